//! Every kind of bad input gets one clear message naming the file, the line where known, the
//! field and the fix; exit code 2; no panic; nothing on stdout.

use std::path::PathBuf;
use std::process::Command;

fn bin() -> Command {
    Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
}

fn run(args: &[&str]) -> (i32, String, String) {
    let o = bin().args(args).output().expect("binary runs");
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stdout).into_owned(),
        String::from_utf8_lossy(&o.stderr).into_owned(),
    )
}

fn demo() -> String {
    std::fs::read_to_string("field_cases/nordvik_pm3_caliper_band.yaml").unwrap()
}

/// Write a case variant to a temp file and return its path.
fn variant(name: &str, text: &str) -> PathBuf {
    let dir = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-bad-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let p = dir.join(name);
    std::fs::write(&p, text).unwrap();
    p
}

/// Assert a clean bad-input failure whose message contains each of `needles`.
fn bad(args: &[&str], needles: &[&str]) {
    let (code, out, err) = run(args);
    assert_eq!(code, 2, "exit code for {args:?}\nstderr: {err}");
    assert!(out.is_empty(), "nothing on stdout for {args:?}, got {out}");
    assert!(!err.contains("panicked"), "{err}");
    for n in needles {
        assert!(err.contains(n), "message for {args:?} lacks '{n}':\n{err}");
    }
}

#[test]
fn malformed_yaml_names_file_and_line() {
    let p = variant(
        "malformed.yaml",
        &demo().replace("  width: \"1600 mm\"", "  width: [\"1600 mm\""),
    );
    bad(&["check", p.to_str().unwrap()], &["malformed.yaml", "line"]);
}

#[test]
fn missing_field_is_named_with_a_fix() {
    let p = variant(
        "missing.yaml",
        &demo().replace("  width: \"1600 mm\"\n", ""),
    );
    bad(
        &["check", p.to_str().unwrap()],
        &["missing.yaml", "missing field", "width", "template"],
    );
}

#[test]
fn misspelt_field_is_an_error_not_silence() {
    let p = variant(
        "misspelt.yaml",
        &demo().replace(
            "  tension: \"2.0 pli\"",
            "  tension: \"2.0 pli\"\n  tenson: \"2.0 pli\"",
        ),
    );
    bad(
        &["check", p.to_str().unwrap()],
        &["misspelt.yaml", "unknown field", "tenson", "spelling"],
    );
}

#[test]
fn unit_that_does_not_fit_the_quantity_is_rejected_with_line() {
    let p = variant(
        "kg.yaml",
        &demo().replace("tension: \"2.0 pli\"", "tension: \"25 kg\""),
    );
    bad(
        &["check", p.to_str().unwrap()],
        &["kg.yaml:", "winding.tension", "unknown unit 'kg'", "pli"],
    );
}

#[test]
fn zero_and_negative_sizes_are_rejected() {
    bad(
        &["check", "--set", "roll.width=0 mm"],
        &["roll.width", "out of range"],
    );
    bad(
        &["check", "--set", "material.caliper=-5 um"],
        &["material.caliper", "out of range"],
    );
}

#[test]
fn core_larger_than_roll_is_rejected() {
    let p = variant(
        "core.yaml",
        &demo().replace("core_diameter: \"102 mm\"", "core_diameter: \"1.2 m\""),
    );
    bad(
        &["check", p.to_str().unwrap()],
        &[
            "core.yaml:",
            "roll.core_diameter",
            "not smaller than the roll diameter",
        ],
    );
}

#[test]
fn nan_values_are_rejected() {
    bad(
        &["check", "--set", "winding.nip=NaN pli"],
        &["winding.nip", "not a finite number"],
    );
    let p = variant(
        "nan.yaml",
        &demo().replace("values: [71.8, 72.1,", "values: [.nan, 72.1,"),
    );
    bad(
        &["check", p.to_str().unwrap()],
        &["nan.yaml:", "profiles[0].values[0]", "not a finite number"],
    );
}

#[test]
fn profile_with_mismatched_lengths_is_rejected() {
    let p = variant(
        "len.yaml",
        &demo().replace("values: [71.8, 72.1, ", "values: [72.1, "),
    );
    bad(
        &["check", p.to_str().unwrap()],
        &[
            "len.yaml:",
            "profiles[0].values",
            "16 positions but 15 values",
        ],
    );
}

#[test]
fn positions_outside_the_roll_are_rejected() {
    let p = variant(
        "outside.yaml",
        &demo().replacen("positions: [50, 150,", "positions: [-50, 150,", 1),
    );
    bad(
        &["check", p.to_str().unwrap()],
        &[
            "outside.yaml:",
            "profiles[0].positions[0]",
            "outside the roll width",
        ],
    );
}

#[test]
fn unreadable_csv_is_reported_with_its_path() {
    let text = demo().replacen(
        "    positions: [50, 150, 250, 350, 450, 550, 650, 750, 850, 950, 1050, 1150, 1250, 1350, 1450, 1550]\n    values: [71.8, 72.1, 71.9, 72.0, 72.2, 72.6, 74.3, 72.5, 72.0, 71.9, 72.1, 71.8, 72.0, 71.9, 72.1, 71.7]",
        "    csv: no_such_profile.csv",
        1,
    );
    let p = variant("csv_missing.yaml", &text);
    bad(
        &["check", p.to_str().unwrap()],
        &[
            "csv_missing.yaml:",
            "profiles[0].csv",
            "no_such_profile.csv",
        ],
    );
    // a CSV with a bad row names its own line
    let dir = p.parent().unwrap();
    std::fs::write(
        dir.join("bad_row.csv"),
        "position,value\n50,71.8\n150,abc\n",
    )
    .unwrap();
    let p2 = variant(
        "csv_bad.yaml",
        &text.replace("no_such_profile.csv", "bad_row.csv"),
    );
    bad(
        &["check", p2.to_str().unwrap()],
        &["bad_row.csv:3", "finite numbers"],
    );
}

#[test]
fn a_good_csv_profile_loads() {
    let dir = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-csv-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    std::fs::write(
        dir.join("cal.csv"),
        "position,value\n50,71.8\n800,72.4\n1550,71.7\n",
    )
    .unwrap();
    let text = demo().replacen(
        "    positions: [50, 150, 250, 350, 450, 550, 650, 750, 850, 950, 1050, 1150, 1250, 1350, 1450, 1550]\n    values: [71.8, 72.1, 71.9, 72.0, 72.2, 72.6, 74.3, 72.5, 72.0, 71.9, 72.1, 71.8, 72.0, 71.9, 72.1, 71.7]",
        "    csv: cal.csv",
        1,
    );
    let p = dir.join("csv_ok.yaml");
    std::fs::write(&p, text).unwrap();
    // JSON: the text table wraps a long temporary path at any character
    let (code, out, err) = run(&["--json", "check", p.to_str().unwrap()]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("cal.csv"), "{out}");
}

#[test]
fn unreadable_case_file_is_reported() {
    bad(
        &["check", "no/such/case.yaml"],
        &["no/such/case.yaml", "cannot read"],
    );
}

#[test]
fn bad_set_argument_is_reported() {
    bad(&["check", "--set", "winding.tension"], &["--set", "no '='"]);
    bad(
        &["check", "--set", "profiles[99].age=3 d"],
        &["past the end"],
    );
}

#[test]
fn several_problems_are_all_reported() {
    let p = variant(
        "many.yaml",
        &demo()
            .replace("tension: \"2.0 pli\"", "tension: \"25 kg\"")
            .replace("nip: \"10 pli\"", "nip: \"10 psi\""),
    );
    bad(
        &["check", p.to_str().unwrap()],
        &["2 problems", "winding.tension", "winding.nip"],
    );
}

#[test]
fn usage_errors_exit_with_two() {
    // 2 as clap's own usage errors; 1 is kept for findings.
    let (code, _, err) = run(&["no-such-command"]);
    assert_eq!(code, 2, "{err}");
}

#[test]
fn unknown_word_lists_the_allowed_words_with_line() {
    let text = demo().replacen("barrel_wrap: paper", "barrel_wrap: foil", 1);
    let line = 1 + text
        .lines()
        .position(|l| l.contains("barrel_wrap: foil"))
        .expect("the demo has a paper barrel wrap");
    let p = variant("wrap.yaml", &text);
    let at = format!("wrap.yaml:{line}:");
    bad(
        &["check", p.to_str().unwrap()],
        &[
            &at,
            "storage[0].barrel_wrap",
            "'foil' is not one of: none, paper, film",
        ],
    );
}

#[test]
fn set_keeps_the_file_lines_and_blames_itself_for_its_own_values() {
    // a problem in the file keeps the line of the file as written; a problem in a value that
    // `--set` wrote is reported against that `--set` argument
    let text = demo();
    let first_rh = text.lines().position(|l| l.contains("rh: \"")).unwrap();
    let line = first_rh + 1;
    let old = text.lines().nth(first_rh).unwrap().to_string();
    let broken = old.replacen("rh: \"", "rh: \"1", 1);
    let p = variant("set_lines.yaml", &text.replacen(&old, &broken, 1));
    let file = p.to_str().unwrap();
    bad(
        &["check", file, "--set", "winding.tension=-3 pli"],
        &[
            &format!("{file}:{line}: storage[0].rh"),
            "--set winding.tension=-3 pli: winding.tension",
        ],
    );
    bad(
        &["check", file, "--set", "winding.tension=[1, 2]"],
        &["--set winding.tension=[1, 2]", "no longer fits"],
    );
}

#[test]
fn a_cross_field_problem_blames_the_set_that_changed_one_of_its_fields() {
    // the core diameter is checked against the roll diameter, the nip against the tension: when
    // `--set` wrote the other field, the problem is that `--set`'s, not the file line's
    bad(
        &["check", "--set", "roll.diameter=50 mm"],
        &[
            "--set roll.diameter=50 mm: roll.core_diameter",
            "not smaller",
        ],
    );
    bad(
        &["check", "--set", "winding.tension=0.2 pli"],
        &["--set winding.tension=0.2 pli: winding.nip", "20 times"],
    );
}

#[test]
fn a_density_out_of_range_from_basis_weight_over_caliper_names_both_fields() {
    // the demo gives 45 g/m2: a caliper of 5 mm makes it 9 kg/m3, one of 5 um 9000 kg/m3
    bad(
        &["check", "--set", "material.caliper=5 mm"],
        &[
            "--set material.caliper=5 mm: material.basis_weight",
            "material.basis_weight 45.00 g/m2 over material.caliper 5000 um",
            "density of 9.000 kg/m3",
            "within 100.0 kg/m3 .. 3000 kg/m3",
            "the caliper is too large or the basis weight too small",
            "Fix: check material.caliper and material.basis_weight",
        ],
    );
    bad(
        &["check", "--set", "material.caliper=5 um"],
        &[
            "density of 9000 kg/m3",
            "the caliper is too small or the basis weight too large",
        ],
    );
}
