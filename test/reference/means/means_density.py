#!/usr/bin/env python3
"""Reference log densities for functions/stats/studentTDensity.ts (the t posterior in u, x = c + s sinh u).

In u the density is f_t(sinh u; nu) * cosh u (change of variables), so relative to u = 0 it is
logpdf_t(sinh u) - logpdf_t(0) + log cosh u. Values from scipy.stats.t.logpdf (Boost), with
mpmath (40 digits) beside them for the same expression.
Run: python3 test/reference/means/means_density.py > test/reference/means/means_density.json
"""
import json
import math
import sys

import mpmath as mp
from scipy import stats

mp.mp.dps = 40
rows = []
for nu in (1, 2, 3, 9, 99, 1e6, 1e8):
    for u in (-40.0, -7.5, -2.0, -0.5, -1e-3, 0.25, 1.0, 3.0, 12.0, 60.0):
        t = math.sinh(u)
        scipy_value = float(stats.t.logpdf(t, nu) - stats.t.logpdf(0, nu) + math.log(math.cosh(u)))
        mu = mp.mpf(u)
        tt = mp.sinh(mu)
        mp_value = -(mp.mpf(nu) + 1) / 2 * mp.log(1 + tt * tt / nu) + mp.log(mp.cosh(mu))
        rows.append({"df": nu, "u": u, "scipy": scipy_value, "mpmath": float(mp_value)})
json.dump({"source": "test/reference/means/means_density.py (scipy.stats.t.logpdf; mpmath 40 digits)", "rows": rows},
          sys.stdout, indent=1)
sys.stdout.write("\n")
