//! The closed-form reference cases, each defined once, and every solver of the tool that can
//! pose it:
//!
//! - the column: the 1D transient enthalpy solver (`transient::Solver`);
//! - the plane: the 2D solver (`edge2d::Plane`) under laterally uniform conditions, no
//!   building, three columns of unequal width, the middle one read;
//! - the edge section's far column (`edge2d::EdgeRun`), far from the building;
//! - the shelter wall: the column of finite volumes through one zone of a shelter that the
//!   night model steps (`shelter::RadialWall`, plane geometry; constant properties, no phase
//!   change, so it poses only the cases without freezing);
//! - the steady solver (`steady::solve`), for the steady stack.
//!
//! The cases:
//!
//! - freezing of a half-space from a held surface: Neumann's two-phase solution (Carslaw &
//!   Jaeger 1959, Conduction of Heat in Solids, §11.2) and, with the ground at the freezing
//!   point, the one-phase Stefan problem (Crank 1984, Free and Moving Boundary Problems,
//!   §1.3);
//! - the periodic surface wave: amplitude A e^{−z/d} and lag z/d, d = √(2a/ω) (Carslaw &
//!   Jaeger 1959 §2.6);
//! - the layered steady stack: layers and films in series, q = ΔT / (Σ 1/h + Σ dᵢ/kᵢ) and
//!   each interface at T_top − q·(resistance above) (Incropera & DeWitt, Fundamentals of
//!   Heat and Mass Transfer, §3.1).
//!
//! Each solver returns what it measured; the tests in `tests/closed_form.rs` hold it to the
//! closed form with a tolerance argued for that solver and grid.

use crate::common::*;

use hibernal::physics::analytic::{self, NeumannProblem, PeriodicSurface};
use hibernal::physics::edge2d::demo::design_winter_section;
use hibernal::physics::edge2d::{EdgeRun, Outside, Plane, SoilBand, StartTemperature, TopFace};
use hibernal::physics::materials::{Board, Material, MaterialSpec, SnowRegression};
use hibernal::physics::shelter::{RadialWall, WallGeometry};
use hibernal::physics::stack::{Boundary, Stack};
use hibernal::physics::steady;
use hibernal::physics::transient::grid::GridSpec;
use hibernal::physics::transient::phase::Phase;
use hibernal::physics::transient::setup::Forcing;
use hibernal::physics::transient::{cells_for, BottomCondition, Cell, Solver, TopCondition};
use std::f64::consts::PI;

pub const DAY: f64 = 86_400.0;
pub const YEAR: f64 = 365.0 * DAY;

/// Widths of the plane's three columns, m: unequal, so that a lateral coupling would show.
const PLANE_WIDTHS: [f64; 3] = [0.3, 0.7, 2.0];
/// The plane's column that is read.
const PLANE_READ: usize = 1;

/// The plane over the column's cells: the same z faces, three columns, one top group.
fn plane_over(cells: &[Cell], initial_c: impl Fn(f64) -> f64) -> Plane {
    let mut z_faces: Vec<f64> = cells.iter().map(|c| c.top_m).collect();
    let last = cells.last().unwrap();
    z_faces.push(last.top_m + last.dz_m);
    let mut x_faces = vec![0.0];
    for w in PLANE_WIDTHS {
        x_faces.push(x_faces.last().unwrap() + w);
    }
    let nx = PLANE_WIDTHS.len();
    let phases: Vec<Phase> = cells
        .iter()
        .flat_map(|c| std::iter::repeat(c.phase).take(nx))
        .collect();
    Plane::new(x_faces, z_faces, phases, vec![0; nx], 1, initial_c)
}

fn plane_width() -> f64 {
    PLANE_WIDTHS.iter().sum()
}

fn plane_column(p: &Plane, i: usize) -> Vec<f64> {
    (0..p.nz).map(|j| p.temperature[j * p.nx + i]).collect()
}

/// The solvers, for the tables the tests print.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Posed {
    Column,
    Plane,
    EdgeFarColumn,
    ShelterWall,
    Steady,
}

// ------------------------------------------------------------------ freezing half-space

/// Freezing of a half-space at `initial_c` from a surface held at `surface_c` from t = 0.
#[derive(Debug, Clone, Copy)]
pub struct Freezing {
    pub name: &'static str,
    pub problem: NeumannProblem,
    /// Depth of the column posed, m (the bottom held at the initial temperature).
    pub depth_m: f64,
    /// Days at which the front is compared.
    pub days: &'static [f64],
}

impl Freezing {
    /// The front depth of the closed form, m: Neumann's two-phase solution, or for ground
    /// at the freezing point the one-phase root λ e^{λ²} erf λ = Ste/√π, X = 2λ√(a_f t).
    pub fn exact_front_m(&self, t_s: f64) -> f64 {
        let p = &self.problem;
        if p.initial_c == p.freezing_c {
            let ste = p.c_frozen_j_m3k * (p.freezing_c - p.surface_c) / p.latent_j_m3;
            let lambda = analytic::one_phase_lambda(ste).unwrap();
            2.0 * lambda * (p.k_frozen / p.c_frozen_j_m3k * t_s).sqrt()
        } else {
            p.solve().unwrap().front_depth_m(t_s)
        }
    }

    /// The column's cells: uniform, `cell_m` thick.
    fn cells(&self, cell_m: f64) -> Vec<Cell> {
        cells_for(
            &[self.depth_m],
            &[self.material()],
            &GridSpec::uniform(cell_m),
            &[None],
        )
    }

    /// A material with the problem's constant properties, freezing at 0 °C.
    pub fn material(&self) -> Material {
        let p = &self.problem;
        assert_eq!(p.freezing_c, 0.0, "the tool's materials freeze at 0 °C");
        material(
            p.k_frozen,
            p.k_unfrozen,
            p.c_frozen_j_m3k,
            p.c_unfrozen_j_m3k,
            p.latent_j_m3,
        )
    }
}

/// The published soil example (Lunardini 1981, after Jumikis 1966): −10 °C over +2 °C;
/// front ≈ 1.36 m after 60 days.
pub fn neumann_soil() -> Freezing {
    Freezing {
        name: "Neumann, soil",
        problem: lunardini_soil(),
        depth_m: 8.0,
        days: &[30.0, 60.0],
    }
}

/// Water at +4 °C under a −10 °C surface: ice k 2.2, water k 0.556 W/m/K, C = ρc of ice
/// (916.7 kg/m³ × 2097 J/kg/K) and of water (999.8 × 4219), L = ρ_ice × 333.4 kJ/kg
/// (IAPWS values, from memory).
pub fn neumann_water() -> Freezing {
    Freezing {
        name: "Neumann, water to ice",
        problem: NeumannProblem {
            surface_c: -10.0,
            initial_c: 4.0,
            freezing_c: 0.0,
            k_frozen: 2.2,
            k_unfrozen: 0.556,
            c_frozen_j_m3k: 916.7 * 2097.0,
            c_unfrozen_j_m3k: 999.8 * 4219.0,
            latent_j_m3: 916.7 * 333.4e3,
        },
        depth_m: 3.0,
        days: &[30.0],
    }
}

/// The published soil with the ground at the freezing point: the one-phase Stefan problem.
pub fn stefan_one_phase() -> Freezing {
    let mut problem = lunardini_soil();
    problem.initial_c = 0.0;
    Freezing {
        name: "Stefan, one phase",
        problem,
        depth_m: 4.0,
        days: &[60.0],
    }
}

/// The column: uniform cells of `cell_m`, steps of `step_s`, the bottom held at the
/// initial temperature. Returns the front at each of the case's days and the Newton passes
/// per step.
pub fn column_fronts(case: &Freezing, cell_m: f64, step_s: f64) -> (Vec<f64>, f64) {
    let p = &case.problem;
    let mut s = Solver::new(case.cells(cell_m), p.initial_c);
    let top = TopCondition::Surface {
        surface_c: p.surface_c,
    };
    let bottom = BottomCondition::Temperature {
        temperature_c: p.initial_c,
    };
    let mut fronts = Vec::new();
    for &day in case.days {
        while s.time_s < day * DAY - 1.0 {
            s.step(step_s, &top, &bottom).unwrap();
        }
        fronts.push(s.fronts().frost_depth_m);
    }
    (fronts, s.work.iterations as f64 / s.work.steps as f64)
}

/// The plane over the column's cells (uniform `cell_m`), the surface held, read in its
/// middle column; also the largest difference between its columns' fronts, m.
pub fn plane_fronts(case: &Freezing, cell_m: f64, step_s: f64) -> (Vec<f64>, f64) {
    let p = &case.problem;
    let mut plane = plane_over(&case.cells(cell_m), |_| p.initial_c);
    let tops = [TopFace::Held {
        surface_c: p.surface_c,
    }];
    let bottom = BottomCondition::Temperature {
        temperature_c: p.initial_c,
    };
    let mut fronts = Vec::new();
    let mut spread: f64 = 0.0;
    for &day in case.days {
        while plane.time_s < day * DAY - 1.0 {
            plane.step(step_s, &tops, &bottom).unwrap();
        }
        let all: Vec<f64> = (0..plane.nx)
            .map(|i| plane.column_frost_depth_m(i, 0).unwrap_or(0.0))
            .collect();
        for f in &all {
            spread = spread.max((f - all[PLANE_READ]).abs());
        }
        fronts.push(all[PLANE_READ]);
    }
    (fronts, spread)
}

/// A constant air temperature.
struct Constant(f64);
impl Forcing for Constant {
    fn air_c(&self, _t: f64) -> f64 {
        self.0
    }
}

/// The edge section of the demo, its soil replaced by the case's over 12 m, 15 m of ground
/// outside, the surface at n × air with n = 1 and the air at the surface temperature: its
/// far column, read after each of the case's days, on the section's own grid (2.5 cm cells
/// at the surface growing to 60 cm).
pub fn edge_far_fronts(case: &Freezing) -> Vec<f64> {
    let p = &case.problem;
    let mut s = design_winter_section();
    s.soil = vec![SoilBand {
        thickness_m: 12.0,
        material: case.material(),
        curve: None,
    }];
    s.depth_m = 12.0;
    s.outside_extent_m = 15.0;
    s.outside = Outside::NFactor {
        freezing: 1.0,
        thawing: 1.0,
    };
    s.bottom = BottomCondition::Temperature {
        temperature_c: p.initial_c,
    };
    s.start = StartTemperature {
        surface_c: p.initial_c,
        gradient_k_m: 0.0,
    };
    let last = case.days.iter().cloned().fold(0.0, f64::max);
    s.duration_s = last * DAY;
    let mut run = EdgeRun::new(&s, "edge").unwrap();
    run.advance(&Constant(p.surface_c), usize::MAX).unwrap();
    let r = run.finish();
    case.days
        .iter()
        .map(|&d| r.records[d as usize - 1].far_frost_depth_m)
        .collect()
}

// ------------------------------------------------------------------------ periodic wave

/// A half-space of constant k and C, no phase change, its surface held at A sin ωt from a
/// uniform start at 0 °C; the wave is read over the last of `years` years, at the cells
/// nearest each probe depth (in damping depths).
#[derive(Debug, Clone, Copy)]
pub struct Wave {
    pub k: f64,
    pub c: f64,
    pub amplitude_k: f64,
    pub period_s: f64,
    pub probes_d: &'static [f64],
    pub years: f64,
    pub step_s: f64,
    pub grid: GridSpec,
}

/// The annual wave in a soil of k 1.5 W/m/K, C 2.0e6 J/m³K (d = 2.74 m), 10 K at the surface,
/// read at one and two damping depths in the fourth year; cells 2 cm at the surface growing
/// 2 % to 20 cm, 6-hour steps, the column 12 d deep (so the wave reaching its base is
/// e^{−12} of the surface's).
pub fn annual_wave() -> Wave {
    Wave {
        k: 1.5,
        c: 2.0e6,
        amplitude_k: 10.0,
        period_s: YEAR,
        probes_d: &[1.0, 2.0],
        years: 4.0,
        step_s: 6.0 * 3600.0,
        grid: GridSpec {
            surface_cell_m: 0.02,
            growth_ratio: 1.02,
            max_cell_m: 0.2,
        },
    }
}

/// What a solver measured at one probe: the cell centre's depth, the fitted amplitude and
/// the lag behind the surface.
#[derive(Debug, Clone, Copy)]
pub struct WaveReading {
    pub depth_m: f64,
    pub amplitude_k: f64,
    pub lag_rad: f64,
}

impl Wave {
    pub fn closed(&self) -> PeriodicSurface {
        PeriodicSurface {
            mean_c: 0.0,
            amplitude_k: self.amplitude_k,
            period_s: self.period_s,
            diffusivity_m2_s: self.k / self.c,
            phase_rad: 0.0,
        }
    }
    fn omega(&self) -> f64 {
        2.0 * PI / self.period_s
    }
    fn depth_m(&self) -> f64 {
        12.0 * self.closed().damping_depth_m()
    }
    fn surface_c(&self, t: f64) -> f64 {
        self.amplitude_k * (self.omega() * t).sin()
    }
    fn cells(&self) -> Vec<Cell> {
        let m = material(self.k, self.k, self.c, self.c, 0.0);
        cells_for(&[self.depth_m()], &[m], &self.grid, &[None])
    }
    /// The cell whose span holds each probe depth.
    fn probe_cells(&self, centres: &[f64], faces_below: &[f64]) -> Vec<usize> {
        let d = self.closed().damping_depth_m();
        self.probes_d
            .iter()
            .map(|m| faces_below.iter().position(|&b| b > m * d).unwrap())
            .inspect(|&i| assert!(centres[i] > 0.0))
            .collect()
    }
    /// Fit A_z sin(ωt − φ) to the samples of the last year by projection on sin and cos.
    fn fit(&self, depth_m: f64, hist: &[(f64, f64)]) -> WaveReading {
        let w = self.omega();
        let (mut ss, mut cc) = (0.0, 0.0);
        for &(t, v) in hist {
            ss += v * (w * t).sin();
            cc += v * (w * t).cos();
        }
        let n = hist.len() as f64;
        let (ss, cc) = (2.0 * ss / n, 2.0 * cc / n);
        WaveReading {
            depth_m,
            amplitude_k: (ss * ss + cc * cc).sqrt(),
            lag_rad: (-cc).atan2(ss),
        }
    }
    /// Step any solver: `step(t_end, surface)` advances it to t_end and returns its cell
    /// temperatures.
    fn drive(
        &self,
        centres: &[f64],
        probes: &[usize],
        mut step: impl FnMut(f64, f64) -> Vec<f64>,
    ) -> Vec<WaveReading> {
        let mut hist: Vec<Vec<(f64, f64)>> = vec![Vec::new(); probes.len()];
        let n = (self.years * self.period_s / self.step_s).round() as usize;
        let last_year = n - (self.period_s / self.step_s).round() as usize;
        for k in 1..=n {
            let t = k as f64 * self.step_s;
            let temps = step(t, self.surface_c(t));
            if k > last_year {
                for (j, &i) in probes.iter().enumerate() {
                    hist[j].push((t, temps[i]));
                }
            }
        }
        probes
            .iter()
            .zip(&hist)
            .map(|(&i, h)| self.fit(centres[i], h))
            .collect()
    }
}

/// The column, an insulated base (the wave there is e^{−12} of the surface's).
pub fn column_wave(w: &Wave) -> Vec<WaveReading> {
    let cells = w.cells();
    let centres: Vec<f64> = cells.iter().map(|c| c.center_m()).collect();
    let below: Vec<f64> = cells.iter().map(|c| c.top_m + c.dz_m).collect();
    let probes = w.probe_cells(&centres, &below);
    let mut s = Solver::new(cells, 0.0);
    let bottom = BottomCondition::Flux { upward_w_m2: 0.0 };
    w.drive(&centres, &probes, |_, surface_c| {
        s.step(w.step_s, &TopCondition::Surface { surface_c }, &bottom)
            .unwrap();
        s.temperature.clone()
    })
}

/// The plane over the column's cells, its middle column read.
pub fn plane_wave(w: &Wave) -> Vec<WaveReading> {
    let cells = w.cells();
    let centres: Vec<f64> = cells.iter().map(|c| c.center_m()).collect();
    let below: Vec<f64> = cells.iter().map(|c| c.top_m + c.dz_m).collect();
    let probes = w.probe_cells(&centres, &below);
    let mut p = plane_over(&cells, |_| 0.0);
    let bottom = BottomCondition::Flux { upward_w_m2: 0.0 };
    w.drive(&centres, &probes, |_, surface_c| {
        p.step(w.step_s, &[TopFace::Held { surface_c }], &bottom)
            .unwrap();
        plane_column(&p, PLANE_READ)
    })
}

/// The shelter wall (plane geometry) on the same grid, its inner surface held at the wave
/// and its far face held at 0 °C (the wave there is e^{−12} of the surface's).
pub fn shelter_wall_wave(w: &Wave) -> Vec<WaveReading> {
    let mut wall = RadialWall::new(
        WallGeometry::Plane { area_m2: 1.0 },
        0.0,
        w.depth_m(),
        w.k,
        w.c,
        &w.grid,
        0.0,
        None,
        0.0,
    );
    let centres = wall.centres_m();
    let below = wall.faces_m[1..].to_vec();
    let probes = w.probe_cells(&centres, &below);
    w.drive(&centres, &probes, |_, surface_c| {
        wall.step_surface_held(surface_c, w.step_s);
        wall.temperature_c.clone()
    })
}

// ----------------------------------------------------------------------- steady stack

/// Layers in series between two faces, each of constant k (as its source gives it).
#[derive(Debug, Clone)]
pub struct SeriesStack {
    pub name: &'static str,
    /// Thickness, the material as the tool takes it, and its conductivity as the source
    /// gives it, W/m/K.
    pub layers: Vec<(f64, MaterialSpec, f64)>,
    pub top: Boundary,
    pub bottom: Boundary,
}

/// What a solver measured: the heat flux (downwards positive, W/m²) and the temperature of
/// every face from the top surface to the bottom surface, °C.
#[derive(Debug, Clone)]
pub struct StackReading {
    pub flux_w_m2: f64,
    pub faces_c: Vec<f64>,
}

/// Snow (Sturm et al. 1997 quadratic at 0.3 g/cm³: 0.138 − 1.01·0.3 + 3.233·0.09 =
/// 0.126 W/m/K, the published check value), extruded polystyrene (0.029 W/m/K) and
/// concrete (1.7 W/m/K), the board and concrete values of the tool's table (common practice,
/// no source).
fn snow_board_concrete() -> Vec<(f64, MaterialSpec, f64)> {
    vec![
        (
            0.30,
            MaterialSpec::Snow {
                density_kg_m3: 300.0,
                regression: SnowRegression::Sturm1997Quadratic,
            },
            0.138 - 1.01 * 0.3 + 3.233 * 0.09,
        ),
        (
            0.05,
            MaterialSpec::Insulation {
                board: Board::ExtrudedPolystyrene,
                conductivity_w_m_k: None,
                moisture_derating_pct: 0.0,
            },
            0.029,
        ),
        (
            0.10,
            MaterialSpec::Concrete {
                conductivity_w_m_k: None,
            },
            1.7,
        ),
    ]
}

/// Three layers under air at −30 °C (film 25 W/m²K) over air at −2 °C (film 8 W/m²K).
pub fn three_layers_two_films() -> SeriesStack {
    SeriesStack {
        name: "three layers, two films",
        layers: snow_board_concrete(),
        top: Boundary::Air {
            temperature_c: -30.0,
            film_w_m2k: 25.0,
        },
        bottom: Boundary::Air {
            temperature_c: -2.0,
            film_w_m2k: 8.0,
        },
    }
}

/// The same layers over a base held at −2 °C (a bottom the transient solvers can hold).
pub fn three_layers_held_base() -> SeriesStack {
    SeriesStack {
        name: "three layers, held base",
        bottom: Boundary::Surface {
            temperature_c: -2.0,
        },
        ..three_layers_two_films()
    }
}

/// A snow wall: 0.4 m of the same snow, outside air at −20 °C through a film of 10 W/m²K,
/// the inside surface held at 0 °C (the melt limit of a shelter's wall).
pub fn snow_wall() -> SeriesStack {
    SeriesStack {
        name: "snow wall",
        layers: vec![(
            0.40,
            MaterialSpec::Snow {
                density_kg_m3: 300.0,
                regression: SnowRegression::Sturm1997Quadratic,
            },
            0.138 - 1.01 * 0.3 + 3.233 * 0.09,
        )],
        top: Boundary::Air {
            temperature_c: -20.0,
            film_w_m2k: 10.0,
        },
        bottom: Boundary::Surface { temperature_c: 0.0 },
    }
}

fn film(b: &Boundary) -> f64 {
    match *b {
        Boundary::Air { film_w_m2k, .. } => 1.0 / film_w_m2k,
        Boundary::Surface { .. } => 0.0,
    }
}

fn boundary_c(b: &Boundary) -> f64 {
    match *b {
        Boundary::Air { temperature_c, .. } | Boundary::Surface { temperature_c } => temperature_c,
    }
}

impl SeriesStack {
    pub fn stack(&self) -> Stack {
        Stack {
            layers: self
                .layers
                .iter()
                .map(|(d, m, _)| layer(*d, m.clone()))
                .collect(),
            top: self.top,
            bottom: self.bottom,
        }
    }

    /// Total resistance face to face, m²K/W.
    pub fn r_total(&self) -> f64 {
        film(&self.top) + self.layers.iter().map(|l| l.0 / l.2).sum::<f64>() + film(&self.bottom)
    }

    /// The series formula: flux and every face temperature.
    pub fn exact(&self) -> StackReading {
        let (t_top, t_bottom) = (boundary_c(&self.top), boundary_c(&self.bottom));
        let q = (t_top - t_bottom) / self.r_total();
        let mut r = film(&self.top);
        let mut faces_c = vec![t_top - q * r];
        for l in &self.layers {
            r += l.0 / l.2;
            faces_c.push(t_top - q * r);
        }
        StackReading {
            flux_w_m2: q,
            faces_c,
        }
    }

    /// The materials as the tool resolves them; each layer's conductivity checked against
    /// the source's, so that the closed form and the solvers speak of the same stack.
    pub fn materials(&self) -> Vec<Material> {
        let resolved = self.stack().resolve().unwrap();
        for (m, l) in resolved.materials.iter().zip(&self.layers) {
            assert_rel(m.conductivity.frozen.k(-5.0), l.2, 1e-12, "layer k");
            assert_rel(m.conductivity.unfrozen.k(5.0), l.2, 1e-12, "layer k");
        }
        resolved.materials
    }

    fn top_condition(&self) -> TopCondition {
        match self.top {
            Boundary::Air {
                temperature_c,
                film_w_m2k,
            } => TopCondition::Air {
                air_c: temperature_c,
                film_w_m2k,
                extra_resistance_m2k_w: 0.0,
            },
            Boundary::Surface { temperature_c } => TopCondition::Surface {
                surface_c: temperature_c,
            },
        }
    }

    /// The transient solvers hold their base; a film under the base they cannot pose.
    fn held_base(&self) -> Option<BottomCondition> {
        match self.bottom {
            Boundary::Surface { temperature_c } => {
                Some(BottomCondition::Temperature { temperature_c })
            }
            Boundary::Air { .. } => None,
        }
    }

    /// Face temperatures from a column of cell temperatures in steady state: the top
    /// surface from the film, each interface by weighting its two half-cells by their
    /// conductances (exact for the piecewise linear steady profile), the base as held.
    fn faces_from_cells(&self, cells: &[Cell], temps: &[f64], q: f64) -> Vec<f64> {
        let ks: Vec<f64> = self.layers.iter().map(|l| l.2).collect();
        let mut faces = vec![match self.top {
            Boundary::Air { temperature_c, .. } => temperature_c - q * film(&self.top),
            Boundary::Surface { temperature_c } => temperature_c,
        }];
        for i in 1..cells.len() {
            if cells[i].layer != cells[i - 1].layer {
                let g1 = ks[cells[i - 1].layer] / (0.5 * cells[i - 1].dz_m);
                let g2 = ks[cells[i].layer] / (0.5 * cells[i].dz_m);
                faces.push((g1 * temps[i - 1] + g2 * temps[i]) / (g1 + g2));
            }
        }
        faces.push(boundary_c(&self.bottom));
        faces
    }

    fn column_cells(&self) -> Vec<Cell> {
        let d: Vec<f64> = self.layers.iter().map(|l| l.0).collect();
        cells_for(
            &d,
            &self.materials(),
            &GridSpec {
                surface_cell_m: 0.005,
                growth_ratio: 1.1,
                max_cell_m: 0.02,
            },
            &vec![None; d.len()],
        )
    }
}

/// Steps of 10 days, 200 of them, to reach steady state: the stack's slowest mode has a
/// time constant of about R C ≈ 4 m²K/W × 4e5 J/m²K ≈ 19 days, and backward Euler damps
/// it by 1/(1 + Δt/τ) ≥ 1.5 a step, so 200 steps leave 1.5^−200 ≈ 1e-35 of the start.
const TO_STEADY: (f64, usize) = (10.0 * DAY, 200);

/// The steady solver.
pub fn steady_stack(case: &SeriesStack) -> StackReading {
    let r = steady::solve(&case.stack()).unwrap();
    let mut faces_c = vec![r.layers[0].top_c];
    faces_c.extend(r.layers.iter().map(|l| l.bottom_c));
    StackReading {
        flux_w_m2: r.heat_flux_w_m2,
        faces_c,
    }
}

/// The column under the held conditions until steady; `None` where the base is a film.
pub fn column_stack(case: &SeriesStack) -> Option<StackReading> {
    let bottom = case.held_base()?;
    let cells = case.column_cells();
    let mut s = Solver::new(cells.clone(), boundary_c(&case.bottom));
    for _ in 0..TO_STEADY.1 {
        s.step(TO_STEADY.0, &case.top_condition(), &bottom).unwrap();
    }
    let q = s.last_top_flux_w_m2;
    Some(StackReading {
        flux_w_m2: q,
        faces_c: case.faces_from_cells(&cells, &s.temperature, q),
    })
}

/// The plane over the column's cells until steady, its middle column read; `None` where
/// the base is a film.
pub fn plane_stack(case: &SeriesStack) -> Option<StackReading> {
    let bottom = case.held_base()?;
    let cells = case.column_cells();
    let mut p = plane_over(&cells, |_| boundary_c(&case.bottom));
    let top = match case.top_condition() {
        TopCondition::Air {
            air_c,
            film_w_m2k,
            extra_resistance_m2k_w,
        } => TopFace::Air {
            air_c,
            film_w_m2k,
            extra_resistance_m2k_w,
        },
        TopCondition::Surface { surface_c } => TopFace::Held { surface_c },
    };
    for _ in 0..TO_STEADY.1 {
        p.step(TO_STEADY.0, &[top], &bottom).unwrap();
    }
    let q = p.last_top_w_m[0] / plane_width();
    Some(StackReading {
        flux_w_m2: q,
        faces_c: case.faces_from_cells(&cells, &plane_column(&p, PLANE_READ), q),
    })
}

/// The shelter wall: one layer between the inside surface (the stack's held base) and the
/// outside air (the stack's top film); `None` for a stack it cannot be.
pub fn shelter_wall_stack(case: &SeriesStack) -> Option<StackReading> {
    let (
        Boundary::Air {
            temperature_c: outside_c,
            film_w_m2k,
        },
        Boundary::Surface {
            temperature_c: inside_c,
        },
        [(d, _, k)],
    ) = (case.top, case.bottom, case.layers.as_slice())
    else {
        return None;
    };
    let c = case.materials()[0].c_frozen_j_m3k;
    let mut wall = RadialWall::new(
        WallGeometry::Plane { area_m2: 1.0 },
        0.0,
        *d,
        *k,
        c,
        &GridSpec {
            surface_cell_m: 0.005,
            growth_ratio: 1.1,
            max_cell_m: 0.02,
        },
        outside_c,
        Some(film_w_m2k),
        inside_c,
    );
    let mut into_wall = 0.0;
    for _ in 0..TO_STEADY.1 {
        into_wall = wall.step_surface_held(inside_c, TO_STEADY.0);
    }
    // Heat into the wall at its inside face flows outwards (upwards in the stack).
    let outer_face_c = outside_c + wall.outer_loss_w() / film_w_m2k;
    Some(StackReading {
        flux_w_m2: -into_wall,
        faces_c: vec![outer_face_c, inside_c],
    })
}
