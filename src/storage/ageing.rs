//! The stored roll, lane by lane: the wound-in stresses relax, the stack creeps radially (the roll
//! settles: diameter loss, lower hardness), each lane takes a permanent MD set that follows its own
//! stress history, and moisture moving in or out adds hygroexpansion and mechano-sorptive creep.
//!
//! Mechanics: axisymmetric incremental viscoelasticity in the radial displacement u (plane
//! stress, Poisson coupling neglected): equilibrium d(r sigma_r)/dr = sigma_t, MD strain u/r,
//! radial strain du/dr, each direction a Burgers element ([`super::creep`]) in reduced time
//! ([`super::shift`]) with hygroexpansion as an eigenstrain. This is the relaxation-by-differential-
//! creep picture of viscoelastic winding models (Lin and Westmann 1989; Qualls and Good 1997, from
//! memory), applied after winding. Finite volumes on cells clustered at the core and the barrel,
//! backward Euler in time; lanes do not exchange load in storage, only moisture (through x).

use super::creep::{step_coefficients_at, step_rates, step_update_at, CreepState, Rates};
use super::drive::{drive, LaneDrive};
use super::hardness::HardnessMap;
use super::record::{FullRecord, Recorder, Snapshot};
use super::sorption::gab_moisture;
use super::timeline::{moisture, timeline, MoistureHistory, StoreInput, Timeline};
use crate::case::{Burgers, Material, Stack};
use crate::interp::linear_extrap;
use crate::lanes::Lanes;
use crate::note::Note;
use crate::numeric::thomas;
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
    pub permanent_strain: Vec<f64>,
    /// Delayed (recoverable, still present at unwind) MD creep strain.
    pub delayed_strain: Vec<f64>,
    /// Elastic MD strain (sigma_t / E), recovered at unwind.
    pub elastic_strain: Vec<f64>,
    /// Free MD hygroexpansion since winding, beta_MD (MC - MC_0).
    pub hygro_strain: Vec<f64>,
    /// The web's own length excess as it came to the winder (from a tension profile at winding),
    /// dimensionless; 0 without one. Included in `strain_at_unwind`.
    pub web_length_strain: f64,
    /// Stress-free MD strain the web keeps at unwind (permanent + delayed + hygro + the web's own
    /// length excess at winding), averaged over the outer third of the web length (the first third
    /// unwound).
    pub strain_at_unwind: Vec<f64>,
    /// The same at the end of storage for the outer, middle and inner thirds of web length.
    pub strain_at_unwind_by_third: [f64; 3],
    /// Lane diameter, m.
    pub diameter_m: Vec<f64>,
    /// Mean interlayer pressure in the outer 25 mm, Pa.
    pub surface_pressure_pa: Vec<f64>,
    /// Predicted hardness, scale units.
    pub hardness: Vec<f64>,
    /// Final radial and tangential stress at the radial cells, Pa.
    pub final_radial_stress_pa: Vec<f64>,
    pub final_tangential_stress_pa: Vec<f64>,
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

/// A lane's stresses at the end of a run, on the storage grid, Pa.
#[derive(Debug, Clone, PartialEq)]
pub struct FinalStress {
    pub radial_pa: Vec<f64>,
    pub tangential_pa: Vec<f64>,
}

/// The mechanical state of one lane's radial cells and the scratch of one time step.
struct Cells<'a> {
    /// Cell faces and centres, m.
    f: &'a [f64],
    r: &'a [f64],
    /// Per cell: width f[j+1] - f[j] (m), 1 / r (1/m) and width / r; per face between cells j
    /// and j + 1: 1 / (r[j+1] - r[j]) (1/m).
    width: Vec<f64>,
    inv_r: Vec<f64>,
    width_r: Vec<f64>,
    inv_dr: Vec<f64>,
    /// Core spring per unit radius, Pa/m (None: rigid core).
    core_k: Option<f64>,
    /// Radial and tangential stress, Pa.
    sr: Vec<f64>,
    st: Vec<f64>,
    cr: Vec<CreepState>,
    ct: Vec<CreepState>,
    /// Radial displacement of the lane's surface since winding, m.
    u_surface: f64,
    /// Step coefficients: incremental moduli (eh) and strain offsets (h), radial and MD.
    eh_r: Vec<f64>,
    h_r: Vec<f64>,
    eh_t: Vec<f64>,
    h_t: Vec<f64>,
    /// Elastic strains at the present stresses (MD sigma_t / E; radial, see [`radial_elastic`])
    /// and the stack's tangent modulus, Pa: set after each step for the next.
    g_t: Vec<f64>,
    g_r: Vec<f64>,
    etan_r: Vec<f64>,
    /// The step's creep rates per cell ([`step_rates`]), MD and radial, shared by the
    /// coefficients and the creep update.
    rate_t: Vec<Rates>,
    rate_r: Vec<Rates>,
    /// Per face between cells j and j + 1 (index j): mean modulus, mean strain offset,
    /// f ef / dr and f ef hf.
    ef: Vec<f64>,
    hf: Vec<f64>,
    cf: Vec<f64>,
    rf: Vec<f64>,
    /// Tridiagonal system in the displacement increments (solution in `d`).
    a: Vec<f64>,
    b: Vec<f64>,
    c: Vec<f64>,
    d: Vec<f64>,
    s: Vec<f64>,
    dsr_face: Vec<f64>,
}

impl<'a> Cells<'a> {
    fn new(run: &LaneRun<'a>) -> Self {
        let f = &run.prep.moisture.faces;
        let r = &run.prep.moisture.r;
        let nr = r.len();
        let (sr, st) = initial_stress(run.wound, run.lane, r);
        let z = vec![0.0; nr];
        let width: Vec<f64> = f.windows(2).map(|w| w[1] - w[0]).collect();
        let inv_r: Vec<f64> = r.iter().map(|x| 1.0 / x).collect();
        let mut cells = Cells {
            f,
            r,
            width_r: width.iter().zip(&inv_r).map(|(w, i)| w * i).collect(),
            width,
            inv_r,
            inv_dr: r.windows(2).map(|w| 1.0 / (w[1] - w[0])).collect(),
            core_k: run.wound.core_stiffness_pa.map(|ec| ec / f[0]),
            sr,
            st,
            cr: vec![CreepState::default(); nr],
            ct: vec![CreepState::default(); nr],
            u_surface: 0.0,
            eh_r: z.clone(),
            h_r: z.clone(),
            eh_t: z.clone(),
            h_t: z.clone(),
            g_t: z.clone(),
            g_r: z.clone(),
            etan_r: z.clone(),
            rate_t: vec![Rates::default(); nr],
            rate_r: vec![Rates::default(); nr],
            ef: z.clone(),
            hf: z.clone(),
            cf: z.clone(),
            rf: z.clone(),
            a: z.clone(),
            b: z.clone(),
            c: z.clone(),
            d: z.clone(),
            s: z,
            dsr_face: vec![0.0; nr + 1],
        };
        cells.elastic(run.material);
        cells
    }

    /// Elastic strains and the stack's tangent modulus at the present stresses.
    fn elastic(&mut self, mat: &Material) {
        let e_t = mat.md_modulus_pa;
        for j in 0..self.r.len() {
            self.g_t[j] = self.st[j] / e_t;
            (self.g_r[j], self.etan_r[j]) = radial_elastic(&mat.stack, -self.sr[j]);
        }
    }

    /// The state handed to a recorder, with moisture `mc` at the cells.
    fn snapshot<'s>(&'s self, mc: &'s [f64], big_r0: f64) -> Snapshot<'s> {
        let nr = self.r.len();
        Snapshot {
            mc,
            radial_stress_pa: &self.sr,
            tangential_stress_pa: &self.st,
            md_creep: &self.ct,
            surface_pressure_pa: zone_pressure(&self.sr, self.r, self.f[nr]),
            diameter_m: 2.0 * (big_r0 + self.u_surface),
        }
    }

    /// Incremental moduli and strain offsets of step `k` (elastic strains from [`Self::elastic`]).
    fn coefficients(&mut self, run: &LaneRun, k: usize) {
        let mat = run.material;
        let (e_t, ms) = (mat.md_modulus_pa, mat.creep.mechanosorptive_per_pct);
        let (md, radial) = (&run.creep.md, &run.creep.radial);
        let nr = self.r.len();
        let span = k * nr..(k + 1) * nr;
        let drv = run.drive;
        let (dxi, dmc) = (&drv.dxi[span.clone()], &drv.dmc[span.clone()]);
        if drv.fits(run.creep, ms) {
            // the rates of [`step_rates`], from the parts the drive holds
            let (kel_t, kel_r) = (&drv.kelvin[0][span.clone()], &drv.kelvin[1][span.clone()]);
            let msd = &drv.msd[span.clone()];
            let (fluid_t, fluid_r) = (1.0 / md.viscous_time_s, 1.0 / radial.viscous_time_s);
            for j in 0..nr {
                self.rate_t[j] = Rates {
                    viscous: dxi[j] * fluid_t + msd[j],
                    ..kel_t[j]
                };
                self.rate_r[j] = Rates {
                    viscous: dxi[j] * fluid_r + msd[j],
                    ..kel_r[j]
                };
            }
        } else {
            for j in 0..nr {
                self.rate_t[j] = step_rates(md, ms, dxi[j], dmc[j]);
                self.rate_r[j] = step_rates(radial, ms, dxi[j], dmc[j]);
            }
        }
        for (j, &dm) in dmc.iter().enumerate() {
            // MD: g = sigma_t / E
            let (e1, h1) = step_coefficients_at(md, e_t, self.g_t[j], &self.ct[j], self.rate_t[j]);
            self.eh_t[j] = e1;
            self.h_t[j] = h1 + mat.hygro_md_per_pct * dm;
            // radial: g = -stack strain at the pressure; tangent modulus of the stack
            let (e2, h2) = step_coefficients_at(
                radial,
                self.etan_r[j],
                self.g_r[j],
                &self.cr[j],
                self.rate_r[j],
            );
            self.eh_r[j] = e2;
            self.h_r[j] = h2 + mat.hygro_zd_per_pct * dm;
        }
        let f = self.f;
        for j in 0..nr.saturating_sub(1) {
            let ef = 0.5 * (self.eh_r[j] + self.eh_r[j + 1]);
            let hf = 0.5 * (self.h_r[j] + self.h_r[j + 1]);
            self.ef[j] = ef;
            self.hf[j] = hf;
            self.cf[j] = f[j + 1] * ef * self.inv_dr[j];
            self.rf[j] = f[j + 1] * ef * hf;
        }
    }

    /// Stiffness of the inner half cell (s = E / half cell) and the core's series factor.
    fn core_face(&self) -> (f64, f64) {
        let sh = self.eh_r[0] / (self.r[0] - self.f[0]);
        let fac = match self.core_k {
            Some(kc) => 1.0 / (1.0 + sh / kc),
            None => 1.0,
        };
        (sh, fac)
    }

    /// Assemble cell j: f[j+1] dS(j+1/2) - f[j] dS(j-1/2) - w_j dSt_j = 0 (face terms from
    /// [`Self::coefficients`]).
    fn assemble(&mut self) {
        let nr = self.r.len();
        if nr == 0 {
            return;
        }
        let core = self.core_face();
        self.assemble_row(0, core);
        // interior rows: both faces, no branches (the same operations as `assemble_row`)
        let (cf, rf, eh_t, h_t) = (&self.cf, &self.rf, &self.eh_t, &self.h_t);
        for j in 1..nr - 1 {
            let (right, left) = (cf[j], cf[j - 1]);
            self.a[j] = 0.0 + left;
            self.b[j] = ((0.0 - right) - left) - self.width_r[j] * eh_t[j];
            self.c[j] = 0.0 + right;
            self.d[j] = ((0.0 + rf[j]) - rf[j - 1]) - self.width[j] * eh_t[j] * h_t[j];
        }
        if nr > 1 {
            self.assemble_row(nr - 1, core);
        }
    }

    /// Assemble row j of [`Self::assemble`] with the core face's (stiffness, series factor).
    fn assemble_row(&mut self, j: usize, (sh, fac): (f64, f64)) {
        let f = self.f;
        let nr = self.r.len();
        let (mut aj, mut bj, mut cj, mut rhs) = (0.0, 0.0, 0.0, 0.0);
        if j + 1 < nr {
            cj += self.cf[j];
            bj -= self.cf[j];
            rhs += self.rf[j];
        }
        if j > 0 {
            aj += self.cf[j - 1];
            bj -= self.cf[j - 1];
            rhs -= self.rf[j - 1];
        } else {
            // core face: d sigma = (s du0 - E h)/(1 + s/k), s = E / (half cell)
            bj -= f[0] * sh * fac;
            rhs -= f[0] * self.eh_r[0] * self.h_r[0] * fac;
        }
        bj -= self.width_r[j] * self.eh_t[j];
        rhs -= self.width[j] * self.eh_t[j] * self.h_t[j];
        self.a[j] = aj;
        self.b[j] = bj;
        self.c[j] = cj;
        self.d[j] = rhs;
    }

    /// Solve for the displacement increments (into `d`); false when a pivot vanishes.
    fn solve(&mut self) -> bool {
        thomas(&self.a, &self.b, &self.c, &mut self.d, &mut self.s)
    }

    /// Apply the stress increments of the solved step; false when a stress is not finite.
    fn apply(&mut self) -> bool {
        let (f, r) = (self.f, self.r);
        let nr = r.len();
        let du = &self.d;
        for j in 0..nr.saturating_sub(1) {
            let strain = (du[j + 1] - du[j]) * self.inv_dr[j];
            self.dsr_face[j + 1] = self.ef[j] * (strain - self.hf[j]);
        }
        let (sh, fac) = self.core_face();
        self.dsr_face[0] = (sh * du[0] - self.eh_r[0] * self.h_r[0]) * fac;
        // every cell first, then the check (no early exit, so the loop runs on vectors)
        let mut finite = true;
        for (j, &du_j) in du.iter().enumerate() {
            let dst = self.eh_t[j] * (du_j * self.inv_r[j] - self.h_t[j]);
            let dsr = 0.5 * (self.dsr_face[j] + self.dsr_face[j + 1]);
            self.st[j] += dst;
            self.sr[j] = (self.sr[j] + dsr).min(0.0);
            finite &= self.st[j].is_finite() & self.sr[j].is_finite();
        }
        if !finite {
            return false;
        }
        // surface displacement: outer cell plus its outer half cell's radial strain change
        let j = nr - 1;
        let dsr_out = 0.5 * self.dsr_face[j];
        let half = f[nr] - r[j];
        self.u_surface += du[j] + half * (dsr_out / self.eh_r[j] + self.h_r[j]);
        true
    }

    /// Advance both creep states over the step at the new stresses (the rates of
    /// [`Self::coefficients`]), and set the elastic strains for the next step.
    fn update_creep(&mut self, run: &LaneRun) {
        let mat = run.material;
        let compliance = 1.0 / mat.md_modulus_pa;
        for j in 0..self.r.len() {
            let g = self.st[j] * compliance;
            self.g_t[j] = g;
            step_update_at(&run.creep.md, g, &mut self.ct[j], self.rate_t[j]);
            let (g, e) = radial_elastic(&mat.stack, -self.sr[j]);
            (self.g_r[j], self.etan_r[j]) = (g, e);
            step_update_at(&run.creep.radial, g, &mut self.cr[j], self.rate_r[j]);
        }
    }
}

/// Run one lane through storage for `run.steps` time steps, handing the state at the start and
/// after every step to `rec`; returns the final stresses.
pub fn age_lane_with(run: &LaneRun, rec: &mut impl Recorder) -> Result<FinalStress, AgeError> {
    let prep = run.prep;
    let big_r0 = run.wound.lanes[run.lane].summary.outer_radius_m;
    let mut cells = Cells::new(run);
    rec.record(&cells.snapshot(&prep.moisture.mc[0][run.lane], big_r0));
    for k in 0..run.steps.min(prep.timeline.steps.len()) {
        cells.coefficients(run, k);
        cells.assemble();
        if !cells.solve() || !cells.apply() {
            return Err(AgeError {
                lane: run.lane,
                step: k,
                time_s: prep.timeline.times[k + 1],
            });
        }
        cells.update_creep(run);
        rec.record(&cells.snapshot(&prep.moisture.mc[k + 1][run.lane], big_r0));
    }
    Ok(FinalStress {
        radial_pa: cells.sr,
        tangential_pa: cells.st,
    })
}

/// Creep-driving radial strain (negative in compression) and tangent modulus at pressure `p`
/// (Pa). The stack's total strain at low pressure is mostly closure of the gaps between layers,
/// which does not creep; creep is scaled on the tangent compliance, g = -P / E_r(P), which for a
/// constant radial modulus is the elastic strain and for Pfeiffer's law tends to 1/K2.
fn radial_elastic(stack: &Stack, p: f64) -> (f64, f64) {
    let p = p.max(0.0);
    let e = stack.modulus(p);
    (-p / e, e)
}

/// Mean interlayer pressure (Pa) in the outer [`SURFACE_ZONE_M`] of a lane, on the storage grid.
pub fn zone_pressure(sr: &[f64], r: &[f64], outer: f64) -> f64 {
    let (sum, n) = r
        .iter()
        .zip(sr)
        .filter(|(x, _)| **x >= outer - SURFACE_ZONE_M)
        .fold((0.0, 0usize), |(a, k), (_, s)| (a - s, k + 1));
    let p = if n == 0 {
        -sr[sr.len() - 1]
    } else {
        sum / n as f64
    };
    p.max(0.0)
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
        let drv = drive(material, prep, lane);
        let run = LaneRun {
            material,
            wound,
            prep,
            lane,
            creep: creep.and_then(|c| c.get(lane)).unwrap_or(&grade),
            drive: &drv,
            steps: prep.timeline.steps.len(),
        };
        let mut rec = FullRecord::new(material, prep, wound, lane, hardness);
        let end = age_lane_with(&run, &mut rec)?;
        out.push(rec.finish(end));
    }
    Ok(Aged {
        times_s: prep.timeline.times.clone(),
        radius_m: prep.moisture.r.clone(),
        lanes: out,
        equilibrium_moisture_pct: prep.moisture.m_eq.clone(),
        hardness_map: *hardness,
        notes: prep.timeline.notes.clone(),
    })
}
