//! The invented field cases hold what their header command makes: each file names the
//! `synthesize` command (seed, creep scales, ages) that generated its hardness and diameter
//! readings from the model, and running it again on the file gives the file's readings to the
//! digits printed (hardness to 0.1 unit, diameter to 0.01 mm). A model change that moves the
//! readings shows here, so the field cases are regenerated with it and never go stale against
//! the model that diagnoses them. A consistency check of the invented demo data against the
//! current model, not a validation of the model (that is the other tests' job, against published
//! sources).

use rollsleuth::case::{self, Measure};
use rollsleuth::fit::synth;
use rollsleuth::units::DAY_S;

/// The arguments after `synthesize -- FILE` in a case file's header.
fn header_args(text: &str, file: &str) -> Vec<f64> {
    let key = format!("--example synthesize -- {file} ");
    let at = text
        .find(&key)
        .unwrap_or_else(|| panic!("{file}: no command"))
        + key.len();
    let end = at + text[at..].find('`').expect("closing backquote");
    text[at..end]
        .split_whitespace()
        .map(|a| a.parse().unwrap_or_else(|_| panic!("{file}: {a}")))
        .collect()
}

#[test]
fn field_cases_reproduce_from_their_header_commands() {
    for file in [
        "field_cases/nordvik_pm3_caliper_band.yaml",
        "field_cases/kestrel_coated_cold_to_humid.yaml",
        "field_cases/harrowgate_board_dry_store.yaml",
    ] {
        let text = std::fs::read_to_string(file).unwrap();
        let a = header_args(&text, file);
        assert!(a.len() >= 4, "{file}: {a:?}");
        let ages: Vec<f64> = a[3..].iter().map(|d| d * DAY_S).collect();
        let c = case::load_file(std::path::Path::new(file), &[]).unwrap();
        let made = synth::field_readings(&c, a[0] as u64, [a[1], a[2]], &ages).unwrap();
        assert_eq!(made.len(), 2 * ages.len(), "{file}");
        for p in &made {
            let have = c
                .profiles
                .iter()
                .find(|q| q.what == p.what && (q.age_s - p.age_s).abs() < 0.5 * DAY_S)
                .unwrap_or_else(|| panic!("{file}: no {:?} at {} s", p.what, p.age_s));
            // half the last printed digit, and a little for the unit conversion
            let tol = match p.what {
                Measure::Hardness => 0.05 + 1e-9,
                _ => 0.005e-3 + 1e-9,
            };
            assert_eq!(have.positions_m, p.positions_m, "{file}: {:?}", p.what);
            for (h, m) in have.values.iter().zip(&p.values) {
                assert!(
                    (h - m).abs() <= tol,
                    "{file}: {:?} at {} d: file {h}, command {m}",
                    p.what,
                    p.age_s / DAY_S
                );
            }
        }
    }
}
