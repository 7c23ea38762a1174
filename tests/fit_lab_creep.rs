//! Laboratory creep curves in a case: the Burgers law fitted to them (times shifted to the
//! reference atmosphere, 23 C and 50 % RH as in TAPPI T 402, with an Arrhenius shift) becomes
//! the grade's creep for the per-lane fit.
//! The curves are generated here from known parameters (the Burgers compliance of Findley, Lai
//! and Onaran 1976), so the check is that the known parameters come back.

use approx::assert_relative_eq;
use rollsleuth::case::{self, Burgers, LabCreep};
use rollsleuth::fit::with_lab_creep;
use rollsleuth::storage::{arrhenius_shift, creep_compliance};

fn curve(b: &Burgers, e: f64, stress: f64, t_k: f64, ea: f64) -> LabCreep {
    let a = arrhenius_shift(ea, t_k);
    let times: Vec<f64> = (0..20).map(|k| 600.0 * 1.7f64.powi(k)).collect();
    LabCreep {
        direction: "md".into(),
        stress_pa: stress,
        temperature_k: t_k,
        rh: 0.5,
        strains: times
            .iter()
            .map(|t| stress * creep_compliance(b, e, t / a))
            .collect(),
        times_s: times,
    }
}

#[test]
fn lab_creep_curves_set_the_grade_md_creep() {
    let mut c = case::load_demo(&[]).unwrap();
    let truth = Burgers {
        delayed: 0.42,
        retardation_s: 1.3 * 86400.0,
        viscous_time_s: 260.0 * 86400.0,
    };
    let ea = c.material.creep.activation_energy_j_mol;
    c.lab_creep = vec![
        curve(&truth, 5.5e9, 8e6, 296.15, ea),
        curve(&truth, 5.5e9, 12e6, 308.15, ea),
    ];
    let (fitted, notes) = with_lab_creep(&c).unwrap();
    let b = fitted.material.creep.md;
    assert_relative_eq!(b.delayed, truth.delayed, max_relative = 0.02);
    assert_relative_eq!(b.retardation_s, truth.retardation_s, max_relative = 0.02);
    assert_relative_eq!(b.viscous_time_s, truth.viscous_time_s, max_relative = 0.02);
    assert!(notes
        .iter()
        .any(|n| matches!(n, rollsleuth::note::Note::LabCreep { .. })));
    // radial creep untouched
    assert_eq!(fitted.material.creep.radial, c.material.creep.radial);
}

#[test]
fn lab_creep_in_a_case_file_is_read_and_checked() {
    let demo = std::fs::read_to_string("field_cases/nordvik_pm3_caliper_band.yaml").unwrap();
    let block = "lab_creep:\n  - { direction: md, stress: \"8 MPa\", time_unit: h, times: [0.1, 1, 10, 100], strains: [0.00150, 0.00165, 0.00190, 0.00215] }\n";
    let dir = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"))
        .join(format!("rollsleuth-lab-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let good = dir.join("lab.yaml");
    std::fs::write(&good, format!("{demo}{block}")).unwrap();
    let o = std::process::Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(["fit", good.to_str().unwrap()])
        .output()
        .unwrap();
    assert_eq!(
        o.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&o.stderr)
    );
    // notes go to standard error (the results table to standard output)
    assert!(String::from_utf8_lossy(&o.stderr).contains("md creep from 1 lab curve"));
    let bad = dir.join("lab_bad.yaml");
    std::fs::write(
        &bad,
        format!("{demo}{}", block.replace("0.00215]", "0.00215, 0.0022]")),
    )
    .unwrap();
    let o = std::process::Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(["check", bad.to_str().unwrap()])
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(2));
    let err = String::from_utf8_lossy(&o.stderr);
    assert!(
        err.contains("lab_creep[0].strains") && err.contains("4 times but 5 strains"),
        "{err}"
    );
}
