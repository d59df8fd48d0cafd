//! The steady solver against closed forms. Each check names its source. Its check against
//! the series formula of a layered stack is in tests/closed_form.rs, beside the other
//! solvers'.

mod common;
use common::*;

use hibernal::physics::materials::{MaterialSpec, SnowRegression, SoilInput, SoilModel, Texture};
use hibernal::physics::stack::{Boundary, Stack, MAX_LAYERS};
use hibernal::physics::steady::{self, LayerState};
use proptest::prelude::*;

#[test]
fn a_soil_layer_splits_at_its_0c_plane_self_consistently() {
    // Two-region steady conduction with held faces: k_f (0 − T_s)/X = k_u (T_b − 0)/(d − X),
    // so X = d k_f |T_s| / (k_f |T_s| + k_u T_b) (standard, by flux continuity).
    let soil = silt_input();
    let mut w = Vec::new();
    let p = hibernal::physics::materials::soil::soil_properties(&soil, "m", &mut w).unwrap();
    let (kf, ku) = (p.k_frozen_w_m_k, p.k_unfrozen_w_m_k);
    assert!(
        (kf - ku).abs() > 0.2,
        "the test needs distinct k: {kf} {ku}"
    );
    let d = 3.0;
    let (ts, tb) = (-10.0, 4.0);
    let stack = Stack {
        layers: vec![layer(d, MaterialSpec::Soil(soil))],
        top: Boundary::Surface { temperature_c: ts },
        bottom: Boundary::Surface { temperature_c: tb },
    };
    let r = steady::solve(&stack).unwrap();
    let x = d * kf * 10.0 / (kf * 10.0 + ku * 4.0);
    assert_eq!(r.zero_planes.len(), 1);
    assert_abs(r.zero_planes[0].depth_m, x, 1e-9, "0 °C plane depth");
    assert!(r.zero_planes[0].frozen_above);
    assert_eq!(r.layers[0].state, LayerState::PartlyFrozen);
    assert_rel(r.heat_flux_w_m2, -kf * 10.0 / x, 1e-9, "flux");
    // The plane moves when k changes: with k_u = k_f it would sit at d·10/14.
    assert!((x - d * 10.0 / 14.0).abs() > 0.05);
}

#[test]
fn ice_with_temperature_dependent_k_matches_direct_integration() {
    // Steady conduction with k(T): q d = ∫_{T_b}^{T_t} k(T) dT (Carslaw & Jaeger 1959, §1.7).
    // Here the integral is done independently by Simpson's rule on k(T).
    let stack = Stack {
        layers: vec![layer(0.5, MaterialSpec::Ice)],
        top: Boundary::Surface {
            temperature_c: -40.0,
        },
        bottom: Boundary::Surface { temperature_c: 0.0 },
    };
    let r = steady::solve(&stack).unwrap();
    let n = 2000;
    let (a, b) = (-40.0f64, 0.0f64);
    let h = (b - a) / n as f64;
    let k = hibernal::physics::materials::ice::ice_conductivity_w_m_k;
    let mut s = k(a) + k(b);
    for i in 1..n {
        s += k(a + i as f64 * h) * if i % 2 == 1 { 4.0 } else { 2.0 };
    }
    let integral = s * h / 3.0;
    assert_rel(-r.heat_flux_w_m2 * 0.5, integral, 1e-10, "q d = ∫k dT");
    // Ice conducts better when colder, so the gradient q/k is gentlest on the cold side and
    // the midpoint is colder than the straight line between the faces.
    assert!(r.temperature_at(0.25) < -20.0);
}

#[test]
fn water_under_cold_air_freezes_to_a_steady_ice_cover() {
    // Water layer: ice branch above the 0 °C plane, water below; ice thickness X follows
    // q = ∫k_ice dT / X = k_w (T_b − 0)/(d − X).
    let stack = Stack {
        layers: vec![layer(2.0, MaterialSpec::Water)],
        top: Boundary::Surface {
            temperature_c: -10.0,
        },
        bottom: Boundary::Surface { temperature_c: 4.0 },
    };
    let r = steady::solve(&stack).unwrap();
    let x = r.zero_planes[0].depth_m;
    let phi_ice = -hibernal::physics::materials::ice::ice_kirchhoff_w_m(-10.0);
    let q = -r.heat_flux_w_m2;
    assert_rel(q, phi_ice / x, 1e-9, "flux through the ice");
    assert_rel(q, 0.556 * 4.0 / (2.0 - x), 1e-9, "flux through the water");
}

#[test]
fn the_band_holds_every_regression_and_the_chosen_one() {
    let mk = |c| Stack {
        layers: vec![
            layer(
                0.4,
                MaterialSpec::Snow {
                    density_kg_m3: 320.0,
                    regression: c,
                },
            ),
            layer(
                1.5,
                MaterialSpec::Soil(SoilInput {
                    texture: Texture::Sand,
                    model: SoilModel::Johansen1975,
                    dry_density_kg_m3: 1650.0,
                    water_content_pct: 10.0,
                    quartz_fraction: 0.6,
                    conductivity_factor: 1.0,
                }),
            ),
        ],
        top: Boundary::Air {
            temperature_c: -30.0,
            film_w_m2k: 20.0,
        },
        bottom: Boundary::Surface { temperature_c: 2.0 },
    };
    let stack = mk(SnowRegression::Calonne2011);
    let base = steady::solve(&stack).unwrap();
    let depths = base.profile_depths(16);
    let band = steady::snow_band(&stack, &depths).unwrap();
    assert_eq!(band.members.len(), 9);
    let (rlo, rhi) = band.r_total_range();
    for c in SnowRegression::ALL {
        let single = steady::solve(&mk(c)).unwrap();
        assert!(single.r_total_m2k_w >= rlo - 1e-12 && single.r_total_m2k_w <= rhi + 1e-12);
        for (j, &z) in depths.iter().enumerate() {
            let t = single.temperature_at(z);
            assert!(
                t >= band.min_c[j] - 1e-9 && t <= band.max_c[j] + 1e-9,
                "{c:?} at {z}"
            );
        }
    }
    assert!(
        rhi / rlo > 1.2,
        "the band is not trivially narrow: {rlo}..{rhi}"
    );
}

#[test]
fn bad_stacks_are_refused_naming_the_field() {
    let good = || Stack {
        layers: vec![layer(0.1, custom(1.0))],
        top: Boundary::Surface {
            temperature_c: -5.0,
        },
        bottom: Boundary::Surface { temperature_c: 5.0 },
    };
    let field_of = |s: Stack| steady::solve(&s).unwrap_err().to_string();

    let mut s = good();
    s.layers[0].thickness_m = 0.0;
    assert!(field_of(s).contains("layers[0].thickness_m"));
    let mut s = good();
    s.layers[0].thickness_m = -0.2;
    assert!(field_of(s).contains("layers[0].thickness_m"));
    let mut s = good();
    s.layers[0].thickness_m = f64::NAN;
    assert!(field_of(s).contains("finite"));
    let mut s = good();
    s.layers.clear();
    assert!(field_of(s).contains("layers"));
    let mut s = good();
    s.layers = vec![layer(0.1, custom(1.0)); MAX_LAYERS + 1];
    assert!(field_of(s).contains("65 is not allowed"));
    let mut s = good();
    s.top = Boundary::Air {
        temperature_c: -5.0,
        film_w_m2k: -3.0,
    };
    assert!(field_of(s).contains("top.film_w_m2k"));
    let mut s = good();
    s.bottom = Boundary::Surface {
        temperature_c: 500.0,
    };
    assert!(field_of(s).contains("bottom.temperature_c"));
    // All errors are reported at once.
    let mut s = good();
    s.layers = vec![layer(-1.0, custom(1.0)), layer(0.0, custom(1.0))];
    let e = field_of(s);
    assert!(
        e.contains("layers[0].thickness_m") && e.contains("layers[1].thickness_m"),
        "{e}"
    );
}

#[test]
fn equal_face_temperatures_give_no_flux() {
    let s = Stack {
        layers: vec![layer(0.2, custom(0.5)), layer(0.3, MaterialSpec::Ice)],
        top: Boundary::Air {
            temperature_c: -7.0,
            film_w_m2k: 10.0,
        },
        bottom: Boundary::Surface {
            temperature_c: -7.0,
        },
    };
    let r = steady::solve(&s).unwrap();
    assert_eq!(r.heat_flux_w_m2, 0.0);
    assert!(r
        .layers
        .iter()
        .all(|l| l.top_c == -7.0 && l.bottom_c == -7.0));
}

fn arb_material() -> impl Strategy<Value = MaterialSpec> {
    prop_oneof![
        (0.02f64..3.0, proptest::option::of(0.02f64..3.0)).prop_map(|(k, kf)| {
            MaterialSpec::Custom {
                label: String::new(),
                conductivity_w_m_k: k,
                frozen_conductivity_w_m_k: kf,
                density_kg_m3: 1000.0,
                specific_heat_j_kg_k: 1000.0,
            }
        }),
        (120.0f64..550.0, 0usize..9).prop_map(|(rho, i)| MaterialSpec::Snow {
            density_kg_m3: rho,
            regression: SnowRegression::ALL[i],
        }),
        Just(MaterialSpec::Ice),
        Just(MaterialSpec::Water),
        Just(MaterialSpec::Air),
        (1300.0f64..1900.0, 0.1f64..0.9, 0usize..4, 0usize..3).prop_map(|(rho, s, t, m)| {
            let texture = Texture::ALL[t];
            let wsat =
                hibernal::physics::materials::soil::saturation_water_content_pct(texture, rho);
            MaterialSpec::Soil(SoilInput {
                texture,
                model: SoilModel::ALL[m],
                dry_density_kg_m3: rho,
                water_content_pct: (wsat * s).max(8.0).min(wsat),
                quartz_fraction: 0.4,
                conductivity_factor: 1.0,
            })
        }),
    ]
}

fn arb_boundary() -> impl Strategy<Value = Boundary> {
    prop_oneof![
        (-50.0f64..30.0, 2.0f64..60.0).prop_map(|(t, h)| Boundary::Air {
            temperature_c: t,
            film_w_m2k: h
        }),
        (-50.0f64..30.0).prop_map(|t| Boundary::Surface { temperature_c: t }),
    ]
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 400, ..ProptestConfig::default() })]

    /// Energy conservation: the flux computed independently from each layer's end
    /// temperatures (Φ(T_top) − Φ(T_bottom))/d, and through each film, is one number; and
    /// the profile is monotone from the warm face to the cold face.
    #[test]
    fn flux_is_the_same_through_every_layer_and_the_profile_is_monotone(
        layers in proptest::collection::vec((0.01f64..2.0, arb_material()), 1..8),
        top in arb_boundary(),
        bottom in arb_boundary(),
    ) {
        let stack = Stack {
            layers: layers.into_iter().map(|(d, m)| layer(d, m)).collect(),
            top,
            bottom,
        };
        let r = steady::solve(&stack).unwrap();
        let q = r.heat_flux_w_m2;
        let scale = q.abs().max(1e-6);
        for (i, (l, m)) in r.layers.iter().zip(&r.stack.materials).enumerate() {
            let d = l.bottom_depth_m - l.top_depth_m;
            let (pt, pb) = (m.conductivity.phi(l.top_c), m.conductivity.phi(l.bottom_c));
            let qi = (pt - pb) / d;
            // Besides the solver's 1e-8, the difference of two Φ values carries their
            // round-off (64 ulp of each, divided by the thickness): it matters when the
            // flux is tiny beside Φ (nearly equal face temperatures far from 0 °C).
            let roundoff = 64.0 * f64::EPSILON * (pt.abs() + pb.abs()) / d;
            prop_assert!((qi - q).abs() <= 1e-8 * scale + roundoff, "layer {}: {} vs {}", i, qi, q);
        }
        if let Boundary::Air { temperature_c, film_w_m2k } = top {
            let qf = film_w_m2k * (temperature_c - r.top.surface_c);
            let roundoff = 64.0 * f64::EPSILON * film_w_m2k * (temperature_c.abs() + r.top.surface_c.abs());
            prop_assert!((qf - q).abs() <= 1e-8 * scale + roundoff, "top film: {} vs {}", qf, q);
        }
        if let Boundary::Air { temperature_c, film_w_m2k } = bottom {
            let qf = film_w_m2k * (r.bottom.surface_c - temperature_c);
            let roundoff = 64.0 * f64::EPSILON * film_w_m2k * (temperature_c.abs() + r.bottom.surface_c.abs());
            prop_assert!((qf - q).abs() <= 1e-8 * scale + roundoff, "bottom film: {} vs {}", qf, q);
        }
        let prof = r.profile_at(&r.profile_depths(12));
        let sign = -q.signum();
        for w in prof.windows(2) {
            prop_assert!(sign * (w[1].1 - w[0].1) >= -1e-9, "not monotone: {:?}", w);
        }
        // Each reported 0 °C plane really is at 0 °C.
        for p in &r.zero_planes {
            prop_assert!(r.temperature_at(p.depth_m).abs() < 1e-7);
        }
    }
}
