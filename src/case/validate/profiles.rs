//! `profiles`: cross-width measurements given inline or as a CSV file, converted to SI and
//! checked against the roll width.

use super::super::model::*;
use super::super::raw::RawProfile;
use super::checks::{line_of, Range, Validator};
use crate::units::Kind;
use serde_saphyr::Spanned;
use std::path::PathBuf;

/// Numbers with the line they came from.
type Points = Vec<(f64, Option<u64>)>;

/// Most positions read per profile (a scanner exports a few hundred over a machine width).
pub(in crate::case) const MAX_PROFILE_POINTS: usize = 5000;

impl Validator {
    pub(super) fn profiles(
        &mut self,
        ps: &[RawProfile],
        width: Option<f64>,
        file: &str,
    ) -> Option<Vec<Profile>> {
        let mut out = Vec::new();
        let mut ok = true;
        for (i, p) in ps.iter().enumerate() {
            match self.profile(i, p, width, file) {
                Some(pr) => out.push(pr),
                None => ok = false,
            }
        }
        ok.then_some(out)
    }

    fn profile(
        &mut self,
        i: usize,
        p: &RawProfile,
        width: Option<f64>,
        file: &str,
    ) -> Option<Profile> {
        let f = |n: &str| format!("profiles[{i}].{n}");
        let what = self.word(&p.what, &f("what"))?;
        let age = self.q(&p.age, &f("age"), Kind::Duration, Range::NonNegative);
        let val_unit = p.unit.clone().unwrap_or_default();
        let line = Some(line_of(&p.what));
        if what != Measure::Hardness && val_unit.is_empty() {
            self.push(
                &f("unit"),
                line,
                "caliper and diameter values need a unit, e.g. `unit: um` or `unit: mm`".into(),
            );
            return None;
        }
        let (positions, values, origin) = self.points(i, p, file)?;
        if positions.len() != values.len() {
            self.push(
                &f("values"),
                values.first().and_then(|v| v.1).or(line),
                format!(
                    "{} positions but {} values; each position needs exactly one value",
                    positions.len(),
                    values.len()
                ),
            );
            return None;
        }
        if positions.len() > MAX_PROFILE_POINTS {
            self.push(
                &f("positions"),
                line,
                format!(
                    "{} positions; at most {MAX_PROFILE_POINTS} are read per profile. Fix: average the scan onto fewer positions (every 5-10 mm is plenty for lanes)",
                    positions.len()
                ),
            );
            return None;
        }
        if positions.len() < 2 {
            self.push(
                &f("positions"),
                line,
                "a profile needs at least two positions across the width".into(),
            );
            return None;
        }
        let (pos_si, val_si) = self.points_si(i, p, what, &positions, &values, width)?;
        Some(Profile {
            what,
            age_s: age?,
            positions_m: pos_si,
            values: val_si,
            origin,
        })
    }

    /// Positions and values as written: inline lists or a CSV file, and where they came from.
    fn points(&mut self, i: usize, p: &RawProfile, file: &str) -> Option<(Points, Points, String)> {
        let f = |n: &str| format!("profiles[{i}].{n}");
        match (&p.csv, &p.positions, &p.values) {
            (Some(c), None, None) => self.csv_points(c, &f("csv")),
            (None, Some(ps), Some(vs)) => Some((
                ps.value.iter().map(|&x| (x, Some(line_of(ps)))).collect(),
                vs.value.iter().map(|&x| (x, Some(line_of(vs)))).collect(),
                file.to_string(),
            )),
            (Some(c), _, _) => {
                self.push(
                    &f("csv"),
                    Some(line_of(c)),
                    "give either csv or positions and values, not both".into(),
                );
                None
            }
            _ => {
                self.push(
                    &f("values"),
                    Some(line_of(&p.what)),
                    "a profile needs `positions` and `values` lists, or a `csv` file".into(),
                );
                None
            }
        }
    }

    fn csv_points(&mut self, c: &Spanned<String>, field: &str) -> Option<(Points, Points, String)> {
        let path = match &self.base {
            Some(b) => b.join(&c.value),
            None => PathBuf::from(&c.value),
        };
        match super::super::csv::read_profile(&path) {
            Ok(rows) => Some((
                rows.iter().map(|r| (r.0, None)).collect(),
                rows.iter().map(|r| (r.1, None)).collect(),
                path.display().to_string(),
            )),
            Err(message) => {
                self.push(field, Some(line_of(c)), message);
                None
            }
        }
    }

    /// Positions (m, increasing, inside the roll) and values (m, or hardness scale units).
    fn points_si(
        &mut self,
        i: usize,
        p: &RawProfile,
        what: Measure,
        positions: &Points,
        values: &Points,
        width: Option<f64>,
    ) -> Option<(Vec<f64>, Vec<f64>)> {
        let f = |n: &str| format!("profiles[{i}].{n}");
        let pos_unit = p.position_unit.clone().unwrap_or_else(|| "mm".to_string());
        let val_unit = p.unit.clone().unwrap_or_default();
        let mut pos_si = Vec::new();
        let mut val_si = Vec::new();
        let mut ok = true;
        for (k, ((x, xl), (v, vl))) in positions.iter().zip(values.iter()).enumerate() {
            let xs = self.num_unit(
                *x,
                &pos_unit,
                &f(&format!("positions[{k}]")),
                *xl,
                Kind::Length,
            );
            let vs = self.value_si(*v, *vl, what, &val_unit, &f(&format!("values[{k}]")));
            let (Some(x), Some(v)) = (xs, vs) else {
                ok = false;
                continue;
            };
            if !self.inside(x, width, &f(&format!("positions[{k}]")), *xl) {
                ok = false;
                continue;
            }
            pos_si.push(x);
            val_si.push(v);
        }
        if ok && pos_si.windows(2).any(|w| w[1] <= w[0]) {
            self.push(
                &f("positions"),
                positions.first().and_then(|p| p.1),
                "positions must increase from the front edge to the back edge".into(),
            );
            ok = false;
        }
        ok.then_some((pos_si, val_si))
    }

    /// One profile value in SI: hardness as read, lengths through their unit and positive.
    fn value_si(
        &mut self,
        v: f64,
        line: Option<u64>,
        what: Measure,
        unit: &str,
        field: &str,
    ) -> Option<f64> {
        if what == Measure::Hardness {
            if v.is_finite() {
                return Some(v);
            }
            self.push(
                field,
                line,
                "is not a finite number; remove the point or give its reading".into(),
            );
            return None;
        }
        let v = self.num_unit(v, unit, field, line, Kind::Length)?;
        self.check_range(v, field, line, Kind::Length, Range::Positive)
    }

    /// Whether a position lies on the roll (when the width is known).
    fn inside(&mut self, x: f64, width: Option<f64>, field: &str, line: Option<u64>) -> bool {
        let Some(w) = width else { return true };
        if x < -1e-9 || x > w + 1e-9 {
            self.push(
                field,
                line,
                format!(
                    "position {:.1} mm is outside the roll width (0 .. {:.1} mm); positions are measured from the front edge",
                    x * 1e3,
                    w * 1e3
                ),
            );
            return false;
        }
        true
    }
}
