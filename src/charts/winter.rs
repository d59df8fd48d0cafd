//! A winter run's charts: frost and thaw fronts against time, the ground temperature on one
//! day over the run's envelope, and the daily air and surface temperatures with the ground
//! heat flux.
//!
//! - [`draw_frost_depth`]: frost and thaw fronts against the day.
//! - [`draw_winter_profile`] `(root, report, day, units, scale)`: the ground temperature
//!   against depth on the day whose kept profile is nearest `day`, over the band of the
//!   coldest and warmest each cell reached in the whole run, with the layers as alternating
//!   bands named from `layer_names`, the 0 °C line, that day's frost (and thaw) depth and
//!   that day's snow as a band above the surface. Its axes come from the whole run (the
//!   envelope, every profile, every surface temperature), so they hold still while the day
//!   changes; `tests/chart.rs` checks that the curve's pixels are one linear map of the
//!   data on two different days.
//! - [`draw_ground_series`] `(root, report, units, scale)`: the daily air and surface
//!   temperatures with the heat flux into the ground on a right-hand axis, and the two
//!   freezing indices (quantity `degree_days`) in the upper left corner.
//!
//! Each has an `_svg` form for the CLI and the tests (`--winter-svg`; `--profile-svg`, its
//! day from `--profile-day`, by default the day of the deepest frost; `--series-svg`). No
//! input makes them fail: empty, one-day, NaN and infinite reports draw (with a caption
//! saying no profile was kept when there is none), a single point is drawn as a dot, and
//! `day` may be any number.

use super::frame::{
    chart_scale, day_label, depth_decimals, draw_legend, err, finite_runs, line, padded_range,
    svg_document, tick, tick_decimals, ChartError, AIR_LINE, BAND, FLUX_LINE, INK, PROFILE, ZERO,
};
use crate::document::winter::{WinterDay, WinterReport};
use crate::physics::units::{quantity, UnitSystem};
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

/// Draw frost and thaw depth against time for a winter run: the frozen ground shaded
/// between the thaw front and the frost front, the deepest frost marked. `scale` as in
/// [`super::profile::draw_profile`].
pub fn draw_frost_depth<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    w: &crate::document::winter::WinterReport,
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
    let spells = |depth: &dyn Fn(&crate::document::winter::WinterDay) -> f64| {
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
            if w.frost_at_bottom {
                format!(
                    "at least {:.2} {} (the bottom of the modelled ground)",
                    -my,
                    zq.unit(sys).symbol
                )
            } else {
                format!(
                    "deepest {:.2} {} on day {:.0}",
                    -my,
                    zq.unit(sys).symbol,
                    mx
                )
            },
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
    w: &crate::document::winter::WinterReport,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| draw_frost_depth(root, w, sys, 1.0))
}

/// Snow above the ground surface (the same shade as a snow layer).
const SNOW: RGBColor = RGBColor(226, 238, 250);

/// The two shades the layers of a winter run alternate between (the report carries no
/// material family).
const GROUND_FILLS: [RGBColor; 2] = [RGBColor(242, 236, 224), RGBColor(230, 222, 206)];
/// The ground a run added below the layers given: paler than any layer's band.
const ADDED_GROUND: RGBColor = RGBColor(248, 246, 241);

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

/// Draw the ground temperature against depth on one day of a winter run (the profile kept
/// nearest to `day`): the layers as shaded bands with their names, the coldest and warmest
/// each depth reached over the whole run behind the profile, the 0 °C line, that day's
/// frost depth (and thaw depth, when the ground has thawed from the surface over frozen
/// ground), and that day's snow as a band above the ground surface. Both axes are fixed for
/// the whole run, so the chart holds still while the day changes. `scale` as in
/// [`super::profile::draw_profile`].
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

    // Depth: the layers given and as much of the ground added below them as the frost
    // needs (all of it when frost reached the bottom), and above it the deepest snow.
    let given_m = w
        .layer_faces_m
        .iter()
        .copied()
        .filter(|v| v.is_finite())
        .fold(0.0, f64::max);
    let modelled_m = w
        .envelope
        .iter()
        .map(|e| e[0])
        .filter(|v| v.is_finite())
        .fold(w.modelled_depth_m.max(given_m), f64::max);
    let bottom_m = if modelled_m > given_m + 1e-9 && !w.frost_at_bottom {
        let frost = w.max_frost_depth_m.max(0.0);
        modelled_m.min((1.25 * given_m).max(1.25 * frost))
    } else {
        modelled_m
    };
    let shown = |depth_m: f64| depth_m <= bottom_m + 1e-9;
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

    // The ground added below the layers given: a paler band, named.
    if modelled_m > given_m + 1e-9 && given_m > 0.0 {
        let zt = z(given_m);
        chart
            .draw_series(std::iter::once(Rectangle::new(
                [(x0, -zt), (x1, -bottom)],
                ADDED_GROUND.filled(),
            )))
            .map_err(err)?;
        chart
            .draw_series(DashedLineSeries::new(
                vec![(x0, -zt), (x1, -zt)],
                px(5.0),
                px(4.0),
                RGBColor(120, 120, 120).stroke_width(px(1.0)),
            ))
            .map_err(err)?;
        let name: String = w
            .layer_names
            .last()
            .map_or("", |n| n.trim())
            .chars()
            .take(24)
            .collect();
        chart
            .draw_series(std::iter::once(Text::new(
                format!(
                    "{} continued to {:.*} {} (added)",
                    if name.is_empty() { "last layer" } else { &name },
                    decimals,
                    z(modelled_m),
                    zq.unit(sys).symbol
                ),
                (x1 - 0.015 * (x1 - x0), -zt - 0.012 * height),
                font(12.0)
                    .color(&RGBColor(90, 96, 104))
                    .pos(Pos::new(HPos::Right, VPos::Top)),
            )))
            .map_err(err)?;
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
        .filter(|e| e.iter().all(|v| v.is_finite()) && shown(e[0]))
        .map(|e| (t(e[1]), -z(e[0])))
        .collect();
    if lows.len() >= 2 {
        let mut poly = lows;
        poly.extend(
            w.envelope
                .iter()
                .filter(|e| e.iter().all(|v| v.is_finite()) && shown(e[0]))
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
            .filter(|(e, _)| shown(e[0]))
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
/// freezing indices in the upper left corner. `scale` as in
/// [`super::profile::draw_profile`].
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
