//! Bringing a daily climate record into a scenario (edge, serde): CSV text read with the
//! units the user chose becomes the scenario's daily records, with what a builder wants to
//! see before running it: the span, the freezing index and freezing season of each winter,
//! and the design values of a multi-year record (mean of the three coldest winters, the
//! coldest).
//!
//! [`import_csv`] (units named as the CSV reader accepts them, [`ImportOptions`]) gives the
//! scenario's daily records in SI, every problem with its line, and a summary: the span,
//! the units the header named (they win over the chosen ones, [`UnitFromHeader`]), each
//! winter's freezing and thawing index and its days below 0 °C, the design values or why
//! there are none, and the design winter built from them ([`DesignWinterFit`]).
//! [`summarise_days`] does the same for records already in a scenario. The page calls both
//! through the wasm face.
//!
//! # The design winter fitted to a record
//!
//! A rule of this tool (common practice, no source), over the complete winters:
//!
//! - **Freezing index**: the mean of the three coldest winters (the design value above,
//!   after TM 5-852-6 / UFC 3-130-01).
//! - **Season length**: the mean, over the same three winters, of each winter's days whose
//!   mean air temperature is below 0 °C. The design winter's curve is below 0 °C for
//!   exactly that many days, so the modified Berggren method sees the same season length
//!   whether it is given the record or the design winter built from it.
//! - **Mean annual temperature**: the mean of every day of the complete winters.
//! - **Snow** (when the record has snow depths): in each complete winter with snow on the
//!   ground, freeze-up is the day after the highest point of its cumulative degree-day
//!   curve (where its freezing index starts, as day 0 of the design winter does); the first
//!   day with snow, the day of its greatest depth and the first day after that with a
//!   depth of 0 (or the day after the last with snow) are counted from freeze-up. The
//!   season takes the mean of each of those days and of the greatest depths over the snowy
//!   winters, days before freeze-up wrapping to the end of the design year. Its fresh and
//!   settled densities are the means of the densities recorded over the first and over the
//!   last 14 days of each winter's cover; where none were recorded, the densities of a new
//!   snow season ([`crate::document::defaults::snow_season`]).
//!
//! Its limits: one straight rise and fall a winter, so a record whose snow comes and goes
//! several times in a winter, or melts out in midwinter, is smoothed to one season; means
//! of days and depths are not the depth curve of a mean winter (the peak of the mean is
//! lower than the mean of the peaks only when peaks fall on different days: the peak depth
//! kept is the mean of the winters' peaks); blank depths count as not observed.

use crate::document::climate_csv::{
    read_daily_csv, BadLines, CsvOptions, DensityUnit, DepthUnit, HeaderUnit, LineProblem,
    TemperatureUnit,
};
use crate::document::vocabulary::ErrorDoc;
use crate::document::weather::{DayDoc, SnowSeasonDoc};
use crate::physics::climate::{
    design_freezing_index, DailySeries, DayRecord, DesignOptions, SeasonIndices,
    SEASON_SNOW_DENSITY_RANGE_KG_M3, SEASON_SNOW_DEPTH_RANGE_M,
};
use serde::{Deserialize, Serialize};

/// How the user asked for the file to be read (unit names as the CSV reader accepts them:
/// `°C`/`°F`, `m`/`cm`/`in`/`ft`, `kg/m³`/`lb/ft³`).
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ImportOptions {
    pub temperature: String,
    #[serde(default)]
    pub snow_depth: Option<String>,
    #[serde(default)]
    pub snow_density: Option<String>,
    /// Leave bad lines out instead of refusing the file.
    #[serde(default)]
    pub skip_bad_lines: bool,
    /// Fill gaps of up to this many days by interpolation.
    #[serde(default)]
    pub fill_gaps_days: u32,
    /// Month on whose first day a winter starts (7 north, 1 south; default 7).
    #[serde(default)]
    pub season_start_month: Option<u32>,
}

/// One winter of the record.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct WinterIndex {
    pub start: String,
    pub end: String,
    pub complete: bool,
    pub days_present: usize,
    pub freezing_index_c_days: f64,
    pub thawing_index_c_days: f64,
    /// The winter's freezing season: its days whose mean air temperature is below 0 °C.
    pub freezing_season_days: usize,
}

/// Design freezing indices, when the record has enough complete winters.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DesignValues {
    pub complete_winters: usize,
    pub mean_of_three_coldest_c_days: f64,
    pub three_coldest_starts: Vec<String>,
    pub coldest_c_days: f64,
    pub mean_c_days: f64,
    pub warnings: Vec<String>,
}

/// A design winter fitted to the record (see the module documentation): what the
/// scenario's `design-winter` climate takes.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DesignWinterFit {
    pub freezing_index_c_days: f64,
    pub season_days: f64,
    pub mean_annual_c: f64,
    /// The snow season fitted to the snowy winters, if the record has snow on the ground.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub snow: Option<SnowSeasonDoc>,
    /// How many winters the snow season was fitted to.
    pub snow_winters: usize,
}

/// A column's unit as the header named it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct UnitFromHeader {
    /// The column in plain words (`snow depth`).
    pub column: &'static str,
    pub unit: &'static str,
    /// The unit chosen for that column.
    pub chosen: &'static str,
    /// Whether the header's unit differs from the chosen one (the header's was used).
    pub overrides: bool,
}

impl From<&HeaderUnit> for UnitFromHeader {
    fn from(h: &HeaderUnit) -> Self {
        UnitFromHeader {
            column: h.column.name(),
            unit: h.unit,
            chosen: h.chosen,
            overrides: h.overrides(),
        }
    }
}

/// A line-tied problem, ready for the page.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LineDoc {
    pub line: Option<usize>,
    pub column: Option<String>,
    /// The whole message, starting with the line (`line 17, mean air temperature: …`).
    pub message: String,
}

impl From<&LineProblem> for LineDoc {
    fn from(p: &LineProblem) -> Self {
        LineDoc {
            line: p.line,
            column: p.column.clone(),
            message: p.to_string(),
        }
    }
}

/// What an import gives back.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ImportOutcome {
    pub ok: bool,
    /// Problems that stopped the import (or, with `ok`, the lines skipped).
    pub problems: Vec<LineDoc>,
    pub more_problems: usize,
    /// Errors in the options themselves (field named).
    pub errors: Vec<ErrorDoc>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub summary: Option<ImportSummary>,
    /// The scenario's daily records (SI).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub days: Vec<DayDoc>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ImportSummary {
    pub first_date: String,
    pub last_date: String,
    pub days: usize,
    pub has_snow: bool,
    pub skipped_lines: usize,
    pub filled_days: usize,
    /// The units the header named (the data were read in them).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub header_units: Vec<UnitFromHeader>,
    pub winters: Vec<WinterIndex>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub design: Option<DesignValues>,
    /// Why there are no design values (too few complete winters), if so.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub design_note: Option<String>,
    /// The design winter fitted to the record, with the design values.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub design_winter: Option<DesignWinterFit>,
}

fn failed(errors: Vec<ErrorDoc>, problems: Vec<LineDoc>, more: usize) -> ImportOutcome {
    ImportOutcome {
        ok: false,
        problems,
        more_problems: more,
        errors,
        summary: None,
        days: Vec::new(),
    }
}

/// Summarise a series: its winters (by `season_start_month`) and design values.
pub fn summarise(
    series: &DailySeries,
    season_start_month: u32,
    skipped_lines: usize,
    filled_days: usize,
) -> Result<ImportSummary, ErrorDoc> {
    let winters = series
        .seasons(season_start_month)
        .map_err(|e| ErrorDoc::from(&e))?;
    let options = DesignOptions {
        season_start_month,
        ..DesignOptions::default()
    };
    let (design, design_note, design_winter) = match design_freezing_index(series, &options) {
        Ok(d) => (
            Some(DesignValues {
                complete_winters: d.winters.len(),
                mean_of_three_coldest_c_days: d.mean_of_three_coldest_c_days,
                three_coldest_starts: d
                    .three_coldest_starts
                    .iter()
                    .map(|s| s.to_string())
                    .collect(),
                coldest_c_days: d.coldest_c_days,
                mean_c_days: d.mean_c_days,
                warnings: d.warnings.iter().map(|w| w.message.clone()).collect(),
            }),
            None,
            Some(fit_design_winter(
                series,
                &d.winters,
                &d.three_coldest_starts,
                d.mean_of_three_coldest_c_days,
            )),
        ),
        Err(e) => (None, Some(e.kind.to_string()), None),
    };
    Ok(ImportSummary {
        first_date: series.first_date().to_string(),
        last_date: series.last_date().to_string(),
        days: series.len(),
        has_snow: series.has_snow(),
        skipped_lines,
        filled_days,
        header_units: Vec::new(),
        winters: winters
            .iter()
            .map(|w| WinterIndex {
                start: w.start.to_string(),
                end: w.end.to_string(),
                complete: w.complete,
                days_present: w.days_present,
                freezing_index_c_days: w.freezing_index_c_days,
                thawing_index_c_days: w.thawing_index_c_days,
                freezing_season_days: winter_days(series, w)
                    .iter()
                    .filter(|d| d.mean_air_c < 0.0)
                    .count(),
            })
            .collect(),
        design,
        design_note,
        design_winter,
    })
}

/// The days of `series` that fall in winter `w`.
fn winter_days<'a>(series: &'a DailySeries, w: &SeasonIndices) -> &'a [DayRecord] {
    let days = series.days();
    let first = series.first_date();
    let lo = (w.start - first).num_days().max(0) as usize;
    let hi = (((w.end - first).num_days() + 1).max(0) as usize).min(days.len());
    &days[lo.min(hi)..hi]
}

/// Days in a design year, as the core's climates count them.
const DESIGN_YEAR_DAYS: f64 = 365.0;
/// Days at each end of a winter's snow cover whose densities count as fresh and settled.
const DENSITY_WINDOW_DAYS: usize = 14;

/// Index of the day after the highest point of the cumulative degree-day curve that starts
/// the largest fall (where the winter's freezing index starts).
fn freeze_up_index(days: &[DayRecord]) -> usize {
    let (mut cum, mut peak, mut peak_at, mut range, mut start) = (0.0, 0.0, 0usize, 0.0, 0usize);
    for (i, d) in days.iter().enumerate() {
        cum += d.mean_air_c;
        if cum > peak {
            peak = cum;
            peak_at = i + 1;
        }
        if peak - cum > range {
            range = peak - cum;
            start = peak_at;
        }
    }
    start
}

/// One winter's snow cover, days from its freeze-up: first snow, greatest depth, gone; the
/// greatest depth (m); the densities recorded over the first and the last days of cover.
struct WinterSnow {
    start: f64,
    peak: f64,
    end: f64,
    depth_m: f64,
    fresh: Vec<f64>,
    settled: Vec<f64>,
}

fn winter_snow(days: &[DayRecord]) -> Option<WinterSnow> {
    let depth = |d: &DayRecord| d.snow_depth_m.unwrap_or(0.0);
    let first = days.iter().position(|d| depth(d) > 0.0)?;
    let (mut peak, mut depth_m) = (first, depth(&days[first]));
    for (i, d) in days.iter().enumerate().skip(first) {
        if depth(d) > depth_m {
            (peak, depth_m) = (i, depth(d));
        }
    }
    let last_snow = days.iter().rposition(|d| depth(d) > 0.0).unwrap_or(peak);
    let gone = days
        .iter()
        .enumerate()
        .skip(peak)
        .find(|(_, d)| d.snow_depth_m == Some(0.0))
        .map_or(last_snow + 1, |(i, _)| i);
    let densities = |range: std::ops::Range<usize>| -> Vec<f64> {
        days[range]
            .iter()
            .filter(|d| depth(d) > 0.0)
            .filter_map(|d| d.snow_density_kg_m3)
            .collect()
    };
    let f = freeze_up_index(days) as f64;
    Some(WinterSnow {
        start: first as f64 - f,
        peak: peak as f64 - f,
        end: gone as f64 - f,
        depth_m,
        fresh: densities(first..(first + DENSITY_WINDOW_DAYS).min(gone)),
        settled: densities(gone.saturating_sub(DENSITY_WINDOW_DAYS).max(first)..gone),
    })
}

/// The design winter fitted to the complete `winters` of `series` (the module
/// documentation gives the rule); `coldest` are the starts of the three coldest.
fn fit_design_winter(
    series: &DailySeries,
    winters: &[SeasonIndices],
    coldest: &[chrono::NaiveDate; 3],
    freezing_index_c_days: f64,
) -> DesignWinterFit {
    let mean = |v: &[f64]| (!v.is_empty()).then(|| v.iter().sum::<f64>() / v.len() as f64);
    let below = |w: &SeasonIndices| {
        winter_days(series, w)
            .iter()
            .filter(|d| d.mean_air_c < 0.0)
            .count() as f64
    };
    let season: Vec<f64> = winters
        .iter()
        .filter(|w| coldest.contains(&w.start))
        .map(below)
        .collect();
    let all: Vec<f64> = winters
        .iter()
        .flat_map(|w| winter_days(series, w).iter().map(|d| d.mean_air_c))
        .collect();
    let snows: Vec<WinterSnow> = winters
        .iter()
        .filter_map(|w| winter_snow(winter_days(series, w)))
        .collect();
    let snow = (!snows.is_empty()).then(|| {
        let of = |f: &dyn Fn(&WinterSnow) -> f64| {
            mean(&snows.iter().map(f).collect::<Vec<_>>()).unwrap_or(0.0)
        };
        let (start, peak) = (of(&|s| s.start), of(&|s| s.peak));
        let end = of(&|s| s.end).min(start + DESIGN_YEAR_DAYS);
        let day = |d: f64| (d.round()).rem_euclid(DESIGN_YEAR_DAYS);
        let fallback = crate::document::defaults::snow_season("design-winter");
        let (rlo, rhi) = SEASON_SNOW_DENSITY_RANGE_KG_M3;
        let density = |v: Vec<f64>, default: f64| mean(&v).unwrap_or(default).clamp(rlo, rhi);
        let fresh = density(
            snows.iter().flat_map(|s| s.fresh.clone()).collect(),
            fallback.map_or(150.0, |s| s.fresh_density_kg_m3),
        );
        let settled = density(
            snows.iter().flat_map(|s| s.settled.clone()).collect(),
            fallback.map_or(320.0, |s| s.settled_density_kg_m3),
        )
        .max(fresh);
        SnowSeasonDoc {
            start_day: day(start),
            peak_day: day(peak),
            end_day: day(end),
            peak_depth_m: of(&|s| s.depth_m).min(SEASON_SNOW_DEPTH_RANGE_M.1),
            fresh_density_kg_m3: fresh,
            settled_density_kg_m3: settled,
        }
    });
    DesignWinterFit {
        freezing_index_c_days,
        season_days: mean(&season).unwrap_or(0.0),
        mean_annual_c: mean(&all).unwrap_or(0.0),
        snow,
        snow_winters: snows.len(),
    }
}

/// Read CSV text with the chosen units into daily records and their summary.
pub fn import_csv(text: &str, o: &ImportOptions) -> ImportOutcome {
    let mut errors = Vec::new();
    let temperature = TemperatureUnit::from_text(&o.temperature).unwrap_or_else(|| {
        errors.push(ErrorDoc::plain(
            "import.temperature",
            format!("'{}' is not a temperature unit (°C or °F)", o.temperature),
        ));
        TemperatureUnit::default()
    });
    let snow_depth = match &o.snow_depth {
        None => DepthUnit::default(),
        Some(u) => DepthUnit::from_text(u).unwrap_or_else(|| {
            errors.push(ErrorDoc::plain(
                "import.snow_depth",
                format!("'{u}' is not a depth unit (m, cm, mm, in or ft)"),
            ));
            DepthUnit::default()
        }),
    };
    let snow_density = match &o.snow_density {
        None => DensityUnit::default(),
        Some(u) => DensityUnit::from_text(u).unwrap_or_else(|| {
            errors.push(ErrorDoc::plain(
                "import.snow_density",
                format!("'{u}' is not a density unit (kg/m³ or lb/ft³)"),
            ));
            DensityUnit::default()
        }),
    };
    let month = o.season_start_month.unwrap_or(7);
    if !(1..=12).contains(&month) {
        errors.push(ErrorDoc::plain(
            "import.season_start_month",
            format!("{month} is not a month (1–12)"),
        ));
    }
    if !errors.is_empty() {
        return failed(errors, Vec::new(), 0);
    }
    let options = CsvOptions {
        temperature,
        snow_depth,
        snow_density,
        bad_lines: if o.skip_bad_lines {
            BadLines::Skip
        } else {
            BadLines::Refuse
        },
        max_gap_fill_days: o.fill_gaps_days,
    };
    let imported = match read_daily_csv(text, &options) {
        Ok(i) => i,
        Err(e) => {
            return failed(
                Vec::new(),
                e.problems.iter().map(LineDoc::from).collect(),
                e.more,
            )
        }
    };
    let summary = match summarise(
        &imported.series,
        month,
        imported.skipped_lines,
        imported.filled_days,
    ) {
        Ok(mut s) => {
            s.header_units = imported
                .header_units
                .iter()
                .map(UnitFromHeader::from)
                .collect();
            s
        }
        Err(e) => return failed(vec![e], Vec::new(), 0),
    };
    ImportOutcome {
        ok: true,
        problems: imported.skipped.iter().map(LineDoc::from).collect(),
        more_problems: imported
            .skipped_lines
            .saturating_sub(imported.skipped.len()),
        errors: Vec::new(),
        summary: Some(summary),
        days: imported
            .series
            .days()
            .iter()
            .map(|d| DayDoc {
                date: d.date.to_string(),
                mean_air_c: d.mean_air_c,
                snow_depth_m: d.snow_depth_m,
                snow_density_kg_m3: d.snow_density_kg_m3,
            })
            .collect(),
    }
}

/// Summarise the daily records already in a scenario (after a file is opened, say).
pub fn summarise_days(
    days: &[DayDoc],
    season_start_month: u32,
) -> Result<ImportSummary, Vec<ErrorDoc>> {
    let mut records = Vec::with_capacity(days.len());
    let mut errors = Vec::new();
    for (i, d) in days.iter().enumerate() {
        match chrono::NaiveDate::parse_from_str(&d.date, "%Y-%m-%d") {
            Ok(date) => records.push(crate::physics::climate::DayRecord {
                date,
                mean_air_c: d.mean_air_c,
                snow_depth_m: d.snow_depth_m,
                snow_density_kg_m3: d.snow_density_kg_m3,
            }),
            Err(_) => errors.push(ErrorDoc::plain(
                format!("winter.climate.days[{i}].date"),
                format!(
                    "'{}' is not a date written YYYY-MM-DD",
                    d.date.chars().take(40).collect::<String>()
                ),
            )),
        }
        if errors.len() >= 20 {
            break;
        }
    }
    if !errors.is_empty() {
        return Err(errors);
    }
    let series = DailySeries::new(records).map_err(|e| {
        e.0.iter()
            .map(|x| {
                let mut d = ErrorDoc::from(x);
                d.field = format!("winter.climate.{}", d.field);
                d
            })
            .collect::<Vec<_>>()
    })?;
    summarise(&series, season_start_month, 0, 0).map_err(|e| vec![e])
}
