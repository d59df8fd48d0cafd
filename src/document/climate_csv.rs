//! Daily climate records from CSV text (an edge: the core sees only a validated
//! [`DailySeries`] in SI).
//!
//! # The format
//!
//! Comma-separated text, one day a line. Lines starting with `#` are comments; empty lines
//! are ignored; spaces around cells are ignored; cells may be quoted (a cell cannot span
//! lines).
//!
//! The first line that is neither names the columns, in any order:
//!
//! | column | required | names accepted (case, spaces, `_` and `-` do not matter) |
//! |---|---|---|
//! | date, written `YYYY-MM-DD` | yes | `date`, `day` |
//! | mean air temperature of the day | yes | `mean air temperature`, `mean air temp`, `mean air`, `average air temperature`, `avg air temp` (and the other pairings of mean / average / avg with temperature / temp), `air temperature`, `air temp`, `daily mean temperature`, `tmean`, `t_mean`, `tavg`, `temperature`, `temp` |
//! | snow depth on the ground | no | `snow depth`, `depth of snow`, `snow on ground`, `snwd`, `snow` |
//! | bulk density of that snow | no | `snow density`, `density of snow`, `density` |
//!
//! A column's unit may be named in its header: in brackets or parentheses,
//! `mean air temperature (°F)`, `snow depth [in]`, or as the last word after `_` or a space,
//! `snow_depth_cm`, `tmean degF`, `snow_density_kg_m3` (`kg_m3` and `lb_ft3` read as kg/m³
//! and lb/ft³). Units: °C, C, degC, °F, F, degF; m, cm, mm, in, ft; kg/m³, kg/m3, lb/ft³,
//! lb/ft3. A unit named in the header is the one the column is read in, whatever
//! [`CsvOptions`] chose ([`CsvImport::header_units`] lists them, with the unit chosen, so a
//! caller can say which it overrode); the units of [`CsvOptions`] (°C or °F; m, cm, mm, in
//! or ft; kg/m³ or lb/ft³) apply to the columns whose header names none. A unit the column
//! cannot take (`snow depth (°F)`) is refused, naming the column.
//!
//! Dates must follow one another by exactly one day. A blank snow cell means "not
//! observed". A snow density needs a snow depth on the same line.
//!
//! # Errors
//!
//! Every problem names its line (counted from 1, as a text editor shows it) and column:
//! `line 17, mean air temperature: 'abc' is not a number`. All bad lines are listed (up to
//! [`MAX_REPORTED_PROBLEMS`], then how many more), and nothing is imported if any line is
//! bad, unless [`BadLines::Skip`] is chosen: bad lines are then left out and counted. Gaps
//! in the dates (including those left by skipped lines) are refused unless no longer than
//! [`CsvOptions::max_gap_fill_days`], which are then filled by linear interpolation between
//! the neighbouring days and counted.
//!
//! Unit conversions come from [`crate::physics::units`] (NIST SP 811).
//!
//! # Reading
//!
//! [`read_daily_csv`] splits each line on its own (the csv crate's reader is used only for
//! a line with quotes), so the line numbers stay true after comments and empty lines.

use crate::physics::climate::{
    date_step_problem, day_value_problems, DailySeries, DayField, DayRecord, MAX_SERIES_DAYS,
};
use crate::physics::error::InputErrorKind;
use crate::physics::units::{
    CM_PER_M, DEG_F_AT_0_C, DEG_F_PER_K, FT_PER_M, IN_PER_M, LB_FT3_PER_KG_M3, MM_PER_M,
};
use chrono::NaiveDate;
use std::fmt;

/// Largest input accepted, bytes (200 years of days with every column fits in a quarter of
/// it).
pub const MAX_CSV_BYTES: usize = 16 * 1024 * 1024;
/// Most problems listed; the rest are counted.
pub const MAX_REPORTED_PROBLEMS: usize = 50;
/// Longest gap that may be filled, days.
pub const MAX_GAP_FILL_DAYS: u32 = 31;
/// Longest cell quoted back in a message, characters.
const MAX_QUOTED_CHARS: usize = 40;

/// Unit of the temperature column.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum TemperatureUnit {
    #[default]
    Celsius,
    Fahrenheit,
}

impl TemperatureUnit {
    pub fn symbol(self) -> &'static str {
        match self {
            TemperatureUnit::Celsius => "°C",
            TemperatureUnit::Fahrenheit => "°F",
        }
    }
    /// Value as written → °C.
    pub fn to_si(self, x: f64) -> f64 {
        match self {
            TemperatureUnit::Celsius => x,
            TemperatureUnit::Fahrenheit => (x - DEG_F_AT_0_C) / DEG_F_PER_K,
        }
    }
    /// Unit written in a header or on a command line.
    pub fn from_text(s: &str) -> Option<Self> {
        match unit_key(s).as_str() {
            "c" | "celsius" => Some(TemperatureUnit::Celsius),
            "f" | "fahrenheit" => Some(TemperatureUnit::Fahrenheit),
            _ => None,
        }
    }
}

/// Unit of the snow depth column.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum DepthUnit {
    #[default]
    Metre,
    Centimetre,
    Millimetre,
    Inch,
    Foot,
}

impl DepthUnit {
    pub fn symbol(self) -> &'static str {
        match self {
            DepthUnit::Metre => "m",
            DepthUnit::Centimetre => "cm",
            DepthUnit::Millimetre => "mm",
            DepthUnit::Inch => "in",
            DepthUnit::Foot => "ft",
        }
    }
    /// Value as written → m.
    pub fn to_si(self, x: f64) -> f64 {
        match self {
            DepthUnit::Metre => x,
            DepthUnit::Centimetre => x / CM_PER_M,
            DepthUnit::Millimetre => x / MM_PER_M,
            DepthUnit::Inch => x / IN_PER_M,
            DepthUnit::Foot => x / FT_PER_M,
        }
    }
    pub fn from_text(s: &str) -> Option<Self> {
        match unit_key(s).as_str() {
            "m" | "metre" | "metres" | "meter" | "meters" => Some(DepthUnit::Metre),
            "cm" | "centimetre" | "centimetres" | "centimeter" | "centimeters" => {
                Some(DepthUnit::Centimetre)
            }
            "mm" | "millimetre" | "millimetres" | "millimeter" | "millimeters" => {
                Some(DepthUnit::Millimetre)
            }
            "in" | "inch" | "inches" | "\"" => Some(DepthUnit::Inch),
            "ft" | "foot" | "feet" | "'" => Some(DepthUnit::Foot),
            _ => None,
        }
    }
}

/// Unit of the snow density column.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum DensityUnit {
    #[default]
    KgPerM3,
    LbPerFt3,
}

impl DensityUnit {
    pub fn symbol(self) -> &'static str {
        match self {
            DensityUnit::KgPerM3 => "kg/m³",
            DensityUnit::LbPerFt3 => "lb/ft³",
        }
    }
    /// Value as written → kg/m³.
    pub fn to_si(self, x: f64) -> f64 {
        match self {
            DensityUnit::KgPerM3 => x,
            DensityUnit::LbPerFt3 => x / LB_FT3_PER_KG_M3,
        }
    }
    pub fn from_text(s: &str) -> Option<Self> {
        match unit_key(s).as_str() {
            "kg/m3" | "kg/m³" | "kgm-3" | "kg/cubicmetre" | "kg/cubicmeter" => {
                Some(DensityUnit::KgPerM3)
            }
            "lb/ft3" | "lb/ft³" | "lbft-3" | "lb/cuft" | "pcf" | "lb/cubicfoot" => {
                Some(DensityUnit::LbPerFt3)
            }
            _ => None,
        }
    }
}

/// Lower case, no spaces, no degree sign.
fn unit_key(s: &str) -> String {
    s.chars()
        .filter(|c| !c.is_whitespace() && *c != '°' && *c != 'º')
        .collect::<String>()
        .to_lowercase()
        .trim_start_matches("deg")
        .to_string()
}

/// What to do with a bad line.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum BadLines {
    /// Import nothing; list every problem.
    #[default]
    Refuse,
    /// Leave bad lines out and count them.
    Skip,
}

/// How to read the file.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct CsvOptions {
    pub temperature: TemperatureUnit,
    pub snow_depth: DepthUnit,
    pub snow_density: DensityUnit,
    pub bad_lines: BadLines,
    /// Gaps of up to this many missing days are filled by linear interpolation between the
    /// neighbouring days (0, the default, refuses every gap; at most [`MAX_GAP_FILL_DAYS`]).
    pub max_gap_fill_days: u32,
}

/// One problem, tied to where it is in the file.
#[derive(Debug, Clone, PartialEq)]
pub struct LineProblem {
    /// Line number, from 1; `None` for the file as a whole.
    pub line: Option<usize>,
    /// Column in plain words (`mean air temperature`), or `None` for the whole line.
    pub column: Option<String>,
    pub kind: InputErrorKind,
    /// The cell as written with the unit chosen, where that differs from the SI value in
    /// `kind` (for example `-300 °F`).
    pub written: Option<String>,
}

impl LineProblem {
    fn new(line: Option<usize>, column: Option<&str>, kind: InputErrorKind) -> Self {
        Self {
            line,
            column: column.map(str::to_string),
            kind,
            written: None,
        }
    }
}

impl fmt::Display for LineProblem {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match (self.line, &self.column) {
            (Some(l), Some(c)) => write!(f, "line {l}, {c}: ")?,
            (Some(l), None) => write!(f, "line {l}: ")?,
            (None, Some(c)) => write!(f, "{c}: ")?,
            (None, None) => write!(f, "file: ")?,
        }
        write!(f, "{}", self.kind)?;
        if let Some(w) = &self.written {
            write!(f, " (written {w})")?;
        }
        Ok(())
    }
}

/// Why nothing was imported.
#[derive(Debug, Clone, PartialEq)]
pub struct CsvError {
    /// The first [`MAX_REPORTED_PROBLEMS`] problems, in file order.
    pub problems: Vec<LineProblem>,
    /// How many more there were.
    pub more: usize,
}

impl fmt::Display for CsvError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        for (i, p) in self.problems.iter().enumerate() {
            if i > 0 {
                writeln!(f)?;
            }
            write!(f, "{p}")?;
        }
        if self.more > 0 {
            write!(
                f,
                "\n… and {} more {}",
                self.more,
                if self.more == 1 {
                    "problem"
                } else {
                    "problems"
                }
            )?;
        }
        Ok(())
    }
}

impl std::error::Error for CsvError {}

/// A successful import.
#[derive(Debug, Clone, PartialEq)]
pub struct CsvImport {
    pub series: DailySeries,
    /// Bad lines left out ([`BadLines::Skip`]).
    pub skipped_lines: usize,
    /// Why (the first [`MAX_REPORTED_PROBLEMS`] problems of the skipped lines).
    pub skipped: Vec<LineProblem>,
    /// Days filled in by interpolation ([`CsvOptions::max_gap_fill_days`]).
    pub filled_days: usize,
    /// The units the header named, column by column (the data were read in them).
    pub header_units: Vec<HeaderUnit>,
}

/// A capped list of problems.
#[derive(Default)]
struct Problems {
    list: Vec<LineProblem>,
    more: usize,
}

impl Problems {
    fn push(&mut self, p: LineProblem) {
        if self.list.len() < MAX_REPORTED_PROBLEMS {
            self.list.push(p);
        } else {
            self.more += 1;
        }
    }
    fn is_empty(&self) -> bool {
        self.list.is_empty() && self.more == 0
    }
    fn into_error(self) -> CsvError {
        CsvError {
            problems: self.list,
            more: self.more,
        }
    }
}

fn fail(line: Option<usize>, column: Option<&str>, kind: InputErrorKind) -> CsvError {
    CsvError {
        problems: vec![LineProblem::new(line, column, kind)],
        more: 0,
    }
}

/// Column names: lower case, `_` and `-` as spaces, single spaces.
fn name_key(s: &str) -> String {
    s.to_lowercase()
        .replace(['_', '-'], " ")
        .split_whitespace()
        .collect::<Vec<_>>()
        .join(" ")
}

/// The name of a column, as a [`name_key`], → its field.
fn field_of_name(key: &str) -> Option<DayField> {
    Some(match key {
        "date" | "day" => DayField::Date,
        "mean air temperature"
        | "mean air temp"
        | "mean air"
        | "average air temperature"
        | "average air temp"
        | "avg air temperature"
        | "avg air temp"
        | "air temperature"
        | "air temp"
        | "mean temperature"
        | "mean temp"
        | "average temperature"
        | "average temp"
        | "avg temperature"
        | "avg temp"
        | "daily mean temperature"
        | "tmean"
        | "t mean"
        | "tavg"
        | "t avg"
        | "temperature"
        | "temp" => DayField::MeanAir,
        "snow depth" | "depth of snow" | "snow on ground" | "snwd" | "snow" => DayField::SnowDepth,
        "snow density" | "density of snow" | "density" => DayField::SnowDensity,
        _ => return None,
    })
}

/// Whether `s` names a unit of any column (what a name may end with after `_` or a space).
fn is_unit_word(s: &str) -> bool {
    TemperatureUnit::from_text(s).is_some()
        || DepthUnit::from_text(s).is_some()
        || DensityUnit::from_text(s).is_some()
}

/// Which column a header cell names, and the unit it states: in brackets or parentheses
/// (`snow depth (cm)`, `air temp [°F]`), or as the last word after `_` or a space
/// (`snow_depth_cm`, `tmean degF`, `snow_density_kg_m3`).
fn column_of(cell: &str) -> Option<(DayField, Option<String>)> {
    let cell = cell.trim();
    if let Some(i) = cell.find(['(', '[']) {
        let rest = cell[i + 1..].trim_end();
        let rest = rest
            .strip_suffix(')')
            .or_else(|| rest.strip_suffix(']'))
            .unwrap_or(rest);
        let field = field_of_name(&name_key(&cell[..i]))?;
        return Some((field, Some(rest.trim().to_string())));
    }
    let key = name_key(cell);
    if let Some(field) = field_of_name(&key) {
        return Some((field, None));
    }
    // A unit as the last word, or the last two (`kg m3`, `lb ft3`, `deg c`).
    let words: Vec<&str> = key.split(' ').collect();
    for n in [2, 1] {
        if words.len() <= n {
            continue;
        }
        let (name, unit) = words.split_at(words.len() - n);
        let unit = unit.join("/");
        let unit = if n == 2 && unit.starts_with("deg/") {
            unit.replace('/', "")
        } else {
            unit
        };
        if !is_unit_word(&unit) {
            continue;
        }
        if let Some(field) = field_of_name(&name.join(" ")) {
            return Some((field, Some(unit)));
        }
    }
    None
}

/// Quote a cell for a message, shortened.
fn quoted(cell: &str) -> String {
    let mut s: String = cell.chars().take(MAX_QUOTED_CHARS).collect();
    if cell.chars().count() > MAX_QUOTED_CHARS {
        s.push('…');
    }
    format!("'{s}'")
}

fn parse_number(cell: &str) -> Result<f64, InputErrorKind> {
    match cell.parse::<f64>() {
        Ok(v) if v.is_finite() => Ok(v),
        _ => Err(InputErrorKind::Format(format!(
            "{} is not a number",
            quoted(cell)
        ))),
    }
}

fn parse_date(cell: &str) -> Result<NaiveDate, InputErrorKind> {
    let b = cell.as_bytes();
    let shaped = b.len() == 10
        && b[4] == b'-'
        && b[7] == b'-'
        && b.iter()
            .enumerate()
            .all(|(i, c)| i == 4 || i == 7 || c.is_ascii_digit());
    if !shaped {
        return Err(InputErrorKind::Format(format!(
            "{} is not a date written YYYY-MM-DD",
            quoted(cell)
        )));
    }
    NaiveDate::parse_from_str(cell, "%Y-%m-%d").map_err(|_| {
        InputErrorKind::Format(format!("{} is not a day of the calendar", quoted(cell)))
    })
}

/// One parsed data line.
struct Parsed {
    line: usize,
    day: DayRecord,
}

/// Read a daily series from CSV text (see the module documentation for the format).
pub fn read_daily_csv(text: &str, options: &CsvOptions) -> Result<CsvImport, CsvError> {
    if text.len() > MAX_CSV_BYTES {
        return Err(fail(
            None,
            None,
            InputErrorKind::Format(format!(
                "the file is {} bytes; at most {MAX_CSV_BYTES} are read",
                text.len()
            )),
        ));
    }
    if options.max_gap_fill_days > MAX_GAP_FILL_DAYS {
        return Err(fail(
            None,
            Some("longest gap to fill"),
            InputErrorKind::OutOfBounds {
                value: f64::from(options.max_gap_fill_days),
                min: 0.0,
                max: f64::from(MAX_GAP_FILL_DAYS),
                unit: "days",
            },
        ));
    }
    let mut problems = Problems::default();
    let mut records = lines(text);

    // The header: the first line that is neither empty nor a comment.
    let (header_line, header) = match records.next() {
        None => {
            return Err(fail(
                None,
                None,
                InputErrorKind::Format(
                    "no header line: the first line must name the columns (date, mean air temperature, ...)"
                        .to_string(),
                ),
            ))
        }
        Some((line, Err(e))) => return Err(fail(Some(line), None, InputErrorKind::Format(e))),
        Some((line, Ok(r))) => (line, r),
    };
    let mut columns: Vec<DayField> = Vec::with_capacity(header.len());
    // The units the data are read in: the header's where it names them, else the chosen.
    let mut read_as = *options;
    let mut header_units = Vec::new();
    for (i, cell) in header.iter().enumerate() {
        let at = Some(header_line);
        match column_of(cell) {
            None => problems.push(LineProblem::new(
                at,
                Some(&format!("column {}", i + 1)),
                InputErrorKind::Format(format!(
                    "{} is not a column this reader knows: name them date, mean air temperature, snow depth, snow density (a unit may follow in brackets)",
                    quoted(cell)
                )),
            )),
            Some((field, unit)) => {
                if columns.contains(&field) {
                    problems.push(LineProblem::new(
                        at,
                        Some(field.name()),
                        InputErrorKind::Format(format!(
                            "named twice (again in column {})",
                            i + 1
                        )),
                    ));
                }
                if let Some(u) = unit {
                    match take_header_unit(field, &u, options, &mut read_as) {
                        Ok(h) if field != DayField::Date => header_units.push(h),
                        Ok(_) => {}
                        Err(kind) => problems.push(LineProblem::new(at, Some(field.name()), kind)),
                    }
                }
                columns.push(field);
            }
        }
    }
    for needed in [DayField::Date, DayField::MeanAir] {
        if problems.is_empty() && !columns.contains(&needed) {
            problems.push(LineProblem::new(
                Some(header_line),
                Some(needed.name()),
                InputErrorKind::Format("this column is required and missing".to_string()),
            ));
        }
    }
    if !problems.is_empty() {
        return Err(problems.into_error());
    }

    let options = &read_as;
    let skip = options.bad_lines == BadLines::Skip;
    let mut skipped = Problems::default();
    let mut skipped_lines = 0usize;
    let mut kept: Vec<Parsed> = Vec::new();
    let mut filled_days = 0usize;
    // Date of the last line that followed in order (refuse mode) or was kept (skip mode).
    let mut previous: Option<NaiveDate> = None;
    // Lines since `previous` whose date could not be read.
    let mut unread_dates = 0u64;

    for (line, result) in records {
        let record = match result {
            Ok(r) => r,
            Err(e) => {
                problems.push(LineProblem::new(
                    Some(line),
                    None,
                    InputErrorKind::Format(e),
                ));
                continue;
            }
        };
        let (date, day, mut line_problems) = parse_line(line, &record, &columns, options);

        // Sequence, against the previous good date. When refusing, lines whose date could
        // not be read since then may account for a gap: it is not reported twice.
        let mut gap_fatal = None;
        if let (Some(date), Some(prev)) = (date, previous) {
            if line_problems.is_empty() || !skip {
                let excused = if skip { 0 } else { unread_dates };
                match date_step_problem(prev, date) {
                    None => {}
                    Some(InputErrorKind::DateGap { missing, .. })
                        if missing <= u64::from(options.max_gap_fill_days) + excused => {}
                    Some(kind @ InputErrorKind::DateGap { .. }) => {
                        gap_fatal = Some(LineProblem::new(Some(line), Some("date"), kind));
                    }
                    Some(kind) => {
                        line_problems.push(LineProblem::new(Some(line), Some("date"), kind))
                    }
                }
            }
        }
        let in_order = date.is_some_and(|d| previous.map_or(true, |p| d > p));
        if date.is_some() {
            unread_dates = 0;
        } else {
            unread_dates += 1;
        }

        if let Some(p) = gap_fatal {
            // A gap is not a fault of this line: skipping cannot mend it.
            problems.push(p);
        }
        if line_problems.is_empty() {
            let day = day.expect("a line without problems has a day");
            if let (Some(prev), true) = (kept.last(), problems.is_empty()) {
                let prev = prev.day;
                filled_days += fill_gap(&prev, &day, options.max_gap_fill_days, &mut kept, line);
            }
            previous = Some(day.date);
            kept.push(Parsed { line, day });
            if kept.len() > MAX_SERIES_DAYS {
                problems.push(LineProblem::new(
                    Some(line),
                    None,
                    InputErrorKind::Format(format!(
                        "more than {MAX_SERIES_DAYS} days (200 years): split the record"
                    )),
                ));
                return Err(problems.into_error());
            }
        } else if skip {
            skipped_lines += 1;
            for p in line_problems {
                skipped.push(p);
            }
        } else {
            if in_order {
                previous = date;
            }
            for p in line_problems {
                problems.push(p);
            }
        }
    }

    if !problems.is_empty() {
        return Err(problems.into_error());
    }
    if kept.is_empty() {
        return Err(fail(
            None,
            None,
            InputErrorKind::Format(if skipped_lines > 0 {
                format!("no good lines: all {skipped_lines} were skipped")
            } else {
                "no days: the file has a header and nothing else".to_string()
            }),
        ));
    }
    let lines: Vec<usize> = kept.iter().map(|p| p.line).collect();
    let series = DailySeries::new(kept.into_iter().map(|p| p.day).collect()).map_err(|errs| {
        // Not expected: every check was made line by line. Name the lines anyway.
        let mut out = Problems::default();
        for e in errs.0 {
            let line = e
                .field
                .strip_prefix("days[")
                .and_then(|r| r.split(']').next())
                .and_then(|i| i.parse::<usize>().ok())
                .and_then(|i| lines.get(i).copied());
            out.push(LineProblem::new(line, None, e.kind));
        }
        out.into_error()
    })?;
    Ok(CsvImport {
        series,
        skipped_lines,
        skipped: skipped.list,
        filled_days,
        header_units,
    })
}

/// The lines that carry data, numbered from 1 as a text editor shows them, cut into cells.
/// Each line is read on its own, so line numbers stay true whatever comments and empty
/// lines come before (and a cell cannot span lines: a daily record has no need to).
fn lines(text: &str) -> impl Iterator<Item = (usize, Result<csv::StringRecord, String>)> + '_ {
    text.split('\n').enumerate().filter_map(|(i, raw)| {
        let line = raw.strip_suffix('\r').unwrap_or(raw);
        let trimmed = line.trim();
        if trimmed.is_empty() || trimmed.starts_with('#') {
            return None;
        }
        let cells = if line.contains('"') {
            // Quoted cells: the csv crate's reader.
            let mut reader = csv::ReaderBuilder::new()
                .has_headers(false)
                .flexible(true)
                .trim(csv::Trim::All)
                .buffer_capacity(line.len().max(64))
                .from_reader(line.as_bytes());
            match reader.records().next() {
                Some(Ok(r)) => Ok(r),
                Some(Err(e)) => Err(format!("cannot be read as comma-separated cells ({e})")),
                None => return None,
            }
        } else {
            // Without quotes a line's cells are what lies between its commas.
            Ok(line
                .split(',')
                .map(str::trim)
                .collect::<csv::StringRecord>())
        };
        match cells {
            Ok(r) if r.iter().all(str::is_empty) => None,
            other => Some((i + 1, other)),
        }
    })
}

/// A unit read from the header, where it names one.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct HeaderUnit {
    pub column: DayField,
    /// The unit's symbol as this reader writes it (`cm`, `°F`, `kg/m³`).
    pub unit: &'static str,
    /// The unit chosen in the options, which the header's overrode when they differ.
    pub chosen: &'static str,
}

impl HeaderUnit {
    /// Whether the header said another unit than the one chosen.
    pub fn overrides(&self) -> bool {
        self.unit != self.chosen
    }
}

/// Take the unit a header names for `field` into `o` (the header wins over the chosen
/// unit); a unit the column cannot take is a problem.
fn take_header_unit(
    field: DayField,
    unit: &str,
    chosen: &CsvOptions,
    o: &mut CsvOptions,
) -> Result<HeaderUnit, InputErrorKind> {
    let refused = |accepted: &str| {
        InputErrorKind::Format(format!(
            "{} is not a unit this column takes ({accepted})",
            quoted(unit)
        ))
    };
    let (unit, chosen) = match field {
        DayField::Date => {
            if unit_key(unit) == "yyyy-mm-dd" {
                return Ok(HeaderUnit {
                    column: field,
                    unit: "YYYY-MM-DD",
                    chosen: "YYYY-MM-DD",
                });
            }
            return Err(InputErrorKind::Format(format!(
                "a date has no unit (got {})",
                quoted(unit)
            )));
        }
        DayField::MeanAir => {
            let u = TemperatureUnit::from_text(unit).ok_or_else(|| refused("°C or °F"))?;
            o.temperature = u;
            (u.symbol(), chosen.temperature.symbol())
        }
        DayField::SnowDepth => {
            let u = DepthUnit::from_text(unit).ok_or_else(|| refused("m, cm, mm, in or ft"))?;
            o.snow_depth = u;
            (u.symbol(), chosen.snow_depth.symbol())
        }
        DayField::SnowDensity => {
            let u = DensityUnit::from_text(unit).ok_or_else(|| refused("kg/m³ or lb/ft³"))?;
            o.snow_density = u;
            (u.symbol(), chosen.snow_density.symbol())
        }
    };
    Ok(HeaderUnit {
        column: field,
        unit,
        chosen,
    })
}

/// Parse one data line: its date if that could be read, the day if every cell could, and
/// the problems.
fn parse_line(
    line: usize,
    record: &csv::StringRecord,
    columns: &[DayField],
    o: &CsvOptions,
) -> (Option<NaiveDate>, Option<DayRecord>, Vec<LineProblem>) {
    let mut problems = Vec::new();
    let at = Some(line);
    // Extra cells must be empty; missing cells are blank.
    if record.iter().skip(columns.len()).any(|c| !c.is_empty()) {
        problems.push(LineProblem::new(
            at,
            None,
            InputErrorKind::Format(format!(
                "{} cells, but the header names {} columns",
                record.len(),
                columns.len()
            )),
        ));
        return (None, None, problems);
    }
    let cell = |f: DayField| -> &str {
        columns
            .iter()
            .position(|&c| c == f)
            .and_then(|i| record.get(i))
            .unwrap_or("")
    };
    let required = |f: DayField, problems: &mut Vec<LineProblem>| -> Option<String> {
        let c = cell(f);
        if c.is_empty() {
            problems.push(LineProblem::new(
                at,
                Some(f.name()),
                InputErrorKind::Format("missing: this column is required".to_string()),
            ));
            None
        } else {
            Some(c.to_string())
        }
    };
    let date = required(DayField::Date, &mut problems).and_then(|c| {
        parse_date(&c)
            .map_err(|k| problems.push(LineProblem::new(at, Some("date"), k)))
            .ok()
    });
    let temp = required(DayField::MeanAir, &mut problems);
    let mut number = |f: DayField, text: &str, to_si: &dyn Fn(f64) -> f64, unit: &str| {
        match parse_number(text) {
            Ok(v) => Some((to_si(v), format!("{text} {unit}"))),
            Err(k) => {
                problems.push(LineProblem::new(at, Some(f.name()), k));
                None
            }
        }
    };
    let temp = temp.and_then(|t| {
        number(
            DayField::MeanAir,
            &t,
            &|x| o.temperature.to_si(x),
            o.temperature.symbol(),
        )
    });
    let opt = |f: DayField| Some(cell(f)).filter(|c| !c.is_empty()).map(str::to_string);
    let depth_text = opt(DayField::SnowDepth);
    let density_text = opt(DayField::SnowDensity);
    let depth = depth_text.as_deref().map(|t| {
        number(
            DayField::SnowDepth,
            t,
            &|x| o.snow_depth.to_si(x),
            o.snow_depth.symbol(),
        )
    });
    let density = density_text.as_deref().map(|t| {
        number(
            DayField::SnowDensity,
            t,
            &|x| o.snow_density.to_si(x),
            o.snow_density.symbol(),
        )
    });
    if !problems.is_empty() {
        return (date, None, problems);
    }
    let (Some(date), Some((mean_air_c, temp_written))) = (date, temp) else {
        return (date, None, problems);
    };
    let depth = depth.flatten();
    let density = density.flatten();
    let day = DayRecord {
        date,
        mean_air_c,
        snow_depth_m: depth.as_ref().map(|d| d.0),
        snow_density_kg_m3: density.as_ref().map(|d| d.0),
    };
    let written = |f: DayField| -> Option<String> {
        let (w, si_unit) = match f {
            DayField::MeanAir => (
                Some(&temp_written),
                o.temperature == TemperatureUnit::Celsius,
            ),
            DayField::SnowDepth => (
                depth.as_ref().map(|d| &d.1),
                o.snow_depth == DepthUnit::Metre,
            ),
            DayField::SnowDensity => (
                density.as_ref().map(|d| &d.1),
                o.snow_density == DensityUnit::KgPerM3,
            ),
            DayField::Date => (None, true),
        };
        w.filter(|_| !si_unit).cloned()
    };
    for (f, kind) in day_value_problems(&day) {
        let mut p = LineProblem::new(at, Some(f.name()), kind);
        if matches!(p.kind, InputErrorKind::OutOfBounds { .. }) {
            p.written = written(f);
        }
        problems.push(p);
    }
    (Some(day.date), Some(day), problems)
}

/// Fill the days between `prev` and `next` by linear interpolation (temperature; snow depth
/// and density where both neighbours give them) if no more than `max_days` are missing.
/// Returns how many were added.
fn fill_gap(
    prev: &DayRecord,
    next: &DayRecord,
    max_days: u32,
    kept: &mut Vec<Parsed>,
    line: usize,
) -> usize {
    let step = (next.date - prev.date).num_days();
    if step <= 1 || step - 1 > i64::from(max_days) {
        return 0;
    }
    let lerp = |a: f64, b: f64, f: f64| a + (b - a) * f;
    let both = |a: Option<f64>, b: Option<f64>, f: f64| match (a, b) {
        (Some(a), Some(b)) => Some(lerp(a, b, f)),
        _ => None,
    };
    let mut added = 0;
    for k in 1..step {
        let f = k as f64 / step as f64;
        let Some(date) = prev.date.checked_add_days(chrono::Days::new(k as u64)) else {
            break;
        };
        let depth = both(prev.snow_depth_m, next.snow_depth_m, f);
        kept.push(Parsed {
            line,
            day: DayRecord {
                date,
                mean_air_c: lerp(prev.mean_air_c, next.mean_air_c, f),
                snow_depth_m: depth,
                snow_density_kg_m3: depth.and(both(
                    prev.snow_density_kg_m3,
                    next.snow_density_kg_m3,
                    f,
                )),
            },
        });
        added += 1;
    }
    added
}
