#!/usr/bin/env python3
"""Reference values for the Gamma-Poisson model of event counts (functions/stats/eventRates.ts).

Model (conjugate Gamma-Poisson, common practice; e.g. Gelman et al., BDA 3rd ed., sec. 2.6): with a
Gamma(shape, rate) prior and `events` over `exposure`, the rate's posterior is
Gamma(a = shape + events, b = rate + exposure).

Sources used here, independent of the TypeScript code:
  * scipy.stats.gamma (Boost) ppf/isf for single-variant intervals;
  * the beta closed form P(lambda_i > lambda_0) = I_z(a_0, a_i), z = b_0/(b_0 + b_i), through
    scipy.special.betainc AND, independently, scipy.integrate.quad of int f_i(x) F_0(x) dx;
  * lift quantiles by quadrature of P(lambda_i/lambda_0 <= r) = int f_0(x) F_i(r x) dx with brentq
    (independent of the F-distribution closed form, which is printed beside it through
    scipy.special.betaincinv so both can be compared);
  * P(highest) and expected loss by scipy.integrate.quad (epsrel 1e-13) in z = log(rate);
  * mpmath (50 digits) for the two-variant probability and the closed-form expected loss
    E[(l_B - l_A)+] = m_B I_z(a_A, a_B + 1) - m_A I_z(a_A + 1, a_B), its incomplete betas by mpmath.quad
    of the Beta density in logit space (mpmath.betainc's series does not converge at a = 1e6).
Run: python3 test/reference/events/events_reference.py > test/reference/events/events_values.json
(the demo numbers are an invented garden-supply shop scenario: store visits per user-day).
"""
import json
import math
import sys
import time
import warnings

import mpmath as mp
from scipy import integrate, optimize, special, stats

warnings.simplefilter("ignore", integrate.IntegrationWarning)
INF = math.inf
EPSREL = 1e-13


def posterior(v, prior):
    e, x = v
    return (prior[0] + e, prior[1] + x)


def stirling_error(a):
    """log Gamma(a) - ((a - 1/2) log a - a + log(2 pi)/2): the asymptotic series for a >= 100 (Abramowitz &
    Stegun 6.1.41), else directly (no cancellation at small a)."""
    if a < 100:
        return special.gammaln(a) - ((a - 0.5) * math.log(a) - a + 0.5 * math.log(2 * math.pi))
    a2 = a * a
    return (1 / 12 - (1 / 360 - (1 / 1260 - 1 / (1680 * a2)) / a2) / a2) / a


def expm1_minus(d):
    """e^d - 1 - d without cancellation for small d."""
    if abs(d) > 1e-2:
        return math.expm1(d) - d
    term, total, k = d * d / 2, 0.0, 2
    while abs(term) > 1e-18 * abs(total) or total == 0:
        total += term
        k += 1
        term *= d / k
        if term == 0:
            break
    return total


def logpdf_z(p, z):
    """log density of z = log(lambda) for lambda ~ Gamma(a, b), written about the mode z0 = log(a/b):
    log(a^a e^-a / Gamma(a)) - a (e^d - 1 - d), d = z - z0, with the constant as
    (1/2) log(a/(2 pi)) - stirling_error(a), so nothing of size a log a is subtracted (exact at a = 1e9)."""
    a, b = p
    d = z - math.log(a / b)
    return 0.5 * math.log(a / (2 * math.pi)) - stirling_error(a) - a * expm1_minus(d)


def cdf(p, lam):
    a, b = p
    return special.gammainc(a, b * lam)


def sf(p, lam):
    a, b = p
    return special.gammaincc(a, b * lam)


def z_breakpoints(ps):
    pts = set()
    for a, b in ps:
        mode = math.log(a / b)
        sd = 1 / math.sqrt(a)
        for k in (-400, -100, -40, -20, -10, -5, -2, -1, 0, 1, 2, 5, 10, 20, 40):
            pts.add(mode + k * sd)
    return sorted(pts)


def integrate_z(f, pts):
    edges = [-INF] + pts + [INF]
    total = 0.0
    for lo, hi in zip(edges[:-1], edges[1:]):
        val, _ = integrate.quad(f, lo, hi, epsabs=0, epsrel=EPSREL, limit=2000)
        total += val
    return total


def safe_exp(x):
    return math.exp(x) if x > -745 else 0.0


def prob_highest(ps):
    out = []
    for i, pi in enumerate(ps):
        others = [p for j, p in enumerate(ps) if j != i]

        def f(z, pi=pi, others=others):
            if z > 700:
                return 0.0
            v = safe_exp(logpdf_z(pi, z))
            if v == 0:
                return 0.0
            lam = math.exp(z)
            for p in others:
                v *= cdf(p, lam)
            return v

        out.append(integrate_z(f, z_breakpoints(key_variants(ps, pi))))
    return out


def key_variants(ps, pi):
    """Breakpoints need only the integrated variant and the outermost others (the rest lie between)."""
    if len(ps) <= 3:
        return ps
    by_mode = sorted(ps, key=lambda p: math.log(p[0] / p[1]))
    return [pi, by_mode[0], by_mode[-1]]


def prob_greater_quad(pi, p0):
    def f(z):
        if z > 700:
            return 0.0
        return safe_exp(logpdf_z(pi, z)) * cdf(p0, math.exp(z))

    return integrate_z(f, z_breakpoints([pi, p0]))


def ratio_cdf(p0, p1, r):
    def f(z):
        if z > 700:
            return 0.0
        return safe_exp(logpdf_z(p0, z)) * cdf(p1, r * math.exp(z))

    return integrate_z(f, z_breakpoints([p0, (p1[0], p1[1] * r)]))


def ratio_sf(p0, p1, r):
    def f(z):
        if z > 700:
            return 0.0
        return safe_exp(logpdf_z(p0, z)) * sf(p1, r * math.exp(z))

    return integrate_z(f, z_breakpoints([p0, (p1[0], p1[1] * r)]))


def lift_quantile_quad(p0, p1, q):
    if q <= 0.5:
        g = lambda r: ratio_cdf(p0, p1, r) - q
    else:
        g = lambda r: (1 - q) - ratio_sf(p0, p1, r)
    centre = (p1[0] / p1[1]) / (p0[0] / p0[1])
    spread = 12 * centre * (1 / math.sqrt(p0[0]) + 1 / math.sqrt(p1[0]))
    lo, hi = max(centre - spread, centre * 1e-6), centre + spread
    while g(lo) > 0:
        lo /= 2
    while g(hi) < 0:
        hi *= 2
    return optimize.brentq(g, lo, hi, xtol=1e-300, rtol=1e-15, maxiter=400) - 1


def lift_quantile_closed(p0, p1, q):
    """F form: P(R <= r) = I_{k/(1+k)}(a_1, a_0), k = r b_1/b_0, so r = x/(1-x) * b_0/b_1."""
    (a0, b0), (a1, b1) = p0, p1
    x = special.betaincinv(a1, a0, q)
    one_minus_x = special.betaincinv(a0, a1, 1 - q)
    return x / one_minus_x * b0 / b1 - 1


def expected_loss(ps):
    out = []
    for i, pi in enumerate(ps):
        others = [p for j, p in enumerate(ps) if j != i]

        def f(z, pi=pi, others=others):
            if z > 700:
                return 0.0
            lam = math.exp(z)
            fi = cdf(pi, lam)
            if fi == 0:
                return 0.0
            log_prod = 0.0
            for p in others:
                c = cdf(p, lam)
                if c == 0:
                    return fi * lam
                log_prod += math.log(c)
            return fi * -math.expm1(log_prod) * lam

        out.append(integrate_z(f, z_breakpoints(key_variants(ps, pi))))
    return out


CASES = [
    # name, (events, exposure) per variant, prior (shape, rate), levels
    ("visits_1e2", [(120, 1000.0), (145, 1010.0)], (1.0, 0.0), [0.95, 0.5]),
    ("visits_1e4", [(12000, 1.0e5), (12150, 1.0e5), (11900, 0.99e5)], (1.0, 0.0), [0.95, 0.99]),
    ("visits_1e6", [(1200000, 1.0e7), (1201200, 1.0e7)], (1.0, 0.0), [0.95]),
    ("visits_1e8", [(120000000, 1.0e9), (120012000, 1.0e9)], (1.0, 0.0), [0.95]),
    ("billion_events", [(1000000000, 4.0e8), (1000050000, 4.0e8)], (1.0, 0.0), [0.95]),
    ("huge_exposure", [(5000000, 2.0e12), (5003000, 2.0e12)], (1.0, 0.0), [0.95]),
    ("zero_events", [(0, 500.0), (3, 520.0)], (1.0, 0.0), [0.95]),
    ("jeffreys_few", [(0, 10.0), (1, 10.0), (2, 12.0)], (0.5, 0.0), [0.9]),
    ("with_prior", [(3, 40.0), (7, 45.0)], (2.0, 100.0), [0.95]),
    ("far_apart", [(100, 1000.0), (400, 1000.0)], (1.0, 0.0), [0.95]),
    ("twenty", [(500 + ((11 * i) % 20) * 6, 10000.0) for i in range(20)], (1.0, 0.0), [0.95]),
]


def run_case(name, variants, prior, levels):
    ps = [posterior(v, prior) for v in variants]
    p0 = ps[0]
    res = {
        "name": name,
        "variants": [{"events": e, "exposure": x} for e, x in variants],
        "prior": {"shape": prior[0], "rate": prior[1]},
        "intervals": {},
        "liftIntervals": {},
        "liftIntervalsClosedForm": {},
    }
    for level in levels:
        a = (1 - level) / 2
        res["intervals"][str(level)] = [
            [float(stats.gamma.ppf(a, s, scale=1 / r)), float(stats.gamma.isf(a, s, scale=1 / r))] for s, r in ps
        ]
        res["liftIntervals"][str(level)] = [[lift_quantile_quad(p0, p1, q) for q in (a, 0.5, 1 - a)] for p1 in ps[1:]]
        res["liftIntervalsClosedForm"][str(level)] = [
            [float(lift_quantile_closed(p0, p1, q)) for q in (a, 0.5, 1 - a)] for p1 in ps[1:]
        ]
    (a0, b0) = p0
    res["probAboveControl"] = [float(special.betainc(a0, a1, b0 / (b0 + b1))) for a1, b1 in ps[1:]]
    res["probBelowControl"] = [float(special.betainc(a1, a0, b1 / (b0 + b1))) for a1, b1 in ps[1:]]
    res["probAboveControlQuad"] = [prob_greater_quad(p1, p0) for p1 in ps[1:]]
    res["probHighest"] = prob_highest(ps)
    res["expectedLoss"] = expected_loss(ps)
    return res


# ---- mpmath (50 digits) ---------------------------------------------------------------------------
mp.mp.dps = 50


def mp_beta_cdf(x, a, b):
    """I_x(a, b) by quad of the Beta density in w = logit(t); exact normalisation by loggamma."""
    a, b, x = mp.mpf(a), mp.mpf(b), mp.mpf(x)
    log_norm = mp.loggamma(a + b) - mp.loggamma(a) - mp.loggamma(b)
    f = lambda w: mp.exp(log_norm + a * w - (a + b) * mp.log1p(mp.exp(w)))
    mode = mp.log(a / b)
    sd = mp.sqrt(1 / a + 1 / b)
    top = mp.log(x / (1 - x))
    pts = [mode + k * sd for k in range(-60, 61, 2)]
    pts = sorted(p for p in pts if p < top)
    edges = [mp.ninf] + pts + [top]
    if top < mode:
        # the lower tail: integrate directly from -inf to top
        edges = [mp.ninf] + [top - k * sd for k in (40, 20, 10, 5, 2, 1)] + [top]
        edges = sorted(set(edges))
        edges = [mp.ninf] + [e for e in edges if e != mp.ninf]
    return mp.quad(f, edges)


def mp_checks():
    out = {}
    for name, v, prior in [
        ("visits_1e2", [(120, 1000.0), (145, 1010.0)], (1.0, 0.0)),
        ("with_prior", [(3, 40.0), (7, 45.0)], (2.0, 100.0)),
        ("zero_events", [(0, 500.0), (3, 520.0)], (1.0, 0.0)),
        ("visits_1e6", [(1200000, 1.0e7), (1201200, 1.0e7)], (1.0, 0.0)),
    ]:
        (aA, bA), (aB, bB) = [posterior(x, prior) for x in v]
        z = mp.mpf(bA) / (mp.mpf(bA) + bB)
        p_above = mp_beta_cdf(z, aA, aB)
        mA, mB = mp.mpf(aA) / bA, mp.mpf(aB) / bB
        loss_a = mB * mp_beta_cdf(z, aA, aB + 1) - mA * mp_beta_cdf(z, aA + 1, aB)
        # loss of B = E[(l_A - l_B)+] = loss_A - (m_B - m_A) (loss differences are mean differences)
        loss_b = loss_a - (mB - mA)
        out[name] = {
            "probAboveControl": float(p_above),
            "expectedLoss": [float(loss_a), float(loss_b)],
        }
    return out


def main():
    cases = []
    for c in CASES:
        started = time.time()
        cases.append(run_case(*c))
        print(c[0], f"{time.time() - started:.1f}s", file=sys.stderr, flush=True)
    # Agreement of the independent routes (printed, so a reader of the JSON can judge the references).
    worst_lift = max(abs(x - y) / max(1, abs(x)) for c in cases for lv, rows in c["liftIntervals"].items()
                     for r1, r2 in zip(rows, c["liftIntervalsClosedForm"][lv]) for x, y in zip(r1, r2))
    worst_prob = max(abs(x - y) for c in cases for x, y in zip(c["probAboveControl"], c["probAboveControlQuad"]))
    print(f"lift quadrature vs F closed form: {worst_lift:.2e}; P(above) quadrature vs betainc: {worst_prob:.2e}",
          file=sys.stderr)
    doc = {
        "source": "test/reference/events/events_reference.py: scipy " + __import__("scipy").__version__
        + " (stats.gamma, special.betainc/betaincinv, integrate.quad epsrel 1e-13, optimize.brentq); mpmath "
        + mp.__version__ + " checks",
        "agreement": {"liftQuadratureVsClosedForm": worst_lift, "probAboveQuadratureVsBetainc": worst_prob},
        "cases": cases,
        "mpmath": mp_checks(),
    }
    json.dump(doc, sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
