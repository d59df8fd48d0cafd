//! Every bundled example through the CLI, compared with stored digests: the report, every
//! CSV and every SVG the CLI writes for it, in SI and in US units, must stay the same to the
//! bit. A change of code that is meant to change no number (a tidy, a move, a faster solver)
//! must leave this test green; a change that is meant to change a number updates the digests
//! on purpose, in the same commit, saying why.
//!
//! - `HIBERNAL_KEEP_OUTPUTS=DIR` writes every output into DIR (to diff against a run of the
//!   earlier code).
//! - `HIBERNAL_WRITE_DIGESTS=1` rewrites `tests/data/example_digests.json` from this run
//!   instead of comparing.
//!
//! Besides the CLI's outputs, the steady profile CSV of every example (which the page offers
//! and the CLI does not write) and the import of the bundled climate records are digested
//! through the library.

use hibernal::document::steady;
use std::collections::BTreeMap;
use std::path::{Path, PathBuf};
use std::process::Command;

use sha2::{Digest, Sha256};

const DIGESTS: &str = "tests/data/example_digests.json";

fn hex(bytes: &[u8]) -> String {
    Sha256::digest(bytes)
        .iter()
        .map(|b| format!("{b:02x}"))
        .collect()
}

fn cli() -> Command {
    Command::new(env!("CARGO_BIN_EXE_hibernal"))
}

/// The bundled examples as the CLI lists them.
fn example_names() -> Vec<String> {
    let out = cli().arg("example").output().expect("hibernal example");
    assert!(out.status.success(), "hibernal example failed");
    String::from_utf8(out.stdout)
        .expect("utf-8")
        .lines()
        .filter_map(|l| l.split_whitespace().next().map(str::to_owned))
        .collect()
}

/// The output options the CLI offers for the sections a scenario has, as pairs of option and
/// file name. A ranges study's charts here are those of its first result.
fn outputs_for(scenario: &serde_json::Value) -> Vec<String> {
    let has = |k: &str| scenario.get(k).is_some_and(|v| !v.is_null());
    let mut pairs = vec![("--svg", "profile.svg")];
    if has("winter") {
        pairs.extend([
            ("--winter-svg", "winter.svg"),
            ("--csv", "daily.csv"),
            ("--profile-svg", "day-profile.svg"),
            ("--series-svg", "series.svg"),
            ("--profiles-csv", "profiles.csv"),
        ]);
    }
    if has("shelter") {
        pairs.extend([
            ("--night-svg", "night.svg"),
            ("--night-csv", "night.csv"),
            ("--sweeps-svg", "sweeps.svg"),
            ("--sweeps-csv", "sweeps.csv"),
        ]);
    }
    if has("edge") {
        pairs.extend([
            ("--edge-svg", "edge-field.svg"),
            ("--edge-series-svg", "edge-series.svg"),
            ("--edge-csv", "edge-daily.csv"),
            ("--edge-field-csv", "edge-field.csv"),
        ]);
    }
    if has("ranges") {
        pairs.extend([
            ("--ranges-csv", "ranges-runs.csv"),
            ("--ranges-summary-csv", "ranges-summary.csv"),
            ("--ranges-svg", "ranges-first.svg"),
            ("--sensitivity-svg", "sensitivity-first.svg"),
        ]);
    }
    pairs
        .into_iter()
        .flat_map(|(o, f)| [o.to_owned(), f.to_owned()])
        .collect()
}

/// The charts of a ranges study's result other than the first: a run of their own each.
fn ranges_charts_of(id: &str) -> Vec<String> {
    vec![
        "--ranges-result".into(),
        id.into(),
        "--ranges-svg".into(),
        format!("ranges-{id}.svg"),
        "--sensitivity-svg".into(),
        format!("sensitivity-{id}.svg"),
    ]
}

/// Runs the CLI on `file` with `args` in `dir`; returns the report (stdout).
fn run_cli(file: &Path, dir: &Path, units: &str, args: &[String]) -> Vec<u8> {
    let out = cli()
        .current_dir(dir)
        .arg("run")
        .arg(file)
        .args(["--units", units, "--threads", "2"])
        .args(args)
        .output()
        .expect("hibernal run");
    assert!(
        out.status.success(),
        "hibernal run {} {args:?} failed: {}",
        file.display(),
        String::from_utf8_lossy(&out.stderr)
    );
    out.stdout
}

fn all_outputs() -> BTreeMap<String, Vec<u8>> {
    let mut outputs: BTreeMap<String, Vec<u8>> = BTreeMap::new();
    let work = std::env::temp_dir().join(format!("hibernal-digests-{}", std::process::id()));
    for name in example_names() {
        let json = cli()
            .args(["example", &name])
            .output()
            .expect("hibernal example NAME")
            .stdout;
        let scenario: serde_json::Value = serde_json::from_slice(&json).expect("example JSON");
        let dir = work.join(&name);
        std::fs::create_dir_all(&dir).expect("temp dir");
        let file = dir.join("scenario.json");
        std::fs::write(&file, &json).expect("write scenario");
        let mut report_si: Option<Vec<u8>> = None;
        for units in ["si", "us"] {
            let main = outputs_for(&scenario);
            let report = run_cli(&file, &dir, units, &main);
            let parsed: serde_json::Value = serde_json::from_slice(&report).expect("report");
            let mut runs = vec![main];
            if let Some(results) = parsed.pointer("/ranges/results").and_then(|r| r.as_array()) {
                for r in results.iter().skip(1) {
                    runs.push(ranges_charts_of(r["id"].as_str().expect("result id")));
                }
            }
            match &report_si {
                None => {
                    outputs.insert(format!("{name}/report.json"), report.clone());
                    report_si = Some(report);
                }
                Some(r) => assert!(*r == report, "{name}: the report depends on --units"),
            }
            for (k, args) in runs.iter().enumerate() {
                if k > 0 {
                    let again = run_cli(&file, &dir, units, args);
                    assert!(
                        Some(&again) == report_si.as_ref(),
                        "{name}: the report depends on the charts asked for"
                    );
                }
                for f in args
                    .iter()
                    .filter(|a| a.ends_with(".svg") || a.ends_with(".csv"))
                {
                    let bytes = std::fs::read(dir.join(f)).expect("output written");
                    outputs.insert(format!("{name}/{units}/{f}"), bytes);
                }
            }
        }
        library_outputs(&name, &json, &mut outputs);
    }
    climate_imports(&mut outputs);
    let _ = std::fs::remove_dir_all(&work);
    outputs
}

/// The steady profile CSV (the page's download) of an example, in both unit systems.
fn library_outputs(name: &str, json: &[u8], outputs: &mut BTreeMap<String, Vec<u8>>) {
    use hibernal::document::scenario;
    use hibernal::physics::units::UnitSystem;
    let text = std::str::from_utf8(json).expect("utf-8");
    let s = scenario::parse(text).expect("example parses");
    let c = steady::compute(&s).expect("example computes");
    for (units, sys) in [("si", UnitSystem::Si), ("us", UnitSystem::Us)] {
        outputs.insert(
            format!("{name}/{units}/steady-profile.csv"),
            steady::profile_csv(&c, sys).into_bytes(),
        );
    }
}

/// The bundled climate records imported as the page imports them (units as their headers
/// say), the outcome as JSON.
fn climate_imports(outputs: &mut BTreeMap<String, Vec<u8>>) {
    use hibernal::document::climate_import::{import_csv, ImportOptions};
    let cases = [
        (
            "cold-inland-valley-five-winters",
            r#"{"temperature":"°C","snow_depth":"cm","snow_density":"kg/m³"}"#,
        ),
        (
            "windswept-upland-one-winter-fahrenheit",
            r#"{"temperature":"°F","snow_depth":"in","fill_gaps_days":3,"skip_bad_lines":true}"#,
        ),
    ];
    for (file, options) in cases {
        let text = std::fs::read_to_string(format!("scenarios/climate/{file}.csv"))
            .expect("climate example");
        let o: ImportOptions = serde_json::from_str(options).expect("import options");
        let outcome = import_csv(&text, &o);
        outputs.insert(
            format!("climate/{file}.json"),
            serde_json::to_vec_pretty(&outcome).expect("outcome serialises"),
        );
    }
}

#[test]
fn every_example_gives_the_same_outputs_to_the_bit() {
    let outputs = all_outputs();
    if let Ok(dir) = std::env::var("HIBERNAL_KEEP_OUTPUTS") {
        for (k, v) in &outputs {
            let p = PathBuf::from(&dir).join(k);
            std::fs::create_dir_all(p.parent().expect("parent")).expect("keep dir");
            std::fs::write(p, v).expect("keep output");
        }
    }
    let digests: BTreeMap<String, String> =
        outputs.iter().map(|(k, v)| (k.clone(), hex(v))).collect();
    if std::env::var("HIBERNAL_WRITE_DIGESTS").is_ok_and(|v| v == "1") {
        let text = serde_json::to_string_pretty(&digests).expect("digests") + "\n";
        std::fs::write(DIGESTS, text).expect("write digests");
        return;
    }
    let stored: BTreeMap<String, String> = serde_json::from_str(
        &std::fs::read_to_string(DIGESTS).expect("tests/data/example_digests.json"),
    )
    .expect("digests parse");
    let mut problems = Vec::new();
    for (k, d) in &digests {
        match stored.get(k) {
            None => problems.push(format!("{k}: new output, no stored digest")),
            Some(s) if s != d => problems.push(format!("{k}: changed")),
            Some(_) => {}
        }
    }
    for k in stored.keys().filter(|k| !digests.contains_key(*k)) {
        problems.push(format!("{k}: no longer written"));
    }
    assert!(
        problems.is_empty(),
        "{} of {} outputs differ from the stored digests (HIBERNAL_KEEP_OUTPUTS=DIR writes \
         them to compare):\n{}",
        problems.len(),
        digests.len(),
        problems.join("\n")
    );
}
