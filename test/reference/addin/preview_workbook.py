#!/usr/bin/env python3
"""Outside reference values for the preview's demo workbook (test/preview/workbook.test.ts).

Computed with scipy (a general-purpose reference library), independent of the project's code, for the
INVENTED demo numbers of preview/src/demoWorkbook.ts (an online garden-supply shop). Run:

    python3 test/reference/addin/preview_workbook.py > test/reference/addin/preview_workbook.json
"""
import json
import math

import numpy as np
import scipy
from scipy import special, stats

# Checkout test (invented): visitors, conversions; revenue count, mean, sd; basket adds, sessions.
visitors = [10412, 10388, 10451]
conversions = [412, 463, 431]
rev_count = [10412, 10388, 10451]
rev_mean = [2.41, 2.63, 2.50]
rev_sd = [11.8, 12.3, 12.0]
events = [1820, 1968, 1902]
exposure = [15230, 15190, 15310]

def prob_b_beats_a(aA, bA, aB, bB):
    """Evan Miller (2015), "Formulas for Bayesian A/B Testing": exact sum for integer aB."""
    terms = [
        special.betaln(aA + i, bA + bB) - math.log(bB + i) - special.betaln(1 + i, bB) - special.betaln(aA, bA)
        for i in range(int(aB))
    ]
    return float(np.exp(special.logsumexp(terms)))

alpha = [1 + x for x in conversions]
beta = [1 + n - x for x, n in zip(conversions, visitors)]
out = {
    "source": "scipy " + scipy.__version__ + " (test/reference/addin/preview_workbook.py)",
    "posterior_mean": [a / (a + b) for a, b in zip(alpha, beta)],
    "rate_interval_central_95": [[float(stats.beta.ppf(0.025, a, b)), float(stats.beta.ppf(0.975, a, b))] for a, b in zip(alpha, beta)],
    "prob_above_control": [prob_b_beats_a(alpha[0], beta[0], alpha[i], beta[i]) for i in (1, 2)],
    "srm_pvalue_equal_shares": float(stats.chisquare(visitors).pvalue),
    "mean_interval_95": [
        [m - float(stats.t.ppf(0.975, n - 1)) * s / math.sqrt(n), m + float(stats.t.ppf(0.975, n - 1)) * s / math.sqrt(n)]
        for n, m, s in zip(rev_count, rev_mean, rev_sd)
    ],
    "events_rate_interval_95": [
        [float(stats.gamma.ppf(0.025, 1 + e, scale=1 / t)), float(stats.gamma.ppf(0.975, 1 + e, scale=1 / t))]
        for e, t in zip(events, exposure)
    ],
    # P(lambda_B > lambda_A) = I_z(a_A, a_B), z = b_A / (b_A + b_B) (docs/check-values.md, Gamma–Poisson)
    "events_prob_above_control": [
        float(special.betainc(1 + events[0], 1 + events[i], exposure[0] / (exposure[0] + exposure[i]))) for i in (1, 2)
    ],
}
print(json.dumps(out, indent=2))
