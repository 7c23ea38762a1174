//! `diagnose` and `whatif` output: findings with evidence, causes, corrections checked, and the
//! Markdown report with an SVG plot.

use super::words;
use super::{pos, table, SAFETY};
use crate::diagnose::{Attribution, CheckedCorrection, Diagnosis, Finding};
use crate::units::System;
use crate::vocab::Feature;
use serde_json::{json, Value};
use std::fmt::Write;

fn cond(above: Option<f64>, below: Option<f64>) -> String {
    match (above, below) {
        (Some(a), Some(b)) => format!("between {a} and {b}"),
        (Some(a), None) => format!("above {a}"),
        (None, Some(b)) => format!("below {b}"),
        _ => String::new(),
    }
}

fn lanes_text(lanes: &[crate::diagnose::LaneRef], sys: System) -> String {
    if lanes.is_empty() {
        return "whole roll".into();
    }
    lanes
        .iter()
        .map(|l| {
            format!(
                "{}{} ({:+.2} mm/m)",
                pos(l.position_m, sys),
                if l.extrapolated { "*" } else { "" },
                l.excess_mm_per_m
            )
        })
        .collect::<Vec<_>>()
        .join(", ")
}

/// Human diagnosis.
pub fn text(d: &Diagnosis, sys: System) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "Diagnosis of case {}: {}", d.case, d.title);
    let _ = writeln!(
        out,
        "Predicted length spread across the width at unwind: {:.2} mm per metre of web ({} lanes; rules: {}).",
        d.spread_mm_per_m,
        d.lanes.len(),
        d.rules
    );
    if d.findings.is_empty() {
        let _ = writeln!(out, "\nNo finding: no rule fired. The roll is predicted to unwind within the rules' thresholds.");
    }
    for (k, f) in d.findings.iter().enumerate() {
        out.push_str(&finding_text(k + 1, f, sys));
    }
    if let Some(a) = &d.agreement {
        let _ = writeln!(
            out,
            "Complaint: {}. {}",
            words::defect(a.complaint),
            match (a.agrees, a.rank) {
                (true, Some(r)) => format!("The prediction agrees (finding {r})."),
                (true, None) => "The prediction agrees (no defect predicted).".into(),
                (false, _) => "The prediction does not show it: check the measurements, the storage history and the rules' thresholds.".into(),
            }
        );
    }
    for n in words::notes(d) {
        let _ = writeln!(out, "note: {n}");
    }
    if d.advises_action {
        let _ = writeln!(out, "\n{SAFETY}");
    }
    out
}

/// One finding: defect, mechanism, lanes, evidence and corrections checked.
fn finding_text(rank: usize, f: &Finding, sys: System) -> String {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "\n{rank}. {} ({} likelihood; rule {})",
        words::defect(f.defect),
        f.likelihood,
        f.rule
    );
    let _ = writeln!(out, "   Why: {}", f.mechanism);
    let _ = writeln!(out, "   Where: {}", lanes_text(&f.lanes, sys));
    let mut t = table(&["evidence", "value", "fires when", "source"]);
    for e in &f.evidence {
        t.add_row(vec![
            e.feature.word().to_string(),
            format!("{:.3}", e.value),
            cond(e.above, e.below),
            e.source.clone(),
        ]);
    }
    let _ = writeln!(out, "{t}");
    if let Some(a) = &f.attribution {
        let _ = writeln!(
            out,
            "   Root cause, on {}: {:.3} as predicted, {:.3} with every source removed.",
            words::quantity(a.quantity),
            a.value,
            a.value_without_sources
        );
        for (head, rows) in attribution_rows(a) {
            let mut t = table(&head);
            for r in rows {
                t.add_row(r);
            }
            let _ = writeln!(out, "{t}");
        }
    }
    if !f.corrections.is_empty() {
        let mut c = table(&["correction", "before", "after", "improves", "why"]);
        for x in &f.corrections {
            c.add_row(correction_row(x));
        }
        let _ = writeln!(out, "   Corrections, on {}:\n{c}", words::quantity(q_of(f)));
    }
    out
}

/// The quantity a finding is judged on.
fn q_of(f: &Finding) -> crate::vocab::Quantity {
    f.corrections
        .first()
        .map(|c| c.quantity)
        .or(f.attribution.as_ref().map(|a| a.quantity))
        .unwrap_or(crate::vocab::Quantity::SpreadMmPerM)
}

/// A correction's cells: text, before, after, improves, why.
fn correction_row(x: &CheckedCorrection) -> Vec<String> {
    vec![
        x.text.clone(),
        format!("{:.3}", x.before),
        x.after.map_or("not run".into(), |a| format!("{a:.3}")),
        match x.improves {
            Some(true) => "yes".into(),
            Some(false) => "no: not recommended".into(),
            None => "not run".into(),
        },
        x.why.clone(),
    ]
}

/// The attribution's two tables: sources with Shapley shares, amplifiers at an alternative.
#[allow(clippy::type_complexity)]
fn attribution_rows(a: &Attribution) -> Vec<([&'static str; 4], Vec<Vec<String>>)> {
    let src = a
        .shares
        .iter()
        .map(|s| {
            vec![
                words::cause(s.cause).to_string(),
                words::removed(s.cause).to_string(),
                format!("{:+.3}", s.contribution),
                s.share
                    .map_or("-".into(), |v| format!("{:.0} %", v * 100.0)),
            ]
        })
        .collect();
    let amp = a
        .sensitivities
        .iter()
        .map(|s| {
            let (name, alt) = words::amplifier(s.amplifier);
            vec![
                name.to_string(),
                alt.to_string(),
                format!("{:.3}", s.value_at_alternative),
                format!("{:+.3}", s.value_at_alternative - a.value),
            ]
        })
        .collect();
    vec![
        (
            [
                "source (Shapley share)",
                "removed as",
                "contribution",
                "share",
            ],
            src,
        ),
        (
            ["amplifier", "feasible alternative", "value there", "change"],
            amp,
        ),
    ]
}

/// JSON diagnosis.
pub fn json(d: &Diagnosis) -> Value {
    json!({
        "case": d.case,
        "rules": d.rules,
        "spread_mm_per_m": d.spread_mm_per_m,
        "findings": d.findings,
        "runs": d.runs,
        "agreement": d.agreement,
        "features": d.features.values,
        "lanes": d.lanes,
        "notes": words::notes(d),
        "safety": if d.advises_action { Some(SAFETY) } else { None },
    })
}

/// SVG plot of the predicted length at unwind across the width (lane excess over the mean lane).
pub fn svg(d: &Diagnosis, width_m: f64) -> String {
    let (w, h, m) = (720.0, 300.0, 50.0);
    let vals: Vec<f64> = d.lanes.iter().map(|l| l.excess_mm_per_m).collect();
    let vmax = vals.iter().cloned().fold(0.3f64, |a, b| a.max(b.abs())) * 1.3;
    let x = |p: f64| m + (w - 2.0 * m) * p / width_m;
    let y = |v: f64| h / 2.0 - (h / 2.0 - m) * v / vmax;
    let mut s = String::new();
    let _ = write!(
        s,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{w}\" height=\"{h}\" font-family=\"Helvetica, Arial, sans-serif\" font-size=\"12\">\n<rect width=\"{w}\" height=\"{h}\" fill=\"white\"/>\n"
    );
    let _ = writeln!(s, "<text x=\"{m}\" y=\"20\">Predicted length at unwind over the width-weighted mean lane, mm per m (case {})</text>", d.case);
    let run = d.features.get(Feature::RunningStrainMmPerM);
    for (lim, label) in [
        (0.5 * run, "half the running strain: looks baggy"),
        (run, "running strain: runs slack"),
    ] {
        if lim > vmax {
            continue;
        }
        let _ = writeln!(s, "<line x1=\"{m}\" x2=\"{:.1}\" y1=\"{:.1}\" y2=\"{:.1}\" stroke=\"#999\" stroke-dasharray=\"4 3\"/>", w - m, y(lim), y(lim));
        let _ = writeln!(s, "<text x=\"{:.1}\" y=\"{:.1}\" fill=\"#666\" text-anchor=\"end\">+{lim:.2} mm/m: {label} (common practice)</text>", w - m, y(lim) - 4.0);
    }
    let _ = writeln!(
        s,
        "<line x1=\"{m}\" x2=\"{:.1}\" y1=\"{:.1}\" y2=\"{:.1}\" stroke=\"black\"/>",
        w - m,
        y(0.0),
        y(0.0)
    );
    let pts: Vec<String> = d
        .lanes
        .iter()
        .map(|l| format!("{:.1},{:.1}", x(l.position_m), y(l.excess_mm_per_m)))
        .collect();
    let _ = writeln!(
        s,
        "<polyline fill=\"none\" stroke=\"#1f4e9c\" stroke-width=\"2\" points=\"{}\"/>",
        pts.join(" ")
    );
    for l in &d.lanes {
        let _ = writeln!(
            s,
            "<circle cx=\"{:.1}\" cy=\"{:.1}\" r=\"3\" fill=\"#1f4e9c\"/>",
            x(l.position_m),
            y(l.excess_mm_per_m)
        );
    }
    let _ = writeln!(s, "<text x=\"{m}\" y=\"{:.1}\">front edge</text><text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"end\">back edge ({:.0} mm)</text>", h - 12.0, w - m, h - 12.0, width_m * 1e3);
    let _ = writeln!(
        s,
        "<text x=\"8\" y=\"{:.1}\">{:+.1}</text><text x=\"8\" y=\"{:.1}\">{:+.1}</text>",
        y(vmax * 0.9) + 4.0,
        vmax * 0.9,
        y(-vmax * 0.9) + 4.0,
        -vmax * 0.9
    );
    s.push_str("</svg>\n");
    s
}

/// SVG plot of wound-in interlayer pressure against radius for every lane.
pub fn pressure_svg(d: &Diagnosis) -> String {
    let (radii, curves) = &d.pressure_curves;
    let (w, h, m) = (720.0, 360.0, 60.0);
    let (r0, r1) = (
        radii.first().copied().unwrap_or(0.0),
        radii.last().copied().unwrap_or(1.0),
    );
    let pmax = curves
        .iter()
        .flat_map(|(_, p)| p.iter())
        .cloned()
        .fold(1.0f64, f64::max)
        * 1.1;
    let x = |r: f64| m + (w - 1.5 * m) * (r - r0) / (r1 - r0).max(1e-9);
    let y = |p: f64| h - m - (h - 1.8 * m) * p / pmax;
    let mut s = String::new();
    let _ = writeln!(s, "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{w}\" height=\"{h}\" font-family=\"Helvetica, Arial, sans-serif\" font-size=\"12\">\n<rect width=\"{w}\" height=\"{h}\" fill=\"white\"/>");
    let _ = writeln!(s, "<text x=\"{m}\" y=\"24\">Wound-in interlayer pressure against radius, every lane (case {})</text>", d.case);
    let _ = writeln!(s, "<line x1=\"{m}\" y1=\"{:.1}\" x2=\"{:.1}\" y2=\"{:.1}\" stroke=\"black\"/><line x1=\"{m}\" y1=\"{:.1}\" x2=\"{m}\" y2=\"{:.1}\" stroke=\"black\"/>", y(0.0), w - 0.5 * m, y(0.0), y(0.0), y(pmax));
    let n = curves.len().max(1);
    for (k, (_, p)) in curves.iter().enumerate() {
        let hue = 220.0 - 180.0 * k as f64 / n as f64;
        let pts: Vec<String> = radii
            .iter()
            .zip(p)
            .map(|(r, v)| format!("{:.1},{:.1}", x(*r), y(v.max(0.0))))
            .collect();
        let _ = writeln!(s, "<polyline fill=\"none\" stroke=\"hsl({hue:.0},60%,45%)\" stroke-width=\"1.2\" points=\"{}\"/>", pts.join(" "));
    }
    let _ = writeln!(s, "<text x=\"{m}\" y=\"{:.1}\">core {:.0} mm</text><text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"end\">radius, surface {:.0} mm</text>", h - m + 18.0, r0 * 1e3, w - 0.5 * m, h - m + 18.0, r1 * 1e3);
    let _ = writeln!(
        s,
        "<text x=\"6\" y=\"{:.1}\">{:.0} kPa</text><text x=\"6\" y=\"{:.1}\">0</text>",
        y(pmax) + 4.0,
        pmax / 1e3,
        y(0.0) + 4.0
    );
    let _ = writeln!(s, "<text x=\"{m}\" y=\"{:.1}\" fill=\"#555\">lanes from the front edge (blue) to the back edge (green)</text>", h - 14.0);
    s.push_str("</svg>\n");
    s
}

/// Markdown root-cause report (refers to the SVG plot by file name).
pub fn markdown(d: &Diagnosis, plot_file: &str, sys: System) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "# Root-cause report: {}\n\n{}\n", d.case, d.title);
    let _ = writeln!(
        s,
        "Predicted length spread across the width at unwind: **{:.2} mm per metre of web**.\n",
        d.spread_mm_per_m
    );
    let pressure_file = plot_file.replace("_lanes.svg", "_pressure.svg");
    let _ = writeln!(s, "![lane length at unwind]({plot_file})\n\n![wound-in pressure]({pressure_file})\n\n## Findings\n");
    if d.findings.is_empty() {
        let _ = writeln!(s, "No rule fired.\n");
    }
    for (k, f) in d.findings.iter().enumerate() {
        s.push_str(&finding_markdown(k + 1, f, sys));
    }
    if d.findings.iter().any(|f| f.attribution.is_some()) {
        let _ = writeln!(
            s,
            "## Root cause\n\nUnder each finding: {}.\n",
            words::SHARES_NOTE
        );
    }
    s.push_str(&lanes_markdown(d, sys));
    s.push_str(&features_markdown(d));
    if let Some(a) = &d.agreement {
        let _ = writeln!(
            s,
            "\nComplaint: {}; prediction {}.",
            words::defect(a.complaint),
            if a.agrees { "agrees" } else { "does not agree" }
        );
    }
    let notes = words::notes(d);
    if !notes.is_empty() {
        let _ = writeln!(s, "\n## Notes\n");
        for n in &notes {
            let _ = writeln!(s, "- {n}");
        }
    }
    let _ = writeln!(s, "\n---\n{SAFETY}");
    s
}

/// One finding in Markdown: heading, mechanism, lanes, evidence and corrections.
fn finding_markdown(rank: usize, f: &Finding, sys: System) -> String {
    let mut s = String::new();
    let _ = writeln!(
        s,
        "### {rank}. {} ({} likelihood)\n\n{}\n\nWhere: {}\n",
        words::defect(f.defect),
        f.likelihood,
        f.mechanism,
        lanes_text(&f.lanes, sys)
    );
    let _ = writeln!(
        s,
        "| evidence | value | fires when | source |\n|---|---|---|---|"
    );
    for e in &f.evidence {
        let _ = writeln!(
            s,
            "| {} | {:.3} | {} | {} |",
            e.feature,
            e.value,
            cond(e.above, e.below),
            e.source
        );
    }
    if let Some(a) = &f.attribution {
        let _ = writeln!(
            s,
            "\nRoot cause, on {}: {:.3} as predicted, {:.3} with every source removed.",
            words::quantity(a.quantity),
            a.value,
            a.value_without_sources
        );
        for (head, rows) in attribution_rows(a) {
            let _ = writeln!(s, "\n| {} |\n|---|---|---|---|", head.join(" | "));
            for r in rows {
                let _ = writeln!(s, "| {} |", r.join(" | "));
            }
        }
    }
    if !f.corrections.is_empty() {
        let _ = writeln!(
            s,
            "\nCorrections, on {}:\n\n| correction | before | after | improves | why |\n|---|---|---|---|---|",
            words::quantity(q_of(f))
        );
        for c in &f.corrections {
            let _ = writeln!(s, "| {} |", correction_row(c).join(" | "));
        }
    }
    s.push('\n');
    s
}

/// The lanes table in Markdown.
fn lanes_markdown(d: &Diagnosis, sys: System) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "## Lanes\n\n| lane | centre | caliper dev | length at unwind vs mean lane (mm/m) | MD creep scale | radial creep scale | fit rmse |\n|---|---|---|---|---|---|---|");
    for (i, l) in d.lanes.iter().enumerate() {
        let _ = writeln!(
            s,
            "| {i}{} | {} | {:+.2} % | {:+.2} | {:.2} | {:.2} | {:.2} |",
            if l.extrapolated { "*" } else { "" },
            pos(l.position_m, sys),
            l.caliper_deviation * 100.0,
            l.excess_mm_per_m,
            l.md_creep_scale,
            l.radial_creep_scale,
            l.fit_rmse
        );
    }
    s
}

/// Every feature with its value and meaning, in the words' alphabetical order.
fn features_markdown(d: &Diagnosis) -> String {
    let mut s = String::new();
    let _ = writeln!(
        s,
        "\n## Features\n\n| feature | value | meaning |\n|---|---|---|"
    );
    for (f, v) in d.features.values.by_word() {
        let _ = writeln!(s, "| {f} | {v:.3} | {} |", f.spec().meaning);
    }
    s
}
