//! Seeded random mutations of a case file never make rollsleuth panic: each either loads and runs
//! (or reports a solver failure), or is rejected with an error naming the file.

use rollsleuth::case;
use rollsleuth::fit;
use rollsleuth::fit::synth::Rng;
use rollsleuth::lanes;
use rollsleuth::storage::AgeOptions;
use rollsleuth::winding::{wind, Options, WindInput};

const WEIRD: &[&str] = &[
    "\"0 mm\"",
    "\"-3 pli\"",
    "\"1e300 Pa\"",
    "\"NaN\"",
    "\"12\"",
    "\"3 furlongs\"",
    "[]",
    "{}",
    "~",
    "\"\"",
    "\"0.001 mm\"",
    "\"50 m\"",
    "\"99 %\"",
    "\"0 %\"",
    "\"200 C\"",
    "\"1e-30 m2/s\"",
    "\"100 pli\"",
    "-1",
    "1e9",
    "true",
];

#[test]
fn mutated_cases_never_panic() {
    let base = std::fs::read_to_string("field_cases/nordvik_pm3_caliper_band.yaml").unwrap();
    let lines: Vec<&str> = base.lines().collect();
    let mut rng = Rng::new(20261202);
    let mut loaded = 0;
    for _ in 0..400 {
        let mut l: Vec<String> = lines.iter().map(|s| s.to_string()).collect();
        for _ in 0..(1 + rng.next_u64() % 3) {
            let i = (rng.next_u64() % l.len() as u64) as usize;
            match rng.next_u64() % 4 {
                0 => {
                    l.remove(i);
                }
                1 => {
                    let d = l[i].clone();
                    l.insert(i, d);
                }
                _ => {
                    if let Some(colon) = l[i].find(": ") {
                        let w = WEIRD[(rng.next_u64() % WEIRD.len() as u64) as usize];
                        l[i] = format!("{}: {w}", &l[i][..colon]);
                    }
                }
            }
        }
        let text = l.join("\n");
        match case::load_str(&text, "mutant.yaml", None, &[]) {
            Err(e) => assert!(e.to_string().contains("mutant.yaml")),
            Ok(c) => {
                loaded += 1;
                let ln = lanes::build(&c);
                if let Ok(w) = wind(
                    &WindInput::new(&c.material, &c.roll, &c.winding),
                    &ln,
                    Options {
                        nodes: 41,
                        levelling: 0.5,
                        spacing: Default::default(),
                    },
                ) {
                    let _ = fit::age_measured(
                        &c,
                        &ln,
                        &w,
                        &AgeOptions {
                            cells_r: 12,
                            cells_x: 12,
                            steps: 4,
                        },
                    );
                }
            }
        }
    }
    assert!(
        loaded > 20,
        "some mutants must still be valid cases: {loaded}"
    );
}

/// Extreme but valid rolls run through the whole chain without panicking.
#[test]
fn extreme_valid_rolls_run() {
    let table = rollsleuth::rules::load_default().unwrap();
    for sets in [
        vec!["lanes.count=1"],
        vec!["roll.width=10 mm", "profiles=[]"],
        // a roll barely larger than its core: the demo profiles (diameters near 1 m) go with it
        vec!["roll.diameter=105 mm", "profiles=[]"],
        vec!["winding.speed=150 m/s"],
        // a heavy nip (friction x nip about 9 x the tension: a warning, not a unit slip)
        vec!["winding.nip=40 pli"],
        vec!["material.stack.k1=0.001 Pa"],
        vec!["storage=[{duration: \"2000 d\", temperature: \"60 C\", rh: \"95 %\"}]"],
    ] {
        let s: Vec<String> = sets.iter().map(|x| x.to_string()).collect();
        let c = case::load_demo(&s).unwrap_or_else(|e| panic!("{sets:?}: {e}"));
        let opt = rollsleuth::diagnose::DiagnoseOptions {
            nodes: 61,
            what_if: false,
        };
        let _ = rollsleuth::diagnose::diagnose(&c, &table, &opt);
    }
}
