//! Outputs do not depend on the number of threads: lanes are fitted in parallel (rayon) and the
//! results are taken in lane order.

use std::process::Command;

const BIN: &str = env!("CARGO_BIN_EXE_rollsleuth");

fn run(threads: &str, args: &[&str]) -> Vec<u8> {
    let out = Command::new(BIN)
        .args(args)
        .env("RAYON_NUM_THREADS", threads)
        .output()
        .expect("runs rollsleuth");
    assert!(out.status.code().is_some_and(|c| c <= 1), "{args:?}");
    out.stdout
}

/// `fit --json` of a field case gives the same bytes on one thread and on two.
#[test]
fn fit_json_is_the_same_for_one_and_two_threads() {
    let case = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/field_cases/kestrel_coated_cold_to_humid.yaml"
    );
    let args = ["--json", "fit", case];
    let one = run("1", &args);
    assert!(!one.is_empty());
    assert_eq!(one, run("2", &args));
}
