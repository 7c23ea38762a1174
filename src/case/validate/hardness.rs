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
        self.hardness_range = scale_range(&scale).map(|(lo, hi)| (scale.clone(), lo, hi));
        Some(Hardness {
            scale,
            repeatability: rep?,
            calibration,
        })
    }
}

/// The range a hardness scale's name ends with: `rebound 0-100`, `Shore D 0..100`, `0 to 100`
/// give (0, 100); a name without one (`hardness units`) gives none.
pub(super) fn scale_range(scale: &str) -> Option<(f64, f64)> {
    let words: Vec<&str> = scale.split_whitespace().collect();
    let num = |w: &str| w.parse::<f64>().ok().filter(|v| v.is_finite());
    let pair = match words.as_slice() {
        [.., a, sep, b] if matches!(*sep, "-" | "to" | ".." | "\u{2013}") => (num(a)?, num(b)?),
        [.., last] => {
            let (a, b) = match last.split_once("..") {
                Some(ab) => ab,
                // the separator's dash is the first one after the first character (a low end
                // may be negative)
                None => last.split_at(
                    last.char_indices()
                        .skip(1)
                        .find(|(_, c)| matches!(c, '-' | '\u{2013}'))?
                        .0,
                ),
            };
            let b = b.trim_start_matches(['-', '\u{2013}']);
            (num(a)?, num(b)?)
        }
        [] => return None,
    };
    (pair.0 < pair.1).then_some(pair)
}

#[cfg(test)]
mod tests {
    use super::scale_range;

    #[test]
    fn a_scale_name_ending_with_a_range_gives_it() {
        assert_eq!(scale_range("rebound 0-100"), Some((0.0, 100.0)));
        assert_eq!(scale_range("Shore D 0..100"), Some((0.0, 100.0)));
        assert_eq!(scale_range("gauge 0 to 100"), Some((0.0, 100.0)));
        assert_eq!(scale_range("gauge 0 - 100"), Some((0.0, 100.0)));
        assert_eq!(scale_range("odd -10-90"), Some((-10.0, 90.0)));
        assert_eq!(scale_range("hardness units"), None);
        assert_eq!(scale_range("rebound"), None);
        assert_eq!(scale_range("backwards 100-0"), None);
        assert_eq!(scale_range(""), None);
        assert_eq!(scale_range("\u{2013}5"), None);
    }
}
