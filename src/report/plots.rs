//! The root-cause report's plots, built from [`ReportData`] and drawn by [`super::chart`]:
//! lane length at unwind, cause shares and correction effects, measured against predicted
//! hardness and diameter, pressure and MD stress against radius, moisture through storage.

use super::chart::{
    bar_chart, line_chart, Band, BarRow, Chart, HLine, Line, Marker, Plot, Series, MARKERS, PALETTE,
};
use super::escape::plot_text;
use super::report_data::ReportData;
use crate::case::Measure;
use crate::units::{self, Kind, System};

/// A series with defaults: solid line, no marker, first colour.
fn series(label: impl Into<String>, points: Vec<(f64, f64)>) -> Series {
    Series {
        label: label.into(),
        points,
        errors: None,
        line: Line::Solid,
        marker: Marker::None,
        marker_count: None,
        color: PALETTE[0],
    }
}

/// Position-axis title and converter.
fn width_axis(sys: System) -> (String, units::Display) {
    let d = units::display(Kind::Length, sys, false);
    (
        format!(
            "position across the width from the front edge ({})",
            d.label
        ),
        d,
    )
}

/// Unit of a diameter change: mm in SI, mil in US customary.
fn diameter_unit(sys: System) -> units::Display {
    units::display(Kind::Length, sys, sys == System::Us)
}

/// The model's 5 % and 95 % over the posterior draws of one survey, as dotted lines (none where
/// the band has no width).
fn model_band(
    s: &super::report_data::Survey,
    xd: &units::Display,
    conv: &dyn Fn(f64) -> f64,
    day: f64,
    color: plotters::style::RGBColor,
) -> Vec<Series> {
    if s.band.iter().all(|(a, b)| a == b) {
        return Vec::new();
    }
    [false, true]
        .into_iter()
        .map(|high| {
            let mut b = series(
                format!("model {} %, day {day:.0}", if high { 95 } else { 5 }),
                s.points
                    .iter()
                    .zip(&s.band)
                    .map(|(p, (lo, hi))| (xd.from_si(p.0), conv(if high { *hi } else { *lo })))
                    .collect(),
            );
            b.line = Line::Dotted;
            b.color = color;
            b
        })
        .collect()
}

/// Plot (1): measured against predicted, one chart per measured quantity, every survey.
pub fn surveys(r: &ReportData) -> Vec<Plot> {
    let (xl, xd) = width_axis(r.sys);
    let mut out = Vec::new();
    let all = r.surveys();
    for (what, id) in [
        (Measure::Hardness, "plot-hardness"),
        (Measure::Diameter, "plot-diameter"),
    ] {
        let sv: Vec<_> = all.iter().filter(|s| s.what == what).collect();
        if sv.is_empty() {
            continue;
        }
        let (conv, unit, name): (Box<dyn Fn(f64) -> f64>, String, &str) = match what {
            Measure::Diameter => {
                let d = diameter_unit(r.sys);
                let label = d.label.to_string();
                (
                    Box::new(move |v| d.from_si(v)),
                    label,
                    "diameter change since winding",
                )
            }
            _ => (Box::new(|v| v), r.case.hardness.scale.clone(), "hardness"),
        };
        let mut series_v = Vec::new();
        for (k, s) in sv.iter().enumerate() {
            let color = PALETTE[k % PALETTE.len()];
            let day = s.age_s / units::DAY_S;
            let mut m = series(
                format!("measured, day {day:.0}"),
                s.points
                    .iter()
                    .map(|p| (xd.from_si(p.0), conv(p.1)))
                    .collect(),
            );
            m.line = Line::None;
            m.marker = MARKERS[k % MARKERS.len()];
            m.errors = Some(conv(s.sigma));
            m.color = color;
            let mut p = series(
                format!("model, day {day:.0}"),
                s.points
                    .iter()
                    .map(|p| (xd.from_si(p.0), conv(p.2)))
                    .collect(),
            );
            p.line = [Line::Solid, Line::Dashed, Line::Dotted][k % 3];
            p.color = color;
            series_v.push(m);
            series_v.push(p);
            series_v.extend(model_band(s, &xd, &conv, day, color));
        }
        let chart = Chart {
            title: format!("Measured and predicted {name} across the width"),
            x_label: xl.clone(),
            y_label: format!("{name} ({})", plot_text(&unit, 30)),
            series: series_v,
            hlines: Vec::new(),
            bands: Vec::new(),
            x_range: Some((0.0, xd.from_si(r.case.roll.width_m))),
        };
        out.push(Plot {
            id,
            caption: format!(
                "Measured {name} (markers, interpolated to lane centres, bars: one-sigma repeatability) and the fitted model (lines; dotted: 5 % and 95 % over the posterior draws of the lane creep), for every survey."
            ),
            svg: line_chart(&chart),
        });
    }
    out
}

/// The 5 % and 95 % lane lengths over the plausible states, dotted (none without them).
fn lane_quantiles(r: &ReportData, xd: &units::Display) -> Vec<Series> {
    let (d, c) = (r.diagnosis, &r.diagnosis.confidence.lanes);
    if c.len() != d.lanes.len() || c.is_empty() {
        return Vec::new();
    }
    [
        ("5 % of plausible states", false),
        ("95 % of plausible states", true),
    ]
    .into_iter()
    .map(|(label, high)| {
        let mut s = series(
            label,
            c.iter()
                .map(|l| {
                    let y = if high {
                        l.excess_mm_per_m_p95
                    } else {
                        l.excess_mm_per_m_p05
                    };
                    (xd.from_si(l.position_m), y)
                })
                .collect(),
        );
        s.line = Line::Dotted;
        s.color = PALETTE[2];
        s
    })
    .collect()
}

/// Plot (2): predicted lane length at unwind across the width, with thresholds, the complaint
/// region and extrapolated lanes.
pub fn lane_length(r: &ReportData) -> Plot {
    let (xl, xd) = width_axis(r.sys);
    let d = r.diagnosis;
    let ext = r.extrapolated();
    let pm = units::per_mille_label(r.sys);
    let mut all = series(
        "predicted, lane centres",
        d.lanes
            .iter()
            .map(|l| (xd.from_si(l.position_m), l.excess_mm_per_m))
            .collect(),
    );
    all.marker = Marker::Circle;
    let mut sv = vec![all];
    sv.extend(lane_quantiles(r, &xd));
    let xp: Vec<(f64, f64)> = d
        .lanes
        .iter()
        .zip(&ext)
        .filter(|(_, e)| **e)
        .map(|(l, _)| (xd.from_si(l.position_m), l.excess_mm_per_m))
        .collect();
    if !xp.is_empty() {
        let mut x = series("lane with extrapolated profile values", xp);
        x.line = Line::None;
        x.marker = Marker::Cross;
        x.color = PALETTE[1];
        sv.push(x);
    }
    let mut hlines = Vec::new();
    if let Some(run) = r.running_strain_mm_per_m() {
        hlines.push(HLine {
            y: 0.5 * run,
            label: format!(
                "+{:.2} {pm}: half the running strain, looks baggy",
                0.5 * run
            ),
        });
        hlines.push(HLine {
            y: run,
            label: format!("+{run:.2} {pm}: the running strain, runs slack"),
        });
    }
    let bands = r
        .complaint_region()
        .into_iter()
        .enumerate()
        .map(|(k, (a, b))| Band {
            x0: xd.from_si(a),
            x1: xd.from_si(b),
            label: (k == 0).then(|| "complaint".to_string()),
        })
        .collect();
    let chart = Chart {
        title: "Predicted lane length at unwind, over the mean lane".into(),
        x_label: xl,
        y_label: format!("length over the mean lane ({pm})"),
        series: sv,
        hlines,
        bands,
        x_range: Some((0.0, xd.from_si(r.case.roll.width_m))),
    };
    Plot {
        id: "plot-lane-length",
        caption: "Predicted length of each lane at unwind over the width-weighted mean lane. Dashed lines: thresholds (common practice); hatched: where the complaint is; crosses: lanes whose profile values were extrapolated; dotted: 5 % and 95 % of the lane lengths over the plausible states of the fitted creep (posterior draws).".into(),
        svg: line_chart(&chart),
    }
}

/// Plot (3): interlayer pressure and MD stress against radius for the mean lane and the lanes
/// that carry findings, wound-in (solid) and at unwind (dashed).
pub fn stress(r: &ReportData) -> Vec<Plot> {
    let rd = units::display(Kind::Length, r.sys, false);
    let pd = units::display(Kind::Pressure, r.sys, false);
    let lanes = r.stress_lanes();
    let name = |l: &super::report_data::StressLane| match l.lane {
        None => "mean lane".to_string(),
        Some(i) => format!("lane {i} at {}", super::pos(l.position_m, r.sys)),
    };
    let mk = |pick: &dyn Fn(&(f64, f64, f64)) -> f64| -> Vec<Series> {
        let mut v = Vec::new();
        for (k, l) in lanes.iter().enumerate() {
            for (curve, when, line) in [
                (&l.wound, "wound-in", Line::Solid),
                (&l.aged, "at unwind", Line::Dashed),
            ] {
                let mut s = series(
                    format!("{}, {when}", name(l)),
                    curve
                        .iter()
                        .map(|p| (rd.from_si(p.0), pd.from_si(pick(p))))
                        .collect(),
                );
                s.line = line;
                s.marker = MARKERS[k % MARKERS.len()];
                s.marker_count = Some(8);
                s.color = PALETTE[k % PALETTE.len()];
                v.push(s);
            }
        }
        v
    };
    let charts = [
        (
            "plot-pressure",
            "Interlayer pressure against radius",
            format!("interlayer pressure ({})", pd.label),
            mk(&|p| p.1),
        ),
        (
            "plot-md-stress",
            "MD stress against radius",
            format!("MD stress, tension positive ({})", pd.label),
            mk(&|p| p.2),
        ),
    ];
    charts
        .into_iter()
        .map(|(id, title, yl, sv)| Plot {
            id,
            caption: format!("{title}: the width-weighted mean lane and the lanes with the largest length difference among the findings; solid: as wound, dashed: at the end of storage."),
            svg: line_chart(&Chart {
                title: title.into(),
                x_label: format!("radius ({})", rd.label),
                y_label: yl,
                series: sv,
                hlines: Vec::new(),
                bands: Vec::new(),
                x_range: None,
            }),
        })
        .collect()
}

/// Plot (4): moisture across the width at the start and at the end of each storage stretch.
pub fn moisture(r: &ReportData) -> Plot {
    let (xl, xd) = width_axis(r.sys);
    let sv = r
        .moisture_lines()
        .iter()
        .enumerate()
        .map(|(k, m)| {
            let day = m.age_s / units::DAY_S;
            let label = match m.stretch_end {
                None => format!("day {day:.0}, as wound"),
                Some(i) => format!("day {day:.0}, end of storage stretch {}", i + 1),
            };
            let mut s = series(
                label,
                m.points.iter().map(|p| (xd.from_si(p.0), p.1)).collect(),
            );
            s.line = [Line::Solid, Line::Dashed, Line::Dotted][k % 3];
            s.marker = MARKERS[k % MARKERS.len()];
            s.color = PALETTE[k % PALETTE.len()];
            s
        })
        .collect();
    Plot {
        id: "plot-moisture",
        caption: "Lane-mean moisture content across the width through the storage history (the storage stretches are listed under Inputs).".into(),
        svg: line_chart(&Chart {
            title: "Moisture across the width through storage".into(),
            x_label: xl,
            y_label: "moisture content (%)".into(),
            series: sv,
            hlines: Vec::new(),
            bands: Vec::new(),
            x_range: Some((0.0, xd.from_si(r.case.roll.width_m))),
        }),
    }
}

/// Plot (5): each finding's root-cause shares, and its corrections' effect on its own quantity,
/// as bars.
pub fn bars(r: &ReportData) -> Vec<Plot> {
    let d = r.diagnosis;
    let mut out = Vec::new();
    let mut shares = Vec::new();
    let mut fixes = Vec::new();
    for (i, f) in d.findings.iter().enumerate() {
        let name = format!("{}. {}", i + 1, super::words::defect(f.defect));
        for s in f.attribution.iter().flat_map(|a| &a.shares) {
            if let Some(x) = s.share {
                shares.push(BarRow {
                    label: format!(
                        "{name}: {}{}",
                        super::words::cause(s.cause),
                        if s.against_defect && x >= 0.0 {
                            " (against)"
                        } else {
                            ""
                        }
                    ),
                    before: None,
                    // a share that rounds to zero is drawn and labelled as 0
                    value: if (100.0 * x).abs() < 0.5 {
                        0.0
                    } else {
                        100.0 * x
                    },
                });
            }
        }
        for c in &f.corrections {
            if let Some(a) = c.after.filter(|_| c.before.abs() > 1e-12) {
                fixes.push(BarRow {
                    label: format!("{name}: {}", c.text),
                    before: Some(100.0),
                    value: 100.0 * a / c.before,
                });
            }
        }
    }
    if !shares.is_empty() {
        out.push(Plot {
            id: "plot-causes",
            caption: "Each finding's sources, as Shapley shares of the change in the finding's own quantity when every source is removed (the tables under Root cause give the quantity and the amplifiers).".into(),
            svg: bar_chart("Root-cause shares per finding", "share of the finding's quantity (%)", &shares, "%"),
        });
    }
    if !fixes.is_empty() {
        out.push(Plot {
            id: "plot-corrections",
            caption: "Each correction re-run: the quantity of the finding it answers before (hatched outline, 100 %) and after (filled), as a percentage of before; lower is better except for the surface pressure of telescoping.".into(),
            svg: bar_chart(
                "Corrections: the finding's quantity before and after",
                "finding's quantity after the correction (% of before)",
                &fixes,
                "%",
            ),
        });
    }
    out
}

/// Every plot of the report, in reader order.
pub fn all(r: &ReportData) -> Vec<Plot> {
    let mut v = vec![lane_length(r)];
    v.extend(bars(r));
    v.extend(surveys(r));
    v.extend(stress(r));
    v.push(moisture(r));
    v
}
