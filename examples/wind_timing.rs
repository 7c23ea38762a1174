//! Seconds per wind of a case at a chosen resolution, measured in-process (no process start, no
//! case loading in the timed part): the case is loaded and its lanes built once, then
//! `rollsleuth::winding::wind` is run REPEATS times (after one untimed warm-up wind) and the
//! median and minimum wall-clock seconds per wind are printed as one JSON line. Used by
//! `benches/numpy_hakiel/compare.py`.
//!
//! cargo run --release --example wind_timing -- CASE NODES REPEATS

use rollsleuth::case::load_file;
use rollsleuth::lanes;
use rollsleuth::winding::{wind, Options, WindInput};
use std::hint::black_box;
use std::path::Path;
use std::time::Instant;

fn fail(e: impl std::fmt::Display, code: i32) -> ! {
    eprintln!("{e}");
    std::process::exit(code)
}

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    if args.len() != 3 {
        fail("usage: wind_timing CASE NODES REPEATS", 1);
    }
    let count = |s: &str, what: &str| -> usize {
        s.parse()
            .unwrap_or_else(|_| fail(format!("{what} must be a whole number, got {s}"), 1))
    };
    let nodes = count(&args[1], "NODES");
    let repeats = count(&args[2], "REPEATS").max(1);
    let case = load_file(Path::new(&args[0]), &[]).unwrap_or_else(|e| fail(e, 2));
    let l = lanes::build(&case);
    let input = WindInput::new(&case.material, &case.roll, &case.winding);
    let opt = Options {
        nodes,
        ..Options::default()
    };
    let run = || wind(black_box(&input), &l, opt).unwrap_or_else(|e| fail(e, 2));
    black_box(run());
    let mut secs: Vec<f64> = (0..repeats)
        .map(|_| {
            let t0 = Instant::now();
            black_box(run());
            t0.elapsed().as_secs_f64()
        })
        .collect();
    secs.sort_by(f64::total_cmp);
    let median = if repeats % 2 == 1 {
        secs[repeats / 2]
    } else {
        0.5 * (secs[repeats / 2 - 1] + secs[repeats / 2])
    };
    println!(
        "{{\"nodes\": {nodes}, \"repeats\": {repeats}, \"median_s\": {median:e}, \"min_s\": {:e}}}",
        secs[0]
    );
}
