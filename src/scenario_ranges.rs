//! The ranges section of the scenario document (format version 5): how sure the answers
//! are. Inputs the user marks as uncertain get a range and a spread; the main results of
//! the scenario's parts get P10, P50 and P90 from a Monte Carlo over those inputs
//! ([`crate::physics::ranges`]), the spread across the snow regressions for the base case, and
//! a one-at-a-time sensitivity study.
//!
//! **The work as tasks.** A study is a list of independent tasks ([`RangesPlan::task`]):
//! the `runs` Monte Carlo samples, then the base case, then each input at its low and its
//! high end (the others as the scenario has them), then the base case under each snow
//! regression. A task depends on the plan and its number only, so the page hands tasks to
//! Web Workers in any order and [`RangesPlan::assemble`] gives the same report, to the bit,
//! as one thread running them in order ([`run_plan`]).
//!
//! **What an input changes** ([`RangedWhat`]). An input without `layer` changes every
//! field of its kind in the scenario (stack layers, the winter's and the edge's climate
//! and soil, the shelter's snow); with `layer` only that layer of the stack. The base case
//! is the scenario as written; an input's base value is read from the first field it
//! changes.

use schemars::JsonSchema;
use serde::{Deserialize, Serialize};

use crate::physics::error::{InputError, InputErrorKind, InputErrors};
use crate::physics::materials::SnowCorrelation;
use crate::physics::ranges::{self, Distribution, MonteCarloJob, UncertainInput};
use crate::scenario::{ErrorDoc, LayerDoc, MaterialDoc, Scenario};
use crate::scenario_winter::{ClimateDoc, SurfaceDoc};

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
    /// Whether the scenario has the part this result comes from.
    pub fn available(self, s: &Scenario) -> bool {
        match self {
            RangeResult::RValue => !s.layers.is_empty(),
            RangeResult::FrostDepth => s.winter.is_some(),
            RangeResult::FrostBelowFooting => s.edge.is_some(),
            RangeResult::ShelterInterior | RangeResult::ShelterMelt => s.shelter.is_some(),
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

// ------------------------------------------------------------------ changing a scenario

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
pub fn set_correlation(s: &mut Scenario, c: SnowCorrelation) {
    let doc = c.into();
    for l in s.layers.iter_mut() {
        if let MaterialDoc::Snow { correlation, .. } = &mut l.material {
            *correlation = doc;
        }
    }
    if let Some(sh) = s.shelter.as_mut() {
        sh.snow_correlation = doc;
    }
    if let Some(SurfaceDoc::Film {
        snow_correlation, ..
    }) = s.winter.as_mut().map(|w| &mut w.surface)
    {
        *snow_correlation = doc;
    }
    if let Some(SurfaceDoc::Film {
        snow_correlation, ..
    }) = s.edge.as_mut().map(|e| &mut e.outside)
    {
        *snow_correlation = doc;
    }
}

// ------------------------------------------------------------------ the plan

/// One task of a study.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Task {
    /// Monte Carlo sample i.
    Sample(usize),
    /// The scenario as written.
    Base,
    /// Input i at its low end (`high` false) or high end, the others as written.
    End { input: usize, high: bool },
    /// The scenario as written under one snow regression.
    Correlation(SnowCorrelation),
}

/// What one task gave: per result, its value or why there is none.
#[derive(Debug, Clone, PartialEq)]
pub struct TaskOutcome {
    pub values: Vec<Result<f64, String>>,
}

/// A checked ranges study, ready to run task by task.
#[derive(Debug, Clone)]
pub struct RangesPlan {
    /// The scenario as written, without its ranges and its least-size searches.
    base: Scenario,
    doc: RangesDoc,
    inputs: Vec<UncertainInput>,
    results: Vec<RangeResult>,
    correlations: Vec<SnowCorrelation>,
    base_values: Vec<Option<f64>>,
}

impl RangesPlan {
    /// Check the scenario's `ranges` section. Errors name `ranges.…` fields.
    pub fn new(s: &Scenario) -> Result<Self, InputErrors> {
        let Some(doc) = s.ranges.clone() else {
            return Err(InputError::new(
                "ranges",
                InputErrorKind::NotCovered("the scenario has no ranges section".into()),
            )
            .into());
        };
        let mut base = s.clone();
        base.ranges = None;
        if let Some(w) = base.winter.as_mut() {
            w.least_thickness = None;
        }
        if let Some(e) = base.edge.as_mut() {
            e.least = None;
        }
        let mut errs = InputErrors::default();
        if doc.seed > MAX_SEED {
            errs.push(
                "ranges.seed",
                InputErrorKind::NotCovered(format!("the seed must be 0 to {MAX_SEED}")),
            );
        }
        let results: Vec<RangeResult> = if doc.results.is_empty() {
            RangeResult::ALL
                .into_iter()
                .filter(|r| r.available(&base))
                .collect()
        } else {
            for (i, r) in doc.results.iter().enumerate() {
                if !r.available(&base) {
                    errs.push(
                        format!("ranges.results[{i}]"),
                        InputErrorKind::NotCovered(format!(
                            "{} needs the part of the scenario it comes from",
                            r.name()
                        )),
                    );
                }
                if doc.results[..i].contains(r) {
                    errs.push(
                        format!("ranges.results[{i}]"),
                        InputErrorKind::NotCovered("listed twice".into()),
                    );
                }
            }
            doc.results.clone()
        };
        if results.is_empty() {
            errs.push(
                "ranges.results",
                InputErrorKind::NotCovered("the scenario has no result to give a range for".into()),
            );
        }
        let inputs: Vec<UncertainInput> = doc
            .inputs
            .iter()
            .map(|d| UncertainInput {
                id: match d.layer {
                    Some(k) => format!("{} (layer {})", d.what.id(), k + 1),
                    None => d.what.id().to_string(),
                },
                low: d.low,
                high: d.high,
                distribution: d.distribution.into(),
            })
            .collect();
        // The ranges themselves (ends, modes, runs). The ids are made from `what` and
        // `layer`, whose repeats are named below, at `what`.
        if let Err(e) = MonteCarloJob::new(&inputs, doc.runs, doc.seed, "ranges") {
            errs.0
                .extend(e.0.into_iter().filter(|e| !e.field.ends_with(".id")));
        }
        // Each input must change something, at both ends, and the scenario must accept it.
        let mut base_values = Vec::with_capacity(doc.inputs.len());
        for (i, d) in doc.inputs.iter().enumerate() {
            let f = format!("ranges.inputs[{i}]");
            base_values.push(base_value(&base, d.what, d.layer));
            if let Some(k) = d.layer {
                if k >= base.layers.len() {
                    errs.push(
                        format!("{f}.layer"),
                        InputErrorKind::NotCovered(format!(
                            "the stack has {} layers; this names layer {}",
                            base.layers.len(),
                            k + 1
                        )),
                    );
                    continue;
                }
            }
            let mut t = base.clone();
            match apply(&mut t, d.what, d.layer, 0.5 * (d.low + d.high)) {
                Ok(0) => errs.push(
                    match d.layer {
                        Some(_) => format!("{f}.layer"),
                        None => format!("{f}.what"),
                    },
                    InputErrorKind::NotCovered(format!(
                        "nothing in {} has a {} to vary",
                        match d.layer {
                            Some(k) => format!("layer {}", k + 1),
                            None => "this scenario".into(),
                        },
                        d.what.name().to_lowercase()
                    )),
                ),
                Ok(_) => {}
                Err(why) => errs.push(format!("{f}.low"), InputErrorKind::NotCovered(why)),
            }
            if doc.inputs[..i]
                .iter()
                .any(|o| o.what == d.what && o.layer == d.layer)
            {
                errs.push(
                    format!("{f}.what"),
                    InputErrorKind::NotCovered("this input is listed twice".into()),
                );
            }
        }
        errs.into_result()?;
        let correlations = if results.iter().any(|&r| result_has_snow(&base, r)) {
            SnowCorrelation::ALL.to_vec()
        } else {
            Vec::new()
        };
        Ok(Self {
            base,
            doc,
            inputs,
            results,
            correlations,
            base_values,
        })
    }

    pub fn runs(&self) -> usize {
        self.doc.runs
    }
    pub fn seed(&self) -> u64 {
        self.doc.seed
    }
    pub fn results(&self) -> &[RangeResult] {
        &self.results
    }
    pub fn inputs(&self) -> &[UncertainInput] {
        &self.inputs
    }
    /// The snow regressions the spread is taken over (none when there is no snow).
    pub fn correlations(&self) -> &[SnowCorrelation] {
        &self.correlations
    }

    /// Number of tasks: runs + 1 + 2 × inputs + regressions.
    pub fn task_count(&self) -> usize {
        self.doc.runs + 1 + 2 * self.inputs.len() + self.correlations.len()
    }

    /// Task `k` (None past the last).
    pub fn task(&self, k: usize) -> Option<Task> {
        let runs = self.doc.runs;
        let n = self.inputs.len();
        if k < runs {
            Some(Task::Sample(k))
        } else if k == runs {
            Some(Task::Base)
        } else if k < runs + 1 + 2 * n {
            let j = k - runs - 1;
            Some(Task::End {
                input: j / 2,
                high: j % 2 == 1,
            })
        } else {
            self.correlations
                .get(k - runs - 1 - 2 * n)
                .map(|&c| Task::Correlation(c))
        }
    }

    /// The input values of Monte Carlo sample `i`, SI.
    pub fn sample(&self, i: usize) -> Vec<f64> {
        ranges::sample_at(&self.inputs, self.doc.seed, i as u64)
    }

    /// The scenario task `k` runs.
    pub fn scenario_for(&self, task: Task) -> Result<Scenario, String> {
        let mut s = self.base.clone();
        let set = |s: &mut Scenario, i: usize, v: f64| {
            let d = &self.doc.inputs[i];
            apply(s, d.what, d.layer, v).map(|_| ())
        };
        match task {
            Task::Sample(i) => {
                for (j, v) in self.sample(i).into_iter().enumerate() {
                    set(&mut s, j, v)?;
                }
            }
            Task::Base => {}
            Task::End { input, high } => {
                let inp = &self.inputs[input];
                set(&mut s, input, if high { inp.high } else { inp.low })?;
            }
            Task::Correlation(c) => set_correlation(&mut s, c),
        }
        Ok(s)
    }

    /// Run task `k`: each result's value, or why it has none. Never panics on a valid
    /// plan; a `k` past the last task gives an outcome of errors.
    pub fn run_task(&self, k: usize) -> TaskOutcome {
        let fail = |why: String| TaskOutcome {
            values: vec![Err(why); self.results.len()],
        };
        let Some(task) = self.task(k) else {
            return fail(format!("there is no task {k}"));
        };
        let s = match self.scenario_for(task) {
            Ok(s) => s,
            Err(why) => return fail(why),
        };
        TaskOutcome {
            values: evaluate_all(&s, &self.results),
        }
    }

    /// Every task's outcome (in task order) into the report. Errs when the count is wrong.
    pub fn assemble(&self, outcomes: &[TaskOutcome]) -> Result<RangesReport, InputErrors> {
        if outcomes.len() != self.task_count()
            || outcomes
                .iter()
                .any(|o| o.values.len() != self.results.len())
        {
            return Err(InputError::new(
                "ranges",
                InputErrorKind::Count {
                    count: outcomes.len(),
                    min: self.task_count(),
                    max: self.task_count(),
                },
            )
            .into());
        }
        let runs = self.doc.runs;
        let n = self.inputs.len();
        let samples: Vec<Vec<f64>> = (0..runs).map(|i| self.sample(i)).collect();
        let mut results = Vec::with_capacity(self.results.len());
        for (r_i, &r) in self.results.iter().enumerate() {
            let value = |k: usize| outcomes[k].values[r_i].clone();
            let mut job = MonteCarloJob::new(&self.inputs, runs, self.doc.seed, "ranges")?;
            for i in 0..runs {
                // A fresh job takes each index once, so this cannot fail.
                let _ = job.record_at(i, value(i));
            }
            let mc = job.result();
            let base = value(runs);
            let sensitivity = (0..n)
                .map(|i| {
                    let at_low = value(runs + 1 + 2 * i);
                    let at_high = value(runs + 2 + 2 * i);
                    let inp = &self.inputs[i];
                    let d = &self.doc.inputs[i];
                    SwingDoc {
                        input: i,
                        what: d.what.id(),
                        name: input_label(d),
                        quantity: d.what.quantity(),
                        low: inp.low,
                        high: inp.high,
                        swing: match (&at_low, &at_high) {
                            (Ok(a), Ok(b)) => Some((b - a).abs()),
                            _ => None,
                        },
                        at_low: at_low.as_ref().ok().copied(),
                        at_high: at_high.as_ref().ok().copied(),
                        error: at_low.err().or(at_high.err()),
                    }
                })
                .collect::<Vec<_>>();
            let mut sensitivity = sensitivity;
            // Largest swing first, failed ones last, ties in the inputs' order.
            sensitivity.sort_by(|a, b| {
                b.swing
                    .unwrap_or(f64::NEG_INFINITY)
                    .total_cmp(&a.swing.unwrap_or(f64::NEG_INFINITY))
            });
            let spread = result_has_snow(&self.base, r).then(|| {
                let mut members = Vec::new();
                let mut skipped = Vec::new();
                for (j, &c) in self.correlations.iter().enumerate() {
                    match value(runs + 1 + 2 * n + j) {
                        Ok(v) => members.push(MemberDoc {
                            id: c.id(),
                            name: c.name(),
                            short: c.short_name(),
                            value: v,
                        }),
                        Err(why) => skipped.push(ErrorDoc::plain(c.id(), why)),
                    }
                }
                let lo = members
                    .iter()
                    .map(|m| m.value)
                    .fold(f64::INFINITY, f64::min);
                let hi = members
                    .iter()
                    .map(|m| m.value)
                    .fold(f64::NEG_INFINITY, f64::max);
                SpreadDoc {
                    min: (!members.is_empty()).then_some(lo),
                    max: (!members.is_empty()).then_some(hi),
                    members,
                    skipped,
                }
            });
            let (stats, mc_error) = match mc {
                Ok(m) => (Some(m), None),
                Err(e) => (None, Some(e.to_string())),
            };
            let past_limit = r.limit().map(|(limit, meaning)| PastLimitDoc {
                limit,
                meaning,
                runs: stats
                    .as_ref()
                    .map_or(0, |m| m.values.iter().filter(|&&v| v > limit).count()),
                of: stats.as_ref().map_or(0, |m| m.values.len()),
                base_past: base.as_ref().ok().map(|&b| b > limit),
            });
            results.push(RangeResultReport {
                id: r.id(),
                name: r.name(),
                quantity: r.quantity(),
                base: base.as_ref().ok().copied(),
                base_error: base.err(),
                p10: stats.as_ref().map(|m| m.p10),
                p50: stats.as_ref().map(|m| m.p50),
                p90: stats.as_ref().map(|m| m.p90),
                mean: stats.as_ref().map(|m| m.mean),
                sd: stats.as_ref().map(|m| m.sd),
                min: stats.as_ref().map(|m| m.min),
                max: stats.as_ref().map(|m| m.max),
                runs_ok: stats.as_ref().map_or(0, |m| m.values.len()),
                runs_failed: stats.as_ref().map_or(runs, |m| m.failures.len()),
                failures: stats.as_ref().map_or_else(Vec::new, |m| {
                    m.failures
                        .iter()
                        .take(LISTED_FAILURES)
                        .map(|f| ErrorDoc::plain(format!("run {}", f.index + 1), f.message.clone()))
                        .collect()
                }),
                error: mc_error,
                spread,
                sensitivity,
                past_limit,
            });
        }
        let trials = (0..runs)
            .map(|i| TrialDoc {
                run: i,
                inputs: samples[i].clone(),
                values: outcomes[i]
                    .values
                    .iter()
                    .map(|v| v.as_ref().ok().copied().filter(|x| x.is_finite()))
                    .collect(),
            })
            .collect();
        Ok(RangesReport {
            runs,
            seed: self.doc.seed,
            sampler: "pcg32, inverse distribution functions, plain Monte Carlo",
            inputs: self
                .doc
                .inputs
                .iter()
                .zip(&self.base_values)
                .map(|(d, b)| RangedInputReport {
                    what: d.what.id(),
                    name: input_label(d),
                    quantity: d.what.quantity(),
                    layer: d.layer,
                    low: d.low,
                    high: d.high,
                    distribution: d.distribution,
                    base_value: *b,
                })
                .collect(),
            results,
            trials,
        })
    }
}

fn input_label(d: &RangedInputDoc) -> String {
    match d.layer {
        Some(k) => format!("{} (layer {})", d.what.name(), k + 1),
        None => d.what.name().to_string(),
    }
}

/// One result of one scenario (the parts it needs only).
pub fn evaluate(s: &Scenario, r: RangeResult) -> Result<f64, String> {
    evaluate_all(s, &[r]).remove(0)
}

/// Each of `results` for one scenario, running each part it needs once (the steady stack
/// serves the R-value and the winter; the shelter's two results come from one shelter run).
pub fn evaluate_all(s: &Scenario, results: &[RangeResult]) -> Vec<Result<f64, String>> {
    let msg = |e: InputErrors| e.to_string();
    let mut steady: Option<Result<crate::scenario::Computed, String>> = None;
    let mut shelter: Option<Result<crate::scenario_shelter::ShelterReport, String>> = None;
    results
        .iter()
        .map(|&r| match r {
            RangeResult::RValue => steady
                .get_or_insert_with(|| crate::scenario::compute(s).map_err(msg))
                .as_ref()
                .map(|c| c.result.r_total_m2k_per_w)
                .map_err(Clone::clone),
            RangeResult::FrostDepth => {
                let w = s.winter.as_ref().ok_or("the scenario has no winter")?;
                let c = steady
                    .get_or_insert_with(|| crate::scenario::compute(s).map_err(msg))
                    .as_ref()
                    .map_err(Clone::clone)?;
                crate::scenario_winter::run_winter(w, &c.result.stack, &s.layers)
                    .map(|r| r.max_frost_depth_m)
                    .map_err(msg)
            }
            RangeResult::FrostBelowFooting => {
                let e = s.edge.as_ref().ok_or("the scenario has no building edge")?;
                crate::scenario_edge::run_edge_scenario(e)
                    .map(|r| r.max_frost_below_base_m)
                    .map_err(msg)
            }
            RangeResult::ShelterInterior | RangeResult::ShelterMelt => {
                let report = shelter.get_or_insert_with(|| {
                    let sh = s.shelter.as_ref().ok_or("the scenario has no shelter")?;
                    crate::scenario_shelter::run_shelter(sh).map_err(msg)
                });
                let report = report.as_ref().map_err(Clone::clone)?;
                Ok(if r == RangeResult::ShelterMelt {
                    report.melt_kg_per_h
                } else {
                    report.interior_c
                })
            }
        })
        .collect()
}

/// Run every task of a plan on up to `threads` threads (1 on wasm) and assemble the report.
/// Tasks are split by stride, so the report is the same for any number of threads.
pub fn run_plan(plan: &RangesPlan, threads: usize) -> Result<RangesReport, InputErrors> {
    let count = plan.task_count();
    let threads = threads.clamp(1, 64).min(count.max(1));
    let mut outcomes: Vec<Option<TaskOutcome>> = vec![None; count];
    if threads == 1 || cfg!(target_arch = "wasm32") {
        for (k, o) in outcomes.iter_mut().enumerate() {
            *o = Some(plan.run_task(k));
        }
    } else {
        let parts: Vec<Vec<(usize, TaskOutcome)>> = std::thread::scope(|scope| {
            let handles: Vec<_> = (0..threads)
                .map(|t| {
                    scope.spawn(move || {
                        (t..count)
                            .step_by(threads)
                            .map(|k| (k, plan.run_task(k)))
                            .collect::<Vec<_>>()
                    })
                })
                .collect();
            handles
                .into_iter()
                .map(|h| h.join().unwrap_or_default())
                .collect()
        });
        for (k, o) in parts.into_iter().flatten() {
            outcomes[k] = Some(o);
        }
    }
    let outcomes: Vec<TaskOutcome> = outcomes
        .into_iter()
        .enumerate()
        .map(|(k, o)| {
            o.unwrap_or_else(|| TaskOutcome {
                values: vec![Err(format!("task {k} did not run")); plan.results.len()],
            })
        })
        .collect();
    plan.assemble(&outcomes)
}

/// Check and run a scenario's ranges section (threads as in [`run_plan`]).
pub fn run_ranges(s: &Scenario, threads: usize) -> Result<RangesReport, InputErrors> {
    run_plan(&RangesPlan::new(s)?, threads)
}

// ------------------------------------------------------------------ the report

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RangedInputReport {
    pub what: &'static str,
    pub name: String,
    pub quantity: &'static str,
    pub layer: Option<usize>,
    pub low: f64,
    pub high: f64,
    pub distribution: DistributionDoc,
    /// The scenario's own value (the base case), SI.
    pub base_value: Option<f64>,
}

/// One regression's value for the base case.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MemberDoc {
    pub id: &'static str,
    pub name: &'static str,
    /// The first author alone, for chart labels.
    pub short: &'static str,
    pub value: f64,
}

/// The spread across the snow regressions for the base case.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SpreadDoc {
    pub min: Option<f64>,
    pub max: Option<f64>,
    pub members: Vec<MemberDoc>,
    /// Regressions that gave no value (e.g. the density lies outside their fit).
    pub skipped: Vec<ErrorDoc>,
}

/// One input's swing in the one-at-a-time study.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SwingDoc {
    pub input: usize,
    pub what: &'static str,
    pub name: String,
    pub quantity: &'static str,
    pub low: f64,
    pub high: f64,
    pub at_low: Option<f64>,
    pub at_high: Option<f64>,
    /// |at_high − at_low|; None when an end failed.
    pub swing: Option<f64>,
    pub error: Option<String>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RangeResultReport {
    pub id: &'static str,
    pub name: &'static str,
    pub quantity: &'static str,
    /// The base case's value, SI.
    pub base: Option<f64>,
    pub base_error: Option<String>,
    pub p10: Option<f64>,
    pub p50: Option<f64>,
    pub p90: Option<f64>,
    pub mean: Option<f64>,
    pub sd: Option<f64>,
    pub min: Option<f64>,
    pub max: Option<f64>,
    pub runs_ok: usize,
    pub runs_failed: usize,
    /// The first failed runs (at most [`LISTED_FAILURES`]).
    pub failures: Vec<ErrorDoc>,
    /// Why there are no statistics (every run failed).
    pub error: Option<String>,
    /// None when the result's part of the scenario has no snow.
    pub spread: Option<SpreadDoc>,
    /// Largest swing first.
    pub sensitivity: Vec<SwingDoc>,
    /// For a result with a limit ([`RangeResult::limit`]): how many runs went past it.
    pub past_limit: Option<PastLimitDoc>,
}

/// How many Monte Carlo runs put a result past its limit (value > limit).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PastLimitDoc {
    /// The limit, SI (0: the footing's base, or no melt).
    pub limit: f64,
    /// What going past it means, e.g. "frost gets below the footing's base".
    pub meaning: &'static str,
    /// Runs past the limit, out of the runs that gave a value.
    pub runs: usize,
    pub of: usize,
    /// Whether the base case is past it.
    pub base_past: Option<bool>,
}

/// One Monte Carlo run: its inputs and its results (None where it failed).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TrialDoc {
    pub run: usize,
    pub inputs: Vec<f64>,
    pub values: Vec<Option<f64>>,
}

/// The report of a ranges study (SI).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RangesReport {
    pub runs: usize,
    pub seed: u64,
    pub sampler: &'static str,
    pub inputs: Vec<RangedInputReport>,
    pub results: Vec<RangeResultReport>,
    pub trials: Vec<TrialDoc>,
}

// ------------------------------------------------------------------ CSV

fn unit_symbol(q: &str, sys: crate::physics::units::UnitSystem) -> String {
    crate::physics::units::quantity(q).map_or_else(String::new, |q| q.unit(sys).symbol.to_string())
}

fn shown(q: &str, sys: crate::physics::units::UnitSystem, v: f64) -> String {
    match crate::physics::units::quantity(q) {
        Some(q) => {
            let places = usize::from(q.unit(sys).decimals) + 2;
            format!("{:.places$}", q.show(sys, v))
        }
        None => format!("{v}"),
    }
}

fn heading(name: &str, q: &str, sys: crate::physics::units::UnitSystem) -> String {
    let sym = unit_symbol(q, sys);
    let h = if sym.is_empty() {
        name.to_string()
    } else {
        format!("{name} [{sym}]")
    };
    csv_field(&h)
}

fn csv_field(s: &str) -> String {
    if s.contains([',', '"', '\n']) {
        format!("\"{}\"", s.replace('"', "\"\""))
    } else {
        s.to_string()
    }
}

/// Every Monte Carlo run as CSV: run number, the seed, each input and each result (units
/// in the headings; a failed result is left empty).
pub fn trials_csv(r: &RangesReport, sys: crate::physics::units::UnitSystem) -> String {
    let mut out = String::from("run,seed");
    for i in &r.inputs {
        out.push(',');
        out.push_str(&heading(&i.name, i.quantity, sys));
    }
    for res in &r.results {
        out.push(',');
        out.push_str(&heading(res.name, res.quantity, sys));
    }
    out.push('\n');
    for t in &r.trials {
        out.push_str(&format!("{},{}", t.run + 1, r.seed));
        for (v, i) in t.inputs.iter().zip(&r.inputs) {
            out.push(',');
            out.push_str(&shown(i.quantity, sys, *v));
        }
        for (v, res) in t.values.iter().zip(&r.results) {
            out.push(',');
            if let Some(v) = v {
                out.push_str(&shown(res.quantity, sys, *v));
            }
        }
        out.push('\n');
    }
    out
}

/// One row per result: the base case, P10, P50, P90, mean, sd, min, max, the runs, the
/// seed and the spread across the snow regressions (units in the unit column).
pub fn summary_csv(r: &RangesReport, sys: crate::physics::units::UnitSystem) -> String {
    let mut out = String::from(
        "result,unit,base case,P10,P50,P90,mean,sd,min,max,runs,failed runs,seed,regressions low,regressions high,runs past the limit,past the limit means\n",
    );
    for res in &r.results {
        let q = res.quantity;
        let opt = |v: Option<f64>| v.map_or_else(String::new, |v| shown(q, sys, v));
        // A spread is a difference: no offset.
        let sd = res
            .sd
            .map_or_else(String::new, |v| match crate::physics::units::quantity(q) {
                Some(qq) => {
                    let places = usize::from(qq.unit(sys).decimals) + 2;
                    format!("{:.places$}", qq.show(sys, v) - qq.show(sys, 0.0))
                }
                None => format!("{v}"),
            });
        out.push_str(&format!(
            "{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{}\n",
            csv_field(res.name),
            csv_field(&unit_symbol(q, sys)),
            opt(res.base),
            opt(res.p10),
            opt(res.p50),
            opt(res.p90),
            opt(res.mean),
            sd,
            opt(res.min),
            opt(res.max),
            r.runs,
            res.runs_failed,
            r.seed,
            opt(res.spread.as_ref().and_then(|s| s.min)),
            opt(res.spread.as_ref().and_then(|s| s.max)),
            res.past_limit
                .as_ref()
                .map_or_else(String::new, |p| p.runs.to_string()),
            res.past_limit
                .as_ref()
                .map_or_else(String::new, |p| csv_field(p.meaning)),
        ));
    }
    out
}

/// A few lines for a terminal: per result the base case, P10, P50, P90 and the spread
/// across the snow regressions, with the runs, the seed and the time taken.
pub fn summary_text(
    r: &RangesReport,
    sys: crate::physics::units::UnitSystem,
    took: std::time::Duration,
) -> String {
    let mut out = format!(
        "ranges: {} runs, seed {}, {:.1} s",
        r.runs,
        r.seed,
        took.as_secs_f64()
    );
    for res in &r.results {
        let q = res.quantity;
        let sym = unit_symbol(q, sys);
        let v = |x: Option<f64>| x.map_or_else(|| "-".to_string(), |x| shown(q, sys, x));
        out.push_str(&format!(
            "\n  {}: base {}, P10 {}, P50 {}, P90 {} {sym}",
            res.name,
            v(res.base),
            v(res.p10),
            v(res.p50),
            v(res.p90)
        ));
        if res.runs_failed > 0 {
            out.push_str(&format!(" ({} runs failed)", res.runs_failed));
        }
        if let Some(sp) = &res.spread {
            out.push_str(&format!(
                "; snow regressions {} to {} {sym}",
                v(sp.min),
                v(sp.max)
            ));
        }
        if let Some(p) = &res.past_limit {
            out.push_str(&format!("; {} in {} of {} runs", p.meaning, p.runs, p.of));
        }
    }
    out
}
