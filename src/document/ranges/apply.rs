//! An input's value into a scenario, and back out.
//!
//! [`apply`] sets every field of the input's kind in the scenario: the stack's layers, the
//! edge's soil, slab and boards, the shelter's snow, a snow season's settled density (the
//! fresh one keeping its ratio to it), daily records' snow densities (scaled to the value
//! as their mean), and the climate's freezing index (a design winter's directly; any other
//! climate by a shift of its air temperature found by bisection); with `layer`, that layer
//! of the stack only. The plan refuses an input that would change nothing, at
//! `ranges.inputs[i].what` (or `.layer`). [`base_value`] reads the scenario's own value,
//! from the first field `apply` would set.

use super::{RangeResult, RangedWhat};
use crate::document::scenario::Scenario;
use crate::document::vocabulary::{LayerDoc, MaterialDoc};
use crate::document::weather::{ClimateDoc, SurfaceDoc};
use crate::physics::materials::SnowRegression;

fn soil_fields(m: &mut MaterialDoc) -> Option<(&mut f64, &mut f64)> {
    match m {
        MaterialDoc::Soil {
            water_content_pct,
            conductivity_factor,
            ..
        } => Some((water_content_pct, conductivity_factor)),
        _ => None,
    }
}

/// The one field of `what` in a material, if it has it.
fn material_field(m: &mut MaterialDoc, what: RangedWhat) -> Option<&mut f64> {
    match (what, m) {
        (RangedWhat::SnowDensity, MaterialDoc::Snow { density_kg_m3, .. }) => Some(density_kg_m3),
        (RangedWhat::WaterContent, m) => soil_fields(m).map(|f| f.0),
        (RangedWhat::SoilConductivityFactor, m) => soil_fields(m).map(|f| f.1),
        (
            RangedWhat::InsulationDerating,
            MaterialDoc::Insulation {
                moisture_derating_pct,
                ..
            },
        ) => Some(moisture_derating_pct),
        _ => None,
    }
}

/// Daily mean air temperatures of a climate's first year (or of every record), °C.
fn climate_days(c: &ClimateDoc) -> Vec<f64> {
    match c {
        ClimateDoc::Sinusoid {
            mean_c,
            amplitude_k,
            coldest_day_of_year,
            ..
        } => (0..365)
            .map(|d| {
                // The mean over day d (t from d to d + 1 days) of the climate's
                // T = mean − A cos(2π(t − t_c)/365), coldest at noon of its day of the
                // year, t_c = day − ½ ([`crate::physics::climate::Climate::air_temperature_c`]).
                let w = 2.0 * std::f64::consts::PI / crate::physics::climate::DAYS_PER_YEAR;
                let a = w * (d as f64 - (f64::from(*coldest_day_of_year) - 0.5));
                mean_c - amplitude_k * ((a + w).sin() - a.sin()) / w
            })
            .collect(),
        ClimateDoc::DesignWinter { .. } => Vec::new(),
        ClimateDoc::Daily { days } => days.iter().map(|d| d.mean_air_c).collect(),
    }
}

/// The air freezing index of a climate, °C·days (the largest fall of the cumulative
/// degree-day curve, [`crate::physics::climate::freezing_index_c_days`]).
pub fn climate_freezing_index(c: &ClimateDoc) -> f64 {
    match c {
        ClimateDoc::DesignWinter {
            freezing_index_c_days,
            ..
        } => *freezing_index_c_days,
        other => crate::physics::climate::freezing_index_c_days(&climate_days(other)),
    }
}

/// Shift a climate's air temperatures (or set a design winter's index) so its freezing
/// index is `fi`. The index falls as the air warms, so the shift is found by bisection
/// over ±80 K to 1e-9 K. Errs when no shift in that span reaches it.
fn set_freezing_index(c: &mut ClimateDoc, fi: f64) -> Result<(), String> {
    if let ClimateDoc::DesignWinter {
        freezing_index_c_days,
        ..
    } = c
    {
        *freezing_index_c_days = fi;
        return Ok(());
    }
    let days = climate_days(c);
    let fi_at = |dt: f64| {
        let shifted: Vec<f64> = days.iter().map(|t| t + dt).collect();
        crate::physics::climate::freezing_index_c_days(&shifted)
    };
    let (mut warm, mut cold) = (80.0_f64, -80.0_f64);
    if fi_at(cold) < fi || fi_at(warm) > fi {
        return Err(format!(
            "no shift of the air temperatures within ±80 K gives a freezing index of {fi:.0} °C·days"
        ));
    }
    for _ in 0..200 {
        let mid = 0.5 * (warm + cold);
        if fi_at(mid) > fi {
            cold = mid;
        } else {
            warm = mid;
        }
        if warm - cold < 1e-9 {
            break;
        }
    }
    let dt = 0.5 * (warm + cold);
    match c {
        ClimateDoc::Sinusoid { mean_c, .. } => *mean_c += dt,
        ClimateDoc::Daily { days } => days.iter_mut().for_each(|d| d.mean_air_c += dt),
        ClimateDoc::DesignWinter { .. } => {}
    }
    Ok(())
}

/// Set the snow density of a climate's snow; returns whether it had any.
fn set_climate_snow_density(c: &mut ClimateDoc, rho: f64) -> bool {
    match c {
        ClimateDoc::Sinusoid { snow: Some(s), .. }
        | ClimateDoc::DesignWinter { snow: Some(s), .. } => {
            let ratio = s.fresh_density_kg_m3 / s.settled_density_kg_m3;
            s.settled_density_kg_m3 = rho;
            s.fresh_density_kg_m3 = rho * ratio;
            true
        }
        ClimateDoc::Daily { days } => {
            let given: Vec<f64> = days.iter().filter_map(|d| d.snow_density_kg_m3).collect();
            if given.is_empty() {
                return false;
            }
            let mean = given.iter().sum::<f64>() / given.len() as f64;
            for d in days.iter_mut() {
                if let Some(r) = d.snow_density_kg_m3.as_mut() {
                    *r *= rho / mean;
                }
            }
            true
        }
        _ => false,
    }
}

fn climate_snow_density(c: &ClimateDoc) -> Option<f64> {
    match c {
        ClimateDoc::Sinusoid { snow: Some(s), .. }
        | ClimateDoc::DesignWinter { snow: Some(s), .. } => Some(s.settled_density_kg_m3),
        ClimateDoc::Daily { days } => {
            let given: Vec<f64> = days.iter().filter_map(|d| d.snow_density_kg_m3).collect();
            (!given.is_empty()).then(|| given.iter().sum::<f64>() / given.len() as f64)
        }
        _ => None,
    }
}

/// Set `what` to `value` in the scenario (see [`RangedWhat`]); returns how many fields
/// changed, or why it could not.
pub fn apply(
    s: &mut Scenario,
    what: RangedWhat,
    layer: Option<usize>,
    value: f64,
) -> Result<usize, String> {
    let mut n = 0;
    let mut set_layers = |layers: &mut [LayerDoc], only: Option<usize>| {
        for (i, l) in layers.iter_mut().enumerate() {
            if only.is_some_and(|k| k != i) {
                continue;
            }
            if let Some(f) = material_field(&mut l.material, what) {
                *f = value;
                n += 1;
            }
        }
    };
    set_layers(&mut s.layers, layer);
    if layer.is_some() {
        return Ok(n);
    }
    if let Some(e) = s.edge.as_mut() {
        set_layers(&mut e.soil, None);
        for m in [
            Some(&mut e.slab.material),
            e.wing.as_mut().map(|w| &mut w.material),
            e.wall_board.as_mut().map(|w| &mut w.material),
        ]
        .into_iter()
        .flatten()
        {
            if let Some(f) = material_field(m, what) {
                *f = value;
                n += 1;
            }
        }
    }
    match what {
        RangedWhat::SnowDensity => {
            if let Some(sh) = s.shelter.as_mut() {
                sh.snow_density_kg_m3 = value;
                n += 1;
            }
            if let Some(w) = s.winter.as_mut() {
                n += usize::from(set_climate_snow_density(&mut w.climate, value));
            }
            if let Some(e) = s.edge.as_mut() {
                n += usize::from(set_climate_snow_density(&mut e.climate, value));
            }
        }
        RangedWhat::FreezingIndex => {
            if let Some(w) = s.winter.as_mut() {
                set_freezing_index(&mut w.climate, value)?;
                n += 1;
            }
            if let Some(e) = s.edge.as_mut() {
                set_freezing_index(&mut e.climate, value)?;
                n += 1;
            }
        }
        _ => {}
    }
    Ok(n)
}

/// The scenario's own value of `what` (the first field [`apply`] would change).
pub fn base_value(s: &Scenario, what: RangedWhat, layer: Option<usize>) -> Option<f64> {
    let mut t = s.clone();
    let from_layers = |layers: &mut [LayerDoc], only: Option<usize>| {
        layers.iter_mut().enumerate().find_map(|(i, l)| {
            if only.is_some_and(|k| k != i) {
                return None;
            }
            material_field(&mut l.material, what).map(|f| *f)
        })
    };
    if let Some(v) = from_layers(&mut t.layers, layer) {
        return Some(v);
    }
    if layer.is_some() {
        return None;
    }
    if let Some(e) = t.edge.as_mut() {
        if let Some(v) = from_layers(&mut e.soil, None) {
            return Some(v);
        }
        for m in [
            Some(&mut e.slab.material),
            e.wing.as_mut().map(|w| &mut w.material),
            e.wall_board.as_mut().map(|w| &mut w.material),
        ]
        .into_iter()
        .flatten()
        {
            if let Some(f) = material_field(m, what) {
                return Some(*f);
            }
        }
    }
    let climates = [
        s.winter.as_ref().map(|w| &w.climate),
        s.edge.as_ref().map(|e| &e.climate),
    ];
    match what {
        RangedWhat::SnowDensity => {
            s.shelter
                .as_ref()
                .map(|sh| sh.snow_density_kg_m3)
                .or_else(|| {
                    climates
                        .iter()
                        .flatten()
                        .find_map(|c| climate_snow_density(c))
                })
        }
        RangedWhat::FreezingIndex => climates
            .iter()
            .flatten()
            .next()
            .map(|c| climate_freezing_index(c)),
        _ => None,
    }
}

fn climate_has_snow(c: &ClimateDoc, surface: &SurfaceDoc) -> bool {
    matches!(surface, SurfaceDoc::Film { .. })
        && match c {
            ClimateDoc::Sinusoid { snow: Some(s), .. }
            | ClimateDoc::DesignWinter { snow: Some(s), .. } => s.peak_depth_m > 0.0,
            ClimateDoc::Daily { days } => days.iter().any(|d| d.snow_depth_m.unwrap_or(0.0) > 0.0),
            _ => false,
        }
}

/// Whether the part of the scenario a result comes from has snow whose conductivity comes
/// from a regression (else the spread across regressions says nothing and is left out).
pub fn result_has_snow(s: &Scenario, r: RangeResult) -> bool {
    let layer_snow = s
        .layers
        .iter()
        .any(|l| matches!(l.material, MaterialDoc::Snow { .. }));
    match r {
        RangeResult::RValue => layer_snow,
        RangeResult::FrostDepth => {
            layer_snow
                || s.winter
                    .as_ref()
                    .is_some_and(|w| climate_has_snow(&w.climate, &w.surface))
        }
        RangeResult::FrostBelowFooting => s
            .edge
            .as_ref()
            .is_some_and(|e| climate_has_snow(&e.climate, &e.outside)),
        RangeResult::ShelterInterior | RangeResult::ShelterMelt => s.shelter.is_some(),
    }
}

/// Every snow regression in the scenario set to `c`.
pub fn set_regression(s: &mut Scenario, c: SnowRegression) {
    let doc = c.into();
    for l in s.layers.iter_mut() {
        if let MaterialDoc::Snow { regression, .. } = &mut l.material {
            *regression = doc;
        }
    }
    if let Some(sh) = s.shelter.as_mut() {
        sh.snow_regression = doc;
    }
    if let Some(SurfaceDoc::Film {
        snow_regression, ..
    }) = s.winter.as_mut().map(|w| &mut w.surface)
    {
        *snow_regression = doc;
    }
    if let Some(SurfaceDoc::Film {
        snow_regression, ..
    }) = s.edge.as_mut().map(|e| &mut e.outside)
    {
        *snow_regression = doc;
    }
}
