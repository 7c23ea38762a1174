//! Every command from the README as a new user runs it: exit codes, JSON field names carrying SI
//! units, deterministic output, report files written whole.

use std::process::Command;

fn run(args: &[&str]) -> (i32, String, String) {
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(args)
        .output()
        .expect("runs");
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stdout).into(),
        String::from_utf8_lossy(&o.stderr).into(),
    )
}

#[test]
fn every_field_case_passes_check_lanes_and_stress() {
    for f in [
        "field_cases/nordvik_pm3_caliper_band.yaml",
        "field_cases/kestrel_coated_cold_to_humid.yaml",
        "field_cases/harrowgate_board_dry_store.yaml",
    ] {
        for cmd in ["check", "lanes", "stress", "age", "fit"] {
            let (code, out, err) = run(&[cmd, f]);
            assert_eq!(code, 0, "{cmd} {f}: {err}");
            assert!(!out.is_empty());
        }
        let (code, _, err) = run(&["check", "--units", "us", f]);
        assert_eq!(code, 0, "{err}");
    }
}

#[test]
fn template_is_a_valid_case() {
    let (code, out, _) = run(&["template"]);
    assert_eq!(code, 0);
    let p = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-template-{}.yaml", std::process::id()));
    std::fs::write(&p, out).unwrap();
    let (code, _, err) = run(&["check", p.to_str().unwrap()]);
    assert_eq!(code, 0, "{err}");
}

#[test]
fn json_field_names_carry_si_units() {
    let (_, out, _) = run(&["stress", "--json"]);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let lane = &v["lanes"][0];
    for k in [
        "position_m",
        "radius_m",
        "radial_stress_pa",
        "tangential_stress_pa",
        "wound_in_tension_n_per_m",
    ] {
        assert!(lane.get(k).is_some(), "stress lane lacks {k}");
    }
    let (_, out, _) = run(&["age", "--json"]);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert!(v["times_s"].is_array());
    for k in [
        "position_m",
        "moisture_pct",
        "permanent_strain_m_per_m",
        "hygro_strain_m_per_m",
        "diameter_m",
        "hardness_hardness_units",
    ] {
        assert!(v["lanes"][0].get(k).is_some(), "age lane lacks {k}");
    }
    let (_, out, _) = run(&["fit", "--json"]);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    for k in [
        "position_m",
        "params",
        "uncertainty",
        "rmse_noise_units",
        "converged",
        "strain_at_unwind_m_per_m",
    ] {
        assert!(v["lanes"][0].get(k).is_some(), "fit lane lacks {k}");
    }
    assert!(v["spread_m_per_m"].is_number());
    let (code, out, _) = run(&["diagnose", "--json"]);
    assert_eq!(code, 1, "findings exit with 1");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let f = &v["findings"][0];
    for k in ["defect", "likelihood", "evidence", "lanes", "corrections"] {
        assert!(f.get(k).is_some(), "finding lacks {k}");
    }
    assert!(f["corrections"][0].get("after").is_some());
    let a = &f["attribution"];
    let sum: f64 = a["shares"]
        .as_array()
        .unwrap()
        .iter()
        .map(|c| c["contribution"].as_f64().unwrap())
        .sum();
    let total = a["value"].as_f64().unwrap() - a["value_without_sources"].as_f64().unwrap();
    assert!((sum - total).abs() <= 1e-9 * total.abs().max(1e-9));
    assert!(v["safety"].as_str().unwrap().contains("Safety"));
}

#[test]
fn same_input_gives_the_same_bytes() {
    for args in [
        &["diagnose", "--json"][..],
        &["fit"][..],
        &[
            "age",
            "--json",
            "field_cases/kestrel_coated_cold_to_humid.yaml",
        ][..],
    ] {
        let a = run(args).1;
        let b = run(args).1;
        assert_eq!(a, b, "{args:?}");
    }
}

#[test]
fn diagnose_writes_a_whole_report_and_advises_safely() {
    let dir = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-report-{}", std::process::id()));
    let (code, out, err) = run(&["diagnose", "--out", dir.to_str().unwrap()]);
    assert_eq!(code, 1, "{err}");
    assert!(out.contains("Safety:"));
    let names: Vec<String> = std::fs::read_dir(&dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    assert_eq!(names.len(), 3, "{names:?}");
    assert!(names.iter().all(|n| !n.ends_with(".tmp")));
    let md = std::fs::read_to_string(dir.join("NVP-PM3-24117-R06.md")).unwrap();
    assert!(md.contains("## Root cause and corrections") && md.contains("Safety"));
    let html = std::fs::read_to_string(dir.join("NVP-PM3-24117-R06.html")).unwrap();
    assert!(html.contains("<svg") && html.trim_end().ends_with("</html>"));
    assert!(dir.join("NVP-PM3-24117-R06.json").exists());
}

#[test]
fn whatif_compares_before_and_after() {
    // the demo's lighter nip still leaves likely defects: exit 1, as diagnose with findings
    let (code, out, err) = run(&["whatif", "--set", "winding.nip=4 pli"]);
    assert_eq!(code, 1, "{err}");
    assert!(out.contains("->") && out.contains("Safety"));
    let (code, _, _) = run(&["whatif"]);
    assert_eq!(code, 2, "whatif without --set is a usage error");
}

#[test]
fn triage_ranks_rolls_and_reports_bad_files() {
    let (code, out, err) = run(&["triage", "field_cases", "no/such.yaml"]);
    assert_eq!(code, 2, "a bad file exits 2 after the rest: {err}");
    assert!(
        out.contains("NVP-PM3-24117-R06")
            && out.contains("KCP-CM2-8841-R03")
            && out.contains("HGB-BM1-5520-R11")
    );
    assert!(
        out.contains("Not diagnosed") && out.contains("no/such.yaml: the case file does not exist"),
        "a bad file is listed with its whole message, not fatal: {out}"
    );
}

/// The same roll gives the same answer whatever the command: `fit`, `diagnose` and `triage` wind
/// at one resolution (the winding model's default nodes) and report the same length spread at
/// unwind, to the last digit (common practice: a result must not depend on how it is asked for).
#[test]
fn fit_diagnose_and_triage_report_the_same_spread() {
    let f = "field_cases/kestrel_coated_cold_to_humid.yaml";
    let spread = |args: &[&str]| -> f64 {
        let (_, out, err) = run(args);
        let v: serde_json::Value =
            serde_json::from_str(&out).unwrap_or_else(|e| panic!("{e}: {err}"));
        let s = if v["rolls"].is_array() {
            &v["rolls"][0]["spread_mm_per_m"]
        } else {
            &v["spread_mm_per_m"]
        };
        s.as_f64().unwrap_or_else(|| panic!("{args:?}: {s}"))
    };
    let fit = spread(&["--json", "fit", f]);
    let diagnose = spread(&["--json", "diagnose", f]);
    let triage = spread(&["--json", "triage", f]);
    assert!(fit > 0.5, "the coated roll's edges are long: {fit}");
    assert_eq!(
        fit.to_bits(),
        diagnose.to_bits(),
        "fit {fit}, diagnose {diagnose}"
    );
    assert_eq!(
        fit.to_bits(),
        triage.to_bits(),
        "fit {fit}, triage {triage}"
    );
}

#[test]
fn check_warns_of_surveys_past_the_storage_history_as_diagnose_does() {
    // the demo stores 31 d; a survey at 300 d, or surveys with no storage at all, leave a gap
    // that every run fills with assumed conditions
    for (set, reach, covers) in [
        ("profiles[3].age=300 d", "300.0 d", "31.0 d"),
        ("storage=[]", "31.0 d", "0.0 d"),
    ] {
        let warning = format!("measurements reach {reach} but storage history covers {covers}");
        // warnings go to standard error, as every command's do
        let (code, _, err) = run(&["check", "--set", set]);
        assert_eq!(code, 0, "{err}");
        assert!(err.contains(&format!("warning: {warning}")), "{err}");
        let (_, json, err) = run(&["check", "--json", "--set", set]);
        let v: serde_json::Value = serde_json::from_str(&json).expect(&err);
        let warnings = v["cases"][0]["warnings"].as_array().expect("warnings");
        assert!(
            warnings
                .iter()
                .any(|w| w.as_str().is_some_and(|w| w.starts_with(&warning))),
            "{warnings:?}"
        );
    }
    let (code, _, err) = run(&["check"]);
    assert_eq!(code, 0, "{err}");
    assert!(!err.contains("storage history covers"), "{err}");
}

/// A winding grid coarser than the default is warned of in text and JSON, with how far such
/// grids are from converged (the soft study roll against 12801 nodes, benches/numpy_hakiel:
/// 9.9 % off at 51 nodes, 0.33 % at 401); the default grid carries no such warning.
#[test]
fn stress_on_a_coarse_grid_says_it_is_not_converged() {
    let (code, text, err) = run(&["stress", "--nodes", "51"]);
    assert_eq!(code, 0, "{err}");
    let all = format!("{text}{err}");
    assert!(
        all.contains("--nodes 51") && all.contains("not converged"),
        "{all}"
    );
    let (_, json, _) = run(&["stress", "--nodes", "51", "--json"]);
    let v: serde_json::Value = serde_json::from_str(&json).unwrap();
    let warned = v["warnings"].as_array().unwrap();
    assert!(
        warned
            .iter()
            .any(|w| w.as_str().unwrap().contains("not converged")),
        "{warned:?}"
    );
    let (_, json, _) = run(&["stress", "--json"]);
    assert!(!json.contains("not converged"));
}

/// Temperatures print to a tenth of a degree in both unit systems (a stretch given as "6 C" was
/// "6.000 C" and "17.00 C"): the demo's storage at 17, 6 and 24 C, and the same in F by
/// F = 9/5 C + 32 (NIST SP 811, appendix B.8: 62.6, 42.8 and 75.2 F).
#[test]
fn temperatures_print_to_a_tenth_of_a_degree() {
    let (code, si, err) = run(&["check", "--width", "200"]);
    assert_eq!(code, 0, "{err}");
    for t in ["17.0 C", "6.0 C", "24.0 C"] {
        assert!(si.contains(&format!(" {t} ")), "{t}: {si}");
    }
    let (code, us, err) = run(&["check", "--units", "us", "--width", "200"]);
    assert_eq!(code, 0, "{err}");
    for t in ["62.6 F", "42.8 F", "75.2 F"] {
        assert!(us.contains(&format!(" {t} ")), "{t}: {us}");
    }
    assert!(!si.contains("6.000 C") && !si.contains("17.00 C"), "{si}");
}

/// `--units us` reaches the notes and warnings (they said mm, um, C and g/m2 whatever the
/// units): the demo's loose-wraps and condensation warnings and its resolution note give lengths
/// in in or mil and temperatures in F (6 C = 42.8 F, F = 9/5 C + 32: NIST SP 811, appendix B.8);
/// SI output and the JSON's words stay as they were.
#[test]
fn us_units_reach_notes_and_warnings() {
    let (_, _, us) = run(&["diagnose", "--units", "us"]);
    assert!(us.contains("came in at 42.8 F"), "{us}");
    assert!(us.contains("worst at 0.5 in"), "{us}");
    assert!(us.contains("caliper read to 0.01969 mil"), "{us}");
    for si in [
        " mm", " um", " C,", " C:", " C)", "g/m2", " MPa", " kPa", " m/s",
    ] {
        assert!(!us.contains(si), "{si} in US output: {us}");
    }
    let (_, _, si) = run(&["diagnose"]);
    for s in [
        "came in at 6.0 C",
        "worst at 12 mm",
        "caliper read to 0.5 um",
        "(8 g/m2",
    ] {
        assert!(si.contains(s), "{s}: {si}");
    }
    let (_, out, _) = run(&["diagnose", "--units", "us", "--json"]);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let w = v["warnings"].to_string();
    assert!(
        w.contains("came in at 6.0 C") && w.contains("worst at 12 mm"),
        "{w}"
    );
    // the case's own warnings too: a nip far above the web tension
    let nip = ["--set", "winding.nip=40 pli"];
    let (_, _, us) = run(&["check", "--units", "us", nip[0], nip[1]]);
    assert!(us.contains("friction x nip (18.00 pli)"), "{us}");
    let (_, out, _) = run(&["check", "--units", "us", "--json", nip[0], nip[1]]);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let w = v["cases"][0]["warnings"].to_string();
    assert!(w.contains("friction x nip (3152 N/m)"), "{w}");
}
