//! Speed of the main stages on a 40-lane, 1 m roll (the figures quoted in the issue notes).
//!
//! cargo bench --bench pipeline

use criterion::{criterion_group, criterion_main, Criterion};
use rollsleuth::case::{self, Case, Measure};
use rollsleuth::fit::{self, synth};
use rollsleuth::lanes;
use rollsleuth::storage::{AgeOptions, LaneCreep};
use rollsleuth::units::DAY_S;
use rollsleuth::winding::{
    wind, wind_caliper, wind_from, Caliper, Options, WindInput, DEFAULT_NODES,
};
use std::hint::black_box;

fn roll(storage_days: u32) -> Case {
    case::load_demo(&[
        "lanes.count=40".into(),
        format!(
            "storage=[{{duration: \"{storage_days} d\", temperature: \"24 C\", rh: \"60 %\", barrel_wrap: none, end_wrap: none}}]"
        ),
    ])
    .expect("demo case loads")
}

fn bench(c: &mut Criterion) {
    let case = roll(200);
    let l = lanes::build(&case);
    c.bench_function("wind 40 lanes, 1 m roll, 401 nodes", |b| {
        b.iter(|| {
            wind(
                black_box(&WindInput::new(&case.material, &case.roll, &case.winding)),
                &l,
                Options::default(),
            )
            .expect("winds")
        })
    });
    // a noise roll of the confidence screen, on the grid a diagnosis winds it on: the coarse
    // grid of the layer-count secant is the wanted grid, so its last accretion is the wound state
    let coarse = rollsleuth::diagnose::confidence::noise_options(&case, DEFAULT_NODES);
    let nodes = coarse
        .grid(0.5 * case.roll.core_diameter_m, 0.5 * case.roll.diameter_m)
        .len();
    c.bench_function(
        &format!("wind 40 lanes, 1 m roll, {nodes} nodes (a noise roll)"),
        |b| {
            b.iter(|| {
                wind(
                    black_box(&WindInput::new(&case.material, &case.roll, &case.winding)),
                    &l,
                    coarse,
                )
                .expect("winds")
            })
        },
    );
    // the same roll wound as a noise roll is: once, with the compressed caliper of a like roll
    // (the noise-free roll's), no secant
    let input = WindInput::new(&case.material, &case.roll, &case.winding);
    let (_, start) = wind_from(&input, &l, coarse, None).expect("winds");
    c.bench_function(
        &format!("wind 40 lanes, {nodes} nodes, caliper of a like roll (as a noise roll is)"),
        |b| {
            b.iter(|| {
                wind_caliper(black_box(&input), &l, coarse, Caliper::Given(start)).expect("winds")
            })
        },
    );
    let w = wind(
        &WindInput::new(&case.material, &case.roll, &case.winding),
        &l,
        Options::default(),
    )
    .expect("winds");
    // after the first iteration the moisture field is the one kept for these inputs (storage's
    // moisture cache), so this measures the mechanics of 40 lanes
    c.bench_function("age 40 lanes through 200 d", |b| {
        b.iter(|| {
            fit::age_measured(black_box(&case), &l, &w, &AgeOptions::default()).expect("ages")
        })
    });
    // fit: 40 lanes, three measurement times (synthetic data)
    let mut fc = roll(31);
    fc.profiles.retain(|p| p.what == Measure::Caliper);
    let lf = lanes::build(&fc);
    let wf = wind(
        &WindInput::new(&fc.material, &fc.roll, &fc.winding),
        &lf,
        Options::default(),
    )
    .expect("winds");
    let creep: Vec<LaneCreep> = (0..lf.lanes.len())
        .map(|i| fit::creep_from(&fc.material, &[0.2 * (i % 3) as f64, 0.3 * (i % 4) as f64]))
        .collect();
    let p = synth::profiles(
        &fc,
        &lf,
        &wf,
        &synth::Truth {
            creep: &creep,
            ages_s: &[0.0, 10.0 * DAY_S, 31.0 * DAY_S],
            hardness_sd: 0.8,
            diameter_sd_m: 8e-5,
            seed: 1,
        },
    )
    .expect("synthesises");
    fc.profiles.extend(p);
    c.bench_function("fit 40 lanes, 3 measurement times", |b| {
        b.iter(|| fit::fit_roll(black_box(&fc), &lf, &wf, &AgeOptions::default()).expect("fits"))
    });
}

fn bench_triage(c: &mut Criterion) {
    // a 40-lane roll as triage diagnoses it (no re-runs) and as diagnose does (with re-runs)
    let case = roll(200);
    let table = rollsleuth::rules::load_default().expect("default rules load");
    let opt = rollsleuth::diagnose::DiagnoseOptions {
        what_if: false,
        ..Default::default()
    };
    c.bench_function("triage one 40-lane roll", |b| {
        b.iter(|| {
            rollsleuth::diagnose::diagnose(black_box(&case), &table, &opt).expect("diagnoses")
        })
    });
    // the field-case mix as triage runs it, one roll of each (a 10,000-roll triage is about
    // 3,333 times this, over the cores)
    let mix: Vec<Case> = [
        "field_cases/harrowgate_board_dry_store.yaml",
        "field_cases/kestrel_coated_cold_to_humid.yaml",
        "field_cases/nordvik_pm3_caliper_band.yaml",
    ]
    .iter()
    .map(|p| case::load_file(std::path::Path::new(p), &[]).expect("field case loads"))
    .collect();
    c.bench_function("triage the field-case mix (3 rolls)", |b| {
        b.iter(|| {
            for roll in &mix {
                black_box(rollsleuth::diagnose::diagnose(roll, &table, &opt).expect("diagnoses"));
            }
        })
    });
    let full = rollsleuth::diagnose::DiagnoseOptions::default();
    // the cost of the re-runs: model runs per diagnosis (Shapley subsets of the sources, the
    // amplifiers' alternatives and the corrections, each distinct scenario once)
    let d = rollsleuth::diagnose::diagnose(&case, &table, &full).expect("diagnoses");
    let corrections: usize = d.findings.iter().map(|f| f.corrections.len()).sum();
    let sources = d
        .findings
        .first()
        .and_then(|f| f.attribution.as_ref())
        .map_or(0, |a| a.shares.len());
    eprintln!(
        "runs per diagnosis of the 40-lane roll: {} winding runs, {} storage runs ({} findings, {} sources -> {} subsets, {} corrections listed)",
        d.runs.winding_runs,
        d.runs.storage_runs,
        d.findings.len(),
        sources,
        1usize << sources,
        corrections
    );
    c.bench_function("diagnose one 40-lane roll (with re-runs)", |b| {
        b.iter(|| {
            rollsleuth::diagnose::diagnose(black_box(&case), &table, &full).expect("diagnoses")
        })
    });
}

/// Winding at 1 % accuracy: the soft study roll of tests/winding_convergence.rs (within 1 % of
/// the converged radial stress at 201 nodes, 0.25 % at the default 401).
fn bench_accuracy(c: &mut Criterion) {
    let soft = case::load_file(
        std::path::Path::new("benches/numpy_hakiel/soft_roll.yaml"),
        &[],
    )
    .expect("study roll loads");
    let l = lanes::build(&soft);
    for nodes in [201, 401] {
        c.bench_function(&format!("wind the soft study roll, {nodes} nodes"), |b| {
            b.iter(|| {
                wind(
                    black_box(&WindInput::new(&soft.material, &soft.roll, &soft.winding)),
                    &l,
                    Options {
                        nodes,
                        ..Options::default()
                    },
                )
                .expect("winds")
            })
        });
    }
}

criterion_group! {
    name = benches;
    config = Criterion::default().sample_size(10);
    targets = bench, bench_triage, bench_accuracy
}
criterion_main!(benches);
