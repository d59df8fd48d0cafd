//! Every section of a scenario run over the core, and the report the CLI prints.
//!
//! - [`compute_with_winter`]: the steady solve and the winter run, with its least-thickness
//!   search when the section asks for one.
//! - [`compute_all`]: that, plus the shelter and the building edge (with its `edge.least`
//!   search when asked). The errors of the stack, the winter, the shelter and the edge come
//!   together, so every one is named at once.
//! - [`report`] makes the [`Report`] (SI) of what was computed. The ranges section is left
//!   aside here: the CLI runs it afterwards (`ranges::plan::run_ranges`) into
//!   `Report::ranges`, and the page runs it only when asked.

use super::scenario::{Scenario, FORMAT_VERSION};
use super::steady::{
    compute, BandDoc, BandMemberDoc, FaceDoc, LayerReport, PropertiesDoc, Steady, ZeroPlaneDoc,
};
use super::vocabulary::ErrorDoc;
use crate::physics::error::InputErrors;
use crate::physics::steady;
use serde::Serialize;

/// The report of one steady run (SI).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Report {
    pub tool: &'static str,
    pub tool_version: &'static str,
    pub format_version: u32,
    pub title: String,
    pub r_total_m2k_w: f64,
    pub r_layers_m2k_w: f64,
    /// The same two R-values in US units, ft²·°F·h/Btu.
    pub r_total_ft2_f_h_btu: f64,
    pub r_layers_ft2_f_h_btu: f64,
    pub u_w_m2k: f64,
    pub heat_flux_w_m2: f64,
    pub top: FaceDoc,
    pub bottom: FaceDoc,
    pub layers: Vec<LayerReport>,
    pub zero_planes: Vec<ZeroPlaneDoc>,
    pub profile: Vec<[f64; 2]>,
    pub band: Option<BandDoc>,
    /// The winter run, when the scenario has one and it was asked for.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub winter: Option<crate::document::winter::WinterReport>,
    /// The shelter, when the scenario has one and it was asked for.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub shelter: Option<crate::document::shelter::ShelterReport>,
    /// The building edge, when the scenario has one and it was asked for.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub edge: Option<crate::document::edge::EdgeReport>,
    /// The ranges study, when the scenario has one and it was asked for (the CLI runs it;
    /// [`report`] leaves it empty).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub ranges: Option<crate::document::ranges::report::RangesReport>,
    pub warnings: Vec<ErrorDoc>,
}

/// The results a report and the charts are made from: the steady solve and the sections'
/// reports.
#[derive(Debug, Clone, PartialEq)]
pub struct Computed {
    pub steady: Steady,
    /// Filled by [`compute_with_winter`] and [`compute_all`] only.
    pub winter: Option<crate::document::winter::WinterReport>,
    /// Filled by [`compute_all`] only.
    pub shelter: Option<crate::document::shelter::ShelterReport>,
    /// Filled by [`compute_all`] only.
    pub edge: Option<crate::document::edge::EdgeReport>,
}

impl From<Steady> for Computed {
    /// The steady solve alone, no section run.
    fn from(steady: Steady) -> Self {
        Computed {
            steady,
            winter: None,
            shelter: None,
            edge: None,
        }
    }
}

/// The steady solve ([`compute`]), plus the winter run when the scenario has a winter
/// section.
pub fn compute_with_winter(s: &Scenario) -> Result<Computed, InputErrors> {
    let mut c = Computed::from(compute(s)?);
    if let Some(w) = &s.winter {
        let mut report = crate::document::winter::run_winter(w, &c.steady.result.stack, &s.layers)?;
        if w.least_thickness.is_some() {
            report.least_thickness = Some(crate::document::winter_least::run_least_thickness(
                w,
                &c.steady.result.stack,
                &s.layers,
            )?);
        }
        c.winter = Some(report);
    }
    Ok(c)
}

/// [`compute_with_winter`], plus the shelter and the building edge when the scenario has
/// those sections. The errors of the stack, the shelter and the edge come together, so
/// every one is named at once.
pub fn compute_all(s: &Scenario) -> Result<Computed, InputErrors> {
    let shelter = s
        .shelter
        .as_ref()
        .map(crate::document::shelter::run_shelter)
        .transpose();
    let edge = s
        .edge
        .as_ref()
        .map(|d| -> Result<_, InputErrors> {
            let mut r = crate::document::edge::run_edge_scenario(d)?;
            if d.least.is_some() {
                r.least = Some(crate::document::edge_least::run_edge_least(d)?);
            }
            Ok(r)
        })
        .transpose();
    let mut errs = InputErrors::default();
    let c = compute_with_winter(s).map_err(|e| errs.0.extend(e.0)).ok();
    let sh = shelter.map_err(|e| errs.0.extend(e.0)).ok();
    let ed = edge.map_err(|e| errs.0.extend(e.0)).ok();
    match (c, sh, ed) {
        (Some(mut c), Some(sh), Some(ed)) if errs.is_empty() => {
            c.shelter = sh;
            c.edge = ed;
            Ok(c)
        }
        _ => Err(errs),
    }
}

/// Build the report of a computed scenario.
pub fn report(s: &Scenario, c: &Computed) -> Report {
    let r = &c.steady.result;
    let face = |f: &steady::FaceResult| FaceDoc {
        air_c: f.air_c,
        surface_c: f.surface_c,
        film_r_m2k_w: f.film_r_m2k_w,
    };
    let layers = r
        .layers
        .iter()
        .zip(&r.stack.layers)
        .zip(&r.stack.materials)
        .map(|((lr, l), m)| LayerReport {
            name: l.name.clone(),
            material: m.label.clone(),
            thickness_m: l.thickness_m,
            top_depth_m: lr.top_depth_m,
            bottom_depth_m: lr.bottom_depth_m,
            top_c: lr.top_c,
            bottom_c: lr.bottom_c,
            r_m2k_w: lr.r_m2k_w,
            conductivity_w_m_k: lr.k_eff_w_m_k,
            state: lr.state.label(),
            properties: PropertiesDoc {
                k_frozen_w_m_k: m.conductivity.frozen.k(-5.0),
                k_unfrozen_w_m_k: m.conductivity.unfrozen.k(5.0),
                density_kg_m3: m.density_kg_m3,
                c_frozen_j_m3k: m.c_frozen_j_m3k,
                c_unfrozen_j_m3k: m.c_unfrozen_j_m3k,
                latent_j_m3: m.latent_j_m3,
            },
        })
        .collect();
    let band = c.steady.band.as_ref().map(|b| {
        let (r_min, r_max) = b.r_total_range();
        let (q_min, q_max) = b.flux_range();
        let z = b.zero_depth_range();
        BandDoc {
            r_min_m2k_w: r_min,
            r_max_m2k_w: r_max,
            flux_min_w_m2: q_min,
            flux_max_w_m2: q_max,
            zero_depth_min_m: z.map(|z| z.0),
            zero_depth_max_m: z.map(|z| z.1),
            by_regression: b
                .members
                .iter()
                .map(|m| BandMemberDoc {
                    id: m.regression.id(),
                    name: m.regression.name(),
                    r_total_m2k_w: m.result.r_total_m2k_w,
                    heat_flux_w_m2: m.result.heat_flux_w_m2,
                    zero_planes_m: m.result.zero_planes.iter().map(|p| p.depth_m).collect(),
                })
                .collect(),
            skipped: b
                .skipped
                .iter()
                .map(|(c, why)| ErrorDoc::plain(c.id(), why.clone()))
                .collect(),
            envelope: b
                .depths_m
                .iter()
                .zip(b.min_c.iter().zip(&b.max_c))
                .map(|(&z, (&lo, &hi))| [z, lo, hi])
                .collect(),
        }
    });
    Report {
        tool: "hibernal",
        tool_version: env!("CARGO_PKG_VERSION"),
        format_version: FORMAT_VERSION,
        title: s.title.clone(),
        r_total_m2k_w: r.r_total_m2k_w,
        r_layers_m2k_w: r.r_layers_m2k_w,
        r_total_ft2_f_h_btu: r.r_total_m2k_w * crate::physics::units::R_US_PER_R_SI,
        r_layers_ft2_f_h_btu: r.r_layers_m2k_w * crate::physics::units::R_US_PER_R_SI,
        u_w_m2k: r.u_w_m2k,
        heat_flux_w_m2: r.heat_flux_w_m2,
        top: face(&r.top),
        bottom: face(&r.bottom),
        layers,
        zero_planes: r
            .zero_planes
            .iter()
            .map(|p| ZeroPlaneDoc {
                depth_m: p.depth_m,
                layer: p.layer,
                frozen_side: if p.frozen_above { "above" } else { "below" },
            })
            .collect(),
        profile: r
            .profile_at(&c.steady.depths_m)
            .into_iter()
            .map(|(z, t)| [z, t])
            .collect(),
        band,
        winter: c.winter.clone(),
        shelter: c.shelter.clone(),
        edge: c.edge.clone(),
        ranges: None,
        warnings: r.warnings.iter().map(ErrorDoc::from).collect(),
    }
}
