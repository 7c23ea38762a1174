//! `diagnose --out DIR` writes its three report files as a set: a failure part way through the
//! renames leaves the earlier report whole and no temporary file behind, the error names the
//! file that failed and how to fix it, and the files get the mode a new file gets under the
//! umask (a report is meant to be shared).

use std::path::{Path, PathBuf};
use std::process::Command;

const BIN: &str = env!("CARGO_BIN_EXE_rollsleuth");
/// The demo roll's report stem (its case id).
const STEM: &str = "NVP-PM3-24117-R06";

fn scratch(name: &str) -> PathBuf {
    let d = Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-set-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn names(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().into_string().unwrap())
        .collect();
    v.sort();
    v
}

#[test]
fn a_failed_rename_leaves_the_earlier_report_whole() {
    let d = scratch("fail");
    let (html, md, json) = (
        d.join(format!("{STEM}.html")),
        d.join(format!("{STEM}.md")),
        d.join(format!("{STEM}.json")),
    );
    std::fs::write(&html, "earlier html").unwrap();
    std::fs::write(&md, "earlier md").unwrap();
    // the JSON is renamed last: a folder at its name makes that rename fail after the others
    std::fs::create_dir(&json).unwrap();
    let o = Command::new(BIN)
        .args(["diagnose", "--out", d.to_str().unwrap(), "-q"])
        .output()
        .unwrap();
    let err = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(2), "{err}");
    assert!(
        err.contains(&json.display().to_string()),
        "names the file: {err}"
    );
    assert!(err.contains("Fix: a folder has this file's name"), "{err}");
    assert_eq!(std::fs::read_to_string(&html).unwrap(), "earlier html");
    assert_eq!(std::fs::read_to_string(&md).unwrap(), "earlier md");
    assert!(json.is_dir());
    assert_eq!(
        names(&d),
        [
            format!("{STEM}.html"),
            format!("{STEM}.json"),
            format!("{STEM}.md")
        ],
        "no temporary or set-aside file is left"
    );
    let _ = std::fs::remove_dir_all(&d);
}

#[cfg(unix)]
#[test]
fn report_files_get_the_mode_the_umask_gives() {
    use std::os::unix::fs::PermissionsExt;
    let d = scratch("mode");
    for (umask, mode) in [("022", 0o644), ("002", 0o664)] {
        let o = Command::new("sh")
            .args([
                "-c",
                &format!("umask {umask}; exec \"$0\" diagnose --out \"$1\" -q"),
                BIN,
                d.to_str().unwrap(),
            ])
            .output()
            .unwrap();
        assert_eq!(
            o.status.code(),
            Some(1),
            "{}",
            String::from_utf8_lossy(&o.stderr)
        );
        for ext in ["html", "md", "json"] {
            let m = std::fs::metadata(d.join(format!("{STEM}.{ext}")))
                .unwrap()
                .permissions()
                .mode();
            assert_eq!(
                m & 0o777,
                mode,
                "{ext} under umask {umask}: {:o}",
                m & 0o777
            );
        }
        assert_eq!(names(&d).len(), 3, "{:?}", names(&d));
    }
    let _ = std::fs::remove_dir_all(&d);
}
