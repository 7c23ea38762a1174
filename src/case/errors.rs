//! Why a case could not be loaded: one error type for the whole `case` module.

use thiserror::Error;

/// One thing wrong with a case.
#[derive(Debug, Clone, PartialEq)]
pub struct Problem {
    /// Field path, e.g. `profiles[2].values[7]`.
    pub field: String,
    /// 1-based line in the case file, where known.
    pub line: Option<u64>,
    /// The `--set` argument that wrote the field, when one did.
    pub set: Option<String>,
    /// What is wrong and how to fix it.
    pub message: String,
}

/// Why a case could not be loaded.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum CaseError {
    /// The file could not be read.
    #[error("{file}: the case file {message}.")]
    Read { file: String, message: String },
    /// The YAML is malformed, or a field is missing, misspelt or of the wrong type.
    #[error("{file}: {}", syntax_text(.message))]
    Syntax { file: String, message: String },
    /// Fields parsed but their values are not acceptable.
    #[error("{}", invalid_text(.file, .problems))]
    Invalid {
        file: String,
        problems: Vec<Problem>,
    },
    /// A `--set path=value` argument could not be applied.
    #[error(
        "--set {arg}: {message}. Fix: write --set path=value, e.g. --set winding.tension=\"2.0 pli\"."
    )]
    Set { arg: String, message: String },
}

/// The parser's message without its `error: ` prefix, with a fix for the common cases.
fn syntax_text(message: &str) -> String {
    let plain = crate::input::plain_yaml_message(message);
    let m = plain.trim_end();
    let mut s = m.strip_prefix("error: ").unwrap_or(m).to_string();
    if message.contains("unknown field") {
        s.push_str("\nFix: check the spelling; `rollsleuth template` prints every field.");
    } else if message.contains("missing field") {
        s.push_str("\nFix: add the field; `rollsleuth template` shows an example.");
    } else if message.contains("unexpected end of input") {
        s.push_str("\nFix: the file holds no case, or ends too early; `rollsleuth template` prints a starter case.");
    }
    s
}

/// A count line, then one line per problem with file, line (where known) and field.
fn invalid_text(file: &str, problems: &[Problem]) -> String {
    let n = problems.len();
    let mut s = format!(
        "{file}: {n} problem{} in the case",
        if n == 1 { "" } else { "s" }
    );
    for p in problems {
        match (&p.set, p.line) {
            (Some(arg), _) => s.push_str(&format!("\n  --set {arg}: {}: {}", p.field, p.message)),
            (None, Some(l)) => s.push_str(&format!("\n  {file}:{l}: {}: {}", p.field, p.message)),
            (None, None) => s.push_str(&format!("\n  {file}: {}: {}", p.field, p.message)),
        }
    }
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_variant_names_its_input_and_fix() {
        let read = CaseError::Read {
            file: "a.yaml".into(),
            message: "cannot be opened (No such file). Fix: check the path and its permissions"
                .into(),
        };
        assert_eq!(
            read.to_string(),
            "a.yaml: the case file cannot be opened (No such file). Fix: check the path and its permissions."
        );
        let syn = CaseError::Syntax {
            file: "a.yaml".into(),
            message: "error: unknown field `tenson` at line 3\n".into(),
        };
        assert_eq!(
            syn.to_string(),
            "a.yaml: unknown field `tenson` at line 3\nFix: check the spelling; `rollsleuth template` prints every field."
        );
        let inv = CaseError::Invalid {
            file: "a.yaml".into(),
            problems: vec![
                Problem {
                    field: "roll.width".into(),
                    line: Some(7),
                    set: None,
                    message: "bad".into(),
                },
                Problem {
                    field: "winding.tension".into(),
                    line: None,
                    set: None,
                    message: "missing".into(),
                },
            ],
        };
        assert_eq!(
            inv.to_string(),
            "a.yaml: 2 problems in the case\n  a.yaml:7: roll.width: bad\n  a.yaml: winding.tension: missing"
        );
        let set = CaseError::Set {
            arg: "x".into(),
            message: "no '='".into(),
        };
        assert_eq!(
            set.to_string(),
            "--set x: no '='. Fix: write --set path=value, e.g. --set winding.tension=\"2.0 pli\"."
        );
    }
}
