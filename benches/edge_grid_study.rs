//! Grid study of the edge section (a measurement, not a check: its conclusion is asserted
//! cheaply in `tests/edge_grid_study.rs`): the demo section without boards, unheated and
//! heated, through its design winter on nine grids, printing cells, the frost below the
//! footing's base, the far-field frost and the wall time of each. Run: `cargo bench --bench
//! edge_grid_study`. The figures are in MEASUREMENTS.md, "The edge's grid study".

use hibernal::physics::edge2d::demo::{design_winter_climate, design_winter_section};
use hibernal::physics::edge2d::{run_edge, AxisSpacing, Inside};
use std::time::Instant;

fn main() {
    let climate = design_winter_climate();
    let grids = [
        (0.04, 1.2, 0.6),
        (0.03, 1.2, 0.5),
        (0.02, 1.2, 0.5),
        (0.02, 1.15, 0.4),
        (0.015, 1.15, 0.4),
        (0.01, 1.1, 0.25),
        (0.03, 1.15, 0.4),
        (0.04, 1.15, 0.4),
        (0.03, 1.12, 0.4),
    ];
    for heated in [false, true] {
        for &(f, g, m) in &grids {
            let mut s = design_winter_section();
            s.wall_board = None;
            s.wing = None;
            if !heated {
                s.inside = Inside::Closed;
            }
            s.grid = AxisSpacing {
                fine_m: f,
                growth_ratio: g,
                max_cell_m: m,
            };
            let t0 = Instant::now();
            let r = run_edge(&s, &climate).expect("the demo section runs");
            println!(
                "heated {heated} grid ({f}, {g}, {m}): {} x {} = {} cells, below base {:.3} m, far {:.3} m, {:.2} s native",
                r.nx,
                r.nz,
                r.nx * r.nz,
                r.max_frost_below_base_m,
                r.max_far_frost_depth_m,
                t0.elapsed().as_secs_f64()
            );
        }
    }
}
