//! `edge.least` (edge module: serde): the search for the least wing width, board R-value or
//! footing depth that keeps frost at or above the footing base through the edge's winter,
//! over the 2D solver ([`crate::physics::edge2d::least`]); its sliced job for the page and its
//! report.
//!
//! ```json
//! "least": { "quantity": "wing-width", "min": 0.0, "max": 2.0, "resolution": 0.02 }
//! ```
//! Values in the quantity's SI unit: m for `wing-width` and `footing-depth`, m²K/W for
//! `wing-r` and `wall-board-r` (the R of the board as the run takes it, moisture derating
//! included: the board's thickness is varied at its derated conductivity).

use schemars::JsonSchema;
use serde::{Deserialize, Serialize};

use crate::physics::edge2d::least::{
    EdgeDesignError, EdgeDesignJob, EdgeDesignReport, EdgeQuantity, EdgeTrial,
};
use crate::physics::error::{InputError, InputErrorKind, InputErrors};
use crate::physics::transient::run::Progress;
use crate::scenario_edge::EdgeDoc;

/// What the search varies.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, JsonSchema)]
#[serde(rename_all = "kebab-case")]
pub enum EdgeQuantityDoc {
    /// The wing board's width out from the wall, m.
    WingWidth,
    /// The wing board's R-value, m²K/W.
    WingR,
    /// The R-value of the board against the wall, m²K/W.
    WallBoardR,
    /// The footing base's depth below grade, m.
    FootingDepth,
}

impl From<EdgeQuantityDoc> for EdgeQuantity {
    fn from(q: EdgeQuantityDoc) -> Self {
        match q {
            EdgeQuantityDoc::WingWidth => EdgeQuantity::WingWidth,
            EdgeQuantityDoc::WingR => EdgeQuantity::WingR,
            EdgeQuantityDoc::WallBoardR => EdgeQuantity::WallBoardR,
            EdgeQuantityDoc::FootingDepth => EdgeQuantity::FootingDepth,
        }
    }
}

/// `edge.least`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct EdgeLeastDoc {
    pub quantity: EdgeQuantityDoc,
    /// The least value to try (the quantity's SI unit).
    pub min: f64,
    /// The most to try.
    pub max: f64,
    /// The answer is found to within this.
    pub resolution: f64,
}

/// One run of the search, as reported.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct EdgeTrialDoc {
    pub value: f64,
    /// Deepest frost below the footing base in that run, m (≤ 0: frost stays above it).
    pub frost_below_base_m: f64,
}

impl From<&EdgeTrial> for EdgeTrialDoc {
    fn from(t: &EdgeTrial) -> Self {
        EdgeTrialDoc {
            value: t.value,
            frost_below_base_m: t.frost_below_base_m,
        }
    }
}

/// The search's report (SI; values in the quantity's unit).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct EdgeLeastReport {
    /// `wing-width`, `wing-r`, `wall-board-r` or `footing-depth`.
    pub quantity: &'static str,
    /// `m` or `m²K/W`.
    pub unit: &'static str,
    /// `found`, `smallest-suffices`, `not-reachable`, `not-monotone` or `run-limit`.
    pub outcome: &'static str,
    /// The least value that holds (found, run-limit) or the smallest of the range
    /// (smallest-suffices); absent otherwise.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub value: Option<f64>,
    /// Frost below the base at `value` (or in the last run), m.
    pub frost_below_base_m: f64,
    /// The sensitivity d(frost below base)/d(value) near the answer (m per unit; negative:
    /// more lifts the frost), from the failing side; absent with fewer than two failing runs.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub slope: Option<f64>,
    /// How far frost below base drops across the last bracket, m: the read-off jumps when
    /// the last frozen cell under the footing thaws.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub jump_m: Option<f64>,
    /// The last bracket: the largest failing and the smallest holding value.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub bracket: Option<[f64; 2]>,
    pub resolution: f64,
    pub trials: Vec<EdgeTrialDoc>,
}

impl From<&EdgeDesignReport> for EdgeLeastReport {
    fn from(r: &EdgeDesignReport) -> Self {
        EdgeLeastReport {
            quantity: r.quantity.id(),
            unit: r.quantity.unit(),
            outcome: r.outcome.id(),
            value: r.value,
            frost_below_base_m: r.frost_below_base_m,
            slope: r.slope,
            jump_m: r.jump_m,
            bracket: r.bracket.map(|(a, b)| [a, b]),
            resolution: r.resolution,
            trials: r.trials.iter().map(EdgeTrialDoc::from).collect(),
        }
    }
}

/// The core names the search's settings `edge.design.*` and a board's thickness
/// `….board.thickness_m`; the scenario's fields are `edge.least.*` and `….thickness_m`.
fn scenario_path(field: &str) -> String {
    field
        .replace("edge.design.", "edge.least.")
        .replace(".board.thickness_m", ".thickness_m")
}

fn design_error(e: EdgeDesignError) -> InputErrors {
    match e {
        EdgeDesignError::Input(errs) => crate::scenario_edge::moved_by(errs, scenario_path),
        other => {
            InputError::new("edge.least", InputErrorKind::NotCovered(other.to_string())).into()
        }
    }
}

/// The search of an edge section under way, advanced a slice at a time (each trial a whole
/// winter of the section).
#[derive(Debug, Clone)]
pub struct EdgeLeastJob {
    job: EdgeDesignJob,
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
        let job = EdgeDesignJob::new(
            &section,
            &climate,
            d.quantity.into(),
            d.min,
            d.max,
            d.resolution,
            "edge",
        )
        .map_err(design_error)?;
        Ok(EdgeLeastJob { job })
    }

    /// Advance by at most `max_steps` time steps; the share done and whether it has ended.
    pub fn advance(&mut self, max_steps: usize) -> Result<Progress, InputErrors> {
        self.job.advance(max_steps).map_err(design_error)
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
