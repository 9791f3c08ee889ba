#!/usr/bin/env python3
"""Expected losses of twelve variants of very mixed counts (5 to 5e8) in the Normal model, where the t
posteriors are not all log-concave in one shared coordinate, so the add-in tabulates each in its own.

Model: Gelman et al., Bayesian Data Analysis, 3rd ed., section 3.2 (Student t, n - 1 df, centre the mean,
scale sd / sqrt(n)). loss_i = int F_i(x) (1 - prod_{j != i} F_j(x)) dx, with F from scipy.stats.t.logcdf and
1 - prod F = -expm1(sum log F); scipy.integrate.quad (epsrel 1e-13) between breakpoints at each posterior's
centre +- its scale times 0, 1/4, ..., 4 and 2^3 ... 2^40, plus the two infinite tails.
The counts, means and sds are an invented scenario (average order value per visitor of twelve page layouts).
Run: python3 test/reference/means/means_many_mixed.py > test/reference/means/means_many_mixed.json
"""
import json
import math
import sys

import numpy as np
from scipy import integrate, stats

VARIANTS = [
    (5, 48.0, 21.0),
    (8, 55.0, 18.0),
    (40, 51.5, 20.0),
    (300, 50.2, 19.0),
    (12000, 50.9, 20.5),
    (2000000, 50.45, 19.5),
    (500000000, 50.4, 20.0),
    (7, 44.0, 25.0),
    (150000, 50.6, 20.0),
    (60, 53.0, 22.0),
    (30000000, 50.41, 20.0),
    (20, 49.0, 17.0),
]


def main():
    ts = [stats.t(df=n - 1, loc=m, scale=s / math.sqrt(n)) for n, m, s in VARIANTS]
    steps = [q / 4 for q in range(17)] + [2.0**e for e in range(3, 41)]
    points = set()
    for n, m, s in VARIANTS:
        sc = s / math.sqrt(n)
        for q in steps:
            points.add(m + q * sc)
            points.add(m - q * sc)
    points = sorted(points)
    losses = []
    for i, ti in enumerate(ts):
        others = [t for j, t in enumerate(ts) if j != i]

        def integrand(x):
            logs = sum(t.logcdf(x) for t in others)
            return ti.cdf(x) * -math.expm1(logs)

        total = integrate.quad(integrand, -np.inf, points[0], epsabs=0, epsrel=1e-13, limit=500)[0]
        total += integrate.quad(integrand, points[-1], np.inf, epsabs=0, epsrel=1e-13, limit=500)[0]
        for a, b in zip(points[:-1], points[1:]):
            total += integrate.quad(integrand, a, b, epsabs=0, epsrel=1e-13, limit=200)[0]
        losses.append(total)
    json.dump({"source": "test/reference/means/means_many_mixed.py (scipy.stats.t, scipy.integrate.quad epsrel 1e-13)",
               "name": "many_mixed_12", "variants": [{"count": n, "mean": m, "sd": s} for n, m, s in VARIANTS],
               "expectedLoss": losses}, sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
