//! The trend leg of the caliper band test ([`super::profile_test`]): how far a band of a few
//! adjacent readings stands over the least-squares trend through the readings outside it, a
//! straight line against position, or a quadratic where those readings are bent beyond noise
//! ([`CURVATURE_SIGMAS`]). A wedge's thick end and a dish's thick edges stand over the
//! readings' median and over their neighbours without any band (their neighbours all lie on
//! their thin side), but not over that trend: a wedge is a line, a crown or dish close to a
//! parabola, and it bends the readings around any band as much as itself. A quadratic for every
//! band would cost power at the ends, where it extrapolates: a band of two readings 7
//! repeatabilities thick at the end of 15 stands 6.9 over the line through the others, 4.0 over
//! their quadratic.

/// Widest band, in readings, that [`over_trend`] holds against the trend through the readings
/// outside it (a band of one to three readings: a gauge band is a few readings wide, a
/// one-sided thick edge one or two).
const TREND_BAND: usize = 3;

/// Grid units per reading spacing in [`grid`].
const GRID_UNIT: f64 = 1e6;

/// The readings' positions as the trend leg uses them: in units of their mean spacing from the
/// first, to a millionth ([`GRID_UNIT`]), so evenly spaced readings are 0, 1, 2, ... exactly and
/// share their noise-only profiles with every such profile of that count. Positions that do not
/// rise (or are not `n` numbers) are taken as evenly spaced.
pub(super) fn grid(positions: &[f64], n: usize) -> Vec<i64> {
    let ok = positions.len() == n
        && n >= 2
        && positions.iter().all(|p| p.is_finite())
        && positions.windows(2).all(|w| w[1] > w[0]);
    if !ok {
        return index_grid(n);
    }
    let step = (positions[n - 1] - positions[0]) / (n - 1) as f64;
    positions
        .iter()
        .map(|p| ((p - positions[0]) / step * GRID_UNIT).round() as i64)
        .collect()
}

/// Evenly spaced readings' grid: 0, 1, 2, ... in [`GRID_UNIT`]s.
pub(super) fn index_grid(n: usize) -> Vec<i64> {
    (0..n as i64).map(|i| i * GRID_UNIT as i64).collect()
}

/// The largest excess of a band of 1 to [`TREND_BAND`] adjacent readings `v` over the
/// least-squares trend (against their positions, on [`grid`] `at`) through the readings outside
/// it (a line, or a quadratic where they are bent: [`CURVATURE_SIGMAS`]), in units of that excess's standard deviation in the readings' own:
/// for a band B of k readings, (mean of B - the fitted trend's mean over B) / sqrt(1/k +
/// f^T (X^T X)^-1 f), with X the others' design matrix and f the mean over B of its rows, the
/// error of predicting a mean of k new readings from a fitted regression (Draper and Smith
/// 1998, "Applied Regression Analysis", 3rd ed., sections 3.1 and 5.1, from memory; for k = 1
/// the deleted residual of Cook and Weisberg 1982). Each is standard normal on a level profile
/// of unit noise, and a band does not move the trend it is judged against. `v` is in units of
/// the readings' repeatability ([`CURVATURE_SIGMAS`] reads it so). At least one reading
/// more than the trend has coefficients stays outside a band. 0 when none lies above its trend.
pub(super) fn over_trend(v: &[f64], at: &[i64]) -> f64 {
    thread_local! {
        static SCAN: std::cell::RefCell<TrendScan> = const {
            std::cell::RefCell::new(TrendScan {
                at: Vec::new(),
                phi: Vec::new(),
                bands: Vec::new(),
                sums: Vec::new(),
            })
        };
    }
    SCAN.with_borrow_mut(|scan| {
        if scan.at != at {
            *scan = TrendScan::new(at);
        }
        scan.most(v)
    })
}

/// What [`over_trend`] needs of the positions alone, per band (made once per grid and thread:
/// the noise-only profiles use it 100,000 times).
struct TrendScan {
    at: Vec<i64>,
    /// The trends' basis at each reading: 1, u and u^2 (u the position mapped onto -1..1).
    phi: Vec<[f64; 3]>,
    bands: Vec<TrendBand>,
    /// Scratch: running sums of v phi over the readings before each index.
    sums: Vec<[f64; 3]>,
}

/// One band's geometry: its first reading and width, 1/k, the straight line's and (where
/// [`BENT_OTHERS`] readings or more stay outside) the quadratic's prediction of the band's mean, and the weights
/// that give the others' quadratic coefficient over its standard error.
struct TrendBand {
    start: usize,
    k: usize,
    inv_k: f64,
    line: Predictor,
    quadratic: Option<(Predictor, [f64; 3])>,
}

/// A least-squares trend's prediction of a band's mean from the others: the weights w = M^-1 f
/// that give it from the others' sums of v phi (M the others' sum of phi phi^T over the trend's
/// terms, f the band's mean phi), and 1 over its error's standard deviation factor
/// sqrt(1/k + f . w).
struct Predictor {
    w: [f64; 3],
    inv_sd: f64,
}

impl Predictor {
    fn new(m: [[f64; 3]; 3], f: [f64; 3], terms: usize, k: f64) -> Option<Self> {
        let w = solve_spd(m, f, terms)?;
        let var = 1.0 / k + f.iter().zip(&w).map(|(a, b)| a * b).sum::<f64>();
        Some(Predictor {
            w,
            inv_sd: 1.0 / var.sqrt(),
        })
    }

    /// The band's mean excess over the trend, in units of its standard deviation, from the
    /// band's mean `yb` and the others' sums `rest`.
    #[inline]
    fn excess(&self, yb: f64, rest: [f64; 3]) -> f64 {
        let trend = self.w[0] * rest[0] + self.w[1] * rest[1] + self.w[2] * rest[2];
        (yb - trend) * self.inv_sd
    }
}

/// How far, in standard errors, the quadratic coefficient of the readings outside a band must
/// stand from zero for their trend to be the quadratic rather than the straight line: three
/// (common practice: three sigma). A crown or dish bends the readings around a band as much as
/// itself, a band does not bend the readings outside it; a level or wedged profile's noise
/// takes the quadratic for 0.27 % of bands, which the Monte Carlo null counts like every other
/// choice the statistic makes.
pub(super) const CURVATURE_SIGMAS: f64 = 3.0;

/// Fewest readings outside a band whose trend may be a quadratic: three more than its
/// coefficients, so that their curvature is measured and not a fit of four points (a profile of
/// six readings or fewer is held against the line).
pub(super) const BENT_OTHERS: usize = 6;

impl TrendScan {
    fn new(at: &[i64]) -> Self {
        let n = at.len();
        let (lo, hi) = match (at.first(), at.last()) {
            (Some(a), Some(b)) if b > a => (*a as f64, *b as f64),
            _ => (0.0, 1.0),
        };
        let phi: Vec<[f64; 3]> = at
            .iter()
            .map(|&g| {
                let u = 2.0 * (g as f64 - lo) / (hi - lo) - 1.0;
                [1.0, u, u * u]
            })
            .collect();
        let mut bands = Vec::new();
        for k in 1..=TREND_BAND.min(n.saturating_sub(3)) {
            let kf = k as f64;
            for start in 0..=n - k {
                let (mut m, mut f) = ([[0.0; 3]; 3], [0.0; 3]);
                for (j, b) in phi.iter().enumerate() {
                    if (start..start + k).contains(&j) {
                        f.iter_mut().zip(b).for_each(|(x, y)| *x += y / kf);
                    } else {
                        for (row, br) in m.iter_mut().zip(b) {
                            row.iter_mut().zip(b).for_each(|(x, y)| *x += br * y);
                        }
                    }
                }
                let Some(line) = Predictor::new(m, f, 2, kf) else {
                    continue;
                };
                // the others' quadratic coefficient is g . (their sums), g = M^-1 e_3, with
                // variance g_3 (unit noise)
                let quadratic = (n - k >= BENT_OTHERS)
                    .then(|| {
                        let g = solve_spd(m, [0.0, 0.0, 1.0], 3)?;
                        let z = g.map(|x| x / g[2].sqrt());
                        Some((Predictor::new(m, f, 3, kf)?, z))
                    })
                    .flatten();
                bands.push(TrendBand {
                    start,
                    k,
                    inv_k: 1.0 / kf,
                    line,
                    quadratic,
                });
            }
        }
        TrendScan {
            at: at.to_vec(),
            phi,
            bands,
            sums: Vec::with_capacity(n + 1),
        }
    }

    fn most(&mut self, v: &[f64]) -> f64 {
        let p = &mut self.sums;
        p.clear();
        p.push([0.0; 3]);
        for (y, b) in v.iter().zip(&self.phi) {
            let s = p[p.len() - 1];
            p.push([s[0] + y * b[0], s[1] + y * b[1], s[2] + y * b[2]]);
        }
        let t = p[p.len() - 1];
        let mut most = 0.0_f64;
        for b in &self.bands {
            let (hi, lo) = (p[b.start + b.k], p[b.start]);
            let rest = std::array::from_fn(|j| t[j] - (hi[j] - lo[j]));
            let yb = (hi[0] - lo[0]) * b.inv_k;
            let bent = b.quadratic.as_ref().filter(|(_, z)| {
                (z[0] * rest[0] + z[1] * rest[1] + z[2] * rest[2]).abs() > CURVATURE_SIGMAS
            });
            let excess = match bent {
                Some((q, _)) => q.excess(yb, rest),
                None => b.line.excess(yb, rest),
            };
            most = most.max(excess);
        }
        most
    }
}

/// Solve M w = f for the leading `p` x `p` block of a symmetric positive definite `m`
/// (Cholesky); the rest of w is 0. `None` when the block is not positive definite (the
/// readings outside a band do not fix the background).
fn solve_spd(m: [[f64; 3]; 3], f: [f64; 3], p: usize) -> Option<[f64; 3]> {
    let mut l = [[0.0; 3]; 3];
    for i in 0..p {
        for j in 0..=i {
            let s = m[i][j] - (0..j).map(|q| l[i][q] * l[j][q]).sum::<f64>();
            if i == j {
                if s <= 1e-12 * m[0][0] {
                    return None;
                }
                l[i][i] = s.sqrt();
            } else {
                l[i][j] = s / l[j][j];
            }
        }
    }
    let mut y = [0.0; 3];
    for i in 0..p {
        y[i] = (f[i] - (0..i).map(|q| l[i][q] * y[q]).sum::<f64>()) / l[i][i];
    }
    let mut w = [0.0; 3];
    for i in (0..p).rev() {
        w[i] = (y[i] - (i + 1..p).map(|q| l[q][i] * w[q]).sum::<f64>()) / l[i][i];
    }
    Some(w)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The hat value of reading `i` under a least-squares fit of degree `d` over positions `x`,
    /// from the orthonormal polynomials of the positions (Gram-Schmidt, written out here apart
    /// from the normal equations the scan solves): h_ii = sum_j e_j(i)^2 (Cook and Weisberg 1982,
    /// section 2.1).
    fn hat(x: &[f64], d: i32, i: usize) -> f64 {
        let mut basis: Vec<Vec<f64>> = Vec::new();
        for p in 0..=d {
            let mut e: Vec<f64> = x.iter().map(|v| v.powi(p)).collect();
            for b in &basis {
                let dot: f64 = e.iter().zip(b).map(|(a, c)| a * c).sum();
                e.iter_mut().zip(b).for_each(|(a, c)| *a -= dot * c);
            }
            let norm = e.iter().map(|a| a * a).sum::<f64>().sqrt();
            e.iter_mut().for_each(|a| *a /= norm);
            basis.push(e);
        }
        basis.iter().map(|e| e[i] * e[i]).sum()
    }

    /// Evenly spaced positions are the index grid exactly (shared noise-only profiles); a
    /// straight wedge and a dish read at uneven positions (60 mm apart at the front, 270 mm at
    /// the back) lie on their trend: no band, where by reading number the wedge's thick end
    /// stands out; one reading d above the trend at the back end stands d sqrt(1 - h) over the
    /// trend through all the others, h its hat value under a line (the wedge: the others are not
    /// bent) or a quadratic (the dish), the deleted residual over its standard deviation (Cook
    /// and Weisberg 1982, section 2.2). Six readings rising on a line: a line.
    #[test]
    fn the_trend_is_fitted_against_the_positions() {
        let even: Vec<f64> = (0..15).map(|i| 0.06 + 0.12 * i as f64).collect();
        assert_eq!(grid(&even, 15), index_grid(15));
        let uneven: Vec<f64> = (0..12)
            .map(|i| 0.06 * i as f64)
            .chain((1..=4).map(|i| 0.66 + 0.27 * i as f64))
            .collect();
        let at = grid(&uneven, uneven.len());
        let x: Vec<f64> = at.iter().map(|&g| g as f64 / GRID_UNIT).collect();
        let wedge: Vec<f64> = uneven.iter().map(|x| 4.0 * x).collect();
        let dish: Vec<f64> = x.iter().map(|v| 0.5 * (v - 8.0).powi(2)).collect();
        // (positions are kept to a millionth of a spacing)
        assert!(over_trend(&wedge, &at) < 1e-5);
        assert!(over_trend(&dish, &at) < 1e-5);
        let by_number = over_trend(&wedge, &index_grid(uneven.len()));
        assert!(by_number > 1.0, "{by_number}");
        let last = x.len() - 1;
        for (base, degree) in [(&wedge, 1), (&dish, 2)] {
            let mut band = base.clone();
            band[last] += 6.0;
            let d = over_trend(&band, &at);
            let want = 6.0 * (1.0 - hat(&x, degree, last)).sqrt();
            assert!((d - want).abs() < 1e-6, "{d} vs {want}");
        }
        let six: Vec<f64> = (0..6)
            .map(|i| 0.5 * i as f64 + if i == 5 { 6.0 } else { 0.0 })
            .collect();
        let xs: Vec<f64> = (0..6).map(f64::from).collect();
        let d = over_trend(&six, &index_grid(6));
        let want = 6.0 * (1.0 - hat(&xs, 1, 5)).sqrt();
        assert!((d - want).abs() < 1e-9, "{d} vs {want}");
    }
}
