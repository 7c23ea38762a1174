//! Air entrained at winding (issue 18): the film against the Knox and Sweeney (1971) foil
//! bearing and Martin's (1916) nip film, evaluated by a Python script, and an invented fast, light
//! roll wound without a nip against the same roll wound slowly or with a nip.

mod common;

use rollsleuth::case::{self, Case, Tension, Winding};
use rollsleuth::diagnose::Diagnosis;
use rollsleuth::vocab::{Defect, Feature};
use rollsleuth::winding::air::{film_m, foil_bearing_film_m, nip_film_m, AIR_VISCOSITY_PA_S};

fn rows() -> Vec<(String, [f64; 5])> {
    let path = format!(
        "{}/tests/data/knox_sweeney/table.csv",
        env!("CARGO_MANIFEST_DIR")
    );
    std::fs::read_to_string(path)
        .unwrap()
        .lines()
        .skip(1)
        .map(|l| {
            let c: Vec<&str> = l.split(',').collect();
            let v = [1, 2, 3, 4, 5].map(|i| c[i].parse::<f64>().unwrap());
            (c[0].to_string(), v)
        })
        .collect()
}

#[test]
fn film_thickness_matches_knox_sweeney_and_martin() {
    // tests/data/knox_sweeney/table.csv
    let rows = rows();
    assert_eq!(rows.len(), 44);
    for (kind, [r, mu, u, t, h]) in rows {
        let got = if kind == "foil" {
            foil_bearing_film_m(r, mu, u, t)
        } else {
            nip_film_m(r, mu, u, t)
        };
        assert!(
            (got / h - 1.0).abs() < 1e-12,
            "{kind} {r} {u} {t}: {got} against {h}"
        );
    }
}

#[test]
fn a_nip_squeezes_the_film_and_a_light_nip_does_not_thicken_it() {
    // Martin's film with the lay-on roll against the foil bearing alone (the same table's forms)
    let w = |nip: f64| Winding {
        tension: Tension::Constant {
            tension_n_per_m: 300.0,
        },
        nip_n_per_m: nip,
        speed_m_s: 25.0,
    };
    let foil = foil_bearing_film_m(0.5, AIR_VISCOSITY_PA_S, 25.0, 300.0);
    assert_eq!(film_m(&w(0.0), 0.5, 300.0), foil);
    assert!(film_m(&w(1000.0), 0.5, 300.0) < 1e-6);
    assert_eq!(film_m(&w(1e-3), 0.5, 300.0), foil);
}

/// An invented light newsprint roll (45 g/m2 demo grade) wound at 1800 m/min without a nip.
fn invented(sets: &[&str]) -> Case {
    let mut all = vec![
        "profiles=[]".to_string(),
        "lanes.count=6".to_string(),
        "winding.nip=\"0 N/m\"".to_string(),
        "winding.speed=\"1800 m/min\"".to_string(),
        "storage=[{duration: \"5 d\", temperature: \"23 C\", rh: \"50 %\", barrel_wrap: film, end_wrap: film}]".to_string(),
    ];
    all.extend(sets.iter().map(|s| s.to_string()));
    let mut c = case::load_demo(&all).unwrap();
    c.complaint = None;
    c
}

fn run(c: &Case, what_if: bool) -> Diagnosis {
    common::diagnose_at(c, 121, what_if)
}

fn has_air(d: &Diagnosis) -> bool {
    d.findings
        .iter()
        .any(|f| f.defect == Defect::LooseOuterWraps)
}

#[test]
fn a_fast_light_roll_without_a_nip_has_loose_outer_wraps_from_air() {
    let d = run(&invented(&[]), true);
    println!(
        "film / roughness {:.2}, tension lost {:.3}",
        d.features.get(Feature::AirFilmRoughnessRatio),
        d.features.get(Feature::AirTensionLossRatio)
    );
    let f = d
        .findings
        .iter()
        .find(|f| f.defect == Defect::LooseOuterWraps)
        .unwrap_or_else(|| {
            panic!(
                "{:?}",
                d.findings.iter().map(|f| f.defect).collect::<Vec<_>>()
            )
        });
    assert!(f.mechanism.starts_with("Air"));
    for c in &f.corrections {
        println!("{:?}: {} -> {:?} kPa", c.action, c.before, c.after);
        assert_eq!(c.improves, Some(true), "{:?}", c.action);
    }
}

#[test]
fn the_same_roll_wound_slowly_has_no_air_finding() {
    let d = run(&invented(&["winding.speed=\"60 m/min\""]), false);
    assert!(!has_air(&d));
}

#[test]
fn the_same_roll_wound_with_a_nip_has_no_air_finding() {
    let d = run(&invented(&["winding.nip=\"1.75 kN/m\""]), false);
    assert!(d.features.get(Feature::AirFilmRoughnessRatio) < 1.0);
    assert!(!has_air(&d));
}

#[test]
fn air_lowers_the_outer_wraps_pressure_at_winding() {
    // the same roll with a rough enough web to vent the film: the air's loss is what differs
    let fast = run(&invented(&[]), false);
    let vented = run(&invented(&["material.roughness=\"100 um\""]), false);
    let p = |d: &Diagnosis| d.features.get(Feature::SurfacePressureEndKpa);
    assert!(p(&fast) < p(&vented), "{} against {}", p(&fast), p(&vented));
}

#[test]
fn air_that_takes_all_the_wound_in_tension_is_a_warning() {
    // 100 N/m at 2500 m/min: the film (about 0.4 mm at full diameter) takes more hoop strain
    // than the web tension gives; the ordinary fast roll keeps some
    let floats = invented(&[
        "winding.tension=\"100 N/m\"",
        "winding.speed=\"2500 m/min\"",
    ]);
    let notes = rollsleuth::limits::air_floats(&floats);
    assert!(matches!(
        notes.as_slice(),
        [rollsleuth::note::Note::Limit(
            rollsleuth::note::Limit::AirFloats { .. }
        )]
    ));
    assert!(rollsleuth::limits::air_floats(&invented(&[])).is_empty());
}
