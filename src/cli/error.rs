//! Why a command failed, and the one place that maps each kind of failure to an exit code.

use crate::case::CaseError;
use std::path::PathBuf;

/// A failed command. Printed as `error: ` and the message; the exit code follows from the kind
/// ([`CliError::exit_code`]).
#[derive(Debug, thiserror::Error)]
pub enum CliError {
    /// A case file that cannot be used.
    #[error(transparent)]
    Case(#[from] CaseError),
    /// Several case files that cannot be used (`check` reports them all).
    #[error("{}", join_errors(.0))]
    Cases(Vec<CaseError>),
    #[error(transparent)]
    Rules(#[from] crate::rules::RulesError),
    #[error(transparent)]
    Wind(#[from] crate::winding::WindError),
    #[error(transparent)]
    Age(#[from] crate::storage::AgeError),
    #[error(transparent)]
    Fit(#[from] crate::fit::FitError),
    #[error(transparent)]
    Diagnose(#[from] crate::diagnose::DiagnoseError),
    #[error(transparent)]
    WhatIfLanes(#[from] crate::report::WhatIfLanesError),
    #[error("{}: cannot read the folder: {source}", .path.display())]
    Folder {
        path: PathBuf,
        source: std::io::Error,
    },
    #[error("{}: cannot write the report: {source}", .dir.display())]
    Report {
        dir: PathBuf,
        source: crate::report::files::WriteError,
    },
    #[error("--out {}: is a file, not a folder. Fix: give --out a folder (it is created if missing), e.g. --out reports", .0.display())]
    OutNotFolder(PathBuf),
    #[error("--date {0:?}: not a calendar date; write YYYY-MM-DD (e.g. 2026-12-02) or `today`")]
    BadDate(String),
    #[error("{}: cannot read the rule table: {source}", .path.display())]
    RulesText {
        path: PathBuf,
        source: std::io::Error,
    },
    #[error("cannot write the JSON output: {0}")]
    Json(#[from] serde_json::Error),
    #[error("whatif needs at least one --set path=value, e.g. --set winding.tension=\"1.8 pli\"")]
    WhatIfNeedsSet,
    /// `whatif --set lanes...`: a change of the lane layout cannot be compared lane by lane.
    #[error("--set {set}: whatif compares the roll lane by lane before and after a change, so it cannot change the lane layout (lanes.count, lanes.edges). Fix: leave `lanes` out of whatif's --set, or run `{diagnose}` to see the roll at another lane layout")]
    WhatIfLaneLayout { set: String, diagnose: String },
    /// `whatif` with changes that move the lanes (profile positions, the width): no lane-by-lane
    /// comparison.
    #[error("--set {sets}: the change moves the lanes ({}), and whatif compares the roll lane by lane before and after a change. Fix: run `{diagnose}` to see the changed roll at its own lanes", lanes_moved(*.before, *.after))]
    WhatIfLanesMoved {
        sets: String,
        before: usize,
        after: usize,
        diagnose: String,
    },
    #[error("triage needs case files or folders holding *.yaml case files")]
    TriageNeedsFiles,
    #[error("{name}: the case {0}", name = super::commands::STDIN_NAME)]
    Stdin(crate::input::InputError),
    /// The input size limit from the environment is not a size.
    #[error("{0}")]
    InputLimit(String),
    #[error("cannot write the output: {source}")]
    Stdout { source: std::io::Error },
    #[error("{}: cannot resume from it: {message}; give the CSV that `triage --format csv` wrote", .path.display())]
    Resume { path: PathBuf, message: String },
    #[error("--resume needs --format csv (it continues a CSV output)")]
    ResumeNeedsCsv,
}

/// How the lanes moved: their count, else their centres.
fn lanes_moved(before: usize, after: usize) -> String {
    if before == after {
        format!("{before} lanes, not all at the same centres")
    } else {
        format!("{before} lanes before, {after} after")
    }
}

/// Case errors one per line, each but the first with its own `error: ` prefix.
fn join_errors(errors: &[CaseError]) -> String {
    errors
        .iter()
        .map(|e| e.to_string())
        .collect::<Vec<_>>()
        .join("\nerror: ")
}

impl CliError {
    /// Exit code: 2 for a usage error, bad input, a model that could not be solved or output
    /// that could not be written (1 is kept for findings).
    pub fn exit_code(&self) -> u8 {
        match self {
            CliError::WhatIfNeedsSet
            | CliError::TriageNeedsFiles
            | CliError::ResumeNeedsCsv
            | CliError::BadDate(_)
            | CliError::InputLimit(_)
            | CliError::OutNotFolder(_) => super::USAGE_EXIT,
            CliError::Stdin(_) | CliError::Stdout { .. } | CliError::Resume { .. } => 2,
            CliError::WhatIfLaneLayout { .. } | CliError::WhatIfLanesMoved { .. } => 2,
            CliError::Case(_)
            | CliError::Cases(_)
            | CliError::Rules(_)
            | CliError::Wind(_)
            | CliError::Age(_)
            | CliError::Fit(_)
            | CliError::Diagnose(_)
            | CliError::WhatIfLanes(_)
            | CliError::Folder { .. }
            | CliError::Report { .. }
            | CliError::RulesText { .. }
            | CliError::Json(_) => 2,
        }
    }
}

impl CliError {
    /// A word for the kind of failure, given in JSON errors (`error.kind`).
    pub fn kind(&self) -> &'static str {
        match self {
            CliError::WhatIfNeedsSet
            | CliError::TriageNeedsFiles
            | CliError::ResumeNeedsCsv
            | CliError::BadDate(_)
            | CliError::InputLimit(_)
            | CliError::OutNotFolder(_) => "usage",
            CliError::Case(_)
            | CliError::Cases(_)
            | CliError::Rules(_)
            | CliError::Stdin(_)
            | CliError::Resume { .. }
            | CliError::RulesText { .. }
            | CliError::WhatIfLaneLayout { .. }
            | CliError::WhatIfLanesMoved { .. }
            | CliError::Folder { .. } => "bad_input",
            CliError::Wind(_)
            | CliError::Age(_)
            | CliError::Fit(_)
            | CliError::Diagnose(_)
            | CliError::WhatIfLanes(_) => "model",
            CliError::Report { .. } | CliError::Json(_) | CliError::Stdout { .. } => "output",
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Usage errors and every failure exit with 2; 1 is only for findings (the codes the
    /// README documents).
    #[test]
    fn usage_errors_and_failures_exit_2() {
        assert_eq!(CliError::WhatIfNeedsSet.exit_code(), 2);
        assert_eq!(CliError::TriageNeedsFiles.exit_code(), 2);
        assert_eq!(CliError::WhatIfNeedsSet.kind(), "usage");
        let e = CliError::Report {
            dir: "out".into(),
            source: crate::report::files::WriteError {
                path: "out/R1.json".into(),
                folder: false,
                source: std::io::Error::other("disk full"),
                stranded: Vec::new(),
            },
        };
        assert_eq!(e.exit_code(), 2);
        assert_eq!(
            e.to_string(),
            "out: cannot write the report: out/R1.json: disk full. Fix: check that the folder exists and is writable and that the disk has space, then run again; no report file was changed"
        );
    }
}
