//! Per-lane fit of the storage creep model to measured hardness and diameter (argmin).
//!
//! Fitted per lane: two creep scales, one per direction, that multiply the grade's creep
//! compliance beyond the elastic part (J = (1/E)[1 + s (delayed (1 - e^(-t/tau_K)) + t/tau_v)]).
//! The radial scale sets how fast the stack settles (diameter, hardness); the MD scale how fast
//! wound-in tension relaxes and how much permanent set the lane takes. Retardation time and the
//! ratio of delayed to viscous creep are held at grade values: hardness and diameter at two or
//! three ages cannot separate them.
//!
//! Solver: Nelder-Mead on the log-scales. The objective is a few milliseconds of simulation with
//! no analytic gradient and kinks where pressure reaches zero, in two dimensions: a derivative-free
//! simplex is robust and cheap there; bounds are enforced by a steep penalty outside
//! [1/100, 100], never NaN. Stages: a pooled fit of one pair of scales for the whole roll (on up to
//! six representative lanes), then each lane with a Gaussian prior on its log-scales centred on
//! the pooled values, standard deviation ln 3 (a factor of three: wide enough that two good
//! measurements of a lane overrule it, narrow enough that a lane with little data stays near the
//! roll). The pooled stage uses up to six evenly spread lanes. Uncertainty: the lane's posterior,
//! integrated on a grid ([`super::posterior`]); a scale is flagged not identifiable when
//! its posterior is not narrower than the prior by sqrt 2 (the data alone constrain it less than
//! the prior does), and then stays at the pooled value (hierarchical shrinkage).

use super::observe::{Obs, ObsKind};
use super::SolverError;
use crate::case::{Burgers, Material, Measure};
use crate::storage::{
    age_lane_with, drive, track_lane_pack, HardnessMap, LaneAged, LaneCreep, LaneDrive, LaneRun,
    Prepared, Track,
};
use crate::winding::Wound;
use argmin::core::{CostFunction, Error as ArgminError, Executor, State, TerminationReason};
use argmin::solver::neldermead::NelderMead;
use serde::Serialize;

/// Width of the prior on each lane's log-scales (a factor of 3).
pub const PRIOR_SD_LN: f64 = 1.098_612_288_668_11;
/// Width of the pooled fit's prior towards the grade values (a factor of 10).
pub const POOLED_PRIOR_SD_LN: f64 = std::f64::consts::LN_10;
/// Bounds of the scales.
pub const SCALE_BOUNDS: (f64, f64) = (0.01, 100.0);
/// Simulations of a lane run side by side ([`LaneProblem::simulate_many`]).
pub const PACK: usize = 4;
/// Iteration limit of each Nelder-Mead run.
pub const MAX_ITERS: u64 = 200;

/// Scale a grade's Burgers parameters: creep beyond the elastic part times `s`.
pub fn scaled(b: &Burgers, s: f64) -> Burgers {
    Burgers {
        delayed: b.delayed * s,
        retardation_s: b.retardation_s,
        viscous_time_s: b.viscous_time_s / s,
    }
}

/// Lane creep parameters from the material's grade creep and two log-scales.
pub fn creep_from(material: &Material, theta: &[f64]) -> LaneCreep {
    LaneCreep {
        md: scaled(&material.creep.md, theta[0].exp()),
        radial: scaled(&material.creep.radial, theta[1].exp()),
    }
}

/// One lane's data and fixed inputs.
pub struct LaneProblem<'a> {
    pub material: &'a Material,
    pub wound: &'a Wound,
    pub prep: &'a Prepared,
    /// How surface pressure reads as hardness.
    pub hardness: &'a HardnessMap,
    pub lane: usize,
    /// The lane's drive, lent by `prep` (owned only when computed afresh).
    pub drive: std::borrow::Cow<'a, LaneDrive>,
    pub obs: Vec<Obs>,
    /// Steps to simulate (up to the last observation).
    pub steps: usize,
}

impl<'a> LaneProblem<'a> {
    /// Set up a lane's problem.
    pub fn new(
        material: &'a Material,
        wound: &'a Wound,
        prep: &'a Prepared,
        hardness: &'a HardnessMap,
        lane: usize,
        obs: Vec<Obs>,
    ) -> Self {
        let steps = obs.iter().map(|o| o.step).max().unwrap_or(0);
        LaneProblem {
            material,
            wound,
            prep,
            hardness,
            lane,
            drive: drive(material, prep, lane),
            obs,
            steps,
        }
    }

    /// Simulate the lane up to its last observation.
    pub fn simulate(&self, theta: &[f64]) -> Option<Track> {
        let creep = creep_from(self.material, theta);
        let mut track = Track::default();
        age_lane_with(&self.run(&creep), &mut track).ok()?;
        Some(track)
    }

    /// The lane's storage run with `creep`.
    fn run<'r>(&'r self, creep: &'r LaneCreep) -> LaneRun<'r> {
        LaneRun {
            material: self.material,
            wound: self.wound,
            prep: self.prep,
            lane: self.lane,
            creep,
            drive: &self.drive,
            steps: self.steps,
        }
    }

    /// [`Self::simulate`] at each of `thetas`, [`PACK`] at a time side by side (a short last
    /// pack is filled up with its last entry); the same tracks, to the bit.
    pub fn simulate_many(&self, thetas: &[[f64; 2]]) -> Vec<Option<Track>> {
        let mut out = Vec::with_capacity(thetas.len());
        for chunk in thetas.chunks(PACK) {
            let creep: [LaneCreep; PACK] =
                std::array::from_fn(|m| creep_from(self.material, &chunk[m.min(chunk.len() - 1)]));
            // the run's own creep is not read: each member's is
            match track_lane_pack(&self.run(&creep[0]), &creep) {
                Some(tracks) => out.extend(tracks.into_iter().take(chunk.len())),
                None => out.extend(chunk.iter().map(|t| self.simulate(t))),
            }
        }
        out
    }

    /// Predicted value of an observation from a simulated lane.
    pub fn predict(&self, o: &Obs, a: &Track) -> f64 {
        match (o.what, o.kind) {
            (Measure::Hardness, _) => self.hardness.hardness(a.surface_pressure_pa[o.step]),
            (_, ObsKind::ChangeFrom { step0 }) => a.diameter_m[o.step] - a.diameter_m[step0],
            (_, ObsKind::Absolute) => a.diameter_m[o.step],
        }
    }

    /// Half the sum of squared normalised residuals (data part of the objective).
    pub fn chi2_half(&self, theta: &[f64]) -> f64 {
        self.chi2_half_of(self.simulate(theta))
    }

    /// [`Self::chi2_half`] of a simulated lane (`None`: the model could not run).
    fn chi2_half_of(&self, track: Option<Track>) -> f64 {
        match track {
            Some(a) => {
                0.5 * self
                    .obs
                    .iter()
                    .map(|o| ((self.predict(o, &a) - o.value) / o.sigma).powi(2))
                    .sum::<f64>()
            }
            None => 1e12,
        }
    }
}

/// Penalty outside the scale bounds (quadratic, steep; keeps the objective finite).
fn bound_penalty(theta: &[f64]) -> f64 {
    let (lo, hi) = (SCALE_BOUNDS.0.ln(), SCALE_BOUNDS.1.ln());
    theta
        .iter()
        .map(|&t| {
            if t < lo {
                1e4 * (lo - t).powi(2)
            } else if t > hi {
                1e4 * (t - hi).powi(2)
            } else {
                0.0
            }
        })
        .sum()
}

fn clamp_theta(theta: &[f64]) -> Vec<f64> {
    theta.iter().map(|&t| clamp_one(t)).collect()
}

fn clamp_one(t: f64) -> f64 {
    t.clamp(SCALE_BOUNDS.0.ln(), SCALE_BOUNDS.1.ln())
}

/// Objective: data misfit of one or more lanes plus a Gaussian prior on the log-scales.
pub struct Objective<'a, 'b> {
    pub lanes: &'b [LaneProblem<'a>],
    pub prior: [f64; 2],
    pub prior_sd: f64,
}

impl Objective<'_, '_> {
    /// Objective value at log-scales `theta`.
    pub fn value(&self, theta: &[f64]) -> f64 {
        let t = clamp_theta(theta);
        let data: f64 = self.lanes.iter().map(|l| l.chi2_half(&t)).sum();
        self.with_prior(theta, &t, data)
    }

    /// [`Self::value`] at each of `thetas`, the simulations run side by side
    /// ([`LaneProblem::simulate_many`]); the same values, to the bit.
    pub fn values(&self, thetas: &[[f64; 2]]) -> Vec<f64> {
        let t: Vec<[f64; 2]> = thetas
            .iter()
            .map(|x| [0, 1].map(|i| clamp_one(x[i])))
            .collect();
        let chi: Vec<Vec<f64>> = self
            .lanes
            .iter()
            .map(|l| {
                let tracks = l.simulate_many(&t);
                tracks.into_iter().map(|a| l.chi2_half_of(a)).collect()
            })
            .collect();
        (0..thetas.len())
            .map(|m| {
                let data: f64 = chi.iter().map(|c| c[m]).sum();
                self.with_prior(&thetas[m], &t[m], data)
            })
            .collect()
    }

    /// [`Self::value`] at `theta` of a one-lane objective from that lane's run `track` at
    /// `theta`, as the value would run it (run afresh when clamping moves `theta` or there is
    /// not one lane).
    fn value_from_run(&self, theta: &[f64], track: Track) -> f64 {
        let t = clamp_theta(theta);
        match self.lanes {
            [l] if t == theta => self.with_prior(theta, &t, l.chi2_half_of(Some(track))),
            _ => self.value(theta),
        }
    }

    /// The objective from the data part at `theta` (clamped: `t`).
    fn with_prior(&self, theta: &[f64], t: &[f64], data: f64) -> f64 {
        let prior: f64 = t
            .iter()
            .zip(self.prior)
            .map(|(a, b)| 0.5 * ((a - b) / self.prior_sd).powi(2))
            .sum();
        data + prior + bound_penalty(theta)
    }
}

/// Objective values of points already evaluated (run side by side), found by the points' bits.
#[derive(Default)]
pub(super) struct Known(Vec<([u64; 2], f64)>);

impl Known {
    /// Keep `values` as those of `pts` (as many).
    pub(super) fn add(&mut self, pts: &[[f64; 2]], values: &[f64]) {
        let bits = pts.iter().map(|p| p.map(f64::to_bits));
        self.0.extend(bits.zip(values.iter().copied()));
    }

    /// The value kept for `x` (two log-scales), if any.
    pub(super) fn get(&self, x: &[f64]) -> Option<f64> {
        let [a, b] = x else {
            return None;
        };
        let key = [a.to_bits(), b.to_bits()];
        self.0.iter().find(|(k, _)| *k == key).map(|(_, v)| *v)
    }
}

/// Borrowing adapter so argmin can run on an objective it does not own, with the values of
/// points already evaluated (the start simplex).
struct Borrowed<'o, 'a, 'b>(&'o Objective<'a, 'b>, Known);

impl CostFunction for Borrowed<'_, '_, '_> {
    type Param = Vec<f64>;
    type Output = f64;
    fn cost(&self, p: &Self::Param) -> Result<f64, ArgminError> {
        Ok(self.1.get(p).unwrap_or_else(|| self.0.value(p)))
    }
}

/// Result of one minimisation.
#[derive(Debug, Clone, PartialEq)]
pub struct Minimum {
    pub theta: Vec<f64>,
    pub cost: f64,
    pub start_cost: f64,
    pub converged: bool,
    pub iterations: u64,
    pub evaluations: u64,
}

/// Minimise an objective from `start` with Nelder-Mead.
pub fn minimise(obj: &Objective, start: [f64; 2]) -> Result<Minimum, SolverError> {
    let vertices = [
        start,
        [start[0] + 0.7, start[1]],
        [start[0], start[1] + 0.7],
    ];
    // the start simplex run side by side (the same values, to the bit)
    let values = obj.values(&vertices);
    let start_cost = values[0];
    let mut known = Known::default();
    known.add(&vertices, &values);
    let simplex = vertices.iter().map(|v| v.to_vec()).collect();
    let solver = NelderMead::new(simplex)
        .with_sd_tolerance(1e-3)
        .map_err(SolverError::optimiser)?;
    let res = Executor::new(Borrowed(obj, known), solver)
        .configure(|s| s.max_iters(MAX_ITERS).counting(true))
        .timer(false)
        .run()
        .map_err(SolverError::optimiser)?;
    let st = res.state();
    let theta = st
        .get_best_param()
        .cloned()
        .ok_or(SolverError::NoParameters)?;
    let converged = matches!(
        st.get_termination_reason(),
        Some(TerminationReason::SolverConverged)
    );
    let evaluations = st.get_func_counts().values().sum::<u64>();
    let clamped = clamp_theta(&theta);
    // the best point's value is the objective's there unless clamping moved it
    let mut cost = if clamped == theta && st.get_best_cost().is_finite() {
        st.get_best_cost()
    } else {
        obj.value(&clamped)
    };
    let mut theta = clamped;
    if cost > start_cost {
        // never report something worse than where we started
        theta = start.to_vec();
        cost = start_cost;
    }
    Ok(Minimum {
        theta,
        cost,
        start_cost,
        converged,
        iterations: st.get_iter(),
        evaluations,
    })
}

/// 2x2 Hessian at `x`, where the objective is `f0`, by central differences with step `h`; the
/// eight points around `x` are evaluated together by `values` (the objective at each point).
pub fn hessian2(
    values: &dyn Fn(&[[f64; 2]]) -> Vec<f64>,
    x: &[f64],
    f0: f64,
    h: f64,
) -> [[f64; 2]; 2] {
    let steps = [
        [h, 0.0],
        [-h, 0.0],
        [0.0, h],
        [0.0, -h],
        [h, h],
        [h, -h],
        [-h, h],
        [-h, -h],
    ];
    let v = values(&steps.map(|[dx, dy]| [x[0] + dx, x[1] + dy]));
    let at = |k: usize| v.get(k).copied().unwrap_or(f64::NAN);
    let hxx = (at(0) - 2.0 * f0 + at(1)) / (h * h);
    let hyy = (at(2) - 2.0 * f0 + at(3)) / (h * h);
    let hxy = (at(4) - at(5) - at(6) + at(7)) / (4.0 * h * h);
    [[hxx, hxy], [hxy, hyy]]
}

/// Inverse of a 2x2 symmetric matrix, if positive definite.
pub fn inverse_pd(m: [[f64; 2]; 2]) -> Option<[[f64; 2]; 2]> {
    let det = m[0][0] * m[1][1] - m[0][1] * m[1][0];
    if m[0][0] <= 0.0 || m[1][1] <= 0.0 || det <= 0.0 || !det.is_finite() {
        return None;
    }
    Some([
        [m[1][1] / det, -m[0][1] / det],
        [-m[1][0] / det, m[0][0] / det],
    ])
}

/// A residual of one observation.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Residual {
    pub what: Measure,
    /// Roll age at the reading, s.
    pub age_s: f64,
    /// Measured value (hardness units; diameter change in m).
    pub measured: f64,
    pub predicted: f64,
    /// 5 % and 95 % of the prediction over the lane's posterior draws (same unit; the
    /// prediction itself when there are no draws).
    pub predicted_p05: f64,
    pub predicted_p95: f64,
    /// predicted - measured, in units of the measurement's repeatability (a hardness predicted
    /// below the bottom of the scale taken at the bottom).
    pub normalised: f64,
}

/// Fitted parameters, named with units.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct FittedParams {
    pub md_creep_scale: f64,
    pub radial_creep_scale: f64,
    /// Kelvin compliance over the elastic compliance, MD and radial.
    #[serde(rename = "md_delayed_ratio")]
    pub md_delayed: f64,
    pub md_viscous_time_s: f64,
    #[serde(rename = "radial_delayed_ratio")]
    pub radial_delayed: f64,
    pub radial_viscous_time_s: f64,
}

/// Uncertainty of the scales, from the lane's posterior samples ([`super::posterior`]).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Uncertainty {
    /// Standard deviation of the MD scale (same units as the scale), from the posterior
    /// standard deviation of its logarithm.
    pub md_creep_scale_sd: f64,
    pub radial_creep_scale_sd: f64,
    /// Multiplicative one-sigma factor, exp(posterior sd of the log-scale).
    pub md_creep_scale_factor: f64,
    pub radial_creep_scale_factor: f64,
    /// 15.87 % and 84.13 % posterior quantiles of each scale (one-sigma equivalent; asymmetric).
    pub md_creep_scale_low: f64,
    pub md_creep_scale_high: f64,
    pub radial_creep_scale_low: f64,
    pub radial_creep_scale_high: f64,
    /// Nodes of the grid the posterior was integrated on ([`super::posterior::quadrature`]).
    pub posterior_nodes: usize,
    /// The grid still held mass at an edge when it had grown as far as it may: the posterior's
    /// tails are left out and the sds and intervals above are understated.
    pub posterior_cut: bool,
}

/// A lane's fit.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LaneFit {
    pub position_m: f64,
    pub params: FittedParams,
    pub uncertainty: Uncertainty,
    /// Whether the data (without the prior) identify each scale: the posterior is narrower than
    /// the prior by more than a factor sqrt 2 (the data alone constrain it more than the prior
    /// does). A scale that is not identifiable stays at the pooled value (hierarchical shrinkage).
    pub md_identifiable: bool,
    pub radial_identifiable: bool,
    pub residuals: Vec<Residual>,
    /// Root-mean-square normalised residual (1 = measurement noise level).
    pub rmse: f64,
    pub converged: bool,
    pub iterations: u64,
    pub evaluations: u64,
    pub start_cost: f64,
    pub final_cost: f64,
    /// Log-scales at the optimum.
    #[serde(skip)]
    pub theta: Vec<f64>,
    /// Each log-scale (MD, radial) set to the pooled value: it moves with the roll's value in
    /// the draws ([`Self::draws`]).
    #[serde(skip)]
    pub pinned: [bool; 2],
    /// The lane's creep parameters (grade, or lab-fitted grade, times the scales).
    #[serde(skip)]
    pub creep: LaneCreep,
    /// Creep parameters of [`super::posterior::DRAWS`] posterior draws (for propagation).
    #[serde(skip)]
    pub draws: Vec<LaneCreep>,
    /// Log-scales (MD, radial) of the same draws.
    #[serde(skip)]
    pub draws_theta: Vec<[f64; 2]>,
    /// The lane run through the whole of storage with each of the draws, everything kept (as
    /// [`crate::storage::age_prepared`] keeps it); `None` when a draw's run failed (a run of
    /// its own then names the failure).
    #[serde(skip)]
    pub draw_runs: Option<Vec<LaneAged>>,
}

/// Fit one lane with a prior centred on `prior` (the pooled log-scales): the optimum by
/// Nelder-Mead, then the posterior by quadrature on a grid ([`super::posterior::quadrature`]).
/// A scale the data do not identify is set to the pooled value when the pooled value lies inside
/// its one-sigma posterior interval. With `scores` (the lane's score in each state,
/// [`super::field`]) the posterior draws are put in state order by them, else left in their
/// seeded random order.
pub fn fit_lane(
    p: &LaneProblem,
    (prior, pooled_draws): ([f64; 2], &[[f64; 2]]),
    seed: u64,
    scores: Option<&[f64]>,
) -> Result<LaneFit, SolverError> {
    let lanes = std::slice::from_ref(p);
    let obj = Objective {
        lanes,
        prior,
        prior_sd: PRIOR_SD_LN,
    };
    let m = minimise(&obj, prior)?;
    let h = hessian2(&|t| obj.values(t), &m.theta, m.cost, 0.05);
    let post = super::posterior::quadrature(&obj, (&m.theta, m.cost), h, PRIOR_SD_LN, seed);
    // the data alone: the curvature without the prior's part
    let ip = 1.0 / (PRIOR_SD_LN * PRIOR_SD_LN);
    let cov_data = inverse_pd([[h[0][0] - ip, h[0][1]], [h[1][0], h[1][1] - ip]]);
    let ident = |i: usize| {
        post.sd[i] < PRIOR_SD_LN * std::f64::consts::FRAC_1_SQRT_2
            && cov_data.is_some_and(|c| c[i][i].sqrt() < PRIOR_SD_LN)
    };
    // shrink to the pooled value when the data cannot tell it apart from the optimum
    let pinned = [0, 1].map(|i| !ident(i) && (post.low[i]..=post.high[i]).contains(&prior[i]));
    let theta: Vec<f64> = (0..2)
        .map(|i| if pinned[i] { prior[i] } else { m.theta[i] })
        .collect();
    let a = p.simulate(&theta).ok_or(SolverError::ModelFailed)?;
    let mut residuals = residuals(p, &a);
    let final_cost = obj.value_from_run(&theta, a);
    let rmse = rms_normalised(&residuals);
    let (smd, sr) = (theta[0].exp(), theta[1].exp());
    let c = creep_from(p.material, &theta);
    let (draws, draws_theta) =
        super::draws::pinned_draws(p.material, &post, &theta, (pinned, pooled_draws), scores);
    let draw_runs = super::draws::draw_runs(p, &draws);
    super::draws::prediction_bands(p, &draws_theta, draw_runs.as_deref(), &mut residuals);
    Ok(LaneFit {
        position_m: p.wound.lanes[p.lane].position_m,
        params: FittedParams {
            md_creep_scale: smd,
            radial_creep_scale: sr,
            md_delayed: c.md.delayed,
            md_viscous_time_s: c.md.viscous_time_s,
            radial_delayed: c.radial.delayed,
            radial_viscous_time_s: c.radial.viscous_time_s,
        },
        uncertainty: Uncertainty {
            md_creep_scale_sd: smd * post.sd[0],
            radial_creep_scale_sd: sr * post.sd[1],
            md_creep_scale_factor: post.sd[0].exp(),
            radial_creep_scale_factor: post.sd[1].exp(),
            md_creep_scale_low: post.low[0].exp(),
            md_creep_scale_high: post.high[0].exp(),
            radial_creep_scale_low: post.low[1].exp(),
            radial_creep_scale_high: post.high[1].exp(),
            posterior_nodes: post.nodes,
            posterior_cut: post.cut,
        },
        md_identifiable: ident(0),
        radial_identifiable: ident(1),
        residuals,
        rmse,
        converged: m.converged,
        iterations: m.iterations,
        evaluations: m.evaluations + 8 + post.evaluations,
        start_cost: m.start_cost,
        final_cost,
        theta,
        pinned,
        creep: c,
        draws,
        draws_theta,
        draw_runs,
    })
}

/// Root-mean-square normalised residual (0 with no residuals).
fn rms_normalised(residuals: &[Residual]) -> f64 {
    if residuals.is_empty() {
        return 0.0;
    }
    (residuals.iter().map(|r| r.normalised.powi(2)).sum::<f64>() / residuals.len() as f64).sqrt()
}

/// Residuals of a lane's observations against a simulated lane.
fn residuals(p: &LaneProblem, a: &Track) -> Vec<Residual> {
    p.obs
        .iter()
        .map(|o| {
            let pred = p.predict(o, a);
            Residual {
                what: o.what,
                age_s: o.age_s,
                measured: o.value,
                predicted: pred,
                predicted_p05: pred,
                predicted_p95: pred,
                normalised: super::explained::normalised(o.what, pred, o.value, o.sigma),
            }
        })
        .collect()
}
