//! The ranges study of a scenario (its `ranges` section) as independent tasks, so the page
//! can spread them over Web Workers, and the scenario's own value of an uncertain input.

use super::shared::{
    clock_ms, draw_on, error_docs, slice_budget, step_outcome, to_js, units, CanvasArea,
};
use crate::document::scenario;
use crate::document::vocabulary::ErrorDoc;
use serde::Serialize;
use wasm_bindgen::prelude::*;

/// A scenario from the page (a worker has no edited scenario: it is handed the scenario).
fn read_scenario(v: JsValue) -> Result<scenario::Scenario, Vec<ErrorDoc>> {
    let value: serde_json::Value = serde_wasm_bindgen::from_value(v).map_err(|e| {
        vec![ErrorDoc::plain(
            "",
            format!("the scenario is not a JSON object: {e}"),
        )]
    })?;
    scenario::from_value(value).map_err(|e| error_docs(&e))
}

/// One task's outcome as it crosses from a worker to the page: per result, a value or
/// the reason there is none.
#[derive(Serialize, serde::Deserialize)]
struct TaskOutcomeDoc {
    values: Vec<Option<f64>>,
    errors: Vec<Option<String>>,
}

impl From<&crate::document::ranges::plan::TaskOutcome> for TaskOutcomeDoc {
    fn from(o: &crate::document::ranges::plan::TaskOutcome) -> Self {
        TaskOutcomeDoc {
            values: o.values.iter().map(|v| v.as_ref().ok().copied()).collect(),
            errors: o.values.iter().map(|v| v.as_ref().err().cloned()).collect(),
        }
    }
}

/// A scenario's ranges study (its `ranges` section) as independent tasks, so the page can
/// spread them over Web Workers: each worker makes its own `RangesStudy` from the same
/// scenario and calls `run_task(k)` for its share; the page's own study `record`s each
/// outcome and, once all are in, gives the `report` (the same, to the bit, whatever the
/// order). `advance` runs the tasks here instead, a slice at a time. The constructor never
/// throws.
#[wasm_bindgen]
pub struct RangesStudy {
    plan: Option<crate::document::ranges::plan::RangesPlan>,
    outcomes: Vec<Option<crate::document::ranges::plan::TaskOutcome>>,
    recorded: usize,
    next: usize,
    report: Option<crate::document::ranges::report::RangesReport>,
    errors: Vec<ErrorDoc>,
}

#[wasm_bindgen]
impl RangesStudy {
    /// Check the scenario and its ranges section and set up.
    #[wasm_bindgen(constructor)]
    pub fn new(scenario_value: JsValue) -> RangesStudy {
        let plan = read_scenario(scenario_value).and_then(|s| {
            crate::document::ranges::plan::RangesPlan::new(&s).map_err(|e| error_docs(&e))
        });
        match plan {
            Ok(p) => RangesStudy {
                outcomes: vec![None; p.task_count()],
                plan: Some(p),
                recorded: 0,
                next: 0,
                report: None,
                errors: Vec::new(),
            },
            Err(errors) => RangesStudy {
                plan: None,
                outcomes: Vec::new(),
                recorded: 0,
                next: 0,
                report: None,
                errors,
            },
        }
    }

    /// Why the study cannot go on (`[]` while it can).
    pub fn errors(&self) -> JsValue {
        to_js(&self.errors)
    }

    /// How many tasks the study has (0 when it cannot run).
    pub fn task_count(&self) -> usize {
        self.plan.as_ref().map_or(0, |p| p.task_count())
    }

    /// How many outcomes are in.
    pub fn recorded(&self) -> usize {
        self.recorded
    }

    /// What task `k` is: `{kind: "sample"|"base"|"low"|"high"|"regression", input?, regression?}`.
    pub fn task_kind(&self, k: usize) -> JsValue {
        use crate::document::ranges::plan::Task;
        #[derive(Serialize)]
        struct Kind {
            kind: &'static str,
            index: Option<usize>,
            regression: Option<&'static str>,
        }
        let kind = self.plan.as_ref().and_then(|p| p.task(k)).map(|t| match t {
            Task::Sample(i) => Kind {
                kind: "sample",
                index: Some(i),
                regression: None,
            },
            Task::Base => Kind {
                kind: "base",
                index: None,
                regression: None,
            },
            Task::End { input, high } => Kind {
                kind: if high { "high" } else { "low" },
                index: Some(input),
                regression: None,
            },
            Task::Regression(c) => Kind {
                kind: "regression",
                index: None,
                regression: Some(c.id()),
            },
        });
        kind.as_ref().map_or(JsValue::NULL, to_js)
    }

    /// Run task `k` here and return its outcome `{values: [number|null], errors:
    /// [string|null]}` (one entry per result), for `record` on the page's study. Past the
    /// last task, or on a study that cannot run, every entry is an error.
    pub fn run_task(&self, k: usize) -> JsValue {
        match &self.plan {
            Some(p) => to_js(&TaskOutcomeDoc::from(&p.run_task(k))),
            None => to_js(&TaskOutcomeDoc {
                values: vec![None],
                errors: vec![Some("the study cannot run".into())],
            }),
        }
    }

    /// Record task `k`'s outcome (as `run_task` gave it). Returns whether it was taken: not
    /// for an unknown task, one already in, or an outcome of the wrong shape. The last one
    /// in makes the report.
    pub fn record(&mut self, k: usize, outcome: JsValue) -> bool {
        let Some(plan) = &self.plan else {
            return false;
        };
        let Ok(doc) = serde_wasm_bindgen::from_value::<TaskOutcomeDoc>(outcome) else {
            return false;
        };
        let n = plan.results().len();
        if doc.values.len() != n || doc.errors.len() != n {
            return false;
        }
        let Some(slot @ None) = self.outcomes.get_mut(k) else {
            return false;
        };
        let values = doc
            .values
            .into_iter()
            .zip(doc.errors)
            .map(|(v, e)| match (v, e) {
                (Some(v), None) => Ok(v),
                (_, e) => Err(e.unwrap_or_else(|| "no value".into())),
            })
            .collect();
        *slot = Some(crate::document::ranges::plan::TaskOutcome { values });
        self.recorded += 1;
        if self.recorded == self.outcomes.len() {
            self.finish();
        }
        true
    }

    /// Run the next tasks here for about `budget_ms` milliseconds (at least one):
    /// `{ok, fraction, finished, errors?}`.
    pub fn advance(&mut self, budget_ms: f64) -> JsValue {
        let t0 = clock_ms();
        let budget = slice_budget(budget_ms);
        if let Some(plan) = &self.plan {
            while self.next < self.outcomes.len() {
                let k = self.next;
                self.next += 1;
                if self.outcomes[k].is_none() {
                    self.outcomes[k] = Some(plan.run_task(k));
                    self.recorded += 1;
                }
                if clock_ms() - t0 >= budget {
                    break;
                }
            }
        }
        if self.plan.is_some() && self.recorded == self.outcomes.len() && self.report.is_none() {
            self.finish();
        }
        let fraction = if self.outcomes.is_empty() {
            0.0
        } else {
            self.recorded as f64 / self.outcomes.len() as f64
        };
        let finished = self.report.is_some();
        step_outcome(
            if finished { 1.0 } else { fraction },
            finished,
            &self.errors,
        )
    }

    /// The report once every outcome is in, or null.
    pub fn report(&self) -> JsValue {
        self.report.as_ref().map_or(JsValue::NULL, to_js)
    }

    /// Draw result `index`'s Monte Carlo values (a histogram with P10, P50, P90, the base
    /// case and the spread across snow regressions).
    pub fn draw_spread(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        index: usize,
        unit_system: &str,
        pixel_ratio: f64,
    ) -> JsValue {
        self.draw(canvas, |root, r| {
            crate::charts::ranges::draw_report_spread(
                root,
                r,
                index,
                units(unit_system),
                pixel_ratio,
            )
        })
    }

    /// Draw result `index`'s one-at-a-time swings (largest on top).
    pub fn draw_sensitivity(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        index: usize,
        unit_system: &str,
        pixel_ratio: f64,
    ) -> JsValue {
        self.draw(canvas, |root, r| {
            crate::charts::ranges::draw_report_sensitivity(
                root,
                r,
                index,
                units(unit_system),
                pixel_ratio,
            )
        })
    }

    /// Every Monte Carlo run as CSV in the chosen units (empty before the end).
    pub fn trials_csv(&self, unit_system: &str) -> String {
        self.report.as_ref().map_or_else(String::new, |r| {
            crate::document::ranges::csv::trials_csv(r, units(unit_system))
        })
    }

    /// The summary per result as CSV in the chosen units (empty before the end).
    pub fn summary_csv(&self, unit_system: &str) -> String {
        self.report.as_ref().map_or_else(String::new, |r| {
            crate::document::ranges::csv::summary_csv(r, units(unit_system))
        })
    }
}

impl RangesStudy {
    fn draw(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        f: impl FnOnce(
            &CanvasArea,
            &crate::document::ranges::report::RangesReport,
        ) -> Result<(), crate::charts::frame::ChartError>,
    ) -> JsValue {
        draw_on(
            canvas,
            self.report.as_ref().ok_or("the study has not finished"),
            f,
        )
    }

    fn finish(&mut self) {
        let Some(plan) = &self.plan else { return };
        let outcomes: Vec<_> = self.outcomes.iter().flatten().cloned().collect();
        match plan.assemble(&outcomes) {
            Ok(r) => self.report = Some(r),
            Err(e) => self.errors = error_docs(&e),
        }
    }
}

/// The scenario's own value of an uncertain input (`what` as in the ranges section; `layer`
/// a stack layer, or negative for every field of the kind), SI; null when it has none or
/// the scenario cannot be read. For the page's default ranges.
#[wasm_bindgen]
pub fn ranges_base_value(scenario_value: JsValue, what: &str, layer: i32) -> JsValue {
    let Ok(s) = read_scenario(scenario_value) else {
        return JsValue::NULL;
    };
    let Some(w) = crate::document::ranges::RangedWhat::ALL
        .into_iter()
        .find(|w| w.id() == what)
    else {
        return JsValue::NULL;
    };
    let layer = usize::try_from(layer).ok();
    crate::document::ranges::apply::base_value(&s, w, layer)
        .map_or(JsValue::NULL, JsValue::from_f64)
}
