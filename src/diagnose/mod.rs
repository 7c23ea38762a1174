//! Diagnosis: the whole chain (lanes, winding, storage, fit), features of the predicted roll, the
//! rules they fire, and per finding: the lanes carrying its evidence, the root cause on its own
//! quantity (`attribution`) and each correction re-run and checked on it (`corrections`).
//!
//! **Invariant:** returns structured findings, never prose; `report` turns them into words.

pub mod actions;
pub mod attribution;
mod band_place;
pub mod confidence;
mod consistency;
pub mod corrections;
mod crown;
pub mod features;
pub mod limit_noise;
pub mod local;
mod noise;
mod profile_test;
pub mod quantity;
mod states;
mod trend_scan;
mod unevenness;
pub mod unwind;
mod whatif;
mod width_means;

pub use attribution::{Attribution, RunCount};
pub use corrections::CheckedCorrection;

pub use whatif::{creep_at, what_if, WhatIf};

use crate::case::Case;
use crate::fit::{fit_roll, FitError};
use crate::lanes::{self, Lanes};
use crate::note::Note;
use crate::rules::{self, Table};
use crate::storage::{AgeOptions, LaneCreep};
use crate::vocab::{Defect, Feature, Likelihood};
use crate::winding::{wind, Options, WindError, WindInput};
use actions::{Outcome, RunError, Scenario};
use attribution::{Runner, Runs};
use features::Features;
use quantity::{locate, quantity_of, Site};
use serde::Serialize;

/// Diagnosis options.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DiagnoseOptions {
    /// Radial nodes of the winding model, for the wound state and the re-runs (default: the
    /// winding model's [`crate::winding::DEFAULT_NODES`], as `fit` and `triage` use, so every
    /// command reports the same numbers for the same roll).
    pub nodes: usize,
    /// Whether to attribute causes and check corrections (the re-runs).
    pub what_if: bool,
}

impl Default for DiagnoseOptions {
    fn default() -> Self {
        DiagnoseOptions {
            nodes: crate::winding::DEFAULT_NODES,
            what_if: true,
        }
    }
}

/// The diagnosis failed.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum DiagnoseError {
    #[error(transparent)]
    Wind(#[from] WindError),
    #[error(transparent)]
    Fit(#[from] FitError),
    #[error(transparent)]
    Run(#[from] RunError),
    /// A what-if whose change moves the lanes (their count or their centres): the comparison is
    /// lane by lane ([`what_if`]).
    #[error("the change moves the lanes ({before} before, {after} after, or not all at the same centres); a what-if compares the roll lane by lane")]
    LanesMoved { before: usize, after: usize },
}

/// A feature value that fired a rule, with the condition and its source (values in the
/// feature's own unit, which its name carries).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Evidence {
    pub feature: Feature,
    /// The value at the fitted creep.
    pub value: f64,
    pub above: Option<f64>,
    pub below: Option<f64>,
    pub source: String,
    /// 5 % and 95 % quantiles of the value over the plausible states (the creep posterior's
    /// draws; [`confidence`]): what the hardness and diameter readings leave uncertain.
    pub p05: Option<f64>,
    pub p95: Option<f64>,
    /// For the rule's deciding condition tested on the noise rolls: the value the feature must
    /// pass to stand above measurement noise (the noise-free uniform roll's value moved by the
    /// noise rolls' threshold, on the condition's side); otherwise None.
    pub noise_threshold: Option<f64>,
}

/// A lane named in a finding.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LaneRef {
    pub index: usize,
    /// Lane centre from the front edge, m.
    pub position_m: f64,
    /// Lane length at unwind over the width-weighted mean lane, mm per m of web.
    pub excess_mm_per_m: f64,
    /// Whether a profile had to be extrapolated to this lane.
    pub extrapolated: bool,
}

/// A rule naming a mechanism of a finding's defect, and the share of the plausible states in
/// which it holds ([`Finding::mechanisms`]).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MechanismShare {
    pub rule: String,
    pub mechanism: String,
    #[serde(rename = "share_fraction")]
    pub share: f64,
}

/// A finding.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Finding {
    pub defect: Defect,
    pub rule: String,
    pub likelihood: Likelihood,
    /// Share of the plausible states (posterior draws) in which the defect holds: the rule's
    /// conditions, or those of another rule that finds the same defect by the same deciding
    /// condition and names another mechanism.
    #[serde(rename = "probability_fraction")]
    pub probability: f64,
    /// The weight of the rule's likelihood label, 0..1 ([`Likelihood::weight`]).
    #[serde(rename = "weight_fraction")]
    pub weight: f64,
    pub mechanism: String,
    /// Where another rule finds the same defect by the same deciding condition and names
    /// another mechanism (drying against winding, say): each such rule, this one first, with the
    /// share of the plausible states in which it holds. Empty when no other rule does.
    pub mechanisms: Vec<MechanismShare>,
    pub evidence: Vec<Evidence>,
    pub lanes: Vec<LaneRef>,
    /// The length difference behind the finding (its first feature), mm/m when a length.
    pub length_difference_mm_per_m: f64,
    /// For a core collapse, where the core is loaded most: the window of the highest mean
    /// pressure over the core's load width ([`crate::limits::core_load`]); none otherwise.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub core: Option<crate::numeric::WindowMean>,
    /// Root cause on the finding's own quantity (None when re-runs are off).
    pub attribution: Option<Attribution>,
    /// Corrections checked on the same quantity; those that do not improve it last.
    pub corrections: Vec<CheckedCorrection>,
}

impl Finding {
    /// The order of findings, most likely first ([`likelier_first`]). `diagnose` lists its
    /// findings so, and triage ranks rolls by their first finding the same way.
    pub fn rank_cmp(&self, other: &Finding) -> std::cmp::Ordering {
        likelier_first(
            (self.likelihood, self.probability, self.weight),
            (other.likelihood, other.probability, other.weight),
        )
    }
}

/// The order of two findings given as (graded likelihood, probability, rule weight), most
/// likely first: by the grade (high, medium, low), then the probability, then the weight.
pub fn likelier_first(a: (Likelihood, f64, f64), b: (Likelihood, f64, f64)) -> std::cmp::Ordering {
    (b.0.rank().cmp(&a.0.rank()))
        .then(b.1.total_cmp(&a.1))
        .then(b.2.total_cmp(&a.2))
}

/// Does the prediction agree with what the complainant saw?
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Agreement {
    pub complaint: Defect,
    pub agrees: bool,
    /// Rank of the matching finding (1 = top), if any.
    pub rank: Option<usize>,
}

/// Per-lane result.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LaneResult {
    pub position_m: f64,
    /// Lane caliper over the mean caliper, less 1.
    #[serde(rename = "caliper_deviation_fraction")]
    pub caliper_deviation: f64,
    /// Stress-free MD strain at unwind (outer third of the web).
    #[serde(rename = "strain_at_unwind_m_per_m")]
    pub strain_at_unwind: f64,
    pub excess_mm_per_m: f64,
    pub md_creep_scale: f64,
    pub radial_creep_scale: f64,
    /// Root-mean-square fit residual in units of the measurement noise.
    #[serde(rename = "fit_rmse_noise_units")]
    pub fit_rmse: f64,
    /// Whether a profile had to be extrapolated to this lane.
    pub extrapolated: bool,
}

/// The diagnosis of one roll.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Diagnosis {
    pub case: String,
    pub title: String,
    pub rules: String,
    pub features: Features,
    pub findings: Vec<Finding>,
    /// Model runs made for the attribution and the corrections.
    pub runs: RunCount,
    pub agreement: Option<Agreement>,
    pub lanes: Vec<LaneResult>,
    pub spread_mm_per_m: f64,
    /// Whether the output advises action (then it carries the safety note): a finding, or a
    /// note that advises action ([`Note::advises_action`]: a physical limit passed).
    pub advises_action: bool,
    pub notes: Vec<Note>,
    /// Noise floor, lane intervals and misfit ([`confidence`]).
    pub confidence: confidence::Confidence,
    /// The case's own warnings from loading (words of `case`'s validation).
    pub case_warnings: Vec<String>,
}

/// The base scenario of a diagnosed case: fitted creep per lane, storage as simulated (extended
/// to the last measurement). Scenarios run forward only; they do not read measurements.
pub fn base_scenario(
    case: &Case,
    lanes: &Lanes,
    creep: Vec<LaneCreep>,
    levelling: f64,
) -> Scenario {
    let mut c = case.clone();
    let tl = crate::storage::timeline(
        &case.storage,
        &lanes.measurement_ages(),
        &AgeOptions::default(),
    );
    c.storage = tl.stretches;
    Scenario {
        case: c,
        lanes: lanes.clone(),
        levelling,
        creep,
        excluded: Vec::new(),
    }
}

/// A case wound and fitted: what diagnosis and what-if start from.
pub struct Fitted {
    pub lanes: Lanes,
    pub wound: crate::winding::Wound,
    pub fit: crate::fit::RollFit,
    /// Fitted creep per lane.
    pub creep: Vec<LaneCreep>,
}

/// Build lanes, wind and fit a case.
pub fn fitted(case: &Case, opt: &DiagnoseOptions) -> Result<Fitted, DiagnoseError> {
    let lanes = lanes::build(case);
    let wound = wind(
        &WindInput::new(&case.material, &case.roll, &case.winding),
        &lanes,
        Options::with_nodes(opt.nodes),
    )?;
    let fit = fit_roll(case, &lanes, &wound, &AgeOptions::default())?;
    let creep = fit.lanes.iter().map(|l| l.creep).collect();
    Ok(Fitted {
        lanes,
        wound,
        fit,
        creep,
    })
}

/// Diagnose a case with a rule table.
pub fn diagnose(
    case: &Case,
    table: &Table,
    opt: &DiagnoseOptions,
) -> Result<Diagnosis, DiagnoseError> {
    diagnose_fitted(case, table, opt, &fitted(case, opt)?)
}

/// Diagnose a case already wound and fitted with [`fitted`] (the report reuses the fit).
pub fn diagnose_fitted(
    case: &Case,
    table: &Table,
    opt: &DiagnoseOptions,
    fitted: &Fitted,
) -> Result<Diagnosis, DiagnoseError> {
    let Fitted {
        lanes,
        wound,
        fit,
        creep,
    } = fitted;
    let fitted_outcome = Outcome {
        wound: wound.clone(),
        aged: fit.aged.clone(),
        unwind: unwind::at_unwind(case, wound, creep, lanes),
    };
    let feats = features::compute(case, lanes, &fitted_outcome);
    let fired = rules::evaluate(table, &feats.values);
    let base = base_scenario(case, lanes, creep.clone(), Options::default().levelling);
    let identified = fit
        .lanes
        .iter()
        .any(|l| l.md_identifiable || l.radial_identifiable);
    let mut rerun = if opt.what_if {
        let mut runner = Runner::new(opt.nodes, &base, wound.clone());
        let runs = attribution::prepare(&base, &mut runner, identified)?;
        Some((runner, runs))
    } else {
        None
    };
    let mut findings = Vec::new();
    for fr in &fired {
        findings.push(finding(
            fr,
            case,
            lanes,
            &feats,
            &fitted_outcome,
            &base,
            rerun.as_mut(),
        )?);
    }
    let mut notes = fit.all_notes();
    // what the lanes can resolve bears on the findings
    let coarse = lanes
        .notes
        .iter()
        .filter(|n| matches!(n, Note::LanesCoarse { .. }));
    crate::note::push_new(&mut notes, coarse.copied());
    let confidence = confidence::assess(
        case,
        table,
        fitted,
        &feats,
        &mut findings,
        &mut notes,
        opt.nodes,
    )?;
    limit_noise::qualify(&mut notes);
    // `case` accepts only vocabulary words as the complaint
    let complaint = case.complaint.as_deref().and_then(Defect::from_word);
    let agreement = complaint.map(|c| agreement(c, &findings));
    let lane_results = lane_results(fit, lanes, &feats);
    Ok(Diagnosis {
        case: case.id.clone(),
        title: case.title.clone(),
        rules: table.source.clone(),
        spread_mm_per_m: feats.get(Feature::SpreadMmPerM),
        advises_action: !findings.is_empty() || notes.iter().any(Note::advises_action),
        features: feats,
        findings,
        runs: rerun.map(|(r, _)| r.count).unwrap_or_default(),
        agreement,
        lanes: lane_results,
        notes,
        confidence,
        case_warnings: case.warnings.clone(),
    })
}

/// A fired rule's conditions with the values they were read at, as a finding's evidence (its
/// intervals and noise threshold are filled in by [`confidence`]).
fn evidence_of(fr: &rules::Fired) -> Vec<Evidence> {
    (fr.rule.when.iter())
        .zip(&fr.evidence)
        .map(|(c, &(feature, v))| Evidence {
            feature,
            value: v,
            above: c.above,
            below: c.below,
            source: c.source.clone(),
            p05: None,
            p95: None,
            noise_threshold: None,
        })
        .collect()
}

/// The lanes `idx` as a finding names them.
fn lane_refs(idx: &[usize], lanes: &Lanes, feats: &Features) -> Vec<LaneRef> {
    (idx.iter())
        .map(|&i| LaneRef {
            index: i,
            position_m: lanes.lanes[i].position_m,
            excess_mm_per_m: feats.excess_mm_per_m[i],
            extrapolated: lanes.lanes[i].extrapolated,
        })
        .collect()
}

/// A fired rule as a finding: its evidence, the lanes that carry it, its root cause and its
/// corrections, both on the defect's own quantity. `rerun`: the runner and the attribution runs
/// (None when re-runs are off).
fn finding(
    fr: &rules::Fired,
    case: &Case,
    lanes: &Lanes,
    feats: &Features,
    fitted: &Outcome,
    base: &Scenario,
    rerun: Option<&mut (Runner, Runs)>,
) -> Result<Finding, DiagnoseError> {
    let r = fr.rule;
    let core = core_window(r.defect, case, lanes, fitted);
    let idx = match core {
        // the lanes under the core's most loaded window
        Some(m) => (0..lanes.lanes.len())
            .filter(|&i| lanes.lanes[i].right_m > m.from_m && lanes.lanes[i].left_m < m.to_m)
            .collect(),
        None => locate(r.defect, lanes, case.roll.width_m, feats, fitted),
    };
    let lane_refs = lane_refs(&idx, lanes, feats);
    let q = quantity_of(r.defect);
    let site = Site {
        lanes,
        roll: &case.roll,
        width_m: case.roll.width_m,
        at: &idx,
        excluded: &[],
    };
    let (deciding, first) = (r.when.first(), r.when.first().map(|c| c.feature));
    let (attribution, corrections) = match rerun {
        Some((runner, runs)) => {
            let a = attribution::attribute(runs, q, &r.when, &|o| site.measure(q, o));
            let b = std::rc::Rc::clone(&runs.subsets[0]);
            let c = corrections::check(
                &r.corrections,
                (q, deciding, r.defect),
                &site,
                base,
                &b,
                Some(runner),
            )?;
            (Some(a), c)
        }
        None => (
            None,
            corrections::check(
                &r.corrections,
                (q, deciding, r.defect),
                &site,
                base,
                fitted,
                None,
            )?,
        ),
    };
    Ok(Finding {
        defect: r.defect,
        rule: r.id.clone(),
        likelihood: r.likelihood,
        probability: 1.0,
        weight: r.weight,
        mechanism: r.mechanism.clone(),
        mechanisms: Vec::new(),
        evidence: evidence_of(fr),
        lanes: lane_refs,
        length_difference_mm_per_m: match first {
            Some(f) if f.spec().is_length => feats.get(f).abs(),
            _ => feats.get(Feature::SpreadMmPerM),
        },
        core,
        attribution,
        corrections,
    })
}

/// For a core collapse, the core's most loaded window ([`quantity::core_load`] over all lanes).
fn core_window(
    defect: Defect,
    case: &Case,
    lanes: &Lanes,
    o: &Outcome,
) -> Option<crate::numeric::WindowMean> {
    let all: Vec<usize> = (0..lanes.lanes.len()).collect();
    (defect == Defect::CoreCollapse)
        .then(|| quantity::core_load(&case.roll, &local::spans(lanes), &o.wound, &all))
        .flatten()
}

/// Whether the findings agree with the complaint: a finding of the defect complained of, or of
/// its kin (baggy edges and a baggy edge on one side: a complainant who saw one edge baggy may
/// write either).
fn agreement(complaint: Defect, findings: &[Finding]) -> Agreement {
    let kin = |d: Defect| {
        matches!(
            (d, complaint),
            (Defect::BaggyEdges, Defect::BaggyOneEdge) | (Defect::BaggyOneEdge, Defect::BaggyEdges)
        )
    };
    let rank = findings
        .iter()
        .position(|f| f.defect == complaint)
        .or_else(|| findings.iter().position(|f| kin(f.defect)))
        .map(|p| p + 1);
    Agreement {
        complaint,
        agrees: if complaint == Defect::NoDefect {
            findings.is_empty()
        } else {
            rank.is_some()
        },
        rank,
    }
}

/// Per-lane results of the fitted roll.
fn lane_results(fit: &crate::fit::RollFit, lanes: &Lanes, feats: &Features) -> Vec<LaneResult> {
    let last = fit.aged.last();
    fit.lanes
        .iter()
        .enumerate()
        .map(|(i, l)| LaneResult {
            position_m: l.position_m,
            caliper_deviation: lanes.lanes[i].caliper_deviation,
            strain_at_unwind: fit.aged.lanes[i].strain_at_unwind[last],
            excess_mm_per_m: feats.excess_mm_per_m[i],
            md_creep_scale: l.params.md_creep_scale,
            radial_creep_scale: l.params.radial_creep_scale,
            fit_rmse: l.rmse,
            extrapolated: lanes.lanes[i].extrapolated,
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn finding(rule: &str, likelihood: Likelihood, probability: f64, weight: f64) -> Finding {
        Finding {
            defect: Defect::BaggyLane,
            rule: rule.into(),
            likelihood,
            probability,
            weight,
            mechanism: String::new(),
            mechanisms: Vec::new(),
            evidence: Vec::new(),
            lanes: Vec::new(),
            length_difference_mm_per_m: 0.0,
            core: None,
            attribution: None,
            corrections: Vec::new(),
        }
    }

    /// Findings are listed by graded likelihood first: a high finding before a medium one of
    /// a rule with the same label weight and probability, and before a medium one whose
    /// probability times weight is larger; then by probability, then by the label's weight.
    #[test]
    fn findings_rank_by_graded_likelihood_then_probability_then_weight() {
        let mut f = [
            finding("medium-sure", Likelihood::Medium, 1.0, 0.8),
            finding("low", Likelihood::Low, 1.0, 0.8),
            finding("high-less-sure", Likelihood::High, 0.9, 0.5),
            finding("medium-lower-label", Likelihood::Medium, 1.0, 0.5),
            finding("high", Likelihood::High, 1.0, 0.8),
            finding("medium-less-sure", Likelihood::Medium, 0.7, 0.8),
        ];
        f.sort_by(Finding::rank_cmp);
        let order: Vec<&str> = f.iter().map(|x| x.rule.as_str()).collect();
        assert_eq!(
            order,
            [
                "high",
                "high-less-sure",
                "medium-sure",
                "medium-lower-label",
                "medium-less-sure",
                "low"
            ]
        );
    }
}
