//! The line leg of the caliper band test ([`super::profile_test`]): how far a band of a few
//! adjacent readings stands over the straight line through the readings outside it. A wedge's
//! thick end stands over the readings' median and over its neighbours without any band, but not
//! over that line.

/// Widest band, in readings, that [`over_line`] holds against the line through the readings
/// outside it (a band of one to three readings: a gauge band is a few readings wide, a
/// one-sided thick edge one or two).
const LINE_BAND: usize = 3;

/// Grid units per reading spacing in [`grid`].
const GRID_UNIT: f64 = 1e6;

/// The readings' positions as the line leg uses them: in units of their mean spacing from the
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

/// The largest excess of a band of 1 to [`LINE_BAND`] adjacent readings `v` over the
/// least-squares straight line (against their positions, on [`grid`] `at`) through the readings
/// outside it, in units of that excess's standard deviation in the readings' own: for a band B
/// of k readings and the m others, (mean of B - line at B's mean position) / sqrt(1/k + 1/m +
/// (B's mean position - the others')^2 / their sum of squares about their mean position), the
/// error of predicting a mean of k new readings from a fitted line (Draper and Smith 1998,
/// "Applied Regression Analysis", 3rd ed., section 3.1, from memory; for k = 1 the deleted
/// residual of Cook and Weisberg 1982). Each is standard normal on a level profile of unit
/// noise, and a band does not move the line it is judged against. At least three readings stay
/// outside a band. 0 when none lies above its line.
pub(super) fn over_line(v: &[f64], at: &[i64]) -> f64 {
    thread_local! {
        static SCAN: std::cell::RefCell<LineScan> = const {
            std::cell::RefCell::new(LineScan {
                at: Vec::new(),
                x: Vec::new(),
                bands: Vec::new(),
                sums: Vec::new(),
            })
        };
    }
    SCAN.with_borrow_mut(|scan| {
        if scan.at != at {
            *scan = LineScan::new(at);
        }
        scan.most(v)
    })
}

/// What [`over_line`] needs of the positions alone, per band (made once per grid and thread:
/// the noise-only profiles use it 100,000 times).
struct LineScan {
    at: Vec<i64>,
    /// Positions in reading spacings.
    x: Vec<f64>,
    bands: Vec<LineBand>,
    /// Scratch: running sums of v and x v over the readings before each index.
    sums: Vec<(f64, f64)>,
}

/// One band's geometry: its first reading and width, 1/k, 1/m, the others' mean position, 1 over
/// their sum of squares about it, the band's mean position less theirs, and 1 over the standard
/// deviation factor.
struct LineBand {
    start: usize,
    k: usize,
    inv_k: f64,
    inv_m: f64,
    xr: f64,
    inv_sxx: f64,
    dx: f64,
    inv_sd: f64,
}

impl LineScan {
    fn new(at: &[i64]) -> Self {
        let x: Vec<f64> = at.iter().map(|&g| g as f64 / GRID_UNIT).collect();
        let n = x.len();
        let sum = |lo: usize, hi: usize, p: i32| x[lo..hi].iter().map(|v| v.powi(p)).sum::<f64>();
        let mut bands = Vec::new();
        for k in 1..=LINE_BAND.min(n.saturating_sub(3)) {
            for start in 0..=n - k {
                let (kf, m) = (k as f64, (n - k) as f64);
                let xb = sum(start, start + k, 1) / kf;
                let xr = (sum(0, n, 1) - kf * xb) / m;
                let sxx = sum(0, n, 2) - sum(start, start + k, 2) - m * xr * xr;
                let dx = xb - xr;
                bands.push(LineBand {
                    start,
                    k,
                    inv_k: 1.0 / kf,
                    inv_m: 1.0 / m,
                    xr,
                    inv_sxx: 1.0 / sxx,
                    dx,
                    inv_sd: 1.0 / (1.0 / kf + 1.0 / m + dx * dx / sxx).sqrt(),
                });
            }
        }
        LineScan {
            at: at.to_vec(),
            x,
            bands,
            sums: Vec::with_capacity(n + 1),
        }
    }

    fn most(&mut self, v: &[f64]) -> f64 {
        let p = &mut self.sums;
        p.clear();
        p.push((0.0, 0.0));
        for (y, x) in v.iter().zip(&self.x) {
            let (sy, sxy) = p[p.len() - 1];
            p.push((sy + y, sxy + x * y));
        }
        let (ty, txy) = p[p.len() - 1];
        let mut most = 0.0_f64;
        for b in &self.bands {
            let yb = p[b.start + b.k].0 - p[b.start].0;
            let xyb = p[b.start + b.k].1 - p[b.start].1;
            let (yr, xyr) = (ty - yb, txy - xyb);
            let slope = (xyr - b.xr * yr) * b.inv_sxx;
            let excess = yb * b.inv_k - yr * b.inv_m - slope * b.dx;
            most = most.max(excess * b.inv_sd);
        }
        most
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Evenly spaced positions are the index grid exactly (shared noise-only profiles); a
    /// straight wedge read at uneven positions (60 mm apart at the front, 270 mm at the back)
    /// lies on its line: no band, where by reading number its thick end stands out; one reading
    /// d above it at the back end stands d sqrt(1 - h) over the line through all of them, the
    /// deleted residual over its standard deviation (Cook and Weisberg 1982, section 2.2).
    #[test]
    fn the_line_is_fitted_against_the_positions() {
        let even: Vec<f64> = (0..15).map(|i| 0.06 + 0.12 * i as f64).collect();
        assert_eq!(grid(&even, 15), index_grid(15));
        let uneven: Vec<f64> = (0..12)
            .map(|i| 0.06 * i as f64)
            .chain((1..=4).map(|i| 0.66 + 0.27 * i as f64))
            .collect();
        let wedge: Vec<f64> = uneven.iter().map(|x| 4.0 * x).collect();
        let at = grid(&uneven, uneven.len());
        // (positions are kept to a millionth of a spacing)
        assert!(over_line(&wedge, &at) < 1e-5);
        let by_number = over_line(&wedge, &index_grid(uneven.len()));
        assert!(by_number > 1.0, "{by_number}");
        let mut band = wedge.clone();
        *band.last_mut().unwrap() += 6.0;
        let x: Vec<f64> = at.iter().map(|&g| g as f64 / GRID_UNIT).collect();
        let xm = x.iter().sum::<f64>() / x.len() as f64;
        let sxx: f64 = x.iter().map(|v| (v - xm).powi(2)).sum();
        let h = 1.0 / x.len() as f64 + (x[x.len() - 1] - xm).powi(2) / sxx;
        let d = over_line(&band, &at);
        assert!((d - 6.0 * (1.0 - h).sqrt()).abs() < 1e-6, "{d}");
    }
}
