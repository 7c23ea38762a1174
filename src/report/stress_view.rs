//! `stress` output: per-lane wound-in state.

use super::{pos, q, table};
use crate::case::Case;
use crate::lanes::Lanes;
use crate::units::{Kind, System};
use crate::winding::Wound;
use serde_json::{json, Value};
use std::fmt::Write;

/// Per-lane table of the wound-in state.
pub fn text(c: &Case, l: &Lanes, w: &Wound, sys: System) -> String {
    let mut out = heading(c, w, sys);
    let surface = format!(
        "surface {}",
        super::pos(crate::winding::SURFACE_ZONE_M, sys)
    );
    let mut t = table(&[
        "lane",
        "wound-in tension",
        "peak pressure",
        "at radius",
        "core pressure",
        &surface,
        "MD stress range",
        "MD compressive",
    ]);
    for (i, l) in w.lanes.iter().enumerate() {
        let s = &l.summary;
        let comp = match (s.compressive_from_m, s.compressive_to_m) {
            (Some(a), Some(b)) => {
                format!("{} .. {}", q(a, Kind::Length, sys), q(b, Kind::Length, sys))
            }
            _ => "none".into(),
        };
        t.add_row(vec![
            format!("{i} @ {}", pos(l.position_m, sys)),
            q(s.wound_in_tension_mean_n_per_m, Kind::LineForce, sys),
            q(s.peak_pressure_pa, Kind::Pressure, sys),
            q(s.peak_pressure_radius_m, Kind::Length, sys),
            q(s.core_pressure_pa, Kind::Pressure, sys),
            q(s.surface_zone_pressure_pa, Kind::Pressure, sys),
            format!(
                "{} .. {}",
                q(s.tangential_min_pa, Kind::Pressure, sys),
                q(s.tangential_max_pa, Kind::Pressure, sys)
            ),
            comp,
        ]);
    }
    let _ = writeln!(out, "{t}");
    let _ = writeln!(
        out,
        "Core stiffness: {}. A new layer stops pressing on the roll above a surface speed of about {} (thin-ring estimate); winding speed {}.",
        w.core_stiffness_pa
            .map(|e| q(e, Kind::Pressure, sys))
            .unwrap_or_else(|| "rigid".into()),
        q(w.lift_off_speed_m_s, Kind::Speed, sys),
        q(c.winding.speed_m_s, Kind::Speed, sys),
    );
    let slack: Vec<String> = w
        .lanes
        .iter()
        .enumerate()
        .filter(|(_, l)| {
            let slack = |t: f64| t <= c.material.friction * c.winding.nip_n_per_m + 1e-9;
            slack_share(&w.radius_m, &l.wound_in_tension_n_per_m, slack) > 0.1
        })
        .map(|(i, l)| format!("{i} @ {}", pos(l.position_m, sys)))
        .collect();
    if !slack.is_empty() {
        let _ = writeln!(
            out,
            "Lanes wound slack for more than a tenth of the build (web tension fell to zero): {}",
            slack.join(", ")
        );
    }
    let limits = limits(c, l, w);
    for line in super::words::note_lines(&c.warnings, &limits, sys) {
        let _ = writeln!(out, "{line}");
    }
    super::push_safety(&mut out, super::safety_for(&limits));
    out
}

/// Share of the build (by radius, each node standing for half of each interval beside it; the
/// nodes are not evenly spaced) over which `slack` holds for the wound-in tension `wit` (N/m)
/// at radii `r` (m).
fn slack_share(r: &[f64], wit: &[f64], slack: impl Fn(f64) -> bool) -> f64 {
    let n = r.len().min(wit.len());
    if n < 2 {
        return if n == 1 && slack(wit[0]) { 1.0 } else { 0.0 };
    }
    let span = |i: usize| 0.5 * (r[(i + 1).min(n - 1)] - r[i.saturating_sub(1)]);
    let held: f64 = (0..n).filter(|&i| slack(wit[i])).map(span).sum();
    held / (r[n - 1] - r[0]).max(1e-300)
}

/// The first line: the case, the grid and the CD levelling.
fn heading(c: &Case, w: &Wound, sys: System) -> String {
    let lag = if w.shear_lag_m.is_finite() {
        q(w.shear_lag_m, Kind::Length, sys)
    } else {
        "the whole width".into()
    };
    format!(
        "Case {}: wound-in state, {} lanes, {:.0} layers on a grid of {} nodes per lane ({} radii with the refined zone under the surface), CD levelling over a shear lag of {lag} (uniform levelling {:.2} on top)\n",
        c.id,
        w.lanes.len(),
        w.layers,
        w.grid_nodes,
        w.radius_m.len(),
        w.levelling
    )
}

/// The physical limits the wound state passed, and its diameters against the winding-time
/// diameter profile.
fn limits(c: &Case, l: &Lanes, w: &Wound) -> Vec<crate::note::Note> {
    let mut out = crate::limits::after_winding(w, l, &c.material, &c.roll, c.winding.speed_m_s);
    let rep = crate::fit::observe::DIAMETER_REPEATABILITY_M;
    out.extend(crate::limits::against_winding_diameter(l, w, rep));
    out
}

/// JSON with full radial arrays per lane; `safety` when a warning advises action.
pub fn json(c: &Case, l: &Lanes, w: &Wound) -> Value {
    let limits = limits(c, l, w);
    let (notes, warnings) = super::words::note_json(&c.warnings, &limits);
    json!({
        "case": c.id,
        "radius_m": w.radius_m,
        "layer_count": w.layers,
        "layers_per_node": w.layers_per_node,
        "grid_nodes": w.grid_nodes,
        "stack_compression_m_per_m": w.stack_compression,
        "layer_thickness_m": w.layer_thickness_m,
        "levelling_fraction": w.levelling,
        "shear_lag_m": w.shear_lag_m,
        "core_stiffness_pa": w.core_stiffness_pa,
        "lift_off_speed_m_s": w.lift_off_speed_m_s,
        "lanes": w.lanes.iter().map(|x| json!({
            "position_m": x.position_m,
            "caliper_m": x.caliper_m,
            "radius_m": w.radius_m,
            "radial_stress_pa": x.radial_stress_pa,
            "tangential_stress_pa": x.tangential_stress_pa,
            "wound_in_tension_n_per_m": x.wound_in_tension_n_per_m,
            "nip_load_n_per_m": x.nip_load_n_per_m,
            "summary": x.summary,
        })).collect::<Vec<_>>(),
        "notes": notes,
        "warnings": warnings,
        "safety": super::safety_for(&limits),
    })
}

#[cfg(test)]
mod tests {
    use super::slack_share;

    /// The share is by radius, not by node count: nodes crowded at the surface (the refined
    /// zone) count for the radius they stand for.
    #[test]
    fn slack_share_weighs_nodes_by_the_radius_they_stand_for() {
        let even: Vec<f64> = (0..=10).map(f64::from).collect();
        let wit = [0.0, 0.0, 0.0, 0.0, 0.0, 1.0, 1.0, 1.0, 1.0, 1.0, 1.0];
        assert!((slack_share(&even, &wit, |t| t <= 0.0) - 0.45).abs() < 1e-12);
        // eleven nodes in the last tenth of a unit, the outer five slack: a quarter of the
        // nodes, but 0.45 % of the radius
        let mut r: Vec<f64> = (0..=9).map(f64::from).collect();
        r.extend((0..=10).map(|i| 9.9 + 0.01 * f64::from(i)));
        let wit: Vec<f64> = r
            .iter()
            .map(|&x| if x > 9.955 { 0.0 } else { 1.0 })
            .collect();
        let share = slack_share(&r, &wit, |t| t <= 0.0);
        assert!((share - 0.0045).abs() < 1e-12, "{share}");
        assert_eq!(slack_share(&[1.0], &[0.0], |t| t <= 0.0), 1.0);
    }
}
