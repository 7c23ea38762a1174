//! Born-baggy inputs: a web that reaches the winder with lanes of different length (a tension
//! profile at winding) or moisture (a moisture profile at winding) is told from a roll that made
//! the difference. Checks:
//! - the lanes wind with the measured tension profile's shape (Hooke's law: lanes that share one
//!   strain carry tension in proportion to their own strain);
//! - a slack lane in the tension profile unwinds long by about its slack, T_w (1 - t_i / t_mean)
//!   / (E c) (Hooke's law), and the diagnosis names the web as the source, with a correction that
//!   evens the web out; the same roll with a flat tension profile gives no baggy lane;
//! - a wet band at winding in a film-wrapped roll keeps the roll's water (conservation of mass),
//!   and the band shrinks as it dries into its neighbours (hygroexpansion eps = beta dMC).

mod common;

use rollsleuth::case::{self, Case, Measure, Profile};
use rollsleuth::diagnose::{base_scenario, Diagnosis};
use rollsleuth::lanes;
use rollsleuth::storage::LaneCreep;
use rollsleuth::vocab::{Action, Cause, Defect};

const POSITIONS_MM: [f64; 16] = [
    50.0, 150.0, 250.0, 350.0, 450.0, 550.0, 650.0, 750.0, 850.0, 950.0, 1050.0, 1150.0, 1250.0,
    1350.0, 1450.0, 1550.0,
];

fn profile(what: Measure, values: Vec<f64>) -> Profile {
    Profile {
        what,
        age_s: 0.0,
        positions_m: POSITIONS_MM.iter().map(|x| x * 1e-3).collect(),
        values,
        origin: "test".into(),
    }
}

/// The demo roll (1600 mm newsprint, 72 um) with its surveys replaced by a flat caliper profile
/// at winding and the given profiles at winding.
fn roll(extra: Vec<Profile>) -> Case {
    let mut c =
        case::load_demo(&["profiles=[]".to_string(), "lanes.count=16".to_string()]).unwrap();
    c.complaint = None;
    c.profiles = vec![profile(Measure::Caliper, vec![72e-6; 16])];
    c.profiles.extend(extra);
    c
}

/// A tension profile in fractions of the mean with lane 7 (650 mm) at `slack` of the others.
fn tension(slack: f64) -> Profile {
    let mut v = vec![1.0; 16];
    v[6] = slack;
    profile(Measure::Tension, v)
}

fn run(c: &Case) -> Diagnosis {
    // with the re-runs: attribution and corrections
    common::diagnose_at(c, 121, true)
}

use common::defects;

#[test]
fn lanes_wind_with_the_measured_tension_profile() {
    let c = roll(vec![tension(0.6)]);
    let l = lanes::build(&c);
    let w = common::wound(&c, &l, 121);
    // first layer: equal radii, so each lane's share is its own measured tension (Hooke's law,
    // one shared strain plus each lane's own); the nip, speed and air parts are equal per lane
    let t_w = c.winding.tension.at(c.roll.core_diameter_m);
    let t: Vec<f64> = l
        .lanes
        .iter()
        .map(|lane| {
            if (lane.position_m - 0.65).abs() < 0.05 {
                0.6
            } else {
                1.0
            }
        })
        .collect();
    let tbar = l.mean(&t);
    let wit0: Vec<f64> = w
        .lanes
        .iter()
        .map(|x| x.wound_in_tension_n_per_m[0])
        .collect();
    let (i7, i1) = (
        l.lanes
            .iter()
            .position(|x| (x.position_m - 0.65).abs() < 0.05)
            .unwrap(),
        2,
    );
    let want = t_w * (t[i1] - t[i7]) / tbar;
    let got = wit0[i1] - wit0[i7];
    assert!((got - want).abs() < 1e-6 * want, "{got} vs {want}");
}

#[test]
fn a_slack_lane_at_winding_is_born_baggy_and_the_web_is_its_source() {
    let c = roll(vec![tension(0.45)]);
    let d = run(&c);
    let f = d
        .findings
        .iter()
        .find(|f| f.defect == Defect::BaggyLane)
        .unwrap_or_else(|| panic!("{:?}", defects(&d)));
    assert_eq!(f.rule, "baggy-lane-web");
    assert!(f.lanes.iter().any(|l| (l.position_m - 0.65).abs() < 0.05));
    // the lane's own slack at winding (Hooke's law): T_w (1 - 0.45 / t_mean) / (E c), with
    // t_mean the width-weighted mean of the profile on the lanes
    let l = lanes::build(&c);
    let t: Vec<f64> = l
        .lanes
        .iter()
        .map(|x| {
            if (x.position_m - 0.65).abs() < 0.05 {
                0.45
            } else {
                1.0
            }
        })
        .collect();
    let t_w = c
        .winding
        .tension
        .at(0.5 * (c.roll.core_diameter_m + c.roll.diameter_m));
    let slack_mm_per_m = t_w * (1.0 - 0.45 / l.mean(&t)) / (c.material.md_modulus_pa * 72e-6) * 1e3;
    let a = f.attribution.as_ref().unwrap();
    let web = a
        .shares
        .iter()
        .find(|s| s.cause == Cause::WebProfile)
        .unwrap_or_else(|| panic!("{:?}", a.shares));
    // the web's part of the finding's quantity is its own slack, within what the roll adds or
    // takes (a slack lane winds with less tension and creeps less: at most a fifth here)
    assert!(
        (web.contribution - slack_mm_per_m).abs() < 0.2 * slack_mm_per_m,
        "web part {} vs slack {slack_mm_per_m}",
        web.contribution
    );
    for s in &a.shares {
        assert!(
            s.contribution.abs() <= web.contribution.abs(),
            "{:?}",
            a.shares
        );
    }
    let even = f
        .corrections
        .iter()
        .find(|k| k.action == Action::EvenWebProfile)
        .unwrap();
    assert_eq!(even.improves, Some(true));
    assert!(even.after.unwrap().abs() < 0.1 * even.before);
}

#[test]
fn a_flat_tension_profile_gives_no_baggy_lane() {
    let d = run(&roll(vec![tension(1.0)]));
    assert!(
        !defects(&d).contains(&Defect::BaggyLane),
        "{:?}",
        defects(&d)
    );
}

#[test]
fn a_wet_band_at_winding_keeps_the_roll_s_water_and_shrinks_as_it_dries() {
    let mut v = vec![8.5; 16];
    v[6] = 10.5;
    // film barrel and ends: almost no exchange with the air
    let mut c = case::load_demo(&[
        "profiles=[]".to_string(),
        "lanes.count=16".to_string(),
        "storage=[{duration: \"60 d\", temperature: \"20 C\", rh: \"50 %\", barrel_wrap: film, end_wrap: film, stance: on_end}]".to_string(),
    ])
    .unwrap();
    c.profiles = vec![
        profile(Measure::Caliper, vec![72e-6; 16]),
        profile(Measure::Moisture, v),
    ];
    let l = lanes::build(&c);
    let creep = vec![LaneCreep::grade(&c.material); l.lanes.len()];
    let o = base_scenario(&c, &l, creep, 0.5).run(121).unwrap();
    let last = o.aged.last();
    let m0: Vec<f64> = o.aged.lanes.iter().map(|x| x.moisture_pct[0]).collect();
    let m1: Vec<f64> = o.aged.lanes.iter().map(|x| x.moisture_pct[last]).collect();
    let i7 = l
        .lanes
        .iter()
        .position(|x| (x.position_m - 0.65).abs() < 0.05)
        .unwrap();
    assert!(
        (m0[i7] - 10.5).abs() < 1e-9 && (m0[0] - 8.5).abs() < 1e-9,
        "{m0:?}"
    );
    // conservation of water: the roll's mean moisture moves by far less than the band's excess
    let (mean0, mean1) = (l.mean(&m0), l.mean(&m1));
    assert!((mean1 - mean0).abs() < 0.05, "{mean0} -> {mean1}");
    // the band dries into its neighbours and shrinks by beta dMC (hygroexpansion)
    assert!(m1[i7] < m0[i7] && m1[i7 + 1] > m0[i7 + 1], "{m0:?} {m1:?}");
    let beta = c.material.hygro_md_per_pct;
    let h = o.aged.lanes[i7].hygro_strain[last];
    let dmc = m1[i7] - m0[i7];
    assert!(
        h < 0.0 && (h - beta * dmc).abs() < 0.1 * (beta * dmc).abs(),
        "{h} vs {}",
        beta * dmc
    );
}

#[test]
fn tension_and_moisture_profiles_are_read_at_winding_only() {
    let text = std::fs::read_to_string("field_cases/nordvik_pm3_caliper_band.yaml").unwrap();
    let late = text.replace(
        "profiles:\n",
        "profiles:\n  - { what: tension, age: \"5 d\", unit: \"N/m\", positions: [100, 900], values: [350, 340] }\n",
    );
    let e = case::load_str(&late, "late.yaml", None, &[])
        .unwrap_err()
        .to_string();
    assert!(
        e.contains("late.yaml") && e.contains("profiles[0].age") && e.contains("0 d"),
        "{e}"
    );
    let no_unit = text.replace(
        "profiles:\n",
        "profiles:\n  - { what: moisture, age: \"0 d\", positions: [100, 900], values: [8.2, 8.6] }\n",
    );
    let e = case::load_str(&no_unit, "nounit.yaml", None, &[])
        .unwrap_err()
        .to_string();
    assert!(e.contains("profiles[0].unit"), "{e}");
    let pli = text.replace(
        "profiles:\n",
        "profiles:\n  - { what: tension, age: \"0 d\", unit: pli, positions: [100, 900], values: [2.0, 1.9] }\n",
    );
    let c = case::load_str(&pli, "pli.yaml", None, &[]).unwrap();
    let p = c
        .profiles
        .iter()
        .find(|p| p.what == Measure::Tension)
        .unwrap();
    // 1 pli = 175.1268 N/m (NIST SP 811: lbf = 4.448222 N, in = 0.0254 m)
    assert!(
        (p.values[0] - 2.0 * 175.126_8).abs() < 0.01,
        "{:?}",
        p.values
    );
}
