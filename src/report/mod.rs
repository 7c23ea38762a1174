//! Human output (comfy-table tables; the root-cause report as HTML with plotters SVG plots and as
//! Markdown) and JSON documents.
//!
//! **Invariant:** the only module that turns results into words; models and diagnosis return
//! structured data. Output is deterministic: same input, same bytes.

pub mod age_view;
pub mod case_view;
mod cause_words;
pub mod chart;
pub mod check_view;
pub mod diagnose_view;
pub mod document;
pub mod document_cause;
pub mod document_tables;
pub mod escape;
pub mod files;
pub mod fit_view;
pub mod fit_words;
pub mod html;
mod limit_words;
pub mod markdown;
mod marks;
mod note_words;
pub mod plots;
pub mod report_data;
pub mod rules_view;
pub mod stress_view;
pub mod triage_view;
pub mod words;

pub use triage_view::{
    triage_csv_header, triage_csv_records, triage_csv_rows, triage_json, triage_subfolder_note,
    triage_text, whatif_json, whatif_text, TriageRow, WhatIfLanesError, TRIAGE_CSV_COLUMNS,
};

use crate::units::{self, Kind, System};
use comfy_table::{presets, ContentArrangement, Table};
use std::sync::atomic::{AtomicU16, Ordering};

/// Table width (columns) used when nothing else sets one: the width of output that is not a
/// terminal, so output in pipes and files does not depend on who ran it.
pub const DEFAULT_WIDTH: u16 = 100;

static WIDTH: AtomicU16 = AtomicU16::new(DEFAULT_WIDTH);

/// Set the width (columns) that tables wrap to; the CLI sets it once, from `--width`,
/// `COLUMNS` or the terminal.
pub fn set_width(columns: u16) {
    WIDTH.store(columns.max(40), Ordering::Relaxed);
}

/// The width tables wrap to.
pub fn width() -> u16 {
    WIDTH.load(Ordering::Relaxed)
}

/// A table in the project's style, wrapping its cells to [`width`].
pub fn table(headers: &[&str]) -> Table {
    let mut t = Table::new();
    t.load_style(presets::UTF8_FULL_CONDENSED)
        .set_content_arrangement(ContentArrangement::Dynamic)
        .set_width(width())
        .set_header(headers.iter().copied());
    t
}

/// A long text shortened for a table cell to at most `max` characters, ending in "..." when
/// cut (the full text is in JSON and the report).
pub fn short(text: &str, max: usize) -> String {
    if text.chars().count() <= max {
        return text.to_string();
    }
    let cut: String = text.chars().take(max.saturating_sub(3)).collect();
    format!("{}...", cut.trim_end())
}

/// Format an SI quantity for humans in the chosen unit system.
pub fn q(si: f64, kind: Kind, sys: System) -> String {
    units::show(si, kind, sys, false)
}

/// Format a caliper-sized length (um or mil).
pub fn fine(si: f64, sys: System) -> String {
    units::show(si, Kind::Length, sys, true)
}

/// The label of a length difference per length of web: "mm/m", or "mil/in" in US units (the
/// same number).
pub fn strain_unit(sys: System) -> &'static str {
    units::strain_label(sys)
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

/// A quantity in a note or warning: `si`, its SI wording as the notes have always given it, or in
/// US units the value as [`units::show`] writes it (so the SI text stays as it was).
pub fn said(sys: System, si: String, value_si: f64, kind: Kind, fine: bool) -> String {
    match sys {
        System::Si => si,
        System::Us => units::show(value_si, kind, sys, fine),
    }
}

/// The safety note every output that advises action carries.
pub const SAFETY: &str = "Safety: rolls are heavy and can burst, telescope or fall. These findings support, and do not replace, site procedures, local codes and the judgement of qualified people; handle, wind and store rolls only as your site's procedures allow.";

/// The safety note for output whose notes advise action ([`crate::note::Note::advises_action`]):
/// `Some(SAFETY)`, else `None` (JSON `null`, as `diagnose` gives without findings).
pub fn safety_for(notes: &[crate::note::Note]) -> Option<&'static str> {
    notes
        .iter()
        .any(crate::note::Note::advises_action)
        .then_some(SAFETY)
}

/// The safety note as the last paragraph of human output, when `safety` holds it.
pub fn push_safety(out: &mut String, safety: Option<&str>) {
    if let Some(s) = safety {
        out.push('\n');
        out.push_str(s);
        out.push('\n');
    }
}

/// A JSON document as printed: pretty, keys sorted, a final newline, and no negative zero
/// (`-0.0`, which a rounding or a sign flip can leave, prints as `0.0`).
pub fn json_text(v: &serde_json::Value) -> Result<String, serde_json::Error> {
    let mut v = v.clone();
    unsigned_zeros(&mut v);
    let mut s = serde_json::to_string_pretty(&v)?;
    s.push('\n');
    Ok(s)
}

/// Every `-0.0` in `v` made `0.0`.
fn unsigned_zeros(v: &mut serde_json::Value) {
    match v {
        serde_json::Value::Number(n) if n.as_f64() == Some(0.0) && n.is_f64() => {
            *v = serde_json::json!(0.0);
        }
        serde_json::Value::Array(a) => a.iter_mut().for_each(unsigned_zeros),
        serde_json::Value::Object(m) => m.values_mut().for_each(unsigned_zeros),
        _ => {}
    }
}

/// Prose lines longer than `width` broken at spaces, continuation lines indented like the line
/// they continue; table lines (which already fit) and words longer than the width are left whole.
pub fn wrap_prose(text: &str, width: usize) -> String {
    let mut out = String::with_capacity(text.len() + text.len() / 16);
    for line in text.split_inclusive('\n') {
        let body = line.trim_end_matches('\n');
        if body.chars().count() <= width || body.starts_with(['┌', '│', '╞', '├', '└', '|'])
        {
            out.push_str(line);
            continue;
        }
        let indent: String = body.chars().take_while(|c| *c == ' ').collect();
        let mut cur = String::new();
        for word in body.split(' ').filter(|w| !w.is_empty()) {
            let len = cur.chars().count();
            if len > indent.len() && len + 1 + word.chars().count() > width {
                out.push_str(cur.trim_end());
                out.push('\n');
                cur.clear();
            }
            if cur.is_empty() {
                cur.push_str(&indent);
            } else if cur.len() > indent.len() {
                cur.push(' ');
            }
            cur.push_str(word);
        }
        out.push_str(cur.trim_end());
        if line.ends_with('\n') {
            out.push('\n');
        }
    }
    out
}

#[cfg(test)]
mod wrap_tests {
    use super::*;

    #[test]
    fn prose_wraps_with_its_indent_and_tables_stay() {
        let s = wrap_prose("   Why: one two three four five six\n│ a ┆ b │\n", 16);
        assert_eq!(
            s,
            "   Why: one two\n   three four\n   five six\n│ a ┆ b │\n"
        );
        for l in s.lines() {
            assert!(l.chars().count() <= 16, "{l}");
        }
    }

    /// A negative zero prints as zero (a correction that changes a quantity by -0.0 changes
    /// nothing); other numbers keep their sign.
    #[test]
    fn json_prints_no_negative_zero() {
        let v = serde_json::json!({ "after": -0.0, "x": [-0.0, -1.5, 0.0] });
        let s = json_text(&v).unwrap();
        assert!(!s.contains("-0.0"), "{s}");
        assert!(s.contains("-1.5") && s.contains("\"after\": 0.0"), "{s}");
    }
}
