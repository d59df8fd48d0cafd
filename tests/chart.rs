//! The winter charts (ground temperature on one day, daily series through the run) and the
//! CLI options that write them: well-formed SVG, labels in the chosen units, a curve that
//! is the report's data on fixed axes, and no failure on odd reports.

mod common;
use common::*;
use hibernal::document::compute;
use hibernal::document::examples;

use std::sync::OnceLock;

use hibernal::charts::winter::{
    draw_ground_series, draw_winter_profile, ground_series_svg, winter_profile_svg,
};
use hibernal::document::scenario;
use hibernal::document::winter::{DayProfile, WinterDay, WinterReport};
use hibernal::physics::units::{quantity, UnitSystem};
use plotters::prelude::*;
use proptest::prelude::*;

/// The winter run of the bundled design-winter example (computed once for all tests).
fn yard() -> &'static WinterReport {
    static YARD: OnceLock<WinterReport> = OnceLock::new();
    YARD.get_or_init(|| {
        let s =
            scenario::parse(examples::example("silty-yard-design-winter").unwrap().json).unwrap();
        compute::compute_with_winter(&s).unwrap().winter.unwrap()
    })
}

/// A small report made by hand: two layers, four cells, `days` days (0, 1, …), the day's
/// temperatures from `temp(day, depth)`, snow and frost depth from the given closures.
fn hand_report(
    days: usize,
    temp: impl Fn(f64, f64) -> f64,
    snow: impl Fn(f64) -> f64,
    frost: impl Fn(f64) -> f64,
) -> WinterReport {
    let depths = [0.1, 0.3, 0.7, 1.5];
    let daily: Vec<WinterDay> = (0..days)
        .map(|i| {
            let day = i as f64;
            WinterDay {
                day,
                air_c: temp(day, 0.0) - 2.0,
                surface_c: temp(day, 0.0),
                frost_depth_m: frost(day),
                thaw_depth_m: 0.0,
                ground_flux_w_m2: -3.0 + day,
                snow_depth_m: snow(day),
            }
        })
        .collect();
    let profiles: Vec<DayProfile> = daily
        .iter()
        .map(|d| DayProfile {
            day: d.day,
            temperature_c: depths.iter().map(|&z| temp(d.day, z)).collect(),
            snow_c: Vec::new(),
        })
        .collect();
    let envelope = depths
        .iter()
        .enumerate()
        .map(|(i, &z)| {
            let all = profiles.iter().map(|p| p.temperature_c[i]);
            [
                z,
                all.clone().fold(f64::INFINITY, f64::min),
                all.fold(f64::NEG_INFINITY, f64::max),
            ]
        })
        .collect();
    WinterReport {
        max_frost_depth_m: daily.iter().map(|d| d.frost_depth_m).fold(0.0, f64::max),
        max_frost_day: 0.0,
        air_freezing_index_c_days: 0.0,
        surface_freezing_index_c_days: 0.0,
        cells: depths.len(),
        steps: 0,
        iterations_per_step: 0.0,
        split_steps: 0,
        spin_up_years: 0,
        energy_imbalance_relative: 0.0,
        daily,
        envelope,
        layer_faces_m: vec![0.0, 0.5, 2.0],
        layer_names: vec!["Top & gravel <fill>".into(), String::new()],
        warnings: Vec::new(),
        modelled_depth_m: 2.0,
        frost_at_bottom: false,
        frozen_all_year: false,
        freezable_top_m: 0.0,
        least_thickness: None,
        hand_methods: Vec::new(),
        start_date: None,
        profiles,
    }
}

/// The trimmed contents of every `<text>` element (entities left as written).
fn texts(svg: &str) -> Vec<String> {
    svg.split("<text")
        .skip(1)
        .filter_map(|t| {
            let start = t.find('>')? + 1;
            let end = t.find("</text>")?;
            Some(t[start..end].trim().to_string())
        })
        .collect()
}

/// Whether one `<text>` element reads exactly `s`.
fn has_text(svg: &str, s: &str) -> bool {
    texts(svg).iter().any(|t| t == s)
}

/// The value of attribute `name` in a tag's text.
fn attr<'a>(tag: &'a str, name: &str) -> Option<&'a str> {
    let key = format!(" {name}=\"");
    let start = tag.find(&key)? + key.len();
    let len = tag[start..].find('"')?;
    Some(&tag[start..start + len])
}

/// The point lists of every `<polyline>` with the given stroke colour.
fn polylines(svg: &str, stroke: &str) -> Vec<Vec<(f64, f64)>> {
    svg.split("<polyline")
        .skip(1)
        .filter(|t| attr(t, "stroke") == Some(stroke))
        .filter_map(|t| attr(t, "points"))
        .map(|p| {
            p.split_whitespace()
                .map(|xy| {
                    let (x, y) = xy.split_once(',').unwrap();
                    (x.parse().unwrap(), y.parse().unwrap())
                })
                .collect()
        })
        .collect()
}

/// The longest polyline in the colour of a profile or a surface line (`chart::PROFILE`,
/// rgb 20, 70, 140): the curve itself, not its two-point legend swatch.
fn curve(svg: &str, stroke: &str) -> Vec<(f64, f64)> {
    polylines(svg, stroke)
        .into_iter()
        .max_by_key(|l| l.len())
        .unwrap_or_default()
}

const PROFILE_STROKE: &str = "#14468C";
const AIR_STROKE: &str = "#78808C";
const FLUX_STROKE: &str = "#C47010";

/// Least-squares line pixel = a + b·value.
fn fit(values: &[f64], pixels: &[f64]) -> (f64, f64) {
    let n = values.len() as f64;
    let (mv, mp) = (
        values.iter().sum::<f64>() / n,
        pixels.iter().sum::<f64>() / n,
    );
    let cov: f64 = values
        .iter()
        .zip(pixels)
        .map(|(v, p)| (v - mv) * (p - mp))
        .sum();
    let var: f64 = values.iter().map(|v| (v - mv) * (v - mv)).sum();
    let b = cov / var;
    (mp - b * mv, b)
}

/// The (temperature °C, depth m) points the profile curve of `day` should pass through: the
/// ground surface, then every cell centre.
fn profile_data(w: &WinterReport, day: usize) -> Vec<(f64, f64)> {
    let p = &w.profiles[day];
    let d = w.daily.iter().find(|d| d.day == p.day).unwrap();
    std::iter::once((d.surface_c, 0.0))
        .chain(
            w.envelope
                .iter()
                .zip(&p.temperature_c)
                .map(|(e, &t)| (t, e[0])),
        )
        .collect()
}

#[test]
fn the_day_profile_is_well_formed_and_labelled_in_the_chosen_units() {
    let w = yard();
    let si = winter_profile_svg(w, 40.0, UnitSystem::Si, 760, 720).unwrap();
    let us = winter_profile_svg(w, 40.0, UnitSystem::Us, 760, 720).unwrap();
    for svg in [&si, &us] {
        assert_well_formed(svg);
        assert!(has_text(svg, "Ground temperature on day 40"));
        assert!(
            svg.contains("Moist silt") && svg.contains("Sand"),
            "layer names"
        );
        assert!(svg.contains("Coldest and warmest over the run"));
        assert!(svg.contains("frost depth"), "day 40 has frost");
        assert!(!svg.contains("snow"), "the yard is bare");
    }
    assert!(si.contains("Temperature (°C)") && si.contains("ground surface (m)"));
    assert!(us.contains("Temperature (°F)") && us.contains("ground surface (ft)"));
    assert!(!us.contains("(°C)") && !us.contains("(m)"));
    // The frost depth written is that day's, in the unit shown (2 decimals).
    let frost = w.daily[40].frost_depth_m;
    assert!(si.contains(&format!("frost depth {frost:.2} m")), "{frost}");
    assert!(us.contains(&format!("frost depth {:.2} ft", frost / 0.3048)));
}

#[test]
fn the_day_profile_draws_the_data_of_its_day_on_axes_fixed_for_the_run() {
    let w = yard();
    let a = winter_profile_svg(w, 40.0, UnitSystem::Si, 760, 720).unwrap();
    let b = winter_profile_svg(w, 149.0, UnitSystem::Si, 760, 720).unwrap();
    assert!(has_text(&a, "Ground temperature on day 40") && !a.contains("on day 149"));
    assert!(has_text(&b, "Ground temperature on day 149") && !b.contains("on day 40"));
    let (ca, cb) = (curve(&a, PROFILE_STROKE), curve(&b, PROFILE_STROKE));
    let (da, db) = (profile_data(w, 40), profile_data(w, 149));
    assert_eq!(ca.len(), da.len(), "one point per cell and the surface");
    assert_eq!(cb.len(), db.len());
    // Pixels are whole numbers, so each point sits within a pixel of the straight map
    // value → pixel; the least-squares intercept absorbs the mean rounding, leaving at most
    // one pixel.
    let ta: Vec<f64> = da.iter().map(|p| p.0).collect();
    let za: Vec<f64> = da.iter().map(|p| p.1).collect();
    let (xa, xb) = fit(&ta, &ca.iter().map(|p| p.0).collect::<Vec<_>>());
    let (ya, yb) = fit(&za, &ca.iter().map(|p| p.1).collect::<Vec<_>>());
    assert!(xb > 0.0, "warmer is further right");
    assert!(yb > 0.0, "deeper is further down the page");
    // The same map holds on day 149: the axes did not move with the day.
    for (data, pts, day) in [(&da, &ca, 40), (&db, &cb, 149)] {
        for (&(t, z), &(px, py)) in data.iter().zip(pts) {
            assert_abs(px, xa + xb * t, 1.0, &format!("x of {t} °C on day {day}"));
            assert_abs(py, ya + yb * z, 1.0, &format!("y of {z} m on day {day}"));
        }
    }
    // The curve agrees with the rest of the chart: the line between the layers (the face
    // at 2 m) and the 0 °C line sit where the same map puts them.
    let face = polylines(&a, "#969696");
    assert_eq!(face.len(), 1, "one inner layer face");
    assert_abs(face[0][0].1, ya + yb * 2.0, 1.0, "the face at 2 m");
    let zero = polylines(&a, "#BE2828");
    assert!(!zero.is_empty(), "the 0 °C line");
    for dash in &zero {
        assert_abs(dash[0].0, xa, 1.0, "the 0 °C line");
    }
    // …and the curve moved: the surface is several degrees colder on day 40.
    assert!(da[0].0 < db[0].0 - 3.0, "{} vs {}", da[0].0, db[0].0);
    assert!(ca[0].0 < cb[0].0 - 3.0 * xb, "{:?} vs {:?}", ca[0], cb[0]);
    // The envelope is the same polygon on both days.
    let poly = |s: &str| {
        s.split("<polygon")
            .nth(1)
            .map(|t| attr(t, "points").unwrap().to_string())
    };
    assert!(poly(&a).is_some());
    assert_eq!(poly(&a), poly(&b));
}

#[test]
fn the_snow_of_the_day_is_a_band_above_the_ground() {
    // Snow on days 2 and 3 only; the band's top moves with the day's depth.
    let w = hand_report(
        4,
        |d, z| -5.0 + 2.0 * z + d,
        |d| if d >= 2.0 { 0.1 * d } else { 0.0 },
        |_| 0.2,
    );
    let snow_fill = "#E2EEFA";
    let rect_with = |svg: &str| -> Vec<(f64, f64)> {
        svg.split("<rect")
            .skip(1)
            .filter(|t| attr(t, "fill") == Some(snow_fill))
            .map(|t| {
                (
                    attr(t, "y").unwrap().parse().unwrap(),
                    attr(t, "height").unwrap().parse().unwrap(),
                )
            })
            .collect()
    };
    let bare = winter_profile_svg(&w, 1.0, UnitSystem::Si, 600, 500).unwrap();
    let two = winter_profile_svg(&w, 2.0, UnitSystem::Si, 600, 500).unwrap();
    let three = winter_profile_svg(&w, 3.0, UnitSystem::Us, 600, 500).unwrap();
    for s in [&bare, &two, &three] {
        assert_well_formed(s);
    }
    assert!(rect_with(&bare).is_empty() && !bare.contains("snow"));
    assert!(two.contains("snow 0.20 m"));
    // 0.3 m = 0.984 ft (NIST SP 811: 1 ft = 0.3048 m).
    assert!(three.contains("snow 0.98 ft"));
    let (r2, r3) = (rect_with(&two), rect_with(&three));
    assert_eq!((r2.len(), r3.len()), (1, 1));
    // Both bands stand on the ground surface (same bottom pixel, ±1 for rounding); the
    // deeper snow is taller, in proportion (0.3 / 0.2), within two pixels.
    let bottom = |r: (f64, f64)| r.0 + r.1;
    assert_abs(
        bottom(r2[0]),
        bottom(r3[0]),
        1.0,
        "snow stands on the ground",
    );
    assert_abs(r3[0].1, r2[0].1 * 1.5, 2.0, "snow height in proportion");
    // The layer names are escaped; an empty name is numbered.
    assert!(two.contains("Top &amp; gravel &lt;fill&gt;") && two.contains("layer 2"));
}

#[test]
fn the_ground_series_has_both_axes_the_three_lines_and_the_indices() {
    let w = yard();
    let si = ground_series_svg(w, UnitSystem::Si, 960, 520).unwrap();
    let us = ground_series_svg(w, UnitSystem::Us, 960, 520).unwrap();
    for svg in [&si, &us] {
        assert_well_formed(svg);
        assert!(svg.contains("Day of the run"));
        // A point a day for the temperatures; the flux from the first day on (the run's
        // first instant has taken no step and carries no flux).
        assert_eq!(curve(svg, AIR_STROKE).len(), w.daily.len());
        assert_eq!(curve(svg, PROFILE_STROKE).len(), w.daily.len());
        assert_eq!(curve(svg, FLUX_STROKE).len(), w.daily.len() - 1);
    }
    assert!(si.contains("Temperature (°C)") && si.contains("Heat flux into the ground (W/m²)"));
    assert!(
        us.contains("Temperature (°F)") && us.contains("Heat flux into the ground (Btu/(h·ft²))")
    );
    let (fa, fs) = (w.air_freezing_index_c_days, w.surface_freezing_index_c_days);
    assert!(fa > 1000.0 && fs > 500.0, "a real winter: {fa}, {fs}");
    assert!(si.contains(&format!("Freezing index of the air: {fa:.0} °C·days")));
    assert!(si.contains(&format!(
        "Freezing index of the ground surface: {fs:.0} °C·days"
    )));
    // °F·days = 1.8 × °C·days (a temperature interval, NIST SP 811).
    assert!(us.contains(&format!(
        "Freezing index of the air: {:.0} °F·days",
        1.8 * fa
    )));
    assert!(us.contains(&format!(
        "Freezing index of the ground surface: {:.0} °F·days",
        1.8 * fs
    )));
    // The air line is the data: pixel x linear in day, y linear in temperature (±1 px as
    // above), colder further down.
    let pts = curve(&si, AIR_STROKE);
    let days: Vec<f64> = w.daily.iter().map(|d| d.day).collect();
    let air: Vec<f64> = w.daily.iter().map(|d| d.air_c).collect();
    let (xa, xb) = fit(&days, &pts.iter().map(|p| p.0).collect::<Vec<_>>());
    let (ya, yb) = fit(&air, &pts.iter().map(|p| p.1).collect::<Vec<_>>());
    assert!(xb > 0.0 && yb < 0.0);
    for ((&d, &t), &(px, py)) in days.iter().zip(&air).zip(&pts) {
        assert_abs(px, xa + xb * d, 1.0, "x of a day");
        assert_abs(py, ya + yb * t, 1.0, "y of an air temperature");
    }
}

#[test]
fn degree_days_convert_as_temperature_intervals() {
    // NIST SP 811 B.9: a temperature interval of 1 K is 1.8 °F, with no offset.
    let q = quantity("degree_days").unwrap();
    assert_abs(q.show(UnitSystem::Us, 1000.0), 1800.0, 1e-9, "°F·days");
    assert_abs(q.show(UnitSystem::Us, 0.0), 0.0, 0.0, "no offset");
    assert_abs(q.show(UnitSystem::Si, 1200.0), 1200.0, 0.0, "°C·days");
    assert_eq!(q.unit(UnitSystem::Si).symbol, "°C·days");
    assert_eq!(q.unit(UnitSystem::Us).symbol, "°F·days");
}

#[test]
fn the_xml_check_rejects_broken_documents() {
    assert!(check_xml(
        r#"<?xml version="1.0"?><svg a="1"><g><text>x &amp; y</text></g><rect/></svg>"#
    )
    .is_ok());
    for bad in [
        "<svg><g></svg>",
        "<svg></g></svg>",
        "<svg><text>a & b</text></svg>",
        "<svg><text>a &nbsp; b</text></svg>",
        "<svg a=1></svg>",
        r#"<svg a="1" a="2"></svg>"#,
        r#"<svg a="1></svg>"#,
        "<svg></svg><svg></svg>",
        "<g></g>",
        "<svg>",
        "<svg></svg>tail",
    ] {
        assert!(check_xml(bad).is_err(), "{bad}");
    }
}

/// Both charts of `w`, in both systems, at several days: drawn, and well-formed.
#[track_caller]
fn draws_cleanly(w: &WinterReport, what: &str) -> Vec<String> {
    let mut out = Vec::new();
    for sys in [UnitSystem::Si, UnitSystem::Us] {
        for day in [
            -5.0,
            0.0,
            0.4,
            1.0,
            1e6,
            f64::NAN,
            f64::INFINITY,
            f64::NEG_INFINITY,
        ] {
            let s = winter_profile_svg(w, day, sys, 500, 400)
                .unwrap_or_else(|e| panic!("{what}, day {day}: {e}"));
            assert_well_formed(&s);
            out.push(s);
        }
        let s = ground_series_svg(w, sys, 500, 400).unwrap_or_else(|e| panic!("{what}: {e}"));
        assert_well_formed(&s);
        out.push(s);
    }
    out
}

#[test]
fn odd_reports_draw_without_failing() {
    // All thawed: warm ground, no frost, no snow.
    let thawed = hand_report(30, |d, z| 4.0 + z + 0.1 * d, |_| 0.0, |_| 0.0);
    for s in draws_cleanly(&thawed, "all thawed") {
        assert!(!s.contains("frost depth"), "no frost to mark");
    }
    // One day.
    let one = hand_report(1, |_, z| -2.0 + 3.0 * z, |_| 0.05, |_| 0.3);
    let drawn = draws_cleanly(&one, "one day");
    assert!(has_text(&drawn[0], "Ground temperature on day 0"));
    assert!(drawn[0].contains("frost depth 0.30 m") && drawn[0].contains("snow 0.05 m"));
    // Nothing at all: no days, no profiles, no cells, no layers.
    let mut empty = hand_report(0, |_, _| 0.0, |_| 0.0, |_| 0.0);
    empty.envelope.clear();
    empty.layer_faces_m.clear();
    empty.layer_names.clear();
    let drawn = draws_cleanly(&empty, "empty");
    assert!(has_text(
        &drawn[0],
        "Ground temperature: no profile was kept"
    ));
    // Everything NaN or infinite; mismatched lengths (fewer names and temperatures than
    // layers and cells).
    let mut bad = hand_report(
        5,
        |d, z| if d == 2.0 { f64::NAN } else { z - 3.0 },
        |_| f64::NAN,
        |_| f64::INFINITY,
    );
    bad.daily[1].air_c = f64::INFINITY;
    bad.daily[3].ground_flux_w_m2 = f64::NAN;
    bad.envelope[1] = [f64::NAN, f64::NAN, f64::INFINITY];
    bad.layer_faces_m = vec![0.0, f64::NAN, 2.0, 1.0];
    bad.layer_names.truncate(1);
    bad.profiles[4].temperature_c.truncate(2);
    bad.air_freezing_index_c_days = f64::NAN;
    let drawn = draws_cleanly(&bad, "not finite");
    assert!(drawn
        .last()
        .unwrap()
        .contains("Freezing index of the air: not known"));
    // All days at one day number, huge and tiny values.
    let mut flat = hand_report(3, |_, _| 1e12, |_| 1e9, |_| 1e-300);
    for d in &mut flat.daily {
        d.day = 7.0;
    }
    draws_cleanly(&flat, "one day number, huge values");
}

#[test]
fn odd_scales_and_backends_draw() {
    // The generic functions, as the page calls them with its device pixel ratio.
    let w = yard();
    for scale in [0.0, 1.0, 2.0, 3.5, 100.0, f64::NAN] {
        let mut out = String::new();
        {
            let root = SVGBackend::with_string(&mut out, (800, 600)).into_drawing_area();
            draw_winter_profile(&root, w, 100.0, UnitSystem::Us, scale).unwrap();
        }
        assert_well_formed(&out);
        let mut out = String::new();
        {
            let root = SVGBackend::with_string(&mut out, (800, 600)).into_drawing_area();
            draw_ground_series(&root, w, UnitSystem::Si, scale).unwrap();
        }
        assert_well_formed(&out);
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(64))]
    #[test]
    fn any_day_draws_the_profile_kept_nearest(day in -10.0f64..1000.0) {
        // Profiles are kept at the end of days 0, 1, …, 365: the nearest is the day
        // rounded and held to that range (halves are ambiguous and left out).
        prop_assume!((day.fract().abs() - 0.5).abs() > 1e-6);
        let w = yard();
        let svg = winter_profile_svg(w, day, UnitSystem::Si, 500, 420).unwrap();
        prop_assert!(check_xml(&svg).is_ok());
        let expected = day.round().clamp(0.0, 365.0) + 0.0;
        let caption = format!("Ground temperature on day {expected:.0}");
        prop_assert!(has_text(&svg, &caption), "day {}: no {}", day, caption);
    }
}

#[test]
fn cli_writes_the_day_profile_the_series_and_the_profiles_csv() {
    let dir = test_dir("cli-charts");
    let file = dir.join("yard.json");
    std::fs::write(
        &file,
        examples::example("silty-yard-design-winter").unwrap().json,
    )
    .unwrap();
    let (profile, series, csv) = (
        dir.join("day.svg"),
        dir.join("series.svg"),
        dir.join("profiles.csv"),
    );
    let report = report_of(
        cli()
            .args(["run", file.to_str().unwrap(), "--units", "us"])
            .args([
                "--profile-svg",
                profile.to_str().unwrap(),
                "--profile-day",
                "40",
            ])
            .args(["--series-svg", series.to_str().unwrap()])
            .args(["--profiles-csv", csv.to_str().unwrap()]),
    );
    let cells = report["winter"]["cells"].as_u64().unwrap() as usize;
    let profile = std::fs::read_to_string(profile).unwrap();
    assert_well_formed(&profile);
    assert!(profile.contains("Ground temperature on day 40") && profile.contains("(ft)"));
    let series = std::fs::read_to_string(series).unwrap();
    assert_well_formed(&series);
    assert!(series.contains("°F·days"));

    // The CSV: a header, then one row per day (days 0–365), a day and one temperature per
    // cell in every row.
    let text = std::fs::read_to_string(csv).unwrap();
    let rows: Vec<Vec<&str>> = text.lines().map(|l| l.split(',').collect()).collect();
    assert_eq!(rows.len(), 1 + 366);
    for (i, r) in rows.iter().enumerate() {
        assert_eq!(r.len(), 1 + cells, "row {i}");
    }
    assert_eq!(rows[0][0], "day");
    // Headings name both units and the depths (in ft), which increase.
    let depths: Vec<f64> = rows[0][1..]
        .iter()
        .map(|h| {
            let h = h.strip_prefix("temperature [°F] at ").unwrap();
            h.strip_suffix(" ft").unwrap().parse().unwrap()
        })
        .collect();
    assert!(depths.windows(2).all(|p| p[1] > p[0]));
    // Against the report computed here: depths in ft, temperatures in °F (1 ft = 0.3048 m,
    // °F = 1.8 °C + 32, NIST SP 811), within the rounding of the last decimal written.
    let w = yard();
    assert_eq!(w.envelope.len(), cells);
    for (h, e) in depths.iter().zip(&w.envelope) {
        assert_abs(*h, e[0] / 0.3048, 0.5e-4 + 1e-12, "depth heading");
    }
    for (row, p) in rows[1..].iter().zip(&w.profiles) {
        assert_abs(row[0].parse().unwrap(), p.day, 0.5e-3, "day");
        for (v, t) in row[1..].iter().zip(&p.temperature_c) {
            assert_abs(v.parse().unwrap(), 1.8 * t + 32.0, 0.5e-3 + 1e-9, "°F");
        }
    }

    // Bad input: exit code 2 with a message.
    let bad = |args: &[&str]| {
        let out = cli().arg("run").arg(&file).args(args).output().unwrap();
        assert_eq!(out.status.code(), Some(2), "{args:?}");
        assert!(!out.stderr.is_empty());
    };
    bad(&["--profile-day", "40"]); // a day without a chart to draw it in
    bad(&[
        "--profile-svg",
        dir.join("x.svg").to_str().unwrap(),
        "--profile-day",
        "nan",
    ]);
    bad(&[
        "--profile-svg",
        dir.join("x.svg").to_str().unwrap(),
        "--profile-day",
        "day",
    ]);
    let wall = dir.join("wall.json");
    std::fs::write(&wall, examples::example("snow-block-wall").unwrap().json).unwrap();
    for opt in ["--profiles-csv", "--profile-svg", "--series-svg"] {
        let out = cli()
            .arg("run")
            .arg(&wall)
            .args([opt, dir.join("y").to_str().unwrap()])
            .output()
            .unwrap();
        assert_eq!(out.status.code(), Some(2), "{opt} without a winter");
    }
}

#[test]
fn a_field_map_draws_every_cell_and_finds_the_0c_line_where_it_is() {
    // A field linear in depth, T = 20 z − 10 (°C, z in m), on an uneven grid: the 0 °C line
    // lies at z = 0.5 m exactly (marching squares with linear interpolation along edges is
    // exact for a linear field), across the whole width. The SVG holds one rectangle per
    // cell, the caption, the outlines; US units label the colour bar in °F (NIST SP 811).
    use hibernal::charts::field::{field_map_svg, zero_line, FieldMap, Outline, OutlineKind};
    use hibernal::physics::units::UnitSystem;
    let x: Vec<f64> = [0.0, 0.1, 0.3, 0.6, 1.0, 1.5, 2.2, 3.0].to_vec();
    let z: Vec<f64> = (0..=12).map(|k| (k as f64 * 0.1).powf(1.2)).collect();
    let (nx, nz) = (x.len() - 1, z.len() - 1);
    let mut t = Vec::new();
    for k in 0..nz {
        let zc = 0.5 * (z[k] + z[k + 1]);
        for _ in 0..nx {
            t.push(20.0 * zc - 10.0);
        }
    }
    let outlines = [Outline {
        x0_m: 0.3,
        x1_m: 0.6,
        z0_m: 0.0,
        z1_m: 0.4,
        kind: OutlineKind::Concrete,
        label: "Footing <b>".into(),
    }];
    let f = FieldMap {
        x_faces_m: &x,
        z_faces_m: &z,
        temperature_c: &t,
        outlines: &outlines,
        caption: "Ground on day 90",
    };
    let segs = zero_line(&f).unwrap();
    assert_eq!(segs.len(), nx - 1, "one segment per column gap");
    for s in &segs {
        for p in s {
            assert!((p.1 - 0.5).abs() < 1e-12, "{p:?}");
        }
    }
    let svg = field_map_svg(&f, UnitSystem::Si, 800, 500).unwrap();
    assert!(svg.contains("Ground on day 90"));
    assert!(
        svg.matches("<rect").count() > nx * nz,
        "every cell and the outline"
    );
    // The bar's three labels and the 0 °C line's key.
    assert!(svg.contains("black line:") && svg.matches(" °C").count() >= 4);
    let us = field_map_svg(&f, UnitSystem::Us, 800, 500).unwrap();
    assert!(us.contains("32 °F") && us.contains("(ft)"), "US labels");
    // A field that does not fit its grid is refused, not drawn wrong.
    let short = FieldMap {
        temperature_c: &t[1..],
        ..f.clone()
    };
    assert!(field_map_svg(&short, UnitSystem::Si, 400, 300).is_err());
}
