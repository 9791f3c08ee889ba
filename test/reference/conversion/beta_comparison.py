#!/usr/bin/env python3
"""Reference values of P(Y > X) for independent Y ~ Beta(aY, bY), X ~ Beta(aX, bX), by mpmath at 40 digits.

Run with a python3 that has mpmath (1.3.0 here):  python3 test/reference/conversion/beta_comparison.py
Prints JSON, committed as test/reference/conversion/beta_comparison.json (test/stats/betaComparison.test.ts reads it).

Methods (neither is Evan Miller's sum, which the TypeScript code uses):
 - 'binomial' (aY and bY whole): with N = aY + bY - 1, P(Y > x) = P(Bin(N, x) <= aY - 1) (the binomial
   form of the regularized incomplete beta, Abramowitz & Stegun 26.5.24), so
   P(Y > X) = sum_{k < aY} C(N, k) B(aX + k, bX + N - k) / B(aX, bX), every term from mpmath.loggamma
   at 40 digits directly (no recurrence); all terms are positive, so tiny tails keep their digits.
 - 'quad' (any shapes, small ones only): mpmath.quad of f_X(x) (1 - betainc(aY, bY, 0, x)) over [0, 1],
   split at X's mean and a few standard deviations around it.
Self-check printed under "checks": the two methods on small whole-number shapes, and P(Y>X) + P(X>Y) = 1.
"""
import json

import mpmath as mp

mp.mp.dps = 40


def log_beta(a, b):
    return mp.loggamma(a) + mp.loggamma(b) - mp.loggamma(a + b)


def binomial(aY, bY, aX, bX):
    N = aY + bY - 1
    lbx = log_beta(mp.mpf(aX), mp.mpf(bX))
    lgN = mp.loggamma(N + 1)
    terms = [mp.exp(lgN - mp.loggamma(k + 1) - mp.loggamma(N - k + 1) + log_beta(aX + k, bX + N - k) - lbx)
             for k in range(aY)]
    return mp.fsum(terms)


def quad(aY, bY, aX, bX):
    aY, bY, aX, bX = (mp.mpf(v) for v in (aY, bY, aX, bX))
    lbx = log_beta(aX, bX)
    f = lambda x: mp.exp((aX - 1) * mp.log(x) + (bX - 1) * mp.log1p(-x) - lbx) * (1 - mp.betainc(aY, bY, 0, x, regularized=True))
    m = aX / (aX + bX)
    sd = mp.sqrt(m * (1 - m) / (aX + bX + 1))
    pts = sorted(set([mp.mpf(0), mp.mpf(1)] + [m + k * sd for k in (-6, -3, -1, 0, 1, 3, 6) if 0 < m + k * sd < 1]))
    return mp.quad(f, pts)


# (aY, bY, aX, bX, why). Whole-number shapes are posteriors Beta(1 + conversions, 1 + misses).
CASES = [
    (6, 6, 4, 8, "Miller's worked example: 521/646"),
    (4, 8, 6, 6, 'the same pair reversed: 125/646'),
    (11, 91, 21, 81, 'small counts'),
    (101, 901, 121, 881, '1000 visitors, 10% rates'),
    (301, 701, 311, 691, '1000 visitors, 30% rates'),
    (1001, 9001, 1051, 8951, '10000 visitors, 10% rates'),
    (101, 9901, 121, 9881, '10000 visitors, 1% rates'),
    (301, 29701, 331, 29671, '30000 visitors, 1% rates'),
    (1001, 99001, 1051, 98951, '1e5 visitors, 1% rates'),
    (501, 99501, 531, 99471, '1e5 visitors, 0.5% rates'),
    (3001, 297001, 3061, 296941, '3e5 visitors, 1% rates'),
    (10001, 990001, 10101, 989901, '1e6 visitors, 1% rates'),
    (2001, 8001, 2101, 7901, '10000 visitors, 20% rates'),
    (6001, 24001, 6101, 23901, '30000 visitors, 20% rates'),
    (401, 39601, 421, 39581, '40000 visitors, 1% rates: |log B| about 2600'),
    (451, 44551, 471, 44531, '45000 visitors, 1% rates: |log B| about 2900, near the bound'),
    (901, 3601, 931, 3571, '4500 visitors, 20% rates: |log B| about 2900, near the bound'),
    (1201, 1201, 1181, 1221, '2400 visitors, 50% rates: |log B| about 2300'),
    (1001, 4001, 1031, 3971, '5000 visitors, 20% rates: |log B| about 3200, past the bound'),
    (11, 99991, 15, 99987, '1e5 visitors, 0.01% rates: few terms, small log-betas'),
    (11, 191, 101, 101, 'tiny tail'),
    (41, 961, 201, 801, 'tail near 1e-30'),
    (16, 1186, 601, 601, 'tail near 1e-200'),
    (101, 101, 11, 191, 'near 1 (the tiny tail reversed)'),
    (3, 4.5, 2.5, 6.25, 'aY whole, the others not: the direct sum'),
    (2.5, 7.5, 3.25, 4, 'bX whole, the others not: the mirrored sum'),
    (40.5, 60.5, 30, 70.5, 'only aX whole: the complement sum'),
    (5.5, 95.5, 40, 60.5, 'only aX whole, P(Y > X) below 1e-3: no closed form'),
    (6.5, 5.5, 4.5, 8.5, 'no whole-number shape'),
]


def main():
    out = {'source': 'mpmath ' + mp.__version__ + ' at 40 digits: test/reference/conversion/beta_comparison.py', 'cases': [], 'checks': {}}
    worst = mp.mpf(0)
    for aY, bY, aX, bX in [(6, 6, 4, 8), (11, 91, 21, 81), (3, 17, 5, 9)]:
        worst = max(worst, abs(binomial(aY, bY, aX, bX) / quad(aY, bY, aX, bX) - 1))
        worst = max(worst, abs(binomial(aY, bY, aX, bX) + binomial(aX, bX, aY, bY) - 1))
    out['checks']['binomialVsQuadWorst'] = mp.nstr(worst, 5)
    for aY, bY, aX, bX, why in CASES:
        whole = all(float(v).is_integer() for v in (aY, bY))
        p = binomial(int(aY), int(bY), aX, bX) if whole else quad(aY, bY, aX, bX)
        out['cases'].append({'aY': aY, 'bY': bY, 'aX': aX, 'bX': bX, 'why': why,
                             'method': 'binomial' if whole else 'quad',
                             'p': mp.nstr(p, 20), 'logP': mp.nstr(mp.log(p), 20)})
    print(json.dumps(out, indent=1))


main()
