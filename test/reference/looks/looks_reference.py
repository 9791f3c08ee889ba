"""Reference values for the planning functions of tests looked at several times (functions/stats/looks.ts,
brownianCrossing.ts, manyVariants.ts, detectableLift.ts, byDay.ts), from numpy/scipy.

Sections (python3 test/reference/looks/looks_reference.py SECTION ... > file; the committed looks_values.json
merges all sections: python3 test/reference/looks/looks_reference.py all > test/reference/looks/looks_values.json):

- normal:  the normal limit by scipy.stats.multivariate_normal (Genz's quasi-Monte Carlo, fixed seeds) of
           the partial-sum z-statistics Z_k, corr(Z_j, Z_k) = sqrt(t_j / t_k):
           two-sided |Z| >= 1.96 (Jennison & Turnbull 2000, Table 1.1), one-sided Z >= 1.645, Pocock's
           constants (z with two-sided rate 0.05; Pocock 1977) by brentq, and a few unequal cases. Each value
           is the mean over 3 seeds; "spread" is the largest difference between seeds.
- dunnett: Dunnett's (1955) one-sided many-to-one critical values c (infinite degrees of freedom, equal
           sizes, correlation 1/2): P(max Z_i >= c) = alpha, by scipy's multivariate normal (up to 8
           challengers) and by the one-dimensional integral  1 - int phi(y) Phi(y + c sqrt 2)^m dy
           (scipy.integrate.quad), for m = 1 ... 49 challengers.
- exact:   exact enumeration over both variants' binomial outcomes at every look: a dynamic programme over
           (x_A, x_B) with scipy.stats.binom pmfs (no truncation inside a +-12 sd window), the decision at
           each look P(p_B > p_A | data) >= threshold (two-sided: either variant's P >= threshold), where P is
           Evan Miller's closed form for a whole-number prior alpha and otherwise scipy.integrate.quad of
           f_A(x) * (1 - I_x(a_B, b_B)) (scipy.special.betaincc, the density from betaln); each
           x_A's boundary found by bisection over x_B (P rises with x_B).
- lift:    the smallest relative lift whose decision power (exact sum over both variants' outcomes, as in
           planning_power.py) reaches the power, by brentq on the lift.
- byday:   P(beats control) on cumulative daily counts (Miller / quad) and the split check's chi-square
           p-value on cumulative visitors (scipy.stats.chisquare), for an invented daily table.
"""
import json
import sys

import numpy as np
import scipy
from scipy import integrate, optimize, stats
from scipy.special import betaincc, betaln, logsumexp, ndtr, ndtri, xlog1py, xlogy

SEEDS = (11, 22, 33)


# --------------------------------------------------------------------------------------------------
# Normal limit


def corr_matrix(times):
    t = np.asarray(times, float)
    return np.sqrt(np.minimum.outer(t, t) / np.maximum.outer(t, t))


def mvn_rate(times, upper, lower=None, seed=11):
    """P(some Z_k >= upper_k or Z_k <= lower_k) = 1 - P(all lower_k < Z_k < upper_k)."""
    K = len(times)
    up = np.asarray(upper, float)
    lo = np.full(K, -np.inf) if lower is None else np.asarray(lower, float)
    inside = stats.multivariate_normal.cdf(
        up, mean=np.zeros(K), cov=corr_matrix(times), lower_limit=lo,
        maxpts=400_000 * K, abseps=1e-8, releps=1e-8, rng=np.random.default_rng(seed))
    return 1.0 - float(inside)


def seeded(fn):
    values = [fn(seed) for seed in SEEDS]
    return float(np.mean(values)), float(np.max(values) - np.min(values))


def section_normal():
    out = {"twoSided196": [], "oneSided1645": [], "pocock": [], "unequal": []}
    z2 = float(ndtri(0.975))
    z1 = float(ndtri(0.95))
    for K in (2, 3, 4, 5, 10, 20):
        times = list(range(1, K + 1))
        value, spread = seeded(lambda s: mvn_rate(times, [z2] * K, [-z2] * K, s))
        out["twoSided196"].append({"looks": K, "rate": value, "spread": spread})
    for K in (2, 5, 10, 20):
        times = list(range(1, K + 1))
        value, spread = seeded(lambda s: mvn_rate(times, [z1] * K, None, s))
        out["oneSided1645"].append({"looks": K, "rate": value, "spread": spread})
    for K in (2, 3, 4, 5, 10):
        times = list(range(1, K + 1))
        zs = []
        for seed in SEEDS:
            f = lambda z: mvn_rate(times, [z] * K, [-z] * K, seed) - 0.05
            zs.append(optimize.brentq(f, 1.9, 3.0, xtol=1e-7))
        out["pocock"].append({"looks": K, "z": float(np.mean(zs)), "spread": float(np.max(zs) - np.min(zs)),
                              "threshold": float(ndtr(np.mean(zs)))})
    cases = [
        ([100, 150, 400, 1000], [2.5, 2.2, 2.1, 2.0], [-3.0, -np.inf, -2.5, -2.0]),
        ([1, 2, 3], [2.0, 2.0, 2.0], None),
        ([5, 6, 30, 31, 90], [3.0, 1.8, 2.4, 2.3, 1.7], None),
        ([1, 10], [1.0, 2.5], [-1.0, -2.5]),
    ]
    for times, up, lo in cases:
        value, spread = seeded(lambda s: mvn_rate(times, up, lo, s))
        out["unequal"].append({"times": times, "upper": up,
                               "lower": None if lo is None else [None if not np.isfinite(v) else v for v in lo],
                               "rate": value, "spread": spread})
    return out


# --------------------------------------------------------------------------------------------------
# Dunnett


def dunnett_integral(c, m):
    f = lambda y: stats.norm.pdf(y) * stats.norm.cdf(y + c * np.sqrt(2.0)) ** m
    inside, _ = integrate.quad(f, -12, 12, epsabs=1e-14, epsrel=1e-13, limit=200)
    return 1.0 - inside


def dunnett_mvn(c, m, seed):
    cov = np.full((m, m), 0.5) + 0.5 * np.eye(m)
    inside = stats.multivariate_normal.cdf(np.full(m, c), mean=np.zeros(m), cov=cov, maxpts=400_000 * m,
                                           abseps=1e-9, releps=1e-9, rng=np.random.default_rng(seed))
    return 1.0 - float(inside)


def section_dunnett():
    out = []
    for alpha in (0.05, 0.01, 0.1):
        for m in list(range(1, 11)) + [15, 20, 30, 49]:
            c = optimize.brentq(lambda c: dunnett_integral(c, m) - alpha, 0.0, 8.0, xtol=1e-12)
            row = {"alpha": alpha, "challengers": m, "c": c, "threshold": float(ndtr(c))}
            if m <= 8 and alpha == 0.05:
                cs = [optimize.brentq(lambda c: dunnett_mvn(c, m, s) - alpha, 0.0, 8.0, xtol=1e-8) for s in SEEDS]
                row["cMvn"] = float(np.mean(cs))
                row["mvnSpread"] = float(np.max(cs) - np.min(cs))
            out.append(row)
    return out


# --------------------------------------------------------------------------------------------------
# Exact enumeration


def prob_above(aA, bA, aB, bB):
    """P(p_B > p_A), p_A ~ Beta(aA, bA), p_B ~ Beta(aB, bB)."""
    if float(aB).is_integer() and aB <= 20000:
        i = np.arange(int(aB))
        t = betaln(aA + i, bA + bB) - np.log(bB + i) - betaln(1 + i, bB) - betaln(aA, bA)
        return float(np.exp(logsumexp(t)))
    log_norm = betaln(aA, bA)
    f = lambda x: np.exp(xlogy(aA - 1, x) + xlog1py(bA - 1, -x) - log_norm) * betaincc(aB, bB, x)
    mA = aA / (aA + bA)
    sA = np.sqrt(aA * bA / ((aA + bA) ** 2 * (aA + bA + 1)))
    pts = [p for p in (mA - 3 * sA, mA, mA + 3 * sA) if 0 < p < 1]
    val, _ = integrate.quad(f, 0, 1, points=pts, limit=400, epsabs=1e-15, epsrel=1e-13)
    return float(val)


def window(n, p, nsd=12.0):
    m, s = n * p, np.sqrt(n * p * (1 - p))
    return max(0, int(np.floor(m - nsd * s - 3))), min(n, int(np.ceil(m + nsd * s + 3)))


def boundary(n, t, a, b, loA, hiA, loB, hiB, upper):
    """Upper: for each x_A the smallest x_B in [loB, hiB + 1] with P(B > A) >= t. Lower: the smallest x_B in
    [loB, hiB + 1] with P(A > B) = 1 - P(B > A) < t (so every x_B below it declares A)."""
    out = np.empty(hiA - loA + 1, dtype=np.int64)
    for i, xA in enumerate(range(loA, hiA + 1)):
        lo, hi = loB, hiB + 1
        while lo < hi:
            mid = (lo + hi) // 2
            p = prob_above(a + xA, b + n - xA, a + mid, b + n - mid)
            if (p >= t) if upper else (1 - p < t):
                hi = mid
            else:
                lo = mid + 1
        out[i] = lo
    return out


def exact_dp(looks, pA, pB, t, sides, a, b):
    total, by_look = 0.0, []
    f, prev, wA, wB = None, 0, None, None
    for n in looks:
        loA, hiA = window(n, pA)
        loB, hiB = window(n, pB)
        if f is None:
            g = np.outer(stats.binom.pmf(np.arange(loA, hiA + 1), n, pA), stats.binom.pmf(np.arange(loB, hiB + 1), n, pB))
        else:
            dn = n - prev
            MA = stats.binom.pmf(np.arange(loA, hiA + 1)[:, None] - np.arange(wA[0], wA[1] + 1)[None, :], dn, pA)
            MB = stats.binom.pmf(np.arange(loB, hiB + 1)[:, None] - np.arange(wB[0], wB[1] + 1)[None, :], dn, pB)
            g = MA @ f @ MB.T
        xb = np.arange(loB, hiB + 1)[None, :]
        stop = xb >= boundary(n, t, a, b, loA, hiA, loB, hiB, True)[:, None]
        if sides == 2:
            stop |= xb < boundary(n, t, a, b, loA, hiA, loB, hiB, False)[:, None]
        crossed = float(g[stop].sum())
        by_look.append(crossed)
        total += crossed
        f = np.where(stop, 0.0, g)
        prev, wA, wB = n, (loA, hiA), (loB, hiB)
    return total, by_look


def exact_cases():
    cases = []
    # The small tests: 2-10 equally spaced looks of 50-500 visitors, rates from 1% to 50%.
    for p in (0.01, 0.05, 0.2, 0.5):
        for K, step in ((2, 500), (3, 200), (5, 100), (10, 50), (5, 500), (10, 200)):
            looks = [step * (k + 1) for k in range(K)]
            cases.append({"rate": p, "lift": 0.0, "looks": looks, "threshold": 0.95, "sides": 1})
            cases.append({"rate": p, "lift": 0.0, "looks": looks, "threshold": 0.975, "sides": 2})
            lift = round(2.5 / np.sqrt(looks[-1] * p / (1 - p)), 4)
            if p * (1 + lift) < 1:
                cases.append({"rate": p, "lift": lift, "looks": looks, "threshold": 0.95, "sides": 1})
    # Unequal looks, other thresholds and priors.
    cases += [
        {"rate": 0.1, "lift": 0.0, "looks": [50, 120, 400, 410, 1000], "threshold": 0.9, "sides": 1},
        {"rate": 0.1, "lift": 0.3, "looks": [50, 120, 400, 410, 1000], "threshold": 0.99, "sides": 1},
        {"rate": 0.03, "lift": 0.0, "looks": [1, 2, 3, 10, 30, 100], "threshold": 0.95, "sides": 2},
        {"rate": 0.3, "lift": 0.0, "looks": [300, 600, 900], "threshold": 0.95, "sides": 1, "prior": [0.5, 0.5]},
        {"rate": 0.3, "lift": 0.0, "looks": [300, 600, 900], "threshold": 0.975, "sides": 2, "prior": [0.5, 0.5]},
        {"rate": 0.05, "lift": 0.4, "looks": [400, 800, 1200], "threshold": 0.95, "sides": 1, "prior": [2, 38]},
        {"rate": 0.05, "lift": 0.0, "looks": [400, 800, 1200], "threshold": 0.95, "sides": 1, "prior": [2, 38]},
        {"rate": 0.6, "lift": -0.1, "looks": [100, 200, 300], "threshold": 0.95, "sides": 1},
        {"rate": 0.5, "lift": 0.0, "looks": [1000, 2000], "threshold": 0.95, "sides": 1},
        {"rate": 0.02, "lift": 0.0, "looks": [300 * (k + 1) for k in range(30)], "threshold": 0.95, "sides": 1},
        {"rate": 0.02, "lift": 0.0, "looks": [300 * (k + 1) for k in range(30)], "threshold": 0.975, "sides": 2},
        {"rate": 0.2, "lift": 0.0, "looks": [100 * (k + 1) for k in range(30)], "threshold": 0.95, "sides": 1},
    ]
    return cases


def section_exact():
    out = []
    for c in exact_cases():
        a, b = c.get("prior", [1, 1])
        pA = c["rate"]
        pB = pA * (1 + c["lift"])
        rate, by_look = exact_dp(c["looks"], pA, pB, c["threshold"], c["sides"], a, b)
        out.append({**c, "probability": rate, "byLook": by_look})
        print(json.dumps(out[-1]), file=sys.stderr, flush=True)
    return out


# --------------------------------------------------------------------------------------------------
# Smallest detectable lift


def decision_power(n, p0, lift, t, a, b):
    p1 = p0 * (1 + lift)
    loA, hiA = window(n, p0, 9)
    loB, hiB = window(n, p1, 9)
    c = boundary(n, t, a, b, loA, hiA, loB, hiB, True)
    return float((stats.binom.pmf(np.arange(loA, hiA + 1), n, p0) * stats.binom.sf(c - 1, n, p1)).sum())


def boundary_fixed(n, p0, t, a, b, p1max):
    loA, hiA = window(n, p0, 9)
    _, hiB = window(n, p1max, 9)
    return loA, hiA, boundary(n, t, a, b, loA, hiA, 0, hiB, True)


def section_lift():
    cases = [
        (0.1, 3000, 0.95, 0.8, 1, 1),
        (0.05, 10000, 0.95, 0.8, 1, 1),
        (0.02, 20000, 0.95, 0.8, 1, 1),
        (0.3, 500, 0.95, 0.8, 1, 1),
        (0.1, 3000, 0.99, 0.9, 1, 1),
        (0.05, 5000, 0.9, 0.5, 1, 1),
        (0.2, 1000, 0.95, 0.8, 0.5, 0.5),
        (0.04, 8000, 0.95, 0.8, 4, 96),
        (0.5, 200, 0.95, 0.8, 1, 1),
    ]
    out = []
    for p0, n, t, power, a, b in cases:
        # The boundary does not depend on the lift: find it once (wide enough for the largest lift tried).
        hi_lift = min(1 / p0 - 1 - 1e-9, 20 / np.sqrt(n * p0 * (1 - p0)) + 1.0)
        loA, hiA, c = boundary_fixed(n, p0, t, a, b, p0 * (1 + hi_lift))
        pmfA = stats.binom.pmf(np.arange(loA, hiA + 1), n, p0)
        pw = lambda lift: float((pmfA * stats.binom.sf(c - 1, n, p0 * (1 + lift))).sum())
        lift = optimize.brentq(lambda L: pw(L) - power, 1e-9, hi_lift, xtol=1e-14, rtol=1e-13)
        out.append({"baselineRate": p0, "visitors": n, "threshold": t, "power": power, "prior": [a, b],
                    "lift": lift, "powerAtLift": pw(lift), "powerBelow": pw(lift * (1 - 1e-6)),
                    "powerAbove": pw(lift * (1 + 1e-6))})
        print(json.dumps(out[-1]), file=sys.stderr, flush=True)
    return out


# --------------------------------------------------------------------------------------------------
# Day by day (an invented test: control and two challengers, daily counts)

DAILY_VISITORS = [[412, 398, 405], [388, 401, 377], [0, 0, 0], [455, 440, 462], [430, 446, 421],
                  [397, 410, 388], [512, 498, 505]]
DAILY_CONVERSIONS = [[21, 19, 27], [17, 22, 24], [0, 0, 0], [25, 23, 31], [19, 26, 28],
                     [22, 20, 27], [26, 31, 33]]


def section_byday():
    v = np.cumsum(np.array(DAILY_VISITORS), axis=0)
    c = np.cumsum(np.array(DAILY_CONVERSIONS), axis=0)
    prob, split = [], []
    for d in range(v.shape[0]):
        row = [prob_above(1 + c[d, 0], 1 + v[d, 0] - c[d, 0], 1 + c[d, j], 1 + v[d, j] - c[d, j]) for j in (1, 2)]
        prob.append(row)
        split.append(float(stats.chisquare(v[d]).pvalue))
    split_planned = [float(stats.chisquare(v[d], v[d].sum() * np.array([2, 1, 1]) / 4).pvalue) for d in range(v.shape[0])]
    return {"visitors": DAILY_VISITORS, "conversions": DAILY_CONVERSIONS, "probAboveControl": prob,
            "srmPValue": split, "srmPValuePlanned211": split_planned}


SECTIONS = {"normal": section_normal, "dunnett": section_dunnett, "exact": section_exact,
            "lift": section_lift, "byday": section_byday}

if __name__ == "__main__":
    names = sys.argv[1:] or ["all"]
    if names == ["all"]:
        names = list(SECTIONS)
    result = {"scipy": scipy.__version__, "numpy": np.__version__}
    for name in names:
        result[name] = SECTIONS[name]()
    print(json.dumps(result, indent=1))
