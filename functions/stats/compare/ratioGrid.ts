/**
 * The density of the relative lift R = Y/X − 1 (X > 0) on a whole grid of lifts at once, for a chart
 * table: each exact value is an integral (ratio.ts logRatioDensity), so the log density of V = log(1 + R)
 * is evaluated exactly at a few Chebyshev points per piece of the grid and interpolated at the grid's
 * points, wherever a piece's Chebyshev coefficients show that the interpolant is accurate; elsewhere each
 * grid point is evaluated exactly. In v = log(1 + m) the log density is smooth across the whole grid (its
 * singularity at m = −1 becomes a straight tail), so at a thousand visitors one piece of 24 points stands
 * for a hundred or a thousand rows.
 */
import { logRatioDensity } from './ratio';
import type { TabulatedDistribution } from '../quadrature';

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

/** cos((2j + 1)π/(2M)) (descending in [−1, 1]), the barycentric weights and the cosine table. */
const ANGLES = Array.from({ length: POINTS }, (_, j) => ((2 * j + 1) * Math.PI) / (2 * POINTS));
const CHEB_POINTS = Float64Array.from(ANGLES, (a) => Math.cos(a));
const CHEB_WEIGHTS = Float64Array.from(ANGLES, (a, j) => (j % 2 === 0 ? 1 : -1) * Math.sin(a));
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

/** Barycentric interpolation through the values at the first-kind Chebyshev points (Berrut & Trefethen 2004). */
function interpolate(values: Float64Array, t: number): number {
  let numerator = 0;
  let denominator = 0;
  for (let j = 0; j < POINTS; j++) {
    const d = t - (CHEB_POINTS[j] as number);
    if (d === 0) return values[j] as number;
    const w = (CHEB_WEIGHTS[j] as number) / d;
    numerator += w * (values[j] as number);
    denominator += w;
  }
  return numerator / denominator;
}

/** What ratioDensityGrid did: its densities and how many exact integrals they took. */
export interface RatioDensityGrid {
  /** The density of R at each lift of the grid (0 at lifts ≤ −1). */
  readonly densities: number[];
  /** Exact density integrals evaluated (at most 1.5 times the number of lifts above −1). */
  readonly integrals: number;
}

/**
 * The density of R = Y/X − 1 at each lift of an ascending grid. The lifts above −1 are cut into pieces
 * in v = log(1 + m): a piece holding at least 32 lifts is tried with the log density of V exactly at 16
 * Chebyshev points and accepted when its last four coefficients are below 1e-13 (+ 4e-16 of the largest
 * |log density|, its rounding): its lifts then take the interpolated value; else it is halved in v. A
 * piece of fewer lifts, a piece met once the tries have used half as many integrals as there are lifts,
 * and the halves of a piece where an exact value is not finite (a density below ~1e-308) or the
 * coefficients do not fall are evaluated exactly lift by lift. A kink (two uniforms at m = 0) is never
 * interpolated across: its coefficients do not fall.
 * Accuracy: that of the exact values (ratioDensity, ~1e-13 relative); tested against mpmath.
 * Cost: at most 1.5 × (lifts above −1) density integrals; 16 for a thousand lifts at thousands of visitors.
 * Throws StatsError('invalid_argument') unless X is positive for sure (as ratioDensity).
 * @example
 * const [y, x] = [tabulate(betaWorkingDensity(1, 1)), tabulate(betaWorkingDensity(1, 1))]; // two uniforms
 * ratioDensityGrid(y, x, [-1, -0.5, 1]).densities //=> [0, 0.5, 0.125] (1/2 up to m = 0, 1/(2(1 + m)²) above)
 */
export function ratioDensityGrid(
  y: TabulatedDistribution,
  x: TabulatedDistribution,
  grid: readonly number[],
): RatioDensityGrid {
  const densities = grid.map(() => 0);
  let first = 0;
  while (first < grid.length && !((grid[first] as number) > -1)) first++;
  const count = grid.length - first;
  const v = grid.map((m) => (m > -1 ? Math.log1p(m) : -Infinity));
  let integrals = 0;
  let tried = 0;
  const exact = (m: number): number => {
    integrals++;
    return logRatioDensity(y, x, m);
  };
  const direct = (from: number, to: number): void => {
    for (let i = from; i <= to; i++) densities[i] = Math.exp(exact(grid[i] as number));
  };
  const values = new Float64Array(POINTS);
  // Pieces as index ranges [from, to] of the grid, their ends in v the first and last lifts' v.
  const piece = (from: number, to: number): void => {
    const n = to - from + 1;
    const va = v[from] as number;
    const vb = v[to] as number;
    if (n < 2 * POINTS || 2 * (tried + POINTS) > count || !(vb > va)) {
      direct(from, to);
      return;
    }
    tried += POINTS;
    const mid = (va + vb) / 2;
    const half = (vb - va) / 2;
    let largest = 0;
    let finite = true;
    for (let j = 0; j < POINTS; j++) {
      const vj = mid + half * (CHEB_POINTS[j] as number);
      // log h(v) = log g(m) + v: the density of V = log(1 + R) at v, per unit of v.
      const value = exact(Math.expm1(vj)) + vj;
      if (!Number.isFinite(value)) finite = false;
      values[j] = value;
      largest = Math.max(largest, Math.abs(value));
    }
    if (finite && tailCoefficient(values) <= ACCEPT_ABSOLUTE + ACCEPT_RELATIVE * largest) {
      for (let i = from; i <= to; i++) {
        const vi = v[i] as number;
        densities[i] = Math.exp(interpolate(values, Math.max(-1, Math.min(1, (vi - mid) / half))) - vi);
      }
      return;
    }
    // Halve in v: the last lift at or below the middle ends the left piece.
    let split = from;
    while (split < to - 1 && (v[split + 1] as number) <= mid) split++;
    piece(from, split);
    piece(split + 1, to);
  };
  if (count > 0) piece(first, grid.length - 1);
  return { densities, integrals };
}
