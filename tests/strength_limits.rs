//! Strength limits and rules that respect their mechanism, on invented rolls. Comparison values
//! come from a closed form written out here (thin-ring buckling) or from the trade's
//! expectations (common practice).

mod common;

use rollsleuth::case::Case;
use rollsleuth::diagnose::Diagnosis;
use rollsleuth::rules;
use rollsleuth::vocab::{Defect, Feature, FeatureValues};

fn demo(sets: &[&str]) -> Case {
    common::demo_without_profiles(sets)
}

fn run(c: &Case) -> Diagnosis {
    common::diagnose_at(c, 121, false)
}

use common::defects;

const SHORT_STORE: &str = "storage=[{duration: \"10 d\", temperature: \"23 C\", rh: \"50 %\", barrel_wrap: paper, end_wrap: paper}]";

/// Thin-ring buckling p = 3 E I / r^3, I = t^3/12 (Timoshenko and Gere 1961, from memory), written
/// out here: a 76 mm paper core of 3 GPa with a 3 mm wall collapses near 0.42 MPa.
fn ring(e: f64, t: f64, r_outer: f64) -> f64 {
    let r = r_outer - t / 2.0;
    3.0 * e * (t * t * t / 12.0) / (r * r * r)
}

/// A weak core under high tension and nip gives a core-collapse finding; the same roll on a steel
/// core does not.
#[test]
fn weak_core_collapses_and_steel_core_does_not() {
    let sets = |core: &'static str| {
        vec![
            "roll.core_diameter=76 mm",
            core,
            "roll.width=400 mm",
            "lanes.count=4",
            "winding.tension=4 pli",
            "winding.nip=25 pli",
            SHORT_STORE,
        ]
    };
    let weak = demo(&sets(
        "roll.core={modulus: \"3 GPa\", wall: \"3 mm\", poisson: 0.3}",
    ));
    let p_cr = rollsleuth::winding::collapse_pressure(&weak.roll.core, 0.038, None).unwrap();
    assert!((p_cr / ring(3e9, 0.003, 0.038) - 1.0).abs() < 1e-12);
    let d = run(&weak);
    assert!(
        defects(&d).contains(&Defect::CoreCollapse),
        "core pressure ratio {}: {:?}",
        d.features.get(Feature::CorePressureRatio),
        defects(&d)
    );
    assert!(rollsleuth::report::words::warnings(&d)
        .iter()
        .any(|w| w.contains("collapse pressure")));
    let steel = demo(&sets(
        "roll.core={modulus: \"207 GPa\", wall: \"8 mm\", poisson: 0.3}",
    ));
    let d = run(&steel);
    assert!(
        !defects(&d).contains(&Defect::CoreCollapse),
        "{:?}",
        defects(&d)
    );
    assert!(d.features.get(Feature::CorePressureRatio) < 0.1);
}

/// The burst rule needs outer-wrap drying and a paper grade (common practice: only a hygroscopic
/// web shrinks on drying). On a feature set that fires it, removing the drying or the paper grade
/// removes it.
#[test]
fn burst_rule_needs_drying_and_paper() {
    let table = rules::load_default().unwrap();
    let bursts = |loss: f64, paper: f64| {
        let v = FeatureValues::from_fn(|f| match f {
            Feature::MdTensionStrengthRatio => 0.8,
            Feature::OuterMoistureLossPct => loss,
            Feature::PaperGrade => paper,
            _ => 0.0,
        });
        rules::evaluate(&table, &v)
            .iter()
            .any(|r| r.rule.defect == Defect::Bursts)
    };
    assert!(bursts(2.0, 1.0));
    assert!(!bursts(-1.0, 1.0));
    assert!(!bursts(2.0, 0.0));
}

/// No bursts on a roll that gained moisture (stored wet, outer wraps gain) or on a film roll,
/// both wound tight.
#[test]
fn no_bursts_on_a_wetting_roll_or_on_film() {
    let wet = demo(&[
        "lanes.count=5",
        "roll.width=500 mm",
        "winding.tension=4 pli",
        "storage=[{duration: \"20 d\", temperature: \"25 C\", rh: \"90 %\", barrel_wrap: none, end_wrap: none}]",
    ]);
    let d = run(&wet);
    assert!(d.features.get(Feature::OuterMoistureLossPct) < 0.0);
    assert!(!defects(&d).contains(&Defect::Bursts), "{:?}", defects(&d));
    let film = demo(&[
        "material={grade: film}",
        "lanes.count=5",
        "roll.width=500 mm",
        "winding.tension=1 pli",
        "storage=[{duration: \"20 d\", temperature: \"25 C\", rh: \"15 %\", barrel_wrap: none, end_wrap: none}]",
    ]);
    assert_eq!(film.material.hygro_md_per_pct, 0.0);
    assert_eq!(film.material.creep.mechanosorptive_per_pct, 0.0);
    let d = run(&film);
    assert_eq!(d.features.get(Feature::PaperGrade), 0.0);
    assert!(!defects(&d).contains(&Defect::Bursts), "{:?}", defects(&d));
}
