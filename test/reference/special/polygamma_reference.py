#!/usr/bin/python3
"""Reference values of the tetragamma and pentagamma functions psi''(x) and psi'''(x) for
functions/stats/special/gamma.ts (Lift Ledger), from mpmath.psi(2, x) and mpmath.psi(3, x) at 40 digits.

Run with a python3 that has mpmath (1.3 here):
    python3 test/reference/special/polygamma_reference.py > test/reference/special/polygamma_values.json

Every input is a double; mpmath receives it exactly (mpf(float)). Outputs are rounded to doubles.
Rows are [x, psi''(x)] under "tetragamma" and [x, psi'''(x)] under "pentagamma".
"""
import json

import mpmath as mp

mp.mp.dps = 40

# Across the recurrence (x < 10), the switch to the asymptotic series (x = 10) and far into it; the
# planner calls both with posterior shapes from a prior's (tiny) alpha up to ~1e10 visitors.
XS = [1e-8, 1e-3, 0.1, 0.5, 1.0, 1.5, 2.0, 3.7, 9.99, 10.0, 10.5, 17.25, 123.4, 1e4, 1e6, 1e9]

out = {
    "source": "mpmath %s, mp.dps = 40: psi(2, x) and psi(3, x)" % mp.__version__,
    "tetragamma": [[x, float(mp.psi(2, mp.mpf(x)))] for x in XS],
    "pentagamma": [[x, float(mp.psi(3, mp.mpf(x)))] for x in XS],
}
lines = ['{', '  "source": %s,' % json.dumps(out["source"])]
for i, name in enumerate(["tetragamma", "pentagamma"]):
    rows = ",\n".join("    " + json.dumps(r) for r in out[name])
    lines.append('  "%s": [\n%s\n  ]%s' % (name, rows, "," if i == 0 else ""))
lines.append("}")
print("\n".join(lines))
