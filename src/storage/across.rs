//! Like rolls run through storage side by side: lane i of several rolls that share their storage
//! grid, moisture field, time steps, material and core (the noise rolls of a diagnosis, which
//! differ only in their wound states, creep and hardness maps) as the members of one pack
//! ([`Pack`]), each member from its own wound state. Each roll's record has the bits a run of
//! its own gives it.

use super::ageing::{age_lane_full, AgeError, Aged, LaneAged, LaneCreep, LaneRun, Prepared};
use super::cells::{run_lane, Params, Start};
use super::drive::drive;
use super::hardness::HardnessMap;
use super::record::{FullRecord, FullRecords};
use crate::case::Material;
use crate::winding::Wound;
use std::sync::Arc;

/// One roll of [`age_prepared_across`]: its prepared storage, wound state, creep per lane and
/// hardness map.
pub type RollStore<'a> = (&'a Prepared, &'a Wound, &'a [LaneCreep], &'a HardnessMap);

/// [`super::age_prepared`] of `B` rolls, each with its own creep per lane (the grade's past the
/// end of a roll's list), lane by lane side by side where the rolls share everything but their
/// wound states, creep and hardness maps; rolls that do not are each run as
/// [`super::age_prepared`] runs them, and a lane whose creep does not share its retardation
/// times or where any member's run fails is run roll by roll. Each roll's result is what
/// [`super::age_prepared`] gives it, to the bit (a failure names the roll's first failing
/// lane).
pub fn age_prepared_across<const B: usize>(
    material: &Material,
    rolls: [RollStore; B],
) -> [Result<Aged, AgeError>; B] {
    // (no roll: nothing is indexed, and no result)
    let lanes = rolls.first().map_or(0, |r| r.1.lanes.len());
    if !rolls.iter().all(|r| alike(r, &rolls[0], lanes)) {
        return rolls.map(|(prep, wound, creep, map)| {
            super::ageing::age_prepared(material, prep, wound, Some(creep), map)
        });
    }
    let grade = LaneCreep::grade(material);
    // each lane's creep as `age_prepared` reads it (the grade's past the end of a roll's list)
    let creep_of = |r: &RollStore, lane: usize| r.2.get(lane).copied().unwrap_or(grade);
    let mut out: [Result<Vec<LaneAged>, AgeError>; B] =
        std::array::from_fn(|_| Ok(Vec::with_capacity(lanes)));
    for lane in 0..lanes {
        match lane_across(material, &rolls, rolls.map(|r| creep_of(&r, lane)), lane) {
            Some(aged) => {
                for (o, a) in out.iter_mut().zip(aged) {
                    if let Ok(v) = o {
                        v.push(a);
                    }
                }
            }
            None => {
                for (o, r) in out.iter_mut().zip(&rolls) {
                    if let Ok(v) = o {
                        match age_lane_full(material, (r.0, r.1, lane), &creep_of(r, lane), r.3) {
                            Ok(a) => v.push(a),
                            Err(e) => *o = Err(e),
                        }
                    }
                }
            }
        }
    }
    let mut m = 0;
    out.map(|o| {
        let (prep, _, _, map) = rolls[m];
        m += 1;
        o.map(|l| Aged::of(prep, l, map))
    })
}

/// Whether roll `r` shares with `first` what the kernel reads besides the wound state, creep
/// and hardness: the moisture field (the same one), time steps, core and lane count.
fn alike(r: &RollStore, first: &RollStore, lanes: usize) -> bool {
    let bits = |x: Option<f64>| x.map(f64::to_bits);
    Arc::ptr_eq(&r.0.moisture, &first.0.moisture)
        && r.0.timeline == first.0.timeline
        && r.0.mc_ref.to_bits() == first.0.mc_ref.to_bits()
        && bits(r.1.core_stiffness_pa) == bits(first.1.core_stiffness_pa)
        && r.1.lanes.len() == lanes
}

/// Lane `lane` of every roll side by side, member m with `creep[m]`; `None` when their creep
/// does not share its retardation times or any member's run fails.
fn lane_across<const B: usize>(
    material: &Material,
    rolls: &[RollStore; B],
    creep: [LaneCreep; B],
    lane: usize,
) -> Option<[LaneAged; B]> {
    let params = Params::pack(&creep)?;
    let drv = drive(material, rolls[0].0, lane);
    let runs: [LaneRun; B] = std::array::from_fn(|m| {
        LaneRun::whole(material, (rolls[m].0, rolls[m].1, lane), &creep[m], &drv)
    });
    let member = |m: usize| FullRecord::new(material, rolls[m].0, rolls[m].1, lane, rolls[m].3);
    let mut rec = FullRecords::<B>::new(std::array::from_fn(member));
    let end = run_lane(&runs[0], &params, Start::across(&runs), &mut rec);
    if end.failed != 0 {
        return None;
    }
    Some(rec.finish_all(&end))
}
