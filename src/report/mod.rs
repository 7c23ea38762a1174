//! Human output (comfy-table tables, SVG plots, Markdown) and JSON documents.
//!
//! **Invariant:** the only module that turns results into words; models and diagnosis return
//! structured data. Output is deterministic: same input, same bytes.

pub mod age_view;
pub mod case_view;
pub mod diagnose_view;
pub mod fit_view;
pub mod stress_view;

use crate::units::{self, Kind, System};
use comfy_table::{presets, ContentArrangement, Table};

/// A table in the project's style.
pub fn table(headers: &[&str]) -> Table {
    let mut t = Table::new();
    t.load_style(presets::UTF8_FULL_CONDENSED)
        .set_content_arrangement(ContentArrangement::Disabled)
        .set_header(headers.iter().copied());
    t
}

/// Format an SI quantity for humans in the chosen unit system.
pub fn q(si: f64, kind: Kind, sys: System) -> String {
    units::show(si, kind, sys, false)
}

/// Format a caliper-sized length (um or mil).
pub fn fine(si: f64, sys: System) -> String {
    units::show(si, Kind::Length, sys, true)
}

/// Number with a fixed count of decimals.
pub fn f(v: f64, decimals: usize) -> String {
    format!("{v:.decimals$}")
}

/// Percent with sign, from a fraction.
pub fn pct(frac: f64, decimals: usize) -> String {
    format!("{:+.decimals$} %", frac * 100.0)
}

/// Position across the width in mm (or in), the trade's way of naming lanes.
pub fn pos(si: f64, sys: System) -> String {
    match sys {
        System::Si => format!("{:.0} mm", si * 1e3),
        System::Us => format!("{:.1} in", si / units::INCH_M),
    }
}

/// The safety note every output that advises action carries.
pub const SAFETY: &str = "Safety: rolls are heavy and can burst, telescope or fall. These findings support, and do not replace, site procedures, local codes and the judgement of qualified people; handle, wind and store rolls only as your site's procedures allow.";

/// Write a file atomically: to a temporary file beside it, then rename, so a failure never leaves
/// a partial output file.
pub fn write_atomic(path: &std::path::Path, content: &str) -> std::io::Result<()> {
    let dir = path.parent().filter(|p| !p.as_os_str().is_empty());
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| "out".into());
    let tmp = match dir {
        Some(d) => d.join(format!(".{name}.{}.tmp", std::process::id())),
        None => std::path::PathBuf::from(format!(".{name}.{}.tmp", std::process::id())),
    };
    std::fs::write(&tmp, content)?;
    std::fs::rename(&tmp, path).inspect_err(|_| {
        let _ = std::fs::remove_file(&tmp);
    })
}

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
