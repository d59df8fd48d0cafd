//! Benchmark: the reference year (about 200 cells, hourly steps, 365 days, snow cover).
//! Prints wall time (median of several runs), iterations per step and cell-updates per
//! second. Run: `cargo bench --bench reference_year` (or `./build.sh bench`).

use hibernal::transient::reference::reference_year;
use hibernal::transient::run::run;
use std::time::Instant;

fn main() {
    let (spec, forcing) = reference_year();
    let mut times = Vec::new();
    let mut last = None;
    for _ in 0..7 {
        let t0 = Instant::now();
        let r = run(&spec, &forcing).expect("reference year runs");
        times.push(t0.elapsed().as_secs_f64());
        last = Some(r);
    }
    times.sort_by(f64::total_cmp);
    let r = last.unwrap();
    let median = times[times.len() / 2];
    let per_step = r.iterations as f64 / r.steps as f64;
    let updates = r.cells as f64 * r.iterations as f64;
    println!(
        "reference year (native): {} cells, {} steps ({} split), {:.2} iterations/step",
        r.cells, r.steps, r.splits, per_step
    );
    println!(
        "  time: median {:.1} ms (min {:.1}, max {:.1}) over {} runs",
        median * 1e3,
        times[0] * 1e3,
        times[times.len() - 1] * 1e3,
        times.len()
    );
    println!(
        "  cell-updates per second: {:.3e} (cells × iterations / time)",
        updates / median
    );
    println!(
        "  deepest frost {:.3} m on day {:.0}; energy imbalance {:.2e} of throughput",
        r.max_frost_depth_m,
        r.max_frost_time_s / 86_400.0,
        (r.energy_imbalance_j_m2 / r.energy_throughput_j_m2).abs()
    );
}
