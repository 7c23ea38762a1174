//! The new layers of one grid step of the accretion ([`super::hakiel`]): the load of a new
//! interval's layers on the roll, integrated over the interval in closed form of the Altmann
//! kernel, and the step's sub-steps, the same for every lane on a grid (planned once per step).

/// Six-point Gauss-Legendre nodes and weights on [-1, 1] (Abramowitz and Stegun, Table 25.4).
const GAUSS6: [(f64, f64); 6] = [
    (-0.932_469_514_203_152, 0.171_324_492_379_170),
    (-0.661_209_386_466_265, 0.360_761_573_048_139),
    (-0.238_619_186_083_197, 0.467_913_934_572_691),
    (0.238_619_186_083_197, 0.467_913_934_572_691),
    (0.661_209_386_466_265, 0.360_761_573_048_139),
    (0.932_469_514_203_152, 0.171_324_492_379_170),
];

/// The Gauss points of a new interval of log-length `tau` (its layers' load on the roll), in
/// t = ln(r / r_inner): the pressure at the inner end, per unit wound-in stress, of the layers
/// wound over the interval is the integral over the interval of phi(inner) / phi(t) dt, which
/// for an element of g and z0 is
///
/// g integral_0^tau 2 e^t x / (a + b x^2) dt,  x = e^(-g t),  a = g + z0,  b = g - z0,
///
/// smooth on the interval (g tau is at most about one; the six-point rule is then within about
/// 1e-10 of the integral). Kept here: the points t_k of the inner half (the outer half's x are
/// e^(-g tau) / x of these, the points being symmetric) and the g-free weights
/// c_k = tau w_k e^(t_k), so that a lane's g costs four exponentials.
#[derive(Debug, Clone, Copy)]
pub(super) struct LayerPoints {
    tau: f64,
    t: [f64; 3],
    c: [f64; 6],
}

impl LayerPoints {
    fn new(tau: f64) -> Self {
        let t = GAUSS6.map(|(xi, _)| 0.5 * tau * (1.0 + xi));
        let mut c = [0.0; 6];
        for (k, (_, w)) in GAUSS6.iter().enumerate() {
            c[k] = tau * w * t[k].exp();
        }
        LayerPoints {
            tau,
            t: [t[0], t[1], t[2]],
            c,
        }
    }

    /// The kernel for a lane of g.
    #[inline]
    pub(super) fn at(&self, g: f64) -> LayerKernel {
        let e = (-g * self.tau).exp();
        let mut x = [0.0; 6];
        for k in 0..3 {
            x[k] = (-g * self.t[k]).exp();
            // on an extremely soft stack both underflow: the outer half's points are then 0 too
            x[5 - k] = if x[k] > 0.0 { e / x[k] } else { 0.0 };
        }
        let mut cx = [0.0; 6];
        for k in 0..6 {
            cx[k] = self.c[k] * x[k];
        }
        LayerKernel { g, x, cx }
    }
}

/// [`LayerPoints`] at one g: the points x_k and c_k x_k.
#[derive(Debug, Clone, Copy)]
pub(super) struct LayerKernel {
    g: f64,
    x: [f64; 6],
    cx: [f64; 6],
}

impl LayerKernel {
    /// The load for z0 at the interval's inner end.
    #[inline]
    pub(super) fn load(&self, z0: f64) -> f64 {
        let (a, b) = (self.g + z0, self.g - z0);
        let mut sum = 0.0;
        for k in 0..6 {
            sum += self.cx[k] / (a + b * self.x[k] * self.x[k]);
        }
        self.g * sum
    }
}

/// The sub-steps of one grid step, the same for every lane wound on the grid with the same
/// model: each sub-step's new radius, its log-length over the surface node, and the new-layer
/// kernel at the unloaded stack's g (the predictor's, whose surface node carries no pressure
/// yet). Built once per grid step and shared by the lanes ([`LaneState::plan`]).
#[derive(Debug, Clone, Default)]
pub struct SubSteps {
    /// Grid step the plan is for.
    pub(super) k: usize,
    /// Per sub-step: new radius (m), log-length and ratio over the previous surface node.
    pub(super) r_new: Vec<f64>,
    pub(super) tau: Vec<f64>,
    pub(super) grow: Vec<f64>,
    /// Gauss points of each sub-step's new interval, and their kernel at `g0` (the predictor's).
    pub(super) points: Vec<LayerPoints>,
    pub(super) kernel: Vec<LayerKernel>,
}

impl SubSteps {
    /// The sub-steps of grid step `k` (at least 1) of grid `r` (m) in `sub` steps, with the
    /// predictor's kernels at `g0`, the unloaded stack's g.
    pub(super) fn new(r: &[f64], k: usize, sub: usize, g0: f64) -> Self {
        let mut plan = SubSteps {
            k,
            r_new: Vec::with_capacity(sub),
            tau: Vec::with_capacity(sub),
            grow: Vec::with_capacity(sub),
            points: Vec::with_capacity(sub),
            kernel: Vec::with_capacity(sub),
        };
        if k == 0 || k >= r.len() {
            return plan;
        }
        let (r0, r1) = (r[k - 1], r[k]);
        let tau_f = (r1 / r0).ln() / sub as f64;
        let mut prev = r0;
        for i in 1..=sub {
            let r_new = if i == sub {
                r1
            } else {
                r0 * (tau_f * i as f64).exp()
            };
            let tau_new = (r_new / prev).ln();
            plan.r_new.push(r_new);
            plan.tau.push(tau_new);
            plan.grow.push(r_new / prev);
            let points = LayerPoints::new(tau_new);
            plan.points.push(points);
            plan.kernel.push(points.at(g0));
            prev = r_new;
        }
        plan
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The six-point rule against composite Simpson (Abramowitz and Stegun 25.4.6, 20,000
    /// panels) of the same integral, over the spans a sub-step takes (g tau up to 1: 0.25 on
    /// the reference grid, about 0.8 on the layer-count grid) and z0 from 0.2 to 2. SciPy's
    /// quad gives the same differences: about 1e-10 at g tau = 1, 1e-7 at 2 (the x-form of an
    /// earlier version was no closer).
    #[test]
    fn layer_load_matches_a_fine_quadrature() {
        for (g, tau) in [(300.0, 0.000_8), (300.0, 0.003), (40.0, 0.025), (5.0, 0.2)] {
            for z0 in [0.2, 1.0, 2.0] {
                let (a, b) = (g + z0, g - z0);
                let f = |t: f64| {
                    let x = (-g * t).exp();
                    2.0 * g * t.exp() * x / (a + b * x * x)
                };
                let n = 20_000;
                let h = tau / f64::from(n);
                let mut simpson = f(0.0) + f(tau);
                for i in 1..n {
                    simpson += if i % 2 == 1 { 4.0 } else { 2.0 } * f(h * f64::from(i));
                }
                simpson *= h / 3.0;
                let q = LayerPoints::new(tau).at(g).load(z0);
                assert!(
                    (q / simpson - 1.0).abs() < 1e-9,
                    "g {g} tau {tau} z0 {z0}: {q} vs {simpson}"
                );
            }
        }
        // g so large that every point's x underflows: the load stays finite
        assert!(LayerPoints::new(0.01).at(1e6).load(1.0).is_finite());
    }
}
