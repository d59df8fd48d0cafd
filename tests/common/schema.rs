//! Reading the scenario format's JSON Schema by its structure: its definitions, their
//! properties with their types, required lists and enums, and the variants of a tagged
//! union by their `kind`.

use serde_json::Value;

/// The schema as a JSON value (what the `schema` command prints).
pub fn schema() -> Value {
    hibernal::document::scenario::schema()
}

/// A definition of `$defs`, by name.
#[track_caller]
pub fn def<'a>(schema: &'a Value, name: &str) -> &'a Value {
    schema["$defs"]
        .get(name)
        .unwrap_or_else(|| panic!("no definition {name} in $defs"))
}

/// A property of an object definition.
#[track_caller]
pub fn prop<'a>(object: &'a Value, name: &str) -> &'a Value {
    object["properties"]
        .get(name)
        .unwrap_or_else(|| panic!("no property {name} in {object}"))
}

/// The definition a property refers to, directly or as the non-null member of an
/// `anyOf` (an optional section): the name after `#/$defs/`.
#[track_caller]
pub fn refers_to(property: &Value) -> String {
    let direct = property["$ref"].as_str();
    let optional = property["anyOf"]
        .as_array()
        .and_then(|a| a.iter().find_map(|m| m["$ref"].as_str()));
    let r = direct
        .or(optional)
        .unwrap_or_else(|| panic!("no $ref in {property}"));
    r.strip_prefix("#/$defs/")
        .unwrap_or_else(|| panic!("{r} is not a local definition"))
        .to_string()
}

/// Whether a property may be null (an `anyOf` with a null member, or `type` listing null).
pub fn nullable(property: &Value) -> bool {
    let any_null = property["anyOf"]
        .as_array()
        .is_some_and(|a| a.iter().any(|m| m["type"] == "null"));
    let type_null = property["type"]
        .as_array()
        .is_some_and(|t| t.iter().any(|x| x == "null"));
    any_null || type_null
}

/// The `type` of a property (its first, for a list such as ["number", "null"]).
#[track_caller]
pub fn type_of(property: &Value) -> &str {
    match &property["type"] {
        Value::String(s) => s,
        Value::Array(a) => a[0].as_str().unwrap(),
        _ => panic!("no type in {property}"),
    }
}

/// The required list of an object definition.
pub fn required(object: &Value) -> Vec<&str> {
    object["required"]
        .as_array()
        .map(|a| a.iter().filter_map(Value::as_str).collect())
        .unwrap_or_default()
}

/// The values of a string enum definition.
#[track_caller]
pub fn enum_values(def: &Value) -> Vec<&str> {
    assert_eq!(def["type"], "string", "{def} is not a string enum");
    def["enum"]
        .as_array()
        .unwrap_or_else(|| panic!("no enum in {def}"))
        .iter()
        .map(|v| v.as_str().unwrap())
        .collect()
}

/// The `kind`s of a tagged union (a `oneOf` of objects each with a constant `kind`).
#[track_caller]
pub fn kinds(union: &Value) -> Vec<&str> {
    union["oneOf"]
        .as_array()
        .unwrap_or_else(|| panic!("no oneOf in {union}"))
        .iter()
        .map(|v| v["properties"]["kind"]["const"].as_str().unwrap())
        .collect()
}

/// The variant of a tagged union with the given `kind`.
#[track_caller]
pub fn variant<'a>(union: &'a Value, kind: &str) -> &'a Value {
    union["oneOf"]
        .as_array()
        .unwrap_or_else(|| panic!("no oneOf in {union}"))
        .iter()
        .find(|v| v["properties"]["kind"]["const"] == kind)
        .unwrap_or_else(|| panic!("no variant {kind} in {union}"))
}

/// Assert that `object` has each property of `props` with the type given, and that those
/// marked required are in its required list and the others not.
#[track_caller]
pub fn assert_properties(object: &Value, props: &[(&str, &str, bool)]) {
    let req = required(object);
    for &(name, ty, is_required) in props {
        assert_eq!(type_of(prop(object, name)), ty, "type of {name}");
        assert_eq!(req.contains(&name), is_required, "{name} required: {req:?}");
    }
}
