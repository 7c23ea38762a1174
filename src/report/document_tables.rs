//! The report's supporting blocks: the lane and feature tables, the inputs (material, roll,
//! winding, storage history, measurements, case notes), the defaults used, and the provenance
//! (rule table, tool version, analysis date, units) with the safety note.

use super::document::{b, feature_value, k, t, Block, Span};
use super::report_data::ReportData;
use super::{pos, q, SAFETY};
use crate::case::{Case, Core, Stance, Tension, Wrap};
use crate::units::{self, Kind, System};

fn days(s: f64) -> String {
    format!("{:.1} d", s / units::DAY_S)
}

/// The lane table with the fit's quality, and the feature table.
pub fn tables(r: &ReportData, v: &mut Vec<Block>) {
    let fit = &r.fitted.fit;
    v.push(Block::Heading(2, "Lanes and fit".into(), "lanes"));
    v.push(Block::Para(vec![t(format!(
        "Creep fitted per lane to the measured hardness (repeatability {} {}) and diameter (repeatability {}); fit rmse is in units of the repeatability (1 = measurement noise). Pooled creep scales (1-sigma range): MD {:.2} ({:.2}-{:.2}), radial {:.2} ({:.2}-{:.2}).",
        units::sig(fit.noise.hardness, 3),
        r.case.hardness.scale,
        q(fit.noise.diameter_m, Kind::Length, r.sys),
        fit.pooled_md_creep_scale,
        fit.pooled_md_creep_scale_low,
        fit.pooled_md_creep_scale_high,
        fit.pooled_radial_creep_scale,
        fit.pooled_radial_creep_scale_low,
        fit.pooled_radial_creep_scale_high,
    ))]));
    v.push(lane_table(r));
    v.push(Block::Heading(2, "Features".into(), "features"));
    v.push(Block::Table {
        head: vec!["feature".into(), "value".into(), "meaning".into()],
        rows: r
            .diagnosis
            .features
            .values
            .by_word()
            .into_iter()
            .map(|(f, x)| {
                vec![
                    t(f.word()),
                    t(feature_value(&f, x, r.sys)),
                    t(f.spec().meaning),
                ]
            })
            .collect(),
    });
}

/// A fitted creep scale with its one-sigma factor.
fn scale(s: f64, factor: f64, identified: bool) -> String {
    format!(
        "{s:.2} (x/ {factor:.2}){}",
        if identified { "" } else { ", not identified" }
    )
}

/// One row per lane: position, caliper, length at unwind, fitted creep, fit quality.
fn lane_table(r: &ReportData) -> Block {
    let (d, sys, fit) = (r.diagnosis, r.sys, &r.fitted.fit);
    let ext = r.extrapolated();
    let rows = d
        .lanes
        .iter()
        .enumerate()
        .map(|(i, l)| {
            let lf = fit.lanes.get(i);
            let md = lf.map(|f| {
                scale(
                    f.params.md_creep_scale,
                    f.uncertainty.md_creep_scale_factor,
                    f.md_identifiable,
                )
            });
            let radial = lf.map(|f| {
                scale(
                    f.params.radial_creep_scale,
                    f.uncertainty.radial_creep_scale_factor,
                    f.radial_identifiable,
                )
            });
            vec![
                t(i.to_string()),
                t(pos(l.position_m, sys)),
                t(format!("{:+.2} %", l.caliper_deviation * 100.0)),
                k(
                    format!("{:+.2}", l.excess_mm_per_m),
                    format!("lane{i}.excess"),
                ),
                t(d.confidence
                    .lanes
                    .get(i)
                    .map(|c| {
                        format!(
                            "{:+.2} to {:+.2}",
                            c.excess_mm_per_m_p05, c.excess_mm_per_m_p95
                        )
                    })
                    .unwrap_or_default()),
                t(md.unwrap_or_default()),
                t(radial.unwrap_or_default()),
                t(format!("{:.2}", l.fit_rmse)),
                t(if ext.get(i).copied().unwrap_or(false) {
                    "yes"
                } else {
                    ""
                }),
            ]
        })
        .collect();
    Block::Table {
        head: vec![
            "lane".into(),
            "centre".into(),
            "caliper vs mean".into(),
            format!(
                "length at unwind vs mean lane ({})",
                units::per_mille_label(sys)
            ),
            "5-95 % of plausible states".into(),
            "MD creep scale".into(),
            "radial creep scale".into(),
            "fit rmse".into(),
            "extrapolated".into(),
        ],
        rows,
    }
}

/// The inputs: material, roll and winding; the storage history; the measurements; the case's
/// notes; the defaults used.
pub fn inputs(r: &ReportData, v: &mut Vec<Block>) {
    v.push(Block::Heading(2, "Inputs".into(), "inputs"));
    v.push(input_table(r.case, r.sys));
    v.push(Block::Heading(3, "Storage history".into(), "storage"));
    v.push(storage_table(r.case, r.sys));
    v.push(Block::Heading(3, "Measurements".into(), "measurements"));
    v.push(measurements_table(r.case, r.sys));
    if !r.case.notes.trim().is_empty() {
        v.push(Block::Heading(3, "Case notes".into(), "case-notes"));
        v.push(Block::Para(vec![t(r.case.notes.trim().to_string())]));
    }
    defaults(r.case, v);
}

fn core_text(c: &Case, sys: System) -> String {
    match c.roll.core {
        Core::Rigid => "rigid".into(),
        Core::Tube {
            modulus_pa, wall_m, ..
        } => format!(
            "tube, modulus {}, wall {}",
            q(modulus_pa, Kind::Pressure, sys),
            q(wall_m, Kind::Length, sys)
        ),
    }
}

fn tension_text(c: &Case, sys: System) -> String {
    match &c.winding.tension {
        Tension::Constant { tension_n_per_m } => q(*tension_n_per_m, Kind::LineForce, sys),
        Tension::Taper { points } => points
            .iter()
            .map(|(dm, tn)| {
                format!(
                    "{} at {}",
                    q(*tn, Kind::LineForce, sys),
                    q(*dm, Kind::Length, sys)
                )
            })
            .collect::<Vec<_>>()
            .join(", "),
    }
}

/// Material, roll, winding and converting inputs, defaults marked.
fn input_table(c: &Case, sys: System) -> Block {
    let m = &c.material;
    let fields: Vec<(&str, String)> = vec![
        ("material.grade", format!("{:?}", m.grade).to_lowercase()),
        ("material.caliper", super::fine(m.caliper_m, sys)),
        ("material.density", q(m.density_kg_m3, Kind::Density, sys)),
        (
            "material.md_modulus",
            q(m.md_modulus_pa, Kind::Pressure, sys),
        ),
        (
            "material.cd_modulus",
            q(m.cd_modulus_pa, Kind::Pressure, sys),
        ),
        ("material.moisture", format!("{:.2} %", m.moisture_pct)),
        ("roll.width", q(c.roll.width_m, Kind::Length, sys)),
        ("roll.diameter", q(c.roll.diameter_m, Kind::Length, sys)),
        (
            "roll.core_diameter",
            q(c.roll.core_diameter_m, Kind::Length, sys),
        ),
        ("roll.core", core_text(c, sys)),
        ("winding.tension", tension_text(c, sys)),
        (
            "winding.nip",
            q(c.winding.nip_n_per_m, Kind::LineForce, sys),
        ),
        ("winding.speed", q(c.winding.speed_m_s, Kind::Speed, sys)),
        (
            "converting.tension",
            q(c.converting_tension_n_per_m, Kind::LineForce, sys),
        ),
        (
            "hardness",
            format!(
                "{}, repeatability {}",
                c.hardness.scale,
                units::sig(c.hardness.repeatability, 3)
            ),
        ),
    ];
    let default = |field: &str| c.defaults.iter().any(|d| d.field == field);
    Block::Table {
        head: vec!["field".into(), "value".into(), "note".into()],
        rows: fields
            .into_iter()
            .map(|(f, val)| vec![t(f), t(val), t(if default(f) { "default" } else { "" })])
            .collect(),
    }
}

/// The storage history as a timeline: roll age, temperature, RH, wrap, stance, place.
fn storage_table(c: &Case, sys: System) -> Block {
    let wrap = |w: Wrap| format!("{w:?}").to_lowercase();
    let mut start = 0.0;
    let rows = c
        .storage
        .iter()
        .enumerate()
        .map(|(i, s)| {
            let from = start;
            start += s.duration_s;
            vec![
                t((i + 1).to_string()),
                t(format!("{} to {}", days(from), days(start))),
                t(q(s.temperature_k, Kind::Temperature, sys)),
                t(format!("{:.0} %", s.rh * 100.0)),
                t(format!(
                    "barrel {}, ends {}",
                    wrap(s.barrel_wrap),
                    wrap(s.end_wrap)
                )),
                t(match s.stance {
                    Stance::OnEnd => "on end",
                    Stance::OnSide => "on side",
                }),
                t(s.place.clone().unwrap_or_default()),
            ]
        })
        .collect();
    Block::Table {
        head: [
            "stretch",
            "roll age",
            "temperature",
            "RH",
            "wrap",
            "stance",
            "place",
        ]
        .map(String::from)
        .to_vec(),
        rows,
    }
}

/// The profiles measured: what, when, how many points, where, from which file.
fn measurements_table(c: &Case, sys: System) -> Block {
    let rows = c
        .profiles
        .iter()
        .map(|p| {
            vec![
                t(super::words::measure(p.what)),
                t(days(p.age_s)),
                t(p.positions_m.len().to_string()),
                t(match (p.positions_m.first(), p.positions_m.last()) {
                    (Some(a), Some(b)) => format!("{} to {}", pos(*a, sys), pos(*b, sys)),
                    _ => String::new(),
                }),
                t(p.origin.clone()),
            ]
        })
        .collect();
    Block::Table {
        head: ["profile", "roll age", "points", "span", "from"]
            .map(String::from)
            .to_vec(),
        rows,
    }
}

/// Every default the case used, with its source.
fn defaults(c: &Case, v: &mut Vec<Block>) {
    v.push(Block::Heading(2, "Defaults used".into(), "defaults"));
    if c.defaults.is_empty() {
        v.push(Block::Para(vec![t(
            "None: every value came from the case.",
        )]));
        return;
    }
    v.push(Block::Table {
        head: vec!["field".into(), "value".into(), "source".into()],
        rows: c
            .defaults
            .iter()
            .map(|d| vec![t(d.field.clone()), t(d.value.clone()), t(d.source.clone())])
            .collect(),
    });
}

/// The model's notes, the provenance (rule table, tool, date, case file, units) and the safety
/// note.
pub fn provenance(r: &ReportData, v: &mut Vec<Block>) {
    let d = r.diagnosis;
    let mut notes: Vec<Vec<Span>> = super::words::notes_in(d, r.sys)
        .into_iter()
        .map(|n| vec![t(n)])
        .collect();
    notes.extend(
        super::words::warnings_in(d, r.sys)
            .into_iter()
            .map(|w| vec![b("warning: "), t(w)]),
    );
    if !notes.is_empty() {
        v.push(Block::Heading(2, "Model notes".into(), "notes"));
        v.push(Block::List(notes));
    }
    v.push(Block::Heading(2, "About this report".into(), "about"));
    v.push(Block::List(vec![
        vec![
            b("Rule table: "),
            t(format!("{}, {} rules, fingerprint ", r.rules.source, r.rules.rules)),
            k(r.rules.fingerprint.clone(), "rules-fingerprint"),
            t(" (FNV-1a 64-bit of the table's text)."),
        ],
        vec![
            b("Tool: "),
            k(
                format!("rollsleuth {}", env!("CARGO_PKG_VERSION")),
                "tool-version",
            ),
            t("."),
        ],
        vec![
            b("Analysis date: "),
            k(
                r.date
                    .clone()
                    .unwrap_or_else(|| "not stated (diagnose --date YYYY-MM-DD)".into()),
                "date",
            ),
            t("."),
        ],
        vec![
            b("Case file: "),
            t(format!("{}.", r.case.source)),
        ],
        vec![
            b("Units: "),
            t(match r.sys {
                System::Si => "SI (mm, kPa, N/m, C); length differences in mm per m of web.",
                System::Us => "US customary (in, mil, psi, pli, F); length differences in mil per inch of web (the same number as mm per m).",
            }),
        ],
    ]));
    v.push(Block::Boxed(vec![vec![
        b("Safety. "),
        t(SAFETY.trim_start_matches("Safety: ")),
    ]]));
}
