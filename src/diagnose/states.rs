//! The plausible states of a diagnosis: the roll run to unwind with draw k of every lane's creep
//! posterior, for every k (used by [`super::confidence`] for finding probabilities, evidence
//! intervals and the lanes' spreads).

use super::{features, DiagnoseError, Fitted, MechanismShare};
use crate::case::Case;
use crate::fit::{prepared, FitError};
use crate::rules::Rule;
use crate::storage::{age_prepared, AgeOptions, Aged, LaneAged, LaneCreep};
use crate::vocab::FeatureValues;

/// Feature values of one posterior state and its lane lengths.
pub(super) struct State {
    pub(super) values: FeatureValues,
    pub(super) excess_mm_per_m: Vec<f64>,
}

/// Where the posterior states' storage runs come from.
enum StateSource<'a> {
    /// The fit's runs of each lane's draws.
    Fit(Vec<&'a [LaneAged]>),
    /// Runs here, on this storage grid and hardness map.
    Here(crate::storage::Prepared, crate::storage::HardnessMap),
}

/// The roll run to unwind with draw k of every lane's posterior, for every k: from the fit's runs
/// of the draws when every lane has them ([`crate::fit::LaneFit::draw_runs`]), else run here.
pub(super) fn posterior_states(lab: &Case, fitted: &Fitted) -> Result<Vec<State>, DiagnoseError> {
    let count = fitted
        .fit
        .lanes
        .iter()
        .map(|l| l.draws.len())
        .min()
        .unwrap_or(0);
    let runs: Option<Vec<&[LaneAged]>> = (fitted.fit.lanes.iter())
        .map(|l| l.draw_runs.as_deref().filter(|r| r.len() >= count))
        .collect();
    let source = match runs {
        Some(r) => StateSource::Fit(r),
        None => {
            let (prep, map) = prepared(lab, &fitted.lanes, &fitted.wound, &AgeOptions::default())?;
            StateSource::Here(prep, map)
        }
    };
    let aged_at = |k: usize, creep: &[LaneCreep]| -> Result<Aged, DiagnoseError> {
        match &source {
            // the fit's record of the roll with each lane's run replaced by its draw k
            StateSource::Fit(r) => Ok(fitted.fit.aged.with_lanes(r.iter().map(|l| l[k].clone()))),
            StateSource::Here(prep, map) => {
                Ok(
                    age_prepared(&lab.material, prep, &fitted.wound, Some(creep), map)
                        .map_err(FitError::from)?,
                )
            }
        }
    };
    let mut out = Vec::with_capacity(count);
    // one outcome on the fitted wound state (cloned once); each state replaces its storage and
    // unwind parts
    let mut slot: Option<super::actions::Outcome> = None;
    for k in 0..count {
        let creep: Vec<LaneCreep> = fitted.fit.lanes.iter().map(|l| l.draws[k]).collect();
        let aged = aged_at(k, &creep)?;
        let unwind = super::unwind::at_unwind(lab, &fitted.wound, &creep, &fitted.lanes);
        let o = match slot.take() {
            Some(mut o) => {
                o.aged = aged;
                o.unwind = unwind;
                o
            }
            None => super::actions::Outcome {
                wound: fitted.wound.clone(),
                aged,
                unwind,
            },
        };
        let f = features::compute(lab, &fitted.lanes, &o);
        slot = Some(o);
        out.push(State {
            values: f.values,
            excess_mm_per_m: f.excess_mm_per_m,
        });
    }
    Ok(out)
}

/// Each rule of `siblings` (the finding's rule `r` first) with the share of `states` in which it
/// holds; empty when `r` has no sibling.
pub(super) fn mechanism_shares(
    r: &Rule,
    siblings: &[&Rule],
    states: &[State],
) -> Vec<MechanismShare> {
    if siblings.len() < 2 {
        return Vec::new();
    }
    let share = |q: &Rule| {
        let n = states.iter().filter(|s| q.holds(&s.values)).count();
        n as f64 / states.len().max(1) as f64
    };
    let others = siblings.iter().filter(|q| q.id != r.id);
    (std::iter::once(r).chain(others.copied()))
        .map(|q| MechanismShare {
            rule: q.id.clone(),
            mechanism: q.mechanism.clone(),
            share: share(q),
        })
        .collect()
}
