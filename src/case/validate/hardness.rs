//! `hardness`: scale name, repeatability and the optional calibration to interlayer pressure.

use super::super::defaults;
use super::super::model::*;
use super::super::raw::RawHardness;
use super::checks::{Range, Validator};
use crate::units::Kind;
use Range::{Any, Positive};

impl Validator {
    pub(super) fn hardness(&mut self, h: Option<&RawHardness>) -> Option<Hardness> {
        let rep = self.or_default(
            h.and_then(|h| h.repeatability.as_ref()),
            "hardness.repeatability",
            Kind::Number,
            Positive,
            Some(defaults::HARDNESS_REPEAT),
        );
        let calibration = match h.and_then(|h| h.calibration.as_ref()) {
            Some(c) => {
                let a = self.q(&c.a, "hardness.calibration.a", Kind::Number, Any);
                let b = self.q(&c.b, "hardness.calibration.b", Kind::Number, Positive);
                let p = self.q(
                    &c.pressure_ref,
                    "hardness.calibration.pressure_ref",
                    Kind::Pressure,
                    Positive,
                );
                Some(Calibration {
                    a: a?,
                    b: b?,
                    pressure_ref_pa: p?,
                })
            }
            None => {
                let d = defaults::HARDNESS_SLOPE;
                self.record("hardness.calibration.b", d.text, d.source);
                None
            }
        };
        let scale = match h.and_then(|h| h.scale.clone()) {
            Some(s) => s,
            None => {
                let d = defaults::HARDNESS_SCALE;
                self.record("hardness.scale", d.text, d.source);
                d.text.to_string()
            }
        };
        Some(Hardness {
            scale,
            repeatability: rep?,
            calibration,
        })
    }
}
