//! One function per subcommand: load what it needs, run the library, hand the result to
//! `report` for text or JSON.

use super::args::{CaseArg, RulesArg};
use super::{CliError, Outcome};
use crate::case::{self, Case};
use crate::diagnose::{self, DiagnoseOptions, Diagnosis};
use crate::lanes::{self, Lanes};
use crate::report::{self, TriageRow};
use crate::rules::{self, Table};
use crate::storage::AgeOptions;
use crate::units::System;
use crate::winding::{self, Wound};
use serde_json::Value;
use std::path::{Path, PathBuf};

/// Output settings every command shares.
#[derive(Debug, Clone, Copy)]
pub struct Output {
    /// JSON instead of human text.
    pub json: bool,
    /// Unit system for human text.
    pub sys: System,
}

impl Output {
    /// JSON or text, as asked.
    fn pick(
        self,
        json: impl FnOnce() -> Value,
        text: impl FnOnce() -> String,
    ) -> Result<String, CliError> {
        if self.json {
            Ok(report::json_text(&json())?)
        } else {
            Ok(text())
        }
    }
}

/// Load the case named by `arg`, or the demo case.
pub fn load(arg: &CaseArg) -> Result<Case, CliError> {
    Ok(match &arg.case {
        Some(p) => case::load_file(p, &arg.set)?,
        None => case::load_demo(&arg.set)?,
    })
}

fn load_rules(arg: &RulesArg) -> Result<Table, CliError> {
    Ok(match &arg.rules {
        Some(p) => rules::load_file(p)?,
        None => rules::load_default()?,
    })
}

/// Case files named by paths (folders expand to their *.yaml files, sorted).
fn case_files(paths: &[PathBuf]) -> Result<Vec<PathBuf>, CliError> {
    let mut out = Vec::new();
    for p in paths {
        if p.is_dir() {
            let rd = std::fs::read_dir(p).map_err(|source| CliError::Folder {
                path: p.clone(),
                source,
            })?;
            let mut v: Vec<PathBuf> = rd
                .filter_map(|e| e.ok().map(|e| e.path()))
                .filter(|x| x.extension().is_some_and(|e| e == "yaml" || e == "yml"))
                .collect();
            v.sort();
            out.extend(v);
        } else {
            out.push(p.clone());
        }
    }
    Ok(out)
}

/// Load a case, build its lanes and wind it.
fn wound_case(arg: &CaseArg, opt: winding::Options) -> Result<(Case, Lanes, Wound), CliError> {
    let c = load(arg)?;
    let l = lanes::build(&c);
    let w = winding::wind(
        &winding::WindInput::new(&c.material, &c.roll, &c.winding),
        &l,
        opt,
    )?;
    Ok((c, l, w))
}

/// `template`.
pub fn template(out: Output) -> Result<Outcome, CliError> {
    let s = out.pick(report::check_view::template_json, || {
        report::case_view::TEMPLATE.to_string()
    })?;
    Ok(Outcome::Ok(s))
}

/// `check`: every case is loaded; any that fails is reported, all together.
pub fn check(cases: &[PathBuf], set: &[String], out: Output) -> Result<Outcome, CliError> {
    let mut loaded = Vec::new();
    let mut errors = Vec::new();
    if cases.is_empty() {
        loaded.push(case::load_demo(set)?);
    }
    for p in cases {
        match case::load_file(p, set) {
            Ok(c) => loaded.push(c),
            Err(e) => errors.push(e),
        }
    }
    if !errors.is_empty() {
        return Err(CliError::Cases(errors));
    }
    let json = if out.json {
        report::check_view::cases_json(&loaded)?
    } else {
        Value::Null
    };
    let s = out.pick(|| json, || report::check_view::cases_text(&loaded, out.sys))?;
    Ok(Outcome::Ok(s))
}

/// `lanes`.
pub fn lanes(arg: &CaseArg, out: Output) -> Result<Outcome, CliError> {
    let c = load(arg)?;
    let l = lanes::build(&c);
    let s = out.pick(
        || report::case_view::lanes_json(&c, &l),
        || report::case_view::lanes_text(&c, &l, out.sys),
    )?;
    Ok(Outcome::Ok(s))
}

/// `stress`.
pub fn stress(
    arg: &CaseArg,
    nodes: usize,
    levelling: f64,
    out: Output,
) -> Result<Outcome, CliError> {
    let (c, _, w) = wound_case(arg, winding::Options { nodes, levelling })?;
    let s = out.pick(
        || report::stress_view::json(&c, &w),
        || report::stress_view::text(&c, &w, out.sys),
    )?;
    Ok(Outcome::Ok(s))
}

/// `age`.
pub fn age(arg: &CaseArg, out: Output) -> Result<Outcome, CliError> {
    let (c, l, w) = wound_case(arg, winding::Options::default())?;
    let a = crate::fit::age_measured(&c, &l, &w, &AgeOptions::default())?;
    let s = out.pick(
        || report::age_view::json(&c, &a),
        || report::age_view::text(&c, &l, &a, out.sys),
    )?;
    Ok(Outcome::Ok(s))
}

/// `fit`.
pub fn fit(arg: &CaseArg, out: Output) -> Result<Outcome, CliError> {
    let (c, l, w) = wound_case(arg, winding::Options::default())?;
    let f = crate::fit::fit_roll(&c, &l, &w, &AgeOptions::default())?;
    let s = out.pick(
        || report::fit_view::json(&c, &f),
        || report::fit_view::text(&c, &l, &f, out.sys),
    )?;
    Ok(Outcome::Ok(s))
}

/// `diagnose`: findings exit with 1; `--out` writes the report files first.
pub fn diagnose(
    arg: &CaseArg,
    rules: &RulesArg,
    dir: Option<&Path>,
    out: Output,
) -> Result<Outcome, CliError> {
    let c = load(arg)?;
    let table = load_rules(rules)?;
    let d = diagnose::diagnose(&c, &table, &DiagnoseOptions::default())?;
    if let Some(dir) = dir {
        write_report(dir, &c, &d, out.sys)?;
    }
    let s = out.pick(
        || report::diagnose_view::json(&d),
        || report::diagnose_view::text(&d, out.sys),
    )?;
    Ok(if d.findings.is_empty() {
        Outcome::Ok(s)
    } else {
        Outcome::Findings(s)
    })
}

/// `whatif`: the case as measured against the case with the `--set` changes.
pub fn whatif(arg: &CaseArg, rules: &RulesArg, out: Output) -> Result<Outcome, CliError> {
    if arg.set.is_empty() {
        return Err(CliError::WhatIfNeedsSet);
    }
    let base = load(&CaseArg {
        case: arg.case.clone(),
        set: Vec::new(),
    })?;
    let variant = load(arg)?;
    let table = load_rules(rules)?;
    let w = diagnose::what_if(&base, &variant, &arg.set, &table, &Default::default())?;
    let s = if out.json {
        report::json_text(&report::whatif_json(&w)?)?
    } else {
        report::whatif_text(&w, out.sys)?
    };
    Ok(Outcome::Ok(s))
}

/// `triage`: every roll diagnosed with the fast settings, worst first; a roll that fails is a
/// row, not the end of the run.
pub fn triage(paths: &[PathBuf], rules: &RulesArg, out: Output) -> Result<Outcome, CliError> {
    use rayon::prelude::*;
    let table = load_rules(rules)?;
    let files = case_files(paths)?;
    if files.is_empty() {
        return Err(CliError::TriageNeedsFiles);
    }
    let opt = DiagnoseOptions {
        nodes: crate::winding::DEFAULT_NODES,
        what_if: false,
    };
    let mut rows: Vec<TriageRow> = files
        .par_iter()
        .map(|f| match case::load_file(f, &[]) {
            Ok(c) => match diagnose::diagnose(&c, &table, &opt) {
                Ok(d) => TriageRow::from_diagnosis(f, &d),
                Err(e) => TriageRow::failed(f, &e.to_string()),
            },
            Err(e) => TriageRow::failed(f, &e.to_string()),
        })
        .collect();
    rows.sort_by(|a, b| {
        b.rank_key()
            .total_cmp(&a.rank_key())
            .then(a.file.cmp(&b.file))
    });
    let any = rows
        .iter()
        .any(|r| !r.defects.is_empty() || r.error.is_some());
    let s = out.pick(|| report::triage_json(&rows), || report::triage_text(&rows))?;
    Ok(if any {
        Outcome::Findings(s)
    } else {
        Outcome::Ok(s)
    })
}

/// `rules features`.
pub fn rules_features(out: Output) -> Result<Outcome, CliError> {
    let s = out.pick(
        report::rules_view::features_json,
        report::rules_view::features_text,
    )?;
    Ok(Outcome::Ok(s))
}

/// `rules lint`: a table with problems fails with all of them.
pub fn rules_lint(file: Option<&Path>, out: Output) -> Result<Outcome, CliError> {
    let t = load_rules(&RulesArg {
        rules: file.map(Path::to_path_buf),
    })?;
    let s = out.pick(
        || report::rules_view::lint_json(&t),
        || report::rules_view::lint_text(&t),
    )?;
    Ok(Outcome::Ok(s))
}

/// The report files of a diagnosis: lane plot, pressure plot, Markdown and JSON, each written
/// whole or not at all.
fn write_report(dir: &Path, c: &Case, d: &Diagnosis, sys: System) -> Result<(), CliError> {
    let fail = |source: std::io::Error| CliError::Report {
        dir: dir.to_path_buf(),
        source,
    };
    std::fs::create_dir_all(dir).map_err(fail)?;
    let stem = report::file_stem(&c.id);
    let plot = format!("{stem}_lanes.svg");
    let files = [
        (plot.clone(), report::diagnose_view::svg(d, c.roll.width_m)),
        (
            format!("{stem}_pressure.svg"),
            report::diagnose_view::pressure_svg(d),
        ),
        (
            format!("{stem}_report.md"),
            report::diagnose_view::markdown(d, &plot, sys),
        ),
        (
            format!("{stem}_diagnosis.json"),
            report::json_text(&report::diagnose_view::json(d))?,
        ),
    ];
    for (name, content) in files {
        report::write_atomic(&dir.join(name), &content).map_err(fail)?;
    }
    Ok(())
}
