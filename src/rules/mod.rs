//! Rule tables: from features of the predicted roll to defects, mechanisms and corrections.
//!
//! A table is YAML in our own format (see `rules/default.yaml`): each rule names a defect from the
//! trade's vocabulary, conditions on features (`above` / `below` a threshold, each with its
//! source), a likelihood, the mechanism in one line, and corrections, each a model change the
//! diagnosis can re-run (`action`) with the words for the report and why.
//!
//! **Invariant:** knows features only by name (checked against
//! [`crate::diagnose::features::FEATURES`]); does not compute them.

use crate::diagnose::features::FEATURES;
use serde::{Deserialize, Serialize};
use serde_saphyr::Spanned;
use std::fmt;
use std::path::Path;

/// The default rule table shipped with rollsleuth.
pub const DEFAULT_RULES: &str = include_str!("../../rules/default.yaml");
/// Name under which the default table is reported.
pub const DEFAULT_NAME: &str = "<default: rules/default.yaml>";

/// Model changes a correction may ask for (see [`crate::diagnose::actions`]).
pub const ACTIONS: &[&str] = &[
    "flatten_caliper",
    "scale_tension",
    "taper_tension",
    "scale_nip",
    "film_wrap",
    "store_at_equilibrium",
    "keep_wrapped_until_use",
    "shorten_storage",
    "slit_out",
];

/// Likelihood words and their weight for ranking.
pub const LIKELIHOODS: &[(&str, f64)] = &[("high", 0.8), ("medium", 0.5), ("low", 0.25)];

/// A rule table file.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawTable {
    pub format: Spanned<u32>,
    #[serde(default)]
    pub title: Option<String>,
    pub rules: Vec<RawRule>,
}

/// A rule as written.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawRule {
    pub id: Spanned<String>,
    pub defect: Spanned<String>,
    pub when: Vec<RawCondition>,
    pub likelihood: Spanned<String>,
    pub mechanism: String,
    #[serde(default)]
    pub corrections: Vec<RawCorrection>,
}

/// A condition as written.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawCondition {
    pub feature: Spanned<String>,
    #[serde(default)]
    pub above: Option<f64>,
    #[serde(default)]
    pub below: Option<f64>,
    #[serde(default)]
    pub source: Option<String>,
}

/// A correction as written.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawCorrection {
    pub action: Spanned<String>,
    #[serde(default)]
    pub factor: Option<f64>,
    pub text: String,
    pub why: String,
}

/// A validated condition: feature in (above, below).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Condition {
    pub feature: String,
    pub above: Option<f64>,
    pub below: Option<f64>,
    pub source: String,
}

impl Condition {
    /// Whether a value satisfies the condition.
    pub fn holds(&self, v: f64) -> bool {
        self.above.is_none_or(|a| v > a) && self.below.is_none_or(|b| v < b)
    }
    fn interval(&self) -> (f64, f64) {
        (
            self.above.unwrap_or(f64::NEG_INFINITY),
            self.below.unwrap_or(f64::INFINITY),
        )
    }
}

/// A validated correction.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Correction {
    pub action: String,
    pub factor: Option<f64>,
    pub text: String,
    pub why: String,
}

/// A validated rule.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Rule {
    pub id: String,
    pub defect: String,
    pub when: Vec<Condition>,
    pub likelihood: String,
    pub weight: f64,
    pub mechanism: String,
    pub corrections: Vec<Correction>,
}

/// A validated table.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Table {
    pub source: String,
    pub rules: Vec<Rule>,
}

/// One problem found in a table.
#[derive(Debug, Clone, PartialEq)]
pub struct Lint {
    pub line: Option<u64>,
    pub rule: String,
    pub message: String,
}

/// Why a table cannot be used.
#[derive(Debug, Clone, PartialEq)]
pub enum RulesError {
    Read { file: String, message: String },
    Syntax { file: String, message: String },
    Invalid { file: String, problems: Vec<Lint> },
}

impl fmt::Display for RulesError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            RulesError::Read { file, message } => {
                write!(
                    f,
                    "{file}: cannot read the rule table: {message}. Fix: check the path."
                )
            }
            RulesError::Syntax { file, message } => {
                let m = message.trim_end();
                write!(f, "{file}: {}", m.strip_prefix("error: ").unwrap_or(m))
            }
            RulesError::Invalid { file, problems } => {
                let n = problems.len();
                write!(
                    f,
                    "{file}: {n} problem{} in the rule table",
                    if n == 1 { "" } else { "s" }
                )?;
                for p in problems {
                    match p.line {
                        Some(l) => write!(f, "\n  {file}:{l}: rule '{}': {}", p.rule, p.message)?,
                        None => write!(f, "\n  {file}: rule '{}': {}", p.rule, p.message)?,
                    }
                }
                Ok(())
            }
        }
    }
}

impl std::error::Error for RulesError {}

/// Load the default table.
pub fn load_default() -> Result<Table, RulesError> {
    parse(DEFAULT_RULES, DEFAULT_NAME)
}

/// Load a table from a file.
pub fn load_file(path: &Path) -> Result<Table, RulesError> {
    let file = path.display().to_string();
    let text = std::fs::read_to_string(path).map_err(|e| RulesError::Read {
        file: file.clone(),
        message: e.to_string(),
    })?;
    parse(&text, &file)
}

/// Parse and lint a table; any lint problem is an error.
pub fn parse(text: &str, file: &str) -> Result<Table, RulesError> {
    let raw: RawTable = serde_saphyr::from_str(text).map_err(|e| RulesError::Syntax {
        file: file.to_string(),
        message: e.to_string(),
    })?;
    let (table, problems) = lint(&raw, file);
    if problems.is_empty() {
        Ok(table)
    } else {
        Err(RulesError::Invalid {
            file: file.to_string(),
            problems,
        })
    }
}

/// Check a table: format, unknown defects, features, actions and likelihoods, missing sources,
/// empty or impossible conditions (unreachable rules), overlapping rules for the same defect,
/// duplicate ids.
pub fn lint(raw: &RawTable, file: &str) -> (Table, Vec<Lint>) {
    let mut problems = Vec::new();
    let mut push = |line: u64, rule: &str, message: String| {
        problems.push(Lint {
            line: (line > 0).then_some(line),
            rule: rule.to_string(),
            message,
        })
    };
    if raw.format.value != 1 {
        push(
            raw.format.referenced.line(),
            "-",
            format!(
                "format {} is not supported; write `format: 1`",
                raw.format.value
            ),
        );
    }
    let mut rules = Vec::new();
    let mut seen = std::collections::BTreeSet::new();
    for r in &raw.rules {
        let id = r.id.value.clone();
        let line = r.id.referenced.line();
        if !seen.insert(id.clone()) {
            push(
                line,
                &id,
                "duplicate rule id; give each rule its own id".into(),
            );
        }
        if !crate::defects::WORDS.contains(&r.defect.value.as_str()) {
            push(
                r.defect.referenced.line(),
                &id,
                format!(
                    "unknown defect '{}'; use one of: {}",
                    r.defect.value,
                    crate::defects::WORDS.join(", ")
                ),
            );
        }
        let weight = LIKELIHOODS
            .iter()
            .find(|(w, _)| *w == r.likelihood.value)
            .map(|x| x.1);
        if weight.is_none() {
            push(
                r.likelihood.referenced.line(),
                &id,
                format!(
                    "likelihood '{}' must be high, medium or low",
                    r.likelihood.value
                ),
            );
        }
        if r.when.is_empty() {
            push(
                line,
                &id,
                "a rule needs at least one condition under `when`".into(),
            );
        }
        if r.mechanism.trim().is_empty() {
            push(line, &id, "give the mechanism in one line".into());
        }
        let mut conds = Vec::new();
        for c in &r.when {
            let fl = c.feature.referenced.line();
            let spec = FEATURES.iter().find(|f| f.name == c.feature.value);
            match spec {
                None => push(
                    fl,
                    &id,
                    format!(
                        "unknown feature '{}'; known features: {}",
                        c.feature.value,
                        FEATURES
                            .iter()
                            .map(|f| f.name)
                            .collect::<Vec<_>>()
                            .join(", ")
                    ),
                ),
                Some(spec) => {
                    if c.above.is_none() && c.below.is_none() {
                        push(
                            fl,
                            &id,
                            format!("condition on '{}' needs `above` or `below`", spec.name),
                        );
                    }
                    let (lo, hi) = (
                        c.above.unwrap_or(f64::NEG_INFINITY),
                        c.below.unwrap_or(f64::INFINITY),
                    );
                    if lo >= hi {
                        push(fl, &id, format!("'{}' must be above {lo} and below {hi}: no value can do both, so the rule is unreachable", spec.name));
                    } else if lo >= spec.max || hi <= spec.min {
                        push(fl, &id, format!("'{}' ranges over {} .. {}; this condition can never hold, so the rule is unreachable", spec.name, spec.min, spec.max));
                    }
                }
            }
            match &c.source {
                Some(s) if !s.trim().is_empty() => {}
                _ => push(fl, &id, format!("the threshold on '{}' has no source; name one, or write \"common practice\" or \"from memory\"", c.feature.value)),
            }
            conds.push(Condition {
                feature: c.feature.value.clone(),
                above: c.above,
                below: c.below,
                source: c.source.clone().unwrap_or_default(),
            });
        }
        let mut corr = Vec::new();
        for c in &r.corrections {
            if !ACTIONS.contains(&c.action.value.as_str()) {
                push(
                    c.action.referenced.line(),
                    &id,
                    format!(
                        "unknown action '{}'; use one of: {}",
                        c.action.value,
                        ACTIONS.join(", ")
                    ),
                );
            }
            let needs_factor = matches!(
                c.action.value.as_str(),
                "scale_tension" | "taper_tension" | "scale_nip" | "shorten_storage"
            );
            match (needs_factor, c.factor) {
                (true, None) => push(
                    c.action.referenced.line(),
                    &id,
                    format!("action '{}' needs a `factor` (e.g. 0.85)", c.action.value),
                ),
                (true, Some(f)) if !(f > 0.0 && f < 10.0) => push(
                    c.action.referenced.line(),
                    &id,
                    format!("factor {f} must be between 0 and 10"),
                ),
                _ => {}
            }
            corr.push(Correction {
                action: c.action.value.clone(),
                factor: c.factor,
                text: c.text.clone(),
                why: c.why.clone(),
            });
        }
        rules.push(Rule {
            id,
            defect: r.defect.value.clone(),
            when: conds,
            likelihood: r.likelihood.value.clone(),
            weight: weight.unwrap_or(0.0),
            mechanism: r.mechanism.clone(),
            corrections: corr,
        });
    }
    // overlapping rules: same defect and every shared feature's intervals intersect
    for (i, a) in rules.iter().enumerate() {
        for b in rules.iter().skip(i + 1) {
            if a.defect != b.defect {
                continue;
            }
            let separated = a.when.iter().any(|ca| {
                b.when.iter().any(|cb| {
                    ca.feature == cb.feature && {
                        let (l1, h1) = ca.interval();
                        let (l2, h2) = cb.interval();
                        l1.max(l2) >= h1.min(h2)
                    }
                })
            });
            if !separated {
                let line = raw
                    .rules
                    .iter()
                    .find(|r| r.id.value == b.id)
                    .map(|r| r.id.referenced.line())
                    .unwrap_or(0);
                push(line, &b.id, format!("overlaps rule '{}' (same defect, conditions can hold together); make a shared feature's ranges exclusive or merge them", a.id));
            }
        }
    }
    (
        Table {
            source: file.to_string(),
            rules,
        },
        problems,
    )
}

/// A rule that fired, with the feature values that fired it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Fired<'t> {
    pub rule: &'t Rule,
    pub evidence: Vec<(String, f64)>,
}

/// Rules whose every condition holds for `value_of`, ranked by likelihood then table order.
pub fn evaluate<'t>(table: &'t Table, value_of: &dyn Fn(&str) -> Option<f64>) -> Vec<Fired<'t>> {
    let mut out: Vec<Fired> = table
        .rules
        .iter()
        .filter_map(|r| {
            let mut ev = Vec::new();
            for c in &r.when {
                let v = value_of(&c.feature)?;
                if !c.holds(v) {
                    return None;
                }
                ev.push((c.feature.clone(), v));
            }
            Some(Fired {
                rule: r,
                evidence: ev,
            })
        })
        .collect();
    out.sort_by(|a, b| b.rule.weight.total_cmp(&a.rule.weight));
    out
}
