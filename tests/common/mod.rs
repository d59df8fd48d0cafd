//! Shared test helpers.
#![allow(dead_code)]

use hibernal::physics::materials::{
    Branch, ConductivityLaw, Family, Material, MaterialSpec, SoilInput, SoilModel, Texture,
};
use hibernal::physics::stack::Layer;
use hibernal::physics::transient::grid::GridSpec;
use hibernal::physics::transient::{cells_for, Solver};
use serde_json::Value;

pub mod fuzz;
pub mod schema;

// ------------------------------------------------------------------- material builders

/// A material of constant conductivities and heat capacities that freezes at 0 °C when
/// `latent` > 0 (an invented test material).
pub fn material(k_f: f64, k_u: f64, c_f: f64, c_u: f64, latent: f64) -> Material {
    Material {
        family: Family::Custom,
        label: "test".into(),
        conductivity: ConductivityLaw {
            frozen: Branch::Constant(k_f),
            unfrozen: Branch::Constant(k_u),
        },
        freezes: latent > 0.0,
        density_kg_m3: 1800.0,
        c_frozen_j_m3k: c_f,
        c_unfrozen_j_m3k: c_u,
        latent_j_m3: latent,
        valid_temperature_c: (-100.0, 100.0),
    }
}

/// A custom material of one conductivity as the format gives it (ρ 1000 kg/m³, c 1000
/// J/kg/K: invented).
pub fn custom(k: f64) -> MaterialSpec {
    MaterialSpec::Custom {
        label: String::new(),
        conductivity_w_m_k: k,
        frozen_conductivity_w_m_k: None,
        density_kg_m3: 1000.0,
        specific_heat_j_kg_k: 1000.0,
    }
}

/// The invented silt of the tests: Kersten 1949, 1600 kg/m³ dry, 20 % water, quartz 0.3.
pub fn silt_input() -> SoilInput {
    SoilInput {
        texture: Texture::Silt,
        model: SoilModel::Kersten1949,
        dry_density_kg_m3: 1600.0,
        water_content_pct: 20.0,
        quartz_fraction: 0.3,
        conductivity_factor: 1.0,
    }
}

pub fn silt_spec() -> MaterialSpec {
    MaterialSpec::Soil(silt_input())
}

/// The silt, resolved.
pub fn silt() -> Material {
    silt_spec().resolve("silt", &mut Vec::new()).unwrap()
}

/// The invented demo edge section with or without its vertical board, its wing and its
/// heating (unheated: a closed floor).
pub fn demo_section(
    wall_board: bool,
    wing: bool,
    heated: bool,
) -> hibernal::physics::edge2d::EdgeSection {
    let mut s = hibernal::physics::edge2d::demo::design_winter_section();
    if !wall_board {
        s.wall_board = None;
    }
    if !wing {
        s.wing = None;
    }
    if !heated {
        s.inside = hibernal::physics::edge2d::Inside::Closed;
    }
    s
}

// ---------------------------------------------------------------------- stack builders

/// An unnamed layer of a stack.
pub fn layer(d: f64, m: MaterialSpec) -> Layer {
    Layer {
        name: String::new(),
        thickness_m: d,
        material: m,
    }
}

/// A column of the 1D solver over `(thickness, material)` layers, none freezing over a
/// range, at a uniform start.
pub fn column(layers: &[(f64, Material)], grid: GridSpec, initial_c: f64) -> Solver {
    let d: Vec<f64> = layers.iter().map(|l| l.0).collect();
    let m: Vec<Material> = layers.iter().map(|l| l.1.clone()).collect();
    Solver::new(cells_for(&d, &m, &grid, &[]), initial_c)
}

/// The command-line tool built with the tests.
pub fn cli() -> std::process::Command {
    std::process::Command::new(env!("CARGO_BIN_EXE_hibernal"))
}

/// A folder for one test's files, `hibernal-<tag>-<process id>` in the system's temporary
/// folder, created.
pub fn test_dir(tag: &str) -> std::path::PathBuf {
    let dir = std::env::temp_dir().join(format!("hibernal-{tag}-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    dir
}

/// Writes the bundled example `id`, as `hibernal example` prints it, to `file`.
pub fn write_example(id: &str, file: &std::path::Path) {
    let out = cli().args(["example", id]).output().unwrap();
    assert!(out.status.success(), "hibernal example {id}");
    std::fs::write(file, &out.stdout).unwrap();
}

/// Runs the command, asserting that it succeeded (its standard error shown if not), and
/// reads the report it prints.
#[track_caller]
pub fn report_of(cmd: &mut std::process::Command) -> Value {
    let out = cmd.output().unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).unwrap()
}

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
pub fn lunardini_soil() -> hibernal::physics::analytic::NeumannProblem {
    hibernal::physics::analytic::NeumannProblem {
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

/// Checks that `svg` is well-formed XML of one `<svg>` root: every tag closed in order,
/// attributes quoted, no stray `<` and only entity references after `&`. (A small checker
/// rather than an XML crate: the charts use no DTD, CDATA or namespaces.)
pub fn check_xml(svg: &str) -> Result<(), String> {
    fn check_text(t: &str) -> Result<(), String> {
        let mut rest = t;
        while let Some(i) = rest.find('&') {
            let after = &rest[i + 1..];
            let end = after.find(';').ok_or("& without ;")?;
            let name = &after[..end];
            let ok = matches!(name, "lt" | "gt" | "amp" | "quot" | "apos")
                || (name.starts_with('#') && name.len() > 1);
            if !ok {
                return Err(format!("bad entity &{name};"));
            }
            rest = &after[end + 1..];
        }
        if t.contains('>') && t.contains("]]>") {
            return Err("]]> in text".into());
        }
        Ok(())
    }
    let mut stack: Vec<String> = Vec::new();
    let mut roots = 0;
    let mut rest = svg;
    while let Some(open) = rest.find('<') {
        check_text(&rest[..open])?;
        if stack.is_empty() && !rest[..open].trim().is_empty() {
            return Err("text outside the root".into());
        }
        rest = &rest[open..];
        if let Some(r) = rest.strip_prefix("<?") {
            let end = r.find("?>").ok_or("unclosed <?")?;
            rest = &r[end + 2..];
            continue;
        }
        if let Some(r) = rest.strip_prefix("<!--") {
            let end = r.find("-->").ok_or("unclosed comment")?;
            rest = &r[end + 3..];
            continue;
        }
        let close = rest.find('>').ok_or("unclosed tag")?;
        let tag = &rest[1..close];
        rest = &rest[close + 1..];
        if tag.contains('<') {
            return Err(format!("< inside a tag: {tag}"));
        }
        if let Some(name) = tag.strip_prefix('/') {
            let top = stack.pop().ok_or(format!("</{name}> with nothing open"))?;
            if top != name.trim() {
                return Err(format!("</{name}> closes <{top}>"));
            }
            continue;
        }
        let self_closing = tag.ends_with('/');
        let body = tag.trim_end_matches('/');
        let name_end = body.find(char::is_whitespace).unwrap_or(body.len());
        let name = &body[..name_end];
        if name.is_empty()
            || !name
                .chars()
                .all(|c| c.is_alphanumeric() || "-_:.".contains(c))
        {
            return Err(format!("bad element name {name:?}"));
        }
        // Attributes: name="value" (or 'value'), separated by white space.
        let mut attrs = body[name_end..].trim_start();
        let mut seen = Vec::new();
        while !attrs.is_empty() {
            let eq = attrs
                .find('=')
                .ok_or(format!("attribute without = in <{name}>"))?;
            let an = attrs[..eq].trim();
            if an.is_empty() || an.contains(char::is_whitespace) {
                return Err(format!("bad attribute name {an:?} in <{name}>"));
            }
            if seen.contains(&an) {
                return Err(format!("attribute {an} twice in <{name}>"));
            }
            seen.push(an);
            let v = attrs[eq + 1..].trim_start();
            let q = v.chars().next().ok_or("attribute without value")?;
            if q != '"' && q != '\'' {
                return Err(format!("unquoted attribute {an} in <{name}>"));
            }
            let end = v[1..].find(q).ok_or("unterminated attribute")?;
            check_text(&v[1..1 + end])?;
            attrs = v[end + 2..].trim_start();
        }
        if stack.is_empty() {
            roots += 1;
            if name != "svg" {
                return Err(format!("root element {name}"));
            }
        }
        if !self_closing {
            stack.push(name.to_string());
        }
    }
    check_text(rest)?;
    if !rest.trim().is_empty() {
        return Err("text after the root".into());
    }
    if let Some(open) = stack.pop() {
        return Err(format!("<{open}> never closed"));
    }
    if roots != 1 {
        return Err(format!("{roots} root elements"));
    }
    Ok(())
}

#[track_caller]
pub fn assert_well_formed(svg: &str) {
    if let Err(e) = check_xml(svg) {
        panic!("not well-formed XML: {e}");
    }
}
