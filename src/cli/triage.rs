//! `triage`: many rolls, one row each, with a progress bar on standard error, a table, CSV or
//! JSON, and `--resume` from a partial CSV output, which prints the CSV a fresh run prints.

use super::args::{RulesArg, TriageFormat};
use super::commands::{case_files, load_rules, Output};
use super::{CliError, Outcome};
use crate::case;
use crate::diagnose::{self, DiagnoseOptions};
use crate::report::{self, TriageRow};
use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};
use rayon::prelude::*;
use std::collections::{BTreeSet, HashMap};
use std::io::Write;
use std::path::{Path, PathBuf};

/// Rolls run in parallel per batch; CSV rows are written (in file order, with the earlier rows
/// of a resumed run in their places) after each batch, so a stopped run leaves whole rows to
/// resume from.
const BATCH: usize = 16;

/// `triage`: every roll diagnosed with the fast settings; a roll that fails is a row, not the
/// end of the run. Exit 2 when any roll could not be diagnosed, else 3 when the model does not
/// explain a roll, else 1 with findings.
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
    let (files, subfolders) = case_files(paths)?;
    for d in &subfolders {
        out.tell(&report::triage_subfolder_note(d));
    }
    if files.is_empty() {
        return Err(CliError::TriageNeedsFiles);
    }
    let earlier = match resume {
        Some(p) => earlier_rows(p, &files)?,
        None => Earlier::default(),
    };
    let plan: Vec<Roll> = (files.iter())
        .map(|f| match earlier.done.get(&f.display().to_string()) {
            Some(line) => Roll::Listed(line),
            None => Roll::Run(f),
        })
        .collect();
    let todo = plan.iter().filter(|r| matches!(r, Roll::Run(_))).count();
    if !earlier.done.is_empty() {
        out.detail(&format!(
            "resuming: {} rolls already listed, {todo} to go",
            files.len() - todo
        ));
    }
    let csv = format == TriageFormat::Csv;
    if csv {
        write_now(&std::io::stdout(), &report::triage_csv_header())?;
    }
    // the table's warnings in the units asked for; the CSV and the JSON in SI
    let sys = if format == TriageFormat::Table {
        out.sys
    } else {
        crate::units::System::Si
    };
    let mut rows = run_rolls(&plan, &table, (csv, sys), out.quiet)?;
    if csv {
        // rows of files this run does not name: kept, after this run's
        write_now(&std::io::stdout(), &earlier.others)?;
    }
    rows.sort_by(|a, b| a.rank_cmp(b).then(a.file.cmp(&b.file)));
    let s = match format {
        TriageFormat::Csv => String::new(),
        TriageFormat::Json => report::json_text(&report::triage_json(&rows))?,
        TriageFormat::Table => report::triage_text(&rows, out.sys),
    };
    let bad = rows.iter().any(|r| r.error.is_some());
    let any = earlier.findings || rows.iter().any(|r| !r.defects.is_empty());
    let unexplained = earlier.not_explained || rows.iter().any(TriageRow::not_explained);
    Ok(if bad {
        Outcome::BadInput(s)
    } else if unexplained {
        Outcome::NotExplained(s)
    } else if any {
        Outcome::Findings(s)
    } else {
        Outcome::Ok(s)
    })
}

/// A file of the run: listed by the earlier CSV a run resumes from (its CSV line), or to run.
enum Roll<'a> {
    Listed(&'a str),
    Run(&'a PathBuf),
}

/// Diagnose the rolls to run in batches run in parallel, with a progress bar; with `csv`, each
/// batch's rows are printed as soon as it is done, in file order with the listed rows in their
/// places (every row up to the batch's last file), so a resumed run prints a fresh run's CSV.
/// Returns the new rows, their warnings in `sys`.
fn run_rolls(
    plan: &[Roll],
    table: &crate::rules::Table,
    (csv, sys): (bool, crate::units::System),
    quiet: bool,
) -> Result<Vec<TriageRow>, CliError> {
    let todo: Vec<(usize, &PathBuf)> = (plan.iter().enumerate())
        .filter_map(|(i, r)| match r {
            Roll::Run(f) => Some((i, *f)),
            Roll::Listed(_) => None,
        })
        .collect();
    let bar = progress(todo.len() as u64, quiet);
    let opt = DiagnoseOptions {
        nodes: crate::winding::DEFAULT_NODES,
        what_if: false,
    };
    let stdout = std::io::stdout();
    let mut rows: Vec<Option<TriageRow>> = plan.iter().map(|_| None).collect();
    let mut printed = 0;
    for batch in todo.chunks(BATCH) {
        let got: Vec<TriageRow> = batch
            .par_iter()
            .map(|(_, f)| {
                let row = one_roll(f, table, &opt, sys);
                bar.inc(1);
                row
            })
            .collect();
        let last = batch.last().map_or(0, |b| b.0 + 1);
        for ((i, _), row) in batch.iter().zip(got) {
            rows[*i] = Some(row);
        }
        if csv {
            let text = csv_lines(plan, &rows, printed..last);
            bar.suspend(|| write_now(&stdout, &text))?;
            printed = last;
        }
    }
    bar.finish_and_clear();
    if csv {
        write_now(&stdout, &csv_lines(plan, &rows, printed..plan.len()))?;
    }
    Ok(rows.into_iter().flatten().collect())
}

/// The CSV lines of the files `range` of the plan: a listed file's earlier line, a run file's
/// new row.
fn csv_lines(plan: &[Roll], rows: &[Option<TriageRow>], range: std::ops::Range<usize>) -> String {
    let mut text = String::new();
    for i in range {
        match (&plan[i], &rows[i]) {
            (Roll::Listed(line), _) => text.push_str(line),
            (Roll::Run(_), Some(row)) => {
                text.push_str(&report::triage_csv_rows(std::slice::from_ref(row)))
            }
            (Roll::Run(_), None) => {}
        }
    }
    text
}

/// One roll: loaded and diagnosed, or the reason it could not be.
fn one_roll(
    f: &Path,
    table: &crate::rules::Table,
    opt: &DiagnoseOptions,
    sys: crate::units::System,
) -> TriageRow {
    match case::load_file(f, &[]) {
        Ok(c) => match diagnose::diagnose(&c, table, opt) {
            Ok(d) => TriageRow::from_diagnosis_in(f, &d, sys),
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

/// What an earlier CSV output gives a resumed run.
#[derive(Default)]
struct Earlier {
    /// Files of this run with a row and no error, not run again: each file's row as a CSV line
    /// in the current columns (the last whole row of the file).
    done: HashMap<String, String>,
    /// The rows of files this run does not name, as CSV lines in the order they came.
    others: String,
    /// Whether a standing row has findings.
    findings: bool,
    /// Whether the model does not explain a standing row's roll (`model_fit` `not_explained`).
    not_explained: bool,
}

/// Read an earlier CSV output (`--resume`): its whole rows, mapped by column name onto the
/// current columns (a column it lacks is left empty, but for `safety`, given to a diagnosed row
/// with findings or warnings; a `top_likelihood` written before `top_probability` was the rule's
/// weight and is left empty too). A row cut short by a stop is not done; a
/// row with an error is not done either, so a file fixed since is diagnosed again and its new
/// row supersedes the failed one.
fn earlier_rows(path: &Path, files: &[PathBuf]) -> Result<Earlier, CliError> {
    let fail = |message: String| CliError::Resume {
        path: path.to_path_buf(),
        message,
    };
    if same_file_as_stdout(path) {
        return Err(fail("the output goes to this same file; write the new CSV to another file, then rename it over this one".into()));
    }
    let mut rdr = csv::ReaderBuilder::new()
        .flexible(true)
        .from_path(path)
        .map_err(|e| fail(e.to_string()))?;
    let headers = rdr.headers().map_err(|e| fail(e.to_string()))?.clone();
    let at = |name: &str| headers.iter().position(|h| h == name);
    let file_col = at("file").ok_or_else(|| fail("it has no `file` column".into()))?;
    let (error_col, defects_col) = (at("error"), at("defects"));
    let fit_col = at("model_fit");
    // before `top_probability`, `top_likelihood` held the rule's weight, not the graded word
    let columns: Vec<Option<usize>> = (report::TRIAGE_CSV_COLUMNS.iter())
        .map(|&c| at(c).filter(|_| c != "top_likelihood" || at("top_probability").is_some()))
        .collect();
    // a CSV from before the `safety` column: a diagnosed row with findings or warnings gets it
    let safety_at = (at("safety").is_none())
        .then(|| {
            report::TRIAGE_CSV_COLUMNS
                .iter()
                .position(|c| *c == "safety")
        })
        .flatten();
    let warnings_col = at("warnings");
    // the last whole row of each file, in the order the files first appear
    let mut rows: Vec<(String, csv::StringRecord)> = Vec::new();
    // each file's place in `rows`, so a long batch is read in one pass
    let mut index: std::collections::HashMap<String, usize> = std::collections::HashMap::new();
    for rec in rdr.records() {
        let Ok(rec) = rec else { continue };
        if rec.len() != headers.len() {
            continue;
        }
        let file = rec.get(file_col).unwrap_or_default().to_string();
        match index.get(&file) {
            Some(&i) => rows[i].1 = rec,
            None => {
                index.insert(file.clone(), rows.len());
                rows.push((file, rec));
            }
        }
    }
    let this_run: BTreeSet<String> = files.iter().map(|f| f.display().to_string()).collect();
    let cell = |rec: &csv::StringRecord, col: Option<usize>| {
        col.and_then(|c| rec.get(c)).unwrap_or_default().to_string()
    };
    let mut out = Earlier::default();
    let mut others = Vec::new();
    for (file, rec) in rows {
        let ok = cell(&rec, error_col).is_empty();
        let ours = this_run.contains(&file);
        if !ok && ours {
            continue;
        }
        let findings = !cell(&rec, defects_col).is_empty();
        out.findings |= ok && findings;
        let not = report::fit_words::verdict_word(crate::fit::Verdict::NotExplained);
        out.not_explained |= ok && cell(&rec, fit_col) == not;
        let mut row: Vec<String> = columns.iter().map(|&c| cell(&rec, c)).collect();
        if let Some(i) = safety_at {
            if ok && (findings || !cell(&rec, warnings_col).is_empty()) {
                row[i] = report::SAFETY.to_string();
            }
        }
        if ours {
            let line = report::triage_csv_records(std::slice::from_ref(&row));
            out.done.insert(file, line);
        } else {
            others.push(row);
        }
    }
    out.others = report::triage_csv_records(&others);
    Ok(out)
}

/// Whether standard output is the file `path` (a `>>` onto the CSV being resumed).
#[cfg(unix)]
fn same_file_as_stdout(path: &Path) -> bool {
    use std::os::fd::AsFd;
    use std::os::unix::fs::MetadataExt;
    let out = std::io::stdout()
        .as_fd()
        .try_clone_to_owned()
        .map(std::fs::File::from)
        .and_then(|f| f.metadata());
    match (out, std::fs::metadata(path)) {
        (Ok(a), Ok(b)) => a.is_file() && a.dev() == b.dev() && a.ino() == b.ino(),
        _ => false,
    }
}

#[cfg(not(unix))]
fn same_file_as_stdout(_: &Path) -> bool {
    false
}
