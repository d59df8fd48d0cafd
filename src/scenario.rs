//! The scenario document (versioned JSON) and the report, at the edge between the core and
//! its faces (page, CLI). These are serialisable mirrors of the core types: the core itself
//! has no serde.
//!
//! Format: `{"format": "hibernal-scenario", "version": 5, ...}`, all values SI. Version 2
//! adds the optional `winter` section (a transient run of the same stack,
//! [`crate::scenario_winter`]); version 3 the optional `shelter` section (a snow shelter,
//! [`crate::scenario_shelter`], which stands on its own beside the stack); version 4 the
//! optional `edge` section (a building's edge in 2D, [`crate::scenario_edge`], also on its
//! own); version 5 the optional `ranges` section (uncertain inputs, [`crate::scenario_ranges`])
//! and a soil's `conductivity_factor`. Documents of versions 1 to 4, which lack the later
//! sections, still load. A document from a newer version is refused
//! with a message.

use schemars::JsonSchema;
use serde::{Deserialize, Serialize};

use crate::physics::error::{InputError, InputErrorKind, InputErrors, Warning};
use crate::physics::materials::{
    Board, MaterialSpec, SnowCorrelation, SoilInput, SoilModel, Texture,
};
use crate::physics::stack::{Boundary, Layer, Stack};
use crate::physics::steady::{self, SnowBand, SteadyResult};

/// The `format` tag every scenario carries.
pub const FORMAT_TAG: &str = "hibernal-scenario";
/// The newest version this build reads and writes.
pub const FORMAT_VERSION: u32 = 5;
/// Largest document accepted, bytes.
pub const MAX_DOCUMENT_BYTES: usize = 1 << 20;
/// Points per layer in the reported profile.
pub const PROFILE_POINTS_PER_LAYER: usize = 24;

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
    pub winter: Option<crate::scenario_winter::WinterDoc>,
    /// A snow shelter (version 3 and later). It does not use `layers`, `top` or `bottom`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub shelter: Option<crate::scenario_shelter::ShelterDoc>,
    /// The edge of a building on a slab in 2D (version 4 and later). It does not use
    /// `layers`, `top` or `bottom`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub edge: Option<crate::scenario_edge::EdgeDoc>,
    /// Ranges instead of single numbers: uncertain inputs and a Monte Carlo over them
    /// (version 5 and later). Ordinary runs leave it aside; see [`crate::scenario_ranges`].
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub ranges: Option<crate::scenario_ranges::RangesDoc>,
}

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
        correlation: SnowCorrelationDoc,
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

id_enum!(SnowCorrelationDoc, SnowCorrelation, {
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
                correlation,
            } => MaterialSpec::Snow {
                density_kg_m3: *density_kg_m3,
                correlation: (*correlation).into(),
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
                conductivity_w_per_m_k: *conductivity_w_m_k,
                moisture_derating_pct: *moisture_derating_pct,
            },
            MaterialDoc::Concrete { conductivity_w_m_k } => MaterialSpec::Concrete {
                conductivity_w_per_m_k: *conductivity_w_m_k,
            },
            MaterialDoc::Custom {
                label,
                conductivity_w_m_k,
                frozen_conductivity_w_m_k,
                density_kg_m3,
                specific_heat_j_kg_k,
            } => MaterialSpec::Custom {
                label: label.clone(),
                conductivity_w_per_m_k: *conductivity_w_m_k,
                frozen_conductivity_w_per_m_k: *frozen_conductivity_w_m_k,
                density_kg_m3: *density_kg_m3,
                specific_heat_j_per_kg_k: *specific_heat_j_kg_k,
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
                film_w_per_m2_k: film_w_m2k,
            },
            BoundaryDoc::Surface { temperature_c } => Boundary::Surface { temperature_c },
        }
    }
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

// ---------------------------------------------------------------- report

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

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FaceDoc {
    pub air_c: Option<f64>,
    pub surface_c: f64,
    pub film_r_m2k_w: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PropertiesDoc {
    pub k_frozen_w_m_k: f64,
    pub k_unfrozen_w_m_k: f64,
    pub density_kg_m3: f64,
    pub c_frozen_j_m3k: f64,
    pub c_unfrozen_j_m3k: f64,
    pub latent_j_m3: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LayerReport {
    pub name: String,
    pub material: String,
    pub thickness_m: f64,
    pub top_depth_m: f64,
    pub bottom_depth_m: f64,
    pub top_c: f64,
    pub bottom_c: f64,
    pub r_m2k_w: f64,
    pub conductivity_w_m_k: f64,
    pub state: &'static str,
    pub properties: PropertiesDoc,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ZeroPlaneDoc {
    pub depth_m: f64,
    pub layer: usize,
    pub frozen_side: &'static str,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BandMemberDoc {
    pub id: &'static str,
    pub name: &'static str,
    pub r_total_m2k_w: f64,
    pub heat_flux_w_m2: f64,
    pub zero_planes_m: Vec<f64>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BandDoc {
    pub r_min_m2k_w: f64,
    pub r_max_m2k_w: f64,
    pub flux_min_w_m2: f64,
    pub flux_max_w_m2: f64,
    pub zero_depth_min_m: Option<f64>,
    pub zero_depth_max_m: Option<f64>,
    pub by_correlation: Vec<BandMemberDoc>,
    pub skipped: Vec<ErrorDoc>,
    /// (depth m, lowest °C, highest °C).
    pub envelope: Vec<[f64; 3]>,
}

/// The report of one steady run (SI).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Report {
    pub tool: &'static str,
    pub tool_version: &'static str,
    pub format_version: u32,
    pub title: String,
    pub r_total_m2k_w: f64,
    pub r_layers_m2k_w: f64,
    /// The same two R-values in US units, ft²·°F·h/Btu.
    pub r_total_ft2_f_h_btu: f64,
    pub r_layers_ft2_f_h_btu: f64,
    pub u_w_m2k: f64,
    pub heat_flux_w_m2: f64,
    pub top: FaceDoc,
    pub bottom: FaceDoc,
    pub layers: Vec<LayerReport>,
    pub zero_planes: Vec<ZeroPlaneDoc>,
    pub profile: Vec<[f64; 2]>,
    pub band: Option<BandDoc>,
    /// The winter run, when the scenario has one and it was asked for.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub winter: Option<crate::scenario_winter::WinterReport>,
    /// The shelter, when the scenario has one and it was asked for.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub shelter: Option<crate::scenario_shelter::ShelterReport>,
    /// The building edge, when the scenario has one and it was asked for.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub edge: Option<crate::scenario_edge::EdgeReport>,
    /// The ranges study, when the scenario has one and it was asked for (the CLI runs it;
    /// [`report`] leaves it empty).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub ranges: Option<crate::scenario_ranges::RangesReport>,
    pub warnings: Vec<ErrorDoc>,
}

/// The core results a report and a chart are made from.
#[derive(Debug, Clone, PartialEq)]
pub struct Computed {
    pub result: SteadyResult,
    pub band: Option<SnowBand>,
    pub depths_m: Vec<f64>,
    /// Filled by [`compute_with_winter`] and [`compute_all`] only.
    pub winter: Option<crate::scenario_winter::WinterReport>,
    /// Filled by [`compute_all`] only.
    pub shelter: Option<crate::scenario_shelter::ShelterReport>,
    /// Filled by [`compute_all`] only.
    pub edge: Option<crate::scenario_edge::EdgeReport>,
}

/// Solve a scenario: the steady result and the band across snow regressions.
pub fn compute(s: &Scenario) -> Result<Computed, InputErrors> {
    let stack = s.stack();
    let result = steady::solve(&stack).map_err(|e| match e {
        steady::SolveError::Input(errs) => errs,
        other => InputError::new("", InputErrorKind::NotCovered(other.to_string())).into(),
    })?;
    let depths_m = result.profile_depths(PROFILE_POINTS_PER_LAYER);
    let band = steady::snow_band(&stack, &depths_m);
    Ok(Computed {
        result,
        band,
        depths_m,
        winter: None,
        shelter: None,
        edge: None,
    })
}

/// [`compute`], plus the winter run when the scenario has a winter section.
pub fn compute_with_winter(s: &Scenario) -> Result<Computed, InputErrors> {
    let mut c = compute(s)?;
    if let Some(w) = &s.winter {
        let mut report = crate::scenario_winter::run_winter(w, &c.result.stack, &s.layers)?;
        if w.least_thickness.is_some() {
            report.least_thickness = Some(crate::scenario_design::run_design(
                w,
                &c.result.stack,
                &s.layers,
            )?);
        }
        c.winter = Some(report);
    }
    Ok(c)
}

/// [`compute_with_winter`], plus the shelter and the building edge when the scenario has
/// those sections. The errors of the stack, the shelter and the edge come together, so
/// every one is named at once.
pub fn compute_all(s: &Scenario) -> Result<Computed, InputErrors> {
    let shelter = s
        .shelter
        .as_ref()
        .map(crate::scenario_shelter::run_shelter)
        .transpose();
    let edge = s
        .edge
        .as_ref()
        .map(|d| -> Result<_, InputErrors> {
            let mut r = crate::scenario_edge::run_edge_scenario(d)?;
            if d.least.is_some() {
                r.least = Some(crate::scenario_edge_design::run_edge_least(d)?);
            }
            Ok(r)
        })
        .transpose();
    let mut errs = InputErrors::default();
    let c = compute_with_winter(s).map_err(|e| errs.0.extend(e.0)).ok();
    let sh = shelter.map_err(|e| errs.0.extend(e.0)).ok();
    let ed = edge.map_err(|e| errs.0.extend(e.0)).ok();
    match (c, sh, ed) {
        (Some(mut c), Some(sh), Some(ed)) if errs.is_empty() => {
            c.shelter = sh;
            c.edge = ed;
            Ok(c)
        }
        _ => Err(errs),
    }
}

/// Build the report of a computed scenario.
pub fn report(s: &Scenario, c: &Computed) -> Report {
    let r = &c.result;
    let face = |f: &steady::FaceResult| FaceDoc {
        air_c: f.air_c,
        surface_c: f.surface_c,
        film_r_m2k_w: f.film_r_m2k_per_w,
    };
    let layers = r
        .layers
        .iter()
        .zip(&r.stack.layers)
        .zip(&r.stack.materials)
        .map(|((lr, l), m)| LayerReport {
            name: l.name.clone(),
            material: m.label.clone(),
            thickness_m: l.thickness_m,
            top_depth_m: lr.top_depth_m,
            bottom_depth_m: lr.bottom_depth_m,
            top_c: lr.top_c,
            bottom_c: lr.bottom_c,
            r_m2k_w: lr.r_m2k_per_w,
            conductivity_w_m_k: lr.k_eff_w_per_m_k,
            state: lr.state.label(),
            properties: PropertiesDoc {
                k_frozen_w_m_k: m.conductivity.frozen.k(-5.0),
                k_unfrozen_w_m_k: m.conductivity.unfrozen.k(5.0),
                density_kg_m3: m.density_kg_m3,
                c_frozen_j_m3k: m.c_frozen_j_per_m3_k,
                c_unfrozen_j_m3k: m.c_unfrozen_j_per_m3_k,
                latent_j_m3: m.latent_j_per_m3,
            },
        })
        .collect();
    let band = c.band.as_ref().map(|b| {
        let (r_min, r_max) = b.r_total_range();
        let (q_min, q_max) = b.flux_range();
        let z = b.zero_depth_range();
        BandDoc {
            r_min_m2k_w: r_min,
            r_max_m2k_w: r_max,
            flux_min_w_m2: q_min,
            flux_max_w_m2: q_max,
            zero_depth_min_m: z.map(|z| z.0),
            zero_depth_max_m: z.map(|z| z.1),
            by_correlation: b
                .members
                .iter()
                .map(|m| BandMemberDoc {
                    id: m.correlation.id(),
                    name: m.correlation.name(),
                    r_total_m2k_w: m.result.r_total_m2k_per_w,
                    heat_flux_w_m2: m.result.heat_flux_w_per_m2,
                    zero_planes_m: m.result.zero_planes.iter().map(|p| p.depth_m).collect(),
                })
                .collect(),
            skipped: b
                .skipped
                .iter()
                .map(|(c, why)| ErrorDoc::plain(c.id(), why.clone()))
                .collect(),
            envelope: b
                .depths_m
                .iter()
                .zip(b.min_c.iter().zip(&b.max_c))
                .map(|(&z, (&lo, &hi))| [z, lo, hi])
                .collect(),
        }
    });
    Report {
        tool: "hibernal",
        tool_version: env!("CARGO_PKG_VERSION"),
        format_version: FORMAT_VERSION,
        title: s.title.clone(),
        r_total_m2k_w: r.r_total_m2k_per_w,
        r_layers_m2k_w: r.r_layers_m2k_per_w,
        r_total_ft2_f_h_btu: r.r_total_m2k_per_w * crate::physics::units::R_US_PER_R_SI,
        r_layers_ft2_f_h_btu: r.r_layers_m2k_per_w * crate::physics::units::R_US_PER_R_SI,
        u_w_m2k: r.u_w_per_m2_k,
        heat_flux_w_m2: r.heat_flux_w_per_m2,
        top: face(&r.top),
        bottom: face(&r.bottom),
        layers,
        zero_planes: r
            .zero_planes
            .iter()
            .map(|p| ZeroPlaneDoc {
                depth_m: p.depth_m,
                layer: p.layer,
                frozen_side: if p.frozen_above { "above" } else { "below" },
            })
            .collect(),
        profile: r
            .profile_at(&c.depths_m)
            .into_iter()
            .map(|(z, t)| [z, t])
            .collect(),
        band,
        winter: c.winter.clone(),
        shelter: c.shelter.clone(),
        edge: c.edge.clone(),
        ranges: None,
        warnings: r.warnings.iter().map(ErrorDoc::from).collect(),
    }
}

// ---------------------------------------------------------------- examples

/// A bundled example: an invented scenario of our own.
pub struct Example {
    pub id: &'static str,
    pub summary: &'static str,
    pub json: &'static str,
}

/// The bundled examples; the page starts from the first.
pub const EXAMPLES: [Example; 11] = [
    Example {
        id: "snow-over-foam-on-silt",
        summary: "40 cm of wind-packed snow over 50 mm of foam board over silty soil",
        json: include_str!("../scenarios/snow-over-foam-on-silt.json"),
    },
    Example {
        id: "snow-block-wall",
        summary: "A 40 cm wall of snow blocks between a −25 °C night and a 0 °C interior",
        json: include_str!("../scenarios/snow-block-wall.json"),
    },
    Example {
        id: "unheated-shed-floor",
        summary: "Concrete floor of an unheated shed on foam board, gravel and silt",
        json: include_str!("../scenarios/unheated-shed-floor.json"),
    },
    Example {
        id: "bare-sand-path",
        summary: "A cleared garden path on sand: no snow, no insulation",
        json: include_str!("../scenarios/bare-sand-path.json"),
    },
    Example {
        id: "silty-yard-design-winter",
        summary: "Bare silty yard through a design winter of 1200 °C·days",
        json: include_str!("../scenarios/silty-yard-design-winter.json"),
    },
    Example {
        id: "cabin-porch-slab-snowy-winter",
        summary: "A cabin's porch slab on foam board, gravel and silt through a snowy winter: change the board and watch the deepest frost move",
        json: include_str!("../scenarios/cabin-porch-slab-snowy-winter.json"),
    },
    Example {
        id: "silt-yard-how-sure",
        summary: "Frost in a silt yard as P10, P50 and P90 over uncertain snow, water, conductivity and winter",
        json: include_str!("../scenarios/silt-yard-how-sure.json"),
    },
    Example {
        id: "training-dome-four",
        summary: "A snow-block dome for four on a training night at −20 °C in a 5 m/s wind: how warm, how thick, how the night goes",
        json: include_str!("../scenarios/training-dome-four.json"),
    },
    Example {
        id: "drift-cave-two",
        summary: "A drift cave for two with a 5 cm vent at −25 °C: the deep snow around it keeps the air at the melt limit, and the roof drips",
        json: include_str!("../scenarios/drift-cave-two.json"),
    },
    Example {
        id: "heated-workshop-edge",
        summary: "The edge of a heated workshop on a 0.6 m footing with wall board and wing in silt, through a 1500 °C·day winter: frost stays above the footing's base",
        json: include_str!("../scenarios/heated-workshop-edge.json"),
    },
    Example {
        id: "unheated-storage-edge",
        summary: "The edge of an unheated storage building on a 0.45 m footing with a narrow wing: frost reaches below the base; widen the wing",
        json: include_str!("../scenarios/unheated-storage-edge.json"),
    },
];

pub fn example(id: &str) -> Option<&'static Example> {
    EXAMPLES.iter().find(|e| e.id == id)
}

/// The steady temperature profile as CSV (the points the profile chart draws): depth below
/// the top face and temperature, with the band across snow regressions (lowest, highest)
/// where the stack has snow; units in the header, in the system chosen.
pub fn profile_csv(c: &Computed, sys: crate::physics::units::UnitSystem) -> String {
    use crate::physics::units::quantity;
    let (Some(tq), Some(zq)) = (quantity("temperature"), quantity("depth")) else {
        return String::new();
    };
    let (tu, zu) = (tq.unit(sys).symbol, zq.unit(sys).symbol);
    let band = c
        .band
        .as_ref()
        .filter(|b| b.depths_m.len() == c.depths_m.len());
    let mut out = format!("depth [{zu}],temperature [{tu}]");
    if band.is_some() {
        out.push_str(&format!(
            ",lowest across snow regressions [{tu}],highest across snow regressions [{tu}]"
        ));
    }
    out.push('\n');
    for (i, &z) in c.depths_m.iter().enumerate() {
        out.push_str(&format!(
            "{:.4},{:.3}",
            zq.show(sys, z),
            tq.show(sys, c.result.temperature_at(z))
        ));
        if let Some(b) = band {
            out.push_str(&format!(
                ",{:.3},{:.3}",
                tq.show(sys, b.min_c[i]),
                tq.show(sys, b.max_c[i])
            ));
        }
        out.push('\n');
    }
    out
}
