//! The stored roll, lane by lane: the wound-in stresses relax, the stack creeps radially (the roll
//! settles: diameter loss, lower hardness), each lane takes a permanent MD set that follows its own
//! stress history, and moisture moving in or out adds hygroexpansion and mechano-sorptive creep.
//!
//! Mechanics: axisymmetric incremental viscoelasticity in the radial displacement u (plane
//! stress, Poisson coupling neglected): equilibrium d(r sigma_r)/dr = sigma_t, MD strain u/r,
//! radial strain du/dr, each direction a Burgers element ([`super::creep`]) in reduced time
//! ([`super::shift`]) with hygroexpansion as an eigenstrain. This is the
//! relaxation-by-differential-
//! creep picture of viscoelastic winding models (Lin and Westmann 1989; Qualls and Good 1997, from
//! memory), applied after winding. Finite volumes on cells clustered at the core and the barrel,
//! backward Euler in time; lanes do not exchange load in storage, only moisture (through x).

use super::cells::{run_lane, Params, Start};
use super::drive::{drive, LaneDrive};
use super::hardness::HardnessMap;
use super::record::{FullRecord, FullRecords, Recorder, Track, Tracks};
use super::sorption::gab_moisture;
use super::timeline::{moisture, timeline, MoistureHistory, StoreInput, Timeline};
use crate::case::{Burgers, Material};
use crate::interp::linear_extrap;
use crate::lanes::Lanes;
use crate::note::Note;
use crate::pack::Real;
use crate::units::DAY_S;
use crate::winding::{Wound, SURFACE_ZONE_M};
use serde::Serialize;
use std::sync::Arc;

/// Discretisation options.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct AgeOptions {
    /// Radial cells.
    pub cells_r: usize,
    /// Cells across the width for moisture.
    pub cells_x: usize,
    /// Time steps per segment (between stretch ends and output times).
    pub steps: usize,
}

impl Default for AgeOptions {
    fn default() -> Self {
        AgeOptions {
            cells_r: 64,
            cells_x: 96,
            steps: 20,
        }
    }
}

/// Creep parameters of one lane (grade values, or fitted).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct LaneCreep {
    pub md: Burgers,
    pub radial: Burgers,
}

impl LaneCreep {
    /// The grade's creep parameters.
    pub fn grade(material: &Material) -> LaneCreep {
        LaneCreep {
            md: material.creep.md,
            radial: material.creep.radial,
        }
    }
}

/// One lane through storage; every array is over [`Aged::times_s`].
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LaneAged {
    /// Lane centre, m.
    pub position_m: f64,
    /// Mean moisture over the radius, %.
    pub moisture_pct: Vec<f64>,
    /// Mean moisture of the outer third of the web length (the outer wraps), %.
    pub outer_moisture_pct: Vec<f64>,
    /// Permanent (viscous + mechano-sorptive) MD strain, area-weighted over the radius.
    #[serde(rename = "permanent_strain_m_per_m")]
    pub permanent_strain: Vec<f64>,
    /// Delayed (recoverable, still present at unwind) MD creep strain.
    #[serde(rename = "delayed_strain_m_per_m")]
    pub delayed_strain: Vec<f64>,
    /// Elastic MD strain (sigma_t / E), recovered at unwind.
    #[serde(rename = "elastic_strain_m_per_m")]
    pub elastic_strain: Vec<f64>,
    /// Free MD hygroexpansion since winding, beta_MD (MC - MC_0).
    #[serde(rename = "hygro_strain_m_per_m")]
    pub hygro_strain: Vec<f64>,
    /// The web's own length excess as it came to the winder (from a tension profile at winding),
    /// dimensionless; 0 without one. Included in `strain_at_unwind`.
    #[serde(rename = "web_length_strain_m_per_m")]
    pub web_length_strain: f64,
    /// Stress-free MD strain the web keeps at unwind (permanent + delayed + hygro + the web's own
    /// length excess at winding), averaged over the outer third of the web length (the first third
    /// unwound).
    #[serde(rename = "strain_at_unwind_m_per_m")]
    pub strain_at_unwind: Vec<f64>,
    /// The same at the end of storage for the outer, middle and inner thirds of web length.
    #[serde(rename = "strain_at_unwind_by_third_m_per_m")]
    pub strain_at_unwind_by_third: [f64; 3],
    /// Lane diameter, m.
    pub diameter_m: Vec<f64>,
    /// Mean interlayer pressure in the outer 25 mm, Pa.
    pub surface_pressure_pa: Vec<f64>,
    /// Predicted hardness, scale units.
    #[serde(rename = "hardness_hardness_units")]
    pub hardness: Vec<f64>,
    /// Final radial and tangential stress at the radial cells, Pa.
    pub final_radial_stress_pa: Vec<f64>,
    pub final_tangential_stress_pa: Vec<f64>,
    /// Loose outer wraps: the largest depth below the barrel (m) down to which the kernel held
    /// cells of the outer half of the radius at zero interlayer pressure at a step end (0:
    /// none), when (s since winding), and the depth at the end of storage. Wound layers cannot
    /// pull on one another, so where a step would turn a cell's pressure to tension the model
    /// holds it at zero ([`super::cells`]): those wraps are loose, and would lift off.
    pub loose_outer_depth_m: f64,
    pub loose_outer_time_s: f64,
    pub loose_outer_end_depth_m: f64,
}

/// The roll through storage.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Aged {
    /// Time since winding at each step end, s (`times_s[0] = 0`).
    pub times_s: Vec<f64>,
    /// Radial cell centres, m.
    pub radius_m: Vec<f64>,
    pub lanes: Vec<LaneAged>,
    /// Equilibrium moisture of each stretch, %.
    pub equilibrium_moisture_pct: Vec<f64>,
    pub hardness_map: HardnessMap,
    pub notes: Vec<Note>,
}

impl Aged {
    /// The roll's record on prepared storage `prep`: its lanes' runs `lanes`, hardness read with
    /// `hardness`.
    pub(super) fn of(prep: &Prepared, lanes: Vec<LaneAged>, hardness: &HardnessMap) -> Aged {
        Aged {
            times_s: prep.timeline.times.clone(),
            radius_m: prep.moisture.r.clone(),
            lanes,
            equilibrium_moisture_pct: prep.moisture.m_eq.clone(),
            hardness_map: *hardness,
            notes: prep.timeline.notes.clone(),
        }
    }

    /// This record of the roll with `lanes` in place of its lanes' runs.
    pub fn with_lanes(&self, lanes: impl IntoIterator<Item = LaneAged>) -> Aged {
        Aged {
            times_s: self.times_s.clone(),
            radius_m: self.radius_m.clone(),
            lanes: lanes.into_iter().collect(),
            equilibrium_moisture_pct: self.equilibrium_moisture_pct.clone(),
            hardness_map: self.hardness_map,
            notes: self.notes.clone(),
        }
    }

    /// Index of the last time step.
    pub fn last(&self) -> usize {
        self.times_s.len().saturating_sub(1)
    }

    /// Each lane's strain at unwind at the end of storage.
    pub fn final_strain_at_unwind(&self) -> Vec<f64> {
        let last = self.last();
        self.lanes
            .iter()
            .map(|l| l.strain_at_unwind[last])
            .collect()
    }
}

/// The storage model could not be solved.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("storage model failed in lane {lane} at step {step} (t = {:.2} d); check the creep parameters and the stack law", .time_s / DAY_S)]
pub struct AgeError {
    pub lane: usize,
    pub step: usize,
    /// Time since winding at the end of the failed step, s.
    pub time_s: f64,
}

/// Everything the per-lane mechanics needs that does not depend on creep parameters.
#[derive(Debug, Clone)]
pub struct Prepared {
    pub timeline: Timeline,
    /// The moisture field (shared with other runs on the same storage history).
    pub moisture: Arc<MoistureHistory>,
    /// Reference moisture of the creep parameters: equilibrium at 50 % RH, %.
    pub mc_ref: f64,
    /// Each lane's own length excess as the web came to the winder (minus its
    /// [`crate::lanes::Lane::web_strain`]), dimensionless: carried through the roll unchanged
    /// and part of the strain at unwind.
    pub web_length: Vec<f64>,
}

/// Prepare the creep-independent parts (time grid and moisture field).
pub fn prepare(input: &StoreInput, lanes: &Lanes, opt: &AgeOptions) -> Prepared {
    let timeline = timeline(input.storage, input.output_times_s, opt);
    let moisture = moisture(input, lanes, &timeline, opt);
    Prepared {
        mc_ref: gab_moisture(&input.material.sorption, 0.5),
        timeline,
        moisture,
        web_length: lanes.lanes.iter().map(|l| 0.0 - l.web_strain).collect(),
    }
}

/// One lane's run through storage: what the mechanics needs.
#[derive(Debug, Clone, Copy)]
pub struct LaneRun<'a> {
    pub material: &'a Material,
    pub wound: &'a Wound,
    pub prep: &'a Prepared,
    pub lane: usize,
    pub creep: &'a LaneCreep,
    pub drive: &'a LaneDrive,
    /// Time steps to run; fewer than the timeline's stops early (a fit stops at its last
    /// observation).
    pub steps: usize,
}

impl<'a> LaneRun<'a> {
    /// Lane `lane` of a roll (`prep`, `wound`) with `creep` and its drive `drive`, through every
    /// time step.
    pub fn whole(
        material: &'a Material,
        (prep, wound, lane): (&'a Prepared, &'a Wound, usize),
        creep: &'a LaneCreep,
        drive: &'a LaneDrive,
    ) -> Self {
        LaneRun {
            material,
            wound,
            prep,
            lane,
            creep,
            drive,
            steps: prep.timeline.steps.len(),
        }
    }
}

/// A lane's stresses at the end of a run, on the storage grid, Pa.
#[derive(Debug, Clone, PartialEq)]
pub struct FinalStress {
    pub radial_pa: Vec<f64>,
    pub tangential_pa: Vec<f64>,
}

/// Run one lane through storage for `run.steps` time steps, handing the state at the start and
/// after every step to `rec`; returns the final stresses.
pub fn age_lane_with(run: &LaneRun, rec: &mut impl Recorder) -> Result<FinalStress, AgeError> {
    let end = run_lane(run, &Params::one(run.creep), Start::of(run), rec);
    if end.failed != 0 {
        return Err(AgeError {
            lane: run.lane,
            step: end.failed_step,
            time_s: run.prep.timeline.times[end.failed_step + 1],
        });
    }
    Ok(FinalStress {
        radial_pa: end.radial_pa,
        tangential_pa: end.tangential_pa,
    })
}

/// [`age_lane_with`] for a pack of `B` creep parameter sets on the same lane (the creep of `run`
/// is not read), side by side: each set's track, or `None` where its run failed (as
/// [`age_lane_with`] fails). `None` as a whole when the sets do not share their retardation
/// times (run them one by one).
pub fn track_lane_pack<const B: usize>(
    run: &LaneRun,
    creep: &[LaneCreep; B],
) -> Option<[Option<Track>; B]> {
    let params = Params::pack(creep)?;
    let mut rec = Tracks::<B>::default();
    let end = run_lane(run, &params, Start::of(run), &mut rec);
    Some(std::array::from_fn(|m| {
        (end.failed & (1 << m) == 0).then(|| rec.member(m))
    }))
}

/// [`age_lane_with`] with a [`FullRecord`] for a pack of `B` creep parameter sets on the same
/// lane (the creep of `run` is not read), side by side, reading hardness with `hardness`: each
/// set's record, the same to the bit as a run of its own. `None` when the sets do not share their
/// retardation times or when any set's run fails (run them one by one: a run of its own names
/// its failure).
pub fn age_lane_pack<const B: usize>(
    run: &LaneRun,
    creep: &[LaneCreep; B],
    hardness: &HardnessMap,
) -> Option<[LaneAged; B]> {
    let params = Params::pack(creep)?;
    let member = || FullRecord::new(run.material, run.prep, run.wound, run.lane, hardness);
    let mut rec = FullRecords::<B>::new(std::array::from_fn(|_| member()));
    let end = run_lane(run, &params, Start::of(run), &mut rec);
    (end.failed == 0).then(|| rec.finish_all(&end))
}

/// Mean interlayer pressure (Pa) in the outer [`SURFACE_ZONE_M`] of a lane, on the storage grid
/// with cell faces `faces` (m; one more than the cells of `sr`): each cell weighted by its
/// thickness inside the zone, the integral over radius of the cells' piecewise-constant
/// pressure (as the winding's summary integrates), so the mean does not depend on how the cells
/// cluster at the surface.
pub fn zone_pressure<T: Real>(sr: &[T], faces: &[f64]) -> T {
    let n = sr.len().min(faces.len().saturating_sub(1));
    if n == 0 {
        return T::splat(0.0);
    }
    let from = faces[n] - SURFACE_ZONE_M;
    let (mut sum, mut len) = (T::splat(0.0), 0.0);
    for j in 0..n {
        let w = faces[j + 1] - faces[j].max(from);
        if w > 0.0 {
            sum = sum - sr[j] * w;
            len += w;
        }
    }
    (sum / len.max(1e-300)).max_f(0.0)
}

/// A lane's initial radial and tangential stress on the storage grid `r` (m).
pub fn initial_stress(wound: &Wound, lane: usize, r: &[f64]) -> (Vec<f64>, Vec<f64>) {
    let wl = &wound.lanes[lane];
    let interp = |ys: &[f64], x: f64| linear_extrap(&wound.radius_m, ys, x).0;
    (
        r.iter()
            .map(|&x| interp(&wl.radial_stress_pa, x).min(0.0))
            .collect(),
        r.iter()
            .map(|&x| interp(&wl.tangential_stress_pa, x))
            .collect(),
    )
}

/// Age every lane of a roll through storage with the grade's creep (or `creep` per lane when
/// given), reading hardness with `hardness`.
pub fn age(
    input: &StoreInput,
    lanes: &Lanes,
    wound: &Wound,
    creep: Option<&[LaneCreep]>,
    hardness: &HardnessMap,
    opt: &AgeOptions,
) -> Result<Aged, AgeError> {
    let prep = prepare(input, lanes, opt);
    age_prepared(input.material, &prep, wound, creep, hardness)
}

/// [`age`] on a prepared time grid and moisture field.
pub fn age_prepared(
    material: &Material,
    prep: &Prepared,
    wound: &Wound,
    creep: Option<&[LaneCreep]>,
    hardness: &HardnessMap,
) -> Result<Aged, AgeError> {
    let grade = LaneCreep::grade(material);
    let mut out = Vec::with_capacity(wound.lanes.len());
    for lane in 0..wound.lanes.len() {
        let c = creep.and_then(|c| c.get(lane)).unwrap_or(&grade);
        out.push(age_lane_full(material, (prep, wound, lane), c, hardness)?);
    }
    Ok(Aged::of(prep, out, hardness))
}

/// Lane `lane` of a roll (`prep`, `wound`) through the whole of storage with `creep`, keeping
/// everything of it ([`FullRecord`]), hardness read with `hardness`.
pub(super) fn age_lane_full(
    material: &Material,
    (prep, wound, lane): (&Prepared, &Wound, usize),
    creep: &LaneCreep,
    hardness: &HardnessMap,
) -> Result<LaneAged, AgeError> {
    let drv = drive(material, prep, lane);
    let run = LaneRun::whole(material, (prep, wound, lane), creep, &drv);
    let mut rec = FullRecord::new(material, prep, wound, lane, hardness);
    let end = age_lane_with(&run, &mut rec)?;
    Ok(rec.finish(end))
}
