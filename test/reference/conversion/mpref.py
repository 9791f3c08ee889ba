"""Shared mpmath helpers of the conversion reference scripts: the Gauss-Legendre rule, the logit pair and
BetaZ, a Beta(a, b) posterior written in z = logit(p).

Used by conversion_reference.py, conversion_marginals.py and loss_many_reference.py (and, through the
last, lift_quantiles_more.py). Nothing here prints or runs on import.

Precision: mpmath's working precision is global. A script calls set_precision(digits) once, before it
builds any BetaZ; that sets mpmath's digits and computes the 12-point Gauss-Legendre nodes at those digits.
The rule keeps the digits it was made at if the script lowers mpmath's precision afterwards (as
lift_quantiles_more.py does: nodes at 38 digits, sums at 30).

BetaZ (independent of the TypeScript code): the density of z = logit(p) is
exp(a z - (a + b) log(1 + e^z) - log B(a, b)), log B from mpmath's loggamma. Anchors run from the mode
outwards in steps of at most half a standard deviation and at most 2/|slope| (the density changes by at
most e^2 across a step, so the 12-point rule is exact to ~1e-31 relative on every step) until the log
density is log_range below its peak. The cdf F is accumulated from the left and the survival S from the
right, so both tails keep their relative accuracy; beyond the outer anchors the exponential-tail value
f/|slope| is used.
"""
import mpmath as mp

_RULE = {'nodes': None, 'weights': None}


def gauss_legendre(n):
    """n-point Gauss-Legendre nodes/weights on [-1, 1] at the working precision (Newton on P_n)."""
    nodes, weights = [], []
    for i in range(1, n + 1):
        x = mp.cos(mp.pi * (i - mp.mpf(1) / 4) / (n + mp.mpf(1) / 2))
        for _ in range(100):
            p0, p1 = mp.mpf(1), x
            for k in range(2, n + 1):
                p0, p1 = p1, ((2 * k - 1) * x * p1 - (k - 1) * p0) / k
            dp = n * (x * p1 - p0) / (x * x - 1)
            dx = p1 / dp
            x -= dx
            if abs(dx) < mp.mpf(10) ** (-mp.mp.dps - 2):
                break
        nodes.append(x)
        weights.append(2 / ((1 - x * x) * dp * dp))
    return nodes, weights


def set_precision(digits, points=12):
    """Set mpmath's working precision to `digits` and make the Gauss-Legendre rule at that precision."""
    mp.mp.dps = digits
    _RULE['nodes'], _RULE['weights'] = gauss_legendre(points)


def rule():
    """(nodes, weights) of the current rule (set_precision must have run)."""
    if _RULE['nodes'] is None:
        raise RuntimeError('mpref.set_precision(digits) must run before the rule is used')
    return _RULE['nodes'], _RULE['weights']


def gl(f, a, b):
    """The rule on [a, b]."""
    nodes, weights = rule()
    half = (b - a) / 2
    mid = (a + b) / 2
    return half * mp.fsum(w * f(mid + half * t) for t, w in zip(nodes, weights))


def logistic(z):
    return 1 / (1 + mp.exp(-z))


def logit(x):
    return mp.log(x) - mp.log1p(-x)


class BetaZ:
    """Beta(a, b) in z = logit(p): log density, anchors, F from the left and S from the right.

    lower(z)/upper(z): F and S, each accumulated from its own side; tails(z): (F, S) with the smaller one
    computed directly and the other as 1 minus it; log_cdf(z); cdf_value(x) at the rate x; quantile(p).
    """

    def __init__(self, a, b, log_range):
        self.a = mp.mpf(a)
        self.b = mp.mpf(b)
        n = self.a + self.b
        self.lbeta = mp.loggamma(self.a) + mp.loggamma(self.b) - mp.loggamma(n)
        self.mode = mp.log(self.a / self.b)
        p0 = self.a / n
        self.sd = 1 / mp.sqrt(n * p0 * (1 - p0))
        self.peak = self.logdens(self.mode)
        step = lambda z: min(self.sd / 2, 2 / max(abs(self.slope(z)), mp.mpf(10) ** -30))
        left = [self.mode]
        while self.logdens(left[-1]) - self.peak > -log_range:
            left.append(left[-1] - step(left[-1]))
        right = [self.mode]
        while self.logdens(right[-1]) - self.peak > -log_range:
            right.append(right[-1] + step(right[-1]))
        self.anchors = list(reversed(left))[:-1] + right
        pieces = [gl(self.dens, self.anchors[i], self.anchors[i + 1]) for i in range(len(self.anchors) - 1)]
        z0, z1 = self.anchors[0], self.anchors[-1]
        tail_left = self.dens(z0) / abs(self.slope(z0))
        tail_right = self.dens(z1) / abs(self.slope(z1))
        self.F = [tail_left]
        for piece in pieces:
            self.F.append(self.F[-1] + piece)
        self.S = [tail_right]
        for piece in reversed(pieces):
            self.S.append(self.S[-1] + piece)
        self.S.reverse()
        self.total = self.F[-1] + tail_right  # should be 1
        self.mean = self.a / n

    def logdens(self, z):
        return self.a * z - (self.a + self.b) * mp.log1p(mp.exp(z)) - self.lbeta

    def slope(self, z):
        return self.a - (self.a + self.b) / (1 + mp.exp(-z))

    def dens(self, z):
        return mp.exp(self.logdens(z))

    def _index(self, z):
        if z <= self.anchors[0]:
            return -1
        if z >= self.anchors[-1]:
            return len(self.anchors) - 1
        lo, hi = 0, len(self.anchors) - 1
        while hi - lo > 1:
            mid = (lo + hi) // 2
            if self.anchors[mid] <= z:
                lo = mid
            else:
                hi = mid
        return lo

    def lower(self, z):
        """F(z) accumulated from the left."""
        i = self._index(z)
        if i < 0:
            return self.dens(z) / abs(self.slope(z))
        if i >= len(self.anchors) - 1:
            return 1 - self.upper(z)
        return self.F[i] + gl(self.dens, self.anchors[i], z)

    def upper(self, z):
        """S(z) = 1 - F(z) accumulated from the right."""
        i = self._index(z)
        if i >= len(self.anchors) - 1:
            return self.dens(z) / abs(self.slope(z))
        if i < 0:
            return 1 - self.lower(z)
        return self.S[i + 1] + gl(self.dens, z, self.anchors[i + 1])

    def tails(self, z):
        """(F(z), S(z)), the smaller one computed directly and the other as 1 minus it."""
        i = self._index(z)
        if i < 0:
            f = self.dens(z) / abs(self.slope(z))
            return f, 1 - f
        if i >= len(self.anchors) - 1:
            s = self.dens(z) / abs(self.slope(z))
            return 1 - s, s
        if self.F[i] < self.S[i + 1]:
            f = self.F[i] + gl(self.dens, self.anchors[i], z)
            return f, 1 - f
        s = self.S[i + 1] + gl(self.dens, z, self.anchors[i + 1])
        return 1 - s, s

    def log_cdf(self, z):
        f, s = self.tails(z)
        return mp.log(f) if f < s else mp.log1p(-s)

    def cdf_value(self, x):
        """F at the rate x (not at z)."""
        return self.lower(mp.log(x) - mp.log1p(-x))

    def quantile(self, p):
        """The rate p-quantile, by mpmath.findroot (Anderson) on log F or log S, whichever is smaller."""
        p = mp.mpf(p)
        if p <= 0.5:
            f = lambda z: mp.log(self.lower(z)) - mp.log(p)
        else:
            f = lambda z: mp.log(1 - p) - mp.log(self.upper(z))
        z = mp.findroot(f, (self.mode - self.sd, self.mode + self.sd), solver='anderson', tol=mp.mpf(10) ** -30)
        return 1 / (1 + mp.exp(-z))
