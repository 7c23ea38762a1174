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

use super::creep::{step_coefficients, step_update, CreepState};
use super::moisture::{radial_faces, Field, Surfaces};
use super::shift::{arrhenius_shift, moisture_shift};
use super::sorption::gab_moisture;
use crate::case::{Burgers, Case, Measure, Stance, Stretch, Wrap};
use crate::interp::linear_extrap;
use crate::lanes::Lanes;
use crate::numeric::thomas;
use crate::winding::{Wound, SURFACE_ZONE_M};
use serde::Serialize;

/// Discretisation options.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct AgeOptions {
    /// Radial cells.
    pub cells_r: usize,
    /// Cells across the width for moisture.
    pub cells_x: usize,
    /// Time steps per segment (between stretch ends and measurement ages).
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

/// Floor contact at the lower end of a roll stored on end cuts that face's exchange to this
/// fraction (assumption).
pub const FLOOR_CONTACT: f64 = 0.1;

/// Ambient conditions assumed past the last stretch (standard atmosphere, TAPPI T 402).
fn standard_stretch() -> Stretch {
    Stretch {
        duration_s: 0.0,
        temperature_k: 296.15,
        rh: 0.5,
        barrel_wrap: Wrap::None,
        end_wrap: Wrap::None,
        stance: Stance::OnEnd,
        place: Some("assumed standard atmosphere".into()),
    }
}

/// A time step: duration (s) and the stretch it belongs to.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Step {
    pub dt: f64,
    pub stretch: usize,
}

/// Time grid over the storage history: geometric steps within each segment between stretch ends
/// and measurement ages, so measurement ages are step ends.
#[derive(Debug, Clone, PartialEq)]
pub struct Timeline {
    pub steps: Vec<Step>,
    /// Time at the end of each step, s (`times[0] = 0` is the start).
    pub times: Vec<f64>,
    /// Stretches used (the case's, plus an assumed one when measurements go past storage).
    pub stretches: Vec<Stretch>,
    pub notes: Vec<String>,
}

/// Build the time grid for a case.
pub fn timeline(case: &Case, opt: &AgeOptions) -> Timeline {
    let mut stretches = case.storage.clone();
    let mut notes = Vec::new();
    let total: f64 = stretches.iter().map(|s| s.duration_s).sum();
    let last_age = case.profiles.iter().map(|p| p.age_s).fold(0.0, f64::max);
    if last_age > total + 1.0 {
        let mut s = stretches.last().cloned().unwrap_or_else(standard_stretch);
        s.duration_s = last_age - total;
        notes.push(format!(
            "measurements reach {:.1} d but storage history covers {:.1} d; the last {:.1} d assume {}",
            last_age / 86400.0,
            total / 86400.0,
            s.duration_s / 86400.0,
            if case.storage.is_empty() {
                "23 C, 50 % RH, unwrapped"
            } else {
                "the last stretch continued"
            }
        ));
        stretches.push(s);
    }
    let mut cuts: Vec<(f64, usize)> = Vec::new();
    let mut t = 0.0;
    for (i, s) in stretches.iter().enumerate() {
        let t1 = t + s.duration_s;
        let mut inner: Vec<f64> = case
            .profiles
            .iter()
            .map(|p| p.age_s)
            .filter(|&a| a > t + 1.0 && a < t1 - 1.0)
            .collect();
        inner.sort_by(f64::total_cmp);
        inner.dedup_by(|a, b| (*a - *b).abs() < 1.0);
        for a in inner {
            cuts.push((a, i));
        }
        cuts.push((t1, i));
        t = t1;
    }
    let q: f64 = 1.15;
    let n = opt.steps.max(1);
    let mut steps = Vec::new();
    let mut times = vec![0.0];
    let mut t0 = 0.0;
    for (t1, si) in cuts {
        let span = t1 - t0;
        if span <= 0.0 {
            continue;
        }
        let norm = (q.powi(n as i32) - 1.0) / (q - 1.0);
        let mut acc = t0;
        for j in 0..n {
            let dt = if j + 1 == n {
                t1 - acc
            } else {
                span * q.powi(j as i32) / norm
            };
            acc += dt;
            steps.push(Step { dt, stretch: si });
            times.push(acc);
        }
        t0 = t1;
    }
    Timeline {
        steps,
        times,
        stretches,
        notes,
    }
}

/// Moisture at each lane's radial cells over time.
#[derive(Debug, Clone, PartialEq)]
pub struct MoistureHistory {
    /// Radial cell faces and centres shared with the mechanics, m.
    pub faces: Vec<f64>,
    pub r: Vec<f64>,
    /// `mc[time][lane][cell]`, %.
    pub mc: Vec<Vec<Vec<f64>>>,
    /// Equilibrium moisture of each stretch, %.
    pub m_eq: Vec<f64>,
}

fn surfaces(case: &Case, s: &Stretch) -> Surfaces {
    let w = &case.wraps;
    let end = w.of(s.end_wrap);
    let back = if s.stance == Stance::OnEnd {
        end * FLOOR_CONTACT
    } else {
        end
    };
    Surfaces {
        front_m_s: end,
        back_m_s: back,
        barrel_m_s: w.of(s.barrel_wrap),
        // The core tube is open at its ends; treated like a paper wrap (assumption).
        core_m_s: w.paper_m_s,
        m_eq: gab_moisture(&case.material.sorption, s.rh),
    }
}

/// Run the moisture model for a case.
pub fn moisture(case: &Case, lanes: &Lanes, tl: &Timeline, opt: &AgeOptions) -> MoistureHistory {
    let m = &case.material;
    let faces = radial_faces(
        0.5 * case.roll.core_diameter_m,
        0.5 * case.roll.diameter_m,
        opt.cells_r,
    );
    let mut field = Field::new(
        case.roll.width_m,
        opt.cells_x,
        faces.clone(),
        m.moisture_pct,
        m.diffusivity_inplane_m2_s,
        m.diffusivity_radial_m2_s,
    );
    let centres = lanes.positions();
    let sample = |f: &Field| -> Vec<Vec<f64>> {
        centres
            .iter()
            .map(|&x| (0..f.nr()).map(|j| f.at(x, j)).collect())
            .collect()
    };
    let surf: Vec<Surfaces> = tl.stretches.iter().map(|s| surfaces(case, s)).collect();
    let mut mc = vec![sample(&field)];
    for st in &tl.steps {
        field.step(st.dt, &surf[st.stretch]);
        mc.push(sample(&field));
    }
    MoistureHistory {
        r: field.r.clone(),
        faces,
        mc,
        m_eq: surf.iter().map(|s| s.m_eq).collect(),
    }
}

/// Creep parameters of one lane (grade values, or fitted).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct LaneCreep {
    pub md: Burgers,
    pub radial: Burgers,
}

/// Hardness as a function of the surface-zone pressure: H = a + b ln(P / pressure_ref).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct HardnessMap {
    pub a: f64,
    pub b: f64,
    /// Pa.
    pub pressure_ref_pa: f64,
    /// Where a and b came from.
    #[serde(skip)]
    pub source: &'static str,
}

/// Default slope of hardness against ln(pressure) when the case gives no calibration, scale
/// units per e-fold of pressure (assumption: rebound readings rise about 10-15 points from a soft
/// to a hard newsprint roll, whose pressures differ about threefold; common practice).
pub const DEFAULT_HARDNESS_SLOPE: f64 = 12.0;

impl HardnessMap {
    /// Hardness (scale units) at surface-zone pressure `p` (Pa).
    pub fn hardness(&self, p: f64) -> f64 {
        self.a + self.b * (p.max(1.0) / self.pressure_ref_pa).ln()
    }

    /// The case's calibration, or a default slope with the offset set so the roll's mean
    /// predicted hardness at the earliest hardness profile equals the measured mean.
    pub fn for_case(case: &Case, lanes: &Lanes, wound: &Wound, faces: &[f64]) -> HardnessMap {
        if let Some(c) = case.hardness.calibration {
            return HardnessMap {
                a: c.a,
                b: c.b,
                pressure_ref_pa: c.pressure_ref_pa,
                source: "case calibration",
            };
        }
        let widths = lanes.widths();
        let wsum: f64 = widths.iter().sum();
        let r: Vec<f64> = faces.windows(2).map(|w| 0.5 * (w[0] + w[1])).collect();
        let outer = faces[faces.len() - 1];
        let mean_lnp = (0..wound.lanes.len())
            .zip(&widths)
            .map(|(i, w)| {
                let (sr, _) = initial_stress(wound, i, &r);
                w * zone_pressure(&sr, &r, outer).max(1.0).ln()
            })
            .sum::<f64>()
            / wsum;
        let p_ref: f64 = 1e3;
        let b = DEFAULT_HARDNESS_SLOPE;
        let first = case
            .profiles
            .iter()
            .filter(|p| p.what == Measure::Hardness)
            .min_by(|a, b| a.age_s.total_cmp(&b.age_s));
        match first {
            Some(p) if p.age_s < 86400.0 => {
                let (vals, _) = crate::lanes::onto(p, &lanes.positions());
                let mean_h = vals.iter().zip(&widths).map(|(v, w)| v * w).sum::<f64>() / wsum;
                HardnessMap {
                    a: mean_h - b * (mean_lnp - p_ref.ln()),
                    b,
                    pressure_ref_pa: p_ref,
                    source: "default slope; offset matched to the first hardness profile",
                }
            }
            _ => HardnessMap {
                a: 60.0 - b * (250e3f64 / p_ref).ln(),
                b,
                pressure_ref_pa: p_ref,
                source: "default map: 60 units at 250 kPa (assumption)",
            },
        }
    }
}

/// One lane through storage; every array is over [`Aged::times_days`].
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LaneAged {
    /// Lane centre, m.
    pub position_m: f64,
    /// Mean moisture over the radius, %.
    pub moisture_pct: Vec<f64>,
    /// Permanent (viscous + mechano-sorptive) MD strain, area-weighted over the radius.
    pub permanent_strain: Vec<f64>,
    /// Delayed (recoverable, still present at unwind) MD creep strain.
    pub delayed_strain: Vec<f64>,
    /// Elastic MD strain (sigma_t / E), recovered at unwind.
    pub elastic_strain: Vec<f64>,
    /// Free MD hygroexpansion since winding, beta_MD (MC - MC_0).
    pub hygro_strain: Vec<f64>,
    /// Stress-free MD strain the web keeps at unwind (permanent + delayed + hygro), averaged over
    /// the outer third of the web length (the first third unwound).
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
    pub times_days: Vec<f64>,
    /// Radial cell centres, m.
    pub radius_m: Vec<f64>,
    pub lanes: Vec<LaneAged>,
    /// Equilibrium moisture of each stretch, %.
    pub equilibrium_moisture_pct: Vec<f64>,
    pub hardness_map: HardnessMap,
    pub notes: Vec<String>,
}

/// The storage model could not be solved.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("storage model failed in lane {lane} at step {step} (t = {days:.2} d); check the creep parameters and the stack law")]
pub struct AgeError {
    pub lane: usize,
    pub step: usize,
    pub days: f64,
}

/// Everything the per-lane mechanics needs that does not depend on the creep parameters.
#[derive(Debug, Clone)]
pub struct Prepared {
    pub timeline: Timeline,
    pub moisture: MoistureHistory,
    pub hardness: HardnessMap,
    /// Reference moisture of the creep parameters: equilibrium at 50 % RH, %.
    pub mc_ref: f64,
}

/// Prepare the creep-independent parts (time grid, moisture field, hardness map).
pub fn prepare(case: &Case, lanes: &Lanes, wound: &Wound, opt: &AgeOptions) -> Prepared {
    let timeline = timeline(case, opt);
    let moisture = moisture(case, lanes, &timeline, opt);
    let mut prep = Prepared {
        hardness: HardnessMap::for_case(case, lanes, wound, &moisture.faces),
        mc_ref: gab_moisture(&case.material.sorption, 0.5),
        timeline,
        moisture,
    };
    match_later_hardness(case, lanes, wound, &mut prep);
    prep
}

/// Without a calibration and without a winding-time hardness profile, set the hardness map's
/// offset so that the roll's mean hardness, predicted with the grade's creep at the age of the
/// first hardness profile, equals the measured mean there (a converter often has only later
/// readings). The slope stays at its default.
fn match_later_hardness(case: &Case, lanes: &Lanes, wound: &Wound, prep: &mut Prepared) {
    if case.hardness.calibration.is_some() {
        return;
    }
    let Some(first) = case
        .profiles
        .iter()
        .filter(|p| p.what == Measure::Hardness)
        .min_by(|a, b| a.age_s.total_cmp(&b.age_s))
    else {
        return;
    };
    if first.age_s < 86400.0 {
        return;
    }
    let step = prep
        .timeline
        .times
        .iter()
        .enumerate()
        .min_by(|a, b| {
            (a.1 - first.age_s)
                .abs()
                .total_cmp(&(b.1 - first.age_s).abs())
        })
        .map(|(i, _)| i)
        .unwrap_or(0);
    let grade = LaneCreep {
        md: case.material.creep.md,
        radial: case.material.creep.radial,
    };
    let widths = lanes.widths();
    let wsum: f64 = widths.iter().sum();
    let mut mean_lnp = 0.0;
    for (i, w) in widths.iter().enumerate() {
        let d = drive(case, prep, i);
        match age_lane_with(case, wound, i, &grade, prep, &d, step, true) {
            Ok(a) => {
                mean_lnp += w * a.surface_pressure_pa[step.min(a.surface_pressure_pa.len() - 1)]
                    .max(1.0)
                    .ln()
            }
            Err(_) => return,
        }
    }
    mean_lnp /= wsum;
    let (vals, _) = crate::lanes::onto(first, &lanes.positions());
    let mean_h = vals.iter().zip(&widths).map(|(v, w)| v * w).sum::<f64>() / wsum;
    let h = &mut prep.hardness;
    h.a = mean_h - h.b * (mean_lnp - h.pressure_ref_pa.ln());
    h.source = "default slope; offset matched at the first hardness profile (after winding) with the grade's creep";
}

/// What storage does to one lane independently of its creep parameters: the reduced-time step
/// and the moisture change of each radial cell at each time step (index k * cells + j).
#[derive(Debug, Clone, PartialEq)]
pub struct LaneDrive {
    pub dxi: Vec<f64>,
    pub dmc: Vec<f64>,
}

/// Precompute a lane's drive (time shifts and moisture changes).
pub fn drive(case: &Case, prep: &Prepared, lane: usize) -> LaneDrive {
    let mat = &case.material;
    let nr = prep.moisture.r.len();
    let ns = prep.timeline.steps.len();
    let mut dxi = Vec::with_capacity(ns * nr);
    let mut dmc = Vec::with_capacity(ns * nr);
    for (k, stp) in prep.timeline.steps.iter().enumerate() {
        let stretch = &prep.timeline.stretches[stp.stretch];
        let a_t = arrhenius_shift(mat.creep.activation_energy_j_mol, stretch.temperature_k);
        let mc_old = &prep.moisture.mc[k][lane];
        let mc_new = &prep.moisture.mc[k + 1][lane];
        for j in 0..nr {
            let mc_mid = 0.5 * (mc_old[j] + mc_new[j]);
            let a_m = moisture_shift(mat.creep.moisture_shift_dec_per_pct, mc_mid, prep.mc_ref);
            dxi.push(stp.dt / (a_t * a_m));
            dmc.push(mc_new[j] - mc_old[j]);
        }
    }
    LaneDrive { dxi, dmc }
}

/// Age one lane with given creep parameters.
pub fn age_lane(
    case: &Case,
    wound: &Wound,
    lane: usize,
    creep: &LaneCreep,
    prep: &Prepared,
) -> Result<LaneAged, AgeError> {
    let d = drive(case, prep, lane);
    age_lane_with(
        case,
        wound,
        lane,
        creep,
        prep,
        &d,
        prep.timeline.steps.len(),
        false,
    )
}

/// Age one lane with a precomputed drive, for the first `steps` time steps. With `lean`, only
/// hardness, diameter and surface pressure are recorded (what a fit compares with measurements);
/// the other series stay empty.
#[allow(clippy::too_many_arguments)]
pub fn age_lane_with(
    case: &Case,
    wound: &Wound,
    lane: usize,
    creep: &LaneCreep,
    prep: &Prepared,
    drv: &LaneDrive,
    steps: usize,
    lean: bool,
) -> Result<LaneAged, AgeError> {
    let mat = &case.material;
    let wl = &wound.lanes[lane];
    let f = &prep.moisture.faces;
    let r = &prep.moisture.r;
    let nr = r.len();
    let e_t = mat.md_modulus_pa;
    let stack = mat.stack;
    let ms = mat.creep.mechanosorptive_per_pct;
    let core_k = wound.core_stiffness_pa.map(|ec| ec / f[0]);
    let (mut sr, mut st) = initial_stress(wound, lane, r);
    let mut cr = vec![CreepState::default(); nr];
    let mut ct = vec![CreepState::default(); nr];
    let mc0 = &prep.moisture.mc[0][lane];
    let big_r0 = wl.summary.outer_radius_m;
    let mut u_surface = 0.0;
    let (mut a, mut b, mut c, mut d, mut s) = (
        vec![0.0; nr],
        vec![0.0; nr],
        vec![0.0; nr],
        vec![0.0; nr],
        vec![0.0; nr],
    );
    let (mut eh_r, mut h_r, mut eh_t, mut h_t) =
        (vec![0.0; nr], vec![0.0; nr], vec![0.0; nr], vec![0.0; nr]);
    let nt = prep.timeline.times.len();
    let mut out = LaneAged {
        position_m: wl.position_m,
        moisture_pct: Vec::with_capacity(nt),
        permanent_strain: Vec::with_capacity(nt),
        delayed_strain: Vec::with_capacity(nt),
        elastic_strain: Vec::with_capacity(nt),
        hygro_strain: Vec::with_capacity(nt),
        strain_at_unwind: Vec::with_capacity(nt),
        diameter_m: Vec::with_capacity(nt),
        surface_pressure_pa: Vec::with_capacity(nt),
        hardness: Vec::with_capacity(nt),
        strain_at_unwind_by_third: [0.0; 3],
        final_radial_stress_pa: Vec::new(),
        final_tangential_stress_pa: Vec::new(),
    };
    let vol: Vec<f64> = (0..nr).map(|j| r[j] * (f[j + 1] - f[j])).collect();
    let vsum: f64 = vol.iter().sum();
    // thirds of web length (equal volume), counted from the outside
    let third = |j: usize| -> usize {
        let outside: f64 = vol[j + 1..].iter().sum::<f64>() + 0.5 * vol[j];
        ((3.0 * outside / vsum) as usize).min(2)
    };
    let thirds: Vec<usize> = (0..nr)
        .collect::<Vec<_>>()
        .iter()
        .map(|&j| third(j))
        .collect();
    let outer_w: f64 = (0..nr).filter(|&j| thirds[j] == 0).map(|j| vol[j]).sum();
    let record = |out: &mut LaneAged,
                  mc: &[f64],
                  sr: &[f64],
                  st: &[f64],
                  ct: &[CreepState],
                  u_surface: f64| {
        let p = zone_pressure(sr, r, f[nr]);
        out.surface_pressure_pa.push(p);
        out.hardness.push(prep.hardness.hardness(p));
        out.diameter_m.push(2.0 * (big_r0 + u_surface));
        if lean {
            return;
        }
        let avg = |g: &dyn Fn(usize) -> f64| (0..nr).map(|j| vol[j] * g(j)).sum::<f64>() / vsum;
        let perm = avg(&|j| ct[j].permanent);
        let del = avg(&|j| ct[j].delayed);
        let hyg = avg(&|j| mat.hygro_md_per_pct * (mc[j] - mc0[j]));
        let unwind =
            |j: usize| ct[j].permanent + ct[j].delayed + mat.hygro_md_per_pct * (mc[j] - mc0[j]);
        let outer = (0..nr)
            .filter(|&j| thirds[j] == 0)
            .map(|j| vol[j] * unwind(j))
            .sum::<f64>()
            / outer_w;
        out.moisture_pct.push(avg(&|j| mc[j]));
        out.permanent_strain.push(perm);
        out.delayed_strain.push(del);
        out.elastic_strain.push(avg(&|j| st[j] / e_t));
        out.hygro_strain.push(hyg);
        out.strain_at_unwind.push(outer);
        let mut by = [0.0; 3];
        let mut wsum = [0.0; 3];
        for j in 0..nr {
            by[thirds[j]] += vol[j] * unwind(j);
            wsum[thirds[j]] += vol[j];
        }
        for z in 0..3 {
            out.strain_at_unwind_by_third[z] = by[z] / wsum[z].max(1e-300);
        }
    };
    record(&mut out, mc0, &sr, &st, &ct, u_surface);
    let mut dsr_face = vec![0.0; nr + 1];
    for k in 0..steps.min(prep.timeline.steps.len()) {
        let mc_new = &prep.moisture.mc[k + 1][lane];
        for j in 0..nr {
            let dxi = drv.dxi[k * nr + j];
            let dmc = drv.dmc[k * nr + j];
            // MD: g = sigma_t / E
            let (e1, h1) = step_coefficients(&creep.md, ms, e_t, st[j] / e_t, &ct[j], dxi, dmc);
            eh_t[j] = e1;
            h_t[j] = h1 + mat.hygro_md_per_pct * dmc;
            // radial: g = -stack strain at the pressure; tangent modulus of the stack
            let p = -sr[j];
            let (g, etan) = radial_elastic(&stack, p);
            let (e2, h2) = step_coefficients(&creep.radial, ms, etan, g, &cr[j], dxi, dmc);
            eh_r[j] = e2;
            h_r[j] = h2 + mat.hygro_zd_per_pct * dmc;
        }
        // assemble: cell j: f[j+1] dS(j+1/2) - f[j] dS(j-1/2) - w_j dSt_j = 0
        for j in 0..nr {
            let w = f[j + 1] - f[j];
            let (mut aj, mut bj, mut cj, mut rhs) = (0.0, 0.0, 0.0, 0.0);
            if j + 1 < nr {
                let dd = r[j + 1] - r[j];
                let ef = 0.5 * (eh_r[j] + eh_r[j + 1]);
                let hf = 0.5 * (h_r[j] + h_r[j + 1]);
                let cf = f[j + 1] * ef / dd;
                cj += cf;
                bj -= cf;
                rhs += f[j + 1] * ef * hf;
            }
            if j > 0 {
                let dd = r[j] - r[j - 1];
                let ef = 0.5 * (eh_r[j] + eh_r[j - 1]);
                let hf = 0.5 * (h_r[j] + h_r[j - 1]);
                let cf = f[j] * ef / dd;
                aj += cf;
                bj -= cf;
                rhs -= f[j] * ef * hf;
            } else {
                // core face: d sigma = (s du0 - E h)/(1 + s/k), s = E / (half cell)
                let sh = eh_r[0] / (r[0] - f[0]);
                let fac = match core_k {
                    Some(kc) => 1.0 / (1.0 + sh / kc),
                    None => 1.0,
                };
                bj -= f[0] * sh * fac;
                rhs -= f[0] * eh_r[0] * h_r[0] * fac;
            }
            bj -= w * eh_t[j] / r[j];
            rhs -= w * eh_t[j] * h_t[j];
            a[j] = aj;
            b[j] = bj;
            c[j] = cj;
            d[j] = rhs;
        }
        if !thomas(&a, &b, &c, &mut d, &mut s) {
            return Err(AgeError {
                lane,
                step: k,
                days: prep.timeline.times[k + 1] / 86400.0,
            });
        }
        let du = &d;
        // stress increments
        for j in 0..nr.saturating_sub(1) {
            let dd = r[j + 1] - r[j];
            let ef = 0.5 * (eh_r[j] + eh_r[j + 1]);
            let hf = 0.5 * (h_r[j] + h_r[j + 1]);
            dsr_face[j + 1] = ef * ((du[j + 1] - du[j]) / dd - hf);
        }
        {
            let sh = eh_r[0] / (r[0] - f[0]);
            let fac = match core_k {
                Some(kc) => 1.0 / (1.0 + sh / kc),
                None => 1.0,
            };
            dsr_face[0] = (sh * du[0] - eh_r[0] * h_r[0]) * fac;
        }
        for j in 0..nr {
            let dst = eh_t[j] * (du[j] / r[j] - h_t[j]);
            let dsr = 0.5 * (dsr_face[j] + dsr_face[j + 1]);
            st[j] += dst;
            sr[j] = (sr[j] + dsr).min(0.0);
            if !st[j].is_finite() || !sr[j].is_finite() {
                return Err(AgeError {
                    lane,
                    step: k,
                    days: prep.timeline.times[k + 1] / 86400.0,
                });
            }
        }
        // surface displacement: outer cell plus its outer half cell's radial strain change
        let j = nr - 1;
        let dsr_out = 0.5 * dsr_face[j];
        let half = f[nr] - r[j];
        u_surface += du[j] + half * (dsr_out / eh_r[j] + h_r[j]);
        for j in 0..nr {
            let dxi = drv.dxi[k * nr + j];
            let dmc = drv.dmc[k * nr + j];
            step_update(&creep.md, ms, st[j] / e_t, &mut ct[j], dxi, dmc);
            let (g, _) = radial_elastic(&stack, -sr[j]);
            step_update(&creep.radial, ms, g, &mut cr[j], dxi, dmc);
        }
        record(&mut out, mc_new, &sr, &st, &ct, u_surface);
    }
    out.final_radial_stress_pa = sr;
    out.final_tangential_stress_pa = st;
    Ok(out)
}

/// Creep-driving radial strain (negative in compression) and tangent modulus at pressure `p`
/// (Pa). The stack's total strain at low pressure is mostly closure of the gaps between layers,
/// which does not creep; creep is scaled on the tangent compliance, g = -P / E_r(P), which for a
/// constant radial modulus is the elastic strain and for Pfeiffer's law tends to 1/K2.
fn radial_elastic(stack: &crate::case::Stack, p: f64) -> (f64, f64) {
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

/// Age every lane with the case's grade creep parameters (or `creep` per lane when given).
pub fn age(
    case: &Case,
    lanes: &Lanes,
    wound: &Wound,
    creep: Option<&[LaneCreep]>,
    opt: &AgeOptions,
) -> Result<Aged, AgeError> {
    let prep = prepare(case, lanes, wound, opt);
    let grade = LaneCreep {
        md: case.material.creep.md,
        radial: case.material.creep.radial,
    };
    let mut out = Vec::with_capacity(wound.lanes.len());
    for i in 0..wound.lanes.len() {
        let c = creep.and_then(|c| c.get(i)).unwrap_or(&grade);
        out.push(age_lane(case, wound, i, c, &prep)?);
    }
    Ok(Aged {
        times_days: prep.timeline.times.iter().map(|t| t / 86400.0).collect(),
        radius_m: prep.moisture.r.clone(),
        lanes: out,
        equilibrium_moisture_pct: prep.moisture.m_eq.clone(),
        hardness_map: prep.hardness,
        notes: prep.timeline.notes.clone(),
    })
}
