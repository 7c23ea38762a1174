//! Tests on the measured profiles themselves, without winding: is a profile's most outlying
//! reading more than its repeatability explains? The caliper band test, and the same test of a
//! tension or moisture profile at winding for the rules that rest on the web's own profile
//! (Monte Carlo over noise-only profiles with as many readings, cheap). Whether the caliper
//! profile is uneven in any way is [`super::unevenness`]'s.

use super::band_place;
use super::noise::{MOISTURE_REPEATABILITY_PCT, TENSION_REPEATABILITY};
use super::trend_scan;
use crate::case::{Case, Measure};
use crate::fit::posterior;
use crate::lanes::Lanes;
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use std::collections::BTreeMap;
use std::sync::{Arc, Mutex};

/// Noise-only profiles drawn for each test (enough that a chance ten times below the test's
/// level is resolved, see `confidence`'s clear margin).
pub const BAND_DRAWS: usize = 100_000;

/// The outlier test of one profile: the largest deviation of a reading from the readings'
/// median in units of the repeatability, against the same statistic of [`BAND_DRAWS`]
/// noise-only profiles with as many readings. A single high reading counts at its own size,
/// where a range over lanes would add the noise of the lowest lane and of lanes extrapolated to
/// the edges.
pub(super) struct BandTest {
    /// Monte Carlo chance that noise alone reaches the observed statistic, (count + 1) /
    /// (draws + 1) (Davison and Hinkley 1997, eq. 4.11).
    pub(super) chance: f64,
    /// Quantile of the noise statistic at the test's level, repeatability units.
    pub(super) threshold_sigmas: f64,
    /// The lanes that carry a reading standing out at the test's level (the caliper band test
    /// only, [`super::band_place`]): a rule resting on the calipers may stand on this test only
    /// for a finding on one of them. Empty where no reading stands out.
    pub(super) carriers: Vec<usize>,
    /// Those readings (indices into [`caliper_readings`]).
    pub(super) standing: Vec<usize>,
}

/// Which readings an outlier test looks for.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub(super) enum Outlying {
    /// Either way (a tension or moisture streak: a slack or a tight lane, a wet or a dry one).
    Either,
    /// Thick against its neighbours: each reading over the median of its [`NEIGHBOURS`] nearest
    /// readings by index, the largest of them. A caliper band builds a hard ring, a ridge and a
    /// long lane; a thin reading makes none of those. Against its neighbours, not the whole
    /// profile's median: a crowned or dished profile moves slowly from reading to reading, and
    /// its centre or its edges stand far from the median without any band (a crown is judged by
    /// [`super::crown`]).
    Thick,
    /// Thick against the trend through the other readings, against their positions: the
    /// largest excess of a band of one to three readings over the least-squares line through
    /// those outside it, or their quadratic where they are bent beyond noise
    /// ([`super::trend_scan::over_trend`]). A wedge's thick end and a dish's thick edges stand
    /// over the readings' median and over their neighbours (all on their thin side) without any
    /// band, but not over the trend through the others.
    ThickOverTrend,
}

/// Fewest readings whose [`Outlying::ThickOverTrend`] statistic is taken over a trend; fewer are
/// held against their median (of four, a band of one leaves three for the line, and an end
/// reading's excess over it is barely larger than the line's own error there).
const TREND_READINGS: usize = 5;

/// Readings a reading is held against in the thick band test (four each side inside the profile;
/// the nearest eight at its ends): enough that their median is not much noisier than the whole
/// profile's, few enough that a crown hardly bends it (a 3 % crown read at 15 positions: the
/// centre reading stands 0.13 of the crown over its neighbours' median).
pub const NEIGHBOURS: usize = 8;

/// Median of `v` (not empty); `v` is reordered.
fn median_of(v: &mut [f64]) -> f64 {
    let n = v.len();
    let (below, upper, _) = v.select_nth_unstable_by(n / 2, f64::total_cmp);
    let upper = *upper;
    if n % 2 == 1 {
        upper
    } else {
        0.5 * (below.iter().copied().fold(f64::NEG_INFINITY, f64::max) + upper)
    }
}

/// The largest excess of a reading over the median of its [`NEIGHBOURS`] nearest readings by
/// index (all the others when there are fewer), 0 when none exceeds it. `buf` is scratch.
///
/// The windows of [`NEIGHBOURS`] + 1 readings around each reading (moved inward at the ends)
/// slide by one reading at a time, so one sorted window is kept: a step takes one reading out and
/// puts one in, and each reading's neighbours are the window without it (this runs 100,000
/// times a reading for the test's noise-only profiles).
fn thick_statistic(v: &[f64], buf: &mut Vec<f64>) -> f64 {
    let n = v.len();
    let k = NEIGHBOURS.min(n.saturating_sub(1));
    if k == 0 {
        return 0.0;
    }
    let rank = |w: &[f64], x: f64| w.iter().position(|y| y.to_bits() == x.to_bits());
    let (mut most, mut at): (f64, Option<usize>) = (0.0, None);
    for i in 0..n {
        let lo = i.saturating_sub(k / 2).min(n - 1 - k);
        match at {
            Some(prev) if prev == lo => {}
            Some(prev) => {
                // the window moved on by one: v[prev] out, v[lo + k] in
                if let Some(r) = rank(buf, v[prev]) {
                    buf.remove(r);
                }
                let x = v[lo + k];
                let p = buf.partition_point(|y| y.total_cmp(&x).is_lt());
                buf.insert(p, x);
            }
            None => {
                buf.clear();
                buf.extend_from_slice(&v[lo..=lo + k]);
                buf.sort_by(f64::total_cmp);
            }
        }
        at = Some(lo);
        // the neighbours' median: the window's order statistics with v[i] taken out
        let r = rank(buf, v[i]).unwrap_or(buf.len());
        let nth = |j: usize| if j < r { buf[j] } else { buf[j + 1] };
        let med = if k % 2 == 1 {
            nth(k / 2)
        } else {
            0.5 * (nth(k / 2 - 1) + nth(k / 2))
        };
        most = most.max(v[i] - med);
    }
    most
}

/// Largest |reading - median of the readings| ([`Outlying::Either`]), a reading's excess over
/// its neighbours ([`Outlying::Thick`]), in the readings' unit, or over the trend through the
/// others ([`Outlying::ThickOverTrend`], in units of its standard deviation: over their median,
/// in the readings' unit, below [`TREND_READINGS`]; it takes `v` in units of the readings'
/// repeatability, as its choice of trend reads them). `buf` is scratch.
fn band_statistic(v: &[f64], at: &[i64], buf: &mut Vec<f64>, way: Outlying) -> f64 {
    if v.is_empty() {
        return 0.0;
    }
    if way == Outlying::Thick {
        return thick_statistic(v, buf);
    }
    if way == Outlying::ThickOverTrend && v.len() >= TREND_READINGS {
        return super::trend_scan::over_trend(v, at);
    }
    buf.clear();
    buf.extend_from_slice(v);
    let med = median_of(buf);
    if way == Outlying::ThickOverTrend {
        return v.iter().map(|x| x - med).fold(0.0, f64::max);
    }
    v.iter().map(|x| (x - med).abs()).fold(0.0, f64::max)
}

/// Noise statistics kept per readings' grid and way.
type Kept = BTreeMap<(Vec<i64>, Outlying), Arc<[f64]>>;

/// Grids whose noise statistics are kept for the rest of the process.
const KEPT_COUNTS: usize = 64;

/// The band statistic (`way`) of [`BAND_DRAWS`] noise-only profiles of standard normal readings
/// on grid `at` ([`trend_scan::grid`]; only the trend leg reads the positions, and only the
/// reading count seeds the draws), sorted. A function of `at` and `way` alone, so it is drawn
/// once per grid, way and process and shared by every profile, test and roll (evenly spaced
/// readings of a count share one grid).
fn null_statistics(at: &[i64], way: Outlying) -> Arc<[f64]> {
    static KEPT: Mutex<Kept> = Mutex::new(BTreeMap::new());
    let n = at.len();
    // the either-way statistic does not read the positions
    let at: Vec<i64> = match way {
        Outlying::Either => trend_scan::index_grid(n),
        Outlying::Thick | Outlying::ThickOverTrend => at.to_vec(),
    };
    let kept = KEPT
        .lock()
        .unwrap_or_else(|e| e.into_inner())
        .get(&(at.clone(), way))
        .cloned();
    if let Some(v) = kept {
        return v;
    }
    // the two thick statistics are drawn together, from the same noise-only profiles
    let (label, ways): (&str, &[Outlying]) = match way {
        Outlying::Either => ("band statistic", &[Outlying::Either]),
        Outlying::Thick | Outlying::ThickOverTrend => (
            "thick band statistics",
            &[Outlying::Thick, Outlying::ThickOverTrend],
        ),
    };
    let mut rng = ChaCha8Rng::seed_from_u64(posterior::seed_for(label, n));
    let (mut draw, mut buf) = (vec![0.0; n], Vec::with_capacity(n));
    let mut noise: Vec<Vec<f64>> = vec![Vec::with_capacity(BAND_DRAWS); ways.len()];
    for _ in 0..BAND_DRAWS {
        normals(&mut rng, &mut draw);
        for (v, w) in noise.iter_mut().zip(ways) {
            v.push(band_statistic(&draw, &at, &mut buf, *w));
        }
    }
    let mut m = KEPT.lock().unwrap_or_else(|e| e.into_inner());
    let mut wanted = None;
    for (mut v, w) in noise.into_iter().zip(ways) {
        v.sort_by(f64::total_cmp);
        let v: Arc<[f64]> = v.into();
        if m.len() < KEPT_COUNTS {
            m.entry((at.clone(), *w)).or_insert_with(|| Arc::clone(&v));
        }
        if *w == way {
            wanted = Some(v);
        }
    }
    wanted.unwrap_or_else(|| Arc::from(Vec::new()))
}

/// Fill `out` with standard normal draws, two at a time by Marsaglia's polar method (Marsaglia
/// and Bray 1964, SIAM Review 6:260-264, from memory): a point uniform in the unit disc, (u, v)
/// with s = u^2 + v^2 in (0, 1), gives u f and v f, f = sqrt(-2 ln s / s).
fn normals(rng: &mut ChaCha8Rng, out: &mut [f64]) {
    for pair in out.chunks_mut(2) {
        let (u, v, s) = loop {
            let u = 2.0 * rng.random::<f64>() - 1.0;
            let v = 2.0 * rng.random::<f64>() - 1.0;
            let s = u * u + v * v;
            if s > 0.0 && s < 1.0 {
                break (u, v, s);
            }
        };
        let f = (-2.0 * s.ln() / s).sqrt();
        pair[0] = u * f;
        if let Some(x) = pair.get_mut(1) {
            *x = v * f;
        }
    }
}

/// The outlier test of `readings` on grid `at` with one-sigma repeatability `rep` (same unit) at
/// `level`, on the readings in units of `rep` (the trend leg's choice of trend reads them so).
/// A statistic that is not a number (readings that are not) is no evidence: chance 1.
fn outlier_test(readings: &[f64], at: &[i64], rep: f64, level: f64, way: Outlying) -> BandTest {
    let scaled: Vec<f64> = readings.iter().map(|x| x / rep.max(1e-300)).collect();
    let observed = band_statistic(&scaled, at, &mut Vec::new(), way);
    let noise = null_statistics(at, way);
    let count = noise.len() - noise.partition_point(|x| *x < observed);
    BandTest {
        chance: (count + 1) as f64 / (BAND_DRAWS + 1) as f64,
        threshold_sigmas: posterior::quantile(&noise, 1.0 - level),
        carriers: Vec::new(),
        standing: Vec::new(),
    }
}

/// The band test of the case's caliper readings (the caliper profile with the most readings; the
/// lanes' calipers when the case has none) with repeatability `rep` (m) at `level`.
/// The lanes that carry a reading standing out over its neighbours at the thick leg's threshold
/// are the test's `carriers`.
pub(super) fn band_test(lab: &Case, lanes: &Lanes, rep: f64, level: f64) -> BandTest {
    let (readings, positions) = caliper_readings(lab, lanes);
    let grid = trend_scan::grid(&positions, readings.len());
    let [thick, over] = thick_legs(&readings, &grid, rep, level);
    let scaled: Vec<f64> = readings.iter().map(|x| x / rep.max(1e-300)).collect();
    let passed = thick.chance.max(over.chance) <= level;
    let mut at = band_place::standing(
        &band_place::thick_excesses(&scaled),
        thick.threshold_sigmas,
        passed,
    );
    // and the band of one to three readings the trend leg holds out, where it stands: a band
    // wider than a reading is placed whole, though its inner readings stand over neighbours
    // that are the band's own
    if readings.len() >= TREND_READINGS {
        if let (true, Some((first, k))) = (
            over.chance <= level,
            trend_scan::over_trend_band(&scaled, &grid),
        ) {
            at.extend(first..first + k);
            at.sort_unstable();
            at.dedup();
        }
    }
    let mut t = both_legs([thick, over]);
    t.carriers = band_place::carriers(lanes, &positions, &at);
    t.standing = at;
    t
}

/// The two legs of the band test of caliper `readings` on grid `at` with repeatability `rep` at
/// `level`, [`Outlying::Thick`] then [`Outlying::ThickOverTrend`]: a band must stand out both from the trend through the other readings and a reading from the median of
/// its [`NEIGHBOURS`] nearest readings ([`Outlying::ThickOverTrend`], [`Outlying::Thick`]); the
/// larger of the two chances (an intersection-union test, whose size is at most either test's:
/// Berger 1982, Technometrics 24:295-300, from memory). The first alone takes the thick parts of a
/// profile bent more than a parabola (or a crown's thick centre, with too few readings for a
/// quadratic) for a band, the second alone loses power against a band with shoulders (its
/// neighbours' median is noisier and sits on the shoulders) and takes a wedge's thick end or a
/// dish's thick edges for one (their neighbours all lie on their thin side). Its threshold is the
/// larger of the two ([`both_legs`]).
fn thick_legs(readings: &[f64], at: &[i64], rep: f64, level: f64) -> [BandTest; 2] {
    [Outlying::Thick, Outlying::ThickOverTrend].map(|w| outlier_test(readings, at, rep, level, w))
}

/// The band test from its two legs ([`thick_legs`]): the larger chance and threshold.
fn both_legs([a, b]: [BandTest; 2]) -> BandTest {
    BandTest {
        chance: a.chance.max(b.chance),
        threshold_sigmas: a.threshold_sigmas.max(b.threshold_sigmas),
        carriers: Vec::new(),
        standing: Vec::new(),
    }
}

/// The caliper readings the profile tests judge (m) and their positions (m): the caliper
/// profile with the most readings, or the lanes' calipers at their centres when the case has
/// none.
pub(super) fn caliper_readings(lab: &Case, lanes: &Lanes) -> (Vec<f64>, Vec<f64>) {
    lab.densest(Measure::Caliper).map_or_else(
        || {
            let c = lanes.lanes.iter().map(|l| l.caliper_m).collect();
            (c, lanes.positions())
        },
        |p| (p.values.clone(), p.positions_m.clone()),
    )
}

/// The test of the web's own profile at winding: the tension profile's readings over their
/// mean with [`TENSION_REPEATABILITY`], the moisture profile's with
/// [`MOISTURE_REPEATABILITY_PCT`]; with both, twice the smaller chance (Bonferroni). `None`
/// without either profile; a tension profile whose mean is not positive is not tested.
pub(super) fn web_test(lab: &Case, level: f64) -> Option<BandTest> {
    let mut tests = Vec::new();
    // a tension profile is read by its shape over its mean: none without a positive mean (as
    // the lanes read it, `lanes::web_strains`)
    if let Some(p) = lab.densest(Measure::Tension) {
        let m = p.values.iter().sum::<f64>() / p.values.len().max(1) as f64;
        if m > 0.0 && m.is_finite() {
            let v: Vec<f64> = p.values.iter().map(|x| x / m).collect();
            tests.push(outlier_test(
                &v,
                &trend_scan::index_grid(v.len()),
                TENSION_REPEATABILITY,
                level,
                Outlying::Either,
            ));
        }
    }
    if let Some(p) = lab.densest(Measure::Moisture) {
        tests.push(outlier_test(
            &p.values,
            &trend_scan::index_grid(p.values.len()),
            MOISTURE_REPEATABILITY_PCT,
            level,
            Outlying::Either,
        ));
    }
    let n = tests.len() as f64;
    tests
        .into_iter()
        .reduce(|a, b| if a.chance <= b.chance { a } else { b })
        .map(|t| BandTest {
            chance: (n * t.chance).min(1.0),
            threshold_sigmas: t.threshold_sigmas,
            carriers: Vec::new(),
            standing: Vec::new(),
        })
}

#[cfg(test)]
mod tests {
    use super::trend_scan::index_grid;
    use super::{normals, BandTest, Outlying};
    use Outlying::{Either, Thick};

    // the tests on evenly spaced readings
    fn band_statistic(v: &[f64], buf: &mut Vec<f64>, way: Outlying) -> f64 {
        super::band_statistic(v, &index_grid(v.len()), buf, way)
    }
    fn null_statistics(n: usize, way: Outlying) -> std::sync::Arc<[f64]> {
        super::null_statistics(&index_grid(n), way)
    }
    fn outlier_test(v: &[f64], rep: f64, level: f64, way: Outlying) -> BandTest {
        super::outlier_test(v, &index_grid(v.len()), rep, level, way)
    }
    fn thick_band(v: &[f64], rep: f64, level: f64) -> BandTest {
        super::both_legs(super::thick_legs(v, &index_grid(v.len()), rep, level))
    }
    use rand::SeedableRng;

    /// The median through selection is the median of the sorted readings, for odd and even
    /// counts (definition of the sample median).
    #[test]
    fn the_band_statistic_measures_from_the_sorted_median() {
        let mut buf = Vec::new();
        // odd: median 3, farthest reading 10
        assert_eq!(
            band_statistic(&[10.0, 3.0, 1.0, 2.0, 4.0], &mut buf, Either),
            7.0
        );
        // even: median (2 + 4) / 2 = 3, farthest reading -5
        assert_eq!(
            band_statistic(&[4.0, -5.0, 9.0, 2.0], &mut buf, Either),
            8.0
        );
        // thick against its neighbours (all the others in so few): 9 over the median of
        // (4, -5, 2) by 7, 5 over that of
        // (4, -50, 4, 4) by 1 (a thin reading is no band); inside a straight slope no reading
        // stands out, only its high end over the eight readings inward of it, by 4.5 steps
        assert_eq!(band_statistic(&[4.0, -5.0, 9.0, 2.0], &mut buf, Thick), 7.0);
        let one = band_statistic(&[4.0, -50.0, 5.0, 4.0, 4.0], &mut buf, Thick);
        assert_eq!(one, 1.0);
        let slope: Vec<f64> = (0..9).map(|i| i as f64).collect();
        assert_eq!(band_statistic(&slope, &mut buf, Thick), 4.5);
        assert_eq!(band_statistic(&[], &mut buf, Either), 0.0);
    }

    /// The thick leg's sliding-window statistic is the largest of the per-reading excesses
    /// [`super::super::band_place::thick_excesses`] computes window by window (the same
    /// definition, two implementations), at counts below, at and above the window.
    #[test]
    fn the_sliding_window_agrees_with_each_reading_on_its_own() {
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(11);
        let mut buf = Vec::new();
        for n in [2, 5, 9, 10, 16, 40] {
            let mut v = vec![0.0; n];
            normals(&mut rng, &mut v);
            let each = super::super::band_place::thick_excesses(&v);
            let most = each.iter().copied().fold(0.0, f64::max);
            assert_eq!(band_statistic(&v, &mut buf, Thick), most, "{n} readings");
        }
    }

    /// Polar-method draws are standard normal: mean 0, variance 1, and 5 % beyond +/-1.959964
    /// (Abramowitz and Stegun 1964, Table 26.1: Phi(1.96) = 0.97500). 200,000 draws: the
    /// tolerances are about 4 standard errors.
    #[test]
    fn polar_draws_are_standard_normal() {
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(7);
        let mut v = vec![0.0; 200_001];
        normals(&mut rng, &mut v);
        let n = v.len() as f64;
        let mean = v.iter().sum::<f64>() / n;
        let var = v.iter().map(|x| (x - mean).powi(2)).sum::<f64>() / (n - 1.0);
        let tail = v.iter().filter(|x| x.abs() > 1.959_964).count() as f64 / n;
        assert!(mean.abs() < 0.01, "{mean}");
        assert!((var - 1.0).abs() < 0.013, "{var}");
        assert!((tail - 0.05).abs() < 0.002, "{tail}");
    }

    /// With two readings the statistic is |x1 - x2| / 2, half-normal with sd 1/sqrt(2): its
    /// 99th percentile is z(0.995) / sqrt(2) = 2.575829 / 1.414214 = 1.821377 (Abramowitz and
    /// Stegun 1964, Table 26.5), and noise alone reaches it with chance 0.01. Monte Carlo
    /// standard errors over 100,000 draws: 0.008 and 0.0003.
    #[test]
    fn the_noise_statistic_of_two_readings_is_half_normal() {
        let t = outlier_test(&[0.0, 2.0 * 1.821_377], 1.0, 0.01, Either);
        assert!(
            (t.threshold_sigmas - 1.821_377).abs() < 0.03,
            "{}",
            t.threshold_sigmas
        );
        assert!((t.chance - 0.01).abs() < 0.0013, "{}", t.chance);
        // the same count gives the same draws, kept once
        assert!(std::sync::Arc::ptr_eq(
            &null_statistics(2, Either),
            &null_statistics(2, Either)
        ));
        // readings that are not numbers are no evidence
        assert_eq!(
            outlier_test(&[0.0, f64::NAN], 1.0, 0.01, Either).chance,
            1.0
        );
    }

    /// A crowned profile has no band, a band on a level profile is one: 15 readings, a crown of
    /// 6 repeatabilities (the centre reading 6 above the ends, 1.6 above the median) stands out
    /// from the median by a large chance-free margin but not from its neighbours; one reading 6
    /// above a level profile stands out from both (chance at the Monte Carlo floor, 1e-5).
    #[test]
    fn a_crown_is_no_band_and_a_band_is_one() {
        let u: Vec<f64> = (0..15).map(|i| i as f64 / 7.0 - 1.0).collect();
        let crown: Vec<f64> = u.iter().map(|x| 6.0 * (1.0 - x * x)).collect();
        assert!(thick_band(&crown, 1.0, 0.001).chance > 0.1);
        let mut band = vec![0.0; 15];
        band[7] = 6.0;
        assert!(thick_band(&band, 1.0, 0.001).chance < 1e-4);
    }

    /// A wedge has no band: 15 readings rising by 0.5 repeatability a reading (7 from end to
    /// end) stand far over their median and their end over its neighbours, but no reading over
    /// the line through the others (they are not bent, so the trend is that line); one reading 6
    /// above the wedge at its thick end stands over both. The deleted residual of a reading d
    /// above a straight line of n readings is d sqrt(1 - h) (Cook and Weisberg 1982, section
    /// 2.2): at the end of 15, h = 1/15 + 49/280.
    #[test]
    fn a_wedge_is_no_band_and_a_band_at_its_thick_end_is_one() {
        let mut buf = Vec::new();
        let wedge: Vec<f64> = (0..15).map(|i| 0.5 * i as f64).collect();
        let on_trend = band_statistic(&wedge, &mut buf, Outlying::ThickOverTrend);
        assert!(on_trend < 1e-12, "{on_trend}");
        assert!(thick_band(&wedge, 1.0, 0.001).chance > 0.1);
        let mut band = wedge.clone();
        band[14] += 6.0;
        let h: f64 = 1.0 / 15.0 + 49.0 / 280.0;
        let d = band_statistic(&band, &mut buf, Outlying::ThickOverTrend);
        assert!((d - 6.0 * (1.0 - h).sqrt()).abs() < 1e-12, "{d}");
        assert!(thick_band(&band, 1.0, 0.001).chance < 1e-4);
    }

    /// A dish has no band: 15 readings 6 repeatabilities thicker at the ends than at the
    /// centre (a parabola) stand over their neighbours' median at the ends (5.2 repeatabilities
    /// over the median of the eight nearest, 6 x 0.133), but on the trend through the
    /// others, which the dish bends (so the trend is their quadratic); a band of 6 on top of the
    /// dish, at an edge or inside, stands out from both (chance 1.9e-4 at an edge, where the
    /// quadratic extrapolates: under it an end reading of 15 has the hat value
    /// 1/15 + 49/280 + 8281/37128 = 0.465, from the discrete orthogonal polynomials 1, x - 7 and
    /// (x - 7)^2 - 56/3 of the table of orthogonal polynomials in Fisher and Yates 1963,
    /// "Statistical Tables", 6th ed., from memory; at the Monte Carlo floor
    /// inside).
    #[test]
    fn a_dish_is_no_band_and_a_band_on_it_is_one() {
        let mut buf = Vec::new();
        let u: Vec<f64> = (0..15).map(|i| i as f64 / 7.0 - 1.0).collect();
        let dish: Vec<f64> = u.iter().map(|x| 6.0 * x * x).collect();
        assert!(band_statistic(&dish, &mut buf, Outlying::Thick) > 3.0);
        assert!(band_statistic(&dish, &mut buf, Outlying::ThickOverTrend) < 1e-9);
        assert!(thick_band(&dish, 1.0, 0.001).chance > 0.1);
        let mut edge = dish.clone();
        edge[14] += 6.0;
        let h: f64 = 1.0 / 15.0 + 49.0 / 280.0 + 8281.0 / 37128.0;
        let d = band_statistic(&edge, &mut buf, Outlying::ThickOverTrend);
        assert!((d - 6.0 * (1.0 - h).sqrt()).abs() < 1e-12, "{d}");
        for at in [0, 4, 14] {
            let mut band = dish.clone();
            band[at] += 6.0;
            let t = thick_band(&band, 1.0, 0.001);
            assert!(t.chance < 1e-3, "band at {at}: {}", t.chance);
        }
    }

    /// Thick readings at both edges are bands, not a dish: 8 repeatabilities on the two
    /// outermost of 15 readings each side, and 10 on the one outermost of 9. Each edge bends
    /// the readings outside the other edge's band, but they do not lie on a parabola (their
    /// residuals about it are beyond the chi-square 0.001 point), so each band is held against
    /// the line through them. With 9 readings the fit check is weak: at 8 repeatabilities the
    /// eight others of one edge reading still fit a parabola, and the chance is 0.006, not a
    /// band at the test's 0.001.
    #[test]
    fn thick_readings_at_both_edges_are_bands() {
        let mut fifteen = vec![0.0; 15];
        for i in [0, 1, 13, 14] {
            fifteen[i] = 8.0;
        }
        let mut nine = vec![0.0; 9];
        nine[0] = 10.0;
        nine[8] = 10.0;
        for v in [fifteen, nine] {
            let t = thick_band(&v, 1.0, 0.001);
            assert!(t.chance < 1e-3, "{v:?}: {}", t.chance);
        }
    }

    /// The trend leg's statistic of level readings against NumPy 2.4.6 Monte Carlo of the same
    /// statistic written independently (numpy.linalg.lstsq, 1,000,000 draws, standard error of
    /// the quantile about 0.01: `tests/data/band_scan/scan_null.py`): the 99.9th percentile of
    /// 15 readings is 4.106 (4.043 on the line alone), of 6 readings (held against the line)
    /// 3.794; over the test's 100,000 draws the quantile's
    /// standard error is about 0.03. With 15 it lies above the one-reading Bonferroni bound
    /// z(1 - 0.001 / 15) = 3.820 (Abramowitz and Stegun 1964, 26.2.23), as the scan over band
    /// widths tests more than the 15 single readings.
    #[test]
    fn the_trend_leg_null_matches_an_independent_monte_carlo() {
        let null = |n| null_statistics(n, Outlying::ThickOverTrend);
        let q = crate::fit::posterior::quantile(&null(15), 0.999);
        assert!((q - 4.106).abs() < 0.08, "{q}");
        assert!(q > crate::stats::normal_isf(0.001 / 15.0), "{q}");
        let q = crate::fit::posterior::quantile(&null(6), 0.999);
        assert!((q - 3.794).abs() < 0.1, "{q}");
    }

    /// With two readings the thick statistic is |x1 - x2|, normal with variance 2 folded: its
    /// 99th percentile is sqrt(2) z(0.995) = 1.414214 x 2.575829 = 3.642773 (Abramowitz and
    /// Stegun 1964, Table 26.5). Monte Carlo standard error over 100,000 draws: about 0.015.
    #[test]
    fn the_thick_statistic_of_two_readings_is_their_folded_difference() {
        let q = crate::fit::posterior::quantile(&null_statistics(2, Thick), 0.99);
        assert!((q - 3.642_773).abs() < 0.05, "{q}");
        let t = outlier_test(&[0.0, 3.642_773], 1.0, 0.01, Thick);
        assert!((t.chance - 0.01).abs() < 0.0013, "{}", t.chance);
    }
}
