//! Storage resolution study: each lane's predicted readings (hardness, diameter) at the grade's
//! creep on several storage grids, and their distance from the finest grid in noise units.
//!
//! `cargo run --release --example storage_convergence -- CASE CELLSxSTEPS ...` (the last grid is
//! the reference; `64x20` is the default: 64 radial cells, 20 time steps per segment).
//! Environment: `SET="field=value;..."` edits the case as `--set` does, `THETA=md,radial` sets the
//! log creep scales (default 0,0: the grade's creep), `SHOW_LANE=i` also prints lane i's readings
//! and its final moisture on each grid.
use rollsleuth::fit::{observe, prepared, LaneProblem};
use rollsleuth::storage::AgeOptions;
use rollsleuth::winding::{wind, Options, WindInput};

/// Per lane, each reading's predicted value, its noise (one standard deviation) and whether it
/// is a hardness reading (else a diameter).
type Readings = Vec<Vec<(f64, f64, bool)>>;

fn main() {
    let args: Vec<String> = std::env::args().collect();
    if args.len() < 4 {
        eprintln!("usage: storage_convergence CASE CELLSxSTEPS CELLSxSTEPS ...");
        std::process::exit(2);
    }
    let sets: Vec<String> = std::env::var("SET")
        .map(|v| v.split(';').map(str::to_string).collect())
        .unwrap_or_default();
    let case = rollsleuth::case::load_file(std::path::Path::new(&args[1]), &sets)
        .unwrap_or_else(|e| panic!("{}: {e}", args[1]));
    let lanes = rollsleuth::lanes::build(&case);
    let input = WindInput::new(&case.material, &case.roll, &case.winding);
    let wound = wind(&input, &lanes, Options::default()).expect("winding");
    // per grid: per lane, the predicted readings and their noise
    let mut all: Vec<(String, Readings)> = Vec::new();
    for spec in &args[2..] {
        let v: Vec<usize> = spec
            .split('x')
            .map(|x| x.parse().expect("CELLSxSTEPS"))
            .collect();
        let opt = AgeOptions {
            cells_r: v[0],
            steps: v[1],
            ..AgeOptions::default()
        };
        let (prep, map) = prepared(&case, &lanes, &wound, &opt).expect("storage");
        let (obs, _) = observe::observations(&lanes, &prep.timeline, case.hardness.repeatability);
        eprintln!("{spec}: {} time steps", prep.timeline.steps.len());
        if let Some(i) = std::env::var("SHOW_LANE")
            .ok()
            .and_then(|v| v.parse::<usize>().ok())
        {
            let m = &prep.moisture.mc[prep.moisture.mc.len() - 1][i];
            let mean = m.iter().sum::<f64>() / m.len() as f64;
            eprintln!(
                "{spec}: lane {i} final moisture mean {mean:.5} outer {:.5}",
                m[m.len() - 1]
            );
        }
        let per_lane = obs
            .into_iter()
            .enumerate()
            .map(|(i, o)| {
                let p = LaneProblem::new(&case.material, &wound, &prep, &map, i, o);
                let th: Vec<f64> = std::env::var("THETA")
                    .map(|v| {
                        v.split(',')
                            .map(|x| x.parse().expect("THETA=a,b"))
                            .collect()
                    })
                    .unwrap_or_else(|_| vec![0.0, 0.0]);
                match p.simulate(&th) {
                    Some(t) => p
                        .obs
                        .iter()
                        .map(|o| (p.predict(o, &t), o.sigma, hard(o)))
                        .collect(),
                    None => p.obs.iter().map(|o| (f64::NAN, o.sigma, hard(o))).collect(),
                }
            })
            .collect();
        all.push((spec.clone(), per_lane));
    }
    if let Some(i) = std::env::var("SHOW_LANE")
        .ok()
        .and_then(|v| v.parse::<usize>().ok())
    {
        for (spec, lanes_obs) in &all {
            let v: Vec<String> = lanes_obs[i]
                .iter()
                .map(|(x, _, _)| format!("{x:.5}"))
                .collect();
            println!("{spec:>12} lane {i}: {}", v.join(" "));
        }
    }
    let reference = &all[all.len() - 1].1;
    for (spec, lanes_obs) in &all {
        // the largest distance of a hardness and of a diameter reading: (distance, lane, reading)
        let mut worst = [(0.0f64, 0, 0); 2];
        for (i, lane) in lanes_obs.iter().enumerate() {
            for (k, &(v, s, h)) in lane.iter().enumerate() {
                let d = (v - reference[i][k].0).abs() / s;
                let w = &mut worst[usize::from(!h)];
                // a reading the model could not give (NaN) counts as the worst
                if d.is_nan() || d > w.0 {
                    *w = (d, i, k);
                }
            }
        }
        let [h, d] = worst;
        println!(
            "{spec:>9}: largest distance from {} in noise units: hardness {:.3} (lane {}, reading {}), diameter {:.3} (lane {}, reading {})",
            all[all.len() - 1].0,
            h.0,
            h.1,
            h.2,
            d.0,
            d.1,
            d.2
        );
    }
}

/// Whether an observation is a hardness reading.
fn hard(o: &rollsleuth::fit::observe::Obs) -> bool {
    o.what == rollsleuth::case::Measure::Hardness
}
