//! The exact element of the accretion ([`super::hakiel`]) and the active intervals it is
//! evaluated on.
//!
//! Each interval keeps the decay factor e^(-g tau) it last computed with a library exponential
//! and the g it was for. While g stays close to that reference (|g_ref - g| tau below
//! [`SERIES_SPAN`]), the factor is the reference times the Taylor series of e^x to x^6
//! (remainder below 2e-18 relative), which is what most intervals need at most steps: deep in
//! the roll a step changes the pressure, and so g, by a small fraction. The factor is then
//! within about one unit in the last place of the exponential's, and never drifts, since every
//! value is one series away from a reference computed in full.

/// Largest |x| = |g_ref - g| tau for which e^x is summed as a series.
const SERIES_SPAN: f64 = 1e-2;

/// One exact element (computed in full; the reference for [`Interval::ratio`]): from z at the
/// inner end of an interval of log-length `tau` (`grow` =
/// e^tau), return (phi_in / phi_out, z at the outer end).
#[cfg(test)]
fn element(g: f64, z0: f64, tau: f64, grow: f64) -> (f64, f64) {
    element_with(g, (-g * tau).exp(), z0, grow)
}

/// [`element`] with its decay factor `e1` = e^(-g tau) given.
#[inline]
fn element_with(g: f64, e1: f64, z0: f64, grow: f64) -> (f64, f64) {
    let a = g + z0;
    let d = a + (g - z0) * e1 * e1;
    let inv = 1.0 / d;
    (2.0 * g * e1 * grow * inv, 2.0 * g * a * inv - g)
}

/// e^x for |x| <= [`SERIES_SPAN`], Taylor series to x^6.
#[inline]
fn exp_small(x: f64) -> f64 {
    1.0 + x
        * (1.0
            + x * (0.5
                + x * (1.0 / 6.0 + x * (1.0 / 24.0 + x * (1.0 / 120.0 + x * (1.0 / 720.0))))))
}

/// An active interval of a lane (between consecutive active nodes): log-length, ratio of end
/// radii, the element ratio phi_in / phi_out last computed, and its reference g and decay
/// factor (g NaN: none yet).
#[derive(Debug, Clone, Copy)]
pub(super) struct Interval {
    pub tau: f64,
    pub grow: f64,
    pub rho: f64,
    g_ref: f64,
    e_ref: f64,
}

impl Interval {
    /// An interval of log-length `tau` and end-radius ratio `grow`.
    pub fn new(tau: f64, grow: f64) -> Self {
        Interval {
            tau,
            grow,
            rho: 0.0,
            g_ref: f64::NAN,
            e_ref: 0.0,
        }
    }

    /// The element at `g` from `z0`: stores the ratio, returns z at the outer end.
    #[inline]
    pub fn ratio(&mut self, g: f64, z0: f64) -> f64 {
        let x = (self.g_ref - g) * self.tau;
        let e1 = if x.abs() <= SERIES_SPAN {
            self.e_ref * exp_small(x)
        } else {
            let e = (-g * self.tau).exp();
            self.g_ref = g;
            self.e_ref = e;
            e
        };
        let (rho, z1) = element_with(g, e1, z0, self.grow);
        self.rho = rho;
        z1
    }
}

/// Merge intervals `b..e` of `iv` into one from radius `r_b` to `r_e` (m) with ratio `rho`.
pub(super) fn merge(iv: &mut Vec<Interval>, b: usize, e: usize, r_b: f64, r_e: f64, rho: f64) {
    let mut one = Interval::new((r_e / r_b).ln(), r_e / r_b);
    one.rho = rho;
    iv[b] = one;
    iv.drain(b + 1..e);
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The series stays within 2 units in the last place of the library exponential over its
    /// span, and a ratio from a reference matches a ratio computed in full.
    #[test]
    fn series_factor_matches_the_exponential() {
        for i in -100..=100 {
            let x = SERIES_SPAN * f64::from(i) / 100.0;
            let (a, b) = (exp_small(x), x.exp());
            assert!((a - b).abs() <= 2.0 * f64::EPSILON * b, "{x}: {a} vs {b}");
        }
        let mut iv = Interval::new(0.01, 0.01f64.exp());
        iv.ratio(30.0, 0.9);
        for g in [30.0, 30.5, 29.2, 30.9] {
            let z = iv.ratio(g, 0.7);
            let (rho, z1) = element(g, 0.7, 0.01, 0.01f64.exp());
            assert!((iv.rho / rho - 1.0).abs() < 4.0 * f64::EPSILON, "{g}");
            assert!((z / z1 - 1.0).abs() < 8.0 * f64::EPSILON, "{g}");
        }
    }
}
