//! The wasm face: a thin layer between the page's JavaScript and the core. Compiled for
//! wasm32 only. Every export takes plain JS values, returns plain JS objects and never panics
//! on user input; a panic hook shows any bug on the page.
//!
//! The parts: [`catalogue`] (what the page offers to choose from, with sources, the unit
//! table and the defaults a new section starts from); [`edited`] (the scenario the page
//! edits, [`EditedScenario`]: read and checked once per edit, and the report, the profile
//! chart, its CSV and the section jobs served from it); [`jobs`] (one sliced job, [`Job`],
//! over every section run: a winter, a least-thickness search, an edge, an edge search, a
//! shelter); [`ranges`] (the ranges study, split over Web Workers); [`benchmarks`]; and
//! `shared.rs`, the conversions and the one canvas-drawing path the others share. This
//! file holds the start, the panic hook, the bundled examples and the climate import.

pub mod benchmarks;
pub mod catalogue;
pub mod edited;
pub mod jobs;
pub mod ranges;
mod shared;

pub use benchmarks::{benchmark_edge_winter, benchmark_reference_year};
pub use catalogue::{catalogue, read_value, write_value};
pub use edited::EditedScenario;
pub use jobs::Job;
pub use ranges::{ranges_base_value, RangesStudy};

use crate::document::examples;
use crate::document::scenario;
use crate::document::vocabulary::ErrorDoc;
use serde::Serialize;
use shared::to_js;
use wasm_bindgen::prelude::*;

/// Show a panic on the page (element `#panic`) and in the console.
fn panic_hook(info: &std::panic::PanicHookInfo<'_>) {
    show_internal_error(&format!("Internal error (please report it): {info}"));
}

/// What the panic hook does with its message: the console, and the page's `#panic` box
/// (unhidden). Public so the wasm tests can check it without panicking.
pub fn show_internal_error(msg: &str) {
    web_sys::console::error_1(&JsValue::from_str(msg));
    if let Some(el) = web_sys::window()
        .and_then(|w| w.document())
        .and_then(|d| d.get_element_by_id("panic"))
    {
        el.set_text_content(Some(msg));
        let _ = el.remove_attribute("hidden");
    }
}

#[wasm_bindgen(start)]
pub fn start() {
    std::panic::set_hook(Box::new(panic_hook));
}

#[derive(Serialize)]
struct ExampleInfo {
    id: &'static str,
    title: String,
    summary: &'static str,
}

/// A bundled example read through a JSON value, the path the page's own scenarios take
/// (`scenario::from_value`): reading text straight into the document would build a second
/// copy of every deserializer into the module (about 100 KiB) for eight known-good files.
fn bundled(json: &str) -> Result<scenario::Scenario, ErrorDoc> {
    let v: serde_json::Value =
        serde_json::from_str(json).map_err(|e| ErrorDoc::plain("", e.to_string()))?;
    scenario::from_value(v).map_err(|e| ErrorDoc::plain("", e.to_string()))
}

/// The bundled examples: `[{id, title, summary}]`.
#[wasm_bindgen]
pub fn examples() -> JsValue {
    let list: Vec<ExampleInfo> = examples::EXAMPLES
        .iter()
        .map(|e| ExampleInfo {
            id: e.id,
            title: bundled(e.json)
                .map(|s| s.title)
                .unwrap_or_else(|_| e.id.to_string()),
            summary: e.summary,
        })
        .collect();
    to_js(&list)
}

/// One example as a scenario object, or null if there is none by that id.
#[wasm_bindgen]
pub fn example(id: &str) -> JsValue {
    match examples::example(id).map(|e| bundled(e.json)) {
        Some(Ok(s)) => to_js(&s),
        _ => JsValue::NULL,
    }
}

/// JSON Schema of the scenario format.
#[wasm_bindgen]
pub fn scenario_schema() -> JsValue {
    to_js(&scenario::schema())
}

/// Read a daily climate record from CSV text with the units chosen
/// (`{temperature, snow_depth?, snow_density?, skip_bad_lines?, fill_gaps_days?,
/// season_start_month?}`): `{ok, days, summary, problems, errors}`; every problem names its
/// line.
#[wasm_bindgen]
pub fn import_climate_csv(text: &str, options: JsValue) -> JsValue {
    match serde_wasm_bindgen::from_value::<crate::document::climate_import::ImportOptions>(options)
    {
        Ok(o) => to_js(&crate::document::climate_import::import_csv(text, &o)),
        Err(e) => to_js(&crate::document::climate_import::ImportOutcome {
            ok: false,
            problems: Vec::new(),
            more_problems: 0,
            errors: vec![ErrorDoc::plain("import", e.to_string())],
            summary: None,
            days: Vec::new(),
        }),
    }
}

#[derive(Serialize)]
struct SummaryOutcome {
    ok: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    summary: Option<crate::document::climate_import::ImportSummary>,
    #[serde(skip_serializing_if = "Vec::is_empty")]
    errors: Vec<ErrorDoc>,
}

/// Summarise daily records already in a scenario (`[{date, mean_air_c, …}]`): their span,
/// each winter's freezing index and the design values: `{ok, summary}` or `{ok, errors}`.
#[wasm_bindgen]
pub fn summarise_days(days: JsValue, season_start_month: u32) -> JsValue {
    let out = match serde_wasm_bindgen::from_value::<Vec<crate::document::weather::DayDoc>>(days) {
        Ok(d) => match crate::document::climate_import::summarise_days(&d, season_start_month) {
            Ok(s) => SummaryOutcome {
                ok: true,
                summary: Some(s),
                errors: Vec::new(),
            },
            Err(errors) => SummaryOutcome {
                ok: false,
                summary: None,
                errors,
            },
        },
        Err(e) => SummaryOutcome {
            ok: false,
            summary: None,
            errors: vec![ErrorDoc::plain("winter.climate.days", e.to_string())],
        },
    };
    to_js(&out)
}
