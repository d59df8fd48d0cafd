//! Transient 1D heat flow with freezing and thawing, through the layered stack.
//!
//! Method (finite volumes, fully implicit in time):
//! - The stack is cut into cells; every layer interface is a cell face, and cells are fine
//!   at the surface and grow with depth ([`grid`]).
//! - The unknown of each cell is its volumetric enthalpy H (J/m³), referred to fully frozen
//!   at 0 °C, so latent heat is part of the state and energy is conserved to round-off
//!   ([`phase`]). Water freezes at one temperature (free water, saturated coarse soil) or
//!   over a range given by an unfrozen-water curve (fine soils, Anderson & Tice 1972).
//! - Backward Euler: (H − Hⁿ) Δz/Δt = Σ faces G (T_neighbour − T), with T = T(H). Crank–
//!   Nicolson is not used: it overshoots at a freezing front.
//! - Each step is solved by a Newton iteration on H in which T is linearised about the
//!   current iterate, T(H^{k+1}) ≈ T(H^k) + (dT/dH)^k (H^{k+1} − H^k); the enthalpy, not the
//!   temperature, is updated, and T follows from H. This is the enthalpy form of the
//!   source-update scheme of Swaminathan & Voller 1992 (Metall. Trans. B 23:651–664): in a
//!   cell that is changing phase at one temperature dT/dH = 0 and the latent heat absorbs the
//!   imbalance, so the iteration needs a few passes per step, not tens. Each pass is one
//!   tridiagonal solve (Thomas algorithm) in preallocated buffers.
//! - Face conductances are harmonic means of the two half-cells, G = 1/(Δz₁/2k₁ + Δz₂/2k₂),
//!   so a layer interface on a face is exact for steady flux.
//! - Adaptive time step: a step whose iteration does not converge is split in halves, down
//!   to 1/1024 of the requested step; beyond that, [`TransientError::NoConvergence`] is
//!   returned — never a silent wrong answer.
//! - The frost front is read from the frozen fraction inside a cell, not from node
//!   temperatures alone ([`Solver::fronts`]).
//! - Snow on the ground is a stack of cells of its own above the ground cells, whose depth
//!   and density the climate prescribes ([`Solver::set_snow`]): they store heat and latent
//!   heat ([`phase::Phase::Snow`]), their surface cannot warm above 0 °C while they hold
//!   ice, and the energy that arrives or leaves with snow mass is booked in the energy
//!   ledger as a term of its own.
//!
//! Valid for conduction with phase change in a column: no water or vapour movement, no frost
//! heave, no snowmelt infiltration.
//!
//! Files: [`grid`] lays the cells out; [`phase`] is one cell's T(H) (`Phase::Inert`,
//! `Isothermal`, `Range` with an unfrozen-water curve, `Snow`); [`solver`] takes the steps
//! (the step in detail, the snow cells, and what keeps it fast); [`setup`] is what a run
//! needs besides the solver (the forcing, the top model, the start, the
//! [`setup::RunSpec`]); [`run`] drives a run a slice at a time and keeps what a builder
//! reads off; [`periodic`] is the periodic start; [`mod@reference`] is the invented year
//! the benchmarks run.

pub mod grid;
pub mod periodic;
pub mod phase;
pub mod reference;
pub mod run;
pub mod setup;
pub mod solver;

pub use solver::{
    cells_for, BottomCondition, Cell, Fronts, SnowLayer, Solver, Tolerances, TopCondition,
    TransientError, Work, MAX_SNOW_CELLS, SNOW_CELL_M, SNOW_LAYER, SNOW_MELT_OUT_SHARE,
    SNOW_MIN_DEPTH_M,
};
