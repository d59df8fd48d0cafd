//! The column solver: backward Euler in enthalpy with Newton passes, one tridiagonal solve
//! per pass in preallocated buffers (the method in outline is in [`super`]; this file holds
//! its details, the snow cells and what keeps it fast).
//!
//! # A step
//!
//! - Newton passes on the cells' enthalpy with T linearised about the iterate; each pass is
//!   one Thomas solve, eliminated from the bottom row up.
//! - Face conductances are taken at the step's start and held through its passes; once the
//!   residual has converged they are compared with the state and taken afresh (a Picard
//!   update of k) until they agree with it to 1e-4 relative. The fluxes booked use the same
//!   conductances as the residual, so energy is conserved whatever k is held.
//! - A step has converged when every cell's residual, as an enthalpy error |R| Δt/Δz, is
//!   below [`Tolerances::enthalpy_j_m3`], or when a pass left every cell, and the top flux,
//!   on the linear piece of T(H) it started on with the conductances settled (no
//!   unfrozen-water curve in the column): that pass solved the step's equations exactly.
//! - After 12 passes the update is halved, to break a cycle between two states at a kink of
//!   T(H). A step whose passes run out (`max_iterations`) is split in halves, down to
//!   `min_step_fraction` (1/1024) of the requested step; below that
//!   [`TransientError::NoConvergence`].
//! - [`Solver::fronts`] reads frost and thaw depth from the frozen fraction inside the
//!   ground cells. The energy ledger, [`Solver::energy_imbalance_j_m2`], is stored change −
//!   face fluxes − snow-mass exchange.
//!
//! # Snow cells
//!
//! Under an air film (`TopModel::AirFilm` of [`super::setup`]) the snow the forcing gives
//! (depth, density) lies on the ground as cells of its own at the start of
//! [`Solver::cells`], above the ground cells ([`Solver::snow_cells`] of them; their `top_m`
//! is negative, the height above the ground negated). Before every step the run
//! ([`super::run::Run`]) calls [`Solver::set_snow`] with the snow at the end of the step.
//!
//! - **Added, removed, resized.** Snow of [`SNOW_MIN_DEPTH_M`] (5 mm) or less has no cells;
//!   otherwise ⌈depth / [`SNOW_CELL_M`]⌉ equal cells, at most [`MAX_SNOW_CELLS`]. The cell
//!   arrays and the kept rows of the system are reallocated only when that number changes;
//!   otherwise the snow cells are rewritten in place, and the deep ground rows keep their
//!   factors.
//! - **Remapped by mass.** The enthalpy is carried over in mass coordinates counted from
//!   the ground up: each new cell takes the mass-weighted mean of the old cells' specific
//!   enthalpy (J/kg) over the mass it spans. Settling (denser, thinner, same mass) keeps
//!   every parcel's temperature. Mass gained is snowfall on top at the air temperature
//!   capped at 0 °C (frozen); mass lost leaves from the top with the specific enthalpy it
//!   had.
//! - **Booked.** The energy that comes and goes with snow mass is
//!   [`Solver::snow_exchange_j_m2`], so stored change = face fluxes + snow-mass exchange
//!   closes to round-off (`tests/transient.rs` asserts 1e-9 of the throughput over a snowy
//!   year, and that it would not close without the term).
//! - **At the surface.** The film sits on top of the snow. The snow surface cannot warm
//!   above 0 °C while the top cell holds ice: the top flux is max(plain conduction, h
//!   (T_air − 0)), handed over linearly to plain conduction as the top cell's last tenth of
//!   ice melts ([`SNOW_MELT_OUT_SHARE`]), so the flux stays continuous and its derivatives
//!   go into the Newton matrix. The depth is prescribed: a snow cell whose ice has all
//!   melted (the climate keeps snow the energy has melted) holds its water in place and
//!   warms above 0 °C. What a snow cell stores and conducts is its phase, `Phase::Snow` of
//!   [`super::phase`].
//!
//! # Speed without changing a number
//!
//! Every shortcut here keeps numbers that are bit for bit what computing them afresh gives:
//! a number is a pure function of the cells and their state, and it is kept only while its
//! inputs are unchanged. [`Solver::clear_step_cache`] forgets all of it, and
//! `the_state_kept_between_steps_changes_no_number` (`tests/transient.rs`) compares a run
//! with one that clears it before every step; debug builds, so every `cargo test`, check
//! the kept rows, factors, faces, stretches, pieces and held k against fresh values at
//! every pass.
//!
//! - Each converged step keeps every cell's k, dT/dH and stretch of constant k for the next
//!   step where its enthalpy is unchanged (`h_key`; snow remapping and states set from
//!   outside leave it unmatched, and the step's start evaluates those cells afresh).
//! - Each cell's phase is unpacked once (`Pieces` of [`super::phase`]): an inert or
//!   isothermal cell's T(H) is linear below one enthalpy and above another, with one dT/dH
//!   and one stretch on each piece, so most cells cost a comparison and a division; a cell
//!   found on the same piece as before is not compared again (tested against `Phase` bit
//!   for bit).
//! - k is evaluated only in `k_unsure`, the range of cells off a stretch of constant k
//!   (`Phase::constant_k_stretch`, tested) or moved to another stretch since their k was
//!   taken; the face conductances of the others are kept.
//! - Only rows 0..`rows_changed` of the tridiagonal system are built and factorised again:
//!   every change of a cell's Δz/Δt, face conductance or dT/dH marks the rows it enters,
//!   and the factorisation runs from the bottom row up, so the deep ground's rows and
//!   factors are kept while the freezing front and the snow move.
//! - The residual runs from the bottom row up and makes the solve's upward sweep as it
//!   goes; the downward sweep updates each cell as it reaches it. Each row's data (Δz/Δt,
//!   start enthalpy, super-diagonal, factors, sweep value, piece) sit side by side in one
//!   array (`Row`), which matters in wasm, where every separate array costs an address
//!   computation on every read.
//!
//! What is left is the solve itself and the number of passes. The solve's two sweeps are
//! chains of dependent multiplications and subtractions that no reordering can shorten
//! without changing the numbers. The Picard agreement of k stays at 1e-4: loosening it
//! saves passes but moves the deepest frost by centimetres in long steps with an
//! unfrozen-water curve. The figures behind both statements, and the speed before and after
//! this work, are in `MEASUREMENTS.md`.

use super::phase::{stretch_of, Phase, Pieces, BETWEEN, VARYING_K};
use crate::physics::materials::Material;

/// Why a transient run could not go on.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum TransientError {
    #[error(
        "the time step did not converge at t = {time_s:.0} s even at {dt_s:.3e} s (residual {residual:.3e} J/m³)"
    )]
    NoConvergence {
        time_s: f64,
        dt_s: f64,
        residual: f64,
    },
    #[error("{field}: {message}")]
    Input { field: String, message: String },
}

/// Conditions on the top face at one instant.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum TopCondition {
    /// Air at `air_c` through a film `film_w_m2k` and an extra resistance in series (a
    /// resistance that stores no heat, m²K/W). When the column carries snow cells the face
    /// under film and extra resistance is the snow surface, which is held at 0 °C at most
    /// (see [`Solver::set_snow`]).
    Air {
        air_c: f64,
        film_w_m2k: f64,
        extra_resistance_m2k_w: f64,
    },
    /// The surface held at a temperature (for an n-factor, the caller passes n × T_air).
    Surface { surface_c: f64 },
}

/// Conditions on the bottom face.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum BottomCondition {
    /// Bottom face held at a temperature.
    Temperature { temperature_c: f64 },
    /// Heat flux entering from below, W/m² (the geothermal flux; 0 for an insulated base).
    Flux { upward_w_m2: f64 },
}

/// Iteration settings.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Tolerances {
    /// Converged when every cell's residual, as an enthalpy error |R| Δt/Δz, is below this,
    /// J/m³.
    pub enthalpy_j_m3: f64,
    /// Iterations allowed before the step is split.
    pub max_iterations: usize,
    /// Smallest fraction of the requested step a split may reach.
    pub min_step_fraction: f64,
}

impl Default for Tolerances {
    fn default() -> Self {
        Self {
            // The step is converged when no cell's energy balance is off by more than
            // 1e-4 J/m³, about 5e-11 K of sensible heat in soil.
            enthalpy_j_m3: 1e-4,
            max_iterations: 40,
            min_step_fraction: 1.0 / 1024.0,
        }
    }
}

/// One cell of the column.
#[derive(Debug, Clone, PartialEq)]
pub struct Cell {
    /// Depth of the cell's top face and thickness, m.
    pub top_m: f64,
    pub dz_m: f64,
    /// Index of the layer the cell belongs to ([`SNOW_LAYER`] for a snow cell).
    pub layer: usize,
    pub phase: Phase,
}

impl Cell {
    pub fn center_m(&self) -> f64 {
        self.top_m + 0.5 * self.dz_m
    }
}

/// Counters of the work done.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Work {
    pub steps: u64,
    pub iterations: u64,
    pub splits: u64,
    /// Σ over the linear solves of converged steps of the cells solved (snow cells
    /// included): the cell-updates of the benchmark.
    pub cell_updates: u64,
}

/// Snow on the ground as the climate prescribes it at one instant.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SnowLayer {
    pub depth_m: f64,
    pub density_kg_m3: f64,
    /// From the run's snow regression at that density, W/m/K.
    pub conductivity_w_m_k: f64,
}

/// The `layer` of a snow cell (snow is not one of the stack's layers).
pub const SNOW_LAYER: usize = usize::MAX;

/// Snow shallower than this gets no cells, m: half the 1 cm to which daily snow depth is
/// usually observed (shallower cover is reported as a trace; common practice, no source).
/// Its resistance is then at most that of the film (5 mm / 0.1 W/m/K = 0.05 m²K/W) and its
/// heat capacity about 2 kJ/m²/K, a few millimetres of soil.
pub const SNOW_MIN_DEPTH_M: f64 = 0.005;
/// Target thickness of a snow cell, m; the cover gets ⌈depth / this⌉ equal cells, at most
/// [`MAX_SNOW_CELLS`].
pub const SNOW_CELL_M: f64 = 0.02;
/// Most snow cells (at 30 cm of snow, cells of 3.75 cm: about half the damping depth of the
/// daily temperature wave in settled snow, √(2a/ω) ≈ 7.6 cm for a = 2.1e-7 m²/s; the annual
/// wave, 1.5 m, is resolved finely).
pub const MAX_SNOW_CELLS: usize = 8;
/// Share of the top snow cell's ice over which its surface hands over from being held at
/// 0 °C (melting) to the plain film, as the cell's ice runs out (a numerical device of this
/// tool, so that the top flux stays continuous in the cell's state; no source).
pub const SNOW_MELT_OUT_SHARE: f64 = 0.1;

/// The column and its state.
#[derive(Debug, Clone)]
pub struct Solver {
    /// The cells, snow cells first. Read them freely; change them only through the
    /// solver (`set_snow`), which keeps what it derives from each cell's phase in step.
    pub cells: Vec<Cell>,
    /// Enthalpy per cell, J/m³. A state may be set here from outside between steps
    /// (with `temperature` set to match): the next step notices and evaluates those cells
    /// afresh.
    pub enthalpy: Vec<f64>,
    /// Temperature per cell, °C (follows from enthalpy).
    pub temperature: Vec<f64>,
    pub time_s: f64,
    pub tolerances: Tolerances,
    pub work: Work,
    /// Energy that entered through the faces since the start, J/m².
    pub energy_in_j_m2: f64,
    /// Energy stored at the start, J/m².
    pub energy_start_j_m2: f64,
    /// Energy brought into the column with snow mass since the start (snow arriving, less
    /// snow leaving, each at its own specific enthalpy), J/m².
    pub snow_exchange_j_m2: f64,
    /// Fluxes of the last step, W/m², positive into the column.
    pub last_top_flux_w_m2: f64,
    pub last_bottom_flux_w_m2: f64,
    /// Flux into the ground through its top face (the snow/ground interface under snow) and
    /// the temperature of that face at the end of the last step, W/m² and °C.
    pub last_ground_flux_w_m2: f64,
    pub last_ground_surface_c: f64,
    /// Number of snow cells at the start of `cells` (0 without snow). Snow cells sit above
    /// the ground surface: their `top_m` is negative (height above the ground, negated).
    pub snow_cells: usize,
    /// The snow the snow cells represent.
    pub snow: Option<SnowLayer>,
    // Scratch, preallocated: no allocation per step.
    //
    // What the solver keeps between passes and steps, and why it is exact. Every number
    // below is a pure function of the cells and their state (enthalpy, or the step
    // length); the solver keeps it while its inputs are unchanged and computes it again,
    // or marks it, where they change, so the numbers it uses are bit for bit those a
    // solver computing everything afresh would use (`clear_step_cache` forgets all of it,
    // and a test compares the two; debug builds check the rows, faces, stretches and
    // held k against fresh values at every pass).
    //
    /// What the two inner loops read and write of each row besides the cell's enthalpy,
    /// temperature and phase, side by side (see [`Row`]).
    rows: Vec<Row>,
    /// Half-cell resistances Δz/2k held through a step's passes, m²K/W.
    k: Vec<f64>,
    /// The enthalpy each cell had when the last converged step ended (NaN: not known).
    /// Where it still matches, the cell's k, `slope` and `stretch` are those of its state;
    /// anything that changes a cell otherwise (snow remapping, a state set from outside)
    /// leaves it unmatched, and the next step's start evaluates the cell afresh.
    h_key: Vec<f64>,
    /// The half-cell resistance the settled check evaluated at the present state, for the
    /// cells in `k_unsure`; a converged step hands it to `k` for the next step.
    k_state: Vec<f64>,
    /// Each cell's phase unpacked for the inner loop (see [`Pieces`]); follows `cells`.
    pieces: Vec<Pieces>,
    /// The stretch of constant k ([`Phase::constant_k_stretch`], [`VARYING_K`] where k
    /// varies with the state) that each cell's present enthalpy lies on; set wherever the
    /// solver sets an enthalpy, and at a step's start for every cell whose `h_key` does not
    /// match.
    stretch: Vec<u8>,
    /// The stretch of the state at which each cell's held `k` was taken. A cell whose
    /// `stretch` equals it (and is not [`VARYING_K`]) has the same k now, bit for bit.
    k_stretch: Vec<u8>,
    /// Cells lo..hi (lo, hi) hold every cell whose k may differ from its held one: those
    /// on no stretch of constant k, or on another stretch than the one their held k was
    /// taken on. Only there does the settled check evaluate k, and only there can a
    /// converged step's final state give a cell a new k for the next step.
    k_unsure: (usize, usize),
    /// Face conductances 1/(r_above + r_below), W/m²K; face i is the top face of cell i.
    g: Vec<f64>,
    /// dT/dH of each cell's present state, K per J/m³.
    slope: Vec<f64>,
    /// The tridiagonal system of a Newton pass: sub- and main diagonal (the super-diagonal
    /// is in `rows`). From row `rows_changed` down, each row is the one the present Δz/Δt,
    /// `g` and `slope` give, and `rows` hold its factors.
    a: Vec<f64>,
    b: Vec<f64>,
    /// The step length the rows' Δz/Δt are for (NaN: none yet).
    cap_dt: f64,
    /// Rows of the system that may differ from those last built and factorised are the
    /// rows 0..rows_changed. Every change of a cell's Δz/Δt, face conductance or dT/dH
    /// moves this bound below the rows it enters (row i holds cap_i, g_i, g_{i+1} and
    /// the slopes of cells i − 1 to i + 1), so the rows below it need not be built or
    /// factorised again: they, and their factors, are bit for bit what building them
    /// again would give. The deep ground, whose cells stay on one linear piece of T(H)
    /// and one constant k, then costs nothing here; only the rows down to the freezing
    /// front and the snow are rebuilt.
    rows_changed: usize,
    /// The cells 0..stale were changed from outside the passes (snow remapping, a change
    /// in the number of cells, a cleared cache): their Δz/Δt and faces are computed afresh
    /// at the next step's start.
    stale: usize,
    /// Whether the bottom row of the last system built carries the bottom face's
    /// conductance (a held bottom temperature).
    bottom_row: bool,
    /// Whether every cell's T(H) is piecewise linear (no unfrozen-water curve), so a pass
    /// that keeps every cell on its piece is exact.
    linear_pieces: bool,
}

/// The fronts read off the column at one instant.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Fronts {
    /// Depth of the deepest frozen ground, m (0 when nothing is frozen).
    pub frost_depth_m: f64,
    /// Depth thawed from the surface down while frozen ground remains below, m (0 if none).
    pub thaw_depth_m: f64,
}

impl Solver {
    /// A column from cells with a uniform initial temperature.
    pub fn new(cells: Vec<Cell>, initial_c: f64) -> Self {
        let n = cells.len();
        let enthalpy: Vec<f64> = cells.iter().map(|c| c.phase.enthalpy(initial_c)).collect();
        let temperature = vec![initial_c; n];
        let mut s = Solver {
            cells,
            enthalpy,
            temperature,
            time_s: 0.0,
            tolerances: Tolerances::default(),
            work: Work::default(),
            energy_in_j_m2: 0.0,
            energy_start_j_m2: 0.0,
            snow_exchange_j_m2: 0.0,
            last_top_flux_w_m2: 0.0,
            last_bottom_flux_w_m2: 0.0,
            last_ground_flux_w_m2: 0.0,
            last_ground_surface_c: initial_c,
            snow_cells: 0,
            snow: None,
            rows: vec![Row::default(); n],
            k: vec![0.0; n],
            h_key: vec![f64::NAN; n],
            k_state: vec![0.0; n],
            pieces: Vec::new(),
            stretch: vec![VARYING_K; n],
            k_stretch: vec![VARYING_K; n],
            k_unsure: (0, n),
            g: vec![0.0; n + 1],
            slope: vec![0.0; n],
            a: vec![0.0; n],
            b: vec![0.0; n],
            cap_dt: f64::NAN,
            rows_changed: n,
            stale: n,
            bottom_row: false,
            linear_pieces: false,
        };
        s.pieces = s.cells.iter().map(|c| Pieces::of(&c.phase)).collect();
        s.linear_pieces = s
            .cells
            .iter()
            .all(|c| !matches!(c.phase, Phase::Range { .. }));
        s.energy_start_j_m2 = s.stored_energy_j_m2();
        s
    }

    /// Set the initial state of the ground cells from a temperature at each depth (the snow
    /// cells keep theirs), and start the energy ledger afresh.
    pub fn set_temperatures(&mut self, t: impl Fn(f64) -> f64) {
        for (i, cell) in self.cells.iter().enumerate().skip(self.snow_cells) {
            let tc = t(cell.center_m());
            self.enthalpy[i] = cell.phase.enthalpy(tc);
            self.temperature[i] = cell.phase.temperature(self.enthalpy[i]);
        }
        self.restart_ledger();
    }

    /// Forget the state kept from the last converged step (each cell's k and dT/dH, the
    /// face conductances, Δz/Δt, the rows of the system and their factors), so the next
    /// step evaluates and factorises everything afresh. The kept state is exact, so this
    /// changes no number; a test uses it to show that.
    pub fn clear_step_cache(&mut self) {
        self.h_key.fill(f64::NAN);
        self.cap_dt = f64::NAN;
        self.stale = self.cells.len();
        self.k_unsure = (0, self.cells.len());
    }

    /// Start the energy ledger afresh from the present state.
    pub fn restart_ledger(&mut self) {
        self.energy_start_j_m2 = self.stored_energy_j_m2();
        self.energy_in_j_m2 = 0.0;
        self.snow_exchange_j_m2 = 0.0;
    }

    /// Index range of the ground cells (after the snow cells).
    pub fn ground(&self) -> std::ops::Range<usize> {
        self.snow_cells..self.cells.len()
    }

    /// Temperatures of the ground cells, top down, °C.
    pub fn ground_temperatures(&self) -> &[f64] {
        &self.temperature[self.snow_cells..]
    }

    /// Snow cells as (height of the cell centre above the ground surface m, temperature °C),
    /// from the ground up.
    pub fn snow_profile(&self) -> Vec<[f64; 2]> {
        (0..self.snow_cells)
            .rev()
            .map(|i| [-self.cells[i].center_m(), self.temperature[i]])
            .collect()
    }

    /// Put the snow the climate prescribes on the column (or take it away), before a step.
    ///
    /// `None`, or snow no deeper than [`SNOW_MIN_DEPTH_M`], means no snow cells. Otherwise the
    /// cover is cut into N = ⌈depth / [`SNOW_CELL_M`]⌉ equal cells (1 ≤ N ≤
    /// [`MAX_SNOW_CELLS`]) of the given density. The enthalpy is remapped conservatively in
    /// mass coordinates counted from the ground up: each new cell takes the mass-weighted
    /// mean of the old cells' specific enthalpy (J/kg) over the mass it spans, so snow that
    /// only settles (denser, thinner, same mass) keeps its temperature profile. Mass gained
    /// is added at the top, as snowfall, at the specific enthalpy of ice at `fresh_c` capped
    /// at 0 °C (frozen); mass lost leaves from the top (melt, wind, sublimation) with the
    /// specific enthalpy it had. The energy so brought in is returned (J/m²) and added to
    /// [`Solver::snow_exchange_j_m2`], so the ledger still closes:
    /// stored change = face fluxes + snow-mass exchange.
    ///
    /// The cell arrays are reallocated only when the number of cells changes.
    pub fn set_snow(&mut self, snow: Option<SnowLayer>, fresh_c: f64) -> f64 {
        let snow = snow.filter(|s| {
            s.depth_m > SNOW_MIN_DEPTH_M
                && s.depth_m.is_finite()
                && s.density_kg_m3 > 0.0
                && s.density_kg_m3.is_finite()
                && s.conductivity_w_m_k > 0.0
                && s.conductivity_w_m_k.is_finite()
        });
        if snow == self.snow {
            return 0.0;
        }
        let ns_old = self.snow_cells;
        // The old cover in mass coordinates from the ground up: equal cells of mass m_old.
        let (m_old, rho_old) = match self.snow {
            Some(s) if ns_old > 0 => (s.density_kg_m3 * s.depth_m / ns_old as f64, s.density_kg_m3),
            _ => (0.0, 1.0),
        };
        let mut spec_old = [0.0; MAX_SNOW_CELLS];
        let mut prefix = [0.0; MAX_SNOW_CELLS + 1];
        for g in 0..ns_old {
            // g counts from the ground up; the cell index counts from the top down.
            spec_old[g] = self.enthalpy[ns_old - 1 - g] / rho_old;
            prefix[g + 1] = prefix[g] + m_old * spec_old[g];
        }
        let mass_old = m_old * ns_old as f64;
        let energy_old = prefix[ns_old];
        let h_fresh = super::phase::snow_specific_enthalpy(fresh_c.min(0.0));
        // ∫₀^m h dm over the old cover, continued above it by fresh snow.
        let cumulative = |m: f64| -> f64 {
            if m >= mass_old {
                energy_old + (m - mass_old) * h_fresh
            } else {
                let g = ((m / m_old).floor() as usize).min(ns_old - 1);
                prefix[g] + (m - g as f64 * m_old) * spec_old[g]
            }
        };
        let (ns_new, dz_new, mass_new) = match snow {
            Some(s) => {
                let n = ((s.depth_m / SNOW_CELL_M).ceil() as usize).clamp(1, MAX_SNOW_CELLS);
                (n, s.depth_m / n as f64, s.density_kg_m3 * s.depth_m)
            }
            None => (0, 0.0, 0.0),
        };
        let mut h_new = [0.0; MAX_SNOW_CELLS];
        let mut below = 0.0;
        for (g, h) in h_new.iter_mut().enumerate().take(ns_new) {
            let above = cumulative(mass_new * (g + 1) as f64 / ns_new as f64);
            *h = (above - below) / dz_new;
            below = above;
        }
        // Energy brought in with snow mass: fresh snow added, or the top of the old cover lost.
        let exchange = if mass_new >= mass_old {
            (mass_new - mass_old) * h_fresh
        } else {
            -(energy_old - cumulative(mass_new))
        };
        self.snow_exchange_j_m2 += exchange;
        // The new snow cells, top down (none without snow).
        let (depth, phase) = match snow {
            Some(s) => (
                s.depth_m,
                Phase::Snow {
                    density_kg_m3: s.density_kg_m3,
                    conductivity: s.conductivity_w_m_k,
                },
            ),
            None => (
                0.0,
                Phase::Snow {
                    density_kg_m3: 1.0,
                    conductivity: 1.0,
                },
            ),
        };
        let make = |j: usize| -> (Cell, f64) {
            let cell = Cell {
                top_m: -depth + j as f64 * dz_new,
                dz_m: dz_new,
                layer: SNOW_LAYER,
                phase,
            };
            (cell, h_new[ns_new - 1 - j])
        };
        if ns_new == ns_old {
            for j in 0..ns_new {
                let (cell, h) = make(j);
                self.temperature[j] = cell.phase.temperature(h);
                self.enthalpy[j] = h;
                self.pieces[j] = Pieces::of(&cell.phase);
                self.rows[j].piece = BETWEEN;
                self.cells[j] = cell;
                self.h_key[j] = f64::NAN;
            }
            self.stale = self.stale.max(ns_new);
        } else {
            let (cells, hs): (Vec<Cell>, Vec<f64>) = (0..ns_new).map(make).unzip();
            let ts: Vec<f64> = cells
                .iter()
                .zip(&hs)
                .map(|(c, &h)| c.phase.temperature(h))
                .collect();
            let pieces: Vec<Pieces> = cells.iter().map(|c| Pieces::of(&c.phase)).collect();
            self.pieces.splice(0..ns_old, pieces);
            self.cells.splice(0..ns_old, cells);
            self.enthalpy.splice(0..ns_old, hs);
            self.temperature.splice(0..ns_old, ts);
            let n = self.cells.len();
            for v in [&mut self.k, &mut self.slope, &mut self.a, &mut self.b] {
                v.resize(n, 0.0);
            }
            self.rows.clear();
            self.rows.resize(n, Row::default());
            self.g.resize(n + 1, 0.0);
            self.k_state.resize(n, 0.0);
            self.stretch.resize(n, VARYING_K);
            self.k_stretch.resize(n, VARYING_K);
            self.h_key.clear();
            self.h_key.resize(n, f64::NAN);
            // Every array shifted by the change in the number of snow cells.
            self.stale = n;
            self.k_unsure = (0, n);
            self.snow_cells = ns_new;
        }
        self.snow = snow;
        exchange
    }

    /// Σ H Δz, J/m².
    pub fn stored_energy_j_m2(&self) -> f64 {
        self.cells
            .iter()
            .zip(&self.enthalpy)
            .map(|(c, h)| c.dz_m * h)
            .sum()
    }

    /// Energy stored since the start minus the energy that entered through the faces and
    /// with snow mass, J/m² (zero to round-off).
    pub fn energy_imbalance_j_m2(&self) -> f64 {
        (self.stored_energy_j_m2() - self.energy_start_j_m2)
            - self.energy_in_j_m2
            - self.snow_exchange_j_m2
    }

    /// Depth of the bottom face, m.
    pub fn depth_m(&self) -> f64 {
        self.cells.last().map_or(0.0, |c| c.top_m + c.dz_m)
    }

    /// Ice share of each cell's freezable water (0 for cells that hold none).
    pub fn frozen_fraction(&self, i: usize) -> f64 {
        self.cells[i]
            .phase
            .frozen_fraction(self.enthalpy[i], self.temperature[i])
    }

    /// Frost and thaw fronts in the ground (depths from the ground surface; snow cells are
    /// not ground), read from the frozen fraction inside cells. In a cell that is part
    /// frozen, the front sits at the fraction of its thickness given by the frozen share, on
    /// the side of the frozen neighbour.
    pub fn fronts(&self) -> Fronts {
        let ground = self.ground();
        let freezes = |i: usize| self.cells[i].phase.freezes();
        // A cell above 0 °C holds no ice in any phase model: look for cells at or below
        // 0 °C first (a plain scan of the temperatures, from the bottom up).
        let mut end = ground.end;
        let deepest = loop {
            let below_zero = self.temperature[ground.start..end]
                .iter()
                .rposition(|&t| t <= 0.0);
            let Some(i) = below_zero.map(|j| ground.start + j) else {
                return Fronts::default();
            };
            if freezes(i) && self.frozen_fraction(i) > 1e-9 {
                break i;
            }
            end = i;
        };
        let c = &self.cells[deepest];
        let f = self.frozen_fraction(deepest).clamp(0.0, 1.0);
        let frost = c.top_m + f * c.dz_m;
        // Thaw from the top: the first freezable cell not fully frozen, above frozen ground.
        let mut thaw: f64 = 0.0;
        for i in (ground.start..=deepest).filter(|&i| freezes(i)) {
            let fi = self.frozen_fraction(i).clamp(0.0, 1.0);
            if fi >= 1.0 - 1e-9 {
                break;
            }
            let ci = &self.cells[i];
            if i == deepest {
                // The last frozen lens lies inside this one cell: its ice is taken to sit
                // just above the frost front, so the thaw front is the cell's top.
                thaw = ci.top_m;
                break;
            }
            thaw = ci.top_m + (1.0 - fi) * ci.dz_m;
            if fi > 1e-9 {
                break;
            }
        }
        // Frozen ground starting at the top of the first ground that can freeze (under a slab
        // or a board, say) has not thawed from above: nothing thawed, depth 0.
        let top_freezable = ground
            .clone()
            .find(|&i| freezes(i))
            .map_or(0.0, |i| self.cells[i].top_m);
        let thaw = if thaw <= top_freezable + 1e-12 {
            0.0
        } else {
            thaw.min(frost)
        };
        Fronts {
            frost_depth_m: frost,
            thaw_depth_m: thaw,
        }
    }

    /// Take every cell's half-cell resistance at the present state (a Picard update of k),
    /// then the face conductances. Only the cells in `k_unsure` can have a new k; every
    /// other cell is still on the stretch of constant k its held k was taken on, and
    /// evaluating it again would give the same bits.
    fn update_conductances(&mut self, top: &TopCondition, bottom: &BottomCondition) {
        let (lo, hi) = self.k_unsure;
        let mut changed = 0;
        for i in lo..hi {
            if self.stretch[i] != VARYING_K && self.stretch[i] == self.k_stretch[i] {
                continue;
            }
            let half = self.half_resistance(i);
            if half.to_bits() != self.k[i].to_bits() {
                self.k[i] = half;
                changed = i + 1;
            }
        }
        self.held_k_taken();
        self.face_conductances(top, bottom, changed);
    }

    /// Every cell in `k_unsure` has had its k taken at its present state: note the
    /// stretch it was taken on, and narrow `k_unsure` to the cells whose k varies with
    /// their state (the only ones now unsure).
    fn held_k_taken(&mut self) {
        let (lo, hi) = self.k_unsure;
        self.k_stretch[lo..hi].copy_from_slice(&self.stretch[lo..hi]);
        let varying = |&s: &u8| s == VARYING_K;
        self.k_unsure = match self.stretch[lo..hi].iter().position(varying) {
            Some(first) => {
                let last = self.stretch[lo..hi]
                    .iter()
                    .rposition(varying)
                    .unwrap_or(first);
                (lo + first, lo + last + 1)
            }
            None => (0, 0),
        };
    }

    /// At a step's start, the half-cell resistance, dT/dH and stretch of every cell whose
    /// enthalpy is not the one the last converged step left (a snow cell remapped, a state
    /// set from outside), then the face conductances. Every other cell keeps what the last
    /// step left: its state is unchanged, and so are they.
    fn conductances_at_step_start(&mut self, top: &TopCondition, bottom: &BottomCondition) {
        let n = self.cells.len();
        // Cells 0..changed have a new k (or were changed from outside).
        let mut changed = self.stale.min(n);
        for i in 0..n {
            if self.h_key[i] == self.enthalpy[i] {
                continue;
            }
            let phase = &self.cells[i].phase;
            let (h, t) = (self.enthalpy[i], self.temperature[i]);
            let slope = phase.dt_dh(h, t);
            if slope.to_bits() != self.slope[i].to_bits() {
                self.slope[i] = slope;
                self.rows_changed = self.rows_changed.max(i + 2);
            }
            let stretch = stretch_of(phase, h);
            self.stretch[i] = stretch;
            self.k_stretch[i] = stretch;
            self.rows[i].piece = BETWEEN;
            if stretch == VARYING_K {
                self.k_unsure = take_in(self.k_unsure, i);
            }
            let k = self.half_resistance(i);
            if k.to_bits() != self.k[i].to_bits() {
                self.k[i] = k;
                changed = changed.max(i + 1);
            }
        }
        self.stale = 0;
        self.face_conductances(top, bottom, changed);
    }

    /// Face conductances: the top and bottom faces, and the faces of cells 0..changed (the
    /// cells whose half-cell resistance may have changed; the other faces keep theirs,
    /// which computing them again would give bit for bit).
    fn face_conductances(&mut self, top: &TopCondition, bottom: &BottomCondition, changed: usize) {
        let n = self.cells.len();
        let top_g = match *top {
            TopCondition::Air {
                film_w_m2k,
                extra_resistance_m2k_w,
                ..
            } => 1.0 / (1.0 / film_w_m2k + extra_resistance_m2k_w + self.k[0]),
            TopCondition::Surface { .. } => 1.0 / self.k[0],
        };
        self.set_face(0, top_g);
        for i in 1..(changed + 1).min(n) {
            self.set_face(i, 1.0 / (self.k[i - 1] + self.k[i]));
        }
        let bottom_g = match bottom {
            BottomCondition::Temperature { .. } => 1.0 / self.k[n - 1],
            BottomCondition::Flux { .. } => 0.0,
        };
        self.set_face(n, bottom_g);
    }

    /// Set face i's conductance; where its bits change, the rows it enters (i − 1 and i)
    /// must be built again.
    fn set_face(&mut self, i: usize, g: f64) {
        if g.to_bits() != self.g[i].to_bits() {
            self.g[i] = g;
            self.rows_changed = self.rows_changed.max(i + 1);
        }
    }

    /// Whether the conductances held through the passes still match the current state to
    /// 1e-4 relative; if not, take the new ones (a Picard update of k) and say so. A cell
    /// changing phase changes its conductivity (ice conducts about four times better than
    /// water), so the step is not finished until k agrees with the state it produced.
    fn conductances_settled(&mut self, top: &TopCondition, bottom: &BottomCondition) -> bool {
        let (lo, hi) = self.k_unsure;
        let mut settled = true;
        for i in lo..hi {
            // Where k is one constant over a stretch of enthalpy and the cell has stayed on
            // it since k was taken, k is unchanged, bit for bit: no need to evaluate it.
            if self.stretch[i] != VARYING_K && self.stretch[i] == self.k_stretch[i] {
                self.k_state[i] = self.k[i];
                continue;
            }
            let half = self.half_resistance(i);
            self.k_state[i] = half;
            if (half - self.k[i]).abs() > 1e-4 * self.k[i] {
                settled = false;
                break;
            }
        }
        if !settled {
            self.update_conductances(top, bottom);
        }
        settled
    }

    /// End a converged step: book its energy with the conductances and temperatures it
    /// was solved with, key the state, then take k at the final state for the next step
    /// (the settled check left it in `k_state` for the cells in `k_unsure`; every other
    /// cell's held k is already that of its state).
    fn finish_step(
        &mut self,
        q_top: f64,
        q_bot: f64,
        dt: f64,
        top: &TopCondition,
        bottom: &BottomCondition,
    ) {
        self.book(q_top, q_bot, dt);
        self.h_key.copy_from_slice(&self.enthalpy);
        let (lo, hi) = self.k_unsure;
        let mut changed = 0;
        for i in lo..hi {
            if self.k_state[i].to_bits() != self.k[i].to_bits() {
                self.k[i] = self.k_state[i];
                changed = i + 1;
            }
        }
        self.held_k_taken();
        self.face_conductances(top, bottom, changed);
    }

    /// Half-cell resistance Δz/2k of cell i at its current state, m²K/W.
    fn half_resistance(&self, i: usize) -> f64 {
        let k = self.cells[i]
            .phase
            .conductivity(self.enthalpy[i], self.temperature[i]);
        0.5 * self.cells[i].dz_m / k
    }

    /// Record a converged step's face fluxes and the energy they carried in, and the flux
    /// into the ground and its surface temperature (extrapolated through the top ground
    /// cell's half-cell resistance).
    fn book(&mut self, q_top: f64, q_bot: f64, dt: f64) {
        self.last_top_flux_w_m2 = q_top;
        self.last_bottom_flux_w_m2 = q_bot;
        self.energy_in_j_m2 += (q_top + q_bot) * dt;
        let gi = self.snow_cells;
        let q_ground = if gi == 0 {
            q_top
        } else {
            self.g[gi] * (self.temperature[gi - 1] - self.temperature[gi])
        };
        self.last_ground_flux_w_m2 = q_ground;
        self.last_ground_surface_c = self.temperature[gi] + q_ground * self.k[gi];
    }

    /// Flux into the column through the top face, W/m², with its derivatives with respect
    /// to the top cell's temperature and enthalpy, and which piece of the flux law applies.
    ///
    /// Under snow the snow surface cannot be warmer than 0 °C: where the film and top half
    /// cell would put it above, the surface is held at 0 °C and the film brings
    /// q = (T_air − 0)/(1/h + R_extra) into the top cell, which melts (or, if colder, warms:
    /// meltwater refreezing inside). This is q = max(q₁, q_cap), q₁ the plain conduction
    /// through film and half cell: continuous and monotone in the cell's temperature. As
    /// the top cell's last ice melts ([`SNOW_MELT_OUT_SHARE`]) the held surface hands over
    /// linearly to q₁.
    fn top_flux(&self, top: &TopCondition) -> (f64, f64, f64, u8) {
        let g0 = self.g[0];
        match *top {
            TopCondition::Surface { surface_c } => {
                (g0 * (surface_c - self.temperature[0]), -g0, 0.0, 0)
            }
            TopCondition::Air {
                air_c,
                film_w_m2k,
                extra_resistance_m2k_w,
            } => {
                let q1 = g0 * (air_c - self.temperature[0]);
                if self.snow_cells == 0 {
                    return (q1, -g0, 0.0, 0);
                }
                let q_cap = air_c / (1.0 / film_w_m2k + extra_resistance_m2k_w);
                if q1 >= q_cap {
                    return (q1, -g0, 0.0, 0);
                }
                let latent = self.cells[0].phase.latent_j_m3();
                let h = self.enthalpy[0];
                let ramp = SNOW_MELT_OUT_SHARE * latent;
                if h <= latent - ramp {
                    (q_cap, 0.0, 0.0, 1)
                } else if h >= latent {
                    (q1, -g0, 0.0, 0)
                } else {
                    let w = (latent - h) / ramp;
                    (
                        q1 + w * (q_cap - q1),
                        -g0 * (1.0 - w),
                        -(q_cap - q1) / ramp,
                        2,
                    )
                }
            }
        }
    }

    /// Fluxes into the column through the top and bottom faces, W/m².
    fn fluxes(&self, top: &TopCondition, bottom: &BottomCondition) -> (f64, f64) {
        let n = self.cells.len();
        let q_top = self.top_flux(top).0;
        let q_bot = match *bottom {
            BottomCondition::Temperature { temperature_c } => {
                self.g[n] * (temperature_c - self.temperature[n - 1])
            }
            BottomCondition::Flux { upward_w_m2 } => upward_w_m2,
        };
        (q_top, q_bot)
    }

    /// Δz/Δt of every cell for a step of `dt` (kept while the step length and the cells
    /// stay the same), and whether the bottom row carries a face conductance; rows whose
    /// inputs change are marked to be built again.
    fn capacities(&mut self, dt: f64, bottom_row: bool) {
        let n = self.cells.len();
        let inv_dt = 1.0 / dt;
        let fresh = if dt.to_bits() == self.cap_dt.to_bits() {
            self.stale.min(n)
        } else {
            n
        };
        for i in 0..fresh {
            self.rows[i].cap = self.cells[i].dz_m * inv_dt;
        }
        self.cap_dt = dt;
        self.rows_changed = self.rows_changed.max(fresh);
        if bottom_row != self.bottom_row {
            self.bottom_row = bottom_row;
            self.rows_changed = n;
        }
    }

    /// One implicit step of length `dt` from the current state; on failure the state is
    /// restored and the residual returned.
    fn try_step(
        &mut self,
        dt: f64,
        top: &TopCondition,
        bottom: &BottomCondition,
    ) -> Result<usize, f64> {
        let n = self.cells.len();
        for (row, &h) in self.rows.iter_mut().zip(&self.enthalpy) {
            row.h_old = h;
        }
        let tol = self.tolerances.enthalpy_j_m3;
        let g_bottom_row = matches!(bottom, BottomCondition::Temperature { .. });
        let mut last_residual = f64::INFINITY;
        self.capacities(dt, g_bottom_row);
        // Conductivities are taken at the start of the step (lagged by one step) and held
        // through its passes; the fluxes booked use the same conductances, so energy is still
        // conserved exactly, and a pass in which no cell changes regime is exact.
        self.conductances_at_step_start(top, bottom);
        for iter in 0..=self.tolerances.max_iterations {
            // Newton: J δH = −R, with T linearised about the iterate (`slope` holds dT/dH
            // of the present state: set at the step's start, then by each update below).
            // The system is built and factorised first (only the rows that may have
            // changed since the last pass), so that the residual, computed from the
            // bottom row up, feeds the solve's upward sweep as it goes.
            let (q_top, q_bot) = self.fluxes(top, bottom);
            let (_, dq_dt, dq_dh, top_piece) = self.top_flux(top);
            let rows = self.rows_changed.clamp(1, n);
            {
                let (g, slope) = (&self.g[..n + 1], &self.slope[..n]);
                let (a, b, row) = (&mut self.a[..n], &mut self.b[..n], &mut self.rows[..n]);
                for i in 0..rows {
                    let g_up = g[i];
                    let g_dn = if i < n - 1 || g_bottom_row {
                        g[i + 1]
                    } else {
                        0.0
                    };
                    b[i] = row[i].cap + (g_up + g_dn) * slope[i];
                    a[i] = if i > 0 { -g[i] * slope[i - 1] } else { 0.0 };
                    row[i].c = if i < n - 1 {
                        -g[i + 1] * slope[i + 1]
                    } else {
                        0.0
                    };
                }
            }
            // The top row: the top flux's own derivatives (they differ from the face
            // conductance where the snow surface is held at 0 °C).
            self.b[0] += (-dq_dt - self.g[0]) * self.slope[0] - dq_dh;
            #[cfg(debug_assertions)]
            self.check_kept_rows(rows, g_bottom_row);
            factor(&mut self.rows, &self.a, &self.b, rows);
            self.rows_changed = 0;
            // Residual R_i = Δz (H − Hⁿ)/Δt − inflow, measured as an enthalpy error
            // |R_i| Δt/Δz (J/m³). −R_i is the right-hand side of row i: the loop runs from
            // the bottom row up and makes the solve's upward sweep with it, y_i =
            // (−R_i − c_i y_{i+1}) / d_i.
            let mut worst: f64 = 0.0;
            {
                // Slices of length n (n + 1 faces), so the loop runs without bounds checks.
                let (t, h) = (&self.temperature[..n], &self.enthalpy[..n]);
                let (g, row) = (&self.g[..n + 1], &mut self.rows[..n]);
                // Downward flux through the face below cell i, then above it: inflow from
                // below g_{i+1} (T_{i+1} − T_i) and from above g_i (T_{i−1} − T_i) are
                // −f_below and f_above, each face's flux computed once (and each cell's
                // temperature read once). The bottom row's c is +0, so its y is
                // (−R − 0·0)·(1/d), the same bits as −R·(1/d).
                let mut f_below = -q_bot;
                let mut y_below = 0.0;
                let mut t_here = t[n - 1];
                for i in (1..n).rev() {
                    let t_above = t[i - 1];
                    let f_above = g[i] * (t_above - t_here);
                    t_here = t_above;
                    let r = &mut row[i];
                    let res = r.cap * (h[i] - r.h_old) - (f_above - f_below);
                    measure_residual(&mut worst, res, r.cap, tol);
                    f_below = f_above;
                    y_below = (-res - r.c * y_below) * r.inv;
                    r.y = y_below;
                }
                let r = &mut row[0];
                let res = r.cap * (h[0] - r.h_old) - (q_top - f_below);
                measure_residual(&mut worst, res, r.cap, tol);
                r.y = (-res - r.c * y_below) * r.inv;
            }
            if !worst.is_finite() {
                break;
            }
            last_residual = worst;
            if worst <= tol {
                if !self.conductances_settled(top, bottom) {
                    // New conductances: measure the residual again before solving.
                    continue;
                }
                self.finish_step(q_top, q_bot, dt, top, bottom);
                return Ok(iter.max(1));
            }
            if iter == self.tolerances.max_iterations {
                break;
            }
            // Where T(H) has a kink (the edge of an unfrozen-water curve) a full Newton step
            // can cycle between two states; after a few passes, damp the step to break it.
            let damping = if iter < 12 { 1.0 } else { 0.5 };
            let mut same_regime = damping == 1.0;
            // The solve's downward sweep gives δH cell by cell, x_i = y_i − (a_i/d_i) x_{i−1}:
            // update the enthalpy, T, dT/dH and stretch; mark the rows whose slope changed
            // and the cells whose k may now differ from the held one.
            let mut slopes_changed = 0;
            let mut unsure = self.k_unsure;
            {
                let (cells, pieces) = (&self.cells[..n], &self.pieces[..n]);
                let row = &mut self.rows[..n];
                let (h, t, sl, st, k_st) = (
                    &mut self.enthalpy[..n],
                    &mut self.temperature[..n],
                    &mut self.slope[..n],
                    &mut self.stretch[..n],
                    &self.k_stretch[..n],
                );
                let mut dh = 0.0;
                for i in 0..n {
                    let r = &mut row[i];
                    dh = if i > 0 { r.y - r.ap * dh } else { r.y };
                    h[i] += damping * dh;
                    let (ti, slope, stretch, piece) = pieces[i].state(&cells[i].phase, h[i]);
                    t[i] = ti;
                    // A cell found on the same linear piece as before keeps its dT/dH and
                    // stretch, and so whether its k is unsure.
                    if piece == BETWEEN || piece != r.piece {
                        same_regime &= slope == sl[i];
                        if slope.to_bits() != sl[i].to_bits() {
                            slopes_changed = i + 2;
                        }
                        sl[i] = slope;
                        st[i] = stretch;
                        r.piece = piece;
                        if stretch == VARYING_K || stretch != k_st[i] {
                            unsure = take_in(unsure, i);
                        }
                    }
                }
            }
            self.rows_changed = slopes_changed;
            self.k_unsure = unsure;
            same_regime &= self.top_flux(top).3 == top_piece;
            // With conductances held, every cell's T(H) and the top flux on the same linear
            // piece, the Newton step solved the step's equations exactly (to round-off).
            if same_regime && self.linear_pieces && self.conductances_settled(top, bottom) {
                let (q_top, q_bot) = self.fluxes(top, bottom);
                self.finish_step(q_top, q_bot, dt, top, bottom);
                return Ok(iter + 1);
            }
        }
        for (h, row) in self.enthalpy.iter_mut().zip(&self.rows) {
            *h = row.h_old;
        }
        for i in 0..n {
            self.temperature[i] = self.cells[i].phase.temperature(self.enthalpy[i]);
        }
        self.h_key.fill(f64::NAN);
        Err(last_residual)
    }

    /// Debug builds: check that the rows of the system below `rows` (those not built
    /// again) and their factors are bit for bit what building and factorising them from
    /// the present Δz/Δt, conductances and slopes gives, and that every kept face
    /// conductance, stretch, piece and held k agrees with the state.
    #[cfg(debug_assertions)]
    fn check_kept_rows(&self, rows: usize, g_bottom_row: bool) {
        let n = self.cells.len();
        let (g, slope) = (&self.g, &self.slope);
        for i in rows.max(1)..n {
            let g_dn = if i < n - 1 || g_bottom_row {
                g[i + 1]
            } else {
                0.0
            };
            let b = self.rows[i].cap + (g[i] + g_dn) * slope[i];
            let a = -g[i] * slope[i - 1];
            let c = if i < n - 1 {
                -g[i + 1] * slope[i + 1]
            } else {
                0.0
            };
            assert_eq!(
                (a.to_bits(), b.to_bits(), c.to_bits()),
                (
                    self.a[i].to_bits(),
                    self.b[i].to_bits(),
                    self.rows[i].c.to_bits()
                ),
                "kept row {i} of {n}"
            );
            let below = if i + 1 < n {
                c * self.rows[i + 1].ap
            } else {
                0.0
            };
            let d = 1.0 / (b - below);
            assert_eq!(
                (d.to_bits(), (a * d).to_bits()),
                (self.rows[i].inv.to_bits(), self.rows[i].ap.to_bits()),
                "kept factors of row {i} of {n}"
            );
        }
        for (i, k) in self.k.windows(2).enumerate() {
            let face = 1.0 / (k[0] + k[1]);
            assert_eq!(face.to_bits(), g[i + 1].to_bits(), "kept face {}", i + 1);
        }
        let (lo, hi) = self.k_unsure;
        for i in 0..n {
            let p = &self.cells[i].phase;
            assert_eq!(self.pieces[i], Pieces::of(p), "pieces {i}");
            if self.rows[i].piece != BETWEEN {
                let (_, slope, stretch, piece) = self.pieces[i].state(p, self.enthalpy[i]);
                assert_eq!(
                    (piece, slope.to_bits(), stretch),
                    (self.rows[i].piece, self.slope[i].to_bits(), self.stretch[i]),
                    "piece {i}"
                );
            }
            assert_eq!(
                self.stretch[i],
                stretch_of(p, self.enthalpy[i]),
                "stretch {i}"
            );
            if self.stretch[i] != VARYING_K && self.stretch[i] == self.k_stretch[i] {
                assert_eq!(
                    self.k[i].to_bits(),
                    self.half_resistance(i).to_bits(),
                    "held k of cell {i}"
                );
            } else {
                assert!(lo <= i && i < hi, "cell {i} outside {lo}..{hi}");
            }
            assert_eq!(
                self.rows[i].cap.to_bits(),
                (self.cells[i].dz_m * (1.0 / self.cap_dt)).to_bits(),
                "cap {i}"
            );
        }
    }

    /// Advance by `dt` seconds with the conditions at the end of the step (implicit),
    /// splitting the step where the iteration does not converge.
    pub fn step(
        &mut self,
        dt: f64,
        top: &TopCondition,
        bottom: &BottomCondition,
    ) -> Result<(), TransientError> {
        self.step_split(dt, dt, top, bottom)
    }

    fn step_split(
        &mut self,
        dt: f64,
        dt_requested: f64,
        top: &TopCondition,
        bottom: &BottomCondition,
    ) -> Result<(), TransientError> {
        match self.try_step(dt, top, bottom) {
            Ok(iters) => {
                self.work.steps += 1;
                self.work.iterations += iters as u64;
                self.work.cell_updates += (iters * self.cells.len()) as u64;
                self.time_s += dt;
                Ok(())
            }
            Err(residual) => {
                if dt * 0.5 < dt_requested * self.tolerances.min_step_fraction {
                    return Err(TransientError::NoConvergence {
                        time_s: self.time_s,
                        dt_s: dt,
                        residual,
                    });
                }
                self.work.splits += 1;
                self.step_split(0.5 * dt, dt_requested, top, bottom)?;
                self.step_split(0.5 * dt, dt_requested, top, bottom)
            }
        }
    }
}

/// The range of cells lo..hi widened to take in cell i.
fn take_in((lo, hi): (usize, usize), i: usize) -> (usize, usize) {
    if lo >= hi {
        (i, i + 1)
    } else {
        (lo.min(i), hi.max(i + 1))
    }
}

/// Take a cell's residual `res` (J/m²/s; its cell's Δz/Δt is `cap`) into the worst
/// enthalpy error |R| Δt/Δz of a pass so far, compared with the tolerance without dividing;
/// a residual that is not finite makes it infinite.
#[inline(always)]
fn measure_residual(worst: &mut f64, res: f64, cap: f64, tol: f64) {
    if res.abs() > tol * cap {
        *worst = worst.max(res.abs() / cap);
    }
    if !res.is_finite() {
        *worst = f64::INFINITY;
    }
}

/// One row of a pass, side by side for the inner loops: what they read and write of row
/// i of the system and of cell i, besides the cell's enthalpy, temperature and phase. (Kept
/// together so that a loop reads one stream of memory; in wasm each separate array costs
/// an address computation of its own on every read.)
#[derive(Debug, Clone, Copy, PartialEq)]
struct Row {
    /// Δz/Δt of the cell for the step length `Solver::cap_dt`, m/s.
    cap: f64,
    /// The cell's enthalpy at the start of the step, J/m³.
    h_old: f64,
    /// The system's super-diagonal c_i, and the factors a_i/d_i and 1/d_i of the row
    /// (d_i its pivot; see [`factor`]).
    c: f64,
    ap: f64,
    inv: f64,
    /// The upward sweep's y_i = (r_i − c_i y_{i+1}) / d_i.
    y: f64,
    /// The linear piece of T(H) the cell's `slope` and `stretch` were set for
    /// ([`BETWEEN`]: none, or not known). A state found on the same piece again has the
    /// same dT/dH and stretch, bit for bit, so the update need not compare them.
    piece: u8,
}

impl Default for Row {
    fn default() -> Self {
        Row {
            cap: 0.0,
            h_old: 0.0,
            c: 0.0,
            ap: 0.0,
            inv: 0.0,
            y: 0.0,
            piece: BETWEEN,
        }
    }
}

/// Factorise rows 0..changed of the tridiagonal system a x_{i−1} + b x_i + c x_{i+1} = r
/// (c in `rows`) for the Thomas algorithm, eliminating from the bottom row up: row i's
/// factors depend only on rows i..n, so when the system differs from the one last
/// factorised only in its upper rows (the freezing front and the surface, while the deep
/// ground is unchanged), only those are factorised again, and the factors are bit for bit
/// those of a factorisation from scratch. The sweeps of the right-hand side then need no
/// division. Diagonally dominant here (Δz/Δt on the diagonal), so no pivoting is needed.
fn factor(rows: &mut [Row], a: &[f64], b: &[f64], changed: usize) {
    let n = rows.len();
    let (a, b) = (&a[..n], &b[..n]);
    // Rows changed-1 .. 0, bottom up.
    for i in (0..changed.min(n)).rev() {
        let below = if i + 1 < n {
            rows[i].c * rows[i + 1].ap
        } else {
            0.0
        };
        let d = 1.0 / (b[i] - below);
        rows[i].inv = d;
        rows[i].ap = a[i] * d;
    }
}

/// Cells for a resolved stack on a grid.
pub fn cells_for(
    thicknesses_m: &[f64],
    materials: &[Material],
    spec: &super::grid::GridSpec,
    curves: &[Option<super::phase::UnfrozenWater>],
) -> Vec<Cell> {
    let faces = super::grid::faces(thicknesses_m, spec);
    let mut cells = Vec::new();
    for (layer, f) in faces.iter().enumerate() {
        let m = &materials[layer];
        let curve = curves.get(layer).copied().flatten();
        for w in f.windows(2) {
            cells.push(Cell {
                top_m: w[0],
                dz_m: w[1] - w[0],
                layer,
                phase: Phase::for_material(m, curve),
            });
        }
    }
    cells
}

#[cfg(test)]
mod tests {
    use super::{factor, Row};

    fn residual(a: &[f64], b: &[f64], c: &[f64], r: &[f64], x: &[f64]) -> f64 {
        let n = b.len();
        (0..n)
            .map(|i| {
                let mut v = b[i] * x[i] - r[i];
                if i > 0 {
                    v += a[i] * x[i - 1];
                }
                if i + 1 < n {
                    v += c[i] * x[i + 1];
                }
                v.abs()
            })
            .fold(0.0, f64::max)
    }

    /// The solve the solver's passes make (fused there with the residual and the update),
    /// rows 0..changed factorised again.
    fn solve(
        rows: &mut [Row],
        a: &[f64],
        b: &[f64],
        c: &[f64],
        r: &[f64],
        changed: usize,
    ) -> Vec<f64> {
        let n = rows.len();
        for (row, &ci) in rows.iter_mut().zip(c) {
            row.c = ci;
        }
        factor(rows, a, b, changed);
        rows[n - 1].y = r[n - 1] * rows[n - 1].inv;
        for i in (0..n - 1).rev() {
            rows[i].y = (r[i] - c[i] * rows[i + 1].y) * rows[i].inv;
        }
        let mut x = vec![rows[0].y; n];
        for i in 1..n {
            x[i] = rows[i].y - rows[i].ap * x[i - 1];
        }
        x
    }

    #[test]
    fn reused_factors_solve_a_matrix_changed_in_its_upper_rows_exactly() {
        let n = 50;
        let mut a: Vec<f64> = (0..n).map(|i| -0.3 - 0.01 * i as f64).collect();
        let b: Vec<f64> = (0..n).map(|i| 2.0 + 0.02 * i as f64).collect();
        let c: Vec<f64> = (0..n).map(|i| -0.4 + 0.003 * i as f64).collect();
        let r: Vec<f64> = (0..n).map(|i| (i as f64).sin()).collect();
        a[0] = 0.0;
        let mut rows = vec![Row::default(); n];
        let x = solve(&mut rows, &a, &b, &c, &r, n);
        assert!(residual(&a, &b, &c, &r, &x) < 1e-13);
        // Change rows 3 and 7 only: the kept factors of rows 8.. are reused, and the answer
        // is bit for bit that of a factorisation of every row.
        let mut b2 = b.clone();
        b2[3] += 0.7;
        b2[7] -= 0.2;
        let x = solve(&mut rows, &a, &b2, &c, &r, 8);
        assert!(residual(&a, &b2, &c, &r, &x) < 1e-13);
        let scratch = solve(&mut vec![Row::default(); n], &a, &b2, &c, &r, n);
        assert_eq!(x, scratch);
        // Told too few rows (row 7 changed, rows 0..5 factorised again), the kept factors
        // of row 7 are stale and the answer is wrong: the count matters.
        let mut b3 = b2.clone();
        b3[7] += 1.0;
        let x = solve(&mut rows, &a, &b3, &c, &r, 5);
        assert!(residual(&a, &b3, &c, &r, &x) > 1e-6);
        let x = solve(&mut rows, &a, &b3, &c, &r, n);
        assert!(residual(&a, &b3, &c, &r, &x) < 1e-13);
    }
}
