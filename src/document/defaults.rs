//! The defaults a new section starts from, in one place for the page (through the
//! catalogue), the CLI (`hibernal default SECTION`) and the tests: a winter, a snow shelter,
//! a building edge, a ranges study, a material of each kind, and the parts a section can
//! switch between (climates, snow seasons, surfaces, deep boundaries, starts, shelter
//! shapes, floors, entrances, the inside of a building, the least-insulation searches).
//!
//! Physical values with a source come from the core, where the source is cited:
//! [`GROUND_FILM_W_M2K`], [`GEOTHERMAL_FLUX_W_M2`], [`FLOOR_FILM_DOWN_W_M2K`],
//! [`INSIDE_FILM_W_M2K`], [`BODY_AREA_M2`], the n-factor table ([`Surface`]), the default
//! grids. Everything else here is an invented scenario of this tool's (no source): a
//! calendar year or a design winter in a cold temperate climate, a dome for two on a calm
//! night, a heated building on a shallow footing in silt. Each default section checks and
//! runs as it is (tested).

use super::edge::{
    EdgeDoc, EdgeGridDoc, EdgeInsideDoc, EdgeSlabDoc, EdgeStartDoc, EdgeWallBoardDoc, EdgeWallDoc,
    EdgeWingDoc, DEFAULT_GRID,
};
use super::ranges::apply::climate_freezing_index;
use super::ranges::{DistributionDoc, RangedInputDoc, RangedWhat, RangesDoc, DEFAULT_RUNS};
use super::shelter::{
    ConditionsDoc, EntranceDoc, ExposedFaceDoc, FloorDoc, NightDoc, ShapeDoc, ShelterDoc,
    SweepsDoc, TargetDoc,
};
use super::vocabulary::{
    BoardDoc, LayerDoc, MaterialDoc, SnowRegressionDoc, SoilModelDoc, TextureDoc,
};
use super::weather::{ClimateDoc, DeepDoc, SnowSeasonDoc, SurfaceDoc};
use super::winter::{GridDoc, InitialDoc, WinterDoc};
use crate::physics::climate::Surface;
use crate::physics::edge2d::section::FLOOR_FILM_DOWN_W_M2K;
use crate::physics::materials::SnowRegression;
use crate::physics::shelter::inputs::{BODY_AREA_M2, INSIDE_FILM_W_M2K};
use crate::physics::stack::GROUND_FILM_W_M2K;
use crate::physics::transient::setup::GEOTHERMAL_FLUX_W_M2;

/// The regression a new snow layer or shelter starts with: the first the tool lists.
fn first_regression() -> SnowRegressionDoc {
    SnowRegression::ALL[0].into()
}

/// The material kinds a layer can have, as the format names them.
pub const MATERIAL_KINDS: [&str; 8] = [
    "snow",
    "ice",
    "water",
    "air",
    "soil",
    "insulation",
    "concrete",
    "custom",
];

/// A material of a kind (invented values: snow of 300 kg/m³; a moist silt; an extruded
/// polystyrene board at its nominal conductivity; concrete at its nominal conductivity; a
/// material of one's own), or `None` for a kind the format does not have.
pub fn material(kind: &str) -> Option<MaterialDoc> {
    Some(match kind {
        "snow" => MaterialDoc::Snow {
            density_kg_m3: 300.0,
            regression: first_regression(),
        },
        "ice" => MaterialDoc::Ice,
        "water" => MaterialDoc::Water,
        "air" => MaterialDoc::Air,
        "soil" => MaterialDoc::Soil {
            texture: TextureDoc::Silt,
            model: SoilModelDoc::Kersten1949,
            dry_density_kg_m3: 1600.0,
            water_content_pct: 20.0,
            quartz_fraction: 0.3,
            conductivity_factor: 1.0,
            unfrozen_water: None,
        },
        "insulation" => MaterialDoc::Insulation {
            board: BoardDoc::ExtrudedPolystyrene,
            conductivity_w_m_k: None,
            moisture_derating_pct: 0.0,
        },
        "concrete" => MaterialDoc::Concrete {
            conductivity_w_m_k: None,
        },
        "custom" => MaterialDoc::Custom {
            label: "Own material".into(),
            conductivity_w_m_k: 0.5,
            frozen_conductivity_w_m_k: None,
            density_kg_m3: 1000.0,
            specific_heat_j_kg_k: 1000.0,
        },
        _ => return None,
    })
}

/// The climate kinds, as the format names them.
pub const CLIMATE_KINDS: [&str; 3] = ["sinusoid", "design-winter", "daily"];

/// A climate of a kind: a sine year with a mean of +3 °C, a swing of ±14 K and its coldest
/// day on 20 January; a design winter of 1000 °C·days over 150 days with a mean annual
/// +3 °C; daily records with no days yet (to be imported). Invented; no snow.
pub fn climate(kind: &str) -> Option<ClimateDoc> {
    Some(match kind {
        "sinusoid" => ClimateDoc::Sinusoid {
            mean_c: 3.0,
            amplitude_k: 14.0,
            coldest_day_of_year: 20,
            snow: None,
        },
        "design-winter" => ClimateDoc::DesignWinter {
            freezing_index_c_days: 1000.0,
            season_days: 150.0,
            mean_annual_c: 3.0,
            snow: None,
        },
        "daily" => ClimateDoc::Daily { days: Vec::new() },
        _ => return None,
    })
}

/// The snow season a climate of a kind starts with when snow is switched on: for a calendar
/// year (day 0 = 1 January) from mid-November to mid-April, for a design winter (day 0 =
/// freeze-up) from day 10 to day 160; 40 cm at the peak, fresh 150 and settled 320 kg/m³.
/// Invented. `None` for daily records, which carry their own snow.
pub fn snow_season(climate_kind: &str) -> Option<SnowSeasonDoc> {
    let (start_day, peak_day, end_day) = match climate_kind {
        "sinusoid" => (320.0, 50.0, 105.0),
        "design-winter" => (10.0, 100.0, 160.0),
        _ => return None,
    };
    Some(SnowSeasonDoc {
        start_day,
        peak_day,
        end_day,
        peak_depth_m: 0.4,
        fresh_density_kg_m3: 150.0,
        settled_density_kg_m3: 320.0,
    })
}

/// How the ground surface meets the weather, by kind: air through a film of
/// [`GROUND_FILM_W_M2K`] with the first snow regression, or n-factors of bare soil
/// (freezing 0.7, UFC 3-130-04 Table 4-1, [`Surface::BareSoil`]; thawing 1.0, common
/// practice, no source).
pub fn surface(kind: &str) -> Option<SurfaceDoc> {
    Some(match kind {
        "film" => SurfaceDoc::Film {
            film_w_m2k: GROUND_FILM_W_M2K,
            snow_regression: first_regression(),
        },
        "n-factor" => SurfaceDoc::NFactor {
            freezing: Surface::BareSoil.freezing_n_factor(),
            thawing: 1.0,
            preset: Some(Surface::BareSoil.id().to_string()),
        },
        _ => return None,
    })
}

/// The deep boundary, by kind: the geothermal flux [`GEOTHERMAL_FLUX_W_M2`], or the
/// bottom held at +4 °C (invented: a mean ground temperature of a cold temperate
/// climate).
pub fn bottom(kind: &str) -> Option<DeepDoc> {
    Some(match kind {
        "flux" => DeepDoc::Flux {
            upward_w_m2: GEOTHERMAL_FLUX_W_M2,
            at_layers_bottom: false,
        },
        "temperature" => DeepDoc::Temperature {
            temperature_c: 4.0,
            at_layers_bottom: false,
        },
        _ => return None,
    })
}

/// How a winter run starts, by kind: a spin-up of at most 10 years from +4 °C, the ground
/// uniformly at +4 °C, or the periodic start. Invented.
pub fn initial(kind: &str) -> Option<InitialDoc> {
    Some(match kind {
        "spin-up" => InitialDoc::SpinUp {
            start_c: 4.0,
            max_years: 10,
            from_periodic: false,
        },
        "uniform" => InitialDoc::Uniform { temperature_c: 4.0 },
        "periodic" => InitialDoc::Periodic {},
        _ => return None,
    })
}

/// A new winter: the sine year, a film surface, the geothermal flux, a spin-up start, hourly
/// steps, the default grid (left out, so the file says only what the user chose).
pub fn winter() -> WinterDoc {
    WinterDoc {
        climate: climate("sinusoid").unwrap_or(ClimateDoc::Daily { days: Vec::new() }),
        surface: surface("film").unwrap_or(SurfaceDoc::NFactor {
            freezing: 1.0,
            thawing: 1.0,
            preset: None,
        }),
        bottom: bottom("flux").unwrap_or(DeepDoc::Temperature {
            temperature_c: 4.0,
            at_layers_bottom: false,
        }),
        initial: initial("spin-up").unwrap_or(InitialDoc::Periodic {}),
        grid: None,
        step_s: 3600.0,
        duration_days: None,
        least_thickness: None,
    }
}

/// The winter run's grid when the section names none.
pub fn winter_grid() -> GridDoc {
    GridDoc::default()
}

/// The shelter shapes, as the format names them.
pub const SHAPE_KINDS: [&str; 4] = ["block-dome", "hollowed-pile", "drift-cave", "trench"];

/// A shelter shape of a kind, sized for two (invented): a dome 2.2 m across inside with
/// 35 cm walls; a pile 2.4 m across with a 40 cm crown and a 70 cm base; a cave 2 m across
/// in a drift (no side to the outside air); a trench 2.2 × 0.9 m, 1 m deep, under a 30 cm
/// roof.
pub fn shape(kind: &str) -> Option<ShapeDoc> {
    Some(match kind {
        "block-dome" => ShapeDoc::BlockDome {
            inner_radius_m: 1.1,
            wall_thickness_m: 0.35,
        },
        "hollowed-pile" => ShapeDoc::HollowedPile {
            inner_radius_m: 1.2,
            crown_thickness_m: 0.4,
            base_thickness_m: 0.7,
        },
        "drift-cave" => ShapeDoc::DriftCave {
            inner_radius_m: 1.0,
            exposed_face: Some(exposed_face()),
        },
        "trench" => ShapeDoc::Trench {
            length_m: 2.2,
            width_m: 0.9,
            depth_m: 1.0,
            roof_thickness_m: 0.3,
        },
        _ => return None,
    })
}

/// The side of a drift cave that faces the outside air, when there is one: 30 % of the
/// chamber's curved surface under 50 cm of snow. Invented.
pub fn exposed_face() -> ExposedFaceDoc {
    ExposedFaceDoc {
        share: 0.3,
        thickness_m: 0.5,
    }
}

/// A shelter floor of a kind: snow, or ground at −2 °C with the conductivity and heat
/// capacity of a moist mineral soil (1.5 W/m·K, 2.2 MJ/m³K; typical values, from memory).
pub fn floor(kind: &str) -> Option<FloorDoc> {
    Some(match kind {
        "snow" => FloorDoc::Snow,
        "ground" => FloorDoc::Ground {
            conductivity_w_m_k: 1.5,
            heat_capacity_j_m3_k: 2.2e6,
            temperature_c: -2.0,
        },
        _ => return None,
    })
}

/// A shelter entrance of a kind: one that dips below the floor, or a doorway level with it
/// with 50 × 30 cm left open. Invented.
pub fn entrance(kind: &str) -> Option<EntranceDoc> {
    Some(match kind {
        "cold-trap" => EntranceDoc::ColdTrap,
        "level" => EntranceDoc::Level {
            opening_width_m: 0.5,
            opening_height_m: 0.3,
        },
        _ => return None,
    })
}

/// A new shelter: a snow-block dome for two asleep on a calm −15 °C night (3 m/s wind,
/// snowpack at −8 °C), 300 kg/m³ snow, an 8 cm vent, a cold-trap entrance, mats of
/// 0.3 m²K/W, a lining of 0.2 m²K/W to compare; a 12-hour night in minute steps and a
/// target of −5 °C for the least wall. Invented; the films and body area from the core.
pub fn shelter() -> ShelterDoc {
    ShelterDoc {
        shape: shape("block-dome").unwrap_or(ShapeDoc::BlockDome {
            inner_radius_m: 1.1,
            wall_thickness_m: 0.35,
        }),
        snow_density_kg_m3: 300.0,
        snow_regression: first_regression(),
        floor: FloorDoc::Snow,
        entrance: EntranceDoc::ColdTrap,
        vent_diameter_m: 0.08,
        inside_film_w_m2k: INSIDE_FILM_W_M2K,
        lining_m2k_w: 0.2,
        floor_cover_m2k_w: 0.3,
        conditions: ConditionsDoc {
            outside_c: -15.0,
            wind_m_s: 3.0,
            snowpack_c: -8.0,
            people: 2,
            activity: super::shelter::ActivityDoc::Sleeping,
            body_area_m2: BODY_AREA_M2,
            candles: 0,
            stove_w: 0.0,
            stove_heat_share: 1.0,
        },
        night: NightDoc::default(),
        target: TargetDoc::default(),
        sweeps: SweepsDoc::default(),
    }
}

/// An insulation board for the edge: extruded polystyrene at its nominal conductivity,
/// 5 cm thick, 10 % of its R lost to moisture in buried use (an invented allowance; the
/// report's cautions say what is assumed).
fn edge_board() -> (MaterialDoc, f64) {
    (
        MaterialDoc::Insulation {
            board: BoardDoc::ExtrudedPolystyrene,
            conductivity_w_m_k: None,
            moisture_derating_pct: 10.0,
        },
        0.05,
    )
}

/// The board against the wall of a new edge, from grade to 0.6 m.
pub fn edge_wall_board() -> EdgeWallBoardDoc {
    let (material, thickness_m) = edge_board();
    EdgeWallBoardDoc {
        material,
        thickness_m,
        depth_m: 0.6,
    }
}

/// The wing of a new edge: 0.6 m wide with its top 0.3 m below grade.
pub fn edge_wing() -> EdgeWingDoc {
    let (material, thickness_m) = edge_board();
    EdgeWingDoc {
        material,
        thickness_m,
        width_m: 0.6,
        depth_m: 0.3,
    }
}

/// The inside of the building, by kind: heated to 20 °C through a floor film of
/// [`FLOOR_FILM_DOWN_W_M2K`], or closed (unheated).
pub fn edge_inside(kind: &str) -> Option<EdgeInsideDoc> {
    Some(match kind {
        "heated" => EdgeInsideDoc::Heated {
            air_c: 20.0,
            film_w_m2k: FLOOR_FILM_DOWN_W_M2K,
        },
        "closed" => EdgeInsideDoc::Closed,
        _ => return None,
    })
}

/// A new building edge: a heated building (10 m wide) on a 0.6 m footing with a board
/// against the wall and a wing, 10 cm slab, 20 cm concrete wall, in 8 m of silt, through a
/// design winter of 1500 °C·days over 160 days with snow, daily steps for 200 days (the
/// freezing season and some weeks of thaw: frost under a footing is deepest near the
/// season's end), a field kept every 7 days. Invented.
pub fn edge() -> EdgeDoc {
    let concrete = || material("concrete").unwrap_or(MaterialDoc::Ice);
    EdgeDoc {
        inside_half_width_m: 5.0,
        outside_extent_m: 8.0,
        depth_m: 8.0,
        slab: EdgeSlabDoc {
            thickness_m: 0.1,
            material: concrete(),
        },
        wall: EdgeWallDoc {
            width_m: 0.2,
            base_depth_m: 0.6,
            material: concrete(),
        },
        wall_board: Some(edge_wall_board()),
        wing: Some(edge_wing()),
        soil: vec![LayerDoc {
            name: "silt".into(),
            thickness_m: 8.0,
            material: material("soil").unwrap_or(MaterialDoc::Ice),
        }],
        inside: edge_inside("heated").unwrap_or(EdgeInsideDoc::Closed),
        outside: surface("film").unwrap_or(SurfaceDoc::NFactor {
            freezing: 1.0,
            thawing: 1.0,
            preset: None,
        }),
        climate: ClimateDoc::DesignWinter {
            freezing_index_c_days: 1500.0,
            season_days: 160.0,
            mean_annual_c: 2.0,
            snow: snow_season("design-winter"),
        },
        bottom: bottom("flux").unwrap_or(DeepDoc::Temperature {
            temperature_c: 4.0,
            at_layers_bottom: false,
        }),
        start: EdgeStartDoc {
            surface_c: 5.0,
            gradient_k_m: 0.03,
        },
        grid: None,
        step_s: 86_400.0,
        duration_days: Some(200.0),
        field_every_days: 7.0,
        least: None,
    }
}

/// The edge's grid when the section names none.
pub fn edge_grid() -> EdgeGridDoc {
    DEFAULT_GRID
}

/// The range and step a new search starts with, SI, round in the units it is shown in
/// (the search tries `min + k·resolution`: see [`crate::physics::least::Search`]).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct LeastRange {
    pub min: f64,
    pub max: f64,
    pub resolution: f64,
}

/// m per inch, exact.
const IN: f64 = 0.0254;
/// m²K/W per US R-value (ft²·°F·h/Btu): 1 / 5.678 263 (NIST SP 811).
const R_US: f64 = 1.0 / crate::physics::units::R_US_PER_R_SI;

/// The least-thickness search of a winter, with SI units: 0 to 30 cm in 2 mm steps.
pub const LEAST_THICKNESS_SI: LeastRange = LeastRange {
    min: 0.0,
    max: 0.3,
    resolution: 0.002,
};
/// With US units: 0 to 12 in in 1/2 in steps (foam boards are sold in 1/2 in steps of
/// thickness; common practice, no source).
pub const LEAST_THICKNESS_US: LeastRange = LeastRange {
    min: 0.0,
    max: 12.0 * IN,
    resolution: 0.5 * IN,
};

/// What the edge's least-insulation search can vary, with the units quantity its values
/// are shown in, the part it needs, and the range and resolution a new search starts with
/// (SI, round in SI units; `us`: round in US units). Invented ranges, wide enough for the
/// examples.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct LeastQuantity {
    /// As the format's `edge.least.quantity` names it.
    pub id: &'static str,
    pub name: &'static str,
    /// The units quantity of its values.
    pub quantity: &'static str,
    /// The part of the section it needs (`wing`, `wall_board`), if any.
    pub needs: Option<&'static str>,
    pub min: f64,
    pub max: f64,
    pub resolution: f64,
    /// The range a new search starts with when the page shows US units.
    pub us: LeastRange,
}

/// The four quantities, wing width first. US ranges: wings in 6 in steps up to 6 ft (board
/// widths are cut from 2 ft × 8 ft sheets, so 6 in is a quarter sheet's width), boards
/// in whole R-values up to R-35 (boards are labelled in whole R), footings in 2 in steps
/// from 1 ft to 10 ft (footings are dug and formed to the inch); common practice, no source.
pub const EDGE_LEAST_QUANTITIES: [LeastQuantity; 4] = [
    LeastQuantity {
        id: "wing-width",
        name: "Width of the wing board",
        quantity: "length",
        needs: Some("wing"),
        min: 0.0,
        max: 2.0,
        resolution: 0.02,
        us: LeastRange {
            min: 0.0,
            max: 72.0 * IN,
            resolution: 6.0 * IN,
        },
    },
    LeastQuantity {
        id: "wing-r",
        name: "R-value of the wing board",
        quantity: "r_value",
        needs: Some("wing"),
        min: 0.2,
        max: 6.0,
        resolution: 0.05,
        us: LeastRange {
            min: R_US,
            max: 35.0 * R_US,
            resolution: R_US,
        },
    },
    LeastQuantity {
        id: "wall-board-r",
        name: "R-value of the board against the wall",
        quantity: "r_value",
        needs: Some("wall_board"),
        min: 0.2,
        max: 6.0,
        resolution: 0.05,
        us: LeastRange {
            min: R_US,
            max: 35.0 * R_US,
            resolution: R_US,
        },
    },
    LeastQuantity {
        id: "footing-depth",
        name: "Depth of the footing base",
        quantity: "depth",
        needs: None,
        min: 0.3,
        max: 3.0,
        resolution: 0.02,
        us: LeastRange {
            min: 12.0 * IN,
            max: 120.0 * IN,
            resolution: 2.0 * IN,
        },
    },
];

/// A new ranges study for a scenario with the default [`winter`]: [`DEFAULT_RUNS`] runs,
/// seed 1, the winter's freezing index spread evenly over ±20 % of the default winter's
/// own (rounded to 10 °C·days). (The page starts a study from the scenario's own values and
/// a fresh seed.)
pub fn ranges() -> RangesDoc {
    let fi = climate_freezing_index(&winter().climate);
    let round = |v: f64| (v / 10.0).round() * 10.0;
    RangesDoc {
        runs: DEFAULT_RUNS,
        seed: 1,
        results: Vec::new(),
        inputs: vec![RangedInputDoc {
            what: RangedWhat::FreezingIndex,
            layer: None,
            low: round(0.8 * fi),
            high: round(1.2 * fi),
            distribution: DistributionDoc::Uniform,
        }],
    }
}
