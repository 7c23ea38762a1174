//! `profiles`: cross-width measurements given inline or as a CSV file, converted to SI and
//! checked against the roll width.

use super::super::csv::{confined, read_profile, Columns};
use super::super::errors::Problem;
use super::super::model::*;
use super::super::raw::{RawColumns, RawProfile, Word};
use super::checks::{line_of, Range, Validator};
use crate::units::Kind;
use serde_saphyr::Spanned;

/// Numbers with the line they came from.
type Points = Vec<(f64, Option<u64>)>;

/// Positions, values, the file they came from, the (position, value) units of a CSV header,
/// and the CSV line of each row (empty for inline lists).
type PointsFrom = (
    Points,
    Points,
    String,
    (Option<String>, Option<String>),
    Vec<u64>,
);

/// The units a profile's positions and values are written in, and for a CSV its file and the
/// line of each row (for messages).
struct Units {
    position: String,
    value: String,
    csv: Option<(String, Vec<u64>)>,
}
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
        (ok && self.distinct(ps, &out)).then_some(out)
    }

    /// Whether no two profiles measure the same thing at the same age: the lanes would read
    /// only one of them, so a second one is refused, both entries named.
    fn distinct(&mut self, raw: &[RawProfile], profiles: &[Profile]) -> bool {
        let mut ok = true;
        for (j, b) in profiles.iter().enumerate() {
            let Some(i) = profiles[..j]
                .iter()
                .position(|a| a.what == b.what && (a.age_s - b.age_s).abs() < SAME_AGE_S)
            else {
                continue;
            };
            let message = format!(
                "profiles[{i}] (line {}) and profiles[{j}] are both {} profiles at {:.1} d; only one can be read. Fix: keep one, average them into one, or give each its own age",
                line_of(&raw[i].what),
                what_word(b.what),
                b.age_s / crate::units::DAY_S
            );
            self.push(
                &format!("profiles[{j}].what"),
                Some(line_of(&raw[j].what)),
                message,
            );
            ok = false;
        }
        ok
    }

    /// The caliper repeatability the caliper profiles give, m (the largest when several do);
    /// `repeatability` on another profile is an error (hardness has `hardness.repeatability`).
    pub(super) fn caliper_repeatability(&mut self, ps: &[RawProfile]) -> Option<f64> {
        let mut out: Option<f64> = None;
        for (i, p) in ps.iter().enumerate() {
            let Some(q) = p.repeatability.as_ref() else {
                continue;
            };
            let field = format!("profiles[{i}].repeatability");
            if !matches!(p.what.value, Word::Known(Measure::Caliper)) {
                self.push(
                    &field,
                    Some(line_of(&p.what)),
                    "repeatability is read for caliper profiles only; hardness takes `hardness.repeatability`. Fix: remove it here".into(),
                );
                continue;
            }
            if let Some(v) = self.q(q, &field, Kind::Length, Range::Positive) {
                out = Some(out.map_or(v, |o| o.max(v)));
            }
        }
        out
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
        let line = Some(line_of(&p.what));
        let (positions, values, origin, header_units, csv_lines) = self.points(i, p, file)?;
        let csv = (!csv_lines.is_empty()).then(|| (origin.clone(), csv_lines));
        let units = self.units(i, p, what, header_units, csv)?;
        if what != Measure::Hardness && units.value.is_empty() {
            self.push(&f("unit"), line, unit_hint(what).into());
            return None;
        }
        if matches!(what, Measure::Tension | Measure::Moisture) && age.is_some_and(|a| a > 0.0) {
            self.push(
                &f("age"),
                Some(line_of(&p.age)),
                "tension and moisture profiles are read as the web was wound: give `age: \"0 d\"` (later surveys are hardness, diameter or caliper)".into(),
            );
            return None;
        }
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
            let from = if origin == file {
                String::new()
            } else {
                format!(" (CSV file {origin} has {})", positions.len())
            };
            self.push(
                &f("positions"),
                line,
                format!("a profile needs at least two positions across the width{from}"),
            );
            return None;
        }
        let (pos_si, val_si) = self.points_si(i, &units, what, &positions, &values, width)?;
        Some(Profile {
            what,
            age_s: age?,
            positions_m: pos_si,
            values: val_si,
            origin,
        })
    }

    /// The units profile `i` is read in: `position_unit` and `unit` as written, else the CSV
    /// header's, else mm for positions. A header unit other than the case's own is an error
    /// naming both (which of the two holds cannot be told).
    fn units(
        &mut self,
        i: usize,
        p: &RawProfile,
        what: Measure,
        header: (Option<String>, Option<String>),
        csv: Option<(String, Vec<u64>)>,
    ) -> Option<Units> {
        let value_kind = match what {
            Measure::Caliper | Measure::Diameter => Some(Kind::Length),
            Measure::Moisture => Some(Kind::Moisture),
            Measure::Tension => Some(Kind::LineForce),
            Measure::Hardness => None,
        };
        let mut ok = true;
        for (field, given, head, column, kind) in [
            (
                "position_unit",
                &p.position_unit,
                &header.0,
                "position",
                Some(Kind::Length),
            ),
            ("unit", &p.unit, &header.1, "value", value_kind),
        ] {
            let (Some(g), Some(h), Some((file, _))) = (given, head, &csv) else {
                continue;
            };
            if !same_unit(g, h, kind) {
                let message = format!(
                    "`{field}: {g}` disagrees with the unit '{}' in the header of CSV file {file} (its {column} column), so which holds cannot be told. Fix: correct the one that is wrong, or remove `{field}` to read the header's unit",
                    super::super::csv::snippet(h)
                );
                self.push(
                    &format!("profiles[{i}].{field}"),
                    Some(line_of(&p.what)),
                    message,
                );
                ok = false;
            }
        }
        ok.then(|| Units {
            csv,
            position: (p.position_unit.clone().or(header.0)).unwrap_or_else(|| "mm".to_string()),
            value: p.unit.clone().or(header.1).unwrap_or_default(),
        })
    }

    /// Positions and values as written: inline lists or a CSV file, where they came from, and
    /// the units a CSV header gives.
    fn points(&mut self, i: usize, p: &RawProfile, file: &str) -> Option<PointsFrom> {
        let f = |n: &str| format!("profiles[{i}].{n}");
        match (&p.csv, &p.positions, &p.values) {
            (Some(c), None, None) => self.csv_points(c, p.columns.as_ref(), &f("csv")),
            (None, Some(ps), Some(vs)) => Some((
                ps.value.iter().map(|&x| (x, Some(line_of(ps)))).collect(),
                vs.value.iter().map(|&x| (x, Some(line_of(vs)))).collect(),
                file.to_string(),
                (None, None),
                Vec::new(),
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

    fn csv_points(
        &mut self,
        c: &Spanned<String>,
        columns: Option<&RawColumns>,
        field: &str,
    ) -> Option<PointsFrom> {
        let (shown, path) = match confined(self.base.as_deref(), &c.value) {
            Ok(p) => p,
            Err(message) => {
                self.push(field, Some(line_of(c)), message);
                return None;
            }
        };
        let cols = match columns {
            Some(m) => Columns {
                position: &m.position,
                value: &m.value,
            },
            None => Columns::default(),
        };
        match read_profile(&path, &shown.display().to_string(), &cols) {
            Ok(read) => Some({
                self.warnings.extend(read.notes);
                // a problem in a row is reported at the `csv:` line, the row named in the message
                let at = Some(line_of(c));
                (
                    read.rows.iter().map(|r| (r.0, at)).collect(),
                    read.rows.iter().map(|r| (r.1, at)).collect(),
                    shown.display().to_string(),
                    (read.position_unit, read.value_unit),
                    read.lines,
                )
            }),
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
        units: &Units,
        what: Measure,
        positions: &Points,
        values: &Points,
        width: Option<f64>,
    ) -> Option<(Vec<f64>, Vec<f64>)> {
        let f = |n: &str| format!("profiles[{i}].{n}");
        let (pos_unit, val_unit) = (&units.position, &units.value);
        let mut pos_si = Vec::new();
        let mut val_si = Vec::new();
        let mut ok = true;
        // the row of each problem from `start` on
        let (start, mut rows) = (self.problems.len(), Vec::new());
        for (k, ((x, xl), (v, vl))) in positions.iter().zip(values.iter()).enumerate() {
            let xs = self.num_unit(
                *x,
                pos_unit,
                &f(&format!("positions[{k}]")),
                *xl,
                Kind::Length,
            );
            let vs = self.value_si(*v, *vl, what, val_unit, &f(&format!("values[{k}]")));
            let (Some(x), Some(v)) = (xs, vs) else {
                ok = false;
                rows.resize(self.problems.len() - start, k);
                continue;
            };
            if !self.inside(x, width, &f(&format!("positions[{k}]")), *xl) {
                ok = false;
                rows.resize(self.problems.len() - start, k);
                continue;
            }
            pos_si.push(x);
            val_si.push(v);
        }
        self.name_rows(units, start, &rows);
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

    /// The problems from `start` on came from the rows `rows` (one each): problems with the
    /// same message (a unit wrong for every reading) become one, on the field they share, naming
    /// every row; each names its rows, by CSV line when the profile came from a CSV.
    fn name_rows(&mut self, units: &Units, start: usize, rows: &[usize]) {
        let found: Vec<Problem> = self.problems.drain(start..).collect();
        let mut merged: Vec<(Problem, Vec<usize>)> = Vec::new();
        for (p, &k) in found.into_iter().zip(rows) {
            match merged.iter_mut().find(|(m, _)| m.message == p.message) {
                Some((m, ks)) => {
                    // the field both lie under: `profiles[0].positions[3]` -> `profiles[0].positions`
                    let base = |f: &str| match f.strip_suffix(']').and_then(|g| g.rfind('[')) {
                        Some(i) => f[..i].to_string(),
                        None => f.to_string(),
                    };
                    if m.field != p.field && base(&m.field) == base(&p.field) {
                        m.field = base(&m.field);
                    }
                    ks.push(k);
                }
                None => merged.push((p, vec![k])),
            }
        }
        for (mut p, ks) in merged {
            let at: Vec<String> = match &units.csv {
                Some((_, lines)) => ks
                    .iter()
                    .map(|k| lines.get(*k).copied().unwrap_or(0).to_string())
                    .collect(),
                None => ks.iter().map(|k| k.to_string()).collect(),
            };
            // a long run of rows is named by its first few and its last
            let list = match at.as_slice() {
                [first @ .., last] if at.len() > 6 => {
                    format!(
                        "{}, ... {last} ({} in all)",
                        first[..3].join(", "),
                        at.len()
                    )
                }
                _ => at.join(", "),
            };
            let lines = if ks.len() == 1 { "line" } else { "lines" };
            let suffix = match &units.csv {
                Some((csv, _)) => format!(" (CSV file {csv}, {lines} {list})"),
                None if ks.len() > 1 => format!(" (readings {list}, counted from 0)"),
                None => String::new(),
            };
            p.message.push_str(&suffix);
            self.problems.push(p);
        }
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
        let kind = match what {
            Measure::Hardness => return self.hardness_reading(v, line, field),
            Measure::Diameter | Measure::Caliper => Kind::Length,
            Measure::Moisture => Kind::Moisture,
            Measure::Tension if unit.trim() == "%" => {
                // percent of the profile's mean, kept as a fraction: `lanes` reads only the
                // profile's shape (each value over the mean), so N/m and % read alike
                let v = self.check_percent(v, field, line, Range::NonNegative)?;
                return Some(v / 100.0);
            }
            Measure::Tension => Kind::LineForce,
        };
        let v = self.num_unit(v, unit, field, line, kind)?;
        let range = match what {
            Measure::Tension => Range::NonNegative,
            // the range of material.moisture
            Measure::Moisture => Range::Between(0.0, super::material::MOISTURE_MAX_PCT),
            _ => Range::Positive,
        };
        self.check_range(v, field, line, kind, range)
    }

    /// A hardness reading: finite, and inside the scale's range when its name gives one.
    fn hardness_reading(&mut self, v: f64, line: Option<u64>, field: &str) -> Option<f64> {
        if !v.is_finite() {
            self.push(
                field,
                line,
                "is not a finite number; remove the point or give its reading".into(),
            );
            return None;
        }
        if let Some((scale, lo, hi)) = &self.hardness_range {
            if v < *lo || v > *hi {
                let message = format!(
                    "reading {} is outside the hardness scale '{scale}' ({} .. {}). Fix: correct the reading, or name the scale the gauge reads in hardness.scale",
                    crate::units::sig(v, 4),
                    crate::units::sig(*lo, 4),
                    crate::units::sig(*hi, 4)
                );
                self.push(field, line, message);
                return None;
            }
        }
        Some(v)
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

/// Two profiles measured less than this apart are at the same age, s (a minute: ages are
/// written in days or hours).
const SAME_AGE_S: f64 = 60.0;

/// A profile's `what` as written in the case.
fn what_word(what: Measure) -> &'static str {
    match what {
        Measure::Caliper => "caliper",
        Measure::Diameter => "diameter",
        Measure::Hardness => "hardness",
        Measure::Tension => "tension",
        Measure::Moisture => "moisture",
    }
}

/// Whether two unit words name one unit of `kind`: the same word whatever its case, or two words
/// for one factor ("um" and "µm"); a `kind` of `None` compares the words only.
fn same_unit(a: &str, b: &str, kind: Option<Kind>) -> bool {
    let factor = |u: &str, k| crate::units::parse(&format!("1 {u}"), k).ok();
    a.trim().eq_ignore_ascii_case(b.trim())
        || kind.is_some_and(|k| match (factor(a, k), factor(b, k)) {
            (Some(x), Some(y)) => (x - y).abs() <= 1e-12 * x.abs().max(y.abs()),
            _ => false,
        })
}

/// What a profile's missing `unit` should say.
fn unit_hint(what: Measure) -> &'static str {
    match what {
        Measure::Hardness | Measure::Caliper | Measure::Diameter => {
            "caliper and diameter values need a unit, e.g. `unit: um` or `unit: mm` (or in the CSV header, `value (um)`)"
        }
        Measure::Tension => {
            "tension values need a unit: a line force (`unit: N/m`, `pli`, `kN/m`) or `unit: \"%\"` for percent of the profile's mean"
        }
        Measure::Moisture => "moisture values need a unit: `unit: \"%\"` (the basis of material.moisture)",
    }
}

/// Band a caliper profile's mean must lie in, as a multiple of the material caliper (common
/// practice: a real caliper profile varies by a few per cent, never by a factor of two).
pub(in crate::case) const CALIPER_BAND: (f64, f64) = (0.5, 2.0);
/// Band a diameter profile's mean must lie in, as a multiple of the stated roll diameter.
pub(in crate::case) const DIAMETER_BAND: (f64, f64) = (0.8, 1.25);

impl Validator {
    /// A caliper or diameter profile whose mean is far from the material caliper or the roll
    /// diameter was most likely written in another unit than the one it is labelled with.
    pub(super) fn profile_scale(
        &mut self,
        raw: &[RawProfile],
        profiles: &[Profile],
        caliper_m: f64,
        diameter_m: f64,
    ) {
        for (i, (r, p)) in raw.iter().zip(profiles).enumerate() {
            let (nominal, band, name, fine) = match p.what {
                Measure::Caliper => (caliper_m, CALIPER_BAND, "material.caliper", true),
                Measure::Diameter => (diameter_m, DIAMETER_BAND, "roll.diameter", false),
                Measure::Hardness | Measure::Tension | Measure::Moisture => continue,
            };
            let mean = p.values.iter().sum::<f64>() / p.values.len().max(1) as f64;
            let ratio = mean / nominal;
            if (band.0..=band.1).contains(&ratio) {
                continue;
            }
            let show = |v| crate::units::show(v, Kind::Length, crate::units::System::Si, fine);
            let hint = r
                .unit
                .as_deref()
                .and_then(|labelled| likely_unit(mean, labelled, nominal, band))
                .map(|u| {
                    format!(
                        "; the values look like {u} labelled {}: fix `unit`",
                        r.unit.as_deref().unwrap_or("")
                    )
                })
                .unwrap_or_else(|| "; check the profile's unit and the nominal value".into());
            self.push(
                &format!("profiles[{i}].unit"),
                Some(line_of(&r.what)),
                format!(
                    "the mean of this profile is {} = {ratio:.2} x {name} ({}), outside x{}..x{}{hint}",
                    show(mean),
                    show(nominal),
                    band.0,
                    band.1
                ),
            );
        }
    }
}

/// The length unit the numbers were probably written in: the one that brings the mean into the
/// band, when the unit they are labelled with does not.
fn likely_unit(
    mean_si: f64,
    labelled: &str,
    nominal: f64,
    band: (f64, f64),
) -> Option<&'static str> {
    let factor = |u: &str| crate::units::parse(&format!("1 {u}"), Kind::Length).ok();
    let written = mean_si / factor(labelled)?;
    ["um", "mil", "mm", "cm", "in", "m"]
        .into_iter()
        .filter(|u| !u.eq_ignore_ascii_case(labelled))
        .find(|u| factor(u).is_some_and(|f| (band.0..=band.1).contains(&(written * f / nominal))))
}
