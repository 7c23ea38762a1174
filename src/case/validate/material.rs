//! `material`: grade, then one table row per scalar property (field, reader, kind, range,
//! default), and the two either-or properties (density or basis weight; stack law or constant
//! radial modulus).

use super::super::defaults::{self, Def, GradeDefaults};
use super::super::model::*;
use super::super::raw::{RawMaterial, Q};
use super::checks::{line_of, Range, Validator};
use crate::units::Kind;
use Range::{Between, Positive};

/// One scalar material property: where it is in the file, what it measures, its allowed range,
/// its grade default and where it goes in [`Material`].
struct Row {
    field: &'static str,
    get: fn(&RawMaterial) -> Option<&Q>,
    kind: Kind,
    range: Range,
    default: fn(&GradeDefaults) -> Def,
    put: fn(&mut Material, f64),
}

const fn row(
    field: &'static str,
    get: fn(&RawMaterial) -> Option<&Q>,
    kind: Kind,
    range: Range,
    default: fn(&GradeDefaults) -> Def,
    put: fn(&mut Material, f64),
) -> Row {
    Row {
        field,
        get,
        kind,
        range,
        default,
        put,
    }
}

/// Range of the density, given or derived from basis weight over caliper, kg/m3 (light tissue
/// to mineral-filled board, with margin).
const DENSITY_KG_M3: (f64, f64) = (100.0, 3000.0);

/// Read before density (a basis weight needs the caliper).
const CALIPER: &[Row] = &[row(
    "material.caliper",
    |m| m.caliper.as_ref(),
    Kind::Length,
    Between(1e-6, 5e-3),
    |d| d.caliper,
    |m, v| m.caliper_m = v,
)];

/// In-plane elastic constants.
const ELASTIC: &[Row] = &[
    row(
        "material.md_modulus",
        |m| m.md_modulus.as_ref(),
        Kind::Pressure,
        Between(1e7, 1e12),
        |d| d.md_modulus,
        |m, v| m.md_modulus_pa = v,
    ),
    row(
        "material.cd_modulus",
        |m| m.cd_modulus.as_ref(),
        Kind::Pressure,
        Between(1e7, 1e12),
        |d| d.cd_modulus,
        |m, v| m.cd_modulus_pa = v,
    ),
    row(
        "material.poisson",
        |m| m.poisson.as_ref(),
        Kind::Number,
        Between(-0.5, 0.5),
        |d| d.poisson,
        |m, v| m.poisson = v,
    ),
];

/// Pfeiffer stack law constants (when no constant radial modulus is given).
const STACK: &[Row] = &[
    row(
        "material.stack.k1",
        |m| m.stack.as_ref().map(|s| &s.k1),
        Kind::Pressure,
        Positive,
        |d| d.k1,
        |m, v| set_pfeiffer(m, Some(v), None),
    ),
    row(
        "material.stack.k2",
        |m| m.stack.as_ref().map(|s| &s.k2),
        Kind::Number,
        Between(1.0, 1e4),
        |d| d.k2,
        |m, v| set_pfeiffer(m, None, Some(v)),
    ),
];

/// Highest moisture content accepted, % (material.moisture and every moisture profile value
/// share it).
pub(super) const MOISTURE_MAX_PCT: f64 = 40.0;

/// Friction, moisture response and sorption.
const MOISTURE: &[Row] = &[
    row(
        "material.friction",
        |m| m.friction.as_ref(),
        Kind::Number,
        Between(0.0, 2.0),
        |d| d.friction,
        |m, v| m.friction = v,
    ),
    row(
        "material.hygro_md",
        |m| m.hygro_md.as_ref(),
        Kind::PerMoisture,
        Between(0.0, 0.05),
        |d| d.hygro_md,
        |m, v| m.hygro_md_per_pct = v,
    ),
    row(
        "material.hygro_cd",
        |m| m.hygro_cd.as_ref(),
        Kind::PerMoisture,
        Between(0.0, 0.05),
        |d| d.hygro_cd,
        |m, v| m.hygro_cd_per_pct = v,
    ),
    row(
        "material.hygro_zd",
        |m| m.hygro_zd.as_ref(),
        Kind::PerMoisture,
        Between(0.0, 0.2),
        |d| d.hygro_zd,
        |m, v| m.hygro_zd_per_pct = v,
    ),
    row(
        "material.moisture",
        |m| m.moisture.as_ref(),
        Kind::Moisture,
        Between(0.0, MOISTURE_MAX_PCT),
        |d| d.moisture,
        |m, v| m.moisture_pct = v,
    ),
    row(
        "material.diffusivity_inplane",
        |m| m.diffusivity_inplane.as_ref(),
        Kind::Diffusivity,
        Between(0.0, 1e-4),
        |d| d.diffusivity_inplane,
        |m, v| m.diffusivity_inplane_m2_s = v,
    ),
    row(
        "material.diffusivity_radial",
        |m| m.diffusivity_radial.as_ref(),
        Kind::Diffusivity,
        Between(0.0, 1e-4),
        |d| d.diffusivity_radial,
        |m, v| m.diffusivity_radial_m2_s = v,
    ),
    row(
        "material.sorption.monolayer",
        |m| m.sorption.as_ref().map(|s| &s.monolayer),
        Kind::Moisture,
        Between(0.0, 30.0),
        |d| d.gab_m,
        |m, v| m.sorption.monolayer_pct = v,
    ),
    row(
        "material.sorption.c",
        |m| m.sorption.as_ref().map(|s| &s.c),
        Kind::Number,
        Between(0.0, 1e4),
        |d| d.gab_c,
        |m, v| m.sorption.c = v,
    ),
    row(
        "material.sorption.k",
        |m| m.sorption.as_ref().map(|s| &s.k),
        Kind::Number,
        Between(0.0, 0.99),
        |d| d.gab_k,
        |m, v| m.sorption.k = v,
    ),
];

/// Burgers creep per direction, time shifts and mechano-sorption.
const CREEP: &[Row] = &[
    row(
        "material.creep.md.delayed",
        |m| m.creep.as_ref()?.md.as_ref().map(|b| &b.delayed),
        Kind::Number,
        Between(0.0, 100.0),
        |d| d.md_delayed,
        |m, v| m.creep.md.delayed = v,
    ),
    row(
        "material.creep.md.retardation",
        |m| m.creep.as_ref()?.md.as_ref().map(|b| &b.retardation),
        Kind::Duration,
        Positive,
        |d| d.md_retardation,
        |m, v| m.creep.md.retardation_s = v,
    ),
    row(
        "material.creep.md.viscous_time",
        |m| m.creep.as_ref()?.md.as_ref().map(|b| &b.viscous_time),
        Kind::Duration,
        Positive,
        |d| d.md_viscous,
        |m, v| m.creep.md.viscous_time_s = v,
    ),
    row(
        "material.creep.radial.delayed",
        |m| m.creep.as_ref()?.radial.as_ref().map(|b| &b.delayed),
        Kind::Number,
        Between(0.0, 100.0),
        |d| d.r_delayed,
        |m, v| m.creep.radial.delayed = v,
    ),
    row(
        "material.creep.radial.retardation",
        |m| m.creep.as_ref()?.radial.as_ref().map(|b| &b.retardation),
        Kind::Duration,
        Positive,
        |d| d.r_retardation,
        |m, v| m.creep.radial.retardation_s = v,
    ),
    row(
        "material.creep.radial.viscous_time",
        |m| m.creep.as_ref()?.radial.as_ref().map(|b| &b.viscous_time),
        Kind::Duration,
        Positive,
        |d| d.r_viscous,
        |m, v| m.creep.radial.viscous_time_s = v,
    ),
    row(
        "material.creep.activation_energy",
        |m| m.creep.as_ref()?.activation_energy.as_ref(),
        Kind::MolarEnergy,
        Between(0.0, 1e6),
        |d| d.activation,
        |m, v| m.creep.activation_energy_j_mol = v,
    ),
    row(
        "material.creep.moisture_shift",
        |m| m.creep.as_ref()?.moisture_shift.as_ref(),
        Kind::Number,
        Between(0.0, 5.0),
        |d| d.moisture_shift,
        |m, v| m.creep.moisture_shift_dec_per_pct = v,
    ),
    row(
        "material.creep.mechanosorptive",
        |m| m.creep.as_ref()?.mechanosorptive.as_ref(),
        Kind::Number,
        Between(0.0, 100.0),
        |d| d.mechanosorptive,
        |m, v| m.creep.mechanosorptive_per_pct = v,
    ),
];

/// Strength limits (the wound state is checked against them).
const STRENGTH: &[Row] = &[
    row(
        "material.strength.md_tensile",
        |m| m.strength.as_ref()?.md_tensile.as_ref(),
        Kind::Pressure,
        Between(1e5, 1e10),
        |d| d.md_tensile,
        |m, v| m.strength.md_tensile_pa = v,
    ),
    row(
        "material.strength.md_compressive",
        |m| m.strength.as_ref()?.md_compressive.as_ref(),
        Kind::Pressure,
        Between(1e5, 1e10),
        |d| d.md_compressive,
        |m, v| m.strength.md_compressive_pa = v,
    ),
    row(
        "material.strength.zd_crush",
        |m| m.strength.as_ref()?.zd_crush.as_ref(),
        Kind::Pressure,
        Between(1e4, 1e10),
        |d| d.zd_crush,
        |m, v| m.strength.zd_crush_pa = v,
    ),
    row(
        "material.roughness",
        |m| m.roughness.as_ref(),
        Kind::Length,
        Between(1e-9, 1e-4),
        |d| d.roughness,
        |m, v| m.roughness_m = v,
    ),
];

fn set_pfeiffer(m: &mut Material, k1: Option<f64>, k2: Option<f64>) {
    if let Stack::Pfeiffer { k1_pa, k2: k } = &mut m.stack {
        *k1_pa = k1.unwrap_or(*k1_pa);
        *k = k2.unwrap_or(*k);
    }
}

/// A material with every value zero, filled in row by row.
fn blank(grade: Grade) -> Material {
    let burgers = Burgers {
        delayed: 0.0,
        retardation_s: 0.0,
        viscous_time_s: 0.0,
    };
    Material {
        grade,
        caliper_m: 0.0,
        density_kg_m3: 0.0,
        md_modulus_pa: 0.0,
        cd_modulus_pa: 0.0,
        poisson: 0.0,
        stack: Stack::Pfeiffer {
            k1_pa: 0.0,
            k2: 0.0,
        },
        friction: 0.0,
        hygro_md_per_pct: 0.0,
        hygro_cd_per_pct: 0.0,
        hygro_zd_per_pct: 0.0,
        moisture_pct: 0.0,
        diffusivity_inplane_m2_s: 0.0,
        diffusivity_radial_m2_s: 0.0,
        sorption: Gab {
            monolayer_pct: 0.0,
            c: 0.0,
            k: 0.0,
        },
        creep: Creep {
            md: burgers,
            radial: burgers,
            activation_energy_j_mol: 0.0,
            moisture_shift_dec_per_pct: 0.0,
            mechanosorptive_per_pct: 0.0,
        },
        strength: Strength {
            md_tensile_pa: 0.0,
            md_compressive_pa: 0.0,
            zd_crush_pa: 0.0,
        },
        roughness_m: 0.0,
    }
}

impl Validator {
    pub(super) fn material(&mut self, m: &RawMaterial) -> Option<Material> {
        let grade = self.grade(m)?;
        let gd = defaults::for_grade(grade);
        let mut out = blank(grade);
        let mut ok = self.rows(m, gd.as_ref(), CALIPER, &mut out);
        let caliper = ok.then_some(out.caliper_m);
        ok &= self.density(m, gd.as_ref(), caliper, &mut out);
        ok &= self.rows(m, gd.as_ref(), ELASTIC, &mut out);
        ok &= self.stack(m, gd.as_ref(), &mut out);
        ok &= self.rows(m, gd.as_ref(), MOISTURE, &mut out);
        ok &= self.rows(m, gd.as_ref(), CREEP, &mut out);
        ok &= self.rows(m, gd.as_ref(), STRENGTH, &mut out);
        ok.then_some(out)
    }

    fn grade(&mut self, m: &RawMaterial) -> Option<Grade> {
        match &m.grade.value {
            super::super::raw::Word::Known(g) => Some(*g),
            super::super::raw::Word::Unknown { text, .. } => {
                self.push(
                    "material.grade",
                    Some(line_of(&m.grade)),
                    format!(
                        "'{text}' is not a grade class; use newsprint, coated, board, film or custom"
                    ),
                );
                None
            }
        }
    }

    /// Every row in turn (all are checked, so every problem is reported); false if any failed.
    fn rows(
        &mut self,
        m: &RawMaterial,
        gd: Option<&GradeDefaults>,
        rows: &[Row],
        out: &mut Material,
    ) -> bool {
        let mut ok = true;
        for r in rows {
            let def = gd.map(r.default);
            match self.or_default((r.get)(m), r.field, r.kind, r.range, def) {
                Some(v) => (r.put)(out, v),
                None => ok = false,
            }
        }
        ok
    }

    /// Density, given directly or as basis weight over caliper.
    fn density(
        &mut self,
        m: &RawMaterial,
        gd: Option<&GradeDefaults>,
        caliper: Option<f64>,
        out: &mut Material,
    ) -> bool {
        let rho_range = Between(DENSITY_KG_M3.0, DENSITY_KG_M3.1);
        let v = match (&m.density, &m.basis_weight) {
            (Some(_), Some(bw)) => {
                self.push(
                    "material.basis_weight",
                    Some(line_of(bw)),
                    "give density or basis_weight, not both".into(),
                );
                None
            }
            (None, Some(bw)) => {
                let gsm = self.q(bw, "material.basis_weight", Kind::Grammage, Positive);
                gsm.zip(caliper)
                    .and_then(|(w, c)| self.weight_density(w, c, Some(line_of(bw))))
            }
            (d, None) => self.or_default(
                d.as_ref(),
                "material.density",
                Kind::Density,
                rho_range,
                gd.map(|d| d.density),
            ),
        };
        v.map(|v| out.density_kg_m3 = v).is_some()
    }

    /// The density a basis weight `w` (kg/m2) over a caliper `c` (m) gives, when it lies in
    /// [`DENSITY_KG_M3`]; else a problem naming both fields, the density, its range and which
    /// way the two are likely wrong (reported against a `--set` of either).
    fn weight_density(&mut self, w: f64, c: f64, line: Option<u64>) -> Option<f64> {
        let (rho, (lo, hi)) = (w / c, DENSITY_KG_M3);
        if (lo..=hi).contains(&rho) {
            return Some(rho);
        }
        let sys = crate::units::message_system();
        let show = |v, kind, fine| crate::units::show(v, kind, sys, fine);
        let check = if rho < lo {
            "the caliper is too large or the basis weight too small"
        } else {
            "the caliper is too small or the basis weight too large"
        };
        let message = format!(
            "material.basis_weight {} over material.caliper {} gives a density of {}, out of range: it must be within {} .. {}; {check}. Fix: check material.caliper and material.basis_weight, their units first (a caliper is tens to hundreds of um, a basis weight tens to hundreds of g/m2)",
            show(w, Kind::Grammage, false),
            show(c, Kind::Length, true),
            show(rho, Kind::Density, false),
            show(lo, Kind::Density, false),
            show(hi, Kind::Density, false),
        );
        self.push_across(
            "material.basis_weight",
            &["material.caliper"],
            line,
            message,
        );
        None
    }

    /// Stack law: Pfeiffer constants (given or grade defaults) or a constant radial modulus.
    fn stack(&mut self, m: &RawMaterial, gd: Option<&GradeDefaults>, out: &mut Material) -> bool {
        match (&m.stack, &m.radial_modulus) {
            (Some(_), Some(rm)) => {
                self.push(
                    "material.radial_modulus",
                    Some(line_of(rm)),
                    "give either stack (k1, k2) or radial_modulus, not both".into(),
                );
                false
            }
            (None, Some(rm)) => self
                .q(rm, "material.radial_modulus", Kind::Pressure, Positive)
                .map(|e| {
                    out.stack = Stack::Constant {
                        radial_modulus_pa: e,
                    }
                })
                .is_some(),
            (_, None) => self.rows(m, gd, STACK, out),
        }
    }
}
