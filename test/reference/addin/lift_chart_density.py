"""
Reference values for the densities of LIFT_DENSITY on a grid of lifts (compare/ratioGrid.ts, which
interpolates the log density of log(1 + lift) between exact values): for each case, the lift's density at
41 evenly spread lifts, by mpmath at 40 digits. The counts are invented; they cover a light-tailed lift, a
control with no conversions (a heavy right tail), small counts whose lift reaches down to -1, close
variants of 10,000 visitors, two million visitors, a weak prior, and challengers far larger than their
control (whose densities ratioGrid.ts takes from Gauss rules of the challenger's posterior).

With X ~ Beta(alpha + x_A, beta + n_A - x_A) the control's rate and Y the challenger's, the lift
L = Y/X - 1 has the density (common practice: the density of a ratio, differentiated under the integral)
  g(l) = int_0^{1/(1 + l)} x f_X(x) f_Y((1 + l) x) dx,
integrated here in t = logit(x) (dx = x (1 - x) dt) with mpmath.quad (tanh-sinh) split at the integrand's
peak +- 2j standard deviations (j = 1 ... 20, the peak and its curvature from mpmath.findroot and
mpmath.diff), out to -inf and to logit(1/(1 + l)) (or +inf when l <= 0). Log densities of the Betas from
mpmath's loggamma (log B).

Run (about a minute): python3 test/reference/addin/lift_chart_density.py > test/reference/addin/lift_chart_density.json
"""
import json

import mpmath as mp

mp.mp.dps = 40

CASES = [
    ('a light-tailed lift (the README example)', (120, 2400), (150, 2380), (1, 1), (-0.15, 0.75)),
    ('no conversions in the control (a heavy right tail)', (0, 1000), (10, 1000), (1, 1), (0.93, 127.5)),
    ('small counts: the lift reaches down to -1', (0, 10), (7, 31), (1, 1), (-0.99, 123)),
    ('close variants of 10,000 visitors', (500, 10000), (510, 10007), (1, 1), (-0.13, 0.26)),
    ('two million visitors each', (100000, 2000000), (101000, 2000000), (1, 1), (-0.004, 0.024)),
    ('a weak prior, 0.5 and 0.5', (2, 1000), (9, 1000), (0.5, 0.5), (-0.6, 20)),
    ('a challenger of 12,649 visitors against a control of 10', (0, 10), (4217, 12649), (1, 1), (0.2, 40)),
    ('a challenger of ten million visitors against a control of 2,000', (100, 2000), (500000, 10000000), (1, 1),
     (-0.3, 0.45)),
]
POINTS = 41


def log_beta_pdf(a, b):
    lb = mp.loggamma(a) + mp.loggamma(b) - mp.loggamma(a + b)
    return lambda x: (a - 1) * mp.log(x) + (b - 1) * mp.log1p(-x) - lb


def density(control, challenger, lift):
    s = 1 + mp.mpf(lift)
    lx = log_beta_pdf(*control)
    ly = log_beta_pdf(*challenger)

    def log_integrand(t):
        x = 1 / (1 + mp.exp(-t))
        y = s * x
        if y >= 1:
            return mp.ninf
        return 2 * mp.log(x) + mp.log1p(-x) + lx(x) + ly(y)

    top = mp.log(1 / s) - mp.log1p(-1 / s) if s > 1 else mp.inf
    # The peak: start from the control's mode in logit, clipped inside the domain.
    a, b = control
    start = mp.log(mp.mpf(a) / b)
    if top != mp.inf and start > top - 1:
        start = top - 1
    d1 = lambda t: mp.diff(log_integrand, t)
    try:
        peak = mp.findroot(d1, start, tol=mp.mpf(10) ** -25, maxsteps=200)
    except (ValueError, ZeroDivisionError):
        peak = mp.findroot(d1, (start - 5, min(start + 5, top - mp.mpf('1e-6'))), solver='anderson')
    curvature = -mp.diff(log_integrand, peak, 2)
    width = 1 / mp.sqrt(curvature)
    cuts = [peak + 2 * j * width for j in range(-20, 21)]
    cuts = [c for c in cuts if c < top]
    points = [mp.ninf] + cuts + [top]
    f = lambda t: mp.exp(log_integrand(t))
    return mp.quad(f, points)


def main():
    out = []
    for why, control_counts, challenger_counts, (alpha, beta), (lo, hi) in CASES:
        control = (alpha + control_counts[0], beta + control_counts[1] - control_counts[0])
        challenger = (alpha + challenger_counts[0], beta + challenger_counts[1] - challenger_counts[0])
        lifts = [lo + (hi - lo) * i / (POINTS - 1) for i in range(POINTS)]
        values = [float(density(control, challenger, l)) for l in lifts]
        out.append({'why': why, 'control': control_counts, 'challenger': challenger_counts, 'prior': [alpha, beta],
                    'lifts': lifts, 'densities': values})
    print(json.dumps({'source': 'lift_chart_density.py, mpmath ' + mp.__version__ + ' at 40 digits', 'cases': out},
                     indent=1))


if __name__ == '__main__':
    main()
