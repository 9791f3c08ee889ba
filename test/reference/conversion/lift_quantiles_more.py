#!/usr/bin/env python3
"""Quantiles (2.5%, 50%, 97.5%) of the lift p_B/p_A - 1 and of the difference p_B - p_A for two conversion
variants (Beta posteriors under the uniform prior), by mpmath at 30 digits.

Run with a python3 that has mpmath (1.3.0 here), from the repository root:
    python3 test/reference/conversion/lift_quantiles_more.py > test/reference/conversion/lift_quantiles_more.json
(a few minutes on one core). test/stats/liftQuantilesMore.test.ts reads the JSON; it never runs python.

Method: the posteriors are the BetaZ of mpref.py as loss_many_reference.py builds them (density in z = logit(x) from
mpmath.loggamma; F from the left and S from the right by composite 12-point Gauss-Legendre between anchors
at most half a standard deviation and 2/|slope| apart). With X = p_A, Y = p_B and u the other variable's
value at a node of the base (the posterior narrower in z):
  P(Y <= e^r X)  = int f_X(z) F_Y(e^r x(z)) dz      or   int f_Y(t) S_X(e^-r y(t)) dt,
  P(Y - X <= d)  = int f_X(z) F_Y(x(z) + d) dz      or   int f_Y(t) S_X(y(t) - d) dt,
(the upper tails with S and F swapped) and their derivatives in r or d (the same integrals with the other
density), integrated by the same composite rule over the base's anchors (where its log density is within
60 of its peak, e^-60 ~ 1e-26), the other's anchors mapped onto the base's axis, and the points where
the other's argument reaches 0 or 1. The quantile is Newton's method on log(smaller tail) - log(target)
in r = log(1 + lift) (ratio) or d (difference), from the normal approximation, until the step is below
1e-22; the lift is expm1(r).
Checks under "checks" (for a person, not the tests): at every quantile the other tail (integrated
directly, not as 1 minus the first) plus the solved tail equals 1; worst |sum - 1|.
"""
import json
import os
import sys

import mpmath as mp

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import loss_many_reference as base_module  # noqa: E402
from loss_many_reference import GL_NODES, GL_WEIGHTS, logistic, logit  # noqa: E402

mp.mp.dps = 30
BASE_RANGE = 60


def posterior(conversions, visitors):
    return base_module.posterior(conversions, visitors)


def dens_x(d, u):
    """Density of d in value units at u (0 outside (0, 1))."""
    if u <= 0 or u >= 1:
        return mp.mpf(0)
    return d.dens(logit(u)) / (u * (1 - u))


def tails_x(d, u):
    """(F, S) of d at the value u."""
    if u <= 0:
        return mp.mpf(0), mp.mpf(1)
    if u >= 1:
        return mp.mpf(1), mp.mpf(0)
    return d.tails(logit(u))


def breakpoints(base, other, to_base):
    """Base anchors within BASE_RANGE of its peak, the other's anchors mapped by to_base (value -> base
    value, or None), and the images of the other's values 0 and 1."""
    pts = [z for z in base.anchors if base.logdens(z) - base.peak > -BASE_RANGE]
    lo, hi = pts[0], pts[-1]
    extra = [to_base(logistic(z)) for z in other.anchors] + [to_base(mp.mpf(0)), to_base(mp.mpf(1))]
    for v in extra:
        if v is not None and 0 < v < 1:
            z = logit(v)
            if lo < z < hi:
                pts.append(z)
    return sorted(set(pts))


def tail_and_density(kind, y, x, v, upper):
    """log P(V <= v) (or > v when upper) and log dP(V <= v)/dv, V = log(Y/X) (kind 'ratio') or Y - X."""
    y_base = y.sd < x.sd
    b, o = (y, x) if y_base else (x, y)
    if kind == 'ratio':
        k = mp.exp(v)
        # base X: Y's argument u = e^v x; base Y: X's argument w = e^-v y.
        arg = (lambda t: t / k) if y_base else (lambda t: k * t)
        inv = (lambda u: u * k) if y_base else (lambda u: u / k)
        dscale = lambda t, u: u  # d arg/dv = +-u
    else:
        arg = (lambda t: t - v) if y_base else (lambda t: t + v)
        inv = (lambda u: u + v) if y_base else (lambda u: u - v)
        dscale = lambda t, u: mp.mpf(1)
    pts = breakpoints(b, o, inv)
    tail_terms, dens_terms = [], []
    for a0, b0 in zip(pts, pts[1:]):
        half = (b0 - a0) / 2
        mid = (a0 + b0) / 2
        for t, w in zip(GL_NODES, GL_WEIGHTS):
            z = mid + half * t
            fb = b.dens(z)
            u = arg(logistic(z))
            F, S = tails_x(o, u)
            # base X: P(V <= v) = int f_X F_Y(u); base Y: P(V <= v) = int f_Y S_X(u).
            lower = S if y_base else F
            upper_part = F if y_base else S
            tail_terms.append(half * w * fb * (upper_part if upper else lower))
            dens_terms.append(half * w * fb * dens_x(o, u) * dscale(z, u))
    tail = mp.fsum(tail_terms)
    density = mp.fsum(dens_terms)
    return mp.log(tail), mp.log(density)


def quantile(kind, y, x, p, start):
    p = mp.mpf(p)
    upper = p > mp.mpf(1) / 2
    target = mp.log(1 - p) if upper else mp.log(p)
    v = start
    for _ in range(40):
        log_tail, log_density = tail_and_density(kind, y, x, v, upper)
        slope = mp.exp(log_density - log_tail) * (-1 if upper else 1)
        step = (log_tail - target) / slope
        v -= step
        if abs(step) < mp.mpf(10) ** -22 * max(1, abs(v)):
            break
    else:
        raise RuntimeError('Newton did not converge')
    solved, _ = tail_and_density(kind, y, x, v, upper)
    other, _ = tail_and_density(kind, y, x, v, not upper)
    return v, abs(mp.exp(solved) + mp.exp(other) - 1)


def s(v):
    return mp.nstr(v, 25)


PAIRS = [
    ((10, 100), (14, 100), '100 visitors each'),
    ((120, 1000), (140, 1000), '1e3 visitors each'),
    ((500, 10000), (540, 10000), '1e4 visitors each'),
    ((30000, 1000000), (30300, 1000000), '1e6 visitors each'),
    ((20000000, 1000000000), (20005000, 1000000000), '1e9 visitors each'),
    ((0, 1000), (4, 1000), 'no conversions in the control'),
    ((5, 1000), (0, 1000), 'no conversions in the challenger'),
    ((0, 200), (0, 100), 'no conversions on either side'),
    ((12, 100), (60000, 1000000), '100 against 1e6 visitors'),
    ((50000000, 1000000000), (480, 10000), '1e9 against 1e4 visitors'),
]


def main():
    out = {'source': 'mpmath ' + mp.__version__ + ' at 30 digits: test/reference/conversion/lift_quantiles_more.py', 'cases': []}
    worst_sum = mp.mpf(0)
    for control, challenger, why in PAIRS:
        x = posterior(*control)
        y = posterior(*challenger)
        mx, my = x.mean, y.mean
        sx = mp.sqrt(mx * (1 - mx) / (x.a + x.b + 1))
        sy = mp.sqrt(my * (1 - my) / (y.a + y.b + 1))
        row = {'why': why, 'control': list(control), 'challenger': list(challenger), 'p': [0.025, 0.5, 0.975],
               'lift': [], 'difference': []}
        for p, zq in [('0.025', -1.959963984540054), ('0.5', 0), ('0.975', 1.959963984540054)]:
            r0 = mp.log(my / mx) + zq * mp.sqrt((sx / mx) ** 2 + (sy / my) ** 2)
            r, err = quantile('ratio', y, x, p, r0)
            worst_sum = max(worst_sum, err)
            d0 = my - mx + zq * mp.sqrt(sx ** 2 + sy ** 2)
            d, err = quantile('difference', y, x, p, d0)
            worst_sum = max(worst_sum, err)
            row['lift'].append(s(mp.expm1(r)))
            row['difference'].append(s(d))
        out['cases'].append(row)
        print(why, row['lift'], row['difference'], file=sys.stderr, flush=True)
    out['checks'] = {'tailsSumToOneWorstAbsolute': mp.nstr(worst_sum, 5)}
    print(json.dumps(out, indent=1))


if __name__ == '__main__':
    main()
