//! Rule tables: from features of the predicted roll to defects, mechanisms and corrections.
//!
//! A table is YAML in our own format (see `rules/default.yaml`): each rule names a defect from the
//! trade's vocabulary, conditions on features (`above` / `below` a threshold, each with its
//! source), a likelihood, the mechanism in one line, and corrections, each a model change the
//! diagnosis can re-run (`action`) with the words for the report and why. Defects, features,
//! actions and likelihoods are written as their [`crate::vocab`] words and read into those enums
//! by [`lint`], which reports every unknown word with its line.
//!
//! **Invariant:** knows features only through [`crate::vocab::Feature`]; does not compute them
//! (imports `vocab`, never `diagnose`).

mod lint;

pub use lint::lint;

use crate::vocab::{Action, Defect, Feature, FeatureValues, Likelihood};
use serde::{Deserialize, Serialize};
use serde_saphyr::Spanned;
use std::path::Path;

/// The default rule table shipped with rollsleuth.
pub const DEFAULT_RULES: &str = include_str!("../../rules/default.yaml");
/// Name under which the default table is reported.
pub const DEFAULT_NAME: &str = "the built-in default table (print it with: rollsleuth rules show)";

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
    pub feature: Feature,
    pub above: Option<f64>,
    pub below: Option<f64>,
    pub source: String,
}

impl Condition {
    /// Whether a value satisfies the condition.
    pub fn holds(&self, v: f64) -> bool {
        self.above.is_none_or(|a| v > a) && self.below.is_none_or(|b| v < b)
    }

    /// Whether `other` tests the same feature on the same interval (whatever its source).
    pub fn same_test(&self, other: &Condition) -> bool {
        self.feature == other.feature && self.interval() == other.interval()
    }

    /// The open interval (above, below), unbounded sides infinite.
    pub fn interval(&self) -> (f64, f64) {
        (
            self.above.unwrap_or(f64::NEG_INFINITY),
            self.below.unwrap_or(f64::INFINITY),
        )
    }
}

/// A validated correction.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Correction {
    pub action: Action,
    pub factor: Option<f64>,
    pub text: String,
    pub why: String,
}

/// A validated rule.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Rule {
    pub id: String,
    pub defect: Defect,
    pub when: Vec<Condition>,
    pub likelihood: Likelihood,
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

impl Rule {
    /// Whether every condition of the rule holds on feature values `v`.
    pub fn holds(&self, v: &crate::vocab::FeatureValues) -> bool {
        self.when.iter().all(|c| c.holds(v[c.feature]))
    }
}

impl Table {
    /// The rules that find `r`'s defect by the same deciding condition (its first; `r` among
    /// them). They differ only in the mechanism they name (a moisture or a winding share), so a
    /// plausible state split between two mechanisms is still that defect: the defect holds where
    /// any of them does.
    pub fn siblings(&self, r: &Rule) -> Vec<&Rule> {
        let same = |q: &&Rule| match (q.when.first(), r.when.first()) {
            (Some(a), Some(b)) => q.defect == r.defect && a.same_test(b),
            _ => q.id == r.id,
        };
        self.rules.iter().filter(same).collect()
    }
}

/// One problem found in a table.
#[derive(Debug, Clone, PartialEq)]
pub struct Lint {
    pub line: Option<u64>,
    pub rule: String,
    pub message: String,
}

/// Why a table cannot be used.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum RulesError {
    #[error("{file}: the rule table {message}.")]
    Read { file: String, message: String },
    #[error("{file}: {}", syntax_message(.message))]
    Syntax { file: String, message: String },
    #[error("{}", invalid_message(.file, .problems))]
    Invalid { file: String, problems: Vec<Lint> },
}

/// The YAML reader's message without its own `error: ` prefix.
fn syntax_message(message: &str) -> &str {
    let m = message.trim_end();
    m.strip_prefix("error: ").unwrap_or(m)
}

/// Every lint problem, one per line, each with its file and line.
fn invalid_message(file: &str, problems: &[Lint]) -> String {
    let n = problems.len();
    let mut s = format!(
        "{file}: {n} problem{} in the rule table",
        if n == 1 { "" } else { "s" }
    );
    for p in problems {
        match p.line {
            Some(l) => s.push_str(&format!("\n  {file}:{l}: rule '{}': {}", p.rule, p.message)),
            None => s.push_str(&format!("\n  {file}: rule '{}': {}", p.rule, p.message)),
        }
    }
    s
}

/// Load the default table.
pub fn load_default() -> Result<Table, RulesError> {
    parse(DEFAULT_RULES, DEFAULT_NAME)
}

/// Load a table from a file.
pub fn load_file(path: &Path) -> Result<Table, RulesError> {
    let file = path.display().to_string();
    let text = crate::input::read_text(path).map_err(|e| RulesError::Read {
        file: file.clone(),
        message: e.to_string(),
    })?;
    parse(&text, &file)
}

/// Parse and lint a table; any lint problem is an error.
pub fn parse(text: &str, file: &str) -> Result<Table, RulesError> {
    let raw: RawTable = serde_saphyr::from_str(text).map_err(|e| RulesError::Syntax {
        file: file.to_string(),
        message: crate::input::plain_yaml_message(&e.to_string()),
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

/// A rule that fired, with the feature values that fired it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Fired<'t> {
    pub rule: &'t Rule,
    pub evidence: Vec<(Feature, f64)>,
}

/// Rules whose every condition holds for the feature values, ranked by likelihood then table
/// order. A NaN value satisfies no condition.
pub fn evaluate<'t>(table: &'t Table, values: &FeatureValues) -> Vec<Fired<'t>> {
    let mut out: Vec<Fired> = table
        .rules
        .iter()
        .filter(|r| r.holds(values))
        .map(|r| Fired {
            rule: r,
            evidence: r
                .when
                .iter()
                .map(|c| (c.feature, values[c.feature]))
                .collect(),
        })
        .collect();
    out.sort_by(|a, b| b.rule.weight.total_cmp(&a.rule.weight));
    out
}
