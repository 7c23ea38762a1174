//! Diagnosis: the whole chain (lanes, winding, storage, fit), features of the predicted roll, the
//! rules they fire, root-cause shares by removing each cause in turn, and each correction checked
//! by re-running the model with it applied.
//!
//! **Invariant:** returns structured findings, never prose; `report` turns them into words.

pub mod actions;
pub mod features;

use crate::case::Case;
use crate::fit::{fit_roll, FitError};
use crate::lanes::{self, Lanes};
use crate::rules::{self, Table};
use crate::storage::{AgeOptions, LaneCreep};
use crate::vocab::{Action, Cause, Defect, Feature, Likelihood};
use crate::winding::{wind, Options, WindError};
use actions::{apply, spread_mm_per_m, Change, RunError, Scenario, ABLATIONS};
use features::Features;
use serde::Serialize;

/// Diagnosis options.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DiagnoseOptions {
    /// Radial nodes of the winding model in the re-runs.
    pub nodes: usize,
    /// Whether to attribute causes and check corrections (the re-runs).
    pub what_if: bool,
}

impl Default for DiagnoseOptions {
    fn default() -> Self {
        DiagnoseOptions {
            nodes: 201,
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
}

/// A feature value that fired a rule, with the condition and its source.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Evidence {
    pub feature: Feature,
    pub value: f64,
    pub above: Option<f64>,
    pub below: Option<f64>,
    pub source: String,
}

/// A lane named in a finding.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LaneRef {
    pub index: usize,
    /// Lane centre from the front edge, m.
    pub position_m: f64,
    /// Lane length at unwind over the width-weighted mean lane, mm per m of web.
    pub excess_mm_per_m: f64,
}

/// A correction with the model re-run.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CheckedCorrection {
    pub action: Action,
    pub factor: Option<f64>,
    pub text: String,
    pub why: String,
    /// Spread of the strain at unwind before and after, mm/m.
    pub spread_before_mm_per_m: f64,
    pub spread_after_mm_per_m: f64,
}

/// A finding.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Finding {
    pub defect: Defect,
    pub rule: String,
    pub likelihood: Likelihood,
    pub weight: f64,
    pub mechanism: String,
    pub evidence: Vec<Evidence>,
    pub lanes: Vec<LaneRef>,
    /// The length difference behind the finding (its first feature), mm/m when a length.
    pub length_difference_mm_per_m: f64,
    pub corrections: Vec<CheckedCorrection>,
}

/// A cause's share of the predicted nonuniformity.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CauseShare {
    pub cause: Cause,
    /// Spread with this cause removed, mm/m.
    pub spread_without_mm_per_m: f64,
    pub share: f64,
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
    pub caliper_deviation: f64,
    pub strain_at_unwind: f64,
    pub excess_mm_per_m: f64,
    pub md_creep_scale: f64,
    pub radial_creep_scale: f64,
    pub fit_rmse: f64,
}

/// The diagnosis of one roll.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Diagnosis {
    pub case: String,
    pub title: String,
    pub rules: String,
    pub features: Features,
    pub findings: Vec<Finding>,
    pub causes: Vec<CauseShare>,
    pub agreement: Option<Agreement>,
    pub lanes: Vec<LaneResult>,
    pub spread_mm_per_m: f64,
    /// Whether the output advises action (then it carries the safety note).
    pub advises_action: bool,
    /// Wound-in interlayer pressure against radius per lane, for plotting: radii (m) and, per
    /// lane, (position m, pressure Pa at each radius).
    #[serde(skip)]
    pub pressure_curves: (Vec<f64>, Vec<(f64, Vec<f64>)>),
    pub notes: Vec<String>,
}

/// The base scenario of a diagnosed case: fitted creep per lane, storage as simulated (extended
/// to the last measurement), measurements dropped (forward runs only).
pub fn base_scenario(
    case: &Case,
    lanes: &Lanes,
    creep: Vec<LaneCreep>,
    levelling: f64,
) -> Scenario {
    let mut c = case.clone();
    let tl = crate::storage::timeline(case, &AgeOptions::default());
    c.storage = tl.stretches;
    c.profiles.clear();
    Scenario {
        case: c,
        lanes: lanes.clone(),
        levelling,
        creep,
        excluded: Vec::new(),
    }
}

/// Lanes a finding concerns (none: the whole roll).
fn lanes_for(defect: Defect, case: &Case, lanes: &Lanes, f: &Features) -> Vec<usize> {
    let w = case.roll.width_m;
    match defect {
        Defect::BaggyEdges => features::edge_lanes(lanes, w),
        Defect::BaggyCenter => features::centre_lanes(lanes, w),
        Defect::Starring | Defect::CrepeWrinkles | Defect::Telescoping | Defect::Bursts => {
            Vec::new()
        }
        Defect::BaggyLane
        | Defect::Puckers
        | Defect::Ridges
        | Defect::Corrugations
        | Defect::GaugeBands
        | Defect::NoDefect => f.peak_lanes.clone(),
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
        case,
        &lanes,
        Options {
            nodes: opt.nodes,
            ..Options::default()
        },
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

/// A correction run's identity: action, factor bits, slit lanes.
type CorrectionKey = (Action, Option<u64>, Vec<usize>);

/// Diagnose a case with a rule table.
pub fn diagnose(
    case: &Case,
    table: &Table,
    opt: &DiagnoseOptions,
) -> Result<Diagnosis, DiagnoseError> {
    let Fitted {
        lanes,
        wound,
        fit,
        creep,
    } = fitted(case, opt)?;
    let feats = features::compute(case, &lanes, &wound, &fit.aged);
    let fired = rules::evaluate(table, &feats.values);
    let base = base_scenario(case, &lanes, creep, Options::default().levelling);
    let mut notes = fit.notes.clone();
    let (base_spread, causes) = if opt.what_if {
        // the base scenario winds exactly as the fitted roll did: reuse that wound state
        let b = base.age_on(wound.clone())?;
        let s0 = spread_mm_per_m(&b.aged, &[]);
        let mut raw = Vec::new();
        for (cause, change, factor) in ABLATIONS {
            let s = apply(&base, change, factor, &[]).run(opt.nodes)?;
            let without = spread_mm_per_m(&s.aged, &[]);
            raw.push((cause, without, (s0 - without).max(0.0)));
        }
        let total: f64 = raw.iter().map(|r| r.2).sum();
        let mut causes: Vec<CauseShare> = raw
            .iter()
            .map(|&(cause, w, red)| CauseShare {
                cause,
                spread_without_mm_per_m: w,
                share: if total > 0.0 { red / total } else { 0.0 },
            })
            .collect();
        if total <= 0.0 {
            causes.push(CauseShare {
                cause: Cause::NotAttributable,
                spread_without_mm_per_m: s0,
                share: 1.0,
            });
        }
        (s0, causes)
    } else {
        (feats.get(Feature::SpreadMmPerM), Vec::new())
    };
    let mut cache: Vec<(CorrectionKey, f64)> = Vec::new();
    let mut findings = Vec::new();
    for fr in &fired {
        let r = fr.rule;
        let idx = lanes_for(r.defect, case, &lanes, &feats);
        let lane_refs: Vec<LaneRef> = idx
            .iter()
            .map(|&i| LaneRef {
                index: i,
                position_m: lanes.lanes[i].position_m,
                excess_mm_per_m: feats.excess_mm_per_m[i],
            })
            .collect();
        let mut corrections = Vec::new();
        for c in &r.corrections {
            let after = if opt.what_if {
                let slit = if c.action == Action::SlitOut {
                    idx.clone()
                } else {
                    Vec::new()
                };
                let key = (c.action, c.factor.map(f64::to_bits), slit);
                match cache.iter().find(|(k, _)| *k == key) {
                    Some((_, v)) => *v,
                    None => {
                        let s = apply(&base, Change::Correct(c.action), c.factor, &idx);
                        let out = s.run(opt.nodes)?;
                        let v = spread_mm_per_m(&out.aged, &s.excluded);
                        cache.push((key, v));
                        v
                    }
                }
            } else {
                f64::NAN
            };
            corrections.push(CheckedCorrection {
                action: c.action,
                factor: c.factor,
                text: c.text.clone(),
                why: c.why.clone(),
                spread_before_mm_per_m: base_spread,
                spread_after_mm_per_m: after,
            });
        }
        let first = r.when.first().map(|c| c.feature);
        findings.push(Finding {
            defect: r.defect,
            rule: r.id.clone(),
            likelihood: r.likelihood,
            weight: r.weight,
            mechanism: r.mechanism.clone(),
            evidence: r
                .when
                .iter()
                .zip(&fr.evidence)
                .map(|(c, &(feature, v))| Evidence {
                    feature,
                    value: v,
                    above: c.above,
                    below: c.below,
                    source: c.source.clone(),
                })
                .collect(),
            lanes: lane_refs,
            length_difference_mm_per_m: match first {
                Some(f) if f.spec().is_length => feats.get(f).abs(),
                _ => feats.get(Feature::SpreadMmPerM),
            },
            corrections,
        });
    }
    // `case` accepts only vocabulary words as the complaint
    let complaint = case.complaint.as_deref().and_then(Defect::from_word);
    let agreement = complaint.map(|c| {
        let rank = findings.iter().position(|f| f.defect == c).map(|p| p + 1);
        Agreement {
            complaint: c,
            agrees: if c == Defect::NoDefect {
                findings.is_empty()
            } else {
                rank.is_some()
            },
            rank,
        }
    });
    let last = fit.aged.times_days.len() - 1;
    let lane_results = fit
        .lanes
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
        })
        .collect();
    notes.extend(fit.aged.notes.iter().cloned());
    notes.sort();
    notes.dedup();
    let stride = (wound.radius_m.len() / 200).max(1);
    let pressure_curves = (
        wound.radius_m.iter().step_by(stride).copied().collect(),
        wound
            .lanes
            .iter()
            .map(|l| {
                (
                    l.position_m,
                    l.radial_stress_pa
                        .iter()
                        .step_by(stride)
                        .map(|s| -s)
                        .collect(),
                )
            })
            .collect(),
    );
    Ok(Diagnosis {
        pressure_curves,
        case: case.id.clone(),
        title: case.title.clone(),
        rules: table.source.clone(),
        spread_mm_per_m: feats.get(Feature::SpreadMmPerM),
        advises_action: !findings.is_empty(),
        features: feats,
        findings,
        causes,
        agreement,
        lanes: lane_results,
        notes,
    })
}

/// A what-if comparison: the case as measured and with changes applied, both run forward with the
/// creep fitted on the measured case (creep is a property of the paper, not of the change).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct WhatIf {
    pub case: String,
    pub changes: Vec<String>,
    pub spread_before_mm_per_m: f64,
    pub spread_after_mm_per_m: f64,
    /// Lane centres, m.
    pub position_m: Vec<f64>,
    /// Lane length at unwind over the mean lane, before and after, mm/m.
    pub excess_before_mm_per_m: Vec<f64>,
    pub excess_after_mm_per_m: Vec<f64>,
    /// Defects the rules predict before and after.
    pub defects_before: Vec<Defect>,
    pub defects_after: Vec<Defect>,
}

/// Compare a case with a variant of it (same lanes count expected; the variant's lanes are
/// rebuilt from its own profiles).
pub fn what_if(
    base: &Case,
    variant: &Case,
    changes: &[String],
    table: &Table,
    opt: &DiagnoseOptions,
) -> Result<WhatIf, DiagnoseError> {
    let creep = fitted(base, opt)?.creep;
    let run = |c: &Case| -> Result<(Lanes, actions::Outcome), DiagnoseError> {
        let l = lanes::build(c);
        let mut cr = creep.clone();
        cr.resize(
            l.lanes.len(),
            creep.last().copied().unwrap_or(LaneCreep {
                md: c.material.creep.md,
                radial: c.material.creep.radial,
            }),
        );
        let s = base_scenario(c, &l, cr, Options::default().levelling);
        Ok((l, s.run(opt.nodes)?))
    };
    let (lb, ob) = run(base)?;
    let (la, oa) = run(variant)?;
    let fb = features::compute(base, &lb, &ob.wound, &ob.aged);
    let fa = features::compute(variant, &la, &oa.wound, &oa.aged);
    let defects = |f: &Features| {
        let mut d: Vec<Defect> = rules::evaluate(table, &f.values)
            .iter()
            .map(|x| x.rule.defect)
            .collect();
        d.dedup();
        d
    };
    Ok(WhatIf {
        case: base.id.clone(),
        changes: changes.to_vec(),
        spread_before_mm_per_m: spread_mm_per_m(&ob.aged, &[]),
        spread_after_mm_per_m: spread_mm_per_m(&oa.aged, &[]),
        position_m: la.positions(),
        excess_before_mm_per_m: fb.excess_mm_per_m.clone(),
        excess_after_mm_per_m: fa.excess_mm_per_m.clone(),
        defects_before: defects(&fb),
        defects_after: defects(&fa),
    })
}
