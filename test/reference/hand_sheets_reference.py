"""
Correct values for the invented hand-calculation workbooks of test/fixtures/handSheets.ts,
computed independently of Nappe: water properties by IAPWS-IF97 (Debian's python3-iapws; the
viscosity by its IAPWS 2008 formulation), Colebrook solved with mpmath, unit factors from
NIST SP 811. Writes hand_sheets_reference.json beside this file with the versions used; the
tests read the JSON and never need Python.

    /usr/bin/python3 test/reference/hand_sheets_reference.py

Every input is typed in again here from the fixture (invented data, no real site).
"""
import json
import platform
from pathlib import Path

import iapws
import mpmath
from iapws import IAPWS97
from iapws.iapws97 import _PSat_T

mpmath.mp.dps = 30
G = 9.80665  # standard gravity, NIST SP 811
FT = 0.3048  # m per ft, exact
IN = 0.0254  # m per inch, exact
GAL = 3.785411784e-3  # m³ per US gallon, exact
PSI = 6894.757293168  # Pa per lbf/in², NIST SP 811
ATM = 101325.0  # Pa, standard atmosphere
LB_FT3 = 16.01846337396  # kg/m³ per lb/ft³, NIST SP 811
HP = 745.69987158227022


def water(t_c):
    w = IAPWS97(T=t_c + 273.15, P=ATM / 1e6)
    return {"density": w.rho, "kinematic_viscosity": w.mu / w.rho, "vapour_pressure": _PSat_T(t_c + 273.15) * 1e6}


def colebrook(re, rr):
    g = lambda x: x + 2 * mpmath.log10(rr / mpmath.mpf("3.7") + mpmath.mpf("2.51") * x / re)
    x = mpmath.findroot(g, mpmath.mpf(8))
    return float(1 / x**2)


def darcy(q, d, length, eps, nu):
    """Head loss (m), with the intermediate values, SI base units throughout."""
    v = q / (mpmath.pi * d * d / 4)
    re = v * d / nu
    f = colebrook(re, eps / d)
    return {"V": float(v), "Re": float(re), "f": f, "velocity_head": float(v * v / (2 * G)), "head_loss": float(f * length / d * v * v / (2 * G))}


out = {}

# clean-si, g981-si, inch-mm-si: 70 m³/h through 240 m of 102.3 mm pipe, ε 0.045 mm, ν typed 1.1386e-6 m²/s.
si = darcy(70 / 3600, 0.1023, 240, 0.045e-3, 1.1386e-6)
out["clean-si"] = {"result": si["head_loss"], "unit": "m", "steps": si}
out["g981-si"] = out["clean-si"]
# inch-mm-si: the same pipe given as 4.026 in.
mm = darcy(70 / 3600, 4.026 * IN, 240, 0.045e-3, 1.1386e-6)
out["inch-mm-si"] = {"result": mm["head_loss"], "unit": "m", "steps": mm}

# swamee-us, g322-us, imperial-us: 300 gpm through 650 ft of 4.026 in pipe, ε 0.00015 ft, ν 1.217e-5 ft²/s.
us = darcy(300 * GAL / 60, 4.026 * IN, 650 * FT, 0.00015 * FT, 1.217e-5 * FT * FT)
us_ft = {**us, "V": us["V"] / FT, "velocity_head": us["velocity_head"] / FT, "head_loss": us["head_loss"] / FT}
for book in ["swamee-us", "g322-us", "imperial-us"]:
    out[book] = {"result": us["head_loss"] / FT, "unit": "ft", "steps": us_ft}

# density-cell-si and density-text-si: shaft power at 90 m³/h, 38.5 m, 74 %, water at 60 °C.
w60 = water(60)
out["density-cell-si"] = {"result": w60["density"] * G * (90 / 3600) * 38.5 / 0.74 / 1000, "unit": "kW", "water": w60}
out["density-text-si"] = out["density-cell-si"]

# gauge-us: tank at 5 psig (standard atmosphere above it), surface 6 ft above the eye, 2.5 ft suction loss, water at 70 °F.
w70 = water((70 - 32) / 1.8)
rho_typed = 62.30 * LB_FT3  # the sheet types ρ = 62.30 lb/ft³
npsh = ((5 * PSI + ATM) - w70["vapour_pressure"]) / (rho_typed * G) + 6 * FT - 2.5 * FT
out["gauge-us"] = {"result": npsh / FT, "unit": "ft", "water": w70}

# vapour-left-si: open tank at 101.325 kPa, surface 1.8 m above the eye, 0.9 m loss, 60 °C, ρ typed 983.2 kg/m³.
out["vapour-left-si"] = {"result": (ATM - w60["vapour_pressure"]) / (983.2 * G) + 1.8 - 0.9, "unit": "m", "water": w60}

# velhead-si: 25 L/s through 154.1 mm, ΣK = 0.5 + 0.15 + 3 × 0.3 + 1.0 = 2.55.
v = 0.025 / (mpmath.pi * 0.1541**2 / 4)
out["velhead-si"] = {"result": float(2.55 * v * v / (2 * G)), "unit": "m", "steps": {"V": float(v), "velocity_head": float(v * v / (2 * G))}}

# reynolds-si: Colebrook at the Reynolds number and ε/D of clean-si.
out["reynolds-si"] = {"result": si["f"], "unit": "", "steps": si}

# npsh-no-temp-si: open tank 101.325 kPa, 1.2 m above the eye, 0.6 m loss, p_v typed 7.384 kPa, ρ typed 992.2 kg/m³
# (water at 40 °C; the sheet names no temperature). Correct at 40 °C with the typed density:
w40 = water(40)
out["npsh-no-temp-si"] = {"result": (ATM - w40["vapour_pressure"]) / (992.2 * G) + 1.2 - 0.6, "unit": "m", "water": w40}

out["_versions"] = {"python": platform.python_version(), "iapws": iapws.__version__, "mpmath": mpmath.__version__}
(Path(__file__).parent / "hand_sheets_reference.json").write_text(json.dumps(out, indent=1) + "\n")
print(json.dumps({k: v.get("result") for k, v in out.items() if k != "_versions"}, indent=1))
print("typed ν at 15 °C", water(15)["kinematic_viscosity"], "ρ 70 °F", w70["density"] / LB_FT3, "pv 70F psia", w70["vapour_pressure"] / PSI, "pv 40C", w40["vapour_pressure"], w40["density"])
