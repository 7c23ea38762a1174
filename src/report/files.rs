//! Report files: names derived from the case id, a fingerprint of the rule table, the analysis
//! date, and writing a set of files so that a failure leaves the previous set intact.

use std::path::{Path, PathBuf};

/// Longest file stem derived from a case id, in characters.
pub const MAX_STEM: usize = 80;

/// A file stem from a case id: characters outside `[A-Za-z0-9._-]` become `_`, at most
/// [`MAX_STEM`] characters, no leading dot; `report` when nothing usable is left.
pub fn stem(case_id: &str) -> String {
    let s: String = case_id
        .chars()
        .map(|c| {
            if c.is_ascii_alphanumeric() || matches!(c, '.' | '_' | '-') {
                c
            } else {
                '_'
            }
        })
        .take(MAX_STEM)
        .collect();
    let s = s.trim_start_matches('.').to_string();
    if s.chars().all(|c| c == '_' || c == '.') {
        "report".into()
    } else {
        s
    }
}

/// 64-bit FNV-1a hash (Fowler, Noll and Vo; offset basis 0xcbf29ce484222325, prime
/// 0x100000001b3), printed as 16 hex digits: a stable fingerprint of a rule table's text.
pub fn fingerprint(bytes: &[u8]) -> String {
    let mut h: u64 = 0xcbf2_9ce4_8422_2325;
    for b in bytes {
        h ^= u64::from(*b);
        h = h.wrapping_mul(0x0100_0000_01b3);
    }
    format!("{h:016x}")
}

/// A date `YYYY-MM-DD` checked for a real calendar day (proleptic Gregorian).
pub fn parse_date(s: &str) -> Option<String> {
    let b = s.as_bytes();
    if b.len() != 10 || b[4] != b'-' || b[7] != b'-' {
        return None;
    }
    let num = |r: std::ops::Range<usize>| -> Option<u32> {
        let t = &s[r];
        t.bytes()
            .all(|c| c.is_ascii_digit())
            .then(|| t.parse().ok())
            .flatten()
    };
    let (y, m, d) = (num(0..4)?, num(5..7)?, num(8..10)?);
    let leap = (y % 4 == 0 && y % 100 != 0) || y % 400 == 0;
    let days = match m {
        1 | 3 | 5 | 7 | 8 | 10 | 12 => 31,
        4 | 6 | 9 | 11 => 30,
        2 if leap => 29,
        2 => 28,
        _ => return None,
    };
    (1..=days).contains(&d).then(|| s.to_string())
}

/// The civil date of a count of days since 1970-01-01 (H. Hinnant's `civil_from_days`
/// algorithm, proleptic Gregorian calendar).
pub fn date_from_days(z: i64) -> String {
    let z = z + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!("{y:04}-{m:02}-{d:02}")
}

/// Write every file of a set so that a failure leaves the previous set intact: each file is
/// first written whole to a temporary file created exclusively beside its target under an
/// unpredictable name (`tempfile`; a symlink at the target is replaced by the rename, never
/// followed), and only when all are written are they renamed into place. On any error the
/// temporary files are removed and no target is touched.
pub fn write_set(files: &[(PathBuf, String)]) -> std::io::Result<()> {
    use std::io::Write;
    let mut temps = Vec::with_capacity(files.len());
    for (target, content) in files {
        let dir = match target.parent() {
            Some(d) if !d.as_os_str().is_empty() => d,
            _ => Path::new("."),
        };
        let mut t = tempfile::Builder::new()
            .prefix(".rollsleuth-")
            .suffix(".tmp")
            .tempfile_in(dir)?;
        t.write_all(content.as_bytes())?;
        t.as_file().sync_all()?;
        temps.push((t, target));
    }
    for (t, target) in temps {
        t.persist(target).map_err(|e| e.error)?;
    }
    Ok(())
}

/// The files of a root-cause report: `<stem>.html`, `<stem>.md` and `<stem>.json` in `dir`
/// (created if missing), written with [`write_set`]. Returns the paths written.
pub fn write_report(
    dir: &Path,
    r: &super::report_data::ReportData,
) -> std::io::Result<Vec<PathBuf>> {
    std::fs::create_dir_all(dir)?;
    let stem = stem(&r.case.id);
    let html_name = format!("{stem}.html");
    let mut json = serde_json::to_string_pretty(&super::diagnose_view::json(r.diagnosis))
        .map_err(std::io::Error::other)?;
    json.push('\n');
    let files = vec![
        (dir.join(&html_name), super::html::render(r)),
        (
            dir.join(format!("{stem}.md")),
            super::markdown::render(r, &html_name),
        ),
        (dir.join(format!("{stem}.json")), json),
    ];
    write_set(&files)?;
    Ok(files.into_iter().map(|f| f.0).collect())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn stem_keeps_safe_characters_and_bounds_length() {
        assert_eq!(stem("KCP-CM2 8841/R03"), "KCP-CM2_8841_R03");
        assert_eq!(stem("../../etc"), "_.._etc");
        assert_eq!(stem("<&>"), "report");
        assert_eq!(stem(""), "report");
        assert_eq!(stem(&"x".repeat(500)).len(), MAX_STEM);
    }

    #[test]
    fn fingerprint_matches_published_fnv1a_vectors() {
        // test vectors from the FNV reference (Noll's fnv test suite): "" and "a"
        assert_eq!(fingerprint(b""), "cbf29ce484222325");
        assert_eq!(fingerprint(b"a"), "af63dc4c8601ec8c");
        assert_eq!(fingerprint(b"foobar"), "85944171f73967e8");
    }

    #[test]
    fn a_failed_set_leaves_the_previous_files_and_no_temporary_file() {
        let dir = std::env::temp_dir().join(format!("rollsleuth-set-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        std::fs::create_dir_all(&dir).unwrap();
        let a = dir.join("a.html");
        std::fs::write(&a, "old").unwrap();
        // the second file's folder does not exist: its temporary file cannot be written
        let files = vec![
            (a.clone(), "new".to_string()),
            (dir.join("missing").join("b.md"), "new".to_string()),
        ];
        assert!(write_set(&files).is_err());
        assert_eq!(std::fs::read_to_string(&a).unwrap(), "old");
        let left: Vec<_> = std::fs::read_dir(&dir)
            .unwrap()
            .map(|e| e.unwrap().file_name())
            .collect();
        assert_eq!(left, vec![std::ffi::OsString::from("a.html")]);
        assert!(write_set(&files[..1]).is_ok());
        assert_eq!(std::fs::read_to_string(&a).unwrap(), "new");
        let _ = std::fs::remove_dir_all(&dir);
    }

    #[test]
    fn dates_are_checked_and_computed_from_days() {
        assert_eq!(parse_date("2024-02-29").as_deref(), Some("2024-02-29"));
        assert!(parse_date("2023-02-29").is_none());
        assert!(parse_date("2023-13-01").is_none());
        assert!(parse_date("23-01-01").is_none());
        assert_eq!(date_from_days(0), "1970-01-01");
        // 2000-03-01 is day 11017 since the Unix epoch (POSIX time 951868800 / 86400)
        assert_eq!(date_from_days(11_017), "2000-03-01");
    }
}
