//! The enthalpy–temperature relation of one cell, with or without freezing.
//!
//! Volumetric enthalpy H (J/m³) is measured from the fully frozen state at 0 °C:
//! - a material with no freezable water: H = C_f T below 0 °C, C_u T above;
//! - water freezing at one temperature (free water, saturated coarse soil): H = C_f T below
//!   0 °C, H ∈ [0, L] at 0 °C while it changes phase, H = L + C_u T above;
//! - water freezing over a range (fine soils): H = C_f T + L θ(T) below 0 °C, where θ is the
//!   liquid share of the pore water from an unfrozen-water curve, and L + C_u T above.
//!
//! Conductivity while partly frozen is the geometric mean k_f^(1−θ) k_u^θ weighted by the
//! liquid share θ (the weighting of Johansen 1975's saturated conductivity; common practice).

use crate::materials::{ConductivityLaw, Material};

/// Unfrozen water content w_u = α θ^β (gravimetric, as a fraction of dry mass) at θ degrees
/// below 0 °C, β < 0 (Anderson & Tice 1972, Highway Research Record 393; from memory).
/// `total` is the soil's whole water content (fraction of dry mass).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct UnfrozenWater {
    pub alpha: f64,
    pub beta: f64,
    pub total: f64,
}

impl UnfrozenWater {
    /// Liquid share of the pore water at temperature `t_c` (1 at and above 0 °C).
    pub fn liquid_share(&self, t_c: f64) -> f64 {
        if t_c >= 0.0 {
            return 1.0;
        }
        ((self.alpha / self.total) * (-t_c).powf(self.beta)).min(1.0)
    }

    /// d(liquid share)/dT, per K (≥ 0).
    pub fn liquid_share_slope(&self, t_c: f64) -> f64 {
        if t_c >= 0.0 {
            return 0.0;
        }
        let theta = -t_c;
        let share = (self.alpha / self.total) * theta.powf(self.beta);
        if share >= 1.0 {
            0.0
        } else {
            -(self.alpha / self.total) * self.beta * theta.powf(self.beta - 1.0)
        }
    }
}

/// How one cell stores heat.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Phase {
    /// No freezable water.
    Inert {
        c_frozen: f64,
        c_unfrozen: f64,
        law: ConductivityLaw,
    },
    /// Water that freezes at 0 °C.
    Isothermal {
        c_frozen: f64,
        c_unfrozen: f64,
        latent: f64,
        law: ConductivityLaw,
    },
    /// Water that freezes over a range of temperature.
    Range {
        c_frozen: f64,
        c_unfrozen: f64,
        latent: f64,
        law: ConductivityLaw,
        curve: UnfrozenWater,
    },
}

impl Phase {
    /// The phase model of a resolved material; `curve` makes a freezing material freeze over
    /// a range instead of at 0 °C.
    pub fn for_material(m: &Material, curve: Option<UnfrozenWater>) -> Phase {
        let (c_frozen, c_unfrozen, law) = (
            m.c_frozen_j_per_m3_k,
            m.c_unfrozen_j_per_m3_k,
            m.conductivity,
        );
        if !m.freezes || m.latent_j_per_m3 <= 0.0 {
            return Phase::Inert {
                c_frozen,
                c_unfrozen,
                law,
            };
        }
        match curve {
            Some(curve) => Phase::Range {
                c_frozen,
                c_unfrozen,
                latent: m.latent_j_per_m3,
                law,
                curve,
            },
            None => Phase::Isothermal {
                c_frozen,
                c_unfrozen,
                latent: m.latent_j_per_m3,
                law,
            },
        }
    }

    pub fn freezes(&self) -> bool {
        !matches!(self, Phase::Inert { .. })
    }

    /// H(T), J/m³.
    pub fn enthalpy(&self, t: f64) -> f64 {
        match *self {
            Phase::Inert {
                c_frozen,
                c_unfrozen,
                ..
            } => {
                if t < 0.0 {
                    c_frozen * t
                } else {
                    c_unfrozen * t
                }
            }
            Phase::Isothermal {
                c_frozen,
                c_unfrozen,
                latent,
                ..
            } => {
                if t < 0.0 {
                    c_frozen * t
                } else {
                    latent + c_unfrozen * t
                }
            }
            Phase::Range {
                c_frozen,
                c_unfrozen,
                latent,
                curve,
                ..
            } => {
                if t < 0.0 {
                    c_frozen * t + latent * curve.liquid_share(t)
                } else {
                    latent + c_unfrozen * t
                }
            }
        }
    }

    /// T(H), °C: the inverse of [`Phase::enthalpy`].
    pub fn temperature(&self, h: f64) -> f64 {
        match *self {
            Phase::Inert {
                c_frozen,
                c_unfrozen,
                ..
            } => {
                if h < 0.0 {
                    h / c_frozen
                } else {
                    h / c_unfrozen
                }
            }
            Phase::Isothermal {
                c_frozen,
                c_unfrozen,
                latent,
                ..
            } => {
                if h < 0.0 {
                    h / c_frozen
                } else if h > latent {
                    (h - latent) / c_unfrozen
                } else {
                    0.0
                }
            }
            Phase::Range {
                c_frozen,
                c_unfrozen,
                latent,
                curve,
                ..
            } => {
                if h >= latent {
                    return (h - latent) / c_unfrozen;
                }
                // c_f T + L θ(T) = h is increasing in T; T ∈ [(h − L)/c_f, min(0, h/c_f)].
                // Safeguarded Newton: a Newton step inside the bracket, else bisection.
                let mut lo = (h - latent) / c_frozen;
                let mut hi = (h / c_frozen).min(0.0);
                let f = |t: f64| c_frozen * t + latent * curve.liquid_share(t) - h;
                let tol = 1e-12 * h.abs().max(latent);
                let mut t = hi;
                for _ in 0..200 {
                    let ft = f(t);
                    if ft.abs() <= tol {
                        return t;
                    }
                    if ft > 0.0 {
                        hi = t;
                    } else {
                        lo = t;
                    }
                    if hi - lo <= 1e-15 * (1.0 + lo.abs()) {
                        break;
                    }
                    let d = c_frozen + latent * curve.liquid_share_slope(t);
                    let newton = t - ft / d;
                    t = if newton > lo && newton < hi {
                        newton
                    } else {
                        0.5 * (lo + hi)
                    };
                }
                t
            }
        }
    }

    /// dT/dH at the state, K per J/m³ (0 while changing phase at one temperature).
    pub fn dt_dh(&self, h: f64, t: f64) -> f64 {
        match *self {
            Phase::Inert {
                c_frozen,
                c_unfrozen,
                ..
            } => {
                if h < 0.0 {
                    1.0 / c_frozen
                } else {
                    1.0 / c_unfrozen
                }
            }
            Phase::Isothermal {
                c_frozen,
                c_unfrozen,
                latent,
                ..
            } => {
                if h < 0.0 {
                    1.0 / c_frozen
                } else if h > latent {
                    1.0 / c_unfrozen
                } else {
                    0.0
                }
            }
            Phase::Range {
                c_frozen,
                c_unfrozen,
                latent,
                curve,
                ..
            } => {
                if h >= latent {
                    1.0 / c_unfrozen
                } else {
                    1.0 / (c_frozen + latent * curve.liquid_share_slope(t))
                }
            }
        }
    }

    /// Liquid share of the freezable water (1 for inert cells).
    pub fn liquid_share(&self, h: f64, t: f64) -> f64 {
        match *self {
            Phase::Inert { .. } => 1.0,
            Phase::Isothermal { latent, .. } => (h / latent).clamp(0.0, 1.0),
            Phase::Range { curve, latent, .. } => {
                if h >= latent {
                    1.0
                } else {
                    curve.liquid_share(t)
                }
            }
        }
    }

    /// Ice share of the freezable water (0 for inert cells).
    pub fn frozen_fraction(&self, h: f64, t: f64) -> f64 {
        if self.freezes() {
            1.0 - self.liquid_share(h, t)
        } else {
            0.0
        }
    }

    /// Conductivity at the state, W/m/K.
    pub fn conductivity(&self, h: f64, t: f64) -> f64 {
        match *self {
            Phase::Inert { law, .. } => law.k(t),
            Phase::Isothermal { law, .. } | Phase::Range { law, .. } => {
                let theta = self.liquid_share(h, t);
                if theta >= 1.0 {
                    law.unfrozen.k(t.max(0.0))
                } else if theta <= 0.0 {
                    law.frozen.k(t.min(0.0))
                } else {
                    let kf = law.frozen.k(t.min(0.0));
                    let ku = law.unfrozen.k(t.max(0.0));
                    kf * (ku / kf).powf(theta)
                }
            }
        }
    }
}
