/**
 * The Beta distribution: log density, both tails of the regularized incomplete beta function I_x(a, b)
 * and both quantiles, accurate from parameters ~0.1 to a billion.
 *
 * Density and tail prefactor use C. Loader's saddle-point form ("Fast and Accurate Computation of Binomial
 * Probabilities", 2000 — the form R's dbeta uses via dbinom_raw), which keeps full relative precision
 * when a and b are ~1e9 (the naive a·log x + b·log(1 − x) − log B(a, b) loses about seven digits there).
 * The tails use the continued fraction of I_x(a, b) (Numerical Recipes, 3rd ed., §6.4; modified Lentz,
 * W. J. Lentz 1976 as modified by Thompson & Barnett 1986), evaluated on the side where it converges fast and
 * run to a relative change of 1e-15. Pure and stateless.
 *
 * Why one file of ~530 lines: the density, the tails and the quantiles share its private double-double
 * helpers and the one tail evaluation the quantiles invert; apart they would have to export those.
 */
import { StatsError, ensure } from '../errors';
import { gaussLegendre, log1mExp } from '../numeric';
import { binomialDeviance, binomialDevianceSeries, digamma, logBeta, stirlingError, trigamma } from './gamma';
import { normalQuantile } from './normal';

const LOG_2PI = 1.8378770664093454836;
/** Iteration cap of the continued fraction: far above the ~√max(a, b)·few needed at a, b ~ 1e9. */
const MAX_FRACTION_TERMS = 1_000_000;
const FRACTION_TOLERANCE = 1e-15;
const TINY = 1e-300;

function checkShapes(a: number, b: number, name: string): void {
  ensure(
    a > 0 && b > 0 && Number.isFinite(a) && Number.isFinite(b),
    `${name} needs finite shape parameters a > 0 and b > 0, got a = ${a}, b = ${b}`,
  );
}

/** log x and log(1 − x) from x and its complement y = 1 − x, each from whichever is the accurate input. */
function logPair(x: number, y: number): [number, number] {
  return [x < 0.5 ? Math.log(x) : Math.log1p(-y), y < 0.5 ? Math.log(y) : Math.log1p(-x)];
}

/**
 * Loader's binomial deviance bd0(k, M) = k log(k/M) + M − k (see binomialDeviance in gamma.ts) for M
 * given as a double-double, so that k − M, the quantity the series hinges on, is exact.
 */
function devianceTo(k: number, M: Double2): number {
  const total = M[0] + M[1];
  if (Math.abs(k - total) >= 0.1 * (k + total)) return binomialDeviance(k, total);
  const difference = add2([k, 0], [-M[0], -M[1]]);
  return binomialDevianceSeries(difference[0] + difference[1], k, k + total);
}

/**
 * Loader's saddle-point log of the binomial term Γ(k + m + 1)/(Γ(k + 1)Γ(m + 1)) p^k q^m for real k, m > 0
 * and p + q = 1 (R's dbinom_raw with n = k + m): δ(n) − δ(k) − δ(m) − bd0(k, np) − bd0(m, nq)
 * − ½ log(2π k m/n). The means np and nq are formed in double-double from n = k + m (exact) and the
 * smaller of p, q, the larger being taken as exactly 1 − the smaller: at n ~ 1e9 one rounding of n·p,
 * of n or of 1 − p would otherwise move the log density by up to ~1e-11. Returns NaN when np or nq
 * underflow, so the caller can fall back.
 */
function logBinomialTerm(k: number, m: number, p: number, q: number): number {
  const n2 = twoSum(k, m);
  const n = n2[0] + n2[1];
  if (!(n * p > 1e-280 && n * q > 1e-280)) return NaN;
  const small = Math.min(p, q);
  const nSmall = add2(twoProduct(n2[0], small), twoProduct(n2[1], small));
  const nLarge = add2(n2, [-nSmall[0], -nSmall[1]]);
  const [np, nq] = p <= q ? [nSmall, nLarge] : [nLarge, nSmall];
  const lc = stirlingError(n) - stirlingError(k) - stirlingError(m) - devianceTo(k, np) - devianceTo(m, nq);
  const lf = LOG_2PI + Math.log(k) + Math.log(m) - Math.log(n);
  return lc - 0.5 * lf;
}

/** log of the Beta(a, b) density at 0 < x < 1, given also y = 1 − x. */
function logDensityPair(x: number, y: number, a: number, b: number): number {
  if (a > 2 && b > 2) {
    const saddle = logBinomialTerm(a - 1, b - 1, x, y);
    if (!Number.isNaN(saddle)) return Math.log(a + b - 1) + saddle;
  }
  const [logX, logY] = logPair(x, y);
  return (a - 1) * logX + (b - 1) * logY - logBeta(a, b);
}

/** log of the continued-fraction prefactor x^a y^b / (a B(a, b)). */
function logPrefactor(x: number, y: number, a: number, b: number): number {
  if (a >= 2 && b >= 2) {
    // x^a y^b / (a B(a, b)) = [Γ(a+b+1)/(Γ(a+1)Γ(b+1)) x^a y^b] · b/(a+b)
    const saddle = logBinomialTerm(a, b, x, y);
    if (!Number.isNaN(saddle)) return saddle + Math.log(b / (a + b));
  }
  const [logX, logY] = logPair(x, y);
  return a * logX + b * logY - logBeta(a, b) - Math.log(a);
}

/**
 * The continued fraction of I_x(a, b) / prefactor (Numerical Recipes §6.4, modified Lentz), run until a
 * convergent changes by less than 1e-15 relative.
 */
function betaFraction(x: number, y: number, a: number, b: number): number {
  const sum = a + b;
  let c = 1;
  // 1 − (a + b)x/(a + 1), written with y = 1 − x where x is near 1 (the difference is then ~y, and x
  // itself, a double next to 1, no longer carries those digits).
  let d = x < 0.5 ? 1 - (sum * x) / (a + 1) : (1 - b + sum * y) / (a + 1);
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= MAX_FRACTION_TERMS; m++) {
    const m2 = 2 * m;
    let coefficient = (m * (b - m) * x) / ((a - 1 + m2) * (a + m2));
    d = 1 + coefficient * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + coefficient / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    coefficient = (-(a + m) * (sum + m) * x) / ((a + m2) * (a + 1 + m2));
    d = 1 + coefficient * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + coefficient / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const change = d * c;
    h *= change;
    if (Math.abs(change - 1) <= FRACTION_TOLERANCE) return h;
  }
  throw new StatsError(
    'not_available',
    `the incomplete beta continued fraction did not converge for x = ${x}, a = ${a}, b = ${b}`,
  );
}

/**
 * log I_x(a, b) (upper = false) or log(1 − I_x(a, b)) (upper = true) for 0 ≤ x ≤ 1 given with its
 * complement y = 1 − x (pass y exactly when you have it, e.g. t²/(ν + t²)).
 *
 * Method: the continued fraction of whichever of I_x(a, b), I_y(b, a) converges fast
 * (x < (a + 1)/(a + b + 2) picks the first), times Loader's saddle-point prefactor, in logs; the other
 * tail by log(1 − e^l), so each tail is direct wherever it is the small one. When the fast fraction's
 * variable is a double next to 1 and the density is narrow (large counts, within one standard deviation
 * past the mirror point), the fraction in the small variable a little before the mirror point plus a
 * Gauss–Legendre integral of the density is used instead (see bridgeLowerW), and further out the
 * fraction runs in double-double arithmetic (betaFractionNearOne). When both shapes are ≥ 1e5 and x is
 * within 10 standard deviations of the mean, the smaller tail is instead a Gauss–Legendre integral of
 * the density (centralBetaTail). Measured against mpmath (test/stats/special, 172 points, shapes
 * 0.1 … 1e9): absolute error ≤ 3.5e-15 and smaller-tail relative error ≤ 1.5e-12 down to 1e-300.
 * Cost: O(√max(a, b)) fraction terms near the centre (≈ 2000 at a = 5e7, b = 9.5e8); measured on one
 * core: 10 µs at (8, 42), 60–250 µs at shapes 1e6–1e9, up to ~200 µs in the double-double tail.
 * Throws StatsError('invalid_argument') for a bad a, b or x; StatsError('not_available') if the fraction
 * does not converge within 1e6 terms (not observed for a, b ≤ 1e10).
 * @example Math.exp(betaTailLog(0.2, 0.8, 8, 42, false)) //=> 0.7908826978300284
 */
export function betaTailLog(x: number, y: number, a: number, b: number, upper: boolean): number {
  checkShapes(a, b, 'betaTailLog');
  ensure(
    x >= 0 && y >= 0 && Math.abs(x + y - 1) <= 1e-12,
    `betaTailLog needs 0 ≤ x ≤ 1 with y = 1 − x, got x = ${x}, y = ${y}`,
  );
  if (x === 0) return upper ? 0 : -Infinity;
  if (y === 0) return upper ? -Infinity : 0;
  // The fraction of I_x(a, b) converges fast for x < (a + 1)/(a + b + 2); otherwise use I_y(b, a).
  // Write the chosen one as P(V ≤ v) for V ~ Beta(p, q), and W = 1 − V ~ Beta(q, p).
  const central = centralBetaTail(x, y, a, b);
  if (central !== null) {
    // central = [log P(X ≤ x), log P(X > x)]
    return upper ? central[1] : central[0];
  }
  const lowerSide = x < (a + 1) / (a + b + 2);
  const [v, w, p, q] = lowerSide ? [x, y, a, b] : [y, x, b, a];
  let logFractionSide: number; // log P(V ≤ v)
  let logOtherSide: number; // log P(V > v)
  const bridge = v >= 0.5 ? bridgeLowerW(w, q, p) : NaN;
  if (!Number.isNaN(bridge)) {
    logFractionSide = Math.log1p(-bridge);
    logOtherSide = Math.log(bridge);
  } else {
    // In a variable next to 1 with a narrow density, run the fraction in double-double arithmetic with
    // v = 1 − w held exactly, so that its roundings stay relative to w (see betaFractionNearOne).
    const nearOne = v >= 0.5 && (q * p) / ((p + q) * (p + q) * (p + q + 1)) < 1e-6;
    const fraction = nearOne ? betaFractionNearOne(w, p, q) : betaFraction(v, w, p, q);
    logFractionSide = Math.min(logPrefactor(v, w, p, q) + Math.log(fraction), 0);
    logOtherSide = log1mExp(logFractionSide);
  }
  // lower side: P(V ≤ v) = I_x(a, b); otherwise P(V ≤ v) = I_y(b, a) = 1 − I_x(a, b)
  if (lowerSide) return upper ? logOtherSide : logFractionSide;
  return upper ? logFractionSide : logOtherSide;
}

/**
 * Both tails [log P(X ≤ x), log P(X > x)] near the centre when both shapes are large (min(a, b) ≥ 1e5,
 * x within 10 standard deviations of the mean), or null elsewhere.
 *
 * Method: in the smaller of x, 1 − x (call it t, with T ~ Beta(k, m)), the smaller tail is the integral
 * of the density from t to 16 standard deviations further out (the mass beyond, below e^−100 of it,
 * is dropped), by 16 Gauss–Legendre panels of 16 points in u = t − c around the mean c, the density at
 * c + u taken by Loader's saddle-point form with the binomial means n(c + u) formed exactly in
 * double-double, so neither the nodes nor the means carry the rounding of a value near c. This replaces
 * a continued fraction of ~√max(a, b) terms (and their accumulated rounding, ~5e-12 at 1e9) by 256
 * density evaluations with ~1e-15 absolute error.
 */
function centralBetaTail(x: number, y: number, a: number, b: number): [number, number] | null {
  if (Math.min(a, b) < 1e5) return null;
  const n = a + b;
  const sd = Math.sqrt((a * b) / (n * n * (n + 1)));
  const flip = x > 0.5;
  const [t, k, m] = flip ? [y, b, a] : [x, a, b];
  const c = k / n;
  if (!(Math.abs(t - c) <= 10 * sd) || c > 0.5) return null;
  const offset = t - c; // exact (Sterbenz: t and c are within a factor 2)
  const smallIsLower = t <= c;
  const [from, to] = smallIsLower ? [offset - 16 * sd, offset] : [offset, offset + 16 * sd];
  const panels = 16;
  const width = (to - from) / panels;
  // density of Beta(k, m) at p: (n − 1)·dbinom(k − 1; n − 2, p), Loader's form with the mean (n − 2)p
  const n2 = twoSum(k - 1, m - 1);
  const constant = Math.log(n - 1) + stirlingError(n2[0] + n2[1]) - stirlingError(k - 1) - stirlingError(m - 1);
  const nc = add2(twoProduct(n2[0], c), twoProduct(n2[1], c));
  const lf = LOG_2PI + Math.log(k - 1) + Math.log(m - 1) - Math.log(n2[0] + n2[1]);
  let total = 0;
  for (let panel = 0; panel < panels; panel++) {
    const centre = from + (panel + 0.5) * width;
    let sum = 0;
    for (let i = 0; i < 16; i++) {
      const u = centre + 0.5 * width * (GAUSS_16.nodes[i] as number);
      const np = add2(nc, add2(twoProduct(n2[0], u), twoProduct(n2[1], u)));
      const nq = add2(n2, [-np[0], -np[1]]);
      const logDensity = constant - devianceTo(k - 1, np) - devianceTo(m - 1, nq) - 0.5 * lf;
      sum += (GAUSS_16.weights[i] as number) * Math.exp(logDensity);
    }
    total += 0.5 * width * sum;
  }
  const logSmall = Math.log(Math.min(total, 1));
  const logT = smallIsLower ? [logSmall, log1mExp(logSmall)] : [log1mExp(logSmall), logSmall];
  // P(T ≤ t) is P(X ≤ x) unless flipped, where it is P(X ≥ x)
  return flip ? [logT[1] as number, logT[0] as number] : [logT[0] as number, logT[1] as number];
}

/* Double-double arithmetic (T. J. Dekker, "A floating-point technique for extending the available
 * precision", Numer. Math. 18, 1971; D. H. Bailey's QD library conventions): a value is hi + lo with
 * |lo| ≤ ½ ulp(hi), about 32 significant digits. Used only inside betaFractionNearOne. */
type Double2 = [number, number];
const SPLITTER = 134217729; // 2^27 + 1

function twoSum(a: number, b: number): Double2 {
  const s = a + b;
  const bb = s - a;
  return [s, a - (s - bb) + (b - bb)];
}

function quickTwoSum(a: number, b: number): Double2 {
  const s = a + b;
  return [s, b - (s - a)];
}

function twoProduct(a: number, b: number): Double2 {
  const p = a * b;
  let t = SPLITTER * a;
  const ah = t - (t - a);
  const al = a - ah;
  t = SPLITTER * b;
  const bh = t - (t - b);
  const bl = b - bh;
  return [p, ah * bh - p + ah * bl + al * bh + al * bl];
}

function add2(a: Double2, b: Double2): Double2 {
  const [s, e] = twoSum(a[0], b[0]);
  return quickTwoSum(s, e + a[1] + b[1]);
}

function multiply2(a: Double2, b: Double2): Double2 {
  const [p, e] = twoProduct(a[0], b[0]);
  return quickTwoSum(p, e + a[0] * b[1] + a[1] * b[0]);
}

function divide2(a: Double2, b: Double2): Double2 {
  const q1 = a[0] / b[0];
  const r = add2(a, multiply2(b, [-q1, 0]));
  const q2 = r[0] / b[0];
  const r2 = add2(r, multiply2(b, [-q2, 0]));
  const q3 = r2[0] / b[0];
  return add2(quickTwoSum(q1, q2), [q3, 0]);
}

/**
 * The continued fraction of {@link betaFraction} for I_v(p, q) at v = 1 − w (v ≥ ½), evaluated in
 * double-double arithmetic with v held exactly as 1 − w. In double precision each rounding inside the
 * fraction acts as an absolute error of ~1e-16 in w, which a narrow density (large counts) turns into a
 * relative error of up to ~1e-11 in a far tail; with 32 digits that effect is gone and the result is
 * accurate relative to w. Cost: about 25× a double-precision term; used only in that regime.
 */
function betaFractionNearOne(w: number, p: number, q: number): number {
  const one: Double2 = [1, 0];
  const tiny: Double2 = [TINY, 0];
  const v: Double2 = twoSum(1, -w);
  const sum = twoSum(p, q);
  const clamp = (value: Double2): Double2 => (Math.abs(value[0]) < TINY ? tiny : value);
  let c: Double2 = one;
  // 1 − (p + q)v/(p + 1) = ((1 − q) + (p + q)w)/(p + 1)
  let d = clamp(divide2(add2(twoSum(1, -q), multiply2(sum, [w, 0])), twoSum(p, 1)));
  d = divide2(one, d);
  let h = d;
  for (let m = 1; m <= MAX_FRACTION_TERMS; m++) {
    const m2 = 2 * m;
    let coefficient = divide2(
      multiply2(multiply2([m, 0], twoSum(q, -m)), v),
      multiply2(twoSum(p - 1, m2), twoSum(p, m2)),
    );
    d = clamp(add2(one, multiply2(coefficient, d)));
    c = clamp(add2(one, divide2(coefficient, c)));
    d = divide2(one, d);
    h = multiply2(h, multiply2(d, c));
    coefficient = divide2(
      multiply2(multiply2(twoSum(p, m), add2(sum, [m, 0])), [-v[0], -v[1]]),
      multiply2(twoSum(p, m2), twoSum(p + 1, m2)),
    );
    d = clamp(add2(one, multiply2(coefficient, d)));
    c = clamp(add2(one, divide2(coefficient, c)));
    d = divide2(one, d);
    const change = multiply2(d, c);
    h = multiply2(h, change);
    if (Math.abs(change[0] - 1 + change[1]) <= FRACTION_TOLERANCE) return h[0] + h[1];
  }
  throw new StatsError(
    'not_available',
    `the incomplete beta continued fraction did not converge for x = ${1 - w}, a = ${p}, b = ${q}`,
  );
}

/** The 16-point Gauss–Legendre rule on [−1, 1], computed once (an immutable table). */
const GAUSS_16 = gaussLegendre(16);

/**
 * P(W ≤ w) for W ~ Beta(q, p) just above the mirror point w* = (q + 1)/(p + q + 2), when w is small and
 * the density is narrow, or NaN when this bridge is not needed.
 *
 * There the fast continued fraction is the one in v = 1 − w, a double next to 1: each of its roundings
 * acts as an absolute error of 1e-16 in w, which the narrow density turns into up to ~1e-9 in the
 * probability (measured at q = 12345.5, p = 1e9). Instead: the fraction in w itself at a point w₀ a little
 * below w* (where it converges fast and its roundings are relative to w), plus the integral of the
 * density from w₀ to w by 16-point Gauss–Legendre panels no wider than one standard deviation. Used
 * while w is within one standard deviation above w* (so P(W > w) ≳ 0.15 keeps its digits when taken from
 * 1 − P(W ≤ w)) and the standard deviation is below 1e-3 (where the
 * effect is below 1e-13 anyway); further out the fraction in v runs in double-double arithmetic
 * (betaFractionNearOne).
 */
function bridgeLowerW(w: number, q: number, p: number): number {
  const n = p + q;
  const sd = Math.sqrt((q * p) / (n * n * (n + 1)));
  const mirror = (q + 1) / (n + 2);
  if (!(sd < 1e-3) || w > mirror + sd || w <= mirror) return NaN;
  const start = mirror - 2 * sd > 0.5 * mirror ? mirror - 2 * sd : 0.5 * mirror;
  let total = Math.exp(
    Math.min(logPrefactor(start, 1 - start, q, p) + Math.log(betaFraction(start, 1 - start, q, p)), 0),
  );
  const panels = Math.max(1, Math.ceil((w - start) / sd));
  const width = (w - start) / panels;
  for (let panel = 0; panel < panels; panel++) {
    const centre = start + (panel + 0.5) * width;
    let sum = 0;
    for (let i = 0; i < 16; i++) {
      const t = centre + 0.5 * width * (GAUSS_16.nodes[i] as number);
      sum += (GAUSS_16.weights[i] as number) * Math.exp(logDensityPair(t, 1 - t, q, p));
    }
    total += 0.5 * width * sum;
  }
  return Math.min(total, 1);
}

function checkPoint(x: number, name: string): void {
  ensure(!Number.isNaN(x), `${name} needs a number x, got NaN`);
}

/**
 * log of the Beta(a, b) density at x.
 *
 * Method: for a, b > 2 Loader's saddle-point form (R's dbeta via dbinom_raw):
 * log(a + b − 1) + log dbinom_raw(a − 1; a + b − 2, x), with the binomial means formed in double-double;
 * otherwise (a − 1) log x + (b − 1) log(1 − x) − log B(a, b). Measured against mpmath: error of the log
 * density ≤ 1.2e-14 relative, ≤ 5e-13 absolute (at log densities of −450, a = b = 1e9). Cost: O(1).
 * Returns −Infinity outside [0, 1]; at x = 0 or 1 the exact limit (+Infinity for a shape below 1).
 * Throws StatsError('invalid_argument') for a ≤ 0, b ≤ 0, non-finite shapes or NaN x.
 * @example betaLogDensity(0.5, 8, 10) //=> 1.08772972003088 (density 2.967529296875)
 */
export function betaLogDensity(x: number, a: number, b: number): number {
  checkShapes(a, b, 'betaLogDensity');
  checkPoint(x, 'betaLogDensity');
  if (x < 0 || x > 1) return -Infinity;
  if (x === 0) return a < 1 ? Infinity : a === 1 ? Math.log(b) : -Infinity;
  if (x === 1) return b < 1 ? Infinity : b === 1 ? Math.log(a) : -Infinity;
  return logDensityPair(x, 1 - x, a, b);
}

/**
 * The Beta(a, b) distribution function I_x(a, b) = P(X ≤ x), the regularized incomplete beta function.
 *
 * Method: see {@link betaTailLog}: continued fraction on its fast side, Loader's saddle-point prefactor,
 * run to convergence; the lower tail is computed directly whenever it is the smaller one. Measured
 * against mpmath (test/stats/special/incompleteBeta.test.ts, 172 points, shapes 0.1 … 1e9): absolute
 * error ≤ 3.5e-15, relative error of the smaller tail ≤ 1.5e-12 down to 1e-300 (≤ 1e-13 for shapes
 * ≤ 1e4). Cost: O(1) in the tails, O(√max(a, b)) near the
 * centre. Throws StatsError('invalid_argument') for a ≤ 0, b ≤ 0, non-finite shapes or NaN x.
 * Returns 0 for x ≤ 0 and 1 for x ≥ 1.
 * @example betaCdf(0.2, 8, 42) //=> 0.7908826978300284 (R: pbeta(0.2, 8, 42) = 0.790882697830027)
 * @example betaCdf(0.5, 1e9, 1e9) //=> 0.5000000000000018 (exactly ½ by symmetry)
 */
export function betaCdf(x: number, a: number, b: number): number {
  checkShapes(a, b, 'betaCdf');
  checkPoint(x, 'betaCdf');
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  return Math.exp(betaTailLog(x, 1 - x, a, b, false));
}

/**
 * The Beta(a, b) survival function 1 − I_x(a, b) = P(X > x), computed directly (never as 1 − betaCdf
 * when that would cancel).
 *
 * Method and accuracy as {@link betaCdf}, with the roles of the tails swapped. Cost: as betaCdf.
 * Throws StatsError('invalid_argument') for a ≤ 0, b ≤ 0, non-finite shapes or NaN x.
 * Returns 1 for x ≤ 0 and 0 for x ≥ 1.
 * @example betaSf(0.9, 2, 30) //=> 2.7999999999999627e-29 (closed form 0.1³⁰·(0.1 + 31·0.9) = 2.8e-29)
 */
export function betaSf(x: number, a: number, b: number): number {
  checkShapes(a, b, 'betaSf');
  checkPoint(x, 'betaSf');
  if (x <= 0) return 1;
  if (x >= 1) return 0;
  return Math.exp(betaTailLog(x, 1 - x, a, b, true));
}

/** The logistic function and its complement, each computed directly: [1/(1+e^−z), 1/(1+e^z)]. */
function logisticPair(z: number): [number, number] {
  return [1 / (1 + Math.exp(-z)), 1 / (1 + Math.exp(z))];
}

/**
 * The Beta(a, b) quantile as the pair [x, 1 − x] (each with full relative precision): the solution of
 * I_x(a, b) = target (upper = false) or 1 − I_x(a, b) = target (upper = true); use it on the smaller tail.
 *
 * Method: start from the normal approximation of z = logit X, whose mean and variance are exactly
 * ψ(a) − ψ(b) and ψ′(a) + ψ′(b); then Newton's method in z on g(z) = log tail(z) − log target. The density
 * of logit X is log-concave for all a, b > 0, so the log of either tail is concave in z and Newton's method
 * converges monotonically after its first step; a bracket is kept and bisection used should rounding ever
 * push a step outside it. Each step updates x and 1 − x multiplicatively (x ← x/(x + (1 − x)e^(−Δz))), so
 * neither loses precision to the representation of z. Deterministic. Cost: typically 4–8 evaluations of
 * {@link betaTailLog}. Throws StatsError('invalid_argument') for bad shapes or a target outside (0, 1).
 * @example betaQuantilePair(0.5, 3, 3, false) //=> [0.5, 0.49999999999999994]
 */
export function betaQuantilePair(target: number, a: number, b: number, upper: boolean): [number, number] {
  checkShapes(a, b, 'betaQuantilePair');
  ensure(target > 0 && target < 1, `betaQuantilePair needs a tail probability strictly between 0 and 1, got ${target}`);
  const logTarget = Math.log(target);
  const sign = upper ? -1 : 1;
  const centre = digamma(a) - digamma(b);
  const spread = Math.sqrt(trigamma(a) + trigamma(b));
  const start = centre + sign * spread * (target < 0.5 ? normalQuantile(target) : -normalQuantile(1 - target));
  let [x, y] = logisticPair(Math.min(Math.max(start, -745), 745));
  // The bracket [lo, hi] in z where G(z) = sign·(log tail − log target), increasing in z, changes sign.
  let lo = -Infinity;
  let hi = Infinity;
  let stride = 1;
  let previousStep = Infinity;
  for (let iteration = 0; iteration < 200; iteration++) {
    const logX = x < 0.5 ? Math.log(x) : Math.log1p(-y);
    const logY = y < 0.5 ? Math.log(y) : Math.log1p(-x);
    const z = logX - logY;
    let value: number;
    let slope: number;
    if (x === 0 || y === 0) {
      // Beyond the double range of x or 1 − x the tail is exactly 0 or 1 to double precision.
      const logTail = x === 0 ? (upper ? 0 : -Infinity) : upper ? -Infinity : 0;
      value = sign * (logTail - logTarget);
      slope = NaN;
    } else {
      const logTail = betaTailLog(x, y, a, b, upper);
      value = sign * (logTail - logTarget);
      slope = Math.exp(logDensityPair(x, y, a, b) + logX + logY - logTail);
    }
    if (value === 0) return [x, y];
    if (value < 0) lo = Math.max(lo, x === 0 ? -745 : z);
    else hi = Math.min(hi, y === 0 ? 745 : z);
    if (lo >= 745) return [1, 0];
    if (hi <= -745) return [0, 1];
    let step = -value / slope;
    // Small steps are Newton's quadratic phase and stay inside; only large ones are checked (in z, where
    // a step below the spacing of z would look like no move at all).
    if (!Number.isFinite(step) || (Math.abs(step) > 1e-6 && (z + step <= lo || z + step >= hi))) {
      let next: number;
      if (Number.isFinite(lo) && Number.isFinite(hi)) next = 0.5 * (lo + hi);
      else if (Number.isFinite(lo)) next = lo + stride;
      else next = hi - stride;
      stride *= 2;
      [x, y] = logisticPair(next);
      if (Number.isFinite(lo) && Number.isFinite(hi) && hi - lo <= 4e-16 * Math.max(1, Math.abs(next))) return [x, y];
      continue;
    }
    // x/(x + y e^−step) and y/(y + x e^step), in the form that cannot overflow.
    if (step > 0) {
      const shrink = Math.exp(-step);
      [x, y] = [x / (x + y * shrink), (y * shrink) / (x + y * shrink)];
    } else {
      const grow = Math.exp(step);
      [x, y] = [(x * grow) / (x * grow + y), y / (x * grow + y)];
    }
    // Converged, or down to the rounding noise of the tail (steps no longer shrinking).
    if (Math.abs(step) <= 2e-16 || (Math.abs(value) < 1e-6 && Math.abs(step) > 0.5 * previousStep)) return [x, y];
    previousStep = Math.abs(step);
  }
  return [x, y];
}

function checkProbability(p: number, name: string): void {
  ensure(p >= 0 && p <= 1, `${name} needs a probability between 0 and 1, got ${p}`);
}

/**
 * The Beta(a, b) quantile: the x with I_x(a, b) = p.
 *
 * Method: {@link betaQuantilePair} on the smaller tail (p itself for p ≤ ½, 1 − p — exact there —
 * above), so betaCdf(betaQuantile(p)) = p to ~1e-13 relative in the smaller tail, limited only by the
 * spacing of doubles near x (the condition number x·f(x)/F(x) grows like √(a + b)). Cost: about 4–8
 * incomplete-beta evaluations. Throws StatsError('invalid_argument') for bad shapes or p outside [0, 1].
 * betaQuantile(0) = 0, betaQuantile(1) = 1.
 * @example betaQuantile(0.9, 0.1, 10) //=> 0.027469622296097975 (R: qbeta(0.9, 0.1, 10) = 0.0274696222960978)
 */
export function betaQuantile(p: number, a: number, b: number): number {
  checkShapes(a, b, 'betaQuantile');
  checkProbability(p, 'betaQuantile');
  if (p === 0) return 0;
  if (p === 1) return 1;
  return (p <= 0.5 ? betaQuantilePair(p, a, b, false) : betaQuantilePair(1 - p, a, b, true))[0];
}

/**
 * The upper Beta(a, b) quantile: the x with 1 − I_x(a, b) = q, so that betaSf(x, a, b) = q; accurate for
 * q near 0 where betaQuantile(1 − q) would lose digits.
 *
 * Method and cost as {@link betaQuantile}. Throws StatsError('invalid_argument') for bad shapes or q
 * outside [0, 1]. betaQuantileUpper(0) = 1, betaQuantileUpper(1) = 0.
 * @example betaQuantileUpper(0.5, 2, 2) //=> 0.5
 */
export function betaQuantileUpper(q: number, a: number, b: number): number {
  checkShapes(a, b, 'betaQuantileUpper');
  checkProbability(q, 'betaQuantileUpper');
  if (q === 0) return 1;
  if (q === 1) return 0;
  return (q <= 0.5 ? betaQuantilePair(q, a, b, true) : betaQuantilePair(1 - q, a, b, false))[0];
}
