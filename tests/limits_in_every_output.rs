//! A result beyond a physical limit is never silent: every command that computes it says so as a
//! `warning:` line on standard error, in its JSON (`warnings`), in the triage table and CSV, and
//! in the root-cause report. The limit checked here is the lift-off speed: a layer wound at
//! speed v carries a centrifugal hoop stress rho v^2 (Timoshenko and Goodier, Theory of
//! Elasticity, rotating disk), so above v = sqrt(sigma_wound / rho) the wound-in stress cannot
//! hold it on the roll. A changed roll whose measured surveys the model no longer explains
//! exits 3, a result like 0 and 1 (README, exit codes); bad input would be 2.

use std::process::Command;

mod common;

// above the demo's lift-off speed of about 160 m/s (its 2 pli and nip part, see the last test)
const FAST: &str = "winding.speed=200 m/s";

fn run(args: &[&str]) -> (i32, String, String) {
    let o = Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(args)
        .output()
        .expect("binary runs");
    (
        o.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&o.stdout).into_owned(),
        String::from_utf8_lossy(&o.stderr).into_owned(),
    )
}

#[test]
fn every_command_warns_when_the_roll_is_wound_above_lift_off() {
    for cmd in ["stress", "age", "fit", "diagnose", "whatif"] {
        let (code, _, err) = run(&[cmd, "--set", FAST]);
        assert!(matches!(code, 0 | 1 | 3), "{cmd}: {err}");
        assert!(
            err.contains("warning:") && err.contains("lift-off speed"),
            "{cmd} text: {err}"
        );
        let (_, out, _) = run(&[cmd, "--json", "--set", FAST]);
        let v: serde_json::Value = serde_json::from_str(&out).expect(cmd);
        let w = v["warnings"].as_array().expect("warnings array");
        assert!(
            w.iter().any(|x| x.as_str().unwrap().contains("lift-off")),
            "{cmd} JSON: {w:?}"
        );
    }
    // a roll well inside every limit (the Harrowgate field case with its ends wrapped, at the
    // grade's creep) has no warning at all; with its ends open to the dry store, its edge lanes
    // dry and their outer wraps lose all interlayer pressure, which is the one warning of its
    // diagnosis
    let harrowgate = "field_cases/harrowgate_board_dry_store.yaml";
    let warnings = |cmd: &str, sets: &[&str]| {
        let mut args = vec![cmd, "--json", harrowgate];
        for s in sets {
            args.extend(["--set", s]);
        }
        let (_, out, _) = run(&args);
        let v: serde_json::Value = serde_json::from_str(&out).unwrap();
        v["warnings"].as_array().unwrap().clone()
    };
    let w = warnings("age", &["storage[0].end_wrap=film"]);
    assert_eq!(w.len(), 0, "{w:?}");
    let w = warnings("diagnose", &[]);
    assert_eq!(w.len(), 1, "{w:?}");
    assert!(w[0].as_str().unwrap().contains("loose"), "{w:?}");
}

#[test]
fn case_warnings_reach_diagnose_and_its_json() {
    // friction x nip far above the web tension: measured nip-induced tension saturates there
    // (Good, Wu and Fikes 1994, from memory; the 2.5x threshold is common practice), which the
    // case loader warns about
    let (_, _, err) = run(&["diagnose", "--set", "winding.nip=40 pli"]);
    assert!(
        err.contains("warning:") && err.contains("saturates"),
        "{err}"
    );
    let (_, out, _) = run(&["diagnose", "--json", "--set", "winding.nip=40 pli"]);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert!(
        v["warnings"].to_string().contains("saturates"),
        "{}",
        v["warnings"]
    );
}

#[test]
fn the_report_and_triage_carry_the_warning() {
    let d = tempfile::tempdir().unwrap();
    let out = d.path().join("out");
    let (code, _, err) = run(&["diagnose", "--set", FAST, "--out", out.to_str().unwrap()]);
    assert!(matches!(code, 0 | 1 | 3), "{err}");
    let md = std::fs::read_to_string(out.join("NVP-PM3-24117-R06.md")).unwrap();
    assert!(
        md.contains("warning:") && md.contains("lift-off"),
        "report lacks the warning"
    );
    let case = d.path().join("fast.yaml");
    let demo = std::fs::read_to_string("field_cases/nordvik_pm3_caliper_band.yaml").unwrap();
    let speed = demo
        .lines()
        .find(|l| l.trim_start().starts_with("speed:"))
        .expect("demo states its speed");
    std::fs::write(&case, demo.replacen(speed, "  speed: \"200 m/s\"", 1)).unwrap();
    let (_, table, err) = run(&["triage", case.to_str().unwrap()]);
    assert!(
        format!("{table}{err}").contains("lift-off"),
        "triage table: {table}{err}"
    );
    let (_, csv, _) = run(&["triage", "--format", "csv", case.to_str().unwrap()]);
    let header: Vec<&str> = csv.lines().next().unwrap().split(',').collect();
    assert!(header.contains(&"warnings"), "{csv}");
    assert!(csv.contains("lift-off"), "{csv}");
}

/// A hardness scale has no negative readings (rebound and durometer scales run from 0; common
/// practice). A stiff stack on an edge lane that dries at an open end loses all its surface-zone
/// pressure, and the log map H = a + b ln P then predicts about -94 units: `age` and `fit` say
/// so in their text and JSON, and `age` names the two edge lanes.
#[test]
fn a_hardness_below_the_scale_is_a_warning() {
    let case = "field_cases/harrowgate_board_dry_store.yaml";
    let stiff = "material.radial_modulus=20 MPa";
    for cmd in ["age", "fit"] {
        let (code, _, err) = run(&[cmd, case, "--set", stiff]);
        assert!(matches!(code, 0 | 1 | 3), "{cmd}: {err}");
        // the text is wrapped to the terminal's width
        let err = err.split_whitespace().collect::<Vec<_>>().join(" ");
        assert!(
            err.contains("warning:") && err.contains("below the bottom of any hardness scale"),
            "{cmd} text: {err}"
        );
        let (_, out, _) = run(&[cmd, "--json", case, "--set", stiff]);
        let v: serde_json::Value = serde_json::from_str(&out).expect(cmd);
        let w = v["warnings"].as_array().expect("warnings array");
        assert!(
            w.iter()
                .any(|x| x.as_str().unwrap().contains("hardness scale")),
            "{cmd} JSON: {w:?}"
        );
    }
    // a reading there is judged against the scale's bottom, 0, which is all the model can say
    // (the instrument reads its lowest): its residual is (0 - measured) / repeatability, and a
    // lane's misfit is the root mean square of its residuals as before
    let (_, out, _) = run(&["fit", "--json", case, "--set", stiff]);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let sigma = v["noise"]["hardness_hardness_units"].as_f64().unwrap();
    let mut below = 0;
    for l in v["lanes"].as_array().unwrap() {
        let r = l["residuals"].as_array().unwrap();
        for x in r {
            let p = x["predicted_hardness_units"].as_f64();
            if let Some(p) = p.filter(|p| *p < 0.0) {
                below += 1;
                let m = x["measured_hardness_units"].as_f64().unwrap();
                let z = x["normalised_noise_units"].as_f64().unwrap();
                assert!(((0.0 - m) / sigma - z).abs() < 1e-12, "{x}");
                assert!(((p - m) / sigma).abs() > 10.0 * z.abs(), "{x}");
            }
        }
        let z: Vec<f64> = (r.iter())
            .map(|x| x["normalised_noise_units"].as_f64().unwrap())
            .collect();
        let rms = (z.iter().map(|x| x * x).sum::<f64>() / z.len().max(1) as f64).sqrt();
        let misfit = l["rmse_noise_units"].as_f64().unwrap();
        assert!((misfit - rms).abs() <= 1e-12 * rms.max(1.0), "{l}");
    }
    assert!(
        below >= 2,
        "the two edge lanes' readings fall below the scale"
    );
    let (_, _, err) = run(&["age", case, "--set", stiff]);
    assert!(err.contains("2 lanes (worst at 12 mm)"), "{err}");
}

/// A roll inside every limit gets a diagnosis with no warning at all: the demo roll without its
/// measurements (the grade's creep), kept in film through storage and stored on end.
#[test]
fn a_roll_inside_every_limit_is_diagnosed_without_a_warning() {
    let mut sets = Vec::new();
    for i in 0..3 {
        sets.push(format!("storage[{i}].barrel_wrap=film"));
        sets.push(format!("storage[{i}].end_wrap=film"));
        sets.push(format!("storage[{i}].stance=on_end"));
    }
    let sets: Vec<&str> = sets.iter().map(String::as_str).collect();
    let c = common::demo_without_profiles(&sets);
    let d = common::diagnose_at(&c, rollsleuth::winding::DEFAULT_NODES, false);
    let w = rollsleuth::report::words::warnings(&d);
    assert!(w.is_empty(), "{w:?}");
}

/// A converting tension that alone stresses the web beyond its MD tensile strength breaks the web
/// at unwind (the tensile strength is the stress at break: ISO 1924-2 defines it per width, so
/// the stress is the tension over the caliper). The demo's newsprint, 4.5 kN/m over its caliper,
/// is past its 40 MPa default strength; every command that runs the roll to unwind says so.
#[test]
fn every_command_warns_when_the_converting_tension_breaks_the_web() {
    let set = "converting.tension=4.5 kN/m";
    for cmd in ["age", "fit", "diagnose", "whatif"] {
        let (code, _, err) = run(&[cmd, "--set", set]);
        assert!(code <= 1, "{cmd}: {err}");
        assert!(err.contains("the web breaks"), "{cmd} text: {err}");
        let (_, out, _) = run(&[cmd, "--json", "--set", set]);
        let v: serde_json::Value = serde_json::from_str(&out).expect(cmd);
        assert!(
            v["warnings"].to_string().contains("the web breaks"),
            "{cmd} JSON: {}",
            v["warnings"]
        );
    }
    let (_, _, err) = run(&["diagnose"]);
    assert!(!err.contains("the web breaks"), "{err}");
}

/// `whatif` runs two rolls, and each one's limits are its own: the measured Harrowgate roll's
/// loose outer wraps (its one warning, above) and the changed roll's winding above lift-off
/// both show, each saying which roll it is about, in the text and in the JSON. Like `diagnose`,
/// it exits 1 while the changed roll still has likely defects, and its JSON carries the safety
/// note.
#[test]
fn whatif_warns_for_both_rolls_and_says_which() {
    let h = "field_cases/harrowgate_board_dry_store.yaml";
    let (code, out, err) = run(&["whatif", h, "--set", FAST]);
    assert_eq!(code, 1, "{out}");
    // warnings go to standard error, wrapped to the table width: each warning, its lines joined
    let flat = err.split_whitespace().collect::<Vec<_>>().join(" ");
    let line = |tag: &str, what: &str| {
        (flat.split("warning: ").skip(1))
            .any(|w| w.starts_with(&format!("{tag}: ")) && w.contains(what))
    };
    assert!(line("as measured", "outer wraps"), "{err}");
    assert!(line("as changed", "lift-off"), "{err}");
    let (_, out, _) = run(&["whatif", "--json", h, "--set", FAST]);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let has = |k: &str, what: &str| v[k].to_string().contains(what);
    assert!(has("warnings_before", "loose") && !has("warnings_before", "lift-off"));
    assert!(has("warnings_after", "lift-off"));
    assert!(has("warnings", "as measured: ") && has("warnings", "as changed: "));
    assert!(v["safety"].as_str().unwrap().contains("qualified people"));
}

/// The lift-off speed is that of the stress the winder puts in, before the spin takes its part:
/// sqrt(sigma / rho) with sigma the web tension plus the nip-induced part (friction x nip load;
/// Good, Wu and Fikes 1994) over the caliper (thin spinning ring; Timoshenko and Goodier, as
/// above). On the demo (2 pli, no nip) wound at 183 m/s, far past it, the lift-off speed is the
/// tension's own, about 88 m/s, not the zero that the spun-off wound-in tension would give;
/// with its 10 pli nip at friction 0.45 the stress is (2 + 4.5) pli over the caliper. 1 pli =
/// 175.1268 N/m (NIST SP 811, B.8).
#[test]
fn the_lift_off_speed_is_the_winders_stress_before_the_spin() {
    let lift_off = |sets: &[&str]| {
        let mut args = vec!["stress", "--json"];
        for s in sets {
            args.extend(["--set", s]);
        }
        let (_, out, err) = run(&args);
        let v: serde_json::Value = serde_json::from_str(&out).expect(&err);
        v["lift_off_speed_m_s"].as_f64().unwrap()
    };
    let c = rollsleuth::case::load_demo(&[]).unwrap();
    let caliper = rollsleuth::lanes::build(&c).mean_caliper_m;
    let rho = c.material.density_kg_m3;
    let expect = |pli: f64| (pli * 175.126_8 / caliper / rho).sqrt();
    let bare = lift_off(&["winding.nip=0 N/m", "winding.speed=11000 m/min"]);
    assert!((bare / expect(2.0) - 1.0).abs() < 1e-4, "{bare}");
    assert!((bare - 88.0).abs() < 1.0, "{bare}");
    let nipped = lift_off(&[]);
    assert!((nipped / expect(6.5) - 1.0).abs() < 1e-4, "{nipped}");
}

/// Under a taper the outer wraps are wound at the least tension, so they lift off first: the
/// lift-off speed is that of the lowest winder stress over the build (as above), here the taper's
/// outer 0.5 pli with no nip.
#[test]
fn under_a_taper_the_lift_off_speed_is_that_of_the_least_tension() {
    let taper = "winding={taper: [{diameter: \"102 mm\", tension: \"3 pli\"}, {diameter: \"1000 mm\", tension: \"0.5 pli\"}], nip: \"0 N/m\", speed: \"1800 m/min\"}";
    let (_, out, err) = run(&["stress", "--json", "--set", taper]);
    let v: serde_json::Value = serde_json::from_str(&out).expect(&err);
    let got = v["lift_off_speed_m_s"].as_f64().unwrap();
    let c = rollsleuth::case::load_demo(&[]).unwrap();
    let caliper = rollsleuth::lanes::build(&c).mean_caliper_m;
    let want = (0.5 * 175.126_8 / caliper / c.material.density_kg_m3).sqrt();
    assert!((got / want - 1.0).abs() < 1e-4, "{got} against {want}");
}
