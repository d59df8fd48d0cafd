//! Benchmark: the invented edge section through the invented design winter (plane 2D,
//! daily steps, 180 days). Prints wall time (median of several runs), cells, steps, Newton
//! passes and conjugate-gradient iterations per step. Run: `cargo bench --bench
//! design_winter_2d`.

use hibernal::edge2d::demo::{design_winter_climate, design_winter_section};
use hibernal::edge2d::run_edge;
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
}
