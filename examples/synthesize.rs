//! Print hardness and diameter profiles (YAML) predicted for a case with chosen creep scales plus
//! seeded noise. Used to make the invented field cases' later measurements physically coherent.
//!
//! cargo run --release --example synthesize -- CASE SEED MD_SCALE RADIAL_SCALE AGE_DAYS...

use rollsleuth::case::{load_file, Measure};
use rollsleuth::fit::{creep_from, synth};
use rollsleuth::lanes;
use rollsleuth::winding::{wind, Options};
use std::path::Path;

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    if args.len() < 5 {
        eprintln!("usage: synthesize CASE SEED MD_SCALE RADIAL_SCALE AGE_DAYS...");
        std::process::exit(1);
    }
    let parse = |s: &str| -> f64 {
        s.parse().unwrap_or_else(|_| {
            eprintln!("not a number: {s}");
            std::process::exit(1)
        })
    };
    let case = load_file(Path::new(&args[0]), &[]).unwrap_or_else(|e| {
        eprintln!("{e}");
        std::process::exit(2)
    });
    let seed = parse(&args[1]) as u64;
    let theta = [parse(&args[2]).ln(), parse(&args[3]).ln()];
    let ages: Vec<f64> = args[4..].iter().map(|a| parse(a) * 86400.0).collect();
    let l = lanes::build(&case);
    let w = wind(&case, &l, Options::default()).unwrap_or_else(|e| {
        eprintln!("{e}");
        std::process::exit(2)
    });
    let creep = vec![creep_from(&case, &theta); l.lanes.len()];
    let noise_h = case.hardness.repeatability;
    let profiles = synth::profiles(&case, &l, &w, &creep, &ages, noise_h, 8e-5, seed)
        .unwrap_or_else(|e| {
            eprintln!("{e}");
            std::process::exit(2)
        });
    for p in profiles {
        let pos: Vec<String> = p
            .positions_m
            .iter()
            .map(|x| format!("{:.0}", x * 1e3))
            .collect();
        let (unit, vals): (&str, Vec<String>) = match p.what {
            Measure::Hardness => ("", p.values.iter().map(|v| format!("{v:.1}")).collect()),
            _ => (
                "mm",
                p.values.iter().map(|v| format!("{:.2}", v * 1e3)).collect(),
            ),
        };
        println!("  - what: {:?}", p.what);
        println!("    age: \"{:.0} d\"", p.age_s / 86400.0);
        if !unit.is_empty() {
            println!("    unit: {unit}");
        }
        println!("    position_unit: mm");
        println!("    positions: [{}]", pos.join(", "));
        println!("    values: [{}]", vals.join(", "));
    }
}
