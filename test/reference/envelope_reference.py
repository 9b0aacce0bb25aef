"""Independent solutions of a pump's operating envelope, for test/envelope.test.ts.

The pump curve, pipes and cases are invented test data (not any maker's pump). Each corner is
solved here with SciPy alone: PchipInterpolator for the curve's head, efficiency and NPSHr
columns, brentq for the Colebrook friction factor and for the crossing of the pump and system
curves, and the affinity laws for speed. The best efficiency point is the vertex of
numpy.polyfit (degree 2) through the top efficiency point and up to two neighbours each side.

Water properties at the case temperatures are handbook values (IAPWS-95 based tables, from
memory): 15 °C: 999.10 kg/m³, 1.1375 mPa·s, 1.7057 kPa; 30 °C: 995.65 kg/m³, 0.7972 mPa·s,
4.2470 kPa. Standard gravity 9.80665 m/s² (NIST SP 811). Run: python3 test/reference/envelope_reference.py
"""

import json
import math
import platform
from pathlib import Path

import numpy as np
import scipy
from scipy.interpolate import PchipInterpolator
from scipy.optimize import brentq, minimize_scalar

G = 9.80665
GPM = 3.785411784e-3 / 60  # m³/s per US gpm (NIST SP 811)
FT = 0.3048
WATER = {15: (999.10, 1.1375e-3, 1705.7), 30: (995.65, 0.7972e-3, 4247.0)}
ATM = 101325.0

# Invented curve: Flow (gpm), Head (ft), Eff (%), NPSHr (ft); NPSHr blank at shutoff.
CURVE = [[0, 100, 0, None], [100, 98, 55, 6], [200, 92, 72, 8], [300, 80, 76, 11], [400, 60, 70, 16]]
SUCTION = [(6.0, 0.1541, 4.5e-5, 2.0)]  # length m, ID m, roughness m, K
DISCHARGE = [(250.0, 0.1023, 4.5e-5, 8.0)]
CASES = [
    # label, suction level m, discharge level m, roughness m or None, temperature °C, pumps, speed, hours
    ("design", 2.0, 12.0, None, 15, 1, 1.0, 3000),
    ("low level, aged pipe", -1.5, 12.0, 5e-4, 30, 1, 1.0, 1000),
    ("two pumps", 3.5, 12.0, None, 15, 2, 1.0, 500),
    ("reduced speed", 2.0, 12.0, None, 15, 1, 0.9, 500),
    ("deep lift", -8.5, 12.0, None, 30, 1, 1.0, 100),
]

def interpolants(curve):
    """PCHIP head (m), efficiency (fraction) and NPSHr (m) of a curve given in gpm, ft, %, ft."""
    x = np.array([r[0] for r in curve]) * GPM
    pts = [(r[0] * GPM, r[3] * FT) for r in curve if r[3] is not None]
    return {
        "x": x,
        "effs": [r[2] for r in curve],
        "head": PchipInterpolator(x, np.array([r[1] for r in curve]) * FT),
        "eff": PchipInterpolator(x, np.array([r[2] for r in curve]) / 100),
        "npshr": PchipInterpolator([p[0] for p in pts], [p[1] for p in pts]),
    }


def colebrook(re, rr):
    if re < 2000:
        return 64 / re
    g = lambda f: 1 / math.sqrt(f) + 2 * math.log10(rr / 3.7 + 2.51 / (re * math.sqrt(f)))
    return brentq(g, 1e-4, 1.0, xtol=1e-16, rtol=1e-15)


def losses(flow, segments, nu, roughness):
    total = 0.0
    for length, d, e, k in segments:
        if flow == 0:
            continue
        v = flow / (math.pi * d * d / 4)
        f = colebrook(v * d / nu, (roughness if roughness is not None else e) / d)
        total += (f * length / d + k) * v * v / (2 * G)
    return total


def bep_of(c):
    """Vertex of numpy.polyfit (degree 2) through the top efficiency point and up to two neighbours each side."""
    top = c["effs"].index(max(c["effs"]))
    lo, hi = max(0, top - 2), min(len(c["effs"]) - 1, top + 2)
    a, b, k = np.polyfit(c["x"][lo : hi + 1], np.array(c["effs"][lo : hi + 1]) / 100, 2)
    flow = -b / (2 * a)
    return {"flow": flow, "efficiency": float(np.polyval([a, b, k], flow)), "head": float(c["head"](flow))}


def corner(c, bep, case):
    label, zs, zd, rough, temp, n, r, hours = case
    rho, mu, pv = WATER[temp]
    nu = mu / rho
    system = lambda x: zd - zs + losses(x, SUCTION, nu, rough) + losses(n * x, DISCHARGE, nu, rough)
    pump = lambda x: r * r * float(c["head"](x / r))
    flow = brentq(lambda x: pump(x) - system(x), c["x"][0] * r + 1e-12, c["x"][-1] * r, xtol=1e-15, rtol=1e-15)
    h = pump(flow)
    e = float(c["eff"](flow / r))
    power = rho * G * flow * h / e
    npsha = (ATM - pv) / (rho * G) + zs - losses(flow, SUCTION, nu, rough)
    nr = r * r * float(c["npshr"](flow / r))
    return {
        "label": label,
        "flow_total": n * flow,
        "flow_per_pump": flow,
        "head": h,
        "fraction_of_bep": flow / (r * bep["flow"]),
        "efficiency": e,
        "shaft_power": power,
        "npsha": npsha,
        "npshr": nr,
        "margin": npsha / nr,
        "energy_kwh": n * power * hours / 1000,
    }


def end_of_curve(c, rho):
    """The largest ρgQH/η on a fine grid to the end of the curve."""
    grid = np.linspace(c["x"][1] / 4, c["x"][-1], 200001)
    p = rho * G * grid * c["head"](grid) / c["eff"](grid)
    return {"power": float(p.max()), "flow": float(grid[p.argmax()])}


def max_power_bounded(c, rho):
    """The largest ρgQH/η: the best of 400 even steps over the curve, then SciPy's bounded optimiser
    (minimize_scalar, method "bounded") between that step's neighbours."""
    lo, hi = c["x"][0], c["x"][-1]
    grid = np.linspace(lo, hi, 401)
    power = lambda q: rho * G * q * c["head"](q) / c["eff"](q) if c["eff"](q) > 0 else 0.0
    p = np.array([power(q) for q in grid])
    i = int(p.argmax())
    a, b = grid[max(i - 1, 0)], grid[min(i + 1, 400)]
    r = minimize_scalar(lambda q: -power(q), bounds=(a, b), method="bounded", options={"xatol": 1e-14})
    return {"power": float(-r.fun), "flow": float(r.x), "bracket": [float(a), float(b)]}


# An invented curve whose power peaks inside it (efficiency rises again past 800 gpm):
# Flow (gpm), Head (ft), Eff (%).
CURVE_PEAK = [[0, 120, 0], [200, 118, 50], [400, 112, 68], [600, 100, 76], [800, 82, 74], [1000, 50, 66]]


def interpolants_he(curve):
    x = np.array([r[0] for r in curve]) * GPM
    return {"x": x, "head": PchipInterpolator(x, np.array([r[1] for r in curve]) * FT), "eff": PchipInterpolator(x, np.array([r[2] for r in curve]) / 100)}


# A second, smaller impeller for the selection table (invented): 230 mm beside the 250 mm curve above.
CURVE_230 = [[0, 86, 0, None], [100, 84, 53, 6], [200, 78, 70, 8], [300, 66, 73, 11], [400, 46, 66, 16]]
c250 = interpolants(CURVE)
bep = bep_of(c250)
corners = [corner(c250, bep, case) for case in CASES]
end_of_curve_15 = end_of_curve(c250, WATER[15][0])

out = {
    "description": "Envelope corners solved independently with SciPy (PCHIP, brentq, Colebrook) and numpy.polyfit for the BEP",
    "generator": "test/reference/envelope_reference.py",
    "versions": {"python": platform.python_version(), "numpy": np.__version__, "scipy": scipy.__version__},
    "curve": CURVE,
    "suction": SUCTION,
    "discharge": DISCHARGE,
    "cases": CASES,
    "bep": bep,
    "corners": corners,
    "end_of_curve_15C": end_of_curve_15,
    "curve_peak": CURVE_PEAK,
    "max_power_peak_15C": max_power_bounded(interpolants_he(CURVE_PEAK), WATER[15][0]),
}
if __name__ == "__main__":
    Path(__file__).with_name("envelope_reference.json").write_text(json.dumps(out, indent=1) + "\n")
    print(json.dumps({"bep": bep, "corners": [(c["label"], round(c["flow_per_pump"] / GPM, 2), round(c["margin"], 3)) for c in corners], "eoc": end_of_curve_15}, indent=1))
