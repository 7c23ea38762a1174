//! The web around a lane: the cross-width window that local features (a lane's length at
//! unwind or its diameter at winding over the web around it) judge a lane against, fixed in
//! metres so that the lane count, a resolution choice, does not change them.

use crate::lanes::Lanes;

/// Inner radius of the cross-width window a lane is judged against, m. A ridge or a baggy lane is
/// a band some tens of mm to about 150 mm wide (common practice), so web within 75 mm of a lane's
/// centre may be the band itself and is not its baseline.
pub const BASELINE_INNER_M: f64 = 0.075;

/// Outer radius of that window, m: a band is judged against the web a few hundred mm around it
/// (common practice), 300 mm each side; near a roll end the window holds the web on one side.
pub const BASELINE_OUTER_M: f64 = 0.300;

/// Baseline of lane `k` for a per-lane value `v` on lanes spanning `spans` (front and back edge
/// of each lane, m, sorted from the front): the web from [`BASELINE_INNER_M`] to
/// [`BASELINE_OUTER_M`] away from lane `k`'s centre on each side, each other lane weighted by the
/// width of that window it covers (a width-weighted mean of the lanes in the window, lanes cut by
/// its bounds counted for their part); the baseline is the mean of the two sides, each side
/// counting equally whatever width of web it holds, so a straight slope across the width is
/// neither a peak nor a dip and a lane next to a long edge strip is judged against it as much as
/// against the web inboard. The window is fixed in metres, so the baseline does not depend on how
/// many lanes the width is cut into. A side whose window no other lane reaches (near a
/// roll end, next to a gap left by lanes slit out, or lanes wider than the window) is the
/// adjacent lane on that side; a side with no lane at all (the roll end) does not count, so an
/// end lane is judged against one side. None for a lone lane.
///
/// With both sides, the excess v - baseline is min(v - mean of the sides, 2 (v - higher side)):
/// a band on level web or on a gentle slope (rising above the higher side by at least half its
/// excess) keeps its excess over the mean; the lane beside a trough on one side (level with the
/// web on its other side) has none; a straight slope counts as a dip of twice the slope's half
/// difference (common-practice reading of a band: it stands above the web on both sides).
pub fn baseline(spans: &[(f64, f64)], v: &[f64], k: usize) -> Option<f64> {
    let c = 0.5 * (spans[k].0 + spans[k].1);
    let side = |lo: f64, hi: f64, adjacent: Option<usize>| {
        let (sw, swv) = (0..spans.len())
            .filter(|&j| j != k)
            .fold((0.0, 0.0), |(sw, swv), j| {
                let w = (spans[j].1.min(hi) - spans[j].0.max(lo)).max(0.0);
                (sw + w, swv + w * v[j])
            });
        if sw > 0.0 {
            Some(swv / sw)
        } else {
            adjacent.map(|j| v[j])
        }
    };
    let front = side(c - BASELINE_OUTER_M, c - BASELINE_INNER_M, k.checked_sub(1));
    let back = side(
        c + BASELINE_INNER_M,
        c + BASELINE_OUTER_M,
        (k + 1 < spans.len()).then_some(k + 1),
    );
    match (front, back) {
        // a band stands above the web on both sides: its excess over the mean of the sides is
        // kept only while it rises above the higher side by half of it, so a shoulder beside
        // a trough (an edge dried short) is no peak, and a straight slope is a dip
        (Some(a), Some(b)) => Some((0.5 * (a + b)).max(2.0 * a.max(b) - v[k])),
        (a, b) => a.or(b),
    }
}

/// How far one edge is long and the other not: the larger excess of an end lane (the outermost
/// lane each side, from five lanes up) over the web 75-300 mm inward of it ([`baseline`], one
/// side), less the other end lane's excess where that is long too, in the unit of `v`. A long
/// edge on one side, which the inner lanes' local peak leaves out; both edges long alike (thick
/// edges, a dish) is the centre-against-edges pattern, not this. 0 below five lanes (every lane
/// is inner there).
pub fn end_excess(spans: &[(f64, f64)], v: &[f64]) -> f64 {
    if v.len() < 5 {
        return 0.0;
    }
    let (a, b) = end_overs(spans, v);
    a.max(b) - a.min(b).max(0.0)
}

/// Centre `c` minus the two edges `front` and `back` as a two-sided pattern: their mean where
/// both edges lie on the same side of the centre (a baggy centre stands above both edges, and
/// baggy edges both stand above the centre); 0 where they lie on opposite sides of it or level
/// with it (a wedge, or one long edge and one short: the side-to-side and one-edge features speak
/// for those). In the unit of the inputs. (The edge nearer the centre instead of the mean lost a
/// 4 % dish whose edge lanes' creep the data do not identify: one edge read 0.07 mm/m long, the
/// other 0.46.)
pub fn centre_minus_both(c: f64, front: f64, back: f64) -> f64 {
    let (a, b) = (c - front, c - back);
    if (a > 0.0 && b > 0.0) || (a < 0.0 && b < 0.0) {
        0.5 * (a + b)
    } else {
        0.0
    }
}

/// Excess of the first and of the last lane over the web inward of it ([`baseline`]; 0 where
/// there is none), in the unit of `v`.
pub fn end_overs(spans: &[(f64, f64)], v: &[f64]) -> (f64, f64) {
    let over = |k: usize| baseline(spans, v, k).map_or(0.0, |m| v[k] - m);
    (over(0), over(v.len().saturating_sub(1)))
}

/// Front and back edge of every lane, m.
pub fn spans(lanes: &Lanes) -> Vec<(f64, f64)> {
    lanes.lanes.iter().map(|l| (l.left_m, l.right_m)).collect()
}

/// The lanes that may stand out locally: all but the outermost lane at each end from five lanes
/// up (every lane below). An end lane is judged against the web on one side only, and is often a
/// narrow edge strip whose profile values are extrapolated beyond the outermost reading; the edge
/// features speak for the ends.
pub fn inner_lanes(n: usize) -> std::ops::Range<usize> {
    if n >= 5 {
        1..n - 1
    } else {
        0..n
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// `n` equal lanes across `width` m.
    fn equal(n: usize, width: f64) -> Vec<(f64, f64)> {
        let w = width / n as f64;
        (0..n).map(|i| (i as f64 * w, (i + 1) as f64 * w)).collect()
    }

    fn centres(s: &[(f64, f64)]) -> Vec<f64> {
        s.iter().map(|(a, b)| 0.5 * (a + b)).collect()
    }

    /// The mean of a straight line over two intervals placed symmetrically about a point is its
    /// value there, so the mean of the sides is a lane's own value; but the line rises above it
    /// on one side, so no lane of a straight slope stands out (it is a dip), at any lane count.
    #[test]
    fn a_straight_line_is_no_peak_at_any_lane_count() {
        for n in [8, 16, 40, 100] {
            let s = equal(n, 1.6);
            let x = centres(&s);
            for k in 0..n {
                if x[k] - BASELINE_OUTER_M > 0.0 && x[k] + BASELINE_OUTER_M < 1.6 {
                    let b = baseline(&s, &x, k).unwrap();
                    assert!(b > x[k] + 0.1, "{n} lanes, lane {k}: {b} vs {}", x[k]);
                }
            }
        }
    }

    /// Web dried short at one end (2 below the rest) and level elsewhere: the lanes beside the
    /// short strip are level with the web on their other side, so none of them stands out,
    /// although the mean of their two sides lies below them.
    #[test]
    fn a_shoulder_beside_a_trough_is_no_peak() {
        for n in [16, 40] {
            let s = equal(n, 1.6);
            let x = centres(&s);
            let v: Vec<f64> = x
                .iter()
                .map(|&c| if c < 0.1 { -2.0 } else { 0.0 })
                .collect();
            for k in 1..n - 1 {
                let b = baseline(&s, &v, k).unwrap();
                assert!(
                    v[k] - b <= 1e-12,
                    "{n} lanes, lane {k}: excess {}",
                    v[k] - b
                );
            }
        }
    }

    /// A 100 mm band 1 higher than the web: the lane at its centre stands out by the full 1 at
    /// any count whose lanes resolve it, since the band lies inside the inner radius; the web
    /// next to a roll end is judged on the one side it has.
    #[test]
    fn a_band_stands_out_by_its_height_whatever_the_lane_width() {
        for n in [16, 32, 80, 160] {
            let s = equal(n, 1.6);
            let x = centres(&s);
            let v: Vec<f64> = x
                .iter()
                .map(|&c| f64::from((c - 0.65).abs() < 0.05))
                .collect();
            let k = (0..n)
                .min_by(|&a, &b| (x[a] - 0.65).abs().total_cmp(&(x[b] - 0.65).abs()))
                .unwrap();
            for i in [k, 0] {
                let b = baseline(&s, &v, i).unwrap();
                assert!(b.abs() < 1e-9, "{n} lanes, lane {i}: {b}");
            }
        }
        assert_eq!(baseline(&[(0.0, 1.0)], &[1.0], 0), None);
        // lanes wider than the window: the adjacent lane each side
        let s = equal(3, 2.4);
        assert_eq!(baseline(&s, &[1.0, 5.0, 3.0], 1), Some(2.0));
    }

    /// A baggy centre or baggy edges stands on both edges: their mean where both lie on one side
    /// of the centre, and none where they lie on opposite sides (a wedge, one long edge and one
    /// short) or one is level with it (definition of the feature).
    #[test]
    fn centre_against_both_edges() {
        assert_eq!(centre_minus_both(1.0, 0.0, 0.25), 0.875);
        assert_eq!(centre_minus_both(0.0, 1.0, 0.5), -0.75);
        assert_eq!(centre_minus_both(0.0, 1.3, -0.2), 0.0);
        assert_eq!(centre_minus_both(0.0, -0.4, 0.9), 0.0);
        assert_eq!(centre_minus_both(0.0, 0.0, 0.9), 0.0);
        assert_eq!(centre_minus_both(0.2, -0.3, -0.3), 0.5);
    }

    /// One edge 1 long over level web is long by 1 at any lane count (the web inward of the edge
    /// lane is level); both edges long alike is no one-sided edge; a short other edge (dried) does
    /// not add to it; under five lanes every lane is inner (definitions of the feature).
    #[test]
    fn one_long_edge_counts_and_two_alike_do_not() {
        for n in [8, 16, 40] {
            let s = equal(n, 1.6);
            let mut v = vec![0.0; n];
            v[n - 1] = 1.0;
            assert!((end_excess(&s, &v) - 1.0).abs() < 1e-12, "{n} lanes");
            v[0] = 1.0;
            assert!(end_excess(&s, &v).abs() < 1e-12, "{n} lanes");
            v[0] = -2.0;
            assert!((end_excess(&s, &v) - 1.0).abs() < 1e-12, "{n} lanes");
        }
        assert_eq!(end_excess(&equal(4, 1.6), &[0.0, 0.0, 0.0, 3.0]), 0.0);
    }
}
