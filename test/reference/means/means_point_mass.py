#!/usr/bin/env python3
"""P(highest) and expected losses when all variants but one have sd = 0 (point masses at their means) and
one has a Student t posterior (nu = n - 1, centre xbar, scale s/sqrt(n); Gelman et al., BDA 3rd ed., 3.2).

With M the largest exact mean: P(the t variant is highest) = P(X > M) = scipy.stats.t.sf; the exact
variants at M share the rest. Losses: choosing X loses E[(M - X)+] = s (t0 F(t0) + (nu + t0^2)/(nu - 1) f(t0)),
t0 = (M - c)/s (the partial expectation of the t, E[T; T < t0] = -(nu + t0^2)/(nu - 1) f(t0), a standard
identity; checked here against scipy.integrate.quad of F); choosing an exact c loses mean_X + E[(M - X)+] - c.
Run: python3 test/reference/means/means_point_mass.py > test/reference/means/means_point_mass.json
"""
import json
import math
import sys

from scipy import integrate, stats

CASES = [
    # an invented garden-supply test where the control sold nothing (mean 0, sd 0)
    ("no_sales_control", [(40, 0.0, 0.0), (40, 0.6, 2.5)]),
    ("two_exact_one_spread", [(25, 3.0, 0.0), (30, 2.5, 4.0), (20, 3.0, 0.0), (18, 1.0, 0.0)]),
]


def main():
    out = []
    for name, variants in CASES:
        spread = [(n - 1, m, s / math.sqrt(n)) for n, m, s in variants if s > 0][0]
        nu, c, sc = spread
        top = max(m for n, m, s in variants if s == 0)
        ties = sum(1 for n, m, s in variants if s == 0 and m == top)
        wins = float(stats.t.sf((top - c) / sc, nu))
        t0 = (top - c) / sc
        lower_moment = sc * (t0 * stats.t.cdf(t0, nu) + (nu + t0 * t0) / (nu - 1) * stats.t.pdf(t0, nu))
        check, _ = integrate.quad(lambda x: stats.t.cdf((x - c) / sc, nu), -math.inf, top, epsabs=0, epsrel=1e-12)
        assert abs(check - lower_moment) <= 1e-10 * max(1, lower_moment), (check, lower_moment)
        highest, losses = [], []
        for n, m, s in variants:
            if s > 0:
                highest.append(wins)
                losses.append(float(lower_moment))
            else:
                highest.append((1 - wins) / ties if m == top else 0.0)
                losses.append(float(c + lower_moment - m))
        out.append({"name": name, "variants": [{"count": n, "mean": m, "sd": s} for n, m, s in variants],
                    "probHighest": highest, "expectedLoss": losses})
    json.dump({"source": "test/reference/means/means_point_mass.py (scipy.stats.t; partial expectation checked by quad)",
               "cases": out}, sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
