//! A winter (or several) run on a column: the forcing, the records kept, and the results a
//! builder reads off: frost and thaw depth against time, the deepest frost and its date, the
//! temperature profile at any date, the envelope of temperatures, the ground heat flux and
//! the freezing indices.

use super::{
    cells_for, grid::GridSpec, phase::UnfrozenWater, BottomCondition, Solver, TopCondition,
    TransientError,
};
use crate::materials::{Material, SnowCorrelation};

/// What drives the top of the column over time (t in seconds from the start).
pub trait Forcing {
    /// Air temperature, °C.
    fn air_c(&self, t_s: f64) -> f64;
    /// Snow on the ground: depth m and density kg/m³, or `None`.
    fn snow(&self, _t_s: f64) -> Option<(f64, f64)> {
        None
    }
}

/// A sinusoidal year: T = mean − amplitude cos(2π (day − coldest)/365).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SinusoidalYear {
    pub mean_c: f64,
    pub amplitude_k: f64,
    /// Day of the run (0-based, fractional) on which the air is coldest.
    pub coldest_day: f64,
}

impl Forcing for SinusoidalYear {
    fn air_c(&self, t_s: f64) -> f64 {
        let day = t_s / 86_400.0;
        self.mean_c
            - self.amplitude_k
                * (2.0 * std::f64::consts::PI * (day - self.coldest_day) / 365.0).cos()
    }
}

/// How the top face meets the weather.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum TopModel {
    /// Air through a film; snow on the ground adds its resistance (depth / k(density)), taken
    /// as quasi-steady (no heat stored in the snow), with its surface no warmer than 0 °C.
    AirFilm {
        film_w_m2k: f64,
        snow_correlation: SnowCorrelation,
    },
    /// Surface temperature = n × air temperature, with a freezing n-factor below 0 °C and a
    /// thawing n-factor above (US Army TM 5-852-6 / UFC 3-130-04 n-factor method).
    NFactor { freezing: f64, thawing: f64 },
}

/// How the run starts.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Initial {
    /// Every cell at one temperature, °C.
    Uniform(f64),
    /// Repeat the first year until the state at its start repeats (periodic steady state),
    /// starting from the given uniform temperature; at most `max_years` repeats.
    SpinUp { start_c: f64, max_years: u32 },
}

/// Everything a run needs besides the forcing.
#[derive(Debug, Clone)]
pub struct RunSpec {
    pub thicknesses_m: Vec<f64>,
    pub materials: Vec<Material>,
    pub curves: Vec<Option<UnfrozenWater>>,
    pub grid: GridSpec,
    pub top: TopModel,
    pub bottom: BottomCondition,
    pub initial: Initial,
    /// Requested time step, s (split where needed).
    pub step_s: f64,
    pub duration_s: f64,
    /// Keep a profile every this many seconds.
    pub profile_every_s: f64,
}

/// One record of the time series.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Sample {
    pub time_s: f64,
    pub air_c: f64,
    pub surface_c: f64,
    pub frost_depth_m: f64,
    pub thaw_depth_m: f64,
    /// Heat flux into the ground through its top face, W/m² (negative when the ground loses
    /// heat).
    pub ground_flux_w_m2: f64,
    pub snow_depth_m: f64,
}

/// Results of a run.
#[derive(Debug, Clone)]
pub struct RunResult {
    pub samples: Vec<Sample>,
    /// Cell centres, m.
    pub depths_m: Vec<f64>,
    /// (time s, temperature of each cell °C).
    pub profiles: Vec<(f64, Vec<f64>)>,
    /// Lowest and highest temperature each cell reached.
    pub min_c: Vec<f64>,
    pub max_c: Vec<f64>,
    pub max_frost_depth_m: f64,
    pub max_frost_time_s: f64,
    /// Range of the cumulative degree-day curve of air and of surface temperature, °C·days.
    pub air_freezing_index_c_days: f64,
    pub surface_freezing_index_c_days: f64,
    pub energy_imbalance_j_m2: f64,
    pub energy_throughput_j_m2: f64,
    pub steps: u64,
    pub iterations: u64,
    pub splits: u64,
    pub cells: usize,
    pub spin_up_years: u32,
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

fn top_condition(spec: &RunSpec, forcing: &dyn Forcing, t: f64) -> (TopCondition, f64, f64) {
    let air = forcing.air_c(t);
    match spec.top {
        TopModel::AirFilm {
            film_w_m2k,
            snow_correlation,
        } => {
            let (depth, r_snow) = match forcing.snow(t) {
                Some((d, rho)) if d > 0.0 => (d, d / snow_correlation.conductivity_w_per_m_k(rho)),
                _ => (0.0, 0.0),
            };
            // A snow surface cannot be warmer than 0 °C: warm air over snow drives at most 0 °C.
            let drive = if depth > 0.0 { air.min(0.0) } else { air };
            (
                TopCondition::Air {
                    air_c: drive,
                    film_w_m2k,
                    extra_resistance_m2k_w: r_snow,
                },
                air,
                depth,
            )
        }
        TopModel::NFactor { freezing, thawing } => {
            let n = if air < 0.0 { freezing } else { thawing };
            (TopCondition::Surface { surface_c: n * air }, air, 0.0)
        }
    }
}

fn run_span(
    s: &mut Solver,
    spec: &RunSpec,
    forcing: &dyn Forcing,
    t0: f64,
    duration: f64,
    mut on_step: impl FnMut(&Solver, f64, f64, f64),
) -> Result<(), TransientError> {
    let n_steps = (duration / spec.step_s).ceil().max(1.0) as usize;
    let dt = duration / n_steps as f64;
    for k in 1..=n_steps {
        let t = t0 + dt * k as f64;
        let (top, air, snow) = top_condition(spec, forcing, t);
        s.step(dt, &top, &spec.bottom)?;
        on_step(s, air, snow, dt);
    }
    Ok(())
}

/// Run the column under the forcing.
pub fn run(spec: &RunSpec, forcing: &dyn Forcing) -> Result<RunResult, TransientError> {
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
    let start = match spec.initial {
        Initial::Uniform(t) | Initial::SpinUp { start_c: t, .. } => t,
    };
    let mut s = Solver::new(cells, start);
    let mut spin_up_years = 0;
    if let Initial::SpinUp { max_years, .. } = spec.initial {
        let year = 365.0 * 86_400.0;
        for _ in 0..max_years {
            let before = s.temperature.clone();
            s.time_s = 0.0;
            run_span(&mut s, spec, forcing, 0.0, year, |_, _, _, _| {})?;
            spin_up_years += 1;
            let change = before
                .iter()
                .zip(&s.temperature)
                .map(|(a, b)| (a - b).abs())
                .fold(0.0, f64::max);
            if change < 0.01 {
                break;
            }
        }
        s.time_s = 0.0;
        s.energy_start_j_m2 = s.stored_energy_j_m2();
        s.energy_in_j_m2 = 0.0;
        s.work = Default::default();
    }
    let n = s.cells.len();
    let depths_m: Vec<f64> = s.cells.iter().map(|c| c.center_m()).collect();
    let mut min_c = s.temperature.clone();
    let mut max_c = s.temperature.clone();
    let mut samples = Vec::with_capacity((spec.duration_s / spec.step_s) as usize + 1);
    let mut profiles = vec![(0.0, s.temperature.clone())];
    let mut next_profile = spec.profile_every_s;
    let (mut air_dd, mut surf_dd) = (DegreeDays::default(), DegreeDays::default());
    let mut throughput = 0.0;
    let mut max_frost = (0.0, 0.0);
    let f0 = s.fronts();
    samples.push(Sample {
        time_s: 0.0,
        air_c: forcing.air_c(0.0),
        surface_c: s.temperature[0],
        frost_depth_m: f0.frost_depth_m,
        thaw_depth_m: f0.thaw_depth_m,
        ground_flux_w_m2: 0.0,
        snow_depth_m: forcing.snow(0.0).map_or(0.0, |x| x.0),
    });
    run_span(
        &mut s,
        spec,
        forcing,
        0.0,
        spec.duration_s,
        |s, air, snow, dt| {
            for i in 0..n {
                min_c[i] = min_c[i].min(s.temperature[i]);
                max_c[i] = max_c[i].max(s.temperature[i]);
            }
            let fr = s.fronts();
            if fr.frost_depth_m > max_frost.0 {
                max_frost = (fr.frost_depth_m, s.time_s);
            }
            // Surface temperature: extrapolate the top cell through its half-cell.
            let surface = s.temperature[0]
                + s.last_top_flux_w_m2 * 0.5 * s.cells[0].dz_m
                    / s.cells[0]
                        .phase
                        .conductivity(s.enthalpy[0], s.temperature[0]);
            air_dd.add(air, dt);
            surf_dd.add(surface, dt);
            throughput += (s.last_top_flux_w_m2.abs() + s.last_bottom_flux_w_m2.abs()) * dt;
            samples.push(Sample {
                time_s: s.time_s,
                air_c: air,
                surface_c: surface,
                frost_depth_m: fr.frost_depth_m,
                thaw_depth_m: fr.thaw_depth_m,
                ground_flux_w_m2: s.last_top_flux_w_m2,
                snow_depth_m: snow,
            });
            if s.time_s >= next_profile - 1e-6 {
                profiles.push((s.time_s, s.temperature.clone()));
                next_profile += spec.profile_every_s;
            }
        },
    )?;
    Ok(RunResult {
        samples,
        depths_m,
        profiles,
        min_c,
        max_c,
        max_frost_depth_m: max_frost.0,
        max_frost_time_s: max_frost.1,
        air_freezing_index_c_days: air_dd.range,
        surface_freezing_index_c_days: surf_dd.range,
        energy_imbalance_j_m2: s.energy_imbalance_j_m2(),
        energy_throughput_j_m2: throughput,
        steps: s.work.steps,
        iterations: s.work.iterations,
        splits: s.work.splits,
        cells: n,
        spin_up_years,
    })
}

/// Density assumed for recorded snow whose density is not given, kg/m³: settled snow
/// (200–300 kg/m³ in Cuffey & Paterson, The Physics of Glaciers, Table 2.1; from memory).
pub const DEFAULT_SNOW_DENSITY_KG_M3: f64 = 250.0;

impl Forcing for crate::climate::Climate {
    fn air_c(&self, t_s: f64) -> f64 {
        self.air_temperature_c(t_s)
    }
    fn snow(&self, t_s: f64) -> Option<(f64, f64)> {
        self.snow_at(t_s).map(|s| {
            (
                s.depth_m,
                s.density_kg_m3.unwrap_or(DEFAULT_SNOW_DENSITY_KG_M3),
            )
        })
    }
}
