//! `rules features`, `rules lint` and `rules show --json` output: the features a rule may test,
//! a table that passed lint, and a table as JSON.

use super::table;
use crate::rules::Table;
use crate::vocab::Feature;
use serde_json::{json, Value};

/// Every feature with its meaning, in [`Feature::ALL`] order.
pub fn features_text() -> String {
    let mut t = table(&["feature", "meaning"]);
    for f in Feature::ALL {
        t.add_row(vec![f.word(), f.spec().meaning]);
    }
    format!("{t}\n")
}

/// Every feature with its meaning, as JSON.
pub fn features_json() -> Value {
    let v: Vec<Value> = Feature::ALL
        .iter()
        .map(|f| json!({"feature": f.word(), "meaning": f.spec().meaning}))
        .collect();
    json!({ "features": v })
}

/// A table that passed lint: its rule count and the defects it covers (alphabetical).
pub fn lint_text(t: &Table) -> String {
    let mut d: Vec<&str> = t.rules.iter().map(|r| r.defect.word()).collect();
    d.sort();
    d.dedup();
    format!(
        "{}: ok, {} rules covering {}\n",
        t.source,
        t.rules.len(),
        d.join(", ")
    )
}

/// A table that passed lint, as JSON.
pub fn lint_json(t: &Table) -> Value {
    json!({ "file": t.source, "ok": true, "rules": t.rules.len() })
}

/// A rule table as JSON: each rule with its id, defect, likelihood, mechanism, conditions and
/// corrections, in table order. A condition's `above` and `below` are in the unit its feature's
/// word carries (`peak_width_mm`: mm); a correction's `factor` multiplies the present setting.
pub fn show_json(t: &Table) -> Value {
    let rules: Vec<Value> = (t.rules.iter())
        .map(|r| {
            json!({
                "id": r.id,
                "defect": r.defect,
                "likelihood": r.likelihood,
                "mechanism": r.mechanism,
                "when": r.when,
                "corrections": r.corrections,
            })
        })
        .collect();
    json!({ "format": 1, "table": t.source, "rules": rules })
}
