//! The defaults a new section starts from (`document::defaults`): each checks and runs as
//! it is, every part of each kind fits its section, the CLI prints exactly them, and the
//! sourced values agree with what they cite.

use hibernal::document::compute::compute_all;
use hibernal::document::defaults;
use hibernal::document::examples::example;
use hibernal::document::ranges::plan::RangesPlan;
use hibernal::document::scenario::{parse, Scenario, FORMAT_VERSION};
use hibernal::document::vocabulary::LayerDoc;
use hibernal::physics::stack::SURFACE_PRESETS;

/// A scenario of the current version with the bundled snow-over-foam stack and no section.
fn base() -> Scenario {
    let mut s = parse(example("snow-over-foam-on-silt").expect("example").json).expect("parses");
    s.version = FORMAT_VERSION;
    s
}

fn assert_runs(s: &Scenario, what: &str) {
    // Through JSON, as a file or the page would hand it over.
    let text = serde_json::to_string(s).expect("serialises");
    let back = parse(&text).unwrap_or_else(|e| panic!("{what}: the default does not parse: {e}"));
    if let Err(e) = compute_all(&back) {
        panic!("{what}: the default does not run: {e}");
    }
}

#[test]
fn each_default_section_checks_and_runs_as_it_is() {
    let mut s = base();
    s.winter = Some(defaults::winter());
    assert_runs(&s, "winter");
    let mut s = base();
    s.shelter = Some(defaults::shelter());
    assert_runs(&s, "shelter");
    let mut s = base();
    s.edge = Some(defaults::edge());
    assert_runs(&s, "edge");
    let mut s = base();
    s.winter = Some(defaults::winter());
    s.ranges = Some(defaults::ranges());
    let plan = RangesPlan::new(&s).unwrap_or_else(|e| panic!("ranges: {e}"));
    assert!(plan.task_count() > defaults::ranges().runs);
}

#[test]
fn every_part_of_every_kind_fits_its_section() {
    for kind in defaults::MATERIAL_KINDS {
        let mut s = base();
        s.layers.insert(
            0,
            LayerDoc {
                name: kind.into(),
                thickness_m: 0.1,
                material: defaults::material(kind).expect("material kind"),
            },
        );
        assert_runs(&s, &format!("material {kind}"));
    }
    assert!(defaults::material("granite").is_none());
    for kind in defaults::CLIMATE_KINDS.iter().filter(|k| **k != "daily") {
        for snow in [false, true] {
            let mut w = defaults::winter();
            let mut c = defaults::climate(kind).expect("climate kind");
            if snow {
                let season = defaults::snow_season(kind);
                assert!(season.is_some(), "{kind} has a snow season");
                match &mut c {
                    hibernal::document::weather::ClimateDoc::Sinusoid { snow, .. }
                    | hibernal::document::weather::ClimateDoc::DesignWinter { snow, .. } => {
                        *snow = season
                    }
                    hibernal::document::weather::ClimateDoc::Daily { .. } => {}
                }
            }
            w.climate = c;
            let mut s = base();
            s.winter = Some(w);
            assert_runs(&s, &format!("climate {kind}, snow {snow}"));
        }
    }
    assert!(defaults::snow_season("daily").is_none());
    for (surface, bottom, initial) in [
        ("film", "flux", "spin-up"),
        ("n-factor", "temperature", "uniform"),
        ("film", "temperature", "periodic"),
    ] {
        let mut w = defaults::winter();
        w.surface = defaults::surface(surface).expect("surface kind");
        w.bottom = defaults::bottom(bottom).expect("bottom kind");
        w.initial = defaults::initial(initial).expect("initial kind");
        let mut s = base();
        s.winter = Some(w);
        assert_runs(&s, &format!("{surface}, {bottom}, {initial}"));
    }
    for shape in defaults::SHAPE_KINDS {
        for (floor, entrance) in [("snow", "cold-trap"), ("ground", "level")] {
            let mut sh = defaults::shelter();
            sh.shape = defaults::shape(shape).expect("shape kind");
            sh.floor = defaults::floor(floor).expect("floor kind");
            sh.entrance = defaults::entrance(entrance).expect("entrance kind");
            let mut s = base();
            s.shelter = Some(sh);
            assert_runs(&s, &format!("{shape} on {floor}, {entrance}"));
        }
    }
    let mut e = defaults::edge();
    e.inside = defaults::edge_inside("closed").expect("inside kind");
    e.duration_days = Some(60.0);
    let mut s = base();
    s.edge = Some(e);
    assert_runs(&s, "unheated edge");
}

#[test]
fn the_least_insulation_searches_start_inside_their_own_limits() {
    for q in defaults::EDGE_LEAST_QUANTITIES {
        assert!(q.min < q.max && q.resolution > 0.0 && q.resolution < q.max - q.min);
        assert!(
            hibernal::physics::units::quantity(q.quantity).is_some(),
            "{}",
            q.id
        );
    }
    let mut e = defaults::edge();
    let q = defaults::EDGE_LEAST_QUANTITIES[0];
    e.least = Some(
        serde_json::from_value(serde_json::json!({
            "quantity": q.id, "min": q.min, "max": q.max, "resolution": q.resolution
        }))
        .expect("a least search"),
    );
    let mut s = base();
    s.edge = Some(e);
    let text = serde_json::to_string(&s).expect("serialises");
    assert!(parse(&text).is_ok());
}

#[test]
fn the_cli_prints_the_defaults_themselves() {
    let cli = env!("CARGO_BIN_EXE_hibernal");
    let print = |section: &str| -> serde_json::Value {
        let out = std::process::Command::new(cli)
            .args(["default", section])
            .output()
            .expect("hibernal default");
        assert!(out.status.success(), "hibernal default {section}");
        serde_json::from_slice(&out.stdout).expect("JSON")
    };
    assert_eq!(
        print("winter"),
        serde_json::to_value(defaults::winter()).unwrap()
    );
    assert_eq!(
        print("shelter"),
        serde_json::to_value(defaults::shelter()).unwrap()
    );
    assert_eq!(
        print("edge"),
        serde_json::to_value(defaults::edge()).unwrap()
    );
    assert_eq!(
        print("ranges"),
        serde_json::to_value(defaults::ranges()).unwrap()
    );
    let list = std::process::Command::new(cli)
        .arg("default")
        .output()
        .expect("hibernal default");
    let text = String::from_utf8(list.stdout).expect("utf-8");
    for id in ["winter", "shelter", "edge", "ranges"] {
        assert!(text.lines().any(|l| l.starts_with(id)), "{id} listed");
    }
    let bad = std::process::Command::new(cli)
        .args(["default", "garden"])
        .output()
        .expect("hibernal default garden");
    assert!(!bad.status.success());
    assert!(String::from_utf8_lossy(&bad.stderr).contains("winter"));
}

#[test]
fn the_sourced_values_agree_with_what_they_cite() {
    use hibernal::physics::edge2d::section::FLOOR_FILM_DOWN_W_M2K;
    use hibernal::physics::stack::GROUND_FILM_W_M2K;
    use hibernal::physics::transient::setup::GEOTHERMAL_FLUX_W_M2;
    // ISO 6946's downward internal surface resistance, 0.17 m²K/W, as the preset has it.
    let down = SURFACE_PRESETS
        .iter()
        .find(|p| p.id == "indoor-down")
        .and_then(|p| p.film_w_m2k)
        .expect("indoor-down preset");
    assert!((FLOOR_FILM_DOWN_W_M2K - down).abs() / down < 0.03);
    // Open ground lies between the calm and the standard outdoor films.
    let film = |id: &str| {
        SURFACE_PRESETS
            .iter()
            .find(|p| p.id == id)
            .and_then(|p| p.film_w_m2k)
            .expect("preset")
    };
    assert!(
        film("outdoor-calm") < GROUND_FILM_W_M2K && GROUND_FILM_W_M2K < film("outdoor-standard")
    );
    // Continental heat flow: about 65 mW/m² on average (Pollack et al. 1993), most of it
    // within 40–90 mW/m².
    assert!((0.04..=0.09).contains(&GEOTHERMAL_FLUX_W_M2));
}
