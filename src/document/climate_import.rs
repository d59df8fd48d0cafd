//! Bringing a daily climate record into a scenario (edge, serde): CSV text read with the
//! units the user chose becomes the scenario's daily records, with what a builder wants to
//! see before running it: the span, the freezing index of each winter, and the design values
//! of a multi-year record (mean of the three coldest winters, the coldest).
//!
//! [`import_csv`] (units named as the CSV reader accepts them, [`ImportOptions`]) gives the
//! scenario's daily records in SI, every problem with its line, and a summary: the span,
//! each winter's freezing and thawing index, and the design values or why there are none.
//! [`summarise_days`] does the same for records already in a scenario. The page calls both
//! through the wasm face.

use crate::document::climate_csv::{
    read_daily_csv, BadLines, CsvOptions, DensityUnit, DepthUnit, LineProblem, TemperatureUnit,
};
use crate::document::vocabulary::ErrorDoc;
use crate::document::weather::DayDoc;
use crate::physics::climate::{design_freezing_index, DailySeries, DesignOptions};
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
    pub winters: Vec<WinterIndex>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub design: Option<DesignValues>,
    /// Why there are no design values (too few complete winters), if so.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub design_note: Option<String>,
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
    let (design, design_note) = match design_freezing_index(series, &options) {
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
        ),
        Err(e) => (None, Some(e.kind.to_string())),
    };
    Ok(ImportSummary {
        first_date: series.first_date().to_string(),
        last_date: series.last_date().to_string(),
        days: series.len(),
        has_snow: series.has_snow(),
        skipped_lines,
        filled_days,
        winters: winters
            .iter()
            .map(|w| WinterIndex {
                start: w.start.to_string(),
                end: w.end.to_string(),
                complete: w.complete,
                days_present: w.days_present,
                freezing_index_c_days: w.freezing_index_c_days,
                thawing_index_c_days: w.thawing_index_c_days,
            })
            .collect(),
        design,
        design_note,
    })
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
                format!("'{u}' is not a depth unit (m, cm, in or ft)"),
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
        Ok(s) => s,
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
