//! Print the later hardness and diameter profiles (YAML) predicted for a case with chosen creep
//! scales plus seeded noise. Used to make the invented field cases' later measurements
//! physically coherent with their winding-time readings.
//!
//! cargo run --release --example synthesize -- CASE SEED MD_SCALE RADIAL_SCALE AGE_DAYS...
//!
//! The case's own hardness and diameter profiles at the requested ages are left out first, so
//! the output depends only on the rest of the case (its winding-time readings, caliper, storage)
//! and running the command again on the case with the output pasted in reproduces the output.
//! Values are printed at the positions of the case's earliest hardness (else diameter, else
//! caliper) profile as the case gives it (before any is left out), interpolated from the lane
//! centres, so pasting them in keeps the lanes.

use rollsleuth::case::{load_file, Case, Measure, Profile};
use rollsleuth::fit::{creep_from, synth};
use rollsleuth::interp::linear_extrap;
use rollsleuth::lanes;
use rollsleuth::units::DAY_S;
use rollsleuth::winding::{wind, Options, WindInput};
use std::path::Path;

fn fail(e: impl std::fmt::Display, code: i32) -> ! {
    eprintln!("{e}");
    std::process::exit(code)
}

/// Positions the readings are printed at: the earliest hardness, else diameter, else caliper
/// profile's; else the lane centres.
fn reading_positions(case: &Case, centres: &[f64]) -> Vec<f64> {
    [Measure::Hardness, Measure::Diameter, Measure::Caliper]
        .iter()
        .find_map(|m| {
            case.profiles
                .iter()
                .filter(|p| p.what == *m)
                .min_by(|a, b| a.age_s.total_cmp(&b.age_s))
        })
        .map(|p| p.positions_m.clone())
        .unwrap_or_else(|| centres.to_vec())
}

fn print(p: &Profile, positions: &[f64], centres: &[f64]) {
    let at: Vec<f64> = positions
        .iter()
        .map(|&x| linear_extrap(centres, &p.values, x).0)
        .collect();
    let pos: Vec<String> = positions
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
    let mut case = load_file(Path::new(&args[0]), &[]).unwrap_or_else(|e| fail(e, 2));
    let seed = parse(&args[1]) as u64;
    let theta = [parse(&args[2]).ln(), parse(&args[3]).ln()];
    let ages: Vec<f64> = args[4..].iter().map(|a| parse(a) * DAY_S).collect();
    // printed at the case's own reading positions, so pasting the output back keeps the lanes
    let positions = reading_positions(&case, &lanes::build(&case).positions());
    case.profiles.retain(|p| {
        p.what == Measure::Caliper || !ages.iter().any(|a| (a - p.age_s).abs() < 0.5 * DAY_S)
    });
    let l = lanes::build(&case);
    let w = wind(
        &WindInput::new(&case.material, &case.roll, &case.winding),
        &l,
        Options::default(),
    )
    .unwrap_or_else(|e| fail(e, 2));
    let creep = vec![creep_from(&case.material, &theta); l.lanes.len()];
    let truth = synth::Truth {
        creep: &creep,
        ages_s: &ages,
        hardness_sd: case.hardness.repeatability,
        diameter_sd_m: 8e-5,
        seed,
    };
    let profiles = synth::profiles(&case, &l, &w, &truth).unwrap_or_else(|e| fail(e, 2));
    let centres = l.positions();
    for p in &profiles {
        print(p, &positions, &centres);
    }
}
