//! The command line as a user expects it (issue 16): tables that fit the width, units
//! everywhere, triage progress, formats, resume and exit codes, rule-table help, flexible CSV,
//! completions, man page, standard input, quiet output, JSON errors and the files `--out`
//! wrote.

use assert_cmd::Command;
use std::path::{Path, PathBuf};

/// The binary with a clean environment for width and units, so results do not depend on the
/// shell running the tests.
fn cmd() -> Command {
    let mut c = Command::cargo_bin("rollsleuth").expect("binary");
    c.env_remove("COLUMNS").env_remove("ROLLSLEUTH_UNITS");
    c
}

fn run(c: &mut Command) -> (i32, String, String) {
    let o = c.output().expect("runs");
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stdout).into(),
        String::from_utf8_lossy(&o.stderr).into(),
    )
}

fn tmp(name: &str) -> PathBuf {
    let d = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-i16-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

const DEMO: &str = "field_cases/nordvik_pm3_caliper_band.yaml";

fn widest(s: &str) -> usize {
    s.lines().map(|l| l.chars().count()).max().unwrap_or(0)
}

#[test]
fn no_line_exceeds_80_or_120_columns() {
    for w in ["80", "120"] {
        let n: usize = w.parse().unwrap();
        for sub in ["check", "lanes", "stress", "age", "fit", "diagnose"] {
            let (_, out, err) = run(cmd().args([sub, "--width", w]));
            assert!(
                widest(&out) <= n,
                "{sub} at {w}: {} wide\n{out}{err}",
                widest(&out)
            );
        }
        // COLUMNS sets the width when no option does
        let (_, out, _) = run(cmd().env("COLUMNS", w).arg("diagnose"));
        assert!(widest(&out) <= n);
        let (_, out, _) = run(cmd().args(["triage", "field_cases", "no/such.yaml", "--width", w]));
        assert!(widest(&out) <= n, "triage at {w}\n{out}");
    }
    // piped output without a width is laid out at the fixed default, the same every run
    let (_, a, _) = run(cmd().arg("diagnose"));
    let (_, b, _) = run(cmd().arg("diagnose"));
    assert_eq!(a, b);
    assert!(widest(&a) <= 100);
}

#[test]
fn long_sources_are_shortened_in_tables_and_whole_in_json() {
    let (_, text, _) = run(cmd().arg("diagnose"));
    let (_, json, _) = run(cmd().args(["diagnose", "--json"]));
    let v: serde_json::Value = serde_json::from_str(&json).unwrap();
    let src = v["findings"][0]["evidence"][0]["source"].as_str().unwrap();
    assert!(src.len() > 60 && !src.ends_with("..."), "{src}");
    assert!(text.contains("..."), "a long source is cut in the table");
}

#[test]
fn evidence_and_columns_carry_human_labels() {
    let (_, out, _) = run(cmd().args(["diagnose", "--width", "200"]));
    assert!(out.contains("local peak / running strain"), "{out}");
    assert!(
        !out.contains("local_peak_ratio"),
        "identifiers stay in JSON"
    );
    let (_, json, _) = run(cmd().args(["diagnose", "--json"]));
    assert!(json.contains("\"local_peak_ratio\""));
    let (_, lanes, _) = run(cmd().arg("lanes"));
    assert!(
        lanes.contains("caliper from the measured caliper profile"),
        "{lanes}"
    );
    let (_, fit, _) = run(cmd().args(["fit", "--width", "200"]));
    for jargon in ["x/÷", "rmse (x noise)", "Profile"] {
        assert!(!fit.contains(jargon) && !lanes.contains(jargon), "{jargon}");
    }
    let (_, check, _) = run(cmd().args(["check", "--width", "200"]));
    assert!(check.contains("storage period") && !check.contains("│ stretch"));
}

#[test]
fn us_units_reach_headlines_evidence_and_lane_notes() {
    let (_, si, _) = run(cmd().args(["diagnose", "--width", "200"]));
    let (_, us, _) = run(cmd().args(["diagnose", "--units", "us", "--width", "200"]));
    assert!(si.contains("mm per metre") && si.contains("100.00 mm"));
    assert!(us.contains("mil per inch"), "{us}");
    assert!(us.contains("mil/in") && !us.contains(" mm/m"), "{us}");
    assert!(us.contains("3.937 in"), "100 mm band width in inches: {us}");
    // the environment variable sets the default, case-blind
    let (_, env, _) = run(cmd()
        .env("ROLLSLEUTH_UNITS", "US")
        .args(["diagnose", "--width", "200"]));
    assert_eq!(env, us);
    let (_, fit, _) = run(cmd().args(["fit", "--units", "us", "--width", "200"]));
    assert!(fit.contains("mil/in") && fit.contains(" in "), "{fit}");
}

/// Copy of the demo with `from` replaced by `to`, written into `dir`.
fn demo_with(dir: &Path, from: &str, to: &str) -> PathBuf {
    let text = std::fs::read_to_string(DEMO).unwrap();
    assert!(text.contains(from), "demo lacks {from}");
    let p = dir.join("case.yaml");
    std::fs::write(&p, text.replacen(from, to, 1)).unwrap();
    p
}

#[test]
fn unit_words_ignore_case_on_the_command_line() {
    let (code, out, err) = run(cmd().args(["lanes", "--json", "--set", "winding.tension=2.0 PLI"]));
    assert_eq!(code, 0, "{err}");
    let (_, same, _) = run(cmd().args(["lanes", "--json", "--set", "winding.tension=2.0 pli"]));
    assert_eq!(out, same);
    let (code, _, err) = run(cmd().args(["lanes", "--set", "winding.tension=350 n/m"]));
    assert_eq!(code, 0, "{err}");
}

#[test]
fn a_caliper_profile_in_the_wrong_unit_names_the_slip() {
    let d = tmp("slip");
    let p = demo_with(&d, "unit: um", "unit: mil");
    let (code, _, err) = run(cmd().args(["check", p.to_str().unwrap()]));
    assert_eq!(code, 2);
    assert!(err.contains("look like um labelled mil"), "{err}");
}

fn triage_dir(name: &str, n: usize) -> PathBuf {
    let d = tmp(name);
    for k in 0..n {
        std::fs::copy(DEMO, d.join(format!("roll{k:02}.yaml"))).unwrap();
    }
    d
}

#[test]
fn triage_formats_exit_codes_and_no_progress_when_piped() {
    let d = triage_dir("triage", 3);
    let (code, out, err) = run(cmd().args(["triage", "--format", "csv", d.to_str().unwrap()]));
    assert_eq!(code, 1, "findings: {err}");
    assert!(
        err.is_empty(),
        "no progress bar or notes when standard error is a pipe: {err}"
    );
    assert!(out.starts_with("file,case,spread_mm_per_m,"), "{out}");
    assert_eq!(out.lines().count(), 4);
    let (_, json, _) = run(cmd().args(["triage", "--format", "json", d.to_str().unwrap()]));
    let v: serde_json::Value = serde_json::from_str(&json).unwrap();
    assert_eq!(v["rolls"].as_array().unwrap().len(), 3);
    std::fs::write(d.join("broken.yaml"), "format: 1\ncase: [\n").unwrap();
    let (code, out, _) = run(cmd().args(["triage", d.to_str().unwrap()]));
    assert_eq!(code, 2, "a bad file exits 2 after the rest are done");
    assert_eq!(out.matches("NVP-PM3-24117-R06").count(), 3, "{out}");
}

#[test]
fn triage_resumes_from_a_partial_csv() {
    let d = triage_dir("resume", 3);
    let (_, full, _) = run(cmd().args(["triage", "--format", "csv", d.to_str().unwrap()]));
    let lines: Vec<&str> = full.lines().collect();
    let partial = d.join("partial.csv");
    std::fs::write(
        &partial,
        format!("{}\n{}\n{}", lines[0], lines[1], &lines[2][..10]),
    )
    .unwrap();
    let (code, rest, err) = run(cmd().args([
        "triage",
        "--format",
        "csv",
        "--resume",
        partial.to_str().unwrap(),
        d.to_str().unwrap(),
    ]));
    assert_eq!(code, 1, "{err}");
    assert_eq!(
        rest.lines().collect::<Vec<_>>(),
        lines,
        "the whole CSV again: header, the earlier whole row, then the rest"
    );
    let (code, _, _) = run(cmd().args(["triage", "--resume", "x.csv", d.to_str().unwrap()]));
    assert_eq!(code, 2, "--resume without --format csv is a usage error");
}

#[test]
fn rules_show_prints_the_built_in_table_and_lint_suggests_names() {
    let (code, out, _) = run(cmd().args(["rules", "show"]));
    assert_eq!(code, 0);
    assert!(out.contains("rules:"));
    let (_, diag, _) = run(cmd().args(["diagnose", "--width", "200"]));
    assert!(!diag.contains("rules/default.yaml"));
    assert!(diag.contains("built-in default table (print it with: rollsleuth rules show)"));
    let d = tmp("lint");
    let p = d.join("r.yaml");
    std::fs::write(&p, out.replacen("local_peak_ratio", "lokal_peak_ratio", 1)).unwrap();
    let (code, _, err) = run(cmd().args(["rules", "lint", p.to_str().unwrap()]));
    assert_eq!(code, 2);
    assert!(err.contains("did you mean 'local_peak_ratio'?"), "{err}");
}

/// Demo case with its first caliper profile replaced by a CSV reference.
fn csv_case(dir: &Path, csv_name: &str, csv: &str, columns: &str) -> PathBuf {
    let text = std::fs::read_to_string(DEMO).unwrap();
    let c = text
        .lines()
        .position(|l| l.contains("what: caliper"))
        .expect("demo has a caliper profile");
    let lines: Vec<&str> = text.lines().collect();
    let (mut pos, mut val) = (None, None);
    for l in &lines[c..] {
        let t = l.trim_start();
        if pos.is_none() && t.starts_with("positions:") {
            pos = Some(l.to_string());
        } else if val.is_none() && t.starts_with("values:") {
            val = Some(l.to_string());
        }
    }
    let nums = |l: &str| -> Vec<String> {
        let a = l.find('[').unwrap();
        let b = l.rfind(']').unwrap();
        l[a + 1..b]
            .split(',')
            .map(|s| s.trim().to_string())
            .collect()
    };
    let (pl, vl) = (pos.unwrap(), val.unwrap());
    let (ps, vs) = (nums(&pl), nums(&vl));
    let indent: String = pl.chars().take_while(|c| *c == ' ').collect();
    let rows: String = ps
        .iter()
        .zip(&vs)
        .rev()
        .map(|(p, v)| {
            csv.replace("{p}", p).replace(
                "{v}",
                &v.replace('.', if csv.contains(';') { "," } else { "." }),
            )
        })
        .collect();
    let head = csv.lines().next().unwrap();
    let body: String = rows
        .lines()
        .filter(|l| *l != head)
        .map(|l| format!("{l}\n"))
        .collect();
    std::fs::write(dir.join(csv_name), format!("{head}\n{body}")).unwrap();
    let new = text
        .replacen(&pl, &format!("{indent}csv: {csv_name}{columns}"), 1)
        .replacen(&format!("{vl}\n"), "", 1);
    let p = dir.join("case.yaml");
    std::fs::write(&p, new).unwrap();
    p
}

#[test]
fn csv_profiles_with_semicolons_mapping_and_back_edge_first_scans() {
    let d = tmp("csv");
    let (_, inline, _) = run(cmd().args(["lanes", "--json", DEMO]));
    let p = csv_case(&d, "cal.csv", "position;value\n{p};{v}\n", "");
    let (code, semi, err) = run(cmd().args(["lanes", "--json", p.to_str().unwrap()]));
    assert_eq!(code, 0, "{err}");
    let (_, _, err) = run(cmd().args(["check", p.to_str().unwrap()]));
    assert!(
        err.contains("sorted by position"),
        "a back-edge-first scan is sorted with a note: {err}"
    );
    let lanes = |s: &str| serde_json::from_str::<serde_json::Value>(s).unwrap()["lanes"].clone();
    assert_eq!(lanes(&semi), lanes(&inline));
    let p = csv_case(
        &d,
        "map.csv",
        "x\tcal\n{p}\t{v}\n",
        "\n    columns: {position: x, value: cal}",
    );
    let (code, mapped, err) = run(cmd().args(["lanes", "--json", p.to_str().unwrap()]));
    assert_eq!(code, 0, "{err}");
    assert_eq!(lanes(&mapped), lanes(&inline));
}

#[test]
fn completions_and_man_page_come_from_the_command_line() {
    let (code, out, _) = run(cmd().args(["completions", "bash"]));
    assert_eq!(code, 0);
    assert!(out.contains("rollsleuth") && out.contains("triage"));
    let (code, out, _) = run(cmd().arg("man"));
    assert_eq!(code, 0);
    assert!(
        out.starts_with(".ie") || out.contains(".TH rollsleuth"),
        "{}",
        &out[..80.min(out.len())]
    );
}

#[test]
fn a_case_on_standard_input_is_the_same_as_the_file() {
    let (_, file, _) = run(cmd().args(["check", "--json", DEMO]));
    let text = std::fs::read_to_string(DEMO).unwrap();
    let (code, stdin, err) = run(cmd().args(["lanes", "--json", "-"]).write_stdin(text));
    assert_eq!(code, 0, "{err}");
    let (_, lanes, _) = run(cmd().args(["lanes", "--json", DEMO]));
    assert_eq!(stdin, lanes);
    assert!(!file.is_empty());
}

#[test]
fn notes_go_to_standard_error_and_quiet_silences_them() {
    let (_, out, err) = run(cmd().arg("diagnose"));
    assert!(!out.contains("\nnote: ") && err.contains("note: "), "{err}");
    let (_, _, err) = run(cmd().args(["diagnose", "--quiet"]));
    // --quiet drops the notes; warnings (a physical limit passed) are never silenced
    assert!(!err.contains("note: "), "{err}");
    assert!(err.lines().all(|l| !l.starts_with("note")), "{err}");
}

#[test]
fn errors_are_json_on_standard_error_with_json() {
    let (code, out, err) = run(cmd().args(["check", "--json", "no/such.yaml"]));
    assert_eq!(code, 2);
    assert!(out.is_empty());
    let v: serde_json::Value = serde_json::from_str(err.trim()).expect("JSON error");
    assert_eq!(v["error"]["kind"], "bad_input");
    assert!(v["error"]["message"]
        .as_str()
        .unwrap()
        .contains("no/such.yaml"));
    let (code, _, err) = run(cmd().args(["--json", "frobnicate"]));
    assert_eq!(code, 2, "clap's usage errors exit 2");
    let v: serde_json::Value = serde_json::from_str(err.trim()).expect("JSON error");
    assert_eq!(v["error"]["kind"], "usage");
}

#[test]
fn out_lists_the_files_it_wrote() {
    let d = tmp("out");
    let (code, _, err) = run(cmd().args(["diagnose", "--out", d.to_str().unwrap()]));
    assert_eq!(code, 1);
    let listed: Vec<&str> = err
        .lines()
        .filter_map(|l| l.strip_prefix("wrote "))
        .collect();
    assert_eq!(listed.len(), 3, "html, md and json: {err}");
    for f in listed {
        assert!(Path::new(f).is_file(), "{f}");
    }
}

#[test]
fn exit_codes_are_0_none_1_findings_2_bad_input_or_usage() {
    let (code, _, _) = run(cmd().arg("--version"));
    assert_eq!(code, 0);
    let (code, _, _) = run(cmd().arg("diagnose"));
    assert_eq!(code, 1);
    let (code, _, _) = run(cmd().args(["check", "no/such.yaml"]));
    assert_eq!(code, 2);
    let (code, _, _) = run(cmd().args(["stress", "--nodes", "many"]));
    assert_eq!(code, 2);
}

#[test]
fn range_errors_use_the_chosen_units() {
    // 1 pli = 175.1268 N/m (NIST SP 811, 2008, B.8: lbf = 4.448222 N, in = 0.0254 m)
    let (code, _, err) =
        run(cmd().args(["--units", "us", "check", "--set", "winding.tension=-3 pli"]));
    assert_eq!(code, 2);
    assert!(err.contains("-3.000 pli"), "{err}");
    let (_, _, err) = run(cmd().args(["check", "--set", "winding.tension=-3 pli"]));
    assert!(err.contains("-525.4 N/m"), "{err}");
}

#[test]
fn triage_shows_progress_on_a_terminal() {
    // util-linux `script` gives the program a pseudo-terminal, as an interactive shell would
    if !Path::new("/usr/bin/script").exists() {
        panic!(
            "/usr/bin/script (util-linux) is needed for the terminal check; .ci/run installs it"
        );
    }
    let d = triage_dir("triage-tty", 4);
    let log = d.join("typescript");
    let command = format!(
        "{} triage {} --format csv > /dev/null",
        env!("CARGO_BIN_EXE_rollsleuth"),
        d.display()
    );
    let st = std::process::Command::new("/usr/bin/script")
        .args(["-qec", &command])
        .arg(&log)
        .stdout(std::process::Stdio::null())
        .status()
        .unwrap();
    // `script -e` returns the program's status: 1, the demo rolls have findings
    assert_eq!(st.code(), Some(1));
    let seen = String::from_utf8_lossy(&std::fs::read(&log).unwrap()).into_owned();
    assert!(
        seen.contains("4/4 rolls"),
        "progress on the terminal: {seen}"
    );
}

/// `--lanes N` is `--set lanes.count=N` written shorter: the same bytes on `lanes` and `stress`;
/// a count outside 1-400 is refused with the fix, exit 2.
#[test]
fn lanes_option_is_the_lane_count_override() {
    for sub in ["lanes", "stress"] {
        let a = run(cmd().args([sub, DEMO, "--lanes", "24", "--json"]));
        let b = run(cmd().args([sub, DEMO, "--set", "lanes.count=24", "--json"]));
        assert_eq!(a.0, 0, "{}", a.2);
        assert_eq!(a, b, "{sub}");
    }
    for bad in ["0", "401", "many"] {
        let (code, _, err) = run(cmd().args(["lanes", DEMO, "--lanes", bad]));
        assert_eq!(code, 2, "{bad}: {err}");
        assert!(
            err.contains("--lanes") && err.contains("from 1 to 400"),
            "{err}"
        );
    }
}
