//! What storage does to one lane independently of its creep parameters (the reduced-time steps
//! and moisture changes of its cells), computed once per lane and re-used by every run of its
//! mechanics (a fit runs a lane hundreds of times).

use super::ageing::Prepared;
use super::creep::{exponential_ratio, Rates};
use super::shift::{arrhenius_shift, moisture_shift};
use crate::case::Material;
use std::borrow::Cow;
use std::sync::OnceLock;

/// What storage does to one lane independently of its creep parameters: the reduced-time step
/// and the moisture change of each radial cell at each time step (index k * cells + j).
#[derive(Debug, Clone, PartialEq)]
pub struct LaneDrive {
    pub dxi: Vec<f64>,
    pub dmc: Vec<f64>,
    /// The parts of each step's creep rates that a fit's scales leave alone (index as `dxi`):
    /// the Kelvin parts of [`Rates`] with a = dxi / tau_K for the grade's retardation times `ret`
    /// (s), MD and radial (their viscous part is left 0: a fit's scales set it); and m_s |dmc|
    /// for the grade's mechano-sorptive coefficient `ms` (/%).
    pub(super) kelvin: [Vec<Rates>; 2],
    pub(super) msd: Vec<f64>,
    /// c(msd) = msd / (1 - e^-msd) ([`exponential_ratio`]; index as `dxi`).
    pub(super) msd_c: Vec<f64>,
    ret: [f64; 2],
    ms: f64,
}

impl LaneDrive {
    /// Whether the precomputed rate parts hold for retardation times `ret` (s; MD, radial) and
    /// coefficient `ms` (same to the bit as the grade's).
    pub(super) fn fits(&self, ret: [f64; 2], ms: f64) -> bool {
        self.ret[0].to_bits() == ret[0].to_bits()
            && self.ret[1].to_bits() == ret[1].to_bits()
            && self.ms.to_bits() == ms.to_bits()
    }
}

/// Lanes' drives kept with the moisture history they come from, each with the bits of the
/// material values it read ([`DriveKey`]). Equal to any other (it holds nothing a run's result
/// depends on); a clone starts empty.
#[derive(Debug, Default)]
pub struct Drives(Vec<OnceLock<(DriveKey, LaneDrive)>>);

/// The material's creep values and reference moisture a drive reads, as bits.
type DriveKey = [u64; 6];

impl Drives {
    pub(super) fn new(lanes: usize) -> Self {
        Drives((0..lanes).map(|_| OnceLock::new()).collect())
    }
}

impl Clone for Drives {
    fn clone(&self) -> Self {
        Drives::new(self.0.len())
    }
}

impl PartialEq for Drives {
    fn eq(&self, _: &Self) -> bool {
        true
    }
}

/// A lane's drive (time shifts and moisture changes): computed once per lane of a moisture
/// history and material, then lent out (computed afresh, and owned, for other creep values).
pub fn drive<'p>(material: &Material, prep: &'p Prepared, lane: usize) -> Cow<'p, LaneDrive> {
    let c = &material.creep;
    let key = [
        c.activation_energy_j_mol,
        c.moisture_shift_dec_per_pct,
        c.md.retardation_s,
        c.radial.retardation_s,
        c.mechanosorptive_per_pct,
        prep.mc_ref,
    ]
    .map(f64::to_bits);
    match prep.moisture.drives.0.get(lane) {
        Some(cell) => {
            let (k, d) = cell.get_or_init(|| (key, compute(material, prep, lane)));
            if *k == key {
                Cow::Borrowed(d)
            } else {
                Cow::Owned(compute(material, prep, lane))
            }
        }
        None => Cow::Owned(compute(material, prep, lane)),
    }
}

/// [`drive`] computed.
fn compute(material: &Material, prep: &Prepared, lane: usize) -> LaneDrive {
    let mat = material;
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
    let ret = [mat.creep.md.retardation_s, mat.creep.radial.retardation_s];
    let ms = mat.creep.mechanosorptive_per_pct;
    let msd: Vec<f64> = dmc.iter().map(|d| ms * d.abs()).collect();
    LaneDrive {
        kelvin: ret.map(|t| {
            dxi.iter()
                .map(|x| Rates::new(x / t, 0.0, 0.0, 1.0))
                .collect()
        }),
        msd_c: msd.iter().map(|&m| exponential_ratio(m)).collect(),
        msd,
        ret,
        ms,
        dxi,
        dmc,
    }
}
