//! `diagnose` terminal and JSON output: findings with evidence, each with its root cause and its
//! corrections checked on its own quantity. The root-cause report files are in `document`,
//! `html`, `markdown` and `plots`.

use super::words;
use super::{pos, short, strain_unit, table, SAFETY};

/// Longest source text in a table cell (the full text is in --json and the report).
const SOURCE_CHARS: usize = 60;
use crate::diagnose::{Attribution, CheckedCorrection, Diagnosis, Finding};
use crate::units::System;
use crate::vocab::Feature;
use serde_json::{json, Value};
use std::fmt::Write;

fn cond(feature: Feature, above: Option<f64>, below: Option<f64>, sys: System) -> String {
    let v = |x: f64| words::feature_value(feature, x, sys);
    match (above, below) {
        (Some(a), Some(b)) => format!("between {} and {}", v(a), v(b)),
        (Some(a), None) => format!("above {}", v(a)),
        (None, Some(b)) => format!("below {}", v(b)),
        _ => String::new(),
    }
}

/// An evidence value and, below it, its 5-95 % interval over the plausible states.
fn value_with_spread(e: &crate::diagnose::Evidence, sys: System) -> String {
    let v = |x: f64| words::feature_value(e.feature, x, sys);
    match (e.p05, e.p95) {
        (Some(lo), Some(hi)) => format!(
            "{}\ncreep 5-95 %: {} to {}",
            v(e.value),
            number(&v(lo)),
            v(hi)
        ),
        _ => v(e.value),
    }
}

/// An evidence condition and, below it, where the feature stands above measurement noise.
fn cond_with_noise(e: &crate::diagnose::Evidence, sys: System) -> String {
    let c = cond(e.feature, e.above, e.below, sys);
    match (e.noise_threshold, e.above.is_some()) {
        (Some(x), true) => format!(
            "{c}\nnoise: above {}",
            words::feature_value(e.feature, x, sys)
        ),
        (Some(x), false) => format!(
            "{c}\nnoise: below {}",
            words::feature_value(e.feature, x, sys)
        ),
        (None, _) => c,
    }
}

/// How the plausible states split between the mechanisms of a finding's defect, when another
/// mechanism holds in some of them; `None` otherwise.
pub fn mechanism_split(f: &Finding) -> Option<String> {
    let (own, others) = f.mechanisms.split_first()?;
    let shown: Vec<&crate::diagnose::MechanismShare> =
        others.iter().filter(|m| m.share > 0.0).collect();
    let names: Vec<String> = (shown.iter())
        .map(|m| format!("rule {} in {:.0} %", m.rule, m.share * 100.0))
        .collect();
    let likelier = if shown.iter().any(|m| m.share > own.share) {
        " Another mechanism holds in more states than this one: read its rule (rollsleuth rules show) before acting on this finding's cause and corrections."
    } else {
        ""
    };
    (!names.is_empty()).then(|| {
        format!(
            "Mechanism: this one holds in {:.0} % of the plausible states; {} (a state can hold more than one; the defect holds in {:.0} %, whichever the mechanism).{likelier}",
            own.share * 100.0,
            names.join("; "),
            f.probability * 100.0
        )
    })
}

/// Evidence values outside their creep 5-95 % range, named, and why where the reason is known
/// (a share or a correlation across the lanes above its range); `None` when none lies outside.
fn outside_range(evidence: &[crate::diagnose::Evidence]) -> Option<String> {
    use crate::diagnose::Evidence;
    let outside = |e: &&Evidence| match (e.p05, e.p95) {
        (Some(lo), Some(hi)) => e.value < lo || e.value > hi,
        _ => false,
    };
    let out: Vec<&Evidence> = evidence.iter().filter(outside).collect();
    let scatter = |e: &&Evidence| {
        matches!(
            e.feature,
            Feature::MoistureShare | Feature::CaliperCorrelation
        ) && e.p95.is_some_and(|hi| e.value > hi)
    };
    let why = if out.iter().all(scatter) {
        " A share or a correlation across the lanes falls as their creep scatters, and over the plausible states each lane's creep scatters within what its readings leave uncertain."
    } else {
        ""
    };
    (!out.is_empty()).then(|| {
        let names: Vec<&str> = out.iter().map(|e| words::feature(e.feature)).collect();
        format!(
            "Outside its creep 5-95 % range: {}. An evidence value is the fitted creep's; the range is over the plausible states.{why}",
            names.join(", ")
        )
    })
}

/// The number of a value with its unit ("1.41 per mille" -> "1.41").
fn number(v: &str) -> &str {
    v.split(' ').next().unwrap_or(v)
}

fn lanes_text(lanes: &[crate::diagnose::LaneRef], sys: System) -> String {
    if lanes.is_empty() {
        return "whole roll".into();
    }
    lanes
        .iter()
        .map(|l| {
            format!(
                "{}{} ({:+.2} {})",
                pos(l.position_m, sys),
                if l.extrapolated { "*" } else { "" },
                l.excess_mm_per_m,
                strain_unit(sys)
            )
        })
        .collect::<Vec<_>>()
        .join(", ")
}

/// Human diagnosis.
pub fn text(d: &Diagnosis, sys: System) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "Diagnosis of case {}: {}", d.case, d.title);
    let fit = d.confidence.model_fit();
    let rests = "The findings below, and the absence of findings,";
    if let Some(s) = super::fit_words::opening(&fit, sys, rests) {
        let _ = writeln!(out, "{s}");
    }
    let _ = writeln!(
        out,
        "Predicted length spread across the width at unwind: {:.2} {} of web ({} {}; rules: {}).",
        d.spread_mm_per_m,
        match sys {
            System::Si => "mm per metre",
            System::Us => "mil per inch",
        },
        d.lanes.len(),
        if d.lanes.len() == 1 { "lane" } else { "lanes" },
        d.rules
    );
    if d.findings.is_empty() {
        let _ = writeln!(out, "\n{}", words::no_finding(d));
    }
    for (k, f) in d.findings.iter().enumerate() {
        out.push_str(&finding_text(k + 1, f, sys));
    }
    if let Some(a) = &d.agreement {
        let _ = writeln!(
            out,
            "Complaint: {}. {}{}",
            words::defect(a.complaint),
            match (a.agrees, a.rank) {
                (true, Some(r)) => format!("The prediction agrees (finding {r})."),
                (true, None) => "The prediction agrees (no defect predicted).".into(),
                (false, _) => "The prediction does not show it: check the measurements, the storage history and the rules' thresholds.".into(),
            },
            super::fit_words::agreement_caveat(&fit)
        );
    }
    out.push_str(&lanes_table(d, sys));
    for w in words::warnings_in(d, sys) {
        let _ = writeln!(out, "warning: {w}");
    }
    for n in words::notes_in(d, sys) {
        let _ = writeln!(out, "note: {n}");
    }
    super::push_safety(&mut out, d.advises_action.then_some(SAFETY));
    out
}

/// Each lane's length at unwind with its 5-95 % interval over the plausible states, and how well
/// the model fits its readings (misfit in noise units).
/// A lane beyond the measured positions (its profile values extrapolated) is marked `*`.
fn lanes_table(d: &Diagnosis, sys: System) -> String {
    let c = &d.confidence;
    let unit = strain_unit(sys);
    let (len, range) = (format!("length {unit}"), format!("creep 5-95 % {unit}"));
    let mut t = table(&["lane at", &len, &range, "misfit (noise units)"]);
    for (i, l) in c.lanes.iter().enumerate() {
        let star = d.lanes.get(i).is_some_and(|r| r.extrapolated);
        t.add_row(vec![
            format!("{}{}", pos(l.position_m, sys), if star { "*" } else { "" }),
            format!("{:+.2}", l.excess_mm_per_m),
            format!(
                "{:+.2} .. {:+.2}",
                l.excess_mm_per_m_p05, l.excess_mm_per_m_p95
            ),
            format!(
                "{:.1}{}",
                l.misfit,
                if l.explained { "" } else { " not explained" }
            ),
        ]);
    }
    format!(
        "\nLanes at unwind ({} plausible states; roll misfit {}):\n{t}\nThe creep range is what the hardness and diameter readings leave uncertain; caliper noise adds to it (the resolution note says how far a lane must stand out).\n",
        c.states,
        super::fit_words::misfit(c.roll_misfit)
    )
}

/// One finding: defect, mechanism, lanes, evidence and corrections checked.
fn finding_text(rank: usize, f: &Finding, sys: System) -> String {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "\n{rank}. {} ({} likelihood, probability {:.2}; rule {})",
        words::defect(f.defect),
        f.likelihood,
        f.probability,
        f.rule
    );
    let _ = writeln!(out, "   Why: {}", f.mechanism);
    if let Some(line) = mechanism_split(f) {
        let _ = writeln!(out, "   {line}");
    }
    let at = match &f.core {
        Some(m) => super::note_words::core_where(m, sys),
        None => lanes_text(&f.lanes, sys),
    };
    let _ = writeln!(out, "   Where: {at}");
    let mut t = table(&["evidence", "value", "fires when", "source"]);
    for e in &f.evidence {
        t.add_row(vec![
            words::feature(e.feature).to_string(),
            value_with_spread(e, sys),
            cond_with_noise(e, sys),
            short(&e.source, SOURCE_CHARS),
        ]);
    }
    let _ = writeln!(out, "{t}");
    if let Some(line) = outside_range(&f.evidence) {
        let _ = writeln!(out, "   {line}");
    }
    if let Some(a) = &f.attribution {
        let _ = writeln!(
            out,
            "   Root cause, on the {}: {} as predicted, {} with every source removed.",
            words::quantity(a.quantity),
            words::quantity_value(a.quantity, a.value, sys),
            words::quantity_value(a.quantity, a.value_without_sources, sys)
        );
        for (head, rows) in attribution_rows(a, sys) {
            let mut t = table(&head);
            for r in rows {
                t.add_row(r);
            }
            let _ = writeln!(out, "{t}");
        }
        if let Some(why) = words::no_source_cause(a, sys) {
            let _ = writeln!(
                out,
                "   Root cause: no source of non-uniformity explains this finding: {why}."
            );
        }
    }
    if let Some(first) = f.corrections.first() {
        let mut c = table(&["correction", "before", "after", "improves", "why"]);
        for x in &f.corrections {
            c.add_row(correction_row(x, sys));
        }
        let _ = writeln!(
            out,
            "   Corrections, on the {}:\n{c}",
            words::quantity(first.quantity)
        );
    }
    out
}

/// A correction's cells: text, before, after, improves, why.
pub fn correction_row(x: &CheckedCorrection, sys: System) -> Vec<String> {
    vec![
        x.text.clone(),
        words::quantity_value(x.quantity, x.before, sys),
        x.after.map_or("not run".into(), |a| {
            words::quantity_value(x.quantity, a, sys)
        }),
        words::improves(x),
        words::why(x),
    ]
}

/// The attribution's two tables: sources with Shapley shares, amplifiers at an alternative.
#[allow(clippy::type_complexity)]
pub fn attribution_rows(
    a: &Attribution,
    sys: System,
) -> Vec<([&'static str; 4], Vec<Vec<String>>)> {
    let q = a.quantity;
    let src = a
        .shares
        .iter()
        .map(|s| {
            vec![
                words::cause(s.cause).to_string(),
                words::removed(s.cause).to_string(),
                words::contribution(q, s, sys),
                words::share(s.share),
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
                words::quantity_value(q, s.value_at_alternative, sys),
                words::quantity_change(q, s.value_at_alternative - a.value, sys),
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
        "confidence": d.confidence,
        "model_fit": d.confidence.model_fit(),
        "notes": words::notes(d),
        "warnings": words::warnings(d),
        "safety": d.advises_action.then_some(SAFETY),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::diagnose::Evidence;

    fn evidence(feature: Feature, value: f64, range: Option<(f64, f64)>) -> Evidence {
        Evidence {
            feature,
            value,
            above: Some(0.5),
            below: None,
            source: String::new(),
            p05: range.map(|r| r.0),
            p95: range.map(|r| r.1),
            noise_threshold: None,
        }
    }

    /// Only a value outside its own range is named; a value without a range is not.
    #[test]
    fn an_evidence_value_outside_its_range_is_named_and_explained() {
        let e = [
            evidence(Feature::MoistureShare, 0.70, Some((0.51, 0.67))),
            evidence(Feature::SpreadMmPerM, 1.0, Some((0.9, 1.1))),
            evidence(Feature::CaliperCorrelation, 0.9, None),
        ];
        let s = outside_range(&e).unwrap();
        assert!(s.contains(words::feature(Feature::MoistureShare)), "{s}");
        assert!(!s.contains(words::feature(Feature::SpreadMmPerM)), "{s}");
        assert_eq!(outside_range(&e[1..]), None);
    }
}
