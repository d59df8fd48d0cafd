//! Benchmarks timed with the page's clock, for the benchmark script (`e2e/bench.mjs`), not
//! for users.

use super::shared::{clock_ms, to_js};
use crate::document::{examples, scenario};
use serde::Serialize;
use wasm_bindgen::prelude::*;

#[derive(Serialize)]
struct BenchOutcome {
    ms: f64,
    cells: usize,
    steps: u64,
    iterations: u64,
    iterations_per_step: f64,
    cell_updates_per_s: f64,
    max_frost_depth_m: f64,
}

/// Run the reference year (the benchmark case of `transient::reference`) once and time it
/// with the page's clock. For the benchmark script, not for users.
#[wasm_bindgen]
pub fn benchmark_reference_year() -> JsValue {
    let (spec, forcing) = crate::physics::transient::reference::reference_year();
    let t0 = clock_ms();
    let r = crate::physics::transient::run::run(&spec, &forcing);
    let ms = clock_ms() - t0;
    match r {
        Ok(r) => to_js(&BenchOutcome {
            ms,
            cells: r.cells,
            steps: r.steps,
            iterations: r.iterations,
            iterations_per_step: r.iterations as f64 / r.steps as f64,
            cell_updates_per_s: r.cells as f64 * r.iterations as f64 / (ms / 1000.0),
            max_frost_depth_m: r.max_frost_depth_m,
        }),
        Err(e) => JsValue::from_str(&e.to_string()),
    }
}

#[derive(Serialize)]
struct EdgeBenchOutcome {
    ms: f64,
    nx: usize,
    nz: usize,
    cells: usize,
    steps: u64,
    iterations: u64,
    iterations_per_step: f64,
    max_frost_below_base_m: f64,
    far_frost_depth_m: f64,
}

/// Run the edge section of the bundled heated-workshop example (the default grid, its
/// 190-day design winter, with the 1D column beside it) once and time it with the page's
/// clock. For the benchmark script, not for users.
#[wasm_bindgen]
pub fn benchmark_edge_winter() -> JsValue {
    let doc = examples::example("heated-workshop-edge")
        .ok_or_else(|| "no example".to_string())
        .and_then(|e| scenario::parse(e.json).map_err(|e| e.to_string()))
        .and_then(|s| s.edge.ok_or_else(|| "no edge section".to_string()));
    let doc = match doc {
        Ok(d) => d,
        Err(e) => return JsValue::from_str(&e),
    };
    let t0 = clock_ms();
    let r = crate::document::edge::run_edge_scenario(&doc);
    let ms = clock_ms() - t0;
    match r {
        Ok(r) => to_js(&EdgeBenchOutcome {
            ms,
            nx: r.nx,
            nz: r.nz,
            cells: r.cells,
            steps: r.steps,
            iterations: r.iterations,
            iterations_per_step: r.iterations as f64 / r.steps.max(1) as f64,
            max_frost_below_base_m: r.max_frost_below_base_m,
            far_frost_depth_m: r.far_frost_depth_m,
        }),
        Err(e) => JsValue::from_str(&e.to_string()),
    }
}
