//! The `edge` section of the scenario document (format version 4): a vertical cross-section
//! through the edge of a slab-on-grade building ([`crate::physics::edge2d`]) run through a
//! winter, the far-field soil column run by the 1D winter machinery beside it, and the
//! report of both. The section stands on its own, like the shelter: it reads neither
//! `layers` nor `top` nor `bottom`, which stay required. Files of versions 1 to 3 load
//! unchanged; an `edge` in a file of an older version is refused (field `edge`).
//!
//! ```json
//! "edge": {
//!   "inside_half_width_m": 5.0, "outside_extent_m": 8.0, "depth_m": 8.0,
//!   "slab": { "thickness_m": 0.10, "material": <MaterialDoc> },
//!   "wall": { "width_m": 0.20, "base_depth_m": 0.60, "material": <MaterialDoc> },
//!   "wall_board": null | { "material": <insulation>, "thickness_m": 0.05, "depth_m": 0.60 },
//!   "wing": null | { "material": <insulation>, "thickness_m": 0.05, "width_m": 0.60, "depth_m": 0.30 },
//!   "soil": [ { "name": "silt", "thickness_m": 8.0, "material": <soil, unfrozen_water allowed> } ],
//!   "inside": { "kind": "heated", "air_c": 20.0, "film_w_m2k": 6.0 } | { "kind": "closed" },
//!   "outside": <winter SurfaceDoc>, "climate": <winter ClimateDoc>, "bottom": <winter DeepDoc>,
//!   "start": { "surface_c": 5.0, "gradient_k_per_m": 0.03 },
//!   "grid": null | { "fine_m": 0.02, "growth_ratio": 1.15, "max_cell_m": 0.4 },
//!   "step_s": 86400, "duration_days": null, "field_every_days": 7,
//!   "least": null | <see the edge_least module>
//! }
//! ```
//!
//! The start's gradient keeps its published key `gradient_k_per_m` (the Rust field is
//! `gradient_k_m`).
//!
//! **Conversion and checks** (one pass, every error at once). Soil bands are cut to
//! `depth_m` (the last one reaching the bottom). The far-field column goes through the
//! winter machinery unchanged: a `WinterDoc` of the same climate, surface, bottom and step
//! (uniform start at `start.surface_c`) over a stack of the soil bands, so climate,
//! surface, bottom, step, duration and the soils' unfrozen-water curves are checked by the
//! winter's own code, their paths moved under `edge.` (`winter.surface` → `edge.outside`,
//! `layers[i]` → `edge.soil[i]`); when the soil fails, the climate, surface and bottom are
//! still checked on a stand-in column. Boards must be insulation materials; their
//! conductivity is the resolved one, which carries `moisture_derating_pct` (k / (1 − d), so
//! R × (1 − d); `the_boards_are_derated_for_moisture_in_the_run` in
//! `tests/edge_scenario.rs`), and the report's cautions state the deratings used. Then the
//! core's `EdgeSection::validate("edge")` (paths `edge.wing.width_m`; `….board.thickness_m`
//! moved to `edge.wing.thickness_m`, the board's conductivity and heat capacity to
//! `edge.wing.material.…`) and its cell cap (`MAX_CELLS`, field `edge.grid.fine_m`). Caps
//! of the section: [`MAX_SOIL_BANDS`] soil bands, [`MAX_EDGE_DAYS`], [`MAX_EDGE_STEPS`]
//! (field `edge.step_s`).
//!
//! **The run** ([`EdgeJob`]: `new`, `section`, `advance(max_steps)`, `progress`, `finish`;
//! [`run_edge_scenario`] drives one to the end). The 2D `EdgeRun` under the climate and,
//! beside it, the 1D `WinterJob` of the far-field column; the column (hundreds of times
//! cheaper) runs to its end in the first `advance`, the 2D run `max_steps` per call.
//! Slicing changes no number (a run in 7-step slices equals one in one call:
//! `the_report_carries_cautions_hand_methods_and_outlines`, `tests/edge_scenario.rs`).
//!
//! **The report** ([`EdgeReport`], `Report.edge`): `max_frost_below_base_m` (positive below
//! the base; negative: the 0 °C point stays that far above it), `max_frost_below_base_day`,
//! `frost_below_base`, `base_depth_m`, `far_frost_depth_m` (2D far side),
//! `column_frost_depth_m` (1D), `mean_slab_heat_w_m`, `peak_slab_heat_w_m` (per metre of
//! wall, for the half-building in the section), `air_freezing_index_c_days` and
//! `surface_freezing_index_c_days` (from the column run), `nx`, `nz`, `cells`, `steps`,
//! `iterations`, `energy_imbalance_relative`, `width_m`, `depth_m`, `daily` ([`EdgeDay`]:
//! day, air, frost below the base, far-field frost, slab heat as the mean over the day's
//! steps, the column's frost), `outlines` (`part`: slab, wall, wall-board, wing; x0, x1,
//! z0, z1 in m), `field_days`, `warnings`, `hand_methods` and `cautions` (ids
//! `frost-heave`, `estimates-only`, `board-moisture`, `long-wall`; always present). The
//! fields and the grid faces stay out of the JSON ([`edge_field_csv`], the charts);
//! [`edge_daily_csv`] writes the daily series; both name their units in the header.
//!
//! **Hand methods** (rows like the winter's `HandMethodRow`): `stefan` (the first freezing
//! soil from the column run's surface freezing index), `stefan-resistance` (from the air
//! freezing index with the outside film and the snow, d/k(ρ), as one resistance averaged
//! over the days below 0 °C; for an n-factor surface the winter's row), `berggren`
//! (modified Berggren through the soil bands, as the winter report does it), `column` (the
//! 1D run), `far-field-2d` and `footing-2d` (frost depth below grade under the footing:
//! base plus the frost below it). The notes say what each ignores (the building's heat, for
//! all but the last).
//!
//! **The far field against the column.** The examples' 2D far side agrees with the 1D
//! column within 5 cm
//! (`the_examples_show_both_outcomes_and_the_far_field_agrees_with_the_column`): the 2D run
//! takes snow as a resistance without heat capacity and starts with the gradient on cells
//! up to 0.4 m deep, the column has snow cells, a uniform start and 1 cm cells.

use crate::document::vocabulary::{ErrorDoc, LayerDoc, MaterialDoc};
use crate::document::weather::{ClimateDoc, DeepDoc, SurfaceDoc};
use crate::document::winter::{HandMethodRow, InitialDoc, WinterDoc, WinterJob, WinterReport};
use crate::physics::climate::Climate;
use crate::physics::edge2d::least::{EdgeLeastAnswer, EdgeQuantity, EdgeTrial};
use crate::physics::edge2d::{
    AxisSpacing, Board, EdgeError, EdgeField, EdgeRun, EdgeSection, FoundationWall, Inside,
    Outside, Region, Slab, SoilBand, StartTemperature, WallBoard, Wing,
};
use crate::physics::error::{check, InputError, InputErrorKind, InputErrors};
use crate::physics::hand;
use crate::physics::materials::{Material, MaterialSpec};
use crate::physics::stack::{Boundary, Layer, Stack};
use crate::physics::transient::run::Progress;
use schemars::JsonSchema;
use serde::{Deserialize, Serialize};

const DAY: f64 = 86_400.0;

/// Longest edge run, days (a few winters; a setting of this tool).
pub const MAX_EDGE_DAYS: f64 = 3.0 * 365.0;

/// Most time steps an edge run may take (a setting of this tool: a few years of daily steps,
/// or a winter of hourly ones).
pub const MAX_EDGE_STEPS: f64 = 6000.0;

/// Most soil bands.
pub const MAX_SOIL_BANDS: usize = 20;

/// The default grid: cells of 2 cm at the foci growing by 1.15 up to 0.4 m, chosen by the
/// edge's grid study against a grid of 1 cm cells growing by 1.1 (its figures are in
/// `MEASUREMENTS.md`).
pub const DEFAULT_GRID: EdgeGridDoc = EdgeGridDoc {
    fine_m: 0.02,
    growth_ratio: 1.15,
    max_cell_m: 0.4,
};

/// The edge of a building on a slab, in a cross-section perpendicular to a long wall (SI).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct EdgeDoc {
    /// From the slab's centre line to the wall's inner face, m.
    pub inside_half_width_m: f64,
    /// From the wall's outer face to the far side of the section, m.
    pub outside_extent_m: f64,
    /// Depth of the section's bottom below grade, m.
    pub depth_m: f64,
    pub slab: EdgeSlabDoc,
    pub wall: EdgeWallDoc,
    /// Vertical insulation against the wall's outer face, from grade down.
    #[serde(default)]
    pub wall_board: Option<EdgeWallBoardDoc>,
    /// Horizontal insulation running outwards from the wall's outer face.
    #[serde(default)]
    pub wing: Option<EdgeWingDoc>,
    /// Soil bands from grade down; the last reaches the bottom.
    pub soil: Vec<LayerDoc>,
    pub inside: EdgeInsideDoc,
    /// The outside ground surface: a film (snow as a resistance) or n-factors.
    pub outside: SurfaceDoc,
    pub climate: ClimateDoc,
    pub bottom: DeepDoc,
    pub start: EdgeStartDoc,
    /// Cell sizes; null for [`DEFAULT_GRID`].
    #[serde(default)]
    pub grid: Option<EdgeGridDoc>,
    /// Time step, s (default one day).
    #[serde(default = "default_step")]
    pub step_s: f64,
    /// Length of the run, days (default: the climate's own length).
    #[serde(default)]
    pub duration_days: Option<f64>,
    /// Keep the temperature field every this many days (and at the end).
    #[serde(default = "default_field_every")]
    pub field_every_days: f64,
    /// A search for the least wing width, board R-value or footing depth that keeps frost at
    /// or above the footing base ([`crate::document::edge_least`]).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub least: Option<crate::document::edge::EdgeLeastDoc>,
}

fn default_step() -> f64 {
    DAY
}

fn default_field_every() -> f64 {
    7.0
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct EdgeSlabDoc {
    pub thickness_m: f64,
    pub material: MaterialDoc,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct EdgeWallDoc {
    pub width_m: f64,
    /// Depth of the footing's base below grade, m.
    pub base_depth_m: f64,
    pub material: MaterialDoc,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct EdgeWallBoardDoc {
    /// An insulation board; its `moisture_derating_pct` lowers its R in the run.
    pub material: MaterialDoc,
    pub thickness_m: f64,
    /// From grade down, m.
    pub depth_m: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct EdgeWingDoc {
    /// An insulation board; its `moisture_derating_pct` lowers its R in the run.
    pub material: MaterialDoc,
    pub thickness_m: f64,
    /// From the wall's outer face, m.
    pub width_m: f64,
    /// Depth of the board's top face below grade, m.
    pub depth_m: f64,
}

#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(tag = "kind", rename_all = "kebab-case", deny_unknown_fields)]
pub enum EdgeInsideDoc {
    /// Air held at `air_c` over the slab, through a film.
    Heated { air_c: f64, film_w_m2k: f64 },
    /// An unheated building: no heat crosses the floor.
    Closed,
}

#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct EdgeStartDoc {
    pub surface_c: f64,
    #[serde(rename = "gradient_k_per_m")]
    pub gradient_k_m: f64,
}

#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct EdgeGridDoc {
    pub fine_m: f64,
    pub growth_ratio: f64,
    pub max_cell_m: f64,
}

/// Move a field path of the 1D machinery or the core under the section's own names.
fn edge_path(field: &str) -> String {
    if field == "winter" {
        // The column run as a whole (a step that did not converge).
        return "edge".into();
    }
    let f = field
        .replace("winter.surface", "edge.outside")
        .replace("winter.initial.temperature_c", "edge.start.surface_c")
        .replace("winter.", "edge.")
        .replace(
            "edge.wall_board.board.thickness_m",
            "edge.wall_board.thickness_m",
        )
        .replace("edge.wall_board.board.", "edge.wall_board.material.")
        .replace("edge.wing.board.thickness_m", "edge.wing.thickness_m")
        .replace("edge.wing.board.", "edge.wing.material.");
    match f.strip_prefix("layers[") {
        Some(rest) => format!("edge.soil[{rest}"),
        None => f,
    }
}

fn moved(e: InputErrors) -> InputErrors {
    moved_by(e, edge_path)
}

/// The errors with every field path mapped by `path` (a core's names to the scenario's).
pub(crate) fn moved_by(e: InputErrors, path: impl Fn(&str) -> String) -> InputErrors {
    InputErrors(
        e.0.into_iter()
            .map(|mut x| {
                x.field = path(&x.field);
                x
            })
            .collect(),
    )
}

/// A board from an insulation material: its conductivity is the resolved one, which
/// carries the moisture derating (k / (1 − derating), so R × (1 − derating)).
fn board_of(
    doc: &MaterialDoc,
    thickness_m: f64,
    field: &str,
    errs: &mut InputErrors,
    warnings: &mut Vec<crate::physics::error::Warning>,
) -> Option<(Board, f64)> {
    let derating = match doc {
        MaterialDoc::Insulation {
            moisture_derating_pct,
            ..
        } => *moisture_derating_pct,
        _ => {
            errs.push(
                format!("{field}.material"),
                InputErrorKind::NotCovered("a board must be an insulation material".into()),
            );
            return None;
        }
    };
    match MaterialSpec::from(doc).resolve(&format!("{field}.material"), warnings) {
        Ok(m) => Some((
            Board {
                thickness_m,
                conductivity_w_m_k: m.conductivity.unfrozen.k(5.0),
                heat_capacity_j_m3_k: m.c_unfrozen_j_m3k,
            },
            derating,
        )),
        Err(e) => {
            errs.0.extend(e.0);
            None
        }
    }
}

fn material_of(
    doc: &MaterialDoc,
    field: &str,
    errs: &mut InputErrors,
    warnings: &mut Vec<crate::physics::error::Warning>,
) -> Option<Material> {
    match MaterialSpec::from(doc).resolve(field, warnings) {
        Ok(m) => Some(m),
        Err(e) => {
            errs.0.extend(e.0);
            None
        }
    }
}

/// Everything a run of the section needs, checked.
struct Prepared {
    section: EdgeSection,
    column: WinterJob,
    climate: Climate,
    deratings: Vec<(&'static str, f64)>,
    warnings: Vec<ErrorDoc>,
    /// Mean resistance of the outside film and the snow over the days the air is below
    /// 0 °C, m²K/W (None for an n-factor surface).
    surface_resistance_m2k_w: Option<f64>,
}

/// The ground to add below the soil bands (cut to the section's depth) so that the section
/// is [`crate::physics::transient::periodic::DEEP_GROUND_DAMPING_DEPTHS`] damping depths
/// deep, m; 0 when it already is, or when a band does not resolve (its error is reported
/// where the bands are checked).
fn added_ground_m(soil: &[LayerDoc]) -> f64 {
    let stack = Stack {
        layers: soil
            .iter()
            .map(|l| Layer {
                name: l.name.clone(),
                thickness_m: l.thickness_m,
                material: (&l.material).into(),
            })
            .collect(),
        top: Boundary::Surface { temperature_c: 0.0 },
        bottom: Boundary::Surface { temperature_c: 0.0 },
    };
    match stack.resolve() {
        Ok(r) => {
            let t: Vec<f64> = r.layers.iter().map(|l| l.thickness_m).collect();
            crate::physics::transient::periodic::deep_ground_extension_m(&t, &r.materials)
        }
        Err(_) => 0.0,
    }
}

impl EdgeDoc {
    /// The section as the 2D run takes it (materials resolved, boards derated) and its
    /// climate, every error at once with fields under `edge.`.
    pub fn section_and_climate(&self) -> Result<(EdgeSection, Climate), InputErrors> {
        let p = self.prepare()?;
        Ok((p.section, p.climate))
    }

    /// The soil bands cut to the section's depth (the last one reaching the bottom).
    fn soil_to_depth(&self) -> Vec<LayerDoc> {
        let mut out = Vec::new();
        let mut top = 0.0;
        for l in &self.soil {
            if !(l.thickness_m.is_finite() && l.thickness_m > 0.0) {
                return self.soil.clone();
            }
            let mut l = l.clone();
            if top + l.thickness_m >= self.depth_m {
                l.thickness_m = self.depth_m - top;
                out.push(l);
                return out;
            }
            top += l.thickness_m;
            out.push(l);
        }
        if let Some(last) = out.last_mut() {
            last.thickness_m += self.depth_m - top;
        }
        out
    }

    fn prepare(&self) -> Result<Prepared, InputErrors> {
        let mut errs = InputErrors::default();
        let mut core_warnings = Vec::new();
        if self.soil.is_empty() || self.soil.len() > MAX_SOIL_BANDS {
            errs.push(
                "edge.soil",
                InputErrorKind::Count {
                    count: self.soil.len(),
                    min: 1,
                    max: MAX_SOIL_BANDS,
                },
            );
        }
        for (k, s) in self.soil.iter().enumerate() {
            check::within(
                &mut errs,
                &format!("edge.soil[{k}].thickness_m"),
                s.thickness_m,
                0.01,
                100.0,
                "m",
            );
        }
        let depth_ok = check::within(&mut errs, "edge.depth_m", self.depth_m, 1.0, 100.0, "m");
        check::within(
            &mut errs,
            "edge.field_every_days",
            self.field_every_days,
            1.0,
            MAX_EDGE_DAYS,
            "days",
        );
        check::within(
            &mut errs,
            "edge.start.surface_c",
            self.start.surface_c,
            -60.0,
            60.0,
            "°C",
        );
        check::within(
            &mut errs,
            "edge.start.gradient_k_per_m",
            self.start.gradient_k_m,
            -1.0,
            1.0,
            "K/m",
        );
        if let Some(d) = self.duration_days {
            check::within(
                &mut errs,
                "edge.duration_days",
                d,
                1.0,
                MAX_EDGE_DAYS,
                "days",
            );
        }
        // The far-field column through the 1D winter machinery.
        let mut soil = if depth_ok && errs.is_empty() {
            self.soil_to_depth()
        } else {
            self.soil.clone()
        };
        // Unless the bottom is held at the section's depth, the deepest band goes on down to
        // where the year's wave has died (as a winter run's column does, see `DeepDoc`); the
        // column then takes the section's bottom as its own.
        let mut depth_m = self.depth_m;
        if depth_ok && errs.is_empty() && !self.bottom.at_layers_bottom() {
            let added = added_ground_m(&soil);
            if let (Some(last), true) = (soil.last_mut(), added > 0.0) {
                last.thickness_m += added;
                depth_m += added;
            }
        }
        let winter = WinterDoc {
            climate: self.climate.clone(),
            surface: self.outside.clone(),
            bottom: self.bottom.held_at_layers_bottom(true),
            initial: InitialDoc::Uniform {
                temperature_c: self.start.surface_c,
            },
            grid: None,
            step_s: self.step_s,
            duration_days: self.duration_days,
            least_thickness: None,
        };
        let stack = Stack {
            layers: soil
                .iter()
                .map(|l| Layer {
                    name: l.name.clone(),
                    thickness_m: l.thickness_m,
                    material: (&l.material).into(),
                })
                .collect(),
            top: Boundary::Surface { temperature_c: 0.0 },
            bottom: Boundary::Surface { temperature_c: 0.0 },
        };
        let column = if soil.is_empty() || soil.len() > MAX_SOIL_BANDS {
            None
        } else {
            match stack.resolve() {
                Ok(resolved) => match winter.run_spec(&resolved, &soil) {
                    Ok((spec, climate)) => match WinterJob::new(&winter, &resolved, &soil) {
                        Ok(job) => Some((spec, climate, job, resolved)),
                        Err(e) => {
                            errs.0.extend(moved(e).0);
                            None
                        }
                    },
                    Err(e) => {
                        errs.0.extend(moved(e).0);
                        None
                    }
                },
                Err(e) => {
                    errs.0.extend(moved(e).0);
                    // Still check the climate, surface and bottom, on a stand-in column.
                    let stand_in = Stack {
                        layers: vec![Layer {
                            name: String::new(),
                            thickness_m: 5.0,
                            material: MaterialSpec::Concrete {
                                conductivity_w_m_k: None,
                            },
                        }],
                        ..stack.clone()
                    };
                    if let Ok(r) = stand_in.resolve() {
                        if let Err(e) = winter.run_spec(&r, &[]) {
                            errs.0.extend(moved(e).0);
                        }
                    }
                    None
                }
            }
        };
        let slab = material_of(
            &self.slab.material,
            "edge.slab.material",
            &mut errs,
            &mut core_warnings,
        );
        let wall = material_of(
            &self.wall.material,
            "edge.wall.material",
            &mut errs,
            &mut core_warnings,
        );
        let mut deratings = Vec::new();
        let wall_board = self.wall_board.as_ref().and_then(|b| {
            board_of(
                &b.material,
                b.thickness_m,
                "edge.wall_board",
                &mut errs,
                &mut core_warnings,
            )
            .map(|(board, d)| {
                deratings.push(("wall board", d));
                WallBoard {
                    board,
                    depth_m: b.depth_m,
                }
            })
        });
        let wing = self.wing.as_ref().and_then(|b| {
            board_of(
                &b.material,
                b.thickness_m,
                "edge.wing",
                &mut errs,
                &mut core_warnings,
            )
            .map(|(board, d)| {
                deratings.push(("wing", d));
                Wing {
                    board,
                    width_m: b.width_m,
                    depth_m: b.depth_m,
                }
            })
        });
        // One message per field and problem (the column and the section check some alike).
        let mut seen = std::collections::HashSet::new();
        errs.0
            .retain(|e| seen.insert((e.field.clone(), e.to_string())));
        let g = self.grid.unwrap_or(DEFAULT_GRID);
        let (Some((spec, climate, job, resolved)), Some(slab), Some(wall), true) =
            (column, slab, wall, errs.is_empty())
        else {
            return Err(errs);
        };
        if self.wall_board.is_some() && wall_board.is_none()
            || self.wing.is_some() && wing.is_none()
        {
            return Err(errs);
        }
        let duration_s = spec.duration_s;
        if duration_s > MAX_EDGE_DAYS * DAY + 1.0 {
            errs.push(
                if self.duration_days.is_some() {
                    "edge.duration_days"
                } else {
                    "edge.climate"
                },
                InputErrorKind::NotCovered(format!(
                    "the run lasts {:.0} days; an edge run lasts at most {MAX_EDGE_DAYS:.0} \
                     days (set duration_days)",
                    duration_s / DAY
                )),
            );
        }
        if duration_s / self.step_s > MAX_EDGE_STEPS {
            errs.push(
                "edge.step_s",
                InputErrorKind::NotCovered(format!(
                    "the run would take {:.0} steps; at most {MAX_EDGE_STEPS:.0} (take a longer \
                     step or a shorter run)",
                    duration_s / self.step_s
                )),
            );
        }
        errs.clone().into_result()?;
        let section = EdgeSection {
            inside_half_width_m: self.inside_half_width_m,
            outside_extent_m: self.outside_extent_m,
            depth_m,
            slab: Slab {
                thickness_m: self.slab.thickness_m,
                material: slab,
            },
            wall: FoundationWall {
                width_m: self.wall.width_m,
                base_depth_m: self.wall.base_depth_m,
                material: wall,
            },
            wall_board,
            wing,
            soil: resolved
                .materials
                .iter()
                .zip(&soil)
                .zip(&spec.curves)
                .map(|((m, l), c)| SoilBand {
                    thickness_m: l.thickness_m,
                    material: m.clone(),
                    curve: *c,
                })
                .collect(),
            inside: match self.inside {
                EdgeInsideDoc::Heated { air_c, film_w_m2k } => Inside::Heated { air_c, film_w_m2k },
                EdgeInsideDoc::Closed => Inside::Closed,
            },
            outside: match self.outside {
                SurfaceDoc::Film {
                    film_w_m2k,
                    snow_regression,
                } => Outside::Film {
                    film_w_m2k,
                    snow_regression: snow_regression.into(),
                },
                SurfaceDoc::NFactor {
                    freezing, thawing, ..
                } => Outside::NFactor { freezing, thawing },
            },
            bottom: spec.bottom,
            start: StartTemperature {
                surface_c: self.start.surface_c,
                gradient_k_m: self.start.gradient_k_m,
            },
            grid: AxisSpacing {
                fine_m: g.fine_m,
                growth_ratio: g.growth_ratio,
                max_cell_m: g.max_cell_m,
            },
            step_s: self.step_s,
            duration_s,
            field_every_s: self.field_every_days * DAY,
        };
        section.validate("edge").map_err(moved)?;
        let mut warnings: Vec<ErrorDoc> = core_warnings
            .iter()
            .map(|w| {
                let mut d = ErrorDoc::from(w);
                d.field = edge_path(&d.field);
                d
            })
            .collect();
        warnings.dedup_by(|a, b| a.field == b.field && a.message == b.message);
        let surface_resistance_m2k_w = match section.outside {
            Outside::Film {
                film_w_m2k,
                snow_regression,
            } => Some(hand::film_and_snow_resistance(
                film_w_m2k,
                snow_regression,
                &climate,
                duration_s,
            )),
            Outside::NFactor { .. } => None,
        };
        Ok(Prepared {
            section,
            column: job,
            climate,
            deratings,
            warnings,
            surface_resistance_m2k_w,
        })
    }
}

fn solver_error(e: EdgeError) -> InputErrors {
    match e {
        EdgeError::Input(errs) => moved(errs),
        other => InputError::new("edge", InputErrorKind::NotCovered(other.to_string())).into(),
    }
}

/// An edge run under way, advanced a slice at a time (the page shows its progress and stays
/// responsive): the 2D section and, beside it, the far-field soil column by the 1D winter
/// machinery. [`run_edge_scenario`] drives one to the end.
#[derive(Debug, Clone)]
pub struct EdgeJob {
    run: EdgeRun,
    column: WinterJob,
    column_done: bool,
    climate: Climate,
    section: EdgeSection,
    deratings: Vec<(&'static str, f64)>,
    warnings: Vec<ErrorDoc>,
    surface_resistance_m2k_w: Option<f64>,
    given: GivenBottom,
}

/// The section's depth as entered, and whether its deep condition is held there (else the
/// deepest band was continued below it).
#[derive(Debug, Clone, Copy)]
struct GivenBottom {
    depth_m: f64,
    held: bool,
}

impl EdgeJob {
    /// Check the section (every error at once, fields under `edge.`) and set the runs up.
    pub fn new(doc: &EdgeDoc) -> Result<EdgeJob, InputErrors> {
        let p = doc.prepare()?;
        let run = EdgeRun::new(&p.section, "edge").map_err(solver_error)?;
        Ok(EdgeJob {
            run,
            column: p.column,
            column_done: false,
            climate: p.climate,
            section: p.section,
            deratings: p.deratings,
            warnings: p.warnings,
            surface_resistance_m2k_w: p.surface_resistance_m2k_w,
            given: GivenBottom {
                depth_m: doc.depth_m,
                held: doc.bottom.at_layers_bottom(),
            },
        })
    }

    /// The section as the 2D run takes it (materials resolved, boards derated).
    pub fn section(&self) -> &EdgeSection {
        &self.section
    }

    /// Cells of the section's grid.
    pub fn cells(&self) -> usize {
        self.run.layout().plane.len()
    }

    /// Advance by at most `max_steps` steps of the 2D run (the column, a hundred times
    /// cheaper, runs to its end in the first call); the share of the 2D work done.
    pub fn advance(&mut self, max_steps: usize) -> Result<Progress, InputErrors> {
        if !self.column_done {
            self.column_done = self.column.advance(usize::MAX).map_err(moved)?.finished;
        }
        let p = self
            .run
            .advance(&self.climate, max_steps)
            .map_err(solver_error)?;
        Ok(Progress {
            fraction: p.fraction,
            finished: p.finished && self.column_done,
        })
    }

    pub fn progress(&self) -> Progress {
        let p = self.run.progress();
        Progress {
            fraction: p.fraction,
            finished: p.finished && self.column_done,
        }
    }

    /// The report (of the part run, if called before the end).
    pub fn finish(self) -> EdgeReport {
        let column = self.column.finish();
        let r = self.run.finish();
        build_report(
            &self.section,
            r,
            column,
            self.deratings,
            self.warnings,
            self.surface_resistance_m2k_w,
            self.given,
        )
    }
}

/// Run an edge section to the end and build its report.
pub fn run_edge_scenario(doc: &EdgeDoc) -> Result<EdgeReport, InputErrors> {
    let mut job = EdgeJob::new(doc)?;
    while !job.advance(usize::MAX)?.finished {}
    Ok(job.finish())
}

/// One day of the edge report (values at the end of the day; the slab's heat loss is the
/// mean over the day's steps).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct EdgeDay {
    pub day: f64,
    pub air_c: f64,
    /// Frost below the footing's base, m (negative: the 0 °C point stays that far above it).
    pub frost_below_base_m: f64,
    pub far_frost_depth_m: f64,
    /// Heat lost by the slab to the ground, W per metre of wall.
    pub slab_heat_w_m: f64,
    /// Frost depth of the 1D column run on the same day, m below grade.
    pub column_frost_depth_m: f64,
}

/// A rectangle of the section for the chart, m (x from the slab's centre line, z depth).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct OutlineDoc {
    /// `slab`, `wall`, `wall-board`, `wing`.
    pub part: &'static str,
    pub x0_m: f64,
    pub x1_m: f64,
    pub z0_m: f64,
    pub z1_m: f64,
}

/// One of the notes always shown with an edge result.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CautionDoc {
    pub id: &'static str,
    pub text: String,
}

/// The report of an edge run (SI).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct EdgeReport {
    /// Deepest frost below the footing's base over the run, m: positive below the base,
    /// negative when frost stays above the base by that much.
    pub max_frost_below_base_m: f64,
    pub max_frost_below_base_day: f64,
    pub frost_below_base: bool,
    pub base_depth_m: f64,
    /// Deepest frost in the far-side column of the 2D run, m below grade.
    pub far_frost_depth_m: f64,
    /// Deepest frost of the 1D column run on the far-field soil, m below grade.
    pub column_frost_depth_m: f64,
    pub mean_slab_heat_w_m: f64,
    pub peak_slab_heat_w_m: f64,
    pub air_freezing_index_c_days: f64,
    /// At the outside ground surface (under the film and snow), from the 1D column run.
    pub surface_freezing_index_c_days: f64,
    pub nx: usize,
    pub nz: usize,
    pub cells: usize,
    pub steps: u64,
    pub iterations: u64,
    pub energy_imbalance_relative: f64,
    /// Width and depth of the section as run, m (the depth entered and any ground added
    /// below it).
    pub width_m: f64,
    pub depth_m: f64,
    /// The section's depth as entered, m; `depth_m` is deeper where the deepest soil band
    /// was continued down to where the year's wave has died.
    pub given_depth_m: f64,
    /// Frost reached the bottom of the section (in the 2D far field or the 1D column): the
    /// far-field frost depths are then lower bounds, and a warning says what to change.
    pub frost_at_bottom: bool,
    pub daily: Vec<EdgeDay>,
    pub outlines: Vec<OutlineDoc>,
    /// Days with a kept temperature field.
    pub field_days: Vec<f64>,
    pub warnings: Vec<ErrorDoc>,
    pub hand_methods: Vec<HandMethodRow>,
    pub cautions: Vec<CautionDoc>,
    /// Cell faces of the grid, m; left out of the JSON (they go with the fields).
    #[serde(skip)]
    pub x_faces_m: Vec<f64>,
    #[serde(skip)]
    pub z_faces_m: Vec<f64>,
    /// The kept fields; left out of the JSON (the CLI writes one as CSV on request).
    #[serde(skip)]
    pub fields: Vec<EdgeField>,
    /// The search of `edge.least`, when asked for (the CLI runs it; the page runs it on
    /// request through its own job).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub least: Option<crate::document::edge::EdgeLeastReport>,
}

impl EdgeReport {
    /// The kept field nearest to `day`.
    pub fn field_near(&self, day: f64) -> Option<&EdgeField> {
        self.fields.iter().min_by(|a, b| {
            (a.time_s / DAY - day)
                .abs()
                .partial_cmp(&(b.time_s / DAY - day).abs())
                .unwrap_or(std::cmp::Ordering::Equal)
        })
    }
}

/// The notes always shown with an edge result (plain words; the derating used is stated).
pub fn cautions(deratings: &[(&'static str, f64)]) -> Vec<CautionDoc> {
    let derating = if deratings.is_empty() {
        "This section has no insulation boards.".to_string()
    } else {
        let parts: Vec<String> = deratings
            .iter()
            .map(|(p, d)| format!("{p} R derated by {d:.0} %"))
            .collect();
        format!("Used here: {}.", parts.join(", "))
    };
    vec![
        CautionDoc {
            id: "frost-heave",
            text: "Frost heave can lift and crack footings and slabs when frozen ground reaches \
                   under them in a soil that holds water."
                .into(),
        },
        CautionDoc {
            id: "estimates-only",
            text: "These are estimates for design study. They are no substitute for the governing \
                   frost-protected shallow foundation standard, local codes and a licensed \
                   engineer."
                .into(),
        },
        CautionDoc {
            id: "board-moisture",
            text: format!(
                "Buried insulation takes up moisture and loses part of its R-value, so derate it \
                 (the board's moisture derating). {derating}"
            ),
        },
        CautionDoc {
            id: "long-wall",
            text: "The run assumes a long straight wall: corners lose more heat and freeze \
                   deeper. It takes the soil and the climate as entered."
                .into(),
        },
    ]
}

fn outlines(s: &EdgeSection) -> Vec<OutlineDoc> {
    let (xi, xo) = s.wall_faces_m();
    let mut v = vec![
        OutlineDoc {
            part: "slab",
            x0_m: 0.0,
            x1_m: xi,
            z0_m: 0.0,
            z1_m: s.slab.thickness_m,
        },
        OutlineDoc {
            part: "wall",
            x0_m: xi,
            x1_m: xo,
            z0_m: 0.0,
            z1_m: s.wall.base_depth_m,
        },
    ];
    if let Some(b) = &s.wall_board {
        v.push(OutlineDoc {
            part: "wall-board",
            x0_m: xo,
            x1_m: xo + b.board.thickness_m,
            z0_m: 0.0,
            z1_m: b.depth_m,
        });
    }
    if let Some(w) = &s.wing {
        v.push(OutlineDoc {
            part: "wing",
            x0_m: xo,
            x1_m: xo + w.width_m,
            z0_m: w.depth_m,
            z1_m: w.depth_m + w.board.thickness_m,
        });
    }
    v
}

fn build_report(
    s: &EdgeSection,
    r: crate::physics::edge2d::EdgeResult,
    column: WinterReport,
    deratings: Vec<(&'static str, f64)>,
    mut warnings: Vec<ErrorDoc>,
    surface_resistance_m2k_w: Option<f64>,
    given: GivenBottom,
) -> EdgeReport {
    // The column's own note on frost at its bottom speaks of a winter's layers; the section's
    // note below replaces it.
    warnings.extend(
        column
            .warnings
            .iter()
            .filter(|w| w.field != "winter.bottom")
            .cloned()
            .map(|mut w| {
                w.field = edge_path(&w.field);
                w
            }),
    );
    let last_centre_m = match r.z_faces_m.as_slice() {
        [.., a, b] => 0.5 * (a + b),
        _ => s.depth_m,
    };
    let frost_at_bottom = column.frost_at_bottom || r.max_far_frost_depth_m >= last_centre_m;
    if frost_at_bottom {
        warnings.push(frost_at_section_bottom(s.depth_m, given));
    }
    let column_frost = |day: f64| {
        column
            .daily
            .iter()
            .find(|c| (c.day - day).abs() < 1e-6)
            .map_or(f64::NAN, |c| c.frost_depth_m)
    };
    let mut daily = Vec::new();
    let mut next = DAY;
    let (mut q_sum, mut q_n) = (0.0, 0usize);
    for d in &r.records {
        q_sum += d.slab_heat_w_m;
        q_n += 1;
        if d.time_s >= next - 1e-6 {
            daily.push(EdgeDay {
                day: d.time_s / DAY,
                air_c: d.air_c,
                frost_below_base_m: d.frost_below_base_m,
                far_frost_depth_m: d.far_frost_depth_m,
                slab_heat_w_m: q_sum / q_n as f64,
                column_frost_depth_m: column_frost(d.time_s / DAY),
            });
            (q_sum, q_n) = (0.0, 0);
            next += DAY;
        }
    }
    let peak = r
        .records
        .iter()
        .map(|d| d.slab_heat_w_m)
        .fold(0.0, f64::max);
    let base = s.wall.base_depth_m;
    let below = r.max_frost_below_base_m;
    let hand = hand_rows(
        s,
        &column,
        surface_resistance_m2k_w,
        r.max_far_frost_depth_m,
        base + below,
    );
    let cells = r.nx * r.nz;
    let (_, xo) = s.wall_faces_m();
    EdgeReport {
        max_frost_below_base_m: below,
        max_frost_below_base_day: r.max_frost_below_base_time_s / DAY,
        frost_below_base: below > 0.0,
        base_depth_m: base,
        far_frost_depth_m: r.max_far_frost_depth_m,
        column_frost_depth_m: column.max_frost_depth_m,
        mean_slab_heat_w_m: r.mean_slab_heat_w_m,
        peak_slab_heat_w_m: peak,
        air_freezing_index_c_days: column.air_freezing_index_c_days,
        surface_freezing_index_c_days: column.surface_freezing_index_c_days,
        nx: r.nx,
        nz: r.nz,
        cells,
        steps: r.steps,
        iterations: r.iterations,
        energy_imbalance_relative: (r.energy_imbalance_j_m / r.energy_throughput_j_m.max(1e-300))
            .abs(),
        width_m: xo + s.outside_extent_m,
        depth_m: s.depth_m,
        given_depth_m: given.depth_m,
        frost_at_bottom,
        daily,
        outlines: outlines(s),
        field_days: r.fields.iter().map(|f| f.time_s / DAY).collect(),
        warnings,
        hand_methods: hand,
        cautions: cautions(&deratings),
        x_faces_m: r.x_faces_m,
        z_faces_m: r.z_faces_m,
        fields: r.fields,
        least: None,
    }
}

/// The warning when frost reached the section's bottom.
fn frost_at_section_bottom(depth_m: f64, given: GivenBottom) -> ErrorDoc {
    let text = if given.held {
        format!(
            "Frost reached the bottom of the section, {depth_m:.2} m down, where the deep \
             condition is held: the far-field frost goes at least that deep and may go deeper. \
             Let the run add ground below the section (do not hold the deep condition at its \
             bottom), or make the section deeper; check the climate and the deep boundary."
        )
    } else {
        format!(
            "Frost reached the bottom of the modelled ground, {depth_m:.2} m down (the \
             {:.2} m entered and the deepest soil band continued below it): the far-field \
             frost goes at least that deep and may go deeper. Check the climate's mean \
             temperature and the deep boundary; ground that stays frozen from year to year \
             (permafrost) is outside this model of seasonal frost.",
            given.depth_m
        )
    };
    ErrorDoc::plain("edge.bottom", text)
}

/// The hand methods on the edge's far-field case beside the runs (models.md §4). The rows
/// of the 1D winter report on the soil column (Stefan's law, modified Berggren; each from
/// the column run's ground-surface freezing index), Stefan's law from the air freezing index
/// with the outside film and the snow as a resistance (their mean over the days below
/// 0 °C), the 1D column run, the 2D far field and the 2D result at the footing.
fn hand_rows(
    s: &EdgeSection,
    column: &WinterReport,
    surface_resistance_m2k_w: Option<f64>,
    far_2d_m: f64,
    footing_m: f64,
) -> Vec<HandMethodRow> {
    let mut rows = Vec::new();
    for row in &column.hand_methods {
        match row.method {
            "stefan" => {
                let mut r = row.clone();
                r.note = format!(
                    "{}; from the surface freezing index; ignores the building's heat",
                    r.note
                );
                rows.push(r);
            }
            "stefan-resistance" => {
                let first = s.soil.iter().find(|b| hand::freezes(&b.material));
                match (surface_resistance_m2k_w, first) {
                    (Some(rs), Some(b)) => {
                        let fa = column.air_freezing_index_c_days * DAY;
                        rows.push(HandMethodRow {
                            method: "stefan-resistance",
                            name: "Stefan's law under the film and snow",
                            depth_m: Some(hand::stefan_under_resistance_m(&b.material, fa, rs)),
                            note: format!(
                                "air freezing index, film and snow as {rs:.2} m²K/W (mean over \
                                 the freezing days); ignores sensible heat and the building"
                            ),
                        });
                    }
                    _ => {
                        let mut r = row.clone();
                        r.note = format!("{}; n-factor surface: the surface index", r.note);
                        rows.push(r);
                    }
                }
            }
            "berggren" => {
                let mut r = row.clone();
                r.note = format!("{}; ignores the building's heat", r.note);
                rows.push(r);
            }
            "transient" => rows.push(HandMethodRow {
                method: "column",
                name: "1D column run (far-field soil)",
                depth_m: Some(column.max_frost_depth_m),
                note: "the far-field soil alone, snow as layers of its own; ignores the building"
                    .into(),
            }),
            _ => rows.push(row.clone()),
        }
    }
    rows.push(HandMethodRow {
        method: "far-field-2d",
        name: "2D run, far side",
        depth_m: Some(far_2d_m),
        note: "the far-side column of the section; snow as a resistance that stores no heat".into(),
    });
    rows.push(HandMethodRow {
        method: "footing-2d",
        name: "2D run, at the footing",
        depth_m: Some(footing_m),
        note: format!(
            "frost depth below grade under the footing (base at {:.2} m): the building's heat, \
             footing and boards, sideways flow",
            s.wall.base_depth_m
        ),
    });
    rows
}

/// Heat per metre of wall: the symbol of the units table's `linear_heat` (W/m, or Btu/h
/// per foot).
pub fn linear_heat_symbol(sys: crate::physics::units::UnitSystem) -> &'static str {
    crate::physics::units::quantity("linear_heat").map_or("W/m", |q| q.unit(sys).symbol)
}

/// A heat per metre of wall in the chosen units (the units table's `linear_heat`).
pub fn linear_heat_shown(sys: crate::physics::units::UnitSystem, w_m: f64) -> f64 {
    crate::physics::units::quantity("linear_heat").map_or(w_m, |q| q.show(sys, w_m))
}

/// The daily series as CSV text in the chosen units, units in the header.
pub fn edge_daily_csv(r: &EdgeReport, sys: crate::physics::units::UnitSystem) -> String {
    use crate::physics::units::quantity;
    let cols: [(&str, &str); 4] = [
        ("air temperature", "temperature"),
        ("frost below footing base", "depth"),
        ("far-field frost depth", "depth"),
        ("slab heat loss", "linear_heat"),
    ];
    let mut out = String::from("day");
    for (name, q) in cols {
        let sym = quantity(q).map_or(linear_heat_symbol(sys), |q| q.unit(sys).symbol);
        out.push_str(&format!(",{name} [{sym}]"));
    }
    out.push('\n');
    for d in &r.daily {
        let values = [
            d.air_c,
            d.frost_below_base_m,
            d.far_frost_depth_m,
            d.slab_heat_w_m,
        ];
        out.push_str(&format!("{:.3}", d.day));
        for ((_, q), v) in cols.iter().zip(values) {
            let (shown, places) = quantity(q).map_or((linear_heat_shown(sys, v), 3), |q| {
                (q.show(sys, v), usize::from(q.unit(sys).decimals) + 2)
            });
            out.push_str(&format!(",{shown:.places$}"));
        }
        out.push('\n');
    }
    out
}

/// The kept field nearest `day` as CSV (cell centres x and z, temperature, frozen fraction),
/// units in the header; a comment line names the day of the field. Empty (header only) when
/// no field was kept.
pub fn edge_field_csv(r: &EdgeReport, day: f64, sys: crate::physics::units::UnitSystem) -> String {
    use crate::physics::units::quantity;
    let sym = |q: &str, si: &str| quantity(q).map_or(si.to_string(), |q| q.unit(sys).symbol.into());
    let show = |q: &str, v: f64| quantity(q).map_or(v, |q| q.show(sys, v));
    let mut out = String::new();
    let field = r.field_near(day);
    if let Some(f) = field {
        out.push_str(&format!("# field of day {:.3}\n", f.time_s / DAY));
    }
    out.push_str(&format!(
        "x [{}],z [{}],temperature [{}],frozen fraction\n",
        sym("length", "m"),
        sym("length", "m"),
        sym("temperature", "°C")
    ));
    let Some(f) = field else {
        return out;
    };
    let nx = r.x_faces_m.len().saturating_sub(1);
    let nz = r.z_faces_m.len().saturating_sub(1);
    if f.temperature_c.len() != nx * nz {
        return out;
    }
    for j in 0..nz {
        let z = 0.5 * (r.z_faces_m[j] + r.z_faces_m[j + 1]);
        for i in 0..nx {
            let x = 0.5 * (r.x_faces_m[i] + r.x_faces_m[i + 1]);
            let k = j * nx + i;
            out.push_str(&format!(
                "{:.4},{:.4},{:.3},{:.3}\n",
                show("length", x),
                show("length", z),
                show("temperature", f.temperature_c[k]),
                f.frozen_fraction[k]
            ));
        }
    }
    out
}

/// What a cell is, as a word (for tests and tools).
pub fn region_name(r: Region) -> &'static str {
    match r {
        Region::Soil(_) => "soil",
        Region::Slab => "slab",
        Region::Wall => "wall",
        Region::WallBoard => "wall-board",
        Region::Wing => "wing",
    }
}

/// What the search varies.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, JsonSchema)]
#[serde(rename_all = "kebab-case")]
pub enum EdgeQuantityDoc {
    /// The wing board's width out from the wall, m.
    WingWidth,
    /// The wing board's R-value, m²K/W.
    WingR,
    /// The R-value of the board against the wall, m²K/W.
    WallBoardR,
    /// The footing base's depth below grade, m.
    FootingDepth,
}

impl From<EdgeQuantityDoc> for EdgeQuantity {
    fn from(q: EdgeQuantityDoc) -> Self {
        match q {
            EdgeQuantityDoc::WingWidth => EdgeQuantity::WingWidth,
            EdgeQuantityDoc::WingR => EdgeQuantity::WingR,
            EdgeQuantityDoc::WallBoardR => EdgeQuantity::WallBoardR,
            EdgeQuantityDoc::FootingDepth => EdgeQuantity::FootingDepth,
        }
    }
}

/// `edge.least`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, JsonSchema)]
#[serde(deny_unknown_fields)]
pub struct EdgeLeastDoc {
    pub quantity: EdgeQuantityDoc,
    /// The least value to try (the quantity's SI unit).
    pub min: f64,
    /// The most to try.
    pub max: f64,
    /// The answer is found to within this.
    pub resolution: f64,
}

/// One run of the search, as reported.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct EdgeTrialDoc {
    pub value: f64,
    /// Deepest frost below the footing base in that run, m (≤ 0: frost stays above it).
    pub frost_below_base_m: f64,
}

impl From<&EdgeTrial> for EdgeTrialDoc {
    fn from(t: &EdgeTrial) -> Self {
        EdgeTrialDoc {
            value: t.value,
            frost_below_base_m: t.frost_below_base_m,
        }
    }
}

/// The search's report (SI; values in the quantity's unit).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct EdgeLeastReport {
    /// `wing-width`, `wing-r`, `wall-board-r` or `footing-depth`.
    pub quantity: &'static str,
    /// `m` or `m²K/W`.
    pub unit: &'static str,
    /// `found`, `smallest-suffices`, `not-reachable`, `not-monotone` or `run-limit`.
    pub outcome: &'static str,
    /// The least value that holds (found, run-limit) or the smallest of the range
    /// (smallest-suffices); absent otherwise.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub value: Option<f64>,
    /// Frost below the base at `value` (or in the last run), m.
    pub frost_below_base_m: f64,
    /// The sensitivity d(frost below base)/d(value) near the answer (m per unit; negative:
    /// more lifts the frost), from the failing side; absent with fewer than two failing runs.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub slope: Option<f64>,
    /// How far frost below base drops across the last bracket, m: the read-off jumps when
    /// the last frozen cell under the footing thaws.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub jump_m: Option<f64>,
    /// The last bracket: the largest failing and the smallest holding value.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub bracket: Option<[f64; 2]>,
    pub resolution: f64,
    pub trials: Vec<EdgeTrialDoc>,
}

impl From<&EdgeLeastAnswer> for EdgeLeastReport {
    fn from(r: &EdgeLeastAnswer) -> Self {
        EdgeLeastReport {
            quantity: r.quantity.id(),
            unit: r.quantity.unit(),
            outcome: r.outcome.id(),
            value: r.value,
            frost_below_base_m: r.frost_below_base_m,
            slope: r.slope,
            jump_m: r.jump_m,
            bracket: r.bracket.map(|(a, b)| [a, b]),
            resolution: r.resolution,
            trials: r.trials.iter().map(EdgeTrialDoc::from).collect(),
        }
    }
}
