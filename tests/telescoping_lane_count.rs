//! Telescoping is decided by the interlayer pressure of the outer wraps at the end of storage
//! (`surface_pressure_end_kpa`), the width-weighted mean over the lanes: axial slip of the
//! outer wraps is resisted by friction over the whole face, friction times the interlayer
//! pressure integrated over the width (Coulomb's law of friction, Coulomb 1785). The lowest
//! lane it replaced was a 25 mm edge strip at every lane count, so one strip decided the roll.
//! A mean over the width in metres does not change with the lane count once the lanes resolve
//! the pressure's pattern across the width (sampling; common practice).
//!
//! The roll: the board field case (drying edges, readings 75-150 mm apart), diagnosed as the
//! command line does without the what-if re-runs.

use rollsleuth::case;
use rollsleuth::diagnose::{diagnose, DiagnoseOptions};
use rollsleuth::rules;
use rollsleuth::vocab::Feature;

fn feature_at(count: usize, f: Feature) -> f64 {
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("field_cases/harrowgate_board_dry_store.yaml");
    let c = case::load_file(&path, &[format!("lanes.count={count}")]).expect("loads");
    let opt = DiagnoseOptions {
        what_if: false,
        ..DiagnoseOptions::default()
    };
    let d = diagnose(&c, &rules::load_default().unwrap(), &opt).expect("diagnoses");
    d.features.get(f)
}

/// The width-weighted surface pressure agrees within 5 % over 10-30 lanes (measured: 22.59-23.15
/// kPa, 2.5 %).
#[test]
fn the_surface_pressure_telescoping_reads_agrees_across_lane_counts() {
    let v: Vec<(usize, f64)> = [10, 16, 24, 30]
        .into_iter()
        .map(|n| (n, feature_at(n, Feature::SurfacePressureEndKpa)))
        .collect();
    eprintln!("{v:?}");
    let lo = v.iter().map(|x| x.1).fold(f64::INFINITY, f64::min);
    let hi = v.iter().map(|x| x.1).fold(0.0, f64::max);
    assert!(lo > 0.0 && (hi - lo) / lo < 0.05, "{v:?}");
}
