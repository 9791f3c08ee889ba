#!/usr/bin/env python3
"""Reference log densities for functions/stats/gammaDensity.ts (Gamma(a, b) in z = log(rate)).

In z the density is f_gamma(e^z; a, b) * e^z, so relative to its mode z0 = log(a/b) it is
logpdf(e^z) + z - logpdf(e^z0) - z0. Values in mpmath (40 digits, where the subtraction is exact
enough even at a = 1e9) and scipy.stats.gamma.logpdf (Boost) for moderate shapes.
Run: python3 test/reference/events/events_density.py > test/reference/events/events_density.json
"""
import json
import math
import sys

import mpmath as mp
from scipy import stats

mp.mp.dps = 40
rows = []
for a, b in ((1.0, 500.0), (0.5, 10.0), (121.0, 1000.0), (12001.0, 1e5), (1e9 + 1, 4e8)):
    z0 = math.log(a / b)
    sd = 1 / math.sqrt(a)
    for k in (-30.0, -5.0, -1.0, -0.01, 0.0, 0.3, 2.0, 6.0):
        z = z0 + k * sd
        ma, mb, mz = mp.mpf(a), mp.mpf(b), mp.mpf(z)
        mz0 = mp.log(ma / mb)
        value = ma * (mz - mz0) - mb * (mp.exp(mz) - mp.exp(mz0))
        scipy_value = None
        if a < 1e6:
            scipy_value = float(stats.gamma.logpdf(math.exp(z), a, scale=1 / b) + z
                                - stats.gamma.logpdf(math.exp(z0), a, scale=1 / b) - z0)
        rows.append({"shape": a, "rate": b, "z": z, "mpmath": float(value), "scipy": scipy_value})
json.dump({"source": "test/reference/events/events_density.py (mpmath 40 digits; scipy.stats.gamma.logpdf)", "rows": rows},
          sys.stdout, indent=1)
sys.stdout.write("\n")
