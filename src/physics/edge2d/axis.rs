//! Cell faces along one axis: every listed coordinate is a face, and cells are fine near the
//! listed focus points and grow away from them.
//!
//! Target cell size at x: h(x) = min(h_max, h₀ + (r − 1) d(x)), d the distance to the
//! nearest focus point: the continuous form of cells that grow by a ratio r from one to the
//! next (as the column grid, [`crate::physics::transient::grid`]). Each interval between two
//! consecutive required faces gets n = ⌈∫ dx/h⌉ cells (at least one, so a thin board gets a
//! cell of its own), placed so that each spans an equal share of that integral (the
//! integral by the midpoint rule on pieces a quarter of the finest cell long, its inverse by linear interpolation: a
//! device of this tool, the faces need only be smooth, not exact).

/// How fine a grid axis is.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct AxisSpacing {
    /// Cell size at a focus point, m.
    pub fine_m: f64,
    /// Growth ratio from one cell to the next away from a focus (1 = uniform).
    pub growth_ratio: f64,
    /// Largest cell, m.
    pub max_cell_m: f64,
}

impl AxisSpacing {
    fn h(&self, d: f64) -> f64 {
        (self.fine_m + (self.growth_ratio - 1.0) * d).min(self.max_cell_m)
    }
}

/// Faces from the first to the last of `required` (sorted and made unique here), with cells
/// sized by `spacing` around `foci`.
pub fn faces(required: &[f64], foci: &[f64], spacing: &AxisSpacing) -> Vec<f64> {
    let mut req: Vec<f64> = required.iter().copied().filter(|v| v.is_finite()).collect();
    req.sort_by(f64::total_cmp);
    req.dedup_by(|a, b| (*a - *b).abs() <= 1e-9);
    let h = |x: f64| {
        let d = foci
            .iter()
            .map(|f| (x - f).abs())
            .fold(f64::INFINITY, f64::min);
        spacing.h(if d.is_finite() { d } else { 0.0 })
    };
    let mut out = Vec::new();
    for w in req.windows(2) {
        let (a, b) = (w[0], w[1]);
        // Cumulative ∫ dx/h at the piece ends.
        // Pieces a quarter of the finest cell long (at least 64, at most 20 000).
        let pieces = ((b - a) / (0.25 * spacing.fine_m))
            .ceil()
            .clamp(64.0, 20_000.0) as usize;
        let step = (b - a) / pieces as f64;
        let mut cum = vec![0.0; pieces + 1];
        for k in 0..pieces {
            cum[k + 1] = cum[k] + step / h(a + (k as f64 + 0.5) * step);
        }
        let total = cum[pieces];
        let n = ((total - 1e-9).ceil() as usize).max(1);
        out.push(a);
        let mut k = 0;
        for m in 1..n {
            let target = total * m as f64 / n as f64;
            while cum[k + 1] < target {
                k += 1;
            }
            let s = (target - cum[k]) / (cum[k + 1] - cum[k]);
            out.push(a + (k as f64 + s) * step);
        }
    }
    if let Some(&last) = req.last() {
        out.push(last);
    }
    out
}

/// Widths of the cells between consecutive faces.
pub fn widths(faces: &[f64]) -> Vec<f64> {
    faces.windows(2).map(|w| w[1] - w[0]).collect()
}

/// Index of the face nearest `x`.
pub fn nearest_face(faces: &[f64], x: f64) -> usize {
    let mut best = 0;
    for (k, f) in faces.iter().enumerate() {
        if (f - x).abs() < (faces[best] - x).abs() {
            best = k;
        }
    }
    best
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn required_faces_are_kept_and_cells_grow_away_from_a_focus() {
        let s = AxisSpacing {
            fine_m: 0.01,
            growth_ratio: 1.2,
            max_cell_m: 0.5,
        };
        let f = faces(&[0.0, 0.05, 0.075, 6.0], &[0.05, 0.075], &s);
        for r in [0.0, 0.05, 0.075, 6.0] {
            assert!(f.iter().any(|v| (v - r).abs() < 1e-12), "face {r}");
        }
        let w = widths(&f);
        assert!(w.iter().all(|&d| d > 0.0));
        // Near the focus the cells are about the fine size; the last is near the largest.
        assert!(w[w.len() - 1] > 0.3 && w[w.len() - 1] <= 0.5 + 1e-9);
        let near = w
            .iter()
            .zip(f.windows(2))
            .find(|(_, fw)| fw[0] >= 0.075)
            .unwrap()
            .0;
        assert!(*near <= 0.02, "first cell past the board {near}");
        // Neighbouring cells differ by about the growth ratio at most, plus the rounding of
        // each interval to whole cells (up to (n + 1)/n across a required face).
        for p in w.windows(2) {
            let r = p[1] / p[0];
            assert!(r < 1.5 && r > 1.0 / 1.5, "ratio {r}");
        }
    }
}
