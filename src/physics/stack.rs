//! A layered stack and the conditions on its two faces.
//!
//! Layers are listed from the top (outer) face to the bottom (deep or inner) face. Depth is
//! measured from the top face, in metres. For ground, the top face meets the air and the
//! bottom is deep soil; for a snow wall, the top face is the outside and the bottom the
//! inside.
//!
//! A face is a [`Boundary`]: air at a temperature through a surface film, or a surface held
//! at a temperature; [`SURFACE_PRESETS`] are the films the page offers, each with its
//! source. [`Stack::resolve`] checks everything at once against the limits of this file
//! (every error names its field, `layers[2].thickness_m`) and resolves each layer's
//! material; the solvers start from the [`ResolvedStack`].

use crate::physics::error::{check, InputErrorKind, InputErrors, Warning};
use crate::physics::materials::{Material, MaterialSpec};

/// Most layers a stack may have.
pub const MAX_LAYERS: usize = 64;
/// Thickest layer accepted, m.
pub const MAX_LAYER_THICKNESS_M: f64 = 200.0;
/// Longest layer name, characters.
pub const MAX_NAME_CHARS: usize = 80;
/// Temperatures accepted on a face, °C (beyond any winter on Earth or any heated interior
/// this tool is meant for).
pub const TEMPERATURE_RANGE_C: (f64, f64) = (-90.0, 60.0);
/// Film coefficients accepted, W/m²/K.
pub const FILM_RANGE_W_PER_M2_K: (f64, f64) = (0.1, 1000.0);

/// One layer.
#[derive(Debug, Clone, PartialEq)]
pub struct Layer {
    pub name: String,
    pub thickness_m: f64,
    pub material: MaterialSpec,
}

/// What holds one face.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Boundary {
    /// Air at a temperature, coupled through a surface film (convection and radiation
    /// lumped): q = h (T_air − T_surface).
    Air { temperature_c: f64, film_w_m2k: f64 },
    /// The surface itself held at a temperature (no film).
    Surface { temperature_c: f64 },
}

impl Boundary {
    pub fn temperature_c(&self) -> f64 {
        match *self {
            Boundary::Air { temperature_c, .. } | Boundary::Surface { temperature_c } => {
                temperature_c
            }
        }
    }
    /// Film resistance, m²K/W (0 for a held surface).
    pub fn film_resistance_m2k_w(&self) -> f64 {
        match *self {
            Boundary::Air { film_w_m2k, .. } => 1.0 / film_w_m2k,
            Boundary::Surface { .. } => 0.0,
        }
    }
    fn validate(&self, field: &str, errs: &mut InputErrors) {
        let (lo, hi) = TEMPERATURE_RANGE_C;
        check::within(
            errs,
            &format!("{field}.temperature_c"),
            self.temperature_c(),
            lo,
            hi,
            "°C",
        );
        if let Boundary::Air { film_w_m2k, .. } = *self {
            let (lo, hi) = FILM_RANGE_W_PER_M2_K;
            check::within(
                errs,
                &format!("{field}.film_w_m2k"),
                film_w_m2k,
                lo,
                hi,
                "W/m²K",
            );
        }
    }
}

/// Surface film presets. Sources: ISO 6946 conventional surface resistances (R_si 0.10
/// upward, 0.13 horizontal, 0.17 downward heat flow; R_se 0.04 m²K/W; from memory) and the
/// snow-shelter film ranges of the model reference (inside 6–8, outside 15–25 W/m²K rising
/// with wind; from memory).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SurfacePreset {
    pub id: &'static str,
    pub name: &'static str,
    /// `None`: the surface temperature is held (no film).
    pub film_w_m2k: Option<f64>,
    pub source: &'static str,
}

/// Film coefficient of open ground in light wind, W/(m²·K): 20, between the calm and the
/// standard outdoor presets below (common practice, no source). The default surface film
/// of a winter run and of an edge's outside ground.
pub const GROUND_FILM_W_M2K: f64 = 20.0;

pub const SURFACE_PRESETS: [SurfacePreset; 8] = [
    SurfacePreset {
        id: "held-surface",
        name: "Surface held at the temperature (no film)",
        film_w_m2k: None,
        source: "—",
    },
    SurfacePreset {
        id: "outdoor-standard",
        name: "Outdoors, standard exposure (ISO 6946)",
        film_w_m2k: Some(25.0),
        source: "ISO 6946 external surface resistance (from memory)",
    },
    SurfacePreset {
        id: "outdoor-calm",
        name: "Outdoors, calm air",
        film_w_m2k: Some(15.0),
        source: "lower end of the outside film range, model reference (from memory)",
    },
    SurfacePreset {
        id: "outdoor-windy",
        name: "Outdoors, strong wind",
        film_w_m2k: Some(35.0),
        source: "common practice, no source",
    },
    SurfacePreset {
        id: "indoor-up",
        name: "Indoors, heat flowing up (ISO 6946)",
        film_w_m2k: Some(10.0),
        source: "ISO 6946 internal surface resistance, upward (from memory)",
    },
    SurfacePreset {
        id: "indoor-horizontal",
        name: "Indoors, heat flowing sideways (ISO 6946)",
        film_w_m2k: Some(1.0 / 0.13),
        source: "ISO 6946 internal surface resistance, horizontal (from memory)",
    },
    SurfacePreset {
        id: "indoor-down",
        name: "Indoors, heat flowing down (ISO 6946)",
        film_w_m2k: Some(1.0 / 0.17),
        source: "ISO 6946 internal surface resistance, downward (from memory)",
    },
    SurfacePreset {
        id: "shelter-inside",
        name: "Inside a snow shelter, still air",
        film_w_m2k: Some(7.0),
        source: "model reference, inside film 6–8 W/m²K (from memory)",
    },
];

/// A steady 1D problem: a stack and its two faces.
#[derive(Debug, Clone, PartialEq)]
pub struct Stack {
    pub layers: Vec<Layer>,
    pub top: Boundary,
    pub bottom: Boundary,
}

/// A stack whose inputs have been checked and whose materials are resolved.
#[derive(Debug, Clone, PartialEq)]
pub struct ResolvedStack {
    pub layers: Vec<Layer>,
    pub materials: Vec<Material>,
    pub top: Boundary,
    pub bottom: Boundary,
    /// Depth of each interface from the top face, m; `interfaces[0] = 0`, length = layers + 1.
    pub interfaces_m: Vec<f64>,
    pub warnings: Vec<Warning>,
}

impl Stack {
    /// Check every input (collecting all errors, each naming its field) and resolve the
    /// materials.
    pub fn resolve(&self) -> Result<ResolvedStack, InputErrors> {
        let mut errs = InputErrors::default();
        let mut warnings = Vec::new();
        let n = self.layers.len();
        if n == 0 || n > MAX_LAYERS {
            errs.push(
                "layers",
                InputErrorKind::Count {
                    count: n,
                    min: 1,
                    max: MAX_LAYERS,
                },
            );
            return Err(errs);
        }
        self.top.validate("top", &mut errs);
        self.bottom.validate("bottom", &mut errs);
        let mut materials = Vec::with_capacity(n);
        let mut interfaces = Vec::with_capacity(n + 1);
        interfaces.push(0.0);
        for (i, layer) in self.layers.iter().enumerate() {
            let chars = layer.name.chars().count();
            if chars > MAX_NAME_CHARS {
                errs.push(
                    format!("layers[{i}].name"),
                    InputErrorKind::Count {
                        count: chars,
                        min: 0,
                        max: MAX_NAME_CHARS,
                    },
                );
            }
            let f = format!("layers[{i}].thickness_m");
            if check::positive(&mut errs, &f, layer.thickness_m)
                && layer.thickness_m > MAX_LAYER_THICKNESS_M
            {
                errs.push(
                    &f,
                    InputErrorKind::OutOfBounds {
                        value: layer.thickness_m,
                        min: 0.0,
                        max: MAX_LAYER_THICKNESS_M,
                        unit: "m",
                    },
                );
            }
            let last = *interfaces.last().unwrap_or(&0.0);
            interfaces.push(last + layer.thickness_m);
            match layer
                .material
                .resolve(&format!("layers[{i}].material"), &mut warnings)
            {
                Ok(m) => materials.push(m),
                Err(e) => errs.0.extend(e.0),
            }
        }
        errs.into_result()?;
        Ok(ResolvedStack {
            layers: self.layers.clone(),
            materials,
            top: self.top,
            bottom: self.bottom,
            interfaces_m: interfaces,
            warnings,
        })
    }

    pub fn has_snow(&self) -> bool {
        self.layers.iter().any(|l| l.material.is_snow())
    }
}
