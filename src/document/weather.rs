//! The weather the winter and the building edge share: the climate ([`ClimateDoc`]: a
//! sinusoidal year, a design winter from a freezing index and a season length, or daily
//! records), an optional snow season on the first two ([`SnowSeasonDoc`], into the core's
//! `SnowSeason`), how the ground surface meets the weather ([`SurfaceDoc`]: a film with the
//! snow's regression, or n-factors) and the deep boundary ([`DeepDoc`]).
//!
//! The winter reads them as `winter.climate`, `winter.surface` and `winter.bottom`; the
//! edge as `edge.climate`, `edge.outside` and `edge.bottom`. They are checked where they
//! are turned into the core's climate and run (the winter section; the edge moves the paths
//! under `edge.`), with field paths such as `winter.climate.snow.peak_depth_m`. A snow
//! season is optional, so files of format version 2 without one load unchanged. A film's
//! regression keeps its published key `snow_correlation`.

use crate::document::vocabulary::SnowRegressionDoc;
use crate::physics::climate::SnowSeason;
use schemars::JsonSchema;
use serde::{Deserialize, Serialize};

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(tag = "kind", rename_all = "kebab-case", deny_unknown_fields)]
pub enum ClimateDoc {
    /// A sinusoidal year of air temperature.
    Sinusoid {
        mean_c: f64,
        amplitude_k: f64,
        coldest_day_of_year: u32,
        /// Snow on the ground over a season, if any.
        #[serde(default, skip_serializing_if = "Option::is_none")]
        snow: Option<SnowSeasonDoc>,
    },
    /// A design winter built from a freezing index and a season length.
    DesignWinter {
        freezing_index_c_days: f64,
        season_days: f64,
        mean_annual_c: f64,
        /// Snow on the ground over a season, if any.
        #[serde(default, skip_serializing_if = "Option::is_none")]
        snow: Option<SnowSeasonDoc>,
    },
    /// Daily records (dates consecutive, YYYY-MM-DD).
    Daily { days: Vec<DayDoc> },
}

/// A snow season (days of the run, 0-based; see [`SnowSeason`]): depth rising linearly
/// from 0 at `start_day` to `peak_depth_m` at `peak_day` and falling to 0 at `end_day`;
/// density rising linearly from fresh to settled between start and end. A season may run
/// across the year end (`end_day` beyond 365, or `start_day` after `end_day`); it repeats
/// every 365 days.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct SnowSeasonDoc {
    pub start_day: f64,
    pub peak_day: f64,
    pub end_day: f64,
    pub peak_depth_m: f64,
    pub fresh_density_kg_m3: f64,
    pub settled_density_kg_m3: f64,
}

impl From<SnowSeasonDoc> for SnowSeason {
    fn from(d: SnowSeasonDoc) -> Self {
        SnowSeason {
            start_day: d.start_day,
            peak_day: d.peak_day,
            end_day: d.end_day,
            peak_depth_m: d.peak_depth_m,
            fresh_density_kg_m3: d.fresh_density_kg_m3,
            settled_density_kg_m3: d.settled_density_kg_m3,
        }
    }
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct DayDoc {
    pub date: String,
    pub mean_air_c: f64,
    #[serde(default)]
    pub snow_depth_m: Option<f64>,
    #[serde(default)]
    pub snow_density_kg_m3: Option<f64>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(tag = "kind", rename_all = "kebab-case", deny_unknown_fields)]
pub enum SurfaceDoc {
    /// Air through a film; snow on the ground (recorded, or a snow season) lies under the
    /// film as layers of its own, with conductivity from the chosen regression.
    Film {
        film_w_m2k: f64,
        #[serde(rename = "snow_correlation")]
        snow_regression: SnowRegressionDoc,
    },
    /// Surface = n × air, freezing and thawing n-factors. The n-factor stands for the surface
    /// cover, snow included, so snow in the climate is not used. `preset` names the surface
    /// whose published freezing n-factor was chosen (an id of
    /// [`crate::physics::climate::Surface`], version 6), so the page shows the surface the
    /// user picked rather than the first with the same value; absent for a value of one's
    /// own.
    NFactor {
        freezing: f64,
        thawing: f64,
        #[serde(default, skip_serializing_if = "Option::is_none")]
        preset: Option<String>,
    },
}

/// The deep boundary. Unless `at_layers_bottom` is set, it acts below the layers given: the
/// run continues the deepest layer downwards until the column is
/// [`DEEP_GROUND_DAMPING_DEPTHS`](crate::physics::transient::periodic::DEEP_GROUND_DAMPING_DEPTHS)
/// damping depths deep (the year's wave has died there) and applies the condition at that
/// depth, so frost is never stopped by a bottom that sits too high. `at_layers_bottom: true`
/// holds it at the bottom of the layers given (a measured temperature at that depth, bedrock
/// of known flux). Files without the key get the added ground.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(tag = "kind", rename_all = "kebab-case", deny_unknown_fields)]
pub enum DeepDoc {
    /// Bottom face held at a temperature.
    Temperature {
        temperature_c: f64,
        #[serde(default, skip_serializing_if = "std::ops::Not::not")]
        at_layers_bottom: bool,
    },
    /// Heat entering from below (geothermal flux), W/m².
    Flux {
        upward_w_m2: f64,
        #[serde(default, skip_serializing_if = "std::ops::Not::not")]
        at_layers_bottom: bool,
    },
}

impl DeepDoc {
    /// Whether the condition is held at the bottom of the layers given (no ground added).
    pub fn at_layers_bottom(&self) -> bool {
        match *self {
            DeepDoc::Temperature {
                at_layers_bottom, ..
            }
            | DeepDoc::Flux {
                at_layers_bottom, ..
            } => at_layers_bottom,
        }
    }

    /// The same condition, held at the bottom of the layers given (or not).
    pub fn held_at_layers_bottom(&self, held: bool) -> DeepDoc {
        let mut d = self.clone();
        match &mut d {
            DeepDoc::Temperature {
                at_layers_bottom, ..
            }
            | DeepDoc::Flux {
                at_layers_bottom, ..
            } => *at_layers_bottom = held,
        }
        d
    }
}
