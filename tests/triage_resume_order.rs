//! A resumed triage prints the CSV a fresh run prints: the same rows in the same order (the
//! files' order), the earlier rows that stand in their places, byte for byte.

use std::path::{Path, PathBuf};
use std::process::Command;

/// Run the binary; (exit code, standard output, standard error).
fn run(args: &[&str]) -> (i32, String, String) {
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(args)
        .env_remove("COLUMNS")
        .env_remove("ROLLSLEUTH_UNITS")
        .output()
        .expect("runs");
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stdout).into(),
        String::from_utf8_lossy(&o.stderr).into(),
    )
}

/// A fresh scratch folder under the target folder.
fn tmp(name: &str) -> PathBuf {
    let d = Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-resume-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

/// The rolls: three field cases and a broken file, in the order a folder lists them.
fn batch(d: &Path) {
    for (name, from) in [
        (
            "a_board.yaml",
            "field_cases/harrowgate_board_dry_store.yaml",
        ),
        (
            "b_coated.yaml",
            "field_cases/kestrel_coated_cold_to_humid.yaml",
        ),
        (
            "d_newsprint.yaml",
            "field_cases/nordvik_pm3_caliper_band.yaml",
        ),
    ] {
        std::fs::copy(from, d.join(name)).unwrap();
    }
    std::fs::write(d.join("c_broken.yaml"), "format: 1\ncase: [\n").unwrap();
}

/// The CSV of a triage of `dir`, resumed from `resume` when given.
fn triage(dir: &Path, resume: Option<&Path>) -> (i32, String) {
    let mut args = vec!["triage", "--format", "csv", "-q"];
    if let Some(r) = resume {
        args.extend(["--resume", r.to_str().unwrap()]);
    }
    args.push(dir.to_str().unwrap());
    let (code, out, err) = run(&args);
    assert!(code == 1 || code == 2, "{code}: {err}");
    (code, out)
}

/// An earlier output that lists the rolls out of order (the last file first, then the broken
/// one's failed row), another file's row, and a row cut short by a stop: the resumed run runs
/// the missing, cut and failed rolls again and prints every row where a fresh run prints it;
/// the row of a file this run does not name comes last.
#[test]
fn a_resumed_triage_prints_what_a_fresh_one_prints() {
    let d = tmp("order");
    batch(&d);
    let (code, fresh) = triage(&d, None);
    assert_eq!(code, 2, "the broken file: {fresh}");
    let lines: Vec<&str> = fresh.lines().collect();
    assert_eq!(lines.len(), 5, "{fresh}");
    let row = |name: &str| {
        *lines
            .iter()
            .find(|l| l.contains(name))
            .unwrap_or_else(|| panic!("{name}: {fresh}"))
    };
    let (b, c, dd) = (row("b_coated"), row("c_broken"), row("d_newsprint"));
    assert!(
        lines[1].contains("a_board") && lines[4] == dd,
        "file order: {fresh}"
    );
    let other = dd.replacen(d.join("d_newsprint.yaml").to_str().unwrap(), "gone.yaml", 1);
    assert_ne!(other, dd);
    let partial = d.join("partial.csv");
    let cut = &b[..b.len() / 2];
    let text = format!("{}\n{dd}\n{other}\n{c}\n{cut}", lines[0]);
    std::fs::write(&partial, text).unwrap();
    let (code, resumed) = triage(&d, Some(&partial));
    assert_eq!(code, 2, "{resumed}");
    assert_eq!(
        resumed,
        format!("{fresh}{other}\n"),
        "a fresh run's bytes, then the other file's row"
    );
    // with every row done, a resumed run runs nothing and prints the fresh CSV again
    let done = d.join("done.csv");
    let shuffled = [lines[0], lines[4], lines[2], lines[1], lines[3]].join("\n");
    std::fs::write(&done, shuffled).unwrap();
    let (_, again) = triage(&d, Some(&done));
    assert_eq!(again, fresh);
}
