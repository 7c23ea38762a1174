//! The storage kernel: one lane's radial cells stepped through storage (see [`super::ageing`] for
//! the model), for one set of creep parameters (`f64`) or for a pack of sets side by side
//! ([`Pack`]: the same lane, drive and grid, each member its own creep scales; each member's
//! result has the bits of its own run).

use super::ageing::{initial_stress, zone_pressure, LaneCreep, LaneRun};
use super::creep::{step_coefficients_at, step_rates_of, step_update_at, CreepState, Rates};
use super::record::{Recorder, Snapshot};
use crate::case::{Material, Stack};
use crate::numeric::thomas_of;
use crate::pack::{Finite, Pack, Real};

/// The creep parameters a run reads, MD (index 0) and radial (1): each run's delayed part
/// (E / E_K) and viscous time (s); the retardation times (s) are shared.
#[derive(Debug, Clone, Copy)]
pub struct Params<T> {
    delayed: [T; 2],
    viscous_time_s: [T; 2],
    retardation_s: [f64; 2],
}

impl Params<f64> {
    /// One run's parameters.
    pub fn one(c: &LaneCreep) -> Self {
        Params {
            delayed: [c.md.delayed, c.radial.delayed],
            viscous_time_s: [c.md.viscous_time_s, c.radial.viscous_time_s],
            retardation_s: [c.md.retardation_s, c.radial.retardation_s],
        }
    }
}

impl<const B: usize> Params<Pack<B>> {
    /// A pack of runs' parameters; `None` unless they share their retardation times (to the bit).
    pub fn pack(c: &[LaneCreep; B]) -> Option<Self> {
        let ret = |x: &LaneCreep| [x.md.retardation_s, x.radial.retardation_s].map(f64::to_bits);
        let first = c.first()?;
        if c.iter().any(|x| ret(x) != ret(first)) {
            return None;
        }
        Some(Params {
            delayed: [
                Pack(c.map(|x| x.md.delayed)),
                Pack(c.map(|x| x.radial.delayed)),
            ],
            viscous_time_s: [
                Pack(c.map(|x| x.md.viscous_time_s)),
                Pack(c.map(|x| x.radial.viscous_time_s)),
            ],
            retardation_s: [first.md.retardation_s, first.radial.retardation_s],
        })
    }
}

/// How a kernel run ended: the runs that failed (bits) and the step of the first failure.
#[derive(Debug, Clone)]
pub struct Ended<T> {
    pub failed: u32,
    pub failed_step: usize,
    /// Final radial and tangential stress at the cells, Pa.
    pub radial_pa: Vec<T>,
    pub tangential_pa: Vec<T>,
}

/// A lane's state at the start of storage, of one run or of each member of a pack: radial and
/// tangential stress at the storage cells (Pa) and the lane's outer radius (m).
pub struct Start<T> {
    sr: Vec<T>,
    st: Vec<T>,
    big_r0: T,
}

impl<T: Real> Start<T> {
    /// The wound state of `run`, the same for every member.
    pub fn of(run: &LaneRun) -> Self {
        let (sr, st) = initial_stress(run.wound, run.lane, &run.prep.moisture.r);
        Start {
            sr: sr.into_iter().map(T::splat).collect(),
            st: st.into_iter().map(T::splat).collect(),
            big_r0: T::splat(run.wound.lanes[run.lane].summary.outer_radius_m),
        }
    }
}

impl<const B: usize> Start<Pack<B>> {
    /// Each member's own wound state: member m that of `runs[m]` (on the storage cells of
    /// `runs[0]`, which the members share).
    pub fn across(runs: &[LaneRun; B]) -> Self {
        let r = &runs[0].prep.moisture.r;
        let each = runs.map(|x| initial_stress(x.wound, x.lane, r));
        // cell j's pack: member m's value at cell j
        let packed = |v: [&Vec<f64>; B]| -> Vec<Pack<B>> {
            (0..r.len())
                .map(|j| Pack(std::array::from_fn(|m| v[m][j])))
                .collect()
        };
        Start {
            sr: packed(each.each_ref().map(|e| &e.0)),
            st: packed(each.each_ref().map(|e| &e.1)),
            big_r0: Pack(runs.map(|x| x.wound.lanes[x.lane].summary.outer_radius_m)),
        }
    }
}

/// Run one lane through storage for `run.steps` time steps with creep `params` (the creep of
/// `run` is not read) from `start`, handing the state at the start and after every step to
/// `rec`. A run that fails is marked and left (its values are not meaningful after); the kernel
/// stops when every run has failed.
///
/// Where the processor has AVX2 the kernel runs compiled for it ([`run_lane_avx2`]): a pack's
/// members then run four wide, to the same bits (IEEE operations are correctly rounded whatever
/// the vector width, nothing is fused, and library functions such as `exp` and `expm1` are the
/// same calls in both).
pub fn run_lane<T: Real, R: Recorder<T>>(
    run: &LaneRun,
    params: &Params<T>,
    start: Start<T>,
    rec: &mut R,
) -> Ended<T> {
    #[cfg(target_arch = "x86_64")]
    if crate::pack::avx2() {
        // SAFETY: `avx2()` is true only where the processor has AVX2.
        return unsafe { run_lane_avx2(run, params, start, rec) };
    }
    run_lane_any(run, params, start, rec)
}

/// [`run_lane`] compiled for AVX2.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
fn run_lane_avx2<T: Real, R: Recorder<T>>(
    run: &LaneRun,
    params: &Params<T>,
    start: Start<T>,
    rec: &mut R,
) -> Ended<T> {
    run_lane_any(run, params, start, rec)
}

/// [`run_lane`] for any processor.
#[inline(always)]
fn run_lane_any<T: Real, R: Recorder<T>>(
    run: &LaneRun,
    params: &Params<T>,
    start: Start<T>,
    rec: &mut R,
) -> Ended<T> {
    let prep = run.prep;
    let big_r0 = start.big_r0;
    let mut cells = Cells::new(run, start);
    let (mut failed, mut failed_step) = (0, 0);
    rec.record(&cells.snapshot(&prep.moisture.mc[0][run.lane], big_r0, &[]));
    for k in 0..run.steps.min(prep.timeline.steps.len()) {
        cells.coefficients(run, params, k);
        cells.assemble();
        let now = cells.solve() | cells.apply(R::HELD);
        if failed == 0 && now != 0 {
            failed_step = k;
        }
        failed |= now;
        if failed == T::ALL {
            break;
        }
        cells.update_creep(run.material, params);
        let held = if R::HELD { &cells.held[..] } else { &[] };
        rec.record(&cells.snapshot(&prep.moisture.mc[k + 1][run.lane], big_r0, held));
    }
    Ended {
        failed,
        failed_step,
        radial_pa: cells.sr,
        tangential_pa: cells.st,
    }
}

/// The mechanical state of one lane's radial cells and the scratch of one time step.
struct Cells<'a, T> {
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
    sr: Vec<T>,
    st: Vec<T>,
    cr: Vec<CreepState<T>>,
    ct: Vec<CreepState<T>>,
    /// Radial displacement of the lane's surface since winding, m.
    u_surface: T,
    /// Step coefficients: incremental moduli (eh) and strain offsets (h), radial and MD.
    eh_r: Vec<T>,
    h_r: Vec<T>,
    eh_t: Vec<T>,
    h_t: Vec<T>,
    /// Elastic strains at the present stresses (MD sigma_t / E; radial, see [`radial_elastic`])
    /// and the stack's tangent modulus, Pa: set after each step for the next.
    g_t: Vec<T>,
    g_r: Vec<T>,
    etan_r: Vec<T>,
    /// The step's creep rates per cell, MD and radial, shared by the coefficients and the
    /// creep update.
    rate_t: Vec<Rates<T>>,
    rate_r: Vec<Rates<T>>,
    /// Per face between cells j and j + 1 (index j): mean modulus, mean strain offset,
    /// f ef / dr and f ef hf.
    ef: Vec<T>,
    hf: Vec<T>,
    cf: Vec<T>,
    rf: Vec<T>,
    /// Tridiagonal system in the displacement increments (solution in `d`).
    a: Vec<T>,
    b: Vec<T>,
    c: Vec<T>,
    d: Vec<T>,
    s: Vec<T>,
    dsr_face: Vec<T>,
    /// Per cell, the runs (bits) whose radial stress the last step held at zero (kept only
    /// when the recorder asks, [`Recorder::HELD`]).
    held: Vec<u32>,
}

impl<'a, T: Real> Cells<'a, T> {
    fn new(run: &LaneRun<'a>, start: Start<T>) -> Self {
        let f = &run.prep.moisture.faces;
        let r = &run.prep.moisture.r;
        let nr = r.len();
        let Start { sr, st, .. } = start;
        let z = vec![T::default(); nr];
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
            u_surface: T::default(),
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
            dsr_face: vec![T::default(); nr + 1],
            held: vec![0; nr],
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
    fn snapshot<'s>(&'s self, mc: &'s [f64], big_r0: T, held: &'s [u32]) -> Snapshot<'s, T> {
        Snapshot {
            mc,
            radial_stress_pa: &self.sr,
            tangential_stress_pa: &self.st,
            md_creep: &self.ct,
            surface_pressure_pa: zone_pressure(&self.sr, self.f),
            diameter_m: (self.u_surface + big_r0) * 2.0,
            held,
        }
    }

    /// Incremental moduli and strain offsets of step `k` (elastic strains from [`Self::elastic`]).
    #[inline(always)]
    fn coefficients(&mut self, run: &LaneRun, p: &Params<T>, k: usize) {
        let mat = run.material;
        let (e_t, ms) = (mat.md_modulus_pa, mat.creep.mechanosorptive_per_pct);
        let nr = self.r.len();
        let span = k * nr..(k + 1) * nr;
        let drv = run.drive;
        let (dxi, dmc) = (&drv.dxi[span.clone()], &drv.dmc[span.clone()]);
        if drv.fits(p.retardation_s, ms) {
            // the rates of [`step_rates_of`], from the parts the drive holds
            let (kel_t, kel_r) = (&drv.kelvin[0][span.clone()], &drv.kelvin[1][span.clone()]);
            let (msd, msd_c) = (&drv.msd[span.clone()], &drv.msd_c[span.clone()]);
            let fluid = p.viscous_time_s.map(|t| T::splat(1.0) / t);
            for j in 0..nr {
                let part = |kel: &Rates, fluid: T| {
                    let flow = fluid * dxi[j];
                    Rates {
                        kelvin: kel.kelvin,
                        keep: kel.keep,
                        viscous: flow + msd[j],
                        relaxed: flow + msd_c[j],
                    }
                };
                self.rate_t[j] = part(&kel_t[j], fluid[0]);
                self.rate_r[j] = part(&kel_r[j], fluid[1]);
            }
        } else {
            let (ret, vt) = (p.retardation_s, p.viscous_time_s);
            for j in 0..nr {
                self.rate_t[j] = step_rates_of(ret[0], vt[0], ms, dxi[j], dmc[j]);
                self.rate_r[j] = step_rates_of(ret[1], vt[1], ms, dxi[j], dmc[j]);
            }
        }
        for (j, &dm) in dmc.iter().enumerate() {
            // MD: g = sigma_t / E
            let (e1, h1) = step_coefficients_at(
                p.delayed[0],
                T::splat(e_t),
                self.g_t[j],
                &self.ct[j],
                self.rate_t[j],
            );
            self.eh_t[j] = e1;
            self.h_t[j] = h1 + mat.hygro_md_per_pct * dm;
            // radial: g = -stack strain at the pressure; tangent modulus of the stack
            let (e2, h2) = step_coefficients_at(
                p.delayed[1],
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
            let ef = (self.eh_r[j] + self.eh_r[j + 1]) * 0.5;
            let hf = (self.h_r[j] + self.h_r[j + 1]) * 0.5;
            self.ef[j] = ef;
            self.hf[j] = hf;
            self.cf[j] = ef * f[j + 1] * self.inv_dr[j];
            self.rf[j] = ef * f[j + 1] * hf;
        }
    }

    /// Stiffness of the inner half cell (s = E / half cell) and the core's series factor.
    fn core_face(&self) -> (T, T) {
        let sh = self.eh_r[0] / (self.r[0] - self.f[0]);
        let fac = match self.core_k {
            Some(kc) => T::splat(1.0) / (sh / kc + 1.0),
            None => T::splat(1.0),
        };
        (sh, fac)
    }

    /// Assemble cell j: f[j+1] dS(j+1/2) - f[j] dS(j-1/2) - w_j dSt_j = 0 (face terms from
    /// [`Self::coefficients`]).
    #[inline(always)]
    fn assemble(&mut self) {
        let nr = self.r.len();
        if nr == 0 {
            return;
        }
        let core = self.core_face();
        self.assemble_row(0, core);
        // interior rows: both faces, no branches (the same operations as `assemble_row`)
        let (cf, rf, eh_t, h_t) = (&self.cf, &self.rf, &self.eh_t, &self.h_t);
        let zero = T::splat(0.0);
        for j in 1..nr - 1 {
            let (right, left) = (cf[j], cf[j - 1]);
            self.a[j] = left + 0.0;
            self.b[j] = ((zero - right) - left) - eh_t[j] * self.width_r[j];
            self.c[j] = right + 0.0;
            self.d[j] = ((rf[j] + 0.0) - rf[j - 1]) - eh_t[j] * self.width[j] * h_t[j];
        }
        if nr > 1 {
            self.assemble_row(nr - 1, core);
        }
    }

    /// Assemble row j of [`Self::assemble`] with the core face's (stiffness, series factor).
    fn assemble_row(&mut self, j: usize, (sh, fac): (T, T)) {
        let f = self.f;
        let nr = self.r.len();
        let zero = T::splat(0.0);
        let (mut aj, mut bj, mut cj, mut rhs) = (zero, zero, zero, zero);
        if j + 1 < nr {
            cj += self.cf[j];
            bj = bj - self.cf[j];
            rhs += self.rf[j];
        }
        if j > 0 {
            aj += self.cf[j - 1];
            bj = bj - self.cf[j - 1];
            rhs = rhs - self.rf[j - 1];
        } else {
            // core face: d sigma = (s du0 - E h)/(1 + s/k), s = E / (half cell)
            bj = bj - sh * f[0] * fac;
            rhs = rhs - self.eh_r[0] * f[0] * self.h_r[0] * fac;
        }
        bj = bj - self.eh_t[j] * self.width_r[j];
        rhs = rhs - self.eh_t[j] * self.width[j] * self.h_t[j];
        self.a[j] = aj;
        self.b[j] = bj;
        self.c[j] = cj;
        self.d[j] = rhs;
    }

    /// Solve for the displacement increments (into `d`); returns the runs whose solve failed.
    #[inline(always)]
    fn solve(&mut self) -> u32 {
        thomas_of(&self.a, &self.b, &self.c, &mut self.d, &mut self.s)
    }

    /// Apply the stress increments of the solved step, marking the cells held at zero pressure
    /// when `mark_held`; returns the runs with a stress not finite.
    #[inline(always)]
    fn apply(&mut self, mark_held: bool) -> u32 {
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
        let mut finite = Finite::new();
        for (j, &du_j) in du.iter().enumerate() {
            let dst = self.eh_t[j] * (du_j * self.inv_r[j] - self.h_t[j]);
            let dsr = (self.dsr_face[j] + self.dsr_face[j + 1]) * 0.5;
            self.st[j] += dst;
            let sr = self.sr[j] + dsr;
            if mark_held {
                self.held[j] = sr.which(|x| x > 0.0);
            }
            self.sr[j] = sr.min_f(0.0);
            finite.see(self.st[j]);
            finite.see(self.sr[j]);
        }
        // surface displacement: outer cell plus its outer half cell's radial strain change
        let j = nr - 1;
        let dsr_out = self.dsr_face[j] * 0.5;
        let half = f[nr] - r[j];
        self.u_surface += du[j] + (dsr_out / self.eh_r[j] + self.h_r[j]) * half;
        finite.failed()
    }

    /// Advance both creep states over the step at the new stresses (the rates of
    /// [`Self::coefficients`]), and set the elastic strains for the next step.
    #[inline(always)]
    fn update_creep(&mut self, mat: &Material, p: &Params<T>) {
        let compliance = 1.0 / mat.md_modulus_pa;
        for j in 0..self.r.len() {
            let g = self.st[j] * compliance;
            step_update_at(
                p.delayed[0],
                self.g_t[j],
                g,
                &mut self.ct[j],
                self.rate_t[j],
            );
            self.g_t[j] = g;
            let (g, e) = radial_elastic(&mat.stack, -self.sr[j]);
            step_update_at(
                p.delayed[1],
                self.g_r[j],
                g,
                &mut self.cr[j],
                self.rate_r[j],
            );
            (self.g_r[j], self.etan_r[j]) = (g, e);
        }
    }
}

/// Creep-driving radial strain (negative in compression) and tangent modulus at pressure `p`
/// (Pa). The stack's total strain at low pressure is mostly closure of the gaps between layers,
/// which does not creep; creep is scaled on the tangent compliance, g = -P / E_r(P), which for a
/// constant radial modulus is the elastic strain and for Pfeiffer's law tends to 1/K2.
fn radial_elastic<T: Real>(stack: &Stack, p: T) -> (T, T) {
    let p = p.max_f(0.0);
    let e = stack.modulus_of(p);
    (-p / e, e)
}
