//! The report's plots, drawn with `plotters` into SVG strings (no font libraries: the SVG text is
//! drawn by the browser). Every plot has axis titles with units in the report's unit system;
//! every value drawn is finite (non-finite points are left out, never drawn at 0).
//!
//! The limit is drawn the same way everywhere: a solid black line for the limit, a dashed black
//! line for the limit minus the margin, each named in the legend (never colour alone).

use anyhow::anyhow;
use plotters::coord::Shift;
use plotters::coord::types::RangedCoordf64;
use plotters::element::ComposedElement;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::compute::{LeafResult, MapResult, SweepResult, colour};
use super::document::MapQuantity;
use super::units::{Quantity, UnitSystem};

/// Width of the line plots \[px of the SVG's own coordinates\].
pub const PLOT_WIDTH: u32 = 760;
/// Height of the line plots.
pub const PLOT_HEIGHT: u32 = 350;
/// Height of the energy-budget bar chart.
pub const BUDGET_HEIGHT: u32 = 310;

const FONT: &str = "sans-serif";
const TITLE_PX: u32 = 19;
const DESC_PX: u32 = 17;
const LABEL_PX: u32 = 15;
const LEGEND_PX: u32 = 15;

/// Curve colours, the scenario's leaf size first: the Okabe–Ito colour-blind-safe set
/// (vermillion, blue, bluish green, reddish purple, orange, sky blue) and grey.
pub const CURVE_COLOURS: [RGBColor; 7] = [
    RGBColor(213, 94, 0),
    RGBColor(0, 114, 178),
    RGBColor(0, 158, 115),
    RGBColor(204, 121, 167),
    RGBColor(230, 159, 0),
    RGBColor(86, 180, 233),
    RGBColor(110, 110, 110),
];

const LIMIT_COLOUR: RGBColor = RGBColor(0, 0, 0);
const GRID_BOLD: RGBColor = RGBColor(200, 200, 200);
const GRID_LIGHT: RGBColor = RGBColor(235, 235, 235);

/// One term of the energy budget as the bar chart draws it.
#[derive(Debug, Clone, PartialEq)]
pub struct BudgetBar {
    /// Name in the legend and table.
    pub name: &'static str,
    /// Size of the flow \[W m⁻²\], positive.
    pub w_m2: f64,
    /// Into the leaf (true) or out of it (false).
    pub gain: bool,
    /// Colour of its bar segment.
    pub colour: RGBColor,
}

/// A line chart of the report on a drawing area, in display units.
type LineChart<'a, 'b> =
    ChartContext<'a, SVGBackend<'b>, Cartesian2d<RangedCoordf64, RangedCoordf64>>;

/// The chart frame every line plot of the report shares: caption, margins, axes and grid with
/// their titles (units included by the caller).
fn line_chart<'a, 'b>(
    root: &'a DrawingArea<SVGBackend<'b>, Shift>,
    caption: &str,
    x: std::ops::Range<f64>,
    y: std::ops::Range<f64>,
    x_title: String,
    y_title: String,
) -> anyhow::Result<LineChart<'a, 'b>> {
    let mut chart = ChartBuilder::on(root)
        .caption(caption, (FONT, TITLE_PX))
        .margin(12)
        .x_label_area_size(48)
        .y_label_area_size(64)
        .build_cartesian_2d(x, y)
        .map_err(err)?;
    let t = |v: &f64| tick(*v);
    chart
        .configure_mesh()
        .bold_line_style(GRID_BOLD)
        .light_line_style(GRID_LIGHT)
        .x_desc(x_title)
        .y_desc(y_title)
        .x_label_formatter(&t)
        .y_label_formatter(&t)
        .axis_desc_style((FONT, DESC_PX))
        .label_style((FONT, LABEL_PX))
        .draw()
        .map_err(err)?;
    Ok(chart)
}

/// The legend box of a line chart, top right.
fn draw_legend<'a, 'b: 'a>(chart: &mut LineChart<'a, 'b>) -> anyhow::Result<()> {
    chart
        .configure_series_labels()
        .position(SeriesLabelPosition::UpperRight)
        .background_style(WHITE.mix(0.92))
        .border_style(RGBColor(120, 120, 120))
        .label_font((FONT, LEGEND_PX))
        .draw()
        .map_err(err)
}

/// The scenario's own point on a line chart, with its legend entry.
fn draw_now(chart: &mut LineChart<'_, '_>, point: (f64, f64)) -> anyhow::Result<()> {
    chart
        .draw_series(std::iter::once(Circle::new(point, 6, stroke(BLACK, 2))))
        .map_err(err)?
        .label("the scenario now")
        .legend(|(x, y)| Circle::new((x + 11, y), 5, stroke(BLACK, 2)));
    Ok(())
}

fn err<E: std::fmt::Display>(e: E) -> anyhow::Error {
    anyhow!("could not draw a plot: {e}")
}

/// An axis title with its unit: "air speed [m/s]".
#[must_use]
pub fn axis_title(name: &str, q: Quantity, units: UnitSystem) -> String {
    let u = q.unit(units);
    if u.is_empty() {
        name.to_owned()
    } else {
        format!("{name} [{u}]")
    }
}

/// A tick label: about three significant figures, trailing zeros dropped.
#[must_use]
pub fn tick(v: f64) -> String {
    if !v.is_finite() {
        return String::new();
    }
    if v.abs() < 1e-12 {
        return "0".to_owned();
    }
    let digits = (2 - v.abs().log10().floor() as i32).clamp(0, 6) as usize;
    let s = format!("{v:.digits$}");
    if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_owned()
    } else {
        s
    }
}

/// Tick positions 1, 2, 5 × 10ⁿ inside `lo..=hi` (bold, labelled) and 1…9 × 10ⁿ (light).
#[must_use]
pub fn log_ticks(lo: f64, hi: f64) -> (Vec<f64>, Vec<f64>) {
    let mut bold = Vec::new();
    let mut light = Vec::new();
    if !(lo > 0.0 && hi > lo && hi.is_finite()) {
        return (bold, light);
    }
    let first = lo.log10().floor() as i32;
    let last = hi.log10().ceil() as i32;
    for n in first..=last {
        for k in 1..=9 {
            let v = f64::from(k) * 10f64.powi(n);
            if v < lo * (1.0 - 1e-9) || v > hi * (1.0 + 1e-9) {
                continue;
            }
            if matches!(k, 1 | 2 | 5) {
                bold.push(v);
            } else {
                light.push(v);
            }
        }
    }
    (bold, light)
}

/// Adds an accessible name to the SVG's root element.
fn finish(svg: String, label: &str) -> String {
    let label = super::html::attr(label);
    match svg.strip_prefix("<svg ") {
        Some(rest) => format!("<svg role=\"img\" aria-label=\"{label}\" {rest}"),
        None => svg,
    }
}

/// Two dashes side by side, in backend pixels.
type DashedSample<DB> =
    ComposedElement<(i32, i32), DB, PathElement<(i32, i32)>, PathElement<(i32, i32)>>;

/// A legend sample of a dashed line: two dashes.
fn dashed_sample<DB: DrawingBackend>(x: i32, y: i32, s: ShapeStyle) -> DashedSample<DB> {
    EmptyElement::at((x, y))
        + PathElement::new(vec![(0, 0), (8, 0)], s)
        + PathElement::new(vec![(13, 0), (22, 0)], s)
}

fn stroke(c: RGBColor, width: u32) -> ShapeStyle {
    ShapeStyle {
        color: c.to_rgba(),
        filled: false,
        stroke_width: width,
    }
}

/// A rounded-outward range that contains every value and `extra`, with a little headroom.
fn padded_range(values: impl Iterator<Item = f64>, pad_frac: f64) -> Option<(f64, f64)> {
    let (lo, hi) = values
        .filter(|v| v.is_finite())
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| {
            (a.min(v), b.max(v))
        });
    if !lo.is_finite() || !hi.is_finite() {
        return None;
    }
    let span = (hi - lo).max(0.5);
    Some((lo - pad_frac * span, hi + pad_frac * span))
}

/// The part of a decreasing curve below `y_max`, entering at `y_max` by linear interpolation (so
/// nothing is drawn outside the plot area; plotters does not clip).
fn below(points: &[(f64, f64)], y_max: f64) -> Vec<(f64, f64)> {
    let Some(first_in) = points.iter().position(|p| p.1 <= y_max) else {
        return Vec::new();
    };
    let mut out = Vec::with_capacity(points.len() - first_in + 1);
    if first_in > 0 {
        let (a, b) = (points[first_in - 1], points[first_in]);
        if (a.1 - b.1).abs() > 0.0 {
            let t = (a.1 - y_max) / (a.1 - b.1);
            out.push((a.0 + t * (b.0 - a.0), y_max));
        }
    }
    out.extend(points[first_in..].iter().copied().filter(|p| p.1 <= y_max));
    out
}

fn legend_box(
    root: &DrawingArea<SVGBackend<'_>, Shift>,
    x: i32,
    y: i32,
    entries: &[(String, ShapeStyle, bool)],
) -> anyhow::Result<()> {
    // A legend drawn beside the chart with plotters elements: a line (or filled swatch) and text.
    let style = TextStyle::from((FONT, LEGEND_PX).into_font()).color(&BLACK);
    for (i, (name, s, filled)) in entries.iter().enumerate() {
        let yy = y + i as i32 * 22;
        if *filled {
            root.draw(&Rectangle::new([(x, yy - 6), (x + 22, yy + 6)], s.filled()))
                .map_err(err)?;
        } else {
            root.draw(&PathElement::new(vec![(x, yy), (x + 22, yy)], *s))
                .map_err(err)?;
        }
        root.draw(&Text::new(name.clone(), (x + 30, yy - 8), style.clone()))
            .map_err(err)?;
    }
    Ok(())
}

/// A legend sample.
#[derive(Debug, Clone, Copy)]
enum Sample {
    /// A solid line.
    Line(ShapeStyle),
    /// A dashed line.
    Dashed(ShapeStyle),
    /// An open black circle.
    Circle,
}

/// A one-row legend drawn with plotters elements: sample, then its name, left to right (text
/// widths estimated at 0.55 of the drawn em per character; SVG text is laid out by the viewer).
fn legend_row(
    root: &DrawingArea<SVGBackend<'_>, Shift>,
    x0: i32,
    y: i32,
    entries: &[(String, Sample)],
) -> anyhow::Result<()> {
    let style = TextStyle::from((FONT, LEGEND_PX).into_font()).color(&BLACK);
    let mut x = x0;
    for (name, sample) in entries {
        match *sample {
            Sample::Line(s) => root
                .draw(&PathElement::new(vec![(x, y), (x + 22, y)], s))
                .map_err(err)?,
            Sample::Dashed(s) => root.draw(&dashed_sample(x, y, s)).map_err(err)?,
            Sample::Circle => root
                .draw(&Circle::new((x + 11, y), 6, stroke(BLACK, 2)))
                .map_err(err)?,
        }
        root.draw(&Text::new(name.clone(), (x + 30, y - 8), style.clone()))
            .map_err(err)?;
        let chars = i32::try_from(name.chars().count()).unwrap_or(20);
        x += 30 + chars * (LEGEND_PX as i32) * 45 / 100 + 26;
    }
    Ok(())
}

/// The energy budget as two stacked bars — into the leaf and out of it — of equal height when
/// the balance closes.
///
/// # Errors
/// A drawing failure (not expected).
pub fn budget_svg(bars: &[BudgetBar]) -> anyhow::Result<String> {
    let w_m2 = Quantity::Same("W/m²");
    let units = UnitSystem::Si;
    let total = |gain: bool| -> f64 {
        bars.iter()
            .filter(|b| b.gain == gain && b.w_m2.is_finite())
            .map(|b| b.w_m2)
            .sum()
    };
    let top = total(true).max(total(false)).max(1.0) * 1.08;
    let mut svg = String::new();
    {
        let root =
            SVGBackend::with_string(&mut svg, (PLOT_WIDTH, BUDGET_HEIGHT)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let (left, right) = root.split_horizontally(430);
        let mut chart = ChartBuilder::on(&left)
            .caption("Energy budget of the leaf", (FONT, TITLE_PX))
            .margin(12)
            .x_label_area_size(40)
            .y_label_area_size(72)
            .build_cartesian_2d((0u32..1u32).into_segmented(), 0.0..top)
            .map_err(err)?;
        let side = |v: &SegmentValue<u32>| match v {
            SegmentValue::CenterOf(0) => "into the leaf".to_owned(),
            SegmentValue::CenterOf(1) => "out of the leaf".to_owned(),
            _ => String::new(),
        };
        let ytick = |v: &f64| tick(*v);
        chart
            .configure_mesh()
            .disable_x_mesh()
            .bold_line_style(GRID_BOLD)
            .light_line_style(GRID_LIGHT)
            .max_light_lines(1)
            .x_desc("flow of energy")
            .y_desc(axis_title("flux per leaf area", w_m2, units))
            .x_label_formatter(&side)
            .y_label_formatter(&ytick)
            .axis_desc_style((FONT, DESC_PX))
            .label_style((FONT, LABEL_PX))
            .draw()
            .map_err(err)?;
        let mut base = [0.0_f64; 2];
        for b in bars.iter().filter(|b| b.w_m2.is_finite() && b.w_m2 > 0.0) {
            let i = usize::from(!b.gain);
            let (y0, y1) = (base[i], base[i] + b.w_m2);
            base[i] = y1;
            let x = i as u32;
            let mut rect = Rectangle::new(
                [
                    (SegmentValue::Exact(x), y0),
                    (SegmentValue::Exact(x + 1), y1),
                ],
                b.colour.filled(),
            );
            rect.set_margin(0, 0, 28, 28);
            chart.draw_series(std::iter::once(rect)).map_err(err)?;
            chart
                .draw_series(std::iter::once(Rectangle::new(
                    [
                        (SegmentValue::Exact(x), y0),
                        (SegmentValue::Exact(x + 1), y1),
                    ],
                    stroke(WHITE, 1),
                )))
                .map_err(err)?;
            if b.w_m2 > 0.07 * top {
                let label = format!("{:.0}", b.w_m2);
                let style = TextStyle::from((FONT, LABEL_PX).into_font())
                    .color(&BLACK)
                    .pos(Pos::new(HPos::Center, VPos::Center));
                chart
                    .draw_series(std::iter::once(Text::new(
                        label,
                        (SegmentValue::CenterOf(x), 0.5 * (y0 + y1)),
                        style,
                    )))
                    .map_err(err)?;
            }
        }
        let entries: Vec<(String, ShapeStyle, bool)> = bars
            .iter()
            .filter(|b| b.w_m2.is_finite() && b.w_m2 > 0.0)
            .map(|b| {
                let dir = if b.gain { "in" } else { "out" };
                (
                    format!("{} ({dir}) {:.0} W/m²", b.name, b.w_m2),
                    b.colour.filled(),
                    true,
                )
            })
            .collect();
        legend_box(&right, 10, 70, &entries)?;
        root.present().map_err(err)?;
    }
    Ok(finish(
        svg,
        "Energy budget: bars of the energy flowing into and out of the leaf",
    ))
}

/// Leaf − air temperature difference against air speed, one curve per leaf size, with the limit
/// and the limit minus the margin (as differences from the air), the least air speed and the
/// scenario's own point.
///
/// # Errors
/// A drawing failure (not expected).
pub fn sweep_diff_svg(
    sweep: &SweepResult,
    leaf: &LeafResult,
    least_speed_m_s: Option<f64>,
    units: UnitSystem,
) -> anyhow::Result<String> {
    let (sp, dq) = (Quantity::Speed, Quantity::TempDiff);
    let air = sweep.air_temp_c;
    let limit_diff = leaf.limit_c - air;
    let margin_diff = limit_diff - leaf.margin_k;
    let x_max = sweep
        .curves
        .first()
        .and_then(|c| c.speeds_m_s.last().copied())
        .unwrap_or(1.0);
    let x_max_d = sp.to_display(x_max, units);
    let values = sweep
        .curves
        .iter()
        .flat_map(|c| c.diff_k.iter().flatten().copied())
        .chain([limit_diff, margin_diff, 0.0])
        .map(|v| dq.to_display(v, units));
    let (y0, y1) = padded_range(values, 0.08).unwrap_or((-1.0, 1.0));
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (PLOT_WIDTH, PLOT_HEIGHT)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let mut chart = line_chart(
            &root,
            "Leaf temperature above the air, by air speed",
            0.0..x_max_d,
            y0..y1,
            axis_title("air speed over the leaf", sp, units),
            axis_title("leaf − air", dq, units),
        )?;
        // The air temperature itself (difference zero).
        chart
            .draw_series(LineSeries::new(
                [(0.0, 0.0), (x_max_d, 0.0)],
                stroke(RGBColor(150, 150, 150), 1),
            ))
            .map_err(err)?;
        let limit_name = format!(
            "limit {}",
            super::tables::show(Quantity::Temperature, leaf.limit_c, units)
        );
        let margin_name = format!(
            "limit − margin {}",
            super::tables::show(Quantity::Temperature, leaf.limit_c - leaf.margin_k, units)
        );
        let ld = dq.to_display(limit_diff, units);
        let md = dq.to_display(margin_diff, units);
        chart
            .draw_series(LineSeries::new(
                [(0.0, ld), (x_max_d, ld)],
                stroke(LIMIT_COLOUR, 2),
            ))
            .map_err(err)?
            .label(limit_name)
            .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 22, y)], stroke(LIMIT_COLOUR, 2)));
        chart
            .draw_series(DashedLineSeries::new(
                [(0.0, md), (x_max_d, md)],
                8,
                5,
                stroke(LIMIT_COLOUR, 2),
            ))
            .map_err(err)?
            .label(margin_name)
            .legend(|(x, y)| dashed_sample(x, y, stroke(LIMIT_COLOUR, 2)));
        for (i, c) in sweep.curves.iter().enumerate() {
            let colour = CURVE_COLOURS[i % CURVE_COLOURS.len()];
            let width = if i == 0 { 3 } else { 2 };
            let pts: Vec<(f64, f64)> = c
                .speeds_m_s
                .iter()
                .zip(&c.diff_k)
                .filter_map(|(&u, d)| d.map(|d| (sp.to_display(u, units), dq.to_display(d, units))))
                .filter(|p| p.0.is_finite() && p.1.is_finite())
                .collect();
            let name = size_name(c.size_m, i == 0, units);
            chart
                .draw_series(LineSeries::new(pts, stroke(colour, width)))
                .map_err(err)?
                .label(name)
                .legend(move |(x, y)| {
                    PathElement::new(vec![(x, y), (x + 22, y)], stroke(colour, 3))
                });
        }
        if let Some(u) = least_speed_m_s.filter(|u| *u > 0.0 && *u <= x_max) {
            let ud = sp.to_display(u, units);
            chart
                .draw_series(DashedLineSeries::new(
                    [(ud, y0), (ud, y1)],
                    4,
                    4,
                    stroke(CURVE_COLOURS[0], 1),
                ))
                .map_err(err)?
                .label(format!(
                    "least air speed {}",
                    super::tables::show(sp, u, units)
                ))
                .legend(|(x, y)| dashed_sample(x, y, stroke(CURVE_COLOURS[0], 2)));
        }
        let (u_now, d_now) = (leaf.case.air.speed_m_s, leaf.solution.leaf_air_diff_k);
        if u_now <= x_max && d_now.is_finite() {
            draw_now(
                &mut chart,
                (sp.to_display(u_now, units), dq.to_display(d_now, units)),
            )?;
        }
        draw_legend(&mut chart)?;
        root.present().map_err(err)?;
    }
    Ok(finish(
        svg,
        "Leaf minus air temperature against air speed, one curve per leaf size, with the limit",
    ))
}

/// The name of a curve for a leaf size.
#[must_use]
pub fn size_name(size_m: f64, current: bool, units: UnitSystem) -> String {
    let s = super::tables::show(Quantity::LeafSize, size_m, units);
    if current {
        format!("leaf {s} (scenario)")
    } else {
        format!("leaf {s}")
    }
}

/// The 99 % boundary-layer thickness at the leaf's trailing edge against air speed, one curve per
/// leaf size (none in still air, where there is no forced boundary layer).
///
/// # Errors
/// A drawing failure (not expected).
pub fn sweep_thickness_svg(
    sweep: &SweepResult,
    leaf: &LeafResult,
    units: UnitSystem,
) -> anyhow::Result<String> {
    let (sp, th) = (Quantity::Speed, Quantity::Thickness);
    let x_max = sweep
        .curves
        .first()
        .and_then(|c| c.speeds_m_s.last().copied())
        .unwrap_or(1.0);
    let x_max_d = sp.to_display(x_max, units);
    let curves: Vec<Vec<(f64, f64)>> = sweep
        .curves
        .iter()
        .map(|c| {
            c.speeds_m_s
                .iter()
                .zip(&c.delta99_m)
                .filter_map(|(&u, d)| d.map(|d| (sp.to_display(u, units), th.to_display(d, units))))
                .filter(|p| p.0.is_finite() && p.1.is_finite() && p.1 > 0.0)
                .collect()
        })
        .collect();
    // The thickness grows without bound toward still air: show it from a tenth of the highest
    // speed on (the CSV has every point).
    let y_top = curves
        .iter()
        .flat_map(|c| c.iter().filter(|p| p.0 >= 0.1 * x_max_d).map(|p| p.1))
        .fold(0.0_f64, f64::max);
    let y_top = if y_top > 0.0 { y_top * 1.1 } else { 1.0 };
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (PLOT_WIDTH, PLOT_HEIGHT)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let mut chart = line_chart(
            &root,
            "Boundary-layer thickness, by air speed",
            0.0..x_max_d,
            0.0..y_top,
            axis_title("air speed over the leaf", sp, units),
            axis_title("99 % thickness at the trailing edge", th, units),
        )?;
        for (i, (c, pts)) in sweep.curves.iter().zip(&curves).enumerate() {
            let colour = CURVE_COLOURS[i % CURVE_COLOURS.len()];
            let width = if i == 0 { 3 } else { 2 };
            chart
                .draw_series(LineSeries::new(below(pts, y_top), stroke(colour, width)))
                .map_err(err)?
                .label(size_name(c.size_m, i == 0, units))
                .legend(move |(x, y)| {
                    PathElement::new(vec![(x, y), (x + 22, y)], stroke(colour, 3))
                });
        }
        let (u_now, d_now) = (leaf.case.air.speed_m_s, leaf.solution.bl_thickness_m);
        if let Some(d) = d_now.filter(|_| u_now <= x_max) {
            let p = (sp.to_display(u_now, units), th.to_display(d, units));
            if p.1 <= y_top && p.1.is_finite() {
                draw_now(&mut chart, p)?;
            }
        }
        draw_legend(&mut chart)?;
        root.present().map_err(err)?;
    }
    Ok(finish(
        svg,
        "Boundary-layer thickness against air speed, one curve per leaf size",
    ))
}

fn to_rgb(c: egui::Color32) -> RGBColor {
    RGBColor(c.r(), c.g(), c.b())
}

/// Cell edges of a log-spaced axis: geometric midpoints between nodes, the ends at the nodes.
fn log_edges(nodes: &[f64]) -> Vec<f64> {
    let n = nodes.len();
    let mut e = Vec::with_capacity(n + 1);
    if n == 0 {
        return e;
    }
    e.push(nodes[0]);
    for w in nodes.windows(2) {
        e.push((w[0] * w[1]).sqrt());
    }
    e.push(nodes[n - 1]);
    e
}

/// The wind × size map: the coloured quantity as one rectangle per cell on log axes, the limit
/// and margin contours (marching squares, from [`super::contour`] via the map result), the
/// scenario's leaf, and a colour bar.
///
/// # Errors
/// A drawing failure (not expected).
#[allow(clippy::too_many_lines)]
pub fn map_svg(map: &MapResult, leaf: &LeafResult, units: UnitSystem) -> anyhow::Result<String> {
    let (sp, sz) = (Quantity::Speed, Quantity::LeafSize);
    let (vq, vname) = match map.input.quantity {
        MapQuantity::LeafTemperature => (Quantity::Temperature, "leaf temperature"),
        MapQuantity::MarginToLimit => (Quantity::TempDiff, "limit − leaf temperature"),
    };
    let xs: Vec<f64> = map
        .speeds_m_s
        .iter()
        .map(|&v| sp.to_display(v, units))
        .collect();
    let ys: Vec<f64> = map
        .sizes_m
        .iter()
        .map(|&v| sz.to_display(v, units))
        .collect();
    let (Some(&x_lo), Some(&x_hi), Some(&y_lo), Some(&y_hi)) =
        (xs.first(), xs.last(), ys.first(), ys.last())
    else {
        return Err(anyhow!("the map has no cells"));
    };
    let xe = log_edges(&xs);
    let ye = log_edges(&ys);
    let (x_bold, x_light) = log_ticks(x_lo, x_hi);
    let (y_bold, y_light) = log_ticks(y_lo, y_hi);
    let (lo, hi) = map.scale;
    let w = xs.len();
    let mut svg = String::new();
    {
        let root =
            SVGBackend::with_string(&mut svg, (PLOT_WIDTH, PLOT_HEIGHT + 170)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let (upper, legend_area) = root.split_vertically(PLOT_HEIGHT + 130);
        let (main, bar_area) = upper.split_horizontally(PLOT_WIDTH - 150);
        let mut legend: Vec<(String, Sample)> = Vec::new();
        let mut chart = ChartBuilder::on(&main)
            .caption(
                "Leaf temperature by air speed and leaf size",
                (FONT, TITLE_PX),
            )
            .margin(12)
            .x_label_area_size(48)
            .y_label_area_size(64)
            .build_cartesian_2d(
                (x_lo..x_hi)
                    .log_scale()
                    .with_key_points(x_bold)
                    .with_light_points(x_light),
                (y_lo..y_hi)
                    .log_scale()
                    .with_key_points(y_bold)
                    .with_light_points(y_light),
            )
            .map_err(err)?;
        let t = |v: &f64| tick(*v);
        chart
            .configure_mesh()
            .disable_mesh()
            .x_desc(axis_title("air speed over the leaf", sp, units))
            .y_desc(axis_title("leaf size along the wind", sz, units))
            .x_label_formatter(&t)
            .y_label_formatter(&t)
            .axis_desc_style((FONT, DESC_PX))
            .label_style((FONT, LABEL_PX))
            .draw()
            .map_err(err)?;
        let mut cells = Vec::with_capacity(map.leaf_temp_c.len());
        for r in 0..ys.len() {
            for c in 0..w {
                let v = map.shown_value(map.leaf_temp_c[r * w + c]);
                let fill = to_rgb(colour(v, lo, hi, map.input.quantity));
                cells.push(Rectangle::new(
                    [(xe[c], ye[r]), (xe[c + 1], ye[r + 1])],
                    fill.filled(),
                ));
            }
        }
        chart.draw_series(cells).map_err(err)?;
        // Contours come in log10(SI) plot coordinates.
        let to_display = |p: &[f64; 2]| {
            (
                sp.to_display(10f64.powf(p[0]), units),
                sz.to_display(10f64.powf(p[1]), units),
            )
        };
        let limit_name = format!(
            "leaf at the limit {}",
            super::tables::show(Quantity::Temperature, leaf.limit_c, units)
        );
        let margin_name = format!(
            "leaf at limit − margin {}",
            super::tables::show(Quantity::Temperature, leaf.limit_c - leaf.margin_k, units)
        );
        for (k, line) in map.limit_lines.iter().enumerate() {
            let pts: Vec<(f64, f64)> = line
                .iter()
                .map(to_display)
                .filter(|p| p.0.is_finite() && p.1.is_finite())
                .collect();
            chart
                .draw_series(LineSeries::new(pts.clone(), stroke(WHITE, 6)))
                .map_err(err)?;
            chart
                .draw_series(LineSeries::new(pts, stroke(LIMIT_COLOUR, 3)))
                .map_err(err)?;
            if k == 0 {
                legend.push((limit_name.clone(), Sample::Line(stroke(LIMIT_COLOUR, 3))));
            }
        }
        for (k, line) in map.margin_lines.iter().enumerate() {
            let pts: Vec<(f64, f64)> = line
                .iter()
                .map(to_display)
                .filter(|p| p.0.is_finite() && p.1.is_finite())
                .collect();
            chart
                .draw_series(LineSeries::new(pts.clone(), stroke(WHITE, 5)))
                .map_err(err)?;
            chart
                .draw_series(DashedLineSeries::new(pts, 9, 6, stroke(LIMIT_COLOUR, 2)))
                .map_err(err)?;
            if k == 0 {
                legend.push((margin_name.clone(), Sample::Dashed(stroke(LIMIT_COLOUR, 2))));
            }
        }
        let (u, d) = (
            sp.to_display(leaf.case.air.speed_m_s, units),
            sz.to_display(leaf.case.leaf.dimension_m, units),
        );
        if u >= x_lo && u <= x_hi && d >= y_lo && d <= y_hi {
            chart
                .draw_series([
                    Circle::new((u, d), 7, WHITE.filled()),
                    Circle::new((u, d), 7, stroke(BLACK, 2)),
                ])
                .map_err(err)?;
            legend.push(("the scenario".to_owned(), Sample::Circle));
        }
        // The legend goes under the map, never over it.
        legend_row(&legend_area, 76, 24, &legend)?;

        // The colour bar, in the report's units.
        let (dlo, dhi) = (vq.to_display(lo, units), vq.to_display(hi, units));
        let mut bar = ChartBuilder::on(&bar_area)
            .margin_top(52)
            .margin_bottom(60)
            .margin_right(8)
            .y_label_area_size(92)
            .build_cartesian_2d(0.0..1.0, dlo..dhi)
            .map_err(err)?;
        bar.configure_mesh()
            .disable_mesh()
            .disable_x_axis()
            .y_desc(axis_title(vname, vq, units))
            .y_label_formatter(&t)
            .axis_desc_style((FONT, DESC_PX))
            .label_style((FONT, LABEL_PX))
            .draw()
            .map_err(err)?;
        let steps = 64;
        let swatches = (0..steps).map(|i| {
            let f0 = i as f64 / steps as f64;
            let f1 = (i + 1) as f64 / steps as f64;
            let si_mid = lo + (hi - lo) * 0.5 * (f0 + f1);
            let fill = to_rgb(colour(si_mid, lo, hi, map.input.quantity));
            Rectangle::new(
                [(0.0, dlo + (dhi - dlo) * f0), (1.0, dlo + (dhi - dlo) * f1)],
                fill.filled(),
            )
        });
        bar.draw_series(swatches).map_err(err)?;
        root.present().map_err(err)?;
    }
    Ok(finish(
        svg,
        "Map of the leaf over air speed and leaf size, with the limit contours",
    ))
}

/// A line plot of several named series against a shared x axis: used by the optional canopy and
/// design-day sections.
#[derive(Debug, Clone)]
pub struct LinePlot {
    /// Title inside the SVG.
    pub title: String,
    /// X axis title with unit.
    pub x_title: String,
    /// Y axis title with unit.
    pub y_title: String,
    /// The series.
    pub series: Vec<Series>,
    /// Accessible name of the SVG.
    pub label: String,
}

/// One series of a [`LinePlot`].
#[derive(Debug, Clone)]
pub struct Series {
    /// Name in the legend.
    pub name: String,
    /// Points in display units.
    pub points: Vec<(f64, f64)>,
    /// Dashed (true) or solid.
    pub dashed: bool,
    /// Index into [`CURVE_COLOURS`]; `None` draws black (limits).
    pub colour: Option<usize>,
}

impl Series {
    /// A series.
    #[must_use]
    pub fn new(
        name: impl Into<String>,
        points: Vec<(f64, f64)>,
        dashed: bool,
        colour: Option<usize>,
    ) -> Self {
        Self {
            name: name.into(),
            points,
            dashed,
            colour,
        }
    }
}

/// Draws a [`LinePlot`]: ranges padded around every finite point, a legend at the upper right.
///
/// # Errors
/// A drawing failure (not expected), or no finite point at all.
pub fn line_plot_svg(p: &LinePlot) -> anyhow::Result<String> {
    let all = || {
        p.series
            .iter()
            .flat_map(|s| s.points.iter())
            .filter(|q| q.0.is_finite() && q.1.is_finite())
    };
    let (x0, x1) =
        padded_range(all().map(|q| q.0), 0.03).ok_or_else(|| anyhow!("nothing to plot"))?;
    let (y0, y1) =
        padded_range(all().map(|q| q.1), 0.1).ok_or_else(|| anyhow!("nothing to plot"))?;
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (PLOT_WIDTH, PLOT_HEIGHT)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let mut chart = line_chart(
            &root,
            &p.title,
            x0..x1,
            y0..y1,
            p.x_title.clone(),
            p.y_title.clone(),
        )?;
        for Series {
            name,
            points,
            dashed,
            colour,
        } in &p.series
        {
            let colour = colour.map_or(LIMIT_COLOUR, |i| CURVE_COLOURS[i % CURVE_COLOURS.len()]);
            let pts: Vec<(f64, f64)> = points
                .iter()
                .copied()
                .filter(|q| q.0.is_finite() && q.1.is_finite())
                .collect();
            let s = if *dashed {
                chart
                    .draw_series(DashedLineSeries::new(pts, 8, 5, stroke(colour, 2)))
                    .map_err(err)?
            } else {
                chart
                    .draw_series(LineSeries::new(pts, stroke(colour, 2)))
                    .map_err(err)?
            };
            if *dashed {
                s.label(name.clone())
                    .legend(move |(x, y)| dashed_sample(x, y, stroke(colour, 2)));
            } else {
                s.label(name.clone()).legend(move |(x, y)| {
                    PathElement::new(vec![(x, y), (x + 22, y)], stroke(colour, 2))
                });
            }
        }
        draw_legend(&mut chart)?;
        root.present().map_err(err)?;
    }
    Ok(finish(svg, &p.label))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ticks_read_cleanly() {
        assert_eq!(tick(0.5), "0.5");
        assert_eq!(tick(1.0), "1");
        assert_eq!(tick(196.850_393_7), "197");
        assert_eq!(tick(f64::NAN), "");
        let (bold, light) = log_ticks(0.05, 5.0);
        // 0.05, 0.1, 0.2, 0.5, 1, 2, 5.
        assert_eq!(bold.len(), 7);
        assert!(bold.iter().all(|v| *v >= 0.05 && *v <= 5.0));
        assert!(!light.is_empty());
    }

    #[test]
    fn curve_enters_at_the_top() {
        let pts = [(0.0, 10.0), (1.0, 4.0), (2.0, 2.0)];
        let v = below(&pts, 7.0);
        assert_eq!(v[0], (0.5, 7.0));
        assert_eq!(v.len(), 3);
    }
}
