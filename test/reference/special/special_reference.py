#!/usr/bin/python3
"""Reference values for functions/stats/special/ (Lift Ledger), computed with mpmath.

Run with Debian's python3 (which has python3-mpmath):
    /usr/bin/python3 test/reference/special/special_reference.py > test/reference/special/special_values.json

Sources, per table:
  * mpmath's own functions (loggamma, psi, betainc, gammainc, ncdf via erfc, findroot) at 40 digits
    wherever they converge (small and moderate parameters);
  * for large shape parameters (1e5 ... 1e9), where mpmath's hypergeometric series do not converge,
    an independent tanh-sinh quadrature (mpmath.quad, 40 digits) of the exact log density, written in a
    variable where it is smooth (logit x for the Beta, log x for the Gamma) over the smaller tail, split
    into panels out to where the density has fallen by e^-200. For moderate parameters both routes are
    computed and must agree to 1e-25 (the script stops otherwise).
Every input is a double; mpmath receives it exactly (mpf(float)). Outputs are rounded to doubles.
"""
import json
import sys

import mpmath as mp

mp.mp.dps = 40
DPS = 40


def f(v):
    """mpf -> float (nearest double); keeps values below 1e-308 out (callers skip them)."""
    return float(v)


# ---------------------------------------------------------------- Beta by quadrature in z = logit x
def beta_log_density_z(z, a, b):
    # density of Z = logit X: exp(a z - (a+b) log(1+e^z)) / B(a,b)
    return a * z - (a + b) * mp.log1p(mp.exp(z)) if z < 0 else -b * z - (a + b) * mp.log1p(mp.exp(-z))


def beta_tail_quad(x, a, b, upper):
    """P(X <= x) (upper=False) or P(X > x) by quadrature of the logit-density over that tail."""
    a = mp.mpf(a)
    b = mp.mpf(b)
    x = mp.mpf(x)
    z0 = mp.log(x) - mp.log1p(-x)
    lb = mp.log(mp.beta(a, b)) if a + b < 1e4 else mp.loggamma(a) + mp.loggamma(b) - mp.loggamma(a + b)
    mode = mp.log(a / b)
    sigma = mp.sqrt(mp.psi(1, a) + mp.psi(1, b))
    # integrate the tail beyond z0; if z0 is on the far side of the mode, integrate the other tail and
    # take the complement (both exact at 40 digits)
    lower_side = z0 <= mode
    want_lower = not upper
    integrate_lower = lower_side  # the tail not containing the mode
    peak = beta_log_density_z(z0, a, b)
    # mp.quad's tolerance is absolute: integrate the density scaled to 1 at z0, then scale back
    g = lambda z: mp.exp(beta_log_density_z(z, a, b) - peak)
    points = [z0]
    direction = -1 if integrate_lower else 1
    z = z0
    while True:
        slope = a - (a + b) / (1 + mp.exp(-z))
        h = min(sigma, 4 / max(abs(slope), mp.mpf('1e-30')))
        z = z + direction * h
        points.append(z)
        if beta_log_density_z(z, a, b) < peak - 200:
            break
    points.sort()
    tail = mp.quad(g, points) * mp.exp(peak - lb)
    if integrate_lower == want_lower:
        return tail
    return 1 - tail


def beta_tail(x, a, b, upper, cross_check=True):
    if a + b <= 2000:
        lower = mp.betainc(a, b, 0, mp.mpf(x), regularized=True)
        # the upper tail as I_{1-x}(b, a): 1 - x is exact at 40 digits, and mpmath's betainc(a, b, x, 1)
        # forms 1 - I_x(a, b) internally, which cancels in the far upper tail
        direct_upper = mp.betainc(b, a, 0, 1 - mp.mpf(x), regularized=True)
        value = direct_upper if upper else lower
        if cross_check and a + b >= 20:
            check = beta_tail_quad(x, a, b, upper)
            if abs(check - value) > mp.mpf('1e-25') * abs(value):
                sys.exit(f'beta cross-check failed at {x}, {a}, {b}: {value} vs {check}')
        return value
    return beta_tail_quad(x, a, b, upper)


def beta_log_density(x, a, b):
    a = mp.mpf(a); b = mp.mpf(b); x = mp.mpf(x)
    return (a - 1) * mp.log(x) + (b - 1) * mp.log1p(-x) - (mp.loggamma(a) + mp.loggamma(b) - mp.loggamma(a + b))


# ---------------------------------------------------------------- Gamma by quadrature in u = log x
def gamma_tail_quad(a, x, upper):
    a = mp.mpf(a); x = mp.mpf(x)
    u0 = mp.log(x)
    lg = mp.loggamma(a)
    logd = lambda u: a * u - mp.exp(u) - lg
    mode = mp.log(a)
    sigma = mp.sqrt(mp.psi(1, a))
    integrate_lower = u0 <= mode
    peak = logd(u0)
    points = [u0]
    u = u0
    direction = -1 if integrate_lower else 1
    while True:
        slope = a - mp.exp(u)
        h = min(sigma, 4 / max(abs(slope), mp.mpf('1e-30')))
        u = u + direction * h
        points.append(u)
        if logd(u) < peak - 200:
            break
    points.sort()
    tail = mp.quad(lambda t: mp.exp(logd(t) - peak), points) * mp.exp(peak)
    if integrate_lower == (not upper):
        return tail
    return 1 - tail


def gamma_tail(a, x, upper, cross_check=True):
    if a <= 2e4:
        value = mp.gammainc(a, x, mp.inf, regularized=True) if upper else mp.gammainc(a, 0, x, regularized=True)
        if cross_check and a >= 20:
            check = gamma_tail_quad(a, x, upper)
            if abs(check - value) > mp.mpf('1e-25') * abs(value):
                sys.exit(f'gamma cross-check failed at {a}, {x}: {value} vs {check}')
        return value
    return gamma_tail_quad(a, x, upper)


def normal_cdf(x):
    return mp.ncdf(mp.mpf(x))


def t_cdf(t, df):
    """P(T <= t) for Student t with df degrees of freedom, via the incomplete beta at 40 digits."""
    t = mp.mpf(t); df = mp.mpf(df)
    x = df / (df + t * t)
    half = beta_tail(x, df / 2, mp.mpf(1) / 2, False) / 2 if t != 0 else mp.mpf(1) / 2
    return half if t < 0 else 1 - half


def t_log_density(t, df):
    t = mp.mpf(t); df = mp.mpf(df)
    return (mp.loggamma((df + 1) / 2) - mp.loggamma(df / 2) - mp.log(df * mp.pi) / 2
            - (df + 1) / 2 * mp.log1p(t * t / df))


def solve(fun, target, lo, hi):
    """Bisection+secant (mpmath.findroot 'anderson') for fun(v) = target on [lo, hi]."""
    return mp.findroot(lambda v: fun(v) - target, (mp.mpf(lo), mp.mpf(hi)), solver='anderson', tol=mp.mpf(10) ** (-34))


out = {"source": "mpmath %s, %d digits; test/reference/special/special_reference.py" % (mp.__version__, DPS)}

# ---- gamma family
xs = [1e-300, 1e-10, 0.001, 0.1, 0.5, 0.9999, 1.0, 1.0001, 1.4616321449683622, 1.5, 1.9999, 2.0, 2.5, 3.7,
      7.3, 10.5, 14.9, 15.0, 15.5, 33.3, 100.0, 1234.5, 1e5, 1e9, 1e12]
out["logGamma"] = [[x, f(mp.loggamma(mp.mpf(x)))] for x in xs]
mp.mp.dps = 80  # stirlerr at 1e12 cancels ~25 digits
out["stirlingError"] = [[x, f(mp.loggamma(mp.mpf(x) + 1) - (mp.mpf(x) + mp.mpf(1) / 2) * mp.log(mp.mpf(x)) + mp.mpf(x)
                              - mp.log(2 * mp.pi) / 2)] for x in xs]
pairs_lb = [(0.5, 0.5), (1, 1), (8, 10), (0.1, 1e9), (2.5, 1e6), (12, 13), (1e6, 1e6), (5e7 + 1, 9.5e8 + 1), (1e9, 1e9),
            (30, 1e9)]
out["logBeta"] = [[a, b, f(mp.loggamma(mp.mpf(a)) + mp.loggamma(mp.mpf(b)) - mp.loggamma(mp.mpf(a) + mp.mpf(b)))]
                  for a, b in pairs_lb]
def bd0(x, M):
    x = mp.mpf(x); M = mp.mpf(M)
    return M if x == 0 else x * mp.log(x / M) + M - x


out["binomialDeviance"] = [[x, M, f(bd0(x, M))]
                           for x, M in [(0, 3.5), (1, 1.0), (10, 11.0), (1e9 + 1e4, 1e9), (1e9, 1e9 + 0.5), (3.0, 300.0),
                                        (5e7, 4.99e7), (0.25, 1e-3)]]
mp.mp.dps = DPS
out["digamma"] = [[x, f(mp.psi(0, mp.mpf(x)))] for x in [1e-8, 0.1, 0.5, 1.0, 2.0, 3.7, 10.0, 123.4, 1e6, 1e9]]
out["trigamma"] = [[x, f(mp.psi(1, mp.mpf(x)))] for x in [1e-8, 0.1, 0.5, 1.0, 2.0, 3.7, 10.0, 123.4, 1e6, 1e9]]

# ---- Beta distribution: [x, a, b, cdf, sf, log density]
beta_cases = []
shapes = [(0.1, 0.1), (0.1, 10), (0.5, 0.5), (1, 1), (1, 30), (1, 1e6), (2, 3), (8, 10), (8, 42), (31, 971),
          (1.5, 1e6 + 0.5), (1e3, 1e6), (1e6, 1e6), (1e6 + 1, 2e7), (1e7, 1e7), (5e7 + 1, 9.5e8 + 1), (5e8, 5e8),
          (1e9, 1e9), (1, 1e9 + 1), (12345.5, 1e9)]
for a, b in shapes:
    a_ = mp.mpf(a); b_ = mp.mpf(b)
    mean = a_ / (a_ + b_)
    sd = mp.sqrt(a_ * b_ / ((a_ + b_) ** 2 * (a_ + b_ + 1)))
    points = set()
    for k in [-30, -8, -3, -1, 0, 1, 3, 8, 30]:
        v = mean + k * sd
        if 0 < v < 1:
            points.add(float(v))
    for v in [1e-200, 1e-12, 0.3, 0.5, 0.95]:
        points.add(v)
    for x in sorted(points):
        lo = beta_tail(x, a, b, False)
        up = beta_tail(x, a, b, True)
        if (lo != 0 and abs(lo) < mp.mpf('1e-300')) or (up != 0 and abs(up) < mp.mpf('1e-300')):
            continue
        if lo < mp.mpf('1e-300') or up < mp.mpf('1e-300'):
            continue
        beta_cases.append([x, a, b, f(lo), f(up), f(beta_log_density(x, a, b))])
    print('beta', a, b, file=sys.stderr)
# named checks (documented in docs/check-values.md)
named = [(0.2, 8, 42), (0.3, 0.5, 0.5), (0.5, 8, 10), (0.5, 1e6, 1e6), (0.5, 1e7, 1e7), (0.5, 5e8, 5e8),
         (0.05, 5e7 + 1, 9.5e8 + 1)]
out["betaNamed"] = [[x, a, b, f(beta_tail(x, a, b, False)), f(beta_tail(x, a, b, True))] for x, a, b in named]
out["beta"] = beta_cases

# quantiles: [p, a, b, lower quantile x (I_x = p), upper quantile x (1 - I_x = p)], by 130 bisections
# of the (monotone) tail in z = logit x on [-740, 740] (spacing 1e-36, far below double precision)
def bisect(fun, lo, hi, increasing):
    lo = mp.mpf(lo); hi = mp.mpf(hi)
    for _ in range(130):
        mid = (lo + hi) / 2
        if (fun(mid) < 0) == increasing:
            lo = mid
        else:
            hi = mid
    return (lo + hi) / 2


beta_q = []
for a, b in [(0.1, 10), (0.5, 0.5), (1, 1), (2, 3), (8, 10), (8, 42), (31, 971)]:
    for p in [1e-300, 1e-20, 1e-6, 0.025, 0.5, 0.9]:
        row = [p, a, b]
        for upper in (False, True):
            def fun(z, u=upper):
                x = 1 / (1 + mp.exp(-z))
                return mp.log(beta_tail(x, a, b, u, cross_check=False)) - mp.log(p)
            z = bisect(fun, -740, 740, not upper)
            row.append(f(1 / (1 + mp.exp(-z))))
        beta_q.append(row)
    print('beta q', a, b, file=sys.stderr)
out["betaQuantile"] = beta_q

# ---- Gamma: [a, x, P, Q]
gamma_cases = []
for a in [0.1, 0.5, 1.0, 4.5, 9.0, 30.0, 1e3, 1e5, 1e6, 1e8, 1e9]:
    a_ = mp.mpf(a)
    points = set()
    for k in [-30, -8, -3, -1, 0, 1, 3, 8, 30, 60]:
        v = a_ + k * mp.sqrt(a_)
        if v > 0:
            points.add(float(v))
    for v in [1e-100, 1e-5, 0.5, 2.0, 40.0]:
        points.add(v)
    for x in sorted(points):
        P = gamma_tail(a, x, False)
        Q = gamma_tail(a, x, True)
        if P < mp.mpf('1e-300') or Q < mp.mpf('1e-300'):
            continue
        gamma_cases.append([a, x, f(P), f(Q)])
    print('gamma', a, file=sys.stderr)
out["gamma"] = gamma_cases
gamma_q = []
for a in [0.1, 0.5, 1.0, 9.0, 1e3]:
    for p in [1e-300, 1e-20, 1e-6, 0.025, 0.5, 0.9]:
        row = [p, a]
        for upper in (False, True):
            def fun(u, up=upper):
                return mp.log(gamma_tail(a, mp.exp(u), up, cross_check=False)) - mp.log(p)
            u = bisect(fun, -740, 700, not upper)
            row.append(f(mp.exp(u)))
        gamma_q.append(row)
    print('gamma q', a, file=sys.stderr)
out["gammaQuantile"] = gamma_q

# ---- normal: [x, Phi(x)], [p, quantile]
out["normalCdf"] = [[x, f(normal_cdf(x))] for x in [-37.5, -37.0, -30.0, -20.0, -10.0, -8.0, -5.0, -3.0, -1.959963984540054,
                                                     -1.0, -0.5, -1e-10, 0.0, 0.3, 0.66, 0.7, 1.0, 2.0, 5.0, 8.0]]
# quantile: 130 bisections of log ncdf(z) - log p on [-40, 10]
out["normalQuantile"] = [[p, f(bisect(lambda z, p=p: mp.log(mp.ncdf(z)) - mp.log(p), -40, 10, True))]
                         for p in [1e-300, 1e-100, 1e-20, 1e-12, 1e-5, 0.001, 0.025, 0.075, 0.2, 0.5, 0.7, 0.925,
                                   0.975, 0.999999]]

# ---- Student t: [t, df, cdf, log density]
t_cases = []
for df in [0.5, 1.0, 2.0, 3.0, 7.5, 30.0, 1e3, 1e6]:
    for t in [-1e10, -1e3, -40.0, -6.0, -2.0, -0.5, 0.0, 0.1, 1.0, 2.5, 12.0, 1e5]:
        c = t_cdf(t, df)
        if c < mp.mpf('1e-300'):
            continue
        t_cases.append([t, df, f(c), f(t_log_density(t, df))])
    print('t', df, file=sys.stderr)
out["studentT"] = t_cases
t_q = []
for df in [0.5, 1.0, 3.0, 30.0, 1e6]:
    for p in [1e-100, 1e-8, 0.025, 0.3, 0.5, 0.975]:
        if p == 0.5:
            t_q.append([p, df, 0.0]); continue
        # solve in t with bisection on a wide bracket, then refine
        fun = lambda t: t_cdf(t, df) - p
        lo, hi = mp.mpf(-1e200), mp.mpf(1e200)
        guess_lo = mp.mpf(-1); guess_hi = mp.mpf(1)
        while fun(guess_lo) > 0: guess_lo *= 4
        while fun(guess_hi) < 0: guess_hi *= 4
        root = mp.findroot(lambda t: mp.log(t_cdf(t, df)) - mp.log(p), (guess_lo, guess_hi), solver='anderson')
        t_q.append([p, df, f(root)])
    print('t q', df, file=sys.stderr)
out["studentTQuantile"] = t_q

# ---- chi-square: [x, df, cdf, sf]
chi = []
for x, df in [(16.16958, 2), (6.7232, 1), (12.0, 2), (3.84, 1), (0.001, 1), (55.0, 2), (100.0, 10), (79.0, 30),
              (1000.0, 900), (1e6 + 5e3, 1e6), (200.0, 3)]:
    chi.append([x, df, f(gamma_tail(mp.mpf(df) / 2, mp.mpf(x) / 2, False)), f(gamma_tail(mp.mpf(df) / 2, mp.mpf(x) / 2, True))])
out["chiSquare"] = chi

json.dump(out, sys.stdout, indent=None, separators=(',', ':'), allow_nan=False)
print()
