//! Shared test helpers.
#![allow(dead_code)]

use serde_json::Value;

/// Reference values made by tools/reference.py (IAPWS, CoolProp and independent
/// implementations of the published formulas).
pub fn reference() -> Value {
    serde_json::from_str(include_str!("../data/reference.json")).expect("reference.json")
}

/// Closed-form reference values made by tools/analytic_reference.py (scipy brentq and
/// scipy.special erf/erfc/erfcx).
pub fn analytic_reference() -> Value {
    serde_json::from_str(include_str!("../data/analytic_reference.json"))
        .expect("analytic_reference.json")
}

pub fn f(v: &Value, key: &str) -> f64 {
    v[key]
        .as_f64()
        .unwrap_or_else(|| panic!("{key} missing in {v}"))
}

/// |a − b| ≤ rel·|b|, with a message.
#[track_caller]
pub fn assert_rel(a: f64, b: f64, rel: f64, what: &str) {
    assert!(
        (a - b).abs() <= rel * b.abs(),
        "{what}: got {a}, expected {b} (relative tolerance {rel}, off by {:.3e})",
        ((a - b) / b).abs()
    );
}

#[track_caller]
pub fn assert_abs(a: f64, b: f64, tol: f64, what: &str) {
    assert!(
        (a - b).abs() <= tol,
        "{what}: got {a}, expected {b} (tolerance {tol})"
    );
}

/// The published soil example of the model reference (Lunardini 1981, after Jumikis 1966):
/// surface −10 °C over ground at +2 °C; front about 3.6 cm/h^½, ≈ 1.36 m after 60 days.
pub fn lunardini_soil() -> hibernal::analytic::NeumannProblem {
    hibernal::analytic::NeumannProblem {
        surface_c: -10.0,
        initial_c: 2.0,
        freezing_c: 0.0,
        k_frozen: 2.324,
        k_unfrozen: 1.860,
        c_frozen_j_m3k: 1.966e6,
        c_unfrozen_j_m3k: 2.862e6,
        latent_j_m3: 1.1045e8,
    }
}
