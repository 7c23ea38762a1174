//! Confidence of a diagnosis: a noise floor per rule feature, a probability per finding, lane
//! lengths with intervals, and how well the model explains each lane's measurements.
//!
//! - **States.** Each lane's creep posterior ([`crate::fit::posterior`]) gives draws; state k takes
//!   draw k of every lane (put in state order so that lanes fitted to the same survey readings
//!   move together, [`crate::fit::field`]; a pinned scale takes the pooled draw k) and runs
//!   the roll through storage to unwind. A finding's probability is the share of states in which
//!   every condition of its rule holds; each lane's length at unwind gets a standard deviation and
//!   5 %/95 % quantiles over the states.
//! - **Noise floor.** [`NOISE_ROLLS`] uniform rolls with the case's lanes, winding and storage
//!   that differ only by measurement noise: calipers drawn from the caliper repeatability at the
//!   profile readings (put on the lanes as the readings are), lane creep scales moved from the
//!   pooled scales as far as a draw of the lane's own posterior lies from its fit (what the
//!   hardness and diameter reading noise leaves unresolved; zero for a scale the data do not
//!   identify, which the fit keeps at the pooled value). A finding stands above noise when the
//!   noise-free uniform roll already fires its rule's deciding condition (the first; the pattern
//!   comes from winding or storage, not from the lanes), or when the chance that noise alone moves
//!   the deciding feature as far from the uniform roll, on the side the condition looks at, is at
//!   most [`FAMILY_LEVEL`] shared over the one-sided tests of the deciding conditions
//!   (Bonferroni), so noise alone puts up any finding at all in at most 1 % of rolls. The chance
//!   is the tail of a new noise roll's signed deviation, predicted from the noise rolls with
//!   Student's t (the sample spread of a few dozen rolls is itself uncertain; Hahn and Meeker
//!   1991), and is never below 1 / ([`NOISE_ROLLS`] + 1) while a noise roll deviates as far on
//!   that side (a guard where the tail is heavier than the model's). A rule that rests on the
//!   web's own profile at winding (`web_length_share` above) may stand on that profile's test
//!   ([`super::profile_test::web_test`]), one more test in the family; for a
//!   caliper band (deciding feature `caliper_range_pct`) from the readings themselves
//!   ([`BandTest`], Monte Carlo, no winding); a winding baggy centre or edges on the readings'
//!   crown ([`super::crown`]). A finding whose defect holds in fewer than half of the plausible
//!   states ([`Table::siblings`]) is dropped too.
//! - **Profiles within noise.** A feature that jumps (a lane going slack) has a heavier tail than
//!   the noise rolls predict. A finding that goes away when the profiles that do not stand above
//!   noise (calipers by their unevenness test: outlier, spread, wedge, crown; tension and
//!   moisture by the web-profile test) are made uniform, fitted creep kept, rests on differences
//!   noise alone can make and is dropped ([`Note::OnProfileNoise`]).
//! - Dropped findings get a note; a note states the resolution (the smallest caliper band, lane
//!   excess and centre-to-edges difference that pass).
//! - **Grading.** Likelihood from the probability (high at 0.9 or more, medium at 0.6, else low),
//!   never above the rule's own label, and high only with a clear margin over noise
//!   ([`NoiseTest::clear`]). Findings are listed by that grade, then by probability, then by
//!   the rule's weight ([`Finding::rank_cmp`]).
//! - **Consistency.** A lane whose fit misfit (root-mean-square residual in noise units) exceeds
//!   [`MISFIT_LIMIT`] is not explained; so is the roll when its pooled misfit does. Findings on
//!   such lanes, or on lanes with a scale the data do not identify, are named in notes.
//!
//! Determinism: noise draws come from ChaCha8 seeded by [`crate::fit::posterior::seed_for`] of the
//! case id and a fixed offset; every loop runs in a fixed order.
//!
//! **Invariant:** no prose; notes carry numbers (positions in m, lengths in mm per m of web).

use super::band_place::{flat_lanes, rest_unevenness, Flat};
use super::crown::{crown, drop_orphan_notes, rides_on_crown, Crown, OWN_SHARE};
use super::features::Features;
use super::noise::{
    caliper_repeatability, flattened_features, noise_floor, rests_on_web, Floor, Side,
};
pub use super::noise::{
    noise_nodes, noise_options, FeatureFloor, FAMILY_LEVEL, FLOOR_QUANTILE, NOISE_CORE_GROWTH,
    NOISE_NODES, NOISE_ROLLS, STEP_FOLLOWS,
};
use super::profile_test::caliper_readings;
pub use super::profile_test::BAND_DRAWS;
use super::states::{mechanism_shares, posterior_states, State};
use super::unevenness::caliper_unevenness;
use super::{DiagnoseError, Finding, Fitted};
use crate::case::{Case, Measure};
use crate::fit::{posterior, with_lab_creep};
use crate::note::{NoiseBasis, Note};
use crate::rules::{Rule, Table};
use crate::vocab::{Feature, Likelihood};
use serde::Serialize;

pub use crate::fit::MISFIT_LIMIT;

/// A lane's length at unwind with its spread over the plausible states.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LaneSpread {
    /// Lane centre, m.
    pub position_m: f64,
    /// Length at unwind over the width-weighted mean lane (fitted optimum), mm per m of web.
    pub excess_mm_per_m: f64,
    /// Standard deviation over the posterior states, mm/m.
    pub excess_mm_per_m_sd: f64,
    /// 5 % and 95 % quantiles over the posterior states, mm/m.
    pub excess_mm_per_m_p05: f64,
    pub excess_mm_per_m_p95: f64,
    /// Root-mean-square fit residual in units of the measurement noise (1 = noise level).
    #[serde(rename = "misfit_noise_units")]
    pub misfit: f64,
    /// Misfit at or below [`MISFIT_LIMIT`].
    pub explained: bool,
}

/// Confidence of a diagnosis.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Confidence {
    /// One-sigma caliper repeatability used, m, and where it came from.
    pub caliper_repeatability_m: f64,
    pub caliper_repeatability_source: String,
    /// Posterior states run to unwind.
    pub states: usize,
    /// Noise-only uniform rolls.
    pub noise_rolls: usize,
    /// Floor of each deciding feature of the table's rules.
    pub floors: Vec<FeatureFloor>,
    pub lanes: Vec<LaneSpread>,
    /// Root-mean-square residual of every reading of the roll, noise units.
    #[serde(rename = "roll_misfit_noise_units")]
    pub roll_misfit: f64,
    /// Rules whose finding was dropped: below the noise floor, resting on profiles within noise,
    /// or holding in fewer than half of the states.
    pub below_floor: Vec<String>,
}

impl Confidence {
    /// Whether the model explains the surveys: the roll's misfit and each lane's against
    /// [`MISFIT_LIMIT`] (the verdict every output opens with).
    pub fn model_fit(&self) -> crate::fit::ModelFit {
        let lanes = self.lanes.iter().map(|l| (l.position_m, l.misfit));
        crate::fit::explained::from_lanes(self.roll_misfit, lanes)
    }
}

/// Assess a diagnosis: drop findings below the noise floor, give each a probability and a graded
/// likelihood, and add notes on resolution and consistency. Returns the confidence.
pub fn assess(
    case: &Case,
    table: &Table,
    fitted: &Fitted,
    feats: &Features,
    findings: &mut Vec<Finding>,
    notes: &mut Vec<Note>,
    nodes: usize,
) -> Result<Confidence, DiagnoseError> {
    let (lab, _) = with_lab_creep(case)?;
    let states = posterior_states(&lab, fitted)?;
    let mut fl = noise_floor(&lab, fitted, table, nodes)?;
    let (rep, source) = caliper_repeatability(case);
    let crown = crown((&lab, fitted), table, rep, fl.level)?;
    if let (Note::Resolution { crown_m, .. }, Some(k)) = (&mut fl.resolution, &crown) {
        *crown_m = Some(k.needed_m);
    }
    let tests = (&fl, crown.as_ref());
    let mut below_floor = drop_below_floor(table, feats, tests, findings, notes);
    let on_noise = (case, fitted, nodes);
    below_floor.extend(drop_on_profile_noise(
        on_noise, table, feats, tests, findings, notes,
    )?);
    grade_findings(table, feats, tests, &states, findings);
    findings.retain(|f| {
        let keep = f.probability >= 0.5;
        if !keep {
            below_floor.push(f.rule.clone());
            notes.push(Note::Unlikely {
                defect: f.defect,
                probability: f.probability,
            });
        }
        keep
    });
    drop_orphan_notes(findings, notes);
    notes.push(fl.resolution);
    let lanes = lane_spreads(fitted, feats, &states);
    let roll_misfit = crate::fit::explained::roll_misfit(&fitted.fit);
    super::consistency::notes(fitted, &lanes, roll_misfit, findings, notes);
    findings.sort_by(Finding::rank_cmp);
    Ok(Confidence {
        caliper_repeatability_m: rep,
        caliper_repeatability_source: source,
        states: states.len(),
        noise_rolls: NOISE_ROLLS,
        floors: fl.floors,
        lanes,
        roll_misfit,
        below_floor,
    })
}

/// The noise test of a rule's deciding condition (its first).
struct NoiseTest<'a> {
    /// Floor of the deciding feature (`None`: the rule has no tested feature, so it stands).
    floor: Option<&'a FeatureFloor>,
    /// Side of the deciding condition tested.
    side: Side,
    /// The noise-free uniform roll already fires the deciding condition (the pattern comes from
    /// winding or storage, not from the lanes).
    own: bool,
    /// One-sided chance that measurement noise alone moves the deciding feature this far from the
    /// uniform roll.
    chance: f64,
    /// Level the chance must not exceed: [`FAMILY_LEVEL`] over the number of features tested.
    level: f64,
    /// The test that gave `chance`.
    basis: NoiseBasis,
}

impl NoiseTest<'_> {
    fn stands(&self) -> bool {
        self.own || self.chance <= self.level
    }
    /// A clear margin for a high likelihood: noise alone at least ten times less likely than
    /// the test's level (common practice for a "clear" margin, not a published value).
    fn clear(&self) -> bool {
        self.own || self.chance <= 0.1 * self.level
    }
}

/// The noise test of rule `r` on the diagnosed roll's features, for a finding on lanes `on`
/// (indices; empty for the roll as a whole).
fn noise_test<'a>(
    r: &Rule,
    on: &[usize],
    feats: &Features,
    (fl, crown): Tests<'a>,
) -> NoiseTest<'a> {
    // a rule that may ride on the caliper crown gives that test its share of the level
    let riding = crown.filter(|_| rides_on_crown(r));
    let level = fl.level * if riding.is_some() { OWN_SHARE } else { 1.0 };
    let found = r.when.first().and_then(|c| {
        fl.floors
            .iter()
            .find(|x| x.feature == c.feature)
            .map(|x| (c, x))
    });
    let Some((c, x)) = found else {
        return NoiseTest {
            floor: None,
            side: Side::Both,
            own: true,
            chance: 0.0,
            level,
            basis: NoiseBasis::NoiseRolls,
        };
    };
    // a rule that rests on the caliper profile (thick lanes long, a caliper range, or a diameter
    // ridge at winding, which the winding model builds from the lanes' calipers alone: they are
    // its only input that varies across the width) may stand on the band test: its false alarms
    // are already counted in the family's share
    let on_caliper = r.when.iter().any(|k| {
        k.above.is_some()
            && matches!(
                k.feature,
                Feature::CaliperRangePct
                    | Feature::CaliperCorrelation
                    | Feature::DiameterRidgePerMille
            )
    });
    // but only where the finding's lanes carry a reading that stands out: a band at one place
    // lends no significance to a pattern at another (where none stands out anywhere, the test's
    // own chance, which then does not pass)
    let carriers = &fl.band.carriers;
    let carried = on.is_empty() || carriers.is_empty() || on.iter().any(|i| carriers.contains(i));
    let band_chance = if carried { fl.band.chance } else { 1.0 };
    let side = Side::of(c);
    let own_chance = x.chance(feats.get(c.feature) - x.uniform, side);
    // a rule that rests on the web's own profile at winding may stand on that profile's test,
    // counted in the family as one more test
    let web_chance = match &fl.web {
        Some(w) if r.when.iter().any(rests_on_web) => w.chance,
        Some(_) | None => 1.0,
    };
    let (chance, basis) =
        if c.feature == Feature::CaliperRangePct || (on_caliper && band_chance < own_chance) {
            (band_chance, NoiseBasis::CaliperReadings)
        } else if !on_caliper && web_chance < own_chance {
            (web_chance, NoiseBasis::WebProfile)
        } else {
            (own_chance, NoiseBasis::NoiseRolls)
        };
    let test = NoiseTest {
        floor: Some(x),
        side,
        own: c.holds(x.uniform),
        chance,
        level,
        basis,
    };
    // the crown route, where the crown alone fires the rule and it is the stronger evidence
    match riding.and_then(|k| k.route(r, (side, x.uniform), fl.level)) {
        Some((chance, level)) if chance / level < test.chance / test.level => NoiseTest {
            chance,
            level,
            basis: NoiseBasis::CaliperCrown,
            ..test
        },
        _ => test,
    }
}

/// The indices of a finding's lanes.
fn lanes_of(f: &Finding) -> Vec<usize> {
    f.lanes.iter().map(|l| l.index).collect()
}

/// What the noise test of a rule reads: the noise floor and the caliper crown, when the table has
/// a rule that may ride on it.
type Tests<'a> = (&'a Floor, Option<&'a Crown>);

/// Drop the findings that do not stand above the noise floor, with a note each; their rules.
fn drop_below_floor(
    table: &Table,
    feats: &Features,
    tests: Tests<'_>,
    findings: &mut Vec<Finding>,
    notes: &mut Vec<Note>,
) -> Vec<String> {
    let mut below = Vec::new();
    findings.retain(|f| {
        let Some(r) = table.rules.iter().find(|r| r.id == f.rule) else {
            return true;
        };
        let t = noise_test(r, &lanes_of(f), feats, tests);
        if t.stands() {
            if let (NoiseBasis::CaliperCrown, Some(k)) = (t.basis, tests.1) {
                let uniform = t.floor.map_or(0.0, |x| x.uniform);
                notes.push(k.note((f.defect, r), (t.chance, t.level), uniform));
            }
            return true;
        }
        below.push(f.rule.clone());
        if let Some(x) = t.floor {
            notes.push(Note::BelowNoiseFloor {
                defect: f.defect,
                feature: x.feature,
                value: feats.get(x.feature),
                uniform: x.uniform,
                threshold: x.threshold(t.side),
                noise_chance: t.chance,
                level: t.level,
                basis: t.basis,
            });
        }
        false
    });
    below
}

/// Drop the findings that come from the lanes' profiles alone while the profiles do not stand
/// above noise, with a note each; their rules.
///
/// The noise rolls predict a feature's tail from a few dozen rolls as if it were smooth; a
/// feature that jumps (a lane going slack makes the strength ratios leap) has a heavier tail
/// than that. So the profiles that do not stand above noise at the family's level (the lanes'
/// calipers by the caliper readings' unevenness test,
/// [`super::profile_test::unevenness_chance`]: an outlying reading, the spread, a wedge or a
/// crown; the tension and moisture profiles at winding by the web-profile test) are made
/// uniform, the others kept, and the roll is run once more with each lane's fitted creep
/// ([`flattened_features`]); a finding whose deciding condition no longer holds there rests on
/// profile differences that noise alone can make, and is dropped. Findings the noise-free
/// uniform roll already gives are left. This overrides a finding's own noise test however
/// clear: a pattern the readings cannot resolve above their noise is not a finding, even where
/// the model amplifies it.
fn drop_on_profile_noise(
    (case, fitted, nodes): (&Case, &Fitted, usize),
    table: &Table,
    feats: &Features,
    tests: Tests<'_>,
    findings: &mut Vec<Finding>,
    notes: &mut Vec<Note>,
) -> Result<Vec<String>, DiagnoseError> {
    let fl = tests.0;
    let (rep, _) = caliper_repeatability(case);
    // each kind of profile is made uniform when the lanes differ by it and it does not stand
    // above noise; one that stands is kept
    let differ = fitted
        .lanes
        .lanes
        .iter()
        .any(|l| l.caliper_deviation != 0.0);
    let calipers = if differ {
        caliper_unevenness(case, &fitted.lanes, rep, fl.band.chance)
    } else {
        0.0
    };
    let has_web = case
        .profiles
        .iter()
        .any(|p| matches!(p.what, Measure::Tension | Measure::Moisture));
    let web = if has_web {
        fl.web.as_ref().map_or(1.0, |w| w.chance)
    } else {
        0.0
    };
    let (flat_calipers, calipers) = caliper_flat((case, fitted), rep, fl, (differ, calipers));
    let flatten = (flat_calipers != Flat::Keep, web > fl.level);
    let rule_of = |f: &Finding| table.rules.iter().find(|r| r.id == f.rule);
    let asks =
        |f: &Finding| rule_of(f).is_some_and(|r| !noise_test(r, &lanes_of(f), feats, tests).own);
    if flatten == (false, false) || !findings.iter().any(asks) {
        return Ok(Vec::new());
    }
    // the most uneven of the profiles made uniform
    let profile_chance = match flatten {
        (true, true) => calipers.min(web),
        (true, false) => calipers,
        _ => web,
    };
    let kept_m: Vec<f64> = match &flat_calipers {
        Flat::Except(keep) => {
            let (_, at) = caliper_readings(case, &fitted.lanes);
            keep.iter().filter_map(|&i| at.get(i).copied()).collect()
        }
        Flat::All | Flat::Keep => Vec::new(),
    };
    let l0 = flat_lanes(case, &fitted.lanes, &flat_calipers, flatten.1);
    let flat = flattened_features(case, fitted, nodes, &l0)?;
    let mut dropped = Vec::new();
    findings.retain(|f| {
        let Some(c) = rule_of(f).filter(|_| asks(f)).and_then(|r| r.when.first()) else {
            return true;
        };
        if c.holds(flat.get(c.feature)) {
            return true;
        }
        dropped.push(f.rule.clone());
        notes.push(Note::OnProfileNoise {
            defect: f.defect,
            feature: c.feature,
            value: feats.get(c.feature),
            flattened: flat.get(c.feature),
            profile_chance,
            level: fl.level,
            kept_readings: kept_m.len(),
            kept_span_m: (
                kept_m.first().copied().unwrap_or(0.0),
                kept_m.last().copied().unwrap_or(0.0),
            ),
        });
        false
    });
    Ok(dropped)
}

/// What of the calipers a re-run without the profiles noise can make makes uniform, and the
/// chance that noise alone makes what it flattens as uneven: all of them where they do not stand
/// above noise (`chance`, the unevenness test; the lanes' calipers differ where `differ`); where
/// they stand by their bands alone, all but the bands (a band that stands lends nothing to the
/// noise elsewhere on the profile); else none.
fn caliper_flat(
    (case, fitted): (&Case, &Fitted),
    rep: f64,
    fl: &Floor,
    (differ, chance): (bool, f64),
) -> (Flat, f64) {
    let standing = &fl.band.standing;
    if chance > fl.level {
        return (Flat::All, chance);
    }
    if differ && !standing.is_empty() {
        let rest = rest_unevenness(case, &fitted.lanes, rep, standing);
        if rest > fl.level {
            return (Flat::Except(standing.clone()), rest);
        }
    }
    (Flat::Keep, chance)
}

/// Each finding's probability over the states and its likelihood graded from it.
fn grade_findings(
    table: &Table,
    feats: &Features,
    tests: Tests<'_>,
    states: &[State],
    findings: &mut [Finding],
) {
    for f in findings.iter_mut() {
        let Some(r) = table.rules.iter().find(|r| r.id == f.rule) else {
            continue;
        };
        let siblings = table.siblings(r);
        let held: Vec<bool> = (states.iter())
            .map(|s| siblings.iter().any(|q| q.holds(&s.values)))
            .collect();
        let holds = held.iter().filter(|&&h| h).count();
        f.probability = holds as f64 / states.len().max(1) as f64;
        f.mechanisms = mechanism_shares(r, &siblings, states);
        let test = noise_test(r, &lanes_of(f), feats, tests);
        f.likelihood = grade(f.probability, test.clear(), r.likelihood);
        if let (Some(d), Some(e)) = (r.when.first(), f.evidence.first()) {
            let v: Vec<(f64, bool)> = (states.iter().zip(held))
                .map(|(s, h)| (s.values[d.feature], h))
                .collect();
            super::corrections::remains_over_states(&mut f.corrections, d, e.value, &v);
        }
        for e in f.evidence.iter_mut() {
            let mut v: Vec<f64> = states.iter().map(|s| s.values[e.feature]).collect();
            v.sort_by(f64::total_cmp);
            if !v.is_empty() {
                e.p05 = Some(posterior::quantile(&v, 0.05));
                e.p95 = Some(posterior::quantile(&v, 0.95));
            }
        }
        if let (Some(e), Some(x), NoiseBasis::NoiseRolls, false) =
            (f.evidence.first_mut(), test.floor, test.basis, test.own)
        {
            e.noise_threshold = match test.side {
                Side::Up => Some(x.uniform + x.threshold_above),
                Side::Down => Some(x.uniform - x.threshold_below),
                Side::Both => None,
            };
        }
    }
}

/// Likelihood from a probability, capped by the rule's label; high needs a clear margin over
/// noise ([`NoiseTest::clear`]).
fn grade(p: f64, wide: bool, label: Likelihood) -> Likelihood {
    let g = if p >= 0.9 && wide {
        Likelihood::High
    } else if p >= 0.6 {
        Likelihood::Medium
    } else {
        Likelihood::Low
    };
    if g.rank() <= label.rank() {
        g
    } else {
        label
    }
}

/// Each lane's length at unwind with its spread over the states, and its misfit.
fn lane_spreads(fitted: &Fitted, feats: &Features, states: &[State]) -> Vec<LaneSpread> {
    fitted
        .fit
        .lanes
        .iter()
        .enumerate()
        .map(|(i, l)| {
            let mut v: Vec<f64> = states.iter().map(|s| s.excess_mm_per_m[i]).collect();
            v.sort_by(f64::total_cmp);
            let m = v.iter().sum::<f64>() / v.len().max(1) as f64;
            let var =
                v.iter().map(|x| (x - m).powi(2)).sum::<f64>() / (v.len() as f64 - 1.0).max(1.0);
            LaneSpread {
                position_m: l.position_m,
                excess_mm_per_m: feats.excess_mm_per_m[i],
                excess_mm_per_m_sd: var.sqrt(),
                excess_mm_per_m_p05: posterior::quantile(&v, 0.05),
                excess_mm_per_m_p95: posterior::quantile(&v, 0.95),
                misfit: l.rmse,
                explained: crate::fit::explained::explained(l.rmse),
            }
        })
        .collect()
}
