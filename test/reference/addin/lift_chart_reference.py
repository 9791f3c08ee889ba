"""
Reference values for the side panel's lift chart (taskpane/logic/liftCurves.ts): for the invented demo
checkout test (control 412 of 10412, challengers 463 of 10388 and 431 of 10451, uniform prior), each
challenger's 5% and 95% lift quantiles and its lift density at a few lifts, by scipy.

With X ~ Beta(1 + x_A, 1 + n_A - x_A) the control's rate and Y the challenger's, the lift L = Y/X - 1 has
  P(L <= l) = int f_X(x) F_Y((1 + l) x) dx   and   density g(l) = int x f_X(x) f_Y((1 + l) x) dx,
integrated with scipy.integrate.quad over the control's central 1 - 1e-12 range; quantiles by brentq.

Run: python3 test/reference/addin/lift_chart_reference.py > test/reference/addin/lift_chart_reference.json
"""
import json

from scipy.integrate import quad
from scipy.optimize import brentq
from scipy.stats import beta

CONTROL = (412, 10412)
CHALLENGERS = [(463, 10388), (431, 10451)]


def posterior(x, n):
    return beta(1 + x, 1 + n - x)


def lift_cdf(control, challenger, lift):
    lo, hi = control.ppf(1e-13), control.isf(1e-13)
    value, _ = quad(lambda t: control.pdf(t) * challenger.cdf((1 + lift) * t), lo, hi, epsabs=1e-14, epsrel=1e-12, limit=400)
    return value


def lift_density(control, challenger, lift):
    lo, hi = control.ppf(1e-13), control.isf(1e-13)
    value, _ = quad(lambda t: t * control.pdf(t) * challenger.pdf((1 + lift) * t), lo, hi, epsabs=1e-14, epsrel=1e-12, limit=400)
    return value


control = posterior(*CONTROL)
rows = []
for x, n in CHALLENGERS:
    challenger = posterior(x, n)
    low = brentq(lambda l: lift_cdf(control, challenger, l) - 0.05, -0.9, 5, xtol=1e-14)
    high = brentq(lambda l: lift_cdf(control, challenger, l) - 0.95, -0.9, 5, xtol=1e-14)
    rows.append({
        "conversions": x,
        "visitors": n,
        "low90": low,
        "high90": high,
        "density": [[l, lift_density(control, challenger, l)] for l in (-0.05, 0.0, 0.05, 0.1, 0.15, 0.2)],
    })

print(json.dumps({
    "source": "scipy.stats.beta with scipy.integrate.quad and scipy.optimize.brentq",
    "control": {"conversions": CONTROL[0], "visitors": CONTROL[1]},
    "challengers": rows,
}, indent=2))
