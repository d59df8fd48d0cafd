//! Hibernal: heat flow through layered snow, ice, soil and insulation.
//!
//! The physics core ([`materials`], [`stack`], [`steady`], [`transient`], [`analytic`], [`shelter`],
//! [`climate`], [`design`], [`edge2d`], [`uncertainty`], [`units`]) knows nothing of the browser, of serde or of plotting. The edges
//! are: [`scenario`] (the versioned JSON document and the report, serde), [`chart`]
//! (plotters, generic over the drawing backend), [`climate_csv`] (daily climate records
//! from CSV text), [`climate_import`] (that record brought into a scenario, with its
//! winters' freezing indices and design values), the CLI in `src/bin`, and the wasm bindings in `web` (compiled for wasm32
//! only).

pub mod physics;

pub mod charts;
pub mod document;

#[cfg(target_arch = "wasm32")]
pub mod web;
