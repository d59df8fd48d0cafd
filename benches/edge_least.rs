//! Benchmark: searches of the edge design (`edge2d::least`) on the invented section and
//! design winter, at the design grid (4 cm cells at the foci) and at a finer one, and on a
//! coarse trial grid (10 cm). Prints, for each: outcome, answer, runs, cells and wall time.
//! Run: `cargo bench --bench edge_least`.

use hibernal::physics::edge2d::demo::{design_winter_climate, design_winter_section};
use hibernal::physics::edge2d::least::{least_edge_value, EdgeQuantity};
use hibernal::physics::edge2d::{run_edge, AxisSpacing, EdgeSection, Inside};
use std::time::Instant;

fn case(name: &str, s: &EdgeSection, q: EdgeQuantity, lo: f64, hi: f64, res: f64) {
    let c = design_winter_climate();
    let cells = run_edge(
        &EdgeSection {
            duration_s: 86_400.0,
            step_s: 86_400.0,
            ..s.clone()
        },
        &c,
    )
    .map(|r| r.nx * r.nz)
    .unwrap_or(0);
    let t0 = Instant::now();
    let r = least_edge_value(s, &c, q, lo, hi, res, "edge").expect("the search runs");
    let t = t0.elapsed().as_secs_f64();
    println!(
        "{name}: {} in [{lo}, {hi}] to {res}: {} {:?} (frost below base {:.3} m, slope {:?}), {} runs of ~{cells} cells, {:.2} s ({:.2} s/run)",
        q.id(),
        r.outcome.id(),
        r.value,
        r.frost_below_base_m,
        r.slope,
        r.trials.len(),
        t,
        t / r.trials.len() as f64
    );
}

fn main() {
    // The demo section left unheated (closed floor): it needs a wing.
    let mut closed = design_winter_section();
    closed.inside = Inside::Closed;
    // The same without boards: the footing depth it needs.
    let mut bare = closed.clone();
    bare.wall_board = None;
    bare.wing = None;
    let grids = [
        (
            "coarse (10 cm)",
            AxisSpacing {
                fine_m: 0.1,
                growth_ratio: 1.35,
                max_cell_m: 1.0,
            },
        ),
        ("design (4 cm)", closed.grid),
        (
            "fine (2 cm)",
            AxisSpacing {
                fine_m: 0.02,
                growth_ratio: 1.1,
                max_cell_m: 0.3,
            },
        ),
    ];
    for (name, g) in grids {
        let with = |s: &EdgeSection| EdgeSection {
            grid: g,
            ..s.clone()
        };
        case(
            name,
            &with(&closed),
            EdgeQuantity::WingWidth,
            0.0,
            3.0,
            0.02,
        );
        case(name, &with(&closed), EdgeQuantity::WingR, 0.0, 6.0, 0.05);
        case(
            name,
            &with(&bare),
            EdgeQuantity::FootingDepth,
            0.2,
            2.5,
            0.02,
        );
    }
}
