//! Benchmark: a Monte Carlo of 200 trials of a cheap steady case (snow of uncertain
//! density over silt, R air to surface), the sampler alone, and one reference year, from
//! which the time of 200 reference years on workers is estimated.
//! Run: `cargo bench --bench ranges`.

use hibernal::physics::materials::{MaterialSpec, SnowRegression, SoilInput, SoilModel, Texture};
use hibernal::physics::ranges::{monte_carlo, sample_at, Distribution, RangedInput};
use hibernal::physics::stack::{Boundary, Layer, Stack};
use hibernal::physics::steady;
use hibernal::physics::transient::reference::reference_year;
use hibernal::physics::transient::run::run;
use std::time::Instant;

fn stack(density: f64) -> Stack {
    Stack {
        layers: vec![
            Layer {
                name: "snow".into(),
                thickness_m: 0.4,
                material: MaterialSpec::Snow {
                    density_kg_m3: density,
                    regression: SnowRegression::Sturm1997Quadratic,
                },
            },
            Layer {
                name: "silt".into(),
                thickness_m: 2.0,
                material: MaterialSpec::Soil(SoilInput {
                    texture: Texture::Silt,
                    model: SoilModel::Kersten1949,
                    dry_density_kg_m3: 1600.0,
                    water_content_pct: 20.0,
                    quartz_fraction: 0.3,
                    conductivity_factor: 1.0,
                }),
            },
        ],
        top: Boundary::Air {
            temperature_c: -25.0,
            film_w_m2k: 20.0,
        },
        bottom: Boundary::Surface { temperature_c: 4.0 },
    }
}

fn median(mut t: Vec<f64>) -> f64 {
    t.sort_by(f64::total_cmp);
    t[t.len() / 2]
}

fn main() {
    let inputs = [RangedInput {
        id: "snow-density".into(),
        low: 160.0,
        high: 450.0,
        distribution: Distribution::Triangular { mode: 300.0 },
    }];
    let mut times = Vec::new();
    let mut p = (0.0, 0.0, 0.0);
    for _ in 0..9 {
        let t0 = Instant::now();
        let r = monte_carlo(&inputs, 200, 1, |x| {
            steady::solve(&stack(x[0])).map(|r| r.r_total_m2k_w)
        })
        .expect("runs");
        times.push(t0.elapsed().as_secs_f64());
        p = (r.p10, r.p50, r.p90);
    }
    println!(
        "Monte Carlo, 200 steady trials: median {:.2} ms over 9 (R p10/p50/p90 {:.3}/{:.3}/{:.3} m²K/W)",
        median(times) * 1e3,
        p.0,
        p.1,
        p.2
    );

    let normal: Vec<RangedInput> = (0..4)
        .map(|i| RangedInput {
            id: format!("x{i}"),
            low: 0.0,
            high: 1.0,
            distribution: Distribution::Normal { mean: 0.3, sd: 0.2 },
        })
        .collect();
    let t0 = Instant::now();
    let mut s = 0.0;
    for i in 0..10_000 {
        s += sample_at(&normal, 3, i)[0];
    }
    println!(
        "sampler: 10 000 samples of 4 truncated normal inputs in {:.2} ms (checksum {s:.3})",
        t0.elapsed().as_secs_f64() * 1e3
    );

    let (spec, forcing) = reference_year();
    let mut years = Vec::new();
    for _ in 0..3 {
        let t0 = Instant::now();
        run(&spec, &forcing).expect("reference year runs");
        years.push(t0.elapsed().as_secs_f64());
    }
    let year = median(years);
    println!(
        "reference year: median {:.1} ms over 3; 200 of them ≈ {:.1} s on one thread, ≈ {:.1} s on 2 workers (ideal split, native speed)",
        year * 1e3,
        200.0 * year,
        100.0 * year
    );
}
