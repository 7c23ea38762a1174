//! Synthetic measurements from the forward model with known per-lane creep parameters and seeded
//! noise: the ground truth for parameter-recovery tests and for generating invented demo data.

use crate::case::{Case, Measure, Profile};
use crate::lanes::Lanes;
use crate::numeric::closest_index;
use crate::storage::{age_prepared, prepare, AgeError, AgeOptions, LaneCreep};
use crate::winding::Wound;

/// SplitMix64 generator (Steele, Lea and Flood 2014): small, seeded, reproducible everywhere.
#[derive(Debug, Clone)]
pub struct Rng(u64);

impl Rng {
    /// A generator from a seed.
    pub fn new(seed: u64) -> Self {
        Rng(seed)
    }
    /// Next 64 random bits.
    pub fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }
    /// Uniform in (0, 1).
    pub fn uniform(&mut self) -> f64 {
        ((self.next_u64() >> 11) as f64 + 0.5) / (1u64 << 53) as f64
    }
    /// Standard normal (Box-Muller).
    pub fn normal(&mut self) -> f64 {
        let (u1, u2) = (self.uniform(), self.uniform());
        (-2.0 * u1.ln()).sqrt() * (2.0 * std::f64::consts::PI * u2).cos()
    }
}

/// What to synthesise: the true creep per lane, the ages, the noise and the seed.
#[derive(Debug, Clone, Copy)]
pub struct Truth<'a> {
    /// Creep parameters per lane.
    pub creep: &'a [LaneCreep],
    /// Ages of the readings, s.
    pub ages_s: &'a [f64],
    /// One-sigma noise of a hardness reading, scale units.
    pub hardness_sd: f64,
    /// One-sigma noise of a diameter reading, m.
    pub diameter_sd_m: f64,
    pub seed: u64,
}

/// Hardness and diameter profiles at `truth.ages_s` at the lane centres, predicted with
/// `truth.creep` per lane plus Gaussian noise. Diameters are the model's lane diameters; hardness
/// reads the surface pressure through the map a fit of the case would use
/// ([`super::hardness_map`]: its calibration, else anchored at its own earliest hardness
/// readings, else the default map of 60 units at 250 kPa), so readings are on the hardness scale.
pub fn profiles(
    case: &Case,
    lanes: &Lanes,
    wound: &Wound,
    truth: &Truth,
) -> Result<Vec<Profile>, AgeError> {
    let mut times = lanes.measurement_ages();
    times.extend_from_slice(truth.ages_s);
    let prep = prepare(
        &super::store_input(case, &times),
        lanes,
        &AgeOptions::default(),
    );
    let map = super::hardness_map(
        case.hardness.calibration.as_ref(),
        &case.material,
        lanes,
        wound,
        &prep,
    )?;
    let a = age_prepared(&case.material, &prep, wound, Some(truth.creep), &map)?;
    let mut rng = Rng::new(truth.seed);
    let positions = lanes.positions();
    let origin = format!("synthetic (seed {})", truth.seed);
    let mut out = Vec::new();
    for &t in truth.ages_s {
        let k = closest_index(&a.times_s, t);
        let h: Vec<f64> = a
            .lanes
            .iter()
            .map(|l| l.hardness[k] + truth.hardness_sd * rng.normal())
            .collect();
        let d: Vec<f64> = a
            .lanes
            .iter()
            .map(|l| l.diameter_m[k] + truth.diameter_sd_m * rng.normal())
            .collect();
        out.push(Profile {
            what: Measure::Hardness,
            age_s: t,
            positions_m: positions.clone(),
            values: h,
            origin: origin.clone(),
        });
        out.push(Profile {
            what: Measure::Diameter,
            age_s: t,
            positions_m: positions.clone(),
            values: d,
            origin: origin.clone(),
        });
    }
    Ok(out)
}

/// The case's lanes and wound state at the default resolution.
fn wound_default(case: &Case) -> Result<(Lanes, Wound), SynthError> {
    let l = crate::lanes::build(case);
    let w = crate::winding::wind(
        &crate::winding::WindInput::new(&case.material, &case.roll, &case.winding),
        &l,
        crate::winding::Options::default(),
    )?;
    Ok((l, w))
}

/// A roll for recovery checks: `case` with its hardness and diameter surveys replaced by
/// synthetic ones at `ages_s` (s) from per-lane creep scales drawn log-uniform (MD 0.5-2,
/// radial 0.5-3, from `seed`), read with noise of `hardness_sd` (scale units) and
/// `diameter_sd_m` (m). Returns the roll and the true (MD, radial) scales per lane.
pub fn recovery_roll(
    mut case: Case,
    seed: u64,
    ages_s: &[f64],
    hardness_sd: f64,
    diameter_sd_m: f64,
) -> Result<(Case, Vec<(f64, f64)>), SynthError> {
    case.profiles.retain(|p| p.what == Measure::Caliper);
    let (l, w) = wound_default(&case)?;
    let mut rng = Rng::new(seed);
    let truth: Vec<(f64, f64)> = (0..l.lanes.len())
        .map(|_| {
            (
                0.5 * 4f64.powf(rng.uniform()),
                0.5 * 6f64.powf(rng.uniform()),
            )
        })
        .collect();
    let creep: Vec<LaneCreep> = truth
        .iter()
        .map(|&(a, b)| super::creep_from(&case.material, &[a.ln(), b.ln()]))
        .collect();
    let t = Truth {
        creep: &creep,
        ages_s,
        hardness_sd,
        diameter_sd_m,
        seed: seed + 1000,
    };
    let p = profiles(&case, &l, &w, &t)?;
    case.profiles.extend(p);
    case.hardness.repeatability = hardness_sd.max(0.05);
    Ok((case, truth))
}

/// Distances of the fitted identifiable log-scales of `fit` from the `truth` (MD, radial per
/// lane), in posterior standard deviations.
pub fn recovery_z(fit: &super::RollFit, truth: &[(f64, f64)]) -> Vec<f64> {
    let mut z = Vec::new();
    for (lf, t) in fit.lanes.iter().zip(truth) {
        let u = &lf.uncertainty;
        for (v, sd, ident, tv) in [
            (
                lf.params.md_creep_scale,
                u.md_creep_scale_factor,
                lf.md_identifiable,
                t.0,
            ),
            (
                lf.params.radial_creep_scale,
                u.radial_creep_scale_factor,
                lf.radial_identifiable,
                t.1,
            ),
        ] {
            if ident {
                z.push((v.ln() - tv.ln()).abs() / sd.ln());
            }
        }
    }
    z
}

/// A synthetic recovery roll could not be made.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SynthError {
    #[error(transparent)]
    Wind(#[from] crate::winding::WindError),
    #[error(transparent)]
    Age(#[from] AgeError),
}

/// The positions field readings are given at: the case's earliest hardness (else diameter, else
/// caliper) profile's, as the case gives it; else `centres` (m).
fn reading_positions(case: &Case, centres: &[f64]) -> Vec<f64> {
    [Measure::Hardness, Measure::Diameter, Measure::Caliper]
        .iter()
        .find_map(|m| {
            case.profiles
                .iter()
                .filter(|p| p.what == *m)
                .min_by(|a, b| a.age_s.total_cmp(&b.age_s))
        })
        .map(|p| p.positions_m.clone())
        .unwrap_or_else(|| centres.to_vec())
}

/// Hardness and diameter readings of an invented field case at `ages_s` (s), predicted with the
/// creep `scales` (MD, radial) in every lane plus seeded noise (the case's hardness
/// repeatability; 0.08 mm of diameter), at the positions of the case's own readings
/// (interpolated from the lane centres, so putting them in the case keeps its lanes). The case's
/// own hardness and diameter profiles at those ages are left out first, so the result depends
/// only on the rest of the case: a case holding its readings reproduces them.
pub fn field_readings(
    case: &Case,
    seed: u64,
    scales: [f64; 2],
    ages_s: &[f64],
) -> Result<Vec<Profile>, SynthError> {
    let positions = reading_positions(case, &crate::lanes::build(case).positions());
    let mut case = case.clone();
    case.profiles.retain(|p| {
        p.what == Measure::Caliper
            || !ages_s
                .iter()
                .any(|a| (a - p.age_s).abs() < 0.5 * crate::units::DAY_S)
    });
    let (l, w) = wound_default(&case)?;
    let creep =
        vec![super::creep_from(&case.material, &[scales[0].ln(), scales[1].ln()]); l.lanes.len()];
    let truth = Truth {
        creep: &creep,
        ages_s,
        hardness_sd: case.hardness.repeatability,
        diameter_sd_m: 8e-5,
        seed,
    };
    let centres = l.positions();
    Ok(profiles(&case, &l, &w, &truth)?
        .into_iter()
        .map(|p| Profile {
            values: positions
                .iter()
                .map(|&x| crate::interp::linear_extrap(&centres, &p.values, x).0)
                .collect(),
            positions_m: positions.clone(),
            ..p
        })
        .collect())
}
