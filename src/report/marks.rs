//! Where a series' markers go: spread evenly along the x axis, so that a curve whose points
//! crowd somewhere (the wound-in stress, with its refined zone under the surface) is not marked
//! only there.

/// About `count` of `points`, one nearest (in x) to each of `count` evenly spaced x positions
/// across the points' x range, the positions shifted by a third of their spacing for each of
/// `stagger` (mod 3), so that the markers of coinciding curves do not hide each other. Every
/// point where there are no more than `count`, or no x range to spread over; a point nearest two
/// positions is given once. Points whose x is not finite are never picked.
pub fn spread(points: &[(f64, f64)], count: usize, stagger: usize) -> Vec<(f64, f64)> {
    let finite = || points.iter().filter(|p| p.0.is_finite());
    let lo = finite().map(|p| p.0).fold(f64::INFINITY, f64::min);
    let hi = finite().map(|p| p.0).fold(f64::NEG_INFINITY, f64::max);
    if points.len() <= count || count == 0 || hi <= lo {
        return points.to_vec();
    }
    let dx = (hi - lo) / count as f64;
    let shift = ((stagger % 3) as f64 + 0.5) / 3.0 * dx;
    let mut out: Vec<usize> = Vec::with_capacity(count);
    for k in 0..count {
        let x = lo + shift + k as f64 * dx;
        let nearest = (points.iter().enumerate())
            .filter(|(_, p)| p.0.is_finite())
            .min_by(|a, b| (a.1 .0 - x).abs().total_cmp(&(b.1 .0 - x).abs()))
            .map(|(i, _)| i);
        if let Some(i) = nearest.filter(|i| !out.contains(i)) {
            out.push(i);
        }
    }
    out.into_iter().map(|i| points[i]).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn markers_are_spread_in_x_however_the_points_crowd() {
        // 100 points on 0..1 and 900 crowded on 1..1.01: by index, 9 of 10 markers fell in the
        // crowd; spread in x, one marker per tenth of the range
        let mut pts: Vec<(f64, f64)> = (0..100).map(|i| (i as f64 / 100.0, 0.0)).collect();
        pts.extend((0..900).map(|i| (1.0 + i as f64 * 1e-5, 1.0)));
        let m = spread(&pts, 10, 0);
        assert_eq!(m.len(), 10);
        let range = 1.0 + 899.0 * 1e-5;
        for (k, p) in m.iter().enumerate() {
            let want = (k as f64 + 1.0 / 6.0) * range / 10.0;
            assert!(
                (p.0 - want).abs() <= 0.01,
                "marker {k} at {} not near {want}",
                p.0
            );
        }
    }

    #[test]
    fn staggered_series_take_other_points_and_short_series_keep_all() {
        let pts: Vec<(f64, f64)> = (0..=300).map(|i| (i as f64, 0.0)).collect();
        let (a, b) = (spread(&pts, 8, 0), spread(&pts, 8, 1));
        assert!(a.iter().all(|p| !b.contains(p)));
        assert_eq!(spread(&pts[..5], 8, 2), pts[..5].to_vec());
        let flat = vec![(2.0, 1.0); 20];
        assert_eq!(spread(&flat, 8, 0).len(), 20);
        let with_nan = [(f64::NAN, 0.0), (0.0, 0.0), (1.0, 0.0), (2.0, 0.0)];
        assert!(spread(&with_nan, 2, 0).iter().all(|p| p.0.is_finite()));
    }
}
