//! Winding model against Altmann's (1968) closed form for a constant radial modulus.
//!
//! Source: Altmann, H.C. (1968) "Formulas for computing the stresses in center-wound rolls",
//! TAPPI 51(4):176-179 (from memory). With constant E_r the accretion equation has solutions
//! r^(-1 +/- g), g = sqrt(E_t / E_r), and
//!   sigma_r(r) = -(phi(r)/r) * integral_r^R T_w / phi(s) ds,
//!   phi(x) = x^g + C r_c^(2g) x^(-g),  C = (g - 1 - kappa)/(g + 1 + kappa),
//!   kappa = E_t/E_c - 1 + nu.
//! The integral is evaluated here by composite Simpson quadrature, independent of the model.

use approx::assert_relative_eq;
use rollsleuth::case::Stack;
use rollsleuth::winding::hakiel::{LaneModel, LaneState};

fn altmann_sigma_r(r: f64, rc: f64, big_r: f64, tw: f64, g: f64, kappa: f64) -> f64 {
    let c = (g - 1.0 - kappa) / (g + 1.0 + kappa);
    let phi = |x: f64| x.powf(g) + c * rc.powf(2.0 * g) * x.powf(-g);
    let n = 20000;
    let h = (big_r - r) / n as f64;
    let mut s = 0.0;
    for i in 0..=n {
        let x = r + i as f64 * h;
        let w = if i == 0 || i == n {
            1.0
        } else if i % 2 == 1 {
            4.0
        } else {
            2.0
        };
        s += w * tw / phi(x);
    }
    -(phi(r) / r) * s * h / 3.0
}

/// Wind with constant wound-in stress `tw` (Pa) on `nodes` nodes.
fn wind(model: &LaneModel, rc: f64, big_r: f64, tw: f64, nodes: usize) -> LaneState {
    let h = (big_r - rc) / (nodes as f64 - 1.0);
    let grid: Vec<f64> = (0..nodes).map(|j| rc + j as f64 * h).collect();
    let mut st = LaneState::new(grid.clone());
    for &rk in grid.iter() {
        st.add(model, tw * h / rk, tw, tw * h).unwrap();
    }
    st.finish(tw);
    st
}

fn at(st: &LaneState, r: f64) -> (f64, f64) {
    let h = st.r[1] - st.r[0];
    let i = ((r - st.r[0]) / h).round() as usize;
    (st.sr[i], st.st[i])
}

/// Check vector (derived by numerical integration of Altmann's formula): r_c = 0.05 m,
/// R = 0.5 m, T_w = 5 MPa, E_t = 5 GPa, E_r = 50 MPa (g = 10), E_c = 1 GPa, nu = 0.01.
/// Values in kPa at r = 0.05, 0.10, 0.20, 0.30, 0.40, 0.45 m (references.md section 1).
#[test]
fn radial_stress_matches_altmann_check_vector_within_one_percent() {
    let model = LaneModel {
        e_t: 5e9,
        stack: Stack::Constant {
            radial_modulus_pa: 50e6,
        },
        poisson: 0.01,
        core_stiffness: Some(1e9),
    };
    let st = wind(&model, 0.05, 0.5, 5e6, 3001);
    let table = [
        (0.05, -676.1),
        (0.10, -555.6),
        (0.20, -555.4),
        (0.30, -550.0),
        (0.40, -481.0),
        (0.45, -340.3),
    ];
    for (r, want_kpa) in table {
        let (sr, _) = at(&st, r);
        assert_relative_eq!(sr / 1e3, want_kpa, max_relative = 0.01);
        // and the independent quadrature of the closed form agrees with the table
        let q = altmann_sigma_r(r, 0.05, 0.5, 5e6, 10.0, 5e9 / 1e9 - 1.0 + 0.01);
        assert_relative_eq!(q / 1e3, want_kpa, max_relative = 0.002);
    }
    // Tangential stress, same check vector (kPa); absolute tolerance 0.2 % of T_w.
    let tang = [
        (0.05, 1612.9),
        (0.10, -555.6),
        (0.20, -554.1),
        (0.30, -499.6),
        (0.40, 190.1),
        (0.45, 1596.8),
    ];
    for (r, want_kpa) in tang {
        let (_, stt) = at(&st, r);
        assert!(
            (stt / 1e3 - want_kpa).abs() < 10.0,
            "sigma_t({r}) = {} kPa, want {want_kpa}",
            stt / 1e3
        );
    }
    // The outermost layer carries exactly its wound-in stress; the surface is free.
    assert_relative_eq!(*st.st.last().unwrap(), 5e6);
    assert_relative_eq!(*st.sr.last().unwrap(), 0.0);
}

/// Rigid core, no Poisson coupling, constant tension: the stated check, away from the
/// outer layers (the outer 5 % of the build, where lumping layers matters most, is excluded).
#[test]
fn radial_stress_matches_altmann_closed_form_rigid_core() {
    let model = LaneModel {
        e_t: 5e9,
        stack: Stack::Constant {
            radial_modulus_pa: 20e6,
        },
        poisson: 0.0,
        core_stiffness: None,
    };
    let (rc, big_r, tw) = (0.05, 0.5, 3e6);
    let st = wind(&model, rc, big_r, tw, 2001);
    let g = (5e9f64 / 20e6).sqrt();
    for k in 0..=18 {
        let r = rc + (big_r - rc) * k as f64 / 20.0;
        let want = altmann_sigma_r(r, rc, big_r, tw, g, -1.0);
        let (sr, _) = at(&st, r);
        assert_relative_eq!(sr, want, max_relative = 0.01);
    }
}
