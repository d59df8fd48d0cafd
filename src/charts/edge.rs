//! A building edge's charts: the temperature in the cross-section on a kept day (over
//! [`super::field`]), and frost below the footing, far-field frost and slab heat loss through
//! the winter.

use super::field::{Outline, OutlineKind};
use super::frame::{
    chart_scale, day_label, draw_legend, err, finite_runs, line, padded_range, svg_document, tick,
    tick_decimals, ChartError, FLUX_LINE, INK, PROFILE, ZERO,
};
use crate::document::edge::EdgeReport;
use crate::physics::units::{quantity, UnitSystem};
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

/// The slab, wall and boards of an edge report as the field map draws them.
pub fn outlines_of(r: &EdgeReport) -> Vec<Outline> {
    r.outlines
        .iter()
        .map(|o| Outline {
            x0_m: o.x0_m,
            x1_m: o.x1_m,
            z0_m: o.z0_m,
            z1_m: o.z1_m,
            kind: match o.part {
                "wall-board" | "wing" => OutlineKind::Insulation,
                "slab" | "wall" => OutlineKind::Concrete,
                _ => OutlineKind::Other,
            },
            label: o.part.replace('-', " "),
        })
        .collect()
}

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
    let outlines = outlines_of(r);
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
            let map = super::field::FieldMap {
                x_faces_m: &r.x_faces_m,
                z_faces_m: &r.z_faces_m,
                temperature_c: &f.temperature_c,
                outlines: &outlines,
                caption: &caption,
            };
            super::field::draw_field_map(root, &map, sys, scale)
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
    let q = |si: f64| crate::document::edge::linear_heat_shown(sys, si);
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
            crate::document::edge::linear_heat_symbol(sys)
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
    type Pick = fn(&crate::document::edge::EdgeDay, f64) -> f64;
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
