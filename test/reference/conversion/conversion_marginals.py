#!/usr/bin/env python3
"""Reference values of single Beta posteriors (cdf, survival, density, log density in logit) by mpmath.

Run with a python3 that has mpmath, from the repository root:  python3 test/reference/conversion/conversion_marginals.py
Prints JSON, committed as test/reference/conversion/conversion_marginals.json (the tests read that file).

Method: the same independent mpmath construction as conversion_reference.py (class BetaZ of mpref.py: the
density of z = logit(p) from mpmath's loggamma at 40 digits, cdf and survival accumulated by 12-point
Gauss-Legendre over anchors at most half a standard deviation apart). Points (mode ± up to 30 standard deviations, log density above -150) are given by their logit z
(exactly representable doubles), so the tests need no conversion from the rate that would lose digits
at a billion visitors. Also checked against mpmath.betainc at small shapes (printed under "checks").
"""
import json

import mpmath as mp

from mpref import BetaZ, set_precision

set_precision(40)
# Reach log density -300 (conversion_reference.py's 130 is enough for the comparisons): the exponential-tail
# value used beyond the last anchor is then far below every tabulated point (those are kept above -150).
LOG_RANGE = 300

CASES = [(8, 10), (1, 2), (0.5, 0.5), (3, 300), (51, 951), (5001, 95001), (0.3, 40), (2, 1000001),
         (50000001, 950000001), (1, 1000000001), (1000000001, 1), (1, 1), (0.1, 10)]
SDS = [-30, -12, -5, -2, -0.5, 0, 0.7, 2, 5, 12, 30]


def main():
    out = {'source': 'mpmath ' + mp.__version__ + ' at 40 digits: test/reference/conversion/conversion_marginals.py',
           'cases': [], 'checks': {}}
    worst = mp.mpf(0)
    for a, b, x in [(8, 10, 0.5), (3, 50, 0.02), (0.5, 0.5, 0.3), (1, 2, 0.1), (0.1, 10, 0.0274696222960978)]:
        d = BetaZ(a, b, LOG_RANGE)
        worst = max(worst, abs(d.cdf_value(mp.mpf(x)) / mp.betainc(a, b, 0, x, regularized=True) - 1))
    out['checks']['cdfVsBetaincWorstRelative'] = mp.nstr(worst, 5)
    for a, b in CASES:
        d = BetaZ(a, b, LOG_RANGE)
        pts = []
        for k in SDS:
            z = float(d.mode + k * d.sd)
            if not (d.anchors[0] < z < d.anchors[-1]) or d.logdens(mp.mpf(z)) - d.peak < -150:
                continue
            zz = mp.mpf(z)
            pts.append({'z': z, 'cdf': mp.nstr(d.lower(zz), 25), 'sf': mp.nstr(d.upper(zz), 25),
                        'logDensityRelative': mp.nstr(d.logdens(zz) - d.logdens(mp.mpf(float(d.mode))), 25),
                        'zDensity': mp.nstr(d.dens(zz), 25)})
        out['cases'].append({'a': a, 'b': b, 'mode': float(d.mode), 'points': pts})
    print(json.dumps(out, indent=1))


main()
