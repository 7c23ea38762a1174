//! Command-line interface: clap arguments ([`args`]), one function per subcommand
//! ([`commands`]), and failures with their exit codes ([`error`]).
//!
//! **Invariant:** the only module that knows clap; makes no words of its own (`report` does).
//! Exit codes: 0 ok, 1 findings or usage error, 2 bad input, a model that could not be solved, or
//! output that could not be written ([`CliError::exit_code`]).

pub mod args;
pub mod commands;
pub mod error;

pub use args::{CaseArg, Cli, Command, RulesArg, RulesCommand, UnitsArg};
pub use commands::load;
pub use error::CliError;

use crate::units::System;
use clap::Parser;
use commands::Output;
use std::ffi::OsString;
use std::io::Write;
use std::process::ExitCode;

/// What a command produced.
pub enum Outcome {
    /// Printed; nothing to flag.
    Ok(String),
    /// Printed; findings to flag (exit 1).
    Findings(String),
}

/// Run a parsed command.
pub fn run(cli: &Cli) -> Result<Outcome, CliError> {
    if let Some(b) = cli.max_input_size {
        crate::input::set_max_input_bytes(b);
    }
    let out = Output {
        json: cli.json,
        sys: match cli.units {
            UnitsArg::Si => System::Si,
            UnitsArg::Us => System::Us,
        },
    };
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
        } => commands::diagnose(case, rules, dir.as_deref(), out),
        Command::Whatif { case, rules } => commands::whatif(case, rules, out),
        Command::Triage { paths, rules } => commands::triage(paths, rules, out),
        Command::Rules { command } => match command {
            RulesCommand::Features => commands::rules_features(out),
            RulesCommand::Lint { file } => commands::rules_lint(file.as_deref(), out),
        },
    }
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
        Err(e) => {
            let _ = writeln!(std::io::stderr(), "error: {e}");
            ExitCode::from(e.exit_code())
        }
    }
}
