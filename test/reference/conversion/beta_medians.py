#!/usr/bin/env python3
"""Medians of Beta(a, b) posteriors, by scipy.special.betaincinv(a, b, 0.5) (Boost's ibeta_inv).

Run with a python3 that has scipy and mpmath (scipy 1.17.1, mpmath 1.3.0 here):
    python3 test/reference/conversion/beta_medians.py > test/reference/conversion/beta_medians.json
test/stats/quadratureCaches.test.ts reads the JSON (TabulatedDistribution.median against it).
Check under "checks" (for a person): where mpmath.betainc converges (the shapes below 1e4), the median
again as the root of mpmath.betainc(a, b, 0, x) = 1/2 at 30 digits (mpmath.findroot from scipy's value);
worst relative difference from scipy.
"""
import json

import mpmath as mp
from scipy.special import betaincinv

mp.mp.dps = 30

# (a, b, why): posterior shapes 1 + conversions, 1 + visitors - conversions, and two non-integer priors.
CASES = [
    (8, 10, '7 of 16 converted'),
    (1, 1, 'the uniform prior'),
    (1, 1001, 'no conversions in 1000 visitors'),
    (1001, 1, 'all of 1000 visitors converted'),
    (0.5, 0.5, 'the Jeffreys prior'),
    (101, 901, '100 of 1000'),
    (3.5, 40.5, 'a Jeffreys posterior, 3 of 40'),
    (50001, 950001, '5% of 1e6'),
    (20000001, 980000001, '2% of 1e9'),
    (3, 1000000000, '2 of 1e9'),
]


def main():
    out = {'source': 'scipy.special.betaincinv(a, b, 0.5): test/reference/conversion/beta_medians.py', 'cases': []}
    worst = mp.mpf(0)
    for a, b, why in CASES:
        med = float(betaincinv(a, b, 0.5))
        out['cases'].append({'why': why, 'a': a, 'b': b, 'median': repr(med)})
        if a + b < 1e4:
            root = mp.findroot(lambda x: mp.betainc(a, b, 0, x, regularized=True) - mp.mpf(1) / 2, mp.mpf(med), tol=mp.mpf(10) ** -26)
            worst = max(worst, abs(root / med - 1))
    out['checks'] = {'mpmathVsScipyWorstRelative': mp.nstr(worst, 5)}
    print(json.dumps(out, indent=1))


if __name__ == '__main__':
    main()
