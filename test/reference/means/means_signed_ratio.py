#!/usr/bin/env python3
"""Reference lift intervals where the control's mean has a small but not negligible chance (1e-9 to 1e-6)
of being negative, and a challenger whose mean may be negative: the ratio's distribution over both signs
of the control, P(mu1/mu0 - 1 <= r) = int_{x>0} f0 F1((1+r)x) dx + int_{x<0} f0 S1((1+r)x) dx, by
scipy.integrate.quad (epsrel 1e-13) and brentq, with the same integrands as means_reference.py.
Run: python3 test/reference/means/means_signed_ratio.py > test/reference/means/means_signed_ratio.json
"""
import json
import sys

from means_reference import EPSREL, control_below_zero, posterior, quantile, ratio_cdf, ratio_sf

CASES = [
    # control 10 +- 1.9 (t, 99 df): about 4e-7 of its posterior lies below zero.
    ("control_barely_positive", [(100, 10.0, 19.0), (100, 11.0, 20.0), (100, -0.5, 20.0)], 0.95),
]


def main():
    out = []
    for name, variants, level in CASES:
        ps = [posterior(v) for v in variants]
        p0 = ps[0]
        a = (1 - level) / 2
        lifts = []
        for p1 in ps[1:]:
            centre = p1[1] / p0[1] - 1
            spread = 10 * (p1[2] / abs(p0[1]) + abs(p1[1]) * p0[2] / p0[1] ** 2)
            lifts.append([quantile(lambda r: ratio_cdf(p0, p1, r), lambda r: ratio_sf(p0, p1, r), q,
                                   centre - spread, centre + spread) for q in (a, 0.5, 1 - a)])
        out.append({
            "name": name,
            "variants": [{"count": n, "mean": m, "sd": s} for n, m, s in variants],
            "level": level,
            "controlBelowZero": control_below_zero(p0),
            "liftIntervals": lifts,
        })
    json.dump({"source": f"test/reference/means/means_signed_ratio.py (scipy quad epsrel {EPSREL}, brentq)", "cases": out},
              sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
