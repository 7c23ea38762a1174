//! Burgers creep law: closed forms and the incremental update used in the roll.
//!
//! Source: Findley, Lai and Onaran (1976) Creep and Relaxation of Nonlinear Viscoelastic
//! Materials, North-Holland (from memory). Standard linear solid check values, evaluated by hand
//! from its closed forms J(t) = 1/E1 + (1 - exp(-t E2/eta))/E2 and
//! E(t) = E_inf + (E1 - E_inf) exp(-t (E1 + E2)/eta), E_inf = E1 E2/(E1 + E2) (the same source):
//! E1 = 5 GPa, E2 = 10 GPa, eta = 1e15 Pa s: J(1e5 s) = 2.6321e-10 1/Pa, E(1e5 s) = 3.7052 GPa.

use approx::assert_relative_eq;
use rollsleuth::case::Burgers;
use rollsleuth::storage::{
    creep_compliance, relaxation_modulus, step_coefficients, step_update, CreepState,
};

fn sls() -> Burgers {
    // E1 = 5 GPa, E2 = E1/delayed = 10 GPa, tau_K = eta/E2 = 1e5 s, no viscous flow
    Burgers {
        delayed: 0.5,
        retardation_s: 1e5,
        viscous_time_s: f64::INFINITY,
    }
}

#[test]
fn standard_linear_solid_matches_findley_check_values() {
    assert_relative_eq!(
        creep_compliance(&sls(), 5e9, 1e5),
        2.6321e-10,
        max_relative = 1e-4
    );
    assert_relative_eq!(
        relaxation_modulus(&sls(), 5e9, 1e5) / 1e9,
        3.7052,
        max_relative = 1e-4
    );
}

/// Time stepping under a constant stress reproduces the closed-form creep compliance.
#[test]
fn step_response_under_constant_stress_matches_creep_compliance() {
    let b = Burgers {
        delayed: 0.3,
        retardation_s: 2.0 * 86400.0,
        viscous_time_s: 400.0 * 86400.0,
    };
    let e = 5.5e9;
    let sigma = 10e6;
    let mut st = CreepState::default();
    let n = 20000;
    let t_end = 60.0 * 86400.0;
    let dt = t_end / n as f64;
    for k in 1..=n {
        step_update(&b, 0.0, sigma / e, sigma / e, &mut st, dt, 0.0);
        let t = k as f64 * dt;
        if k % 5000 == 0 {
            let eps = sigma / e + st.delayed + st.permanent;
            assert_relative_eq!(eps, sigma * creep_compliance(&b, e, t), max_relative = 2e-4);
        }
    }
}

/// Time stepping at a fixed strain reproduces the closed-form Burgers relaxation modulus
/// (two exponentials), which Findley, Lai and Onaran (1976) derive from the model's operator
/// equation (from memory).
#[test]
fn relaxation_under_fixed_strain_matches_closed_form() {
    let b = Burgers {
        delayed: 0.4,
        retardation_s: 1.0 * 86400.0,
        viscous_time_s: 30.0 * 86400.0,
    };
    let e = 5e9;
    let eps0 = 1e-3;
    let mut sigma = e * eps0;
    let mut st = CreepState::default();
    let n = 40000;
    let t_end = 60.0 * 86400.0;
    let dt = t_end / n as f64;
    for k in 1..=n {
        let (e_hat, h) = step_coefficients(&b, 0.0, e, sigma / e, &st, dt, 0.0);
        let before = sigma;
        sigma += e_hat * (0.0 - h);
        step_update(&b, 0.0, before / e, sigma / e, &mut st, dt, 0.0);
        if k % 8000 == 0 {
            let t = k as f64 * dt;
            let want = eps0 * relaxation_modulus(&b, e, t);
            assert!(
                (sigma - want).abs() < 2e-3 * e * eps0,
                "t = {} d: {sigma} vs {want}",
                t / 86400.0
            );
        }
    }
}

/// Mechano-sorptive creep (d eps = m_s g |dMC|, the form reviewed by Haslach 2000, Mech.
/// Time-Depend. Mater. 4:169-210, from memory): a moisture swing adds creep that a steady
/// state does not; cycling adds more than the same time at constant moisture (Byrd 1972,
/// qualitative, from memory).
#[test]
fn moisture_cycling_accelerates_creep() {
    let b = Burgers {
        delayed: 0.3,
        retardation_s: 86400.0,
        viscous_time_s: 400.0 * 86400.0,
    };
    let e = 5e9;
    let g = 2e-3;
    let (mut steady, mut cycled) = (CreepState::default(), CreepState::default());
    for k in 0..100 {
        step_update(&b, 0.5, g, g, &mut steady, 3600.0, 0.0);
        let dmc = if (k / 10) % 2 == 0 { 0.2 } else { -0.2 };
        step_update(&b, 0.5, g, g, &mut cycled, 3600.0, dmc);
    }
    let _ = e;
    assert!(
        cycled.permanent > 5.0 * steady.permanent,
        "{} vs {}",
        cycled.permanent,
        steady.permanent
    );
}

/// Mechano-sorptive relaxation at a fixed strain, d g / d s = -g with s = m_s |MC change|, keeps
/// e^-s of the stress, exactly, in one step of any size: the exponential algorithm of Taylor,
/// Pister and Goudreau (1970), Int. J. Numer. Meth. Eng. 2:45-59 (from memory), is exact for a
/// strain rate constant over the step. Backward Euler would keep 1/(1 + s): 0.25 instead of
/// e^-3 = 0.0498 for s = 3. Under a constant stress the same step adds s g of creep, the
/// Haslach (2000) form d eps = m_s g |dMC| (from memory) integrated exactly.
#[test]
fn mechano_sorptive_step_is_exact_at_fixed_strain_and_at_fixed_stress() {
    let b = Burgers {
        delayed: 0.0,
        retardation_s: 86400.0,
        viscous_time_s: f64::INFINITY,
    };
    let (e, m_s) = (5e9, 0.5);
    for &dmc in &[0.01, 0.4, 6.0] {
        let s = m_s * dmc;
        // fixed strain, one step
        let sigma0 = 10e6;
        let mut st = CreepState::default();
        let (e_hat, h) = step_coefficients(&b, m_s, e, sigma0 / e, &st, 3600.0, dmc);
        let sigma1 = sigma0 + e_hat * (0.0 - h);
        assert_relative_eq!(sigma1 / sigma0, (-s).exp(), max_relative = 1e-12);
        step_update(&b, m_s, sigma0 / e, sigma1 / e, &mut st, 3600.0, dmc);
        // the strain is unchanged: elastic + permanent = the initial elastic strain
        assert_relative_eq!(sigma1 / e + st.permanent, sigma0 / e, max_relative = 1e-12);
        // fixed stress, one step
        let mut held = CreepState::default();
        step_update(&b, m_s, sigma0 / e, sigma0 / e, &mut held, 3600.0, dmc);
        assert_relative_eq!(held.permanent, s * sigma0 / e, max_relative = 1e-12);
    }
}
