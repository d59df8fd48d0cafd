//! An invented edge section and design winter, for the benchmark, the tests and examples:
//! a heated slab-on-grade house with a shallow footing, on silt over sand, in a cold
//! climate (freezing index 1500 °C·days). No real site, product or building.
//!
//! Run by `benches/design_winter_2d.rs` and `benches/edge_least.rs`, by the tests of the 2D
//! core and its search, and by the grid study (`tests/edge_grid_study.rs`); what they
//! measured is in `MEASUREMENTS.md`.

use super::axis::AxisSpacing;
use super::section::{
    Board, EdgeSection, FoundationWall, Inside, Outside, Slab, SoilBand, StartTemperature,
    WallBoard, Wing,
};
use crate::physics::climate::Climate;
use crate::physics::materials::{MaterialSpec, SnowRegression, SoilInput, SoilModel, Texture};
use crate::physics::transient::BottomCondition;

const DAY: f64 = 86_400.0;

/// Volumetric heat capacity of an extruded polystyrene board, J/m³/K (32 kg/m³ × 1500 J/kg/K,
/// the class values of [`crate::physics::materials::Board::density_and_specific_heat`]).
pub const XPS_HEAT_CAPACITY_J_M3_K: f64 = 32.0 * 1500.0;

/// A 50 mm XPS board (k 0.029 W/m/K, the class's nominal value).
pub fn xps_50mm() -> Board {
    Board {
        thickness_m: 0.05,
        conductivity_w_m_k: 0.029,
        heat_capacity_j_m3_k: XPS_HEAT_CAPACITY_J_M3_K,
    }
}

/// The invented section: slab 0.1 m of concrete, 6 m from the centre line to the wall;
/// wall and footing 0.25 m wide to 0.6 m below grade; 50 mm of XPS on the wall to the base
/// and a 50 mm wing 1.2 m wide at 0.35 m; silt (1600 kg/m³ dry, 22 % water) 1.5 m over sand
/// (1700 kg/m³, 12 %), 10 m deep, 0.05 W/m² from below; inside 20 °C; outside by a film of
/// 15 W/m²K (snow as a resistance); daily steps over 180 days.
pub fn design_winter_section() -> EdgeSection {
    let mut w = Vec::new();
    let concrete = MaterialSpec::Concrete {
        conductivity_w_m_k: None,
    }
    .resolve("concrete", &mut w)
    .expect("concrete resolves");
    let silt = MaterialSpec::Soil(SoilInput {
        texture: Texture::Silt,
        model: SoilModel::Kersten1949,
        dry_density_kg_m3: 1600.0,
        water_content_pct: 22.0,
        quartz_fraction: 0.3,
        conductivity_factor: 1.0,
    })
    .resolve("silt", &mut w)
    .expect("silt resolves");
    let sand = MaterialSpec::Soil(SoilInput {
        texture: Texture::Sand,
        model: SoilModel::Kersten1949,
        dry_density_kg_m3: 1700.0,
        water_content_pct: 12.0,
        quartz_fraction: 0.6,
        conductivity_factor: 1.0,
    })
    .resolve("sand", &mut w)
    .expect("sand resolves");
    EdgeSection {
        inside_half_width_m: 6.0,
        outside_extent_m: 10.0,
        depth_m: 10.0,
        slab: Slab {
            thickness_m: 0.1,
            material: concrete.clone(),
        },
        wall: FoundationWall {
            width_m: 0.25,
            base_depth_m: 0.6,
            material: concrete,
        },
        wall_board: Some(WallBoard {
            board: xps_50mm(),
            depth_m: 0.6,
        }),
        wing: Some(Wing {
            board: xps_50mm(),
            width_m: 1.2,
            depth_m: 0.35,
        }),
        soil: vec![
            SoilBand {
                thickness_m: 1.5,
                material: silt,
                curve: None,
            },
            SoilBand {
                thickness_m: 8.5,
                material: sand,
                curve: None,
            },
        ],
        inside: Inside::Heated {
            air_c: 20.0,
            film_w_m2k: 6.0,
        },
        outside: Outside::Film {
            film_w_m2k: 15.0,
            snow_regression: SnowRegression::ALL[0],
        },
        bottom: BottomCondition::Flux { upward_w_m2: 0.05 },
        start: StartTemperature {
            surface_c: 4.0,
            gradient_k_m: 0.2,
        },
        grid: AxisSpacing {
            fine_m: 0.04,
            growth_ratio: 1.2,
            max_cell_m: 0.6,
        },
        step_s: DAY,
        duration_s: 180.0 * DAY,
        field_every_s: DAY,
    }
}

/// The invented design winter: freezing index 1500 °C·days over a 180-day season, mean
/// annual 1 °C, no snow (bare ground: the severe case for a footing).
pub fn design_winter_climate() -> Climate {
    Climate::DesignWinter {
        freezing_index_c_days: 1500.0,
        season_days: 180.0,
        mean_annual_c: 1.0,
        snow: None,
    }
}
