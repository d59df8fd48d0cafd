//! The plane (2D) enthalpy solver on a rectangular grid of cells, per metre of length
//! perpendicular to the plane.
//!
//! Method: the physics of the column solver ([`crate::physics::transient`]) cell by cell, in two
//! dimensions.
//! - Cells (i, j), i along x (columns), j along z (rows, downwards), stored row-major
//!   (index j·nx + i). The unknown of each cell is its volumetric enthalpy H (J/m³), with
//!   T = T(H) from the cell's [`Phase`].
//! - Backward Euler: V (H − Hⁿ)/Δt = Σ faces G (T_neighbour − T) + boundary inflow, with
//!   V = Δx Δz (m³ per m) and G the face conductance per metre, the harmonic mean of the two
//!   half-cells: G = A/(d₁/2k₁ + d₂/2k₂), A the face length (so a material interface on a
//!   face is exact for steady flux; Patankar 1980, Numerical Heat Transfer and Fluid Flow
//!   §4.2-4, from memory).
//! - Newton passes on H with T linearised about the iterate, δT = S δH, S = dT/dH (as in
//!   the column solver, the enthalpy form of Swaminathan & Voller 1992). The Newton system
//!   F + V/Δt δH + A δT = 0 (A the conductance matrix, symmetric positive semi-definite) is
//!   not symmetric in δH. In the unknown δT it is: for a cell with S > 0, δH = δT/S, and its
//!   row is (V/(Δt S)) δT + (A δT) = −F, whose diagonal V/(Δt S) is the cell's apparent heat
//!   capacity over the step; a cell changing phase at one temperature (S = 0) has δT = 0, its
//!   column drops out, and its δH follows from its own row afterwards:
//!   δH = (−F + Σ G δT_neighbour) Δt/V. What remains is symmetric positive definite
//!   (a principal submatrix of A plus a positive diagonal), solved by conjugate gradients
//!   preconditioned with an incomplete Cholesky factorisation without fill (IC(0); Meijerink
//!   & van der Vorst 1977, Math. Comp. 31:148–162, from memory).
//! - The linear solve stops when every cell's linear residual, as an enthalpy error
//!   |r| Δt/V, is below a quarter of the step tolerance or 1e-2 of the present Newton
//!   residual, whichever is larger (an inexact Newton method): the step is judged on the
//!   nonlinear residual of every cell (default 1e-3 J/m³, about 5e-10 K of sensible heat),
//!   so an inexact linear solve costs passes, never accuracy.
//! - A Newton update that crosses a kink of T(H) (either edge of the melting interval; the
//!   top of an unfrozen-water curve's range) stops on the kink, and a cell on a kink takes
//!   half the slope of its sensible side (`clip_at_kink`, `slope_at`: devices of this tool;
//!   without them daily steps on 4 cm cells overshoot by tens of kelvin and split). After
//!   12 passes the update is halved.
//! - Conductances are taken afresh after every pass (a Picard update of k inside the
//!   passes, so they have mostly settled when the residual has); when the residual has
//!   converged they are compared with the state (1e-4 relative) and, if they differ, taken
//!   again and the passes go on, as the column solver does at the end of its step. The
//!   fluxes booked use the same conductances and temperatures as the residual, and each
//!   face's flux is computed once and given to both cells, so the energy ledger (stored
//!   change − boundary heat) closes to round-off plus the residual tolerance
//!   (`tests/edge2d.rs` asserts 1e-9 of the throughput over the design winter).
//! - Each step starts its passes from the state the last step's rate of change predicts
//!   ([`PlaneTolerances::predict`]; only the starting point of the iteration).
//! - A step that does not converge in `max_iterations` passes is split in halves down to
//!   `min_step_fraction` of the requested step; beyond that a typed
//!   [`PlaneError::NoConvergence`] — never a silent wrong answer.
//!
//! Boundaries: each column's top face belongs to a top group (air through a film and a
//! resistance, a held surface, or closed), given per step; the bottom face is held at a
//! temperature or takes a flux; the two vertical sides are adiabatic (planes of symmetry or
//! far from any disturbance).
//!
//! Valid for conduction with phase change: no water or vapour movement, no frost heave.

// Index loops over several parallel arrays of cells read more plainly than zipped iterators.
#![allow(clippy::needless_range_loop)]

use super::axis;
use crate::physics::transient::phase::Phase;
use crate::physics::transient::BottomCondition;

/// Where T(H) has a kink (the edges of the melting interval of a cell that changes phase at
/// one temperature; the top of the freezing range of an unfrozen-water curve), a Newton
/// update that crosses it from `h0` is stopped on it: the linearisation about `h0` holds
/// only up to the kink, and beyond it overshoots (a cell predicted to cool 2 K past 0 °C
/// stops at 0 °C and starts to freeze). The next pass, on the new piece, goes on. A device
/// of this tool (the usual safeguard of enthalpy iterations; no single source).
fn clip_at_kink(phase: &Phase, h0: f64, h1: f64) -> f64 {
    let kinks: [f64; 2] = match *phase {
        Phase::Isothermal { latent, .. } => [0.0, latent],
        Phase::Range { latent, .. } => [latent, latent],
        _ => return h1,
    };
    let mut h = h1;
    for k in kinks {
        if (h0 < k && h > k) || (h0 > k && h < k) {
            h = k;
        }
    }
    h
}

/// dT/dH for the Newton pass. A cell sitting exactly on a kink (where [`clip_at_kink`] left
/// it) takes half the slope of the sensible side, not the latent side's zero: it may move
/// either way, and with a zero slope a cell that turns back out of the melting interval
/// would be handed its whole move as enthalpy at fixed temperature and overshoot by many
/// kelvin; with half the slope it overshoots by at most a factor of two, or undershoots
/// into the interval, and the next pass, on its piece, corrects it (a device of this tool).
fn slope_at(phase: &Phase, h: f64, t: f64) -> f64 {
    match *phase {
        Phase::Isothermal {
            c_frozen,
            c_unfrozen,
            latent,
            ..
        } => {
            if h == 0.0 {
                0.5 / c_frozen
            } else if h == latent {
                0.5 / c_unfrozen
            } else {
                phase.dt_dh(h, t)
            }
        }
        Phase::Range {
            c_unfrozen, latent, ..
        } if h == latent => 0.5 / c_unfrozen,
        _ => phase.dt_dh(h, t),
    }
}

/// Why the plane solver could not go on.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum PlaneError {
    #[error(
        "the time step did not converge at t = {time_s:.0} s even at {dt_s:.3e} s (residual {residual:.3e} J/m³)"
    )]
    NoConvergence {
        time_s: f64,
        dt_s: f64,
        residual: f64,
    },
}

/// The condition on the top faces of one group of columns at one instant.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum TopFace {
    /// Air at `air_c` through a film and a resistance in series that stores no heat
    /// (a snow cover taken as a resistance, say), m²K/W.
    Air {
        air_c: f64,
        film_w_m2k: f64,
        extra_resistance_m2k_w: f64,
    },
    /// The surface held at a temperature.
    Held { surface_c: f64 },
    /// No heat crosses.
    Closed,
}

/// Iteration settings.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PlaneTolerances {
    /// A step is converged when every cell's residual, as an enthalpy error |R| Δt/V, is
    /// below this, J/m³.
    pub enthalpy_j_m3: f64,
    /// Newton passes allowed before the step is split.
    pub max_iterations: usize,
    /// Smallest fraction of the requested step a split may reach.
    pub min_step_fraction: f64,
    /// Conjugate-gradient iterations allowed per pass.
    pub max_linear_iterations: usize,
    /// Start each step's passes from the state the last step's rate of change predicts
    /// (H + Δt (H − Hⁿ⁻¹)/Δtⁿ⁻¹) rather than from the state itself. Only the starting point
    /// of the iteration: the converged step is the same to the tolerance.
    pub predict: bool,
}

impl Default for PlaneTolerances {
    fn default() -> Self {
        Self {
            // 1e-3 J/m³ is about 5e-10 K of sensible heat in soil (C ≈ 2e6 J/m³/K).
            enthalpy_j_m3: 1e-3,
            max_iterations: 40,
            min_step_fraction: 1.0 / 1024.0,
            max_linear_iterations: 2000,
            predict: true,
        }
    }
}

/// Counters of the work done.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct PlaneWork {
    pub steps: u64,
    /// Newton passes of converged steps.
    pub iterations: u64,
    /// Conjugate-gradient iterations of all passes (converged or not).
    pub linear_iterations: u64,
    pub splits: u64,
}

/// The grid, the cells' phases and the state.
#[derive(Debug, Clone)]
pub struct Plane {
    pub nx: usize,
    pub nz: usize,
    /// Cell faces along x and z, m (nx + 1 and nz + 1 of them, increasing).
    pub x_faces_m: Vec<f64>,
    pub z_faces_m: Vec<f64>,
    /// Phase per cell, row-major (j·nx + i).
    pub phases: Vec<Phase>,
    /// Top group of each column (index into the `tops` passed to [`Plane::step`]).
    pub top_group: Vec<usize>,
    pub enthalpy: Vec<f64>,
    pub temperature: Vec<f64>,
    pub time_s: f64,
    pub tolerances: PlaneTolerances,
    pub work: PlaneWork,
    /// Energy stored at the start, J/m.
    pub energy_start_j_m: f64,
    /// Energy in through each top group and through the bottom since the start, J/m.
    pub energy_in_top_j_m: Vec<f64>,
    pub energy_in_bottom_j_m: f64,
    /// Σ |boundary heat| over the steps, J/m.
    pub energy_throughput_j_m: f64,
    /// Heat in through each top group and the bottom over the last step, W/m.
    pub last_top_w_m: Vec<f64>,
    pub last_bottom_w_m: f64,
    dx: Vec<f64>,
    dz: Vec<f64>,
    /// Half-cell resistances along x (Δx/2k) and z (Δz/2k), m K/W · m.
    rx: Vec<f64>,
    rz: Vec<f64>,
    /// Face conductances, W/m/K per metre of length: gx between (i, j) and (i+1, j) at
    /// j·(nx−1) + i; gz between (i, j) and (i, j+1) at j·nx + i; top and bottom per column.
    gx: Vec<f64>,
    gz: Vec<f64>,
    g_top: Vec<f64>,
    g_bot: Vec<f64>,
    slope: Vec<f64>,
    h_old: Vec<f64>,
    /// dH/dt of the last converged step, J/m³/s (empty before the first).
    trend: Vec<f64>,
    /// V/Δt per cell.
    cap: Vec<f64>,
    /// −F (the negated residual), W/m.
    res: Vec<f64>,
    // Linear solve.
    diag: Vec<f64>,
    /// Couplings of each cell to its west and north neighbours in the δT system (the face
    /// conductance, or 0 where either cell is masked).
    cw: Vec<f64>,
    cn: Vec<f64>,
    fw: Vec<f64>,
    fn_: Vec<f64>,
    bw: Vec<f64>,
    bn: Vec<f64>,
    ic: Vec<f64>,
    x: Vec<f64>,
    r: Vec<f64>,
    z: Vec<f64>,
    p: Vec<f64>,
    q: Vec<f64>,
}

impl Plane {
    /// A plane from faces, one phase per cell (row-major) and each column's top group, at a
    /// temperature given by depth (cell centres).
    ///
    /// The caller guarantees at least one cell each way, increasing faces and one phase per
    /// cell (the section builder checks its inputs first).
    pub fn new(
        x_faces_m: Vec<f64>,
        z_faces_m: Vec<f64>,
        phases: Vec<Phase>,
        top_group: Vec<usize>,
        groups: usize,
        initial_c: impl Fn(f64) -> f64,
    ) -> Plane {
        let nx = x_faces_m.len() - 1;
        let nz = z_faces_m.len() - 1;
        let n = nx * nz;
        debug_assert_eq!(phases.len(), n);
        debug_assert_eq!(top_group.len(), nx);
        let dx = axis::widths(&x_faces_m);
        let dz = axis::widths(&z_faces_m);
        let mut enthalpy = vec![0.0; n];
        let mut temperature = vec![0.0; n];
        for j in 0..nz {
            let zc = 0.5 * (z_faces_m[j] + z_faces_m[j + 1]);
            let t = initial_c(zc);
            for i in 0..nx {
                let p = j * nx + i;
                enthalpy[p] = phases[p].enthalpy(t);
                temperature[p] = phases[p].temperature(enthalpy[p]);
            }
        }
        let mut s = Plane {
            nx,
            nz,
            x_faces_m,
            z_faces_m,
            phases,
            top_group,
            enthalpy,
            temperature,
            time_s: 0.0,
            tolerances: PlaneTolerances::default(),
            work: PlaneWork::default(),
            energy_start_j_m: 0.0,
            energy_in_top_j_m: vec![0.0; groups],
            energy_in_bottom_j_m: 0.0,
            energy_throughput_j_m: 0.0,
            last_top_w_m: vec![0.0; groups],
            last_bottom_w_m: 0.0,
            dx,
            dz,
            rx: vec![0.0; n],
            rz: vec![0.0; n],
            gx: vec![0.0; nx.saturating_sub(1) * nz],
            gz: vec![0.0; nx * nz.saturating_sub(1)],
            g_top: vec![0.0; nx],
            g_bot: vec![0.0; nx],
            slope: vec![0.0; n],
            h_old: vec![0.0; n],
            trend: Vec::new(),
            cap: vec![0.0; n],
            res: vec![0.0; n],
            diag: vec![0.0; n],
            cw: vec![0.0; n],
            cn: vec![0.0; n],
            fw: vec![0.0; n],
            fn_: vec![0.0; n],
            bw: vec![0.0; n],
            bn: vec![0.0; n],
            ic: vec![0.0; n],
            x: vec![0.0; n],
            r: vec![0.0; n],
            z: vec![0.0; n],
            p: vec![0.0; n],
            q: vec![0.0; n],
        };
        s.energy_start_j_m = s.stored_energy_j_m();
        s
    }

    /// Number of cells.
    pub fn len(&self) -> usize {
        self.nx * self.nz
    }

    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// Cell widths along x and heights along z, m.
    pub fn dx_m(&self) -> &[f64] {
        &self.dx
    }
    pub fn dz_m(&self) -> &[f64] {
        &self.dz
    }

    /// Σ H V, J/m.
    pub fn stored_energy_j_m(&self) -> f64 {
        let mut e = 0.0;
        for j in 0..self.nz {
            let mut row = 0.0;
            for i in 0..self.nx {
                row += self.enthalpy[j * self.nx + i] * self.dx[i];
            }
            e += row * self.dz[j];
        }
        e
    }

    /// Stored change since the start minus the heat in through the boundaries, J/m (zero to
    /// round-off and the residual tolerance).
    pub fn energy_imbalance_j_m(&self) -> f64 {
        (self.stored_energy_j_m() - self.energy_start_j_m)
            - self.energy_in_top_j_m.iter().sum::<f64>()
            - self.energy_in_bottom_j_m
    }

    /// Ice share of the freezable water of cell p (0 for cells that hold none).
    pub fn frozen_fraction(&self, p: usize) -> f64 {
        self.phases[p].frozen_fraction(self.enthalpy[p], self.temperature[p])
    }

    /// Depth of the deepest frozen ground in column i, m from the top face, read from the
    /// frozen fraction inside the cell as the column solver does (0 when nothing is
    /// frozen); only rows from `from_row` down are searched.
    pub fn column_frost_depth_m(&self, i: usize, from_row: usize) -> Option<f64> {
        (from_row..self.nz).rev().find_map(|j| {
            let p = j * self.nx + i;
            if self.temperature[p] <= 0.0 && self.phases[p].freezes() {
                let f = self.frozen_fraction(p);
                if f > 1e-9 {
                    return Some(self.z_faces_m[j] + f.clamp(0.0, 1.0) * self.dz[j]);
                }
            }
            None
        })
    }

    fn half_resistances(&mut self) {
        for j in 0..self.nz {
            for i in 0..self.nx {
                let p = j * self.nx + i;
                let k = self.phases[p].conductivity(self.enthalpy[p], self.temperature[p]);
                self.rx[p] = 0.5 * self.dx[i] / k;
                self.rz[p] = 0.5 * self.dz[j] / k;
            }
        }
    }

    fn face_conductances(&mut self, tops: &[TopFace], bottom: &BottomCondition) {
        let (nx, nz) = (self.nx, self.nz);
        for j in 0..nz {
            for i in 0..nx.saturating_sub(1) {
                let p = j * nx + i;
                self.gx[j * (nx - 1) + i] = self.dz[j] / (self.rx[p] + self.rx[p + 1]);
            }
        }
        for j in 0..nz.saturating_sub(1) {
            for i in 0..nx {
                let p = j * nx + i;
                self.gz[p] = self.dx[i] / (self.rz[p] + self.rz[p + nx]);
            }
        }
        for i in 0..nx {
            self.g_top[i] = match tops[self.top_group[i]] {
                TopFace::Air {
                    film_w_m2k,
                    extra_resistance_m2k_w,
                    ..
                } => self.dx[i] / (1.0 / film_w_m2k + extra_resistance_m2k_w + self.rz[i]),
                TopFace::Held { .. } => self.dx[i] / self.rz[i],
                TopFace::Closed => 0.0,
            };
            let p = (nz - 1) * nx + i;
            self.g_bot[i] = match bottom {
                BottomCondition::Temperature { .. } => self.dx[i] / self.rz[p],
                BottomCondition::Flux { .. } => 0.0,
            };
        }
    }

    /// Whether the held conductances still match the state to 1e-4 relative; if not, take
    /// the new ones.
    fn conductances_settled(&mut self, tops: &[TopFace], bottom: &BottomCondition) -> bool {
        let mut settled = true;
        'outer: for j in 0..self.nz {
            for i in 0..self.nx {
                let p = j * self.nx + i;
                let k = self.phases[p].conductivity(self.enthalpy[p], self.temperature[p]);
                let r = 0.5 * self.dx[i] / k;
                if (r - self.rx[p]).abs() > 1e-4 * self.rx[p] {
                    settled = false;
                    break 'outer;
                }
            }
        }
        if !settled {
            self.half_resistances();
            self.face_conductances(tops, bottom);
        }
        settled
    }

    /// Temperature a top face's group sets beyond its conductance.
    fn top_temperature(top: &TopFace) -> f64 {
        match *top {
            TopFace::Air { air_c, .. } => air_c,
            TopFace::Held { surface_c } => surface_c,
            TopFace::Closed => 0.0,
        }
    }

    /// Boundary heat in over the present state: per top group and through the bottom, W/m.
    fn boundary_heat(&self, tops: &[TopFace], bottom: &BottomCondition, top: &mut [f64]) -> f64 {
        top.fill(0.0);
        let (nx, nz) = (self.nx, self.nz);
        for i in 0..nx {
            let g = self.top_group[i];
            top[g] += self.g_top[i] * (Self::top_temperature(&tops[g]) - self.temperature[i]);
        }
        let mut bot = 0.0;
        for i in 0..nx {
            bot += match *bottom {
                BottomCondition::Temperature { temperature_c } => {
                    self.g_bot[i] * (temperature_c - self.temperature[(nz - 1) * nx + i])
                }
                BottomCondition::Flux { upward_w_m2 } => upward_w_m2 * self.dx[i],
            };
        }
        bot
    }

    /// −F for every cell into `res`; returns the worst enthalpy error |F| Δt/V (infinite if
    /// not finite).
    fn residual(&mut self, tops: &[TopFace], bottom: &BottomCondition) -> f64 {
        let (nx, nz) = (self.nx, self.nz);
        let t = &self.temperature;
        let res = &mut self.res;
        for p in 0..nx * nz {
            res[p] = -self.cap[p] * (self.enthalpy[p] - self.h_old[p]);
        }
        // Each face's flux once, to both cells.
        for j in 0..nz {
            for i in 0..nx.saturating_sub(1) {
                let p = j * nx + i;
                let f = self.gx[j * (nx - 1) + i] * (t[p] - t[p + 1]);
                res[p] -= f;
                res[p + 1] += f;
            }
        }
        for j in 0..nz.saturating_sub(1) {
            for i in 0..nx {
                let p = j * nx + i;
                let f = self.gz[p] * (t[p] - t[p + nx]);
                res[p] -= f;
                res[p + nx] += f;
            }
        }
        for i in 0..nx {
            let g = self.top_group[i];
            res[i] += self.g_top[i] * (Self::top_temperature(&tops[g]) - t[i]);
            let p = (nz - 1) * nx + i;
            res[p] += match *bottom {
                BottomCondition::Temperature { temperature_c } => {
                    self.g_bot[i] * (temperature_c - t[p])
                }
                BottomCondition::Flux { upward_w_m2 } => upward_w_m2 * self.dx[i],
            };
        }
        let mut worst: f64 = 0.0;
        for p in 0..nx * nz {
            let e = self.res[p].abs() / self.cap[p];
            if !e.is_finite() {
                return f64::INFINITY;
            }
            worst = worst.max(e);
        }
        worst
    }

    /// The couplings of the δT system for the present slopes.
    fn couplings(&mut self) {
        let (nx, nz) = (self.nx, self.nz);
        for j in 0..nz {
            for i in 0..nx {
                let p = j * nx + i;
                let on = self.slope[p] > 0.0;
                self.cw[p] = if i > 0 && on && self.slope[p - 1] > 0.0 {
                    self.gx[j * (nx - 1) + i - 1]
                } else {
                    0.0
                };
                self.cn[p] = if j > 0 && on && self.slope[p - nx] > 0.0 {
                    self.gz[p - nx]
                } else {
                    0.0
                };
            }
        }
    }

    /// y = M x (masked cells: y = x, and they hold x = 0).
    fn apply(&self, x: &[f64], y: &mut [f64]) {
        let (nx, n) = (self.nx, self.len());
        let (cw, cn, diag) = (&self.cw[..n], &self.cn[..n], &self.diag[..n]);
        let (x, y) = (&x[..n], &mut y[..n]);
        for p in 0..n {
            let mut v = diag[p] * x[p];
            if p >= 1 {
                v -= cw[p] * x[p - 1];
            }
            if p + 1 < n {
                v -= cw[p + 1] * x[p + 1];
            }
            if p >= nx {
                v -= cn[p] * x[p - nx];
            }
            if p + nx < n {
                v -= cn[p + nx] * x[p + nx];
            }
            y[p] = v;
        }
    }

    /// IC(0) of M: pivots d_p = m_pp − Σ_lower c² / d_q (Meijerink & van der Vorst 1977).
    /// M is a symmetric M-matrix (positive diagonal, non-positive couplings, diagonally
    /// dominant), so the pivots stay positive; a guard keeps them so anyway. Stored for the
    /// sweeps already divided by the pivot: `ic` = 1/d_p, `fw`, `fn_` = c/d_p of the west and
    /// north couplings, `bw`, `bn` = c/d_p of the east and south ones.
    fn factorise(&mut self) {
        let (nx, n) = (self.nx, self.len());
        for p in 0..n {
            let mut d = self.diag[p];
            if p >= 1 {
                d -= self.cw[p] * self.cw[p] * self.ic[p - 1];
            }
            if p >= nx {
                d -= self.cn[p] * self.cn[p] * self.ic[p - nx];
            }
            self.ic[p] = if d > 0.0 { 1.0 / d } else { 1.0 / self.diag[p] };
        }
        for p in 0..n {
            let inv = self.ic[p];
            self.fw[p] = self.cw[p] * inv;
            self.fn_[p] = self.cn[p] * inv;
            self.bw[p] = if p + 1 < n { self.cw[p + 1] * inv } else { 0.0 };
            self.bn[p] = if p + nx < n {
                self.cn[p + nx] * inv
            } else {
                0.0
            };
        }
    }

    /// z = (IC(0))⁻¹ r: forward u_p = (r_p + Σ_lower c u_q)/d_p, then backward
    /// z_p = u_p + Σ_upper c z_q / d_p (the couplings of M are −c).
    fn precondition(&self, r: &[f64], z: &mut [f64]) {
        let (nx, n) = (self.nx, self.len());
        let (ic, fw, fnn) = (&self.ic[..n], &self.fw[..n], &self.fn_[..n]);
        let (bw, bn) = (&self.bw[..n], &self.bn[..n]);
        let (r, z) = (&r[..n], &mut z[..n]);
        // First row: west couplings only; then every row with its north neighbour.
        z[0] = r[0] * ic[0];
        for p in 1..nx.min(n) {
            z[p] = r[p] * ic[p] + fw[p] * z[p - 1];
        }
        for p in nx..n {
            z[p] = r[p] * ic[p] + fw[p] * z[p - 1] + fnn[p] * z[p - nx];
        }
        // Backward: last row east only; then every row with its south neighbour.
        let last_row = n.saturating_sub(nx);
        for p in (last_row..n.saturating_sub(1)).rev() {
            z[p] += bw[p] * z[p + 1];
        }
        for p in (0..last_row).rev() {
            z[p] += bw[p] * z[p + 1] + bn[p] * z[p + nx];
        }
    }

    /// Solve M x = res over the unmasked cells by preconditioned conjugate gradients, until
    /// every cell's residual as an enthalpy error is below `target` (J/m³). Returns the
    /// iterations used.
    fn solve_linear(&mut self, target: f64) -> usize {
        let n = self.len();
        self.couplings();
        self.factorise();
        let mut x = std::mem::take(&mut self.x);
        let mut r = std::mem::take(&mut self.r);
        let mut z = std::mem::take(&mut self.z);
        let mut pv = std::mem::take(&mut self.p);
        let mut q = std::mem::take(&mut self.q);
        x.fill(0.0);
        for k in 0..n {
            r[k] = if self.slope[k] > 0.0 {
                self.res[k]
            } else {
                0.0
            };
        }
        let done = |r: &[f64], cap: &[f64]| r.iter().zip(cap).all(|(a, c)| a.abs() <= target * c);
        let mut iters = 0;
        if !done(&r, &self.cap) {
            self.precondition(&r, &mut z);
            pv.copy_from_slice(&z);
            let mut rz: f64 = r.iter().zip(&z).map(|(a, b)| a * b).sum();
            while iters < self.tolerances.max_linear_iterations {
                iters += 1;
                self.apply(&pv, &mut q);
                let pq: f64 = pv.iter().zip(&q).map(|(a, b)| a * b).sum();
                if pq.is_nan() || pq <= 0.0 {
                    break;
                }
                let alpha = rz / pq;
                for k in 0..n {
                    x[k] += alpha * pv[k];
                    r[k] -= alpha * q[k];
                }
                if done(&r, &self.cap) {
                    break;
                }
                self.precondition(&r, &mut z);
                let rz_new: f64 = r.iter().zip(&z).map(|(a, b)| a * b).sum();
                let beta = rz_new / rz;
                rz = rz_new;
                for k in 0..n {
                    pv[k] = z[k] + beta * pv[k];
                }
            }
        }
        self.x = x;
        self.r = r;
        self.z = z;
        self.p = pv;
        self.q = q;
        iters
    }

    /// One implicit step of length `dt`; on failure the state is restored and the residual
    /// returned.
    fn try_step(
        &mut self,
        dt: f64,
        tops: &[TopFace],
        bottom: &BottomCondition,
    ) -> Result<usize, f64> {
        let (nx, nz) = (self.nx, self.nz);
        let n = nx * nz;
        self.h_old.copy_from_slice(&self.enthalpy);
        if self.tolerances.predict && self.trend.len() == n {
            for p in 0..n {
                self.enthalpy[p] += self.trend[p] * dt;
                self.temperature[p] = self.phases[p].temperature(self.enthalpy[p]);
            }
        }
        for j in 0..nz {
            for i in 0..nx {
                self.cap[j * nx + i] = self.dx[i] * self.dz[j] / dt;
            }
        }
        for p in 0..n {
            self.slope[p] = slope_at(&self.phases[p], self.enthalpy[p], self.temperature[p]);
        }
        self.half_resistances();
        self.face_conductances(tops, bottom);
        let tol = self.tolerances.enthalpy_j_m3;
        let mut last = f64::INFINITY;
        for iter in 0..=self.tolerances.max_iterations {
            let worst = self.residual(tops, bottom);
            if !worst.is_finite() {
                break;
            }
            last = worst;
            if worst <= tol {
                if !self.conductances_settled(tops, bottom) {
                    continue;
                }
                let mut top = std::mem::take(&mut self.last_top_w_m);
                let bot = self.boundary_heat(tops, bottom, &mut top);
                for (e, q) in self.energy_in_top_j_m.iter_mut().zip(&top) {
                    *e += q * dt;
                }
                self.energy_in_bottom_j_m += bot * dt;
                self.energy_throughput_j_m +=
                    (top.iter().map(|q| q.abs()).sum::<f64>() + bot.abs()) * dt;
                self.last_top_w_m = top;
                self.last_bottom_w_m = bot;
                self.trend.resize(n, 0.0);
                for p in 0..n {
                    self.trend[p] = (self.enthalpy[p] - self.h_old[p]) / dt;
                }
                return Ok(iter.max(1));
            }
            if iter == self.tolerances.max_iterations {
                break;
            }
            // The δT system: diagonal V/(Δt S) + Σ G over the cell's faces (boundary
            // conductances included); masked (S = 0) cells get 1 and a zero right-hand side.
            for j in 0..nz {
                for i in 0..nx {
                    let p = j * nx + i;
                    let s = self.slope[p];
                    let mut g = 0.0;
                    if i > 0 {
                        g += self.gx[j * (nx - 1) + i - 1];
                    }
                    if i + 1 < nx {
                        g += self.gx[j * (nx - 1) + i];
                    }
                    g += if j > 0 {
                        self.gz[p - nx]
                    } else {
                        self.g_top[i]
                    };
                    g += if j + 1 < nz {
                        self.gz[p]
                    } else {
                        self.g_bot[i]
                    };
                    if s > 0.0 {
                        self.diag[p] = self.cap[p] / s + g;
                    } else {
                        self.diag[p] = 1.0;
                    }
                }
            }
            let target = (0.25 * tol).max(1e-2 * worst);
            let li = self.solve_linear(target);
            self.work.linear_iterations += li as u64;
            let damping = if iter < 12 { 1.0 } else { 0.5 };
            // δH: from δT where S > 0; from the cell's own row where S = 0:
            // cap δH = −F + Σ G δT_neighbour. A move across a kink of T(H) stops on it
            // ([`clip_at_kink`]).
            for j in 0..nz {
                for i in 0..nx {
                    let p = j * nx + i;
                    let s = self.slope[p];
                    let dh = if s > 0.0 {
                        self.x[p] / s
                    } else {
                        let mut b = self.res[p];
                        if i > 0 {
                            b += self.gx[j * (nx - 1) + i - 1] * self.x[p - 1];
                        }
                        if i + 1 < nx {
                            b += self.gx[j * (nx - 1) + i] * self.x[p + 1];
                        }
                        if j > 0 {
                            b += self.gz[p - nx] * self.x[p - nx];
                        }
                        if j + 1 < nz {
                            b += self.gz[p] * self.x[p + nx];
                        }
                        b / self.cap[p]
                    };
                    let phase = &self.phases[p];
                    let h0 = self.enthalpy[p];
                    self.enthalpy[p] = clip_at_kink(phase, h0, h0 + damping * dh);
                    self.temperature[p] = phase.temperature(self.enthalpy[p]);
                }
            }
            for p in 0..n {
                self.slope[p] = slope_at(&self.phases[p], self.enthalpy[p], self.temperature[p]);
            }
            // Conductances follow the iterate (a Picard update of k within the passes), so
            // they have mostly settled by the time the residual has.
            self.half_resistances();
            self.face_conductances(tops, bottom);
        }
        self.enthalpy.copy_from_slice(&self.h_old);
        for p in 0..n {
            self.temperature[p] = self.phases[p].temperature(self.enthalpy[p]);
        }
        Err(last)
    }

    /// Advance by `dt` seconds with the conditions at the end of the step (implicit),
    /// splitting the step where the iteration does not converge. `tops` holds one condition
    /// per top group.
    pub fn step(
        &mut self,
        dt: f64,
        tops: &[TopFace],
        bottom: &BottomCondition,
    ) -> Result<(), PlaneError> {
        self.step_split(dt, dt, tops, bottom)
    }

    fn step_split(
        &mut self,
        dt: f64,
        dt_requested: f64,
        tops: &[TopFace],
        bottom: &BottomCondition,
    ) -> Result<(), PlaneError> {
        match self.try_step(dt, tops, bottom) {
            Ok(iters) => {
                self.work.steps += 1;
                self.work.iterations += iters as u64;
                self.time_s += dt;
                Ok(())
            }
            Err(residual) => {
                if dt * 0.5 < dt_requested * self.tolerances.min_step_fraction {
                    return Err(PlaneError::NoConvergence {
                        time_s: self.time_s,
                        dt_s: dt,
                        residual,
                    });
                }
                self.work.splits += 1;
                self.step_split(0.5 * dt, dt_requested, tops, bottom)?;
                self.step_split(0.5 * dt, dt_requested, tops, bottom)
            }
        }
    }
}
