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

// ---------- values as the trade writes them ----------
// Expected strings worked by hand from the definitions 1 in = 0.0254 m and 1 ft = 12 in
// (NIST SP 811 B.8); the precisions are the rule of `physics::units::written`.

use hibernal::physics::units::{read, read_feet_inches, read_number, write, Form, Rounding};

fn us(id: &str, si: f64) -> String {
    write(
        quantity(id).unwrap(),
        UnitSystem::Us,
        si,
        Rounding::Nearest,
        Form::Input,
    )
}
fn us_text(id: &str, si: f64, rounding: Rounding) -> String {
    write(
        quantity(id).unwrap(),
        UnitSystem::Us,
        si,
        rounding,
        Form::Text,
    )
    .replace('\u{a0}', " ")
}

#[test]
fn board_and_layer_thicknesses_are_written_in_eighths_of_an_inch() {
    // 0.1 m = 3.937 in → 31.496 eighths → 31 eighths = 3 7/8 in.
    assert_eq!(us("thickness", 0.1), "3 7/8");
    // 6 m = 236.22 in → 1889.8 eighths → 1890 = 236 2/8 = 236 1/4.
    assert_eq!(us("thickness", 6.0), "236 1/4");
    // 2 in, 1 1/2 in, 7/8 in, 3/4 in exactly.
    assert_eq!(us("thickness", 2.0 * 0.0254), "2");
    assert_eq!(us("thickness", 1.5 * 0.0254), "1 1/2");
    assert_eq!(us("thickness", 0.875 * 0.0254), "7/8");
    assert_eq!(
        us_text("thickness", 0.75 * 0.0254, Rounding::Nearest),
        "3/4 in"
    );
    // 0.01 m = 0.3937 in = 3.15 eighths → 3/8.
    assert_eq!(us("thickness", 0.01), "3/8");
    // Rounded up, a least value is never short: 0.0998 m (31.43 eighths) → 4 in; exactly 2 in stays.
    assert_eq!(us_text("thickness", 0.0998, Rounding::Up), "4 in");
    assert_eq!(us_text("thickness", 2.0 * 0.0254, Rounding::Up), "2 in");
    assert_eq!(us_text("thickness", 0.050_81, Rounding::Up), "2 1/8 in");
    // SI keeps the table's decimals (cm to 0.1).
    let t = quantity("thickness").unwrap();
    assert_eq!(
        write(t, UnitSystem::Si, 0.1234, Rounding::Nearest, Form::Text),
        "12.3\u{a0}cm"
    );
}

#[test]
fn depths_and_lengths_are_written_in_feet_and_inches_to_the_inch() {
    // 0.45 m = 17.72 in → 18 in = 1 ft 6 in.
    assert_eq!(us_text("depth", 0.45, Rounding::Nearest), "1 ft 6 in");
    // 0.66 m = 25.98 in → 26 in = 2 ft 2 in.
    assert_eq!(us_text("depth", 0.66, Rounding::Nearest), "2 ft 2 in");
    // 1.2192 m = 48 in exactly.
    assert_eq!(us("depth", 1.2192), "4 ft 0 in");
    // 0.15 m = 5.91 in → 6 in (under a foot: inches alone).
    assert_eq!(us("depth", 0.15), "6 in");
    // 0.45 m = 1.4764 ft → 1 ft 6 in in an input box too, with plain spaces.
    assert_eq!(us("depth", 0.45), "1 ft 6 in");
    assert_eq!(us("length", 0.6096), "2 ft 0 in");
    // 11.6 in rounds to 12 in: 1 ft 0 in, not 0 ft 12 in.
    assert_eq!(us("depth", 11.6 * 0.0254), "1 ft 0 in");
    // Rounded up: 1.01 in → 2 in.
    assert_eq!(us_text("depth", 1.01 * 0.0254, Rounding::Up), "2 in");
    // Negative (above a base): the typographic minus in text, the typed one in an input.
    assert_eq!(
        us_text("depth", -0.3048, Rounding::Nearest),
        "\u{2212}1 ft 0 in"
    );
    assert_eq!(us("depth", -0.3048), "-1 ft 0 in");
    assert_eq!(us("thickness", -2.0 * 0.0254), "-2");
    // Not finite: a dash.
    assert_eq!(us("depth", f64::NAN), "\u{2013}");
}

#[test]
fn other_us_quantities_keep_their_decimals_and_si_is_unchanged() {
    // 1900 kg/m³ = 118.613 lb/ft³ → 118.6; −12.3 °C = 9.86 °F → 9.9; R 0.88 m²K/W =
    // 4.997 ft²·°F·h/Btu → 5.0.
    assert_eq!(us("density", 1900.0), "118.6");
    assert_eq!(us("temperature", -12.3), "9.9");
    assert_eq!(
        us_text("r_value", 0.88, Rounding::Nearest),
        "5.0 ft²·°F·h/Btu"
    );
    // −0.02 °F reads 0.0, not −0.0.
    assert_eq!(us("temperature", -17.7889), "0.0");
    let d = quantity("depth").unwrap();
    assert_eq!(
        write(d, UnitSystem::Si, 1.5, Rounding::Nearest, Form::Text),
        "1.500\u{a0}m"
    );
}

#[test]
fn feet_and_inches_read_as_people_type_them() {
    let cases: [(&str, bool, f64); 16] = [
        ("2 ft 3 in", false, 27.0),
        ("2' 3\"", false, 27.0),
        ("2'3\"", false, 27.0),
        ("2'-3 1/2\"", false, 27.5),
        ("27 in", false, 27.0),
        ("27\"", false, 27.0),
        ("2 ft", false, 24.0),
        ("2.25", false, 27.0),
        ("2,5", false, 30.0),
        ("2' 3", false, 27.0),
        ("3 1/2", true, 3.5),
        ("3-1/2", true, 3.5),
        ("7/8", true, 0.875),
        ("1 ft 2 inches", true, 14.0),
        ("\u{2212}6 in", false, -6.0),
        ("2 feet 3 inches", false, 27.0),
    ];
    for (text, bare_in, inches) in cases {
        assert_eq!(read_feet_inches(text, bare_in), Some(inches), "{text}");
    }
    for bad in [
        "",
        "ft",
        "2 ft 3 ft",
        "3 in 2 ft",
        "3/0",
        "1/2/3",
        "two",
        "2 3",
        "--2",
        "3 in 4",
    ] {
        assert_eq!(read_feet_inches(bad, true), None, "{bad:?}");
    }
    // Odd text and extreme values never panic.
    for odd in ["'", "\"", "\u{2212}", "1e400"] {
        assert_eq!(read_feet_inches(odd, false), None, "{odd:?}");
    }
    for v in [f64::INFINITY, -1e300, 1e300] {
        let _ = us("depth", v);
        let _ = us_text("thickness", v, Rounding::Up);
    }
    assert_eq!(read_number("1,5"), Some(1.5));
    assert_eq!(read_number("1e-3"), Some(1e-3));
    assert_eq!(read_number("1.2.3"), None);
}

#[test]
fn what_is_typed_in_us_units_is_stored_as_its_exact_conversion() {
    let t = quantity("thickness").unwrap();
    let d = quantity("depth").unwrap();
    // 3 1/2 in = 0.0889 m; 2 ft 3 in = 27 in = 0.6858 m (inches × 0.0254, exact in decimal;
    // the same float as the product).
    assert_eq!(read(t, UnitSystem::Us, "3 1/2"), Some(3.5 * 0.0254));
    assert_eq!(read(d, UnitSystem::Us, "2 ft 3 in"), Some(27.0 * 0.0254));
    assert_eq!(read(d, UnitSystem::Us, "2' 3\""), Some(27.0 * 0.0254));
    // A shown value read back is the value shown: 0.45 m shows 1 ft 6 in, which reads 18 in.
    assert_eq!(
        read(d, UnitSystem::Us, &us("depth", 0.45)),
        Some(18.0 * 0.0254)
    );
    // Decimal quantities convert through the table: 32 °F = 0 °C.
    let temp = quantity("temperature").unwrap();
    assert_abs(
        read(temp, UnitSystem::Us, "32").unwrap(),
        0.0,
        1e-12,
        "32 °F",
    );
    assert_eq!(read(temp, UnitSystem::Us, "cold"), None);
    // SI thickness is in cm.
    assert_abs(read(t, UnitSystem::Si, "5").unwrap(), 0.05, 1e-15, "5 cm");
}
