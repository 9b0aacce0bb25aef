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

# PUMP.BEP, PUMP.REGION, PUMP.MAXPOWER, PUMP.ENVELOPE, PUMP.SHORTLIST: the envelope of envelope_reference.py
# (SciPy PCHIP, brentq and Colebrook; numpy.polyfit BEP). Only the first two cases go into the examples.
import sys

sys.path.insert(0, str(Path(__file__).parent))
import envelope_reference as env  # noqa: E402

HEADER_ENVELOPE = ["Case", "Flow (gpm)", "Flow per pump (gpm)", "Head (ft)", "% of BEP", "Eff (%)", "Shaft power per pump (hp)", "NPSHa (ft)", "NPSHr (ft)", "NPSH margin", "Energy (kWh/yr)", "Verdict"]


def envelope_row(c):
    return [c["label"], c["flow_total"] / GPM, c["flow_per_pump"] / GPM, c["head"] / FT, c["fraction_of_bep"] * 100, c["efficiency"] * 100, c["shaft_power"] / HP, c["npsha"] / FT, c["npshr"] / FT, c["margin"], c["energy_kwh"], "ok"]


NEMA_HP = [0.5, 0.75, 1, 1.5, 2, 3, 5, 7.5, 10, 15, 20, 25, 30, 40, 50]  # NEMA MG 1 (from memory)
shortlist = []
for label, curve in [(230, env.CURVE_230), (250, env.CURVE)]:
    c = env.interpolants(curve)
    b = env.bep_of(c)
    cs = [env.corner(c, b, case) for case in env.CASES[:2]]
    end = env.end_of_curve(c, env.WATER[15][0])["power"]
    need = max(end, *(x["shaft_power"] for x in cs))
    motor = next(r for r in NEMA_HP if r * HP >= need * (1 - 1e-12))
    d = cs[0]
    shortlist.append([label, d["flow_total"] / GPM, d["head"] / FT, d["fraction_of_bep"] * 100, d["efficiency"] * 100, d["shaft_power"] / HP, end / HP, motor, min(x["margin"] for x in cs), sum(x["energy_kwh"] for x in cs), d["efficiency"]])
best = max(shortlist, key=lambda r: r[-1])
for r in shortlist:
    eff_r = r.pop()
    r.append(
        f"recommended: passes every check at every corner, with the best efficiency at the design duty ({eff_r * 100:.1f} %)"
        if eff_r == best[-1] or r[0] == best[0]
        else f"passes, but {eff_r * 100:.1f} % at the design duty against {best[4]:.1f} % for {best[0]}"
    )

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
        "PUMP.BEP": [["BEP flow (gpm)", "BEP head (ft)", "BEP efficiency (%)", "POR from (gpm)", "POR to (gpm)"], [env.bep["flow"] / GPM, env.bep["head"] / FT, env.bep["efficiency"] * 100, 0.7 * env.bep["flow"] / GPM, 1.2 * env.bep["flow"] / GPM]],
        "PUMP.REGION": 250 * GPM / env.bep["flow"],
        "PUMP.MAXPOWER": [["Largest shaft power (hp)", "At flow (gpm)", "Motor (hp)"], [env.end_of_curve(env.c250, 999.1)["power"] / HP, env.end_of_curve(env.c250, 999.1)["flow"] / GPM, 10]],
        "PUMP.ENVELOPE": [HEADER_ENVELOPE, *(envelope_row(c) for c in env.corners[:2])],
        "PUMP.SHORTLIST": [["Impeller", "Flow (gpm)", "Head (ft)", "% of BEP", "Eff (%)", "Shaft power (hp)", "End-of-curve power (hp)", "Motor (hp)", "Worst NPSH margin", "Energy (kWh/yr)", "Verdict"], *shortlist],
    },
    "notes": {"PUMP.SELECT": f"the next smaller impeller, 210 mm, gives {smaller_head:.4f} m: too little"},
}
Path(__file__).with_name("examples_reference.json").write_text(json.dumps(out, indent=2) + "\n")
print(json.dumps(out["examples"], indent=2))
