//! The climate that drives a winter simulation: air temperature (and, where known, snow
//! cover) as a function of time, freezing and thawing indices, design values over several
//! winters, and surface n-factors.
//!
//! Time `t_s` is in seconds from the start of the run; temperatures are in °C; degree-days
//! are °C·days (one day at −1 °C is 1 °C·day of freezing). A day is 86 400 s.
//!
//! Sources: the freezing index as the range of the cumulative degree-day curve over a
//! freezing season, the design values (mean of the three coldest winters, the coldest
//! winter) and the freezing n-factors follow US Army TM 5-852-6 / UFC 3-130-01 and
//! UFC 3-130-04 Table 4-1, as listed in the project's model reference, §4 (marked there as
//! read in the source).
//!
//! What is here: [`DayRecord`] and [`DailySeries`] (validated: consecutive dates, values in
//! range, at most 200 years), split into winters by [`DailySeries::seasons`]; [`Climate`]
//! (`Sinusoid`, `DesignWinter`, `Series`) with [`Climate::air_temperature_c`],
//! [`Climate::snow_at`] and [`Climate::duration_s`]; the freezing index (the range of the
//! cumulative degree-day curve, [`freezing_index_c_days`]), the plain freezing degree-day
//! sum and the thawing index; [`design_freezing_index`] (mean of the three coldest and the
//! coldest complete winter); [`SnowSeason`], the optional snow cover of the sinusoid and
//! the design winter; [`Climate::annual_wave`], the mean and first harmonic a periodic
//! start needs ([`AnnualWave`]); and the freezing n-factors of ground surfaces
//! ([`Surface`]). Dates are `chrono::NaiveDate` (chrono without default features: dates
//! only, no clock).

use chrono::{Datelike, NaiveDate};

use crate::physics::error::{check, InputError, InputErrorKind, InputErrors, Warning};

/// Seconds in a day.
pub const SECONDS_PER_DAY: f64 = 86_400.0;
/// Days in the (non-leap) year of the periodic climates.
pub const DAYS_PER_YEAR: f64 = 365.0;
/// Longest daily series accepted: 200 years of days.
pub const MAX_SERIES_DAYS: usize = 200 * 366;
/// Daily mean air temperatures accepted, °C (beyond any climate on Earth).
pub const AIR_TEMPERATURE_RANGE_C: (f64, f64) = crate::physics::stack::TEMPERATURE_RANGE_C;
/// Snow depths accepted, m (deeper than any seasonal snowpack on the ground).
pub const SNOW_DEPTH_RANGE_M: (f64, f64) = (0.0, 20.0);
/// Snow densities accepted, kg/m³: fresh powder can be below 50; nothing porous is denser
/// than ice (916.7 kg/m³ at 0 °C, IAPWS R10-06, rounded up).
pub const SNOW_DENSITY_RANGE_KG_M3: (f64, f64) = (10.0, 917.0);
/// Freezing indices accepted for a design winter, °C·days (the coldest inhabited places
/// reach several thousand).
pub const DESIGN_FREEZING_INDEX_RANGE_C_DAYS: (f64, f64) = (0.0, 10_000.0);
/// Freezing-season lengths accepted for a design winter, days: the warm part of the year
/// must keep at least one day.
pub const DESIGN_SEASON_DAYS_RANGE: (f64, f64) = (1.0, 364.0);
/// Largest sinusoid amplitude accepted, K.
pub const MAX_AMPLITUDE_K: f64 = 75.0;
/// Fewest complete winters from which design values are given (the mean of the three
/// coldest needs three).
pub const MIN_WINTERS_FOR_DESIGN: usize = 3;
/// The number of winters the design values of the source are based on (the three coldest,
/// or the coldest, in 30 years). Fewer give a warning.
pub const DESIGN_BASIS_WINTERS: usize = 30;

/// One day of a climate record.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DayRecord {
    pub date: NaiveDate,
    /// Mean air temperature over the day, °C.
    pub mean_air_c: f64,
    /// Snow depth on the ground, m, if observed.
    pub snow_depth_m: Option<f64>,
    /// Bulk density of that snow, kg/m³, if observed.
    pub snow_density_kg_m3: Option<f64>,
}

impl DayRecord {
    /// A day with a temperature and no snow observation.
    pub fn new(date: NaiveDate, mean_air_c: f64) -> Self {
        Self {
            date,
            mean_air_c,
            snow_depth_m: None,
            snow_density_kg_m3: None,
        }
    }
}

/// Which value of a [`DayRecord`] a problem concerns.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum DayField {
    Date,
    MeanAir,
    SnowDepth,
    SnowDensity,
}

impl DayField {
    /// Key in SI, as used in field paths (`days[3].mean_air_c`).
    pub fn key(self) -> &'static str {
        match self {
            DayField::Date => "date",
            DayField::MeanAir => "mean_air_c",
            DayField::SnowDepth => "snow_depth_m",
            DayField::SnowDensity => "snow_density_kg_m3",
        }
    }
    /// Plain-word name, as a column is called in messages.
    pub fn name(self) -> &'static str {
        match self {
            DayField::Date => "date",
            DayField::MeanAir => "mean air temperature",
            DayField::SnowDepth => "snow depth",
            DayField::SnowDensity => "snow density",
        }
    }
}

/// What is wrong with the values of one day, whatever its place in the series.
pub fn day_value_problems(day: &DayRecord) -> Vec<(DayField, InputErrorKind)> {
    let mut out = Vec::new();
    let (lo, hi) = AIR_TEMPERATURE_RANGE_C;
    if let Some(k) = check::within_kind(day.mean_air_c, lo, hi, "°C") {
        out.push((DayField::MeanAir, k));
    }
    if let Some(d) = day.snow_depth_m {
        let (lo, hi) = SNOW_DEPTH_RANGE_M;
        if let Some(k) = check::within_kind(d, lo, hi, "m") {
            out.push((DayField::SnowDepth, k));
        }
    }
    if let Some(r) = day.snow_density_kg_m3 {
        let (lo, hi) = SNOW_DENSITY_RANGE_KG_M3;
        if let Some(k) = check::within_kind(r, lo, hi, "kg/m³") {
            out.push((DayField::SnowDensity, k));
        } else if day.snow_depth_m.is_none() {
            out.push((
                DayField::SnowDensity,
                InputErrorKind::NotCovered(
                    "a snow density needs a snow depth on the same day".to_string(),
                ),
            ));
        }
    }
    out
}

/// What is wrong with `date` following `previous` in a daily series: it must be the next
/// day.
pub fn date_step_problem(previous: NaiveDate, date: NaiveDate) -> Option<InputErrorKind> {
    let step = (date - previous).num_days();
    if step == 1 {
        None
    } else if step < 1 {
        Some(InputErrorKind::DateOutOfOrder {
            date: date.to_string(),
            previous: previous.to_string(),
        })
    } else {
        Some(InputErrorKind::DateGap {
            date: date.to_string(),
            previous: previous.to_string(),
            missing: (step - 1) as u64,
        })
    }
}

/// A validated daily climate record: at least one day, consecutive dates without gaps, every
/// value within the accepted ranges, at most [`MAX_SERIES_DAYS`] days.
#[derive(Debug, Clone, PartialEq)]
pub struct DailySeries {
    days: Vec<DayRecord>,
}

impl DailySeries {
    /// Validate and wrap. Every problem is reported, with the field path `days[i].<key>`
    /// (i from 0) and, for dates, the dates concerned.
    pub fn new(days: Vec<DayRecord>) -> Result<Self, InputErrors> {
        let mut errs = InputErrors::default();
        if days.is_empty() || days.len() > MAX_SERIES_DAYS {
            errs.push(
                "days",
                InputErrorKind::Count {
                    count: days.len(),
                    min: 1,
                    max: MAX_SERIES_DAYS,
                },
            );
            return Err(errs);
        }
        for (i, day) in days.iter().enumerate() {
            for (f, kind) in day_value_problems(day) {
                errs.push(format!("days[{i}].{}", f.key()), kind);
            }
            if i > 0 {
                if let Some(kind) = date_step_problem(days[i - 1].date, day.date) {
                    errs.push(format!("days[{i}].date"), kind);
                }
            }
        }
        errs.into_result()?;
        Ok(Self { days })
    }

    pub fn days(&self) -> &[DayRecord] {
        &self.days
    }
    pub fn len(&self) -> usize {
        self.days.len()
    }
    /// Always false: a series has at least one day.
    pub fn is_empty(&self) -> bool {
        self.days.is_empty()
    }
    pub fn first_date(&self) -> NaiveDate {
        self.days[0].date
    }
    pub fn last_date(&self) -> NaiveDate {
        self.days[self.days.len() - 1].date
    }
    /// The daily mean air temperatures, °C.
    pub fn mean_air_c(&self) -> Vec<f64> {
        self.days.iter().map(|d| d.mean_air_c).collect()
    }
    /// Whether any day carries a snow depth.
    pub fn has_snow(&self) -> bool {
        self.days.iter().any(|d| d.snow_depth_m.is_some())
    }
    /// From 00:00 of the first day to 24:00 of the last, s.
    pub fn duration_s(&self) -> f64 {
        self.days.len() as f64 * SECONDS_PER_DAY
    }

    /// Where `t_s` falls between the daily values, which sit at noon of their day
    /// (day i at (i + ½) days): the index of the day at or before it and the fraction of the
    /// way to the next, clamped at both ends.
    fn bracket(&self, t_s: f64) -> (usize, usize, f64) {
        let n = self.days.len();
        let x = t_s / SECONDS_PER_DAY - 0.5;
        if x.is_nan() || x <= 0.0 || n == 1 {
            return (0, 0, 0.0);
        }
        if x >= (n - 1) as f64 {
            return (n - 1, n - 1, 0.0);
        }
        let i = (x.floor() as usize).min(n - 2);
        (i, i + 1, x - i as f64)
    }

    /// Air temperature at `t_s` (s from 00:00 of the first day), °C: linear between daily
    /// means placed at noon, held at the first (last) mean before the first (after the last)
    /// noon. A convention of this tool (common practice, no source): it keeps each day's
    /// mean close to its record without inventing a daily cycle.
    pub fn air_temperature_c(&self, t_s: f64) -> f64 {
        let (i, j, f) = self.bracket(t_s);
        let (a, b) = (self.days[i].mean_air_c, self.days[j].mean_air_c);
        a + (b - a) * f
    }

    /// Snow on the ground at `t_s`, if the record says. Between two days that both give a
    /// depth the depth is linear (noon to noon), and so is the density where both give one
    /// (else the one given is used); where only one of the two days gives a depth, the
    /// nearer day decides. Held constant beyond the ends, like the temperature.
    pub fn snow_at(&self, t_s: f64) -> Option<SnowCover> {
        let (i, j, f) = self.bracket(t_s);
        let (a, b) = (&self.days[i], &self.days[j]);
        match (a.snow_depth_m, b.snow_depth_m) {
            (Some(da), Some(db)) => {
                let density = match (a.snow_density_kg_m3, b.snow_density_kg_m3) {
                    (Some(ra), Some(rb)) => Some(ra + (rb - ra) * f),
                    (ra, rb) => ra.or(rb),
                };
                Some(SnowCover {
                    depth_m: da + (db - da) * f,
                    density_kg_m3: density,
                })
            }
            _ => {
                let near = if f < 0.5 { a } else { b };
                near.snow_depth_m.map(|depth_m| SnowCover {
                    depth_m,
                    density_kg_m3: near.snow_density_kg_m3,
                })
            }
        }
    }

    /// The series cut into seasons of one year each, starting on day 1 of `start_month`
    /// (1–12): every season the series touches, in order, whether complete or not.
    /// Use `start_month` 7 for northern winters (1 July to 30 June, so that no winter is cut
    /// in the middle) and 1 for southern winters; the opposite months give summers, over
    /// which the thawing index is meaningful.
    pub fn seasons(&self, start_month: u32) -> Result<Vec<SeasonIndices>, InputError> {
        if !(1..=12).contains(&start_month) {
            return Err(InputError::new(
                "season_start_month",
                InputErrorKind::OutOfBounds {
                    value: start_month as f64,
                    min: 1.0,
                    max: 12.0,
                    unit: "",
                },
            ));
        }
        let first = self.first_date();
        let last = self.last_date();
        let start_of = |year: i32| NaiveDate::from_ymd_opt(year, start_month, 1);
        let mut year = if first >= start_of(first.year()).unwrap_or(first) {
            first.year()
        } else {
            first.year() - 1
        };
        let mut out = Vec::new();
        while let (Some(start), Some(next)) = (start_of(year), start_of(year + 1)) {
            if start > last {
                break;
            }
            let lo = (start - first).num_days().max(0) as usize;
            let hi = ((next - first).num_days().max(0) as usize).min(self.days.len());
            let temps: Vec<f64> = self.days[lo..hi].iter().map(|d| d.mean_air_c).collect();
            out.push(SeasonIndices {
                start,
                end: next.pred_opt().unwrap_or(next),
                days_present: hi - lo,
                complete: start >= first && next.pred_opt().is_some_and(|e| e <= last),
                freezing_index_c_days: freezing_index_c_days(&temps),
                freezing_degree_days_c_days: freezing_degree_days_sum(&temps),
                thawing_index_c_days: thawing_index_c_days(&temps),
            });
            year += 1;
        }
        Ok(out)
    }
}

/// Snow on the ground at one moment.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SnowCover {
    pub depth_m: f64,
    pub density_kg_m3: Option<f64>,
}

/// Indices of one season (see [`DailySeries::seasons`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SeasonIndices {
    /// First day of the season.
    pub start: NaiveDate,
    /// Last day of the season (the day before the next season starts).
    pub end: NaiveDate,
    /// Days of the season present in the series.
    pub days_present: usize,
    /// Whether every day of the season is present.
    pub complete: bool,
    /// [`freezing_index_c_days`] of the days present.
    pub freezing_index_c_days: f64,
    /// [`freezing_degree_days_sum`] of the days present.
    pub freezing_degree_days_c_days: f64,
    /// [`thawing_index_c_days`] of the days present.
    pub thawing_index_c_days: f64,
}

/// Freezing index of a freezing season, °C·days: the range of the cumulative degree-day
/// curve, i.e. the largest fall from a maximum of C(k) = Σ_{j≤k} T_j (daily means T_j in °C,
/// C = 0 before the first day) to a later minimum (US Army TM 5-852-6 / UFC 3-130-01, via
/// the project's model reference §4). Short warm spells inside the freezing season reduce
/// it by their thawing degree-days; warm days before the maximum or after the minimum do not
/// count. Zero if the curve never falls. Pass one freezing season (see
/// [`DailySeries::seasons`]); over several years it would give the largest single fall.
/// Values must be finite (a [`DailySeries`] guarantees it).
pub fn freezing_index_c_days(daily_mean_c: &[f64]) -> f64 {
    let (mut cum, mut peak, mut range) = (0.0_f64, 0.0_f64, 0.0_f64);
    for &t in daily_mean_c {
        cum += t;
        peak = peak.max(cum);
        range = range.max(peak - cum);
    }
    range
}

/// Thawing index, °C·days: the range of the cumulative degree-day curve from a minimum to a
/// later maximum (the counterpart of [`freezing_index_c_days`], same source). Pass one
/// thawing season.
pub fn thawing_index_c_days(daily_mean_c: &[f64]) -> f64 {
    let (mut cum, mut trough, mut range) = (0.0_f64, 0.0_f64, 0.0_f64);
    for &t in daily_mean_c {
        cum += t;
        trough = trough.min(cum);
        range = range.max(cum - trough);
    }
    range
}

/// Plain sum of freezing degree-days, °C·days: Σ (0 − T) over the days with T < 0 °C
/// (model reference §4). Not smaller than [`freezing_index_c_days`] over the same days;
/// larger when warm days interrupt the freezing season.
pub fn freezing_degree_days_sum(daily_mean_c: &[f64]) -> f64 {
    daily_mean_c.iter().filter(|&&t| t < 0.0).map(|&t| -t).sum()
}

/// How design values are taken from a series.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DesignOptions {
    /// Month (1–12) on whose first day each winter starts: 7 in the northern hemisphere,
    /// 1 in the southern.
    pub season_start_month: u32,
    /// Fewest complete winters accepted (at least [`MIN_WINTERS_FOR_DESIGN`]).
    pub min_complete_winters: usize,
}

impl Default for DesignOptions {
    fn default() -> Self {
        Self {
            season_start_month: 7,
            min_complete_winters: MIN_WINTERS_FOR_DESIGN,
        }
    }
}

/// Design freezing indices of a multi-year series (model reference §4, after TM 5-852-6:
/// the mean of the three coldest winters, or the coldest, in 30 years).
#[derive(Debug, Clone, PartialEq)]
pub struct DesignFreezingIndex {
    /// Every complete winter, in order.
    pub winters: Vec<SeasonIndices>,
    /// Mean freezing index of the three winters with the largest index, °C·days.
    pub mean_of_three_coldest_c_days: f64,
    /// Start dates of those three winters, coldest first.
    pub three_coldest_starts: [NaiveDate; 3],
    /// Largest freezing index of a complete winter, °C·days.
    pub coldest_c_days: f64,
    /// Mean freezing index of all complete winters, °C·days.
    pub mean_c_days: f64,
    /// Fewer winters than the source's basis, for example.
    pub warnings: Vec<Warning>,
}

/// Design freezing indices from the complete winters of `series`. Incomplete winters at
/// either end are left out. Refused with [`InputErrorKind::TooFewWinters`] if fewer than
/// `max(min_complete_winters, 3)` are complete; warns below [`DESIGN_BASIS_WINTERS`].
pub fn design_freezing_index(
    series: &DailySeries,
    options: &DesignOptions,
) -> Result<DesignFreezingIndex, InputError> {
    let winters: Vec<SeasonIndices> = series
        .seasons(options.season_start_month)?
        .into_iter()
        .filter(|s| s.complete)
        .collect();
    let needed = options.min_complete_winters.max(MIN_WINTERS_FOR_DESIGN);
    if winters.len() < needed {
        return Err(InputError::new(
            "climate.series",
            InputErrorKind::TooFewWinters {
                complete: winters.len(),
                needed,
                season_start: format!("1 {}", month_name(options.season_start_month)),
            },
        ));
    }
    let mut order: Vec<usize> = (0..winters.len()).collect();
    order.sort_by(|&a, &b| {
        winters[b]
            .freezing_index_c_days
            .total_cmp(&winters[a].freezing_index_c_days)
    });
    let top: [usize; 3] = [order[0], order[1], order[2]];
    let mean_of_three = top
        .iter()
        .map(|&i| winters[i].freezing_index_c_days)
        .sum::<f64>()
        / 3.0;
    let mean = winters.iter().map(|w| w.freezing_index_c_days).sum::<f64>() / winters.len() as f64;
    let mut warnings = Vec::new();
    if winters.len() < DESIGN_BASIS_WINTERS {
        warnings.push(Warning {
            field: "climate.series".to_string(),
            message: format!(
                "only {} complete winters: the design values of the source are taken over {DESIGN_BASIS_WINTERS}, so these are less sure",
                winters.len()
            ),
        });
    }
    Ok(DesignFreezingIndex {
        mean_of_three_coldest_c_days: mean_of_three,
        three_coldest_starts: top.map(|i| winters[i].start),
        coldest_c_days: winters[top[0]].freezing_index_c_days,
        mean_c_days: mean,
        winters,
        warnings,
    })
}

fn month_name(m: u32) -> &'static str {
    const NAMES: [&str; 12] = [
        "January",
        "February",
        "March",
        "April",
        "May",
        "June",
        "July",
        "August",
        "September",
        "October",
        "November",
        "December",
    ];
    NAMES[(m.clamp(1, 12) - 1) as usize]
}

/// The air temperature (and snow) that drives a run.
#[derive(Debug, Clone, PartialEq)]
pub enum Climate {
    /// T(t) = mean − amplitude · cos(2π (t − t_c) / P), P = 365 days, with t = 0 at 00:00 of
    /// day 1 of the year and t_c at noon of `coldest_day_of_year`: the usual annual
    /// sinusoid of surface temperature (model reference §4, periodic surface temperature).
    /// Its mean over a year is `mean_c`; its coldest moment is noon of the given day. The
    /// natural run is one year.
    Sinusoid {
        mean_c: f64,
        amplitude_k: f64,
        coldest_day_of_year: u32,
        /// Snow on the ground, if any ([`SnowSeason`]).
        snow: Option<SnowSeason>,
    },
    /// A daily record, interpolated as in [`DailySeries::air_temperature_c`]. The natural run
    /// is the record's length.
    Series(DailySeries),
    /// A design year built from a freezing index F (°C·days), a freezing-season length S
    /// (days) and a mean annual temperature M (°C). A construction of this tool (no source):
    /// with τ the time in days since the start of the freezing season (t = 0), period 365 d,
    ///
    /// - freezing season, 0 ≤ τ ≤ S: T = −A sin(π τ / S), A = π F / (2 S), so that
    ///   ∫ (0 − T) dτ = 2 A S / π = F exactly;
    /// - warm part, S ≤ τ ≤ 365: T = B sin(π (τ − S) / W), W = 365 − S,
    ///   B = π (365 M + F) / (2 W), so that the year's mean is (2 B W / π − F) / 365 = M.
    ///
    /// B ≥ 0 is required (M ≥ −F / 365): otherwise the warm part would have to freeze too,
    /// and the freezing index would not be F. The curve is continuous, at 0 °C at both ends
    /// of the season, and the range of its cumulative degree-day curve is F. The natural run
    /// is one year, starting at freeze-up.
    DesignWinter {
        freezing_index_c_days: f64,
        season_days: f64,
        mean_annual_c: f64,
        /// Snow on the ground, if any ([`SnowSeason`]).
        snow: Option<SnowSeason>,
    },
}

/// Snow depths accepted in a [`SnowSeason`], m.
pub const SEASON_SNOW_DEPTH_RANGE_M: (f64, f64) = (0.0, 5.0);
/// Snow densities accepted in a [`SnowSeason`], kg/m³ (new snow to old wind-packed snow
/// and beyond: Cuffey & Paterson, The Physics of Glaciers, Table 2.1, from memory).
pub const SEASON_SNOW_DENSITY_RANGE_KG_M3: (f64, f64) = (50.0, 600.0);
/// Days of a [`SnowSeason`] accepted: within the first two years of the run.
pub const SEASON_DAY_RANGE: (f64, f64) = (0.0, 730.0);

/// A snow season for the synthetic climates: a shape of this tool (no source), for runs
/// where no snow record exists. Days are days of the run (0-based, fractional), and the
/// season repeats every 365 days, like the climates it belongs to.
///
/// - Depth rises linearly from 0 at `start_day` to `peak_depth_m` at `peak_day`, then falls
///   linearly to 0 at `end_day`.
/// - Density rises linearly from `fresh_density_kg_m3` at `start_day` to
///   `settled_density_kg_m3` at `end_day` (settling over the winter).
/// - A season may run across the end of the year: either `end_day` beyond 365
///   (300 → 465), or `start_day` after `end_day` (300 → 100, the same season). It lasts at
///   most 365 days. On any day the time since the start is taken modulo 365 days, so the
///   first days of a run that starts in midwinter carry the previous winter's snow.
///
/// [`SnowSeason::validate`] checks it with field paths under the caller's prefix
/// (`winter.climate.snow.peak_depth_m`): peak depth within [`SEASON_SNOW_DEPTH_RANGE_M`],
/// densities within [`SEASON_SNOW_DENSITY_RANGE_KG_M3`] and settled not lighter than fresh,
/// days within [`SEASON_DAY_RANGE`], the season at most 365 days with its peak inside it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SnowSeason {
    pub start_day: f64,
    pub peak_day: f64,
    pub end_day: f64,
    pub peak_depth_m: f64,
    pub fresh_density_kg_m3: f64,
    pub settled_density_kg_m3: f64,
}

impl SnowSeason {
    /// Days from the start to the peak and to the end, with the season unwrapped.
    fn offsets(&self) -> (f64, f64) {
        let mut end = self.end_day - self.start_day;
        if end <= 0.0 {
            end += DAYS_PER_YEAR;
        }
        let mut peak = self.peak_day - self.start_day;
        if peak < 0.0 {
            peak += DAYS_PER_YEAR;
        }
        (peak, end)
    }

    /// Check every value; field paths start with `field` (e.g. `winter.climate.snow`).
    pub fn validate(&self, field: &str, errs: &mut InputErrors) {
        let (dlo, dhi) = SEASON_DAY_RANGE;
        let mut days_ok = true;
        for (key, v) in [
            ("start_day", self.start_day),
            ("peak_day", self.peak_day),
            ("end_day", self.end_day),
        ] {
            days_ok &= check::within(errs, &format!("{field}.{key}"), v, dlo, dhi, "days");
        }
        let (zlo, zhi) = SEASON_SNOW_DEPTH_RANGE_M;
        check::within(
            errs,
            &format!("{field}.peak_depth_m"),
            self.peak_depth_m,
            zlo,
            zhi,
            "m",
        );
        let (rlo, rhi) = SEASON_SNOW_DENSITY_RANGE_KG_M3;
        let fresh = check::within(
            errs,
            &format!("{field}.fresh_density_kg_m3"),
            self.fresh_density_kg_m3,
            rlo,
            rhi,
            "kg/m³",
        );
        let settled = check::within(
            errs,
            &format!("{field}.settled_density_kg_m3"),
            self.settled_density_kg_m3,
            rlo,
            rhi,
            "kg/m³",
        );
        if fresh && settled && self.settled_density_kg_m3 < self.fresh_density_kg_m3 {
            errs.push(
                format!("{field}.settled_density_kg_m3"),
                InputErrorKind::NotCovered(format!(
                    "settled snow ({} kg/m³) must not be lighter than fresh snow ({} kg/m³)",
                    self.settled_density_kg_m3, self.fresh_density_kg_m3
                )),
            );
        }
        if days_ok {
            let (peak, end) = self.offsets();
            if end > DAYS_PER_YEAR {
                errs.push(
                    format!("{field}.end_day"),
                    InputErrorKind::NotCovered(format!(
                        "a snow season lasts at most {DAYS_PER_YEAR} days (this one {end} days)"
                    )),
                );
            } else if peak > end {
                errs.push(
                    format!("{field}.peak_day"),
                    InputErrorKind::NotCovered(format!(
                        "the peak (day {}) must fall within the season, from day {} to day {}",
                        self.peak_day, self.start_day, self.end_day
                    )),
                );
            }
        }
    }

    /// Snow on the ground at `t_s` (s from the start of the run), `None` outside the season
    /// or at zero depth.
    pub fn at(&self, t_s: f64) -> Option<SnowCover> {
        let (peak, end) = self.offsets();
        let since = (t_s / SECONDS_PER_DAY - self.start_day).rem_euclid(DAYS_PER_YEAR);
        if since.is_nan() || since > end {
            return None;
        }
        let depth = if since <= peak {
            if peak > 0.0 {
                self.peak_depth_m * since / peak
            } else {
                self.peak_depth_m
            }
        } else if end > peak {
            self.peak_depth_m * (end - since) / (end - peak)
        } else {
            0.0
        };
        let density = self.fresh_density_kg_m3
            + (self.settled_density_kg_m3 - self.fresh_density_kg_m3) * (since / end).min(1.0);
        (depth > 0.0).then_some(SnowCover {
            depth_m: depth,
            density_kg_m3: Some(density),
        })
    }
}

/// The annual wave of a climate's air temperature, its mean and first harmonic:
/// T ≈ mean − amplitude · cos(2π (t − coldest) / 365 d). What the periodic start of a
/// winter run is built from.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct AnnualWave {
    pub mean_c: f64,
    pub amplitude_k: f64,
    /// Time of the coldest moment of the wave, s from the start of the run, in [0, 365 d).
    pub coldest_s: f64,
}

/// Least-squares fit of T(t) ≈ m + a cos ωt + b sin ωt (ω = 2π / 365 d) to samples, turned
/// into an [`AnnualWave`] (a = −A cos ωt_c, b = −A sin ωt_c). Over whole years of evenly
/// spaced samples the fit is the projection onto the first harmonic (the Fourier
/// coefficients, standard); on shorter spans it is still the least-squares wave. With too
/// few samples to fix a wave (fewer than 3, or all at one phase), the mean with no wave.
pub fn fit_annual_wave(times_s: &[f64], values_c: &[f64]) -> AnnualWave {
    let omega = 2.0 * std::f64::consts::PI / (DAYS_PER_YEAR * SECONDS_PER_DAY);
    let n = times_s.len().min(values_c.len());
    let mean = if n == 0 {
        0.0
    } else {
        values_c[..n].iter().sum::<f64>() / n as f64
    };
    // Normal equations of the basis (1, cos, sin).
    let mut m = [[0.0; 3]; 3];
    let mut rhs = [0.0; 3];
    for (&t, &v) in times_s.iter().zip(values_c).take(n) {
        let basis = [1.0, (omega * t).cos(), (omega * t).sin()];
        for i in 0..3 {
            for j in 0..3 {
                m[i][j] += basis[i] * basis[j];
            }
            rhs[i] += basis[i] * v;
        }
    }
    let det = |m: &[[f64; 3]; 3]| {
        m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1])
            - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0])
            + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0])
    };
    let d = det(&m);
    let flat = AnnualWave {
        mean_c: mean,
        amplitude_k: 0.0,
        coldest_s: 0.0,
    };
    if n < 3 || d.is_nan() || d.abs() <= 1e-9 * (n as f64).powi(3) {
        return flat;
    }
    // Cramer's rule.
    let solve = |col: usize| {
        let mut mm = m;
        for (row, r) in mm.iter_mut().zip(&rhs) {
            row[col] = *r;
        }
        det(&mm) / d
    };
    let (m0, a, b) = (solve(0), solve(1), solve(2));
    let amplitude = a.hypot(b);
    let coldest = if amplitude > 0.0 {
        ((-b).atan2(-a) / omega).rem_euclid(DAYS_PER_YEAR * SECONDS_PER_DAY)
    } else {
        0.0
    };
    AnnualWave {
        mean_c: m0,
        amplitude_k: amplitude,
        coldest_s: coldest,
    }
}

/// Amplitudes (A, B) in K of the two halves of a [`Climate::DesignWinter`] (see there):
/// A = π F / (2 S), B = π (365 M + F) / (2 (365 − S)).
pub fn design_winter_amplitudes_k(
    freezing_index_c_days: f64,
    season_days: f64,
    mean_annual_c: f64,
) -> (f64, f64) {
    let pi = std::f64::consts::PI;
    let a = pi * freezing_index_c_days / (2.0 * season_days);
    let b = pi * (DAYS_PER_YEAR * mean_annual_c + freezing_index_c_days)
        / (2.0 * (DAYS_PER_YEAR - season_days));
    (a, b)
}

/// Freezing index over one period of a [`Climate::Sinusoid`], °C·days, closed form: with
/// θ₀ = arccos(mean / amplitude), the negative part of the sine integrates to
/// (A sin θ₀ − M θ₀) · 365 / π (M ≥ A: 0; M ≤ −A: −365 M). Derived here from the formula
/// of the sinusoid (standard calculus, no source).
pub fn sinusoid_freezing_index_c_days(mean_c: f64, amplitude_k: f64) -> f64 {
    if mean_c >= amplitude_k {
        0.0
    } else if mean_c <= -amplitude_k {
        -DAYS_PER_YEAR * mean_c
    } else {
        let th = (mean_c / amplitude_k).acos();
        (amplitude_k * th.sin() - mean_c * th) * DAYS_PER_YEAR / std::f64::consts::PI
    }
}

impl Climate {
    /// Check every parameter; field paths start with `field` (for example `climate`).
    pub fn validate(&self, field: &str) -> Result<(), InputErrors> {
        let mut errs = InputErrors::default();
        let (tlo, thi) = AIR_TEMPERATURE_RANGE_C;
        match *self {
            Climate::Sinusoid {
                mean_c,
                amplitude_k,
                coldest_day_of_year,
                snow,
            } => {
                if let Some(s) = snow {
                    s.validate(&format!("{field}.snow"), &mut errs);
                }
                let m = check::within(
                    &mut errs,
                    &format!("{field}.mean_c"),
                    mean_c,
                    tlo,
                    thi,
                    "°C",
                );
                let a = check::within(
                    &mut errs,
                    &format!("{field}.amplitude_k"),
                    amplitude_k,
                    0.0,
                    MAX_AMPLITUDE_K,
                    "K",
                );
                if m && a && (mean_c - amplitude_k < tlo || mean_c + amplitude_k > thi) {
                    errs.push(
                        format!("{field}.amplitude_k"),
                        InputErrorKind::NotCovered(format!(
                            "the mean ± the amplitude must stay between {tlo} and {thi} °C (it spans {} to {} °C)",
                            mean_c - amplitude_k,
                            mean_c + amplitude_k
                        )),
                    );
                }
                if !(1..=365).contains(&coldest_day_of_year) {
                    errs.push(
                        format!("{field}.coldest_day_of_year"),
                        InputErrorKind::OutOfBounds {
                            value: coldest_day_of_year as f64,
                            min: 1.0,
                            max: 365.0,
                            unit: "",
                        },
                    );
                }
            }
            Climate::Series(_) => {}
            Climate::DesignWinter {
                freezing_index_c_days,
                season_days,
                mean_annual_c,
                snow,
            } => {
                if let Some(s) = snow {
                    s.validate(&format!("{field}.snow"), &mut errs);
                }
                let (flo, fhi) = DESIGN_FREEZING_INDEX_RANGE_C_DAYS;
                let (slo, shi) = DESIGN_SEASON_DAYS_RANGE;
                let f = check::within(
                    &mut errs,
                    &format!("{field}.freezing_index_c_days"),
                    freezing_index_c_days,
                    flo,
                    fhi,
                    "°C·days",
                );
                let s = check::within(
                    &mut errs,
                    &format!("{field}.season_days"),
                    season_days,
                    slo,
                    shi,
                    "days",
                );
                let m = check::within(
                    &mut errs,
                    &format!("{field}.mean_annual_c"),
                    mean_annual_c,
                    tlo,
                    thi,
                    "°C",
                );
                if f && s && m {
                    let (a, b) = design_winter_amplitudes_k(
                        freezing_index_c_days,
                        season_days,
                        mean_annual_c,
                    );
                    if b < 0.0 {
                        errs.push(
                            format!("{field}.mean_annual_c"),
                            InputErrorKind::NotCovered(format!(
                                "a mean annual temperature of {mean_annual_c} °C needs more freezing than the freezing index of {freezing_index_c_days} °C·days: it must be at least {:.3} °C (−F / 365)",
                                -freezing_index_c_days / DAYS_PER_YEAR
                            )),
                        );
                    }
                    if -a < tlo {
                        errs.push(
                            format!("{field}.season_days"),
                            InputErrorKind::NotCovered(format!(
                                "the coldest day would be {:.1} °C, below {tlo} °C: lengthen the season",
                                -a
                            )),
                        );
                    }
                    if b > thi {
                        errs.push(
                            format!("{field}.season_days"),
                            InputErrorKind::NotCovered(format!(
                                "the warmest day would be {b:.1} °C, above {thi} °C: shorten the season"
                            )),
                        );
                    }
                }
            }
        }
        errs.into_result()
    }

    /// Air temperature at `t_s` seconds from the start of the run, °C.
    pub fn air_temperature_c(&self, t_s: f64) -> f64 {
        match self {
            Climate::Sinusoid {
                mean_c,
                amplitude_k,
                coldest_day_of_year,
                ..
            } => {
                let t_c = (f64::from(*coldest_day_of_year) - 0.5) * SECONDS_PER_DAY;
                let period = DAYS_PER_YEAR * SECONDS_PER_DAY;
                mean_c - amplitude_k * (2.0 * std::f64::consts::PI * (t_s - t_c) / period).cos()
            }
            Climate::Series(s) => s.air_temperature_c(t_s),
            Climate::DesignWinter {
                freezing_index_c_days,
                season_days,
                mean_annual_c,
                ..
            } => {
                let (a, b) = design_winter_amplitudes_k(
                    *freezing_index_c_days,
                    *season_days,
                    *mean_annual_c,
                );
                let tau = (t_s / SECONDS_PER_DAY).rem_euclid(DAYS_PER_YEAR);
                let pi = std::f64::consts::PI;
                if tau <= *season_days {
                    -a * (pi * tau / season_days).sin()
                } else {
                    b * (pi * (tau - season_days) / (DAYS_PER_YEAR - season_days)).sin()
                }
            }
        }
    }

    /// Snow on the ground at `t_s`: a series that carries snow depths, or the snow season
    /// of a sinusoid or design winter.
    pub fn snow_at(&self, t_s: f64) -> Option<SnowCover> {
        match self {
            Climate::Series(s) => s.snow_at(t_s),
            Climate::Sinusoid { snow, .. } | Climate::DesignWinter { snow, .. } => {
                snow.as_ref().and_then(|s| s.at(t_s))
            }
        }
    }

    /// The mean and first harmonic of the air temperature ([`AnnualWave`]):
    /// - a sinusoid: its own mean, amplitude and coldest moment (noon of its coldest day);
    /// - a design winter: its mean M (exact by construction) and the first harmonic of the
    ///   constructed curve, fitted ([`fit_annual_wave`]) to 24 samples a day over its year
    ///   (each at the middle of its hour; the curve's two kinks at 0 °C make the error of
    ///   that quadrature about 1e-7 K);
    /// - a daily series: fitted to the daily means (at noon of their day) over as many whole
    ///   years of 365 days as the series holds from its first day, or over the whole series
    ///   if it is shorter than a year.
    pub fn annual_wave(&self) -> AnnualWave {
        let year = DAYS_PER_YEAR * SECONDS_PER_DAY;
        match self {
            Climate::Sinusoid {
                mean_c,
                amplitude_k,
                coldest_day_of_year,
                ..
            } => AnnualWave {
                mean_c: *mean_c,
                amplitude_k: *amplitude_k,
                coldest_s: ((f64::from(*coldest_day_of_year) - 0.5) * SECONDS_PER_DAY)
                    .rem_euclid(year),
            },
            Climate::DesignWinter { mean_annual_c, .. } => {
                let n = (DAYS_PER_YEAR * 24.0) as usize;
                let times: Vec<f64> = (0..n).map(|i| (i as f64 + 0.5) * 3600.0).collect();
                let values: Vec<f64> = times.iter().map(|&t| self.air_temperature_c(t)).collect();
                AnnualWave {
                    mean_c: *mean_annual_c,
                    ..fit_annual_wave(&times, &values)
                }
            }
            Climate::Series(s) => {
                let days = s.days();
                let whole = (days.len() / DAYS_PER_YEAR as usize) * DAYS_PER_YEAR as usize;
                let n = if whole > 0 { whole } else { days.len() };
                let times: Vec<f64> = (0..n).map(|i| (i as f64 + 0.5) * SECONDS_PER_DAY).collect();
                let values: Vec<f64> = days[..n].iter().map(|d| d.mean_air_c).collect();
                fit_annual_wave(&times, &values)
            }
        }
    }

    /// The natural length of a run, s: one year for the periodic climates, the record's
    /// length for a series.
    pub fn duration_s(&self) -> f64 {
        match self {
            Climate::Series(s) => s.duration_s(),
            _ => DAYS_PER_YEAR * SECONDS_PER_DAY,
        }
    }
}

/// A ground surface and its freezing n-factor: the ratio of the surface freezing index to
/// the air freezing index (UFC 3-130-04 Table 4-1, also TM 5-852-6, via the project's model
/// reference §4, marked there as read in the source).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Surface {
    SnowCovered,
    Concrete,
    Asphalt,
    BareSoil,
    Shaded,
    Turf,
    TreeCovered,
}

/// Where the freezing n-factors come from.
pub const N_FACTOR_SOURCE: &str =
    "UFC 3-130-04, Table 4-1 (freezing n-factors); also US Army TM 5-852-6";

impl Surface {
    pub const ALL: [Surface; 7] = [
        Surface::SnowCovered,
        Surface::Concrete,
        Surface::Asphalt,
        Surface::BareSoil,
        Surface::Shaded,
        Surface::Turf,
        Surface::TreeCovered,
    ];
    pub fn id(self) -> &'static str {
        match self {
            Surface::SnowCovered => "snow",
            Surface::Concrete => "concrete",
            Surface::Asphalt => "asphalt",
            Surface::BareSoil => "bare-soil",
            Surface::Shaded => "shaded",
            Surface::Turf => "turf",
            Surface::TreeCovered => "tree-covered",
        }
    }
    pub fn from_id(id: &str) -> Option<Self> {
        Self::ALL.into_iter().find(|s| s.id() == id)
    }
    /// In plain words.
    pub fn name(self) -> &'static str {
        match self {
            Surface::SnowCovered => "Snow surface",
            Surface::Concrete => "Concrete",
            Surface::Asphalt => "Asphalt",
            Surface::BareSoil => "Bare soil",
            Surface::Shaded => "Shaded surface",
            Surface::Turf => "Turf (grass)",
            Surface::TreeCovered => "Ground under trees",
        }
    }
    /// Freezing n-factor (dimensionless).
    pub fn freezing_n_factor(self) -> f64 {
        match self {
            Surface::SnowCovered => 1.0,
            Surface::Concrete => 0.75,
            Surface::Asphalt => 0.7,
            Surface::BareSoil => 0.7,
            Surface::Shaded => 0.9,
            Surface::Turf => 0.5,
            Surface::TreeCovered => 0.3,
        }
    }
    pub fn source(self) -> &'static str {
        N_FACTOR_SOURCE
    }
}

/// Surface freezing index, °C·days: n × the air freezing index (same source as
/// [`Surface`]).
pub fn surface_freezing_index_c_days(n_factor: f64, air_freezing_index_c_days: f64) -> f64 {
    n_factor * air_freezing_index_c_days
}
