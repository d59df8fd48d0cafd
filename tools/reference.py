#!/usr/bin/env python3
"""Make tests/data/reference.json: reference values the Rust tests check against.

Sources, named beside each value in the output:
- ice Ih and liquid water: IAPWS R10-06 (ice) and IAPWS-95 (water), computed with the
  general-purpose `iapws` package from PyPI;
- dry air: CoolProp (PyPI), a general-purpose property library;
- snow regressions, Kersten 1949, Johansen 1975, Côté & Konrad 2005: an independent
  implementation here of each published formula (coefficients as listed in the project's
  model reference), so a slip in the Rust code does not pass unnoticed.

Run: pip install iapws coolprop && python3 tools/reference.py
"""
import json
import math
import pathlib

from iapws import IAPWS95, _Ice
import CoolProp.CoolProp as CP

out = {"sources": {}, "ice": [], "water": {}, "air": [], "snow": [], "kersten": [],
       "johansen": [], "cote_konrad": []}
out["sources"]["ice"] = "IAPWS R10-06 via the iapws package " + __import__("iapws").__version__
out["sources"]["water"] = "IAPWS-95 via the iapws package"
out["sources"]["air"] = "CoolProp " + CP.get_global_param_string("version")
out["sources"]["formulas"] = "independent Python implementation of the published formulas"

for t_c in (0.0, -10.0, -20.0, -30.0):
    ice = _Ice(273.15 + t_c, 0.101325)
    out["ice"].append({"t_c": t_c, "density_kg_m3": ice["rho"], "cp_j_kg_k": ice["cp"] * 1000})

w = IAPWS95(T=273.16, P=0.101325)
out["water"] = {"t_c": 0.01, "density_kg_m3": w.rho, "cp_j_kg_k": w.cp * 1000, "k_w_m_k": w.k}

for t_c in (-40.0, -20.0, 0.0, 20.0):
    T = 273.15 + t_c
    out["air"].append({"t_c": t_c, "k_w_m_k": CP.PropsSI("L", "T", T, "P", 101325, "Air")})


def snow(cid, rho):
    r = rho / 1000
    if cid == "sturm-1997-quadratic":
        return 0.023 + 0.234 * r if r < 0.156 else 0.138 - 1.01 * r + 3.233 * r ** 2
    if cid == "sturm-1997-logarithmic":
        return 10 ** (2.650 * r - 1.652)
    if cid == "calonne-2011":
        return 2.5e-6 * rho ** 2 - 1.23e-4 * rho + 0.024
    if cid == "yen-1981":
        return 2.22362 * r ** 1.885
    if cid == "jordan-1991":
        return 0.023 + (7.75e-5 * rho + 1.105e-6 * rho ** 2) * (2.29 - 0.023)
    if cid == "abels-1893":
        return 2.846 * r ** 2
    if cid == "van-dusen-1929":
        return 0.021 + 4.2e-4 * rho + 2.2e-9 * rho ** 3
    if cid == "devaux-1933":
        return 0.0293 + 2.93e-6 * rho ** 2
    if cid == "riche-schneebeli-2013":
        return 3.0e-6 * rho ** 2 - 1.06e-5 * rho + 0.024
    raise KeyError(cid)


for cid in ("sturm-1997-quadratic", "sturm-1997-logarithmic", "calonne-2011", "yen-1981",
            "jordan-1991", "abels-1893", "van-dusen-1929", "devaux-1933",
            "riche-schneebeli-2013"):
    for rho in (150.0, 250.0, 400.0):
        out["snow"].append({"id": cid, "density_kg_m3": rho, "k_w_m_k": snow(cid, rho)})


def kersten(fine, rd, w):
    if fine:
        return (0.001442 * 10 ** (1.373 * rd) + 0.01226 * 10 ** (0.4994 * rd) * w,
                0.1442 * (0.9 * math.log10(w) - 0.2) * 10 ** (0.6243 * rd))
    return (0.01096 * 10 ** (0.8116 * rd) + 0.00461 * 10 ** (0.9115 * rd) * w,
            0.1442 * (0.7 * math.log10(w) + 0.4) * 10 ** (0.6243 * rd))


for texture, fine in (("silt", True), ("clay", True), ("sand", False), ("gravel", False)):
    for rd, w in ((1.5, 15.0), (1.8, 10.0)):
        kf, ku = kersten(fine, rd, w)
        out["kersten"].append({"texture": texture, "dry_density_kg_m3": rd * 1000,
                               "water_content_pct": w, "k_frozen": kf, "k_unfrozen": ku})

RHO_S = 2650.0


def sat(rho_d, w):
    n = 1 - rho_d / RHO_S
    return n, (w / 100) * rho_d / (n * 1000)


def johansen(coarse, rho_d, w, q):
    n, sr = sat(rho_d, w)
    ko = 2.0 if q > 0.2 else 3.0
    ks = 7.7 ** q * ko ** (1 - q)
    kdry = (0.135 * rho_d + 64.7) / (2700 - 0.947 * rho_d)
    ksu = ks ** (1 - n) * 0.57 ** n
    ksf = ks ** (1 - n) * 2.2 ** n
    keu = max(0.0, (0.7 * math.log10(sr) + 1) if coarse else (math.log10(sr) + 1))
    return kdry + sr * (ksf - kdry), kdry + keu * (ksu - kdry)


for texture, coarse in (("sand", True), ("silt", False)):
    for rho_d, w, q in ((1600.0, 12.0, 0.6), (1800.0, 8.0, 0.15)):
        kf, ku = johansen(coarse, rho_d, w, q)
        out["johansen"].append({"texture": texture, "dry_density_kg_m3": rho_d,
                                "water_content_pct": w, "quartz_fraction": q,
                                "k_frozen": kf, "k_unfrozen": ku})

KAPPA = {"gravel": (4.60, 1.70), "sand": (3.55, 0.95), "silt": (1.90, 0.85),
         "clay": (1.90, 0.85), "peat": (0.60, 0.25)}


def cote_konrad(texture, rho_d, w, q):
    rho_s = 1450.0 if texture == "peat" else RHO_S
    n = 1 - rho_d / rho_s
    sr = (w / 100) * rho_d / (n * 1000)
    if texture == "peat":
        chi, eta, ks = 0.30, 0.87, 0.25
    else:
        ko = 2.0 if q > 0.2 else 3.0
        chi, eta, ks = 0.75, 1.20, 7.7 ** q * ko ** (1 - q)
    kdry = chi * 10 ** (-eta * n)
    ksu = ks ** (1 - n) * 0.60 ** n
    ksf = ks ** (1 - n) * 2.24 ** n
    ku_, kf_ = KAPPA[texture]
    ke = lambda k: k * sr / (1 + (k - 1) * sr)
    return kdry + ke(kf_) * (ksf - kdry), kdry + ke(ku_) * (ksu - kdry)


for texture, rho_d, w, q in (("gravel", 1900.0, 5.0, 0.5), ("clay", 1450.0, 28.0, 0.2),
                             ("peat", 150.0, 400.0, 0.0)):
    kf, ku = cote_konrad(texture, rho_d, w, q)
    out["cote_konrad"].append({"texture": texture, "dry_density_kg_m3": rho_d,
                               "water_content_pct": w, "quartz_fraction": q,
                               "k_frozen": kf, "k_unfrozen": ku})

path = pathlib.Path(__file__).resolve().parent.parent / "tests" / "data" / "reference.json"
path.write_text(json.dumps(out, indent=1) + "\n")
print(path)
