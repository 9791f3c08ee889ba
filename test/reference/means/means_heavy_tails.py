#!/usr/bin/env python3
"""Expected losses for the heavy-tailed tiny_3 case of means_values.json (count 3, so nu = 2), in mpmath at
30 digits, where scipy's quadrature of the slowly decaying integrand is good only to ~3e-8.

For nu = 2 the t distribution function has the closed form F(t) = 1/2 + t / (2 sqrt(2 + t^2))
(e.g. Johnson, Kotz & Balakrishnan, Continuous Univariate Distributions, vol. 2, ch. 28), so
loss_i = int F_i(x) (1 - prod_{j != i} F_j(x)) dx is one mpmath.quad over x = c + w sinh(v), splitting
the real line at many points (the tails decay like x^-2).
Run: python3 test/reference/means/means_heavy_tails.py > test/reference/means/means_heavy_tails.json
"""
import json
import sys

import mpmath as mp

mp.mp.dps = 30
VARIANTS = [(3, 30.0, 4.0), (3, 34.0, 5.0), (3, 31.0, 3.0)]


def cdf_nu2(x, centre, scale):
    t = (x - centre) / scale
    return mp.mpf(1) / 2 + t / (2 * mp.sqrt(2 + t * t))


def main():
    ps = [(mp.mpf(m), mp.mpf(s) / mp.sqrt(n)) for n, m, s in VARIANTS]
    losses = []
    for i, (ci, si) in enumerate(ps):
        others = [p for j, p in enumerate(ps) if j != i]

        def integrand(v):
            x = 31 + 3 * mp.sinh(v)
            prod = mp.mpf(1)
            for c, s in others:
                prod *= cdf_nu2(x, c, s)
            return cdf_nu2(x, ci, si) * (1 - prod) * 3 * mp.cosh(v)

        losses.append(float(mp.quad(integrand, mp.linspace(-60, 60, 241))))
    json.dump({"source": "test/reference/means/means_heavy_tails.py (mpmath 30 digits, closed-form t cdf at nu = 2)",
               "name": "tiny_3", "variants": [{"count": n, "mean": m, "sd": s} for n, m, s in VARIANTS],
               "expectedLoss": losses}, sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
