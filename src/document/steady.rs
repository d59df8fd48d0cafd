//! The steady part of a scenario: [`compute`] solves the stack and, when it holds snow, the
//! band across the snow regressions ([`Steady`], beside the sections' results in
//! [`crate::document::compute::Computed`]); the report's pieces (faces, layers with their
//! properties, 0 °C planes, the band, whose members keep their published key
//! `by_correlation`); and [`profile_csv`], the points the profile chart draws with the
//! band, in either unit system (the page's CSV of the profile; the CLI does not write it).

use super::scenario::Scenario;
use super::vocabulary::ErrorDoc;
use crate::physics::error::{InputError, InputErrorKind, InputErrors};
use crate::physics::steady::{self, SnowBand, SteadyResult};
use serde::Serialize;

/// Points per layer in the reported profile.
pub const PROFILE_POINTS_PER_LAYER: usize = 24;

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FaceDoc {
    pub air_c: Option<f64>,
    pub surface_c: f64,
    pub film_r_m2k_w: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PropertiesDoc {
    pub k_frozen_w_m_k: f64,
    pub k_unfrozen_w_m_k: f64,
    pub density_kg_m3: f64,
    pub c_frozen_j_m3k: f64,
    pub c_unfrozen_j_m3k: f64,
    pub latent_j_m3: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LayerReport {
    pub name: String,
    pub material: String,
    pub thickness_m: f64,
    pub top_depth_m: f64,
    pub bottom_depth_m: f64,
    pub top_c: f64,
    pub bottom_c: f64,
    pub r_m2k_w: f64,
    pub conductivity_w_m_k: f64,
    pub state: &'static str,
    pub properties: PropertiesDoc,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ZeroPlaneDoc {
    pub depth_m: f64,
    pub layer: usize,
    pub frozen_side: &'static str,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BandMemberDoc {
    pub id: &'static str,
    pub name: &'static str,
    pub r_total_m2k_w: f64,
    pub heat_flux_w_m2: f64,
    pub zero_planes_m: Vec<f64>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BandDoc {
    pub r_min_m2k_w: f64,
    pub r_max_m2k_w: f64,
    pub flux_min_w_m2: f64,
    pub flux_max_w_m2: f64,
    pub zero_depth_min_m: Option<f64>,
    pub zero_depth_max_m: Option<f64>,
    #[serde(rename = "by_correlation")]
    pub by_regression: Vec<BandMemberDoc>,
    pub skipped: Vec<ErrorDoc>,
    /// (depth m, lowest °C, highest °C).
    pub envelope: Vec<[f64; 3]>,
}

/// The steady solve of a scenario's stack: what its report and its chart are made from.
#[derive(Debug, Clone, PartialEq)]
pub struct Steady {
    pub result: SteadyResult,
    /// The same stack with every snow regression, when it has snow.
    pub band: Option<SnowBand>,
    /// The depths the profile is reported at.
    pub depths_m: Vec<f64>,
}

/// Solve a scenario: the steady result and the band across snow regressions.
pub fn compute(s: &Scenario) -> Result<Steady, InputErrors> {
    let stack = s.stack();
    let result = steady::solve(&stack).map_err(|e| match e {
        steady::SolveError::Input(errs) => errs,
        other => InputError::new("", InputErrorKind::NotCovered(other.to_string())).into(),
    })?;
    let depths_m = result.profile_depths(PROFILE_POINTS_PER_LAYER);
    let band = steady::snow_band(&stack, &depths_m);
    Ok(Steady {
        result,
        band,
        depths_m,
    })
}

/// The steady temperature profile as CSV (the points the profile chart draws): depth below
/// the top face and temperature, with the band across snow regressions (lowest, highest)
/// where the stack has snow; units in the header, in the system chosen.
pub fn profile_csv(c: &Steady, sys: crate::physics::units::UnitSystem) -> String {
    use crate::physics::units::quantity;
    let (Some(tq), Some(zq)) = (quantity("temperature"), quantity("depth")) else {
        return String::new();
    };
    let (tu, zu) = (tq.unit(sys).symbol, zq.unit(sys).symbol);
    let band = c
        .band
        .as_ref()
        .filter(|b| b.depths_m.len() == c.depths_m.len());
    let mut out = format!("depth [{zu}],temperature [{tu}]");
    if band.is_some() {
        out.push_str(&format!(
            ",lowest across snow regressions [{tu}],highest across snow regressions [{tu}]"
        ));
    }
    out.push('\n');
    for (i, &z) in c.depths_m.iter().enumerate() {
        out.push_str(&format!(
            "{:.4},{:.3}",
            zq.show(sys, z),
            tq.show(sys, c.result.temperature_at(z))
        ));
        if let Some(b) = band {
            out.push_str(&format!(
                ",{:.3},{:.3}",
                tq.show(sys, b.min_c[i]),
                tq.show(sys, b.max_c[i])
            ));
        }
        out.push('\n');
    }
    out
}
