//! The same roll diagnosed at several lane counts gives the same answer. A lane count is a
//! resolution choice: refining the lanes must not change the physics, so the defects found and
//! the longest lane's length at unwind must agree within the diagnosis's own stated uncertainty
//! (common practice (a result must not depend on the discretisation)).
//!
//! The field cases are diagnosed through the same code path as the command line (`diagnose` with
//! the default 201 winding nodes) without the what-if re-runs, which do not change which findings
//! stand or the lanes' intervals, to run in seconds. Lane counts are `lanes.count` overrides; the
//! lanes module adds a 25 mm edge strip each side. The demo's caliper band is one reading
//! (100 mm spacing) at 650 mm; a lane count resolves a band when its lanes are no wider than the
//! band (sampling; common practice), so the demo is compared from 16 lanes (100 mm) up. Coarser
//! lanes average the band with its neighbours and see a lower ridge (12 lanes of 133 mm: about
//! half, below the ridge rule's threshold once the nip shares its load by lane).

use rollsleuth::case::{self, Case};
use rollsleuth::diagnose::{diagnose, DiagnoseOptions, Diagnosis};
use rollsleuth::rules;
use rollsleuth::vocab::{Defect, Likelihood};
use std::collections::BTreeSet;

fn case_at(file: Option<&str>, count: usize) -> Case {
    let set = vec![format!("lanes.count={count}")];
    match file {
        None => case::load_demo(&set).unwrap(),
        Some(f) => case::load_file(std::path::Path::new(f), &set).unwrap(),
    }
}

fn run(c: &Case) -> Diagnosis {
    let opt = DiagnoseOptions {
        what_if: false,
        ..DiagnoseOptions::default()
    };
    diagnose(c, &rules::load_default().unwrap(), &opt).unwrap()
}

/// Defects among the findings with likelihood above low.
fn defects(d: &Diagnosis) -> BTreeSet<Defect> {
    d.findings
        .iter()
        .filter(|f| f.likelihood != Likelihood::Low)
        .map(|f| f.defect)
        .collect()
}

/// The longest lane at unwind: its excess over the mean lane and 5-95 % interval, mm/m.
fn peak_lane(d: &Diagnosis) -> (f64, f64, f64) {
    let l = d
        .confidence
        .lanes
        .iter()
        .max_by(|a, b| a.excess_mm_per_m.total_cmp(&b.excess_mm_per_m))
        .unwrap();
    (
        l.excess_mm_per_m,
        l.excess_mm_per_m_p05,
        l.excess_mm_per_m_p95,
    )
}

/// Diagnoses of a case at each count, with the lane counts actually built.
fn at_counts(file: Option<&str>, counts: &[usize]) -> Vec<(usize, Diagnosis)> {
    counts
        .iter()
        .map(|&n| {
            let d = run(&case_at(file, n));
            assert!(
                d.confidence.lanes.len() >= n,
                "{n}: {}",
                d.confidence.lanes.len()
            );
            (n, d)
        })
        .collect()
}

/// Every count finds the same defects (likelihood above low), and that set is not empty.
fn same_defects(runs: &[(usize, Diagnosis)], want: &[Defect]) {
    let want: BTreeSet<Defect> = want.iter().copied().collect();
    for (n, d) in runs {
        assert_eq!(defects(d), want, "{n} lanes: {:?}", d.findings);
    }
}

/// The demo (a 3.5 % caliper band at 650 mm): a baggy lane, a ridge and a gauge band at 16, 18,
/// 24 and 40 lanes (before the cross-width window was fixed in metres the ridge was lost at 40
/// lanes), and the longest lane's length at unwind agrees within the 5-95 % intervals: every
/// pair of intervals overlaps, and the longest lane stays at the band.
#[test]
fn the_demo_gives_the_same_findings_and_peak_lane_at_every_lane_count() {
    let runs = at_counts(None, &[16, 18, 24, 40]);
    same_defects(
        &runs,
        &[Defect::BaggyLane, Defect::Ridges, Defect::GaugeBands],
    );
    let peaks: Vec<(usize, (f64, f64, f64))> =
        runs.iter().map(|(n, d)| (*n, peak_lane(d))).collect();
    eprintln!("demo longest lane (count, (mm/m, p05, p95)): {peaks:?}");
    for (n, (v, lo, hi)) in &peaks {
        assert!(lo <= v && v <= hi, "{n}: {v} outside [{lo}, {hi}]");
        assert!(*v > 0.0, "{n}: the band's lane is long");
    }
    for (i, (na, (_, la, ha))) in peaks.iter().enumerate() {
        for (nb, (_, lb, hb)) in &peaks[i + 1..] {
            assert!(
                la <= hb && lb <= ha,
                "{na} lanes [{la}, {ha}] and {nb} lanes [{lb}, {hb}] do not overlap"
            );
        }
    }
    for (n, d) in &runs {
        let f = d
            .findings
            .iter()
            .find(|f| f.defect == Defect::BaggyLane)
            .unwrap();
        assert!(
            f.lanes.iter().any(|l| (l.position_m - 0.65).abs() <= 0.1),
            "{n}: {:?}",
            f.lanes
        );
    }
}

/// The dry board roll (a broad baggy centre, low surface pressure): the same findings at 12, 24
/// and 40 lanes; a broad centre is not a local peak at any count.
#[test]
fn the_board_roll_gives_the_same_findings_at_every_lane_count() {
    let runs = at_counts(
        Some("field_cases/harrowgate_board_dry_store.yaml"),
        &[12, 24, 40],
    );
    same_defects(&runs, &[Defect::BaggyCenter, Defect::Telescoping]);
}

/// The coated roll taken from cold to humid (long edges from moisture taken up at the ends): the
/// same findings at 12, 24 and 40 lanes; the edge's slope is not read as a baggy lane inside it.
#[test]
fn the_coated_roll_gives_the_same_findings_at_every_lane_count() {
    let runs = at_counts(
        Some("field_cases/kestrel_coated_cold_to_humid.yaml"),
        &[12, 24, 40],
    );
    same_defects(&runs, &[Defect::BaggyEdges]);
}
