"""Reference values for the side panel's tests (test/taskpane/*.test.ts), from scipy.

Run:  python3 test/reference/addin/taskpane_crosscheck.py > test/reference/addin/taskpane_crosscheck.json
The tests read the JSON and never run python. Data: the invented garden-supply checkout test used
throughout the side-panel tests (three button colours), not real results.
"""
import json
import numpy as np
import scipy
from scipy import stats, integrate, optimize

out = {"_source": f"scipy {scipy.__version__}, numpy {np.__version__}; script test/reference/addin/taskpane_crosscheck.py"}

visitors = [10000, 10050, 9980]
conversions = [412, 455, 430]

# Beta posteriors with the uniform prior Beta(1, 1)
def post(i, a=1.0, b=1.0):
    return a + conversions[i], b + visitors[i] - conversions[i]

a0, b0 = post(0)
out["posterior_mean_0"] = stats.beta(a0, b0).mean()
out["rate_interval_90_0"] = [stats.beta.ppf(0.05, a0, b0), stats.beta.ppf(0.95, a0, b0)]
pa, pb = post(0, 2.0, 50.0)
out["rate_interval_95_prior_2_50_0"] = [stats.beta.ppf(0.025, pa, pb), stats.beta.ppf(0.975, pa, pb)]
out["posterior_density_0_at_0.04"] = stats.beta.pdf(0.04, a0, b0)

# 90% highest-density interval of variant 0 (shortest interval with 90%): minimise width over the lower tail mass
def width(t):
    return stats.beta.ppf(t + 0.9, a0, b0) - stats.beta.ppf(t, a0, b0)
res = optimize.minimize_scalar(width, bounds=(1e-9, 0.1 - 1e-9), method="bounded", options={"xatol": 1e-12})
out["rate_hdi_90_0"] = [stats.beta.ppf(res.x, a0, b0), stats.beta.ppf(res.x + 0.9, a0, b0)]

# P(rate_1 > rate_0), exact by quadrature: integral of f_1(t) F_0(t) dt
a1, b1 = post(1)
f = lambda t: stats.beta.pdf(t, a1, b1) * stats.beta.cdf(t, a0, b0)
lo, hi = stats.beta.ppf(1e-12, a1, b1), stats.beta.ppf(1 - 1e-12, a1, b1)
out["prob_above_control_1"] = integrate.quad(f, lo, hi, epsabs=1e-14, epsrel=1e-12, limit=200)[0]

# SRM: chi-square goodness of fit, equal shares
out["srm_equal_pvalue"] = stats.chisquare(visitors).pvalue

# Normal model (Student t posteriors): count, mean, sd of revenue per visitor (invented)
count = [10000, 10050]
mean = [2.31, 2.45]
sd = [9.8, 10.4]
t0 = stats.t(df=count[0] - 1, loc=mean[0], scale=sd[0] / np.sqrt(count[0]))
t1 = stats.t(df=count[1] - 1, loc=mean[1], scale=sd[1] / np.sqrt(count[1]))
out["mean_interval_95_0"] = [t0.ppf(0.025), t0.ppf(0.975)]
g = lambda x: t1.pdf(x) * t0.cdf(x)
out["mean_prob_above_control_1"] = integrate.quad(g, t1.ppf(1e-12), t1.ppf(1 - 1e-12), epsabs=1e-14, epsrel=1e-12, limit=200)[0]
# difference t1 - t0: CDF by quadrature, quantiles by root finding
def diff_cdf(d):
    h = lambda x: t0.pdf(x) * t1.cdf(x + d)
    return integrate.quad(h, t0.ppf(1e-12), t0.ppf(1 - 1e-12), epsabs=1e-14, epsrel=1e-12, limit=200)[0]
out["mean_diff_interval_95_1"] = [
    optimize.brentq(lambda d: diff_cdf(d) - 0.025, -2, 2, xtol=1e-12),
    optimize.brentq(lambda d: diff_cdf(d) - 0.975, -2, 2, xtol=1e-12),
]

# Gamma-Poisson: events over exposure (user-days), flat prior Gamma(1, 0) -> Gamma(1 + events, exposure)
events = [380, 431]
exposure = [5200.0, 5150.0]
s0, r0 = 1 + events[0], exposure[0]
s1, r1 = 1 + events[1], exposure[1]
out["events_rate_interval_95_0"] = [stats.gamma.ppf(0.025, s0, scale=1 / r0), stats.gamma.ppf(0.975, s0, scale=1 / r0)]
gam0 = stats.gamma(s0, scale=1 / r0)
gam1 = stats.gamma(s1, scale=1 / r1)
k = lambda x: gam1.pdf(x) * gam0.cdf(x)
out["events_prob_above_control_1"] = integrate.quad(k, gam1.ppf(1e-12), gam1.ppf(1 - 1e-12), epsabs=1e-14, epsrel=1e-12, limit=200)[0]
# ratio lambda1 / lambda0: CDF P(l1 <= r l0) by quadrature, quantiles by root finding (independent of the beta-prime form)
def ratio_cdf(r):
    h = lambda x: gam0.pdf(x) * gam1.cdf(r * x)
    return integrate.quad(h, gam0.ppf(1e-12), gam0.ppf(1 - 1e-12), epsabs=1e-14, epsrel=1e-12, limit=200)[0]
out["events_lift_interval_95_1"] = [
    optimize.brentq(lambda r: ratio_cdf(r) - p, 0.5, 2, xtol=1e-13) - 1 for p in (0.025, 0.5, 0.975)
]

# A prior whose central 90% interval is [0.03, 0.06], fitted here with scipy (for the BETA.DIST check)
def eqs(v):
    a, b = np.exp(v)
    return [stats.beta.cdf(0.03, a, b) - 0.05, stats.beta.sf(0.06, a, b) - 0.05]
sol = optimize.fsolve(eqs, [np.log(20), np.log(400)], xtol=1e-14)
out["prior_interval_0.03_0.06_90"] = [float(np.exp(sol[0])), float(np.exp(sol[1]))]

# Prior summaries: Beta(20, 480) (mean 4%, worth 500) and Beta(0.5, 12)
for a, b in [(20, 480), (0.5, 12)]:
    out[f"prior_summary_{a}_{b}"] = {
        "low90": stats.beta.ppf(0.05, a, b),
        "high90": stats.beta.ppf(0.95, a, b),
        "q0005": stats.beta.ppf(0.0005, a, b),
        "q9995": stats.beta.ppf(0.9995, a, b),
        "pdf_at_0.04": stats.beta.pdf(0.04, a, b),
    }

print(json.dumps(out, indent=2))
