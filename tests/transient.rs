//! The transient solver against the steady solver, published ranges and conservation. Each
//! check names its source. Its checks against the closed forms (Neumann, Stefan, the
//! periodic wave) are in tests/closed_form.rs, beside the other solvers'.

mod common;
use common::*;

use hibernal::physics::materials::{Branch, ConductivityLaw, Material};
use hibernal::physics::stack::{Boundary, Stack};
use hibernal::physics::steady;
use hibernal::physics::transient::grid::GridSpec;
use hibernal::physics::transient::phase::UnfrozenWater;
use hibernal::physics::transient::{cells_for, BottomCondition, Solver, TopCondition};
use std::f64::consts::PI;

const DAY: f64 = 86_400.0;
const YEAR: f64 = 365.0 * DAY;

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
fn held_conditions_lead_to_the_steady_solution() {
    // The exact steady solver (Kirchhoff transform) is the long-time limit of the transient
    // one under held conditions: the 0 °C plane must agree within a cell.
    let stack = Stack {
        layers: vec![layer(3.0, silt_spec())],
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
    assert_rel(-s.last_top_flux_w_m2, -exact.heat_flux_w_m2, 0.01, "flux");
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

use hibernal::physics::analytic;

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
    use hibernal::physics::climate::Climate;
    use hibernal::physics::transient::run::run;
    use hibernal::physics::transient::setup::{Initial, RunSpec, TopModel};
    let climate = Climate::DesignWinter {
        freezing_index_c_days: 1200.0,
        season_days: 150.0,
        mean_annual_c: 1.0,
        snow: None,
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
    let stefan = hibernal::physics::analytic::stefan_depth_m(1.8, 1.0e8, 1200.0 * DAY);
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
    use hibernal::physics::climate::Climate;
    use hibernal::physics::transient::run::{run, Run};
    use hibernal::physics::transient::setup::{Initial, RunSpec, TopModel};
    let climate = Climate::Sinusoid {
        mean_c: 1.0,
        amplitude_k: 14.0,
        coldest_day_of_year: 20,
        snow: None,
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
            from_periodic: None,
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

// ------------------------------------------------------------------------- snow cells

use hibernal::physics::materials::{MaterialSpec, SnowRegression};
use hibernal::physics::transient::setup::{Forcing, Initial, RunSpec, TopModel};
use hibernal::physics::transient::SnowLayer;

fn snow_layer(depth_m: f64, density: f64) -> SnowLayer {
    SnowLayer {
        depth_m,
        density_kg_m3: density,
        conductivity_w_m_k: SnowRegression::Sturm1997Quadratic.conductivity_w_m_k(density),
    }
}

#[test]
fn snow_cells_under_held_air_carry_the_steady_series_flux() {
    // Fourier's law through layers in series: the long-time limit of snow cells over soil
    // under held air is the steady solution of the same stack, snow as a layer of its own
    // with k from the same regression (the steady solver's Kirchhoff march, itself checked
    // against the series formula 1/h + d/k + Σ R in tests/closed_form.rs). 0.3 m of snow at
    // 250 kg/m³ (Sturm et al. 1997) over 3 m of silt that freezes; air −15 °C through
    // h = 20 W/m²K; bottom held at +3 °C. Flux within 1e-3 relative.
    let snow_spec = MaterialSpec::Snow {
        density_kg_m3: 250.0,
        regression: SnowRegression::Sturm1997Quadratic,
    };
    let stack = Stack {
        layers: vec![layer(0.3, snow_spec), layer(3.0, silt_spec())],
        top: Boundary::Air {
            temperature_c: -15.0,
            film_w_m2k: 20.0,
        },
        bottom: Boundary::Surface { temperature_c: 3.0 },
    };
    let exact = steady::solve(&stack).unwrap();
    let mut s = column(&[(3.0, silt())], GridSpec::uniform(0.02), 3.0);
    let top = TopCondition::Air {
        air_c: -15.0,
        film_w_m2k: 20.0,
        extra_resistance_m2k_w: 0.0,
    };
    let bottom = BottomCondition::Temperature { temperature_c: 3.0 };
    s.set_snow(Some(snow_layer(0.3, 250.0)), -15.0);
    assert_eq!(s.snow_cells, 8, "0.3 m of snow in the most cells allowed");
    for _ in 0..(30 * 365) {
        s.step(DAY, &top, &bottom).unwrap();
    }
    let q = exact.heat_flux_w_m2;
    println!(
        "held air under snow: flux {:.6} W/m² vs steady {q:.6} ({:.1e} relative)",
        s.last_top_flux_w_m2,
        ((s.last_top_flux_w_m2 - q) / q).abs()
    );
    assert_rel(
        s.last_top_flux_w_m2,
        q,
        1e-3,
        "flux through the snow surface",
    );
    assert_rel(s.last_ground_flux_w_m2, q, 1e-3, "flux into the ground");
    // The snow/ground interface and the snow surface.
    assert_abs(
        s.last_ground_surface_c,
        exact.layers[1].top_c,
        1e-3 * 18.0,
        "snow/ground interface temperature",
    );
    // The series formula for the snow layer alone: ΔT across it = q d / k.
    let k_snow = SnowRegression::Sturm1997Quadratic.conductivity_w_m_k(250.0);
    let snow_top = -15.0 - q / 20.0;
    assert_rel(
        s.last_ground_surface_c - snow_top,
        -q * 0.3 / k_snow,
        1e-3,
        "temperature drop across the snow, q d / k",
    );
    // Frost depth is measured from the ground surface: the steady 0 °C plane.
    assert_abs(
        s.fronts().frost_depth_m,
        exact.zero_planes[0].depth_m - 0.3,
        0.02,
        "frost depth below the ground surface",
    );
}

#[test]
fn a_snowpack_at_0c_under_warm_air_melts_by_the_film_flux_and_shields_the_ground() {
    // Surface energy balance of a snowpack at 0 °C (its surface cannot warm above 0 °C):
    // all the film flux h (T_air − 0) goes into melting, at the rate h T_air / (ρ L_f)
    // (Newton's law of cooling at the surface; L_f = 333.4 kJ/kg, IAPWS). 0.2 m of snow at
    // 300 kg/m³ and 0 °C over ground frozen at 0 °C (so no heat passes between them), air
    // +4 °C through h = 10 W/m²K, constant depth. While the top cell holds ice, the flux is
    // h T_air to round-off and the melted mass grows as h T_air t / L_f; the snow never
    // warms above 0 °C while it holds ice, and the ground under it never above 0 °C.
    let (h, air, rho, depth) = (10.0, 4.0, 300.0, 0.2);
    let mut s = column(&[(2.0, silt())], GridSpec::uniform(0.02), -1.0);
    // Ground frozen at 0 °C: enthalpy 0 (fully frozen) at 0 °C.
    for i in s.ground() {
        s.enthalpy[i] = 0.0;
        s.temperature[i] = 0.0;
    }
    s.set_snow(Some(snow_layer(depth, rho)), air);
    s.restart_ledger();
    let ns = s.snow_cells;
    assert!(
        s.temperature[..ns].iter().all(|&t| t == 0.0),
        "new snow at min(air, 0) = 0 °C"
    );
    assert!(s.enthalpy[..ns].iter().all(|&e| e == 0.0), "and frozen");
    let top = TopCondition::Air {
        air_c: air,
        film_w_m2k: h,
        extra_resistance_m2k_w: 0.0,
    };
    let bottom = BottomCondition::Flux { upward_w_m2: 0.0 };
    let latent = rho * 333.4e3;
    let dt = 3600.0;
    let mut t = 0.0;
    let mut melt_checked = 0;
    for _ in 0..(6 * 24) {
        s.step(dt, &top, &bottom).unwrap();
        t += dt;
        let melted: f64 = (0..ns)
            .map(|i| {
                s.cells[i]
                    .phase
                    .liquid_share(s.enthalpy[i], s.temperature[i])
                    * rho
                    * s.cells[i].dz_m
            })
            .sum();
        if s.enthalpy[0] < 0.9 * latent {
            assert_rel(
                s.last_top_flux_w_m2,
                h * air,
                1e-12,
                "film flux into melting snow",
            );
            assert_rel(
                melted,
                h * air * t / 333.4e3,
                1e-9,
                "melted mass h T_air t / L_f",
            );
            melt_checked += 1;
        }
        for i in 0..ns {
            if s.enthalpy[i] < latent {
                assert!(
                    s.temperature[i] <= 0.0,
                    "snow holding ice stays at or below 0 °C"
                );
            }
        }
        let snow_left = s.enthalpy[ns - 1] < latent;
        let ground_max = s
            .ground_temperatures()
            .iter()
            .cloned()
            .fold(f64::MIN, f64::max);
        if snow_left {
            assert!(ground_max <= 1e-12, "ground under snow at {ground_max} °C");
        }
    }
    assert!(
        melt_checked >= 12,
        "the top cell melted for {melt_checked} h"
    );
    let rel = s.energy_imbalance_j_m2().abs() / (h * air * t);
    assert!(rel < 1e-12, "energy imbalance {rel:e}");
}

/// Snow that is constant in depth and density while the air freezes.
struct SnowWhileFreezing {
    air: hibernal::physics::transient::setup::SinusoidalYear,
    depth_m: f64,
    density: f64,
}

impl Forcing for SnowWhileFreezing {
    fn air_c(&self, t_s: f64) -> f64 {
        self.air.air_c(t_s)
    }
    fn snow(&self, t_s: f64) -> Option<(f64, f64)> {
        (self.air.air_c(t_s) < 0.0).then_some((self.depth_m, self.density))
    }
}

#[test]
fn a_snowy_year_closes_its_energy_balance_with_the_snow_mass_term() {
    // Conservation of energy (finite volumes conserve by construction): over a year with a
    // snow season that builds, settles and melts away across the year end (days 300 → 110,
    // peak 0.4 m on day 45, 120 → 320 kg/m³), stored change = face fluxes + energy brought
    // and taken by snow mass, to 1e-9 of the energy that crossed; and without the snow term
    // it would not close (so the test can fail).
    use hibernal::physics::climate::{Climate, SnowSeason};
    let climate = Climate::Sinusoid {
        mean_c: 1.0,
        amplitude_k: 14.0,
        coldest_day_of_year: 30,
        snow: Some(SnowSeason {
            start_day: 300.0,
            peak_day: 45.0,
            end_day: 110.0,
            peak_depth_m: 0.4,
            fresh_density_kg_m3: 120.0,
            settled_density_kg_m3: 320.0,
        }),
    };
    let spec = RunSpec {
        thicknesses_m: vec![0.05, 6.0],
        materials: vec![material(1.2, 1.2, 2.0e6, 2.0e6, 0.0), silt()],
        curves: vec![
            None,
            Some(UnfrozenWater {
                alpha: 0.08,
                beta: -0.5,
                total: 0.2,
            }),
        ],
        grid: GridSpec {
            surface_cell_m: 0.01,
            growth_ratio: 1.05,
            max_cell_m: 0.25,
        },
        top: TopModel::AirFilm {
            film_w_m2k: 15.0,
            snow_regression: SnowRegression::Calonne2011,
        },
        bottom: BottomCondition::Flux { upward_w_m2: 0.06 },
        initial: Initial::Uniform(3.0),
        step_s: 3600.0,
        duration_s: YEAR,
        profile_every_s: DAY,
    };
    let r = hibernal::physics::transient::run::run(&spec, &climate).unwrap();
    assert!(
        r.max_snow_cells == 8,
        "the snow grew to {} cells",
        r.max_snow_cells
    );
    let rel = r.energy_imbalance_j_m2.abs() / r.energy_throughput_j_m2;
    assert!(rel < 1e-9, "relative imbalance {rel:e}");
    let without = (r.energy_imbalance_j_m2 + r.snow_exchange_j_m2).abs() / r.energy_throughput_j_m2;
    assert!(without > 1e-6, "the snow term matters: {without:e}");
    // Daily profiles: ground cells only, fixed length; snow cells beside them.
    assert!(r.profiles.iter().all(|p| p.1.len() == r.depths_m.len()));
    assert_eq!(r.snow_profiles.len(), r.profiles.len());
    let day = |d: usize| &r.snow_profiles[d];
    assert!(day(200).is_empty(), "no snow in summer");
    let midwinter = day(45);
    assert_eq!(midwinter.len(), 8);
    assert_abs(
        midwinter.last().unwrap()[0],
        0.4 * 15.0 / 16.0,
        1e-9,
        "top cell centre height",
    );
    assert!(
        midwinter.windows(2).all(|w| w[1][0] > w[0][0]),
        "from the ground up"
    );
    println!(
        "snowy year: imbalance {rel:e}, snow term {:.3e} J/m², iterations/step {:.2}",
        r.snow_exchange_j_m2,
        r.iterations as f64 / r.steps as f64
    );
}

#[test]
fn settling_keeps_the_temperature_profile_and_snowfall_books_its_energy() {
    // Conservation of mass and energy in the remap (a Lagrangian remap in mass coordinates):
    // snow that settles (0.3 m at 200 kg/m³ → 0.2 m at 300 kg/m³, same mass) keeps the
    // temperature of every parcel of mass and exchanges no energy; new snow at −8 °C adds
    // m · h_ice(−8 °C) with h_ice = ∫₀ᵀ c_ice dθ ≈ (2097.9 − 7.122·4) · (−8) J/kg
    // (the c_ice fit of materials::ice, exact for a linear c over the 2 K bands).
    let mut s = column(&[(2.0, silt())], GridSpec::uniform(0.05), -2.0);
    s.set_snow(Some(snow_layer(0.3, 200.0)), -10.0);
    let n = s.snow_cells;
    assert_eq!(n, 8);
    // A profile: cold at the top, warmer at the ground.
    for i in 0..n {
        let t = -10.0 + i as f64;
        s.enthalpy[i] = s.cells[i].phase.enthalpy(t);
        s.temperature[i] = t;
    }
    s.restart_ledger();
    let before = s.snow_profile();
    let e = s.set_snow(Some(snow_layer(0.3 * 200.0 / 300.0, 300.0)), -10.0);
    assert!(e.abs() < 1e-9, "settling exchanges no energy: {e}");
    let after = s.snow_profile();
    assert_eq!(after.len(), before.len());
    for (a, b) in after.iter().zip(&before) {
        assert_abs(a[1], b[1], 1e-9, "temperature of a parcel after settling");
        assert_rel(
            a[0],
            b[0] * 200.0 / 300.0,
            1e-12,
            "height scales with depth",
        );
    }
    // Snowfall: 0.05 m at 300 kg/m³ of fresh snow at −8 °C on top.
    let e = s.set_snow(Some(snow_layer(0.3 * 200.0 / 300.0 + 0.05, 300.0)), -8.0);
    let h_ice = (2097.87 - 7.122 * 4.0) * -8.0;
    assert_rel(e, 0.05 * 300.0 * h_ice, 1e-5, "energy of the new snow");
    assert!(
        s.energy_imbalance_j_m2().abs() < 1e-9 * e.abs(),
        "ledger closes"
    );
    // Melt-off of everything: the snow's energy leaves with it.
    let stored_snow: f64 = (0..s.snow_cells)
        .map(|i| s.enthalpy[i] * s.cells[i].dz_m)
        .sum();
    let e = s.set_snow(None, 0.0);
    assert_rel(
        e,
        -stored_snow,
        1e-12,
        "all the snow's energy leaves with it",
    );
    assert_eq!(s.snow_cells, 0);
    assert!(s.energy_imbalance_j_m2().abs() < 1e-9 * stored_snow.abs());
}

#[test]
fn frost_under_snow_is_shallower_than_bare_and_within_stefan_with_the_snow_resistance() {
    // Stefan's law with a surface resistance (model reference §4; analytic.rs): the frost
    // depth under a resistance R that stores no heat, with all heat removed taken as latent,
    // X = −kR + √((kR)² + 2kF/L), is an upper bound for ground starting at or above 0 °C (it
    // ignores the sensible heat of snow and ground and the warm ground below). A first
    // winter on silt at +2 °C: sinusoidal air (mean −2 °C, amplitude 18 K, coldest on day
    // 120 of the run, which starts in autumn); 0.3 m of snow at 250 kg/m³ whenever the air
    // freezes (so R = 1/h + d/k holds through the whole freezing season); film 20 W/m²K.
    use hibernal::physics::analytic::stefan_depth_with_resistance_m;
    use hibernal::physics::transient::setup::SinusoidalYear;
    let air = SinusoidalYear {
        mean_c: -2.0,
        amplitude_k: 18.0,
        coldest_day: 120.0,
    };
    let spec = RunSpec {
        thicknesses_m: vec![8.0],
        materials: vec![silt()],
        curves: vec![None],
        grid: GridSpec {
            surface_cell_m: 0.01,
            growth_ratio: 1.03,
            max_cell_m: 0.2,
        },
        top: TopModel::AirFilm {
            film_w_m2k: 20.0,
            snow_regression: SnowRegression::Sturm1997Quadratic,
        },
        bottom: BottomCondition::Flux { upward_w_m2: 0.05 },
        initial: Initial::Uniform(2.0),
        step_s: 3600.0,
        duration_s: YEAR,
        profile_every_s: DAY,
    };
    let snowy = SnowWhileFreezing {
        air,
        depth_m: 0.3,
        density: 250.0,
    };
    let under_snow = hibernal::physics::transient::run::run(&spec, &snowy).unwrap();
    let bare = hibernal::physics::transient::run::run(&spec, &air).unwrap();
    let m = silt();
    let (kf, l) = (m.conductivity.frozen.k(-1.0), m.latent_j_m3);
    let f = hibernal::physics::climate::sinusoid_freezing_index_c_days(-2.0, 18.0) * DAY;
    let r_snow = 0.3 / SnowRegression::Sturm1997Quadratic.conductivity_w_m_k(250.0);
    let bound_snow = stefan_depth_with_resistance_m(kf, l, f, 1.0 / 20.0 + r_snow);
    let bound_bare = stefan_depth_with_resistance_m(kf, l, f, 1.0 / 20.0);
    println!(
        "frost: under snow {:.3} m (Stefan with R {bound_snow:.3} m), bare {:.3} m (Stefan {bound_bare:.3} m)",
        under_snow.max_frost_depth_m, bare.max_frost_depth_m
    );
    assert!(
        under_snow.max_frost_depth_m > 0.2 * bound_snow,
        "the ground does freeze"
    );
    assert!(
        under_snow.max_frost_depth_m < 0.6 * bare.max_frost_depth_m,
        "snow insulates"
    );
    assert!(
        under_snow.max_frost_depth_m < bound_snow,
        "Stefan with R bounds it"
    );
    assert!(
        bare.max_frost_depth_m < bound_bare,
        "Stefan bounds the bare ground"
    );
    let rel = (under_snow.energy_imbalance_j_m2 / under_snow.energy_throughput_j_m2).abs();
    assert!(rel < 1e-9, "energy {rel:e}");
}

// -------------------------------------------------------------------- periodic start

use hibernal::physics::climate::{AnnualWave, Climate};
use hibernal::physics::transient::periodic::{n_factor_wave, PeriodicProfile};

fn inert_spec(top: TopModel, bottom: BottomCondition, initial: Initial) -> RunSpec {
    // k 1.2 W/m/K, C 2.0e6 J/m³K: a = 6e-7 m²/s, annual damping depth d = 2.46 m; 30 m is
    // 12 d, so the wave reaching the base is e^{−12} ≈ 6e-6 of the surface's.
    RunSpec {
        thicknesses_m: vec![30.0],
        materials: vec![material(1.2, 1.2, 2.0e6, 2.0e6, 0.0)],
        curves: vec![None],
        grid: GridSpec {
            surface_cell_m: 0.02,
            growth_ratio: 1.03,
            max_cell_m: 0.5,
        },
        top,
        bottom,
        initial,
        step_s: 3600.0,
        duration_s: YEAR,
        profile_every_s: DAY,
    }
}

const N11: TopModel = TopModel::NFactor {
    freezing: 1.0,
    thawing: 1.0,
};

#[test]
fn the_periodic_start_is_the_closed_form_temperature_wave() {
    // Carslaw & Jaeger 1959 §2.6 (analytic::PeriodicSurface): for one homogeneous layer and
    // the surface following the air (n = 1), the start profile is
    // T_m + A e^{−z/d} sin(ωt + φ − z/d) with −A cos(ω(t − t_c)) = A sin(ωt − ωt_c − π/2),
    // plus the steady gradient q/k of a geothermal flux q; to 1e-9 K at sample depths, and
    // the run's first profile is that function at the cell centres.
    let climate = Climate::Sinusoid {
        mean_c: 2.0,
        amplitude_k: 12.0,
        coldest_day_of_year: 40,
        snow: None,
    };
    let wave = climate.annual_wave();
    assert_abs(
        wave.coldest_s,
        39.5 * DAY,
        1e-6,
        "coldest at noon of day 40",
    );
    let omega = 2.0 * PI / YEAR;
    let closed = analytic::PeriodicSurface {
        mean_c: 2.0,
        amplitude_k: 12.0,
        period_s: YEAR,
        diffusivity_m2_s: 1.2 / 2.0e6,
        phase_rad: -omega * wave.coldest_s - PI / 2.0,
    };
    for q in [0.0, 0.06] {
        let spec = inert_spec(
            N11,
            BottomCondition::Flux { upward_w_m2: q },
            Initial::Periodic(wave),
        );
        let p = PeriodicProfile::new(&spec, &wave);
        for z in [0.0, 0.1, 0.5, 1.0, 2.46, 5.0, 12.0, 29.0] {
            assert_abs(
                p.temperature_c(z, 0.0),
                closed.temperature_c(z, 0.0) + q * z / 1.2,
                1e-9,
                &format!("start at {z} m, q = {q}"),
            );
        }
        let r = hibernal::physics::transient::run::run(
            &RunSpec {
                duration_s: DAY,
                ..spec.clone()
            },
            &climate,
        )
        .unwrap();
        for (z, t) in r.depths_m.iter().zip(&r.profiles[0].1) {
            assert_abs(
                *t,
                closed.temperature_c(*z, 0.0) + q * z / 1.2,
                1e-9,
                "first profile",
            );
        }
    }
}

#[test]
fn a_run_from_the_periodic_start_is_already_periodic() {
    // Periodicity of the conduction solution (Carslaw & Jaeger §2.6): started from the
    // periodic profile under the matching sinusoid, the column after one year is where it
    // began, up to the difference between the scheme's own periodic wave and the closed
    // form: backward Euler damps a wave by about ωΔt/2 = 3.6e-4 per unit amplitude at hourly
    // steps (the spatial error, (Δz/d)²/12 ≈ 6e-6, is smaller), so 0.1 % of the surface
    // amplitude (0.012 K) is three times that estimate. For the surface held at n × air
    // (n = 1) and through a film (whose complex transfer factor h/(h + k(1 + i)/d) the start
    // uses). A uniform start at the mean changes by several K.
    let climate = Climate::Sinusoid {
        mean_c: 2.0,
        amplitude_k: 12.0,
        coldest_day_of_year: 40,
        snow: None,
    };
    let wave = climate.annual_wave();
    let film = TopModel::AirFilm {
        film_w_m2k: 5.0,
        snow_regression: SnowRegression::Sturm1997Quadratic,
    };
    let change = |top: TopModel, bottom: BottomCondition, initial: Initial| {
        let r = hibernal::physics::transient::run::run(&inert_spec(top, bottom, initial), &climate)
            .unwrap();
        let (first, last) = (&r.profiles[0].1, &r.profiles.last().unwrap().1);
        assert_abs(r.profiles.last().unwrap().0, YEAR, 1.0, "a year later");
        first
            .iter()
            .zip(last)
            .map(|(a, b)| (a - b).abs())
            .fold(0.0, f64::max)
    };
    let geo = BottomCondition::Flux { upward_w_m2: 0.06 };
    for top in [N11, film] {
        let periodic = change(top, geo, Initial::Periodic(wave));
        let uniform = change(top, geo, Initial::Uniform(2.0));
        println!("{top:?}: periodic start changes by {periodic:.4} K, uniform by {uniform:.3} K");
        assert!(
            periodic < 1e-3 * 12.0,
            "periodic start changed by {periodic} K"
        );
        assert!(uniform > 2.0, "uniform start changed by {uniform} K");
    }
    // A held bottom temperature: the mean profile runs linearly to it.
    let held = BottomCondition::Temperature { temperature_c: 4.0 };
    let periodic = change(N11, held, Initial::Periodic(wave));
    assert!(
        periodic < 1e-3 * 12.0,
        "held bottom: changed by {periodic} K"
    );
}

#[test]
fn the_n_factor_surface_wave_is_the_first_harmonic_of_n_times_air() {
    // Fourier coefficients of n(T)·T for T = M − A cos θ, computed here by the midpoint rule
    // (2·10⁵ points) against the closed form of n_factor_wave; 1e-6 K.
    for &(m, a, nf, nt) in &[
        (2.0, 15.0, 0.7, 1.2),
        (-3.0, 10.0, 0.5, 1.0),
        (-20.0, 10.0, 0.9, 1.4),
        (20.0, 10.0, 0.9, 1.4),
        (0.0, 0.0, 0.7, 1.0),
    ] {
        let n = 200_000;
        let (mut mean, mut cosc) = (0.0, 0.0);
        for i in 0..n {
            let th = 2.0 * PI * (i as f64 + 0.5) / n as f64;
            let t = m - a * th.cos();
            let s = if t < 0.0 { nf * t } else { nt * t };
            mean += s / n as f64;
            cosc += 2.0 * s * th.cos() / n as f64;
        }
        let (ms, as_) = n_factor_wave(m, a, nf, nt);
        assert_abs(ms, mean, 1e-6, "mean of n·T");
        assert_abs(as_, -cosc, 1e-6, "amplitude of n·T");
    }
}

#[test]
fn spin_up_from_the_periodic_start_needs_fewer_years_than_from_uniform() {
    // The periodic start is the conduction solution: with freezing, latent heat moves the
    // ground away from it, and spin-up (repeat the year until it repeats to 0.01 K) refines
    // it. From it, spin-up converges in no more years than from a uniform start at the
    // mean, and both reach the same periodic state (to the spin-up tolerance, a few 0.01 K).
    let climate = Climate::Sinusoid {
        mean_c: 2.0,
        amplitude_k: 14.0,
        coldest_day_of_year: 30,
        snow: None,
    };
    let wave = climate.annual_wave();
    let spec = |from_periodic: Option<AnnualWave>| RunSpec {
        thicknesses_m: vec![12.0],
        materials: vec![silt()],
        curves: vec![None],
        grid: GridSpec {
            surface_cell_m: 0.02,
            growth_ratio: 1.05,
            max_cell_m: 0.4,
        },
        top: TopModel::NFactor {
            freezing: 0.7,
            thawing: 1.0,
        },
        bottom: BottomCondition::Flux { upward_w_m2: 0.06 },
        initial: Initial::SpinUp {
            start_c: 2.0,
            max_years: 30,
            from_periodic,
        },
        step_s: 6.0 * 3600.0,
        duration_s: YEAR,
        profile_every_s: DAY,
    };
    let a = hibernal::physics::transient::run::run(&spec(Some(wave)), &climate).unwrap();
    let b = hibernal::physics::transient::run::run(&spec(None), &climate).unwrap();
    println!(
        "spin-up years: from periodic {}, from uniform {}",
        a.spin_up_years, b.spin_up_years
    );
    assert!(a.spin_up_years <= b.spin_up_years);
    assert!(
        a.spin_up_years < 30 && b.spin_up_years < 30,
        "both converged"
    );
    assert_abs(
        a.max_frost_depth_m,
        b.max_frost_depth_m,
        0.02,
        "the same frost depth",
    );
}

#[test]
fn a_snow_cell_stores_heat_as_its_ice() {
    // Dry snow stores heat as its ice (model reference §1): H = ρ ∫₀ᵀ c_ice dθ below 0 °C
    // with the c_ice fit of materials::ice (c = 152.5 + 7.122 T_K, checked against IAPWS
    // R10-06 in tests/materials.rs), exact at the 2 K band edges and within ρ c₁ B²/8 between;
    // the latent heat ρ L_f (L_f = 333.4 kJ/kg, IAPWS) at 0 °C; T(H) inverts H(T).
    use hibernal::physics::transient::phase::{Phase, SNOW_CAPACITY_BAND_K};
    let rho = 280.0;
    let p = Phase::Snow {
        density_kg_m3: rho,
        conductivity: 0.2,
    };
    let c0 = 152.5 + 7.122 * 273.15;
    let exact = |t: f64| rho * (c0 * t + 0.5 * 7.122 * t * t);
    for k in 0..30 {
        let t = -(k as f64) * SNOW_CAPACITY_BAND_K;
        assert_rel(p.enthalpy(t) - 1.0, exact(t) - 1.0, 1e-12, "band edge");
    }
    let worst_between = rho * 7.122 * SNOW_CAPACITY_BAND_K.powi(2) / 8.0;
    for i in 0..600 {
        let t = -0.1 * i as f64 - 0.037;
        let h = p.enthalpy(t);
        assert!(
            (h - exact(t)).abs() <= worst_between * (1.0 + 1e-9),
            "H at {t}"
        );
        assert_abs(p.temperature(h), t, 1e-10, "T(H(T))");
        assert!(p.dt_dh(h, t) > 0.0 && p.conductivity(h, t) == 0.2);
    }
    assert_eq!(p.enthalpy(0.0), 0.0, "snow at 0 °C is frozen");
    assert_rel(
        p.latent_j_m3(),
        rho * 333.4e3,
        1e-15,
        "latent heat of its ice",
    );
    let half = 0.5 * p.latent_j_m3();
    assert_eq!(p.temperature(half), 0.0);
    assert_eq!(p.dt_dh(half, 0.0), 0.0);
    assert_abs(p.liquid_share(half, 0.0), 0.5, 1e-15, "half melted");
    // Beyond its latent heat: its water, at c_w = 4219 J/kg/K (IAPWS-95).
    assert_abs(
        p.temperature(p.latent_j_m3() + rho * 4219.0),
        1.0,
        1e-12,
        "meltwater",
    );
}

#[test]
fn an_erratic_snow_record_runs_to_the_end_and_conserves_energy() {
    // Conservation of energy under the hardest forcing a record can give: three years of
    // daily values (an invented, deterministic sequence) with air from −28 to +12 °C, snow
    // that comes and goes from one day to the next, depths up to 0.8 m and densities from 60
    // to 480 kg/m³. The run must finish (step halving where needed) and close its energy
    // balance with the snow-mass term to 1e-9.
    use hibernal::physics::climate::{DailySeries, DayRecord};
    let mut seed: u64 = 12345;
    let mut next = move || {
        seed = seed
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (seed >> 11) as f64 / (1u64 << 53) as f64
    };
    let start = chrono::NaiveDate::from_ymd_opt(2001, 7, 1).unwrap();
    let days: Vec<DayRecord> = (0..3 * 365)
        .map(|i| {
            let season = -(2.0 * PI * i as f64 / 365.0).cos();
            let air = -8.0 * season + 2.0 + 10.0 * (next() - 0.5) * 2.0;
            let snowy = next() < 0.5 + 0.5 * season;
            let depth = if snowy { 0.8 * next() } else { 0.0 };
            DayRecord {
                date: start + chrono::Days::new(i as u64),
                mean_air_c: air.clamp(-28.0, 12.0),
                snow_depth_m: Some(depth),
                snow_density_kg_m3: Some(60.0 + 420.0 * next()),
            }
        })
        .collect();
    let climate = Climate::Series(DailySeries::new(days).unwrap());
    let spec = RunSpec {
        thicknesses_m: vec![3.0, 5.0],
        materials: vec![silt(), material(2.0, 1.6, 1.9e6, 2.6e6, 6.0e7)],
        curves: vec![None, None],
        grid: GridSpec {
            surface_cell_m: 0.01,
            growth_ratio: 1.05,
            max_cell_m: 0.25,
        },
        top: TopModel::AirFilm {
            film_w_m2k: 25.0,
            snow_regression: SnowRegression::Jordan1991,
        },
        bottom: BottomCondition::Flux { upward_w_m2: 0.06 },
        initial: Initial::Periodic(climate.annual_wave()),
        step_s: 3600.0,
        duration_s: climate.duration_s(),
        profile_every_s: DAY,
    };
    let r = hibernal::physics::transient::run::run(&spec, &climate).unwrap();
    let rel = (r.energy_imbalance_j_m2 / r.energy_throughput_j_m2).abs();
    println!(
        "erratic record: imbalance {rel:e}, {:.2} iterations/step, {} splits",
        r.iterations as f64 / r.steps as f64,
        r.splits
    );
    assert!(rel < 1e-9, "relative imbalance {rel:e}");
    assert_eq!(r.max_snow_cells, 8);
    assert!(r
        .samples
        .iter()
        .all(|s| s.surface_c.is_finite() && s.frost_depth_m >= 0.0));
}

#[test]
fn the_state_kept_between_steps_changes_no_number() {
    // Each converged step keeps every cell's k and dT/dH for the next step, where the cell's
    // enthalpy has not changed since. That must be exact: the reference year (freezing
    // soils, a snow cover that comes, deepens, settles and goes, so snow cells are remapped
    // and their count changes) stepped with the kept state and with it cleared before every
    // step gives bit-for-bit the same column. Invariant of this tool; no outside source.
    use hibernal::physics::transient::reference::reference_year;
    use hibernal::physics::transient::setup::Forcing;
    use hibernal::physics::transient::SnowLayer;
    let (spec, forcing) = reference_year();
    let cells = cells_for(
        &spec.thicknesses_m,
        &spec.materials,
        &spec.grid,
        &spec.curves,
    );
    let mut kept = Solver::new(cells.clone(), 4.0);
    let mut fresh = Solver::new(cells, 4.0);
    let bottom = BottomCondition::Flux { upward_w_m2: 0.06 };
    let dt = 3600.0;
    let mut most_snow_cells = 0;
    for k in 1..=(200 * 24) {
        // Days 280–480 of the reference year: its snow season (days 300–465) and its freeze.
        let t = (280.0 * DAY) + k as f64 * dt;
        let air = forcing.air_c(t);
        let snow = forcing.snow(t).map(|(depth_m, density_kg_m3)| SnowLayer {
            depth_m,
            density_kg_m3,
            conductivity_w_m_k: 0.2,
        });
        let top = TopCondition::Air {
            air_c: air,
            film_w_m2k: 20.0,
            extra_resistance_m2k_w: 0.0,
        };
        for s in [&mut kept, &mut fresh] {
            s.set_snow(snow, air.min(0.0));
        }
        fresh.clear_step_cache();
        kept.step(dt, &top, &bottom).unwrap();
        fresh.step(dt, &top, &bottom).unwrap();
        assert_eq!(kept.enthalpy, fresh.enthalpy, "step {k}");
        most_snow_cells = most_snow_cells.max(kept.snow_cells);
    }
    assert!(
        kept.fronts().frost_depth_m > 0.05,
        "the test froze the ground"
    );
    assert!(
        most_snow_cells >= 8,
        "snow cells came and went: {most_snow_cells}"
    );
    assert_eq!(kept.work.iterations, fresh.work.iterations);
}

#[test]
fn states_on_one_constant_k_stretch_have_the_same_conductivity() {
    // The solver skips re-evaluating k where a cell stays on a stretch of enthalpy over
    // which k is one constant (Phase::constant_k_stretch). Check the claim it rests on:
    // any two states with the same tag have bit-for-bit the same conductivity, for inert,
    // freezing and snow cells; a partly frozen state or a temperature-dependent branch has
    // no tag. Invariant of this tool; no outside source.
    use hibernal::physics::materials::Branch;
    use hibernal::physics::transient::phase::Phase;
    let law = ConductivityLaw {
        frozen: Branch::Constant(2.1),
        unfrozen: Branch::Constant(1.4),
    };
    let phases = [
        Phase::Inert {
            c_frozen: 1.9e6,
            c_unfrozen: 2.0e6,
            law,
        },
        Phase::Isothermal {
            c_frozen: 1.9e6,
            c_unfrozen: 2.8e6,
            latent: 1.0e8,
            law,
        },
        Phase::Snow {
            density_kg_m3: 250.0,
            conductivity: 0.2,
        },
    ];
    let hs: Vec<f64> = (-400..=400).map(|i| i as f64 * 3.1e5 + 17.0).collect();
    for p in &phases {
        for &h1 in &hs {
            let Some(tag) = p.constant_k_stretch(h1) else {
                continue;
            };
            let k1 = p.conductivity(h1, p.temperature(h1));
            for &h2 in hs.iter().step_by(7) {
                if p.constant_k_stretch(h2) == Some(tag) {
                    assert_eq!(k1, p.conductivity(h2, p.temperature(h2)), "{p:?} {h1} {h2}");
                }
            }
        }
    }
    let iso = &phases[1];
    assert_eq!(iso.constant_k_stretch(0.5e8), None, "partly frozen");
    let ice = Phase::Isothermal {
        c_frozen: 1.9e6,
        c_unfrozen: 4.2e6,
        latent: 3.0e8,
        law: ConductivityLaw {
            frozen: Branch::IceIh,
            unfrozen: Branch::Constant(0.56),
        },
    };
    assert_eq!(ice.constant_k_stretch(-1e6), None, "ice k depends on T");
    assert_eq!(ice.constant_k_stretch(4e8), Some(1));
}
