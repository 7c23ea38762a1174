//! The root-cause report's content in reader order, as blocks of plain text that `html` and
//! `markdown` render (and escape) the same way: headline, findings with evidence, root cause and
//! corrections, plots, tables, inputs, defaults used, provenance and the safety note.

use super::report_data::ReportData;
use super::{document_cause, document_tables};
use super::{pos, q};
use crate::units::{self, Kind, System};
use crate::vocab::{Defect, Feature};

/// A run of text, optionally bold, optionally tagged with a key (HTML `data-key`) so tests can
/// find the number.
#[derive(Debug, Clone, PartialEq)]
pub struct Span {
    pub text: String,
    pub strong: bool,
    pub key: Option<String>,
}

/// A table cell: text and an optional key.
pub type Cell = Span;

/// A block of the report.
#[derive(Debug, Clone, PartialEq)]
pub enum Block {
    /// Heading level (1..=3), text, anchor id.
    Heading(u8, String, &'static str),
    /// A paragraph.
    Para(Vec<Span>),
    /// A bulleted list of paragraphs.
    List(Vec<Vec<Span>>),
    /// A table with a header row.
    Table {
        head: Vec<String>,
        rows: Vec<Vec<Cell>>,
    },
    /// Where the plots go.
    Plots,
    /// A boxed note (the headline, the safety note).
    Boxed(Vec<Vec<Span>>),
}

/// Plain text.
pub fn t(s: impl Into<String>) -> Span {
    Span {
        text: s.into(),
        strong: false,
        key: None,
    }
}

/// Bold text.
pub fn b(s: impl Into<String>) -> Span {
    Span {
        text: s.into(),
        strong: true,
        key: None,
    }
}

/// Text carrying a key.
pub fn k(s: impl Into<String>, key: impl Into<String>) -> Span {
    Span {
        text: s.into(),
        strong: false,
        key: Some(key.into()),
    }
}

/// A defect in plain language.
fn plain(defect: &Defect) -> String {
    super::words::defect(*defect).to_string()
}

/// A length difference per length (mm/m; mil/in is the same number), two decimals.
fn per_mille(v: f64, sys: System) -> String {
    format!("{v:.2} {}", units::per_mille_label(sys))
}

/// A feature value in the unit its name carries, in the report's unit system.
pub fn feature_value(f: &Feature, v: f64, sys: System) -> String {
    let name = f.word();
    if name.ends_with("_mm_per_m") {
        format!("{v:.3} {}", units::per_mille_label(sys))
    } else if name.ends_with("_mm") {
        let d = units::display(Kind::Length, sys, false);
        format!("{:.3} {}", d.from_si(v * 1e-3), d.label)
    } else if name.ends_with("_mpa") {
        match sys {
            System::Si => format!("{v:.3} MPa"),
            System::Us => {
                let d = units::display(Kind::Pressure, sys, false);
                format!("{:.1} {}", d.from_si(v * 1e6), d.label)
            }
        }
    } else if name.ends_with("_kpa") {
        let d = units::display(Kind::Pressure, sys, false);
        format!("{:.3} {}", d.from_si(v * 1e3), d.label)
    } else if name.ends_with("_pct") {
        format!("{v:.3} %")
    } else {
        format!("{v:.3}")
    }
}

fn condition(name: &Feature, above: Option<f64>, below: Option<f64>, sys: System) -> String {
    let v = |x: f64| feature_value(name, x, sys);
    match (above, below) {
        (Some(a), Some(b)) => format!("between {} and {}", v(a), v(b)),
        (Some(a), None) => format!("above {}", v(a)),
        (None, Some(b)) => format!("below {}", v(b)),
        _ => String::new(),
    }
}

/// An evidence value `v` with its 5-95 % interval over the plausible states, where known.
fn with_spread(e: &crate::diagnose::Evidence, v: String, sys: System) -> String {
    match (e.p05, e.p95) {
        (Some(lo), Some(hi)) => format!(
            "{v} (creep 5-95 %: {} to {})",
            feature_value(&e.feature, lo, sys),
            feature_value(&e.feature, hi, sys)
        ),
        _ => v,
    }
}

/// An evidence condition `c` with where the feature stands above measurement noise, where
/// tested on the noise rolls.
fn with_noise(e: &crate::diagnose::Evidence, c: String, sys: System) -> String {
    let side = if e.above.is_some() { "above" } else { "below" };
    match e.noise_threshold {
        Some(x) => format!(
            "{c}; above noise {side} {}",
            feature_value(&e.feature, x, sys)
        ),
        None => c,
    }
}

/// The report's blocks.
pub fn build(r: &ReportData) -> Vec<Block> {
    let mut v = Vec::new();
    headline(r, &mut v);
    findings(r, &mut v);
    document_cause::root_cause(r, &mut v);
    v.push(Block::Heading(2, "Plots".into(), "plots"));
    v.push(Block::Plots);
    document_tables::tables(r, &mut v);
    document_tables::inputs(r, &mut v);
    document_tables::provenance(r, &mut v);
    v
}

fn headline(r: &ReportData, v: &mut Vec<Block>) {
    let (c, d, sys) = (r.case, r.diagnosis, r.sys);
    v.push(Block::Heading(
        1,
        format!("Root-cause report: {}", c.id),
        "top",
    ));
    if !c.title.is_empty() {
        v.push(Block::Para(vec![t(c.title.clone())]));
    }
    let mut lines = Vec::new();
    lines.push(vec![
        b("Roll: "),
        t(format!(
            "{}, {} grade, {} wide, {} diameter on a {} core, caliper {}.",
            c.id,
            format!("{:?}", c.material.grade).to_lowercase(),
            q(c.roll.width_m, Kind::Length, sys),
            q(c.roll.diameter_m, Kind::Length, sys),
            q(c.roll.core_diameter_m, Kind::Length, sys),
            super::fine(c.material.caliper_m, sys),
        )),
    ]);
    lines.push(vec![
        b("Complaint: "),
        t(match &c.complaint {
            Some(x) => format!("{}.", super::words::complaint(x)),
            None => "none stated.".into(),
        }),
    ]);
    lines.push(found_line(d, sys));
    let fit = d.confidence.model_fit();
    if fit.verdict == crate::fit::Verdict::LanesNotExplained {
        let rests = "What rests on those lanes";
        let words = super::fit_words::opening(&fit, sys, rests).unwrap_or_default();
        lines.push(vec![b("Model fit: "), t(words)]);
    }
    if let Some(line) = document_cause::main_cause(d, sys) {
        lines.push(line);
    }
    lines.push(agreement_line(d));
    v.push(Block::Boxed(lines));
}

/// The headline's "Found": what the rules found, after what the model does not explain.
fn found_line(d: &crate::diagnose::Diagnosis, sys: System) -> Vec<Span> {
    let fit = d.confidence.model_fit();
    let found = if d.findings.is_empty() && d.confidence.below_floor.is_empty() {
        "no rule fired: the roll is predicted to unwind within the rules' thresholds".to_string()
    } else if d.findings.is_empty() {
        "nothing that stands above measurement noise (see the notes for what the measurements can resolve)".to_string()
    } else {
        d.findings
            .iter()
            .map(|f| {
                format!(
                    "{} ({} likelihood, probability {:.2})",
                    plain(&f.defect),
                    f.likelihood,
                    f.probability
                )
            })
            .collect::<Vec<_>>()
            .join("; ")
    };
    let before = super::fit_words::found_prefix(&fit, sys).unwrap_or_default();
    vec![
        b("Found: "),
        t(format!(
            "{before}{found}. Predicted length spread across the width at unwind: "
        )),
        k(per_mille(d.spread_mm_per_m, sys), "spread"),
        t("."),
    ]
}

/// The headline's agreement with the complaint.
fn agreement_line(d: &crate::diagnose::Diagnosis) -> Vec<Span> {
    let caveat = super::fit_words::agreement_caveat(&d.confidence.model_fit());
    vec![
        b("Agreement with the complaint: "),
        t(match &d.agreement {
            None => "no complaint to compare with.".to_string(),
            Some(a) => match (a.agrees, a.rank) {
                (true, Some(r)) => format!("the prediction agrees (finding {r}).{caveat}"),
                (true, None) => format!("the prediction agrees (no defect predicted).{caveat}"),
                (false, _) => format!("the prediction does not show it: check the measurements, the storage history and the rules' thresholds.{caveat}"),
            },
        }),
    ]
}

fn lanes_text(f: &crate::diagnose::Finding, sys: System) -> String {
    if let Some(m) = &f.core {
        return super::note_words::core_where(m, sys);
    }
    if f.lanes.is_empty() {
        return "whole roll".into();
    }
    f.lanes
        .iter()
        .map(|l| {
            format!(
                "lane {} at {}{} ({:+.2} {})",
                l.index,
                pos(l.position_m, sys),
                if l.extrapolated { "*" } else { "" },
                l.excess_mm_per_m,
                units::per_mille_label(sys)
            )
        })
        .collect::<Vec<_>>()
        .join(", ")
}

fn findings(r: &ReportData, v: &mut Vec<Block>) {
    let (d, sys) = (r.diagnosis, r.sys);
    v.push(Block::Heading(2, "Findings".into(), "findings"));
    if d.findings.is_empty() {
        v.push(Block::Para(vec![t(super::words::no_finding(d))]));
    }
    v.push(Block::Para(vec![t(format!(
        "Probability: the share of {} plausible states of the fitted creep (posterior draws) in which the rule holds. A finding is kept only where measurement noise alone would make it with a chance of {} % or less, shared over the features tested (compared with {} uniform rolls that differ only by noise). An evidence value is that of the fitted creep; its \"creep 5-95 %\" range is over the plausible states, in which each lane's creep varies within what its readings leave uncertain, so a feature that falls as the lanes scatter (a share or a correlation across the lanes) can lie above its range.",
        d.confidence.states,
        crate::units::sig(crate::diagnose::confidence::FAMILY_LEVEL * 100.0, 2),
        d.confidence.noise_rolls
    ))]));
    for (i, f) in d.findings.iter().enumerate() {
        v.push(Block::Heading(
            3,
            format!(
                "{}. {} ({} likelihood, probability {:.2}, rule {})",
                i + 1,
                plain(&f.defect),
                f.likelihood,
                f.probability,
                f.rule
            ),
            "",
        ));
        v.push(Block::Para(vec![b("Why: "), t(f.mechanism.clone())]));
        if let Some(m) = super::diagnose_view::mechanism_split(f) {
            let m = m.trim_start_matches("Mechanism: ").to_string();
            v.push(Block::Para(vec![b("Mechanism: "), t(m)]));
        }
        v.push(Block::Para(vec![b("Where: "), t(lanes_text(f, sys))]));
        v.push(Block::Table {
            head: vec![
                "evidence".into(),
                "value".into(),
                "fires when".into(),
                "source".into(),
            ],
            rows: f
                .evidence
                .iter()
                .map(|e| {
                    vec![
                        t(e.feature.word()),
                        k(
                            with_spread(e, feature_value(&e.feature, e.value, sys), sys),
                            format!("finding{}.{}", i + 1, e.feature),
                        ),
                        t(with_noise(
                            e,
                            condition(&e.feature, e.above, e.below, sys),
                            sys,
                        )),
                        t(e.source.clone()),
                    ]
                })
                .collect(),
        });
    }
}
