//! Each correction of a finding re-run exactly as its text says (see `actions::apply`) and
//! checked on the finding's own quantity, before and after. A correction that does not move the
//! quantity the better way is marked and listed last.

use super::actions::{apply, Change, Outcome, RunError, Scenario};
use super::attribution::Runner;
use super::quantity::Site;
use crate::rules::{Condition, Correction};
use crate::vocab::{Action, Defect, Quantity};
use serde::Serialize;

/// A correction with the model re-run, judged on the finding's quantity.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CheckedCorrection {
    pub action: Action,
    pub factor: Option<f64>,
    pub text: String,
    pub why: String,
    pub quantity: Quantity,
    /// Unit of `before` and `after`.
    pub unit: &'static str,
    /// The finding's quantity as predicted.
    pub before: f64,
    /// The quantity with the correction applied (None when re-runs are off).
    pub after: Option<f64>,
    /// Whether the quantity moves the better way (None when not re-run).
    pub improves: Option<bool>,
    /// Whether the defect stays where the finding is: the finding's deciding condition still
    /// holds on the corrected roll (the fitted creep) and the lanes that carry it there include
    /// some of the finding's own ([`super::quantity::locate`]), however much the quantity moved.
    /// None when not re-run, when the correction does not apply, and for a slit-out (the roll
    /// keeps its lanes; the slit web is judged on its quantity).
    pub defect_remains: Option<bool>,
    /// Whether the correction changes anything on this roll (keeping a wrap the roll never had
    /// does not): one that does not apply is neither run nor judged, and is listed last.
    pub applies: bool,
}

/// Relative change below which a correction counts as no improvement (a numerical tolerance of
/// the re-runs, not a physical threshold).
const TOLERANCE: f64 = 1e-3;

/// Whether `after` is better than `before` for `q` by more than the tolerance.
pub fn improves(q: Quantity, before: f64, after: f64) -> bool {
    let d = after - before;
    let margin = TOLERANCE * before.abs().max(1e-9);
    if q.lower_is_better() {
        d < -margin
    } else {
        d > margin
    }
}

/// Check a finding's corrections: each re-run through `runner` (None: re-runs off), measured
/// at `site` (the finding's lanes; a slit-out leaves them out), and the finding's `deciding`
/// condition read on the corrected roll. Improving corrections first, in the rule's order, then
/// the rest.
pub fn check(
    corrections: &[Correction],
    (q, deciding, defect): (Quantity, Option<&Condition>, Defect),
    site: &Site,
    base: &Scenario,
    base_outcome: &Outcome,
    runner: Option<&mut Runner>,
) -> Result<Vec<CheckedCorrection>, RunError> {
    let before = site.measure(q, base_outcome);
    let scenarios: Vec<Scenario> = corrections
        .iter()
        .map(|c| apply(base, Change::Correct(c.action), c.factor, site.at))
        .collect();
    let outcomes = match runner {
        Some(r) => Some(r.run_all(&scenarios)?),
        None => None,
    };
    let mut out = Vec::new();
    for (i, c) in corrections.iter().enumerate() {
        let applies = scenarios[i] != *base;
        let after = (outcomes.as_ref()).filter(|_| applies).map(|o| {
            let at = Site {
                excluded: &scenarios[i].excluded,
                ..*site
            };
            at.measure(q, &o[i])
        });
        let remains = match (&outcomes, deciding) {
            (Some(o), Some(d)) if applies && c.action != Action::SlitOut => {
                let s = &scenarios[i];
                let f = super::features::compute(&s.case, &s.lanes, &o[i]);
                let width = s.case.roll.width_m;
                let here = || {
                    let at = super::quantity::locate(defect, &s.lanes, width, &f, &o[i]);
                    site.at.is_empty() || at.iter().any(|j| site.at.contains(j))
                };
                Some(d.holds(f.get(d.feature)) && here())
            }
            _ => None,
        };
        out.push(CheckedCorrection {
            action: c.action,
            factor: c.factor,
            text: c.text.clone(),
            why: c.why.clone(),
            quantity: q,
            unit: q.unit(),
            before,
            after,
            improves: after.map(|a| improves(q, before, a)),
            defect_remains: remains,
            applies,
        });
    }
    out.sort_by_key(|c| (!c.applies, c.improves == Some(false)));
    Ok(out)
}
