//! The shelter section of the scenario format, its report, CSV files, charts and CLI.

mod common;
use common::*;
use hibernal::document::compute;
use hibernal::document::examples;
use hibernal::document::shelter;

use hibernal::document::scenario;
use hibernal::document::shelter::{night_csv, sweeps_csv};
use hibernal::physics::units::UnitSystem;
use serde_json::{json, Value};

const SHELTER_EXAMPLES: [&str; 2] = ["training-dome-four", "drift-cave-two"];

fn value(id: &str) -> Value {
    serde_json::from_str(examples::example(id).unwrap().json).unwrap()
}

fn run(v: Value) -> Result<shelter::ShelterReport, hibernal::physics::error::InputErrors> {
    let s = scenario::from_value(v)?;
    compute::compute_all(&s).map(|c| c.shelter.expect("a shelter report"))
}

fn fields(e: &hibernal::physics::error::InputErrors) -> Vec<String> {
    e.0.iter().map(|x| x.field.clone()).collect()
}

#[test]
fn the_shelter_examples_round_trip_and_agree_with_the_core() {
    for id in SHELTER_EXAMPLES {
        let s = scenario::parse(examples::example(id).unwrap().json).unwrap();
        assert_eq!(s.version, 3, "{id}");
        let text = serde_json::to_string(&s).unwrap();
        assert_eq!(scenario::parse(&text).unwrap(), s, "{id} round-trips");
        let doc = s.shelter.as_ref().unwrap();
        let r = shelter::run_shelter(doc).unwrap();
        // The report is the core's answer, unchanged.
        let core = hibernal::physics::shelter::steady(&doc.shelter(), &doc.conditions()).unwrap();
        assert_eq!(r.interior_c, core.interior_c);
        assert!(r.interior_c > r.outside_c, "{id}: warmer inside");
        // First law: what is given off inside leaves by the paths listed.
        let out: f64 = r.losses.iter().map(|l| l.heat_w).sum();
        assert_rel(out, r.gains_w, 1e-9, "losses add up to the heat given off");
        let shares: f64 = r.losses.iter().map(|l| l.share).sum();
        assert_abs(shares, 1.0, 1e-9, "shares add up to one");
        assert_eq!(r.band.by_regression.len(), 9);
        assert!(r.band.coldest_c <= r.interior_c && r.interior_c <= r.band.warmest_c);
        assert_eq!(r.sweeps.len(), 3);
        assert!(r.sweeps.iter().all(|s| !s.points.is_empty()), "{id}");
        assert_eq!(
            r.night.samples.len(),
            (doc.night.duration_h * 6.0) as usize + 1
        );
        assert!(r.night.energy_imbalance_relative < 1e-9);
        assert_eq!(
            r.cautions.len(),
            hibernal::physics::shelter::cautions().len()
        );
        for id in [
            "carbon-monoxide",
            "vent-open",
            "wall-thickness",
            "collapse",
            "avalanche",
        ] {
            assert!(r.cautions.iter().any(|c| c.id == id), "{id}");
        }
        assert!(r.cautions.iter().all(|c| !c.source.is_empty()));
    }
}

#[test]
fn older_versions_load_and_a_shelter_needs_version_3() {
    // Version 1 and 2 files (no shelter) still load and compute as before.
    for id in ["snow-block-wall", "silty-yard-design-winter"] {
        let s = scenario::parse(examples::example(id).unwrap().json).unwrap();
        assert!(s.version < 3 && s.shelter.is_none());
        let c = compute::compute_all(&s).unwrap();
        assert!(c.shelter.is_none());
        let report = serde_json::to_value(compute::report(&s, &c)).unwrap();
        assert!(report.get("shelter").is_none(), "no shelter key in {id}");
        assert!(!serde_json::to_string(&s).unwrap().contains("shelter"));
    }
    let mut v = value("training-dome-four");
    v["version"] = json!(2);
    let e = scenario::from_value(v.clone()).unwrap_err();
    assert_eq!(fields(&e), ["shelter"]);
    v["version"] = json!(scenario::FORMAT_VERSION + 1);
    let e = scenario::from_value(v).unwrap_err();
    assert!(fields(&e).contains(&"version".to_string()));
}

#[test]
fn a_minimal_shelter_takes_its_defaults() {
    let mut v = value("snow-block-wall");
    v["version"] = json!(3);
    v["shelter"] = json!({
        "shape": { "kind": "trench", "length_m": 2.2, "width_m": 0.9, "depth_m": 1.0, "roof_thickness_m": 0.3 },
        "snow_density_kg_m3": 320, "snow_correlation": "calonne-2011",
        "floor": { "kind": "ground", "conductivity_w_m_k": 1.5, "heat_capacity_j_m3_k": 2.2e6, "temperature_c": -2 },
        "entrance": { "kind": "level", "opening_width_m": 0.5, "opening_height_m": 0.4 },
        "vent_diameter_m": 0.05,
        "conditions": { "outside_c": -12, "wind_m_s": 3, "snowpack_c": -6, "people": 1, "activity": "seated-quiet" }
    });
    let s = scenario::from_value(v).unwrap();
    let doc = s.shelter.as_ref().unwrap();
    assert_eq!(doc.inside_film_w_m2k, 7.0);
    assert_eq!(doc.night.duration_h, 12.0);
    assert_eq!(doc.target.target_c, -5.0);
    assert_eq!(doc.sweeps.points, 31);
    // A trench starts from the snowpack's temperature, the air from the outside air.
    let n = doc.night_settings();
    assert_eq!((n.snow_start_c, n.air_start_c), (-6.0, -12.0));
    let r = shelter::run_shelter(doc).unwrap();
    assert!(r.door_flow_m3_s > 0.0, "a level doorway exchanges air");
    assert_eq!(r.least_wall.field, "shelter.shape.roof_thickness_m");
}

#[test]
fn bad_fields_are_all_named_at_once() {
    let mut v = value("training-dome-four");
    v["shelter"]["shape"]["inner_radius_m"] = json!(-1.0);
    v["shelter"]["conditions"]["outside_c"] = json!(4.0);
    v["shelter"]["night"]["duration_h"] = json!(500.0);
    v["shelter"]["sweeps"]["thickness_m"] = json!([0.8, 0.2]);
    v["shelter"]["vent_diameter_m"] = json!(-0.1);
    let e = run(v).unwrap_err();
    let f = fields(&e);
    for want in [
        "shelter.shape.inner_radius_m",
        "shelter.conditions.outside_c",
        "shelter.night.duration_h",
        "shelter.sweeps.thickness_m",
        "shelter.vent_diameter_m",
    ] {
        assert!(f.contains(&want.to_string()), "{want} in {f:?}");
    }
    // A stack error and a shelter error come together.
    let mut v = value("training-dome-four");
    v["layers"][0]["thickness_m"] = json!(-0.3);
    v["shelter"]["conditions"]["people"] = json!(500);
    let f = fields(&run(v).unwrap_err());
    assert!(f.contains(&"layers[0].thickness_m".to_string()), "{f:?}");
    assert!(
        f.contains(&"shelter.conditions.people".to_string()),
        "{f:?}"
    );
    // Structure errors name their path.
    let mut v = value("drift-cave-two");
    v["shelter"]["shape"]["kind"] = json!("igloo-palace");
    let e = scenario::from_value(v).unwrap_err();
    assert!(
        e.0[0].field.starts_with("shelter.shape"),
        "{}",
        e.0[0].field
    );
    let mut v = value("drift-cave-two");
    v["shelter"]["conditions"]["colour"] = json!("blue");
    assert!(scenario::from_value(v).is_err(), "unknown keys are refused");
}

#[test]
fn a_big_stove_trips_the_melt_limit_and_a_lining_is_compared() {
    let mut v = value("training-dome-four");
    let calm = run(v.clone()).unwrap();
    assert_eq!(calm.surface_state, "frozen");
    assert_eq!(calm.melt_kg_h, 0.0);
    v["shelter"]["conditions"]["stove_w"] = json!(1500.0);
    let hot = run(v).unwrap();
    assert_eq!(hot.surface_state, "melting");
    assert!(hot.melt_kg_h > 0.0);
    // Melting at 0 °C: the heat to melting over L_f = 333.4 kJ/kg (IAPWS) is the melt rate.
    let melt_w = hot
        .losses
        .iter()
        .find(|l| l.id == "melting")
        .unwrap()
        .heat_w;
    assert_rel(hot.melt_kg_h, melt_w * 3600.0 / 333.4e3, 1e-9, "melt rate");
    assert!(hot.surfaces.iter().any(|s| s.melting && s.surface_c == 0.0));
    let l = hot.with_lining.as_ref().expect("a lining outcome");
    assert!(
        l.interior_c > hot.interior_c,
        "a lining lets the air get warmer"
    );
    assert!(hot.warnings.iter().any(|w| w.message.contains("glaze")));
    // The melt warning carries its number for a face to word in its own units.
    let melt = hot
        .warnings
        .iter()
        .find(|w| w.kind == Some("melting"))
        .unwrap();
    assert_eq!(melt.value, Some(hot.melt_kg_h));
    assert!(hot
        .warnings
        .iter()
        .any(|w| w.field == "shelter.conditions.stove_w"));
}

#[test]
fn the_series_move_the_right_way_and_the_least_wall_is_named() {
    let r = run(value("training-dome-four")).unwrap();
    for s in &r.sweeps {
        let t: Vec<f64> = s.points.iter().map(|p| p.interior_c).collect();
        assert!(
            t.windows(2).all(|w| w[1] >= w[0] - 1e-9),
            "{}: warmer with thicker walls, more people, warmer air",
            s.id
        );
    }
    let lw = &r.least_wall;
    assert_eq!(lw.answer, "reached");
    assert_eq!(lw.field, "shelter.shape.wall_thickness_m");
    let t = lw.thickness_m.unwrap();
    let thick = &r.sweeps[0];
    // The sweep brackets the answer: colder than the target below it, warmer above.
    for p in &thick.points {
        if p.x < t - 1e-3 {
            assert!(p.interior_c < lw.target_c);
        } else if p.x > t + 1e-3 {
            assert!(p.interior_c > lw.target_c);
        }
    }
    // A target above what the melt limit allows cannot be reached, and says why.
    let mut v = value("training-dome-four");
    v["shelter"]["design"]["target_c"] = json!(5.0);
    let r = run(v).unwrap();
    assert_eq!(r.least_wall.answer, "not-reachable");
    assert_eq!(r.least_wall.reason, Some("melt-limit"));
    assert!(
        r.least_wall.message.contains("melts"),
        "{}",
        r.least_wall.message
    );
    // A cave with no outside face has no thickness to choose.
    let mut v = value("drift-cave-two");
    v["shelter"]["shape"] = json!({ "kind": "drift-cave", "inner_radius_m": 1.0 });
    let r = run(v).unwrap();
    assert_eq!(r.least_wall.answer, "no-thickness-to-choose");
    assert!(r.sweeps[0].points.is_empty() && r.sweeps[0].note.is_some());
}

#[test]
fn warnings_with_numbers_carry_them() {
    let mut v = value("training-dome-four");
    v["shelter"]["shape"]["wall_thickness_m"] = json!(0.2);
    v["shelter"]["snow_density_kg_m3"] = json!(120.0);
    let r = run(v).unwrap();
    let thin = r
        .warnings
        .iter()
        .find(|w| w.field == "shelter.shape.wall_thickness_m")
        .unwrap();
    assert_eq!(
        (thin.kind, thin.value, thin.max),
        (Some("thin_wall"), Some(0.2), Some(0.3))
    );
    let rho = r
        .warnings
        .iter()
        .find(|w| w.field == "shelter.snow_density_kg_m3")
        .unwrap();
    assert_eq!(rho.kind, Some("density_range"));
    assert_eq!(rho.value, Some(120.0));
    assert!(rho.min.unwrap() > 120.0, "below the regression's range");
}

#[test]
fn a_pile_keeps_its_base_in_range_along_the_thickness_series() {
    // Crown 0.3 m, base 1.5 m: the base is five times the crown, so a crown of 1 m would give
    // a 5 m base, beyond the 3 m accepted; the series stops at a 0.6 m crown instead.
    let mut v = value("training-dome-four");
    v["shelter"]["shape"] = json!({ "kind": "hollowed-pile", "inner_radius_m": 1.4,
        "crown_thickness_m": 0.3, "base_thickness_m": 1.5 });
    let r = run(v).unwrap();
    let xs: Vec<f64> = r.sweeps[0].points.iter().map(|p| p.x).collect();
    assert_abs(*xs.first().unwrap(), 0.1, 1e-12, "first crown");
    assert_abs(*xs.last().unwrap(), 0.6, 1e-12, "last crown");
}

#[test]
fn csv_files_name_their_units_and_convert() {
    let r = run(value("training-dome-four")).unwrap();
    let si = night_csv(&r, UnitSystem::Si);
    let us = night_csv(&r, UnitSystem::Us);
    let head: Vec<&str> = si.lines().next().unwrap().split(',').collect();
    assert_eq!(
        &head[..3],
        ["time [h]", "air inside [°C]", "warmest snow surface [°C]"]
    );
    assert!(head.iter().any(|h| h.starts_with("surface: dome")));
    assert!(us.starts_with("time [h],air inside [°F]"));
    assert!(us.lines().next().unwrap().contains("melting [lb/h]"));
    assert_eq!(si.lines().count(), r.night.samples.len() + 1);
    // °F = °C × 1.8 + 32 (NIST SP 811 B.9).
    let last = r.night.samples.last().unwrap();
    let row: Vec<f64> = us
        .lines()
        .last()
        .unwrap()
        .split(',')
        .map(|x| x.parse().unwrap())
        .collect();
    assert_abs(row[0], r.night.duration_s / 3600.0, 1e-6, "hours");
    assert_abs(row[1], last.interior_c * 1.8 + 32.0, 1e-3, "°F");
    let sw = sweeps_csv(&r, UnitSystem::Us);
    assert!(sw.starts_with("series,x,x unit,air inside [°F]"));
    let n: usize = r.sweeps.iter().map(|s| s.points.len()).sum();
    assert_eq!(sw.lines().count(), n + 1);
    // Thickness in inches (1 in = 0.0254 m, NIST SP 811).
    let first: Vec<&str> = sw.lines().nth(1).unwrap().split(',').collect();
    assert_eq!((first[0], first[2]), ("thickness", "in"));
    assert_abs(
        first[1].parse::<f64>().unwrap(),
        r.sweeps[0].points[0].x / 0.0254,
        1e-3,
        "inches",
    );
}

#[test]
fn the_charts_carry_their_axes_series_and_limits() {
    let r = run(value("training-dome-four")).unwrap();
    let night = hibernal::charts::shelter::shelter_night_svg(&r, UnitSystem::Si, 900, 520).unwrap();
    for want in [
        "The first night inside",
        "Hours since people went in",
        "Temperature (°C)",
        "Air inside",
        "Inner surface of the main wall",
        "snow melts",
        "target",
    ] {
        assert!(night.contains(want), "night chart has {want:?}");
    }
    let us = hibernal::charts::shelter::shelter_night_svg(&r, UnitSystem::Us, 900, 520).unwrap();
    assert!(us.contains("Temperature (°F)") && us.contains("32 °F: snow melts"));
    let sweeps =
        hibernal::charts::shelter::shelter_sweeps_svg(&r, UnitSystem::Us, 1500, 480).unwrap();
    for want in [
        "By wall thickness",
        "Wall thickness (in)",
        "By the number of people",
        "People inside",
        "By the outside temperature",
        "Outside air temperature (°F)",
        "Air inside (°F)",
    ] {
        assert!(sweeps.contains(want), "series chart has {want:?}");
    }
    // One document, closed once, with a line per panel.
    assert_eq!(sweeps.matches("</svg>").count(), 1);
    assert!(sweeps.matches("<polyline").count() >= 3);
    // Empty data draws without failing.
    let mut empty = r.clone();
    empty.night.samples.clear();
    for s in &mut empty.sweeps {
        s.points.clear();
    }
    assert!(
        hibernal::charts::shelter::shelter_night_svg(&empty, UnitSystem::Si, 400, 300)
            .unwrap()
            .contains("No night was run")
    );
    assert!(
        hibernal::charts::shelter::shelter_sweeps_svg(&empty, UnitSystem::Si, 900, 300).is_ok()
    );
}

#[test]
fn cli_runs_a_shelter_and_writes_its_files() {
    let dir = test_dir("cli-shelter");
    let file = dir.join("dome.json");
    write_example("training-dome-four", &file);
    let p = |n: &str| dir.join(n).to_str().unwrap().to_string();
    let report = report_of(
        cli()
            .args(["run", file.to_str().unwrap(), "--units", "us"])
            .args(["--night-svg", &p("n.svg"), "--night-csv", &p("n.csv")])
            .args(["--sweeps-svg", &p("s.svg"), "--sweeps-csv", &p("s.csv")]),
    );
    let sh = &report["shelter"];
    assert!(sh["interior_c"].as_f64().unwrap() > -20.0);
    assert!(sh["cautions"].as_array().unwrap().len() >= 8);
    assert!(sh["cautions"][0]["source"]
        .as_str()
        .unwrap()
        .contains("FM 21-76"));
    assert!(std::fs::read_to_string(p("n.svg"))
        .unwrap()
        .contains("Air inside"));
    assert!(std::fs::read_to_string(p("s.svg"))
        .unwrap()
        .contains("People inside"));
    assert!(std::fs::read_to_string(p("n.csv"))
        .unwrap()
        .starts_with("time [h],air inside [°F]"));
    assert!(std::fs::read_to_string(p("s.csv"))
        .unwrap()
        .contains("people,"));

    // A shelter option on a scenario without a shelter: a message and exit code 2.
    let wall = dir.join("wall.json");
    let out = cli().args(["example", "snow-block-wall"]).output().unwrap();
    std::fs::write(&wall, &out.stdout).unwrap();
    let out = cli()
        .args(["run", wall.to_str().unwrap(), "--night-svg", &p("x.svg")])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr)
        .contains("--night-svg needs a scenario with a shelter"));

    // A bad shelter: every bad field named on stderr, exit code 2, no panic.
    let mut v = value("training-dome-four");
    v["shelter"]["shape"]["inner_radius_m"] = json!(-1.0);
    v["shelter"]["conditions"]["wind_m_s"] = json!(-3.0);
    let bad = dir.join("bad.json");
    std::fs::write(&bad, v.to_string()).unwrap();
    let out = cli().args(["run", bad.to_str().unwrap()]).output().unwrap();
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("shelter.shape.inner_radius_m"), "{err}");
    assert!(err.contains("shelter.conditions.wind_m_s"), "{err}");
    assert!(!err.contains("panicked"));
    let help = cli().args(["run", "--help"]).output().unwrap();
    let help = String::from_utf8_lossy(&help.stdout);
    for opt in ["--night-svg", "--night-csv", "--sweeps-svg", "--sweeps-csv"] {
        assert!(help.contains(opt), "--help lists {opt}");
    }
}

#[test]
fn the_schema_describes_the_shelter() {
    use common::schema::*;
    let s = schema();
    let shelter = prop(&s, "shelter");
    assert_eq!(refers_to(shelter), "ShelterDoc");
    assert!(nullable(shelter));
    let d = def(&s, "ShelterDoc");
    assert_eq!(d["additionalProperties"], false, "unknown keys are refused");
    assert_eq!(
        required(d),
        [
            "shape",
            "snow_density_kg_m3",
            "snow_correlation",
            "floor",
            "entrance",
            "vent_diameter_m",
            "conditions"
        ]
    );
    assert_properties(
        d,
        &[
            ("snow_density_kg_m3", "number", true),
            ("vent_diameter_m", "number", true),
            ("inside_film_w_m2k", "number", false),
        ],
    );
    assert_eq!(refers_to(prop(d, "snow_correlation")), "SnowRegressionDoc");
    // The shapes and entrances by kind, each with its own required fields.
    let shape = def(&s, refers_to(prop(d, "shape")).as_str());
    for kind in ["block-dome", "hollowed-pile", "drift-cave", "trench"] {
        assert!(kinds(shape).contains(&kind), "shape {kind}");
    }
    assert_properties(
        variant(shape, "block-dome"),
        &[
            ("inner_radius_m", "number", true),
            ("wall_thickness_m", "number", true),
        ],
    );
    let cave = variant(shape, "drift-cave");
    assert_properties(cave, &[("inner_radius_m", "number", true)]);
    assert_eq!(refers_to(prop(cave, "exposed_face")), "ExposedFaceDoc");
    let entrance = def(&s, refers_to(prop(d, "entrance")).as_str());
    assert_eq!(kinds(entrance), ["cold-trap", "level"]);
    assert_eq!(required(variant(entrance, "cold-trap")), ["kind"]);
    // The design target: a number defaulting to −5 °C.
    let design = prop(d, "design");
    assert_eq!(refers_to(design), "TargetDoc");
    let target = prop(def(&s, "TargetDoc"), "target_c");
    assert_eq!(type_of(target), "number");
    assert_eq!(target["default"], -5.0);
}

mod never_panics {
    use super::*;
    use crate::common::fuzz::{any_section_leaf, mutate, picks};
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig { cases: 200, ..ProptestConfig::default() })]

        /// A shelter example with up to three numeric fields of its shelter section replaced
        /// by anything is computed (with finite numbers and its cautions) or refused with
        /// errors naming `shelter…` fields: never a panic.
        #[test]
        fn mutated_shelters_never_panic(
            which in 0usize..SHELTER_EXAMPLES.len(),
            picks in picks(any_section_leaf()),
        ) {
            let mut v = value(SHELTER_EXAMPLES[which]);
            mutate(&mut v, Some("shelter"), picks);
            match run(v) {
                Ok(r) => {
                    prop_assert!(r.interior_c.is_finite());
                    prop_assert!(!r.cautions.is_empty());
                    let _ = hibernal::charts::shelter::shelter_night_svg(&r, UnitSystem::Us, 300, 200);
                    let _ = hibernal::charts::shelter::shelter_sweeps_svg(&r, UnitSystem::Si, 600, 200);
                }
                Err(e) => {
                    prop_assert!(!e.0.is_empty());
                    prop_assert!(e.0.iter().all(|x| x.field.starts_with("shelter")), "{e}");
                }
            }
        }
    }
}

#[test]
fn a_winter_and_a_shelter_run_side_by_side() {
    let mut v = value("training-dome-four");
    v["winter"] = value("silty-yard-design-winter")["winter"].clone();
    let s = scenario::from_value(v).unwrap();
    let c = compute::compute_all(&s).unwrap();
    assert!(c.winter.is_some() && c.shelter.is_some());
    let alone = run(value("training-dome-four")).unwrap();
    assert_eq!(
        c.shelter.unwrap().interior_c,
        alone.interior_c,
        "the winter does not touch the shelter"
    );
}
