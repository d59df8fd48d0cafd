//! Hibernal: heat flow through layered snow, ice, soil and insulation.
//!
//! Three layers, each depending only on those before it:
//!
//! - [`physics`]: the core. Materials, the steady and transient solvers, the building edge in
//!   2D, snow shelters, hand methods, climates, the least-value search, ranges of inputs,
//!   units and typed errors; SI throughout, and nothing of the file format, the charts or the
//!   browser.
//! - [`document`]: the scenario format (versioned JSON) and what runs its sections over the
//!   core, their reports and CSV files.
//! - [`charts`]: every chart, written once against plotters' generic backend; they read
//!   reports and plain data.
//!
//! Two faces use them: the wasm bindings in `web` (compiled for wasm32 only) and the CLI in
//! `src/bin`. `tests/layers.rs` checks that the dependencies point this way.

pub mod physics;

pub mod charts;
pub mod document;

#[cfg(target_arch = "wasm32")]
pub mod web;
