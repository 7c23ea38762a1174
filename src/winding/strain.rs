//! The stack's compressive strain as the pressure on it changes, for the accretion
//! ([`super::hakiel`]): by its change since it was last brought up to date, once per grid step,
//! in a pass over the nodes the step loaded.

use crate::case::Stack;

/// Change of the stack's compressive strain from pressure `p0` to `p1` (Pa). For the Pfeiffer
/// law it is ln(1 + x) / K2 with x = (p1 - p0) / (K1 + p0); small steps (|x| < 1e-3, most of
/// them deep in the roll) take the series to x^5 (remainder below 2e-16 relative) instead of a
/// logarithm.
#[cfg(test)]
fn change(stack: &Stack, p0: f64, p1: f64) -> f64 {
    let (p0, p1) = (p0.max(0.0), p1.max(0.0));
    match *stack {
        Stack::Pfeiffer { k1_pa, k2 } => {
            let x = (p1 - p0) / (k1_pa + p0);
            let l = if x.abs() < SERIES_SPAN {
                ln_1p_series(x)
            } else {
                ln_1p_far(x)
            };
            l * (1.0 / k2)
        }
        Stack::Constant { .. } => stack.strain(p1) - stack.strain(p0),
    }
}

/// |x| below which ln(1 + x) is summed as its series to x^5.
const SERIES_SPAN: f64 = 1e-3;

/// ln(1 + x) for |x| < [`SERIES_SPAN`]: the series to x^5.
#[inline(always)]
fn ln_1p_series(x: f64) -> f64 {
    x * (1.0 - x * (0.5 - x * (1.0 / 3.0 - x * (0.25 - 0.2 * x))))
}

/// ln(1 + x) beyond the series' span: [`ln_1p_near`] to |x| = 0.1, else the library's.
#[inline]
fn ln_1p_far(x: f64) -> f64 {
    if x.abs() < 0.1 {
        ln_1p_near(x)
    } else {
        x.ln_1p()
    }
}

/// ln(1 + x) for |x| < 0.1 as 2 atanh(u), u = x / (2 + x) (|u| < 0.053), by its series to
/// u^13 (remainder below 1e-19 relative): no library call for the pressure changes of the deep
/// roll, whose relative size per step is about one over the number of steps wound since.
#[inline]
fn ln_1p_near(x: f64) -> f64 {
    let u = x / (2.0 + x);
    let u2 = u * u;
    let tail = 1.0 / 9.0 + u2 * (1.0 / 11.0 + u2 * (1.0 / 13.0));
    2.0 * u * (1.0 + u2 * (1.0 / 3.0 + u2 * (1.0 / 5.0 + u2 * (1.0 / 7.0 + u2 * tail))))
}

/// The strain changes `de` of nodes whose pressure was `was` (Pa) and whose radial stress is
/// now `sr` (Pa, compression negative), each as `change` gives it; `was` becomes the present
/// pressure -`sr`. For the Pfeiffer law x is found for every node in one pass (which
/// vectorises), then the logarithm: by its series alone, in a pass that vectorises too, when no
/// node is beyond the series' span.
/// Where the processor has AVX2 the passes run four wide, to the same bits.
pub(super) fn changes(stack: &Stack, was: &mut [f64], sr: &[f64], de: &mut [f64]) {
    #[cfg(target_arch = "x86_64")]
    if crate::pack::avx2() {
        // SAFETY: `avx2()` is true only where the processor has AVX2.
        return unsafe { changes_avx2(stack, was, sr, de) };
    }
    changes_any(stack, was, sr, de);
}

/// [`changes`] compiled for AVX2.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
fn changes_avx2(stack: &Stack, was: &mut [f64], sr: &[f64], de: &mut [f64]) {
    changes_any(stack, was, sr, de);
}

/// [`changes`] for any processor.
#[inline(always)]
fn changes_any(stack: &Stack, was: &mut [f64], sr: &[f64], de: &mut [f64]) {
    match *stack {
        Stack::Pfeiffer { k1_pa, k2 } => {
            let inv_k2 = 1.0 / k2;
            let mut far = false;
            for ((d, &p0), &s) in de.iter_mut().zip(&*was).zip(sr) {
                let (p0, p1) = (p0.max(0.0), (-s).max(0.0));
                let x = (p1 - p0) / (k1_pa + p0);
                *d = x;
                far |= !x.abs().lt(&SERIES_SPAN);
            }
            if far {
                for d in de.iter_mut() {
                    let x = *d;
                    let l = if x.abs() < SERIES_SPAN {
                        ln_1p_series(x)
                    } else {
                        ln_1p_far(x)
                    };
                    *d = l * inv_k2;
                }
            } else {
                for d in de.iter_mut() {
                    *d = ln_1p_series(*d) * inv_k2;
                }
            }
        }
        Stack::Constant { .. } => {
            for ((d, &p0), &s) in de.iter_mut().zip(&*was).zip(sr) {
                *d = stack.strain(-s) - stack.strain(p0);
            }
        }
    }
    for (p, &s) in was.iter_mut().zip(sr) {
        *p = -s;
    }
}

/// The sum over nodes `lo..` of the grid `r` (m) of each strain change `de` (one per node from
/// `lo`) times its trapezoid weight's double, r[j + 1] - r[j - 1] (the span of its neighbours;
/// at the ends, of the node itself and its one neighbour), m. The interior is summed in four
/// running sums, which vectorise.
pub(super) fn weighted(de: &[f64], r: &[f64], lo: usize) -> f64 {
    let n = r.len();
    let span = |j: usize| r[(j + 1).min(n - 1)] - r[j.saturating_sub(1)];
    // interior nodes a..b (both neighbours on the grid), the ends one by one
    let (a, b) = (lo.max(1), n.saturating_sub(1));
    let (mut acc, mut tail) = ([0.0f64; 4], 0.0);
    if a >= b {
        for j in lo..n {
            tail += de[j - lo] * span(j);
        }
        return tail;
    }
    let inner = de[a - lo..b - lo].chunks_exact(4);
    let (hi, below) = (
        r[a + 1..b + 1].chunks_exact(4),
        r[a - 1..b - 1].chunks_exact(4),
    );
    let rest = inner.remainder().len();
    for ((d, h), l) in inner.zip(hi).zip(below) {
        for k in 0..4 {
            acc[k] += d[k] * (h[k] - l[k]);
        }
    }
    for j in (b - rest..b).chain(lo..a).chain(b..n) {
        tail += de[j - lo] * span(j);
    }
    (acc[0] + acc[1]) + (acc[2] + acc[3]) + tail
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The series agrees with the library's ln_1p to within 2 units in the last place over its
    /// span.
    #[test]
    fn near_logarithm_matches_the_library() {
        for i in -1000..=1000 {
            let x = 0.0999 * f64::from(i) / 1000.0;
            let (a, b) = (ln_1p_near(x), x.ln_1p());
            assert!(
                (a - b).abs() <= 2.0 * f64::EPSILON * b.abs(),
                "{x}: {a} vs {b}"
            );
        }
    }

    /// The pass gives each node what the change from its pressure alone gives, to the bit, for
    /// changes inside and beyond the series' span, negative pressures (tension) included; and
    /// the strain changes sum to the strain at the end (Pfeiffer 1966: ln(1 + P / K1) / K2). The
    /// build for this processor gives the generic build's bits.
    #[test]
    fn the_pass_matches_each_node_and_sums_to_the_law() {
        let stack = Stack::Pfeiffer {
            k1_pa: 5e3,
            k2: 50.0,
        };
        let was0 = [0.0, 1e3, 2e5, 2e5, 7e4, 50.0, -3e3, 1e6];
        let sr = [
            -1e3,
            -1.0005e3,
            -2.00001e5,
            -1.9e5,
            -9e4,
            4e2,
            -1e3,
            -1.0000001e6,
        ];
        let mut was = was0;
        let mut de = [0.0; 8];
        changes(&stack, &mut was, &sr, &mut de);
        let (mut was_any, mut de_any) = (was0, [0.0; 8]);
        changes_any(&stack, &mut was_any, &sr, &mut de_any);
        for k in 0..8 {
            assert_eq!(de[k].to_bits(), de_any[k].to_bits(), "{k}");
            assert_eq!(
                de[k].to_bits(),
                change(&stack, was0[k], -sr[k]).to_bits(),
                "{k}"
            );
            assert_eq!(was[k], -sr[k]);
        }
        let mut p = [0.0];
        let mut total = 0.0;
        for i in 1..=2000 {
            let s = [-(i as f64) * 100.0];
            let mut d = [0.0];
            changes(&stack, &mut p, &s, &mut d);
            total += d[0];
        }
        let law = (1.0 + 2e5 / 5e3f64).ln() / 50.0;
        assert!((total / law - 1.0).abs() < 1e-12, "{total} vs {law}");
    }

    /// On a constant radial modulus the change is the difference of Hooke's strains P / E_r
    /// (zero in tension), in both builds to the bit.
    #[test]
    fn a_constant_stack_changes_by_hookes_law() {
        let e_r = 2e7;
        let stack = Stack::Constant {
            radial_modulus_pa: e_r,
        };
        let was0 = [0.0, 1e3, 2e5, -5e2];
        let sr = [-1e3, -3e3, -1e5, 1e3];
        let (mut was, mut de) = (was0, [0.0; 4]);
        changes(&stack, &mut was, &sr, &mut de);
        let (mut was_any, mut de_any) = (was0, [0.0; 4]);
        changes_any(&stack, &mut was_any, &sr, &mut de_any);
        for k in 0..4 {
            let want = (-sr[k]).max(0.0) / e_r - was0[k].max(0.0) / e_r;
            assert!((de[k] - want).abs() <= 1e-18, "{k}: {} vs {want}", de[k]);
            assert_eq!(de[k].to_bits(), de_any[k].to_bits(), "{k}");
            assert_eq!(was[k], -sr[k]);
        }
    }

    /// The weighted sum equals the plain sum of change times neighbour span node by node (to
    /// rounding), for every start `lo` and grid length, ends included.
    #[test]
    fn the_weighted_sum_is_the_trapezoid_sum() {
        for n in 1..20 {
            let r: Vec<f64> = (0..n).map(|j| 0.1 * (0.05 * j as f64).exp()).collect();
            for lo in 0..n {
                let de: Vec<f64> = (lo..n).map(|j| 1e-4 * (1.0 + (j as f64).sin())).collect();
                let plain: f64 = (lo..n)
                    .map(|j| de[j - lo] * (r[(j + 1).min(n - 1)] - r[j.saturating_sub(1)]))
                    .sum();
                let got = weighted(&de, &r, lo);
                assert!(
                    (got - plain).abs() <= 1e-15 * plain.abs().max(1e-12),
                    "{n} {lo}"
                );
            }
        }
    }
}
