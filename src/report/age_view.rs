//! `age` output: each lane at the end of storage, and a short time line.

use super::{f, pos, table};
use crate::case::Case;
use crate::lanes::Lanes;
use crate::numeric::spread;
use crate::storage::Aged;
use crate::units::{System, DAY_S};
use serde_json::{json, Value};
use std::fmt::Write;

/// Per-lane table at the end of storage plus a time line at stretch ends; means are of the mean
/// lane (width-weighted over `lanes`).
pub fn text(c: &Case, lanes: &Lanes, a: &Aged, sys: System) -> String {
    let mut out = String::new();
    let n = a.last();
    let _ = writeln!(
        out,
        "Case {}: {} lanes through {:.1} d of storage",
        c.id,
        a.lanes.len(),
        a.times_s[n] / DAY_S
    );
    let mean = lanes.mean(&a.final_strain_at_unwind());
    let mut t = table(&[
        "lane",
        "moisture %",
        "permanent",
        "delayed",
        "hygro",
        "at unwind (outer third)",
        "vs mean mm/m",
        "diameter change",
        "hardness",
    ]);
    for (i, l) in a.lanes.iter().enumerate() {
        let dd = l.diameter_m[n] - l.diameter_m[0];
        t.add_row(vec![
            format!("{i} @ {}", pos(l.position_m, sys)),
            format!("{:.2} -> {:.2}", l.moisture_pct[0], l.moisture_pct[n]),
            format!("{:.4} %", l.permanent_strain[n] * 100.0),
            format!("{:.4} %", l.delayed_strain[n] * 100.0),
            format!("{:+.4} %", l.hygro_strain[n] * 100.0),
            format!("{:+.4} %", l.strain_at_unwind[n] * 100.0),
            format!("{:+.2}", (l.strain_at_unwind[n] - mean) * 1e3),
            match sys {
                System::Si => crate::units::signed(dd, crate::units::Kind::Length, sys, false, 2),
                System::Us => crate::units::signed(dd, crate::units::Kind::Length, sys, true, 1),
            },
            format!("{:.1} -> {:.1}", l.hardness[0], l.hardness[n]),
        ]);
    }
    let _ = writeln!(out, "{t}");
    let tl = time_line(lanes, a);
    let _ = writeln!(out, "{tl}");
    let _ = writeln!(
        out,
        "Equilibrium moisture of the stretches: {}. Hardness map: H = {:.1} + {:.1} ln(P / {:.0} kPa) ({}).",
        a.equilibrium_moisture_pct
            .iter()
            .map(|m| format!("{m:.2} %"))
            .collect::<Vec<_>>()
            .join(", "),
        a.hardness_map.a,
        a.hardness_map.b,
        a.hardness_map.pressure_ref_pa / 1e3,
        a.hardness_map.source
    );
    let _ = writeln!(
        out,
        "Strain at unwind is the stress-free MD strain a lane keeps (permanent + delayed creep + hygroexpansion); a lane longer than the mean by more than about 0.5 mm/m runs visibly slack on light webs (common practice)."
    );
    for line in super::words::note_lines(&c.warnings, &a.notes, sys) {
        let _ = writeln!(out, "{line}");
    }
    super::push_safety(&mut out, super::safety_for(&a.notes));
    out
}

/// The mean lane and the length spread at five times over storage.
fn time_line(lanes: &Lanes, a: &Aged) -> comfy_table::Table {
    let n = a.last();
    let mut tl = table(&[
        "day",
        "moisture % (mean)",
        "hardness (mean)",
        "surface pressure kPa (mean)",
        "length spread mm/m",
    ]);
    let marks: Vec<usize> = {
        let mut m: Vec<usize> = (0..=4).map(|k| k * n / 4).collect();
        m.dedup();
        m
    };
    for &k in &marks {
        let col =
            |g: &dyn Fn(usize) -> f64| lanes.mean(&(0..a.lanes.len()).map(g).collect::<Vec<_>>());
        let s: Vec<f64> = a.lanes.iter().map(|l| l.strain_at_unwind[k]).collect();
        tl.add_row(vec![
            f(a.times_s[k] / DAY_S, 1),
            f(col(&|i| a.lanes[i].moisture_pct[k]), 2),
            f(col(&|i| a.lanes[i].hardness[k]), 1),
            f(col(&|i| a.lanes[i].surface_pressure_pa[k]) / 1e3, 1),
            f(spread(&s) * 1e3, 3),
        ]);
    }
    tl
}

/// JSON with arrays over `times_s`; `safety` when a warning advises action.
pub fn json(c: &Case, a: &Aged) -> Value {
    let (notes, warnings) = super::words::note_json(&c.warnings, &a.notes);
    json!({
        "case": c.id,
        "times_s": a.times_s,
        "radius_m": a.radius_m,
        "equilibrium_moisture_pct": a.equilibrium_moisture_pct,
        "hardness_map": a.hardness_map,
        "notes": notes,
        "warnings": warnings,
        "safety": super::safety_for(&a.notes),
        "lanes": a.lanes,
    })
}
