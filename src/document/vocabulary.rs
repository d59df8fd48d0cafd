//! The vocabulary the sections share: a layer ([`LayerDoc`]), a face ([`BoundaryDoc`]), a
//! material ([`MaterialDoc`], a soil with its optional unfrozen-water curve,
//! [`UnfrozenWaterDoc`]), the ids of the core's enumerations, and the error as the faces
//! see it ([`ErrorDoc`]).
//!
//! - Every struct refuses unknown keys; a face and a material are tagged by `kind`, in
//!   kebab case (`air`, `surface`; `snow`, `soil`, …).
//! - The ids of snow regressions, textures, soil models and boards are one `id_enum!` each,
//!   converting both ways to the core's enumeration; `document_ids_match_the_core_ids`
//!   (`tests/scenario.rs`) checks that they agree with the core's own ids.
//! - A snow material's regression keeps its published key `correlation` (the Rust field is
//!   `regression`).
//! - [`ErrorDoc`] carries the field path, the message, the kind's id and its numbers
//!   (value, min, max in SI), so the page can word a refusal in the units it shows.

use crate::physics::error::{InputError, Warning};
use crate::physics::materials::{
    Board, MaterialSpec, SnowRegression, SoilInput, SoilModel, Texture,
};
use crate::physics::stack::Boundary;
use schemars::JsonSchema;
use serde::{Deserialize, Serialize};

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct LayerDoc {
    #[serde(default)]
    pub name: String,
    /// Thickness, m (> 0).
    pub thickness_m: f64,
    pub material: MaterialDoc,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(tag = "kind", rename_all = "kebab-case", deny_unknown_fields)]
pub enum BoundaryDoc {
    /// Air at a temperature through a surface film.
    Air {
        temperature_c: f64,
        /// Film coefficient, W/m²/K.
        film_w_m2k: f64,
    },
    /// The surface held at a temperature.
    Surface { temperature_c: f64 },
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(tag = "kind", rename_all = "kebab-case", deny_unknown_fields)]
pub enum MaterialDoc {
    Snow {
        /// kg/m³.
        density_kg_m3: f64,
        #[serde(rename = "correlation")]
        regression: SnowRegressionDoc,
    },
    Ice,
    Water,
    Air,
    Soil {
        texture: TextureDoc,
        model: SoilModelDoc,
        dry_density_kg_m3: f64,
        /// Gravimetric water content, % of dry mass.
        water_content_pct: f64,
        /// Quartz share of the solids, 0–1 (Johansen 1975, Côté & Konrad 2005).
        #[serde(default = "default_quartz")]
        quartz_fraction: f64,
        /// Multiplies the model's conductivity, frozen and unfrozen (version 5; 1 when
        /// absent). See [`SoilInput::conductivity_factor`].
        #[serde(default = "one", skip_serializing_if = "is_one")]
        conductivity_factor: f64,
        /// Freezing over a range in the winter run: unfrozen water w_u = α θ^β (fraction of
        /// dry mass, θ in K below 0 °C; Anderson & Tice 1972). Absent: the water freezes
        /// at 0 °C. The steady part always freezes at 0 °C.
        #[serde(default, skip_serializing_if = "Option::is_none")]
        unfrozen_water: Option<UnfrozenWaterDoc>,
    },
    Insulation {
        board: BoardDoc,
        /// W/m/K; null for the board's nominal value.
        #[serde(default)]
        conductivity_w_m_k: Option<f64>,
        /// Share of R lost to moisture in buried use, %.
        #[serde(default)]
        moisture_derating_pct: f64,
    },
    Concrete {
        #[serde(default)]
        conductivity_w_m_k: Option<f64>,
    },
    Custom {
        #[serde(default)]
        label: String,
        conductivity_w_m_k: f64,
        #[serde(default)]
        frozen_conductivity_w_m_k: Option<f64>,
        density_kg_m3: f64,
        specific_heat_j_kg_k: f64,
    },
}

/// Anderson & Tice 1972 unfrozen-water parameters: w_u = α θ^β.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct UnfrozenWaterDoc {
    /// α, fraction of dry mass at 1 K below 0 °C.
    pub alpha: f64,
    /// β, negative.
    pub beta: f64,
}

fn default_quartz() -> f64 {
    0.5
}

fn one() -> f64 {
    1.0
}

#[allow(clippy::trivially_copy_pass_by_ref)]
fn is_one(v: &f64) -> bool {
    *v == 1.0
}

macro_rules! id_enum {
    ($doc:ident, $core:ty, { $($var:ident => $id:literal),+ $(,)? }) => {
        #[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, JsonSchema)]
        pub enum $doc {
            $(#[serde(rename = $id)] $var,)+
        }
        impl From<$doc> for $core {
            fn from(d: $doc) -> $core {
                match d { $($doc::$var => <$core>::$var,)+ }
            }
        }
        impl From<$core> for $doc {
            fn from(c: $core) -> $doc {
                match c { $(<$core>::$var => $doc::$var,)+ }
            }
        }
    };
}

id_enum!(SnowRegressionDoc, SnowRegression, {
    Sturm1997Quadratic => "sturm-1997-quadratic",
    Sturm1997Logarithmic => "sturm-1997-logarithmic",
    Calonne2011 => "calonne-2011",
    Yen1981 => "yen-1981",
    Jordan1991 => "jordan-1991",
    Abels1893 => "abels-1893",
    VanDusen1929 => "van-dusen-1929",
    Devaux1933 => "devaux-1933",
    RicheSchneebeli2013 => "riche-schneebeli-2013",
});

id_enum!(TextureDoc, Texture, {
    Gravel => "gravel", Sand => "sand", Silt => "silt", Clay => "clay", Peat => "peat",
});

id_enum!(SoilModelDoc, SoilModel, {
    Kersten1949 => "kersten-1949",
    Johansen1975 => "johansen-1975",
    CoteKonrad2005 => "cote-konrad-2005",
});

id_enum!(BoardDoc, Board, {
    ExtrudedPolystyrene => "xps",
    ExpandedPolystyrene => "eps",
    Polyisocyanurate => "polyiso",
    MineralWool => "mineral-wool",
});

impl From<&MaterialDoc> for MaterialSpec {
    fn from(m: &MaterialDoc) -> Self {
        match m {
            MaterialDoc::Snow {
                density_kg_m3,
                regression,
            } => MaterialSpec::Snow {
                density_kg_m3: *density_kg_m3,
                regression: (*regression).into(),
            },
            MaterialDoc::Ice => MaterialSpec::Ice,
            MaterialDoc::Water => MaterialSpec::Water,
            MaterialDoc::Air => MaterialSpec::Air,
            MaterialDoc::Soil {
                texture,
                model,
                dry_density_kg_m3,
                water_content_pct,
                quartz_fraction,
                conductivity_factor,
                ..
            } => MaterialSpec::Soil(SoilInput {
                texture: (*texture).into(),
                model: (*model).into(),
                dry_density_kg_m3: *dry_density_kg_m3,
                water_content_pct: *water_content_pct,
                quartz_fraction: *quartz_fraction,
                conductivity_factor: *conductivity_factor,
            }),
            MaterialDoc::Insulation {
                board,
                conductivity_w_m_k,
                moisture_derating_pct,
            } => MaterialSpec::Insulation {
                board: (*board).into(),
                conductivity_w_m_k: *conductivity_w_m_k,
                moisture_derating_pct: *moisture_derating_pct,
            },
            MaterialDoc::Concrete { conductivity_w_m_k } => MaterialSpec::Concrete {
                conductivity_w_m_k: *conductivity_w_m_k,
            },
            MaterialDoc::Custom {
                label,
                conductivity_w_m_k,
                frozen_conductivity_w_m_k,
                density_kg_m3,
                specific_heat_j_kg_k,
            } => MaterialSpec::Custom {
                label: label.clone(),
                conductivity_w_m_k: *conductivity_w_m_k,
                frozen_conductivity_w_m_k: *frozen_conductivity_w_m_k,
                density_kg_m3: *density_kg_m3,
                specific_heat_j_kg_k: *specific_heat_j_kg_k,
            },
        }
    }
}

impl From<&BoundaryDoc> for Boundary {
    fn from(b: &BoundaryDoc) -> Self {
        match *b {
            BoundaryDoc::Air {
                temperature_c,
                film_w_m2k,
            } => Boundary::Air {
                temperature_c,
                film_w_m2k,
            },
            BoundaryDoc::Surface { temperature_c } => Boundary::Surface { temperature_c },
        }
    }
}

/// An error or warning as the faces see it. `kind`, `value`, `min` and `max` (SI, in the
/// field's unit) let a face word the message in the units it shows.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ErrorDoc {
    pub field: String,
    pub message: String,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub kind: Option<&'static str>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub value: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub min: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub max: Option<f64>,
}

impl ErrorDoc {
    pub fn plain(field: impl Into<String>, message: impl Into<String>) -> Self {
        ErrorDoc {
            field: field.into(),
            message: message.into(),
            kind: None,
            value: None,
            min: None,
            max: None,
        }
    }
}

impl From<&InputError> for ErrorDoc {
    fn from(e: &InputError) -> Self {
        let (value, min, max) = e.kind.numbers();
        ErrorDoc {
            field: e.field.clone(),
            message: e.kind.to_string(),
            kind: Some(e.kind.id()),
            value,
            min,
            max,
        }
    }
}

impl From<&Warning> for ErrorDoc {
    fn from(w: &Warning) -> Self {
        ErrorDoc::plain(w.field.clone(), w.message.clone())
    }
}
