//! The uncertainty core against closed forms. Each check names its source and why its
//! tolerance is what it is. Sampling checks use a fixed seed, so each is deterministic;
//! their tolerances are 4 standard errors of the statistic at the run count, a bound a
//! correct sampler breaks with probability about 6e-5 for any one seed.

mod common;
use common::*;

use hibernal::physics::error::InputErrorKind;
use hibernal::physics::materials::{MaterialSpec, SnowRegression};
use hibernal::physics::ranges::{
    monte_carlo, one_at_a_time, percentile_sorted, sample_at, Distribution, MonteCarloError,
    MonteCarloJob, Pcg32, RangedInput, SensitivityError, MAX_RUNS,
};
use hibernal::physics::stack::{Boundary, Layer, Stack};
use hibernal::physics::steady;

fn uniform(id: &str, low: f64, high: f64) -> RangedInput {
    RangedInput {
        id: id.into(),
        low,
        high,
        distribution: Distribution::Uniform,
    }
}

/// y = Σ aᵢxᵢ + b with xᵢ uniform on [lᵢ, hᵢ].
const A: [f64; 3] = [2.0, -3.0, 0.5];
const B: f64 = 7.0;
fn linear_inputs() -> Vec<RangedInput> {
    vec![
        uniform("x0", 0.0, 1.0),
        uniform("x1", 10.0, 14.0),
        uniform("x2", -5.0, 5.0),
    ]
}
fn linear(x: &[f64]) -> Result<f64, String> {
    Ok(A.iter().zip(x).map(|(a, x)| a * x).sum::<f64>() + B)
}

#[test]
fn pcg32_reproduces_the_reference_vector_and_jumps_ahead_exactly() {
    // O'Neill's pcg32 demo (pcg-random.org, "Using the basic C implementation"):
    // initstate 42, initseq 54 gives these six outputs.
    let mut g = Pcg32::new(42, 54);
    let got: Vec<u32> = (0..6).map(|_| g.next_u32()).collect();
    assert_eq!(
        got,
        [0xa15c02b7, 0x7b47f409, 0xba1d3330, 0x83d2f293, 0xbfa4784b, 0xcbed606e]
    );
    // Jump-ahead (Brown 1994) equals stepping one draw at a time, for several strides.
    for delta in [0u64, 1, 2, 3, 17, 1000, 65_537] {
        let mut stepped = Pcg32::new(7, 99);
        for _ in 0..delta {
            stepped.next_u32();
        }
        let mut jumped = Pcg32::new(7, 99);
        jumped.advance(delta);
        assert_eq!(stepped, jumped, "advance({delta})");
    }
}

#[test]
fn linear_function_mean_and_variance_match_the_analytic_moments() {
    // For independent uniform xᵢ: E[y] = Σaᵢ(lᵢ+hᵢ)/2 + b, Var[y] = Σaᵢ²(hᵢ−lᵢ)²/12
    // (moments of the uniform distribution; variances of independent terms add).
    let inputs = linear_inputs();
    let n = MAX_RUNS;
    let r = monte_carlo(&inputs, n, 20261202, linear).unwrap();
    assert_eq!(r.values.len(), n);
    assert!(r.failures.is_empty());
    let widths: Vec<f64> = A
        .iter()
        .zip(&inputs)
        .map(|(a, i)| a.abs() * (i.high - i.low))
        .collect();
    let mean: f64 = A
        .iter()
        .zip(&inputs)
        .map(|(a, i)| a * (i.low + i.high) / 2.0)
        .sum::<f64>()
        + B;
    let var_i: Vec<f64> = widths.iter().map(|w| w * w / 12.0).collect();
    let var: f64 = var_i.iter().sum();
    assert_abs(mean, -28.0, 1e-12, "analytic mean by hand");
    assert_abs(var, 173.0 / 12.0, 1e-12, "analytic variance by hand");
    // Standard error of the mean: σ/√n.
    let se_mean = (var / n as f64).sqrt();
    assert_abs(r.mean, mean, 4.0 * se_mean, "Monte Carlo mean (4 SE)");
    // Standard error of the sample variance: √((μ₄ − σ⁴)/n), with the fourth central
    // moment of a sum of independent terms μ₄ = Σμ₄ᵢ + 6Σ_{i<j}σᵢ²σⱼ², and μ₄ᵢ = wᵢ⁴/80
    // for a uniform of width wᵢ.
    let mut mu4: f64 = widths.iter().map(|w| w.powi(4) / 80.0).sum();
    for i in 0..3 {
        for j in i + 1..3 {
            mu4 += 6.0 * var_i[i] * var_i[j];
        }
    }
    let se_var = ((mu4 - var * var) / n as f64).sqrt();
    assert_abs(
        r.sd * r.sd,
        var,
        4.0 * se_var,
        "Monte Carlo variance (4 SE)",
    );
    // And the statistics agree with the values they come from.
    let m: f64 = r.values.iter().sum::<f64>() / n as f64;
    assert_eq!(m, r.mean);
    assert!(r.sorted.windows(2).all(|w| w[0] <= w[1]));
}

#[test]
fn percentile_is_hyndman_fan_type_7() {
    // Hand-computed from the type-7 definition (numpy.percentile's default "linear"):
    // h = (n − 1)p, x_⌊h⌋ + (h − ⌊h⌋)(x_⌊h⌋+1 − x_⌊h⌋).
    let x = [1.0, 2.0, 3.0, 4.0, 10.0];
    for (p, want) in [
        (0.0, 1.0),
        (0.1, 1.4),
        (0.25, 2.0),
        (0.5, 3.0),
        (0.9, 7.6),
        (1.0, 10.0),
    ] {
        assert_abs(percentile_sorted(&x, p), want, 1e-12, &format!("p = {p}"));
    }
    let y = [2.0, 4.0, 8.0, 16.0];
    for (p, want) in [(0.1, 2.6), (0.5, 6.0), (0.9, 13.6)] {
        assert_abs(percentile_sorted(&y, p), want, 1e-12, &format!("p = {p}"));
    }
    assert_eq!(percentile_sorted(&[5.0], 0.3), 5.0);
    assert!(percentile_sorted(&[], 0.5).is_nan());
}

#[test]
fn percentiles_of_a_uniform_input_match_its_quantiles() {
    // Uniform on [l, h]: the p-quantile is l + p(h − l). The standard error of a sample
    // quantile is √(p(1−p)/n)/f(x_p) (asymptotic, e.g. Stuart & Ord, Kendall's Advanced
    // Theory of Statistics vol. 1 §10.10, from memory), with f = 1/(h − l).
    let (l, h) = (150.0, 450.0);
    let n = 5000;
    let r = monte_carlo(&[uniform("u", l, h)], n, 11, |x| Ok::<_, String>(x[0])).unwrap();
    for (p, got) in [(0.1, r.p10), (0.5, r.p50), (0.9, r.p90)] {
        let se = (p * (1.0 - p) / n as f64).sqrt() * (h - l);
        assert_abs(got, l + p * (h - l), 4.0 * se, &format!("p{}", p * 100.0));
    }
    assert!(r.min >= l && r.max <= h);
}

#[test]
fn triangular_and_truncated_normal_means_match_their_formulas() {
    let n = MAX_RUNS;
    // Triangular (l, c, h): mean (l + c + h)/3, variance (l² + c² + h² − lc − lh − ch)/18
    // (standard moments of the triangular distribution, from memory).
    let (l, c, h) = (0.0, 2.0, 10.0);
    let tri = RangedInput {
        id: "t".into(),
        low: l,
        high: h,
        distribution: Distribution::Triangular { mode: c },
    };
    let r = monte_carlo(&[tri], n, 5, |x| Ok::<_, String>(x[0])).unwrap();
    let var: f64 = (l * l + c * c + h * h - l * c - l * h - c * h) / 18.0;
    assert_abs(
        r.mean,
        (l + c + h) / 3.0,
        4.0 * (var / n as f64).sqrt(),
        "triangular mean",
    );
    // Its distribution function at the mode is (c − l)/(h − l) = 0.2: the share below c.
    let below = r.values.iter().filter(|&&v| v < c).count() as f64 / n as f64;
    assert_abs(
        below,
        0.2,
        4.0 * (0.2f64 * 0.8 / n as f64).sqrt(),
        "F(mode)",
    );

    // Normal(μ, σ) truncated to [l, h], α = (l−μ)/σ, β = (h−μ)/σ, Z = Φ(β) − Φ(α):
    // mean μ + σ(φ(α) − φ(β))/Z, variance σ²[1 + (αφ(α) − βφ(β))/Z − ((φ(α) − φ(β))/Z)²]
    // (Johnson, Kotz & Balakrishnan, Continuous Univariate Distributions vol. 1, §10.1,
    // from memory). Φ and φ here come from libm's erfc and exp.
    let (mu, sd, l, h) = (300.0, 80.0, 250.0, 500.0);
    let nrm = RangedInput {
        id: "n".into(),
        low: l,
        high: h,
        distribution: Distribution::Normal { mean: mu, sd },
    };
    let big_phi = |z: f64| 0.5 * libm::erfc(-z / std::f64::consts::SQRT_2);
    let phi = |z: f64| (-0.5 * z * z).exp() / (2.0 * std::f64::consts::PI).sqrt();
    let (a, b) = ((l - mu) / sd, (h - mu) / sd);
    let z = big_phi(b) - big_phi(a);
    let m = mu + sd * (phi(a) - phi(b)) / z;
    let v = sd * sd * (1.0 + (a * phi(a) - b * phi(b)) / z - ((phi(a) - phi(b)) / z).powi(2));
    let r = monte_carlo(&[nrm], n, 6, |x| Ok::<_, String>(x[0])).unwrap();
    assert_abs(
        r.mean,
        m,
        4.0 * (v / n as f64).sqrt(),
        "truncated normal mean",
    );
    assert!(r.min >= l && r.max <= h);
    // Far in one tail the inverse still lands inside the range (mirrored bisection).
    let tail = RangedInput {
        id: "tail".into(),
        low: 0.0,
        high: 1.0,
        distribution: Distribution::Normal {
            mean: 0.0,
            sd: 1e-3,
        },
    };
    for u in [1e-300, 1e-9, 0.5, 1.0 - 1e-9] {
        let x = tail.quantile(u);
        assert!((0.0..=1.0).contains(&x) && x.is_finite(), "u = {u}: {x}");
    }
    assert!(
        tail.quantile(0.5) < 1e-3,
        "the median of a half-normal of sd 1e-3"
    );
}

#[test]
fn same_seed_same_result_different_seed_different_samples() {
    let inputs = linear_inputs();
    let a = monte_carlo(&inputs, 500, 42, linear).unwrap();
    let b = monte_carlo(&inputs, 500, 42, linear).unwrap();
    assert_eq!(a, b);
    let c = monte_carlo(&inputs, 500, 43, linear).unwrap();
    assert_ne!(a.values, c.values);
    assert_ne!(sample_at(&inputs, 42, 0), sample_at(&inputs, 43, 0));
    // Neighbouring samples of one seed differ too.
    assert_ne!(sample_at(&inputs, 42, 0), sample_at(&inputs, 42, 1));
    // Against an independent implementation: PCG32 and the 53-bit composition written
    // again in Python from O'Neill 2014, the triangular inverse from its formula and the
    // truncated normal through Python's statistics.NormalDist.inv_cdf (Wichura 1988,
    // AS241), not bisection. The uniforms are integer work and must agree to the bit; the
    // same bits are expected on wasm32 (integer arithmetic and libm only).
    let mut u = Vec::new();
    hibernal::physics::ranges::sample_uniforms(42, 0, 3, &mut u);
    let bits: Vec<u64> = u.iter().map(|v| v.to_bits()).collect();
    assert_eq!(
        bits,
        [0x3fdc4c19b3c7a0d5, 0x3fee8484292e448a, 0x3fd0f9fbc90cff61]
    );
    let three = [
        inputs[1].clone(),
        RangedInput {
            id: "t".into(),
            low: 0.0,
            high: 10.0,
            distribution: Distribution::Triangular { mode: 2.0 },
        },
        RangedInput {
            id: "n".into(),
            low: 250.0,
            high: 500.0,
            distribution: Distribution::Normal {
                mean: 300.0,
                sd: 80.0,
            },
        },
    ];
    let s = sample_at(&three, 42, 7);
    assert_eq!(s[0], 13.544945270847322, "uniform, exact");
    assert_rel(s[1], 8.1318713891038, 1e-14, "triangular (sqrt only)");
    // AS241 is good to about 1e-16 relative; bisection to the last bit of z.
    assert_rel(s[2], 356.1239732679238, 1e-13, "truncated normal");
}

#[test]
fn interleaved_batches_merge_to_the_single_thread_result() {
    let inputs = linear_inputs();
    let runs = 301;
    let seed = 9;
    // A trial that fails on some samples, so failures are merged too.
    let trial = |x: &[f64]| {
        if x[0] > 0.97 {
            Err("too high".to_string())
        } else {
            linear(x)
        }
    };
    let single = monte_carlo(&inputs, runs, seed, trial).unwrap();
    assert!(!single.failures.is_empty() && single.failures.len() < 30);
    // The sliced single-thread job gives the same.
    let mut job = MonteCarloJob::new(&inputs, runs, seed, "ranges").unwrap();
    while let Some(s) = job.next_sample() {
        job.record(trial(&s)).unwrap();
    }
    assert_eq!(job.result().unwrap(), single);
    for workers in [2usize, 3] {
        // Each worker computes its own share from (seed, i) alone.
        let shares: Vec<Vec<(usize, Result<f64, String>)>> = (0..workers)
            .map(|w| {
                let job = MonteCarloJob::new(&inputs, runs, seed, "").unwrap();
                (w..runs)
                    .step_by(workers)
                    .map(|i| (i, trial(&job.sample(i).unwrap())))
                    .collect()
            })
            .collect();
        // Merged worker by worker, last worker first (not index order).
        let mut merged = MonteCarloJob::new(&inputs, runs, seed, "").unwrap();
        for share in shares.into_iter().rev() {
            assert!(!merged.finished());
            for (i, v) in share {
                merged.record_at(i, v).unwrap();
            }
        }
        assert_eq!(merged.result().unwrap(), single, "{workers} workers");
    }
}

#[test]
fn job_refuses_bad_records_and_reports_unfinished() {
    let inputs = linear_inputs();
    let mut job = MonteCarloJob::new(&inputs, 3, 1, "").unwrap();
    assert!(matches!(
        job.record(Ok(1.0)),
        Err(MonteCarloError::BadIndex { .. })
    ));
    assert!(matches!(
        job.record_at(3, Ok(1.0)),
        Err(MonteCarloError::BadIndex { index: 3, .. })
    ));
    job.record_at(1, Ok(1.0)).unwrap();
    assert!(job.record_at(1, Ok(2.0)).is_err(), "twice");
    assert_eq!(
        job.result().unwrap_err(),
        MonteCarloError::Unfinished {
            recorded: 1,
            runs: 3
        }
    );
    job.record_at(0, Ok(f64::NAN)).unwrap();
    job.record_at(2, Ok(3.0)).unwrap();
    let r = job.result().unwrap();
    assert_eq!(r.values, [1.0, 3.0]);
    assert_eq!(r.indices, [1, 2]);
    assert_eq!(r.failures.len(), 1);
    assert_eq!(r.failures[0].index, 0);
    // Every run failing is an error, not a NaN result.
    let e = monte_carlo(&inputs, 4, 1, |_| Err::<f64, _>("no")).unwrap_err();
    assert!(matches!(e, MonteCarloError::NoValues { .. }));
}

#[test]
fn bad_inputs_are_refused_naming_the_field() {
    let mut inputs = linear_inputs();
    inputs[2].high = inputs[2].low; // not above low
    inputs[1].distribution = Distribution::Triangular { mode: 20.0 }; // outside [10, 14]
    inputs[0].distribution = Distribution::Normal {
        mean: 0.5,
        sd: -1.0,
    };
    inputs.push(uniform("x0", 0.0, f64::NAN)); // name used twice, high not finite
    let e = MonteCarloJob::new(&inputs, MAX_RUNS + 1, 1, "ranges").unwrap_err();
    let fields: Vec<&str> = e.0.iter().map(|e| e.field.as_str()).collect();
    assert_eq!(
        fields,
        [
            "ranges.inputs[0].distribution.sd",
            "ranges.inputs[1].distribution.mode",
            "ranges.inputs[2].high",
            "ranges.inputs[3].high",
            "ranges.inputs[3].id",
            "ranges.runs",
        ]
    );
    assert_eq!(
        e.0[5].kind,
        InputErrorKind::Count {
            count: MAX_RUNS + 1,
            min: 2,
            max: MAX_RUNS
        }
    );
    assert!(matches!(e.0[1].kind, InputErrorKind::OutOfBounds { value, .. } if value == 20.0));
    // No inputs at all; a nameless input; the one-call form has no prefix.
    let e = monte_carlo(&[], 10, 1, linear).unwrap_err();
    match e {
        MonteCarloError::Input(errs) => {
            assert_eq!(errs.0[0].field, "inputs");
            assert!(matches!(
                errs.0[0].kind,
                InputErrorKind::Count { count: 0, .. }
            ));
        }
        other => panic!("{other:?}"),
    }
    let e = MonteCarloJob::new(&[uniform(" ", 0.0, 1.0)], 10, 1, "").unwrap_err();
    assert_eq!(e.0[0].field, "inputs[0].id");
    // Sampling an input nobody checked gives a number or NaN, never a panic.
    for d in [
        Distribution::Uniform,
        Distribution::Triangular { mode: 3.0 },
        Distribution::Normal {
            mean: f64::NAN,
            sd: 0.0,
        },
    ] {
        let bad = RangedInput {
            id: "bad".into(),
            low: 5.0,
            high: 1.0,
            distribution: d,
        };
        let _ = sample_at(std::slice::from_ref(&bad), 1, 0);
        let _ = bad.quantile(f64::NAN);
    }
}

#[test]
fn one_at_a_time_on_the_linear_function_gives_the_exact_swings_in_order() {
    // ∂y/∂xᵢ = aᵢ, so moving xᵢ from lᵢ to hᵢ swings y by |aᵢ|(hᵢ − lᵢ): 2, 12 and 5.
    // Every number here is exact in binary, so the swings are compared exactly.
    let inputs = linear_inputs();
    let base = [0.5, 12.0, 0.0];
    let s = one_at_a_time(&base, &inputs, linear).unwrap();
    assert_eq!(s.at_base, linear(&base).unwrap());
    let order: Vec<usize> = s.swings.iter().map(|w| w.input).collect();
    assert_eq!(order, [1, 2, 0]);
    let swings: Vec<f64> = s.swings.iter().map(|w| w.swing).collect();
    assert_eq!(swings, [12.0, 5.0, 2.0]);
    let x1 = &s.swings[0];
    assert_eq!(x1.id, "x1");
    assert_eq!(x1.at_low, linear(&[0.5, 10.0, 0.0]).unwrap());
    assert_eq!(x1.at_high, linear(&[0.5, 14.0, 0.0]).unwrap());
    // A base outside its range, or of the wrong length, is refused by field.
    match one_at_a_time(&[0.5, 20.0, 0.0], &inputs, linear) {
        Err(SensitivityError::Input(e)) => assert_eq!(e.0[0].field, "base[1]"),
        other => panic!("{other:?}"),
    }
    match one_at_a_time(&[0.5], &inputs, linear) {
        Err(SensitivityError::Input(e)) => assert_eq!(e.0[0].field, "base"),
        other => panic!("{other:?}"),
    }
    // A failing trial says which input and which end.
    let r = one_at_a_time(&base, &inputs, |x: &[f64]| {
        if x[2] > 4.0 {
            Err("fails")
        } else {
            linear(x).map_err(|_| "never")
        }
    });
    assert_eq!(
        r.unwrap_err(),
        SensitivityError::Trial {
            input: Some(2),
            high: true,
            error: "fails"
        }
    );
}

/// Snow of `density` over frozen-capable silt, air at −25 °C above, +4 °C held 2 m down.
fn snow_over_soil(density: f64, regression: SnowRegression) -> Stack {
    Stack {
        layers: vec![
            Layer {
                name: "snow".into(),
                thickness_m: 0.4,
                material: MaterialSpec::Snow {
                    density_kg_m3: density,
                    regression,
                },
            },
            Layer {
                name: "silt".into(),
                thickness_m: 2.0,
                material: MaterialSpec::Soil(silt_input()),
            },
        ],
        top: Boundary::Air {
            temperature_c: -25.0,
            film_w_m2k: 20.0,
        },
        bottom: Boundary::Surface { temperature_c: 4.0 },
    }
}

#[test]
fn snow_density_range_on_a_steady_stack_stays_between_its_ends() {
    // Sturm et al. 1997 (quadratic, valid 156–600 kg/m³): k rises with density over the
    // range, so R falls. Checked here on a grid rather than assumed.
    let corr = SnowRegression::Sturm1997Quadratic;
    let (lo, hi) = (160.0, 450.0);
    let r_of = |rho: f64| steady::solve(&snow_over_soil(rho, corr)).map(|r| r.r_total_m2k_w);
    let grid: Vec<f64> = (0..=58)
        .map(|i| r_of(lo + 5.0 * i as f64).unwrap())
        .collect();
    assert!(
        grid.windows(2).all(|w| w[1] < w[0]),
        "R strictly decreasing in density: {grid:?}"
    );
    // The 0 °C plane lies in the soil, so the soil's frozen/unfrozen split moves with
    // density too (the case is not a plain sum of constant resistances).
    let mid = steady::solve(&snow_over_soil(300.0, corr)).unwrap();
    assert_eq!(mid.zero_planes.len(), 1);
    assert_eq!(mid.zero_planes[0].layer, 1);

    let inputs = [RangedInput {
        id: "snow-density".into(),
        low: lo,
        high: hi,
        distribution: Distribution::Triangular { mode: 300.0 },
    }];
    let r = monte_carlo(&inputs, 200, 2026, |x| r_of(x[0])).unwrap();
    assert!(r.failures.is_empty());
    let (r_hi_density, r_lo_density) = (r_of(hi).unwrap(), r_of(lo).unwrap());
    for &v in &r.values {
        assert!(
            v >= r_hi_density && v <= r_lo_density,
            "{v} outside {r_hi_density}..{r_lo_density}"
        );
    }
    assert!(r.p10 < r.p50 && r.p50 < r.p90);
    // The range of R across snow regressions (steady::snow_band) holds every regression
    // solved on its own, at both ends and the middle of the density range; the Monte
    // Carlo's regression is one of its members, to the bit.
    for rho in [lo, 300.0, hi] {
        let band = steady::snow_band(&snow_over_soil(rho, corr), &[0.0, 0.4, 1.0]).unwrap();
        let (rmin, rmax) = band.r_total_range();
        for c in SnowRegression::ALL {
            if let Ok(single) = steady::solve(&snow_over_soil(rho, c)) {
                let v = single.r_total_m2k_w;
                assert!(
                    rmin <= v && v <= rmax,
                    "{c:?} at {rho}: {v} not in {rmin}..{rmax}"
                );
            }
        }
        let member = band.members.iter().find(|m| m.regression == corr).unwrap();
        assert_eq!(member.result.r_total_m2k_w, r_of(rho).unwrap());
    }
}
