//! The storage kernel run on a pack of creep parameter sets side by side (what a fit's posterior
//! grid does) against each set run on its own: an invariant of the implementation, to the bit.

use rollsleuth::case::{self, Case};
use rollsleuth::lanes::Lanes;
use rollsleuth::storage::{
    age_lane_pack, age_lane_with, age_prepared, age_prepared_across, drive, prepare,
    track_lane_pack, AgeOptions, FullRecord, HardnessMap, LaneCreep, LaneDrive, LaneRun, Prepared,
    RollStore, Track,
};
use rollsleuth::winding::Wound;

mod common;

/// A run of lane `lane` through the whole of storage.
fn run<'a>(
    case: &'a Case,
    wound: &'a Wound,
    prep: &'a Prepared,
    drv: &'a LaneDrive,
    lane: usize,
    creep: &'a LaneCreep,
) -> LaneRun<'a> {
    LaneRun {
        material: &case.material,
        wound,
        prep,
        lane,
        creep,
        drive: drv,
        steps: prep.timeline.steps.len(),
    }
}

/// The demo roll wound on 41 nodes and its storage prepared on the default grid.
fn demo() -> (Case, Lanes, Wound, Prepared) {
    let case = case::load_demo(&[]).expect("demo loads");
    let lanes = rollsleuth::lanes::build(&case);
    let wound = common::wound(&case, &lanes, 41);
    let prep = prepare(
        &rollsleuth::fit::store_input(&case, &[]),
        &lanes,
        &AgeOptions::default(),
    );
    (case, lanes, wound, prep)
}

/// Each member of a pack has the bits of its own run, and a member that cannot run fails
/// alone (the others are not touched by it).
#[test]
fn a_pack_of_runs_gives_each_run_its_own_bits() {
    let (case, lanes, wound, prep) = demo();
    let lane = lanes.lanes.len() / 2;
    let drv = drive(&case.material, &prep, lane);
    let grade = LaneCreep::grade(&case.material);
    let scaled = |s: [f64; 2]| rollsleuth::fit::creep_from(&case.material, &s.map(f64::ln));
    let mut creep = [[1.0, 1.0], [0.2, 3.0], [5.0, 0.5], [1.0, 1.0]].map(scaled);
    // a run that cannot be computed: its delayed part is not a number
    creep[3].radial.delayed = f64::NAN;
    let packed = track_lane_pack(&run(&case, &wound, &prep, &drv, lane, &grade), &creep)
        .expect("shared retardation times");
    for (c, got) in creep.iter().zip(&packed) {
        let mut own = Track::default();
        let alone = age_lane_with(&run(&case, &wound, &prep, &drv, lane, c), &mut own)
            .ok()
            .map(|_| own);
        assert_eq!(got.is_some(), alone.is_some());
        if let (Some(g), Some(a)) = (got, alone) {
            let bits = |v: &[f64]| v.iter().map(|x| x.to_bits()).collect::<Vec<u64>>();
            assert_eq!(bits(&g.diameter_m), bits(&a.diameter_m));
            assert_eq!(bits(&g.surface_pressure_pa), bits(&a.surface_pressure_pa));
            assert!(g.diameter_m.len() > 10);
        }
    }
    assert!(packed[..3].iter().all(Option::is_some) && packed[3].is_none());
    // different retardation times cannot share a pack
    let mut other = creep;
    other[1].md.retardation_s *= 2.0;
    let base = run(&case, &wound, &prep, &drv, lane, &grade);
    assert!(track_lane_pack(&base, &other).is_none());
}

/// Everything a pack's members keep (the whole record of each, as a diagnosis's posterior states
/// read it) is what each keeps on a run of its own, to the bit; a pack with a member that cannot
/// run gives nothing (its members are then run one by one, which names the failure).
#[test]
fn a_pack_keeps_each_run_its_whole_record() {
    let (case, lanes, wound, prep) = demo();
    let map = HardnessMap::default_map();
    let scaled = |s: [f64; 2]| rollsleuth::fit::creep_from(&case.material, &s.map(f64::ln));
    let creep = [[1.0, 1.0], [0.2, 4.0], [5.0, 0.5], [2.0, 8.0]].map(scaled);
    let mut loose = 0;
    for lane in [0, lanes.lanes.len() / 2] {
        let drv = drive(&case.material, &prep, lane);
        let packed = age_lane_pack(
            &run(&case, &wound, &prep, &drv, lane, &creep[0]),
            &creep,
            &map,
        )
        .expect("every member runs");
        for (c, got) in creep.iter().zip(&packed) {
            let mut own = FullRecord::new(&case.material, &prep, &wound, lane, &map);
            let end = age_lane_with(&run(&case, &wound, &prep, &drv, lane, c), &mut own)
                .expect("runs on its own");
            let alone = own.finish(end);
            assert!(alone.diameter_m.len() > 10);
            assert_eq!(format!("{got:?}"), format!("{alone:?}"), "lane {lane}");
            loose += usize::from(alone.loose_outer_depth_m > 0.0);
        }
    }
    // the held cells are compared too: the runs loosen outer wraps (8 of the 8 measured)
    assert!(loose > 0);
    let mut bad = creep;
    bad[2].radial.delayed = f64::NAN;
    let drv = drive(&case.material, &prep, 0);
    assert!(age_lane_pack(&run(&case, &wound, &prep, &drv, 0, &creep[0]), &bad, &map).is_none());
}

/// Rolls that share their storage and differ in wound state, creep and hardness map (as a
/// diagnosis's noise rolls do) run side by side give each roll what it gets on its own, to the
/// bit; so do rolls that cannot share a pack (run one by one), and a roll whose run fails names
/// its own first failing lane while the others run.
#[test]
fn rolls_side_by_side_give_each_roll_its_own_record() {
    let (case, lanes, _, prep) = demo();
    let winds: Vec<Wound> = [1.0, 1.01, 0.99, 1.02]
        .iter()
        .map(|f| {
            let mut l = lanes.clone();
            for (i, lane) in l.lanes.iter_mut().enumerate() {
                lane.caliper_m *= f + 0.002 * (i % 3) as f64;
            }
            common::wound(&case, &l, 41)
        })
        .collect();
    let n = lanes.lanes.len();
    let scaled = |s: [f64; 2]| rollsleuth::fit::creep_from(&case.material, &s.map(f64::ln));
    let creep: Vec<Vec<LaneCreep>> = (0..4)
        .map(|m| {
            (0..n)
                .map(|i| scaled([0.5 + 0.3 * m as f64, 2.0 - 0.1 * (i % 5) as f64]))
                .collect()
        })
        .collect();
    let maps = [
        HardnessMap::default_map(),
        HardnessMap::default_map(),
        HardnessMap::calibrated(&rollsleuth::case::Calibration {
            a: 40.0,
            b: 10.0,
            pressure_ref_pa: 2e3,
        }),
        HardnessMap::default_map(),
    ];
    let own = |m: usize, creep: &[LaneCreep]| {
        format!(
            "{:?}",
            age_prepared(&case.material, &prep, &winds[m], Some(creep), &maps[m])
        )
    };
    let across = age_prepared_across(
        &case.material,
        std::array::from_fn::<RollStore, 4, _>(|m| (&prep, &winds[m], &creep[m][..], &maps[m])),
    );
    for (m, a) in across.iter().enumerate() {
        assert!(a.is_ok());
        assert_eq!(format!("{a:?}"), own(m, &creep[m]), "roll {m}");
    }
    // a lane of roll 2 that cannot run: it fails alone, naming that lane
    let mut bad = creep.clone();
    bad[2][1].radial.delayed = f64::NAN;
    let across = age_prepared_across(
        &case.material,
        std::array::from_fn::<RollStore, 4, _>(|m| (&prep, &winds[m], &bad[m][..], &maps[m])),
    );
    for (m, a) in across.iter().enumerate() {
        assert_eq!(format!("{a:?}"), own(m, &bad[m]), "roll {m}");
    }
    assert!(matches!(&across[2], Err(e) if e.lane == 1));
    // a roll on another storage history cannot share the pack: each runs on its own
    let other = prepare(
        &rollsleuth::fit::store_input(&case, &[86_400.0 * 90.0]),
        &lanes,
        &AgeOptions::default(),
    );
    let mut rolls =
        std::array::from_fn::<RollStore, 4, _>(|m| (&prep, &winds[m], &creep[m][..], &maps[m]));
    rolls[3].0 = &other;
    let across = age_prepared_across(&case.material, rolls);
    let alone = age_prepared(&case.material, &other, &winds[3], Some(&creep[3]), &maps[3]);
    assert_eq!(format!("{:?}", across[3]), format!("{alone:?}"));
    assert_eq!(format!("{:?}", across[0]), own(0, &creep[0]));
    // a creep list shorter than the lanes: the lanes past its end take the grade's creep, as
    // `age_prepared` gives them
    let short = &creep[1][..n / 2];
    let mut rolls =
        std::array::from_fn::<RollStore, 4, _>(|m| (&prep, &winds[m], &creep[m][..], &maps[m]));
    rolls[1].2 = short;
    let across = age_prepared_across(&case.material, rolls);
    assert_eq!(format!("{:?}", across[1]), own(1, short));
}
