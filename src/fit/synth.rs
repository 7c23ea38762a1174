//! Synthetic measurements from the forward model with known per-lane creep parameters and seeded
//! noise: the ground truth for parameter-recovery tests and for generating invented demo data.

use crate::case::{Case, Measure, Profile};
use crate::lanes::Lanes;
use crate::storage::{age, AgeError, AgeOptions, LaneCreep};
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

/// Hardness and diameter profiles at `ages_s` (s) at the lane centres, predicted with `creep`
/// per lane plus Gaussian noise of `hardness_sd` (scale units) and `diameter_sd_m` (m).
/// Diameters are the model's lane diameters; hardness follows the case's hardness map.
#[allow(clippy::too_many_arguments)]
pub fn profiles(
    case: &Case,
    lanes: &Lanes,
    wound: &Wound,
    creep: &[LaneCreep],
    ages_s: &[f64],
    hardness_sd: f64,
    diameter_sd_m: f64,
    seed: u64,
) -> Result<Vec<Profile>, AgeError> {
    let mut c = case.clone();
    // make sure the time grid has steps at the requested ages
    c.profiles.extend(ages_s.iter().map(|&a| Profile {
        what: Measure::Hardness,
        age_s: a,
        positions_m: vec![],
        values: vec![],
        origin: String::new(),
    }));
    let a = age(&c, lanes, wound, Some(creep), &AgeOptions::default())?;
    let mut rng = Rng::new(seed);
    let positions = lanes.positions();
    let mut out = Vec::new();
    for &t in ages_s {
        let k = a
            .times_days
            .iter()
            .enumerate()
            .min_by(|x, y| {
                (x.1 * 86400.0 - t)
                    .abs()
                    .total_cmp(&(y.1 * 86400.0 - t).abs())
            })
            .map(|(i, _)| i)
            .unwrap_or(0);
        let h: Vec<f64> = a
            .lanes
            .iter()
            .map(|l| l.hardness[k] + hardness_sd * rng.normal())
            .collect();
        let d: Vec<f64> = a
            .lanes
            .iter()
            .map(|l| l.diameter_m[k] + diameter_sd_m * rng.normal())
            .collect();
        out.push(Profile {
            what: Measure::Hardness,
            age_s: t,
            positions_m: positions.clone(),
            values: h,
            origin: format!("synthetic (seed {seed})"),
        });
        out.push(Profile {
            what: Measure::Diameter,
            age_s: t,
            positions_m: positions.clone(),
            values: d,
            origin: format!("synthetic (seed {seed})"),
        });
    }
    Ok(out)
}
