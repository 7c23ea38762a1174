//! The exact element of the accretion ([`super::hakiel`]) and the active intervals it is
//! evaluated on, swept side by side.
//!
//! Each interval keeps the decay factor e^(-g tau) it last computed with a library exponential
//! and the g it was for. While g stays close to that reference (|g_ref - g| tau below
//! [`SERIES_SPAN`]), the factor is the reference times the Taylor series of e^x to x^6
//! (remainder below 2e-18 relative), which is what most intervals need at most steps: deep in
//! the roll a step changes the pressure, and so g, by a small fraction. The factor is then
//! within about one unit in the last place of the exponential's, and never drifts, since every
//! value is one series away from a reference computed in full.

use crate::case::Stack;

/// Largest |x| = |g_ref - g| tau for which e^x is summed as a series.
const SERIES_SPAN: f64 = 1e-2;

/// One exact element (computed in full, in the Riccati form of [`super::hakiel`]; the
/// reference the sweep is checked against): from z at the inner end of an interval of
/// log-length `tau` (`grow` = e^tau), return (phi_in / phi_out, z at the outer end).
#[cfg(test)]
fn element(g: f64, z0: f64, tau: f64, grow: f64) -> (f64, f64) {
    let e1 = (-g * tau).exp();
    let a = g + z0;
    let d = a + (g - z0) * e1 * e1;
    (2.0 * g * e1 * grow / d, 2.0 * g * a / d - g)
}

/// One element in the linear form: with u = r phi and w = r^2 phi' + r phi (so z = w / u), an
/// interval of the constant-modulus equation carries (u, w) by the hyperbolic rotation of angle
/// g tau, here scaled by its decay factor `e1` = e^(-g tau) (`ig` = 1 / g):
///
/// u1 = c u + (s / g) w,  w1 = g s u + c w,  c = (1 + e1^2) / 2,  s = (1 - e1^2) / 2,
///
/// and phi_in / phi_out = e^tau e1 u / u1. Returns (u1, w1). The Riccati form z1 = g (z + g
/// th) / (g + z th) (th = tanh g tau) is the same map on z, but each step waits on a division;
/// here the chain from one interval to the next is two products and a sum for each of u and w
/// (nothing fused), and the division for the ratio stands aside from it.
#[inline(always)]
fn rotate((g, ig, e1): (f64, f64, f64), u: f64, w: f64) -> (f64, f64) {
    let e2 = e1 * e1;
    let (c, s) = (0.5 + 0.5 * e2, 0.5 - 0.5 * e2);
    (c * u + (s * ig) * w, (s * g) * u + c * w)
}

/// e^x for |x| <= [`SERIES_SPAN`], Taylor series to x^6.
#[inline]
fn exp_small(x: f64) -> f64 {
    1.0 + x
        * (1.0
            + x * (0.5
                + x * (1.0 / 6.0 + x * (1.0 / 24.0 + x * (1.0 / 120.0 + x * (1.0 / 720.0))))))
}

/// (u, w) are rescaled when |u| leaves [1 / RESCALE, RESCALE] (z and the ratios depend on their
/// ratio only).
const RESCALE: f64 = 1e150;

/// (u, w) brought back to u = 1; rare (a long run of intervals where the solution grows or
/// decays by the same factor), so kept off the sweep's path.
#[cold]
#[inline(never)]
fn rescale(u: f64, w: f64) -> (f64, f64) {
    if u.is_finite() && u != 0.0 {
        (1.0, w / u)
    } else {
        // overflowed or vanished: no element can be computed, which the callers' checks for
        // numbers that are not finite report
        (f64::NAN, f64::NAN)
    }
}

/// The active intervals of a lane (between consecutive active nodes), side by side (one vector
/// per quantity, so the sweep's passes over them vectorise): log-length, ratio of end radii,
/// the element ratio phi_in / phi_out last computed, and the reference g and decay factor of
/// each (g NaN: none yet); and the sweep's working vectors.
#[derive(Debug, Clone, Default)]
pub(super) struct Intervals {
    tau: Vec<f64>,
    grow: Vec<f64>,
    /// Element ratio phi_in / phi_out of each interval, as last computed.
    pub rho: Vec<f64>,
    g_ref: Vec<f64>,
    e_ref: Vec<f64>,
    // sweep scratch: per interval g, 1 / g and e^(-g tau)
    g: Vec<f64>,
    ig: Vec<f64>,
    e: Vec<f64>,
}

impl Intervals {
    /// No intervals, room for `cap`.
    pub fn with_capacity(cap: usize) -> Self {
        let v = || Vec::with_capacity(cap);
        Intervals {
            tau: v(),
            grow: v(),
            rho: v(),
            g_ref: v(),
            e_ref: v(),
            g: v(),
            ig: v(),
            e: v(),
        }
    }

    /// Append an interval of log-length `tau` and end-radius ratio `grow`.
    pub fn push(&mut self, tau: f64, grow: f64) {
        self.tau.push(tau);
        self.grow.push(grow);
        self.rho.push(0.0);
        self.g_ref.push(f64::NAN);
        self.e_ref.push(0.0);
    }

    /// The decay factor e^(-g tau) of interval `j`: a series from its reference while g is close
    /// to it, else computed in full and made the reference.
    #[inline]
    fn decay(&mut self, j: usize, g: f64) -> f64 {
        let x = (self.g_ref[j] - g) * self.tau[j];
        if x.abs() <= SERIES_SPAN {
            self.e_ref[j] * exp_small(x)
        } else {
            self.refresh(j, g)
        }
    }

    /// The decay factor e^(-g tau) of interval `j` computed in full, and made its reference.
    fn refresh(&mut self, j: usize, g: f64) -> f64 {
        let e = (-g * self.tau[j]).exp();
        self.g_ref[j] = g;
        self.e_ref[j] = e;
        e
    }

    /// The element of interval `j` at `g` from (u, w) at its inner end: stores the ratio,
    /// returns (u, w) at the outer end.
    pub fn step(&mut self, j: usize, g: f64, (u, w): (f64, f64)) -> (f64, f64) {
        let e1 = self.decay(j, g);
        let (u1, w1) = rotate((g, 1.0 / g, e1), u, w);
        self.rho[j] = self.grow[j] * e1 * u / u1;
        (u1, w1)
    }

    /// Sweep the elements of the intervals from node `from` up to node `from + p.len() - 1`: `p`
    /// holds the pressures (Pa) at those nodes; each element's radial modulus is the `stack`'s
    /// at the mean of its end pressures, and g = sqrt(`e_t` / E_r). Stores the ratios, carries
    /// (u, w) (z = w / u) from node `from` up, writing them at each node above it, and returns
    /// z at the top.
    ///
    /// In passes: g (and 1 / g = g E_r / E_t, no second root) of every interval, then the decay
    /// factors, then the chain of rotations with its ratios. The first two are independent per
    /// interval and vectorise; the chain waits on a product and a sum per interval.
    ///
    /// Where the processor has AVX2 the passes run four wide ([`Self::sweep_avx2`]); the results
    /// are the same to the bit (IEEE division, root, product and sum are correctly rounded
    /// whatever the vector width, nothing is fused, and the full exponential is the same
    /// library call in both).
    pub fn sweep(
        &mut self,
        model: (f64, Stack),
        from: usize,
        p: &[f64],
        uw: (&mut [f64], &mut [f64]),
    ) -> f64 {
        #[cfg(target_arch = "x86_64")]
        if crate::pack::avx2() {
            // SAFETY: `avx2()` is true only where the processor has AVX2.
            return unsafe { self.sweep_avx2(model, from, p, uw) };
        }
        self.sweep_any(model, from, p, uw)
    }

    /// [`Self::sweep`] compiled for AVX2.
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx2")]
    fn sweep_avx2(
        &mut self,
        model: (f64, Stack),
        from: usize,
        p: &[f64],
        uw: (&mut [f64], &mut [f64]),
    ) -> f64 {
        self.sweep_any(model, from, p, uw)
    }

    /// [`Self::sweep`] for any processor.
    #[inline(always)]
    fn sweep_any(
        &mut self,
        (e_t, stack): (f64, Stack),
        from: usize,
        p: &[f64],
        (u_at, w_at): (&mut [f64], &mut [f64]),
    ) -> f64 {
        let n = p.len().saturating_sub(1);
        if n == 0 {
            return w_at[from] / u_at[from];
        }
        // every entry used is written before it is read
        for v in [&mut self.g, &mut self.ig, &mut self.e] {
            if v.len() < n {
                v.resize(n, 0.0);
            }
        }
        match stack {
            Stack::Pfeiffer { k1_pa, k2 } => {
                self.moduli(e_t, p, |x| (x.max(0.0) + k1_pa) * k2);
            }
            Stack::Constant { radial_modulus_pa } => self.moduli(e_t, p, |_| radial_modulus_pa),
        }
        let (tau, g_ref, e_ref) = (
            &self.tau[from..from + n],
            &self.g_ref[from..from + n],
            &self.e_ref[from..from + n],
        );
        let mut far = false;
        for (((e, &g), &t), (&gr, &er)) in self.e[..n]
            .iter_mut()
            .zip(&self.g[..n])
            .zip(tau)
            .zip(g_ref.iter().zip(e_ref))
        {
            let x = (gr - g) * t;
            *e = er * exp_small(x);
            far |= !x.abs().le(&SERIES_SPAN); // NaN (no reference yet) is far
        }
        if far {
            for k in 0..n {
                let (j, g) = (from + k, self.g[k]);
                if !((self.g_ref[j] - g) * self.tau[j]).abs().le(&SERIES_SPAN) {
                    self.e[k] = self.refresh(j, g);
                }
            }
        }
        let (mut u, mut w) = (u_at[from], w_at[from]);
        let rho = &mut self.rho[from..from + n];
        let grow = &self.grow[from..from + n];
        let (u_out, w_out) = (
            &mut u_at[from + 1..=from + n],
            &mut w_at[from + 1..=from + n],
        );
        let (g, ig, e) = (&self.g[..n], &self.ig[..n], &self.e[..n]);
        // the chain: u into each interval kept in `rho` for the ratio's pass
        for k in 0..n {
            let (u1, w1) = rotate((g[k], ig[k], e[k]), u, w);
            rho[k] = u;
            u_out[k] = u1;
            w_out[k] = w1;
            (u, w) = (u1, w1);
            if !(u1.abs() <= RESCALE && u1.abs() >= 1.0 / RESCALE) {
                (u, w) = rescale(u1, w1);
            }
        }
        for (((r, &gr), &ek), &u1) in rho.iter_mut().zip(grow).zip(e).zip(u_out.iter()) {
            *r = gr * ek * *r / u1;
        }
        w / u
    }

    /// g and 1 / g of each interval for pressures `p` at its ends and radial modulus `modulus`.
    #[inline(always)]
    fn moduli(&mut self, e_t: f64, p: &[f64], modulus: impl Fn(f64) -> f64) {
        let inv_et = 1.0 / e_t;
        let n = p.len() - 1;
        for (((g, ig), &p0), &p1) in self.g[..n]
            .iter_mut()
            .zip(&mut self.ig[..n])
            .zip(&p[..n])
            .zip(&p[1..])
        {
            let er = modulus(0.5 * (p0 + p1));
            let gk = (e_t / er).sqrt();
            *g = gk;
            *ig = gk * (er * inv_et);
        }
    }

    /// Merge intervals `b..e` into one from radius `r_b` to `r_e` (m) with ratio `rho`.
    pub fn merge(&mut self, b: usize, e: usize, (r_b, r_e): (f64, f64), rho: f64) {
        self.tau[b] = (r_e / r_b).ln();
        self.grow[b] = r_e / r_b;
        self.rho[b] = rho;
        self.g_ref[b] = f64::NAN;
        self.e_ref[b] = 0.0;
        for v in [
            &mut self.tau,
            &mut self.grow,
            &mut self.rho,
            &mut self.g_ref,
            &mut self.e_ref,
        ] {
            v.drain(b + 1..e);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The series stays within 2 units in the last place of the library exponential over its
    /// span, and an element from a reference matches the Riccati form computed in full.
    #[test]
    fn series_factor_matches_the_exponential() {
        for i in -100..=100 {
            let x = SERIES_SPAN * f64::from(i) / 100.0;
            let (a, b) = (exp_small(x), x.exp());
            assert!((a - b).abs() <= 2.0 * f64::EPSILON * b, "{x}: {a} vs {b}");
        }
        let mut iv = Intervals::with_capacity(1);
        iv.push(0.01, 0.01f64.exp());
        iv.step(0, 30.0, (1.0, 0.9));
        for g in [30.0, 30.5, 29.2, 30.9] {
            let (u, w) = iv.step(0, g, (2.0, 1.4));
            let z = w / u;
            let (rho, z1) = element(g, 0.7, 0.01, 0.01f64.exp());
            assert!((iv.rho[0] / rho - 1.0).abs() < 8.0 * f64::EPSILON, "{g}");
            assert!((z / z1 - 1.0).abs() < 8.0 * f64::EPSILON, "{g}");
        }
    }

    /// A sweep equals the chain of Riccati elements, each in full, to a few units in the last
    /// place per element: over a pressure profile that rises to the core, on stacks from soft
    /// (g tau up to about 35 on the 7-node grid) to stiff, from a rigid and a soft core's z (z0
    /// above g there), again after the pressures move (the decay factors then come from their
    /// references), from the core and from a node above it. The build for this processor (four
    /// wide where it has AVX2) gives the generic build's bits.
    #[test]
    fn a_sweep_matches_the_riccati_chain() {
        for (nodes, span) in [(401, 2.3), (41, 2.3), (2001, 0.7), (7, 1.5)] {
            let tau = span / (nodes - 1) as f64;
            let mut iv = Intervals::with_capacity(nodes);
            for _ in 1..nodes {
                iv.push(tau, tau.exp());
            }
            for (z0, scale) in [(0.3, 1.0), (40.0, 1.0), (0.3, 1.01), (0.3, 3.0)] {
                for from in [0, 3] {
                    sweep_against_riccati(&mut iv, (z0, 2.5), (scale, from));
                }
            }
        }
    }

    /// A sweep whose (u, w) leaves [1e-150, 1e150] is rescaled, and gives the same ratios and z
    /// as from (1, z0): from u just above 1e-150 on a rigid core (u falls at the first interval)
    /// and just below 1e150 on a soft core with z0 above g (u rises).
    #[test]
    fn a_sweep_is_rescaled_where_u_leaves_its_range() {
        for (z0, u0) in [(0.3, 1.01e-150), (40.0, 0.99e150)] {
            let tau = 2.3 / 400.0;
            let mut iv = Intervals::with_capacity(401);
            for _ in 1..401 {
                iv.push(tau, tau.exp());
            }
            let u = sweep_against_riccati(&mut iv, (z0, u0), (1.0, 0));
            let out = |x: f64| !(1e-150..=1e150).contains(&x.abs());
            assert!(out(u[1]), "{z0}: u[1] = {}", u[1]);
            assert!(u[2..].iter().all(|&x| (1e-3..1e3).contains(&x)), "{z0}");
        }
    }

    /// Sweep `iv` from node `from`, where (u, w) = (u0, z0 u0) (`u0` = 2.5: not normalised),
    /// over the pressures 2e5 `scale` (1 - j / n)^2 Pa on a Pfeiffer stack (K1 = 5 kPa, K2 = 50,
    /// E_t = 5 GPa), and check it against the Riccati chain and the generic build; returns u.
    fn sweep_against_riccati(
        iv: &mut Intervals,
        (z0, u0): (f64, f64),
        (scale, from): (f64, usize),
    ) -> Vec<f64> {
        let (k1, k2, e_t) = (5e3, 50.0, 5e9);
        let stack = Stack::Pfeiffer { k1_pa: k1, k2 };
        let nodes = iv.tau.len() + 1;
        let p: Vec<f64> = (0..nodes)
            .map(|j| scale * 2e5 * (1.0 - j as f64 / nodes as f64).powi(2))
            .collect();
        let (mut u, mut w) = (vec![0.0; nodes], vec![0.0; nodes]);
        (u[from], w[from]) = (u0, z0 * u0);
        // the generic build, from the same state, for the bits below
        let (mut any, mut ua, mut wa) = (iv.clone(), u.clone(), w.clone());
        let top = iv.sweep((e_t, stack), from, &p[from..], (&mut u, &mut w));
        let top_any = any.sweep_any((e_t, stack), from, &p[from..], (&mut ua, &mut wa));
        assert_eq!(top.to_bits(), top_any.to_bits());
        for j in from..nodes - 1 {
            assert_eq!(iv.rho[j].to_bits(), any.rho[j].to_bits());
            assert_eq!(u[j + 1].to_bits(), ua[j + 1].to_bits());
            assert_eq!(w[j + 1].to_bits(), wa[j + 1].to_bits());
        }
        let z: Vec<f64> = u.iter().zip(&w).map(|(u, w)| w / u).collect();
        let mut zr = z0;
        for j in from..nodes - 1 {
            let g = (e_t / stack.modulus(0.5 * (p[j] + p[j + 1]))).sqrt();
            let tau = iv.tau[j];
            let (rho, z1) = element(g, zr, tau, tau.exp());
            let tol = 1e-13 * (1.0 + j as f64).sqrt();
            assert!((iv.rho[j] / rho - 1.0).abs() < tol, "{nodes} {j}: rho");
            assert!((z[j + 1] / z1 - 1.0).abs() < tol, "{nodes} {j}: z");
            zr = z1;
        }
        assert_eq!(top, z[nodes - 1]);
        u
    }
}
