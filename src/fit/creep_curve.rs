//! Fit the Burgers creep compliance to a laboratory creep curve (strain against time under a
//! constant stress), with argmin's Nelder-Mead on log-parameters.
//!
//! Objective: sum of squared relative strain residuals, sum ((eps_model/eps_meas) - 1)^2, with
//! eps_model = stress x J(t) (see [`crate::storage::creep_compliance`]). Parameters, all fitted in
//! log form so they stay positive: E, delayed, retardation time, viscous time.

use super::SolverError;
use crate::case::Burgers;
use crate::storage::creep_compliance;
use argmin::core::{CostFunction, Error as ArgminError, Executor, State, TerminationReason};
use argmin::solver::neldermead::NelderMead;

/// A creep test: constant stress (Pa), times (s) and measured strains.
#[derive(Debug, Clone, PartialEq)]
pub struct CreepCurve {
    pub stress_pa: f64,
    pub times_s: Vec<f64>,
    pub strains: Vec<f64>,
}

/// The objective at log-parameters [ln E, ln delayed, ln tau_K, ln tau_v].
pub fn objective(c: &CreepCurve, p: &[f64]) -> f64 {
    objective_many(std::slice::from_ref(c), p)
}

/// The objective summed over several curves (same material, different stresses).
pub fn objective_many(cs: &[CreepCurve], p: &[f64]) -> f64 {
    cs.iter().map(|c| one(c, p)).sum()
}

fn one(c: &CreepCurve, p: &[f64]) -> f64 {
    let b = Burgers {
        delayed: p[1].exp(),
        retardation_s: p[2].exp(),
        viscous_time_s: p[3].exp(),
    };
    let e = p[0].exp();
    c.times_s
        .iter()
        .zip(&c.strains)
        .map(|(&t, &eps)| (c.stress_pa * creep_compliance(&b, e, t) / eps - 1.0).powi(2))
        .sum()
}

struct Problem<'a>(&'a [CreepCurve]);

impl CostFunction for Problem<'_> {
    type Param = Vec<f64>;
    type Output = f64;
    fn cost(&self, p: &Self::Param) -> Result<f64, ArgminError> {
        let v = objective_many(self.0, p);
        Ok(if v.is_finite() { v } else { 1e300 })
    }
}

/// Result of a creep-curve fit.
#[derive(Debug, Clone, PartialEq)]
pub struct CurveFit {
    /// Elastic modulus, Pa.
    pub modulus_pa: f64,
    pub burgers: Burgers,
    /// Objective at the optimum.
    pub cost: f64,
    pub converged: bool,
    pub iterations: u64,
}

/// Fit a creep curve from a starting guess (modulus Pa, Burgers parameters).
pub fn fit(c: &CreepCurve, e0: f64, b0: &Burgers) -> Result<CurveFit, SolverError> {
    fit_many(std::slice::from_ref(c), e0, b0)
}

/// Fit several curves of one material together.
pub fn fit_many(c: &[CreepCurve], e0: f64, b0: &Burgers) -> Result<CurveFit, SolverError> {
    let x0 = vec![
        e0.ln(),
        b0.delayed.ln(),
        b0.retardation_s.ln(),
        b0.viscous_time_s.ln(),
    ];
    let mut simplex = vec![x0.clone()];
    for i in 0..4 {
        let mut v = x0.clone();
        v[i] += 0.5;
        simplex.push(v);
    }
    let solver = NelderMead::new(simplex)
        .with_sd_tolerance(1e-12)
        .map_err(SolverError::optimiser)?;
    let res = Executor::new(Problem(c), solver)
        .configure(|s| s.max_iters(5000))
        .timer(false)
        .run()
        .map_err(SolverError::optimiser)?;
    let st = res.state();
    let p = st
        .get_best_param()
        .cloned()
        .ok_or(SolverError::NoParameters)?;
    Ok(CurveFit {
        modulus_pa: p[0].exp(),
        burgers: Burgers {
            delayed: p[1].exp(),
            retardation_s: p[2].exp(),
            viscous_time_s: p[3].exp(),
        },
        cost: st.get_best_cost(),
        converged: matches!(
            st.get_termination_reason(),
            Some(TerminationReason::SolverConverged)
        ),
        iterations: st.get_iter(),
    })
}
