//! The validator's state and its field checks: quantities with units and ranges, defaults and
//! closed-set words.

use super::super::defaults::Def;
use super::super::errors::Problem;
use super::super::model::DefaultUsed;
use super::super::raw::{Word, Q, W};
use crate::units::{self, Kind};
use serde_saphyr::Spanned;
use std::path::{Path, PathBuf};

/// Collects problems, defaults used and warnings while the sections are validated.
pub(in crate::case) struct Validator {
    /// Where problems get their lines.
    lines: LineSource,
    /// Directory that relative CSV paths start from.
    pub(super) base: Option<PathBuf>,
    pub(in crate::case) problems: Vec<Problem>,
    pub(super) defaults: Vec<DefaultUsed>,
    pub(super) warnings: Vec<String>,
    /// The hardness scale's name and range (lo, hi), when its name ends with one
    /// (`rebound 0-100`); readings outside it are refused.
    pub(super) hardness_range: Option<(String, f64, f64)>,
}

/// Where a problem's line comes from.
pub(in crate::case) enum LineSource {
    /// The case was read as written: each value's own location.
    Spans,
    /// The case was edited by `--set` and re-read: lines of the file as written, by field path;
    /// problems under a set path are reported against the `--set` argument.
    Edited {
        /// Field path -> line in the file as written.
        lines: std::collections::BTreeMap<String, u64>,
        /// (field path, whole `--set` argument), in the order given.
        sets: Vec<(String, String)>,
    },
}

/// Line of a located value in the case file (1-based).
pub(super) fn line_of<T>(s: &Spanned<T>) -> u64 {
    s.referenced.line()
}

/// Allowed range of a value.
#[derive(Clone, Copy)]
pub(super) enum Range {
    Any,
    Positive,
    NonNegative,
    /// Closed range [lo, hi].
    Between(f64, f64),
}

impl Range {
    fn bounds(self) -> (f64, f64, &'static str) {
        match self {
            Range::Any => (f64::NEG_INFINITY, f64::INFINITY, "finite"),
            Range::Positive => (0.0, f64::INFINITY, "greater than zero"),
            Range::NonNegative => (0.0, f64::INFINITY, "zero or more"),
            Range::Between(a, b) => (a, b, "within"),
        }
    }
    /// Whether `v` lies in the range (above zero for [`Range::Positive`], bounds included
    /// otherwise).
    fn admits(self, v: f64) -> bool {
        let (lo, hi, _) = self.bounds();
        let below = if matches!(self, Range::Positive) {
            v <= lo
        } else {
            v < lo
        };
        !below && v <= hi
    }
}

/// "value V unit is out of range: it must be WHAT (LO unit .. HI unit)", the unit left out for a
/// bare number and an open end written "no limit"; `values` is (value, low, high) in SI.
fn range_text(
    show: impl Fn(f64) -> String,
    values: (f64, f64, f64),
    what: &str,
    label: &str,
) -> String {
    let with_unit = |x: f64| {
        if !x.is_finite() {
            "no limit".to_string()
        } else if label.is_empty() {
            show(x)
        } else {
            format!("{} {label}", show(x))
        }
    };
    let (v, lo, hi) = values;
    format!(
        "value {} is out of range: it must be {what} ({} .. {})",
        with_unit(v),
        with_unit(lo),
        with_unit(hi)
    )
}

impl Validator {
    pub(in crate::case) fn new(lines: LineSource, base: Option<&Path>) -> Validator {
        Validator {
            lines,
            base: base.map(Path::to_path_buf),
            problems: Vec::new(),
            defaults: Vec::new(),
            warnings: Vec::new(),
            hardness_range: None,
        }
    }

    pub(super) fn push(&mut self, field: &str, line: Option<u64>, message: String) {
        self.push_across(field, &[], line, message);
    }

    /// The last `--set` that wrote `field` (or a field under it), if one did.
    fn set_of(&self, field: &str) -> Option<&String> {
        match &self.lines {
            LineSource::Spans => None,
            LineSource::Edited { sets, .. } => sets
                .iter()
                .rev()
                .find(|(p, _)| super::super::lines::is_under(field, p))
                .map(|(_, arg)| arg),
        }
    }

    /// A problem with `field` that comes from its value against the `others` (a cross-field
    /// check): reported against the `--set` that wrote `field`, else against one that wrote any of
    /// the others (the value that changed), else at `field`'s line.
    pub(super) fn push_across(
        &mut self,
        field: &str,
        others: &[&str],
        line: Option<u64>,
        message: String,
    ) {
        let set = (self.set_of(field))
            .or_else(|| others.iter().find_map(|o| self.set_of(o)))
            .cloned();
        let line = match (&self.lines, &set) {
            (_, Some(_)) => None,
            (LineSource::Spans, None) => line.filter(|&l| l > 0),
            (LineSource::Edited { lines, .. }, None) => super::super::lines::line_for(lines, field),
        };
        self.problems.push(Problem {
            field: field.to_string(),
            line,
            set,
            message,
        });
    }

    /// Record a default used for `field`: its value as written and its source.
    pub(super) fn record(&mut self, field: &str, value: impl Into<String>, source: &str) {
        self.defaults.push(DefaultUsed {
            field: field.to_string(),
            value: value.into(),
            source: source.to_string(),
        });
    }

    /// Parse a quantity; `range` is in SI.
    pub(super) fn q(&mut self, q: &Q, field: &str, kind: Kind, range: Range) -> Option<f64> {
        match units::parse(&q.value.0, kind) {
            Ok(v) => self.check_range(v, field, Some(line_of(q)), kind, range),
            Err(e) => {
                self.push(field, Some(line_of(q)), format!("{e}"));
                None
            }
        }
    }

    pub(super) fn check_range(
        &mut self,
        v: f64,
        field: &str,
        line: Option<u64>,
        kind: Kind,
        range: Range,
    ) -> Option<f64> {
        let d = units::display(kind, units::message_system(), false);
        self.within(
            v,
            (field, line),
            range,
            (|x| units::digits(d.from_si(x), kind), d.label),
        )
    }

    /// A number in per cent (a tension profile's share of its mean), kept as written.
    pub(super) fn check_percent(
        &mut self,
        v: f64,
        field: &str,
        line: Option<u64>,
        range: Range,
    ) -> Option<f64> {
        self.within(v, (field, line), range, (|x| units::sig(x, 4), "%"))
    }

    /// `v` when finite and in `range`, else a problem at `field` and `line`, its numbers shown by
    /// `show` with unit `label`.
    fn within(
        &mut self,
        v: f64,
        (field, line): (&str, Option<u64>),
        range: Range,
        (show, label): (impl Fn(f64) -> String, &str),
    ) -> Option<f64> {
        if !v.is_finite() {
            self.push(
                field,
                line,
                "is not a finite number; give a real value".into(),
            );
            return None;
        }
        if !range.admits(v) {
            let (lo, hi, what) = range.bounds();
            let text = range_text(show, (v, lo, hi), what, label);
            self.push(field, line, text);
            return None;
        }
        Some(v)
    }

    /// A quantity that may be missing: then the default is used and recorded.
    pub(super) fn or_default(
        &mut self,
        q: Option<&Q>,
        field: &str,
        kind: Kind,
        range: Range,
        def: Option<Def>,
    ) -> Option<f64> {
        if let Some(q) = q {
            return self.q(q, field, kind, range);
        }
        let Some(def) = def else {
            self.push(
                field,
                None,
                format!(
                    "is required for grade 'custom' (no default); add e.g. {}",
                    kind.example()
                ),
            );
            return None;
        };
        self.record(field, def.text, def.source);
        match units::parse(def.text, kind) {
            Ok(v) => Some(v),
            Err(e) => {
                self.push(
                    field,
                    None,
                    format!("internal default '{}' is bad: {e}", def.text),
                );
                None
            }
        }
    }

    /// A word of a closed set; an unknown word is reported with the allowed words.
    pub(super) fn word<T: Copy>(&mut self, w: &W<T>, field: &str) -> Option<T> {
        match &w.value {
            Word::Known(v) => Some(*v),
            Word::Unknown { text, allowed } => {
                self.push(
                    field,
                    Some(line_of(w)),
                    format!("'{text}' is not one of: {}", allowed.join(", ")),
                );
                None
            }
        }
    }

    /// A free-text word that must be one of `allowed`.
    pub(super) fn known_word<'a>(
        &mut self,
        s: &'a Spanned<String>,
        field: &str,
        allowed: &[&'a str],
    ) -> Option<&'a str> {
        let v = s.value.as_str();
        if allowed.contains(&v) {
            Some(v)
        } else {
            self.push(
                field,
                Some(line_of(s)),
                format!("'{v}' is not one of: {}", allowed.join(", ")),
            );
            None
        }
    }

    /// A word of a closed set that may be missing: then `default` is used and recorded.
    pub(super) fn word_or<T: Copy>(
        &mut self,
        w: Option<&W<T>>,
        field: &str,
        default: (T, Def),
    ) -> Option<T> {
        match w {
            Some(w) => self.word(w, field),
            None => {
                self.record(field, default.1.text, default.1.source);
                Some(default.0)
            }
        }
    }

    /// A bare number from a list, read in `unit`.
    pub(super) fn num_unit(
        &mut self,
        x: f64,
        unit: &str,
        field: &str,
        line: Option<u64>,
        kind: Kind,
    ) -> Option<f64> {
        if !x.is_finite() {
            self.push(
                field,
                line,
                "is not a finite number; give a real value".into(),
            );
            return None;
        }
        match units::parse(&format!("{x} {unit}"), kind) {
            Ok(v) => Some(v),
            Err(e) => {
                self.push(field, line, format!("{e}"));
                None
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_range_message_has_no_stray_space_and_keeps_its_unit() {
        let plain = range_text(|x| format!("{x:.1}"), (0.7, -0.5, 0.5), "within", "");
        assert_eq!(
            plain,
            "value 0.7 is out of range: it must be within (-0.5 .. 0.5)"
        );
        let pct = range_text(
            |x| format!("{x}"),
            (-50.0, 0.0, f64::INFINITY),
            "zero or more",
            "%",
        );
        assert_eq!(
            pct,
            "value -50 % is out of range: it must be zero or more (0 % .. no limit)"
        );
    }
}
