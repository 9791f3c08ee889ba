#!/usr/bin/env python3
"""Expected losses of 3-6 conversion variants (Beta posteriors under the uniform prior), by mpmath at 38 digits.

Run with a python3 that has mpmath (1.3.0 here):
    python3 test/reference/conversion/loss_many_reference.py > test/reference/conversion/loss_many_values.json
(about seven minutes on one core). test/stats/lossMany.test.ts reads the JSON; it never runs python.

The quantity: loss_i = E[max_j X_j - X_i] = int_0^1 F_i(x) (1 - prod_{j != i} F_j(x)) dx, X_j ~ Beta(a_j, b_j),
a_j = 1 + conversions, b_j = 1 + visitors - conversions, F_j the regularized incomplete beta I_x(a_j, b_j).

Method ('composite'): mpmath.betainc's hypergeometric series does not converge at these shapes (10^7 and
more), so F_j is computed from the density. In z = logit(x) the density of Beta(a, b) is
exp(a z - (a + b) log(1 + e^z) - log B(a, b)) (log B from mpmath.loggamma). Each posterior gets anchors from
its mode outwards, steps of at most half a standard deviation and at most 2/|d log f/dz| (the density
changes by at most e^2 across a step), until the log density is 250 below its peak (e^-250 ~ 1e-109);
F at the anchors is accumulated from the left and S = 1 - F from the right, each step by 12-point
Gauss-Legendre, so both tails keep their relative accuracy; F(z) between anchors adds one more partial
step. Beyond the outer anchors F (or S) is f/|slope| (below 1e-108, too small to matter here).
The loss integral is the same composite rule in z (dx = x(1 - x) dz) over the union of all the
posteriors' anchors, gaps between windows cut into steps of at most 1/2, with
1 - prod F_j = -expm1(sum log F_j) and log F_j = log1p(-S_j) where S_j is the smaller tail, so a loss of
1e-40 keeps its relative digits. (The construction of conversion_reference.py: BetaZ, the Gauss-Legendre
rule and the logit pair come from mpref.py.)

Checks printed under "checks" (not used by the tests, read by a person):
 - 'halving': the cases marked HALVING again with every integration step cut in two; worst relative change.
 - 'quad': for the cases in QUAD_CASES (at most 1000 visitors), mpmath.quad (tanh-sinh) of the same integrand in
   x with F from mpmath.betainc, split at each posterior's 1e-12, 0.001, 0.5, 0.999, 1 - 1e-12 quantiles
   and every half of the smallest posterior sd over mean +- 40 sd, is the value stored; worst relative
   difference of 'composite' from it.
 - 'meanIdentity': worst |(loss_i - loss_j) - (mean_j - mean_i)| with the means exact rationals.
"""
import json
import os
import sys

import mpmath as mp

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
# The rule, the logit pair and BetaZ are mpref.py's (shared with conversion_reference.py).
from mpref import BetaZ, logistic, logit, rule, set_precision  # noqa: E402

set_precision(38)
LOG_RANGE = 250
GAP_STEP = mp.mpf(1) / 2
# lift_quantiles_more.py imports these (the nodes stay at 38 digits when it lowers the precision to 30).
GL_NODES, GL_WEIGHTS = rule()


def posterior(conversions, visitors):
    return BetaZ(1 + conversions, 1 + visitors - conversions, LOG_RANGE)


def integration_points(ds, split):
    """The union of the anchors, gaps cut into steps of at most GAP_STEP, each step cut in `split`."""
    allpts = sorted(set(z for d in ds for z in d.anchors))
    pts = [allpts[0]]
    for z in allpts[1:]:
        gap = z - pts[-1]
        parts = max(1, int(mp.ceil(gap / GAP_STEP)))
        base = pts[-1]
        for j in range(1, parts):
            pts.append(base + gap * j / parts)
        pts.append(z)
    if split > 1:
        fine = [pts[0]]
        for a, b in zip(pts, pts[1:]):
            for j in range(1, split):
                fine.append(a + (b - a) * j / split)
            fine.append(b)
        pts = fine
    return pts


def expected_losses(ds, split=1):
    """Composite Gauss-Legendre of F_i (1 - prod_{j != i} F_j) x (1 - x) dz over the union of anchors."""
    k = len(ds)
    pts = integration_points(ds, split)
    sums = [[] for _ in range(k)]
    for a, b in zip(pts, pts[1:]):
        half = (b - a) / 2
        mid = (a + b) / 2
        for t, w in zip(GL_NODES, GL_WEIGHTS):
            z = mid + half * t
            x = logistic(z)
            jac = x * (1 - x)
            tails = [d.tails(z) for d in ds]
            logs = [mp.log(f) if f < s else mp.log1p(-s) for f, s in tails]
            total = mp.fsum(logs)
            for i in range(k):
                others = total - logs[i]
                above = -mp.expm1(others)
                sums[i].append(half * w * tails[i][0] * above * jac)
    return [mp.fsum(s) for s in sums]


def quad_losses(g):
    """mpmath.quad in x with F = mpmath.betainc (small shapes only), split at each posterior's quantiles."""
    shapes = [(1 + c, 1 + n - c) for c, n in g]
    pts = {mp.mpf(0), mp.mpf(1)}
    for a, b in shapes:
        for p in ['1e-12', '0.001', '0.5', '0.999']:
            pts.add(quantile_x(a, b, mp.mpf(p)))
        pts.add(1 - quantile_x(b, a, mp.mpf('1e-12')))
    # Dense split points too: a tiny loss (1e-40) lives between the leader's far lower tail and the others'
    # far upper tails, beyond every quantile above; steps of half the smallest posterior sd over
    # mean ± 40 sd of all posteriors keep tanh-sinh on it.
    means = [mp.mpf(a) / (a + b) for a, b in shapes]
    sds = [mp.sqrt(a * b / ((a + b) ** 2 * (a + b + 1))) for a, b in shapes]
    lo = max(mp.mpf(0), min(m - 40 * d for m, d in zip(means, sds)))
    hi = min(mp.mpf(1), max(m + 40 * d for m, d in zip(means, sds)))
    step = min(sds) / 2
    count = int(mp.ceil((hi - lo) / step))
    for j in range(count + 1):
        pts.add(lo + (hi - lo) * j / count)
    pts = sorted(p for p in pts if 0 <= p <= 1)
    out = []
    for i, (ai, bi) in enumerate(shapes):
        def integrand(x, i=i):
            prod = mp.mpf(1)
            for j, (aj, bj) in enumerate(shapes):
                if j != i:
                    prod *= mp.betainc(aj, bj, 0, x, regularized=True)
            return mp.betainc(ai, bi, 0, x, regularized=True) * (1 - prod)
        out.append(mp.quad(integrand, pts))
    return out


def quantile_x(a, b, p):
    """x with I_x(a, b) = p, by mpmath.findroot on mpmath.betainc (small shapes)."""
    f = lambda x: mp.log(mp.betainc(a, b, 0, x, regularized=True)) - mp.log(p)
    lo = mp.mpf(10) ** -40
    hi = 1 - mp.mpf(10) ** -40
    # Bisection in logit (a split point needs no more than ~1e-20).
    zl, zh = logit(lo), logit(hi)
    for _ in range(200):
        zm = (zl + zh) / 2
        if f(logistic(zm)) < 0:
            zl = zm
        else:
            zh = zm
        if zh - zl < mp.mpf(10) ** -20:
            break
    return logistic((zl + zh) / 2)


def s(v):
    return mp.nstr(v, 32)


CASES = [
    ([(100, 1000), (104, 1000), (97, 1000)], '3 close variants at 1e3 visitors'),
    ([(5000, 100000), (5060, 100000), (4980, 100000)], '3 close variants at 1e5 visitors'),
    ([(300000, 10000000), (300400, 10000000), (299800, 10000000)], '3 close variants at 1e7 visitors'),
    ([(6, 100), (50100, 1000000), (50000000, 1000000000), (480, 10000)], '4 variants of very different sizes (100, 1e4, 1e6, 1e9 visitors)'),
    ([(5, 100), (1000, 20000), (49990000, 1000000000), (51000, 1000000)], '4 variants of very different sizes, the 1e9 one in the middle'),
    ([(255, 1000), (100, 1000), (110, 1000)], 'one variant far ahead of two (leader loss ~1e-20)'),
    ([(330, 1000), (100, 1000), (120, 1000)], 'one variant far ahead of two (leader loss ~1e-33)'),
    ([(375, 1000), (100, 1000), (100, 1000), (130, 1000)], 'one variant far ahead of three (leader loss ~1e-40)'),
    ([(500, 10000), (520, 10000), (480, 10000), (530, 10000), (510, 10000), (495, 10000)], '6 variants at 1e4 visitors'),
    ([(0, 1000), (0, 100), (2, 1000)], 'zero conversions'),
    ([(1000, 1000), (100, 100), (995, 1000)], 'all conversions'),
    ([(0, 10), (10, 10), (5, 10)], 'zero, all and half conversions at 10 visitors'),
]

# Cases with at most this many visitors per variant take mpmath.quad with mpmath.betainc as the reference
# (betainc converges there); the composite rule is then the check. Measured: the composite rule missed the
# 1e-40 leader loss of 'one variant far ahead of three' by 9e-8 relative (quad, and Lift Ledger's three
# paths, agree to 2e-14), so where an independent method exists it is the one stored.
QUAD_MAX_VISITORS = 1000
# ... of those, the cases where it is stored (mpmath.quad with dense split points costs minutes a case): the
# three with a far-ahead leader, whose tiny losses the composite rule resolves least well, and the smallest.
QUAD_CASES = {5, 6, 7, 11}
# Cases (by index) integrated a second time with every step halved (the rest cost too long to repeat).
HALVING = {2, 3, 7, 9, 11}


def main():
    out = {'source': 'mpmath ' + mp.__version__ + ' at 38 digits: test/reference/conversion/loss_many_reference.py', 'cases': []}
    worst_halving = mp.mpf(0)
    worst_quad = mp.mpf(0)
    worst_mean = mp.mpf(0)
    for index, (g, why) in enumerate(CASES):
        ds = [posterior(*v) for v in g]
        loss = expected_losses(ds)
        if index in HALVING:
            fine = expected_losses(ds, split=2)
            worst_halving = max(worst_halving, max(abs(u / v - 1) for u, v in zip(loss, fine)))
        if index in QUAD_CASES and max(n for _, n in g) <= QUAD_MAX_VISITORS:
            # Where mpmath.betainc converges, its tanh-sinh quadrature is the reference (independent of the
            # composite construction, which here only serves as the check).
            q = quad_losses(g)
            worst_quad = max(worst_quad, max(abs(u / v - 1) for u, v in zip(loss, q)))
            loss = q
        for i in range(len(g)):
            for j in range(len(g)):
                mi = mp.mpf(1 + g[i][0]) / (2 + g[i][1])
                mj = mp.mpf(1 + g[j][0]) / (2 + g[j][1])
                worst_mean = max(worst_mean, abs((loss[i] - loss[j]) - (mj - mi)))
        out['cases'].append({'why': why, 'variants': [list(v) for v in g], 'loss': [s(v) for v in loss]})
        print(why, [mp.nstr(v, 12) for v in loss], file=sys.stderr)
    out['checks'] = {
        'halvingWorstRelative': mp.nstr(worst_halving, 5),
        'quadVsCompositeWorstRelative': mp.nstr(worst_quad, 5),
        'meanIdentityWorstAbsolute': mp.nstr(worst_mean, 5),
    }
    print(json.dumps(out, indent=1))


if __name__ == '__main__':
    main()
