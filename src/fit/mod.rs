//! Fitting the storage creep model per lane to what was measured (argmin), and lab creep curves.
//!
//! **Invariant:** sees the physics only through [`crate::storage`]'s lane evaluation; no I/O.

pub mod creep_curve;
mod lane_fit;
pub mod observe;
pub mod synth;

pub use lane_fit::{
    creep_from, fit_lane, hessian2, inverse_pd, minimise, scaled, FittedParams, LaneFit,
    LaneProblem, Minimum, Objective, Residual, Uncertainty, MAX_ITERS, POOLED_PRIOR_SD_LN,
    PRIOR_SD_LN, SCALE_BOUNDS,
};

use crate::case::Case;
use crate::lanes::Lanes;
use crate::storage::{age, prepare, AgeOptions, Aged, LaneCreep};
use crate::winding::Wound;
use serde::Serialize;

/// The fit failed.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum FitError {
    #[error("fit of lane {lane} failed: {message}")]
    Lane { lane: usize, message: String },
    #[error("pooled fit failed: {0}")]
    Pooled(String),
    #[error(transparent)]
    Age(#[from] crate::storage::AgeError),
}

/// Measurement noise used in the fit.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Noise {
    pub hardness: f64,
    pub hardness_source: String,
    pub diameter_m: f64,
    pub diameter_source: &'static str,
}

/// The whole roll's fit.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RollFit {
    pub lanes: Vec<LaneFit>,
    pub pooled_md_creep_scale: f64,
    pub pooled_radial_creep_scale: f64,
    pub pooled_converged: bool,
    /// Stress-free MD strain at unwind per lane (outer third of the web), with fitted parameters.
    pub strain_at_unwind: Vec<f64>,
    /// Largest minus smallest lane strain at unwind.
    pub spread_strain: f64,
    /// The same as a length difference, mm per metre of web.
    pub spread_mm_per_m: f64,
    pub prior_sd_ln: f64,
    pub noise: Noise,
    /// Total model evaluations (lane simulations).
    pub evaluations: u64,
    pub notes: Vec<String>,
    /// The roll through storage with fitted parameters.
    #[serde(skip)]
    pub aged: Aged,
}

/// The grade's creep with laboratory creep curves applied: each direction that has lab curves
/// gets the Burgers parameters fitted to them (times shifted to the reference atmosphere with the
/// case's Arrhenius and moisture shifts). Returns the updated case and notes.
pub fn with_lab_creep(case: &Case) -> Result<(Case, Vec<String>), FitError> {
    let mut c = case.clone();
    let mut notes = Vec::new();
    let m = &case.material;
    let mc_ref = crate::storage::gab_moisture(&m.sorption, 0.5);
    for dir in ["md", "radial"] {
        let curves: Vec<creep_curve::CreepCurve> = case
            .lab_creep
            .iter()
            .filter(|t| t.direction == dir)
            .map(|t| {
                let a = crate::storage::arrhenius_shift(
                    m.creep.activation_energy_j_mol,
                    t.temperature_k,
                ) * crate::storage::moisture_shift(
                    m.creep.moisture_shift_dec_per_pct,
                    crate::storage::gab_moisture(&m.sorption, t.rh),
                    mc_ref,
                );
                creep_curve::CreepCurve {
                    stress_pa: t.stress_pa,
                    times_s: t.times_s.iter().map(|x| x / a).collect(),
                    strains: t.strains.clone(),
                }
            })
            .collect();
        if curves.is_empty() {
            continue;
        }
        let (e0, b0) = if dir == "md" {
            (m.md_modulus_pa, m.creep.md)
        } else {
            let c0 = &curves[0];
            (c0.stress_pa / c0.strains[0], m.creep.radial)
        };
        let f = creep_curve::fit_many(&curves, e0, &b0).map_err(FitError::Pooled)?;
        notes.push(format!(
            "{dir} creep from {} lab curve(s): delayed {:.3}, retardation {:.2} d, viscous time {:.0} d, elastic modulus {:.3} GPa{}",
            curves.len(),
            f.burgers.delayed,
            f.burgers.retardation_s / 86400.0,
            f.burgers.viscous_time_s / 86400.0,
            f.modulus_pa / 1e9,
            if f.converged { "" } else { " (lab-curve fit hit its iteration limit)" }
        ));
        if dir == "md" {
            c.material.creep.md = f.burgers;
        } else {
            c.material.creep.radial = f.burgers;
        }
    }
    Ok((c, notes))
}

/// Fit every lane of a roll, then predict its state at unwind.
pub fn fit_roll(
    case: &Case,
    lanes: &Lanes,
    wound: &Wound,
    opt: &AgeOptions,
) -> Result<RollFit, FitError> {
    let (lab_case, lab_notes) = with_lab_creep(case)?;
    let case = &lab_case;
    let prep = prepare(case, lanes, wound, opt);
    let (obs, mut notes) = observe::observations(case, lanes, &prep.timeline);
    notes.extend(lab_notes);
    let problems: Vec<LaneProblem> = obs
        .into_iter()
        .enumerate()
        .map(|(i, o)| LaneProblem::new(case, wound, &prep, i, o))
        .collect();
    let n = problems.len();
    // pooled fit on up to six evenly spread lanes
    let pick: Vec<usize> = if n <= 6 {
        (0..n).collect()
    } else {
        (0..6).map(|k| k * (n - 1) / 5).collect()
    };
    let sample: Vec<LaneProblem> = pick
        .iter()
        .map(|&i| LaneProblem::new(case, wound, &prep, i, problems[i].obs.clone()))
        .collect();
    let pooled_obj = Objective {
        lanes: &sample,
        prior: [0.0, 0.0],
        prior_sd: POOLED_PRIOR_SD_LN,
    };
    let pooled = minimise(&pooled_obj, [0.0, 0.0]).map_err(FitError::Pooled)?;
    let mut evaluations = pooled.evaluations * sample.len() as u64;
    let prior = [pooled.theta[0], pooled.theta[1]];
    let mut fits = Vec::with_capacity(n);
    for (i, p) in problems.iter().enumerate() {
        let f = fit_lane(p, prior).map_err(|m| FitError::Lane {
            lane: i,
            message: m,
        })?;
        evaluations += f.evaluations;
        fits.push(f);
    }
    if problems.iter().all(|p| p.steps == 0) {
        notes.push(
            "all measurements are at one age: creep parameters cannot be identified and stay at the roll's prior (grade values)".into(),
        );
    }
    let creep: Vec<LaneCreep> = fits.iter().map(|f| f.creep).collect();
    let aged = age(case, lanes, wound, Some(&creep), opt)?;
    let last = aged.times_days.len() - 1;
    let strain: Vec<f64> = aged
        .lanes
        .iter()
        .map(|l| l.strain_at_unwind[last])
        .collect();
    let lo = strain.iter().cloned().fold(f64::INFINITY, f64::min);
    let hi = strain.iter().cloned().fold(f64::NEG_INFINITY, f64::max);
    Ok(RollFit {
        lanes: fits,
        pooled_md_creep_scale: prior[0].exp(),
        pooled_radial_creep_scale: prior[1].exp(),
        pooled_converged: pooled.converged,
        strain_at_unwind: strain,
        spread_strain: hi - lo,
        spread_mm_per_m: (hi - lo) * 1e3,
        prior_sd_ln: PRIOR_SD_LN,
        noise: Noise {
            hardness: case.hardness.repeatability,
            hardness_source: if case
                .defaults
                .iter()
                .any(|d| d.field == "hardness.repeatability")
            {
                crate::case::defaults::HARDNESS_REPEAT.source.to_string()
            } else {
                "case file".into()
            },
            diameter_m: observe::DIAMETER_REPEATABILITY_M,
            diameter_source:
                "circumference tape read to about 0.1 mm of diameter (common practice)",
        },
        evaluations,
        notes,
        aged,
    })
}
