//! `edge.least` in the scenario format: the search over the 2D edge as a scenario asks for
//! it (round trip, errors named under `edge.least`, the CLI's report), checked against runs
//! of its own.

use hibernal::document::compute;
use hibernal::document::edge::run_edge_scenario;
use hibernal::document::examples;
use hibernal::document::scenario;
use serde_json::{json, Value};

/// The invented unheated store, on coarse cells and a shorter winter so each try is cheap
/// (the numbers are not the example's; the checks compare runs on the same grid).
fn quick_store() -> Value {
    let mut v: Value =
        serde_json::from_str(examples::example("unheated-storage-edge").unwrap().json).unwrap();
    v["edge"]["grid"] = json!({ "fine_m": 0.05, "growth_ratio": 1.3, "max_cell_m": 0.8 });
    v["edge"]["duration_days"] = json!(150);
    v
}

fn frost_below_base(v: &Value) -> f64 {
    let mut v = v.clone();
    v["edge"].as_object_mut().unwrap().remove("least");
    let s = scenario::from_value(v).unwrap();
    run_edge_scenario(s.edge.as_ref().unwrap())
        .unwrap()
        .max_frost_below_base_m
}

#[test]
fn the_least_wing_width_holds_and_a_resolution_less_does_not() {
    // The answer's promise, checked by runs of its own on the same grid: with the wing at
    // the answer frost stays at or above the base (within the search's 1 mm read-off
    // allowance, design::MONOTONE_NOISE_M), a resolution narrower it gets below.
    let mut v = quick_store();
    let bare = frost_below_base(&v);
    assert!(bare > 0.0, "the store's footing freezes as set: {bare}");
    v["edge"]["least"] =
        json!({ "quantity": "wing-width", "min": 0.0, "max": 2.5, "resolution": 0.05 });
    let s = scenario::from_value(v.clone()).unwrap();
    let text = serde_json::to_string(&s).unwrap();
    assert_eq!(scenario::parse(&text).unwrap(), s, "round trip");
    let r = compute::compute_all(&s)
        .unwrap()
        .edge
        .unwrap()
        .least
        .expect("the report carries the search");
    assert_eq!(r.outcome, "found");
    assert_eq!(r.quantity, "wing-width");
    assert_eq!(r.unit, "m");
    let w = r.value.unwrap();
    assert!(
        r.trials.len() >= 3 && r.trials.len() <= 16,
        "{} runs",
        r.trials.len()
    );
    let mut at = v.clone();
    at["edge"]["wing"]["width_m"] = json!(w);
    assert!(frost_below_base(&at) <= 1e-3, "holds at the answer {w}");
    let mut less = v.clone();
    less["edge"]["wing"]["width_m"] = json!(w - r.resolution);
    assert!(
        frost_below_base(&less) > 0.0,
        "fails at {}",
        w - r.resolution
    );
    // The sensitivity, where given, says more wing lifts the frost.
    if let Some(slope) = r.slope {
        assert!(slope < 0.0, "{slope}");
    }
    // The JSON report names it the page's way.
    let j = serde_json::to_value(&r).unwrap();
    assert!(j["trials"][0]["frost_below_base_m"].is_number());
}

#[test]
fn a_bad_search_is_refused_naming_its_fields() {
    let mut v = quick_store();
    for (least, field) in [
        (
            json!({ "quantity": "wing-width", "min": 1.0, "max": 0.5, "resolution": 0.05 }),
            "edge.least.max",
        ),
        (
            json!({ "quantity": "wing-width", "min": 0.0, "max": 1.0, "resolution": 0.0 }),
            "edge.least.resolution",
        ),
    ] {
        v["edge"]["least"] = least;
        let s = scenario::from_value(v.clone()).unwrap();
        let e = compute::compute_all(&s).unwrap_err();
        assert!(e.0.iter().any(|x| x.field == field), "{field}: {e:?}");
    }
    // A wall-board quantity where there is no board names the board.
    v["edge"]["least"] =
        json!({ "quantity": "wall-board-r", "min": 0.2, "max": 4.0, "resolution": 0.1 });
    let s = scenario::from_value(v.clone()).unwrap();
    let e = compute::compute_all(&s).unwrap_err();
    assert!(e.0.iter().any(|x| x.field == "edge.wall_board"), "{e:?}");
    // An unknown quantity is refused by the parser, naming the field.
    v["edge"]["least"] =
        json!({ "quantity": "more-foam", "min": 0.0, "max": 1.0, "resolution": 0.1 });
    let e = scenario::from_value(v).unwrap_err();
    assert!(
        e.0.iter().any(|x| x.field.starts_with("edge.least")),
        "{e:?}"
    );
}
