//! The ranges section of the scenario: a Monte Carlo over marked inputs, the spread across
//! the snow regressions and the one-at-a-time study, through the scenario document.
//! Sampling checks use fixed seeds and tolerances of 4 standard errors (a correct sampler
//! breaks one with probability about 6e-5 for any one seed).

mod common;
use common::*;
use hibernal::document::examples;
use hibernal::document::ranges::apply;
use hibernal::document::ranges::plan;
use hibernal::document::steady;

use hibernal::document::ranges::csv::{summary_csv, trials_csv};
use hibernal::document::ranges::plan::{evaluate, run_plan, RangesPlan};
use hibernal::document::ranges::{RangeResult, RangedWhat};
use hibernal::document::scenario;
use hibernal::document::scenario::Scenario;
use hibernal::physics::units::UnitSystem;
use serde_json::{json, Value};

fn doc(v: Value) -> Scenario {
    scenario::from_value(v).expect("test scenario is valid")
}

/// Two boards between air films, the top board's derating uniform on [5, 45] %, the
/// lower board's triangular on [0, 30] % with its peak at 10 %. The steady R-value is
/// R = 1/h_top + t₁(1 − d₁/100)/k₁ + t₂(1 − d₂/100)/k₂ + 1/h_bottom (a derated board's
/// conductivity is k/(1 − d/100)), linear in both inputs.
fn two_boards(runs: usize, seed: u64) -> Scenario {
    doc(json!({
        "format": "hibernal-scenario", "version": 5,
        "layers": [
            { "thickness_m": 0.10, "material": { "kind": "insulation", "board": "xps",
              "conductivity_w_m_k": 0.030, "moisture_derating_pct": 20 } },
            { "thickness_m": 0.05, "material": { "kind": "insulation", "board": "eps",
              "conductivity_w_m_k": 0.040, "moisture_derating_pct": 10 } }
        ],
        "top": { "kind": "air", "temperature_c": -20, "film_w_m2k": 25 },
        "bottom": { "kind": "air", "temperature_c": 20, "film_w_m2k": 8 },
        "ranges": {
            "runs": runs, "seed": seed,
            "inputs": [
                { "what": "insulation-derating", "layer": 0, "low": 5, "high": 45 },
                { "what": "insulation-derating", "layer": 1, "low": 0, "high": 30,
                  "distribution": { "kind": "triangular", "mode": 10 } }
            ]
        }
    }))
}

#[test]
fn a_case_linear_in_its_inputs_gives_the_analytic_mean_and_variance() {
    // Moments: uniform on [l, h] has mean (l + h)/2, variance (h − l)²/12 and fourth central
    // moment (h − l)⁴/80; triangular (l, c, h) has mean (l + c + h)/3 and variance
    // (l² + c² + h² − lc − lh − ch)/18 (standard results, e.g. Johnson, Kotz & Balakrishnan,
    // Continuous Univariate Distributions). Variances of independent terms add.
    let n = 10_000;
    let s = two_boards(n, 7);
    let r = run_plan(&RangesPlan::new(&s).unwrap(), 2).unwrap();
    let res = &r.results[0];
    assert_eq!(res.id, "r-value");
    assert_eq!((res.runs_ok, res.runs_failed), (n, 0));
    let b1 = 0.10 / 0.030 / 100.0; // R lost per % of derating, board 1
    let b2 = 0.05 / 0.040 / 100.0;
    let r0 = 1.0 / 25.0 + 0.10 / 0.030 + 0.05 / 0.040 + 1.0 / 8.0;
    let (l1, h1) = (5.0, 45.0);
    let (l2, c2, h2): (f64, f64, f64) = (0.0, 10.0, 30.0);
    let mean = r0 - b1 * (l1 + h1) / 2.0 - b2 * (l2 + c2 + h2) / 3.0;
    let v1 = b1 * b1 * (h1 - l1) * (h1 - l1) / 12.0;
    let v2 = b2 * b2 * (l2 * l2 + c2 * c2 + h2 * h2 - l2 * c2 - l2 * h2 - c2 * h2) / 18.0;
    let var = v1 + v2;
    // The base case is the document's own deratings (20 % and 10 %), exactly.
    assert_abs(
        res.base.unwrap(),
        r0 - b1 * 20.0 - b2 * 10.0,
        1e-12,
        "base R",
    );
    let se_mean = (var / n as f64).sqrt();
    assert_abs(res.mean.unwrap(), mean, 4.0 * se_mean, "mean R (4 SE)");
    // SE of the sample variance, √((μ₄ − σ⁴)/n): μ₄ of the sum = μ₄₁ + μ₄₂ + 6σ₁²σ₂²; the
    // uniform's excess kurtosis is −6/5 (μ₄ = 9/5·σ⁴ = w⁴/80), the triangular's −3/5
    // (μ₄ = 12/5·σ⁴), same source.
    let mu4 = b1.powi(4) * (h1 - l1).powi(4) / 80.0 + 2.4 * v2 * v2 + 6.0 * v1 * v2;
    let se_var = ((mu4 - var * var) / n as f64).sqrt();
    let sd = res.sd.unwrap();
    assert_abs(sd * sd, var, 4.0 * se_var, "variance of R (4 SE)");
    // Every value lies within the R the ends give.
    let lo = r0 - b1 * h1 - b2 * h2;
    let hi = r0 - b1 * l1 - b2 * l2;
    assert!(res.min.unwrap() >= lo - 1e-12 && res.max.unwrap() <= hi + 1e-12);
    assert!(res.p10 < res.p50 && res.p50 < res.p90);
    // One at a time: each swing is bᵢ × (hᵢ − lᵢ), the larger first.
    assert_eq!(res.sensitivity[0].input, 0);
    assert_abs(
        res.sensitivity[0].swing.unwrap(),
        b1 * 40.0,
        1e-12,
        "swing 1",
    );
    assert_abs(
        res.sensitivity[1].swing.unwrap(),
        b2 * 30.0,
        1e-12,
        "swing 2",
    );
    // No snow in the stack: no spread across snow regressions.
    assert!(res.spread.is_none());
}

#[test]
fn the_same_seed_gives_the_same_percentiles_on_any_number_of_threads() {
    let s = two_boards(300, 2026);
    let plan = RangesPlan::new(&s).unwrap();
    let one = run_plan(&plan, 1).unwrap();
    let two = run_plan(&plan, 2).unwrap();
    let again = run_plan(&RangesPlan::new(&s).unwrap(), 3).unwrap();
    assert_eq!(one, two, "one thread and two give the same report");
    assert_eq!(
        one, again,
        "a fresh plan from the same document gives it again"
    );
    let (a, b) = (&one.results[0], &two.results[0]);
    assert_eq!(
        (
            a.p10.unwrap().to_bits(),
            a.p50.unwrap().to_bits(),
            a.p90.unwrap().to_bits()
        ),
        (
            b.p10.unwrap().to_bits(),
            b.p50.unwrap().to_bits(),
            b.p90.unwrap().to_bits()
        )
    );
    // Tasks in reverse order, as workers might finish them, assemble to the same report.
    let outcomes: Vec<_> = (0..plan.task_count())
        .rev()
        .map(|k| (k, plan.run_task(k)))
        .collect();
    let mut ordered = vec![None; plan.task_count()];
    for (k, o) in outcomes {
        ordered[k] = Some(o);
    }
    let ordered: Vec<_> = ordered.into_iter().map(Option::unwrap).collect();
    assert_eq!(plan.assemble(&ordered).unwrap(), one);
    // Another seed gives other samples.
    let other = run_plan(&RangesPlan::new(&two_boards(300, 2027)).unwrap(), 2).unwrap();
    assert_ne!(other.results[0].p50, a.p50);
    assert_eq!(one.seed, 2026);
}

/// A snow layer over foam over soil, and a shelter: both with snow from a regression.
fn snowy() -> Scenario {
    let mut v: Value =
        serde_json::from_str(examples::example("snow-over-foam-on-silt").unwrap().json).unwrap();
    let shelter: Value =
        serde_json::from_str(examples::example("training-dome-four").unwrap().json).unwrap();
    v["version"] = json!(5);
    v["shelter"] = shelter["shelter"].clone();
    v["ranges"] = json!({
        "runs": 20, "seed": 3,
        "inputs": [ { "what": "snow-density", "low": 250, "high": 400 } ]
    });
    doc(v)
}

#[test]
fn the_band_across_regressions_holds_every_single_regression_result() {
    let s = snowy();
    let r = plan::run_ranges(&s, 2).unwrap();
    let ids: Vec<&str> = r.results.iter().map(|x| x.id).collect();
    assert_eq!(ids, ["r-value", "shelter-interior", "shelter-melt"]);
    for (res, kind) in r.results.iter().zip([
        RangeResult::RValue,
        RangeResult::ShelterInterior,
        RangeResult::ShelterMelt,
    ]) {
        let sp = res.spread.as_ref().expect("snow: a spread");
        let (lo, hi) = (sp.min.unwrap(), sp.max.unwrap());
        // Four asleep in this dome keep every inner surface frozen whatever the regression:
        // no melt at either end. The other two differ across the regressions.
        if kind == RangeResult::ShelterMelt {
            assert_eq!((lo, hi), (0.0, 0.0), "no melt");
        } else {
            assert!(lo < hi, "{}: the regressions differ", res.id);
        }
        assert_eq!(sp.members.len() + sp.skipped.len(), 9);
        // Each regression set by hand in the document (not through the study's own
        // setter) and the result computed by the ordinary path.
        for c in hibernal::physics::materials::SnowRegression::ALL {
            let mut v = serde_json::to_value(&s).unwrap();
            for l in v["layers"].as_array_mut().unwrap() {
                if l["material"]["kind"] == "snow" {
                    l["material"]["correlation"] = json!(c.id());
                }
            }
            v["shelter"]["snow_correlation"] = json!(c.id());
            let one = doc(v);
            match evaluate(&one, kind) {
                Ok(x) => {
                    assert!(
                        lo <= x && x <= hi,
                        "{}: {} gives {x}, outside [{lo}, {hi}]",
                        res.id,
                        c.id()
                    );
                    let m = sp.members.iter().find(|m| m.id == c.id()).unwrap();
                    assert_eq!(m.value, x, "{} member is that regression's result", c.id());
                }
                Err(_) => assert!(sp.skipped.iter().any(|e| e.field == c.id())),
            }
        }
        // The band's ends are members' values (tight, not padded).
        assert!(sp.members.iter().any(|m| m.value == lo));
        assert!(sp.members.iter().any(|m| m.value == hi));
    }
}

#[test]
fn a_freezing_index_input_gives_the_winter_that_index() {
    // The winter run computes its own air freezing index from the air it was given; after
    // the study sets the index, the run must report it back (to 0.5 %: the run samples the
    // air hourly, the study integrates the sine wave by days).
    let mut s =
        doc(serde_json::from_str(examples::example("silt-yard-how-sure").unwrap().json).unwrap());
    for target in [600.0, 1300.0] {
        let n = apply::apply(&mut s, RangedWhat::FreezingIndex, None, target).unwrap();
        assert_eq!(n, 1);
        let w = s.winter.as_ref().unwrap();
        let c = steady::compute(&s).unwrap();
        let rep = hibernal::document::winter::run_winter(w, &c.result.stack, &s.layers).unwrap();
        assert_rel(
            rep.air_freezing_index_c_days,
            target,
            0.005,
            "air freezing index",
        );
    }
    // Daily records: every day shifted by one amount, to the index asked for.
    let t0: Vec<f64> = (0..200)
        .map(|d| 3.0 - 12.0 * (std::f64::consts::PI * d as f64 / 200.0).sin())
        .collect();
    let mut v = serde_json::to_value(&s).unwrap();
    v["winter"]["climate"] = json!({
        "kind": "daily",
        "days": t0.iter().enumerate().map(|(d, t)| json!({
            "date": (chrono_like_date(d)), "mean_air_c": t
        })).collect::<Vec<_>>()
    });
    let mut s2 = doc(v);
    let before = apply::climate_freezing_index(&s2.winter.as_ref().unwrap().climate);
    assert_rel(
        before,
        hibernal::physics::climate::freezing_index_c_days(&t0),
        1e-12,
        "index of the records",
    );
    apply::apply(&mut s2, RangedWhat::FreezingIndex, None, 0.5 * before).unwrap();
    let hibernal::document::weather::ClimateDoc::Daily { days } =
        &s2.winter.as_ref().unwrap().climate
    else {
        panic!("still daily records")
    };
    let t1: Vec<f64> = days.iter().map(|d| d.mean_air_c).collect();
    let shift = t1[0] - t0[0];
    assert!(shift > 0.0, "a smaller index is a warmer winter");
    for (a, b) in t0.iter().zip(&t1) {
        assert_abs(b - a, shift, 1e-9, "one shift for every day");
    }
    assert_abs(
        hibernal::physics::climate::freezing_index_c_days(&t1),
        0.5 * before,
        1e-6,
        "index after the shift",
    );
}

/// Consecutive dates from 1 October 2030, YYYY-MM-DD.
fn chrono_like_date(d: usize) -> String {
    let months = [
        (10, 31),
        (11, 30),
        (12, 31),
        (1, 31),
        (2, 28),
        (3, 31),
        (4, 30),
        (5, 31),
    ];
    let mut left = d;
    for (i, (m, len)) in months.iter().enumerate() {
        if left < *len {
            let year = if i < 3 { 2030 } else { 2031 };
            return format!("{year}-{m:02}-{:02}", left + 1);
        }
        left -= len;
    }
    unreachable!("200 days fit in eight months")
}

#[test]
fn inputs_change_the_fields_they_name() {
    let mut s = snowy();
    // Two snow-free layers and one snow layer in this stack; the shelter has snow too.
    assert_eq!(
        apply::apply(&mut s, RangedWhat::SnowDensity, None, 333.0).unwrap(),
        2
    );
    assert_eq!(s.shelter.as_ref().unwrap().snow_density_kg_m3, 333.0);
    assert_eq!(
        apply::base_value(&s, RangedWhat::SnowDensity, None),
        Some(333.0)
    );
    let n = apply::apply(&mut s, RangedWhat::InsulationDerating, None, 15.0).unwrap();
    assert_eq!(n, 1);
    let c = steady::compute(&s).unwrap();
    assert!(c
        .result
        .stack
        .materials
        .iter()
        .any(|m| m.label.contains("R derated 15 %")));
    // The soil conductivity factor scales the soil's conductivity, frozen and unfrozen.
    let k_before: Vec<f64> = c
        .result
        .stack
        .materials
        .iter()
        .map(|m| m.conductivity.k(-5.0))
        .collect();
    apply::apply(&mut s, RangedWhat::SoilConductivityFactor, None, 1.2).unwrap();
    let c2 = steady::compute(&s).unwrap();
    for ((m0, m1), k0) in c
        .result
        .stack
        .materials
        .iter()
        .zip(&c2.result.stack.materials)
        .zip(&k_before)
    {
        let ratio = m1.conductivity.k(-5.0) / k0;
        let expect = if m0.family == hibernal::physics::materials::Family::Soil {
            1.2
        } else {
            1.0
        };
        assert_abs(
            ratio,
            expect,
            1e-12,
            &format!("{} conductivity ratio", m0.label),
        );
        assert_abs(
            m1.conductivity.k(5.0) / m0.conductivity.k(5.0),
            expect,
            1e-12,
            "unfrozen too",
        );
    }
}

fn errors_of(v: Value) -> Vec<String> {
    match scenario::from_value(v) {
        Err(e) => e.0.iter().map(|e| e.field.clone()).collect(),
        Ok(s) => match RangesPlan::new(&s) {
            Ok(_) => Vec::new(),
            Err(e) => e.0.iter().map(|e| e.field.clone()).collect(),
        },
    }
}

#[test]
fn bad_ranges_are_refused_naming_the_field() {
    let base = serde_json::to_value(two_boards(100, 1)).unwrap();
    let with = |f: &dyn Fn(&mut Value)| {
        let mut v = base.clone();
        f(&mut v);
        errors_of(v)
    };
    assert!(with(&|_| {}).is_empty());
    assert_eq!(with(&|v| v["version"] = json!(4)), ["ranges"]);
    assert_eq!(
        with(&|v| v["ranges"]["inputs"][0]["high"] = json!(1)),
        ["ranges.inputs[0].high"]
    );
    assert_eq!(with(&|v| v["ranges"]["runs"] = json!(1)), ["ranges.runs"]);
    assert_eq!(
        with(&|v| v["ranges"]["runs"] = json!(10_001)),
        ["ranges.runs"]
    );
    assert_eq!(
        with(&|v| v["ranges"]["seed"] = json!(1u64 << 53)),
        ["ranges.seed"]
    );
    assert_eq!(
        with(&|v| v["ranges"]["inputs"][0]["layer"] = json!(5)),
        ["ranges.inputs[0].layer"]
    );
    // No snow, no soil in this stack: nothing to vary.
    assert_eq!(
        with(&|v| v["ranges"]["inputs"][0] =
            json!({ "what": "snow-density", "low": 100, "high": 300 })),
        ["ranges.inputs[0].what"]
    );
    assert_eq!(
        with(&|v| v["ranges"]["inputs"][1]["layer"] = json!(0)),
        ["ranges.inputs[1].what"]
    );
    assert_eq!(
        with(&|v| v["ranges"]["results"] = json!(["frost-depth"])),
        ["ranges.results[0]"]
    );
    assert_eq!(
        with(&|v| v["ranges"]["inputs"][0]["distribution"] =
            json!({ "kind": "normal", "mean": 60, "sd": 5 })),
        ["ranges.inputs[0].distribution.mean"]
    );
    assert_eq!(
        with(&|v| v["ranges"]["inputs"] = json!([])),
        ["ranges.inputs"]
    );
    // Unknown names are format errors at their place.
    assert_eq!(
        with(&|v| v["ranges"]["inputs"][0]["what"] = json!("wind")),
        ["ranges.inputs[0].what"]
    );
    // A sampled value the model refuses is a failed run, counted, not a refused study.
    let mut v = base.clone();
    v["ranges"]["inputs"][0]["high"] = json!(95);
    assert_eq!(errors_of(v.clone()), Vec::<String>::new());
    let r = plan::run_ranges(&scenario::from_value(v).unwrap(), 1).unwrap();
    let res = &r.results[0];
    assert!(res.runs_failed > 0 && res.runs_ok > 0);
    assert_eq!(res.runs_ok + res.runs_failed, 100);
    assert!(res.failures[0].message.contains("moisture_derating_pct"));
}

#[test]
fn the_csv_files_carry_the_seed_and_the_percentiles() {
    let r = plan::run_ranges(&two_boards(50, 99), 1).unwrap();
    let t = trials_csv(&r, UnitSystem::Si);
    let lines: Vec<&str> = t.lines().collect();
    assert_eq!(lines.len(), 51);
    assert!(lines[0].starts_with("run,seed,Insulation derating (layer 1) [%]"));
    assert!(lines[0].ends_with("R-value of the stack [m²·K/W]"));
    assert!(lines[1].starts_with("1,99,"));
    let sum = summary_csv(&r, UnitSystem::Si);
    let row: Vec<&str> = sum.lines().nth(1).unwrap().split(',').collect();
    let res = &r.results[0];
    let p50: f64 = row[4].parse().unwrap();
    assert_abs(p50, res.p50.unwrap(), 1e-4, "P50 in the summary");
    assert_eq!(row[12], "99");
    // US units: R in ft²·°F·h/Btu (× 5.678263, ASHRAE Fundamentals unit conversions).
    let us = summary_csv(&r, UnitSystem::Us);
    let row: Vec<&str> = us.lines().nth(1).unwrap().split(',').collect();
    let p50_us: f64 = row[4].parse().unwrap();
    assert_rel(p50_us, res.p50.unwrap() * 5.678263, 1e-4, "P50 in US units");
}

#[test]
fn the_example_study_runs_and_reads_sensibly() {
    // The bundled example, fewer runs: the frost depth's spread across the snow regressions
    // holds its base case, and its inputs all move the answer.
    let mut s =
        doc(serde_json::from_str(examples::example("silt-yard-how-sure").unwrap().json).unwrap());
    s.ranges.as_mut().unwrap().runs = 8;
    let r = plan::run_ranges(&s, 2).unwrap();
    let frost = r.results.iter().find(|x| x.id == "frost-depth").unwrap();
    let base = frost.base.unwrap();
    let sp = frost.spread.as_ref().unwrap();
    assert!(sp.min.unwrap() <= base && base <= sp.max.unwrap());
    assert!(frost.sensitivity.iter().all(|w| w.swing.unwrap() > 0.0));
    // A colder winter (the freezing index's high end) freezes deeper.
    let fi = frost
        .sensitivity
        .iter()
        .find(|w| w.what == "freezing-index")
        .unwrap();
    assert!(fi.at_high.unwrap() > fi.at_low.unwrap());
    // Denser snow conducts better and lets the frost deeper (Sturm et al. 1997: k rises
    // with density).
    let sd = frost
        .sensitivity
        .iter()
        .find(|w| w.what == "snow-density")
        .unwrap();
    assert!(sd.at_high.unwrap() > sd.at_low.unwrap());
    assert_eq!(r.trials.len(), 8);
}

#[test]
fn runs_past_a_limit_are_counted_from_the_runs_themselves() {
    // The dome with a 50 W stove and the snow's density uncertain: lighter snow insulates
    // better and its inner surface melts, denser snow stays frozen (about half the runs
    // each way, seen when the test was written). The melt result and the interior come
    // from one shelter run, and the count of runs whose inner surface melts is that of the
    // runs' own values.
    let mut v: Value =
        serde_json::from_str(examples::example("training-dome-four").unwrap().json).unwrap();
    v["version"] = json!(5);
    v["ranges"] = json!({
        "runs": 60, "seed": 21, "results": ["shelter-interior", "shelter-melt"],
        "inputs": [ { "what": "snow-density", "low": 200, "high": 420 } ]
    });
    v["shelter"]["conditions"]["stove_w"] = json!(50.0);
    let s = doc(v);
    let r = plan::run_ranges(&s, 2).unwrap();
    let melt = r.results.iter().find(|x| x.id == "shelter-melt").unwrap();
    let interior = r
        .results
        .iter()
        .find(|x| x.id == "shelter-interior")
        .unwrap();
    assert!(interior.past_limit.is_none(), "the interior has no limit");
    let p = melt.past_limit.as_ref().expect("melt has a limit");
    assert_eq!(p.limit, 0.0);
    assert_eq!(p.meaning, "the inner surface melts");
    let by_hand = r
        .trials
        .iter()
        .filter(|t| t.values[1].unwrap() > 0.0)
        .count();
    assert_eq!((p.runs, p.of), (by_hand, 60));
    assert!(
        0 < p.runs && p.runs < 60,
        "the range straddles the limit: {}",
        p.runs
    );
    // Lighter snow melts: every melting run's density is below every frozen run's.
    let (wet, dry): (Vec<_>, Vec<_>) = r.trials.iter().partition(|t| t.values[1].unwrap() > 0.0);
    let lightest_dry = dry
        .iter()
        .map(|t| t.inputs[0])
        .fold(f64::INFINITY, f64::min);
    assert!(wet.iter().all(|t| t.inputs[0] < lightest_dry));
    assert_eq!(p.base_past, Some(melt.base.unwrap() > 0.0));
    // Each run's two values are those of an ordinary run of its scenario.
    let plan = RangesPlan::new(&s).unwrap();
    for i in [0, 17, 59] {
        let one = plan.scenario_for(plan::Task::Sample(i)).unwrap();
        let rep = hibernal::document::shelter::run_shelter(one.shelter.as_ref().unwrap()).unwrap();
        assert_eq!(
            r.trials[i].values,
            vec![Some(rep.interior_c), Some(rep.melt_kg_h)]
        );
    }
    // The summary names the count; a result without a limit leaves it empty.
    let sum = summary_csv(&r, UnitSystem::Si);
    let rows: Vec<Vec<&str>> = sum.lines().map(|l| l.split(',').collect()).collect();
    assert_eq!(rows[0][15], "runs past the limit");
    assert_eq!(rows[1][15], "");
    assert_eq!(rows[2][15], p.runs.to_string());
    assert_eq!(rows[2][16], "the inner surface melts");
}
