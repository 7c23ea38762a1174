//! Words for the notes the confidence stage and the winding-time diameter check give (split from
//! `words` to keep each file short). Every `match` is exhaustive.

use super::words::{defect, feature};
use crate::note::{DiameterMismatch, Note};
use crate::units::DAY_S;

fn defect_name(d: crate::vocab::Defect) -> &'static str {
    defect(d)
}

fn feature_name(f: crate::vocab::Feature) -> &'static str {
    feature(f)
}

/// A note of the diagnosis's confidence (noise floor, resolution, misfit) as a sentence.
pub(super) fn confidence_note(n: &Note) -> String {
    match *n {
        Note::BelowNoiseFloor {
            defect,
            feature,
            value,
            uniform,
            threshold,
            noise_chance,
            level,
        } => format!(
            "{} not reported: measurement noise alone moves {} this far with a chance of {} % (a finding needs {} % or less: 5 % shared over the features tested); {} against a uniform roll's {}, while standing above noise takes a difference of {}",
            defect_name(defect),
            feature_name(feature),
            crate::units::sig(noise_chance * 100.0, 2),
            crate::units::sig(level * 100.0, 2),
            crate::units::sig(value, 3),
            crate::units::sig(uniform, 3),
            crate::units::sig(threshold, 2)
        ),
        Note::Unlikely { defect, probability } => format!(
            "{} not reported: its rule holds in only {:.0} % of the plausible states (posterior draws)",
            defect_name(defect),
            probability * 100.0
        ),
        Note::Resolution {
            caliper_repeatability_m,
            band_m,
            lane_excess_mm_per_m,
            centre_edges_mm_per_m,
        } => format!(
            "resolution of these measurements (caliper read to {:.1} um, one sigma): a caliper band must exceed {:.1} um, a lane's excess length over the web around it {:.3} % and centre against edges {:.3} % of the web length to stand above noise (a 5 % chance, shared over the features tested, that noise alone does it)",
            caliper_repeatability_m * 1e6,
            band_m * 1e6,
            lane_excess_mm_per_m / 10.0,
            centre_edges_mm_per_m / 10.0
        ),
        Note::LaneNotExplained { position_m, misfit } => format!(
            "the lane at {:.0} mm is not explained by the model: its readings miss the fit by {misfit:.1} noise units (rms; over 3)",
            position_m * 1e3
        ),
        Note::RollNotExplained { misfit } => format!(
            "the roll is not explained by the model: its readings miss the fit by {misfit:.1} noise units (rms over every reading; over 3)"
        ),
        Note::FindingOnWeakLanes {
            defect,
            lanes,
            unexplained,
            unidentified,
        } => format!(
            "{} rests on {lanes} lane(s): {unexplained} not explained by the model, {unidentified} with creep the data do not identify (kept at the pooled value)",
            defect_name(defect)
        ),
        _ => String::new(),
    }
}

/// The wound state against the diameter profile at winding ([`Note::WindingDiameter`]).
pub(super) fn winding_diameter(m: &DiameterMismatch) -> String {
    format!(
        "the wound state disagrees with the diameter profile at {:.0} d: at {:.0} mm the predicted diameter is {:+.2} mm from the mean, the measured {:+.2} mm (tolerance {:.2} mm, three times the repeatability of the difference; {} lanes beyond it); check the caliper profile, the lanes and the winder settings before trusting the findings (profiles, winding)",
        m.age_s / DAY_S,
        m.position_m * 1e3,
        m.predicted_m * 1e3,
        m.measured_m * 1e3,
        m.tolerance_m * 1e3,
        m.lanes
    )
}
