/**
 * The read-out's decision on the lattice of outcomes of a two-variant test with n visitors per variant:
 * P(challenger beats control) at every pair of counts (x_A, x_B), walked one count at a time by exact
 * recurrences, and the decision power of one look computed on that walk. The planning functions for tests
 * that are looked at more than once (looks.ts, looksExact.ts) and the smallest detectable lift
 * (detectableLift.ts) are built on it.
 *
 * P(B beats A) is g = P(p_B > p_A) for the posteriors p_A ~ Beta(a_A, b_A), p_B ~ Beta(a_B, b_B), with
 * a = α + x and b = β + n − x under a Beta(α, β) prior. One count more for either variant changes g by a
 * closed-form amount (J. D. Cook, "Exact calculation of beta inequalities", 2005; the same identities give
 * Evan Miller's sum):
 *   g(x_A, x_B + 1) − g(x_A, x_B) = H / a_B,   g(x_A, x_B) − g(x_A + 1, x_B) = H / a_A,
 *   H = B(a_A + a_B, b_A + b_B − 1) / (B(a_A, b_A) B(a_B, b_B)),
 * (from I_x(a, b) − I_x(a + 1, b − 1) = x^a (1 − x)^(b−1) / (a B(a, b)), integrated against the other
 * density), and H itself changes by a rational factor per step. On the diagonal x_A = x_B both posteriors
 * are the same and g = ½ exactly; a walk starts there with H from Stirling-series terms that carry no
 * cancellation (so H is accurate to ~1e-14 relative even at 1e10 visitors) and moves outwards. Every value
 * of g on a walk is ½ plus a sum of positive terms: absolute error about (steps)·1e-16, for any prior
 * (whole or fractional shapes alike) and without quadrature.
 */
import { ensure } from './errors';
import { logBeta, stirlingError } from './special/gamma';
import { betaLogDensity } from './special/incompleteBeta';
import type { BetaPrior } from './types';

/** A binomial pmf on the window [lo, hi] of counts outside which every pmf value is below 1e-16 of the peak. */
export interface BinomialWindow {
  readonly lo: number;
  readonly hi: number;
  /** pmf[k − lo] = P(X = k) for k in [lo, hi]. */
  readonly pmf: Float64Array;
}

const WINDOW_CUTOFF = 1e-16;
/** Counts between fresh saddle-point values of the pmf (each costs up to ~70 µs). */
const ANCHOR_EVERY = 16384;
const HALF_LOG_2PI = 0.5 * Math.log(2 * Math.PI);

/**
 * The Binomial(n, p) pmf on the window of counts where it is at least `cutoff` (default 1e-16) of its peak
 * (the mass outside is below ~1e-15 at the default). Values from Loader's saddle-point density ({@link betaLogDensity}) every 16384 counts
 * and the ratio pmf(k + 1)/pmf(k) = (n − k)/(k + 1)·p/(1 − p) in between (a relative drift below 1e-11).
 * Cost: O(√(n p (1 − p)) + 1) values. Needs a whole n ≥ 1 and 0 < p < 1 (checked by the callers).
 * @example binomialWindow(4, 0.5).pmf //=> Float64Array [0.0625, 0.25, 0.375, 0.25, 0.0625] (the binomial coefficients over 16)
 */
export function binomialWindow(n: number, p: number, cutoff = WINDOW_CUTOFF): BinomialWindow {
  const logScale = Math.log(n + 1);
  const logPmf = (k: number): number => betaLogDensity(p, k + 1, n - k + 1) - logScale;
  const odds = p / (1 - p);
  const mode = Math.min(n, Math.floor((n + 1) * p));
  const peak = Math.exp(logPmf(mode));
  const floor = peak * cutoff;
  // Each side fits in 9 standard deviations plus 40 counts (a Poisson(1) pmf is below 1e-16 of its peak
  // from 19 on): one buffer holds both sides around the peak at `room`, so the window is a view of it with no
  // copy (a second buffer is made only if a side is ever longer).
  const room = Math.min(n + 1, Math.ceil(9 * Math.sqrt(n * p * (1 - p))) + 40);
  let buffer: Float64Array = new Float64Array(2 * room + 1);
  let centre = room;
  buffer[centre] = peak;
  let countAbove = 0;
  let v = peak;
  let k = mode;
  let untilAnchor = ANCHOR_EVERY;
  while (k < n) {
    if (--untilAnchor === 0) {
      untilAnchor = ANCHOR_EVERY;
      v = Math.exp(logPmf(k + 1));
    } else v *= ((n - k) * odds) / (k + 1); // the ratio is off the chain of v: divisions overlap
    if (v < floor) break;
    if (centre + countAbove + 1 === buffer.length) buffer = widened(buffer, centre, centre + countAbove, 0);
    buffer[centre + ++countAbove] = v;
    k++;
  }
  let countBelow = 0;
  v = peak;
  k = mode;
  untilAnchor = ANCHOR_EVERY;
  while (k > 0) {
    if (--untilAnchor === 0) {
      untilAnchor = ANCHOR_EVERY;
      v = Math.exp(logPmf(k - 1));
    } else v *= k / ((n - k + 1) * odds);
    if (v < floor) break;
    if (countBelow === centre) {
      const extra = centre + 16;
      buffer = widened(buffer, centre - countBelow, centre + countAbove, extra);
      centre += extra;
    }
    buffer[centre - ++countBelow] = v;
    k--;
  }
  const lo = mode - countBelow;
  const pmf = buffer.subarray(centre - countBelow, centre + countAbove + 1);
  return { lo, hi: lo + pmf.length - 1, pmf };
}

/**
 * A copy of values[from … to] into a buffer twice as long, `before` places further from its start (room for
 * more values below when before > 0, above otherwise).
 */
function widened(values: Float64Array, from: number, to: number, before: number): Float64Array {
  const next = new Float64Array(2 * values.length + 16);
  next.set(values.subarray(from, to + 1), from + before);
  return next;
}

/**
 * Σ_j P(X = j)·weight(j) for X ~ Binomial(n, p), with weight(j) = weights[j − first] on the table,
 * 0 below it and `above` beyond it: one pass over the window of the pmf (as {@link binomialWindow}, ratio
 * recurrences from the mode with a saddle-point value every 16384 counts), without storing it.
 * Cost: O(√(n p (1 − p)) + 1), no allocation.
 */
export function binomialWeightedSum(n: number, p: number, weights: Float64Array, first: number, above: number): number {
  const logScale = Math.log(n + 1);
  const logPmf = (k: number): number => betaLogDensity(p, k + 1, n - k + 1) - logScale;
  const odds = p / (1 - p);
  const mode = Math.min(n, Math.floor((n + 1) * p));
  const last = first + weights.length - 1;
  const weight = (k: number): number => (k < first ? 0 : k > last ? above : (weights[k - first] as number));
  const peak = Math.exp(logPmf(mode));
  const floor = peak * WINDOW_CUTOFF;
  let sum = peak * weight(mode);
  for (const direction of [1, -1]) {
    let v = peak;
    let k = mode;
    let untilAnchor = ANCHOR_EVERY;
    for (;;) {
      if (direction > 0 ? k >= n : k <= 0) break;
      if (--untilAnchor === 0) {
        untilAnchor = ANCHOR_EVERY;
        v = Math.exp(logPmf(k + direction));
      } else v *= direction > 0 ? ((n - k) * odds) / (k + 1) : k / ((n - k + 1) * odds);
      if (v < floor) break;
      k += direction;
      sum += v * weight(k);
    }
  }
  return sum;
}

/**
 * Upper tails of a window: tail[c − lo] = P(X ≥ c) for c in [lo, hi + 1], summed from the top (so the small
 * tails keep their relative accuracy). P(X ≥ c) is taken as tail[0] for c < lo and 0 for c > hi.
 */
export function upperTails(window: BinomialWindow): Float64Array {
  const size = window.pmf.length;
  const tails = new Float64Array(size + 1);
  let sum = 0;
  for (let i = size - 1; i >= 0; i--) {
    sum += window.pmf[i] as number;
    tails[i] = sum;
  }
  return tails;
}

/**
 * log H on the diagonal x_A = x_B = x, where both posteriors are Beta(a, b): H = B(2a, 2b − 1)/B(a, b)².
 * Written with Stirling's series so that no large logarithms cancel:
 * log H = −½ log 4π + ½ log(a c / b) + (2b − 3/2) log1p(−1/(2b)) − (2c − 3/2) log1p(−1/(2c))
 *         + δ(2a) + δ(2b − 1) − δ(2c − 1) − 2δ(a) − 2δ(b) + 2δ(c),   c = a + b,
 * with δ Loader's Stirling error (log Γ(x) = (x − ½) log x − x + ½ log 2π + δ(x)).
 * Returns +Infinity where 2b − 1 ≤ 0 (the corner x = n with β ≤ ½, where H is not finite and never used).
 */
function diagonalLogH(a: number, b: number): number {
  if (2 * b - 1 <= 0) return Infinity;
  const c = a + b;
  return (
    -0.5 * Math.log(2) -
    HALF_LOG_2PI +
    0.5 * Math.log((a * c) / b) +
    (2 * b - 1.5) * Math.log1p(-1 / (2 * b)) -
    (2 * c - 1.5) * Math.log1p(-1 / (2 * c)) +
    stirlingError(2 * a) +
    stirlingError(2 * b - 1) -
    stirlingError(2 * c - 1) -
    2 * (stirlingError(a) + stirlingError(b) - stirlingError(c))
  );
}

/**
 * A position on the lattice of one look: P(B beats A) at (xA, xB) with n visitors per variant, moved one
 * count at a time. Start it on the diagonal; every move is O(1) (a few multiplications).
 */
export class DecisionCursor {
  /** P(p_B > p_A | x_A = xA, x_B = xB). */
  probability = 0.5;
  xA: number;
  xB: number;
  private h: number;
  private aA: number;
  private bA: number;
  private aB: number;
  private bB: number;

  /** Starts at the diagonal (x, x), where P(B beats A) = ½ exactly. */
  constructor(
    readonly n: number,
    private readonly prior: BetaPrior,
    x: number,
  ) {
    this.xA = x;
    this.xB = x;
    this.aA = prior.alpha + x;
    this.bA = prior.beta + n - x;
    this.aB = this.aA;
    this.bB = this.bA;
    this.h = Math.exp(diagonalLogH(this.aA, this.bA));
  }

  /** H computed afresh at the current point (used only after leaving the corner where H is infinite). */
  private freshH(): number {
    const r = this.bA + this.bB - 1;
    if (r <= 0) return Infinity;
    return Math.exp(logBeta(this.aA + this.aB, r) - logBeta(this.aA, this.bA) - logBeta(this.aB, this.bB));
  }

  /** x_B → x_B + 1 (needs x_B < n): P rises by H/a_B. */
  upB(): void {
    const { aA, bA, aB, bB } = this;
    this.probability += this.h / aB;
    const s = aA + aB;
    const r = bA + bB - 1;
    this.aB = aB + 1;
    this.bB = bB - 1;
    this.xB++;
    this.h = r - 1 > 0 ? (this.h * s * (bB - 1)) / ((r - 1) * aB) : Infinity;
  }

  /** x_B → x_B − 1 (needs x_B > 0): P falls by H/a_B at the new point. */
  downB(): void {
    const { aA, bA, aB, bB } = this;
    const s = aA + aB;
    const r = bA + bB - 1;
    this.aB = aB - 1;
    this.bB = bB + 1;
    this.xB--;
    this.h = Number.isFinite(this.h) ? (this.h * r * (aB - 1)) / ((s - 1) * bB) : this.freshH();
    this.probability -= this.h / this.aB;
  }

  /** x_A → x_A + 1 (needs x_A < n): P falls by H/a_A. */
  upA(): void {
    const { aA, bA, aB, bB } = this;
    this.probability -= this.h / aA;
    const s = aA + aB;
    const r = bA + bB - 1;
    this.aA = aA + 1;
    this.bA = bA - 1;
    this.xA++;
    this.h = r - 1 > 0 ? (this.h * s * (bA - 1)) / ((r - 1) * aA) : Infinity;
  }

  /** x_A → x_A − 1 (needs x_A > 0): P rises by H/a_A at the new point. */
  downA(): void {
    const { aA, bA, aB, bB } = this;
    const s = aA + aB;
    const r = bA + bB - 1;
    this.aA = aA - 1;
    this.bA = bA + 1;
    this.xA--;
    this.h = Number.isFinite(this.h) ? (this.h * r * (aA - 1)) / ((s - 1) * bA) : this.freshH();
    this.probability += this.h / this.aA;
  }
}

/**
 * P(B beats A) at (xA, xB) by a walk from the diagonal: |xB − xA| steps. For tests and small cases.
 * @example probAboveOnLattice(1000, 50, 65, UNIFORM_PRIOR) //=> 0.9244803789… (Evan Miller's closed form: 0.92448037890258)
 */
export function probAboveOnLattice(n: number, xA: number, xB: number, prior: BetaPrior): number {
  const cursor = new DecisionCursor(n, prior, xA);
  while (cursor.xB < xB) cursor.upB();
  while (cursor.xB > xB) cursor.downB();
  return cursor.probability;
}

/**
 * The boundary of a decision on one look's windows: for each count x_A of windowA (row x_A − windowA.lo), the
 * first count x_B at which P(B beats A) reaches `level` (P ≥ level, or P > level when `strict`), as a
 * column of windowB: 0 when it is reached at windowB.lo or below, the window's width when not within it.
 * The boundary never falls as x_A rises, so it is one walk: from the diagonal of the first row, where P = ½
 * exactly (down from it for a level below ½, but not below B's window), then one row and as many columns
 * up as needed at a time. Any level in (0, 1).
 * Cost: O(rows + columns + distance of the first row's boundary from its diagonal) steps of the cursor.
 * @example boundaryColumns(10, binomialWindow(10, 0.5), binomialWindow(10, 0.5), 0.95, false, UNIFORM_PRIOR)[5] //=> 9 (x_A = 5 needs x_B = 9: P = 0.9683 there, 0.9087 at 8)
 */
export function boundaryColumns(
  n: number,
  windowA: BinomialWindow,
  windowB: BinomialWindow,
  level: number,
  strict: boolean,
  prior: BetaPrior,
): Int32Array {
  const rows = windowA.hi - windowA.lo + 1;
  const width = windowB.hi - windowB.lo + 1;
  const columns = new Int32Array(rows).fill(width);
  const cursor = new DecisionCursor(n, prior, windowA.lo);
  const reached = (): boolean => (strict ? cursor.probability > level : cursor.probability >= level);
  if (reached()) {
    while (cursor.xB > 0 && cursor.xB > windowB.lo) {
      cursor.downB();
      if (!reached()) {
        cursor.upB();
        break;
      }
    }
  }
  for (let i = 0; i < rows; i++) {
    if (i > 0) cursor.upA();
    while (!reached() && cursor.xB < n && cursor.xB <= windowB.hi) cursor.upB();
    if (!reached() || cursor.xB > windowB.hi) break; // no later row reaches it within the window either
    columns[i] = Math.max(cursor.xB - windowB.lo, 0);
  }
  return columns;
}

/**
 * The decision power of one look: P(x_B ≥ c(x_A)) summed over x_A, where c(x_A) is the smallest x_B with
 * P(B beats A) ≥ threshold, for x_A ~ Bin(n, pA), x_B ~ Bin(n, pB). The same quantity as
 * planning.decisionPower (there with baseline pA and lift pB/pA − 1), computed on one walk along the
 * boundary ({@link boundaryColumns}): c never falls as x_A rises, so the walk takes O(√(n p (1 − p))) steps in
 * all. Any threshold in (0, 1): at ½ or below the boundary lies on or below the diagonal.
 * `tailsB` may be passed when the caller already holds upperTails(windowB).
 * Cost: O(window of A + boundary span) steps of a few multiplications; ~16√(n p q) + |z|√(2 n p q) steps, and
 * one array of A's window.
 * Throws StatsError('invalid_argument') for a threshold outside (0, 1).
 * @example lookPower(50, binomialWindow(50, 0.1), binomialWindow(50, 0.15), 0.95, UNIFORM_PRIOR) //=> 0.17864782398… (scipy brute force, planning_power.json: 0.1786478239821182)
 */
export function lookPower(
  n: number,
  windowA: BinomialWindow,
  windowB: BinomialWindow,
  threshold: number,
  prior: BetaPrior,
  tailsB: Float64Array = upperTails(windowB),
): number {
  ensure(threshold > 0 && threshold < 1, `the threshold must be above 0 and below 1, got ${threshold}`);
  const columns = boundaryColumns(n, windowA, windowB, threshold, false, prior);
  const width = windowB.hi - windowB.lo + 1;
  let power = 0;
  for (let i = 0; i < columns.length; i++) {
    const c = columns[i] as number;
    if (c === width) break; // no x_B of B's window declares, nor for any later x_A
    power += (windowA.pmf[i] as number) * (tailsB[c] as number);
  }
  return Math.min(Math.max(power, 0), 1);
}
