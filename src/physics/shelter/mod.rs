//! Snow shelters: the air temperature inside a shelter of snow, the heat its walls, floor
//! and vent take, where the inner surface would melt, how the air warms through the first
//! night, and the least wall and sweeps built on these.
//!
//! The shelter is described by plain structs in SI ([`Shelter`]: shape, snow, floor,
//! entrance, vent, films; [`Conditions`]: outside air, wind, snowpack, people, candles,
//! stove). [`model::Model::build`] checks every input (all errors at once, each naming its
//! field, e.g. `shelter.inner_radius_m`) and reduces the shelter to *zones*: pieces of the
//! inner surface, each joined to its heat sink (outside air through the outer film, or deep
//! snow or ground at a held temperature) by one-dimensional conduction, radial in a sphere or
//! straight through a plane wall. Everything else is built on the zones:
//!
//! - [`mod@steady`]: the steady heat balance for the interior air (bisection), the melt limit
//!   (inner snow surfaces held at 0 °C, surplus heat to melt), the effect of a hung lining,
//!   CO₂, and the band over all nine snow conductivity regressions;
//! - [`mod@night`]: the first hours after people enter, finite volumes through every zone with a
//!   lumped air node, backward Euler, the melt limit held in every step;
//! - [`least`]: least wall thickness for a target interior temperature, and sweeps;
//! - [`mod@cautions`]: the safety notes that must always be shown, with their sources.
//!
//! Valid for a dry snow shelter in still cold weather: outside air at or below 0 °C, snow
//! at or below 0 °C, conduction through dry snow (no vapour transport, which can raise the
//! effective conductivity of low-density snow by up to about 50 %: Fourteau et al. 2021, The
//! Cryosphere 15:2739), no solar gain, no rain. The geometry is idealised (see each shape).
//! Melting surfaces are not moved, and people's latent heat is counted as heat.
//!
//! Files: [`inputs`] (what the shelter is, [`ShelterError`]); [`model`] (checks with field
//! paths, the zones, films, vent and doorway flows, heat sources); [`mod@steady`];
//! [`mod@night`]; [`least`]; [`mod@cautions`].
//!
//! **How to add a shape.** Add the variant to [`Shape`] (plain name, SI fields) with the
//! thickness the least-wall search varies (`main_thickness_m`, `with_main_thickness`,
//! `main_thickness_field`); check its fields in `Shelter::validate` (limits in
//! `model::limits`, paths `{prefix}.<field>`); in the model's assembly push its zones (each
//! a [`model::Geometry`]: a sphere sector, a plane, or `Geometry::equivalent_sphere(area,
//! shape_factor)` for a deep surface, with its `Sink`, `Part`, whether it melts and whether
//! a lining covers it), its air volume, and its inner height in [`model::inner_height_m`].
//! The steady balance, the night, the band and the least wall pick it up. Test its
//! conductance against a published shape factor or closed form in `tests/shelter.rs`,
//! naming the source.

pub mod cautions;
pub mod inputs;
pub mod least;
pub mod model;
pub mod night;
pub mod steady;

pub use cautions::{cautions, Caution};
pub use inputs::{
    Activity, Conditions, Entrance, ExposedFace, Floor, Shape, Shelter, ShelterError,
    CONDITIONS_FIELD, NIGHT_FIELD, SHELTER_FIELD,
};
pub use least::{
    least_thickness, sweep_outside_temperature, sweep_people, sweep_wall_thickness,
    NotReachableReason, SweepPoint, ThicknessAnswer,
};
pub use model::{Model, Zone};
pub use night::{night, NightResult, NightSettings, RadialWall, WallGeometry};
pub use steady::{flat_wall, regression_band, steady, Band, BandEntry, FlatWall, SteadyResult};
