//! Small numerical kernels shared by the models and views: the tridiagonal (Thomas) solver, the
//! width-weighted mean (the one definition of "the mean lane"), the spread (largest minus
//! smallest), the time step closest to a given time, the complementary error function and the
//! standard normal upper quantile.

use crate::pack::{Finite, Real};

/// Solve a tridiagonal system in place by the Thomas algorithm.
///
/// `a` is the sub-diagonal (`a[0]` unused), `b` the diagonal, `c` the super-diagonal (`c[n-1]`
/// unused), `d` the right-hand side; the solution overwrites `d`. `scratch` must have length n.
/// Returns `false` if a pivot vanishes (the caller reports a solver failure).
///
/// ```
/// // 2x = 2, x + 2y = 5  ->  x = 1, y = 2
/// let (a, b, c) = ([0.0, 1.0], [2.0, 2.0], [0.0, 0.0]);
/// let mut d = [2.0, 5.0];
/// let mut s = [0.0; 2];
/// assert!(rollsleuth::numeric::thomas(&a, &b, &c, &mut d, &mut s));
/// assert!((d[1] - 2.0).abs() < 1e-12);
/// ```
pub fn thomas(a: &[f64], b: &[f64], c: &[f64], d: &mut [f64], scratch: &mut [f64]) -> bool {
    thomas_of(a, b, c, d, scratch) == 0
}

/// [`thomas`] on numbers of the storage kernel ([`Real`]: one system, or a pack of systems
/// solved side by side): returns the members whose solve failed, as bits (0: all solved). Each
/// member's solution has the bits of its own solve.
#[inline(always)]
pub fn thomas_of<T: Real>(a: &[T], b: &[T], c: &[T], d: &mut [T], scratch: &mut [T]) -> u32 {
    let n = d.len();
    if n < 8 {
        return thomas_one_way(a, b, c, d, scratch);
    }
    // Eliminate from both ends towards row m at once (a twisted factorisation; Meurant 1992,
    // from memory): two independent chains of dependent divisions, which the processor runs side
    // by side, instead of one chain twice as long. Rows above m end as x_i = y_i - u_i x_(i+1),
    // rows below as x_i = z_i - v_i x_(i-1); u, v go in `scratch`, y, z in `d`. A vanishing
    // pivot marks its member failed; the others go on (no member reads another).
    let m = n / 2;
    let zero = T::splat(0.0);
    let mut failed = Pivots::new();
    let (mut y, mut u) = eliminate(b[0], zero, c[0], d[0], (zero, zero), &mut failed);
    let (mut z, mut v) = eliminate(
        b[n - 1],
        zero,
        a[n - 1],
        d[n - 1],
        (zero, zero),
        &mut failed,
    );
    (d[0], scratch[0], d[n - 1], scratch[n - 1]) = (y, u, z, v);
    // the top takes rows 1..m-1, the bottom rows n-2 down to m+1 (one row fewer when n is even)
    for i in 1..m {
        (y, u) = eliminate(b[i], a[i], c[i], d[i], (y, u), &mut failed);
        (d[i], scratch[i]) = (y, u);
        let j = n - 1 - i;
        if j > m {
            (z, v) = eliminate(b[j], c[j], a[j], d[j], (z, v), &mut failed);
            (d[j], scratch[j]) = (z, v);
        }
    }
    // rows 0..m-1 from the top and m+1..n-1 from the bottom are eliminated (n >= 8)
    let pivot = b[m] - a[m] * scratch[m - 1] - c[m] * scratch[m + 1];
    failed.see(pivot);
    let xm = (d[m] - a[m] * d[m - 1] - c[m] * d[m + 1]) / pivot;
    d[m] = xm;
    let (mut up, mut down) = (xm, xm);
    for k in 1..n {
        let (i, j) = (m.wrapping_sub(k), m + k);
        let top = k <= m;
        let bottom = j < n;
        if !top && !bottom {
            break;
        }
        if top {
            up = d[i] - scratch[i] * up;
            d[i] = up;
        }
        if bottom {
            down = d[j] - scratch[j] * down;
            d[j] = down;
        }
    }
    failed.failed() | not_finite(d)
}

/// The members not finite in some entry of `d`, as bits.
fn not_finite<T: Real>(d: &[T]) -> u32 {
    let mut f = Finite::new();
    for &x in d {
        f.see(x);
    }
    f.failed()
}

/// The pivots of an elimination, watched for one that vanishes (per member): below 1e-300 in
/// size, or not finite.
struct Pivots<T> {
    smallest: T,
    finite: Finite<T>,
}

impl<T: Real> Pivots<T> {
    #[inline(always)]
    fn new() -> Self {
        Pivots {
            smallest: T::splat(f64::INFINITY),
            finite: Finite::new(),
        }
    }
    #[inline(always)]
    fn see(&mut self, p: T) {
        self.smallest = self.smallest.min_t(p.abs());
        self.finite.see(p);
    }
    /// The members with a pivot that vanishes, as bits.
    #[inline(always)]
    fn failed(self) -> u32 {
        self.smallest.which(|v| v < 1e-300) | self.finite.failed()
    }
}

/// One row of an elimination that carries (solution part, factor) = (y, u) from its neighbour:
/// pivot beta = `diag` - `near` u, then ((`rhs` - `near` y) / beta, `far` / beta); a member
/// whose pivot vanishes (below 1e-300 or not finite) is marked in `failed`. From the top, near
/// is the sub-diagonal and far the super-diagonal; from the bottom the other way round.
#[inline(always)]
fn eliminate<T: Real>(
    diag: T,
    near: T,
    far: T,
    rhs: T,
    (y, u): (T, T),
    failed: &mut Pivots<T>,
) -> (T, T) {
    let beta = diag - near * u;
    failed.see(beta);
    ((rhs - near * y) / beta, far / beta)
}

/// The Thomas algorithm eliminating from the top only ([`thomas_of`] for small systems).
fn thomas_one_way<T: Real>(a: &[T], b: &[T], c: &[T], d: &mut [T], scratch: &mut [T]) -> u32 {
    let n = d.len();
    if n == 0 {
        return 0;
    }
    // the last row solved is carried in registers, not read back from memory: each row's
    // dependence on the one before is then only the arithmetic
    let zero = T::splat(0.0);
    let mut failed = Pivots::new();
    let mut row = (zero, zero);
    for i in 0..n {
        let near = if i == 0 { zero } else { a[i] };
        row = eliminate(b[i], near, c[i], d[i], row, &mut failed);
        (d[i], scratch[i]) = row;
    }
    // x_i = y_i - u_i x_(i+1)
    let mut prev = row.0;
    for i in (0..n - 1).rev() {
        prev = d[i] - scratch[i] * prev;
        d[i] = prev;
    }
    failed.failed() | not_finite(d)
}

/// Weighted mean of `v` with weights `w` (for lanes: their widths, which makes it the mean lane).
/// Empty input or zero total weight gives 0.
///
/// ```
/// assert_eq!(rollsleuth::numeric::weighted_mean(&[1.0, 4.0], &[3.0, 1.0]), 1.75);
/// ```
pub fn weighted_mean(v: &[f64], w: &[f64]) -> f64 {
    let sw: f64 = w.iter().take(v.len()).sum();
    if sw == 0.0 {
        return 0.0;
    }
    v.iter().zip(w).map(|(a, b)| a * b).sum::<f64>() / sw
}

/// Integral over the width of the absolute deviation of `v` from its weighted mean: the sum of
/// `w_i |v_i - m|` with `m` the [`weighted_mean`] (for lanes, `w` their widths in m: the unit of
/// `v` times metres), so a lane counts for its width, not as one of the lanes. 0 for no input.
///
/// ```
/// // a 25 mm strip at 1 beside a 75 mm lane at 0: mean 0.25; 0.025 x 0.75 + 0.075 x 0.25
/// let d = rollsleuth::numeric::weighted_abs_deviation(&[1.0, 0.0], &[0.025, 0.075]);
/// assert!((d - 0.0375).abs() < 1e-15);
/// ```
pub fn weighted_abs_deviation(v: &[f64], w: &[f64]) -> f64 {
    let m = weighted_mean(v, w);
    v.iter().zip(w).map(|(a, b)| b * (a - m).abs()).sum()
}

/// The window of a fixed width where a piecewise-constant profile is highest on average.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct WindowMean {
    /// Width-weighted mean of the profile over the window (the profile's unit).
    pub mean: f64,
    /// The window's ends, m.
    pub from_m: f64,
    pub to_m: f64,
}

/// The highest running width-weighted mean of `v` over a window `window_m` wide (m), the lanes
/// given by their `spans` (left, right edges, m; sorted, not overlapping): each lane weighs by
/// the part of the window it covers. The window slides over the lanes' extent; one wider than
/// that extent is the whole extent, and inside a lane wider than the window it reads that lane.
/// The window's mean is piecewise linear in its start, so the highest lies where an end of the
/// window meets a lane edge; those starts are tried in order and the first highest kept. `None`
/// without lanes or for a window not above zero.
///
/// ```
/// use rollsleuth::numeric::running_mean_max;
/// // lanes 0-0.1, 0.1-0.2, 0.2-0.4 at 1, 3, 2: a 0.15 m window from 0.1 to 0.25 reads
/// // (3 x 0.1 + 2 x 0.05) / 0.15 = 2.667
/// let m = running_mean_max(&[(0.0, 0.1), (0.1, 0.2), (0.2, 0.4)], &[1.0, 3.0, 2.0], 0.15).unwrap();
/// assert!((m.mean - 8.0 / 3.0).abs() < 1e-12 && (m.from_m - 0.1).abs() < 1e-12);
/// ```
pub fn running_mean_max(spans: &[(f64, f64)], v: &[f64], window_m: f64) -> Option<WindowMean> {
    let (first, last) = (spans.first()?.0, spans.last()?.1);
    if window_m.is_nan() || window_m <= 0.0 || v.len() != spans.len() {
        return None;
    }
    let w = window_m.min(last - first);
    let mean_from = |x0: f64| {
        let x1 = x0 + w;
        let (mut sum, mut cover) = (0.0, 0.0);
        for (&(a, b), &val) in spans.iter().zip(v) {
            let part = (b.min(x1) - a.max(x0)).max(0.0);
            sum += val * part;
            cover += part;
        }
        if cover > 0.0 {
            sum / cover
        } else {
            f64::NEG_INFINITY
        }
    };
    let mut starts: Vec<f64> = spans
        .iter()
        .flat_map(|&(a, b)| [a, b, a - w, b - w])
        .map(|x| x.clamp(first, last - w))
        .collect();
    starts.sort_by(f64::total_cmp);
    starts.dedup();
    let mut best: Option<WindowMean> = None;
    for x0 in starts {
        let mean = mean_from(x0);
        if best.is_none_or(|b| mean > b.mean || (mean.is_nan() && !b.mean.is_nan())) {
            best = Some(WindowMean {
                mean,
                from_m: x0,
                to_m: x0 + w,
            });
        }
    }
    best
}

/// Largest minus smallest value; 0 for no values.
///
/// ```
/// assert_eq!(rollsleuth::numeric::spread(&[2.0, -1.0, 0.5]), 3.0);
/// ```
pub fn spread(v: &[f64]) -> f64 {
    if v.is_empty() {
        return 0.0;
    }
    let hi = v.iter().cloned().fold(f64::NEG_INFINITY, f64::max);
    let lo = v.iter().cloned().fold(f64::INFINITY, f64::min);
    hi - lo
}

/// Index of the time in `times` closest to `t` (same unit); the first of equally close ones, 0
/// for no times.
///
/// ```
/// assert_eq!(rollsleuth::numeric::closest_index(&[0.0, 10.0, 20.0], 12.0), 1);
/// ```
pub fn closest_index(times: &[f64], t: f64) -> usize {
    times
        .iter()
        .enumerate()
        .min_by(|a, b| (a.1 - t).abs().total_cmp(&(b.1 - t).abs()))
        .map(|(i, _)| i)
        .unwrap_or(0)
}

/// Complementary error function, |error| < 1.2e-7 (Numerical Recipes' Chebyshev fit `erfcc`,
/// Press et al. 1992, section 6.2).
pub fn erfc(x: f64) -> f64 {
    let z = x.abs();
    let t = 1.0 / (1.0 + 0.5 * z);
    let poly = -z * z - 1.265_512_23
        + t * (1.000_023_68
            + t * (0.374_091_96
                + t * (0.096_784_18
                    + t * (-0.186_288_06
                        + t * (0.278_868_07
                            + t * (-1.135_203_98
                                + t * (1.488_515_87 + t * (-0.822_152_23 + t * 0.170_872_77))))))));
    let r = t * poly.exp();
    if x >= 0.0 {
        r
    } else {
        2.0 - r
    }
}

/// The standard normal upper quantile: z with P(Z > z) = `p` (0 < p < 1), by bisection on
/// erfc (P(Z > z) = erfc(z / sqrt 2) / 2), to 1e-10 in z.
pub fn normal_upper_quantile(p: f64) -> f64 {
    let p = p.clamp(1e-15, 1.0 - 1e-15);
    let (mut lo, mut hi) = (-9.0_f64, 9.0_f64);
    for _ in 0..80 {
        let mid = 0.5 * (lo + hi);
        if 0.5 * erfc(mid / std::f64::consts::SQRT_2) > p {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn thomas_matches_dense_solution() {
        // [4 1 0; 1 4 1; 0 1 4] x = [5 6 5] -> x = [1 1 1]
        let a = [0.0, 1.0, 1.0];
        let b = [4.0, 4.0, 4.0];
        let c = [1.0, 1.0, 0.0];
        let mut d = [5.0, 6.0, 5.0];
        let mut s = [0.0; 3];
        assert!(thomas(&a, &b, &c, &mut d, &mut s));
        for x in d {
            assert_relative_eq!(x, 1.0, epsilon = 1e-12);
        }
    }

    /// Both ends of the twisted elimination against Gaussian elimination with partial pivoting
    /// of the dense matrix (Golub and Van Loan 2013, algorithm 3.4.1), for even and odd sizes.
    #[test]
    fn thomas_matches_dense_elimination_on_larger_systems() {
        for n in [8usize, 9, 17, 64, 65] {
            let a: Vec<f64> = (0..n)
                .map(|i| if i == 0 { 0.0 } else { -1.0 - 0.01 * i as f64 })
                .collect();
            let c: Vec<f64> = (0..n)
                .map(|i| {
                    if i + 1 == n {
                        0.0
                    } else {
                        -0.5 - 0.02 * i as f64
                    }
                })
                .collect();
            let b: Vec<f64> = (0..n).map(|i| 3.0 + (i as f64).sin()).collect();
            let rhs: Vec<f64> = (0..n)
                .map(|i| (0.3 * i as f64).cos() + 0.1 * i as f64)
                .collect();
            // dense copy, solved by elimination with partial pivoting
            let mut m = vec![vec![0.0; n + 1]; n];
            for i in 0..n {
                m[i][i] = b[i];
                if i > 0 {
                    m[i][i - 1] = a[i];
                }
                if i + 1 < n {
                    m[i][i + 1] = c[i];
                }
                m[i][n] = rhs[i];
            }
            for k in 0..n {
                let p = (k..n)
                    .max_by(|&x, &y| m[x][k].abs().total_cmp(&m[y][k].abs()))
                    .unwrap();
                m.swap(k, p);
                let (head, tail) = m.split_at_mut(k + 1);
                let pivot_row = &head[k];
                for row in tail.iter_mut() {
                    let f = row[k] / pivot_row[k];
                    for (x, p) in row[k..].iter_mut().zip(&pivot_row[k..]) {
                        *x -= f * p;
                    }
                }
            }
            let mut x = vec![0.0; n];
            for i in (0..n).rev() {
                let s: f64 = (i + 1..n).map(|j| m[i][j] * x[j]).sum();
                x[i] = (m[i][n] - s) / m[i][i];
            }
            let mut d = rhs.clone();
            let mut s = vec![0.0; n];
            assert!(thomas(&a, &b, &c, &mut d, &mut s));
            for (got, want) in d.iter().zip(&x) {
                assert_relative_eq!(*got, *want, max_relative = 1e-12);
            }
        }
    }

    #[test]
    fn thomas_reports_singular() {
        let mut d = [1.0];
        assert!(!thomas(&[0.0], &[0.0], &[0.0], &mut d, &mut [0.0]));
        // the twisted elimination of a larger system (a zero pivot in the middle)
        let mut b = [2.0; 12];
        b[6] = 0.0;
        let mut d = [1.0; 12];
        assert!(!thomas(&[0.0; 12], &b, &[0.0; 12], &mut d, &mut [0.0; 12]));
    }

    /// Upper quantiles of the standard normal against Abramowitz and Stegun (1964) table 26.5:
    /// z(0.05) = 1.644854, z(0.025) = 1.959964, z(0.001) = 3.090232; the Chebyshev erfc limits
    /// the agreement to about 1e-6.
    #[test]
    fn normal_upper_quantiles_match_the_table() {
        for (p, z) in [
            (0.05, 1.644_854),
            (0.025, 1.959_964),
            (0.001, 3.090_232),
            (0.5, 0.0),
        ] {
            assert!((normal_upper_quantile(p) - z).abs() < 2e-6, "{p}");
        }
    }

    /// The running mean against a hand computation (the mean of a piecewise-constant profile
    /// over a window is the integral over the window divided by its width; each lane's part is
    /// its overlap). Lanes 0-0.2 at 1, 0.2-0.3 at 5, 0.3-0.35 at 9, 0.35-1.0 at 2; window 0.1:
    /// - from 0.25: (5 x 0.05 + 9 x 0.05) / 0.1 = 7.0 (the narrow 9 alone cannot fill it);
    /// - from 0.3: (9 x 0.05 + 2 x 0.05) / 0.1 = 5.5; from 0.2: 5.0. The highest is 7.0.
    ///
    /// A window wider than the roll is the whole width: (0.2 + 0.5 + 0.45 + 1.3) / 1.0 = 2.45.
    /// A lane wider than the window reads that lane: two lanes 0-0.5 at 4 and 0.5-1 at 1 with
    /// a 0.1 window give 4 from 0 to 0.1.
    #[test]
    fn the_running_mean_is_the_overlap_weighted_mean_of_the_best_window() {
        let spans = [(0.0, 0.2), (0.2, 0.3), (0.3, 0.35), (0.35, 1.0)];
        let v = [1.0, 5.0, 9.0, 2.0];
        let m = running_mean_max(&spans, &v, 0.1).unwrap();
        assert_relative_eq!(m.mean, 7.0, max_relative = 1e-12);
        assert_relative_eq!(m.from_m, 0.25, epsilon = 1e-12);
        assert_relative_eq!(m.to_m, 0.35, epsilon = 1e-12);
        let all = running_mean_max(&spans, &v, 5.0).unwrap();
        assert_relative_eq!(all.mean, 2.45, max_relative = 1e-12);
        assert_eq!((all.from_m, all.to_m), (0.0, 1.0));
        let wide = running_mean_max(&[(0.0, 0.5), (0.5, 1.0)], &[4.0, 1.0], 0.1).unwrap();
        assert_eq!((wide.mean, wide.from_m), (4.0, 0.0));
        // the same profile cut into finer lanes gives the same window
        let fine = [
            (0.0, 0.1),
            (0.1, 0.2),
            (0.2, 0.25),
            (0.25, 0.3),
            (0.3, 0.35),
            (0.35, 1.0),
        ];
        let fv = [1.0, 1.0, 5.0, 5.0, 9.0, 2.0];
        let f = running_mean_max(&fine, &fv, 0.1).unwrap();
        assert_relative_eq!(f.mean, 7.0, max_relative = 1e-12);
        assert!(running_mean_max(&[], &[], 0.1).is_none());
        assert!(running_mean_max(&spans, &v, 0.0).is_none());
        let nan = running_mean_max(&spans, &[1.0, f64::NAN, 1.0, 1.0], 0.1).unwrap();
        assert!(nan.mean.is_nan());
    }
}
