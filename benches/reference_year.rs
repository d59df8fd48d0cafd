//! Benchmark: the reference year (about 200 ground cells, hourly steps, 365 days, snow cover
//! as snow cells of its own).
//! Prints wall time (median of several runs), iterations per step and cell-updates per
//! second. Run: `cargo bench --bench reference_year` (or `./build.sh bench`).

use hibernal::physics::transient::reference::reference_year;
use hibernal::physics::transient::run::run;
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
        "reference year (native): {} ground cells (+ up to {} snow cells), {} steps ({} split), {:.2} iterations/step",
        r.cells, r.max_snow_cells, r.steps, r.splits, per_step
    );
    println!(
        "  time: median {:.1} ms (min {:.1}, max {:.1}) over {} runs",
        median * 1e3,
        times[0] * 1e3,
        times[times.len() - 1] * 1e3,
        times.len()
    );
    println!(
        "  cell-updates per second: {:.3e} (ground cells × iterations / time; {:.3e} counting snow cells)",
        updates / median,
        r.cell_updates as f64 / median
    );
    println!(
        "  deepest frost {:.3} m on day {:.0}; energy imbalance {:.2e} of throughput; snow-mass exchange {:.3e} J/m²",
        r.max_frost_depth_m,
        r.max_frost_time_s / 86_400.0,
        (r.energy_imbalance_j_m2 / r.energy_throughput_j_m2).abs(),
        r.snow_exchange_j_m2
    );
}
