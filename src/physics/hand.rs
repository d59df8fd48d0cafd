//! Hand methods for the deepest frost on a layered column, applied the same way wherever a
//! run is reported beside them (the winter run of a stack, the far field of a building
//! edge), so that users see how conservative each is (the project's model reference, §4).
//!
//! - **Stefan's law** for the first layer that holds water that freezes, taken to start at
//!   the surface: X = √(2 k_f I / L) ([`analytic::stefan_depth_m`]), k_f at −1 °C. Ignores
//!   sensible heat and everything above that layer.
//! - **Stefan's law under a resistance** ([`analytic::stefan_depth_with_resistance_m`]): the
//!   layers above the first freezing one (slab, board), or a surface film and snow, as a
//!   resistance that stores no heat.
//! - **Modified Berggren** through every layer ([`analytic::modified_berggren_layered`],
//!   TM 5-852-6 / UFC 3-130-04): k and C the means of frozen and unfrozen (TM 5-852-6, from
//!   memory); the mean annual temperature v₀ is the ground surface's mean over the run when
//!   it lasts a year or more, else the climate's annual mean; the freezing season is the
//!   time the ground surface spends below 0 °C in the design winter. Not applicable when
//!   v₀ < 0 °C (permafrost).
//!
//! **Winters.** The method is posed for one freezing season: the design winter's freezing
//! index and the length of that same season (TM 5-852-6 / UFC 3-130-04, where the design
//! freezing index is that of one winter and the season is its duration, from memory). A run
//! of a year or less ([`ONE_WINTER_DAYS`]) is one winter. A longer run (a multi-year record)
//! is cut into winters by [`surface_winters`] at the warmest moment of the climate's annual
//! wave, half a year after its coldest, every 365 days (a rule of this tool, common
//! practice, no source); each winter has its own freezing index (the range of its
//! cumulative degree-day curve) and its own days below 0 °C, and every hand method takes
//! the winter with the largest index.
//!
//! Indices here are in K·s (°C·days × 86 400).

use crate::physics::analytic::{self, BerggrenLayered};
use crate::physics::materials::{Material, SnowRegression};
use crate::physics::transient::setup::Forcing;

const DAY: f64 = 86_400.0;

/// Does the material hold water that freezes (and so can carry a frost front)?
pub fn freezes(m: &Material) -> bool {
    m.freezes && m.latent_j_m3 > 0.0
}

/// The conductivity the hand methods give a layer that freezes through: the mean of its
/// frozen (at −1 °C) and unfrozen (at +1 °C) values, W/(m·K).
pub fn mean_conductivity(m: &Material) -> f64 {
    0.5 * (m.conductivity.frozen.k(-1.0) + m.conductivity.unfrozen.k(1.0))
}

/// The first layer that freezes, and what lies above it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FirstFreezing {
    /// Its index in the layers, top down.
    pub index: usize,
    /// Depth of its top below the top face, m.
    pub above_m: f64,
    /// The layers above it as one resistance (each at [`mean_conductivity`]), m²·K/W.
    pub r_above_m2k_w: f64,
}

/// The first of `layers` (thickness m, material; top down) that [`freezes`].
pub fn first_freezing(layers: &[(f64, Material)]) -> Option<FirstFreezing> {
    let index = layers.iter().position(|(_, m)| freezes(m))?;
    Some(FirstFreezing {
        index,
        above_m: layers[..index].iter().map(|(d, _)| d).sum::<f64>() + 0.0,
        r_above_m2k_w: layers[..index]
            .iter()
            .map(|(d, m)| d / mean_conductivity(m))
            .sum(),
    })
}

/// Stefan's law for `m` alone from the surface under a surface freezing index, m.
pub fn stefan_m(m: &Material, index_k_s: f64) -> f64 {
    analytic::stefan_depth_m(m.conductivity.frozen.k(-1.0), m.latent_j_m3, index_k_s)
}

/// Stefan's law for `m` under a resistance `r` (m²·K/W) that stores no heat, m below the
/// bottom of the resistance.
pub fn stefan_under_resistance_m(m: &Material, index_k_s: f64, r: f64) -> f64 {
    analytic::stefan_depth_with_resistance_m(
        m.conductivity.frozen.k(-1.0),
        m.latent_j_m3,
        index_k_s,
        r,
    )
}

/// The ground surface over a run: how long it spent below 0 °C and its time-mean.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SurfaceSeason {
    /// Time below 0 °C, days.
    pub days_below: f64,
    /// Time-mean temperature, °C (0 for a run of no length).
    mean_sum_c_s: f64,
    /// Length of the run, s.
    pub total_s: f64,
}

impl SurfaceSeason {
    /// From the run's samples as (time s, surface °C), in time order; each interval counts
    /// with the temperature at its end.
    pub fn of(samples: &[(f64, f64)]) -> SurfaceSeason {
        let (mut below_s, mut sum, mut total) = (0.0, 0.0, 0.0);
        for w in samples.windows(2) {
            let dt = w[1].0 - w[0].0;
            if w[1].1 < 0.0 {
                below_s += dt;
            }
            sum += w[1].1 * dt;
            total += dt;
        }
        SurfaceSeason {
            days_below: below_s / DAY,
            mean_sum_c_s: sum,
            total_s: total,
        }
    }

    /// The mean annual temperature the modified Berggren method takes: the surface's own
    /// mean when the run lasts a year or more (364 days), else `climate_mean_c`.
    pub fn mean_annual_c(&self, climate_mean_c: f64) -> f64 {
        if self.total_s >= 364.0 * DAY {
            self.mean_sum_c_s / self.total_s
        } else {
            climate_mean_c
        }
    }
}

/// A run no longer than this many days is taken as one winter.
pub const ONE_WINTER_DAYS: f64 = 366.0;

/// One winter of a run at the ground surface.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SurfaceWinter {
    /// Its first and last moment, s from the start of the run.
    pub start_s: f64,
    pub end_s: f64,
    /// Its freezing index at the surface (the range of its cumulative degree-day curve), K·s.
    pub freezing_index_k_s: f64,
    /// Its time below 0 °C, days.
    pub days_below: f64,
}

/// The run's ground surface (samples as in [`SurfaceSeason::of`]) cut into winters at the
/// warmest moment of the annual wave whose coldest moment is `coldest_s` (s from the start
/// of the run): at `coldest_s` + 182.5 days, and every 365 days from there. A run of at
/// most [`ONE_WINTER_DAYS`] is one winter. Each interval counts with the temperature at its
/// end, in the winter where it ends.
pub fn surface_winters(samples: &[(f64, f64)], coldest_s: f64) -> Vec<SurfaceWinter> {
    let (Some(first), Some(last)) = (samples.first(), samples.last()) else {
        return Vec::new();
    };
    let year = 365.0 * DAY;
    let one = last.0 - first.0 <= ONE_WINTER_DAYS * DAY;
    let warmest = (coldest_s + 0.5 * year).rem_euclid(year);
    // The index of the winter a moment falls in (0 before the first cut).
    let winter_of = |t: f64| -> i64 {
        if one || t <= warmest {
            0
        } else {
            ((t - warmest) / year).ceil() as i64
        }
    };
    let mut out: Vec<SurfaceWinter> = Vec::new();
    let (mut current, mut cum, mut top, mut range, mut below) = (-1i64, 0.0, 0.0, 0.0, 0.0);
    let mut start = first.0;
    let flush = |out: &mut Vec<SurfaceWinter>, start: f64, end: f64, range: f64, below: f64| {
        out.push(SurfaceWinter {
            start_s: start,
            end_s: end,
            freezing_index_k_s: range,
            days_below: below / DAY,
        });
    };
    for w in samples.windows(2) {
        let k = winter_of(w[1].0);
        if k != current {
            if current >= 0 {
                flush(&mut out, start, w[0].0, range, below);
            }
            (current, cum, top, range, below, start) = (k, 0.0, 0.0, 0.0, 0.0, w[0].0);
        }
        let dt = w[1].0 - w[0].0;
        if w[1].1 < 0.0 {
            below += dt;
        }
        cum += w[1].1 * dt;
        top = f64::max(top, cum);
        range = f64::max(range, top - cum);
    }
    if current >= 0 {
        flush(&mut out, start, last.0, range, below);
    }
    out
}

/// Why the modified Berggren method gives no depth.
#[derive(Debug, Clone, PartialEq)]
pub enum BerggrenNotApplicable {
    /// No freezing index, or less than a day below 0 °C.
    SurfaceDoesNotFreeze,
    /// The mean annual temperature is below 0 °C.
    Permafrost { mean_annual_c: f64 },
    /// The method itself refused the inputs (its message).
    Refused(String),
}

/// The modified Berggren method through every layer (thickness m, material; top down) under
/// a surface freezing index, with the surface's season.
pub fn berggren_m(
    layers: &[(f64, Material)],
    index_k_s: f64,
    mean_annual_c: f64,
    days_below: f64,
) -> Result<BerggrenLayered, BerggrenNotApplicable> {
    let bl: Vec<analytic::BerggrenLayer> = layers
        .iter()
        .map(|(d, m)| analytic::BerggrenLayer {
            thickness_m: *d,
            k_w_m_k: mean_conductivity(m),
            latent_j_m3: if m.freezes { m.latent_j_m3 } else { 0.0 },
            c_j_m3k: 0.5 * (m.c_frozen_j_m3k + m.c_unfrozen_j_m3k),
        })
        .collect();
    if index_k_s <= 0.0 || days_below < 1.0 {
        Err(BerggrenNotApplicable::SurfaceDoesNotFreeze)
    } else if mean_annual_c < 0.0 {
        Err(BerggrenNotApplicable::Permafrost { mean_annual_c })
    } else {
        analytic::modified_berggren_layered(&bl, 1.0, index_k_s, mean_annual_c, days_below * DAY)
            .map_err(|e| BerggrenNotApplicable::Refused(e.to_string()))
    }
}

/// The surface film and the snow on the ground as one resistance, m²·K/W: the mean of
/// 1/h + depth/k(ρ) over the days whose middle finds the air below 0 °C (the days that
/// drive frost), or 1/h when there are none. Snow of no depth or density counts as none.
pub fn film_and_snow_resistance(
    film_w_m2k: f64,
    snow_regression: SnowRegression,
    forcing: &dyn Forcing,
    duration_s: f64,
) -> f64 {
    let days = (duration_s / DAY).ceil() as usize;
    let (mut sum, mut n) = (0.0, 0usize);
    for d in 0..days {
        let t = (d as f64 + 0.5) * DAY;
        if forcing.air_c(t) < 0.0 {
            let snow = forcing
                .snow(t)
                .filter(|&(z, rho)| z > 0.0 && rho > 0.0)
                .map_or(0.0, |(z, rho)| z / snow_regression.conductivity_w_m_k(rho));
            sum += 1.0 / film_w_m2k + snow;
            n += 1;
        }
    }
    if n > 0 {
        sum / n as f64
    } else {
        1.0 / film_w_m2k
    }
}
