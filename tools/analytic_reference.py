#!/usr/bin/env python3
"""Make tests/data/analytic_reference.json: closed-form frost-penetration values that
tests/analytic.rs checks src/analytic.rs against.

Each transcendental equation is solved here independently of the Rust code, with
scipy.optimize.brentq (Brent's method) and scipy.special.erf / erfc / erfcx (Cephes):

- Neumann two-phase equation (Carslaw & Jaeger 1959 §11.2), root xi, front constant
  2 xi sqrt(a_f) and the temperature field at chosen (z, t);
- one-phase Stefan equation  lam exp(lam^2) erf(lam) = Ste / sqrt(pi);
- modified Berggren equation  1/erf z - alpha/erfc z = sqrt(pi) z exp(z^2)/mu,
  lambda = z sqrt(2/mu);
- erfcx itself at a few points (to check the scaled erfc used for large arguments).

Run: pip install scipy && python3 tools/analytic_reference.py
"""
import json
import math
import pathlib

import scipy
from scipy.optimize import brentq
from scipy.special import erf, erfc, erfcx

SQRT_PI = math.sqrt(math.pi)


def solve_decreasing(f):
    """Root of f, decreasing, positive near 0+: double the upper end until f < 0."""
    lo, hi = 1e-12, 1.0
    while f(hi) > 0:
        lo, hi = hi, hi * 2
    assert f(lo) > 0
    return brentq(f, lo, hi, xtol=1e-300, rtol=4 * 2.220446049250313e-16, maxiter=500)


def neumann(p):
    af = p["k_frozen"] / p["c_frozen_j_m3k"]
    au = p["k_unfrozen"] / p["c_unfrozen_j_m3k"]
    r = math.sqrt(af / au)
    dts = p["freezing_c"] - p["surface_c"]
    dt0 = p["initial_c"] - p["freezing_c"]

    # The Neumann equation multiplied through by nothing: each term as published, with
    # exp(-x^2)/erfc(x) written 1/erfcx(x) so that large arguments do not underflow.
    def f(x):
        return (p["k_frozen"] * dts * math.exp(-x * x) / (erf(x) * math.sqrt(math.pi * af))
                - p["k_unfrozen"] * dt0 / (erfcx(x * r) * math.sqrt(math.pi * au))
                - p["latent_j_m3"] * x * math.sqrt(af))

    xi = solve_decreasing(f)
    beta = 2 * xi * math.sqrt(af)

    def temp(z, t):
        x = beta * math.sqrt(t)
        if z <= x:
            return p["surface_c"] + dts * erf(z / (2 * math.sqrt(af * t))) / erf(xi)
        a = z / (2 * math.sqrt(au * t))
        b = xi * r
        # erfc(a)/erfc(b) = exp(b^2 - a^2) erfcx(a)/erfcx(b)
        return p["initial_c"] - dt0 * math.exp(b * b - a * a) * erfcx(a) / erfcx(b)

    t = 10 * 86400.0
    x = beta * math.sqrt(t)
    points = []
    for frac in (0.0, 0.3, 0.7, 1.0, 1.001, 1.01, 1.2, 2.0, 4.0):
        z = frac * x
        points.append({"z_m": z, "t_s": t, "t_c": temp(z, t)})
    return {"xi": xi, "front_constant_m_per_sqrt_s": beta, "temperatures": points}


ICE_RHO = 916.7       # IAPWS R10-06 at 0 °C (project model reference §2)
ICE_CP = 2097.0       # IAPWS R10-06 at 0 °C
ICE_K = 2.07          # 9.828 exp(-0.0057 * 273.15), model reference §2 (from memory there)
WATER_RHO = 999.8     # IAPWS-95 at 0 °C
WATER_CP = 4219.0
WATER_K = 0.556
LATENT = 333.4e3      # J/kg, IAPWS

cases = {
    "soil_lunardini_1981": dict(surface_c=-10.0, initial_c=2.0, freezing_c=0.0,
                                k_frozen=2.324, k_unfrozen=1.860, c_frozen_j_m3k=1.966e6,
                                c_unfrozen_j_m3k=2.862e6, latent_j_m3=1.1045e8),
    "water_to_ice": dict(surface_c=-10.0, initial_c=4.0, freezing_c=0.0,
                         k_frozen=ICE_K, k_unfrozen=WATER_K,
                         c_frozen_j_m3k=ICE_RHO * ICE_CP, c_unfrozen_j_m3k=WATER_RHO * WATER_CP,
                         latent_j_m3=ICE_RHO * LATENT),
    "extreme_high_stefan": dict(surface_c=-60.0, initial_c=30.0, freezing_c=0.0,
                                k_frozen=3.0, k_unfrozen=0.5, c_frozen_j_m3k=2.0e6,
                                c_unfrozen_j_m3k=3.0e6, latent_j_m3=2.0e6),
    "extreme_diffusivity_ratio": dict(surface_c=-30.0, initial_c=1.0, freezing_c=-0.5,
                                      k_frozen=3.0, k_unfrozen=0.008, c_frozen_j_m3k=1.0e6,
                                      c_unfrozen_j_m3k=4.0e6, latent_j_m3=2.0e6),
    "tiny_stefan": dict(surface_c=-0.01, initial_c=0.01, freezing_c=0.0,
                        k_frozen=2.0, k_unfrozen=1.5, c_frozen_j_m3k=2.0e6,
                        c_unfrozen_j_m3k=3.0e6, latent_j_m3=3.0e8),
    "one_phase_soil": dict(surface_c=-10.0, initial_c=0.0, freezing_c=0.0,
                           k_frozen=2.324, k_unfrozen=1.860, c_frozen_j_m3k=1.966e6,
                           c_unfrozen_j_m3k=2.862e6, latent_j_m3=1.1045e8),
}

out = {
    "sources": {
        "all": f"scipy {scipy.__version__}: optimize.brentq, special.erf/erfc/erfcx",
        "water_to_ice": "ice 916.7 kg/m3, 2097 J/kg/K (IAPWS R10-06), k 2.07; water 999.8, "
                        "4219, 0.556 (IAPWS-95); L 333.4 kJ/kg (model reference section 2)",
        "soil_lunardini_1981": "inputs of the Lunardini 1981 (after Jumikis 1966) example",
    },
    "neumann": [],
    "one_phase": [],
    "berggren": [],
    "erfcx": [],
}

for name, p in cases.items():
    out["neumann"].append({"name": name, "problem": p, **neumann(p)})

for ste in (1e-4, 0.01, 0.1, 0.5, 1.0, 2.0, 5.0, 20.0):
    c = ste / SQRT_PI
    lam = solve_decreasing(lambda l: c - l * math.exp(l * l) * erf(l))
    out["one_phase"].append({"stefan_number": ste, "lambda": lam})

for alpha in (0.0, 0.25, 0.5, 1.0, 2.0, 3.0, 5.0):
    for mu in (0.005, 0.05, 0.2, 0.5, 1.0, 2.0, 5.0):
        z = solve_decreasing(
            lambda z: 1 / erf(z) - alpha / erfc(z) - SQRT_PI * z * math.exp(z * z) / mu
            if z < 5 else
            math.exp(-z * z) / erf(z) - alpha / erfcx(z) - SQRT_PI * z / mu)
        out["berggren"].append({"alpha": alpha, "mu": mu, "lambda": z * math.sqrt(2 / mu)})

for x in (0.0, 0.5, 3.0, 10.0, 24.9, 25.0, 26.0, 30.0, 100.0, 1e4):
    out["erfcx"].append({"x": x, "erfcx": float(erfcx(x))})

path = pathlib.Path(__file__).resolve().parent.parent / "tests" / "data" / "analytic_reference.json"
path.write_text(json.dumps(out, indent=1) + "\n")
print("wrote", path)
for c in out["neumann"]:
    print(c["name"], c["xi"], c["front_constant_m_per_sqrt_s"])
