//! The scenario document: the versioned JSON format (serde and a JSON Schema), its checks
//! with field paths, the runs of its sections over the physics core, and their reports and
//! CSV files. Serialisable mirrors of the core's types live here, never in the core.

pub mod climate_csv;
pub mod climate_import;
pub mod compute;
pub mod defaults;
pub mod edge;
pub mod edge_least;
pub mod examples;
pub mod ranges;
pub mod scenario;
pub mod shelter;
pub mod steady;
pub mod vocabulary;
pub mod weather;
pub mod winter;
pub mod winter_least;
