//! `fit` output: per-lane creep parameters, uncertainty, residuals and the strain at unwind.

use super::{pos, table};
use crate::case::{Case, Measure};
use crate::fit::RollFit;
use crate::lanes::Lanes;
use crate::units::{System, DAY_S};
use serde_json::{json, Value};
use std::fmt::Write;

/// Per-lane table of the fit; "vs mean" is against the mean lane (width-weighted over `lanes`).
pub fn text(c: &Case, lanes: &Lanes, f: &RollFit, sys: System) -> String {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "Case {}: creep fitted per lane to {} hardness and diameter readings (Nelder-Mead, then the posterior on a grid; {} model evaluations)",
        c.id,
        f.lanes.iter().map(|l| l.residuals.len()).sum::<usize>(),
        f.evaluations
    );
    let rests = "The creep scales and the strain at unwind below";
    if let Some(s) = super::fit_words::opening(&crate::fit::model_fit(f), sys, rests) {
        let _ = writeln!(out, "{s}");
    }
    let _ = writeln!(
        out,
        "Roll values (pooled): MD creep scale {:.2} ({:.2}-{:.2}), radial creep scale {:.2} ({:.2}-{:.2}){}; each lane drawn towards them with a prior of a factor {:.1} (1 sigma); a scale a lane's data do not identify stays at the roll's value and carries its range.",
        f.pooled_md_creep_scale,
        f.pooled_md_creep_scale_low,
        f.pooled_md_creep_scale_high,
        f.pooled_radial_creep_scale,
        f.pooled_radial_creep_scale_low,
        f.pooled_radial_creep_scale_high,
        if f.pooled_converged { "" } else { " (pooled fit hit its iteration limit)" },
        f.prior_sd_ln.exp()
    );
    let mean = lanes.mean(&f.strain_at_unwind);
    let vs_mean = format!("vs mean lane {}", super::strain_unit(sys));
    let mut t = table(&[
        "lane",
        "MD creep scale (1-sigma range)",
        "radial creep scale (1-sigma range)",
        "fit error (in noise units)",
        "converged",
        "strain at unwind",
        &vs_mean,
    ]);
    for (i, l) in f.lanes.iter().enumerate() {
        let flag = |ok: bool| if ok { "" } else { " (not identifiable)" };
        t.add_row(vec![
            format!("{i} @ {}", pos(l.position_m, sys)),
            scale_range(
                l.params.md_creep_scale,
                l.uncertainty.md_creep_scale_factor,
                flag(l.md_identifiable),
            ),
            scale_range(
                l.params.radial_creep_scale,
                l.uncertainty.radial_creep_scale_factor,
                flag(l.radial_identifiable),
            ),
            format!("{:.2}", l.rmse),
            if l.converged { "yes" } else { "no" }.to_string(),
            format!("{:+.4} %", f.strain_at_unwind[i] * 100.0),
            format!("{:+.2}", (f.strain_at_unwind[i] - mean) * 1e3),
        ]);
    }
    let _ = writeln!(out, "{t}");
    if let Some(r) = worst_residuals(f, sys) {
        let _ = writeln!(out, "Residuals of the worst-fitting lane:\n{r}");
    }
    let _ = writeln!(
        out,
        "Spread of strain at unwind across the width: {:.4} % = {:.2} {} of web. Noise: hardness {} units ({}), diameter {} ({}).",
        f.spread_strain * 100.0,
        f.spread_mm_per_m,
        super::strain_unit(sys),
        f.noise.hardness,
        f.noise.hardness_source,
        crate::units::show(f.noise.diameter_m, crate::units::Kind::Length, sys, false),
        f.noise.diameter_source
    );
    let notes = f.all_notes();
    for line in super::words::note_lines(&c.warnings, &notes, sys) {
        let _ = writeln!(out, "{line}");
    }
    super::push_safety(&mut out, super::safety_for(&notes));
    out
}

/// Residual table of the worst-fitting lane, if any lane was fitted.
fn worst_residuals(f: &RollFit, sys: System) -> Option<comfy_table::Table> {
    let dec = if sys == System::Us { 3 } else { 2 };
    let (i, worst) = f
        .lanes
        .iter()
        .enumerate()
        .max_by(|a, b| a.1.rmse.total_cmp(&b.1.rmse))?;
    let mut r = table(&[
        "lane",
        "measure",
        "age d",
        "measured",
        "predicted",
        "residual / noise",
    ]);
    for x in &worst.residuals {
        let (m, p) = match x.what {
            Measure::Hardness => (format!("{:.1}", x.measured), format!("{:.1}", x.predicted)),
            _ => (
                crate::units::signed(x.measured, crate::units::Kind::Length, sys, false, dec),
                crate::units::signed(x.predicted, crate::units::Kind::Length, sys, false, dec),
            ),
        };
        r.add_row(vec![
            i.to_string(),
            super::words::measure(x.what).to_string(),
            format!("{:.0}", x.age_s / DAY_S),
            m,
            p,
            format!("{:+.2}", x.normalised),
        ]);
    }
    Some(r)
}

/// A residual in JSON: the measured and predicted values named with their unit (hardness units,
/// or m of diameter change), the residual in noise units.
fn residual_json(x: &crate::fit::Residual) -> Value {
    let u = x.what.json_unit();
    let mut m = serde_json::Map::new();
    m.insert("what".into(), json!(x.what));
    m.insert("age_s".into(), json!(x.age_s));
    m.insert(format!("measured_{u}"), json!(x.measured));
    m.insert(format!("predicted_{u}"), json!(x.predicted));
    m.insert(format!("predicted_{u}_p05"), json!(x.predicted_p05));
    m.insert(format!("predicted_{u}_p95"), json!(x.predicted_p95));
    m.insert("normalised_noise_units".into(), json!(x.normalised));
    Value::Object(m)
}

/// A contradiction in JSON, its values named with their unit (hardness units, or m).
fn contradiction_json(k: &crate::fit::contradict::Contradiction) -> Value {
    let u = k.what.json_unit();
    let mut m = serde_json::Map::new();
    m.insert("what".into(), json!(super::words::measure(k.what)));
    m.insert("age_s".into(), json!(k.age_s));
    m.insert("position_m".into(), json!(k.position_m));
    m.insert("unit".into(), json!(u));
    m.insert(format!("predicted_change_vs_roll_{u}"), json!(k.predicted));
    m.insert(format!("measured_change_vs_roll_{u}"), json!(k.measured));
    m.insert(format!("noise_sd_{u}"), json!(k.sigma));
    Value::Object(m)
}

/// JSON of the fit; `safety` when a warning advises action.
pub fn json(c: &Case, f: &RollFit) -> Value {
    let all = f.all_notes();
    let (notes, warnings) = super::words::note_json(&c.warnings, &all);
    json!({
        "case": c.id,
        "lanes": f.lanes.iter().enumerate().map(|(i, l)| json!({
            "position_m": l.position_m,
            "params": l.params,
            "uncertainty": l.uncertainty,
            "md_identifiable": l.md_identifiable,
            "radial_identifiable": l.radial_identifiable,
            "rmse_noise_units": l.rmse,
            "converged": l.converged,
            "iterations": l.iterations,
            "evaluations": l.evaluations,
            "residuals": l.residuals.iter().map(residual_json).collect::<Vec<_>>(),
            "strain_at_unwind_m_per_m": f.strain_at_unwind[i],
        })).collect::<Vec<_>>(),
        "pooled_md_creep_scale": f.pooled_md_creep_scale,
        "pooled_radial_creep_scale": f.pooled_radial_creep_scale,
        "pooled_md_creep_scale_low": f.pooled_md_creep_scale_low,
        "pooled_md_creep_scale_high": f.pooled_md_creep_scale_high,
        "pooled_radial_creep_scale_low": f.pooled_radial_creep_scale_low,
        "pooled_radial_creep_scale_high": f.pooled_radial_creep_scale_high,
        "spread_m_per_m": f.spread_strain,
        "spread_mm_per_m": f.spread_mm_per_m,
        "prior_sd_ln": f.prior_sd_ln,
        "noise": f.noise,
        "contradictions": f.contradictions.iter().map(contradiction_json).collect::<Vec<_>>(),
        "evaluations": f.evaluations,
        "model_fit": crate::fit::model_fit(f),
        "notes": notes,
        "warnings": warnings,
        "safety": super::safety_for(&all),
    })
}

/// A fitted scale with its 1-sigma range from a multiplicative factor: "1.02 (0.79-1.32)".
fn scale_range(value: f64, factor: f64, flag: &str) -> String {
    if factor.is_finite() && factor >= 1.0 {
        format!(
            "{value:.2} ({:.2}-{:.2}){flag}",
            value / factor,
            value * factor
        )
    } else {
        format!("{value:.2}{flag}")
    }
}
