//! The trend leg of the caliper band test ([`super::profile_test`]): how far a band of a few
//! adjacent readings stands over the least-squares trend through the readings outside it, a
//! straight line against position, or a quadratic where those readings are bent beyond noise
//! ([`CURVATURE_SIGMAS`]) and lie on it ([`FIT_CHANCE`]). A wedge's thick end and a dish's thick
//! edges stand over the readings' median and over their neighbours without any band (their
//! neighbours all lie on their thin side), but not over that trend: a wedge is a line, a crown or
//! dish close to a parabola, and it bends the readings around any band as much as itself. A
//! quadratic for every band would cost power at the ends, where it extrapolates: a noise-free band
//! of two readings 7 repeatabilities thick at the end of 15 stands 7.4 over the line through the
//! others, 5.2 over their quadratic. Thick readings at both edges bend the readings outside either
//! band, but do not lie on a parabola with them, so each band is held against the line.

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

/// The largest excess of a band of 1 to [`TREND_BAND`] adjacent readings `v` over the least-squares
/// trend (against their positions, on [`grid`] `at`) through the readings outside it (a line, or a
/// quadratic where they are bent, [`CURVATURE_SIGMAS`], and lie on it, [`FIT_CHANCE`]), in units
/// of that excess's standard deviation in the readings' own: for a band B of k readings, (mean of
/// B - the fitted trend's mean over B) / sqrt(1/k + f^T (X^T X)^-1 f), with X the others' design
/// matrix and f the mean over B of its rows, the error of predicting a mean of k new readings from
/// a fitted regression (Draper and Smith 1998, "Applied Regression Analysis", 3rd ed., sections 3.1
/// and 5.1, from memory; for k = 1 the deleted residual of Cook and Weisberg 1982). Each is about
/// standard normal on a level profile of unit noise, and a band does not move the trend it is
/// judged against. `v` is in units of the readings' repeatability ([`CURVATURE_SIGMAS`] and
/// [`FIT_CHANCE`] read it so). At least one reading more than the trend has coefficients stays
/// outside a band. 0 when none lies above its trend.
pub(super) fn over_trend(v: &[f64], at: &[i64]) -> f64 {
    with_scan(at, |scan| scan.most(v))
}

/// The readings (first, count) of the band [`over_trend`] finds most in excess of its trend,
/// `None` where none lies above it.
pub(super) fn over_trend_band(v: &[f64], at: &[i64]) -> Option<(usize, usize)> {
    with_scan(at, |scan| scan.best(v))
}

/// `f` on this thread's scan of grid `at` (made anew for a new grid).
fn with_scan<T>(at: &[i64], f: impl FnOnce(&mut TrendScan) -> T) -> T {
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
        f(scan)
    })
}

/// What [`over_trend`] needs of the positions alone, per band (made once per grid and thread:
/// the noise-only profiles use it 100,000 times).
struct TrendScan {
    at: Vec<i64>,
    /// The trends' basis at each reading: 1, u and u^2 (u the position mapped onto -1..1).
    phi: Vec<[f64; 3]>,
    bands: Vec<TrendBand>,
    /// Scratch: running sums of v phi and of v^2 over the readings before each index.
    sums: Vec<[f64; 4]>,
}

/// One band's geometry: its first reading and width, 1/k, the straight line's and (where
/// [`BENT_OTHERS`] readings or more stay outside) the quadratic's prediction of the band's mean,
/// and the weights that give the others' quadratic coefficient over its standard error.
struct TrendBand {
    start: usize,
    k: usize,
    inv_k: f64,
    line: Predictor,
    quadratic: Option<Bent>,
}

/// What a band needs to hold itself against the others' parabola: its predictor, the weights
/// g / sqrt(g_3) (g = M^-1 e_3) that give the others' quadratic coefficient in standard errors
/// from their sums of v phi, M^-1 (their residual sum of squares about the parabola is
/// sum v^2 - S^T M^-1 S, S those sums), and the chi-square bound that sum must stay below
/// ([`FIT_CHANCE`]).
struct Bent {
    predictor: Predictor,
    z: [f64; 3],
    inv_m: [[f64; 3]; 3],
    fit_limit: f64,
}

impl Bent {
    fn new(m: [[f64; 3]; 3], f: [f64; 3], k: f64, others: usize) -> Option<Self> {
        let col = |j: usize| solve_spd(m, std::array::from_fn(|i| f64::from(i == j)), 3);
        let inv_m = [col(0)?, col(1)?, col(2)?];
        let g = inv_m[2];
        Some(Bent {
            predictor: Predictor::new(m, f, 3, k)?,
            z: g.map(|x| x / g[2].sqrt()),
            inv_m,
            fit_limit: crate::stats::chi2_isf(FIT_CHANCE, (others - 3) as f64),
        })
    }

    /// Whether the others (their sums `rest` of v phi and `rest_vv` of v^2) bend along a
    /// parabola: their quadratic coefficient stands beyond [`CURVATURE_SIGMAS`] and their
    /// residuals about it are within noise.
    #[inline]
    fn holds(&self, rest: [f64; 3], rest_vv: f64) -> bool {
        let dot = |a: &[f64; 3]| a[0] * rest[0] + a[1] * rest[1] + a[2] * rest[2];
        if dot(&self.z).abs() <= CURVATURE_SIGMAS {
            return false;
        }
        let fitted = rest[0] * dot(&self.inv_m[0])
            + rest[1] * dot(&self.inv_m[1])
            + rest[2] * dot(&self.inv_m[2]);
        rest_vv - fitted < self.fit_limit
    }
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
/// stand from zero for their trend to be the quadratic rather than the straight line (and they
/// must lie on it, [`FIT_CHANCE`]): two (about the two-sided 95 % point; common practice). A
/// crown or dish bends the readings around a band as much as itself, a band does not bend the
/// readings outside it. A level or wedged profile's noise takes the quadratic for about 4.6 % of
/// bands, which costs a band a few hundredths of power and which the Monte Carlo null counts
/// like every other choice the statistic makes; at three standard errors a 6-sigma dish read at
/// 12 positions still came out as a band in 58 % of noise draws (14 % at two).
pub(super) const CURVATURE_SIGMAS: f64 = 2.0;

/// Chance at which the readings outside a band are judged not to lie on their parabola: their
/// residual sum of squares about it (unit noise) beyond the chi-square upper quantile at this
/// chance on their count less three degrees of freedom (the lack-of-fit test of a regression with
/// known error variance; Draper and Smith 1998, section 2.8, from memory). Thick readings at the
/// far edge bend the others without lying on any parabola with them; a dish's readings do lie on
/// one. The level is common practice for a check that only chooses between two trends.
pub(super) const FIT_CHANCE: f64 = 0.001;

/// Fewest readings outside a band whose trend may be a quadratic: three more than its
/// coefficients, so that their curvature and their fit to it are measured, not a fit of four
/// points (common practice); a profile of six readings or fewer is held against the line.
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
                let quadratic = (n - k >= BENT_OTHERS)
                    .then(|| Bent::new(m, f, kf, n - k))
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
        let mut most = 0.0_f64;
        self.scan(v, |_, excess| most = most.max(excess));
        most
    }

    /// The band (first reading, readings) whose excess over its trend is the largest, `None`
    /// when none lies above its trend.
    fn best(&mut self, v: &[f64]) -> Option<(usize, usize)> {
        let mut best = (0.0_f64, None);
        self.scan(v, |b, excess| {
            if excess > best.0 {
                best = (excess, Some((b.start, b.k)));
            }
        });
        best.1
    }

    /// Each band's excess over its trend, to `visit`.
    fn scan(&mut self, v: &[f64], mut visit: impl FnMut(&TrendBand, f64)) {
        // about their mean (no trend depends on it), so a large offset keeps its digits
        let c = v.iter().sum::<f64>() / v.len().max(1) as f64;
        let p = &mut self.sums;
        p.clear();
        p.push([0.0; 4]);
        for (y, b) in v.iter().map(|y| y - c).zip(&self.phi) {
            let s = p[p.len() - 1];
            p.push([
                s[0] + y * b[0],
                s[1] + y * b[1],
                s[2] + y * b[2],
                s[3] + y * y,
            ]);
        }
        let t = p[p.len() - 1];
        for b in &self.bands {
            let (hi, lo) = (p[b.start + b.k], p[b.start]);
            let rest: [f64; 4] = std::array::from_fn(|j| t[j] - (hi[j] - lo[j]));
            let rest3 = [rest[0], rest[1], rest[2]];
            let yb = (hi[0] - lo[0]) * b.inv_k;
            let excess = match b.quadratic.as_ref().filter(|q| q.holds(rest3, rest[3])) {
                Some(q) => q.predictor.excess(yb, rest3),
                None => b.line.excess(yb, rest3),
            };
            visit(b, excess);
        }
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
                if s <= 1e-10 * m[0][0] {
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

    /// The powers 0..=`d` of positions `x` made orthonormal (Gram-Schmidt, written out here apart
    /// from the normal equations the scan solves), each with its norm before it was normalised:
    /// the part of its column orthogonal to the lower powers.
    fn orthonormal(x: &[f64], d: i32) -> Vec<(Vec<f64>, f64)> {
        let mut basis: Vec<(Vec<f64>, f64)> = Vec::new();
        for p in 0..=d {
            let mut e: Vec<f64> = x.iter().map(|v| v.powi(p)).collect();
            for (b, _) in &basis {
                let dot: f64 = e.iter().zip(b).map(|(a, c)| a * c).sum();
                e.iter_mut().zip(b).for_each(|(a, c)| *a -= dot * c);
            }
            let norm = e.iter().map(|a| a * a).sum::<f64>().sqrt();
            e.iter_mut().for_each(|a| *a /= norm);
            basis.push((e, norm));
        }
        basis
    }

    /// The hat value of reading `i` under a least-squares fit of degree `d` over positions `x`:
    /// h_ii = sum_j e_j(i)^2 over the orthonormal polynomials (Cook and Weisberg 1982, section
    /// 2.1).
    fn hat(x: &[f64], d: i32, i: usize) -> f64 {
        orthonormal(x, d).iter().map(|(e, _)| e[i] * e[i]).sum()
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

    /// The others' sums of v phi and of v^2 for band `b` of `scan`, readings `v`.
    fn rest_of(scan: &TrendScan, b: &TrendBand, v: &[f64]) -> ([f64; 3], f64) {
        let (mut r, mut vv) = ([0.0; 3], 0.0);
        for (j, (y, ph)) in v.iter().zip(&scan.phi).enumerate() {
            if !(b.start..b.start + b.k).contains(&j) {
                r.iter_mut().zip(ph).for_each(|(a, p)| *a += y * p);
                vv += y * y;
            }
        }
        (r, vv)
    }

    /// The parabola is taken where the others' quadratic coefficient stands beyond two standard
    /// errors: readings a u^2 outside the end reading of 15, a set so that the coefficient
    /// stands 1.9 and 2.1 standard errors out. The standard error of a least-squares
    /// coefficient with unit noise is 1 / |the part of its column orthogonal to the others'|
    /// (Draper and Smith 1998, section 5.1, from memory), computed here by Gram-Schmidt apart
    /// from the scan's normal equations. Readings that bend but do not lie on a parabola (a far
    /// edge reading 8 thick) keep the line: their residuals about it are beyond the chi-square
    /// 0.001 point on 11 degrees of freedom.
    #[test]
    fn the_parabola_is_taken_past_two_standard_errors_of_bend_and_only_on_a_fit() {
        let scan = TrendScan::new(&index_grid(15));
        let b = scan
            .bands
            .iter()
            .find(|b| b.start == 14 && b.k == 1)
            .unwrap();
        let q = b.quadratic.as_ref().unwrap();
        let u: Vec<f64> = (0..14).map(|i| i as f64 / 7.0 - 1.0).collect();
        let se = 1.0 / orthonormal(&u, 2)[2].1;
        for (sigmas, bent) in [(1.9, false), (2.1, true)] {
            let a = sigmas * se;
            let mut v: Vec<f64> = u.iter().map(|x| a * x * x).collect();
            v.push(0.0);
            let (rest, vv) = rest_of(&scan, b, &v);
            assert_eq!(q.holds(rest, vv), bent, "{sigmas} standard errors");
        }
        let mut edge = vec![0.0; 15];
        edge[0] = 8.0;
        let (rest, vv) = rest_of(&scan, b, &edge);
        let z: f64 = q.z.iter().zip(&rest).map(|(a, c)| a * c).sum();
        assert!(z.abs() > CURVATURE_SIGMAS, "{z}");
        assert!(!q.holds(rest, vv));
        assert!((q.fit_limit - 31.264_133).abs() < 1e-5, "{}", q.fit_limit);
    }

    /// On level unit-normal readings the parabola is taken for 4.54 % of the bands of 15
    /// readings (NumPy 2.4.6 Monte Carlo of the same rule written independently, 1,000,000
    /// profiles: `tests/data/band_scan/scan_null.py`); over 20,000 profiles here the share's
    /// standard error is under 0.1 point (bands of one profile are correlated). A threshold of
    /// 2.1 standard errors gives 3.6 %.
    #[test]
    fn noise_takes_the_parabola_as_often_as_an_independent_monte_carlo() {
        use rand::SeedableRng;
        let scan = TrendScan::new(&index_grid(15));
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(15);
        let (mut taken, mut count) = (0usize, 0usize);
        for _ in 0..20_000 {
            let v: Vec<f64> = (0..15)
                .map(|_| crate::fit::posterior::normal(&mut rng))
                .collect();
            for b in &scan.bands {
                if let Some(q) = &b.quadratic {
                    let (rest, vv) = rest_of(&scan, b, &v);
                    taken += usize::from(q.holds(rest, vv));
                    count += 1;
                }
            }
        }
        let share = taken as f64 / count as f64;
        assert!((share - 0.0454).abs() < 0.004, "{share}");
    }
}
