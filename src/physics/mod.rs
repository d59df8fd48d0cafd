//! The physics core: materials, the steady and transient solvers (1D and the 2D building
//! edge), snow shelters, closed-form references and hand methods, climates, the search for
//! a least value, ranges of inputs, units and typed errors.
//!
//! **The core knows nothing of the file format, the charts or the browser.** It uses only
//! std, thiserror, libm (erf/erfc) and chrono (dates only), and everything in it is SI;
//! `tests/layers.rs` checks what it may not mention.

pub mod analytic;
pub mod climate;
pub mod edge2d;
pub mod error;
pub mod hand;
pub mod least;
pub mod materials;
pub mod ranges;
pub mod shelter;
pub mod stack;
pub mod steady;
pub mod transient;
pub mod units;
