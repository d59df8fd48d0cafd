//! Ice, liquid water and still air near 0 °C.

/// Density of ice Ih at 0 °C and 1 atm, kg/m³ (IAPWS R10-06, Feistel & Wagner 2006).
pub const ICE_DENSITY_0C_KG_M3: f64 = 916.7;
/// Latent heat of fusion of water at 1 atm, J/kg (IAPWS value; handbooks round to 334 kJ/kg).
pub const LATENT_HEAT_FUSION_J_PER_KG: f64 = 333.4e3;
/// Freezing point of pore water and free water at 1 atm, °C. Freezing-point depression in
/// fine soils is handled by later models; this slice freezes at one temperature.
pub const FREEZING_POINT_C: f64 = 0.0;
/// 0 °C in kelvin.
pub const KELVIN_OFFSET: f64 = 273.15;

/// Thermal conductivity of ice Ih, W/m/K: k(T) = 9.828 exp(−0.0057 T), T in K
/// (the fit reported by Yen 1981, CRREL Report 81-10; recalled from the literature).
/// Gives 2.07 at 0 °C and 2.19 at −10 °C. Valid about −100 °C to 0 °C.
pub fn ice_conductivity_w_m_k(t_c: f64) -> f64 {
    9.828 * (-0.0057 * (t_c + KELVIN_OFFSET)).exp()
}

/// ∫ k_ice dT from 0 °C to `t_c`, W/m (the Kirchhoff transform of [`ice_conductivity_w_m_k`]).
pub fn ice_kirchhoff_w_m(t_c: f64) -> f64 {
    let a = 9.828;
    let b = 0.0057;
    // ∫ a e^{-b(T+273.15)} dT = -(a/b) e^{-b(T+273.15)}
    let f = |t: f64| -(a / b) * (-b * (t + KELVIN_OFFSET)).exp();
    f(t_c) - f(0.0)
}

/// Inverse of [`ice_kirchhoff_w_m`]: the temperature (°C) whose transform is `phi`.
/// Returns `None` when `phi` lies beyond the transform's range (no such temperature).
pub fn ice_kirchhoff_inverse_c(phi: f64) -> Option<f64> {
    let a = 9.828;
    let b = 0.0057;
    // phi = (a/b)(e^{-b·273.15} − e^{-b(T+273.15)})
    let e0 = (-b * KELVIN_OFFSET).exp();
    let inner = e0 - phi * b / a;
    if inner <= 0.0 {
        return None;
    }
    Some(-inner.ln() / b - KELVIN_OFFSET)
}

/// Specific heat of ice Ih, J/kg/K: c = 152.5 + 7.122 T, T in K (Dorsey 1940 fit as given by
/// Yen 1981, recalled from the literature). Checked against IAPWS R10-06 in the tests
/// (2097 J/kg/K at 0 °C, about 2023 at −10 °C). Valid about −100 °C to 0 °C.
pub fn ice_specific_heat_j_kg_k(t_c: f64) -> f64 {
    152.5 + 7.122 * (t_c + KELVIN_OFFSET)
}

/// Density of ice Ih, kg/m³, with its small thermal expansion:
/// ρ = 916.7 (1 − 1.55e-4 T_c), a linear fit to IAPWS R10-06 densities at 0, −10 and −20 °C
/// (computed with a general-purpose IAPWS library). Valid −40–0 °C.
pub fn ice_density_kg_m3(t_c: f64) -> f64 {
    ICE_DENSITY_0C_KG_M3 * (1.0 - 1.55e-4 * t_c)
}

/// Liquid water at 0 °C (IAPWS-95 values via a general-purpose IAPWS library): density
/// kg/m³, specific heat J/kg/K, conductivity W/m/K. Used as constants from 0 to ~10 °C.
pub const WATER_DENSITY_KG_M3: f64 = 999.8;
pub const WATER_SPECIFIC_HEAT_J_PER_KG_K: f64 = 4219.0;
pub const WATER_CONDUCTIVITY_W_PER_M_K: f64 = 0.556;

/// Dry air at 1 atm: conductivity k = 0.02436 + 7.74e-5 T_c W/m/K, a linear fit to
/// property-library values at 0 and −20 °C (0.02436 and 0.02281); within 0.5 % from −40 to
/// +20 °C. Density 1.293 kg/m³ and specific heat 1006 J/kg/K at 0 °C. Conduction only: an
/// air layer here is a still gap with no convection or radiation across it.
pub const AIR_CONDUCTIVITY_0C_W_PER_M_K: f64 = 0.02436;
/// Slope of the air conductivity fit, W/m/K per K.
pub const AIR_CONDUCTIVITY_SLOPE_W_PER_M_K2: f64 = 7.74e-5;
pub const AIR_DENSITY_KG_M3: f64 = 1.293;
pub const AIR_SPECIFIC_HEAT_J_PER_KG_K: f64 = 1006.0;
