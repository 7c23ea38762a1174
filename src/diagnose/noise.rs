//! What measurement noise alone makes of a roll: [`NOISE_ROLLS`] uniform rolls that differ from
//! the diagnosed one only by noise (caliper readings drawn from the caliper repeatability and put
//! on the lanes as the readings are; lane creep moved by a posterior draw's deviation from the
//! lane's fit), the noise-free uniform roll, the caliper band test on the readings themselves,
//! and the resolution note. Used by [`super::confidence`].
//!
//! Determinism: draws come from ChaCha8 seeded by [`crate::fit::posterior::seed_for`] of the case
//! id and a fixed offset, in a fixed order; the rolls run in parallel and are collected in order.

use super::features::{self, Features};
use super::{DiagnoseError, Fitted};
use crate::case::{Case, Measure};
use crate::fit::{creep_from, posterior, prepared, FitError};
use crate::lanes::Lanes;
use crate::note::Note;
use crate::rules::Table;
use crate::storage::{age_prepared, AgeOptions, LaneCreep};
use crate::vocab::Feature;
use crate::winding::{wind, Options, WindInput};
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use serde::Serialize;

/// Uniform rolls made of measurement noise alone.
pub const NOISE_ROLLS: usize = 24;

/// Quantile of the noise-only deviations that sets the floor.
pub const FLOOR_QUANTILE: f64 = 0.95;

/// Most winding nodes of a noise roll (floors are differences between rolls at the same nodes).
pub const NOISE_NODES: usize = 61;

/// Family-wise level of the noise test: the chance that noise alone puts up any finding at all
/// is held to 5 % by splitting it evenly over the deciding features tested (Bonferroni; Dunn
/// 1961, "Multiple comparisons among means").
pub const FAMILY_LEVEL: f64 = 0.05;

/// Noise-only caliper profiles drawn for the band test (cheap: no winding).
pub const BAND_DRAWS: usize = 4000;

/// Seed offset of the noise rolls (distinct from any lane index of the sampler).
const NOISE_SEED_LANE: usize = 1 << 20;

/// What measurement noise alone makes of a feature.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FeatureFloor {
    pub feature: Feature,
    /// Value on the noise-free uniform roll (feature's own unit).
    pub uniform: f64,
    /// 95 % quantile of |noisy - uniform| over the noise rolls (feature's own unit).
    pub floor: f64,
    /// Mean, standard deviation and largest of |noisy - uniform| over the noise rolls (feature's
    /// own unit).
    pub noise_mean: f64,
    pub noise_sd: f64,
    pub noise_max: f64,
    /// The smallest |value - uniform| that stands above noise at the family-wise level (feature's
    /// own unit).
    pub threshold: f64,
}

/// The caliper repeatability of a case, m, and its source.
pub(super) fn caliper_repeatability(case: &Case) -> (f64, String) {
    match case.caliper_repeatability_m {
        Some(v) => (v, "case file".into()),
        None => {
            let d = crate::case::defaults::CALIPER_REPEAT;
            let v = crate::units::parse(d.text, crate::units::Kind::Length).unwrap_or(1e-6);
            (v, d.source.to_string())
        }
    }
}

/// A standard normal draw (Box-Muller).
fn normal(rng: &mut ChaCha8Rng) -> f64 {
    let u1: f64 = rng.random::<f64>().max(1e-300);
    let u2: f64 = rng.random::<f64>();
    (-2.0 * u1.ln()).sqrt() * (std::f64::consts::TAU * u2).cos()
}

/// What noise alone makes: floors of the deciding features, the caliper band test and the
/// resolution note.
pub(super) struct Floor {
    pub(super) floors: Vec<FeatureFloor>,
    pub(super) band: BandTest,
    pub(super) resolution: Note,
}

/// One-sigma repeatability of a tension-profile reading, as a fraction of the profile's mean
/// (assumption: segmented-roll and air-bearing tension profilers read to a few per cent).
pub const TENSION_REPEATABILITY: f64 = 0.02;

/// One-sigma repeatability of a moisture-profile reading, percentage points (from memory: an
/// on-line moisture scanner reads to about 0.1-0.2 points).
pub const MOISTURE_REPEATABILITY_PCT: f64 = 0.15;

/// Lanes of a uniform roll: every caliper, tension and moisture profile set to its mean plus
/// noise (one draw per reading; caliper with `noise`'s sigma in m, tension with
/// [`TENSION_REPEATABILITY`], moisture with [`MOISTURE_REPEATABILITY_PCT`]; none for the
/// noise-free roll) and put on the lanes as the case's own profiles are (so lanes average or
/// interpolate the noise as they do the readings); without a caliper profile the lanes' own
/// deviations are drawn with `noise`'s sigma.
fn uniform_lanes(lab: &Case, lanes: &Lanes, noise: Option<(&mut ChaCha8Rng, f64)>) -> Lanes {
    let flat = |m: Measure| lab.profiles.iter().any(|p| p.what == m);
    let has_profile = flat(Measure::Caliper);
    let web = flat(Measure::Tension) || flat(Measure::Moisture);
    let mut rng_sigma = noise;
    if has_profile || web {
        let mut c = lab.clone();
        for p in c.profiles.iter_mut() {
            let m = p.values.iter().sum::<f64>() / p.values.len().max(1) as f64;
            let sd = |s: f64| match p.what {
                Measure::Caliper => Some(s),
                Measure::Tension => Some(TENSION_REPEATABILITY * m),
                Measure::Moisture => Some(MOISTURE_REPEATABILITY_PCT),
                Measure::Hardness | Measure::Diameter => None,
            };
            if sd(0.0).is_none() {
                continue;
            }
            for v in p.values.iter_mut() {
                *v = m + rng_sigma
                    .as_mut()
                    .map_or(0.0, |(r, s)| sd(*s).unwrap_or(0.0) * normal(r));
            }
        }
        let l = crate::lanes::build(&c);
        if has_profile {
            return l;
        }
        return draw_lane_calipers(l, lanes.mean_caliper_m, rng_sigma);
    }
    draw_lane_calipers(lanes.clone(), lanes.mean_caliper_m, rng_sigma)
}

/// Each lane's caliper the mean `mean_m` (m) times one plus a draw with `noise`'s sigma (m)
/// over the mean; the mean itself for the noise-free roll.
fn draw_lane_calipers(
    mut l: Lanes,
    mean_m: f64,
    mut rng_sigma: Option<(&mut ChaCha8Rng, f64)>,
) -> Lanes {
    for lane in l.lanes.iter_mut() {
        let d = rng_sigma
            .as_mut()
            .map_or(0.0, |(r, s)| *s / mean_m.max(1e-12) * normal(r));
        lane.caliper_deviation = d;
        lane.caliper_m = mean_m * (1.0 + d);
    }
    l
}

/// A roll on `lanes` wound at `nodes` and run through storage with `creep` per lane: its features.
fn roll_features(
    lab: &Case,
    lanes: &Lanes,
    creep: &[LaneCreep],
    nodes: usize,
) -> Result<Features, DiagnoseError> {
    let wound = wind(
        &WindInput::new(&lab.material, &lab.roll, &lab.winding),
        lanes,
        Options {
            nodes,
            ..Options::default()
        },
    )?;
    let (prep, map) = prepared(lab, lanes, &wound, &AgeOptions::default())?;
    let aged =
        age_prepared(&lab.material, &prep, &wound, Some(creep), &map).map_err(FitError::from)?;
    let o = super::actions::Outcome {
        unwind: super::unwind::at_unwind(lab, &wound, creep),
        wound,
        aged,
    };
    Ok(features::compute(lab, lanes, &o))
}

/// Creep per lane of a noise-only roll: the pooled log-scales moved by one of the lane's own
/// posterior draws' deviations from its fitted log-scales (a random draw per lane), so the
/// correlation of the two scales is kept; a scale the data do not identify does not move.
fn noisy_creep(lab: &Case, fit: &crate::fit::RollFit, rng: &mut ChaCha8Rng) -> Vec<LaneCreep> {
    let pooled = [
        fit.pooled_md_creep_scale.ln(),
        fit.pooled_radial_creep_scale.ln(),
    ];
    fit.lanes
        .iter()
        .map(|l| {
            let n = l.draws_theta.len();
            let t = if n == 0 {
                pooled
            } else {
                let d = l.draws_theta[rng.random_range(0..n)];
                [0, 1].map(|i| pooled[i] + d[i] - l.theta[i])
            };
            creep_from(&lab.material, &t)
        })
        .collect()
}

/// The caliper band test on the readings themselves: the largest deviation of a reading from the
/// readings' median in units of the caliper repeatability, against the same statistic of
/// [`BAND_DRAWS`] noise-only profiles with as many readings. A single high reading counts at its
/// own size, where a range over lanes would add the noise of the lowest lane and of lanes
/// extrapolated to the edges.
pub(super) struct BandTest {
    /// Monte Carlo chance that noise alone reaches the observed statistic, (count + 1) /
    /// (draws + 1) (Davison and Hinkley 1997, eq. 4.11).
    pub(super) chance: f64,
    /// Quantile of the noise statistic at the test's level, repeatability units.
    threshold_sigmas: f64,
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

/// The band test of the case's caliper readings (the caliper profile with the most readings; the
/// lanes' calipers when the case has none) at `level`.
fn band_test(lab: &Case, lanes: &Lanes, rep: f64, level: f64, rng: &mut ChaCha8Rng) -> BandTest {
    let readings: Vec<f64> = lab
        .profiles
        .iter()
        .filter(|p| p.what == Measure::Caliper)
        .fold(None::<&crate::case::Profile>, |best, p| match best {
            Some(b) if b.values.len() >= p.values.len() => Some(b),
            _ => Some(p),
        })
        .map(|p| p.values.clone())
        .unwrap_or_else(|| lanes.lanes.iter().map(|l| l.caliper_m).collect());
    let observed = band_statistic(&readings) / rep.max(1e-12);
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

/// Floors of the deciding features of `table`'s rules from [`NOISE_ROLLS`] noise-only uniform
/// rolls (wound at no more than [`NOISE_NODES`] nodes, run in parallel, drawn in a fixed order),
/// the caliper band test, and the resolution note. The uniform value a finding is measured from
/// is the noise-free roll at the diagnosis's own `nodes`; the noise deviations are measured from
/// the noise-free roll at the noise rolls' nodes.
pub(super) fn noise_floor(
    lab: &Case,
    fitted: &Fitted,
    table: &Table,
    nodes: usize,
) -> Result<Floor, DiagnoseError> {
    use rayon::prelude::*;
    let fit = &fitted.fit;
    let (rep, _) = caliper_repeatability(lab);
    let l0 = uniform_lanes(lab, &fitted.lanes, None);
    let pooled = creep_from(
        &lab.material,
        &[
            fit.pooled_md_creep_scale.ln(),
            fit.pooled_radial_creep_scale.ln(),
        ],
    );
    let pooled = vec![pooled; fit.lanes.len()];
    let uniform = roll_features(lab, &l0, &pooled, nodes)?;
    let coarse = nodes.min(NOISE_NODES);
    let clean = roll_features(lab, &l0, &pooled, coarse)?;
    let mut rng = ChaCha8Rng::seed_from_u64(posterior::seed_for(&lab.id, NOISE_SEED_LANE));
    let inputs: Vec<(Lanes, Vec<LaneCreep>)> = (0..NOISE_ROLLS)
        .map(|_| {
            let l = uniform_lanes(lab, &fitted.lanes, Some((&mut rng, rep)));
            (l, noisy_creep(lab, fit, &mut rng))
        })
        .collect();
    let rolls: Vec<Features> = inputs
        .par_iter()
        .map(|(l, c)| roll_features(lab, l, c, coarse))
        .collect::<Result<_, _>>()?;
    let mut deciding: Vec<Feature> = Vec::new();
    for c in table.rules.iter().filter_map(|r| r.when.first()) {
        if !deciding.contains(&c.feature) {
            deciding.push(c.feature);
        }
    }
    let level = FAMILY_LEVEL / deciding.len().max(1) as f64;
    let z = crate::numeric::normal_upper_quantile(level);
    let band = band_test(lab, &fitted.lanes, rep, level, &mut rng);
    let band_pct = band.threshold_sigmas * rep / fitted.lanes.mean_caliper_m.max(1e-12) * 100.0;
    let floor_of = |x: Feature| {
        let mut v: Vec<f64> = rolls
            .iter()
            .map(|f| (f.get(x) - clean.get(x)).abs())
            .collect();
        v.sort_by(f64::total_cmp);
        let n = v.len().max(1) as f64;
        let m = v.iter().sum::<f64>() / n;
        let sd = (v.iter().map(|d| (d - m).powi(2)).sum::<f64>() / (n - 1.0).max(1.0)).sqrt();
        FeatureFloor {
            feature: x,
            uniform: uniform.get(x),
            floor: posterior::quantile(&v, FLOOR_QUANTILE),
            noise_mean: m,
            noise_sd: sd,
            noise_max: v.last().copied().unwrap_or(0.0),
            threshold: if x == Feature::CaliperRangePct {
                band_pct
            } else {
                (m + z * sd).max(v.last().copied().unwrap_or(0.0))
            },
        }
    };
    let floors: Vec<FeatureFloor> = deciding.iter().map(|x| floor_of(*x)).collect();
    let resolution = Note::Resolution {
        caliper_repeatability_m: rep,
        band_m: band.threshold_sigmas * rep,
        lane_excess_mm_per_m: floor_of(Feature::LocalPeakMmPerM).threshold,
        centre_edges_mm_per_m: floor_of(Feature::CentreMinusEdgesMmPerM).threshold,
    };
    Ok(Floor {
        floors,
        band,
        resolution,
    })
}
