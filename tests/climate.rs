//! The climate that drives a winter: freezing indices, design values, the periodic
//! climates and n-factors. Each check names its source.

mod common;
use common::*;

use chrono::NaiveDate;
use hibernal::climate::{
    design_freezing_index, design_winter_amplitudes_k, freezing_degree_days_sum,
    freezing_index_c_days, sinusoid_freezing_index_c_days, surface_freezing_index_c_days,
    thawing_index_c_days, Climate, DailySeries, DayRecord, DesignOptions, Surface, MAX_SERIES_DAYS,
    SECONDS_PER_DAY,
};
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
    };
    let e = c.validate("climate").unwrap_err();
    assert_eq!(e.0[0].field, "climate.mean_annual_c");
    assert!(e.to_string().contains("-2.000"), "{e}");
    let c = Climate::DesignWinter {
        freezing_index_c_days: 730.0,
        season_days: 365.0,
        mean_annual_c: 0.0,
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
        coldest_day_of_year: 1
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
