//! Condensation on a cold roll brought into warm humid air: warned whenever the new air's dew
//! point (Magnus form, Alduchov and Eskridge 1996) is above the roll's temperature and a face is
//! not wrapped in film; never otherwise.

use rollsleuth::case;
use rollsleuth::storage::condensation::{check, dew_point_k};
use rollsleuth::units::ZERO_C_K;

fn kestrel(sets: &[&str]) -> case::Case {
    let s: Vec<String> = sets.iter().map(|s| s.to_string()).collect();
    case::load_file(
        std::path::Path::new("field_cases/kestrel_coated_cold_to_humid.yaml"),
        &s,
    )
    .unwrap()
}

#[test]
fn a_cold_roll_unwrapped_in_humid_air_condenses() {
    // 40 F (4.4 C) warehouse, then 81 F (27.2 C) at 78 % RH unwrapped: dew point 23.0 C
    let c = kestrel(&[]);
    let found = check(&c.storage);
    assert_eq!(found.len(), 1, "{found:?}");
    let f = found[0];
    assert_eq!(f.stretch, 1);
    assert!(
        (f.dew_point_k - ZERO_C_K - 23.0).abs() < 0.2,
        "{}",
        f.dew_point_k
    );
    assert!(f.water_kg_m2 > 0.0 && f.wet_s > 0.0);
    assert!(f.barrel && f.ends);
    // the warning reaches the command's output
    let o = std::process::Command::new(env!("CARGO_BIN_EXE_rollsleuth"))
        .args(["age", "field_cases/kestrel_coated_cold_to_humid.yaml"])
        .output()
        .unwrap();
    assert!(String::from_utf8_lossy(&o.stderr).contains("dew point"));
}

#[test]
fn film_wrap_or_dry_air_or_a_warm_roll_gives_none() {
    let film = kestrel(&["storage[1].barrel_wrap=film", "storage[1].end_wrap=film"]);
    assert!(check(&film.storage).is_empty());
    // 27.2 C at 25 % RH: dew point about 5.7 C (Magnus), above 4.4 C: still some
    let dryish = kestrel(&["storage[1].rh=25 %"]);
    assert!(dew_point_k(dryish.storage[1].temperature_k, 0.25) - ZERO_C_K > 4.4);
    let dry = kestrel(&["storage[1].rh=15 %"]);
    assert!(check(&dry.storage).is_empty(), "dew point below the roll");
    let warm = kestrel(&["storage[0].temperature=30 C"]);
    assert!(check(&warm.storage).is_empty());
}

/// A trace of condensation is not warned of: a roll at 10 C brought into 22 C at 50 % RH (dew
/// point 11.1 C, Magnus form) condenses for minutes only, far less water than a moisture meter
/// resolves in the outer wraps (0.1 point, common practice); the Kestrel roll's stretch is warned.
#[test]
fn a_trace_of_condensation_is_not_a_warning() {
    let trace = kestrel(&[
        "storage[0].temperature=10 C",
        "storage[1].temperature=22 C",
        "storage[1].rh=50 %",
    ]);
    let found = check(&trace.storage);
    assert_eq!(found.len(), 1, "water does condense: {found:?}");
    let rise = found[0].outer_rise_pct(trace.material.density_kg_m3);
    assert!(rise < rollsleuth::limits::CONDENSATION_SHOWS_PCT, "{rise}");
    assert!(rollsleuth::limits::condensation(&trace.storage, &trace.material).is_empty());
    let c = kestrel(&[]);
    assert_eq!(
        rollsleuth::limits::condensation(&c.storage, &c.material).len(),
        1
    );
}
