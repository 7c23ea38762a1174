//! Lint of a rule table: each check is one function that pushes its problems, in the order a
//! reader meets them (table, then each rule's header, conditions and corrections, then pairs of
//! rules).

use super::{
    Condition, Correction, Lint, RawCondition, RawCorrection, RawRule, RawTable, Rule, Table,
};
use crate::vocab::{Action, Defect, Feature, Likelihood, WORDS};
use std::collections::BTreeSet;

/// Problems found so far.
#[derive(Default)]
struct Problems(Vec<Lint>);

impl Problems {
    fn push(&mut self, line: u64, rule: &str, message: String) {
        self.0.push(Lint {
            line: (line > 0).then_some(line),
            rule: rule.to_string(),
            message,
        })
    }
}

/// Check a table: format, unknown defects, features, actions and likelihoods, missing sources,
/// empty or impossible conditions (unreachable rules), overlapping rules for the same defect,
/// duplicate ids. Returns the rules that could be read and every problem.
pub fn lint(raw: &RawTable, file: &str) -> (Table, Vec<Lint>) {
    let mut p = Problems::default();
    check_format(raw, &mut p);
    if raw.rules.is_empty() {
        p.push(
            raw.format.referenced.line(),
            "-",
            "the table has no rules, so no defect could ever be found; add at least one rule under `rules`".into(),
        );
    }
    let mut seen = BTreeSet::new();
    let mut rules = Vec::new();
    for r in &raw.rules {
        check_duplicate_id(r, &mut seen, &mut p);
        let header = check_header(r, &mut p);
        let when: Vec<Condition> = r
            .when
            .iter()
            .filter_map(|c| check_condition(c, &r.id.value, &mut p))
            .collect();
        let corrections: Vec<Correction> = r
            .corrections
            .iter()
            .filter_map(|c| check_correction(c, &r.id.value, &mut p))
            .collect();
        if let Some((defect, likelihood)) = header {
            rules.push(Rule {
                id: r.id.value.clone(),
                defect,
                when,
                likelihood,
                weight: likelihood.weight(),
                mechanism: r.mechanism.clone(),
                corrections,
            });
        }
    }
    check_overlaps(raw, &rules, &mut p);
    let table = Table {
        source: file.to_string(),
        rules,
    };
    (table, p.0)
}

/// The table format this version reads.
fn check_format(raw: &RawTable, p: &mut Problems) {
    if raw.format.value != 1 {
        p.push(
            raw.format.referenced.line(),
            "-",
            format!(
                "format {} is not supported; write `format: 1`",
                raw.format.value
            ),
        );
    }
}

/// Each rule has its own id.
fn check_duplicate_id(r: &RawRule, seen: &mut BTreeSet<String>, p: &mut Problems) {
    if !seen.insert(r.id.value.clone()) {
        p.push(
            r.id.referenced.line(),
            &r.id.value,
            "duplicate rule id; give each rule its own id".into(),
        );
    }
}

/// Defect and likelihood words, at least one condition, a mechanism. Returns the defect and
/// likelihood when both are known words.
fn check_header(r: &RawRule, p: &mut Problems) -> Option<(Defect, Likelihood)> {
    let id = r.id.value.as_str();
    let line = r.id.referenced.line();
    let defect = Defect::from_word(&r.defect.value);
    if defect.is_none() {
        p.push(
            r.defect.referenced.line(),
            id,
            format!(
                "unknown defect '{}';{} use one of: {}",
                r.defect.value,
                did_you_mean(&r.defect.value, WORDS.iter().copied()),
                WORDS.join(", ")
            ),
        );
    }
    let likelihood = Likelihood::from_word(&r.likelihood.value);
    if likelihood.is_none() {
        p.push(
            r.likelihood.referenced.line(),
            id,
            format!(
                "likelihood '{}' must be high, medium or low",
                r.likelihood.value
            ),
        );
    }
    if r.when.is_empty() {
        p.push(
            line,
            id,
            "a rule needs at least one condition under `when`".into(),
        );
    }
    if r.mechanism.trim().is_empty() {
        p.push(line, id, "give the mechanism in one line".into());
    }
    Some((defect?, likelihood?))
}

/// A known feature, a bound, a range that some value can meet, and a source. Returns the
/// condition when its feature is known.
fn check_condition(c: &RawCondition, id: &str, p: &mut Problems) -> Option<Condition> {
    let line = c.feature.referenced.line();
    let feature = Feature::from_word(&c.feature.value);
    match feature {
        None => p.push(
            line,
            id,
            format!(
                "unknown feature '{}';{} known features: {}",
                c.feature.value,
                did_you_mean(&c.feature.value, Feature::ALL.iter().map(|f| f.word())),
                Feature::ALL
                    .iter()
                    .map(|f| f.word())
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
        ),
        Some(f) => check_reachable(c, f, line, id, p),
    }
    match &c.source {
        Some(s) if !s.trim().is_empty() => {}
        _ => p.push(line, id, format!("the threshold on '{}' has no source; name one, or write \"common practice\" or \"from memory\"", c.feature.value)),
    }
    Some(Condition {
        feature: feature?,
        above: c.above,
        below: c.below,
        source: c.source.clone().unwrap_or_default(),
    })
}

/// A condition needs a bound, and some value in the feature's range must meet it.
fn check_reachable(c: &RawCondition, f: Feature, line: u64, id: &str, p: &mut Problems) {
    let (name, spec) = (f.word(), f.spec());
    if c.above.is_none() && c.below.is_none() {
        p.push(
            line,
            id,
            format!("condition on '{name}' needs `above` or `below`"),
        );
    }
    for (word, v) in [("above", c.above), ("below", c.below)] {
        if v.is_some_and(|v| !v.is_finite()) {
            p.push(line, id, format!("`{word}` on '{name}' must be a finite number, not .nan or .inf; leave it out for no bound"));
            return;
        }
    }
    let (lo, hi) = (
        c.above.unwrap_or(f64::NEG_INFINITY),
        c.below.unwrap_or(f64::INFINITY),
    );
    if lo >= hi {
        p.push(line, id, format!("'{name}' must be above {lo} and below {hi}: no value can do both, so the rule is unreachable"));
    } else if lo >= spec.max || hi <= spec.min {
        p.push(line, id, format!("'{name}' ranges over {} .. {}; this condition can never hold, so the rule is unreachable", spec.min, spec.max));
    }
}

/// Plausible range of a correction's `factor` (dimensionless).
pub const FACTOR_RANGE: (f64, f64) = (0.05, 20.0);

/// Percentages stated in a correction's text ("about 15 %", "to 70%").
fn stated_percentages(text: &str) -> Vec<f64> {
    let mut out = Vec::new();
    let b: Vec<char> = text.chars().collect();
    for (i, ch) in b.iter().enumerate() {
        if *ch != '%' {
            continue;
        }
        let mut j = i;
        while j > 0 && b[j - 1] == ' ' {
            j -= 1;
        }
        let end = j;
        while j > 0 && (b[j - 1].is_ascii_digit() || b[j - 1] == '.') {
            j -= 1;
        }
        if let Ok(v) = b[j..end].iter().collect::<String>().parse::<f64>() {
            out.push(v);
        }
    }
    out
}

/// A factor agrees with a stated percentage N when it is N %, or N % less or more (within 2
/// points).
fn factor_matches_text(f: f64, text: &str) -> bool {
    let pcts = stated_percentages(text);
    pcts.is_empty()
        || pcts.iter().any(|n| {
            let x = n / 100.0;
            [x, 1.0 - x, 1.0 + x].iter().any(|t| (f - t).abs() <= 0.02)
        })
}

/// A known action, with a finite factor in [`FACTOR_RANGE`] when it scales something, matching
/// the percentage its text states. Returns the correction when its action is known.
fn check_correction(c: &RawCorrection, id: &str, p: &mut Problems) -> Option<Correction> {
    let line = c.action.referenced.line();
    let action = Action::from_word(&c.action.value);
    if action.is_none() {
        p.push(
            line,
            id,
            format!(
                "unknown action '{}';{} use one of: {}",
                c.action.value,
                did_you_mean(&c.action.value, Action::ALL.iter().map(|a| a.word())),
                Action::ALL
                    .iter()
                    .map(|a| a.word())
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
        );
    }
    match (action.is_some_and(Action::needs_factor), c.factor) {
        (true, None) => p.push(
            line,
            id,
            format!("action '{}' needs a `factor` (e.g. 0.85)", c.action.value),
        ),
        (true, Some(f)) if !(f >= FACTOR_RANGE.0 && f <= FACTOR_RANGE.1) => p.push(
            line,
            id,
            format!(
                "factor {f} must be between {} and {} (e.g. 0.85 for 15 % less)",
                FACTOR_RANGE.0, FACTOR_RANGE.1
            ),
        ),
        (true, Some(f)) if !factor_matches_text(f, &c.text) => p.push(
            line,
            id,
            format!("factor {f} does not match the percentage the text states ('{}'); make them agree (e.g. factor 0.85 for \"about 15 % less\")", c.text),
        ),
        _ => {}
    }
    Some(Correction {
        action: action?,
        factor: c.factor,
        text: c.text.clone(),
        why: c.why.clone(),
    })
}

/// Two rules for the same defect overlap when every shared feature's intervals intersect.
fn check_overlaps(raw: &RawTable, rules: &[Rule], p: &mut Problems) {
    for (i, a) in rules.iter().enumerate() {
        for b in rules.iter().skip(i + 1) {
            if a.defect != b.defect || separated(a, b) {
                continue;
            }
            let line = raw
                .rules
                .iter()
                .find(|r| r.id.value == b.id)
                .map(|r| r.id.referenced.line())
                .unwrap_or(0);
            p.push(line, &b.id, format!("overlaps rule '{}' (same defect, conditions can hold together); make a shared feature's ranges exclusive or merge them", a.id));
        }
    }
}

/// Whether some feature both rules test has disjoint ranges in them.
fn separated(a: &Rule, b: &Rule) -> bool {
    a.when.iter().any(|ca| {
        b.when.iter().any(|cb| {
            ca.feature == cb.feature && {
                let (l1, h1) = ca.interval();
                let (l2, h2) = cb.interval();
                l1.max(l2) >= h1.min(h2)
            }
        })
    })
}

/// " did you mean 'x'?" for the known word nearest to `word` (Levenshtein distance at most a
/// third of its length, at least 2), else nothing.
pub(crate) fn did_you_mean<'a>(word: &str, known: impl Iterator<Item = &'a str>) -> String {
    let limit = (word.chars().count() / 3).max(2);
    known
        .map(|k| (edit_distance(word, k), k))
        .filter(|(d, _)| *d <= limit)
        .min()
        .map(|(_, k)| format!(" did you mean '{k}'?"))
        .unwrap_or_default()
}

/// Levenshtein edit distance (insertions, deletions, substitutions), by characters.
pub(crate) fn edit_distance(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    for (i, ca) in a.chars().enumerate() {
        let mut cur = vec![i + 1; b.len() + 1];
        for (j, &cb) in b.iter().enumerate() {
            let sub = prev[j] + usize::from(ca != cb);
            cur[j + 1] = sub.min(prev[j + 1] + 1).min(cur[j] + 1);
        }
        prev = cur;
    }
    prev[b.len()]
}

#[cfg(test)]
mod suggest_tests {
    use super::*;

    /// Worked examples of Levenshtein (1966) distance: kitten/sitting 3, flaw/lawn 2.
    #[test]
    fn edit_distance_matches_textbook_examples() {
        assert_eq!(edit_distance("kitten", "sitting"), 3);
        assert_eq!(edit_distance("flaw", "lawn"), 2);
        assert_eq!(edit_distance("", "abc"), 3);
    }

    #[test]
    fn suggests_the_nearest_known_word() {
        let s = did_you_mean("lokal_peak_ratio", Feature::ALL.iter().map(|f| f.word()));
        assert_eq!(s, " did you mean 'local_peak_ratio'?");
        assert_eq!(did_you_mean("zzzz", ["baggy_lane"].into_iter()), "");
    }
}
