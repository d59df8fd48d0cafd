//! Closed-form frost-penetration solutions against published examples, scipy, and the
//! defining equations. Each check names its source.

mod common;
use common::*;

use hibernal::physics::analytic::*;
use serde_json::Value;

const DAY: f64 = 86_400.0;

fn problem(v: &Value) -> NeumannProblem {
    NeumannProblem {
        surface_c: f(v, "surface_c"),
        initial_c: f(v, "initial_c"),
        freezing_c: f(v, "freezing_c"),
        k_frozen: f(v, "k_frozen"),
        k_unfrozen: f(v, "k_unfrozen"),
        c_frozen_j_m3k: f(v, "c_frozen_j_m3k"),
        c_unfrozen_j_m3k: f(v, "c_unfrozen_j_m3k"),
        latent_j_m3: f(v, "latent_j_m3"),
    }
}

// ---------------------------------------------------------------------------------------
// Error function
// ---------------------------------------------------------------------------------------

#[test]
fn erf_and_erfcx_match_scipy_and_tabulated_values() {
    // Abramowitz & Stegun Table 7.1: erf 0.5 = 0.5204998778, erf 1 = 0.8427007929,
    // erf 2 = 0.9953222650 (ten decimals as tabulated, so ±5e-11).
    assert_abs(erf(0.5), 0.520_499_877_8, 5e-11, "erf 0.5 (A&S 7.1)");
    assert_abs(erf(1.0), 0.842_700_792_9, 5e-11, "erf 1 (A&S 7.1)");
    assert_abs(erf(2.0), 0.995_322_265_0, 5e-11, "erf 2 (A&S 7.1)");
    assert_abs(erfc(1.0) + erf(1.0), 1.0, 1e-15, "erfc = 1 − erf");
    // scipy.special.erfcx, across the switch from the direct form to the continued fraction
    // at x = 25. The direct form loses about x²·ε in exp(x²) (≈ 7e-14 at 25), so 1e-12.
    for row in analytic_reference()["erfcx"].as_array().unwrap() {
        let x = f(row, "x");
        assert_rel(
            erfcx(x),
            f(row, "erfcx"),
            1e-12,
            &format!("erfcx({x}) vs scipy"),
        );
    }
}

// ---------------------------------------------------------------------------------------
// Neumann
// ---------------------------------------------------------------------------------------

#[test]
fn lunardini_soil_example_front_constant() {
    // Lunardini 1981, Heat Transfer in Cold Climates, after Jumikis 1966 (as quoted in the
    // project's model reference): front constant "about 3.6 cm/h^½", ≈ 1.36 m after 60
    // days. Published to two and three figures, so ±0.05 cm/h^½ and ±0.005 m.
    let s = lunardini_soil().solve().unwrap();
    let beta_cm_sqrt_h = s.front_constant_m_sqrt_s() * 100.0 * 3600f64.sqrt();
    assert_abs(beta_cm_sqrt_h, 3.6, 0.05, "front constant, cm/h^½");
    assert_abs(
        s.front_depth_m(60.0 * DAY),
        1.36,
        0.005,
        "front after 60 days, m",
    );
}

#[test]
fn neumann_matches_scipy() {
    // tools/analytic_reference.py: the same equation solved by scipy.optimize.brentq with
    // scipy.special erf/erfcx; both solve to ~1e-15, so 1e-10 leaves room for the
    // conditioning of the equation and nothing else. Temperatures: 1e-10 of the
    // temperature span (T₀ − T_s).
    let r = analytic_reference();
    let cases = r["neumann"].as_array().unwrap();
    assert_eq!(cases.len(), 6);
    for c in cases {
        let name = c["name"].as_str().unwrap();
        let p = problem(&c["problem"]);
        let s = p.solve().unwrap_or_else(|e| panic!("{name}: {e}"));
        assert_rel(s.xi, f(c, "xi"), 1e-10, &format!("{name}: ξ"));
        assert_rel(
            s.front_constant_m_sqrt_s(),
            f(c, "front_constant_m_per_sqrt_s"),
            1e-10,
            &format!("{name}: front constant"),
        );
        let span = p.initial_c - p.surface_c;
        for pt in c["temperatures"].as_array().unwrap() {
            let (z, t) = (f(pt, "z_m"), f(pt, "t_s"));
            assert_abs(
                s.temperature_c(z, t),
                f(pt, "t_c"),
                1e-10 * span,
                &format!("{name}: T({z} m, {t} s)"),
            );
        }
    }
}

#[test]
fn neumann_field_meets_its_boundary_and_front_conditions() {
    // The problem's own conditions (Carslaw & Jaeger 1959 §11.2): T = T_s at z = 0,
    // T = T_f at the front from both sides, T → T₀ far below.
    for p in [
        lunardini_soil(),
        NeumannProblem {
            surface_c: -25.0,
            initial_c: 8.0,
            freezing_c: -1.0,
            ..lunardini_soil()
        },
    ] {
        let s = p.solve().unwrap();
        for t in [3600.0, 10.0 * DAY, 100.0 * DAY] {
            let x = s.front_depth_m(t);
            assert_abs(s.temperature_c(0.0, t), p.surface_c, 1e-12, "T(0) = T_s");
            assert_abs(s.temperature_c(x, t), p.freezing_c, 1e-12, "T(X) = T_f");
            assert_abs(
                s.temperature_c(x * (1.0 + 1e-12), t),
                p.freezing_c,
                1e-9,
                "T(X+) = T_f",
            );
            assert_abs(
                s.temperature_c(50.0 * x, t),
                p.initial_c,
                1e-12,
                "T(∞) = T₀",
            );
            // Monotone in depth.
            let mut prev = f64::MIN;
            for i in 0..=200 {
                let tc = s.temperature_c(x * i as f64 / 50.0, t);
                assert!(tc >= prev, "T increases with depth");
                prev = tc;
            }
        }
    }
}

#[test]
fn neumann_satisfies_the_stefan_condition_by_finite_differences() {
    // Stefan condition at the front: k_f ∂T/∂z(X−) − k_u ∂T/∂z(X+) = L dX/dt, with the
    // gradients by second-order one-sided differences of temperature_c and dX/dt by a
    // central difference of front_depth_m. Each side's step is 1e-4 of its zone's length
    // scale at the front (X/max(1, ξ²) frozen; X/(b·max(1, b)) unfrozen, b = X/(2√(a_u t)),
    // the erf/erfc argument there), so truncation is ~1e-8 relative and rounding
    // (ε·ΔT/h) below 1e-9. Tolerance 1e-6 relative to L dX/dt.
    let r = analytic_reference();
    for c in r["neumann"].as_array().unwrap() {
        let name = c["name"].as_str().unwrap();
        let p = problem(&c["problem"]);
        let s = p.solve().unwrap();
        let t = 10.0 * DAY;
        let x = s.front_depth_m(t);
        let b = x / (2.0 * (s.a_unfrozen_m2_s * t).sqrt());
        let hf = 1e-4 * x / s.xi.powi(2).max(1.0);
        let hu = 1e-4 * x / (b * b.max(1.0)).max(1.0);
        let tz = |z: f64| s.temperature_c(z, t);
        let g_minus = (3.0 * tz(x) - 4.0 * tz(x - hf) + tz(x - 2.0 * hf)) / (2.0 * hf);
        let g_plus = (-3.0 * tz(x) + 4.0 * tz(x + hu) - tz(x + 2.0 * hu)) / (2.0 * hu);
        let dt = 1e-4 * t;
        let v = (s.front_depth_m(t + dt) - s.front_depth_m(t - dt)) / (2.0 * dt);
        let latent = p.latent_j_m3 * v;
        let conducted = p.k_frozen * g_minus - p.k_unfrozen * g_plus;
        assert_rel(
            conducted,
            latent,
            1e-6,
            &format!("{name}: Stefan condition"),
        );
    }
}

#[test]
fn neumann_field_satisfies_the_heat_equation_in_each_zone() {
    // ∂T/∂t = a ∂²T/∂z² in each zone, by central differences (relative steps 1e-3 in z and
    // t: truncation ~1e-6, rounding ~1e-10 of the terms), tolerance 1e-4 of a·T_zz.
    let s = lunardini_soil().solve().unwrap();
    let t = 20.0 * DAY;
    let x = s.front_depth_m(t);
    for (frac, a) in [
        (0.3, s.a_frozen_m2_s),
        (0.8, s.a_frozen_m2_s),
        (1.3, s.a_unfrozen_m2_s),
        (2.0, s.a_unfrozen_m2_s),
    ] {
        let z = frac * x;
        let hz = 1e-3 * x;
        let ht = 1e-3 * t;
        let tzz = (s.temperature_c(z + hz, t) - 2.0 * s.temperature_c(z, t)
            + s.temperature_c(z - hz, t))
            / (hz * hz);
        let tt = (s.temperature_c(z, t + ht) - s.temperature_c(z, t - ht)) / (2.0 * ht);
        assert_rel(tt, a * tzz, 1e-4, &format!("heat equation at z = {frac} X"));
    }
}

#[test]
fn neumann_reduces_to_the_one_phase_problem() {
    // Carslaw & Jaeger 1959 §11.2: with the unfrozen side at T_f the unfrozen term vanishes
    // and ξ solves λ e^{λ²} erf λ = Ste/√π. Both roots are to 1e-15, so 1e-13.
    let base = lunardini_soil();
    let p = NeumannProblem {
        initial_c: base.freezing_c,
        ..base
    };
    let ste = stefan_number(p.c_frozen_j_m3k, p.freezing_c - p.surface_c, p.latent_j_m3);
    let xi = p.solve().unwrap().xi;
    assert_rel(xi, one_phase_lambda(ste).unwrap(), 1e-13, "ξ = one-phase λ");
    // Continuity: T₀ → T_f from above (the unfrozen term is linear in T₀ − T_f: 1e-9 K
    // moves ξ by ~1e-10 relative).
    let near = NeumannProblem {
        initial_c: base.freezing_c + 1e-9,
        ..base
    };
    assert_rel(near.solve().unwrap().xi, xi, 1e-8, "T₀ → T_f");
    // And warmer ground slows the front (the unfrozen term only opposes freezing).
    assert!(base.solve().unwrap().xi < xi);
    // And the unfrozen conductivity no longer matters.
    let other = NeumannProblem {
        k_unfrozen: 0.1,
        ..p
    };
    assert_rel(other.solve().unwrap().xi, xi, 1e-13, "k_u irrelevant");
}

#[test]
fn one_phase_matches_scipy() {
    // tools/analytic_reference.py (scipy brentq + special.erf), tolerance as for Neumann.
    for row in analytic_reference()["one_phase"].as_array().unwrap() {
        let ste = f(row, "stefan_number");
        assert_rel(
            one_phase_lambda(ste).unwrap(),
            f(row, "lambda"),
            1e-10,
            &format!("one-phase λ at Ste = {ste}"),
        );
    }
}

#[test]
fn one_phase_tends_to_stefan_for_small_stefan_number() {
    // Crank 1984 §1.3 / Carslaw & Jaeger §11.2: λ → √(Ste/2) as Ste → 0, so the front
    // X = 2λ√(a t) → √(2 k ΔT t/L), Stefan's law. λ² = (Ste/2)(1 − Ste/6 + …) (series of
    // the equation), so at Ste = 1e-6 the ratio is within 1e-6.
    let (k, c, l, dt) = (2.0, 2.0e6, 1.0e8, 5e-5);
    let ste = stefan_number(c, dt, l);
    assert_abs(ste, 1e-6, 1e-20, "Ste");
    let lam = one_phase_lambda(ste).unwrap();
    assert_rel(lam, (ste / 2.0).sqrt(), 1e-6, "λ → √(Ste/2)");
    let t = 30.0 * DAY;
    let x = 2.0 * lam * (k / c * t).sqrt();
    assert_rel(x, stefan_depth_m(k, l, dt * t), 1e-6, "X → Stefan");
    // Stefan ignores sensible heat, so it overestimates at finite Ste (an upper bound).
    for ste in [0.05, 0.5, 2.0] {
        let lam = one_phase_lambda(ste).unwrap();
        assert!(
            lam < (ste / 2.0).sqrt(),
            "Stefan overestimates at Ste = {ste}"
        );
    }
}

// ---------------------------------------------------------------------------------------
// Stefan
// ---------------------------------------------------------------------------------------

#[test]
fn stefan_with_resistance() {
    // Derived balance L (R X + X²/(2k)) = F (quasi-steady, model reference §4): the
    // returned X must satisfy it to rounding (1e-12), equal Stefan at R = 0, and fall with R.
    let (k, l, fi) = (1.8, 1.2e8, 800.0 * DAY);
    let bare = stefan_depth_m(k, l, fi);
    assert_rel(bare, (2.0 * k * fi / l).sqrt(), 1e-15, "√(2kF/L)");
    assert_eq!(stefan_depth_with_resistance_m(k, l, fi, 0.0), bare, "R = 0");
    let mut prev = bare;
    for r in [0.01, 0.5, 2.0, 50.0] {
        let x = stefan_depth_with_resistance_m(k, l, fi, r);
        assert_rel(l * (r * x + x * x / (2.0 * k)), fi, 1e-12, "balance");
        assert!(x < prev, "more resistance, shallower frost");
        prev = x;
    }
    // Large R: X → F/(L R) (all resistance in R).
    let r = 1e4;
    assert_rel(
        stefan_depth_with_resistance_m(k, l, fi, r),
        fi / (l * r),
        1e-3,
        "large R",
    );
    assert_eq!(stefan_depth_m(k, l, -5.0), 0.0, "no freezing index");
}

// ---------------------------------------------------------------------------------------
// Modified Berggren
// ---------------------------------------------------------------------------------------

#[test]
fn berggren_lambda_matches_scipy_on_a_grid() {
    // tools/analytic_reference.py: 1/erf z − α/erfc z = √π z e^{z²}/μ by scipy brentq,
    // λ = z √(2/μ); 7 × 7 points, α 0–5, μ 0.005–5. Tolerance 1e-10.
    let r = analytic_reference();
    let rows = r["berggren"].as_array().unwrap();
    assert_eq!(rows.len(), 49);
    for row in rows {
        let (a, m) = (f(row, "alpha"), f(row, "mu"));
        let lam = berggren_lambda(a, m).unwrap();
        assert_rel(lam, f(row, "lambda"), 1e-10, &format!("λ({a}, {m})"));
        assert!(lam > 0.0 && lam < 1.0, "0 < λ < 1 at ({a}, {m})");
    }
}

#[test]
fn berggren_lambda_limits_and_trends() {
    // μ → 0 with α = 0 gives λ → 1 (Stefan): λ ≈ 1 − μ/6 from the series, so at μ = 1e-8
    // within 1e-8.
    assert_abs(berggren_lambda(0.0, 1e-8).unwrap(), 1.0, 1e-8, "λ(0, μ→0)");
    // λ falls with α and with μ (TM 5-852-6 chart trend: warmer ground and more sensible
    // heat both slow the front).
    for mu in [0.01, 0.3, 3.0] {
        let mut prev = 1.0;
        for a in [0.0, 0.5, 1.0, 2.0, 4.0] {
            let lam = berggren_lambda(a, mu).unwrap();
            assert!(lam < prev, "λ falls with α at μ = {mu}");
            prev = lam;
        }
    }
    for a in [0.0, 1.0, 3.0] {
        let mut prev = 1.0;
        for mu in [0.01, 0.1, 0.5, 1.0, 4.0] {
            let lam = berggren_lambda(a, mu).unwrap();
            assert!(lam < prev, "λ falls with μ at α = {a}");
            prev = lam;
        }
    }
    // With α = 0 the equation is the one-phase one with Ste = μ: λ = λ₁(μ) √(2/μ).
    for mu in [0.01, 0.5, 2.0] {
        assert_rel(
            berggren_lambda(0.0, mu).unwrap(),
            one_phase_lambda(mu).unwrap() * (2.0 / mu).sqrt(),
            1e-13,
            "α = 0 is one-phase",
        );
    }
}

#[test]
fn modified_berggren_equals_neumann_with_equal_properties() {
    // The derivation in berggren_lambda's doc comment: the method's λ is the Neumann front
    // with equal frozen and unfrozen properties, the ground at the mean annual temperature
    // and the surface at −v_s for the season. Both sides to ~1e-15, so 1e-12.
    let (k, c, l) = (1.6, 2.4e6, 9.0e7);
    let (n, fi_air, mat, season) = (0.7, 1500.0 * DAY, 4.0, 150.0 * DAY);
    let x = modified_berggren_depth_m(k, l, n, fi_air, mat, season, c).unwrap();
    let v_s = n * fi_air / season;
    let neumann = NeumannProblem {
        surface_c: -v_s,
        initial_c: mat,
        freezing_c: 0.0,
        k_frozen: k,
        k_unfrozen: k,
        c_frozen_j_m3k: c,
        c_unfrozen_j_m3k: c,
        latent_j_m3: l,
    }
    .solve()
    .unwrap();
    assert_rel(
        x,
        neumann.front_depth_m(season),
        1e-12,
        "Berggren = Neumann",
    );
    // And it is λ times Stefan's depth with the surface index nF.
    let lam = berggren_lambda(
        thermal_ratio(mat, n * fi_air, season),
        fusion_parameter(c, v_s, l),
    )
    .unwrap();
    assert_rel(x, lam * stefan_depth_m(k, l, n * fi_air), 1e-14, "λ·Stefan");
    assert!(x < stefan_depth_m(k, l, n * fi_air));
}

#[test]
fn layered_berggren_of_a_uniform_soil_does_not_depend_on_the_split() {
    // The TM 5-852-6 layered sum telescopes for identical layers:
    // Σ L d (ΣR + d/2k) = L D²/(2k), so any split gives the one-layer depth. Partial
    // indices sum to nF. Tolerance 1e-12 (the partial layer is bisected to ~1e-16).
    let soil = BerggrenLayer {
        thickness_m: 0.25,
        k_w_m_k: 1.9,
        latent_j_m3: 1.0e8,
        c_j_m3k: 2.3e6,
    };
    let (n, fi, mat, season) = (0.9, 1200.0 * DAY, 3.0, 140.0 * DAY);
    let one = modified_berggren_depth_m(1.9, 1.0e8, n, fi, mat, season, 2.3e6).unwrap();
    let split = modified_berggren_layered(&[soil; 7], n, fi, mat, season).unwrap();
    assert_rel(split.depth_m, one, 1e-12, "uniform soil in 7 layers");
    assert!(split.partial_index_k_s.len() >= 2);
    let sum: f64 = split.partial_index_k_s.iter().sum();
    assert_rel(sum, n * fi, 1e-12, "partial indices sum to nF");
    let uneven = [
        BerggrenLayer {
            thickness_m: 0.07,
            ..soil
        },
        BerggrenLayer {
            thickness_m: 0.6,
            ..soil
        },
        soil,
    ];
    let uneven = modified_berggren_layered(&uneven, n, fi, mat, season).unwrap();
    assert_rel(uneven.depth_m, one, 1e-12, "uneven split");
}

#[test]
fn layered_berggren_under_insulation_tends_to_stefan_with_resistance() {
    // With α = 0 and μ → 0 (negligible heat capacity) λ → 1 and the layered sum is the
    // quasi-steady balance L (R X + X²/2k) = nF for soil under a board of resistance R
    // (the board has no latent heat). λ ≈ 1 − μ/6 with μ ~ 1e-8 here, so 1e-6.
    let board = BerggrenLayer {
        thickness_m: 0.05,
        k_w_m_k: 0.029,
        latent_j_m3: 0.0,
        c_j_m3k: 1.0,
    };
    let soil = BerggrenLayer {
        thickness_m: 3.0,
        k_w_m_k: 2.0,
        latent_j_m3: 1.2e8,
        c_j_m3k: 1.0,
    };
    let (n, fi, season) = (1.0, 2000.0 * DAY, 180.0 * DAY);
    let out = modified_berggren_layered(&[board, soil], n, fi, 0.0, season).unwrap();
    let r = board.thickness_m / board.k_w_m_k;
    let x = stefan_depth_with_resistance_m(soil.k_w_m_k, soil.latent_j_m3, fi, r);
    assert_rel(
        out.depth_m - board.thickness_m,
        x,
        1e-6,
        "layered → Stefan with R",
    );
    assert_eq!(
        out.partial_index_k_s[0], 0.0,
        "the board takes no index itself"
    );
    // Insulation reduces the frost depth below the board's top.
    let bare = modified_berggren_layered(&[soil], n, fi, 0.0, season).unwrap();
    assert!(out.depth_m - board.thickness_m < bare.depth_m);
}

#[test]
fn layered_berggren_follows_the_procedure_step_by_step() {
    // TM 5-852-6 layered procedure (recalled, from memory; see the doc comment), redone by
    // hand here: a drier layer over a wetter one of the same k and C. Layer 1 takes
    // nF₁ = L₁ d₁ (d₁/2k)/λ₁², λ₁ from the means of layer 1; the frozen part x of layer 2
    // solves L₂ x (d₁/k + x/2k)/λ₂² = nF − nF₁ with λ₂ from the means down to d₁ + x.
    let dry = BerggrenLayer {
        thickness_m: 0.4,
        k_w_m_k: 1.6,
        latent_j_m3: 3.0e7,
        c_j_m3k: 2.0e6,
    };
    let wet = BerggrenLayer {
        latent_j_m3: 1.4e8,
        thickness_m: 2.0,
        ..dry
    };
    let (n, fi, mat, season) = (0.7, 1000.0 * DAY, 5.0, 120.0 * DAY);
    let out = modified_berggren_layered(&[dry, wet], n, fi, mat, season).unwrap();
    let nf = n * fi;
    let v_s = nf / season;
    let alpha = thermal_ratio(mat, nf, season);
    assert_rel(out.alpha, alpha, 1e-15, "α");
    let lam1 = berggren_lambda(alpha, fusion_parameter(dry.c_j_m3k, v_s, dry.latent_j_m3)).unwrap();
    let k = dry.k_w_m_k;
    let nf1 = dry.latent_j_m3 * dry.thickness_m * (dry.thickness_m / (2.0 * k)) / (lam1 * lam1);
    assert_eq!(out.partial_index_k_s.len(), 2);
    assert_rel(out.partial_index_k_s[0], nf1, 1e-13, "index of layer 1");
    assert_rel(
        out.partial_index_k_s[1],
        nf - nf1,
        1e-13,
        "index left for layer 2",
    );
    let x = out.depth_m - dry.thickness_m;
    assert!(x > 0.0 && x < wet.thickness_m, "front in layer 2");
    let l_bar = (dry.latent_j_m3 * dry.thickness_m + wet.latent_j_m3 * x) / out.depth_m;
    let lam2 = berggren_lambda(alpha, fusion_parameter(dry.c_j_m3k, v_s, l_bar)).unwrap();
    assert_rel(out.lambda, lam2, 1e-13, "λ of the last layer");
    let need = wet.latent_j_m3 * x * (dry.thickness_m / k + x / (2.0 * k)) / (lam2 * lam2);
    assert_rel(need, nf - nf1, 1e-12, "layer 2 balance");
    // More latent heat below can only make the front shallower than in the dry soil alone.
    let d_dry = modified_berggren_layered(&[dry], n, fi, mat, season).unwrap();
    assert!(out.depth_m < d_dry.depth_m);
}

// ---------------------------------------------------------------------------------------
// Periodic surface temperature
// ---------------------------------------------------------------------------------------

fn annual() -> PeriodicSurface {
    PeriodicSurface {
        mean_c: 4.0,
        amplitude_k: 12.0,
        period_s: 365.0 * DAY,
        diffusivity_m2_s: 8.0e-7,
        phase_rad: 0.3,
    }
}

#[test]
fn periodic_amplitude_and_lag_from_the_field_itself() {
    // Carslaw & Jaeger 1959 §2.6: amplitude A e^{−z/d}, lag z/d. Measured here by sampling
    // temperature_c over one period at each depth (20 000 samples: the peak value is found
    // to (π/10⁴)²/2 ≈ 5e-8 relative; its time to a period/20 000).
    let p = annual();
    let d = p.damping_depth_m();
    assert_rel(
        d,
        (2.0 * p.diffusivity_m2_s * p.period_s / (2.0 * std::f64::consts::PI)).sqrt(),
        1e-15,
        "d = √(2a/ω)",
    );
    let n = 20_000;
    let peak = |z: f64| {
        (0..n)
            .map(|i| {
                let t = p.period_s * i as f64 / n as f64;
                (t, p.temperature_c(z, t))
            })
            .fold((0.0, f64::MIN), |a, b| if b.1 > a.1 { b } else { a })
    };
    let (t0, max0) = peak(0.0);
    assert_rel(max0 - p.mean_c, p.amplitude_k, 1e-7, "surface amplitude");
    for z in [0.5, 2.0, 5.0] {
        let (tz, maxz) = peak(z);
        assert_rel(maxz - p.mean_c, p.amplitude_at_k(z), 1e-7, "amplitude at z");
        assert_rel(
            p.amplitude_at_k(z) / p.amplitude_k,
            (-z / d).exp(),
            1e-14,
            "e^{−z/d}",
        );
        let lag = (tz - t0).rem_euclid(p.period_s);
        assert_abs(lag, p.time_lag_s(z), 2.0 * p.period_s / n as f64, "lag");
    }
}

#[test]
fn periodic_field_satisfies_the_heat_equation() {
    // ∂T/∂t = a ∂²T/∂z², central differences (h_z = d/1000, h_t = period/10⁵), 1e-5
    // relative to the largest term in the comparison.
    let p = annual();
    let d = p.damping_depth_m();
    let (hz, ht) = (d / 1000.0, p.period_s / 1e5);
    for z in [0.2, 1.0, 3.0] {
        for t in [0.0, 40.0 * DAY, 200.0 * DAY] {
            let tzz = (p.temperature_c(z + hz, t) - 2.0 * p.temperature_c(z, t)
                + p.temperature_c(z - hz, t))
                / (hz * hz);
            let tt = (p.temperature_c(z, t + ht) - p.temperature_c(z, t - ht)) / (2.0 * ht);
            let scale = p.amplitude_at_k(z) * p.angular_frequency_rad_s();
            assert_abs(tt, p.diffusivity_m2_s * tzz, 1e-5 * scale, "heat equation");
        }
    }
}

#[test]
fn periodic_depth_reaching_zero() {
    // Lowest temperature at depth z is T_m − A e^{−z/d}; at the returned depth it is the
    // threshold (1e-12 K).
    let p = annual();
    let z = p.depth_reaching_m(0.0).unwrap();
    assert_abs(
        p.mean_c - p.amplitude_at_k(z),
        0.0,
        1e-12,
        "min T = 0 °C there",
    );
    assert!(PeriodicSurface { mean_c: -1.0, ..p }
        .depth_reaching_m(0.0)
        .is_none());
    assert_eq!(
        PeriodicSurface { mean_c: 20.0, ..p }.depth_reaching_m(0.0),
        Some(0.0)
    );
}

// ---------------------------------------------------------------------------------------
// Lake ice
// ---------------------------------------------------------------------------------------

#[test]
fn lake_ice_by_stefans_law() {
    // The ideal coefficient is Stefan's law for ice at the air temperature: clear ice
    // k 2.2 W/m/K (handbook value, model reference §2) and ρ_i L = 916.7 × 333.4 kJ
    // (IAPWS, ibid.). Ashton quotes about 3.4 cm/(°C·d)^½ for the ideal case (from
    // memory), so only a loose band 3.3–3.7 on that.
    let l = 916.7 * 333.4e3;
    let ideal = stefan_ice_coefficient_cm_sqrt_cday(2.2, l);
    assert!(ideal > 3.3 && ideal < 3.7, "ideal coefficient {ideal}");
    for fdd in [10.0, 250.0, 1500.0] {
        assert_rel(
            lake_ice_thickness_m(ideal, fdd),
            stefan_depth_m(2.2, l, fdd * DAY),
            1e-13,
            "lake ice with the ideal coefficient = Stefan",
        );
    }
    // Michel 1971 via Ashton (from memory): the field coefficients lie below the ideal.
    let (lo, hi) = LAKE_ICE_COEFFICIENT_AVERAGE_WITH_SNOW;
    assert!(lo < hi && hi < LAKE_ICE_COEFFICIENT_WINDY_NO_SNOW);
    assert!(LAKE_ICE_COEFFICIENT_WINDY_NO_SNOW < ideal);
    // h = α √FDD in cm: 2.7 × √400 = 54 cm.
    assert_rel(
        lake_ice_thickness_m(LAKE_ICE_COEFFICIENT_WINDY_NO_SNOW, 400.0),
        0.54,
        1e-14,
        "2.7 √400 cm",
    );
    assert_eq!(lake_ice_thickness_m(2.0, -3.0), 0.0);
}

// ---------------------------------------------------------------------------------------
// Refusals
// ---------------------------------------------------------------------------------------

#[test]
fn impossible_inputs_are_refused_with_typed_errors() {
    let base = lunardini_soil();
    assert!(matches!(
        NeumannProblem {
            surface_c: 0.0,
            ..base
        }
        .solve(),
        Err(AnalyticError::SurfaceNotBelowFreezing { .. })
    ));
    assert!(matches!(
        NeumannProblem {
            initial_c: -1.0,
            ..base
        }
        .solve(),
        Err(AnalyticError::InitialBelowFreezing { .. })
    ));
    assert!(matches!(
        NeumannProblem {
            k_frozen: 0.0,
            ..base
        }
        .solve(),
        Err(AnalyticError::NotPositive { .. })
    ));
    assert!(matches!(
        NeumannProblem {
            latent_j_m3: f64::NAN,
            ..base
        }
        .solve(),
        Err(AnalyticError::NotFinite { .. })
    ));
    assert!(matches!(
        one_phase_lambda(0.0),
        Err(AnalyticError::NotPositive { .. })
    ));
    assert!(matches!(
        berggren_lambda(-0.1, 0.5),
        Err(AnalyticError::NegativeThermalRatio { .. })
    ));
    assert!(matches!(
        modified_berggren_depth_m(1.5, 1e8, 1.0, 1000.0 * DAY, -2.0, 150.0 * DAY, 2e6),
        Err(AnalyticError::NegativeThermalRatio { .. })
    ));
    assert!(matches!(
        modified_berggren_layered(&[], 1.0, 1000.0 * DAY, 2.0, 150.0 * DAY),
        Err(AnalyticError::NoLayers)
    ));
    let msg = NeumannProblem {
        surface_c: 1.0,
        ..base
    }
    .solve()
    .unwrap_err()
    .to_string();
    assert!(msg.contains("below the freezing point"), "{msg}");
}
