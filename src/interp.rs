//! Piecewise-linear interpolation shared by profiles, taper tables and time lines.

/// Linear interpolation in sorted (x, y) points; flat beyond the ends. Empty input gives 0.
///
/// ```
/// let p = [(0.0, 1.0), (1.0, 3.0)];
/// assert_eq!(rollsleuth::interp::linear_flat(&p, 0.5), 2.0);
/// assert_eq!(rollsleuth::interp::linear_flat(&p, 9.0), 3.0);
/// ```
pub fn linear_flat(points: &[(f64, f64)], x: f64) -> f64 {
    let n = points.len();
    if n == 0 {
        return 0.0;
    }
    if x <= points[0].0 {
        return points[0].1;
    }
    if x >= points[n - 1].0 {
        return points[n - 1].1;
    }
    let i = points.partition_point(|p| p.0 <= x).clamp(1, n - 1);
    let (x0, y0) = points[i - 1];
    let (x1, y1) = points[i];
    if x1 - x0 <= 0.0 {
        return y1;
    }
    y0 + (y1 - y0) * (x - x0) / (x1 - x0)
}

/// How much a reading's independent noise grows in [`linear_extrap`] at `x`: the root sum of
/// squares of the two readings' weights, never below 1 (inside the readings the lanes share
/// readings, so no lane counts as better than one reading; beyond them the end segment's slope
/// amplifies the noise: 1.58 at half a reading spacing out).
pub fn noise_gain(xs: &[f64], x: f64) -> f64 {
    segment(xs, x).map_or(1.0, |(_, w)| ((1.0 - w).powi(2) + w * w).sqrt().max(1.0))
}

/// The segment of `xs` (sorted) that [`linear_extrap`] reads at `x`: the index of its upper
/// end (the segment runs from `xs[i - 1]` to `xs[i]`; beyond the readings, the end segment) and
/// how far along it `x` lies (below 0 or above 1 beyond the ends), so that the value there is
/// the readings' weights 1 - w and w. `None` with fewer than two readings or a segment of no
/// length.
pub fn segment(xs: &[f64], x: f64) -> Option<(usize, f64)> {
    let n = xs.len();
    if n < 2 {
        return None;
    }
    let i = xs.partition_point(|&p| p <= x).clamp(1, n - 1);
    let (x0, x1) = (xs[i - 1], xs[i]);
    (x1 - x0 > 0.0).then(|| (i, (x - x0) / (x1 - x0)))
}

/// Linear interpolation of `ys` at `xs` (sorted) onto `x`, extrapolating linearly from the end
/// segments; returns the value and whether it extrapolated.
pub fn linear_extrap(xs: &[f64], ys: &[f64], x: f64) -> (f64, bool) {
    let n = xs.len().min(ys.len());
    if n == 0 {
        return (0.0, true);
    }
    if n == 1 {
        return (ys[0], (x - xs[0]).abs() > 0.0);
    }
    let out = x < xs[0] || x > xs[n - 1];
    let i = xs[..n].partition_point(|&p| p <= x).clamp(1, n - 1);
    let (x0, x1, y0, y1) = (xs[i - 1], xs[i], ys[i - 1], ys[i]);
    if x1 - x0 <= 0.0 {
        return (y1, out);
    }
    (y0 + (y1 - y0) * (x - x0) / (x1 - x0), out)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The variance of a weighted sum of independent readings is the sum of the squared weights
    /// times their variance (Bienaymé's formula): at half a spacing beyond the last reading the
    /// weights are -0.5 and 1.5, so the noise grows by sqrt(2.5) = 1.581; inside, never below 1.
    #[test]
    fn noise_gain_grows_beyond_the_readings() {
        let xs = [0.0, 1.0, 2.0];
        assert!((noise_gain(&xs, 2.5) - 2.5f64.sqrt()).abs() < 1e-12);
        assert!((noise_gain(&xs, -0.5) - 2.5f64.sqrt()).abs() < 1e-12);
        assert_eq!(noise_gain(&xs, 0.5), 1.0);
        assert_eq!(noise_gain(&xs, 1.0), 1.0);
        assert_eq!(noise_gain(&[1.0], 5.0), 1.0);
    }
}
