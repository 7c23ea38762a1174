//! What a lane run keeps of each step end: the [`Recorder`] trait, [`Track`] (what a fit
//! compares with measurements) and [`FullRecord`] (everything, as [`LaneAged`]).

use super::ageing::{FinalStress, LaneAged, Prepared};
use super::cells::Ended;
use super::creep::CreepState;
use super::hardness::HardnessMap;
use crate::case::Material;
use crate::pack::{member, Pack};
use crate::winding::Wound;

/// A lane's state at a step end, handed to a [`Recorder`]: of one run, or of a pack of runs
/// side by side (`T`, see [`crate::pack`]).
#[derive(Debug, Clone, Copy)]
pub struct Snapshot<'a, T = f64> {
    /// Moisture at the radial cells, %.
    pub mc: &'a [f64],
    /// Radial and tangential stress at the radial cells, Pa.
    pub radial_stress_pa: &'a [T],
    pub tangential_stress_pa: &'a [T],
    /// MD creep state at the radial cells.
    pub md_creep: &'a [CreepState<T>],
    /// Mean interlayer pressure in the surface zone, Pa.
    pub surface_pressure_pa: T,
    /// Lane diameter, m.
    pub diameter_m: T,
    /// Per cell, the runs (bits) whose radial stress the step just ended would have turned to
    /// tension and the kernel held at zero instead; empty at the start, and unless the recorder
    /// asks for it ([`Recorder::HELD`]).
    pub held: &'a [u32],
}

/// What a lane run keeps of each step end.
pub trait Recorder<T = f64> {
    /// Whether the kernel should mark the cells it held at zero pressure ([`Snapshot::held`]).
    const HELD: bool = false;
    /// Keep what is wanted of the state at a step end (called for the start and every step).
    fn record(&mut self, s: &Snapshot<T>);
}

/// Keeps only what a fit compares with measurements: surface pressure and diameter.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Track {
    /// Mean interlayer pressure in the surface zone at each step end, Pa.
    pub surface_pressure_pa: Vec<f64>,
    /// Lane diameter at each step end, m.
    pub diameter_m: Vec<f64>,
}

impl Recorder for Track {
    fn record(&mut self, s: &Snapshot) {
        self.surface_pressure_pa.push(s.surface_pressure_pa);
        self.diameter_m.push(s.diameter_m);
    }
}

/// [`Track`]s of a pack of runs side by side, step by step.
#[derive(Debug, Clone, Default)]
pub struct Tracks<const B: usize> {
    surface_pressure_pa: Vec<Pack<B>>,
    diameter_m: Vec<Pack<B>>,
}

impl<const B: usize> Recorder<Pack<B>> for Tracks<B> {
    fn record(&mut self, s: &Snapshot<Pack<B>>) {
        self.surface_pressure_pa.push(s.surface_pressure_pa);
        self.diameter_m.push(s.diameter_m);
    }
}

impl<const B: usize> Tracks<B> {
    /// Member `m`'s track.
    pub fn member(&self, m: usize) -> Track {
        Track {
            surface_pressure_pa: member(&self.surface_pressure_pa, m).collect(),
            diameter_m: member(&self.diameter_m, m).collect(),
        }
    }
}

/// Keeps everything of a lane ([`LaneAged`]).
#[derive(Debug, Clone)]
pub struct FullRecord<'a> {
    out: LaneAged,
    hardness: &'a HardnessMap,
    /// Cell volumes per unit length and their sum, m^2.
    vol: Vec<f64>,
    vsum: f64,
    /// Third of web length (0 outer, 2 inner) of each cell, and the outer third's volume.
    thirds: Vec<usize>,
    outer_w: f64,
    mc0: &'a [f64],
    /// The web's own length excess at winding, dimensionless.
    born: f64,
    hygro_md_per_pct: f64,
    md_modulus_pa: f64,
    /// Cell faces (m) and step-end times (s) of the run.
    faces: &'a [f64],
    times: &'a [f64],
    /// Cells that had interlayer pressure at the start of storage (a cell wound slack was never
    /// pressed on, so it is not loosened in storage).
    pressed: Vec<bool>,
}

impl<'a> FullRecord<'a> {
    /// A recorder for lane `lane` of a prepared storage run.
    pub fn new(
        material: &Material,
        prep: &'a Prepared,
        wound: &Wound,
        lane: usize,
        hardness: &'a HardnessMap,
    ) -> Self {
        let f = &prep.moisture.faces;
        let r = &prep.moisture.r;
        let nr = r.len();
        let nt = prep.timeline.times.len();
        let vol: Vec<f64> = (0..nr).map(|j| r[j] * (f[j + 1] - f[j])).collect();
        let vsum: f64 = vol.iter().sum();
        // thirds of web length (equal volume), counted from the outside
        let thirds: Vec<usize> = (0..nr)
            .map(|j| {
                let outside: f64 = vol[j + 1..].iter().sum::<f64>() + 0.5 * vol[j];
                ((3.0 * outside / vsum) as usize).min(2)
            })
            .collect();
        let outer_w: f64 = (0..nr).filter(|&j| thirds[j] == 0).map(|j| vol[j]).sum();
        FullRecord {
            out: LaneAged {
                position_m: wound.lanes[lane].position_m,
                moisture_pct: Vec::with_capacity(nt),
                permanent_strain: Vec::with_capacity(nt),
                delayed_strain: Vec::with_capacity(nt),
                elastic_strain: Vec::with_capacity(nt),
                hygro_strain: Vec::with_capacity(nt),
                web_length_strain: prep.web_length.get(lane).copied().unwrap_or(0.0),
                outer_moisture_pct: Vec::with_capacity(nt),
                strain_at_unwind: Vec::with_capacity(nt),
                diameter_m: Vec::with_capacity(nt),
                surface_pressure_pa: Vec::with_capacity(nt),
                hardness: Vec::with_capacity(nt),
                strain_at_unwind_by_third: [0.0; 3],
                final_radial_stress_pa: Vec::new(),
                final_tangential_stress_pa: Vec::new(),
                loose_outer_depth_m: 0.0,
                loose_outer_time_s: 0.0,
                loose_outer_end_depth_m: 0.0,
            },
            hardness,
            vol,
            vsum,
            thirds,
            outer_w,
            mc0: &prep.moisture.mc[0][lane],
            born: prep.web_length.get(lane).copied().unwrap_or(0.0),
            hygro_md_per_pct: material.hygro_md_per_pct,
            md_modulus_pa: material.md_modulus_pa,
            faces: f,
            times: &prep.timeline.times,
            pressed: Vec::new(),
        }
    }

    /// Keep the loose outer wraps of a step end: the depth below the barrel (m) of the deepest
    /// cell of the outer half, pressed on at the start of storage, that the kernel held at zero
    /// pressure (`held`, bit 0), the deepest so far with its time, and the depth at the latest
    /// step end.
    fn loose(&mut self, held: &[u32]) {
        let f = self.faces;
        let (Some(&top), Some(&bottom)) = (f.last(), f.first()) else {
            return;
        };
        if held.is_empty() {
            return;
        }
        let mid = 0.5 * (top + bottom);
        let pressed = |j: usize| self.pressed.get(j).copied().unwrap_or(false);
        let deepest = (0..held.len())
            .filter(|&j| f[j] >= mid && held[j] & 1 != 0 && pressed(j))
            .map(|j| top - f[j])
            .fold(0.0, f64::max);
        self.out.loose_outer_end_depth_m = deepest;
        if deepest > self.out.loose_outer_depth_m {
            let step = self.out.diameter_m.len();
            self.out.loose_outer_depth_m = deepest;
            self.out.loose_outer_time_s = self.times.get(step).copied().unwrap_or(0.0);
        }
    }

    /// The lane's record, with the final stresses.
    pub fn finish(mut self, end: FinalStress) -> LaneAged {
        self.out.final_radial_stress_pa = end.radial_pa;
        self.out.final_tangential_stress_pa = end.tangential_pa;
        self.out
    }
}

impl Recorder for FullRecord<'_> {
    const HELD: bool = true;
    fn record(&mut self, s: &Snapshot) {
        let (mc, st, ct) = (s.mc, s.tangential_stress_pa, s.md_creep);
        let (mc0, beta, e_t, born) = (
            self.mc0,
            self.hygro_md_per_pct,
            self.md_modulus_pa,
            self.born,
        );
        let nr = self.vol.len();
        if self.out.diameter_m.is_empty() {
            self.pressed = s.radial_stress_pa.iter().map(|&x| x < 0.0).collect();
        }
        self.loose(s.held);
        self.out.surface_pressure_pa.push(s.surface_pressure_pa);
        self.out
            .hardness
            .push(self.hardness.hardness(s.surface_pressure_pa));
        self.out.diameter_m.push(s.diameter_m);
        // every cell sum in one pass, each added in cell order from -0.0 as `Iterator::sum`
        // adds (the same bits as a pass per sum)
        let (mut perm, mut del, mut hyg, mut moist, mut elastic) = (-0.0, -0.0, -0.0, -0.0, -0.0);
        let (mut outer, mut outer_mc) = (-0.0, -0.0);
        let mut by = [0.0; 3];
        let mut wsum = [0.0; 3];
        for j in 0..nr {
            let v = self.vol[j];
            let hygro = beta * (mc[j] - mc0[j]);
            let unwind = ct[j].permanent + ct[j].delayed + hygro + born;
            perm += v * ct[j].permanent;
            del += v * ct[j].delayed;
            hyg += v * hygro;
            moist += v * mc[j];
            elastic += v * (st[j] / e_t);
            let third = self.thirds[j];
            if third == 0 {
                outer += v * unwind;
                outer_mc += v * mc[j];
            }
            by[third] += v * unwind;
            wsum[third] += v;
        }
        let (perm, del, hyg, moist, elastic) = (
            perm / self.vsum,
            del / self.vsum,
            hyg / self.vsum,
            moist / self.vsum,
            elastic / self.vsum,
        );
        let (outer, outer_mc) = (outer / self.outer_w, outer_mc / self.outer_w);
        let out = &mut self.out;
        out.moisture_pct.push(moist);
        out.outer_moisture_pct.push(outer_mc);
        out.permanent_strain.push(perm);
        out.delayed_strain.push(del);
        out.elastic_strain.push(elastic);
        out.hygro_strain.push(hyg);
        out.strain_at_unwind.push(outer);
        for z in 0..3 {
            out.strain_at_unwind_by_third[z] = by[z] / wsum[z].max(1e-300);
        }
    }
}

/// [`FullRecord`]s of a pack of runs side by side: each member's record kept from its own view
/// of the pack's snapshot (the same values, to the bit, as a run of its own hands its record).
#[derive(Debug, Clone)]
pub struct FullRecords<'a, const B: usize> {
    members: [FullRecord<'a>; B],
    radial: Vec<f64>,
    tangential: Vec<f64>,
    md_creep: Vec<CreepState>,
    held: Vec<u32>,
}

impl<'a, const B: usize> FullRecords<'a, B> {
    /// Recorders for the members, each as [`FullRecord::new`] makes it.
    pub fn new(members: [FullRecord<'a>; B]) -> Self {
        FullRecords {
            members,
            radial: Vec::new(),
            tangential: Vec::new(),
            md_creep: Vec::new(),
            held: Vec::new(),
        }
    }

    /// Each member's record, with its final stresses from the pack's run `end`.
    pub fn finish_all(self, end: &Ended<Pack<B>>) -> [LaneAged; B] {
        let mut m = 0;
        self.members.map(|r| {
            let stress = FinalStress {
                radial_pa: member(&end.radial_pa, m).collect(),
                tangential_pa: member(&end.tangential_pa, m).collect(),
            };
            m += 1;
            r.finish(stress)
        })
    }
}

impl<const B: usize> Recorder<Pack<B>> for FullRecords<'_, B> {
    const HELD: bool = true;
    fn record(&mut self, s: &Snapshot<Pack<B>>) {
        let FullRecords {
            members,
            radial,
            tangential,
            md_creep,
            held,
        } = self;
        for (m, rec) in members.iter_mut().enumerate() {
            radial.clear();
            radial.extend(member(s.radial_stress_pa, m));
            tangential.clear();
            tangential.extend(member(s.tangential_stress_pa, m));
            md_creep.clear();
            md_creep.extend(s.md_creep.iter().map(|c| CreepState {
                delayed: c.delayed.0[m],
                permanent: c.permanent.0[m],
            }));
            // member m's held cells as a run of its own marks them (bit 0)
            held.clear();
            held.extend(s.held.iter().map(|h| (h >> m) & 1));
            rec.record(&Snapshot {
                mc: s.mc,
                radial_stress_pa: radial,
                tangential_stress_pa: tangential,
                md_creep,
                surface_pressure_pa: s.surface_pressure_pa.0[m],
                diameter_m: s.diameter_m.0[m],
                held,
            });
        }
    }
}
