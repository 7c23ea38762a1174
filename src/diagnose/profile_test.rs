//! Tests on the measured profiles themselves, without winding: is a profile's most outlying
//! reading more than its repeatability explains? The caliper band test, and the same test of a
//! tension or moisture profile at winding for the rules that rest on the web's own profile.
//! Monte Carlo over noise-only profiles with as many readings (cheap).

use super::noise::{normal, MOISTURE_REPEATABILITY_PCT, TENSION_REPEATABILITY};
use crate::case::{Case, Measure, Profile};
use crate::fit::posterior;
use crate::lanes::Lanes;
use rand_chacha::ChaCha8Rng;

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
}

/// Largest |reading - median of the readings|, in the readings' unit.
fn band_statistic(v: &[f64]) -> f64 {
    let mut s = v.to_vec();
    s.sort_by(f64::total_cmp);
    let n = s.len();
    if n == 0 {
        return 0.0;
    }
    let med = if n % 2 == 1 {
        s[n / 2]
    } else {
        0.5 * (s[n / 2 - 1] + s[n / 2])
    };
    v.iter().map(|x| (x - med).abs()).fold(0.0, f64::max)
}

/// The outlier test of `readings` with one-sigma repeatability `rep` (same unit) at `level`.
fn outlier_test(readings: &[f64], rep: f64, level: f64, rng: &mut ChaCha8Rng) -> BandTest {
    let observed = band_statistic(readings) / rep.max(1e-300);
    let mut noise: Vec<f64> = (0..BAND_DRAWS)
        .map(|_| {
            let v: Vec<f64> = (0..readings.len()).map(|_| normal(rng)).collect();
            band_statistic(&v)
        })
        .collect();
    noise.sort_by(f64::total_cmp);
    let count = noise.iter().filter(|x| **x >= observed).count();
    BandTest {
        chance: (count + 1) as f64 / (BAND_DRAWS + 1) as f64,
        threshold_sigmas: posterior::quantile(&noise, 1.0 - level),
    }
}

/// The profile of kind `what` with the most readings.
fn densest(lab: &Case, what: Measure) -> Option<&Profile> {
    lab.profiles
        .iter()
        .filter(|p| p.what == what)
        .fold(None::<&Profile>, |best, p| match best {
            Some(b) if b.values.len() >= p.values.len() => Some(b),
            _ => Some(p),
        })
}

/// The band test of the case's caliper readings (the caliper profile with the most readings; the
/// lanes' calipers when the case has none) with repeatability `rep` (m) at `level`.
pub(super) fn band_test(
    lab: &Case,
    lanes: &Lanes,
    rep: f64,
    level: f64,
    rng: &mut ChaCha8Rng,
) -> BandTest {
    let readings: Vec<f64> = densest(lab, Measure::Caliper)
        .map(|p| p.values.clone())
        .unwrap_or_else(|| lanes.lanes.iter().map(|l| l.caliper_m).collect());
    outlier_test(&readings, rep, level, rng)
}

/// The test of the web's own profile at winding: the tension profile's readings over their
/// mean with [`TENSION_REPEATABILITY`], the moisture profile's with
/// [`MOISTURE_REPEATABILITY_PCT`]; with both, twice the smaller chance (Bonferroni). `None`
/// without either profile; a tension profile whose mean is not positive is not tested.
pub(super) fn web_test(lab: &Case, level: f64, rng: &mut ChaCha8Rng) -> Option<BandTest> {
    let mut tests = Vec::new();
    // a tension profile is read by its shape over its mean: none without a positive mean (as
    // the lanes read it, `lanes::web_strains`)
    if let Some(p) = densest(lab, Measure::Tension) {
        let m = p.values.iter().sum::<f64>() / p.values.len().max(1) as f64;
        if m > 0.0 && m.is_finite() {
            let v: Vec<f64> = p.values.iter().map(|x| x / m).collect();
            tests.push(outlier_test(&v, TENSION_REPEATABILITY, level, rng));
        }
    }
    if let Some(p) = densest(lab, Measure::Moisture) {
        tests.push(outlier_test(
            &p.values,
            MOISTURE_REPEATABILITY_PCT,
            level,
            rng,
        ));
    }
    let n = tests.len() as f64;
    tests
        .into_iter()
        .reduce(|a, b| if a.chance <= b.chance { a } else { b })
        .map(|t| BandTest {
            chance: (n * t.chance).min(1.0),
            threshold_sigmas: t.threshold_sigmas,
        })
}
