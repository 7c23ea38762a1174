//! One lane's layer-by-layer accretion with Hakiel's nonlinear orthotropic model.
//!
//! Hakiel, Z. (1987) "Nonlinear model for wound roll stresses", TAPPI J. 70(5):113-117 (from
//! memory). Each accreted layer adds a stress increment that solves, on the wound part of the
//! roll,
//!
//! r^2 s'' + 3 r s' + (1 - E_t / E_r(P)) s = 0
//!
//! with s the radial stress increment, E_t the MD modulus and E_r the radial (stack) modulus at
//! the current interlayer pressure (Pfeiffer 1966: E_r = K2 (P + K1)). Boundary conditions: at
//! the new outer layer s = -p_new (the pressure the new layer adds, T h / r for a thin ring); at
//! the core r s' = (E_t / E_c - 1 + nu) s (core stiffness E_c; rigid core: E_t / E_c = 0).
//! Central differences on a uniform grid give a tridiagonal system solved by the Thomas
//! algorithm; the core condition uses a ghost node (second order), and the new node takes half
//! of its own layer's pressure (trapezoid rule over the accretion integral), so the result
//! converges at second order in the node spacing. The tangential stress follows
//! from equilibrium, s_t = s_r + r s_r'; a new layer enters at its wound-in stress.

use crate::case::Stack;
use crate::numeric::thomas;

/// Material and boundary data for one lane's accretion.
#[derive(Debug, Clone, Copy)]
pub struct LaneModel {
    /// MD (tangential) modulus, Pa.
    pub e_t: f64,
    /// Stack law giving the radial modulus.
    pub stack: Stack,
    /// Poisson ratio in the core condition.
    pub poisson: f64,
    /// Core stiffness E_c, Pa; `None` for a rigid core.
    pub core_stiffness: Option<f64>,
}

impl LaneModel {
    /// kappa = E_t / E_c - 1 + nu in the core condition r s' = kappa s.
    pub fn kappa(&self) -> f64 {
        self.core_stiffness.map_or(0.0, |ec| self.e_t / ec) - 1.0 + self.poisson
    }
}

/// A lane being wound: stresses at the grid nodes wound so far.
#[derive(Debug, Clone)]
pub struct LaneState {
    /// Grid radii, m (shared nominal grid, uniform spacing).
    pub r: Vec<f64>,
    /// Radial stress, Pa (compression negative).
    pub sr: Vec<f64>,
    /// Tangential (MD) stress, Pa.
    pub st: Vec<f64>,
    /// Wound-in tension each node was wound with, N/m.
    pub wit: Vec<f64>,
    /// Number of nodes wound so far.
    pub wound: usize,
    a: Vec<f64>,
    b: Vec<f64>,
    c: Vec<f64>,
    d: Vec<f64>,
    s: Vec<f64>,
    pred: Vec<f64>,
}

/// The linear system at one accretion step could not be solved.
#[derive(Debug, Clone, PartialEq)]
pub struct StepFailure {
    /// Node index being added.
    pub step: usize,
}

impl LaneState {
    /// An empty lane on grid `r` (m).
    pub fn new(r: Vec<f64>) -> Self {
        let n = r.len();
        LaneState {
            r,
            sr: vec![0.0; n],
            st: vec![0.0; n],
            wit: vec![0.0; n],
            wound: 0,
            a: vec![0.0; n],
            b: vec![0.0; n],
            c: vec![0.0; n],
            d: vec![0.0; n],
            s: vec![0.0; n],
            pred: vec![0.0; n],
        }
    }

    /// Add the next node (layer group). `p_new` is the interlayer pressure it adds (Pa),
    /// `sigma_w` its wound-in stress (Pa), `wit` its wound-in tension (N/m).
    pub fn add(
        &mut self,
        m: &LaneModel,
        p_new: f64,
        sigma_w: f64,
        wit: f64,
    ) -> Result<(), StepFailure> {
        let k = self.wound;
        if k >= self.r.len() {
            return Err(StepFailure { step: k });
        }
        let kappa = m.kappa();
        if k == 0 {
            // First group straight on the core.
            self.sr[0] = -0.5 * p_new;
            self.st[0] = sigma_w + 0.5 * (1.0 + kappa) * (-p_new);
            self.wit[0] = wit;
            self.wound = 1;
            return Ok(());
        }
        let h = self.r[1] - self.r[0];
        let n = k + 1;
        // Predictor with E_r at the current pressure, corrector with E_r at the mid-step
        // pressure P - ds/2 (the radial modulus follows the pressure during the step).
        self.solve(m, k, h, kappa, p_new, false)?;
        self.pred[..n].copy_from_slice(&self.d[..n]);
        self.solve(m, k, h, kappa, p_new, true)?;
        let ds = &self.d;
        for i in 0..k {
            let r = self.r[i];
            let rds = if i == 0 {
                kappa * ds[0]
            } else {
                r * (ds[i + 1] - ds[i - 1]) / (2.0 * h)
            };
            self.sr[i] += ds[i];
            self.st[i] += ds[i] + rds;
        }
        // Trapezoid weight: the new node carries half its own layer's pressure, so the sum of
        // increments integrates the continuum accretion integral to second order in h.
        self.sr[k] = 0.5 * ds[k];
        let rds_k = self.r[k] * (ds[k] - ds[k - 1]) / h;
        self.st[k] = sigma_w + 0.5 * (ds[k] + rds_k);
        self.wit[k] = wit;
        self.wound = n;
        Ok(())
    }

    /// Solve the increment system for step `k` into `self.d`; with `mid`, evaluate E_r at the
    /// mid-step pressure using the predictor in `self.pred`.
    fn solve(
        &mut self,
        m: &LaneModel,
        k: usize,
        h: f64,
        kappa: f64,
        p_new: f64,
        mid: bool,
    ) -> Result<(), StepFailure> {
        let n = k + 1;
        for i in 0..k {
            let r = self.r[i];
            let p_now = -self.sr[i] - if mid { 0.5 * self.pred[i] } else { 0.0 };
            let er = m.stack.modulus(p_now);
            let q = r * r / (h * h);
            let p = 1.5 * r / h;
            let (ai, bi, ci) = (q - p, -2.0 * q + (1.0 - m.e_t / er), q + p);
            if i == 0 {
                // ghost node: s_{-1} = s_1 - 2 h kappa s_0 / r_0
                self.a[0] = 0.0;
                self.b[0] = bi - 2.0 * h * kappa * ai / r;
                self.c[0] = ai + ci;
            } else {
                self.a[i] = ai;
                self.b[i] = bi;
                self.c[i] = ci;
            }
            self.d[i] = 0.0;
        }
        // Dirichlet at the new outer node.
        self.a[k] = 0.0;
        self.b[k] = 1.0;
        self.c[k] = 0.0;
        self.d[k] = -p_new;
        if thomas(
            &self.a[..n],
            &self.b[..n],
            &self.c[..n],
            &mut self.d[..n],
            &mut self.s[..n],
        ) {
            Ok(())
        } else {
            Err(StepFailure { step: k })
        }
    }

    /// End of winding: the outermost node is the free surface, with zero radial stress and
    /// exactly its wound-in stress (the half-layer terms of the trapezoid rule vanish there).
    pub fn finish(&mut self, sigma_w_last: f64) {
        if self.wound > 0 {
            let k = self.wound - 1;
            self.sr[k] = 0.0;
            self.st[k] = sigma_w_last;
        }
    }

    /// Compressed thickness of the wound build (m) for layers of caliper `caliper` with `m`
    /// layers per node, plus the core's inward displacement.
    pub fn outer_radius(&self, m: &LaneModel, layers_per_node: f64, caliper: f64) -> f64 {
        let r0 = self.r[0];
        let core_u = match m.core_stiffness {
            Some(ec) if self.wound > 0 => self.sr[0] * r0 / ec,
            _ => 0.0,
        };
        let mut build = 0.0;
        for i in 0..self.wound {
            build += 1.0 - m.stack.strain(-self.sr[i]);
        }
        r0 + core_u + build * layers_per_node * caliper
    }
}
