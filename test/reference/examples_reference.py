"""
Independent computations behind the catalogue's worked examples that cite one (SciPy PCHIP
values, the Swamee-Jain formula in Python, Colebrook solved with mpmath for a two-segment
system). Writes examples_reference.json beside this file with the versions used; the project's
tests compare each such example's expected value with this file (test/catalog.test.ts).

    python3 test/reference/examples_reference.py

The data are the examples' own (invented curves and pipes), typed in again here.
"""
import json
import math
import platform
from pathlib import Path

import mpmath
import numpy
import scipy
from scipy.interpolate import PchipInterpolator

G = 9.80665
GPM = 3.785411784e-3 / 60  # m³/s per US gpm (NIST SP 811: gallon 3.785411784 L)
FT = 0.3048
HP = 745.69987158227022  # W per mechanical horsepower (NIST SP 811)

# PUMP.HEAD, PUMP.EFFICIENCY, PUMP.NPSHR, PUMP.POWER: the US curve at 250 gpm.
q = [0, 100, 200, 300, 400]
head = PchipInterpolator(q, [100, 98, 92, 80, 60])(250).item()
eff = PchipInterpolator(q, [0, 0.55, 0.72, 0.76, 0.70])(250).item()
npshr = PchipInterpolator(q[1:], [6, 8, 11, 16])(250).item()  # blank NPSHr at shutoff skipped
power_hp = 1000 * G * 250 * GPM * head * FT / eff / HP

# PUMP.SELECT: the 230 mm impeller of the invented family at 80 m³/h.
qf = [0, 50, 100, 150]
select_head = PchipInterpolator(qf, [34, 32.6, 28.5, 21])(80).item()
select_eff = PchipInterpolator(qf, [0, 0.60, 0.72, 0.67])(80).item()
smaller_head = PchipInterpolator(qf, [28, 26.8, 23, 16])(80).item()

# FRICTION, "swamee-jain": Re 1e5, eps/D 1e-4.
swamee = 0.25 / math.log10(1e-4 / 3.7 + 5.74 / 1e5**0.9) ** 2

# SYSTEM.HEAD: 0.02 m³/s through two segments, nu 1.004e-6 m²/s, static 15 m.
mpmath.mp.dps = 40


def colebrook(re, rr):
    """Darcy f from Colebrook, 1/sqrt(f) = -2 log10(rr/3.7 + 2.51/(Re sqrt(f))), solved for y = 1/sqrt(f)."""
    y = mpmath.findroot(lambda y: y + 2 * mpmath.log10(rr / 3.7 + mpmath.mpf("2.51") * y / re), 8)
    return 1 / y**2


total = mpmath.mpf(15)
for length, d_mm, eps_mm, k in [(12, 154.1, 0.045, 2.5), (180, 102.3, 0.045, 6)]:
    d = mpmath.mpf(d_mm) / 1000
    v = mpmath.mpf("0.02") / (mpmath.pi * d**2 / 4)
    re = v * d / mpmath.mpf("1.004e-6")
    f = colebrook(re, mpmath.mpf(eps_mm) / 1000 / d)
    total += (f * length / d + k) * v**2 / (2 * G)

out = {
    "description": "Independent values behind the catalogue's worked examples (see the docstring of examples_reference.py).",
    "generator": "test/reference/examples_reference.py",
    "versions": {"python": platform.python_version(), "numpy": numpy.__version__, "scipy": scipy.__version__, "mpmath": mpmath.__version__},
    "examples": {
        "PUMP.HEAD": head,
        "PUMP.EFFICIENCY": eff,
        "PUMP.NPSHR": npshr,
        "PUMP.POWER": power_hp,
        "PUMP.SELECT": [[230, select_head, select_eff, ""]],
        "FRICTION": swamee,
        "SYSTEM.HEAD": float(total),
    },
    "notes": {"PUMP.SELECT": f"the next smaller impeller, 210 mm, gives {smaller_head:.4f} m: too little"},
}
Path(__file__).with_name("examples_reference.json").write_text(json.dumps(out, indent=2) + "\n")
print(json.dumps(out["examples"], indent=2))
