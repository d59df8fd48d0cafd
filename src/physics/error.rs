//! Typed errors and warnings. Every one names the input field at fault, as a path into the
//! scenario document (for example `layers[2].thickness_m`), so the page can show the message
//! beside that field and the CLI can print it.
//!
//! - [`InputError`] is one `{ field, kind }`; [`InputErrors`] all the errors of one pass of
//!   checks (every validator collects them all, never stopping at the first); [`Warning`] a
//!   model used outside the range its source covers, which does not stop the run.
//! - Each [`InputErrorKind`] has a stable [`InputErrorKind::id`] and its
//!   [`InputErrorKind::numbers`] (the offending value and the limits, SI), which the
//!   reports carry so a face can word a refusal in the units it shows.
//! - Outside a model's range: warn, don't fail. Outside what is physical (snow denser than
//!   ice, water beyond saturation, zero thickness): an error naming the field.
//! - A section that reuses another's checks moves their paths under its own name (the
//!   edge's far-field column is checked as a winter, its paths moved from `winter.` to
//!   `edge.`), so a path always names a field of the document as written.

use std::fmt;

/// What is wrong with one input value.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum InputErrorKind {
    /// The value is NaN or infinite.
    #[error("must be a finite number")]
    NotFinite,
    /// The value must be strictly positive.
    #[error("must be greater than zero (got {value})")]
    NotPositive { value: f64 },
    /// The value must be zero or more.
    #[error("must not be negative (got {value})")]
    Negative { value: f64 },
    /// The value lies outside the range the tool accepts at all (not a model's validity
    /// range, which only warns).
    #[error("must be between {min} and {max} {unit} (got {value})")]
    OutOfBounds {
        value: f64,
        min: f64,
        max: f64,
        unit: &'static str,
    },
    /// A porous material (snow) denser than solid ice.
    #[error("{value} kg/m³ is denser than solid ice ({ice} kg/m³)")]
    DenserThanIce { value: f64, ice: f64 },
    /// A soil holding more water than its pores can.
    #[error(
        "{value_pct} % is more water than the pores hold at this dry density (saturation is {saturation_pct:.1} %)"
    )]
    BeyondSaturation { value_pct: f64, saturation_pct: f64 },
    /// A soil denser than its solid grains.
    #[error("{value} kg/m³ is at or above the density of the solid grains ({solids} kg/m³)")]
    DenserThanSolids { value: f64, solids: f64 },
    /// Too few or too many of something.
    #[error("{count} is not allowed: between {min} and {max} are")]
    Count {
        count: usize,
        min: usize,
        max: usize,
    },
    /// A model was asked for a case it does not cover.
    #[error("{0}")]
    NotCovered(String),
    /// The document itself could not be read.
    #[error("{0}")]
    Format(String),
    /// A date that does not come after the date before it (dates are ISO 8601 text).
    #[error("{date} does not come after the previous date {previous}")]
    DateOutOfOrder { date: String, previous: String },
    /// Days missing between two consecutive records (dates are ISO 8601 text).
    #[error("{missing} {} missing between {previous} and {date}", if *.missing == 1 { "day" } else { "days" })]
    DateGap {
        date: String,
        previous: String,
        missing: u64,
    },
    /// A climate series too short for design values.
    #[error(
        "{complete} complete {} in the series (each running from {season_start} to the day before {season_start} of the next year); design values need at least {needed}",
        if *.complete == 1 { "winter" } else { "winters" }
    )]
    TooFewWinters {
        complete: usize,
        needed: usize,
        season_start: String,
    },
}

impl InputErrorKind {
    /// Stable identifier of the kind, for faces that word the message themselves.
    pub fn id(&self) -> &'static str {
        match self {
            InputErrorKind::NotFinite => "not_finite",
            InputErrorKind::NotPositive { .. } => "not_positive",
            InputErrorKind::Negative { .. } => "negative",
            InputErrorKind::OutOfBounds { .. } => "out_of_bounds",
            InputErrorKind::DenserThanIce { .. } => "denser_than_ice",
            InputErrorKind::BeyondSaturation { .. } => "beyond_saturation",
            InputErrorKind::DenserThanSolids { .. } => "denser_than_solids",
            InputErrorKind::Count { .. } => "count",
            InputErrorKind::NotCovered(_) => "not_covered",
            InputErrorKind::Format(_) => "format",
            InputErrorKind::DateOutOfOrder { .. } => "date_out_of_order",
            InputErrorKind::DateGap { .. } => "date_gap",
            InputErrorKind::TooFewWinters { .. } => "too_few_winters",
        }
    }

    /// The offending value and the limits it broke, in the field's SI unit, so a face can
    /// show them in the unit the user reads: (value, min, max).
    pub fn numbers(&self) -> (Option<f64>, Option<f64>, Option<f64>) {
        match *self {
            InputErrorKind::NotPositive { value } => (Some(value), Some(0.0), None),
            InputErrorKind::Negative { value } => (Some(value), Some(0.0), None),
            InputErrorKind::OutOfBounds {
                value, min, max, ..
            } => (Some(value), Some(min), Some(max)),
            InputErrorKind::DenserThanIce { value, ice } => (Some(value), None, Some(ice)),
            InputErrorKind::DenserThanSolids { value, solids } => (Some(value), None, Some(solids)),
            InputErrorKind::BeyondSaturation {
                value_pct,
                saturation_pct,
            } => (Some(value_pct), None, Some(saturation_pct)),
            _ => (None, None, None),
        }
    }
}

/// An input error tied to the field at fault.
#[derive(Debug, Clone, PartialEq)]
pub struct InputError {
    /// Path of the field in the scenario document, e.g. `layers[1].material.density_kg_m3`.
    pub field: String,
    pub kind: InputErrorKind,
}

impl InputError {
    pub fn new(field: impl Into<String>, kind: InputErrorKind) -> Self {
        Self {
            field: field.into(),
            kind,
        }
    }
}

impl fmt::Display for InputError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: {}", self.field, self.kind)
    }
}

impl std::error::Error for InputError {}

/// All the input errors found in one pass (validation does not stop at the first).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct InputErrors(pub Vec<InputError>);

impl InputErrors {
    pub fn push(&mut self, field: impl Into<String>, kind: InputErrorKind) {
        self.0.push(InputError::new(field, kind));
    }
    pub fn is_empty(&self) -> bool {
        self.0.is_empty()
    }
    /// `Ok(())` if nothing was pushed.
    pub fn into_result(self) -> Result<(), InputErrors> {
        if self.0.is_empty() {
            Ok(())
        } else {
            Err(self)
        }
    }
}

impl fmt::Display for InputErrors {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        for (i, e) in self.0.iter().enumerate() {
            if i > 0 {
                writeln!(f)?;
            }
            write!(f, "{e}")?;
        }
        Ok(())
    }
}

impl std::error::Error for InputErrors {}

impl From<InputError> for InputErrors {
    fn from(e: InputError) -> Self {
        InputErrors(vec![e])
    }
}

/// A model used outside the range its source covers. The result is still given.
#[derive(Debug, Clone, PartialEq)]
pub struct Warning {
    pub field: String,
    pub message: String,
}

/// Checks shared by the validators.
pub(crate) mod check {
    use super::{InputErrorKind, InputErrors};

    /// Push an error unless `value` is finite and > 0. Returns whether it passed.
    pub fn positive(errs: &mut InputErrors, field: &str, value: f64) -> bool {
        if !value.is_finite() {
            errs.push(field, InputErrorKind::NotFinite);
            false
        } else if value <= 0.0 {
            errs.push(field, InputErrorKind::NotPositive { value });
            false
        } else {
            true
        }
    }

    /// Push an error unless `value` is finite and in `[min, max]`.
    pub fn within(
        errs: &mut InputErrors,
        field: &str,
        value: f64,
        min: f64,
        max: f64,
        unit: &'static str,
    ) -> bool {
        match within_kind(value, min, max, unit) {
            Some(kind) => {
                errs.push(field, kind);
                false
            }
            None => true,
        }
    }

    /// What is wrong with `value` if it is not finite or not in `[min, max]`.
    pub fn within_kind(
        value: f64,
        min: f64,
        max: f64,
        unit: &'static str,
    ) -> Option<InputErrorKind> {
        if !value.is_finite() {
            Some(InputErrorKind::NotFinite)
        } else if value < min || value > max {
            Some(InputErrorKind::OutOfBounds {
                value,
                min,
                max,
                unit,
            })
        } else {
            None
        }
    }
}
