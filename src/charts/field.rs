//! A cross-section's temperature field as a colour map, with the 0 °C line and the outlines
//! of what is built in it (slab, footing, boards), written once against plotters' generic
//! backend like the other charts. The field is plain data ([`FieldMap`]), so any
//! 2D solver can hand it over.

use plotters::coord::Shift;
use plotters::prelude::*;

use super::frame::{chart_scale, err, svg_document, ChartError};
use crate::physics::units::{quantity, UnitSystem};

/// What an outline is, for its stroke and fill.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum OutlineKind {
    Insulation,
    Concrete,
    Other,
}

/// A rectangle drawn over the field, m (x across, z depth below grade, positive down).
#[derive(Debug, Clone, PartialEq)]
pub struct Outline {
    pub x0_m: f64,
    pub x1_m: f64,
    pub z0_m: f64,
    pub z1_m: f64,
    pub kind: OutlineKind,
    pub label: String,
}

/// A temperature field on a rectangular grid of cells.
#[derive(Debug, Clone, PartialEq)]
pub struct FieldMap<'a> {
    /// Cell faces across, m (nx + 1, increasing).
    pub x_faces_m: &'a [f64],
    /// Cell faces down, m below grade (nz + 1, increasing; negative above grade).
    pub z_faces_m: &'a [f64],
    /// °C per cell, row by row from the top (nz rows of nx).
    pub temperature_c: &'a [f64],
    pub outlines: &'a [Outline],
    pub caption: &'a str,
}

impl FieldMap<'_> {
    fn dims(&self) -> Result<(usize, usize), ChartError> {
        let nx = self.x_faces_m.len().saturating_sub(1);
        let nz = self.z_faces_m.len().saturating_sub(1);
        if nx == 0 || nz == 0 || self.temperature_c.len() != nx * nz {
            return Err(ChartError(format!(
                "field of {} values on {nx} × {nz} cells",
                self.temperature_c.len()
            )));
        }
        Ok((nx, nz))
    }
}

/// Colour of a temperature on a diverging scale about 0 °C: white at 0 °C, full blue at
/// −`cold` K and below, full red at +`warm` K and above (each side scaled on its own, so
/// frozen ground a few kelvin below 0 °C reads blue beside a warm slab; a diverging scale, so
/// the freezing point stands out).
pub fn field_colour(t_c: f64, cold: f64, warm: f64) -> RGBColor {
    let span = if t_c < 0.0 { cold } else { warm };
    let s = if span > 0.0 {
        (t_c / span).clamp(-1.0, 1.0)
    } else {
        0.0
    };
    let mix = |a: (f64, f64, f64), b: (f64, f64, f64), w: f64| {
        RGBColor(
            (a.0 + (b.0 - a.0) * w).round() as u8,
            (a.1 + (b.1 - a.1) * w).round() as u8,
            (a.2 + (b.2 - a.2) * w).round() as u8,
        )
    };
    let white = (247.0, 247.0, 247.0);
    if s < 0.0 {
        mix(white, (33.0, 102.0, 172.0), -s)
    } else {
        mix(white, (178.0, 24.0, 43.0), s)
    }
}

/// Segments of the 0 °C line through the cell centres (marching squares on the dual grid:
/// each square of four neighbouring centres is cut where the temperature, taken linear along
/// each edge, crosses 0 °C). Points are (x, z) in m.
pub fn zero_line(f: &FieldMap<'_>) -> Result<Vec<[(f64, f64); 2]>, ChartError> {
    let (nx, nz) = f.dims()?;
    let cx: Vec<f64> = f
        .x_faces_m
        .windows(2)
        .map(|w| 0.5 * (w[0] + w[1]))
        .collect();
    let cz: Vec<f64> = f
        .z_faces_m
        .windows(2)
        .map(|w| 0.5 * (w[0] + w[1]))
        .collect();
    let t = |i: usize, k: usize| f.temperature_c[k * nx + i];
    let mut out = Vec::new();
    for k in 0..nz.saturating_sub(1) {
        for i in 0..nx.saturating_sub(1) {
            // Corners anticlockwise from top-left: (i,k) (i,k+1) (i+1,k+1) (i+1,k).
            let c = [
                (cx[i], cz[k], t(i, k)),
                (cx[i], cz[k + 1], t(i, k + 1)),
                (cx[i + 1], cz[k + 1], t(i + 1, k + 1)),
                (cx[i + 1], cz[k], t(i + 1, k)),
            ];
            let mut pts = Vec::with_capacity(4);
            for e in 0..4 {
                let (a, b) = (c[e], c[(e + 1) % 4]);
                if (a.2 < 0.0) != (b.2 < 0.0) {
                    let w = a.2 / (a.2 - b.2);
                    pts.push((a.0 + w * (b.0 - a.0), a.1 + w * (b.1 - a.1)));
                }
            }
            match pts.len() {
                2 => out.push([pts[0], pts[1]]),
                4 => {
                    // A saddle: pair the crossings by the centre's sign.
                    let centre = 0.25 * (c[0].2 + c[1].2 + c[2].2 + c[3].2);
                    if (centre < 0.0) == (c[0].2 < 0.0) {
                        out.push([pts[0], pts[3]]);
                        out.push([pts[1], pts[2]]);
                    } else {
                        out.push([pts[0], pts[1]]);
                        out.push([pts[2], pts[3]]);
                    }
                }
                _ => {}
            }
        }
    }
    Ok(out)
}

/// Draw the field: cells coloured by temperature, the 0 °C line, the outlines, and a
/// colour bar. `scale` multiplies fonts and lines (the page passes its device pixel ratio).
pub fn draw_field_map<DB: DrawingBackend>(
    root: &DrawingArea<DB, Shift>,
    f: &FieldMap<'_>,
    sys: UnitSystem,
    scale: f64,
) -> Result<(), ChartError> {
    let (nx, nz) = f.dims()?;
    let scale = chart_scale(scale);
    let px = |v: f64| (v * scale).round() as u32;
    let font = |s: f64| ("sans-serif", s * scale).into_font();
    let lq = quantity("depth").ok_or_else(|| ChartError("no depth unit".into()))?;
    let tq = quantity("temperature").ok_or_else(|| ChartError("no temperature unit".into()))?;
    let l = |si: f64| lq.show(sys, si);
    root.fill(&WHITE).map_err(err)?;
    let (w, _) = root.dim_in_pixel();
    let bar_w = px(70.0).min(w / 4);
    let (plot, bar) = root.split_horizontally(w - bar_w);
    let finite: Vec<f64> = f
        .temperature_c
        .iter()
        .copied()
        .filter(|v| v.is_finite())
        .collect();
    // Each side of 0 °C reaches at least 1 K.
    let cold = finite.iter().fold(1.0f64, |m, v| m.max(-v));
    let warm = finite.iter().fold(1.0f64, |m, v| m.max(*v));
    let (x0, x1) = (f.x_faces_m[0], f.x_faces_m[nx]);
    let (z0, z1) = (f.z_faces_m[0], f.z_faces_m[nz]);
    let mut chart = ChartBuilder::on(&plot)
        .margin(px(10.0))
        .caption(f.caption, font(16.0))
        .x_label_area_size(px(40.0))
        .y_label_area_size(px(56.0))
        .build_cartesian_2d(l(x0)..l(x1), -l(z1)..-l(z0))
        .map_err(err)?;
    chart
        .configure_mesh()
        .disable_mesh()
        .x_desc(format!("Across the section ({})", lq.unit(sys).symbol))
        .y_desc(format!("Depth below grade ({})", lq.unit(sys).symbol))
        // + 0.0 turns −0 into 0.
        .y_label_formatter(&|v| format!("{:.1}", -v + 0.0))
        .label_style(font(11.0))
        .axis_desc_style(font(12.0))
        .draw()
        .map_err(err)?;
    let cells = (0..nz).flat_map(|k| (0..nx).map(move |i| (i, k)));
    chart
        .draw_series(cells.map(|(i, k)| {
            let t = f.temperature_c[k * nx + i];
            let colour = if t.is_finite() {
                field_colour(t, cold, warm)
            } else {
                RGBColor(200, 200, 200)
            };
            Rectangle::new(
                [
                    (l(f.x_faces_m[i]), -l(f.z_faces_m[k])),
                    (l(f.x_faces_m[i + 1]), -l(f.z_faces_m[k + 1])),
                ],
                colour.filled(),
            )
        }))
        .map_err(err)?;
    for o in f.outlines {
        let style = match o.kind {
            OutlineKind::Insulation => RGBColor(214, 51, 132).stroke_width(px(2.0)),
            OutlineKind::Concrete => RGBColor(60, 60, 60).stroke_width(px(2.0)),
            OutlineKind::Other => RGBColor(90, 90, 90).stroke_width(px(1.0)),
        };
        chart
            .draw_series(std::iter::once(Rectangle::new(
                [(l(o.x0_m), -l(o.z0_m)), (l(o.x1_m), -l(o.z1_m))],
                style,
            )))
            .map_err(err)?;
    }
    let zero = zero_line(f)?;
    chart
        .draw_series(zero.iter().map(|s| {
            PathElement::new(
                vec![(l(s[0].0), -l(s[0].1)), (l(s[1].0), -l(s[1].1))],
                RGBColor(20, 20, 20).stroke_width(px(2.5)),
            )
        }))
        .map_err(err)?;
    // Colour bar: +warm at the top, 0 in the middle, −cold at the bottom, in the shown
    // temperature unit.
    let (_, bh) = bar.dim_in_pixel();
    let top = px(40.0) as i32;
    let bottom = bh as i32 - px(50.0) as i32;
    let left = px(8.0) as i32;
    let right = left + px(16.0) as i32;
    let steps = 64;
    for s in 0..steps {
        let a = top + (bottom - top) * s / steps;
        let b = top + (bottom - top) * (s + 1) / steps;
        let u = 1.0 - 2.0 * (s as f64 + 0.5) / steps as f64;
        let t = if u >= 0.0 { warm * u } else { cold * u };
        bar.draw(&Rectangle::new(
            [(left, a), (right, b)],
            field_colour(t, cold, warm).filled(),
        ))
        .map_err(err)?;
    }
    for (frac, t) in [(0.0, warm), (0.5, 0.0), (1.0, -cold)] {
        let y = top + ((bottom - top) as f64 * frac) as i32;
        let text = format!("{:.0} {}", tq.show(sys, t), tq.unit(sys).symbol);
        bar.draw(&Text::new(
            text,
            (right + px(4.0) as i32, y - px(6.0) as i32),
            font(11.0),
        ))
        .map_err(err)?;
    }
    for (i, line) in [
        "black line:".to_string(),
        format!("{:.0} {}", tq.show(sys, 0.0), tq.unit(sys).symbol),
    ]
    .into_iter()
    .enumerate()
    {
        bar.draw(&Text::new(
            line,
            (left, bottom + px(14.0 + 12.0 * i as f64) as i32),
            font(10.0),
        ))
        .map_err(err)?;
    }
    Ok(())
}

/// The field as an SVG document.
pub fn field_map_svg(
    f: &FieldMap<'_>,
    sys: UnitSystem,
    width: u32,
    height: u32,
) -> Result<String, ChartError> {
    svg_document(width, height, |root| draw_field_map(root, f, sys, 1.0))
}
