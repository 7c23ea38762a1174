//! What measurement noise alone makes of a roll: [`NOISE_ROLLS`] uniform rolls that differ from
//! the diagnosed one only by noise (caliper readings drawn from the caliper repeatability and put
//! on the lanes as the readings are; lane creep moved by a posterior draw's deviation from the
//! lane's fit), the noise-free uniform roll, the caliper band test on the readings themselves,
//! and the resolution note. Used by [`super::confidence`].
//!
//! Determinism: draws come from ChaCha8 seeded by [`crate::fit::posterior::seed_for`] of the case
//! id and a fixed offset, in a fixed order; the rolls run in parallel and are collected in order.

use super::features::{self, Features};
use super::profile_test::{band_test, web_test, BandTest};
use super::{DiagnoseError, Fitted};
use crate::case::{Case, Measure};
use crate::fit::field::{coupled, Field};
use crate::fit::posterior::normal;
use crate::fit::{creep_from, posterior, prepared, FitError};
use crate::lanes::Lanes;
use crate::note::Note;
use crate::rules::Table;
use crate::storage::{
    age_prepared, age_prepared_across, AgeError, AgeOptions, Aged, HardnessMap, LaneCreep,
    Prepared, RollStore,
};
use crate::vocab::Feature;
use crate::winding::{coupling, wind_caliper, Caliper, Options, Secant, Spacing, WindInput, Wound};
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use serde::Serialize;

/// Uniform rolls made of measurement noise alone (the spread they give is itself uncertain, by
/// about 15 % at 24 rolls: the noise test's Student-t prediction bound carries that).
pub const NOISE_ROLLS: usize = 24;

/// Quantile of the noise-only deviations that sets the floor.
pub const FLOOR_QUANTILE: f64 = 0.95;

/// Grid nodes of a noise roll (floors are differences between rolls at the same nodes) at the
/// least: the spacing its grid grows to from the core ([`noise_options`]), unless the roll is
/// large enough for [`STEP_FOLLOWS`] to ask for more ([`noise_nodes`]). Under 81 the lanes' nip
/// shares chattered ([`STEP_FOLLOWS`]).
pub const NOISE_NODES: usize = 81;

/// Longest outermost grid step of a noise roll, in lengths over which the lanes' nip shares follow
/// their contact ([`coupling::NIP_FOLLOW_M`]). The lanes' strain offsets and nip shares are updated
/// once per grid step, so a step that is long against that length lags them: the lane-pattern,
/// surface-pressure and MD floors of the 1500 mm board (on a 152 mm core) converge with it, nip or
/// none. Against noise rolls wound on 401 nodes, every deciding floor of the field cases, the
/// 40-lane roll and the board without its nip is within 4.2 % at 1.25, but two: the board's MD
/// compression floor (0.001 of the strength against a rule threshold of 1, whose minimum moves
/// between nodes) and the end surface pressure floor of the board without its nip, 7 % short (a
/// floor of 0.05 kPa; 12 % at 81 nodes). At 2 follow lengths the board's centre-minus-edges floor
/// was 21 % wide and its MD tension floor 8 % short. Under 81 nodes the nip shares chattered
/// between the lanes (the board at 61: 5.5 kN/m on one lane and 0.12 kN/m on another, against
/// 1.6-2.1 kN/m each from 81 up).
pub const STEP_FOLLOWS: f64 = 1.25;

/// Growth per step of a noise roll's grid steps in ln r, from the diagnosis's own steps at the
/// core to the noise rolls' ([`noise_options`]). The core-pressure and crush floors converge
/// slowly with the steps near the core, where a step is comparable to the build: on geometric
/// grids of 81 and 139 nodes the board's came out 25 % and 9 % short, and without its nip 47 %
/// and 21 % short; graded at 1.05 (148 nodes) they are within 1.5 % of those of noise rolls wound
/// on 401 nodes on every field case, the 40-lane roll and the board without its nip.
pub const NOISE_CORE_GROWTH: f64 = 1.05;

/// Winding options of `lab`'s noise rolls for a diagnosis at `nodes`: the spacing of
/// [`noise_nodes`] nodes, refined towards the core ([`Spacing::Core`]) from the diagnosis's own
/// spacing there, growing by [`NOISE_CORE_GROWTH`] per step; the diagnosis's own grid where that
/// is no finer.
pub fn noise_options(lab: &Case, nodes: usize) -> Options {
    Options {
        nodes: nodes.min(noise_nodes(lab)),
        spacing: Spacing::Core {
            core_nodes: nodes,
            growth: NOISE_CORE_GROWTH,
        },
        ..Options::default()
    }
}

/// Nodes of the geometric grid whose spacing `lab`'s noise rolls grow to ([`noise_options`]):
/// [`NOISE_NODES`], or enough for the outermost grid step to be no longer than
/// [`STEP_FOLLOWS`] follow lengths.
pub fn noise_nodes(lab: &Case) -> usize {
    let (rc, big_r) = (0.5 * lab.roll.core_diameter_m, 0.5 * lab.roll.diameter_m);
    if !(big_r > rc && rc > 0.0) {
        return NOISE_NODES;
    }
    // the geometric grid's outermost step is about R ln(R / rc) / (nodes - 1)
    let steps = big_r * (big_r / rc).ln() / (STEP_FOLLOWS * coupling::NIP_FOLLOW_M);
    NOISE_NODES.max(1 + steps.ceil().min(4096.0) as usize)
}

/// Family-wise level of the noise test: the chance that noise alone puts up any finding at all
/// is held to 1 % by splitting it evenly over the one-sided tests of the deciding conditions
/// (Bonferroni; Dunn 1961, "Multiple comparisons among means"). 1 % is the stricter of the two
/// conventional levels (Fisher 1925, "Statistical Methods for Research Workers"): a finding goes
/// into a report a customer reads and a supplier signs, so a false one costs more than a
/// marginal one missed.
pub const FAMILY_LEVEL: f64 = 0.01;

/// Seed offset of the noise rolls (distinct from any lane index of the sampler).
const NOISE_SEED_LANE: usize = 1 << 20;

/// What measurement noise alone makes of a feature. Deviations are signed (noisy - uniform), so
/// a skewed response (thick lanes concentrate load, thin ones cannot take it below zero) keeps
/// its sides apart.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FeatureFloor {
    pub feature: Feature,
    /// Value on the noise-free uniform roll (feature's own unit).
    pub uniform: f64,
    /// 95 % quantile of |noisy - uniform| over the noise rolls (feature's own unit).
    pub floor: f64,
    /// Mean and standard deviation of the signed deviation noisy - uniform over the noise rolls
    /// (feature's own unit).
    pub noise_mean: f64,
    pub noise_sd: f64,
    /// Smallest and largest signed deviation over the noise rolls (feature's own unit).
    pub noise_min: f64,
    pub noise_max: f64,
    /// The smallest rise above, and fall below, the uniform value that stands above noise at the
    /// test's level (positive, feature's own unit): the Student-t prediction bound of the noise
    /// rolls ([`crate::stats`]), never inside what the noise rolls themselves reached.
    pub threshold_above: f64,
    pub threshold_below: f64,
}

/// Side of a deciding condition the noise test looks at.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(super) enum Side {
    /// `above` only: noise must not raise the feature this far.
    Up,
    /// `below` only: noise must not lower it this far.
    Down,
    /// A range: either way (two one-sided tests).
    Both,
}

impl Side {
    pub(super) fn of(c: &crate::rules::Condition) -> Side {
        match (c.above.is_some(), c.below.is_some()) {
            (true, false) => Side::Up,
            (false, true) => Side::Down,
            (true, true) | (false, false) => Side::Both,
        }
    }

    /// One-sided tests this side counts for in the family.
    fn tests(self) -> usize {
        match self {
            Side::Up | Side::Down => 1,
            Side::Both => 2,
        }
    }
}

impl FeatureFloor {
    /// The smallest deviation from the uniform value that stands above noise on `side`
    /// (positive, feature's own unit): the larger of the two for both sides.
    pub(super) fn threshold(&self, side: Side) -> f64 {
        match side {
            Side::Up => self.threshold_above,
            Side::Down => self.threshold_below,
            Side::Both => self.threshold_above.max(self.threshold_below),
        }
    }

    /// Chance that measurement noise alone moves the feature `d` (signed, value - uniform) or
    /// further on `side`: the upper or lower tail of a new noise roll's deviation, predicted as
    /// mean + sd sqrt(1 + 1/n) T with T Student's t on n - 1 degrees of freedom (Hahn and
    /// Meeker 1991, section 4.4); both sides take twice the smaller tail. Within what the noise
    /// rolls themselves reached on that side, never below the empirical share 1 / (n + 1).
    pub(super) fn chance(&self, d: f64, side: Side) -> f64 {
        let n = NOISE_ROLLS as f64;
        let scale = self.noise_sd * (1.0 + 1.0 / n).sqrt();
        let tail = |excess: f64| {
            if scale > 0.0 {
                crate::stats::student_t_sf(excess / scale, n - 1.0)
            } else if excess > 1e-9 * self.noise_mean.abs() + 1e-12 {
                0.0
            } else {
                1.0
            }
        };
        let floor = 1.0 / (n + 1.0);
        let up = || {
            let c = tail(d - self.noise_mean);
            if d <= self.noise_max {
                c.max(floor)
            } else {
                c
            }
        };
        let down = || {
            let c = tail(self.noise_mean - d);
            if d >= self.noise_min {
                c.max(floor)
            } else {
                c
            }
        };
        match side {
            Side::Up => up(),
            Side::Down => down(),
            Side::Both => (2.0 * up().min(down())).min(1.0),
        }
    }
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

/// What noise alone makes: floors of the deciding features, the caliper band test and the
/// resolution note.
pub(super) struct Floor {
    pub(super) floors: Vec<FeatureFloor>,
    /// Level each one-sided test must meet: [`FAMILY_LEVEL`] over the one-sided tests of the
    /// table's deciding conditions (a range counts twice).
    pub(super) level: f64,
    pub(super) band: BandTest,
    /// The test of the web's tension or moisture profile at winding, when the case has one.
    pub(super) web: Option<BandTest>,
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
pub(super) fn uniform_lanes(
    lab: &Case,
    lanes: &Lanes,
    noise: Option<(&mut ChaCha8Rng, f64)>,
) -> Lanes {
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
/// over the mean; the mean itself for the noise-free roll. The roll's mean caliper and the lanes'
/// deviations are then those of the drawn calipers, as [`crate::lanes::build`] makes them (the
/// width-weighted mean, and each lane over it).
fn draw_lane_calipers(
    mut l: Lanes,
    mean_m: f64,
    mut rng_sigma: Option<(&mut ChaCha8Rng, f64)>,
) -> Lanes {
    for lane in l.lanes.iter_mut() {
        let d = rng_sigma
            .as_mut()
            .map_or(0.0, |(r, s)| *s / mean_m.max(1e-12) * normal(r));
        lane.caliper_m = mean_m * (1.0 + d);
    }
    if rng_sigma.is_some() {
        let cbar = crate::numeric::weighted_mean(&l.calipers(), &l.widths());
        for lane in l.lanes.iter_mut() {
            lane.caliper_deviation = lane.caliper_m / cbar - 1.0;
        }
        l.mean_caliper_m = cbar;
    } else {
        for lane in l.lanes.iter_mut() {
            lane.caliper_deviation = 0.0;
        }
    }
    l
}

/// A roll wound and its storage prepared: wound state, storage grid and moisture, hardness map.
struct Stored {
    wound: Wound,
    prep: Prepared,
    map: HardnessMap,
}

/// A roll on `lanes` wound on `opt`'s grid with its compressed caliper set as `caliper` says
/// ([`wind_caliper`]) and its storage prepared; with the caliper its winding used.
fn stored(
    lab: &Case,
    lanes: &Lanes,
    opt: Options,
    caliper: Caliper,
) -> Result<(Stored, Secant), DiagnoseError> {
    let input = WindInput::new(&lab.material, &lab.roll, &lab.winding);
    let (wound, found) = wind_caliper(&input, lanes, opt, caliper)?;
    let (prep, map) = prepared(lab, lanes, &wound, &AgeOptions::default())?;
    Ok((Stored { wound, prep, map }, found))
}

/// The features of a stored roll on `lanes` aged (`aged`) with `creep` per lane.
fn features_of(lab: &Case, lanes: &Lanes, creep: &[LaneCreep], s: Stored, aged: Aged) -> Features {
    let o = super::actions::Outcome {
        unwind: super::unwind::at_unwind(lab, &s.wound, creep, lanes),
        wound: s.wound,
        aged,
    };
    features::compute(lab, lanes, &o)
}

/// A roll on `lanes` wound on `opt`'s grid with its compressed caliper set as `caliper` says
/// ([`wind_caliper`]) and run through storage with `creep` per lane: its features and the
/// caliper its winding used.
fn roll_features(
    lab: &Case,
    lanes: &Lanes,
    creep: &[LaneCreep],
    opt: Options,
    caliper: Caliper,
) -> Result<(Features, Secant), DiagnoseError> {
    let (s, found) = stored(lab, lanes, opt, caliper)?;
    let aged = age_prepared(&lab.material, &s.prep, &s.wound, Some(creep), &s.map)
        .map_err(FitError::from)?;
    Ok((features_of(lab, lanes, creep, s, aged), found))
}

/// Noise rolls run through storage side by side ([`age_prepared_across`]).
const SIDE_BY_SIDE: usize = 4;

/// Stored rolls `s` aged with the creep of `inputs` (as many), [`SIDE_BY_SIDE`] at a time
/// where there are that many (each roll's record as it would have on its own).
fn age_group(
    lab: &Case,
    s: &[Stored],
    inputs: &[(Lanes, Vec<LaneCreep>)],
) -> Vec<Result<Aged, AgeError>> {
    let roll = |m: usize| -> RollStore { (&s[m].prep, &s[m].wound, &inputs[m].1, &s[m].map) };
    if s.len() == SIDE_BY_SIDE && inputs.len() == SIDE_BY_SIDE {
        let rolls: [RollStore; SIDE_BY_SIDE] = std::array::from_fn(roll);
        return age_prepared_across(&lab.material, rolls).into();
    }
    (0..s.len().min(inputs.len()))
        .map(|m| {
            let (prep, wound, creep, map) = roll(m);
            age_prepared(&lab.material, prep, wound, Some(creep), map)
        })
        .collect()
}

/// Features of the diagnosed roll on lanes `l0` (its own lanes with some profiles made uniform,
/// [`super::band_place::flat_lanes`]), each lane's fitted creep kept, wound at the diagnosis's
/// `nodes`: what the roll shows without those measured profiles.
pub(super) fn flattened_features(
    case: &Case,
    fitted: &Fitted,
    nodes: usize,
    l0: &Lanes,
) -> Result<Features, DiagnoseError> {
    let start = (fitted.wound.secant).scaled(fitted.lanes.mean_caliper_m, l0.mean_caliper_m);
    let opt = Options::with_nodes(nodes);
    roll_features(case, l0, &fitted.creep, opt, Caliper::Fill(start)).map(|(f, _)| f)
}

/// Creep per lane of a noise-only roll: the pooled log-scales moved by one of the lane's own
/// posterior draws' deviations from its fitted log-scales, so the correlation of the two scales
/// is kept; a scale the data do not identify does not move. The draw is the one at the normal
/// quantile of the lane's score in a realisation of the survey readings' `field`
/// ([`crate::fit::field`]: lanes on `e`, edges, that share readings move together), else a
/// random draw per lane.
fn noisy_creep(
    lab: &Case,
    (fit, field, e): (&crate::fit::RollFit, Option<&Field>, &[f64]),
    rng: &mut ChaCha8Rng,
) -> Vec<LaneCreep> {
    let pooled = [fit.pooled_md_creep_scale, fit.pooled_radial_creep_scale].map(f64::ln);
    let field = field.map(|f| (f.draw(rng), f));
    (fit.lanes.iter().enumerate())
        .map(|(i, l)| {
            let n = l.draws_theta.len();
            let t = if n == 0 {
                pooled
            } else {
                let k = match &field {
                    Some((z, f)) if coupled(l.pinned) => f.pick(z, &l.draws_theta, (e, i)),
                    _ => rng.random_range(0..n),
                };
                let d = l.draws_theta[k];
                // a scale pinned to the roll's value moves with the roll, not per lane
                [0, 1].map(|i| {
                    if l.pinned[i] {
                        pooled[i]
                    } else {
                        pooled[i] + d[i] - l.theta[i]
                    }
                })
            };
            creep_from(&lab.material, &t)
        })
        .collect()
}

/// Features of [`NOISE_ROLLS`] noise-only uniform rolls wound on `opt`'s grid (drawn in a fixed
/// order from `rng`, run in parallel, collected in order), with caliper noise `rep` (m). `clean`:
/// the noise-free roll's mean caliper (m) and where its secant ended. Each noise roll is wound with
/// the clean roll's compressed caliper scaled by its own mean caliper ([`Caliper::Given`]), which
/// fills the stated diameter to first order: its build ends within about 0.5 % of the wound depth
/// of it. That shifts every lane alike; the roll-level features (core and peak pressure, strength
/// ratios) move with it, by under about 1 % of their floors, far inside the floors' sampling error
/// over 24 rolls. One winding each, where filling the diameter took two. A noise roll the scaled
/// caliper leaves more than [`crate::winding`]'s like-roll tolerance from the diameter (caliper
/// noise of several per cent) fills the diameter instead.
fn noise_rolls(
    lab: &Case,
    fitted: &Fitted,
    rep: f64,
    (opt, clean): (Options, (f64, Secant)),
    rng: &mut ChaCha8Rng,
) -> Result<Vec<Features>, DiagnoseError> {
    use rayon::prelude::*;
    let (edges, field) = (fitted.lanes.edges_m(), Field::of(lab));
    let inputs: Vec<(Lanes, Vec<LaneCreep>)> = (0..NOISE_ROLLS)
        .map(|_| {
            let l = uniform_lanes(lab, &fitted.lanes, Some((&mut *rng, rep)));
            let on = (&fitted.fit, field.as_ref(), edges.as_slice());
            (l, noisy_creep(lab, on, &mut *rng))
        })
        .collect();
    let rolls: Vec<Stored> = inputs
        .par_iter()
        .map(|(l, _)| {
            // no clean secant to scale (never the case after a winding): fill the diameter; a
            // noise roll whose build the scaled caliper does not bring to the diameter (large
            // caliper noise) fills it, starting there
            match clean.1.scaled(clean.0, l.mean_caliper_m) {
                Some(s) => stored(lab, l, opt, Caliper::Given(s))
                    .or_else(|_| stored(lab, l, opt, Caliper::Fill(Some(s)))),
                None => stored(lab, l, opt, Caliper::Fill(None)),
            }
            .map(|(s, _)| s)
        })
        .collect::<Result<_, _>>()?;
    let aged: Vec<Result<Aged, AgeError>> = (rolls.par_chunks(SIDE_BY_SIDE))
        .zip(inputs.par_chunks(SIDE_BY_SIDE))
        .flat_map_iter(|(s, i)| age_group(lab, s, i))
        .collect();
    (rolls.into_iter().zip(aged).zip(&inputs))
        .map(|((s, a), (l, c))| Ok(features_of(lab, l, c, s, a.map_err(FitError::from)?)))
        .collect()
}

/// The one-sided tests of `table`'s deciding conditions (first condition of each rule; a range
/// counts twice) and one for the web-profile test when a rule rests on the web: the deciding
/// (feature, side) pairs and the number of tests.
fn deciding_tests(table: &Table) -> (Vec<(Feature, Side)>, usize) {
    let mut deciding: Vec<(Feature, Side)> = Vec::new();
    for c in table.rules.iter().filter_map(|r| r.when.first()) {
        let t = (c.feature, Side::of(c));
        if !deciding.contains(&t) {
            deciding.push(t);
        }
    }
    let web = table.rules.iter().any(|r| r.when.iter().any(rests_on_web));
    let tests = deciding.iter().map(|(_, s)| s.tests()).sum::<usize>() + usize::from(web);
    (deciding, tests)
}

/// A condition that makes a rule rest on the web's own profile at winding.
pub(super) fn rests_on_web(c: &crate::rules::Condition) -> bool {
    c.feature == Feature::WebLengthShare && c.above.is_some()
}

/// Floors of the deciding features of `table`'s rules from [`NOISE_ROLLS`] noise-only uniform
/// rolls (wound on the grid of [`noise_options`], run in parallel, drawn in a fixed order),
/// the caliper band test, and the resolution note. The uniform value a finding is measured from
/// is the noise-free roll at the diagnosis's own `nodes`; the noise deviations are measured from
/// the noise-free roll at the noise rolls' nodes.
pub(super) fn noise_floor(
    lab: &Case,
    fitted: &Fitted,
    table: &Table,
    nodes: usize,
) -> Result<Floor, DiagnoseError> {
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
    // the noise-free roll's secant starts from the measured roll's (as a like roll's)
    let start = (fitted.wound.secant).scaled(fitted.lanes.mean_caliper_m, l0.mean_caliper_m);
    let own = Options::with_nodes(nodes);
    let (uniform, _) = roll_features(lab, &l0, &pooled, own, Caliper::Fill(start))?;
    let coarse = noise_options(lab, nodes);
    let (clean, found) = roll_features(lab, &l0, &pooled, coarse, Caliper::Fill(start))?;
    let mut rng = ChaCha8Rng::seed_from_u64(posterior::seed_for(&lab.id, NOISE_SEED_LANE));
    let at = (coarse, (l0.mean_caliper_m, found));
    let rolls = noise_rolls(lab, fitted, rep, at, &mut rng)?;
    let (deciding, tests) = deciding_tests(table);
    let level = FAMILY_LEVEL / tests.max(1) as f64;
    let n = rolls.len().max(1) as f64;
    let q = crate::stats::student_t_isf(level, (n - 1.0).max(1.0)) * (1.0 + 1.0 / n).sqrt();
    let band = band_test(lab, &fitted.lanes, rep, level);
    let web = web_test(lab, level);
    let band_pct = band.threshold_sigmas * rep / fitted.lanes.mean_caliper_m.max(1e-12) * 100.0;
    let floor_of = |x: Feature| {
        let dev: Vec<f64> = rolls.iter().map(|f| f.get(x) - clean.get(x)).collect();
        let mut v: Vec<f64> = dev.iter().map(|d| d.abs()).collect();
        v.sort_by(f64::total_cmp);
        let m = dev.iter().sum::<f64>() / n;
        let sd = (dev.iter().map(|d| (d - m).powi(2)).sum::<f64>() / (n - 1.0).max(1.0)).sqrt();
        let lo = dev.iter().copied().fold(0.0, f64::min);
        let hi = dev.iter().copied().fold(0.0, f64::max);
        let (above, below) = if x == Feature::CaliperRangePct {
            (band_pct, band_pct)
        } else {
            ((m + q * sd).max(hi), (q * sd - m).max(-lo))
        };
        FeatureFloor {
            feature: x,
            uniform: uniform.get(x),
            floor: posterior::quantile(&v, FLOOR_QUANTILE),
            noise_mean: m,
            noise_sd: sd,
            noise_min: lo,
            noise_max: hi,
            threshold_above: above.max(0.0),
            threshold_below: below.max(0.0),
        }
    };
    let mut floors: Vec<FeatureFloor> = Vec::new();
    for (x, _) in &deciding {
        if !floors.iter().any(|f| f.feature == *x) {
            floors.push(floor_of(*x));
        }
    }
    let resolution = Note::Resolution {
        caliper_repeatability_m: rep,
        band_m: band.threshold_sigmas * rep,
        lane_excess_mm_per_m: floor_of(Feature::LocalPeakMmPerM).threshold(Side::Up),
        centre_edges_mm_per_m: floor_of(Feature::CentreMinusEdgesMmPerM).threshold(Side::Both),
        crown_m: None,
    };
    Ok(Floor {
        floors,
        level,
        band,
        web,
        resolution,
    })
}
