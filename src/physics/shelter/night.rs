//! The first hours after people enter: interior air and wall temperatures over time.
//!
//! Method:
//! - Every zone of the [`Model`] is a column of finite volumes from its inner surface to its
//!   sink ([`RadialWall`]): radial in a sphere sector (face areas Ω r², cell volumes
//!   Ω (r₂³ − r₁³)/3, conductance between two radii Ω k/(1/r₁ − 1/r₂), the exact steady
//!   spherical resistance, so the columns reach the steady shell formula exactly) or straight
//!   in a plane wall. Faces come from the project's grid ([`crate::physics::transient::grid`]): fine
//!   at the inner surface, growing outwards. Deep snow and ground (infinite outer radius in
//!   the steady model) are cut at 10 √(a t_end) beyond the surface, at least 0.5 m, and held
//!   there at their temperature: at the end of the night the heat has not reached that far
//!   (erfc(5) ≈ 1.5e-12).
//! - Snow and ground keep constant properties (snow: ρ c_ice at −10 °C; no phase change
//!   inside the wall: every cell stays at or below 0 °C, see below), so each step is linear.
//! - Backward Euler in time. The interior air is a lumped node with its heat capacity
//!   (ρ c_p V at the starting temperature, held constant so the energy ledger is exact). Per
//!   step, each column's response to its surface temperature is linear: heat into the wall
//!   = a + b T_surface, from two tridiagonal solves with one factorisation. With the film
//!   (R_in), T_surface follows from T_i; where it would pass 0 °C on snow, it is held at
//!   0 °C and the surplus T_i/R_in − (a + b·0) melts snow (the melt limit, as in the steady
//!   balance). The air equation C_air (T_i − T_iⁿ)/Δt = gains − vent − doorway − Σ film heat
//!   is decreasing in T_i and is solved by bisection to the last bit; then each column takes
//!   its surface temperature. With the surface and the sinks at or below 0 °C and the start
//!   at or below 0 °C, the backward-Euler matrix (an M-matrix) keeps every cell at or below
//!   0 °C (discrete maximum principle): held snow does not warm past melting.
//! - Energy ledger: stored change (walls and air) = heat given off − air exchange − heat to
//!   the sinks − melt, closed to round-off.
//!
//! The melting surface is not moved (a night's melt is millimetres); the outside stays at
//! the conditions' temperature.
//!
//! Checked in `tests/shelter.rs`: a column at rest reaches the steady shell formula to 1e-9
//! (`radial_column_reaches_the_steady_shell`), the ledger closes to 1e-9 and the snow stays
//! at or below 0 °C (`night_conserves_energy_and_warms_up`, `night_holds_the_melt_limit`).
//!
//! **Warm-up time**: the first time the air reaches its start plus
//! [`NightSettings::warmup_share`] (default 90 %) of the rise to the steady interior
//! temperature, interpolated within the step; `None` if not within the night. It refers to
//! the steady state with infinitely deep snow, which the night's columns only approach over
//! weeks.

use super::inputs::{Conditions, Shelter, ShelterError, NIGHT_FIELD};
use super::model::{Geometry, Model, Sink};
use super::steady;
use crate::physics::error::{check, InputErrors, Warning};
use crate::physics::materials::ice::{AIR_SPECIFIC_HEAT_J_PER_KG_K, LATENT_HEAT_FUSION_J_PER_KG};
use crate::physics::transient::grid::{faces, GridSpec};

/// Most cell-steps (cells of all columns × time steps) a night may take: a few seconds of
/// work natively (a limit of this tool).
pub const MAX_CELL_STEPS: f64 = 2.0e8;

/// How a column conducts.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum WallGeometry {
    /// Positions are radii, m.
    Sphere { solid_angle_sr: f64 },
    /// Positions are depths from the inner face, m.
    Plane { area_m2: f64 },
}

impl WallGeometry {
    fn area(&self, x: f64) -> f64 {
        match *self {
            WallGeometry::Sphere { solid_angle_sr } => solid_angle_sr * x * x,
            WallGeometry::Plane { area_m2 } => area_m2,
        }
    }
    fn volume(&self, x1: f64, x2: f64) -> f64 {
        match *self {
            WallGeometry::Sphere { solid_angle_sr } => {
                solid_angle_sr * (x2 * x2 * x2 - x1 * x1 * x1) / 3.0
            }
            WallGeometry::Plane { area_m2 } => area_m2 * (x2 - x1),
        }
    }
    fn resistance(&self, x1: f64, x2: f64, k: f64) -> f64 {
        match *self {
            WallGeometry::Sphere { solid_angle_sr } => (1.0 / x1 - 1.0 / x2) / (solid_angle_sr * k),
            WallGeometry::Plane { area_m2 } => (x2 - x1) / (k * area_m2),
        }
    }
}

/// A column of finite volumes through one wall, from its inner surface to its sink.
#[derive(Debug, Clone)]
pub struct RadialWall {
    pub geometry: WallGeometry,
    /// Cell faces (radius or depth), m, inner surface first.
    pub faces_m: Vec<f64>,
    /// Cell temperatures, °C.
    pub temperature_c: Vec<f64>,
    /// Heat capacity of each cell, J/K.
    capacity: Vec<f64>,
    /// Conductances, W/K: `g[0]` inner surface → cell 0, `g[k]` cell k−1 → cell k,
    /// `g[n]` last cell → sink.
    g: Vec<f64>,
    pub sink_c: f64,
    // Factorisation for the step `dt` (Thomas): modified upper diagonal and pivots.
    dt: f64,
    cp: Vec<f64>,
    inv: Vec<f64>,
    u: Vec<f64>,
    w: Vec<f64>,
}

impl RadialWall {
    /// A column from `inner_m` to `outer_m` (radius for a sphere, depth for a plane: then
    /// `inner_m` = 0), conductivity `k`, heat capacity `c` J/m³K, outer face to `sink_c`
    /// through `outer_film_w_m2k` (`None`: held at `sink_c`), starting at `start_c`.
    #[allow(clippy::too_many_arguments)]
    pub fn new(
        geometry: WallGeometry,
        inner_m: f64,
        outer_m: f64,
        k: f64,
        c: f64,
        grid: &GridSpec,
        sink_c: f64,
        outer_film_w_m2k: Option<f64>,
        start_c: f64,
    ) -> RadialWall {
        let depth = faces(&[outer_m - inner_m], grid);
        let faces_m: Vec<f64> = depth[0].iter().map(|d| inner_m + d).collect();
        let n = faces_m.len() - 1;
        let centre: Vec<f64> = (0..n)
            .map(|i| 0.5 * (faces_m[i] + faces_m[i + 1]))
            .collect();
        let capacity = (0..n)
            .map(|i| c * geometry.volume(faces_m[i], faces_m[i + 1]))
            .collect();
        let mut g = vec![0.0; n + 1];
        g[0] = 1.0 / geometry.resistance(faces_m[0], centre[0], k);
        for i in 1..n {
            g[i] = 1.0 / geometry.resistance(centre[i - 1], centre[i], k);
        }
        let film = outer_film_w_m2k.map_or(0.0, |h| 1.0 / (h * geometry.area(faces_m[n])));
        g[n] = 1.0 / (geometry.resistance(centre[n - 1], faces_m[n], k) + film);
        RadialWall {
            geometry,
            faces_m,
            temperature_c: vec![start_c; n],
            capacity,
            g,
            sink_c,
            dt: f64::NAN,
            cp: vec![0.0; n],
            inv: vec![0.0; n],
            u: vec![0.0; n],
            w: vec![0.0; n],
        }
    }

    pub fn cells(&self) -> usize {
        self.temperature_c.len()
    }

    /// Cell centres, m.
    pub fn centres_m(&self) -> Vec<f64> {
        self.faces_m
            .windows(2)
            .map(|f| 0.5 * (f[0] + f[1]))
            .collect()
    }

    /// Heat stored, J, referred to 0 °C.
    pub fn stored_energy_j(&self) -> f64 {
        self.capacity
            .iter()
            .zip(&self.temperature_c)
            .map(|(c, t)| c * t)
            .sum()
    }

    /// Heat leaving through the outer face to the sink now, W.
    pub fn outer_loss_w(&self) -> f64 {
        let n = self.cells();
        self.g[n] * (self.temperature_c[n - 1] - self.sink_c)
    }

    fn factor(&mut self, dt: f64) {
        let n = self.cells();
        let mut prev_c = 0.0;
        for i in 0..n {
            let diag = self.capacity[i] / dt + self.g[i] + self.g[i + 1];
            let lower = if i > 0 { -self.g[i] } else { 0.0 };
            let d = diag - lower * prev_c;
            self.inv[i] = 1.0 / d;
            let upper = if i + 1 < n { -self.g[i + 1] } else { 0.0 };
            self.cp[i] = upper * self.inv[i];
            prev_c = self.cp[i];
        }
        self.dt = dt;
    }

    fn solve_into(&self, rhs: &mut [f64]) {
        let n = self.cells();
        for i in 0..n {
            let lower = if i > 0 { -self.g[i] } else { 0.0 };
            let prev = if i > 0 { rhs[i - 1] } else { 0.0 };
            rhs[i] = (rhs[i] - lower * prev) * self.inv[i];
        }
        for i in (0..n.saturating_sub(1)).rev() {
            rhs[i] -= self.cp[i] * rhs[i + 1];
        }
    }

    /// Prepare a step of `dt` s: returns (a, b) with heat into the wall from its inner
    /// surface over the step = a + b T_surface, W.
    pub fn surface_response(&mut self, dt: f64) -> (f64, f64) {
        if self.dt != dt {
            self.factor(dt);
        }
        let n = self.cells();
        let mut u = std::mem::take(&mut self.u);
        let mut w = std::mem::take(&mut self.w);
        for i in 0..n {
            u[i] = self.capacity[i] / dt * self.temperature_c[i];
            w[i] = 0.0;
        }
        u[n - 1] += self.g[n] * self.sink_c;
        w[0] = self.g[0];
        self.solve_into(&mut u);
        self.solve_into(&mut w);
        let a = -self.g[0] * u[0];
        let b = self.g[0] * (1.0 - w[0]);
        self.u = u;
        self.w = w;
        (a, b)
    }

    /// End the step prepared by [`RadialWall::surface_response`] with the inner surface at
    /// `t_surface`; returns the heat conducted into the wall, W.
    pub fn finish_step(&mut self, t_surface: f64) -> f64 {
        for i in 0..self.cells() {
            self.temperature_c[i] = self.u[i] + t_surface * self.w[i];
        }
        self.g[0] * (t_surface - self.temperature_c[0])
    }

    /// One step of `dt` s with the inner surface held at `t_surface`; returns the heat
    /// conducted into the wall, W.
    pub fn step_surface_held(&mut self, t_surface: f64, dt: f64) -> f64 {
        self.surface_response(dt);
        self.finish_step(t_surface)
    }
}

/// Settings of the night run.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct NightSettings {
    /// Length of the run, s.
    pub duration_s: f64,
    /// Time step, s (the run takes ⌈duration/step⌉ equal steps).
    pub step_s: f64,
    /// Uniform starting temperature of the snow (walls, roof, snowpack, snow floor), °C: the
    /// outside air for a shelter just built, the snowpack's for a cave. A ground floor
    /// starts at its own temperature.
    pub snow_start_c: f64,
    /// Starting temperature of the interior air, °C.
    pub air_start_c: f64,
    /// Share of the rise to the steady interior temperature that defines the warm-up time.
    pub warmup_share: f64,
    /// An interior temperature whose first crossing is reported, °C.
    pub target_c: Option<f64>,
    /// Grid of every column (first cell at the inner surface, growth, largest).
    pub grid: GridSpec,
    /// Interval between kept samples, s.
    pub sample_every_s: f64,
    /// Hang the shelter's lining from the start.
    pub lining: bool,
}

impl Default for NightSettings {
    /// Twelve hours in one-minute steps, snow and air starting at −15 °C, warm-up at 90 %
    /// of the rise, first cell 2 mm growing by 10 % to at most 5 cm (common practice, no
    /// source), samples every 10 minutes.
    fn default() -> Self {
        NightSettings {
            duration_s: 12.0 * 3600.0,
            step_s: 60.0,
            snow_start_c: -15.0,
            air_start_c: -15.0,
            warmup_share: 0.9,
            target_c: None,
            grid: GridSpec {
                surface_cell_m: 0.002,
                growth_ratio: 1.1,
                max_cell_m: 0.05,
            },
            sample_every_s: 600.0,
            lining: false,
        }
    }
}

impl NightSettings {
    pub fn validate(&self, prefix: &str, errs: &mut InputErrors) {
        let f = |n: &str| format!("{prefix}.{n}");
        check::within(
            errs,
            &f("duration_s"),
            self.duration_s,
            60.0,
            7.0 * 86_400.0,
            "s",
        );
        check::within(errs, &f("step_s"), self.step_s, 0.01, 3600.0, "s");
        check::within(
            errs,
            &f("snow_start_c"),
            self.snow_start_c,
            -70.0,
            0.0,
            "°C",
        );
        check::within(errs, &f("air_start_c"), self.air_start_c, -70.0, 40.0, "°C");
        check::within(errs, &f("warmup_share"), self.warmup_share, 0.01, 0.999, "");
        if let Some(t) = self.target_c {
            check::within(errs, &f("target_c"), t, -70.0, 40.0, "°C");
        }
        check::within(
            errs,
            &f("grid.surface_cell_m"),
            self.grid.surface_cell_m,
            1e-4,
            0.1,
            "m",
        );
        check::within(
            errs,
            &f("grid.growth_ratio"),
            self.grid.growth_ratio,
            1.0,
            2.0,
            "",
        );
        check::within(
            errs,
            &f("grid.max_cell_m"),
            self.grid.max_cell_m,
            1e-3,
            0.5,
            "m",
        );
        if self.grid.max_cell_m < self.grid.surface_cell_m {
            errs.push(
                f("grid.max_cell_m"),
                crate::physics::error::InputErrorKind::NotCovered(
                    "the largest cell must not be smaller than the first".into(),
                ),
            );
        }
        check::within(
            errs,
            &f("sample_every_s"),
            self.sample_every_s,
            1.0,
            86_400.0,
            "s",
        );
        if self.duration_s.is_finite() && self.step_s.is_finite() && self.step_s > 0.0 {
            let steps = self.duration_s / self.step_s;
            if steps > 2.0e6 {
                errs.push(
                    f("step_s"),
                    crate::physics::error::InputErrorKind::NotCovered(format!(
                        "{steps:.0} steps: at most 2 000 000 are run"
                    )),
                );
            }
        }
    }
}

/// One kept instant.
#[derive(Debug, Clone, PartialEq)]
pub struct NightSample {
    pub time_s: f64,
    pub interior_c: f64,
    /// Warmest snow surface, °C.
    pub warmest_snow_surface_c: f64,
    /// Snow melting now, kg/h.
    pub melt_kg_h: f64,
    /// Heat conducted into walls, roof and floor now, W.
    pub into_walls_w: f64,
    /// Air exchange loss now, W.
    pub air_loss_w: f64,
    /// CO₂ inside, ppm: well mixed, starting at the outdoor level
    /// ([`super::steady::OUTDOOR_CO2_PPM`]), V dC/dt = G − V̇ (C − C_o) by backward Euler.
    pub co2_ppm: f64,
    /// Inner surface temperature of each zone, °C, in the order of
    /// [`NightResult::zone_names`].
    pub surfaces_c: Vec<f64>,
    /// Cell temperatures of the main wall (zone 0: the dome, the pile's crown band, the
    /// cave's exposed face or else its walls, the trench's roof), °C, at
    /// [`NightResult::main_wall_positions_m`].
    pub main_wall_c: Vec<f64>,
}

/// Energy over the run, J.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct NightLedger {
    pub stored_change_j: f64,
    pub given_off_j: f64,
    pub air_exchange_j: f64,
    pub to_sinks_j: f64,
    pub melt_j: f64,
    /// stored change − (given off − air exchange − to sinks − melt).
    pub imbalance_j: f64,
}

/// A zone's temperatures at the end.
#[derive(Debug, Clone, PartialEq)]
pub struct ZoneProfile {
    pub name: String,
    /// Cell centres: radius for a sphere, depth from the inner face for a plane, m.
    pub positions_m: Vec<f64>,
    pub temperatures_c: Vec<f64>,
}

/// The night.
#[derive(Debug, Clone, PartialEq)]
pub struct NightResult {
    pub samples: Vec<NightSample>,
    /// The steady interior temperature (the same shelter and conditions, deep snow infinite).
    pub steady_interior_c: f64,
    /// First time the air reaches `air_start + share × (steady − air_start)`, s; `None` if
    /// not within the run or if the steady state is no warmer than the start.
    pub warmup_time_s: Option<f64>,
    /// First time the air reaches the target, s.
    pub target_time_s: Option<f64>,
    pub melted_kg: f64,
    pub ledger: NightLedger,
    pub profiles: Vec<ZoneProfile>,
    /// Names of the zones, in the order of [`NightSample::surfaces_c`].
    pub zone_names: Vec<String>,
    /// Cell centres of the main wall, m (radius for a sphere, depth for a plane).
    pub main_wall_positions_m: Vec<f64>,
    /// Highest temperature any snow cell reached, °C (never above 0).
    pub warmest_snow_cell_c: f64,
    pub warnings: Vec<Warning>,
}

/// Run the night.
pub fn night(
    shelter: &Shelter,
    conditions: &Conditions,
    settings: &NightSettings,
) -> Result<NightResult, ShelterError> {
    let mut errs = InputErrors::default();
    settings.validate(NIGHT_FIELD, &mut errs);
    let (model, warnings) = match Model::build(shelter, conditions) {
        Ok(m) => m,
        Err(ShelterError::Input(mut e)) => {
            e.0.extend(errs.0);
            return Err(ShelterError::Input(e));
        }
        Err(e) => return Err(e),
    };
    errs.into_result()?;
    let lining = if settings.lining {
        model.lining_m2k_w
    } else {
        0.0
    };
    let steady_interior_c = steady::interior_c(&model, lining)?;
    run(&model, settings, lining, steady_interior_c, warnings)
}

fn run(
    model: &Model,
    s: &NightSettings,
    lining: f64,
    steady_interior_c: f64,
    warnings: Vec<Warning>,
) -> Result<NightResult, ShelterError> {
    let mut walls = Vec::with_capacity(model.zones.len());
    let mut r_in = Vec::with_capacity(model.zones.len());
    for zone in &model.zones {
        let a = zone.conductivity_w_m_k / zone.heat_capacity_j_m3_k;
        let deep = (10.0 * (a * s.duration_s).sqrt()).max(0.5);
        let (geometry, inner, outer) = match zone.geometry {
            Geometry::Sphere {
                solid_angle_sr,
                inner_radius_m,
                outer_radius_m,
            } => (
                WallGeometry::Sphere { solid_angle_sr },
                inner_radius_m,
                outer_radius_m.min(inner_radius_m + deep),
            ),
            Geometry::Plane {
                area_m2,
                thickness_m,
            } => (WallGeometry::Plane { area_m2 }, 0.0, thickness_m),
        };
        let (film, sink_c) = match zone.sink {
            Sink::OutsideAir { film_w_m2k } => (Some(film_w_m2k), model.outside_c),
            Sink::Deep { temperature_c } => (None, temperature_c),
        };
        let start = if zone.melts { s.snow_start_c } else { sink_c };
        walls.push(RadialWall::new(
            geometry,
            inner,
            outer,
            zone.conductivity_w_m_k,
            zone.heat_capacity_j_m3_k,
            &s.grid,
            sink_c,
            film,
            start,
        ));
        r_in.push(zone.inner_resistance_k_w(model.inside_film_w_m2k, lining));
    }
    let cells: usize = walls.iter().map(|w| w.cells()).sum();
    let steps_wanted = (s.duration_s / s.step_s).ceil().max(1.0);
    if cells as f64 * steps_wanted > MAX_CELL_STEPS {
        let mut e = InputErrors::default();
        e.push(
            format!("{NIGHT_FIELD}.grid.surface_cell_m"),
            crate::physics::error::InputErrorKind::NotCovered(format!(
                "{cells} cells over {steps_wanted:.0} steps is more work than the {MAX_CELL_STEPS:.0e} cell-steps a night may take: use coarser cells or longer steps"
            )),
        );
        return Err(e.into());
    }
    let c_air = super::model::air_density_kg_m3(s.air_start_c)
        * AIR_SPECIFIC_HEAT_J_PER_KG_K
        * model.air_volume_m3;
    let steps = (s.duration_s / s.step_s).ceil().max(1.0) as usize;
    let dt = s.duration_s / steps as f64;
    let stored = |walls: &[RadialWall], t_air: f64| -> f64 {
        walls.iter().map(|w| w.stored_energy_j()).sum::<f64>() + c_air * t_air
    };
    let mut t_air = s.air_start_c;
    let start_energy = stored(&walls, t_air);
    let mut ledger = NightLedger::default();
    let mut response = vec![(0.0, 0.0); walls.len()];
    let mut surface = vec![0.0; walls.len()];
    let mut samples = Vec::new();
    let mut warmest_cell = walls
        .iter()
        .zip(&model.zones)
        .filter(|(_, z)| z.melts)
        .flat_map(|(w, _)| w.temperature_c.iter().copied())
        .fold(f64::NEG_INFINITY, f64::max);
    let rise_to = s.air_start_c + s.warmup_share * (steady_interior_c - s.air_start_c);
    let mut warmup_time_s = None;
    let mut target_time_s = s.target_c.filter(|&t| t <= s.air_start_c).map(|_| 0.0);
    let gains = model.gains.total_w;
    let zones = &model.zones;
    // Surface temperature of zone z at interior t (with the melt limit).
    let surface_at = |z: usize, t: f64, resp: &[(f64, f64)]| -> f64 {
        let (a, b) = resp[z];
        let ts = (t / r_in[z] - a) / (1.0 / r_in[z] + b);
        if zones[z].melts {
            ts.min(0.0)
        } else {
            ts
        }
    };
    let mut next_sample = 0.0;
    let mut co2 = steady::OUTDOOR_CO2_PPM;
    #[allow(clippy::too_many_arguments)]
    let push_sample = |samples: &mut Vec<NightSample>,
                       time_s: f64,
                       t_air: f64,
                       surface: &[f64],
                       melt_w: f64,
                       into_w: f64,
                       co2_ppm: f64,
                       main: &RadialWall| {
        let (v, d) = model.air_loss_w(t_air);
        let warmest = surface
            .iter()
            .zip(zones)
            .filter(|(_, z)| z.melts)
            .map(|(t, _)| *t)
            .fold(f64::NEG_INFINITY, f64::max);
        samples.push(NightSample {
            time_s,
            interior_c: t_air,
            warmest_snow_surface_c: warmest,
            melt_kg_h: melt_w / LATENT_HEAT_FUSION_J_PER_KG * 3600.0,
            into_walls_w: into_w,
            air_loss_w: v + d,
            co2_ppm,
            surfaces_c: surface.to_vec(),
            main_wall_c: main.temperature_c.clone(),
        });
    };
    for (z, w) in walls.iter().enumerate() {
        surface[z] = w.temperature_c[0];
    }
    push_sample(&mut samples, 0.0, t_air, &surface, 0.0, 0.0, co2, &walls[0]);
    next_sample += s.sample_every_s;
    for step in 1..=steps {
        for (z, w) in walls.iter_mut().enumerate() {
            response[z] = w.surface_response(dt);
        }
        let t_old = t_air;
        let net = |t: f64| -> f64 {
            let (v, d) = model.air_loss_w(t);
            let films: f64 = (0..zones.len())
                .map(|z| (t - surface_at(z, t, &response)) / r_in[z])
                .sum();
            gains - v - d - films - c_air * (t - t_old) / dt
        };
        let lo = walls
            .iter()
            .flat_map(|w| w.temperature_c.iter().copied().chain([w.sink_c]))
            .fold(t_old.min(model.outside_c), f64::min)
            - 1.0;
        let mut hi = lo + 10.0;
        let mut expansions = 0;
        while net(hi) > 0.0 {
            hi = lo + 2.0 * (hi - lo);
            expansions += 1;
            if expansions > 60 {
                return Err(ShelterError::NoConvergence {
                    quantity: "interior temperature in the night",
                    detail: format!("no upper bracket at step {step}"),
                });
            }
        }
        t_air = steady::bisect_decreasing(net, lo, hi, "interior temperature in the night")?;
        let (mut melt_w, mut into_w) = (0.0, 0.0);
        for z in 0..walls.len() {
            surface[z] = surface_at(z, t_air, &response);
            let q_in = (t_air - surface[z]) / r_in[z];
            let conducted = walls[z].finish_step(surface[z]);
            into_w += conducted;
            if zones[z].melts {
                melt_w += q_in - conducted;
            }
            ledger.to_sinks_j += walls[z].outer_loss_w() * dt;
        }
        let (v, d) = model.air_loss_w(t_air);
        let flow = model.vent_flow_m3_s(t_air) + model.door_flow_m3_s(t_air);
        let volume = model.air_volume_m3;
        co2 = (volume * co2 / dt + 1e6 * model.co2_source_m3_s + flow * steady::OUTDOOR_CO2_PPM)
            / (volume / dt + flow);
        ledger.given_off_j += gains * dt;
        ledger.air_exchange_j += (v + d) * dt;
        ledger.melt_j += melt_w * dt;
        for (w, zone) in walls.iter().zip(zones) {
            if zone.melts {
                for &t in &w.temperature_c {
                    warmest_cell = warmest_cell.max(t);
                }
            }
        }
        let time = step as f64 * dt;
        let crossing = |level: f64| -> Option<f64> {
            let (a, b) = (t_old - level, t_air - level);
            (a < 0.0 && b >= 0.0).then(|| time - dt * b / (b - a))
        };
        if warmup_time_s.is_none() && steady_interior_c > s.air_start_c {
            warmup_time_s = crossing(rise_to);
        }
        if target_time_s.is_none() {
            if let Some(target) = s.target_c {
                target_time_s = crossing(target);
            }
        }
        if time + 1e-9 >= next_sample || step == steps {
            push_sample(
                &mut samples,
                time,
                t_air,
                &surface,
                melt_w,
                into_w,
                co2,
                &walls[0],
            );
            while next_sample <= time + 1e-9 {
                next_sample += s.sample_every_s;
            }
        }
    }
    ledger.stored_change_j = stored(&walls, t_air) - start_energy;
    ledger.imbalance_j = ledger.stored_change_j
        - (ledger.given_off_j - ledger.air_exchange_j - ledger.to_sinks_j - ledger.melt_j);
    let profiles = walls
        .iter()
        .zip(zones)
        .map(|(w, z)| ZoneProfile {
            name: z.name.clone(),
            positions_m: w.centres_m(),
            temperatures_c: w.temperature_c.clone(),
        })
        .collect();
    Ok(NightResult {
        samples,
        steady_interior_c,
        warmup_time_s,
        target_time_s,
        melted_kg: ledger.melt_j / LATENT_HEAT_FUSION_J_PER_KG,
        ledger,
        profiles,
        zone_names: zones.iter().map(|z| z.name.clone()).collect(),
        main_wall_positions_m: walls[0].centres_m(),
        warmest_snow_cell_c: warmest_cell,
        warnings,
    })
}
