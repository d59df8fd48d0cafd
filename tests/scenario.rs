//! The scenario format, the bundled examples and the CLI.

mod common;
use common::*;
use hibernal::document::compute;
use hibernal::document::examples;
use hibernal::document::steady;

use hibernal::document::scenario;
use hibernal::document::vocabulary::{BoardDoc, SnowRegressionDoc, SoilModelDoc, TextureDoc};
use hibernal::physics::materials::{Board, SnowRegression, SoilModel, Texture};

#[test]
fn every_example_parses_computes_and_round_trips() {
    for e in &examples::EXAMPLES {
        let s = scenario::parse(e.json).unwrap_or_else(|err| panic!("{}: {err}", e.id));
        assert!(
            !s.title.is_empty() && !s.notes.is_empty(),
            "{} documents itself",
            e.id
        );
        let c = steady::compute(&s).unwrap_or_else(|err| panic!("{}: {err}", e.id));
        let text = serde_json::to_string(&s).unwrap();
        assert_eq!(scenario::parse(&text).unwrap(), s, "{} round-trips", e.id);
        let r = compute::report(&s, &c.clone().into());
        assert!(r.r_total_m2k_w > 0.0 && r.u_w_m2k > 0.0);
        assert_eq!(r.layers.len(), s.layers.len());
        assert!(r.warnings.is_empty(), "{}: {:?}", e.id, r.warnings);
    }
    assert_eq!(examples::EXAMPLES[0].id, "snow-over-foam-on-silt");
}

#[test]
fn the_snow_wall_example_equals_the_series_formula() {
    // Plane wall with films (Incropera & DeWitt §3.1): R = 1/h_o + d/k + 1/h_i, k by
    // Sturm et al. 1997 quadratic at 350 kg/m³.
    let s = scenario::parse(examples::example("snow-block-wall").unwrap().json).unwrap();
    let r = compute::report(&s, &steady::compute(&s).unwrap().into());
    let k = 0.138 - 1.01 * 0.35 + 3.233 * 0.35 * 0.35;
    assert_rel(
        r.r_total_m2k_w,
        1.0 / 20.0 + 0.40 / k + 1.0 / 7.0,
        1e-12,
        "wall R",
    );
    let band = r.band.unwrap();
    assert_eq!(band.by_regression.len(), 9);
    assert!(band.r_min_m2k_w < r.r_total_m2k_w && r.r_total_m2k_w <= band.r_max_m2k_w + 1e-12);
}

#[test]
fn document_ids_match_the_core_ids() {
    let id = |v: serde_json::Value| v.as_str().unwrap().to_string();
    for c in SnowRegression::ALL {
        assert_eq!(
            id(serde_json::to_value(SnowRegressionDoc::from(c)).unwrap()),
            c.id()
        );
    }
    for t in Texture::ALL {
        assert_eq!(
            id(serde_json::to_value(TextureDoc::from(t)).unwrap()),
            t.id()
        );
    }
    for m in SoilModel::ALL {
        assert_eq!(
            id(serde_json::to_value(SoilModelDoc::from(m)).unwrap()),
            m.id()
        );
    }
    for b in Board::ALL {
        assert_eq!(id(serde_json::to_value(BoardDoc::from(b)).unwrap()), b.id());
    }
}

fn example_value() -> serde_json::Value {
    serde_json::from_str(examples::EXAMPLES[0].json).unwrap()
}

fn first_error(v: serde_json::Value) -> (String, String) {
    let e = scenario::from_value(v)
        .and_then(|s| steady::compute(&s).map(|_| s))
        .unwrap_err();
    (e.0[0].field.clone(), e.0[0].kind.to_string())
}

#[test]
fn malformed_documents_are_refused_naming_the_field() {
    let mut v = example_value();
    v["layers"][1]["thickness_m"] = serde_json::json!("abc");
    let (field, msg) = first_error(v);
    assert_eq!(field, "layers[1].thickness_m");
    assert!(msg.contains("invalid type"), "{msg}");

    let mut v = example_value();
    v["layers"][0]["material"]["correlation"] = serde_json::json!("nobody-2020");
    // Inside a tagged material the path stops at the material; the message names the value.
    let (field, msg) = first_error(v);
    assert_eq!(field, "layers[0].material");
    assert!(
        msg.contains("nobody-2020") && msg.contains("sturm-1997-quadratic"),
        "{msg}"
    );

    let mut v = example_value();
    v["layers"][0]["material"]["colour"] = serde_json::json!("red");
    let (field, msg) = first_error(v);
    assert_eq!(field, "layers[0].material");
    assert!(msg.contains("colour"), "{msg}");

    let mut v = example_value();
    v["version"] = serde_json::json!(7);
    let (field, msg) = first_error(v);
    assert_eq!(field, "version");
    assert!(msg.contains("version 7"), "{msg}");

    let mut v = example_value();
    v["layers"][2]["material"]["water_content_pct"] = serde_json::json!(80.0);
    assert_eq!(first_error(v).0, "layers[2].material.water_content_pct");

    assert!(scenario::parse("{").is_err());
    assert!(scenario::parse("[1,2,3]").is_err());
    assert!(
        scenario::parse(&"[".repeat(100_000)).is_err(),
        "deep nesting is refused"
    );
    let big = format!(
        "{{\"title\": \"{}\"}}",
        "x".repeat(scenario::MAX_DOCUMENT_BYTES)
    );
    assert!(scenario::parse(&big)
        .unwrap_err()
        .to_string()
        .contains("at most"));
}

#[test]
fn the_schema_describes_the_format() {
    use common::schema::*;
    let s = schema();
    // The document: an object with its required keys and the stack's three parts.
    assert_eq!(s["type"], "object");
    assert_eq!(s["additionalProperties"], false, "unknown keys are refused");
    assert_eq!(
        required(&s),
        ["format", "version", "layers", "top", "bottom"]
    );
    assert_eq!(type_of(prop(&s, "format")), "string");
    assert_eq!(type_of(prop(&s, "version")), "integer");
    let layers = prop(&s, "layers");
    assert_eq!(type_of(layers), "array");
    assert_eq!(refers_to(&layers["items"]), "LayerDoc");
    assert_eq!(refers_to(prop(&s, "top")), "BoundaryDoc");
    assert_eq!(refers_to(prop(&s, "bottom")), "BoundaryDoc");
    // A layer: its thickness a number, required with its material.
    let layer = def(&s, "LayerDoc");
    assert_properties(
        layer,
        &[("thickness_m", "number", true), ("name", "string", false)],
    );
    assert_eq!(required(layer), ["thickness_m", "material"]);
    assert_eq!(refers_to(prop(layer, "material")), "MaterialDoc");
    // The materials by kind; snow names its regression and soil its model, each an enum
    // holding every id of the core.
    let material = def(&s, "MaterialDoc");
    for kind in ["snow", "ice", "water", "air", "soil", "custom"] {
        assert!(kinds(material).contains(&kind), "material kind {kind}");
    }
    let snow = variant(material, "snow");
    assert_properties(snow, &[("density_kg_m3", "number", true)]);
    assert_eq!(refers_to(prop(snow, "correlation")), "SnowRegressionDoc");
    let regressions = enum_values(def(&s, "SnowRegressionDoc"));
    assert_eq!(regressions.len(), SnowRegression::ALL.len());
    assert!(regressions.contains(&"sturm-1997-quadratic"));
    assert_eq!(
        refers_to(prop(variant(material, "soil"), "model")),
        "SoilModelDoc"
    );
    let models = enum_values(def(&s, "SoilModelDoc"));
    assert_eq!(models.len(), SoilModel::ALL.len());
    assert!(models.contains(&"kersten-1949"));
    // A face: air through a film (both numbers, required) or a held surface.
    let boundary = def(&s, "BoundaryDoc");
    assert_eq!(kinds(boundary), ["air", "surface"]);
    assert_properties(
        variant(boundary, "air"),
        &[
            ("temperature_c", "number", true),
            ("film_w_m2k", "number", true),
        ],
    );
    assert_properties(
        variant(boundary, "surface"),
        &[("temperature_c", "number", true)],
    );
    // The optional sections, each its own definition and nullable.
    for (key, def_name) in [
        ("winter", "WinterDoc"),
        ("shelter", "ShelterDoc"),
        ("edge", "EdgeDoc"),
        ("ranges", "RangesDoc"),
    ] {
        let p = prop(&s, key);
        assert_eq!(refers_to(p), def_name, "{key}");
        assert!(nullable(p), "{key} is optional");
        assert!(!required(&s).contains(&key));
        def(&s, def_name);
    }
}

#[test]
fn cli_runs_an_example_and_writes_the_chart() {
    let dir = test_dir("cli");
    let file = dir.join("wall.json");
    write_example("snow-block-wall", &file);
    let svg = dir.join("wall.svg");
    let report = report_of(cli().args([
        "run",
        file.to_str().unwrap(),
        "--svg",
        svg.to_str().unwrap(),
    ]));
    assert!(report["r_total_m2k_w"].as_f64().unwrap() > 2.0);
    let svg = std::fs::read_to_string(svg).unwrap();
    assert!(
        svg.starts_with("<svg") && svg.contains("Temperature"),
        "an SVG chart"
    );

    let list = cli().arg("example").output().unwrap();
    let list = String::from_utf8(list.stdout).unwrap();
    assert_eq!(list.lines().count(), examples::EXAMPLES.len());
    let schema = cli().arg("schema").output().unwrap();
    assert!(serde_json::from_slice::<serde_json::Value>(&schema.stdout).is_ok());
}

#[test]
fn cli_answers_bad_files_with_a_message_and_exit_code() {
    let dir = std::env::temp_dir().join(format!("hibernal-cli-bad-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let bad = dir.join("bad.json");
    let mut v = example_value();
    v["layers"][0]["thickness_m"] = serde_json::json!(-0.4);
    std::fs::write(&bad, v.to_string()).unwrap();
    let out = cli().args(["run", bad.to_str().unwrap()]).output().unwrap();
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("layers[0].thickness_m"), "{err}");
    assert!(!err.contains("panicked"));

    std::fs::write(&bad, b"\xff\xfe not json").unwrap();
    let out = cli().args(["run", bad.to_str().unwrap()]).output().unwrap();
    assert_eq!(out.status.code(), Some(2));
    let out = cli().args(["run", "/nonexistent/x.json"]).output().unwrap();
    assert_eq!(out.status.code(), Some(2));
    let out = cli().args(["example", "no-such"]).output().unwrap();
    assert_eq!(out.status.code(), Some(2));
}

mod never_panics {
    use super::*;
    use crate::common::fuzz::{any_leaf, mutate, picks};
    use proptest::prelude::*;
    use serde_json::Value;

    proptest! {
        #![proptest_config(ProptestConfig { cases: 600, ..ProptestConfig::default() })]

        /// Any example with up to three numeric fields replaced by anything, and its layers
        /// repeated, is either computed or refused with errors naming fields: never a panic.
        #[test]
        fn mutated_examples_never_panic(
            which in 0usize..examples::EXAMPLES.len(),
            picks in picks(any_leaf()),
            repeat in 1usize..30,
        ) {
            let mut v: Value = serde_json::from_str(examples::EXAMPLES[which].json).unwrap();
            mutate(&mut v, None, picks);
            if let Value::Array(layers) = &mut v["layers"] {
                let copy = layers.clone();
                for _ in 1..repeat {
                    layers.extend(copy.iter().cloned());
                }
            }
            let text = v.to_string();
            match scenario::parse(&text) {
                Ok(s) => match steady::compute(&s) {
                    Ok(c) => {
                        let r = compute::report(&s, &c.clone().into());
                        prop_assert!(r.r_total_m2k_w.is_finite() && r.r_total_m2k_w > 0.0);
                        prop_assert!(r.heat_flux_w_m2.is_finite());
                        let _ = hibernal::charts::profile::profile_svg(&c, hibernal::physics::units::UnitSystem::Us, 300, 200);
                    }
                    Err(e) => prop_assert!(!e.0.is_empty()),
                },
                Err(e) => prop_assert!(!e.0.is_empty()),
            }
        }
    }
}

#[test]
fn the_design_winter_example_runs_and_agrees_with_the_hand_methods() {
    // The winter run of the bundled design-winter example, against the hand methods of
    // US Army TM 5-852-6 / UFC 3-130-04 on the same silt: Stefan's law (an upper bound: it
    // ignores sensible heat) and the modified Berggren method (λ from the Neumann-type
    // equation, frozen/unfrozen means; within 10 %, the method's own approximations).
    let s = scenario::parse(examples::example("silty-yard-design-winter").unwrap().json).unwrap();
    assert_eq!(s.version, 2);
    let c = compute::compute_with_winter(&s).unwrap();
    let w = c.winter.as_ref().expect("a winter report");
    let silt = &c.steady.result.stack.materials[0];
    let (kf, ku) = (
        silt.conductivity.frozen.k(-1.0),
        silt.conductivity.unfrozen.k(1.0),
    );
    let l = silt.latent_j_m3;
    let nf = 0.7 * 1200.0 * 86_400.0;
    let stefan = hibernal::physics::analytic::stefan_depth_m(kf, l, nf);
    assert!(
        w.max_frost_depth_m < stefan,
        "{} < Stefan {stefan}",
        w.max_frost_depth_m
    );
    let berggren = hibernal::physics::analytic::modified_berggren_depth_m(
        0.5 * (kf + ku),
        l,
        0.7,
        1200.0 * 86_400.0,
        2.0,
        150.0 * 86_400.0,
        0.5 * (silt.c_frozen_j_m3k + silt.c_unfrozen_j_m3k),
    )
    .unwrap();
    assert_rel(
        w.max_frost_depth_m,
        berggren,
        0.10,
        "frost depth vs modified Berggren",
    );
    assert_rel(
        w.surface_freezing_index_c_days,
        0.7 * 1200.0,
        1e-3,
        "surface index = nF",
    );
    assert!(w.energy_imbalance_relative < 1e-9);
    // The report's own hand-method rows on this case: Stefan's law as computed above (the
    // run's surface index is nF to 1e-3), the modified Berggren row within 10 % of the run.
    let row = |m: &str| {
        w.hand_methods
            .iter()
            .find(|h| h.method == m)
            .and_then(|h| h.depth_m)
            .unwrap()
    };
    assert_rel(row("stefan"), stefan, 2e-3, "Stefan row");
    assert_eq!(
        row("stefan-resistance"),
        row("stefan"),
        "nothing above the silt"
    );
    assert_rel(row("berggren"), w.max_frost_depth_m, 0.10, "Berggren row");
    assert_eq!(row("transient"), w.max_frost_depth_m);
    assert_eq!(w.daily.len(), 366, "day 0 and the end of each day");
    // The report carries it; CSV export has a header with units and a row per day.
    let r = compute::report(&s, &c);
    assert!(r.winter.is_some());
    let csv = hibernal::document::winter::daily_csv(w);
    assert!(csv.starts_with("day,air temperature [°C]"));
    assert_eq!(csv.lines().count(), 367);
    // In US units: °F and ft in the header, and each value the SI one converted
    // (°F = 1.8 °C + 32, ft = m / 0.3048: NIST SP 811 B.8).
    let us = hibernal::document::winter::daily_csv_in(w, hibernal::physics::units::UnitSystem::Us);
    let head = us.lines().next().unwrap();
    assert!(
        head.contains("air temperature [°F]") && head.contains("frost depth [ft]"),
        "{head}"
    );
    let deepest = w
        .daily
        .iter()
        .enumerate()
        .max_by(|a, b| a.1.frost_depth_m.total_cmp(&b.1.frost_depth_m))
        .unwrap();
    let row: Vec<f64> = us
        .lines()
        .nth(deepest.0 + 1)
        .unwrap()
        .split(',')
        .map(|x| x.parse().unwrap())
        .collect();
    assert!((row[1] - (deepest.1.air_c * 1.8 + 32.0)).abs() < 1e-3);
    assert!((row[3] - deepest.1.frost_depth_m / 0.3048).abs() < 1e-4);
}

#[test]
fn version_1_documents_load_and_a_winter_needs_version_2() {
    let mut v = example_value();
    assert_eq!(v["version"], 1);
    assert!(
        scenario::from_value(v.clone()).is_ok(),
        "version 1 still loads"
    );
    let yard: serde_json::Value =
        serde_json::from_str(examples::example("silty-yard-design-winter").unwrap().json).unwrap();
    v["winter"] = yard["winter"].clone();
    let e = scenario::from_value(v.clone()).unwrap_err();
    assert_eq!(e.0[0].field, "winter");
    v["version"] = serde_json::json!(2);
    v["winter"]["grid"] =
        serde_json::json!({"surface_cell_m": 0.0001, "growth_ratio": 1.0, "max_cell_m": 0.0001});
    let s = scenario::from_value(v).unwrap();
    let e = compute::compute_with_winter(&s).unwrap_err();
    assert!(
        e.0.iter().any(|x| x.field == "winter.grid.surface_cell_m"),
        "{e}"
    );
}

#[test]
fn cli_writes_the_winter_series_as_csv() {
    let dir = test_dir("cli-winter");
    let file = dir.join("yard.json");
    write_example("silty-yard-design-winter", &file);
    let csv = dir.join("yard.csv");
    let svg = dir.join("yard-frost.svg");
    let report = report_of(cli().args([
        "run",
        file.to_str().unwrap(),
        "--csv",
        csv.to_str().unwrap(),
        "--winter-svg",
        svg.to_str().unwrap(),
        "--units",
        "us",
    ]));
    assert!(report["winter"]["max_frost_depth_m"].as_f64().unwrap() > 0.5);
    assert_eq!(std::fs::read_to_string(csv).unwrap().lines().count(), 367);
    let svg = std::fs::read_to_string(svg).unwrap();
    assert!(svg.starts_with("<svg") && svg.contains("Frost depth") && svg.contains("deepest"));
    assert!(svg.contains("(ft)"), "the chart follows --units us");
    // A scenario without a winter cannot export one.
    let wall = dir.join("wall.json");
    std::fs::write(&wall, examples::example("snow-block-wall").unwrap().json).unwrap();
    let out = cli()
        .args([
            "run",
            wall.to_str().unwrap(),
            "--csv",
            dir.join("x.csv").to_str().unwrap(),
        ])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
}

#[test]
fn a_soil_can_freeze_over_a_range_in_the_winter_run() {
    // Anderson & Tice 1972 form w_u = α θ^β (from memory; α 0.08, β −0.5 are invented
    // values for a silt holding 20 %). Freezing over a range leaves water liquid below 0 °C,
    // so the same winter releases less latent heat near the surface and the run differs
    // from freezing at 0 °C; energy stays conserved.
    let base: serde_json::Value =
        serde_json::from_str(examples::example("silty-yard-design-winter").unwrap().json).unwrap();
    let run = |v: serde_json::Value| {
        let s = scenario::from_value(v).unwrap();
        compute::compute_with_winter(&s).map(|c| c.winter.unwrap())
    };
    let sharp = run(base.clone()).unwrap();
    let mut v = base.clone();
    v["layers"][0]["material"]["unfrozen_water"] = serde_json::json!({"alpha": 0.08, "beta": -0.5});
    let spread = run(v.clone()).unwrap();
    assert!(spread.energy_imbalance_relative < 1e-9);
    assert!(
        (spread.max_frost_depth_m - sharp.max_frost_depth_m).abs() > 0.01,
        "{} vs {}",
        spread.max_frost_depth_m,
        sharp.max_frost_depth_m
    );
    v["layers"][0]["material"]["unfrozen_water"]["beta"] = serde_json::json!(0.5);
    let e = run(v).unwrap_err();
    assert_eq!(e.0[0].field, "layers[0].material.unfrozen_water.beta");
}

fn yard() -> serde_json::Value {
    serde_json::from_str(examples::example("silty-yard-design-winter").unwrap().json).unwrap()
}

fn winter_of(
    v: serde_json::Value,
) -> Result<hibernal::document::winter::WinterReport, hibernal::physics::error::InputErrors> {
    let s = scenario::from_value(v)?;
    compute::compute_with_winter(&s).map(|c| c.winter.unwrap())
}

#[test]
fn older_files_and_every_example_still_parse_and_write_no_new_keys() {
    // The snow season and the periodic start are optional additions to format version 2:
    // every bundled example (all written before them) and a version 1 file still load, and
    // a document that uses neither writes back without the new keys.
    for e in &examples::EXAMPLES {
        let s = scenario::parse(e.json).unwrap_or_else(|err| panic!("{}: {err}", e.id));
        if e.id == "cabin-porch-slab-snowy-winter" || e.id == "silt-yard-how-sure" {
            // Written with a snow season: it must keep it.
            assert!(serde_json::to_string(&s.winter)
                .unwrap()
                .contains("\"snow\""));
            continue;
        }
        let text = serde_json::to_string(&s.winter).unwrap();
        assert!(
            !text.contains("\"snow\"") && !text.contains("from_periodic"),
            "{}",
            e.id
        );
    }
    let v1 = example_value();
    assert_eq!(v1["version"], 1);
    assert!(scenario::from_value(v1).is_ok());
    let s = scenario::from_value(yard()).unwrap();
    assert_eq!(s.version, 2);
}

#[test]
fn a_snow_season_over_a_design_winter_lies_on_the_ground_as_snow_cells() {
    // A design winter (the bundled yard, 1200 °C·days) under a film of 20 W/m²K, with and
    // without a snow season reaching 0.3 m; from the periodic start. Checks: energy balance
    // with the snow-mass term (conservation, 1e-9); snow cells in the daily profiles only
    // while the season's snow lies, with their heights inside the snow; the daily snow depth
    // is the season's (linear between days 20, 80 and 150); less frost under snow (it
    // insulates: Fourier's law with the snow's resistance added).
    let mut v = yard();
    v["winter"]["surface"] = serde_json::json!({"kind": "film", "film_w_m2k": 20, "snow_correlation": "sturm-1997-quadratic"});
    v["winter"]["initial"] = serde_json::json!({"kind": "periodic"});
    let bare = winter_of(v.clone()).unwrap();
    v["winter"]["climate"]["snow"] = serde_json::json!({
        "start_day": 20, "peak_day": 80, "end_day": 150, "peak_depth_m": 0.3,
        "fresh_density_kg_m3": 100, "settled_density_kg_m3": 300
    });
    let snowy = winter_of(v.clone()).unwrap();
    assert!(
        snowy.energy_imbalance_relative < 1e-9,
        "{}",
        snowy.energy_imbalance_relative
    );
    assert_abs(
        snowy.daily[50].snow_depth_m,
        0.15,
        1e-9,
        "half-way to the peak on day 50",
    );
    assert_abs(snowy.daily[80].snow_depth_m, 0.3, 1e-9, "peak on day 80");
    let p = snowy.profile_near(80.0).unwrap();
    assert_eq!(p.snow_c.len(), 8);
    assert!(p
        .snow_c
        .iter()
        .all(|c| c[0] > 0.0 && c[0] < 0.3 && c[1] <= 0.0));
    assert_eq!(
        p.temperature_c.len(),
        snowy.envelope.len(),
        "ground cells only"
    );
    assert!(snowy.profile_near(10.0).unwrap().snow_c.is_empty());
    assert!(snowy.profile_near(200.0).unwrap().snow_c.is_empty());
    assert!(
        snowy.max_frost_depth_m < bare.max_frost_depth_m,
        "{} under snow vs {} bare",
        snowy.max_frost_depth_m,
        bare.max_frost_depth_m
    );
    // It round-trips, and a spin-up may start from the periodic state.
    let s = scenario::from_value(v.clone()).unwrap();
    assert_eq!(
        scenario::parse(&serde_json::to_string(&s).unwrap()).unwrap(),
        s
    );
    v["winter"]["initial"] = serde_json::json!({"kind": "spin-up", "start_c": 4, "max_years": 10, "from_periodic": true});
    let spun = winter_of(v).unwrap();
    assert!(spun.spin_up_years >= 1 && spun.energy_imbalance_relative < 1e-9);
}

#[test]
fn bad_snow_seasons_are_refused_naming_the_field() {
    let with_snow = |snow: serde_json::Value| {
        let mut v = yard();
        v["winter"]["climate"]["snow"] = snow;
        winter_of(v).map(|_| ()).unwrap_err()
    };
    let ok = serde_json::json!({
        "start_day": 300, "peak_day": 20, "end_day": 100, "peak_depth_m": 0.3,
        "fresh_density_kg_m3": 100, "settled_density_kg_m3": 300
    });
    let mut bad = ok.clone();
    bad["peak_depth_m"] = serde_json::json!(7.5);
    assert_eq!(
        with_snow(bad).0[0].field,
        "winter.climate.snow.peak_depth_m"
    );
    let mut bad = ok.clone();
    bad["settled_density_kg_m3"] = serde_json::json!(90);
    assert_eq!(
        with_snow(bad).0[0].field,
        "winter.climate.snow.settled_density_kg_m3"
    );
    let mut bad = ok.clone();
    bad["end_day"] = serde_json::json!(800);
    assert_eq!(with_snow(bad).0[0].field, "winter.climate.snow.end_day");
    let mut bad = ok.clone();
    bad["colour"] = serde_json::json!("white");
    let e = with_snow(bad);
    assert!(e.to_string().contains("colour"), "{e}");
    // The schema carries the new shapes: the snow season on a sinusoidal year and a design
    // winter, every field a required number; the periodic start and spin-up from it.
    use common::schema::*;
    let s = schema();
    let season = def(&s, "SnowSeasonDoc");
    assert_properties(
        season,
        &[
            ("start_day", "number", true),
            ("peak_day", "number", true),
            ("end_day", "number", true),
            ("peak_depth_m", "number", true),
            ("fresh_density_kg_m3", "number", true),
            ("settled_density_kg_m3", "number", true),
        ],
    );
    let climate = def(&s, "ClimateDoc");
    for kind in ["sinusoid", "design-winter"] {
        let snow = prop(variant(climate, kind), "snow");
        assert_eq!(refers_to(snow), "SnowSeasonDoc", "{kind}");
        assert!(nullable(snow), "snow is optional on {kind}");
    }
    let initial = def(&s, "InitialDoc");
    assert_eq!(kinds(initial), ["uniform", "spin-up", "periodic"]);
    let spin_up = variant(initial, "spin-up");
    assert_properties(
        spin_up,
        &[
            ("start_c", "number", true),
            ("max_years", "integer", true),
            ("from_periodic", "boolean", false),
        ],
    );
    assert_eq!(required(variant(initial, "periodic")), ["kind"]);
}

fn cabin() -> serde_json::Value {
    serde_json::from_str(
        examples::example("cabin-porch-slab-snowy-winter")
            .unwrap()
            .json,
    )
    .unwrap()
}

#[test]
fn spin_ups_from_different_starts_reach_the_same_year() {
    // The periodic steady state of a column under a repeating year is unique (heat
    // conduction with a monotone enthalpy is a contraction; standard), so a spin-up from
    // the periodic start (which ignores latent heat and snow, and starts this column far
    // too cold at depth) and one from a uniform 4 °C must settle on the same year. The
    // spin-up must judge "settled" on enthalpy: judged on temperature alone, a frozen lens
    // held at 0 °C while it slowly thaws looks settled, and the run then reported it as
    // frost 2.25 m deep on day 0. Tolerance: both stop when no cell changes by more than
    // 0.01 K-equivalent in a year, and the deepest frost is read to well under a cell
    // (1–2 cm at that depth); allow 1 cm.
    let mut v = cabin();
    v["layers"][1]["thickness_m"] = serde_json::json!(0.10);
    v["winter"]["climate"]["snow"]["peak_depth_m"] = serde_json::json!(0.20);
    v["winter"]["initial"]["max_years"] = serde_json::json!(30);
    let uniform = winter_of(v.clone()).unwrap();
    v["winter"]["initial"]["from_periodic"] = serde_json::json!(true);
    let periodic = winter_of(v.clone()).unwrap();
    for r in [&uniform, &periodic] {
        assert!(r.warnings.is_empty(), "settled: {:?}", r.warnings);
        assert_eq!(r.daily[0].frost_depth_m, 0.0, "no frozen lens at the start");
        // Ground that can freeze starts under the slab and the board (0.1 + 0.1 m); frost
        // there has not thawed from above, so no thaw depth lies at or above it.
        assert_abs(r.freezable_top_m, 0.2, 1e-12, "top of the gravel pad");
        assert!(
            r.daily.iter().any(|d| d.frost_depth_m > 0.2),
            "the pad freezes"
        );
        for d in &r.daily {
            assert!(
                d.thaw_depth_m == 0.0 || d.thaw_depth_m > 0.2,
                "day {}: thaw {}",
                d.day,
                d.thaw_depth_m
            );
        }
    }
    assert_abs(
        periodic.max_frost_depth_m,
        uniform.max_frost_depth_m,
        0.01,
        "same deepest frost",
    );
    // Capped before it settles, the run says so and names the field.
    v["winter"]["initial"]["max_years"] = serde_json::json!(3);
    let capped = winter_of(v).unwrap();
    assert_eq!(capped.spin_up_years, 3);
    assert!(
        capped
            .warnings
            .iter()
            .any(|w| w.field == "winter.initial.max_years"
                && w.message.contains("after 3 warm-up years")),
        "{:?}",
        capped.warnings
    );
}

#[test]
fn a_surface_set_by_n_factors_says_it_ignores_the_snow() {
    // n-factors stand for the surface and its cover together (the published n-factor
    // tables are measured over surfaces as they are), so the run cannot also lay the
    // climate's snow on the ground; it says so rather than ignore it silently.
    let mut v = cabin();
    v["winter"]["surface"] =
        serde_json::json!({"kind": "n-factor", "freezing": 0.7, "thawing": 1.0});
    v["winter"]["initial"] = serde_json::json!({"kind": "uniform", "temperature_c": 4});
    let r = winter_of(v.clone()).unwrap();
    assert!(
        r.warnings.iter().any(|w| w.field == "winter.surface"),
        "{:?}",
        r.warnings
    );
    v["winter"]["climate"]
        .as_object_mut()
        .unwrap()
        .remove("snow");
    let bare = winter_of(v).unwrap();
    assert!(bare.warnings.is_empty(), "{:?}", bare.warnings);
}

#[test]
fn a_winter_grid_finer_than_the_cell_cap_is_refused_with_the_cap_named() {
    // Hard cap on the column's cells (scenario_winter::MAX_CELLS): a grid allowed cell by
    // cell but too fine in total is refused naming the grid, the count and the cap.
    let mut v: serde_json::Value =
        serde_json::from_str(examples::example("silty-yard-design-winter").unwrap().json).unwrap();
    v["winter"]["grid"] =
        serde_json::json!({"surface_cell_m": 0.002, "growth_ratio": 1.0, "max_cell_m": 0.002});
    let s = scenario::from_value(v).unwrap();
    let e = compute::compute_with_winter(&s).unwrap_err();
    let x =
        e.0.iter()
            .find(|x| x.field == "winter.grid")
            .expect("the grid is named");
    let text = x.to_string();
    assert!(
        text.contains(&hibernal::document::winter::MAX_CELLS.to_string()),
        "{text}"
    );
}

#[test]
fn the_steady_profile_csv_carries_every_chart_point_with_its_band() {
    // The snow wall example: a row per chart point (depth, temperature at it from the exact
    // solution, and the band across snow regressions), units in the header.
    let s = scenario::parse(examples::example("snow-block-wall").unwrap().json).unwrap();
    let c = steady::compute(&s).unwrap();
    let text = steady::profile_csv(&c, hibernal::physics::units::UnitSystem::Si);
    let lines: Vec<&str> = text.trim().lines().collect();
    assert!(
        lines[0].starts_with("depth [m],temperature [°C],lowest"),
        "{}",
        lines[0]
    );
    assert_eq!(lines.len(), 1 + c.depths_m.len());
    let last: Vec<f64> = lines[lines.len() - 1]
        .split(',')
        .map(|x| x.parse().unwrap())
        .collect();
    let z = *c.depths_m.last().unwrap();
    assert!((last[0] - z).abs() < 1e-4 && (last[1] - c.result.temperature_at(z)).abs() < 1e-3);
    assert!(
        last[2] <= last[1] + 1e-3 && last[1] <= last[3] + 1e-3,
        "the line inside its band"
    );
    let us = steady::profile_csv(&c, hibernal::physics::units::UnitSystem::Us);
    assert!(us.starts_with("depth [ft],temperature [°F]"));
}

#[test]
fn an_n_factor_surface_names_its_preset_and_an_unknown_one_is_refused() {
    // The surface chosen travels with the n-factor (format version 6), so a reader can tell
    // bare soil from another surface of the same published value; a name that is not a
    // surface of the n-factor table is refused, naming the field.
    let mut v: serde_json::Value =
        serde_json::from_str(examples::example("silty-yard-design-winter").unwrap().json).unwrap();
    assert_eq!(v["winter"]["surface"]["preset"], "bare-soil");
    let r = winter_of(v.clone()).unwrap();
    assert!(r.max_frost_depth_m > 0.0);
    v["winter"]["surface"]["preset"] = serde_json::json!("moon-dust");
    let e = winter_of(v).unwrap_err();
    assert!(
        e.0.iter()
            .any(|x| x.field == "winter.surface.preset" && x.to_string().contains("bare-soil")),
        "{e:?}"
    );
}

/// The silty-yard example with its climate replaced by `years` identical invented years of
/// daily records from 1 July 2004: 245 days at +8 °C, then 120 days at −10 °C (a winter's
/// air freezing index of 1200 °C·days, as the example's design winter has).
fn silty_yard_over_daily_years(years: usize) -> scenario::Scenario {
    let mut v: serde_json::Value =
        serde_json::from_str(examples::example("silty-yard-design-winter").unwrap().json).unwrap();
    let mut days = Vec::new();
    let mut date = chrono::NaiveDate::from_ymd_opt(2004, 7, 1).unwrap();
    for _ in 0..years {
        for k in 0..365 {
            let t = if k < 245 { 8.0 } else { -10.0 };
            days.push(serde_json::json!({"date": date.to_string(), "mean_air_c": t}));
            date = date.succ_opt().unwrap();
        }
    }
    v["winter"]["climate"] = serde_json::json!({"kind": "daily", "days": days});
    v["winter"]["initial"] = serde_json::json!({"kind": "uniform", "temperature_c": 4.0});
    v["winter"]["step_s"] = serde_json::json!(21_600.0);
    scenario::from_value(v).unwrap()
}

fn hand_row<'a>(
    w: &'a hibernal::document::winter::WinterReport,
    m: &str,
) -> &'a hibernal::document::winter::HandMethodRow {
    w.hand_methods.iter().find(|h| h.method == m).unwrap()
}

/// The season length a modified Berggren row's note gives, days.
fn berggren_season_days(note: &str) -> f64 {
    let at = note.find("season ").expect("the note names the season") + "season ".len();
    note[at..].split(' ').next().unwrap().parse().unwrap()
}

#[test]
fn the_hand_methods_take_one_winter_of_a_record_of_several() {
    // The modified Berggren method takes the freezing index and the freezing season of one
    // design winter (TM 5-852-6 / UFC 3-130-04, from memory): over three identical winters
    // it must see one winter's season (about 120 days below 0 °C at the surface, which an
    // n-factor surface makes below 0 °C exactly when the air is), not the three winters'
    // 360, and give the depth it gives on the first winter alone.
    let one = compute::compute_with_winter(&silty_yard_over_daily_years(1)).unwrap();
    let three = compute::compute_with_winter(&silty_yard_over_daily_years(3)).unwrap();
    let (w1, w3) = (one.winter.unwrap(), three.winter.unwrap());
    let b1 = hand_row(&w1, "berggren");
    let b3 = hand_row(&w3, "berggren");
    let (s1, s3) = (
        berggren_season_days(&b1.note),
        berggren_season_days(&b3.note),
    );
    // The daily means are interpolated between days, so the season may gain or lose a day.
    assert!((s1 - 120.0).abs() <= 2.0, "one winter: {}", b1.note);
    assert!(
        (s3 - s1).abs() <= 1.0,
        "three winters: {} / {}",
        b3.note,
        b1.note
    );
    assert!(b3.note.contains("of 3"), "{}", b3.note);
    // The same winter, the same layers: the same depth (the mean annual surface
    // temperature is the same over one year or three identical ones; the first winter
    // starts from a uniform 4 °C, the later ones from the year before: 2 %).
    let (d1, d3) = (b1.depth_m.unwrap(), b3.depth_m.unwrap());
    assert_rel(d3, d1, 0.02, "Berggren over three winters vs one");
    // Stefan's law takes the design winter's surface index too: n × 1200 (UFC 3-130-04,
    // n = 0.7 here) within the day-interpolation's 1 %.
    let st = hand_row(&w3, "stefan").depth_m.unwrap();
    assert_rel(st, hand_row(&w1, "stefan").depth_m.unwrap(), 0.01, "Stefan");
}

#[test]
fn the_daily_csv_of_a_record_dates_each_day() {
    // A daily record: a date beside the day number, the record's first date on day 0 and
    // one date later each row (chrono's calendar); a design winter keeps day numbers only.
    let c = compute::compute_with_winter(&silty_yard_over_daily_years(1)).unwrap();
    let w = c.winter.unwrap();
    let csv = hibernal::document::winter::daily_csv(&w);
    let mut lines = csv.lines();
    assert!(
        lines
            .next()
            .unwrap()
            .starts_with("day,date,air temperature [°C]"),
        "{csv:.80}"
    );
    let first = chrono::NaiveDate::from_ymd_opt(2004, 7, 1).unwrap();
    let mut n = 0;
    for (i, line) in lines.enumerate() {
        let cells: Vec<&str> = line.split(',').collect();
        let day: f64 = cells[0].parse().unwrap();
        assert_eq!(day, i as f64, "{line}");
        let date = first + chrono::Days::new(i as u64);
        assert_eq!(cells[1], date.format("%Y-%m-%d").to_string(), "{line}");
        n += 1;
    }
    assert_eq!(n, 366, "day 0 and the end of each of 365 days");
    let s = scenario::parse(examples::example("silty-yard-design-winter").unwrap().json).unwrap();
    let c = compute::compute_with_winter(&s).unwrap();
    let csv = hibernal::document::winter::daily_csv(c.winter.as_ref().unwrap());
    assert!(csv.starts_with("day,air temperature [°C]"), "{csv:.80}");
    let row = csv.lines().nth(1).unwrap();
    assert!(
        row.split(',').all(|x| x.parse::<f64>().is_ok()),
        "numbers only: {row}"
    );
}
