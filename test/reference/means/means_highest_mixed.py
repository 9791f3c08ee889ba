#!/usr/bin/env python3
"""P(each is highest) of fifty variants of very mixed counts (2 to 1e8) in the Normal model: the bench's
"50 uneven variants" of averages (bench/worstCases.js unevenMeans), heavy and narrow t posteriors side by
side, so the add-in cannot put them in one shared coordinate and integrates them on a grid read through
each one's own coordinate (compare/sharedHighest.ts mappedHighestIntegrals).

Model: Gelman et al., Bayesian Data Analysis, 3rd ed., section 3.2 (Student t, n - 1 df, centre the mean,
scale sd / sqrt(n)). P(i highest) = int f_i(x) prod_{j != i} F_j(x) dx, written in i's own variable
x = m_i + s_i sinh(u) (so the t's polynomial tails decay like e^(-nu |u|)), with F_j from
scipy.special.stdtr and f_i from scipy.stats.t.logpdf; scipy.integrate.quad (epsabs 0, epsrel 1e-12)
between breakpoints at every posterior's centre +- 0, 1/2, ..., 8 of its scales (mapped to u) and at every
whole u over the range where i's density in u is above e^-800.
The counts, means and sds are an invented scenario (average order values of fifty page layouts).
Run: python3 test/reference/means/means_highest_mixed.py > test/reference/means/means_highest_mixed.json
"""
import json
import math
import sys

import numpy as np
from scipy import integrate, special, stats


def uneven_means(k):
    """bench/worstCases.js unevenMeans(k), the same arithmetic."""
    out = []
    for i in range(k):
        count = round(2 * 10 ** ((7.7 * i) / (k - 1)))
        mean = 24 * (1 + 0.01 * ((i * 11) % k))
        sd = 0.01 * 10 ** ((4.5 * ((i * 13) % k)) / (k - 1))
        out.append((count, mean, sd))
    return out


def js_round(v):
    return math.floor(v + 0.5)


def highest(variants):
    dfs = np.array([n - 1.0 for n, _, _ in variants])
    ms = np.array([m for _, m, _ in variants])
    ss = np.array([s / math.sqrt(n) for n, _, s in variants])
    k = len(variants)
    out = []
    for i in range(k):
        others = np.array([j for j in range(k) if j != i])
        df_o, m_o, s_o = dfs[others], ms[others], ss[others]
        nu, m, s = dfs[i], ms[i], ss[i]

        def integrand(u):
            x = m + s * math.sinh(u)
            with np.errstate(divide="ignore"):
                log_f = np.log(special.stdtr(df_o, (x - m_o) / s_o)).sum()
            if log_f == -np.inf:
                return 0.0
            log_g = stats.t.logpdf(math.sinh(u), nu) + math.log(math.cosh(u))
            return math.exp(log_g + log_f)

        reach = min(700.0, 800.0 / nu + 5.0)
        points = set(float(v) for v in range(-int(reach), int(reach) + 1))
        for mj, sj in zip(ms, ss):
            for q in np.arange(-8.0, 8.01, 0.5):
                t = (mj + q * sj - m) / s
                u = math.asinh(t)
                if -reach < u < reach:
                    points.add(u)
        points = sorted(points)
        total = 0.0
        for a, b in zip(points[:-1], points[1:]):
            total += integrate.quad(integrand, a, b, epsabs=0, epsrel=1e-12, limit=200)[0]
        out.append(total)
        print(f"variant {i + 1}: {total!r}", file=sys.stderr)
    return out


def main():
    variants = [(js_round(n), m, s) for n, m, s in uneven_means(50)]
    probs = highest(variants)
    json.dump({"source": "test/reference/means/means_highest_mixed.py (scipy.special.stdtr, scipy.integrate.quad epsrel 1e-12)",
               "name": "highest_mixed_50", "variants": [{"count": n, "mean": m, "sd": s} for n, m, s in variants],
               "probHighest": probs}, sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
