//! Root cause per finding and corrections checked as written: Shapley efficiency, sources
//! against amplifiers, every correction action changing what its text says (checked against the
//! Good-Wu-Fikes wound-in tension, the GAB isotherm and a closed-form taper mean), and findings
//! placed where a roll's defect is known to be.

use rollsleuth::case::{self, Case, Measure, Profile, Stance, Wrap};
use rollsleuth::diagnose::actions::{apply, Change, Scenario};
use rollsleuth::diagnose::{base_scenario, diagnose, DiagnoseOptions, Diagnosis, Finding};
use rollsleuth::lanes;
use rollsleuth::rules;
use rollsleuth::storage::LaneCreep;
use rollsleuth::vocab::{Action, Cause, Defect};

fn run(c: &Case) -> Diagnosis {
    diagnose(
        c,
        &rules::load_default().unwrap(),
        &DiagnoseOptions::default(),
    )
    .unwrap()
}

/// A 1.6 m newsprint roll (demo defaults), 30 d paper-wrapped at 50 % RH, with a 3.5 % caliper
/// band at 0.9 m, wound with `nip` (pli) and `tension` (pli).
fn banded(tension: &str, nip: &str) -> Case {
    let mut c = case::load_demo(&[
        "storage=[{duration: \"30 d\", temperature: \"23 C\", rh: \"50 %\", barrel_wrap: paper, end_wrap: paper}]".into(),
        "converting.tension=1.1 pli".into(),
        format!("winding.tension={tension}"),
        format!("winding.nip={nip}"),
    ])
    .unwrap();
    c.profiles.clear();
    c.complaint = None;
    c.lane_count = None;
    c.profiles.push(Profile {
        what: Measure::Caliper,
        age_s: 0.0,
        positions_m: vec![0.1, 0.3, 0.5, 0.7, 0.9, 1.1, 1.3, 1.5],
        values: vec![72e-6, 72e-6, 72e-6, 72e-6, 74.5e-6, 72e-6, 72e-6, 72e-6],
        origin: "test".into(),
    });
    c
}

fn find(d: &Diagnosis, want: Defect) -> &Finding {
    d.findings
        .iter()
        .find(|f| f.defect == want)
        .unwrap_or_else(|| {
            panic!(
                "no {want}: {:?}",
                d.findings.iter().map(|f| f.defect).collect::<Vec<_>>()
            )
        })
}

/// Shapley efficiency: a finding's shares add up to its quantity with every source removed.
fn efficient(f: &Finding) {
    let a = f.attribution.as_ref().unwrap();
    let sum: f64 = a.shares.iter().map(|s| s.contribution).sum();
    let total = a.value - a.value_without_sources;
    assert!(
        (sum - total).abs() <= 1e-9 * total.abs().max(1e-9),
        "{sum} vs {total}"
    );
}

/// The caliper leads the baggy lane's attribution whether the wound-in tension comes from the
/// nip or from the web tension (same wound-in tension T + mu N, Good, Wu and Fikes 1994); the
/// nip and the web tension are amplifiers, never sources.
#[test]
fn caliper_leads_the_baggy_lane_whether_nip_or_web_tension() {
    let with_nip = banded("2.0 pli", "10 pli");
    let mu = with_nip.material.friction;
    let t = 2.0 + mu * 10.0;
    for c in [with_nip, banded(&format!("{t:.4} pli"), "0 pli")] {
        let d = run(&c);
        let f = find(&d, Defect::BaggyLane);
        efficient(f);
        let a = f.attribution.as_ref().unwrap();
        let lead = a
            .shares
            .iter()
            .max_by(|x, y| x.contribution.total_cmp(&y.contribution))
            .unwrap();
        assert_eq!(lead.cause, Cause::CaliperProfile, "{a:?}");
        assert!(lead.share.unwrap() > 0.5, "{a:?}");
        for g in &d.findings {
            efficient(g);
        }
    }
}

/// A scenario on a case with a taper-free tension, a nip and two storage stretches.
fn scenario() -> Scenario {
    let mut c = banded("1.5 pli", "6 pli");
    c.storage.push(c.storage[0].clone());
    c.storage[1].rh = 0.7;
    let l = lanes::build(&c);
    let creep = vec![LaneCreep::grade(&c.material); l.lanes.len()];
    base_scenario(&c, &l, creep, 0.5)
}

/// GAB isotherm (Guggenheim, Anderson, de Boer), written out here.
fn gab(c: &Case, rh: f64) -> f64 {
    let g = &c.material.sorption;
    let ka = g.k * rh;
    g.monolayer_pct * g.c * ka / ((1.0 - ka) * (1.0 - ka + g.c * ka))
}

/// Every action re-runs what its text says (one arm per action, so a new action needs a check).
#[test]
fn each_correction_changes_what_its_text_says() {
    let b = scenario();
    let (d0, d1) = (b.case.roll.core_diameter_m, b.case.roll.diameter_m);
    let t = |s: &Scenario, d: f64| s.case.winding.tension.at(d);
    let mu = b.case.material.friction;
    let wit = |s: &Scenario, d: f64| t(s, d) + mu * s.case.winding.nip_n_per_m;
    for &a in Action::ALL {
        let f = if a.needs_factor() { Some(0.6) } else { None };
        let n = apply(&b, Change::Correct(a), f, &[3, 4]);
        match a {
            // "even out the web before it is wound": no lane's own strain, the moisture at
            // winding at its width-weighted mean
            Action::EvenWebProfile => {
                let mut w = b.clone();
                for (i, l) in w.lanes.lanes.iter_mut().enumerate() {
                    l.web_strain = 1e-4 * (i as f64 - 3.0);
                    l.winding_moisture_pct = Some(8.0 + 0.1 * i as f64);
                }
                let wm: Vec<f64> = w
                    .lanes
                    .lanes
                    .iter()
                    .map(|l| l.winding_moisture_pct.unwrap())
                    .collect();
                let mean = w.lanes.mean(&wm);
                let e = apply(&w, Change::Correct(a), f, &[3, 4]);
                for l in &e.lanes.lanes {
                    assert_eq!(l.web_strain, 0.0);
                    assert!((l.winding_moisture_pct.unwrap() - mean).abs() < 1e-12);
                }
                assert_eq!(n, b, "a web without profiles is already even");
            }
            Action::FlattenCaliper => {
                assert!(n
                    .lanes
                    .lanes
                    .iter()
                    .all(|l| l.caliper_m == b.lanes.mean_caliper_m))
            }
            // "even out the caliper at the band, to the web beside it": the finding's lanes (3
            // and 4) take the width-weighted mean caliper of the other lanes within 0.3 m of
            // them, worked here from the lanes themselves; the other lanes keep theirs
            Action::EvenCaliperLocally => {
                let ls = &b.lanes.lanes;
                let (lo, hi) = (ls[3].left_m, ls[4].right_m);
                let near: Vec<usize> = (0..ls.len())
                    .filter(|&j| j != 3 && j != 4)
                    .filter(|&j| ls[j].right_m > lo - 0.3 && ls[j].left_m < hi + 0.3)
                    .collect();
                let w: f64 = near.iter().map(|&j| ls[j].width_m).sum();
                let want = near
                    .iter()
                    .map(|&j| ls[j].caliper_m * ls[j].width_m)
                    .sum::<f64>()
                    / w;
                for (i, (l, o)) in n.lanes.lanes.iter().zip(ls).enumerate() {
                    let c = if i == 3 || i == 4 { want } else { o.caliper_m };
                    assert!((l.caliper_m - c).abs() < 1e-15, "lane {i}");
                    assert!(
                        (l.caliper_deviation - (c / n.lanes.mean_caliper_m - 1.0)).abs() < 1e-12
                    );
                }
            }
            // "lower the wound-in tension": T + mu N scaled, the nip part included
            Action::ScaleTension => {
                for d in [d0, 0.5 * (d0 + d1), d1] {
                    assert!((wit(&n, d) - 0.6 * wit(&b, d)).abs() < 1e-9 * wit(&b, d));
                }
                assert!(
                    (n.case.winding.nip_n_per_m - 0.6 * b.case.winding.nip_n_per_m).abs() < 1e-9
                );
            }
            Action::TaperTension => {
                assert_eq!(t(&n, d0), t(&b, d0));
                assert!((t(&n, d1) - 0.6 * t(&b, d0)).abs() < 1e-9);
            }
            // "start with higher tension and taper": the start rises, the end is 0.6 of the
            // start, and the mean over the web length (weight d) is kept: for a linear taper
            // from s at d0 to 0.6 s at d1 the mean is s [1 - 0.4 (2 d1^3 - 3 d0 d1^2 + d0^3)
            // / (3 (d1 - d0)(d1^2 - d0^2))] (integral of (1 - 0.4 x) d dd, worked by hand)
            Action::RaiseStartAndTaper => {
                let s = t(&n, d0);
                assert!(s > t(&b, d0));
                assert!((t(&n, d1) - 0.6 * s).abs() < 1e-9 * s);
                let m = s
                    * (1.0
                        - 0.4 * (2.0 * d1.powi(3) - 3.0 * d0 * d1 * d1 + d0.powi(3))
                            / (3.0 * (d1 - d0) * (d1 * d1 - d0 * d0)));
                assert!((m - t(&b, d0)).abs() < 1e-4 * m, "{m} vs {}", t(&b, d0));
            }
            Action::ScaleNip => {
                assert_eq!(t(&n, d0), t(&b, d0));
                assert!(
                    (n.case.winding.nip_n_per_m - 0.6 * b.case.winding.nip_n_per_m).abs() < 1e-9
                );
            }
            Action::FilmWrap => assert!(n
                .case
                .storage
                .iter()
                .all(|s| s.barrel_wrap == Wrap::Film && s.end_wrap == Wrap::Film)),
            // "keep the roll in the wrap it came in": the last stretch takes the wraps of the
            // stretch before it, where it had them; a roll that came unwrapped keeps its own
            Action::KeepWrappedUntilUse => {
                let mut w = b.clone();
                (w.case.storage[0].barrel_wrap, w.case.storage[0].end_wrap) =
                    (Wrap::Paper, Wrap::None);
                (w.case.storage[1].barrel_wrap, w.case.storage[1].end_wrap) =
                    (Wrap::None, Wrap::Film);
                let k = apply(&w, Change::Correct(a), f, &[3, 4]);
                assert_eq!(k.case.storage[0], w.case.storage[0]);
                assert_eq!(k.case.storage[1].barrel_wrap, Wrap::Paper);
                // a film the roll has is not swapped for the paper it came in
                assert_eq!(k.case.storage[1].end_wrap, Wrap::Film);
                w.case.storage[0].end_wrap = Wrap::Paper;
                let k = apply(&w, Change::Correct(a), f, &[3, 4]);
                assert_eq!(k.case.storage[1].end_wrap, Wrap::Film);
                let mut bare = w.clone();
                bare.case.storage[0].barrel_wrap = Wrap::None;
                let k = apply(&bare, Change::Correct(a), f, &[3, 4]);
                assert_eq!(k.case.storage[1].barrel_wrap, Wrap::None);
            }
            // "store at a humidity in equilibrium with the paper": every stretch's RH holds the
            // paper's moisture on the isotherm
            Action::StoreAtEquilibrium => {
                for s in &n.case.storage {
                    assert!((gab(&b.case, s.rh) - b.case.material.moisture_pct).abs() < 1e-6);
                }
            }
            // "make the paper at pressroom equilibrium": the as-made moisture is the isotherm's
            // at the pressroom (last stretch) humidity; storage unchanged
            Action::MakeAtPressroomEquilibrium => {
                assert!((n.case.material.moisture_pct - gab(&b.case, 0.7)).abs() < 1e-9);
                assert_eq!(n.case.storage, b.case.storage);
            }
            Action::ShortenStorage => {
                assert!((n.case.storage_s() - 0.6 * b.case.storage_s()).abs() < 1e-6)
            }
            Action::SlitOut => assert_eq!(n.excluded, vec![3, 4]),
            Action::StoreOnEnd => assert!(n.case.storage.iter().all(|s| s.stance == Stance::OnEnd)),
            // "a quarter turn at regular intervals": one contact line bears the weight for the
            // factor's share of each stretch
            Action::TurnRolls => assert!(n.case.storage.iter().all(|s| s.contact_share == 0.6)),
            Action::ScaleUnwindSpeed => assert!(
                (n.case.converting_speed_m_s - 0.6 * b.case.converting_speed_m_s).abs() < 1e-12
            ),
            Action::ScaleWindingSpeed => {
                assert!((n.case.winding.speed_m_s - 0.6 * b.case.winding.speed_m_s).abs() < 1e-12)
            }
            // "a nip of about the web tension": the nip is the factor times the web tension at
            // mid-build, or the present nip when heavier (here 6 pli = 1051 N/m > 0.6 x 263 N/m)
            Action::AddNip => {
                let want = b.case.winding.nip_n_per_m.max(0.6 * t(&b, 0.5 * (d0 + d1)));
                assert_eq!(n.case.winding.nip_n_per_m, want);
                assert_eq!(n.case.winding.tension, b.case.winding.tension);
            }
        }
        // nothing else of the winder changes unless the action is about winding
        if !matches!(
            a,
            Action::ScaleTension
                | Action::TaperTension
                | Action::RaiseStartAndTaper
                | Action::ScaleNip
                | Action::ScaleWindingSpeed
                | Action::AddNip
        ) {
            assert_eq!(n.case.winding, b.case.winding, "{a}");
        }
    }
}

/// Findings are placed where the roll's defect is: the baggy lane, the ridge and the gauge band
/// at the caliper band (0.9 m), not at the longest lane elsewhere. At 1.5 pli web tension: the
/// nip concentrates on the band and, below its saturation, compresses the band's diameter
/// ridge under the ridge rule's 1 per mille (0.94 at 2 pli and 10 pli nip; 1.12 here).
#[test]
fn caliper_band_findings_are_at_the_band() {
    let d = run(&banded("1.5 pli", "10 pli"));
    for want in [Defect::BaggyLane, Defect::Ridges, Defect::GaugeBands] {
        let f = find(&d, want);
        assert!(!f.lanes.is_empty(), "{want}");
        for l in &f.lanes {
            assert!((l.position_m - 0.9).abs() < 0.11, "{want}: {:?}", f.lanes);
        }
    }
}

fn uniform(storage: &str) -> Case {
    let mut c = case::load_demo(&[
        "lanes.count=9".into(),
        format!("storage={storage}"),
        "converting.tension=1.1 pli".into(),
    ])
    .unwrap();
    c.profiles.clear();
    c.complaint = None;
    c
}

/// Baggy edges name only long lanes in the edge zones; baggy centre only long centre lanes;
/// core-stress findings on uniform lanes (if any) name the whole roll.
#[test]
fn edge_and_centre_findings_name_only_their_long_lanes() {
    let w = run(&uniform("[{duration: \"20 d\", temperature: \"25 C\", rh: \"85 %\", barrel_wrap: paper, end_wrap: none}]"));
    let width = 1.6;
    let f = find(&w, Defect::BaggyEdges);
    assert!(!f.lanes.is_empty());
    for l in &f.lanes {
        let x = l.position_m / width;
        assert!(
            x <= 0.15 || x >= 0.85 || l.index == 0 || l.index + 1 == w.lanes.len(),
            "{:?}",
            f.lanes
        );
        assert!(l.excess_mm_per_m > 0.0, "a short lane named: {:?}", f.lanes);
    }
    let dry = run(&uniform("[{duration: \"40 d\", temperature: \"28 C\", rh: \"20 %\", barrel_wrap: paper, end_wrap: none}]"));
    let f = find(&dry, Defect::BaggyCenter);
    assert!(!f.lanes.is_empty());
    for l in &f.lanes {
        assert!((l.position_m / width - 0.5).abs() <= 0.25, "{:?}", f.lanes);
        assert!(l.excess_mm_per_m > 0.0, "{:?}", f.lanes);
    }
    for d in [&w, &dry] {
        for f in &d.findings {
            efficient(f);
            if matches!(f.defect, Defect::Starring | Defect::CrepeWrinkles) {
                assert!(
                    f.lanes.is_empty(),
                    "uniform lanes: the whole roll, {:?}",
                    f.lanes
                );
            }
        }
    }
}
