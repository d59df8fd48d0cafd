//! The `least_thickness` part of a winter section: which layer's thickness to search, the
//! limit frost must stay above, and the range to search; the search run a slice at a time
//! (`LeastThicknessJob`) and its report. The search itself is [`crate::physics::least`].
//!
//! The part reads `winter.least_thickness`: the layer, `keep_frost_above` (a depth, or a
//! layer's bottom: a pipe under a cover), `min_m`, `max_m` and `resolution_m`, each checked
//! with its field path. The job runs the search's stepper a slice at a time, each trial a
//! whole winter run, at most [`crate::document::winter::MAX_RUNS`] of them; the report
//! gives the outcome, the thickness, the frost and the limit at it, the slope where frost
//! does not jump, and every trial. [`crate::document::compute::compute_with_winter`] runs
//! it for the CLI (into `WinterReport::least_thickness`); the page runs it on request
//! through the wasm face.

use super::winter::{LeastThicknessReport, TrialDoc, MAX_RUNS};
use crate::document::vocabulary::LayerDoc;
use crate::document::winter::WinterDoc;
use crate::physics::climate::Climate;
use crate::physics::error::{InputError, InputErrorKind, InputErrors};
use crate::physics::least::{
    limit_depth_m, with_layer_thickness, FrostLimit, LeastAnswer, Searcher, Trial,
};
use crate::physics::stack::ResolvedStack;
use crate::physics::transient::run;
use crate::physics::transient::setup::RunSpec;

/// A search under way, advanced a slice at a time; each trial is a whole winter run.
#[derive(Debug, Clone)]
pub struct LeastThicknessJob {
    spec: RunSpec,
    climate: Climate,
    layer: usize,
    layer_name: String,
    limit: FrostLimit,
    resolution_m: f64,
    searcher: Searcher,
    current: Option<(f64, run::Run)>,
}

fn run_error(e: crate::physics::transient::TransientError) -> InputErrors {
    InputErrors::from(InputError::new(
        "winter",
        InputErrorKind::NotCovered(e.to_string()),
    ))
}

impl LeastThicknessJob {
    /// Check the winter section (which must have a `least_thickness` part) and set up.
    pub fn new(
        w: &WinterDoc,
        stack: &ResolvedStack,
        layers: &[LayerDoc],
    ) -> Result<LeastThicknessJob, InputErrors> {
        let Some(d) = &w.least_thickness else {
            return Err(InputError::new(
                "winter.least_thickness",
                InputErrorKind::NotCovered("the winter section asks for no search".into()),
            )
            .into());
        };
        let mut errs = InputErrors::default();
        let checked = d.check(stack.layers.len(), &mut errs);
        let spec = match w.run_spec(stack, layers) {
            Ok(v) => Some(v),
            Err(e) => {
                for x in e.0 {
                    errs.0.push(x);
                }
                None
            }
        };
        errs.into_result()?;
        let (Some((limit, search)), Some((spec, climate))) = (checked, spec) else {
            return Err(
                InputError::new("winter", InputErrorKind::NotCovered("invalid".into())).into(),
            );
        };
        Ok(LeastThicknessJob {
            spec,
            climate,
            layer: d.layer,
            layer_name: stack.layers[d.layer].name.clone(),
            limit,
            resolution_m: d.resolution_m,
            searcher: Searcher::new(search),
            current: None,
        })
    }

    /// Advance by at most `max_steps` time steps; the share of the work done (each run
    /// counted as an equal share of [`MAX_RUNS`] until the search ends) and whether it has
    /// ended.
    pub fn advance(&mut self, max_steps: usize) -> Result<run::Progress, InputErrors> {
        let mut budget = max_steps;
        while budget > 0 {
            if self.current.is_none() {
                let Some(x) = self.searcher.next_value() else {
                    break;
                };
                let r = run::Run::new(&with_layer_thickness(&self.spec, self.layer, x))
                    .map_err(run_error)?;
                self.current = Some((x, r));
            }
            let Some((x, r)) = self.current.as_mut() else {
                break;
            };
            let steps = budget.min(256);
            let p = r.advance(&self.climate, steps).map_err(run_error)?;
            budget -= steps;
            if p.finished {
                let x = *x;
                let Some((_, r)) = self.current.take() else {
                    break;
                };
                let res = r.finish();
                let mut thicknesses = self.spec.thicknesses_m.clone();
                thicknesses[self.layer] = x;
                self.searcher.record(Trial {
                    value: x,
                    frost_depth_m: res.max_frost_depth_m,
                    limit_m: limit_depth_m(self.limit, &thicknesses),
                });
            }
        }
        Ok(self.progress())
    }

    pub fn progress(&self) -> run::Progress {
        let done = self.searcher.trials().len() as f64;
        let part = self
            .current
            .as_ref()
            .map_or(0.0, |(_, r)| r.progress().fraction);
        let finished = self.searcher.answer().is_some();
        run::Progress {
            fraction: if finished {
                1.0
            } else {
                ((done + part) / MAX_RUNS as f64).min(0.99)
            },
            finished,
        }
    }

    /// The report (`None` before the search has ended).
    /// R = t / k of the sized layer when it is an insulation board (constant k).
    fn board_r_value(&self, thickness_m: f64) -> Option<f64> {
        let m = self.spec.materials.get(self.layer)?;
        if m.family != crate::physics::materials::Family::Insulation {
            return None;
        }
        let k = m.conductivity.k(0.0);
        (k > 0.0 && k.is_finite()).then(|| thickness_m / k)
    }

    pub fn report(&self) -> Option<LeastThicknessReport> {
        let answer = self.searcher.answer()?;
        let trials: Vec<TrialDoc> = self.searcher.trials().iter().map(TrialDoc::from).collect();
        let base = |outcome, thickness_m, t: &Trial, slope| LeastThicknessReport {
            outcome,
            layer: self.layer,
            layer_name: self.layer_name.clone(),
            thickness_m,
            frost_depth_m: t.frost_depth_m,
            limit_m: t.limit_m,
            slope,
            resolution_m: self.resolution_m,
            r_value_m2k_w: thickness_m.and_then(|t: f64| self.board_r_value(t)),
            trials: trials.clone(),
        };
        Some(match answer {
            LeastAnswer::Found {
                value,
                frost_depth_m,
                limit_m,
                slope,
                ..
            } => base(
                "found",
                Some(*value),
                &Trial {
                    value: *value,
                    frost_depth_m: *frost_depth_m,
                    limit_m: *limit_m,
                },
                // Where the holding run's ground does not freeze at all, frost jumps
                // across the answer and a slope means nothing.
                (*frost_depth_m > 0.0).then_some(*slope),
            ),
            LeastAnswer::SmallestSuffices { trial } => {
                base("smallest-suffices", Some(trial.value), trial, None)
            }
            LeastAnswer::NotReachable { trial } => base("not-reachable", None, trial, None),
            LeastAnswer::NotMonotone { trials: t } => {
                let last = t.last().copied().unwrap_or(Trial {
                    value: 0.0,
                    frost_depth_m: 0.0,
                    limit_m: 0.0,
                });
                base("not-monotone", None, &last, None)
            }
        })
    }
}

/// Run the search to its end and report it.
pub fn run_least_thickness(
    w: &WinterDoc,
    stack: &ResolvedStack,
    layers: &[LayerDoc],
) -> Result<LeastThicknessReport, InputErrors> {
    let mut job = LeastThicknessJob::new(w, stack, layers)?;
    while !job.advance(usize::MAX)?.finished {}
    job.report().ok_or_else(|| {
        InputError::new(
            "winter.least_thickness",
            InputErrorKind::NotCovered("no answer".into()),
        )
        .into()
    })
}
