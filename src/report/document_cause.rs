//! The report's root cause, per finding on its own quantity: the sources' Shapley shares, the
//! amplifiers at a feasible alternative, and the corrections re-run and judged on the same
//! quantity (before, after, improves).

use super::document::{b, k, t, Block, Span};
use super::report_data::ReportData;
use super::words;
use crate::diagnose::attribution::worse_sign;
use crate::diagnose::{Attribution, Diagnosis, Finding};
use crate::units::System;

/// The headline line on the first attributed finding: the source that moves its quantity most
/// toward the defect, or, when the sources do not explain it ([`words::no_source_cause`]), that
/// no source does. A source working against the defect is never named.
pub fn main_cause(d: &Diagnosis, sys: System) -> Option<Vec<Span>> {
    let (i, f, a) = d
        .findings
        .iter()
        .enumerate()
        .find_map(|(i, f)| f.attribution.as_ref().map(|a| (i, f, a)))?;
    if let Some(why) = words::no_source_cause(a, sys) {
        return Some(vec![
            b("Main cause: "),
            t(format!(
                "no source of non-uniformity explains finding {} ({}): {why}.",
                i + 1,
                words::defect(f.defect)
            )),
        ]);
    }
    let worse = worse_sign(a.quantity);
    let lead = a
        .shares
        .iter()
        .filter(|s| s.share.is_some() && !s.against_defect)
        .max_by(|x, y| (worse * x.contribution).total_cmp(&(worse * y.contribution)))?;
    Some(vec![
        b("Main cause: "),
        t(format!(
            "{} ({:.0} % of the {}, finding {}: {}).",
            words::cause(lead.cause),
            lead.share.unwrap_or(0.0) * 100.0,
            words::quantity(a.quantity),
            i + 1,
            words::defect(f.defect)
        )),
    ])
}

/// A sentence's first letter in upper case.
fn capitalised(s: &str) -> String {
    let mut c = s.chars();
    c.next()
        .map(|f| f.to_uppercase().chain(c).collect())
        .unwrap_or_default()
}

/// The section: how shares are made, then each finding's root cause and corrections.
pub fn root_cause(r: &ReportData, v: &mut Vec<Block>) {
    let (d, sys) = (r.diagnosis, r.sys);
    v.push(Block::Heading(
        2,
        "Root cause and corrections".into(),
        "root-cause",
    ));
    if d.findings.is_empty() {
        v.push(Block::Para(vec![t(
            "No finding, so there is nothing to attribute or correct.",
        )]));
        return;
    }
    if d.findings.iter().all(|f| f.attribution.is_none()) {
        v.push(Block::Para(vec![t(
            "Causes were not attributed (the model was not re-run).",
        )]));
    } else {
        v.push(Block::Para(vec![
            b("How: "),
            t(format!("{}.", capitalised(words::SHARES_METHOD))),
        ]));
        v.push(Block::Para(vec![
            b("Model runs: "),
            k(
                format!(
                    "{} winding, {} storage",
                    d.runs.winding_runs, d.runs.storage_runs
                ),
                "runs",
            ),
            t(" (each distinct scenario once, shared by every finding)."),
        ]));
    }
    for (i, f) in d.findings.iter().enumerate() {
        finding(i + 1, f, sys, v);
    }
}

/// One finding's root cause and corrections.
fn finding(n: usize, f: &Finding, sys: System, v: &mut Vec<Block>) {
    let q = f
        .attribution
        .as_ref()
        .map(|a| a.quantity)
        .or(f.corrections.first().map(|c| c.quantity));
    let Some(q) = q else { return };
    v.push(Block::Heading(
        3,
        format!(
            "{n}. {}: on the {}",
            words::defect(f.defect),
            words::quantity(q)
        ),
        "",
    ));
    if let Some(a) = &f.attribution {
        attribution(n, a, sys, v);
    }
    if f.corrections.is_empty() {
        return;
    }
    v.push(Block::Para(vec![t(
        "Each correction applied to the model as its text says and the roll re-run through winding and storage; one that does not improve the quantity is marked and listed last. Whether the defect stays is its deciding condition on the corrected roll, in each plausible state moved by what the correction moves it at the fitted creep:",
    )]));
    v.push(Block::Table {
        head: ["correction", "before", "after", "change", "improves", "why"]
            .map(String::from)
            .to_vec(),
        rows: f
            .corrections
            .iter()
            .map(|c| {
                let after = c.after.map(|a| words::quantity_value(q, a, sys));
                vec![
                    t(c.text.clone()),
                    t(words::quantity_value(q, c.before, sys)),
                    k(
                        after.unwrap_or_else(|| "not run".into()),
                        format!("after.{n}.{}", c.action),
                    ),
                    t(c.after
                        .map(|a| words::quantity_change(q, a - c.before, sys))
                        .unwrap_or_default()),
                    k(words::improves(c), format!("improves.{n}.{}", c.action)),
                    t(words::why(c)),
                ]
            })
            .collect(),
    });
}

/// The sources' shares and the amplifiers' sensitivities of one finding.
fn attribution(n: usize, a: &Attribution, sys: System, v: &mut Vec<Block>) {
    let q = a.quantity;
    v.push(Block::Para(vec![
        t("As predicted: "),
        k(words::quantity_value(q, a.value, sys), format!("value.{n}")),
        t("; with every source removed: "),
        t(words::quantity_value(q, a.value_without_sources, sys)),
        t("."),
    ]));
    v.push(Block::Table {
        head: ["source", "removed as", "contribution", "share"]
            .map(String::from)
            .to_vec(),
        rows: a
            .shares
            .iter()
            .map(|s| {
                vec![
                    t(words::cause(s.cause)),
                    t(words::removed(s.cause)),
                    t(words::contribution(q, s, sys)),
                    k(words::share(s.share), format!("share.{n}.{}", s.cause)),
                ]
            })
            .collect(),
    });
    if let Some(why) = words::no_source_cause(a, sys) {
        v.push(Block::Para(vec![
            b("Root cause: "),
            t(format!(
                "no source of non-uniformity explains this finding: {why}."
            )),
        ]));
    }
    if a.sensitivities.is_empty() {
        return;
    }
    v.push(Block::Table {
        head: ["amplifier", "feasible alternative", "value there", "change"]
            .map(String::from)
            .to_vec(),
        rows: a
            .sensitivities
            .iter()
            .map(|s| {
                let (name, alt) = words::amplifier(s.amplifier);
                vec![
                    t(name),
                    t(alt),
                    t(words::quantity_value(q, s.value_at_alternative, sys)),
                    t(words::quantity_change(
                        q,
                        s.value_at_alternative - a.value,
                        sys,
                    )),
                ]
            })
            .collect(),
    });
}
