//! The never-panic fuzzers' shared parts: the numeric leaves of a scenario document, how to
//! replace one, and what to put there.

use proptest::prelude::*;
use serde_json::{json, Value};

/// Paths of every numeric leaf in a JSON value, each below `path`.
pub fn numeric_paths(v: &Value, path: &mut Vec<String>, out: &mut Vec<Vec<String>>) {
    match v {
        Value::Number(_) => out.push(path.clone()),
        Value::Object(m) => {
            for (k, x) in m {
                path.push(k.clone());
                numeric_paths(x, path, out);
                path.pop();
            }
        }
        Value::Array(a) => {
            for (i, x) in a.iter().enumerate() {
                path.push(i.to_string());
                numeric_paths(x, path, out);
                path.pop();
            }
        }
        _ => {}
    }
}

/// Replace the leaf at `path`.
pub fn set(v: &mut Value, path: &[String], new: Value) {
    let mut cur = v;
    for k in path {
        cur = match cur {
            Value::Object(m) => m.get_mut(k).unwrap(),
            Value::Array(a) => &mut a[k.parse::<usize>().unwrap()],
            _ => unreachable!(),
        };
    }
    *cur = new;
}

/// Replace the picked numeric leaves of `v` below the key `section` (the whole document
/// for `None`), each pick an index into those leaves and its new value.
pub fn mutate(v: &mut Value, section: Option<&str>, picks: Vec<(prop::sample::Index, Value)>) {
    let mut paths = Vec::new();
    match section {
        Some(key) => numeric_paths(&v[key], &mut vec![key.to_string()], &mut paths),
        None => numeric_paths(v, &mut Vec::new(), &mut paths),
    }
    for (idx, leaf) in picks {
        let p = idx.get(&paths).clone();
        set(v, &p, leaf);
    }
}

/// Anything for a leaf of a whole document: any number, signed zeros, a tiny one, null, a
/// short string or an empty array.
pub fn any_leaf() -> impl Strategy<Value = Value> {
    prop_oneof![
        (-1e6f64..1e6).prop_map(|x| json!(x)),
        prop::num::f64::NORMAL.prop_map(|x| json!(x)),
        Just(json!(0.0)),
        Just(json!(-0.0)),
        Just(json!(1e-300)),
        Just(Value::Null),
        ".{0,12}".prop_map(Value::String),
        Just(json!([])),
    ]
}

/// Anything for a leaf of a section (edge, shelter): plausible and extreme numbers, whole
/// numbers, zero, a tiny one, null or a string.
pub fn any_section_leaf() -> impl Strategy<Value = Value> {
    prop_oneof![
        (-100f64..100.0).prop_map(|x| json!(x)),
        (0f64..3.0).prop_map(|x| json!(x)),
        prop::num::f64::NORMAL.prop_map(|x| json!(x)),
        (0u32..80).prop_map(|x| json!(x)),
        Just(json!(0.0)),
        Just(json!(1e-300)),
        Just(Value::Null),
        Just(json!("x")),
    ]
}

/// Up to three leaves picked, each with something to put there.
pub fn picks(
    leaf: impl Strategy<Value = Value>,
) -> impl Strategy<Value = Vec<(prop::sample::Index, Value)>> {
    proptest::collection::vec((any::<prop::sample::Index>(), leaf), 1..4)
}
