//! The cross-section's inputs (slab, wall, boards, soil bands, inside and outside), their
//! checks with field paths, and the grid and regions they lay out.
//!
//! - [`EdgeSection::validate`] checks every input at once, each path under the caller's
//!   prefix (`edge.wing.width_m`; a board's own fields as `….board.thickness_m`).
//! - [`EdgeSection::layout`] builds the [`Layout`]: every region face is a required cell
//!   face along its axis (both faces of a board) and every edge a focus of fine cells
//!   ([`super::axis`]); more than [`MAX_CELLS`] cells is refused. Regions are painted in
//!   the order soil, slab, wall, vertical board, wing, each cell taking the region its
//!   centre lies in; a board is a `Phase::Inert` cell, everything else the phase of its
//!   material.
//! - The tops of the columns come in three groups ([`TOP_INSIDE`], [`TOP_WALL`],
//!   [`TOP_OUTSIDE`]): the inside air through a film or closed, the wall's top closed, the
//!   outside as [`Outside`] says.

use super::axis::{self, AxisSpacing};
use super::plane::Plane;
use crate::physics::error::{check, InputErrorKind, InputErrors};
use crate::physics::materials::{ConductivityLaw, Material, SnowRegression};
use crate::physics::transient::phase::{Phase, UnfrozenWater};
use crate::physics::transient::BottomCondition;

/// A board of insulation (or any thin layer that stores little heat).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Board {
    pub thickness_m: f64,
    pub conductivity_w_m_k: f64,
    /// Volumetric heat capacity, J/m³/K.
    pub heat_capacity_j_m3_k: f64,
}

impl Board {
    /// A board of thermal resistance `r_m2k_w` (its R-value, SI) and thickness.
    pub fn from_r_value(r_m2k_w: f64, thickness_m: f64, heat_capacity_j_m3_k: f64) -> Board {
        Board {
            thickness_m,
            conductivity_w_m_k: thickness_m / r_m2k_w,
            heat_capacity_j_m3_k,
        }
    }

    /// Thermal resistance, m²K/W.
    pub fn r_value_m2k_w(&self) -> f64 {
        self.thickness_m / self.conductivity_w_m_k
    }

    fn phase(&self) -> Phase {
        Phase::Inert {
            c_frozen: self.heat_capacity_j_m3_k,
            c_unfrozen: self.heat_capacity_j_m3_k,
            law: ConductivityLaw::constant(self.conductivity_w_m_k),
        }
    }

    fn validate(&self, field: &str, errs: &mut InputErrors) {
        check::within(
            errs,
            &format!("{field}.thickness_m"),
            self.thickness_m,
            0.001,
            1.0,
            "m",
        );
        check::within(
            errs,
            &format!("{field}.conductivity_w_m_k"),
            self.conductivity_w_m_k,
            0.005,
            5.0,
            "W/m/K",
        );
        check::within(
            errs,
            &format!("{field}.heat_capacity_j_m3_k"),
            self.heat_capacity_j_m3_k,
            1e3,
            1e7,
            "J/m³/K",
        );
    }
}

/// The slab on grade, from the centre line to the wall.
#[derive(Debug, Clone, PartialEq)]
pub struct Slab {
    pub thickness_m: f64,
    pub material: Material,
}

/// The foundation wall with its footing, as one rectangle from grade to the base.
#[derive(Debug, Clone, PartialEq)]
pub struct FoundationWall {
    pub width_m: f64,
    /// Depth of the footing's base below grade, m.
    pub base_depth_m: f64,
    pub material: Material,
}

/// Vertical insulation against the wall's outer face, from grade down to `depth_m`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct WallBoard {
    pub board: Board,
    pub depth_m: f64,
}

/// Horizontal (wing) insulation running outwards from the wall's outer face.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Wing {
    pub board: Board,
    /// Width from the wall's outer face, m.
    pub width_m: f64,
    /// Depth of the board's top face below grade, m.
    pub depth_m: f64,
}

/// A horizontal soil layer, counted from grade down; the last one reaches the bottom.
#[derive(Debug, Clone, PartialEq)]
pub struct SoilBand {
    pub thickness_m: f64,
    pub material: Material,
    /// An unfrozen-water curve makes the soil freeze over a range ([`Phase::Range`]).
    pub curve: Option<UnfrozenWater>,
}

/// Film on a floor with heat flowing down, W/(m²·K): about 6 (ISO 6946's downward internal
/// surface resistance 0.17 m²·K/W gives 5.9; from memory). The default inside film of a
/// heated building.
pub const FLOOR_FILM_DOWN_W_M2K: f64 = 6.0;

/// The inside of the building, over the slab.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Inside {
    /// Air held at `air_c` meeting the slab through a film (a floor's inside film is about
    /// 6 W/m²K for heat flowing down, ISO 6946 R_si = 0.17 m²K/W; from memory).
    Heated { air_c: f64, film_w_m2k: f64 },
    /// No heat crosses the floor (an unheated building, taken as adiabatic).
    Closed,
}

/// How the outside ground surface meets the weather.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Outside {
    /// Air through a film; the forcing's snow is a resistance depth/k(ρ) in series, k from
    /// `snow_regression` at the snow's density.
    Film {
        film_w_m2k: f64,
        snow_regression: SnowRegression,
    },
    /// Surface held at n × air temperature (freezing n below 0 °C, thawing above; US Army
    /// TM 5-852-6 / UFC 3-130-04 n-factor method). The forcing's snow is not used.
    NFactor { freezing: f64, thawing: f64 },
}

/// The ground's temperature at the start: surface_c + gradient × depth (every cell,
/// building parts included).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StartTemperature {
    pub surface_c: f64,
    pub gradient_k_m: f64,
}

/// How fine the grid is: cells of `fine_m` at grade, at the slab's underside, at the wall's
/// faces and base and at every board face, growing by `growth_ratio` away from them up to
/// `max_cell_m`.
pub type GridSpacing = AxisSpacing;

/// Everything the section and its run need besides the forcing.
#[derive(Debug, Clone, PartialEq)]
pub struct EdgeSection {
    /// From the slab's centre line to the wall's inner face, m.
    pub inside_half_width_m: f64,
    /// From the wall's outer face to the far side of the section, m.
    pub outside_extent_m: f64,
    /// Depth of the section's bottom below grade, m.
    pub depth_m: f64,
    pub slab: Slab,
    pub wall: FoundationWall,
    pub wall_board: Option<WallBoard>,
    pub wing: Option<Wing>,
    pub soil: Vec<SoilBand>,
    pub inside: Inside,
    pub outside: Outside,
    pub bottom: BottomCondition,
    pub start: StartTemperature,
    pub grid: GridSpacing,
    /// Requested time step, s (split where needed).
    pub step_s: f64,
    pub duration_s: f64,
    /// Keep the temperature and frozen-fraction fields every this many seconds (and at the
    /// end).
    pub field_every_s: f64,
}

/// What each cell is.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Region {
    Soil(usize),
    Slab,
    Wall,
    WallBoard,
    Wing,
}

/// Most cells a section's grid may have (a grid this fine takes minutes natively; a setting
/// of this tool).
pub const MAX_CELLS: usize = 250_000;

/// Top groups of the plane built for a section.
pub const TOP_INSIDE: usize = 0;
pub const TOP_WALL: usize = 1;
pub const TOP_OUTSIDE: usize = 2;

/// The plane built for a section, and where its parts are.
#[derive(Debug, Clone)]
pub struct Layout {
    pub plane: Plane,
    /// What each cell is, row-major.
    pub regions: Vec<Region>,
    /// Columns whose centre lies under the wall and footing.
    pub footing_columns: std::ops::Range<usize>,
    /// First row below the footing's base.
    pub base_row: usize,
}

fn check_material(errs: &mut InputErrors, field: &str, m: &Material) {
    let f = format!("{field}.material");
    let k0 = m.conductivity.k(-5.0);
    let k1 = m.conductivity.k(5.0);
    for k in [k0, k1] {
        if !(k.is_finite() && k > 0.0) {
            errs.push(
                &f,
                InputErrorKind::NotCovered("the material has no positive conductivity".into()),
            );
            return;
        }
    }
    if !(m.c_frozen_j_m3k > 0.0 && m.c_unfrozen_j_m3k > 0.0) {
        errs.push(
            &f,
            InputErrorKind::NotCovered("the material has no positive heat capacity".into()),
        );
    }
}

impl EdgeSection {
    /// Check every input, naming each field under `prefix` (e.g. `edge`:
    /// `edge.wing.width_m`).
    pub fn validate(&self, prefix: &str) -> Result<(), InputErrors> {
        let mut e = InputErrors::default();
        let f = |s: &str| format!("{prefix}.{s}");
        check::within(
            &mut e,
            &f("inside_half_width_m"),
            self.inside_half_width_m,
            0.5,
            100.0,
            "m",
        );
        check::within(
            &mut e,
            &f("outside_extent_m"),
            self.outside_extent_m,
            0.5,
            100.0,
            "m",
        );
        let depth_ok = check::within(&mut e, &f("depth_m"), self.depth_m, 1.0, 100.0, "m");
        let depth = if depth_ok { self.depth_m } else { 100.0 };
        check::within(
            &mut e,
            &f("slab.thickness_m"),
            self.slab.thickness_m,
            0.02,
            1.0,
            "m",
        );
        check_material(&mut e, &f("slab"), &self.slab.material);
        check::within(
            &mut e,
            &f("wall.width_m"),
            self.wall.width_m,
            0.05,
            2.0,
            "m",
        );
        let base_lo = if self.slab.thickness_m.is_finite() {
            self.slab.thickness_m.max(0.02)
        } else {
            0.02
        };
        check::within(
            &mut e,
            &f("wall.base_depth_m"),
            self.wall.base_depth_m,
            base_lo,
            0.9 * depth,
            "m",
        );
        check_material(&mut e, &f("wall"), &self.wall.material);
        if let Some(vb) = &self.wall_board {
            vb.board.validate(&f("wall_board.board"), &mut e);
            check::within(
                &mut e,
                &f("wall_board.depth_m"),
                vb.depth_m,
                0.02,
                0.9 * depth,
                "m",
            );
            if vb.board.thickness_m >= self.outside_extent_m {
                e.push(
                    f("wall_board.board.thickness_m"),
                    InputErrorKind::NotCovered(
                        "the board is thicker than the section reaches outside".into(),
                    ),
                );
            }
        }
        if let Some(w) = &self.wing {
            w.board.validate(&f("wing.board"), &mut e);
            let max_w = if self.outside_extent_m.is_finite() {
                0.9 * self.outside_extent_m
            } else {
                0.0
            };
            check::within(&mut e, &f("wing.width_m"), w.width_m, 0.05, max_w, "m");
            check::within(
                &mut e,
                &f("wing.depth_m"),
                w.depth_m,
                0.0,
                0.9 * depth - w.board.thickness_m.max(0.0),
                "m",
            );
            if let Some(vb) = &self.wall_board {
                if w.width_m.is_finite() && w.width_m <= vb.board.thickness_m {
                    e.push(
                        f("wing.width_m"),
                        InputErrorKind::NotCovered(
                            "the wing must reach beyond the vertical board".into(),
                        ),
                    );
                }
            }
        }
        if self.soil.is_empty() || self.soil.len() > 20 {
            e.push(
                f("soil"),
                InputErrorKind::Count {
                    count: self.soil.len(),
                    min: 1,
                    max: 20,
                },
            );
        }
        for (k, s) in self.soil.iter().enumerate() {
            check::within(
                &mut e,
                &f(&format!("soil[{k}].thickness_m")),
                s.thickness_m,
                0.01,
                100.0,
                "m",
            );
            check_material(&mut e, &f(&format!("soil[{k}]")), &s.material);
        }
        match self.inside {
            Inside::Heated { air_c, film_w_m2k } => {
                check::within(&mut e, &f("inside.air_c"), air_c, -60.0, 60.0, "°C");
                check::within(
                    &mut e,
                    &f("inside.film_w_m2k"),
                    film_w_m2k,
                    0.5,
                    100.0,
                    "W/m²K",
                );
            }
            Inside::Closed => {}
        }
        match self.outside {
            Outside::Film { film_w_m2k, .. } => {
                check::within(
                    &mut e,
                    &f("outside.film_w_m2k"),
                    film_w_m2k,
                    0.5,
                    1000.0,
                    "W/m²K",
                );
            }
            Outside::NFactor { freezing, thawing } => {
                check::within(&mut e, &f("outside.freezing"), freezing, 0.05, 2.0, "");
                check::within(&mut e, &f("outside.thawing"), thawing, 0.05, 3.0, "");
            }
        }
        match self.bottom {
            BottomCondition::Temperature { temperature_c } => {
                check::within(
                    &mut e,
                    &f("bottom.temperature_c"),
                    temperature_c,
                    -30.0,
                    40.0,
                    "°C",
                );
            }
            BottomCondition::Flux { upward_w_m2 } => {
                check::within(
                    &mut e,
                    &f("bottom.upward_w_m2"),
                    upward_w_m2,
                    -1.0,
                    1.0,
                    "W/m²",
                );
            }
        }
        check::within(
            &mut e,
            &f("start.surface_c"),
            self.start.surface_c,
            -60.0,
            60.0,
            "°C",
        );
        check::within(
            &mut e,
            &f("start.gradient_k_per_m"),
            self.start.gradient_k_m,
            -1.0,
            1.0,
            "K/m",
        );
        check::within(&mut e, &f("grid.fine_m"), self.grid.fine_m, 0.002, 0.5, "m");
        check::within(
            &mut e,
            &f("grid.growth_ratio"),
            self.grid.growth_ratio,
            1.0,
            2.0,
            "",
        );
        let lo = if self.grid.fine_m.is_finite() {
            self.grid.fine_m
        } else {
            0.002
        };
        check::within(
            &mut e,
            &f("grid.max_cell_m"),
            self.grid.max_cell_m,
            lo,
            5.0,
            "m",
        );
        check::within(
            &mut e,
            &f("step_s"),
            self.step_s,
            60.0,
            30.0 * 86_400.0,
            "s",
        );
        check::within(
            &mut e,
            &f("duration_s"),
            self.duration_s,
            60.0,
            3.0 * 365.0 * 86_400.0,
            "s",
        );
        check::within(
            &mut e,
            &f("field_every_s"),
            self.field_every_s,
            60.0,
            3.0 * 365.0 * 86_400.0,
            "s",
        );
        e.into_result()
    }

    /// x of the wall's inner and outer faces, m.
    pub fn wall_faces_m(&self) -> (f64, f64) {
        (
            self.inside_half_width_m,
            self.inside_half_width_m + self.wall.width_m,
        )
    }

    /// Validate, then build the grid, the cells and their regions.
    pub fn layout(&self, prefix: &str) -> Result<Layout, InputErrors> {
        self.validate(prefix)?;
        let (xi, xo) = self.wall_faces_m();
        let x_end = xo + self.outside_extent_m;
        let depth = self.depth_m;
        let base = self.wall.base_depth_m;
        let mut xr = vec![0.0, xi, xo, x_end];
        let mut xf = vec![xi, xo];
        let mut zr = vec![0.0, self.slab.thickness_m, base, depth];
        let mut zf = vec![0.0, self.slab.thickness_m, base];
        if let Some(vb) = &self.wall_board {
            xr.push(xo + vb.board.thickness_m);
            xf.push(xo + vb.board.thickness_m);
            zr.push(vb.depth_m);
            zf.push(vb.depth_m);
        }
        if let Some(w) = &self.wing {
            xr.push(xo + w.width_m);
            xf.push(xo + w.width_m);
            zr.push(w.depth_m);
            zr.push(w.depth_m + w.board.thickness_m);
            zf.push(w.depth_m);
            zf.push(w.depth_m + w.board.thickness_m);
        }
        let mut top = 0.0;
        for s in &self.soil {
            top += s.thickness_m;
            if top < depth {
                zr.push(top);
            }
        }
        let x_faces = axis::faces(&xr, &xf, &self.grid);
        let z_faces = axis::faces(&zr, &zf, &self.grid);
        let (nx, nz) = (x_faces.len() - 1, z_faces.len() - 1);
        if nx * nz > MAX_CELLS {
            return Err(InputErrors(vec![crate::physics::error::InputError::new(
                format!("{prefix}.grid.fine_m"),
                InputErrorKind::Count {
                    count: nx * nz,
                    min: 1,
                    max: MAX_CELLS,
                },
            )]));
        }
        let inside = |a: f64, b: f64, c: f64| c > a && c < b;
        let mut regions = Vec::with_capacity(nx * nz);
        let mut phases = Vec::with_capacity(nx * nz);
        for j in 0..nz {
            let zc = 0.5 * (z_faces[j] + z_faces[j + 1]);
            // Soil layer at this depth (the last reaches the bottom).
            let mut layer = self.soil.len() - 1;
            let mut acc = 0.0;
            for (k, s) in self.soil.iter().enumerate() {
                acc += s.thickness_m;
                if zc < acc {
                    layer = k;
                    break;
                }
            }
            for i in 0..nx {
                let xc = 0.5 * (x_faces[i] + x_faces[i + 1]);
                let mut r = Region::Soil(layer);
                if xc < xi && zc < self.slab.thickness_m {
                    r = Region::Slab;
                }
                if inside(xi, xo, xc) && zc < base {
                    r = Region::Wall;
                }
                if let Some(vb) = &self.wall_board {
                    if inside(xo, xo + vb.board.thickness_m, xc) && zc < vb.depth_m {
                        r = Region::WallBoard;
                    }
                }
                if let Some(w) = &self.wing {
                    if inside(xo, xo + w.width_m, xc)
                        && inside(w.depth_m, w.depth_m + w.board.thickness_m, zc)
                    {
                        r = Region::Wing;
                    }
                }
                let phase = match r {
                    Region::Soil(k) => {
                        Phase::for_material(&self.soil[k].material, self.soil[k].curve)
                    }
                    Region::Slab => Phase::for_material(&self.slab.material, None),
                    Region::Wall => Phase::for_material(&self.wall.material, None),
                    Region::WallBoard => self
                        .wall_board
                        .as_ref()
                        .map(|b| b.board.phase())
                        .unwrap_or(Phase::for_material(&self.wall.material, None)),
                    Region::Wing => self
                        .wing
                        .as_ref()
                        .map(|w| w.board.phase())
                        .unwrap_or(Phase::for_material(&self.wall.material, None)),
                };
                regions.push(r);
                phases.push(phase);
            }
        }
        let top_group: Vec<usize> = (0..nx)
            .map(|i| {
                let xc = 0.5 * (x_faces[i] + x_faces[i + 1]);
                if xc < xi {
                    TOP_INSIDE
                } else if xc < xo {
                    TOP_WALL
                } else {
                    TOP_OUTSIDE
                }
            })
            .collect();
        let col_lo = axis::nearest_face(&x_faces, xi);
        let col_hi = axis::nearest_face(&x_faces, xo);
        let base_row = axis::nearest_face(&z_faces, base);
        let start = self.start;
        let plane = Plane::new(x_faces, z_faces, phases, top_group, 3, move |z| {
            start.surface_c + start.gradient_k_m * z
        });
        Ok(Layout {
            plane,
            regions,
            footing_columns: col_lo..col_hi,
            base_row,
        })
    }
}
