//! A uniform roll wound as one lane: when every lane has the same caliper and own strain at
//! winding, every lane winds alike, so one lane across the width is wound and its state put on
//! each lane ([`super::roll::wind_from`]).

use super::roll::{final_shear_lag, LaneStress, WindInput, Wound};
use crate::lanes::{Lane, Lanes};

/// A uniform roll as one lane across its width: when every lane has the same caliper and the
/// same own strain at winding (bit for bit), every lane winds alike (equal radii, so no offsets
/// from levelling and equal nip shares), so one lane is wound instead of all of them.
pub(super) fn one_lane(lanes: &Lanes) -> Option<Lanes> {
    let (first, last) = (lanes.lanes.first()?, lanes.lanes.last()?);
    let alike = |l: &Lane| {
        l.caliper_m.to_bits() == first.caliper_m.to_bits()
            && l.web_strain.to_bits() == first.web_strain.to_bits()
    };
    if lanes.lanes.len() < 2 || !lanes.lanes.iter().all(alike) {
        return None;
    }
    let lane = Lane {
        right_m: last.right_m,
        width_m: lanes.widths().iter().sum(),
        position_m: 0.5 * (first.left_m + last.right_m),
        ..first.clone()
    };
    Some(Lanes {
        lanes: vec![lane],
        mean_caliper_m: lanes.mean_caliper_m,
        caliper_source: lanes.caliper_source,
        notes: Vec::new(),
        series: Vec::new(),
    })
}

/// The wound state of [`one_lane`]'s roll put on every lane of `lanes`, with the shear lag of
/// all of them.
pub(super) fn on_every_lane(one: Wound, input: &WindInput, lanes: &Lanes) -> Wound {
    let Some(lane) = one.lanes.first() else {
        return one;
    };
    let out: Vec<LaneStress> = lanes
        .lanes
        .iter()
        .map(|l| LaneStress {
            position_m: l.position_m,
            ..lane.clone()
        })
        .collect();
    Wound {
        shear_lag_m: final_shear_lag(input, lanes, &out),
        lanes: out,
        ..one
    }
}
