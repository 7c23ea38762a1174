//! Helpers the integration tests share: the demo case without its measurements, a diagnosis at a
//! chosen resolution, a fit of a case as the command line runs it. Each test file uses some of
//! them, so the ones it does not use are not dead code.
#![allow(dead_code)]

use rollsleuth::case::{self, Case};
use rollsleuth::diagnose::{diagnose, DiagnoseOptions, Diagnosis};
use rollsleuth::fit::{self, RollFit};
use rollsleuth::lanes::{self, Lanes};
use rollsleuth::rules;
use rollsleuth::storage::AgeOptions;
use rollsleuth::vocab::Defect;
use rollsleuth::winding::{wind, Options, WindInput, Wound};

/// The demo case with `sets` applied, without its profiles and complaint.
pub fn demo_without_profiles(sets: &[&str]) -> Case {
    let mut s: Vec<String> = vec!["profiles=[]".into()];
    s.extend(sets.iter().map(|s| s.to_string()));
    let mut c = case::load_demo(&s).unwrap();
    c.profiles.clear();
    c.complaint = None;
    c
}

/// Diagnose `c` with the built-in rules at `nodes` winding nodes, with or without the what-if
/// re-runs (attribution and corrections).
pub fn diagnose_at(c: &Case, nodes: usize, what_if: bool) -> Diagnosis {
    let opt = DiagnoseOptions { nodes, what_if };
    diagnose(c, &rules::load_default().unwrap(), &opt).unwrap()
}

/// The defects of a diagnosis's findings, in order.
pub fn defects(d: &Diagnosis) -> Vec<Defect> {
    d.findings.iter().map(|f| f.defect).collect()
}

/// `c` wound on lanes `l` at `nodes` winding nodes.
pub fn wound(c: &Case, l: &Lanes, nodes: usize) -> Wound {
    wind(
        &WindInput::new(&c.material, &c.roll, &c.winding),
        l,
        Options {
            nodes,
            ..Options::default()
        },
    )
    .unwrap()
}

/// `c`'s lanes, wound at the default resolution and fitted as the `fit` command does.
pub fn fit_case(c: &Case) -> RollFit {
    let l = lanes::build(c);
    let w = wound(c, &l, Options::default().nodes);
    fit::fit_roll(c, &l, &w, &AgeOptions::default()).unwrap()
}

/// Run the built binary with `args`: exit code (-1 when killed), standard output and standard
/// error, as text.
pub fn run_bin(args: &[&str]) -> (i32, String, String) {
    let o = std::process::Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(args)
        .output()
        .expect("the binary runs");
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stdout).into_owned(),
        String::from_utf8_lossy(&o.stderr).into_owned(),
    )
}

/// `rollsleuth check FILE`: exit code and standard error, asserting that it did not panic and,
/// when it refused the file (exit 2), that it printed no partial output.
pub fn check_file(p: &std::path::Path) -> (i32, String) {
    let (code, out, err) = run_bin(&["check", p.to_str().expect("a UTF-8 path")]);
    assert!(!err.contains("panicked"), "{err}");
    if code == 2 {
        assert!(out.is_empty(), "no partial output: {err}");
    }
    (code, err)
}
