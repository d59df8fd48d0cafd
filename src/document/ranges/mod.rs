//! The ranges section of the scenario document (format version 5): how sure the answers
//! are. Inputs the user marks as uncertain get a range and a spread; the main results of
//! the scenario's parts get P10, P50 and P90 from a Monte Carlo over those inputs
//! ([`crate::physics::ranges`]), the spread across the snow regressions for the base case, and
//! a one-at-a-time sensitivity study.
//!
//! **The work as tasks.** A study is a list of independent tasks
//! ([`plan::RangesPlan::task`]): the `runs` Monte Carlo samples, then the base case, then
//! each input at its low and its high end (the others as the scenario has them), then the
//! base case under each snow regression. A task depends on the plan and its number only, so
//! the page hands tasks to Web Workers in any order and [`plan::RangesPlan::assemble`]
//! gives the same report, to the bit, as one thread running them in order
//! ([`plan::run_plan`]).
//!
//! **What an input changes** ([`RangedWhat`]). An input without `layer` changes every field
//! of its kind in the scenario (stack layers, the winter's and the edge's climate and soil,
//! the shelter's snow); with `layer` only that layer of the stack (the details are in
//! [`apply`]). The base case is the scenario as written; an input's base value is read from
//! the first field it changes.
//!
//! Files: this one holds the section's document; [`apply`] puts an input's value into a
//! scenario and reads it back; [`plan`] makes and runs the tasks; [`report`] is what a study
//! gives; [`csv`] writes it as CSV and as the CLI's summary.
//!
//! **The document.** `ranges { runs (default 200), seed (0 to 2⁵³ − 1, default 1), results
//! (empty: every one the scenario has), inputs [{ what, layer?, low, high, distribution }]
//! }`. `what` is one of [`RangedWhat`]: `snow-density`, `water-content`,
//! `soil-conductivity-factor` (the soil's `conductivity_factor`, new in version 5, which
//! multiplies its model's frozen and unfrozen k), `insulation-derating`, `freezing-index`.
//! The results are [`RangeResult`]: `r-value` (steady), `frost-depth` (winter),
//! `frost-below-footing` (edge; negative: how far above the base the frost stays),
//! `shelter-interior`, `shelter-melt` (kg/h off the inner surfaces). A result with a limit
//! ([`RangeResult::limit`]: frost below the footing's base, melt above 0) reports how many
//! runs went past it and whether the base case does.
//! [`crate::document::compute::compute_all`] and the page's ordinary runs leave the section
//! aside.
//!
//! **Adding a kind of ranged input**: a [`RangedWhat`] variant with its id, name and unit
//! quantity; its field or fields in `apply` (a material's in `material_field`), and in
//! `base_value`; the page's entry for it in `RANGED` (`www/js/ranges.js`) with the layer
//! kind it applies to; and a test in `tests/ranges.rs` that `apply` changes what it says.

pub mod apply;
pub mod csv;
pub mod plan;
pub mod report;

use crate::physics::ranges::Distribution;
use schemars::JsonSchema;
use serde::{Deserialize, Serialize};

/// Runs when the section does not say.
pub const DEFAULT_RUNS: usize = 200;

/// Largest seed (2⁵³ − 1, so a page's number holds it exactly).
pub const MAX_SEED: u64 = (1 << 53) - 1;

/// Failed runs listed in a report (the count is always whole).
pub const LISTED_FAILURES: usize = 20;

fn default_runs() -> usize {
    DEFAULT_RUNS
}

fn default_seed() -> u64 {
    1
}

/// The `ranges` section.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct RangesDoc {
    /// Monte Carlo runs, 2 to 10 000.
    #[serde(default = "default_runs")]
    pub runs: usize,
    /// Seed of the sampler, 0 to 2⁵³ − 1: the same seed gives the same samples.
    #[serde(default = "default_seed")]
    pub seed: u64,
    /// Which results to study; empty for every result the scenario has.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub results: Vec<RangeResult>,
    /// The inputs known only as a range (1 to 32).
    pub inputs: Vec<RangedInputDoc>,
}

/// A main result a range is given for.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, JsonSchema)]
#[serde(rename_all = "kebab-case")]
pub enum RangeResult {
    /// The stack's total R-value, steady (m²·K/W).
    RValue,
    /// The winter's deepest frost (m).
    FrostDepth,
    /// At the building edge, the deepest frost below the footing's base (m): positive below
    /// the base, negative when frost stays above the base by that much.
    FrostBelowFooting,
    /// The shelter's steady interior air temperature (°C).
    ShelterInterior,
    /// Snow melting off the shelter's inner surfaces once the walls have warmed through
    /// (kg/h; 0 while every inner surface stays frozen).
    ShelterMelt,
}

impl RangeResult {
    pub const ALL: [RangeResult; 5] = [
        RangeResult::RValue,
        RangeResult::FrostDepth,
        RangeResult::FrostBelowFooting,
        RangeResult::ShelterInterior,
        RangeResult::ShelterMelt,
    ];
    pub fn id(self) -> &'static str {
        match self {
            RangeResult::RValue => "r-value",
            RangeResult::FrostDepth => "frost-depth",
            RangeResult::FrostBelowFooting => "frost-below-footing",
            RangeResult::ShelterInterior => "shelter-interior",
            RangeResult::ShelterMelt => "shelter-melt",
        }
    }
    pub fn name(self) -> &'static str {
        match self {
            RangeResult::RValue => "R-value of the stack",
            RangeResult::FrostDepth => "Deepest frost over the winter",
            RangeResult::FrostBelowFooting => "Frost below the footing",
            RangeResult::ShelterInterior => "Shelter interior",
            RangeResult::ShelterMelt => "Melt inside the shelter",
        }
    }
    /// The units quantity it is shown in.
    pub fn quantity(self) -> &'static str {
        match self {
            RangeResult::RValue => "r_value",
            RangeResult::FrostDepth | RangeResult::FrostBelowFooting => "depth",
            RangeResult::ShelterInterior => "temperature",
            RangeResult::ShelterMelt => "mass_rate",
        }
    }

    /// The limit whose crossing the report counts, with what crossing it means: frost below
    /// the footing's base, an inner surface melting. None for the others.
    pub fn limit(self) -> Option<(f64, &'static str)> {
        match self {
            RangeResult::FrostBelowFooting => Some((0.0, "frost gets below the footing's base")),
            RangeResult::ShelterMelt => Some((0.0, "the inner surface melts")),
            _ => None,
        }
    }
}

/// What an uncertain input stands for.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, JsonSchema)]
#[serde(rename_all = "kebab-case")]
pub enum RangedWhat {
    /// Snow density, kg/m³: snow layers' density, the shelter's snow; in a snow season the
    /// settled density (the fresh density keeps its ratio to it); in daily records every
    /// day's density scaled so their mean is the value.
    SnowDensity,
    /// Soil gravimetric water content, % of dry mass.
    WaterContent,
    /// Factor on the soil model's conductivity (frozen and unfrozen).
    SoilConductivityFactor,
    /// Insulation boards' loss of R to moisture, %.
    InsulationDerating,
    /// Air freezing index of the winter, °C·days: a design winter's index is set; a
    /// sinusoidal year's mean, or every daily record, is shifted until the index is the
    /// value.
    FreezingIndex,
}

impl RangedWhat {
    pub const ALL: [RangedWhat; 5] = [
        RangedWhat::SnowDensity,
        RangedWhat::WaterContent,
        RangedWhat::SoilConductivityFactor,
        RangedWhat::InsulationDerating,
        RangedWhat::FreezingIndex,
    ];
    pub fn id(self) -> &'static str {
        match self {
            RangedWhat::SnowDensity => "snow-density",
            RangedWhat::WaterContent => "water-content",
            RangedWhat::SoilConductivityFactor => "soil-conductivity-factor",
            RangedWhat::InsulationDerating => "insulation-derating",
            RangedWhat::FreezingIndex => "freezing-index",
        }
    }
    pub fn name(self) -> &'static str {
        match self {
            RangedWhat::SnowDensity => "Snow density",
            RangedWhat::WaterContent => "Soil water content",
            RangedWhat::SoilConductivityFactor => "Soil conductivity factor",
            RangedWhat::InsulationDerating => "Insulation derating",
            RangedWhat::FreezingIndex => "Freezing index",
        }
    }
    /// The units quantity it is given in.
    pub fn quantity(self) -> &'static str {
        match self {
            RangedWhat::SnowDensity => "density",
            RangedWhat::WaterContent => "water_content",
            RangedWhat::SoilConductivityFactor => "fraction",
            RangedWhat::InsulationDerating => "percent",
            RangedWhat::FreezingIndex => "degree_days",
        }
    }
}

/// One uncertain input.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct RangedInputDoc {
    pub what: RangedWhat,
    /// Only this layer of the stack (0 = top); absent for every field of the kind.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub layer: Option<usize>,
    /// Low end, SI.
    pub low: f64,
    /// High end, SI.
    pub high: f64,
    #[serde(default)]
    pub distribution: DistributionDoc,
}

/// How a value is spread over its range.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize, JsonSchema)]
#[serde(tag = "kind", rename_all = "kebab-case", deny_unknown_fields)]
pub enum DistributionDoc {
    /// Every value in the range equally likely.
    #[default]
    Uniform,
    /// Most likely at `mode`, falling linearly to the ends.
    Triangular { mode: f64 },
    /// Normal (`mean`, `sd`) cut off at the ends.
    Normal { mean: f64, sd: f64 },
}

impl From<DistributionDoc> for Distribution {
    fn from(d: DistributionDoc) -> Self {
        match d {
            DistributionDoc::Uniform => Distribution::Uniform,
            DistributionDoc::Triangular { mode } => Distribution::Triangular { mode },
            DistributionDoc::Normal { mean, sd } => Distribution::Normal { mean, sd },
        }
    }
}
