//! `check` and `template` output for one or more cases (each case's own view is in `case_view`).

use super::case_view::{check_json, check_text, TEMPLATE};
use crate::case::Case;
use crate::units::System;
use serde_json::{json, Value};

/// Every checked case, normalised, each followed by its `ok` line.
pub fn cases_text(cases: &[Case], sys: System) -> String {
    let mut s = String::new();
    for c in cases {
        s.push_str(&check_text(c, sys));
        s.push_str(&format!("{}: ok\n\n", c.source));
    }
    s
}

/// Every checked case as JSON.
pub fn cases_json(cases: &[Case]) -> Result<Value, serde_json::Error> {
    let v = cases
        .iter()
        .map(check_json)
        .collect::<Result<Vec<Value>, _>>()?;
    Ok(json!({ "cases": v }))
}

/// The starter case file inside JSON.
pub fn template_json() -> Value {
    json!({ "template_yaml": TEMPLATE })
}
