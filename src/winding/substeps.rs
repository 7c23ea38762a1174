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

/// Integral over an interval of log-length `tau` of phi(inner) / phi(t) dt: the pressure at the
/// inner end, per unit wound-in stress, of the layers wound over the interval. With
/// x = e^(-g t) the integrand is 2 x^(-1/g) / (a + b x^2), smooth on [e^(-g tau), 1].
pub(super) fn new_layer_load(g: f64, z0: f64, tau: f64) -> f64 {
    LayerKernel::new(g, tau).load(g, z0)
}

/// The part of [`new_layer_load`] that depends only on g and the interval (the Gauss points x
/// and their weighted x^(-1/g)), so that lanes with the same g share it.
#[derive(Debug, Clone, Copy)]
pub(super) struct LayerKernel {
    /// Twice the half-width of the interval in x.
    twice_half: f64,
    /// Gauss points x and w x^(-1/g).
    points: [(f64, f64); 6],
}

impl LayerKernel {
    #[inline]
    fn new(g: f64, tau: f64) -> Self {
        let x1 = (-g * tau).exp();
        let (mid, half) = (0.5 * (1.0 + x1), 0.5 * (1.0 - x1));
        let points = GAUSS6.map(|(xi, w)| {
            let x = mid + half * xi;
            (x, w * (-x.ln() / g).exp())
        });
        LayerKernel {
            twice_half: 2.0 * half,
            points,
        }
    }

    /// The load for z0 at the interval's inner end (g as in [`Self::new`]).
    #[inline]
    pub(super) fn load(&self, g: f64, z0: f64) -> f64 {
        let (a, b) = (g + z0, g - z0);
        let mut sum = 0.0;
        for (x, wk) in self.points {
            sum += wk / (a + b * x * x);
        }
        self.twice_half * sum
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
    /// Predictor kernel per sub-step, at `g0`.
    pub(super) kernel: Vec<LayerKernel>,
    pub(super) g0: f64,
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
            kernel: Vec::with_capacity(sub),
            g0,
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
            plan.kernel.push(LayerKernel::new(g0, tau_new));
            prev = r_new;
        }
        plan
    }
}
