//! The enthalpy–temperature relation of one cell, with or without freezing.
//!
//! Volumetric enthalpy H (J/m³) is measured from the fully frozen state at 0 °C:
//! - a material with no freezable water: H = C_f T below 0 °C, C_u T above;
//! - water freezing at one temperature (free water, saturated coarse soil): H = C_f T below
//!   0 °C, H ∈ [0, L] at 0 °C while it changes phase, H = L + C_u T above;
//! - water freezing over a range (fine soils): H = C_f T + L θ(T) below 0 °C, where θ is the
//!   liquid share of the pore water from an unfrozen-water curve, and L + C_u T above.
//!
//! - snow (a cell of the snow cover): H = ρ h, with h the specific enthalpy of ice,
//!   h = ∫₀ᵀ c_ice dθ below 0 °C, h ∈ [0, L_f] at 0 °C while the ice melts, and
//!   L_f + c_w T above (the cell's ice all melted, its water still in place); see
//!   [`Phase::Snow`].
//!
//! Conductivity while partly frozen is the geometric mean k_f^(1−θ) k_u^θ weighted by the
//! liquid share θ (the weighting of Johansen 1975's saturated conductivity; common practice).

use crate::physics::materials::ice;
use crate::physics::materials::{Branch, ConductivityLaw, Material};

/// Width of the temperature bands over which a snow cell's heat capacity is held constant,
/// K. See [`Phase::Snow`].
pub const SNOW_CAPACITY_BAND_K: f64 = 2.0;

/// Specific heat of ice at 0 °C and its slope, J/kg/K and J/kg/K² (the linear fit of
/// [`ice::ice_specific_heat_j_kg_k`]: c = 152.5 + 7.122 T_K).
const C_ICE_0C: f64 = 152.5 + 7.122 * ice::KELVIN_OFFSET;
const C_ICE_SLOPE: f64 = 7.122;

/// Specific enthalpy of ice at the band edge T_k = −k B, J/kg: the exact integral
/// ∫₀^{T_k} c_ice dθ = c₀ T_k + c₁ T_k²/2.
fn snow_edge_enthalpy(k: f64) -> f64 {
    let t = -k * SNOW_CAPACITY_BAND_K;
    C_ICE_0C * t + 0.5 * C_ICE_SLOPE * t * t
}

/// Specific heat of ice over band k (between −(k+1) B and −k B), J/kg/K: c_ice at the band's
/// middle, which is the band's exact mean.
fn snow_band_capacity(k: f64) -> f64 {
    C_ICE_0C - C_ICE_SLOPE * (k + 0.5) * SNOW_CAPACITY_BAND_K
}

/// The band k ≥ 0 holding a specific enthalpy h < 0 (J/kg): h_{k+1} ≤ h < h_k.
fn snow_band(h: f64) -> f64 {
    let mut k = (-h / (C_ICE_0C * SNOW_CAPACITY_BAND_K)).floor().max(0.0);
    // The guess uses c at 0 °C; c falls with temperature, so adjust (once or twice at most).
    for _ in 0..64 {
        if h < snow_edge_enthalpy(k + 1.0) {
            k += 1.0;
        } else if k > 0.0 && h >= snow_edge_enthalpy(k) {
            k -= 1.0;
        } else {
            break;
        }
    }
    k
}

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
    /// A cell of the snow cover: ice (with air, which stores a negligible share of the heat)
    /// of bulk density ρ, conductivity `conductivity` from the run's snow regression.
    ///
    /// - Below 0 °C the volumetric heat capacity is ρ c_ice(T), c_ice the fit of
    ///   [`ice::ice_specific_heat_j_kg_k`] (Dorsey 1940 via Yen 1981; dry snow stores heat
    ///   as its ice, model reference §1). It is taken constant over bands of
    ///   [`SNOW_CAPACITY_BAND_K`] (c_ice at the band's middle), so that H(T) is exact at every
    ///   band edge, piecewise linear between, and off by at most ρ c₁ B²/8 (3.6 J/kg, 0.002 K)
    ///   inside a band; c_ice itself changes by 0.7 % across a band. Piecewise-linear T(H) lets
    ///   a Newton pass that stays within a band be exact, as for the other phases.
    /// - At 0 °C the ice melts: H from 0 to ρ L_f, L_f = 333.4 kJ/kg
    ///   ([`ice::LATENT_HEAT_FUSION_J_PER_KG`], IAPWS), with the meltwater held in the cell
    ///   (no percolation).
    /// - Above, H = ρ L_f + ρ c_w T: the ice of the cell has all melted. Real meltwater drains
    ///   and the snow is gone; here the depth is prescribed by the climate, so this state
    ///   only arises where the climate keeps snow the energy has melted. Conductivity stays
    ///   the snow's.
    ///
    /// At exactly 0 °C [`Phase::enthalpy`] gives frozen snow (H = 0). Valid for dry seasonal
    /// snow about −60 °C to 0 °C; no vapour transport, no compaction heat, no radiation
    /// absorbed inside the pack.
    Snow {
        density_kg_m3: f64,
        conductivity: f64,
    },
}

impl Phase {
    /// The phase model of a resolved material; `curve` makes a freezing material freeze over
    /// a range instead of at 0 °C.
    pub fn for_material(m: &Material, curve: Option<UnfrozenWater>) -> Phase {
        let (c_frozen, c_unfrozen, law) = (m.c_frozen_j_m3k, m.c_unfrozen_j_m3k, m.conductivity);
        if !m.freezes || m.latent_j_m3 <= 0.0 {
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
                latent: m.latent_j_m3,
                law,
                curve,
            },
            None => Phase::Isothermal {
                c_frozen,
                c_unfrozen,
                latent: m.latent_j_m3,
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
            Phase::Snow { density_kg_m3, .. } => density_kg_m3 * snow_specific_enthalpy(t),
        }
    }

    /// Latent heat per volume, J/m³ (0 for inert cells).
    pub fn latent_j_m3(&self) -> f64 {
        match *self {
            Phase::Inert { .. } => 0.0,
            Phase::Isothermal { latent, .. } | Phase::Range { latent, .. } => latent,
            Phase::Snow { density_kg_m3, .. } => density_kg_m3 * ice::LATENT_HEAT_FUSION_J_PER_KG,
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
            Phase::Snow { density_kg_m3, .. } => snow_temperature(h / density_kg_m3),
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
            Phase::Snow { density_kg_m3, .. } => {
                let hs = h / density_kg_m3;
                if hs < 0.0 {
                    1.0 / (density_kg_m3 * snow_band_capacity(snow_band(hs)))
                } else if hs > ice::LATENT_HEAT_FUSION_J_PER_KG {
                    1.0 / (density_kg_m3 * ice::WATER_SPECIFIC_HEAT_J_PER_KG_K)
                } else {
                    0.0
                }
            }
        }
    }

    /// Liquid share of the freezable water (1 for inert cells).
    pub fn liquid_share(&self, h: f64, t: f64) -> f64 {
        match *self {
            Phase::Inert { .. } => 1.0,
            Phase::Isothermal { latent, .. } => (h / latent).clamp(0.0, 1.0),
            Phase::Snow { .. } => (h / self.latent_j_m3()).clamp(0.0, 1.0),
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

    /// Where the conductivity is one constant over a stretch of enthalpy around `h`, a tag
    /// for that stretch (0 frozen, 1 thawed, 2 snow); `None` where it varies with the state
    /// (partly frozen, a temperature-dependent branch, an unfrozen-water curve). Two states
    /// with the same tag have the same [`Phase::conductivity`], bit for bit; the solver uses
    /// this to skip re-evaluating k.
    pub fn constant_k_stretch(&self, h: f64) -> Option<u8> {
        let constant = |law: &ConductivityLaw, frozen: bool| {
            matches!(
                if frozen { law.frozen } else { law.unfrozen },
                crate::physics::materials::Branch::Constant(_)
            )
        };
        match self {
            Phase::Snow { .. } => Some(2),
            Phase::Inert { law, .. } => {
                // k takes the frozen branch below 0 °C; T(H) = H/c has the sign of H unless
                // the quotient underflows to zero, which only a |H| this small can do.
                if h.abs() < 1e-290 {
                    return None;
                }
                let frozen = h < 0.0;
                constant(law, frozen).then_some(u8::from(!frozen))
            }
            Phase::Isothermal { law, latent, .. } => {
                if h <= 0.0 {
                    constant(law, true).then_some(0)
                } else if h >= *latent {
                    constant(law, false).then_some(1)
                } else {
                    None
                }
            }
            Phase::Range { .. } => None,
        }
    }

    /// Conductivity at the state, W/m/K.
    pub fn conductivity(&self, h: f64, t: f64) -> f64 {
        match *self {
            Phase::Inert { law, .. } => law.k(t),
            Phase::Snow { conductivity, .. } => conductivity,
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

/// The tag the solver keeps for a state whose k varies with it (no stretch of constant k;
/// see [`Phase::constant_k_stretch`]).
pub(crate) const VARYING_K: u8 = u8::MAX;

/// The stretch of constant k that enthalpy `h` lies on, or [`VARYING_K`].
pub(crate) fn stretch_of(phase: &Phase, h: f64) -> u8 {
    phase.constant_k_stretch(h).unwrap_or(VARYING_K)
}

/// Which piece of T(H) [`Pieces::state`] found a state on: the frozen or the thawed
/// linear piece, whose dT/dH and stretch are fixed, or [`BETWEEN`] (anything else).
pub(crate) const FROZEN_PIECE: u8 = 0;
pub(crate) const THAWED_PIECE: u8 = 2;
pub(crate) const BETWEEN: u8 = 1;

/// A cell's phase unpacked for the solver's inner loop. For an inert cell and a cell that
/// freezes at one temperature, T(H) is linear below one enthalpy (frozen: T = H/C_f) and
/// above another (thawed: T = (H − L)/C_u), with one dT/dH and one stretch of constant k
/// on each; those are worked out once here, so a state on either piece costs a comparison
/// and a division. Between the two (a cell changing phase, an inert cell within 1e-290 of
/// H = 0) and for any other phase, the phase is asked. Either way [`Pieces::state`] gives
/// bit for bit what [`Phase::temperature`], [`Phase::dt_dh`] and
/// [`Phase::constant_k_stretch`] give (a test checks it).
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Pieces {
    /// Below this enthalpy the state is on the frozen piece, above this on the thawed one
    /// (J/m³; −∞ and +∞ where there are no such pieces).
    frozen_below: f64,
    thawed_above: f64,
    kind: PieceKind,
    c_frozen: f64,
    c_unfrozen: f64,
    latent: f64,
    /// 1/C on the frozen and the thawed piece, K per J/m³.
    slope_frozen: f64,
    slope_unfrozen: f64,
    /// The stretch tags of the frozen and the thawed piece ([`VARYING_K`] where that
    /// side's k depends on temperature).
    stretch_frozen: u8,
    stretch_unfrozen: u8,
}

#[derive(Debug, Clone, Copy, PartialEq)]
enum PieceKind {
    Inert,
    Isothermal,
    /// Ask the phase.
    Other,
}

impl Pieces {
    pub(crate) fn of(phase: &Phase) -> Pieces {
        let tag = |b: Branch, tag: u8| {
            if matches!(b, Branch::Constant(_)) {
                tag
            } else {
                VARYING_K
            }
        };
        // `Phase::constant_k_stretch` gives an inert cell no stretch within 1e-290 of H = 0.
        let tiny = 1e-290;
        let (kind, edges, c_frozen, c_unfrozen, latent, law) = match *phase {
            Phase::Inert {
                c_frozen,
                c_unfrozen,
                law,
            } => (
                PieceKind::Inert,
                (-tiny, tiny),
                c_frozen,
                c_unfrozen,
                0.0,
                Some(law),
            ),
            // With L > 0 the pieces below 0 and above L do not meet, as `state` assumes.
            Phase::Isothermal {
                c_frozen,
                c_unfrozen,
                latent,
                law,
            } if latent > 0.0 => (
                PieceKind::Isothermal,
                (0.0, latent),
                c_frozen,
                c_unfrozen,
                latent,
                Some(law),
            ),
            _ => (PieceKind::Other, (0.0, 0.0), 1.0, 1.0, 0.0, None),
        };
        let (stretch_frozen, stretch_unfrozen) = law.map_or((VARYING_K, VARYING_K), |l| {
            (tag(l.frozen, 0), tag(l.unfrozen, 1))
        });
        // On a piece dT/dH must equal itself (a NaN would not), as the solver takes one
        // piece for one slope.
        let kind = if c_frozen.is_nan() || c_unfrozen.is_nan() {
            PieceKind::Other
        } else {
            kind
        };
        let (frozen_below, thawed_above) = if kind == PieceKind::Other {
            (f64::NEG_INFINITY, f64::INFINITY)
        } else {
            edges
        };
        Pieces {
            frozen_below,
            thawed_above,
            kind,
            c_frozen,
            c_unfrozen,
            latent,
            slope_frozen: 1.0 / c_frozen,
            slope_unfrozen: 1.0 / c_unfrozen,
            stretch_frozen,
            stretch_unfrozen,
        }
    }

    /// T(H) °C, dT/dH K per J/m³, the stretch tag of enthalpy `h` in `phase` (the phase
    /// these pieces were unpacked from), and the piece it is on.
    #[inline]
    pub(crate) fn state(&self, phase: &Phase, h: f64) -> (f64, f64, u8, u8) {
        if h > self.thawed_above {
            // An inert cell's L is 0, and h − 0 = h for h > 0.
            (
                (h - self.latent) / self.c_unfrozen,
                self.slope_unfrozen,
                self.stretch_unfrozen,
                THAWED_PIECE,
            )
        } else if h < self.frozen_below {
            (
                h / self.c_frozen,
                self.slope_frozen,
                self.stretch_frozen,
                FROZEN_PIECE,
            )
        } else {
            let (t, slope, stretch) = self.between(phase, h);
            (t, slope, stretch, BETWEEN)
        }
    }

    /// `state` off the two pieces.
    fn between(&self, phase: &Phase, h: f64) -> (f64, f64, u8) {
        match self.kind {
            PieceKind::Inert => {
                // As in `Phase::constant_k_stretch`: a |H| this small has no tag.
                if h < 0.0 {
                    let tag = if h > -1e-290 {
                        VARYING_K
                    } else {
                        self.stretch_frozen
                    };
                    (h / self.c_frozen, self.slope_frozen, tag)
                } else {
                    let tag = if h < 1e-290 {
                        VARYING_K
                    } else {
                        self.stretch_unfrozen
                    };
                    (h / self.c_unfrozen, self.slope_unfrozen, tag)
                }
            }
            PieceKind::Isothermal => {
                if h < 0.0 {
                    (h / self.c_frozen, self.slope_frozen, self.stretch_frozen)
                } else if h > self.latent {
                    (
                        (h - self.latent) / self.c_unfrozen,
                        self.slope_unfrozen,
                        self.stretch_unfrozen,
                    )
                } else {
                    let tag = if h <= 0.0 {
                        self.stretch_frozen
                    } else if h >= self.latent {
                        self.stretch_unfrozen
                    } else {
                        VARYING_K
                    };
                    (0.0, 0.0, tag)
                }
            }
            PieceKind::Other => {
                let t = phase.temperature(h);
                (t, phase.dt_dh(h, t), stretch_of(phase, h))
            }
        }
    }
}

/// Specific enthalpy of snow (its ice) at `t_c`, J/kg, referred to ice at 0 °C: banded
/// ∫₀ᵀ c_ice dθ below 0 °C (see [`Phase::Snow`]), 0 at 0 °C (frozen), L_f + c_w T above.
pub fn snow_specific_enthalpy(t_c: f64) -> f64 {
    if t_c <= 0.0 {
        let k = (-t_c / SNOW_CAPACITY_BAND_K).floor();
        let edge = -k * SNOW_CAPACITY_BAND_K;
        snow_edge_enthalpy(k) + snow_band_capacity(k) * (t_c - edge)
    } else {
        ice::LATENT_HEAT_FUSION_J_PER_KG + ice::WATER_SPECIFIC_HEAT_J_PER_KG_K * t_c
    }
}

/// Inverse of [`snow_specific_enthalpy`] (0 °C across the melting interval).
fn snow_temperature(h: f64) -> f64 {
    if h < 0.0 {
        let k = snow_band(h);
        -k * SNOW_CAPACITY_BAND_K + (h - snow_edge_enthalpy(k)) / snow_band_capacity(k)
    } else if h > ice::LATENT_HEAT_FUSION_J_PER_KG {
        (h - ice::LATENT_HEAT_FUSION_J_PER_KG) / ice::WATER_SPECIFIC_HEAT_J_PER_KG_K
    } else {
        0.0
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The unpacked pieces give the phase's own T(H), dT/dH and stretch, bit for bit, for
    /// every kind of phase, on both sides of and at 0 and L, at signed zeros, at the
    /// smallest enthalpies (where an inert cell has no stretch), at a snow band edge and at
    /// NaN. Invariant of this tool; no outside source.
    #[test]
    fn pieces_give_the_phases_own_bits() {
        let law = ConductivityLaw {
            frozen: Branch::Constant(2.1),
            unfrozen: Branch::Constant(1.4),
        };
        let ice = ConductivityLaw {
            frozen: Branch::IceIh,
            unfrozen: Branch::Constant(0.56),
        };
        let air = ConductivityLaw::same(Branch::Linear {
            k0: 0.024,
            slope: 7e-5,
        });
        let curve = UnfrozenWater {
            alpha: 0.05,
            beta: -0.5,
            total: 0.2,
        };
        let phases = [
            Phase::Inert {
                c_frozen: 1.9e6,
                c_unfrozen: 2.0e6,
                law,
            },
            Phase::Inert {
                c_frozen: 1.2e3,
                c_unfrozen: 1.2e3,
                law: air,
            },
            Phase::Isothermal {
                c_frozen: 1.9e6,
                c_unfrozen: 2.8e6,
                latent: 1.0e8,
                law,
            },
            Phase::Isothermal {
                c_frozen: 1.9e6,
                c_unfrozen: 4.2e6,
                latent: 3.0e8,
                law: ice,
            },
            // Not a phase a material resolves to, but one the enum can hold.
            Phase::Isothermal {
                c_frozen: 1.9e6,
                c_unfrozen: 2.8e6,
                latent: -1.0e6,
                law,
            },
            Phase::Range {
                c_frozen: 1.9e6,
                c_unfrozen: 2.8e6,
                latent: 1.0e8,
                law,
                curve,
            },
            Phase::Snow {
                density_kg_m3: 250.0,
                conductivity: 0.2,
            },
        ];
        let mut hs: Vec<f64> = (-300..=300).map(|i| i as f64 * 1.3e6 + 17.0).collect();
        hs.extend([
            0.0,
            -0.0,
            1e-300,
            -1e-300,
            1e-320,
            -1e-320,
            1.0e8,
            3.0e8,
            -1.0e6,
            250.0 * snow_edge_enthalpy(1.0),
            f64::NAN,
        ]);
        hs.extend([
            1e-290,
            -1e-290,
            2e-290,
            -2e-290,
            f64::INFINITY,
            f64::NEG_INFINITY,
        ]);
        let bits = |(t, s, k): (f64, f64, u8)| (t.to_bits(), s.to_bits(), k);
        for p in &phases {
            let pieces = Pieces::of(p);
            // One piece has one dT/dH and one stretch.
            let mut on_piece = [None, None, None];
            for &h in &hs {
                let t = p.temperature(h);
                let own = (t, p.dt_dh(h, t), stretch_of(p, h));
                let (t, slope, stretch, piece) = pieces.state(p, h);
                assert_eq!(bits((t, slope, stretch)), bits(own), "{p:?} at H = {h:e}");
                if piece != BETWEEN {
                    let seen = on_piece[piece as usize].get_or_insert((slope.to_bits(), stretch));
                    assert_eq!(*seen, (slope.to_bits(), stretch), "{p:?} piece {piece}");
                }
            }
        }
        assert_eq!(Pieces::of(&phases[2]).kind, PieceKind::Isothermal);
        assert_eq!(Pieces::of(&phases[4]).kind, PieceKind::Other);
    }
}
