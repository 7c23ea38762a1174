//! Does a later survey contradict the model? Before the per-lane fit bends each lane's creep to
//! its own readings, the roll with the pooled creep in every lane predicts how each lane changes
//! between the first survey and a later one, relative to the roll (winding, moisture and the
//! lanes' own wound-in stress make lanes differ). A lane contradicts the model when that
//! prediction is clearly on one side of the roll's change (beyond [`CLEAR_SIGMAS`] of the
//! change's noise) and the survey is clearly on the other: harder where softer is predicted,
//! or the reverse, and the same for diameter. The per-lane fit can still absorb it (a creep
//! scale far from the pooled one), so the check is made before the fit and reported.
//!
//! If the model is right, a measured change that far on the other side is a noise excursion of
//! at least 2 x [`CLEAR_SIGMAS`] = 4 sigma: about 3e-5 per lane and survey (one-sided normal
//! tail), so a contradiction is a statement about the roll, not the readings.

use super::observe::{Obs, ObsKind};
use super::LaneProblem;
use crate::case::Measure;
use serde::Serialize;

/// How far, in noise units of the change, prediction and survey must each lie from the roll's
/// change, on opposite sides.
pub const CLEAR_SIGMAS: f64 = 2.0;

/// A lane whose later survey contradicts the model with pooled creep.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Contradiction {
    pub what: Measure,
    /// Age of the later survey, s.
    pub age_s: f64,
    /// Lane index and centre (m).
    pub lane: usize,
    pub position_m: f64,
    /// The lane's change since the first survey minus the roll's width-weighted change:
    /// predicted with the pooled creep and measured (hardness units, or m of diameter).
    pub predicted: f64,
    pub measured: f64,
    /// One-sigma noise of the lane's change (same unit).
    pub sigma: f64,
}

/// A lane's change of one survey since the first of its kind: (measured, predicted, sigma).
fn change(p: &LaneProblem, track: &crate::storage::Track, o: &Obs) -> Option<(f64, f64, f64)> {
    match o.kind {
        ObsKind::ChangeFrom { .. } => Some((o.value, p.predict(o, track), o.sigma)),
        ObsKind::Absolute => {
            let first = p
                .obs
                .iter()
                .filter(|f| f.what == o.what && f.kind == ObsKind::Absolute)
                .min_by(|a, b| a.age_s.total_cmp(&b.age_s))?;
            (first.age_s < o.age_s).then(|| {
                (
                    o.value - first.value,
                    p.predict(o, track) - p.predict(first, track),
                    o.sigma.hypot(first.sigma),
                )
            })
        }
    }
}

/// Surveys of every lane with the pooled log-scales `theta`: the lanes that contradict the
/// model, in lane order then survey order. `widths_m` are the lanes' widths (m), for the roll's
/// width-weighted change. Lanes that cannot be simulated are left out.
pub fn contradictions(
    problems: &[LaneProblem],
    theta: &[f64],
    positions_m: &[f64],
    widths_m: &[f64],
) -> Vec<Contradiction> {
    let tracks: Vec<_> = problems.iter().map(|p| p.simulate(theta)).collect();
    // the later surveys: (what, age) pairs in the order first met
    let mut surveys: Vec<(Measure, f64)> = Vec::new();
    for o in problems.iter().flat_map(|p| &p.obs) {
        if !surveys.iter().any(|s| s.0 == o.what && s.1 == o.age_s) {
            surveys.push((o.what, o.age_s));
        }
    }
    let mut found = Vec::new();
    for (what, age) in surveys {
        // (lane, measured, predicted, sigma) of this survey
        let rows: Vec<(usize, f64, f64, f64)> = problems
            .iter()
            .zip(&tracks)
            .enumerate()
            .filter_map(|(i, (p, t))| {
                let t = t.as_ref()?;
                let o = p.obs.iter().find(|o| o.what == what && o.age_s == age)?;
                change(p, t, o).map(|(m, q, s)| (i, m, q, s))
            })
            .collect();
        if rows.len() < 3 {
            continue;
        }
        let w: Vec<f64> = rows.iter().map(|r| widths_m[r.0]).collect();
        let mean = |k: fn(&(usize, f64, f64, f64)) -> f64| {
            let v: Vec<f64> = rows.iter().map(k).collect();
            crate::numeric::weighted_mean(&v, &w)
        };
        let (mm, mp) = (mean(|r| r.1), mean(|r| r.2));
        for &(i, m, q, s) in &rows {
            let (dm, dp) = (m - mm, q - mp);
            let clear = CLEAR_SIGMAS * s;
            if dp.abs() > clear && dm.abs() > clear && dp.signum() != dm.signum() {
                found.push(Contradiction {
                    what,
                    age_s: age,
                    lane: i,
                    position_m: positions_m[i],
                    predicted: dp,
                    measured: dm,
                    sigma: s,
                });
            }
        }
    }
    found
}
