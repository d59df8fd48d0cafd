//! A winter (or several) run on a column: the forcing, the records kept, and the results a
//! builder reads off: frost and thaw depth against time, the deepest frost and its date, the
//! temperature profile at any date, the envelope of temperatures, the ground heat flux and
//! the freezing indices.
//!
//! **A slice at a time.** The top meets the weather through a film (with the forcing's snow
//! as snow cells under it) or by n-factors; the run starts uniform, periodic or spun up
//! ([`super::setup::Initial`]). [`Run`] holds a run in progress: [`Run::advance`] moves it
//! on by at most `max_steps` steps (spin-up years too) and reports [`Progress`]
//! (`fraction`, `finished`); [`Run::finish`] gives the [`RunResult`]. [`run`] is a `Run`
//! driven to the end in one call, and slicing changes no number
//! (`a_run_advanced_in_slices_gives_the_same_results_as_one_call`, `tests/transient.rs`).
//!
//! **Spin-up** repeats the first year until no ground cell's enthalpy changed over the year
//! by more than [`SPIN_UP_TOLERANCE_K`] of its thawed heat capacity. It is judged on
//! enthalpy, not temperature, so a frozen lens held at 0 °C while it slowly thaws is not
//! taken for rest (judged on temperature it was, and a run reported it as frost on day 0).
//! [`RunResult::spin_up_change_k`] carries the last year's change, so a report can warn
//! when the year limit stopped the spin-up first.
//!
//! **Ground only.** Frost and thaw depths (from the ground surface), the kept profiles and
//! the envelope (of fixed length), [`RunResult::depths_m`] and [`RunResult::cells`] are of
//! the ground cells. The ground surface temperature and flux in the samples are those of
//! the snow/ground interface under snow. The snow cells of each profile are in
//! [`RunResult::snow_profiles`] (height of the cell centre m, °C, from the ground up).

use super::periodic::PeriodicProfile;
use super::setup::{Forcing, Initial, RunSpec, TopModel};
use super::solver::{cells_for, SnowLayer, Solver, TopCondition, TransientError};

/// A spin-up stops when no ground cell's enthalpy changed over the year by more than this
/// many kelvin of its thawed heat capacity (so a change of ice content counts at its full
/// latent weight: a cell held at 0 °C while a frozen lens thaws is not at rest). A setting of
/// this tool, no source: 0.01 K is well below what any chart shows.
pub const SPIN_UP_TOLERANCE_K: f64 = 0.01;

/// The ground cells' enthalpies, J/m³, top down.
fn ground_enthalpies(s: &Solver) -> Vec<f64> {
    s.enthalpy[s.ground()].to_vec()
}

/// The largest change of a ground cell's enthalpy since `before` (from
/// [`ground_enthalpies`]), in kelvin of the cell's thawed heat capacity (the enthalpy step
/// from 10 to 11 °C, where every material is thawed).
/// The ground's change over a spun-up year, in kelvin of each cell's thawed heat capacity:
/// the largest change of one cell (magnitude) and the mean signed change over the cells
/// (above 0: the ground is still warming, below: still cooling).
fn year_change_k(s: &Solver, before: &[f64]) -> (f64, f64) {
    let (mut largest, mut sum, mut n) = (0.0f64, 0.0, 0usize);
    for (i, h0) in s.ground().zip(before) {
        let p = &s.cells[i].phase;
        let c = p.enthalpy(11.0) - p.enthalpy(10.0);
        let change = (s.enthalpy[i] - h0) / c;
        largest = largest.max(change.abs());
        sum += change;
        n += 1;
    }
    (largest, sum / n.max(1) as f64)
}

/// One record of the time series.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Sample {
    pub time_s: f64,
    pub air_c: f64,
    pub surface_c: f64,
    pub frost_depth_m: f64,
    pub thaw_depth_m: f64,
    /// Heat flux into the ground through its top face over the step that ended at
    /// `time_s`, W/m² (negative when the ground loses heat). The sample at time 0 carries the
    /// flux of the last spin-up step when there was a spin-up (the state at the end of a
    /// spun-up year is the state at its start), else that of the first step.
    pub ground_flux_w_m2: f64,
    pub snow_depth_m: f64,
}

/// Results of a run.
#[derive(Debug, Clone)]
pub struct RunResult {
    pub samples: Vec<Sample>,
    /// Centres of the ground cells, m below the ground surface.
    pub depths_m: Vec<f64>,
    /// (time s, temperature of each ground cell °C).
    pub profiles: Vec<(f64, Vec<f64>)>,
    /// The snow cells at the time of each profile: (height of the cell centre above the
    /// ground surface m, temperature °C), from the ground up; empty without snow.
    pub snow_profiles: Vec<Vec<[f64; 2]>>,
    /// Lowest and highest temperature each ground cell reached.
    pub min_c: Vec<f64>,
    pub max_c: Vec<f64>,
    pub max_frost_depth_m: f64,
    pub max_frost_time_s: f64,
    /// Range of the cumulative degree-day curve of air and of surface temperature, °C·days.
    pub air_freezing_index_c_days: f64,
    pub surface_freezing_index_c_days: f64,
    pub energy_imbalance_j_m2: f64,
    /// Σ |face fluxes| Δt + Σ |snow-mass exchange|, J/m².
    pub energy_throughput_j_m2: f64,
    /// Net energy brought in with snow mass over the run, J/m².
    pub snow_exchange_j_m2: f64,
    pub steps: u64,
    pub iterations: u64,
    pub splits: u64,
    /// Cells × linear solves, snow cells included.
    pub cell_updates: u64,
    /// Ground cells.
    pub cells: usize,
    /// Most snow cells at any time.
    pub max_snow_cells: usize,
    pub spin_up_years: u32,
    /// With a spin-up: the largest change of a ground cell over its last year, in kelvin of
    /// thawed heat capacity (see [`SPIN_UP_TOLERANCE_K`]); above the tolerance when the
    /// spin-up stopped at its year limit before settling.
    pub spin_up_change_k: Option<f64>,
    /// With a spin-up: the ground's mean change over its last year, K (above 0 still
    /// warming, below 0 still cooling), so a report can say which way an unsettled start
    /// leans.
    pub spin_up_trend_k: Option<f64>,
}

/// Range of a cumulative freezing degree-day curve: the largest rise of Σ(0 − T)Δt/86400
/// from any earlier minimum (US Army TM 5-852-6 definition of the freezing index).
#[derive(Debug, Clone, Copy, Default)]
struct DegreeDays {
    cumulative: f64,
    min_so_far: f64,
    range: f64,
}

impl DegreeDays {
    fn add(&mut self, t_c: f64, dt_s: f64) {
        self.cumulative += -t_c * dt_s / 86_400.0;
        self.min_so_far = self.min_so_far.min(self.cumulative);
        self.range = self.range.max(self.cumulative - self.min_so_far);
    }
}

/// The conditions at time `t`: the top condition, the air temperature, the snow depth
/// recorded, and the snow the column is to carry.
fn top_condition(
    spec: &RunSpec,
    forcing: &dyn Forcing,
    t: f64,
) -> (TopCondition, f64, f64, Option<SnowLayer>) {
    let air = forcing.air_c(t);
    match spec.top {
        TopModel::AirFilm {
            film_w_m2k,
            snow_regression,
        } => {
            let snow = forcing
                .snow(t)
                .filter(|&(d, rho)| d > 0.0 && rho > 0.0)
                .map(|(d, rho)| SnowLayer {
                    depth_m: d,
                    density_kg_m3: rho,
                    conductivity_w_m_k: snow_regression.conductivity_w_m_k(rho),
                });
            (
                TopCondition::Air {
                    air_c: air,
                    film_w_m2k,
                    extra_resistance_m2k_w: 0.0,
                },
                air,
                snow.map_or(0.0, |s| s.depth_m),
                snow,
            )
        }
        TopModel::NFactor { freezing, thawing } => {
            let n = if air < 0.0 { freezing } else { thawing };
            (TopCondition::Surface { surface_c: n * air }, air, 0.0, None)
        }
    }
}

/// Temperature of snow falling at time `t`: the air's, capped at 0 °C (snow in equilibrium
/// with the air it falls through; common practice, no source).
fn fresh_snow_c(air_c: f64) -> f64 {
    air_c.min(0.0)
}

/// A run in progress, advanced a slice at a time so that a caller (the page) can show
/// progress and stay responsive. [`run`] drives one to the end in a single call.
///
/// The forcing is passed to each call rather than held, so a run owns no borrowed data.
#[derive(Debug, Clone)]
pub struct Run {
    spec: RunSpec,
    solver: Solver,
    /// Spin-up years done, and the state at the start of the year under way (the ground
    /// cells' enthalpies, J/m³).
    spin_up_years: u32,
    spinning: Option<Vec<f64>>,
    spin_up_change: Option<f64>,
    spin_up_trend: Option<f64>,
    /// Steps of the main run done, out of `n_steps`, each `dt` long.
    done: usize,
    n_steps: usize,
    dt: f64,
    /// Steps per spin-up year and their length.
    year_steps: usize,
    year_dt: f64,
    spin_step: usize,
    min_c: Vec<f64>,
    max_c: Vec<f64>,
    samples: Vec<Sample>,
    profiles: Vec<(f64, Vec<f64>)>,
    snow_profiles: Vec<Vec<[f64; 2]>>,
    max_snow_cells: usize,
    next_profile: f64,
    air_dd: DegreeDays,
    surf_dd: DegreeDays,
    throughput: f64,
    max_frost: (f64, f64),
    /// Whether the snow at t = 0 is on the column.
    snow_placed: bool,
    started: bool,
}

/// How far a run has got.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Progress {
    /// Share of the work done, 0–1 (spin-up counted as its year budget, then the run).
    pub fraction: f64,
    pub finished: bool,
}

fn steps_for(duration: f64, step_s: f64) -> (usize, f64) {
    let n = (duration / step_s).ceil().max(1.0) as usize;
    (n, duration / n as f64)
}

impl Run {
    /// Check the spec and set the column up in its initial state.
    pub fn new(spec: &RunSpec) -> Result<Run, TransientError> {
        if spec.materials.is_empty() || spec.thicknesses_m.len() != spec.materials.len() {
            return Err(TransientError::Input {
                field: "layers".into(),
                message: "a run needs at least one layer".into(),
            });
        }
        if !(spec.step_s > 0.0 && spec.duration_s > 0.0 && spec.duration_s / spec.step_s <= 5.0e6) {
            return Err(TransientError::Input {
                field: "run.step_s".into(),
                message: "the step must be positive and the run at most 5 million steps".into(),
            });
        }
        let cells = cells_for(
            &spec.thicknesses_m,
            &spec.materials,
            &spec.grid,
            &spec.curves,
        );
        let (start, wave) = match spec.initial {
            Initial::Uniform(t) => (t, None),
            Initial::SpinUp {
                start_c,
                from_periodic,
                ..
            } => (start_c, from_periodic),
            Initial::Periodic(w) => (0.0, Some(w)),
        };
        let mut solver = Solver::new(cells, start);
        if let Some(w) = wave {
            if !(w.mean_c.is_finite()
                && w.amplitude_k.is_finite()
                && w.amplitude_k >= 0.0
                && w.coldest_s.is_finite())
            {
                return Err(TransientError::Input {
                    field: "winter.initial".into(),
                    message: "the annual wave of the periodic start must be finite".into(),
                });
            }
            let p = PeriodicProfile::new(spec, &w);
            solver.set_temperatures(|z| p.temperature_c(z, 0.0));
        }
        let (n_steps, dt) = steps_for(spec.duration_s, spec.step_s);
        let (year_steps, year_dt) = steps_for(365.0 * 86_400.0, spec.step_s);
        let spinning = match spec.initial {
            Initial::SpinUp { max_years, .. } if max_years > 0 => Some(ground_enthalpies(&solver)),
            _ => None,
        };
        Ok(Run {
            spec: spec.clone(),
            min_c: solver.temperature.clone(),
            max_c: solver.temperature.clone(),
            samples: Vec::with_capacity(n_steps + 1),
            profiles: Vec::new(),
            snow_profiles: Vec::new(),
            max_snow_cells: 0,
            snow_placed: false,
            next_profile: spec.profile_every_s,
            air_dd: DegreeDays::default(),
            surf_dd: DegreeDays::default(),
            throughput: 0.0,
            max_frost: (0.0, 0.0),
            solver,
            spin_up_years: 0,
            spinning,
            spin_up_change: None,
            spin_up_trend: None,
            done: 0,
            n_steps,
            dt,
            year_steps,
            year_dt,
            spin_step: 0,
            started: false,
        })
    }

    /// Centres of the ground cells, m.
    pub fn depths_m(&self) -> Vec<f64> {
        self.solver.cells[self.solver.ground()]
            .iter()
            .map(|c| c.center_m())
            .collect()
    }

    /// The column (for inspection).
    pub fn solver(&self) -> &Solver {
        &self.solver
    }

    pub fn progress(&self) -> Progress {
        let spin_budget = match self.spec.initial {
            Initial::SpinUp { max_years, .. } => max_years as f64 * self.year_steps as f64,
            Initial::Uniform(_) | Initial::Periodic(_) => 0.0,
        };
        let spin_done = if self.spinning.is_some() {
            self.spin_up_years as f64 * self.year_steps as f64 + self.spin_step as f64
        } else {
            spin_budget
        };
        let total = spin_budget + self.n_steps as f64;
        Progress {
            fraction: ((spin_done + self.done as f64) / total).min(1.0),
            finished: self.done >= self.n_steps,
        }
    }

    /// Advance by at most `max_steps` time steps (spin-up steps count).
    pub fn advance(
        &mut self,
        forcing: &dyn Forcing,
        max_steps: usize,
    ) -> Result<Progress, TransientError> {
        let mut budget = max_steps.max(1);
        if !self.snow_placed {
            // The snow on the ground at the start is part of the initial state.
            self.snow_placed = true;
            let (_, air, _, snow) = top_condition(&self.spec, forcing, 0.0);
            self.solver.set_snow(snow, fresh_snow_c(air));
            self.solver.restart_ledger();
        }
        while budget > 0 && self.spinning.is_some() {
            self.spin_step += 1;
            budget -= 1;
            let t = self.year_dt * self.spin_step as f64;
            let (top, air, _, snow) = top_condition(&self.spec, forcing, t);
            self.solver.set_snow(snow, fresh_snow_c(air));
            self.solver.step(self.year_dt, &top, &self.spec.bottom)?;
            if self.spin_step >= self.year_steps {
                self.end_spin_up_year();
            }
        }
        if self.spinning.is_some() {
            return Ok(self.progress());
        }
        if !self.started {
            self.begin_main(forcing);
        }
        while budget > 0 && self.done < self.n_steps {
            budget -= 1;
            self.done += 1;
            let t = self.dt * self.done as f64;
            let (top, air, depth, snow) = top_condition(&self.spec, forcing, t);
            let exchange = self.solver.set_snow(snow, fresh_snow_c(air));
            self.solver.step(self.dt, &top, &self.spec.bottom)?;
            self.record(air, depth, exchange);
        }
        Ok(self.progress())
    }

    fn end_spin_up_year(&mut self) {
        let Initial::SpinUp { max_years, .. } = self.spec.initial else {
            return;
        };
        self.spin_up_years += 1;
        self.spin_step = 0;
        self.solver.time_s = 0.0;
        let before = self.spinning.take().unwrap_or_default();
        let (change, trend) = year_change_k(&self.solver, &before);
        self.spin_up_change = Some(change);
        self.spin_up_trend = Some(trend);
        if change >= SPIN_UP_TOLERANCE_K && self.spin_up_years < max_years {
            self.spinning = Some(ground_enthalpies(&self.solver));
        } else {
            let s = &mut self.solver;
            s.restart_ledger();
            s.work = Default::default();
        }
    }

    fn begin_main(&mut self, forcing: &dyn Forcing) {
        self.started = true;
        let s = &self.solver;
        let ground = s.ground_temperatures();
        self.min_c = ground.to_vec();
        self.max_c = ground.to_vec();
        self.profiles = vec![(0.0, ground.to_vec())];
        self.snow_profiles = vec![s.snow_profile()];
        self.max_snow_cells = s.snow_cells;
        let f0 = s.fronts();
        let spun = self.spin_up_years > 0;
        self.samples.push(Sample {
            time_s: 0.0,
            air_c: forcing.air_c(0.0),
            surface_c: if spun {
                s.last_ground_surface_c
            } else {
                ground[0]
            },
            frost_depth_m: f0.frost_depth_m,
            thaw_depth_m: f0.thaw_depth_m,
            // Replaced by the first step's flux in `record` when there was no spin-up.
            ground_flux_w_m2: if spun {
                s.last_ground_flux_w_m2
            } else {
                f64::NAN
            },
            snow_depth_m: forcing.snow(0.0).map_or(0.0, |x| x.0),
        });
    }

    fn record(&mut self, air: f64, snow: f64, exchange: f64) {
        let s = &self.solver;
        let dt = self.dt;
        for (i, &t) in s.ground_temperatures().iter().enumerate() {
            self.min_c[i] = self.min_c[i].min(t);
            self.max_c[i] = self.max_c[i].max(t);
        }
        self.max_snow_cells = self.max_snow_cells.max(s.snow_cells);
        let fr = s.fronts();
        if fr.frost_depth_m > self.max_frost.0 {
            self.max_frost = (fr.frost_depth_m, s.time_s);
        }
        // The ground surface (the snow/ground interface under snow), extrapolated from the
        // top ground cell through its half-cell.
        let surface = s.last_ground_surface_c;
        self.air_dd.add(air, dt);
        self.surf_dd.add(surface, dt);
        self.throughput +=
            (s.last_top_flux_w_m2.abs() + s.last_bottom_flux_w_m2.abs()) * dt + exchange.abs();
        if let [first] = self.samples.as_mut_slice() {
            if first.ground_flux_w_m2.is_nan() {
                first.ground_flux_w_m2 = s.last_ground_flux_w_m2;
            }
        }
        self.samples.push(Sample {
            time_s: s.time_s,
            air_c: air,
            surface_c: surface,
            frost_depth_m: fr.frost_depth_m,
            thaw_depth_m: fr.thaw_depth_m,
            ground_flux_w_m2: s.last_ground_flux_w_m2,
            snow_depth_m: snow,
        });
        if s.time_s >= self.next_profile - 1e-6 {
            self.profiles
                .push((s.time_s, s.ground_temperatures().to_vec()));
            self.snow_profiles.push(s.snow_profile());
            self.next_profile += self.spec.profile_every_s;
        }
    }

    /// The results; call once [`Progress::finished`] (earlier, they cover the part run).
    pub fn finish(self) -> RunResult {
        let s = &self.solver;
        RunResult {
            depths_m: self.depths_m(),
            energy_imbalance_j_m2: s.energy_imbalance_j_m2(),
            energy_throughput_j_m2: self.throughput,
            snow_exchange_j_m2: s.snow_exchange_j_m2,
            steps: s.work.steps,
            iterations: s.work.iterations,
            splits: s.work.splits,
            cell_updates: s.work.cell_updates,
            cells: s.cells.len() - s.snow_cells,
            max_snow_cells: self.max_snow_cells,
            samples: self.samples,
            profiles: self.profiles,
            snow_profiles: self.snow_profiles,
            min_c: self.min_c,
            max_c: self.max_c,
            max_frost_depth_m: self.max_frost.0,
            max_frost_time_s: self.max_frost.1,
            air_freezing_index_c_days: self.air_dd.range,
            surface_freezing_index_c_days: self.surf_dd.range,
            spin_up_years: self.spin_up_years,
            spin_up_change_k: self.spin_up_change,
            spin_up_trend_k: self.spin_up_trend,
        }
    }
}

/// Run the column under the forcing, to the end.
pub fn run(spec: &RunSpec, forcing: &dyn Forcing) -> Result<RunResult, TransientError> {
    let mut r = Run::new(spec)?;
    while !r.advance(forcing, usize::MAX)?.finished {}
    Ok(r.finish())
}
