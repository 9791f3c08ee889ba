/**
 * A working density whose log is costly to evaluate (each value an integral), made cheap for grid.ts by
 * piecewise Chebyshev interpolation: the log density is evaluated exactly at a few hundred points and
 * interpolated everywhere else, with every piece's accuracy checked from its own Chebyshev coefficients.
 *
 * The tabulation (grid.ts) asks for the log density at ~16 nodes per panel plus slope and curvature at
 * its probe points, some 600–1700 values. A smooth log density (the log of a convolution of log-concave
 * densities is smooth and concave) is reproduced to ~1e-13 by interpolation at 24 Chebyshev points on
 * pieces several standard deviations wide, so 3–10 pieces replace most of those evaluations.
 */
import { StatsError } from './errors';
import type { WorkingDensity } from './types';

/** What an exact evaluation returns: log density (up to a constant), its slope and its curvature (−second derivative). */
export interface DensityPoint {
  readonly logDensity: number;
  readonly slope: number;
  readonly curvature: number;
  /**
   * The rounding noise expected in logDensity, if the evaluation can estimate it (e.g. from how fast its
   * integrand's factor changes with the working point, times the point's own rounding).
   */
  readonly noise?: number;
}

/** A costly working density: exact evaluation in the working variable, and where to start looking. */
export interface ExactDensity {
  /** log density up to a constant, with slope and curvature (these may be approximate to ~1e-6). */
  evaluate(z: number): DensityPoint;
  /** A point near the mode. */
  readonly start: number;
  /**
   * A working point where the density is only finitely often differentiable (pieces end there, and
   * grid.ts's panels are graded towards it), if any.
   */
  readonly kink?: number;
  /** The value mapping and its range (as WorkingDensity). */
  toValue(z: number): number;
  toWorking(x: number): number;
  valueJacobian(z: number): number;
  logJacobianAtValue?(x: number): number;
  readonly valueRange: readonly [number, number];
  readonly exactMean?: number;
}

/** Chebyshev points per piece. */
const POINTS = 24;
/** The window covers log density ≥ −WINDOW (beyond grid.ts's 230, so its window search stays inside). */
const WINDOW = 250;
/** grid.ts's panels are graded towards a kink down to this many standard deviations of the peak. */
const KINK_DEPTH = 1e-5;
/** Budgets: exact evaluations for the mode and for each window end, and pieces tried in all. */
const MODE_BUDGET = 80;
const END_BUDGET = 120;
const PIECE_BUDGET = 400;

/** cos((2j + 1)π/(2M)) (the points, descending in [−1, 1]), the barycentric weights and the DCT table. */
const ANGLES = Array.from({ length: POINTS }, (_, j) => ((2 * j + 1) * Math.PI) / (2 * POINTS));
const CHEB_POINTS = Float64Array.from(ANGLES, (a) => Math.cos(a));
const CHEB_WEIGHTS = Float64Array.from(ANGLES, (a, j) => (j % 2 === 0 ? 1 : -1) * Math.sin(a));
/** COSINES[k·M + j] = cos(k·θ_j): Chebyshev coefficients from values at the points. */
const COSINES = (() => {
  const table = new Float64Array(POINTS * POINTS);
  for (let k = 0; k < POINTS; k++)
    for (let j = 0; j < POINTS; j++) table[k * POINTS + j] = Math.cos(k * (ANGLES[j] as number));
  return table;
})();

/** One interpolated piece [left, right] with the log density, slope and curvature at its points. */
interface Piece {
  readonly left: number;
  readonly right: number;
  readonly logDensity: Float64Array;
  readonly slope: Float64Array;
  readonly curvature: Float64Array;
}

/**
 * The largest of the last four Chebyshev coefficients of the values at the points (the interpolant's
 * error is about this size once the coefficients have decayed: Trefethen, "Approximation Theory and
 * Approximation Practice", 2013, ch. 8; common practice in chebfun).
 */
function tailCoefficient(values: Float64Array): number {
  let most = 0;
  for (let k = POINTS - 4; k < POINTS; k++) {
    let c = 0;
    for (let j = 0; j < POINTS; j++) c += (values[j] as number) * (COSINES[k * POINTS + j] as number);
    most = Math.max(most, Math.abs((2 / POINTS) * c));
  }
  return most;
}

/** Barycentric interpolation (first-kind Chebyshev points; Berrut & Trefethen 2004) at t ∈ [−1, 1]. */
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

function failure(message: string): StatsError {
  return new StatsError('not_available', `the posterior could not be tabulated: ${message}`);
}

/**
 * Builds the interpolated working density of `exact`:
 *  1. the mode, by Newton's method on the slope inside a bracket that the slope's sign shrinks;
 *  2. each end of the window where the log density is WINDOW below its peak, by Newton's method in a
 *     bracket (bisection when a step leaves it; doubling the distance while no point outside is known);
 *  3. pieces from the left end: each interpolated at 24 Chebyshev points and accepted when its last four
 *     coefficients are below 1e-12 + 1e-12·d + 1e-11·d² (+ 5e-15 of its deepest point's depth, the
 *     evaluations' rounding), d the depth of its highest point below the peak
 *     (an error ε in the log density there changes probabilities by ~e^-d·ε), 4e-16·|slope|·|z| (the
 *     rounding of the working point itself) and the evaluations' own noise estimate, else a quarter as wide is
 *     tried; the first piece tried is the whole window, and an accepted piece lets the next try twice
 *     its width (at large counts the log density is nearly quadratic: one piece, 24 evaluations).
 * Outside the window (log density below −250, beyond what grid.ts tabulates) the log density continues
 * along its tangent at the nearer end. For a density that is not log-concave (`logConcave`
 * false) the curvature reported is each piece's largest |curvature|, so grid.ts's panels stay narrow
 * across every bend. Everything is deterministic.
 * Cost: ~5–10 exact evaluations for the mode, ~10 per end and 24 per piece tried (typically 4–12 pieces).
 * Throws StatsError('not_available') when a budget (80 steps for the mode, 120 per end, 400 pieces) is
 * exceeded or a value is not a number.
 */
export function chebyshevDensity(exact: ExactDensity, logConcave = true): WorkingDensity {
  // 1. The mode.
  let lo = -Infinity;
  let hi = Infinity;
  let mode = exact.start;
  let found = false;
  let step = 1;
  for (let i = 0; i < MODE_BUDGET; i++) {
    const v = exact.evaluate(mode);
    if (!(Number.isFinite(v.slope) && Number.isFinite(v.logDensity))) throw failure(`no density near ${mode}`);
    if (v.slope === 0) {
      found = true;
      break;
    }
    if (v.slope > 0) lo = mode;
    else hi = mode;
    let next = v.curvature > 0 ? mode + v.slope / v.curvature : NaN;
    if (!(next > lo && next < hi)) {
      next = Number.isFinite(lo) && Number.isFinite(hi) ? (lo + hi) / 2 : mode + (v.slope > 0 ? step : -step);
      step *= 2;
    }
    const scale = v.curvature > 0 ? 1 / Math.sqrt(v.curvature) : Math.abs(next - mode);
    const done = Math.abs(next - mode) <= 1e-9 * scale || hi - lo <= 4 * Number.EPSILON * Math.max(1, Math.abs(mode));
    mode = next;
    if (done) {
      found = true;
      break;
    }
  }
  if (!found) throw failure('its mode was not found');
  const peak = exact.evaluate(mode);
  const top = peak.logDensity;
  const width = peak.curvature > 0 ? 1 / Math.sqrt(peak.curvature) : 1;

  // 2. The window ends: Newton's method on log density + WINDOW from the mode outwards, kept inside the
  // bracket [last point inside, first point outside] (bisection when a step leaves it).
  const end = (direction: 1 | -1): DensityPoint & { readonly z: number } => {
    let inside = 0;
    let outside = Infinity;
    let out = Math.sqrt(2 * WINDOW) * width;
    for (let i = 0; i < END_BUDGET; i++) {
      const z = mode + direction * out;
      const v = exact.evaluate(z);
      const g = v.logDensity - top + WINDOW;
      if (Number.isNaN(g)) throw failure(`the log density is NaN at ${z}`);
      if (Math.abs(g) <= 1e-6) return { z, ...v };
      if (g > 0) inside = out;
      else outside = out;
      // Newton in the distance from the mode (slope of g in it: direction·slope).
      let next = out - g / (direction * v.slope);
      if (!(next > inside && next < outside) || !Number.isFinite(next)) {
        next = Number.isFinite(outside) ? (inside + outside) / 2 : 2 * out;
      }
      if (Math.abs(next - out) <= 1e-12 * Math.max(1, Math.abs(z))) return { z, ...v };
      out = next;
    }
    throw failure('the tail window did not converge');
  };
  const leftEnd = end(-1);
  const rightEnd = end(1);

  // 3. The pieces.
  const pieces: Piece[] = [];
  let a = leftEnd.z;
  const last = rightEnd.z;
  const kink = exact.kink !== undefined && exact.kink > a && exact.kink < last ? exact.kink : undefined;
  let w = last - a;
  for (let tries = 0; a < last; tries++) {
    if (tries >= PIECE_BUDGET) throw failure('its log density is not smooth enough to interpolate');
    // Pieces end at the kink (where the density is only finitely smooth) and at the window's end.
    const b = kink !== undefined && a < kink ? kink : last;
    const right = b - (a + w) < 1e-9 * w ? b : Math.min(b, a + w);
    const half = (right - a) / 2;
    const mid = (right + a) / 2;
    const logDensity = new Float64Array(POINTS);
    const slope = new Float64Array(POINTS);
    const curvature = new Float64Array(POINTS);
    let nearest = Infinity;
    let deepest = 0;
    let conditioning = 0;
    let evaluationNoise = 0;
    for (let j = 0; j < POINTS; j++) {
      const v = exact.evaluate(mid + half * (CHEB_POINTS[j] as number));
      if (!Number.isFinite(v.logDensity))
        throw failure(`the log density is not finite at ${mid + half * (CHEB_POINTS[j] as number)}`);
      logDensity[j] = v.logDensity - top;
      slope[j] = v.slope;
      curvature[j] = v.curvature;
      nearest = Math.min(nearest, Math.abs(v.logDensity - top));
      deepest = Math.max(deepest, Math.abs(v.logDensity - top));
      conditioning = Math.max(
        conditioning,
        Math.abs(v.slope) * Math.max(1, Math.abs(mid + half * (CHEB_POINTS[j] as number))),
      );
      evaluationNoise = Math.max(evaluationNoise, v.noise ?? 0);
    }
    // An error ε in the log density d below the peak moves probabilities by ~e^-d·ε, and tail
    // probabilities ~e^-d by ε relative: allow 1e-12 + 1e-12·d + 1e-11·d² (≤ 5e-12 of any probability,
    // ≤ 1e-6 relative up to d = 300), plus the evaluations' own rounding, ~5e-15 of the largest |log
    // density| on the piece. Far in a tail (d > 30) a piece narrower than 1e-9 of the window is accepted
    // as it is (the evaluations' rounding, not the interpolation, is then what remains). A working point
    // z is itself only known to ~2.2e-16·|z|, which moves the log density by |slope|·that: at a billion
    // counts (slope ~1e5 a few standard deviations out) that floor is ~1e-10, the same as every table's.
    const noise = 4e-16 * conditioning + evaluationNoise;
    const tolerance = 1e-12 + noise + 5e-15 * deepest + 1e-12 * nearest + 1e-11 * nearest * nearest;
    const floor = nearest > 30 && right - a < 1e-9 * (last - leftEnd.z);
    if (tailCoefficient(logDensity) > tolerance && !floor) {
      w /= 4;
      continue;
    }
    pieces.push({ left: a, right, logDensity, slope, curvature });
    a = right;
    w *= 2;
  }
  const lefts = Float64Array.from(pieces, (p) => p.left);
  // Where the log density is not concave, grid.ts's panel rule (width 2/√curvature) must not see a
  // curvature near zero between bends: report each piece's largest |curvature| instead.
  const bends = Float64Array.from(pieces, (p) => p.curvature.reduce((most, c) => Math.max(most, Math.abs(c)), 0));
  const windowLeft = leftEnd.z;
  const windowRight = rightEnd.z;

  /** The piece holding z (binary search), or −1 outside the window. */
  const pieceOf = (z: number): number => {
    if (!(z >= windowLeft && z <= windowRight)) return -1;
    let l = 0;
    let h = lefts.length - 1;
    while (l < h) {
      const m = (l + h + 1) >> 1;
      if ((lefts[m] as number) <= z) l = m;
      else h = m - 1;
    }
    return l;
  };
  // Beyond the window the log density continues along its tangent at the nearer end (only grid.ts's
  // window search looks there, and a line leads its Newton steps straight back inside).
  const beyond = (z: number): DensityPoint => {
    const e = z < windowLeft ? leftEnd : rightEnd;
    return { logDensity: e.logDensity - top + e.slope * (z - e.z), slope: e.slope, curvature: Math.abs(e.curvature) };
  };
  const at = (z: number, pick: (p: Piece) => Float64Array, outside: (v: DensityPoint) => number): number => {
    const i = pieceOf(z);
    if (i < 0) return outside(beyond(z));
    const p = pieces[i] as Piece;
    return interpolate(pick(p), (2 * z - p.left - p.right) / (p.right - p.left));
  };
  const density: WorkingDensity = {
    mode,
    valueRange: exact.valueRange,
    logDensity: (z: number): number => {
      const i = pieceOf(z);
      if (i < 0) return beyond(z).logDensity;
      const p = pieces[i] as Piece;
      return interpolate(p.logDensity, (2 * z - p.left - p.right) / (p.right - p.left));
    },
    slope: (z: number): number =>
      at(
        z,
        (p) => p.slope,
        (v) => v.slope,
      ),
    curvature: (z: number): number => {
      let c: number;
      if (logConcave)
        c = at(
          z,
          (p) => p.curvature,
          (v) => v.curvature,
        );
      else {
        const i = pieceOf(z);
        c = i < 0 ? beyond(z).curvature : (bends[i] as number);
      }
      if (kink === undefined) return c;
      // Panels at most their distance to the kink wide (geometric grading), down to KINK_DEPTH widths.
      const d = Math.max(Math.abs(z - kink), KINK_DEPTH * width);
      return Math.max(c, 4 / (d * d));
    },
    toValue: (z: number): number => exact.toValue(z),
    toWorking: (x: number): number => exact.toWorking(x),
    valueJacobian: (z: number): number => exact.valueJacobian(z),
  };
  const withJacobian =
    exact.logJacobianAtValue !== undefined
      ? {
          ...density,
          logJacobianAtValue: (x: number): number => (exact.logJacobianAtValue as (x: number) => number)(x),
        }
      : density;
  return exact.exactMean !== undefined ? { ...withJacobian, exactMean: exact.exactMean } : withJacobian;
}
