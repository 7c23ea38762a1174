//! Out-of-round from storage on the side (issue 18): the flat against Hertz line contact with
//! creep and recovery (Johnson 1985 eq. 4.45, evaluated by a SciPy script), the tension swing
//! against a time integration of the base-excited oscillator (Den Hartog 1956), and an invented
//! roll that lay on its side against the same roll stored on end.

mod common;

use rollsleuth::case::{self, Burgers, Case, Stack, Stance, Stretch, Wrap};
use rollsleuth::diagnose::unwind::relative_response;
use rollsleuth::diagnose::Diagnosis;
use rollsleuth::storage::out_of_round::flat;
use rollsleuth::vocab::{Action, Defect, Feature};

const DAY_S: f64 = 86_400.0;

fn table(name: &str) -> Vec<Vec<String>> {
    let path = format!("{}/tests/data/{name}/table.csv", env!("CARGO_MANIFEST_DIR"));
    let text = std::fs::read_to_string(&path).unwrap();
    text.lines()
        .skip(1)
        .map(|l| l.split(',').map(str::to_string).collect())
        .collect()
}

fn stretch(days: f64, celsius: f64, stance: Stance) -> Stretch {
    Stretch {
        duration_s: days * DAY_S,
        temperature_k: celsius + 273.15,
        rh: 0.5,
        barrel_wrap: Wrap::Film,
        end_wrap: Wrap::Film,
        stance,
        place: None,
        contact_share: 1.0,
    }
}

#[test]
fn the_flat_matches_hertz_line_contact_with_creep_and_recovery() {
    // tests/data/johnson_line_contact: Johnson (1985) eq. 4.45, Lee and Radok (1960), Burgers
    let base = case::load_demo(&[]).unwrap();
    let rows = table("johnson_line_contact");
    assert_eq!(rows.len(), 3);
    for row in rows {
        let v: Vec<f64> = row.iter().map(|s| s.parse().unwrap_or(f64::NAN)).collect();
        let mut m = base.material.clone();
        let mut roll = base.roll.clone();
        m.density_kg_m3 = v[1];
        roll.diameter_m = 2.0 * v[2];
        roll.core_diameter_m = 2.0 * v[3];
        m.stack = if row[4] == "pfeiffer" {
            Stack::Pfeiffer {
                k1_pa: v[5],
                k2: v[6],
            }
        } else {
            Stack::Constant {
                radial_modulus_pa: v[6],
            }
        };
        let radial = Burgers {
            delayed: v[8],
            retardation_s: v[9],
            viscous_time_s: v[10],
        };
        m.creep.activation_energy_j_mol = v[11];
        let storage = [
            stretch(v[12], v[13], Stance::OnSide),
            stretch(v[14], v[15], Stance::OnEnd),
        ];
        let f = flat(&m, &roll, &storage, v[7], &radial).unwrap();
        let got = [
            f.load_n_per_m,
            f.modulus_pa,
            f.half_width_m,
            f.peak_pressure_pa,
            f.elastic_depth_m,
            f.creep_depth_m,
            f.residual_depth_m,
        ];
        for (k, (g, want)) in got.iter().zip(&v[16..23]).enumerate() {
            assert!(
                (g / want - 1.0).abs() < 1e-9,
                "{} column {k}: {g} against {want}",
                row[0]
            );
        }
    }
}

#[test]
fn a_roll_stored_on_end_has_no_flat() {
    let c = case::load_demo(&[]).unwrap();
    let storage = [stretch(90.0, 30.0, Stance::OnEnd)];
    let radial = c.material.creep.radial;
    assert!(flat(&c.material, &c.roll, &storage, 1e4, &radial).is_none());
}

#[test]
fn the_swing_matches_the_integrated_oscillator() {
    // tests/data/den_hartog_sdof: solve_ivp to a steady state (Den Hartog 1956 closed form)
    for row in table("den_hartog_sdof") {
        let v: Vec<f64> = row.iter().map(|s| s.parse().unwrap()).collect();
        let got = relative_response(v[0], v[1]);
        assert!(
            (got / v[2] - 1.0).abs() < 1e-4,
            "r = {}, zeta = {}: {got} against {}",
            v[0],
            v[1],
            v[2]
        );
    }
}

/// An invented newsprint roll of a creep-prone grade (radial creep ten times the default), 90 days
/// on its side in a warm store, 2 days on end, unwound at 900 m/min.
fn invented(stance: &str) -> Case {
    let storage = format!(
        "storage=[{{duration: \"90 d\", temperature: \"30 C\", rh: \"50 %\", stance: {stance}}}, \
         {{duration: \"2 d\", temperature: \"23 C\", rh: \"50 %\", stance: on_end}}]"
    );
    let mut c = case::load_demo(&[
        "profiles=[]".to_string(),
        "lanes.count=6".to_string(),
        "material.creep.radial={delayed: 0.5, retardation: \"3 d\", viscous_time: \"200 d\"}"
            .to_string(),
        "converting.speed=\"900 m/min\"".to_string(),
        storage,
    ])
    .unwrap();
    c.complaint = None;
    c
}

fn run(c: &Case, what_if: bool) -> Diagnosis {
    common::diagnose_at(c, 121, what_if)
}

#[test]
fn a_roll_stored_on_its_side_is_out_of_round_and_the_corrections_help() {
    let d = run(&invented("on_side"), true);
    let run_out = d.features.get(Feature::RunOutMm);
    let swing = d.features.get(Feature::UnwindTensionSwingRatio);
    println!("run-out {run_out:.4} mm, swing / tension {swing:.3}");
    let f = d
        .findings
        .iter()
        .find(|f| f.defect == Defect::OutOfRound)
        .unwrap_or_else(|| {
            panic!(
                "{:?}",
                d.findings.iter().map(|f| f.defect).collect::<Vec<_>>()
            )
        });
    assert!(run_out > 0.0);
    // the flat acts across the whole width
    assert!(f.lanes.is_empty());
    for c in &f.corrections {
        println!("{:?}: {} -> {:?} MPa", c.action, c.before, c.after);
        assert_eq!(c.improves, Some(true), "{:?}", c.action);
    }
    // stored on end there is no flat and no swing at all
    let on_end = f
        .corrections
        .iter()
        .find(|c| c.action == Action::StoreOnEnd)
        .unwrap();
    assert_eq!(on_end.after, Some(0.0));
}

#[test]
fn the_same_roll_stored_on_end_is_not_out_of_round() {
    let d = run(&invented("on_end"), false);
    assert_eq!(d.features.get(Feature::RunOutMm), 0.0);
    assert!(
        d.findings.iter().all(|f| f.defect != Defect::OutOfRound),
        "{:?}",
        d.findings.iter().map(|f| f.defect).collect::<Vec<_>>()
    );
}

#[test]
fn a_contact_wider_than_hertz_allows_is_a_warning() {
    use rollsleuth::note::{Limit, Note};
    use rollsleuth::winding::{wind, Options, WindInput};
    let mut c = invented("on_side");
    let lanes = rollsleuth::lanes::build(&c);
    let wi = WindInput::new(&c.material, &c.roll, &c.winding);
    let wound = wind(&wi, &lanes, Options::default()).unwrap();
    // the invented roll's contact is narrow: no warning
    assert!(rollsleuth::limits::flat_contact(&c, &lanes, &wound).is_empty());
    // a stack ten times softer than any paper (0.1 MPa): a = sqrt(4 P R / (pi E)) is about a
    // third of the radius, outside Hertz's small-contact theory
    c.material.stack = Stack::Constant {
        radial_modulus_pa: 1e5,
    };
    let notes = rollsleuth::limits::flat_contact(&c, &lanes, &wound);
    match notes.as_slice() {
        [Note::Limit(Limit::FlatContact {
            half_width_m,
            radius_m,
            ..
        })] => assert!(*half_width_m > 0.25 * radius_m),
        other => panic!("{other:?}"),
    }
}

#[test]
fn a_weak_web_on_the_same_flat_is_a_break_risk() {
    // the invented roll's peak web stress is about 3.9 MPa; against an MD tensile strength of
    // 7 MPa that is past half of it: the break rule fires, not the plain one
    let mut c = invented("on_side");
    c.material.strength.md_tensile_pa = 7e6;
    let d = run(&c, false);
    let rules: Vec<&str> = d
        .findings
        .iter()
        .filter(|f| f.defect == Defect::OutOfRound)
        .map(|f| f.rule.as_str())
        .collect();
    assert_eq!(rules, ["out-of-round-break"]);
    assert!(d.features.get(Feature::UnwindStressStrengthRatio) > 0.5);
}
