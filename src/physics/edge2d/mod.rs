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
//!
//! **Files.** [`section`] holds the inputs ([`EdgeSection`] and its parts), their checks
//! with field paths and the layout of grid and regions; [`axis`] places the cell faces
//! along one axis; [`plane`] is the 2D enthalpy solver and its linear solver; [`run`] runs
//! a section under a forcing a slice at a time ([`EdgeRun`]) and reads off what it reports;
//! [`least`] searches the least insulation or footing depth; [`demo`] is the invented
//! section and design winter of the benchmark and the tests. Plain structs in SI: the file
//! format's `edge` section, the charts and the page build on these.
//!
//! **Checks** (`tests/edge2d.rs`, each test naming its source): laterally uniform ground
//! equals the column solver column for column
//! (`laterally_uniform_plane_equals_the_column_solver`: 1e-3 K, fronts 2e-4 m, the same
//! steps); a steady rectangle against its Fourier cosine series (Carslaw & Jaeger §5.3,
//! from memory), the error falling about fourfold with each halving of the cells
//! (`steady_rectangle_matches_the_fourier_series_and_converges`); the energy ledger over
//! the design winter (`energy_balance_closes_over_a_winter`, 1e-9 of the throughput); the
//! far-field column against Neumann's solution for the published soil (in the shared
//! closed-form checker, `tests/closed_form.rs` `neumann_soil_on_every_solver`, 1.5 %); orderings by the maximum
//! principle: heating and boards keep frost from the footing, and under a heated slab frost
//! below the base stays shallower than the far field
//! (`insulation_and_heating_keep_frost_from_the_footing`); daily steps against 6-hour steps
//! (1 cm) and the design grid against a finer one (the far field within 2 %; under an
//! unheated, uninsulated footing the design grid reads frost short:
//! `daily_steps_and_the_design_grid_are_converged_enough`); slicing changes no number
//! (`slices_give_the_same_run`). A design check of a footing should use a finer grid than
//! the benchmark's. What each check measured is in `MEASUREMENTS.md`.
//!
//! **How to add a region.** Add a struct for it (plain name, SI fields) and an `Option`
//! field on [`EdgeSection`]; check its fields in [`EdgeSection::validate`] under
//! `{prefix}.<name>.<field>`; in [`EdgeSection::layout`] push its faces to the required x
//! and z faces and its edges to the foci, add a [`Region`] variant, paint it in the cell
//! loop (after what it covers) and give its phase (a [`Board`] gives `Phase::Inert`; a
//! material `Phase::for_material`). If its top meets the air differently, give its columns
//! a top group of their own and a condition in the run's `tops`. Test it against a closed
//! form or an ordering in `tests/edge2d.rs`, naming the source.

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
