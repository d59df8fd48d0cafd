//! The `least_thickness` part of a winter section: which layer's thickness to search, the
//! limit frost must stay above, and the range to search; the search run a slice at a time
//! (`DesignJob`) and its report. The search itself is [`crate::physics::least`].

use schemars::JsonSchema;
use serde::{Deserialize, Serialize};

use crate::physics::climate::Climate;
use crate::physics::error::{check, InputError, InputErrorKind, InputErrors};
use crate::physics::least::{
    limit_depth_m, with_layer_thickness, DesignAnswer, FrostLimit, Search, Searcher, Trial,
};
use crate::physics::stack::ResolvedStack;
use crate::physics::transient::run::{self};
use crate::physics::transient::setup::RunSpec;
use crate::scenario::LayerDoc;
use crate::scenario_winter::WinterDoc;

/// Find the least thickness of one layer that keeps frost above a limit through the
/// winter.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct LeastThicknessDoc {
    /// Index of the layer whose thickness is searched (0 = the top layer).
    pub layer: usize,
    pub keep_frost_above: FrostLimitDoc,
    /// The range searched, m.
    pub min_m: f64,
    pub max_m: f64,
    /// The answer's resolution, m (default 2 mm).
    #[serde(default = "default_resolution")]
    pub resolution_m: f64,
}

fn default_resolution() -> f64 {
    0.002
}

/// Where frost must stay above.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(tag = "kind", rename_all = "kebab-case", deny_unknown_fields)]
pub enum FrostLimitDoc {
    /// A depth below the top face, m (a pipe, a footing base).
    Depth { depth_m: f64 },
    /// The bottom face of a layer: what lies below it must not freeze.
    LayerBottom { layer: usize },
}

/// At most this many runs in one search.
pub const MAX_RUNS: usize = 16;

impl LeastThicknessDoc {
    fn check(&self, layers: usize, errs: &mut InputErrors) -> Option<(FrostLimit, Search)> {
        let f = "winter.least_thickness";
        let mut ok = true;
        if self.layer >= layers {
            errs.push(
                format!("{f}.layer"),
                InputErrorKind::Count {
                    count: self.layer + 1,
                    min: 1,
                    max: layers,
                },
            );
            ok = false;
        }
        ok &= check::within(errs, &format!("{f}.min_m"), self.min_m, 0.0, 10.0, "m");
        ok &= check::within(errs, &format!("{f}.max_m"), self.max_m, 0.001, 10.0, "m");
        ok &= check::within(
            errs,
            &format!("{f}.resolution_m"),
            self.resolution_m,
            1e-4,
            0.5,
            "m",
        );
        if ok && self.max_m <= self.min_m + self.resolution_m {
            errs.push(
                format!("{f}.max_m"),
                InputErrorKind::NotCovered(
                    "the largest thickness must exceed the smallest by more than the resolution"
                        .into(),
                ),
            );
            ok = false;
        }
        let limit = match self.keep_frost_above {
            FrostLimitDoc::Depth { depth_m } => {
                ok &= check::within(
                    errs,
                    &format!("{f}.keep_frost_above.depth_m"),
                    depth_m,
                    0.001,
                    100.0,
                    "m",
                );
                FrostLimit::Depth(depth_m)
            }
            FrostLimitDoc::LayerBottom { layer } => {
                if layer >= layers {
                    errs.push(
                        format!("{f}.keep_frost_above.layer"),
                        InputErrorKind::Count {
                            count: layer + 1,
                            min: 1,
                            max: layers,
                        },
                    );
                    ok = false;
                }
                FrostLimit::BottomOfLayer(layer)
            }
        };
        ok.then_some((
            limit,
            Search {
                lo: self.min_m,
                hi: self.max_m,
                tolerance: self.resolution_m,
                max_runs: MAX_RUNS,
            },
        ))
    }
}

/// One run of the search, as reported.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct TrialDoc {
    pub thickness_m: f64,
    pub frost_depth_m: f64,
    pub limit_m: f64,
}

impl From<&Trial> for TrialDoc {
    fn from(t: &Trial) -> Self {
        TrialDoc {
            thickness_m: t.value,
            frost_depth_m: t.frost_depth_m,
            limit_m: t.limit_m,
        }
    }
}

/// The search's report (SI).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LeastThicknessReport {
    /// `found`, `smallest-suffices`, `not-reachable` or `not-monotone`.
    pub outcome: &'static str,
    pub layer: usize,
    pub layer_name: String,
    /// The least thickness found (for `found`), the smallest of the range (for
    /// `smallest-suffices`); absent otherwise.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub thickness_m: Option<f64>,
    /// The deepest frost and the limit with that thickness (or with the range's end), m.
    pub frost_depth_m: f64,
    pub limit_m: f64,
    /// d(frost − limit)/d(thickness) near the answer (m per m; negative: more of the layer
    /// lifts the frost); absent where frost jumps across the answer (with the answer's
    /// thickness the ground below does not freeze at all).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub slope: Option<f64>,
    pub resolution_m: f64,
    /// For an insulation board: the R-value of the thickness found (or of the smallest of
    /// the range), m²K/W, at the board's conductivity as the run used it (moisture
    /// derating included), R = thickness / k.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub r_value_m2k_w: Option<f64>,
    /// Every run, in the order run.
    pub trials: Vec<TrialDoc>,
}

/// A search under way, advanced a slice at a time; each trial is a whole winter run.
#[derive(Debug, Clone)]
pub struct DesignJob {
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

impl DesignJob {
    /// Check the winter section (which must have a `least_thickness` part) and set up.
    pub fn new(
        w: &WinterDoc,
        stack: &ResolvedStack,
        layers: &[LayerDoc],
    ) -> Result<DesignJob, InputErrors> {
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
        Ok(DesignJob {
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
            DesignAnswer::Found {
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
            DesignAnswer::SmallestSuffices { trial } => {
                base("smallest-suffices", Some(trial.value), trial, None)
            }
            DesignAnswer::NotReachable { trial } => base("not-reachable", None, trial, None),
            DesignAnswer::NotMonotone { trials: t } => {
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
pub fn run_design(
    w: &WinterDoc,
    stack: &ResolvedStack,
    layers: &[LayerDoc],
) -> Result<LeastThicknessReport, InputErrors> {
    let mut job = DesignJob::new(w, stack, layers)?;
    while !job.advance(usize::MAX)?.finished {}
    job.report().ok_or_else(|| {
        InputError::new(
            "winter.least_thickness",
            InputErrorKind::NotCovered("no answer".into()),
        )
        .into()
    })
}
