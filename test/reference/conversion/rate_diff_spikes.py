#!/usr/bin/env python3
"""Quantiles of the difference D = p_B - p_A of two Beta posteriors piled up against 0 (no conversions under
priors with alpha far below 1), by mpmath at 25 digits: the
regime of RATE_DIFF_INTERVAL with 50 variants of 0 conversions and a prior like Beta(0.007, 65).

Run from the repository root with a python3 that has mpmath (1.3.0 here):
    python3 test/reference/conversion/rate_diff_spikes.py > test/reference/conversion/rate_diff_spikes.json
(about 8 minutes on one core). test/stats/rateDiffSpikes.test.ts reads the JSON; it never runs python.

Method (written for this file, independent of the add-in's grid): with X = p_A ~ Beta(a1, b1) and
Y = p_B ~ Beta(a2, b2) and c = |d|,
  d > 0:  P(D <= d) = int_0^1 f_X(x) F_Y(x + c) dx,   P(D > d)  = int_0^1 f_X(x) S_Y(x + c) dx,
  d < 0:  P(D <= d) = int_0^1 f_Y(y) S_X(y + c) dy,   P(D > d)  = int_0^1 f_Y(y) F_X(y + c) dy,
so the other variable's argument never comes near 0 (no cusp). The base variable is written x = e^s
(f(e^s) e^s = e^{a s} (1 - e^s)^{b - 1} / B(a, b), smooth in s even for a << 1) and integrated by
mpmath.quad (tanh-sinh) over s in [S0, 0] with breakpoints at log c, at the base's bulk, and where
e^s + c reaches the other's quantiles and 1; below S0 = log(c) - 90 the other factor is its value at c to
~1e-39 and (1 - e^s)^{b-1} is 1, so that piece is H(c) e^{a S0} / (a B(a, b)) in closed form. F and S are
mpmath.betainc (regularized). The smaller tail is integrated directly. A quantile is found by bisection
on the smaller tail in u, d = sign(u) e^{|u| - 800}, for 44 halvings (d to ~1e-10 relative).
Checks under "checks" (for a person, not the tests): at each quantile both tails integrated directly sum to 1.
"""
import json
import sys

import mpmath as mp

mp.mp.dps = 25


def log_beta(a, b):
    return mp.loggamma(a) + mp.loggamma(b) - mp.loggamma(a + b)


class Beta:
    def __init__(self, a, b):
        self.a = mp.mpf(a)
        self.b = mp.mpf(b)
        self.lb = log_beta(self.a, self.b)

    def cdf(self, u):
        if u <= 0:
            return mp.mpf(0)
        if u >= 1:
            return mp.mpf(1)
        return mp.betainc(self.a, self.b, 0, u, regularized=True)

    def sf(self, u):
        if u <= 0:
            return mp.mpf(1)
        if u >= 1:
            return mp.mpf(0)
        return mp.betainc(self.a, self.b, u, 1, regularized=True)

    def quantile_guess(self, p):
        """A rough quantile (breakpoints only): bisection in log u."""
        lo, hi = mp.mpf(-3000), mp.mpf(0)
        for _ in range(60):
            mid = (lo + hi) / 2
            if self.cdf(mp.e ** mid) < p:
                lo = mid
            else:
                hi = mid
        return mp.e ** hi


def tail(base, other_fn, c, base_quantiles, other_quantiles):
    """int_0^1 f_base(x) H(x + c) dx with x = e^s; H = other_fn (cdf or sf of the other)."""
    a, b = base.a, base.b
    log_c = mp.log(c)
    s0 = log_c - 90
    head = other_fn(c) * mp.e ** (a * s0 - base.lb) / a

    def integrand(s):
        x = mp.e ** s
        return mp.e ** (a * s + (b - 1) * mp.log1p(-x) - base.lb) * other_fn(x + c)

    points = {s0, log_c - 20, log_c, mp.mpf(0)}
    for q in base_quantiles:
        if q > 0:
            points.add(mp.log(q))
    for q in list(other_quantiles) + [mp.mpf(1)]:
        if q - c > 0:
            points.add(mp.log(q - c))
    pts = sorted(p for p in points if s0 <= p <= 0)
    return head + mp.quad(integrand, pts)


class Difference:
    def __init__(self, x, y):
        self.x, self.y = x, y
        levels = [mp.mpf(10) ** -k for k in (30, 12, 6, 3)] + [mp.mpf('0.1'), mp.mpf('0.5'), mp.mpf('0.9')]
        self.qx = [x.quantile_guess(p) for p in levels]
        self.qy = [y.quantile_guess(p) for p in levels]

    def tails(self, d):
        """(P(D <= d), P(D > d)), each integrated directly."""
        c = abs(d)
        if d > 0:
            lower = tail(self.x, self.y.cdf, c, self.qx, self.qy)
            upper = tail(self.x, self.y.sf, c, self.qx, self.qy)
        else:
            lower = tail(self.y, self.x.sf, c, self.qy, self.qx)
            upper = tail(self.y, self.x.cdf, c, self.qy, self.qx)
        return lower, upper

    def quantile(self, p):
        p = mp.mpf(p)
        upper_half = p > mp.mpf('0.5')
        lo, hi = mp.mpf(-800), mp.mpf(800)
        for _ in range(44):
            mid = (lo + hi) / 2
            d = mp.sign(mid) * mp.e ** (abs(mid) - 800)
            lower, upper = self.tails(d)
            below = (upper > 1 - p) if upper_half else (lower < p)
            if below:
                lo = mid
            else:
                hi = mid
        mid = (lo + hi) / 2
        return mp.sign(mid) * mp.e ** (abs(mid) - 800)


CASES = [
    # (name, control (conversions, visitors), challenger, prior (alpha, beta), level)
    ('0 of 678 vs 0 of 680, prior 0.00712,65.2', (0, 678), (0, 680), ('0.007123954424274551', '65.24800919992214'),
     '0.5756554758971683'),
]


def main():
    out = {'source': 'mpmath %s, 25 digits; see the docstring' % mp.__version__, 'cases': [], 'checks': []}
    worst = mp.mpf(0)
    for name, (c0, n0), (c1, n1), (pa, pb), level in CASES:
        a, b = mp.mpf(pa), mp.mpf(pb)
        x = Beta(c0 + a, n0 - c0 + b)
        y = Beta(c1 + a, n1 - c1 + b)
        diff = Difference(x, y)
        tail_p = (1 - mp.mpf(level)) / 2
        qs = [diff.quantile(tail_p), diff.quantile(1 - tail_p)]
        for q in qs:
            lower, upper = diff.tails(q)
            worst = max(worst, abs(lower + upper - 1))
        out['cases'].append({
            'name': name, 'control': [c0, n0], 'challenger': [c1, n1], 'prior': [float(pa), float(pb)],
            'level': float(level), 'lower': mp.nstr(qs[0], 12), 'upper': mp.nstr(qs[1], 12),
        })
        print(name, [mp.nstr(q, 10) for q in qs], file=sys.stderr, flush=True)
    out['checks'].append({'worst |P(D<=q) + P(D>q) - 1|': mp.nstr(worst, 3)})
    print(json.dumps(out, indent=1))


if __name__ == '__main__':
    main()
