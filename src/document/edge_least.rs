//! `edge.least`: the search for the least wing width, board R-value or
//! footing depth that keeps frost at or above the footing base through the edge's winter,
//! over the 2D solver ([`crate::physics::edge2d::least`]): its sliced job, for the page and
//! the CLI.
//!
//! ```json
//! "least": { "quantity": "wing-width", "min": 0.0, "max": 2.0, "resolution": 0.02 }
//! ```
//! Values in the quantity's SI unit: m for `wing-width` and `footing-depth`, m²K/W for
//! `wing-r` and `wall-board-r` (the R of the board as the run takes it, moisture derating
//! included: the board's thickness is varied at its derated conductivity).
//!
//! [`EdgeLeastJob`] (`new(&EdgeDoc)`, `advance`, `progress`, `report`) runs the core's
//! [`EdgeLeastSearch`] a slice at a time. The core already names the search's own fields
//! `edge.least.min`, `.max`, `.resolution`; the job moves a board's `….board.thickness_m`
//! to the document's `….thickness_m`. The document's part (`EdgeLeastDoc`) and report
//! (`EdgeLeastReport`: outcome, value, frost at it, slope, jump, bracket, every trial) live
//! in [`crate::document::edge`] with their section. [`run_edge_least`] runs one to its end:
//! [`crate::document::compute::compute_all`] puts it into `EdgeReport::least` when the
//! section asks; the page runs it on request through the wasm face.

use super::edge::EdgeLeastReport;
use crate::document::edge::EdgeDoc;
use crate::physics::edge2d::least::{EdgeLeastError, EdgeLeastSearch};
use crate::physics::error::{InputError, InputErrorKind, InputErrors};
use crate::physics::transient::run::Progress;

/// The core names a board's thickness `….board.thickness_m`; the scenario's field is
/// `….thickness_m`.
fn scenario_path(field: &str) -> String {
    field.replace(".board.thickness_m", ".thickness_m")
}

fn least_error(e: EdgeLeastError) -> InputErrors {
    match e {
        EdgeLeastError::Input(errs) => crate::document::edge::moved_by(errs, scenario_path),
        other => {
            InputError::new("edge.least", InputErrorKind::NotCovered(other.to_string())).into()
        }
    }
}

/// The search of an edge section under way, advanced a slice at a time (each trial a whole
/// winter of the section).
#[derive(Debug, Clone)]
pub struct EdgeLeastJob {
    job: EdgeLeastSearch,
}

impl EdgeLeastJob {
    /// Check the section and the search (every error at once, fields under `edge.`).
    pub fn new(doc: &EdgeDoc) -> Result<EdgeLeastJob, InputErrors> {
        let Some(d) = &doc.least else {
            return Err(InputError::new(
                "edge.least",
                InputErrorKind::NotCovered("the edge section asks for no search".into()),
            )
            .into());
        };
        let (section, climate) = doc.section_and_climate()?;
        let job = EdgeLeastSearch::new(
            &section,
            &climate,
            d.quantity.into(),
            d.min,
            d.max,
            d.resolution,
            "edge",
        )
        .map_err(least_error)?;
        Ok(EdgeLeastJob { job })
    }

    /// Advance by at most `max_steps` time steps; the share done and whether it has ended.
    pub fn advance(&mut self, max_steps: usize) -> Result<Progress, InputErrors> {
        self.job.advance(max_steps).map_err(least_error)
    }

    /// The share done and whether the search has ended.
    pub fn progress(&self) -> Progress {
        self.job.progress()
    }

    /// The report, once the search has ended.
    pub fn report(&self) -> Option<EdgeLeastReport> {
        self.job.report().as_ref().map(EdgeLeastReport::from)
    }
}

/// Run the search of `edge.least` to its end.
pub fn run_edge_least(doc: &EdgeDoc) -> Result<EdgeLeastReport, InputErrors> {
    let mut job = EdgeLeastJob::new(doc)?;
    while !job.advance(usize::MAX)?.finished {}
    job.report().ok_or_else(|| {
        InputError::new(
            "edge.least",
            InputErrorKind::NotCovered("the search ended without an answer".into()),
        )
        .into()
    })
}
