//! A snow shelter's charts: the first night hour by hour, and the air inside against wall
//! thickness, people and outside temperature.

use super::frame::{
    chart_scale, draw_legend, err, finite_runs, line, padded_range, reference_line, svg_document,
    tick, tick_decimals, ChartError, AIR_LINE, FLUX_LINE, INK, PROFILE, ZERO,
};
use crate::document::shelter::{SeriesDoc, ShelterReport};
use crate::physics::units::{quantity, UnitSystem};
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

const TARGET: RGBColor = RGBColor(30, 130, 70);

const SURFACE_LINE: RGBColor = RGBColor(150, 90, 170);

/// Draw the first night in a shelter: the air inside, the inner surface of the main wall
/// and the warmest snow surface against the hours, with the 0 °C melt limit, the target and
/// the steady interior temperature marked, and the warm-up time if the air gets there.
/// `scale` as in [`super::profile::draw_profile`]. No report makes it fail: an empty night
/// draws axes and a note.
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
    type Pick = fn(&crate::document::shelter::NightPointDoc) -> f64;
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
/// target.
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
        .filter(|p| p.melt_kg_h > 0.0 && p.interior_c.is_finite())
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
