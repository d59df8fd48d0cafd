//! The shelter reduced to zones, its heat sources and its air exchange.
//!
//! # Zones
//!
//! | zone | geometry | sink |
//! |---|---|---|
//! | block dome | sphere sector Ω = 2π, r_i → r_i + t | outside air through h_o |
//! | hollowed pile | [`PILE_BANDS`] bands of polar angle, thickness linear from crown to base, each radial on its own (no sideways flow between bands) | outside air |
//! | drift cave | exposed share f: Ω = 2πf to the air; the rest Ω = 2π(1 − f), r_o = ∞ | air; snowpack temperature |
//! | trench | flat roof (plane, L × W); walls and floor: half-body shape factor S = √(2π A) split by area | air; snowpack (floor: its medium) |
//! | floor of dome, pile, cave | disk on a half-space, S = 2D | snowpack or ground temperature |
//!
//! A trench longer than about four widths is warned of: beyond that the compact-body shape
//! factor of its walls and floor may be 10–20 % low.
//!
//! # Conduction
//! Each zone is a piece of the inner surface joined to its sink by 1D conduction:
//!
//! - **Spherical** (dome, pile bands, a cave's exposed face): solid angle Ω, inner radius
//!   r_i, outer r_o. Wall resistance R = (1/r_i − 1/r_o)/(Ω k), the spherical-shell formula
//!   (Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, conduction in a spherical
//!   wall; for the full sphere Ω = 4π, for the hemispherical dome Ω = 2π, giving
//!   Q = 2π k ΔT r_i r_o/(r_o − r_i)). Exact for steady radial conduction with uniform k.
//! - **Deep** (snow or ground going on far from the surface): the same with r_o → ∞,
//!   R = 1/(Ω k r_i). A hemispherical cavity in a half-space whose surface plane carries no
//!   flux has R = 1/(2π k r_i), half the sphere in an infinite medium (shape factor 4π r,
//!   Incropera Table 4.1 (from memory of the table's numbering)). Other deep surfaces (a
//!   floor disk, a trench's walls and floor) are given by a shape factor S and their area A
//!   and represented as an *equivalent sphere* with r = A/S and Ω = S²/A: it has the right
//!   area (so the right early-time, plane-like response) and the right steady conductance
//!   k S. That equivalence is a device of this tool (no source) and exact only at those two
//!   limits.
//! - **Plane** (a trench's flat roof): R = t/(k A).
//!
//! Floor disk of diameter D on a half-space: S = 2D (Incropera Table 4.1, disk on a
//! semi-infinite medium, from memory). Trench walls and floor: the cavity is half of a
//! closed box mirrored in the snow surface (the surface plane taken as carrying no flux: an
//! approximation of this tool, no source); a convex body in an infinite medium has a shape
//! factor close to √(4π A) (exact for the sphere; Yovanovich's √A-scaled shape factors vary
//! little between compact convex bodies, from memory: the cube's published S = 8.24 L
//! against √(4π·6) L = 8.68 L is 5 % off), so the half-body has S = √(2π A_cav) with
//! A_cav = floor + walls. It is split between walls and floor by area. Valid for compact
//! trenches (length up to a few widths; from memory an elongated body's S rises some
//! 10–20 % above the rule).
//!
//! # Films
//! Inside: one coefficient h_i for convection and radiation (input; 6–8 W/m²K, model
//! reference, from memory). Outside: h_o = 4 + 4 v (convection, v the wind speed in m/s)
//! plus radiation 4 σ T³ (to surroundings at the air temperature, emissivity 1): the form
//! of ISO 6946 Annex A (h_ce = 4 + 4v, h_r0 = 4σT_m³; from memory). At 4 m/s and 0 °C this
//! gives 24.6 W/m²K, the standard 25 W/m²K. A clear night sky is colder than the air: that
//! loss is not included.
//!
//! # Air exchange
//! Vent: buoyancy flow through the vent hole of area A, the chamber's height H above the
//! inflow at floor level: V̇ = C_d A √(2 g H ΔT / T_i), C_d = 0.6, with the whole height
//! driving the vent flow because the entrance is much larger than the vent, so the neutral
//! plane lies near the vent (stack-effect orifice flow as in ASHRAE Fundamentals, natural
//! ventilation; from memory). Level doorway: two-way exchange through one opening of width
//! W and height h: V̇ = (C_d/3) W √(g h³ ΔT / T_i) (single-opening buoyancy exchange,
//! Linden 1999, Annu. Rev. Fluid Mech. 31:201; from memory), added to the vent flow (the two
//! flows interact; simple addition is an approximation of this tool). Loss
//! ρ c_p V̇ (T_i − T_o), air at the interior temperature: ρ = p/(R_d T_i), p = 101 325 Pa,
//! R_d = 287.05 J/kg/K, c_p = 1006 J/kg/K. No flow when the inside is not warmer.
//!
//! # Heat sources
//! People: met × 58.2 W/m² × body area (ASHRAE Fundamentals; 1 met = 58.2 W/m², read in a
//! reprint). All of it is counted as heat in the shelter: the part given off as water vapour
//! deposits as frost on the walls and releases its latent heat there (approximation of this
//! tool; what leaves by the vent is not subtracted). Candles: 80 W each (Hamins, Bundy &
//! Dillon 2005, J. Fire Prot. Eng. 15:265, from memory). Stove: its fuel power times the
//! share that heats the shelter.

use super::inputs::{
    Conditions, Entrance, Floor, Shape, Shelter, ShelterError, CONDITIONS_FIELD, SHELTER_FIELD,
};
use crate::physics::error::{check, InputErrorKind, InputErrors, Warning};
use crate::physics::materials::ice::{
    ice_specific_heat_j_kg_k, AIR_SPECIFIC_HEAT_J_PER_KG_K, KELVIN_OFFSET,
};
use crate::physics::materials::snow::{
    SnowRegression, MAX_SNOW_DENSITY_KG_M3, MIN_SNOW_DENSITY_KG_M3,
};
use std::f64::consts::PI;

/// 1 met, W per m² of body surface (ASHRAE Fundamentals, read in a reprint).
pub const MET_W_PER_M2: f64 = 58.2;
/// Heat release of one candle, W (Hamins et al. 2005, from memory).
pub const CANDLE_W: f64 = 80.0;
/// Standard gravity, m/s².
pub const GRAVITY_M_S2: f64 = 9.80665;
/// Discharge coefficient of a sharp-edged opening (model reference, from memory).
pub const DISCHARGE_COEFFICIENT: f64 = 0.6;
/// Air pressure, Pa (sea level; the vent flow and air density use it).
pub const AIR_PRESSURE_PA: f64 = 101_325.0;
/// Gas constant of dry air, J/kg/K.
pub const DRY_AIR_GAS_CONSTANT: f64 = 287.05;
/// Stefan–Boltzmann constant, W/m²/K⁴ (CODATA).
pub const STEFAN_BOLTZMANN: f64 = 5.670_374_419e-8;
/// Bands of polar angle a hollowed pile's shell is integrated in.
pub const PILE_BANDS: usize = 12;
/// Snow heat capacity per kg: that of ice at −10 °C (the project's ice fit, 2023 J/kg/K
/// against IAPWS R10-06); 4 % lower at −20 °C, 3 % higher at 0 °C.
pub fn snow_specific_heat_j_kg_k() -> f64 {
    ice_specific_heat_j_kg_k(-10.0)
}

/// Outside film, W/m²K: 4 + 4 v + 4 σ T³ (ISO 6946 Annex A form, from memory).
pub fn outside_film_w_m2k(wind_m_s: f64, outside_c: f64) -> f64 {
    let t = outside_c + KELVIN_OFFSET;
    4.0 + 4.0 * wind_m_s + 4.0 * STEFAN_BOLTZMANN * t * t * t
}

/// Density of air at a temperature, kg/m³ (ideal gas at [`AIR_PRESSURE_PA`]).
pub fn air_density_kg_m3(t_c: f64) -> f64 {
    AIR_PRESSURE_PA / (DRY_AIR_GAS_CONSTANT * (t_c + KELVIN_OFFSET))
}

/// How one zone conducts.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Geometry {
    /// Radial conduction in a sphere sector; `outer_radius_m` infinite for deep snow or
    /// ground.
    Sphere {
        solid_angle_sr: f64,
        inner_radius_m: f64,
        outer_radius_m: f64,
    },
    /// Straight conduction through a flat wall.
    Plane { area_m2: f64, thickness_m: f64 },
}

impl Geometry {
    /// A deep surface of area A and shape factor S as its equivalent sphere.
    pub fn equivalent_sphere(area_m2: f64, shape_factor_m: f64) -> Geometry {
        Geometry::Sphere {
            solid_angle_sr: shape_factor_m * shape_factor_m / area_m2,
            inner_radius_m: area_m2 / shape_factor_m,
            outer_radius_m: f64::INFINITY,
        }
    }

    pub fn inner_area_m2(&self) -> f64 {
        match *self {
            Geometry::Sphere {
                solid_angle_sr,
                inner_radius_m,
                ..
            } => solid_angle_sr * inner_radius_m * inner_radius_m,
            Geometry::Plane { area_m2, .. } => area_m2,
        }
    }

    pub fn outer_area_m2(&self) -> f64 {
        match *self {
            Geometry::Sphere {
                solid_angle_sr,
                outer_radius_m,
                ..
            } => solid_angle_sr * outer_radius_m * outer_radius_m,
            Geometry::Plane { area_m2, .. } => area_m2,
        }
    }

    /// Conduction resistance of the wall, K/W.
    pub fn wall_resistance_k_w(&self, k: f64) -> f64 {
        match *self {
            Geometry::Sphere {
                solid_angle_sr,
                inner_radius_m,
                outer_radius_m,
            } => (1.0 / inner_radius_m - 1.0 / outer_radius_m) / (solid_angle_sr * k),
            Geometry::Plane {
                area_m2,
                thickness_m,
            } => thickness_m / (k * area_m2),
        }
    }
}

/// Where a zone's heat goes.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Sink {
    /// The outside air, through the outer film (W/m²K).
    OutsideAir { film_w_m2k: f64 },
    /// Deep snow or ground held at a temperature.
    Deep { temperature_c: f64 },
}

/// Whether a zone is wall and roof or floor (for the breakdown of losses).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Part {
    WallsAndRoof,
    Floor,
}

/// One piece of the inner surface and its path to its sink.
#[derive(Debug, Clone, PartialEq)]
pub struct Zone {
    /// Plain name ("dome", "band 3 of 12", "exposed face", "roof", "floor", …).
    pub name: String,
    pub part: Part,
    pub geometry: Geometry,
    pub conductivity_w_m_k: f64,
    pub heat_capacity_j_m3_k: f64,
    pub sink: Sink,
    /// The inner surface is snow: held at 0 °C at most, surplus heat melts it.
    pub melts: bool,
    /// A hung lining would cover it (walls and roof, not the floor).
    pub lined: bool,
    /// Resistance of what covers the surface for good (mats on the floor), m²K/W.
    pub cover_m2k_w: f64,
}

impl Zone {
    /// Inner film (and lining) resistance, K/W.
    pub fn inner_resistance_k_w(&self, film_w_m2k: f64, lining_m2k_w: f64) -> f64 {
        let r = 1.0 / film_w_m2k + self.cover_m2k_w + if self.lined { lining_m2k_w } else { 0.0 };
        r / self.geometry.inner_area_m2()
    }
    /// Wall and outer film resistance, K/W.
    pub fn outer_resistance_k_w(&self) -> f64 {
        let wall = self.geometry.wall_resistance_k_w(self.conductivity_w_m_k);
        match self.sink {
            Sink::OutsideAir { film_w_m2k } => {
                wall + 1.0 / (film_w_m2k * self.geometry.outer_area_m2())
            }
            Sink::Deep { .. } => wall,
        }
    }
    pub fn sink_c(&self, outside_c: f64) -> f64 {
        match self.sink {
            Sink::OutsideAir { .. } => outside_c,
            Sink::Deep { temperature_c } => temperature_c,
        }
    }
}

/// Heat given off inside, W.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Gains {
    pub people_w: f64,
    pub candles_w: f64,
    pub stove_w: f64,
    pub total_w: f64,
}

/// The resolved shelter: zones, sources, openings, SI throughout.
#[derive(Debug, Clone, PartialEq)]
pub struct Model {
    pub zones: Vec<Zone>,
    pub inside_film_w_m2k: f64,
    pub lining_m2k_w: f64,
    pub outside_c: f64,
    pub outside_film_w_m2k: f64,
    pub gains: Gains,
    pub vent_area_m2: f64,
    /// Height driving the vent flow (the chamber's inner height), m.
    pub stack_height_m: f64,
    /// Level doorway opening (width, height), m.
    pub door_m: Option<(f64, f64)>,
    pub air_volume_m3: f64,
    pub snow_density_kg_m3: f64,
    pub snow_conductivity_w_m_k: f64,
    pub snow_regression: SnowRegression,
    /// CO₂ given off inside, m³/s (see [`mod@super::steady`]).
    pub co2_source_m3_s: f64,
    /// Heat capacity per volume of snow, J/m³K.
    pub snow_heat_capacity_j_m3_k: f64,
}

/// Limits of what is accepted (beyond them: an error naming the field).
pub mod limits {
    pub const INNER_RADIUS_M: (f64, f64) = (0.3, 5.0);
    pub const THICKNESS_M: (f64, f64) = (0.02, 3.0);
    pub const TRENCH_LENGTH_M: (f64, f64) = (0.5, 20.0);
    pub const TRENCH_WIDTH_M: (f64, f64) = (0.3, 10.0);
    pub const TRENCH_DEPTH_M: (f64, f64) = (0.3, 5.0);
    pub const GROUND_CONDUCTIVITY_W_M_K: (f64, f64) = (0.05, 10.0);
    pub const GROUND_HEAT_CAPACITY_J_M3_K: (f64, f64) = (1.0e5, 5.0e6);
    pub const GROUND_C: (f64, f64) = (-50.0, 10.0);
    pub const OPENING_M: (f64, f64) = (0.05, 3.0);
    pub const VENT_DIAMETER_M: (f64, f64) = (0.0, 0.5);
    pub const INSIDE_FILM_W_M2K: (f64, f64) = (1.0, 50.0);
    pub const LINING_M2K_W: (f64, f64) = (0.0, 2.0);
    pub const FLOOR_COVER_M2K_W: (f64, f64) = (0.0, 10.0);
    pub const OUTSIDE_C: (f64, f64) = (-70.0, 0.0);
    pub const WIND_M_S: (f64, f64) = (0.0, 50.0);
    pub const SNOWPACK_C: (f64, f64) = (-60.0, 0.0);
    pub const PEOPLE: u32 = 50;
    pub const BODY_AREA_M2: (f64, f64) = (0.5, 2.6);
    pub const CANDLES: u32 = 50;
    pub const STOVE_W: (f64, f64) = (0.0, 20_000.0);
    /// Walls and roofs thinner than this draw a warning (FM 21-76 for caves and hollowed
    /// piles, see [`mod@super::super::cautions`]).
    pub const THIN_WALL_M: f64 = 0.30;
}

fn count(errs: &mut InputErrors, field: &str, n: u32, max: u32) {
    if n > max {
        errs.push(
            field,
            InputErrorKind::Count {
                count: n as usize,
                min: 0,
                max: max as usize,
            },
        );
    }
}

impl Shelter {
    /// Check every input, collecting all errors (each naming its field under `prefix`,
    /// e.g. `shelter.inner_radius_m`) and the warnings.
    pub fn validate(&self, prefix: &str, errs: &mut InputErrors, warnings: &mut Vec<Warning>) {
        let f = |name: &str| format!("{prefix}.{name}");
        let (t_lo, t_hi) = limits::THICKNESS_M;
        let thin = |warnings: &mut Vec<Warning>, field: String, t: f64, what: &str| {
            if t.is_finite() && t < limits::THIN_WALL_M {
                warnings.push(Warning {
                    field,
                    message: format!(
                        "{what} of {:.0} cm is thinner than about 30 cm, the least field manuals give for caves and hollowed piles (US Army FM 21-76); light showing through means it is too thin",
                        t * 100.0
                    ),
                });
            }
        };
        match self.shape {
            Shape::BlockDome {
                inner_radius_m,
                wall_thickness_m,
            } => {
                let (lo, hi) = limits::INNER_RADIUS_M;
                check::within(errs, &f("inner_radius_m"), inner_radius_m, lo, hi, "m");
                check::within(
                    errs,
                    &f("wall_thickness_m"),
                    wall_thickness_m,
                    t_lo,
                    t_hi,
                    "m",
                );
                thin(warnings, f("wall_thickness_m"), wall_thickness_m, "A wall");
            }
            Shape::HollowedPile {
                inner_radius_m,
                crown_thickness_m,
                base_thickness_m,
            } => {
                let (lo, hi) = limits::INNER_RADIUS_M;
                check::within(errs, &f("inner_radius_m"), inner_radius_m, lo, hi, "m");
                check::within(
                    errs,
                    &f("crown_thickness_m"),
                    crown_thickness_m,
                    t_lo,
                    t_hi,
                    "m",
                );
                check::within(
                    errs,
                    &f("base_thickness_m"),
                    base_thickness_m,
                    t_lo,
                    t_hi,
                    "m",
                );
                thin(
                    warnings,
                    f("crown_thickness_m"),
                    crown_thickness_m,
                    "A roof",
                );
                thin(warnings, f("base_thickness_m"), base_thickness_m, "A wall");
            }
            Shape::DriftCave {
                inner_radius_m,
                exposed_face,
            } => {
                let (lo, hi) = limits::INNER_RADIUS_M;
                check::within(errs, &f("inner_radius_m"), inner_radius_m, lo, hi, "m");
                if let Some(face) = exposed_face {
                    let field = f("exposed_face.share");
                    if check::positive(errs, &field, face.share) && face.share > 1.0 {
                        errs.push(
                            field,
                            InputErrorKind::OutOfBounds {
                                value: face.share,
                                min: 0.0,
                                max: 1.0,
                                unit: "",
                            },
                        );
                    }
                    check::within(
                        errs,
                        &f("exposed_face.thickness_m"),
                        face.thickness_m,
                        t_lo,
                        t_hi,
                        "m",
                    );
                    thin(
                        warnings,
                        f("exposed_face.thickness_m"),
                        face.thickness_m,
                        "A wall",
                    );
                }
            }
            Shape::Trench {
                length_m,
                width_m,
                depth_m,
                roof_thickness_m,
            } => {
                let (lo, hi) = limits::TRENCH_LENGTH_M;
                check::within(errs, &f("length_m"), length_m, lo, hi, "m");
                let (lo, hi) = limits::TRENCH_WIDTH_M;
                check::within(errs, &f("width_m"), width_m, lo, hi, "m");
                let (lo, hi) = limits::TRENCH_DEPTH_M;
                check::within(errs, &f("depth_m"), depth_m, lo, hi, "m");
                check::within(
                    errs,
                    &f("roof_thickness_m"),
                    roof_thickness_m,
                    t_lo,
                    t_hi,
                    "m",
                );
                thin(warnings, f("roof_thickness_m"), roof_thickness_m, "A roof");
                if length_m.is_finite() && width_m.is_finite() && length_m > 4.0 * width_m {
                    warnings.push(Warning {
                        field: f("length_m"),
                        message: "a trench longer than about four widths is outside the compact-body shape factor used for its walls and floor: their loss may be 10–20 % higher".into(),
                    });
                }
            }
        }
        let rho = self.snow_density_kg_m3;
        let field = f("snow_density_kg_m3");
        if !rho.is_finite() {
            errs.push(&field, InputErrorKind::NotFinite);
        } else if rho > MAX_SNOW_DENSITY_KG_M3 {
            errs.push(
                &field,
                InputErrorKind::DenserThanIce {
                    value: rho,
                    ice: MAX_SNOW_DENSITY_KG_M3,
                },
            );
        } else if rho < MIN_SNOW_DENSITY_KG_M3 {
            errs.push(
                &field,
                InputErrorKind::OutOfBounds {
                    value: rho,
                    min: MIN_SNOW_DENSITY_KG_M3,
                    max: MAX_SNOW_DENSITY_KG_M3,
                    unit: "kg/m³",
                },
            );
        } else {
            let (lo, hi) = self.snow_regression.valid_range_kg_m3();
            if rho < lo || rho > hi {
                warnings.push(Warning {
                    field: field.clone(),
                    message: format!(
                        "{rho} kg/m³ is outside the {lo}–{hi} kg/m³ range of {}",
                        self.snow_regression.name()
                    ),
                });
            }
        }
        if let Floor::Ground {
            conductivity_w_m_k,
            heat_capacity_j_m3_k,
            temperature_c,
        } = self.floor
        {
            let (lo, hi) = limits::GROUND_CONDUCTIVITY_W_M_K;
            check::within(
                errs,
                &f("floor.conductivity_w_m_k"),
                conductivity_w_m_k,
                lo,
                hi,
                "W/m/K",
            );
            let (lo, hi) = limits::GROUND_HEAT_CAPACITY_J_M3_K;
            check::within(
                errs,
                &f("floor.heat_capacity_j_m3_k"),
                heat_capacity_j_m3_k,
                lo,
                hi,
                "J/m³K",
            );
            let (lo, hi) = limits::GROUND_C;
            check::within(errs, &f("floor.temperature_c"), temperature_c, lo, hi, "°C");
        }
        if let Entrance::Level {
            opening_width_m,
            opening_height_m,
        } = self.entrance
        {
            let (lo, hi) = limits::OPENING_M;
            check::within(
                errs,
                &f("entrance.opening_width_m"),
                opening_width_m,
                lo,
                hi,
                "m",
            );
            check::within(
                errs,
                &f("entrance.opening_height_m"),
                opening_height_m,
                lo,
                hi,
                "m",
            );
            let height = inner_height_m(&self.shape);
            if opening_height_m.is_finite() && height.is_finite() && opening_height_m > height {
                errs.push(
                    f("entrance.opening_height_m"),
                    InputErrorKind::NotCovered(format!(
                        "a doorway {opening_height_m} m high is taller than the chamber ({height:.2} m)"
                    )),
                );
            }
        }
        let (lo, hi) = limits::VENT_DIAMETER_M;
        check::within(
            errs,
            &f("vent_diameter_m"),
            self.vent_diameter_m,
            lo,
            hi,
            "m",
        );
        let (lo, hi) = limits::INSIDE_FILM_W_M2K;
        check::within(
            errs,
            &f("inside_film_w_m2k"),
            self.inside_film_w_m2k,
            lo,
            hi,
            "W/m²K",
        );
        let (lo, hi) = limits::LINING_M2K_W;
        check::within(
            errs,
            &f("lining_m2k_per_w"),
            self.lining_m2k_w,
            lo,
            hi,
            "m²K/W",
        );
        let (lo, hi) = limits::FLOOR_COVER_M2K_W;
        check::within(
            errs,
            &f("floor_cover_m2k_per_w"),
            self.floor_cover_m2k_w,
            lo,
            hi,
            "m²K/W",
        );
    }
}

impl Conditions {
    /// Check every input, each error naming its field under `prefix`.
    pub fn validate(&self, prefix: &str, errs: &mut InputErrors, warnings: &mut Vec<Warning>) {
        let f = |name: &str| format!("{prefix}.{name}");
        let (lo, hi) = limits::OUTSIDE_C;
        check::within(errs, &f("outside_c"), self.outside_c, lo, hi, "°C");
        let (lo, hi) = limits::WIND_M_S;
        check::within(errs, &f("wind_m_s"), self.wind_m_s, lo, hi, "m/s");
        let (lo, hi) = limits::SNOWPACK_C;
        check::within(errs, &f("snowpack_c"), self.snowpack_c, lo, hi, "°C");
        count(errs, &f("people"), self.people, limits::PEOPLE);
        let (lo, hi) = limits::BODY_AREA_M2;
        check::within(errs, &f("body_area_m2"), self.body_area_m2, lo, hi, "m²");
        count(errs, &f("candles"), self.candles, limits::CANDLES);
        let (lo, hi) = limits::STOVE_W;
        check::within(errs, &f("stove_w"), self.stove_w, lo, hi, "W");
        check::within(
            errs,
            &f("stove_heat_share"),
            self.stove_heat_share,
            0.0,
            1.0,
            "",
        );
        if self.stove_w > 0.0 && self.stove_w.is_finite() {
            warnings.push(Warning {
                field: f("stove_w"),
                message: "a stove burning inside makes carbon monoxide, which has no smell: keep the vent open, never sleep with it burning (Keyes et al. 2001; Gill 1994)".into(),
            });
        }
        if self.candles > 0 {
            warnings.push(Warning {
                field: f("candles"),
                message: "candles make carbon monoxide and use oxygen: keep the vent open and put them out before sleeping (US Army FM 21-76)".into(),
            });
        }
    }
}

/// Inner height of the chamber, m.
pub fn inner_height_m(shape: &Shape) -> f64 {
    match *shape {
        Shape::BlockDome { inner_radius_m, .. }
        | Shape::HollowedPile { inner_radius_m, .. }
        | Shape::DriftCave { inner_radius_m, .. } => inner_radius_m,
        Shape::Trench { depth_m, .. } => depth_m,
    }
}

/// CO₂ of burning a hydrocarbon fuel per joule of its heat, m³/J at 0 °C and 1 atm:
/// 44/14 kg CO₂ per kg of (CH₂)ₙ fuel (stoichiometry), a heating value of 43 MJ/kg
/// (paraffin wax, kerosene; from memory; butane and white gas are within about 10 %), and a
/// CO₂ density of 1.977 kg/m³ at 0 °C, 1 atm (from memory).
pub const FUEL_CO2_M3_PER_J: f64 = (44.0 / 14.0) / 43.0e6 / 1.977;
/// CO₂ given off by one person at 1.2 met, m³/s (0.0052 L/s, ASTM D6245 / ASHRAE 62.1
/// background, from memory), scaled in proportion to the metabolic rate.
pub const PERSON_CO2_M3_S_AT_1_2_MET: f64 = 0.0052e-3;

impl Model {
    /// Check the inputs and build the zones with the shelter's own snow regression.
    pub fn build(
        shelter: &Shelter,
        conditions: &Conditions,
    ) -> Result<(Model, Vec<Warning>), ShelterError> {
        let mut errs = InputErrors::default();
        let mut warnings = Vec::new();
        shelter.validate(SHELTER_FIELD, &mut errs, &mut warnings);
        conditions.validate(CONDITIONS_FIELD, &mut errs, &mut warnings);
        errs.into_result()?;
        Ok((
            Model::assemble(shelter, conditions, shelter.snow_regression),
            warnings,
        ))
    }

    /// Build the zones from inputs already checked, with any regression.
    pub(crate) fn assemble(
        shelter: &Shelter,
        conditions: &Conditions,
        regression: SnowRegression,
    ) -> Model {
        let rho = shelter.snow_density_kg_m3;
        let k_snow = regression.conductivity_w_m_k(rho);
        let c_snow = rho * snow_specific_heat_j_kg_k();
        let h_o = outside_film_w_m2k(conditions.wind_m_s, conditions.outside_c);
        let air = Sink::OutsideAir { film_w_m2k: h_o };
        let deep_snow = Sink::Deep {
            temperature_c: conditions.snowpack_c,
        };
        let snow_zone = |name: String, geometry: Geometry, sink: Sink, part: Part| Zone {
            name,
            part,
            geometry,
            conductivity_w_m_k: k_snow,
            heat_capacity_j_m3_k: c_snow,
            sink,
            melts: true,
            lined: part == Part::WallsAndRoof,
            cover_m2k_w: if part == Part::Floor {
                shelter.floor_cover_m2k_w
            } else {
                0.0
            },
        };
        let floor_zone = |name: &str, geometry: Geometry| match shelter.floor {
            Floor::Snow => snow_zone(name.into(), geometry, deep_snow, Part::Floor),
            Floor::Ground {
                conductivity_w_m_k,
                heat_capacity_j_m3_k,
                temperature_c,
            } => Zone {
                name: name.into(),
                part: Part::Floor,
                geometry,
                conductivity_w_m_k,
                heat_capacity_j_m3_k,
                sink: Sink::Deep { temperature_c },
                melts: false,
                lined: false,
                cover_m2k_w: shelter.floor_cover_m2k_w,
            },
        };
        let mut zones = Vec::new();
        let disk_floor = |r: f64| {
            // Disk of diameter D = 2r on a half-space: S = 2D.
            Geometry::equivalent_sphere(PI * r * r, 4.0 * r)
        };
        let air_volume_m3 = match shelter.shape {
            Shape::BlockDome {
                inner_radius_m: r,
                wall_thickness_m: t,
            } => {
                zones.push(snow_zone(
                    "dome".into(),
                    Geometry::Sphere {
                        solid_angle_sr: 2.0 * PI,
                        inner_radius_m: r,
                        outer_radius_m: r + t,
                    },
                    air,
                    Part::WallsAndRoof,
                ));
                zones.push(floor_zone("floor", disk_floor(r)));
                2.0 / 3.0 * PI * r * r * r
            }
            Shape::HollowedPile {
                inner_radius_m: r,
                crown_thickness_m,
                base_thickness_m,
            } => {
                for b in 0..PILE_BANDS {
                    let th0 = 0.5 * PI * b as f64 / PILE_BANDS as f64;
                    let th1 = 0.5 * PI * (b + 1) as f64 / PILE_BANDS as f64;
                    let mid = 0.5 * (th0 + th1) / (0.5 * PI);
                    let t = crown_thickness_m + (base_thickness_m - crown_thickness_m) * mid;
                    zones.push(snow_zone(
                        format!("band {} of {PILE_BANDS} from the crown", b + 1),
                        Geometry::Sphere {
                            solid_angle_sr: 2.0 * PI * (th0.cos() - th1.cos()),
                            inner_radius_m: r,
                            outer_radius_m: r + t,
                        },
                        air,
                        Part::WallsAndRoof,
                    ));
                }
                zones.push(floor_zone("floor", disk_floor(r)));
                2.0 / 3.0 * PI * r * r * r
            }
            Shape::DriftCave {
                inner_radius_m: r,
                exposed_face,
            } => {
                let share = exposed_face.map(|f| f.share).unwrap_or(0.0);
                if let Some(face) = exposed_face {
                    zones.push(snow_zone(
                        "exposed face".into(),
                        Geometry::Sphere {
                            solid_angle_sr: 2.0 * PI * share,
                            inner_radius_m: r,
                            outer_radius_m: r + face.thickness_m,
                        },
                        air,
                        Part::WallsAndRoof,
                    ));
                }
                if share < 1.0 {
                    zones.push(snow_zone(
                        "walls in deep snow".into(),
                        Geometry::Sphere {
                            solid_angle_sr: 2.0 * PI * (1.0 - share),
                            inner_radius_m: r,
                            outer_radius_m: f64::INFINITY,
                        },
                        deep_snow,
                        Part::WallsAndRoof,
                    ));
                }
                zones.push(floor_zone("floor", disk_floor(r)));
                2.0 / 3.0 * PI * r * r * r
            }
            Shape::Trench {
                length_m: l,
                width_m: w,
                depth_m: d,
                roof_thickness_m: t,
            } => {
                zones.push(snow_zone(
                    "roof".into(),
                    Geometry::Plane {
                        area_m2: l * w,
                        thickness_m: t,
                    },
                    air,
                    Part::WallsAndRoof,
                ));
                let a_floor = l * w;
                let a_walls = 2.0 * d * (l + w);
                let s = (2.0 * PI * (a_floor + a_walls)).sqrt();
                let share = |a: f64| s * a / (a_floor + a_walls);
                zones.push(snow_zone(
                    "walls".into(),
                    Geometry::equivalent_sphere(a_walls, share(a_walls)),
                    deep_snow,
                    Part::WallsAndRoof,
                ));
                zones.push(floor_zone(
                    "floor",
                    Geometry::equivalent_sphere(a_floor, share(a_floor)),
                ));
                l * w * d
            }
        };
        let met = conditions.activity.met();
        let people_w = conditions.people as f64 * met * MET_W_PER_M2 * conditions.body_area_m2;
        let candles_w = conditions.candles as f64 * CANDLE_W;
        let stove_w = conditions.stove_w * conditions.stove_heat_share;
        let co2_source_m3_s = conditions.people as f64 * PERSON_CO2_M3_S_AT_1_2_MET * met / 1.2
            + (candles_w + conditions.stove_w) * FUEL_CO2_M3_PER_J;
        let door_m = match shelter.entrance {
            Entrance::ColdTrap => None,
            Entrance::Level {
                opening_width_m,
                opening_height_m,
            } => Some((opening_width_m, opening_height_m)),
        };
        Model {
            zones,
            inside_film_w_m2k: shelter.inside_film_w_m2k,
            lining_m2k_w: shelter.lining_m2k_w,
            outside_c: conditions.outside_c,
            outside_film_w_m2k: h_o,
            gains: Gains {
                people_w,
                candles_w,
                stove_w,
                total_w: people_w + candles_w + stove_w,
            },
            vent_area_m2: 0.25 * PI * shelter.vent_diameter_m * shelter.vent_diameter_m,
            stack_height_m: inner_height_m(&shelter.shape),
            door_m,
            air_volume_m3,
            snow_density_kg_m3: rho,
            snow_conductivity_w_m_k: k_snow,
            snow_regression: regression,
            co2_source_m3_s,
            snow_heat_capacity_j_m3_k: c_snow,
        }
    }

    /// Buoyancy flow out of the vent, m³/s, at interior air `t_i_c`.
    pub fn vent_flow_m3_s(&self, t_i_c: f64) -> f64 {
        let dt = t_i_c - self.outside_c;
        if dt <= 0.0 || self.vent_area_m2 <= 0.0 {
            return 0.0;
        }
        DISCHARGE_COEFFICIENT
            * self.vent_area_m2
            * (2.0 * GRAVITY_M_S2 * self.stack_height_m * dt / (t_i_c + KELVIN_OFFSET)).sqrt()
    }

    /// Two-way exchange through a level doorway, m³/s.
    pub fn door_flow_m3_s(&self, t_i_c: f64) -> f64 {
        let dt = t_i_c - self.outside_c;
        match self.door_m {
            Some((w, h)) if dt > 0.0 => {
                DISCHARGE_COEFFICIENT / 3.0
                    * w
                    * (GRAVITY_M_S2 * h * h * h * dt / (t_i_c + KELVIN_OFFSET)).sqrt()
            }
            _ => 0.0,
        }
    }

    /// Heat carried out by the air exchanged through vent and doorway, W.
    pub fn air_loss_w(&self, t_i_c: f64) -> (f64, f64) {
        let per = air_density_kg_m3(t_i_c)
            * AIR_SPECIFIC_HEAT_J_PER_KG_K
            * (t_i_c - self.outside_c).max(0.0);
        (
            per * self.vent_flow_m3_s(t_i_c),
            per * self.door_flow_m3_s(t_i_c),
        )
    }
}
