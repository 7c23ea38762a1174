//! Root cause per finding, on the finding's own quantity.
//!
//! - **Sources** of non-uniformity across the width (caliper profile, moisture gradients from
//!   storage and wraps, lane-to-lane creep differences the measurements identify) share the
//!   quantity's change by Shapley values (Shapley 1953): every subset of removals is run once
//!   (2^n runs for n sources, shared by all findings) and each source gets its marginal effect
//!   averaged over all orders of removal. The values are order-independent, share interactions
//!   evenly, and add up to the change with every source removed (efficiency).
//! - **Amplifiers** (web tension, nip, speed, storage time) make no non-uniformity of their own;
//!   each is reported as the quantity at a feasible alternative setting.
//! - Whether the sources **explain** the finding at all ([`explains`]): when their total works
//!   against the defect or is negligible, no source is its cause; the winding and storage
//!   conditions themselves are (common practice: a cause makes a non-uniformity, an amplifier
//!   only enlarges one).
//!
//! Every re-run goes through [`Runner::run`], which re-uses a wound state for scenarios that wind
//! alike and a whole run for scenarios that are alike, and counts the runs.

use super::actions::{apply, Change, Outcome, RunError, Scenario};
use super::quantity::rule_threshold;
use crate::rules::Condition;
use crate::vocab::{Action, Amplifier, Cause, Quantity};
use crate::winding::{Cache, Wound};
use serde::Serialize;
use std::rc::Rc;

/// Model runs made for one diagnosis.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq, Serialize)]
pub struct RunCount {
    /// Winding runs (a wound state re-used is not counted).
    pub winding_runs: usize,
    /// Storage runs (a scenario re-used is not counted).
    pub storage_runs: usize,
}

/// Runs scenarios forward, each distinct one once.
pub struct Runner {
    nodes: usize,
    winds: Cache,
    done: Vec<(Scenario, Rc<Outcome>)>,
    pub count: RunCount,
}

impl Runner {
    /// A runner with `nodes` radial nodes, seeded with a wound state already computed for `base`.
    pub fn new(nodes: usize, base: &Scenario, wound: Wound) -> Self {
        let mut winds = Cache::default();
        winds.insert(
            &base.wind_input(),
            &base.lanes,
            base.wind_options(nodes),
            &wound,
        );
        Runner {
            nodes,
            winds,
            done: Vec::new(),
            count: RunCount::default(),
        }
    }

    /// The outcome of a scenario (its `excluded` lanes do not change the run).
    pub fn run(&mut self, s: &Scenario) -> Result<Rc<Outcome>, RunError> {
        let mut all = self.run_all(std::slice::from_ref(s))?;
        Ok(all.remove(0))
    }

    /// The outcomes of `scenarios`, in order. The distinct ones not run before are wound and
    /// then run through storage side by side (rayon); outcomes and counts are those of running
    /// them one by one with [`Self::run`]. An error fails the batch (a winding error before any
    /// storage error).
    pub fn run_all(&mut self, scenarios: &[Scenario]) -> Result<Vec<Rc<Outcome>>, RunError> {
        use rayon::prelude::*;
        let keys: Vec<Scenario> = scenarios
            .iter()
            .map(|s| {
                let mut k = s.clone();
                k.excluded.clear();
                k
            })
            .collect();
        let mut fresh: Vec<&Scenario> = Vec::new();
        for k in &keys {
            if !self.done.iter().any(|(d, _)| d == k) && !fresh.contains(&k) {
                fresh.push(k);
            }
        }
        let jobs: Vec<_> = fresh
            .iter()
            .map(|s| (s.wind_input(), &s.lanes, s.wind_options(self.nodes)))
            .collect();
        let held = self.winds.len();
        // a winding error comes before any storage run, as one by one it would stop there
        let wound = self.winds.wind_all(&jobs);
        self.count.winding_runs += self.winds.len() - held;
        let aged: Vec<Result<Outcome, RunError>> = fresh
            .par_iter()
            .zip(wound?)
            .map(|(s, w)| s.age_on(w))
            .collect();
        for (s, o) in fresh.iter().zip(aged) {
            self.count.storage_runs += 1;
            self.done.push(((*s).clone(), Rc::new(o?)));
        }
        Ok(keys
            .iter()
            .filter_map(|k| self.done.iter().find(|(d, _)| d == k))
            .map(|(_, o)| Rc::clone(o))
            .collect())
    }
}

/// The change that removes a source.
pub const fn removal(c: Cause) -> Change {
    match c {
        Cause::CaliperProfile => Change::Correct(Action::FlattenCaliper),
        Cause::StorageMoisture => Change::Correct(Action::StoreAtEquilibrium),
        Cause::LaneToLaneCreep => Change::UniformCreep,
        Cause::WebProfile => Change::Correct(Action::EvenWebProfile),
    }
}

/// Each amplifier's feasible alternative: the change and its factor (common practice: a mill or
/// converter can lower web tension by about 15 %, lighten the nip by about 40 %, wind about 20 %
/// slower and halve the storage time by rotating stock).
pub const AMPLIFIERS: [(Amplifier, Change, f64); 4] = [
    (Amplifier::WebTension, Change::ScaleWebTension, 0.85),
    (Amplifier::Nip, Change::Correct(Action::ScaleNip), 0.6),
    (Amplifier::Speed, Change::ScaleSpeed, 0.8),
    (
        Amplifier::StorageTime,
        Change::Correct(Action::ShortenStorage),
        0.5,
    ),
];

/// Shapley values of `n` players for a game given as the value of each coalition, indexed by
/// bit mask (`v[mask]`, bit i set: player i removed). Player i gets the weighted mean of
/// v(T) - v(T + i) over coalitions T without i, with weight |T|! (n - |T| - 1)! / n! (Shapley
/// 1953), so the values add up to v(none) - v(all).
pub fn shapley(n: usize, v: &[f64]) -> Vec<f64> {
    let fact = |k: usize| (1..=k).map(|x| x as f64).product::<f64>();
    let nf = fact(n);
    (0..n)
        .map(|i| {
            (0..1usize << n)
                .filter(|m| m & (1 << i) == 0)
                .map(|m| {
                    let s = m.count_ones() as usize;
                    fact(s) * fact(n - s - 1) / nf * (v[m] - v[m | (1 << i)])
                })
                .sum()
        })
        .collect()
}

/// A source's Shapley value.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SourceShare {
    pub cause: Cause,
    /// How much of the quantity this source makes, in the quantity's unit.
    pub contribution: f64,
    /// Contribution over the change with every source removed (None when that change is nil).
    #[serde(rename = "share_fraction")]
    pub share: Option<f64>,
    /// Whether the contribution moves the quantity away from the defect (lowers a quantity
    /// where lower is worse, raises one where higher is worse): such a source is no cause.
    pub against_defect: bool,
}

/// The finding's quantity at an amplifier's feasible alternative.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Sensitivity {
    pub amplifier: Amplifier,
    /// The alternative as a factor on the present setting.
    pub factor: f64,
    /// The quantity at the alternative, in the quantity's unit.
    pub value_at_alternative: f64,
}

/// Root cause of one finding.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Attribution {
    pub quantity: Quantity,
    /// Unit of every value below.
    pub unit: &'static str,
    /// The quantity as predicted.
    pub value: f64,
    /// The quantity with every source removed (what the amplifiers make of a uniform web).
    pub value_without_sources: f64,
    /// Shapley values of the sources; they add up to `value - value_without_sources`.
    pub shares: Vec<SourceShare>,
    /// Whether the sources together make the defect ([`explains`]); when not, no source is
    /// named as its cause and the amplifiers show what the winding and storage conditions do.
    pub sources_explain: bool,
    /// Whether the finding's deciding condition holds on the roll with every source removed:
    /// the sources do not make the defect, whatever they add to it.
    pub holds_without_sources: bool,
    pub sensitivities: Vec<Sensitivity>,
}

/// Below this fraction of the defect's size ([`defect_size`]) the sources' total change toward
/// the defect is negligible. Our choice (common practice: a root-cause breakdown names no
/// contributor under about 5 %): removing every source would leave the defect within 5 % of its
/// size, so no source makes it.
pub const NEGLIGIBLE_FRACTION: f64 = 0.05;

/// +1 when a rise of `q` makes the defect worse, -1 when a fall does (`lower_is_better`).
pub const fn worse_sign(q: Quantity) -> f64 {
    if q.lower_is_better() {
        1.0
    } else {
        -1.0
    }
}

/// The defect's size on its quantity, in the quantity's unit: the largest of |value|,
/// |value with every source removed| and, when the finding's rule tests the quantity itself,
/// |value - the rule's threshold| (`threshold`). Where lower is better a uniform web makes
/// none, so the value is the size; where higher is better (a surface pressure) the size is the
/// shortfall below the threshold, which the value alone (near 0 on a slack roll) misses.
pub fn defect_size(value: f64, without: f64, threshold: Option<f64>) -> f64 {
    let shortfall = threshold.map_or(0.0, |t| (value - t).abs());
    value.abs().max(without.abs()).max(shortfall)
}

/// Whether the sources explain a finding: their total change (`value - without`, Shapley
/// efficiency: the sum of the shares, Shapley 1953) moves `q` toward the defect by more than
/// [`NEGLIGIBLE_FRACTION`] of [`defect_size`]. A total against the defect, nil or smaller than
/// that leaves the defect to the winding and storage conditions (tension, nip, speed, air wound
/// in, storage time and stance), which make no non-uniformity of their own.
pub fn explains(q: Quantity, value: f64, without: f64, threshold: Option<f64>) -> bool {
    let toward = worse_sign(q) * (value - without);
    toward > NEGLIGIBLE_FRACTION * defect_size(value, without, threshold)
}

/// The runs attribution needs, made once and shared by every finding.
pub struct Runs {
    /// Sources present (their removal changes the scenario).
    pub sources: Vec<Cause>,
    /// Outcome per subset of sources removed, by bit mask.
    pub subsets: Vec<Rc<Outcome>>,
    /// Amplifiers present, their factor and outcome.
    pub amplifiers: Vec<(Amplifier, f64, Rc<Outcome>)>,
    /// The rule features of the roll with every source removed: a finding whose deciding
    /// condition still holds there is not made by the sources.
    pub without: crate::vocab::FeatureValues,
}

/// Run every subset of source removals and every amplifier's alternative. `creep_identified`:
/// whether the measurements identify any lane's creep (else lane-to-lane creep is no source).
pub fn prepare(
    base: &Scenario,
    runner: &mut Runner,
    creep_identified: bool,
) -> Result<Runs, RunError> {
    let sources: Vec<Cause> = Cause::ALL
        .iter()
        .copied()
        .filter(|&c| c != Cause::LaneToLaneCreep || creep_identified)
        .filter(|&c| apply(base, removal(c), None, &[]) != *base)
        .collect();
    let mut scenarios = Vec::new();
    for mask in 0..1usize << sources.len() {
        let mut s = base.clone();
        for (i, &c) in sources.iter().enumerate() {
            if mask & (1 << i) != 0 {
                s = apply(&s, removal(c), None, &[]);
            }
        }
        scenarios.push(s);
    }
    let subsets = scenarios.len();
    let mut present = Vec::new();
    for (a, change, f) in AMPLIFIERS {
        let s = apply(base, change, Some(f), &[]);
        if s != *base {
            present.push((a, f));
            scenarios.push(s);
        }
    }
    let mut outcomes = runner.run_all(&scenarios)?;
    let amplified = outcomes.split_off(subsets);
    let none = &scenarios[subsets - 1];
    let without = super::features::compute(&none.case, &none.lanes, &outcomes[subsets - 1]).values;
    Ok(Runs {
        without,
        sources,
        subsets: outcomes,
        amplifiers: present
            .into_iter()
            .zip(amplified)
            .map(|((a, f), o)| (a, f, o))
            .collect(),
    })
}

/// Attribute one finding's quantity, `measure` evaluating it on an outcome. `when`: the
/// finding's rule's conditions (a threshold on the quantity itself sizes the defect:
/// [`rule_threshold`]).
pub fn attribute(
    runs: &Runs,
    quantity: Quantity,
    when: &[Condition],
    measure: &dyn Fn(&Outcome) -> f64,
) -> Attribution {
    let threshold = rule_threshold(quantity, when);
    let v: Vec<f64> = runs.subsets.iter().map(|o| measure(o)).collect();
    let n = runs.sources.len();
    let phi = shapley(n, &v);
    let (value, without) = (v[0], v[v.len() - 1]);
    let total = value - without;
    let tiny = 1e-9 * v[0].abs().max(1e-9);
    let worse = worse_sign(quantity);
    let size = defect_size(value, without, threshold);
    let holds_without = (when.first()).is_some_and(|c| c.holds(runs.without[c.feature]));
    Attribution {
        quantity,
        unit: quantity.unit(),
        value,
        value_without_sources: without,
        // the defect holding with every source removed is made by the winding and storage
        // conditions, whatever the sources add to it
        sources_explain: explains(quantity, value, without, threshold) && !holds_without,
        holds_without_sources: holds_without,
        shares: runs
            .sources
            .iter()
            .zip(&phi)
            .map(|(&cause, &p)| SourceShare {
                cause,
                contribution: p,
                share: (total.abs() > tiny).then(|| p / total),
                against_defect: worse * p < -1e-9 * size.max(1e-9),
            })
            .collect(),
        sensitivities: runs
            .amplifiers
            .iter()
            .map(|(a, f, o)| Sensitivity {
                amplifier: *a,
                factor: *f,
                value_at_alternative: measure(o),
            })
            .collect(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The glove game (Shapley 1953 style worked example): players 0 and 1 hold left gloves,
    /// player 2 a right glove; a pair is worth 1. Shapley values are 1/6, 1/6, 2/3. Here the
    /// game is stated as the loss when players are removed: v(mask) = worth of those left.
    #[test]
    fn shapley_values_of_the_glove_game() {
        let worth = |left: usize| {
            let l = (left & 1 != 0) as u8 + (left & 2 != 0) as u8;
            let r = (left & 4 != 0) as u8;
            l.min(r) as f64
        };
        let v: Vec<f64> = (0..8).map(|m| worth(!m & 7)).collect();
        let phi = shapley(3, &v);
        for (p, want) in phi.iter().zip([1.0 / 6.0, 1.0 / 6.0, 2.0 / 3.0]) {
            assert!((p - want).abs() < 1e-12, "{phi:?}");
        }
        assert!((phi.iter().sum::<f64>() - (v[0] - v[7])).abs() < 1e-12);
    }

    /// The sources explain a finding only when their total moves the quantity toward the defect
    /// by 5 % of its size (the criterion; common practice: a cause makes the non-uniformity).
    #[test]
    fn sources_explain_only_a_change_toward_the_defect() {
        let (lane, surface) = (Quantity::LaneExcessMmPerM, Quantity::SurfacePressureKpa);
        // a baggy lane made by its sources, from a uniform web's nothing
        assert!(explains(lane, 0.5, 0.0, None));
        // the same lane, whose sources make 2 % of it: the winding makes the rest
        assert!(!explains(lane, 0.5, 0.49, None));
        // sources that raise the surface pressure work against telescoping
        assert!(!explains(surface, 0.0078, 0.0, Some(20.0)));
        // sources that lower it by 0.0078 kPa of a 20 kPa shortfall are negligible
        assert!(!explains(surface, 0.0, 0.0078, Some(20.0)));
        // sources that take it from 18 kPa to 6 kPa make the shortfall
        assert!(explains(surface, 6.0, 18.0, Some(20.0)));
        // nothing changes: nothing to explain
        assert!(!explains(lane, 0.0, 0.0, None));
    }

    /// With an interaction, the interaction term is split evenly whatever the order (a game
    /// v = a + b + c ab over presences: Shapley gives a + c/2 and b + c/2).
    #[test]
    fn shapley_splits_an_interaction_evenly() {
        let (a, b, c) = (0.3, 0.5, 0.4);
        let v: Vec<f64> = (0..4)
            .map(|m: usize| {
                let (x, y) = ((m & 1 == 0) as u8 as f64, (m & 2 == 0) as u8 as f64);
                a * x + b * y + c * x * y
            })
            .collect();
        let phi = shapley(2, &v);
        assert!((phi[0] - (a + c / 2.0)).abs() < 1e-12);
        assert!((phi[1] - (b + c / 2.0)).abs() < 1e-12);
    }
}
