#!/usr/bin/env python3
"""Reference values for revenue per visitor R = p * v (the REVENUE_ functions), by nested quadrature of the
product model with scipy.integrate.quad (QUADPACK, epsrel 1e-13), independent of the add-in's method:

  p ~ Beta(1 + orders, 1 + visitors - orders);
  v: exponential order values, 1/v ~ Gamma(orders, revenue)  (no order_sd), or
     Student t(orders - 1) with centre revenue/orders, scale order_sd/sqrt(orders)  (order_sd given),
     or exactly revenue/orders (order_sd 0).

One variant's R: F(r) = int f_p(p) P(v <= r/p) dp, f(r) = int f_p(p) f_v(r/p)/p dp (over z = logit p, with
breakpoints at the rate's mode +- k sd and where the order value's factor turns). Then, by an outer quad:
  P(R_B > R_A) = int f_A S_B;  P(i highest) = int f_i prod_{j != i} F_j;
  loss_i = int F_i (1 - prod_{j != i} F_j) dr;  P(R_B/R_A - 1 > m) = int_{x>0} f_A S_B((1+m)x) + int_{x<0} f_A F_B((1+m)x);
interval ends and lift quantiles by brentq on those. For exponential order values P(R_B > R_A) is also
computed in closed form inside: given the rates, b_A*lam_A/(b_A*lam_A + b_B*lam_B) ~ Beta(a_A, a_B), so
P(p_B/lam_B > p_A/lam_A | p) = I_x(a_B, a_A) with x = k/(1+k), k = (p_B/p_A)*(b_B/b_A) (a closed form,
derived here; a = orders, b = revenue), averaged over the two rates by a 2-D quad ("pGreaterClosedForm").
The order values alone: P(v_B > v_A) = P(lam_B < lam_A) = I_y(a_B, a_A), y = b_B/(b_A + b_B), against
quadrature ("orderValueOnly"; it is the limit of P(R_B > R_A) as both rates become certain and equal).

Run: python3 test/reference/revenue/revenue_reference.py > test/reference/revenue/revenue_values.json   (an hour or more), or one
case a process (python3 revenue_reference.py NAME > NAME.json, in parallel) and then
python3 revenue_reference.py --merge *.json > revenue_values.json.
The case "t_ten_variants" stays listed but is not in revenue_values.json: its nested quadrature did not finish
in 1.5 hours; revenue_ten_reference.py computes it in minutes (one quad per outer node) -> revenue_ten_values.json.
"""
import json
import math
import sys

import numpy as np
from scipy import integrate, optimize, special, stats

EPSREL = 1e-12
LIMIT = 500


class Variant:
    def __init__(self, orders, visitors, revenue, order_sd=None):
        self.orders, self.visitors, self.revenue, self.order_sd = orders, visitors, revenue, order_sd
        self.a = 1.0 + orders
        self.b = 1.0 + visitors - orders
        a, b = self.a, self.b
        self.z0 = math.log(a / b)
        self.p0 = a / (a + b)
        # sd of logit p (trigamma), for breakpoints
        self.sz = math.sqrt(special.polygamma(1, a) + special.polygamma(1, b))
        if order_sd is None:
            self.kind = "exp"
            self.alpha, self.beta = float(orders), float(revenue)
        elif order_sd == 0:
            self.kind = "fixed"
            self.m = revenue / orders
        else:
            self.kind = "t"
            self.nu = orders - 1.0
            self.m = revenue / orders
            self.s = order_sd / math.sqrt(orders)
            # log of the t density's constant Gamma((nu+1)/2)/(Gamma(nu/2) sqrt(nu pi))
            self.t_log_norm = special.gammaln((self.nu + 1) / 2) - special.gammaln(self.nu / 2) - 0.5 * math.log(self.nu * math.pi)
        self._norm = None

    # log density of z = logit p relative to its mode (no log-gamma of large numbers)
    def logf_z(self, z):
        a, b = self.a, self.b
        n = a + b
        p0, q0 = a / n, b / n
        d = z - self.z0
        if p0 <= 0.5:
            y = p0 * math.expm1(d)
            if y <= 1:
                k = p0 * (math.expm1(d) - d) + (math.log1p(y) - y)
            else:
                y2 = q0 * math.expm1(-d)
                k = q0 * (math.expm1(-d) + d) + (math.log1p(y2) - y2)
        else:
            y = q0 * math.expm1(-d)
            if y <= 1:
                k = q0 * (math.expm1(-d) + d) + (math.log1p(y) - y)
            else:
                y2 = p0 * math.expm1(d)
                k = p0 * (math.expm1(d) - d) + (math.log1p(y2) - y2)
        return -n * k

    def z_points(self, extra=()):
        pts = [self.z0 + k * self.sz for k in (-30, -12, -5, -2, 0, 2, 5, 12, 30)]
        pts += [e for e in extra if math.isfinite(e)]
        return sorted(set(pts))

    def _zrange(self):
        # where the log density is >= -150 (bisection on each side; the density is log-concave in z)
        def edge(direction):
            lo, hi = 0.0, 1.0
            while self.logf_z(self.z0 + direction * hi * self.sz) > -150:
                lo, hi = hi, 2 * hi
            for _ in range(200):
                mid = (lo + hi) / 2
                if self.logf_z(self.z0 + direction * mid * self.sz) > -150:
                    lo = mid
                else:
                    hi = mid
            return self.z0 + direction * hi * self.sz
        return edge(-1), edge(1)

    def quad_z(self, g, extra=()):
        """int exp(logf_z(z)) g(z) dz / int exp(logf_z(z)) dz, over the rate's window."""
        lo, hi = self._zrange()
        pts = [x for x in self.z_points(extra) if lo < x < hi]
        if self._norm is None:
            self._norm = integrate.quad(lambda z: math.exp(self.logf_z(z)), lo, hi, points=pts[:50], epsabs=0,
                                        epsrel=EPSREL, limit=LIMIT)[0]
        val = integrate.quad(lambda z: math.exp(self.logf_z(z)) * g(z), lo, hi, points=pts[:50], epsabs=0,
                             epsrel=EPSREL, limit=LIMIT)[0]
        return val / self._norm

    # order value: P(v <= x), P(v > x), density
    def v_cdf(self, x, upper=False):
        if self.kind == "exp":
            if x <= 0:
                return 0.0 if not upper else 1.0
            # v <= x  <=>  lambda >= 1/x: Q(alpha, beta/x)
            return special.gammainc(self.alpha, self.beta / x) if upper else special.gammaincc(self.alpha, self.beta / x)
        if self.kind == "fixed":
            below = 1.0 if x >= self.m else 0.0
            return 1 - below if upper else below
        t = (x - self.m) / self.s
        return special.stdtr(self.nu, -t) if upper else special.stdtr(self.nu, t)

    def v_pdf(self, x):
        if self.kind == "exp":
            if x <= 0:
                return 0.0
            lam = 1 / x
            return math.exp(self.alpha * math.log(self.beta * lam) - self.beta * lam - special.gammaln(self.alpha)) / x
        t = (x - self.m) / self.s
        return math.exp(self.t_log_norm - (self.nu + 1) / 2 * math.log1p(t * t / self.nu)) / self.s

    def turn(self, r):
        """logit of the rate where the order-value factor turns for R = r (a breakpoint)."""
        if self.kind == "exp":
            p = self.alpha * r / self.beta
        else:
            p = r / self.m if self.m != 0 else float("nan")
        if 0 < p < 1:
            return [math.log(p) - math.log1p(-p)]
        return []

    def cdf(self, r, upper=False):
        """P(R <= r) (or > r)."""
        if self.kind == "fixed":
            x = r / self.m
            if x <= 0:
                return 0.0 if not upper else 1.0
            if x >= 1:
                return 1.0 if not upper else 0.0
            return special.betaincc(self.a, self.b, x) if upper else special.betainc(self.a, self.b, x)

        def g(z):
            p = 1 / (1 + math.exp(-z))
            return self.v_cdf(r / p, upper)
        extra = self.turn(r)
        if self.kind == "t":
            w = self.s / abs(self.m) if self.m != 0 else 1.0
            extra = extra + [e + k * w for e in extra for k in (-12, -3, 3, 12)]
        return self.quad_z(g, extra)

    def pdf(self, r):
        if self.kind == "fixed":
            x = r / self.m
            if not 0 < x < 1:
                return 0.0
            return stats.beta.pdf(x, self.a, self.b) / self.m

        def g(z):
            p = 1 / (1 + math.exp(-z))
            return self.v_pdf(r / p) / p
        extra = self.turn(r)
        if self.kind == "t":
            w = self.s / abs(self.m) if self.m != 0 else 1.0
            extra = extra + [e + k * w for e in extra for k in (-12, -3, 3, 12)]
        return self.quad_z(g, extra)

    # an outer coordinate and its breakpoints
    def frame(self):
        if self.kind == "exp":
            mu = special.digamma(self.a) - special.digamma(self.a + self.b) + math.log(self.beta) - special.digamma(self.alpha)
            sd = math.sqrt(special.polygamma(1, self.a) - special.polygamma(1, self.a + self.b) + special.polygamma(1, self.alpha))
            return ("log", mu, sd)
        if self.kind == "fixed":
            mu = self.p0 * self.m
            sd = self.m * math.sqrt(self.p0 * (1 - self.p0) / (self.a + self.b + 1))
            return ("lin", mu, sd)
        mu = self.p0 * self.m
        sd = math.hypot(self.m * math.sqrt(self.p0 * (1 - self.p0) / (self.a + self.b + 1)), self.p0 * self.s)
        return ("sinh", mu, sd)


def outer_quad(fn, variants, positive_only=False, negative_only=False):
    """int fn(r) dr over the real line (or r > 0 / r < 0), in a coordinate and with breakpoints from the variants."""
    frames = [v.frame() for v in variants]
    if all(f[0] == "log" for f in frames) or positive_only:
        # w = log r
        mus, sds = [], []
        for f, v in zip(frames, variants):
            if f[0] == "log":
                mus.append(f[1])
                sds.append(f[2])
            else:
                mus.append(math.log(max(abs(f[1]), 1e-300)))
                sds.append(f[2] / max(abs(f[1]), 1e-300) + 0.05)
        lo = min(m - 40 * s for m, s in zip(mus, sds))
        hi = max(m + 40 * s for m, s in zip(mus, sds))
        if any(v.kind == "t" for v in variants):
            lo, hi = lo - 40, hi + 40
        pts = sorted({m + k * s for m, s in zip(mus, sds) for k in (-20, -8, -4, -2, 0, 2, 4, 8, 20)})
        pts = [p for p in pts if lo < p < hi]
        return integrate.quad(lambda w: fn(math.exp(w)) * math.exp(w), lo, hi, points=pts[:80], epsabs=0,
                              epsrel=EPSREL, limit=LIMIT)[0]
    # signed: r = c + s sinh(u)
    c = np.mean([f[1] for f in frames])
    s = max(f[2] for f in frames)
    nus = [v.nu for v in variants if v.kind == "t"]
    span = 40 + 400 / max(1.0, min(nus)) if nus else 60
    pts = sorted({math.asinh((f[1] + k * f[2] - c) / s) for f in frames for k in (-20, -8, -4, -2, 0, 2, 4, 8, 20)}
                 | {math.asinh(-c / s)})
    lo, hi = -span, span
    if negative_only:
        hi = math.asinh(-c / s)
    pts = [p for p in pts if lo < p < hi]
    return integrate.quad(lambda u: fn(c + s * math.sinh(u)) * s * math.cosh(u), lo, hi, points=pts[:80], epsabs=0,
                          epsrel=EPSREL, limit=LIMIT)[0]


def prob_greater(b, a):
    """P(R_b > R_a), both tails integrated; returns (P(b > a), P(a > b))."""
    upper = outer_quad(lambda r: a.pdf(r) * b.cdf(r, upper=True), [a, b])
    lower = outer_quad(lambda r: b.pdf(r) * a.cdf(r, upper=True), [a, b])
    return upper, lower


def p_greater_closed_form(b, a):
    """Exponential order values: E over both rates of I_x(alpha_B, alpha_A), x = k/(1+k), k = (p_B/p_A)(beta_B/beta_A)."""
    def inner(za):
        pa = 1 / (1 + math.exp(-za))

        def g(zb):
            pb = 1 / (1 + math.exp(-zb))
            k = (pb / pa) * (b.beta / a.beta)
            return special.betainc(b.alpha, a.alpha, k / (1 + k))
        return b.quad_z(g)
    return a.quad_z(inner)


def prob_highest(vs):
    out = []
    for i, vi in enumerate(vs):
        others = [v for j, v in enumerate(vs) if j != i]
        out.append(outer_quad(lambda r: vi.pdf(r) * math.prod(o.cdf(r) for o in others), vs))
    return out


def losses(vs):
    """loss_i = int F_i (1 - prod F_j): 1 - prod F_j = -expm1(sum log1p(-S_j)) with each S_j integrated
    directly (1 - F_j in doubles loses the heavy tails' contribution where S_j < 1e-16: 5e-9 at 2 orders)."""
    out = []
    for i, vi in enumerate(vs):
        others = [v for j, v in enumerate(vs) if j != i]

        def f(r, vi=vi, others=others):
            sfs = [o.cdf(r, upper=True) for o in others]
            if any(x >= 1 for x in sfs):
                return vi.cdf(r)
            return vi.cdf(r) * -math.expm1(sum(math.log1p(-x) for x in sfs))
        out.append(outer_quad(f, vs))
    return out


def lift_tail(a, b, m, upper):
    """P(R_b/R_a - 1 <= m) (or > m), the control's negative part included."""
    k = 1 + m
    pos = outer_quad(lambda x: a.pdf(x) * b.cdf(k * x, upper=upper), [a, b], positive_only=True)
    if a.kind == "t" and special.stdtr(a.nu, -a.m / a.s) > 1e-300:
        neg = outer_quad(lambda x: a.pdf(x) * b.cdf(k * x, upper=not upper), [a, b], negative_only=True)
    else:
        neg = 0.0
    return pos + neg


def quantile(cdf, sf, q, lo, hi):
    if q <= 0.5:
        f = lambda x: cdf(x) - q
    else:
        f = lambda x: (1 - q) - sf(x)
    while f(lo) > 0:
        lo = lo - (hi - lo)
    while f(hi) < 0:
        hi = hi + (hi - lo)
    return optimize.brentq(f, lo, hi, xtol=1e-14, rtol=1e-13, maxiter=200)


def interval(v, level):
    mu, sd = v.frame()[1], v.frame()[2]
    t = (1 - level) / 2
    if v.kind == "exp":
        lo, hi = math.exp(mu - 8 * sd), math.exp(mu + 8 * sd)
    else:
        lo, hi = mu - 10 * sd, mu + 10 * sd
    return [quantile(lambda r: v.cdf(r), lambda r: v.cdf(r, True), q, lo, hi) for q in (t, 1 - t)]


def lift_interval(a, b, level):
    t = (1 - level) / 2
    centre = b.frame()[1] / a.frame()[1] - 1 if a.kind != "exp" else math.exp(b.frame()[1] - a.frame()[1]) - 1
    return [quantile(lambda m: lift_tail(a, b, m, False), lambda m: lift_tail(a, b, m, True), q,
                     max(-0.999, centre - 0.05), centre + 0.05) for q in (t, 0.5, 1 - t)]


def V(*args):
    return Variant(*args)


# Invented totals (orders, visitors, revenue[, order_sd]); the first variant of each case is the control.
CASES = [
    ("exp_typical", [V(120, 2400, 7200.0), V(150, 2380, 8100.0)], dict(lift=[-0.02, 0.1], closed=True)),
    ("exp_one_order", [V(1, 50, 40.0), V(3, 55, 150.0)], dict(lift=[0.0], closed=True, noLoss=True)),
    ("exp_billion_visitors", [V(5000, 10**9, 250000.0), V(5300, 10**9, 270000.0)], dict(lift=[0.05], closed=True)),
    ("exp_all_visitors_ordered", [V(20, 20, 900.0), V(25, 25, 1000.0)], dict(lift=[-0.1], closed=True)),
    ("exp_two_orders", [V(2, 400, 61.5), V(5, 410, 180.0)], dict(lift=[0.5], closed=True)),
    ("exp_ten_variants", [V(80 + 5 * i, 2000 + 10 * i, (80 + 5 * i) * (45.0 + i)) for i in range(10)], dict(lift=[], noLift=True)),
    ("t_typical", [V(120, 2400, 7200.0, 55.0), V(150, 2380, 8100.0, 60.0)], dict(lift=[-0.02, 0.1])),
    ("t_whale_few_orders", [V(400, 20000, 20000.0, 1000.0), V(420, 20000, 22000.0, 1100.0)], dict(lift=[], noLift=True)),
    ("t_whale_many_orders", [V(50000, 1000000, 2.5e6, 1000.0), V(50500, 1000000, 2.55e6, 1000.0)], dict(lift=[0.0])),
    ("t_fixed_price", [V(400, 10000, 20000.0, 0.5), V(420, 10000, 21010.0, 0.5)], dict(lift=[0.02])),
    ("t_two_orders", [V(2, 30, 100.0, 20.0), V(3, 30, 160.0, 10.0)], dict(lift=[0.0], noLoss=True)),
    ("t_control_barely_positive", [V(100, 2000, 5000.0, 71.4), V(110, 2000, 5600.0, 75.0)], dict(lift=[0.0])),
    ("t_order_sd_zero_control", [V(60, 1500, 1800.0, 0.0), V(70, 1500, 2100.0, 4.0)], dict(lift=[0.0])),
    ("t_ten_variants", [V(80 + 5 * i, 2000 + 10 * i, (80 + 5 * i) * (45.0 + i), 30.0 + i) for i in range(10)], dict(lift=[], noLift=True)),
]


def merge(paths):
    """Joins per-case outputs of this script (run one case a process, in parallel) into one JSON, in CASES order."""
    parts = [json.load(open(p)) for p in paths]
    by_name = {c["name"]: c for part in parts for c in part["cases"]}
    json.dump({"source": parts[0]["source"], "orderValueOnly": parts[0]["orderValueOnly"],
               "cases": [by_name[name] for name, _, _ in CASES if name in by_name]}, sys.stdout, indent=1)
    sys.stdout.write("\n")


def main():
    if sys.argv[1:2] == ["--merge"]:
        merge(sys.argv[2:])
        return
    only = sys.argv[1:]
    out = []
    for name, vs, opts in CASES:
        if only and name not in only:
            continue
        sys.stderr.write(f"{name}\n")
        a = vs[0]
        case = {
            "name": name,
            "variants": [{"orders": v.orders, "visitors": v.visitors, "revenue": v.revenue,
                          **({} if v.order_sd is None else {"orderSd": v.order_sd})} for v in vs],
            "level": 0.95,
            "intervals": [interval(v, 0.95) for v in vs] if len(vs) <= 2 else [interval(vs[0], 0.95)],
            "probHighest": prob_highest(vs),
        }
        pairs = [prob_greater(b, a) for b in vs[1:]] if len(vs) <= 2 else [prob_greater(vs[1], a)]
        case["probAboveControl"] = [p[0] for p in pairs]
        case["probBelowControl"] = [p[1] for p in pairs]
        if opts.get("closed"):
            case["pGreaterClosedForm"] = [p_greater_closed_form(b, a) for b in vs[1:]]
        if not opts.get("noLoss"):
            case["expectedLoss"] = losses(vs)
        if not opts.get("noLift"):
            b = vs[1]
            case["liftAbove"] = [{"minLift": m, "above": lift_tail(a, b, m, True), "below": lift_tail(a, b, m, False)}
                                 for m in opts["lift"]]
            case["liftInterval"] = lift_interval(a, b, 0.95)
        if a.kind == "t":
            case["controlNegative"] = float(special.stdtr(a.nu, -a.m / a.s))
        out.append(case)
    # The order value's part alone (exponential): P(v_B > v_A) = I_z(a_A, a_B), z = b_A/(b_A + b_B).
    va, vb = Variant(120, 2400, 7200.0), Variant(150, 2380, 8100.0)
    # P(v_B > v_A) = P(lam_B < lam_A) = I_y(alpha_B, alpha_A), y = beta_B/(beta_A + beta_B)
    y = vb.beta / (va.beta + vb.beta)
    order_value_only = {
        "variants": [{"orders": 120, "revenue": 7200.0}, {"orders": 150, "revenue": 8100.0}],
        "closedForm": float(special.betainc(vb.alpha, va.alpha, y)),
        # the same by quadrature over w = log v (+-20 sd of log v around log 60)
        "quadrature": integrate.quad(lambda w: vb.v_cdf(math.exp(w), True) * va.v_pdf(math.exp(w)) * math.exp(w), 2, 6,
                                     epsabs=0, epsrel=EPSREL, limit=LIMIT)[0],
    }
    json.dump({"source": f"test/reference/revenue/revenue_reference.py (scipy {__import__('scipy').__version__} quad epsrel "
                         f"{EPSREL}, brentq)", "orderValueOnly": order_value_only, "cases": out}, sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
