//! `storage` stretches and the `wraps` mass-transfer coefficients.

use super::super::defaults;
use super::super::model::*;
use super::super::raw::{RawStretch, RawWraps};
use super::checks::{Range, Validator};
use crate::units::Kind;
use Range::{Between, Positive};

/// Most storage stretches in one case.
pub(in crate::case) const MAX_STRETCHES: usize = 100;
/// Longest total storage, s (20 years).
pub(in crate::case) const MAX_STORAGE_S: f64 = 20.0 * 365.25 * crate::units::DAY_S;

impl Validator {
    pub(super) fn storage(&mut self, s: &[RawStretch]) -> Option<Vec<Stretch>> {
        if s.len() > MAX_STRETCHES {
            self.push(
                "storage",
                s.get(MAX_STRETCHES).map(|st| super::checks::line_of(&st.duration)),
                format!(
                    "{} storage stretches; at most {MAX_STRETCHES} are read. Fix: merge stretches with similar temperature and humidity",
                    s.len()
                ),
            );
            return None;
        }
        let mut out = Vec::new();
        let mut ok = true;
        for (i, st) in s.iter().enumerate() {
            match self.stretch(i, st) {
                Some(x) => out.push(x),
                None => ok = false,
            }
        }
        let total: f64 = out.iter().map(|x: &Stretch| x.duration_s).sum();
        if ok && total > MAX_STORAGE_S {
            self.push(
                "storage",
                s.first().map(|st| super::checks::line_of(&st.duration)),
                format!(
                    "the stretches add up to {:.0} days, over the 20 years this model is meant for; check the durations' units (e.g. \"30 d\")",
                    total / crate::units::DAY_S
                ),
            );
            return None;
        }
        ok.then_some(out)
    }

    fn stretch(&mut self, i: usize, st: &RawStretch) -> Option<Stretch> {
        let f = |n: &str| format!("storage[{i}].{n}");
        let dur = self.q(&st.duration, &f("duration"), Kind::Duration, Positive);
        let t = self.q(
            &st.temperature,
            &f("temperature"),
            Kind::Temperature,
            Between(223.15, 373.15),
        );
        let rh = self.q(&st.rh, &f("rh"), Kind::Humidity, Between(0.0, 1.0));
        let wrap = (Wrap::None, defaults::WRAP);
        let bw = self.word_or(st.barrel_wrap.as_ref(), &f("barrel_wrap"), wrap);
        let ew = self.word_or(st.end_wrap.as_ref(), &f("end_wrap"), wrap);
        let stance = self.word_or(
            st.stance.as_ref(),
            &f("stance"),
            (Stance::OnEnd, defaults::STANCE),
        );
        Some(Stretch {
            duration_s: dur?,
            temperature_k: t?,
            rh: rh?,
            barrel_wrap: bw?,
            end_wrap: ew?,
            stance: stance?,
            place: st.place.clone(),
            contact_share: 1.0,
        })
    }

    pub(super) fn wraps(&mut self, w: Option<&RawWraps>) -> Option<WrapPermeance> {
        let r = Range::Between(0.0, 1.0);
        let none = self.or_default(
            w.and_then(|w| w.none.as_ref()),
            "wraps.none",
            Kind::Permeance,
            r,
            Some(defaults::WRAP_NONE),
        );
        let paper = self.or_default(
            w.and_then(|w| w.paper.as_ref()),
            "wraps.paper",
            Kind::Permeance,
            r,
            Some(defaults::WRAP_PAPER),
        );
        let film = self.or_default(
            w.and_then(|w| w.film.as_ref()),
            "wraps.film",
            Kind::Permeance,
            r,
            Some(defaults::WRAP_FILM),
        );
        Some(WrapPermeance {
            none_m_s: none?,
            paper_m_s: paper?,
            film_m_s: film?,
        })
    }
}
