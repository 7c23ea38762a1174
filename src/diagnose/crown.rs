//! The caliper crown route of the noise test: a baggy centre or baggy edges wound in from a
//! crowned (or dished) caliper profile may stand on the caliper readings themselves.
//!
//! The noise rolls judge `centre_minus_edges_ratio` against a uniform roll whose lanes' calipers
//! and creep carry measurement noise. The creep noise (what hardness and diameter reading noise
//! leaves unresolved per lane) falls on the two end lanes the feature compares with the centre,
//! so a broad crown that the readings show many times above their repeatability can still sit
//! inside that floor. A crown spreads over every reading: its quadratic component across the
//! width (the readings projected on the degree-2 polynomial of position made orthonormal over
//! them, [`super::unevenness::poly_basis`]) is normal with the repeatability as its standard
//! deviation when the profile is level (the low-order components of Neyman's smooth test;
//! Neyman 1937, Skandinavisk Aktuarietidskrift 20:149-199, from memory).
//!
//! A rule may stand on that component when its deciding condition is `centre_minus_edges_ratio`
//! and it rests neither on moisture (`moisture_share` above) nor on the web's profile at winding
//! ([`super::noise::rests_on_web`]): a winding mechanism, whose only input that varies across
//! the width is the lanes' calipers. Its share of the family's level is split before the data are
//! seen: [`OWN_SHARE`] to the noise rolls, the rest to the crown (weighted Bonferroni; Rosenthal
//! and Rubin 1983, Psychological Bulletin 94:540-541, from memory), so noise alone still puts up
//! the finding with a chance no larger than the level. The crown route also asks that the crown
//! alone fire the rule: the diagnosed roll run again with every lane's creep made the lanes' mean
//! ([`super::actions::uniform_creep`]) must still meet the deciding condition, with and without
//! the noise-free uniform roll's value (what storage alone makes of a level roll: drying or
//! wetting ends), so a crown that is real but too small does not stand on creep differences the
//! data cannot resolve or on a moisture pattern it did not make.

use super::features;
use super::noise::{rests_on_web, Side};
use super::profile_test::caliper_readings;
use super::unevenness::poly_basis;
use super::{DiagnoseError, Fitted};
use crate::case::Case;
use crate::fit::{prepared, FitError};
use crate::note::Note;
use crate::rules::{Rule, Table};
use crate::stats::{normal_isf, normal_sf};
use crate::storage::{age_prepared, AgeOptions};
use crate::vocab::{Defect, Feature, FeatureValues};

/// Share of a crown-riding rule's level given to its noise rolls' test; the rest goes to the
/// caliper crown test (an allocation fixed in advance; the crown test is far more powerful on a
/// real crown, so it needs little of the level).
pub const OWN_SHARE: f64 = 0.9;

/// The crown of the caliper readings and what it lets stand.
#[derive(Debug, Clone)]
pub(super) struct Crown {
    /// The readings' least-squares parabola across the width, centre over the outermost readings,
    /// m (negative: edges thick).
    pub(super) crown_m: f64,
    /// The crown's component over the readings' repeatability (positive: centre thick).
    pub(super) sigmas: f64,
    /// Smallest crown of either sign that stands at the crown test's share of the level, m.
    pub(super) needed_m: f64,
    /// Readings left out of the parabola as a band (farther from it than noise reaches at the
    /// level, [`crown`]).
    pub(super) left_out: usize,
    /// Features of the diagnosed roll with every lane's creep made the lanes' mean, when the
    /// crown stands above noise and a rule of the table may ride on it.
    pub(super) guard: Option<FeatureValues>,
}

/// Whether rule `r` may stand on the caliper crown: its deciding condition is
/// `centre_minus_edges_ratio` and it rests neither on moisture nor on the web's profile.
pub(super) fn rides_on_crown(r: &Rule) -> bool {
    r.when
        .first()
        .is_some_and(|c| c.feature == Feature::CentreMinusEdgesRatio)
        && !r
            .when
            .iter()
            .any(|c| rests_on_web(c) || (c.feature == Feature::MoistureShare && c.above.is_some()))
}

impl Crown {
    /// One-sided chance that noise alone crowns level readings this far on `side` (up: centre
    /// thick; both sides: twice the smaller).
    pub(super) fn chance(&self, side: Side) -> f64 {
        let (up, down) = (normal_sf(self.sigmas), normal_sf(-self.sigmas));
        let c = match side {
            Side::Up => up,
            Side::Down => down,
            Side::Both => (2.0 * up.min(down)).min(1.0),
        };
        if c.is_nan() {
            1.0
        } else {
            c
        }
    }

    /// The note of a finding of `defect` on rule `r` that stands on this crown, with the crown
    /// test's chance and level and the deciding feature on the noise-free uniform roll.
    pub(super) fn note(
        &self,
        (defect, r): (Defect, &Rule),
        (chance, level): (f64, f64),
        uniform: f64,
    ) -> Note {
        let feature = r
            .when
            .first()
            .map_or(Feature::CentreMinusEdgesRatio, |c| c.feature);
        Note::OnCaliperCrown {
            defect,
            crown_m: self.crown_m,
            sigmas: self.sigmas,
            left_out: self.left_out,
            noise_chance: chance,
            level,
            feature,
            uniform_creep: self.guard.as_ref().map_or(f64::NAN, |g| g[feature]),
            storage_part: uniform,
        }
    }

    /// The crown test of rule `r` on `side`, for a rule whose share of the family is `level`:
    /// its chance and the level it must meet ([`OWN_SHARE`]); `None` unless the crown alone meets
    /// the rule's deciding condition: with creep made uniform, and again with the noise-free
    /// uniform roll's value (`uniform`, what storage makes of a level roll: drying or wetting
    /// ends) taken out, so the crown does not stand on a moisture pattern it did not make.
    pub(super) fn route(
        &self,
        r: &Rule,
        (side, uniform): (Side, f64),
        level: f64,
    ) -> Option<(f64, f64)> {
        let fires = match (&self.guard, r.when.first()) {
            (Some(g), Some(c)) => c.holds(g[c.feature]) && c.holds(g[c.feature] - uniform),
            _ => false,
        };
        fires.then(|| (self.chance(side), level * (1.0 - OWN_SHARE)))
    }
}

/// The crown of the case's caliper readings with one-sigma repeatability `rep` (m), for a
/// family `level` per one-sided test: `None` when no rule of `table` rides on the crown or the
/// readings are too few for a quadratic component (four). The guard run is made only when the
/// crown stands above noise on either side.
pub(super) fn crown(
    (lab, fitted): (&Case, &Fitted),
    table: &Table,
    rep: f64,
    level: f64,
) -> Result<Option<Crown>, DiagnoseError> {
    if !table.rules.iter().any(rides_on_crown) {
        return Ok(None);
    }
    let (readings, positions) = caliper_readings(lab, &fitted.lanes);
    let n = readings.len().min(positions.len());
    let rep = rep.max(f64::MIN_POSITIVE);
    // a reading lies this many repeatabilities from the fit by noise alone with a chance of at
    // most `level` over all n of them (Bonferroni on the two-sided normal tail)
    let beyond = normal_isf(level / (2.0 * n.max(1) as f64));
    let Some(fit) = parabola(&readings[..n], &positions[..n], rep, beyond) else {
        return Ok(None);
    };
    let z = normal_isf((1.0 - OWN_SHARE) * level);
    let mut out = Crown {
        crown_m: fit.crown,
        sigmas: fit.crown * fit.k / rep,
        needed_m: z * rep / fit.k,
        left_out: fit.left_out,
        guard: None,
    };
    if out.sigmas.abs() >= z {
        out.guard = Some(uniform_creep_features(lab, fitted)?);
    }
    Ok(Some(out))
}

/// Drop the crown notes of findings that did not stand to the end (dropped later as unlikely or
/// on profile noise): a note says a finding stands only where it does.
pub(super) fn drop_orphan_notes(findings: &[super::Finding], notes: &mut Vec<Note>) {
    notes.retain(|n| match n {
        Note::OnCaliperCrown { defect, .. } => findings.iter().any(|f| f.defect == *defect),
        _ => true,
    });
}

/// The readings' parabola across the width after a band is left out.
struct Parabola {
    /// Crown, centre over the outermost readings kept (the readings' unit).
    crown: f64,
    /// Length of u^2's residual over the constant and linear terms at the readings kept: the
    /// crown's component is `crown k`.
    k: f64,
    /// Readings left out as a band.
    left_out: usize,
}

/// The least-squares parabola of `readings` at `positions` with one-sigma repeatability `rep`,
/// leaving out, one at a time, the reading farthest from the parabola while it lies more than
/// `threshold` repeatabilities from it (a band, which would otherwise read as a crown when it
/// lies near the centre), at most a quarter of the readings. `None` under four readings.
///
/// On level readings the threshold ([`crown`]: the Bonferroni bound of the two-sided normal tail
/// over the readings at the family's level) is passed with a chance of at most that level, so the
/// crown test is nearly always made on every reading; a reading's residual from the fit has a
/// standard deviation below the repeatability, which makes the threshold conservative.
fn parabola(readings: &[f64], positions: &[f64], rep: f64, threshold: f64) -> Option<Parabola> {
    let mut keep: Vec<usize> = (0..readings.len()).collect();
    let n = keep.len();
    loop {
        let (x, at): (Vec<f64>, Vec<f64>) =
            keep.iter().map(|&i| (readings[i], positions[i])).unzip();
        let (basis, u) = poly_basis(&at);
        let e2 = basis.get(2)?;
        // the fit's coefficient on each basis vector, and each reading's distance from the fit
        let coef: Vec<f64> = (basis.iter())
            .map(|e| e.iter().zip(&x).map(|(a, b)| a * b).sum())
            .collect();
        let fitted = |j: usize| -> f64 { basis.iter().zip(&coef).map(|(e, c)| e[j] * c).sum() };
        let (worst, dev) = (0..x.len())
            .map(|j| (j, (x[j] - fitted(j)).abs() / rep))
            .fold((0, 0.0), |a, b| if b.1 > a.1 { b } else { a });
        if dev > threshold && 4 * (n - keep.len() + 1) <= n && keep.len() > 4 {
            keep.remove(worst);
            continue;
        }
        // e2 is u^2's residual made unit: its product with u^2 is that residual's length, k > 0,
        // and a parabola of crown A (1 - u^2) has component -A k
        let k: f64 = e2.iter().zip(&u).map(|(e, p)| e * p * p).sum();
        let c = coef[2];
        return Some(Parabola {
            crown: -c / k,
            k,
            left_out: n - keep.len(),
        });
    }
}

/// Features of the diagnosed roll (its wound state) run through storage with every lane's
/// fitted creep made the lanes' mean.
fn uniform_creep_features(lab: &Case, fitted: &Fitted) -> Result<FeatureValues, DiagnoseError> {
    let mut creep = fitted.creep.clone();
    super::actions::uniform_creep(&mut creep, &fitted.lanes.widths());
    let (prep, map) = prepared(lab, &fitted.lanes, &fitted.wound, &AgeOptions::default())?;
    let aged = age_prepared(&lab.material, &prep, &fitted.wound, Some(&creep), &map)
        .map_err(FitError::from)?;
    let o = super::actions::Outcome {
        unwind: super::unwind::at_unwind(lab, &fitted.wound, &creep, &fitted.lanes),
        wound: fitted.wound.clone(),
        aged,
    };
    Ok(features::compute(lab, &fitted.lanes, &o).values)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Readings on a parabola of crown A give back A, and the component over the repeatability
    /// is A k / rep with k the length of u^2's residual over the constant and linear terms; for 5
    /// readings at u = -1, -1/2, 0, 1/2, 1, u^2 is (1, 1/4, 0, 1/4, 1), its mean 1/2, and the
    /// residual (1/2, -1/4, -1/2, -1/4, 1/2) has length sqrt(0.875) (by hand: the linear term is
    /// orthogonal to an even profile).
    #[test]
    fn a_parabola_gives_back_its_crown() {
        let pos = [0.0, 0.25, 0.5, 0.75, 1.0];
        let a = 3.0;
        let readings: Vec<f64> = pos
            .iter()
            .map(|x| 80.0 + 0.4 * x + a * (1.0 - (2.0 * x - 1.0_f64).powi(2)))
            .collect();
        let p = parabola(&readings, &pos, 0.5, 4.0).expect("five readings");
        assert!((p.k - 0.875_f64.sqrt()).abs() < 1e-12, "{}", p.k);
        assert!((p.crown - a).abs() < 1e-12, "{}", p.crown);
        assert_eq!(p.left_out, 0);
        assert!(parabola(&readings[..3], &pos[..3], 0.5, 4.0).is_none());
    }

    /// A level profile with one thick reading near the centre (a gauge band) has a quadratic
    /// component (it projects on the degree-2 polynomial), but no crown once the band is left
    /// out: 15 readings at 0.1 sigma, 0.9 above the rest at the eighth. With the band the crown
    /// reads 0.31 (4.1 sigma; NumPy 2.4.6 least squares of the same readings, `numpy.linalg.qr`),
    /// without it 0.13 (1.7 sigma, same source).
    #[test]
    fn a_band_is_left_out_of_the_crown() {
        let pos: Vec<f64> = (0..15).map(|i| 60.0 + 120.0 * i as f64).collect();
        let v = [
            20.0, 20.1, 19.9, 20.0, 20.1, 19.9, 20.3, 20.9, 20.3, 19.9, 20.0, 20.1, 20.0, 19.9,
            20.0,
        ];
        let all = parabola(&v, &pos, 0.1, f64::INFINITY).expect("readings");
        assert!((all.crown - 0.312_783).abs() < 1e-5, "{}", all.crown);
        let kept = parabola(&v, &pos, 0.1, 4.0).expect("readings");
        assert_eq!(kept.left_out, 1);
        assert!((kept.crown - 0.133_209).abs() < 1e-5, "{}", kept.crown);
        assert!((kept.crown * kept.k / 0.1 - 1.665_209).abs() < 1e-5);
    }

    /// On level readings the crown's component is standard normal in repeatability units
    /// (Neyman 1937, from memory), so the one-sided crown test at 1 % fires on 1 % of noise-only
    /// profiles: 20,000 profiles of 15 readings, binomial standard error 0.07 %, tolerance 4 of
    /// them. With a band left out beyond 3.5 repeatabilities the size hardly moves.
    #[test]
    fn the_crown_test_holds_its_level_on_level_readings() {
        use rand::{Rng, SeedableRng};
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(11);
        let pos: Vec<f64> = (0..15).map(|i| 0.06 + 0.12 * i as f64).collect();
        let z = normal_isf(0.01);
        let (mut plain, mut kept) = (0, 0);
        for _ in 0..20_000 {
            let v: Vec<f64> = (0..15)
                .map(|_| {
                    let (u1, u2): (f64, f64) = (rng.random::<f64>().max(1e-300), rng.random());
                    (-2.0 * u1.ln()).sqrt() * (std::f64::consts::TAU * u2).cos()
                })
                .collect();
            let a = parabola(&v, &pos, 1.0, f64::INFINITY).expect("readings");
            plain += usize::from(a.crown * a.k > z);
            let b = parabola(&v, &pos, 1.0, 3.5).expect("readings");
            kept += usize::from(b.crown * b.k > z);
        }
        let share = |k: usize| k as f64 / 20_000.0;
        assert!((share(plain) - 0.01).abs() < 0.0028, "{}", share(plain));
        assert!((share(kept) - 0.01).abs() < 0.0028, "{}", share(kept));
    }
}
