#!/usr/bin/env python3
"""Reference values for the conversion (Beta-Binomial) read-out, computed with mpmath at 30+ digits.

Run with a python3 that has mpmath, from the repository root:  python3 test/reference/conversion/conversion_reference.py
It prints JSON; the committed copy is test/reference/conversion/conversion_values.json (the tests read that file and
never run python).

Method (independent of the TypeScript code; the posterior class BetaZ and the rule are in mpref.py, shared
with conversion_marginals.py and loss_many_reference.py): each posterior Beta(a, b) is written in z = logit(p), whose
density exp(a z - (a+b) log(1 + e^z) - log B(a, b)) is evaluated with mpmath's loggamma at 40 digits.
Its cdf F and survival S are accumulated over anchors a quarter of a standard deviation apart (F from the
left, S from the right, so both tails keep their relative accuracy), each step and each partial step by
12-point Gauss-Legendre at 40 digits (anchors at most half a standard deviation and 2/|slope| apart, so
each step is exact to ~1e-31 relative). The comparison integrals (P(B > A) = int f_B F_A, P(highest),
expected loss = int F_i (1 - prod F_j) dx, the cdf of a difference or a ratio) use the same composite rule
over the union of the posteriors' anchors; quantiles are mpmath.findroot (secant) on those integrals.
(mpmath.quad's tanh-sinh gives the same digits but took minutes per value at these anchor counts.)
Self-checks printed beside the values: P(B > A) + P(A > B) = 1, sum of P(highest) = 1, the cdf against
mpmath.betainc where betainc converges (small counts), and P(B > A) against Evan Miller's exact sum
(2015) for integer shapes.
"""
import json
import sys

import mpmath as mp

from mpref import BetaZ, gl, logistic, logit, set_precision

set_precision(40)
LOG_RANGE = 130  # anchors reach log density -130 (e^-130 ~ 1e-57) on each side


def posterior(conversions, visitors, prior=(1, 1)):
    return BetaZ(prior[0] + conversions, prior[1] + visitors - conversions, LOG_RANGE)


def breakpoints(dists, base):
    """The base's anchors where its log density is within the range, refined by the others' anchors."""
    lo, hi = base.anchors[0], base.anchors[-1]
    pts = set(base.anchors)
    for d in dists:
        if d is base:
            continue
        for z in d.anchors:
            if lo < z < hi:
                pts.add(z)
    return sorted(pts)


def integrate(base, integrand, others):
    pts = breakpoints(others, base)
    return mp.fsum(gl(integrand, pts[i], pts[i + 1]) for i in range(len(pts) - 1))


def prob_greater(x, y):
    """P(X > Y) = int f_X F_Y and P(Y > X) = int f_X S_Y (both computed; they must add to 1)."""
    gt = integrate(x, lambda z: x.dens(z) * y.lower(z), [y])
    lt = integrate(x, lambda z: x.dens(z) * y.upper(z), [y])
    return gt, lt


def prob_highest(ds):
    out = []
    for i, d in enumerate(ds):
        others = [o for j, o in enumerate(ds) if j != i]

        def integrand(z, d=d, others=others):
            v = d.dens(z)
            for o in others:
                v *= o.lower(z)
            return v

        out.append(integrate(d, integrand, others))
    return out


def expected_loss(ds):
    """loss_i = int F_i(x) (1 - prod_{j != i} F_j(x)) dx with x = logistic(z), dx = x(1 - x) dz."""
    out = []
    allpts = sorted(set(z for d in ds for z in d.anchors))
    for i, d in enumerate(ds):
        others = [o for j, o in enumerate(ds) if j != i]

        def integrand(z, d=d, others=others):
            if len(others) == 1:
                s = others[0].upper(z)
            else:
                prod = mp.mpf(1)
                for o in others:
                    prod *= o.lower(z)
                s = 1 - prod
            x = 1 / (1 + mp.exp(-z))
            return d.lower(z) * s * x * (1 - x)

        lo = min(dd.anchors[0] for dd in ds)
        hi = max(dd.anchors[-1] for dd in ds)
        pts = [z for z in allpts if lo <= z <= hi]
        out.append(mp.fsum(gl(integrand, pts[k], pts[k + 1]) for k in range(len(pts) - 1)))
    return out


def diff_tail(y, x, d, upper):
    """P(Y - X <= d) (upper False) or P(Y - X > d) (upper True) = int f_X(s) F_Y(s + d) ds or with S_Y."""

    def at(z):
        u = logistic(z) + d
        if u <= 0:
            return mp.mpf(1) if upper else mp.mpf(0)
        if u >= 1:
            return mp.mpf(0) if upper else mp.mpf(1)
        zu = logit(u)
        return y.upper(zu) if upper else y.lower(zu)

    return integrate(x, lambda z: x.dens(z) * at(z), [])


def ratio_tail(y, x, r, upper):
    """P(log(Y/X) <= r) or P(log(Y/X) > r) = int f_X(s) F_Y(e^r s) ds (lift = e^r - 1)."""
    k = mp.exp(r)

    def at(z):
        u = k * logistic(z)
        if u >= 1:
            return mp.mpf(0) if upper else mp.mpf(1)
        zu = logit(u)
        return y.upper(zu) if upper else y.lower(zu)

    return integrate(x, lambda z: x.dens(z) * at(z), [])


def quantile_of(tail, p, start):
    """Root of log P(V <= v) = log p (p <= 1/2) or log P(V > v) = log(1 - p), by the secant method."""
    p = mp.mpf(p)
    upper = p > 0.5

    def f(v):
        return mp.log(1 - p) - mp.log(tail(v, True)) if upper else mp.log(tail(v, False)) - mp.log(p)

    return mp.findroot(f, start, solver='secant', tol=mp.mpf(10) ** -30)


def s(v):
    return mp.nstr(v, 30, min_fixed=-1000, max_fixed=1000) if False else mp.nstr(v, 30)


def main(section):
    out = {}
    pairs = [
        # (control conversions, visitors), (challenger conversions, visitors)
        ((10, 100), (15, 100)),
        ((50, 1000), (65, 1000)),
        ((500, 10000), (560, 10000)),
        ((5000, 100000), (5150, 100000)),
        ((50000, 1000000), (50300, 1000000)),
        ((5000000, 100000000), (5003000, 100000000)),
        ((50000000, 1000000000), (50010000, 1000000000)),
        ((0, 1000), (3, 1000)),
        ((1000, 1000), (998, 1000)),
        ((0, 1), (1, 1)),
        ((100, 1000), (300, 1000)),
        ((50, 1000), (200, 1000)),
        ((0, 1000000000), (2, 1000000000)),
        ((60, 1000), (50000000, 1000000000)),
        ((1000000000, 1000000000), (999999995, 1000000000)),
    ]
    groups = [
        [(50, 1000), (60, 1000), (55, 1000)],
        [(500, 10000), (520, 10000), (480, 10000), (530, 10000), (510, 10000)],
        [(5000000, 100000000), (5001000, 100000000), (4999000, 100000000), (5002000, 100000000)],
        [(100, 1000), (300, 1000), (120, 1000)],
        [(50000000, 1000000000), (50005000, 1000000000), (49995000, 1000000000)],
        [(0, 10), (1, 10), (0, 1), (2, 10)],
    ]
    if section == 'probGreater':
        out['checks'] = {}
        # Self-check of the cdf against mpmath.betainc where the hypergeometric series converges.
        worst = mp.mpf(0)
        for a, b, x in [(8, 10, 0.5), (3, 50, 0.02), (20, 200, 0.12), (0.5, 0.5, 0.3), (1, 1001, 0.001)]:
            d = BetaZ(a, b, LOG_RANGE)
            ref = mp.betainc(a, b, 0, x, regularized=True)
            worst = max(worst, abs(d.cdf_value(mp.mpf(x)) / ref - 1))
        out['checks']['cdfVsBetaincWorstRelative'] = s(worst)
        out['probGreater'] = []
        worst_sum = mp.mpf(0)
        for control, challenger in pairs:
            a = posterior(*control)
            b = posterior(*challenger)
            gt, lt = prob_greater(b, a)
            worst_sum = max(worst_sum, abs(gt + lt - 1))
            out['probGreater'].append({'control': list(control), 'challenger': list(challenger),
                                       'pChallengerAbove': s(gt), 'pControlAbove': s(lt)})
            print('probGreater', control, challenger, mp.nstr(gt, 15), file=sys.stderr)
        out['checks']['probGreaterSumWorst'] = s(worst_sum)
        # Evan Miller (2015): P(p_B > p_A) = sum_{i<a_B} B(a_A+i, b_A+b_B) / ((b_B+i) B(1+i, b_B) B(a_A, b_A)).
        worst = mp.mpf(0)
        for control, challenger in [pairs[0], pairs[1], pairs[7], pairs[9]]:
            aA, bA = 1 + control[0], 1 + control[1] - control[0]
            aB, bB = 1 + challenger[0], 1 + challenger[1] - challenger[0]
            exact = mp.fsum(mp.beta(aA + i, bA + bB) / ((bB + i) * mp.beta(1 + i, bB) * mp.beta(aA, bA)) for i in range(aB))
            gt, _ = prob_greater(posterior(*challenger), posterior(*control))
            worst = max(worst, abs(gt / exact - 1))
        out['checks']['probGreaterVsEvanMillerWorstRelative'] = s(worst)
        out['rateQuantile'] = []
        for v in [(0, 1000), (50, 1000), (1000, 1000), (0, 1), (50000000, 1000000000), (1000000000, 1000000000)]:
            d = posterior(*v)
            for p in ['0.025', '0.5', '0.975']:
                out['rateQuantile'].append({'variant': list(v), 'p': float(p), 'rate': s(d.quantile(p))})
    elif section == 'probHighest':
        out['probHighest'] = []
        worst_sum = mp.mpf(0)
        for g in groups:
            ds = [posterior(*v) for v in g]
            ph = prob_highest(ds)
            worst_sum = max(worst_sum, abs(mp.fsum(ph) - 1))
            out['probHighest'].append({'variants': [list(v) for v in g], 'pHighest': [s(v) for v in ph]})
            print('probHighest', g, [mp.nstr(v, 10) for v in ph], file=sys.stderr)
        out['checks'] = {'probHighestSumWorst': s(worst_sum)}
    elif section == 'expectedLoss':
        out['expectedLoss'] = []
        for g in [pairs[0], pairs[1], pairs[3], pairs[6], pairs[7], pairs[10], pairs[13], groups[0], groups[5]]:
            g = list(g)
            ds = [posterior(*v) for v in g]
            loss = expected_loss(ds)
            out['expectedLoss'].append({'variants': [list(v) for v in g], 'loss': [s(v) for v in loss]})
            print('loss', g, [mp.nstr(v, 10) for v in loss], file=sys.stderr)
    elif section == 'quantiles':
        out['liftQuantile'] = []
        out['diffQuantile'] = []
        for control, challenger in [pairs[0], pairs[1], pairs[7]]:
            x = posterior(*control)
            y = posterior(*challenger)
            mx = x.a / (x.a + x.b)
            my = y.a / (y.a + y.b)
            sx = mp.sqrt(mx * (1 - mx) / (x.a + x.b))
            sy = mp.sqrt(my * (1 - my) / (y.a + y.b))
            for p in ['0.025', '0.975']:
                zq = -1.96 if p == '0.025' else 1.96
                # Starting points from the normal approximations (delta method for the log ratio).
                r0 = mp.log(my / mx) + zq * mp.sqrt((sx / mx) ** 2 + (sy / my) ** 2)
                r = quantile_of(lambda v, upper: ratio_tail(y, x, v, upper), p, (r0, r0 * 1.02 + 0.01))
                out['liftQuantile'].append({'control': list(control), 'challenger': list(challenger), 'p': float(p),
                                            'lift': s(mp.expm1(r))})
                d0 = my - mx + zq * mp.sqrt(sx ** 2 + sy ** 2)
                d = quantile_of(lambda v, upper: diff_tail(y, x, v, upper), p, (d0, d0 * 1.02 + 0.001))
                out['diffQuantile'].append({'control': list(control), 'challenger': list(challenger), 'p': float(p),
                                            'difference': s(d)})
                print('quantiles', control, challenger, p, mp.nstr(mp.expm1(r), 12), mp.nstr(d, 12), file=sys.stderr)
    return out


SECTIONS = ['probGreater', 'probHighest', 'expectedLoss', 'quantiles']

if __name__ == '__main__':
    # With no argument: every section, merged (what conversion_values.json holds). With section names:
    # just those (the committed file was made by running the four sections in parallel and merging).
    chosen = sys.argv[1:] or SECTIONS
    result = {'source': 'mpmath ' + mp.__version__ + ' at 40 digits: test/reference/conversion/conversion_reference.py'}
    checks = {}
    for name in chosen:
        part = main(name)
        checks.update(part.pop('checks', {}))
        result.update(part)
    result['checks'] = checks
    print(json.dumps(result, indent=1))
