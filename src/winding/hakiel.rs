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
//! the new outer layer s = -p_new (the pressure the new layer adds, sigma_w dr / r for a thin
//! ring of thickness dr); at the core r s' = (E_t / E_c - 1 + nu) s (core stiffness E_c; rigid
//! core: E_t / E_c = 0).
//!
//! # Discretisation: an exact element per interval
//! In t = ln r the equation has constant coefficients where E_r is constant,
//! s_tt + 2 s_t + (1 - g^2) s = 0 with g = sqrt(E_t / E_r), whose solutions are r^(-1 +/- g)
//! (Altmann 1968). E_r is taken constant on each grid interval, at the mean of its end
//! pressures, and the equation is solved exactly there. With z = 1 + r s'/s, the core condition
//! gives z = 1 + kappa at the core, and across an interval of log-length tau
//!
//! z1 = g (a - b) / (a + b),  phi1 / phi0 = e^(-tau) e^(g tau) (a + b) / (2 g),
//! a = g + z0,  b = (g - z0) e^(-2 g tau),
//!
//! (computed in the equivalent linear form of [`super::element`], whose chain from interval to
//! interval needs no division), where phi is the solution that meets the core condition. Since a
//! Dirichlet load at the outer edge only scales phi, a unit pressure at radius s gives the
//! increment phi(r) / phi(s) at r: each step's increment is a product of the per-interval ratios,
//! marched inward from the new layer, and the new layers' pressure is integrated over their own
//! interval in closed form of the kernel (Gauss-Legendre in t) rather than lumped at one node. The
//! tangential increment is z s (equilibrium, s_t = s + r s'). The only approximations left are E_r
//! constant on an interval and over a step (taken at the mid-step pressure: predictor-corrector in
//! the surface zone, whose predictor re-uses the ratios the last sub-step's corrector left, and
//! extrapolated from the previous step's increment in the deep part, where a step changes the
//! pressure little and smoothly): both second order in the node spacing, and the layer's own inward
//! decay over about r / g needs no resolving. Increments that have decayed below 1e-15 of the local
//! pressure are not carried further in, and the per-interval ratios are only recomputed where the
//! pressure changed, each decay factor as a short series from the last one computed in full while g
//! has moved little ([`super::element`]). The stack strain behind the compressed build is updated
//! by its change once per grid step, over the nodes the step loaded (series for small and moderate
//! changes, no library logarithm for most nodes and steps; `super::strain`); the build is read
//! only between grid steps.

use super::element::Intervals;
use super::strain;
pub use super::substeps::SubSteps;
use crate::case::Stack;

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

    /// g = sqrt(E_t / E_r) at interlayer pressure `p` (Pa).
    #[inline]
    fn g(&self, p: f64) -> f64 {
        (self.e_t / self.stack.modulus(p)).sqrt()
    }
}

/// Increments smaller than this fraction of the local radial stress are not carried inward.
const NEGLIGIBLE: f64 = 1e-15;

/// Refinement of the accretion near the surface for grid `r`: each grid interval is wound in
/// `sub` steps, and the sub-nodes are kept while they lie within `depth` grid intervals of the
/// surface, where the stack is soft and the pressure profile steep. On a grid of
/// [`REFERENCE_INTERVALS`] intervals a step's layers span [`SUB_SPAN`] of the unloaded stack's
/// inward decay length r / g(0); the number of steps per interval does not depend on the grid,
/// so refining the grid refines the steps with it (one resolution knob). The zone reaches
/// [`ZONE_DECAYS`] decay lengths deep. Returns (sub, depth).
pub fn refinement(m: &LaneModel, r: &[f64]) -> (usize, usize) {
    let (first, last) = match (r.first(), r.last()) {
        (Some(a), Some(b)) if r.len() > 1 => (*a, *b),
        _ => return (1, 1),
    };
    let tau_max = r.windows(2).map(|w| (w[1] / w[0]).ln()).fold(0.0, f64::max);
    let g0 = m.g(0.0);
    let per_interval = g0 * (last / first).ln() / REFERENCE_INTERVALS;
    let sub = (per_interval / SUB_SPAN).ceil().clamp(1.0, 64.0) as usize;
    let depth = (ZONE_DECAYS / (g0 * tau_max)).ceil().clamp(1.0, 4096.0) as usize;
    (sub, depth)
}

/// Grid intervals at which a step spans [`SUB_SPAN`] decay lengths.
pub const REFERENCE_INTERVALS: f64 = 400.0;
/// Step size, in decay lengths of the unloaded stack, on the reference grid.
pub const SUB_SPAN: f64 = 0.25;
/// Depth of the refined zone, in decay lengths of the unloaded stack.
pub const ZONE_DECAYS: f64 = 4.0;

/// A lane being wound on a grid of nodes.
///
/// Internally the nodes in use ("active") are the grid nodes below the refined zone and every
/// sub-node inside it. The deep part (grid nodes only) is updated once per grid step, with
/// its radial modulus at the mid-step pressure estimated from the previous step's increment;
/// the zone is updated at every sub-step with a predictor-corrector (the predictor on the
/// ratios the last corrector left, and the new interval's).
#[derive(Debug, Clone)]
pub struct LaneState {
    /// Grid radii, m (increasing; need not be uniform); after [`Self::finish`], the output
    /// nodes' radii (the grid nodes and the refined zone's sub-nodes).
    pub r: Vec<f64>,
    /// Radial stress at the output nodes, Pa (compression negative); valid after
    /// [`Self::finish`].
    pub sr: Vec<f64>,
    /// Tangential (MD) stress at the output nodes, Pa; valid after [`Self::finish`].
    pub st: Vec<f64>,
    /// Wound-in tension each grid node (after [`Self::finish`], each output node) was wound
    /// with, N/m.
    pub wit: Vec<f64>,
    /// Number of grid nodes wound so far; after [`Self::finish`], the number of output nodes.
    pub wound: usize,
    sub: usize,
    depth: usize,
    // active nodes
    ar: Vec<f64>,
    asr: Vec<f64>,
    ast: Vec<f64>,
    /// u and w of the element chain at each active node (z = 1 + r s' / s = w / u; u = 1 at the
    /// core, which no sweep writes).
    au: Vec<f64>,
    aw: Vec<f64>,
    aeps: Vec<f64>,
    /// Pressure (Pa) at which `aeps` was last brought up to date.
    ap: Vec<f64>,
    agrid: Vec<usize>,
    /// Increment of the current sub-step (zone), and of the last grid step (all nodes).
    s: Vec<f64>,
    last: Vec<f64>,
    /// Active intervals.
    iv: Intervals,
    /// Scratch: the pressures (Pa) at the nodes of the sweep in hand, or the strain changes of
    /// [`Self::strains`].
    pbuf: Vec<f64>,
    /// Active index of the zone's bottom node (a grid node).
    b: usize,
    /// Deep intervals below this one have ratios valid for the current pressures.
    fresh: usize,
    /// Lowest deep node the last grid step's increment reached.
    dcut: usize,
    zcut: usize,
    /// Sum over active intervals of dr (1 - mean strain), m.
    build: f64,
    /// [`Self::finish`] has given out the output nodes (a second call changes nothing).
    finished: bool,
}

/// The accretion step could not be computed.
#[derive(Debug, Clone, PartialEq)]
pub struct StepFailure {
    /// Node index being added.
    pub step: usize,
}

impl LaneState {
    /// An empty lane on grid `r` (m, increasing), refined for model `m` by [`refinement`].
    pub fn new(r: Vec<f64>, m: &LaneModel) -> Self {
        let (sub, depth) = refinement(m, &r);
        Self::with_refinement(r, sub, depth)
    }

    /// An empty lane on grid `r` with `sub` steps per grid interval, sub-nodes kept `depth`
    /// intervals deep.
    pub fn with_refinement(r: Vec<f64>, sub: usize, depth: usize) -> Self {
        let n = r.len();
        let cap = n + sub * (depth + 1) + 1;
        LaneState {
            sr: vec![0.0; n],
            st: vec![0.0; n],
            wit: vec![0.0; n],
            r,
            wound: 0,
            sub: sub.max(1),
            depth: depth.max(1),
            ar: Vec::with_capacity(cap),
            asr: Vec::with_capacity(cap),
            ast: Vec::with_capacity(cap),
            au: Vec::with_capacity(cap),
            aw: Vec::with_capacity(cap),
            aeps: Vec::with_capacity(cap),
            ap: Vec::with_capacity(cap),
            agrid: Vec::with_capacity(cap),
            s: Vec::with_capacity(cap),
            last: Vec::with_capacity(cap),
            iv: Intervals::with_capacity(cap),
            pbuf: Vec::with_capacity(cap),
            b: 0,
            fresh: 0,
            dcut: 0,
            zcut: 0,
            build: 0.0,
            finished: false,
        }
    }

    fn push_node(&mut self, r: f64, sigma_w: f64, grid: usize) {
        self.ar.push(r);
        self.asr.push(0.0);
        self.ast.push(sigma_w);
        self.au.push(1.0);
        self.aw.push(0.0);
        self.aeps.push(0.0);
        self.ap.push(0.0);
        self.agrid.push(grid);
        self.s.push(0.0);
        self.last.push(0.0);
    }

    /// The sub-steps of grid step `k` (at least 1) for this lane's grid and refinement; lanes on
    /// the same grid with the same model share it ([`Self::add_planned`]).
    pub fn plan(&self, m: &LaneModel, k: usize) -> SubSteps {
        SubSteps::new(&self.r, k, self.sub, m.g(0.0))
    }

    /// Add the next grid node: the layers between the current surface and the next grid
    /// radius. `sigma_w` is their wound-in stress (Pa), `wit` their wound-in tension (N/m).
    pub fn add(&mut self, m: &LaneModel, sigma_w: f64, wit: f64) -> Result<(), StepFailure> {
        let plan = self.plan(m, self.wound);
        self.add_planned(m, &plan, sigma_w, wit)
    }

    /// [`Self::add`] with the grid step's sub-steps already planned (by [`Self::plan`] of any
    /// lane on the same grid with the same model); the result is the same to the last bit.
    pub fn add_planned(
        &mut self,
        m: &LaneModel,
        plan: &SubSteps,
        sigma_w: f64,
        wit: f64,
    ) -> Result<(), StepFailure> {
        let k = self.wound;
        if self.finished || k >= self.r.len() {
            return Err(StepFailure { step: k });
        }
        self.wit[k] = wit;
        if k == 0 {
            // The first layer lies on the core; it carries its wound-in stress and no pressure.
            self.push_node(self.r[0], sigma_w, 0);
            self.aw[0] = 1.0 + m.kappa();
            self.wound = 1;
            return Ok(());
        }
        if plan.k != k
            || plan.r_new.len() != self.sub
            || plan.r_new[self.sub - 1].to_bits() != self.r[k].to_bits()
        {
            let own = self.plan(m, k);
            return self.add_planned(m, &own, sigma_w, wit);
        }
        let fail = StepFailure { step: k };
        // deep part: ratios at the mid-step pressure estimated from the last step's increment
        self.deep_sweep(m);
        let b = self.b;
        for i in b..self.ar.len() {
            self.last[i] = 0.0;
        }
        let mut load_b = 0.0;
        for i in 1..=self.sub {
            let top = self.ar.len() - 1;
            let r_new = plan.r_new[i - 1];
            let tau_new = plan.tau[i - 1];
            debug_assert_eq!(tau_new, (r_new / self.ar[top]).ln());
            // predictor: the ratios the last corrector left (see [`Self::new_interval`]),
            // corrector at mid-step
            let (zj, pj) = self.new_interval(m, top);
            // the new interval: zero pressure at its outer end; the surface node has none yet,
            // so the predictor's kernel is the plan's (at g of the unloaded stack)
            let q = if pj == 0.0 {
                plan.kernel[i - 1].load(zj)
            } else {
                plan.points[i - 1].at(m.g(0.5 * pj)).load(zj)
            };
            self.zone_march(top, -sigma_w * q);
            let (zj, pj) = self.zone_sweep(m, top);
            let q = plan.points[i - 1].at(m.g(0.5 * pj)).load(zj);
            self.zone_march(top, -sigma_w * q);
            if !q.is_finite() {
                return Err(fail);
            }
            self.build += r_new - self.ar[top];
            self.iv.push(tau_new, plan.grow[i - 1]);
            self.push_node(r_new, sigma_w, if i == self.sub { k } else { usize::MAX });
            self.load_zone(top);
            if self.zcut == b {
                load_b += self.s[b];
            }
        }
        // deep part: ratios at the mid-step pressure extrapolated from the last step
        self.deep_march(load_b);
        if !self.asr.iter().all(|x| x.is_finite()) {
            return Err(fail);
        }
        self.strains(m, self.dcut);
        self.coarsen();
        self.wound = k + 1;
        Ok(())
    }

    /// Add increment `s` to the stress of active node `j` (its strain is left to
    /// [`Self::strains`], once per grid step).
    #[inline]
    fn load(&mut self, j: usize, s: f64) {
        self.asr[j] += s;
        if j == 0 {
            self.load_core(s);
        }
    }

    /// The core node's tangential stress takes its radial increment `s` times z there, exactly
    /// (z = 1 + kappa at the core); elsewhere sigma_t comes from equilibrium.
    #[inline]
    fn load_core(&mut self, s: f64) {
        self.ast[0] += s * self.aw[0];
    }

    /// Add the zone's increment (from [`Self::zcut`] up to the surface node `top`) to the
    /// stresses and to the grid step's increment, as [`Self::load`] node by node would.
    fn load_zone(&mut self, top: usize) {
        let lo = self.zcut;
        let s = &self.s[lo..=top];
        for ((a, l), &sj) in self.asr[lo..=top]
            .iter_mut()
            .zip(&mut self.last[lo..=top])
            .zip(s)
        {
            *a += sj;
            *l += sj;
        }
        if lo == 0 {
            self.load_core(self.s[0]);
        }
    }

    /// Bring the stack strains of the nodes the grid step loaded (from active node `lo` up) to
    /// their pressures at its end, keeping the build sum (a node's trapezoid weight is half the
    /// span of its neighbours): once per grid step, not per sub-step (the build is read between
    /// grid steps only; the strain is a function of the pressure alone). A node's neighbours are
    /// fixed from the sub-step after it is laid until [`Self::coarsen`], which is after this.
    fn strains(&mut self, m: &LaneModel, lo: usize) {
        let n = self.ar.len();
        let mut de = std::mem::take(&mut self.pbuf);
        de.clear();
        de.resize(n - lo, 0.0);
        strain::changes(&m.stack, &mut self.ap[lo..], &self.asr[lo..], &mut de);
        for (e, &d) in self.aeps[lo..].iter_mut().zip(&de) {
            *e += d;
        }
        self.build -= 0.5 * strain::weighted(&de, &self.ar, lo);
        self.pbuf = de;
    }

    /// Element ratios of the intervals from node `from` up to node `to`, with the pressure at node
    /// i (Pa, positive in compression) half way through the step: -(sigma_r + half the
    /// increment), the increment being the deep part's last one (`deep`) or the zone's predicted
    /// one, counted from node `cut` up; each element's modulus is at its mid pressure. Returns
    /// the load factor and the pressure at `to`.
    fn sweep(
        &mut self,
        m: &LaneModel,
        (from, to): (usize, usize),
        (deep, cut): (bool, usize),
    ) -> (f64, f64) {
        let mut buf = std::mem::take(&mut self.pbuf);
        buf.clear();
        // pressure -(sigma_r + half the increment), the increment counted from `cut` up
        let half = if deep { &self.last } else { &self.s };
        let k0 = cut.clamp(from, to + 1);
        buf.extend(self.asr[from..k0].iter().map(|&a| -a));
        let rest = self.asr[k0..=to].iter().zip(&half[k0..=to]);
        buf.extend(rest.map(|(&a, &h)| -(a + 0.5 * h)));
        let zj = self
            .iv
            .sweep((m.e_t, m.stack), from, &buf, (&mut self.au, &mut self.aw));
        let pj = buf[buf.len() - 1];
        self.pbuf = buf;
        (zj, pj)
    }

    /// Recompute the deep ratios from `fresh` up to the zone bottom, at pressures half way
    /// through the step as estimated from the last step's increment.
    fn deep_sweep(&mut self, m: &LaneModel) {
        let (from, b, dcut) = (self.fresh.min(self.b), self.b, self.dcut);
        self.sweep(m, (from, b), (true, dcut));
    }

    /// Carry the load that reached the zone bottom through the deep part, recording the
    /// increment (the next step's mid-step pressure estimate).
    fn deep_march(&mut self, load_b: f64) {
        let mut s = load_b;
        let mut j = self.b;
        while j > 0 {
            s *= self.iv.rho[j - 1];
            if s.abs() <= NEGLIGIBLE * self.asr[j - 1].abs() {
                break;
            }
            j -= 1;
            self.load(j, s);
            self.last[j] = s;
        }
        self.dcut = j;
        self.fresh = j.saturating_sub(1);
    }

    /// Zone ratios from the zone bottom to the surface node `top` at the pressures half way
    /// through the sub-step (using the predicted increment in `self.s`); returns z and the
    /// pressure (Pa) at `top`.
    fn zone_sweep(&mut self, m: &LaneModel, top: usize) -> (f64, f64) {
        let (b, cut) = (self.b, self.zcut);
        self.sweep(m, (b, top), (false, cut))
    }

    /// The predictor's ratios: those below the surface node `top` as the last sub-step's
    /// corrector (or the grid step's deep sweep and [`Self::coarsen`]) left them, and the new
    /// interval just below `top` (not swept yet) at the start-of-step pressures; returns z and
    /// the pressure (Pa) at `top`. The ratios left are at pressures half a sub-step's increment
    /// before the start of this one, where a full predictor sweep would take them at its start:
    /// either way the predicted increment is off by the modulus change over about one
    /// increment, which moves the corrector's mid-step pressure only at second order.
    fn new_interval(&mut self, m: &LaneModel, top: usize) -> (f64, f64) {
        if top <= self.b {
            return (self.aw[top] / self.au[top], -self.asr[top]);
        }
        let j = top - 1;
        let (p0, p1) = (-self.asr[j], -self.asr[top]);
        let (u, w) = self
            .iv
            .step(j, m.g(0.5 * (p0 + p1)), (self.au[j], self.aw[j]));
        (self.au[top], self.aw[top]) = (u, w);
        (w / u, p1)
    }

    /// March the increment `s_top` at the surface node inward to the zone bottom or until it
    /// is negligible.
    fn zone_march(&mut self, top: usize, s_top: f64) {
        self.s[top] = s_top;
        let mut i = top;
        while i > self.b {
            let next = self.s[i] * self.iv.rho[i - 1];
            if next.abs() <= NEGLIGIBLE * self.asr[i - 1].abs() {
                break;
            }
            self.s[i - 1] = next;
            i -= 1;
        }
        self.zcut = i;
    }

    /// Drop the sub-nodes of grid intervals deeper than `depth` below the surface.
    fn coarsen(&mut self) {
        while (self.ar.len() - 1 - self.b) / self.sub > self.depth {
            let (b, e) = (self.b, self.b + self.sub);
            if self.sub > 1 {
                let mut rho = 1.0;
                let mut old = 0.0;
                for j in b..e {
                    rho *= self.iv.rho[j];
                    old += (self.ar[j + 1] - self.ar[j])
                        * (1.0 - 0.5 * (self.aeps[j] + self.aeps[j + 1]));
                }
                let new = (self.ar[e] - self.ar[b]) * (1.0 - 0.5 * (self.aeps[b] + self.aeps[e]));
                self.build += new - old;
                self.iv.merge(b, e, (self.ar[b], self.ar[e]), rho);
                let gone = b + 1..e;
                for v in [
                    &mut self.ar,
                    &mut self.asr,
                    &mut self.ast,
                    &mut self.au,
                    &mut self.aw,
                    &mut self.aeps,
                    &mut self.ap,
                    &mut self.s,
                    &mut self.last,
                ] {
                    v.drain(gone.clone());
                }
                self.agrid.drain(gone);
            }
            self.b += 1;
        }
    }

    /// End of winding: the output nodes and their stresses, in [`Self::r`], [`Self::sr`],
    /// [`Self::st`] and [`Self::wit`] (whose lengths become [`Self::wound`]; none if nothing was
    /// wound). The outermost node is the free surface with exactly its wound-in stress. Once
    /// only: a second call changes nothing, and [`Self::add`] refuses to go on.
    ///
    /// The output nodes are the nodes in use: the grid nodes below the refined zone and every
    /// sub-node in it, so the steep profile under the surface is given at the sub-steps'
    /// spacing. From the grid nodes alone, the outer 25 mm's mean pressure and the outer wrap's
    /// MD stress after storage came out up to 86 % and 37 % off at 61-87 nodes, against 3-7 %
    /// and 0.1-8 % with them (field cases, against 401 nodes). A sub-node's wound-in tension is
    /// that of the grid step that wound it.
    ///
    /// Inside the roll the tangential stress is taken from equilibrium, sigma_t = d(r sigma_r)/dr
    /// (three-point differences on the nodes in use, which include the refined zone at the
    /// surface), rather than summed from the increments z ds: that sum nearly cancels the
    /// wound-in stress and so loses the relative accuracy the radial stress has. At the core
    /// the sum is exact (z = 1 + kappa there) and is kept.
    pub fn finish(&mut self, sigma_w_last: f64) {
        if std::mem::replace(&mut self.finished, true) {
            return;
        }
        let n = self.ar.len();
        for i in 1..n.saturating_sub(1) {
            let (r0, r1, r2) = (self.ar[i - 1], self.ar[i], self.ar[i + 1]);
            let (f0, f1, f2) = (r0 * self.asr[i - 1], r1 * self.asr[i], r2 * self.asr[i + 1]);
            let (h0, h1) = (r1 - r0, r2 - r1);
            self.ast[i] = (-h1 / (h0 * (h0 + h1))) * f0
                + ((h1 - h0) / (h0 * h1)) * f1
                + (h0 / (h1 * (h0 + h1))) * f2;
        }
        if self.wound == 0 || n == 0 {
            for v in [&mut self.r, &mut self.sr, &mut self.st, &mut self.wit] {
                v.clear();
            }
            self.wound = 0;
            return;
        }
        // a sub-node's layers were wound in the grid step ending at the next grid node above it
        let mut wit = vec![0.0; n];
        let mut step = self.wound - 1;
        for i in (0..n).rev() {
            if self.agrid[i] != usize::MAX {
                step = self.agrid[i];
            }
            wit[i] = self.wit[step];
        }
        self.r.clone_from(&self.ar);
        self.sr.clone_from(&self.asr);
        self.st.clone_from(&self.ast);
        self.wit = wit;
        self.wound = n;
        self.sr[n - 1] = 0.0;
        self.st[n - 1] = sigma_w_last;
    }

    /// Compressed radius of the wound build (m): the core radius, less the core's inward
    /// displacement, plus each wound interval's layers at compressed thickness. `layers_per_m`
    /// is the number of layers per metre of grid (1 / mean compressed layer thickness) and
    /// `caliper` this lane's uncompressed caliper (m); interval strains are the mean of the
    /// end nodes' strains (trapezoid rule).
    pub fn outer_radius(&self, m: &LaneModel, layers_per_m: f64, caliper: f64) -> f64 {
        let r0 = self.r[0];
        let core_u = match (m.core_stiffness, self.asr.first()) {
            (Some(ec), Some(&sr0)) => sr0 * r0 / ec,
            _ => 0.0,
        };
        r0 + core_u + self.build * layers_per_m * caliper
    }
}
