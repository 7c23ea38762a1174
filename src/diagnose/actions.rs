//! Model changes behind corrections and root-cause attribution: each turns a scenario (case, lanes,
//! CD levelling, fitted creep) into another, which is then re-run through winding and storage.

use crate::case::{Case, Tension, Wrap};
use crate::lanes::Lanes;
use crate::numeric::spread;
use crate::storage::{age, gab_moisture, AgeError, AgeOptions, Aged, HardnessMap, LaneCreep};
use crate::vocab::{Action, Cause};
use crate::winding::{Cache, Options, WindError, WindInput, Wound};

/// Everything a forward run needs.
#[derive(Debug, Clone)]
pub struct Scenario {
    pub case: Case,
    pub lanes: Lanes,
    pub levelling: f64,
    pub creep: Vec<LaneCreep>,
    /// Lanes left out of the spread (slit out).
    pub excluded: Vec<usize>,
}

/// A forward run's result.
#[derive(Debug, Clone)]
pub struct Outcome {
    pub wound: Wound,
    pub aged: Aged,
}

/// A forward run failed.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum RunError {
    #[error(transparent)]
    Wind(#[from] WindError),
    #[error(transparent)]
    Age(#[from] AgeError),
}

impl Scenario {
    /// Run winding and storage.
    pub fn run(&self, nodes: usize) -> Result<Outcome, RunError> {
        self.run_cached(nodes, &mut Cache::default())
    }

    /// Run winding and storage, reusing a wound state from `winds` when the winding inputs match.
    pub fn run_cached(&self, nodes: usize, winds: &mut Cache) -> Result<Outcome, RunError> {
        let wound = winds.wind(&self.wind_input(), &self.lanes, self.wind_options(nodes))?;
        self.age_on(wound)
    }

    /// What winding reads of this scenario's case.
    pub fn wind_input(&self) -> WindInput<'_> {
        WindInput::new(&self.case.material, &self.case.roll, &self.case.winding)
    }

    /// Winding options of this scenario at `nodes` nodes.
    pub fn wind_options(&self, nodes: usize) -> Options {
        Options {
            nodes,
            levelling: self.levelling,
        }
    }

    /// Run storage on a wound state already computed for this scenario's case, lanes and
    /// levelling (winding does not depend on storage or creep). Forward only: no measurement
    /// times; hardness is read with the case's calibration or the default map.
    pub fn age_on(&self, wound: Wound) -> Result<Outcome, RunError> {
        let c = &self.case;
        let aged = age(
            &crate::fit::store_input(c, &[]),
            &self.lanes,
            &wound,
            Some(&self.creep),
            &HardnessMap::given(c.hardness.calibration.as_ref()),
            &AgeOptions::default(),
        )?;
        Ok(Outcome { wound, aged })
    }
}

/// Largest minus smallest strain at unwind (mm/m) over the lanes not excluded.
pub fn spread_mm_per_m(aged: &Aged, excluded: &[usize]) -> f64 {
    let last = aged.last();
    let v: Vec<f64> = aged
        .lanes
        .iter()
        .enumerate()
        .filter(|(i, _)| !excluded.contains(i))
        .map(|(_, l)| l.strain_at_unwind[last] * 1e3)
        .collect();
    spread(&v)
}

/// Relative humidity (fraction) at which the GAB isotherm gives moisture `mc` (%), by bisection.
pub fn rh_for_moisture(case: &Case, mc: f64) -> f64 {
    let g = &case.material.sorption;
    let (mut lo, mut hi) = (0.0, 0.99);
    for _ in 0..60 {
        let mid = 0.5 * (lo + hi);
        if gab_moisture(g, mid) < mc {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

/// A model change: a correction from a rule table, or one of the ablations that remove a cause
/// for root-cause attribution.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Change {
    /// A rule table's correction.
    Correct(Action),
    /// Every lane wound at the same tension (full CD levelling).
    UniformLaneTension,
    /// Every lane given the roll's mean creep.
    UniformCreep,
}

/// The cause ablations: each cause, the change that removes it and its factor.
pub const ABLATIONS: [(Cause, Change, Option<f64>); 5] = [
    (
        Cause::CaliperProfile,
        Change::Correct(Action::FlattenCaliper),
        None,
    ),
    (
        Cause::StorageMoisture,
        Change::Correct(Action::StoreAtEquilibrium),
        None,
    ),
    (
        Cause::WoundInTensionProfile,
        Change::UniformLaneTension,
        None,
    ),
    (Cause::Nip, Change::Correct(Action::ScaleNip), Some(0.0)),
    (Cause::LaneToLaneCreep, Change::UniformCreep, None),
];

/// Apply a change with its factor (1 when none). `slit` lists the lanes a `slit_out` leaves out.
pub fn apply(s: &Scenario, change: Change, factor: Option<f64>, slit: &[usize]) -> Scenario {
    let mut n = s.clone();
    let f = factor.unwrap_or(1.0);
    match change {
        Change::Correct(a) => correct(&mut n, a, f, slit),
        Change::UniformLaneTension => n.levelling = 1.0,
        Change::UniformCreep => uniform_creep(&mut n.creep),
    }
    n
}

/// Apply a rule table's action with factor `f`.
fn correct(n: &mut Scenario, action: Action, f: f64, slit: &[usize]) {
    match action {
        Action::FlattenCaliper => {
            let m = n.lanes.mean_caliper_m;
            for l in &mut n.lanes.lanes {
                l.caliper_m = m;
                l.caliper_deviation = 0.0;
            }
        }
        Action::ScaleTension => {
            n.case.winding.tension = match &n.case.winding.tension {
                Tension::Constant { tension_n_per_m } => Tension::Constant {
                    tension_n_per_m: tension_n_per_m * f,
                },
                Tension::Taper { points } => Tension::Taper {
                    points: points.iter().map(|(d, t)| (*d, t * f)).collect(),
                },
            }
        }
        Action::TaperTension => {
            let d0 = n.case.roll.core_diameter_m;
            let d1 = n.case.roll.diameter_m;
            let t0 = n.case.winding.tension.at(d0);
            n.case.winding.tension = Tension::Taper {
                points: vec![(d0, t0), (d1, t0 * f)],
            };
        }
        Action::ScaleNip => n.case.winding.nip_n_per_m *= f,
        Action::FilmWrap => {
            for st in &mut n.case.storage {
                st.barrel_wrap = Wrap::Film;
                st.end_wrap = Wrap::Film;
            }
        }
        Action::KeepWrappedUntilUse => {
            if let Some(st) = n.case.storage.last_mut() {
                st.barrel_wrap = Wrap::Film;
                st.end_wrap = Wrap::Film;
            }
        }
        Action::StoreAtEquilibrium => {
            let rh = rh_for_moisture(&n.case, n.case.material.moisture_pct);
            for st in &mut n.case.storage {
                st.rh = rh;
            }
        }
        Action::ShortenStorage => {
            for st in &mut n.case.storage {
                st.duration_s *= f;
            }
        }
        Action::SlitOut => n.excluded = slit.to_vec(),
    }
}

/// Give every lane the roll's mean delayed compliance and mean viscous fluidity, per direction.
fn uniform_creep(creep: &mut [LaneCreep]) {
    let k = creep.len().max(1) as f64;
    let mean = |g: &dyn Fn(&LaneCreep) -> f64| creep.iter().map(g).sum::<f64>() / k;
    let (md_d, md_v, r_d, r_v) = (
        mean(&|c| c.md.delayed),
        mean(&|c| c.md.viscous_time_s.recip()),
        mean(&|c| c.radial.delayed),
        mean(&|c| c.radial.viscous_time_s.recip()),
    );
    for c in creep {
        c.md.delayed = md_d;
        c.md.viscous_time_s = md_v.recip();
        c.radial.delayed = r_d;
        c.radial.viscous_time_s = r_v.recip();
    }
}
