//! Distributions the noise test needs: Student's t upper tail and quantile, from the regularised
//! incomplete beta function, and the chi-square upper tail (the profile test), from the
//! regularised incomplete gamma function. Pure functions, no state.
//!
//! A new noise deviation, predicted from `n` noise-only rolls with sample mean `m` and standard
//! deviation `s`, is distributed as `m + s sqrt(1 + 1/n) T` with `T` Student's t on `n - 1`
//! degrees of freedom (the normal prediction interval; Hahn and Meeker 1991, "Statistical
//! Intervals", section 4.4). With few rolls this is wider than the normal, as it must be.

/// Natural log of the gamma function for `x > 0` (Lanczos approximation, g = 7, nine
/// coefficients; Press et al. 2007, "Numerical Recipes", 3rd ed., section 6.1; relative error
/// below 1e-14 on the range used here).
pub fn ln_gamma(x: f64) -> f64 {
    const G: f64 = 7.0;
    const C: [f64; 9] = [
        0.999_999_999_999_809_9,
        676.520_368_121_885_1,
        -1_259.139_216_722_402_8,
        771.323_428_777_653_1,
        -176.615_029_162_140_6,
        12.507_343_278_686_905,
        -0.138_571_095_265_720_12,
        9.984_369_578_019_572e-6,
        1.505_632_735_149_311_6e-7,
    ];
    if x < 0.5 {
        // reflection: Gamma(x) Gamma(1 - x) = pi / sin(pi x)
        let pi = std::f64::consts::PI;
        return (pi / (pi * x).sin()).ln() - ln_gamma(1.0 - x);
    }
    let x = x - 1.0;
    let mut a = C[0];
    let t = x + G + 0.5;
    for (i, c) in C.iter().enumerate().skip(1) {
        a += c / (x + i as f64);
    }
    0.5 * (2.0 * std::f64::consts::PI).ln() + (x + 0.5) * t.ln() - t + a.ln()
}

/// Continued fraction of the incomplete beta function (modified Lentz; Press et al. 2007,
/// section 6.4, eq. 6.4.5).
fn beta_cf(a: f64, b: f64, x: f64) -> f64 {
    const TINY: f64 = 1e-300;
    let (qab, qap, qam) = (a + b, a + 1.0, a - 1.0);
    let mut c = 1.0;
    let mut d = 1.0 - qab * x / qap;
    if d.abs() < TINY {
        d = TINY;
    }
    d = 1.0 / d;
    let mut h = d;
    for m in 1..=300 {
        let m = m as f64;
        let m2 = 2.0 * m;
        let aa = m * (b - m) * x / ((qam + m2) * (a + m2));
        d = 1.0 + aa * d;
        d = if d.abs() < TINY { TINY } else { d };
        c = 1.0 + aa / c;
        c = if c.abs() < TINY { TINY } else { c };
        d = 1.0 / d;
        h *= d * c;
        let aa = -(a + m) * (qab + m) * x / ((a + m2) * (qap + m2));
        d = 1.0 + aa * d;
        d = if d.abs() < TINY { TINY } else { d };
        c = 1.0 + aa / c;
        c = if c.abs() < TINY { TINY } else { c };
        d = 1.0 / d;
        let del = d * c;
        h *= del;
        if (del - 1.0).abs() < 1e-15 {
            break;
        }
    }
    h
}

/// Regularised incomplete beta function I_x(a, b) for a, b > 0 and 0 <= x <= 1 (Press et al.
/// 2007, eq. 6.4.1 with the continued fraction on the side where it converges fast).
pub fn inc_beta(a: f64, b: f64, x: f64) -> f64 {
    if x <= 0.0 {
        return 0.0;
    }
    if x >= 1.0 {
        return 1.0;
    }
    let ln_front = ln_gamma(a + b) - ln_gamma(a) - ln_gamma(b) + a * x.ln() + b * (1.0 - x).ln();
    let front = ln_front.exp();
    if x < (a + 1.0) / (a + b + 2.0) {
        front * beta_cf(a, b, x) / a
    } else {
        1.0 - front * beta_cf(b, a, 1.0 - x) / b
    }
}

/// Upper tail P(T >= t) of Student's t with `nu` degrees of freedom (nu > 0):
/// 0.5 I_{nu/(nu+t^2)}(nu/2, 1/2) for t >= 0 (Abramowitz and Stegun 1964, 26.7.1 with 26.5.27).
pub fn student_t_sf(t: f64, nu: f64) -> f64 {
    if t.is_nan() {
        return f64::NAN;
    }
    let tail = 0.5 * inc_beta(0.5 * nu, 0.5, nu / (nu + t * t));
    if t >= 0.0 {
        tail
    } else {
        1.0 - tail
    }
}

/// Upper quantile of Student's t: the `t` with P(T >= t) = `p` (0 < p < 1), by bisection on
/// [`student_t_sf`] to a relative 1e-12 (deterministic: a fixed bracket and iteration count).
pub fn student_t_isf(p: f64, nu: f64) -> f64 {
    if p >= 0.5 {
        return -student_t_isf(1.0 - p, nu);
    }
    upper_point(p, |t| student_t_sf(t, nu), 1.0)
}

/// The `x` >= 0 with `sf(x)` = `p` for a decreasing tail `sf`, by bisection to a relative 1e-12:
/// the bracket [0, `hi`] doubled until it holds the point, then at most 200 halvings (a fixed
/// order of operations, deterministic).
fn upper_point(p: f64, sf: impl Fn(f64) -> f64, hi: f64) -> f64 {
    let (mut lo, mut hi) = (0.0_f64, hi);
    while sf(hi) > p && hi < 1e12 {
        lo = hi;
        hi *= 2.0;
    }
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if sf(mid) > p {
            lo = mid;
        } else {
            hi = mid;
        }
        if hi - lo <= 1e-12 * hi {
            break;
        }
    }
    0.5 * (lo + hi)
}

/// Regularised upper incomplete gamma function Q(a, x) = Gamma(a, x) / Gamma(a) for a > 0,
/// x >= 0: the series of P = 1 - Q below x = a + 1, the continued fraction of Q above (modified
/// Lentz; Press et al. 2007, "Numerical Recipes", 3rd ed., section 6.2, eqs. 6.2.5 and 6.2.7).
pub fn gamma_q(a: f64, x: f64) -> f64 {
    if x.is_nan() || a.is_nan() {
        return f64::NAN;
    }
    if x <= 0.0 {
        return 1.0;
    }
    if x == f64::INFINITY {
        return 0.0;
    }
    let front = (a * x.ln() - x - ln_gamma(a)).exp();
    if x < a + 1.0 {
        // P(a, x) = e^-x x^a / Gamma(a + 1) sum_n x^n / ((a + 1) ... (a + n))
        let (mut term, mut sum, mut ap) = (1.0 / a, 1.0 / a, a);
        for _ in 0..1000 {
            ap += 1.0;
            term *= x / ap;
            sum += term;
            if term.abs() < sum.abs() * 1e-16 {
                break;
            }
        }
        (1.0 - front * sum).max(0.0)
    } else {
        let tiny = 1e-300;
        let mut b = x + 1.0 - a;
        let mut c = 1.0 / tiny;
        let mut d = 1.0 / b;
        let mut h = d;
        for i in 1..1000 {
            let an = -(i as f64) * (i as f64 - a);
            b += 2.0;
            d = an * d + b;
            if d.abs() < tiny {
                d = tiny;
            }
            c = b + an / c;
            if c.abs() < tiny {
                c = tiny;
            }
            d = 1.0 / d;
            let del = d * c;
            h *= del;
            if (del - 1.0).abs() < 1e-16 {
                break;
            }
        }
        front * h
    }
}

/// Upper tail P(X >= x) of the chi-square law with `k` degrees of freedom (k > 0):
/// Q(k/2, x/2) (Abramowitz and Stegun 1964, 26.4.19, from memory).
pub fn chi2_sf(x: f64, k: f64) -> f64 {
    gamma_q(0.5 * k, 0.5 * x)
}

/// Upper quantile of the chi-square law with `k` degrees of freedom: the `x` with
/// P(X >= x) = `p` (0 < p < 1), by bisection on [`chi2_sf`] (`upper_point`).
pub fn chi2_isf(p: f64, k: f64) -> f64 {
    upper_point(p, |x| chi2_sf(x, k), k.max(1.0))
}

/// Upper tail P(Z >= z) of the standard normal law, from the chi-square law on one degree of
/// freedom: Z^2 is chi-square(1), so P(Z >= z) = Q(1/2, z^2/2) / 2 for z >= 0 (Abramowitz and
/// Stegun 1964, 26.2.30 with 26.4.19, from memory). Not a number for a `z` that is not.
pub fn normal_sf(z: f64) -> f64 {
    if z.is_nan() {
        return f64::NAN;
    }
    let half = 0.5 * chi2_sf(z * z, 1.0);
    if z >= 0.0 {
        half
    } else {
        1.0 - half
    }
}

/// The z with [`normal_sf`]`(z) = p`, for 0 < p < 1 (bisection to the last bit; +/-infinity at
/// the ends, not a number outside them).
pub fn normal_isf(p: f64) -> f64 {
    if !(0.0..=1.0).contains(&p) {
        return f64::NAN;
    }
    if p == 0.0 || p == 1.0 {
        return if p == 0.0 {
            f64::INFINITY
        } else {
            f64::NEG_INFINITY
        };
    }
    // P(Z >= 40) is about 4e-350, below any f64
    let (mut lo, mut hi) = (-40.0_f64, 40.0_f64);
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if mid <= lo || mid >= hi {
            break;
        }
        if normal_sf(mid) > p {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

/// Robust slope of `y` against `x`: the median of the slopes of every pair of points (Theil 1950,
/// Indagationes Mathematicae 12; Sen 1968, JASA 63:1379-1389), each pair weighted by the product
/// of its points' weights `w` (a lane's width: the slope does not depend on how finely the width
/// is cut into lanes). A single point far off the line, or a minority of them, moves it little,
/// where it tilts a least-squares line. The weighted median is the slope where the sorted pairs'
/// weight first reaches half of their total, averaged with the next slope when it reaches half
/// exactly (so equal weights give the ordinary median). Pairs at the same `x` are left out; 0
/// when no pair is left.
pub fn theil_sen_slope(x: &[f64], y: &[f64], w: &[f64]) -> f64 {
    let n = x.len().min(y.len()).min(w.len());
    let mut pairs: Vec<(f64, f64)> = Vec::with_capacity(n * n.saturating_sub(1) / 2);
    for i in 0..n {
        for j in i + 1..n {
            let dx = x[j] - x[i];
            if dx != 0.0 {
                pairs.push(((y[j] - y[i]) / dx, w[i] * w[j]));
            }
        }
    }
    weighted_median(pairs)
}

/// Weighted median of `(value, weight)` pairs: the value where the pairs sorted by value first
/// reach half of their total weight, averaged with the next value when they reach half exactly
/// (so equal weights give the ordinary median). Pairs of no weight count for nothing; 0 with no
/// pair of weight.
pub fn weighted_median(mut pairs: Vec<(f64, f64)>) -> f64 {
    pairs.retain(|p| p.1 > 0.0);
    if pairs.is_empty() {
        return 0.0;
    }
    pairs.sort_by(|a, b| a.0.total_cmp(&b.0));
    let half = 0.5 * pairs.iter().map(|p| p.1).sum::<f64>();
    let mut cum = 0.0;
    for (k, &(value, weight)) in pairs.iter().enumerate() {
        cum += weight;
        if cum >= half {
            let exact = (cum - half).abs() <= 1e-12 * half;
            return match pairs.get(k + 1) {
                Some(next) if exact => 0.5 * (value + next.0),
                _ => value,
            };
        }
    }
    pairs[pairs.len() - 1].0
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Normal tails and quantiles (Abramowitz and Stegun 1964, Table 26.1 and 26.5: Q(1.959964)
    /// = 0.025, Q(3.090232) = 0.001, Q(1) = 0.158655); P(Z >= 7) = 1.279813e-12 (SciPy 1.17.1,
    /// `norm.sf(7)`).
    #[test]
    fn normal_tails_and_quantiles() {
        assert!((normal_sf(1.959_964) - 0.025).abs() < 1e-7);
        assert!((normal_sf(-1.0) - (1.0 - 0.158_655_3)).abs() < 1e-7);
        assert!((normal_sf(7.0) / 1.279_813e-12 - 1.0).abs() < 1e-5);
        assert!((normal_isf(0.001) - 3.090_232).abs() < 1e-6);
        assert!((normal_isf(0.975) + 1.959_964).abs() < 1e-6);
        assert_eq!(normal_isf(0.0), f64::INFINITY);
        assert!(normal_isf(1.5).is_nan() && normal_sf(f64::NAN).is_nan());
    }

    /// Chi-square upper quantiles at 0.001 (SciPy 1.17.1, `chi2.isf(0.001, k)`).
    #[test]
    fn chi2_upper_quantiles_match_scipy() {
        for (k, want) in [
            (1.0, 10.827_566_170_662_733),
            (3.0, 16.266_236_196_238_13),
            (6.0, 22.457_744_484_825_323),
            (12.0, 32.909_490_407_360_21),
            (27.0, 55.476_020_205_745_21),
        ] {
            let got = chi2_isf(0.001, k);
            assert!((got / want - 1.0).abs() < 1e-9, "k {k}: {got} vs {want}");
        }
    }

    /// The weighted median: equal weights give the ordinary median (Python 3.11's
    /// `statistics.median`: 2 of [3, 1, 2], 2.5 of [1, 2, 3, 4]); unequal weights hand-worked.
    #[test]
    fn weighted_median_of_equal_and_unequal_weights() {
        let eq = |v: &[f64]| weighted_median(v.iter().map(|&x| (x, 1.0)).collect());
        assert_eq!(eq(&[3.0, 1.0, 2.0]), 2.0);
        assert_eq!(eq(&[1.0, 2.0, 3.0, 4.0]), 2.5);
        // hand-worked: weights 1, 1, 2 reach half (2) exactly at 2, so 2 and 3 are averaged;
        // one narrow outlier does not move it, where it moves the weighted mean
        assert_eq!(
            weighted_median(vec![(1.0, 1.0), (2.0, 1.0), (3.0, 2.0)]),
            2.5
        );
        assert_eq!(
            weighted_median(vec![(0.1, 4.0), (0.2, 4.0), (9.0, 1.0)]),
            0.2
        );
        assert_eq!(weighted_median(Vec::new()), 0.0);
        // a pair of no weight counts for nothing
        assert_eq!(
            weighted_median(vec![(1.0, 1.0), (2.0, 0.0), (3.0, 1.0)]),
            2.0
        );
        assert_eq!(weighted_median(vec![(1.0, 0.0), (2.0, 0.0)]), 0.0);
    }

    /// Equal weights give the ordinary Theil-Sen slope (SciPy 1.17.1, `scipy.stats.theilslopes`:
    /// 2.666666666666668 on 21 pairs, 2.0 on 10 pairs, the mean of the middle two); a point cut
    /// into two at the same position with half the weight each leaves it unchanged.
    #[test]
    fn theil_sen_slope_matches_scipy() {
        let x = [0.1, 0.3, 0.35, 0.6, 0.9, 1.2, 1.25];
        let y = [1.0, 1.4, 0.2, 2.2, 2.0, 3.5, 9.0];
        let one = [1.0; 7];
        assert!((theil_sen_slope(&x, &y, &one) - 2.666_666_666_666_668).abs() < 1e-12);
        let (x5, y5) = ([0.0, 0.2, 0.5, 0.7, 1.0], [0.0, 0.5, 0.4, 1.9, 1.6]);
        assert!((theil_sen_slope(&x5, &y5, &[2.0; 5]) - 2.0).abs() < 1e-12);
        let xs = [0.1, 0.3, 0.35, 0.6, 0.6, 0.9, 1.2, 1.25];
        let ys = [1.0, 1.4, 0.2, 2.2, 2.2, 2.0, 3.5, 9.0];
        let ws = [1.0, 1.0, 1.0, 0.5, 0.5, 1.0, 1.0, 1.0];
        assert!((theil_sen_slope(&xs, &ys, &ws) - 2.666_666_666_666_668).abs() < 1e-12);
        assert_eq!(theil_sen_slope(&[1.0, 1.0], &[0.0, 3.0], &[1.0, 1.0]), 0.0);
    }

    /// Gamma of integers is a factorial, Gamma(1/2) = sqrt(pi) (Abramowitz and Stegun 1964,
    /// 6.1.6 and 6.1.8).
    #[test]
    fn ln_gamma_matches_factorials_and_half() {
        let mut f = 1.0_f64;
        for n in 1..20 {
            assert!((ln_gamma(n as f64) - f.ln()).abs() < 1e-12 * f.ln().abs().max(1.0));
            f *= n as f64;
        }
        let half = 0.5 * std::f64::consts::PI.ln();
        assert!((ln_gamma(0.5) - half).abs() < 1e-13);
    }

    /// One degree of freedom is the Cauchy law: P(T >= t) = 1/2 - atan(t)/pi; the tail is
    /// symmetric (Abramowitz and Stegun 1964, 26.7.3).
    #[test]
    fn one_degree_of_freedom_is_cauchy() {
        for t in [-4.0, -0.3, 0.0, 0.7, 2.0, 12.0] {
            let want = 0.5 - f64::atan(t) / std::f64::consts::PI;
            assert!((student_t_sf(t, 1.0) - want).abs() < 1e-13, "{t}");
        }
    }
}
