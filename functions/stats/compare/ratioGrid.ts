/**
 * The density of the relative lift R = Y/X − 1 (X > 0) on a whole grid of lifts at once, for a chart
 * table: each exact value is an integral (ratio.ts logRatioDensity), so the log density of V = log(1 + R)
 * is evaluated exactly at a few Chebyshev points per piece of the grid and interpolated at the grid's
 * points, wherever a piece's Chebyshev coefficients show that the interpolant is accurate; elsewhere each
 * grid point is evaluated exactly. In v = log(1 + m) the log density is smooth across the whole grid (its
 * singularity at m = −1 becomes a straight tail), so at a thousand visitors one piece of 16 points stands
 * for a hundred or a thousand rows.
 */
import { barycentric, chebyshevNodes } from '../chebyshevNodes';
import { gaussLegendre, logAddExp } from '../numeric';
import { PANEL_NODES, PANEL_ORDER, panelLogIntegral } from '../quadrature';
import type { TabulatedDistribution } from '../quadrature';
import { factor, forEachPiece, innerEdges } from './factors';
import { PRUNE, xIsBase } from './integrate';
import { logRatioDensity, ratioLogTail, ratioQuantile, ratioQuantileStart } from './ratio';
import type { QuantileOf } from './ratio';

/** Chebyshev points per piece. */
const POINTS = 16;
/**
 * A piece is accepted when its last four Chebyshev coefficients are at most ACCEPT_ABSOLUTE +
 * ACCEPT_RELATIVE·(largest |log density| on it): the interpolant's error in the log density is about
 * that size once the coefficients have decayed (Trefethen, "Approximation Theory and Approximation
 * Practice", 2013, ch. 8; common practice in chebfun), i.e. a relative error in the density of ~1e-13,
 * the size of the exact values' own rounding (the relative part is the rounding of a log density of
 * several hundred).
 */
const ACCEPT_ABSOLUTE = 1e-13;
const ACCEPT_RELATIVE = 4e-16;

/** The POINTS first-kind Chebyshev points (descending in [−1, 1]) with their weights, and the cosine table. */
const NODES = chebyshevNodes(POINTS);
const ANGLES = NODES.angles;
const CHEB_POINTS = NODES.points;
const COSINES = (() => {
  const table = new Float64Array(POINTS * POINTS);
  for (let k = 0; k < POINTS; k++)
    for (let j = 0; j < POINTS; j++) table[k * POINTS + j] = Math.cos(k * (ANGLES[j] as number));
  return table;
})();

/** The largest of the last four Chebyshev coefficients of the values at the points. */
function tailCoefficient(values: Float64Array): number {
  let most = 0;
  for (let k = POINTS - 4; k < POINTS; k++) {
    let c = 0;
    for (let j = 0; j < POINTS; j++) c += (values[j] as number) * (COSINES[k * POINTS + j] as number);
    most = Math.max(most, Math.abs((2 / POINTS) * c));
  }
  return most;
}

/**
 * log of the ratio density at many lifts of one pair: the same integral as ratio.ts logRatioDensity
 * (integrate.ts logIntegral with the one density factor: the same panels in the same order, the same
 * pruning bounds, the same splits at the other's panel edges and the same node values), so the same number
 * to the last bit, with what does not depend on the lift (which posterior is the base, its node values
 * and their logs) found once and no working arrays made per lift.
 */
class PairDensity {
  private readonly base: TabulatedDistribution;
  private readonly other: TabulatedDistribution;
  private readonly baseIsX: boolean;
  private readonly globalBound: number;
  private readonly values = new Float64Array(PANEL_ORDER);
  private readonly breaks: number[] = [];

  constructor(
    private readonly y: TabulatedDistribution,
    private readonly x: TabulatedDistribution,
  ) {
    // The checks of logRatioDensity (a positive denominator), once.
    logRatioDensity(y, x, 0);
    this.baseIsX = xIsBase(x, y);
    this.base = this.baseIsX ? x : y;
    this.other = this.baseIsX ? y : x;
    const src = this.base.source;
    this.globalBound = Math.log(src.toValue(this.base.windowRight)) + this.other.logMaxValueDensity;
  }

  /** log of the density of Y/X − 1 at m > −1. */
  logAt(m: number): number {
    const s = 1 + m;
    // At s = 1 with a shared coordinate logIntegral evaluates the other's density in the working variable.
    if (s === 1) return logRatioDensity(this.y, this.x, m);
    // Over X: ∫ f_X(t) t f_Y(st) dt; over Y: ∫ f_Y(t) t f_X(t/s) dt / s² (as logRatioDensity).
    const scale = this.baseIsX ? s : 1 / s;
    const logOffset = this.baseIsX ? 0 : -2 * Math.log(s);
    const base = this.base;
    const other = this.other;
    const src = base.source;
    const n = PANEL_ORDER;
    const panels = base.panelCount;
    const order = base.panelOrder;
    const mass = base.panelLogMass;
    const nodeLogDensity = base.nodeLogDensity;
    const nodeValue = base.nodeValue;
    const nodeLogValue = base.nodeLogValue;
    const maxDensity = other.logMaxValueDensity;
    const f = factor(other, 'density', scale, 0);
    const values = this.values;
    const breaks = this.breaks;
    let total = -Infinity;
    for (let r = 0; r < panels; r++) {
      const p = order[r] as number;
      const panelMass = mass[p] as number;
      if (panelMass + this.globalBound < total - PRUNE || panelMass === -Infinity) break;
      const bound = panelMass + maxDensity + Math.log(src.toValue(base.edges[p + 1] as number));
      if (bound === -Infinity || bound < total - PRUNE) continue;
      const a = base.edges[p] as number;
      const b = base.edges[p + 1] as number;
      breaks.length = 0;
      innerEdges(base, f, false, a, b, breaks);
      if (breaks.length === 0) {
        for (let k = 0; k < n; k++) {
          const i = p * n + k;
          const logDensity = nodeLogDensity[i] as number;
          if (logDensity === -Infinity) {
            values[k] = -Infinity;
            continue;
          }
          const v = logDensity + (nodeLogValue[i] as number);
          values[k] = v === -Infinity ? v : v + other.logValueDensity(scale * (nodeValue[i] as number) + 0);
        }
        total = logAddExp(total, panelLogIntegral(values, 0, (b - a) / 2));
        continue;
      }
      forEachPiece(a, b, breaks, (mid, half) => {
        for (let k = 0; k < n; k++) {
          const z = mid + half * (PANEL_NODES[k] as number);
          const logDensity = base.logDensityAt(z);
          if (logDensity === -Infinity) {
            values[k] = -Infinity;
            continue;
          }
          const x = src.toValue(z);
          const v = logDensity + Math.log(x);
          values[k] = v === -Infinity ? v : v + other.logValueDensity(scale * x + 0);
        }
        total = logAddExp(total, panelLogIntegral(values, 0, half));
      });
    }
    return total + logOffset;
  }
}

/** log h, the density of V = log(1 + R) per unit of v, on [mid − half, mid + half]: its values at 16 points. */
export interface LogDensityPiece {
  readonly mid: number;
  readonly half: number;
  readonly values: Float64Array;
}

/**
 * log h on [va, vb] from 16 exact values, if its last four Chebyshev coefficients show the interpolant is
 * as accurate as they are (see ACCEPT_ABSOLUTE); undefined otherwise (or where a value is not finite).
 */
function fitPiece(logDensityAt: (m: number) => number, va: number, vb: number): LogDensityPiece | undefined {
  const mid = (va + vb) / 2;
  const half = (vb - va) / 2;
  const values = new Float64Array(POINTS);
  let largest = 0;
  for (let j = 0; j < POINTS; j++) {
    const vj = mid + half * (CHEB_POINTS[j] as number);
    // log h(v) = log g(m) + v: the density of V = log(1 + R) at v, per unit of v.
    const value = logDensityAt(Math.expm1(vj)) + vj;
    if (!Number.isFinite(value)) return undefined;
    values[j] = value;
    largest = Math.max(largest, Math.abs(value));
  }
  return tailCoefficient(values) <= ACCEPT_ABSOLUTE + ACCEPT_RELATIVE * largest ? { mid, half, values } : undefined;
}

/** The interpolated log h at v inside the piece. */
function pieceAt(piece: LogDensityPiece, v: number): number {
  return barycentric(NODES, piece.values, Math.max(-1, Math.min(1, (v - piece.mid) / piece.half)));
}

/** What ratioDensityGrid did: its densities and how many exact integrals they took. */
export interface RatioDensityGrid {
  /** The density of R at each lift of the grid (0 at lifts ≤ −1). */
  readonly densities: number[];
  /** Exact density integrals evaluated (at most 1.25 times the number of lifts above −1). */
  readonly integrals: number;
}

/**
 * The density of R = Y/X − 1 at each lift of an ascending grid. The lifts above −1 are cut into pieces
 * in v = log(1 + m): a piece holding at least 32 lifts is tried with the log density of V exactly at 16
 * Chebyshev points and accepted when its last four coefficients are below 1e-13 (+ 4e-16 of the largest
 * |log density|, its rounding): its lifts then take the interpolated value; else it is halved in v. A
 * piece of fewer lifts, a piece met once the tries would pass a quarter as many integrals as there are
 * lifts, and the halves of a piece where an exact value is not finite (a density below ~1e-308) or the
 * coefficients do not fall are evaluated exactly lift by lift. A kink (two uniforms at m = 0) is never
 * interpolated across: its coefficients do not fall.
 * Accuracy: that of the exact values (ratioDensity, ~1e-13 relative); tested against mpmath.
 * Cost: at most 1.25 × (lifts above −1) density integrals; 16 for a thousand lifts at thousands of visitors.
 * Throws StatsError('invalid_argument') unless X is positive for sure (as ratioDensity).
 * @example
 * const [y, x] = [tabulate(betaWorkingDensity(1, 1)), tabulate(betaWorkingDensity(1, 1))]; // two uniforms
 * ratioDensityGrid(y, x, [-1, -0.5, 1]).densities //=> [0, 0.5, 0.125] (1/2 up to m = 0, 1/(2(1 + m)²) above)
 */
export function ratioDensityGrid(
  y: TabulatedDistribution,
  x: TabulatedDistribution,
  grid: readonly number[],
  known?: LogDensityPiece,
): RatioDensityGrid {
  const densities = grid.map(() => 0);
  let first = 0;
  while (first < grid.length && !((grid[first] as number) > -1)) first++;
  const v = grid.map((m) => (m > -1 ? Math.log1p(m) : -Infinity));
  // The lifts inside a piece already known take its values; the rest (before and after it) are pieced.
  let knownFrom = grid.length;
  let knownTo = grid.length - 1;
  if (known !== undefined) {
    for (let i = first; i < grid.length; i++) {
      const vi = v[i] as number;
      if (Math.abs(vi - known.mid) <= known.half) {
        if (knownFrom === grid.length) knownFrom = i;
        knownTo = i;
        densities[i] = Math.exp(pieceAt(known, vi) - vi);
      }
    }
  }
  const count = grid.length - first - (knownTo - knownFrom + 1);
  let integrals = 0;
  let tried = 0;
  const pair = count > 0 ? new PairDensity(y, x) : undefined;
  const exact = (m: number): number => {
    integrals++;
    return (pair as PairDensity).logAt(m);
  };
  const direct = (from: number, to: number): void => {
    for (let i = from; i <= to; i++) densities[i] = Math.exp(exact(grid[i] as number));
  };
  // Pieces as index ranges [from, to] of the grid, their ends in v the first and last lifts' v.
  const piece = (from: number, to: number): void => {
    const n = to - from + 1;
    const va = v[from] as number;
    const vb = v[to] as number;
    if (n < 2 * POINTS || 4 * (tried + POINTS) > count || !(vb > va)) {
      direct(from, to);
      return;
    }
    tried += POINTS;
    const mid = (va + vb) / 2;
    const fitted = fitPiece(exact, va, vb);
    if (fitted !== undefined) {
      for (let i = from; i <= to; i++) densities[i] = Math.exp(pieceAt(fitted, v[i] as number) - (v[i] as number));
      return;
    }
    // Halve in v: the last lift at or below the middle ends the left piece.
    let split = from;
    while (split < to - 1 && (v[split + 1] as number) <= mid) split++;
    // The half with more lifts first: the tries left are spent where they save the most.
    if (split - from >= to - split - 1) {
      piece(from, split);
      piece(split + 1, to);
    } else {
      piece(split + 1, to);
      piece(from, split);
    }
  };
  if (knownFrom === grid.length) {
    if (count > 0) piece(first, grid.length - 1);
  } else {
    if (knownFrom > first) piece(first, knownFrom - 1);
    if (knownTo < grid.length - 1) piece(knownTo + 1, grid.length - 1);
  }
  return { densities, integrals };
}

/**
 * The widest range of starts (in v = log(1 + lift)) a chart piece is fitted to: wider ranges come from
 * small counts or a control without conversions, whose log h is too far from a polynomial of degree 15
 * across them (measured: last coefficients 1e-3 to 1e-1), so a fit would only cost its 16 integrals.
 */
const MAX_CHART_WIDTH = 1;

/** Sub-intervals of a chart piece for its cumulative integral (each by 16-point Gauss–Legendre). */
const CUMULATIVE_PARTS = 32;
const RULE = gaussLegendre(16);

/** What ratioChartQuantiles found: the lift quantiles, and the piece of log h it used (for the grid). */
export interface RatioChartQuantiles {
  readonly quantiles: number[];
  readonly piece: LogDensityPiece | undefined;
}

/**
 * Quantiles of R = Y/X − 1 for a chart (ratioQuantile, the same roots), with the Newton steps started
 * from the interpolated distribution: log h is fitted (as ratioDensityGrid) on the range of the normal
 * approximations' starts widened by a quarter of its width on each side (when that range is at most 1
 * wide in v), the cdf there is one exact tail at its
 * middle plus the integral of the interpolated density (32 parts of 16-point Gauss–Legendre), and each
 * quantile's start is where that cdf reaches p; such a start is right to ~1e-12, so ratioQuantile
 * accepts its first Newton step after one pass (instead of two to four). Where the fit fails, the middle
 * tail is below 0.001 or a start falls outside the piece, the normal approximation's start is used.
 * X's marginal quantiles for the starts from `xQuantile` when given (as ratioQuantileStart).
 * Cost: 16 density integrals and one tail pass, then one pass a quantile (typically). Errors as
 * ratioQuantile.
 */
export function ratioChartQuantiles(
  y: TabulatedDistribution,
  x: TabulatedDistribution,
  ps: readonly number[],
  xQuantile?: QuantileOf,
): RatioChartQuantiles {
  const starts = ps.map((p) => ratioQuantileStart(y, x, p, xQuantile));
  const plain = (): RatioChartQuantiles => ({
    quantiles: ps.map((p, i) => ratioQuantile(y, x, p, starts[i])),
    piece: undefined,
  });
  const low = Math.min(...starts);
  const high = Math.max(...starts);
  const width = high - low;
  if (!(width > 0 && width <= MAX_CHART_WIDTH)) return plain();
  const pair = new PairDensity(y, x);
  const piece = fitPiece((m) => pair.logAt(m), low - width / 4, high + width / 4);
  if (piece === undefined) return plain();
  const middleCdf = Math.exp(ratioLogTail(y, x, piece.mid, false));
  if (!(middleCdf > 1e-3 && middleCdf < 1 - 1e-3)) return { ...plain(), piece };
  // cumulative[k] = ∫ h from the piece's left end to its k-th part edge.
  const left = piece.mid - piece.half;
  const step = (2 * piece.half) / CUMULATIVE_PARTS;
  const integral = (a: number, b: number): number => {
    let sum = 0;
    for (let j = 0; j < RULE.nodes.length; j++) {
      const t = (a + b) / 2 + ((b - a) / 2) * (RULE.nodes[j] as number);
      sum += (RULE.weights[j] as number) * Math.exp(pieceAt(piece, t));
    }
    return (sum * (b - a)) / 2;
  };
  const cumulative = new Float64Array(CUMULATIVE_PARTS + 1);
  for (let k = 0; k < CUMULATIVE_PARTS; k++) {
    cumulative[k + 1] = (cumulative[k] as number) + integral(left + k * step, left + (k + 1) * step);
  }
  const middle = cumulative[CUMULATIVE_PARTS / 2] as number;
  const quantiles = ps.map((p, i) => {
    // ∫ h from the left end to the quantile, by the cdf at the middle.
    const target = middle + (p - middleCdf);
    let k = 0;
    while (k < CUMULATIVE_PARTS && (cumulative[k + 1] as number) < target) k++;
    if (!(target > 0) || k === CUMULATIVE_PARTS) return ratioQuantile(y, x, p, starts[i]);
    // Newton inside part k on ∫ from its left edge, the derivative h.
    const a = left + k * step;
    const rest = target - (cumulative[k] as number);
    let v = a + (rest / ((cumulative[k + 1] as number) - (cumulative[k] as number))) * step;
    for (let iteration = 0; iteration < 8; iteration++) {
      const next = v - (integral(a, v) - rest) / Math.exp(pieceAt(piece, v));
      if (!Number.isFinite(next)) break;
      const done = Math.abs(next - v) <= 1e-15 * Math.max(1, Math.abs(v));
      v = next;
      if (done) break;
    }
    return ratioQuantile(y, x, p, Number.isFinite(v) ? v : starts[i]);
  });
  return { quantiles, piece };
}
