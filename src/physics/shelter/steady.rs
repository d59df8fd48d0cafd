//! The steady heat balance of the interior air.
//!
//! Heat given off inside = Σ zones heat through the inner film + vent loss + doorway loss.
//! Each zone is linear: with its sink at T_s (outside air or deep snow), inner resistance
//! R_in (film, plus lining where it applies) and outer R_out (wall and outer film), the
//! inner surface sits at T_surf = T_i − (T_i − T_s) R_in/(R_in + R_out).
//!
//! **Melt limit.** A snow surface cannot be warmer than 0 °C: it melts, drips and refreezes
//! into a glaze (model reference, physics). Where T_surf would pass 0 °C the surface is held
//! at 0 °C: the film brings T_i/R_in, the wall carries (0 − T_s)/R_out away and the
//! difference melts snow at L_f = 333.4 kJ/kg (IAPWS; handbooks round to 334 kJ/kg). The
//! heat into a zone stays continuous and increasing in T_i, so the balance has one root,
//! found by bisection to the last bit; a bracket that fails is an error, never a silent
//! answer. T_i is then the temperature the air holds with the warm surfaces at 0 °C.
//!
//! **Lining.** A fabric hung with an air gap in front of the walls adds a resistance between
//! air and snow (input, about 0.15–0.3 m²K/W: common practice, no source). When the inner
//! surface would melt, the balance is solved again with it to show the interior temperature
//! the lining allows.
//!
//! **CO₂.** Steady mixing: C = C_o + G/V̇ with V̇ the air exchanged (vent and doorway), G
//! the CO₂ given off (people: 0.0052 L/s at 1.2 met, ASTM D6245, from memory, in proportion
//! to met; candles and stove: from their fuel power by stoichiometry, see
//! [`super::model::FUEL_CO2_M3_PER_J`]), C_o = 420 ppm (outdoor air of the 2020s, NOAA
//! global mean, from memory). Perfect mixing assumed.
//!
//! **What it gives** ([`SteadyResult`]): every zone's surface temperature and heat, the
//! breakdown (walls, floor, vent, doorway, melt), melt kg/h, CO₂, the highest melt-free
//! interior temperature (−T_s R_in/R_out, the least over the snow zones) and, when
//! something melts, the same with the lining. The bracket of the bisection is proved by the
//! resistances; a failed one is `ShelterError::NoConvergence`. [`regression_band`] repeats
//! the balance with each of the nine snow regressions and names the coldest and warmest.
//!
//! **Well-mixed air.** The air is one temperature. A real shelter is colder at the floor,
//! so a bare snow floor's melt limit fires here earlier than in reality, before the dome's
//! (`floor_cover_moves_the_melt_limit_to_the_dome` in `tests/shelter.rs`; its figures are
//! in `MEASUREMENTS.md`). A floor cover (mats, branches; `floor_cover_m2k_w`,
//! area-averaged) adds a resistance on the floor zones.

use super::inputs::{Conditions, Shelter, ShelterError};
use super::model::{Model, Part};
use crate::physics::error::Warning;
use crate::physics::materials::ice::LATENT_HEAT_FUSION_J_PER_KG;
use crate::physics::materials::snow::SnowRegression;

/// Outdoor CO₂, ppm (from memory, see the module documentation).
pub const OUTDOOR_CO2_PPM: f64 = 420.0;
/// CO₂ above which a warning is given, ppm: the OSHA permissible exposure limit (8-hour
/// time-weighted average, 29 CFR 1910.1000 Table Z-1; from memory).
pub const CO2_LIMIT_PPM: f64 = 5000.0;

/// One zone in the steady state.
#[derive(Debug, Clone, PartialEq)]
pub struct ZoneState {
    pub name: String,
    pub part: Part,
    pub inner_area_m2: f64,
    /// Inner surface temperature, °C (0 when held by melting).
    pub surface_c: f64,
    /// Heat through the inner film, W.
    pub heat_in_w: f64,
    /// Heat conducted to the sink, W.
    pub conducted_w: f64,
    /// Heat melting snow at the surface, W (heat_in − conducted).
    pub melt_w: f64,
    /// How fast the melting surface recedes, mm/h (melt over ρ_snow × area).
    pub melt_mm_h: f64,
}

/// The result with a lining hung.
#[derive(Debug, Clone, PartialEq)]
pub struct LiningOutcome {
    pub lining_m2k_w: f64,
    pub interior_c: f64,
    pub melt_kg_h: f64,
    /// Highest interior temperature at which no lined snow surface melts, °C.
    pub melt_free_limit_c: f64,
}

/// The steady state.
#[derive(Debug, Clone, PartialEq)]
pub struct SteadyResult {
    pub interior_c: f64,
    pub outside_c: f64,
    pub zones: Vec<ZoneState>,
    pub gains_w: f64,
    pub people_w: f64,
    pub candles_w: f64,
    pub stove_w: f64,
    /// Conducted through walls and roof, W.
    pub walls_w: f64,
    /// Conducted through the floor, W.
    pub floor_w: f64,
    pub vent_w: f64,
    pub door_w: f64,
    pub melt_w: f64,
    pub melt_kg_h: f64,
    pub vent_flow_m3_s: f64,
    pub door_flow_m3_s: f64,
    /// Steady CO₂ inside, ppm; `None` when no air is exchanged (it keeps rising).
    pub co2_ppm: Option<f64>,
    /// Warmest snow surface, °C.
    pub warmest_snow_surface_c: f64,
    /// Highest interior temperature at which no snow surface melts, °C.
    pub melt_free_limit_c: f64,
    pub outside_film_w_m2k: f64,
    pub snow_conductivity_w_m_k: f64,
    pub snow_regression: SnowRegression,
    /// What a lining would allow; given when a surface melts and a lining resistance > 0 is
    /// set.
    pub with_lining: Option<LiningOutcome>,
    pub warnings: Vec<Warning>,
}

/// The state of one zone at interior temperature `t_i`, with lining resistance `lining`.
pub(crate) fn zone_at(model: &Model, z: usize, t_i: f64, lining: f64) -> (f64, f64, f64, f64) {
    let zone = &model.zones[z];
    let r_in = zone.inner_resistance_k_w(model.inside_film_w_m2k, lining);
    let r_out = zone.outer_resistance_k_w();
    let sink = zone.sink_c(model.outside_c);
    let q = (t_i - sink) / (r_in + r_out);
    let surface = t_i - q * r_in;
    if zone.melts && surface > 0.0 {
        let heat_in = t_i / r_in;
        let conducted = -sink / r_out;
        (0.0, heat_in, conducted, heat_in - conducted)
    } else {
        (surface, q, q, 0.0)
    }
}

/// Net heat into the air at `t_i` (gains − losses), W: strictly decreasing in `t_i`.
fn net_w(model: &Model, t_i: f64, lining: f64) -> f64 {
    let (vent, door) = model.air_loss_w(t_i);
    let zones: f64 = (0..model.zones.len())
        .map(|z| zone_at(model, z, t_i, lining).1)
        .sum();
    model.gains.total_w - zones - vent - door
}

/// Bisection on a decreasing function with f(lo) ≥ 0 ≥ f(hi), to the last bit.
pub(crate) fn bisect_decreasing(
    f: impl Fn(f64) -> f64,
    mut lo: f64,
    mut hi: f64,
    quantity: &'static str,
) -> Result<f64, ShelterError> {
    let (flo, fhi) = (f(lo), f(hi));
    if !(flo >= 0.0 && fhi <= 0.0) {
        return Err(ShelterError::NoConvergence {
            quantity,
            detail: format!("no sign change on [{lo}, {hi}] (f = {flo:.3e}, {fhi:.3e})"),
        });
    }
    for _ in 0..400 {
        let mid = 0.5 * (lo + hi);
        if mid <= lo || mid >= hi {
            return Ok(mid);
        }
        let fm = f(mid);
        if !fm.is_finite() {
            return Err(ShelterError::NoConvergence {
                quantity,
                detail: format!("not a number at {mid}"),
            });
        }
        if fm > 0.0 {
            lo = mid;
        } else if fm < 0.0 {
            hi = mid;
        } else {
            return Ok(mid);
        }
    }
    Ok(0.5 * (lo + hi))
}

/// The interior temperature that balances the model with a lining resistance `lining`.
pub(crate) fn interior_c(model: &Model, lining: f64) -> Result<f64, ShelterError> {
    let sinks = model.zones.iter().map(|z| z.sink_c(model.outside_c));
    let lo = sinks.clone().fold(model.outside_c, f64::min) - 1.0;
    let max_sink = sinks.fold(model.outside_c, f64::max);
    // Every zone takes at least (T − T_s)/(R_in + R_out), so beyond this the net is < 0.
    let conductance: f64 = model
        .zones
        .iter()
        .map(|z| {
            1.0 / (z.inner_resistance_k_w(model.inside_film_w_m2k, lining)
                + z.outer_resistance_k_w())
        })
        .sum();
    let hi = max_sink + model.gains.total_w / conductance + 1.0;
    bisect_decreasing(|t| net_w(model, t, lining), lo, hi, "interior temperature")
}

/// Highest interior temperature at which no snow surface melts: for each melting zone the
/// T_i with its surface at 0 °C, T_i = −T_s R_in/R_out; the least of them.
fn melt_free_limit_c(model: &Model, lining: f64) -> f64 {
    model
        .zones
        .iter()
        .filter(|z| z.melts)
        .map(|z| {
            let r_in = z.inner_resistance_k_w(model.inside_film_w_m2k, lining);
            -z.sink_c(model.outside_c) * r_in / z.outer_resistance_k_w()
        })
        .fold(f64::INFINITY, f64::min)
}

/// The steady state of a built model, with lining resistance `lining` on the lined zones.
pub fn solve(model: &Model, lining: f64) -> Result<SteadyResult, ShelterError> {
    let t_i = interior_c(model, lining)?;
    let mut zones = Vec::with_capacity(model.zones.len());
    let (mut walls_w, mut floor_w, mut melt_w) = (0.0, 0.0, 0.0);
    let mut warmest = f64::NEG_INFINITY;
    for (z, zone) in model.zones.iter().enumerate() {
        let (surface_c, heat_in_w, conducted_w, m) = zone_at(model, z, t_i, lining);
        match zone.part {
            Part::WallsAndRoof => walls_w += conducted_w,
            Part::Floor => floor_w += conducted_w,
        }
        melt_w += m;
        if zone.melts {
            warmest = warmest.max(surface_c);
        }
        zones.push(ZoneState {
            name: zone.name.clone(),
            part: zone.part,
            inner_area_m2: zone.geometry.inner_area_m2(),
            surface_c,
            heat_in_w,
            conducted_w,
            melt_w: m,
            melt_mm_h: m / LATENT_HEAT_FUSION_J_PER_KG * 3600.0
                / (model.snow_density_kg_m3 * zone.geometry.inner_area_m2())
                * 1000.0,
        });
    }
    let (vent_w, door_w) = model.air_loss_w(t_i);
    let vent_flow = model.vent_flow_m3_s(t_i);
    let door_flow = model.door_flow_m3_s(t_i);
    let flow = vent_flow + door_flow;
    let co2_ppm = (flow > 0.0).then(|| OUTDOOR_CO2_PPM + 1e6 * model.co2_source_m3_s / flow);
    Ok(SteadyResult {
        interior_c: t_i,
        outside_c: model.outside_c,
        zones,
        gains_w: model.gains.total_w,
        people_w: model.gains.people_w,
        candles_w: model.gains.candles_w,
        stove_w: model.gains.stove_w,
        walls_w,
        floor_w,
        vent_w,
        door_w,
        melt_w,
        melt_kg_h: melt_w / LATENT_HEAT_FUSION_J_PER_KG * 3600.0,
        vent_flow_m3_s: vent_flow,
        door_flow_m3_s: door_flow,
        co2_ppm,
        warmest_snow_surface_c: warmest,
        melt_free_limit_c: melt_free_limit_c(model, lining),
        outside_film_w_m2k: model.outside_film_w_m2k,
        snow_conductivity_w_m_k: model.snow_conductivity_w_m_k,
        snow_regression: model.snow_regression,
        with_lining: None,
        warnings: Vec::new(),
    })
}

/// Warnings that depend on the result.
fn result_warnings(model: &Model, r: &SteadyResult, out: &mut Vec<Warning>) {
    match r.co2_ppm {
        Some(c) if c > CO2_LIMIT_PPM => out.push(Warning {
            field: "shelter.vent_diameter_m".into(),
            message: format!(
                "the vent exchanges too little air: CO₂ would settle near {c:.0} ppm, above the 5000 ppm occupational limit (OSHA PEL); widen the vent"
            ),
        }),
        None if model.co2_source_m3_s > 0.0 => out.push(Warning {
            field: "shelter.vent_diameter_m".into(),
            message: "no air is exchanged: CO₂ keeps rising; open a vent".into(),
        }),
        _ => {}
    }
    if r.melt_w > 0.0 {
        out.push(Warning {
            field: "shelter".into(),
            message: format!(
                "the inner snow surface would pass 0 °C: it is held at 0 °C and {:.2} kg of snow melts each hour; the surface will glaze with ice and drip",
                r.melt_kg_h
            ),
        });
    }
}

/// The steady state of a shelter under conditions.
pub fn steady(shelter: &Shelter, conditions: &Conditions) -> Result<SteadyResult, ShelterError> {
    let (model, mut warnings) = Model::build(shelter, conditions)?;
    let mut r = solve(&model, 0.0)?;
    if r.melt_w > 0.0 && model.lining_m2k_w > 0.0 {
        let lined = solve(&model, model.lining_m2k_w)?;
        r.with_lining = Some(LiningOutcome {
            lining_m2k_w: model.lining_m2k_w,
            interior_c: lined.interior_c,
            melt_kg_h: lined.melt_kg_h,
            melt_free_limit_c: lined.melt_free_limit_c,
        });
    }
    result_warnings(&model, &r, &mut warnings);
    r.warnings = warnings;
    Ok(r)
}

/// One regression's result.
#[derive(Debug, Clone, PartialEq)]
pub struct BandEntry {
    pub regression: SnowRegression,
    pub conductivity_w_m_k: f64,
    pub interior_c: f64,
    pub melt_kg_h: f64,
    /// The density lies in the regression's range.
    pub in_range: bool,
}

/// The interior temperature with every snow regression.
#[derive(Debug, Clone, PartialEq)]
pub struct Band {
    pub entries: Vec<BandEntry>,
    /// The coldest and warmest interior and the regression giving each.
    pub coldest: (SnowRegression, f64),
    pub warmest: (SnowRegression, f64),
}

/// The same shelter with each of the nine snow regressions.
pub fn regression_band(shelter: &Shelter, conditions: &Conditions) -> Result<Band, ShelterError> {
    Model::build(shelter, conditions)?;
    let mut entries = Vec::with_capacity(SnowRegression::ALL.len());
    for c in SnowRegression::ALL {
        let model = Model::assemble(shelter, conditions, c);
        let r = solve(&model, 0.0)?;
        let (lo, hi) = c.valid_range_kg_m3();
        let rho = shelter.snow_density_kg_m3;
        entries.push(BandEntry {
            regression: c,
            conductivity_w_m_k: model.snow_conductivity_w_m_k,
            interior_c: r.interior_c,
            melt_kg_h: r.melt_kg_h,
            in_range: rho >= lo && rho <= hi,
        });
    }
    let pick = |better: fn(f64, f64) -> bool| {
        let mut best = &entries[0];
        for e in &entries[1..] {
            if better(e.interior_c, best.interior_c) {
                best = e;
            }
        }
        (best.regression, best.interior_c)
    };
    let coldest = pick(|a, b| a < b);
    let warmest = pick(|a, b| a > b);
    Ok(Band {
        entries,
        coldest,
        warmest,
    })
}

/// One square metre of a shelter's main wall laid flat (see [`FlatWall`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FlatWall {
    /// The main thickness ([`super::inputs::Shape::main_thickness_m`]), m.
    pub thickness_m: f64,
    /// Air to air: outside film, snow and inside film in series, m²K/W.
    pub r_m2k_w: f64,
    /// Heat through it from the air inside to the outside air, W/m² (positive outwards).
    pub heat_flux_w_m2: f64,
    /// The shelter's outside air, °C.
    pub outside_c: f64,
    /// The steady air inside, °C.
    pub inside_c: f64,
}

/// The shelter's main wall laid flat, per square metre, between the shelter's own outside
/// air (through the outside film of its wind) and the steady air inside `r` gives (through
/// the inside film): a plane wall of resistances in series, R = 1/h_o + t/k + 1/h_i, and
/// q = (T_i − T_o)/R (Incropera & DeWitt, the plane wall with convection on both sides).
/// It leaves out the curvature the zones carry (a shell conducts less per inner square
/// metre than a flat wall of the same thickness) and the melt limit (a flux whose inner
/// surface would pass 0 °C is shown as the formula gives it). `None` for a cave with no
/// face to the outside air, which has no such wall.
pub fn flat_wall(shelter: &Shelter, r: &SteadyResult) -> Option<FlatWall> {
    let t = shelter.shape.main_thickness_m()?;
    let r_m2k_w = 1.0 / r.outside_film_w_m2k
        + t / r.snow_conductivity_w_m_k
        + 1.0 / shelter.inside_film_w_m2k;
    Some(FlatWall {
        thickness_m: t,
        r_m2k_w,
        heat_flux_w_m2: (r.interior_c - r.outside_c) / r_m2k_w,
        outside_c: r.outside_c,
        inside_c: r.interior_c,
    })
}
