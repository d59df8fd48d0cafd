//! One sliced job over every section run the page starts: a winter, the least-thickness
//! search of a winter, a building edge, its least-insulation search, and a snow shelter
//! (computed at once: it starts finished). [`Job`] is the one class the page drives:
//! `advance(budget_ms)` works about that long and says how far it is, `errors()` says why
//! it cannot go on, `report()` gives the report once finished, and `csv(what, …)` and
//! `draw(what, …)` give the tables and charts of its kind by name. A name the kind does not
//! have is answered with an error value, never a throw.

use super::shared::{
    clock_ms, draw_on, draw_outcome, error_docs, slice_budget, step_outcome, to_js, units,
    CanvasArea,
};
use crate::charts::frame::ChartError;
use crate::document::vocabulary::ErrorDoc;
use crate::document::{edge, edge_least, shelter, winter, winter_least};
use crate::physics::error::InputErrors;
use crate::physics::transient::run::Progress;
use serde::Serialize;
use wasm_bindgen::prelude::*;

/// The kinds of job, as the page names them.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Kind {
    Winter,
    LeastThickness,
    Edge,
    EdgeLeast,
    Shelter,
    /// A kind the page asked for and there is none of (its job is refused).
    Unknown,
}

impl Kind {
    pub const ALL: [Kind; 5] = [
        Kind::Winter,
        Kind::LeastThickness,
        Kind::Edge,
        Kind::EdgeLeast,
        Kind::Shelter,
    ];

    pub fn id(self) -> &'static str {
        match self {
            Kind::Winter => "winter",
            Kind::LeastThickness => "least-thickness",
            Kind::Edge => "edge",
            Kind::EdgeLeast => "edge-least",
            Kind::Shelter => "shelter",
            Kind::Unknown => "unknown",
        }
    }

    pub fn from_id(id: &str) -> Option<Kind> {
        Kind::ALL.into_iter().find(|k| k.id() == id)
    }

    /// Why there is nothing to draw or tabulate yet.
    fn not_yet(self) -> &'static str {
        match self {
            Kind::Shelter => "the shelter has no result",
            Kind::Unknown => "there is no such job",
            _ => "the run has not finished",
        }
    }
}

/// A job under way (each boxed: they are large, and of very different sizes).
pub enum Running {
    Winter(Box<winter::WinterJob>),
    LeastThickness(Box<winter_least::LeastThicknessJob>),
    Edge(Box<edge::EdgeJob>),
    EdgeLeast(Box<edge_least::EdgeLeastJob>),
}

impl Running {
    /// One slice of work: 48 steps of a 1D column, 2 of the plane (each far longer).
    fn step(&mut self) -> Result<Progress, InputErrors> {
        match self {
            Running::Winter(j) => j.advance(48),
            Running::LeastThickness(j) => j.advance(48),
            Running::Edge(j) => j.advance(2),
            Running::EdgeLeast(j) => j.advance(2),
        }
    }

    fn progress(&self) -> Progress {
        match self {
            Running::Winter(j) => j.progress(),
            Running::LeastThickness(j) => j.progress(),
            Running::Edge(j) => j.progress(),
            Running::EdgeLeast(j) => j.progress(),
        }
    }

    /// The report of a job that has ended (a search may end without one).
    fn end(self) -> Option<Finished> {
        match self {
            Running::Winter(j) => Some(Finished::Winter(Box::new(j.finish()))),
            Running::LeastThickness(j) => j.report().map(|r| Finished::LeastThickness(Box::new(r))),
            Running::Edge(j) => Some(Finished::Edge(Box::new(j.finish()))),
            Running::EdgeLeast(j) => j.report().map(|r| Finished::EdgeLeast(Box::new(r))),
        }
    }
}

/// The report of a job that has finished (each boxed, as the jobs are).
pub enum Finished {
    Winter(Box<winter::WinterReport>),
    LeastThickness(Box<winter::LeastThicknessReport>),
    Edge(Box<edge::EdgeReport>),
    EdgeLeast(Box<edge::EdgeLeastReport>),
    Shelter(Box<shelter::ShelterReport>),
}

/// A section's job, run a slice at a time, or its report once finished. Made by the
/// edited scenario's `start`; never throws: a job that cannot run is reported by
/// `errors()`, each error naming its field, and a run that fails by `advance`.
#[wasm_bindgen]
pub struct Job {
    kind: Kind,
    running: Option<Running>,
    finished: Option<Finished>,
    errors: Vec<ErrorDoc>,
}

impl Job {
    /// A job of `kind` under way.
    pub fn running(kind: Kind, job: Running) -> Job {
        Job {
            kind,
            running: Some(job),
            finished: None,
            errors: Vec::new(),
        }
    }

    /// A job of `kind` that is done already.
    pub fn finished(kind: Kind, report: Finished) -> Job {
        Job {
            kind,
            running: None,
            finished: Some(report),
            errors: Vec::new(),
        }
    }

    /// A job of `kind` that cannot run, and why.
    pub fn refused(kind: Kind, errors: Vec<ErrorDoc>) -> Job {
        Job {
            kind,
            running: None,
            finished: None,
            errors,
        }
    }

    /// A job of `kind` set up, or refused with the errors that stop it.
    pub fn made(kind: Kind, made: Result<Running, Vec<ErrorDoc>>) -> Job {
        match made {
            Ok(j) => Job::running(kind, j),
            Err(e) => Job::refused(kind, e),
        }
    }

    fn winter(&self) -> Option<&winter::WinterReport> {
        match &self.finished {
            Some(Finished::Winter(r)) => Some(&**r),
            _ => None,
        }
    }

    fn edge(&self) -> Option<&edge::EdgeReport> {
        match &self.finished {
            Some(Finished::Edge(r)) => Some(&**r),
            _ => None,
        }
    }

    fn shelter(&self) -> Option<&shelter::ShelterReport> {
        match &self.finished {
            Some(Finished::Shelter(r)) => Some(&**r),
            _ => None,
        }
    }

    /// `report` or why there is none yet, for [`draw_on`].
    fn ready<'a, R>(&self, report: Option<&'a R>) -> Result<&'a R, &'static str> {
        report.ok_or(self.kind.not_yet())
    }

    fn unknown(&self, part: &str, what: &str) -> String {
        format!("a {} job has no {part} \"{what}\"", self.kind.id())
    }
}

#[derive(Serialize)]
struct Refusal {
    ok: bool,
    message: String,
}

#[wasm_bindgen]
impl Job {
    /// Its kind: `winter`, `least-thickness`, `edge`, `edge-least` or `shelter` (`unknown`
    /// for a kind there is none of).
    pub fn kind(&self) -> String {
        self.kind.id().to_string()
    }

    /// Why the job cannot go on (`[]` while it can).
    pub fn errors(&self) -> JsValue {
        to_js(&self.errors)
    }

    /// Work for about `budget_ms` milliseconds (at least one slice): `{ok, fraction,
    /// finished, errors?}`.
    pub fn advance(&mut self, budget_ms: f64) -> JsValue {
        let t0 = clock_ms();
        let budget = slice_budget(budget_ms);
        while let Some(j) = self.running.as_mut() {
            match j.step() {
                Ok(p) if p.finished => {
                    self.finished = self.running.take().and_then(Running::end);
                }
                Ok(_) => {
                    if clock_ms() - t0 >= budget {
                        break;
                    }
                }
                Err(e) => {
                    self.errors = error_docs(&e);
                    self.running = None;
                }
            }
        }
        let (fraction, finished) = match (&self.running, &self.finished) {
            (Some(j), _) => (j.progress().fraction, false),
            (None, Some(_)) => (1.0, true),
            (None, None) => (0.0, false),
        };
        step_outcome(fraction, finished, &self.errors)
    }

    /// The report (SI) once finished, or null. A winter's has no profiles (see `csv`), an
    /// edge's no fields (see `field_days`, `csv`, `draw`).
    pub fn report(&self) -> JsValue {
        match &self.finished {
            Some(Finished::Winter(r)) => to_js(r),
            Some(Finished::LeastThickness(r)) => to_js(r),
            Some(Finished::Edge(r)) => to_js(r),
            Some(Finished::EdgeLeast(r)) => to_js(r),
            Some(Finished::Shelter(r)) => to_js(r),
            None => JsValue::NULL,
        }
    }

    /// The days of an edge run with a kept temperature field (empty before the end and for
    /// other kinds).
    pub fn field_days(&self) -> JsValue {
        to_js(&self.edge().map_or_else(Vec::new, |r| r.field_days.clone()))
    }

    /// A table as CSV text in the chosen units (units in the header); empty before the end.
    /// `what`: a winter's `daily` or `profiles` (a row per kept day, a column per cell
    /// centre); an edge's `daily` or `field` (the field kept nearest day `at`: x, z,
    /// temperature, frozen fraction); a shelter's `night` or `sweeps` (the three series).
    /// A table the kind does not have: `{ok: false, message}`.
    pub fn csv(&self, what: &str, unit_system: &str, at: f64) -> JsValue {
        let sys = units(unit_system);
        let text = match (self.kind, what) {
            (Kind::Winter, "daily") => self.winter().map(|r| winter::daily_csv_in(r, sys)),
            (Kind::Winter, "profiles") => self.winter().map(|r| winter::profiles_csv(r, sys)),
            (Kind::Edge, "daily") => self.edge().map(|r| edge::edge_daily_csv(r, sys)),
            (Kind::Edge, "field") => {
                let day = if at.is_finite() { at } else { 0.0 };
                self.edge().map(|r| edge::edge_field_csv(r, day, sys))
            }
            (Kind::Shelter, "night") => self.shelter().map(|r| shelter::night_csv(r, sys)),
            (Kind::Shelter, "sweeps") => self.shelter().map(|r| shelter::sweeps_csv(r, sys)),
            _ => {
                return to_js(&Refusal {
                    ok: false,
                    message: self.unknown("table", what),
                })
            }
        };
        JsValue::from_str(&text.unwrap_or_default())
    }

    /// Draw a chart of the finished job on a canvas at its current pixel size: `{ok}` or
    /// `{ok: false, message}`. `what`: a winter's `frost-depth` (frost and thaw depth
    /// against time), `day-profile` (the ground on day `at`, the profile kept nearest to it,
    /// over the envelope of the run) or `series` (air and surface temperature, ground heat
    /// flux); an edge's `field` (the field of the kept day nearest `at`, with the 0 °C line
    /// and the outlines) or `series` (frost below the footing's base, far-field frost, the
    /// slab's heat loss); a shelter's `night` or `sweep` (series `at`: 0 wall thickness, 1
    /// people, 2 outside temperature).
    pub fn draw(
        &self,
        what: &str,
        canvas: web_sys::HtmlCanvasElement,
        at: f64,
        unit_system: &str,
        pixel_ratio: f64,
    ) -> JsValue {
        use crate::charts;
        let sys = units(unit_system);
        let dpr = pixel_ratio;
        match (self.kind, what) {
            (Kind::Winter, "frost-depth") => {
                draw_on(canvas, self.ready(self.winter()), |root, w| {
                    charts::winter::draw_frost_depth(root, w, sys, dpr)
                })
            }
            (Kind::Winter, "day-profile") => {
                draw_on(canvas, self.ready(self.winter()), |root, w| {
                    charts::winter::draw_winter_profile(root, w, at, sys, dpr)
                })
            }
            (Kind::Winter, "series") => draw_on(canvas, self.ready(self.winter()), |root, w| {
                charts::winter::draw_ground_series(root, w, sys, dpr)
            }),
            (Kind::Edge, "field") => draw_on(canvas, self.ready(self.edge()), |root, r| {
                charts::edge::draw_edge_field(root, r, at, sys, dpr)
            }),
            (Kind::Edge, "series") => draw_on(canvas, self.ready(self.edge()), |root, r| {
                charts::edge::draw_edge_series(root, r, sys, dpr)
            }),
            (Kind::Shelter, "night") => draw_on(canvas, self.ready(self.shelter()), |root, r| {
                charts::shelter::draw_shelter_night(root, r, sys, dpr)
            }),
            (Kind::Shelter, "sweep") => draw_on(canvas, self.ready(self.shelter()), |root, r| {
                draw_sweep(root, r, at, sys, dpr)
            }),
            _ => draw_outcome(Some(self.unknown("chart", what))),
        }
    }
}

/// One of a shelter's series, by its index.
fn draw_sweep(
    root: &CanvasArea,
    r: &shelter::ShelterReport,
    at: f64,
    sys: crate::physics::units::UnitSystem,
    pixel_ratio: f64,
) -> Result<(), ChartError> {
    let which = if at.is_finite() && at >= 0.0 {
        at as usize
    } else {
        usize::MAX
    };
    match r.sweeps.get(which) {
        Some(s) => crate::charts::shelter::draw_shelter_sweep(
            root,
            s,
            r.least_wall.target_c,
            sys,
            pixel_ratio,
        ),
        None => Err(ChartError(format!("there is no series {at}"))),
    }
}
