//! Benchmark: the invented edge section through the invented design winter (plane 2D,
//! daily steps, 180 days), then the edge section of the heated-workshop example as the
//! scenario runs it (default grid, 190 days, with the 1D column beside it). Prints wall time (median of several runs), cells, steps, Newton
//! passes and conjugate-gradient iterations per step. Run: `cargo bench --bench
//! design_winter_2d`.

use hibernal::physics::edge2d::demo::{design_winter_climate, design_winter_section};
use hibernal::physics::edge2d::run_edge;
use std::time::Instant;

fn main() {
    let section = design_winter_section();
    let climate = design_winter_climate();
    let mut times = Vec::new();
    let mut last = None;
    for _ in 0..5 {
        let t0 = Instant::now();
        let r = run_edge(&section, &climate).expect("design winter runs");
        times.push(t0.elapsed().as_secs_f64());
        last = Some(r);
    }
    times.sort_by(f64::total_cmp);
    let r = last.unwrap();
    let median = times[times.len() / 2];
    println!(
        "design winter 2D (native): {} x {} = {} cells, {} steps ({} split), {:.2} passes/step, {:.1} linear iterations/step ({:.1}/pass)",
        r.nx,
        r.nz,
        r.nx * r.nz,
        r.steps,
        r.splits,
        r.iterations as f64 / r.steps as f64,
        r.linear_iterations as f64 / r.steps as f64,
        r.linear_iterations as f64 / r.iterations.max(1) as f64,
    );
    println!(
        "  time: median {:.1} ms (min {:.1}, max {:.1}) over {} runs",
        median * 1e3,
        times[0] * 1e3,
        times[times.len() - 1] * 1e3,
        times.len()
    );
    println!(
        "  frost below the footing base: deepest {:.3} m (day {:.0}); far field {:.3} m; mean slab heat {:.2} W/m; energy imbalance {:.2e} of throughput",
        r.max_frost_below_base_m,
        r.max_frost_below_base_time_s / 86_400.0,
        r.max_far_frost_depth_m,
        r.mean_slab_heat_w_m,
        (r.energy_imbalance_j_m / r.energy_throughput_j_m).abs()
    );
    edge_example();
}

fn edge_example() {
    let s = hibernal::document::scenario::parse(
        hibernal::document::examples::example("heated-workshop-edge")
            .expect("example")
            .json,
    )
    .expect("example parses");
    let doc = s.edge.expect("an edge section");
    let mut times = Vec::new();
    let mut last = None;
    for _ in 0..3 {
        let t0 = Instant::now();
        let r = hibernal::document::edge::run_edge_scenario(&doc).expect("example runs");
        times.push(t0.elapsed().as_secs_f64());
        last = Some(r);
    }
    times.sort_by(f64::total_cmp);
    let r = last.unwrap();
    println!(
        "edge example heated-workshop-edge (native, default grid): {} x {} = {} cells, {} steps, {:.2} passes/step; median {:.2} s (min {:.2}, max {:.2}) over {} runs",
        r.nx,
        r.nz,
        r.cells,
        r.steps,
        r.iterations as f64 / r.steps.max(1) as f64,
        times[times.len() / 2],
        times[0],
        times[times.len() - 1],
        times.len()
    );
    println!(
        "  frost below the footing base {:.3} m; far field {:.3} m (1D column {:.3} m)",
        r.max_frost_below_base_m, r.far_frost_depth_m, r.column_frost_depth_m
    );
}
