//! Reading a profile's CSV file (columns `position` and `value`, header line first) before
//! validation; a bad file gives one message naming the file and, for a bad row, its line.

use std::path::Path;

/// (position, value) rows of a profile CSV, as written (units applied by validation).
pub(super) fn read_profile(path: &Path) -> Result<Vec<(f64, f64)>, String> {
    let shown = path.display().to_string();
    let bytes = crate::input::read_bytes(path).map_err(|e| {
        format!("CSV file '{shown}' {e} (the path is relative to the case file's folder)")
    })?;
    let mut rdr = csv::ReaderBuilder::new()
        .trim(csv::Trim::All)
        .from_reader(bytes.as_slice());
    let headers = rdr.headers().map_err(|e| format!("{shown}: {e}"))?.clone();
    let col = |name: &str| headers.iter().position(|h| h.eq_ignore_ascii_case(name));
    let (Some(pc), Some(vc)) = (col("position"), col("value")) else {
        return Err(format!(
            "{shown}: needs a header line with columns `position` and `value`"
        ));
    };
    let mut rows = Vec::new();
    for (k, rec) in rdr.records().enumerate() {
        let lineno = k as u64 + 2;
        let rec = rec.map_err(|e| format!("{shown}:{lineno}: {e}"))?;
        let get = |i: usize| rec.get(i).and_then(|s| s.parse::<f64>().ok());
        match (get(pc), get(vc)) {
            (Some(p), Some(v)) if p.is_finite() && v.is_finite() => rows.push((p, v)),
            _ => {
                return Err(format!(
                    "{shown}:{lineno}: position and value must be finite numbers"
                ))
            }
        }
    }
    Ok(rows)
}
