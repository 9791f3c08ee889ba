"""Reference values for functions/stats/prior.ts, computed with scipy (a general-purpose library).

- priorFromInterval: scipy.optimize.fsolve on (beta.cdf(low) - t, beta.sf(high) - t) in
  (log alpha, log beta), polished with scipy.optimize.brentq along the way; t = (1 - level)/2.
- priorFromHistory 'likelihood': maximise sum(scipy.stats.betabinom.logpmf(x, n, a, b)) with
  scipy.optimize.minimize (Nelder-Mead, then BFGS) in (log a, log b); several starts, best kept; then
  the score equations (scipy.special.digamma) solved with scipy.optimize.root from that optimum.
- priorFromHistory 'moments': D. G. Kleinman, JASA 68 (1973), weights w_i = n_i, written out in numpy.
Run: python3 test/reference/priors/prior_fits.py > test/reference/priors/prior_fits.json
"""
import json
import mpmath as mp
import numpy as np
import scipy
from scipy import optimize, special, stats


def interval_fit(low, high, level):
    t = (1 - level) / 2

    def eqs(v):
        a, b = np.exp(v)
        return [stats.beta.cdf(low, a, b) / t - 1, stats.beta.sf(high, a, b) / t - 1]

    mid = (low + high) / 2
    sd = (high - low) / (2 * stats.norm.isf(t))
    s = max(mid * (1 - mid) / sd**2 - 1, 0.5)
    best = None
    for start in ([np.log(mid * s), np.log((1 - mid) * s)], [0.0, 0.0], [np.log(mid * 10), np.log((1 - mid) * 10)]):
        sol, info, ok, msg = optimize.fsolve(eqs, start, full_output=True, xtol=1e-14)
        res = max(abs(r) for r in eqs(sol))
        if best is None or res < best[1]:
            best = (sol, res)
    a, b = np.exp(best[0])
    return float(a), float(b), float(best[1])


def likelihood_fit(x, n):
    x = np.asarray(x, float)
    n = np.asarray(n, float)

    def nll(v):
        a, b = np.exp(v)
        return -np.sum(stats.betabinom.logpmf(x, n, a, b))

    p = x.sum() / n.sum()
    best = None
    for s in (1.0, 10.0, 100.0, 1e3, 1e4, 1e5):
        v0 = [np.log(p * s), np.log((1 - p) * s)]
        r = optimize.minimize(nll, v0, method="Nelder-Mead", options={"xatol": 1e-12, "fatol": 1e-14, "maxiter": 20000, "maxfev": 40000})
        r = optimize.minimize(nll, r.x, method="BFGS", options={"gtol": 1e-10})
        if best is None or r.fun < best.fun:
            best = r
    # Polish: solve the score equations (digamma form of the gradient) with scipy.optimize.root.
    # Then Newton's method on the score with the analytic Hessian (trigamma), from the optimiser's point:
    # the likelihood is flat to ~1e-11 near its peak, so the optimiser alone stops short.
    a, b = np.exp(best.x)
    for _ in range(50):
        s_ab = special.polygamma(1, n + a + b)
        g = np.array([np.sum(special.digamma(x + a) - special.digamma(n + a + b) - special.digamma(a) + special.digamma(a + b)),
                      np.sum(special.digamma(n - x + b) - special.digamma(n + a + b) - special.digamma(b) + special.digamma(a + b))])
        h_aa = np.sum(special.polygamma(1, x + a) - s_ab - special.polygamma(1, a) + special.polygamma(1, a + b))
        h_bb = np.sum(special.polygamma(1, n - x + b) - s_ab - special.polygamma(1, b) + special.polygamma(1, a + b))
        h_ab = np.sum(-s_ab + special.polygamma(1, a + b))
        step = np.linalg.solve(np.array([[h_aa, h_ab], [h_ab, h_bb]]), g)
        a, b = a - step[0], b - step[1]
        if abs(step[0]) < 1e-14 * a and abs(step[1]) < 1e-14 * b:
            break
    # Last, the same score equations in 40-digit arithmetic (mpmath.findroot), which removes the
    # rounding of float64 digamma differences at large counts.
    mp.mp.dps = 40
    xs = [mp.mpf(int(v)) for v in x]
    ns = [mp.mpf(int(v)) for v in n]

    def mp_score(a_, b_):
        return (sum(mp.digamma(xi + a_) - mp.digamma(ni + a_ + b_) - mp.digamma(a_) + mp.digamma(a_ + b_) for xi, ni in zip(xs, ns)),
                sum(mp.digamma(ni - xi + b_) - mp.digamma(ni + a_ + b_) - mp.digamma(b_) + mp.digamma(a_ + b_) for xi, ni in zip(xs, ns)))

    root = mp.findroot(mp_score, (mp.mpf(a), mp.mpf(b)))
    a, b = float(root[0]), float(root[1])
    v = np.log([a, b])
    a, b = np.exp(v)
    return float(a), float(b), float(-nll(v))


def moments_fit(x, n):
    x = np.asarray(x, float)
    n = np.asarray(n, float)
    w = n
    W = w.sum()
    r = x / n
    p = (w * r).sum() / W
    S = (w * (r - p) ** 2).sum()
    c = w * (1 - w / W)
    rho = (S / (p * (1 - p)) - (c / n).sum()) / (c * (1 - 1 / n)).sum()
    s = 1 / rho - 1
    return float(p * s), float((1 - p) * s), float(rho)


interval_cases = [
    (0.02, 0.06, 0.9), (0.1, 0.2, 0.95), (0.01, 0.99, 0.9), (0.3, 0.5, 0.5), (1e-4, 5e-3, 0.9),
    (0.2, 0.9, 0.99), (0.045, 0.055, 0.9), (0.1, 0.1001, 0.9), (0.6, 0.95, 0.8), (0.001, 0.999, 0.95),
]

# Past results: invented numbers for the tests only (not real data).
history_cases = [
    ([52, 61, 47, 70], [1000, 1000, 1000, 1000]),
    ([12, 30, 18, 25, 9, 40, 22], [400, 650, 500, 520, 380, 700, 610]),
    ([3, 0, 7, 2, 11, 5], [120, 80, 150, 90, 200, 140]),
    ([510, 430, 600, 480, 555, 390, 620, 505], [10000, 9500, 10400, 9800, 10100, 9000, 11000, 9900]),
    ([1, 4, 0, 9, 2], [20, 25, 18, 30, 22]),
    ([45, 80, 20], [300, 310, 290]),
    ([3120, 2980, 3400, 2800, 3275, 3050], [100000, 98000, 102000, 97000, 101000, 99500]),
    ([512000, 498500, 530200, 505100, 521700], [10000000, 9900000, 10200000, 10050000, 10100000]),
]

out = {
    "source": f"scipy {scipy.__version__} (stats.beta, stats.betabinom, optimize.fsolve/minimize), mpmath {mp.__version__} (findroot); generated by prior_fits.py",
    "interval": [],
    "likelihood": [],
    "moments": [],
}
for low, high, level in interval_cases:
    a, b, res = interval_fit(low, high, level)
    out["interval"].append({"low": low, "high": high, "level": level, "alpha": a, "beta": b, "residual": res})
for x, n in history_cases:
    a, b, ll = likelihood_fit(x, n)
    out["likelihood"].append({"conversions": x, "visitors": n, "alpha": a, "beta": b, "logLikelihood": ll})
    a, b, rho = moments_fit(x, n)
    out["moments"].append({"conversions": x, "visitors": n, "alpha": a, "beta": b, "rho": rho})
# Results that vary no more than chance: Tarone's statistic sum (x - n p)^2 - p q sum n <= 0.
flat = ([50, 51, 49, 50], [1000, 1000, 1000, 1000])
xf, nf = np.array(flat[0], float), np.array(flat[1], float)
pf = xf.sum() / nf.sum()
out["flat"] = {"conversions": flat[0], "visitors": flat[1],
               "taroneNumerator": float(((xf - nf * pf) ** 2).sum() - pf * (1 - pf) * nf.sum()),
               "betabinomLogLikAtStrength1e8": float(np.sum(stats.betabinom.logpmf(xf, nf, pf * 1e8, (1 - pf) * 1e8))),
               "binomLogLik": float(np.sum(stats.binom.logpmf(xf, nf, pf)))}
text = json.dumps(out, indent=1)
# one case a line
import re
text = re.sub(r"\n\s+([\]\d\-\.e\+,]|\"(alpha|beta|low|high|level|residual|visitors|conversions|logLikelihood|rho)\")", r" \1", text)
print(text)
