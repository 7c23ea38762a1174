//! `lab_creep`: laboratory creep curves of the grade (constant stress, strain against time).

use super::super::defaults;
use super::super::model::*;
use super::super::raw::RawLabCreep;
use super::checks::{line_of, Range, Validator};
use crate::units::Kind;

impl Validator {
    pub(super) fn lab_creep(&mut self, tests: &[RawLabCreep]) -> Option<Vec<LabCreep>> {
        let mut out = Vec::new();
        let mut ok = true;
        for (i, t) in tests.iter().enumerate() {
            match self.lab_test(i, t) {
                Some(x) => out.push(x),
                None => ok = false,
            }
        }
        ok.then_some(out)
    }

    fn lab_test(&mut self, i: usize, t: &RawLabCreep) -> Option<LabCreep> {
        let f = |n: &str| format!("lab_creep[{i}].{n}");
        let dir = self.word(&t.direction, &f("direction"));
        let stress = self.q(&t.stress, &f("stress"), Kind::Pressure, Range::Positive);
        let temp = self.or_default(
            t.temperature.as_ref(),
            &f("temperature"),
            Kind::Temperature,
            Range::Between(223.15, 373.15),
            Some(defaults::LAB_TEMPERATURE),
        );
        let rh = self.or_default(
            t.rh.as_ref(),
            &f("rh"),
            Kind::Humidity,
            Range::Between(0.0, 1.0),
            Some(defaults::LAB_RH),
        );
        let n_t = t.times.value.len();
        let n_s = t.strains.value.len();
        if n_t != n_s || n_t < 4 {
            self.push(
                &f("strains"),
                Some(line_of(&t.strains)),
                format!(
                    "{n_t} times but {n_s} strains; give at least four points, one strain per time"
                ),
            );
            return None;
        }
        let (times, mut ok) = self.lab_times(i, t);
        let strains: Vec<f64> = t.strains.value.clone();
        if strains.iter().any(|s| !s.is_finite() || *s <= 0.0) {
            self.push(
                &f("strains"),
                Some(line_of(&t.strains)),
                "strains must be positive finite numbers (as fractions, e.g. 0.0015)".into(),
            );
            ok = false;
        }
        if times.windows(2).any(|w| w[1] <= w[0]) {
            self.push(
                &f("times"),
                Some(line_of(&t.times)),
                "times must increase".into(),
            );
            ok = false;
        }
        ok.then_some(LabCreep {
            direction: dir?.word().to_string(),
            stress_pa: stress?,
            temperature_k: temp?,
            rh: rh?,
            times_s: times,
            strains,
        })
    }

    /// Test times in SI, each after loading; false if any was bad.
    fn lab_times(&mut self, i: usize, t: &RawLabCreep) -> (Vec<f64>, bool) {
        let line = Some(line_of(&t.times));
        let mut times = Vec::new();
        let mut ok = true;
        for (k, x) in t.times.value.iter().enumerate() {
            let field = format!("lab_creep[{i}].times[{k}]");
            match self.num_unit(*x, &t.time_unit.value, &field, line, Kind::Duration) {
                Some(v) if v > 0.0 => times.push(v),
                Some(_) => {
                    self.push(
                        &field,
                        line,
                        "times must be after loading (greater than zero)".into(),
                    );
                    ok = false;
                }
                None => ok = false,
            }
        }
        (times, ok)
    }
}
