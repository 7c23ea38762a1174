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
    /// The deciding condition's feature on the corrected roll at the fitted creep, and whether
    /// the lanes that carry the defect there include some of the finding's own (None when
    /// `defect_remains` is).
    pub deciding_after: Option<DecidingAfter>,
    /// Share of the plausible states in which the defect stays ([`remains_over_states`]); None
    /// when `defect_remains` is, or before the confidence screen.
    pub remains_fraction: Option<f64>,
    /// Whether the correction changes anything on this roll (keeping a wrap the roll never had
    /// does not): one that does not apply is neither run nor judged, and is listed last.
    pub applies: bool,
    /// The moisture a correction that makes the paper at another moisture makes it at, % dry
    /// basis (None for other corrections): see [`CheckedCorrection::made_beyond_practice`].
    pub made_at_moisture_pct: Option<f64>,
}

/// Moisture range paper machines commonly make paper at, % wet basis (water over the wet mass;
/// from memory: about 4-10 % off the dryer section, newsprint and board near the top of it).
pub const MACHINE_MOISTURE_PCT: (f64, f64) = (4.0, 10.0);

/// A moisture content in % dry basis (water over dry mass, as the model keeps it) in % wet basis.
pub fn wet_basis_pct(dry_pct: f64) -> f64 {
    100.0 * dry_pct / (100.0 + dry_pct)
}

impl CheckedCorrection {
    /// Whether the correction makes the paper at a moisture outside [`MACHINE_MOISTURE_PCT`]
    /// (compared on a wet basis): the model re-runs it as its text says, but a mill would not
    /// make it so.
    pub fn made_beyond_practice(&self) -> bool {
        let (lo, hi) = MACHINE_MOISTURE_PCT;
        (self.made_at_moisture_pct).is_some_and(|m| !(lo..=hi).contains(&wet_basis_pct(m)))
    }
}

/// The finding's deciding feature read on a corrected roll (in the feature's own unit).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct DecidingAfter {
    pub feature: crate::vocab::Feature,
    pub value: f64,
    /// Whether the defect, located on the corrected roll, overlaps the finding's lanes (a
    /// defect located on the whole roll, as the core's collapse is, always does).
    pub at_finding: bool,
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
        let deciding_after = match (&outcomes, deciding) {
            (Some(o), Some(d)) if applies && c.action != Action::SlitOut => {
                let s = &scenarios[i];
                let f = super::features::compute(&s.case, &s.lanes, &o[i]);
                let width = s.case.roll.width_m;
                let at = super::quantity::locate(defect, &s.lanes, width, &f, &o[i]);
                Some(DecidingAfter {
                    feature: d.feature,
                    value: f.get(d.feature),
                    // no lanes located: the whole roll (the core, the outer wraps, a flat)
                    at_finding: site.at.is_empty()
                        || at.is_empty()
                        || at.iter().any(|j| site.at.contains(j)),
                })
            }
            _ => None,
        };
        let remains = deciding
            .zip(deciding_after)
            .map(|(d, a)| a.at_finding && d.holds(a.value));
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
            deciding_after,
            remains_fraction: None,
            applies,
            made_at_moisture_pct: (c.action == Action::MakeAtPressroomEquilibrium && applies)
                .then(|| scenarios[i].case.material.moisture_pct),
        });
    }
    out.sort_by_key(|c| (!c.applies, c.improves == Some(false)));
    Ok(out)
}

/// Whether each correction's defect stays over the plausible states: of the states in which the
/// finding holds (`states`: the deciding feature's value in each plausible state of the measured
/// roll, and whether the finding holds there), the share in which the `deciding` condition still
/// holds once the value is moved as the correction moves it at the fitted creep (from `fitted`,
/// the finding's value, to [`DecidingAfter::value`]): in proportion where both have one sign, as
/// a length that grows with creep does, else by the difference. A first-order estimate: the
/// correction is re-run at the fitted creep only. A defect located away from the finding's lanes
/// goes in every state.
pub fn remains_over_states(
    corrections: &mut [CheckedCorrection],
    deciding: &Condition,
    fitted: f64,
    states: &[(f64, bool)],
) {
    let held = states.iter().filter(|s| s.1).count();
    if held == 0 {
        return;
    }
    for c in corrections.iter_mut() {
        let Some(a) = c.deciding_after else { continue };
        let ratio = a.value / fitted;
        let moved = |v: f64| {
            if ratio.is_finite() && ratio > 0.0 {
                v * ratio
            } else {
                v + (a.value - fitted)
            }
        };
        let stays = (states.iter())
            .filter(|&&(v, h)| h && a.at_finding && deciding.holds(moved(v)))
            .count();
        c.remains_fraction = Some(stays as f64 / held as f64);
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::vocab::Feature;

    fn corrected(value: f64, at_finding: bool) -> CheckedCorrection {
        CheckedCorrection {
            action: Action::ScaleTension,
            factor: Some(0.8),
            text: String::new(),
            why: String::new(),
            quantity: Quantity::SpreadMmPerM,
            unit: "mm/m",
            before: 1.0,
            after: Some(0.5),
            improves: Some(true),
            defect_remains: Some(at_finding && value > 0.5),
            deciding_after: Some(DecidingAfter {
                feature: Feature::SpreadMmPerM,
                value,
                at_finding,
            }),
            remains_fraction: None,
            applies: true,
            made_at_moisture_pct: None,
        }
    }

    /// Hand-worked: the finding reads 1.0 at the fitted creep and 0.6, 0.75, 1.0, 1.2 in four
    /// states, holding in the last three. A correction that moves it to 0.7 (by a factor 0.7)
    /// leaves 0.525, 0.7 and 0.84 there, so the condition "above 0.6" holds in two of the three.
    /// One that moves it to 0.1 leaves none; one located away from the finding stays in none. A
    /// finding read at 0 moves by the difference: 0 to 0.7 takes 0.1 and -0.2 to 0.8 and 0.5.
    #[test]
    fn a_correction_stays_in_the_states_it_leaves_past_the_threshold() {
        let d = Condition {
            feature: Feature::SpreadMmPerM,
            above: Some(0.6),
            below: None,
            source: String::new(),
        };
        let untouched = [
            corrected(0.7, true),
            corrected(0.1, true),
            corrected(2.0, false),
        ];
        let mut c = untouched.to_vec();
        let states = [(0.6, false), (0.75, true), (1.0, true), (1.2, true)];
        remains_over_states(&mut c, &d, 1.0, &states);
        let got: Vec<Option<f64>> = c.iter().map(|x| x.remains_fraction).collect();
        assert_eq!(got, vec![Some(2.0 / 3.0), Some(0.0), Some(0.0)]);
        let mut n = untouched.to_vec();
        remains_over_states(&mut n, &d, 1.0, &[]);
        assert!(n.iter().all(|x| x.remains_fraction.is_none()));
        let mut z = vec![untouched[0].clone()];
        remains_over_states(&mut z, &d, 0.0, &[(0.1, true), (-0.2, true)]);
        assert_eq!(z[0].remains_fraction, Some(0.5));
    }
}
