//! The finite-volume grid: layer interfaces on cell faces, cells fine at the surface and
//! growing with depth.
//!
//! Target cell size at depth z: h(z) = min(h_max, h₀ + (r − 1) z), the continuous form of
//! cells that grow by a ratio r from one to the next. Each layer gets
//! n = ⌈∫ dz / h(z)⌉ cells (at least one), placed so that every cell spans an equal share of
//! that integral.

/// How fine the grid is.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GridSpec {
    /// Cell size at the surface, m.
    pub surface_cell_m: f64,
    /// Growth ratio from one cell to the next (1 = uniform).
    pub growth_ratio: f64,
    /// Largest cell, m.
    pub max_cell_m: f64,
}

impl GridSpec {
    pub fn uniform(cell_m: f64) -> Self {
        GridSpec {
            surface_cell_m: cell_m,
            growth_ratio: 1.0,
            max_cell_m: cell_m,
        }
    }

    /// Target cell size at depth `z`, m.
    pub fn h(&self, z: f64) -> f64 {
        (self.surface_cell_m + (self.growth_ratio - 1.0) * z).min(self.max_cell_m)
    }

    /// ∫₀ᶻ dz'/h(z'), closed form.
    fn s(&self, z: f64) -> f64 {
        let g = self.growth_ratio - 1.0;
        let h0 = self.surface_cell_m;
        if g <= 1e-12 {
            return z / h0.min(self.max_cell_m);
        }
        let zc = ((self.max_cell_m - h0) / g).max(0.0);
        if z <= zc {
            ((h0 + g * z) / h0).ln() / g
        } else {
            ((h0 + g * zc) / h0).ln() / g + (z - zc) / self.max_cell_m
        }
    }
}

/// Face depths of each layer (global depth from the top face, m), layer by layer; the last
/// face of a layer is the first of the next.
pub fn faces(thicknesses_m: &[f64], spec: &GridSpec) -> Vec<Vec<f64>> {
    let mut out = Vec::with_capacity(thicknesses_m.len());
    let mut top = 0.0;
    for &d in thicknesses_m {
        let bottom = top + d;
        let (s0, s1) = (spec.s(top), spec.s(bottom));
        let n = ((s1 - s0 - 1e-9).ceil() as usize).max(1);
        let mut f = Vec::with_capacity(n + 1);
        f.push(top);
        for k in 1..n {
            let target = s0 + (s1 - s0) * k as f64 / n as f64;
            // s is increasing: bisection.
            let (mut lo, mut hi) = (top, bottom);
            for _ in 0..80 {
                let mid = 0.5 * (lo + hi);
                if spec.s(mid) < target {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            f.push(0.5 * (lo + hi));
        }
        f.push(bottom);
        out.push(f);
        top = bottom;
    }
    out
}
