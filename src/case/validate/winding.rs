//! `winding`: web tension (constant or a taper table), nip load and speed.

use super::super::model::*;
use super::super::raw::{RawTaperPoint, RawWinding};
use super::checks::{line_of, Range, Validator};
use crate::units::Kind;
use Range::{Between, NonNegative, Positive};

impl Validator {
    pub(super) fn winding(&mut self, w: &RawWinding) -> Option<Winding> {
        let tension = match (&w.tension, &w.taper) {
            (Some(q), None) => self
                .q(q, "winding.tension", Kind::LineForce, Positive)
                .map(|t| Tension::Constant { tension_n_per_m: t }),
            (Some(q), Some(_)) => {
                self.push(
                    "winding.taper",
                    Some(line_of(q)),
                    "give either tension (constant) or taper (a table), not both".into(),
                );
                None
            }
            (None, None) => {
                self.push(
                    "winding.tension",
                    None,
                    "missing: give `tension: \"2.0 pli\"` or a `taper:` table of {diameter, tension}".into(),
                );
                None
            }
            (None, Some(pts)) => self.taper(pts),
        };
        let nip = match &w.nip {
            Some(q) => self.q(q, "winding.nip", Kind::LineForce, NonNegative),
            None => {
                self.record(
                    "winding.nip",
                    "0 N/m",
                    "no nip given: centre winding without a nip assumed",
                );
                Some(0.0)
            }
        };
        let speed = match &w.speed {
            Some(q) => self.q(q, "winding.speed", Kind::Speed, Between(0.0, 200.0)),
            None => {
                self.record(
                    "winding.speed",
                    "0 m/s",
                    "no speed given: centrifugal effects left out",
                );
                Some(0.0)
            }
        };
        Some(Winding {
            tension: tension?,
            nip_n_per_m: nip?,
            speed_m_s: speed?,
        })
    }

    /// A taper table: (diameter, tension) points with increasing diameter.
    fn taper(&mut self, pts: &[RawTaperPoint]) -> Option<Tension> {
        if pts.is_empty() {
            self.push(
                "winding.taper",
                None,
                "taper table is empty; give at least one {diameter, tension} point".into(),
            );
            return None;
        }
        let mut out = Vec::new();
        let mut ok = true;
        for (i, p) in pts.iter().enumerate() {
            let d = self.q(
                &p.diameter,
                &format!("winding.taper[{i}].diameter"),
                Kind::Length,
                Positive,
            );
            let t = self.q(
                &p.tension,
                &format!("winding.taper[{i}].tension"),
                Kind::LineForce,
                Positive,
            );
            match (d, t) {
                (Some(d), Some(t)) => out.push((d, t)),
                _ => ok = false,
            }
        }
        if ok && out.windows(2).any(|p| p[1].0 <= p[0].0) {
            self.push(
                "winding.taper",
                Some(line_of(&pts[0].diameter)),
                "taper table diameters must increase from one point to the next".into(),
            );
            ok = false;
        }
        ok.then_some(Tension::Taper { points: out })
    }
}
