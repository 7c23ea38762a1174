//! The kernels built for AVX2 (the winding's sweep and strain pass, the storage kernel; chosen at
//! run time where the processor has it) give the generic build's bits: a diagnosis of a field
//! case and a triage of the three, with and without `ROLLSLEUTH_GENERIC`, print the same bytes.
//! IEEE 754 division, square root, product and sum are correctly rounded whatever the vector
//! width (IEEE 754-2008, clause 5.4), and nothing is fused into a multiply-add. On a processor
//! without AVX2 both runs take the generic build and the check holds trivially.

use std::process::Command;

fn run(args: &[&str], generic: bool) -> Vec<u8> {
    let mut cmd = Command::new(env!("CARGO_BIN_EXE_rollsleuth"));
    cmd.current_dir(env!("CARGO_MANIFEST_DIR"))
        .args(["--json", "--quiet"])
        .args(args)
        .env("RAYON_NUM_THREADS", "2");
    if generic {
        cmd.env(rollsleuth::pack::GENERIC_ENV, "1");
    } else {
        cmd.env_remove(rollsleuth::pack::GENERIC_ENV);
    }
    let out = cmd.output().expect("runs");
    // 0: nothing to flag, 1: findings to flag; anything else is a failure
    assert!(
        matches!(out.status.code(), Some(0 | 1)),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    out.stdout
}

#[test]
fn avx2_and_generic_builds_print_the_same_bytes() {
    #[cfg(target_arch = "x86_64")]
    let wide = std::arch::is_x86_feature_detected!("avx2");
    #[cfg(not(target_arch = "x86_64"))]
    let wide = false;
    if !wide {
        eprintln!("no AVX2 on this processor: both runs take the generic build");
    }
    for args in [
        &["diagnose", "field_cases/kestrel_coated_cold_to_humid.yaml"][..],
        &[
            "triage",
            "field_cases/harrowgate_board_dry_store.yaml",
            "field_cases/kestrel_coated_cold_to_humid.yaml",
            "field_cases/nordvik_pm3_caliper_band.yaml",
        ][..],
    ] {
        let (wide, generic) = (run(args, false), run(args, true));
        assert!(!wide.is_empty());
        assert!(wide == generic, "{args:?}: the two builds differ");
    }
}
