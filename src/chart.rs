//! Charts, written once against plotters' generic [`DrawingBackend`]: the page draws them on
//! its canvas (plotters-canvas), the CLI and the tests to SVG.

use plotters::coord::types::RangedCoordf64;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use crate::physics::materials::Family;
use crate::physics::units::{quantity, UnitSystem};
use crate::scenario::Computed;

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

/// Fill colour of a layer band, by material family.
fn layer_fill(f: Family) -> RGBColor {
    match f {
        Family::Snow => RGBColor(226, 238, 250),
        Family::Ice => RGBColor(205, 232, 240),
        Family::Water => RGBColor(190, 214, 238),
        Family::Air => RGBColor(246, 246, 246),
        Family::Soil => RGBColor(238, 226, 204),
        Family::Insulation => RGBColor(250, 228, 234),
        Family::Concrete => RGBColor(225, 225, 225),
        Family::Custom => RGBColor(232, 240, 220),
    }
}

pub(crate) const INK: RGBColor = RGBColor(30, 36, 44);
const PROFILE: RGBColor = RGBColor(20, 70, 140);
pub(crate) const BAND: RGBColor = RGBColor(120, 150, 200);
const ZERO: RGBColor = RGBColor(190, 40, 40);

/// Draw temperature against depth: layers shaded, the profile, the band across snow
/// regressions, the 0 °C line and each 0 °C plane. `scale` multiplies font sizes and line
/// widths (the page passes its device pixel ratio).
pub fn draw_profile<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    c: &Computed,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    let scale = chart_scale(scale);
    let px = |v: f64| (v * scale).round() as u32;
    let tq = quantity("temperature").ok_or_else(|| ChartError("no temperature unit".into()))?;
    let zq = quantity("depth").ok_or_else(|| ChartError("no depth unit".into()))?;
    let t = |si: f64| tq.show(sys, si);
    let z = |si: f64| zq.show(sys, si);
    let r = &c.result;

    root.fill(&WHITE).map_err(err)?;
    let depth_max = z(r.total_depth_m());
    // Tick labels: enough decimals for the span, no more.
    let depth_decimals = if depth_max >= 20.0 {
        0
    } else if depth_max >= 4.0 {
        1
    } else {
        2
    };
    // Temperature range: profile, band, faces and 0 °C, with a margin.
    let mut lo = f64::INFINITY;
    let mut hi = f64::NEG_INFINITY;
    let mut take = |v: f64| {
        lo = lo.min(v);
        hi = hi.max(v);
    };
    take(t(0.0));
    for &(_, tc) in &r.profile_at(&c.depths_m) {
        take(t(tc));
    }
    for face in [&r.top, &r.bottom] {
        take(t(face.surface_c));
    }
    if let Some(b) = &c.band {
        b.min_c.iter().chain(&b.max_c).for_each(|&v| take(t(v)));
    }
    let span = (hi - lo).max(1.0);
    let (x0, x1) = (lo - 0.06 * span, hi + 0.06 * span);

    let font = |size: f64| ("sans-serif", size * scale).into_font().color(&INK);
    let title = "Temperature through the stack";
    let mut chart = ChartBuilder::on(root)
        .margin(px(12.0))
        .caption(title, font(17.0))
        .x_label_area_size(px(44.0))
        .y_label_area_size(px(64.0))
        .build_cartesian_2d(x0..x1, -depth_max..0.0)
        .map_err(err)?;

    // Layers, shaded, with their names.
    for (i, (l, m)) in r.layers.iter().zip(&r.stack.materials).enumerate() {
        let (zt, zb) = (z(l.top_depth_m), z(l.bottom_depth_m));
        // Neighbours of one family alternate in shade so each layer stays visible.
        let mut fill = layer_fill(m.family);
        let same_as_above = i > 0 && r.stack.materials[i - 1].family == m.family;
        if same_as_above && i % 2 == 1 {
            fill = RGBColor(
                (fill.0 as f64 * 0.93) as u8,
                (fill.1 as f64 * 0.93) as u8,
                (fill.2 as f64 * 0.93) as u8,
            );
        }
        chart
            .draw_series(std::iter::once(Rectangle::new(
                [(x0, -zt), (x1, -zb)],
                fill.filled(),
            )))
            .map_err(err)?;
        if i > 0 {
            chart
                .draw_series(std::iter::once(PathElement::new(
                    vec![(x0, -zt), (x1, -zt)],
                    RGBColor(150, 150, 150).stroke_width(px(1.0)),
                )))
                .map_err(err)?;
        }
        let h_frac = (zb - zt) / depth_max.max(1e-12);
        if h_frac > 0.03 {
            let name = &r.stack.layers[i].name;
            let label = if name.trim().is_empty() {
                m.label.clone()
            } else {
                name.clone()
            };
            let label: String = label.chars().take(40).collect();
            chart
                .draw_series(std::iter::once(Text::new(
                    label,
                    (x1 - 0.015 * (x1 - x0), -zt - 0.012 * depth_max),
                    font(12.0)
                        .color(&RGBColor(90, 96, 104))
                        .pos(Pos::new(HPos::Right, VPos::Top)),
                )))
                .map_err(err)?;
        }
    }

    chart
        .configure_mesh()
        .disable_mesh()
        .x_desc(format!("Temperature ({})", tq.unit(sys).symbol))
        .y_desc(format!("Depth from the top face ({})", zq.unit(sys).symbol))
        .y_label_formatter(&|v| format!("{:.*}", depth_decimals, v.abs()))
        .x_label_formatter(&|v| format!("{v:.0}"))
        .label_style(font(12.0))
        .axis_desc_style(font(13.0))
        .draw()
        .map_err(err)?;

    // Band across snow regressions.
    if let Some(b) = &c.band {
        let mut poly: Vec<(f64, f64)> = b
            .depths_m
            .iter()
            .zip(&b.min_c)
            .map(|(&d, &v)| (t(v), -z(d)))
            .collect();
        poly.extend(
            b.depths_m
                .iter()
                .zip(&b.max_c)
                .rev()
                .map(|(&d, &v)| (t(v), -z(d))),
        );
        chart
            .draw_series(std::iter::once(Polygon::new(poly, BAND.mix(0.35).filled())))
            .map_err(err)?
            .label("Range across the snow conductivity regressions")
            .legend(move |(x, y)| {
                Rectangle::new(
                    [
                        (x, y - px(5.0) as i32),
                        (x + px(18.0) as i32, y + px(5.0) as i32),
                    ],
                    BAND.mix(0.35).filled(),
                )
            });
    }

    // 0 °C line.
    let t0 = t(0.0);
    chart
        .draw_series(DashedLineSeries::new(
            vec![(t0, 0.0), (t0, -depth_max)],
            px(6.0),
            px(4.0),
            ZERO.stroke_width(px(1.5)),
        ))
        .map_err(err)?;

    // Profile.
    let pts: Vec<(f64, f64)> = r
        .profile_at(&r.line_depths(48))
        .into_iter()
        .map(|(d, tc)| (t(tc), -z(d)))
        .collect();
    chart
        .draw_series(LineSeries::new(pts, PROFILE.stroke_width(px(2.5))))
        .map_err(err)?
        .label(if c.band.is_some() {
            "Temperature (chosen snow regression)"
        } else {
            "Temperature"
        })
        .legend(move |(x, y)| {
            PathElement::new(
                vec![(x, y), (x + px(18.0) as i32, y)],
                PROFILE.stroke_width(px(2.5)),
            )
        });

    // 0 °C planes.
    for p in &r.zero_planes {
        let d = -z(p.depth_m);
        chart
            .draw_series(DashedLineSeries::new(
                vec![(x0, d), (x1, d)],
                px(4.0),
                px(4.0),
                ZERO.stroke_width(px(1.0)),
            ))
            .map_err(err)?;
        chart
            .draw_series(std::iter::once(Circle::new(
                (t0, d),
                px(4.0),
                ZERO.filled(),
            )))
            .map_err(err)?;
        // Label the plane on whichever side of the 0 °C line has more room.
        let label = format!(
            "{:.0} {} at {:.2} {}",
            t0,
            tq.unit(sys).symbol,
            -d,
            zq.unit(sys).symbol
        );
        let right_side = t0 < x0 + 0.6 * (x1 - x0);
        let (anchor_x, h) = if right_side {
            (t0 + 0.015 * (x1 - x0), HPos::Left)
        } else {
            (t0 - 0.015 * (x1 - x0), HPos::Right)
        };
        chart
            .draw_series(std::iter::once(Text::new(
                label,
                (anchor_x, d + 0.01 * depth_max),
                font(12.0).color(&ZERO).pos(Pos::new(h, VPos::Bottom)),
            )))
            .map_err(err)?;
    }

    draw_legend(&mut chart, SeriesLabelPosition::LowerLeft, scale)?;
    root.present().map_err(err)?;
    Ok(())
}

/// The profile chart as an SVG document.
pub fn profile_svg(
    c: &Computed,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| draw_profile(root, c, sys, 1.0))
}

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
fn draw_legend<'a, DB: DrawingBackend + 'a>(
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

/// Draw frost and thaw depth against time for a winter run: the frozen ground shaded
/// between the thaw front and the frost front, the deepest frost marked. `scale` as in
/// [`draw_profile`].
pub fn draw_frost_depth<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    w: &crate::scenario_winter::WinterReport,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    let scale = chart_scale(scale);
    let px = |v: f64| (v * scale).round() as u32;
    let zq = quantity("depth").ok_or_else(|| ChartError("no depth unit".into()))?;
    let z = |si: f64| zq.show(sys, si);
    let font = |size: f64| ("sans-serif", size * scale).into_font().color(&INK);
    root.fill(&WHITE).map_err(err)?;
    let days = w.daily.last().map_or(1.0, |d| d.day).max(1.0);
    let deepest = w
        .daily
        .iter()
        .map(|d| d.frost_depth_m)
        .fold(w.max_frost_depth_m, f64::max);
    let y_max = z(deepest.max(0.05)) * 1.15;
    let mut chart = ChartBuilder::on(root)
        .margin(px(12.0))
        .caption("Frost in the ground through the run", font(17.0))
        .x_label_area_size(px(44.0))
        .y_label_area_size(px(64.0))
        .build_cartesian_2d(0.0..days, -y_max..0.0)
        .map_err(err)?;
    chart
        .configure_mesh()
        .light_line_style(RGBColor(235, 235, 235))
        .x_desc("Day of the run")
        .y_desc(format!("Depth below the surface ({})", zq.unit(sys).symbol))
        .y_label_formatter(&|v| format!("{:.2}", v.abs()))
        .x_label_formatter(&|v| format!("{v:.0}"))
        .label_style(font(12.0))
        .axis_desc_style(font(13.0))
        .draw()
        .map_err(err)?;
    // Frozen ground: between the thaw front (or the top of the first ground that can
    // freeze: a slab or a board above it holds no frozen ground) and the frost front.
    let mut poly: Vec<(f64, f64)> = w
        .daily
        .iter()
        .map(|d| (d.day, -z(d.frost_depth_m)))
        .collect();
    poly.extend(w.daily.iter().rev().map(|d| {
        let top = d.thaw_depth_m.max(w.freezable_top_m).min(d.frost_depth_m);
        (d.day, -z(top))
    }));
    chart
        .draw_series(std::iter::once(Polygon::new(poly, BAND.mix(0.45).filled())))
        .map_err(err)?
        .label("Frozen ground")
        .legend(move |(x, y)| {
            Rectangle::new(
                [
                    (x, y - px(5.0) as i32),
                    (x + px(18.0) as i32, y + px(5.0) as i32),
                ],
                BAND.mix(0.45).filled(),
            )
        });
    // Each front is drawn only over the spells when it exists (frost: frozen ground below
    // the surface; thaw: ground thawed from the surface above frozen ground).
    let spells = |depth: &dyn Fn(&crate::scenario_winter::WinterDay) -> f64| {
        let mut out: Vec<Vec<(f64, f64)>> = Vec::new();
        let mut current: Vec<(f64, f64)> = Vec::new();
        for d in &w.daily {
            if depth(d) > 0.0 {
                current.push((d.day, -z(depth(d))));
            } else if !current.is_empty() {
                out.push(std::mem::take(&mut current));
            }
        }
        if !current.is_empty() {
            out.push(current);
        }
        out
    };
    type Runs = Vec<Vec<(f64, f64)>>;
    let fronts: [(&str, RGBColor, f64, Runs); 2] = [
        ("Frost depth", PROFILE, 2.5, spells(&|d| d.frost_depth_m)),
        (
            "Thawed from the surface",
            ZERO,
            1.5,
            spells(&|d| d.thaw_depth_m),
        ),
    ];
    for (label, colour, width, runs) in fronts {
        for (i, run) in runs.into_iter().enumerate() {
            let series = chart
                .draw_series(line(run, colour, px(width)))
                .map_err(err)?;
            if i == 0 {
                series.label(label).legend(move |(x, y)| {
                    PathElement::new(
                        vec![(x, y), (x + px(18.0) as i32, y)],
                        colour.stroke_width(px(width)),
                    )
                });
            }
        }
    }
    let (mx, my) = (w.max_frost_day, -z(w.max_frost_depth_m));
    chart
        .draw_series(std::iter::once(Circle::new(
            (mx, my),
            px(4.0),
            PROFILE.filled(),
        )))
        .map_err(err)?;
    let right_side = mx < 0.6 * days;
    chart
        .draw_series(std::iter::once(Text::new(
            format!(
                "deepest {:.2} {} on day {:.0}",
                -my,
                zq.unit(sys).symbol,
                mx
            ),
            (
                mx + if right_side { 0.015 } else { -0.015 } * days,
                my - 0.02 * y_max,
            ),
            font(12.0).pos(Pos::new(
                if right_side { HPos::Left } else { HPos::Right },
                VPos::Top,
            )),
        )))
        .map_err(err)?;
    draw_legend(&mut chart, SeriesLabelPosition::UpperRight, scale)?;
    root.present().map_err(err)?;
    Ok(())
}

/// The frost-depth chart of a winter run as an SVG document.
pub fn frost_depth_svg(
    w: &crate::scenario_winter::WinterReport,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| draw_frost_depth(root, w, sys, 1.0))
}

use crate::scenario_winter::{WinterDay, WinterReport};

/// Snow above the ground surface (the same shade as a snow layer).
const SNOW: RGBColor = RGBColor(226, 238, 250);
/// The two shades the layers of a winter run alternate between (the report carries no
/// material family).
const GROUND_FILLS: [RGBColor; 2] = [RGBColor(242, 236, 224), RGBColor(230, 222, 206)];
const AIR_LINE: RGBColor = RGBColor(120, 128, 140);
const FLUX_LINE: RGBColor = RGBColor(196, 112, 16);
const ENVELOPE: RGBColor = RGBColor(150, 170, 205);

/// The daily record nearest to `day` (NaN days never win).
fn day_near(w: &WinterReport, day: f64) -> Option<&WinterDay> {
    w.daily.iter().filter(|d| d.day.is_finite()).min_by(|a, b| {
        (a.day - day)
            .abs()
            .partial_cmp(&(b.day - day).abs())
            .unwrap_or(std::cmp::Ordering::Equal)
    })
}

/// A day number as a caption shows it: whole days without decimals.
fn day_label(day: f64) -> String {
    if (day - day.round()).abs() < 1e-6 {
        format!("{:.0}", day.round() + 0.0)
    } else {
        format!("{day:.1}")
    }
}

/// Split a line at its non-finite points, so a gap in the data is a gap in the line.
fn finite_runs(points: impl IntoIterator<Item = (f64, f64)>) -> Vec<Vec<(f64, f64)>> {
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
fn line<DB: DrawingBackend>(
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
fn depth_decimals(depth_max: f64) -> usize {
    if depth_max >= 20.0 {
        0
    } else if depth_max >= 4.0 {
        1
    } else {
        2
    }
}

/// Draw the ground temperature against depth on one day of a winter run (the profile kept
/// nearest to `day`): the layers as shaded bands with their names, the coldest and warmest
/// each depth reached over the whole run behind the profile, the 0 °C line, that day's
/// frost depth (and thaw depth, when the ground has thawed from the surface over frozen
/// ground), and that day's snow as a band above the ground surface. Both axes are fixed for
/// the whole run, so the chart holds still while the day changes. `scale` as in
/// [`draw_profile`].
pub fn draw_winter_profile<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    w: &WinterReport,
    day: f64,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    let scale = chart_scale(scale);
    let px = |v: f64| (v * scale).round() as u32;
    let tq = quantity("temperature").ok_or_else(|| ChartError("no temperature unit".into()))?;
    let zq = quantity("depth").ok_or_else(|| ChartError("no depth unit".into()))?;
    let t = |si: f64| tq.show(sys, si);
    let z = |si: f64| zq.show(sys, si);
    let font = |size: f64| ("sans-serif", size * scale).into_font().color(&INK);
    root.fill(&WHITE).map_err(err)?;

    let day = if day.is_nan() {
        0.0
    } else {
        day.clamp(-1e9, 1e9)
    };
    let profile = w.profile_near(day);
    let today = day_near(w, profile.map_or(day, |p| p.day));

    // Depth: the whole stack, and above it the deepest snow of the run.
    let bottom_m = w
        .layer_faces_m
        .iter()
        .chain(w.envelope.iter().map(|e| &e[0]))
        .copied()
        .filter(|v| v.is_finite())
        .fold(0.0, f64::max);
    let bottom = z(if bottom_m > 0.0 { bottom_m } else { 1.0 });
    let snow_max = z(w
        .daily
        .iter()
        .map(|d| d.snow_depth_m)
        .filter(|v| v.is_finite())
        .fold(0.0, f64::max)
        .min(100.0));
    let top = if snow_max > 0.0 {
        snow_max * 1.1 + 0.03 * bottom
    } else {
        0.0
    };
    let decimals = depth_decimals(bottom.max(top));

    // Temperature: everything the run reached, so no day leaves the axis.
    let temps = std::iter::once(0.0)
        .chain(w.envelope.iter().flat_map(|e| [e[1], e[2]]))
        .chain(w.daily.iter().map(|d| d.surface_c))
        .chain(
            w.profiles
                .iter()
                .flat_map(|p| p.temperature_c.iter().copied()),
        )
        .map(t);
    let (x0, x1) = padded_range(temps, 1.0, 0.06);
    let x_decimals = tick_decimals(x1 - x0);

    let caption = match profile {
        Some(p) => format!("Ground temperature on day {}", day_label(p.day)),
        None => "Ground temperature: no profile was kept".to_string(),
    };
    let mut chart = ChartBuilder::on(root)
        .margin(px(12.0))
        .caption(caption, font(17.0))
        .x_label_area_size(px(44.0))
        .y_label_area_size(px(64.0))
        .build_cartesian_2d(x0..x1, -bottom..top)
        .map_err(err)?;

    // Layers, alternating in shade, with their names.
    let height = bottom + top;
    for (i, pair) in w.layer_faces_m.windows(2).enumerate() {
        let (zt, zb) = (z(pair[0]), z(pair[1]));
        if !(zt.is_finite() && zb.is_finite() && zb > zt) {
            continue;
        }
        let (zt, zb) = (zt.max(0.0), zb.min(bottom));
        chart
            .draw_series(std::iter::once(Rectangle::new(
                [(x0, -zt), (x1, -zb)],
                GROUND_FILLS[i % 2].filled(),
            )))
            .map_err(err)?;
        if i > 0 {
            chart
                .draw_series(std::iter::once(PathElement::new(
                    vec![(x0, -zt), (x1, -zt)],
                    RGBColor(150, 150, 150).stroke_width(px(1.0)),
                )))
                .map_err(err)?;
        }
        if (zb - zt) / height > 0.03 {
            let name = w.layer_names.get(i).map_or("", |n| n.trim());
            let label: String = if name.is_empty() {
                format!("layer {}", i + 1)
            } else {
                name.chars().take(40).collect()
            };
            chart
                .draw_series(std::iter::once(Text::new(
                    label,
                    (x1 - 0.015 * (x1 - x0), -zt - 0.012 * height),
                    font(12.0)
                        .color(&RGBColor(90, 96, 104))
                        .pos(Pos::new(HPos::Right, VPos::Top)),
                )))
                .map_err(err)?;
        }
    }

    chart
        .configure_mesh()
        .disable_mesh()
        .x_desc(format!("Temperature ({})", tq.unit(sys).symbol))
        .y_desc(format!(
            "Depth below the ground surface ({})",
            zq.unit(sys).symbol
        ))
        .y_label_formatter(&|v| tick(-v, decimals))
        .x_label_formatter(&|v| tick(*v, x_decimals))
        .label_style(font(12.0))
        .axis_desc_style(font(13.0))
        .draw()
        .map_err(err)?;

    // The coldest and warmest each depth reached over the run.
    let lows: Vec<(f64, f64)> = w
        .envelope
        .iter()
        .filter(|e| e.iter().all(|v| v.is_finite()))
        .map(|e| (t(e[1]), -z(e[0])))
        .collect();
    if lows.len() >= 2 {
        let mut poly = lows;
        poly.extend(
            w.envelope
                .iter()
                .filter(|e| e.iter().all(|v| v.is_finite()))
                .rev()
                .map(|e| (t(e[2]), -z(e[0]))),
        );
        chart
            .draw_series(std::iter::once(Polygon::new(
                poly,
                ENVELOPE.mix(0.35).filled(),
            )))
            .map_err(err)?
            .label("Coldest and warmest over the run")
            .legend(move |(x, y)| {
                Rectangle::new(
                    [
                        (x, y - px(5.0) as i32),
                        (x + px(18.0) as i32, y + px(5.0) as i32),
                    ],
                    ENVELOPE.mix(0.35).filled(),
                )
            });
    }

    // That day's snow, above the ground surface.
    let snow_today = today
        .map(|d| d.snow_depth_m)
        .filter(|s| s.is_finite() && *s > 0.0)
        .map(|s| z(s).min(top));
    if let Some(s) = snow_today {
        chart
            .draw_series(std::iter::once(Rectangle::new(
                [(x0, 0.0), (x1, s)],
                SNOW.filled(),
            )))
            .map_err(err)?;
        let label = format!(
            "snow {:.*} {}",
            zq.unit(sys).decimals.min(2) as usize,
            s,
            zq.unit(sys).symbol
        );
        chart
            .draw_series(std::iter::once(Text::new(
                label,
                (x1 - 0.015 * (x1 - x0), s),
                font(12.0)
                    .color(&RGBColor(70, 100, 140))
                    .pos(Pos::new(HPos::Right, VPos::Bottom)),
            )))
            .map_err(err)?;
    }
    if top > 0.0 {
        // The ground surface, between the snow above and the ground below.
        chart
            .draw_series(std::iter::once(PathElement::new(
                vec![(x0, 0.0), (x1, 0.0)],
                RGBColor(110, 110, 110).stroke_width(px(1.0)),
            )))
            .map_err(err)?;
    }

    // 0 °C line.
    let t0 = t(0.0);
    chart
        .draw_series(DashedLineSeries::new(
            vec![(t0, top), (t0, -bottom)],
            px(6.0),
            px(4.0),
            ZERO.stroke_width(px(1.5)),
        ))
        .map_err(err)?;

    // The profile: from the ground surface through every cell centre.
    if let Some(p) = profile {
        let surface = today
            .filter(|d| (d.day - p.day).abs() < 0.01)
            .map(|d| (t(d.surface_c), 0.0));
        let cells = w
            .envelope
            .iter()
            .zip(&p.temperature_c)
            .map(|(e, &tc)| (t(tc), -z(e[0])));
        for (i, run) in finite_runs(surface.into_iter().chain(cells))
            .into_iter()
            .enumerate()
        {
            let series = chart
                .draw_series(line(run, PROFILE, px(2.5)))
                .map_err(err)?;
            if i == 0 {
                series
                    .label("Temperature on this day")
                    .legend(move |(x, y)| {
                        PathElement::new(
                            vec![(x, y), (x + px(18.0) as i32, y)],
                            PROFILE.stroke_width(px(2.5)),
                        )
                    });
            }
        }
    }

    // That day's fronts.
    if let Some(d) = today {
        let fronts = [
            ("frost depth", d.frost_depth_m, PROFILE),
            ("thawed to", d.thaw_depth_m, ZERO),
        ];
        for (what, depth_m, colour) in fronts {
            if !(depth_m.is_finite() && depth_m > 0.0) {
                continue;
            }
            let y = -z(depth_m).min(bottom);
            chart
                .draw_series(DashedLineSeries::new(
                    vec![(x0, y), (x1, y)],
                    px(4.0),
                    px(4.0),
                    colour.stroke_width(px(1.5)),
                ))
                .map_err(err)?;
            chart
                .draw_series(std::iter::once(Text::new(
                    format!("{what} {:.2} {}", -y, zq.unit(sys).symbol),
                    (x0 + 0.015 * (x1 - x0), y + 0.008 * height),
                    font(12.0)
                        .color(&colour)
                        .pos(Pos::new(HPos::Left, VPos::Bottom)),
                )))
                .map_err(err)?;
        }
    }

    draw_legend(&mut chart, SeriesLabelPosition::LowerLeft, scale)?;
    root.present().map_err(err)?;
    Ok(())
}

/// The winter profile chart of one day as an SVG document.
pub fn winter_profile_svg(
    w: &WinterReport,
    day: f64,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| {
        draw_winter_profile(root, w, day, sys, 1.0)
    })
}

/// Draw the daily air and ground surface temperatures against the day of the run, with the
/// heat flux into the ground on a second axis at the right, and the air and surface
/// freezing indices in the upper left corner. `scale` as in [`draw_profile`].
pub fn draw_ground_series<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    w: &WinterReport,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    let scale = chart_scale(scale);
    let px = |v: f64| (v * scale).round() as u32;
    let tq = quantity("temperature").ok_or_else(|| ChartError("no temperature unit".into()))?;
    let fq = quantity("heat_flux").ok_or_else(|| ChartError("no heat flux unit".into()))?;
    let dq = quantity("degree_days").ok_or_else(|| ChartError("no degree-day unit".into()))?;
    let t = |si: f64| tq.show(sys, si);
    let f = |si: f64| fq.show(sys, si);
    let font = |size: f64| ("sans-serif", size * scale).into_font().color(&INK);
    root.fill(&WHITE).map_err(err)?;

    let (mut d0, mut d1) = (f64::INFINITY, f64::NEG_INFINITY);
    for d in w.daily.iter().map(|d| d.day).filter(|v| v.is_finite()) {
        d0 = d0.min(d);
        d1 = d1.max(d);
    }
    if d0 > d1 {
        (d0, d1) = (0.0, 1.0);
    }
    if d1 - d0 < 1.0 {
        d1 = d0 + 1.0;
    }
    let (y0, y1) = padded_range(
        std::iter::once(0.0)
            .chain(w.daily.iter().flat_map(|d| [d.air_c, d.surface_c]))
            .map(t),
        2.0,
        0.06,
    );
    // The record of the run's first instant has taken no step, so it has no flux yet (the
    // run writes 0 there): the flux line starts with the first day.
    let fluxes: Vec<(f64, f64)> = w
        .daily
        .iter()
        .enumerate()
        .filter(|(i, d)| !(*i == 0 && d.day == 0.0))
        .map(|(_, d)| (d.day, f(d.ground_flux_w_m2)))
        .collect();
    let (s0, s1) = padded_range(
        std::iter::once(0.0).chain(fluxes.iter().map(|p| p.1)),
        1.0,
        0.06,
    );
    let (day_decimals, t_decimals) = (tick_decimals(d1 - d0), tick_decimals(y1 - y0));

    let mut chart = ChartBuilder::on(root)
        .margin(px(12.0))
        .caption(
            "Air, ground surface and heat flux through the run",
            font(17.0),
        )
        .x_label_area_size(px(44.0))
        .y_label_area_size(px(64.0))
        .right_y_label_area_size(px(72.0))
        .build_cartesian_2d(d0..d1, y0..y1)
        .map_err(err)?
        .set_secondary_coord(d0..d1, s0..s1);
    chart
        .configure_mesh()
        .light_line_style(RGBColor(235, 235, 235))
        .x_desc("Day of the run")
        .y_desc(format!("Temperature ({})", tq.unit(sys).symbol))
        .x_label_formatter(&|v| tick(*v, day_decimals))
        .y_label_formatter(&|v| tick(*v, t_decimals))
        .label_style(font(12.0))
        .axis_desc_style(font(13.0))
        .draw()
        .map_err(err)?;
    let flux_decimals = tick_decimals(s1 - s0);
    chart
        .configure_secondary_axes()
        .y_desc(format!(
            "Heat flux into the ground ({})",
            fq.unit(sys).symbol
        ))
        .y_label_formatter(&|v| tick(*v, flux_decimals))
        .label_style(font(12.0))
        .axis_desc_style(font(13.0))
        .draw()
        .map_err(err)?;

    let t0 = t(0.0);
    chart
        .draw_series(DashedLineSeries::new(
            vec![(d0, t0), (d1, t0)],
            px(6.0),
            px(4.0),
            ZERO.stroke_width(px(1.0)),
        ))
        .map_err(err)?;

    type Pick = fn(&WinterDay) -> f64;
    let lines: [(&str, RGBColor, f64, Pick); 2] = [
        ("Air", AIR_LINE, 1.5, |d| d.air_c),
        ("Ground surface", PROFILE, 2.0, |d| d.surface_c),
    ];
    for (label, colour, width, pick) in lines {
        let runs = finite_runs(w.daily.iter().map(|d| (d.day, t(pick(d)))));
        for (i, run) in runs.into_iter().enumerate() {
            let series = chart
                .draw_series(line(run, colour, px(width)))
                .map_err(err)?;
            if i == 0 {
                series.label(label).legend(move |(x, y)| {
                    PathElement::new(
                        vec![(x, y), (x + px(18.0) as i32, y)],
                        colour.stroke_width(px(width)),
                    )
                });
            }
        }
    }
    let runs = finite_runs(fluxes);
    for (i, run) in runs.into_iter().enumerate() {
        let series = chart
            .draw_secondary_series(line(run, FLUX_LINE, px(1.5)))
            .map_err(err)?;
        if i == 0 {
            series
                .label("Heat flux into the ground (right axis)")
                .legend(move |(x, y)| {
                    PathElement::new(
                        vec![(x, y), (x + px(18.0) as i32, y)],
                        FLUX_LINE.stroke_width(px(1.5)),
                    )
                });
        }
    }

    // The freezing indices, on a pale box in the upper left corner of the plot.
    let index = |v: f64| {
        if v.is_finite() {
            format!("{:.0} {}", dq.show(sys, v) + 0.0, dq.unit(sys).symbol)
        } else {
            "not known".to_string()
        }
    };
    let notes = [
        format!(
            "Freezing index of the air: {}",
            index(w.air_freezing_index_c_days)
        ),
        format!(
            "Freezing index of the ground surface: {}",
            index(w.surface_freezing_index_c_days)
        ),
    ];
    let note_font = font(12.0);
    let (mut box_w, mut line_h) = (0i32, 0i32);
    for n in &notes {
        let (tw, th) = root.estimate_text_size(n, &note_font).map_err(err)?;
        box_w = box_w.max(tw as i32);
        line_h = line_h.max(th as i32);
    }
    line_h += px(4.0) as i32;
    let (xr, yr) = chart.plotting_area().get_pixel_range();
    let base = root.get_base_pixel();
    let (bx, by) = (
        xr.start - base.0 + px(10.0) as i32,
        yr.start - base.1 + px(8.0) as i32,
    );
    let pad = px(5.0) as i32;
    root.draw(&Rectangle::new(
        [
            (bx - pad, by - pad),
            (bx + box_w + pad, by + line_h * notes.len() as i32 + pad),
        ],
        WHITE.mix(0.85).filled(),
    ))
    .map_err(err)?;
    for (i, n) in notes.iter().enumerate() {
        root.draw(&Text::new(
            n.clone(),
            (bx, by + line_h * i as i32),
            note_font.clone(),
        ))
        .map_err(err)?;
    }

    draw_legend(&mut chart, SeriesLabelPosition::LowerRight, scale)?;
    root.present().map_err(err)?;
    Ok(())
}

/// The daily series chart of a winter run as an SVG document.
pub fn ground_series_svg(
    w: &WinterReport,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| draw_ground_series(root, w, sys, 1.0))
}

// ---------------------------------------------------------------- shelter charts

use crate::scenario_shelter::{SeriesDoc, ShelterReport};

const TARGET: RGBColor = RGBColor(30, 130, 70);
const SURFACE_LINE: RGBColor = RGBColor(150, 90, 170);

/// A horizontal reference line across the plot, labelled at its right end.
fn reference_line<DB: DrawingBackend>(
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

/// Draw the first night in a shelter: the air inside, the inner surface of the main wall
/// and the warmest snow surface against the hours, with the 0 °C melt limit, the design
/// target and the steady interior temperature marked, and the warm-up time if the air gets
/// there. `scale` as in [`draw_profile`]. No report makes it fail: an empty night draws
/// axes and a note.
pub fn draw_shelter_night<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    r: &ShelterReport,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    let scale = chart_scale(scale);
    let px = |v: f64| (v * scale).round() as u32;
    let tq = quantity("temperature").ok_or_else(|| ChartError("no temperature unit".into()))?;
    let t = |si: f64| tq.show(sys, si);
    let sym = tq.unit(sys).symbol;
    let font = |size: f64| ("sans-serif", size * scale).into_font().color(&INK);
    root.fill(&WHITE).map_err(err)?;
    let n = &r.night;
    let hours = |s: f64| s / 3600.0;
    let x_max = hours(n.duration_s)
        .max(n.samples.last().map_or(0.0, |p| hours(p.time_s)))
        .max(1e-3);
    let x_max = if x_max.is_finite() { x_max } else { 1.0 };
    let values = n
        .samples
        .iter()
        .flat_map(|p| [p.interior_c, p.main_surface_c, p.warmest_surface_c])
        .chain([0.0, r.least_wall.target_c, n.steady_interior_c])
        .map(t);
    let (y0, y1) = padded_range(values, 2.0, 0.06);
    let mut chart = ChartBuilder::on(root)
        .margin(px(12.0))
        .caption("The first night inside", font(17.0))
        .x_label_area_size(px(44.0))
        .y_label_area_size(px(56.0))
        .build_cartesian_2d(0.0..x_max, y0..y1)
        .map_err(err)?;
    let yd = tick_decimals(y1 - y0);
    chart
        .configure_mesh()
        .light_line_style(RGBColor(235, 235, 235))
        .x_desc("Hours since people went in")
        .y_desc(format!("Temperature ({sym})"))
        .x_label_formatter(&|v| tick(*v, tick_decimals(x_max)))
        .y_label_formatter(&|v| tick(*v, yd))
        .label_style(font(12.0))
        .axis_desc_style(font(13.0))
        .draw()
        .map_err(err)?;
    reference_line(
        &mut chart,
        (0.0, x_max),
        t(0.0),
        ZERO,
        (&format!("{} {sym}: snow melts", tick(t(0.0), 0)), false),
        scale,
    )?;
    reference_line(
        &mut chart,
        (0.0, x_max),
        t(r.least_wall.target_c),
        TARGET,
        ("target", false),
        scale,
    )?;
    reference_line(
        &mut chart,
        (0.0, x_max),
        t(n.steady_interior_c),
        AIR_LINE,
        ("steady state", true),
        scale,
    )?;
    type Pick = fn(&crate::scenario_shelter::NightPointDoc) -> f64;
    let lines: [(&str, RGBColor, f64, Pick); 3] = [
        ("Air inside", PROFILE, 2.5, |p| p.interior_c),
        ("Inner surface of the main wall", SURFACE_LINE, 1.8, |p| {
            p.main_surface_c
        }),
        ("Warmest snow surface", FLUX_LINE, 1.2, |p| {
            p.warmest_surface_c
        }),
    ];
    for (label, colour, width, get) in lines {
        let runs = finite_runs(n.samples.iter().map(|p| (hours(p.time_s), t(get(p)))));
        for (i, run) in runs.into_iter().enumerate() {
            let s = chart
                .draw_series(line(run, colour, px(width)))
                .map_err(err)?;
            if i == 0 {
                s.label(label).legend(move |(x, y)| {
                    PathElement::new(
                        vec![(x, y), (x + px(18.0) as i32, y)],
                        colour.stroke_width(px(width)),
                    )
                });
            }
        }
    }
    if let Some(w) = n.warmup_time_s.map(hours).filter(|w| w.is_finite()) {
        let y = n
            .samples
            .iter()
            .min_by(|a, b| {
                (hours(a.time_s) - w)
                    .abs()
                    .partial_cmp(&(hours(b.time_s) - w).abs())
                    .unwrap_or(std::cmp::Ordering::Equal)
            })
            .map_or(f64::NAN, |p| t(p.interior_c));
        if y.is_finite() {
            chart
                .draw_series(std::iter::once(Circle::new(
                    (w, y),
                    px(4.0),
                    PROFILE.filled(),
                )))
                .map_err(err)?;
            chart
                .draw_series(std::iter::once(Text::new(
                    format!("warm after {w:.1} h"),
                    (w, y),
                    font(12.0).pos(Pos::new(HPos::Left, VPos::Top)),
                )))
                .map_err(err)?;
        }
    }
    if n.samples.is_empty() {
        chart
            .draw_series(std::iter::once(Text::new(
                "No night was run",
                (0.5 * x_max, 0.5 * (y0 + y1)),
                font(13.0).pos(Pos::new(HPos::Center, VPos::Center)),
            )))
            .map_err(err)?;
    }
    draw_legend(&mut chart, SeriesLabelPosition::LowerRight, scale)?;
    root.present().map_err(err)?;
    Ok(())
}

/// The night chart as an SVG document.
pub fn shelter_night_svg(
    r: &ShelterReport,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| draw_shelter_night(root, r, sys, 1.0))
}

/// Draw one series of a shelter (the air inside against wall thickness, people or the
/// outside temperature): the line, its points where snow melts marked with red dots, the
/// 0 °C melt limit, the target, and the shelter as it stands. No legend: the panels are
/// narrow, the y axis names the line and the page's caption the dots. `target_c` is the
/// design target.
pub fn draw_shelter_sweep<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    s: &SeriesDoc,
    target_c: f64,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    sweep_panel(root, s, target_c, sys, scale)?;
    root.present().map_err(err)
}

/// One series on its area, not yet presented (so panels can share one document).
fn sweep_panel<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    s: &SeriesDoc,
    target_c: f64,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    let scale = chart_scale(scale);
    let px = |v: f64| (v * scale).round() as u32;
    let tq = quantity("temperature").ok_or_else(|| ChartError("no temperature unit".into()))?;
    let t = |si: f64| tq.show(sys, si);
    let xq = quantity(s.x_quantity);
    let x = |si: f64| xq.map_or(si, |q| q.show(sys, si));
    let x_sym = xq.map_or("", |q| q.unit(sys).symbol);
    let sym = tq.unit(sys).symbol;
    let font = |size: f64| ("sans-serif", size * scale).into_font().color(&INK);
    root.fill(&WHITE).map_err(err)?;
    let (mut x0, mut x1) = padded_range(s.points.iter().map(|p| x(p.x)), 1e-6, 0.0);
    if x1 - x0 < 1e-6 {
        (x0, x1) = (x0 - 1.0, x1 + 1.0);
    }
    let (y0, y1) = padded_range(
        s.points
            .iter()
            .map(|p| p.interior_c)
            .chain([0.0, target_c])
            .map(t),
        2.0,
        0.06,
    );
    let mut label = s.x_label.clone();
    if let Some(c) = label.get(0..1) {
        label.replace_range(0..1, &c.to_uppercase());
    }
    let x_desc = if x_sym.is_empty() {
        label.clone()
    } else {
        format!("{label} ({x_sym})")
    };
    let mut chart = ChartBuilder::on(root)
        .margin(px(12.0))
        .caption(s.title.clone(), font(15.0))
        .x_label_area_size(px(44.0))
        .y_label_area_size(px(56.0))
        .build_cartesian_2d(x0..x1, y0..y1)
        .map_err(err)?;
    let (xd, yd) = (
        if s.x_quantity == "count" {
            0
        } else {
            tick_decimals(x1 - x0)
        },
        tick_decimals(y1 - y0),
    );
    chart
        .configure_mesh()
        .light_line_style(RGBColor(235, 235, 235))
        .x_desc(x_desc)
        .y_desc(format!("Air inside ({sym})"))
        .x_label_formatter(&|v| tick(*v, xd))
        .y_label_formatter(&|v| tick(*v, yd))
        .label_style(font(12.0))
        .axis_desc_style(font(13.0))
        .draw()
        .map_err(err)?;
    reference_line(
        &mut chart,
        (x0, x1),
        t(0.0),
        ZERO,
        (&format!("{} {sym}: snow melts", tick(t(0.0), 0)), false),
        scale,
    )?;
    reference_line(
        &mut chart,
        (x0, x1),
        t(target_c),
        TARGET,
        ("target", true),
        scale,
    )?;
    for run in finite_runs(s.points.iter().map(|p| (x(p.x), t(p.interior_c)))) {
        chart
            .draw_series(line(run, PROFILE, px(2.5)))
            .map_err(err)?;
    }
    let melting: Vec<(f64, f64)> = s
        .points
        .iter()
        .filter(|p| p.melt_kg_per_h > 0.0 && p.interior_c.is_finite())
        .map(|p| (x(p.x), t(p.interior_c)))
        .collect();
    if !melting.is_empty() {
        chart
            .draw_series(
                melting
                    .into_iter()
                    .map(|c| Circle::new(c, px(3.5), ZERO.filled())),
            )
            .map_err(err)?;
    }
    if let Some(cx) = s
        .current_x
        .map(x)
        .filter(|v| v.is_finite() && *v >= x0 && *v <= x1)
    {
        chart
            .draw_series(DashedLineSeries::new(
                vec![(cx, y0), (cx, y1)],
                px(3.0),
                px(3.0),
                AIR_LINE.stroke_width(px(1.0)),
            ))
            .map_err(err)?;
        chart
            .draw_series(std::iter::once(Text::new(
                "as set",
                (cx, y1),
                font(11.0).pos(Pos::new(HPos::Left, VPos::Top)),
            )))
            .map_err(err)?;
    }
    if s.points.is_empty() {
        chart
            .draw_series(std::iter::once(Text::new(
                s.note.clone().unwrap_or_else(|| "No points".into()),
                (0.5 * (x0 + x1), 0.5 * (y0 + y1)),
                font(12.0).pos(Pos::new(HPos::Center, VPos::Center)),
            )))
            .map_err(err)?;
    }
    Ok(())
}

/// The three series side by side on one drawing area.
pub fn draw_shelter_sweeps<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    r: &ShelterReport,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    root.fill(&WHITE).map_err(err)?;
    let n = r.sweeps.len().max(1);
    let panels = root.split_evenly((1, n));
    for (panel, s) in panels.iter().zip(&r.sweeps) {
        sweep_panel(panel, s, r.least_wall.target_c, sys, scale)?;
    }
    root.present().map_err(err)?;
    Ok(())
}

/// The three series as one SVG document of three panels.
pub fn shelter_sweeps_svg(
    r: &ShelterReport,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| draw_shelter_sweeps(root, r, sys, 1.0))
}

// ---------------------------------------------------------------- edge charts

use crate::scenario_edge::EdgeReport;

const BASE_LINE: RGBColor = RGBColor(90, 90, 90);
const COLUMN_LINE: RGBColor = RGBColor(60, 150, 90);

/// The temperature field of an edge run on the kept day nearest `day`, as a colour map with
/// the 0 °C line and the outlines of slab, wall and boards; the day in the caption. No
/// report makes it fail: without a field it draws the caption and a note.
pub fn draw_edge_field<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    r: &EdgeReport,
    day: f64,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    let outlines = r.chart_outlines();
    let nx = r.x_faces_m.len().saturating_sub(1);
    let nz = r.z_faces_m.len().saturating_sub(1);
    let field = r
        .field_near(if day.is_finite() { day } else { 0.0 })
        .filter(|f| nx > 0 && nz > 0 && f.temperature_c.len() == nx * nz);
    match field {
        Some(f) => {
            let caption = format!(
                "Temperature in the section on day {}",
                day_label(f.time_s / 86_400.0)
            );
            let map = crate::chart_field::FieldMap {
                x_faces_m: &r.x_faces_m,
                z_faces_m: &r.z_faces_m,
                temperature_c: &f.temperature_c,
                outlines: &outlines,
                caption: &caption,
            };
            crate::chart_field::draw_field_map(root, &map, sys, scale)
        }
        None => {
            let scale = chart_scale(scale);
            root.fill(&WHITE).map_err(err)?;
            let (w, h) = root.dim_in_pixel();
            root.draw(&Text::new(
                "Temperature in the section: no field was kept",
                ((w / 2) as i32, (h / 2) as i32),
                ("sans-serif", 15.0 * scale)
                    .into_font()
                    .color(&INK)
                    .pos(Pos::new(HPos::Center, VPos::Center)),
            ))
            .map_err(err)?;
            root.present().map_err(err)?;
            Ok(())
        }
    }
}

/// The edge field chart as an SVG document.
pub fn edge_field_svg(
    r: &EdgeReport,
    day: f64,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| {
        draw_edge_field(root, r, day, sys, 1.0)
    })
}

/// Frost below the footing's base against the day (the base is the 0 line; below it
/// positive), with the far-field frost of the 2D run and of the 1D column measured from the
/// same base, and the slab's heat loss on the right-hand axis. No report makes it fail: an
/// empty one draws the axes and a note.
pub fn draw_edge_series<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    r: &EdgeReport,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    let scale = chart_scale(scale);
    let px = |v: f64| (v * scale).round() as u32;
    let zq = quantity("depth").ok_or_else(|| ChartError("no depth unit".into()))?;
    let z = |si: f64| zq.show(sys, si);
    let q = |si: f64| crate::scenario_edge::linear_heat_shown(sys, si);
    let font = |size: f64| ("sans-serif", size * scale).into_font().color(&INK);
    root.fill(&WHITE).map_err(err)?;
    let base = if r.base_depth_m.is_finite() {
        r.base_depth_m
    } else {
        0.0
    };
    let (mut d0, mut d1) = (f64::INFINITY, f64::NEG_INFINITY);
    for d in r.daily.iter().map(|d| d.day).filter(|v| v.is_finite()) {
        d0 = d0.min(d);
        d1 = d1.max(d);
    }
    if d0 > d1 {
        (d0, d1) = (0.0, 1.0);
    }
    if d1 - d0 < 1.0 {
        d1 = d0 + 1.0;
    }
    let (y0, y1) = padded_range(
        std::iter::once(0.0)
            .chain(r.daily.iter().flat_map(|d| {
                [
                    d.frost_below_base_m,
                    d.far_frost_depth_m - base,
                    d.column_frost_depth_m - base,
                ]
            }))
            .map(z),
        0.2,
        0.06,
    );
    let (s0, s1) = padded_range(
        std::iter::once(0.0).chain(r.daily.iter().map(|d| q(d.slab_heat_w_m))),
        1.0,
        0.06,
    );
    let (day_decimals, z_decimals) = (tick_decimals(d1 - d0), tick_decimals(y1 - y0));
    let mut chart = ChartBuilder::on(root)
        .margin(px(12.0))
        .caption(
            "Frost below the footing's base, and the slab's heat loss",
            font(17.0),
        )
        .x_label_area_size(px(44.0))
        .y_label_area_size(px(64.0))
        .right_y_label_area_size(px(72.0))
        .build_cartesian_2d(d0..d1, y0..y1)
        .map_err(err)?
        .set_secondary_coord(d0..d1, s0..s1);
    chart
        .configure_mesh()
        .light_line_style(RGBColor(235, 235, 235))
        .x_desc("Day of the run")
        .y_desc(format!(
            "Frost below the base ({}), above it negative",
            zq.unit(sys).symbol
        ))
        .x_label_formatter(&|v| tick(*v, day_decimals))
        .y_label_formatter(&|v| tick(*v, z_decimals))
        .label_style(font(12.0))
        .axis_desc_style(font(13.0))
        .draw()
        .map_err(err)?;
    let q_decimals = tick_decimals(s1 - s0);
    chart
        .configure_secondary_axes()
        .y_desc(format!(
            "Slab heat loss ({})",
            crate::scenario_edge::linear_heat_symbol(sys)
        ))
        .y_label_formatter(&|v| tick(*v, q_decimals))
        .label_style(font(12.0))
        .axis_desc_style(font(13.0))
        .draw()
        .map_err(err)?;
    chart
        .draw_series(DashedLineSeries::new(
            vec![(d0, 0.0), (d1, 0.0)],
            px(6.0),
            px(4.0),
            BASE_LINE.stroke_width(px(1.0)),
        ))
        .map_err(err)?
        .label("Footing's base")
        .legend(move |(x, y)| {
            PathElement::new(
                vec![(x, y), (x + px(18.0) as i32, y)],
                BASE_LINE.stroke_width(px(1.0)),
            )
        });
    type Pick = fn(&crate::scenario_edge::EdgeDay, f64) -> f64;
    let lines: [(&str, RGBColor, f64, Pick); 3] = [
        ("Under the footing (2D)", ZERO, 2.0, |d, _| {
            d.frost_below_base_m
        }),
        ("Far field (2D)", PROFILE, 1.5, |d, b| {
            d.far_frost_depth_m - b
        }),
        ("Far field (1D column)", COLUMN_LINE, 1.5, |d, b| {
            d.column_frost_depth_m - b
        }),
    ];
    for (label, colour, width, pick) in lines {
        let runs = finite_runs(r.daily.iter().map(|d| (d.day, z(pick(d, base)))));
        for (i, run) in runs.into_iter().enumerate() {
            let series = chart
                .draw_series(line(run, colour, px(width)))
                .map_err(err)?;
            if i == 0 {
                series.label(label).legend(move |(x, y)| {
                    PathElement::new(
                        vec![(x, y), (x + px(18.0) as i32, y)],
                        colour.stroke_width(px(width)),
                    )
                });
            }
        }
    }
    let runs = finite_runs(r.daily.iter().map(|d| (d.day, q(d.slab_heat_w_m))));
    for (i, run) in runs.into_iter().enumerate() {
        let series = chart
            .draw_secondary_series(line(run, FLUX_LINE, px(1.5)))
            .map_err(err)?;
        if i == 0 {
            series
                .label("Slab heat loss (right axis)")
                .legend(move |(x, y)| {
                    PathElement::new(
                        vec![(x, y), (x + px(18.0) as i32, y)],
                        FLUX_LINE.stroke_width(px(1.5)),
                    )
                });
        }
    }
    if r.daily.is_empty() {
        chart
            .draw_series(std::iter::once(Text::new(
                "No day was run",
                (0.5 * (d0 + d1), 0.5 * (y0 + y1)),
                font(13.0).pos(Pos::new(HPos::Center, VPos::Center)),
            )))
            .map_err(err)?;
    }
    draw_legend(&mut chart, SeriesLabelPosition::LowerRight, scale)?;
    root.present().map_err(err)?;
    Ok(())
}

/// The edge series chart as an SVG document.
pub fn edge_series_svg(
    r: &EdgeReport,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| draw_edge_series(root, r, sys, 1.0))
}
