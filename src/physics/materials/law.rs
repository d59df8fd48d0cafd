//! Conductivity as a function of temperature, and its Kirchhoff transform.
//!
//! In steady 1D conduction with k = k(T) the flux q = −k dT/dz is the same at every depth, so
//! the Kirchhoff transform Φ(T) = ∫₀ᵀ k(θ) dθ is linear in depth inside a homogeneous layer:
//! Φ(T(z)) = Φ(T_top) − q (z − z_top) (Carslaw & Jaeger 1959, §1.7, standard). With Φ known in
//! closed form and inverted exactly, a layer's profile is exact for any of the laws below,
//! including the jump in k at the freezing point of a soil.

use super::ice;

/// One branch of a conductivity law, on one side of the freezing point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Branch {
    /// k constant, W/m/K.
    Constant(f64),
    /// Ice Ih, k(T) = 9.828 exp(−0.0057 T_K).
    IceIh,
    /// k = k0 + slope · T_c (W/m/K, W/m/K²).
    Linear { k0: f64, slope: f64 },
}

impl Branch {
    pub fn k(self, t_c: f64) -> f64 {
        match self {
            Branch::Constant(k) => k,
            Branch::IceIh => ice::ice_conductivity_w_m_k(t_c),
            Branch::Linear { k0, slope } => k0 + slope * t_c,
        }
    }

    /// ∫₀ᵀ k dθ, W/m.
    pub fn phi(self, t_c: f64) -> f64 {
        match self {
            Branch::Constant(k) => k * t_c,
            Branch::IceIh => ice::ice_kirchhoff_w_m(t_c),
            Branch::Linear { k0, slope } => k0 * t_c + 0.5 * slope * t_c * t_c,
        }
    }

    /// The temperature whose transform is `phi`, on the branch where k stays positive;
    /// `None` if there is none.
    pub fn phi_inverse(self, phi: f64) -> Option<f64> {
        match self {
            Branch::Constant(k) => Some(phi / k),
            Branch::IceIh => ice::ice_kirchhoff_inverse_c(phi),
            Branch::Linear { k0, slope } => {
                if slope.abs() < 1e-15 {
                    return Some(phi / k0);
                }
                // slope/2 T² + k0 T − phi = 0, root with k = k0 + slope T > 0.
                let disc = k0 * k0 + 2.0 * slope * phi;
                if disc < 0.0 {
                    return None;
                }
                Some((disc.sqrt() - k0) / slope)
            }
        }
    }
}

/// Conductivity on either side of the freezing point (0 °C). For a material that does not
/// freeze, both branches are the same.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ConductivityLaw {
    pub frozen: Branch,
    pub unfrozen: Branch,
}

impl ConductivityLaw {
    pub fn constant(k: f64) -> Self {
        Self {
            frozen: Branch::Constant(k),
            unfrozen: Branch::Constant(k),
        }
    }

    pub fn same(branch: Branch) -> Self {
        Self {
            frozen: branch,
            unfrozen: branch,
        }
    }

    pub fn k(&self, t_c: f64) -> f64 {
        if t_c < ice::FREEZING_POINT_C {
            self.frozen.k(t_c)
        } else {
            self.unfrozen.k(t_c)
        }
    }

    /// Kirchhoff transform, zero at 0 °C and continuous across it.
    pub fn phi(&self, t_c: f64) -> f64 {
        if t_c < ice::FREEZING_POINT_C {
            self.frozen.phi(t_c)
        } else {
            self.unfrozen.phi(t_c)
        }
    }

    pub fn phi_inverse(&self, phi: f64) -> Option<f64> {
        if phi < 0.0 {
            self.frozen.phi_inverse(phi).map(|t| t.min(0.0))
        } else {
            self.unfrozen.phi_inverse(phi).map(|t| t.max(0.0))
        }
    }

    /// Whether the two sides differ (the material freezes with a change in k).
    pub fn freezes(&self) -> bool {
        self.frozen != self.unfrozen
    }

    /// Mean conductivity between two temperatures: (Φ(a) − Φ(b)) / (a − b), or k(a) when
    /// they coincide.
    pub fn mean_k(&self, a: f64, b: f64) -> f64 {
        if (a - b).abs() < 1e-12 {
            self.k(0.5 * (a + b))
        } else {
            (self.phi(a) - self.phi(b)) / (a - b)
        }
    }
}
