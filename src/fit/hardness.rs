//! The hardness map set from the measurements: the case's calibration when it gives one, else the
//! default slope with the offset matched to the roll's earliest hardness profile. Storage only
//! applies the map ([`crate::storage::HardnessMap`]); setting it from readings belongs here, next
//! to the other observations.

use crate::case::{Calibration, Material, Measure};
use crate::lanes::Lanes;
use crate::numeric::closest_index;
use crate::storage::{
    age_lane_with, drive, initial_stress_of, zone_pressure, AgeError, HardnessMap, LaneCreep,
    LaneRun, Prepared, Track,
};
use crate::units::DAY_S;
use crate::winding::Wound;

/// The hardness map for a roll.
///
/// - With a calibration: the calibration.
/// - Else, when the earliest hardness profile was read within a day of winding: the default slope
///   with the offset set so that the roll's mean hardness on the wound-in pressures equals the
///   measured mean there.
/// - Else, when there is a later hardness profile (a converter often has only later readings):
///   the same, on the pressures predicted at that age with the grade's creep (an explicit
///   ageing pass with grade creep, run here).
/// - Else the default map.
pub fn hardness_map(
    calibration: Option<&Calibration>,
    material: &Material,
    lanes: &Lanes,
    wound: &Wound,
    prep: &Prepared,
) -> Result<HardnessMap, AgeError> {
    if let Some(c) = calibration {
        return Ok(HardnessMap::calibrated(c));
    }
    let Some(first) = lanes.earliest(Measure::Hardness) else {
        return Ok(HardnessMap::default_map());
    };
    let mean_h = lanes.mean(&first.values);
    if first.age_s < DAY_S {
        let mean_ln_p = lanes.mean(&wound_in_ln_pressure(lanes, wound, prep));
        return Ok(HardnessMap::matched(
            mean_h,
            mean_ln_p,
            "default slope; offset matched to the first hardness profile",
        ));
    }
    let step = closest_index(&prep.timeline.times, first.age_s);
    let mean_ln_p = lanes.mean(&grade_ln_pressure(material, wound, prep, step)?);
    Ok(HardnessMap::matched(
        mean_h,
        mean_ln_p,
        "default slope; offset matched at the first hardness profile (after winding) with the grade's creep",
    ))
}

/// Each lane's log surface-zone pressure (ln Pa) as wound, on the storage grid.
fn wound_in_ln_pressure(lanes: &Lanes, wound: &Wound, prep: &Prepared) -> Vec<f64> {
    let faces = &prep.moisture.faces;
    let r: Vec<f64> = faces.windows(2).map(|w| 0.5 * (w[0] + w[1])).collect();
    (0..lanes.lanes.len().min(wound.lanes.len()))
        .map(|i| {
            let (sr, _) = initial_stress_of(wound, i, &r);
            zone_pressure(&sr, faces).max(1.0).ln()
        })
        .collect()
}

/// Each lane's log surface-zone pressure (ln Pa) after `step` time steps with the grade's creep.
fn grade_ln_pressure(
    material: &Material,
    wound: &Wound,
    prep: &Prepared,
    step: usize,
) -> Result<Vec<f64>, AgeError> {
    let grade = LaneCreep::grade(material);
    (0..wound.lanes.len())
        .map(|lane| {
            let drv = drive(material, prep, lane);
            let run = LaneRun {
                steps: step,
                ..LaneRun::whole(material, (prep, wound, lane), &grade, &drv)
            };
            let mut track = Track::default();
            age_lane_with(&run, &mut track)?;
            let p = &track.surface_pressure_pa;
            Ok(p[step.min(p.len() - 1)].max(1.0).ln())
        })
        .collect()
}
