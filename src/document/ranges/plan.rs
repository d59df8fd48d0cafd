//! A study as independent tasks, and their run.
//!
//! [`RangesPlan::new`] checks the whole section at once (the core's checks of the ranged
//! inputs under `ranges.inputs[i]`, each input against the scenario) and keeps the scenario
//! as written without its ranges and its least-size searches. The tasks are in the order
//! the section's documentation gives ([`super`]); the regressions' tasks come only when a
//! chosen result's part has snow. [`RangesPlan::run_task`] depends on the plan and `k`
//! alone; [`RangesPlan::assemble`] makes the report from the outcomes. The report is the
//! same to the bit for any order and any number of threads or workers
//! (`the_same_seed_gives_the_same_percentiles_on_any_number_of_threads` in
//! `tests/ranges.rs`: 1, 2, 3 threads and reverse order; a worker-style split in the wasm
//! tests).
//!
//! [`evaluate_all`] runs each part the chosen results need once (the steady stack serves
//! the R-value and the winter; the shelter's two results come from one run). [`run_plan`]
//! runs a plan on std threads natively (one thread on wasm), split by stride;
//! [`run_ranges`] is what the CLI calls (`hibernal run` runs a ranges section when there is
//! one: the report's `ranges` key, a summary on stderr, `--threads`).

use super::apply::{apply, base_value, result_has_snow, set_regression};
use super::report::{
    MemberDoc, PastLimitDoc, RangeResultReport, RangedInputReport, RangesReport, SpreadDoc,
    SwingDoc, TrialDoc,
};
use super::{RangeResult, RangedInputDoc, RangesDoc, LISTED_FAILURES, MAX_SEED};
use crate::document::scenario::Scenario;
use crate::document::vocabulary::ErrorDoc;
use crate::physics::error::{InputError, InputErrorKind, InputErrors};
use crate::physics::materials::SnowRegression;
use crate::physics::ranges;
use crate::physics::ranges::{MonteCarloJob, RangedInput};

/// One task of a study.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Task {
    /// Monte Carlo sample i.
    Sample(usize),
    /// The scenario as written.
    Base,
    /// Input i at its low end (`high` false) or high end, the others as written.
    End { input: usize, high: bool },
    /// The scenario as written under one snow regression.
    Regression(SnowRegression),
}

/// What one task gave: per result, its value or why there is none.
#[derive(Debug, Clone, PartialEq)]
pub struct TaskOutcome {
    pub values: Vec<Result<f64, String>>,
}

/// A checked ranges study, ready to run task by task.
#[derive(Debug, Clone)]
pub struct RangesPlan {
    /// The scenario as written, without its ranges and its least-size searches.
    base: Scenario,
    doc: RangesDoc,
    inputs: Vec<RangedInput>,
    results: Vec<RangeResult>,
    regressions: Vec<SnowRegression>,
    base_values: Vec<Option<f64>>,
}

impl RangesPlan {
    /// Check the scenario's `ranges` section. Errors name `ranges.…` fields.
    pub fn new(s: &Scenario) -> Result<Self, InputErrors> {
        let Some(doc) = s.ranges.clone() else {
            return Err(InputError::new(
                "ranges",
                InputErrorKind::NotCovered("the scenario has no ranges section".into()),
            )
            .into());
        };
        let mut base = s.clone();
        base.ranges = None;
        if let Some(w) = base.winter.as_mut() {
            w.least_thickness = None;
        }
        if let Some(e) = base.edge.as_mut() {
            e.least = None;
        }
        let mut errs = InputErrors::default();
        if doc.seed > MAX_SEED {
            errs.push(
                "ranges.seed",
                InputErrorKind::NotCovered(format!("the seed must be 0 to {MAX_SEED}")),
            );
        }
        let results: Vec<RangeResult> = if doc.results.is_empty() {
            RangeResult::ALL
                .into_iter()
                .filter(|r| available(*r, &base))
                .collect()
        } else {
            for (i, r) in doc.results.iter().enumerate() {
                if !available(*r, &base) {
                    errs.push(
                        format!("ranges.results[{i}]"),
                        InputErrorKind::NotCovered(format!(
                            "{} needs the part of the scenario it comes from",
                            r.name()
                        )),
                    );
                }
                if doc.results[..i].contains(r) {
                    errs.push(
                        format!("ranges.results[{i}]"),
                        InputErrorKind::NotCovered("listed twice".into()),
                    );
                }
            }
            doc.results.clone()
        };
        if results.is_empty() {
            errs.push(
                "ranges.results",
                InputErrorKind::NotCovered("the scenario has no result to give a range for".into()),
            );
        }
        let inputs: Vec<RangedInput> = doc
            .inputs
            .iter()
            .map(|d| RangedInput {
                id: match d.layer {
                    Some(k) => format!("{} (layer {})", d.what.id(), k + 1),
                    None => d.what.id().to_string(),
                },
                low: d.low,
                high: d.high,
                distribution: d.distribution.into(),
            })
            .collect();
        // The ranges themselves (ends, modes, runs). The ids are made from `what` and
        // `layer`, whose repeats are named below, at `what`.
        if let Err(e) = MonteCarloJob::new(&inputs, doc.runs, doc.seed, "ranges") {
            errs.0
                .extend(e.0.into_iter().filter(|e| !e.field.ends_with(".id")));
        }
        // Each input must change something, at both ends, and the scenario must accept it.
        let mut base_values = Vec::with_capacity(doc.inputs.len());
        for (i, d) in doc.inputs.iter().enumerate() {
            let f = format!("ranges.inputs[{i}]");
            base_values.push(base_value(&base, d.what, d.layer));
            if let Some(k) = d.layer {
                if k >= base.layers.len() {
                    errs.push(
                        format!("{f}.layer"),
                        InputErrorKind::NotCovered(format!(
                            "the stack has {} layers; this names layer {}",
                            base.layers.len(),
                            k + 1
                        )),
                    );
                    continue;
                }
            }
            let mut t = base.clone();
            match apply(&mut t, d.what, d.layer, 0.5 * (d.low + d.high)) {
                Ok(0) => errs.push(
                    match d.layer {
                        Some(_) => format!("{f}.layer"),
                        None => format!("{f}.what"),
                    },
                    InputErrorKind::NotCovered(format!(
                        "nothing in {} has a {} to vary",
                        match d.layer {
                            Some(k) => format!("layer {}", k + 1),
                            None => "this scenario".into(),
                        },
                        d.what.name().to_lowercase()
                    )),
                ),
                Ok(_) => {}
                Err(why) => errs.push(format!("{f}.low"), InputErrorKind::NotCovered(why)),
            }
            if doc.inputs[..i]
                .iter()
                .any(|o| o.what == d.what && o.layer == d.layer)
            {
                errs.push(
                    format!("{f}.what"),
                    InputErrorKind::NotCovered("this input is listed twice".into()),
                );
            }
        }
        errs.into_result()?;
        let regressions = if results.iter().any(|&r| result_has_snow(&base, r)) {
            SnowRegression::ALL.to_vec()
        } else {
            Vec::new()
        };
        Ok(Self {
            base,
            doc,
            inputs,
            results,
            regressions,
            base_values,
        })
    }

    pub fn runs(&self) -> usize {
        self.doc.runs
    }
    pub fn seed(&self) -> u64 {
        self.doc.seed
    }
    pub fn results(&self) -> &[RangeResult] {
        &self.results
    }
    pub fn inputs(&self) -> &[RangedInput] {
        &self.inputs
    }
    /// The snow regressions the spread is taken over (none when there is no snow).
    pub fn regressions(&self) -> &[SnowRegression] {
        &self.regressions
    }

    /// Number of tasks: runs + 1 + 2 × inputs + regressions.
    pub fn task_count(&self) -> usize {
        self.doc.runs + 1 + 2 * self.inputs.len() + self.regressions.len()
    }

    /// Task `k` (None past the last).
    pub fn task(&self, k: usize) -> Option<Task> {
        let runs = self.doc.runs;
        let n = self.inputs.len();
        if k < runs {
            Some(Task::Sample(k))
        } else if k == runs {
            Some(Task::Base)
        } else if k < runs + 1 + 2 * n {
            let j = k - runs - 1;
            Some(Task::End {
                input: j / 2,
                high: j % 2 == 1,
            })
        } else {
            self.regressions
                .get(k - runs - 1 - 2 * n)
                .map(|&c| Task::Regression(c))
        }
    }

    /// The input values of Monte Carlo sample `i`, SI.
    pub fn sample(&self, i: usize) -> Vec<f64> {
        ranges::sample_at(&self.inputs, self.doc.seed, i as u64)
    }

    /// The scenario task `k` runs.
    pub fn scenario_for(&self, task: Task) -> Result<Scenario, String> {
        let mut s = self.base.clone();
        let set = |s: &mut Scenario, i: usize, v: f64| {
            let d = &self.doc.inputs[i];
            apply(s, d.what, d.layer, v).map(|_| ())
        };
        match task {
            Task::Sample(i) => {
                for (j, v) in self.sample(i).into_iter().enumerate() {
                    set(&mut s, j, v)?;
                }
            }
            Task::Base => {}
            Task::End { input, high } => {
                let inp = &self.inputs[input];
                set(&mut s, input, if high { inp.high } else { inp.low })?;
            }
            Task::Regression(c) => set_regression(&mut s, c),
        }
        Ok(s)
    }

    /// Run task `k`: each result's value, or why it has none. Never panics on a valid
    /// plan; a `k` past the last task gives an outcome of errors.
    pub fn run_task(&self, k: usize) -> TaskOutcome {
        let fail = |why: String| TaskOutcome {
            values: vec![Err(why); self.results.len()],
        };
        let Some(task) = self.task(k) else {
            return fail(format!("there is no task {k}"));
        };
        let s = match self.scenario_for(task) {
            Ok(s) => s,
            Err(why) => return fail(why),
        };
        TaskOutcome {
            values: evaluate_all(&s, &self.results),
        }
    }

    /// Every task's outcome (in task order) into the report. Errs when the count is wrong.
    pub fn assemble(&self, outcomes: &[TaskOutcome]) -> Result<RangesReport, InputErrors> {
        if outcomes.len() != self.task_count()
            || outcomes
                .iter()
                .any(|o| o.values.len() != self.results.len())
        {
            return Err(InputError::new(
                "ranges",
                InputErrorKind::Count {
                    count: outcomes.len(),
                    min: self.task_count(),
                    max: self.task_count(),
                },
            )
            .into());
        }
        let runs = self.doc.runs;
        let n = self.inputs.len();
        let samples: Vec<Vec<f64>> = (0..runs).map(|i| self.sample(i)).collect();
        let mut results = Vec::with_capacity(self.results.len());
        for (r_i, &r) in self.results.iter().enumerate() {
            let value = |k: usize| outcomes[k].values[r_i].clone();
            let mut job = MonteCarloJob::new(&self.inputs, runs, self.doc.seed, "ranges")?;
            for i in 0..runs {
                // A fresh job takes each index once, so this cannot fail.
                let _ = job.record_at(i, value(i));
            }
            let mc = job.result();
            let base = value(runs);
            let sensitivity = (0..n)
                .map(|i| {
                    let at_low = value(runs + 1 + 2 * i);
                    let at_high = value(runs + 2 + 2 * i);
                    let inp = &self.inputs[i];
                    let d = &self.doc.inputs[i];
                    SwingDoc {
                        input: i,
                        what: d.what.id(),
                        name: input_label(d),
                        quantity: d.what.quantity(),
                        low: inp.low,
                        high: inp.high,
                        swing: match (&at_low, &at_high) {
                            (Ok(a), Ok(b)) => Some((b - a).abs()),
                            _ => None,
                        },
                        at_low: at_low.as_ref().ok().copied(),
                        at_high: at_high.as_ref().ok().copied(),
                        error: at_low.err().or(at_high.err()),
                    }
                })
                .collect::<Vec<_>>();
            let mut sensitivity = sensitivity;
            // Largest swing first, failed ones last, ties in the inputs' order.
            sensitivity.sort_by(|a, b| {
                b.swing
                    .unwrap_or(f64::NEG_INFINITY)
                    .total_cmp(&a.swing.unwrap_or(f64::NEG_INFINITY))
            });
            let spread = result_has_snow(&self.base, r).then(|| {
                let mut members = Vec::new();
                let mut skipped = Vec::new();
                for (j, &c) in self.regressions.iter().enumerate() {
                    match value(runs + 1 + 2 * n + j) {
                        Ok(v) => members.push(MemberDoc {
                            id: c.id(),
                            name: c.name(),
                            short: c.short_name(),
                            value: v,
                        }),
                        Err(why) => skipped.push(ErrorDoc::plain(c.id(), why)),
                    }
                }
                let lo = members
                    .iter()
                    .map(|m| m.value)
                    .fold(f64::INFINITY, f64::min);
                let hi = members
                    .iter()
                    .map(|m| m.value)
                    .fold(f64::NEG_INFINITY, f64::max);
                SpreadDoc {
                    min: (!members.is_empty()).then_some(lo),
                    max: (!members.is_empty()).then_some(hi),
                    members,
                    skipped,
                }
            });
            let (stats, mc_error) = match mc {
                Ok(m) => (Some(m), None),
                Err(e) => (None, Some(e.to_string())),
            };
            let past_limit = r.limit().map(|(limit, meaning)| PastLimitDoc {
                limit,
                meaning,
                runs: stats
                    .as_ref()
                    .map_or(0, |m| m.values.iter().filter(|&&v| v > limit).count()),
                of: stats.as_ref().map_or(0, |m| m.values.len()),
                base_past: base.as_ref().ok().map(|&b| b > limit),
            });
            results.push(RangeResultReport {
                id: r.id(),
                name: r.name(),
                quantity: r.quantity(),
                base: base.as_ref().ok().copied(),
                base_error: base.err(),
                p10: stats.as_ref().map(|m| m.p10),
                p50: stats.as_ref().map(|m| m.p50),
                p90: stats.as_ref().map(|m| m.p90),
                mean: stats.as_ref().map(|m| m.mean),
                sd: stats.as_ref().map(|m| m.sd),
                min: stats.as_ref().map(|m| m.min),
                max: stats.as_ref().map(|m| m.max),
                runs_ok: stats.as_ref().map_or(0, |m| m.values.len()),
                runs_failed: stats.as_ref().map_or(runs, |m| m.failures.len()),
                failures: stats.as_ref().map_or_else(Vec::new, |m| {
                    m.failures
                        .iter()
                        .take(LISTED_FAILURES)
                        .map(|f| ErrorDoc::plain(format!("run {}", f.index + 1), f.message.clone()))
                        .collect()
                }),
                error: mc_error,
                spread,
                sensitivity,
                past_limit,
            });
        }
        let trials = (0..runs)
            .map(|i| TrialDoc {
                run: i,
                inputs: samples[i].clone(),
                values: outcomes[i]
                    .values
                    .iter()
                    .map(|v| v.as_ref().ok().copied().filter(|x| x.is_finite()))
                    .collect(),
            })
            .collect();
        Ok(RangesReport {
            runs,
            seed: self.doc.seed,
            sampler: "pcg32, inverse distribution functions, plain Monte Carlo",
            inputs: self
                .doc
                .inputs
                .iter()
                .zip(&self.base_values)
                .map(|(d, b)| RangedInputReport {
                    what: d.what.id(),
                    name: input_label(d),
                    quantity: d.what.quantity(),
                    layer: d.layer,
                    low: d.low,
                    high: d.high,
                    distribution: d.distribution,
                    base_value: *b,
                })
                .collect(),
            results,
            trials,
        })
    }
}

fn input_label(d: &RangedInputDoc) -> String {
    match d.layer {
        Some(k) => format!("{} (layer {})", d.what.name(), k + 1),
        None => d.what.name().to_string(),
    }
}

/// One result of one scenario (the parts it needs only).
pub fn evaluate(s: &Scenario, r: RangeResult) -> Result<f64, String> {
    evaluate_all(s, &[r]).remove(0)
}

/// Each of `results` for one scenario, running each part it needs once (the steady stack
/// serves the R-value and the winter; the shelter's two results come from one shelter run).
pub fn evaluate_all(s: &Scenario, results: &[RangeResult]) -> Vec<Result<f64, String>> {
    let msg = |e: InputErrors| e.to_string();
    let mut steady: Option<Result<crate::document::steady::Steady, String>> = None;
    let mut shelter: Option<Result<crate::document::shelter::ShelterReport, String>> = None;
    results
        .iter()
        .map(|&r| match r {
            RangeResult::RValue => steady
                .get_or_insert_with(|| crate::document::steady::compute(s).map_err(msg))
                .as_ref()
                .map(|c| c.result.r_total_m2k_w)
                .map_err(Clone::clone),
            RangeResult::FrostDepth => {
                let w = s.winter.as_ref().ok_or("the scenario has no winter")?;
                let c = steady
                    .get_or_insert_with(|| crate::document::steady::compute(s).map_err(msg))
                    .as_ref()
                    .map_err(Clone::clone)?;
                crate::document::winter::run_winter(w, &c.result.stack, &s.layers)
                    .map(|r| r.max_frost_depth_m)
                    .map_err(msg)
            }
            RangeResult::FrostBelowFooting => {
                let e = s.edge.as_ref().ok_or("the scenario has no building edge")?;
                crate::document::edge::run_edge_scenario(e)
                    .map(|r| r.max_frost_below_base_m)
                    .map_err(msg)
            }
            RangeResult::ShelterInterior | RangeResult::ShelterMelt => {
                let report = shelter.get_or_insert_with(|| {
                    let sh = s.shelter.as_ref().ok_or("the scenario has no shelter")?;
                    crate::document::shelter::run_shelter(sh).map_err(msg)
                });
                let report = report.as_ref().map_err(Clone::clone)?;
                Ok(if r == RangeResult::ShelterMelt {
                    report.melt_kg_h
                } else {
                    report.interior_c
                })
            }
        })
        .collect()
}

/// Run every task of a plan on up to `threads` threads (1 on wasm) and assemble the report.
/// Tasks are split by stride, so the report is the same for any number of threads.
pub fn run_plan(plan: &RangesPlan, threads: usize) -> Result<RangesReport, InputErrors> {
    let count = plan.task_count();
    let threads = threads.clamp(1, 64).min(count.max(1));
    let mut outcomes: Vec<Option<TaskOutcome>> = vec![None; count];
    if threads == 1 || cfg!(target_arch = "wasm32") {
        for (k, o) in outcomes.iter_mut().enumerate() {
            *o = Some(plan.run_task(k));
        }
    } else {
        let parts: Vec<Vec<(usize, TaskOutcome)>> = std::thread::scope(|scope| {
            let handles: Vec<_> = (0..threads)
                .map(|t| {
                    scope.spawn(move || {
                        (t..count)
                            .step_by(threads)
                            .map(|k| (k, plan.run_task(k)))
                            .collect::<Vec<_>>()
                    })
                })
                .collect();
            handles
                .into_iter()
                .map(|h| h.join().unwrap_or_default())
                .collect()
        });
        for (k, o) in parts.into_iter().flatten() {
            outcomes[k] = Some(o);
        }
    }
    let outcomes: Vec<TaskOutcome> = outcomes
        .into_iter()
        .enumerate()
        .map(|(k, o)| {
            o.unwrap_or_else(|| TaskOutcome {
                values: vec![Err(format!("task {k} did not run")); plan.results.len()],
            })
        })
        .collect();
    plan.assemble(&outcomes)
}

/// Check and run a scenario's ranges section (threads as in [`run_plan`]).
pub fn run_ranges(s: &Scenario, threads: usize) -> Result<RangesReport, InputErrors> {
    run_plan(&RangesPlan::new(s)?, threads)
}

/// Whether the scenario has the part a result comes from.
fn available(r: RangeResult, s: &Scenario) -> bool {
    match r {
        RangeResult::RValue => !s.layers.is_empty(),
        RangeResult::FrostDepth => s.winter.is_some(),
        RangeResult::FrostBelowFooting => s.edge.is_some(),
        RangeResult::ShelterInterior | RangeResult::ShelterMelt => s.shelter.is_some(),
    }
}
