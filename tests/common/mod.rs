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
