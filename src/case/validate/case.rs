//! The whole case: every section in turn, then the checks that span sections.

use super::super::model::*;
use super::super::raw::RawCase;
use super::checks::{Range, Validator};
use crate::units::Kind;

impl Validator {
    /// Validate every section; `None` when any section failed (the problems say why).
    pub(in crate::case) fn case(&mut self, raw: RawCase, file: &str) -> Option<Case> {
        self.format(&raw);
        let complaint = raw.complaint.as_ref().and_then(|c| {
            self.known_word(c, "complaint", crate::vocab::WORDS)
                .map(str::to_string)
        });
        let material = self.material(&raw.material);
        let roll = self.roll(&raw.roll);
        let winding = self.winding(&raw.winding);
        let hardness = self.hardness(raw.hardness.as_ref());
        let wraps = self.wraps(raw.wraps.as_ref());
        let storage = self.storage(&raw.storage);
        let width = roll.as_ref().map(|r| r.width_m);
        let profiles = self.profiles(&raw.profiles, width, file);
        let caliper_repeatability_m = self.caliper_repeatability(&raw.profiles);
        let (lane_edges_m, lane_count) = self.lanes(raw.lanes.as_ref(), width);
        let lab_creep = self.lab_creep(&raw.lab_creep);
        let converting = self.converting(&raw, roll.as_ref(), winding.as_ref());
        let converting_speed = self.converting_speed(&raw, winding.as_ref());
        if let (Some(m), Some(r), Some(ps)) = (&material, &roll, &profiles) {
            self.profile_scale(&raw.profiles, ps, m.caliper_m, r.diameter_m);
        }
        self.warn_taper(roll.as_ref(), winding.as_ref());
        self.warn_nip(material.as_ref(), winding.as_ref());
        self.physical(&raw, material.as_ref(), winding.as_ref());
        Some(Case {
            source: file.to_string(),
            id: raw.case.clone(),
            title: raw.title.clone().unwrap_or_default(),
            complaint,
            notes: raw.notes.clone().unwrap_or_default(),
            material: material?,
            roll: roll?,
            winding: winding?,
            profiles: profiles?,
            storage: storage?,
            lane_edges_m,
            lane_count,
            hardness: hardness?,
            wraps: wraps?,
            converting_tension_n_per_m: converting?,
            caliper_repeatability_m,
            converting_speed_m_s: converting_speed?,
            lab_creep: lab_creep?,
            defaults: std::mem::take(&mut self.defaults),
            warnings: std::mem::take(&mut self.warnings),
        })
    }

    fn format(&mut self, raw: &RawCase) {
        if raw.format.value != 1 {
            self.push(
                "format",
                Some(super::checks::line_of(&raw.format)),
                format!(
                    "format {} is not supported; this version reads `format: 1`",
                    raw.format.value
                ),
            );
        }
    }

    /// Converter tension, N/m; defaults to the winding tension at mid-build.
    fn converting(
        &mut self,
        raw: &RawCase,
        roll: Option<&Roll>,
        winding: Option<&Winding>,
    ) -> Option<f64> {
        match raw.converting.as_ref().and_then(|c| c.tension.as_ref()) {
            Some(q) => self.q(q, "converting.tension", Kind::LineForce, Range::Positive),
            None => winding.zip(roll).map(|(w, r)| {
                let t = w.tension.at(0.5 * (r.core_diameter_m + r.diameter_m));
                self.record(
                    "converting.tension",
                    format!("{t:.0} N/m"),
                    "not given: assumed equal to the winding web tension",
                );
                t
            }),
        }
    }

    /// Converter unwind speed, m/s; defaults to the winding speed.
    fn converting_speed(&mut self, raw: &RawCase, winding: Option<&Winding>) -> Option<f64> {
        match raw.converting.as_ref().and_then(|c| c.speed.as_ref()) {
            Some(q) => self.q(q, "converting.speed", Kind::Speed, Range::Positive),
            None => winding.map(|w| {
                self.record(
                    "converting.speed",
                    format!("{:.2} m/s", w.speed_m_s),
                    "not given: assumed equal to the winding speed",
                );
                w.speed_m_s
            }),
        }
    }

    /// A taper table that does not span the build is held flat beyond its ends.
    fn warn_taper(&mut self, roll: Option<&Roll>, winding: Option<&Winding>) {
        let (Some(r), Some(w)) = (roll, winding) else {
            return;
        };
        if let Tension::Taper { points } = &w.tension {
            let (lo, hi) = (points[0].0, points[points.len() - 1].0);
            if lo > r.core_diameter_m * 1.5 || hi < r.diameter_m * 0.9 {
                let sys = crate::units::message_system();
                let (lo, hi, core, d) = match sys {
                    crate::units::System::Si => (
                        format!("{:.0}", lo * 1e3),
                        format!("{:.0} mm", hi * 1e3),
                        format!("{:.0}", r.core_diameter_m * 1e3),
                        format!("{:.0} mm", r.diameter_m * 1e3),
                    ),
                    crate::units::System::Us => {
                        let l = |x| crate::units::show(x, crate::units::Kind::Length, sys, false);
                        (l(lo), l(hi), l(r.core_diameter_m), l(r.diameter_m))
                    }
                };
                self.warnings.push(format!(
                    "winding.taper: table covers {lo}-{hi} but the roll builds from {core} to {d}; tension is held flat beyond the table"
                ));
            }
        }
    }

    /// A nip load far above the web tension is where the nip model overstates.
    fn warn_nip(&mut self, material: Option<&Material>, winding: Option<&Winding>) {
        let (Some(m), Some(w)) = (material, winding) else {
            return;
        };
        let t = w.tension.at(0.0).max(1e-9);
        if m.friction * w.nip_n_per_m > 2.5 * t {
            let sys = crate::units::message_system();
            let f = |x: f64| match sys {
                crate::units::System::Si => format!("{x:.0} N/m"),
                crate::units::System::Us => {
                    crate::units::show(x, crate::units::Kind::LineForce, sys, false)
                }
            };
            self.warnings.push(format!(
                "winding.nip: friction x nip ({}) is over 2.5x the web tension ({}); measured nip-induced tension saturates at such loads, so the model may overstate wound-in tension (common practice)",
                f(m.friction * w.nip_n_per_m),
                f(t)
            ));
        }
    }
}
