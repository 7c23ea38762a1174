//! `diagnose` terminal and JSON output: findings with evidence, causes, corrections checked. The
//! root-cause report files are in `document`, `html`, `markdown` and `plots`.

use super::words;
use super::{pos, short, strain_unit, table, SAFETY};

/// Longest source text in a table cell (the full text is in --json and the report).
const SOURCE_CHARS: usize = 60;
use crate::diagnose::{CauseShare, Diagnosis, Finding};
use crate::units::System;
use crate::vocab::Feature;
use serde_json::{json, Value};
use std::fmt::Write;

fn cond(feature: Feature, above: Option<f64>, below: Option<f64>, sys: System) -> String {
    let v = |x: f64| words::feature_value(feature, x, sys);
    match (above, below) {
        (Some(a), Some(b)) => format!("between {} and {}", v(a), v(b)),
        (Some(a), None) => format!("above {}", v(a)),
        (None, Some(b)) => format!("below {}", v(b)),
        _ => String::new(),
    }
}

fn lanes_text(lanes: &[crate::diagnose::LaneRef], sys: System) -> String {
    if lanes.is_empty() {
        return "whole roll".into();
    }
    lanes
        .iter()
        .map(|l| {
            format!(
                "{} ({:+.2} {})",
                pos(l.position_m, sys),
                l.excess_mm_per_m,
                strain_unit(sys)
            )
        })
        .collect::<Vec<_>>()
        .join(", ")
}

/// Human diagnosis.
pub fn text(d: &Diagnosis, sys: System) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "Diagnosis of case {}: {}", d.case, d.title);
    let _ = writeln!(
        out,
        "Predicted length spread across the width at unwind: {:.2} {} of web ({} lanes; rules: {}).",
        d.spread_mm_per_m,
        match sys {
            System::Si => "mm per metre",
            System::Us => "mil per inch",
        },
        d.lanes.len(),
        d.rules
    );
    if d.findings.is_empty() {
        let _ = writeln!(out, "\nNo finding: no rule fired. The roll is predicted to unwind within the rules' thresholds.");
    }
    for (k, f) in d.findings.iter().enumerate() {
        out.push_str(&finding_text(k + 1, f, sys));
    }
    if !d.causes.is_empty() {
        let _ = writeln!(
            out,
            "\nRoot cause (each cause removed in turn):\n{}",
            causes_table(&d.causes, sys)
        );
    }
    if let Some(a) = &d.agreement {
        let _ = writeln!(
            out,
            "Complaint: {}. {}",
            words::defect(a.complaint),
            match (a.agrees, a.rank) {
                (true, Some(r)) => format!("The prediction agrees (finding {r})."),
                (true, None) => "The prediction agrees (no defect predicted).".into(),
                (false, _) => "The prediction does not show it: check the measurements, the storage history and the rules' thresholds.".into(),
            }
        );
    }
    for n in words::notes(d) {
        let _ = writeln!(out, "note: {n}");
    }
    if d.advises_action {
        let _ = writeln!(out, "\n{SAFETY}");
    }
    out
}

/// One finding: defect, mechanism, lanes, evidence and corrections checked.
fn finding_text(rank: usize, f: &Finding, sys: System) -> String {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "\n{rank}. {} ({} likelihood; rule {})",
        words::defect(f.defect),
        f.likelihood,
        f.rule
    );
    let _ = writeln!(out, "   Why: {}", f.mechanism);
    let _ = writeln!(out, "   Where: {}", lanes_text(&f.lanes, sys));
    let mut t = table(&["evidence", "value", "fires when", "source"]);
    for e in &f.evidence {
        t.add_row(vec![
            words::feature(e.feature).to_string(),
            words::feature_value(e.feature, e.value, sys),
            cond(e.feature, e.above, e.below, sys),
            short(&e.source, SOURCE_CHARS),
        ]);
    }
    let _ = writeln!(out, "{t}");
    if !f.corrections.is_empty() {
        let unit = strain_unit(sys);
        let before = format!("spread before {unit}");
        let after = format!("after {unit}");
        let mut c = table(&["correction", &before, &after, "why"]);
        for x in &f.corrections {
            c.add_row(vec![
                x.text.clone(),
                format!("{:.2}", x.spread_before_mm_per_m),
                if x.spread_after_mm_per_m.is_finite() {
                    format!("{:.2}", x.spread_after_mm_per_m)
                } else {
                    "not run".into()
                },
                x.why.clone(),
            ]);
        }
        let _ = writeln!(out, "{c}");
    }
    out
}

/// Root-cause shares as a table.
fn causes_table(causes: &[CauseShare], sys: System) -> comfy_table::Table {
    let without = format!("spread without it {}", strain_unit(sys));
    let mut c = table(&["cause", "removed as", &without, "share"]);
    for x in causes {
        c.add_row(vec![
            words::cause(x.cause).to_string(),
            words::removed(x.cause).to_string(),
            format!("{:.2}", x.spread_without_mm_per_m),
            format!("{:.0} %", x.share * 100.0),
        ]);
    }
    c
}

/// A cause share in JSON: the cause and how it was removed, in words.
fn cause_json(c: &CauseShare) -> Value {
    json!({
        "cause": words::cause(c.cause),
        "removed": words::removed(c.cause),
        "spread_without_mm_per_m": c.spread_without_mm_per_m,
        "share": c.share,
    })
}

/// JSON diagnosis.
pub fn json(d: &Diagnosis) -> Value {
    json!({
        "case": d.case,
        "rules": d.rules,
        "spread_mm_per_m": d.spread_mm_per_m,
        "findings": d.findings,
        "causes": d.causes.iter().map(cause_json).collect::<Vec<_>>(),
        "agreement": d.agreement,
        "features": d.features.values,
        "lanes": d.lanes,
        "notes": words::notes(d),
        "safety": if d.advises_action { Some(SAFETY) } else { None },
    })
}
