//! Steady 1D conduction through a layered stack with surface films.
//!
//! Method. The flux q (W/m², positive from the top face towards the bottom face) is the same
//! at every depth. Inside a homogeneous layer the Kirchhoff transform Φ(T) = ∫₀ᵀ k dθ is
//! linear in depth (see [`crate::physics::materials::law`]), so given q and the temperature at the top
//! of a layer, the temperature at its bottom follows exactly: Φ(T_b) = Φ(T_t) − q d. Films
//! give T_surface = T_air − q/h. Marching from the top face yields the temperature the bottom
//! face would have; that is strictly decreasing in q, so q is found by a bracketed bisection
//! to machine precision. Because each layer's law holds both branches (frozen below 0 °C,
//! unfrozen above), a soil whose 0 °C plane moves when its conductivity changes is solved
//! self-consistently: the iteration is over q, and the frozen part of each layer follows.
//!
//! For constant conductivities the result is the series-resistance formula
//! q = ΔT / (1/h_top + Σ dᵢ/kᵢ + 1/h_bottom) (Incropera & DeWitt, Fundamentals of Heat and
//! Mass Transfer, ch. 3, standard), which the tests check.
//!
//! Valid for conduction only: no convection inside layers, no radiation across air gaps, no
//! moisture or vapour transport, and water freezing at exactly 0 °C.
//!
//! No separate iteration on the position of a 0 °C plane is needed: the frozen and unfrozen
//! parts of a soil follow from the march, and the answer is self-consistent by
//! construction. The property test
//! `flux_is_the_same_through_every_layer_and_the_profile_is_monotone` (`tests/steady.rs`)
//! checks that the flux computed independently from each layer's end temperatures, and
//! through each film, equals q to 1e-8.
//!
//! The result ([`SteadyResult`]) gives each layer's state ([`LayerState`]: frozen,
//! unfrozen, partly frozen, or without water that freezes), every 0 °C plane
//! ([`ZeroPlane`]) and the exact temperature at any depth
//! ([`SteadyResult::temperature_at`]); [`snow_band`] solves the same stack with every snow
//! regression, for the spread the results show.

use crate::physics::error::{InputErrors, Warning};
use crate::physics::materials::{Family, Material, SnowRegression};
use crate::physics::stack::{Boundary, ResolvedStack, Stack};

/// State of one layer at steady state.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum LayerState {
    Frozen,
    Unfrozen,
    PartlyFrozen,
    /// The material holds no water that freezes.
    DoesNotFreeze,
}

impl LayerState {
    pub fn label(self) -> &'static str {
        match self {
            LayerState::Frozen => "frozen",
            LayerState::Unfrozen => "unfrozen",
            LayerState::PartlyFrozen => "partly frozen",
            LayerState::DoesNotFreeze => "does not freeze",
        }
    }
}

/// One layer's result.
#[derive(Debug, Clone, PartialEq)]
pub struct LayerResult {
    pub top_depth_m: f64,
    pub bottom_depth_m: f64,
    pub top_c: f64,
    pub bottom_c: f64,
    /// Effective resistance ΔT/q, m²K/W (d / mean k when q = 0).
    pub r_m2k_w: f64,
    /// Mean conductivity over the layer's temperature span, W/m/K.
    pub k_eff_w_m_k: f64,
    pub state: LayerState,
}

/// A depth where the temperature passes 0 °C.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ZeroPlane {
    pub depth_m: f64,
    pub layer: usize,
    /// Whether the frozen (below 0 °C) side is above the plane.
    pub frozen_above: bool,
}

/// Temperatures at one face.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FaceResult {
    /// Air temperature, where the face meets air through a film.
    pub air_c: Option<f64>,
    pub surface_c: f64,
    pub film_r_m2k_w: f64,
}

/// The steady solution.
#[derive(Debug, Clone, PartialEq)]
pub struct SteadyResult {
    pub stack: ResolvedStack,
    /// W/m², positive from the top face towards the bottom face.
    pub heat_flux_w_m2: f64,
    /// Sum of the layers' resistances, surface to surface, m²K/W.
    pub r_layers_m2k_w: f64,
    /// Including both films (air to air), m²K/W.
    pub r_total_m2k_w: f64,
    /// 1 / r_total, W/m²/K.
    pub u_w_m2k: f64,
    pub top: FaceResult,
    pub bottom: FaceResult,
    pub layers: Vec<LayerResult>,
    pub zero_planes: Vec<ZeroPlane>,
    pub warnings: Vec<Warning>,
}

/// Solver failures that are not input errors.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SolveError {
    #[error("the stack's inputs are not valid: {0}")]
    Input(#[from] InputErrors),
    #[error("no steady temperature profile exists for these conditions (a conductivity law leaves its range)")]
    NoSolution,
}

/// Temperature at the bottom of a layer, given the temperature at its top and the flux.
fn layer_bottom(m: &Material, top_c: f64, thickness: f64, q: f64) -> Option<f64> {
    let phi_b = m.conductivity.phi(top_c) - q * thickness;
    m.conductivity.phi_inverse(phi_b).filter(|t| t.is_finite())
}

/// March from the top face with flux `q`; returns the top surface temperature, each
/// interface temperature (layers + 1 values) and the predicted bottom boundary temperature.
fn march(s: &ResolvedStack, q: f64, temps: &mut Vec<f64>) -> Option<f64> {
    temps.clear();
    let mut t = match s.top {
        Boundary::Air {
            temperature_c,
            film_w_m2k,
        } => temperature_c - q / film_w_m2k,
        Boundary::Surface { temperature_c } => temperature_c,
    };
    temps.push(t);
    for (layer, m) in s.layers.iter().zip(&s.materials) {
        t = layer_bottom(m, t, layer.thickness_m, q)?;
        temps.push(t);
    }
    Some(match s.bottom {
        Boundary::Air { film_w_m2k, .. } => t - q / film_w_m2k,
        Boundary::Surface { .. } => t,
    })
}

/// Solve the steady problem.
pub fn solve(stack: &Stack) -> Result<SteadyResult, SolveError> {
    let resolved = stack.resolve()?;
    solve_resolved(resolved)
}

/// Solve a stack whose inputs are already checked.
pub fn solve_resolved(s: ResolvedStack) -> Result<SteadyResult, SolveError> {
    let t_top = s.top.temperature_c();
    let t_bot = s.bottom.temperature_c();
    let dt = t_top - t_bot;
    let mut temps = Vec::with_capacity(s.layers.len() + 1);
    // residual(q) = predicted bottom temperature − required; strictly decreasing in q.
    // A march that leaves a law's range has gone too far in the direction of q's sign.
    let mut residual = |q: f64| -> f64 {
        match march(&s, q, &mut temps) {
            Some(tb) => tb - t_bot,
            None => {
                if q > 0.0 {
                    f64::NEG_INFINITY
                } else {
                    f64::INFINITY
                }
            }
        }
    };
    let q = if dt == 0.0 {
        0.0
    } else {
        // Initial guess from conductivities at the mean temperature.
        let t_mean = 0.5 * (t_top + t_bot);
        let r_guess: f64 = s.top.film_resistance_m2k_w()
            + s.bottom.film_resistance_m2k_w()
            + s.layers
                .iter()
                .zip(&s.materials)
                .map(|(l, m)| l.thickness_m / m.conductivity.k(t_mean))
                .sum::<f64>();
        let sign = dt.signum();
        let (mut lo, mut hi) = (0.0f64, sign * dt.abs() / r_guess);
        // Expand until the bracket holds the root (|q| grows, residual changes sign).
        let mut expanded = 0;
        while residual(hi) * sign > 0.0 {
            lo = hi;
            hi *= 2.0;
            expanded += 1;
            if expanded > 200 {
                return Err(SolveError::NoSolution);
            }
        }
        for _ in 0..200 {
            let mid = 0.5 * (lo + hi);
            if mid == lo || mid == hi {
                break;
            }
            if residual(mid) * sign > 0.0 {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        // Take the end with the smaller residual.
        if residual(lo).abs() <= residual(hi).abs() {
            lo
        } else {
            hi
        }
    };
    if march(&s, q, &mut temps).is_none() {
        return Err(SolveError::NoSolution);
    }
    Ok(assemble(s, q, &temps))
}

fn assemble(s: ResolvedStack, q: f64, temps: &[f64]) -> SteadyResult {
    let mut layers = Vec::with_capacity(s.layers.len());
    let mut zero_planes = Vec::new();
    let mut warnings = s.warnings.clone();
    for (i, (layer, m)) in s.layers.iter().zip(&s.materials).enumerate() {
        let (tt, tb) = (temps[i], temps[i + 1]);
        let (zt, zb) = (s.interfaces_m[i], s.interfaces_m[i + 1]);
        let k_eff = m.conductivity.mean_k(tt, tb);
        let r = layer.thickness_m / k_eff;
        let frozen_t = tt < 0.0;
        let frozen_b = tb < 0.0;
        if frozen_t != frozen_b && q != 0.0 {
            // Φ(0) = 0 and Φ falls linearly by q per metre.
            let depth = (zt + m.conductivity.phi(tt) / q).clamp(zt, zb);
            zero_planes.push(ZeroPlane {
                depth_m: depth,
                layer: i,
                frozen_above: frozen_t,
            });
        }
        let state = if matches!(m.family, Family::Snow | Family::Ice) {
            // Already frozen water; above 0 °C it would melt (warned below).
            LayerState::Frozen
        } else if !m.freezes {
            LayerState::DoesNotFreeze
        } else if frozen_t && frozen_b {
            LayerState::Frozen
        } else if !frozen_t && !frozen_b {
            LayerState::Unfrozen
        } else {
            LayerState::PartlyFrozen
        };
        let (lo, hi) = m.valid_temperature_c;
        let (tmin, tmax) = (tt.min(tb), tt.max(tb));
        let field = format!("layers[{i}]");
        if matches!(m.family, Family::Snow | Family::Ice) && tmax > 1e-9 {
            warnings.push(Warning {
                field,
                message: format!(
                    "{} would be above 0 °C (up to {tmax:.1} °C): it would be melting, so this part of the profile is not physical",
                    if m.family == Family::Snow { "Snow" } else { "Ice" }
                ),
            });
        } else if tmin < lo || tmax > hi {
            warnings.push(Warning {
                field,
                message: format!(
                    "temperatures {tmin:.1} to {tmax:.1} °C leave the range {lo:.0} to {hi:.0} °C over which this material's properties hold"
                ),
            });
        }
        layers.push(LayerResult {
            top_depth_m: zt,
            bottom_depth_m: zb,
            top_c: tt,
            bottom_c: tb,
            r_m2k_w: r,
            k_eff_w_m_k: k_eff,
            state,
        });
    }
    let r_layers: f64 = layers.iter().map(|l| l.r_m2k_w).sum();
    let r_top = s.top.film_resistance_m2k_w();
    let r_bot = s.bottom.film_resistance_m2k_w();
    let r_total = r_layers + r_top + r_bot;
    let face = |b: &Boundary, surface_c: f64| FaceResult {
        air_c: match b {
            Boundary::Air { temperature_c, .. } => Some(*temperature_c),
            Boundary::Surface { .. } => None,
        },
        surface_c,
        film_r_m2k_w: b.film_resistance_m2k_w(),
    };
    let top = face(&s.top, temps[0]);
    let bottom = face(&s.bottom, temps[temps.len() - 1]);
    SteadyResult {
        heat_flux_w_m2: q,
        r_layers_m2k_w: r_layers,
        r_total_m2k_w: r_total,
        u_w_m2k: 1.0 / r_total,
        top,
        bottom,
        layers,
        zero_planes,
        warnings,
        stack: s,
    }
}

impl SteadyResult {
    /// Total depth of the stack, m.
    pub fn total_depth_m(&self) -> f64 {
        *self.stack.interfaces_m.last().unwrap_or(&0.0)
    }

    /// Temperature at a depth (clamped to the stack), exact.
    pub fn temperature_at(&self, depth_m: f64) -> f64 {
        let z = depth_m.clamp(0.0, self.total_depth_m());
        let i = self
            .layers
            .iter()
            .position(|l| z <= l.bottom_depth_m)
            .unwrap_or(self.layers.len() - 1);
        let l = &self.layers[i];
        let law = &self.stack.materials[i].conductivity;
        let phi = law.phi(l.top_c) - self.heat_flux_w_m2 * (z - l.top_depth_m);
        law.phi_inverse(phi).unwrap_or(l.bottom_c)
    }

    /// Depths for a profile: `per_layer` equal steps in each layer (ends included), plus the
    /// 0 °C planes; sorted, without repeats.
    pub fn profile_depths(&self, per_layer: usize) -> Vec<f64> {
        let per_layer = per_layer.max(1);
        let mut z = Vec::with_capacity(self.layers.len() * per_layer + 1);
        z.push(0.0);
        for l in &self.layers {
            let d = l.bottom_depth_m - l.top_depth_m;
            for k in 1..=per_layer {
                z.push(l.top_depth_m + d * k as f64 / per_layer as f64);
            }
        }
        z.extend(self.zero_planes.iter().map(|p| p.depth_m));
        z.sort_by(f64::total_cmp);
        z.dedup_by(|a, b| (*a - *b).abs() < 1e-12);
        z
    }

    /// Depths that draw the profile exactly as straight segments: the ends of each layer
    /// whose conductivity is constant on both sides of 0 °C (its profile is piecewise
    /// linear), `per_curved_layer` steps in a layer whose k depends on temperature (ice,
    /// air), plus the 0 °C planes.
    pub fn line_depths(&self, per_curved_layer: usize) -> Vec<f64> {
        let mut z = vec![0.0];
        for (l, m) in self.layers.iter().zip(&self.stack.materials) {
            let law = &m.conductivity;
            let straight = matches!(law.frozen, crate::physics::materials::Branch::Constant(_))
                && matches!(law.unfrozen, crate::physics::materials::Branch::Constant(_));
            let n = if straight { 1 } else { per_curved_layer.max(1) };
            let d = l.bottom_depth_m - l.top_depth_m;
            z.extend((1..=n).map(|k| l.top_depth_m + d * k as f64 / n as f64));
        }
        z.extend(self.zero_planes.iter().map(|p| p.depth_m));
        z.sort_by(f64::total_cmp);
        z.dedup_by(|a, b| (*a - *b).abs() < 1e-12);
        z
    }

    /// (depth m, temperature °C) at the given depths.
    pub fn profile_at(&self, depths: &[f64]) -> Vec<(f64, f64)> {
        depths
            .iter()
            .map(|&z| (z, self.temperature_at(z)))
            .collect()
    }
}

/// One snow regression's result in the band.
#[derive(Debug, Clone, PartialEq)]
pub struct BandMember {
    pub regression: SnowRegression,
    pub result: SteadyResult,
}

/// The same stack solved with every snow regression in turn (all snow layers switched
/// together), with the envelope of the profiles.
#[derive(Debug, Clone, PartialEq)]
pub struct SnowBand {
    pub members: Vec<BandMember>,
    /// Regressions that gave no solution (for example a fit with no positive conductivity
    /// at this density), with the reason.
    pub skipped: Vec<(SnowRegression, String)>,
    pub depths_m: Vec<f64>,
    pub min_c: Vec<f64>,
    pub max_c: Vec<f64>,
}

impl SnowBand {
    fn range(&self, f: impl Fn(&SteadyResult) -> f64) -> (f64, f64) {
        self.members
            .iter()
            .map(|m| f(&m.result))
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), v| {
                (lo.min(v), hi.max(v))
            })
    }
    pub fn r_total_range(&self) -> (f64, f64) {
        self.range(|r| r.r_total_m2k_w)
    }
    pub fn flux_range(&self) -> (f64, f64) {
        self.range(|r| r.heat_flux_w_m2)
    }
    /// Range of the shallowest 0 °C plane across regressions that have one.
    pub fn zero_depth_range(&self) -> Option<(f64, f64)> {
        let v: Vec<f64> = self
            .members
            .iter()
            .filter_map(|m| m.result.zero_planes.first().map(|p| p.depth_m))
            .collect();
        if v.is_empty() {
            return None;
        }
        Some(
            v.iter()
                .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), &x| {
                    (lo.min(x), hi.max(x))
                }),
        )
    }
}

/// Solve with every snow regression; `None` when the stack has no snow.
pub fn snow_band(stack: &Stack, depths_m: &[f64]) -> Option<SnowBand> {
    if !stack.has_snow() {
        return None;
    }
    let mut members = Vec::new();
    let mut skipped = Vec::new();
    for c in SnowRegression::ALL {
        let mut variant = stack.clone();
        for l in &mut variant.layers {
            l.material = l.material.with_snow_regression(c);
        }
        match solve(&variant) {
            Ok(result) => members.push(BandMember {
                regression: c,
                result,
            }),
            Err(e) => skipped.push((c, e.to_string())),
        }
    }
    if members.is_empty() {
        return None;
    }
    let mut min_c = vec![f64::INFINITY; depths_m.len()];
    let mut max_c = vec![f64::NEG_INFINITY; depths_m.len()];
    for m in &members {
        for (j, &z) in depths_m.iter().enumerate() {
            let t = m.result.temperature_at(z);
            min_c[j] = min_c[j].min(t);
            max_c[j] = max_c[j].max(t);
        }
    }
    Some(SnowBand {
        members,
        skipped,
        depths_m: depths_m.to_vec(),
        min_c,
        max_c,
    })
}
