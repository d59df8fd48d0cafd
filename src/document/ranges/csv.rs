//! A study as CSV and as the CLI's summary: [`trials_csv`] (every run's inputs and results)
//! and [`summary_csv`] (per result: base case, P10, P50, P90, mean, sd, min, max, runs, the
//! runs past a limit, the snow regressions' spread), units in the headings and the seed in
//! every row; [`summary_text`] is the summary the CLI prints on stderr.

use super::report::RangesReport;

fn unit_symbol(q: &str, sys: crate::physics::units::UnitSystem) -> String {
    crate::physics::units::quantity(q).map_or_else(String::new, |q| q.unit(sys).symbol.to_string())
}

fn shown(q: &str, sys: crate::physics::units::UnitSystem, v: f64) -> String {
    match crate::physics::units::quantity(q) {
        Some(q) => {
            let places = usize::from(q.unit(sys).decimals) + 2;
            format!("{:.places$}", q.show(sys, v))
        }
        None => format!("{v}"),
    }
}

fn heading(name: &str, q: &str, sys: crate::physics::units::UnitSystem) -> String {
    let sym = unit_symbol(q, sys);
    let h = if sym.is_empty() {
        name.to_string()
    } else {
        format!("{name} [{sym}]")
    };
    csv_field(&h)
}

fn csv_field(s: &str) -> String {
    if s.contains([',', '"', '\n']) {
        format!("\"{}\"", s.replace('"', "\"\""))
    } else {
        s.to_string()
    }
}

/// Every Monte Carlo run as CSV: run number, the seed, each input and each result (units
/// in the headings; a failed result is left empty).
pub fn trials_csv(r: &RangesReport, sys: crate::physics::units::UnitSystem) -> String {
    let mut out = String::from("run,seed");
    for i in &r.inputs {
        out.push(',');
        out.push_str(&heading(&i.name, i.quantity, sys));
    }
    for res in &r.results {
        out.push(',');
        out.push_str(&heading(res.name, res.quantity, sys));
    }
    out.push('\n');
    for t in &r.trials {
        out.push_str(&format!("{},{}", t.run + 1, r.seed));
        for (v, i) in t.inputs.iter().zip(&r.inputs) {
            out.push(',');
            out.push_str(&shown(i.quantity, sys, *v));
        }
        for (v, res) in t.values.iter().zip(&r.results) {
            out.push(',');
            if let Some(v) = v {
                out.push_str(&shown(res.quantity, sys, *v));
            }
        }
        out.push('\n');
    }
    out
}

/// One row per result: the base case, P10, P50, P90, mean, sd, min, max, the runs, the
/// seed and the spread across the snow regressions (units in the unit column).
pub fn summary_csv(r: &RangesReport, sys: crate::physics::units::UnitSystem) -> String {
    let mut out = String::from(
        "result,unit,base case,P10,P50,P90,mean,sd,min,max,runs,failed runs,seed,regressions low,regressions high,runs past the limit,past the limit means\n",
    );
    for res in &r.results {
        let q = res.quantity;
        let opt = |v: Option<f64>| v.map_or_else(String::new, |v| shown(q, sys, v));
        // A spread is a difference: no offset.
        let sd = res
            .sd
            .map_or_else(String::new, |v| match crate::physics::units::quantity(q) {
                Some(qq) => {
                    let places = usize::from(qq.unit(sys).decimals) + 2;
                    format!("{:.places$}", qq.show(sys, v) - qq.show(sys, 0.0))
                }
                None => format!("{v}"),
            });
        out.push_str(&format!(
            "{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{},{}\n",
            csv_field(res.name),
            csv_field(&unit_symbol(q, sys)),
            opt(res.base),
            opt(res.p10),
            opt(res.p50),
            opt(res.p90),
            opt(res.mean),
            sd,
            opt(res.min),
            opt(res.max),
            r.runs,
            res.runs_failed,
            r.seed,
            opt(res.spread.as_ref().and_then(|s| s.min)),
            opt(res.spread.as_ref().and_then(|s| s.max)),
            res.past_limit
                .as_ref()
                .map_or_else(String::new, |p| p.runs.to_string()),
            res.past_limit
                .as_ref()
                .map_or_else(String::new, |p| csv_field(p.meaning)),
        ));
    }
    out
}

/// A few lines for a terminal: per result the base case, P10, P50, P90 and the spread
/// across the snow regressions, with the runs, the seed and the time taken.
pub fn summary_text(
    r: &RangesReport,
    sys: crate::physics::units::UnitSystem,
    took: std::time::Duration,
) -> String {
    let mut out = format!(
        "ranges: {} runs, seed {}, {:.1} s",
        r.runs,
        r.seed,
        took.as_secs_f64()
    );
    for res in &r.results {
        let q = res.quantity;
        let sym = unit_symbol(q, sys);
        let v = |x: Option<f64>| x.map_or_else(|| "-".to_string(), |x| shown(q, sys, x));
        out.push_str(&format!(
            "\n  {}: base {}, P10 {}, P50 {}, P90 {} {sym}",
            res.name,
            v(res.base),
            v(res.p10),
            v(res.p50),
            v(res.p90)
        ));
        if res.runs_failed > 0 {
            out.push_str(&format!(" ({} runs failed)", res.runs_failed));
        }
        if let Some(sp) = &res.spread {
            out.push_str(&format!(
                "; snow regressions {} to {} {sym}",
                v(sp.min),
                v(sp.max)
            ));
        }
        if let Some(p) = &res.past_limit {
            out.push_str(&format!("; {} in {} of {} runs", p.meaning, p.runs, p.of));
        }
    }
    out
}
