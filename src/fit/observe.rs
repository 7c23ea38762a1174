//! Measurements turned into per-lane observations at the model's time steps.

use crate::case::{Case, Measure};
use crate::lanes::{onto, Lanes};
use crate::storage::Timeline;
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
    tl.times
        .iter()
        .enumerate()
        .min_by(|a, b| (a.1 - age).abs().total_cmp(&(b.1 - age).abs()))
        .map(|(i, _)| i)
        .unwrap_or(0)
}

/// Observations per lane, and notes on measurements that could not be used.
pub fn observations(case: &Case, lanes: &Lanes, tl: &Timeline) -> (Vec<Vec<Obs>>, Vec<String>) {
    let n = lanes.lanes.len();
    let centres = lanes.positions();
    let mut out = vec![Vec::new(); n];
    let mut notes = Vec::new();
    let first_dia = case
        .profiles
        .iter()
        .filter(|p| p.what == Measure::Diameter)
        .min_by(|a, b| a.age_s.total_cmp(&b.age_s));
    let base = first_dia.filter(|p| p.age_s < 86400.0).map(|p| {
        let (v, _) = onto(p, &centres);
        (step_of(tl, p.age_s), v, p.age_s)
    });
    for p in &case.profiles {
        let (vals, _) = onto(p, &centres);
        let step = step_of(tl, p.age_s);
        match p.what {
            Measure::Caliper => {}
            Measure::Hardness => {
                for (i, v) in vals.iter().enumerate() {
                    out[i].push(Obs {
                        what: Measure::Hardness,
                        age_s: p.age_s,
                        step,
                        value: *v,
                        sigma: case.hardness.repeatability,
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
                            sigma: DIAMETER_REPEATABILITY_M * std::f64::consts::SQRT_2,
                            kind: ObsKind::ChangeFrom { step0: *s0 },
                        });
                    }
                }
                Some(_) => {}
                None => notes.push(format!(
                    "diameter profile at {:.0} d has no winding-time diameter to compare with; not used in the fit",
                    p.age_s / 86400.0
                )),
            },
        }
    }
    (out, notes)
}
