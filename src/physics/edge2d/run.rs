//! A run of an edge section under a forcing, a slice at a time, and what it reports: frost
//! under the footing and in the far field, heat lost through the slab, and the fields.
//!
//! - The forcing's air sets each step's tops: the inside air through its film or closed,
//!   the wall's top closed, the outside through a film with the forcing's snow as a
//!   resistance depth/k(ρ) that stores no heat, or held at n × air.
//! - Per step an [`EdgeRecord`]: the air, frost below the footing's base (the deepest
//!   frozen point in the columns under the wall, read from the frozen fraction as the
//!   column solver does, minus the base depth; zero or negative: the 0 °C point in the
//!   footing above its base, −base depth when there is none), the far-side column's frost
//!   depth, and the heat from the inside air into the slab and into the outside surface (W
//!   per metre of wall).
//! - Fields ([`EdgeField`]: temperature and frozen fraction, row-major j·nx + i on the
//!   result's faces, with each cell's [`Region`] in the result) every `field_every_s` and
//!   at the end; the [`EdgeResult`] adds the deepest frost under the footing and in the far
//!   field, the mean slab heat, the ledger and the work counters.
//! - [`EdgeRun::advance`] runs at most `max_steps` steps and returns `Progress`;
//!   [`EdgeRun::finish`] gives the result; [`run_edge`] runs to the end in one call.
//!   Slicing changes no number (`slices_give_the_same_run`, `tests/edge2d.rs`).

use super::plane::{PlaneError, TopFace};
use super::section::{EdgeSection, Inside, Layout, Outside, Region, TOP_INSIDE, TOP_OUTSIDE};
use crate::physics::error::InputErrors;
use crate::physics::transient::run::Progress;
use crate::physics::transient::setup::Forcing;

/// Why a run could not start or go on.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum EdgeError {
    #[error("{0}")]
    Input(InputErrors),
    #[error(transparent)]
    Solver(#[from] PlaneError),
}

impl From<InputErrors> for EdgeError {
    fn from(e: InputErrors) -> Self {
        EdgeError::Input(e)
    }
}

/// One record per step.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EdgeRecord {
    /// End of the step, s from the start.
    pub time_s: f64,
    pub air_c: f64,
    /// How far frost reaches below the footing's base, m: positive when frozen ground lies
    /// under the base (the deepest frozen point in the columns under the footing, read from
    /// the frozen fraction as the column solver does); zero or negative when it does not: the
    /// 0 °C point in the footing above its base, measured from the base (−base depth when no
    /// part of the footing is at or below 0 °C).
    pub frost_below_base_m: f64,
    /// Frost depth in the far-side column, m below grade (0 when unfrozen).
    pub far_frost_depth_m: f64,
    /// Heat from the inside air into the slab over the step, W per metre of wall (the
    /// slab's heat loss to the ground, for the half of the building the section holds).
    pub slab_heat_w_m: f64,
    /// Heat into the ground through the outside surface over the step, W per metre of wall.
    pub outside_heat_w_m: f64,
}

/// The fields at one time, row-major (j·nx + i) on the result's grid.
#[derive(Debug, Clone, PartialEq)]
pub struct EdgeField {
    pub time_s: f64,
    pub temperature_c: Vec<f64>,
    /// Ice share of each cell's freezable water (0 for cells that hold none).
    pub frozen_fraction: Vec<f64>,
}

/// Results of a run.
#[derive(Debug, Clone, PartialEq)]
pub struct EdgeResult {
    pub nx: usize,
    pub nz: usize,
    pub x_faces_m: Vec<f64>,
    pub z_faces_m: Vec<f64>,
    pub regions: Vec<Region>,
    pub records: Vec<EdgeRecord>,
    pub fields: Vec<EdgeField>,
    pub max_frost_below_base_m: f64,
    pub max_frost_below_base_time_s: f64,
    pub max_far_frost_depth_m: f64,
    /// Mean heat from the inside air into the slab over the run, W per metre of wall.
    pub mean_slab_heat_w_m: f64,
    pub energy_imbalance_j_m: f64,
    pub energy_throughput_j_m: f64,
    pub steps: u64,
    pub iterations: u64,
    pub linear_iterations: u64,
    pub splits: u64,
}

/// A run in progress. The forcing is passed to each call rather than held.
#[derive(Debug, Clone)]
pub struct EdgeRun {
    section: EdgeSection,
    layout: Layout,
    done: usize,
    n_steps: usize,
    dt: f64,
    records: Vec<EdgeRecord>,
    fields: Vec<EdgeField>,
    next_field: f64,
}

impl EdgeRun {
    /// Validate the section (fields under `prefix`) and build its grid.
    pub fn new(section: &EdgeSection, prefix: &str) -> Result<EdgeRun, EdgeError> {
        let layout = section.layout(prefix)?;
        let n_steps = (section.duration_s / section.step_s).ceil().max(1.0) as usize;
        let dt = section.duration_s / n_steps as f64;
        let mut run = EdgeRun {
            section: section.clone(),
            layout,
            done: 0,
            n_steps,
            dt,
            records: Vec::new(),
            fields: Vec::new(),
            next_field: 0.0,
        };
        run.keep_field();
        Ok(run)
    }

    pub fn layout(&self) -> &Layout {
        &self.layout
    }

    /// Change the solver's iteration settings (before or between slices).
    pub fn set_tolerances(&mut self, t: super::plane::PlaneTolerances) {
        self.layout.plane.tolerances = t;
    }

    /// The top conditions at time t: inside, wall top, outside.
    fn tops(&self, forcing: &dyn Forcing, t: f64) -> ([TopFace; 3], f64) {
        let air = forcing.air_c(t);
        let inside = match self.section.inside {
            Inside::Heated { air_c, film_w_m2k } => TopFace::Air {
                air_c,
                film_w_m2k,
                extra_resistance_m2k_w: 0.0,
            },
            Inside::Closed => TopFace::Closed,
        };
        let outside = match self.section.outside {
            Outside::Film {
                film_w_m2k,
                snow_regression,
            } => {
                let extra = forcing
                    .snow(t)
                    .filter(|&(d, rho)| d > 0.0 && rho > 0.0 && d.is_finite())
                    .map(|(d, rho)| {
                        let k = snow_regression.conductivity_w_m_k(rho);
                        if k > 0.0 && k.is_finite() {
                            d / k
                        } else {
                            0.0
                        }
                    })
                    .unwrap_or(0.0);
                TopFace::Air {
                    air_c: air,
                    film_w_m2k,
                    extra_resistance_m2k_w: extra,
                }
            }
            Outside::NFactor { freezing, thawing } => {
                let n = if air < 0.0 { freezing } else { thawing };
                TopFace::Held { surface_c: n * air }
            }
        };
        ([inside, TopFace::Closed, outside], air)
    }

    fn keep_field(&mut self) {
        let p = &self.layout.plane;
        self.fields.push(EdgeField {
            time_s: p.time_s,
            temperature_c: p.temperature.clone(),
            frozen_fraction: (0..p.len()).map(|k| p.frozen_fraction(k)).collect(),
        });
        self.next_field = p.time_s + self.section.field_every_s;
    }

    /// How far the run has got.
    pub fn progress(&self) -> Progress {
        Progress {
            fraction: self.done as f64 / self.n_steps as f64,
            finished: self.done >= self.n_steps,
        }
    }

    /// Frost below the footing's base now (see [`EdgeRecord::frost_below_base_m`]).
    pub fn frost_below_base_m(&self) -> f64 {
        let l = &self.layout;
        let p = &l.plane;
        let base = p.z_faces_m[l.base_row];
        let frozen = l
            .footing_columns
            .clone()
            .filter_map(|i| p.column_frost_depth_m(i, l.base_row))
            .fold(None, |a: Option<f64>, b| Some(a.map_or(b, |a| a.max(b))));
        if let Some(z) = frozen {
            return z - base;
        }
        // No frozen ground under the base: the lowest 0 °C point in the footing's columns,
        // between cell centres (or at the base, if the lowest footing cell is at or below
        // 0 °C: taken as 0, frost just reaching the base).
        let mut lowest: Option<f64> = None;
        for i in l.footing_columns.clone() {
            for j in (0..l.base_row).rev() {
                let t = p.temperature[j * p.nx + i];
                if t <= 0.0 {
                    let zc = 0.5 * (p.z_faces_m[j] + p.z_faces_m[j + 1]);
                    let z0 = if j + 1 < l.base_row {
                        let zn = 0.5 * (p.z_faces_m[j + 1] + p.z_faces_m[j + 2]);
                        let tn = p.temperature[(j + 1) * p.nx + i];
                        zc + (zn - zc) * (0.0 - t) / (tn - t)
                    } else {
                        base
                    };
                    lowest = Some(lowest.map_or(z0, |a: f64| a.max(z0)));
                    break;
                }
            }
        }
        lowest.map_or(-base, |z| z - base)
    }

    /// Frost depth in the far-side column now, m below grade.
    pub fn far_frost_depth_m(&self) -> f64 {
        let p = &self.layout.plane;
        p.column_frost_depth_m(p.nx - 1, 0).unwrap_or(0.0)
    }

    /// Run at most `max_steps` more steps.
    pub fn advance(
        &mut self,
        forcing: &dyn Forcing,
        max_steps: usize,
    ) -> Result<Progress, EdgeError> {
        let mut budget = max_steps;
        while self.done < self.n_steps && budget > 0 {
            let t_end = (self.done + 1) as f64 * self.dt;
            let (tops, air) = self.tops(forcing, t_end);
            let bottom = self.section.bottom;
            self.layout.plane.step(self.dt, &tops, &bottom)?;
            // The plane's time is the sum of its steps: keep it on the step grid.
            self.layout.plane.time_s = t_end;
            self.done += 1;
            budget -= 1;
            let p = &self.layout.plane;
            self.records.push(EdgeRecord {
                time_s: t_end,
                air_c: air,
                frost_below_base_m: self.frost_below_base_m(),
                far_frost_depth_m: self.far_frost_depth_m(),
                slab_heat_w_m: p.last_top_w_m[TOP_INSIDE],
                outside_heat_w_m: p.last_top_w_m[TOP_OUTSIDE],
            });
            if t_end >= self.next_field - 1e-6 || self.done == self.n_steps {
                self.keep_field();
            }
        }
        Ok(self.progress())
    }

    /// The results (of the steps done so far).
    pub fn finish(self) -> EdgeResult {
        let p = &self.layout.plane;
        let (mut max_b, mut max_t) = (f64::NEG_INFINITY, 0.0);
        for d in &self.records {
            if d.frost_below_base_m > max_b {
                max_b = d.frost_below_base_m;
                max_t = d.time_s;
            }
        }
        let max_far = self
            .records
            .iter()
            .map(|d| d.far_frost_depth_m)
            .fold(0.0, f64::max);
        let mean_slab = if self.records.is_empty() {
            0.0
        } else {
            self.records.iter().map(|d| d.slab_heat_w_m).sum::<f64>() / self.records.len() as f64
        };
        EdgeResult {
            nx: p.nx,
            nz: p.nz,
            x_faces_m: p.x_faces_m.clone(),
            z_faces_m: p.z_faces_m.clone(),
            regions: self.layout.regions.clone(),
            max_frost_below_base_m: if max_b.is_finite() { max_b } else { 0.0 },
            max_frost_below_base_time_s: max_t,
            max_far_frost_depth_m: max_far,
            mean_slab_heat_w_m: mean_slab,
            energy_imbalance_j_m: p.energy_imbalance_j_m(),
            energy_throughput_j_m: p.energy_throughput_j_m,
            steps: p.work.steps,
            iterations: p.work.iterations,
            linear_iterations: p.work.linear_iterations,
            splits: p.work.splits,
            records: self.records,
            fields: self.fields,
        }
    }
}

/// Run a section to the end in one call.
pub fn run_edge(section: &EdgeSection, forcing: &dyn Forcing) -> Result<EdgeResult, EdgeError> {
    let mut r = EdgeRun::new(section, "edge")?;
    r.advance(forcing, usize::MAX)?;
    Ok(r.finish())
}
