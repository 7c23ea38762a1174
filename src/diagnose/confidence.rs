//! Confidence of a diagnosis: a noise floor per rule feature, a probability per finding, lane
//! lengths with intervals, and how well the model explains each lane's measurements.
//!
//! - **States.** Each lane's creep posterior ([`crate::fit::posterior`]) gives draws; state k takes
//!   draw k of every lane (the lanes' posteriors are independent given the pooled scales) and runs
//!   the roll through storage to unwind. A finding's probability is the share of states in which
//!   every condition of its rule holds; each lane's length at unwind gets a standard deviation and
//!   5 %/95 % quantiles over the states.
//! - **Noise floor.** [`NOISE_ROLLS`] uniform rolls with the case's lanes, winding and storage
//!   that differ only by measurement noise: calipers drawn from the caliper repeatability at the
//!   profile readings (put on the lanes as the readings are), lane creep scales moved from the
//!   pooled scales as far as a draw of the lane's own posterior lies from its fit (what the
//!   hardness and diameter reading noise leaves unresolved; zero for a scale the data do not
//!   identify, which the fit keeps at the pooled value). A finding stands above the floor when the
//!   noise-free uniform roll already
//!   fires its rule (the pattern comes from winding or storage, not from the lanes), or when at
//!   most [`NULL_SHARE`] of the noise rolls fire the rule with its deciding feature (the first
//!   condition) at least as far from the uniform roll's (a one-sided test under "noise only";
//!   with 24 rolls, at most one). A finding whose rule
//!   holds in fewer than half of the plausible states is dropped with a note too.
//!   Findings below the floor are dropped with a note; a note states the resolution (the 95 %
//!   quantile of what noise does to a caliper band, a lane's excess and centre against edges).
//! - **Grading.** Likelihood from the probability (high at 0.9 or more, medium at 0.6, else low),
//!   never above the rule's own label, and high only when no noise roll fires it as strongly.
//! - **Consistency.** A lane whose fit misfit (root-mean-square residual in noise units) exceeds
//!   [`MISFIT_LIMIT`] is not explained; so is the roll when its pooled misfit does. Findings on
//!   such lanes, or on lanes with a scale the data do not identify, are named in notes.
//!
//! Determinism: noise draws come from ChaCha8 seeded by [`crate::fit::posterior::seed_for`] of the
//! case id and a fixed offset; every loop runs in a fixed order.
//!
//! **Invariant:** no prose; notes carry numbers (positions in m, lengths in mm per m of web).

use super::features::{self, Features};
use super::{DiagnoseError, Finding, Fitted};
use crate::case::{Case, Measure};
use crate::fit::{creep_from, posterior, prepared, with_lab_creep, FitError};
use crate::lanes::Lanes;
use crate::note::Note;
use crate::rules::{Rule, Table};
use crate::storage::{age_prepared, AgeOptions, LaneCreep};
use crate::vocab::{Feature, FeatureValues, Likelihood};
use crate::winding::{wind, Options, WindInput};
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use serde::Serialize;

/// Uniform rolls made of measurement noise alone.
pub const NOISE_ROLLS: usize = 24;
/// Quantile of the noise-only deviations that sets the floor.
pub const FLOOR_QUANTILE: f64 = 0.95;
/// Misfit (root-mean-square residual in noise units) above which a lane is not explained.
pub const MISFIT_LIMIT: f64 = 3.0;
/// Most winding nodes of a noise roll (floors are differences between rolls at the same nodes).
pub const NOISE_NODES: usize = 61;
/// Largest share of noise rolls that may fire a finding as strongly for it to stand above noise
/// (a one-sided test at 5 %).
pub const NULL_SHARE: f64 = 0.05;
/// Seed offset of the noise rolls (distinct from any lane index of the sampler).
const NOISE_SEED_LANE: usize = 1 << 20;

/// A lane's length at unwind with its spread over the plausible states.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LaneSpread {
    /// Lane centre, m.
    pub position_m: f64,
    /// Length at unwind over the width-weighted mean lane (fitted optimum), mm per m of web.
    pub excess_mm_per_m: f64,
    /// Standard deviation over the posterior states, mm/m.
    pub excess_mm_per_m_sd: f64,
    /// 5 % and 95 % quantiles over the posterior states, mm/m.
    pub excess_mm_per_m_p05: f64,
    pub excess_mm_per_m_p95: f64,
    /// Root-mean-square fit residual in units of the measurement noise (1 = noise level).
    pub misfit: f64,
    /// Misfit at or below [`MISFIT_LIMIT`].
    pub explained: bool,
}

/// What measurement noise alone makes of a feature.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FeatureFloor {
    pub feature: Feature,
    /// Value on the noise-free uniform roll (feature's own unit).
    pub uniform: f64,
    /// 95 % quantile of |noisy - uniform| over the noise rolls (feature's own unit).
    pub floor: f64,
}

/// Confidence of a diagnosis.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Confidence {
    /// One-sigma caliper repeatability used, m, and where it came from.
    pub caliper_repeatability_m: f64,
    pub caliper_repeatability_source: String,
    /// Posterior states run to unwind.
    pub states: usize,
    /// Noise-only uniform rolls.
    pub noise_rolls: usize,
    /// Floor of each deciding feature of the table's rules.
    pub floors: Vec<FeatureFloor>,
    pub lanes: Vec<LaneSpread>,
    /// Root-mean-square residual of every reading of the roll, noise units.
    pub roll_misfit: f64,
    /// Rules whose finding was dropped below the noise floor.
    pub below_floor: Vec<String>,
}

/// The caliper repeatability of a case, m, and its source.
fn caliper_repeatability(case: &Case) -> (f64, String) {
    match case.caliper_repeatability_m {
        Some(v) => (v, "case file".into()),
        None => {
            let d = crate::case::defaults::CALIPER_REPEAT;
            let v = crate::units::parse(d.text, crate::units::Kind::Length).unwrap_or(1e-6);
            (v, d.source.to_string())
        }
    }
}

/// A standard normal draw (Box-Muller).
fn normal(rng: &mut ChaCha8Rng) -> f64 {
    let u1: f64 = rng.random::<f64>().max(1e-300);
    let u2: f64 = rng.random::<f64>();
    (-2.0 * u1.ln()).sqrt() * (std::f64::consts::TAU * u2).cos()
}

/// Assess a diagnosis: drop findings below the noise floor, give each a probability and a graded
/// likelihood, and add notes on resolution and consistency. Returns the confidence.
pub fn assess(
    case: &Case,
    table: &Table,
    fitted: &Fitted,
    feats: &Features,
    findings: &mut Vec<Finding>,
    notes: &mut Vec<Note>,
    nodes: usize,
) -> Result<Confidence, DiagnoseError> {
    let (lab, _) = with_lab_creep(case)?;
    let states = posterior_states(&lab, fitted)?;
    let fl = noise_floor(&lab, fitted, table, nodes)?;
    let mut below_floor = drop_below_floor(table, feats, &fl, findings, notes);
    grade_findings(table, feats, &fl, &states, findings);
    findings.retain(|f| {
        let keep = f.probability >= 0.5;
        if !keep {
            below_floor.push(f.rule.clone());
            notes.push(Note::Unlikely {
                defect: f.defect,
                probability: f.probability,
            });
        }
        keep
    });
    findings.sort_by(|a, b| (b.probability * b.weight).total_cmp(&(a.probability * a.weight)));
    notes.push(fl.resolution);
    let lanes = lane_spreads(fitted, feats, &states);
    let roll_misfit = roll_misfit(fitted);
    consistency_notes(fitted, &lanes, roll_misfit, findings, notes);
    let (rep, source) = caliper_repeatability(case);
    Ok(Confidence {
        caliper_repeatability_m: rep,
        caliper_repeatability_source: source,
        states: states.len(),
        noise_rolls: NOISE_ROLLS,
        floors: fl.floors,
        lanes,
        roll_misfit,
        below_floor,
    })
}

/// Whether the noise-free uniform roll fires the rule's deciding condition, and the rule's floor
/// and the share of noise rolls that fire it as strongly ([`noise_share`]).
fn floor_test(r: &Rule, feats: &Features, fl: &Floor) -> (bool, (f64, f64)) {
    let own = r
        .when
        .first()
        .and_then(|c| {
            fl.floors
                .iter()
                .find(|x| x.feature == c.feature)
                .map(|x| c.holds(x.uniform))
        })
        .unwrap_or(true);
    (own, noise_share(r, feats, fl))
}

/// Drop the findings that do not stand above the noise floor, with a note each; their rules.
fn drop_below_floor(
    table: &Table,
    feats: &Features,
    fl: &Floor,
    findings: &mut Vec<Finding>,
    notes: &mut Vec<Note>,
) -> Vec<String> {
    let mut below = Vec::new();
    findings.retain(|f| {
        let Some(r) = table.rules.iter().find(|r| r.id == f.rule) else {
            return true;
        };
        let (own, (share, _)) = floor_test(r, feats, fl);
        let keep = own || share <= NULL_SHARE;
        if !keep {
            below.push(f.rule.clone());
            let c = r.when.first();
            if let Some((c, x)) = c.and_then(|c| {
                fl.floors
                    .iter()
                    .find(|x| x.feature == c.feature)
                    .map(|x| (c, x))
            }) {
                notes.push(Note::BelowNoiseFloor {
                    defect: f.defect,
                    feature: c.feature,
                    value: feats.get(c.feature),
                    uniform: x.uniform,
                    floor: x.floor,
                    noise_share: share,
                });
            }
        }
        keep
    });
    below
}

/// Each finding's probability over the states and its likelihood graded from it.
fn grade_findings(
    table: &Table,
    feats: &Features,
    fl: &Floor,
    states: &[State],
    findings: &mut [Finding],
) {
    for f in findings.iter_mut() {
        let Some(r) = table.rules.iter().find(|r| r.id == f.rule) else {
            continue;
        };
        let holds = states
            .iter()
            .filter(|s| r.when.iter().all(|c| c.holds(s.values[c.feature])))
            .count();
        f.probability = holds as f64 / states.len().max(1) as f64;
        let (own, (share, _)) = floor_test(r, feats, fl);
        f.likelihood = grade(f.probability, own || share == 0.0, r.likelihood);
    }
}

/// Likelihood from a probability, capped by the rule's label; high needs a clear margin (no noise
/// roll fires the rule as strongly, or the noise-free uniform roll fires it).
fn grade(p: f64, wide: bool, label: Likelihood) -> Likelihood {
    let rank = |l: Likelihood| match l {
        Likelihood::High => 2,
        Likelihood::Medium => 1,
        Likelihood::Low => 0,
    };
    let g = if p >= 0.9 && wide {
        Likelihood::High
    } else if p >= 0.6 {
        Likelihood::Medium
    } else {
        Likelihood::Low
    };
    if rank(g) <= rank(label) {
        g
    } else {
        label
    }
}

/// Feature values of one posterior state and its lane lengths.
struct State {
    values: FeatureValues,
    excess_mm_per_m: Vec<f64>,
}

/// The roll run to unwind with draw k of every lane's posterior, for every k.
fn posterior_states(lab: &Case, fitted: &Fitted) -> Result<Vec<State>, DiagnoseError> {
    let count = fitted
        .fit
        .lanes
        .iter()
        .map(|l| l.draws.len())
        .min()
        .unwrap_or(0);
    let (prep, map) = prepared(lab, &fitted.lanes, &fitted.wound, &AgeOptions::default())?;
    let mut out = Vec::with_capacity(count);
    for k in 0..count {
        let creep: Vec<LaneCreep> = fitted.fit.lanes.iter().map(|l| l.draws[k]).collect();
        let aged = age_prepared(&lab.material, &prep, &fitted.wound, Some(&creep), &map)
            .map_err(FitError::from)?;
        let f = features::compute(lab, &fitted.lanes, &fitted.wound, &aged);
        out.push(State {
            values: f.values,
            excess_mm_per_m: f.excess_mm_per_m,
        });
    }
    Ok(out)
}

/// What noise alone makes: floors of the deciding features, the resolution note, and the feature
/// values of every noise roll.
struct Floor {
    floors: Vec<FeatureFloor>,
    resolution: Note,
    rolls: Vec<FeatureValues>,
}

/// Share of the noise rolls in which the rule fires with its deciding feature at least as far
/// from the uniform roll's as in `feats` (a one-sided p-value under "noise only"), and that
/// distance in `feats`.
fn noise_share(r: &Rule, feats: &Features, fl: &Floor) -> (f64, f64) {
    let Some(c) = r.when.first() else {
        return (0.0, 0.0);
    };
    let Some(u) = fl.floors.iter().find(|x| x.feature == c.feature) else {
        return (0.0, 0.0);
    };
    let d = (feats.get(c.feature) - u.uniform).abs();
    let n = fl
        .rolls
        .iter()
        .filter(|v| {
            r.when.iter().all(|k| k.holds(v[k.feature])) && (v[c.feature] - u.uniform).abs() >= d
        })
        .count();
    (n as f64 / fl.rolls.len().max(1) as f64, d)
}

/// Lanes of a uniform roll: every caliper profile set to its mean plus `noise` (one draw per
/// reading, m; none for the noise-free roll) and put on the lanes as the case's own profiles are
/// (so lanes average or interpolate the noise as they do the readings); without a caliper profile
/// the lanes' own deviations are drawn with `lane_sigma` (fraction).
fn uniform_lanes(lab: &Case, lanes: &Lanes, noise: Option<(&mut ChaCha8Rng, f64)>) -> Lanes {
    let has_profile = lab.profiles.iter().any(|p| p.what == Measure::Caliper);
    let mut rng_sigma = noise;
    if has_profile {
        let mut c = lab.clone();
        for p in c.profiles.iter_mut().filter(|p| p.what == Measure::Caliper) {
            let m = p.values.iter().sum::<f64>() / p.values.len().max(1) as f64;
            for v in p.values.iter_mut() {
                *v = m + rng_sigma.as_mut().map_or(0.0, |(r, s)| *s * normal(r));
            }
        }
        return crate::lanes::build(&c);
    }
    let mut l = lanes.clone();
    for lane in l.lanes.iter_mut() {
        let d = rng_sigma.as_mut().map_or(0.0, |(r, s)| {
            *s / lanes.mean_caliper_m.max(1e-12) * normal(r)
        });
        lane.caliper_deviation = d;
        lane.caliper_m = lanes.mean_caliper_m * (1.0 + d);
    }
    l
}

/// A roll on `lanes` wound at `nodes` and run through storage with `creep` per lane: its features.
fn roll_features(
    lab: &Case,
    lanes: &Lanes,
    creep: &[LaneCreep],
    nodes: usize,
) -> Result<Features, DiagnoseError> {
    let wound = wind(
        &WindInput::new(&lab.material, &lab.roll, &lab.winding),
        lanes,
        Options {
            nodes,
            ..Options::default()
        },
    )?;
    let (prep, map) = prepared(lab, lanes, &wound, &AgeOptions::default())?;
    let aged =
        age_prepared(&lab.material, &prep, &wound, Some(creep), &map).map_err(FitError::from)?;
    Ok(features::compute(lab, lanes, &wound, &aged))
}

/// Creep per lane of a noise-only roll: the pooled log-scales moved by one of the lane's own
/// posterior draws' deviations from its fitted log-scales (a random draw per lane), so the
/// correlation of the two scales is kept; a scale the data do not identify does not move.
fn noisy_creep(lab: &Case, fit: &crate::fit::RollFit, rng: &mut ChaCha8Rng) -> Vec<LaneCreep> {
    let pooled = [
        fit.pooled_md_creep_scale.ln(),
        fit.pooled_radial_creep_scale.ln(),
    ];
    fit.lanes
        .iter()
        .map(|l| {
            let n = l.draws_theta.len();
            let t = if n == 0 {
                pooled
            } else {
                let d = l.draws_theta[rng.random_range(0..n)];
                [0, 1].map(|i| pooled[i] + d[i] - l.theta[i])
            };
            creep_from(&lab.material, &t)
        })
        .collect()
}

/// Floors of the deciding features of `table`'s rules from [`NOISE_ROLLS`] noise-only uniform
/// rolls (wound at no more than [`NOISE_NODES`] nodes, run in parallel, drawn in a fixed order),
/// and the resolution note.
fn noise_floor(
    lab: &Case,
    fitted: &Fitted,
    table: &Table,
    nodes: usize,
) -> Result<Floor, DiagnoseError> {
    use rayon::prelude::*;
    let fit = &fitted.fit;
    let nodes = nodes.min(NOISE_NODES);
    let (rep, _) = caliper_repeatability(lab);
    let l0 = uniform_lanes(lab, &fitted.lanes, None);
    let none = noisy_creep(lab, fit, &mut ChaCha8Rng::seed_from_u64(0)).len();
    let pooled = creep_from(
        &lab.material,
        &[
            fit.pooled_md_creep_scale.ln(),
            fit.pooled_radial_creep_scale.ln(),
        ],
    );
    let clean = roll_features(lab, &l0, &vec![pooled; none], nodes)?;
    let mut rng = ChaCha8Rng::seed_from_u64(posterior::seed_for(&lab.id, NOISE_SEED_LANE));
    let inputs: Vec<(Lanes, Vec<LaneCreep>)> = (0..NOISE_ROLLS)
        .map(|_| {
            let l = uniform_lanes(lab, &fitted.lanes, Some((&mut rng, rep)));
            (l, noisy_creep(lab, fit, &mut rng))
        })
        .collect();
    let rolls: Vec<Features> = inputs
        .par_iter()
        .map(|(l, c)| roll_features(lab, l, c, nodes))
        .collect::<Result<_, _>>()?;
    let floor_of = |x: Feature| {
        let mut v: Vec<f64> = rolls
            .iter()
            .map(|f| (f.get(x) - clean.get(x)).abs())
            .collect();
        v.sort_by(f64::total_cmp);
        posterior::quantile(&v, FLOOR_QUANTILE)
    };
    let mut floors: Vec<FeatureFloor> = Vec::new();
    for c in table.rules.iter().filter_map(|r| r.when.first()) {
        if !floors.iter().any(|x| x.feature == c.feature) {
            floors.push(FeatureFloor {
                feature: c.feature,
                uniform: clean.get(c.feature),
                floor: floor_of(c.feature),
            });
        }
    }
    let resolution = Note::Resolution {
        caliper_repeatability_m: rep,
        band_m: floor_of(Feature::CaliperRangePct) / 100.0 * fitted.lanes.mean_caliper_m,
        lane_excess_mm_per_m: floor_of(Feature::LocalPeakMmPerM),
        centre_edges_mm_per_m: floor_of(Feature::CentreMinusEdgesMmPerM),
    };
    Ok(Floor {
        floors,
        resolution,
        rolls: rolls.into_iter().map(|f| f.values).collect(),
    })
}

/// Each lane's length at unwind with its spread over the states, and its misfit.
fn lane_spreads(fitted: &Fitted, feats: &Features, states: &[State]) -> Vec<LaneSpread> {
    fitted
        .fit
        .lanes
        .iter()
        .enumerate()
        .map(|(i, l)| {
            let mut v: Vec<f64> = states.iter().map(|s| s.excess_mm_per_m[i]).collect();
            v.sort_by(f64::total_cmp);
            let m = v.iter().sum::<f64>() / v.len().max(1) as f64;
            let var =
                v.iter().map(|x| (x - m).powi(2)).sum::<f64>() / (v.len() as f64 - 1.0).max(1.0);
            LaneSpread {
                position_m: l.position_m,
                excess_mm_per_m: feats.excess_mm_per_m[i],
                excess_mm_per_m_sd: var.sqrt(),
                excess_mm_per_m_p05: posterior::quantile(&v, 0.05),
                excess_mm_per_m_p95: posterior::quantile(&v, 0.95),
                misfit: l.rmse,
                explained: l.rmse <= MISFIT_LIMIT,
            }
        })
        .collect()
}

/// Root-mean-square normalised residual over every reading of the roll.
fn roll_misfit(fitted: &Fitted) -> f64 {
    let r: Vec<f64> = fitted
        .fit
        .lanes
        .iter()
        .flat_map(|l| l.residuals.iter().map(|r| r.normalised))
        .collect();
    if r.is_empty() {
        0.0
    } else {
        (r.iter().map(|x| x * x).sum::<f64>() / r.len() as f64).sqrt()
    }
}

/// Notes on lanes and a roll the model does not explain, and on findings resting on them.
fn consistency_notes(
    fitted: &Fitted,
    lanes: &[LaneSpread],
    roll_misfit: f64,
    findings: &[Finding],
    notes: &mut Vec<Note>,
) {
    for l in lanes.iter().filter(|l| !l.explained) {
        notes.push(Note::LaneNotExplained {
            position_m: l.position_m,
            misfit: l.misfit,
        });
    }
    if roll_misfit > MISFIT_LIMIT {
        notes.push(Note::RollNotExplained {
            misfit: roll_misfit,
        });
    }
    for f in findings {
        let unexplained = f.lanes.iter().filter(|r| !lanes[r.index].explained).count();
        let unidentified = f
            .lanes
            .iter()
            .filter(|r| {
                let l = &fitted.fit.lanes[r.index];
                !(l.md_identifiable && l.radial_identifiable)
            })
            .count();
        if unexplained + unidentified > 0 {
            notes.push(Note::FindingOnWeakLanes {
                defect: f.defect,
                lanes: f.lanes.len(),
                unexplained,
                unidentified,
            });
        }
    }
}
