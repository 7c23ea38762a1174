//! Roll-level quantities made from the lanes agree at every lane count. Each edge lane is one
//! 25 mm strip at every lane count and inner lanes are wider, so a plain mean or sum over lanes
//! lets a strip count as much as a 200 mm lane and moves with the lane count; a mean or integral
//! over the width in metres does not, once the lanes resolve the pattern across the width
//! (sampling; common practice). Checked here on forward runs at the grade's creep (every lane
//! the same law, so only the lanes' layout differs), 401 winding nodes, at 10, 16, 24 and 30
//! lanes:
//! - `surface_pressure_loss_pct`: the loss of the surface-zone pressure integrated over the width
//!   (friction over the face resists slip; Coulomb's law of friction, Coulomb 1785);
//! - `moisture_share` and `creep_share`: the lane-to-lane differences integrated over the width;
//! - the outer wraps' mean surface pressure ([`Wound::mean_surface_pressure_pa`]) that the flat
//!   of a roll stored on its side reads (Hertz line contact over the whole width; Johnson 1985,
//!   section 4.3), and the run-out left at unwind.
//!
//! The rolls: the board and coated field cases as stored, and both stored on their side for 30
//! days (an override of their storage) for the flat.

use rollsleuth::case::{self, Case};
use rollsleuth::diagnose::{base_scenario, features};
use rollsleuth::lanes::{self, Lanes};
use rollsleuth::storage::LaneCreep;
use rollsleuth::vocab::Feature;
use rollsleuth::winding::{Wound, DEFAULT_NODES};

const COUNTS: [usize; 4] = [10, 16, 24, 30];
const BOARD: &str = "field_cases/harrowgate_board_dry_store.yaml";
const COATED: &str = "field_cases/kestrel_coated_cold_to_humid.yaml";
const NORDVIK: &str = "field_cases/nordvik_pm3_caliper_band.yaml";
const ON_SIDE: &str = "storage=[{duration: \"30 d\", temperature: \"23 C\", rh: \"50 %\", \
                       barrel_wrap: film, end_wrap: film, stance: on_side}, \
                       {duration: \"1 d\", temperature: \"23 C\", rh: \"50 %\", \
                       barrel_wrap: film, end_wrap: film, stance: on_end}]";

fn load(file: &str, count: usize, extra: &[&str]) -> Case {
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join(file);
    let mut set = vec![format!("lanes.count={count}")];
    set.extend(extra.iter().map(|s| s.to_string()));
    case::load_file(&path, &set).expect("loads")
}

/// A forward run of `c` at the grade's creep: its lanes, features and wound state.
fn forward(c: &Case) -> (Lanes, features::Features, Wound, Option<f64>) {
    let l = lanes::build(c);
    let creep = vec![LaneCreep::grade(&c.material); l.lanes.len()];
    let o = base_scenario(c, &l, creep, 0.5)
        .run(DEFAULT_NODES)
        .expect("runs");
    let f = features::compute(c, &l, &o);
    let run_out = o.unwind.flat.map(|f| f.residual_depth_m);
    (l, f, o.wound, run_out)
}

/// Largest minus smallest of `v` over the largest magnitude.
fn relative_range(v: &[f64]) -> f64 {
    let hi = v.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let lo = v.iter().copied().fold(f64::INFINITY, f64::min);
    let big = v.iter().map(|x| x.abs()).fold(0.0, f64::max);
    (hi - lo) / big.max(1e-300)
}

fn features_at(file: &str, extra: &[&str], fs: &[Feature]) -> Vec<Vec<f64>> {
    COUNTS
        .iter()
        .map(|&n| {
            let (_, f, _, _) = forward(&load(file, n, extra));
            fs.iter().map(|&x| f.get(x)).collect()
        })
        .collect()
}

/// The pressure loss over storage agrees within 5 % of its value over 10-30 lanes (measured:
/// board 18.97-19.65 %, 3.5 %; coated 55.98-56.11 %, 0.2 %). The plain mean of the lanes'
/// losses it replaced read 29.7, 27.0, 25.2 and 21.7 % on the board (27 %).
#[test]
fn surface_pressure_loss_agrees_across_lane_counts() {
    for file in [BOARD, COATED] {
        let v: Vec<f64> = features_at(file, &[], &[Feature::SurfacePressureLossPct])
            .into_iter()
            .map(|x| x[0])
            .collect();
        eprintln!("{file}: surface_pressure_loss_pct at {COUNTS:?} lanes: {v:?}");
        assert!(relative_range(&v) < 0.05, "{file}: {v:?}");
    }
}

/// The moisture and creep shares agree within 0.03 (absolute, on a 0..1 share) over 16-30
/// lanes and within 0.06 from 10 lanes, as stored and stored on the side (measured: the coated
/// roll on its side 0.135, 0.179, 0.193, 0.191; 10 lanes of about 130 mm average the edges' pattern
/// away, which lowers the deviations themselves, a matter of resolution). Summed over lanes
/// without widths, it read 0.317, 0.307, 0.286 and 0.237, moving most where the lanes are finest.
#[test]
fn moisture_and_creep_shares_agree_across_lane_counts() {
    for (file, extra) in [
        (BOARD, None),
        (COATED, None),
        (BOARD, Some(ON_SIDE)),
        (COATED, Some(ON_SIDE)),
    ] {
        let extra: Vec<&str> = extra.into_iter().collect();
        let v = features_at(file, &extra, &[Feature::MoistureShare, Feature::CreepShare]);
        eprintln!("{file} {extra:?}: (moisture_share, creep_share) at {COUNTS:?} lanes: {v:?}");
        for k in 0..2 {
            let col: Vec<f64> = v.iter().map(|x| x[k]).collect();
            let hi = col.iter().copied().fold(f64::NEG_INFINITY, f64::max);
            let lo = col.iter().copied().fold(f64::INFINITY, f64::min);
            assert!(hi - lo < 0.06, "{file}: {v:?}");
            let fine = &col[1..];
            let hi = fine.iter().copied().fold(f64::NEG_INFINITY, f64::max);
            let lo = fine.iter().copied().fold(f64::INFINITY, f64::min);
            assert!(hi - lo < 0.03, "{file}: {v:?}");
        }
    }
}

/// The outer wraps' mean surface pressure agrees within 0.5 % over 10-30 lanes, and the run-out
/// of the roll stored on its side within 0.5 % (measured: 0.05 % and 0.03 % on the board, less
/// on the coated roll). The plain mean over lanes it replaced read 31.93, 32.22, 32.41 and
/// 32.75 kPa on the board (2.5 %).
#[test]
fn mean_surface_pressure_and_run_out_agree_across_lane_counts() {
    for file in [BOARD, COATED] {
        let (mut p, mut r) = (Vec::new(), Vec::new());
        for n in COUNTS {
            let (l, _, wound, run_out) = forward(&load(file, n, &[ON_SIDE]));
            p.push(wound.mean_surface_pressure_pa(&l.widths()));
            r.push(run_out.expect("a roll on its side has a flat"));
        }
        eprintln!("{file}: mean surface pressure, Pa, at {COUNTS:?} lanes: {p:?}");
        eprintln!("{file}: run-out, m: {r:?}");
        assert!(relative_range(&p) < 0.005, "{file}: {p:?}");
        assert!(relative_range(&r) < 0.005, "{file}: {r:?}");
    }
}

/// The correlation of lane caliper with length at unwind, each lane weighted by its width,
/// agrees within 0.03 over 16-30 lanes on the caliper-band and board rolls (measured: 0.987-0.990
/// and 0.782-0.801; the board at 10 lanes of 150 mm reads 0.694, its caliper pattern averaged
/// over wide lanes, a matter of resolution, not checked).
#[test]
fn caliper_correlation_agrees_across_lane_counts() {
    for file in [NORDVIK, BOARD] {
        let v: Vec<f64> = features_at(file, &[], &[Feature::CaliperCorrelation])
            .into_iter()
            .map(|x| x[0])
            .collect();
        eprintln!("{file}: caliper_correlation at {COUNTS:?} lanes: {v:?}");
        let fine = &v[1..];
        let hi = fine.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        let lo = fine.iter().copied().fold(f64::INFINITY, f64::min);
        assert!(hi - lo < 0.03, "{file}: {v:?}");
    }
}
