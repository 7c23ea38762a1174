//! The command line as clap reads it: global options, subcommands and their arguments.

use clap::{Args, Parser, Subcommand, ValueEnum};
use std::path::PathBuf;

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
        #[arg(long, default_value_t = crate::winding::DEFAULT_NODES)]
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
