"""Reference values for looks close together (a small fraction of their size apart), where the recursive
integration of functions/stats/brownianCrossing.ts switches from Simpson's rule to exact integrals of the
density's quadratic pieces: the normal limit by scipy.stats.multivariate_normal (Genz's quasi-Monte Carlo,
fixed seeds) of the partial-sum z-statistics Z_k, corr(Z_j, Z_k) = sqrt(t_j / t_k). Each value is the mean
over 3 seeds; "spread" is the largest difference between seeds.

    python3 test/reference/looks/looks_close.py > test/reference/looks/looks_close.json   (about a minute)
"""
import json

import numpy as np
import scipy
from scipy import stats

SEEDS = (11, 22, 33)
Z95 = 1.6448536269514722
Z975 = 1.959963984540054


def corr_matrix(times):
    t = np.asarray(times, float)
    return np.sqrt(np.minimum.outer(t, t) / np.maximum.outer(t, t))


def mvn_rate(times, upper, lower, seed):
    """P(some Z_k >= upper_k or Z_k <= lower_k) = 1 - P(all lower_k < Z_k < upper_k)."""
    K = len(times)
    inside = stats.multivariate_normal.cdf(
        np.asarray(upper, float), mean=np.zeros(K), cov=corr_matrix(times), lower_limit=np.asarray(lower, float),
        maxpts=2_000_000, abseps=1e-8, releps=0, rng=np.random.default_rng(seed))
    return 1.0 - float(inside)


def case(times, z, sides):
    K = len(times)
    upper = [z] * K
    lower = [-z] * K if sides == 2 else [-np.inf] * K
    values = [mvn_rate(times, upper, lower, seed) for seed in SEEDS]
    return {"times": [float(t) for t in times], "z": z, "sides": sides,
            "rate": float(np.mean(values)), "spread": float(np.max(values) - np.min(values))}


def main():
    cases = []
    for K, span, z, sides in [(2, 1e-3, Z95, 2), (10, 1e-3, Z95, 2), (10, 1e-2, Z95, 2), (5, 1e-4, Z95, 1),
                              (10, 1e-2, Z975, 1), (20, 1e-2, Z975, 2), (8, 1e-6, Z95, 1)]:
        cases.append(case(np.linspace(1.0, 1.0 + span, K), z, sides))
    print(json.dumps({"scipy": scipy.__version__, "cases": cases}, indent=1))


if __name__ == "__main__":
    main()
