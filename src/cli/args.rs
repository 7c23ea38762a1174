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
    /// Units for human output (tables, headlines, notes, errors); JSON stays SI.
    #[arg(
        long,
        global = true,
        value_enum,
        ignore_case = true,
        env = "ROLLSLEUTH_UNITS",
        default_value_t = UnitsArg::Si
    )]
    pub units: UnitsArg,
    /// Print only results and errors: no progress, warnings or notes on standard error.
    #[arg(long, short, global = true, conflicts_with = "verbose")]
    pub quiet: bool,
    /// Also print notes (defaults used, files read) on standard error.
    #[arg(long, short, global = true)]
    pub verbose: bool,
    /// Table width in columns. Default: the COLUMNS variable, else the terminal's width, else 100
    /// when standard output is not a terminal.
    #[arg(long, global = true, value_name = "COLUMNS", value_parser = clap::value_parser!(u16).range(40..))]
    pub width: Option<u16>,
    /// Largest input (case, rule table, CSV, standard input) in bytes, above zero; default 8 MiB,
    /// or the environment variable ROLLSLEUTH_MAX_INPUT_SIZE.
    #[arg(long, global = true, value_name = "BYTES", value_parser = input_size)]
    pub max_input_size: Option<u64>,
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
    /// Case file (YAML); `-` reads it from standard input. Without one, the embedded demo case
    /// is used.
    pub case: Option<PathBuf>,
    /// Override a field before validation, e.g. --set winding.tension="1.8 pli" (repeatable).
    #[arg(long = "set", value_name = "PATH=VALUE")]
    pub set: Vec<String>,
    /// Number of equal lanes across the width, 1 to 400 (the same as --set lanes.count=N).
    #[arg(long, value_name = "N", value_parser = lane_count)]
    pub lanes: Option<u32>,
}

impl CaseArg {
    /// The overrides to apply: the lane count of `--lanes` first, then the `--set`s in order.
    pub fn sets(&self) -> Vec<String> {
        let lanes = self.lanes.map(|n| format!("lanes.count={n}"));
        lanes.into_iter().chain(self.set.iter().cloned()).collect()
    }
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
        /// Radial grid nodes per lane, 5 to 20001 (the output adds the refined zone's sub-nodes
        /// under the surface).
        #[arg(long, default_value_t = crate::winding::DEFAULT_NODES, value_parser = grid_nodes)]
        nodes: usize,
        /// Uniform CD levelling 0..1 on top of the shear-lag levelling (0: shear lag only; 1:
        /// equal lane tensions).
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
        /// Write the root-cause report into this folder: CASE.html (self-contained, with plots),
        /// CASE.md (for tickets) and CASE.json; the files written are listed on standard error.
        #[arg(long, value_name = "DIR")]
        out: Option<PathBuf>,
        /// Analysis date printed in the report, YYYY-MM-DD, or `today` for the system clock.
        #[arg(long, value_name = "DATE")]
        date: Option<String>,
    },
    /// Compare the case as measured with the same roll changed by --set (e.g. lower tension).
    Whatif {
        #[command(flatten)]
        case: CaseArg,
        #[command(flatten)]
        rules: RulesArg,
    },
    /// Triage many rolls: one line each, worst first.
    ///
    /// Worst first: rolls not diagnosed, then rolls beyond a physical limit (column "beyond
    /// limits", `limits_exceeded`), then the rest, each by the first finding's graded likelihood,
    /// its probability and its rule's label, then the length spread.
    Triage {
        /// Case files or folders of case files (*.yaml).
        paths: Vec<PathBuf>,
        #[command(flatten)]
        rules: RulesArg,
        /// Output format (--json is the same as --format json).
        #[arg(long, value_enum, default_value_t = TriageFormat::Table)]
        format: TriageFormat,
        /// Continue a batch from this earlier CSV output (`--format csv`): rolls it lists
        /// without an error are skipped, rolls that failed are run again, and the whole CSV is
        /// printed as a fresh run prints it (header, one row per file in file order, the earlier
        /// rows that stand in their places; rows of files not named this time last). Write it
        /// to a new file, then rename that over the old one.
        #[arg(long, value_name = "FILE")]
        resume: Option<PathBuf>,
    },
    /// Rule tables: check one, print the built-in one, or list the features rules may use.
    Rules {
        #[command(subcommand)]
        command: RulesCommand,
    },
    /// Print a shell completion script, e.g. `rollsleuth completions bash > rollsleuth.bash`.
    Completions {
        /// Shell to complete for.
        shell: clap_complete::Shell,
    },
    /// Print the manual page (roff), e.g. `rollsleuth man > rollsleuth.1`.
    Man,
}

/// How `triage` prints its rows.
#[derive(Clone, Copy, Debug, ValueEnum, PartialEq, Eq)]
pub enum TriageFormat {
    /// A table for people, worst roll first.
    Table,
    /// One CSV row per roll (SI, header with units); usable with --resume.
    Csv,
    /// A JSON document.
    Json,
}

/// Rule table choice.
#[derive(Args, Debug, Clone)]
pub struct RulesArg {
    /// Rule table (YAML). Default: the built-in default table (see `rollsleuth rules show`).
    #[arg(long, value_name = "FILE")]
    pub rules: Option<PathBuf>,
}

/// `rules` subcommands.
#[derive(Subcommand, Debug)]
pub enum RulesCommand {
    /// Check a rule table (default: the built-in one).
    Lint {
        /// Rule table to check.
        file: Option<PathBuf>,
    },
    /// List the features a rule may test.
    Features,
    /// Print the built-in default rule table (YAML, or JSON with --json), a starting point for
    /// your own.
    Show,
}

/// Fewest radial grid nodes the winding accepts.
pub const MIN_NODES: usize = 5;
/// Most radial grid nodes `--nodes` accepts: three times the 6401-node reference of the grid
/// convergence study (benches/grid_convergence, where 401 nodes are within 0.21-0.80 %), so any
/// study has room, while a mistyped count cannot take the machine's memory and hours.
pub const MAX_NODES: usize = 20001;

/// `--nodes`: a whole number from [`MIN_NODES`] to [`MAX_NODES`].
fn grid_nodes(s: &str) -> Result<usize, String> {
    let fix = format!(
        "give a whole number from {MIN_NODES} to {MAX_NODES}; the default {} is within 1 % of the converged stress (benches/grid_convergence)",
        crate::winding::DEFAULT_NODES
    );
    match s.trim().parse::<usize>() {
        Ok(n) if (MIN_NODES..=MAX_NODES).contains(&n) => Ok(n),
        _ => Err(format!("not a grid node count. Fix: {fix}")),
    }
}

/// `--lanes`: a whole number of lanes from 1 to [`crate::case::MAX_LANE_COUNT`].
fn lane_count(s: &str) -> Result<u32, String> {
    let max = crate::case::MAX_LANE_COUNT;
    match s.trim().parse::<u32>() {
        Ok(n) if (1..=max).contains(&n) => Ok(n),
        _ => Err(format!(
            "not a lane count. Fix: give a whole number from 1 to {max}, e.g. --lanes 24"
        )),
    }
}

/// `--max-input-size`: a whole number of bytes above zero.
fn input_size(s: &str) -> Result<u64, String> {
    match crate::input::parse_size(s) {
        Some(b) => Ok(b),
        None => Err(format!(
            "not a size in bytes above zero. Fix: give a whole number of bytes, e.g. 16777216 for 16 MiB (the default is {})",
            crate::input::DEFAULT_MAX_INPUT_BYTES
        )),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn node_counts_and_input_sizes_have_bounds() {
        assert_eq!(grid_nodes("401"), Ok(401));
        assert_eq!(grid_nodes("20001"), Ok(20001));
        assert!(grid_nodes("4").is_err());
        assert!(grid_nodes("20002").is_err());
        assert!(grid_nodes("100000000").unwrap_err().contains("5 to 20001"));
        assert_eq!(input_size("1024"), Ok(1024));
        assert!(input_size("0").is_err());
        assert!(input_size("-1").is_err());
    }
}
