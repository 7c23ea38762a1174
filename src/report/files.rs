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

/// A set of files that could not be written: the file it failed on and why, and any earlier
/// file that could not be put back (where its content now is).
#[derive(Debug)]
pub struct WriteError {
    /// The file (or the folder) the failure is about.
    pub path: PathBuf,
    /// Whether `path` is the `--out` folder rather than a file in it.
    pub folder: bool,
    pub source: std::io::Error,
    /// `(target, where its earlier content is)` for each earlier file a failed rollback left
    /// aside (empty when the folder holds the earlier set whole).
    pub stranded: Vec<(PathBuf, PathBuf)>,
}

impl WriteError {
    fn new(path: &Path, source: std::io::Error) -> Self {
        WriteError {
            path: path.to_path_buf(),
            folder: false,
            source,
            stranded: Vec::new(),
        }
    }

    fn folder(path: &Path, source: std::io::Error) -> Self {
        WriteError {
            folder: true,
            ..WriteError::new(path, source)
        }
    }

    /// What to do about it, from the cause.
    fn fix(&self) -> &'static str {
        use std::io::ErrorKind as K;
        if !self.folder && self.path.is_dir() {
            return "a folder has this file's name: move or rename it, or give another --out folder";
        }
        if self.folder && self.path.exists() && !self.path.is_dir() {
            return "the --out path is a file, not a folder: give a folder (it is created if missing)";
        }
        match self.source.kind() {
            K::PermissionDenied | K::ReadOnlyFilesystem => "make the folder and its earlier report files writable (permissions; an immutable attribute shows in `lsattr`), or give another --out folder",
            K::StorageFull | K::QuotaExceeded => "free some space on that disk, or give an --out folder on another one",
            _ => "check that the folder exists and is writable and that the disk has space, then run again",
        }
    }
}

impl std::fmt::Display for WriteError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(
            f,
            "{}: {}. Fix: {}",
            self.path.display(),
            self.source,
            self.fix()
        )?;
        if self.stranded.is_empty() {
            return write!(f, "; no report file was changed");
        }
        for (target, aside) in &self.stranded {
            write!(
                f,
                "; the earlier {} could not be put back: it is kept as {}",
                target.display(),
                aside.display()
            )?;
        }
        Ok(())
    }
}

impl std::error::Error for WriteError {
    fn source(&self) -> Option<&(dyn std::error::Error + 'static)> {
        Some(&self.source)
    }
}

/// The folder a target file is in (`.` for a bare name).
fn folder(target: &Path) -> &Path {
    match target.parent() {
        Some(d) if !d.as_os_str().is_empty() => d,
        _ => Path::new("."),
    }
}

/// A temporary file beside `target` holding `content`, flushed to disk: created exclusively
/// under an unpredictable name, with the mode a new file gets under the process umask
/// (0666 & !umask on Unix; `tempfile`'s own 0600 would stay after the rename, and a report is
/// meant to be shared).
fn temp_with(target: &Path, content: &str) -> std::io::Result<tempfile::NamedTempFile> {
    use std::io::Write;
    let mut b = tempfile::Builder::new();
    b.prefix(".rollsleuth-").suffix(".tmp");
    #[cfg(unix)]
    {
        use std::os::unix::fs::PermissionsExt;
        b.permissions(std::fs::Permissions::from_mode(0o666));
    }
    let mut t = b.tempfile_in(folder(target))?;
    t.write_all(content.as_bytes())?;
    t.as_file().sync_all()?;
    Ok(t)
}

/// One target put in place: where its earlier file was moved aside, if it had one.
struct Placed<'a> {
    target: &'a Path,
    aside: Option<tempfile::TempPath>,
}

/// Move an existing `target` (a file or a symlink, not a folder) aside to a fresh name beside
/// it, then rename the temporary file `t` onto `target`. On failure `target` is as it was.
fn place<'a>(t: tempfile::NamedTempFile, target: &'a Path) -> Result<Placed<'a>, WriteError> {
    let fail = |e| WriteError::new(target, e);
    let aside = match std::fs::symlink_metadata(target) {
        Ok(m) if !m.is_dir() => {
            // an empty file reserves the name; the rename replaces it
            let aside = tempfile::Builder::new()
                .prefix(".rollsleuth-")
                .suffix(".old")
                .tempfile_in(folder(target))
                .map_err(fail)?
                .into_temp_path();
            std::fs::rename(target, &aside).map_err(fail)?;
            Some(aside)
        }
        _ => None,
    };
    match t.persist(target) {
        Ok(_) => Ok(Placed { target, aside }),
        Err(e) => {
            let mut err = fail(e.error);
            unplace(Placed { target, aside }, false, &mut err.stranded);
            Err(err)
        }
    }
}

/// Undo [`place`]: the earlier file back onto its target (a rename, which replaces the new one),
/// or the new file removed when there was none (`placed`: the new file is at the target). An
/// earlier file that cannot be put back is kept where it is and listed in `stranded`.
fn unplace(p: Placed, placed: bool, stranded: &mut Vec<(PathBuf, PathBuf)>) {
    match p.aside {
        Some(aside) => {
            // keep() only stops the removal; after a rename back nothing is left at `aside`
            let back = std::fs::rename(&aside, p.target);
            if let (Err(_), Ok(kept)) = (back, aside.keep()) {
                stranded.push((p.target.to_path_buf(), kept));
            }
        }
        None if placed => {
            let _ = std::fs::remove_file(p.target);
        }
        None => {}
    }
}

/// Write every file of a set so that a failure leaves the previous set intact, as far as the
/// filesystem allows:
/// 1. each file is written whole to a temporary file created exclusively beside its target
///    ([`temp_with`]); a failure here touches no target;
/// 2. then, target by target, an existing file is moved aside to a fresh name and the new one
///    renamed onto the target (a symlink at the target is moved, never followed);
/// 3. if any step of 2 fails, the targets already placed get their earlier files back (or are
///    removed when they had none), the remaining temporary files are removed, and the error
///    names the file that failed; when all are placed, the earlier files are removed.
///
/// The window that remains: a process killed (SIGKILL, power loss) during step 2 cannot roll
/// back. The folder can then hold some new files beside earlier ones, and the earlier files
/// moved aside and the unplaced new ones stay as `.rollsleuth-*.old` and `.rollsleuth-*.tmp`
/// beside them (the `.old` files hold the earlier report; rename them back by hand, or run
/// again). Every rename is within one folder, so each single rename is atomic.
pub fn write_set(files: &[(PathBuf, String)]) -> Result<(), WriteError> {
    let mut temps = Vec::with_capacity(files.len());
    for (target, content) in files {
        let t = temp_with(target, content).map_err(|e| WriteError::new(target, e))?;
        temps.push((t, target.as_path()));
    }
    let mut placed: Vec<Placed> = Vec::with_capacity(files.len());
    // the temporary files not reached are removed when the iterator drops them
    for (t, target) in temps {
        match place(t, target) {
            Ok(p) => placed.push(p),
            Err(mut e) => {
                while let Some(p) = placed.pop() {
                    unplace(p, true, &mut e.stranded);
                }
                return Err(e);
            }
        }
    }
    // dropping the `aside` paths removes the earlier files
    drop(placed);
    #[cfg(unix)]
    if let Some((target, _)) = files.first() {
        // the renames reach the disk with the folder's entry list
        let _ = std::fs::File::open(folder(target)).and_then(|d| d.sync_all());
    }
    Ok(())
}

/// The files of a root-cause report: `<stem>.html`, `<stem>.md` and `<stem>.json` in `dir`
/// (created if missing), written with [`write_set`]. Returns the paths written.
pub fn write_report(
    dir: &Path,
    r: &super::report_data::ReportData,
) -> Result<Vec<PathBuf>, WriteError> {
    std::fs::create_dir_all(dir).map_err(|e| WriteError::folder(dir, e))?;
    let stem = stem(&r.case.id);
    let html_name = format!("{stem}.html");
    let json_path = dir.join(format!("{stem}.json"));
    let json = super::json_text(&super::diagnose_view::json(r.diagnosis))
        .map_err(|e| WriteError::new(&json_path, std::io::Error::other(e)))?;
    let files = vec![
        (dir.join(&html_name), super::html::render(r)),
        (
            dir.join(format!("{stem}.md")),
            super::markdown::render(r, &html_name),
        ),
        (json_path, json),
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

    /// A rename that fails after others succeeded (the last target is a folder) puts every
    /// earlier file back, removes a new file that had no predecessor and leaves no temporary or
    /// set-aside file; the error names the file that failed.
    #[test]
    fn a_failed_rename_puts_the_earlier_files_back() {
        let dir = std::env::temp_dir().join(format!("rollsleuth-undo-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        std::fs::create_dir_all(dir.join("c.json")).unwrap();
        std::fs::write(dir.join("a.html"), "old a").unwrap();
        let files: Vec<(PathBuf, String)> = ["a.html", "b.md", "c.json"]
            .iter()
            .map(|n| (dir.join(n), format!("new {n}")))
            .collect();
        let e = write_set(&files).unwrap_err();
        assert_eq!(e.path, dir.join("c.json"));
        assert!(e.stranded.is_empty());
        assert!(
            e.to_string().contains("a folder has this file's name"),
            "{e}"
        );
        assert_eq!(
            std::fs::read_to_string(dir.join("a.html")).unwrap(),
            "old a"
        );
        let mut left: Vec<_> = std::fs::read_dir(&dir)
            .unwrap()
            .map(|e| e.unwrap().file_name().into_string().unwrap())
            .collect();
        left.sort();
        assert_eq!(left, ["a.html", "c.json"]);
        std::fs::remove_dir(dir.join("c.json")).unwrap();
        write_set(&files).unwrap();
        for (p, text) in &files {
            assert_eq!(&std::fs::read_to_string(p).unwrap(), text);
        }
        assert_eq!(
            std::fs::read_dir(&dir).unwrap().count(),
            3,
            "no file set aside is left"
        );
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
