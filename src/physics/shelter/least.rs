//! Answers on the steady balance: the least wall thickness for a target interior
//! temperature, and data series for charts.
//!
//! The interior temperature rises with the main thickness (see
//! [`super::inputs::Shape::main_thickness_m`]): a thicker wall resists more, and its larger outer
//! surface does not undo that once the outer radius exceeds 2k/h_o, about 2 cm for snow
//! (the critical radius of a sphere, Incropera, from memory), below the thinnest wall
//! accepted. Under the melt limit the interior temperature stops rising: the warm surfaces
//! stay at 0 °C whatever the thickness. So bisection on the thickness is sound.
//!
//! [`least_thickness`] bisects the main thickness (a dome's wall, a pile's crown with its
//! base in proportion, a cave's exposed face, a trench's roof) over [`SEARCH_THICKNESS_M`]
//! to 1 µm, and answers with a [`ThicknessAnswer`]: reached, the thinnest suffices, not
//! reachable (the melt limit, or the other losses, with the shares of the losses), or no
//! thickness to choose. The sweeps over thickness, people and outside temperature return
//! [`SweepPoint`]s, at most [`MAX_SWEEP_POINTS`].

use super::inputs::{Conditions, Shelter, ShelterError, SHELTER_FIELD};
use super::steady::{self, SteadyResult};
use crate::physics::error::{InputErrorKind, InputErrors};

/// Thinnest and thickest walls the search considers, m.
pub const SEARCH_THICKNESS_M: (f64, f64) = (0.05, 3.0);

/// Why a target cannot be reached.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum NotReachableReason {
    /// A snow surface reaches 0 °C first: the air cannot get warmer without melting the
    /// walls (a lining would help).
    MeltLimit,
    /// Even behind the thickest wall, vent, doorway, floor and deep snow take the heat.
    OtherLosses,
}

/// The least thickness.
#[derive(Debug, Clone, PartialEq)]
pub enum ThicknessAnswer {
    /// The thickness (to 1 mm or better) at which the interior reaches the target.
    Reached { thickness_m: f64, interior_c: f64 },
    /// The thinnest wall considered already reaches the target.
    ThinnestSuffices { thickness_m: f64, interior_c: f64 },
    /// Not reachable with any wall up to the thickest considered.
    NotReachable {
        reason: NotReachableReason,
        /// The interior temperature behind the thickest wall, °C.
        best_interior_c: f64,
        /// At the thickest wall: shares of the heat taken by vent and doorway together, by
        /// the floor, and by walls and roof (a share is negative, and another above 1, when
        /// the floor or deep snow is warmer than the air and gives heat to it).
        air_share: f64,
        floor_share: f64,
        walls_share: f64,
    },
    /// The shape has no thickness to choose (a cave with no exposed face).
    NoThicknessToChoose,
}

/// The search range of the main thickness: [`SEARCH_THICKNESS_M`], narrowed for a pile so
/// that its base (kept in proportion) stays within the accepted thicknesses.
fn search_range(shelter: &Shelter) -> (f64, f64) {
    let (mut lo, mut hi) = SEARCH_THICKNESS_M;
    if let super::inputs::Shape::HollowedPile {
        crown_thickness_m,
        base_thickness_m,
        ..
    } = shelter.shape
    {
        let ratio = base_thickness_m / crown_thickness_m;
        let (min, max) = super::model::limits::THICKNESS_M;
        lo = lo.max(min / ratio);
        hi = hi.min(max / ratio);
    }
    (lo, hi)
}

fn at(shelter: &Shelter, conditions: &Conditions, t: f64) -> Result<SteadyResult, ShelterError> {
    let s = Shelter {
        shape: shelter.shape.with_main_thickness(t),
        ..*shelter
    };
    steady::steady(&s, conditions)
}

/// The least main thickness giving an interior of at least `target_c`.
pub fn least_thickness(
    shelter: &Shelter,
    conditions: &Conditions,
    target_c: f64,
) -> Result<ThicknessAnswer, ShelterError> {
    if !target_c.is_finite() {
        let mut e = InputErrors::default();
        e.push("shelter.design.target_c", InputErrorKind::NotFinite);
        return Err(e.into());
    }
    // Validate the shelter as given (errors name its own fields).
    steady::steady(shelter, conditions)?;
    if shelter.shape.main_thickness_m().is_none() {
        return Ok(ThicknessAnswer::NoThicknessToChoose);
    }
    let (t_lo, t_hi) = search_range(shelter);
    let thin = at(shelter, conditions, t_lo)?;
    if thin.interior_c >= target_c {
        return Ok(ThicknessAnswer::ThinnestSuffices {
            thickness_m: t_lo,
            interior_c: thin.interior_c,
        });
    }
    let thick = at(shelter, conditions, t_hi)?;
    if thick.interior_c < target_c {
        let total = thick.gains_w.max(f64::MIN_POSITIVE);
        let reason = if thick.melt_w > 0.0 {
            NotReachableReason::MeltLimit
        } else {
            NotReachableReason::OtherLosses
        };
        return Ok(ThicknessAnswer::NotReachable {
            reason,
            best_interior_c: thick.interior_c,
            air_share: (thick.vent_w + thick.door_w) / total,
            floor_share: thick.floor_w / total,
            walls_share: thick.walls_w / total,
        });
    }
    let (mut lo, mut hi) = (t_lo, t_hi);
    for _ in 0..60 {
        let mid = 0.5 * (lo + hi);
        if at(shelter, conditions, mid)?.interior_c >= target_c {
            hi = mid;
        } else {
            lo = mid;
        }
        if hi - lo < 1e-6 {
            break;
        }
    }
    let r = at(shelter, conditions, hi)?;
    Ok(ThicknessAnswer::Reached {
        thickness_m: hi,
        interior_c: r.interior_c,
    })
}

/// One point of a series.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SweepPoint {
    /// The swept value (m, people, °C).
    pub x: f64,
    pub interior_c: f64,
    pub melt_kg_h: f64,
    pub co2_ppm: Option<f64>,
}

fn point(x: f64, r: &SteadyResult) -> SweepPoint {
    SweepPoint {
        x,
        interior_c: r.interior_c,
        melt_kg_h: r.melt_kg_h,
        co2_ppm: r.co2_ppm,
    }
}

/// Most points a sweep gives.
pub const MAX_SWEEP_POINTS: usize = 1000;

fn check_len(n: usize) -> Result<(), ShelterError> {
    if n == 0 || n > MAX_SWEEP_POINTS {
        let mut e = InputErrors::default();
        e.push(
            format!("{SHELTER_FIELD}.sweep"),
            InputErrorKind::Count {
                count: n,
                min: 1,
                max: MAX_SWEEP_POINTS,
            },
        );
        return Err(e.into());
    }
    Ok(())
}

/// Interior temperature against the main thickness, m.
pub fn sweep_wall_thickness(
    shelter: &Shelter,
    conditions: &Conditions,
    thicknesses_m: &[f64],
) -> Result<Vec<SweepPoint>, ShelterError> {
    check_len(thicknesses_m.len())?;
    thicknesses_m
        .iter()
        .map(|&t| at(shelter, conditions, t).map(|r| point(t, &r)))
        .collect()
}

/// Interior temperature against the number of people.
pub fn sweep_people(
    shelter: &Shelter,
    conditions: &Conditions,
    people: &[u32],
) -> Result<Vec<SweepPoint>, ShelterError> {
    check_len(people.len())?;
    people
        .iter()
        .map(|&n| {
            let c = Conditions {
                people: n,
                ..*conditions
            };
            steady::steady(shelter, &c).map(|r| point(n as f64, &r))
        })
        .collect()
}

/// Interior temperature against the outside temperature, °C.
pub fn sweep_outside_temperature(
    shelter: &Shelter,
    conditions: &Conditions,
    outside_c: &[f64],
) -> Result<Vec<SweepPoint>, ShelterError> {
    check_len(outside_c.len())?;
    outside_c
        .iter()
        .map(|&t| {
            let c = Conditions {
                outside_c: t,
                ..*conditions
            };
            steady::steady(shelter, &c).map(|r| point(t, &r))
        })
        .collect()
}
