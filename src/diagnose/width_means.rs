//! Roll-level quantities made from per-lane values, as integrals over the width. The lanes are
//! not equally wide (each edge lane is one 25 mm strip at every lane count, inner lanes are
//! wider), so a plain sum or mean over lanes lets a 25 mm strip count as much as a 200 mm lane
//! and moves with the lane count. Each lane here counts for its width in metres.

use crate::numeric::{weighted_abs_deviation, weighted_mean};

/// Shares of the lane-to-lane length differences from hygroexpansion and from creep, 0..1 each
/// (summing to 1; (0, 0) when there are no differences). `hyg`: each lane's hygroexpansion
/// strain; `tot`: its strain at unwind with the web's own length profile at winding taken out
/// (same unit); `w`: lane widths, m. Each part is the integral over the width of its absolute
/// deviation from its width-weighted mean ([`weighted_abs_deviation`]); the creep part is what
/// is left of `tot` after `hyg`.
pub fn shares(hyg: &[f64], tot: &[f64], w: &[f64]) -> (f64, f64) {
    let creep: Vec<f64> = tot.iter().zip(hyg).map(|(t, h)| t - h).collect();
    let dh = weighted_abs_deviation(hyg, w);
    let dc = weighted_abs_deviation(&creep, w);
    if dh + dc > 0.0 {
        let ms = dh / (dh + dc);
        (ms, 1.0 - ms)
    } else {
        (0.0, 0.0)
    }
}

/// Loss of the surface-zone pressure from `p0` to `p1` (Pa, per lane), % of the start: the loss
/// of the pressure integrated over the width (`w`, lane widths, m), which is what friction over
/// the face resists slip with (Coulomb's law of friction, Coulomb 1785). The start is taken as
/// at least 1 Pa, so a roll with no pressure at the surface does not divide by zero.
pub fn pressure_loss_pct(p0: &[f64], p1: &[f64], w: &[f64]) -> f64 {
    let start = weighted_mean(p0, w).max(1.0);
    100.0 * (start - weighted_mean(p1, w)) / start
}

/// Pearson's correlation of `a` with `b` over the width: the means, covariance and variances
/// each weighted by the lanes' widths `w` (m), -1..1; 0 when either does not vary.
pub fn correlation(a: &[f64], b: &[f64], w: &[f64]) -> f64 {
    let (ma, mb) = (weighted_mean(a, w), weighted_mean(b, w));
    let sum = |f: &dyn Fn(usize) -> f64| (0..a.len().min(b.len())).map(|i| w[i] * f(i)).sum();
    let cov: f64 = sum(&|i| (a[i] - ma) * (b[i] - mb));
    let va: f64 = sum(&|i| (a[i] - ma).powi(2));
    let vb: f64 = sum(&|i| (b[i] - mb).powi(2));
    if va <= 1e-30 || vb <= 1e-30 {
        0.0
    } else {
        cov / (va * vb).sqrt()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Hand computation: a 25 mm strip and two 200 mm lanes (0.425 m). Hygroexpansion 1, 0, 0:
    /// mean 0.025 / 0.425 = 1/17, deviations integrated 0.025 (16/17) + 0.4 (1/17) = 0.8/17.
    /// Creep 0, 0, 1: mean 0.2 / 0.425 = 8/17, deviations 0.225 (8/17) + 0.2 (9/17) = 3.6/17.
    /// Moisture share 0.8 / 4.4 = 2/11. Counted by lanes, both parts would be 4/3 and the
    /// shares 0.5 each.
    #[test]
    fn shares_match_a_hand_computation() {
        let w = [0.025, 0.2, 0.2];
        let (m, c) = shares(&[1.0, 0.0, 0.0], &[1.0, 0.0, 1.0], &w);
        assert!((m - 2.0 / 11.0).abs() < 1e-12, "{m}");
        assert!((c - 9.0 / 11.0).abs() < 1e-12, "{c}");
        // the same roll with its last lane cut in two: the same shares
        let w4 = [0.025, 0.2, 0.1, 0.1];
        let (m4, _) = shares(&[1.0, 0.0, 0.0, 0.0], &[1.0, 0.0, 1.0, 1.0], &w4);
        assert!((m4 - m).abs() < 1e-12, "{m4}");
    }

    /// Hand computation: widths 0.1, 0.1, 0.2 m, a = 0, 1, 2, b = 0, 2, 1. Weighted means
    /// (0.1 + 0.4) / 0.4 = 1.25 and (0.2 + 0.2) / 0.4 = 1; covariance 0.1 (-1.25)(-1) +
    /// 0.1 (-0.25)(1) + 0.2 (0.75)(0) = 0.1; variances 0.1 (1.5625 + 0.0625) + 0.2 (0.5625) =
    /// 0.275 and 0.1 + 0.1 + 0 = 0.2: r = 0.1 / sqrt(0.055) = 0.4264. The same lanes counted
    /// alike give 0.5; the third lane cut in two (0.1 m each, same values) gives 0.4264 again.
    #[test]
    fn correlation_matches_a_hand_computation() {
        let r = correlation(&[0.0, 1.0, 2.0], &[0.0, 2.0, 1.0], &[0.1, 0.1, 0.2]);
        assert!((r - 0.1 / 0.055f64.sqrt()).abs() < 1e-12, "{r}");
        let equal = correlation(&[0.0, 1.0, 2.0], &[0.0, 2.0, 1.0], &[1.0; 3]);
        assert!((equal - 0.5).abs() < 1e-12, "{equal}");
        let cut = correlation(&[0.0, 1.0, 2.0, 2.0], &[0.0, 2.0, 1.0, 1.0], &[0.1; 4]);
        assert!((cut - r).abs() < 1e-12, "{cut}");
        assert_eq!(correlation(&[1.0, 1.0], &[0.0, 2.0], &[0.5, 0.5]), 0.0);
    }

    /// Hand computation: a 25 mm strip at 1 kPa and a 200 mm lane at 10 kPa (mean over the
    /// width 2025 / 0.225 = 9 kPa) go to 0 and 9 kPa (mean 1800 / 0.225 = 8 kPa): 11.11 % lost.
    /// The plain mean of the lanes' losses (100 % and 10 %) would be 55 %.
    #[test]
    fn pressure_loss_matches_a_hand_computation() {
        let loss = pressure_loss_pct(&[1e3, 1e4], &[0.0, 9e3], &[0.025, 0.2]);
        assert!((loss - 100.0 / 9.0).abs() < 1e-9, "{loss}");
        assert!(pressure_loss_pct(&[0.0], &[0.0], &[1.0]).is_finite());
    }
}
