//! Is the caliper profile uneven in any way (outlier, spread, wedge, crown:
//! [`unevenness_chance`], chi-square tails from [`crate::stats::chi2_sf`])? The confidence stage
//! asks before it drops a finding that rests on the profiles alone. The polynomials of position
//! made orthonormal over the readings ([`poly_basis`]) serve the crown test too.

use super::profile_test::caliper_readings;
use crate::case::Case;
use crate::lanes::Lanes;

/// The unevenness test of the case's caliper readings (the band test's, [`caliper_readings`])
/// with repeatability `rep` (m) and the band test's chance `outlier_chance`: the chance that
/// noise alone makes them as uneven in some way ([`unevenness_chance`]).
pub(super) fn caliper_unevenness(lab: &Case, lanes: &Lanes, rep: f64, outlier_chance: f64) -> f64 {
    let (readings, positions) = caliper_readings(lab, lanes);
    unevenness_chance(&readings, &positions, rep, outlier_chance)
}

/// The chance that noise alone makes `readings` (at `positions`, m) as uneven as they are in
/// any of four ways, with one-sigma repeatability `rep` (the readings' unit):
/// - the most outlying reading, `outlier_chance` (the band test);
/// - the spread, sum (x - mean)^2 / rep^2: chi-square on n - 1 degrees of freedom;
/// - a linear and a quadratic component across the width, (e_k . x)^2 / rep^2 with e_k the
///   polynomials of position made orthonormal over the readings (Gram-Schmidt): chi-square on
///   one degree of freedom each, the low-order components of Neyman's smooth test (Neyman 1937,
///   Skandinavisk Aktuarietidskrift 20:149-199, from memory). A wedge or a crowned profile
///   spreads over many readings and shows in these long before any one reading stands out.
///
/// The outlier test counts at its own chance, as the band test stands elsewhere (so a profile the
/// band test puts above noise is uneven here too); the other tests share the level: their
/// smallest chance times their number (Bonferroni), at most 1. The smaller of the two. A chance
/// that is not a number (readings that are not) counts as no evidence (1).
pub(super) fn unevenness_chance(
    readings: &[f64],
    positions: &[f64],
    rep: f64,
    outlier_chance: f64,
) -> f64 {
    let n = readings.len().min(positions.len());
    let var = (rep * rep).max(f64::MIN_POSITIVE);
    let mut chances = Vec::new();
    if n >= 2 {
        let mean = readings[..n].iter().sum::<f64>() / n as f64;
        let ss: f64 = readings[..n].iter().map(|x| (x - mean).powi(2)).sum();
        chances.push(crate::stats::chi2_sf(ss / var, (n - 1) as f64));
    }
    for e in poly_basis(&positions[..n]).0.iter().skip(1) {
        let c: f64 = e.iter().zip(readings).map(|(x, y)| x * y).sum();
        chances.push(crate::stats::chi2_sf(c * c / var, 1.0));
    }
    let least = chances
        .iter()
        .map(|c| if c.is_nan() { 1.0 } else { *c })
        .fold(1.0, f64::min);
    let outlier = if outlier_chance.is_nan() {
        1.0
    } else {
        outlier_chance
    };
    outlier.min((least * chances.len().max(1) as f64).min(1.0))
}

/// Polynomials of position over `positions` made orthonormal (Gram-Schmidt): the constant, then
/// degree 1 and 2 where the positions allow them (a degree needs two positions more than it).
/// Positions are mapped onto -1..1 first (the outermost at -1 and 1), which leaves the span, and
/// so each vector, unchanged; the mapped positions are returned with the basis.
pub(super) fn poly_basis(positions: &[f64]) -> (Vec<Vec<f64>>, Vec<f64>) {
    let n = positions.len();
    let (lo, hi) = positions
        .iter()
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), &x| {
            (a.min(x), b.max(x))
        });
    let u: Vec<f64> = positions
        .iter()
        .map(|x| 2.0 * (x - lo) / (hi - lo).max(1e-12) - 1.0)
        .collect();
    let mut basis: Vec<Vec<f64>> = vec![vec![1.0 / (n.max(1) as f64).sqrt(); n]];
    for degree in 1..=2i32 {
        if n < degree as usize + 2 {
            break;
        }
        let mut e: Vec<f64> = u.iter().map(|x| x.powi(degree)).collect();
        for b in &basis {
            let dot: f64 = e.iter().zip(b).map(|(x, y)| x * y).sum();
            e.iter_mut().zip(b).for_each(|(x, y)| *x -= dot * y);
        }
        let norm = e.iter().map(|x| x * x).sum::<f64>().sqrt();
        if norm < 1e-9 {
            break;
        }
        e.iter_mut().for_each(|x| *x /= norm);
        basis.push(e);
    }
    (basis, u)
}

#[cfg(test)]
mod tests {
    use super::unevenness_chance;

    /// With the readings exactly on a line, the linear component carries the whole sum of
    /// squares: for 20 evenly spaced readings of a +/-1.5 sigma wedge it is 16.579 sigma^2, whose
    /// chi-square tail on 1 d.f. is 4.667e-5 (SciPy 1.17.1, `chi2.sf(16.579, 1)`); the three
    /// tests besides the outlier's make 1.400e-4. The outlier chance is left at 1 (no reading
    /// stands out).
    #[test]
    fn a_wedge_is_uneven_by_its_linear_component() {
        let n = 20;
        let pos: Vec<f64> = (0..n).map(|i| i as f64 / (n - 1) as f64).collect();
        let wedge: Vec<f64> = pos.iter().map(|u| 1.5 * (2.0 * u - 1.0)).collect();
        let c = unevenness_chance(&wedge, &pos, 1.0, 1.0);
        assert!((c / 1.400e-4 - 1.0).abs() < 1e-3, "{c}");
        // a level profile is not uneven at all
        assert_eq!(unevenness_chance(&[3.0; 20], &pos, 1.0, 1.0), 1.0);
    }

    /// Readings alternating +/-0.9 sigma around the mean: no reading outlies and no trend; the
    /// spread is 20 (0.9)^2 = 16.2 sigma^2 on 19 d.f., chi-square tail 0.644 (SciPy 1.17.1,
    /// `chi2.sf(16.2, 19)`), so not uneven. At +/-1.8 sigma it is 64.8, tail 6.6e-7 (same
    /// source): three tests make 2.0e-6, uneven.
    #[test]
    fn an_alternating_pattern_is_uneven_by_its_spread() {
        let pos: Vec<f64> = (0..20).map(|i| i as f64 * 0.03).collect();
        let alt =
            |a: f64| -> Vec<f64> { (0..20).map(|i| if i % 2 == 0 { a } else { -a }).collect() };
        assert!(unevenness_chance(&alt(0.9), &pos, 1.0, 1.0) > 0.5);
        assert!(unevenness_chance(&alt(1.8), &pos, 1.0, 1.0) < 1e-5);
    }
}
