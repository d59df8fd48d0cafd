#!/usr/bin/env python3
"""Make the invented climate examples in scenarios/climate/ and the values the Rust tests
check them against, tests/data/climate_reference.json.

The examples are made-up scenarios, not records of any real place: a smooth annual cycle
plus random day-to-day weather from Python's `random` with a fixed seed, and a toy snow
pack (snow falls on some cold days, settles, melts on warm days). Running this again
gives the same files.

The reference values are computed here independently of the Rust code, with Python's
`datetime` for the calendar (the winter of year Y runs 1 July Y to 30 June Y+1) and the
published definitions (US Army TM 5-852-6 / UFC 3-130-01, via the project's model
reference, section 4):
- freezing index: the range of the cumulative degree-day curve from a maximum to the
  following minimum;
- freezing degree-day sum: the sum of (0 - T) over days below 0 degC;
- design values: the mean of the three coldest winters and the coldest winter.
Unit conversions (NIST SP 811): T_C = (T_F - 32) / 1.8, 1 in = 0.0254 m exactly.

Run: python3 tools/climate_examples.py
"""
import datetime as dt
import json
import math
import pathlib
import random

ROOT = pathlib.Path(__file__).resolve().parent.parent
OUT_DIR = ROOT / "scenarios" / "climate"
REF = ROOT / "tests" / "data" / "climate_reference.json"


def weather(rng, start, end, mean_c, amplitude_k, coldest_doy, noise_k, winter_shift_k):
    """Daily mean temperatures (degC), one per date from start to end inclusive."""
    days = []
    d = start
    anomaly = 0.0
    shift = {}
    while d <= end:
        winter = d.year if d.month >= 7 else d.year - 1
        if winter not in shift:
            shift[winter] = rng.gauss(0.0, winter_shift_k)
        doy = d.timetuple().tm_yday
        cycle = mean_c - amplitude_k * math.cos(2 * math.pi * (doy - coldest_doy) / 365.0)
        anomaly = 0.7 * anomaly + rng.gauss(0.0, noise_k)
        # Winter anomalies matter only in the cold half of the year.
        cold = max(0.0, -math.cos(2 * math.pi * (doy - coldest_doy) / 365.0))
        days.append((d, round(cycle + anomaly + shift[winter] * cold, 1)))
        d += dt.timedelta(days=1)
    return days


def snowpack(rng, temps):
    """Toy snow pack: (depth in m, density in kg/m3) per day, or (0, None) when bare."""
    depth, density, out = 0.0, None, []
    for _, t in temps:
        if t < -1.0 and rng.random() < 0.25:
            fresh = rng.uniform(0.005, 0.04)
            density = 120.0 if depth == 0.0 else (density * depth + 120.0 * fresh) / (depth + fresh)
            depth += fresh
        if depth > 0.0:
            density = min(450.0, density + 1.5)
            depth *= 0.997
            if t > 0.0:
                depth = max(0.0, depth - 0.004 * t)
            if depth < 0.005:
                depth, density = 0.0, None
        out.append((depth, density))
    return out


def freezing_index(temps):
    """Largest fall of the cumulative degree-day curve (starting at 0) to a later minimum."""
    cum, peak, best = 0.0, 0.0, 0.0
    for t in temps:
        cum += t
        peak = max(peak, cum)
        best = max(best, peak - cum)
    return best


def winters(dated):
    """Complete winters (1 July to 30 June) as (start date, list of temperatures in degC)."""
    first, last = dated[0][0], dated[-1][0]
    by_date = dict(dated)
    out = []
    year = first.year if first >= dt.date(first.year, 7, 1) else first.year - 1
    while dt.date(year + 1, 6, 30) <= last:
        start, end = dt.date(year, 7, 1), dt.date(year + 1, 6, 30)
        if start >= first:
            n = (end - start).days + 1
            out.append((start, [by_date[start + dt.timedelta(days=i)] for i in range(n)]))
        year += 1
    return out


def summary(dated):
    ws = winters(dated)
    rows = [{"start": s.isoformat(),
             "freezing_index_c_days": freezing_index(t),
             "freezing_degree_days_c_days": sum(-x for x in t if x < 0.0)} for s, t in ws]
    fi = sorted((r["freezing_index_c_days"] for r in rows), reverse=True)
    return {"winters": rows,
            "mean_of_three_coldest_c_days": sum(fi[:3]) / 3.0 if len(fi) >= 3 else None,
            "coldest_c_days": fi[0] if fi else None}


def main():
    OUT_DIR.mkdir(parents=True, exist_ok=True)
    ref = {"sources": {
        "calendar": "Python datetime; winters run 1 July to 30 June",
        "definitions": "US Army TM 5-852-6 / UFC 3-130-01 (model reference section 4), implemented independently here",
        "units": "NIST SP 811: T_C = (T_F - 32) / 1.8, 1 in = 0.0254 m"},
        "examples": {}}

    # 1. A cold inland valley, five winters, in degC, cm and kg/m3.
    rng = random.Random(20011)
    temps = weather(rng, dt.date(2001, 7, 1), dt.date(2006, 6, 30),
                    mean_c=-4.0, amplitude_k=19.0, coldest_doy=20, noise_k=2.5,
                    winter_shift_k=4.0)
    snow = snowpack(rng, temps)
    name = "cold-inland-valley-five-winters.csv"
    with open(OUT_DIR / name, "w", newline="\n") as f:
        f.write("# Invented scenario: a cold inland valley, five winters (not a record of any real place).\n")
        f.write("# Made by tools/climate_examples.py with a fixed seed. Units: degC, cm, kg/m3.\n")
        f.write("date,mean air temperature (°C),snow depth (cm),snow density (kg/m³)\n")
        for (d, t), (h, rho) in zip(temps, snow):
            if rho is None:
                f.write(f"{d.isoformat()},{t:.1f},0,\n")
            else:
                f.write(f"{d.isoformat()},{t:.1f},{h * 100:.1f},{rho:.0f}\n")
    ex = summary(temps)
    ex["days"] = len(temps)
    ex["first_date"] = temps[0][0].isoformat()
    ex["last_date"] = temps[-1][0].isoformat()
    ex["units"] = {"temperature": "C", "snow_depth": "cm", "snow_density": "kg/m3"}
    ref["examples"][name] = ex

    # 2. A windswept upland, one winter, in degF and inches, no density.
    rng = random.Random(30307)
    temps_c = weather(rng, dt.date(2010, 10, 1), dt.date(2011, 4, 30),
                      mean_c=-1.0, amplitude_k=14.0, coldest_doy=35, noise_k=3.0,
                      winter_shift_k=0.0)
    snow = snowpack(rng, temps_c)
    name = "windswept-upland-one-winter-fahrenheit.csv"
    written = []
    with open(OUT_DIR / name, "w", newline="\n") as f:
        f.write("# Invented scenario: a windswept upland, one winter (not a record of any real place).\n")
        f.write("# Made by tools/climate_examples.py with a fixed seed. Units: degF and inches.\n")
        f.write("day,air temp [°F],snow on ground [in]\n")
        for (d, t), (h, _) in zip(temps_c, snow):
            t_f = round(t * 1.8 + 32.0, 1)
            h_in = round(h / 0.0254, 1)
            f.write(f"{d.isoformat()},{t_f:.1f},{h_in:.1f}\n")
            written.append((d, (t_f - 32.0) / 1.8, h_in * 0.0254))
    series = [x[1] for x in written]
    ref["examples"][name] = {
        "days": len(written),
        "first_date": written[0][0].isoformat(),
        "last_date": written[-1][0].isoformat(),
        "units": {"temperature": "F", "snow_depth": "in"},
        "freezing_index_c_days": freezing_index(series),
        "freezing_degree_days_c_days": sum(-x for x in series if x < 0.0),
        "max_snow_depth_m": max(x[2] for x in written),
        "spot": [{"date": d.isoformat(), "mean_air_c": t, "snow_depth_m": h}
                 for d, t, h in written[::40]],
    }

    REF.write_text(json.dumps(ref, indent=1) + "\n")
    print("wrote", OUT_DIR, "and", REF)


if __name__ == "__main__":
    main()
