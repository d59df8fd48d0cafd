//! The ground below the layers given: a winter run and an edge continue the deepest layer
//! down to where the year's wave has died, unless the bottom is held at the layers on
//! purpose; frost that still reaches the bottom is a lower bound, said so in words.

mod common;

use common::assert_abs;
use hibernal::document::edge::run_edge_scenario;
use hibernal::document::winter::WinterReport;
use hibernal::document::{compute, examples, scenario};
use hibernal::physics::units::UnitSystem;
use serde_json::{json, Value};

fn example(id: &str) -> Value {
    serde_json::from_str(examples::example(id).unwrap().json).unwrap()
}

fn winter_of(v: Value) -> WinterReport {
    let s = scenario::from_value(v).unwrap();
    compute::compute_with_winter(&s).unwrap().winter.unwrap()
}

/// An unheated floor on 3.0 m of layers (the shed example's stack) under a cold design
/// winter: freezing index 2 500 °C·days over 200 days.
fn cold_floor(mean_annual_c: f64, held: bool) -> Value {
    let mut v = example("unheated-shed-floor");
    v["version"] = json!(5);
    let mut bottom = json!({ "kind": "flux", "upward_w_m2": 0.06 });
    if held {
        bottom["at_layers_bottom"] = json!(true);
    }
    v["winter"] = json!({
        "climate": { "kind": "design-winter", "freezing_index_c_days": 2500.0,
                     "season_days": 200.0, "mean_annual_c": mean_annual_c },
        "surface": { "kind": "film", "film_w_m2k": 20.0, "snow_correlation": "sturm-1997-quadratic" },
        "bottom": bottom,
        "initial": { "kind": "spin-up", "start_c": 4.0, "max_years": 30, "from_periodic": true },
        "step_s": 3600.0
    });
    v
}

/// Half the annual swing at a depth (from the envelope's coldest and warmest), K.
fn half_swing_at(r: &WinterReport, depth_m: f64) -> f64 {
    let e = r
        .envelope
        .iter()
        .min_by(|a, b| (a[0] - depth_m).abs().total_cmp(&(b[0] - depth_m).abs()))
        .unwrap();
    0.5 * (e[2] - e[1])
}

#[test]
fn a_shallow_column_is_continued_until_the_years_wave_has_died() {
    // The periodic wave in a half-space falls as e^(−z/d) (Carslaw & Jaeger 1959 §2.6): at
    // three damping depths it is e⁻³ ≈ 5 % of its surface amplitude, and a bottom that lets
    // no heat through reflects it, at most doubling it there. So at the added bottom the
    // ground swings by under 10 % of the surface's swing; held at the 3.0 m of layers given,
    // the same column swings by far more there.
    let added = winter_of(cold_floor(2.0, false));
    let held = winter_of(cold_floor(2.0, true));
    let given = *added.layer_faces_m.last().unwrap();
    assert_abs(given, 3.0, 1e-12, "the layers given");
    assert!(
        added.modelled_depth_m > given + 2.0,
        "ground added below: {}",
        added.modelled_depth_m
    );
    assert_abs(
        held.modelled_depth_m,
        given,
        1e-12,
        "nothing added when held",
    );
    let surface = half_swing_at(&added, 0.0);
    let bottom = half_swing_at(&added, added.modelled_depth_m);
    assert!(
        bottom < 0.10 * surface,
        "bottom swing {bottom} vs surface {surface}"
    );
    let held_bottom = half_swing_at(&held, given);
    assert!(
        held_bottom > 2.0 * bottom,
        "held at 3 m the bottom still swings: {held_bottom} vs {bottom}"
    );
    // The chart and the report keep the layers the user gave; the chart names the ground
    // added below them (and the held run's chart has no such band).
    assert_eq!(added.layer_names.len(), 4);
    assert_eq!(added.layer_faces_m.len(), 5);
    let svg = |r: &WinterReport| {
        hibernal::charts::winter::winter_profile_svg(r, r.max_frost_day, UnitSystem::Si, 700, 500)
            .unwrap()
    };
    assert!(
        svg(&added).contains("Moist silt continued to"),
        "the added ground is marked"
    );
    assert!(!svg(&held).contains("continued to"));
    // This winter's frost stops well above either bottom: a depth, not a bound.
    for r in [&added, &held] {
        assert!(!r.frost_at_bottom && !r.frozen_all_year, "{:?}", r.warnings);
        assert!(r.max_frost_depth_m > 0.5 && r.max_frost_depth_m < 2.0);
    }
}

#[test]
fn frost_that_reaches_the_bottom_is_reported_as_at_least_with_what_to_change() {
    // A climate whose mean is below freezing, with the bottom held at the 3.0 m of layers:
    // the column freezes to its bottom and stays frozen. The deepest frost is then only a
    // lower bound; the warnings say so, name the field and say what to change.
    let r = winter_of(cold_floor(-1.0, true));
    assert!(r.frost_at_bottom, "{:?}", r.warnings);
    assert!(r.frozen_all_year);
    let at_bottom = r
        .warnings
        .iter()
        .find(|w| w.field == "winter.bottom")
        .expect("a warning on the bottom");
    assert!(
        at_bottom.message.contains("at least"),
        "{}",
        at_bottom.message
    );
    assert!(at_bottom.message.contains("do not hold the deep condition"));
    let frozen = r
        .warnings
        .iter()
        .find(|w| w.field == "winter.climate")
        .expect("a warning on the climate");
    assert!(frozen.message.contains("permafrost"), "{}", frozen.message);
}

#[test]
fn a_start_that_did_not_settle_says_which_way_the_frost_leans() {
    // Capped at 2 years from a uniform +12 °C start, the ground is still cooling towards a
    // climate whose mean is +2 °C: the start is too warm, so the frost shown is too shallow.
    // From −8 °C it is still warming: the frost shown is too deep.
    for (start, still, leans) in [
        (12.0, "still cooling", "shallower"),
        (-8.0, "still warming", "deeper"),
    ] {
        let mut v = cold_floor(2.0, false);
        v["winter"]["initial"] = json!({ "kind": "spin-up", "start_c": start, "max_years": 2 });
        let r = winter_of(v);
        let w = r
            .warnings
            .iter()
            .find(|w| w.field == "winter.initial.max_years")
            .unwrap_or_else(|| panic!("start {start}: {:?}", r.warnings));
        assert!(w.message.contains(still), "{}", w.message);
        assert!(w.message.contains(leans), "{}", w.message);
    }
}

#[test]
fn an_edge_section_is_deepened_the_same_way_unless_held() {
    // The edge example's section is 8 m deep; its silt's damping depth puts three damping
    // depths deeper, so the run adds ground, and the 1D column beside it is not deepened a
    // second time (it takes the section's bottom). Held, the section keeps its 8 m.
    let mut v = example("unheated-storage-edge");
    v["edge"]["duration_days"] = json!(20.0);
    let s = scenario::from_value(v.clone()).unwrap();
    let e = run_edge_scenario(s.edge.as_ref().unwrap()).unwrap();
    assert_abs(e.given_depth_m, 8.0, 1e-12, "depth entered");
    assert!(e.depth_m > 8.5, "deepened: {}", e.depth_m);
    assert!(!e.frost_at_bottom);
    let held = v["edge"]["bottom"]
        .as_object_mut()
        .map(|b| b.insert("at_layers_bottom".into(), json!(true)));
    assert!(held.is_some());
    let s = scenario::from_value(v).unwrap();
    let e = run_edge_scenario(s.edge.as_ref().unwrap()).unwrap();
    assert_abs(e.depth_m, 8.0, 1e-12, "held at the depth entered");
}

#[test]
fn a_file_without_the_key_writes_none_and_a_held_bottom_round_trips() {
    // The key is written only when set, so files that never set it stay as they were.
    let v = cold_floor(2.0, true);
    let s = scenario::from_value(v).unwrap();
    let back = serde_json::to_value(&s).unwrap();
    assert_eq!(back["winter"]["bottom"]["at_layers_bottom"], json!(true));
    let s = scenario::from_value(cold_floor(2.0, false)).unwrap();
    let back = serde_json::to_value(&s).unwrap();
    assert!(back["winter"]["bottom"].get("at_layers_bottom").is_none());
}
