//! The pressure on the core that its collapse pressure is compared with (`limits::core_load`,
//! the `core_pressure_ratio` feature and the core's physical-limit warning) is the highest
//! running mean over a fixed width in metres, the tube's ring-load decay length pi/beta
//! (Timoshenko and Woinowsky-Krieger 1959, section 114), so it does not change with the lane
//! count once the lanes resolve the pattern that loads the core. The one-lane maximum it
//! replaces grew as the lanes narrowed onto a band.
//!
//! The roll ([`FILM`]): a film roll with a 150 mm thick band that loads its core past its
//! collapse pressure. A lane count resolves a band when its lanes are no wider than the band
//! (sampling; common practice, as in `tests/lane_count_agreement.rs`).

use rollsleuth::case::{self, Case};
use rollsleuth::lanes;
use rollsleuth::limits;
use rollsleuth::note::Strength;
use rollsleuth::winding::{wind, Options, WindInput};

/// An invented film roll (test data): 20 um film, 1400 mm wide, on a 152 mm core with a 12 mm
/// wall at 3 GPa (pi/beta = 70.8 mm), caliper read every 50 mm, level but for a band of three
/// readings 1.2 um thick at 650-750 mm.
const FILM: &str = r#"
format: 1
case: TEST-FILM-BAND
title: "Invented test roll: film with a 150 mm thick band"
complaint: none
material:
  grade: film
  caliper: "20 um"
  density: "910 kg/m3"
roll:
  width: "1400 mm"
  diameter: "800 mm"
  core_diameter: "152 mm"
  core: { modulus: "3 GPa", wall: "12 mm" }
winding:
  tension: "80 N/m"
  nip: "300 N/m"
  speed: "400 m/min"
profiles:
  - what: caliper
    age: "0 d"
    unit: um
    position_unit: mm
    repeatability: "0.1 um"
    positions: [25, 75, 125, 175, 225, 275, 325, 375, 425, 475, 525, 575, 625, 675, 725, 775, 825, 875, 925, 975, 1025, 1075, 1125, 1175, 1225, 1275, 1325, 1375]
    values: [20, 20, 20, 20, 20, 20, 20, 20, 20, 20, 20, 20, 20, 21.2, 21.2, 21.2, 20, 20, 20, 20, 20, 20, 20, 20, 20, 20, 20, 20]
storage:
  - { duration: "14 d", temperature: "23 C", rh: "50 %", barrel_wrap: film, end_wrap: film, stance: on_end, place: test }
"#;

fn film_band(count: usize) -> Case {
    let dir = std::path::Path::new(env!("CARGO_TARGET_TMPDIR"));
    let path = dir.join(format!("core_film_band_{}.yaml", std::process::id()));
    std::fs::write(&path, FILM).unwrap();
    let c = case::load_file(&path, &[format!("lanes.count={count}")]).expect("the roll loads");
    let _ = std::fs::remove_file(&path);
    c
}

/// (core ratio over the load width, largest one-lane ratio) at `count` lanes.
fn core_ratios(count: usize) -> (f64, f64) {
    let c = film_band(count);
    let l = lanes::build(&c);
    let w = wind(
        &WindInput::new(&c.material, &c.roll, &c.winding),
        &l,
        Options::default(),
    )
    .expect("winds");
    let r = limits::strength(&c.material, &c.roll, &w, &limits::spans(&l));
    let core = r
        .iter()
        .find(|s| s.which == Strength::CoreCollapse)
        .expect("a tube core has a collapse pressure");
    let one_lane = w
        .lanes
        .iter()
        .map(|x| x.summary.core_pressure_pa / core.limit_pa)
        .fold(0.0, f64::max);
    (core.ratio, one_lane)
}

/// From 12 lanes (117 mm, about the band's width) up the lanes resolve the band, and the core
/// ratio agrees within 5 % (measured: 5.06-5.23, 3.4 %); 8 lanes (190 mm) average the band with
/// the level web beside it (2.94), as every lane-level feature does on lanes wider than the
/// pattern.
#[test]
fn the_core_pressure_ratio_agrees_across_lane_counts() {
    let runs: Vec<(usize, (f64, f64))> = [12, 17, 24, 28, 40]
        .into_iter()
        .map(|n| (n, core_ratios(n)))
        .collect();
    let avg: Vec<f64> = runs.iter().map(|r| r.1 .0).collect();
    let lo = avg.iter().copied().fold(f64::INFINITY, f64::min);
    let hi = avg.iter().copied().fold(0.0, f64::max);
    assert!(lo > 1.0 && (hi - lo) / lo < 0.05, "{runs:?}");
    // the window never reads more than the most loaded lane
    for (n, (avg, one)) in &runs {
        assert!(avg <= &(one * (1.0 + 1e-12)), "{n} lanes: {avg} over {one}");
    }
}
