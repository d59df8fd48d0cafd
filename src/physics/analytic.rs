//! Closed-form frost-penetration references and hand methods.
//!
//! These are the textbook solutions a numerical freezing model is checked against, and the
//! hand methods engineers use for frost depth:
//!
//! - [`stefan_depth_m`], [`stefan_depth_with_resistance_m`]: Stefan's quasi-steady law;
//! - [`NeumannProblem`]: the exact two-phase solution for a semi-infinite solid whose surface
//!   is stepped below freezing (Carslaw & Jaeger 1959 §11.2), and [`one_phase_lambda`], the
//!   one-phase case;
//! - [`PeriodicSurface`]: a sinusoidal surface temperature over a semi-infinite solid without
//!   phase change;
//! - [`berggren_lambda`], [`modified_berggren_depth_m`], [`modified_berggren_layered`]: the
//!   modified Berggren method of US Army TM 5-852-6 / UFC 3-130-04;
//! - [`lake_ice_thickness_m`]: ice growth on a lake by Stefan's law with an empirical
//!   coefficient.
//!
//! All inputs and outputs are SI (m, s, °C or K, W, J) except where a published method is
//! stated in its own units (lake-ice coefficients in cm/(°C·d)^½), which the name says.
//! Freezing index F is in K·s: °C·days × 86 400.
//!
//! erf and erfc are those of the `libm` crate; [`erfcx`], the scaled erfc, keeps large
//! arguments from underflowing. Every transcendental equation is put in a strictly monotone
//! form and solved by bisection on a bracket, to about 1e-15 relative. These are what the
//! transient solvers are tested against; `tests/analytic.rs` checks them in turn against
//! values solved independently with scipy (`tools/analytic_reference.py`). The hand methods
//! as a report applies them to a layered column are in [`crate::physics::hand`].

use std::f64::consts::PI;

/// √π.
const SQRT_PI: f64 = 1.772_453_850_905_516;
/// Seconds in a day.
pub const SECONDS_PER_DAY: f64 = 86_400.0;

/// Errors of the closed-form solutions: inputs for which the solution does not exist or the
/// method does not apply.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum AnalyticError {
    #[error("{name} must be a finite number (got {value})")]
    NotFinite { name: &'static str, value: f64 },
    #[error("{name} must be greater than zero (got {value})")]
    NotPositive { name: &'static str, value: f64 },
    #[error("{name} must not be negative (got {value})")]
    Negative { name: &'static str, value: f64 },
    /// The surface must be held below the freezing point for a front to enter the ground.
    #[error("the surface ({surface_c} °C) must be below the freezing point ({freezing_c} °C)")]
    SurfaceNotBelowFreezing { surface_c: f64, freezing_c: f64 },
    /// The Neumann solution starts from unfrozen ground (at or above the freezing point).
    #[error(
        "the initial temperature ({initial_c} °C) must not be below the freezing point ({freezing_c} °C)"
    )]
    InitialBelowFreezing { initial_c: f64, freezing_c: f64 },
    /// The modified Berggren method assumes a mean annual temperature at or above 0 °C
    /// (seasonal frost, not permafrost).
    #[error("the thermal ratio must not be negative (got {alpha}): mean annual temperature below 0 °C is outside the method")]
    NegativeThermalRatio { alpha: f64 },
    #[error("at least one layer is needed")]
    NoLayers,
    /// The root solve failed to bracket a root (should not happen for valid inputs).
    #[error("no root found for {0}")]
    NoRoot(&'static str),
}

fn finite(name: &'static str, value: f64) -> Result<f64, AnalyticError> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(AnalyticError::NotFinite { name, value })
    }
}

fn positive(name: &'static str, value: f64) -> Result<f64, AnalyticError> {
    finite(name, value)?;
    if value > 0.0 {
        Ok(value)
    } else {
        Err(AnalyticError::NotPositive { name, value })
    }
}

fn non_negative(name: &'static str, value: f64) -> Result<f64, AnalyticError> {
    finite(name, value)?;
    if value >= 0.0 {
        Ok(value)
    } else {
        Err(AnalyticError::Negative { name, value })
    }
}

// ---------------------------------------------------------------------------------------
// Error function
// ---------------------------------------------------------------------------------------

/// Error function erf x = (2/√π) ∫₀ˣ e^{−s²} ds (the `libm` crate, a port of the FreeBSD /
/// Sun fdlibm `s_erf.c`, accurate to about 1 ulp). Dimensionless; all real x.
pub fn erf(x: f64) -> f64 {
    libm::erf(x)
}

/// Complementary error function erfc x = 1 − erf x, computed directly (no cancellation for
/// large x) by the `libm` crate (fdlibm `s_erf.c`). Underflows to 0 beyond x ≈ 27.
pub fn erfc(x: f64) -> f64 {
    libm::erfc(x)
}

/// Scaled complementary error function erfcx x = e^{x²} erfc x, for x ≥ 0 (finite where
/// erfc underflows). Below x = 25: e^{x²}·erfc x from [`erfc`]. From 25 up: Laplace's
/// continued fraction erfc x = (e^{−x²}/√π) · 1/(x + ½/(x + 1/(x + (3/2)/(x + …))))
/// (Abramowitz & Stegun 7.1.14), 40 terms, far more than double precision needs there.
/// For x < 0 it is e^{x²}(2 − erfc|x|), which overflows beyond x ≈ −26.
pub fn erfcx(x: f64) -> f64 {
    if x < 25.0 {
        (x * x).exp() * erfc(x)
    } else {
        let mut t = x;
        for n in (1..=40).rev() {
            t = x + 0.5 * n as f64 / t;
        }
        1.0 / (SQRT_PI * t)
    }
}

/// erfc(a)/erfc(b) for 0 ≤ b ≤ a without underflow: e^{b²−a²} erfcx(a)/erfcx(b).
fn erfc_ratio(a: f64, b: f64) -> f64 {
    if b < 5.0 {
        erfc(a) / erfc(b)
    } else {
        ((b - a) * (b + a)).exp() * erfcx(a) / erfcx(b)
    }
}

/// Root of a function that is strictly decreasing on (0, ∞), positive near 0+ and negative
/// for large arguments. Bisection: the upper end doubles from 1 until the function is
/// negative; then the bracket is halved until it is 4 ulp wide (relative 1e-15) or stops
/// shrinking. The function is never evaluated at 0.
fn root_decreasing(what: &'static str, f: impl Fn(f64) -> f64) -> Result<f64, AnalyticError> {
    let mut lo = 0.0_f64;
    let mut hi = 1.0_f64;
    let mut grow = 0;
    loop {
        let v = f(hi);
        if v.is_nan() {
            return Err(AnalyticError::NoRoot(what));
        }
        if v < 0.0 {
            break;
        }
        lo = hi;
        hi *= 2.0;
        grow += 1;
        if grow > 1100 {
            return Err(AnalyticError::NoRoot(what));
        }
    }
    for _ in 0..2000 {
        let mid = 0.5 * (lo + hi);
        if mid <= lo || mid >= hi || hi - lo <= 4.0 * f64::EPSILON * hi {
            break;
        }
        let v = f(mid);
        if v.is_nan() {
            return Err(AnalyticError::NoRoot(what));
        }
        if v > 0.0 {
            lo = mid;
        } else if v < 0.0 {
            hi = mid;
        } else {
            return Ok(mid);
        }
    }
    Ok(0.5 * (lo + hi))
}

// ---------------------------------------------------------------------------------------
// Stefan
// ---------------------------------------------------------------------------------------

/// Stefan's frost depth X = √(2 k F / L), m.
///
/// `k_frozen_w_m_k`: conductivity of the frozen ground, W/m/K; `latent_j_m3`: latent heat
/// released per volume frozen, J/m³; `freezing_index_k_s`: surface freezing index F, K·s
/// (°C·days × 86 400). Source: the quasi-steady Stefan solution (Stefan 1891; as given in
/// Lunardini 1981, Heat Transfer in Cold Climates, and in TM 5-852-6): the frozen layer
/// carries a linear temperature profile and all heat removed is latent heat, L dX/dt =
/// k ΔT/X. Neglects sensible heat of the frozen and unfrozen ground, so it overestimates
/// (an upper bound for ground initially at the freezing point). Valid for Stefan numbers
/// C ΔT/L ≪ 1. F ≤ 0 gives 0; k and L must be positive (otherwise NaN).
pub fn stefan_depth_m(k_frozen_w_m_k: f64, latent_j_m3: f64, freezing_index_k_s: f64) -> f64 {
    stefan_depth_with_resistance_m(k_frozen_w_m_k, latent_j_m3, freezing_index_k_s, 0.0)
}

/// Stefan's frost depth under a surface resistance R (snow cover, insulation, a surface
/// film), m: X = −kR + √((kR)² + 2kF/L).
///
/// Derived (quasi-steady, as in [`stefan_depth_m`]): the heat flow through R and the
/// frozen layer is ΔT/(R + X/k) = L dX/dt; integrating from X = 0 gives
/// L (R X + X²/(2k)) = F. Evaluated as X = (2kF/L)/(kR + √((kR)² + 2kF/L)), which is the
/// same quantity without cancellation when kR ≫ X. `r_m2k_w`: R in m²K/W (≥ 0), the
/// resistance is taken to store no heat. Other arguments as [`stefan_depth_m`].
pub fn stefan_depth_with_resistance_m(
    k_frozen_w_m_k: f64,
    latent_j_m3: f64,
    freezing_index_k_s: f64,
    r_m2k_w: f64,
) -> f64 {
    if k_frozen_w_m_k <= 0.0 || latent_j_m3 <= 0.0 || r_m2k_w < 0.0 {
        return f64::NAN;
    }
    if freezing_index_k_s <= 0.0 {
        return 0.0;
    }
    let kr = k_frozen_w_m_k * r_m2k_w;
    let s = 2.0 * k_frozen_w_m_k * freezing_index_k_s / latent_j_m3;
    s / (kr + (kr * kr + s).sqrt())
}

/// Stefan number Ste = C ΔT / L: sensible heat of cooling by ΔT over latent heat, per
/// volume (`c_j_m3k` J/m³/K, `delta_k` K, `latent_j_m3` J/m³). Dimensionless.
pub fn stefan_number(c_j_m3k: f64, delta_k: f64, latent_j_m3: f64) -> f64 {
    c_j_m3k * delta_k / latent_j_m3
}

// ---------------------------------------------------------------------------------------
// Neumann and one-phase Stefan problems
// ---------------------------------------------------------------------------------------

/// The one-phase Stefan problem: a semi-infinite solid initially at the freezing point T_f,
/// surface stepped to T_s < T_f at t = 0. Returns λ, the root of
/// λ e^{λ²} erf λ = Ste/√π, with Ste = C_f (T_f − T_s)/L; the front is X = 2λ√(a_f t),
/// a_f = k_f/C_f.
///
/// Source: Carslaw & Jaeger 1959 (Conduction of Heat in Solids, 2nd ed.) §11.2, the
/// Neumann solution with the liquid at the fusion temperature; also Crank 1984 (Free and
/// Moving Boundary Problems) §1.3. Solved as λ erf λ − (Ste/√π) e^{−λ²} = 0 (increasing
/// in λ, no overflow) by bisection to 1e-15 relative. For Ste → 0, λ → √(Ste/2) and X →
/// Stefan's √(2 k ΔT t / L). Ste must be positive.
pub fn one_phase_lambda(stefan_number: f64) -> Result<f64, AnalyticError> {
    let ste = positive("Stefan number", stefan_number)?;
    let c = ste / SQRT_PI;
    root_decreasing("the one-phase Stefan equation", |l| {
        c * (-l * l).exp() - l * erf(l)
    })
}

/// The two-phase Neumann problem: a semi-infinite solid (z ≥ 0) at a uniform initial
/// temperature T₀ ≥ T_f whose surface is held at T_s < T_f from t = 0. Freezing happens at
/// one temperature T_f; each phase has constant properties; the volume does not change on
/// freezing. All fields SI: temperatures °C; conductivities W/m/K; volumetric heat
/// capacities J/m³/K; latent heat J/m³ (per volume of frozen material).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct NeumannProblem {
    pub surface_c: f64,
    pub initial_c: f64,
    pub freezing_c: f64,
    pub k_frozen: f64,
    pub k_unfrozen: f64,
    pub c_frozen_j_m3k: f64,
    pub c_unfrozen_j_m3k: f64,
    pub latent_j_m3: f64,
}

/// The solved Neumann problem: front X(t) = 2ξ√(a_f t) and the temperature field.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct NeumannSolution {
    pub problem: NeumannProblem,
    /// ξ, the dimensionless root of the transcendental equation.
    pub xi: f64,
    /// Frozen and unfrozen diffusivities a = k/C, m²/s.
    pub a_frozen_m2_s: f64,
    pub a_unfrozen_m2_s: f64,
}

impl NeumannProblem {
    /// Solve for ξ.
    ///
    /// Source: Carslaw & Jaeger 1959 §11.2 (Neumann's solution); in this notation also
    /// Lunardini 1981 (Heat Transfer in Cold Climates) ch. 7. With X = 2ξ√(a_f t), the
    /// fields
    /// frozen (0 ≤ z ≤ X): T = T_s + (T_f − T_s) erf(z/(2√(a_f t)))/erf ξ,
    /// unfrozen (z ≥ X): T = T₀ − (T₀ − T_f) erfc(z/(2√(a_u t)))/erfc(ξ√(a_f/a_u))
    /// satisfy the heat equation in each zone and T = T_f at the front; the Stefan
    /// condition k_f ∂T_f/∂z − k_u ∂T_u/∂z = L dX/dt at z = X gives
    /// k_f(T_f−T_s)e^{−ξ²}/(erf ξ √(π a_f)) − k_u(T₀−T_f)e^{−ξ² a_f/a_u}/(erfc(ξ√(a_f/a_u)) √(π a_u)) = L ξ √a_f.
    /// The left side falls strictly from +∞ (ξ → 0) and the right rises from 0, so there is
    /// one root; it is found by bisection to 1e-15 relative, with e^{−x²}/erfc x evaluated as
    /// 1/erfcx x so that large arguments do not underflow.
    ///
    /// Errors: a non-finite input, a non-positive property, the surface not below
    /// freezing, or the ground initially below freezing. T₀ = T_f is allowed: it is the
    /// one-phase problem ([`one_phase_lambda`]).
    pub fn solve(&self) -> Result<NeumannSolution, AnalyticError> {
        let p = *self;
        finite("surface temperature", p.surface_c)?;
        finite("initial temperature", p.initial_c)?;
        finite("freezing temperature", p.freezing_c)?;
        positive("frozen conductivity", p.k_frozen)?;
        positive("unfrozen conductivity", p.k_unfrozen)?;
        positive("frozen heat capacity", p.c_frozen_j_m3k)?;
        positive("unfrozen heat capacity", p.c_unfrozen_j_m3k)?;
        positive("latent heat", p.latent_j_m3)?;
        if p.surface_c >= p.freezing_c {
            return Err(AnalyticError::SurfaceNotBelowFreezing {
                surface_c: p.surface_c,
                freezing_c: p.freezing_c,
            });
        }
        if p.initial_c < p.freezing_c {
            return Err(AnalyticError::InitialBelowFreezing {
                initial_c: p.initial_c,
                freezing_c: p.freezing_c,
            });
        }
        let af = p.k_frozen / p.c_frozen_j_m3k;
        let au = p.k_unfrozen / p.c_unfrozen_j_m3k;
        let r = (af / au).sqrt();
        let cold = p.k_frozen * (p.freezing_c - p.surface_c) / (PI * af).sqrt();
        let warm = p.k_unfrozen * (p.initial_c - p.freezing_c) / (PI * au).sqrt();
        let rhs = p.latent_j_m3 * af.sqrt();
        let xi = root_decreasing("the Neumann equation", |x| {
            cold * (-x * x).exp() / erf(x) - warm / erfcx(x * r) - rhs * x
        })?;
        Ok(NeumannSolution {
            problem: p,
            xi,
            a_frozen_m2_s: af,
            a_unfrozen_m2_s: au,
        })
    }
}

impl NeumannSolution {
    /// Front constant β = 2ξ√a_f, m/s^½: X = β√t.
    pub fn front_constant_m_sqrt_s(&self) -> f64 {
        2.0 * self.xi * self.a_frozen_m2_s.sqrt()
    }

    /// Depth of the freezing front at time `t_s` (s), m. 0 for t ≤ 0.
    pub fn front_depth_m(&self, t_s: f64) -> f64 {
        if t_s <= 0.0 {
            0.0
        } else {
            self.front_constant_m_sqrt_s() * t_s.sqrt()
        }
    }

    /// Temperature (°C) at depth `z_m` (m) and time `t_s` (s), from the erf solution in each
    /// zone (see [`NeumannProblem::solve`]). For t ≤ 0 the initial temperature (the surface
    /// temperature at z ≤ 0); depths above the surface are taken as the surface.
    pub fn temperature_c(&self, z_m: f64, t_s: f64) -> f64 {
        let p = &self.problem;
        let z = z_m.max(0.0);
        if t_s <= 0.0 {
            return if z > 0.0 { p.initial_c } else { p.surface_c };
        }
        if z <= self.front_depth_m(t_s) {
            let eta = z / (2.0 * (self.a_frozen_m2_s * t_s).sqrt());
            p.surface_c + (p.freezing_c - p.surface_c) * erf(eta) / erf(self.xi)
        } else {
            let eta = z / (2.0 * (self.a_unfrozen_m2_s * t_s).sqrt());
            let b = self.xi * (self.a_frozen_m2_s / self.a_unfrozen_m2_s).sqrt();
            p.initial_c - (p.initial_c - p.freezing_c) * erfc_ratio(eta, b)
        }
    }
}

// ---------------------------------------------------------------------------------------
// Periodic surface temperature
// ---------------------------------------------------------------------------------------

/// A semi-infinite solid (z ≥ 0) of constant diffusivity a whose surface temperature varies
/// as T(0, t) = T_m + A sin(ωt + φ), long enough for the start to be forgotten, with no
/// phase change: T(z, t) = T_m + A e^{−z/d} sin(ωt + φ − z/d), d = √(2a/ω).
///
/// Source: Carslaw & Jaeger 1959 §2.6 (the standard "temperature waves" solution). SI:
/// °C, K, s, m²/s. Latent heat is ignored, so below a frozen surface it overestimates how
/// far the 0 °C isotherm reaches.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PeriodicSurface {
    /// Mean temperature T_m, °C.
    pub mean_c: f64,
    /// Surface amplitude A, K (half the peak-to-peak swing).
    pub amplitude_k: f64,
    /// Period, s (365 × 86 400 for the annual wave, 86 400 for the daily).
    pub period_s: f64,
    /// Thermal diffusivity a = k/C, m²/s.
    pub diffusivity_m2_s: f64,
    /// Phase φ of the surface wave at t = 0, rad.
    pub phase_rad: f64,
}

impl PeriodicSurface {
    /// ω = 2π/period, rad/s.
    pub fn angular_frequency_rad_s(&self) -> f64 {
        2.0 * PI / self.period_s
    }
    /// Damping depth d = √(2a/ω), m: the amplitude falls by e over d.
    pub fn damping_depth_m(&self) -> f64 {
        (2.0 * self.diffusivity_m2_s / self.angular_frequency_rad_s()).sqrt()
    }
    /// Amplitude at depth z: A e^{−z/d}, K.
    pub fn amplitude_at_k(&self, z_m: f64) -> f64 {
        self.amplitude_k * (-z_m / self.damping_depth_m()).exp()
    }
    /// Phase lag behind the surface at depth z: z/d, rad.
    pub fn phase_lag_rad(&self, z_m: f64) -> f64 {
        z_m / self.damping_depth_m()
    }
    /// Time lag behind the surface at depth z: (z/d)/ω, s.
    pub fn time_lag_s(&self, z_m: f64) -> f64 {
        self.phase_lag_rad(z_m) / self.angular_frequency_rad_s()
    }
    /// T(z, t), °C.
    pub fn temperature_c(&self, z_m: f64, t_s: f64) -> f64 {
        let w = self.angular_frequency_rad_s();
        let zd = z_m / self.damping_depth_m();
        self.mean_c + self.amplitude_k * (-zd).exp() * (w * t_s + self.phase_rad - zd).sin()
    }
    /// Deepest z whose lowest temperature T_m − A e^{−z/d} reaches `threshold_c`:
    /// z = d ln(A/(T_m − threshold)), m. 0 if even the surface stays above it; `None` if
    /// T_m ≤ threshold (every depth reaches it).
    pub fn depth_reaching_m(&self, threshold_c: f64) -> Option<f64> {
        let above = self.mean_c - threshold_c;
        if above <= 0.0 {
            return None;
        }
        Some((self.damping_depth_m() * (self.amplitude_k / above).ln()).max(0.0))
    }
}

// ---------------------------------------------------------------------------------------
// Modified Berggren
// ---------------------------------------------------------------------------------------

/// Thermal ratio α = v₀/v_s (modified Berggren, TM 5-852-6 / UFC 3-130-04): v₀ = mean
/// annual temperature − 0 °C (K), v_s = nF/t, the mean surface temperature depression over
/// the freezing season (K), with `surface_index_k_s` = nF (K·s) and `season_s` = t (s).
/// Dimensionless.
pub fn thermal_ratio(mean_annual_c: f64, surface_index_k_s: f64, season_s: f64) -> f64 {
    mean_annual_c / (surface_index_k_s / season_s)
}

/// Fusion parameter μ = C v_s / L (modified Berggren): `c_j_m3k` the volumetric heat
/// capacity (J/m³/K, the mean of frozen and unfrozen in TM 5-852-6; from memory),
/// `v_s_k` = nF/t (K), `latent_j_m3` (J/m³). Dimensionless.
pub fn fusion_parameter(c_j_m3k: f64, v_s_k: f64, latent_j_m3: f64) -> f64 {
    c_j_m3k * v_s_k / latent_j_m3
}

/// The modified Berggren coefficient λ(α, μ), dimensionless, 0 < λ < 1 for α ≥ 0, so that
/// X = λ √(2 k nF / L).
///
/// TM 5-852-6 reads λ from a chart (Aldrich & Paynter 1953). Here it is computed from the
/// equation the chart plots, derived from the Neumann solution ([`NeumannProblem`]) with
/// equal frozen and unfrozen properties (k, C, a = k/C), ground initially at the mean
/// annual temperature T₀ = v₀ (T_f = 0 °C) and the surface held at −v_s for the season t.
/// With a_f = a_u = a the Neumann equation reads
/// k v_s e^{−ξ²}/(erf ξ √(πa)) − k v₀ e^{−ξ²}/(erfc ξ √(πa)) = L ξ √a;
/// multiplying by e^{ξ²} √(πa)/(k v_s) and using a = k/C:
/// 1/erf ξ − α/erfc ξ = √π ξ e^{ξ²} L/(C v_s) = √π ξ e^{ξ²}/μ.
/// The front X = 2ξ√(a t) equals λ√(2 k v_s t/L) when λ = ξ √(2L/(C v_s)) = ξ √(2/μ),
/// i.e. ξ = z = λ √(μ/2): the form the project's model reference gives.
/// For μ → 0 (latent heat dominant) with α = 0, z → √(μ/2) and λ → 1 (Stefan).
///
/// Solved as e^{−z²}/erf z − α/erfcx z − √π z/μ = 0 (strictly decreasing for α ≥ 0) by
/// bisection to 1e-15 relative. Errors: μ not positive, α negative (mean annual temperature
/// below 0 °C: permafrost, outside the method), or either not finite.
pub fn berggren_lambda(alpha: f64, mu: f64) -> Result<f64, AnalyticError> {
    let alpha = finite("thermal ratio", alpha)?;
    if alpha < 0.0 {
        return Err(AnalyticError::NegativeThermalRatio { alpha });
    }
    let mu = positive("fusion parameter", mu)?;
    let z = root_decreasing("the modified Berggren equation", |z| {
        (-z * z).exp() / erf(z) - alpha / erfcx(z) - SQRT_PI * z / mu
    })?;
    Ok(z * (2.0 / mu).sqrt())
}

/// Frost depth by the modified Berggren method for a homogeneous soil (TM 5-852-6 /
/// UFC 3-130-04): X = λ(α, μ) √(2 k nF / L), m.
///
/// `k`: conductivity, W/m/K (TM 5-852-6 uses the mean of frozen and unfrozen; from
/// memory); `latent`: J/m³; `n_factor`: surface/air freezing-index ratio (dimensionless,
/// e.g. 0.7 bare soil, 1.0 snow-covered surface, UFC 3-130-04 Table 4-1);
/// `freezing_index_k_s`: air freezing index F, K·s; `mean_annual_c`: mean annual
/// temperature, °C (≥ 0, which sets v₀); `season_s`: length of the freezing season, s;
/// `c_vol`: volumetric heat capacity, J/m³/K (mean of frozen and unfrozen). α and μ as
/// [`thermal_ratio`], [`fusion_parameter`]. Valid for seasonal frost in soils freezing at
/// 0 °C; the published method is a design estimate, not an exact solution. F ≤ 0 gives 0.
pub fn modified_berggren_depth_m(
    k: f64,
    latent: f64,
    n_factor: f64,
    freezing_index_k_s: f64,
    mean_annual_c: f64,
    season_s: f64,
    c_vol: f64,
) -> Result<f64, AnalyticError> {
    let layer = BerggrenLayer {
        thickness_m: 1.0,
        k_w_m_k: k,
        latent_j_m3: latent,
        c_j_m3k: c_vol,
    };
    positive("latent heat", latent)?;
    Ok(modified_berggren_layered(
        &[layer],
        n_factor,
        freezing_index_k_s,
        mean_annual_c,
        season_s,
    )?
    .depth_m)
}

/// One layer for the multi-layer modified Berggren procedure (SI).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BerggrenLayer {
    /// Thickness d, m. The deepest layer is taken to extend without limit.
    pub thickness_m: f64,
    /// Conductivity k, W/m/K.
    pub k_w_m_k: f64,
    /// Latent heat L, J/m³ (0 for insulation or dry material).
    pub latent_j_m3: f64,
    /// Volumetric heat capacity C, J/m³/K.
    pub c_j_m3k: f64,
}

/// Result of the multi-layer modified Berggren procedure.
#[derive(Debug, Clone, PartialEq)]
pub struct BerggrenLayered {
    /// Frost depth below the surface, m.
    pub depth_m: f64,
    /// Surface freezing index taken by each layer reached, K·s (the last possibly in part);
    /// they sum to nF.
    pub partial_index_k_s: Vec<f64>,
    /// λ used for the last layer reached.
    pub lambda: f64,
    /// α, v_s (K) of the season.
    pub alpha: f64,
    pub v_s_k: f64,
}

/// Frost depth through layers by the modified Berggren method of TM 5-852-6 (procedure
/// recalled from TM 5-852-6 / UFC 3-130-04, from memory, not re-read).
///
/// The surface index nF is shared out among the layers from the top. Layer i (thickness
/// d_i, k_i, L_i), lying under layers of total resistance ΣR = Σ d_j/k_j, takes the partial
/// index nF_i = L_i d_i (ΣR + d_i/(2k_i)) / λ_i², where λ_i = λ(α, μ_i) with
/// μ_i = C̄ v_s / L̄, C̄ and L̄ the thickness-weighted means of C and L from the surface to
/// the bottom of layer i. (With λ = 1 this is the layered quasi-steady Stefan balance
/// ∫ L R(x) dx = nF; TM 5-852-6 writes it in imperial units with a factor 24 for
/// degree-days to degree-hours.) Layers are taken whole while the index lasts; in the layer
/// where it runs out, the frozen part x solves L x (ΣR + x/(2k))/λ(x)² = the remaining
/// index, with the means taken to depth x, by bisection. v_s = nF/t and α = v₀/v_s are
/// those of the whole season.
///
/// Assumptions: one-dimensional; all water freezes at 0 °C; properties constant within a
/// layer; a layer with L = 0 (insulation) takes no index itself but its resistance counts
/// for the layers below it; the deepest layer continues downward without limit. Splitting
/// a uniform soil into layers leaves the depth unchanged (the sum telescopes), which the
/// tests check.
pub fn modified_berggren_layered(
    layers: &[BerggrenLayer],
    n_factor: f64,
    freezing_index_k_s: f64,
    mean_annual_c: f64,
    season_s: f64,
) -> Result<BerggrenLayered, AnalyticError> {
    if layers.is_empty() {
        return Err(AnalyticError::NoLayers);
    }
    for l in layers {
        positive("layer thickness", l.thickness_m)?;
        positive("layer conductivity", l.k_w_m_k)?;
        non_negative("layer latent heat", l.latent_j_m3)?;
        positive("layer heat capacity", l.c_j_m3k)?;
    }
    if layers.iter().all(|l| l.latent_j_m3 == 0.0) {
        return Err(AnalyticError::NotPositive {
            name: "latent heat of every layer",
            value: 0.0,
        });
    }
    let n = positive("n-factor", n_factor)?;
    let f_air = finite("freezing index", freezing_index_k_s)?;
    finite("mean annual temperature", mean_annual_c)?;
    let season = positive("freezing season", season_s)?;
    let mut out = BerggrenLayered {
        depth_m: 0.0,
        partial_index_k_s: Vec::new(),
        lambda: 1.0,
        alpha: 0.0,
        v_s_k: 0.0,
    };
    if f_air <= 0.0 {
        return Ok(out);
    }
    let nf = n * f_air;
    let v_s = nf / season;
    let alpha = thermal_ratio(mean_annual_c, nf, season);
    if alpha < 0.0 {
        return Err(AnalyticError::NegativeThermalRatio { alpha });
    }
    out.alpha = alpha;
    out.v_s_k = v_s;

    // Running sums over the layers above: depth, resistance, ∫C, ∫L.
    let (mut depth, mut r_above, mut c_int, mut l_int) = (0.0, 0.0, 0.0, 0.0);
    let mut remaining = nf;
    // λ for the layers above plus `x` of layer `l`.
    let lambda_to = |l: &BerggrenLayer, x: f64, depth: f64, c_int: f64, l_int: f64| {
        let c_bar = (c_int + l.c_j_m3k * x) / (depth + x);
        let l_bar = (l_int + l.latent_j_m3 * x) / (depth + x);
        berggren_lambda(alpha, fusion_parameter(c_bar, v_s, l_bar))
    };
    for (i, l) in layers.iter().enumerate() {
        let last = i + 1 == layers.len();
        // Index needed to freeze x of this layer.
        let need = |x: f64| -> Result<f64, AnalyticError> {
            if l.latent_j_m3 == 0.0 {
                return Ok(0.0);
            }
            let lam = lambda_to(l, x, depth, c_int, l_int)?;
            Ok(l.latent_j_m3 * x * (r_above + x / (2.0 * l.k_w_m_k)) / (lam * lam))
        };
        let whole = need(l.thickness_m)?;
        if !last && whole <= remaining {
            remaining -= whole;
            out.partial_index_k_s.push(whole);
            depth += l.thickness_m;
            r_above += l.thickness_m / l.k_w_m_k;
            c_int += l.c_j_m3k * l.thickness_m;
            l_int += l.latent_j_m3 * l.thickness_m;
            continue;
        }
        // The index runs out in this layer (or this is the deepest, unbounded layer).
        let mut hi = l.thickness_m;
        while need(hi)? < remaining {
            hi *= 2.0;
            if !hi.is_finite() {
                return Err(AnalyticError::NoRoot("the layered Berggren depth"));
            }
        }
        let mut lo = 0.0;
        for _ in 0..200 {
            let mid = 0.5 * (lo + hi);
            if mid <= lo || mid >= hi {
                break;
            }
            if need(mid)? < remaining {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        let x = 0.5 * (lo + hi);
        out.partial_index_k_s.push(remaining);
        out.depth_m = depth + x;
        out.lambda = if l.latent_j_m3 == 0.0 {
            1.0
        } else {
            lambda_to(l, x, depth, c_int, l_int)?
        };
        return Ok(out);
    }
    unreachable!("the deepest layer is unbounded")
}

// ---------------------------------------------------------------------------------------
// Lake ice
// ---------------------------------------------------------------------------------------

/// Published lake-ice coefficient for a windy lake with no snow, cm/(°C·d)^½ (Michel 1971,
/// as tabulated by Ashton, e.g. Ashton 1986 River and Lake Ice Engineering; from memory).
pub const LAKE_ICE_COEFFICIENT_WINDY_NO_SNOW: f64 = 2.7;
/// Published range for an average lake with snow, cm/(°C·d)^½ (same source, from memory).
/// Small rivers with flow are lower still (about 0.7–1.4 in the same table, from memory).
pub const LAKE_ICE_COEFFICIENT_AVERAGE_WITH_SNOW: (f64, f64) = (1.7, 2.4);

/// Lake-ice thickness by Stefan's law with an empirical coefficient, m:
/// h = α √(FDD), α in cm/(°C·d)^½, `freezing_degree_days` in °C·d (accumulated from
/// freeze-up), h returned in metres (α √FDD / 100). FDD ≤ 0 gives 0.
///
/// Source: Stefan's law with the coefficient fitted to observations (Michel 1971, via
/// Ashton; from memory). Published coefficients: ≈ 2.7 windy lake with no snow, 1.7–2.4
/// average lake with snow ([`LAKE_ICE_COEFFICIENT_WINDY_NO_SNOW`],
/// [`LAKE_ICE_COEFFICIENT_AVERAGE_WITH_SNOW`]); they lie below the ideal
/// [`stefan_ice_coefficient_cm_sqrt_cday`] (≈ 3.5 for clear ice at the air
/// temperature) because snow and the air film add resistance.
pub fn lake_ice_thickness_m(coefficient_cm_sqrt_cdays: f64, freezing_degree_days: f64) -> f64 {
    if freezing_degree_days <= 0.0 {
        return 0.0;
    }
    coefficient_cm_sqrt_cdays * freezing_degree_days.sqrt() / 100.0
}

/// The ideal Stefan coefficient for ice, cm/(°C·d)^½: 100 √(2 k_i · 86 400 / L), with
/// `k_ice_w_m_k` (W/m/K) and `latent_j_m3` the latent heat per volume of ice (ρ_i L_f,
/// J/m³). It is [`stefan_depth_m`] written in lake-ice units: the ice surface at the air
/// temperature, no snow, no heat from the water.
pub fn stefan_ice_coefficient_cm_sqrt_cday(k_ice_w_m_k: f64, latent_j_m3: f64) -> f64 {
    100.0 * (2.0 * k_ice_w_m_k * SECONDS_PER_DAY / latent_j_m3).sqrt()
}
