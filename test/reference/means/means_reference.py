#!/usr/bin/env python3
"""Reference values for the Normal model of averages (functions/stats/normalMeans.ts).

Model (Gelman et al., Bayesian Data Analysis, 3rd ed., sec. 3.2): with the reference prior
p(mu, sigma^2) ~ 1/sigma^2, a variant's mean has a Student t posterior with n - 1 degrees of freedom,
centre xbar and scale s/sqrt(n).

Sources used here, independent of the TypeScript code:
  * scipy.stats.t (Boost's Student t) ppf/isf for single-variant intervals, and in every integrand the
    functions scipy.stats.t itself calls (scipy.special.stdtr for cdf and sf, the Pochhammer form of the
    pdf), called directly to avoid its per-call overhead;
  * scipy.integrate.quad (QUADPACK adaptive Gauss-Kronrod) with epsrel 1e-13 for the comparisons,
    integrating over x on pieces split at each variant's centre +- k scales;
  * scipy.optimize.brentq (xtol 1e-15 relative) for quantiles of differences and lifts;
  * mpmath (50 digits: quad of the exact t density, cdf through the closed form of the t cdf for small
    degrees of freedom) as an independent check of a few values, printed beside the scipy values.
Run: python3 test/reference/means/means_reference.py > test/reference/means/means_values.json
(the demo numbers are an invented garden-supply shop scenario, revenue per visitor in dollars).
"""
import json
import math
import sys
import time
import warnings

import mpmath as mp
from scipy import integrate, optimize, special, stats

warnings.simplefilter("ignore", integrate.IntegrationWarning)
INF = math.inf
EPSREL = 1e-13


def posterior(v):
    n, m, s = v
    return (n - 1, m, s / math.sqrt(n))


def log_norm(nu):
    """log of Gamma((nu+1)/2)/(Gamma(nu/2) sqrt(nu pi)) through the Pochhammer symbol (no cancellation)."""
    return math.log(special.poch(0.5 * nu, 0.5)) - 0.5 * (math.log(nu) + math.log(math.pi))


def pdf(p, x):
    """The t density (what scipy.stats.t.pdf computes, without its per-call overhead)."""
    nu, c, sc = p
    t = (x - c) / sc
    return math.exp(log_norm(nu) - (nu + 1) / 2 * math.log1p(t * t / nu)) / sc


def cdf(p, x):
    """scipy.special.stdtr, the function behind scipy.stats.t.cdf (Boost's Student t)."""
    nu, c, sc = p
    if sc == 0:
        return 1.0 if x >= c else 0.0
    return float(special.stdtr(nu, (x - c) / sc))


def sf(p, x):
    nu, c, sc = p
    if sc == 0:
        return 1.0 if x < c else 0.0
    return float(special.stdtr(nu, -(x - c) / sc))


def breakpoints(ps, lo=-INF, hi=INF):
    pts = set()
    for nu, c, sc in ps:
        if sc == 0:
            pts.add(c)
            continue
        for k in (-1e4, -1e3, -100, -30, -10, -4, -2, -1, 0, 1, 2, 4, 10, 30, 100, 1e3, 1e4):
            pts.add(c + k * sc)
    return sorted(x for x in pts if lo < x < hi)


def integrate_line(f, pts, lo=-INF, hi=INF):
    """Integral of f over (lo, hi), split at pts; returns (value, largest QUADPACK error estimate)."""
    edges = [lo] + list(pts) + [hi]
    total = 0.0
    err = 0.0
    for a, b in zip(edges[:-1], edges[1:]):
        if a == b:
            continue
        val, e = integrate.quad(f, a, b, epsabs=0, epsrel=EPSREL, limit=2000)
        total += val
        err += e
    return total, err


def prob_highest(ps):
    out = []
    for i, pi in enumerate(ps):
        others = [p for j, p in enumerate(ps) if j != i]

        def f(x, pi=pi, others=others):
            value = pdf(pi, x)
            for p in others:
                value *= cdf(p, x)
            return value

        val, _ = integrate_line(f, breakpoints(ps))
        out.append(val)
    return out


def prob_greater(px, py):
    """P(X > Y) for independent t posteriors; the integrand uses tails directly."""
    val, _ = integrate_line(lambda x: pdf(px, x) * cdf(py, x), breakpoints([px, py]))
    return val


def diff_cdf(p0, p1, d):
    """P(mu1 - mu0 <= d) = int f0(x) F1(x + d) dx, or the upper tail when that is the smaller."""
    lower, _ = integrate_line(lambda x: pdf(p0, x) * cdf(p1, x + d), breakpoints([p0, (p1[0], p1[1] - d, p1[2])]))
    return lower


def diff_sf(p0, p1, d):
    upper, _ = integrate_line(lambda x: pdf(p0, x) * sf(p1, x + d), breakpoints([p0, (p1[0], p1[1] - d, p1[2])]))
    return upper


def quantile(cdf_fn, sf_fn, q, lo, hi):
    if q <= 0.5:
        g = lambda d: cdf_fn(d) - q
    else:
        g = lambda d: (1 - q) - sf_fn(d)
    while g(lo) > 0:
        lo -= (hi - lo)
    while g(hi) < 0:
        hi += (hi - lo)
    return optimize.brentq(g, lo, hi, xtol=1e-300, rtol=1e-15, maxiter=400)


def ratio_cdf(p0, p1, r):
    """P(mu1/mu0 - 1 <= r), mu0 of either sign: int_{x>0} f0 F1((1+r)x) + int_{x<0} f0 S1((1+r)x)."""
    k = 1 + r
    pts_pos = breakpoints([p0], 0, INF)
    pos, _ = integrate_line(lambda x: pdf(p0, x) * cdf(p1, k * x), pts_pos, 0, INF)
    neg, _ = integrate_line(lambda x: pdf(p0, x) * sf(p1, k * x), breakpoints([p0], -INF, 0), -INF, 0)
    return pos + neg


def ratio_sf(p0, p1, r):
    k = 1 + r
    pos, _ = integrate_line(lambda x: pdf(p0, x) * sf(p1, k * x), breakpoints([p0], 0, INF), 0, INF)
    neg, _ = integrate_line(lambda x: pdf(p0, x) * cdf(p1, k * x), breakpoints([p0], -INF, 0), -INF, 0)
    return pos + neg


def expected_loss(ps):
    """loss_i = int F_i(x) (1 - prod_{j != i} F_j(x)) dx (= E[max_j mu_j - mu_i])."""
    out = []
    for i, pi in enumerate(ps):
        others = [p for j, p in enumerate(ps) if j != i]

        def f(x, pi=pi, others=others):
            log_prod = 0.0
            for p in others:
                c = cdf(p, x)
                if c == 0:
                    return cdf(pi, x)
                log_prod += math.log(c)
            return cdf(pi, x) * -math.expm1(log_prod)

        val, _ = integrate_line(f, breakpoints(ps))
        out.append(val)
    return out


def control_below_zero(p0):
    return cdf(p0, 0.0)


CASES = [
    # name, variants (count, mean, sd), levels
    ("order_value_1e2", [(100, 48.0, 20.0), (100, 52.0, 22.0)], [0.95, 0.5]),
    ("revenue_1e2", [(100, 2.10, 6.5), (100, 2.60, 7.1)], [0.95]),
    ("revenue_1e4", [(10000, 2.10, 6.5), (10000, 2.18, 6.7), (10000, 2.05, 6.2)], [0.95, 0.999]),
    ("revenue_1e6", [(1000000, 2.100, 6.5), (1000000, 2.112, 6.6)], [0.95]),
    ("revenue_1e8", [(100000000, 2.1000, 6.5), (100000000, 2.1012, 6.5)], [0.95]),
    ("tiny_2", [(2, 10.0, 4.0), (2, 12.0, 5.0)], [0.95, 0.5]),
    ("tiny_3", [(3, 30.0, 4.0), (3, 34.0, 5.0), (3, 31.0, 3.0)], [0.95]),
    ("mixed_counts", [(20, 5.0, 8.0), (5000, 5.3, 9.0)], [0.9]),
    ("far_apart", [(1000, 2.0, 1.0), (1000, 3.0, 1.0)], [0.95]),
    ("near_zero_control", [(100, 0.5, 10.0), (100, 0.7, 10.0)], [0.95]),
    ("twenty", [(1000, 3.0 + 0.04 * ((7 * i) % 20) - 0.3 * (i == 13), 9.0 + 0.1 * i) for i in range(20)], [0.95]),
]


def run_case(name, variants, levels):
    ps = [posterior(v) for v in variants]
    k = len(ps)
    p0 = ps[0]
    res = {"name": name, "variants": [{"count": n, "mean": m, "sd": s} for n, m, s in variants]}
    res["intervals"] = {}
    res["diffIntervals"] = {}
    res["liftIntervals"] = {}
    below = control_below_zero(p0)
    res["controlBelowZero"] = below
    for level in levels:
        a = (1 - level) / 2
        res["intervals"][str(level)] = [
            [c + sc * stats.t.ppf(a, nu), c + sc * stats.t.isf(a, nu)] for nu, c, sc in ps
        ]
        diffs = []
        lifts = []
        for p1 in ps[1:]:
            spread = 10 * (p0[2] + p1[2])
            centre = p1[1] - p0[1]
            row = []
            for q in (a, 0.5, 1 - a):
                row.append(quantile(lambda d: diff_cdf(p0, p1, d), lambda d: diff_sf(p0, p1, d), q,
                                    centre - spread, centre + spread))
            diffs.append(row)
            if below <= 1e-6:
                centre_r = p1[1] / p0[1] - 1
                spread_r = 10 * (p1[2] / abs(p0[1]) + abs(p1[1]) * p0[2] / p0[1] ** 2)
                row = []
                for q in (a, 0.5, 1 - a):
                    row.append(quantile(lambda r: ratio_cdf(p0, p1, r), lambda r: ratio_sf(p0, p1, r), q,
                                        centre_r - spread_r, centre_r + spread_r))
                lifts.append(row)
        res["diffIntervals"][str(level)] = diffs
        if below <= 1e-6:
            res["liftIntervals"][str(level)] = lifts
    res["probHighest"] = prob_highest(ps)
    res["probAboveControl"] = [prob_greater(p1, p0) for p1 in ps[1:]]
    res["probBelowControl"] = [prob_greater(p0, p1) for p1 in ps[1:]]
    if all(p[0] > 1 for p in ps):
        res["expectedLoss"] = expected_loss(ps)
    # Welch's normal approximation (a sanity check for large counts only, not a reference).
    res["welchAboveControl"] = [
        float(stats.norm.sf(-(p1[1] - p0[1]) / math.hypot(p1[2], p0[2]))) for p1 in ps[1:]
    ]
    return res


# ---- point masses (sd = 0): closed forms through one t distribution --------------------------------
def point_mass_cases():
    out = {}
    # control has no spread (every visitor spent nothing: mean 0, sd 0); challenger has spread.
    c0 = posterior((50, 0.0, 0.0))
    c1 = posterior((50, 0.4, 2.0))
    a = 0.025
    out["zero_control"] = {
        "variants": [{"count": 50, "mean": 0.0, "sd": 0.0}, {"count": 50, "mean": 0.4, "sd": 2.0}],
        "probAboveControl": [float(sf(c1, 0.0))],
        "diffInterval95": [[c1[1] + c1[2] * stats.t.ppf(q, c1[0]) for q in (a, 0.5, 1 - a)]],
    }
    # challenger has no spread, control has: mean 40 (sd 0) against mean 38 (sd 15) over 400.
    q0 = posterior((400, 38.0, 15.0))
    q1 = (0, 40.0, 0.0)
    f0 = float(cdf(q0, 0.0))
    lift = []
    for q in (a, 0.5, 1 - a):
        # P(40/mu0 - 1 <= r) = F0(0) + S0(40/(1+r)) for 1+r > 0 -> 40/(1+r) = isf(q - F0(0)).
        x = q0[1] + q0[2] * stats.t.isf(q - f0, q0[0])
        lift.append(40.0 / x - 1)
    out["point_challenger"] = {
        "variants": [{"count": 400, "mean": 38.0, "sd": 15.0}, {"count": 30, "mean": 40.0, "sd": 0.0}],
        "probAboveControl": [float(cdf(q0, 40.0))],
        "diffInterval95": [[40.0 - (q0[1] + q0[2] * stats.t.isf(q, q0[0])) for q in (a, 0.5, 1 - a)]],
        "liftInterval95": [lift],
    }
    return out


# ---- mpmath checks (50 digits) -----------------------------------------------------------------
mp.mp.dps = 50


def mp_t_cdf(t, nu):
    """Closed form of the t cdf through the regularised incomplete beta (small nu only)."""
    t = mp.mpf(t)
    x = nu / (nu + t * t)
    tail = mp.betainc(mp.mpf(nu) / 2, mp.mpf(1) / 2, 0, x, regularized=True) / 2
    return 1 - tail if t > 0 else tail


def mp_t_pdf(t, nu):
    nu = mp.mpf(nu)
    return mp.exp(mp.loggamma((nu + 1) / 2) - mp.loggamma(nu / 2)) / mp.sqrt(nu * mp.pi) * (1 + t * t / nu) ** (-(nu + 1) / 2)


def mp_prob_greater(v1, v0):
    (n1, m1, s1), (n0, m0, s0) = v1, v0
    nu1, nu0 = n1 - 1, n0 - 1
    sc1, sc0 = mp.mpf(s1) / mp.sqrt(n1), mp.mpf(s0) / mp.sqrt(n0)
    # x = m1 + sc1*sinh(u): density of mu1 in u times F0(x); the integrand decays like e^(-nu1 |u|).
    f = lambda u: mp_t_pdf(mp.sinh(u), nu1) * mp.cosh(u) * mp_t_cdf((m1 + sc1 * mp.sinh(u) - m0) / sc0, nu0)
    return mp.quad(f, mp.linspace(-80, 80, 81))


def mp_checks():
    out = {}
    for name, v in [("order_value_1e2", [(100, 48.0, 20.0), (100, 52.0, 22.0)]),
                    ("tiny_2", [(2, 10.0, 4.0), (2, 12.0, 5.0)]),
                    ("tiny_3", [(3, 30.0, 4.0), (3, 34.0, 5.0)])]:
        out[name] = {"probAboveControl": float(mp_prob_greater(v[1], v[0]))}
    # t quantiles, nu = 1 and 2 exactly: Cauchy tan(pi (p - 1/2)); nu = 2: t = (2p-1)/sqrt(2p(1-p)).
    out["cauchy_q975"] = float(mp.tan(mp.pi * (mp.mpf("0.975") - mp.mpf(1) / 2)))
    p = mp.mpf("0.975")
    out["t2_q975"] = float((2 * p - 1) / mp.sqrt(2 * p * (1 - p)))
    return out


def main():
    cases = []
    for c in CASES:
        started = time.time()
        cases.append(run_case(*c))
        print(c[0], f"{time.time() - started:.1f}s", file=sys.stderr, flush=True)
    doc = {
        "source": "test/reference/means/means_reference.py: scipy " + __import__("scipy").__version__
        + " (stats.t, integrate.quad epsrel 1e-13, optimize.brentq); mpmath " + mp.__version__ + " checks",
        "cases": cases,
        "pointMass": point_mass_cases(),
        "mpmath": mp_checks(),
    }
    json.dump(doc, sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
