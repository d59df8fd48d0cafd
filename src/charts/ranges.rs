//! Charts for ranges of results: the spread of one result over Monte Carlo runs (a
//! histogram with its percentiles, the base case and the spread across the snow
//! conductivity regressions) and one-at-a-time sensitivity (bars of the answer with each
//! input at its low and its high end). Written once against plotters' generic
//! [`DrawingBackend`], like the other charts. The inputs are plain data
//! ([`SpreadChart`], [`SensitivityChart`]) and know nothing of the scenario document: all
//! values are SI and `quantity` names the unit they are shown in ([`crate::physics::units`]).
//!
//! No data never fails: an empty chart draws its axes and a note. Values that are not
//! finite, or beyond [`LARGEST_DRAWN`] in the unit shown, are skipped.

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::frame::{
    chart_scale, err, padded_range, svg_document, tick, tick_decimals, ChartError, BAND, INK,
};
use crate::physics::ranges::percentile_sorted;
use crate::physics::units::{quantity, Quantity, UnitSystem};

/// One result's spread, for a chart.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SpreadChart<'a> {
    /// The result's name, the chart's caption and its x axis, e.g. "Deepest frost".
    pub title: &'a str,
    /// A units quantity id ([`crate::physics::units::quantity`]): "depth", "temperature",
    /// "r_value", …
    pub quantity: &'a str,
    /// The Monte Carlo values (SI), any order; values that are not finite are skipped.
    pub values: &'a [f64],
    /// The 10th, 50th and 90th percentiles (SI), as the caller computed them; a value that
    /// is not finite is not drawn.
    pub p10: f64,
    pub p50: f64,
    pub p90: f64,
    /// The base case's value (SI); not drawn when not finite.
    pub base: f64,
    /// Runs asked for, the sampler's seed and the runs that gave no value, for the caption
    /// line.
    pub runs: usize,
    pub seed: u64,
    pub failed: usize,
    /// Each snow regression's value for the base case (name, SI value); may be empty.
    /// Values that are not finite are skipped.
    pub members: &'a [(&'a str, f64)],
}

/// One-at-a-time sensitivity (a tornado chart).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SensitivityChart<'a> {
    /// The answer's name, the chart's caption and its x axis.
    pub title: &'a str,
    /// Quantity of the answer (a units quantity id).
    pub quantity: &'a str,
    /// Answer at the base case (SI).
    pub base: f64,
    /// One bar per input, drawn top to bottom in this order (the caller sorts: largest
    /// swing first): (input label, label of its low end e.g. "200 kg/m³", label of its
    /// high end, answer at the low end, answer at the high end); answers SI. An end whose
    /// answer is not finite is not drawn.
    pub bars: &'a [(&'a str, &'a str, &'a str, f64, f64)],
}

/// Equal-width bins over values (in the unit they are shown in).
#[derive(Debug, Clone, PartialEq)]
pub struct Histogram {
    /// Left edge of the first bin.
    pub lo: f64,
    /// Width of each bin; 0 when every value is the same (one bin holding them all).
    pub width: f64,
    /// Values in each bin, left to right; they sum to the number of finite values.
    pub counts: Vec<usize>,
}

/// Fewest and most bins [`histogram`] uses (when there are at least that many values).
pub const MIN_BINS: usize = 8;
pub const MAX_BINS: usize = 40;

/// Bin the finite values; `None` when there are none.
///
/// **Bin rule.** Freedman & Diaconis (1981, "On the histogram as a density estimator: L₂
/// theory", Z. Wahrscheinlichkeitstheorie verw. Gebiete 57, 453): bin width
/// h = 2·IQR·n^(−1/3), with the quartiles by Hyndman & Fan type 7
/// ([`percentile_sorted`]), and k = ⌈(max − min)/h⌉ bins. When the IQR is 0 (more than
/// half the values equal) the square-root rule k = ⌈√n⌉ is used instead. k is then held
/// to [`MIN_BINS`]–[`MAX_BINS`] (a choice for a readable chart, no source) and to at most
/// n. The bins split [min, max] into k equal widths; value v goes to bin
/// ⌊(v − min)/width⌋, the maximum into the last bin. All values equal: one bin of width 0.
pub fn histogram(values: &[f64]) -> Option<Histogram> {
    let mut v: Vec<f64> = values.iter().copied().filter(|x| x.is_finite()).collect();
    if v.is_empty() {
        return None;
    }
    v.sort_by(f64::total_cmp);
    let n = v.len();
    let (lo, hi) = (v[0], v[n - 1]);
    let range = hi - lo;
    if !(range > 0.0 && range.is_finite()) {
        // All equal (or a span too wide for a double): one bin.
        return Some(Histogram {
            lo,
            width: 0.0,
            counts: vec![n],
        });
    }
    let iqr = percentile_sorted(&v, 0.75) - percentile_sorted(&v, 0.25);
    let h = 2.0 * iqr / (n as f64).cbrt();
    let k = if h > 0.0 && h.is_finite() {
        (range / h).ceil()
    } else {
        (n as f64).sqrt().ceil()
    };
    let k = (k as usize).clamp(MIN_BINS, MAX_BINS).min(n).max(1);
    let width = range / k as f64;
    let mut counts = vec![0usize; k];
    for x in &v {
        let i = ((x - lo) / width).floor();
        let i = if i.is_finite() && i > 0.0 {
            (i as usize).min(k - 1)
        } else {
            0
        };
        counts[i] += 1;
    }
    Some(Histogram { lo, width, counts })
}

const HIST: RGBColor = RGBColor(70, 110, 170);
const PERCENTILE: RGBColor = RGBColor(40, 40, 40);
const BASE: RGBColor = RGBColor(200, 90, 20);
const MEMBER: RGBColor = RGBColor(40, 70, 130);
const LOW_END: RGBColor = RGBColor(60, 120, 190);
const HIGH_END: RGBColor = RGBColor(210, 120, 40);
const NOTE: RGBColor = RGBColor(90, 96, 104);

fn unit_of(id: &str) -> Result<&'static Quantity, ChartError> {
    quantity(id).ok_or_else(|| ChartError(format!("quantity: no unit for {id:?}")))
}

/// A value as the charts write it: the unit's own decimals, then its symbol.
fn with_unit(q: &Quantity, sys: UnitSystem, si: f64) -> String {
    let u = q.unit(sys);
    let v = tick(q.show(sys, si), u.decimals as usize);
    if u.symbol.is_empty() {
        v
    } else {
        format!("{v} {}", u.symbol)
    }
}

/// An axis description: the title, then the unit in brackets (none for a bare number).
fn axis_desc(title: &str, q: &Quantity, sys: UnitSystem) -> String {
    let title: String = title.chars().take(80).collect();
    match q.unit(sys).symbol {
        "" => title,
        s => format!("{title} ({s})"),
    }
}

/// Largest size of a value the charts place on an axis, in the unit shown. Beyond it (far
/// past any physical value of these quantities) a value is skipped like one that is not
/// finite: an axis reaching ±f64::MAX would overflow when padded.
pub const LARGEST_DRAWN: f64 = 1e12;

/// The value shown, or NaN when it is beyond [`LARGEST_DRAWN`] or not finite.
fn drawable(v: f64) -> f64 {
    if v.abs() <= LARGEST_DRAWN {
        v
    } else {
        f64::NAN
    }
}

/// The smallest x span a chart is given when its values barely differ: ten steps of the
/// unit's last decimal, or a tenth of the values' size, whichever is more.
fn least_span(q: &Quantity, sys: UnitSystem, shown: impl IntoIterator<Item = f64>) -> f64 {
    let size = shown
        .into_iter()
        .filter(|v| v.is_finite())
        .fold(0.0f64, |m, v| m.max(v.abs()));
    (10f64.powi(1 - q.unit(sys).decimals as i32)).max(0.1 * size)
}

/// Rough width of `text` in pixels at `font_px` (sans-serif averages a little over half
/// an em per character; an estimate for laying labels out, not a measurement).
fn text_width_px(text: &str, font_px: f64) -> f64 {
    0.58 * font_px * text.chars().count() as f64
}

/// Lay out labels centred at `centres` (pixels, any order) with widths `widths` on at most
/// `rows` rows, leaving `gap` pixels between neighbours on a row and keeping each label
/// inside `[left, right]` (a label is slid inwards at the edges): each label's row and its
/// centre, or None when it fits on no row. Labels are placed left to right, each on the
/// lowest row that has room.
pub fn pack_labels(
    centres: &[f64],
    widths: &[f64],
    rows: usize,
    gap: f64,
    left: f64,
    right: f64,
) -> Vec<Option<(usize, f64)>> {
    let mut order: Vec<usize> = (0..centres.len()).collect();
    order.sort_by(|&a, &b| centres[a].total_cmp(&centres[b]));
    let mut ends = vec![f64::NEG_INFINITY; rows];
    let mut out = vec![None; centres.len()];
    for i in order {
        let w = widths[i];
        if !(centres[i].is_finite() && w.is_finite()) || w > right - left {
            continue;
        }
        let c = centres[i].clamp(left + 0.5 * w, right - 0.5 * w);
        if let Some(row) = (0..rows).find(|&r| c - 0.5 * w >= ends[r] + gap) {
            ends[row] = c + 0.5 * w;
            out[i] = Some((row, c));
        }
    }
    out
}

/// Draw the spread of one result over the Monte Carlo runs: a histogram of the finite
/// values (bins by [`histogram`]: Freedman–Diaconis, held to 8–40 bins) in the unit shown
/// on x, the count of runs on y; dashed vertical lines at P10, P50 and P90, each labelled
/// with its value and unit; the base case as a solid line with a triangle and its value;
/// when `members` is not empty, a shaded span from the lowest to the highest snow
/// regression's value with a tick and name for each; under the chart the line
/// "N runs, seed S" (", F failed" when some failed). All values equal, or one value, still
/// draw (the x range is given a width); no finite value draws the axes and a note.
/// `scale` multiplies font sizes and line widths (the page passes its device pixel ratio).
pub fn draw_spread<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    c: &SpreadChart,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    let scale = chart_scale(scale);
    let px = |v: f64| (v * scale).round() as u32;
    let q = unit_of(c.quantity)?;
    let x = |si: f64| drawable(q.show(sys, si));
    let font = |size: f64| ("sans-serif", size * scale).into_font().color(&INK);
    root.fill(&WHITE).map_err(err)?;

    let shown: Vec<f64> = c.values.iter().map(|&v| x(v)).collect();
    let hist = histogram(&shown);
    let members: Vec<(&str, f64)> = c
        .members
        .iter()
        .map(|&(name, v)| (name, x(v)))
        .filter(|(_, v)| v.is_finite())
        .collect();
    let marks = [c.p10, c.p50, c.p90, c.base].map(x);
    let mut all: Vec<f64> = marks.to_vec();
    all.extend(members.iter().map(|m| m.1));
    if let Some(h) = &hist {
        all.push(h.lo);
        all.push(h.lo + h.width * h.counts.len() as f64);
    }
    let (x0, x1) = padded_range(all.iter().copied(), least_span(q, sys, all.clone()), 0.06);
    let top_count = hist
        .as_ref()
        .and_then(|h| h.counts.iter().max().copied())
        .unwrap_or(0);
    // Above the bars, rows of labels laid out in pixels down from the plot's top: P10, P50,
    // P90, the base case, and with regressions their span's label, three rows of their
    // names and their ticks. The bars fill what is left (at least a third of the plot).
    // The plot's height is estimated from the chart's own margins, caption and axis area.
    let (h_px, foot_px) = (root.dim_in_pixel().1, px(24.0));
    let plot_h =
        (f64::from(h_px) - f64::from(foot_px) - scale * (12.0 + 12.0 + 24.0 + 44.0)).max(1.0);
    let labels_px = if c.members.is_empty() { 66.0 } else { 126.0 } * scale;
    let bar_share = ((plot_h - labels_px) / plot_h).clamp(1.0 / 3.0, 0.9);
    let y1 = (top_count as f64 / bar_share).max(1.0);
    // Data height of the point `d` logical pixels below the plot's top.
    let below_top = |d: f64| y1 * (1.0 - d * scale / plot_h);

    let (main, foot) = root.split_vertically(h_px.saturating_sub(foot_px));
    let title: String = c.title.chars().take(80).collect();
    let mut chart = ChartBuilder::on(&main)
        .margin(px(12.0))
        .caption(&title, font(17.0))
        .x_label_area_size(px(44.0))
        .y_label_area_size(px(56.0))
        .build_cartesian_2d(x0..x1, 0.0..y1)
        .map_err(err)?;
    let xd = tick_decimals(x1 - x0);
    chart
        .configure_mesh()
        .disable_x_mesh()
        .light_line_style(RGBColor(235, 235, 235))
        .x_desc(axis_desc(c.title, q, sys))
        .y_desc("Runs in each bin")
        .x_label_formatter(&|v| tick(*v, xd))
        // Counts are whole: only whole ticks are written.
        .y_label_formatter(&|v| {
            if (v - v.round()).abs() < 1e-9 {
                tick(*v, 0)
            } else {
                String::new()
            }
        })
        .label_style(font(12.0))
        .axis_desc_style(font(13.0))
        .draw()
        .map_err(err)?;

    // The spread across the snow regressions: shaded behind the bars, its ticks, names and
    // label above them.
    let member_span = members
        .iter()
        .map(|m| m.1)
        .reduce(f64::min)
        .zip(members.iter().map(|m| m.1).reduce(f64::max));
    if let Some((lo, hi)) = member_span {
        let half = 0.002 * (x1 - x0);
        chart
            .draw_series(std::iter::once(Rectangle::new(
                [(lo - half, 0.0), (hi + half, y1)],
                BAND.mix(0.25).filled(),
            )))
            .map_err(err)?;
    }

    // The histogram: one rectangle per bin that holds a value.
    if let Some(h) = &hist {
        let bar_w = if h.width > 0.0 {
            h.width
        } else {
            (x1 - x0) / 40.0
        };
        let left = if h.width > 0.0 {
            h.lo
        } else {
            h.lo - 0.5 * bar_w
        };
        let bars = h
            .counts
            .iter()
            .enumerate()
            .filter(|(_, &n)| n > 0)
            .map(|(i, &n)| {
                let a = left + i as f64 * bar_w;
                let mut r =
                    Rectangle::new([(a, n as f64), (a + bar_w, 0.0)], HIST.mix(0.85).filled());
                // A pixel of white between neighbours.
                r.set_margin(0, 0, 0, 1);
                r
            });
        chart.draw_series(bars).map_err(err)?;
    } else {
        chart
            .draw_series(std::iter::once(Text::new(
                "No run gave a value",
                (0.5 * (x0 + x1), 0.5 * y1),
                font(13.0).pos(Pos::new(HPos::Center, VPos::Center)),
            )))
            .map_err(err)?;
    }

    if let Some((lo, hi)) = member_span {
        let span = format!(
            "Snow regressions: {} to {}",
            tick(lo, q.unit(sys).decimals as usize),
            with_unit(q, sys, q.to_si(sys, hi))
        );
        chart
            .draw_series(std::iter::once(Text::new(
                span,
                (0.5 * (lo + hi), below_top(72.0)),
                font(11.0)
                    .color(&MEMBER)
                    .pos(Pos::new(HPos::Center, VPos::Bottom)),
            )))
            .map_err(err)?;
        let mut members = members.clone();
        members.sort_by(|a, b| a.1.total_cmp(&b.1));
        let names: Vec<String> = members
            .iter()
            .map(|m| m.0.chars().take(40).collect())
            .collect();
        let (plot_x, _) = chart.plotting_area().get_pixel_range();
        let centres: Vec<f64> = members
            .iter()
            .map(|m| f64::from(chart.backend_coord(&(m.1, 0.0)).0))
            .collect();
        let widths: Vec<f64> = names
            .iter()
            .map(|n| text_width_px(n, 10.0 * scale))
            .collect();
        let placed = pack_labels(
            &centres,
            &widths,
            3,
            6.0 * scale,
            f64::from(plot_x.start),
            f64::from(plot_x.end),
        );
        for (((_, v), text), (centre, spot)) in
            members.iter().zip(names).zip(centres.iter().zip(&placed))
        {
            chart
                .draw_series(std::iter::once(PathElement::new(
                    vec![(*v, below_top(121.0)), (*v, below_top(113.0))],
                    MEMBER.stroke_width(px(2.0)),
                )))
                .map_err(err)?;
            // A name that fits on no row is left out: its tick stays, and the report and the
            // CSV list every regression's value. A name slid in from the plot's edge is
            // drawn off its tick by as much.
            if let Some((row, c)) = *spot {
                chart
                    .draw_series(std::iter::once(
                        EmptyElement::at((*v, below_top(110.0 - 12.0 * row as f64)))
                            + Text::new(
                                text,
                                ((c - centre).round() as i32, 0),
                                font(10.0)
                                    .color(&MEMBER)
                                    .pos(Pos::new(HPos::Center, VPos::Bottom)),
                            ),
                    ))
                    .map_err(err)?;
            }
        }
    }

    // P10, P50, P90: labels stacked at three heights so they never overlap.
    let right_side = |v: f64| v < x0 + 0.65 * (x1 - x0);
    let label_at = |v: f64, text: String, y: f64, colour: &'static RGBColor| {
        let (dx, h) = if right_side(v) {
            (px(4.0) as i32, HPos::Left)
        } else {
            (-(px(4.0) as i32), HPos::Right)
        };
        EmptyElement::at((v, y))
            + Text::new(
                text,
                (dx, 0),
                font(12.0).color(colour).pos(Pos::new(h, VPos::Center)),
            )
    };
    let names = ["P10", "P50", "P90"];
    let si_marks = [c.p10, c.p50, c.p90];
    for (k, (name, &si)) in names.iter().zip(&si_marks).enumerate() {
        let v = x(si);
        if !v.is_finite() {
            continue;
        }
        chart
            .draw_series(DashedLineSeries::new(
                vec![(v, 0.0), (v, y1)],
                px(6.0),
                px(4.0),
                PERCENTILE.stroke_width(px(1.5)),
            ))
            .map_err(err)?;
        let y = below_top(10.0 + 14.0 * k as f64);
        chart
            .draw_series(std::iter::once(label_at(
                v,
                format!("{name} {}", with_unit(q, sys, si)),
                y,
                &PERCENTILE,
            )))
            .map_err(err)?;
    }

    // The base case.
    let b = x(c.base);
    if b.is_finite() {
        chart
            .draw_series(std::iter::once(PathElement::new(
                vec![(b, 0.0), (b, below_top(54.0))],
                BASE.stroke_width(px(2.0)),
            )))
            .map_err(err)?;
        chart
            .draw_series(std::iter::once(TriangleMarker::new(
                (b, below_top(54.0)),
                px(6.0),
                BASE.filled(),
            )))
            .map_err(err)?;
        chart
            .draw_series(std::iter::once(label_at(
                b,
                format!("base case {}", with_unit(q, sys, c.base)),
                below_top(54.0),
                &BASE,
            )))
            .map_err(err)?;
    }

    // The caption line under the chart.
    let mut line = format!("{} runs, seed {}", c.runs, c.seed);
    if c.failed > 0 {
        line.push_str(&format!(", {} failed", c.failed));
    }
    foot.draw(&Text::new(
        line,
        (px(12.0) as i32, (foot_px / 2) as i32),
        font(12.0)
            .color(&NOTE)
            .pos(Pos::new(HPos::Left, VPos::Center)),
    ))
    .map_err(err)?;
    root.present().map_err(err)?;
    Ok(())
}

/// The spread chart as an SVG document.
pub fn spread_svg(
    c: &SpreadChart,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| draw_spread(root, c, sys, 1.0))
}

/// Draw one-at-a-time sensitivity: one horizontal bar per input, in the order given (the
/// caller puts the largest swing first, so it is on top), each from the answer with the
/// input at its low end to the answer with it at its high end, split at a dashed vertical
/// line at the base case: the part towards the low end's answer in one colour, towards the
/// high end's in another (a legend row under the chart says which). The input is named
/// left of its bar, each end's label written beyond that end. When both ends fall on one
/// side of the base case the longer part is drawn first so the shorter stays visible. The
/// base case not finite: no base line, and each bar splits at its middle. No bars draws
/// the axes and the note "no uncertain inputs". `scale` as in [`draw_spread`].
pub fn draw_sensitivity<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    c: &SensitivityChart,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    let scale = chart_scale(scale);
    let px = |v: f64| (v * scale).round() as u32;
    let q = unit_of(c.quantity)?;
    let x = |si: f64| drawable(q.show(sys, si));
    let font = |size: f64| ("sans-serif", size * scale).into_font().color(&INK);
    root.fill(&WHITE).map_err(err)?;

    let base = x(c.base);
    let ends: Vec<f64> = c
        .bars
        .iter()
        .flat_map(|b| [x(b.3), x(b.4)])
        .chain([base])
        .collect();
    let n = c.bars.len();
    let y1 = n.max(1) as f64;
    let labels: Vec<String> = c
        .bars
        .iter()
        .map(|b| b.0.chars().take(40).collect())
        .collect();
    let longest = labels.iter().map(|l| l.chars().count()).max().unwrap_or(0);
    let label_area = (7.0 * longest as f64 + 18.0).clamp(40.0, 300.0);
    // Room beyond the bars' ends for the end labels: the widest label (and its 4 px) as a
    // share f of the plot's width; a margin m of the span on each side gives each side
    // m / (1 + 2m) of the width, so m = f / (1 − 2f) (f held to 0.3).
    let end_w = c
        .bars
        .iter()
        .flat_map(|b| [b.1, b.2])
        .map(|t| text_width_px(&t.chars().take(30).collect::<String>(), 11.0) + 6.0)
        .fold(0.0, f64::max);
    let plot_w = (f64::from(root.dim_in_pixel().0) / scale - label_area - 24.0).max(1.0);
    let f = (end_w / plot_w).min(0.3);
    let margin = (f / (1.0 - 2.0 * f)).max(0.05);
    let (x0, x1) = padded_range(
        ends.iter().copied(),
        least_span(q, sys, ends.clone()),
        margin,
    );
    let title: String = c.title.chars().take(80).collect();
    let (h_px, foot_px) = (root.dim_in_pixel().1, px(26.0));
    let (main, foot) = root.split_vertically(h_px.saturating_sub(foot_px));
    let mut chart = ChartBuilder::on(&main)
        .margin(px(12.0))
        .caption(&title, font(17.0))
        .x_label_area_size(px(44.0))
        .y_label_area_size(px(label_area))
        .build_cartesian_2d(x0..x1, 0.0..y1)
        .map_err(err)?;
    let xd = tick_decimals(x1 - x0);
    chart
        .configure_mesh()
        .disable_y_mesh()
        .light_line_style(RGBColor(235, 235, 235))
        .y_labels(0)
        .x_desc(axis_desc(c.title, q, sys))
        .x_label_formatter(&|v| tick(*v, xd))
        .label_style(font(12.0))
        .axis_desc_style(font(13.0))
        .draw()
        .map_err(err)?;

    if n == 0 {
        chart
            .draw_series(std::iter::once(Text::new(
                "no uncertain inputs",
                (0.5 * (x0 + x1), 0.5 * y1),
                font(13.0).pos(Pos::new(HPos::Center, VPos::Center)),
            )))
            .map_err(err)?;
    }

    let half_h = 0.3;
    let end_font = |h: HPos| font(11.0).color(&NOTE).pos(Pos::new(h, VPos::Center));
    for (i, (bar, label)) in c.bars.iter().zip(&labels).enumerate() {
        let yc = y1 - i as f64 - 0.5;
        let (lo, hi) = (x(bar.3), x(bar.4));
        let split = if base.is_finite() {
            base
        } else if lo.is_finite() && hi.is_finite() {
            0.5 * (lo + hi)
        } else {
            f64::NAN
        };
        // The two parts, the one reaching farther from the split first.
        let mut parts = [(lo, LOW_END), (hi, HIGH_END)];
        parts.sort_by(|a, b| {
            let d = |v: f64| {
                let d = (v - split).abs();
                if d.is_finite() {
                    d
                } else {
                    -1.0
                }
            };
            d(b.0).total_cmp(&d(a.0))
        });
        for (end, colour) in parts {
            if !(end.is_finite() && split.is_finite()) {
                continue;
            }
            chart
                .draw_series(std::iter::once(Rectangle::new(
                    [(split.min(end), yc + half_h), (split.max(end), yc - half_h)],
                    colour.filled(),
                )))
                .map_err(err)?;
        }
        // An input whose two ends give the same answer (it does not reach this result's
        // part of the scenario): one note instead of two labels written over each other.
        if lo.is_finite() && hi.is_finite() && (hi - lo).abs() <= 1e-9 * (x1 - x0).abs() {
            chart
                .draw_series(std::iter::once(
                    EmptyElement::at((lo, yc))
                        + Text::new("no effect", (px(4.0) as i32, 0), end_font(HPos::Left)),
                ))
                .map_err(err)?;
        } else {
            // End labels, beyond each end, away from the split.
            for (end, text) in [(lo, bar.1), (hi, bar.2)] {
                if !end.is_finite() {
                    continue;
                }
                let outward_left = split.is_finite() && end < split;
                let (dx, h) = if outward_left {
                    (-(px(4.0) as i32), HPos::Right)
                } else {
                    (px(4.0) as i32, HPos::Left)
                };
                let text: String = text.chars().take(30).collect();
                chart
                    .draw_series(std::iter::once(
                        EmptyElement::at((end, yc)) + Text::new(text, (dx, 0), end_font(h)),
                    ))
                    .map_err(err)?;
            }
        }
        // The input's name, left of the plot.
        chart
            .draw_series(std::iter::once(
                EmptyElement::at((x0, yc))
                    + Text::new(
                        label.clone(),
                        (-(px(8.0) as i32), 0),
                        font(12.0).pos(Pos::new(HPos::Right, VPos::Center)),
                    ),
            ))
            .map_err(err)?;
    }

    if base.is_finite() {
        chart
            .draw_series(DashedLineSeries::new(
                vec![(base, 0.0), (base, y1)],
                px(6.0),
                px(4.0),
                INK.stroke_width(px(1.5)),
            ))
            .map_err(err)?;
    }

    // The legend, one row under the chart: the two colours, then the base line.
    let mut at = px(12.0) as i32;
    let yc = (foot_px / 2) as i32;
    let sw = px(18.0) as i32;
    let gap = px(8.0) as i32;
    let char_w = 6.5 * scale;
    let mut item = |text: String, swatch: Option<RGBColor>| -> Result<(), ChartError> {
        match swatch {
            Some(colour) => foot
                .draw(&Rectangle::new(
                    [(at, yc - px(5.0) as i32), (at + sw, yc + px(5.0) as i32)],
                    colour.filled(),
                ))
                .map_err(err)?,
            None => foot
                .draw(&PathElement::new(
                    vec![(at, yc), (at + sw, yc)],
                    INK.stroke_width(px(1.5)),
                ))
                .map_err(err)?,
        }
        let w = (text.chars().count() as f64 * char_w).round() as i32;
        foot.draw(&Text::new(
            text,
            (at + sw + gap / 2, yc),
            font(12.0).pos(Pos::new(HPos::Left, VPos::Center)),
        ))
        .map_err(err)?;
        at += sw + gap / 2 + w + 2 * gap;
        Ok(())
    };
    if n > 0 {
        item("Input at its low end".into(), Some(LOW_END))?;
        item("Input at its high end".into(), Some(HIGH_END))?;
    }
    if base.is_finite() {
        item(format!("Base case {}", with_unit(q, sys, c.base)), None)?;
    }
    root.present().map_err(err)?;
    Ok(())
}

/// The sensitivity chart as an SVG document.
pub fn sensitivity_svg(
    c: &SensitivityChart,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| draw_sensitivity(root, c, sys, 1.0))
}

// ------------------------------------------------------------------ from a ranges report

/// Draw result `index` of a ranges report as a [`SpreadChart`] (an index past the last
/// draws the axes and a note).
pub fn draw_report_spread<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    r: &crate::document::ranges::report::RangesReport,
    index: usize,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    let res = r.results.get(index);
    let values: Vec<f64> = r
        .trials
        .iter()
        .filter_map(|t| t.values.get(index).copied().flatten())
        .collect();
    let members: Vec<(&str, f64)> = res
        .and_then(|x| x.spread.as_ref())
        .map_or_else(Vec::new, |s| {
            s.members.iter().map(|m| (m.short, m.value)).collect()
        });
    let nan = f64::NAN;
    let c = SpreadChart {
        title: res.map_or("No result", |x| x.name),
        quantity: res.map_or("depth", |x| x.quantity),
        values: &values,
        p10: res.and_then(|x| x.p10).unwrap_or(nan),
        p50: res.and_then(|x| x.p50).unwrap_or(nan),
        p90: res.and_then(|x| x.p90).unwrap_or(nan),
        base: res.and_then(|x| x.base).unwrap_or(nan),
        runs: r.runs,
        seed: r.seed,
        failed: res.map_or(0, |x| x.runs_failed),
        members: &members,
    };
    draw_spread(root, &c, sys, scale)
}

/// An input's end as the page shows it ("250 kg/m³").
fn end_label(q: &str, sys: UnitSystem, si: f64) -> String {
    match quantity(q) {
        Some(u) => {
            let unit = u.unit(sys);
            let d = usize::from(unit.decimals);
            if unit.symbol.is_empty() {
                format!("{:.d$}", u.show(sys, si))
            } else {
                format!("{:.d$} {}", u.show(sys, si), unit.symbol)
            }
        }
        None => format!("{si}"),
    }
}

/// Draw result `index`'s one-at-a-time swings as a [`SensitivityChart`].
pub fn draw_report_sensitivity<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    r: &crate::document::ranges::report::RangesReport,
    index: usize,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    let res = r.results.get(index);
    let labels: Vec<(String, String, String, f64, f64)> = res.map_or_else(Vec::new, |res| {
        res.sensitivity
            .iter()
            .map(|s| {
                (
                    s.name.clone(),
                    end_label(s.quantity, sys, s.low),
                    end_label(s.quantity, sys, s.high),
                    s.at_low.unwrap_or(f64::NAN),
                    s.at_high.unwrap_or(f64::NAN),
                )
            })
            .collect()
    });
    let bars: Vec<(&str, &str, &str, f64, f64)> = labels
        .iter()
        .map(|(a, b, c, d, e)| (a.as_str(), b.as_str(), c.as_str(), *d, *e))
        .collect();
    let c = SensitivityChart {
        title: res.map_or("No result", |x| x.name),
        quantity: res.map_or("depth", |x| x.quantity),
        base: res.and_then(|x| x.base).unwrap_or(f64::NAN),
        bars: &bars,
    };
    draw_sensitivity(root, &c, sys, scale)
}

/// [`draw_report_spread`] as an SVG document.
pub fn report_spread_svg(
    r: &crate::document::ranges::report::RangesReport,
    index: usize,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| {
        draw_report_spread(root, r, index, sys, 1.0)
    })
}

/// [`draw_report_sensitivity`] as an SVG document.
pub fn report_sensitivity_svg(
    r: &crate::document::ranges::report::RangesReport,
    index: usize,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| {
        draw_report_sensitivity(root, r, index, sys, 1.0)
    })
}
