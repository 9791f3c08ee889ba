"""Reference values for the guardrails in the summary for decision-makers (test/taskpane/summary.test.ts,
test/taskpane/shareSection.test.ts, test/browser/panelShare.test.ts), from scipy.

Run:  python3 test/reference/addin/summary_guardrails.py > test/reference/addin/summary_guardrails.json
The tests read the JSON and never run python. The data are invented: the preview's demo shop
(preview/src/demoWorkbook.ts) and a sign-up test made up for these tests; not real results.

A guardrail's probability is P(lift > limit) of the guardrail metric, lift = challenger / control - 1:
- averages (count n, mean m, sd s; reference prior p(mu, sigma^2) ~ 1/sigma^2): each mean's posterior is
  Student t with n - 1 degrees of freedom, centre m, scale s / sqrt(n) (BDA3 section 3.2). With r = 1 + limit,
  P(Y / X > r) = integral f_X(x) [x > 0: P(Y > r x); x < 0: P(Y < r x)] dx, by scipy.integrate.quad split
  at the control's quantiles;
- counts per exposure (events e, exposure t; Gamma(1, 0) prior): each rate's posterior is
  Gamma(1 + e, rate t), and lambda_B / lambda_A = (a_B t_A / (a_A t_B)) F(2 a_B, 2 a_A), so
  P(lift > limit) = F.sf(r a_A t_B / (a_B t_A), 2 a_B, 2 a_A) (Johnson, Kotz & Balakrishnan, vol. 2, ch. 27).
"""
import json
import numpy as np
from scipy import stats, integrate

CASES = {
    # The preview's invented demo table (Checkout test!A3:I6): revenue count/mean/sd and basket adds per session.
    "checkout_demo": {
        "names": ["Green button (control)", "Orange button", "Big basket icon"],
        "averages": {"count": [10412, 10388, 10451], "mean": [2.41, 2.63, 2.5], "sd": [11.8, 12.3, 12.0]},
        "counts": {"events": [1820, 1968, 1902], "exposure": [15230, 15190, 15310]},
        "limits": [-0.02, 0.0, 0.05],
    },
    # The invented sign-up test of summary_values.json ("signup") with two invented guardrail metrics:
    # order value per visitor (averages) and support contacts per user-day (counts).
    "signup": {
        "names": ["Short form", "Form with photo", "Two-step form"],
        "averages": {"count": [9840, 9910, 9875], "mean": [1.92, 2.05, 1.80], "sd": [9.6, 9.9, 9.4]},
        "counts": {"events": [118, 171, 126], "exposure": [68880, 69370, 69125]},
        "limits": [-0.02, 0.0, 0.05],
    },
}


def mean_prob_lift_above(count, mean, sd, limit):
    r = 1.0 + limit
    post = [stats.t(df=n - 1, loc=m, scale=s / np.sqrt(n)) for n, m, s in zip(count, mean, sd)]
    x = post[0]
    qs = [x.ppf(p) for p in (1e-12, 1e-6, 0.001, 0.1, 0.5, 0.9, 0.999, 1 - 1e-6, 1 - 1e-12)]
    out = []
    for y in post[1:]:
        def f(v):
            return x.pdf(v) * (y.sf(r * v) if v > 0 else y.cdf(r * v))
        total = 0.0
        for a, b in zip(qs[:-1], qs[1:]):
            total += integrate.quad(f, a, b, epsabs=1e-15, epsrel=1e-13, limit=200)[0]
        out.append(total)
    return out


def events_prob_lift_above(events, exposure, limit):
    r = 1.0 + limit
    a = [1.0 + e for e in events]
    t = exposure
    return [
        float(stats.f.sf(r * a[0] * t[i] / (a[i] * t[0]), 2 * a[i], 2 * a[0])) for i in range(1, len(events))
    ]


out = {"_source": "test/reference/addin/summary_guardrails.py (scipy " + __import__("scipy").__version__ + ")"}
for name, case in CASES.items():
    av, ct = case["averages"], case["counts"]
    out[name] = {
        "names": case["names"],
        "averages": av,
        "counts": ct,
        "averages_prob_lift_above": {
            str(l): mean_prob_lift_above(av["count"], av["mean"], av["sd"], l) for l in case["limits"]
        },
        "counts_prob_lift_above": {
            str(l): events_prob_lift_above(ct["events"], ct["exposure"], l) for l in case["limits"]
        },
    }
print(json.dumps(out, indent=1))
