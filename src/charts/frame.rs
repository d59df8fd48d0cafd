//! What every chart shares: the error type, the scale a chart is drawn at (the page's device
//! pixel ratio), the palette, tick and range helpers, the legend box and SVG output.

use plotters::coord::types::RangedCoordf64;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

/// Errors from drawing (the backend's message).
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("chart: {0}")]
pub struct ChartError(pub String);

pub(crate) fn err<E: std::fmt::Debug>(e: E) -> ChartError {
    ChartError(format!("{e:?}"))
}

/// The font and line scale a chart uses: the caller's (device pixel ratio), kept within
/// 0.5–4, or 1 if it is not a number.
pub(crate) fn chart_scale(scale: f64) -> f64 {
    if scale.is_finite() {
        scale.clamp(0.5, 4.0)
    } else {
        1.0
    }
}

pub(crate) const INK: RGBColor = RGBColor(30, 36, 44);

pub(crate) const PROFILE: RGBColor = RGBColor(20, 70, 140);

pub(crate) const BAND: RGBColor = RGBColor(120, 150, 200);

pub(crate) const ZERO: RGBColor = RGBColor(190, 40, 40);

/// Render a chart into an SVG document string.
pub(crate) fn svg_document(
    width: u32,
    height: u32,
    draw: impl FnOnce(&DrawingArea<SVGBackend<'_>, Shift>) -> Result<(), ChartError>,
) -> Result<String, ChartError> {
    let mut out = String::new();
    {
        let root = SVGBackend::with_string(&mut out, (width, height)).into_drawing_area();
        draw(&root)?;
    }
    Ok(out)
}

/// The legend box shared by the charts.
pub(crate) fn draw_legend<'a, DB: DrawingBackend + 'a>(
    chart: &mut ChartContext<'a, DB, Cartesian2d<RangedCoordf64, RangedCoordf64>>,
    position: SeriesLabelPosition,
    scale: f64,
) -> Result<(), ChartError> {
    let px = |v: f64| (v * scale).round() as u32;
    chart
        .configure_series_labels()
        .position(position)
        .legend_area_size(px(28.0))
        .margin(px(10.0))
        .background_style(WHITE.mix(0.85))
        .border_style(RGBColor(200, 200, 200))
        .label_font(("sans-serif", 12.0 * scale).into_font().color(&INK))
        .draw()
        .map_err(err)
}

pub(crate) const AIR_LINE: RGBColor = RGBColor(120, 128, 140);

pub(crate) const FLUX_LINE: RGBColor = RGBColor(196, 112, 16);

/// A day number as a caption shows it: whole days without decimals.
pub(crate) fn day_label(day: f64) -> String {
    if (day - day.round()).abs() < 1e-6 {
        format!("{:.0}", day.round() + 0.0)
    } else {
        format!("{day:.1}")
    }
}

/// Split a line at its non-finite points, so a gap in the data is a gap in the line.
pub(crate) fn finite_runs(points: impl IntoIterator<Item = (f64, f64)>) -> Vec<Vec<(f64, f64)>> {
    let mut out = Vec::new();
    let mut current = Vec::new();
    for (x, y) in points {
        if x.is_finite() && y.is_finite() {
            current.push((x, y));
        } else if !current.is_empty() {
            out.push(std::mem::take(&mut current));
        }
    }
    if !current.is_empty() {
        out.push(current);
    }
    out
}

/// Lowest and highest finite value, widened to at least `min_span` around its middle and
/// by `margin` of the span on each side.
pub(crate) fn padded_range(
    values: impl IntoIterator<Item = f64>,
    min_span: f64,
    margin: f64,
) -> (f64, f64) {
    let (mut lo, mut hi) = (f64::INFINITY, f64::NEG_INFINITY);
    for v in values.into_iter().filter(|v| v.is_finite()) {
        lo = lo.min(v);
        hi = hi.max(v);
    }
    if lo > hi {
        (lo, hi) = (0.0, 0.0);
    }
    if hi - lo < min_span {
        let mid = 0.5 * (lo + hi);
        (lo, hi) = (mid - 0.5 * min_span, mid + 0.5 * min_span);
    }
    let span = hi - lo;
    (lo - margin * span, hi + margin * span)
}

/// Tick decimals for an axis spanning `span` (shown units): enough that neighbouring ticks
/// (about a tenth of the span apart) read differently.
pub(crate) fn tick_decimals(span: f64) -> usize {
    if !(span.is_finite() && span > 0.0) {
        0
    } else {
        (1.0 - span.log10().floor()).clamp(0.0, 6.0) as usize
    }
}

/// A line through `run`; a run of one point (one day, one cell) is drawn as a dot, which a
/// line alone would leave invisible.
pub(crate) fn line<DB: DrawingBackend>(
    run: Vec<(f64, f64)>,
    colour: RGBColor,
    width: u32,
) -> LineSeries<DB, (f64, f64)> {
    let dot = if run.len() == 1 { width + 2 } else { 0 };
    LineSeries::new(run, colour.stroke_width(width)).point_size(dot)
}

/// A tick label: `decimals` decimals, and never "−0".
pub(crate) fn tick(v: f64, decimals: usize) -> String {
    let p = 10f64.powi(decimals as i32);
    format!("{:.*}", decimals, (v * p).round() / p + 0.0)
}

/// Tick decimals for a depth axis reaching `depth_max` (shown units).
pub(crate) fn depth_decimals(depth_max: f64) -> usize {
    if depth_max >= 20.0 {
        0
    } else if depth_max >= 4.0 {
        1
    } else {
        2
    }
}

/// A horizontal reference line across the plot, labelled at its right end.
pub(crate) fn reference_line<DB: DrawingBackend>(
    chart: &mut ChartContext<'_, DB, Cartesian2d<RangedCoordf64, RangedCoordf64>>,
    (x0, x1): (f64, f64),
    y: f64,
    colour: RGBColor,
    (label, at_left): (&str, bool),
    scale: f64,
) -> Result<(), ChartError> {
    let px = |v: f64| (v * scale).round() as u32;
    if !y.is_finite() {
        return Ok(());
    }
    chart
        .draw_series(DashedLineSeries::new(
            vec![(x0, y), (x1, y)],
            px(6.0),
            px(4.0),
            colour.stroke_width(px(1.5)),
        ))
        .map_err(err)?;
    chart
        .draw_series(std::iter::once(Text::new(
            label.to_string(),
            (if at_left { x0 } else { x1 }, y),
            ("sans-serif", 11.0 * scale)
                .into_font()
                .color(&colour)
                .pos(Pos::new(
                    if at_left { HPos::Left } else { HPos::Right },
                    VPos::Bottom,
                )),
        )))
        .map_err(err)?;
    Ok(())
}
