#!/usr/bin/env python3
"""Expected losses of three variants under very weak priors (issue #10's engine-abort reproductions), by mpmath.

Run with a python3 that has mpmath (1.3.0 here):
    python3 test/reference/conversion/loss_extreme_priors.py > test/reference/conversion/loss_extreme_priors.json
test/stats/lossBudget.test.ts reads the JSON; it never runs python.

The quantity: loss_i = E[max_j X_j - X_i] = int F_i(x) (1 - prod_{j != i} F_j(x)) dx over the support,
X_j the posteriors:
 - conversions: X_j ~ Beta(alpha + conversions_j, beta + visitors_j - conversions_j), F_j = mpmath.betainc
   (regularized);
 - events: X_j ~ Gamma(shape + events_j, rate + exposure_j), F_j = mpmath.gammainc (regularized).
mpmath.quad (tanh-sinh) at 40 digits (for 60,000 visitors mpmath.betainc's series does not converge, so that
case uses scipy.special.betainc and scipy.integrate.quad in double precision, epsrel 1e-13, same split points), the interval split at every posterior's mean +- k sd for k in 0, 1,
2, 4, 8, 16, 32, 64 (clipped to the support) and at 1e-300, 1e-100, 1e-30, 1e-10 (the weak-prior variant's mass
sits at tiny values). A loss below 1e-300 is printed as the string "0" (it underflows a double).
Check printed under "checks": 'meanIdentity', the worst |(loss_i - loss_j) - (mean_j - mean_i)| relative to the
largest loss, with the means exact.
"""
import json

import mpmath as mp
import numpy as np
import scipy
from scipy import integrate, special

mp.mp.dps = 40


def beta_case_scipy(why, conversions, visitors, alpha, beta):
    shapes = [(float(alpha) + c, float(beta) + n - c) for c, n in zip(conversions, visitors)]
    means = [a / (a + b) for a, b in shapes]
    sds = [np.sqrt(a * b / ((a + b) ** 2 * (a + b + 1))) for a, b in shapes]
    points = sorted({z for m, s in zip(means, sds) for k in [0, 1, 2, 4, 8, 16, 32, 64]
                     for z in (m - k * s, m + k * s) if 0 < z < 1} | {1e-300, 1e-100, 1e-30, 1e-10})
    edges = [0.0] + points + [1.0]
    losses = []
    for i in range(len(shapes)):
        def integrand(x, i=i):
            others = 1.0
            for j, (a, b) in enumerate(shapes):
                if j != i:
                    others *= special.betainc(a, b, x)
            a, b = shapes[i]
            return special.betainc(a, b, x) * (1 - others)
        losses.append(sum(integrate.quad(integrand, lo, hi, epsabs=0, epsrel=1e-13, limit=200)[0]
                          for lo, hi in zip(edges[:-1], edges[1:])))
    largest = max(losses)
    worst = max(abs((losses[i] - losses[j]) - (means[j] - means[i])) / largest
                for i in range(len(losses)) for j in range(len(losses)))
    shown = [repr(v) if v > 1e-300 else '0' for v in losses]
    return {'why': why, 'model': 'beta', 'inputs': [conversions, visitors, alpha, beta], 'loss': shown,
            'meanIdentity': '%.3g' % worst, 'by': 'scipy ' + scipy.__version__}


def beta_case(why, conversions, visitors, alpha, beta):
    shapes = [(mp.mpf(alpha) + c, mp.mpf(beta) + n - c) for c, n in zip(conversions, visitors)]
    cdfs = [lambda x, a=a, b=b: mp.betainc(a, b, 0, x, regularized=True) for a, b in shapes]
    means = [a / (a + b) for a, b in shapes]
    sds = [mp.sqrt(a * b / ((a + b) ** 2 * (a + b + 1))) for a, b in shapes]
    return case(why, 'beta', [conversions, visitors, alpha, beta], cdfs, means, sds, mp.mpf(1))


def gamma_case(why, events, exposure, shape, rate):
    shapes = [(mp.mpf(shape) + e, mp.mpf(rate) + t) for e, t in zip(events, exposure)]
    cdfs = [lambda x, a=a, r=r: mp.gammainc(a, 0, r * x, regularized=True) for a, r in shapes]
    means = [a / r for a, r in shapes]
    sds = [mp.sqrt(a) / r for a, r in shapes]
    top = max(m + 200 * s for m, s in zip(means, sds))
    return case(why, 'gamma', [events, exposure, shape, rate], cdfs, means, sds, top)


def case(why, model, inputs, cdfs, means, sds, top):
    points = {mp.mpf(0), top}
    for p in ['1e-300', '1e-100', '1e-30', '1e-10']:
        points.add(mp.mpf(p))
    for m, s in zip(means, sds):
        for k in [0, 1, 2, 4, 8, 16, 32, 64]:
            for z in (m - k * s, m + k * s):
                if 0 < z < top:
                    points.add(z)
    grid = sorted(points)
    losses = []
    for i, fi in enumerate(cdfs):
        def integrand(x, i=i, fi=fi):
            others = mp.mpf(1)
            for j, fj in enumerate(cdfs):
                if j != i:
                    others *= fj(x)
            return fi(x) * (1 - others)
        losses.append(mp.quad(integrand, grid))
    largest = max(losses)
    worst = max(abs((losses[i] - losses[j]) - (means[j] - means[i])) / largest
                for i in range(len(losses)) for j in range(len(losses)))
    shown = [mp.nstr(v, 17) if v > mp.mpf('1e-300') else '0' for v in losses]
    return {'why': why, 'model': model, 'inputs': inputs, 'loss': shown, 'meanIdentity': mp.nstr(worst, 3),
            'by': 'mpmath ' + mp.__version__}


def main():
    cases = [
        beta_case('EXPECTED_LOSS({0;15;9},{5000;5000;5000},0.000001,0.999999) (issue #10)',
                  [0, 15, 9], [5000, 5000, 5000], '0.000001', '0.999999'),
        beta_case('the same counts under the prior (0.001, 1), the weakest prior of the domain',
                  [0, 15, 9], [5000, 5000, 5000], '0.001', '1'),
        beta_case_scipy('DECISION({0;30000;0},{60000;60000;60000},,,1E-12,1) (issue #10)',
                  [0, 30000, 0], [60000, 60000, 60000], '1e-12', '1'),
        gamma_case('EVENTS_EXPECTED_LOSS({0;0;5},{1000;1000;1000},0.000001) (issue #10; prior rate 0)',
                   [0, 0, 5], [1000, 1000, 1000], '0.000001', '0'),
    ]
    print(json.dumps({'source': 'loss_extreme_priors.py (mpmath at 40 digits; scipy where marked)',
                      'cases': cases}, indent=1))


if __name__ == '__main__':
    main()
