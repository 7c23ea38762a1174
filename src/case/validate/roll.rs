//! `roll`: width, diameters and the core (rigid, a given tube, or the default tube).

use super::super::defaults;
use super::super::model::*;
use super::super::raw::{RawCore, RawRoll, Q};
use super::checks::{line_of, Range, Validator};
use crate::units::{self, Kind};
use serde_saphyr::Spanned;
use Range::{Between, Positive};

impl Validator {
    pub(super) fn roll(&mut self, r: &RawRoll) -> Option<Roll> {
        let width = self.q(&r.width, "roll.width", Kind::Length, Between(1e-3, 20.0));
        let dia = self.q(
            &r.diameter,
            "roll.diameter",
            Kind::Length,
            Between(1e-3, 10.0),
        );
        let core_d = self.q(
            &r.core_diameter,
            "roll.core_diameter",
            Kind::Length,
            Between(1e-3, 10.0),
        );
        if let (Some(d), Some(c)) = (dia, core_d) {
            if c >= d {
                self.push_across(
                    "roll.core_diameter",
                    &["roll.diameter"],
                    Some(line_of(&r.core_diameter)),
                    format!(
                        "core diameter {:.1} mm is not smaller than the roll diameter {:.1} mm; check both values and their units",
                        c * 1e3,
                        d * 1e3
                    ),
                );
                return None;
            }
        }
        let core = match &r.core {
            Some(RawCore {
                rigid: Some(rg),
                modulus,
                wall,
                ..
            }) => self.rigid_core(rg, modulus.is_some() || wall.is_some()),
            Some(RawCore {
                modulus: Some(m),
                wall: Some(wq),
                poisson,
                ..
            }) => self.tube_core(m, wq, poisson.as_ref(), core_d),
            Some(RawCore {
                rigid: None,
                modulus: None,
                wall: None,
                poisson: None,
                ..
            }) => self.default_core(core_d),
            Some(_) => {
                self.push(
                    "roll.core",
                    Some(line_of(&r.core_diameter)),
                    "give `rigid: true`, or both `modulus` and `wall` (and optionally `poisson`)"
                        .into(),
                );
                return None;
            }
            None => self.default_core(core_d),
        };
        let rating = match r.core.as_ref().and_then(|c| c.rating.as_ref()) {
            Some(q) => Some(self.q(q, "roll.core.rating", Kind::Pressure, Positive)?),
            None => None,
        };
        Some(Roll {
            width_m: width?,
            diameter_m: dia?,
            core_diameter_m: core_d?,
            core: core?,
            core_rating_pa: rating,
        })
    }

    fn rigid_core(&mut self, rg: &Spanned<bool>, has_tube_values: bool) -> Option<Core> {
        if !rg.value {
            self.push(
                "roll.core.rigid",
                Some(line_of(rg)),
                "write `rigid: true`, or leave it out and give modulus and wall".into(),
            );
            return None;
        }
        if has_tube_values {
            self.push(
                "roll.core",
                Some(line_of(rg)),
                "a rigid core takes no modulus or wall; give one or the other".into(),
            );
            return None;
        }
        Some(Core::Rigid)
    }

    fn tube_core(
        &mut self,
        m: &Q,
        wq: &Q,
        poisson: Option<&Q>,
        core_d: Option<f64>,
    ) -> Option<Core> {
        let e = self.q(m, "roll.core.modulus", Kind::Pressure, Positive);
        let w = self.q(wq, "roll.core.wall", Kind::Length, Positive);
        let nu = self.or_default(
            poisson,
            "roll.core.poisson",
            Kind::Number,
            Between(-0.5, 0.5),
            Some(defaults::CORE_POISSON),
        );
        if let (Some(w), Some(c)) = (w, core_d) {
            if w >= c / 2.0 {
                self.push(
                    "roll.core.wall",
                    Some(line_of(wq)),
                    "core wall is thicker than the core radius; give the wall thickness".into(),
                );
                return None;
            }
        }
        Some(Core::Tube {
            modulus_pa: e?,
            wall_m: w?,
            poisson: nu?,
        })
    }

    /// The default paper core; its wall is limited to a fraction of a small core's radius, and
    /// the value recorded is the one used.
    fn default_core(&mut self, core_d: Option<f64>) -> Option<Core> {
        let (de, dw, dn) = defaults::CORE;
        self.record("roll.core.modulus", de.text, de.source);
        let wall = units::parse(dw.text, Kind::Length).ok()?;
        let max = core_d.map(|c| defaults::CORE_WALL_MAX_FRACTION * c / 2.0);
        let wall_m = match max {
            Some(m) if m < wall => {
                let shown = units::show(m, Kind::Length, units::System::Si, false);
                self.record("roll.core.wall", shown, defaults::CORE_WALL_CLIPPED);
                m
            }
            _ => {
                self.record("roll.core.wall", dw.text, dw.source);
                wall
            }
        };
        self.record("roll.core.poisson", dn.text, dn.source);
        Some(Core::Tube {
            modulus_pa: units::parse(de.text, Kind::Pressure).ok()?,
            wall_m,
            poisson: units::parse(dn.text, Kind::Number).ok()?,
        })
    }
}
