//! The grid the noise rolls of a diagnosis are wound on (`diagnose::confidence::noise_options`)
//! against the fine geometric grid: a noise floor is the difference between a roll wound with
//! noisy lane calipers and the uniform roll on the same grid, so what has to converge is that
//! difference. Checked on the folding boxboard field case (1500 mm on a 152 mm core) wound
//! without its nip, where a plain geometric grid of the noise rolls' size is far off near the
//! core. The reference is the same model on the 401-node grid every command uses, which is
//! within 1 % of the converged radial stress (tests/winding_checks.rs); a discretisation is
//! judged by its error against a refined solution of the same equations (grid convergence, as in
//! Roache 1998, "Verification and Validation in Computational Science and Engineering", from
//! memory).

use rollsleuth::case::{self, Case};
use rollsleuth::diagnose::confidence::{noise_nodes, noise_options};
use rollsleuth::lanes::{self, Lanes};
use rollsleuth::winding::{wind, Options, WindInput, Wound, DEFAULT_NODES};
use std::path::Path;

fn board_without_nip() -> Case {
    let path =
        Path::new(env!("CARGO_MANIFEST_DIR")).join("field_cases/harrowgate_board_dry_store.yaml");
    let mut c = case::load_file(&path, &[]).expect("the field case loads");
    c.winding.nip_n_per_m = 0.0;
    c
}

/// The case's lanes with calipers made uniform (`dev = None`) or moved by `dev(i)` of the mean.
fn lanes_with(c: &Case, dev: Option<&dyn Fn(usize) -> f64>) -> Lanes {
    let mut l = lanes::build(c);
    let mean = l.mean_caliper_m;
    for (i, lane) in l.lanes.iter_mut().enumerate() {
        let d = dev.map_or(0.0, |f| f(i));
        lane.caliper_m = mean * (1.0 + d);
        lane.caliper_deviation = d;
        lane.web_strain = 0.0;
    }
    let w: f64 = l.lanes.iter().map(|x| x.width_m).sum();
    l.mean_caliper_m = l.lanes.iter().map(|x| x.caliper_m * x.width_m).sum::<f64>() / w;
    l
}

/// Per lane: core pressure and peak pressure (Pa) of the noisy roll less the uniform roll's,
/// both wound with `opt`.
fn response(c: &Case, opt: Options) -> (Vec<f64>, Vec<f64>) {
    let input = WindInput::new(&c.material, &c.roll, &c.winding);
    // a fixed pattern of caliper noise of about the field case's repeatability (1 % of caliper)
    let dev = |i: usize| 0.01 * (2.7 * i as f64).sin();
    let noisy: Wound = wind(&input, &lanes_with(c, Some(&dev)), opt).expect("winds");
    let flat: Wound = wind(&input, &lanes_with(c, None), opt).expect("winds");
    let diff = |f: &dyn Fn(&rollsleuth::winding::LaneSummary) -> f64| -> Vec<f64> {
        (noisy.lanes.iter().zip(&flat.lanes))
            .map(|(a, b)| f(&a.summary) - f(&b.summary))
            .collect()
    };
    (diff(&|s| s.core_pressure_pa), diff(&|s| s.peak_pressure_pa))
}

/// Largest difference between two responses over the lanes, relative to the reference's largest.
fn worst(got: &[f64], reference: &[f64]) -> f64 {
    assert_eq!(got.len(), reference.len());
    let scale = reference.iter().fold(0.0_f64, |m, x| m.max(x.abs()));
    assert!(scale > 0.0, "noise moves the reference roll's pressures");
    let e = got.iter().zip(reference).map(|(a, b)| (a - b).abs());
    e.fold(0.0, f64::max) / scale
}

#[test]
fn the_noise_grid_resolves_the_core_pressure_response_of_a_board_wound_without_a_nip() {
    let c = board_without_nip();
    let reference = response(&c, Options::with_nodes(DEFAULT_NODES));
    let opt = noise_options(&c, DEFAULT_NODES);
    let graded = response(&c, opt);
    // the plain geometric grid the graded one grows to, for contrast
    let plain = response(&c, Options::with_nodes(noise_nodes(&c)));
    let (core_g, peak_g) = (
        worst(&graded.0, &reference.0),
        worst(&graded.1, &reference.1),
    );
    let (core_p, peak_p) = (worst(&plain.0, &reference.0), worst(&plain.1, &reference.1));
    eprintln!(
        "core pressure response off by {:.1} % graded, {:.1} % plain; peak {:.1} % / {:.1} %",
        100.0 * core_g,
        100.0 * core_p,
        100.0 * peak_g,
        100.0 * peak_p
    );
    assert!(core_g < 0.05, "graded grid: core response off by {core_g}");
    assert!(peak_g < 0.05, "graded grid: peak response off by {peak_g}");
    // the check discriminates: the plain grid of the same outer spacing is well off
    assert!(core_p > 2.0 * core_g.max(0.01), "plain grid: {core_p}");
}
