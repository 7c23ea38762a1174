//! Line and bar charts drawn with plotters' SVG backend into strings.
//!
//! Every chart has axis titles with units, ticks, a zero line, a set font family, and marks that
//! do not rely on colour alone: each series has its own marker shape or dash pattern and a
//! legend entry or a label. Text handed to plotters is escaped by plotters itself (its SVG
//! backend writes `&`, `<`, `>`, quotes as entities); characters XML does not allow are dropped
//! first ([`super::escape::plot_text`]).
//!
//! **Invariant:** the only file that knows plotters.

use super::escape::plot_text;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

pub use plotters::style::RGBColor;

/// Font family of every plot's text.
pub const FONT: &str = "DejaVu Sans, Helvetica, Arial, sans-serif";
/// Plot width, px.
const W: u32 = 760;
/// Plot height, px.
const H: u32 = 380;

/// A plot: an id for the HTML anchor, a caption, the SVG.
#[derive(Debug, Clone, PartialEq)]
pub struct Plot {
    pub id: &'static str,
    pub caption: String,
    pub svg: String,
}

/// Marker of a point series.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Marker {
    None,
    Circle,
    Triangle,
    Square,
    Cross,
}

/// Line pattern of a series.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Line {
    None,
    Solid,
    Dashed,
    Dotted,
}

/// One series of a line chart.
#[derive(Debug, Clone)]
pub struct Series {
    pub label: String,
    pub points: Vec<(f64, f64)>,
    /// Half-height of an error bar at each point (same units as y), if any.
    pub errors: Option<f64>,
    pub line: Line,
    pub marker: Marker,
    /// Markers: `None` at every point, `Some(n)` at about n points spread evenly along the x
    /// axis (staggered between series).
    pub marker_count: Option<usize>,
    pub color: RGBColor,
}

/// A horizontal reference line with a label.
#[derive(Debug, Clone)]
pub struct HLine {
    pub y: f64,
    pub label: String,
}

/// A shaded x range with a label (hatched so it does not rely on colour).
#[derive(Debug, Clone)]
pub struct Band {
    pub x0: f64,
    pub x1: f64,
    pub label: Option<String>,
}

/// A line chart.
#[derive(Debug, Clone)]
pub struct Chart {
    pub title: String,
    pub x_label: String,
    pub y_label: String,
    pub series: Vec<Series>,
    pub hlines: Vec<HLine>,
    pub bands: Vec<Band>,
    /// Fixed x range, else from the data.
    pub x_range: Option<(f64, f64)>,
}

/// Colours that stay apart for common colour-vision deficiencies (Okabe and Ito 2008 palette).
pub const PALETTE: [RGBColor; 6] = [
    RGBColor(0, 114, 178),
    RGBColor(213, 94, 0),
    RGBColor(0, 158, 115),
    RGBColor(204, 121, 167),
    RGBColor(86, 180, 233),
    RGBColor(230, 159, 0),
];
/// Markers in the order series take them.
pub const MARKERS: [Marker; 4] = [
    Marker::Circle,
    Marker::Triangle,
    Marker::Square,
    Marker::Cross,
];

type Err = Box<dyn std::error::Error>;

/// Axis limits covering the values (and zero if asked), padded by the given fractions of the
/// span below and above.
fn range(vals: impl Iterator<Item = f64>, include_zero: bool, pad: (f64, f64)) -> (f64, f64) {
    let (mut lo, mut hi) = (f64::INFINITY, f64::NEG_INFINITY);
    for v in vals.filter(|v| v.is_finite()) {
        lo = lo.min(v);
        hi = hi.max(v);
    }
    if include_zero {
        lo = lo.min(0.0);
        hi = hi.max(0.0);
    }
    if !lo.is_finite() || !hi.is_finite() {
        return (0.0, 1.0);
    }
    let span = (hi - lo).max(1e-9 * hi.abs().max(1.0)).max(1e-12);
    (lo - pad.0 * span, hi + pad.1 * span)
}

/// Tick label with a sensible number of decimals for the axis span.
pub fn tick(v: f64, span: f64) -> String {
    let d = if span >= 50.0 {
        0
    } else if span >= 5.0 {
        1
    } else if span >= 0.5 {
        2
    } else {
        3
    };
    let s = format!("{v:.d$}");
    if s.starts_with('-') && s[1..].chars().all(|c| c == '0' || c == '.') {
        s[1..].to_string()
    } else {
        s
    }
}

fn draw_marker<DB: DrawingBackend>(
    chart: &mut ChartContext<
        DB,
        Cartesian2d<plotters::coord::types::RangedCoordf64, plotters::coord::types::RangedCoordf64>,
    >,
    pts: &[(f64, f64)],
    m: Marker,
    c: RGBColor,
) -> Result<(), Err>
where
    DB::ErrorType: 'static,
{
    let st = c.stroke_width(2);
    match m {
        Marker::None => {}
        Marker::Circle => {
            chart.draw_series(pts.iter().map(|p| Circle::new(*p, 4, c.filled())))?;
        }
        Marker::Triangle => {
            chart.draw_series(pts.iter().map(|p| TriangleMarker::new(*p, 5, c.filled())))?;
        }
        Marker::Square => {
            chart
                .draw_series(pts.iter().map(|p| {
                    EmptyElement::at(*p) + Rectangle::new([(-4, -4), (4, 4)], c.filled())
                }))?;
        }
        Marker::Cross => {
            chart.draw_series(pts.iter().map(|p| Cross::new(*p, 6, st)))?;
        }
    }
    Ok(())
}

/// Legend line pieces: three segments whose spacing shows the series' line pattern.
fn legend_segments(line: Line, c: RGBColor) -> [PathElement<(i32, i32)>; 3] {
    let st = match line {
        Line::None => c.mix(0.0).stroke_width(2),
        _ => c.stroke_width(2),
    };
    let segs: [(i32, i32); 3] = match line {
        Line::Solid | Line::None => [(0, 8), (8, 15), (15, 22)],
        Line::Dashed => [(0, 6), (9, 14), (17, 22)],
        Line::Dotted => [(0, 2), (10, 12), (20, 22)],
    };
    segs.map(|(a, b)| PathElement::new(vec![(a, 0), (b, 0)], st))
}

/// Marker fill: the series' colour for its own marker, invisible for the others.
fn marker_style(own: Marker, this: Marker, c: RGBColor) -> ShapeStyle {
    if own == this {
        c.filled()
    } else {
        c.mix(0.0).filled()
    }
}

/// Axis area for a line chart: x and y ranges covering the data, references and zero.
fn ranges(c: &Chart) -> ((f64, f64), (f64, f64)) {
    let xs = c
        .series
        .iter()
        .flat_map(|s| s.points.iter().map(|p| p.0))
        .chain(c.bands.iter().flat_map(|b| [b.x0, b.x1]));
    let (x0, x1) = c.x_range.unwrap_or_else(|| range(xs, false, (0.03, 0.03)));
    let ys = c
        .series
        .iter()
        .flat_map(|s| {
            let e = s.errors.unwrap_or(0.0);
            s.points.iter().flat_map(move |p| [p.1 - e, p.1 + e])
        })
        .chain(c.hlines.iter().map(|h| h.y));
    // headroom for the legend (upper left): about 18 px a row plus its frame, on a plot area
    // of about 280 px
    let rows = c.series.iter().filter(|s| !s.label.is_empty()).count() as f64;
    let q = ((rows * 18.0 + 36.0) / 280.0).min(0.7);
    let top = if rows > 0.0 {
        (1.08 * q / (1.0 - q)).max(0.12)
    } else {
        0.12
    };
    ((x0, x1), range(ys, true, (0.1, top)))
}

/// The chart context of a line chart.
type Ctx<'a, DB> = ChartContext<
    'a,
    DB,
    Cartesian2d<plotters::coord::types::RangedCoordf64, plotters::coord::types::RangedCoordf64>,
>;

/// Plot area limits: (x0, x1, y0, y1).
type Limits = (f64, f64, f64, f64);

/// Draw a line chart into an area.
fn draw_chart<'a, DB: DrawingBackend + 'a>(
    area: &'a DrawingArea<DB, Shift>,
    c: &Chart,
) -> Result<(), Err>
where
    DB::ErrorType: 'static,
{
    let ((x0, x1), (y0, y1)) = ranges(c);
    let mut chart = ChartBuilder::on(area)
        .caption(plot_text(&c.title, 110), (FONT, 17))
        .margin(12)
        .x_label_area_size(46)
        .y_label_area_size(64)
        .build_cartesian_2d(x0..x1, y0..y1)?;
    let (xs, ys) = (x1 - x0, y1 - y0);
    chart
        .configure_mesh()
        .x_desc(plot_text(&c.x_label, 90))
        .y_desc(plot_text(&c.y_label, 60))
        .axis_desc_style((FONT, 14))
        .label_style((FONT, 12))
        .x_labels(9)
        .y_labels(7)
        .x_label_formatter(&|v| tick(*v, xs))
        .y_label_formatter(&|v| tick(*v, ys))
        .max_light_lines(1)
        .light_line_style(RGBColor(240, 240, 240))
        .bold_line_style(RGBColor(215, 215, 215))
        .axis_style(BLACK.stroke_width(1))
        .draw()?;
    let lim = (x0, x1, y0, y1);
    for b in &c.bands {
        draw_band(&mut chart, b, lim)?;
    }
    // zero line
    chart.draw_series(LineSeries::new(
        [(x0, 0.0), (x1, 0.0)],
        BLACK.stroke_width(1),
    ))?;
    for h in &c.hlines {
        draw_hline(&mut chart, h, lim)?;
    }
    for (si, s) in c.series.iter().enumerate() {
        draw_one_series(&mut chart, si, s, xs)?;
    }
    if c.series.iter().any(|s| !s.label.is_empty()) {
        chart
            .configure_series_labels()
            .position(SeriesLabelPosition::UpperLeft)
            .background_style(WHITE.mix(0.9))
            .border_style(RGBColor(120, 120, 120))
            .label_font((FONT, 12))
            .legend_area_size(30)
            .draw()?;
    }
    Ok(())
}

/// A shaded, hatched x range (hatching shows in grey print as well) with its label.
fn draw_band<DB: DrawingBackend>(chart: &mut Ctx<DB>, b: &Band, lim: Limits) -> Result<(), Err>
where
    DB::ErrorType: 'static,
{
    let (x0, x1, y0, y1) = lim;
    let (step, ys) = ((x1 - x0) / 120.0, y1 - y0);
    chart.draw_series(std::iter::once(Rectangle::new(
        [(b.x0, y0), (b.x1, y1)],
        RGBColor(120, 120, 120).mix(0.10).filled(),
    )))?;
    let mut hatch = Vec::new();
    let mut x = b.x0;
    while x < b.x1 {
        hatch.push(PathElement::new(
            vec![(x, y0), ((x + 0.3 * step).min(b.x1), y0 + 0.03 * ys)],
            RGBColor(90, 90, 90).stroke_width(1),
        ));
        x += step;
    }
    chart.draw_series(hatch)?;
    if let Some(l) = &b.label {
        chart.draw_series(std::iter::once(Text::new(
            plot_text(l, 40),
            (0.5 * (b.x0 + b.x1), y0 + 0.05 * ys),
            (FONT, 12)
                .into_font()
                .color(&RGBColor(60, 60, 60))
                .pos(Pos::new(HPos::Center, VPos::Bottom)),
        )))?;
    }
    Ok(())
}

/// A dashed horizontal reference line labelled at its right end.
fn draw_hline<DB: DrawingBackend>(chart: &mut Ctx<DB>, h: &HLine, lim: Limits) -> Result<(), Err>
where
    DB::ErrorType: 'static,
{
    let (x0, x1, y0, y1) = lim;
    let st = RGBColor(80, 80, 80).stroke_width(1);
    chart.draw_series(DashedLineSeries::new([(x0, h.y), (x1, h.y)], 3, 4, st))?;
    chart.draw_series(std::iter::once(Text::new(
        plot_text(&h.label, 80),
        (x1 - 0.01 * (x1 - x0), h.y + 0.01 * (y1 - y0)),
        (FONT, 12)
            .into_font()
            .color(&RGBColor(60, 60, 60))
            .pos(Pos::new(HPos::Right, VPos::Bottom)),
    )))?;
    Ok(())
}

/// One series: error bars, the line in its pattern, its legend entry, its markers.
fn draw_one_series<'a, DB: DrawingBackend + 'a>(
    chart: &mut Ctx<'a, DB>,
    si: usize,
    s: &Series,
    xs: f64,
) -> Result<(), Err>
where
    DB::ErrorType: 'static,
{
    let st = s.color.stroke_width(2);
    if let Some(e) = s.errors {
        let cap = 0.004 * xs;
        chart.draw_series(s.points.iter().map(|&(x, y)| {
            PathElement::new(
                vec![
                    (x - cap, y - e),
                    (x + cap, y - e),
                    (x, y - e),
                    (x, y + e),
                    (x - cap, y + e),
                    (x + cap, y + e),
                ],
                s.color.stroke_width(1),
            )
        }))?;
    }
    let pts = s.points.clone();
    let anno = match s.line {
        Line::Solid => chart.draw_series(LineSeries::new(pts, st))?,
        Line::Dashed => chart.draw_series(DashedLineSeries::new(pts, 8, 5, st))?,
        Line::Dotted => chart.draw_series(DashedLineSeries::new(pts, 2, 4, st))?,
        Line::None => chart.draw_series(std::iter::empty::<Circle<(f64, f64), i32>>())?,
    };
    let (line, marker, color) = (s.line, s.marker, s.color);
    // every marker kind is present and only the series' own is visible: one concrete type
    anno.label(plot_text(&s.label, 60)).legend(move |(x, y)| {
        let [a, b, c] = legend_segments(line, color);
        let m = |k| marker_style(marker, k, color);
        EmptyElement::at((x, y))
            + a
            + b
            + c
            + Circle::new((11, 0), 4, m(Marker::Circle))
            + TriangleMarker::new((11, 0), 5, m(Marker::Triangle))
            + Rectangle::new([(7, -4), (15, 4)], m(Marker::Square))
            + Cross::new((11, 0), 4, m(Marker::Cross).stroke_width(2))
    });
    // markers of successive series are staggered so that coinciding curves stay visible
    let marks = match s.marker_count {
        Some(n) => super::marks::spread(&s.points, n, si),
        None => s.points.clone(),
    };
    draw_marker(chart, &marks, s.marker, s.color)
}

/// Render into an SVG string of the given size.
fn render(
    (w, h): (u32, u32),
    f: impl FnOnce(&DrawingArea<SVGBackend, Shift>) -> Result<(), Err>,
) -> String {
    let mut buf = String::new();
    let result = {
        let root = SVGBackend::with_string(&mut buf, (w, h)).into_drawing_area();
        root.fill(&WHITE)
            .map_err(|e| Box::new(e) as Err)
            .and_then(|_| f(&root))
            .and_then(|_| root.present().map_err(|e| Box::new(e) as Err))
    };
    match result {
        Ok(()) => buf,
        Err(e) => format!(
            "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{w}\" height=\"40\" viewBox=\"0 0 {w} 40\"><text x=\"8\" y=\"24\" font-family=\"{FONT}\">{}</text></svg>\n",
            super::escape::html(&format!("plot could not be drawn: {e}"))
        ),
    }
}

/// A line chart as SVG.
pub fn line_chart(c: &Chart) -> String {
    render((W, H), |a| draw_chart(a, c))
}

/// One row of a bar chart: a label and one or two values (before, after).
#[derive(Debug, Clone)]
pub struct BarRow {
    pub label: String,
    pub before: Option<f64>,
    pub value: f64,
}

/// Horizontal bars, one row per item, each labelled with its name and value.
pub fn bar_chart(title: &str, x_label: &str, rows: &[BarRow], unit: &str) -> String {
    let n = rows.len().max(1);
    let h = 110 + 46 * n as u32;
    render((W, h), |area| {
        let xmax = rows
            .iter()
            .flat_map(|r| [r.value, r.before.unwrap_or(0.0)])
            .filter(|v| v.is_finite())
            .fold(0.0f64, f64::max)
            .max(1e-9)
            * 1.12;
        let mut chart = ChartBuilder::on(area)
            .caption(plot_text(title, 110), (FONT, 17))
            .margin(12)
            .x_label_area_size(46)
            .y_label_area_size(16)
            .build_cartesian_2d(0.0..xmax, 0.0..n as f64)?;
        chart
            .configure_mesh()
            .disable_y_mesh()
            .y_labels(0)
            .x_desc(plot_text(x_label, 90))
            .axis_desc_style((FONT, 14))
            .label_style((FONT, 12))
            .x_labels(8)
            .x_label_formatter(&|v| tick(*v, xmax))
            .max_light_lines(1)
            .light_line_style(RGBColor(240, 240, 240))
            .bold_line_style(RGBColor(215, 215, 215))
            .axis_style(BLACK.stroke_width(1))
            .draw()?;
        // zero line
        chart.draw_series(LineSeries::new(
            [(0.0, 0.0), (0.0, n as f64)],
            BLACK.stroke_width(2),
        ))?;
        for (k, r) in rows.iter().enumerate() {
            draw_bar_row(&mut chart, r, n as f64 - k as f64, xmax, unit)?;
        }
        Ok(())
    })
}

/// One bar row with its top at `top`: the label with its values, then the bars (before: grey
/// hatched outline; after or the only value: filled).
fn draw_bar_row<DB: DrawingBackend>(
    chart: &mut Ctx<DB>,
    r: &BarRow,
    top: f64,
    xmax: f64,
    unit: &str,
) -> Result<(), Err>
where
    DB::ErrorType: 'static,
{
    let label = plot_text(r.label.trim_end_matches('.'), 70);
    let text = match r.before {
        Some(b) => format!(
            "{label} ({} → {} {unit})",
            tick(b, xmax),
            tick(r.value, xmax)
        ),
        None => format!("{label} ({:.0} {unit})", r.value),
    };
    chart.draw_series(std::iter::once(Text::new(
        text,
        (0.005 * xmax, top - 0.06),
        (FONT, 12)
            .into_font()
            .color(&BLACK)
            .pos(Pos::new(HPos::Left, VPos::Top)),
    )))?;
    let Some(b) = r.before else {
        chart.draw_series(std::iter::once(Rectangle::new(
            [(0.0, top - 0.45), (r.value.max(0.0), top - 0.85)],
            PALETTE[0].filled(),
        )))?;
        return Ok(());
    };
    chart.draw_series(std::iter::once(Rectangle::new(
        [(0.0, top - 0.45), (b, top - 0.65)],
        RGBColor(90, 90, 90).stroke_width(1),
    )))?;
    let step = xmax / 45.0;
    let mut x = 0.0;
    let mut hatch = Vec::new();
    while x + 0.4 * step < b {
        hatch.push(PathElement::new(
            vec![(x, top - 0.65), (x + 0.4 * step, top - 0.45)],
            RGBColor(90, 90, 90).stroke_width(1),
        ));
        x += step;
    }
    chart.draw_series(hatch)?;
    chart.draw_series(std::iter::once(Rectangle::new(
        [(0.0, top - 0.68), (r.value.max(0.0), top - 0.90)],
        PALETTE[0].filled(),
    )))?;
    Ok(())
}
