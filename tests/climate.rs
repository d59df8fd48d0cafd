//! The climate that drives a winter: freezing indices, design values, the periodic
//! climates, n-factors, and daily records read from CSV. Each check names its source.

mod common;
use common::*;

use chrono::NaiveDate;
use hibernal::document::climate_csv::{
    read_daily_csv, BadLines, CsvOptions, DensityUnit, DepthUnit, TemperatureUnit, MAX_CSV_BYTES,
    MAX_REPORTED_PROBLEMS,
};
use hibernal::physics::climate::{
    design_freezing_index, design_winter_amplitudes_k, freezing_degree_days_sum,
    freezing_index_c_days, sinusoid_freezing_index_c_days, surface_freezing_index_c_days,
    thawing_index_c_days, Climate, DailySeries, DayRecord, DesignOptions, Surface, MAX_SERIES_DAYS,
    SECONDS_PER_DAY,
};
use proptest::prelude::*;
use std::f64::consts::PI;

fn date(s: &str) -> NaiveDate {
    NaiveDate::parse_from_str(s, "%Y-%m-%d").unwrap()
}

/// Composite Simpson's rule on [a, b] with n (even) intervals.
fn simpson(f: impl Fn(f64) -> f64, a: f64, b: f64, n: usize) -> f64 {
    let h = (b - a) / n as f64;
    let mut s = f(a) + f(b);
    for i in 1..n {
        let w = if i % 2 == 1 { 4.0 } else { 2.0 };
        s += w * f(a + i as f64 * h);
    }
    s * h / 3.0
}

// ---------------------------------------------------------------- freezing indices

#[test]
fn freezing_index_of_a_hand_worked_series() {
    // Definition: TM 5-852-6 / UFC 3-130-01 via models.md §4 (range of the cumulative
    // degree-day curve) and the plain sum of (0 − T) over days below 0 °C.
    // Daily means  2, −3, −5, 1, −4, 3 °C.
    // Cumulative   2, −1, −6, −5, −9, −6 °C·d (0 before the first day).
    // Largest fall from a maximum to a later minimum: 2 → −9, so 11 °C·d.
    // Sum of (0 − T) below 0: 3 + 5 + 4 = 12 °C·d (the +1 day inside the season is what
    // separates them: 12 − 1 = 11).
    // Thawing index (largest rise from a minimum to a later maximum): 0 → 2 is 2, −9 → −6
    // is 3, so 3 °C·d.
    let t = [2.0, -3.0, -5.0, 1.0, -4.0, 3.0];
    // Sums of a few small integers are exact in binary floating point.
    assert_eq!(freezing_index_c_days(&t), 11.0);
    assert_eq!(freezing_degree_days_sum(&t), 12.0);
    assert_eq!(thawing_index_c_days(&t), 3.0);
    // No frost, no index.
    assert_eq!(freezing_index_c_days(&[1.0, 2.0, 0.0]), 0.0);
    assert_eq!(freezing_index_c_days(&[]), 0.0);
}

#[test]
fn freezing_index_of_a_sine_shaped_winter_equals_the_closed_form_integral() {
    // A winter of S = 150 days, T(τ) = −A sin(π τ / S), between warm spells at +3 °C. The
    // mean of each day k (τ from k to k + 1) is the exact integral of the sine over that day
    // (calculus: ∫ sin(πτ/S) dτ = −(S/π) cos(πτ/S)):
    //   T_k = −(A S / π) (cos(π k / S) − cos(π (k + 1) / S)),
    // so the freezing index, summed over the season, is the closed form 2 A S / π.
    let (a, s) = (18.0, 150usize);
    let mut temps = vec![3.0; 40];
    for k in 0..s {
        let (k0, k1) = (k as f64, k as f64 + 1.0);
        temps
            .push(-(a * s as f64 / PI) * ((PI * k0 / s as f64).cos() - (PI * k1 / s as f64).cos()));
    }
    temps.extend(vec![3.0; 60]);
    let closed = 2.0 * a * s as f64 / PI;
    // 150 rounded terms: a relative error of 1e-12 is a thousand times the rounding.
    assert_rel(freezing_index_c_days(&temps), closed, 1e-12, "sine winter");
    // With no thaw inside the season the range and the plain sum agree.
    assert_rel(freezing_degree_days_sum(&temps), closed, 1e-12, "sum");
}

#[test]
fn a_mid_winter_thaw_separates_the_range_from_the_plain_sum() {
    // models.md §4: the freezing index is the range of the cumulative curve, not the sum
    // of freezing degree-days. Hand calculation:
    // 30 days at −10 °C, 10 days at +4 °C, 30 days at −10 °C.
    // Sum of (0 − T) below 0: 300 + 300 = 600 °C·d. Cumulative curve: 0 → −300 → −260 →
    // −560; range from the maximum (0) to the minimum (−560) = 560 °C·d: the thaw's
    // +40 °C·d is taken off.
    let mut t = vec![-10.0; 30];
    t.extend(vec![4.0; 10]);
    t.extend(vec![-10.0; 30]);
    assert_eq!(freezing_degree_days_sum(&t), 600.0);
    assert_eq!(freezing_index_c_days(&t), 560.0);
    // A thaw longer than the cold spell before it (30 days at +15 °C: +450 > 300) lifts
    // the curve above its earlier maximum: the range restarts there and is 300, one spell,
    // while the sum still counts both: 600.
    let mut t = vec![-10.0; 30];
    t.extend(vec![15.0; 30]);
    t.extend(vec![-10.0; 30]);
    assert_eq!(freezing_degree_days_sum(&t), 600.0);
    assert_eq!(freezing_index_c_days(&t), 300.0);
}

// ---------------------------------------------------------------- design values

/// Winters starting 1 July of `first_year` + i, each with 100 days at −a_i °C from
/// 1 November and +5 °C on every other day; the series starts 1 March of `first_year`
/// (an incomplete winter first) and ends 150 days into the season after the last winter
/// (an incomplete one last). By construction the freezing index of winter i is 100 a_i (the warm days
/// before the maximum and after the minimum do not count).
fn constructed_winters(
    first_year: i32,
    start_month: u32,
    cold_from_month: u32,
    a: &[f64],
) -> DailySeries {
    let start = NaiveDate::from_ymd_opt(first_year, 3, 1).unwrap();
    let end = NaiveDate::from_ymd_opt(first_year + a.len() as i32, start_month, 1).unwrap()
        + chrono::Days::new(150);
    let mut days = Vec::new();
    let mut d = start;
    while d <= end {
        let season_year =
            if d >= NaiveDate::from_ymd_opt(chrono::Datelike::year(&d), start_month, 1).unwrap() {
                chrono::Datelike::year(&d)
            } else {
                chrono::Datelike::year(&d) - 1
            };
        let i = (season_year - first_year) as usize;
        let cold_start = NaiveDate::from_ymd_opt(
            if cold_from_month >= start_month {
                season_year
            } else {
                season_year + 1
            },
            cold_from_month,
            1,
        )
        .unwrap();
        let cold = i < a.len()
            && d >= cold_start
            && (d - cold_start).num_days() < 100
            && season_year >= first_year;
        days.push(DayRecord::new(d, if cold { -a[i] } else { 5.0 }));
        d = d.succ_opt().unwrap();
    }
    DailySeries::new(days).unwrap()
}

#[test]
fn design_values_of_a_constructed_multi_year_series() {
    // Known by construction (see constructed_winters): indices 100 a_i. The three coldest
    // are a = 15, 14, 12 (winters 3, 6, 1) → mean 1366.67; the coldest is 1500 (winter 3).
    // Design values as defined in models.md §4 (after TM 5-852-6).
    let a = [8.0, 12.0, 5.0, 15.0, 9.0, 11.0, 14.0, 7.0, 10.0, 6.0];
    let s = constructed_winters(2001, 7, 11, &a);
    let d = design_freezing_index(&s, &DesignOptions::default()).unwrap();
    assert_eq!(
        d.winters.len(),
        a.len(),
        "incomplete winters at both ends are left out"
    );
    for (w, ai) in d.winters.iter().zip(a) {
        assert_rel(w.freezing_index_c_days, 100.0 * ai, 1e-12, "winter index");
        assert!(w.complete);
    }
    assert_rel(
        d.mean_of_three_coldest_c_days,
        (1500.0 + 1400.0 + 1200.0) / 3.0,
        1e-12,
        "mean of three",
    );
    assert_rel(d.coldest_c_days, 1500.0, 1e-12, "coldest");
    assert_eq!(
        d.three_coldest_starts,
        [date("2004-07-01"), date("2007-07-01"), date("2002-07-01")]
    );
    assert_eq!(d.winters[0].start, date("2001-07-01"));
    assert_eq!(d.winters[0].end, date("2002-06-30"));
    assert!(
        !d.warnings.is_empty(),
        "ten winters are fewer than the 30 of the source"
    );

    // The cold spells run from 1 November to 8 February: split at 1 January instead, every
    // one is cut in two, and no season reaches the coldest winter's 1500. This is why
    // northern winters are split in July.
    let jan = s.seasons(1).unwrap();
    let max_jan = jan
        .iter()
        .map(|x| x.freezing_index_c_days)
        .fold(0.0, f64::max);
    assert!(
        max_jan < 1500.0,
        "a January split cuts the winters: {max_jan}"
    );
}

#[test]
fn design_values_in_the_southern_hemisphere() {
    // Seasons from 1 January; cold spells of 100 days from 1 June (southern winter). Same
    // construction, same expectations (models.md §4 definitions).
    let a = [6.0, 9.0, 4.0, 7.0];
    let s = constructed_winters(2001, 1, 6, &a);
    let o = DesignOptions {
        season_start_month: 1,
        min_complete_winters: 3,
    };
    let d = design_freezing_index(&s, &o).unwrap();
    let got: Vec<f64> = d.winters.iter().map(|w| w.freezing_index_c_days).collect();
    // The series starts 1 March 2001: the 2001 season is incomplete, so winters 2002–2004.
    assert_eq!(d.winters[0].start, date("2002-01-01"));
    assert_eq!(got.len(), 3);
    for (g, ai) in got.iter().zip(&a[1..]) {
        assert_rel(*g, 100.0 * ai, 1e-12, "southern winter");
    }
    assert_rel(d.coldest_c_days, 900.0, 1e-12, "coldest");
}

#[test]
fn too_few_winters_are_refused_with_a_clear_message() {
    let s = constructed_winters(2001, 7, 11, &[8.0, 12.0]);
    let e = design_freezing_index(&s, &DesignOptions::default()).unwrap_err();
    assert_eq!(e.kind.id(), "too_few_winters");
    let msg = e.to_string();
    assert!(msg.contains("2 complete winters"), "{msg}");
    assert!(msg.contains("1 July"), "{msg}");
    assert!(msg.contains("at least 3"), "{msg}");
    // Asking for more than three is honoured.
    let s = constructed_winters(2001, 7, 11, &[8.0, 12.0, 5.0, 15.0]);
    let o = DesignOptions {
        min_complete_winters: 30,
        ..DesignOptions::default()
    };
    let msg = design_freezing_index(&s, &o).unwrap_err().to_string();
    assert!(
        msg.contains("4 complete winters") && msg.contains("at least 30"),
        "{msg}"
    );
    // A split month outside 1–12 names its field.
    let o = DesignOptions {
        season_start_month: 13,
        ..DesignOptions::default()
    };
    assert_eq!(
        design_freezing_index(&s, &o).unwrap_err().field,
        "season_start_month"
    );
}

// ---------------------------------------------------------------- periodic climates

#[test]
fn design_winter_integral_equals_the_requested_index() {
    // The construction documented on Climate::DesignWinter; checked by numerical
    // quadrature (composite Simpson), independent of the closed form. Simpson's error on
    // A sin(πτ/S) over [0, S] with n intervals is at most A S π⁴ / (180 n⁴); relative to
    // F = 2AS/π that is π⁵/(360 n⁴) ≈ 4e-14 for n = 2000, so 1e-9 is a safe bound.
    for &(f, s, m) in &[
        (1500.0, 150.0, 2.0),
        (3000.0, 200.0, -4.0),
        (80.0, 40.0, 9.0),
        (2000.0, 300.0, -5.0),
    ] {
        let c = Climate::DesignWinter {
            freezing_index_c_days: f,
            season_days: s,
            mean_annual_c: m,
            snow: None,
        };
        c.validate("climate").unwrap();
        let t = |tau_d: f64| c.air_temperature_c(tau_d * SECONDS_PER_DAY);
        let frozen = simpson(|x| -t(x), 0.0, s, 2000);
        assert_rel(frozen, f, 1e-9, "freezing degree-days of the design winter");
        let warm = simpson(t, s, 365.0, 2000);
        assert_rel((warm - frozen) / 365.0, m, 1e-9, "mean annual temperature");
        // Below zero exactly inside the season, at or above it outside: sampled hourly.
        for h in 1..(365 * 24) {
            let x = h as f64 / 24.0;
            if x < s {
                assert!(t(x) < 0.0, "frozen at day {x}");
            } else if x > s {
                assert!(t(x) >= 0.0, "warm at day {x}");
            }
        }
        // Periodic, one year.
        assert_abs(t(10.0), t(375.0), 1e-9, "periodic");
        assert_eq!(c.duration_s(), 365.0 * SECONDS_PER_DAY);
        // The daily means' freezing index approaches F (midpoint sampling of a smooth curve).
        let daily: Vec<f64> = (0..365).map(|k| t(k as f64 + 0.5)).collect();
        assert_rel(freezing_index_c_days(&daily), f, 1e-3, "daily means");
    }
    let (a, b) = design_winter_amplitudes_k(1500.0, 150.0, 2.0);
    assert!(a > 0.0 && b > 0.0);
}

#[test]
fn a_design_winter_colder_than_its_index_allows_is_refused() {
    // M ≥ −F/365 is needed (see Climate::DesignWinter): F = 730, so M ≥ −2 °C.
    let c = Climate::DesignWinter {
        freezing_index_c_days: 730.0,
        season_days: 150.0,
        mean_annual_c: -2.5,
        snow: None,
    };
    let e = c.validate("climate").unwrap_err();
    assert_eq!(e.0[0].field, "climate.mean_annual_c");
    assert!(e.to_string().contains("-2.000"), "{e}");
    let c = Climate::DesignWinter {
        freezing_index_c_days: 730.0,
        season_days: 365.0,
        mean_annual_c: 0.0,
        snow: None,
    };
    assert_eq!(
        c.validate("climate").unwrap_err().0[0].field,
        "climate.season_days"
    );
}

#[test]
fn sinusoid_coldest_moment_mean_and_freezing_index() {
    // T = mean − amplitude cos(2π (t − t_c)/P) (documented on Climate::Sinusoid).
    let c = Climate::Sinusoid {
        mean_c: -2.0,
        amplitude_k: 15.0,
        coldest_day_of_year: 20,
        snow: None,
    };
    c.validate("climate").unwrap();
    let year = 365.0 * SECONDS_PER_DAY;
    // Coldest moment, searched minute by minute: noon of day 20, at mean − amplitude.
    let (mut best_t, mut best) = (0.0, f64::INFINITY);
    for m in 0..(365 * 24 * 60) {
        let t = m as f64 * 60.0;
        let v = c.air_temperature_c(t);
        if v < best {
            best = v;
            best_t = t;
        }
    }
    assert_abs(best_t, 19.5 * SECONDS_PER_DAY, 60.0, "coldest moment, s");
    assert_abs(best, -17.0, 1e-9, "coldest temperature");
    // Mean over one period by Simpson: a trigonometric polynomial is integrated exactly (to
    // rounding) by the composite rule over a full period.
    let mean = simpson(|t| c.air_temperature_c(t), 0.0, year, 1000) / year;
    assert_abs(mean, -2.0, 1e-9, "annual mean");
    // Closed-form freezing index against numerical integration of max(0, −T) in days
    // (trapezoid-like error at the two kinks, O(h²): 1e-6 relative with 2e6 intervals).
    let numeric = simpson(
        |d| (-c.air_temperature_c(d * SECONDS_PER_DAY)).max(0.0),
        0.0,
        365.0,
        2_000_000,
    );
    assert_rel(
        sinusoid_freezing_index_c_days(-2.0, 15.0),
        numeric,
        1e-6,
        "sinusoid freezing index",
    );
    assert_eq!(sinusoid_freezing_index_c_days(20.0, 15.0), 0.0);
    assert_rel(
        sinusoid_freezing_index_c_days(-20.0, 15.0),
        20.0 * 365.0,
        1e-12,
        "always frozen",
    );
    // Bad parameters name their fields.
    let bad = Climate::Sinusoid {
        mean_c: -50.0,
        amplitude_k: 45.0,
        coldest_day_of_year: 366,
        snow: None,
    };
    let fields: Vec<String> = bad
        .validate("climate")
        .unwrap_err()
        .0
        .into_iter()
        .map(|e| e.field)
        .collect();
    assert_eq!(
        fields,
        ["climate.amplitude_k", "climate.coldest_day_of_year"]
    );
}

#[test]
fn a_series_interpolates_between_noons_and_holds_at_the_ends() {
    // Convention documented on DailySeries::air_temperature_c; arithmetic by hand.
    let d0 = date("2020-01-01");
    let mut days: Vec<DayRecord> = [-4.0, 2.0, 6.0]
        .iter()
        .enumerate()
        .map(|(i, &t)| DayRecord::new(d0 + chrono::Days::new(i as u64), t))
        .collect();
    days[0].snow_depth_m = Some(0.30);
    days[0].snow_density_kg_m3 = Some(200.0);
    days[1].snow_depth_m = Some(0.20);
    days[1].snow_density_kg_m3 = Some(300.0);
    let c = Climate::Series(DailySeries::new(days).unwrap());
    let h = SECONDS_PER_DAY / 24.0;
    assert_eq!(c.air_temperature_c(12.0 * h), -4.0, "noon of day 1");
    assert_eq!(c.air_temperature_c(0.0), -4.0, "held before the first noon");
    assert_eq!(c.air_temperature_c(-1e9), -4.0, "held before the start");
    assert_abs(
        c.air_temperature_c(24.0 * h),
        -1.0,
        1e-12,
        "midnight: halfway from −4 to 2",
    );
    assert_abs(
        c.air_temperature_c(42.0 * h),
        3.0,
        1e-12,
        "day 2, 18:00: a quarter from 2 to 6",
    );
    assert_eq!(
        c.air_temperature_c(3.0 * SECONDS_PER_DAY + 1e6),
        6.0,
        "held after the end"
    );
    assert_eq!(c.duration_s(), 3.0 * SECONDS_PER_DAY);
    let s = c.snow_at(24.0 * h).unwrap();
    assert_abs(s.depth_m, 0.25, 1e-12, "depth halfway");
    assert_abs(s.density_kg_m3.unwrap(), 250.0, 1e-9, "density halfway");
    assert!(
        c.snow_at(2.9 * SECONDS_PER_DAY).is_none(),
        "day 3 has no observation"
    );
    assert_eq!(
        c.snow_at(1.6 * SECONDS_PER_DAY).unwrap().depth_m,
        0.20,
        "nearer day decides"
    );
    assert!(Climate::Sinusoid {
        mean_c: 0.0,
        amplitude_k: 1.0,
        coldest_day_of_year: 1,
        snow: None,
    }
    .snow_at(0.0)
    .is_none());
    assert!(c.air_temperature_c(f64::NAN).is_finite(), "no panic on NaN");
}

#[test]
fn a_series_refuses_gaps_disorder_and_impossible_values_naming_the_day() {
    let d = |s: &str, t: f64| DayRecord::new(date(s), t);
    let mut dense = d("2020-01-04", -5.0);
    dense.snow_depth_m = Some(0.1);
    dense.snow_density_kg_m3 = Some(950.0);
    let mut orphan = d("2020-01-05", -5.0);
    orphan.snow_density_kg_m3 = Some(300.0);
    let days = vec![
        d("2020-01-01", -5.0),
        d("2020-01-03", -95.0),
        dense,
        orphan,
        d("2020-01-05", 1.0),
    ];
    let e = DailySeries::new(days).unwrap_err();
    let got: Vec<(String, &str)> = e.0.iter().map(|e| (e.field.clone(), e.kind.id())).collect();
    assert_eq!(
        got,
        [
            ("days[1].mean_air_c".to_string(), "out_of_bounds"),
            ("days[1].date".to_string(), "date_gap"),
            ("days[2].snow_density_kg_m3".to_string(), "out_of_bounds"),
            ("days[3].snow_density_kg_m3".to_string(), "not_covered"),
            ("days[4].date".to_string(), "date_out_of_order"),
        ]
    );
    assert!(
        e.to_string()
            .contains("1 day missing between 2020-01-01 and 2020-01-03"),
        "{e}"
    );
    // The length cap.
    let d0 = date("1800-01-01");
    let long: Vec<DayRecord> = (0..=MAX_SERIES_DAYS as u64)
        .map(|i| DayRecord::new(d0 + chrono::Days::new(i), 0.0))
        .collect();
    assert_eq!(DailySeries::new(long).unwrap_err().0[0].kind.id(), "count");
    assert!(DailySeries::new(vec![]).is_err());
}

#[test]
fn n_factors_and_surface_freezing_index() {
    // UFC 3-130-04 Table 4-1 (freezing n-factors), via models.md §4.
    let expect = [
        ("snow", 1.0),
        ("concrete", 0.75),
        ("asphalt", 0.7),
        ("bare-soil", 0.7),
        ("shaded", 0.9),
        ("turf", 0.5),
        ("tree-covered", 0.3),
    ];
    assert_eq!(Surface::ALL.len(), expect.len());
    for (id, n) in expect {
        let s = Surface::from_id(id).unwrap();
        assert_eq!(s.freezing_n_factor(), n, "{id}");
        assert!(s.source().contains("UFC 3-130-04") && !s.name().is_empty());
    }
    // Surface freezing index = n × air freezing index (same source): 0.5 × 1200 = 600.
    let turf = Surface::Turf.freezing_n_factor();
    assert_eq!(surface_freezing_index_c_days(turf, 1200.0), 600.0);
}

// ---------------------------------------------------------------- CSV

fn csv_ok(text: &str, o: &CsvOptions) -> hibernal::document::climate_csv::CsvImport {
    read_daily_csv(text, o).unwrap_or_else(|e| panic!("{e}"))
}

#[test]
fn csv_in_fahrenheit_and_inches_converts_by_nist_factors() {
    // NIST SP 811 Appendix B: T/°C = (T/°F − 32)/1.8; 1 in = 0.0254 m, 1 ft = 0.3048 m
    // (exact); 1 lb/ft³ = 16.018 46 kg/m³.
    let text = "date, air temp (°F), snow depth [in], snow density (lb/ft3)\n\
                2021-01-01,-40,12,15\n\
                2021-01-02,32,0,\n\
                2021-01-03,212,1.5,\n";
    let o = CsvOptions {
        temperature: TemperatureUnit::Fahrenheit,
        snow_depth: DepthUnit::Inch,
        snow_density: DensityUnit::LbPerFt3,
        ..CsvOptions::default()
    };
    // 212 °F = 100 °C is beyond the −90..60 °C accepted: refused, quoting what was written.
    let e = read_daily_csv(text, &o).unwrap_err();
    assert_eq!(e.problems.len(), 1);
    let msg = e.to_string();
    assert!(
        msg.starts_with("line 4, mean air temperature: must be between -90 and 60 °C (got 100)"),
        "{msg}"
    );
    assert!(msg.contains("written 212 °F"), "{msg}");

    let text = text.replace("212", "50");
    let r = csv_ok(&text, &o);
    let days = r.series.days();
    // Conversions through the core's factors are within a few ulps of the exact values.
    assert_abs(days[0].mean_air_c, -40.0, 1e-12, "−40 °F = −40 °C");
    assert_abs(days[1].mean_air_c, 0.0, 1e-12, "32 °F = 0 °C");
    assert_abs(days[2].mean_air_c, 10.0, 1e-12, "50 °F = 10 °C");
    assert_rel(
        days[0].snow_depth_m.unwrap(),
        0.3048,
        1e-12,
        "12 in = 0.3048 m",
    );
    assert_rel(days[2].snow_depth_m.unwrap(), 0.0381, 1e-12, "1.5 in");
    // NIST's 16.018 46 has 7 significant figures.
    assert_rel(
        days[0].snow_density_kg_m3.unwrap(),
        15.0 * 16.01846,
        1e-6,
        "15 lb/ft³",
    );
    assert_eq!(days[1].snow_density_kg_m3, None);
    assert_eq!(r.skipped_lines, 0);

    // Feet and centimetres.
    let o = CsvOptions {
        snow_depth: DepthUnit::Foot,
        ..CsvOptions::default()
    };
    let r = csv_ok("date,temperature,snow\n2021-01-01,-3,2\n", &o);
    assert_rel(
        r.series.days()[0].snow_depth_m.unwrap(),
        0.6096,
        1e-12,
        "2 ft",
    );
    let o = CsvOptions {
        snow_depth: DepthUnit::Centimetre,
        ..CsvOptions::default()
    };
    let r = csv_ok(
        "Date,Mean_Air_Temperature,Snow-Depth\n2021-01-01,-3,45\n",
        &o,
    );
    assert_rel(
        r.series.days()[0].snow_depth_m.unwrap(),
        0.45,
        1e-12,
        "45 cm",
    );
}

#[test]
fn csv_bad_lines_are_all_reported_by_line_number_and_nothing_is_imported() {
    // Line numbers as a text editor counts them: comments and empty lines count.
    let text = "# an invented test file\n\
                date,mean air temperature,snow depth\n\
                \n\
                2021-01-01,-3,0.1\n\
                2021-01-02,abc,0.1\n\
                2021-01-03,-4,-0.2\n\
                2021-01-04,-4,\n\
                2021-13-05,-4,\n\
                2021-01-06,,0.1\n\
                2021-01-07,-4,0.1,7\n";
    let e = read_daily_csv(text, &CsvOptions::default()).unwrap_err();
    let lines: Vec<String> = e.to_string().lines().map(str::to_string).collect();
    assert_eq!(
        lines,
        [
            "line 5, mean air temperature: 'abc' is not a number",
            "line 6, snow depth: must be between 0 and 20 m (got -0.2)",
            "line 8, date: '2021-13-05' is not a day of the calendar",
            "line 9, mean air temperature: missing: this column is required",
            "line 10: 4 cells, but the header names 3 columns",
        ],
    );
    assert_eq!(e.more, 0);
}

#[test]
fn csv_gaps_and_out_of_order_dates_are_reported() {
    let text = "date,temperature\n\
                2021-01-01,-3\n\
                2021-01-02,-3\n\
                2021-01-05,-3\n\
                2021-01-04,-3\n\
                2021-01-06,-3\n\
                2021-01-06,-3\n";
    let e = read_daily_csv(text, &CsvOptions::default()).unwrap_err();
    let lines: Vec<&str> = e.problems.iter().map(|p| p.kind.id()).collect();
    assert_eq!(
        lines,
        ["date_gap", "date_out_of_order", "date_out_of_order"]
    );
    let msg = e.to_string();
    assert!(
        msg.contains("line 4, date: 2 days missing between 2021-01-02 and 2021-01-05"),
        "{msg}"
    );
    assert!(
        msg.contains("line 5, date: 2021-01-04 does not come after the previous date 2021-01-05"),
        "{msg}"
    );
    assert!(
        msg.contains("line 7, date: 2021-01-06 does not come after the previous date 2021-01-06"),
        "{msg}"
    );
    // Gaps up to the chosen length are filled linearly and counted: 2021-01-02 at −3 and
    // 2021-01-05 at 3 → the 3rd at −1 and the 4th at 1 (hand arithmetic).
    let o = CsvOptions {
        max_gap_fill_days: 2,
        ..CsvOptions::default()
    };
    let r = csv_ok("date,temperature\n2021-01-02,-3\n2021-01-05,3\n", &o);
    assert_eq!(r.filled_days, 2);
    let t: Vec<f64> = r.series.days().iter().map(|d| d.mean_air_c).collect();
    assert_eq!(t.len(), 4);
    assert_abs(t[1], -1.0, 1e-12, "filled");
    assert_abs(t[2], 1.0, 1e-12, "filled");
    let o = CsvOptions {
        max_gap_fill_days: 1,
        ..CsvOptions::default()
    };
    assert_eq!(
        read_daily_csv("date,temperature\n2021-01-02,-3\n2021-01-05,3\n", &o)
            .unwrap_err()
            .problems[0]
            .kind
            .id(),
        "date_gap"
    );
}

#[test]
fn csv_skip_mode_leaves_bad_lines_out_and_counts_them() {
    let text = "date,temperature\n\
                2021-01-01,-3\n\
                2021-01-02,x\n\
                2021-01-02,-2\n\
                2021-01-03,-1\n\
                2021-01-02,-9\n\
                2021-01-04,999\n\
                2021-01-04,0\n";
    let o = CsvOptions {
        bad_lines: BadLines::Skip,
        ..CsvOptions::default()
    };
    // Line 3 (not a number), line 6 (out of order), line 7 (out of range) are skipped.
    let r = csv_ok(text, &o);
    assert_eq!(r.skipped_lines, 3);
    let skipped_at: Vec<Option<usize>> = r.skipped.iter().map(|p| p.line).collect();
    assert_eq!(skipped_at, [Some(3), Some(6), Some(7)]);
    let t: Vec<f64> = r.series.days().iter().map(|d| d.mean_air_c).collect();
    assert_eq!(t, [-3.0, -2.0, -1.0, 0.0]);
    // A skipped line that leaves a hole is a gap: refused, unless filling is allowed.
    let text = "date,temperature\n2021-01-01,-3\n2021-01-02,x\n2021-01-03,-1\n";
    let e = read_daily_csv(text, &o).unwrap_err();
    assert_eq!(e.problems[0].line, Some(4));
    assert_eq!(e.problems[0].kind.id(), "date_gap");
    let o = CsvOptions {
        bad_lines: BadLines::Skip,
        max_gap_fill_days: 1,
        ..CsvOptions::default()
    };
    let r = csv_ok(text, &o);
    assert_eq!((r.skipped_lines, r.filled_days, r.series.len()), (1, 1, 3));
    assert_abs(
        r.series.days()[1].mean_air_c,
        -2.0,
        1e-12,
        "filled between −3 and −1",
    );
}

#[test]
fn csv_lists_at_most_the_cap_and_says_how_many_more() {
    let mut text = String::from("date,temperature\n");
    for i in 0..80 {
        let d = date("2021-01-01") + chrono::Days::new(i);
        text.push_str(&format!("{d},oops\n"));
    }
    let e = read_daily_csv(&text, &CsvOptions::default()).unwrap_err();
    assert_eq!(e.problems.len(), MAX_REPORTED_PROBLEMS);
    assert_eq!(e.more, 80 - MAX_REPORTED_PROBLEMS);
    assert!(e.to_string().ends_with("… and 30 more problems"), "{e}");
}

#[test]
fn csv_header_problems_are_named() {
    let o = CsvOptions::default();
    let msg = |t: &str| read_daily_csv(t, &o).unwrap_err().to_string();
    assert!(msg("date,temperature (K)\n").contains("'K' is not a unit this column takes"));
    assert!(msg("date,temprature\n").contains("line 1, column 2: 'temprature' is not a column"));
    assert!(msg("# c\n\ndate,snow depth\n")
        .contains("line 3, mean air temperature: this column is required and missing"));
    assert!(msg("date,temp,air temperature\n").contains("named twice"));
    assert!(msg("").contains("no header line"));
    assert!(msg("date,temp\n\n").contains("no days"));
    // SI keys carry their unit.
    let r = csv_ok(
        "date,mean_air_c,snow_depth_m,snow_density_kg_m3\n2021-01-01,-3,0.4,250\n",
        &o,
    );
    assert_eq!(r.series.days()[0].snow_density_kg_m3, Some(250.0));
    // Column order is free; quoted cells and CRLF are fine.
    let r = csv_ok("\"Snow Depth\",Day,Temp\r\n\"0.2\",2021-01-01,-3\r\n", &o);
    assert_eq!(r.series.days()[0].snow_depth_m, Some(0.2));
    // Too large.
    let big = "x".repeat(MAX_CSV_BYTES + 1);
    assert!(read_daily_csv(&big, &o)
        .unwrap_err()
        .to_string()
        .contains("at most"));
}

#[test]
fn invented_examples_match_the_independent_python_reference() {
    // tools/climate_examples.py made both files and, independently (Python datetime for the
    // winters, its own implementation of the TM 5-852-6 definitions, NIST SP 811
    // conversions), tests/data/climate_reference.json. Same inputs, same order of
    // summation: 1e-9 relative allows for any difference in rounding.
    let reference: serde_json::Value =
        serde_json::from_str(include_str!("data/climate_reference.json")).unwrap();

    let name = "cold-inland-valley-five-winters.csv";
    let r = &reference["examples"][name];
    let o = CsvOptions {
        snow_depth: DepthUnit::Centimetre,
        ..CsvOptions::default()
    };
    let imp = csv_ok(
        include_str!("../scenarios/climate/cold-inland-valley-five-winters.csv"),
        &o,
    );
    assert_eq!(imp.series.len() as u64, r["days"].as_u64().unwrap());
    assert_eq!(
        imp.series.first_date().to_string(),
        r["first_date"].as_str().unwrap()
    );
    assert!(imp.series.has_snow());
    let d = design_freezing_index(&imp.series, &DesignOptions::default()).unwrap();
    let rw = r["winters"].as_array().unwrap();
    assert_eq!(d.winters.len(), rw.len());
    for (w, x) in d.winters.iter().zip(rw) {
        assert_eq!(w.start.to_string(), x["start"].as_str().unwrap());
        assert_rel(
            w.freezing_index_c_days,
            f(x, "freezing_index_c_days"),
            1e-9,
            "winter freezing index",
        );
        assert_rel(
            w.freezing_degree_days_c_days,
            f(x, "freezing_degree_days_c_days"),
            1e-9,
            "winter sum",
        );
    }
    assert_rel(
        d.mean_of_three_coldest_c_days,
        f(r, "mean_of_three_coldest_c_days"),
        1e-9,
        "mean of three coldest",
    );
    assert_rel(d.coldest_c_days, f(r, "coldest_c_days"), 1e-9, "coldest");

    let name = "windswept-upland-one-winter-fahrenheit.csv";
    let r = &reference["examples"][name];
    let o = CsvOptions {
        temperature: TemperatureUnit::Fahrenheit,
        snow_depth: DepthUnit::Inch,
        ..CsvOptions::default()
    };
    let imp = csv_ok(
        include_str!("../scenarios/climate/windswept-upland-one-winter-fahrenheit.csv"),
        &o,
    );
    assert_eq!(imp.series.len() as u64, r["days"].as_u64().unwrap());
    let t = imp.series.mean_air_c();
    assert_rel(
        freezing_index_c_days(&t),
        f(r, "freezing_index_c_days"),
        1e-9,
        "freezing index",
    );
    assert_rel(
        freezing_degree_days_sum(&t),
        f(r, "freezing_degree_days_c_days"),
        1e-9,
        "sum",
    );
    let max_depth = imp
        .series
        .days()
        .iter()
        .filter_map(|d| d.snow_depth_m)
        .fold(0.0, f64::max);
    assert_rel(max_depth, f(r, "max_snow_depth_m"), 1e-12, "deepest snow");
    for spot in r["spot"].as_array().unwrap() {
        let day = imp
            .series
            .days()
            .iter()
            .find(|d| d.date.to_string() == spot["date"].as_str().unwrap())
            .unwrap();
        assert_abs(day.mean_air_c, f(spot, "mean_air_c"), 1e-12, "°F → °C");
        assert_abs(
            day.snow_depth_m.unwrap(),
            f(spot, "snow_depth_m"),
            1e-12,
            "in → m",
        );
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(300))]

    /// Any text: no panic, and the answer is bounded.
    #[test]
    fn arbitrary_text_never_panics(text in "\\PC{0,400}", skip in any::<bool>(), fill in 0u32..5) {
        let o = CsvOptions {
            bad_lines: if skip { BadLines::Skip } else { BadLines::Refuse },
            max_gap_fill_days: fill,
            ..CsvOptions::default()
        };
        match read_daily_csv(&text, &o) {
            Ok(r) => prop_assert!(r.series.len() <= MAX_SERIES_DAYS && r.skipped.len() <= MAX_REPORTED_PROBLEMS),
            Err(e) => {
                prop_assert!(!e.problems.is_empty() && e.problems.len() <= MAX_REPORTED_PROBLEMS);
                prop_assert!(e.to_string().len() < 400 * MAX_REPORTED_PROBLEMS);
            }
        }
    }

    /// CSV-shaped text with random cells reaches the per-line checks: no panic, bounded, and
    /// every problem names a line.
    #[test]
    fn csv_shaped_text_never_panics(
        rows in prop::collection::vec(
            (prop::sample::select(vec!["2021-01-01", "2021-01-02", "2021-01-03", "2021-01-09", "1999-12-31", "2021-02-30", "", "x", "+002021-01-01", "9999-12-31"]),
             prop::sample::select(vec!["-3", "1e308", "NaN", "inf", "", "abc", "-90.1", "59.9", "0"]),
             prop::sample::select(vec!["", "0", "-1", "25", "0.3", "1e-300"]),
             prop::sample::select(vec!["", "10", "9", "917", "300", "x"])),
            0..30),
        skip in any::<bool>(),
        fill in 0u32..32,
    ) {
        let mut text = String::from("date,temperature,snow depth,snow density\n");
        for (a, b, c, d) in rows {
            text.push_str(&format!("{a},{b},{c},{d}\n"));
        }
        let o = CsvOptions {
            bad_lines: if skip { BadLines::Skip } else { BadLines::Refuse },
            max_gap_fill_days: fill,
            ..CsvOptions::default()
        };
        match read_daily_csv(&text, &o) {
            Ok(r) => prop_assert!(r.series.len() <= 30 * 32 + 30),
            Err(e) => prop_assert!(e.problems.len() <= MAX_REPORTED_PROBLEMS),
        }
    }
}

#[test]
fn a_record_brought_into_a_scenario_carries_its_winters_and_design_values() {
    // The page's import: the invented five-winter record (tools/climate_examples.py) read
    // with the units its header names. Its design values must be those of the climate
    // module's own design_freezing_index on the same series (the TM 5-852-6 definitions:
    // mean of the three coldest winters, the coldest), and its days the series' days in SI.
    use hibernal::document::climate_import::{import_csv, ImportOptions};
    let text = include_str!("../scenarios/climate/cold-inland-valley-five-winters.csv");
    let o = ImportOptions {
        temperature: "°C".into(),
        snow_depth: Some("cm".into()),
        snow_density: Some("kg/m³".into()),
        skip_bad_lines: false,
        fill_gaps_days: 0,
        season_start_month: Some(7),
    };
    let out = import_csv(text, &o);
    assert!(out.ok, "{:?}", out.problems);
    let s = out.summary.as_ref().unwrap();
    let direct = read_daily_csv(
        text,
        &CsvOptions {
            snow_depth: DepthUnit::Centimetre,
            ..CsvOptions::default()
        },
    )
    .unwrap();
    let d = hibernal::physics::climate::design_freezing_index(
        &direct.series,
        &hibernal::physics::climate::DesignOptions::default(),
    )
    .unwrap();
    let design = s
        .design
        .as_ref()
        .expect("five complete winters give design values");
    assert_eq!(design.complete_winters, d.winters.len());
    assert_eq!(
        design.mean_of_three_coldest_c_days,
        d.mean_of_three_coldest_c_days
    );
    assert_eq!(design.coldest_c_days, d.coldest_c_days);
    assert_eq!(out.days.len(), direct.series.len());
    assert!(s.has_snow);
    // Snow in cm became metres.
    let (doc, rec) = out
        .days
        .iter()
        .zip(direct.series.days())
        .find(|(x, _)| x.snow_depth_m.unwrap_or(0.0) > 0.0)
        .unwrap();
    assert_eq!(doc.snow_depth_m, rec.snow_depth_m);
    // The same records summarised again (a scenario opened later) give the same summary.
    let again = hibernal::document::climate_import::summarise_days(&out.days, 7).unwrap();
    assert_eq!(again.winters, s.winters);
}

#[test]
fn a_bad_record_is_refused_line_by_line_and_a_bad_unit_by_its_option() {
    use hibernal::document::climate_import::{import_csv, ImportOptions};
    let o = |t: &str| ImportOptions {
        temperature: t.into(),
        snow_depth: None,
        snow_density: None,
        skip_bad_lines: false,
        fill_gaps_days: 0,
        season_start_month: None,
    };
    let text = "date,temperature\n2021-01-01,-3\n2021-01-02,abc\n2021-01-03,-4\n";
    let out = import_csv(text, &o("°C"));
    assert!(!out.ok);
    assert_eq!(out.problems.len(), 1);
    assert_eq!(out.problems[0].line, Some(3));
    assert!(
        out.problems[0].message.starts_with("line 3"),
        "{}",
        out.problems[0].message
    );
    let out = import_csv(text, &o("kelvin"));
    assert!(!out.ok);
    assert_eq!(out.errors[0].field, "import.temperature");
}

// ------------------------------------------------------------- snow season, annual wave

use hibernal::physics::climate::{fit_annual_wave, SnowSeason};

fn season(start: f64, peak: f64, end: f64) -> SnowSeason {
    SnowSeason {
        start_day: start,
        peak_day: peak,
        end_day: end,
        peak_depth_m: 0.6,
        fresh_density_kg_m3: 100.0,
        settled_density_kg_m3: 300.0,
    }
}

#[test]
fn a_snow_season_rises_and_falls_linearly_and_wraps_over_the_year_end() {
    // The documented shape of SnowSeason (a construction of this tool): depth linear from 0
    // at the start to the peak and back to 0 at the end, density linear from fresh to
    // settled over the season; days modulo 365. Hand-worked values.
    let s = season(300.0, 20.0, 100.0); // 165 days: peak after 85, end after 165
    let at = |day: f64| s.at(day * SECONDS_PER_DAY);
    assert!(at(299.0).is_none() && at(101.0).is_none() && at(200.0).is_none());
    let c = at(342.5).unwrap(); // 42.5 days in: half-way to the peak
    assert_abs(c.depth_m, 0.3, 1e-12, "half-way up");
    assert_abs(
        c.density_kg_m3.unwrap(),
        100.0 + 200.0 * 42.5 / 165.0,
        1e-9,
        "density",
    );
    assert_abs(at(20.0).unwrap().depth_m, 0.6, 1e-12, "peak");
    assert_abs(at(60.0).unwrap().depth_m, 0.3, 1e-12, "half-way down");
    // Day 365 + 60 of a second year is the same day.
    assert_eq!(at(425.0), at(60.0));
    // The same season written with its end beyond 365.
    let unwrapped = season(300.0, 385.0, 465.0);
    for d in [0.0, 10.0, 60.0, 99.0, 310.0, 350.0, 400.0, 500.0] {
        let (a, b) = (at(d), unwrapped.at(d * SECONDS_PER_DAY));
        match (a, b) {
            (Some(a), Some(b)) => {
                assert_abs(a.depth_m, b.depth_m, 1e-9, "same depth");
                assert_abs(
                    a.density_kg_m3.unwrap(),
                    b.density_kg_m3.unwrap(),
                    1e-9,
                    "same density",
                );
            }
            (a, b) => assert_eq!(a, b, "day {d}"),
        }
    }
    // The climates carry it; the series is unchanged by it.
    let c = Climate::Sinusoid {
        mean_c: 0.0,
        amplitude_k: 10.0,
        coldest_day_of_year: 20,
        snow: Some(s),
    };
    c.validate("climate").unwrap();
    assert_abs(
        c.snow_at(20.0 * SECONDS_PER_DAY).unwrap().depth_m,
        0.6,
        1e-12,
        "from the climate",
    );
    assert!(c.snow_at(f64::NAN).is_none(), "no panic on NaN");
}

#[test]
fn a_snow_season_out_of_range_is_refused_naming_the_field() {
    let field = |s: SnowSeason| {
        let mut errs = hibernal::physics::error::InputErrors::default();
        s.validate("winter.climate.snow", &mut errs);
        errs.0.into_iter().map(|e| e.field).collect::<Vec<_>>()
    };
    assert!(field(season(300.0, 20.0, 100.0)).is_empty());
    let mut s = season(300.0, 20.0, 100.0);
    s.peak_depth_m = 6.0;
    assert_eq!(field(s), ["winter.climate.snow.peak_depth_m"]);
    s = season(300.0, 20.0, 100.0);
    s.settled_density_kg_m3 = 80.0;
    assert_eq!(field(s), ["winter.climate.snow.settled_density_kg_m3"]);
    s.fresh_density_kg_m3 = 700.0;
    assert_eq!(field(s), ["winter.climate.snow.fresh_density_kg_m3"]);
    assert_eq!(
        field(season(300.0, 200.0, 100.0)),
        ["winter.climate.snow.peak_day"]
    );
    assert_eq!(
        field(season(10.0, 100.0, 700.0)),
        ["winter.climate.snow.end_day"]
    );
    assert_eq!(
        field(season(-1.0, 100.0, 200.0)),
        ["winter.climate.snow.start_day"]
    );
    s = season(300.0, 20.0, 100.0);
    s.peak_depth_m = f64::NAN;
    assert_eq!(field(s), ["winter.climate.snow.peak_depth_m"]);
}

#[test]
fn annual_waves_of_the_three_climates() {
    // A sinusoid's own parameters; a design winter whose season is half the year and whose
    // mean is 0 is the pure sinusoid −A sin(2π τ / 365), A = πF/(2S) (its construction), so
    // its wave has that amplitude and is coldest at τ = 91.25 d; a daily series sampled from
    // a sinusoid gives that sinusoid back (least squares on exact samples), over whole years
    // and over part of a year. 1e-6 K (the design winter's hourly quadrature) and 1e-9.
    let c = Climate::Sinusoid {
        mean_c: -1.5,
        amplitude_k: 17.0,
        coldest_day_of_year: 25,
        snow: None,
    };
    let w = c.annual_wave();
    assert_eq!((w.mean_c, w.amplitude_k), (-1.5, 17.0));
    assert_abs(w.coldest_s, 24.5 * SECONDS_PER_DAY, 1e-9, "coldest");
    let d = Climate::DesignWinter {
        freezing_index_c_days: 1000.0,
        season_days: 182.5,
        mean_annual_c: 0.0,
        snow: None,
    };
    let w = d.annual_wave();
    assert_abs(w.mean_c, 0.0, 1e-12, "design mean");
    assert_abs(
        w.amplitude_k,
        PI * 1000.0 / (2.0 * 182.5),
        1e-6,
        "design amplitude",
    );
    assert_abs(
        w.coldest_s / SECONDS_PER_DAY,
        91.25,
        1e-6,
        "design coldest day",
    );
    let sine = |t: f64| {
        3.0 - 11.0 * (2.0 * PI * (t - 200.0 * SECONDS_PER_DAY) / (365.0 * SECONDS_PER_DAY)).cos()
    };
    for n_days in [3 * 365 + 100, 200] {
        let days: Vec<DayRecord> = (0..n_days)
            .map(|i| {
                let t = (i as f64 + 0.5) * SECONDS_PER_DAY;
                DayRecord::new(date("2001-07-01") + chrono::Days::new(i as u64), sine(t))
            })
            .collect();
        let w = Climate::Series(DailySeries::new(days).unwrap()).annual_wave();
        assert_abs(w.mean_c, 3.0, 1e-9, "series mean");
        assert_abs(w.amplitude_k, 11.0, 1e-9, "series amplitude");
        assert_abs(
            w.coldest_s / SECONDS_PER_DAY,
            200.0,
            1e-7,
            "series coldest day",
        );
    }
    // Too little to fix a wave: the mean, no wave.
    let w = fit_annual_wave(&[0.0, 1.0], &[2.0, 4.0]);
    assert_eq!((w.mean_c, w.amplitude_k), (3.0, 0.0));
}

// ------------------------------------------------------------- header units and names

/// A one-day file under a header, read with the default options (°C, m, kg/m³ chosen).
fn first_day(header: &str, row: &str) -> DayRecord {
    *csv_ok(&format!("{header}\n{row}\n"), &CsvOptions::default())
        .series
        .days()
        .first()
        .expect("one day")
}

#[test]
fn units_named_in_the_header_win_over_the_chosen_ones() {
    // Conversions by NIST SP 811 Appendix B (1 in = 0.0254 m, 1 ft = 0.3048 m exactly,
    // T/°C = (T/°F − 32)/1.8, 1 lb/ft³ = 16.018 46 kg/m³) and the SI prefixes.
    let depth = |h: &str, v: f64| {
        let d = first_day(&format!("date,temp,{h}"), &format!("2021-01-01,-3,{v}"));
        d.snow_depth_m.expect("a depth")
    };
    for (header, written, metres) in [
        ("snow_depth_cm", 45.0, 0.45),
        ("snow depth (cm)", 45.0, 0.45),
        ("Snow Depth [mm]", 450.0, 0.45),
        ("snow depth mm", 450.0, 0.45),
        ("SNWD_in", 12.0, 0.3048),
        ("snow (ft)", 2.0, 0.6096),
        ("snow_depth_m", 0.45, 0.45),
        ("snow depth", 0.45, 0.45),
    ] {
        assert_rel(depth(header, written), metres, 1e-12, header);
    }
    let air =
        |h: &str, v: f64| first_day(&format!("date,{h}"), &format!("2021-01-01,{v}")).mean_air_c;
    for (header, written, celsius) in [
        ("tmean_f", 14.0, -10.0),
        ("Mean Air Temperature (°F)", 14.0, -10.0),
        ("average air temperature [degF]", 14.0, -10.0),
        ("avg air temp F", 14.0, -10.0),
        ("t_mean_degC", -10.0, -10.0),
        ("temp (C)", -10.0, -10.0),
        ("TEMP °C", -10.0, -10.0),
        ("mean_air_c", -10.0, -10.0),
        ("TMEAN", -10.0, -10.0),
    ] {
        assert_abs(air(header, written), celsius, 1e-12, header);
    }
    let density = |h: &str, v: f64| {
        let d = first_day(
            &format!("date,temp,snow depth,{h}"),
            &format!("2021-01-01,-3,0.3,{v}"),
        );
        d.snow_density_kg_m3.expect("a density")
    };
    for (header, written, si) in [
        ("snow_density_kg_m3", 250.0, 250.0),
        ("snow density (kg/m³)", 250.0, 250.0),
        ("Snow Density [kg/m3]", 250.0, 250.0),
        ("snow density lb/ft3", 15.0, 15.0 * 16.01846),
        ("snow_density_lb_ft3", 15.0, 15.0 * 16.01846),
    ] {
        assert_rel(density(header, written), si, 1e-6, header);
    }
    // The header's unit wins over a contradicting choice, and the import says so.
    let o = CsvOptions {
        temperature: TemperatureUnit::Fahrenheit,
        snow_depth: DepthUnit::Metre,
        ..CsvOptions::default()
    };
    let r = csv_ok(
        "date,temperature (°C),snow depth (cm)\n2021-01-01,-3,45\n",
        &o,
    );
    assert_abs(
        r.series.days()[0].mean_air_c,
        -3.0,
        1e-12,
        "°C as the header says",
    );
    assert_rel(r.series.days()[0].snow_depth_m.unwrap(), 0.45, 1e-12, "cm");
    let said: Vec<(&str, &str, bool)> = r
        .header_units
        .iter()
        .map(|h| (h.column.name(), h.unit, h.overrides()))
        .collect();
    assert_eq!(
        said,
        [
            ("mean air temperature", "°C", true),
            ("snow depth", "cm", true)
        ]
    );
    // With no unit in the header, the chosen units are used.
    let r = csv_ok(
        "date,temp,snow depth\n2021-01-01,14,10\n",
        &CsvOptions {
            temperature: TemperatureUnit::Fahrenheit,
            snow_depth: DepthUnit::Inch,
            ..CsvOptions::default()
        },
    );
    assert_abs(r.series.days()[0].mean_air_c, -10.0, 1e-12, "14 °F chosen");
    assert_rel(
        r.series.days()[0].snow_depth_m.unwrap(),
        0.254,
        1e-12,
        "10 in chosen",
    );
    assert!(r.header_units.is_empty());
    // A unit the column cannot take is still refused, naming the column.
    let e = read_daily_csv("date,snow depth (°F),temp\n", &CsvOptions::default()).unwrap_err();
    assert!(
        e.to_string()
            .contains("line 1, snow depth: '°F' is not a unit this column takes"),
        "{e}"
    );
}

#[test]
fn the_import_summary_names_the_header_units_and_each_winters_freezing_season() {
    use hibernal::document::climate_import::{import_csv, ImportOptions};
    // Three invented winters of 365 days, each 100 days at −10 °C after 265 at +5 °C; the
    // winters start 1 July (the default), the record 1 July 2004 (no 29 February in it).
    let mut text = String::from("Date,T_MEAN (°F),snow_depth_cm\n");
    let mut day = date("2004-07-01");
    for _ in 0..3 {
        for k in 0..365 {
            let (t, snow) = if (200..300).contains(&k) {
                (14.0, 30.0)
            } else {
                (41.0, 0.0)
            };
            text.push_str(&format!("{day},{t},{snow}\n"));
            day = day.succ_opt().unwrap();
        }
    }
    let o = ImportOptions {
        temperature: "°C".into(),
        snow_depth: Some("m".into()),
        snow_density: None,
        skip_bad_lines: false,
        fill_gaps_days: 0,
        season_start_month: Some(7),
    };
    let out = import_csv(&text, &o);
    assert!(out.ok, "{:?}", out.problems);
    let s = out.summary.unwrap();
    let units: Vec<(&str, &str, &str, bool)> = s
        .header_units
        .iter()
        .map(|u| (u.column, u.unit, u.chosen, u.overrides))
        .collect();
    assert_eq!(
        units,
        [
            ("mean air temperature", "°F", "°C", true),
            ("snow depth", "cm", "m", true)
        ]
    );
    // Each winter: 100 days below 0 °C, freezing index 100 × 10 = 1000 °C·days (the range
    // of its cumulative curve, TM 5-852-6).
    let complete: Vec<_> = s.winters.iter().filter(|w| w.complete).collect();
    assert_eq!(complete.len(), 3, "{:?}", s.winters);
    for w in &complete {
        assert_eq!(w.freezing_season_days, 100, "{w:?}");
        assert_abs(w.freezing_index_c_days, 1000.0, 1e-9, "index");
    }
    // The design winter built from it carries that season and the record's snow.
    let dw = s
        .design_winter
        .expect("three complete winters give a design winter");
    assert_abs(dw.freezing_index_c_days, 1000.0, 1e-9, "design index");
    assert_abs(dw.season_days, 100.0, 0.0, "season: days below 0 °C");
    // Mean of the year: (265 × 5 − 100 × 10) / 365 °C.
    assert_abs(
        dw.mean_annual_c,
        (265.0 * 5.0 - 1000.0) / 365.0,
        1e-9,
        "mean",
    );
    let snow = dw.snow.expect("the record has snow");
    assert_eq!(dw.snow_winters, 3);
    // Freeze-up is day 200 of each winter (the day after the cumulative curve's top): the
    // snow lies from freeze-up, deepest (the first deepest day) on freeze-up, gone 100 days on.
    assert_eq!(
        (snow.start_day, snow.peak_day, snow.end_day),
        (0.0, 0.0, 100.0)
    );
    assert_rel(snow.peak_depth_m, 0.30, 1e-12, "30 cm");
    // No densities recorded: those of a new snow season (defaults), settled not lighter.
    let fallback = hibernal::document::defaults::snow_season("design-winter").unwrap();
    assert_eq!(snow.fresh_density_kg_m3, fallback.fresh_density_kg_m3);
    assert_eq!(snow.settled_density_kg_m3, fallback.settled_density_kg_m3);
}

#[test]
fn a_snow_season_fitted_to_a_record_takes_the_mean_of_its_winters() {
    use hibernal::document::climate_import::{import_csv, ImportOptions};
    // Three invented winters from 1 July 2004: freezing from day 180 to 299 (120 days at
    // −8 °C), snow from day 160 + 10 k (k = 0, 1, 2: before freeze-up), rising to
    // 40 + 10 k cm on day 240, gone on day 310 + k; densities 120 kg/m³ over the first two
    // weeks of cover, 300 over the last two, 200 between.
    let mut text = String::from("date,mean air temperature,snow depth (cm),snow density\n");
    let mut day = date("2004-07-01");
    for k in 0..3 {
        let (start, end, peak) = (160 + 10 * k, 310 + k, 40.0 + 10.0 * k as f64);
        for i in 0..365 {
            let t = if (180..300).contains(&i) { -8.0 } else { 6.0 };
            let snow = if i < start || i >= end {
                "0,".to_string()
            } else {
                let depth = if i <= 240 {
                    peak * f64::from(i - start + 1) / f64::from(241 - start)
                } else {
                    peak * f64::from(end - i) / f64::from(end - 240)
                };
                let rho = if i < start + 14 {
                    120.0
                } else if i >= end - 14 {
                    300.0
                } else {
                    200.0
                };
                format!("{depth},{rho}")
            };
            text.push_str(&format!("{day},{t},{snow}\n"));
            day = day.succ_opt().unwrap();
        }
    }
    let o = ImportOptions {
        temperature: "°C".into(),
        snow_depth: None,
        snow_density: Some("kg/m³".into()),
        skip_bad_lines: false,
        fill_gaps_days: 0,
        season_start_month: Some(7),
    };
    let out = import_csv(&text, &o);
    assert!(out.ok, "{:?}", out.problems);
    let dw = out.summary.unwrap().design_winter.unwrap();
    assert_abs(dw.season_days, 120.0, 0.0, "120 days below 0 °C");
    let s = dw.snow.unwrap();
    // Freeze-up on day 180: first snow 20, 10 and 0 days before it (a mean of 10 days
    // before: day 355 of the design year, which wraps), the deepest on day 240 (60 days
    // on), gone on days 310, 311, 312 (a mean of 131 days on).
    assert_eq!((s.start_day, s.peak_day, s.end_day), (355.0, 60.0, 131.0));
    assert_rel(s.peak_depth_m, 0.50, 1e-12, "mean of 40, 50 and 60 cm");
    assert_eq!(
        (s.fresh_density_kg_m3, s.settled_density_kg_m3),
        (120.0, 300.0)
    );
    // The season is one a design winter accepts (the core's own checks).
    let season = hibernal::physics::climate::SnowSeason::from(s);
    let mut errs = hibernal::physics::error::InputErrors::default();
    season.validate("snow", &mut errs);
    assert!(errs.is_empty(), "{errs:?}");
}
