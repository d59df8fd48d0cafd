//! The transient solver against closed forms and conservation. Each check names its source.

mod common;
use common::*;

use hibernal::materials::{Branch, ConductivityLaw, Family, Material};
use hibernal::stack::{Boundary, Layer, Stack};
use hibernal::steady;
use hibernal::transient::grid::GridSpec;
use hibernal::transient::phase::UnfrozenWater;
use hibernal::transient::{cells_for, BottomCondition, Solver, TopCondition};
use std::f64::consts::PI;

const DAY: f64 = 86_400.0;
const YEAR: f64 = 365.0 * DAY;

fn material(k_f: f64, k_u: f64, c_f: f64, c_u: f64, latent: f64) -> Material {
    Material {
        family: Family::Custom,
        label: "test".into(),
        conductivity: ConductivityLaw {
            frozen: Branch::Constant(k_f),
            unfrozen: Branch::Constant(k_u),
        },
        freezes: latent > 0.0,
        density_kg_m3: 1800.0,
        c_frozen_j_per_m3_k: c_f,
        c_unfrozen_j_per_m3_k: c_u,
        latent_j_per_m3: latent,
        valid_temperature_c: (-100.0, 100.0),
    }
}

fn column(layers: &[(f64, Material)], grid: GridSpec, initial_c: f64) -> Solver {
    let d: Vec<f64> = layers.iter().map(|l| l.0).collect();
    let m: Vec<Material> = layers.iter().map(|l| l.1.clone()).collect();
    Solver::new(cells_for(&d, &m, &grid, &[]), initial_c)
}

#[test]
fn grid_puts_layer_interfaces_on_faces_and_grows_with_depth() {
    let m = material(1.0, 1.0, 2e6, 2e6, 0.0);
    let s = column(
        &[(0.37, m.clone()), (0.05, m.clone()), (4.0, m)],
        GridSpec {
            surface_cell_m: 0.01,
            growth_ratio: 1.08,
            max_cell_m: 0.25,
        },
        0.0,
    );
    let faces: Vec<f64> = s.cells.iter().map(|c| c.top_m).collect();
    for z in [0.37, 0.42] {
        assert!(faces.iter().any(|f| (f - z).abs() < 1e-12), "face at {z}");
    }
    assert!(s.cells[0].dz_m < 0.011);
    assert!(s.cells.last().unwrap().dz_m > 0.15 && s.cells.last().unwrap().dz_m <= 0.25);
    assert_abs(s.depth_m(), 4.42, 1e-12, "total depth");
}

#[test]
fn a_year_of_freezing_and_thawing_conserves_energy() {
    // Energy balance: Σ Δz (H − H₀) = ∫ (q_top + q_bottom) dt, to 1e-9 of the energy that
    // crossed the faces (conservation by construction of the finite-volume scheme).
    let soil = material(1.8, 1.4, 2.0e6, 2.8e6, 1.0e8);
    let mut s = column(
        &[(0.05, material(0.03, 0.03, 5e4, 5e4, 0.0)), (6.0, soil)],
        GridSpec {
            surface_cell_m: 0.01,
            growth_ratio: 1.1,
            max_cell_m: 0.3,
        },
        4.0,
    );
    let dt = 3600.0;
    let mut throughput = 0.0;
    let bottom = BottomCondition::Flux { upward_w_m2: 0.06 };
    while s.time_s < YEAR - 1.0 {
        let t = s.time_s + dt;
        let air = 2.0 - 18.0 * (2.0 * PI * t / YEAR).cos();
        let top = TopCondition::Air {
            air_c: air,
            film_w_m2k: 15.0,
            extra_resistance_m2k_w: 0.0,
        };
        s.step(dt, &top, &bottom).unwrap();
        throughput += (s.last_top_flux_w_m2.abs() + s.last_bottom_flux_w_m2.abs()) * dt;
    }
    let rel = s.energy_imbalance_j_m2().abs() / throughput;
    assert!(rel < 1e-9, "relative imbalance {rel:e}");
    let per_step = s.work.iterations as f64 / s.work.steps as f64;
    assert!(per_step < 6.0, "iterations per step {per_step}");
}

#[test]
fn periodic_surface_temperature_damps_and_lags_as_the_closed_form() {
    // Semi-infinite solid with T(0, t) = A sin ωt: amplitude A e^{−z/d}, lag z/d radians,
    // d = √(2a/ω) (Carslaw & Jaeger 1959 §2.6). No phase change. 1 % on amplitude.
    let (k, c) = (1.5, 2.0e6);
    let a = k / c;
    let omega = 2.0 * PI / YEAR;
    let d = (2.0 * a / omega).sqrt();
    let amp = 10.0;
    let mut s = column(
        &[(12.0 * d, material(k, k, c, c, 0.0))],
        GridSpec {
            surface_cell_m: 0.02,
            growth_ratio: 1.02,
            max_cell_m: 0.2,
        },
        0.0,
    );
    let dt = 6.0 * 3600.0;
    let bottom = BottomCondition::Flux { upward_w_m2: 0.0 };
    let probe: Vec<usize> = [1.0, 2.0]
        .iter()
        .map(|m| {
            s.cells
                .iter()
                .position(|cell| cell.top_m + cell.dz_m > m * d)
                .unwrap()
        })
        .collect();
    let mut hist: Vec<Vec<(f64, f64)>> = vec![Vec::new(); probe.len()];
    while s.time_s < 4.0 * YEAR - 1.0 {
        let t = s.time_s + dt;
        s.step(
            dt,
            &TopCondition::Surface {
                surface_c: amp * (omega * t).sin(),
            },
            &bottom,
        )
        .unwrap();
        if s.time_s > 3.0 * YEAR {
            for (j, &i) in probe.iter().enumerate() {
                hist[j].push((s.time_s, s.temperature[i]));
            }
        }
    }
    for (j, &i) in probe.iter().enumerate() {
        let z = s.cells[i].center_m();
        // Fit A_z sin(ωt − φ) by projection over the last whole year.
        let (mut ss, mut cc) = (0.0, 0.0);
        for &(t, v) in &hist[j] {
            ss += v * (omega * t).sin();
            cc += v * (omega * t).cos();
        }
        let nn = hist[j].len() as f64;
        let (ss, cc) = (2.0 * ss / nn, 2.0 * cc / nn);
        let a_z = (ss * ss + cc * cc).sqrt();
        let lag = (-cc).atan2(ss);
        assert_rel(
            a_z,
            amp * (-z / d).exp(),
            0.01,
            &format!("amplitude at {z:.2} m"),
        );
        assert_abs(lag, z / d, 0.02, &format!("lag at {z:.2} m"));
    }
}

#[test]
fn held_conditions_lead_to_the_steady_solution() {
    // The exact steady solver (Kirchhoff transform) is the long-time limit of the transient
    // one under held conditions: the 0 °C plane must agree within a cell.
    let soil = hibernal::materials::MaterialSpec::Soil(hibernal::materials::SoilInput {
        texture: hibernal::materials::Texture::Silt,
        model: hibernal::materials::SoilModel::Kersten1949,
        dry_density_kg_m3: 1600.0,
        water_content_pct: 20.0,
        quartz_fraction: 0.3,
    });
    let stack = Stack {
        layers: vec![Layer {
            name: String::new(),
            thickness_m: 3.0,
            material: soil,
        }],
        top: Boundary::Surface {
            temperature_c: -8.0,
        },
        bottom: Boundary::Surface { temperature_c: 3.0 },
    };
    let exact = steady::solve(&stack).unwrap();
    let x_exact = exact.zero_planes[0].depth_m;
    let mat = exact.stack.materials[0].clone();
    let mut s = column(&[(3.0, mat)], GridSpec::uniform(0.02), 3.0);
    let top = TopCondition::Surface { surface_c: -8.0 };
    let bottom = BottomCondition::Temperature { temperature_c: 3.0 };
    for _ in 0..(40 * 365) {
        s.step(DAY, &top, &bottom).unwrap();
    }
    let x = s.fronts().frost_depth_m;
    assert_abs(x, x_exact, 0.02, "frost depth vs steady 0 °C plane");
    // Flux through the top face equals the steady flux.
    assert_rel(
        -s.last_top_flux_w_m2,
        -exact.heat_flux_w_per_m2,
        0.01,
        "flux",
    );
}

#[test]
fn freezing_over_a_range_spreads_the_front_and_still_conserves_energy() {
    // Anderson & Tice 1972 form w_u = α θ^β (from memory; α = 0.08, β = −0.5 are invented
    // test values for a silty soil holding w = 0.25).
    let curve = UnfrozenWater {
        alpha: 0.08,
        beta: -0.5,
        total: 0.25,
    };
    let soil = material(1.9, 1.3, 2.0e6, 2.9e6, 1.3e8);
    let cells = cells_for(&[4.0], &[soil], &GridSpec::uniform(0.02), &[Some(curve)]);
    let mut s = Solver::new(cells, 1.0);
    let top = TopCondition::Surface { surface_c: -12.0 };
    let bottom = BottomCondition::Temperature { temperature_c: 1.0 };
    let mut throughput = 0.0;
    for _ in 0..(60 * 24) {
        s.step(3600.0, &top, &bottom).unwrap();
        throughput += (s.last_top_flux_w_m2.abs() + s.last_bottom_flux_w_m2.abs()) * 3600.0;
    }
    let partly = (0..s.cells.len())
        .filter(|&i| {
            let f = s.frozen_fraction(i);
            f > 0.05 && f < 0.95
        })
        .count();
    assert!(
        partly >= 5,
        "a zone of partly frozen cells, not a sharp front: {partly}"
    );
    // Near the surface at −12 °C the liquid share is α θ^β / w = 0.08·12^−0.5/0.25 = 0.092.
    assert_abs(
        s.frozen_fraction(0),
        1.0 - 0.08 * 12f64.powf(-0.5) / 0.25,
        0.02,
        "top cell",
    );
    let rel = s.energy_imbalance_j_m2().abs() / throughput;
    assert!(rel < 1e-9, "relative imbalance {rel:e}");
}

use hibernal::analytic::{self, NeumannProblem};

/// Freeze a column from a held surface and return the front depth after `days`.
fn freeze_from_surface(
    p: &NeumannProblem,
    depth: f64,
    cell: f64,
    dt: f64,
    days: f64,
) -> (f64, f64) {
    let m = material(
        p.k_frozen,
        p.k_unfrozen,
        p.c_frozen_j_m3k,
        p.c_unfrozen_j_m3k,
        p.latent_j_m3,
    );
    let mut s = column(&[(depth, m)], GridSpec::uniform(cell), p.initial_c);
    let top = TopCondition::Surface {
        surface_c: p.surface_c,
    };
    let bottom = BottomCondition::Temperature {
        temperature_c: p.initial_c,
    };
    let steps = (days * DAY / dt).round() as usize;
    for _ in 0..steps {
        s.step(dt, &top, &bottom).unwrap();
    }
    (
        s.fronts().frost_depth_m,
        s.work.iterations as f64 / s.work.steps as f64,
    )
}

#[test]
fn soil_front_matches_the_neumann_solution_within_one_percent() {
    // Neumann two-phase solution (Carslaw & Jaeger 1959 §11.2), published soil example: front
    // about 1.36 m after 60 days. 1 cm cells, hourly steps: within 1 % of exact.
    let p = lunardini_soil();
    let exact = p.solve().unwrap();
    let (x, per_step) = freeze_from_surface(&p, 8.0, 0.01, 3600.0, 60.0);
    let x_exact = exact.front_depth_m(60.0 * DAY);
    assert_rel(x, x_exact, 0.01, "front at 60 days");
    assert_abs(x_exact, 1.36, 0.01, "the published figure");
    // A front crossing about a cell per step costs a few passes (measured 4.8), not tens.
    assert!(per_step < 6.0, "iterations per step {per_step}");
}

#[test]
fn water_freezing_to_ice_matches_the_neumann_solution() {
    // Water at +4 °C under a −10 °C surface: ice k 2.2, water k 0.556 (model reference §2),
    // C = ρc of ice and water, L = ρ_ice × 333.4 kJ/kg. Neumann solution, 1 % at 1 cm cells.
    let p = NeumannProblem {
        surface_c: -10.0,
        initial_c: 4.0,
        freezing_c: 0.0,
        k_frozen: 2.2,
        k_unfrozen: 0.556,
        c_frozen_j_m3k: 916.7 * 2097.0,
        c_unfrozen_j_m3k: 999.8 * 4219.0,
        latent_j_m3: 916.7 * 333.4e3,
    };
    let exact = p.solve().unwrap();
    let (x, _) = freeze_from_surface(&p, 3.0, 0.01, 3600.0, 30.0);
    assert_rel(
        x,
        exact.front_depth_m(30.0 * DAY),
        0.01,
        "ice thickness at 30 days",
    );
}

#[test]
fn one_phase_stefan_problem_matches_its_solution() {
    // One-phase Stefan problem: ground initially at the freezing point; X = 2λ√(a_f t) with
    // λ e^{λ²} erf λ = Ste/√π (Crank, Free and Moving Boundary Problems §1.3).
    let mut p = lunardini_soil();
    p.initial_c = 0.0;
    let lambda = analytic::one_phase_lambda(p.c_frozen_j_m3k * 10.0 / p.latent_j_m3).unwrap();
    let a = p.k_frozen / p.c_frozen_j_m3k;
    let (x, _) = freeze_from_surface(&p, 4.0, 0.01, 3600.0, 60.0);
    assert_rel(
        x,
        2.0 * lambda * (a * 60.0 * DAY).sqrt(),
        0.01,
        "one-phase front",
    );
}

#[test]
fn the_front_converges_with_grid_and_time_step() {
    // Refining cells (4, 2, 1 cm) and steps (4, 2, 1 h) moves the front towards the Neumann
    // solution; the finest is within 1 %, and the error falls as the grid is refined.
    let p = lunardini_soil();
    let x_exact = p.solve().unwrap().front_depth_m(20.0 * DAY);
    let errs: Vec<f64> = [(0.04, 4.0), (0.02, 2.0), (0.01, 1.0)]
        .iter()
        .map(|&(cell, hours)| {
            let (x, _) = freeze_from_surface(&p, 5.0, cell, hours * 3600.0, 20.0);
            ((x - x_exact) / x_exact).abs()
        })
        .collect();
    assert!(errs[2] < 0.01, "finest error {:?}", errs);
    assert!(errs[2] < errs[0], "refinement helps: {:?}", errs);
}

#[test]
fn lake_ice_grows_within_the_published_range_of_stefan_coefficients() {
    // Lake ice h = α √(freezing degree-days) (Stefan's law; Michel 1971 via Ashton, from
    // memory): α ≈ 2.7 cm/(°C·d)^½ for a windy lake with no snow, and no more than the ideal
    // Stefan coefficient √(2k/ρL) ≈ 3.5. A lake at 0 °C under air at −15 °C through a
    // windy film (h = 30 W/m²K) for 60 days (900 °C·days).
    let ice_water = Material {
        conductivity: ConductivityLaw {
            frozen: Branch::IceIh,
            unfrozen: Branch::Constant(0.556),
        },
        ..material(2.2, 0.556, 916.7 * 2097.0, 999.8 * 4219.0, 916.7 * 333.4e3)
    };
    let mut s = column(&[(3.0, ice_water)], GridSpec::uniform(0.005), 0.0);
    let top = TopCondition::Air {
        air_c: -15.0,
        film_w_m2k: 30.0,
        extra_resistance_m2k_w: 0.0,
    };
    let bottom = BottomCondition::Temperature { temperature_c: 0.0 };
    for _ in 0..(60 * 24) {
        s.step(3600.0, &top, &bottom).unwrap();
    }
    let h_cm = 100.0 * s.fronts().frost_depth_m;
    let alpha = h_cm / 900f64.sqrt();
    assert!(
        alpha > 2.2 && alpha < 3.53,
        "Stefan coefficient {alpha:.2} cm/(°C·d)^½"
    );
}

#[test]
fn a_design_winter_drives_a_run_whose_air_freezing_index_is_the_one_asked_for() {
    // The design winter is built so its freezing season integrates to the index asked for
    // (climate module); a run under it must measure the same air freezing index (range of the
    // cumulative degree-day curve, TM 5-852-6) to the resolution of hourly steps.
    use hibernal::climate::Climate;
    use hibernal::transient::run::{run, Initial, RunSpec, TopModel};
    let climate = Climate::DesignWinter {
        freezing_index_c_days: 1200.0,
        season_days: 150.0,
        mean_annual_c: 1.0,
    };
    let soil = material(1.8, 1.4, 2.0e6, 2.8e6, 1.0e8);
    let spec = RunSpec {
        thicknesses_m: vec![6.0],
        materials: vec![soil],
        curves: vec![None],
        grid: GridSpec {
            surface_cell_m: 0.01,
            growth_ratio: 1.05,
            max_cell_m: 0.25,
        },
        top: TopModel::NFactor {
            freezing: 1.0,
            thawing: 1.0,
        },
        bottom: BottomCondition::Flux { upward_w_m2: 0.0 },
        initial: Initial::Uniform(3.0),
        step_s: 3600.0,
        duration_s: YEAR,
        profile_every_s: DAY,
    };
    let r = run(&spec, &climate).unwrap();
    assert_rel(
        r.air_freezing_index_c_days,
        1200.0,
        2e-3,
        "air freezing index",
    );
    // The surface is held at n × air with n = 1: the two indices agree.
    assert_rel(
        r.surface_freezing_index_c_days,
        1200.0,
        5e-3,
        "surface freezing index",
    );
    // Stefan's law with the frozen properties is an upper bound on the frost depth
    // (it ignores the sensible heat and the warm ground below).
    let stefan = hibernal::analytic::stefan_depth_m(1.8, 1.0e8, 1200.0 * DAY);
    assert!(
        r.max_frost_depth_m > 0.3 * stefan && r.max_frost_depth_m < stefan,
        "frost {} m, Stefan {} m",
        r.max_frost_depth_m,
        stefan
    );
    assert!((r.energy_imbalance_j_m2 / r.energy_throughput_j_m2).abs() < 1e-9);
}

#[test]
fn a_run_advanced_in_slices_gives_the_same_results_as_one_call() {
    // The page advances a run a slice at a time; slicing must not change a single number
    // (the same steps are taken in the same order). Spin-up is sliced too.
    use hibernal::climate::Climate;
    use hibernal::transient::run::{run, Initial, Run, RunSpec, TopModel};
    let climate = Climate::Sinusoid {
        mean_c: 1.0,
        amplitude_k: 14.0,
        coldest_day_of_year: 20,
    };
    let soil = material(1.8, 1.4, 2.0e6, 2.8e6, 1.0e8);
    let spec = RunSpec {
        thicknesses_m: vec![4.0],
        materials: vec![soil],
        curves: vec![None],
        grid: GridSpec {
            surface_cell_m: 0.02,
            growth_ratio: 1.1,
            max_cell_m: 0.3,
        },
        top: TopModel::NFactor {
            freezing: 0.8,
            thawing: 1.2,
        },
        bottom: BottomCondition::Flux { upward_w_m2: 0.05 },
        initial: Initial::SpinUp {
            start_c: 2.0,
            max_years: 3,
        },
        step_s: 6.0 * 3600.0,
        duration_s: YEAR,
        profile_every_s: DAY,
    };
    let whole = run(&spec, &climate).unwrap();
    let mut sliced = Run::new(&spec).unwrap();
    let mut calls = 0;
    let mut last = 0.0;
    loop {
        let p = sliced.advance(&climate, 97).unwrap();
        calls += 1;
        assert!(p.fraction >= last, "progress never goes back");
        last = p.fraction;
        if p.finished {
            break;
        }
    }
    assert!(calls > 10, "the run was sliced ({calls} calls)");
    assert_eq!(last, 1.0);
    let sliced = sliced.finish();
    assert_eq!(sliced.spin_up_years, whole.spin_up_years);
    assert_eq!(sliced.samples, whole.samples);
    assert_eq!(sliced.profiles, whole.profiles);
    assert_eq!(sliced.max_frost_depth_m, whole.max_frost_depth_m);
    assert_eq!(sliced.min_c, whole.min_c);
}
