"""Reference values for pump-curve evaluation, computed independently with SciPy and NumPy.

PCHIP: scipy.interpolate.PchipInterpolator. Least squares: numpy.polyfit (degree 2 and 3).
Writes curve_reference.json beside this file with the versions used; the project's tests read
it and never need Python. Run: python3 test/reference/curve_reference.py

The curves are invented test data (a falling head curve, a drooping head curve that rises to a
peak, an efficiency hump, unevenly spaced points), not any maker's pump.
"""
import json
import platform
from pathlib import Path

import numpy as np
import scipy
from scipy.interpolate import PchipInterpolator
from scipy.optimize import brentq

CURVES = {
    "falling": {"x": [0.0, 0.01, 0.02, 0.03, 0.04, 0.05], "y": [52.0, 51.2, 49.0, 45.1, 39.5, 32.0]},
    "drooping": {"x": [0.0, 0.005, 0.012, 0.02, 0.031, 0.04], "y": [30.0, 31.5, 31.8, 30.2, 25.7, 20.1]},
    "efficiency": {"x": [0.0, 0.008, 0.016, 0.024, 0.032, 0.04, 0.046], "y": [0.0, 0.42, 0.63, 0.74, 0.78, 0.75, 0.69]},
    "uneven": {"x": [0.002, 0.003, 0.011, 0.012, 0.03], "y": [40.0, 39.9, 36.0, 35.1, 18.0]},
}

out = {
    "description": "Pump-curve evaluation references: SciPy PchipInterpolator and numpy.polyfit least squares",
    "generator": "test/reference/curve_reference.py",
    "versions": {"python": platform.python_version(), "numpy": np.__version__, "scipy": scipy.__version__},
    "curves": {},
}
for name, c in CURVES.items():
    x = np.array(c["x"])
    y = np.array(c["y"])
    q = np.linspace(x[0], x[-1], 41)
    f = PchipInterpolator(x, y)
    # slopes: the derivative at each point, which a reviewer needs to check a PCHIP value by hand.
    entry = {"x": c["x"], "y": c["y"], "q": q.tolist(), "pchip": f(q).tolist(), "slopes": f.derivative()(x).tolist()}
    for degree, key in [(2, "quadratic"), (3, "cubic")]:
        if len(x) >= degree + 2:
            entry[key] = np.polyval(np.polyfit(x, y, degree), q).tolist()
    out["curves"][name] = entry

# Operating points: brentq on PCHIP(head) - (Hs + k Q^2) over the curve's flow range.
duty_cases = [("falling", 20.0, 8000.0), ("falling", 30.0, 4000.0), ("drooping", 15.0, 6000.0), ("uneven", 10.0, 20000.0)]
out["operating_points"] = []
for name, hs, k in duty_cases:
    c = CURVES[name]
    f = PchipInterpolator(np.array(c["x"]), np.array(c["y"]))
    g = lambda q: float(f(q)) - (hs + k * q * q)
    q = brentq(g, c["x"][0], c["x"][-1], xtol=1e-15, rtol=1e-15)
    out["operating_points"].append({"curve": name, "static_head": hs, "k": k, "flow": q, "head": float(f(q))})

# Affinity ratios: brentq on r^2 PCHIP(Q/r) - H.
ratio_cases = [("falling", 0.03, 38.0), ("falling", 0.02, 60.0), ("uneven", 0.008, 30.0)]
out["affinity_ratios"] = []
for name, qd, hd in ratio_cases:
    c = CURVES[name]
    f = PchipInterpolator(np.array(c["x"]), np.array(c["y"]))
    lo = qd / c["x"][-1]
    hi = qd / c["x"][0] if c["x"][0] > 0 else 10.0
    g = lambda r: r * r * float(f(min(max(qd / r, c["x"][0]), c["x"][-1]))) - hd
    r = brentq(g, lo, hi, xtol=1e-15, rtol=1e-15)
    out["affinity_ratios"].append({"curve": name, "flow": qd, "head": hd, "ratio": r})

Path(__file__).with_name("curve_reference.json").write_text(json.dumps(out, indent=1) + "\n")
print("wrote", ", ".join(out["curves"]))
