//! Winding accuracy at the default resolution, against a refined solution of the same model.
//!
//! The study roll (benches/numpy_hakiel/soft_roll.yaml, invented): a soft nonlinear stack
//! (Pfeiffer 1966 law, K1 = 5 kPa, K2 = 50), MD modulus 5 GPa, 100 um caliper, rigid 100 mm
//! core, 1000 mm roll, one lane, no nip. Each layer's stress increment decays inward over about
//! r / sqrt(E_t / E_r), about 3.5 mm at the surface of this roll, so a discretisation that does
//! not resolve it is far off near the core.
//!
//! Measured with this test's comparison (max over radii of |sigma_r - sigma_r,ref| / |sigma_r,ref|,
//! reference 6401 nodes): 3.4 % at 101 nodes, 1.0 % at 201, 0.29 % at 401, 0.089 % at 801,
//! an observed order of 1.7-1.8 (second order in the node spacing, approached from below).

use rollsleuth::case;
use rollsleuth::lanes;
use rollsleuth::winding::{wind, Options, WindInput, Wound, DEFAULT_NODES};
use std::path::Path;

fn soft_roll(nodes: usize) -> Wound {
    let c = case::load_file(
        &Path::new(env!("CARGO_MANIFEST_DIR")).join("benches/numpy_hakiel/soft_roll.yaml"),
        &[],
    )
    .expect("study roll loads");
    let l = lanes::build(&c);
    wind(
        &WindInput::new(&c.material, &c.roll, &c.winding),
        &l,
        Options {
            nodes,
            ..Options::default()
        },
    )
    .expect("winds")
}

/// Largest relative difference of the radial stress at the coarse grid's radii (the grids nest).
fn worst(coarse: &Wound, fine: &Wound) -> f64 {
    let n = coarse.radius_m.len();
    let step = (fine.radius_m.len() - 1) / (n - 1);
    let (a, b) = (&coarse.lanes[0], &fine.lanes[0]);
    (0..n - 1)
        .map(|i| {
            assert!((coarse.radius_m[i] / fine.radius_m[i * step] - 1.0).abs() < 1e-12);
            let want = b.radial_stress_pa[i * step];
            (a.radial_stress_pa[i] - want).abs() / want.abs()
        })
        .fold(0.0, f64::max)
}

/// The default resolution is within 1 % of a refined solution (4 times finer) at every radius,
/// including the core, and halving the node spacing cuts the error by more than 2.5 (better
/// than first order).
#[test]
fn default_resolution_is_within_one_percent_on_the_soft_roll() {
    let fine = soft_roll(4 * (DEFAULT_NODES - 1) + 1);
    let def = soft_roll(DEFAULT_NODES);
    let half = soft_roll((DEFAULT_NODES - 1) / 2 + 1);
    let (e_def, e_half) = (worst(&def, &fine), worst(&half, &fine));
    assert!(e_def < 0.01, "default: {:.3} %", 100.0 * e_def);
    assert!(
        e_half / e_def > 2.5,
        "order: {:.3} % -> {:.3} %",
        100.0 * e_half,
        100.0 * e_def
    );
    // the core itself
    let (a, b) = (&def.lanes[0], &fine.lanes[0]);
    assert!((a.radial_stress_pa[0] / b.radial_stress_pa[0] - 1.0).abs() < 0.01);
}
