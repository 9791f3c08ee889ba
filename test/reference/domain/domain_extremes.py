"""Reference values at the corners of the declared domain (functions/stats/limits.ts): the weakest and the
strongest prior, the widest level, the smallest and largest exposure, means and sds at their bounds, and
the point-mass expected-loss case that once cancelled to a negative loss.

Every value is computed with mpmath at 60 significant digits from the textbook definitions (regularised
incomplete beta and gamma functions, the Student t cdf, and one-dimensional integrals by mpmath.quad),
independently of the add-in's code, except where a Beta or Gamma shape or a t's degrees of freedom are 1000 or more: there mpmath's
hypergeometric series does not converge in reasonable time, and scipy (special.betaincinv, special.gammaincinv, stats.t.ppf, stats.beta with
integrate.quad, in double precision) gives the value. Printed as JSON:
python3 domain_extremes.py > domain_extremes.json
"""
import json

import mpmath as mp
import scipy
from scipy import integrate, special, stats

mp.mp.dps = 60


def beta_cdf(x, a, b):
    return mp.betainc(a, b, 0, x, regularized=True)


def beta_ppf(p, a, b):
    """Quantile of Beta(a, b), by bisection on log x (robust for shapes of 0.001); scipy for large shapes."""
    if a >= 1000 or b >= 1000:
        return mp.mpf(special.betaincinv(float(a), float(b), float(p)))
    lo, hi = mp.mpf(-20000), mp.mpf(0)  # log x
    for _ in range(400):
        mid = (lo + hi) / 2
        if beta_cdf(mp.e ** mid, a, b) < p:
            lo = mid
        else:
            hi = mid
    if beta_cdf(mp.mpf(1) - mp.mpf(10) ** -50, a, b) < p:  # the quantile is closer to 1 than 1e-50
        return mp.mpf(1)
    return mp.e ** ((lo + hi) / 2)


def beta_ppf_upper(p, a, b):
    """Quantile p of Beta(a, b) near 1: 1 − (quantile 1 − p of Beta(b, a))."""
    if a >= 1000 or b >= 1000:
        return mp.mpf(special.betaincinv(float(a), float(b), float(p)))
    return 1 - beta_ppf(1 - p, b, a)


def gamma_ppf(p, shape, rate):
    """Quantile of Gamma(shape, rate), by bisection on log x; scipy's gammaincinv for shapes of 1000 or more."""
    if shape >= 1000:
        return mp.mpf(special.gammaincinv(float(shape), float(p))) / rate
    lo, hi = mp.mpf(-20000), mp.log(shape + 60 * mp.sqrt(shape) + 300)  # log x
    for _ in range(400):
        mid = (lo + hi) / 2
        if mp.gammainc(shape, 0, mp.e ** mid, regularized=True) < p:
            lo = mid
        else:
            hi = mid
    return mp.e ** ((lo + hi) / 2) / rate


def t_cdf(t, df):
    x = df / (df + t * t)
    half = mp.betainc(df / 2, mp.mpf(1) / 2, 0, x, regularized=True) / 2
    return half if t < 0 else 1 - half


def t_ppf(p, df):
    if df >= 1000:  # mpmath's series for the incomplete beta does not converge in time: scipy's t quantile
        return mp.mpf(stats.t.ppf(float(p), float(df)))
    lo, hi = mp.mpf(-1e6), mp.mpf(1e6)
    for _ in range(300):
        mid = (lo + hi) / 2
        if t_cdf(mid, df) < p:
            lo = mid
        else:
            hi = mid
    return (lo + hi) / 2


def t_pdf(t, df):
    log_c = mp.loggamma((df + 1) / 2) - mp.loggamma(df / 2) - mp.log(df * mp.pi) / 2
    return mp.e ** (log_c - (df + 1) / 2 * mp.log1p(t * t / df))


def t_upper_moment(m, df, centre, scale):
    """E[(X − m)^+] for X = centre + scale·T, T ~ t(df): scale·∫_z^∞ (t − z) f(t) dt, z = (m − centre)/scale."""
    z = (m - centre) / scale
    return scale * mp.quad(lambda t: (t - z) * t_pdf(t, df), [z, z + 10, z + 100, mp.inf])


def f(x):
    return float(x)


out = {"source": "mpmath %s, %d digits; scipy %s for Beta shapes of 1000 or more" % (mp.__version__, mp.mp.dps, scipy.__version__)}

# RATE_INTERVAL at the weakest prior and the widest level: Beta(0.001 + c, 0.001 + n − c) quantiles.
rate_cases = []
for conv, vis, a, b, level in [
    ([0, 3, 1], [3, 3, 3], 0.001, 0.001, 0.9999),
    ([0, 5], [1000000, 1000000], 0.001, 0.001, 0.95),
    ([5, 100], [100, 100], 1e6, 1e6, 0.9999),
    ([1, 7], [10, 10], 0.001, 1e6, 0.01),
]:
    rows = []
    for c, n in zip(conv, vis):
        pa, pb = mp.mpf(a) + c, mp.mpf(b) + n - c
        lo_p, hi_p = (1 - mp.mpf(level)) / 2, (1 + mp.mpf(level)) / 2
        rows.append([f(beta_ppf(lo_p, pa, pb)), f(beta_ppf_upper(hi_p, pa, pb))])
    rate_cases.append({"conversions": conv, "visitors": vis, "prior": [a, b], "level": level, "interval": rows})
out["rateInterval"] = rate_cases

# PROB_ABOVE_CONTROL at the weakest prior: P(p1 > p0) = ∫ f1(x) I_x(a0, b0) dx.
prob_cases = []
for conv, vis, a, b in [([0, 3], [3, 3], 0.001, 0.001), ([0, 0], [1000, 10], 0.001, 0.001), ([2, 3], [5, 5], 1e6, 1e6)]:
    a0, b0 = mp.mpf(a) + conv[0], mp.mpf(b) + vis[0] - conv[0]
    a1, b1 = mp.mpf(a) + conv[1], mp.mpf(b) + vis[1] - conv[1]
    # P(p1 > p0) = ∫ f0(x) (1 − I_x(a1, b1)) dx, integrated in u = log x for the singular Beta(0.001, ·) densities
    lbeta0 = mp.log(mp.beta(a0, b0))

    def integrand(u, a0=a0, b0=b0, a1=a1, b1=b1, lbeta0=lbeta0):
        x = mp.e ** u
        if x >= 1:
            return mp.mpf(0)
        dens = mp.e ** (a0 * u + (b0 - 1) * mp.log1p(-x) - lbeta0)
        return dens * mp.betainc(a1, b1, x, 1, regularized=True)

    if a0 >= 1000:
        d0, d1 = stats.beta(float(a0), float(b0)), stats.beta(float(a1), float(b1))
        lo, hi = d0.ppf(1e-12), d0.ppf(1 - 1e-12)
        value = integrate.quad(lambda x: d0.pdf(x) * d1.sf(x), lo, hi, epsabs=1e-14, epsrel=1e-12, limit=200)[0]
    else:
        value = mp.quad(integrand, [-mp.inf, -1e5, -1e4, -1e3, -100, -10, -1, -0.1, -0.01, -1e-3, -1e-6, 0])
    prob_cases.append({"conversions": conv, "visitors": vis, "prior": [a, b], "probAbove": f(value)})
out["probAboveControl"] = prob_cases

# EVENTS_RATE_INTERVAL at the bounds of exposure and prior: Gamma(shape + events, rate + exposure) quantiles.
events_cases = []
for ev, ex, shape, rate, level in [
    ([0, 5], [1e-6, 1e12], 0.001, 0, 0.9999),
    ([3, 0], [2.5, 1e12], 1e6, 1e12, 0.95),
    ([0, 12], [1e-6, 1e-6], 1, 0, 0.01),
]:
    rows = []
    for e, t in zip(ev, ex):
        s, r = mp.mpf(shape) + e, mp.mpf(rate) + mp.mpf(t)
        rows.append([f(gamma_ppf((1 - mp.mpf(level)) / 2, s, r)), f(gamma_ppf((1 + mp.mpf(level)) / 2, s, r))])
    events_cases.append({"events": ev, "exposure": ex, "prior": [shape, rate], "level": level, "interval": rows})
out["eventsRateInterval"] = events_cases

# EVENTS_PROB_ABOVE_CONTROL: with U = b0·λ0, V = b1·λ1, P(λ1 > λ0) = P(V/(U+V) > b1/(b0+b1)), V/(U+V) ~ Beta(a1, a0).
eprob = []
for ev, ex, shape, rate in [([0, 1], [1e-6, 1e-6], 0.001, 0), ([10, 12], [1e12, 1e12], 1e6, 1e12), ([0, 0], [1, 3], 0.001, 0)]:
    a0, b0 = mp.mpf(shape) + ev[0], mp.mpf(rate) + mp.mpf(ex[0])
    a1, b1 = mp.mpf(shape) + ev[1], mp.mpf(rate) + mp.mpf(ex[1])
    if a0 >= 1000:
        value = special.betainc(float(a0), float(a1), float(b0 / (b0 + b1)))  # = P(U/(U+V) < b0/(b0+b1))
    else:
        value = mp.betainc(a1, a0, b1 / (b0 + b1), 1, regularized=True)
    eprob.append({"events": ev, "exposure": ex, "prior": [shape, rate], "probAbove": f(value)})
out["eventsProbAboveControl"] = eprob

# MEAN_INTERVAL at the bounds of mean and sd: centre ± scale·t quantile, scale = sd/√count, df = count − 1.
mean_cases = []
for count, mean, sd, level in [
    ([3, 1000000000], [1e12, -1e12], [1e12, 1e-6], 0.9999),
    ([2, 50], [-1e12, 0], [1e-6, 1e12], 0.01),
]:
    rows = []
    for n, m, s in zip(count, mean, sd):
        q = t_ppf((1 + mp.mpf(level)) / 2, mp.mpf(n - 1))
        scale = mp.mpf(s) / mp.sqrt(n)
        rows.append([f(mp.mpf(m) - scale * q), f(mp.mpf(m) + scale * q)])
    mean_cases.append({"count": count, "mean": mean, "sd": sd, "level": level, "interval": rows})
out["meanInterval"] = mean_cases

# MEAN_EXPECTED_LOSS with the control exact (sd = 0, a point mass at M) and one uncertain challenger X:
# the challenger loses E[(M − X)^+] = (M − centre) + E[(X − M)^+], the control loses E[(X − M)^+].
loss_cases = []
for count, mean, sd in [
    ([95, 30806260], [-5.468, -1e12], [0, 0.00776]),
    ([2250, 2026], [200.4937417970264, 169.539489753604], [0, 154.19839124974018]),
    ([40, 40], [10, 10.5], [0, 3]),
]:
    m = mp.mpf(mean[0])
    df, centre, scale = mp.mpf(count[1] - 1), mp.mpf(mean[1]), mp.mpf(sd[1]) / mp.sqrt(count[1])
    upper = t_upper_moment(m, df, centre, scale)
    loss_cases.append({"count": count, "mean": mean, "sd": sd, "loss": [f(upper), f(m - centre + upper)]})
out["meanExpectedLoss"] = loss_cases

# LIFT_INTERVAL at the weakest prior with the control at 30000 of 30000 and the challenger at 0 of 30000:
# the upper end (quantile 0.975) of R = p1/p0, P(R ≤ r) = ∫ f0(x) I_{r·x}(a1, b1) dx, integrated over
# log(1 − x) (1 − p0 ~ Beta(0.001, 30000.001) is singular at 0); bisection on log r. The lower end and
# the median lie within 1e-300 of a lift of −1, so a double holds them as −1.
a0, b0 = mp.mpf(30000.001), mp.mpf(0.001)
a1, b1 = mp.mpf(0.001), mp.mpf(30000.001)
lb = mp.log(mp.beta(b0, a0))


def cdf_ratio(r):
    def g(u):
        q = mp.e ** u
        if q >= 1:
            return mp.mpf(0)
        dens = mp.e ** (b0 * u + (a0 - 1) * mp.log1p(-q) - lb)
        return dens * mp.betainc(a1, b1, 0, r * (1 - q), regularized=True)

    return mp.quad(g, [-mp.inf, -1e5, -1e4, -1e3, -100, -40, -20, -10, -3, -1, 0])


lo, hi = mp.mpf(-60), mp.mpf(-20)
for _ in range(60):
    mid = (lo + hi) / 2
    if cdf_ratio(mp.e ** mid) < mp.mpf("0.975"):
        lo = mid
    else:
        hi = mid
ratio_upper = mp.e ** ((lo + hi) / 2)
out["liftInterval"] = [
    {
        "conversions": [30000, 0],
        "visitors": [30000, 30000],
        "prior": [0.001, 0.001],
        "level": 0.95,
        "ratioUpper": f(ratio_upper),
        "upper": f(ratio_upper - 1),
    }
]

print(json.dumps(out, indent=1))
