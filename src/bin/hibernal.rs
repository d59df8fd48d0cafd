//! The command-line face of Hibernal: runs a scenario file and prints the report as JSON.

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
    use hibernal::scenario;
    use hibernal::units::UnitSystem;

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

    #[derive(Subcommand)]
    enum Command {
        /// Compute a scenario file (and its winter run, if it has one) and print the report as
        /// JSON (SI units).
        Run {
            /// Scenario file (JSON).
            file: PathBuf,
            /// Also write the temperature profile chart to this SVG file.
            #[arg(long, value_name = "OUT.svg")]
            svg: Option<PathBuf>,
            /// Also write the winter run's frost-depth chart to this SVG file.
            #[arg(long, value_name = "OUT.svg")]
            winter_svg: Option<PathBuf>,
            /// Also write the winter run's daily series to this CSV file (units in the header).
            #[arg(long, value_name = "OUT.csv")]
            csv: Option<PathBuf>,
            /// Units of the chart: si or us.
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
    }

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
                for e in &scenario::EXAMPLES {
                    println!("{:<26} {}", e.id, e.summary);
                }
                ExitCode::SUCCESS
            }
            Command::Example { name: Some(n) } => match scenario::example(&n) {
                Some(e) => {
                    print!("{}", e.json);
                    ExitCode::SUCCESS
                }
                None => {
                    let names: Vec<&str> = scenario::EXAMPLES.iter().map(|e| e.id).collect();
                    fail(format!(
                        "no example named {n:?}; the examples are: {}",
                        names.join(", ")
                    ))
                }
            },
            Command::Run {
                file,
                svg,
                winter_svg,
                csv,
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
                let computed = match scenario::compute_with_winter(&sc) {
                    Ok(c) => c,
                    Err(errs) => return fail(format!("{}:\n{errs}", file.display())),
                };
                let report = scenario::report(&sc, &computed);
                match serde_json::to_string_pretty(&report) {
                    Ok(s) => println!("{s}"),
                    Err(e) => return fail(e),
                }
                if let Some(out) = winter_svg {
                    let Some(w) = &computed.winter else {
                        return fail("--winter-svg needs a scenario with a winter section");
                    };
                    let chart = match hibernal::chart::frost_depth_svg(w, sys, 900, 520) {
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
                    if let Err(e) = std::fs::write(&out, hibernal::scenario_winter::daily_csv(w)) {
                        return fail(format!("cannot write {}: {e}", out.display()));
                    }
                }
                if let Some(out) = svg {
                    let chart = match hibernal::chart::profile_svg(&computed, sys, 900, 640) {
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
