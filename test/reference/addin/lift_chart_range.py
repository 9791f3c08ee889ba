"""
Reference values for the grid of LIFT_DENSITY (conversion.ts liftChartRange): for each case, each challenger's
lift quantiles at 1%, 25%, 75% and 99% by scipy, and the grid ends the help states: per challenger
lo = max(q01, q25 - 3 (q75 - q25)), hi = min(q99, q75 + 3 (q75 - q25)), the grid from the smallest lo to the
largest hi. The counts are invented.

With X ~ Beta(alpha + x_A, beta + n_A - x_A) the control's rate and Y the challenger's, the lift L = Y/X - 1 has
  P(L <= l) = int f_X(x) F_Y((1 + l) x) dx,
integrated with scipy.integrate.quad over the control's central 1 - 2e-13 range split at its quantiles
1e-6, 0.001, 0.5, 0.999, 1 - 1e-6 (epsrel 1e-12); quantiles by brentq (xtol 1e-14, rtol 1e-13) in log(1 + l).

Run: python3 test/reference/addin/lift_chart_range.py > test/reference/addin/lift_chart_range.json
"""
import json
import math

import scipy
from scipy.integrate import quad
from scipy.optimize import brentq
from scipy.stats import beta

CASES = [
    ('no conversions in the control, uniform prior (the tail is fenced)', [(0, 1000), (10, 1000)], (1, 1)),
    ('no conversions in the control, prior 0.5 and 0.5 (the tail is fenced)', [(0, 1000), (10, 1000)], (0.5, 0.5)),
    ('a light-tailed lift (the 1% and 99% quantiles are the ends)', [(120, 2400), (150, 2380)], (1, 1)),
    ('two challengers: the grid spans both', [(50, 1000), (65, 1000), (40, 1000)], (1, 1)),
]


def lift_cdf(control, challenger, lift):
    cuts = [control.ppf(1e-13)] + [control.ppf(p) for p in (1e-6, 0.001, 0.5, 0.999)] + [control.isf(1e-6), control.isf(1e-13)]
    total = 0.0
    for lo, hi in zip(cuts[:-1], cuts[1:]):
        value, _ = quad(lambda t: control.pdf(t) * challenger.cdf((1 + lift) * t), lo, hi,
                        epsabs=0, epsrel=1e-12, limit=400)
        total += value
    return total


def lift_quantile(control, challenger, p):
    f = lambda r: lift_cdf(control, challenger, math.expm1(r)) - p
    lo, hi = -1.0, 1.0
    while f(lo) > 0:
        lo *= 2
    while f(hi) < 0:
        hi *= 2
    return math.expm1(brentq(f, lo, hi, xtol=1e-14, rtol=1e-13))


def main():
    out = []
    for why, counts, (a, b) in CASES:
        control = beta(a + counts[0][0], b + counts[0][1] - counts[0][0])
        challengers = []
        ends = []
        for x, n in counts[1:]:
            y = beta(a + x, b + n - x)
            q01, q25, q75, q99 = (lift_quantile(control, y, p) for p in (0.01, 0.25, 0.75, 0.99))
            spread = q75 - q25
            ends.append((max(q01, q25 - 3 * spread), min(q99, q75 + 3 * spread)))
            challengers.append({'q01': q01, 'q25': q25, 'q75': q75, 'q99': q99})
        out.append({'why': why, 'variants': counts, 'prior': [a, b], 'challengers': challengers,
                    'gridStart': min(e[0] for e in ends), 'gridEnd': max(e[1] for e in ends)})
    print(json.dumps({'source': 'lift_chart_range.py, scipy ' + scipy.__version__, 'cases': out}, indent=1))


if __name__ == '__main__':
    main()
