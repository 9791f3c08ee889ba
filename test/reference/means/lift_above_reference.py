#!/usr/bin/env python3
"""Reference values for MEAN_PROB_LIFT_ABOVE and EVENTS_PROB_LIFT_ABOVE: P(mean_i/mean_0 - 1 > m) under the
Student t posteriors (both signs of the control, as means_reference.ratio_sf: scipy quad, epsrel 1e-13), and
P(rate_i/rate_0 - 1 > m) under the Gamma posteriors by quadrature (events_reference.ratio_sf) and by the
closed form 1 - I_x(a_i, a_0), x = k b_i/(b_0 + k b_i), k = 1 + m (scipy.special.betaincc, Boost).
Run: python3 test/reference/means/lift_above_reference.py > test/reference/means/lift_above_values.json
"""
import json
import sys

from scipy import special

import os
# reference scripts of other groups (test/reference/README.md)
sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), '..', 'events'))
import events_reference as ev
import means_reference as mr

MEAN_CASES = [
    # invented summaries (count, mean, sd); the first is the control
    ("means_typical", [(100, 48.0, 20.0), (100, 52.0, 22.0)], [-0.05, 0.0, 0.05, 0.3]),
    ("means_large", [(20000, 3.1, 9.5), (20500, 3.2, 9.9), (19800, 3.05, 9.0)], [-0.02, 0.0, 0.02]),
    ("means_control_barely_positive", [(100, 10.0, 19.0), (100, 11.0, 20.0), (100, -0.5, 20.0)], [-0.5, 0.0, 0.5]),
    ("means_heavy_tails", [(3, 10.0, 1.0), (4, 12.0, 3.0)], [0.0, 0.5]),
]

EVENT_CASES = [
    # invented counts (events, exposure); prior (shape, rate)
    ("events_typical", [(120, 1000.0), (145, 1010.0)], (1.0, 0.0), [-0.05, 0.0, 0.1, 0.6]),
    ("events_large", [(10**7, 5e7), (10**7 + 30000, 5e7)], (1.0, 0.0), [-0.01, 0.0, 0.003, 0.01]),
    ("events_prior", [(3, 40.0), (9, 45.0), (0, 38.0)], (2.0, 10.0), [-0.5, 0.0, 1.0]),
]


def main():
    out = {"source": "test/reference/means/lift_above_reference.py (scipy quad epsrel 1e-13; scipy.special.betaincc)",
           "means": [], "events": []}
    for name, variants, lifts in MEAN_CASES:
        ps = [mr.posterior(v) for v in variants]
        rows = []
        for m in lifts:
            rows.append([mr.ratio_sf(ps[0], p, m) for p in ps[1:]])
        out["means"].append({"name": name, "variants": [{"count": n, "mean": mu, "sd": s} for n, mu, s in variants],
                             "minLifts": lifts, "above": rows, "controlBelowZero": mr.control_below_zero(ps[0])})
    for name, variants, prior, lifts in EVENT_CASES:
        ps = [ev.posterior(v, prior) for v in variants]
        quad, closed = [], []
        for m in lifts:
            k = 1 + m
            quad.append([ev.ratio_sf(ps[0], p, k) for p in ps[1:]])
            row = []
            for p in ps[1:]:
                total = ps[0][1] + k * p[1]
                row.append(float(special.betaincc(p[0], ps[0][0], k * p[1] / total)))
            closed.append(row)
        out["events"].append({"name": name, "variants": [{"events": e, "exposure": x} for e, x in variants],
                              "prior": {"shape": prior[0], "rate": prior[1]}, "minLifts": lifts,
                              "aboveQuadrature": quad, "aboveClosedForm": closed})
    # sd = 0 (a point mass): the exact forms, through scipy.special.stdtr.
    pc = mr.posterior((100, 52.0, 22.0))
    out["meansPointControl"] = {"variants": [{"count": 100, "mean": 50.0, "sd": 0.0}, {"count": 100, "mean": 52.0, "sd": 22.0}],
                                "minLift": 0.1, "above": mr.sf(pc, 1.1 * 50.0)}
    c0 = mr.posterior((100, 50.0, 19.0))
    out["meansPointChallenger"] = {"variants": [{"count": 100, "mean": 50.0, "sd": 19.0}, {"count": 10, "mean": 60.0, "sd": 0.0}],
                                   "minLift": 0.1, "above": mr.cdf(c0, 60.0 / 1.1) - mr.cdf(c0, 0.0)}
    json.dump(out, sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
