"""Colebrook friction factors solved independently to 40 significant digits with mpmath.

Writes colebrook_reference.json beside this file, with the versions used. The project's
tests read the JSON; they never need Python. Run: python3 test/reference/colebrook_reference.py
"""
import json
import platform
from pathlib import Path

import mpmath

mpmath.mp.dps = 40

# 2000–3000: the transitional range, where the solver starts furthest from the root; 1e9: beyond
# the Moody chart; ε/D 0.1–0.5: rough beyond the chart, up to the largest the functions accept.
REYNOLDS = ["2000", "2500", "3000", "4000", "5000", "1e4", "3e4", "1e5", "3e5", "1e6", "3e6", "1e7", "1e8", "1e9"]
RELATIVE_ROUGHNESS = ["0", "1e-6", "1e-5", "1e-4", "1e-3", "1e-2", "0.05", "0.1", "0.5"]


def colebrook(re, rr):
    """Solve 1/sqrt(f) = -2 log10(rr/3.7 + 2.51/(Re sqrt(f))) for f with mpmath.findroot."""
    g = lambda x: x + 2 * mpmath.log10(rr / mpmath.mpf("3.7") + mpmath.mpf("2.51") * x / re)
    x = mpmath.findroot(g, mpmath.mpf(8))
    assert abs(g(x)) < mpmath.mpf("1e-35"), (re, rr)
    return 1 / x**2


rows = []
for re_text in REYNOLDS:
    for rr_text in RELATIVE_ROUGHNESS:
        f = colebrook(mpmath.mpf(re_text), mpmath.mpf(rr_text))
        rows.append({"reynolds": float(re_text), "relative_roughness": float(rr_text), "f": mpmath.nstr(f, 25)})

out = {
    "description": "Darcy friction factor from the Colebrook (1939) equation, solved with mpmath.findroot at 40 digits",
    "generator": "test/reference/colebrook_reference.py",
    "versions": {"python": platform.python_version(), "mpmath": mpmath.__version__},
    "rows": rows,
}
Path(__file__).with_name("colebrook_reference.json").write_text(json.dumps(out, indent=1) + "\n")
print(f"wrote {len(rows)} rows")
