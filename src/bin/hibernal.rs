//! The command-line face of Hibernal: runs a scenario file and prints the report as JSON.
//!
//! `hibernal run FILE.json [options]` parses the file, runs every section through
//! `document::compute::compute_all` (stack, winter, shelter, edge, with the least-value
//! searches the sections ask for) and then, with a `ranges` section, the study on
//! `--threads` threads into the report's `ranges`, with a summary on stderr. The options
//! write the charts as SVG and the series as CSV in the `--units` chosen (`hibernal run
//! --help` lists them). `hibernal schema` prints the format's JSON Schema; `hibernal
//! example [NAME]` lists the bundled examples or prints one. Bad input exits with code 2
//! and a message naming the fields.

//! (The CLI is native only; on wasm32 this binary is an empty stub so that `cargo test
//! --target wasm32-unknown-unknown` can build the crate's targets.)

#[cfg(target_arch = "wasm32")]
fn main() {}

#[cfg(not(target_arch = "wasm32"))]
fn main() -> std::process::ExitCode {
    cli::main()
}

#[cfg(not(target_arch = "wasm32"))]
mod cli {
    use std::path::PathBuf;
    use std::process::ExitCode;

    use clap::{Parser, Subcommand};
    use hibernal::document::{compute, defaults, examples, scenario};
    use hibernal::physics::units::UnitSystem;

    #[derive(Parser)]
    #[command(
        name = "hibernal",
        version,
        about = "Heat flow through layered snow, ice, soil and insulation"
    )]
    struct Cli {
        #[command(subcommand)]
        command: Command,
    }

    // Parsed once per process: the size of `Run` costs nothing.
    #[allow(clippy::large_enum_variant)]
    #[derive(Subcommand)]
    enum Command {
        /// Compute a scenario file (and its winter run, its snow shelter and its building
        /// edge, if it has them) and print the report as JSON (SI units). A shelter's and an
        /// edge's report carry their cautions.
        Run {
            /// Scenario file (JSON).
            file: PathBuf,
            /// Also write the temperature profile chart to this SVG file.
            #[arg(long, value_name = "OUT.svg")]
            svg: Option<PathBuf>,
            /// Also write the winter run's frost-depth chart to this SVG file.
            #[arg(long, value_name = "OUT.svg")]
            winter_svg: Option<PathBuf>,
            /// Also write the winter run's daily series to this CSV file (in the units of
            /// --units, named in the header).
            #[arg(long, value_name = "OUT.csv")]
            csv: Option<PathBuf>,
            /// Also write the winter run's ground temperature on one day (see --profile-day)
            /// to this SVG file.
            #[arg(long, value_name = "OUT.svg")]
            profile_svg: Option<PathBuf>,
            /// The day of the run that --profile-svg draws (the profile kept nearest to it;
            /// default: the day of the deepest frost).
            #[arg(
                long,
                value_name = "DAY",
                requires = "profile_svg",
                allow_negative_numbers = true
            )]
            profile_day: Option<f64>,
            /// Also write the winter run's daily air and surface temperatures and ground heat
            /// flux to this SVG file.
            #[arg(long, value_name = "OUT.svg")]
            series_svg: Option<PathBuf>,
            /// Also write the winter run's ground temperature at every cell centre, one row per
            /// day, to this CSV file (in the units of --units, named in the header).
            #[arg(long, value_name = "OUT.csv")]
            profiles_csv: Option<PathBuf>,
            /// Also write the shelter's first night (air and inner surface temperatures against
            /// the hours) to this SVG file.
            #[arg(long, value_name = "OUT.svg")]
            night_svg: Option<PathBuf>,
            /// Also write the shelter's night series (air, surfaces, melt, CO2 every 10
            /// minutes) to this CSV file (in the units of --units, named in the header).
            #[arg(long, value_name = "OUT.csv")]
            night_csv: Option<PathBuf>,
            /// Also write the shelter's three series (air inside against wall thickness,
            /// people and outside temperature) to this SVG file, one panel each.
            #[arg(long, value_name = "OUT.svg")]
            sweeps_svg: Option<PathBuf>,
            /// Also write the shelter's three series to this CSV file (in the units of
            /// --units, named in the header).
            #[arg(long, value_name = "OUT.csv")]
            sweeps_csv: Option<PathBuf>,
            /// Also write the building edge's temperature field on one day (see --edge-day) to
            /// this SVG file, with the 0 °C line and the slab, wall and boards.
            #[arg(long, value_name = "OUT.svg")]
            edge_svg: Option<PathBuf>,
            /// The day of the edge run that --edge-svg and --edge-field-csv take (the field
            /// kept nearest to it; default: the day of the deepest frost below the base).
            #[arg(long, value_name = "DAY", allow_negative_numbers = true)]
            edge_day: Option<f64>,
            /// Also write the building edge's daily frost below the footing's base, far-field
            /// frost (2D and 1D column) and slab heat loss to this SVG file.
            #[arg(long, value_name = "OUT.svg")]
            edge_series_svg: Option<PathBuf>,
            /// Also write the building edge's daily series to this CSV file (in the units of
            /// --units, named in the header).
            #[arg(long, value_name = "OUT.csv")]
            edge_csv: Option<PathBuf>,
            /// Also write the building edge's field on one day (see --edge-day): x, z,
            /// temperature and frozen fraction of every cell, to this CSV file.
            #[arg(long, value_name = "OUT.csv")]
            edge_field_csv: Option<PathBuf>,
            /// Also write every run of the ranges study (its inputs and results, the seed) to
            /// this CSV file (in the units of --units, named in the header).
            #[arg(long, value_name = "OUT.csv")]
            ranges_csv: Option<PathBuf>,
            /// Also write the ranges study's summary (base case, P10, P50, P90, mean, sd,
            /// min, max, runs, seed, spread across snow regressions per result) to this CSV
            /// file.
            #[arg(long, value_name = "OUT.csv")]
            ranges_summary_csv: Option<PathBuf>,
            /// Also write the ranges study's histogram of one result (see --ranges-result)
            /// with P10, P50, P90 and the spread across snow regressions to this SVG file.
            #[arg(long, value_name = "OUT.svg")]
            ranges_svg: Option<PathBuf>,
            /// Also write the ranges study's one-at-a-time sensitivity of one result (see
            /// --ranges-result) to this SVG file.
            #[arg(long, value_name = "OUT.svg")]
            sensitivity_svg: Option<PathBuf>,
            /// The result --ranges-svg and --sensitivity-svg draw: r-value, frost-depth,
            /// frost-below-footing, shelter-interior or shelter-melt (default: the study's
            /// first).
            #[arg(long, value_name = "ID")]
            ranges_result: Option<String>,
            /// Threads for the ranges study (default: the machine's cores). The answers are
            /// the same for any number.
            #[arg(long, value_name = "N")]
            threads: Option<usize>,
            /// Units of the charts and of the CSV files: si or us.
            #[arg(long, default_value = "si")]
            units: String,
        },
        /// Print the JSON Schema of the scenario format.
        Schema,
        /// List the bundled examples, or print one.
        Example {
            /// Name of the example to print.
            name: Option<String>,
        },
        /// List the sections a scenario can have, or print the one a new section starts
        /// from (JSON, SI), to paste into a scenario under its name.
        Default {
            /// The section: winter, shelter, edge or ranges.
            section: Option<String>,
        },
    }

    /// The sections `hibernal default` prints, with what each is.
    const DEFAULT_SECTIONS: [(&str, &str); 4] = [
        (
            "winter",
            "a winter run of the stack: a sine year, film surface, geothermal flux",
        ),
        (
            "shelter",
            "a snow-block dome for two on a calm -15 °C night",
        ),
        (
            "edge",
            "the edge of a heated building on a 0.6 m footing with board and wing",
        ),
        (
            "ranges",
            "a ranges study of the winter's freezing index (±20 %), 200 runs",
        ),
    ];

    fn fail(msg: impl std::fmt::Display) -> ExitCode {
        eprintln!("hibernal: {msg}");
        ExitCode::from(2)
    }

    pub fn main() -> ExitCode {
        let cli = Cli::parse();
        match cli.command {
            Command::Schema => match serde_json::to_string_pretty(&scenario::schema()) {
                Ok(s) => {
                    println!("{s}");
                    ExitCode::SUCCESS
                }
                Err(e) => fail(e),
            },
            Command::Example { name: None } => {
                for e in &examples::EXAMPLES {
                    println!("{:<26} {}", e.id, e.summary);
                }
                ExitCode::SUCCESS
            }
            Command::Example { name: Some(n) } => match examples::example(&n) {
                Some(e) => {
                    print!("{}", e.json);
                    ExitCode::SUCCESS
                }
                None => {
                    let names: Vec<&str> = examples::EXAMPLES.iter().map(|e| e.id).collect();
                    fail(format!(
                        "no example named {n:?}; the examples are: {}",
                        names.join(", ")
                    ))
                }
            },
            Command::Default { section: None } => {
                for (id, what) in DEFAULT_SECTIONS {
                    println!("{id:<10} {what}");
                }
                ExitCode::SUCCESS
            }
            Command::Default { section: Some(id) } => {
                let json = match id.as_str() {
                    "winter" => serde_json::to_string_pretty(&defaults::winter()),
                    "shelter" => serde_json::to_string_pretty(&defaults::shelter()),
                    "edge" => serde_json::to_string_pretty(&defaults::edge()),
                    "ranges" => serde_json::to_string_pretty(&defaults::ranges()),
                    _ => {
                        let ids: Vec<&str> = DEFAULT_SECTIONS.iter().map(|s| s.0).collect();
                        return fail(format!(
                            "no section named {id:?}; the sections are: {}",
                            ids.join(", ")
                        ));
                    }
                };
                match json {
                    Ok(s) => {
                        println!("{s}");
                        ExitCode::SUCCESS
                    }
                    Err(e) => fail(e),
                }
            }
            Command::Run {
                file,
                svg,
                winter_svg,
                csv,
                profile_svg,
                profile_day,
                series_svg,
                profiles_csv,
                night_svg,
                night_csv,
                sweeps_svg,
                sweeps_csv,
                edge_svg,
                edge_day,
                edge_series_svg,
                edge_csv,
                edge_field_csv,
                ranges_csv,
                ranges_summary_csv,
                ranges_svg,
                sensitivity_svg,
                ranges_result,
                threads,
                units,
            } => {
                let Some(sys) = UnitSystem::from_id(&units) else {
                    return fail(format!("--units must be si or us, not {units:?}"));
                };
                let text = match std::fs::read_to_string(&file) {
                    Ok(t) => t,
                    Err(e) => return fail(format!("cannot read {}: {e}", file.display())),
                };
                let sc = match scenario::parse(&text) {
                    Ok(s) => s,
                    Err(errs) => return fail(format!("{}:\n{errs}", file.display())),
                };
                let computed = match compute::compute_all(&sc) {
                    Ok(c) => c,
                    Err(errs) => return fail(format!("{}:\n{errs}", file.display())),
                };
                let mut report = compute::report(&sc, &computed);
                if sc.ranges.is_some() {
                    let threads = threads.unwrap_or_else(|| {
                        std::thread::available_parallelism().map_or(1, |n| n.get())
                    });
                    let t0 = std::time::Instant::now();
                    match hibernal::document::ranges::plan::run_ranges(&sc, threads) {
                        Ok(r) => {
                            eprintln!(
                                "{}",
                                hibernal::document::ranges::csv::summary_text(
                                    &r,
                                    sys,
                                    t0.elapsed()
                                )
                            );
                            report.ranges = Some(r);
                        }
                        Err(errs) => return fail(format!("{}:\n{errs}", file.display())),
                    }
                }
                let ranges_outputs: [(&str, Option<PathBuf>); 4] = [
                    ("--ranges-csv", ranges_csv),
                    ("--ranges-summary-csv", ranges_summary_csv),
                    ("--ranges-svg", ranges_svg),
                    ("--sensitivity-svg", sensitivity_svg),
                ];
                for (option, out) in ranges_outputs {
                    let Some(out) = out else { continue };
                    let Some(r) = &report.ranges else {
                        return fail(format!("{option} needs a scenario with a ranges section"));
                    };
                    let index = match &ranges_result {
                        None => 0,
                        Some(id) => match r.results.iter().position(|x| x.id == id) {
                            Some(i) => i,
                            None => {
                                let ids: Vec<&str> = r.results.iter().map(|x| x.id).collect();
                                return fail(format!(
                                    "--ranges-result {id:?} is not one of this study's results: {}",
                                    ids.join(", ")
                                ));
                            }
                        },
                    };
                    use hibernal::charts::ranges::{report_sensitivity_svg, report_spread_svg};
                    use hibernal::document::ranges::csv::{summary_csv, trials_csv};
                    let text = match option {
                        "--ranges-csv" => trials_csv(r, sys),
                        "--ranges-summary-csv" => summary_csv(r, sys),
                        "--ranges-svg" => match report_spread_svg(r, index, sys, 900, 520) {
                            Ok(t) => t,
                            Err(e) => return fail(e),
                        },
                        _ => match report_sensitivity_svg(r, index, sys, 900, 520) {
                            Ok(t) => t,
                            Err(e) => return fail(e),
                        },
                    };
                    if let Err(e) = std::fs::write(&out, text) {
                        return fail(format!("cannot write {}: {e}", out.display()));
                    }
                }
                match serde_json::to_string_pretty(&report) {
                    Ok(s) => println!("{s}"),
                    Err(e) => return fail(e),
                }
                if let Some(out) = winter_svg {
                    let Some(w) = &computed.winter else {
                        return fail("--winter-svg needs a scenario with a winter section");
                    };
                    let chart = match hibernal::charts::winter::frost_depth_svg(w, sys, 900, 520) {
                        Ok(s) => s,
                        Err(e) => return fail(e),
                    };
                    if let Err(e) = std::fs::write(&out, chart) {
                        return fail(format!("cannot write {}: {e}", out.display()));
                    }
                }
                if let Some(out) = csv {
                    let Some(w) = &computed.winter else {
                        return fail("--csv needs a scenario with a winter section");
                    };
                    if let Err(e) =
                        std::fs::write(&out, hibernal::document::winter::daily_csv_in(w, sys))
                    {
                        return fail(format!("cannot write {}: {e}", out.display()));
                    }
                }
                if let Some(out) = profile_svg {
                    let Some(w) = &computed.winter else {
                        return fail("--profile-svg needs a scenario with a winter section");
                    };
                    let day = profile_day.unwrap_or(w.max_frost_day);
                    if !day.is_finite() {
                        return fail(format!("--profile-day must be a number of days, not {day}"));
                    }
                    let chart =
                        match hibernal::charts::winter::winter_profile_svg(w, day, sys, 760, 720) {
                            Ok(s) => s,
                            Err(e) => return fail(e),
                        };
                    if let Err(e) = std::fs::write(&out, chart) {
                        return fail(format!("cannot write {}: {e}", out.display()));
                    }
                }
                if let Some(out) = series_svg {
                    let Some(w) = &computed.winter else {
                        return fail("--series-svg needs a scenario with a winter section");
                    };
                    let chart = match hibernal::charts::winter::ground_series_svg(w, sys, 960, 520)
                    {
                        Ok(s) => s,
                        Err(e) => return fail(e),
                    };
                    if let Err(e) = std::fs::write(&out, chart) {
                        return fail(format!("cannot write {}: {e}", out.display()));
                    }
                }
                if let Some(out) = profiles_csv {
                    let Some(w) = &computed.winter else {
                        return fail("--profiles-csv needs a scenario with a winter section");
                    };
                    if let Err(e) =
                        std::fs::write(&out, hibernal::document::winter::profiles_csv(w, sys))
                    {
                        return fail(format!("cannot write {}: {e}", out.display()));
                    }
                }
                let shelter_outputs: [(&str, Option<PathBuf>); 4] = [
                    ("--night-svg", night_svg),
                    ("--night-csv", night_csv),
                    ("--sweeps-svg", sweeps_svg),
                    ("--sweeps-csv", sweeps_csv),
                ];
                for (option, out) in shelter_outputs {
                    let Some(out) = out else { continue };
                    let Some(r) = &computed.shelter else {
                        return fail(format!("{option} needs a scenario with a shelter section"));
                    };
                    use hibernal::document::shelter::{night_csv, sweeps_csv};
                    let text = match option {
                        "--night-svg" => {
                            hibernal::charts::shelter::shelter_night_svg(r, sys, 900, 520)
                        }
                        "--sweeps-svg" => {
                            hibernal::charts::shelter::shelter_sweeps_svg(r, sys, 1500, 480)
                        }
                        "--night-csv" => Ok(night_csv(r, sys)),
                        _ => Ok(sweeps_csv(r, sys)),
                    };
                    let text = match text {
                        Ok(t) => t,
                        Err(e) => return fail(e),
                    };
                    if let Err(e) = std::fs::write(&out, text) {
                        return fail(format!("cannot write {}: {e}", out.display()));
                    }
                }
                if let Some(day) = edge_day {
                    if !day.is_finite() {
                        return fail(format!("--edge-day must be a number of days, not {day}"));
                    }
                }
                let edge_outputs: [(&str, Option<PathBuf>); 4] = [
                    ("--edge-svg", edge_svg),
                    ("--edge-series-svg", edge_series_svg),
                    ("--edge-csv", edge_csv),
                    ("--edge-field-csv", edge_field_csv),
                ];
                for (option, out) in edge_outputs {
                    let Some(out) = out else { continue };
                    let Some(r) = &computed.edge else {
                        return fail(format!("{option} needs a scenario with an edge section"));
                    };
                    use hibernal::document::edge::{edge_daily_csv, edge_field_csv};
                    let day = edge_day.unwrap_or(r.max_frost_below_base_day);
                    let text = match option {
                        "--edge-svg" => {
                            hibernal::charts::edge::edge_field_svg(r, day, sys, 1000, 640)
                        }
                        "--edge-series-svg" => {
                            hibernal::charts::edge::edge_series_svg(r, sys, 960, 520)
                        }
                        "--edge-csv" => Ok(edge_daily_csv(r, sys)),
                        _ => Ok(edge_field_csv(r, day, sys)),
                    };
                    let text = match text {
                        Ok(t) => t,
                        Err(e) => return fail(e),
                    };
                    if let Err(e) = std::fs::write(&out, text) {
                        return fail(format!("cannot write {}: {e}", out.display()));
                    }
                }
                if let Some(out) = svg {
                    let chart = match hibernal::charts::profile::profile_svg(
                        &computed.steady,
                        sys,
                        900,
                        640,
                    ) {
                        Ok(s) => s,
                        Err(e) => return fail(e),
                    };
                    if let Err(e) = std::fs::write(&out, chart) {
                        return fail(format!("cannot write {}: {e}", out.display()));
                    }
                }
                ExitCode::SUCCESS
            }
        }
    }
}
