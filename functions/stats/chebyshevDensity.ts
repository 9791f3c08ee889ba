/**
 * A working density whose log is costly to evaluate (each value an integral), made cheap for grid.ts by
 * piecewise Chebyshev interpolation: the log density is evaluated exactly at a few hundred points and
 * interpolated everywhere else, with every piece's accuracy checked from its own Chebyshev coefficients.
 *
 * The tabulation (grid.ts) asks for the log density at ~16 nodes per panel plus slope and curvature at
 * its probe points, some 600–1700 values. A smooth log density (the log of a convolution of log-concave
 * densities is smooth and concave) is reproduced to ~1e-13 by a polynomial of degree 23 (Hermite: value and
 * slope at 12 Chebyshev points) on pieces several standard deviations wide, so 3–20 pieces replace most of
 * those evaluations.
 */
import { barycentric, chebyshevNodes } from './chebyshevNodes';
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
  /**
   * log density up to a constant, with its slope and curvature. The slope must be as accurate as the value
   * (the pieces are Hermite interpolants of both: the exact derivative of the same quadrature sum is); the
   * curvature may be approximate to ~1e-6 (it only sets panel widths).
   */
  evaluate(z: number): DensityPoint;
  /** A point near the mode. */
  readonly start: number;
  /**
   * True when the model knows its window takes several pieces (a small count: the log density's nearest
   * singularity lies within the window): the first piece tried is then FIRST_SHARE of the window instead
   * of all of it, which would only be rejected.
   */
  readonly severalPieces?: boolean;
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

/** The POINTS first-kind Chebyshev points (descending in [−1, 1]), their angles and barycentric weights. */
const NODES = chebyshevNodes(POINTS);
const ANGLES = NODES.angles;
const CHEB_POINTS = NODES.points;

/**
 * Each piece is found from SAMPLES = POINTS/2 exact evaluations, value and slope at the first-kind Chebyshev
 * points of that order: the Hermite interpolant of degree POINTS − 1 (the slope is the exact derivative of
 * the same quadrature sum, so it is as accurate as the value). Hermite interpolation at Chebyshev points
 * errs like f^(2n)(ξ)·(T_n/2^(n−1))²/(2n)! (the textbook remainder of Hermite interpolation; common
 * practice), within a factor 2 of interpolating 2n values, at half the evaluations. As before, a piece is
 * accepted by its last four Chebyshev coefficients (the interpolant's error is about their size once they
 * have decayed: Trefethen, "Approximation Theory and Approximation Practice", 2013, ch. 8; common practice in
 * chebfun). Its coefficients come from one fixed 24×24 matrix (condition number ~130; a value moves the
 * interpolant at the 24 points by at most its own size, a slope by at most 0.1 of it times the half-width).
 */
const SAMPLES = POINTS / 2;
const SAMPLE_NODES = chebyshevNodes(SAMPLES);
const SAMPLE_ANGLES = SAMPLE_NODES.angles;
const SAMPLE_POINTS = SAMPLE_NODES.points;

/** Inverse of a square matrix (row-major, size n) by Gauss–Jordan elimination with partial pivoting. */
function invert(m: Float64Array, n: number): Float64Array {
  const a = Float64Array.from(m);
  const inv = new Float64Array(n * n);
  for (let i = 0; i < n; i++) inv[i * n + i] = 1;
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++)
      if (Math.abs(a[r * n + col] as number) > Math.abs(a[pivot * n + col] as number)) pivot = r;
    if (pivot !== col) {
      for (let k = 0; k < n; k++) {
        const t = a[col * n + k] as number;
        a[col * n + k] = a[pivot * n + k] as number;
        a[pivot * n + k] = t;
        const u = inv[col * n + k] as number;
        inv[col * n + k] = inv[pivot * n + k] as number;
        inv[pivot * n + k] = u;
      }
    }
    const d = a[col * n + col] as number;
    for (let k = 0; k < n; k++) {
      a[col * n + k] = (a[col * n + k] as number) / d;
      inv[col * n + k] = (inv[col * n + k] as number) / d;
    }
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = a[r * n + col] as number;
      if (f === 0) continue;
      for (let k = 0; k < n; k++) {
        a[r * n + k] = (a[r * n + k] as number) - f * (a[col * n + k] as number);
        inv[r * n + k] = (inv[r * n + k] as number) - f * (inv[col * n + k] as number);
      }
    }
  }
  return inv;
}

/**
 * HERMITE[k·POINTS + i]: Chebyshev coefficient k from the data (values at the SAMPLES points, then
 * half-width × slopes there); VALUES_FROM_DATA and SLOPES_FROM_DATA: the interpolant and its derivative
 * (in t ∈ [−1, 1]) at the POINTS points the pieces keep.
 */
const HERMITE = (() => {
  const n = POINTS;
  const system = new Float64Array(n * n);
  for (let j = 0; j < SAMPLES; j++) {
    const theta = SAMPLE_ANGLES[j] as number;
    for (let k = 0; k < n; k++) {
      system[j * n + k] = Math.cos(k * theta);
      system[(SAMPLES + j) * n + k] = (k * Math.sin(k * theta)) / Math.sin(theta);
    }
  }
  return invert(system, n);
})();
const VALUES_FROM_DATA = new Float64Array(POINTS * POINTS);
const SLOPES_FROM_DATA = new Float64Array(POINTS * POINTS);
for (let i = 0; i < POINTS; i++) {
  const theta = ANGLES[i] as number;
  for (let d = 0; d < POINTS; d++) {
    let value = 0;
    let slope = 0;
    for (let k = 0; k < POINTS; k++) {
      const h = HERMITE[k * POINTS + d] as number;
      value += Math.cos(k * theta) * h;
      slope += ((k * Math.sin(k * theta)) / Math.sin(theta)) * h;
    }
    VALUES_FROM_DATA[i * POINTS + d] = value;
    SLOPES_FROM_DATA[i * POINTS + d] = slope;
  }
}

/**
 * A piece's Chebyshev coefficients and its log density, slope and curvature at the POINTS points, from its
 * data (values, then half-width × slopes at the SAMPLES points) and the curvature there. A function of its
 * own so the engine optimises it early (chebyshevDensity runs once per density, and its loops ran with
 * every intermediate number boxed). Cost O(POINTS²).
 */
function fitPiece(
  data: Float64Array,
  half: number,
  sampleCurvature: Float64Array,
): { coefficients: Float64Array; logDensity: Float64Array; slope: Float64Array; curvature: Float64Array } {
  const coefficients = new Float64Array(POINTS);
  const logDensity = new Float64Array(POINTS);
  const slope = new Float64Array(POINTS);
  const curvature = new Float64Array(POINTS);
  for (let i = 0; i < POINTS; i++) {
    let c = 0;
    let value = 0;
    let derivative = 0;
    for (let d = 0; d < POINTS; d++) {
      const x = data[d] as number;
      c += (HERMITE[i * POINTS + d] as number) * x;
      value += (VALUES_FROM_DATA[i * POINTS + d] as number) * x;
      derivative += (SLOPES_FROM_DATA[i * POINTS + d] as number) * x;
    }
    coefficients[i] = c;
    logDensity[i] = value;
    slope[i] = derivative / half;
    curvature[i] = barycentric(SAMPLE_NODES, sampleCurvature, CHEB_POINTS[i] as number);
  }
  return { coefficients, logDensity, slope, curvature };
}

/** One interpolated piece [left, right] with the log density, slope and curvature at its points. */
interface Piece {
  readonly left: number;
  readonly right: number;
  readonly logDensity: Float64Array;
  readonly slope: Float64Array;
  readonly curvature: Float64Array;
}

/**
 * The first piece's share of the window when the model says it takes several pieces (about what nextWidth
 * predicts after the whole window is rejected at 25–300 orders; a wrong guess costs one try, as before).
 */
const FIRST_SHARE = 0.35;

/** Widths tried for the next piece, as multiples of the last one tried (largest first). */
const WIDTH_LADDER = [4, 2.8, 2, 1.4, 1, 0.7, 0.5, 0.35, 0.25, 0.18, 0.125, 0.09, 0.0625];
/** A width is chosen when its predicted tail coefficient is at most this share of its predicted tolerance. */
const PIECE_SAFETY = 0.01;

/** Where the next piece starts: the depth (below the peak) and slope of the log density there, and the mode. */
interface PieceStart {
  readonly depth: number;
  readonly slope: number;
  readonly mode: number;
}

/**
 * The width of the next piece to try, from the last try (its width and Chebyshev coefficients, whether it
 * was accepted) and where the next piece starts. The coefficients of a function analytic inside the
 * Bernstein ellipse of parameter ρ fall like ρ^-k (Trefethen 2013, ch. 8): ρ is read from the decay between
 * coefficients 2–5 and 10–13 (rounding noise only makes it look smaller, so the estimate errs low), the
 * nearest singularity put at s = (ρ + 1/ρ)/2 half-widths from the middle, and a piece f times as wide
 * predicted to reach ρ' = s' + √(s'² − 1), s' = s/f, with its last four coefficients at C·ρ'^-20. The chosen
 * width is the largest of WIDTH_LADDER whose prediction is within PIECE_SAFETY of the tolerance the piece is
 * predicted to get (its highest point: 0 when it holds the mode; else the start's depth, or towards the mode
 * the tangent's, which for a concave log density lies above it, so that tolerance is never too loose); after a
 * rejection at most half the width. A wrong prediction costs one more try, never accuracy: every piece is
 * still checked. Cost O(POINTS²).
 */
function nextWidth(tried: number, c: Float64Array, accepted: boolean, from: number, start: PieceStart): number {
  let early = 0;
  let late = 0;
  for (let k = 2; k <= 5; k++) early = Math.max(early, Math.abs(c[k] as number));
  for (let k = 10; k <= 13; k++) late = Math.max(late, Math.abs(c[k] as number));
  const rho = early > 0 && late > 0 ? Math.max(1.0001, Math.pow(early / late, 1 / 8)) : 1.0001;
  // C fitted as max |c_k|·ρ^k over k = 2–5 (the largest of them times ρ^5 counted C up to ρ³ too high, so
  // pieces grew by 1.4 at most where 2 was predicted within the safety share).
  let scale = 0;
  for (let k = 2; k <= 5; k++) scale = Math.max(scale, Math.abs(c[k] as number) * Math.pow(rho, k));
  const s = (rho + 1 / rho) / 2;
  const most = accepted ? Infinity : 0.5;
  // A piece that is a straight line to rounding (coefficients 2–5 below 1e-12 of the linear part, as in a
  // power-law tail read in log R) tells nothing of ρ: its late coefficients are rounding noise, which made
  // ρ look like 1 and kept every later piece as narrow as this one. Predicted instead from coefficients
  // 2–5 growing like f^5 in a piece f times as wide (the higher ones stay at the noise).
  const straight = accepted && early <= 1e-12 * Math.max(1, Math.abs(c[0] as number), Math.abs(c[1] as number));
  let chosen = WIDTH_LADDER[WIDTH_LADDER.length - 1] as number;
  for (const f of WIDTH_LADDER) {
    if (f > most) continue;
    const s2 = s / f;
    if (s2 <= 1 && !straight) continue;
    const rho2 = s2 + Math.sqrt(Math.max(0, s2 * s2 - 1));
    const predicted = straight ? early * Math.pow(f, 5) : scale * Math.pow(rho2, -(POINTS - 4));
    const width = f * tried;
    let nearest: number;
    if (from <= start.mode && from + width >= start.mode) nearest = 0;
    else if (from + width < start.mode) nearest = Math.max(0, start.depth - Math.max(0, start.slope) * width);
    else nearest = Math.max(0, start.depth);
    const tolerance = 1e-12 + 1e-12 * nearest + 1e-11 * nearest * nearest;
    if (predicted <= PIECE_SAFETY * tolerance) {
      chosen = f;
      break;
    }
  }
  return chosen * tried;
}

function failure(message: string): StatsError {
  return new StatsError('not_available', `the posterior could not be tabulated: ${message}`);
}

/**
 * Builds the interpolated working density of `exact`:
 *  1. the mode, by Newton's method on the slope inside a bracket that the slope's sign shrinks (towards an
 *     open side at most 1, 2, 4, … per step);
 *  2. each end of the window where the log density is WINDOW below its peak, by Newton's method in a
 *     bracket (bisection when a step leaves it; doubling the distance while no point outside is known);
 *  3. pieces from the left end: each the Hermite interpolant (degree 23) of value and slope at 12 Chebyshev
 *     points, kept as its values at 24, and accepted when its last four
 *     coefficients are below 1e-12 + 1e-12·d + 1e-11·d² (+ 5e-15 of its deepest point's depth, the
 *     evaluations' rounding), d the depth of its highest point below the peak
 *     (an error ε in the log density there changes probabilities by ~e^-d·ε), 4e-16·|slope|·|z| (the
 *     rounding of the working point itself) and the evaluations' own noise estimate; the first piece tried is
 *     the whole window (FIRST_SHARE of it when the model says it takes several), every later width is predicted from the last try's coefficients (nextWidth; after a
 *     rejection at most half as wide) (at large counts the log density is nearly quadratic: one piece, 12
 *     evaluations).
 * Outside the window (log density below −250, beyond what grid.ts tabulates) the log density continues
 * along its tangent at the nearer end. For a density that is not log-concave (`logConcave`
 * false) the curvature reported is each piece's largest |curvature|, so grid.ts's panels stay narrow
 * across every bend. Everything is deterministic.
 * Cost: ~5–10 exact evaluations for the mode, ~10 per end and 12 per piece tried (typically 4–20 pieces).
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
    // A Newton step within 1e-9 of a standard deviation is converged even when it leaves the bracket: at
    // large counts it rounds to no move at all (next = mode = lo), and bisecting on from there took up to
    // 40 more evaluations to close the bracket to a few ulps.
    if (v.curvature > 0 && Math.abs(next - mode) <= 1e-9 / Math.sqrt(v.curvature)) {
      if (next > lo && next < hi) mode = next;
      found = true;
      break;
    }
    // Towards an open side a Newton step goes at most `step` (doubled each time): where the log density is
    // nearly straight (a rate piled against p = 1 before a steep fall) its step would leave every scale.
    const open = v.slope > 0 ? hi === Infinity : lo === -Infinity;
    if (open && Math.abs(next - mode) > step) {
      next = mode + (v.slope > 0 ? step : -step);
      step *= 2;
    }
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
  let w = exact.severalPieces === true ? FIRST_SHARE * (last - a) : last - a;
  for (let tries = 0; a < last; tries++) {
    if (tries >= PIECE_BUDGET) throw failure('its log density is not smooth enough to interpolate');
    // Pieces end at the kink (where the density is only finitely smooth) and at the window's end.
    const b = kink !== undefined && a < kink ? kink : last;
    const right = b - (a + w) < 1e-9 * w ? b : Math.min(b, a + w);
    const half = (right - a) / 2;
    const mid = (right + a) / 2;
    const data = new Float64Array(POINTS);
    const sampleCurvature = new Float64Array(SAMPLES);
    let nearest = Infinity;
    let deepest = 0;
    let conditioning = 0;
    let evaluationNoise = 0;
    for (let j = 0; j < SAMPLES; j++) {
      const z = mid + half * (SAMPLE_POINTS[j] as number);
      const v = exact.evaluate(z);
      if (!Number.isFinite(v.logDensity) || !Number.isFinite(v.slope))
        throw failure(`the log density is not finite at ${z}`);
      data[j] = v.logDensity - top;
      data[SAMPLES + j] = half * v.slope;
      sampleCurvature[j] = v.curvature;
      nearest = Math.min(nearest, Math.abs(v.logDensity - top));
      deepest = Math.max(deepest, Math.abs(v.logDensity - top));
      conditioning = Math.max(conditioning, Math.abs(v.slope) * Math.max(1, Math.abs(z)));
      evaluationNoise = Math.max(evaluationNoise, v.noise ?? 0);
    }
    const { coefficients, logDensity, slope, curvature } = fitPiece(data, half, sampleCurvature);
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
    const tail = Math.max(...Array.from(coefficients.subarray(POINTS - 4)).map(Math.abs));
    const accepted = tail <= tolerance || floor;
    // The next width: predicted from this try (see nextWidth), never the rejected width again.
    const from = accepted ? right : a;
    const t = accepted ? 1 : -1;
    w = nextWidth(right - a, coefficients, accepted, from, {
      depth: -barycentric(NODES, logDensity, t),
      slope: barycentric(NODES, slope, t),
      mode,
    });
    if (!accepted) continue;
    pieces.push({ left: a, right, logDensity, slope, curvature });
    a = right;
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
    return barycentric(NODES, pick(p), (2 * z - p.left - p.right) / (p.right - p.left));
  };
  const density: WorkingDensity = {
    mode,
    valueRange: exact.valueRange,
    logDensity: (z: number): number => {
      const i = pieceOf(z);
      if (i < 0) return beyond(z).logDensity;
      const p = pieces[i] as Piece;
      return barycentric(NODES, p.logDensity, (2 * z - p.left - p.right) / (p.right - p.left));
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
