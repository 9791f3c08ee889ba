#!/usr/bin/env python3
"""Reference values for the ten-variant order_sd case ("t_ten_variants" of revenue_reference.py), computed
in minutes instead of nested adaptive quadrature, and independent of the add-in's method.

Model (as revenue_reference.py): per variant R = p * v with p ~ Beta(1 + orders, 1 + visitors - orders) and
v ~ Student t(orders - 1), centre revenue/orders, scale order_sd/sqrt(orders), independent.

1. Each variant's density and tails of R at fixed outer nodes, each value ONE scipy.integrate.quad
   (QUADPACK qagp, epsabs 0, epsrel 1e-13) over z = logit p of the product-distribution formulas
      f_R(r) = int f_p(p) f_v(r/p) / p dp,   F_R(r) = int f_p(p) T_v(r/p) dp,   S_R(r) = int f_p(p) (1 - T_v(r/p)) dp
   (T_v from scipy.special.stdtr, f_p from gammaln; breakpoints at the rate's mode +- k sd and where the
   order value's factor turns). Each quad's own error estimate (abserr) is kept.
2. The outer integrals over w = log r (R < 0 has probability below 1e-19 here, see "negativeMass"), each a
   composite Gauss-Legendre sum over equal panels on [lo, hi] (lo, hi: 30 sd of log R beyond the extreme
   means), on the same nodes for every variant:
      P(i highest) = int f_i prod_{j != i} F_j dr,   P(R_2 > R_1) = int f_1 S_2 dr,
      loss_i = int F_i (1 - prod_{j != i} F_j) dr   (1 - prod F_j as -expm1(sum log1p(-S_j))).
3. The error bound stated in the JSON ("errorBound", per quantity), the sum of
   (a) the outer rule: |value(N panels) - value(2N panels)| (the 2N value is reported; with 20-point
       Gauss-Legendre rules the error of the finer sum is far below this difference: common practice);
   (b) the inner integrals: for a probability, sum over nodes of weight * (the inner abserr's effect on the
       integrand), taken as weight * (abserr_f * prod F + f * sum_j abserr_Fj), the same for losses;
   (c) the truncation: the mass of every variant outside [lo, hi] (F_i(lo) + S_i(hi), from the same inner
       integrals), which bounds what any probability can miss; for losses that mass times a generous
       scale plus the t tails' contribution beyond hi, bounded by int_hi^inf sum_j S_j dr (computed).
   (a) is an estimate, not a proof; (b) rests on QUADPACK's estimates; (c) is exact up to (b).

The same method checks the corner of the declared domain where order_sd is smallest beside revenue/orders
(0.001 of it): every visitor ordering, and few.

Run (about 2-6 minutes on one core):
  python3 test/reference/revenue/revenue_ten_reference.py > test/reference/revenue/revenue_ten_values.json
  python3 test/reference/revenue/revenue_ten_reference.py t_corner_all_ordered t_corner_few_orders
    > test/reference/revenue/revenue_corner_values.json
"""
import json
import math
import sys

import mpmath
import numpy as np
import scipy
from scipy import integrate, special

EPSREL = 1e-13
LIMIT = 400
PANEL_POINTS = 20


class TVariant:
    """One variant of the order_sd model, written from the model's definition (nothing of the add-in's)."""

    def __init__(self, orders, visitors, revenue, order_sd):
        self.orders, self.visitors, self.revenue, self.order_sd = orders, visitors, revenue, order_sd
        self.a = 1.0 + orders
        self.b = 1.0 + visitors - orders
        self.nu = orders - 1.0
        self.m = revenue / orders
        self.s = order_sd / math.sqrt(orders)
        self.t_log_norm = special.gammaln((self.nu + 1) / 2) - special.gammaln(self.nu / 2) - 0.5 * math.log(self.nu * math.pi)
        # The rate's density in z = logit p is p^a (1-p)^b / B(a, b); written around p0 = a/(a+b) as
        # exp(a log(p/p0) + b log(q/q0) + c), with c = a log p0 + b log q0 - log B(a, b) in mpmath at 40 digits
        # (scipy's betaln alone is off by ~2e-12 here, which would show in every probability).
        mpmath.mp.dps = 40
        A, B = mpmath.mpf(orders) + 1, mpmath.mpf(visitors - orders) + 1
        self.log_p0 = float(mpmath.log(A / (A + B)))
        self.log_q0 = float(mpmath.log(B / (A + B)))
        self.log_c = float(A * mpmath.log(A / (A + B)) + B * mpmath.log(B / (A + B)) - mpmath.log(mpmath.beta(A, B)))
        self.z0 = math.log(self.a / self.b)
        self.sz = math.sqrt(special.polygamma(1, self.a) + special.polygamma(1, self.b))

    def rate_density_z(self, z):
        """Density of z = logit p: p^a (1-p)^b / B(a, b) (the Jacobian p(1-p) included)."""
        log_p = -math.log1p(math.exp(-z)) if z > -30 else z - math.log1p(math.exp(z))
        log_q = -math.log1p(math.exp(z)) if z < 30 else -z - math.log1p(math.exp(-z))
        return math.exp(self.a * (log_p - self.log_p0) + self.b * (log_q - self.log_q0) + self.log_c)

    def _points(self, r):
        pts = [self.z0 + k * self.sz for k in (-25, -12, -6, -3, -1, 0, 1, 3, 6, 12, 25)]
        p = r / self.m
        if 0 < p < 1:
            zt = math.log(p) - math.log1p(-p)
            w = self.s / abs(self.m)
            pts += [zt + k * w for k in (-12, -3, 0, 3, 12)]
        return sorted(set(pts))

    def _quad(self, g, r):
        pts = self._points(r)
        lo, hi = self.z0 - 40 * self.sz, self.z0 + 40 * self.sz
        pts = [x for x in pts if lo < x < hi]
        val, err = integrate.quad(lambda z: self.rate_density_z(z) * g(z), lo, hi, points=pts, epsabs=0,
                                  epsrel=EPSREL, limit=LIMIT)
        return val, err

    def pdf(self, r):
        def g(z):
            p = 1 / (1 + math.exp(-z))
            t = (r / p - self.m) / self.s
            return math.exp(self.t_log_norm - (self.nu + 1) / 2 * math.log1p(t * t / self.nu)) / (self.s * p)
        return self._quad(g, r)

    def cdf(self, r, upper=False):
        def g(z):
            p = 1 / (1 + math.exp(-z))
            t = (r / p - self.m) / self.s
            return special.stdtr(self.nu, -t) if upper else special.stdtr(self.nu, t)
        return self._quad(g, r)

    def log_r_frame(self):
        """Mean and sd of log R by the delta method on v (a placement only, for the outer window)."""
        mu = special.digamma(self.a) - special.digamma(self.a + self.b) + math.log(self.m)
        sd = math.sqrt(special.polygamma(1, self.a) - special.polygamma(1, self.a + self.b) + (self.s / self.m) ** 2)
        return mu, sd


def gauss_legendre(edges):
    x, w = np.polynomial.legendre.leggauss(PANEL_POINTS)
    nodes, weights = [], []
    for a, b in zip(edges[:-1], edges[1:]):
        nodes.extend((a + b) / 2 + (b - a) / 2 * x)
        weights.extend((b - a) / 2 * w)
    return np.array(nodes), np.array(weights)


def outer_edges(vs, lo, hi, panels):
    """Equal panels on [lo, hi] plus edges graded towards log m of each variant (where R = p v has a cliff
    when p piles up at 1: every visitor ordered) at +- (s/m) * 2^k."""
    edges = set(np.linspace(lo, hi, panels + 1))
    for v in vs:
        if v.b > 3:
            continue  # the rate's density vanishes at p = 1: no cliff
        c, w = math.log(v.m), v.s / v.m
        for k in range(-2, 40):
            for sign in (-1, 1):
                e = c + sign * w * 2.0 ** k
                if lo < e < hi:
                    edges.add(e)
        edges.add(c)
    return np.array(sorted(edges))


def halved(edges):
    mids = (edges[:-1] + edges[1:]) / 2
    return np.array(sorted(set(edges) | set(mids)))


def tables(vs, nodes):
    """f, F, S and their inner error estimates for every variant at r = e^w of every node."""
    k = len(vs)
    f, F, S = (np.zeros((k, len(nodes))) for _ in range(3))
    ef, eF, eS = (np.zeros((k, len(nodes))) for _ in range(3))
    for i, v in enumerate(vs):
        for n, w in enumerate(nodes):
            r = math.exp(w)
            f[i, n], ef[i, n] = v.pdf(r)
            F[i, n], eF[i, n] = v.cdf(r)
            S[i, n], eS[i, n] = v.cdf(r, upper=True)
    return f, F, S, ef, eF, eS


def outer(vs, edges):
    nodes, weights = gauss_legendre(edges)
    f, F, S, ef, eF, eS = tables(vs, nodes)
    r = np.exp(nodes)
    jw = weights * r  # dr = r dw
    k = len(vs)
    highest, highest_err, losses, losses_err = [], [], [], []
    for i in range(k):
        others = [j for j in range(k) if j != i]
        prod = np.prod(F[others], axis=0)
        highest.append(float(np.sum(jw * f[i] * prod)))
        highest_err.append(float(np.sum(jw * (ef[i] * prod + f[i] * np.sum(eF[others], axis=0)))))
        miss = -np.expm1(np.sum(np.log1p(-np.minimum(S[others], 1.0)), axis=0))
        losses.append(float(np.sum(jw * F[i] * miss)))
        losses_err.append(float(np.sum(jw * (eF[i] * miss + F[i] * np.sum(eS[others], axis=0)))))
    above = float(np.sum(jw * f[0] * S[1]))
    above_err = float(np.sum(jw * (ef[0] * S[1] + f[0] * eS[1])))
    return dict(highest=highest, highestInner=highest_err, loss=losses, lossInner=losses_err, above=above,
                aboveInner=above_err)


# Invented totals (orders, visitors, revenue, order_sd); the first variant of each case is the control.
CASES = {
    # revenue_reference.py's "t_ten_variants"
    "t_ten_variants": [TVariant(80 + 5 * i, 2000 + 10 * i, (80 + 5 * i) * (45.0 + i), 30.0 + i) for i in range(10)],
    # The corner of the declared domain: order_sd at its smallest share of revenue/orders (0.001), with every
    # visitor ordering (the rate piled against p = 1, so R has a cliff at revenue/orders) and with few.
    "t_corner_all_ordered": [TVariant(30, 30, 30 * 50.0, 0.05), TVariant(31, 31, 31 * 50.2, 0.0502)],
    "t_corner_few_orders": [TVariant(30, 3000, 30 * 50.0, 0.05), TVariant(33, 3000, 33 * 50.5, 0.0505)],
}


def run_case(name, vs, panels):
    frames = [v.log_r_frame() for v in vs]
    lo = min(mu - 30 * sd for mu, sd in frames)
    hi = max(mu + 30 * sd for mu, sd in frames)
    sys.stderr.write(f"{name}: window [{lo:.3f}, {hi:.3f}] in log R, {panels} panels (+ graded) and halved\n")
    edges = outer_edges(vs, lo, hi, panels)
    coarse = outer(vs, edges)
    fine = outer(vs, halved(edges))
    # Truncation: each variant's mass outside the window, and the upper tails' part of a loss beyond hi
    # (int_hi^inf S_j dr = int over w > hi of S_j e^w dw, by quad over w).
    outside = [v.cdf(math.exp(lo))[0] + v.cdf(math.exp(hi), upper=True)[0] for v in vs]
    mass_out = float(sum(outside))
    beyond = float(sum(integrate.quad(lambda w, v=v: v.cdf(math.exp(w), upper=True)[0] * math.exp(w), hi, hi + 5,
                                      epsabs=1e-300, epsrel=1e-6, limit=200)[0] for v in vs))
    # A loss below lo: int_{-inf}^{lo} F_i dr <= e^lo * F_i(e^lo) (F_i increasing; R < 0 negligible).
    below = float(math.exp(lo) * max(v.cdf(math.exp(lo))[0] for v in vs))
    negative = [float(special.stdtr(v.nu, -v.m / v.s)) for v in vs]
    bound = lambda c, f, inner: abs(c - f) + inner + mass_out
    return {
        "source": f"test/reference/revenue/revenue_ten_reference.py (scipy {scipy.__version__} quad epsrel {EPSREL} "
                  f"inner, composite {PANEL_POINTS}-point Gauss-Legendre outer over log R, {panels} panels and halved)",
        "name": name,
        "variants": [{"orders": v.orders, "visitors": v.visitors, "revenue": v.revenue, "orderSd": v.order_sd} for v in vs],
        "window": [lo, hi],
        "massOutsideWindow": mass_out,
        "negativeMass": negative,
        "probHighest": fine["highest"],
        "probHighestErrorBound": [bound(c, f, e) for c, f, e in zip(coarse["highest"], fine["highest"], fine["highestInner"])],
        "probAboveControl": [fine["above"]],
        "probAboveControlErrorBound": [bound(coarse["above"], fine["above"], fine["aboveInner"])],
        "expectedLoss": fine["loss"],
        "expectedLossErrorBound": [abs(c - f) + e + beyond + below + mass_out * math.exp(hi)
                                   for c, f, e in zip(coarse["loss"], fine["loss"], fine["lossInner"])],
    }


def main():
    """python3 revenue_ten_reference.py [CASE ...]: one case prints one JSON object, several a JSON list."""
    names = sys.argv[1:] or ["t_ten_variants"]
    out = [run_case(name, CASES[name], 24) for name in names]
    json.dump(out[0] if len(out) == 1 else out, sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
