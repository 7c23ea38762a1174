//! Measurements turned into per-lane observations at the model's time steps.

use crate::case::Measure;
use crate::lanes::Lanes;
use crate::note::Note;
use crate::numeric::closest_index;
use crate::storage::Timeline;
use crate::units::DAY_S;
use serde::Serialize;

/// Repeatability of a diameter reading, m (common practice: a circumference tape read to about
/// 0.1 mm of diameter).
pub const DIAMETER_REPEATABILITY_M: f64 = 1e-4;

/// How an observation is compared with the model.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub enum ObsKind {
    /// The value itself.
    Absolute,
    /// The change since the observation at `step0` (diameters: absolute lane diameters carry
    /// the winder's build, which the creep model does not own).
    ChangeFrom { step0: usize },
}

/// One observation of one lane.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Obs {
    pub what: Measure,
    /// Roll age, s.
    pub age_s: f64,
    /// Index into the timeline's times.
    pub step: usize,
    /// Measured value (hardness units, or m of diameter change).
    pub value: f64,
    /// One-sigma repeatability in the same units.
    pub sigma: f64,
    pub kind: ObsKind,
}

/// The step whose end time is closest to `age` (s).
pub fn step_of(tl: &Timeline, age: f64) -> usize {
    closest_index(&tl.times, age)
}

/// Observations per lane from the lanes' measurement series, each with one-sigma repeatability:
/// hardness `hardness_sd` (scale units), diameter [`DIAMETER_REPEATABILITY_M`], times the
/// series' noise gain at the lane (larger for an extrapolated lane); and notes on
/// measurements that could not be used.
pub fn observations(lanes: &Lanes, tl: &Timeline, hardness_sd: f64) -> (Vec<Vec<Obs>>, Vec<Note>) {
    let n = lanes.lanes.len();
    let mut out = vec![Vec::new(); n];
    let mut notes = Vec::new();
    let base = lanes
        .earliest(Measure::Diameter)
        .filter(|s| s.age_s < DAY_S)
        .map(|s| (step_of(tl, s.age_s), &s.values, s.age_s));
    for p in &lanes.series {
        let vals = &p.values;
        let step = step_of(tl, p.age_s);
        match p.what {
            // read by winding and storage through the lanes, not fitted
            Measure::Caliper | Measure::Tension | Measure::Moisture => {}
            Measure::Hardness => {
                for (i, v) in vals.iter().enumerate() {
                    out[i].push(Obs {
                        what: Measure::Hardness,
                        age_s: p.age_s,
                        step,
                        value: *v,
                        sigma: hardness_sd * p.noise_gain[i],
                        kind: ObsKind::Absolute,
                    });
                }
            }
            Measure::Diameter => match &base {
                Some((s0, v0, a0)) if p.age_s > *a0 => {
                    for (i, v) in vals.iter().enumerate() {
                        out[i].push(Obs {
                            what: Measure::Diameter,
                            age_s: p.age_s,
                            step,
                            value: v - v0[i],
                            sigma: DIAMETER_REPEATABILITY_M
                                * std::f64::consts::SQRT_2
                                * p.noise_gain[i],
                            kind: ObsKind::ChangeFrom { step0: *s0 },
                        });
                    }
                }
                Some(_) => {}
                None => notes.push(Note::DiameterWithoutReference { age_s: p.age_s }),
            },
        }
    }
    (out, notes)
}
