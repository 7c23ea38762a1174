//! Reading a profile's CSV file before validation. The delimiter is detected from the header
//! line (comma, semicolon or tab; with semicolons a decimal comma is read too). Columns are
//! `position` and `value`, or the names a case maps them to; a header may carry a unit in
//! brackets (`position (mm)`, `value (mil)`). Rows scanned from the back edge first (positions
//! decreasing throughout) are sorted (with a note); rows in any other order, or a position given
//! twice, are an error naming the lines. A CSV path is first confined to the case file's folder
//! ([`confined`]).

use std::path::{Path, PathBuf};

/// A profile CSV as read: rows in increasing position, units from the header, and notes.
#[derive(Debug, Clone, PartialEq, Default)]
pub(super) struct CsvProfile {
    /// (position, value) as written (units applied by validation), increasing in position.
    pub rows: Vec<(f64, f64)>,
    /// The line of the file each row was read from (1-based), in the order of `rows`.
    pub lines: Vec<u64>,
    /// Unit of the positions given in the header, e.g. `position (mm)`.
    pub position_unit: Option<String>,
    /// Unit of the values given in the header, e.g. `value (mil)`.
    pub value_unit: Option<String>,
    /// What was done to the file on reading (sorted rows).
    pub notes: Vec<String>,
}

/// The column names to read (`columns: {position: X, value: Y}` in the case; defaults
/// `position` and `value`).
pub(super) struct Columns<'a> {
    pub position: &'a str,
    pub value: &'a str,
}

impl Default for Columns<'_> {
    fn default() -> Self {
        Columns {
            position: "position",
            value: "value",
        }
    }
}

/// The delimiter of a CSV from its header line: the most frequent of tab, semicolon and comma
/// (comma when none).
fn delimiter(header: &str) -> u8 {
    let n = |c: char| header.matches(c).count();
    [(b'\t', n('\t')), (b';', n(';')), (b',', n(','))]
        .into_iter()
        .filter(|(_, k)| *k > 0)
        .max_by_key(|(_, k)| *k)
        .map(|(d, _)| d)
        .unwrap_or(b',')
}

/// A header cell split into name and unit: "Position (mm)" gives ("position", Some("mm")).
fn name_unit(cell: &str) -> (String, Option<String>) {
    let cell = cell.trim();
    match (cell.find(['(', '[']), cell.rfind([')', ']'])) {
        (Some(a), Some(b)) if b > a => {
            let unit = cell[a + 1..b].trim();
            (
                cell[..a].trim().to_lowercase(),
                (!unit.is_empty()).then(|| unit.to_string()),
            )
        }
        _ => (cell.to_lowercase(), None),
    }
}

/// Most characters of a file's own text a message repeats.
const SNIPPET_CHARS: usize = 40;

/// A short, printable excerpt of a file's text for a message: control characters become `?`
/// and the text is cut at [`SNIPPET_CHARS`] characters (marked `...`), so a message never
/// carries more than a glimpse of whatever file was named.
pub(super) fn snippet(text: &str) -> String {
    let mut out: String = text
        .chars()
        .take(SNIPPET_CHARS)
        .map(|c| if c.is_control() { '?' } else { c })
        .collect();
    if text.chars().count() > SNIPPET_CHARS {
        out.push_str("...");
    }
    out
}

/// A csv reader's error in our words, with the line and a fix.
fn csv_error(shown: &str, e: csv::Error) -> String {
    match e.kind() {
        csv::ErrorKind::UnequalLengths {
            pos,
            expected_len,
            len,
        } => format!(
            "{shown}:{}: this row has {len} cell{} where the rows before it have {expected_len}. Fix: give every row the same columns as the header line (a position and a value, with the header's separator)",
            pos.as_ref().map_or(0, |p| p.line()),
            if *len == 1 { "" } else { "s" }
        ),
        csv::ErrorKind::Utf8 { pos, .. } => format!(
            "{shown}:{}: not UTF-8 text. Fix: save the file as UTF-8 (plain CSV)",
            pos.as_ref().map_or(0, |p| p.line())
        ),
        _ => format!("{shown}: {e}. Fix: export the profile again as plain CSV"),
    }
}

/// Rows (position, value, line) put in increasing position: a back-edge scan (decreasing
/// throughout) is reversed, with a note; any other disorder is an error naming the lines.
fn in_order(rows: &mut [(f64, f64, u64)], shown: &str) -> Result<Vec<String>, String> {
    let mut notes = Vec::new();
    if rows.windows(2).any(|w| w[1].0 < w[0].0) {
        // a scan from the back edge runs the other way all along; any other order is a data error
        let rising = rows[1].0 > rows[0].0;
        if let Some(w) = rows
            .windows(2)
            .find(|w| w[1].0 != w[0].0 && (w[1].0 > w[0].0) != rising)
        {
            return Err(format!(
                "{shown}:{}: position {} comes after {} (line {}): the positions neither increase throughout nor decrease throughout (a scan from the back edge). Fix: sort the rows by position",
                w[1].2, w[1].0, w[0].0, w[0].2
            ));
        }
        rows.reverse();
        notes.push(format!(
            "{shown}: positions ran from the back edge to the front edge; the rows were sorted by position"
        ));
    }
    Ok(notes)
}

/// Read a profile CSV (see the module notes) from `path`; `shown` names the file in messages.
pub(super) fn read_profile(path: &Path, shown: &str, cols: &Columns) -> Result<CsvProfile, String> {
    let bytes = crate::input::read_bytes(path).map_err(|e| match e {
        crate::input::InputError::Missing => format!(
            "CSV file '{shown}' does not exist. Fix: check the csv path; it is read from the case file's folder"
        ),
        e => format!("CSV file '{shown}' {e}"),
    })?;
    let text = String::from_utf8(bytes).map_err(|_| {
        format!("CSV file '{shown}' is not UTF-8 text; save it as UTF-8 (plain CSV)")
    })?;
    parse_profile(&text, shown, cols)
}

/// A CSV path from a case file, resolved inside the case file's folder: relative, no `..`, and
/// not leading out of the folder through a symbolic link. Both the file and the folder are
/// resolved to their real paths before anything is opened, and the real path is what is read,
/// so a case file received from elsewhere cannot make rollsleuth read any other file on the
/// machine. Returns the path to show in messages and the path to open.
pub(super) fn confined(base: Option<&Path>, rel: &str) -> Result<(PathBuf, PathBuf), String> {
    use std::path::Component;
    let p = Path::new(rel);
    let fix = "Fix: put the CSV file in the case file's folder (or a folder below it) and give its path from there, e.g. csv: scans/caliper.csv";
    if p.as_os_str().is_empty()
        || p.components()
            .any(|c| !matches!(c, Component::Normal(_) | Component::CurDir))
    {
        return Err(format!(
            "'{rel}' is not a path inside the case file's folder (absolute paths and '..' are refused). {fix}"
        ));
    }
    let base = base.unwrap_or(Path::new("."));
    let joined = base.join(p);
    // a case file named without a folder (`case.yaml`) has the empty path as its parent, which
    // does not resolve: it is the current folder
    let base = Some(base)
        .filter(|b| !b.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    let unresolved = |what: &str, e: std::io::Error| {
        format!(
            "'{rel}': the {what} cannot be resolved to its real path ({e}), so the CSV was not read. Fix: check that the folders on the way are readable, or copy the CSV into the case file's folder"
        )
    };
    let real = match joined.canonicalize() {
        Ok(f) => f,
        // the reader reports a missing file (a dangling link too) with its own fix
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => return Ok((joined.clone(), joined)),
        Err(e) => return Err(unresolved("CSV file", e)),
    };
    let folder = base
        .canonicalize()
        .map_err(|e| unresolved("case file's folder", e))?;
    if !real.starts_with(&folder) {
        return Err(format!(
            "'{rel}' leads out of the case file's folder through a symbolic link, so it was not read. {fix}"
        ));
    }
    Ok((joined, real))
}

/// The rows of a profile CSV given as text with the default column names (`name` stands for the
/// file in messages): the entry point for fuzzing and for tools that hold the text already.
pub fn profile_rows(text: &str, name: &str) -> Result<Vec<(f64, f64)>, String> {
    parse_profile(text, name, &Columns::default()).map(|p| p.rows)
}

/// Parse a profile CSV's text (see the module notes); `shown` names the file in messages.
fn parse_profile(text: &str, shown: &str, cols: &Columns) -> Result<CsvProfile, String> {
    let header_line = text.lines().next().unwrap_or("");
    let delim = delimiter(header_line);
    let decimal_comma = delim == b';';
    let mut rdr = csv::ReaderBuilder::new()
        .delimiter(delim)
        .trim(csv::Trim::All)
        .from_reader(text.as_bytes());
    let headers = rdr.headers().map_err(|e| csv_error(shown, e))?.clone();
    let cells: Vec<(String, Option<String>)> = headers.iter().map(name_unit).collect();
    let col = |name: &str| cells.iter().position(|(n, _)| *n == name.to_lowercase());
    let (Some(pc), Some(vc)) = (col(cols.position), col(cols.value)) else {
        let found: Vec<&str> = headers.iter().collect();
        return Err(format!(
            "{shown}:1: needs columns `{}` and `{}` (found: {}); name the columns in the header line, or map yours with `columns: {{position: NAME, value: NAME}}` in the profile",
            cols.position,
            cols.value,
            snippet(&found.join(", "))
        ));
    };
    let number = |s: &str| {
        let s = if decimal_comma {
            s.replace(',', ".")
        } else {
            s.to_string()
        };
        s.parse::<f64>().ok().filter(|v| v.is_finite())
    };
    let mut rows: Vec<(f64, f64, u64)> = Vec::new();
    for rec in rdr.records() {
        let rec = rec.map_err(|e| csv_error(shown, e))?;
        let lineno = rec.position().map(|p| p.line()).unwrap_or(0);
        if rec.iter().all(|c| c.is_empty()) {
            continue;
        }
        match (rec.get(pc).and_then(number), rec.get(vc).and_then(number)) {
            (Some(p), Some(v)) => rows.push((p, v, lineno)),
            _ => {
                return Err(format!(
                    "{shown}:{lineno}: position and value must be finite numbers{}",
                    if decimal_comma {
                        " (decimal comma or point)"
                    } else {
                        ""
                    }
                ))
            }
        }
    }
    let notes = in_order(&mut rows, shown)?;
    if let Some(w) = rows.windows(2).find(|w| w[1].0 == w[0].0) {
        return Err(format!(
            "{shown}: position {} is given twice (lines {} and {}); keep one reading per position",
            w[0].0,
            w[0].2.min(w[1].2),
            w[0].2.max(w[1].2)
        ));
    }
    Ok(CsvProfile {
        rows: rows.iter().map(|r| (r.0, r.1)).collect(),
        lines: rows.iter().map(|r| r.2).collect(),
        position_unit: cells[pc].1.clone(),
        value_unit: cells[vc].1.clone(),
        notes,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn read(name: &str, text: &str, cols: &Columns) -> Result<CsvProfile, String> {
        let p = std::env::temp_dir().join(format!("rollsleuth-csv-{}-{name}", std::process::id()));
        std::fs::write(&p, text).unwrap();
        let r = read_profile(&p, &p.display().to_string(), cols);
        let _ = std::fs::remove_file(&p);
        r
    }

    #[test]
    fn detects_semicolons_with_decimal_commas_and_tabs() {
        let s = read(
            "semi.csv",
            "position;value\n0;72,5\n100;73,25\n",
            &Columns::default(),
        )
        .unwrap();
        assert_eq!(s.rows, vec![(0.0, 72.5), (100.0, 73.25)]);
        let t = read(
            "tab.csv",
            "position\tvalue\n0\t72.5\n100\t73\n",
            &Columns::default(),
        )
        .unwrap();
        assert_eq!(t.rows, vec![(0.0, 72.5), (100.0, 73.0)]);
    }

    #[test]
    fn maps_columns_and_reads_units_in_the_header() {
        let cols = Columns {
            position: "x",
            value: "Caliper",
        };
        let r = read("map.csv", "X (in),caliper [mil]\n0,3.5\n2,3.6\n", &cols).unwrap();
        assert_eq!(r.rows, vec![(0.0, 3.5), (2.0, 3.6)]);
        assert_eq!(r.position_unit.as_deref(), Some("in"));
        assert_eq!(r.value_unit.as_deref(), Some("mil"));
    }

    #[test]
    fn sorts_back_edge_first_scans_and_rejects_duplicates() {
        let r = read(
            "rev.csv",
            "position,value\n200,1\n100,2\n0,3\n",
            &Columns::default(),
        )
        .unwrap();
        assert_eq!(r.rows, vec![(0.0, 3.0), (100.0, 2.0), (200.0, 1.0)]);
        assert_eq!(r.notes.len(), 1);
        let e = read(
            "dup.csv",
            "position,value\n0,1\n100,2\n100,3\n",
            &Columns::default(),
        )
        .unwrap_err();
        assert!(e.contains("lines 3 and 4"), "{e}");
    }

    #[test]
    fn shuffled_rows_are_an_error_naming_the_lines() {
        let e = read(
            "shuffled.csv",
            "position,value\n50,1\n600,2\n300,3\n900,4\n",
            &Columns::default(),
        )
        .unwrap_err();
        assert!(e.contains("shuffled.csv:4") && e.contains("line 3"), "{e}");
        assert!(e.contains("Fix: sort the rows"), "{e}");
    }

    #[test]
    fn a_row_with_too_many_cells_names_its_line_and_a_fix() {
        let e = read(
            "extra.csv",
            "position,value\n0,1\n100,2,3\n",
            &Columns::default(),
        )
        .unwrap_err();
        assert!(e.contains("extra.csv:3: this row has 3 cells"), "{e}");
        assert!(e.contains("Fix:"), "{e}");
    }

    #[test]
    fn a_missing_csv_says_where_its_path_starts() {
        let e = read_profile(
            Path::new("no/such/file.csv"),
            "file.csv",
            &Columns::default(),
        )
        .unwrap_err();
        assert!(e.contains("case file's folder"), "{e}");
        assert!(!e.contains("current folder"), "{e}");
    }

    #[test]
    fn a_missing_column_names_what_was_found() {
        let e = read("bad.csv", "pos;val\n0;1\n", &Columns::default()).unwrap_err();
        assert!(
            e.contains("found: pos, val") && e.contains("columns:"),
            "{e}"
        );
    }
}
