//! Every solver that can pose a closed-form case, against it: the cases and the solvers'
//! posings are in `tests/common/closed_form.rs`, defined once; each test here takes one
//! case to each solver that can pose it, prints what each measured and holds each to a
//! tolerance argued for that solver and grid.
//!
//! | case | column | plane | edge far column | shelter wall | steady |
//! | --- | --- | --- | --- | --- | --- |
//! | Neumann, soil | 1 % | 1 % | 1.5 % | no phase change | — |
//! | Neumann, water to ice | 1 % | 1 % | — | no phase change | — |
//! | Stefan, one phase | 1 % | 1 % | — | no phase change | — |
//! | periodic wave | 1 %, 0.02 rad | 1 %, 0.02 rad | — | 1 %, 0.02 rad | — |
//! | stack, two films | no film at its base | no film at its base | — | — | 1e-12 |
//! | stack, held base | 1e-9 | 1e-9 | — | one layer only | 1e-12 |
//! | snow wall | 1e-9 | 1e-9 | — | 1e-9 | 1e-12 |
//!
//! The shelter's night model as a whole (a lumped interior air over its walls) has no
//! closed form among these; each of its zones is a shelter wall column, posed here.

#[path = "common/closed_form.rs"]
mod closed_form;
mod common;

use closed_form::*;
use common::*;

/// One row of a case's table: the error relative where the closed form is not zero,
/// absolute where it is, beside the tolerance it is held to.
fn row(case: &str, solver: Posed, what: &str, got: f64, want: f64, tol: f64) {
    let err = if want == 0.0 {
        (got - want).abs()
    } else {
        ((got - want) / want).abs()
    };
    println!(
        "{case:<24} {:<14} {what:<22} got {got:>12.6} want {want:>12.6} error {err:.2e} (tolerance {tol:.1e})",
        format!("{solver:?}"),
    );
}

// ------------------------------------------------------------------ freezing half-space

/// Column: 1 cm cells and hourly steps put the front within 1 % of the closed form (the
/// front crosses about a cell a step; the error of the enthalpy scheme's front is then a
/// fraction of a cell, measured 0.2 %); plane: the same cells and steps, so the same
/// 1 %, and its three columns of unequal width agree within 2e-4 m (a hundredth of a cell:
/// no lateral flow under lateral uniformity).
fn freezing_on_column_and_plane(case: &Freezing) {
    let (col, per_step) = column_fronts(case, 0.01, 3600.0);
    let (pla, spread) = plane_fronts(case, 0.01, 3600.0);
    for (k, &day) in case.days.iter().enumerate() {
        let want = case.exact_front_m(day * DAY);
        let what = format!("front at day {day}");
        row(case.name, Posed::Column, &what, col[k], want, 0.01);
        row(case.name, Posed::Plane, &what, pla[k], want, 0.01);
        assert_rel(col[k], want, 0.01, &format!("{}: column {what}", case.name));
        assert_rel(pla[k], want, 0.01, &format!("{}: plane {what}", case.name));
    }
    // A front crossing about a cell per step costs a few passes (measured 4.8), not tens.
    assert!(per_step < 6.0, "iterations per step {per_step}");
    assert!(spread < 2e-4, "the plane's columns differ by {spread} m");
}

#[test]
fn neumann_soil_on_every_solver() {
    // The published figure itself (Lunardini 1981, after Jumikis 1966): ≈ 1.36 m after 60
    // days, given to three figures, so ±0.01 m.
    let case = neumann_soil();
    assert_abs(
        case.exact_front_m(60.0 * DAY),
        1.36,
        0.01,
        "the published figure",
    );
    freezing_on_column_and_plane(&case);
    // The edge section's far column, on the section's own grid: 1.5 %, as the grid under
    // the outside grows from 2.5 cm to 60 cm cells and the front at 1 m lies in cells of
    // about 20 cm.
    let far = edge_far_fronts(&case);
    for (k, &day) in case.days.iter().enumerate() {
        let want = case.exact_front_m(day * DAY);
        let what = format!("front at day {day}");
        row(case.name, Posed::EdgeFarColumn, &what, far[k], want, 0.015);
        assert_rel(far[k], want, 0.015, &format!("edge far column {what}"));
    }
}

#[test]
fn neumann_water_to_ice_on_every_solver() {
    freezing_on_column_and_plane(&neumann_water());
}

#[test]
fn one_phase_stefan_on_every_solver() {
    freezing_on_column_and_plane(&stefan_one_phase());
}

#[test]
fn the_column_front_converges_to_neumann_with_grid_and_time_step() {
    // Refining cells (4, 2, 1 cm) and steps (4, 2, 1 h) moves the front towards the Neumann
    // solution; the finest is within 1 %, and the error falls as the grid is refined.
    let case = Freezing {
        depth_m: 5.0,
        days: &[20.0],
        ..neumann_soil()
    };
    let want = case.exact_front_m(20.0 * DAY);
    let errs: Vec<f64> = [(0.04, 4.0), (0.02, 2.0), (0.01, 1.0)]
        .iter()
        .map(|&(cell, hours)| {
            let (x, _) = column_fronts(&case, cell, hours * 3600.0);
            ((x[0] - want) / want).abs()
        })
        .collect();
    println!("column front errors at 4, 2, 1 cm: {errs:?}");
    assert!(errs[2] < 0.01, "finest error {errs:?}");
    assert!(errs[2] < errs[0], "refinement helps: {errs:?}");
}

// ------------------------------------------------------------------------ periodic wave

#[test]
fn the_periodic_wave_on_every_solver() {
    // Amplitude within 1 % and lag within 0.02 rad at one and two damping depths, for
    // every solver on the same grid and steps (the column's tolerance before the checker
    // held the others to it). Error estimates, per damping depth the wave travels: of
    // order ωΔt/2 ≈ 2e-3 from backward Euler at 6-hour steps and (Δz/d)²/12 ≲ 5e-4 from the
    // 2 cm to 20 cm cells, so about 5e-3 at two damping depths; the start from rest, whose
    // slowest part there decays over (2d)²/a ≈ 1.3 years, has had three. Measured 0.56 % and
    // 0.008 rad at 2 d, all three solvers alike: the tolerances leave a margin of about 2.
    let w = annual_wave();
    let closed = w.closed();
    for (solver, readings) in [
        (Posed::Column, column_wave(&w)),
        (Posed::Plane, plane_wave(&w)),
        (Posed::ShelterWall, shelter_wall_wave(&w)),
    ] {
        assert_eq!(readings.len(), w.probes_d.len());
        for r in readings {
            let z = r.depth_m;
            let (a, lag) = (closed.amplitude_at_k(z), closed.phase_lag_rad(z));
            row(
                "periodic wave",
                solver,
                &format!("amplitude at {z:.2} m"),
                r.amplitude_k,
                a,
                0.01,
            );
            // The lag's tolerance, 0.02 rad, is shown relative to the lag.
            row(
                "periodic wave",
                solver,
                &format!("lag at {z:.2} m"),
                r.lag_rad,
                lag,
                0.02 / lag,
            );
            assert_rel(
                r.amplitude_k,
                a,
                0.01,
                &format!("{solver:?}: amplitude at {z:.2} m"),
            );
            assert_abs(
                r.lag_rad,
                lag,
                0.02,
                &format!("{solver:?}: lag at {z:.2} m"),
            );
        }
    }
}

// ----------------------------------------------------------------------- steady stack

/// Hold every solver that can pose `case` to the series formula: the steady solver to
/// round-off (1e-12 relative on the flux, 1e-10 K on the faces: it integrates each layer
/// exactly); the column, the plane and the shelter wall, stepped to steady state (the
/// start decayed to 1e-35, see `TO_STEADY`), to their residual tolerances: 1e-4 J/m³ (1D),
/// 1e-3 J/m³ (2D) per cell over a 10-day step is a flux error below 1e-9 W/m² per cell, so
/// 1e-9 relative on the flux and 1e-8 K on the faces. Returns how many solvers posed it.
fn stack_on_every_solver(case: &SeriesStack) -> usize {
    let exact = case.exact();
    let readings = [
        (Posed::Steady, Some(steady_stack(case)), 1e-12, 1e-10),
        (Posed::Column, column_stack(case), 1e-9, 1e-8),
        (Posed::Plane, plane_stack(case), 1e-9, 1e-8),
        (Posed::ShelterWall, shelter_wall_stack(case), 1e-9, 1e-8),
    ];
    let mut posed = 0;
    for (solver, reading, flux_tol, face_tol) in readings {
        let Some(r) = reading else {
            println!("{:<24} {solver:?}: cannot pose it", case.name);
            continue;
        };
        posed += 1;
        row(
            case.name,
            solver,
            "flux",
            r.flux_w_m2,
            exact.flux_w_m2,
            flux_tol,
        );
        assert_rel(
            r.flux_w_m2,
            exact.flux_w_m2,
            flux_tol,
            &format!("{}: {solver:?} flux", case.name),
        );
        assert_eq!(r.faces_c.len(), exact.faces_c.len());
        for (i, (got, want)) in r.faces_c.iter().zip(&exact.faces_c).enumerate() {
            row(
                case.name,
                solver,
                &format!("face {i}"),
                *got,
                *want,
                face_tol,
            );
            assert_abs(
                *got,
                *want,
                face_tol,
                &format!("{}: {solver:?} face {i}", case.name),
            );
        }
    }
    posed
}

#[test]
fn three_layers_with_two_films_on_every_solver() {
    let case = three_layers_two_films();
    assert_eq!(
        stack_on_every_solver(&case),
        1,
        "only the steady solver has a film below"
    );
    // The totals the steady solver reports, against the same series formula.
    let r = hibernal::physics::steady::solve(&case.stack()).unwrap();
    assert_rel(r.r_total_m2k_w, case.r_total(), 1e-12, "R air to air");
    assert_rel(r.u_w_m2k, 1.0 / case.r_total(), 1e-12, "U");
    assert!(r.zero_planes.is_empty());
}

#[test]
fn three_layers_over_a_held_base_on_every_solver() {
    assert_eq!(stack_on_every_solver(&three_layers_held_base()), 3);
}

#[test]
fn a_snow_wall_on_every_solver() {
    assert_eq!(stack_on_every_solver(&snow_wall()), 4);
}
