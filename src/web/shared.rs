//! What the parts of the wasm face share: unit systems from the page's strings, values to
//! JS, errors as the page reads them, the page's clock, the one path every chart takes to
//! a canvas, and a sliced job's slice budget and step outcome.

use crate::document::vocabulary::ErrorDoc;
use crate::physics::error::InputErrors;
use crate::physics::units::UnitSystem;
use serde::Serialize;
use wasm_bindgen::prelude::*;

/// The unit system a page string names (SI for anything else).
pub fn units(id: &str) -> UnitSystem {
    UnitSystem::from_id(id).unwrap_or(UnitSystem::Si)
}

pub fn to_js<T: Serialize>(v: &T) -> JsValue {
    let ser = serde_wasm_bindgen::Serializer::json_compatible();
    v.serialize(&ser).unwrap_or(JsValue::NULL)
}

/// Errors as the page reads them, each naming its field.
pub fn error_docs(e: &InputErrors) -> Vec<ErrorDoc> {
    e.0.iter().map(ErrorDoc::from).collect()
}

/// The page's clock, ms.
pub fn clock_ms() -> f64 {
    web_sys::window()
        .and_then(|w| w.performance())
        .map_or(0.0, |p| p.now())
}

#[derive(Serialize)]
struct DrawOutcome {
    ok: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    message: Option<String>,
}

/// `{ok: true}`, or `{ok: false, message}`.
pub fn draw_outcome(message: Option<String>) -> JsValue {
    to_js(&DrawOutcome {
        ok: message.is_none(),
        message,
    })
}

/// A canvas as plotters draws on it.
pub type CanvasArea =
    plotters::drawing::DrawingArea<plotters_canvas::CanvasBackend, plotters::coord::Shift>;

/// Draw `report` with `f` on a canvas at its current pixel size: `{ok: true}`, or
/// `{ok: false, message}` when there is nothing to draw (`Err` carries why), the canvas has
/// no 2D context, or the chart fails. Every chart of the page goes through here.
pub fn draw_on<R>(
    canvas: web_sys::HtmlCanvasElement,
    report: Result<&R, &str>,
    f: impl FnOnce(&CanvasArea, &R) -> Result<(), crate::charts::frame::ChartError>,
) -> JsValue {
    let r = match report {
        Ok(r) => r,
        Err(why) => return draw_outcome(Some(why.to_string())),
    };
    let Some(backend) = plotters_canvas::CanvasBackend::with_canvas_object(canvas) else {
        return draw_outcome(Some("the canvas has no 2D context".into()));
    };
    use plotters::prelude::IntoDrawingArea;
    draw_outcome(
        f(&backend.into_drawing_area(), r)
            .err()
            .map(|e| e.to_string()),
    )
}

/// The time a slice may take, ms: what the page asks, within 1 ms and 10 s (16 ms for
/// anything that is not a number).
pub fn slice_budget(budget_ms: f64) -> f64 {
    if budget_ms.is_finite() {
        budget_ms.clamp(1.0, 10_000.0)
    } else {
        16.0
    }
}

#[derive(Serialize)]
struct Step<'a> {
    ok: bool,
    fraction: f64,
    finished: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    errors: Option<&'a [ErrorDoc]>,
}

/// `{ok, fraction, finished, errors?}` of a sliced job.
pub fn step_outcome(fraction: f64, finished: bool, errors: &[ErrorDoc]) -> JsValue {
    to_js(&Step {
        ok: errors.is_empty(),
        fraction,
        finished,
        errors: (!errors.is_empty()).then_some(errors),
    })
}
