//! Fitting the storage creep model per lane to what was measured (argmin), and lab creep curves.
//!
//! **Invariant:** sees the physics only through [`crate::storage`]'s lane evaluation; no I/O.

pub mod contradict;
pub mod creep_curve;
mod draws;
pub mod explained;
pub mod field;
mod grid;
mod hardness;
mod lane_fit;
pub mod observe;
pub mod posterior;
pub mod synth;

pub use explained::{model_fit, ModelFit, Verdict, MISFIT_LIMIT};
pub use hardness::hardness_map;
pub use lane_fit::{
    creep_from, fit_lane, hessian2, inverse_pd, minimise, scaled, FittedParams, LaneFit,
    LaneProblem, Minimum, Objective, Residual, Uncertainty, MAX_ITERS, POOLED_PRIOR_SD_LN,
    PRIOR_SD_LN, SCALE_BOUNDS,
};

use crate::case::Case;
use crate::lanes::Lanes;
use crate::note::Note;
use crate::numeric::spread;
use crate::storage::{
    age_prepared, prepare, AgeError, AgeOptions, Aged, HardnessMap, LaneCreep, Prepared, StoreInput,
};
use crate::winding::Wound;
use serde::Serialize;

/// Why a minimisation gave no answer.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SolverError {
    /// The optimiser (argmin) stopped with an error; its own message.
    #[error("{0}")]
    Optimiser(String),
    #[error("the optimiser returned no parameters")]
    NoParameters,
    #[error("the storage model failed at the optimum")]
    ModelFailed,
}

impl SolverError {
    /// An optimiser's error, kept as its message.
    fn optimiser(e: impl std::fmt::Display) -> SolverError {
        SolverError::Optimiser(e.to_string())
    }
}

/// The fit failed.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum FitError {
    #[error("fit of lane {lane} failed: {source}")]
    Lane { lane: usize, source: SolverError },
    #[error("pooled fit failed: {0}")]
    Pooled(SolverError),
    #[error("lab creep curve fit ({direction}) failed: {source}")]
    LabCurve {
        direction: &'static str,
        source: SolverError,
    },
    #[error(transparent)]
    Age(#[from] AgeError),
}

/// What storage uses of a case, with step ends at `output_times_s` (s).
pub fn store_input<'a>(case: &'a Case, output_times_s: &'a [f64]) -> StoreInput<'a> {
    StoreInput {
        material: &case.material,
        roll: &case.roll,
        wraps: &case.wraps,
        storage: &case.storage,
        output_times_s,
    }
}

/// The roll through storage with the grade's creep, at the measurement ages, with the hardness
/// map set from the case's calibration or measurements ([`hardness_map`]).
pub fn age_measured(
    case: &Case,
    lanes: &Lanes,
    wound: &Wound,
    opt: &AgeOptions,
) -> Result<Aged, FitError> {
    let (prep, map) = prepared(case, lanes, wound, opt)?;
    let aged = age_prepared(&case.material, &prep, wound, None, &map)?;
    Ok(with_limits(case, lanes, wound, aged))
}

/// The aged roll with a note for every physical limit the winding or storage result passed
/// ([`crate::limits`]), and for a wound state that disagrees with the winding-time diameters.
fn with_limits(case: &Case, lanes: &Lanes, wound: &Wound, mut aged: Aged) -> Aged {
    let found = limit_notes(case, lanes, wound, &aged);
    crate::note::push_new(&mut aged.notes, found);
    aged
}

/// A note for every physical limit a roll's winding or storage result passed
/// ([`crate::limits`]), and for a wound state that disagrees with the winding-time diameters.
pub(crate) fn limit_notes(
    case: &Case,
    lanes: &Lanes,
    wound: &Wound,
    aged: &Aged,
) -> Vec<crate::note::Note> {
    let mut found = crate::limits::after_winding(
        wound,
        lanes,
        &case.material,
        &case.roll,
        case.winding.speed_m_s,
    );
    found.extend(crate::limits::after_storage(
        aged,
        &case.material,
        &case.roll,
    ));
    found.extend(crate::limits::condensation(&case.storage, &case.material));
    found.extend(crate::limits::flat_contact(case, lanes, wound));
    found.extend(crate::limits::air_floats(case));
    found.extend(crate::limits::unwind_tension(case));
    let rep = observe::DIAMETER_REPEATABILITY_M;
    found.extend(crate::limits::against_winding_diameter(lanes, wound, rep));
    found
}

/// Measurement noise used in the fit.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Noise {
    /// One-sigma repeatability of a hardness reading, scale units.
    #[serde(rename = "hardness_hardness_units")]
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
    /// One-sigma range (15.87 % and 84.13 % quantiles) of the pooled scales' posterior: what a
    /// scale no lane's data identify carries into the lanes' lengths ([`LaneFit::draws`]).
    pub pooled_md_creep_scale_low: f64,
    pub pooled_md_creep_scale_high: f64,
    pub pooled_radial_creep_scale_low: f64,
    pub pooled_radial_creep_scale_high: f64,
    pub pooled_converged: bool,
    /// Stress-free MD strain at unwind per lane (outer third of the web), with fitted parameters.
    pub strain_at_unwind: Vec<f64>,
    /// Largest minus smallest lane strain at unwind.
    pub spread_strain: f64,
    /// The same as a length difference, mm per metre of web.
    pub spread_mm_per_m: f64,
    pub prior_sd_ln: f64,
    pub noise: Noise,
    /// Lanes whose later survey contradicts the model with pooled creep, before the per-lane
    /// fit ([`contradict`]).
    pub contradictions: Vec<contradict::Contradiction>,
    /// Total model evaluations (lane simulations).
    pub evaluations: u64,
    pub notes: Vec<Note>,
    /// The roll through storage with fitted parameters.
    #[serde(skip)]
    pub aged: Aged,
}

impl RollFit {
    /// The fit's notes and its aged roll's, each once.
    pub fn all_notes(&self) -> Vec<Note> {
        let mut v = self.notes.clone();
        crate::note::push_new(&mut v, self.aged.notes.iter().copied());
        v
    }
}

/// The grade's creep with laboratory creep curves applied: each direction that has lab curves
/// gets the Burgers parameters fitted to them (times shifted to the reference atmosphere with the
/// case's Arrhenius and moisture shifts). Returns the updated case and notes.
pub fn with_lab_creep(case: &Case) -> Result<(Case, Vec<Note>), FitError> {
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
        let f = creep_curve::fit_many(&curves, e0, &b0).map_err(|source| FitError::LabCurve {
            direction: dir,
            source,
        })?;
        notes.push(Note::LabCreep {
            direction: dir,
            curves: curves.len(),
            delayed: f.burgers.delayed,
            retardation_s: f.burgers.retardation_s,
            viscous_time_s: f.burgers.viscous_time_s,
            modulus_pa: f.modulus_pa,
            converged: f.converged,
        });
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
    let (prep, map) = prepared(case, lanes, wound, opt)?;
    let (obs, mut notes) =
        observe::observations(lanes, &prep.timeline, case.hardness.repeatability);
    notes.extend(lab_notes);
    let problems: Vec<LaneProblem> = obs
        .into_iter()
        .enumerate()
        .map(|(i, o)| LaneProblem::new(&case.material, wound, &prep, &map, i, o))
        .collect();
    let (pooled, pooled_post, pooled_evaluations) = pooled_fit(&problems, &case.id)?;
    let prior = [pooled.theta[0], pooled.theta[1]];
    let contradictions =
        contradict::contradictions(&problems, &prior, &lanes.positions(), &lanes.widths());
    notes.extend(contradiction_notes(&contradictions));
    let states = state_scores(case, lanes);
    let (fits, lane_evaluations) =
        lane_fits(&problems, (prior, &pooled_post.draws), &case.id, &states)?;
    if problems.iter().all(|p| p.steps == 0) {
        notes.push(Note::OneAge);
    }
    notes.extend(cut_note(&fits));
    let creep: Vec<LaneCreep> = fits.iter().map(|f| f.creep).collect();
    let aged = age_prepared(&case.material, &prep, wound, Some(&creep), &map)?;
    let aged = with_limits(case, lanes, wound, aged);
    let strain = aged.final_strain_at_unwind();
    let spread_strain = spread(&strain);
    // in mm/m before the difference, as `diagnose` and `triage` take it (the same bits)
    let spread_mm_per_m = spread(&strain.iter().map(|x| x * 1e3).collect::<Vec<f64>>());
    Ok(RollFit {
        lanes: fits,
        pooled_md_creep_scale: prior[0].exp(),
        pooled_radial_creep_scale: prior[1].exp(),
        pooled_md_creep_scale_low: pooled_post.low[0].exp(),
        pooled_md_creep_scale_high: pooled_post.high[0].exp(),
        pooled_radial_creep_scale_low: pooled_post.low[1].exp(),
        pooled_radial_creep_scale_high: pooled_post.high[1].exp(),
        pooled_converged: pooled.converged,
        strain_at_unwind: strain,
        spread_strain,
        spread_mm_per_m,
        prior_sd_ln: PRIOR_SD_LN,
        noise: noise(case),
        contradictions,
        evaluations: pooled_evaluations + lane_evaluations,
        notes,
        aged,
    })
}

/// A note when any lane's posterior was cut at the edge of its widest grid.
fn cut_note(fits: &[LaneFit]) -> Option<Note> {
    let cut: Vec<&LaneFit> = (fits.iter())
        .filter(|f| f.uncertainty.posterior_cut)
        .collect();
    cut.first().map(|first| Note::PosteriorCut {
        lanes: cut.len(),
        position_m: first.position_m,
    })
}

/// One note per contradicted survey, naming its worst lane (largest gap between prediction and
/// survey in noise units).
fn contradiction_notes(found: &[contradict::Contradiction]) -> Vec<Note> {
    let mut notes: Vec<Note> = Vec::new();
    let gap = |c: &contradict::Contradiction| (c.measured - c.predicted).abs() / c.sigma;
    for c in found {
        let same = |n: &Note| matches!(n, Note::SurveyContradicts { what, age_s, .. } if *what == c.what && *age_s == c.age_s);
        if notes.iter().any(same) {
            continue;
        }
        let group: Vec<&contradict::Contradiction> = found
            .iter()
            .filter(|d| d.what == c.what && d.age_s == c.age_s)
            .collect();
        let worst = group
            .iter()
            .copied()
            .fold(c, |a, d| if gap(d) > gap(a) { d } else { a });
        notes.push(Note::SurveyContradicts {
            what: c.what,
            age_s: c.age_s,
            lanes: group.len(),
            position_m: worst.position_m,
            predicted: worst.predicted,
            measured: worst.measured,
            sigma: worst.sigma,
        });
    }
    notes
}

/// Seed offset of the pooled posterior's draws (distinct from any lane index).
const POOLED_SEED_LANE: usize = 1 << 21;

/// The pooled fit of one pair of scales on up to six evenly spread lanes, with a prior towards
/// the grade; returns the minimum, its posterior (on a grid, as a lane's: [`posterior`]) and
/// their lane simulations. The posterior's draws are what a scale the lane's own data do not
/// identify takes in each state: the roll's value is itself only as sure as its data (with no
/// later survey, as the grade prior).
fn pooled_fit(
    problems: &[LaneProblem],
    case_id: &str,
) -> Result<(Minimum, posterior::Posterior, u64), FitError> {
    let n = problems.len();
    let pick: Vec<usize> = if n <= 6 {
        (0..n).collect()
    } else {
        (0..6).map(|k| k * (n - 1) / 5).collect()
    };
    let sample: Vec<LaneProblem> = pick
        .iter()
        .map(|&i| {
            let p = &problems[i];
            LaneProblem::new(p.material, p.wound, p.prep, p.hardness, i, p.obs.clone())
        })
        .collect();
    let obj = Objective {
        lanes: &sample,
        prior: [0.0, 0.0],
        prior_sd: POOLED_PRIOR_SD_LN,
    };
    let m = minimise(&obj, [0.0, 0.0]).map_err(FitError::Pooled)?;
    let h = hessian2(&|t| obj.values(t), &m.theta, m.cost, 0.05);
    let seed = posterior::seed_for(case_id, POOLED_SEED_LANE);
    let post = posterior::quadrature(&obj, (&m.theta, m.cost), h, POOLED_PRIOR_SD_LN, seed);
    let evaluations = (m.evaluations + 8 + post.evaluations) * sample.len() as u64;
    Ok((m, post, evaluations))
}

/// Each lane's fit with a prior towards the pooled log-scales, its pseudo-draws seeded from the
/// case id and the lane; returns the fits and their simulations.
///
/// Lanes are fitted in parallel (each fit is a pure function of its lane and seed); results are
/// taken in lane order, and the first failing lane by index is reported, so the output does not
/// depend on the number of threads.
fn lane_fits(
    problems: &[LaneProblem],
    prior: ([f64; 2], &[[f64; 2]]),
    case_id: &str,
    states: &[Vec<f64>],
) -> Result<(Vec<LaneFit>, u64), FitError> {
    use rayon::prelude::*;
    let all: Vec<_> = problems
        .par_iter()
        .enumerate()
        .map(|(lane, p)| {
            let scores = states.get(lane).map(Vec::as_slice);
            fit_lane(p, prior, posterior::seed_for(case_id, lane), scores)
        })
        .collect();
    let mut fits = Vec::with_capacity(problems.len());
    let mut evaluations = 0;
    for (lane, f) in all.into_iter().enumerate() {
        let f = f.map_err(|source| FitError::Lane { lane, source })?;
        evaluations += f.evaluations;
        fits.push(f);
    }
    Ok((fits, evaluations))
}

/// Seed offset of the states' score fields (distinct from any lane index and the pooled fit's).
const FIELD_SEED_LANE: usize = (1 << 21) + 1;

/// Each lane's score in each of the [`posterior::DRAWS`] states ([`field`]): one realisation of
/// the survey positions' field per state, seeded from the case id; empty where the case has no
/// survey with two positions (the lanes' draws then stay in their own random order).
fn state_scores(case: &Case, lanes: &Lanes) -> Vec<Vec<f64>> {
    use rand::SeedableRng;
    let Some(f) = field::Field::of(case) else {
        return Vec::new();
    };
    let mut rng =
        rand_chacha::ChaCha8Rng::seed_from_u64(posterior::seed_for(&case.id, FIELD_SEED_LANE));
    let z: Vec<Vec<f64>> = (0..posterior::DRAWS).map(|_| f.draw(&mut rng)).collect();
    let e = lanes.edges_m();
    (0..lanes.lanes.len())
        .map(|i| z.iter().map(|zk| f.score(zk, &e, i)).collect())
        .collect()
}

/// The measurement noise a case's fit uses, with where each value came from.
fn noise(case: &Case) -> Noise {
    Noise {
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
        diameter_source: "circumference tape read to about 0.1 mm of diameter (common practice)",
    }
}

/// The prepared storage run and hardness map a fit of `case` works on.
pub fn prepared(
    case: &Case,
    lanes: &Lanes,
    wound: &Wound,
    opt: &AgeOptions,
) -> Result<(Prepared, HardnessMap), FitError> {
    let ages = lanes.measurement_ages();
    let prep = prepare(&store_input(case, &ages), lanes, opt);
    let map = hardness_map(
        case.hardness.calibration.as_ref(),
        &case.material,
        lanes,
        wound,
        &prep,
    )?;
    Ok((prep, map))
}
