//! The line leg of the caliper band test ([`super::profile_test`]): how far a band of a few
//! adjacent readings stands over the straight line through the readings outside it. A wedge's
//! thick end stands over the readings' median and over its neighbours without any band, but not
//! over that line.

/// Widest band, in readings, that [`over_line`] holds against the line through the readings
/// outside it (a band of one to three readings: a gauge band is a few readings wide, a
/// one-sided thick edge one or two).
const LINE_BAND: usize = 3;

/// The largest excess of a band of 1 to [`LINE_BAND`] adjacent readings over the least-squares
/// straight line (by index) through the readings outside it, in units of that excess's standard
/// deviation in the readings' own: for a band B of k readings and the m others,
/// (mean of B - line at B's mean index) / sqrt(1/k + 1/m + (B's mean index - the others')^2 /
/// their sum of squares about their mean index), the error of predicting a mean of k new
/// readings from a fitted line (Draper and Smith 1998, "Applied Regression Analysis", 3rd ed.,
/// section 3.1, from memory; for k = 1 the deleted residual of Cook and Weisberg 1982). Each is
/// standard normal on a level profile of unit noise, and a band does not move the line it is
/// judged against. At least three readings stay outside a band. 0 when none lies above its line.
pub(super) fn over_line(v: &[f64]) -> f64 {
    thread_local! {
        static SCAN: std::cell::RefCell<LineScan> = const {
            std::cell::RefCell::new(LineScan { n: 0, bands: Vec::new() })
        };
    }
    SCAN.with_borrow_mut(|scan| {
        if scan.n != v.len() {
            *scan = LineScan::new(v.len());
        }
        scan.most(v)
    })
}

/// What [`over_line`] needs of the positions alone, per band of `n` readings (made once per
/// reading count and thread: the noise-only profiles use it 100,000 times).
struct LineScan {
    n: usize,
    bands: Vec<LineBand>,
}

/// One band's geometry: its first reading and width, 1/k, 1/m, the others' mean index, 1 over
/// their sum of squares about it, the band's mean index less theirs, and 1 over the standard
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
    fn new(n: usize) -> Self {
        let sum = |lo: usize, hi: usize, p: i32| (lo..hi).map(|i| (i as f64).powi(p)).sum::<f64>();
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
        LineScan { n, bands }
    }

    fn most(&self, v: &[f64]) -> f64 {
        // running sums of v and i v over the readings before each index
        let (mut py, mut pxy) = (vec![0.0; v.len() + 1], vec![0.0; v.len() + 1]);
        for (i, y) in v.iter().enumerate() {
            py[i + 1] = py[i] + y;
            pxy[i + 1] = pxy[i] + i as f64 * y;
        }
        let (ty, txy) = (py[v.len()], pxy[v.len()]);
        let mut most = 0.0_f64;
        for b in &self.bands {
            let yb = py[b.start + b.k] - py[b.start];
            let xyb = pxy[b.start + b.k] - pxy[b.start];
            let (yr, xyr) = (ty - yb, txy - xyb);
            let slope = (xyr - b.xr * yr) * b.inv_sxx;
            let excess = yb * b.inv_k - yr * b.inv_m - slope * b.dx;
            most = most.max(excess * b.inv_sd);
        }
        most
    }
}
