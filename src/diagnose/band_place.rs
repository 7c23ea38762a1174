//! Where a caliper band stands, and which lanes carry it. The band test
//! ([`super::profile_test::band_test`]) judges a profile by its most outlying reading; a finding
//! may stand on that test only where its own lanes carry a reading that stands out, so a band at
//! one place does not lend its significance to a pattern of noise at another.

use super::noise::uniform_lanes;
use super::profile_test::{caliper_readings, NEIGHBOURS};
use super::unevenness::unevenness_chance;
use crate::case::{Case, Measure};
use crate::lanes::{held, Lanes};

/// What of the lanes' calipers a re-run without the profiles noise can make keeps.
#[derive(Debug, Clone, PartialEq)]
pub(super) enum Flat {
    /// The calipers as measured.
    Keep,
    /// Every caliper profile made uniform.
    All,
    /// The band test's caliper profile made uniform but for these readings (indices): the bands
    /// that stand out; the level of the rest is their mean.
    Except(Vec<usize>),
}

/// The diagnosed `lanes` with the calipers made uniform as `calipers` says and the web's tension
/// and moisture profiles too where `web`; the rest as diagnosed (the same lanes). Without a
/// caliper profile there are no readings to keep apart, and [`Flat::Except`] keeps the calipers.
pub(super) fn flat_lanes(case: &Case, lanes: &Lanes, calipers: &Flat, web: bool) -> Lanes {
    let profile = case.densest(Measure::Caliper).is_some();
    let (mut l0, keep) = match calipers {
        Flat::Except(keep) if profile => (crate::lanes::build(&all_but(case, keep, web)), false),
        Flat::All => (uniform_lanes(case, lanes, None), false),
        Flat::Keep | Flat::Except(_) => (uniform_lanes(case, lanes, None), true),
    };
    // what is not to be made uniform is put back from the diagnosed lanes
    for (lane, own) in l0.lanes.iter_mut().zip(&lanes.lanes) {
        if keep {
            (lane.caliper_m, lane.caliper_deviation) = (own.caliper_m, own.caliper_deviation);
        }
        if !web {
            (lane.web_strain, lane.winding_moisture_pct) =
                (own.web_strain, own.winding_moisture_pct);
        }
    }
    if keep {
        l0.mean_caliper_m = lanes.mean_caliper_m;
    }
    l0
}

/// `case` with the band test's caliper profile ([`caliper_readings`]: the densest) at the mean of
/// its readings but `keep` (indices), which are kept; any other caliper profile, and the
/// tension and moisture profiles where `web`, at their means.
fn all_but(case: &Case, keep: &[usize], web: bool) -> Case {
    let mut c = case.clone();
    let densest = case.densest(Measure::Caliper);
    for (p, own) in c.profiles.iter_mut().zip(&case.profiles) {
        let kept: &[usize] = match p.what {
            Measure::Caliper if densest.is_some_and(|d| std::ptr::eq(own, d)) => keep,
            Measure::Caliper => &[],
            Measure::Tension | Measure::Moisture if web => &[],
            _ => continue,
        };
        let rest: Vec<f64> = (0..p.values.len())
            .filter(|i| !kept.contains(i))
            .map(|i| p.values[i])
            .collect();
        let m = rest.iter().sum::<f64>() / rest.len().max(1) as f64;
        for (i, v) in p.values.iter_mut().enumerate() {
            if !kept.contains(&i) {
                *v = m;
            }
        }
    }
    c
}

/// The chance that noise alone makes the band test's caliper readings but `standing` (indices)
/// as uneven as they are, by their spread, wedge and crown ([`unevenness_chance`]; none of them
/// stands out over its neighbours, by what `standing` leaves), with one-sigma repeatability
/// `rep` (m). 1 with fewer than three left.
pub(super) fn rest_unevenness(case: &Case, lanes: &Lanes, rep: f64, standing: &[usize]) -> f64 {
    let (readings, positions) = caliper_readings(case, lanes);
    let rest = |v: &[f64]| -> Vec<f64> {
        (0..v.len())
            .filter(|i| !standing.contains(i))
            .map(|i| v[i])
            .collect()
    };
    let (r, p) = (rest(&readings), rest(&positions));
    if r.len() < 3 {
        return 1.0;
    }
    unevenness_chance(&r, &p, rep, 1.0)
}

/// Each reading's excess over the median of its [`NEIGHBOURS`] nearest readings by index (all
/// the others when there are fewer), in the readings' unit: the thick leg of the band test reads
/// the largest of these. The window of [`NEIGHBOURS`] + 1 readings around a reading is moved
/// inward at the ends, and its neighbours are the window without it.
pub(super) fn thick_excesses(v: &[f64]) -> Vec<f64> {
    let n = v.len();
    let k = NEIGHBOURS.min(n.saturating_sub(1));
    if k == 0 {
        return vec![0.0; n];
    }
    let mut w = Vec::with_capacity(k);
    (0..n)
        .map(|i| {
            let lo = i.saturating_sub(k / 2).min(n - 1 - k);
            w.clear();
            w.extend((lo..=lo + k).filter(|&j| j != i).map(|j| v[j]));
            w.sort_by(f64::total_cmp);
            let med = if k % 2 == 1 {
                w[k / 2]
            } else {
                0.5 * (w[k / 2 - 1] + w[k / 2])
            };
            v[i] - med
        })
        .collect()
}

/// Indices of the readings (`excess` in repeatability units, from [`thick_excesses`]) that stand
/// out at the thick leg's threshold `threshold` (same units); the most outlying one too when the
/// whole test passed (`passed`), so a band that stands is placed even where the Monte Carlo
/// quantile and the chance differ by a draw.
pub(super) fn standing(excess: &[f64], threshold: f64, passed: bool) -> Vec<usize> {
    let top = (0..excess.len()).max_by(|&a, &b| excess[a].total_cmp(&excess[b]));
    (0..excess.len())
        .filter(|&i| excess[i] >= threshold || (passed && Some(i) == top))
        .collect()
}

/// The lanes that carry any of the readings `at` (indices into `positions`, m): a lane holding
/// readings carries those it holds ([`held`]); a lane holding none takes the profile
/// interpolated (or extrapolated) at its centre, and carries the two readings it reads there.
pub(super) fn carriers(lanes: &Lanes, positions: &[f64], at: &[usize]) -> Vec<usize> {
    if at.is_empty() || positions.is_empty() {
        return Vec::new();
    }
    let e = lanes.edges_m();
    (0..lanes.lanes.len())
        .filter(|&i| {
            let mut read = held(positions, &e, i);
            if read.is_empty() {
                read = bracket(positions, lanes.lanes[i].position_m);
            }
            read.iter().any(|j| at.contains(j))
        })
        .collect()
}

/// The two readings (indices into sorted `positions`) a profile interpolated at `x` reads: the
/// ones either side, or the end segment's two beyond the ends (one where there is one).
fn bracket(positions: &[f64], x: f64) -> Vec<usize> {
    let n = positions.len();
    if n < 2 {
        return (0..n).collect();
    }
    let right = positions.partition_point(|p| *p <= x).clamp(1, n - 1);
    vec![right - 1, right]
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The per-reading excesses are the thick statistic's terms: their largest is the statistic
    /// (the same definition, a reading over the median of its eight nearest by index; the
    /// sample median as the middle order statistic).
    #[test]
    fn the_largest_excess_is_the_thick_statistic() {
        // 9 readings: the window is the whole profile, the neighbours the other eight
        let v = [0.0, 1.0, 0.0, 0.0, 5.0, 0.0, -1.0, 0.0, 0.0];
        let e = thick_excesses(&v);
        // the eight others sorted: -1 0 0 0 0 0 0 1, median (0 + 0) / 2 = 0
        assert_eq!(e[4], 5.0);
        // reading 1: others -1 0 0 0 0 0 0 5, median 0
        assert_eq!(e[1], 1.0);
        // a straight slope of 12: the top end stands over the eight inward of it by 4.5 steps
        let slope: Vec<f64> = (0..12).map(f64::from).collect();
        let s = thick_excesses(&slope);
        assert_eq!(s.iter().copied().fold(f64::MIN, f64::max), 4.5);
        assert_eq!(standing(&e, 3.0, false), vec![4]);
        assert_eq!(standing(&e, 9.0, true), vec![4]);
        assert!(standing(&e, 9.0, false).is_empty());
    }

    /// Interpolation reads the readings either side; beyond the ends the end segment.
    #[test]
    fn a_lane_between_readings_reads_the_two_either_side() {
        let p = [0.1, 0.2, 0.3];
        assert_eq!(bracket(&p, 0.25), vec![1, 2]);
        assert_eq!(bracket(&p, 0.01), vec![0, 1]);
        assert_eq!(bracket(&p, 0.39), vec![1, 2]);
        assert_eq!(bracket(&[0.1], 0.5), vec![0]);
    }
}
