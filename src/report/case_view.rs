//! `check`, `lanes` and `template` output.

use super::{f, fine, pct, pos, q, table};
use crate::case::{Case, Core, Measure, Stack, Stance, Tension, Wrap};
use crate::lanes::Lanes;
use crate::units::{self, Kind, System, DAY_S};
use comfy_table::Table;
use serde_json::{json, Value};
use std::fmt::Write;

/// The field table of `check`: one row per value, marked where a default was used.
struct Fields<'a> {
    case: &'a Case,
    sys: System,
    table: Table,
}

impl Fields<'_> {
    fn row(&mut self, field: &str, v: String) {
        let mark = if self.case.defaults.iter().any(|d| d.field == field) {
            "default"
        } else {
            ""
        };
        self.table
            .add_row(vec![field.to_string(), v, mark.to_string()]);
    }

    fn material(&mut self) {
        let (m, sys) = (&self.case.material, self.sys);
        self.row("material.grade", format!("{:?}", m.grade).to_lowercase());
        self.row("material.caliper", fine(m.caliper_m, sys));
        self.row("material.density", q(m.density_kg_m3, Kind::Density, sys));
        self.row(
            "material.md_modulus",
            q(m.md_modulus_pa, Kind::Pressure, sys),
        );
        self.row(
            "material.cd_modulus",
            q(m.cd_modulus_pa, Kind::Pressure, sys),
        );
        self.row("material.poisson", f(m.poisson, 3));
        match m.stack {
            Stack::Pfeiffer { k1_pa, k2 } => {
                self.row("material.stack.k1", q(k1_pa, Kind::Pressure, sys));
                self.row("material.stack.k2", f(k2, 1));
            }
            Stack::Constant { radial_modulus_pa } => self.row(
                "material.radial_modulus",
                q(radial_modulus_pa, Kind::Pressure, sys),
            ),
        }
        self.row("material.friction", f(m.friction, 2));
        self.moisture();
        self.creep();
    }

    fn moisture(&mut self) {
        let m = &self.case.material;
        self.row("material.hygro_md", format!("{} /%", m.hygro_md_per_pct));
        self.row("material.hygro_cd", format!("{} /%", m.hygro_cd_per_pct));
        self.row("material.hygro_zd", format!("{} /%", m.hygro_zd_per_pct));
        self.row("material.moisture", format!("{:.2} %", m.moisture_pct));
        self.row(
            "material.diffusivity_inplane",
            format!("{:.2e} m2/s", m.diffusivity_inplane_m2_s),
        );
        self.row(
            "material.diffusivity_radial",
            format!("{:.2e} m2/s", m.diffusivity_radial_m2_s),
        );
        self.row(
            "material.sorption",
            format!(
                "GAB Mm {:.2} %, C {:.2}, K {:.3}",
                m.sorption.monolayer_pct, m.sorption.c, m.sorption.k
            ),
        );
    }

    fn creep(&mut self) {
        let cr = &self.case.material.creep;
        for (name, b) in [("md", cr.md), ("radial", cr.radial)] {
            self.row(
                &format!("material.creep.{name}.delayed"),
                format!(
                    "{:.2} (retardation {:.1} d, viscous time {:.0} d)",
                    b.delayed,
                    b.retardation_s / DAY_S,
                    b.viscous_time_s / DAY_S
                ),
            );
        }
        self.row(
            "material.creep.activation_energy",
            q(cr.activation_energy_j_mol, Kind::MolarEnergy, self.sys),
        );
        self.row(
            "material.creep.moisture_shift",
            format!("{} decades/%", cr.moisture_shift_dec_per_pct),
        );
        self.row(
            "material.creep.mechanosorptive",
            format!("{} /%", cr.mechanosorptive_per_pct),
        );
    }

    fn roll(&mut self) {
        let (r, sys) = (&self.case.roll, self.sys);
        self.row("roll.width", q(r.width_m, Kind::Length, sys));
        self.row("roll.diameter", q(r.diameter_m, Kind::Length, sys));
        self.row(
            "roll.core_diameter",
            q(r.core_diameter_m, Kind::Length, sys),
        );
        match r.core {
            Core::Rigid => self.row("roll.core", "rigid".into()),
            Core::Tube {
                modulus_pa,
                wall_m,
                poisson,
            } => {
                self.row("roll.core.modulus", q(modulus_pa, Kind::Pressure, sys));
                self.row("roll.core.wall", q(wall_m, Kind::Length, sys));
                self.row("roll.core.poisson", f(poisson, 2));
            }
        }
    }

    fn winding(&mut self) {
        let (w, sys) = (&self.case.winding, self.sys);
        let tension = match &w.tension {
            Tension::Constant { tension_n_per_m } => q(*tension_n_per_m, Kind::LineForce, sys),
            Tension::Taper { points } => points
                .iter()
                .map(|(d, t)| {
                    format!(
                        "{} @ {}",
                        q(*t, Kind::LineForce, sys),
                        q(*d, Kind::Length, sys)
                    )
                })
                .collect::<Vec<_>>()
                .join(", "),
        };
        self.row("winding.tension", tension);
        self.row("winding.nip", q(w.nip_n_per_m, Kind::LineForce, sys));
        self.row("winding.speed", q(w.speed_m_s, Kind::Speed, sys));
    }

    fn hardness(&mut self) {
        let h = &self.case.hardness;
        self.row(
            "hardness.repeatability",
            format!("{} {}", h.repeatability, h.scale),
        );
    }
}

/// The normalised case as text, defaults marked.
pub fn check_text(c: &Case, sys: System) -> String {
    let mut out = header(c);
    let mut fields = Fields {
        case: c,
        sys,
        table: table(&["field", "value", ""]),
    };
    fields.material();
    fields.roll();
    fields.winding();
    fields.hardness();
    let _ = writeln!(out, "{}", fields.table);
    if !c.profiles.is_empty() {
        let _ = writeln!(out, "{}", profiles_table(c, sys));
    }
    if !c.storage.is_empty() {
        let _ = writeln!(out, "{}", storage_table(c, sys));
    }
    if !c.defaults.is_empty() {
        let mut d = table(&["default used for", "value", "source"]);
        for x in &c.defaults {
            d.add_row(vec![x.field.clone(), x.value.clone(), x.source.clone()]);
        }
        let _ = writeln!(out, "{d}");
    }
    for w in &c.warnings {
        let _ = writeln!(out, "warning: {w}");
    }
    out
}

/// Case id, source, title and complaint.
fn header(c: &Case) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "Case {} ({})", c.id, c.source);
    if !c.title.is_empty() {
        let _ = writeln!(out, "{}", c.title);
    }
    if let Some(cp) = &c.complaint {
        let _ = writeln!(out, "Complaint: {}", super::words::complaint(cp));
    }
    out
}

/// One row per profile: kind, age, points, span, value range, origin.
fn profiles_table(c: &Case, sys: System) -> Table {
    let mut p = table(&["profile", "age", "points", "span", "range", "from"]);
    for (i, pr) in c.profiles.iter().enumerate() {
        let (lo, hi) = pr
            .values
            .iter()
            .fold((f64::INFINITY, f64::NEG_INFINITY), |a, &v| {
                (a.0.min(v), a.1.max(v))
            });
        let range = match pr.what {
            Measure::Hardness => format!("{lo:.1} .. {hi:.1}"),
            Measure::Caliper => format!("{} .. {}", fine(lo, sys), fine(hi, sys)),
            Measure::Diameter => format!(
                "{} .. {}",
                q(lo, Kind::Length, sys),
                q(hi, Kind::Length, sys)
            ),
            // N/m, or fractions of the mean for a profile given in %
            Measure::Tension if hi <= 10.0 => format!("{:.1} .. {:.1} %", lo * 100.0, hi * 100.0),
            Measure::Tension => format!(
                "{} .. {}",
                q(lo, Kind::LineForce, sys),
                q(hi, Kind::LineForce, sys)
            ),
            Measure::Moisture => format!("{lo:.2} .. {hi:.2} %"),
        };
        p.add_row(vec![
            format!("{} {}", i + 1, super::words::measure(pr.what)),
            format!("{:.0} d", pr.age_s / DAY_S),
            pr.positions_m.len().to_string(),
            format!(
                "{} .. {}",
                pos(pr.positions_m[0], sys),
                pos(pr.positions_m[pr.positions_m.len() - 1], sys)
            ),
            range,
            pr.origin.clone(),
        ]);
    }
    p
}

/// One row per storage stretch.
fn storage_table(c: &Case, sys: System) -> Table {
    let mut s = table(&[
        "storage period",
        "days",
        "temperature",
        "RH",
        "barrel",
        "ends",
        "stance",
        "place",
    ]);
    let wrap = |w: Wrap| format!("{w:?}").to_lowercase();
    for (i, st) in c.storage.iter().enumerate() {
        s.add_row(vec![
            (i + 1).to_string(),
            f(st.duration_s / DAY_S, 1),
            q(st.temperature_k, Kind::Temperature, sys),
            format!("{:.0} %", st.rh * 100.0),
            wrap(st.barrel_wrap),
            wrap(st.end_wrap),
            match st.stance {
                Stance::OnEnd => "on end".into(),
                Stance::OnSide => "on side".into(),
            },
            st.place.clone().unwrap_or_default(),
        ]);
    }
    s
}

/// The case as JSON (all SI, field names carry units); a failure to serialise is returned, not
/// turned into `null`.
pub fn check_json(c: &Case) -> Result<Value, serde_json::Error> {
    serde_json::to_value(c)
}

/// Per-lane table.
pub fn lanes_text(c: &Case, l: &Lanes, sys: System) -> String {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "Case {}: {} lanes across {}; caliper from {} (mean {})",
        c.id,
        l.lanes.len(),
        q(c.roll.width_m, Kind::Length, sys),
        super::words::caliper_source(l.caliper_source),
        fine(l.mean_caliper_m, sys)
    );
    let mut t = table(&[
        "lane",
        "centre",
        "width",
        "caliper",
        "caliper dev",
        "diameter dev",
        "hardness dev",
        "wound strain dR/R",
    ]);
    for ln in &l.lanes {
        t.add_row(vec![
            format!("{}{}", ln.index, if ln.extrapolated { "*" } else { "" }),
            pos(ln.position_m, sys),
            q(ln.width_m, Kind::Length, sys),
            fine(ln.caliper_m, sys),
            pct(ln.caliper_deviation, 2),
            ln.diameter_deviation_m
                .map(|d| match sys {
                    System::Si => units::signed(d, Kind::Length, sys, false, 2),
                    System::Us => units::signed(d, Kind::Length, sys, true, 1),
                })
                .unwrap_or_else(|| "-".into()),
            ln.hardness_deviation
                .map(|h| format!("{h:+.1}"))
                .unwrap_or_else(|| "-".into()),
            ln.wound_strain_difference
                .map(|s| pct(s, 3))
                .unwrap_or_else(|| "-".into()),
        ]);
    }
    let _ = writeln!(out, "{t}");
    if l.lanes.iter().any(|x| x.extrapolated) {
        let _ = writeln!(out, "* extrapolated beyond the measured positions");
    }
    for line in super::words::note_lines(&c.warnings, &l.notes, sys) {
        let _ = writeln!(out, "{line}");
    }
    let _ = writeln!(
        out,
        "A lane larger than the mean by dR is stretched by about dR/R at winding; a lane with no stretch left runs slack."
    );
    out
}

/// Per-lane JSON.
pub fn lanes_json(c: &Case, l: &Lanes) -> Value {
    let (notes, warnings) = super::words::note_json(&c.warnings, &l.notes);
    json!({
        "case": c.id,
        "mean_caliper_m": l.mean_caliper_m,
        "caliper_source": l.caliper_source,
        "lanes": l.lanes.iter().map(|x| json!({
            "index": x.index,
            "position_m": x.position_m,
            "left_m": x.left_m,
            "right_m": x.right_m,
            "width_m": x.width_m,
            "caliper_m": x.caliper_m,
            "caliper_deviation_fraction": x.caliper_deviation,
            "diameter_deviation_m": x.diameter_deviation_m,
            "hardness_deviation_hardness_units": x.hardness_deviation,
            "strain_m_per_m": x.wound_strain_difference,
            "extrapolated": x.extrapolated,
        })).collect::<Vec<_>>(),
        "notes": notes,
        "warnings": warnings,
    })
}

/// A commented starter case file.
pub const TEMPLATE: &str = include_str!("template.yaml");
