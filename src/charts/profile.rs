//! The steady temperature profile: temperature against depth through the layers.

use super::frame::{
    chart_scale, draw_legend, err, svg_document, ChartError, BAND, INK, PROFILE, ZERO,
};
use crate::document::steady::Steady;
use crate::physics::materials::Family;
use crate::physics::units::{quantity, UnitSystem};
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

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

/// Draw temperature against depth: layers shaded, the profile, the band across snow
/// regressions, the 0 °C line and each 0 °C plane. `scale` multiplies font sizes and line
/// widths (the page passes its device pixel ratio).
pub fn draw_profile<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    c: &Steady,
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
    c: &Steady,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| draw_profile(root, c, sys, 1.0))
}
