"""Reference values for the side panel's summary for decision-makers (test/taskpane/summary.test.ts), from scipy.

Run:  python3 test/reference/addin/summary_reference.py > test/reference/addin/summary_values.json
The tests read the JSON and never run python. The experiments are invented for the test (a seed shop's
sign-up form, a garden-tool shop's banner), not real results.

For each case, with Beta(alpha + conversions, beta + visitors - conversions) posteriors:
- P(variant i has the highest rate) = integral of f_i(x) * prod_{j != i} F_j(x) dx        (quadrature)
- expected loss of i = E[max_j X_j] - E[X_i], E[max] = integral over [0, 1] of 1 - prod_j F_j(x) dx
- P(challenger beats control) = integral of f_B(x) F_A(x) dx
- lift quantiles of X_B / X_A - 1: CDF(r) = P(X_B <= (1 + r) X_A) = integral of f_A(a) F_B((1 + r) a) da,
  solved for the 2.5%, 50% and 97.5% points with brentq
- the split check: scipy.stats.chisquare against the planned shares (equal when not given)
- the decision: the variant with the smallest expected loss may be chosen when that loss is at most
  max_loss = 0.01 * the control's posterior mean (the add-in's default, as DECISION)
Every integral is split at the posteriors' quantiles so the narrow peaks are not missed.
"""
import json
import numpy as np
import scipy
from scipy import stats, integrate, optimize

CASES = {
    # The preview's invented demo (preview/src/demoWorkbook.ts, a garden-supply shop's checkout buttons),
    # as the browser test of the Share section writes its summary: uniform prior, planned shares 1:1:1.
    "checkout_demo": {
        "names": ["Green button (control)", "Orange button", "Big basket icon"],
        "visitors": [10412, 10388, 10451],
        "conversions": [412, 463, 431],
        "prior": [1.0, 1.0],
        "shares": [1.0, 1.0, 1.0],
        "level": 0.95,
    },
    # Three versions of a sign-up form, uniform prior, equal split planned.
    "signup": {
        "names": ["Short form", "Form with photo", "Two-step form"],
        "visitors": [9840, 9910, 9875],
        "conversions": [402, 455, 418],
        "prior": [1.0, 1.0],
        "shares": None,
        "level": 0.95,
    },
    # Two banners with a prior worth 400 visitors centred on 3%, and a split that is broken
    # (planned 50/50, arrived 5,210 / 4,790).
    "banner": {
        "names": ["Old banner", "New banner"],
        "visitors": [5210, 4790],
        "conversions": [151, 166],
        "prior": [12.0, 388.0],
        "shares": [1.0, 1.0],
        "level": 0.9,
    },
    # Two versions where nothing is settled yet: close rates, few visitors.
    "unsettled": {
        "names": ["Plain page", "Page with video"],
        "visitors": [812, 790],
        "conversions": [33, 35],
        "prior": [1.0, 1.0],
        "shares": None,
        "level": 0.95,
    },
}

QUAD = dict(epsabs=1e-15, epsrel=1e-12, limit=400)


def posteriors(case, prior=None):
    a, b = prior if prior is not None else case["prior"]
    return [stats.beta(a + c, b + n - c) for c, n in zip(case["conversions"], case["visitors"])]


def breakpoints(dists):
    qs = [1e-13, 1e-9, 1e-6, 1e-3, 0.02, 0.1, 0.25, 0.5, 0.75, 0.9, 0.98, 1 - 1e-3, 1 - 1e-6, 1 - 1e-9, 1 - 1e-13]
    pts = sorted({float(d.ppf(q)) for d in dists for q in qs})
    return pts


def integrate_split(fn, pts):
    total = 0.0
    for lo, hi in zip(pts[:-1], pts[1:]):
        if hi > lo:
            total += integrate.quad(fn, lo, hi, **QUAD)[0]
    return total


def prob_best(dists):
    pts = breakpoints(dists)
    out = []
    for i, d in enumerate(dists):
        others = [e for j, e in enumerate(dists) if j != i]
        out.append(integrate_split(lambda x: d.pdf(x) * np.prod([e.cdf(x) for e in others]), pts))
    return out


def expected_loss(dists):
    pts = [0.0] + breakpoints(dists) + [1.0]
    # E[max] = integral of (1 - prod F_j) over [0, 1]; beyond the last breakpoint the integrand is ~0
    e_max = integrate_split(lambda x: 1.0 - np.prod([e.cdf(x) for e in dists]), pts)
    return [e_max - d.mean() for d in dists]


def prob_above(control, challenger):
    pts = breakpoints([control, challenger])
    return integrate_split(lambda x: challenger.pdf(x) * control.cdf(x), pts)


def lift_quantiles(control, challenger, level):
    pts = breakpoints([control])

    def cdf(r):
        return integrate_split(lambda a: control.pdf(a) * challenger.cdf((1.0 + r) * a), pts)

    tail = (1.0 - level) / 2.0
    return [optimize.brentq(lambda r: cdf(r) - p, -0.9, 5.0, xtol=1e-13, rtol=1e-13) for p in (tail, 0.5, 1.0 - tail)]


out = {"_source": f"scipy {scipy.__version__}, numpy {np.__version__}; script test/reference/addin/summary_reference.py"}
for name, case in CASES.items():
    dists = posteriors(case)
    losses = expected_loss(dists)
    leader = int(np.argmin(losses))
    max_loss = 0.01 * dists[0].mean()
    visitors = case["visitors"]
    shares = case["shares"] or [1.0] * len(visitors)
    expected = [sum(visitors) * s / sum(shares) for s in shares]
    entry = {
        **case,
        "posterior_mean": [d.mean() for d in dists],
        "prob_best": prob_best(dists),
        "prob_above_control": [prob_above(dists[0], d) for d in dists[1:]],
        "lift": [lift_quantiles(dists[0], d, case["level"]) for d in dists[1:]],
        "expected_loss": losses,
        "decision": {"index": leader, "loss": losses[leader], "max_loss": max_loss, "choose": bool(losses[leader] <= max_loss)},
        "srm_pvalue": float(stats.chisquare(visitors, expected).pvalue),
    }
    if case["prior"] != [1.0, 1.0]:
        flat = posteriors(case, [1.0, 1.0])
        flat_losses = expected_loss(flat)
        flat_leader = int(np.argmin(flat_losses))
        flat_max = 0.01 * flat[0].mean()
        entry["flat"] = {
            "prob_best": prob_best(flat),
            "decision": {"index": flat_leader, "choose": bool(flat_losses[flat_leader] <= flat_max)},
        }
    out[name] = entry

print(json.dumps(out, indent=1))
