//! Moisture transport in the stored roll against Crank's solutions, and the GAB isotherm.
//!
//! Crank, J. (1975) The Mathematics of Diffusion, 2nd ed., Oxford: plane sheet with both faces
//! stepped (eq. 4.18) and the long solid cylinder (eq. 5.23), from memory; the plane-sheet table
//! values are that series evaluated by hand (at Dt/l^2 = 0.01 it is 2 sqrt(Dt/(pi l^2))).
//! Bessel zeros j_{0,n}: Abramowitz and Stegun (1964) Handbook of Mathematical Functions,
//! Table 9.5 (from memory).

use approx::assert_relative_eq;
use rollsleuth::case::Gab;
use rollsleuth::storage::gab_moisture;
use rollsleuth::storage::moisture::{radial_faces, Field, Surfaces};

/// Run a field with the given surfaces from 0 to Dt/l^2 = `tau` in geometric steps.
fn advance(f: &mut Field, s: &Surfaces, t_end: f64, n: usize) {
    let q: f64 = 1.02;
    let norm = (q.powi(n as i32) - 1.0) / (q - 1.0);
    for j in 0..n {
        f.step(t_end * q.powi(j as i32) / norm, s);
    }
}

/// Ends open, barrel and core sealed: the width is Crank's plane sheet of thickness 2l.
/// M_t/M_inf at D t / l^2 = 0.01 .. 1.00: 0.11284, 0.25231, 0.35682, 0.50409, 0.76395, 0.93126.
#[test]
fn moisture_along_width_matches_crank_plane_sheet_within_two_percent() {
    let (w, d) = (1.0, 5e-10);
    let l = w / 2.0;
    let table = [
        (0.01, 0.11284),
        (0.05, 0.25231),
        (0.10, 0.35682),
        (0.20, 0.50409),
        (0.50, 0.76395),
        (1.00, 0.93126),
    ];
    for (tau, want) in table {
        let mut f = Field::new(w, 200, radial_faces(0.05, 0.5, 4), 5.0, d, 1e-11);
        let s = Surfaces {
            front_m_s: 1.0,
            back_m_s: 1.0,
            barrel_m_s: 0.0,
            core_m_s: 0.0,
            m_eq: 10.0,
        };
        advance(&mut f, &s, tau * l * l / d, 400);
        let frac = (f.mean() - 5.0) / 5.0;
        assert_relative_eq!(frac, want, max_relative = 0.02);
    }
}

/// Ends and core sealed, barrel open, core radius tiny: Crank's long solid cylinder of radius a,
/// M_t/M_inf = 1 - sum 4/(j_n^2) exp(-j_n^2 D t/a^2).
#[test]
fn radial_exchange_matches_crank_solid_cylinder() {
    let zeros = [
        2.404825557695773,
        5.520078110286311,
        8.653727912911013,
        11.79153443901428,
        14.93091770848779,
        18.07106396791092,
        21.21163662987926,
        24.3524715307493,
        27.49347913204025,
        30.63460646843198,
    ];
    let series = |tau: f64| {
        let mut s = 0.0;
        for n in 0..200 {
            // beyond the table, McMahon's asymptotic form (n + 3/4) pi is accurate to 1e-4
            let j = if n < zeros.len() {
                zeros[n]
            } else {
                (n as f64 + 0.75) * std::f64::consts::PI
            };
            s += 4.0 / (j * j) * (-j * j * tau).exp();
        }
        1.0 - s
    };
    let (a, d) = (0.5, 2e-11);
    for tau in [0.02, 0.05, 0.1, 0.2, 0.4] {
        let mut f = Field::new(1.0, 2, radial_faces(0.0005, a, 160), 5.0, 1e-9, d);
        let s = Surfaces {
            front_m_s: 0.0,
            back_m_s: 0.0,
            barrel_m_s: 1.0,
            core_m_s: 0.0,
            m_eq: 10.0,
        };
        advance(&mut f, &s, tau * a * a / d, 400);
        let frac = (f.mean() - 5.0) / 5.0;
        assert_relative_eq!(frac, series(tau), max_relative = 0.02);
    }
}

/// GAB isotherm, M = Mm C K a / ((1 - K a)(1 - K a + C K a)) (Guggenheim 1966; Anderson 1946;
/// de Boer 1953; from memory): M(0.5) = 7.543 % for Mm = 5.5 %, C = 10, K = 0.75, evaluated by
/// hand. No published paper GAB table was at hand offline, so the formula is checked against its
/// own hand-evaluated value and against the conditioning range below.
#[test]
fn gab_isotherm_matches_hand_evaluated_value() {
    let g = Gab {
        monolayer_pct: 5.5,
        c: 10.0,
        k: 0.75,
    };
    assert_relative_eq!(gab_moisture(&g, 0.5), 7.543, max_relative = 1e-3);
    // monotone in RH, and the classic sigmoid: steeper at high RH than at mid RH
    let m = |a| gab_moisture(&g, a);
    assert!(m(0.3) < m(0.5) && m(0.5) < m(0.8));
    assert!(m(0.9) - m(0.8) > m(0.6) - m(0.5));
}

/// At the standard conditioning atmosphere (23 C, 50 % RH; TAPPI T 402 / ISO 187) paper holds
/// about 6.5-8 % moisture (from memory); every paper grade default
/// lands in that range.
#[test]
fn paper_defaults_hold_standard_atmosphere_moisture() {
    for grade in ["newsprint", "coated", "board"] {
        let c = rollsleuth::case::load_demo(&[
            format!("material.grade={grade}"),
            "material.caliper=100 um".into(),
        ])
        .unwrap();
        let m = gab_moisture(&c.material.sorption, 0.5);
        assert!((6.3..=8.0).contains(&m), "{grade}: {m}");
    }
}
