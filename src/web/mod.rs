//! The wasm face: a thin layer between the page's JavaScript and the core. Compiled for
//! wasm32 only. Every export takes plain JS values, returns plain JS objects and never panics
//! on user input; a panic hook shows any bug on the page.

use crate::document::compute;
use crate::document::examples;
use crate::document::steady;
use crate::document::vocabulary;
use serde::Serialize;
use wasm_bindgen::prelude::*;

use crate::document::scenario;
use crate::document::vocabulary::ErrorDoc;
use crate::physics::materials::{Board, SnowRegression, SoilModel, Texture};
use crate::physics::stack::SURFACE_PRESETS;
use crate::physics::units::{UnitSystem, QUANTITIES};

/// The unit system a page string names (SI for anything else).
fn units(id: &str) -> UnitSystem {
    UnitSystem::from_id(id).unwrap_or(UnitSystem::Si)
}

fn to_js<T: Serialize>(v: &T) -> JsValue {
    let ser = serde_wasm_bindgen::Serializer::json_compatible();
    v.serialize(&ser).unwrap_or(JsValue::NULL)
}

/// Show a panic on the page (element `#panic`) and in the console.
fn panic_hook(info: &std::panic::PanicHookInfo<'_>) {
    show_internal_error(&format!("Internal error (please report it): {info}"));
}

/// What the panic hook does with its message: the console, and the page's `#panic` box
/// (unhidden). Public so the wasm tests can check it without panicking.
pub fn show_internal_error(msg: &str) {
    web_sys::console::error_1(&JsValue::from_str(msg));
    if let Some(el) = web_sys::window()
        .and_then(|w| w.document())
        .and_then(|d| d.get_element_by_id("panic"))
    {
        el.set_text_content(Some(msg));
        let _ = el.remove_attribute("hidden");
    }
}

#[wasm_bindgen(start)]
pub fn start() {
    std::panic::set_hook(Box::new(panic_hook));
}

#[derive(Serialize)]
struct RegressionDoc {
    id: &'static str,
    name: &'static str,
    citation: &'static str,
    range_kg_m3: [f64; 2],
}

#[derive(Serialize)]
struct IdName {
    id: &'static str,
    name: &'static str,
}

#[derive(Serialize)]
struct SoilModelInfo {
    id: &'static str,
    name: &'static str,
    citation: &'static str,
    textures: Vec<&'static str>,
}

#[derive(Serialize)]
struct BoardInfo {
    id: &'static str,
    name: &'static str,
    conductivity_w_m_k: f64,
    source: &'static str,
}

#[derive(Serialize)]
struct PresetInfo {
    id: &'static str,
    name: &'static str,
    film_w_m2k: Option<f64>,
    source: &'static str,
}

#[derive(Serialize)]
struct NFactorInfo {
    id: &'static str,
    name: &'static str,
    freezing: f64,
    source: &'static str,
}

#[derive(Serialize)]
struct ActivityInfo {
    id: &'static str,
    name: &'static str,
    met: f64,
    source: &'static str,
}

#[derive(Serialize)]
struct UnitInfo {
    symbol: &'static str,
    factor: f64,
    offset: f64,
    decimals: u8,
}

#[derive(Serialize)]
struct QuantityInfo {
    si: UnitInfo,
    us: UnitInfo,
}

#[derive(Serialize)]
struct Catalogue {
    version: &'static str,
    format_version: u32,
    #[serde(rename = "snow_correlations")]
    snow_regressions: Vec<RegressionDoc>,
    soil_textures: Vec<IdName>,
    soil_models: Vec<SoilModelInfo>,
    boards: Vec<BoardInfo>,
    surface_presets: Vec<PresetInfo>,
    material_kinds: Vec<IdName>,
    n_factor_presets: Vec<NFactorInfo>,
    /// Kinds of starting state a winter run accepts.
    initial_kinds: Vec<&'static str>,
    /// Shelter shapes (ids as the scenario names them) with plain names.
    shelter_shapes: Vec<IdName>,
    /// What people in a shelter do, with the metabolic rate and its source.
    activities: Vec<ActivityInfo>,
    /// The shelter cautions, always shown, with their sources.
    cautions: Vec<crate::document::shelter::CautionDoc>,
    units: std::collections::BTreeMap<&'static str, QuantityInfo>,
}

/// Everything the page offers to choose from, with sources, and the unit table.
#[wasm_bindgen]
pub fn catalogue() -> JsValue {
    let unit = |u: &crate::physics::units::UnitDef| UnitInfo {
        symbol: u.symbol,
        factor: u.factor,
        offset: u.offset,
        decimals: u.decimals,
    };
    let c = Catalogue {
        version: env!("CARGO_PKG_VERSION"),
        format_version: scenario::FORMAT_VERSION,
        snow_regressions: SnowRegression::ALL
            .iter()
            .map(|c| {
                let (lo, hi) = c.valid_range_kg_m3();
                RegressionDoc {
                    id: c.id(),
                    name: c.name(),
                    citation: c.citation(),
                    range_kg_m3: [lo, hi],
                }
            })
            .collect(),
        soil_textures: Texture::ALL
            .iter()
            .map(|t| IdName {
                id: t.id(),
                name: t.name(),
            })
            .collect(),
        soil_models: SoilModel::ALL
            .iter()
            .map(|m| SoilModelInfo {
                id: m.id(),
                name: m.name(),
                citation: m.citation(),
                textures: Texture::ALL
                    .iter()
                    .filter(|t| m.covers(**t))
                    .map(|t| t.id())
                    .collect(),
            })
            .collect(),
        boards: Board::ALL
            .iter()
            .map(|b| BoardInfo {
                id: b.id(),
                name: b.name(),
                conductivity_w_m_k: b.nominal_conductivity_w_m_k(),
                source: "typical value for the product class (common practice, no single source)",
            })
            .collect(),
        surface_presets: SURFACE_PRESETS
            .iter()
            .map(|p| PresetInfo {
                id: p.id,
                name: p.name,
                film_w_m2k: p.film_w_m2k,
                source: p.source,
            })
            .collect(),
        material_kinds: [
            ("snow", "Snow"),
            ("ice", "Ice"),
            ("water", "Water (freezes to ice)"),
            ("air", "Still air gap"),
            ("soil", "Soil, gravel or peat"),
            ("insulation", "Insulation board"),
            ("concrete", "Concrete"),
            ("custom", "Custom material"),
        ]
        .into_iter()
        .map(|(id, name)| IdName { id, name })
        .collect(),
        n_factor_presets: crate::physics::climate::Surface::ALL
            .iter()
            .map(|s| NFactorInfo {
                id: s.id(),
                name: s.name(),
                freezing: s.freezing_n_factor(),
                source: s.source(),
            })
            .collect(),
        initial_kinds: vec!["uniform", "spin-up", "periodic"],
        shelter_shapes: [
            ("block-dome", "Dome of snow blocks"),
            ("hollowed-pile", "Pile of snow, hollowed out"),
            ("drift-cave", "Cave dug into a drift"),
            ("trench", "Trench roofed with snow blocks"),
        ]
        .into_iter()
        .map(|(id, name)| IdName { id, name })
        .collect(),
        activities: crate::physics::shelter::Activity::ALL
            .iter()
            .map(|a| ActivityInfo {
                id: a.id(),
                name: a.name(),
                met: a.met(),
                source: a.source(),
            })
            .collect(),
        cautions: crate::document::shelter::cautions(),
        units: QUANTITIES
            .iter()
            .map(|q| {
                (
                    q.id,
                    QuantityInfo {
                        si: unit(&q.si),
                        us: unit(&q.us),
                    },
                )
            })
            .collect(),
    };
    to_js(&c)
}

#[derive(Serialize)]
struct ExampleInfo {
    id: &'static str,
    title: String,
    summary: &'static str,
}

/// A bundled example read through a JSON value, the path the page's own scenarios take
/// (`scenario::from_value`): reading text straight into the document would build a second
/// copy of every deserializer into the module (about 100 KiB) for eight known-good files.
fn bundled(json: &str) -> Result<scenario::Scenario, vocabulary::ErrorDoc> {
    let v: serde_json::Value =
        serde_json::from_str(json).map_err(|e| ErrorDoc::plain("", e.to_string()))?;
    scenario::from_value(v).map_err(|e| ErrorDoc::plain("", e.to_string()))
}

/// The bundled examples: `[{id, title, summary}]`.
#[wasm_bindgen]
pub fn examples() -> JsValue {
    let list: Vec<ExampleInfo> = examples::EXAMPLES
        .iter()
        .map(|e| ExampleInfo {
            id: e.id,
            title: bundled(e.json)
                .map(|s| s.title)
                .unwrap_or_else(|_| e.id.to_string()),
            summary: e.summary,
        })
        .collect();
    to_js(&list)
}

/// One example as a scenario object, or null if there is none by that id.
#[wasm_bindgen]
pub fn example(id: &str) -> JsValue {
    match examples::example(id).map(|e| bundled(e.json)) {
        Some(Ok(s)) => to_js(&s),
        _ => JsValue::NULL,
    }
}

/// JSON Schema of the scenario format.
#[wasm_bindgen]
pub fn scenario_schema() -> JsValue {
    to_js(&scenario::schema())
}

#[derive(Serialize)]
struct Outcome<'a> {
    ok: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    report: Option<&'a compute::Report>,
    #[serde(skip_serializing_if = "Option::is_none")]
    errors: Option<Vec<ErrorDoc>>,
}

fn read_scenario(v: JsValue) -> Result<scenario::Scenario, Vec<ErrorDoc>> {
    let value: serde_json::Value = serde_wasm_bindgen::from_value(v).map_err(|e| {
        vec![ErrorDoc::plain(
            "",
            format!("the scenario is not a JSON object: {e}"),
        )]
    })?;
    scenario::from_value(value).map_err(|e| e.0.iter().map(ErrorDoc::from).collect())
}

fn computed(v: JsValue) -> Result<(scenario::Scenario, steady::Steady), Vec<ErrorDoc>> {
    let s = read_scenario(v)?;
    let c = steady::compute(&s).map_err(|e| e.0.iter().map(ErrorDoc::from).collect::<Vec<_>>())?;
    Ok((s, c))
}

/// Compute a scenario: `{ok: true, report}` or `{ok: false, errors: [{field, message}]}`.
#[wasm_bindgen]
pub fn compute(scenario_value: JsValue) -> JsValue {
    match computed(scenario_value) {
        Ok((s, c)) => {
            let r = compute::report(&s, &c.into());
            to_js(&Outcome {
                ok: true,
                report: Some(&r),
                errors: None,
            })
        }
        Err(errors) => to_js(&Outcome {
            ok: false,
            report: None,
            errors: Some(errors),
        }),
    }
}

#[derive(Serialize)]
struct DrawOutcome {
    ok: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    message: Option<String>,
}

/// A canvas as plotters draws on it.
type CanvasArea =
    plotters::drawing::DrawingArea<plotters_canvas::CanvasBackend, plotters::coord::Shift>;

/// Draw `report` with `f` on a canvas at its current pixel size: `{ok: true}`, or
/// `{ok: false, message}` when there is nothing to draw (`Err` carries why), the canvas has
/// no 2D context, or the chart fails. Every chart of the page goes through here.
fn draw_on<R>(
    canvas: web_sys::HtmlCanvasElement,
    report: Result<&R, &str>,
    f: impl FnOnce(&CanvasArea, &R) -> Result<(), crate::charts::frame::ChartError>,
) -> JsValue {
    let outcome = |message: Option<String>| {
        to_js(&DrawOutcome {
            ok: message.is_none(),
            message,
        })
    };
    let r = match report {
        Ok(r) => r,
        Err(why) => return outcome(Some(why.to_string())),
    };
    let Some(backend) = plotters_canvas::CanvasBackend::with_canvas_object(canvas) else {
        return outcome(Some("the canvas has no 2D context".into()));
    };
    use plotters::prelude::IntoDrawingArea;
    outcome(
        f(&backend.into_drawing_area(), r)
            .err()
            .map(|e| e.to_string()),
    )
}

/// Draw the temperature profile on a canvas at its current pixel size.
#[wasm_bindgen]
pub fn draw_profile(
    canvas: web_sys::HtmlCanvasElement,
    scenario_value: JsValue,
    unit_system: &str,
    pixel_ratio: f64,
) -> JsValue {
    let sys = units(unit_system);
    let c = computed(scenario_value).map(|(_, c)| c).map_err(|e| {
        e.iter()
            .map(|e| format!("{}: {}", e.field, e.message))
            .collect::<Vec<_>>()
            .join("; ")
    });
    draw_on(canvas, c.as_ref().map_err(String::as_str), |root, c| {
        crate::charts::profile::draw_profile(root, c, sys, pixel_ratio)
    })
}

/// The steady profile the chart draws, as CSV in the chosen units; empty when the scenario
/// cannot be computed (its errors are shown by `compute`).
#[wasm_bindgen]
pub fn profile_csv(scenario_value: JsValue, unit_system: &str) -> String {
    match computed(scenario_value) {
        Ok((_, c)) => crate::document::steady::profile_csv(&c, units(unit_system)),
        Err(_) => String::new(),
    }
}

#[derive(Serialize)]
struct BenchOutcome {
    ms: f64,
    cells: usize,
    steps: u64,
    iterations: u64,
    iterations_per_step: f64,
    cell_updates_per_s: f64,
    max_frost_depth_m: f64,
}

/// Run the reference year (the benchmark case of `transient::reference`) once and time it
/// with the page's clock. For the benchmark script, not for users.
#[wasm_bindgen]
pub fn benchmark_reference_year() -> JsValue {
    let now = || {
        web_sys::window()
            .and_then(|w| w.performance())
            .map_or(0.0, |p| p.now())
    };
    let (spec, forcing) = crate::physics::transient::reference::reference_year();
    let t0 = now();
    let r = crate::physics::transient::run::run(&spec, &forcing);
    let ms = now() - t0;
    match r {
        Ok(r) => to_js(&BenchOutcome {
            ms,
            cells: r.cells,
            steps: r.steps,
            iterations: r.iterations,
            iterations_per_step: r.iterations as f64 / r.steps as f64,
            cell_updates_per_s: r.cells as f64 * r.iterations as f64 / (ms / 1000.0),
            max_frost_depth_m: r.max_frost_depth_m,
        }),
        Err(e) => JsValue::from_str(&e.to_string()),
    }
}

/// Read a daily climate record from CSV text with the units chosen
/// (`{temperature, snow_depth?, snow_density?, skip_bad_lines?, fill_gaps_days?,
/// season_start_month?}`): `{ok, days, summary, problems, errors}`; every problem names its
/// line.
#[wasm_bindgen]
pub fn import_climate_csv(text: &str, options: JsValue) -> JsValue {
    match serde_wasm_bindgen::from_value::<crate::document::climate_import::ImportOptions>(options)
    {
        Ok(o) => to_js(&crate::document::climate_import::import_csv(text, &o)),
        Err(e) => to_js(&crate::document::climate_import::ImportOutcome {
            ok: false,
            problems: Vec::new(),
            more_problems: 0,
            errors: vec![ErrorDoc::plain("import", e.to_string())],
            summary: None,
            days: Vec::new(),
        }),
    }
}

#[derive(Serialize)]
struct SummaryOutcome {
    ok: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    summary: Option<crate::document::climate_import::ImportSummary>,
    #[serde(skip_serializing_if = "Vec::is_empty")]
    errors: Vec<ErrorDoc>,
}

/// Summarise daily records already in a scenario (`[{date, mean_air_c, …}]`): their span,
/// each winter's freezing index and the design values: `{ok, summary}` or `{ok, errors}`.
#[wasm_bindgen]
pub fn summarise_days(days: JsValue, season_start_month: u32) -> JsValue {
    let out = match serde_wasm_bindgen::from_value::<Vec<crate::document::weather::DayDoc>>(days) {
        Ok(d) => match crate::document::climate_import::summarise_days(&d, season_start_month) {
            Ok(s) => SummaryOutcome {
                ok: true,
                summary: Some(s),
                errors: Vec::new(),
            },
            Err(errors) => SummaryOutcome {
                ok: false,
                summary: None,
                errors,
            },
        },
        Err(e) => SummaryOutcome {
            ok: false,
            summary: None,
            errors: vec![ErrorDoc::plain("winter.climate.days", e.to_string())],
        },
    };
    to_js(&out)
}

#[derive(Serialize)]
struct Step<'a> {
    ok: bool,
    fraction: f64,
    finished: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    errors: Option<&'a [ErrorDoc]>,
}

/// Drive a sliced job for about `budget_ms` milliseconds (48 steps at a time): the job when
/// it has ended (taken out of `job`), or `None` while it runs; a failure empties `job` and
/// fills `errors`.
fn advance_for<J>(
    job: &mut Option<J>,
    errors: &mut Vec<ErrorDoc>,
    budget_ms: f64,
    mut step: impl FnMut(
        &mut J,
    ) -> Result<
        crate::physics::transient::run::Progress,
        crate::physics::error::InputErrors,
    >,
) -> Option<J> {
    let t0 = clock_ms();
    let budget = if budget_ms.is_finite() {
        budget_ms.clamp(1.0, 10_000.0)
    } else {
        16.0
    };
    while let Some(j) = job.as_mut() {
        match step(j) {
            Ok(p) if p.finished => return job.take(),
            Ok(_) => {
                if clock_ms() - t0 >= budget {
                    break;
                }
            }
            Err(e) => {
                *errors = e.0.iter().map(ErrorDoc::from).collect();
                *job = None;
            }
        }
    }
    None
}

/// `{ok, fraction, finished, errors?}` of a sliced job.
fn step_outcome(
    running: &Option<crate::physics::transient::run::Progress>,
    finished: bool,
    errors: &[ErrorDoc],
) -> JsValue {
    let (fraction, finished) = match (running, finished) {
        (Some(p), _) => (p.fraction, false),
        (None, true) => (1.0, true),
        (None, false) => (0.0, false),
    };
    to_js(&Step {
        ok: errors.is_empty(),
        fraction,
        finished,
        errors: (!errors.is_empty()).then_some(errors),
    })
}

/// The least-thickness search of a scenario's winter section, advanced a slice at a time
/// (each of its runs is a whole winter). Never throws: problems come back through
/// [`LeastThicknessRun::errors`] and `advance`.
#[wasm_bindgen]
pub struct LeastThicknessRun {
    job: Option<crate::document::winter_least::LeastThicknessJob>,
    report: Option<crate::document::winter::LeastThicknessReport>,
    errors: Vec<ErrorDoc>,
}

#[wasm_bindgen]
impl LeastThicknessRun {
    /// Check the scenario (stack, winter section and its `least_thickness`) and set up.
    #[wasm_bindgen(constructor)]
    pub fn new(scenario_value: JsValue) -> LeastThicknessRun {
        let fail = |errors: Vec<ErrorDoc>| LeastThicknessRun {
            job: None,
            report: None,
            errors,
        };
        let (s, c) = match computed(scenario_value) {
            Ok(v) => v,
            Err(e) => return fail(e),
        };
        let Some(w) = &s.winter else {
            return fail(vec![ErrorDoc::plain(
                "winter",
                "the scenario has no winter section",
            )]);
        };
        match crate::document::winter_least::LeastThicknessJob::new(w, &c.result.stack, &s.layers) {
            Ok(job) => LeastThicknessRun {
                job: Some(job),
                report: None,
                errors: Vec::new(),
            },
            Err(e) => fail(e.0.iter().map(ErrorDoc::from).collect()),
        }
    }

    /// Why the search cannot go on (`[]` while it can).
    pub fn errors(&self) -> JsValue {
        to_js(&self.errors)
    }

    /// Work for about `budget_ms` milliseconds: `{ok, fraction, finished, errors?}`.
    pub fn advance(&mut self, budget_ms: f64) -> JsValue {
        let ended = advance_for(&mut self.job, &mut self.errors, budget_ms, |j| {
            j.advance(48)
        });
        if let Some(job) = ended {
            self.report = job.report();
        }
        step_outcome(
            &self.job.as_ref().map(|j| j.progress()),
            self.report.is_some(),
            &self.errors,
        )
    }

    /// The report once finished, or null.
    pub fn report(&self) -> JsValue {
        self.report.as_ref().map_or(JsValue::NULL, to_js)
    }
}

/// A winter run of a scenario, advanced a slice at a time so that the page can show
/// progress and stay responsive. Never throws: a scenario that cannot run is reported by
/// [`WinterRun::errors`], and a run that fails by `advance`.
#[wasm_bindgen]
pub struct WinterRun {
    job: Option<crate::document::winter::WinterJob>,
    report: Option<crate::document::winter::WinterReport>,
    errors: Vec<ErrorDoc>,
}

fn clock_ms() -> f64 {
    web_sys::window()
        .and_then(|w| w.performance())
        .map_or(0.0, |p| p.now())
}

#[wasm_bindgen]
impl WinterRun {
    /// Check the scenario (stack and winter section) and set the run up.
    #[wasm_bindgen(constructor)]
    pub fn new(scenario_value: JsValue) -> WinterRun {
        let fail = |errors: Vec<ErrorDoc>| WinterRun {
            job: None,
            report: None,
            errors,
        };
        let (s, c) = match computed(scenario_value) {
            Ok(v) => v,
            Err(e) => return fail(e),
        };
        let Some(w) = &s.winter else {
            return fail(vec![ErrorDoc::plain(
                "winter",
                "the scenario has no winter section",
            )]);
        };
        match crate::document::winter::WinterJob::new(w, &c.result.stack, &s.layers) {
            Ok(job) => WinterRun {
                job: Some(job),
                report: None,
                errors: Vec::new(),
            },
            Err(e) => fail(e.0.iter().map(ErrorDoc::from).collect()),
        }
    }

    /// Why the run cannot go on (`[]` while it can).
    pub fn errors(&self) -> JsValue {
        to_js(&self.errors)
    }

    /// Work for about `budget_ms` milliseconds: `{ok, fraction, finished, errors?}`.
    pub fn advance(&mut self, budget_ms: f64) -> JsValue {
        let ended = advance_for(&mut self.job, &mut self.errors, budget_ms, |j| {
            j.advance(48)
        });
        if let Some(job) = ended {
            self.report = Some(job.finish());
        }
        step_outcome(
            &self.job.as_ref().map(|j| j.progress()),
            self.report.is_some(),
            &self.errors,
        )
    }

    /// The report once finished (daily series, envelope, indices; no profiles), or null.
    pub fn report(&self) -> JsValue {
        self.report.as_ref().map_or(JsValue::NULL, to_js)
    }

    /// The daily series as CSV text in the chosen units (units in the header); empty before
    /// the end.
    pub fn csv(&self, unit_system: &str) -> String {
        let sys = units(unit_system);
        self.report.as_ref().map_or_else(String::new, |r| {
            crate::document::winter::daily_csv_in(r, sys)
        })
    }

    /// The kept daily profiles (a row per day, a column per cell centre) as CSV in the
    /// chosen units; empty before the end.
    pub fn profiles_csv(&self, unit_system: &str) -> String {
        self.report.as_ref().map_or_else(String::new, |r| {
            crate::document::winter::profiles_csv(r, units(unit_system))
        })
    }

    /// Draw frost and thaw depth against time on a canvas.
    pub fn draw_frost_depth(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        unit_system: &str,
        pixel_ratio: f64,
    ) -> JsValue {
        self.draw(canvas, |root, w| {
            crate::charts::winter::draw_frost_depth(root, w, units(unit_system), pixel_ratio)
        })
    }

    /// Draw the ground temperature against depth on a day of the run (the profile kept
    /// nearest to it), over the envelope of the whole run.
    pub fn draw_day_profile(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        day: f64,
        unit_system: &str,
        pixel_ratio: f64,
    ) -> JsValue {
        self.draw(canvas, |root, w| {
            crate::charts::winter::draw_winter_profile(
                root,
                w,
                day,
                units(unit_system),
                pixel_ratio,
            )
        })
    }

    /// Draw air and surface temperature and the ground heat flux against time.
    pub fn draw_series(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        unit_system: &str,
        pixel_ratio: f64,
    ) -> JsValue {
        self.draw(canvas, |root, w| {
            crate::charts::winter::draw_ground_series(root, w, units(unit_system), pixel_ratio)
        })
    }
}

impl WinterRun {
    fn draw(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        f: impl FnOnce(
            &CanvasArea,
            &crate::document::winter::WinterReport,
        ) -> Result<(), crate::charts::frame::ChartError>,
    ) -> JsValue {
        draw_on(
            canvas,
            self.report.as_ref().ok_or("the run has not finished"),
            f,
        )
    }
}

/// The job of a scenario's edge section (`make` sets it up from the section), or the errors
/// that stop it: the scenario unreadable, no edge section, or the section's own.
fn edge_job<J>(
    scenario_value: JsValue,
    make: impl FnOnce(&crate::document::edge::EdgeDoc) -> Result<J, crate::physics::error::InputErrors>,
) -> Result<J, Vec<ErrorDoc>> {
    let s = read_scenario(scenario_value)?;
    let Some(d) = &s.edge else {
        return Err(vec![ErrorDoc::plain(
            "edge",
            "the scenario has no edge section",
        )]);
    };
    make(d).map_err(|e| e.0.iter().map(ErrorDoc::from).collect())
}

/// The search of a scenario's `edge.least` (the least wing width, board R-value or footing
/// depth that keeps frost at or above the footing base), run a slice at a time like
/// [`LeastThicknessRun`]: each trial is a whole winter of the section. The constructor never throws.
#[wasm_bindgen]
pub struct EdgeLeastRun {
    job: Option<crate::document::edge_least::EdgeLeastJob>,
    report: Option<crate::document::edge::EdgeLeastReport>,
    errors: Vec<ErrorDoc>,
}

#[wasm_bindgen]
impl EdgeLeastRun {
    /// Check the scenario's edge section and its `least` and set up.
    #[wasm_bindgen(constructor)]
    pub fn new(scenario_value: JsValue) -> EdgeLeastRun {
        match edge_job(scenario_value, |d| {
            crate::document::edge_least::EdgeLeastJob::new(d)
        }) {
            Ok(job) => EdgeLeastRun {
                job: Some(job),
                report: None,
                errors: Vec::new(),
            },
            Err(errors) => EdgeLeastRun {
                job: None,
                report: None,
                errors,
            },
        }
    }

    /// Why the search cannot go on (`[]` while it can).
    pub fn errors(&self) -> JsValue {
        to_js(&self.errors)
    }

    /// Work for about `budget_ms` milliseconds: `{ok, fraction, finished, errors?}`.
    pub fn advance(&mut self, budget_ms: f64) -> JsValue {
        let ended = advance_for(&mut self.job, &mut self.errors, budget_ms, |j| j.advance(2));
        if let Some(job) = ended {
            self.report = job.report();
        }
        step_outcome(
            &self.job.as_ref().map(|j| j.progress()),
            self.report.is_some(),
            &self.errors,
        )
    }

    /// The report once finished, or null.
    pub fn report(&self) -> JsValue {
        self.report.as_ref().map_or(JsValue::NULL, to_js)
    }
}

/// The building edge of a scenario (its `edge` section), run a slice at a time like
/// [`WinterRun`]: the constructor never throws; a scenario that cannot be run is reported by
/// [`EdgeRun::errors`], each error naming its field (`edge.wing.width_m`), and a run that
/// fails by `advance`.
#[wasm_bindgen]
pub struct EdgeRun {
    job: Option<crate::document::edge::EdgeJob>,
    report: Option<crate::document::edge::EdgeReport>,
    errors: Vec<ErrorDoc>,
}

#[wasm_bindgen]
impl EdgeRun {
    /// Check the scenario's edge section and set the run up.
    #[wasm_bindgen(constructor)]
    pub fn new(scenario_value: JsValue) -> EdgeRun {
        match edge_job(scenario_value, crate::document::edge::EdgeJob::new) {
            Ok(job) => EdgeRun {
                job: Some(job),
                report: None,
                errors: Vec::new(),
            },
            Err(errors) => EdgeRun {
                job: None,
                report: None,
                errors,
            },
        }
    }

    /// Why the run cannot go on (`[]` while it can).
    pub fn errors(&self) -> JsValue {
        to_js(&self.errors)
    }

    /// Work for about `budget_ms` milliseconds: `{ok, fraction, finished, errors?}`.
    pub fn advance(&mut self, budget_ms: f64) -> JsValue {
        let ended = advance_for(&mut self.job, &mut self.errors, budget_ms, |j| j.advance(2));
        if let Some(job) = ended {
            self.report = Some(job.finish());
        }
        step_outcome(
            &self.job.as_ref().map(|j| j.progress()),
            self.report.is_some(),
            &self.errors,
        )
    }

    /// The report once finished (no fields: see `field_days`, `field_csv`, `draw_field`),
    /// or null.
    pub fn report(&self) -> JsValue {
        self.report.as_ref().map_or(JsValue::NULL, to_js)
    }

    /// The days with a kept temperature field (empty before the end).
    pub fn field_days(&self) -> JsValue {
        to_js(
            &self
                .report
                .as_ref()
                .map_or_else(Vec::new, |r| r.field_days.clone()),
        )
    }

    /// The daily series as CSV text in the chosen units; empty before the end.
    pub fn csv(&self, unit_system: &str) -> String {
        let sys = units(unit_system);
        self.report.as_ref().map_or_else(String::new, |r| {
            crate::document::edge::edge_daily_csv(r, sys)
        })
    }

    /// The field kept nearest `day` as CSV (x, z, temperature, frozen fraction); empty before
    /// the end.
    pub fn field_csv(&self, day: f64, unit_system: &str) -> String {
        let sys = units(unit_system);
        let day = if day.is_finite() { day } else { 0.0 };
        self.report.as_ref().map_or_else(String::new, |r| {
            crate::document::edge::edge_field_csv(r, day, sys)
        })
    }

    /// Draw the temperature field of the kept day nearest `day` with the 0 °C line and the
    /// outlines.
    pub fn draw_field(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        day: f64,
        unit_system: &str,
        pixel_ratio: f64,
    ) -> JsValue {
        self.draw(canvas, |root, r| {
            crate::charts::edge::draw_edge_field(root, r, day, units(unit_system), pixel_ratio)
        })
    }

    /// Draw frost below the footing's base, the far-field frost and the slab's heat loss
    /// against the day.
    pub fn draw_series(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        unit_system: &str,
        pixel_ratio: f64,
    ) -> JsValue {
        self.draw(canvas, |root, r| {
            crate::charts::edge::draw_edge_series(root, r, units(unit_system), pixel_ratio)
        })
    }
}

impl EdgeRun {
    fn draw(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        f: impl FnOnce(
            &CanvasArea,
            &crate::document::edge::EdgeReport,
        ) -> Result<(), crate::charts::frame::ChartError>,
    ) -> JsValue {
        draw_on(
            canvas,
            self.report.as_ref().ok_or("the run has not finished"),
            f,
        )
    }
}

#[derive(Serialize)]
struct EdgeBenchOutcome {
    ms: f64,
    nx: usize,
    nz: usize,
    cells: usize,
    steps: u64,
    iterations: u64,
    iterations_per_step: f64,
    max_frost_below_base_m: f64,
    far_frost_depth_m: f64,
}

/// Run the edge section of the bundled heated-workshop example (the default grid, its
/// 190-day design winter, with the 1D column beside it) once and time it with the page's
/// clock. For the benchmark script, not for users.
#[wasm_bindgen]
pub fn benchmark_edge_winter() -> JsValue {
    let doc = examples::example("heated-workshop-edge")
        .ok_or_else(|| "no example".to_string())
        .and_then(|e| scenario::parse(e.json).map_err(|e| e.to_string()))
        .and_then(|s| s.edge.ok_or_else(|| "no edge section".to_string()));
    let doc = match doc {
        Ok(d) => d,
        Err(e) => return JsValue::from_str(&e),
    };
    let t0 = clock_ms();
    let r = crate::document::edge::run_edge_scenario(&doc);
    let ms = clock_ms() - t0;
    match r {
        Ok(r) => to_js(&EdgeBenchOutcome {
            ms,
            nx: r.nx,
            nz: r.nz,
            cells: r.cells,
            steps: r.steps,
            iterations: r.iterations,
            iterations_per_step: r.iterations as f64 / r.steps.max(1) as f64,
            max_frost_below_base_m: r.max_frost_below_base_m,
            far_frost_depth_m: r.far_frost_depth_m,
        }),
        Err(e) => JsValue::from_str(&e.to_string()),
    }
}

/// A snow shelter of a scenario, computed at once (steady balance, band, night, least wall,
/// series: well under 100 ms). Never throws: a scenario that cannot be computed is reported
/// by [`ShelterRun::errors`], each error naming its field.
#[wasm_bindgen]
pub struct ShelterRun {
    report: Option<crate::document::shelter::ShelterReport>,
    errors: Vec<ErrorDoc>,
}

#[wasm_bindgen]
impl ShelterRun {
    /// Read the scenario and compute its shelter section.
    #[wasm_bindgen(constructor)]
    pub fn new(scenario_value: JsValue) -> ShelterRun {
        let fail = |errors: Vec<ErrorDoc>| ShelterRun {
            report: None,
            errors,
        };
        let s = match read_scenario(scenario_value) {
            Ok(s) => s,
            Err(e) => return fail(e),
        };
        let Some(doc) = &s.shelter else {
            return fail(vec![ErrorDoc::plain(
                "shelter",
                "the scenario has no shelter section",
            )]);
        };
        match crate::document::shelter::run_shelter(doc) {
            Ok(r) => ShelterRun {
                report: Some(r),
                errors: Vec::new(),
            },
            Err(e) => fail(e.0.iter().map(ErrorDoc::from).collect()),
        }
    }

    /// Why there is no result (`[]` when there is one).
    pub fn errors(&self) -> JsValue {
        to_js(&self.errors)
    }

    /// The report (SI), or null.
    pub fn report(&self) -> JsValue {
        self.report.as_ref().map_or(JsValue::NULL, to_js)
    }

    /// The night as CSV text in the chosen units (units in the header); empty without a
    /// result.
    pub fn night_csv(&self, unit_system: &str) -> String {
        self.report.as_ref().map_or_else(String::new, |r| {
            crate::document::shelter::night_csv(r, units(unit_system))
        })
    }

    /// The three series as CSV text in the chosen units; empty without a result.
    pub fn sweeps_csv(&self, unit_system: &str) -> String {
        self.report.as_ref().map_or_else(String::new, |r| {
            crate::document::shelter::sweeps_csv(r, units(unit_system))
        })
    }

    /// Draw the night (air and inner surfaces against the hours) on a canvas.
    pub fn draw_night(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        unit_system: &str,
        pixel_ratio: f64,
    ) -> JsValue {
        self.draw(canvas, |root, r| {
            crate::charts::shelter::draw_shelter_night(root, r, units(unit_system), pixel_ratio)
        })
    }

    /// Draw one series (0: wall thickness, 1: people, 2: outside temperature) on a canvas.
    pub fn draw_sweep(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        which: u32,
        unit_system: &str,
        pixel_ratio: f64,
    ) -> JsValue {
        self.draw(canvas, |root, r| match r.sweeps.get(which as usize) {
            Some(s) => crate::charts::shelter::draw_shelter_sweep(
                root,
                s,
                r.least_wall.target_c,
                units(unit_system),
                pixel_ratio,
            ),
            None => Err(crate::charts::frame::ChartError(format!(
                "there is no series {which}"
            ))),
        })
    }
}

impl ShelterRun {
    fn draw(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        f: impl FnOnce(
            &CanvasArea,
            &crate::document::shelter::ShelterReport,
        ) -> Result<(), crate::charts::frame::ChartError>,
    ) -> JsValue {
        draw_on(
            canvas,
            self.report.as_ref().ok_or("the shelter has no result"),
            f,
        )
    }
}

/// One task's outcome as it crosses from a worker to the page: per result, a value or
/// the reason there is none.
#[derive(Serialize, serde::Deserialize)]
struct TaskOutcomeDoc {
    values: Vec<Option<f64>>,
    errors: Vec<Option<String>>,
}

impl From<&crate::document::ranges::plan::TaskOutcome> for TaskOutcomeDoc {
    fn from(o: &crate::document::ranges::plan::TaskOutcome) -> Self {
        TaskOutcomeDoc {
            values: o.values.iter().map(|v| v.as_ref().ok().copied()).collect(),
            errors: o.values.iter().map(|v| v.as_ref().err().cloned()).collect(),
        }
    }
}

/// A scenario's ranges study (its `ranges` section) as independent tasks, so the page can
/// spread them over Web Workers: each worker makes its own `RangesStudy` from the same
/// scenario and calls `run_task(k)` for its share; the page's own study `record`s each
/// outcome and, once all are in, gives the `report` (the same, to the bit, whatever the
/// order). `advance` runs the tasks here instead, a slice at a time. The constructor never
/// throws.
#[wasm_bindgen]
pub struct RangesStudy {
    plan: Option<crate::document::ranges::plan::RangesPlan>,
    outcomes: Vec<Option<crate::document::ranges::plan::TaskOutcome>>,
    recorded: usize,
    next: usize,
    report: Option<crate::document::ranges::report::RangesReport>,
    errors: Vec<ErrorDoc>,
}

#[wasm_bindgen]
impl RangesStudy {
    /// Check the scenario and its ranges section and set up.
    #[wasm_bindgen(constructor)]
    pub fn new(scenario_value: JsValue) -> RangesStudy {
        let plan = read_scenario(scenario_value).and_then(|s| {
            crate::document::ranges::plan::RangesPlan::new(&s)
                .map_err(|e| e.0.iter().map(ErrorDoc::from).collect())
        });
        match plan {
            Ok(p) => RangesStudy {
                outcomes: vec![None; p.task_count()],
                plan: Some(p),
                recorded: 0,
                next: 0,
                report: None,
                errors: Vec::new(),
            },
            Err(errors) => RangesStudy {
                plan: None,
                outcomes: Vec::new(),
                recorded: 0,
                next: 0,
                report: None,
                errors,
            },
        }
    }

    /// Why the study cannot go on (`[]` while it can).
    pub fn errors(&self) -> JsValue {
        to_js(&self.errors)
    }

    /// How many tasks the study has (0 when it cannot run).
    pub fn task_count(&self) -> usize {
        self.plan.as_ref().map_or(0, |p| p.task_count())
    }

    /// How many outcomes are in.
    pub fn recorded(&self) -> usize {
        self.recorded
    }

    /// What task `k` is: `{kind: "sample"|"base"|"low"|"high"|"regression", input?, regression?}`.
    pub fn task_kind(&self, k: usize) -> JsValue {
        use crate::document::ranges::plan::Task;
        #[derive(Serialize)]
        struct Kind {
            kind: &'static str,
            index: Option<usize>,
            regression: Option<&'static str>,
        }
        let kind = self.plan.as_ref().and_then(|p| p.task(k)).map(|t| match t {
            Task::Sample(i) => Kind {
                kind: "sample",
                index: Some(i),
                regression: None,
            },
            Task::Base => Kind {
                kind: "base",
                index: None,
                regression: None,
            },
            Task::End { input, high } => Kind {
                kind: if high { "high" } else { "low" },
                index: Some(input),
                regression: None,
            },
            Task::Regression(c) => Kind {
                kind: "regression",
                index: None,
                regression: Some(c.id()),
            },
        });
        kind.as_ref().map_or(JsValue::NULL, to_js)
    }

    /// Run task `k` here and return its outcome `{values: [number|null], errors:
    /// [string|null]}` (one entry per result), for `record` on the page's study. Past the
    /// last task, or on a study that cannot run, every entry is an error.
    pub fn run_task(&self, k: usize) -> JsValue {
        match &self.plan {
            Some(p) => to_js(&TaskOutcomeDoc::from(&p.run_task(k))),
            None => to_js(&TaskOutcomeDoc {
                values: vec![None],
                errors: vec![Some("the study cannot run".into())],
            }),
        }
    }

    /// Record task `k`'s outcome (as `run_task` gave it). Returns whether it was taken: not
    /// for an unknown task, one already in, or an outcome of the wrong shape. The last one
    /// in makes the report.
    pub fn record(&mut self, k: usize, outcome: JsValue) -> bool {
        let Some(plan) = &self.plan else {
            return false;
        };
        let Ok(doc) = serde_wasm_bindgen::from_value::<TaskOutcomeDoc>(outcome) else {
            return false;
        };
        let n = plan.results().len();
        if doc.values.len() != n || doc.errors.len() != n {
            return false;
        }
        let Some(slot @ None) = self.outcomes.get_mut(k) else {
            return false;
        };
        let values = doc
            .values
            .into_iter()
            .zip(doc.errors)
            .map(|(v, e)| match (v, e) {
                (Some(v), None) => Ok(v),
                (_, e) => Err(e.unwrap_or_else(|| "no value".into())),
            })
            .collect();
        *slot = Some(crate::document::ranges::plan::TaskOutcome { values });
        self.recorded += 1;
        if self.recorded == self.outcomes.len() {
            self.finish();
        }
        true
    }

    /// Run the next tasks here for about `budget_ms` milliseconds (at least one):
    /// `{ok, fraction, finished, errors?}`.
    pub fn advance(&mut self, budget_ms: f64) -> JsValue {
        let t0 = clock_ms();
        let budget = if budget_ms.is_finite() {
            budget_ms.clamp(1.0, 10_000.0)
        } else {
            16.0
        };
        if let Some(plan) = &self.plan {
            while self.next < self.outcomes.len() {
                let k = self.next;
                self.next += 1;
                if self.outcomes[k].is_none() {
                    self.outcomes[k] = Some(plan.run_task(k));
                    self.recorded += 1;
                }
                if clock_ms() - t0 >= budget {
                    break;
                }
            }
        }
        if self.plan.is_some() && self.recorded == self.outcomes.len() && self.report.is_none() {
            self.finish();
        }
        let fraction = if self.outcomes.is_empty() {
            0.0
        } else {
            self.recorded as f64 / self.outcomes.len() as f64
        };
        let finished = self.report.is_some();
        to_js(&Step {
            ok: self.errors.is_empty(),
            fraction: if finished { 1.0 } else { fraction },
            finished,
            errors: (!self.errors.is_empty()).then_some(&self.errors[..]),
        })
    }

    /// The report once every outcome is in, or null.
    pub fn report(&self) -> JsValue {
        self.report.as_ref().map_or(JsValue::NULL, to_js)
    }

    /// Draw result `index`'s Monte Carlo values (a histogram with P10, P50, P90, the base
    /// case and the spread across snow regressions).
    pub fn draw_spread(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        index: usize,
        unit_system: &str,
        pixel_ratio: f64,
    ) -> JsValue {
        self.draw(canvas, |root, r| {
            crate::charts::ranges::draw_report_spread(
                root,
                r,
                index,
                units(unit_system),
                pixel_ratio,
            )
        })
    }

    /// Draw result `index`'s one-at-a-time swings (largest on top).
    pub fn draw_sensitivity(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        index: usize,
        unit_system: &str,
        pixel_ratio: f64,
    ) -> JsValue {
        self.draw(canvas, |root, r| {
            crate::charts::ranges::draw_report_sensitivity(
                root,
                r,
                index,
                units(unit_system),
                pixel_ratio,
            )
        })
    }

    /// Every Monte Carlo run as CSV in the chosen units (empty before the end).
    pub fn trials_csv(&self, unit_system: &str) -> String {
        self.report.as_ref().map_or_else(String::new, |r| {
            crate::document::ranges::csv::trials_csv(r, units(unit_system))
        })
    }

    /// The summary per result as CSV in the chosen units (empty before the end).
    pub fn summary_csv(&self, unit_system: &str) -> String {
        self.report.as_ref().map_or_else(String::new, |r| {
            crate::document::ranges::csv::summary_csv(r, units(unit_system))
        })
    }
}

impl RangesStudy {
    fn draw(
        &self,
        canvas: web_sys::HtmlCanvasElement,
        f: impl FnOnce(
            &CanvasArea,
            &crate::document::ranges::report::RangesReport,
        ) -> Result<(), crate::charts::frame::ChartError>,
    ) -> JsValue {
        draw_on(
            canvas,
            self.report.as_ref().ok_or("the study has not finished"),
            f,
        )
    }

    fn finish(&mut self) {
        let Some(plan) = &self.plan else { return };
        let outcomes: Vec<_> = self.outcomes.iter().flatten().cloned().collect();
        match plan.assemble(&outcomes) {
            Ok(r) => self.report = Some(r),
            Err(e) => self.errors = e.0.iter().map(ErrorDoc::from).collect(),
        }
    }
}

/// The scenario's own value of an uncertain input (`what` as in the ranges section; `layer`
/// a stack layer, or negative for every field of the kind), SI; null when it has none or
/// the scenario cannot be read. For the page's default ranges.
#[wasm_bindgen]
pub fn ranges_base_value(scenario_value: JsValue, what: &str, layer: i32) -> JsValue {
    let Ok(s) = read_scenario(scenario_value) else {
        return JsValue::NULL;
    };
    let Some(w) = crate::document::ranges::RangedWhat::ALL
        .into_iter()
        .find(|w| w.id() == what)
    else {
        return JsValue::NULL;
    };
    let layer = usize::try_from(layer).ok();
    crate::document::ranges::apply::base_value(&s, w, layer)
        .map_or(JsValue::NULL, JsValue::from_f64)
}
