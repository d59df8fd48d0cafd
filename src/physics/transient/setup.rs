//! What a run on a column needs besides the solver: the forcing that drives its top over
//! time, how the top meets the weather, how the run starts, and the run's specification.

use super::grid::GridSpec;
use super::phase::UnfrozenWater;
use super::solver::BottomCondition;
use crate::physics::climate::AnnualWave;
use crate::physics::materials::{Material, SnowRegression};

/// What drives the top of the column over time (t in seconds from the start).
pub trait Forcing {
    /// Air temperature, °C.
    fn air_c(&self, t_s: f64) -> f64;
    /// Snow on the ground: depth m and density kg/m³, or `None`.
    fn snow(&self, _t_s: f64) -> Option<(f64, f64)> {
        None
    }
}

/// A sinusoidal year: T = mean − amplitude cos(2π (day − coldest)/365).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SinusoidalYear {
    pub mean_c: f64,
    pub amplitude_k: f64,
    /// Day of the run (0-based, fractional) on which the air is coldest.
    pub coldest_day: f64,
}

impl Forcing for SinusoidalYear {
    fn air_c(&self, t_s: f64) -> f64 {
        let day = t_s / 86_400.0;
        self.mean_c
            - self.amplitude_k
                * (2.0 * std::f64::consts::PI * (day - self.coldest_day) / 365.0).cos()
    }
}

/// How the top face meets the weather.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum TopModel {
    /// Air through a film. Snow on the ground (from the forcing) becomes snow cells above
    /// the ground cells (see [`super::solver::Solver::set_snow`]), with the film on top of
    /// the snow; their conductivity comes from `snow_regression` at the snow's density,
    /// they store sensible and latent heat, and their surface stays at or below 0 °C while
    /// they hold ice.
    AirFilm {
        film_w_m2k: f64,
        snow_regression: SnowRegression,
    },
    /// Surface temperature = n × air temperature, with a freezing n-factor below 0 °C and a
    /// thawing n-factor above (US Army TM 5-852-6 / UFC 3-130-04 n-factor method). The
    /// n-factor stands for the surface cover, snow included: the forcing's snow is not used.
    NFactor { freezing: f64, thawing: f64 },
}

/// How the run starts.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Initial {
    /// Every cell at one temperature, °C.
    Uniform(f64),
    /// Repeat the first year until the state at its start repeats (periodic steady state),
    /// at most `max_years` repeats, starting from the uniform temperature `start_c`, or,
    /// given a wave, from the periodic profile under it (`start_c` is then not used).
    SpinUp {
        start_c: f64,
        max_years: u32,
        from_periodic: Option<AnnualWave>,
    },
    /// The periodic profile of conduction without freezing under the climate's annual wave
    /// ([`super::periodic::PeriodicProfile`]).
    Periodic(AnnualWave),
}

/// Everything a run needs besides the forcing.
#[derive(Debug, Clone)]
pub struct RunSpec {
    pub thicknesses_m: Vec<f64>,
    pub materials: Vec<Material>,
    pub curves: Vec<Option<UnfrozenWater>>,
    pub grid: GridSpec,
    pub top: TopModel,
    pub bottom: BottomCondition,
    pub initial: Initial,
    /// Requested time step, s (split where needed).
    pub step_s: f64,
    pub duration_s: f64,
    /// Keep a profile every this many seconds.
    pub profile_every_s: f64,
}

/// Geothermal heat flux entering the column from below, W/m²: 0.06, a typical continental
/// value (global continental mean about 65 mW/m², Pollack, Hurter & Johnson 1993, Rev.
/// Geophys. 31:267; from memory). The default deep boundary of a winter run and an edge.
pub const GEOTHERMAL_FLUX_W_M2: f64 = 0.06;

/// Density assumed for recorded snow whose density is not given, kg/m³: settled snow
/// (200–300 kg/m³ in Cuffey & Paterson, The Physics of Glaciers, Table 2.1; from memory).
pub const DEFAULT_SNOW_DENSITY_KG_M3: f64 = 250.0;

impl Forcing for crate::physics::climate::Climate {
    fn air_c(&self, t_s: f64) -> f64 {
        self.air_temperature_c(t_s)
    }
    fn snow(&self, t_s: f64) -> Option<(f64, f64)> {
        self.snow_at(t_s).map(|s| {
            (
                s.depth_m,
                s.density_kg_m3.unwrap_or(DEFAULT_SNOW_DENSITY_KG_M3),
            )
        })
    }
}
