//! Fit checks on synthetic rolls: parameters generated with the forward model, seeded noise of
//! known size, fitted back. The ground truth is ours by construction (a self-consistency check of
//! the estimator, not of the physics); the physics is checked against sources elsewhere.

mod common;

use rollsleuth::case::{self, Case, Measure};
use rollsleuth::fit::{self, synth};
use rollsleuth::units::DAY_S;

/// A roll of the given field case with its measurements replaced by synthetic ones.
fn synthetic(
    file: &str,
    lanes_n: u32,
    seed: u64,
    ages_d: &[f64],
    noise_h: f64,
    noise_d: f64,
) -> (Case, Vec<(f64, f64)>) {
    let c = case::load_file(
        std::path::Path::new(file),
        &[format!("lanes.count={lanes_n}")],
    )
    .unwrap();
    let ages: Vec<f64> = ages_d.iter().map(|d| d * DAY_S).collect();
    synth::recovery_roll(c, seed, &ages, noise_h, noise_d).unwrap()
}

fn run(c: &Case) -> fit::RollFit {
    common::fit_case(c)
}

/// Smallest k with P(X <= k) >= q for X ~ Binomial(n, p) (exact sum).
fn binomial_quantile(n: usize, p: f64, q: f64) -> usize {
    let mut pmf = (1.0 - p).powi(n as i32);
    let mut cdf = pmf;
    for k in 0..n {
        if cdf >= q {
            return k;
        }
        pmf *= (n - k) as f64 / (k + 1) as f64 * p / (1.0 - p);
        cdf += pmf;
    }
    n
}

/// Recovered within the reported uncertainty: over several seeds and two grades other than the
/// demo's (coated paper, board), the identifiable scales that fall outside 1, 2 and 3 reported
/// sigma of the truth are as many as a calibrated Gaussian interval puts there (31.7 %, 4.55 %,
/// 0.27 %, two-sided normal tails) or fewer: no count lies above the 99.5 % quantile of its
/// binomial distribution, so the intervals are not narrower than the data allow. They may be
/// conservative, but not by more than 1.5x: the 1-sigma count is at least the 0.5 % quantile for
/// the 13.4 % two-sided tail beyond 1.5 sigma. (Measured: 10, 1 and 0 of 103 outside 1, 2 and
/// 3 sigma; the prior towards the pooled scales widens the core of the posterior.) Sigma is the
/// posterior standard deviation of the log-scale.
#[test]
fn parameters_are_recovered_within_reported_uncertainty() {
    let mut outside = [0usize; 3];
    let mut total = 0;
    let cases = [
        ("field_cases/kestrel_coated_cold_to_humid.yaml", 32.0),
        ("field_cases/harrowgate_board_dry_store.yaml", 44.0),
    ];
    for (k, (file, end)) in cases.iter().enumerate() {
        for seed in [1u64, 2, 3] {
            let (c, truth) = synthetic(
                file,
                8,
                10 * k as u64 + seed,
                &[0.0, end / 3.0, *end],
                0.5,
                5e-5,
            );
            let f = run(&c);
            for z in synth::recovery_z(&f, &truth) {
                total += 1;
                for (i, o) in outside.iter_mut().enumerate() {
                    if z > (i + 1) as f64 {
                        *o += 1;
                    }
                }
            }
        }
    }
    assert!(total >= 60, "enough identifiable parameters: {total}");
    eprintln!("recovery: {outside:?} of {total} outside 1, 2 and 3 sigma");
    let tail = [0.3173, 0.0455, 0.0027];
    for (i, (o, p)) in outside.iter().zip(tail).enumerate() {
        let hi = binomial_quantile(total, p, 0.995);
        assert!(
            *o <= hi,
            "{o} of {total} outside {} sigma (at most {hi})",
            i + 1
        );
    }
    let lo = binomial_quantile(total, 0.1336, 0.005);
    assert!(
        outside[0] >= lo,
        "{} of {total} outside 1 sigma (at least {lo})",
        outside[0]
    );
}

/// Synthetic hardness readings are on the hardness scale itself, not offsets from some anchor: a
/// rebound reading lies on its 0-100 scale (common practice), and a roll read at winding, before
/// it has settled, reads near the middle of it (the default map puts 250 kPa at 60 units).
#[test]
fn synthetic_hardness_readings_are_on_the_scale() {
    for file in [
        "field_cases/nordvik_pm3_caliper_band.yaml",
        "field_cases/kestrel_coated_cold_to_humid.yaml",
        "field_cases/harrowgate_board_dry_store.yaml",
    ] {
        let (c, _) = synthetic(file, 8, 11, &[0.0, 10.0, 31.0], 0.8, 8e-5);
        let mut n = 0;
        for p in c.profiles.iter().filter(|p| p.what == Measure::Hardness) {
            for v in &p.values {
                assert!((0.0..100.0).contains(v), "{file}: hardness reading {v}");
                n += 1;
            }
            if p.age_s == 0.0 {
                let mean = p.values.iter().sum::<f64>() / p.values.len() as f64;
                assert!(
                    (30.0..80.0).contains(&mean),
                    "{file}: mean at winding {mean}"
                );
            }
        }
        assert!(
            n >= 3 * 8,
            "{file}: every lane read at every age ({n} readings)"
        );
    }
}

/// The fitted misfit is never worse than at the start, every lane converges, and a roll whose
/// data carry noise of the stated size fits to about that noise level (rmse near 1).
#[test]
fn fit_improves_misfit_and_reaches_noise_level() {
    let (c, _) = synthetic(
        "field_cases/nordvik_pm3_caliper_band.yaml",
        10,
        5,
        &[0.0, 10.0, 31.0],
        0.8,
        8e-5,
    );
    let f = run(&c);
    let mut sum = 0.0;
    let mut n = 0;
    for lf in &f.lanes {
        assert!(lf.final_cost <= lf.start_cost + 1e-12);
        assert!(lf.converged);
        for r in &lf.residuals {
            sum += r.normalised.powi(2);
            n += 1;
        }
    }
    let rmse = (sum / n as f64).sqrt();
    assert!((0.6..1.3).contains(&rmse), "pooled rmse {rmse}");
}

/// A perfectly consistent (noise-free) roll fits to far below the noise level.
#[test]
fn consistent_roll_fits_to_noise_level() {
    let (mut c, _) = synthetic(
        "field_cases/kestrel_coated_cold_to_humid.yaml",
        6,
        3,
        &[0.0, 12.0, 32.0],
        0.0,
        0.0,
    );
    c.hardness.repeatability = 0.5;
    let f = run(&c);
    for lf in &f.lanes {
        assert!(lf.rmse < 0.25, "rmse {}", lf.rmse);
    }
}

/// With every measurement at one age nothing about creep can be learnt: each scale is flagged
/// not identifiable and stays at the prior.
#[test]
fn one_measurement_time_flags_non_identifiable_parameters() {
    let (mut c, _) = synthetic(
        "field_cases/nordvik_pm3_caliper_band.yaml",
        6,
        4,
        &[0.0, 31.0],
        0.5,
        5e-5,
    );
    c.profiles
        .retain(|p| p.age_s < 1.0 || p.what == Measure::Caliper);
    let f = run(&c);
    for lf in &f.lanes {
        assert!(!lf.md_identifiable && !lf.radial_identifiable);
    }
    assert!(f.notes.contains(&rollsleuth::note::Note::OneAge));
}
