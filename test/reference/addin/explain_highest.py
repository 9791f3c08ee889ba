"""
Reference values for the Explain section's cross-check of P(highest) with three variants
(taskpane/logic/explain.ts, highestCheck), on the invented sheet of test/taskpane/explain.test.ts:
Green 412 of 10000, Orange 455 of 10050, Blue 430 of 9980 (uniform prior).

P(i highest) = integral of f_i(t) * prod_{j != i} F_j(t) dt over the Beta posteriors, and the pairwise
P(Orange > Green) = integral of f_Orange(t) F_Green(t) dt, by scipy.integrate.quad over the union of
the posteriors' central 1 - 1e-12 ranges.

Run: python3 test/reference/addin/explain_highest.py > test/reference/addin/explain_highest.json
"""
import json

from scipy.integrate import quad
from scipy.stats import beta

COUNTS = [("Green", 412, 10000), ("Orange", 455, 10050), ("Blue", 430, 9980)]
post = [beta(1 + x, 1 + n - x) for _, x, n in COUNTS]
lo = min(d.ppf(1e-13) for d in post)
hi = max(d.isf(1e-13) for d in post)


def integral(f):
    value, _ = quad(f, lo, hi, epsabs=1e-15, epsrel=1e-12, limit=500, points=[d.mean() for d in post])
    return value


highest = []
for i, d in enumerate(post):
    others = [e for j, e in enumerate(post) if j != i]
    highest.append(integral(lambda t, d=d, others=others: d.pdf(t) * others[0].cdf(t) * others[1].cdf(t)))
orange_beats_green = integral(lambda t: post[1].pdf(t) * post[0].cdf(t))

print(json.dumps({
    "source": "scipy.stats.beta with scipy.integrate.quad",
    "variants": [{"name": name, "conversions": x, "visitors": n} for name, x, n in COUNTS],
    "prob_highest": highest,
    "orange_beats_green": orange_beats_green,
}, indent=2))
