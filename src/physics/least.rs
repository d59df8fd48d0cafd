//! The search for a least value: the least value of a quantity (a board's thickness, a soil
//! cover) that keeps frost above a given depth through a winter.
//!
//! The question is a root of g(x) = frost(x) − target(x) ≤ 0 over a monotone family of
//! runs: more insulation or more cover never lets frost reach deeper below its target
//! (Fourier's law: added resistance above the frozen zone lowers the heat drawn out of the
//! ground; a physical property, not a theorem of the discrete model, so the search checks
//! the sign change it relies on and says so when it is missing). The search is a bracketed
//! regula falsi with the Illinois modification (Dowell & Jarratt 1971): superlinear on a
//! smooth g, never leaving the bracket, with a bisection whenever two runs in a row move
//! the same end (so a g that jumps costs about what bisection costs), and ended by a width
//! tolerance. The answer is the
//! bracket's safe end, which is checked to meet the target by a run of its own.
//!
//! The frost depth read from a run moves in small steps when a layer's thickness moves the
//! grid's faces (cells are re-laid for each run); the tolerance should be above that noise
//! (millimetres for centimetre cells).
//!
//! Every value tried lies on a grid, `lo + k·tolerance` (or is `hi`): the secant or
//! bisection point is moved to the nearest step strictly inside the bracket, and the
//! search ends when the bracket's ends are neighbours on it. Round `lo` and `tolerance` in
//! the units the values are read in give round values tried.
//!
//! The search is a stepper, [`Searcher`] (ask it for the next value, run it, hand the trial
//! back), so a sliced job can run each trial a slice at a time; [`least_value`] drives it
//! in one call. Its answer is a [`LeastAnswer`]: `Found` (the value, the frost and limit at
//! it, every trial, and the slope d(frost − limit)/d(value) near it), `SmallestSuffices`,
//! `NotReachable` or `NotMonotone`. [`least_layer_thickness`] runs it over 1D winter runs
//! of a column, with the limit at a depth or at the bottom of a layer ([`FrostLimit`]: a
//! pipe under a cover); a trial thinner than [`MIN_LAYER_M`] runs without the layer. Each
//! trial is a whole run, so the 2D edge's search uses the same stepper over 2D runs.

use crate::physics::transient::run::run;
use crate::physics::transient::setup::{Forcing, RunSpec};
use crate::physics::transient::TransientError;

/// How far outside its bracket a trial's excess may fall before the family is declared
/// not monotone, m: the read-off noise of the frost depth when cells are re-laid (a setting
/// of this tool, no source).
pub const MONOTONE_NOISE_M: f64 = 1e-3;

/// Where frost must stay above.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum FrostLimit {
    /// A fixed depth below the top face, m (a pipe, a footing base at a set depth).
    Depth(f64),
    /// The bottom face of a layer (index into the stack): what lies below it (a pipe under
    /// a soil cover) must not freeze; the limit moves with the thickness of the layers
    /// above it.
    BottomOfLayer(usize),
}

/// One run of the search.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Trial {
    /// The design value, in the design quantity's unit (m for a thickness).
    pub value: f64,
    /// The deepest frost of the run, m below the top face.
    pub frost_depth_m: f64,
    /// The limit for this value, m below the top face.
    pub limit_m: f64,
}

impl Trial {
    /// Frost minus limit, m: ≤ 0 when the limit holds.
    pub fn excess_m(&self) -> f64 {
        self.frost_depth_m - self.limit_m
    }
}

/// The outcome of a search.
#[derive(Debug, Clone, PartialEq)]
pub enum LeastAnswer {
    /// The least value found (within the tolerance: `value − tolerance` does not hold the
    /// limit, `value` does), with the runs that led there and the answer's sensitivity.
    Found {
        value: f64,
        frost_depth_m: f64,
        limit_m: f64,
        /// d(frost − limit)/d(value) near the answer, from the last bracket (m per unit of
        /// the value; negative: more of the quantity lifts the frost). Its inverse is how
        /// much more of the quantity each metre the limit moves up would need.
        slope: f64,
        trials: Vec<Trial>,
    },
    /// Even the smallest value of the range holds the limit: nothing more is needed.
    SmallestSuffices { trial: Trial },
    /// Even the largest value of the range lets frost below the limit.
    NotReachable { trial: Trial },
    /// The search found frost reaching deeper with more of the quantity between two of its
    /// runs (the family is not monotone here): no least value can be named.
    NotMonotone { trials: Vec<Trial> },
}

/// Search settings.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Search {
    pub lo: f64,
    pub hi: f64,
    /// The step of the values tried (in the value's unit): every trial but `hi` is
    /// `lo + k·tolerance`, so a search from a round `lo` in round steps tries round values
    /// (a board in 1/2 in steps, a wing in 6 in steps); the search stops when no step is
    /// left inside the bracket, so its answer is within this of the least value.
    pub tolerance: f64,
    /// At most this many runs in all (the two ends included).
    pub max_runs: usize,
}

/// The search as a stepper: ask it for the next value to run (`next_value`), run it,
/// hand the trial back (`record`), until it gives its answer. The page drives it a run at
/// a time (each run in slices); [`least_value`] drives it in one call.
#[derive(Debug, Clone)]
pub struct Searcher {
    search: Search,
    trials: Vec<Trial>,
    /// The failing and holding ends, and the Illinois weights of their excesses.
    a: Option<Trial>,
    b: Option<Trial>,
    ga: f64,
    gb: f64,
    side: i8,
    pending: Option<f64>,
    answer: Option<LeastAnswer>,
    /// Whether the last two runs inside the bracket moved the same end.
    same_side_twice: bool,
}

impl Searcher {
    pub fn new(search: Search) -> Searcher {
        Searcher {
            search,
            trials: Vec::new(),
            a: None,
            b: None,
            ga: 0.0,
            gb: 0.0,
            side: 0,
            pending: Some(search.lo),
            answer: None,
            same_side_twice: false,
        }
    }

    /// The value to run next; `None` once the answer is known.
    pub fn next_value(&self) -> Option<f64> {
        self.pending
    }

    /// The runs so far.
    pub fn trials(&self) -> &[Trial] {
        &self.trials
    }

    /// The answer, once the search has ended.
    pub fn answer(&self) -> Option<&LeastAnswer> {
        self.answer.as_ref()
    }

    /// Hand back the run of the value [`Searcher::next_value`] asked for.
    pub fn record(&mut self, t: Trial) {
        if self.answer.is_some() {
            return;
        }
        self.trials.push(t);
        let g = t.excess_m();
        match (self.a, self.b) {
            (None, None) if self.trials.len() == 1 => {
                if g <= 0.0 {
                    return self.end(LeastAnswer::SmallestSuffices { trial: t });
                }
                self.a = Some(t);
                self.ga = g;
                self.pending = Some(self.search.hi);
                return;
            }
            (Some(_), None) => {
                if g > 0.0 {
                    return self.end(LeastAnswer::NotReachable { trial: t });
                }
                self.b = Some(t);
                self.gb = g;
            }
            (Some(a), Some(_)) => {
                // A run that fails by more than the failing end below it (beyond read-off
                // noise) means frost reaches deeper with more of the quantity: the family
                // turns back, and the first value that holds need not be the least. (Among
                // runs that hold, the excess may grow again — a thicker board deepens the
                // top of the soil below it — without changing the answer.)
                if g > 0.0 && g > a.excess_m() + MONOTONE_NOISE_M {
                    let trials = self.trials.clone();
                    return self.end(LeastAnswer::NotMonotone { trials });
                }
                self.same_side_twice = (g > 0.0 && self.side == -1) || (g <= 0.0 && self.side == 1);
                if g > 0.0 {
                    self.a = Some(t);
                    self.ga = g;
                    if self.side == -1 {
                        self.gb *= 0.5; // Illinois: halve the end that stayed twice.
                    }
                    self.side = -1;
                } else {
                    self.b = Some(t);
                    self.gb = g;
                    if self.side == 1 {
                        self.ga *= 0.5;
                    }
                    self.side = 1;
                }
            }
            _ => return,
        }
        let (Some(a), Some(b)) = (self.a, self.b) else {
            return;
        };
        // The next value on the grid strictly inside the bracket, if there is one.
        let next = self.grid_inside(a.value, b.value);
        if next.is_none() || self.trials.len() >= self.search.max_runs {
            let slope = (b.excess_m() - a.excess_m()) / (b.value - a.value);
            let trials = self.trials.clone();
            return self.end(LeastAnswer::Found {
                value: b.value,
                frost_depth_m: b.frost_depth_m,
                limit_m: b.limit_m,
                slope,
                trials,
            });
        }
        // Secant point of the (weighted) bracket, kept off the ends by a tenth; bisection
        // when two runs in a row have moved the same end (frost that jumps — soil that
        // starts to freeze at all — makes the secant crawl from one side).
        let width = b.value - a.value;
        let x = if self.same_side_twice {
            0.5 * (a.value + b.value)
        } else {
            let x = b.value - self.gb * width / (self.gb - self.ga);
            let margin = 0.1 * width;
            x.clamp(a.value + margin, b.value - margin)
        };
        self.pending = next.map(|(k_lo, k_hi)| self.on_grid(x, k_lo, k_hi));
    }

    /// The grid's steps strictly between `a` and `b` (`lo + k·tolerance`, k from the first
    /// to the last returned), or `None` when none is: the bracket is narrowed to its end.
    fn grid_inside(&self, a: f64, b: f64) -> Option<(f64, f64)> {
        let (lo, step) = (self.search.lo, self.search.tolerance);
        if step.is_nan() || step <= 0.0 || step.is_infinite() {
            return None;
        }
        // Float noise in lo + k·step is far below this.
        let eps = 1e-6;
        let k_lo = ((a - lo) / step + eps).floor() + 1.0;
        let k_hi = ((b - lo) / step - eps).ceil() - 1.0;
        (k_lo <= k_hi).then_some((k_lo, k_hi))
    }

    /// `x` moved to the nearest step of the grid within steps `k_lo..=k_hi`.
    fn on_grid(&self, x: f64, k_lo: f64, k_hi: f64) -> f64 {
        let (lo, step) = (self.search.lo, self.search.tolerance);
        let k = ((x - lo) / step).round().clamp(k_lo, k_hi);
        lo + k * step
    }

    fn end(&mut self, answer: LeastAnswer) {
        self.pending = None;
        self.answer = Some(answer);
    }
}

/// The least `x` in `[s.lo, s.hi]` with `trial(x).excess_m() ≤ 0`, by Illinois regula
/// falsi on a bracket ([`Searcher`] driven to its end). `trial` runs one case; errors pass
/// through.
pub fn least_value<E>(
    s: &Search,
    mut trial: impl FnMut(f64) -> Result<Trial, E>,
) -> Result<LeastAnswer, E> {
    let mut searcher = Searcher::new(*s);
    while let Some(x) = searcher.next_value() {
        searcher.record(trial(x)?);
    }
    Ok(searcher
        .answer()
        .cloned()
        .unwrap_or(LeastAnswer::NotMonotone { trials: Vec::new() }))
}

/// The limit's depth below the top face for a stack of these thicknesses.
pub fn limit_depth_m(limit: FrostLimit, thicknesses_m: &[f64]) -> f64 {
    match limit {
        FrostLimit::Depth(d) => d,
        FrostLimit::BottomOfLayer(i) => thicknesses_m[..=i.min(thicknesses_m.len() - 1)]
            .iter()
            .sum(),
    }
}

/// Below this thickness a trial runs without the layer, m (0.1 mm; a setting of this tool).
pub const MIN_LAYER_M: f64 = 1e-4;

/// `spec` with layer `layer` this thick: without the layer below [`MIN_LAYER_M`] (a grid
/// cannot hold a thinner one), when other layers remain.
pub fn with_layer_thickness(spec: &RunSpec, layer: usize, x: f64) -> RunSpec {
    let mut sp = spec.clone();
    if x < MIN_LAYER_M && sp.thicknesses_m.len() > 1 {
        sp.thicknesses_m.remove(layer);
        sp.materials.remove(layer);
        sp.curves.remove(layer);
    } else {
        sp.thicknesses_m[layer] = x.max(MIN_LAYER_M);
    }
    sp
}

/// The least thickness of layer `layer` (m, within `s`) of the 1D column `spec` under
/// `forcing` for which the deepest frost of the run stays at or above `limit`. Each trial
/// is a whole run (its start, spin-up included, as `spec` says).
pub fn least_layer_thickness(
    spec: &RunSpec,
    forcing: &dyn Forcing,
    layer: usize,
    limit: FrostLimit,
    s: &Search,
) -> Result<LeastAnswer, TransientError> {
    least_value(s, |x| {
        let mut thicknesses = spec.thicknesses_m.clone();
        thicknesses[layer] = x.max(0.0);
        let r = run(&with_layer_thickness(spec, layer, x), forcing)?;
        Ok(Trial {
            value: x,
            frost_depth_m: r.max_frost_depth_m,
            limit_m: limit_depth_m(limit, &thicknesses),
        })
    })
}
