//! What the page offers to choose from, with sources: the snow regressions, soils, boards,
//! surfaces, n-factors, activities, shelter shapes and cautions, the unit table, and the
//! defaults a new section and each of its parts start from (`defaults`, the JSON a scenario
//! holds, from [`crate::document::defaults`]).

use super::shared::to_js;
use crate::document::defaults;
use crate::document::scenario;
use crate::physics::materials::{Board, SnowRegression, SoilModel, Texture};
use crate::physics::stack::SURFACE_PRESETS;
use crate::physics::units::{self, Quantity, UnitSystem, QUANTITIES};
use serde::Serialize;
use std::collections::BTreeMap;
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;

#[derive(Serialize)]
struct RegressionDoc {
    id: &'static str,
    name: &'static str,
    citation: &'static str,
    range_kg_m3: [f64; 2],
}

#[derive(Serialize)]
struct IdName {
    id: &'static str,
    name: &'static str,
}

#[derive(Serialize)]
struct SoilModelInfo {
    id: &'static str,
    name: &'static str,
    citation: &'static str,
    textures: Vec<&'static str>,
}

#[derive(Serialize)]
struct BoardInfo {
    id: &'static str,
    name: &'static str,
    conductivity_w_m_k: f64,
    source: &'static str,
}

#[derive(Serialize)]
struct PresetInfo {
    id: &'static str,
    name: &'static str,
    film_w_m2k: Option<f64>,
    source: &'static str,
}

#[derive(Serialize)]
struct NFactorInfo {
    id: &'static str,
    name: &'static str,
    freezing: f64,
    source: &'static str,
}

#[derive(Serialize)]
struct ActivityInfo {
    id: &'static str,
    name: &'static str,
    met: f64,
    source: &'static str,
}

#[derive(Serialize)]
struct UnitInfo {
    symbol: &'static str,
    factor: f64,
    offset: f64,
    decimals: u8,
    /// How its values are written for people (`units::written`): `decimal`,
    /// `inch-fractions`, `feet-inches`.
    written: &'static str,
}

#[derive(Serialize)]
struct QuantityInfo {
    si: UnitInfo,
    us: UnitInfo,
}

#[derive(Serialize)]
struct Catalogue {
    version: &'static str,
    format_version: u32,
    #[serde(rename = "snow_correlations")]
    snow_regressions: Vec<RegressionDoc>,
    soil_textures: Vec<IdName>,
    soil_models: Vec<SoilModelInfo>,
    boards: Vec<BoardInfo>,
    surface_presets: Vec<PresetInfo>,
    material_kinds: Vec<IdName>,
    n_factor_presets: Vec<NFactorInfo>,
    /// Kinds of starting state a winter run accepts.
    initial_kinds: Vec<&'static str>,
    /// Shelter shapes (ids as the scenario names them) with plain names.
    shelter_shapes: Vec<IdName>,
    /// What people in a shelter do, with the metabolic rate and its source.
    activities: Vec<ActivityInfo>,
    /// The shelter cautions, always shown, with their sources.
    cautions: Vec<crate::document::shelter::CautionDoc>,
    units: BTreeMap<&'static str, QuantityInfo>,
    /// The defaults a new section and each of its parts start from.
    defaults: Defaults,
}

/// The parts of each kind `make` gives, keyed by kind.
fn by_kind<T: Serialize>(
    kinds: &[&'static str],
    make: impl Fn(&str) -> Option<T>,
) -> BTreeMap<&'static str, T> {
    kinds
        .iter()
        .filter_map(|k| make(k).map(|v| (*k, v)))
        .collect()
}

#[derive(Serialize)]
struct Defaults {
    materials: BTreeMap<&'static str, crate::document::vocabulary::MaterialDoc>,
    climates: BTreeMap<&'static str, crate::document::weather::ClimateDoc>,
    snow_seasons: BTreeMap<&'static str, crate::document::weather::SnowSeasonDoc>,
    surfaces: BTreeMap<&'static str, crate::document::weather::SurfaceDoc>,
    bottoms: BTreeMap<&'static str, crate::document::weather::DeepDoc>,
    initials: BTreeMap<&'static str, crate::document::winter::InitialDoc>,
    winter: crate::document::winter::WinterDoc,
    winter_grid: crate::document::winter::GridDoc,
    shapes: BTreeMap<&'static str, crate::document::shelter::ShapeDoc>,
    exposed_face: crate::document::shelter::ExposedFaceDoc,
    floors: BTreeMap<&'static str, crate::document::shelter::FloorDoc>,
    entrances: BTreeMap<&'static str, crate::document::shelter::EntranceDoc>,
    shelter: crate::document::shelter::ShelterDoc,
    edge_wall_board: crate::document::edge::EdgeWallBoardDoc,
    edge_wing: crate::document::edge::EdgeWingDoc,
    edge_insides: BTreeMap<&'static str, crate::document::edge::EdgeInsideDoc>,
    edge: crate::document::edge::EdgeDoc,
    edge_grid: crate::document::edge::EdgeGridDoc,
    edge_least_quantities: [defaults::LeastQuantity; 4],
    /// The winter's least-thickness search, by unit system.
    least_thickness: BTreeMap<&'static str, defaults::LeastRange>,
    ranges: crate::document::ranges::RangesDoc,
}

/// Every default of [`crate::document::defaults`] as a scenario holds it.
fn defaults() -> Defaults {
    Defaults {
        materials: by_kind(&defaults::MATERIAL_KINDS, defaults::material),
        climates: by_kind(&defaults::CLIMATE_KINDS, defaults::climate),
        snow_seasons: by_kind(&defaults::CLIMATE_KINDS, defaults::snow_season),
        surfaces: by_kind(&["film", "n-factor"], defaults::surface),
        bottoms: by_kind(&["flux", "temperature"], defaults::bottom),
        initials: by_kind(&["spin-up", "uniform", "periodic"], defaults::initial),
        winter: defaults::winter(),
        winter_grid: defaults::winter_grid(),
        shapes: by_kind(&defaults::SHAPE_KINDS, defaults::shape),
        exposed_face: defaults::exposed_face(),
        floors: by_kind(&["snow", "ground"], defaults::floor),
        entrances: by_kind(&["cold-trap", "level"], defaults::entrance),
        shelter: defaults::shelter(),
        edge_wall_board: defaults::edge_wall_board(),
        edge_wing: defaults::edge_wing(),
        edge_insides: by_kind(&["heated", "closed"], defaults::edge_inside),
        edge: defaults::edge(),
        edge_grid: defaults::edge_grid(),
        edge_least_quantities: defaults::EDGE_LEAST_QUANTITIES,
        least_thickness: BTreeMap::from([
            ("si", defaults::LEAST_THICKNESS_SI),
            ("us", defaults::LEAST_THICKNESS_US),
        ]),
        ranges: defaults::ranges(),
    }
}

/// A section's optional parts the default leaves out (`null`: a winter's or an edge's
/// `grid`, a winter's `duration_days`) are left out of its object, as a file that does not
/// name them; the keys keep the order a scenario file gives them.
fn leave_out_nulls(catalogue: &JsValue) {
    let defaults = js_sys::Reflect::get(catalogue, &"defaults".into()).unwrap_or_default();
    for section in ["winter", "shelter", "edge"] {
        let Ok(obj) = js_sys::Reflect::get(&defaults, &section.into()) else {
            continue;
        };
        let Ok(obj) = obj.dyn_into::<js_sys::Object>() else {
            continue;
        };
        for key in js_sys::Object::keys(&obj).iter() {
            if js_sys::Reflect::get(&obj, &key).is_ok_and(|v| v.is_null()) {
                let _ = js_sys::Reflect::delete_property(&obj, &key);
            }
        }
    }
}

/// Everything the page offers to choose from, with sources, the unit table and the defaults.
#[wasm_bindgen]
pub fn catalogue() -> JsValue {
    let unit = |q: &Quantity, sys: UnitSystem| {
        let u = q.unit(sys);
        UnitInfo {
            symbol: u.symbol,
            factor: u.factor,
            offset: u.offset,
            decimals: u.decimals,
            written: units::written(q, sys).id(),
        }
    };
    let c = Catalogue {
        version: env!("CARGO_PKG_VERSION"),
        format_version: scenario::FORMAT_VERSION,
        snow_regressions: SnowRegression::ALL
            .iter()
            .map(|c| {
                let (lo, hi) = c.valid_range_kg_m3();
                RegressionDoc {
                    id: c.id(),
                    name: c.name(),
                    citation: c.citation(),
                    range_kg_m3: [lo, hi],
                }
            })
            .collect(),
        soil_textures: Texture::ALL
            .iter()
            .map(|t| IdName {
                id: t.id(),
                name: t.name(),
            })
            .collect(),
        soil_models: SoilModel::ALL
            .iter()
            .map(|m| SoilModelInfo {
                id: m.id(),
                name: m.name(),
                citation: m.citation(),
                textures: Texture::ALL
                    .iter()
                    .filter(|t| m.covers(**t))
                    .map(|t| t.id())
                    .collect(),
            })
            .collect(),
        boards: Board::ALL
            .iter()
            .map(|b| BoardInfo {
                id: b.id(),
                name: b.name(),
                conductivity_w_m_k: b.nominal_conductivity_w_m_k(),
                source: "typical value for the product class (common practice, no single source)",
            })
            .collect(),
        surface_presets: SURFACE_PRESETS
            .iter()
            .map(|p| PresetInfo {
                id: p.id,
                name: p.name,
                film_w_m2k: p.film_w_m2k,
                source: p.source,
            })
            .collect(),
        material_kinds: [
            ("snow", "Snow"),
            ("ice", "Ice"),
            ("water", "Water (freezes to ice)"),
            ("air", "Still air gap"),
            ("soil", "Soil, gravel or peat"),
            ("insulation", "Insulation board"),
            ("concrete", "Concrete"),
            ("custom", "Custom material"),
        ]
        .into_iter()
        .map(|(id, name)| IdName { id, name })
        .collect(),
        n_factor_presets: crate::physics::climate::Surface::ALL
            .iter()
            .map(|s| NFactorInfo {
                id: s.id(),
                name: s.name(),
                freezing: s.freezing_n_factor(),
                source: s.source(),
            })
            .collect(),
        initial_kinds: vec!["uniform", "spin-up", "periodic"],
        shelter_shapes: [
            ("block-dome", "Dome of snow blocks"),
            ("hollowed-pile", "Pile of snow, hollowed out"),
            ("drift-cave", "Cave dug into a drift"),
            ("trench", "Trench roofed with snow blocks"),
        ]
        .into_iter()
        .map(|(id, name)| IdName { id, name })
        .collect(),
        activities: crate::physics::shelter::Activity::ALL
            .iter()
            .map(|a| ActivityInfo {
                id: a.id(),
                name: a.name(),
                met: a.met(),
                source: a.source(),
            })
            .collect(),
        cautions: crate::document::shelter::cautions(),
        units: QUANTITIES
            .iter()
            .map(|q| {
                (
                    q.id,
                    QuantityInfo {
                        si: unit(q, UnitSystem::Si),
                        us: unit(q, UnitSystem::Us),
                    },
                )
            })
            .collect(),
        defaults: defaults(),
    };
    let out = to_js(&c);
    leave_out_nulls(&out);
    out
}

/// A value of the unit table's quantity `quantity` (SI) written as the page shows it in
/// `units` (`si`, `us`; see `units::write`): rounded up when `up` (a least value that must be
/// enough), for an input box when `input`. An unknown quantity or system: the number as is.
#[wasm_bindgen]
pub fn write_value(quantity: &str, units: &str, si: f64, up: bool, input: bool) -> String {
    let (Some(q), Some(sys)) = (units::quantity(quantity), UnitSystem::from_id(units)) else {
        return si.to_string();
    };
    let rounding = if up {
        units::Rounding::Up
    } else {
        units::Rounding::Nearest
    };
    let form = if input {
        units::Form::Input
    } else {
        units::Form::Text
    };
    units::write(q, sys, si, rounding, form)
}

/// What was typed into an input of `quantity` shown in `units`, in SI (`units::read`: feet
/// and inches as people type them); `undefined` when it does not read.
#[wasm_bindgen]
pub fn read_value(quantity: &str, units: &str, text: &str) -> Option<f64> {
    let q = units::quantity(quantity)?;
    let sys = UnitSystem::from_id(units)?;
    units::read(q, sys, text)
}
