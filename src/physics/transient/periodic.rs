//! The periodic start of a winter run: the temperature profile the column would have at the
//! start of the run if the climate's annual wave had been repeating for ever and the ground
//! conducted heat without freezing.
//!
//! Source: the temperature waves of a semi-infinite solid under a periodic surface
//! temperature (Carslaw & Jaeger 1959 §2.6; the annual wave in frozen ground as in
//! Lunardini 1981, Heat Transfer in Cold Climates), [`crate::physics::analytic::PeriodicSurface`] in
//! this crate, plus the steady mean profile under the deep boundary:
//!
//! T(z, t) = T̄(z) − A_s e^{−Z(z)} cos(ω (t − t_c) + φ − Z(z)),  Z(z) = ∫₀ᶻ dz′ / d(z′),
//!
//! with ω = 2π / 365 d, d = √(2a/ω) the damping depth of the layer at z (a = k/C), t_c the
//! coldest moment of the air, A_s and φ the amplitude and phase of the surface wave, and
//! T̄(z) = T̄_s + q R(z), R(z) = ∫₀ᶻ dz′/k the resistance from the surface, q the mean heat
//! flux upwards.
//!
//! - **One homogeneous layer**: exact (for a semi-infinite solid). **Several layers**: Z is
//!   summed layer by layer, which ignores the waves reflected at layer interfaces (a
//!   layer-by-layer WKB-type approximation); close when neighbouring layers have similar
//!   thermal effusivity √(kC) or lie deep, where the wave is small.
//! - **Properties**: each layer's k and C are the means of its frozen and unfrozen values,
//!   ½(k_f + k_u), ½(C_f + C_u) (k at −1 and +1 °C): the ground near the surface is frozen
//!   for part of the year and thawed for the rest, and this is the averaging the modified
//!   Berggren method uses for a layer that freezes (TM 5-852-6; from memory).
//! - **Surface**: under n-factors the surface temperature is n_f T_air below 0 °C and n_t
//!   T_air above; its mean and first harmonic are taken in closed form for the sinusoidal
//!   air wave ([`n_factor_wave`]), phase unchanged. Through a film h the surface wave of a
//!   semi-infinite solid is the air wave times h / (h + k(1 + i)/d) (the complex form of the
//!   film condition −k ∂T/∂z = h (T_air − T), Carslaw & Jaeger §2.6), with k and d of the
//!   top layer; the mean surface sits q/h above the mean air. Snow cover is ignored.
//! - **Bottom**: a geothermal flux q gives the mean gradient q/k layer by layer; a held
//!   bottom temperature gives a linear mean (in R) from the surface mean to it. The wave is
//!   taken as if the column went on below the bottom (negligible when the column is several
//!   damping depths deep).
//! - **Latent heat is ignored**: this is a start point. Under a freezing winter it puts the
//!   0 °C isotherm too deep; a spin-up from it ([`super::setup::Initial::SpinUp`] with a wave)
//!   refines it.
//!
//! A run asks for it with [`super::setup::Initial::Periodic`] (the file format's `periodic`
//! start), or spins up from it with `Initial::SpinUp { from_periodic: Some(wave), .. }`
//! (`spin_up_from_the_periodic_start_needs_fewer_years_than_from_uniform` in
//! `tests/transient.rs` checks it needs no more years than a uniform start). The wave comes
//! from [`crate::physics::climate::Climate::annual_wave`]: a sinusoid's own, a design
//! winter's first harmonic, a daily series' least-squares fit over whole years.

use super::setup::{RunSpec, TopModel};
use super::BottomCondition;
use crate::physics::climate::{AnnualWave, DAYS_PER_YEAR, SECONDS_PER_DAY};
use crate::physics::materials::Material;

/// One layer as the periodic profile sees it.
#[derive(Debug, Clone, Copy, PartialEq)]
struct WaveLayer {
    top_m: f64,
    bottom_m: f64,
    k: f64,
    damping_depth_m: f64,
    /// Z and R at the layer's top.
    z_top: f64,
    r_top: f64,
}

/// The periodic profile of a column under an annual wave.
#[derive(Debug, Clone, PartialEq)]
pub struct PeriodicProfile {
    /// Mean surface temperature T̄_s, °C.
    pub surface_mean_c: f64,
    /// Amplitude A_s of the surface wave, K.
    pub surface_amplitude_k: f64,
    /// Phase φ of the surface wave relative to the air, rad (≤ 0: a lag).
    pub surface_phase_rad: f64,
    /// Coldest moment of the air, s.
    pub coldest_s: f64,
    /// Mean heat flux upwards, W/m² (the mean profile rises by q R(z)).
    pub mean_flux_up_w_m2: f64,
    omega: f64,
    layers: Vec<WaveLayer>,
}

/// Mean and amplitude (°C, K) of the first harmonic of the surface temperature
/// n(T) · T under air T = M − A cos θ, with n = `freezing` below 0 °C and `thawing` above.
///
/// Closed form (standard calculus, derived here): with cos θ₀ = M/A (θ₀ ∈ [0, π]; θ₀ = π if
/// M ≤ −A, 0 if M ≥ A), min(T, 0) has mean (M θ₀ − A sin θ₀)/π and cosine coefficient
/// (2 M sin θ₀ − A (θ₀ + sin θ₀ cos θ₀))/π; n(T)·T = n_t T + (n_f − n_t) min(T, 0). The
/// mean of min(T, 0) is −1/365 of the sinusoid's freezing index
/// ([`crate::physics::climate::sinusoid_freezing_index_c_days`]). The wave keeps its phase (the
/// surface is coldest when the air is).
pub fn n_factor_wave(mean_c: f64, amplitude_k: f64, freezing: f64, thawing: f64) -> (f64, f64) {
    let (m, a) = (mean_c, amplitude_k.max(0.0));
    let pi = std::f64::consts::PI;
    let th = if m >= a {
        0.0
    } else if m <= -a {
        pi
    } else {
        (m / a).acos()
    };
    let mean_cold = (m * th - a * th.sin()) / pi;
    let cos_cold = (2.0 * m * th.sin() - a * (th + th.sin() * th.cos())) / pi;
    // n T = n_t (M − A cos θ) + (n_f − n_t) (mean_cold + cos_cold cos θ + …).
    let mean = thawing * m + (freezing - thawing) * mean_cold;
    let cos_coef = -thawing * a + (freezing - thawing) * cos_cold;
    (mean, -cos_coef)
}

/// The annual wave's angular frequency, rad/s.
fn annual_omega() -> f64 {
    2.0 * std::f64::consts::PI / (DAYS_PER_YEAR * SECONDS_PER_DAY)
}

/// A layer's conductivity and heat capacity as the annual wave sees them: the means of the
/// frozen and unfrozen values (k at −1 and +1 °C), as in the module doc.
fn wave_properties(m: &Material) -> (f64, f64) {
    let k = 0.5 * (m.conductivity.frozen.k(-1.0) + m.conductivity.unfrozen.k(1.0));
    let c = 0.5 * (m.c_frozen_j_m3k + m.c_unfrozen_j_m3k);
    (k, c)
}

/// The damping depth of the annual wave in a material, d = √(2a/ω), a = k/C with the
/// frozen–unfrozen means (Carslaw & Jaeger 1959 §2.6): the wave's amplitude falls by e over
/// each d. About 2–3 m in moist soils (a ≈ 0.5–1 × 10⁻⁶ m²/s).
pub fn damping_depth_m(m: &Material) -> f64 {
    let (k, c) = wave_properties(m);
    (2.0 * k / c / annual_omega()).sqrt()
}

/// How many damping depths of ground a run models below the surface, unless its bottom is
/// held at the layers given: the annual wave is e⁻³ ≈ 5 % of its surface amplitude there
/// (about 1 K under a 20 K wave), so a deep condition applied there barely bends the year's
/// temperatures above it. A setting of this tool, no source; the periodic start (above)
/// takes the column as going on below its bottom, which is close at this depth.
pub const DEEP_GROUND_DAMPING_DEPTHS: f64 = 3.0;

/// How much to continue the deepest layer downwards, m, so that the column is
/// [`DEEP_GROUND_DAMPING_DEPTHS`] damping depths deep: Z = Σ thickness / d over the layers
/// (the wave's decay exponent, as in the module doc) reaches that number at the new bottom.
/// 0 when the layers given already reach it (or there are none).
pub fn deep_ground_extension_m(thicknesses_m: &[f64], materials: &[Material]) -> f64 {
    let Some(last) = materials.last() else {
        return 0.0;
    };
    let z: f64 = materials
        .iter()
        .zip(thicknesses_m)
        .map(|(m, &t)| t / damping_depth_m(m))
        .sum();
    let short = DEEP_GROUND_DAMPING_DEPTHS - z;
    if short > 0.0 && short.is_finite() {
        short * damping_depth_m(last)
    } else {
        0.0
    }
}

impl PeriodicProfile {
    /// The periodic profile of the run's column under the air wave `wave`.
    pub fn new(spec: &RunSpec, wave: &AnnualWave) -> PeriodicProfile {
        let omega = annual_omega();
        let mut layers = Vec::with_capacity(spec.materials.len());
        let (mut top, mut z_acc, mut r_acc) = (0.0, 0.0, 0.0);
        for (m, &thick) in spec.materials.iter().zip(&spec.thicknesses_m) {
            let (k, _) = wave_properties(m);
            let d = damping_depth_m(m);
            layers.push(WaveLayer {
                top_m: top,
                bottom_m: top + thick,
                k,
                damping_depth_m: d,
                z_top: z_acc,
                r_top: r_acc,
            });
            top += thick;
            z_acc += thick / d;
            r_acc += thick / k;
        }
        let r_total = r_acc;
        let (mean_s, amp_s, phase, q) = match spec.top {
            TopModel::NFactor { freezing, thawing } => {
                let (mean_s, amp_s) =
                    n_factor_wave(wave.mean_c, wave.amplitude_k, freezing, thawing);
                let q = match spec.bottom {
                    BottomCondition::Flux { upward_w_m2 } => upward_w_m2,
                    BottomCondition::Temperature { temperature_c } => {
                        (temperature_c - mean_s) / r_total
                    }
                };
                (mean_s, amp_s, 0.0, q)
            }
            TopModel::AirFilm { film_w_m2k, .. } => {
                let h = film_w_m2k;
                let q = match spec.bottom {
                    BottomCondition::Flux { upward_w_m2 } => upward_w_m2,
                    BottomCondition::Temperature { temperature_c } => {
                        (temperature_c - wave.mean_c) / (1.0 / h + r_total)
                    }
                };
                // h / (h + κ(1 + i)), κ = k/d of the top layer.
                let kappa = layers.first().map_or(0.0, |l| l.k / l.damping_depth_m);
                let (re, im) = (h + kappa, kappa);
                let gain = h / re.hypot(im);
                (
                    wave.mean_c + q / h,
                    wave.amplitude_k * gain,
                    -im.atan2(re),
                    q,
                )
            }
        };
        PeriodicProfile {
            surface_mean_c: mean_s,
            surface_amplitude_k: amp_s,
            surface_phase_rad: phase,
            coldest_s: wave.coldest_s,
            mean_flux_up_w_m2: q,
            omega,
            layers,
        }
    }

    /// Z(z) and R(z) at depth z (below the last layer, continued with its properties).
    fn z_and_r(&self, z_m: f64) -> (f64, f64) {
        let z_m = z_m.max(0.0);
        let l = self
            .layers
            .iter()
            .find(|l| z_m <= l.bottom_m)
            .or(self.layers.last());
        match l {
            Some(l) => (
                l.z_top + (z_m - l.top_m) / l.damping_depth_m,
                l.r_top + (z_m - l.top_m) / l.k,
            ),
            None => (0.0, 0.0),
        }
    }

    /// T(z, t), °C, at depth `z_m` below the ground surface and `t_s` from the start of the
    /// run.
    pub fn temperature_c(&self, z_m: f64, t_s: f64) -> f64 {
        let (zz, rr) = self.z_and_r(z_m);
        self.surface_mean_c + self.mean_flux_up_w_m2 * rr
            - self.surface_amplitude_k
                * (-zz).exp()
                * (self.omega * (t_s - self.coldest_s) + self.surface_phase_rad - zz).cos()
    }
}
