/**
 * Small numerical building blocks shared by the statistics core: accurate elementary functions near
 * their cancellation points, sums of exponentials kept in logs, a bracketing root finder and
 * Gauss–Legendre rules. Pure and stateless.
 */
import { StatsError } from './errors';

/**
 * log(1 + x) − x, accurate for small |x| (where the subtraction would cancel) and valid for x > −1.
 *
 * Method: for |x| < 0.5 the series −x²/2 + x³/3 − … summed as x²·Σ (−x)^k/(k+2) with Horner-free
 * accumulation to full precision (at most ~60 terms); otherwise the direct formula, which is then accurate.
 * Cost: O(1). Throws nothing; returns −Infinity at x = −1 and NaN below (callers never pass those).
 * @example log1pmx(1e-5) //=> -4.999966666916667e-11
 */
export function log1pmx(x: number): number {
  if (Math.abs(x) >= 0.5) return Math.log1p(x) - x;
  // log1p(x) - x = -x^2/2 + x^3/3 - x^4/4 + ...
  let term = x * x;
  let sum = 0;
  for (let k = 2; k < 200; k++) {
    const contribution = term / k;
    sum += k % 2 === 0 ? -contribution : contribution;
    if (Math.abs(contribution) <= 1e-17 * Math.abs(sum)) break;
    term *= x;
  }
  return sum;
}

/**
 * e^x − 1 − x, accurate for small |x|.
 *
 * Method: Taylor series x²/2! + x³/3! + … for |x| < 0.5, else the direct formula. Cost: O(1).
 * @example expm1mx(1e-5) //=> 5.000016666708333e-11
 */
export function expm1mx(x: number): number {
  if (Math.abs(x) >= 0.5) return Math.expm1(x) - x;
  let term = (x * x) / 2;
  let sum = term;
  for (let k = 3; k < 60; k++) {
    term *= x / k;
    sum += term;
    if (Math.abs(term) <= 1e-17 * Math.abs(sum)) break;
  }
  return sum;
}

/**
 * log(e^a + e^b) without overflow; either may be −Infinity.
 * Cost: O(1).
 * @example logAddExp(Math.log(1), Math.log(3)) //=> 1.3862943611198906 (log 4)
 */
export function logAddExp(a: number, b: number): number {
  if (a === -Infinity) return b;
  if (b === -Infinity) return a;
  return a > b ? a + Math.log1p(Math.exp(b - a)) : b + Math.log1p(Math.exp(a - b));
}

/**
 * log(1 − e^x) for x ≤ 0, accurate at both ends (M. Mächler, "Accurately computing log(1 − exp(−|a|))",
 * Rmpfr vignette, 2012): log(−expm1(x)) for x > −ln 2, else log1p(−exp(x)).
 * Cost: O(1). Returns −Infinity for x ≥ 0 (1 − e^x ≤ 0 has no log; rounding can push a log probability
 * just above 0) and 0 at x = −Infinity.
 * @example log1mExp(Math.log(0.25)) //=> -0.2876820724517809 (log 0.75)
 */
export function log1mExp(x: number): number {
  if (x >= 0) return -Infinity;
  return x > -Math.LN2 ? Math.log(-Math.expm1(x)) : Math.log1p(-Math.exp(x));
}

/**
 * log(Σ exp(values)) computed stably: the largest value taken out before summing.
 * Cost: O(n). Returns −Infinity for an empty list or when every value is −Infinity.
 * @example logSumExp([Math.log(1), Math.log(3)]) //=> 1.3862943611198906 (log 4)
 */
export function logSumExp(values: ArrayLike<number>): number {
  let max = -Infinity;
  for (let i = 0; i < values.length; i++) max = Math.max(max, values[i] as number);
  if (max === -Infinity) return -Infinity;
  let sum = 0;
  for (let i = 0; i < values.length; i++) sum += Math.exp((values[i] as number) - max);
  return max + Math.log(sum);
}

/**
 * A root of a continuous function inside a bracket [lo, hi] whose ends have opposite signs
 * (Brent's method: R. P. Brent, "Algorithms for Minimization without Derivatives", 1973, ch. 4).
 *
 * Deterministic; stops when the bracket is below `tolerance` (absolute, default 1e-15·scale) or after
 * 300 iterations. Cost: typically 10–40 evaluations of `f`.
 * Throws StatsError('not_available') when the ends do not bracket a root.
 * @example findRoot((x) => x * x - 2, 0, 2) //=> 1.4142135623730951
 */
export function findRoot(f: (x: number) => number, lo: number, hi: number, tolerance = 0): number {
  let a = lo;
  let b = hi;
  let fa = f(a);
  let fb = f(b);
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (fa > 0 === fb > 0 || Number.isNaN(fa) || Number.isNaN(fb)) {
    throw new StatsError('not_available', `no root between ${lo} and ${hi}`);
  }
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let iteration = 0; iteration < 300; iteration++) {
    if (fb > 0 === fc > 0) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol = 2 * Number.EPSILON * Math.abs(b) + Math.max(tolerance, Number.MIN_VALUE) / 2;
    const m = (c - b) / 2;
    if (Math.abs(m) <= tol || fb === 0) return b;
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * m * s;
        q = 1 - s;
      } else {
        const qa = fa / fc;
        const r = fb / fc;
        p = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1));
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m;
        e = d;
      }
    } else {
      d = m;
      e = d;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
  }
  return b;
}

/**
 * The root of an increasing function f inside [a, b]: Newton's method with derivative `slope`, started
 * from the linear interpolation of the ends' residuals and kept inside a bisection bracket (a step that
 * leaves it, or has no usable slope, is replaced by the midpoint). Returns a when f(a) ≥ 0 and b when
 * f(b) ≤ 0. Stops when a step moves less than one ulp, |f| ≤ 1e-16 or the bracket is two ulps wide.
 * Cost: typically 3–6 evaluations of f and slope; at most 100 steps.
 * @example solveIncreasing((x) => x * x - 2, (x) => 2 * x, 0, 2) //=> 1.4142135623730951
 */
export function solveIncreasing(f: (z: number) => number, slope: (z: number) => number, a: number, b: number): number {
  let lo = a;
  let hi = b;
  let flo = f(lo);
  let fhi = f(hi);
  if (flo >= 0) return lo;
  if (fhi <= 0) return hi;
  let z = (lo + hi) / 2;
  // Start from the linear interpolation of the residual.
  if (Number.isFinite(flo) && Number.isFinite(fhi)) z = lo - (flo * (hi - lo)) / (fhi - flo);
  for (let i = 0; i < 100; i++) {
    const fz = f(z);
    if (fz === 0) return z;
    if (fz < 0) {
      lo = z;
      flo = fz;
    } else {
      hi = z;
      fhi = fz;
    }
    const d = slope(z);
    let next = d > 0 && Number.isFinite(d) ? z - fz / d : NaN;
    if (!(next > lo && next < hi)) next = (lo + hi) / 2;
    if (Math.abs(next - z) <= Number.EPSILON * Math.abs(z) || Math.abs(fz) <= 1e-16) return next;
    if (hi - lo <= 2 * Number.EPSILON * Math.max(Math.abs(lo), Math.abs(hi))) return z;
    z = next;
  }
  return z;
}

/** Nodes and weights of an n-point Gauss–Legendre rule on [−1, 1]. */
export interface QuadratureRule {
  readonly nodes: Float64Array;
  readonly weights: Float64Array;
}

/**
 * The n-point Gauss–Legendre rule on [−1, 1] (exact for polynomials of degree 2n − 1).
 *
 * Method: Newton's iteration on the Legendre recurrence from Chebyshev starting points
 * (Press et al., Numerical Recipes, 3rd ed., §4.6); nodes accurate to machine precision for n ≤ 100.
 * Cost: O(n²) — compute once and keep the result.
 * @example gaussLegendre(2).nodes //=> Float64Array [-0.5773502691896257, 0.5773502691896257]
 */
export function gaussLegendre(n: number): QuadratureRule {
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  for (let i = 0; i < Math.ceil(n / 2); i++) {
    let x = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let derivative = 0;
    for (let iteration = 0; iteration < 100; iteration++) {
      let p0 = 1;
      let p1 = x;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      if (n === 1) {
        p1 = x;
        p0 = 1;
      }
      derivative = (n * (x * p1 - p0)) / (x * x - 1);
      const step = p1 / derivative;
      x -= step;
      if (Math.abs(step) < 1e-16) break;
    }
    const w = 2 / ((1 - x * x) * derivative * derivative);
    nodes[i] = -x;
    nodes[n - 1 - i] = x;
    weights[i] = w;
    weights[n - 1 - i] = w;
  }
  return { nodes, weights };
}
