//! The least insulation at the edge: the least wing width, wing or wall-board R-value, or footing
//! depth for which frost stays at or above the footing's base through the winter, each trial
//! a whole 2D run of the section ([`super::run::EdgeRun`]).
//!
//! The search is the 1D one ([`crate::physics::least::Searcher`]: Illinois regula falsi on a
//! bracket with a bisection safeguard), fed with 2D runs: a trial's excess is the frost below
//! the footing's base ([`super::EdgeResult::max_frost_below_base_m`]), and the limit holds
//! when it is zero or less. The family is taken as monotone (more insulation, a wider wing
//! or a deeper base never lets frost reach further below the base: added resistance between
//! the cold surface and the ground under the footing, or a base moved below the ground that
//! freezes; a physical expectation, not a theorem of the discrete model), and the search
//! says so when its runs contradict it beyond [`crate::physics::least::MONOTONE_NOISE_M`] (the same
//! read-off allowance as the 1D search).
//!
//! Each trial re-lays the grid (a board face or the base is a cell face), and frost is read
//! as the deepest cell holding ice, so the frost below the base moves in steps of up to a
//! cell from trial to trial and can jump across the answer (a frozen pocket under the
//! footing vanishes, or the footing's lowest cell warms above 0 °C, at once): the search's
//! bisection safeguard handles that, and the report gives the jump beside the slope. The
//! benchmark grid reads the answer a few per cent short of a grid twice as fine (the
//! figures are in `MEASUREMENTS.md`): a design check should be repeated on a finer grid.
//!
//! **The search** ([`EdgeLeastSearch`]): [`EdgeQuantity::apply`] sets the quantity on the
//! section and checks it (how each quantity is varied, and when a trial runs without the
//! board or wing, is on its variant); `new` checks `{prefix}.least.min|max|resolution` (min
//! < max, 0 < resolution < max − min), the climate (`{prefix}.climate`) and the section at
//! both ends of the range; `advance(max_steps)` runs the current trial's [`EdgeRun`] a
//! slice at a time and starts the next one in the same call; `report`, `finish`, and
//! [`least_edge_value`] in one call. Trials keep only their first and last fields. At most
//! [`MAX_EDGE_RUNS`] runs (`set_max_runs` lowers it): a search stopped by the cap before
//! its bracket is within the resolution is [`EdgeOutcome::RunLimit`], with the holding end
//! as its value. The answer ([`EdgeLeastAnswer`]) gives the slope near it, the jump across
//! it and every trial; `under_scaled_winter(factor)` makes the same search under a design
//! winter with its freezing index scaled (0.9, 1.1: two more searches, on request).
//!
//! **Checks** (`tests/edge_least_search.rs`, on a coarse 10 cm grid with 2-day steps): runs
//! of their own at the answer and a resolution below it; a scan of footing depths;
//! orderings by the comparison principle (a warmer inside needs no wider wing and no deeper
//! footing, a harsher winter needs no less); the unheated footing depth against the
//! far-field frost; edge cases, errors and slicing (`slicing_changes_no_number`).
//!
//! Validity: that of the edge section (conduction with phase change, plane section, no
//! frost heave, no moisture movement). Engineering estimates only: buried boards lose part
//! of their R-value to moisture, frost heave is not modelled, and frost-protected shallow
//! foundations must follow the governing standard, local codes and a licensed engineer.

use super::run::{EdgeError, EdgeResult, EdgeRun};
use super::section::EdgeSection;
use crate::physics::climate::Climate;
use crate::physics::error::{InputError, InputErrorKind, InputErrors};
use crate::physics::least::{LeastAnswer, Search, Searcher, Trial};
use crate::physics::transient::run::Progress;

/// A wing narrower than this runs without the wing, m (the section's smallest wing width).
pub const MIN_WING_WIDTH_M: f64 = 0.05;

/// A board thinner than this (at its conductivity) runs without the board, m (the
/// section's thinnest board).
pub const MIN_BOARD_THICKNESS_M: f64 = 0.001;

/// At most this many runs in one search (each a whole winter in 2D: about 0.5 s natively
/// and 1 s as wasm on the benchmark grid; a setting of this tool). A search that reaches it
/// before its bracket is narrower than the resolution ends with [`EdgeOutcome::RunLimit`].
pub const MAX_EDGE_RUNS: usize = 16;

/// What the search varies.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum EdgeQuantity {
    /// The wing's width from the wall's outer face, m. Below [`MIN_WING_WIDTH_M`], or not
    /// reaching beyond the vertical board, the trial runs without a wing. The wing keeps its
    /// board and depth. The section must have a wing.
    WingWidth,
    /// The wing board's R-value, m²K/W: its thickness is varied at the board's
    /// conductivity (R = thickness / k; the top face stays at its depth, the board grows
    /// downwards). Below the R of [`MIN_BOARD_THICKNESS_M`] the trial runs without the
    /// wing. The section must have a wing.
    WingR,
    /// The vertical board's R-value, m²K/W: its thickness is varied at the board's
    /// conductivity (it grows outwards from the wall). Below the R of
    /// [`MIN_BOARD_THICKNESS_M`] the trial runs without the board. The section must have a
    /// vertical board.
    WallBoardR,
    /// The footing's base depth below grade, m. A vertical board that reached the old base
    /// follows it; the limit (the base) moves with it.
    FootingDepth,
}

impl EdgeQuantity {
    pub const ALL: [EdgeQuantity; 4] = [
        EdgeQuantity::WingWidth,
        EdgeQuantity::WingR,
        EdgeQuantity::WallBoardR,
        EdgeQuantity::FootingDepth,
    ];

    /// A stable id.
    pub fn id(self) -> &'static str {
        match self {
            EdgeQuantity::WingWidth => "wing-width",
            EdgeQuantity::WingR => "wing-r",
            EdgeQuantity::WallBoardR => "wall-board-r",
            EdgeQuantity::FootingDepth => "footing-depth",
        }
    }

    /// The unit of the value (SI).
    pub fn unit(self) -> &'static str {
        match self {
            EdgeQuantity::WingWidth | EdgeQuantity::FootingDepth => "m",
            EdgeQuantity::WingR | EdgeQuantity::WallBoardR => "m²K/W",
        }
    }

    /// The section's field the quantity sets, under `prefix` (`edge.wing.width_m`).
    pub fn field(self, prefix: &str) -> String {
        match self {
            EdgeQuantity::WingWidth => format!("{prefix}.wing.width_m"),
            EdgeQuantity::WingR => format!("{prefix}.wing.board.thickness_m"),
            EdgeQuantity::WallBoardR => format!("{prefix}.wall_board.board.thickness_m"),
            EdgeQuantity::FootingDepth => format!("{prefix}.wall.base_depth_m"),
        }
    }

    /// `section` with the quantity set to `value`, checked (every field named under
    /// `prefix`, as [`EdgeSection::validate`] names them). A wing quantity on a section
    /// without a wing is refused naming `{prefix}.wing`, a vertical board's without one
    /// `{prefix}.wall_board`.
    pub fn apply(
        self,
        section: &EdgeSection,
        value: f64,
        prefix: &str,
    ) -> Result<EdgeSection, InputErrors> {
        let field = self.field(prefix);
        if !value.is_finite() {
            return Err(InputError::new(field, InputErrorKind::NotFinite).into());
        }
        if value < 0.0 {
            return Err(InputError::new(field, InputErrorKind::Negative { value }).into());
        }
        let mut s = section.clone();
        let missing = |part: &str, what: &str| -> InputErrors {
            InputError::new(
                format!("{prefix}.{part}"),
                InputErrorKind::NotCovered(format!(
                    "the section has no {what} whose {} could be varied",
                    self.id()
                )),
            )
            .into()
        };
        match self {
            EdgeQuantity::WingWidth => {
                let Some(w) = s.wing.as_mut() else {
                    return Err(missing("wing", "wing"));
                };
                let board = s.wall_board.map_or(0.0, |b| b.board.thickness_m);
                if value < MIN_WING_WIDTH_M || value <= board {
                    s.wing = None;
                } else {
                    w.width_m = value;
                }
            }
            EdgeQuantity::WingR => {
                let Some(w) = s.wing.as_mut() else {
                    return Err(missing("wing", "wing"));
                };
                let t = value * w.board.conductivity_w_m_k;
                if t < MIN_BOARD_THICKNESS_M {
                    s.wing = None;
                } else {
                    w.board.thickness_m = t;
                }
            }
            EdgeQuantity::WallBoardR => {
                let Some(b) = s.wall_board.as_mut() else {
                    return Err(missing("wall_board", "vertical board"));
                };
                let t = value * b.board.conductivity_w_m_k;
                if t < MIN_BOARD_THICKNESS_M {
                    s.wall_board = None;
                } else {
                    b.board.thickness_m = t;
                }
            }
            EdgeQuantity::FootingDepth => {
                let old = s.wall.base_depth_m;
                s.wall.base_depth_m = value;
                if let Some(b) = s.wall_board.as_mut() {
                    if b.depth_m >= old - 1e-9 {
                        b.depth_m = value;
                    }
                }
            }
        }
        s.validate(prefix)?;
        Ok(s)
    }
}

/// One run of the search, as reported.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EdgeTrial {
    /// The quantity's value, in its unit.
    pub value: f64,
    /// The run's deepest frost below the footing's base, m (≤ 0: the limit holds).
    pub frost_below_base_m: f64,
}

/// How a search ended (the kinds of [`LeastAnswer`], and the run cap).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EdgeOutcome {
    /// The least value, to the resolution: a run at it holds the limit, and a run at the
    /// failing end of the last bracket (within the resolution below it) does not.
    Found,
    /// The smallest value of the range already holds the limit.
    SmallestSuffices,
    /// Even the largest value of the range lets frost below the base.
    NotReachable,
    /// Frost went deeper with more of the quantity between two runs: no least value.
    NotMonotone,
    /// [`MAX_EDGE_RUNS`] (or the job's own cap) runs were done before the bracket was
    /// narrower than the resolution: the value given holds the limit, but a smaller one
    /// (down to the bracket's failing end) might too.
    RunLimit,
}

impl EdgeOutcome {
    pub fn id(self) -> &'static str {
        match self {
            EdgeOutcome::Found => "found",
            EdgeOutcome::SmallestSuffices => "smallest-suffices",
            EdgeOutcome::NotReachable => "not-reachable",
            EdgeOutcome::NotMonotone => "not-monotone",
            EdgeOutcome::RunLimit => "run-limit",
        }
    }
}

/// The search's report (SI).
#[derive(Debug, Clone, PartialEq)]
pub struct EdgeLeastAnswer {
    pub quantity: EdgeQuantity,
    pub outcome: EdgeOutcome,
    /// The least value that holds the limit (`Found`, `RunLimit`), or the range's smallest
    /// (`SmallestSuffices`); `None` otherwise.
    pub value: Option<f64>,
    /// Frost below the base at `value` (or, without one, in the last run), m.
    pub frost_below_base_m: f64,
    /// The sensitivity d(frost below base)/d(value) at the answer, m per unit of the value
    /// (negative: more of the quantity lifts frost): the secant of the two runs nearest the
    /// answer on its failing side, where frost is read below the base and moves smoothly
    /// with the value. `None` with fewer than two failing runs. Its inverse is how much more
    /// of the quantity each metre of frost to lift would need.
    pub slope: Option<f64>,
    /// Frost below base at the bracket's failing end minus at the answer, m. The read-off
    /// is not continuous across the answer: when the last frozen cell under the footing
    /// thaws, or the footing's lowest cell warms above 0 °C, it drops by up to a cell or to
    /// −base at once; a jump much larger than |slope| × resolution says so.
    pub jump_m: Option<f64>,
    /// The last bracket: the largest failing and the smallest holding value.
    pub bracket: Option<(f64, f64)>,
    pub resolution: f64,
    /// Every run, in the order run.
    pub trials: Vec<EdgeTrial>,
}

/// Why a search could not start or go on.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum EdgeLeastError {
    /// Bad settings or a section the quantity cannot vary (fields named).
    #[error("{0}")]
    Input(InputErrors),
    /// A trial's run failed.
    #[error("the run with {value} failed: {error}")]
    Run { value: f64, error: EdgeError },
}

impl From<InputErrors> for EdgeLeastError {
    fn from(e: InputErrors) -> Self {
        EdgeLeastError::Input(e)
    }
}

/// A search under way, advanced a slice at a time; each trial is a whole 2D run.
#[derive(Debug, Clone)]
pub struct EdgeLeastSearch {
    section: EdgeSection,
    climate: Climate,
    quantity: EdgeQuantity,
    prefix: String,
    min: f64,
    max: f64,
    resolution: f64,
    max_runs: usize,
    expected_runs: usize,
    searcher: Searcher,
    /// The trial under way: its value, its footing's base depth, its run.
    current: Option<(f64, f64, EdgeRun)>,
    fraction: f64,
}

/// Runs a bisection of `[min, max]` down to `resolution` would take, the two ends included
/// (the regula falsi usually needs fewer): the job's estimate of its length.
fn bisection_runs(min: f64, max: f64, resolution: f64) -> usize {
    2 + ((max - min) / resolution).log2().ceil().max(0.0) as usize
}

impl EdgeLeastSearch {
    /// Check the settings (`{prefix}.least.min`, `.max`, `.resolution`), the section with the
    /// quantity at both ends of the range (the section's fields under `prefix`) and the
    /// climate (under `{prefix}.climate`), and set up. `min < max`, `resolution > 0` and
    /// smaller than the range.
    pub fn new(
        section: &EdgeSection,
        climate: &Climate,
        quantity: EdgeQuantity,
        min: f64,
        max: f64,
        resolution: f64,
        prefix: &str,
    ) -> Result<EdgeLeastSearch, EdgeLeastError> {
        let mut errs = InputErrors::default();
        let f = |k: &str| format!("{prefix}.least.{k}");
        let mut ok = true;
        for (k, v) in [("min", min), ("max", max)] {
            if !v.is_finite() {
                errs.push(f(k), InputErrorKind::NotFinite);
                ok = false;
            } else if v < 0.0 {
                errs.push(f(k), InputErrorKind::Negative { value: v });
                ok = false;
            }
        }
        if !resolution.is_finite() {
            errs.push(f("resolution"), InputErrorKind::NotFinite);
            ok = false;
        } else if resolution <= 0.0 {
            errs.push(
                f("resolution"),
                InputErrorKind::NotPositive { value: resolution },
            );
            ok = false;
        }
        if ok && max <= min {
            errs.push(
                f("max"),
                InputErrorKind::NotCovered(
                    "the largest value must exceed the smallest".to_string(),
                ),
            );
            ok = false;
        }
        if ok && resolution >= max - min {
            errs.push(
                f("resolution"),
                InputErrorKind::NotCovered(
                    "the resolution must be smaller than the range searched".to_string(),
                ),
            );
            ok = false;
        }
        if let Err(e) = climate.validate(&format!("{prefix}.climate")) {
            errs.0.extend(e.0);
        }
        if ok {
            // Both ends must make a valid section: refuse now, naming the section's field,
            // rather than after runs.
            for v in [min, max] {
                if let Err(e) = quantity.apply(section, v, prefix) {
                    for x in e.0 {
                        if !errs.0.contains(&x) {
                            errs.0.push(x);
                        }
                    }
                }
            }
        }
        errs.into_result()?;
        let mut section = section.clone();
        // The search reads only the records: keep the fields at the start and the end.
        section.field_every_s = section.duration_s;
        let max_runs = MAX_EDGE_RUNS;
        Ok(EdgeLeastSearch {
            section,
            climate: climate.clone(),
            quantity,
            prefix: prefix.to_string(),
            min,
            max,
            resolution,
            max_runs,
            expected_runs: bisection_runs(min, max, resolution).min(max_runs),
            searcher: Searcher::new(Search {
                lo: min,
                hi: max,
                tolerance: resolution,
                max_runs,
            }),
            current: None,
            fraction: 0.0,
        })
    }

    /// Cap the runs lower than [`MAX_EDGE_RUNS`] (at least 2; only before the first slice).
    pub fn set_max_runs(&mut self, n: usize) {
        if self.searcher.trials().is_empty() && self.current.is_none() {
            self.max_runs = n.clamp(2, MAX_EDGE_RUNS);
            self.expected_runs =
                bisection_runs(self.min, self.max, self.resolution).min(self.max_runs);
            self.searcher = Searcher::new(Search {
                lo: self.min,
                hi: self.max,
                tolerance: self.resolution,
                max_runs: self.max_runs,
            });
        }
    }

    pub fn quantity(&self) -> EdgeQuantity {
        self.quantity
    }

    /// The runs done so far.
    pub fn trials(&self) -> Vec<EdgeTrial> {
        self.searcher.trials().iter().map(edge_trial).collect()
    }

    /// Run at most `max_steps` more time steps: the current trial's run a slice at a time;
    /// a finished run is handed to the search and the next trial starts in the same call.
    /// The fraction is the runs done (the current one in part) over the runs a bisection
    /// would take, never decreasing, 1 only at the end.
    pub fn advance(&mut self, max_steps: usize) -> Result<Progress, EdgeLeastError> {
        let mut budget = max_steps;
        while budget > 0 {
            if self.current.is_none() {
                let Some(x) = self.searcher.next_value() else {
                    break;
                };
                let s = self.quantity.apply(&self.section, x, &self.prefix)?;
                let r = EdgeRun::new(&s, &self.prefix)
                    .map_err(|error| EdgeLeastError::Run { value: x, error })?;
                self.current = Some((x, s.wall.base_depth_m, r));
            }
            let Some((x, base, r)) = self.current.as_mut() else {
                break;
            };
            let (x, base) = (*x, *base);
            // One step per call, so that a run ending inside the slice leaves the rest of
            // the budget to the next trial.
            let p = r
                .advance(&self.climate, 1)
                .map_err(|error| EdgeLeastError::Run { value: x, error })?;
            budget -= 1;
            if p.finished {
                if let Some((_, _, r)) = self.current.take() {
                    self.searcher.record(trial_of(x, base, &r.finish()));
                }
            }
        }
        self.update_progress();
        Ok(self.progress())
    }

    /// How far the search has got (see [`EdgeLeastSearch::advance`]).
    pub fn progress(&self) -> Progress {
        Progress {
            fraction: self.fraction,
            finished: self.searcher.answer().is_some(),
        }
    }

    fn update_progress(&mut self) {
        let finished = self.searcher.answer().is_some();
        let done = self.searcher.trials().len();
        let part = self
            .current
            .as_ref()
            .map_or(0.0, |(_, _, r)| r.progress().fraction);
        let expected = self.expected_runs.max(done + 1) as f64;
        let f = if finished {
            1.0
        } else {
            ((done as f64 + part) / expected).min(0.99)
        };
        self.fraction = self.fraction.max(f);
    }

    /// The report, once the search has ended (`None` before).
    pub fn report(&self) -> Option<EdgeLeastAnswer> {
        let answer = self.searcher.answer()?;
        let trials = self.trials();
        let last = trials.last().copied().unwrap_or(EdgeTrial {
            value: self.min,
            frost_below_base_m: 0.0,
        });
        let base = |outcome, value, frost_below_base_m, slope, jump_m, bracket| EdgeLeastAnswer {
            quantity: self.quantity,
            outcome,
            value,
            frost_below_base_m,
            slope,
            jump_m,
            bracket,
            resolution: self.resolution,
            trials: trials.clone(),
        };
        Some(match answer {
            LeastAnswer::Found {
                value,
                frost_depth_m,
                limit_m,
                trials: t,
                ..
            } => {
                // The last bracket: the largest failing and the smallest holding value.
                let mut failing: Vec<&Trial> = t.iter().filter(|t| t.excess_m() > 0.0).collect();
                failing.sort_by(|a, b| b.value.total_cmp(&a.value));
                let fail = failing.first().map_or(f64::NEG_INFINITY, |t| t.value);
                let below = frost_depth_m - limit_m;
                // Neighbours on the search's grid (lo + k·resolution) may differ by the
                // resolution and a rounding error.
                let outcome = if *value - fail > self.resolution * (1.0 + 1e-9) {
                    EdgeOutcome::RunLimit
                } else {
                    EdgeOutcome::Found
                };
                // The slope on the failing side, where frost is read below the base and
                // moves with the value (across the answer it may jump).
                let slope = match failing.as_slice() {
                    [a, b, ..] if a.value > b.value => {
                        Some((a.excess_m() - b.excess_m()) / (a.value - b.value))
                    }
                    _ => None,
                };
                let jump = failing.first().map(|a| a.excess_m() - below);
                base(
                    outcome,
                    Some(*value),
                    below,
                    slope,
                    jump,
                    fail.is_finite().then_some((fail, *value)),
                )
            }
            LeastAnswer::SmallestSuffices { trial } => base(
                EdgeOutcome::SmallestSuffices,
                Some(trial.value),
                trial.excess_m(),
                None,
                None,
                None,
            ),
            LeastAnswer::NotReachable { trial } => base(
                EdgeOutcome::NotReachable,
                None,
                trial.excess_m(),
                None,
                None,
                None,
            ),
            LeastAnswer::NotMonotone { .. } => base(
                EdgeOutcome::NotMonotone,
                None,
                last.frost_below_base_m,
                None,
                None,
                None,
            ),
        })
    }

    /// A fresh job for the same search under the design winter with its freezing index
    /// scaled by `factor` (e.g. 0.9 and 1.1: how the answer moves with a winter 10 % milder
    /// or harsher; each such job is a whole search). The season's length and the mean
    /// annual temperature stay; only a [`Climate::DesignWinter`] can be scaled (otherwise a
    /// typed error naming `{prefix}.climate`), and the scaled winter must still be valid
    /// (its warm part must not freeze: M ≥ −F/365).
    pub fn under_scaled_winter(&self, factor: f64) -> Result<EdgeLeastSearch, EdgeLeastError> {
        let field = format!("{}.climate", self.prefix);
        let Climate::DesignWinter {
            freezing_index_c_days,
            season_days,
            mean_annual_c,
            snow,
        } = &self.climate
        else {
            return Err(InputErrors::from(InputError::new(
                field,
                InputErrorKind::NotCovered(
                    "only a design winter's freezing index can be scaled".to_string(),
                ),
            ))
            .into());
        };
        if !(factor.is_finite() && factor > 0.0) {
            return Err(InputErrors::from(InputError::new(
                format!("{field}.freezing_index_c_days"),
                InputErrorKind::NotPositive { value: factor },
            ))
            .into());
        }
        let climate = Climate::DesignWinter {
            freezing_index_c_days: freezing_index_c_days * factor,
            season_days: *season_days,
            mean_annual_c: *mean_annual_c,
            snow: *snow,
        };
        let mut job = EdgeLeastSearch::new(
            &self.section,
            &climate,
            self.quantity,
            self.min,
            self.max,
            self.resolution,
            &self.prefix,
        )?;
        job.set_max_runs(self.max_runs);
        Ok(job)
    }

    /// Drive the job to its end and report.
    pub fn finish(mut self) -> Result<EdgeLeastAnswer, EdgeLeastError> {
        while !self.advance(usize::MAX)?.finished {}
        self.report().ok_or_else(|| {
            EdgeLeastError::Input(
                InputError::new(
                    format!("{}.least", self.prefix),
                    InputErrorKind::NotCovered("the search ended without an answer".into()),
                )
                .into(),
            )
        })
    }
}

/// The trial the search sees: frost depth (base + frost below it) against the base, so its
/// excess is the frost below the base.
fn trial_of(value: f64, base_m: f64, r: &EdgeResult) -> Trial {
    Trial {
        value,
        frost_depth_m: base_m + r.max_frost_below_base_m,
        limit_m: base_m,
    }
}

fn edge_trial(t: &Trial) -> EdgeTrial {
    EdgeTrial {
        value: t.value,
        frost_below_base_m: t.excess_m(),
    }
}

/// The least value of `quantity` in `[min, max]` (to `resolution`) for which frost stays at
/// or above the footing's base through the run of `section` under `climate`:
/// [`EdgeLeastSearch`] driven to its end in one call.
pub fn least_edge_value(
    section: &EdgeSection,
    climate: &Climate,
    quantity: EdgeQuantity,
    min: f64,
    max: f64,
    resolution: f64,
    prefix: &str,
) -> Result<EdgeLeastAnswer, EdgeLeastError> {
    EdgeLeastSearch::new(section, climate, quantity, min, max, resolution, prefix)?.finish()
}
