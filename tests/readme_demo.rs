//! The README's "What you get" excerpt is what `rollsleuth diagnose --width 80` prints on the
//! demo roll today (standard output; findings 1 and 3 cut to their first line and " ...", as
//! the README shows them), so a new user reading it sees the program's real output.
//!
//! Update after a reviewed change with:
//! `UPDATE_README=1 cargo test --locked --test readme_demo`
//! and review the diff of README.md like code.

use std::process::Command;

const README: &str = concat!(env!("CARGO_MANIFEST_DIR"), "/README.md");
const OPEN: &str = "```text\n$ rollsleuth diagnose\n";
/// The characters a table's lines start with.
const BORDERS: [char; 5] = ['┌', '│', '╞', '├', '└'];

/// The demo's output as the README shows it: findings 1 and 3 cut to their first line.
fn abridged(out: &str) -> String {
    let mut keep: Vec<String> = Vec::new();
    // in a cut finding, and past its (possibly wrapped) first line
    let (mut cut, mut body) = (false, false);
    for line in out.trim_end().lines() {
        let finding = line
            .split_once(". ")
            .filter(|(n, _)| n.len() == 1 && n.chars().all(|c| c.is_ascii_digit()))
            .map(|(n, _)| n);
        if let Some(n) = finding {
            (cut, body) = (matches!(n, "1" | "3"), false);
            if cut {
                keep.push(format!("{line} ..."));
                keep.push(String::new());
                continue;
            }
        }
        // a cut finding's body starts at its first indented line and ends at the next line that
        // is neither indented, blank nor a table's
        body |= cut && line.starts_with(' ');
        let own = line.is_empty() || line.starts_with(' ') || line.starts_with(BORDERS);
        if cut && body && !own {
            cut = false;
        }
        let second_blank = line.is_empty() && keep.last().is_some_and(|l| l.is_empty());
        if !cut && !second_blank {
            keep.push(line.to_string());
        }
    }
    keep.join("\n") + "\n"
}

#[test]
fn the_readme_shows_the_demo_output_of_this_build() {
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(["diagnose", "--width", "80"])
        .output()
        .unwrap();
    assert_eq!(
        o.status.code(),
        Some(1),
        "{}",
        String::from_utf8_lossy(&o.stderr)
    );
    let got = abridged(&String::from_utf8(o.stdout).unwrap());
    let readme = std::fs::read_to_string(README).unwrap();
    let start = readme.find(OPEN).expect("the README has the demo block") + OPEN.len();
    let end = start
        + readme[start..]
            .find("```")
            .expect("the demo block is closed");
    if std::env::var_os("UPDATE_README").is_some() {
        let new = format!("{}{}{}", &readme[..start], got, &readme[end..]);
        std::fs::write(README, new).unwrap();
        return;
    }
    let want = &readme[start..end];
    if got != want {
        let line = (got.lines().zip(want.lines()))
            .position(|(a, b)| a != b)
            .unwrap_or(got.lines().count().min(want.lines().count()));
        panic!(
            "the README's demo excerpt differs from this build's output at its line {}:\n  got:  \
             {:?}\n  want: {:?}\nReview, then update with UPDATE_README=1 cargo test --locked \
             --test readme_demo",
            line + 1,
            got.lines().nth(line),
            want.lines().nth(line)
        );
    }
}
