//! The shelter section of the scenario document (format version 3): a snow shelter, the
//! weather and the people in it, the night to follow and the least wall, and the
//! report of all of it. It converts to and from the plain structs of
//! [`crate::physics::shelter`].
//!
//! The section stands on its own: it does not read the document's `layers`, `top` and
//! `bottom`, which keep their meaning (a steady stack; in the bundled shelter examples a
//! flat cut through the wall, outside air to the inner face). Every field path starts with
//! `shelter.` (`shelter.shape.inner_radius_m`, `shelter.conditions.people`,
//! `shelter.night.duration_h`), so errors land beside their inputs on the page.
//!
//! Files of versions 1 and 2 load unchanged; a `shelter` in a file of version 1 or 2 is
//! refused (field `shelter`). A shelter document still carries a stack: the bundled shelter
//! examples use it for one square metre of the wall laid flat (outside air to air at 0 °C),
//! so the steady panels show the wall's R-value. This keeps one document shape for every
//! face (page, CLI, file open and save) and no switch of kinds. Those panels take the
//! stack's own faces; the shelter's own steady panel, its main wall laid flat
//! (`flat_wall` in the report), takes the shelter's outside air and wind.
//!
//! ```json
//! "shelter": {
//!   "shape": { "kind": "block-dome", "inner_radius_m": 1.5, "wall_thickness_m": 0.35 },
//!   "snow_density_kg_m3": 300, "snow_correlation": "sturm-1997-quadratic",
//!   "floor": { "kind": "snow" },            // or ground: conductivity_w_m_k, heat_capacity_j_m3_k, temperature_c
//!   "entrance": { "kind": "cold-trap" },    // or level: opening_width_m, opening_height_m
//!   "vent_diameter_m": 0.10,
//!   "inside_film_w_m2k": 7, "lining_m2k_per_w": 0.2, "floor_cover_m2k_per_w": 0.5,   // defaults 7, 0.2, 0
//!   "conditions": { "outside_c": -20, "wind_m_s": 5, "snowpack_c": -10, "people": 4,
//!                   "activity": "sleeping", "body_area_m2": 1.8, "candles": 0,
//!                   "stove_w": 0, "stove_heat_share": 1 },   // the last four have defaults
//!   "night": { "duration_h": 12, "step_s": 60 },            // optional; snow_start_c, air_start_c, lining
//!   "design": { "target_c": -5 },                           // optional, default −5 °C (invented)
//!   "sweeps": { "thickness_m": [0.1, 1.0], "people": [0, 8], "outside_c": [-40, 0], "points": 31 }
//! }
//! ```
//!
//! Shapes: `block-dome` (inner_radius_m, wall_thickness_m), `hollowed-pile`
//! (inner_radius_m, crown_thickness_m, base_thickness_m), `drift-cave` (inner_radius_m,
//! optional exposed_face {share, thickness_m}), `trench` (length_m, width_m, depth_m,
//! roof_thickness_m). Activities: the ids of the core's `Activity`. The night's starting
//! snow temperature defaults to the outside air for a dome or pile and to the snowpack for
//! a cave or trench; the air starts at the outside air; the night's target is the design
//! target. Keys that keep their published spelling while the Rust names say it another way:
//! `snow_correlation`, `lining_m2k_per_w`, `floor_cover_m2k_per_w`, `design` (the field
//! `target`) and, in the report, `melt_kg_per_h`, `melt_mm_per_h`, `by_correlation`.
//!
//! **Checks.** The core's (`Shelter::validate`, `Conditions::validate`,
//! `NightSettings::validate`), then the section's own (night 1–72 h, target −40 to +20 °C,
//! sweep ranges increasing and within the core's limits, 2 to [`MAX_SERIES_POINTS`]
//! points), all in one pass. The core names a shape's fields directly under `shelter.`
//! (`shelter.inner_radius_m`); [`shape_path`] moves them to the document's
//! `shelter.shape.inner_radius_m`, which is what the page's `data-field` carries.
//!
//! **The run** ([`run_shelter`]): every check first, all errors at once; then the steady
//! balance, the band, the night, the least wall and the three series.
//!
//! **The report** ([`ShelterReport`], `Report.shelter`): interior temperature, surface
//! state (`frozen` or `melting`), warmest surface, melt-free limit, melt kg/h, each inner
//! surface (area, temperature, melting), gains, losses by path (walls and roof, floor,
//! vent, doorway, melting snow: W and share of the heat given off; they add up to it,
//! tested), vent and doorway flow, CO₂ ppm (null without air exchange) and the 5000 ppm
//! limit, the main wall laid flat at the shelter's outside air ([`FlatWallDoc`]; null for a
//! cave with no face to the outside air), the lining comparison, the band (coldest, warmest, each regression), the night
//! (samples every 10 minutes with every surface, warm-up and target times, melted kg,
//! energy imbalance), the least wall (`reached`, `thinnest-suffices`, `not-reachable` with
//! `melt-limit` or `other-losses`, `no-thickness-to-choose`; a plain message in SI, which
//! the page words in the units it shows), the three series, warnings (the core's,
//! deduplicated, with document paths) and the cautions with their sources, always.
//! [`night_csv`] and [`sweeps_csv`] write the night and the series in either unit system.

use crate::document::vocabulary::{ErrorDoc, SnowRegressionDoc};
use crate::physics::error::{check, InputError, InputErrorKind, InputErrors, Warning};
use crate::physics::shelter;
use crate::physics::shelter::{
    Activity, Conditions, Entrance, ExposedFace, Floor, NightSettings, NotReachableReason, Shape,
    Shelter, ShelterError, SweepPoint, ThicknessAnswer,
};
use crate::physics::units::{quantity, UnitSystem};
use schemars::JsonSchema;
use serde::{Deserialize, Serialize};

/// Field path of the shape (the core names the shape's own fields under `shelter.`; the
/// document nests them under `shelter.shape.`, see [`shape_path`]).
pub const SHAPE_FIELD: &str = "shelter.shape";

/// A snow shelter and what to ask of it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct ShelterDoc {
    pub shape: ShapeDoc,
    /// Density of the snow of walls, roof, surrounding snowpack and a snow floor, kg/m³.
    pub snow_density_kg_m3: f64,
    /// The regression giving the snow's conductivity from its density.
    #[serde(rename = "snow_correlation")]
    pub snow_regression: SnowRegressionDoc,
    pub floor: FloorDoc,
    pub entrance: EntranceDoc,
    /// Diameter of the vent hole at the top, m (0: no vent).
    pub vent_diameter_m: f64,
    /// Inside surface film (convection and radiation), W/m²K (default 7).
    #[serde(default = "default_inside_film")]
    pub inside_film_w_m2k: f64,
    /// Resistance of a lining that could be hung in front of the walls, m²K/W (default 0.2;
    /// 0: no lining to compare).
    #[serde(default = "default_lining")]
    #[serde(rename = "lining_m2k_per_w")]
    pub lining_m2k_w: f64,
    /// Resistance of what covers the floor (mats, branches), averaged over the floor, m²K/W.
    #[serde(default)]
    #[serde(rename = "floor_cover_m2k_per_w")]
    pub floor_cover_m2k_w: f64,
    pub conditions: ConditionsDoc,
    /// The first hours after people go in.
    #[serde(default)]
    pub night: NightDoc,
    /// The interior temperature the least wall is sought for (the format's key: `design`).
    #[serde(default, rename = "design")]
    pub target: TargetDoc,
    /// Ranges the three series run over.
    #[serde(default)]
    pub sweeps: SweepsDoc,
}

fn default_inside_film() -> f64 {
    crate::physics::shelter::inputs::INSIDE_FILM_W_M2K
}

fn default_lining() -> f64 {
    0.2
}

#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(tag = "kind", rename_all = "kebab-case", deny_unknown_fields)]
pub enum ShapeDoc {
    /// A dome of snow blocks: a hemispherical shell of uniform thickness.
    BlockDome {
        inner_radius_m: f64,
        wall_thickness_m: f64,
    },
    /// A pile of snow, hollowed out: thickness from the crown down to the base.
    HollowedPile {
        inner_radius_m: f64,
        crown_thickness_m: f64,
        base_thickness_m: f64,
    },
    /// A cave dug into a drift, optionally with one face toward the outside air.
    DriftCave {
        inner_radius_m: f64,
        #[serde(default, skip_serializing_if = "Option::is_none")]
        exposed_face: Option<ExposedFaceDoc>,
    },
    /// A trench in the snowpack roofed with flat snow blocks.
    Trench {
        length_m: f64,
        width_m: f64,
        depth_m: f64,
        roof_thickness_m: f64,
    },
}

#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct ExposedFaceDoc {
    /// Share of the chamber's curved surface (0–1] facing the outside air.
    pub share: f64,
    /// Snow between that face and the outside air, m.
    pub thickness_m: f64,
}

#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(tag = "kind", rename_all = "kebab-case", deny_unknown_fields)]
pub enum FloorDoc {
    /// Snow of the shelter's density over the snowpack.
    Snow,
    /// Ground (soil or rock) at a temperature.
    Ground {
        conductivity_w_m_k: f64,
        heat_capacity_j_m3_k: f64,
        temperature_c: f64,
    },
}

#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(tag = "kind", rename_all = "kebab-case", deny_unknown_fields)]
pub enum EntranceDoc {
    /// A passage dropping below the floor: cold air pools in it and adds no loss.
    ColdTrap,
    /// A doorway level with the floor; `opening_*` is the part left open.
    Level {
        opening_width_m: f64,
        opening_height_m: f64,
    },
}

/// What people do (metabolic rate from the ASHRAE table, see [`Activity`]).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, JsonSchema)]
#[serde(rename_all = "kebab-case")]
pub enum ActivityDoc {
    Sleeping,
    Reclining,
    SeatedQuiet,
    StandingRelaxed,
    Cooking,
    WalkingSlowly,
    LiftingAndPacking,
}

impl From<ActivityDoc> for Activity {
    fn from(a: ActivityDoc) -> Activity {
        match a {
            ActivityDoc::Sleeping => Activity::Sleeping,
            ActivityDoc::Reclining => Activity::Reclining,
            ActivityDoc::SeatedQuiet => Activity::SeatedQuiet,
            ActivityDoc::StandingRelaxed => Activity::StandingRelaxed,
            ActivityDoc::Cooking => Activity::Cooking,
            ActivityDoc::WalkingSlowly => Activity::WalkingSlowly,
            ActivityDoc::LiftingAndPacking => Activity::LiftingAndPacking,
        }
    }
}

#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct ConditionsDoc {
    /// Outside air, °C (at most 0).
    pub outside_c: f64,
    /// Wind at the shelter, m/s.
    pub wind_m_s: f64,
    /// Deep snowpack around and below, °C.
    pub snowpack_c: f64,
    pub people: u32,
    pub activity: ActivityDoc,
    /// Body surface of one person, m² (default 1.8).
    #[serde(default = "default_body_area")]
    pub body_area_m2: f64,
    #[serde(default)]
    pub candles: u32,
    /// Fuel power of a stove burning inside, W.
    #[serde(default)]
    pub stove_w: f64,
    /// Share of the stove's power that heats the shelter, 0–1 (default 1).
    #[serde(default = "default_share")]
    pub stove_heat_share: f64,
}

fn default_body_area() -> f64 {
    crate::physics::shelter::inputs::BODY_AREA_M2
}

fn default_share() -> f64 {
    1.0
}

/// The night run. Starting temperatures left out: the snow starts at the outside air for a
/// dome or a pile (built from surface snow), at the snowpack's for a cave or a trench; the
/// air starts at the outside air.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct NightDoc {
    /// Length of the run, h (default 12).
    #[serde(default = "default_hours")]
    pub duration_h: f64,
    /// Time step, s (default 60).
    #[serde(default = "default_night_step")]
    pub step_s: f64,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub snow_start_c: Option<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub air_start_c: Option<f64>,
    /// Hang the lining from the start.
    #[serde(default)]
    pub lining: bool,
}

fn default_hours() -> f64 {
    12.0
}

fn default_night_step() -> f64 {
    60.0
}

impl Default for NightDoc {
    fn default() -> Self {
        NightDoc {
            duration_h: default_hours(),
            step_s: default_night_step(),
            snow_start_c: None,
            air_start_c: None,
            lining: false,
        }
    }
}

/// The interior temperature wanted, for the least wall that holds it.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct TargetDoc {
    /// Interior temperature wanted, °C (default −5: an invented default, no source).
    #[serde(default = "default_target")]
    pub target_c: f64,
}

fn default_target() -> f64 {
    -5.0
}

impl Default for TargetDoc {
    fn default() -> Self {
        TargetDoc {
            target_c: default_target(),
        }
    }
}

/// Ranges of the three series (each from the first value to the second, `points` evenly
/// spaced; people are whole numbers, every one in the range).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct SweepsDoc {
    /// Main wall thickness, m (default 0.1–1.0).
    #[serde(default = "default_thickness_range")]
    pub thickness_m: [f64; 2],
    /// People (default 0–8).
    #[serde(default = "default_people_range")]
    pub people: [u32; 2],
    /// Outside air, °C (default −40 to 0).
    #[serde(default = "default_outside_range")]
    pub outside_c: [f64; 2],
    /// Points of the thickness and outside-temperature series (default 31).
    #[serde(default = "default_points")]
    pub points: u32,
}

fn default_thickness_range() -> [f64; 2] {
    [0.1, 1.0]
}

fn default_people_range() -> [u32; 2] {
    [0, 8]
}

fn default_outside_range() -> [f64; 2] {
    [-40.0, 0.0]
}

fn default_points() -> u32 {
    31
}

impl Default for SweepsDoc {
    fn default() -> Self {
        SweepsDoc {
            thickness_m: default_thickness_range(),
            people: default_people_range(),
            outside_c: default_outside_range(),
            points: default_points(),
        }
    }
}

/// Most points a series may have here.
pub const MAX_SERIES_POINTS: u32 = 200;

/// The document path of a field the core names (`shelter.inner_radius_m` →
/// `shelter.shape.inner_radius_m`): the core names the shape's fields directly under its
/// prefix, the document nests them under `shape`.
pub fn shape_path(core_field: &str) -> String {
    const SHAPE_KEYS: [&str; 9] = [
        "inner_radius_m",
        "wall_thickness_m",
        "crown_thickness_m",
        "base_thickness_m",
        "exposed_face",
        "length_m",
        "width_m",
        "depth_m",
        "roof_thickness_m",
    ];
    if let Some(rest) = core_field.strip_prefix("shelter.") {
        let head = rest.split('.').next().unwrap_or("");
        if SHAPE_KEYS.contains(&head) {
            return format!("{SHAPE_FIELD}.{rest}");
        }
    }
    core_field.to_string()
}

fn moved(mut e: InputErrors) -> InputErrors {
    for x in &mut e.0 {
        x.field = shape_path(&x.field);
    }
    e
}

fn core_error(e: ShelterError) -> InputErrors {
    match e {
        ShelterError::Input(errs) => moved(errs),
        other => InputError::new("shelter", InputErrorKind::NotCovered(other.to_string())).into(),
    }
}

impl ShelterDoc {
    /// The core's shelter.
    pub fn shelter(&self) -> Shelter {
        Shelter {
            shape: match self.shape {
                ShapeDoc::BlockDome {
                    inner_radius_m,
                    wall_thickness_m,
                } => Shape::BlockDome {
                    inner_radius_m,
                    wall_thickness_m,
                },
                ShapeDoc::HollowedPile {
                    inner_radius_m,
                    crown_thickness_m,
                    base_thickness_m,
                } => Shape::HollowedPile {
                    inner_radius_m,
                    crown_thickness_m,
                    base_thickness_m,
                },
                ShapeDoc::DriftCave {
                    inner_radius_m,
                    exposed_face,
                } => Shape::DriftCave {
                    inner_radius_m,
                    exposed_face: exposed_face.map(|f| ExposedFace {
                        share: f.share,
                        thickness_m: f.thickness_m,
                    }),
                },
                ShapeDoc::Trench {
                    length_m,
                    width_m,
                    depth_m,
                    roof_thickness_m,
                } => Shape::Trench {
                    length_m,
                    width_m,
                    depth_m,
                    roof_thickness_m,
                },
            },
            snow_density_kg_m3: self.snow_density_kg_m3,
            snow_regression: self.snow_regression.into(),
            floor: match self.floor {
                FloorDoc::Snow => Floor::Snow,
                FloorDoc::Ground {
                    conductivity_w_m_k,
                    heat_capacity_j_m3_k,
                    temperature_c,
                } => Floor::Ground {
                    conductivity_w_m_k,
                    heat_capacity_j_m3_k,
                    temperature_c,
                },
            },
            entrance: match self.entrance {
                EntranceDoc::ColdTrap => Entrance::ColdTrap,
                EntranceDoc::Level {
                    opening_width_m,
                    opening_height_m,
                } => Entrance::Level {
                    opening_width_m,
                    opening_height_m,
                },
            },
            vent_diameter_m: self.vent_diameter_m,
            inside_film_w_m2k: self.inside_film_w_m2k,
            lining_m2k_w: self.lining_m2k_w,
            floor_cover_m2k_w: self.floor_cover_m2k_w,
        }
    }

    /// The core's conditions.
    pub fn conditions(&self) -> Conditions {
        let c = &self.conditions;
        Conditions {
            outside_c: c.outside_c,
            wind_m_s: c.wind_m_s,
            snowpack_c: c.snowpack_c,
            people: c.people,
            activity: c.activity.into(),
            body_area_m2: c.body_area_m2,
            candles: c.candles,
            stove_w: c.stove_w,
            stove_heat_share: c.stove_heat_share,
        }
    }

    /// The core's night settings (starting temperatures filled in as documented on
    /// [`NightDoc`]).
    pub fn night_settings(&self) -> NightSettings {
        let c = &self.conditions;
        let n = &self.night;
        let snow_default = match self.shape {
            ShapeDoc::BlockDome { .. } | ShapeDoc::HollowedPile { .. } => c.outside_c,
            ShapeDoc::DriftCave { .. } | ShapeDoc::Trench { .. } => c.snowpack_c,
        };
        NightSettings {
            duration_s: n.duration_h * 3600.0,
            step_s: n.step_s,
            // A default from an outside temperature above 0 °C (refused on its own field) is
            // held at 0 °C, so the error is not repeated on a field nobody set.
            snow_start_c: n.snow_start_c.unwrap_or(snow_default.min(0.0)),
            air_start_c: n.air_start_c.unwrap_or(c.outside_c),
            target_c: Some(self.target.target_c),
            lining: n.lining,
            ..NightSettings::default()
        }
    }

    /// Checks of this section's own fields (the core checks the shelter and conditions).
    fn check_own(&self, errs: &mut InputErrors) {
        let n = &self.night;
        check::within(
            errs,
            "shelter.night.duration_h",
            n.duration_h,
            1.0,
            72.0,
            "h",
        );
        check::within(
            errs,
            "shelter.design.target_c",
            self.target.target_c,
            -40.0,
            20.0,
            "°C",
        );
        let s = &self.sweeps;
        let (lo, hi) = shelter::least::SEARCH_THICKNESS_M;
        let a = check::within(
            errs,
            "shelter.sweeps.thickness_m",
            s.thickness_m[0],
            lo,
            hi,
            "m",
        );
        let b = check::within(
            errs,
            "shelter.sweeps.thickness_m",
            s.thickness_m[1],
            lo,
            hi,
            "m",
        );
        if a && b && s.thickness_m[1] <= s.thickness_m[0] {
            errs.push(
                "shelter.sweeps.thickness_m",
                InputErrorKind::NotCovered(
                    "the range must run from a thinner to a thicker wall".into(),
                ),
            );
        }
        let max_people = shelter::model::limits::PEOPLE;
        if s.people[0] >= s.people[1] || s.people[1] > max_people {
            errs.push(
                "shelter.sweeps.people",
                InputErrorKind::NotCovered(format!(
                    "the range must run from fewer to more people, at most {max_people}"
                )),
            );
        }
        let (lo, hi) = shelter::model::limits::OUTSIDE_C;
        let a = check::within(
            errs,
            "shelter.sweeps.outside_c",
            s.outside_c[0],
            lo,
            hi,
            "°C",
        );
        let b = check::within(
            errs,
            "shelter.sweeps.outside_c",
            s.outside_c[1],
            lo,
            hi,
            "°C",
        );
        if a && b && s.outside_c[1] <= s.outside_c[0] {
            errs.push(
                "shelter.sweeps.outside_c",
                InputErrorKind::NotCovered("the range must run from colder to warmer".into()),
            );
        }
        if s.points < 2 || s.points > MAX_SERIES_POINTS {
            errs.push(
                "shelter.sweeps.points",
                InputErrorKind::Count {
                    count: s.points as usize,
                    min: 2,
                    max: MAX_SERIES_POINTS as usize,
                },
            );
        }
    }
}

/// One piece of the inner surface in the steady state.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SurfaceDoc {
    pub name: String,
    /// "walls and roof" or "floor".
    pub part: &'static str,
    pub area_m2: f64,
    pub surface_c: f64,
    /// Whether this surface is snow held at 0 °C and melting.
    pub melting: bool,
    pub heat_w: f64,
    #[serde(rename = "melt_mm_per_h")]
    pub melt_mm_h: f64,
}

/// Where the heat goes: one path.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LossDoc {
    /// Stable id: walls-and-roof, floor, vent, doorway, melting.
    pub id: &'static str,
    pub name: &'static str,
    pub heat_w: f64,
    /// Share of the heat given off inside.
    pub share: f64,
}

/// The main wall laid flat, one square metre, between the shelter's own outside air and the
/// steady air inside ([`shelter::flat_wall`]): what the shelter's steady panel shows.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FlatWallDoc {
    pub thickness_m: f64,
    pub r_m2k_w: f64,
    pub heat_flux_w_m2: f64,
    pub outside_c: f64,
    pub inside_c: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LiningDoc {
    #[serde(rename = "lining_m2k_per_w")]
    pub lining_m2k_w: f64,
    pub interior_c: f64,
    #[serde(rename = "melt_kg_per_h")]
    pub melt_kg_h: f64,
    pub melt_free_limit_c: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BandEntryDoc {
    pub id: &'static str,
    pub name: &'static str,
    pub conductivity_w_m_k: f64,
    pub interior_c: f64,
    #[serde(rename = "melt_kg_per_h")]
    pub melt_kg_h: f64,
    /// The density lies in the regression's fitted range.
    pub in_range: bool,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ShelterBandDoc {
    pub coldest_c: f64,
    pub coldest_id: &'static str,
    pub warmest_c: f64,
    pub warmest_id: &'static str,
    #[serde(rename = "by_correlation")]
    pub by_regression: Vec<BandEntryDoc>,
}

/// One kept instant of the night.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct NightPointDoc {
    pub time_s: f64,
    pub interior_c: f64,
    /// Warmest inner snow surface, °C.
    pub warmest_surface_c: f64,
    /// Inner surface of the main wall (the first surface), °C.
    pub main_surface_c: f64,
    #[serde(rename = "melt_kg_per_h")]
    pub melt_kg_h: f64,
    pub co2_ppm: f64,
    /// Every surface, in the order of `surface_names`.
    pub surfaces_c: Vec<f64>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct NightReportDoc {
    pub duration_s: f64,
    /// The snow's and the air's temperature at the start, °C (as given or by default).
    pub snow_start_c: f64,
    pub air_start_c: f64,
    pub steady_interior_c: f64,
    /// Time for the air to cover 90 % of its rise to the steady temperature, s.
    pub warmup_time_s: Option<f64>,
    /// First time the air reaches the target, s.
    pub target_time_s: Option<f64>,
    pub melted_kg: f64,
    /// |imbalance| over the heat given off.
    pub energy_imbalance_relative: f64,
    pub surface_names: Vec<String>,
    pub samples: Vec<NightPointDoc>,
}

/// The least wall for the target.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LeastWallDoc {
    pub target_c: f64,
    /// reached, thinnest-suffices, not-reachable, no-thickness-to-choose.
    pub answer: &'static str,
    /// The document path of the thickness this answers for.
    pub field: String,
    pub thickness_m: Option<f64>,
    pub interior_c: Option<f64>,
    /// The answer in plain words (SI; the page words its own from the numbers).
    pub message: String,
    /// For not-reachable: melt-limit or other-losses.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub reason: Option<&'static str>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SeriesPointDoc {
    pub x: f64,
    pub interior_c: f64,
    #[serde(rename = "melt_kg_per_h")]
    pub melt_kg_h: f64,
    pub co2_ppm: Option<f64>,
}

/// One series: the interior against one input.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SeriesDoc {
    /// thickness, people, outside.
    pub id: &'static str,
    /// The page's unit quantity of x (thickness, fraction, temperature).
    pub x_quantity: &'static str,
    pub x_label: String,
    /// A short title for a chart panel.
    pub title: String,
    /// The value of x in the scenario as it stands.
    pub current_x: Option<f64>,
    pub points: Vec<SeriesPointDoc>,
    /// Why the series is empty, if it is.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub note: Option<String>,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct CautionDoc {
    pub id: &'static str,
    pub text: &'static str,
    pub source: &'static str,
}

/// The report of a shelter (SI).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ShelterReport {
    pub interior_c: f64,
    pub outside_c: f64,
    /// frozen, or melting (some snow surface held at 0 °C).
    pub surface_state: &'static str,
    pub warmest_surface_c: f64,
    /// Highest interior temperature at which no snow surface melts, °C.
    pub melt_free_limit_c: f64,
    #[serde(rename = "melt_kg_per_h")]
    pub melt_kg_h: f64,
    pub surfaces: Vec<SurfaceDoc>,
    pub people_w: f64,
    pub candles_w: f64,
    pub stove_w: f64,
    pub gains_w: f64,
    pub losses: Vec<LossDoc>,
    pub vent_flow_m3_s: f64,
    pub door_flow_m3_s: f64,
    /// Steady CO₂, ppm; null when no air is exchanged (it keeps rising).
    pub co2_ppm: Option<f64>,
    pub co2_limit_ppm: f64,
    pub snow_conductivity_w_m_k: f64,
    #[serde(rename = "snow_correlation")]
    pub snow_regression: &'static str,
    pub outside_film_w_m2k: f64,
    /// The main wall laid flat at the shelter's outside air; null for a cave with no face
    /// to the outside air.
    pub flat_wall: Option<FlatWallDoc>,
    pub with_lining: Option<LiningDoc>,
    pub band: ShelterBandDoc,
    pub night: NightReportDoc,
    pub least_wall: LeastWallDoc,
    pub sweeps: Vec<SeriesDoc>,
    pub warnings: Vec<ErrorDoc>,
    /// Always shown with the results.
    pub cautions: Vec<CautionDoc>,
}

/// The safety notes with their sources.
pub fn cautions() -> Vec<CautionDoc> {
    shelter::cautions()
        .iter()
        .map(|c| CautionDoc {
            id: c.id,
            text: c.text,
            source: c.source,
        })
        .collect()
}

fn even(lo: f64, hi: f64, n: u32) -> Vec<f64> {
    let n = n.max(2) as usize;
    (0..n)
        .map(|i| lo + (hi - lo) * i as f64 / (n - 1) as f64)
        .collect()
}

fn series_points(p: Vec<SweepPoint>) -> Vec<SeriesPointDoc> {
    p.into_iter()
        .map(|p| SeriesPointDoc {
            x: p.x,
            interior_c: p.interior_c,
            melt_kg_h: p.melt_kg_h,
            co2_ppm: p.co2_ppm,
        })
        .collect()
}

fn thickness_name(shape: &ShapeDoc) -> &'static str {
    match shape {
        ShapeDoc::BlockDome { .. } => "wall thickness",
        ShapeDoc::HollowedPile { .. } => "crown thickness (the base in proportion)",
        ShapeDoc::DriftCave { .. } => "thickness of the face to the outside",
        ShapeDoc::Trench { .. } => "roof thickness",
    }
}

fn least_wall(doc: &ShelterDoc, a: ThicknessAnswer, field: String) -> LeastWallDoc {
    let target = doc.target.target_c;
    let what = thickness_name(&doc.shape);
    let mut d = LeastWallDoc {
        target_c: target,
        answer: "",
        field,
        thickness_m: None,
        interior_c: None,
        message: String::new(),
        reason: None,
    };
    match a {
        ThicknessAnswer::Reached {
            thickness_m,
            interior_c,
        } => {
            d.answer = "reached";
            d.thickness_m = Some(thickness_m);
            d.interior_c = Some(interior_c);
            d.message = format!(
                "A {what} of {:.0} cm keeps the air at {target:.1} °C.",
                (thickness_m * 100.0).ceil()
            );
            if thickness_m < shelter::model::limits::THIN_WALL_M {
                d.message
                    .push_str(" Build it at least about 30 cm thick all the same, for strength.");
            }
        }
        ThicknessAnswer::ThinnestSuffices {
            thickness_m,
            interior_c,
        } => {
            d.answer = "thinnest-suffices";
            d.thickness_m = Some(thickness_m);
            d.interior_c = Some(interior_c);
            d.message = format!(
                "Even a {what} of {:.0} cm keeps the air at {interior_c:.1} °C, above the target; \
                 build walls of at least about 30 cm all the same, for strength.",
                thickness_m * 100.0
            );
        }
        ThicknessAnswer::NotReachable {
            reason,
            best_interior_c,
            air_share,
            floor_share,
            walls_share,
        } => {
            d.answer = "not-reachable";
            d.interior_c = Some(best_interior_c);
            let max_t = shelter::least::SEARCH_THICKNESS_M.1;
            d.message = match reason {
                NotReachableReason::MeltLimit => {
                    d.reason = Some("melt-limit");
                    format!(
                        "No wall reaches {target:.1} °C: the inner snow surface gets to 0 °C first and \
                         melts, so the air stays near {best_interior_c:.1} °C however thick the wall. \
                         A lining in front of the snow would let it get warmer."
                    )
                }
                NotReachableReason::OtherLosses => {
                    d.reason = Some("other-losses");
                    format!(
                        "No wall up to {max_t:.0} m reaches {target:.1} °C: even then the air stays at \
                         {best_interior_c:.1} °C, because vent and doorway take {:.0} %, the floor \
                         {:.0} % and walls and roof {:.0} % of the heat. More people, a smaller \
                         chamber, a cold-trap entrance or a mat on the floor would help more than \
                         more snow.",
                        air_share * 100.0,
                        floor_share * 100.0,
                        walls_share * 100.0
                    )
                }
            };
        }
        ThicknessAnswer::NoThicknessToChoose => {
            d.answer = "no-thickness-to-choose";
            d.message = "This cave has no face to the outside air, so there is no wall thickness \
                         to choose: the snowpack around it is all the wall."
                .into();
        }
    }
    d
}

fn push_unique(out: &mut Vec<ErrorDoc>, w: &Warning) {
    let field = shape_path(&w.field);
    if !out
        .iter()
        .any(|x| x.field == field && x.message == w.message)
    {
        out.push(ErrorDoc::plain(field, w.message.clone()));
    }
}

/// Check the shelter section (all errors at once, each naming its field) and compute it:
/// steady balance, band, night, least wall and the three series.
pub fn run_shelter(doc: &ShelterDoc) -> Result<ShelterReport, InputErrors> {
    let sh = doc.shelter();
    let co = doc.conditions();
    let settings = doc.night_settings();
    // Every check before any work: the core's, the night's and this section's own.
    let mut errs = InputErrors::default();
    let mut warnings_core = Vec::new();
    sh.validate(shelter::SHELTER_FIELD, &mut errs, &mut warnings_core);
    co.validate(shelter::CONDITIONS_FIELD, &mut errs, &mut warnings_core);
    let mut night_errs = InputErrors::default();
    settings.validate(shelter::NIGHT_FIELD, &mut night_errs);
    for e in night_errs.0 {
        // The document gives the length in hours.
        let field = if e.field == "shelter.night.duration_s" {
            "shelter.night.duration_h".to_string()
        } else {
            e.field
        };
        if field != "shelter.night.target_c" {
            errs.push(field, e.kind);
        }
    }
    doc.check_own(&mut errs);
    let errs = moved(errs);
    errs.into_result()?;

    let r = shelter::steady(&sh, &co).map_err(core_error)?;
    let band = shelter::regression_band(&sh, &co).map_err(core_error)?;
    let night = shelter::night(&sh, &co, &settings).map_err(core_error)?;
    let answer = shelter::least_thickness(&sh, &co, doc.target.target_c).map_err(core_error)?;
    let field = shape_path(&format!("shelter.{}", sh.shape.main_thickness_field()));

    let s = &doc.sweeps;
    let mut sweeps = Vec::with_capacity(3);
    let current_t = sh.shape.main_thickness_m();
    let (thick_points, note) = if current_t.is_some() {
        let (lo, hi) = sweep_thickness_range(&sh, s.thickness_m);
        let xs = even(lo, hi, s.points);
        (
            series_points(shelter::sweep_wall_thickness(&sh, &co, &xs).map_err(core_error)?),
            None,
        )
    } else {
        (
            Vec::new(),
            Some("This cave has no face to the outside air: no thickness to vary.".to_string()),
        )
    };
    sweeps.push(SeriesDoc {
        id: "thickness",
        x_quantity: "thickness",
        x_label: thickness_name(&doc.shape).to_string(),
        title: "By wall thickness".into(),
        current_x: current_t,
        points: thick_points,
        note,
    });
    let people: Vec<u32> = (s.people[0]..=s.people[1]).collect();
    sweeps.push(SeriesDoc {
        id: "people",
        x_quantity: "count",
        x_label: "people inside".into(),
        title: "By the number of people".into(),
        current_x: Some(co.people as f64),
        points: series_points(shelter::sweep_people(&sh, &co, &people).map_err(core_error)?),
        note: None,
    });
    let xs = even(s.outside_c[0], s.outside_c[1], s.points);
    sweeps.push(SeriesDoc {
        id: "outside",
        x_quantity: "temperature",
        x_label: "outside air temperature".into(),
        title: "By the outside temperature".into(),
        current_x: Some(co.outside_c),
        points: series_points(
            shelter::sweep_outside_temperature(&sh, &co, &xs).map_err(core_error)?,
        ),
        note: None,
    });

    let mut warnings = Vec::new();
    for w in r.warnings.iter().chain(&night.warnings) {
        push_unique(&mut warnings, w);
    }
    for w in &mut warnings {
        describe_warning(w, doc, &sh, r.melt_kg_h);
    }

    let gains = r.gains_w.max(f64::MIN_POSITIVE);
    let loss = |id, name, heat_w: f64| LossDoc {
        id,
        name,
        heat_w,
        share: heat_w / gains,
    };
    let ledger = night.ledger;
    let n_samples = night
        .samples
        .iter()
        .map(|p| NightPointDoc {
            time_s: p.time_s,
            interior_c: p.interior_c,
            warmest_surface_c: p.warmest_snow_surface_c,
            main_surface_c: p.surfaces_c.first().copied().unwrap_or(f64::NAN),
            melt_kg_h: p.melt_kg_h,
            co2_ppm: p.co2_ppm,
            surfaces_c: p.surfaces_c.clone(),
        })
        .collect();
    Ok(ShelterReport {
        interior_c: r.interior_c,
        outside_c: r.outside_c,
        surface_state: if r.melt_w > 0.0 { "melting" } else { "frozen" },
        warmest_surface_c: r.warmest_snow_surface_c,
        melt_free_limit_c: r.melt_free_limit_c,
        melt_kg_h: r.melt_kg_h,
        surfaces: r
            .zones
            .iter()
            .zip(&snow_zones(&sh, &co))
            .map(|(z, &snow)| SurfaceDoc {
                name: z.name.clone(),
                part: match z.part {
                    shelter::model::Part::WallsAndRoof => "walls and roof",
                    shelter::model::Part::Floor => "floor",
                },
                area_m2: z.inner_area_m2,
                surface_c: z.surface_c,
                melting: snow && z.melt_w > 0.0,
                heat_w: z.heat_in_w,
                melt_mm_h: z.melt_mm_h,
            })
            .collect(),
        people_w: r.people_w,
        candles_w: r.candles_w,
        stove_w: r.stove_w,
        gains_w: r.gains_w,
        losses: vec![
            loss("walls-and-roof", "walls and roof", r.walls_w),
            loss("floor", "floor", r.floor_w),
            loss("vent", "vent", r.vent_w),
            loss("doorway", "doorway", r.door_w),
            loss("melting", "melting snow", r.melt_w),
        ],
        vent_flow_m3_s: r.vent_flow_m3_s,
        door_flow_m3_s: r.door_flow_m3_s,
        co2_ppm: r.co2_ppm,
        co2_limit_ppm: shelter::steady::CO2_LIMIT_PPM,
        snow_conductivity_w_m_k: r.snow_conductivity_w_m_k,
        snow_regression: r.snow_regression.id(),
        outside_film_w_m2k: r.outside_film_w_m2k,
        flat_wall: shelter::flat_wall(&sh, &r).map(|w| FlatWallDoc {
            thickness_m: w.thickness_m,
            r_m2k_w: w.r_m2k_w,
            heat_flux_w_m2: w.heat_flux_w_m2,
            outside_c: w.outside_c,
            inside_c: w.inside_c,
        }),
        with_lining: r.with_lining.map(|l| LiningDoc {
            lining_m2k_w: l.lining_m2k_w,
            interior_c: l.interior_c,
            melt_kg_h: l.melt_kg_h,
            melt_free_limit_c: l.melt_free_limit_c,
        }),
        band: ShelterBandDoc {
            coldest_c: band.coldest.1,
            coldest_id: band.coldest.0.id(),
            warmest_c: band.warmest.1,
            warmest_id: band.warmest.0.id(),
            by_regression: band
                .entries
                .iter()
                .map(|e| BandEntryDoc {
                    id: e.regression.id(),
                    name: e.regression.name(),
                    conductivity_w_m_k: e.conductivity_w_m_k,
                    interior_c: e.interior_c,
                    melt_kg_h: e.melt_kg_h,
                    in_range: e.in_range,
                })
                .collect(),
        },
        night: NightReportDoc {
            duration_s: settings.duration_s,
            snow_start_c: settings.snow_start_c,
            air_start_c: settings.air_start_c,
            steady_interior_c: night.steady_interior_c,
            warmup_time_s: night.warmup_time_s,
            target_time_s: night.target_time_s,
            melted_kg: night.melted_kg,
            energy_imbalance_relative: (ledger.imbalance_j / ledger.given_off_j.max(1e-300)).abs(),
            surface_names: night.zone_names.clone(),
            samples: n_samples,
        },
        least_wall: least_wall(doc, answer, field),
        sweeps,
        warnings,
        cautions: cautions(),
    })
}

/// Give the warnings whose numbers a face shows in its own units a `kind` and those numbers
/// (SI): `melting` (value: kg/h), `thin_wall` (value: the thickness, m; max: the 0.30 m the
/// field manuals give), `density_range` (value: kg/m³; min and max: the regression's fitted
/// range). Known by the field they name, which the core's checks fix.
fn describe_warning(w: &mut ErrorDoc, doc: &ShelterDoc, sh: &Shelter, melt_kg_h: f64) {
    let thickness = |key: &str| -> Option<f64> {
        match (doc.shape, key) {
            (
                ShapeDoc::BlockDome {
                    wall_thickness_m, ..
                },
                "wall_thickness_m",
            ) => Some(wall_thickness_m),
            (
                ShapeDoc::HollowedPile {
                    crown_thickness_m, ..
                },
                "crown_thickness_m",
            ) => Some(crown_thickness_m),
            (
                ShapeDoc::HollowedPile {
                    base_thickness_m, ..
                },
                "base_thickness_m",
            ) => Some(base_thickness_m),
            (
                ShapeDoc::DriftCave {
                    exposed_face: Some(f),
                    ..
                },
                "exposed_face.thickness_m",
            ) => Some(f.thickness_m),
            (
                ShapeDoc::Trench {
                    roof_thickness_m, ..
                },
                "roof_thickness_m",
            ) => Some(roof_thickness_m),
            _ => None,
        }
    };
    if w.field == "shelter" && melt_kg_h > 0.0 {
        w.kind = Some("melting");
        w.value = Some(melt_kg_h);
    } else if w.field == "shelter.snow_density_kg_m3" {
        let (lo, hi) = sh.snow_regression.valid_range_kg_m3();
        w.kind = Some("density_range");
        (w.value, w.min, w.max) = (Some(sh.snow_density_kg_m3), Some(lo), Some(hi));
    } else if let Some(t) = w.field.strip_prefix("shelter.shape.").and_then(thickness) {
        w.kind = Some("thin_wall");
        (w.value, w.max) = (Some(t), Some(shelter::model::limits::THIN_WALL_M));
    }
}

/// The thickness range of the series, narrowed for a pile so that its base (kept in
/// proportion to the crown) stays within the thicknesses the core accepts.
fn sweep_thickness_range(sh: &Shelter, [lo, hi]: [f64; 2]) -> (f64, f64) {
    if let Shape::HollowedPile {
        crown_thickness_m,
        base_thickness_m,
        ..
    } = sh.shape
    {
        let ratio = base_thickness_m / crown_thickness_m;
        let (min, max) = shelter::model::limits::THICKNESS_M;
        if ratio.is_finite() && ratio > 0.0 {
            let (a, b) = (lo.max(min / ratio), hi.min(max / ratio));
            if a < b {
                return (a, b);
            }
        }
    }
    (lo, hi)
}

/// Which zones are snow (melt at 0 °C), in the model's order.
fn snow_zones(sh: &Shelter, co: &Conditions) -> Vec<bool> {
    shelter::Model::build(sh, co)
        .map(|(m, _)| m.zones.iter().map(|z| z.melts).collect())
        .unwrap_or_default()
}

fn header(name: &str, q: &str, sys: UnitSystem) -> String {
    let sym = quantity(q).map_or("", |q| q.unit(sys).symbol);
    if sym.is_empty() {
        name.to_string()
    } else {
        format!("{name} [{sym}]")
    }
}

fn cell(q: &str, v: f64, sys: UnitSystem) -> String {
    if !v.is_finite() {
        return String::new();
    }
    let (shown, places) = quantity(q).map_or((v, 3), |q| {
        (q.show(sys, v), usize::from(q.unit(sys).decimals) + 2)
    });
    format!("{shown:.places$}")
}

/// The night as CSV in the chosen units (units in the header): time, air, the warmest
/// snow surface, melt, CO₂, then every surface.
pub fn night_csv(r: &ShelterReport, sys: UnitSystem) -> String {
    let mut out = vec![
        header("time", "hours", sys),
        header("air inside", "temperature", sys),
        header("warmest snow surface", "temperature", sys),
        header("melting", "mass_rate", sys),
        header("CO2", "ppm", sys),
    ];
    for n in &r.night.surface_names {
        out.push(header(
            &format!("surface: {}", n.replace(',', ";")),
            "temperature",
            sys,
        ));
    }
    let mut text = out.join(",");
    text.push('\n');
    for p in &r.night.samples {
        let mut row = vec![
            cell("hours", p.time_s, sys),
            cell("temperature", p.interior_c, sys),
            cell("temperature", p.warmest_surface_c, sys),
            cell("mass_rate", p.melt_kg_h, sys),
            cell("ppm", p.co2_ppm, sys),
        ];
        row.extend(p.surfaces_c.iter().map(|&t| cell("temperature", t, sys)));
        text.push_str(&row.join(","));
        text.push('\n');
    }
    text
}

/// The three series as CSV in the chosen units (units in the header), one block after
/// another: series, x, air inside, melting, CO₂.
pub fn sweeps_csv(r: &ShelterReport, sys: UnitSystem) -> String {
    let mut text = [
        "series".to_string(),
        "x".to_string(),
        "x unit".to_string(),
        header("air inside", "temperature", sys),
        header("melting", "mass_rate", sys),
        header("CO2", "ppm", sys),
    ]
    .join(",");
    text.push('\n');
    for s in &r.sweeps {
        let xu = quantity(s.x_quantity).map_or("", |q| q.unit(sys).symbol);
        let xu = if xu.is_empty() { "people" } else { xu };
        for p in &s.points {
            text.push_str(&format!(
                "{},{},{},{},{},{}\n",
                s.id,
                cell(s.x_quantity, p.x, sys),
                xu,
                cell("temperature", p.interior_c, sys),
                cell("mass_rate", p.melt_kg_h, sys),
                p.co2_ppm.map_or(String::new(), |c| cell("ppm", c, sys)),
            ));
        }
    }
    text
}
