//! Materials: what a layer is made of, and the properties the solvers need.
//!
//! A [`MaterialSpec`] is what the user chose (snow of this density by this regression, a silt
//! of this dry density and water content, ...). [`MaterialSpec::resolve`] validates it and
//! gives a [`Material`]: the conductivity law on either side of 0 °C, heat capacities and
//! latent heat, all SI. Every model cites its source where it is defined; a model used
//! outside its published range gives a [`Warning`], not an error.
//!
//! One file per physical family: [`snow`] (the snow regressions), [`ice`] (ice, water and
//! still air), [`soil`] (Kersten, Johansen, Côté & Konrad), [`law`] (the conductivity law
//! on either side of 0 °C and its Kirchhoff transform). Insulation boards ([`Board`]) and
//! concrete are here.

pub mod ice;
pub mod law;
pub mod snow;
pub mod soil;

pub use law::{Branch, ConductivityLaw};
pub use snow::SnowRegression;
pub use soil::{SoilInput, SoilModel, SoilProperties, Texture};

use crate::physics::error::{check, InputError, InputErrorKind, InputErrors, Warning};

/// Generic insulation boards. Nominal conductivities are typical published values for the
/// product class (common practice, no single source; individual products differ, so the
/// user may override them): XPS 0.029 W/m/K (≈ R-5 per inch), EPS 0.036 (≈ R-4 per inch),
/// polyisocyanurate 0.024 (≈ R-6 per inch), mineral-wool board 0.036.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Board {
    ExtrudedPolystyrene,
    ExpandedPolystyrene,
    Polyisocyanurate,
    MineralWool,
}

impl Board {
    pub const ALL: [Board; 4] = [
        Board::ExtrudedPolystyrene,
        Board::ExpandedPolystyrene,
        Board::Polyisocyanurate,
        Board::MineralWool,
    ];
    pub fn id(self) -> &'static str {
        match self {
            Board::ExtrudedPolystyrene => "xps",
            Board::ExpandedPolystyrene => "eps",
            Board::Polyisocyanurate => "polyiso",
            Board::MineralWool => "mineral-wool",
        }
    }
    pub fn from_id(id: &str) -> Option<Self> {
        Self::ALL.into_iter().find(|b| b.id() == id)
    }
    pub fn name(self) -> &'static str {
        match self {
            Board::ExtrudedPolystyrene => "Extruded polystyrene board (XPS)",
            Board::ExpandedPolystyrene => "Expanded polystyrene board (EPS)",
            Board::Polyisocyanurate => "Polyisocyanurate board",
            Board::MineralWool => "Mineral wool board",
        }
    }
    pub fn nominal_conductivity_w_m_k(self) -> f64 {
        match self {
            Board::ExtrudedPolystyrene => 0.029,
            Board::ExpandedPolystyrene => 0.036,
            Board::Polyisocyanurate => 0.024,
            Board::MineralWool => 0.036,
        }
    }
    /// Density kg/m³ and specific heat J/kg/K, typical of the class (common practice).
    pub fn density_and_specific_heat(self) -> (f64, f64) {
        match self {
            Board::ExtrudedPolystyrene => (32.0, 1500.0),
            Board::ExpandedPolystyrene => (20.0, 1500.0),
            Board::Polyisocyanurate => (32.0, 1400.0),
            Board::MineralWool => (120.0, 840.0),
        }
    }
}

/// Normal-weight concrete: k 1.7 W/m/K, 2300 kg/m³, 880 J/kg/K (typical values; handbooks
/// list about 1.4–2.9 W/m/K for normal-weight concrete; from memory).
pub const CONCRETE_CONDUCTIVITY_W_PER_M_K: f64 = 1.7;
const CONCRETE_DENSITY: f64 = 2300.0;
const CONCRETE_SPECIFIC_HEAT: f64 = 880.0;

/// What a layer is made of, as chosen by the user (SI).
#[derive(Debug, Clone, PartialEq)]
pub enum MaterialSpec {
    Snow {
        density_kg_m3: f64,
        regression: SnowRegression,
    },
    Ice,
    Water,
    Air,
    Soil(SoilInput),
    Insulation {
        board: Board,
        /// `None`: the board's nominal conductivity.
        conductivity_w_m_k: Option<f64>,
        /// Share of the R-value lost to absorbed moisture in buried use, percent.
        moisture_derating_pct: f64,
    },
    Concrete {
        conductivity_w_m_k: Option<f64>,
    },
    Custom {
        label: String,
        conductivity_w_m_k: f64,
        /// `None`: same as unfrozen.
        frozen_conductivity_w_m_k: Option<f64>,
        density_kg_m3: f64,
        specific_heat_j_kg_k: f64,
    },
}

/// Which family a material belongs to, for state reporting and checks.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Family {
    Snow,
    Ice,
    Water,
    Air,
    Soil,
    Insulation,
    Concrete,
    Custom,
}

/// Resolved properties of one material (SI).
#[derive(Debug, Clone, PartialEq)]
pub struct Material {
    pub family: Family,
    /// Display label, e.g. "Snow 350 kg/m³ (Sturm et al. 1997 (quadratic))".
    pub label: String,
    pub conductivity: ConductivityLaw,
    /// Whether the material holds water that freezes at 0 °C.
    pub freezes: bool,
    /// Density, kg/m³ (bulk, wet where the material holds water).
    pub density_kg_m3: f64,
    /// Volumetric heat capacity below and above 0 °C, J/m³/K.
    pub c_frozen_j_m3k: f64,
    pub c_unfrozen_j_m3k: f64,
    /// Latent heat released on freezing, J/m³.
    pub latent_j_m3: f64,
    /// Temperature range (°C) over which the properties hold; outside it, a warning.
    pub valid_temperature_c: (f64, f64),
}

impl MaterialSpec {
    /// Validate and compute properties. `field` is the material's path in the scenario,
    /// e.g. `layers[0].material`.
    pub fn resolve(
        &self,
        field: &str,
        warnings: &mut Vec<Warning>,
    ) -> Result<Material, InputErrors> {
        match self {
            MaterialSpec::Snow {
                density_kg_m3,
                regression,
            } => {
                let f = format!("{field}.density_kg_m3");
                let rho = *density_kg_m3;
                let mut errs = InputErrors::default();
                if check::positive(&mut errs, &f, rho) {
                    if rho > snow::MAX_SNOW_DENSITY_KG_M3 {
                        errs.push(
                            &f,
                            InputErrorKind::DenserThanIce {
                                value: rho,
                                ice: snow::MAX_SNOW_DENSITY_KG_M3,
                            },
                        );
                    } else if rho < snow::MIN_SNOW_DENSITY_KG_M3 {
                        errs.push(
                            &f,
                            InputErrorKind::OutOfBounds {
                                value: rho,
                                min: snow::MIN_SNOW_DENSITY_KG_M3,
                                max: snow::MAX_SNOW_DENSITY_KG_M3,
                                unit: "kg/m³",
                            },
                        );
                    }
                }
                errs.into_result()?;
                let (lo, hi) = regression.valid_range_kg_m3();
                if rho < lo || rho > hi {
                    warnings.push(Warning {
                        field: f.clone(),
                        message: format!(
                            "{} was fitted for {lo:.0}–{hi:.0} kg/m³; {rho:.0} kg/m³ is outside that range",
                            regression.name()
                        ),
                    });
                }
                let k = regression.conductivity_w_m_k(rho);
                if k.is_nan() || k <= 0.0 {
                    return Err(InputError::new(
                        f,
                        InputErrorKind::NotCovered(format!(
                            "{} gives no positive conductivity at {rho:.0} kg/m³",
                            regression.name()
                        )),
                    )
                    .into());
                }
                // Dry snow: heat capacity per kg = that of ice (taken at −5 °C).
                let c = rho * ice::ice_specific_heat_j_kg_k(-5.0);
                Ok(Material {
                    family: Family::Snow,
                    label: format!("Snow {rho:.0} kg/m³, {}", regression.name()),
                    conductivity: ConductivityLaw::constant(k),
                    freezes: false,
                    density_kg_m3: rho,
                    c_frozen_j_m3k: c,
                    c_unfrozen_j_m3k: c,
                    latent_j_m3: 0.0,
                    valid_temperature_c: (-60.0, 0.0),
                })
            }
            MaterialSpec::Ice => {
                let rho = ice::ICE_DENSITY_0C_KG_M3;
                let c = rho * ice::ice_specific_heat_j_kg_k(-5.0);
                Ok(Material {
                    family: Family::Ice,
                    label: "Ice".into(),
                    conductivity: ConductivityLaw::same(Branch::IceIh),
                    freezes: false,
                    density_kg_m3: rho,
                    c_frozen_j_m3k: c,
                    c_unfrozen_j_m3k: c,
                    latent_j_m3: 0.0,
                    valid_temperature_c: (-100.0, 0.0),
                })
            }
            MaterialSpec::Water => Ok(Material {
                family: Family::Water,
                label: "Water (ice below 0 °C)".into(),
                conductivity: ConductivityLaw {
                    frozen: Branch::IceIh,
                    unfrozen: Branch::Constant(ice::WATER_CONDUCTIVITY_W_PER_M_K),
                },
                freezes: true,
                density_kg_m3: ice::WATER_DENSITY_KG_M3,
                c_frozen_j_m3k: ice::ICE_DENSITY_0C_KG_M3 * ice::ice_specific_heat_j_kg_k(-5.0),
                c_unfrozen_j_m3k: ice::WATER_DENSITY_KG_M3 * ice::WATER_SPECIFIC_HEAT_J_PER_KG_K,
                latent_j_m3: ice::ICE_DENSITY_0C_KG_M3 * ice::LATENT_HEAT_FUSION_J_PER_KG,
                valid_temperature_c: (-100.0, 10.0),
            }),
            MaterialSpec::Air => {
                let c = ice::AIR_DENSITY_KG_M3 * ice::AIR_SPECIFIC_HEAT_J_PER_KG_K;
                Ok(Material {
                    family: Family::Air,
                    label: "Still air gap (conduction only)".into(),
                    conductivity: ConductivityLaw::same(Branch::Linear {
                        k0: ice::AIR_CONDUCTIVITY_0C_W_PER_M_K,
                        slope: ice::AIR_CONDUCTIVITY_SLOPE_W_PER_M_K2,
                    }),
                    freezes: false,
                    density_kg_m3: ice::AIR_DENSITY_KG_M3,
                    c_frozen_j_m3k: c,
                    c_unfrozen_j_m3k: c,
                    latent_j_m3: 0.0,
                    valid_temperature_c: (-40.0, 20.0),
                })
            }
            MaterialSpec::Soil(input) => {
                let p = soil::soil_properties(input, field, warnings)?;
                Ok(Material {
                    family: Family::Soil,
                    label: format!(
                        "{} {:.0} kg/m³ dry, {:.1} % water, {}",
                        input.texture.name(),
                        input.dry_density_kg_m3,
                        input.water_content_pct,
                        input.model.name()
                    ),
                    conductivity: ConductivityLaw {
                        frozen: Branch::Constant(p.k_frozen_w_m_k),
                        unfrozen: Branch::Constant(p.k_unfrozen_w_m_k),
                    },
                    freezes: input.water_content_pct > 0.0,
                    density_kg_m3: p.bulk_density_kg_m3,
                    c_frozen_j_m3k: p.c_frozen_j_m3k,
                    c_unfrozen_j_m3k: p.c_unfrozen_j_m3k,
                    latent_j_m3: p.latent_j_m3,
                    valid_temperature_c: (-60.0, 40.0),
                })
            }
            MaterialSpec::Insulation {
                board,
                conductivity_w_m_k,
                moisture_derating_pct,
            } => {
                let mut errs = InputErrors::default();
                let fk = format!("{field}.conductivity_w_m_k");
                let fd = format!("{field}.moisture_derating_pct");
                let k = conductivity_w_m_k.unwrap_or(board.nominal_conductivity_w_m_k());
                if conductivity_w_m_k.is_some() {
                    check::within(&mut errs, &fk, k, 0.005, 1.0, "W/m/K");
                }
                check::within(&mut errs, &fd, *moisture_derating_pct, 0.0, 90.0, "%");
                errs.into_result()?;
                // Losing a share x of R multiplies the effective conductivity by 1/(1 − x).
                let k_eff = k / (1.0 - moisture_derating_pct / 100.0);
                let (rho, cp) = board.density_and_specific_heat();
                let mut label = board.name().to_string();
                if *moisture_derating_pct > 0.0 {
                    label.push_str(&format!(", R derated {moisture_derating_pct:.0} %"));
                }
                Ok(Material {
                    family: Family::Insulation,
                    label,
                    conductivity: ConductivityLaw::constant(k_eff),
                    freezes: false,
                    density_kg_m3: rho,
                    c_frozen_j_m3k: rho * cp,
                    c_unfrozen_j_m3k: rho * cp,
                    latent_j_m3: 0.0,
                    valid_temperature_c: (-50.0, 70.0),
                })
            }
            MaterialSpec::Concrete { conductivity_w_m_k } => {
                let fk = format!("{field}.conductivity_w_m_k");
                let k = conductivity_w_m_k.unwrap_or(CONCRETE_CONDUCTIVITY_W_PER_M_K);
                let mut errs = InputErrors::default();
                check::within(&mut errs, &fk, k, 0.1, 5.0, "W/m/K");
                errs.into_result()?;
                let c = CONCRETE_DENSITY * CONCRETE_SPECIFIC_HEAT;
                Ok(Material {
                    family: Family::Concrete,
                    label: "Concrete".into(),
                    conductivity: ConductivityLaw::constant(k),
                    freezes: false,
                    density_kg_m3: CONCRETE_DENSITY,
                    c_frozen_j_m3k: c,
                    c_unfrozen_j_m3k: c,
                    latent_j_m3: 0.0,
                    valid_temperature_c: (-60.0, 60.0),
                })
            }
            MaterialSpec::Custom {
                label,
                conductivity_w_m_k,
                frozen_conductivity_w_m_k,
                density_kg_m3,
                specific_heat_j_kg_k,
            } => {
                let mut errs = InputErrors::default();
                let ku = *conductivity_w_m_k;
                let kf = frozen_conductivity_w_m_k.unwrap_or(ku);
                check::within(
                    &mut errs,
                    &format!("{field}.conductivity_w_m_k"),
                    ku,
                    1e-3,
                    500.0,
                    "W/m/K",
                );
                if frozen_conductivity_w_m_k.is_some() {
                    check::within(
                        &mut errs,
                        &format!("{field}.frozen_conductivity_w_m_k"),
                        kf,
                        1e-3,
                        500.0,
                        "W/m/K",
                    );
                }
                check::within(
                    &mut errs,
                    &format!("{field}.density_kg_m3"),
                    *density_kg_m3,
                    1e-3,
                    25_000.0,
                    "kg/m³",
                );
                check::within(
                    &mut errs,
                    &format!("{field}.specific_heat_j_kg_k"),
                    *specific_heat_j_kg_k,
                    1.0,
                    20_000.0,
                    "J/kg/K",
                );
                if label.chars().count() > 80 {
                    errs.push(
                        format!("{field}.label"),
                        InputErrorKind::Count {
                            count: label.chars().count(),
                            min: 0,
                            max: 80,
                        },
                    );
                }
                errs.into_result()?;
                let c = density_kg_m3 * specific_heat_j_kg_k;
                Ok(Material {
                    family: Family::Custom,
                    label: if label.trim().is_empty() {
                        "Custom material".into()
                    } else {
                        label.clone()
                    },
                    conductivity: ConductivityLaw {
                        frozen: Branch::Constant(kf),
                        unfrozen: Branch::Constant(ku),
                    },
                    freezes: false,
                    density_kg_m3: *density_kg_m3,
                    c_frozen_j_m3k: c,
                    c_unfrozen_j_m3k: c,
                    latent_j_m3: 0.0,
                    valid_temperature_c: (f64::NEG_INFINITY, f64::INFINITY),
                })
            }
        }
    }

    /// The same material with every snow regression swapped for `c` (for the band).
    pub fn with_snow_regression(&self, c: SnowRegression) -> MaterialSpec {
        match self {
            MaterialSpec::Snow { density_kg_m3, .. } => MaterialSpec::Snow {
                density_kg_m3: *density_kg_m3,
                regression: c,
            },
            other => other.clone(),
        }
    }

    pub fn is_snow(&self) -> bool {
        matches!(self, MaterialSpec::Snow { .. })
    }
}
