//! `triage` and `whatif` output: many rolls in one table, and a roll against a changed copy.

use super::{pos, table, SAFETY};
use crate::units::System;

/// One roll in a triage.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct TriageRow {
    pub file: String,
    pub case: String,
    pub spread_mm_per_m: f64,
    pub top_likelihood: f64,
    pub defects: Vec<String>,
    pub complaint: Option<String>,
    pub agrees: Option<bool>,
    pub error: Option<String>,
}

impl TriageRow {
    /// A diagnosed roll.
    pub fn from_diagnosis(file: &std::path::Path, d: &crate::diagnose::Diagnosis) -> Self {
        let mut defects: Vec<String> = d.findings.iter().map(|f| f.defect.clone()).collect();
        defects.dedup();
        TriageRow {
            file: file.display().to_string(),
            case: d.case.clone(),
            spread_mm_per_m: d.spread_mm_per_m,
            top_likelihood: d.findings.first().map(|f| f.weight).unwrap_or(0.0),
            defects,
            complaint: d.agreement.as_ref().map(|a| a.complaint.clone()),
            agrees: d.agreement.as_ref().map(|a| a.agrees),
            error: None,
        }
    }
    /// A roll that could not be diagnosed.
    pub fn failed(file: &std::path::Path, e: &str) -> Self {
        TriageRow {
            file: file.display().to_string(),
            case: String::new(),
            spread_mm_per_m: 0.0,
            top_likelihood: 0.0,
            defects: Vec::new(),
            complaint: None,
            agrees: None,
            error: Some(e.to_string()),
        }
    }
    /// Ranking: failures first, then likelihood, then spread.
    pub fn rank_key(&self) -> f64 {
        if self.error.is_some() {
            1e9
        } else {
            self.top_likelihood * 1e3 + self.spread_mm_per_m
        }
    }
}

/// Triage table.
pub fn triage_text(rows: &[TriageRow]) -> String {
    let mut t = table(&[
        "roll",
        "file",
        "spread mm/m",
        "likely defects",
        "complaint",
        "agrees",
    ]);
    for r in rows {
        t.add_row(vec![
            r.case.clone(),
            r.file.clone(),
            if r.error.is_some() {
                "-".into()
            } else {
                format!("{:.2}", r.spread_mm_per_m)
            },
            match &r.error {
                Some(e) => format!("error: {}", e.lines().next().unwrap_or("")),
                None if r.defects.is_empty() => "none".into(),
                None => r
                    .defects
                    .iter()
                    .map(|d| crate::defects::plain(d))
                    .collect::<Vec<_>>()
                    .join(", "),
            },
            r.complaint
                .as_deref()
                .map(crate::defects::plain)
                .unwrap_or_default(),
            match r.agrees {
                Some(true) => "yes".into(),
                Some(false) => "no".into(),
                None => String::new(),
            },
        ]);
    }
    format!("{t}\nTriage uses the fast settings (no corrections re-run); run `rollsleuth diagnose CASE` on a roll for the full report.\n{SAFETY}\n")
}

/// What-if comparison text.
pub fn whatif_text(w: &crate::diagnose::WhatIf, sys: System) -> String {
    let mut t = table(&["lane", "before mm/m", "after mm/m"]);
    for i in 0..w.position_m.len() {
        t.add_row(vec![
            pos(w.position_m[i], sys),
            w.excess_before_mm_per_m
                .get(i)
                .map(|v| format!("{v:+.2}"))
                .unwrap_or_default(),
            format!("{:+.2}", w.excess_after_mm_per_m[i]),
        ]);
    }
    let list = |d: &[String]| {
        if d.is_empty() {
            "none".to_string()
        } else {
            d.iter()
                .map(|x| crate::defects::plain(x))
                .collect::<Vec<_>>()
                .join(", ")
        }
    };
    format!(
        "What if, case {}: {}\nPredicted length spread at unwind: {:.2} -> {:.2} mm per m of web.\nLikely defects: {} -> {}.\n{t}\nLane length at unwind over the width-weighted mean lane; creep as fitted on the measured roll.\n{SAFETY}\n",
        w.case,
        w.changes.join(", "),
        w.spread_before_mm_per_m,
        w.spread_after_mm_per_m,
        list(&w.defects_before),
        list(&w.defects_after),
    )
}
