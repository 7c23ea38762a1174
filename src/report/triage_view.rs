//! `triage` and `whatif` output: many rolls in one table, and a roll against a changed copy.

use super::{pos, table, words, SAFETY};
use crate::fit::{ModelFit, Verdict};
use crate::units::System;
use crate::vocab::{Defect, Likelihood};
use std::cmp::Ordering;

/// One roll in a triage.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct TriageRow {
    pub file: String,
    pub case: String,
    /// Length spread at unwind, mm per m of web; `None` (JSON null) when the roll could not be
    /// diagnosed, so that no reader takes a failed roll for a perfect one.
    pub spread_mm_per_m: Option<f64>,
    /// Graded likelihood of the first finding (the most likely, as `diagnose` orders them);
    /// `None` with no finding or when not diagnosed.
    pub top_likelihood: Option<Likelihood>,
    /// Probability of the first finding (share of the plausible states in which it holds);
    /// `None` with no finding or when not diagnosed. JSON `top_probability_fraction`; the
    /// CSV keeps its column `top_probability`, which earlier CSVs a run resumes from have.
    #[serde(rename = "top_probability_fraction")]
    pub top_probability: Option<f64>,
    /// Weight of the first finding's rule label, the last tie-break of the ranking.
    #[serde(skip)]
    pub top_weight: Option<f64>,
    pub defects: Vec<Defect>,
    pub complaint: Option<Defect>,
    pub agrees: Option<bool>,
    /// How many physical limits the roll's predicted state is beyond
    /// ([`crate::note::Limit::beyond_physical`]) that the readings resolve; `None` when not
    /// diagnosed.
    pub limits_exceeded: Option<u32>,
    /// How many more it passes only as its calipers read, within measurement noise
    /// ([`crate::diagnose::limit_noise`]); `None` when not diagnosed.
    pub limits_within_noise: Option<u32>,
    /// Whether the model explains the roll's surveys, with its misfit; `None` when not
    /// diagnosed.
    pub model_fit: Option<ModelFit>,
    pub error: Option<String>,
    /// The case's warnings and every physical limit a stage passed, in words.
    pub warnings: Vec<String>,
    /// Whether the row advises action (a finding, or a physical limit passed): the CSV then
    /// gives the safety note in its `safety` column. The JSON and the table give it once for
    /// all rolls.
    #[serde(skip)]
    pub advises_action: bool,
}

impl TriageRow {
    /// A diagnosed roll, its warnings in SI (as the CSV and the JSON give them).
    pub fn from_diagnosis(file: &std::path::Path, d: &crate::diagnose::Diagnosis) -> Self {
        Self::from_diagnosis_in(file, d, System::Si)
    }

    /// A diagnosed roll, its warnings' quantities in `sys` (for the table).
    pub fn from_diagnosis_in(
        file: &std::path::Path,
        d: &crate::diagnose::Diagnosis,
        sys: System,
    ) -> Self {
        let mut defects: Vec<Defect> = d.findings.iter().map(|f| f.defect).collect();
        defects.dedup();
        let (resolved, on_noise) = crate::diagnose::limit_noise::count(&d.notes);
        TriageRow {
            file: file.display().to_string(),
            case: d.case.clone(),
            spread_mm_per_m: Some(d.spread_mm_per_m),
            top_likelihood: d.findings.first().map(|f| f.likelihood),
            top_probability: d.findings.first().map(|f| f.probability),
            top_weight: d.findings.first().map(|f| f.weight),
            defects,
            complaint: d.agreement.as_ref().map(|a| a.complaint),
            agrees: d.agreement.as_ref().map(|a| a.agrees),
            limits_exceeded: Some(resolved),
            limits_within_noise: Some(on_noise),
            model_fit: Some(d.confidence.model_fit()),
            error: None,
            warnings: words::warnings_in(d, sys),
            advises_action: d.advises_action,
        }
    }
    /// A roll that could not be diagnosed; `e` names the file (the table prints it as it is).
    pub fn failed(file: &std::path::Path, e: &str) -> Self {
        TriageRow {
            file: file.display().to_string(),
            case: String::new(),
            spread_mm_per_m: None,
            top_likelihood: None,
            top_probability: None,
            top_weight: None,
            defects: Vec::new(),
            complaint: None,
            agrees: None,
            limits_exceeded: None,
            limits_within_noise: None,
            model_fit: None,
            error: Some(e.to_string()),
            warnings: Vec::new(),
            advises_action: false,
        }
    }
    /// Whether the model does not explain the roll's surveys (its misfit over the limit).
    pub fn not_explained(&self) -> bool {
        (self.model_fit.as_ref()).is_some_and(|m| m.verdict == Verdict::NotExplained)
    }
    /// The triage order, worst first: failures, then rolls beyond a physical limit, then rolls
    /// the model does not explain or that pass a limit only within measurement noise, then the
    /// rest; within each, as `diagnose` orders findings, by the first finding's graded
    /// likelihood (a roll with none last), then its probability, then its rule's weight; then by
    /// the spread.
    pub fn rank_cmp(&self, other: &TriageRow) -> Ordering {
        let group = |r: &TriageRow| match (&r.error, r.spread_mm_per_m) {
            (None, Some(_)) if r.limits_exceeded > Some(0) => 2,
            (None, Some(_)) => u8::from(r.not_explained() || r.limits_within_noise > Some(0)),
            _ => 3,
        };
        let num = |x: Option<f64>| x.unwrap_or(0.0);
        let top = |r: &TriageRow| {
            (r.top_likelihood).map(|l| (l, num(r.top_probability), num(r.top_weight)))
        };
        let findings = match (top(self), top(other)) {
            (Some(a), Some(b)) => crate::diagnose::likelier_first(a, b),
            (Some(_), None) => Ordering::Less,
            (None, Some(_)) => Ordering::Greater,
            (None, None) => Ordering::Equal,
        };
        (group(other).cmp(&group(self)))
            .then(findings)
            .then(num(other.spread_mm_per_m).total_cmp(&num(self.spread_mm_per_m)))
    }
}

/// The columns of the triage CSV (SI; the spread is mm of extra length per m of web). Each row
/// stands on its own in a spreadsheet, so a row that advises action carries the safety note in
/// `safety` (empty otherwise). `model_fit` is `explained`, `lanes_not_explained` or
/// `not_explained` ([`crate::fit::Verdict`]), with the roll's misfit in noise units beside it.
pub const TRIAGE_CSV_COLUMNS: [&str; 15] = [
    "file",
    "case",
    "spread_mm_per_m",
    "top_likelihood",
    "top_probability",
    "defects",
    "complaint",
    "agrees",
    "limits_exceeded",
    "error",
    "warnings",
    "safety",
    "model_fit",
    "roll_misfit_noise_units",
    "limits_within_noise",
];

/// The header line of the triage CSV.
pub fn triage_csv_header() -> String {
    csv_text(|w| w.write_record(TRIAGE_CSV_COLUMNS))
}

/// Rows already in the CSV's columns (a resumed run's earlier rows) as CSV lines.
pub fn triage_csv_records(rows: &[Vec<String>]) -> String {
    csv_text(|w| rows.iter().try_for_each(|r| w.write_record(r)))
}

/// Triage rows as CSV lines (no header); defects are separated by `;`. A roll not diagnosed has
/// its numbers empty (not 0) and its whole error message, one line of it after another joined by
/// ` | `.
pub fn triage_csv_rows(rows: &[TriageRow]) -> String {
    csv_text(|w| {
        for r in rows {
            let defects: Vec<&str> = r.defects.iter().map(|d| d.word()).collect();
            w.write_record([
                r.file.clone(),
                r.case.clone(),
                r.spread_mm_per_m
                    .map(|x| format!("{x:.4}"))
                    .unwrap_or_default(),
                r.top_likelihood
                    .map(|l| l.word().to_string())
                    .unwrap_or_default(),
                r.top_probability
                    .map(|x| format!("{x:.2}"))
                    .unwrap_or_default(),
                defects.join(";"),
                r.complaint.map(|c| c.word()).unwrap_or_default().into(),
                r.agrees.map(|a| a.to_string()).unwrap_or_default(),
                r.limits_exceeded.map(|n| n.to_string()).unwrap_or_default(),
                r.error.as_deref().map(one_line).unwrap_or_default(),
                r.warnings.join(" | "),
                if r.advises_action { SAFETY } else { "" }.to_string(),
                (r.model_fit.as_ref())
                    .map(|m| super::fit_words::verdict_word(m.verdict).to_string())
                    .unwrap_or_default(),
                (r.model_fit.as_ref())
                    .map(|m| format!("{:.2}", m.roll_misfit_noise_units))
                    .unwrap_or_default(),
                (r.limits_within_noise.map(|n| n.to_string())).unwrap_or_default(),
            ])?;
        }
        Ok(())
    })
}

/// A message of several lines on one: each line trimmed, blank ones left out, joined by ` | `.
fn one_line(e: &str) -> String {
    e.lines()
        .map(str::trim)
        .filter(|l| !l.is_empty())
        .collect::<Vec<_>>()
        .join(" | ")
}

fn csv_text(fill: impl FnOnce(&mut csv::Writer<Vec<u8>>) -> csv::Result<()>) -> String {
    let mut w = csv::Writer::from_writer(Vec::new());
    // Writing to memory cannot fail.
    let _ = fill(&mut w);
    let bytes = w.into_inner().unwrap_or_default();
    String::from_utf8_lossy(&bytes).into_owned()
}

/// Triage table: every roll, worst first (the roll id is never wrapped, the file is shown by its
/// name; a roll not diagnosed says so in its columns), then the messages of the files that could
/// not be diagnosed, each whole.
pub fn triage_text(rows: &[TriageRow], sys: System) -> String {
    let spread = format!("length spread {}", super::strain_unit(sys));
    let mut t = table(&[
        "roll",
        "file",
        &spread,
        "likely defects",
        "complaint",
        "agrees",
        "beyond limits",
        "model fits",
    ]);
    let mut failed = String::new();
    let mut warned = String::new();
    for r in rows {
        for w in &r.warnings {
            warned.push_str(&format!("warning: {}: {w}\n", r.case));
        }
        if let Some(e) = &r.error {
            // every failed row's message names its file ([`TriageRow::failed`]'s callers)
            failed.push_str(&format!("  {}\n", e.trim_end()));
        }
        t.add_row(cells(r));
    }
    if let Some(col) = t.column_mut(0) {
        col.set_constraint(comfy_table::ColumnConstraint::ContentWidth);
    }
    let mut out = format!("{t}\n");
    if rows.iter().all(|r| r.error.is_some()) {
        out.push_str("No roll could be diagnosed.\n");
    }
    if !failed.is_empty() {
        out.push_str("Not diagnosed (bad input; fix and run again):\n");
        out.push_str(&failed);
    }
    if rows.iter().any(|r| r.limits_exceeded > Some(0)) {
        out.push_str("Beyond limits: the roll's predicted state passes a physical limit (strength, crush, core, lift-off, air film, ...), so results resting on it are not physical; such rolls are listed first, after those not diagnosed. Check their inputs and the warnings.\n");
    }
    if rows.iter().any(|r| r.limits_within_noise > Some(0)) {
        out.push_str("Within noise: the roll passes a strength limit only as its calipers read, and measurement noise alone moves it that far (a roll with level calipers is within it): the readings cannot tell whether it is beyond; such rolls are listed with those not explained. Treat them with care and read their warnings.\n");
    }
    if rows.iter().any(TriageRow::not_explained) {
        out.push_str(&format!("Not explained: the model does not explain the roll's surveys (readings miss the fit by over {:.0} noise units, rms), so its findings, or the absence of findings, rest on an unexplained model; such rolls are listed after those beyond limits. Check their surveys (instrument, scale, positions, ages) and storage history, and run `rollsleuth diagnose CASE` on each.\n", crate::fit::MISFIT_LIMIT));
    }
    out.push_str(&warned);
    out.push_str("Triage uses the fast settings (no corrections re-run); run `rollsleuth diagnose CASE` on a roll for the full report.\n");
    out.push_str(SAFETY);
    out.push('\n');
    out
}

/// The name of a file, as the triage table shows it.
fn file_name(file: &str) -> String {
    (std::path::Path::new(file).file_name())
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| file.to_string())
}

/// A roll's cells in the triage table; a roll not diagnosed says so in its number and defect
/// columns (its message follows the table).
fn cells(r: &TriageRow) -> Vec<String> {
    let name = file_name(&r.file);
    let spread = match (&r.error, r.spread_mm_per_m) {
        (None, Some(x)) => format!("{x:.2}"),
        _ => "n/a".into(),
    };
    let defects = if r.error.is_some() {
        "could not diagnose".into()
    } else if r.defects.is_empty() {
        "none".into()
    } else {
        defect_list(&r.defects)
    };
    vec![
        r.case.clone(),
        name,
        spread,
        defects,
        r.complaint
            .map(words::defect)
            .unwrap_or_default()
            .to_string(),
        match r.agrees {
            Some(true) => "yes".into(),
            Some(false) => "no".into(),
            None => String::new(),
        },
        limits_cell(r.limits_exceeded, r.limits_within_noise),
        (r.model_fit.as_ref())
            .map(super::fit_words::triage_cell)
            .unwrap_or_default(),
    ]
}

/// The "beyond limits" cell: the limits the readings resolve, and those within noise.
fn limits_cell(resolved: Option<u32>, on_noise: Option<u32>) -> String {
    match (resolved, on_noise.unwrap_or(0)) {
        (None, _) => String::new(),
        (Some(0), 0) => "none".into(),
        (Some(0), k) => format!("{k} within noise (see warnings)"),
        (Some(n), 0) => format!("{n} (see warnings)"),
        (Some(n), k) => format!("{n}, {k} more within noise (see warnings)"),
    }
}

/// The note for a subfolder of a folder given to triage: it is not searched.
pub fn triage_subfolder_note(dir: &std::path::Path) -> String {
    format!(
        "note: {}: a subfolder, not searched (triage reads the *.yaml files of the folders it is given); name it too to triage its rolls",
        dir.display()
    )
}

/// Triage as JSON: the rolls, worst first, and the safety note.
pub fn triage_json(rows: &[TriageRow]) -> serde_json::Value {
    serde_json::json!({ "rolls": rows, "safety": SAFETY })
}

/// A what-if comparison as JSON: the result's own fields; the warnings of the roll as measured
/// (`warnings_before`) and as changed (`warnings_after`), and all of them in `warnings`, each
/// saying which roll it is about ([`tagged`]); the safety note.
pub fn whatif_json(w: &crate::diagnose::WhatIf) -> Result<serde_json::Value, serde_json::Error> {
    let mut v = serde_json::to_value(w)?;
    if let Some(o) = v.as_object_mut() {
        let before = words::note_json(&w.case_warnings_before, &w.notes_before).1;
        let after = words::note_json(&w.case_warnings, &w.notes).1;
        o.insert(
            "warnings".into(),
            serde_json::json!(tagged(&before, &after)),
        );
        o.insert("warnings_before".into(), serde_json::json!(before));
        o.insert("warnings_after".into(), serde_json::json!(after));
        o.insert("safety".into(), serde_json::json!(SAFETY));
    }
    Ok(v)
}

/// The warnings of both rolls, each once, saying which roll it is about: "as measured", "as
/// changed", or "as measured and as changed".
fn tagged(before: &[String], after: &[String]) -> Vec<String> {
    let both = |x: &String| before.contains(x) && after.contains(x);
    let mut out: Vec<String> = (before.iter())
        .map(|x| match both(x) {
            true => format!("as measured and as changed: {x}"),
            false => format!("as measured: {x}"),
        })
        .collect();
    out.extend(
        (after.iter())
            .filter(|x| !both(x))
            .map(|x| format!("as changed: {x}")),
    );
    out
}

/// Defects in plain words, comma-separated.
fn defect_list(d: &[Defect]) -> String {
    d.iter()
        .map(|&x| words::defect(x))
        .collect::<Vec<_>>()
        .join(", ")
}

/// A what-if result whose lanes do not line up: one excess per lane is expected before and after.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("what-if for case {case}: {positions} lane positions but {before} lengths before and {after} after; the comparison needs one of each per lane")]
pub struct WhatIfLanesError {
    pub case: String,
    pub positions: usize,
    pub before: usize,
    pub after: usize,
}

/// What-if comparison text.
pub fn whatif_text(w: &crate::diagnose::WhatIf, sys: System) -> Result<String, WhatIfLanesError> {
    let n = w.position_m.len();
    if w.excess_before_mm_per_m.len() != n || w.excess_after_mm_per_m.len() != n {
        return Err(WhatIfLanesError {
            case: w.case.clone(),
            positions: n,
            before: w.excess_before_mm_per_m.len(),
            after: w.excess_after_mm_per_m.len(),
        });
    }
    let mut t = table(&["lane", "before mm/m", "after mm/m"]);
    for i in 0..n {
        t.add_row(vec![
            pos(w.position_m[i], sys),
            format!("{:+.2}", w.excess_before_mm_per_m[i]),
            format!("{:+.2}", w.excess_after_mm_per_m[i]),
        ]);
    }
    let list = |d: &[Defect]| {
        if d.is_empty() {
            "none".to_string()
        } else {
            defect_list(d)
        }
    };
    let before = words::note_text(&w.case_warnings_before, &w.notes_before, sys).1;
    let (after_notes, after) = words::note_text(&w.case_warnings, &w.notes, sys);
    let notes: String = (tagged(&before, &after).iter())
        .map(|l| format!("warning: {l}\n"))
        .chain(
            after_notes
                .iter()
                .map(|l| format!("note: as changed: {l}\n")),
        )
        .collect();
    let dropped =
        |d: &[Defect], which: &str| (!d.is_empty()).then(|| format!("{which}: {}", defect_list(d)));
    let lists: Vec<String> = [
        dropped(&w.screened_out, "as measured"),
        dropped(&w.screened_out_after, "as changed"),
    ]
    .into_iter()
    .flatten()
    .collect();
    let screened = if lists.is_empty() {
        String::new()
    } else {
        format!(
            "Given by the rules but dropped by each roll's own screen (within measurement noise, or unlikely; `diagnose` says which), so not likely defects: {}.\n",
            lists.join("; ")
        )
    };
    let rests = "The defects of both rolls, and their absence,";
    let fit = (super::fit_words::opening(&w.model_fit, sys, rests))
        .map_or(String::new(), |s| format!("{s}\n"));
    Ok(format!(
        "What if, case {}: {}\n{fit}Predicted length spread at unwind: {:.2} -> {:.2} mm per m of web.\nLikely defects: {} -> {}.\n{screened}{t}\nLane length at unwind over the width-weighted mean lane; creep as fitted on the measured roll.\n{notes}{SAFETY}\n",
        w.case,
        w.changes.join(", "),
        w.spread_before_mm_per_m,
        w.spread_after_mm_per_m,
        list(&w.defects_before),
        list(&w.defects_after),
    ))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::diagnose::WhatIf;

    fn what_if(before: usize) -> WhatIf {
        WhatIf {
            case: "R1".into(),
            changes: vec!["winding.tension=1.5 pli".into()],
            spread_before_mm_per_m: 0.5,
            spread_after_mm_per_m: 0.25,
            position_m: vec![0.1, 0.3],
            excess_before_mm_per_m: vec![0.25; before],
            excess_after_mm_per_m: vec![-0.25, 0.25],
            defects_before: vec![Defect::BaggyCenter],
            defects_after: Vec::new(),
            screened_out: Vec::new(),
            screened_out_after: Vec::new(),
            case_warnings: Vec::new(),
            notes: Vec::new(),
            case_warnings_before: Vec::new(),
            notes_before: Vec::new(),
            model_fit: crate::fit::explained::from_lanes(0.8, [(0.1, 0.7)].into_iter()),
        }
    }

    fn row(file: &str, grade: Option<(Likelihood, f64, f64)>, spread: f64) -> TriageRow {
        let mut r = TriageRow::failed(std::path::Path::new(file), "");
        r.error = None;
        r.spread_mm_per_m = Some(spread);
        r.limits_exceeded = Some(0);
        r.top_likelihood = grade.map(|g| g.0);
        r.top_probability = grade.map(|g| g.1);
        r.top_weight = grade.map(|g| g.2);
        r
    }

    /// Rolls rank by their first finding's graded likelihood, then its probability, then its
    /// rule's weight, then the spread: a medium finding of a high-labelled rule (weight 0.8)
    /// on a roll with a wide spread ranks below a high finding; a roll with no finding last, a
    /// failed roll first.
    #[test]
    fn triage_ranks_by_graded_likelihood_then_probability_then_weight_then_spread() {
        use Likelihood::{High, Medium};
        let mut rows = [
            row("none", None, 3.0),
            row("medium", Some((Medium, 1.0, 0.8)), 2.0),
            row("high_less_sure", Some((High, 0.92, 0.8)), 0.1),
            row("high_sure", Some((High, 1.0, 0.8)), 0.2),
            row("medium_lower_label", Some((Medium, 1.0, 0.5)), 2.5),
            row("high_sure_wider", Some((High, 1.0, 0.8)), 0.3),
            TriageRow::failed(std::path::Path::new("failed"), "bad"),
        ];
        rows.sort_by(|a, b| a.rank_cmp(b));
        let order: Vec<&str> = rows.iter().map(|r| r.file.as_str()).collect();
        assert_eq!(
            order,
            [
                "failed",
                "high_sure_wider",
                "high_sure",
                "high_less_sure",
                "medium",
                "medium_lower_label",
                "none"
            ]
        );
    }

    /// A roll the model does not explain ranks after rolls beyond a physical limit and before
    /// every other roll, findings or not.
    #[test]
    fn a_roll_the_model_does_not_explain_ranks_right_after_rolls_beyond_limits() {
        let fit = |verdict, misfit| {
            let lanes = [(0.1, misfit)].into_iter();
            let mut m = crate::fit::explained::from_lanes(misfit, lanes);
            m.verdict = verdict;
            Some(m)
        };
        let mut high = row("high", Some((Likelihood::High, 1.0, 0.8)), 2.0);
        high.model_fit = fit(Verdict::Explained, 0.6);
        let mut beyond = row("beyond", None, 0.1);
        beyond.limits_exceeded = Some(1);
        let mut unexplained = row("unexplained", None, 0.05);
        unexplained.model_fit = fit(Verdict::NotExplained, 6.0);
        let mut lanes = row("lanes", None, 0.5);
        lanes.model_fit = fit(Verdict::LanesNotExplained, 1.2);
        let mut rows = [lanes, high, unexplained, beyond];
        rows.sort_by(|a, b| a.rank_cmp(b));
        let order: Vec<&str> = rows.iter().map(|r| r.file.as_str()).collect();
        assert_eq!(order, ["beyond", "unexplained", "high", "lanes"]);
    }

    /// The CSV gives the graded word and the probability, each empty when there is no finding.
    #[test]
    fn triage_csv_gives_the_graded_likelihood_and_the_probability() {
        let rows = [
            row("a.yaml", Some((Likelihood::Medium, 0.75, 0.8)), 1.0),
            row("b.yaml", None, 0.0),
        ];
        let csv = triage_csv_rows(&rows);
        let mut lines = csv.lines();
        assert!(
            lines
                .next()
                .unwrap()
                .starts_with("a.yaml,,1.0000,medium,0.75,"),
            "{csv}"
        );
        assert!(
            lines.next().unwrap().starts_with("b.yaml,,0.0000,,,"),
            "{csv}"
        );
    }

    /// Lanes that line up give one row each; lanes that do not are an error naming the counts,
    /// not blank cells.
    #[test]
    fn whatif_view_needs_one_length_per_lane_before_and_after() {
        let t = whatif_text(&what_if(2), System::Si).unwrap();
        assert!(t.contains("Likely defects: baggy centre -> none."), "{t}");
        assert!(t.contains("+0.25") && t.contains("-0.25"), "{t}");
        assert!(!t.contains("dropped by each roll's own screen"), "{t}");
        let mut w = what_if(2);
        w.screened_out_after = vec![Defect::Ridges];
        let t = whatif_text(&w, System::Si).unwrap();
        assert!(t.contains("not likely defects: as changed: ridges."), "{t}");
        let e = whatif_text(&what_if(3), System::Si).unwrap_err();
        assert_eq!(
            e.to_string(),
            "what-if for case R1: 2 lane positions but 3 lengths before and 2 after; the comparison needs one of each per lane"
        );
    }
}
