//! Soil thermal properties, frozen and unfrozen: conductivity by Kersten 1949, Johansen 1975
//! or Côté & Konrad 2005; heat capacity and latent heat by mass balance.
//!
//! Inputs: texture, dry density ρ_d (kg/m³), gravimetric water content w (% of dry mass) and,
//! for Johansen and Côté & Konrad, the quartz fraction q of the solids.
//! All water is taken to freeze at 0 °C (no unfrozen water); fine soils in fact freeze over a
//! range of temperature, which the transient models treat.

use crate::physics::error::{check, InputErrorKind, InputErrors, Warning};

/// Density of water used in the saturation balance, kg/m³ (common practice).
const WATER_DENSITY: f64 = 1000.0;
/// Latent heat used for soils: 333.7 kJ/kg, as in the soil-freezing formulas of US Army
/// TM 5-852-6 / UFC 3-130-05 (the model reference); free water uses the IAPWS 333.4.
pub const SOIL_LATENT_HEAT_J_PER_KG: f64 = 333.7e3;

/// Soil texture class.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Texture {
    Gravel,
    Sand,
    Silt,
    Clay,
    Peat,
}

impl Texture {
    pub const ALL: [Texture; 5] = [
        Texture::Gravel,
        Texture::Sand,
        Texture::Silt,
        Texture::Clay,
        Texture::Peat,
    ];
    pub fn id(self) -> &'static str {
        match self {
            Texture::Gravel => "gravel",
            Texture::Sand => "sand",
            Texture::Silt => "silt",
            Texture::Clay => "clay",
            Texture::Peat => "peat",
        }
    }
    pub fn from_id(id: &str) -> Option<Self> {
        Self::ALL.into_iter().find(|t| t.id() == id)
    }
    pub fn name(self) -> &'static str {
        match self {
            Texture::Gravel => "Gravel",
            Texture::Sand => "Sand",
            Texture::Silt => "Silt",
            Texture::Clay => "Clay",
            Texture::Peat => "Peat",
        }
    }
    /// Density of the solid grains, kg/m³: 2650 for mineral soils (common practice, no
    /// source), 1450 for peat (organic solids, from memory).
    pub fn particle_density_kg_m3(self) -> f64 {
        match self {
            Texture::Peat => 1450.0,
            _ => 2650.0,
        }
    }
    /// Specific heat of the dry solids, J/kg/K: 712 (0.17 Btu/lb/°F, the value of the
    /// TM 5-852-6 formulas; from memory) for minerals, 1920 for organic solids (from memory).
    pub fn solids_specific_heat_j_kg_k(self) -> f64 {
        match self {
            Texture::Peat => 1920.0,
            _ => 712.0,
        }
    }
    fn coarse(self) -> bool {
        matches!(self, Texture::Gravel | Texture::Sand)
    }
}

/// Which published conductivity model.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum SoilModel {
    /// Kersten 1949 (Univ. of Minnesota Eng. Exp. Station Bull. 28), SI forms with w in % and
    /// ρ_d in g/cm³ (the imperial forms × 0.1442; from memory):
    /// silt-clay unfrozen 0.1442 (0.9 log₁₀ w − 0.2) 10^(0.6243 ρ_d),
    /// frozen 0.001442·10^(1.373 ρ_d) + 0.01226·10^(0.4994 ρ_d)·w;
    /// sandy unfrozen 0.1442 (0.7 log₁₀ w + 0.4) 10^(0.6243 ρ_d),
    /// frozen 0.01096·10^(0.8116 ρ_d) + 0.00461·10^(0.9115 ρ_d)·w.
    /// Valid: silt-clay w ≥ 7 %, sandy w ≥ 1 %; mineral soils only.
    Kersten1949,
    /// Johansen 1975 (CRREL Draft Translation 637, 1977): k = k_dry + K_e (k_sat − k_dry),
    /// k_sat = k_s^(1−n) k_w^n (unfrozen) or k_s^(1−n) k_i^n (frozen) with k_w 0.57,
    /// k_i 2.2; k_s = 7.7^q k_o^(1−q), k_o 2.0 (3.0 when q ≤ 0.2); K_e unfrozen coarse
    /// 0.7 log₁₀ S_r + 1, unfrozen fine log₁₀ S_r + 1, frozen S_r; k_dry =
    /// (0.135 ρ_d + 64.7)/(2700 − 0.947 ρ_d) (Farouki 1986). Mineral soils; the K_e forms hold
    /// for S_r above about 0.05 (coarse) and 0.1 (fine).
    Johansen1975,
    /// Côté & Konrad 2005 (Can. Geotech. J. 42:443–458): K_e = κ S_r / (1 + (κ − 1) S_r), κ
    /// unfrozen/frozen gravel & coarse sand 4.60/1.70, medium-fine sand 3.55/0.95, silt & clay
    /// 1.90/0.85, peat 0.60/0.25; k_dry = χ 10^(−η n), χ/η natural mineral soils 0.75/1.20,
    /// organic fibrous soils 0.30/0.87; k_sat as Johansen with k_w 0.60, k_i 2.24 and organic
    /// solids 0.25 W/m/K (coefficients from memory). Covers peat.
    CoteKonrad2005,
}

impl SoilModel {
    pub const ALL: [SoilModel; 3] = [
        SoilModel::Kersten1949,
        SoilModel::Johansen1975,
        SoilModel::CoteKonrad2005,
    ];
    pub fn id(self) -> &'static str {
        match self {
            SoilModel::Kersten1949 => "kersten-1949",
            SoilModel::Johansen1975 => "johansen-1975",
            SoilModel::CoteKonrad2005 => "cote-konrad-2005",
        }
    }
    pub fn from_id(id: &str) -> Option<Self> {
        Self::ALL.into_iter().find(|m| m.id() == id)
    }
    pub fn name(self) -> &'static str {
        match self {
            SoilModel::Kersten1949 => "Kersten 1949",
            SoilModel::Johansen1975 => "Johansen 1975",
            SoilModel::CoteKonrad2005 => "Côté & Konrad 2005",
        }
    }
    pub fn citation(self) -> &'static str {
        match self {
            SoilModel::Kersten1949 => {
                "Kersten 1949, Univ. of Minnesota Engineering Experiment Station Bulletin 28"
            }
            SoilModel::Johansen1975 => {
                "Johansen 1975, CRREL Draft Translation 637 (1977); k_dry after Farouki 1986"
            }
            SoilModel::CoteKonrad2005 => "Côté & Konrad 2005, Can. Geotech. J. 42:443–458",
        }
    }
    pub fn covers(self, t: Texture) -> bool {
        match self {
            SoilModel::Kersten1949 | SoilModel::Johansen1975 => t != Texture::Peat,
            SoilModel::CoteKonrad2005 => true,
        }
    }
}

/// Inputs for one soil.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SoilInput {
    pub texture: Texture,
    pub model: SoilModel,
    pub dry_density_kg_m3: f64,
    pub water_content_pct: f64,
    pub quartz_fraction: f64,
    /// Multiplies the model's frozen and unfrozen conductivity (1 for the model as
    /// published). For a correction from a measurement, or to carry the model's own
    /// scatter into a range study: Kersten (1949) reports his fits within about ±25 % of
    /// his measurements, Johansen (1975) about ±20 % (from memory of the papers' stated
    /// accuracy). Accepted 0.2–5.
    pub conductivity_factor: f64,
}

/// Derived soil properties (SI).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SoilProperties {
    pub k_frozen_w_m_k: f64,
    pub k_unfrozen_w_m_k: f64,
    /// Volumetric heat capacity, J/m³/K: C = ρ_d (c_s + c_water w) with 4187 (unfrozen) or
    /// 2090 (frozen) J/kg/K for the water (TM 5-852-6 form).
    pub c_frozen_j_m3k: f64,
    pub c_unfrozen_j_m3k: f64,
    /// Volumetric latent heat, J/m³: L = ρ_d w 333.7 kJ/kg.
    pub latent_j_m3: f64,
    pub porosity: f64,
    pub saturation: f64,
    /// Bulk (wet) density, kg/m³.
    pub bulk_density_kg_m3: f64,
}

/// Porosity n = 1 − ρ_d/ρ_s and degree of saturation S_r = w ρ_d / (n ρ_w).
pub fn porosity_and_saturation(texture: Texture, dry_density: f64, w_pct: f64) -> (f64, f64) {
    let n = 1.0 - dry_density / texture.particle_density_kg_m3();
    let s = (w_pct / 100.0) * dry_density / (n * WATER_DENSITY);
    (n, s)
}

/// Water content (%) that fills every pore at this dry density.
pub fn saturation_water_content_pct(texture: Texture, dry_density: f64) -> f64 {
    let n = 1.0 - dry_density / texture.particle_density_kg_m3();
    100.0 * n * WATER_DENSITY / dry_density
}

/// Validate and compute. `field` is the path of the material in the scenario, e.g.
/// `layers[2].material`.
pub fn soil_properties(
    input: &SoilInput,
    field: &str,
    warnings: &mut Vec<Warning>,
) -> Result<SoilProperties, InputErrors> {
    let mut errs = InputErrors::default();
    let f_rho = format!("{field}.dry_density_kg_m3");
    let f_w = format!("{field}.water_content_pct");
    let f_q = format!("{field}.quartz_fraction");
    let solids = input.texture.particle_density_kg_m3();
    let rho = input.dry_density_kg_m3;
    let w = input.water_content_pct;
    let rho_ok = check::positive(&mut errs, &f_rho, rho);
    if rho_ok && rho >= solids {
        errs.push(
            &f_rho,
            InputErrorKind::DenserThanSolids { value: rho, solids },
        );
    }
    if check::within(&mut errs, &f_w, w, 0.0, 5000.0, "%") && errs.is_empty() {
        let sat = saturation_water_content_pct(input.texture, rho);
        if w > sat * (1.0 + 1e-9) {
            errs.push(
                &f_w,
                InputErrorKind::BeyondSaturation {
                    value_pct: w,
                    saturation_pct: sat,
                },
            );
        }
    }
    check::within(
        &mut errs,
        &format!("{field}.conductivity_factor"),
        input.conductivity_factor,
        0.2,
        5.0,
        "",
    );
    let uses_quartz = input.model != SoilModel::Kersten1949 && input.texture != Texture::Peat;
    if uses_quartz {
        check::within(&mut errs, &f_q, input.quartz_fraction, 0.0, 1.0, "");
    }
    if !input.model.covers(input.texture) {
        errs.push(
            format!("{field}.model"),
            InputErrorKind::NotCovered(format!(
                "{} does not cover {}; choose {}",
                input.model.name(),
                input.texture.name().to_lowercase(),
                SoilModel::CoteKonrad2005.name()
            )),
        );
    }
    errs.clone().into_result()?;

    let (n, sr) = porosity_and_saturation(input.texture, rho, w);
    let (kf, ku) = match input.model {
        SoilModel::Kersten1949 => kersten(input, &f_w, warnings)?,
        SoilModel::Johansen1975 => johansen(input, n, sr, &f_w, warnings),
        SoilModel::CoteKonrad2005 => cote_konrad(input, n, sr),
    };
    if kf.is_nan() || ku.is_nan() || kf <= 0.0 || ku <= 0.0 || !kf.is_finite() || !ku.is_finite() {
        return Err(InputErrors::from(crate::physics::error::InputError::new(
            f_w,
            InputErrorKind::NotCovered(format!(
                "{} gives no positive conductivity at this water content",
                input.model.name()
            )),
        )));
    }
    let (kf, ku) = (
        kf * input.conductivity_factor,
        ku * input.conductivity_factor,
    );
    let wf = w / 100.0;
    let cs = input.texture.solids_specific_heat_j_kg_k();
    Ok(SoilProperties {
        k_frozen_w_m_k: kf,
        k_unfrozen_w_m_k: ku,
        c_frozen_j_m3k: rho * (cs + 2090.0 * wf),
        c_unfrozen_j_m3k: rho * (cs + 4187.0 * wf),
        latent_j_m3: rho * wf * SOIL_LATENT_HEAT_J_PER_KG,
        porosity: n,
        saturation: sr,
        bulk_density_kg_m3: rho * (1.0 + wf),
    })
}

/// Kersten 1949 in SI (see [`SoilModel::Kersten1949`]). Returns (frozen, unfrozen).
pub fn kersten_formula(fine: bool, dry_density_g_cm3: f64, w_pct: f64) -> (f64, f64) {
    let rd = dry_density_g_cm3;
    let w = w_pct;
    if fine {
        let ku = 0.1442 * (0.9 * w.log10() - 0.2) * 10f64.powf(0.6243 * rd);
        let kf = 0.001442 * 10f64.powf(1.373 * rd) + 0.01226 * 10f64.powf(0.4994 * rd) * w;
        (kf, ku)
    } else {
        let ku = 0.1442 * (0.7 * w.log10() + 0.4) * 10f64.powf(0.6243 * rd);
        let kf = 0.01096 * 10f64.powf(0.8116 * rd) + 0.00461 * 10f64.powf(0.9115 * rd) * w;
        (kf, ku)
    }
}

fn kersten(
    input: &SoilInput,
    f_w: &str,
    warnings: &mut Vec<Warning>,
) -> Result<(f64, f64), InputErrors> {
    let fine = !input.texture.coarse();
    let w = input.water_content_pct;
    let limit = if fine { 7.0 } else { 1.0 };
    if w < limit {
        warnings.push(Warning {
            field: f_w.to_string(),
            message: format!(
                "Kersten 1949 ({} soils) was fitted for water contents of {limit} % and more",
                if fine { "silt-clay" } else { "sandy" }
            ),
        });
    }
    if w <= 0.0 {
        return Err(InputErrors::from(crate::physics::error::InputError::new(
            f_w,
            InputErrorKind::NotCovered(
                "Kersten 1949 needs a water content above 0 %; choose Johansen 1975 for dry soil"
                    .into(),
            ),
        )));
    }
    Ok(kersten_formula(fine, input.dry_density_kg_m3 / 1000.0, w))
}

/// Johansen's dry conductivity, after Farouki 1986: (0.135 ρ_d + 64.7)/(2700 − 0.947 ρ_d).
pub fn johansen_k_dry(dry_density: f64) -> f64 {
    (0.135 * dry_density + 64.7) / (2700.0 - 0.947 * dry_density)
}

/// Solids conductivity from quartz fraction: 7.7^q k_o^(1−q) (Johansen 1975).
pub fn johansen_k_solids(q: f64) -> f64 {
    let k_o: f64 = if q > 0.2 { 2.0 } else { 3.0 };
    7.7f64.powf(q) * k_o.powf(1.0 - q)
}

fn johansen(
    input: &SoilInput,
    n: f64,
    sr: f64,
    f_w: &str,
    warnings: &mut Vec<Warning>,
) -> (f64, f64) {
    let coarse = input.texture.coarse();
    let lower = if coarse { 0.05 } else { 0.1 };
    if sr < lower {
        warnings.push(Warning {
            field: f_w.to_string(),
            message: format!(
                "Johansen 1975 unfrozen Kersten number is fitted for saturation above {lower}; here it is {sr:.3}"
            ),
        });
    }
    let ks = johansen_k_solids(input.quartz_fraction);
    let kdry = johansen_k_dry(input.dry_density_kg_m3);
    let ksat_u = ks.powf(1.0 - n) * 0.57f64.powf(n);
    let ksat_f = ks.powf(1.0 - n) * 2.2f64.powf(n);
    let ke_u = if sr <= 0.0 {
        0.0
    } else if coarse {
        (0.7 * sr.log10() + 1.0).max(0.0)
    } else {
        (sr.log10() + 1.0).max(0.0)
    };
    let ke_f = sr;
    (kdry + ke_f * (ksat_f - kdry), kdry + ke_u * (ksat_u - kdry))
}

fn cote_konrad(input: &SoilInput, n: f64, sr: f64) -> (f64, f64) {
    let (kappa_u, kappa_f) = match input.texture {
        Texture::Gravel => (4.60, 1.70),
        Texture::Sand => (3.55, 0.95),
        Texture::Silt | Texture::Clay => (1.90, 0.85),
        Texture::Peat => (0.60, 0.25),
    };
    let (chi, eta, ks) = match input.texture {
        Texture::Peat => (0.30, 0.87, 0.25),
        _ => (0.75, 1.20, johansen_k_solids(input.quartz_fraction)),
    };
    let kdry = chi * 10f64.powf(-eta * n);
    let ksat_u = ks.powf(1.0 - n) * 0.60f64.powf(n);
    let ksat_f = ks.powf(1.0 - n) * 2.24f64.powf(n);
    let ke = |kappa: f64| kappa * sr / (1.0 + (kappa - 1.0) * sr);
    (
        kdry + ke(kappa_f) * (ksat_f - kdry),
        kdry + ke(kappa_u) * (ksat_u - kdry),
    )
}
