//! Print the hardness and diameter profiles (YAML) predicted for a case at chosen ages with
//! chosen creep scales plus seeded noise (`fit::synth::field_readings`). Used to make the
//! invented field cases' readings (at winding, age 0, and later) physically coherent with the
//! rest of each case.
//!
//! cargo run --release --example synthesize -- CASE SEED MD_SCALE RADIAL_SCALE AGE_DAYS...
//!
//! The case's own hardness and diameter profiles at the requested ages are left out first, so
//! the output depends only on the rest of the case (caliper, winding, storage, and any readings
//! at other ages)
//! and running the command again on the case with the output pasted in reproduces the output.
//! Values are printed at the positions of the case's earliest hardness (else diameter, else
//! caliper) profile as the case gives it (before any is left out), interpolated from the lane
//! centres, so pasting them in keeps the lanes.

use rollsleuth::case::{load_file, Measure, Profile};
use rollsleuth::fit::synth;
use rollsleuth::units::DAY_S;
use std::path::Path;

fn fail(e: impl std::fmt::Display, code: i32) -> ! {
    eprintln!("{e}");
    std::process::exit(code)
}

/// A profile as YAML, as a case gives it (hardness to 0.1 unit, diameter to 0.01 mm).
fn print(p: &Profile) {
    let at = &p.values;
    let pos: Vec<String> = p
        .positions_m
        .iter()
        .map(|x| format!("{:.0}", x * 1e3))
        .collect();
    let (unit, vals): (&str, Vec<String>) = match p.what {
        Measure::Hardness => ("", at.iter().map(|v| format!("{v:.1}")).collect()),
        _ => ("mm", at.iter().map(|v| format!("{:.2}", v * 1e3)).collect()),
    };
    println!("  - what: {}", format!("{:?}", p.what).to_lowercase());
    println!("    age: \"{:.0} d\"", p.age_s / DAY_S);
    if !unit.is_empty() {
        println!("    unit: {unit}");
    }
    println!("    position_unit: mm");
    println!("    positions: [{}]", pos.join(", "));
    println!("    values: [{}]", vals.join(", "));
}

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    if args.len() < 5 {
        fail(
            "usage: synthesize CASE SEED MD_SCALE RADIAL_SCALE AGE_DAYS...",
            1,
        );
    }
    let parse = |s: &str| -> f64 {
        s.parse()
            .unwrap_or_else(|_| fail(format!("not a number: {s}"), 1))
    };
    let case = load_file(Path::new(&args[0]), &[]).unwrap_or_else(|e| fail(e, 2));
    let seed = parse(&args[1]) as u64;
    let scales = [parse(&args[2]), parse(&args[3])];
    let ages: Vec<f64> = args[4..].iter().map(|a| parse(a) * DAY_S).collect();
    let profiles = synth::field_readings(&case, seed, scales, &ages).unwrap_or_else(|e| fail(e, 2));
    for p in &profiles {
        print(p);
    }
}
