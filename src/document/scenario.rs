//! The root of the scenario document (versioned JSON): the stack, its faces and the
//! optional sections, read with field paths, and its JSON Schema. Between the core and its
//! faces (page, CLI): serialisable mirrors of the core types, which know nothing of the
//! format.
//!
//! Format: `{"format": "hibernal-scenario", "version": 6, ...}`, all values SI with the
//! unit in the key (`thickness_m`, `film_w_m2k`). Version 2 adds the optional `winter`
//! section (a transient run of the same stack, [`crate::document::winter`]); version 3 the
//! optional `shelter` section (a snow shelter, [`crate::document::shelter`], which stands
//! on its own beside the stack); version 4 the optional `edge` section (a building's edge
//! in 2D, [`crate::document::edge`], also on its own); version 5 the optional `ranges`
//! section (uncertain inputs, [`crate::document::ranges`]) and a soil's
//! `conductivity_factor`; version 6 the deep boundary's `at_layers_bottom` (without it, the
//! deepest layer is continued below, see [`crate::document::weather::DeepDoc`]) and an
//! n-factor surface's `preset`.
//!
//! **Versions.** Documents of versions 1 to 5, which lack the later sections, load as they
//! are: every later section and key is optional, so no upgrade step is needed, and the page
//! saves what it opened as the current version. A section in a document of a version older
//! than the one that brought it is refused, naming the section (`edge`); a document from a
//! newer version is refused with a message (`version`).
//!
//! **Reading.** [`parse`] (text) and [`from_value`] (the page's objects) read through
//! `serde_path_to_error`, so a malformed document is refused naming the path where it went
//! wrong (`layers[1].thickness_m`); every struct refuses unknown keys, and a document over
//! [`MAX_DOCUMENT_BYTES`] is not read. Reading checks the shape and the header only: the
//! values are checked where they are used (the core's checks, each section's own), all
//! errors of a pass at once. [`schema`] is the format's JSON Schema (`hibernal schema`).
//! The stack's parts (layers, materials, faces) are in [`crate::document::vocabulary`].

use super::vocabulary::{BoundaryDoc, LayerDoc};
use crate::physics::error::{InputError, InputErrorKind, InputErrors};
use crate::physics::stack::{Layer, Stack};
use schemars::JsonSchema;
use serde::{Deserialize, Serialize};

/// The `format` tag every scenario carries.
pub const FORMAT_TAG: &str = "hibernal-scenario";

/// The newest version this build reads and writes.
pub const FORMAT_VERSION: u32 = 6;

/// Largest document accepted, bytes.
pub const MAX_DOCUMENT_BYTES: usize = 1 << 20;

/// A whole scenario: the stack and the conditions on its faces.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct Scenario {
    /// Always "hibernal-scenario".
    pub format: String,
    /// Format version; this build reads 1 to 5.
    pub version: u32,
    #[serde(default)]
    pub title: String,
    #[serde(default)]
    pub notes: String,
    /// Layers from the top (outer) face to the bottom (deep or inner) face.
    pub layers: Vec<LayerDoc>,
    /// Conditions on the top face.
    pub top: BoundaryDoc,
    /// Conditions on the bottom face.
    pub bottom: BoundaryDoc,
    /// A winter run of the same stack (version 2 and later).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub winter: Option<crate::document::winter::WinterDoc>,
    /// A snow shelter (version 3 and later). It does not use `layers`, `top` or `bottom`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub shelter: Option<crate::document::shelter::ShelterDoc>,
    /// The edge of a building on a slab in 2D (version 4 and later). It does not use
    /// `layers`, `top` or `bottom`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub edge: Option<crate::document::edge::EdgeDoc>,
    /// Ranges instead of single numbers: uncertain inputs and a Monte Carlo over them
    /// (version 5 and later). Ordinary runs leave it aside; see [`crate::document::ranges`].
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub ranges: Option<crate::document::ranges::RangesDoc>,
}

impl Scenario {
    /// The core stack this document describes.
    pub fn stack(&self) -> Stack {
        Stack {
            layers: self
                .layers
                .iter()
                .map(|l| Layer {
                    name: l.name.clone(),
                    thickness_m: l.thickness_m,
                    material: (&l.material).into(),
                })
                .collect(),
            top: (&self.top).into(),
            bottom: (&self.bottom).into(),
        }
    }

    /// Check the document-level fields (format tag, version, title and notes sizes).
    fn check_header(&self) -> Result<(), InputErrors> {
        let mut errs = InputErrors::default();
        if self.format != FORMAT_TAG {
            errs.push(
                "format",
                InputErrorKind::Format(format!("must be \"{FORMAT_TAG}\"")),
            );
        }
        if self.version == 0 || self.version > FORMAT_VERSION {
            errs.push(
                "version",
                InputErrorKind::Format(format!(
                    "version {} is not known to this build, which reads versions 1 to {FORMAT_VERSION}",
                    self.version
                )),
            );
        }
        if self.version < 2 && self.winter.is_some() {
            errs.push(
                "winter",
                InputErrorKind::Format("a winter section needs format version 2 or later".into()),
            );
        }
        if self.version < 3 && self.shelter.is_some() {
            errs.push(
                "shelter",
                InputErrorKind::Format("a shelter section needs format version 3 or later".into()),
            );
        }
        if self.version < 4 && self.edge.is_some() {
            errs.push(
                "edge",
                InputErrorKind::Format("an edge section needs format version 4 or later".into()),
            );
        }
        if self.version < 5 && self.ranges.is_some() {
            errs.push(
                "ranges",
                InputErrorKind::Format("a ranges section needs format version 5 or later".into()),
            );
        }
        if self.title.chars().count() > 200 {
            errs.push(
                "title",
                InputErrorKind::Count {
                    count: self.title.chars().count(),
                    min: 0,
                    max: 200,
                },
            );
        }
        if self.notes.chars().count() > 20_000 {
            errs.push(
                "notes",
                InputErrorKind::Count {
                    count: self.notes.chars().count(),
                    min: 0,
                    max: 20_000,
                },
            );
        }
        errs.into_result()
    }
}

/// Read a scenario from JSON text. Errors name the field (`layers[1].thickness_m`) where the
/// document is readable that far.
pub fn parse(text: &str) -> Result<Scenario, InputErrors> {
    if text.len() > MAX_DOCUMENT_BYTES {
        return Err(InputError::new(
            "",
            InputErrorKind::Format(format!(
                "the document is {} bytes; at most {MAX_DOCUMENT_BYTES} are read",
                text.len()
            )),
        )
        .into());
    }
    let mut de = serde_json::Deserializer::from_str(text);
    let s: Scenario = serde_path_to_error::deserialize(&mut de).map_err(path_error)?;
    de.end()
        .map_err(|e| InputError::new("", InputErrorKind::Format(e.to_string())))?;
    s.check_header()?;
    Ok(s)
}

fn path_error<E: std::fmt::Display>(e: serde_path_to_error::Error<E>) -> InputError {
    let path = e.path().to_string();
    InputError::new(
        if path == "." { String::new() } else { path },
        InputErrorKind::Format(e.inner().to_string()),
    )
}

/// Read a scenario from an already-parsed JSON value (the page passes objects).
pub fn from_value(v: serde_json::Value) -> Result<Scenario, InputErrors> {
    let s: Scenario = serde_path_to_error::deserialize(v).map_err(path_error)?;
    s.check_header()?;
    Ok(s)
}

/// JSON Schema of the scenario format.
pub fn schema() -> serde_json::Value {
    serde_json::to_value(schemars::schema_for!(Scenario)).unwrap_or_default()
}
