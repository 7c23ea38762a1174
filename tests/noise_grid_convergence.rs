//! The grid the noise rolls of a diagnosis are wound on (`diagnose::confidence::noise_options`)
//! against the diagnosed roll's own grid: a noise floor is the difference between a roll wound
//! with noisy lane calipers and the uniform roll on the same grid, and a finding's deviation is
//! measured on the diagnosed roll's grid (401 nodes), so the noise rolls' grid has to give the
//! difference that grid gives. Checked on the folding boxboard field case (1500 mm on a 152 mm
//! core) wound without its nip, where a geometric grid of the noise rolls' size is far off near
//! the core. A discretisation is judged by its error against a refined solution of the same
//! equations (grid convergence, as in Roache 1998, "Verification and Validation in
//! Computational Science and Engineering", from memory). The 401-node grid is itself within
//! about 3 % of the converged difference (against 3201 nodes, 3.1 % at 401, 0.55 % at 801;
//! DEVELOPERS.md, "Numerical practice"), where the radial stress is within 1 % at 401.

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

/// Per lane: core pressure (Pa) of the noisy roll less the uniform roll's, both wound with
/// `opt` (on this roll the peak pressure is at the core).
fn response(c: &Case, opt: Options) -> Vec<f64> {
    let input = WindInput::new(&c.material, &c.roll, &c.winding);
    // a fixed pattern of caliper noise of about the field case's repeatability (1 % of caliper)
    let dev = |i: usize| 0.01 * (2.7 * i as f64).sin();
    let noisy: Wound = wind(&input, &lanes_with(c, Some(&dev)), opt).expect("winds");
    let flat: Wound = wind(&input, &lanes_with(c, None), opt).expect("winds");
    (noisy.lanes.iter().zip(&flat.lanes))
        .map(|(a, b)| a.summary.core_pressure_pa - b.summary.core_pressure_pa)
        .collect()
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
    let (rc, big_r) = (0.5 * c.roll.core_diameter_m, 0.5 * c.roll.diameter_m);
    let reference = response(&c, Options::with_nodes(DEFAULT_NODES));
    let opt = noise_options(&c, DEFAULT_NODES);
    let graded_nodes = opt.grid(rc, big_r).len();
    let graded = worst(&response(&c, opt), &reference);
    // for contrast: the geometric grids of the graded one's outer spacing and of its node count
    let plain = worst(
        &response(&c, Options::with_nodes(noise_nodes(&c))),
        &reference,
    );
    let same = worst(&response(&c, Options::with_nodes(graded_nodes)), &reference);
    eprintln!(
        "core pressure response against 401 nodes: graded ({graded_nodes} nodes) {:.1} %, \
         geometric of its outer spacing {:.1} %, geometric of its node count {:.1} %",
        100.0 * graded,
        100.0 * plain,
        100.0 * same
    );
    assert!(graded < 0.05, "graded grid: core response off by {graded}");
    // the check discriminates, and it is the grading, not the node count, that does it
    assert!(
        plain > 4.0 * graded.max(0.01),
        "geometric, outer spacing: {plain}"
    );
    assert!(
        same > 4.0 * graded.max(0.01),
        "geometric, as many nodes: {same}"
    );
}

/// The diagnosed roll's own grid resolves the same response: the strain offsets read the lanes'
/// builds at the middle of each step, which near the core is of the order of the build itself
/// (DEVELOPERS.md, "Numerical practice"). At 401 nodes the response is 3.0 % off that of 1601
/// nodes; read at the step's start it was 9.7 % off (first order).
#[test]
fn the_core_pressure_response_at_the_default_resolution_is_within_five_percent_of_a_finer_grid() {
    let c = board_without_nip();
    let fine = response(&c, Options::with_nodes(4 * (DEFAULT_NODES - 1) + 1));
    let at = worst(&response(&c, Options::with_nodes(DEFAULT_NODES)), &fine);
    eprintln!(
        "core pressure response at 401 nodes against 1601: {:.2} %",
        100.0 * at
    );
    assert!(at < 0.05, "{at}");
}
