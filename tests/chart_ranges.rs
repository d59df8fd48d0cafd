//! The range charts (the spread of one result over Monte Carlo runs, one-at-a-time
//! sensitivity): well-formed SVG, percentiles and the base case written in the chosen units,
//! histogram bars that are the stated bin rule's bins and sum to the finite values, bars in
//! the order given with each end on its side of the base line, and no failure on odd data.
//!
//! Expected unit conversions are written out by hand from NIST SP 811 (1 ft = 0.3048 m
//! exactly; °F = 1.8·°C + 32). Pixel positions are checked against a straight line fitted
//! through the axis's own tick labels, so a tolerance of 2 px covers rounding to whole
//! pixels (the SVG backend writes integers) and the tick labels' own rounding.

mod common;
use common::*;

use hibernal::charts::ranges::{
    draw_sensitivity, draw_spread, histogram, pack_labels, sensitivity_svg, spread_svg, Histogram,
    SensitivityChart, SpreadChart, LARGEST_DRAWN, MAX_BINS, MIN_BINS,
};
use hibernal::physics::ranges::Pcg32;
use hibernal::physics::units::UnitSystem;
use plotters::prelude::*;
use proptest::prelude::*;

/// One `<text>` element: its opening tag and its trimmed contents.
struct TextEl {
    tag: String,
    content: String,
}

impl TextEl {
    fn num(&self, name: &str) -> f64 {
        attr(&self.tag, name).unwrap().parse().unwrap()
    }
    fn anchor(&self) -> &str {
        attr(&self.tag, "text-anchor").unwrap()
    }
}

fn texts(svg: &str) -> Vec<TextEl> {
    svg.split("<text")
        .skip(1)
        .filter_map(|t| {
            let start = t.find('>')? + 1;
            let end = t.find("</text>")?;
            Some(TextEl {
                tag: format!(" {}", &t[..start - 1]),
                content: t[start..end].trim().to_string(),
            })
        })
        .collect()
}

/// The one `<text>` reading exactly `s`.
#[track_caller]
fn text<'a>(all: &'a [TextEl], s: &str) -> &'a TextEl {
    let found: Vec<&TextEl> = all.iter().filter(|t| t.content == s).collect();
    assert_eq!(found.len(), 1, "{s:?} in {:?}", contents(all));
    found[0]
}

fn contents(all: &[TextEl]) -> Vec<&str> {
    all.iter().map(|t| t.content.as_str()).collect()
}

fn has_text(svg: &str, s: &str) -> bool {
    texts(svg).iter().any(|t| t.content == s)
}

/// The value of attribute `name` in a tag's text.
fn attr<'a>(tag: &'a str, name: &str) -> Option<&'a str> {
    let key = format!(" {name}=\"");
    let start = tag.find(&key)? + key.len();
    let len = tag[start..].find('"')?;
    Some(&tag[start..start + len])
}

/// Every `<rect>` filled with `fill`: (x, y, width, height) in pixels.
fn rects(svg: &str, fill: &str) -> Vec<(f64, f64, f64, f64)> {
    svg.split("<rect")
        .skip(1)
        .map(|t| format!(" {}", &t[..t.find('>').unwrap()]))
        .filter(|t| attr(t, "fill") == Some(fill))
        .map(|t| {
            let n = |k: &str| attr(&t, k).unwrap().parse::<f64>().unwrap();
            (n("x"), n("y"), n("width"), n("height"))
        })
        .collect()
}

/// Least-squares line pixel = a + b·value.
fn fit(points: &[(f64, f64)]) -> (f64, f64) {
    let n = points.len() as f64;
    let mv = points.iter().map(|p| p.0).sum::<f64>() / n;
    let mp = points.iter().map(|p| p.1).sum::<f64>() / n;
    let cov: f64 = points.iter().map(|p| (p.0 - mv) * (p.1 - mp)).sum();
    let var: f64 = points.iter().map(|p| (p.0 - mv) * (p.0 - mv)).sum();
    let b = cov / var;
    (mp - b * mv, b)
}

/// The x axis's pixel line, from its tick labels (centred, hanging below the axis, numbers).
fn x_axis(all: &[TextEl]) -> (f64, f64) {
    let ticks: Vec<(f64, f64)> = all
        .iter()
        .filter(|t| t.anchor() == "middle" && attr(&t.tag, "dy") == Some("0.76em"))
        .filter_map(|t| Some((t.content.parse::<f64>().ok()?, t.num("x"))))
        .collect();
    assert!(ticks.len() >= 3, "x ticks {ticks:?}");
    fit(&ticks)
}

/// The y axis's pixel line, from its whole-number tick labels (right-aligned, centred).
fn y_axis(all: &[TextEl]) -> (f64, f64) {
    let ticks: Vec<(f64, f64)> = all
        .iter()
        .filter(|t| t.anchor() == "end" && attr(&t.tag, "dy") == Some("0.5ex"))
        .filter_map(|t| Some((t.content.parse::<u64>().ok()? as f64, t.num("y"))))
        .collect();
    assert!(ticks.len() >= 3, "y ticks {ticks:?}");
    fit(&ticks)
}

const HIST_FILL: &str = "#466EAA";
const SPAN_FILL: &str = "#7896C8";
const MEMBER_STROKE: &str = "#284682";
const LOW_FILL: &str = "#3C78BE";
const HIGH_FILL: &str = "#D27828";

/// `n` values uniform on [a, b) from a fixed PCG32 stream.
fn uniform(n: usize, a: f64, b: f64, seed: u64) -> Vec<f64> {
    let mut g = Pcg32::new(seed, 54);
    (0..n).map(|_| a + (b - a) * g.next_open01()).collect()
}

/// The bin rule written out again, apart from the chart's code: Freedman–Diaconis width
/// 2·IQR·n^(−1/3) with type-7 quartiles, √n bins when the IQR is 0, held to 8–40 and to n;
/// equal widths over [min, max]. Returns the counts.
fn independent_bins(values: &[f64]) -> Vec<usize> {
    let mut v: Vec<f64> = values.iter().copied().filter(|x| x.is_finite()).collect();
    v.sort_by(|a, b| a.partial_cmp(b).unwrap());
    let n = v.len();
    let q = |p: f64| {
        let h = (n - 1) as f64 * p;
        let j = h.floor() as usize;
        let g = h - j as f64;
        if j + 1 < n {
            v[j] * (1.0 - g) + v[j + 1] * g
        } else {
            v[n - 1]
        }
    };
    let (lo, hi) = (v[0], v[n - 1]);
    if hi == lo {
        return vec![n];
    }
    let iqr = q(0.75) - q(0.25);
    let raw = if iqr > 0.0 {
        ((hi - lo) / (2.0 * iqr * (n as f64).powf(-1.0 / 3.0))).ceil() as usize
    } else {
        (n as f64).sqrt().ceil() as usize
    };
    let k = raw.clamp(8, 40).min(n);
    let w = (hi - lo) / k as f64;
    let mut counts = vec![0; k];
    for x in v {
        counts[(((x - lo) / w) as usize).min(k - 1)] += 1;
    }
    counts
}

fn spread<'a>(values: &'a [f64], members: &'a [(&'a str, f64)]) -> SpreadChart<'a> {
    SpreadChart {
        title: "Deepest frost",
        quantity: "depth",
        values,
        p10: 0.9,
        p50: 1.2,
        p90: 1.45,
        base: 1.15,
        runs: values.len(),
        seed: 42,
        failed: 0,
        members,
    }
}

const MEMBERS: [(&str, f64); 3] = [
    ("Sturm et al. 1997", 1.10),
    ("regression B", 1.32),
    ("regression C", 1.05),
];

#[test]
fn one_to_a_hundred_bins_as_counted_by_hand() {
    // 1…100: quartiles 25.75 and 75.25 (type 7), IQR 49.5, width 2·49.5/100^(1/3) = 21.33,
    // ⌈99/21.33⌉ = 5 bins, raised to 8 of width 99/8 = 12.375; counting 1…100 into
    // [1, 13.375), [13.375, 25.75), … by hand gives 13, 12, 13, 12, 12, 13, 12, 13.
    let v: Vec<f64> = (1..=100).map(f64::from).collect();
    let h = histogram(&v).unwrap();
    assert_eq!(
        h,
        Histogram {
            lo: 1.0,
            width: 12.375,
            counts: vec![13, 12, 13, 12, 12, 13, 12, 13],
        }
    );
}

#[test]
fn the_bin_rule_is_freedman_diaconis_held_to_its_bounds() {
    // Uniform on [0, 1): IQR ≈ 0.5, so k ≈ n^(1/3): about 10 bins for 1000 values, and
    // the bounds reached at 100 values (≈ 4.6 → 8) and 200 000 (≈ 58 → 40).
    for (n, lo_k, hi_k) in [(1000, 9, 11), (100, 8, 8), (200_000, 40, 40)] {
        let v = uniform(n, 0.0, 1.0, 7);
        let h = histogram(&v).unwrap();
        assert!(
            (lo_k..=hi_k).contains(&h.counts.len()),
            "{n} values: {} bins",
            h.counts.len()
        );
        assert_eq!(h.counts, independent_bins(&v), "{n} values");
        assert_eq!(h.counts.iter().sum::<usize>(), n);
    }
    // Over half the values equal: the IQR is 0 and √70 → 9 bins.
    let mut v: Vec<f64> = (1..=10).map(f64::from).collect();
    v.extend(std::iter::repeat(5.0).take(60));
    let h = histogram(&v).unwrap();
    assert_eq!(h.counts.len(), 9);
    assert_eq!(h.counts, independent_bins(&v));
    // Fewer values than the least bin count: no more bins than values.
    assert_eq!(histogram(&[1.0, 2.0, 4.0]).unwrap().counts.len(), 3);
    // All equal: one bin of width 0; nothing finite: none.
    let h = histogram(&[2.5, 2.5, f64::NAN, 2.5]).unwrap();
    assert_eq!((h.lo, h.width, h.counts), (2.5, 0.0, vec![3]));
    assert!(histogram(&[]).is_none());
    assert!(histogram(&[f64::NAN, f64::INFINITY, f64::NEG_INFINITY]).is_none());
    assert_eq!((MIN_BINS, MAX_BINS), (8, 40));
}

#[test]
fn the_spread_writes_its_percentiles_and_base_case_in_the_chosen_units() {
    let v = uniform(400, 0.8, 1.6, 3);
    let c = spread(&v, &MEMBERS);
    let si = spread_svg(&c, UnitSystem::Si, 800, 500).unwrap();
    let us = spread_svg(&c, UnitSystem::Us, 800, 500).unwrap();
    for svg in [&si, &us] {
        assert_well_formed(svg);
        assert!(has_text(svg, "Deepest frost"));
        assert!(has_text(svg, "Runs in each bin"));
        assert!(has_text(svg, "400 runs, seed 42"), "no failures, no count");
    }
    // Depth keeps 3 decimals in m, 2 in ft: 0.9 m = 2.953 ft, 1.2 m = 3.937 ft,
    // 1.45 m = 4.757 ft, 1.15 m = 3.773 ft, 1.05 m = 3.445 ft, 1.32 m = 4.331 ft.
    for s in [
        "P10 0.900 m",
        "P50 1.200 m",
        "P90 1.450 m",
        "base case 1.150 m",
        "Deepest frost (m)",
        "Snow regressions: 1.050 to 1.320 m",
    ] {
        assert!(has_text(&si, s), "{s}");
    }
    for s in [
        "P10 2.95 ft",
        "P50 3.94 ft",
        "P90 4.76 ft",
        "base case 3.77 ft",
        "Deepest frost (ft)",
        "Snow regressions: 3.44 to 4.33 ft",
    ] {
        assert!(has_text(&us, s), "{s}");
    }
    assert!(!us.contains(" m<") && !us.contains("(m)"));
    // Each label sits beside its line: 4 px right of it (left of it for those in the right
    // third), at the value's place on the x axis in the unit shown.
    for (svg, f) in [(&si, 1.0), (&us, 1.0 / 0.3048)] {
        let all = texts(svg);
        let (a, b) = x_axis(&all);
        let label = |name: &str, si_v: f64, unit: &str, dec: usize| {
            let t = text(&all, &format!("{name} {:.*} {unit}", dec, si_v * f));
            let x = a + b * si_v * f;
            let off = if t.anchor() == "start" { 4.0 } else { -4.0 };
            assert!(
                (t.num("x") - (x + off)).abs() <= 2.0,
                "{name}: label at {} for a line at {x}",
                t.num("x")
            );
        };
        let (unit, dec) = if f == 1.0 { ("m", 3) } else { ("ft", 2) };
        label("P10", 0.9, unit, dec);
        label("P50", 1.2, unit, dec);
        label("P90", 1.45, unit, dec);
        label("base case", 1.15, unit, dec);
    }
    // A temperature converts with its offset: −5 °C = 23.0 °F.
    let t = SpreadChart {
        quantity: "temperature",
        p50: -5.0,
        ..spread(&v, &[])
    };
    let svg = spread_svg(&t, UnitSystem::Us, 800, 500).unwrap();
    assert!(
        has_text(&svg, "P50 23.0 °F"),
        "{:?}",
        contents(&texts(&svg))
    );
    // Failures are counted on the caption line.
    let f = SpreadChart {
        failed: 3,
        ..spread(&v, &[])
    };
    let svg = spread_svg(&f, UnitSystem::Si, 800, 500).unwrap();
    assert!(has_text(&svg, "400 runs, seed 42, 3 failed"));
}

#[test]
fn the_histogram_bars_are_the_bins_and_their_heights_sum_to_the_finite_values() {
    let mut v = uniform(400, 0.8, 1.6, 11);
    let expected = independent_bins(&v);
    assert!(expected.iter().all(|&n| n > 0), "every bin holds a value");
    assert_eq!(expected.len(), 8);
    // Values that are not finite are left out of the bars.
    v.extend([f64::NAN, f64::INFINITY, f64::NEG_INFINITY]);
    for sys in [UnitSystem::Si, UnitSystem::Us] {
        let svg = spread_svg(&spread(&v, &MEMBERS), sys, 800, 700).unwrap();
        assert_well_formed(&svg);
        let all = texts(&svg);
        let bars = rects(&svg, HIST_FILL);
        assert_eq!(bars.len(), expected.len(), "{sys:?}");
        let (y0, per_count) = y_axis(&all);
        assert!(per_count < -3.0, "{per_count} px per run: too few to count");
        let counts: Vec<usize> = bars
            .iter()
            .map(|r| (r.3 / -per_count).round() as usize)
            .collect();
        assert_eq!(counts, expected, "{sys:?}");
        assert_eq!(counts.iter().sum::<usize>(), 400);
        // Every bar stands on the 0 line and they run left to right across [min, max].
        let (a, b) = x_axis(&all);
        let f = if sys == UnitSystem::Si {
            1.0
        } else {
            1.0 / 0.3048
        };
        let finite: Vec<f64> = v.iter().copied().filter(|x| x.is_finite()).collect();
        let lo = finite.iter().copied().fold(f64::INFINITY, f64::min) * f;
        let hi = finite.iter().copied().fold(f64::NEG_INFINITY, f64::max) * f;
        let w = (hi - lo) / 8.0;
        for (i, r) in bars.iter().enumerate() {
            assert!(
                (r.1 + r.3 - y0).abs() <= 2.0,
                "bar {i} bottom {}",
                r.1 + r.3
            );
            let left = a + b * (lo + i as f64 * w);
            assert!((r.0 - left).abs() <= 2.0, "bar {i} at {} not {left}", r.0);
        }
    }
}

#[test]
fn the_snow_regressions_are_a_shaded_span_with_a_tick_each() {
    let v = uniform(400, 0.8, 1.6, 3);
    let mut members = MEMBERS.to_vec();
    members.push(("regression D", f64::NAN));
    let svg = spread_svg(&spread(&v, &members), UnitSystem::Si, 800, 500).unwrap();
    assert_well_formed(&svg);
    let all = texts(&svg);
    let (a, b) = x_axis(&all);
    let span = rects(&svg, SPAN_FILL);
    assert_eq!(span.len(), 1);
    let (l, r) = (a + b * 1.05, a + b * 1.32);
    assert!((span[0].0 - l).abs() <= 2.5 && (span[0].0 + span[0].2 - r).abs() <= 2.5);
    // One tick per finite regression, at its value; the NaN one left out.
    let ticks: Vec<f64> = svg
        .split("<polyline")
        .skip(1)
        .filter(|t| attr(t, "stroke") == Some(MEMBER_STROKE))
        .map(|t| {
            let p = attr(t, "points").unwrap();
            p.split(',').next().unwrap().parse().unwrap()
        })
        .collect();
    assert_eq!(ticks.len(), 3, "{ticks:?}");
    for (want, got) in [1.05, 1.10, 1.32].iter().zip(&ticks) {
        assert!((a + b * want - got).abs() <= 2.0, "tick {got} for {want}");
    }
    for (name, _) in &MEMBERS {
        text(&all, name);
    }
    assert!(!has_text(&svg, "regression D"));
    // No regressions: no span, no ticks, no span label.
    let none = spread_svg(&spread(&v, &[]), UnitSystem::Si, 800, 500).unwrap();
    assert!(rects(&none, SPAN_FILL).is_empty());
    assert!(!none.contains(MEMBER_STROKE) && !none.contains("Snow regressions"));
}

#[test]
fn odd_spreads_still_draw() {
    let nan = f64::NAN;
    let cases: Vec<(Vec<f64>, usize)> = vec![
        (vec![], 0),
        (vec![1.2], 1),
        (vec![1.2; 50], 1),
        (vec![nan, nan], 0),
        (vec![0.0, 0.0], 1),
        (vec![f64::INFINITY, 1.0, 1.0], 1),
        // Beyond the largest drawn value: skipped like NaN.
        (vec![-1e300, 1e300], 0),
        (vec![1.0, 2.0, LARGEST_DRAWN * 10.0], 2),
    ];
    for (values, bars) in &cases {
        for sys in [UnitSystem::Si, UnitSystem::Us] {
            let c = spread(values, &[]);
            let svg = spread_svg(&c, sys, 640, 420).unwrap_or_else(|e| panic!("{values:?}: {e}"));
            assert_well_formed(&svg);
            let r = rects(&svg, HIST_FILL);
            assert_eq!(r.len(), *bars, "{values:?}");
            // A bar always has a width, even when every value is the same.
            assert!(r.iter().all(|r| r.2 >= 1.0), "{values:?}: {r:?}");
            assert_eq!(has_text(&svg, "No run gave a value"), *bars == 0);
        }
    }
    // One value: the bar holds it all and stands at that value.
    let one = spread_svg(&spread(&[1.2], &[]), UnitSystem::Si, 640, 420).unwrap();
    let all = texts(&one);
    let (a, b) = x_axis(&all);
    let r = rects(&one, HIST_FILL)[0];
    assert!((r.0 + 0.5 * r.2 - (a + b * 1.2)).abs() <= 2.0);
    // Percentiles and base not finite: no lines or labels, no failure.
    let c = SpreadChart {
        p10: nan,
        p50: nan,
        p90: f64::INFINITY,
        base: nan,
        ..spread(&[], &[])
    };
    let svg = spread_svg(&c, UnitSystem::Si, 640, 420).unwrap();
    assert_well_formed(&svg);
    assert!(!svg.contains("P10") && !svg.contains("P90") && !svg.contains("base case"));
    assert!(has_text(&svg, "0 runs, seed 42"));
    // A quantity the units do not know is an error naming it.
    let bad = SpreadChart {
        quantity: "furlongs",
        ..spread(&[1.0], &[])
    };
    let e = spread_svg(&bad, UnitSystem::Si, 640, 420).unwrap_err();
    assert!(e.0.contains("quantity") && e.0.contains("furlongs"), "{e}");
}

const BARS: [(&str, &str, &str, f64, f64); 3] = [
    // Given smallest swing first on purpose: the chart keeps the order it is handed.
    ("Air n-factor", "0.8", "1.0", 1.12, 1.25),
    ("Snow density", "200 kg/m³", "400 kg/m³", 1.35, 0.95),
    ("Soil water", "10 %", "30 %", 1.10, 1.30),
];

fn sens<'a>(bars: &'a [(&'a str, &'a str, &'a str, f64, f64)]) -> SensitivityChart<'a> {
    SensitivityChart {
        title: "Deepest frost",
        quantity: "depth",
        base: 1.15,
        bars,
    }
}

#[test]
fn sensitivity_bars_follow_the_order_given_with_each_end_on_its_side() {
    for sys in [UnitSystem::Si, UnitSystem::Us] {
        let svg = sensitivity_svg(&sens(&BARS), sys, 800, 420).unwrap();
        assert_well_formed(&svg);
        let all = texts(&svg);
        let f = if sys == UnitSystem::Si {
            1.0
        } else {
            1.0 / 0.3048
        };
        let ys: Vec<f64> = BARS.iter().map(|b| text(&all, b.0).num("y")).collect();
        assert!(
            ys[0] < ys[1] && ys[1] < ys[2],
            "top to bottom as given: {ys:?}"
        );
        // Input names are right-aligned left of the plot, all at one x.
        let (a, b) = x_axis(&all);
        let plot_left = all
            .iter()
            .filter(|t| BARS.iter().any(|b| b.0 == t.content))
            .map(|t| {
                assert_eq!(t.anchor(), "end");
                t.num("x")
            })
            .collect::<Vec<_>>();
        assert!(plot_left.windows(2).all(|w| w[0] == w[1]));
        let base_px = a + b * 1.15 * f;
        let (low, high) = (rects(&svg, LOW_FILL), rects(&svg, HIGH_FILL));
        // One part of each colour per bar, plus the legend's swatch under the plot.
        assert_eq!((low.len(), high.len()), (4, 4));
        let bottom = ys[2] + 40.0;
        assert!(
            low[3].1 > bottom && high[3].1 > bottom,
            "legend swatches last"
        );
        for (i, bar) in BARS.iter().enumerate() {
            for (part, answer, end_label) in [(low[i], bar.3, bar.1), (high[i], bar.4, bar.2)] {
                let end_px = a + b * answer * f;
                let (l, r) = (part.0, part.0 + part.2);
                let (want_l, want_r) = (base_px.min(end_px), base_px.max(end_px));
                assert!(
                    (l - want_l).abs() <= 2.0 && (r - want_r).abs() <= 2.0,
                    "{} {end_label}: part {l}–{r}, expected {want_l}–{want_r}",
                    bar.0
                );
                // The part is on its bar's row.
                assert!((part.1 + 0.5 * part.3 - ys[i]).abs() <= 2.0);
                // The end's label is just beyond the end, away from the base line.
                let t = text(&all, end_label);
                if answer * f < 1.15 * f {
                    assert_eq!(t.anchor(), "end", "{end_label}");
                    assert!((t.num("x") - (end_px - 4.0)).abs() <= 2.0);
                } else {
                    assert_eq!(t.anchor(), "start", "{end_label}");
                    assert!((t.num("x") - (end_px + 4.0)).abs() <= 2.0);
                }
                assert!((t.num("y") - ys[i]).abs() <= 1.0);
            }
        }
        for s in ["Input at its low end", "Input at its high end"] {
            text(&all, s);
        }
    }
    let si = sensitivity_svg(&sens(&BARS), UnitSystem::Si, 800, 420).unwrap();
    let us = sensitivity_svg(&sens(&BARS), UnitSystem::Us, 800, 420).unwrap();
    assert!(has_text(&si, "Base case 1.150 m") && has_text(&si, "Deepest frost (m)"));
    assert!(has_text(&us, "Base case 3.77 ft") && has_text(&us, "Deepest frost (ft)"));
}

#[test]
fn odd_sensitivities_still_draw() {
    let nan = f64::NAN;
    let empty = sensitivity_svg(&sens(&[]), UnitSystem::Si, 640, 400).unwrap();
    assert_well_formed(&empty);
    assert!(has_text(&empty, "no uncertain inputs"));
    assert!(rects(&empty, LOW_FILL).is_empty() && rects(&empty, HIGH_FILL).is_empty());
    // An end with no answer is not drawn; its label is left out too.
    let half = [("Snow density", "200 kg/m³", "400 kg/m³", nan, 1.3)];
    let svg = sensitivity_svg(&sens(&half), UnitSystem::Si, 640, 400).unwrap();
    assert_well_formed(&svg);
    assert_eq!(rects(&svg, LOW_FILL).len(), 1, "legend only");
    assert_eq!(rects(&svg, HIGH_FILL).len(), 2);
    assert!(!has_text(&svg, "200 kg/m³") && has_text(&svg, "400 kg/m³"));
    // No base case: the bar splits at its middle, no base line in the legend.
    let c = SensitivityChart {
        base: nan,
        ..sens(&BARS)
    };
    let svg = sensitivity_svg(&c, UnitSystem::Us, 640, 400).unwrap();
    assert_well_formed(&svg);
    assert!(!svg.contains("Base case"));
    assert_eq!(rects(&svg, LOW_FILL).len(), 4);
    // Everything equal: the axis still has a width.
    let flat = [("Snow density", "lo", "hi", 1.15, 1.15)];
    let svg = sensitivity_svg(&sens(&flat), UnitSystem::Si, 640, 400).unwrap();
    assert_well_formed(&svg);
    assert!(
        texts(&svg)
            .iter()
            .filter(|t| t.content.parse::<f64>().is_ok())
            .count()
            >= 3
    );
    // Both ends give the same answer: one note, not two end labels over each other.
    assert!(has_text(&svg, "no effect") && !has_text(&svg, "lo") && !has_text(&svg, "hi"));
    // An input with no effect beside one that moves the answer: only the flat one says so.
    let mixed = [
        ("Soil conductivity factor", "0.8", "1.25", 1.3, 1.0),
        ("Freezing index", "900", "1400", 1.15, 1.15),
    ];
    let svg = sensitivity_svg(&sens(&mixed), UnitSystem::Si, 640, 400).unwrap();
    let all = texts(&svg);
    assert_eq!(all.iter().filter(|t| t.content == "no effect").count(), 1);
    assert!(has_text(&svg, "0.8") && has_text(&svg, "1.25") && !has_text(&svg, "1400"));
    let note_y = text(&all, "no effect").num("y");
    assert!((note_y - text(&all, "Freezing index").num("y")).abs() <= 1.0);
    let bad = SensitivityChart {
        quantity: "",
        ..sens(&BARS)
    };
    assert!(sensitivity_svg(&bad, UnitSystem::Si, 640, 400).is_err());
}

#[test]
fn the_charts_draw_on_any_backend_at_any_scale() {
    let v = uniform(200, 0.8, 1.6, 5);
    let size = |svg: &str, s: &str| {
        let all = texts(svg);
        text(&all, s).num("font-size")
    };
    let mut base = String::new();
    let mut big = String::new();
    let mut odd = String::new();
    for (out, scale) in [(&mut base, 1.0), (&mut big, 2.0), (&mut odd, f64::NAN)] {
        let root = SVGBackend::with_string(out, (1200, 800)).into_drawing_area();
        draw_spread(&root, &spread(&v, &MEMBERS), UnitSystem::Si, scale).unwrap();
    }
    assert_well_formed(&big);
    // Fonts follow the scale; a scale that is not a number is 1.
    let ratio = size(&big, "P50 1.200 m") / size(&base, "P50 1.200 m");
    assert!((ratio - 2.0).abs() < 1e-9, "{ratio}");
    assert_eq!(size(&odd, "P50 1.200 m"), size(&base, "P50 1.200 m"));
    let mut s = String::new();
    {
        let root = SVGBackend::with_string(&mut s, (1200, 800)).into_drawing_area();
        draw_sensitivity(&root, &sens(&BARS), UnitSystem::Si, 3.0).unwrap();
    }
    assert_well_formed(&s);
    assert!(has_text(&s, "Snow density"));
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(64))]
    #[test]
    fn any_values_draw_a_well_formed_spread(
        values in proptest::collection::vec(
            prop_oneof![
                4 => -1e4f64..1e4,
                1 => Just(f64::NAN),
                1 => Just(f64::INFINITY),
                1 => proptest::num::f64::ANY,
            ],
            0..60,
        ),
        p in proptest::num::f64::ANY,
        base in proptest::num::f64::ANY,
        member in proptest::num::f64::ANY,
    ) {
        let members = [("a", member), ("b", 0.5)];
        let c = SpreadChart { p10: p, p50: p, p90: base, base, ..spread(&values, &members) };
        let svg = spread_svg(&c, UnitSystem::Us, 500, 360).unwrap();
        prop_assert!(check_xml(&svg).is_ok());
        let finite: Vec<f64> = values.iter().copied().filter(|v| v.is_finite()).collect();
        prop_assert_eq!(histogram(&values).map_or(0, |h| h.counts.iter().sum()), finite.len());
        let bars = [("x", "lo", "hi", p, base), ("y", "lo", "hi", member, 1.0)];
        let s = SensitivityChart { base: member, ..sens(&bars) };
        let svg = sensitivity_svg(&s, UnitSystem::Si, 500, 360).unwrap();
        prop_assert!(check_xml(&svg).is_ok());
    }
}
/// Every pair of extreme values in every place: no failure, no endless axis (an axis padded
/// past f64::MAX once hung the tick search), well-formed output.
#[test]
fn extreme_values_draw_without_failing() {
    let specials = [
        0.0,
        1.0,
        -1.0,
        5e-324,
        1e11,
        1e13,
        1e300,
        -1e300,
        f64::MAX,
        f64::MIN,
        f64::NAN,
        f64::INFINITY,
    ];
    for &a in &specials {
        for &b in &specials {
            for sys in [UnitSystem::Si, UnitSystem::Us] {
                let vals = [a, b, 0.5];
                let m = [("m", a)];
                let c = SpreadChart {
                    p10: a,
                    p50: b,
                    p90: a,
                    base: b,
                    ..spread(&vals, &m)
                };
                let svg = spread_svg(&c, sys, 500, 360).unwrap();
                assert!(check_xml(&svg).is_ok(), "{a:e} {b:e}");
                let bars = [("x", "lo", "hi", a, b), ("y", "lo", "hi", b, 1.0)];
                let s = SensitivityChart {
                    base: a,
                    ..sens(&bars)
                };
                let svg = sensitivity_svg(&s, sys, 500, 360).unwrap();
                assert!(check_xml(&svg).is_ok(), "{a:e} {b:e}");
            }
        }
    }
}

#[test]
fn labels_are_packed_on_rows_without_overlap_and_kept_inside() {
    // Apart: all on the first row, where they were.
    let p = pack_labels(&[100.0, 200.0, 300.0], &[50.0; 3], 3, 4.0, 0.0, 400.0);
    assert_eq!(
        p,
        vec![Some((0, 100.0)), Some((0, 200.0)), Some((0, 300.0))]
    );
    // Four at one place on three rows: the first three stack, the fourth is left out.
    let p = pack_labels(&[150.0; 4], &[60.0; 4], 3, 4.0, 0.0, 400.0);
    assert_eq!(
        p,
        vec![Some((0, 150.0)), Some((1, 150.0)), Some((2, 150.0)), None]
    );
    // At the edges a label slides inwards; one wider than the space is left out; a
    // label that is not finite is left out.
    let p = pack_labels(
        &[5.0, 398.0, 200.0, f64::NAN],
        &[40.0, 40.0, 500.0, 10.0],
        2,
        4.0,
        0.0,
        400.0,
    );
    assert_eq!(p, vec![Some((0, 20.0)), Some((0, 380.0)), None, None]);
    // Given in any order, placed left to right: the same layout.
    let a = pack_labels(&[100.0, 120.0, 140.0], &[30.0; 3], 2, 2.0, 0.0, 400.0);
    let b = pack_labels(&[140.0, 100.0, 120.0], &[30.0; 3], 2, 2.0, 0.0, 400.0);
    assert_eq!((a[0], a[1], a[2]), (b[1], b[2], b[0]));
    assert_eq!(
        a,
        vec![Some((0, 100.0)), Some((1, 120.0)), Some((0, 140.0))]
    );
}

/// Estimated width of an SVG text at its font size (as the chart estimates it).
fn est_width(t: &TextEl) -> f64 {
    0.58 * t.num("font-size") * t.content.chars().count() as f64
}

#[test]
fn crowded_regression_names_do_not_overlap_and_wide_end_labels_stay_in_the_chart() {
    // Nine regressions within a few centimetres, as a real study gives them.
    let names = [
        "Sturm quad.",
        "Sturm log.",
        "Calonne",
        "Yen",
        "Jordan",
        "Abels",
        "Van Dusen",
        "Devaux",
        "Riche",
    ];
    let vals = [0.344, 0.36, 0.47, 0.49, 0.5, 0.51, 0.62, 0.63, 0.643];
    let members: Vec<(&str, f64)> = names.iter().copied().zip(vals).collect();
    let v = uniform(200, 0.2, 0.7, 9);
    let svg = spread_svg(&spread(&v, &members), UnitSystem::Si, 480, 340).unwrap();
    assert_well_formed(&svg);
    let all = texts(&svg);
    let shown: Vec<&TextEl> = all
        .iter()
        .filter(|t| names.contains(&t.content.as_str()))
        .collect();
    assert!(shown.len() >= 6, "most names fit: {}", shown.len());
    for (i, a) in shown.iter().enumerate() {
        for b in &shown[i + 1..] {
            if (a.num("y") - b.num("y")).abs() < 1.0 {
                let gap = (a.num("x") - b.num("x")).abs() - 0.5 * (est_width(a) + est_width(b));
                assert!(
                    gap >= 0.0,
                    "{} and {} overlap by {}",
                    a.content,
                    b.content,
                    -gap
                );
            }
        }
        assert!(a.num("x") - 0.5 * est_width(a) >= 0.0 && a.num("x") + 0.5 * est_width(a) <= 480.0);
    }
    // The rows from the top: P10, P50, P90, the base case, the span's label, the names,
    // then the bars, each row clear of the next (SVG y grows downwards; a 10 to 12 px font
    // needs about 10 px).
    let y = |s: &str| {
        all.iter()
            .find(|t| t.content.starts_with(s))
            .unwrap_or_else(|| panic!("{s}"))
            .num("y")
    };
    let rows = [
        y("P10"),
        y("P50"),
        y("P90"),
        y("base case"),
        y("Snow regressions"),
    ];
    assert!(rows.windows(2).all(|w| w[1] - w[0] >= 10.0), "{rows:?}");
    let name_ys: Vec<f64> = shown.iter().map(|t| t.num("y")).collect();
    let top_name = name_ys.iter().copied().fold(f64::INFINITY, f64::min);
    let low_name = name_ys.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    assert!(top_name - rows[4] >= 10.0, "names below the span's label");
    let bar_top = rects(&svg, HIST_FILL)
        .iter()
        .map(|r| r.1)
        .fold(f64::INFINITY, f64::min);
    assert!(
        bar_top - low_name >= 8.0,
        "bars below the names: {bar_top} vs {low_name}"
    );
    // A tornado whose widest bar reaches far: its end labels stay right of the input names
    // and inside the chart's right edge.
    let bars = [
        ("Freezing index", "900 °C·days", "1400 °C·days", 0.17, 0.51),
        ("Snow density", "150 kg/m³", "350 kg/m³", 0.27, 0.55),
    ];
    let c = SensitivityChart {
        base: 0.344,
        ..sens(&bars)
    };
    let svg = sensitivity_svg(&c, UnitSystem::Si, 480, 300).unwrap();
    let all = texts(&svg);
    let name_x = text(&all, "Freezing index").num("x");
    for (_, lo, hi, ..) in bars {
        let l = text(&all, lo);
        assert_eq!(l.anchor(), "end");
        assert!(
            l.num("x") - est_width(l) >= name_x + 4.0,
            "{lo} clear of the names"
        );
        let h = text(&all, hi);
        assert_eq!(h.anchor(), "start");
        assert!(
            h.num("x") + est_width(h) <= 480.0 - 4.0,
            "{hi} inside the chart"
        );
    }
}
