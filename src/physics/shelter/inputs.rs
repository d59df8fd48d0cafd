//! What a snow shelter is and the night it faces: shape, snow, floor, entrance, vent,
//! films, people and heat sources, with the field paths their checks use.
//!
//! [`Shelter`] (shape, snow density and regression, floor, entrance, vent, inside film,
//! lining, floor cover) and [`Conditions`] (outside air, wind, snowpack, people, activity,
//! body area, candles, stove and its heat share) are checked by their `validate(prefix, …)`
//! in [`super::model`]: every error with its field, directly under the prefix
//! (`shelter.inner_radius_m`, `shelter.entrance.opening_width_m`,
//! `shelter.conditions.outside_c`; the night's under `shelter.night`), and warnings for a
//! wall under 30 cm, a density outside the chosen regression's range, a stove, candles and
//! an elongated trench. The file format moves a shape's fields under `shelter.shape.`.

use crate::physics::error::InputErrors;
use crate::physics::materials::snow::SnowRegression;

/// Field path of the shelter inputs.
pub const SHELTER_FIELD: &str = "shelter";
/// Field path of the conditions.
pub const CONDITIONS_FIELD: &str = "shelter.conditions";
/// Field path of the night settings.
pub const NIGHT_FIELD: &str = "shelter.night";

/// Why a shelter computation gave no answer.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum ShelterError {
    /// Inputs at fault, each naming its field.
    #[error("{0}")]
    Input(InputErrors),
    /// A root-finder could not bracket or close on its answer (a bug or an input the checks
    /// let through; never a silent wrong number).
    #[error("no converged {quantity}: {detail}")]
    NoConvergence {
        quantity: &'static str,
        detail: String,
    },
}

impl From<InputErrors> for ShelterError {
    fn from(e: InputErrors) -> Self {
        ShelterError::Input(e)
    }
}

/// The shape of the shelter.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Shape {
    /// A dome of snow blocks: a hemispherical shell of uniform thickness on a flat floor.
    /// Joints between blocks are taken as snow of the same density.
    BlockDome {
        inner_radius_m: f64,
        wall_thickness_m: f64,
    },
    /// A pile of snow, hollowed out: a hemispherical chamber whose wall thickness varies
    /// linearly with the polar angle from the crown (top) to the base (floor level). The
    /// shell is integrated in [`super::model::PILE_BANDS`] bands of polar angle, each
    /// conducting radially on its own.
    HollowedPile {
        inner_radius_m: f64,
        crown_thickness_m: f64,
        base_thickness_m: f64,
    },
    /// A cave dug into a drift: a hemispherical chamber surrounded by deep snow at the
    /// snowpack temperature, with optionally one face toward the outside air through a
    /// thinner wall.
    DriftCave {
        inner_radius_m: f64,
        exposed_face: Option<ExposedFace>,
    },
    /// A trench cut into the snowpack, roofed with flat snow blocks at the snow surface:
    /// the roof conducts to the outside air as a plane wall; walls and floor lose heat into
    /// the snowpack (and the ground, if the floor is ground).
    Trench {
        length_m: f64,
        width_m: f64,
        depth_m: f64,
        roof_thickness_m: f64,
    },
}

/// The part of a cave's chamber whose wall meets the outside air.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ExposedFace {
    /// Share of the chamber's curved surface (0–1] that faces the outside air.
    pub share: f64,
    /// Snow between that face and the outside air, m.
    pub thickness_m: f64,
}

impl Shape {
    /// The thickness the least-wall search and the sweeps vary: a dome's wall, a pile's crown (its base keeps
    /// its ratio to the crown), a cave's exposed face, a trench's roof. `None` for a cave
    /// with no exposed face.
    pub fn main_thickness_m(&self) -> Option<f64> {
        match *self {
            Shape::BlockDome {
                wall_thickness_m, ..
            } => Some(wall_thickness_m),
            Shape::HollowedPile {
                crown_thickness_m, ..
            } => Some(crown_thickness_m),
            Shape::DriftCave { exposed_face, .. } => exposed_face.map(|f| f.thickness_m),
            Shape::Trench {
                roof_thickness_m, ..
            } => Some(roof_thickness_m),
        }
    }

    /// The same shape with its main thickness set to `t` (see [`Shape::main_thickness_m`]).
    pub fn with_main_thickness(&self, t: f64) -> Shape {
        let mut s = *self;
        match &mut s {
            Shape::BlockDome {
                wall_thickness_m, ..
            } => *wall_thickness_m = t,
            Shape::HollowedPile {
                crown_thickness_m,
                base_thickness_m,
                ..
            } => {
                let ratio = if *crown_thickness_m > 0.0 {
                    *base_thickness_m / *crown_thickness_m
                } else {
                    1.0
                };
                *crown_thickness_m = t;
                *base_thickness_m = t * ratio;
            }
            Shape::DriftCave { exposed_face, .. } => {
                if let Some(f) = exposed_face {
                    f.thickness_m = t;
                }
            }
            Shape::Trench {
                roof_thickness_m, ..
            } => *roof_thickness_m = t,
        }
        s
    }

    /// The field name of the main thickness.
    pub fn main_thickness_field(&self) -> &'static str {
        match self {
            Shape::BlockDome { .. } => "wall_thickness_m",
            Shape::HollowedPile { .. } => "crown_thickness_m",
            Shape::DriftCave { .. } => "exposed_face.thickness_m",
            Shape::Trench { .. } => "roof_thickness_m",
        }
    }
}

/// What the shelter stands on.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Floor {
    /// Snow of the shelter's density, losing heat to the snowpack at its temperature.
    Snow,
    /// Ground (soil or rock) at a temperature, with its own properties.
    Ground {
        conductivity_w_m_k: f64,
        heat_capacity_j_m3_k: f64,
        temperature_c: f64,
    },
}

/// How people get in.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Entrance {
    /// A passage that drops below the floor and rises into the chamber: the cold air pools
    /// in it and does not exchange with the warmer air above (stable layering), so it adds
    /// no loss of its own.
    ColdTrap,
    /// A doorway level with the floor: warm air leaves through its upper part and cold air
    /// comes in through its lower part. `opening_*` is the part left open.
    Level {
        opening_width_m: f64,
        opening_height_m: f64,
    },
}

/// The shelter as built.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Shelter {
    pub shape: Shape,
    /// Density of the snow of walls, roof, surrounding snowpack and a snow floor, kg/m³.
    pub snow_density_kg_m3: f64,
    /// The regression giving the snow's conductivity from its density.
    pub snow_regression: SnowRegression,
    pub floor: Floor,
    pub entrance: Entrance,
    /// Diameter of the vent hole at the top, m (0: no vent).
    pub vent_diameter_m: f64,
    /// Inside surface film (convection and radiation together), W/m²K.
    pub inside_film_w_m2k: f64,
    /// Resistance of a hung lining (fabric with an air gap behind it), m²K/W: used to show
    /// what a lining would change when the inner surface would melt.
    pub lining_m2k_w: f64,
    /// Resistance of what covers the floor (sleeping mats, branches), averaged over the
    /// whole floor, m²K/W (0: bare). Mats are rated in m²K/W (ASTM F3340, from memory); for
    /// a mat covering part of the floor, average the conductances 1/(1/h + R) by area
    /// (area-weighted U, common practice) and give the equivalent R.
    pub floor_cover_m2k_w: f64,
}

/// What people do, with its metabolic rate in met (1 met = 58.2 W/m² of body surface).
///
/// Values from the table of typical metabolic rates of ASHRAE Handbook — Fundamentals
/// (chapter "Thermal comfort"), read in a reprint of that table: sleeping 0.7, reclining
/// 0.8, seated quiet 1.0, standing relaxed 1.2, walking on the level at 0.9 m/s 2.0, lifting
/// and packing 2.1. Cooking is given there as 1.6–2.0 (from memory); its midpoint 1.8 is used.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Activity {
    Sleeping,
    Reclining,
    SeatedQuiet,
    StandingRelaxed,
    Cooking,
    WalkingSlowly,
    LiftingAndPacking,
}

impl Activity {
    pub const ALL: [Activity; 7] = [
        Activity::Sleeping,
        Activity::Reclining,
        Activity::SeatedQuiet,
        Activity::StandingRelaxed,
        Activity::Cooking,
        Activity::WalkingSlowly,
        Activity::LiftingAndPacking,
    ];

    /// Metabolic rate, met.
    pub fn met(self) -> f64 {
        match self {
            Activity::Sleeping => 0.7,
            Activity::Reclining => 0.8,
            Activity::SeatedQuiet => 1.0,
            Activity::StandingRelaxed => 1.2,
            Activity::Cooking => 1.8,
            Activity::WalkingSlowly => 2.0,
            Activity::LiftingAndPacking => 2.1,
        }
    }

    /// Stable identifier.
    pub fn id(self) -> &'static str {
        match self {
            Activity::Sleeping => "sleeping",
            Activity::Reclining => "reclining",
            Activity::SeatedQuiet => "seated-quiet",
            Activity::StandingRelaxed => "standing-relaxed",
            Activity::Cooking => "cooking",
            Activity::WalkingSlowly => "walking-slowly",
            Activity::LiftingAndPacking => "lifting-and-packing",
        }
    }

    pub fn from_id(id: &str) -> Option<Self> {
        Self::ALL.into_iter().find(|a| a.id() == id)
    }

    /// Plain description.
    pub fn name(self) -> &'static str {
        match self {
            Activity::Sleeping => "Sleeping",
            Activity::Reclining => "Lying awake",
            Activity::SeatedQuiet => "Sitting quietly",
            Activity::StandingRelaxed => "Standing, relaxed",
            Activity::Cooking => "Cooking",
            Activity::WalkingSlowly => "Walking slowly (0.9 m/s)",
            Activity::LiftingAndPacking => "Lifting and packing",
        }
    }

    /// Where the met value comes from.
    pub fn source(self) -> &'static str {
        match self {
            Activity::Cooking => {
                "ASHRAE Handbook — Fundamentals, typical metabolic rates: 1.6–2.0 met, midpoint used (from memory)"
            }
            _ => "ASHRAE Handbook — Fundamentals, typical metabolic rates (read in a reprint of the table)",
        }
    }
}

/// The weather and what is inside.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Conditions {
    /// Outside air temperature, °C (at most 0 °C: a shelter in thawing weather is not
    /// covered).
    pub outside_c: f64,
    /// Wind speed at the shelter, m/s.
    pub wind_m_s: f64,
    /// Temperature of the snowpack deep around and below the shelter, °C.
    pub snowpack_c: f64,
    /// Number of people inside.
    pub people: u32,
    pub activity: Activity,
    /// Body surface area of one person, m² (about 1.8 for an adult: ASHRAE Fundamentals).
    pub body_area_m2: f64,
    /// Candles burning.
    pub candles: u32,
    /// Fuel power of a stove burning inside, W (0: none).
    pub stove_w: f64,
    /// Share of the stove's power that heats the shelter (0–1); the rest goes, for example,
    /// into a pot of melting snow.
    pub stove_heat_share: f64,
}

/// Body surface area of one adult, m²: about 1.8 (the DuBois area of an average adult,
/// ASHRAE Fundamentals, chapter on thermal comfort; from memory).
pub const BODY_AREA_M2: f64 = 1.8;

/// Inside surface film of a snow shelter (convection in still air and radiation between
/// the snow surfaces together), W/(m²·K): 7 (common practice, no source).
pub const INSIDE_FILM_W_M2K: f64 = 7.0;

impl Default for Conditions {
    /// An invented calm night: −15 °C outside, 2 m/s wind, snowpack at −8 °C, two people
    /// sleeping, no flame.
    fn default() -> Self {
        Conditions {
            outside_c: -15.0,
            wind_m_s: 2.0,
            snowpack_c: -8.0,
            people: 2,
            activity: Activity::Sleeping,
            body_area_m2: BODY_AREA_M2,
            candles: 0,
            stove_w: 0.0,
            stove_heat_share: 1.0,
        }
    }
}
