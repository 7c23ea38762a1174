//! Command-line interface: clap arguments, dispatch and exit codes.
//!
//! **Invariant:** the only module that knows clap. Exit codes: 0 ok, 1 findings or usage error,
//! 2 bad input or a model that could not be solved.

use crate::case::{self, Case, CaseError};
use crate::report;
use crate::units::System;
use clap::{Args, Parser, Subcommand, ValueEnum};
use std::ffi::OsString;
use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

/// Find why a wound roll unwinds with baggy lanes, puckers or ridges.
#[derive(Parser, Debug)]
#[command(name = "rollsleuth", version, about, long_about = None)]
pub struct Cli {
    /// Print JSON (SI units, field names carry their unit) instead of tables.
    #[arg(long, global = true)]
    pub json: bool,
    /// Units for human output.
    #[arg(long, global = true, value_enum, default_value_t = UnitsArg::Si)]
    pub units: UnitsArg,
    #[command(subcommand)]
    pub command: Command,
}

/// Unit system for human output.
#[derive(Clone, Copy, Debug, ValueEnum, PartialEq, Eq)]
pub enum UnitsArg {
    /// mm, um, kPa, N/m, C
    Si,
    /// in, mil, psi, pli, F
    Us,
}

/// Case file and overrides.
#[derive(Args, Debug, Clone)]
pub struct CaseArg {
    /// Case file (YAML). Without one, the embedded demo case is used.
    pub case: Option<PathBuf>,
    /// Override a field before validation, e.g. --set winding.tension="1.8 pli" (repeatable).
    #[arg(long = "set", value_name = "PATH=VALUE")]
    pub set: Vec<String>,
}

/// Subcommands.
#[derive(Subcommand, Debug)]
pub enum Command {
    /// Validate case files and print them normalised to SI, defaults marked with their source.
    Check {
        /// Case files. Without any, the embedded demo case is checked.
        cases: Vec<PathBuf>,
        /// Override a field before validation (repeatable).
        #[arg(long = "set", value_name = "PATH=VALUE")]
        set: Vec<String>,
    },
    /// Per-lane table: caliper, diameter and hardness deviations, wound-in strain difference.
    Lanes(CaseArg),
    /// Print a commented starter case file.
    Template,
    /// Wound-in radial and tangential stresses per lane.
    Stress {
        #[command(flatten)]
        case: CaseArg,
        /// Radial nodes per lane.
        #[arg(long, default_value_t = 401)]
        nodes: usize,
        /// CD levelling fraction 0..1 (0: independent lanes).
        #[arg(long, default_value_t = crate::winding::DEFAULT_LEVELLING)]
        levelling: f64,
    },
    /// Creep, relaxation and moisture change through the storage history, per lane.
    Age(CaseArg),
    /// Fit the creep model per lane to the measured hardness and diameter; strain at unwind.
    Fit(CaseArg),
    /// The whole chain: likely defects at unwind, why, how sure, root-cause shares and
    /// corrections checked by re-running the model.
    Diagnose {
        #[command(flatten)]
        case: CaseArg,
        #[command(flatten)]
        rules: RulesArg,
        /// Write a root-cause report (Markdown, SVG plot, JSON) into this folder.
        #[arg(long, value_name = "DIR")]
        out: Option<PathBuf>,
    },
    /// Compare the case as measured with the same roll changed by --set (e.g. lower tension).
    Whatif {
        #[command(flatten)]
        case: CaseArg,
        #[command(flatten)]
        rules: RulesArg,
    },
    /// Triage many rolls: one line each, worst first.
    Triage {
        /// Case files or folders of case files (*.yaml).
        paths: Vec<PathBuf>,
        #[command(flatten)]
        rules: RulesArg,
    },
    /// Rule tables: check one, or list the features rules may use.
    Rules {
        #[command(subcommand)]
        command: RulesCommand,
    },
}

/// Rule table choice.
#[derive(Args, Debug, Clone)]
pub struct RulesArg {
    /// Rule table (YAML). Default: the shipped rules/default.yaml.
    #[arg(long, value_name = "FILE")]
    pub rules: Option<PathBuf>,
}

/// `rules` subcommands.
#[derive(Subcommand, Debug)]
pub enum RulesCommand {
    /// Check a rule table (default: the shipped one).
    Lint {
        /// Rule table to check.
        file: Option<PathBuf>,
    },
    /// List the features a rule may test.
    Features,
}

/// What a command produced.
pub enum Outcome {
    /// Printed; nothing to flag.
    Ok(String),
    /// Printed; findings to flag (exit 1).
    Findings(String),
}

/// An error for the user: message and exit code.
#[derive(Debug)]
pub struct Failure {
    pub message: String,
    pub code: u8,
}

/// Errors of the library become bad-input failures (exit 2) with their message.
macro_rules! bad_input {
    ($($t:ty),*) => {$(
        impl From<$t> for Failure {
            fn from(e: $t) -> Self {
                Failure {
                    message: format!("error: {e}"),
                    code: 2,
                }
            }
        }
    )*};
}

bad_input!(
    CaseError,
    crate::storage::AgeError,
    crate::fit::FitError,
    crate::rules::RulesError,
    crate::diagnose::DiagnoseError,
    crate::winding::WindError
);

fn load_rules(arg: &RulesArg) -> Result<crate::rules::Table, Failure> {
    Ok(match &arg.rules {
        Some(p) => crate::rules::load_file(p)?,
        None => crate::rules::load_default()?,
    })
}

/// Case files named by paths (folders expand to their *.yaml files, sorted).
fn case_files(paths: &[PathBuf]) -> Result<Vec<PathBuf>, Failure> {
    let mut out = Vec::new();
    for p in paths {
        if p.is_dir() {
            let rd = std::fs::read_dir(p).map_err(|e| Failure {
                message: format!("error: {}: cannot read the folder: {e}", p.display()),
                code: 2,
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

/// Load the case named by `arg`, or the demo case.
pub fn load(arg: &CaseArg) -> Result<Case, Failure> {
    Ok(match &arg.case {
        Some(p) => case::load_file(p, &arg.set)?,
        None => case::load_demo(&arg.set)?,
    })
}

/// Load a case, build its lanes and wind it.
fn wound_case(
    arg: &CaseArg,
    opt: crate::winding::Options,
) -> Result<(Case, crate::lanes::Lanes, crate::winding::Wound), Failure> {
    let c = load(arg)?;
    let l = crate::lanes::build(&c);
    let w = crate::winding::wind(
        &crate::winding::WindInput::new(&c.material, &c.roll, &c.winding),
        &l,
        opt,
    )?;
    Ok((c, l, w))
}

fn emit_json(v: &serde_json::Value) -> String {
    let mut s =
        serde_json::to_string_pretty(v).unwrap_or_else(|e| format!("{{\"error\": \"{e}\"}}"));
    s.push('\n');
    s
}

/// Run a parsed command.
pub fn run(cli: &Cli) -> Result<Outcome, Failure> {
    let sys = match cli.units {
        UnitsArg::Si => System::Si,
        UnitsArg::Us => System::Us,
    };
    match &cli.command {
        Command::Template => Ok(Outcome::Ok(if cli.json {
            emit_json(&serde_json::json!({ "template_yaml": report::case_view::TEMPLATE }))
        } else {
            report::case_view::TEMPLATE.to_string()
        })),
        Command::Check { cases, set } => {
            let mut loaded = Vec::new();
            let mut errors = Vec::new();
            if cases.is_empty() {
                loaded.push(case::load_demo(set)?);
            }
            for p in cases {
                match case::load_file(p, set) {
                    Ok(c) => loaded.push(c),
                    Err(e) => errors.push(format!("error: {e}")),
                }
            }
            if !errors.is_empty() {
                return Err(Failure {
                    message: errors.join("\n"),
                    code: 2,
                });
            }
            if cli.json {
                let v: Vec<_> = loaded.iter().map(report::case_view::check_json).collect();
                Ok(Outcome::Ok(emit_json(&serde_json::json!({ "cases": v }))))
            } else {
                let mut s = String::new();
                for c in &loaded {
                    s.push_str(&report::case_view::check_text(c, sys));
                    s.push_str(&format!("{}: ok\n\n", c.source));
                }
                Ok(Outcome::Ok(s))
            }
        }
        Command::Lanes(arg) => {
            let c = load(arg)?;
            let l = crate::lanes::build(&c);
            Ok(Outcome::Ok(if cli.json {
                emit_json(&report::case_view::lanes_json(&c, &l))
            } else {
                report::case_view::lanes_text(&c, &l, sys)
            }))
        }
        Command::Stress {
            case: arg,
            nodes,
            levelling,
        } => {
            let (c, _, w) = wound_case(
                arg,
                crate::winding::Options {
                    nodes: *nodes,
                    levelling: *levelling,
                },
            )?;
            Ok(Outcome::Ok(if cli.json {
                emit_json(&report::stress_view::json(&c, &w))
            } else {
                report::stress_view::text(&c, &w, sys)
            }))
        }
        Command::Age(arg) => {
            let (c, l, w) = wound_case(arg, crate::winding::Options::default())?;
            let a = crate::fit::age_measured(&c, &l, &w, &crate::storage::AgeOptions::default())?;
            Ok(Outcome::Ok(if cli.json {
                emit_json(&report::age_view::json(&c, &a))
            } else {
                report::age_view::text(&c, &l, &a, sys)
            }))
        }
        Command::Fit(arg) => {
            let (c, l, w) = wound_case(arg, crate::winding::Options::default())?;
            let f = crate::fit::fit_roll(&c, &l, &w, &crate::storage::AgeOptions::default())?;
            Ok(Outcome::Ok(if cli.json {
                emit_json(&report::fit_view::json(&c, &f))
            } else {
                report::fit_view::text(&c, &l, &f, sys)
            }))
        }
        Command::Diagnose {
            case: arg,
            rules,
            out,
        } => {
            let c = load(arg)?;
            let table = load_rules(rules)?;
            let d = crate::diagnose::diagnose(&c, &table, &Default::default())?;
            if let Some(dir) = out {
                write_report(dir, &c, &d, sys)?;
            }
            let text = if cli.json {
                emit_json(&report::diagnose_view::json(&d))
            } else {
                report::diagnose_view::text(&d, sys)
            };
            Ok(if d.findings.is_empty() {
                Outcome::Ok(text)
            } else {
                Outcome::Findings(text)
            })
        }
        Command::Whatif { case: arg, rules } => {
            if arg.set.is_empty() {
                return Err(Failure {
                    message: "error: whatif needs at least one --set path=value, e.g. --set winding.tension=\"1.8 pli\"".into(),
                    code: 1,
                });
            }
            let base = load(&CaseArg {
                case: arg.case.clone(),
                set: Vec::new(),
            })?;
            let variant = load(arg)?;
            let table = load_rules(rules)?;
            let w =
                crate::diagnose::what_if(&base, &variant, &arg.set, &table, &Default::default())?;
            Ok(Outcome::Ok(if cli.json {
                emit_json(&serde_json::to_value(&w).unwrap_or_default())
            } else {
                report::whatif_text(&w, sys)
            }))
        }
        Command::Triage { paths, rules } => {
            let table = load_rules(rules)?;
            let files = case_files(paths)?;
            if files.is_empty() {
                return Err(Failure {
                    message: "error: triage needs case files or folders holding *.yaml case files"
                        .into(),
                    code: 1,
                });
            }
            let opt = crate::diagnose::DiagnoseOptions {
                nodes: 101,
                what_if: false,
            };
            use rayon::prelude::*;
            let mut rows: Vec<report::TriageRow> = files
                .par_iter()
                .map(|f| match case::load_file(f, &[]) {
                    Ok(c) => match crate::diagnose::diagnose(&c, &table, &opt) {
                        Ok(d) => report::TriageRow::from_diagnosis(f, &d),
                        Err(e) => report::TriageRow::failed(f, &e.to_string()),
                    },
                    Err(e) => report::TriageRow::failed(f, &e.to_string()),
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
            let text = if cli.json {
                emit_json(&serde_json::json!({ "rolls": rows, "safety": report::SAFETY }))
            } else {
                report::triage_text(&rows)
            };
            Ok(if any {
                Outcome::Findings(text)
            } else {
                Outcome::Ok(text)
            })
        }
        Command::Rules { command } => match command {
            RulesCommand::Features => {
                let v: Vec<_> = crate::diagnose::features::FEATURES
                    .iter()
                    .map(|f| serde_json::json!({"feature": f.name, "meaning": f.meaning}))
                    .collect();
                Ok(Outcome::Ok(if cli.json {
                    emit_json(&serde_json::json!({ "features": v }))
                } else {
                    let mut t = report::table(&["feature", "meaning"]);
                    for f in crate::diagnose::features::FEATURES {
                        t.add_row(vec![f.name, f.meaning]);
                    }
                    format!("{t}\n")
                }))
            }
            RulesCommand::Lint { file } => {
                let t = load_rules(&RulesArg {
                    rules: file.clone(),
                })?;
                let msg = format!("{}: ok, {} rules covering {}", t.source, t.rules.len(), {
                    let mut d: Vec<&str> = t.rules.iter().map(|r| r.defect.as_str()).collect();
                    d.sort();
                    d.dedup();
                    d.join(", ")
                });
                Ok(Outcome::Ok(if cli.json {
                    emit_json(
                        &serde_json::json!({ "file": t.source, "ok": true, "rules": t.rules.len() }),
                    )
                } else {
                    format!("{msg}\n")
                }))
            }
        },
    }
}

fn write_report(
    dir: &std::path::Path,
    c: &Case,
    d: &crate::diagnose::Diagnosis,
    sys: System,
) -> Result<(), Failure> {
    let fail = |e: std::io::Error| Failure {
        message: format!("error: {}: cannot write the report: {e}", dir.display()),
        code: 2,
    };
    std::fs::create_dir_all(dir).map_err(fail)?;
    let stem: String =
        c.id.chars()
            .map(|ch| {
                if ch.is_ascii_alphanumeric() || ch == '-' || ch == '_' {
                    ch
                } else {
                    '_'
                }
            })
            .collect();
    let plot = format!("{stem}_lanes.svg");
    report::write_atomic(
        &dir.join(&plot),
        &report::diagnose_view::svg(d, c.roll.width_m),
    )
    .map_err(fail)?;
    report::write_atomic(
        &dir.join(format!("{stem}_pressure.svg")),
        &report::diagnose_view::pressure_svg(d),
    )
    .map_err(fail)?;
    report::write_atomic(
        &dir.join(format!("{stem}_report.md")),
        &report::diagnose_view::markdown(d, &plot, sys),
    )
    .map_err(fail)?;
    report::write_atomic(
        &dir.join(format!("{stem}_diagnosis.json")),
        &emit_json(&report::diagnose_view::json(d)),
    )
    .map_err(fail)?;
    Ok(())
}

/// Entry point used by the binary.
pub fn main(args: impl IntoIterator<Item = OsString>) -> ExitCode {
    let cli = match Cli::try_parse_from(args) {
        Ok(c) => c,
        Err(e) => {
            let code = if e.use_stderr() { 1 } else { 0 };
            let _ = e.print();
            return ExitCode::from(code);
        }
    };
    let result = run(&cli);
    let stdout = std::io::stdout();
    let mut out = stdout.lock();
    match result {
        Ok(Outcome::Ok(s)) => {
            let _ = out.write_all(s.as_bytes());
            ExitCode::SUCCESS
        }
        Ok(Outcome::Findings(s)) => {
            let _ = out.write_all(s.as_bytes());
            ExitCode::from(1)
        }
        Err(f) => {
            let _ = writeln!(std::io::stderr(), "{}", f.message);
            ExitCode::from(f.code)
        }
    }
}
