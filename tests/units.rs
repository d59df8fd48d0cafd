//! Unit conversions against NIST SP 811 (2008), Appendix B.

mod common;
use common::*;

use hibernal::physics::units::{quantity, UnitSystem, QUANTITIES};

#[test]
fn r_value_and_conductivity_conversions() {
    let r = quantity("r_value").unwrap();
    // 1 h·ft²·°F/Btu = 0.176 110 2 m²·K/W (NIST SP 811).
    assert_rel(r.show(UnitSystem::Us, 0.1761102), 1.0, 1e-6, "R");
    let k = quantity("conductivity").unwrap();
    // R-5 per inch: k = 0.0254 m / (5 × 0.1761102 m²K/W) = 0.028 846 W/m/K → 0.2 Btu·in/(h·ft²·°F).
    assert_rel(
        k.show(UnitSystem::Us, 0.0254 / (5.0 * 0.1761102)),
        0.2,
        1e-6,
        "k",
    );
    let h = quantity("film").unwrap();
    assert_rel(h.show(UnitSystem::Us, 5.678263), 1.0, 1e-7, "film");
    let q = quantity("heat_flux").unwrap();
    assert_rel(q.show(UnitSystem::Us, 3.154591), 1.0, 1e-7, "flux");
    // 1 Btu_IT/(lb·°F) = 4186.8 J/(kg·K).
    let c = quantity("specific_heat").unwrap();
    assert_rel(c.show(UnitSystem::Us, 4186.8), 1.0, 1e-12, "specific heat");
    let rho = quantity("density").unwrap();
    assert_rel(rho.show(UnitSystem::Us, 16.018463), 1.0, 1e-7, "density");
}

#[test]
fn temperatures_and_lengths() {
    let t = quantity("temperature").unwrap();
    assert_abs(
        t.show(UnitSystem::Us, -40.0),
        -40.0,
        1e-12,
        "−40 °C = −40 °F",
    );
    assert_abs(t.show(UnitSystem::Us, 0.0), 32.0, 1e-12, "0 °C");
    assert_abs(t.to_si(UnitSystem::Us, 212.0), 100.0, 1e-12, "212 °F");
    assert_rel(
        quantity("depth").unwrap().show(UnitSystem::Us, 0.3048),
        1.0,
        1e-12,
        "ft",
    );
    assert_rel(
        quantity("thickness").unwrap().show(UnitSystem::Us, 0.0254),
        1.0,
        1e-12,
        "in",
    );
    assert_rel(
        quantity("thickness").unwrap().show(UnitSystem::Si, 0.05),
        5.0,
        1e-12,
        "cm",
    );
}

#[test]
fn every_quantity_round_trips() {
    for q in &QUANTITIES {
        for sys in [UnitSystem::Si, UnitSystem::Us] {
            for v in [-30.0, 0.0, 0.0288, 1.7, 350.0] {
                assert_abs(
                    q.to_si(sys, q.show(sys, v)),
                    v,
                    1e-9 * (1.0 + v.abs()),
                    q.id,
                );
            }
        }
    }
}
