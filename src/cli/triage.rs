//! `triage`: many rolls, one row each, with a progress bar on standard error, a table, CSV or
//! JSON, and `--resume` from a partial CSV output.

use super::args::{RulesArg, TriageFormat};
use super::commands::{case_files, load_rules, Output};
use super::{CliError, Outcome};
use crate::case;
use crate::diagnose::{self, DiagnoseOptions};
use crate::report::{self, TriageRow};
use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};
use rayon::prelude::*;
use std::collections::BTreeSet;
use std::io::Write;
use std::path::{Path, PathBuf};

/// Rolls run in parallel per batch; CSV rows are written (in file order) after each batch, so a
/// stopped run leaves whole rows to resume from.
const BATCH: usize = 16;

/// `triage`: every roll diagnosed with the fast settings; a roll that fails is a row, not the
/// end of the run. Exit 2 when any roll could not be diagnosed, else 1 with findings.
pub fn triage(
    paths: &[PathBuf],
    rules: &RulesArg,
    format: TriageFormat,
    resume: Option<&Path>,
    out: Output,
) -> Result<Outcome, CliError> {
    let format = if out.json { TriageFormat::Json } else { format };
    if resume.is_some() && format != TriageFormat::Csv {
        return Err(CliError::ResumeNeedsCsv);
    }
    let table = load_rules(rules)?;
    let files = case_files(paths)?;
    if files.is_empty() {
        return Err(CliError::TriageNeedsFiles);
    }
    let done = match resume {
        Some(p) => listed_files(p)?,
        None => BTreeSet::new(),
    };
    let todo: Vec<&PathBuf> = files
        .iter()
        .filter(|f| !done.contains(&f.display().to_string()))
        .collect();
    if !done.is_empty() {
        out.detail(&format!(
            "resuming: {} rolls already listed, {} to go",
            files.len() - todo.len(),
            todo.len()
        ));
    }
    let bar = progress(todo.len() as u64, out.quiet);
    let opt = DiagnoseOptions {
        nodes: crate::winding::DEFAULT_NODES,
        what_if: false,
    };
    let stdout = std::io::stdout();
    let mut rows = Vec::with_capacity(todo.len());
    if format == TriageFormat::Csv && resume.is_none() {
        write_now(&stdout, &report::triage_csv_header())?;
    }
    for batch in todo.chunks(BATCH) {
        let got: Vec<TriageRow> = batch
            .par_iter()
            .map(|f| {
                let row = one_roll(f, &table, &opt);
                bar.inc(1);
                row
            })
            .collect();
        if format == TriageFormat::Csv {
            let text = report::triage_csv_rows(&got);
            bar.suspend(|| write_now(&stdout, &text))?;
        }
        rows.extend(got);
    }
    bar.finish_and_clear();
    rows.sort_by(|a, b| {
        let (ka, kb) = (a.rank_key(), b.rank_key());
        kb.0.cmp(&ka.0)
            .then(kb.1.total_cmp(&ka.1))
            .then(a.file.cmp(&b.file))
    });
    let s = match format {
        TriageFormat::Csv => String::new(),
        TriageFormat::Json => report::json_text(&report::triage_json(&rows))?,
        TriageFormat::Table => report::triage_text(&rows, out.sys),
    };
    let bad = rows.iter().any(|r| r.error.is_some());
    let any = rows.iter().any(|r| !r.defects.is_empty());
    Ok(if bad {
        Outcome::BadInput(s)
    } else if any {
        Outcome::Findings(s)
    } else {
        Outcome::Ok(s)
    })
}

/// One roll: loaded and diagnosed, or the reason it could not be.
fn one_roll(f: &Path, table: &crate::rules::Table, opt: &DiagnoseOptions) -> TriageRow {
    match case::load_file(f, &[]) {
        Ok(c) => match diagnose::diagnose(&c, table, opt) {
            Ok(d) => TriageRow::from_diagnosis(f, &d),
            // a model's error does not name the file (a case's error does): every failed row's
            // message names it, in the table, the CSV and the JSON alike
            Err(e) => TriageRow::failed(f, &format!("{}: {e}", f.display())),
        },
        Err(e) => TriageRow::failed(f, &e.to_string()),
    }
}

/// A progress bar on standard error; indicatif hides it when standard error is not a terminal.
fn progress(len: u64, quiet: bool) -> ProgressBar {
    if quiet {
        return ProgressBar::hidden();
    }
    let bar = ProgressBar::with_draw_target(Some(len), ProgressDrawTarget::stderr());
    if let Ok(style) = ProgressStyle::with_template(
        "{bar:30} {pos}/{len} rolls, {elapsed} elapsed, about {eta} left",
    ) {
        bar.set_style(style);
    }
    bar
}

/// Write and flush at once, so a stopped run keeps every row it printed.
fn write_now(stdout: &std::io::Stdout, text: &str) -> Result<(), CliError> {
    let mut lock = stdout.lock();
    lock.write_all(text.as_bytes())
        .and_then(|_| lock.flush())
        .map_err(|source| CliError::Stdout { source })
}

/// The files an earlier CSV output lists (its `file` column).
fn listed_files(path: &Path) -> Result<BTreeSet<String>, CliError> {
    let fail = |message: String| CliError::Resume {
        path: path.to_path_buf(),
        message,
    };
    let mut rdr = csv::ReaderBuilder::new()
        .flexible(true)
        .from_path(path)
        .map_err(|e| fail(e.to_string()))?;
    let headers = rdr.headers().map_err(|e| fail(e.to_string()))?.clone();
    let col = headers
        .iter()
        .position(|h| h == "file")
        .ok_or_else(|| fail("it has no `file` column".into()))?;
    let mut done = BTreeSet::new();
    for rec in rdr.records() {
        // A row cut short by a stop is not done: it is run again.
        let Ok(rec) = rec else { continue };
        if rec.len() == headers.len() {
            if let Some(f) = rec.get(col) {
                done.insert(f.to_string());
            }
        }
    }
    Ok(done)
}
