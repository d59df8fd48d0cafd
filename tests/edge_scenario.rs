//! The edge section of the scenario format (version 4): document, checks with field paths,
//! the derating of buried boards, the run beside the 1D column, the report, CSV files,
//! charts and the CLI.

mod common;
use common::*;
use hibernal::document::compute;
use hibernal::document::examples;

use hibernal::document::edge::{
    edge_daily_csv, edge_field_csv, run_edge_scenario, EdgeDoc, EdgeJob, EdgeReport,
};
use hibernal::document::scenario;
use hibernal::physics::units::UnitSystem;
use serde_json::{json, Value};

const EDGE_EXAMPLES: [&str; 2] = ["heated-workshop-edge", "unheated-storage-edge"];

fn value(id: &str) -> Value {
    serde_json::from_str(examples::example(id).unwrap().json).unwrap()
}

/// An example made cheap for tests that do not need the default grid: coarse cells and a
/// short run.
fn quick(id: &str, days: f64) -> Value {
    let mut v = value(id);
    v["edge"]["grid"] = json!({ "fine_m": 0.05, "growth_ratio": 1.3, "max_cell_m": 0.8 });
    v["edge"]["duration_days"] = json!(days);
    v
}

fn doc(v: &Value) -> EdgeDoc {
    scenario::from_value(v.clone()).unwrap().edge.unwrap()
}

fn fields(e: &hibernal::physics::error::InputErrors) -> Vec<String> {
    e.0.iter().map(|x| x.field.clone()).collect()
}

fn run(v: &Value) -> EdgeReport {
    run_edge_scenario(&doc(v)).unwrap()
}

/// Both examples on the default grid: the heated workshop keeps frost above its footing's
/// base, the unheated storage building does not; in both, the far side of the 2D run
/// agrees with the 1D column run on the same soil, surface and climate within 5 cm. The
/// tolerance: the 2D run takes snow as a resistance that stores no heat and the soil from a
/// start with a gradient on cells up to 0.4 m deep, the column snow as cells of their own
/// from a uniform start on 1 cm cells; over 1.2 m of frost these differ by a few per cent.
#[test]
fn the_examples_show_both_outcomes_and_the_far_field_agrees_with_the_column() {
    let mut outcomes = Vec::new();
    for id in EDGE_EXAMPLES {
        let s = scenario::parse(examples::example(id).unwrap().json).unwrap();
        assert_eq!(s.version, 4, "{id}");
        let text = serde_json::to_string(&s).unwrap();
        assert_eq!(scenario::parse(&text).unwrap(), s, "{id} round-trips");
        let c = compute::compute_all(&s).unwrap();
        let r = c.edge.clone().expect("an edge report");
        assert!(
            r.column_frost_depth_m > 0.8,
            "{id}: {}",
            r.column_frost_depth_m
        );
        assert_abs(
            r.far_frost_depth_m,
            r.column_frost_depth_m,
            0.05,
            &format!("{id}: 2D far field against the 1D column"),
        );
        assert!(r.energy_imbalance_relative < 1e-9, "{id}");
        assert_rel(r.air_freezing_index_c_days, 1500.0, 0.01, "air index");
        assert!(r.surface_freezing_index_c_days < r.air_freezing_index_c_days);
        assert_eq!(r.cells, r.nx * r.nz);
        assert_eq!(r.daily.len(), 190, "{id}");
        assert_eq!(r.frost_below_base, r.max_frost_below_base_m > 0.0);
        assert!(r.warnings.is_empty(), "{id}: {:?}", r.warnings);
        outcomes.push(r.frost_below_base);
        let rep = serde_json::to_value(compute::report(&s, &c)).unwrap();
        assert!(rep["edge"]["hand_methods"].is_array());
        assert!(
            rep["edge"].get("fields").is_none(),
            "fields stay out of the JSON"
        );
    }
    assert_eq!(outcomes, [false, true]);
}

#[test]
fn older_versions_load_and_an_edge_needs_version_4() {
    for id in [
        "snow-block-wall",
        "silty-yard-design-winter",
        "training-dome-four",
    ] {
        let s = scenario::parse(examples::example(id).unwrap().json).unwrap();
        assert!(s.version < 4 && s.edge.is_none(), "{id}");
        let c = compute::compute_all(&s).unwrap();
        assert!(c.edge.is_none());
        let rep = serde_json::to_value(compute::report(&s, &c)).unwrap();
        assert!(rep.get("edge").is_none(), "no edge key in {id}");
        assert!(!serde_json::to_string(&s).unwrap().contains("\"edge\""));
    }
    let mut v = value("heated-workshop-edge");
    v["version"] = json!(3);
    assert_eq!(
        fields(&scenario::from_value(v.clone()).unwrap_err()),
        ["edge"]
    );
    v["version"] = json!(scenario::FORMAT_VERSION + 1);
    assert!(fields(&scenario::from_value(v).unwrap_err()).contains(&"version".to_string()));
}

#[test]
fn bad_fields_are_all_named_at_once_under_edge() {
    let mut v = quick("heated-workshop-edge", 10.0);
    v["edge"]["wing"]["width_m"] = json!(-1.0);
    v["edge"]["soil"][1]["thickness_m"] = json!(0.0);
    v["edge"]["inside"]["film_w_m2k"] = json!(0.0);
    v["edge"]["outside"]["film_w_m2k"] = json!(-3.0);
    v["edge"]["wall_board"]["material"]["moisture_derating_pct"] = json!(95.0);
    v["edge"]["start"]["gradient_k_per_m"] = json!(7.0);
    let e = EdgeJob::new(&doc(&v)).unwrap_err();
    let f = fields(&e);
    for want in [
        "edge.soil[1].thickness_m",
        "edge.outside.film_w_m2k",
        "edge.wall_board.material.moisture_derating_pct",
        "edge.start.gradient_k_per_m",
    ] {
        assert!(f.contains(&want.to_string()), "{want} in {f:?}");
    }
    // Once those are right, the section's own checks name theirs.
    let mut v = quick("heated-workshop-edge", 10.0);
    v["edge"]["wing"]["width_m"] = json!(-1.0);
    v["edge"]["inside"]["film_w_m2k"] = json!(0.0);
    v["edge"]["wing"]["thickness_m"] = json!(5.0);
    let f = fields(&EdgeJob::new(&doc(&v)).unwrap_err());
    for want in [
        "edge.wing.width_m",
        "edge.inside.film_w_m2k",
        "edge.wing.thickness_m",
    ] {
        assert!(f.contains(&want.to_string()), "{want} in {f:?}");
    }
    // A board that is not insulation, too many soil bands, a run too long, too many cells.
    let mut v = quick("heated-workshop-edge", 10.0);
    v["edge"]["wing"]["material"] = json!({ "kind": "concrete", "conductivity_w_m_k": null });
    assert_eq!(
        fields(&EdgeJob::new(&doc(&v)).unwrap_err()),
        ["edge.wing.material"]
    );
    let mut v = quick("heated-workshop-edge", 10.0);
    let band = v["edge"]["soil"][0].clone();
    v["edge"]["soil"] = Value::Array(vec![band; 21]);
    assert!(fields(&EdgeJob::new(&doc(&v)).unwrap_err()).contains(&"edge.soil".to_string()));
    let mut v = quick("heated-workshop-edge", 10.0);
    v["edge"]["duration_days"] = json!(5000.0);
    assert_eq!(
        fields(&EdgeJob::new(&doc(&v)).unwrap_err()),
        ["edge.duration_days"]
    );
    let mut v = quick("heated-workshop-edge", 10.0);
    v["edge"]["grid"] = json!({ "fine_m": 0.001, "growth_ratio": 1.01, "max_cell_m": 0.01 });
    assert_eq!(
        fields(&EdgeJob::new(&doc(&v)).unwrap_err()),
        ["edge.grid.fine_m"]
    );
}

/// Buried boards lose R to moisture: the 2D run takes each board's R times
/// (1 − derating). The nominal XPS conductivity is the materials table's; a 10 % and a 20 %
/// derating give k / 0.9 and k / 0.8 (R 90 % and 80 %).
#[test]
fn the_boards_are_derated_for_moisture_in_the_run() {
    let mut v = quick("heated-workshop-edge", 10.0);
    v["edge"]["wall_board"]["material"]["moisture_derating_pct"] = json!(0.0);
    v["edge"]["wing"]["material"]["moisture_derating_pct"] = json!(0.0);
    let plain = EdgeJob::new(&doc(&v)).unwrap();
    let k0 = plain.section().wall_board.unwrap().board.conductivity_w_m_k;
    assert!(k0 > 0.02 && k0 < 0.04, "XPS k {k0}");
    let derated = EdgeJob::new(&doc(&quick("heated-workshop-edge", 10.0))).unwrap();
    let s = derated.section();
    let (vb, w) = (s.wall_board.unwrap().board, s.wing.unwrap().board);
    assert_rel(
        vb.r_value_m2k_w(),
        0.9 * 0.05 / k0,
        1e-12,
        "wall board R at 10 %",
    );
    assert_rel(w.r_value_m2k_w(), 0.8 * 0.05 / k0, 1e-12, "wing R at 20 %");
    // And a wetter board lets the slab lose more heat.
    let a = run(&v);
    let mut wet = v.clone();
    wet["edge"]["wall_board"]["material"]["moisture_derating_pct"] = json!(60.0);
    wet["edge"]["wing"]["material"]["moisture_derating_pct"] = json!(60.0);
    let b = run(&wet);
    assert!(b.mean_slab_heat_w_m > a.mean_slab_heat_w_m);
    // The caution states the derating used.
    let r = run(&quick("heated-workshop-edge", 3.0));
    let c = r
        .cautions
        .iter()
        .find(|c| c.id == "board-moisture")
        .unwrap();
    assert!(
        c.text.contains("10 %") && c.text.contains("20 %"),
        "{}",
        c.text
    );
}

#[test]
fn the_report_carries_cautions_hand_methods_and_outlines() {
    let r = run(&quick("unheated-storage-edge", 60.0));
    for id in [
        "frost-heave",
        "estimates-only",
        "board-moisture",
        "long-wall",
    ] {
        assert!(r.cautions.iter().any(|c| c.id == id), "{id}");
    }
    let methods: Vec<&str> = r.hand_methods.iter().map(|h| h.method).collect();
    assert_eq!(
        methods,
        [
            "stefan",
            "stefan-resistance",
            "berggren",
            "column",
            "far-field-2d",
            "footing-2d"
        ]
    );
    assert!(r.hand_methods.iter().all(|h| !h.note.is_empty()));
    // Stefan's law ignores sensible heat: it is deeper than the column run.
    let depth = |m: &str| {
        r.hand_methods
            .iter()
            .find(|h| h.method == m)
            .and_then(|h| h.depth_m)
            .unwrap()
    };
    assert!(depth("stefan") > depth("column"));
    assert_abs(depth("column"), r.column_frost_depth_m, 1e-12, "column row");
    assert_abs(
        depth("footing-2d"),
        r.base_depth_m + r.max_frost_below_base_m,
        1e-12,
        "footing row",
    );
    let parts: Vec<&str> = r.outlines.iter().map(|o| o.part).collect();
    assert_eq!(parts, ["slab", "wall", "wing"]);
    assert_eq!(r.field_days.first(), Some(&0.0));
    assert_eq!(r.field_days.last(), Some(&60.0));
    assert_eq!(r.field_days.len(), r.fields.len());
    // Slicing changes nothing.
    let d = doc(&quick("unheated-storage-edge", 60.0));
    let mut job = EdgeJob::new(&d).unwrap();
    let mut slices = 0;
    while !job.advance(7).unwrap().finished {
        slices += 1;
    }
    assert!(slices >= 8);
    let sliced = job.finish();
    assert_eq!(sliced, r);
}

#[test]
fn csv_files_name_their_units_and_convert() {
    let r = run(&quick("unheated-storage-edge", 20.0));
    let si = edge_daily_csv(&r, UnitSystem::Si);
    let us = edge_daily_csv(&r, UnitSystem::Us);
    let head_si = si.lines().next().unwrap();
    let head_us = us.lines().next().unwrap();
    assert!(
        head_si.contains("[°C]") && head_si.contains("W/m"),
        "{head_si}"
    );
    assert!(
        head_us.contains("[°F]") && head_us.contains("Btu/(h·ft)"),
        "{head_us}"
    );
    assert_eq!(si.lines().count(), 21);
    let col = |text: &str, line: usize, c: usize| -> f64 {
        text.lines()
            .nth(line)
            .unwrap()
            .split(',')
            .nth(c)
            .unwrap()
            .parse()
            .unwrap()
    };
    // Air temperature: °F = 1.8 °C + 32.
    assert_abs(
        col(&us, 5, 1),
        1.8 * col(&si, 5, 1) + 32.0,
        0.02,
        "air in °F",
    );
    let f_si = edge_field_csv(&r, 10.0, UnitSystem::Si);
    let f_us = edge_field_csv(&r, 10.0, UnitSystem::Us);
    assert!(
        f_si.starts_with("# field of day 14.000\n") || f_si.starts_with("# field of day 7.000\n")
    );
    assert!(f_si.lines().nth(1).unwrap().contains("x [m]"));
    assert!(f_us.lines().nth(1).unwrap().contains("x [ft]"));
    assert_eq!(f_si.lines().count(), 2 + r.cells);
    let mid = 2 + r.cells / 2;
    assert_rel(
        col(&f_us, mid, 0),
        col(&f_si, mid, 0) / 0.3048,
        1e-3,
        "x in ft",
    );
}

#[test]
fn charts_render_and_never_fail() {
    let r = run(&quick("heated-workshop-edge", 14.0));
    for sys in [UnitSystem::Si, UnitSystem::Us] {
        let field = hibernal::charts::edge::edge_field_svg(&r, 7.0, sys, 800, 500).unwrap();
        assert!(field.contains("day 7"), "the day in the caption");
        let series = hibernal::charts::edge::edge_series_svg(&r, sys, 800, 500).unwrap();
        assert!(series.contains("Footing&apos;s base") || series.contains("Footing's base"));
        assert!(series.contains("1D column"));
    }
    // Empty and NaN reports draw with a caption.
    let mut empty = r.clone();
    empty.daily.clear();
    empty.fields.clear();
    assert!(
        hibernal::charts::edge::edge_field_svg(&empty, f64::NAN, UnitSystem::Si, 400, 300)
            .unwrap()
            .contains("no field")
    );
    assert!(
        hibernal::charts::edge::edge_series_svg(&empty, UnitSystem::Si, 400, 300)
            .unwrap()
            .contains("No day")
    );
    let mut nan = r.clone();
    for d in &mut nan.daily {
        d.frost_below_base_m = f64::NAN;
        d.slab_heat_w_m = f64::INFINITY;
    }
    nan.base_depth_m = f64::NAN;
    assert!(hibernal::charts::edge::edge_series_svg(&nan, UnitSystem::Us, 400, 300).is_ok());
}

#[test]
fn cli_runs_an_edge_and_writes_its_files() {
    let dir = test_dir("cli-edge");
    let file = dir.join("storage.json");
    std::fs::write(&file, quick("unheated-storage-edge", 21.0).to_string()).unwrap();
    let p = |n: &str| dir.join(n).to_string_lossy().into_owned();
    let report = report_of(cli().args([
        "run",
        &file.to_string_lossy(),
        "--edge-svg",
        &p("f.svg"),
        "--edge-day",
        "14",
        "--edge-series-svg",
        &p("s.svg"),
        "--edge-csv",
        &p("d.csv"),
        "--edge-field-csv",
        &p("f.csv"),
        "--units",
        "us",
    ]));
    assert!(report["edge"]["max_frost_below_base_m"].is_number());
    assert_eq!(report["edge"]["cautions"].as_array().unwrap().len(), 4);
    assert!(std::fs::read_to_string(dir.join("f.svg"))
        .unwrap()
        .contains("day 14"));
    assert!(std::fs::read_to_string(dir.join("s.svg"))
        .unwrap()
        .contains("<svg"));
    assert!(std::fs::read_to_string(dir.join("d.csv"))
        .unwrap()
        .contains("[ft]"));
    assert!(std::fs::read_to_string(dir.join("f.csv"))
        .unwrap()
        .starts_with("# field of day 14.000"));
    // Bad input: a message and exit 2, never a panic.
    let mut bad = quick("unheated-storage-edge", 21.0);
    bad["edge"]["wall"]["width_m"] = json!(-0.2);
    std::fs::write(&file, bad.to_string()).unwrap();
    let out = cli()
        .args(["run", &file.to_string_lossy()])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("edge.wall.width_m"));
    // An edge option on a scenario without an edge section.
    let out = cli().args(["example", "snow-block-wall"]).output().unwrap();
    std::fs::write(&file, &out.stdout).unwrap();
    let out = cli()
        .args(["run", &file.to_string_lossy(), "--edge-csv", &p("x.csv")])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("edge section"));
    let out = cli()
        .args(["run", &file.to_string_lossy(), "--edge-day", "NaN"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn the_schema_describes_the_edge() {
    use common::schema::*;
    let s = schema();
    let edge = prop(&s, "edge");
    assert_eq!(refers_to(edge), "EdgeDoc");
    assert!(nullable(edge));
    let e = def(&s, "EdgeDoc");
    assert_eq!(e["additionalProperties"], false, "unknown keys are refused");
    assert_properties(
        e,
        &[
            ("inside_half_width_m", "number", true),
            ("outside_extent_m", "number", true),
            ("depth_m", "number", true),
            ("soil", "array", true),
            ("field_every_days", "number", false),
            ("step_s", "number", false),
        ],
    );
    assert_eq!(prop(e, "field_every_days")["default"], 7.0);
    assert_eq!(refers_to(&prop(e, "soil")["items"]), "LayerDoc");
    // The wall is required; its board and the wing are optional sections of their own.
    assert_eq!(refers_to(prop(e, "wall")), "EdgeWallDoc");
    for (key, def_name) in [("wall_board", "EdgeWallBoardDoc"), ("wing", "EdgeWingDoc")] {
        let p = prop(e, key);
        assert_eq!(refers_to(p), def_name);
        assert!(
            nullable(p) && !required(e).contains(&key),
            "{key} is optional"
        );
    }
    assert_properties(
        def(&s, "EdgeWallDoc"),
        &[
            ("width_m", "number", true),
            ("base_depth_m", "number", true),
        ],
    );
    assert_properties(
        def(&s, "EdgeWallBoardDoc"),
        &[("thickness_m", "number", true), ("depth_m", "number", true)],
    );
}

/// A soil band's unfrozen-water curve (Anderson & Tice) reaches the 2D run, and a bad one is
/// named under the band.
#[test]
fn soil_bands_carry_their_unfrozen_water_curve() {
    let mut v = quick("heated-workshop-edge", 5.0);
    v["edge"]["soil"][0]["material"]["unfrozen_water"] = json!({ "alpha": 0.05, "beta": -0.5 });
    let job = EdgeJob::new(&doc(&v)).unwrap();
    let curve = job.section().soil[0].curve.expect("a curve");
    assert_abs(curve.alpha, 0.05, 0.0, "alpha");
    assert_abs(
        curve.total,
        0.22,
        1e-12,
        "total water from the band's water content",
    );
    assert!(job.section().soil[1].curve.is_none());
    v["edge"]["soil"][0]["material"]["unfrozen_water"] = json!({ "alpha": 5.0, "beta": -0.5 });
    assert_eq!(
        fields(&EdgeJob::new(&doc(&v)).unwrap_err()),
        ["edge.soil[0].material.unfrozen_water.alpha"]
    );
}

mod never_panics {
    use super::*;
    use crate::common::fuzz::{any_section_leaf, mutate, picks};
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig { cases: 200, ..ProptestConfig::default() })]

        /// An edge example with up to three numeric fields of its edge section replaced by
        /// anything runs (its first steps, with finite numbers, its cautions and charts) or is
        /// refused with errors naming `edge…` fields (or the field serde could not read):
        /// never a panic.
        #[test]
        fn mutated_edges_never_panic(
            which in 0usize..EDGE_EXAMPLES.len(),
            picks in picks(any_section_leaf()),
        ) {
            let mut v = quick(EDGE_EXAMPLES[which], 6.0);
            mutate(&mut v, Some("edge"), picks);
            let s = match scenario::from_value(v) {
                Ok(s) => s,
                Err(e) => {
                    prop_assert!(!e.0.is_empty());
                    return Ok(());
                }
            };
            match EdgeJob::new(s.edge.as_ref().unwrap()) {
                Ok(mut job) => {
                    match job.advance(8) {
                        Ok(p) => prop_assert!(p.fraction.is_finite()),
                        Err(e) => prop_assert!(e.0.iter().all(|x| x.field.starts_with("edge")), "{e}"),
                    }
                    let r = job.finish();
                    prop_assert_eq!(r.cautions.len(), 4);
                    prop_assert!(r.daily.iter().all(|d| d.frost_below_base_m.is_finite()));
                    let _ = hibernal::charts::edge::edge_field_svg(&r, 3.0, UnitSystem::Us, 300, 200);
                    let _ = hibernal::charts::edge::edge_series_svg(&r, UnitSystem::Si, 300, 200);
                    let _ = edge_field_csv(&r, 3.0, UnitSystem::Us);
                }
                Err(e) => {
                    prop_assert!(!e.0.is_empty());
                    prop_assert!(e.0.iter().all(|x| x.field.starts_with("edge")), "{e}");
                }
            }
        }
    }
}
