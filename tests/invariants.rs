//! The stated invariants of ARCHITECTURE.md and DEVELOPERS.md that can be checked by reading the
//! source text of `src/`. Each failure names the file, the line and the invariant.
//!
//! The scanner is deliberately simple (no parser dependency):
//! - Comments (`//`, nested `/* */`), string literals (plain, byte, raw `r#"..."#`) and char
//!   literals are blanked out before any check, keeping line numbers; so a number or a macro name
//!   in a doc comment or a message does not count.
//! - `#[cfg(test)]` is recognised only directly before `mod NAME {`; such modules are skipped by
//!   the function-length, module-graph and I/O checks (the unit-literal and `case` checks read
//!   them too). A `#[cfg(test)]` on a single function is not recognised.
//! - A function is the `fn NAME` keyword up to the first `{` (or `;` for a body-less trait
//!   method) outside parentheses and brackets, and its matching `}`; a brace inside a signature
//!   (a const-generic block) would confuse it.
//!   Its length counts lines from the `fn` line to the closing brace, nested items included.
//! - Module dependencies come from `crate::X` paths (in `use` or inline, including
//!   `use crate::{X, Y::..}` groups) and from `super::X` in a top-level module file (or
//!   `super::super::X` one directory down). `super::` inside an inline module is read as if it
//!   were at file level, which is right for the usual `mod tests { use super::*; }`.
//! - Unit literals are recognised by their significant digits, so `25.4e-6`, `0.0254` and `2.54`
//!   are all the inch; the list is below (factors from NIST SP 811, 2008, Appendix B).

use std::collections::{BTreeMap, BTreeSet};
use std::path::{Path, PathBuf};

/// Largest source file in `src/`, lines (ARCHITECTURE.md; issue 10: "about 600").
const MAX_FILE_LINES: usize = 600;
/// Largest function in `src/` outside tests, lines (issue 10: "about 80").
const MAX_FN_LINES: usize = 80;

struct Source {
    /// Path relative to the crate root, with forward slashes.
    path: String,
    /// The text as written.
    raw: String,
    /// The text with comments and literals blanked (same byte length, same newlines).
    code: String,
    /// Byte ranges of `#[cfg(test)] mod NAME { ... }` bodies.
    test_spans: Vec<(usize, usize)>,
}

impl Source {
    fn line_of(&self, byte: usize) -> usize {
        self.raw[..byte].bytes().filter(|&b| b == b'\n').count() + 1
    }
    fn in_tests(&self, byte: usize) -> bool {
        self.test_spans.iter().any(|&(a, b)| a <= byte && byte < b)
    }
    /// Top-level module this file belongs to (`winding` for src/winding/hakiel.rs).
    fn module(&self) -> String {
        let rest = self.path.trim_start_matches("src/");
        let first = rest.split('/').next().unwrap_or(rest);
        first.trim_end_matches(".rs").to_string()
    }
    /// Directory depth below the top-level module: 0 for src/X.rs and src/X/mod.rs.
    fn depth(&self) -> usize {
        let rest = self.path.trim_start_matches("src/");
        let parts: Vec<&str> = rest.split('/').collect();
        match parts.last() {
            Some(&"mod.rs") => parts.len() - 2,
            _ => parts.len() - 1,
        }
    }
}

fn rust_files(dir: &Path, out: &mut Vec<PathBuf>) {
    let mut entries: Vec<PathBuf> = std::fs::read_dir(dir)
        .unwrap_or_else(|e| panic!("cannot read {}: {e}", dir.display()))
        .map(|e| e.unwrap().path())
        .collect();
    entries.sort();
    for p in entries {
        if p.is_dir() {
            rust_files(&p, out);
        } else if p.extension().is_some_and(|x| x == "rs") {
            out.push(p);
        }
    }
}

fn sources() -> Vec<Source> {
    let mut files = Vec::new();
    rust_files(Path::new("src"), &mut files);
    assert!(files.len() > 10, "expected the crate's src/ directory");
    files
        .into_iter()
        .map(|p| {
            let raw = std::fs::read_to_string(&p).unwrap();
            let code = blank(&raw);
            let test_spans = test_modules(&code);
            Source {
                path: p.to_string_lossy().replace('\\', "/"),
                raw,
                code,
                test_spans,
            }
        })
        .collect()
}

/// Replace comments, string literals and char literals by spaces, keeping newlines.
fn blank(src: &str) -> String {
    let b = src.as_bytes();
    let mut out = b.to_vec();
    let n = b.len();
    let mut i = 0;
    let wipe = |out: &mut Vec<u8>, from: usize, to: usize| {
        for c in out[from..to].iter_mut() {
            if *c != b'\n' {
                *c = b' ';
            }
        }
    };
    let ident = |c: u8| c.is_ascii_alphanumeric() || c == b'_';
    while i < n {
        let c = b[i];
        if c == b'/' && i + 1 < n && b[i + 1] == b'/' {
            let end = b[i..].iter().position(|&x| x == b'\n').map_or(n, |k| i + k);
            wipe(&mut out, i, end);
            i = end;
        } else if c == b'/' && i + 1 < n && b[i + 1] == b'*' {
            let (mut depth, mut j) = (1, i + 2);
            while j < n && depth > 0 {
                if b[j] == b'/' && j + 1 < n && b[j + 1] == b'*' {
                    depth += 1;
                    j += 2;
                } else if b[j] == b'*' && j + 1 < n && b[j + 1] == b'/' {
                    depth -= 1;
                    j += 2;
                } else {
                    j += 1;
                }
            }
            wipe(&mut out, i, j);
            i = j;
        } else if (c == b'r' || (c == b'b' && i + 1 < n && b[i + 1] == b'r'))
            && (i == 0 || !ident(b[i - 1]))
            && {
                let mut j = i + if c == b'b' { 2 } else { 1 };
                while j < n && b[j] == b'#' {
                    j += 1;
                }
                j < n && b[j] == b'"'
            }
        {
            let mut j = i + if c == b'b' { 2 } else { 1 };
            let hashes = b[j..].iter().take_while(|&&x| x == b'#').count();
            j += hashes + 1;
            let close: Vec<u8> = std::iter::once(b'"')
                .chain(std::iter::repeat_n(b'#', hashes))
                .collect();
            let end = (j..n)
                .find(|&k| b[k..].starts_with(&close))
                .map_or(n, |k| k + close.len());
            wipe(&mut out, i, end);
            i = end;
        } else if c == b'"' {
            let mut j = i + 1;
            while j < n && b[j] != b'"' {
                j += if b[j] == b'\\' { 2 } else { 1 };
            }
            let end = (j + 1).min(n);
            wipe(&mut out, i, end);
            i = end;
        } else if c == b'\'' {
            // a char literal ('x', '\n', '\u{..}') or a lifetime ('a)
            if i + 1 < n && b[i + 1] == b'\\' {
                let end = (i + 2..n).find(|&k| b[k] == b'\'').map_or(n, |k| k + 1);
                wipe(&mut out, i, end);
                i = end;
            } else if let Some(k) = (i + 1..n.min(i + 6)).find(|&k| b[k] == b'\'') {
                // a char literal holds one (possibly multi-byte) character
                if std::str::from_utf8(&b[i + 1..k]).is_ok_and(|s| s.chars().count() == 1) {
                    wipe(&mut out, i, k + 1);
                    i = k + 1;
                } else {
                    i += 1;
                }
            } else {
                i += 1;
            }
        } else {
            i += 1;
        }
    }
    String::from_utf8(out).expect("blanking keeps UTF-8: only whole literals are replaced")
}

/// Byte position of the `}` matching the `{` at `open`.
fn matching_brace(code: &str, open: usize) -> usize {
    let b = code.as_bytes();
    let mut depth = 0usize;
    for (k, &c) in b.iter().enumerate().skip(open) {
        match c {
            b'{' => depth += 1,
            b'}' => {
                depth -= 1;
                if depth == 0 {
                    return k;
                }
            }
            _ => {}
        }
    }
    b.len()
}

/// Positions of `word` in `code` as a whole identifier.
fn word_positions(code: &str, word: &str) -> Vec<usize> {
    let b = code.as_bytes();
    let ident = |c: u8| c.is_ascii_alphanumeric() || c == b'_';
    code.match_indices(word)
        .map(|(k, _)| k)
        .filter(|&k| {
            (k == 0 || !ident(b[k - 1])) && (k + word.len() >= b.len() || !ident(b[k + word.len()]))
        })
        .collect()
}

fn test_modules(code: &str) -> Vec<(usize, usize)> {
    let mut spans = Vec::new();
    for (k, _) in code.match_indices("#[cfg(test)]") {
        let rest = code[k + 12..].trim_start();
        let start = code.len() - rest.len();
        let rest = rest.strip_prefix("pub ").unwrap_or(rest).trim_start();
        if let Some(after) = rest.strip_prefix("mod ") {
            if let Some(open) = after.find(['{', ';']) {
                let open = code.len() - after.len() + open;
                if code.as_bytes()[open] == b'{' {
                    spans.push((start, matching_brace(code, open) + 1));
                }
            }
        }
    }
    spans
}

/// Significant digits of a numeric literal: sign, underscores, point, exponent, suffix and
/// leading/trailing zeros removed ("25.4e-6" -> "254", "86_400.0" -> "864").
fn signature(lit: &str) -> String {
    let lit = lit.replace('_', "");
    let mant: String = lit
        .chars()
        .take_while(|c| c.is_ascii_digit() || *c == '.')
        .filter(|c| *c != '.')
        .collect();
    mant.trim_start_matches('0')
        .trim_end_matches('0')
        .to_string()
}

/// Numeric literals in blanked code: (byte position, text).
fn numbers(code: &str) -> Vec<(usize, String)> {
    let b = code.as_bytes();
    let n = b.len();
    let mut out = Vec::new();
    let mut i = 0;
    while i < n {
        let c = b[i];
        let prev_ok = i == 0 || !(b[i - 1].is_ascii_alphanumeric() || b[i - 1] == b'_');
        // `x.0` is a tuple field, not a number
        let tuple = i > 0 && b[i - 1] == b'.';
        if c.is_ascii_digit() && prev_ok && !tuple {
            let start = i;
            while i < n && (b[i].is_ascii_digit() || b[i] == b'_') {
                i += 1;
            }
            if i + 1 < n && b[i] == b'.' && b[i + 1].is_ascii_digit() {
                i += 1;
                while i < n && (b[i].is_ascii_digit() || b[i] == b'_') {
                    i += 1;
                }
            } else if i < n
                && b[i] == b'.'
                && (i + 1 >= n || !(b[i + 1] == b'.' || b[i + 1].is_ascii_alphabetic()))
            {
                i += 1; // `1.` as in `1. * x`
            }
            if i < n && (b[i] == b'e' || b[i] == b'E') {
                let mut j = i + 1;
                if j < n && (b[j] == b'+' || b[j] == b'-') {
                    j += 1;
                }
                if j < n && b[j].is_ascii_digit() {
                    i = j;
                    while i < n && (b[i].is_ascii_digit() || b[i] == b'_') {
                        i += 1;
                    }
                }
            }
            out.push((start, code[start..i].to_string()));
            while i < n && (b[i].is_ascii_alphanumeric() || b[i] == b'_') {
                i += 1; // type suffix (f64, usize) or a hex/binary literal's digits
            }
        } else {
            i += 1;
        }
    }
    out
}

/// Unit factors a physics or view module must take from `units` instead (NIST SP 811, 2008,
/// Appendix B): (significant digits, whether a longer literal starting with them also counts,
/// what it is).
const UNIT_SIGNATURES: &[(&str, bool, &str)] = &[
    ("254", false, "inch/mil (0.0254 m, 25.4e-6 m)"),
    ("3048", false, "foot (0.3048 m)"),
    ("689475", true, "psi (6894.757 Pa)"),
    ("1751268", true, "pli (175.1268 N/m)"),
    ("4448", true, "pound-force (4.448222 N)"),
    ("45359", true, "pound (0.4535924 kg)"),
    ("1601846", true, "lb/ft3 (16.01846 kg/m3)"),
    ("3937", true, "inches per metre (39.37)"),
    ("328084", true, "feet per metre (3.28084)"),
    ("220462", true, "pounds per kilogram (2.20462)"),
    ("145037", true, "psi per kPa (0.145038)"),
    ("145038", true, "psi per kPa (0.145038)"),
    ("864", false, "seconds per day (86400)"),
    ("27315", false, "0 C in kelvin (273.15)"),
    ("45967", false, "0 F in rankine (459.67)"),
];

fn unit_literal_violations(src: &Source) -> Vec<String> {
    let mut v = Vec::new();
    let nums = numbers(&src.code);
    let mut lines_with_32 = BTreeSet::new();
    for (pos, lit) in &nums {
        if signature(lit) == "32" && lit.parse::<f64>().is_ok_and(|x| x == 32.0) {
            lines_with_32.insert(src.line_of(*pos));
        }
    }
    for (pos, lit) in &nums {
        let sig = signature(lit);
        let line = src.line_of(*pos);
        let value: Option<f64> = lit.replace('_', "").parse().ok();
        let mut what = UNIT_SIGNATURES
            .iter()
            .find(|(s, prefix, _)| sig == *s || (*prefix && sig.starts_with(s)))
            .map(|(_, _, w)| w.to_string());
        if what.is_none() && value == Some(3600.0) {
            what = Some("seconds per hour (3600)".into());
        }
        if what.is_none() && sig == "18" && lines_with_32.contains(&line) {
            what = Some("Fahrenheit (1.8 with 32)".into());
        }
        if let Some(w) = what {
            v.push(format!(
                "{}:{line}: literal `{lit}` is a unit factor, {w} [invariant: only src/units.rs knows non-SI units]",
                src.path
            ));
        }
    }
    v
}

/// Every `crate::X` / `super::X` dependency of a file outside its test modules:
/// (top-level module, line).
fn dependencies(src: &Source) -> Vec<(String, usize)> {
    let code = &src.code;
    let ident_at = |k: usize| -> String {
        code[k..]
            .chars()
            .take_while(|c| c.is_ascii_alphanumeric() || *c == '_')
            .collect()
    };
    let mut deps = Vec::new();
    let take = |k: usize, deps: &mut Vec<(String, usize)>| {
        if src.in_tests(k) {
            return;
        }
        let rest = &code[k..];
        let lead = rest.len() - rest.trim_start().len();
        let k = k + lead;
        if code[k..].starts_with('{') {
            // `crate::{a, b::c, d}`: the first identifier of each top-level item
            let close = matching_brace(code, k);
            let inner = &code[k + 1..close];
            let mut depth = 0;
            let mut start = 0;
            for (j, ch) in inner
                .char_indices()
                .chain(std::iter::once((inner.len(), ',')))
            {
                match ch {
                    '{' => depth += 1,
                    '}' => depth -= 1,
                    ',' if depth == 0 => {
                        let item = inner[start..j.min(inner.len())].trim_start();
                        let at =
                            k + 1 + start + (inner[start..j.min(inner.len())].len() - item.len());
                        let name = ident_at(at);
                        if !name.is_empty() && name != "self" {
                            deps.push((name, src.line_of(at)));
                        }
                        start = j + 1;
                    }
                    _ => {}
                }
            }
        } else {
            let name = ident_at(k);
            if !name.is_empty() {
                deps.push((name, src.line_of(k)));
            }
        }
    };
    for k in word_positions(code, "crate") {
        if code[k + 5..].starts_with("::") {
            take(k + 7, &mut deps);
        }
    }
    let root_super = match src.depth() {
        0 => "super::",
        1 => "super::super::",
        _ => "super::super::super::",
    };
    for k in word_positions(code, "super") {
        let prefixed = k >= 7 && code[..k].ends_with("super::");
        if !prefixed && code[k..].starts_with(root_super) {
            let at = k + root_super.len();
            if !code[at..].starts_with("super") {
                take(at, &mut deps);
            }
        }
    }
    deps
}

fn report(name: &str, v: Vec<String>) {
    assert!(
        v.is_empty(),
        "{} violation(s) of {name}:\n{}",
        v.len(),
        v.join("\n")
    );
}

#[test]
fn no_unit_literals_outside_units() {
    let v: Vec<String> = sources()
        .iter()
        .filter(|s| s.path != "src/units.rs")
        .flat_map(unit_literal_violations)
        .collect();
    report("\"only units knows non-SI units\"", v);
}

#[test]
fn no_source_file_over_600_lines() {
    let v: Vec<String> = sources()
        .iter()
        .filter_map(|s| {
            let n = s.raw.lines().count();
            (n > MAX_FILE_LINES).then(|| {
                format!(
                    "{}:{n}: file has {n} lines, more than {MAX_FILE_LINES} [invariant: no source file over {MAX_FILE_LINES} lines]",
                    s.path
                )
            })
        })
        .collect();
    report("the file-size limit", v);
}

/// Functions of a file outside its test modules: (name, first line, last line).
fn functions(src: &Source) -> Vec<(String, usize, usize)> {
    let code = &src.code;
    let mut out = Vec::new();
    for k in word_positions(code, "fn") {
        if src.in_tests(k) {
            continue;
        }
        let after = &code[k + 2..];
        // `fn(` is a function-pointer type, not an item
        if !after.starts_with(char::is_whitespace) {
            continue;
        }
        let name: String = after
            .trim_start()
            .chars()
            .take_while(|c| c.is_ascii_alphanumeric() || *c == '_')
            .collect();
        if name.is_empty() {
            continue;
        }
        // the body's `{`, or `;` for a declaration, outside parentheses and brackets
        // (`fn f(x: [f64; 3]) {`)
        let mut depth = 0i32;
        let Some(open) = after.char_indices().find_map(|(j, ch)| {
            match ch {
                '(' | '[' => depth += 1,
                ')' | ']' => depth -= 1,
                '{' | ';' if depth == 0 => return Some(j),
                _ => {}
            }
            None
        }) else {
            continue;
        };
        let open = k + 2 + open;
        if code.as_bytes()[open] == b';' {
            continue;
        }
        let close = matching_brace(code, open);
        out.push((name, src.line_of(k), src.line_of(close.min(code.len() - 1))));
    }
    out
}

#[test]
fn no_function_over_80_lines_outside_tests() {
    let mut v = Vec::new();
    for s in sources() {
        for (name, first, last) in functions(&s) {
            let n = last - first + 1;
            if n > MAX_FN_LINES {
                v.push(format!(
                    "{}:{first}: fn {name} has {n} lines (to line {last}), more than {MAX_FN_LINES} [invariant: no function over {MAX_FN_LINES} lines outside tests]",
                    s.path
                ));
            }
        }
    }
    report("the function-size limit", v);
}

/// Names in a physics file that reach past the inputs it uses: the whole case (`Case`), the
/// measured profiles (`Profile`, `profiles`, `Measure`) or lab creep curves (`lab_creep`).
/// Parameter types that describe one stage's inputs (`Material`, `Roll`, `Winding`, `Stretch`,
/// `Burgers`, ...) are what a stage is meant to take, so they are allowed.
fn case_violations(s: &Source) -> Vec<String> {
    let mut v = Vec::new();
    // test modules count here too: physics takes only the inputs it uses
    for word in ["Case", "Profile", "profiles", "Measure", "lab_creep"] {
        for k in word_positions(&s.code, word) {
            v.push(format!(
                "{}:{}: names `{word}` [invariant: winding and storage take only the inputs they use (material, roll, winding, storage history), never the whole case or its measurements]",
                s.path,
                s.line_of(k)
            ));
        }
    }
    v.sort();
    v
}

#[test]
fn physics_modules_do_not_depend_on_case() {
    let v: Vec<String> = sources()
        .iter()
        .filter(|s| s.path.starts_with("src/winding/") || s.path.starts_with("src/storage/"))
        .flat_map(case_violations)
        .collect();
    report("\"physics modules take only what they use\"", v);
}

#[test]
fn module_graph_has_no_cycle() {
    let srcs = sources();
    let modules: BTreeSet<String> = srcs
        .iter()
        .map(|s| s.module())
        .filter(|m| m != "lib" && m != "main")
        .collect();
    // edges: from -> to -> first place it is used
    let mut edges: BTreeMap<String, BTreeMap<String, String>> = BTreeMap::new();
    for s in &srcs {
        let from = s.module();
        if !modules.contains(&from) {
            continue;
        }
        for (to, line) in dependencies(s) {
            if to != from && modules.contains(&to) {
                edges
                    .entry(from.clone())
                    .or_default()
                    .entry(to)
                    .or_insert_with(|| format!("{}:{line}", s.path));
            }
        }
    }
    let mut v = Vec::new();
    let mut reported = BTreeSet::new();
    for start in &modules {
        // depth-first search for a path back to `start`
        let mut stack = vec![(start.clone(), vec![start.clone()])];
        let mut seen = BTreeSet::new();
        while let Some((m, path)) = stack.pop() {
            for to in edges
                .get(&m)
                .map(|e| e.keys().cloned().collect::<Vec<_>>())
                .unwrap_or_default()
            {
                if &to == start {
                    let mut cycle = path.clone();
                    let mut key = cycle.clone();
                    key.sort();
                    if reported.insert(key) {
                        cycle.push(start.clone());
                        let hops: Vec<String> = cycle
                            .windows(2)
                            .map(|w| format!("{} -> {} ({})", w[0], w[1], edges[&w[0]][&w[1]]))
                            .collect();
                        v.push(format!(
                            "{}: import cycle {} [invariant: the module graph is acyclic]",
                            edges[&cycle[0]][&cycle[1]],
                            hops.join(", ")
                        ));
                    }
                } else if seen.insert(to.clone()) {
                    let mut p = path.clone();
                    p.push(to.clone());
                    stack.push((to, p));
                }
            }
        }
    }
    report("the acyclic module graph", v);
}

/// Printing and file I/O outside test modules.
fn io_violations(s: &Source) -> Vec<String> {
    let banned = [
        "println!",
        "eprintln!",
        "print!",
        "eprint!",
        "dbg!",
        "std::fs",
        "std::io::stdout",
        "std::io::stderr",
    ];
    let mut v = Vec::new();
    for pat in banned {
        let word = pat.split(['!', ':']).next().unwrap();
        for k in word_positions(&s.code, word) {
            if s.code[k..].starts_with(pat) && !s.in_tests(k) {
                v.push(format!(
                    "{}:{}: `{pat}` [invariant: winding, storage, fit and diagnose do no I/O and no printing]",
                    s.path,
                    s.line_of(k)
                ));
            }
        }
    }
    v
}

#[test]
fn pure_modules_do_no_io() {
    let pure = ["src/winding/", "src/storage/", "src/fit/", "src/diagnose/"];
    let v: Vec<String> = sources()
        .iter()
        .filter(|s| pure.iter().any(|p| s.path.starts_with(p)))
        .flat_map(io_violations)
        .collect();
    report("\"pure functions, no I/O\"", v);
}

// The scanner itself, on small known inputs.

fn source(path: &str, text: &str) -> Source {
    let code = blank(text);
    let test_spans = test_modules(&code);
    Source {
        path: path.into(),
        raw: text.into(),
        code,
        test_spans,
    }
}

#[test]
fn scanner_blanks_comments_and_literals_but_keeps_lines() {
    let text = "let a = 1; // 25.4e-6\n/* 86400 /* nested */ */ let s = \"println!\";\nlet r = r#\"0.0254\"#; let c = '\\''; fn f<'a>(x: &'a str) {}\n";
    let code = blank(text);
    assert_eq!(code.len(), text.len());
    assert_eq!(code.lines().count(), text.lines().count());
    for gone in ["25.4e-6", "86400", "println!", "0.0254", "\\'"] {
        assert!(!code.contains(gone), "{gone} left in {code:?}");
    }
    assert!(code.contains("fn f<'a>(x: &'a str) {}"), "{code:?}");
}

#[test]
fn scanner_finds_unit_literals_by_their_digits() {
    let s = source(
        "src/x.rs",
        "let a = d / 25.4e-6;\nlet b = 0.0254 * x;\nlet t = s / 86_400.0;\nlet f = 1.8 * c + 32.0;\nlet g = h - 1.8 * m;\nlet k = x.0 + 254.5 + 0.25;\n",
    );
    let lines: Vec<String> = unit_literal_violations(&s)
        .iter()
        .map(|m| m.split(": ").next().unwrap().to_string())
        .collect();
    assert_eq!(
        lines,
        ["src/x.rs:1", "src/x.rs:2", "src/x.rs:3", "src/x.rs:4"]
    );
}

#[test]
fn scanner_measures_functions_and_skips_test_modules() {
    let body = "    let x = 1;\n".repeat(3);
    let text = format!(
        "fn short(a: [u8; 2]) {{\n{body}}}\ntype F = fn(u8) -> u8;\ntrait T {{ fn decl(&self); }}\n#[cfg(test)]\nmod tests {{\n    fn inner() {{}}\n}}\n"
    );
    let s = source("src/x.rs", &text);
    assert_eq!(functions(&s), vec![("short".to_string(), 1, 5)]);
}

#[test]
fn scanner_reads_module_dependencies() {
    let s = source(
        "src/report/view.rs",
        "use crate::{case::Case, units::{self, System}};\nuse super::super::lanes::Lanes;\nuse super::SAFETY;\nfn f() { crate::winding::wind(); }\n",
    );
    let deps: Vec<(String, usize)> = dependencies(&s);
    let want: Vec<(String, usize)> = [("case", 1), ("units", 1), ("winding", 4), ("lanes", 2)]
        .iter()
        .map(|(m, l)| (m.to_string(), *l))
        .collect();
    let (mut a, mut b) = (deps.clone(), want);
    a.sort();
    b.sort();
    assert_eq!(a, b);
}

#[test]
fn scanner_finds_case_uses_and_io() {
    let s = source(
        "src/winding/x.rs",
        "use crate::case::Stack;\nuse crate::case::{Case, Material};\nfn k(p: &Profile, c: &Cases) {}\n// Case\nfn f() { println!(\"x\"); let _ = std::fs::read(\"p\"); }\nfn g() { let s = \"println!\"; }\n#[cfg(test)]\nmod tests {\n    fn h() { println!(\"ok in tests\"); }\n}\n",
    );
    let at = |v: Vec<String>| -> Vec<String> {
        v.iter()
            .map(|m| m.split(": ").next().unwrap().to_string())
            .collect()
    };
    assert_eq!(
        at(case_violations(&s)),
        ["src/winding/x.rs:2", "src/winding/x.rs:3"]
    );
    assert_eq!(
        at(io_violations(&s)),
        ["src/winding/x.rs:5", "src/winding/x.rs:5"]
    );
}
