"""P(each is highest) and expected losses of 50 conversion variants (the worst-case bench's two 50-variant
scenarios, invented data), by scipy in double precision, independent of the add-in's quadrature.

Posteriors Beta(1 + conversions, 1 + visitors - conversions) (uniform prior), integrated in z = logit(rate):
  P_i    = ∫ f_i(z) Π_{j≠i} F_j(z) dz
  loss_i = ∫ F_i(x) (1 − Π_{j≠i} F_j(x)) dx = ∫ F_i (1 − Π_{j≠i} F_j) σ(z)σ(−z) dz
with log f from scipy.special.betaln and log_expit, F from scipy.special.betainc on whichever side is the
smaller tail (log F = log1p(−S) near 1, S = betainc(b, a, expit(−z))), 1 − Π F = −expm1(Σ log F). Composite
Gauss–Legendre on the union of every posterior's breakpoints (its quantiles at 10^-1 … 10^-300 on both
sides and 81 points ±8 sd around its mode), each interval cut to at most 1/4 of the local narrowest sd;
the integrals are summed in logs (tiny probabilities keep their digits). Self-check: 20 against 32 nodes
per interval, the larger difference printed under "checks". Running time: about 3 minutes of CPU (8 minutes
on a busy 2-core machine).

    python3 test/reference/conversion/conversion_highest_many.py > test/reference/conversion/conversion_highest_many.json
"""
import json
import sys

import numpy as np
import scipy
from scipy.special import betainc, betaincinv, betaln, log_expit, logsumexp


def js_round(x):
    # JavaScript's Math.round (halves up), as the bench's generators use.
    return int(np.floor(x + 0.5))


def uneven_js(k):
    out = []
    for i in range(k):
        n = js_round(10 ** (1 + (8 * i) / (k - 1)))
        rate = 0 if i == 1 else 1 if i == 2 else 0.01 + (0.49 * ((i * 7) % k)) / k
        out.append((js_round(n * rate), n))
    return out


def close_js(k):
    visitors = [10000 + 7 * i for i in range(k)]
    return [(js_round(n * 0.05 * (1 + 0.002 * i)), n) for i, n in enumerate(visitors)]


def logit(p):
    return np.log(p) - np.log1p(-p)


def log_cdf(a, b, z):
    lower = betainc(a, b, np.exp(log_expit(z)))
    upper = betainc(b, a, np.exp(log_expit(-z)))
    with np.errstate(divide='ignore'):
        return np.where(lower < 0.5, np.log(lower), np.log1p(-upper))


def log_density(a, b, z):
    return a * log_expit(z) + b * log_expit(-z) - betaln(a, b)


def breakpoints(a, b):
    mode = np.log(a / b)
    sd = np.sqrt((a + b) / (a * b))
    pts = list(mode + sd * np.linspace(-8, 8, 81))
    for e in np.arange(1, 301, 1.0):
        p = 10.0 ** (-e)
        lo = betaincinv(a, b, p)
        if 0 < lo < 1:
            pts.append(logit(lo))
        hi = betaincinv(b, a, p)  # 1 − x of the upper quantile
        if 0 < hi < 1:
            pts.append(-logit(hi))
    return np.array(pts), sd


def grid(shapes):
    pts = []
    sds = []
    for a, b in shapes:
        p, sd = breakpoints(a, b)
        pts.append(p)
        sds.append((p.min(), p.max(), sd))
    z = np.unique(np.concatenate(pts))
    z = z[np.isfinite(z)]
    edges = [z[0]]
    for right in z[1:]:
        left = edges[-1]
        mid = (left + right) / 2
        local = min([sd for lo, hi, sd in sds if lo <= mid <= hi] or [1.0])
        parts = max(1, int(np.ceil((right - left) / (local / 4))))
        parts = min(parts, 400)
        edges.extend(left + (right - left) * np.arange(1, parts + 1) / parts)
    return np.array(edges)


def integrals(counts, order):
    shapes = [(1.0 + c, 1.0 + n - c) for c, n in counts]
    edges = grid(shapes)
    t, w = np.polynomial.legendre.leggauss(order)
    left, right = edges[:-1], edges[1:]
    half = (right - left) / 2
    z = ((left + right) / 2)[:, None] + half[:, None] * t[None, :]
    logw = np.log(half)[:, None] + np.log(w)[None, :]
    z = z.ravel()
    logw = logw.ravel()
    logF = np.array([log_cdf(a, b, z) for a, b in shapes])
    log_jac = log_expit(z) + log_expit(-z)
    highest = []
    losses = []
    for i, (a, b) in enumerate(shapes):
        others = np.delete(logF, i, axis=0).sum(axis=0)
        highest.append(logsumexp(logw + log_density(a, b, z) + others))
        with np.errstate(divide='ignore'):
            above = np.log(-np.expm1(others))
        losses.append(logsumexp(logw + logF[i] + above + log_jac))
    return np.array(highest), np.array(losses), len(edges)


def case(name, counts):
    h20, l20, n20 = integrals(counts, 20)
    h32, l32, n32 = integrals(counts, 32)
    p = np.exp(h32)
    loss = np.exp(l32)
    return {
        'name': name,
        'conversions': [c for c, _ in counts],
        'visitors': [n for _, n in counts],
        'probHighest': [float(v) for v in p],
        'expectedLoss': [float(v) for v in loss],
        'checks': {
            'intervals': int(n32 - 1),
            'sumOfRawProbHighest': float(p.sum()),
            'maxAbsChangeProbHighest20vs32': float(np.max(np.abs(np.exp(h20) - p))),
            'maxRelChangeLoss20vs32': float(np.max(np.abs(np.exp(l20) - loss) / loss)),
        },
    }


def main():
    out = {
        'source': f'scipy {scipy.__version__}, numpy {np.__version__}: test/reference/conversion/conversion_highest_many.py',
        'cases': [case('uneven 50 (bench)', uneven_js(50)), case('close 50 (bench)', close_js(50))],
    }
    json.dump(out, sys.stdout, indent=1)
    sys.stdout.write('\n')


if __name__ == '__main__':
    main()
