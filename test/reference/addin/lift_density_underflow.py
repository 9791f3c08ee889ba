"""
Reference values for lifts far out in a lift density's tail (compare/ratioGrid.ts PairRule
densityUnderflows: a density below the smallest double is 0 in LIFT_DENSITY's table without its integral):
the natural log of the density there, by mpmath at 40 digits with the integral of lift_chart_density.py
(far below -745, so the density is 0 in double precision), and a lift nearer the middle whose density is
an ordinary number. The counts are invented.

Run (a few seconds, from test/reference/addin, as it imports lift_chart_density.py):
  python3 lift_density_underflow.py > lift_density_underflow.json
"""
import json

import mpmath as mp

from lift_chart_density import density

mp.mp.dps = 40

CASES = [
    ('a control of 100,000 and a challenger of a million visitors, lift +150%', (5000, 100000), (50000, 1000000), 1.5),
    ('a control of 100,000 and a challenger of a million visitors, lift -60%', (5000, 100000), (50000, 1000000), -0.6),
    ('a control of 100,000 and a challenger of a million visitors, lift +5%', (5000, 100000), (50000, 1000000), 0.05),
]


def main():
    out = []
    for why, control_counts, challenger_counts, lift in CASES:
        control = (1 + control_counts[0], 1 + control_counts[1] - control_counts[0])
        challenger = (1 + challenger_counts[0], 1 + challenger_counts[1] - challenger_counts[0])
        value = density(control, challenger, lift)
        out.append({'why': why, 'control': control_counts, 'challenger': challenger_counts, 'prior': [1, 1],
                    'lift': lift, 'logDensity': float(mp.log(value)) if value > 0 else float('-inf')})
    print(json.dumps({'source': 'lift_density_underflow.py, mpmath ' + mp.__version__ + ' at 40 digits',
                      'cases': out}, indent=1))


if __name__ == '__main__':
    main()
