//! Golden test of the Markdown root-cause report for one field case.
//!
//! Update after a reviewed change with:
//! `UPDATE_GOLDEN=1 cargo test --locked --test report_markdown`
//! and review the diff of `tests/data/golden/kestrel_report.md` like code.

use std::process::Command;

const GOLDEN: &str = "tests/data/golden/kestrel_report.md";

#[test]
fn markdown_report_of_the_kestrel_case_matches_the_golden_file() {
    let dir = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-golden-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args([
            "diagnose",
            "field_cases/kestrel_coated_cold_to_humid.yaml",
            "--date",
            "2026-12-02",
            "--out",
        ])
        .arg(&dir)
        .output()
        .unwrap();
    assert!(
        matches!(o.status.code(), Some(0 | 1)),
        "{}",
        String::from_utf8_lossy(&o.stderr)
    );
    let md = std::fs::read_to_string(dir.join("KCP-CM2-8841-R03.md")).unwrap();
    let _ = std::fs::remove_dir_all(&dir);
    if std::env::var_os("UPDATE_GOLDEN").is_some() {
        std::fs::create_dir_all("tests/data/golden").unwrap();
        std::fs::write(GOLDEN, &md).unwrap();
        return;
    }
    let want = std::fs::read_to_string(GOLDEN)
        .unwrap_or_else(|e| panic!("{GOLDEN}: {e}; create it with UPDATE_GOLDEN=1"));
    if md != want {
        let line = md
            .lines()
            .zip(want.lines())
            .position(|(a, b)| a != b)
            .unwrap_or(md.lines().count().min(want.lines().count()));
        panic!(
            "Markdown report differs from {GOLDEN} at line {}:\n  got:  {:?}\n  want: {:?}\nReview, then update with UPDATE_GOLDEN=1 cargo test --locked --test report_markdown",
            line + 1,
            md.lines().nth(line),
            want.lines().nth(line)
        );
    }
}
