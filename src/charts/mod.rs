//! Charts, written once against plotters' generic [`plotters::prelude::DrawingBackend`]: the
//! page draws them on its canvas (plotters-canvas), the CLI and the tests to SVG. One file
//! per chart family over one frame helper ([`frame`]: errors, scale, palette, ticks, legend,
//! SVG output). Charts read reports and plain data; nothing in the document or the physics
//! reads them back.

pub mod edge;
pub mod field;
pub mod frame;
pub mod profile;
pub mod ranges;
pub mod shelter;
pub mod winter;
