//! Inverse design at the edge (`edge2d::least`): the least wing, board or footing depth
//! that keeps frost at or above the footing's base, each trial a 2D winter run.
//!
//! The runs use a coarse grid (10 cm cells at the foci growing by 1.35 up to 1 m, about
//! 700 cells) and 2-day steps so that a search of ten-odd winters takes well under a second
//! in release; the orderings and the agreement with a scan checked here hold on any grid,
//! and the design grid's own error is studied in tests/edge2d.rs.

mod common;
use common::*;

use hibernal::physics::edge2d::demo::design_winter_climate;
use hibernal::physics::edge2d::least::*;
use hibernal::physics::edge2d::{run_edge, AxisSpacing, EdgeSection, Inside};

const DAY: f64 = 86_400.0;
/// The resolution where the answer's own precision is checked, m.
const RES: f64 = 0.02;
/// The resolution of the orderings (fewer runs; the allowance scales with it), m.
const COARSE_RES: f64 = 0.05;

/// The invented demo section on a coarse grid, with or without its boards and heating.
fn coarse(wall_board: bool, wing: bool, heated: bool) -> EdgeSection {
    let mut s = demo_section(wall_board, wing, heated);
    s.grid = AxisSpacing {
        fine_m: 0.1,
        growth_ratio: 1.35,
        max_cell_m: 1.0,
    };
    s.step_s = 2.0 * DAY;
    s
}

/// A shallow footing (base 0.4 m) with its vertical board to the base and a wing at
/// 0.25 m: the case a wing is for. `inside_c`: `None` for a closed (unheated) floor.
fn shallow(inside_c: Option<f64>) -> EdgeSection {
    let mut s = coarse(true, true, inside_c.is_some());
    s.wall.base_depth_m = 0.4;
    s.wall_board.as_mut().unwrap().depth_m = 0.4;
    s.wing.as_mut().unwrap().depth_m = 0.25;
    if let Some(air_c) = inside_c {
        s.inside = Inside::Heated {
            air_c,
            film_w_m2k: 6.0,
        };
    }
    s
}

fn below_base(s: &EdgeSection, q: EdgeQuantity, v: f64) -> f64 {
    let s = q.apply(s, v, "edge").unwrap();
    run_edge(&s, &design_winter_climate())
        .unwrap()
        .max_frost_below_base_m
}

fn search_to(s: &EdgeSection, q: EdgeQuantity, lo: f64, hi: f64, res: f64) -> EdgeLeastAnswer {
    let r = least_edge_value(s, &design_winter_climate(), q, lo, hi, res, "edge").unwrap();
    println!(
        "{}: {} value {:?} below base {:.4} slope {:?} jump {:?} in {} runs",
        q.id(),
        r.outcome.id(),
        r.value,
        r.frost_below_base_m,
        r.slope,
        r.jump_m,
        r.trials.len()
    );
    r
}

fn search(s: &EdgeSection, q: EdgeQuantity, lo: f64, hi: f64) -> EdgeLeastAnswer {
    search_to(s, q, lo, hi, RES)
}

/// (a) The answer is the least value: checked against the definition itself, by runs of
/// their own outside the search. A run at the answer keeps frost at or above the base (and
/// gives the very number the search recorded: the runs are deterministic), a run at
/// answer − resolution lets it below. For the wing width and the wing's R-value.
#[test]
fn the_answer_is_the_least_value() {
    let s = shallow(None);
    for (q, hi) in [(EdgeQuantity::WingWidth, 3.0), (EdgeQuantity::WingR, 6.0)] {
        let r = search(&s, q, 0.0, hi);
        assert_eq!(r.outcome, EdgeOutcome::Found);
        let v = r.value.unwrap();
        assert!(v > 0.1 && v < hi, "{v}");
        let at = below_base(&s, q, v);
        assert!(at <= 0.0, "at the answer frost is {at} m below the base");
        assert_eq!(at, r.frost_below_base_m);
        let short = below_base(&s, q, v - RES);
        assert!(short > 0.0, "at answer − resolution frost is {short} m");
        // The bracket is within the resolution and the slope is a decrease.
        let (a, b) = r.bracket.unwrap();
        // (Neighbours on the search's grid, 0 + k·RES, differ by RES and a rounding error.)
        assert!(b - a <= RES * (1.0 + 1e-9) && b == v);
        // Every value tried but the range's top lies on that grid.
        for t in &r.trials {
            let k = t.value / RES;
            assert!(
                t.value == hi || (k - k.round()).abs() < 1e-9,
                "{} off the grid",
                t.value
            );
        }
        assert!(r.slope.unwrap() < 0.0);
        assert!(r.trials.len() <= MAX_EDGE_RUNS);
    }
}

/// (b) Agreement with a brute scan: the footing depth of the unheated section without
/// boards, scanned every 0.1 m from 0.8 to 1.6 m, each a run of its own. The scan must be
/// monotone (within the search's read-off allowance) and the search's answer must lie above
/// the scan's last failing depth and at most one resolution past its first holding depth.
#[test]
fn the_search_agrees_with_a_scan() {
    let s = coarse(false, false, false);
    let q = EdgeQuantity::FootingDepth;
    let scan: Vec<(f64, f64)> = (0..9)
        .map(|k| {
            let d = 0.8 + 0.1 * k as f64;
            (d, below_base(&s, q, d))
        })
        .collect();
    println!("scan {scan:?}");
    for w in scan.windows(2) {
        assert!(
            w[1].1 <= w[0].1 + hibernal::physics::least::MONOTONE_NOISE_M,
            "{w:?}"
        );
    }
    let k = scan
        .iter()
        .position(|p| p.1 <= 0.0)
        .expect("the scan holds");
    assert!(k > 0, "the scan's shallowest depth already holds");
    let r = search(&s, q, 0.2, 2.5);
    assert_eq!(r.outcome, EdgeOutcome::Found);
    let v = r.value.unwrap();
    assert!(
        v > scan[k - 1].0 && v <= scan[k].0 + RES,
        "answer {v} against the scan's {} (fails) and {} (holds)",
        scan[k - 1].0,
        scan[k].0
    );
}

/// (c) Physical orderings, from the comparison (maximum) principle of heat conduction with
/// phase change, which the scheme keeps (backward Euler on an M-matrix, monotone enthalpy):
/// on the same grid, a warmer inside air only warms the ground, so a warmer building needs no
/// wider wing; the least values may differ from the true thresholds by up to one resolution
/// each, hence the allowance of one resolution.
#[test]
fn a_warmer_building_needs_no_wider_wing() {
    let q = EdgeQuantity::WingWidth;
    let widths: Vec<f64> = [0.0, 5.0, 10.0]
        .iter()
        .map(|&t| {
            let r = search_to(&shallow(Some(t)), q, 0.0, 3.0, COARSE_RES);
            assert!(matches!(
                r.outcome,
                EdgeOutcome::Found | EdgeOutcome::SmallestSuffices
            ));
            r.value.unwrap()
        })
        .collect();
    println!("least wing width at 0, 5, 10 °C inside: {widths:?}");
    assert!(widths[1] <= widths[0] + COARSE_RES && widths[2] <= widths[1] + COARSE_RES);
    // The orderings are not empty: the coldest needs a wing, and more than the warmest.
    assert!(widths[0] > 0.1 && widths[0] > widths[2] + COARSE_RES);
}

/// (c) The least footing depth of an unheated section without boards against the frost
/// depth of the open ground far from it (the far column of the same runs, itself checked
/// against Neumann's solution in tests/edge2d.rs). The footing lies under the closed wall
/// top beside ground under a closed floor, both shielded from the cold, so frost under it
/// cannot reach deeper than in the open: the least depth is at most the far-field depth plus
/// one cell there (0.15 m on this grid at 1–2 m). It is not much shallower either: the
/// wall's outer face borders open ground that freezes almost to the far-field depth, and
/// the concrete conducts the cold down; at least half the far-field depth is asked for (a
/// loose bound of this test, not a published figure; measured about 0.68). Heating the
/// building to 10 °C against 0 °C (same film) lifts it, by the comparison principle.
#[test]
fn least_footing_depth_against_the_far_field_and_heating() {
    let q = EdgeQuantity::FootingDepth;
    let closed = coarse(false, false, false);
    let r = search_to(&closed, q, 0.2, 2.5, COARSE_RES);
    assert_eq!(r.outcome, EdgeOutcome::Found);
    let v = r.value.unwrap();
    let far = run_edge(
        &q.apply(&closed, v, "edge").unwrap(),
        &design_winter_climate(),
    )
    .unwrap()
    .max_far_frost_depth_m;
    println!("least footing depth {v:.3} m, far-field frost {far:.3} m");
    assert!(v <= far + 0.15 && v >= 0.5 * far, "{v} against {far}");
    let at = |t: f64| {
        let mut s = coarse(false, false, true);
        s.inside = Inside::Heated {
            air_c: t,
            film_w_m2k: 6.0,
        };
        search_to(&s, q, 0.2, 2.5, COARSE_RES).value.unwrap()
    };
    let (cold, warm) = (at(0.0), at(10.0));
    println!("least footing depth inside at 0 °C {cold:.3} m, at 10 °C {warm:.3} m");
    assert!(
        warm <= cold + COARSE_RES && warm < cold,
        "{warm} against {cold}"
    );
}

/// (d) The ends of the range and bad settings: the smallest suffices, the largest does not
/// reach, the run cap, and typed errors naming their fields.
#[test]
fn edge_cases_and_errors() {
    let c = design_winter_climate();
    // A house at 20 °C on a 0.6 m footing needs no wing (frost stays in the footing).
    let r = search(&coarse(true, true, true), EdgeQuantity::WingWidth, 0.0, 3.0);
    assert_eq!(r.outcome, EdgeOutcome::SmallestSuffices);
    assert_eq!((r.value, r.trials.len()), (Some(0.0), 1));
    assert!(r.frost_below_base_m <= 0.0);
    // An unheated, uninsulated section needs more than 0.6 m of footing.
    let r = search(
        &coarse(false, false, false),
        EdgeQuantity::FootingDepth,
        0.2,
        0.6,
    );
    assert_eq!(r.outcome, EdgeOutcome::NotReachable);
    assert_eq!((r.value, r.trials.len()), (None, 2));
    assert!(r.frost_below_base_m > 0.0);
    // The run cap: four runs cannot narrow 3 m to 2 cm; the value given still holds.
    let mut job = EdgeLeastSearch::new(
        &shallow(None),
        &c,
        EdgeQuantity::WingWidth,
        0.0,
        3.0,
        RES,
        "edge",
    )
    .unwrap();
    job.set_max_runs(4);
    let r = job.finish().unwrap();
    assert_eq!((r.outcome, r.trials.len()), (EdgeOutcome::RunLimit, 4));
    let (a, b) = r.bracket.unwrap();
    assert!(b - a > RES && r.frost_below_base_m <= 0.0);
    // Errors, each naming its field.
    let field = |e: EdgeLeastError| match e {
        EdgeLeastError::Input(e) => e.0.iter().map(|e| e.field.clone()).collect::<Vec<_>>(),
        other => panic!("expected an input error, got {other:?}"),
    };
    let no_wing = coarse(true, false, true);
    for q in [EdgeQuantity::WingWidth, EdgeQuantity::WingR] {
        let e = EdgeLeastSearch::new(&no_wing, &c, q, 0.0, 1.0, RES, "edge").unwrap_err();
        assert_eq!(field(e), ["edge.wing"]);
    }
    let e = EdgeLeastSearch::new(
        &coarse(false, true, true),
        &c,
        EdgeQuantity::WallBoardR,
        0.0,
        1.0,
        RES,
        "edge",
    )
    .unwrap_err();
    assert_eq!(field(e), ["edge.wall_board"]);
    let s = coarse(true, true, true);
    let q = EdgeQuantity::WingWidth;
    let e = EdgeLeastSearch::new(&s, &c, q, 1.0, 1.0, RES, "edge").unwrap_err();
    assert_eq!(field(e), ["edge.least.max"]);
    let e = EdgeLeastSearch::new(&s, &c, q, 1.0, 0.5, RES, "edge").unwrap_err();
    assert_eq!(field(e), ["edge.least.max"]);
    for res in [0.0, -0.01, f64::NAN] {
        let e = EdgeLeastSearch::new(&s, &c, q, 0.0, 1.0, res, "edge").unwrap_err();
        assert_eq!(field(e), ["edge.least.resolution"]);
    }
    // A range end the section refuses is named by the section's field.
    let e = EdgeLeastSearch::new(&s, &c, q, 0.0, 50.0, RES, "edge").unwrap_err();
    assert_eq!(field(e), ["edge.wing.width_m"]);
    // (The vertical board follows the base to 0 and is named too.)
    let e =
        EdgeLeastSearch::new(&s, &c, EdgeQuantity::FootingDepth, 0.0, 1.0, RES, "x").unwrap_err();
    assert!(field(e).contains(&"x.wall.base_depth_m".to_string()));
    // What `apply` does: a vertical board that reached the base follows it; R is thickness
    // over the board's conductivity; a wing narrower than the least runs without the wing.
    let d = EdgeQuantity::FootingDepth.apply(&s, 0.9, "edge").unwrap();
    assert_eq!(
        (d.wall.base_depth_m, d.wall_board.unwrap().depth_m),
        (0.9, 0.9)
    );
    let k = s.wing.unwrap().board.conductivity_w_m_k;
    let w = EdgeQuantity::WingR
        .apply(&s, 2.0, "edge")
        .unwrap()
        .wing
        .unwrap();
    assert!((w.board.r_value_m2k_w() - 2.0).abs() < 1e-12 && w.board.conductivity_w_m_k == k);
    assert!(EdgeQuantity::WingWidth
        .apply(&s, 0.03, "edge")
        .unwrap()
        .wing
        .is_none());
    assert!(EdgeQuantity::WallBoardR
        .apply(&s, 0.0, "edge")
        .unwrap()
        .wall_board
        .is_none());
}

/// (e) Slicing changes no number: the job driven a few time steps at a time (runs and
/// trials cut mid-winter) gives the very report of the blocking call; the fraction never
/// decreases, stays within 0–1 and reaches 1 only at the end.
#[test]
fn slicing_changes_no_number() {
    let s = shallow(Some(5.0));
    let c = design_winter_climate();
    let q = EdgeQuantity::WingR;
    let whole = least_edge_value(&s, &c, q, 0.0, 6.0, COARSE_RES, "edge").unwrap();
    assert_eq!(whole.outcome, EdgeOutcome::Found);
    let mut job = EdgeLeastSearch::new(&s, &c, q, 0.0, 6.0, COARSE_RES, "edge").unwrap();
    let mut last = 0.0;
    let mut slices = 0;
    loop {
        let p = job.advance(7).unwrap();
        slices += 1;
        assert!(
            p.fraction >= last && p.fraction <= 1.0,
            "{} after {last}",
            p.fraction
        );
        assert_eq!(p.fraction == 1.0, p.finished);
        last = p.fraction;
        if p.finished {
            break;
        }
    }
    assert!(slices > 2 * whole.trials.len());
    assert_eq!(job.report().unwrap(), whole);
}

/// Sensitivity to the winter: the run covers the freezing season only, whose air is
/// −A sin(πτ/S) with A proportional to the freezing index, so a harsher winter is colder at
/// every step and (comparison principle) needs no less; a milder one no more (one
/// resolution of allowance each way, as above).
#[test]
fn a_harsher_winter_needs_no_less() {
    let job = EdgeLeastSearch::new(
        &shallow(None),
        &design_winter_climate(),
        EdgeQuantity::WingWidth,
        0.0,
        3.0,
        COARSE_RES,
        "edge",
    )
    .unwrap();
    let mild = job.under_scaled_winter(0.9).unwrap().finish().unwrap();
    let harsh = job.under_scaled_winter(1.1).unwrap().finish().unwrap();
    let base = job.finish().unwrap();
    let v = |r: &EdgeLeastAnswer| r.value.unwrap();
    println!(
        "least wing width: F × 0.9 {:.3} m, × 1 {:.3} m, × 1.1 {:.3} m",
        v(&mild),
        v(&base),
        v(&harsh)
    );
    assert!(v(&mild) <= v(&base) + COARSE_RES && v(&base) <= v(&harsh) + COARSE_RES);
    assert!(v(&harsh) > v(&mild));
    // Only a design winter scales.
    let series = hibernal::physics::climate::Climate::Sinusoid {
        mean_c: 0.0,
        amplitude_k: 10.0,
        coldest_day_of_year: 30,
        snow: None,
    };
    let job = EdgeLeastSearch::new(
        &shallow(None),
        &series,
        EdgeQuantity::WingWidth,
        0.0,
        3.0,
        RES,
        "edge",
    )
    .unwrap();
    assert!(matches!(
        job.under_scaled_winter(1.1),
        Err(EdgeLeastError::Input(e)) if e.0[0].field == "edge.climate"
    ));
}
