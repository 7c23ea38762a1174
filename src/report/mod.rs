//! Human output (comfy-table tables; the root-cause report as HTML with plotters SVG plots and as
//! Markdown) and JSON documents.
//!
//! **Invariant:** the only module that turns results into words; models and diagnosis return
//! structured data. Output is deterministic: same input, same bytes.

pub mod age_view;
pub mod case_view;
pub mod chart;
pub mod check_view;
pub mod diagnose_view;
pub mod document;
pub mod document_tables;
pub mod escape;
pub mod files;
pub mod fit_view;
pub mod html;
pub mod markdown;
pub mod plots;
pub mod report_data;
pub mod rules_view;
pub mod stress_view;
pub mod triage_view;
pub mod words;

pub use triage_view::{
    triage_json, triage_text, whatif_json, whatif_text, TriageRow, WhatIfLanesError,
};

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

/// A JSON document as printed: pretty, keys sorted, a final newline.
pub fn json_text(v: &serde_json::Value) -> Result<String, serde_json::Error> {
    let mut s = serde_json::to_string_pretty(v)?;
    s.push('\n');
    Ok(s)
}

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
