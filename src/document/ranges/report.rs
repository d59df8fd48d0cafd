//! What a study gives ([`RangesReport`]): per result the base case, P10, P50 and P90,
//! mean, sd, min and max, the runs that succeeded and failed (the first
//! [`super::LISTED_FAILURES`] failures listed), the spread across the snow regressions with
//! every member and the ones skipped, the runs past a limit, and the one-at-a-time swings,
//! largest first; then every run's inputs and values, and the seed.

use super::DistributionDoc;
use crate::document::vocabulary::ErrorDoc;
use serde::Serialize;

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RangedInputReport {
    pub what: &'static str,
    pub name: String,
    pub quantity: &'static str,
    pub layer: Option<usize>,
    pub low: f64,
    pub high: f64,
    pub distribution: DistributionDoc,
    /// The scenario's own value (the base case), SI.
    pub base_value: Option<f64>,
}

/// One regression's value for the base case.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MemberDoc {
    pub id: &'static str,
    pub name: &'static str,
    /// The first author alone, for chart labels.
    pub short: &'static str,
    pub value: f64,
}

/// The spread across the snow regressions for the base case.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SpreadDoc {
    pub min: Option<f64>,
    pub max: Option<f64>,
    pub members: Vec<MemberDoc>,
    /// Regressions that gave no value (e.g. the density lies outside their fit).
    pub skipped: Vec<ErrorDoc>,
}

/// One input's swing in the one-at-a-time study.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SwingDoc {
    pub input: usize,
    pub what: &'static str,
    pub name: String,
    pub quantity: &'static str,
    pub low: f64,
    pub high: f64,
    pub at_low: Option<f64>,
    pub at_high: Option<f64>,
    /// |at_high − at_low|; None when an end failed.
    pub swing: Option<f64>,
    pub error: Option<String>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RangeResultReport {
    pub id: &'static str,
    pub name: &'static str,
    pub quantity: &'static str,
    /// The base case's value, SI.
    pub base: Option<f64>,
    pub base_error: Option<String>,
    pub p10: Option<f64>,
    pub p50: Option<f64>,
    pub p90: Option<f64>,
    pub mean: Option<f64>,
    pub sd: Option<f64>,
    pub min: Option<f64>,
    pub max: Option<f64>,
    pub runs_ok: usize,
    pub runs_failed: usize,
    /// The first failed runs (at most [`super::LISTED_FAILURES`]).
    pub failures: Vec<ErrorDoc>,
    /// Why there are no statistics (every run failed).
    pub error: Option<String>,
    /// None when the result's part of the scenario has no snow.
    pub spread: Option<SpreadDoc>,
    /// Largest swing first.
    pub sensitivity: Vec<SwingDoc>,
    /// For a result with a limit ([`super::RangeResult::limit`]): how many runs went past
    /// it.
    pub past_limit: Option<PastLimitDoc>,
}

/// How many Monte Carlo runs put a result past its limit (value > limit).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PastLimitDoc {
    /// The limit, SI (0: the footing's base, or no melt).
    pub limit: f64,
    /// What going past it means, e.g. "frost gets below the footing's base".
    pub meaning: &'static str,
    /// Runs past the limit, out of the runs that gave a value.
    pub runs: usize,
    pub of: usize,
    /// Whether the base case is past it.
    pub base_past: Option<bool>,
}

/// One Monte Carlo run: its inputs and its results (None where it failed).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TrialDoc {
    pub run: usize,
    pub inputs: Vec<f64>,
    pub values: Vec<Option<f64>>,
}

/// The report of a ranges study (SI).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RangesReport {
    pub runs: usize,
    pub seed: u64,
    pub sampler: &'static str,
    pub inputs: Vec<RangedInputReport>,
    pub results: Vec<RangeResultReport>,
    pub trials: Vec<TrialDoc>,
}
