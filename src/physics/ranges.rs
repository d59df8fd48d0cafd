//! Ranges, not single numbers: uncertain inputs, a seeded sampler, Monte Carlo over any
//! trial, and one-at-a-time sensitivity.
//!
//! Core only: a trial is any `FnMut(&[f64]) -> Result<f64, E>`.
//!
//! **Sampling.** Plain (simple random) Monte Carlo; Latin hypercube sampling is not done in
//! this increment. Each input is drawn by the inverse of its distribution function from one
//! uniform number. The uniform numbers come from PCG32 (O'Neill 2014, "PCG: A Family of
//! Simple Fast Space-Efficient Statistically Good Algorithms for Random Number Generation",
//! HMC-CS-2014-0905; the XSH-RR output on a 64-bit LCG): integer arithmetic only, so a seed
//! gives bit-identical integers on every platform. Sample `i` of `n` inputs uses draws
//! `2·n·i … 2·n·(i+1) − 1` of one stream, reached by jumping the LCG ahead in O(log i)
//! steps (Brown 1994, "Random number generation with arbitrary strides", Trans. Am. Nucl.
//! Soc. 71, 202), so any sample is computable from (seed, i) alone and workers may split
//! the indices as they like. Two 32-bit draws make one double with 53 random bits,
//! u = (k + ½)·2⁻⁵³ in (0, 1). The transcendental functions (sqrt, erfc) are those of the
//! `libm` crate, a pure-Rust port of musl's, so wasm32 and native compute the same
//! doubles; only IEEE-754 basic operations are used besides.
//!
//! **Percentiles** are Hyndman & Fan 1996 (Am. Stat. 50, 361) type 7, numpy's default:
//! for sorted x₀…x_{n−1}, h = (n − 1)p, x_⌊h⌋ + (h − ⌊h⌋)(x_⌊h⌋₊₁ − x_⌊h⌋).
//! **Mean** is the plain sum in sample-index order over n; **sd** the sample standard
//! deviation (divisor n − 1), two-pass. Statistics are computed in index order from the
//! values kept by index, so a result merged from several workers is bit-identical to a
//! single-thread run.
//!
//! **Inputs.** A [`RangedInput`] has an id, its low and high ends and a [`Distribution`]:
//! uniform, triangular with its mode, or normal with its mean and sd truncated to
//! [low, high] (mean inside the range, sd > 0); each is drawn by its inverse distribution
//! function from one uniform number (formulas beside each variant). [`validate_inputs`]
//! checks them all at once with field paths under the caller's prefix
//! (`ranges.inputs[2].high`, `….distribution.mode`, `….id` for an empty or repeated id), at
//! most [`MAX_INPUTS`] of them; a job's runs lie between [`MIN_RUNS`] and [`MAX_RUNS`]
//! (`{prefix}.runs`). `same_seed_same_result_different_seed_different_samples`
//! (`tests/ranges_sampling.rs`) pins the uniforms and three samples against an independent
//! Python implementation, and a wasm test checks the browser gives the same bits.
//!
//! **Jobs.** [`MonteCarloJob`] keeps each run's outcome by its index: a caller runs it in
//! order ([`MonteCarloJob::next_sample`], [`MonteCarloJob::record`]), or hands samples out
//! ([`MonteCarloJob::sample`]) and records them as they come back in any order
//! ([`MonteCarloJob::record_at`]); [`MonteCarloJob::result`] is the same to the bit either
//! way (`interleaved_batches_merge_to_the_single_thread_result` checks 2 and 3 interleaved
//! batches). A trial's error or a value that is not finite is a [`TrialFailure`], kept with
//! its index and left out of the statistics; every trial failing is
//! [`MonteCarloError::NoValues`]. [`monte_carlo`] runs a job in one call.
//!
//! **One at a time.** [`one_at_a_time`] runs 2n + 1 trials: the base case, and each input
//! at its low and its high end with the others at the base (each base value checked to lie
//! in its range); the swings |at_high − at_low| come largest first, for a sensitivity
//! chart.

use crate::physics::error::{check, InputError, InputErrorKind, InputErrors};
use std::fmt;

/// Most Monte Carlo runs one request may ask for.
pub const MAX_RUNS: usize = 10_000;
/// Fewest Monte Carlo runs (a standard deviation needs two).
pub const MIN_RUNS: usize = 2;
/// Most uncertain inputs in one request.
pub const MAX_INPUTS: usize = 32;

/// How an uncertain input's value is spread over [low, high].
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Distribution {
    /// Every value in [l, h] equally likely: F(x) = (x − l)/(h − l); x = l + u(h − l).
    Uniform,
    /// Triangular with its peak at `mode` c, l ≤ c ≤ h: density 2(x − l)/((h − l)(c − l)) up
    /// to c, 2(h − x)/((h − l)(h − c)) above. Inverse: with F_c = (c − l)/(h − l),
    /// x = l + √(u(h − l)(c − l)) for u < F_c, else h − √((1 − u)(h − l)(h − c)).
    /// Mean (l + c + h)/3.
    Triangular { mode: f64 },
    /// Normal with `mean` μ (in [l, h]) and `sd` σ > 0, truncated to [l, h]: with
    /// α = (l − μ)/σ, β = (h − μ)/σ and Φ the standard normal distribution function
    /// (Φ(z) = ½ erfc(−z/√2)), x = μ + σ z where Φ(z) = Φ(α) + u(Φ(β) − Φ(α)); z is found
    /// by bisection on [α, β] to the last bit (the tail side is mirrored so Φ stays small
    /// and accurate). Mean μ + σ(φ(α) − φ(β))/(Φ(β) − Φ(α)).
    Normal { mean: f64, sd: f64 },
}

/// One input known only as a range.
#[derive(Debug, Clone, PartialEq)]
pub struct RangedInput {
    /// A stable name, e.g. `snow-density`.
    pub id: String,
    pub low: f64,
    pub high: f64,
    pub distribution: Distribution,
}

impl RangedInput {
    /// Check this input; `field` is its path (e.g. `ranges.inputs[2]`), errors go to
    /// `{field}.id`, `.low`, `.high`, `.distribution.mode`, `.distribution.mean`,
    /// `.distribution.sd`. Returns whether it passed.
    pub fn validate(&self, field: &str, errs: &mut InputErrors) -> bool {
        let before = errs.0.len();
        if self.id.trim().is_empty() {
            errs.push(
                format!("{field}.id"),
                InputErrorKind::NotCovered("an uncertain input needs a name".into()),
            );
        }
        let lo_ok = finite(errs, &format!("{field}.low"), self.low);
        let hi_ok = finite(errs, &format!("{field}.high"), self.high);
        if lo_ok && hi_ok && self.high <= self.low {
            errs.push(
                format!("{field}.high"),
                InputErrorKind::NotCovered(format!(
                    "the high end ({}) must be above the low end ({})",
                    self.high, self.low
                )),
            );
        }
        let range_ok = lo_ok && hi_ok && self.high > self.low;
        match self.distribution {
            Distribution::Uniform => {}
            Distribution::Triangular { mode } => {
                let f = format!("{field}.distribution.mode");
                if range_ok {
                    check::within(errs, &f, mode, self.low, self.high, "");
                } else {
                    finite(errs, &f, mode);
                }
            }
            Distribution::Normal { mean, sd } => {
                let f = format!("{field}.distribution.mean");
                if range_ok {
                    check::within(errs, &f, mean, self.low, self.high, "");
                } else {
                    finite(errs, &f, mean);
                }
                check::positive(errs, &format!("{field}.distribution.sd"), sd);
            }
        }
        errs.0.len() == before
    }

    /// The value at cumulative probability `u` (the inverse distribution function), clamped
    /// to [low, high]. `u` outside [0, 1] is clamped first. Meant for a validated input;
    /// an invalid one gives a meaningless number (perhaps NaN) but never panics.
    pub fn quantile(&self, u: f64) -> f64 {
        let u = if u.is_nan() { 0.5 } else { u.clamp(0.0, 1.0) };
        let (l, h) = (self.low, self.high);
        let x = match self.distribution {
            Distribution::Uniform => l + u * (h - l),
            Distribution::Triangular { mode: c } => {
                let fc = (c - l) / (h - l);
                if u < fc {
                    l + libm::sqrt(u * (h - l) * (c - l))
                } else {
                    h - libm::sqrt((1.0 - u) * (h - l) * (h - c))
                }
            }
            Distribution::Normal { mean, sd } => {
                let a = (l - mean) / sd;
                let b = (h - mean) / sd;
                // Work on the side where the interval's mass lies in Φ's lower tail.
                let z = if a + b > 0.0 {
                    -truncated_standard_normal(-b, -a, 1.0 - u)
                } else {
                    truncated_standard_normal(a, b, u)
                };
                mean + sd * z
            }
        };
        // Not f64::clamp, which panics on an inverted or NaN range.
        x.max(l).min(h)
    }
}

fn finite(errs: &mut InputErrors, field: &str, v: f64) -> bool {
    if v.is_finite() {
        true
    } else {
        errs.push(field, InputErrorKind::NotFinite);
        false
    }
}

/// Φ(z) = ½ erfc(−z/√2).
fn std_normal_cdf(z: f64) -> f64 {
    0.5 * libm::erfc(-z * std::f64::consts::FRAC_1_SQRT_2)
}

/// z in [a, b] with Φ(z) = Φ(a) + u(Φ(b) − Φ(a)), by bisection until the bracket cannot
/// shrink (at most 1100 halvings, which no double bracket needs).
fn truncated_standard_normal(a: f64, b: f64, u: f64) -> f64 {
    let fa = std_normal_cdf(a);
    let fb = std_normal_cdf(b);
    let target = fa + u * (fb - fa);
    let (mut lo, mut hi) = (a, b);
    for _ in 0..1100 {
        let mid = 0.5 * (lo + hi);
        if mid <= lo || mid >= hi {
            break;
        }
        if std_normal_cdf(mid) < target {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

/// Check a list of inputs: the count (1 to [`MAX_INPUTS`], at `field`), each input at
/// `{field}[i]`, and that ids are unique (`{field}[i].id`).
pub fn validate_inputs(inputs: &[RangedInput], field: &str, errs: &mut InputErrors) -> bool {
    let before = errs.0.len();
    if inputs.is_empty() || inputs.len() > MAX_INPUTS {
        errs.push(
            field,
            InputErrorKind::Count {
                count: inputs.len(),
                min: 1,
                max: MAX_INPUTS,
            },
        );
    }
    for (i, inp) in inputs.iter().enumerate() {
        inp.validate(&format!("{field}[{i}]"), errs);
        if inputs[..i].iter().any(|o| o.id == inp.id) && !inp.id.trim().is_empty() {
            errs.push(
                format!("{field}[{i}].id"),
                InputErrorKind::NotCovered(format!("the name {:?} is used twice", inp.id)),
            );
        }
    }
    errs.0.len() == before
}

fn join(prefix: &str, name: &str) -> String {
    if prefix.is_empty() {
        name.to_string()
    } else {
        format!("{prefix}.{name}")
    }
}

/// PCG32 (O'Neill 2014): a 64-bit LCG, state ← state·6364136223846793005 + inc, output
/// XSH-RR of the old state. `new(initstate, initseq)` is the reference `pcg32_srandom_r`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Pcg32 {
    state: u64,
    inc: u64,
}

const PCG_MULT: u64 = 6_364_136_223_846_793_005;
/// The stream the sampler uses for every seed (the reference demo's default sequence
/// constant; any odd increment would do).
const SAMPLER_STREAM: u64 = 0xda3e_39cb_94b9_5bdb;

impl Pcg32 {
    pub fn new(initstate: u64, initseq: u64) -> Self {
        let mut g = Pcg32 {
            state: 0,
            inc: (initseq << 1) | 1,
        };
        g.next_u32();
        g.state = g.state.wrapping_add(initstate);
        g.next_u32();
        g
    }

    pub fn next_u32(&mut self) -> u32 {
        let old = self.state;
        self.state = old.wrapping_mul(PCG_MULT).wrapping_add(self.inc);
        let xorshifted = (((old >> 18) ^ old) >> 27) as u32;
        let rot = (old >> 59) as u32;
        xorshifted.rotate_right(rot)
    }

    /// Jump `delta` draws ahead in O(log delta) (Brown 1994), as if `next_u32` had been
    /// called `delta` times.
    pub fn advance(&mut self, mut delta: u64) {
        let (mut cur_mult, mut cur_plus) = (PCG_MULT, self.inc);
        let (mut acc_mult, mut acc_plus) = (1u64, 0u64);
        while delta > 0 {
            if delta & 1 == 1 {
                acc_mult = acc_mult.wrapping_mul(cur_mult);
                acc_plus = acc_plus.wrapping_mul(cur_mult).wrapping_add(cur_plus);
            }
            cur_plus = cur_mult.wrapping_add(1).wrapping_mul(cur_plus);
            cur_mult = cur_mult.wrapping_mul(cur_mult);
            delta >>= 1;
        }
        self.state = acc_mult.wrapping_mul(self.state).wrapping_add(acc_plus);
    }

    /// A double in (0, 1) from two draws: 53 random bits k, (k + ½)·2⁻⁵³. Never 0 or 1.
    pub fn next_open01(&mut self) -> f64 {
        let hi = u64::from(self.next_u32()) >> 6; // 26 bits
        let lo = u64::from(self.next_u32()) >> 5; // 27 bits
        let k = (hi << 27) | lo;
        (k as f64 + 0.5) * (1.0 / 9_007_199_254_740_992.0)
    }
}

/// The uniform numbers of sample `index` (one per input, each in (0, 1)) for `dims` inputs.
pub fn sample_uniforms(seed: u64, index: u64, dims: usize, out: &mut Vec<f64>) {
    let mut g = Pcg32::new(seed, SAMPLER_STREAM);
    g.advance(index.wrapping_mul(2 * dims as u64));
    out.clear();
    out.extend((0..dims).map(|_| g.next_open01()));
}

/// Sample `index` of `inputs` under `seed`: one value per input, in the inputs' order.
/// Depends on (seed, index, inputs) only. Call on validated inputs.
pub fn sample_at(inputs: &[RangedInput], seed: u64, index: u64) -> Vec<f64> {
    let mut u = Vec::with_capacity(inputs.len());
    sample_uniforms(seed, index, inputs.len(), &mut u);
    inputs
        .iter()
        .zip(&u)
        .map(|(inp, &u)| inp.quantile(u))
        .collect()
}

/// Percentile `p` in [0, 1] of sorted (ascending, no NaN) values by Hyndman & Fan type 7
/// (numpy's default): h = (n − 1)p, x_⌊h⌋ + (h − ⌊h⌋)(x_⌊h⌋₊₁ − x_⌊h⌋). NaN when empty.
pub fn percentile_sorted(sorted: &[f64], p: f64) -> f64 {
    let n = sorted.len();
    if n == 0 || p.is_nan() {
        return f64::NAN;
    }
    let h = (n - 1) as f64 * p.clamp(0.0, 1.0);
    let j = libm::floor(h) as usize;
    if j + 1 >= n {
        return sorted[n - 1];
    }
    let g = h - j as f64;
    sorted[j] + g * (sorted[j + 1] - sorted[j])
}

/// A trial that gave no value (an error, or a value that is not finite).
#[derive(Debug, Clone, PartialEq)]
pub struct TrialFailure {
    pub index: usize,
    pub message: String,
}

/// The outcome of a Monte Carlo.
#[derive(Debug, Clone, PartialEq)]
pub struct MonteCarloResult {
    /// The successful values, in sample-index order.
    pub values: Vec<f64>,
    /// The sample index of each value.
    pub indices: Vec<usize>,
    /// The same values ascending.
    pub sorted: Vec<f64>,
    pub p10: f64,
    pub p50: f64,
    pub p90: f64,
    pub mean: f64,
    /// Sample standard deviation (divisor n − 1; 0 for one value).
    pub sd: f64,
    pub min: f64,
    pub max: f64,
    /// Runs asked for (successful + failed).
    pub runs: usize,
    pub seed: u64,
    pub failures: Vec<TrialFailure>,
}

/// Why a Monte Carlo gave no result.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum MonteCarloError {
    #[error("the uncertain inputs are not valid: {0}")]
    Input(#[from] InputErrors),
    #[error("{recorded} of {runs} runs recorded")]
    Unfinished { recorded: usize, runs: usize },
    #[error("a value was recorded for run {index}, which is not one of the {runs} runs or already has one")]
    BadIndex { index: usize, runs: usize },
    #[error("every run failed (first: {first})")]
    NoValues { first: String },
}

/// A Monte Carlo run a slice at a time, or split over workers.
///
/// Single thread: `next_sample()` hands out samples in index order and `record(value)` the
/// answer for the last one handed out. Workers: each computes `sample(i)` for its share of
/// indices, and the results are merged with `record_at(i, value)` in any order; `result()`
/// is then bit-identical to a single-thread run.
#[derive(Debug, Clone)]
pub struct MonteCarloJob {
    inputs: Vec<RangedInput>,
    runs: usize,
    seed: u64,
    next: usize,
    outcomes: Vec<Option<Result<f64, String>>>,
    recorded: usize,
}

impl MonteCarloJob {
    /// Check the inputs (at `{prefix}.inputs[i]…`) and `runs` (at `{prefix}.runs`, between
    /// [`MIN_RUNS`] and [`MAX_RUNS`]); `prefix` may be empty.
    pub fn new(
        inputs: &[RangedInput],
        runs: usize,
        seed: u64,
        prefix: &str,
    ) -> Result<Self, InputErrors> {
        let mut errs = InputErrors::default();
        validate_inputs(inputs, &join(prefix, "inputs"), &mut errs);
        if !(MIN_RUNS..=MAX_RUNS).contains(&runs) {
            errs.push(
                join(prefix, "runs"),
                InputErrorKind::Count {
                    count: runs,
                    min: MIN_RUNS,
                    max: MAX_RUNS,
                },
            );
        }
        errs.into_result()?;
        Ok(Self {
            inputs: inputs.to_vec(),
            runs,
            seed,
            next: 0,
            outcomes: vec![None; runs],
            recorded: 0,
        })
    }

    pub fn runs(&self) -> usize {
        self.runs
    }
    pub fn seed(&self) -> u64 {
        self.seed
    }
    pub fn inputs(&self) -> &[RangedInput] {
        &self.inputs
    }
    /// Share of the runs recorded, 0 to 1.
    pub fn fraction(&self) -> f64 {
        self.recorded as f64 / self.runs as f64
    }
    pub fn finished(&self) -> bool {
        self.recorded == self.runs
    }

    /// Sample `index` (None past the last run).
    pub fn sample(&self, index: usize) -> Option<Vec<f64>> {
        (index < self.runs).then(|| sample_at(&self.inputs, self.seed, index as u64))
    }

    /// The next sample in index order; None when all have been handed out.
    pub fn next_sample(&mut self) -> Option<Vec<f64>> {
        let s = self.sample(self.next)?;
        self.next += 1;
        Some(s)
    }

    /// Record the answer for the sample last handed out by `next_sample`.
    pub fn record(&mut self, value: Result<f64, String>) -> Result<(), MonteCarloError> {
        match self.next.checked_sub(1) {
            Some(i) => self.record_at(i, value),
            None => Err(MonteCarloError::BadIndex {
                index: 0,
                runs: self.runs,
            }),
        }
    }

    /// Record the answer for sample `index` (from any worker, in any order). A value that
    /// is not finite counts as a failure.
    pub fn record_at(
        &mut self,
        index: usize,
        value: Result<f64, String>,
    ) -> Result<(), MonteCarloError> {
        match self.outcomes.get_mut(index) {
            Some(slot @ None) => {
                *slot = Some(match value {
                    Ok(v) if v.is_finite() => Ok(v),
                    Ok(v) => Err(format!("the trial gave {v}, not a finite number")),
                    Err(e) => Err(e),
                });
                self.recorded += 1;
                Ok(())
            }
            _ => Err(MonteCarloError::BadIndex {
                index,
                runs: self.runs,
            }),
        }
    }

    /// The statistics, once every run is recorded.
    pub fn result(&self) -> Result<MonteCarloResult, MonteCarloError> {
        if !self.finished() {
            return Err(MonteCarloError::Unfinished {
                recorded: self.recorded,
                runs: self.runs,
            });
        }
        let mut values = Vec::new();
        let mut indices = Vec::new();
        let mut failures = Vec::new();
        for (i, o) in self.outcomes.iter().enumerate() {
            match o {
                Some(Ok(v)) => {
                    values.push(*v);
                    indices.push(i);
                }
                Some(Err(m)) => failures.push(TrialFailure {
                    index: i,
                    message: m.clone(),
                }),
                None => unreachable!("finished"),
            }
        }
        if values.is_empty() {
            return Err(MonteCarloError::NoValues {
                first: failures[0].message.clone(),
            });
        }
        let n = values.len() as f64;
        let mean = values.iter().sum::<f64>() / n;
        let sd = if values.len() > 1 {
            libm::sqrt(values.iter().map(|v| (v - mean) * (v - mean)).sum::<f64>() / (n - 1.0))
        } else {
            0.0
        };
        let mut sorted = values.clone();
        sorted.sort_by(f64::total_cmp);
        Ok(MonteCarloResult {
            p10: percentile_sorted(&sorted, 0.1),
            p50: percentile_sorted(&sorted, 0.5),
            p90: percentile_sorted(&sorted, 0.9),
            min: sorted[0],
            max: sorted[sorted.len() - 1],
            mean,
            sd,
            values,
            indices,
            sorted,
            runs: self.runs,
            seed: self.seed,
            failures,
        })
    }
}

/// Run `trial` on `runs` samples of `inputs` under `seed`, in one call. Error paths are
/// `inputs[i]…` and `runs` (use [`MonteCarloJob::new`] for a prefix). A trial's error is a
/// failure of that run, kept in the result with its message.
pub fn monte_carlo<E: fmt::Display>(
    inputs: &[RangedInput],
    runs: usize,
    seed: u64,
    mut trial: impl FnMut(&[f64]) -> Result<f64, E>,
) -> Result<MonteCarloResult, MonteCarloError> {
    let mut job = MonteCarloJob::new(inputs, runs, seed, "")?;
    while let Some(s) = job.next_sample() {
        let v = trial(&s).map_err(|e| e.to_string());
        job.record(v)?;
    }
    job.result()
}

/// One input's swing in a one-at-a-time study.
#[derive(Debug, Clone, PartialEq)]
pub struct Swing {
    /// Position of the input in the list given.
    pub input: usize,
    pub id: String,
    pub low: f64,
    pub high: f64,
    /// The answer with this input at `low`, the others at base.
    pub at_low: f64,
    /// The answer with this input at `high`, the others at base.
    pub at_high: f64,
    /// |at_high − at_low|.
    pub swing: f64,
}

/// A one-at-a-time study (for a sensitivity chart).
#[derive(Debug, Clone, PartialEq)]
pub struct OneAtATime {
    /// The answer with every input at base.
    pub at_base: f64,
    /// Largest swing first (ties keep the inputs' order).
    pub swings: Vec<Swing>,
}

/// Why a one-at-a-time study gave no result.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SensitivityError<E> {
    #[error("the inputs are not valid: {0}")]
    Input(InputErrors),
    /// A trial failed: `input` None for the base run, else that input at its `high` end
    /// (or low end when `high` is false).
    #[error("a trial failed")]
    Trial {
        input: Option<usize>,
        high: bool,
        error: E,
    },
}

/// Each input in turn at its low and its high end, the others at `base` (one value per
/// input, each within its input's range, checked at `base[i]`); the swings sorted
/// largest first. 2n + 1 trials.
pub fn one_at_a_time<E>(
    base: &[f64],
    inputs: &[RangedInput],
    mut trial: impl FnMut(&[f64]) -> Result<f64, E>,
) -> Result<OneAtATime, SensitivityError<E>> {
    let mut errs = InputErrors::default();
    if validate_inputs(inputs, "inputs", &mut errs) {
        if base.len() != inputs.len() {
            errs.0.push(InputError::new(
                "base",
                InputErrorKind::Count {
                    count: base.len(),
                    min: inputs.len(),
                    max: inputs.len(),
                },
            ));
        } else {
            for (i, (b, inp)) in base.iter().zip(inputs).enumerate() {
                check::within(&mut errs, &format!("base[{i}]"), *b, inp.low, inp.high, "");
            }
        }
    }
    errs.into_result().map_err(SensitivityError::Input)?;
    let at_base = trial(base).map_err(|error| SensitivityError::Trial {
        input: None,
        high: false,
        error,
    })?;
    let mut x = base.to_vec();
    let mut swings = Vec::with_capacity(inputs.len());
    for (i, inp) in inputs.iter().enumerate() {
        x[i] = inp.low;
        let at_low = trial(&x).map_err(|error| SensitivityError::Trial {
            input: Some(i),
            high: false,
            error,
        })?;
        x[i] = inp.high;
        let at_high = trial(&x).map_err(|error| SensitivityError::Trial {
            input: Some(i),
            high: true,
            error,
        })?;
        x[i] = base[i];
        swings.push(Swing {
            input: i,
            id: inp.id.clone(),
            low: inp.low,
            high: inp.high,
            at_low,
            at_high,
            swing: (at_high - at_low).abs(),
        });
    }
    swings.sort_by(|a, b| b.swing.total_cmp(&a.swing));
    Ok(OneAtATime { at_base, swings })
}
