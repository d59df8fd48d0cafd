//! The winter section of the scenario document (format version 2): what drives a transient
//! run of the same stack, and the report of that run.
//!
//! - **The section** ([`WinterDoc`]): the climate (a sinusoid, a design winter or daily
//!   records, with an optional snow season), the surface (a film or n-factors), the deep
//!   boundary, the start (uniform, spun up, or periodic), the grid ([`GridDoc`], default 1
//!   cm at the surface growing by 1.05 to 25 cm), the step and the run's length, and an
//!   optional `least_thickness` search. A soil's optional `unfrozen_water` {α, β} (Anderson
//!   & Tice) makes it freeze over a range in the winter run; the steady part freezes at 0
//!   °C. Every check names its field (`winter.grid.surface_cell_m`); a grid of more than
//!   [`MAX_CELLS`] cells or a run longer than [`MAX_RUN_DAYS`] is refused.
//! - **The run** ([`WinterJob`]: `new`, `advance(max_steps)`, `progress`, `finish`;
//!   [`run_winter`] drives one to the end): the core's sliced run
//!   ([`crate::physics::transient::run::Run`]).
//! - **The report** ([`WinterReport`]): the deepest frost and its day, the air and surface
//!   freezing indices, the daily series, the envelope, the layer faces and names, the work
//!   counters, the energy imbalance, warnings (a start that did not settle, snow under an
//!   n-factor surface) and the daily profiles, which stay out of the JSON. Daily values are
//!   those at the end of each day, except the ground heat flux: the mean over the day
//!   (within a day it swings as the air steps from one daily value to the next).
//! - **Hand methods** beside the run ([`HandMethodRow`], ids `stefan`, `stefan-resistance`,
//!   `berggren`, `transient`): Stefan's law for the first freezing layer, Stefan's law
//!   under the layers above it as a resistance, modified Berggren through every layer, and
//!   the run itself, each from the run's ground-surface freezing index (over several
//!   winters, that of the winter with the largest, and its season: [`crate::physics::hand`]).
//! - **CSV**: [`daily_csv_in`] (the daily series in either unit system, dated when the
//!   climate is daily records; [`daily_csv`] in SI) and [`profiles_csv`] (a row per kept day, a column per cell centre), units in the
//!   headers; the CLI's `--csv` and `--profiles-csv`, and the page's buttons.
//! - **The least thickness** ([`LeastThicknessDoc`], [`LeastThicknessReport`]) lives here
//!   with its section; its sliced job is in [`crate::document::winter_least`].

use super::weather::{ClimateDoc, DeepDoc, SurfaceDoc};
use crate::document::vocabulary::{ErrorDoc, LayerDoc, MaterialDoc};
use crate::physics::climate::{AnnualWave, Climate, DailySeries, DayRecord, SnowSeason};
use crate::physics::error::{check, InputError, InputErrorKind, InputErrors};
use crate::physics::hand::{self, BerggrenNotApplicable};
use crate::physics::least::{FrostLimit, Search, Trial};
use crate::physics::materials::Material;
use crate::physics::stack::ResolvedStack;
use crate::physics::transient::grid::GridSpec;
use crate::physics::transient::periodic::deep_ground_extension_m;
use crate::physics::transient::phase::UnfrozenWater;
use crate::physics::transient::run::RunResult;
use crate::physics::transient::setup::{Forcing, Initial, RunSpec, TopModel};
use crate::physics::transient::{run, BottomCondition};
use schemars::JsonSchema;
use serde::{Deserialize, Serialize};

/// At most this many runs in one search.
pub const MAX_RUNS: usize = 16;

/// Most cells a winter run may use.
pub const MAX_CELLS: usize = 2000;

/// Longest run, days.
pub const MAX_RUN_DAYS: f64 = 30.0 * 365.0;

/// A winter run of the stack.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct WinterDoc {
    pub climate: ClimateDoc,
    pub surface: SurfaceDoc,
    pub bottom: DeepDoc,
    pub initial: InitialDoc,
    #[serde(default)]
    pub grid: Option<GridDoc>,
    /// Time step, s (default one hour).
    #[serde(default = "default_step")]
    pub step_s: f64,
    /// Length of the run, days (default: the climate's own length).
    #[serde(default)]
    pub duration_days: Option<f64>,
    /// Also find the least thickness of one layer that keeps frost above a limit.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub least_thickness: Option<crate::document::winter::LeastThicknessDoc>,
}

fn default_step() -> f64 {
    3600.0
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(tag = "kind", rename_all = "kebab-case", deny_unknown_fields)]
pub enum InitialDoc {
    Uniform {
        temperature_c: f64,
    },
    /// Repeat the first year until it repeats itself (periodic steady state), from a
    /// uniform `start_c` or, with `from_periodic`, from the periodic start.
    SpinUp {
        start_c: f64,
        max_years: u32,
        #[serde(default, skip_serializing_if = "std::ops::Not::not")]
        from_periodic: bool,
    },
    /// The periodic profile of conduction (no freezing) under the climate's mean annual
    /// temperature and annual wave, the surface model and the deep boundary.
    Periodic {},
}

#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct GridDoc {
    pub surface_cell_m: f64,
    pub growth_ratio: f64,
    pub max_cell_m: f64,
}

impl Default for GridDoc {
    fn default() -> Self {
        GridDoc {
            surface_cell_m: 0.01,
            growth_ratio: 1.05,
            max_cell_m: 0.25,
        }
    }
}

impl WinterDoc {
    fn climate(&self, errs: &mut InputErrors) -> Option<Climate> {
        let f = "winter.climate";
        let c = match &self.climate {
            ClimateDoc::Sinusoid {
                mean_c,
                amplitude_k,
                coldest_day_of_year,
                snow,
            } => Climate::Sinusoid {
                mean_c: *mean_c,
                amplitude_k: *amplitude_k,
                coldest_day_of_year: *coldest_day_of_year,
                snow: snow.map(SnowSeason::from),
            },
            ClimateDoc::DesignWinter {
                freezing_index_c_days,
                season_days,
                mean_annual_c,
                snow,
            } => Climate::DesignWinter {
                freezing_index_c_days: *freezing_index_c_days,
                season_days: *season_days,
                mean_annual_c: *mean_annual_c,
                snow: snow.map(SnowSeason::from),
            },
            ClimateDoc::Daily { days } => {
                let mut records = Vec::with_capacity(days.len());
                for (i, d) in days.iter().enumerate() {
                    match chrono::NaiveDate::parse_from_str(&d.date, "%Y-%m-%d") {
                        Ok(date) => records.push(DayRecord {
                            date,
                            mean_air_c: d.mean_air_c,
                            snow_depth_m: d.snow_depth_m,
                            snow_density_kg_m3: d.snow_density_kg_m3,
                        }),
                        Err(_) => errs.push(
                            format!("{f}.days[{i}].date"),
                            InputErrorKind::Format(format!(
                                "'{}' is not a date written YYYY-MM-DD",
                                d.date.chars().take(40).collect::<String>()
                            )),
                        ),
                    }
                }
                if !errs.is_empty() {
                    return None;
                }
                match DailySeries::new(records) {
                    Ok(s) => Climate::Series(s),
                    Err(e) => {
                        errs.0.extend(e.0.into_iter().map(|mut x| {
                            x.field = format!("{f}.{}", x.field);
                            x
                        }));
                        return None;
                    }
                }
            }
        };
        match c.validate(f) {
            Ok(()) => Some(c),
            Err(e) => {
                errs.0.extend(e.0);
                None
            }
        }
    }

    /// Check the section and build the run for a resolved stack; `layers` are the
    /// scenario's layers (for their unfrozen-water curves).
    pub fn run_spec(
        &self,
        stack: &ResolvedStack,
        layers: &[LayerDoc],
    ) -> Result<(RunSpec, Climate), InputErrors> {
        let mut errs = InputErrors::default();
        let curves = unfrozen_curves(layers, &mut errs);
        let climate = self.climate(&mut errs);
        let top = match self.surface {
            SurfaceDoc::Film {
                film_w_m2k,
                snow_regression,
            } => {
                check::within(
                    &mut errs,
                    "winter.surface.film_w_m2k",
                    film_w_m2k,
                    0.1,
                    1000.0,
                    "W/m²K",
                );
                TopModel::AirFilm {
                    film_w_m2k,
                    snow_regression: snow_regression.into(),
                }
            }
            SurfaceDoc::NFactor {
                freezing,
                thawing,
                ref preset,
            } => {
                if let Some(id) = preset {
                    if crate::physics::climate::Surface::from_id(id).is_none() {
                        errs.push(
                            "winter.surface.preset",
                            InputErrorKind::Format(format!(
                                "'{}' is not a surface with a published n-factor; known: {}",
                                id.chars().take(40).collect::<String>(),
                                crate::physics::climate::Surface::ALL
                                    .iter()
                                    .map(|s| s.id())
                                    .collect::<Vec<_>>()
                                    .join(", ")
                            )),
                        );
                    }
                }
                check::within(
                    &mut errs,
                    "winter.surface.freezing",
                    freezing,
                    0.05,
                    2.0,
                    "",
                );
                check::within(&mut errs, "winter.surface.thawing", thawing, 0.05, 3.0, "");
                TopModel::NFactor { freezing, thawing }
            }
        };
        let bottom = match self.bottom {
            DeepDoc::Temperature { temperature_c, .. } => {
                check::within(
                    &mut errs,
                    "winter.bottom.temperature_c",
                    temperature_c,
                    -60.0,
                    60.0,
                    "°C",
                );
                BottomCondition::Temperature { temperature_c }
            }
            DeepDoc::Flux { upward_w_m2, .. } => {
                check::within(
                    &mut errs,
                    "winter.bottom.upward_w_m2",
                    upward_w_m2,
                    -10.0,
                    10.0,
                    "W/m²",
                );
                BottomCondition::Flux { upward_w_m2 }
            }
        };
        // The periodic start's wave comes from the climate, once that is known (below).
        let initial_with = |wave: AnnualWave| match self.initial {
            InitialDoc::Uniform { temperature_c } => Initial::Uniform(temperature_c),
            InitialDoc::SpinUp {
                start_c,
                max_years,
                from_periodic,
            } => Initial::SpinUp {
                start_c,
                max_years,
                from_periodic: from_periodic.then_some(wave),
            },
            InitialDoc::Periodic {} => Initial::Periodic(wave),
        };
        match self.initial {
            InitialDoc::Uniform { temperature_c } => {
                check::within(
                    &mut errs,
                    "winter.initial.temperature_c",
                    temperature_c,
                    -60.0,
                    60.0,
                    "°C",
                );
            }
            InitialDoc::SpinUp {
                start_c, max_years, ..
            } => {
                check::within(
                    &mut errs,
                    "winter.initial.start_c",
                    start_c,
                    -60.0,
                    60.0,
                    "°C",
                );
                if max_years == 0 || max_years > 30 {
                    errs.push(
                        "winter.initial.max_years",
                        InputErrorKind::Count {
                            count: max_years as usize,
                            min: 1,
                            max: 30,
                        },
                    );
                }
            }
            InitialDoc::Periodic {} => {}
        }
        let g = self.grid.unwrap_or_default();
        check::within(
            &mut errs,
            "winter.grid.surface_cell_m",
            g.surface_cell_m,
            1e-3,
            1.0,
            "m",
        );
        check::within(
            &mut errs,
            "winter.grid.growth_ratio",
            g.growth_ratio,
            1.0,
            1.5,
            "",
        );
        check::within(
            &mut errs,
            "winter.grid.max_cell_m",
            g.max_cell_m,
            g.surface_cell_m.max(1e-3),
            2.0,
            "m",
        );
        check::within(&mut errs, "winter.step_s", self.step_s, 60.0, 86_400.0, "s");
        let duration_days = self
            .duration_days
            .or_else(|| climate.as_ref().map(|c| c.duration_s() / 86_400.0))
            .unwrap_or(365.0);
        check::within(
            &mut errs,
            "winter.duration_days",
            duration_days,
            1.0,
            MAX_RUN_DAYS,
            "days",
        );
        errs.clone().into_result()?;
        let grid = GridSpec {
            surface_cell_m: g.surface_cell_m,
            growth_ratio: g.growth_ratio,
            max_cell_m: g.max_cell_m,
        };
        let mut thicknesses: Vec<f64> = stack.layers.iter().map(|l| l.thickness_m).collect();
        let mut materials = stack.materials.clone();
        let mut curves = curves;
        // The deepest layer goes on below the layers given, to where the year's wave has died,
        // unless the bottom is held at the layers' bottom (see `DeepDoc`).
        if !self.bottom.at_layers_bottom() {
            let added = deep_ground_extension_m(&thicknesses, &materials);
            if added > 0.0 {
                if let Some(m) = materials.last().cloned() {
                    let c = curves.get(materials.len() - 1).copied().flatten();
                    curves.resize(materials.len(), None);
                    thicknesses.push(added);
                    materials.push(m);
                    curves.push(c);
                }
            }
        }
        let cells: usize = crate::physics::transient::grid::faces(&thicknesses, &grid)
            .iter()
            .map(|f| f.len() - 1)
            .sum();
        if cells > MAX_CELLS {
            return Err(InputError::new(
                "winter.grid",
                InputErrorKind::Count {
                    count: cells,
                    min: 1,
                    max: MAX_CELLS,
                },
            )
            .into());
        }
        let climate = climate.ok_or_else(|| errs.clone())?;
        let initial = initial_with(climate.annual_wave());
        Ok((
            RunSpec {
                thicknesses_m: thicknesses,
                materials,
                curves,
                grid,
                top,
                bottom,
                initial,
                step_s: self.step_s,
                duration_s: duration_days * 86_400.0,
                profile_every_s: 86_400.0,
            },
            climate,
        ))
    }
}

/// One day of the winter report: values at the end of the day, except the ground heat flux,
/// which is its mean over the day that ends then (the flux swings within a day when the air
/// steps from one daily value to the next; the mean is the heat the day moved). Day 0's
/// flux is the flux at the start (see [`crate::physics::transient::run::Sample`]).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct WinterDay {
    pub day: f64,
    pub air_c: f64,
    pub surface_c: f64,
    pub frost_depth_m: f64,
    pub thaw_depth_m: f64,
    pub ground_flux_w_m2: f64,
    pub snow_depth_m: f64,
}

/// The report of a winter run (SI).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct WinterReport {
    pub max_frost_depth_m: f64,
    pub max_frost_day: f64,
    pub air_freezing_index_c_days: f64,
    pub surface_freezing_index_c_days: f64,
    pub cells: usize,
    pub steps: u64,
    pub iterations_per_step: f64,
    pub split_steps: u64,
    pub spin_up_years: u32,
    pub energy_imbalance_relative: f64,
    pub daily: Vec<WinterDay>,
    /// Cell centres (m) with the lowest and highest temperature each reached.
    pub envelope: Vec<[f64; 3]>,
    /// Depths of the layer faces from the top face down, m (first 0, last the bottom).
    pub layer_faces_m: Vec<f64>,
    pub layer_names: Vec<String>,
    /// Depth of the ground as run, m: the layers given (the last of `layer_faces_m`) and the
    /// ground added below them (the deepest layer continued, see [`DeepDoc`]).
    pub modelled_depth_m: f64,
    /// Frost reached the bottom of the modelled ground: `max_frost_depth_m` is then a lower
    /// bound ("at least"), and a warning says what to change.
    pub frost_at_bottom: bool,
    /// Some ground stayed frozen through a run of a year or more, summer included: the
    /// deepest frost is not a seasonal frost depth (a warning says so).
    pub frozen_all_year: bool,
    /// Depth of the top of the first layer that holds water that can freeze, m (0 when the
    /// top layer does; a slab or a board above it cannot hold frozen ground).
    pub freezable_top_m: f64,
    /// Notes on the run: a model that does not cover part of the input, a start that did
    /// not settle.
    pub warnings: Vec<ErrorDoc>,
    /// The least-thickness search, when the section asks for one and it was run
    /// ([`crate::document::compute::compute_with_winter`] runs it; the page runs it on request).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub least_thickness: Option<crate::document::winter::LeastThicknessReport>,
    /// The hand methods on the same winter and the same layers, beside this run.
    pub hand_methods: Vec<HandMethodRow>,
    /// The temperature of each cell (centres in `envelope`) at the end of each day; left out
    /// of the JSON report (the CLI writes it as CSV on request).
    #[serde(skip)]
    pub profiles: Vec<DayProfile>,
    /// The date of day 0 when the climate is daily records (the daily CSV then dates each
    /// row); `None` for a sine year or a design winter. Left out of the JSON report.
    #[serde(skip)]
    pub start_date: Option<chrono::NaiveDate>,
}

/// One method's deepest frost for the winter run's case.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct HandMethodRow {
    /// `stefan`, `stefan-resistance`, `berggren`, `transient`.
    pub method: &'static str,
    pub name: &'static str,
    /// Deepest frost, m below the top face; absent where the method does not apply.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub depth_m: Option<f64>,
    /// What the method takes and leaves out, or why it does not apply.
    pub note: String,
}

/// The hand methods of [`hand`] on the winter run's own case, so that users see how
/// conservative each is. All take the ground-surface freezing index of the run's design
/// winter (under the snow when there is snow) as the surface index nF, and the layers from
/// the top face down. A run of a year or less is one winter and its index the run's; a
/// longer one is cut into winters ([`hand::surface_winters`], at the warmest moment of the
/// climate's annual wave, `coldest_s` + half a year) and the design winter is the one with
/// the largest index: modified Berggren takes that winter's days below 0 °C as its season
/// (the note counts the winters whose surface freezes).
fn hand_methods(
    r: &RunResult,
    layers: &[(f64, Material)],
    climate_mean_c: f64,
    coldest_s: f64,
) -> Vec<HandMethodRow> {
    let surface: Vec<(f64, f64)> = r.samples.iter().map(|s| (s.time_s, s.surface_c)).collect();
    let season = hand::SurfaceSeason::of(&surface);
    let v0 = season.mean_annual_c(climate_mean_c);
    // The winters of a run longer than one, those whose surface freezes, in order.
    let pieces = hand::surface_winters(&surface, coldest_s);
    let several = pieces.len() > 1;
    let winters: Vec<_> = pieces
        .into_iter()
        .filter(|w| w.freezing_index_k_s > 0.0)
        .collect();
    let design = winters
        .iter()
        .enumerate()
        .max_by(|a, b| a.1.freezing_index_k_s.total_cmp(&b.1.freezing_index_k_s))
        .filter(|_| several);
    let (fs, days_below, which) = match design {
        Some((i, w)) => (
            w.freezing_index_k_s,
            w.days_below,
            format!(
                "; winter {} of {}, days {:.0}–{:.0}, the largest index",
                i + 1,
                winters.len(),
                w.start_s / 86_400.0,
                w.end_s / 86_400.0
            ),
        ),
        None => (
            r.surface_freezing_index_c_days * 86_400.0,
            season.days_below,
            String::new(),
        ),
    };
    let mut rows = Vec::new();
    match hand::first_freezing(layers) {
        Some(first) => {
            let m = &layers[first.index].1;
            let (above, r_above) = (first.above_m, first.r_above_m2k_w);
            rows.push(HandMethodRow {
                method: "stefan",
                name: "Stefan's law",
                depth_m: Some(hand::stefan_m(m, fs)),
                note: format!(
                    "{} alone from the surface, latent heat only{which}",
                    m.label
                ),
            });
            rows.push(HandMethodRow {
                method: "stefan-resistance",
                name: "Stefan's law under the layers above",
                depth_m: Some(above + hand::stefan_under_resistance_m(m, fs, r_above)),
                note: if above > 0.0 {
                    format!(
                        "the {above:.3} m above it as a resistance of {r_above:.2} m²K/W{which}"
                    )
                } else {
                    format!("nothing above it: the same as Stefan's law{which}")
                },
            });
        }
        None => rows.push(HandMethodRow {
            method: "stefan",
            name: "Stefan's law",
            depth_m: None,
            note: "no layer holds water that freezes".into(),
        }),
    }
    rows.push(match hand::berggren_m(layers, fs, v0, days_below) {
        Ok(b) => HandMethodRow {
            method: "berggren",
            name: "Modified Berggren",
            depth_m: Some(b.depth_m),
            note: format!(
                "every layer; λ {:.3}, α {:.2}, season {days_below:.0} days, mean {v0:.1} °C{which}",
                b.lambda, b.alpha
            ),
        },
        Err(why) => HandMethodRow {
            method: "berggren",
            name: "Modified Berggren",
            depth_m: None,
            note: match why {
                BerggrenNotApplicable::SurfaceDoesNotFreeze => {
                    "the ground surface does not freeze".to_string()
                }
                BerggrenNotApplicable::Permafrost { mean_annual_c } => format!(
                    "mean annual temperature {mean_annual_c:.1} °C is below 0 °C (permafrost: \
                     outside the method)"
                ),
                BerggrenNotApplicable::Refused(why) => why,
            },
        },
    });
    rows.push(HandMethodRow {
        method: "transient",
        name: "This run (transient, with freezing)",
        depth_m: Some(r.max_frost_depth_m),
        note: "every layer, sensible and latent heat, snow as it lies".into(),
    });
    rows
}

/// The temperature profile at one instant.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DayProfile {
    pub day: f64,
    /// °C, one per ground cell, top down.
    pub temperature_c: Vec<f64>,
    /// The snow cells: height of each cell centre above the ground surface (m) and its
    /// temperature (°C), from the ground up; empty when there is no snow.
    pub snow_c: Vec<[f64; 2]>,
}

impl WinterReport {
    /// The profile kept nearest to `day`.
    pub fn profile_near(&self, day: f64) -> Option<&DayProfile> {
        self.profiles.iter().min_by(|a, b| {
            (a.day - day)
                .abs()
                .partial_cmp(&(b.day - day).abs())
                .unwrap_or(std::cmp::Ordering::Equal)
        })
    }
}

/// The unfrozen-water curve of each layer (soils that give one), checked.
fn unfrozen_curves(layers: &[LayerDoc], errs: &mut InputErrors) -> Vec<Option<UnfrozenWater>> {
    layers
        .iter()
        .enumerate()
        .map(|(i, l)| match &l.material {
            MaterialDoc::Soil {
                water_content_pct,
                unfrozen_water: Some(u),
                ..
            } => {
                let f = format!("layers[{i}].material.unfrozen_water");
                let ok_a = check::within(errs, &format!("{f}.alpha"), u.alpha, 1e-4, 2.0, "");
                let ok_b = check::within(errs, &format!("{f}.beta"), u.beta, -3.0, -0.01, "");
                (ok_a && ok_b && *water_content_pct > 0.0).then_some(UnfrozenWater {
                    alpha: u.alpha,
                    beta: u.beta,
                    total: water_content_pct / 100.0,
                })
            }
            _ => None,
        })
        .collect()
}

/// A winter run under way, advanced a slice at a time (the page shows its progress and
/// stays responsive); [`run_winter`] drives one to the end.
#[derive(Debug, Clone)]
pub struct WinterJob {
    run: run::Run,
    climate: Climate,
    faces_m: Vec<f64>,
    layer_names: Vec<String>,
    warnings: Vec<ErrorDoc>,
    max_years: u32,
    freezable_top_m: f64,
    hand_layers: Vec<(f64, Material)>,
    climate_mean_c: f64,
    /// The column's depth as run (the layers given and any ground added below them), m.
    modelled_depth_m: f64,
    bottom: DeepDoc,
    /// When the annual wave is coldest, s from the start (where the hand methods' winters
    /// are cut: half a year on).
    climate_coldest_s: f64,
}

fn run_error(e: crate::physics::transient::TransientError) -> InputErrors {
    InputErrors::from(InputError::new(
        "winter",
        InputErrorKind::NotCovered(e.to_string()),
    ))
}

impl WinterJob {
    /// Check the winter section against the resolved stack and set the run up.
    pub fn new(
        w: &WinterDoc,
        stack: &ResolvedStack,
        layers: &[LayerDoc],
    ) -> Result<WinterJob, InputErrors> {
        let (spec, climate) = w.run_spec(stack, layers)?;
        let wave = climate.annual_wave();
        let (climate_mean_c, climate_coldest_s) = (wave.mean_c, wave.coldest_s);
        let run = run::Run::new(&spec).map_err(run_error)?;
        let mut warnings = Vec::new();
        if matches!(spec.top, TopModel::NFactor { .. }) {
            let days = (spec.duration_s / 86_400.0).ceil() as usize;
            let snowy = (0..=days).any(|d| {
                climate
                    .snow(d as f64 * 86_400.0)
                    .is_some_and(|(depth, _)| depth > 0.0)
            });
            if snowy {
                warnings.push(ErrorDoc::plain(
                    "winter.surface",
                    "The climate has snow on the ground, but a surface set by n-factors does not \
                     model it: the n-factor already stands for the surface and its cover. Choose \
                     a surface film to model the snow as layers of its own.",
                ));
            }
        }
        let max_years = match spec.initial {
            Initial::SpinUp { max_years, .. } => max_years,
            _ => 0,
        };
        let mut faces_m = vec![0.0];
        for l in &stack.layers {
            faces_m.push(faces_m.last().copied().unwrap_or(0.0) + l.thickness_m);
        }
        let freezable_top_m = stack
            .materials
            .iter()
            .position(|m| m.freezes)
            .map_or(0.0, |i| faces_m[i]);
        Ok(WinterJob {
            run,
            climate,
            faces_m,
            layer_names: stack.layers.iter().map(|l| l.name.clone()).collect(),
            warnings,
            max_years,
            freezable_top_m,
            hand_layers: spec
                .thicknesses_m
                .iter()
                .copied()
                .zip(spec.materials.iter().cloned())
                .collect(),
            climate_mean_c,
            modelled_depth_m: spec.thicknesses_m.iter().sum(),
            bottom: w.bottom.clone(),
            climate_coldest_s,
        })
    }

    /// Advance by at most `max_steps` time steps; the share of the work done (0–1) and
    /// whether the run has finished.
    pub fn advance(&mut self, max_steps: usize) -> Result<run::Progress, InputErrors> {
        self.run
            .advance(&self.climate, max_steps)
            .map_err(run_error)
    }

    pub fn progress(&self) -> run::Progress {
        self.run.progress()
    }

    /// The report (of the part run, if called before the end).
    pub fn finish(self) -> WinterReport {
        let r = self.run.finish();
        let mut warnings = self.warnings;
        if let (Some(change), Some(trend)) = (r.spin_up_change_k, r.spin_up_trend_k) {
            if change >= UNSETTLED_WARNING_K.max(run::SPIN_UP_TOLERANCE_K) {
                warnings.push(unsettled_start(self.max_years, change, trend));
            }
        }
        // Frost reached the deepest cell's centre: the column froze to its bottom.
        let frost_at_bottom = r.depths_m.last().is_some_and(|&z| r.max_frost_depth_m >= z);
        let given_depth_m = self.faces_m.last().copied().unwrap_or(0.0);
        if frost_at_bottom {
            warnings.push(frost_at_bottom_warning(
                &self.bottom,
                given_depth_m,
                self.modelled_depth_m,
                self.layer_names.last().map_or("", |n| n.as_str()),
            ));
        }
        // Frozen ground at every moment of a run that holds a whole year: the summer did not
        // thaw it, so its depth is not a seasonal frost depth.
        let whole_year = r
            .samples
            .last()
            .is_some_and(|s| s.time_s >= 365.0 * 86_400.0);
        let frozen_all_year = whole_year && r.samples.iter().all(|s| s.frost_depth_m > 0.0);
        if frozen_all_year {
            warnings.push(frozen_all_year_warning(
                r.samples
                    .iter()
                    .map(|s| s.frost_depth_m)
                    .fold(f64::INFINITY, f64::min),
                self.climate_mean_c,
            ));
        }
        let hand = hand_methods(
            &r,
            &self.hand_layers,
            self.climate_mean_c,
            self.climate_coldest_s,
        );
        let mut report = report_of(r, self.faces_m, self.layer_names);
        report.hand_methods = hand;
        report.start_date = match &self.climate {
            Climate::Series(s) => Some(s.first_date()),
            _ => None,
        };
        report.warnings = warnings;
        report.freezable_top_m = self.freezable_top_m;
        report.modelled_depth_m = self.modelled_depth_m;
        report.frost_at_bottom = frost_at_bottom;
        report.frozen_all_year = frozen_all_year;
        report
    }
}

/// A spin-up that stopped at its year limit is reported when the ground still changed by
/// at least this much over its last year, K. Below it the run has not met its own
/// tolerance ([`run::SPIN_UP_TOLERANCE_K`]) but the deepest frost moves by far less than the
/// centimetre it is shown to. A setting of this tool, no source.
pub const UNSETTLED_WARNING_K: f64 = 0.05;

/// The warning for a spin-up that stopped at its year limit, in a builder's words: which
/// way the start still leaned, and what that does to the deepest frost.
fn unsettled_start(max_years: u32, change_k: f64, trend_k: f64) -> ErrorDoc {
    let years = if max_years == 1 { "year" } else { "years" };
    let (still, start, frost) = if trend_k < 0.0 {
        ("cooling", "warmer", "shallower than it would be")
    } else {
        ("warming", "colder", "deeper than it would be")
    };
    ErrorDoc::plain(
        "winter.initial.max_years",
        format!(
            "The ground had not settled into a repeating year when this winter began: after \
             {max_years} warm-up {years} it still changed by up to {change_k:.2} K from one year \
             to the next, and it was still {still}. The start is therefore {start} than this \
             climate would leave the ground, and the deepest frost shown is likely {frost} \
             once the ground has settled. Allow more warm-up years, or begin from the periodic \
             start or from a temperature nearer the ground's yearly mean."
        ),
    )
}

/// The warning when frost reached the bottom of the modelled ground: the deepest frost is only
/// a lower bound; what to change.
fn frost_at_bottom_warning(
    bottom: &DeepDoc,
    given_depth_m: f64,
    modelled_depth_m: f64,
    last_layer: &str,
) -> ErrorDoc {
    let mut text = if modelled_depth_m > given_depth_m + 1e-9 {
        format!(
            "Frost reached the bottom of the modelled ground, {modelled_depth_m:.2} m down (the \
             {given_depth_m:.2} m of layers given, and {:.2} m more of \"{last_layer}\" added \
             below them): the frost goes at least that deep and may go deeper.",
            modelled_depth_m - given_depth_m
        )
    } else {
        format!(
            "Frost reached the bottom of the layers given, {given_depth_m:.2} m down, where the \
             deep condition is held: the frost goes at least that deep and may go deeper. Let \
             the run add ground below the layers (do not hold the deep condition at the \
             layers' bottom), or add deeper layers."
        )
    };
    if let DeepDoc::Temperature { temperature_c, .. } = *bottom {
        if temperature_c <= 0.0 {
            text.push_str(&format!(
                " The deep ground is held at {temperature_c:.1} °C, at or below freezing, so it \
                 is frozen by the condition itself: set the deep temperature to the ground's \
                 measured one."
            ));
        }
    }
    text.push_str(
        " Check the climate and the deep boundary; where they are right, treat the frost depth \
         as unknown beyond this depth.",
    );
    ErrorDoc::plain("winter.bottom", text)
}

/// The warning when some ground stayed frozen through a whole run, summer included.
fn frozen_all_year_warning(least_frozen_depth_m: f64, climate_mean_c: f64) -> ErrorDoc {
    let mut text = format!(
        "Ground stayed frozen through the whole run, summer included (at every moment frozen \
         ground reached {least_frozen_depth_m:.2} m down or deeper): the deepest frost is then not a seasonal frost \
         depth but ground that does not thaw."
    );
    if climate_mean_c < 0.0 {
        text.push_str(&format!(
            " The climate's mean temperature is {climate_mean_c:.1} °C, below freezing: ground \
             that stays frozen from year to year (permafrost) is outside this model of seasonal \
             frost. Check the climate, and seek site-specific advice for building on \
             permafrost."
        ));
    } else {
        text.push_str(
            " Check the climate's mean temperature, the deep boundary and the start (a start \
             colder than the climate leaves frozen ground that one summer cannot thaw).",
        );
    }
    ErrorDoc::plain("winter.climate", text)
}

/// Run the winter and build its report.
pub fn run_winter(
    w: &WinterDoc,
    stack: &ResolvedStack,
    layers: &[LayerDoc],
) -> Result<WinterReport, InputErrors> {
    let mut job = WinterJob::new(w, stack, layers)?;
    while !job.advance(usize::MAX)?.finished {}
    Ok(job.finish())
}

fn report_of(r: RunResult, faces_m: Vec<f64>, layer_names: Vec<String>) -> WinterReport {
    let mut daily = Vec::new();
    let mut next = 0.0;
    let (mut flux_sum, mut flux_n) = (0.0, 0usize);
    for (k, s) in r.samples.iter().enumerate() {
        if k > 0 {
            flux_sum += s.ground_flux_w_m2;
            flux_n += 1;
        }
        if s.time_s >= next - 1e-6 {
            let ground_flux_w_m2 = if flux_n > 0 {
                flux_sum / flux_n as f64
            } else {
                s.ground_flux_w_m2
            };
            (flux_sum, flux_n) = (0.0, 0);
            daily.push(WinterDay {
                day: s.time_s / 86_400.0,
                air_c: s.air_c,
                surface_c: s.surface_c,
                frost_depth_m: s.frost_depth_m,
                thaw_depth_m: s.thaw_depth_m,
                ground_flux_w_m2,
                snow_depth_m: s.snow_depth_m,
            });
            next += 86_400.0;
        }
    }
    WinterReport {
        max_frost_depth_m: r.max_frost_depth_m,
        max_frost_day: r.max_frost_time_s / 86_400.0,
        air_freezing_index_c_days: r.air_freezing_index_c_days,
        surface_freezing_index_c_days: r.surface_freezing_index_c_days,
        cells: r.cells,
        steps: r.steps,
        iterations_per_step: r.iterations as f64 / r.steps.max(1) as f64,
        split_steps: r.splits,
        spin_up_years: r.spin_up_years,
        energy_imbalance_relative: (r.energy_imbalance_j_m2 / r.energy_throughput_j_m2.max(1e-300))
            .abs(),
        daily,
        envelope: r
            .depths_m
            .iter()
            .zip(r.min_c.iter().zip(&r.max_c))
            .map(|(&z, (&lo, &hi))| [z, lo, hi])
            .collect(),
        layer_faces_m: faces_m,
        layer_names,
        warnings: Vec::new(),
        modelled_depth_m: 0.0,
        frost_at_bottom: false,
        frozen_all_year: false,
        freezable_top_m: 0.0,
        least_thickness: None,
        hand_methods: Vec::new(),
        start_date: None,
        profiles: r
            .profiles
            .into_iter()
            .zip(
                r.snow_profiles
                    .into_iter()
                    .chain(std::iter::repeat(Vec::new())),
            )
            .map(|((t, temperature_c), snow_c)| DayProfile {
                day: t / 86_400.0,
                temperature_c,
                snow_c,
            })
            .collect(),
    }
}

/// The daily series as CSV text in SI, units in the header.
pub fn daily_csv(r: &WinterReport) -> String {
    daily_csv_in(r, crate::physics::units::UnitSystem::Si)
}

/// The daily series as CSV text in the chosen units, units in the header. Values carry a
/// few more decimals than the page shows, so a spreadsheet can redo its sums. When the
/// climate is daily records ([`WinterReport::start_date`]), a `date` column (YYYY-MM-DD)
/// follows the day number: day n is 00:00 of the n-th date after the record's first (the
/// row's values are those at that moment, the end of the day before), as the page names
/// the days of a record. A sine year or a design winter keeps day numbers only.
pub fn daily_csv_in(r: &WinterReport, sys: crate::physics::units::UnitSystem) -> String {
    use crate::physics::units::quantity;
    let cols: [(&str, &str); 6] = [
        ("air temperature", "temperature"),
        ("surface temperature", "temperature"),
        ("frost depth", "depth"),
        ("thaw depth", "depth"),
        ("ground heat flux", "heat_flux"),
        ("snow depth", "depth"),
    ];
    let mut out = String::from("day");
    if r.start_date.is_some() {
        out.push_str(",date");
    }
    for (name, q) in cols {
        let sym = quantity(q).map_or("", |q| q.unit(sys).symbol);
        out.push_str(&format!(",{name} [{sym}]"));
    }
    out.push('\n');
    for d in &r.daily {
        let values = [
            d.air_c,
            d.surface_c,
            d.frost_depth_m,
            d.thaw_depth_m,
            d.ground_flux_w_m2,
            d.snow_depth_m,
        ];
        out.push_str(&format!("{:.3}", d.day));
        if let Some(first) = r.start_date {
            let date = u64::try_from(d.day.round() as i64)
                .ok()
                .and_then(|n| first.checked_add_days(chrono::Days::new(n)));
            out.push(',');
            if let Some(date) = date {
                out.push_str(&date.format("%Y-%m-%d").to_string());
            }
        }
        for ((_, q), v) in cols.iter().zip(values) {
            let (shown, places) = quantity(q).map_or((v, 3), |q| {
                (q.show(sys, v), usize::from(q.unit(sys).decimals) + 2)
            });
            out.push_str(&format!(",{shown:.places$}"));
        }
        out.push('\n');
    }
    out
}

/// The daily profiles of a winter run as CSV: one row per kept profile (the day of the
/// run, then the temperature of each cell), one column per cell centre, its depth and
/// both units in the header.
pub fn profiles_csv(w: &WinterReport, sys: crate::physics::units::UnitSystem) -> String {
    use crate::physics::units::quantity;
    let (Some(tq), Some(zq)) = (quantity("temperature"), quantity("depth")) else {
        return String::new();
    };
    let (tu, zu) = (tq.unit(sys).symbol, zq.unit(sys).symbol);
    let depths: Vec<f64> = w.envelope.iter().map(|e| zq.show(sys, e[0])).collect();
    // Enough decimals that no two cell centres share a heading.
    let mut decimals = 4;
    let heading = |d: f64, n: usize| format!("temperature [{tu}] at {d:.n$} {zu}");
    while decimals < 9 {
        let mut names: Vec<String> = depths.iter().map(|&d| heading(d, decimals)).collect();
        names.dedup();
        if names.len() == depths.len() {
            break;
        }
        decimals += 1;
    }
    let mut out = String::from("day");
    for &d in &depths {
        out.push(',');
        out.push_str(&heading(d, decimals));
    }
    out.push('\n');
    for p in &w.profiles {
        out.push_str(&format!("{:.3}", p.day));
        for i in 0..depths.len() {
            out.push(',');
            if let Some(&tc) = p.temperature_c.get(i) {
                out.push_str(&format!("{:.3}", tq.show(sys, tc)));
            }
        }
        out.push('\n');
    }
    out
}

/// Find the least thickness of one layer that keeps frost above a limit through the
/// winter.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct LeastThicknessDoc {
    /// Index of the layer whose thickness is searched (0 = the top layer).
    pub layer: usize,
    pub keep_frost_above: FrostLimitDoc,
    /// The range searched, m.
    pub min_m: f64,
    pub max_m: f64,
    /// The answer's resolution, m (default 2 mm).
    #[serde(default = "default_resolution")]
    pub resolution_m: f64,
}

fn default_resolution() -> f64 {
    0.002
}

/// Where frost must stay above.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(tag = "kind", rename_all = "kebab-case", deny_unknown_fields)]
pub enum FrostLimitDoc {
    /// A depth below the top face, m (a pipe, a footing base).
    Depth { depth_m: f64 },
    /// The bottom face of a layer: what lies below it must not freeze.
    LayerBottom { layer: usize },
}

impl LeastThicknessDoc {
    pub(crate) fn check(
        &self,
        layers: usize,
        errs: &mut InputErrors,
    ) -> Option<(FrostLimit, Search)> {
        let f = "winter.least_thickness";
        let mut ok = true;
        if self.layer >= layers {
            errs.push(
                format!("{f}.layer"),
                InputErrorKind::Count {
                    count: self.layer + 1,
                    min: 1,
                    max: layers,
                },
            );
            ok = false;
        }
        ok &= check::within(errs, &format!("{f}.min_m"), self.min_m, 0.0, 10.0, "m");
        ok &= check::within(errs, &format!("{f}.max_m"), self.max_m, 0.001, 10.0, "m");
        ok &= check::within(
            errs,
            &format!("{f}.resolution_m"),
            self.resolution_m,
            1e-4,
            0.5,
            "m",
        );
        if ok && self.max_m <= self.min_m + self.resolution_m {
            errs.push(
                format!("{f}.max_m"),
                InputErrorKind::NotCovered(
                    "the largest thickness must exceed the smallest by more than the resolution"
                        .into(),
                ),
            );
            ok = false;
        }
        let limit = match self.keep_frost_above {
            FrostLimitDoc::Depth { depth_m } => {
                ok &= check::within(
                    errs,
                    &format!("{f}.keep_frost_above.depth_m"),
                    depth_m,
                    0.001,
                    100.0,
                    "m",
                );
                FrostLimit::Depth(depth_m)
            }
            FrostLimitDoc::LayerBottom { layer } => {
                if layer >= layers {
                    errs.push(
                        format!("{f}.keep_frost_above.layer"),
                        InputErrorKind::Count {
                            count: layer + 1,
                            min: 1,
                            max: layers,
                        },
                    );
                    ok = false;
                }
                FrostLimit::BottomOfLayer(layer)
            }
        };
        ok.then_some((
            limit,
            Search {
                lo: self.min_m,
                hi: self.max_m,
                tolerance: self.resolution_m,
                max_runs: MAX_RUNS,
            },
        ))
    }
}

/// One run of the search, as reported.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TrialDoc {
    pub thickness_m: f64,
    pub frost_depth_m: f64,
    pub limit_m: f64,
}

impl From<&Trial> for TrialDoc {
    fn from(t: &Trial) -> Self {
        TrialDoc {
            thickness_m: t.value,
            frost_depth_m: t.frost_depth_m,
            limit_m: t.limit_m,
        }
    }
}

/// The search's report (SI).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LeastThicknessReport {
    /// `found`, `smallest-suffices`, `not-reachable` or `not-monotone`.
    pub outcome: &'static str,
    pub layer: usize,
    pub layer_name: String,
    /// The least thickness found (for `found`), the smallest of the range (for
    /// `smallest-suffices`); absent otherwise.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub thickness_m: Option<f64>,
    /// The deepest frost and the limit with that thickness (or with the range's end), m.
    pub frost_depth_m: f64,
    pub limit_m: f64,
    /// d(frost − limit)/d(thickness) near the answer (m per m; negative: more of the layer
    /// lifts the frost); absent where frost jumps across the answer (with the answer's
    /// thickness the ground below does not freeze at all).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub slope: Option<f64>,
    pub resolution_m: f64,
    /// For an insulation board: the R-value of the thickness found (or of the smallest of
    /// the range), m²K/W, at the board's conductivity as the run used it (moisture
    /// derating included), R = thickness / k.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub r_value_m2k_w: Option<f64>,
    /// Every run, in the order run.
    pub trials: Vec<TrialDoc>,
}
