"""Reference values for the worksheet-function tests (test/addin/*.test.ts).

Independent of the project's code: every value comes from scipy 1.17 (scipy.stats distributions,
scipy.integrate.quad, scipy.optimize) using the textbook definitions of each quantity. Run with
    python3 test/reference/addin/addin_values.py > test/reference/addin/addin_values.json
The scenario is invented (an online garden-supply shop testing checkout buttons).
"""
import json
import math

import numpy as np
from scipy import integrate, optimize, stats

QUAD = dict(epsabs=1e-14, epsrel=1e-12, limit=400)


def beta_post(x, n, a=1.0, b=1.0):
    return stats.beta(a + x, b + n - x)


def support(dists, width=14.0):
    """An interval holding all the mass of every distribution (mean +- width sd), clipped to their support."""
    lo = min(d.mean() - width * d.std() for d in dists)
    hi = max(d.mean() + width * d.std() for d in dists)
    s_lo = max(lo, max(d.support()[0] for d in dists))
    s_hi = min(hi, min(d.support()[1] for d in dists))
    return s_lo, s_hi


def integrate_over(f, dists):
    lo, hi = support(dists)
    pts = sorted({d.mean() for d in dists})
    return integrate.quad(f, lo, hi, points=[p for p in pts if lo < p < hi], **QUAD)[0]


def prob_highest(dists):
    out = []
    for i, d in enumerate(dists):
        others = [o for j, o in enumerate(dists) if j != i]
        out.append(integrate_over(lambda t: d.pdf(t) * np.prod([o.cdf(t) for o in others]), dists))
    return out


def prob_above_control(dists):
    a = dists[0]
    return [integrate_over(lambda t: b.pdf(t) * a.cdf(t), [a, b]) for b in dists[1:]]


def expected_loss(dists):
    # E[max] = lo + integral of (1 - prod F) over the support; loss_i = E[max] - E[X_i]
    lo, hi = support(dists)
    e_max = lo + integrate_over(lambda t: 1.0 - np.prod([d.cdf(t) for d in dists]), dists)
    return [e_max - d.mean() for d in dists]


def quantiles_of(cdf, probs, lo, hi):
    return [optimize.brentq(lambda v: cdf(v) - p, lo, hi, xtol=1e-15, rtol=1e-13, maxiter=500) for p in probs]


def diff_cdf(a, b):
    # P(B - A <= d) = integral f_A(s) F_B(s + d) ds
    return lambda d: integrate_over(lambda s: a.pdf(s) * b.cdf(s + d), [a])


def ratio_cdf(a, b):
    # P(B / A - 1 <= r) for A > 0: integral f_A(s) F_B(s (1 + r)) ds
    return lambda r: integrate_over(lambda s: a.pdf(s) * b.cdf(s * (1.0 + r)), [a])


def three_point(cdf, level, lo, hi):
    tail = (1.0 - level) / 2.0
    return quantiles_of(cdf, [tail, 0.5, 1.0 - tail], lo, hi)


def hdi(d, level):
    def width(p):
        return d.ppf(p + level) - d.ppf(p)
    res = optimize.minimize_scalar(width, bounds=(1e-12, 1.0 - level - 1e-12), method="bounded",
                                   options=dict(xatol=1e-13))
    return [d.ppf(res.x), d.ppf(res.x + level)]


def conversion_block(x, n, level=0.95, a=1.0, b=1.0, min_lift=0.0):
    dists = [beta_post(xi, ni, a, b) for xi, ni in zip(x, n)]
    ctrl = dists[0]
    out = {
        "conversions": x, "visitors": n, "level": level, "prior": [a, b],
        "posteriorMean": [d.mean() for d in dists],
        "rateIntervalCentral": [[d.ppf((1 - level) / 2), d.ppf((1 + level) / 2)] for d in dists],
        "rateIntervalHdi": [hdi(d, level) for d in dists],
        "probHighest": prob_highest(dists),
        "probAboveControl": prob_above_control(dists),
        "expectedLoss": expected_loss(dists),
        "liftInterval": [three_point(ratio_cdf(ctrl, d), level, -0.99, 20.0) for d in dists[1:]],
        "rateDiffInterval": [three_point(diff_cdf(ctrl, d), level, -1.0, 1.0) for d in dists[1:]],
        "minLift": min_lift,
        "probLiftAbove": [1.0 - ratio_cdf(ctrl, d)(min_lift) for d in dists[1:]],
    }
    return out


def mean_block(count, mean, sd, level=0.95):
    dists = [stats.t(df=c - 1, loc=m, scale=s / math.sqrt(c)) for c, m, s in zip(count, mean, sd)]
    ctrl = dists[0]
    return {
        "count": count, "mean": mean, "sd": sd, "level": level,
        "meanInterval": [[d.ppf((1 - level) / 2), d.ppf((1 + level) / 2)] for d in dists],
        "probHighest": prob_highest(dists),
        "probAboveControl": prob_above_control(dists),
        "expectedLoss": expected_loss(dists),
        "diffInterval": [three_point(diff_cdf(ctrl, d), level, -1e3, 1e3) for d in dists[1:]],
        "liftInterval": [three_point(ratio_cdf(ctrl, d), level, -0.99, 20.0) for d in dists[1:]],
    }


def events_block(events, exposure, level=0.95, shape=1.0, rate=0.0):
    dists = [stats.gamma(a=shape + e, scale=1.0 / (rate + t)) for e, t in zip(events, exposure)]
    ctrl = dists[0]
    return {
        "events": events, "exposure": exposure, "level": level, "prior": [shape, rate],
        "rateInterval": [[d.ppf((1 - level) / 2), d.ppf((1 + level) / 2)] for d in dists],
        "probHighest": prob_highest(dists),
        "probAboveControl": prob_above_control(dists),
        # closed form (check-values.md): P(lambda_B > lambda_A) = I_z(a_A, a_B), z = b_A / (b_A + b_B)
        "probAboveControlClosedForm": [
            float(stats.beta.cdf((rate + exposure[0]) / (2 * rate + exposure[0] + t), shape + events[0], shape + e))
            for e, t in zip(events[1:], exposure[1:])
        ],
        "expectedLoss": expected_loss(dists),
        "liftInterval": [three_point(ratio_cdf(ctrl, d), level, -0.99, 20.0) for d in dists[1:]],
    }


def prior_from_interval(low, high, level):
    tail = (1 - level) / 2

    def eqs(v):
        a, b = np.exp(v)
        return [stats.beta.ppf(tail, a, b) - low, stats.beta.ppf(1 - tail, a, b) - high]
    m = (low + high) / 2
    sol = optimize.fsolve(eqs, [math.log(m * 50), math.log((1 - m) * 50)], xtol=1e-14)
    return [float(v) for v in np.exp(sol)]


def prior_from_history_likelihood(x, n):
    def nll(v):
        a, b = np.exp(v)
        return -sum(stats.betabinom.logpmf(xi, ni, a, b) for xi, ni in zip(x, n))
    res = optimize.minimize(nll, [math.log(5.0), math.log(95.0)], method="Nelder-Mead",
                            options=dict(xatol=1e-12, fatol=1e-14, maxiter=20000))
    return [float(v) for v in np.exp(res.x)]


def decision_power(p0, lift, n, threshold, a=1.0, b=1.0):
    """Exact: sum over control conversions xa of P(xa) * P(challenger conversions >= smallest xb that ends
    with P(rate_B > rate_A | data) >= threshold)."""
    p1 = p0 * (1 + lift)
    ca, cb = stats.binom(n, p0), stats.binom(n, p1)
    xa_lo, xa_hi = int(ca.ppf(1e-15)), int(ca.isf(1e-15))

    def p_above(xa, xb):
        A, B = beta_post(xa, n, a, b), beta_post(xb, n, a, b)
        return integrate_over(lambda t: B.pdf(t) * A.cdf(t), [A, B])

    total = 0.0
    for xa in range(max(0, xa_lo), min(n, xa_hi) + 1):
        lo, hi = xa, n  # P(B > A) < 0.5 when xb < xa for a symmetric prior; threshold > 0.5 so start at xa
        if p_above(xa, hi) < threshold:
            continue
        while hi - lo > 1:
            mid = (lo + hi) // 2
            if p_above(xa, mid) >= threshold:
                hi = mid
            else:
                lo = mid
        first = hi if p_above(xa, lo) < threshold else lo
        total += ca.pmf(xa) * cb.sf(first - 1)
    return total


if __name__ == "__main__":
    out = {
        "source": "scipy 1.17 (stats.beta/t/gamma/betabinom, integrate.quad, optimize); made by addin_values.py",
        # Invented scenario: checkout buttons of an online garden-supply shop (grey, green, large green).
        "conversionTwo": conversion_block([120, 150], [2400, 2380], min_lift=0.05),
        "conversionThree": conversion_block([120, 150, 138], [2400, 2380, 2410], level=0.9, a=2.0, b=38.0, min_lift=-0.02),
        "meanTwo": mean_block([1200, 1180], [3.10, 3.42], [9.8, 10.4]),
        "meanThree": mean_block([800, 820, 790], [12.5, 13.4, 12.9], [20.0, 21.5, 19.0], level=0.9),
        "eventsTwo": events_block([340, 395], [1000.0, 1010.0]),
        "eventsThree": events_block([52, 61, 70], [400.0, 410.0, 395.0], level=0.9, shape=2.0, rate=10.0),
        "priorFromMean": {"meanRate": 0.05, "strength": 200, "alpha": 10.0, "beta": 190.0},
        "priorFromInterval": {"low": 0.03, "high": 0.07, "level": 0.9,
                              "ab": prior_from_interval(0.03, 0.07, 0.9)},
        "priorFromIntervalLevel95": {"low": 0.04, "high": 0.06, "level": 0.95,
                                     "ab": prior_from_interval(0.04, 0.06, 0.95)},
        "priorFromHistory": {"conversions": [30, 75, 52, 41, 88, 47], "visitors": [1000, 1100, 1050, 900, 1200, 980],
                             "likelihood": prior_from_history_likelihood([30, 75, 52, 41, 88, 47],
                                                                         [1000, 1100, 1050, 900, 1200, 980])},
        "decisionPower": [
            {"baseline": 0.10, "lift": 0.20, "n": 1000, "threshold": 0.95,
             "power": decision_power(0.10, 0.20, 1000, 0.95)},
            {"baseline": 0.10, "lift": 0.0, "n": 1000, "threshold": 0.95,
             "power": decision_power(0.10, 0.0, 1000, 0.95)},
        ],
    }
    print(json.dumps(out, indent=1))
