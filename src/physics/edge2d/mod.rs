//! A vertical cross-section through the edge of a building on a slab, perpendicular to a
//! long wall: heat flow in the plane with freezing and thawing, so that frost under the
//! footing can be read off with and without insulation and heating.
//!
//! **Geometry** (plane, per metre of wall; x horizontal from the slab's centre line out, z
//! depth below grade, both m):
//!
//! ```text
//!  x = 0          inside_half_width    +wall width                 far side
//!  | inside air  | (wall top closed) |  outside air (film, snow as a resistance, or n-factor)
//!  |---- slab ---|      wall /       |board|
//!  |             |      footing      |board|  ══════ wing board ══════
//!  |  soil ...   |___________________|              soil layers (horizontal) ...
//!  |                base depth                                                    |
//!  |___________________________________ bottom: geothermal flux or held __________|
//! ```
//!
//! - The slab's top is at grade; its top face meets the inside air through a film
//!   ([`Inside::Heated`]) or is closed ([`Inside::Closed`]: an unheated building whose floor
//!   exchanges no heat, the simplest documented model of an unheated interior).
//! - The foundation wall and its footing are one rectangle from grade to the base depth;
//!   its top face is closed (the wall above grade belongs to the building envelope, not to
//!   this section: a simplification that leaves out heat lost up the wall above grade).
//! - Vertical insulation lies against the wall's outer face from grade down to its depth;
//!   horizontal wing insulation runs outwards from the wall's outer face at its depth.
//!   Boards are cells of their own (the grid honours both faces of a board).
//! - Soil layers are horizontal, counted from grade; the slab, wall and boards replace the
//!   soil where they are. Painting order: soil, slab, wall, vertical board, wing.
//! - Sides: adiabatic (the slab's centre line is a plane of symmetry; the far side should be
//!   far enough that the ground there is a column untouched by the building, and its column
//!   is reported as the far-field frost depth).
//!
//! **Validity**: conduction with phase change, no water or vapour movement, no frost heave,
//! no sun; the wall is long (plane section: corners lose more heat and freeze deeper). A
//! snow cover is a resistance that stores no heat (its heat capacity is neglected: fair for
//! daily or longer steps under snow up to a few tens of centimetres, whose own time constant
//! d²/a is at most days; a device of this tool, no source). Results are engineering
//! estimates; frost-protected shallow foundations must follow the governing standard and
//! local codes, and buried boards lose part of their R-value to moisture (model reference
//! §6).

pub mod axis;
pub mod demo;
pub mod least;
pub mod plane;
pub mod run;
pub mod section;

pub use axis::AxisSpacing;
pub use plane::{Plane, PlaneError, PlaneTolerances, PlaneWork, TopFace};
pub use run::{run_edge, EdgeError, EdgeField, EdgeRecord, EdgeResult, EdgeRun};
pub use section::{
    Board, EdgeSection, FoundationWall, GridSpacing, Inside, Layout, Outside, Region, Slab,
    SoilBand, StartTemperature, WallBoard, Wing, MAX_CELLS, TOP_INSIDE, TOP_OUTSIDE, TOP_WALL,
};
