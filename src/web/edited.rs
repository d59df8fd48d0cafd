//! The scenario the page edits, [`EditedScenario`]: the page makes one, and after each edit
//! hands it the whole scenario with `set`, which reads and checks it once and solves its
//! steady stack once. The report, the profile chart and its CSV, and every section job
//! (`start`) are then served from what it holds, without the scenario crossing again.
//!
//! Each part reads only its own sections, so an error in one never blocks another: the
//! stack and the winter leave the shelter, the edge and the ranges aside; the
//! least-thickness search the ranges; the edge the winter, the shelter and the ranges; the
//! shelter the winter, the edge and the ranges. When the whole scenario reads, each part is
//! served from it; when it does not, each part reads its own share of the scenario, so it
//! is refused for its own errors only.

use super::jobs::{Finished, Job, Kind, Running};
use super::shared::{draw_on, error_docs, to_js, units};
use crate::document::compute::{self, Computed};
use crate::document::scenario::{self, Scenario};
use crate::document::vocabulary::ErrorDoc;
use crate::document::{edge, edge_least, shelter, steady, winter, winter_least};
use serde::Serialize;
use std::borrow::Cow;
use std::rc::Rc;
use wasm_bindgen::prelude::*;

/// The sections the stack (and the winter run, which starts from it) leaves aside.
const STACK_LEAVES: [&str; 3] = ["shelter", "edge", "ranges"];
/// The sections the least-thickness search leaves aside.
const SEARCH_LEAVES: [&str; 1] = ["ranges"];
/// The sections the edge (and its search) leaves aside.
const EDGE_LEAVES: [&str; 3] = ["winter", "shelter", "ranges"];
/// The sections the shelter leaves aside.
const SHELTER_LEAVES: [&str; 3] = ["winter", "edge", "ranges"];

#[derive(Serialize)]
struct Outcome<'a> {
    ok: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    report: Option<&'a compute::Report>,
    #[serde(skip_serializing_if = "Option::is_none")]
    errors: Option<&'a [ErrorDoc]>,
}

/// The scenario the page edits, read and checked once per edit. Never throws.
#[wasm_bindgen]
pub struct EditedScenario {
    /// The scenario as last set, as JSON, or why it is not an object.
    value: Result<serde_json::Value, Vec<ErrorDoc>>,
    /// The whole scenario read, or why not.
    whole: Result<Scenario, Vec<ErrorDoc>>,
    /// The steady solve of the stack (its part of the scenario), or why there is none.
    stack: Result<Rc<Computed>, Vec<ErrorDoc>>,
    /// The report of the last `set`, when its stack computed.
    report: Option<compute::Report>,
    /// The last stack that computed: the profile chart and its CSV are drawn from it while
    /// newer inputs do not compute.
    shown: Option<Rc<Computed>>,
}

impl Default for EditedScenario {
    fn default() -> Self {
        EditedScenario::new()
    }
}

/// `value` without the sections named.
fn without(value: &serde_json::Value, keys: &[&str]) -> serde_json::Value {
    let mut v = value.clone();
    if let serde_json::Value::Object(m) = &mut v {
        for k in keys {
            m.remove(*k);
        }
    }
    v
}

fn read(value: serde_json::Value) -> Result<Scenario, Vec<ErrorDoc>> {
    scenario::from_value(value).map_err(|e| error_docs(&e))
}

fn solve(s: &Scenario) -> Result<Rc<Computed>, Vec<ErrorDoc>> {
    steady::compute(s)
        .map(|c| Rc::new(c.into()))
        .map_err(|e| error_docs(&e))
}

fn no_section(name: &str) -> Vec<ErrorDoc> {
    vec![ErrorDoc::plain(
        name,
        format!("the scenario has no {name} section"),
    )]
}

impl EditedScenario {
    /// The scenario as a part reads it, leaving aside the sections `leaves`: the whole one
    /// when it reads, else its share of the scenario read on its own.
    fn part(&self, leaves: &[&str]) -> Result<Cow<'_, Scenario>, Vec<ErrorDoc>> {
        match (&self.whole, &self.value) {
            (Ok(s), _) => Ok(Cow::Borrowed(s)),
            (Err(_), Ok(v)) => read(without(v, leaves)).map(Cow::Owned),
            (Err(_), Err(e)) => Err(e.clone()),
        }
    }

    /// A part that starts from the stack's steady solve: the part and the solve.
    fn part_with_stack(
        &self,
        leaves: &[&str],
    ) -> Result<(Cow<'_, Scenario>, Rc<Computed>), Vec<ErrorDoc>> {
        let s = self.part(leaves)?;
        // The stack reads only the layers and the faces, the same in every part: its solve
        // is the one `set` made whenever the whole scenario read.
        let c = match (&self.whole, &self.stack) {
            (Ok(_), stack) => stack.clone()?,
            (Err(_), _) => solve(&s)?,
        };
        Ok((s, c))
    }

    fn winter_job(&self, kind: Kind) -> Result<Running, Vec<ErrorDoc>> {
        let leaves: &[&str] = if kind == Kind::Winter {
            &STACK_LEAVES
        } else {
            &SEARCH_LEAVES
        };
        let (s, c) = self.part_with_stack(leaves)?;
        let Some(w) = &s.winter else {
            return Err(no_section("winter"));
        };
        let stack = &c.steady.result.stack;
        let made = if kind == Kind::Winter {
            winter::WinterJob::new(w, stack, &s.layers).map(|j| Running::Winter(Box::new(j)))
        } else {
            winter_least::LeastThicknessJob::new(w, stack, &s.layers)
                .map(|j| Running::LeastThickness(Box::new(j)))
        };
        made.map_err(|e| error_docs(&e))
    }

    fn edge_job(&self, kind: Kind) -> Result<Running, Vec<ErrorDoc>> {
        let s = self.part(&EDGE_LEAVES)?;
        let Some(d) = &s.edge else {
            return Err(no_section("edge"));
        };
        let made = if kind == Kind::Edge {
            edge::EdgeJob::new(d).map(|j| Running::Edge(Box::new(j)))
        } else {
            edge_least::EdgeLeastJob::new(d).map(|j| Running::EdgeLeast(Box::new(j)))
        };
        made.map_err(|e| error_docs(&e))
    }

    fn shelter_job(&self) -> Job {
        let s = match self.part(&SHELTER_LEAVES) {
            Ok(s) => s,
            Err(e) => return Job::refused(Kind::Shelter, e),
        };
        let Some(doc) = &s.shelter else {
            return Job::refused(Kind::Shelter, no_section("shelter"));
        };
        match shelter::run_shelter(doc) {
            Ok(r) => Job::finished(Kind::Shelter, Finished::Shelter(Box::new(r))),
            Err(e) => Job::refused(Kind::Shelter, error_docs(&e)),
        }
    }

    fn outcome(&self) -> JsValue {
        match (&self.stack, &self.report) {
            (Ok(_), Some(r)) => to_js(&Outcome {
                ok: true,
                report: Some(r),
                errors: None,
            }),
            (Err(e), _) => to_js(&Outcome {
                ok: false,
                report: None,
                errors: Some(e),
            }),
            (Ok(_), None) => to_js(&Outcome {
                ok: false,
                report: None,
                errors: Some(&[ErrorDoc::plain("", "no scenario has been set")]),
            }),
        }
    }
}

#[wasm_bindgen]
impl EditedScenario {
    /// An edited scenario with nothing set yet.
    #[wasm_bindgen(constructor)]
    pub fn new() -> EditedScenario {
        let none = || vec![ErrorDoc::plain("", "no scenario has been set")];
        EditedScenario {
            value: Err(none()),
            whole: Err(none()),
            stack: Err(none()),
            report: None,
            shown: None,
        }
    }

    /// Take the scenario as it now stands: read and check it, solve its stack. Returns the
    /// stack's outcome, `{ok: true, report}` or `{ok: false, errors: [{field, message}]}`
    /// (the stack's part only: see the module docs).
    pub fn set(&mut self, scenario_value: JsValue) -> JsValue {
        self.value =
            serde_wasm_bindgen::from_value::<serde_json::Value>(scenario_value).map_err(|e| {
                vec![ErrorDoc::plain(
                    "",
                    format!("the scenario is not a JSON object: {e}"),
                )]
            });
        self.whole = match &self.value {
            Ok(v) => read(v.clone()),
            Err(e) => Err(e.clone()),
        };
        let (stack, report) = match self.part(&STACK_LEAVES) {
            Ok(s) => match solve(&s) {
                Ok(c) => {
                    let r = compute::report(&s, &c);
                    (Ok(c), Some(r))
                }
                Err(e) => (Err(e), None),
            },
            Err(e) => (Err(e), None),
        };
        self.stack = stack;
        self.report = report;
        if let Ok(c) = &self.stack {
            self.shown = Some(c.clone());
        }
        self.outcome()
    }

    /// The report of the last `set`, or null when its stack did not compute.
    pub fn report(&self) -> JsValue {
        self.report.as_ref().map_or(JsValue::NULL, to_js)
    }

    /// Draw the temperature profile of the last stack that computed on a canvas at its
    /// current pixel size: `{ok}` or `{ok: false, message}`.
    pub fn draw_profile(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        unit_system: &str,
        pixel_ratio: f64,
    ) -> JsValue {
        let sys = units(unit_system);
        draw_on(
            canvas,
            self.shown.as_deref().ok_or("no stack has computed yet"),
            |root, c| crate::charts::profile::draw_profile(root, &c.steady, sys, pixel_ratio),
        )
    }

    /// The steady profile the chart draws (of the last stack that computed), as CSV in the
    /// chosen units; empty when none has.
    pub fn profile_csv(&self, unit_system: &str) -> String {
        self.shown.as_ref().map_or_else(String::new, |c| {
            steady::profile_csv(&c.steady, units(unit_system))
        })
    }

    /// Start a section's job on the scenario as last set: `winter`, `least-thickness`,
    /// `edge`, `edge-least` or `shelter` (computed at once). A job that cannot run, or a
    /// kind there is none of, comes back with its `errors()`.
    pub fn start(&self, kind: &str) -> Job {
        let k = Kind::from_id(kind).unwrap_or(Kind::Unknown);
        match k {
            Kind::Winter | Kind::LeastThickness => Job::made(k, self.winter_job(k)),
            Kind::Edge | Kind::EdgeLeast => Job::made(k, self.edge_job(k)),
            Kind::Shelter => self.shelter_job(),
            Kind::Unknown => Job::refused(
                k,
                vec![ErrorDoc::plain("", format!("there is no job \"{kind}\""))],
            ),
        }
    }
}
