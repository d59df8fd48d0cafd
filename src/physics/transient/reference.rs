//! The reference year used by the benchmarks (native and wasm): about 200 ground cells,
//! hourly steps for 365 days, with snow cover (up to 8 snow cells of its own above the
//! ground while it lies). An invented case: silt over sand, a sinusoidal year (mean +2 °C,
//! amplitude 16 K, coldest on day 30), snow building to 30 cm in midwinter.
//!
//! Run by `benches/reference_year.rs` and `benches/ranges.rs` natively, and as wasm by the
//! wasm face's `benchmark_reference_year`, which `e2e/bench.mjs` times in headless
//! Chromium. The invented silt-yard example (`scenarios/silt-yard-how-sure.json`) is its
//! column and climate as a scenario. What they measured is in `MEASUREMENTS.md`.

use super::grid::GridSpec;
use super::setup::{Forcing, Initial, RunSpec, SinusoidalYear, TopModel};
use super::BottomCondition;
use crate::physics::materials::{MaterialSpec, SnowRegression, SoilInput, SoilModel, Texture};

/// Sinusoidal air and a snow cover from day 300 to day 100 of the next year, peaking at
/// 0.3 m, density 250 kg/m³.
pub struct ReferenceForcing {
    pub air: SinusoidalYear,
}

impl Forcing for ReferenceForcing {
    fn air_c(&self, t_s: f64) -> f64 {
        self.air.air_c(t_s)
    }
    fn snow(&self, t_s: f64) -> Option<(f64, f64)> {
        let day = (t_s / 86_400.0).rem_euclid(365.0);
        // Days since 1 Nov-like day 300, wrapping over the new year.
        let since = (day - 300.0).rem_euclid(365.0);
        let season = 165.0;
        if since < season {
            let depth = 0.3 * (std::f64::consts::PI * since / season).sin();
            Some((depth.max(0.0), 250.0))
        } else {
            None
        }
    }
}

/// The reference run.
pub fn reference_year() -> (RunSpec, ReferenceForcing) {
    let mut w = Vec::new();
    let mats = [
        MaterialSpec::Soil(SoilInput {
            texture: Texture::Silt,
            model: SoilModel::Kersten1949,
            dry_density_kg_m3: 1600.0,
            water_content_pct: 20.0,
            quartz_fraction: 0.3,
            conductivity_factor: 1.0,
        }),
        MaterialSpec::Soil(SoilInput {
            texture: Texture::Sand,
            model: SoilModel::Johansen1975,
            dry_density_kg_m3: 1700.0,
            water_content_pct: 10.0,
            quartz_fraction: 0.6,
            conductivity_factor: 1.0,
        }),
    ];
    let materials = mats
        .iter()
        .map(|m| {
            m.resolve("reference", &mut w)
                .expect("reference materials are valid")
        })
        .collect();
    let spec = RunSpec {
        thicknesses_m: vec![2.0, 8.0],
        materials,
        curves: vec![None, None],
        grid: GridSpec {
            surface_cell_m: 0.01,
            growth_ratio: 1.012,
            max_cell_m: 0.1,
        },
        top: TopModel::AirFilm {
            film_w_m2k: 20.0,
            snow_regression: SnowRegression::Sturm1997Quadratic,
        },
        bottom: BottomCondition::Flux { upward_w_m2: 0.06 },
        initial: Initial::Uniform(4.0),
        step_s: 3600.0,
        duration_s: 365.0 * 86_400.0,
        profile_every_s: 86_400.0,
    };
    (
        spec,
        ReferenceForcing {
            air: SinusoidalYear {
                mean_c: 2.0,
                amplitude_k: 16.0,
                coldest_day: 30.0,
            },
        },
    )
}
