//! Command-line interface: clap arguments ([`args`]), one function per subcommand
//! ([`commands`]), and failures with their exit codes ([`error`]).
//!
//! **Invariant:** the only module that knows clap; makes no words of its own (`report` does).
//! Exit codes: 0 ok, 1 findings, 2 bad input, a usage error, a model that could not be solved, or
//! output that could not be written ([`CliError::exit_code`]), 3 a roll the model does not explain
//! (its misfit over [`crate::fit::MISFIT_LIMIT`]; before 1, as the findings rest on that model).

pub mod args;
pub mod commands;
pub mod error;
pub mod triage;

pub use args::{CaseArg, Cli, Command, RulesArg, RulesCommand, TriageFormat, UnitsArg};
pub use commands::load;
pub use error::CliError;

use crate::units::System;
use clap::{CommandFactory, Parser};
use commands::Output;
use std::ffi::OsString;
use std::io::IsTerminal;
use std::io::Write;
use std::process::ExitCode;

/// What a command produced.
pub enum Outcome {
    /// Printed; nothing to flag.
    Ok(String),
    /// Printed; findings to flag (exit 1).
    Findings(String),
    /// Printed; some inputs were bad (exit 2), e.g. a triage with a broken case file.
    BadInput(String),
    /// Printed; the model does not explain a roll's surveys (exit 3), findings or not.
    NotExplained(String),
}

/// Exit code of a roll the model does not explain ([`Outcome::NotExplained`]).
pub const NOT_EXPLAINED_EXIT: u8 = 3;

impl Outcome {
    /// `NotExplained` when the model does not explain the roll, else `Findings` or `Ok`.
    pub fn of_roll(s: String, findings: bool, fit: &crate::fit::ModelFit) -> Outcome {
        if fit.verdict == crate::fit::Verdict::NotExplained {
            Outcome::NotExplained(s)
        } else if findings {
            Outcome::Findings(s)
        } else {
            Outcome::Ok(s)
        }
    }
}

/// Run a parsed command.
pub fn run(cli: &Cli) -> Result<Outcome, CliError> {
    // the option wins; a bad environment value is an error even then, so it is found
    let env = crate::input::limit_from_env().map_err(CliError::InputLimit)?;
    if let Some(b) = cli.max_input_size.or(env) {
        crate::input::set_max_input_bytes(b);
    }
    let out = Output {
        json: cli.json,
        sys: match cli.units {
            UnitsArg::Si => System::Si,
            UnitsArg::Us => System::Us,
        },
        quiet: cli.quiet,
        verbose: cli.verbose,
    };
    // the case's messages (its warnings, its errors) in the units asked for; JSON stays SI
    crate::units::set_message_system(if out.json { System::Si } else { out.sys });
    match &cli.command {
        Command::Template => commands::template(out),
        Command::Check { cases, set } => commands::check(cases, set, out),
        Command::Lanes(arg) => commands::lanes(arg, out),
        Command::Stress {
            case,
            nodes,
            levelling,
        } => commands::stress(case, *nodes, *levelling, out),
        Command::Age(arg) => commands::age(arg, out),
        Command::Fit(arg) => commands::fit(arg, out),
        Command::Diagnose {
            case,
            rules,
            out: dir,
            date,
        } => commands::diagnose(case, rules, dir.as_deref(), date.as_deref(), out),
        Command::Whatif { case, rules } => commands::whatif(case, rules, out),
        Command::Triage {
            paths,
            rules,
            format,
            resume,
        } => triage::triage(paths, rules, *format, resume.as_deref(), out),
        Command::Rules { command } => match command {
            RulesCommand::Features => commands::rules_features(out),
            RulesCommand::Lint { file } => commands::rules_lint(file.as_deref(), out),
            RulesCommand::Show => commands::rules_show(out),
        },
        Command::Completions { shell } => {
            let mut buf = Vec::new();
            clap_complete::generate(*shell, &mut Cli::command(), "rollsleuth", &mut buf);
            Ok(Outcome::Ok(String::from_utf8_lossy(&buf).into_owned()))
        }
        Command::Man => {
            let mut buf = Vec::new();
            clap_mangen::Man::new(Cli::command())
                .render(&mut buf)
                .map_err(|source| CliError::Stdout { source })?;
            Ok(Outcome::Ok(String::from_utf8_lossy(&buf).into_owned()))
        }
    }
}

/// The width tables wrap to: `--width`, else `COLUMNS`, else the terminal's width when standard
/// output is a terminal, else [`report::DEFAULT_WIDTH`] (so piped output is the same for all).
fn table_width(option: Option<u16>) -> u16 {
    if let Some(w) = option {
        return w;
    }
    if let Some(w) = std::env::var("COLUMNS")
        .ok()
        .and_then(|v| v.trim().parse::<u16>().ok())
        .filter(|&w| w >= 40)
    {
        return w;
    }
    if std::io::stdout().is_terminal() {
        if let Some((w, _)) = terminal_width() {
            return w.max(40);
        }
    }
    crate::report::DEFAULT_WIDTH
}

/// The terminal's size as comfy-table sees it (columns, rows).
fn terminal_width() -> Option<(u16, u16)> {
    let t = comfy_table::Table::new();
    t.width().map(|w| (w, 0))
}

/// Whether `--json` is among the arguments (errors before parsing finished are JSON then too).
fn wants_json(args: &[OsString]) -> bool {
    args.iter().skip(1).any(|a| a == "--json")
}

/// An error on standard error: `error: message`, or a JSON object with `--json`.
fn print_error(json: bool, kind: &str, code: u8, message: &str) {
    let mut err = std::io::stderr().lock();
    if json {
        let v =
            serde_json::json!({ "error": { "kind": kind, "exit_code": code, "message": message } });
        let _ = writeln!(err, "{v}");
    } else {
        let _ = writeln!(err, "error: {message}");
    }
}

/// Human output keeps results on standard output, its prose wrapped to the table width; its
/// `note:` and `warning:` lines go to standard error (notes not with `--quiet`). JSON, CSV,
/// YAML, completions and the man page are left whole.
fn route_notes(o: Outcome, cli: &Cli) -> Outcome {
    if cli.json {
        return o;
    }
    let prose = !matches!(
        cli.command,
        Command::Template
            | Command::Completions { .. }
            | Command::Man
            | Command::Rules {
                command: RulesCommand::Show
            }
            | Command::Triage {
                format: TriageFormat::Csv | TriageFormat::Json,
                ..
            }
    );
    let width = crate::report::width() as usize;
    let wrap = |s: &str| {
        if prose {
            crate::report::wrap_prose(s, width)
        } else {
            s.to_string()
        }
    };
    let split = |s: String| {
        let mut keep = String::with_capacity(s.len());
        let mut err = String::new();
        for line in s.split_inclusive('\n') {
            let note = line.starts_with("note: ");
            if note || line.starts_with("warning: ") {
                if !(note && cli.quiet) {
                    err.push_str(line);
                }
            } else {
                keep.push_str(line);
            }
        }
        let _ = std::io::stderr().lock().write_all(wrap(&err).as_bytes());
        wrap(&keep)
    };
    match o {
        Outcome::Ok(s) => Outcome::Ok(split(s)),
        Outcome::Findings(s) => Outcome::Findings(split(s)),
        Outcome::BadInput(s) => Outcome::BadInput(split(s)),
        Outcome::NotExplained(s) => Outcome::NotExplained(split(s)),
    }
}

/// Exit code of a usage error (as clap's own, and as for bad input).
pub const USAGE_EXIT: u8 = 2;

/// Entry point used by the binary.
pub fn main(args: impl IntoIterator<Item = OsString>) -> ExitCode {
    let args: Vec<OsString> = args.into_iter().collect();
    let json = wants_json(&args);
    let cli = match Cli::try_parse_from(&args) {
        Ok(c) => c,
        Err(e) if !e.use_stderr() => {
            // --help and --version
            let _ = e.print();
            return ExitCode::SUCCESS;
        }
        Err(e) if json => {
            let text = e.render().to_string();
            let first = text
                .lines()
                .next()
                .unwrap_or("")
                .trim_start_matches("error: ");
            print_error(true, "usage", USAGE_EXIT, first);
            return ExitCode::from(USAGE_EXIT);
        }
        Err(e) => {
            let _ = e.print();
            return ExitCode::from(USAGE_EXIT);
        }
    };
    crate::report::set_width(table_width(cli.width));
    let result = run(&cli).map(|o| route_notes(o, &cli));
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
        Ok(Outcome::BadInput(s)) => {
            let _ = out.write_all(s.as_bytes());
            ExitCode::from(2)
        }
        Ok(Outcome::NotExplained(s)) => {
            let _ = out.write_all(s.as_bytes());
            ExitCode::from(NOT_EXPLAINED_EXIT)
        }
        Err(e) => {
            // a model's error does not name the case file it came from; a case's error does
            let text = match model_case_file(&cli.command, &e) {
                Some(f) => format!("{f}: {e}"),
                None => e.to_string(),
            };
            print_error(cli.json, e.kind(), e.exit_code(), &text);
            ExitCode::from(e.exit_code())
        }
    }
}

/// The case file a command read (`<standard input>` for `-`), when its error came from the
/// model (winding, storage, fit or diagnosis) rather than from reading the case: the source the
/// message should name.
fn model_case_file(cmd: &Command, e: &CliError) -> Option<String> {
    if e.kind() != "model" {
        return None;
    }
    let arg = match cmd {
        Command::Lanes(c) | Command::Age(c) | Command::Fit(c) => c,
        Command::Stress { case, .. }
        | Command::Diagnose { case, .. }
        | Command::Whatif { case, .. } => case,
        _ => return None,
    };
    arg.case.as_deref().map(|p| {
        if p.as_os_str() == "-" {
            commands::STDIN_NAME.to_string()
        } else {
            p.display().to_string()
        }
    })
}
