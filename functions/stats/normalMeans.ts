/**
 * Revenue and other averages (Normal model from summary statistics): per variant the count, mean and
 * standard deviation of a per-visitor value (revenue per visitor with zeros for non-buyers, items per
 * order, …). With the reference prior p(μ, σ²) ∝ 1/σ², each variant's mean has a Student t posterior
 * with ν = count − 1 degrees of freedom, centre = mean and scale = sd/√count (Gelman et al., Bayesian
 * Data Analysis, 3rd ed., §3.2). The first variant is the control.
 *
 * Comparisons use quadrature of the t posteriors tabulated in u, value = centre + scale·sinh(u)
 * (studentTDensity.ts, quadrature/, compare/); P(highest) and expected loss tabulate all variants in one
 * shared coordinate x = C + S·sinh(w) where that is valid (see tabulateShared). The relative lift uses
 * the ratio engine of the other models over both signs of the means (compare/ratio.ts
 * signedRatioQuantile). Single-variant intervals use the t quantile directly.
 *
 * A variant with sd = 0 (every value equal, e.g. no sales at all) is treated as a point mass at its mean
 * (the limit of the t posterior as the scale goes to 0): its interval is [mean, mean]; comparisons with
 * it go through the other variant's t distribution exactly; ties between two point masses count half
 * each way. P(highest) and expected loss are computed when no variant, every variant, or all but one
 * variant has sd = 0; two or more variants with spread beside one with sd = 0 are reported as not
 * available.
 */
import {
  differenceQuantile,
  expectedLosses,
  highestProbabilities,
  mappedExpectedLosses,
  mappedHighestProbabilities,
  probabilityGreater,
  signedRatioCdf,
  signedRatioQuantile,
} from './compare';
import { chooseByLoss, lossThreshold } from './decisionRule';
import type { LossDecision } from './decisionRule';
import { ensure, StatsError } from './errors';
import { tabulate } from './quadrature';
import type { TabulatedDistribution } from './quadrature';
import type { CoordinateMap } from './compare';
import { MAX_COUNT, checkLevel, checkVariantCount } from './limits';
import { findRoot } from './numeric';
import { solveOncePerKey } from './tableMemo';
import { studentTCdf, studentTQuantile } from './special/studentT';
import { studentTWorkingDensity } from './studentTDensity';
import type { Interval, IntervalWithMedian, MeanSummary, WorkingDensity } from './types';

/** Largest posterior mass the control's mean may put at or below zero for a relative lift. */
const LIFT_ZERO_MASS = 1e-6;

/** The posterior of one variant's mean: Student t(df) with a centre and a scale (scale 0: point mass). */
interface MeanPosterior {
  readonly df: number;
  readonly centre: number;
  readonly scale: number;
}

function posteriors(variants: readonly MeanSummary[], minimum: number): MeanPosterior[] {
  checkVariantCount(variants.length, minimum);
  return variants.map((v, i) => {
    const item = i + 1;
    ensure(Number.isFinite(v.count), `count, item ${item}: ${v.count} is not a number`);
    ensure(Number.isInteger(v.count), `count, item ${item}: ${v.count} is not a whole number`);
    ensure(
      v.count >= 2,
      `count, item ${item}: ${v.count} is too few; the Normal model needs at least 2 values per variant`,
    );
    ensure(v.count <= MAX_COUNT, `count, item ${item}: ${v.count} is above the largest count allowed, 2^53`);
    ensure(Number.isFinite(v.mean), `mean, item ${item}: ${v.mean} is not a finite number`);
    ensure(Number.isFinite(v.sd), `sd, item ${item}: ${v.sd} is not a finite number`);
    ensure(v.sd >= 0, `sd, item ${item}: ${v.sd} is below 0; a standard deviation is 0 or more`);
    return { df: v.count - 1, centre: v.mean, scale: v.sd / Math.sqrt(v.count) };
  });
}

const isPoint = (p: MeanPosterior): boolean => p.scale === 0;

function tabulateOne(p: MeanPosterior): TabulatedDistribution {
  return tabulate(studentTWorkingDensity(p.df, p.centre, p.scale));
}

/** Beyond |w| = FAR_W the shared-coordinate t is written by its exponential tail (sinh would overflow). */
const FAR_W = 300;
/** The shared coordinate's scale is at least this multiple of the widest posterior scale (see below). */
const SHARED_SCALE_MIN = 2;

/** log cosh w for any w, accurate near 0 (log1p(2 sinh²(w/2))) and without overflow for large |w|. */
function logCosh(w: number): number {
  const a = Math.abs(w);
  if (a < 20) {
    const h = Math.sinh(a / 2);
    return Math.log1p(2 * h * h);
  }
  return a - Math.LN2 + Math.log1p(Math.exp(-2 * a));
}

/**
 * One t posterior as a WorkingDensity in a coordinate w shared by every variant of a comparison:
 * value x = C + S·sinh(w) with a common centre C and scale S. With t = (x − centre)/scale =
 * A + B·sinh w (A = (C − centre)/scale and B = S/scale formed once, so t never goes through x and no
 * digits are lost to a large mean), the density in w is f_t(t)·dx/dw, so
 *   log g(w) = −((ν+1)/2)·log1p(t²/ν) + log cosh w,
 *   slope     = −(ν+1)·t·t′/(ν + t²) + tanh w,                                   t′ = B cosh w,
 *   curvature = (ν+1)·[t′²(ν − t²)/(ν + t²)² + t·t″/(ν + t²)] − sech² w,         t″ = B sinh w
 * (differentiated by hand; at C = centre, S = scale this is studentTWorkingDensity's u). Unlike that one,
 * it is log-concave only when S and C suit the posterior (S well above its scale, C within a few S of its
 * centre, and for small ν not far above it either); tabulateShared checks the curvature at every node and
 * falls back otherwise. The tails are exponential, e^(−ν|w|), as in u. The mode is found by Brent's method
 * on the slope (from t = 0 towards where tanh w points).
 */
function sharedTDensity(p: MeanPosterior, centre: number, scale: number): WorkingDensity {
  const nu = p.df;
  const n1 = nu + 1;
  const a = (centre - p.centre) / p.scale;
  const b = scale / p.scale;
  const logNu = Math.log(nu);
  const logB = Math.log(b);
  const raw = (w: number): number => {
    const aw = Math.abs(w);
    if (aw > FAR_W) return -(n1 / 2) * (2 * (logB + aw - Math.LN2) - logNu) + aw - Math.LN2;
    const t = a + b * Math.sinh(w);
    const q =
      Math.abs(t) > 1e100 ? 2 * Math.log(Math.abs(t)) - logNu + Math.log1p(nu / t / t) : Math.log1p((t * t) / nu);
    return -(n1 / 2) * q + logCosh(w);
  };
  const slope = (w: number): number => {
    if (Math.abs(w) > FAR_W) return -nu * Math.sign(w);
    const t = a + b * Math.sinh(w);
    const tp = b * Math.cosh(w);
    const big = Math.abs(t) > 1e100;
    const tOverD = big ? 1 / (t * (1 + nu / t / t)) : t / (nu + t * t);
    return -n1 * tp * tOverD + Math.tanh(w);
  };
  const curvature = (w: number): number => {
    if (Math.abs(w) > FAR_W) return 0;
    const t = a + b * Math.sinh(w);
    const tp = b * Math.cosh(w);
    const tpp = b * Math.sinh(w);
    const big = Math.abs(t) > 1e100;
    const tOverD = big ? 1 / (t * (1 + nu / t / t)) : t / (nu + t * t);
    const t2OverD = big ? 1 / (1 + nu / t / t) : (t * t) / (nu + t * t);
    const nuOverD = big ? nu / t / t / (1 + nu / t / t) : nu / (nu + t * t);
    const tpOverD = big ? tp / t / t / (1 + nu / t / t) : tp / (nu + t * t);
    const c = Math.cosh(w);
    return n1 * (tpOverD * tp * (nuOverD - t2OverD) + tpp * tOverD) - 1 / (c * c);
  };
  // The mode: from w0 (t = 0), where the slope is tanh w0, step towards its sign until the slope turns.
  const w0 = Math.asinh(-a / b);
  let mode = w0;
  const s0 = slope(w0);
  if (s0 !== 0) {
    const direction = s0 > 0 ? 1 : -1;
    let step = 1 / (b * Math.cosh(w0));
    let far = w0 + direction * step;
    for (let i = 0; i < 200 && direction * slope(far) > 0; i++) {
      step *= 2;
      far = w0 + direction * step;
    }
    mode = findRoot(slope, Math.min(w0, far), Math.max(w0, far));
  }
  const top = raw(mode);
  const density: WorkingDensity = {
    logDensity: (w: number): number => raw(w) - top,
    slope,
    curvature,
    mode,
    toValue: (w: number): number => centre + scale * Math.sinh(w),
    toWorking: (x: number): number => Math.asinh((x - centre) / scale),
    valueJacobian: (w: number): number => scale * Math.cosh(w),
    valueRange: [-Infinity, Infinity] as const,
  };
  return nu > 1 ? { ...density, exactMean: p.centre } : density;
}

/** True when a shared-coordinate table is usable: inside |w| ≤ FAR_W and log-concave at every node and edge. */
function sharedTableHolds(t: TabulatedDistribution): boolean {
  if (!(t.windowLeft > -FAR_W && t.windowRight < FAR_W)) return false;
  const curvature = t.source.curvature;
  for (let i = 0; i < t.nodeZ.length; i++) if (!(curvature(t.nodeZ[i] as number) > 0)) return false;
  for (let i = 0; i < t.edges.length; i++) if (!(curvature(t.edges[i] as number) > 0)) return false;
  return true;
}

/**
 * The posteriors (none a point mass) tabulated in one shared coordinate w, x = C + S·sinh(w), with C the
 * middle of the centres and S = max(2 × the widest scale, a quarter of the centres' range), so that
 * compare/ evaluates every cdf at every node directly and takes the O(k²) shared-grid expected loss
 * (instead of O(k³)) and direct P(highest) factors. In the normal limit the t is log-concave in w when
 * S > √2·scale and |C − centre| < 2S (worked out by hand from the curvature above), which this choice
 * gives; heavy tails (small ν) far narrower than S are not, so every table is checked (sharedTableHolds)
 * and undefined is returned when any fails, for the caller to use each posterior's own coordinate.
 */
function tabulateShared(ps: readonly MeanPosterior[]): TabulatedDistribution[] | undefined {
  const { centre, scale } = sharedFrame(ps);
  if (!(Number.isFinite(centre) && Number.isFinite(scale) && scale > 0)) return undefined;
  const coordinate = `asinh((x - ${centre})/${scale})`;
  const tables: TabulatedDistribution[] = [];
  try {
    for (const p of ps) {
      const t = tabulate(sharedTDensity(p, centre, scale), { coordinate });
      if (!sharedTableHolds(t)) return undefined;
      tables.push(t);
    }
  } catch (error) {
    if (error instanceof StatsError) return undefined;
    throw error;
  }
  return tables;
}

/** The centre C and scale S of the coordinate w shared by a comparison, x = C + S·sinh(w) (see tabulateShared). */
function sharedFrame(ps: readonly MeanPosterior[]): { centre: number; scale: number } {
  let lo = Infinity;
  let hi = -Infinity;
  let widest = 0;
  for (const p of ps) {
    lo = Math.min(lo, p.centre);
    hi = Math.max(hi, p.centre);
    widest = Math.max(widest, p.scale);
  }
  return { centre: lo + (hi - lo) / 2, scale: Math.max(SHARED_SCALE_MIN * widest, (hi - lo) / 4) };
}

/**
 * A t posterior's own coordinate u (value = centre + scale·sinh u, studentTDensity.ts) read from the
 * comparison's shared w (value = C + S·sinh w): u = asinh(a + b·sinh w) with a = (C − centre)/scale and
 * b = S/scale formed once (no value is formed, so no digits are lost to a large mean, as in sharedTDensity),
 * w = asinh((centre − C)/S + (scale/S)·sinh u), and du/dw = b·cosh w / cosh u. Beyond |w| or |u| = FAR_W
 * (sinh would overflow) the exponential forms |u| = |w| + log b and back (a and the other terms are below
 * e^-300 of them there). At the grid's nodes u is read from sinh w computed once for all the posteriors
 * (ownFromInner; inside the windows, where the grid lies, |w| < FAR_W and it is toOwn's form).
 */
function coordinateMap(p: MeanPosterior, frame: { centre: number; scale: number }): CoordinateMap {
  const a = (frame.centre - p.centre) / p.scale;
  const b = frame.scale / p.scale;
  const back = (p.centre - frame.centre) / frame.scale;
  const ratio = p.scale / frame.scale;
  const logB = Math.log(b);
  const toOwn = (w: number): number =>
    Math.abs(w) > FAR_W ? Math.sign(w) * (Math.abs(w) + logB) : Math.asinh(a + b * Math.sinh(w));
  return {
    toOwn,
    fromOwn: (u: number): number =>
      Math.abs(u) > FAR_W ? Math.sign(u) * (Math.abs(u) - logB) : Math.asinh(back + ratio * Math.sinh(u)),
    logSlope: (w: number, u: number): number => logB + logCosh(w) - logCosh(u),
    inner: Math.sinh,
    ownFromInner: (v: number): number => Math.asinh(a + b * v),
  };
}

/**
 * Each posterior tabulated in its own coordinate, variants with the same count, mean and sd sharing one table
 * (the comparisons integrate a table listed twice once and give both the identical value). Cost: one
 * tabulation per distinct posterior.
 */
function tabulateEach(ps: readonly MeanPosterior[]): TabulatedDistribution[] {
  const known = new Map<string, TabulatedDistribution>();
  return ps.map((p) => {
    const key = `${p.df} ${p.centre} ${p.scale}`;
    let table = known.get(key);
    if (table === undefined) {
      table = tabulateOne(p);
      known.set(key, table);
    }
    return table;
  });
}

/** The coordinate maps of tabulateEach's tables (one map object per distinct table). */
function mapsOf(
  ps: readonly MeanPosterior[],
  tables: readonly TabulatedDistribution[],
  frame: { centre: number; scale: number },
): CoordinateMap[] {
  const known = new Map<TabulatedDistribution, CoordinateMap>();
  return ps.map((p, i) => {
    const table = tables[i] as TabulatedDistribution;
    let map = known.get(table);
    if (map === undefined) {
      map = coordinateMap(p, frame);
      known.set(table, map);
    }
    return map;
  });
}

/**
 * Expected losses of three or more posteriors that do not all fit the shared coordinate: each tabulated in its
 * own u, on one grid in the shared w through coordinateMap (compare/losses.ts mappedExpectedLosses,
 * O(k × nodes)); when that grid is over its budget, the pruned integrals of expectedLosses.
 */
function separateLosses(ps: readonly MeanPosterior[]): number[] {
  const frame = sharedFrame(ps);
  const tables = tabulateEach(ps);
  if (Number.isFinite(frame.centre) && Number.isFinite(frame.scale) && frame.scale > 0) {
    const value = {
      toValue: (w: number): number => frame.centre + frame.scale * Math.sinh(w),
      valueJacobian: (w: number): number => frame.scale * Math.cosh(w),
    };
    try {
      return mappedExpectedLosses(tables, mapsOf(ps, tables, frame), value);
    } catch (error) {
      if (!(error instanceof StatsError && error.code === 'not_available')) throw error;
    }
  }
  return expectedLosses(tables);
}

/**
 * P(highest) of posteriors that do not all fit the shared coordinate (heavy tails narrower than the others'
 * spread): each tabulated in its own u, integrated on one grid in the shared w through coordinateMap
 * (compare/sharedHighest.ts mappedHighestIntegrals, O(k × nodes)).
 */
function separateHighest(ps: readonly MeanPosterior[]): number[] {
  const frame = sharedFrame(ps);
  const tables = tabulateEach(ps);
  if (!(Number.isFinite(frame.centre) && Number.isFinite(frame.scale) && frame.scale > 0)) {
    return highestProbabilities(tables);
  }
  return mappedHighestProbabilities(tables, mapsOf(ps, tables, frame));
}

/** P(μ ≤ x) for one posterior (a step for a point mass), through the t distribution function. */
function cdfAt(p: MeanPosterior, x: number): number {
  if (isPoint(p)) return x >= p.centre ? 1 : 0;
  return studentTCdf((x - p.centre) / p.scale, p.df);
}

/** The p-quantile of one posterior's mean. */
function quantileOf(p: MeanPosterior, prob: number): number {
  if (isPoint(p)) return p.centre;
  return p.centre + p.scale * studentTQuantile(prob, p.df);
}

/**
 * Per variant: the central credible interval for its true mean at `level`.
 *
 * Method: the Student t posterior's equal-tailed quantiles, centre ± scale·t_{(1−level)/2, ν}, the
 * lower t quantile computed directly and mirrored (the t is symmetric). A variant with sd = 0 gets
 * [mean, mean]. Accuracy: that of the t quantile (checked against scipy.stats.t.ppf in
 * test/stats/normalMeans.test.ts). Cost: one t quantile per variant.
 * Throws StatsError('invalid_argument') for a count below 2 or not whole, a negative sd, a non-finite
 * mean or a level outside (0, 1); 1 to 50 variants.
 * @example meanInterval([{ count: 100, mean: 48, sd: 20 }], 0.95)
 * //=> [{ lower: 44.031566096827…, upper: 51.968433903172… }] (scipy: 48 + 2·t.ppf(0.025, 99))
 */
export function meanInterval(variants: readonly MeanSummary[], level = 0.95): Interval[] {
  checkLevel(level);
  const tail = (1 - level) / 2;
  return posteriors(variants, 1).map((p) => {
    if (isPoint(p)) return { lower: p.centre, upper: p.centre };
    const half = -p.scale * studentTQuantile(tail, p.df);
    return { lower: p.centre - half, upper: p.centre + half };
  });
}

/** P(X > Y) for two posteriors, at least one of them a point mass (ties of two point masses: ½). */
function probGreaterWithPoint(x: MeanPosterior, y: MeanPosterior): number {
  if (isPoint(x) && isPoint(y)) return x.centre > y.centre ? 1 : x.centre < y.centre ? 0 : 0.5;
  // P(X > c) = F_T((centre − c)/scale) by symmetry of the t; P(c > Y) = F_Y(c).
  if (isPoint(y)) return studentTCdf((x.centre - y.centre) / x.scale, x.df);
  return cdfAt(y, x.centre);
}

function mixedPointMassError(ps: readonly MeanPosterior[], what: string): StatsError {
  const items = ps.flatMap((p, i) => (isPoint(p) ? [String(i + 1)] : []));
  return new StatsError(
    'not_available',
    `sd, item ${items.join(', ')}: a standard deviation of 0 (every value equal) makes that mean exact; ` +
      `${what} mixing exact and uncertain means is not computed. Check the data, or compare variants ` +
      'pairwise with MEAN_PROB_ABOVE_CONTROL or MEAN_DIFF_INTERVAL',
  );
}

/**
 * Per variant: the probability that its true mean is the highest; the values sum to 1.
 *
 * Method: quadrature P(i highest) = ∫ f_i ∏_{j≠i} F_j over the t posteriors tabulated in the asinh
 * working variable (compare/ranking.ts), which turns the heavy t tails (count 2 is a Cauchy) into exponential
 * ones. When every variant has sd = 0 the highest mean wins (ties share equally); when all but one have
 * sd = 0 the one with spread wins with its t probability of exceeding the largest exact mean. Accuracy 1e-9 absolute
 * or better against scipy.integrate.quad. The posteriors are tabulated in one shared coordinate where each
 * is log-concave in it (tabulateShared; in practice counts of about 100 and more), so every cdf is read at
 * the base's nodes directly; otherwise each in its own, read on one grid in the shared coordinate through
 * the map between the two (separateHighest). Cost: one tabulation per variant plus O(k × grid nodes).
 * Throws StatsError('invalid_argument') for bad input (2 to 50 variants) and
 * StatsError('not_available') when two or more variants with spread sit beside one with sd = 0.
 * @example meanProbHighest([{ count: 100, mean: 48, sd: 20 }, { count: 100, mean: 52, sd: 22 }])
 * //=> [0.091129888005…, 0.908870111994…]
 */
export function meanProbHighest(variants: readonly MeanSummary[]): number[] {
  const ps = posteriors(variants, 2);
  const points = ps.filter(isPoint).length;
  if (points === 0) {
    try {
      const shared = tabulateShared(ps);
      return shared !== undefined ? highestProbabilities(shared) : separateHighest(ps);
    } catch (error) {
      if (!(error instanceof StatsError && error.code === 'not_available')) throw error;
      return separatedHighest(ps);
    }
  }
  const only = singleSpread(ps);
  if (only !== undefined) {
    // One uncertain mean X against exact ones with largest value M: X wins with P(X > M) (exact, through
    // the t); the point masses at M share P(X ≤ M); the others cannot win.
    const top = Math.max(...ps.filter(isPoint).map((p) => p.centre));
    const wins = studentTCdf((only.centre - top) / only.scale, only.df);
    const ties = ps.filter((p) => isPoint(p) && p.centre === top).length;
    return ps.map((p) => (!isPoint(p) ? wins : p.centre === top ? (1 - wins) / ties : 0));
  }
  if (points < ps.length) throw mixedPointMassError(ps, 'a probability of being highest');
  const best = Math.max(...ps.map((p) => p.centre));
  const ties = ps.filter((p) => p.centre === best).length;
  return ps.map((p) => (p.centre === best ? 1 / ties : 0));
}

/**
 * P(highest) when the quadrature's integrals all vanish: posteriors far narrower than the gaps between their
 * means, tabulated on a grid at the means' rounding (a scale of a few units in the last place). The top mean
 * wins with 1 and each other variant j with 0 when P(X_j > X_top) ≤ P(X_j > m) + P(X_top < m), m the midpoint of
 * their centres, is 0 in double precision (both t tails underflow); otherwise the probabilities are refused with
 * a message naming the arguments. Cost: O(k) t tails.
 */
function separatedHighest(ps: readonly MeanPosterior[]): number[] {
  let top = 0;
  ps.forEach((p, i) => {
    if (p.centre > (ps[top] as MeanPosterior).centre) top = i;
  });
  const t = ps[top] as MeanPosterior;
  const separated = ps.every((p, j) => {
    if (j === top) return true;
    const half = (t.centre - p.centre) / 2;
    return half > 0 && studentTCdf(-half / p.scale, p.df) + studentTCdf(-half / t.scale, t.df) === 0;
  });
  if (separated) return ps.map((_, j) => (j === top ? 1 : 0));
  throw new StatsError(
    'not_available',
    'mean, sd and count: the posteriors are too narrow (sd/√count) beside the size of the means to compute the ' +
      'probabilities of being highest in double precision; subtract a common amount from every mean (e.g. their ' +
      'average) so the means are smaller, or compare pairs with MEAN_PROB_ABOVE_CONTROL',
  );
}

/** The one variant with spread among point masses, or undefined when there are two or more. */
function singleSpread(ps: readonly MeanPosterior[]): MeanPosterior | undefined {
  const spread = ps.filter((p) => !isPoint(p));
  return spread.length === 1 ? spread[0] : undefined;
}

/**
 * Per challenger (every variant after the first): P(its true mean > the control's true mean).
 *
 * Method: quadrature P(X > Y) = ∫ f_X F_Y of the tabulated t posteriors, the smaller of the pair
 * computed directly (compare/ranking.ts). Against a variant with sd = 0 (a point mass at c) it is exactly the
 * other variant's t distribution function at c; two point masses give 1, 0 or ½ for a tie.
 * Accuracy 1e-9 absolute, tails to 1e-6 relative (against scipy.integrate.quad and mpmath).
 * Cost: one tabulation per variant plus O(panels) per challenger.
 * Throws StatsError('invalid_argument') for bad input; 2 to 50 variants.
 * @example meanProbAboveControl([{ count: 100, mean: 48, sd: 20 }, { count: 100, mean: 52, sd: 22 }])
 * //=> [0.908870111994…]
 */
export function meanProbAboveControl(variants: readonly MeanSummary[]): number[] {
  const ps = posteriors(variants, 2);
  const [control, ...challengers] = ps;
  if (control === undefined) return [];
  const controlTable = isPoint(control) ? undefined : tabulateOne(control);
  return challengers.map((p) => {
    if (controlTable === undefined || isPoint(p)) return probGreaterWithPoint(p, control);
    return probabilityGreater(tabulateOne(p), controlTable);
  });
}

/** The key of a t posterior: df, centre and scale determine it (the same count, mean and sd). */
const posteriorKey = (p: MeanPosterior): string => `${p.df}|${p.centre}|${p.scale}`;

/**
 * Per challenger: lower, median and upper of the difference mean − control's mean at `level`
 * (in the metric's own units: 0.25 is 25 cents more revenue per visitor).
 *
 * Method: the difference of two independent t posteriors is symmetric about mean_i − mean_0, so the
 * median is exactly that and the interval is mirrored about it; the lower end is the quantile of the
 * difference distribution P(D ≤ d) = ∫ f_0(x) F_i(x + d) dx by quadrature (compare/difference.ts). With one sd = 0
 * the difference is the other t shifted (exact quantile); with both, all three are the difference.
 * Accuracy 1e-9 absolute relative to the scale of the means (against scipy quadrature and brentq).
 * Cost: tabulation plus a root search of O(panels) integrals per distinct challenger.
 * Throws StatsError('invalid_argument') for bad input; 2 to 50 variants.
 * @example meanDiffInterval([{ count: 100, mean: 48, sd: 20 }, { count: 100, mean: 52, sd: 22 }], 0.95)
 * //=> [{ lower: -1.893549289701…, median: 4, upper: 9.893549289701… }]
 */
export function meanDiffInterval(variants: readonly MeanSummary[], level = 0.95): IntervalWithMedian[] {
  checkLevel(level);
  const tail = (1 - level) / 2;
  const [control, ...challengers] = posteriors(variants, 2);
  if (control === undefined) return [];
  const controlTable = isPoint(control) ? undefined : tabulateOne(control);
  return solveOncePerKey(challengers, posteriorKey, (p): IntervalWithMedian => {
    const median = p.centre - control.centre;
    let half: number;
    if (isPoint(p) && isPoint(control)) half = 0;
    else if (isPoint(p)) half = -control.scale * studentTQuantile(tail, control.df);
    else if (controlTable === undefined) half = -p.scale * studentTQuantile(tail, p.df);
    else half = median - differenceQuantile(tabulateOne(p), controlTable, tail);
    return { lower: median - half, median, upper: median + half };
  });
}

/** The lift quantile of a point-mass challenger c over a continuous control X (exact, both signs of X). */
function pointOverControlLift(c: number, control: MeanPosterior, prob: number, belowZero: number): number {
  if (c === 0) return -1;
  // R = c/X. For c > 0: P(R ≤ ρ) = F(0) + S(c/ρ) for ρ > 0 and F(0) − F(c/ρ) for ρ < 0.
  // For c < 0: P(R ≤ ρ) = F(c/ρ) − F(0) for ρ < 0 and S(0) + F(c/ρ) for ρ > 0.
  let x: number;
  if (c > 0) {
    x =
      prob > belowZero
        ? control.centre - control.scale * studentTQuantile(prob - belowZero, control.df)
        : quantileOf(control, belowZero - prob);
  } else {
    const aboveZero = 1 - belowZero;
    x = prob < aboveZero ? quantileOf(control, prob + belowZero) : quantileOf(control, prob - aboveZero);
  }
  return c / x - 1;
}

function percent(p: number): string {
  const value = 100 * p;
  return value >= 0.1 ? `${value.toFixed(1)}%` : `${value.toPrecision(2)}%`;
}

/**
 * Per challenger: lower, median and upper of the relative lift mean/control's mean − 1 at `level`.
 *
 * Method: quadrature of the ratio distribution with the challenger's mean of either sign and the
 * control's tiny chance of a negative mean kept exactly, P(Y/X ≤ k) = ∫_{x>0} f_X(x) F_Y(kx) dx +
 * ∫_{x<0} f_X(x) S_Y(kx) dx over the control's tabulated panels, inverted by Newton's method on the log
 * of the smaller tail with its density from the same pass (compare/ratio.ts signedRatioQuantile, the
 * ratio engine of the other models, with the signed factors). A challenger with sd = 0 (a point mass
 * c) uses the exact form through the control's t quantile; a control with sd = 0 and mean > 0 divides
 * the challenger's t quantiles by it.
 * The lift is only defined while the control's mean is clearly positive: when its posterior puts more
 * than 1e-6 at or below zero the function refuses (the ratio would be dominated by division by values
 * near zero). Accuracy 1e-9 absolute (against scipy quadrature). Cost: tabulation plus, per quantile of each
 * distinct challenger, 2–6 Newton steps of one pass over the control's kept panels.
 * Throws StatsError('invalid_argument') for bad input (2 to 50 variants) and
 * StatsError('not_available') naming the control when its mean could plausibly be ≤ 0.
 * @example meanLiftInterval([{ count: 100, mean: 48, sd: 20 }, { count: 100, mean: 52, sd: 22 }], 0.95)
 * //=> [{ lower: -0.037394058659…, median: 0.083333333333…, upper: 0.218941375262… }]
 */
export function meanLiftInterval(variants: readonly MeanSummary[], level = 0.95): IntervalWithMedian[] {
  checkLevel(level);
  const tail = (1 - level) / 2;
  const [control, ...challengers] = posteriors(variants, 2);
  if (control === undefined) return [];
  const belowZero = checkLiftControl(control);
  const probs = [tail, 0.5, 1 - tail] as const;
  const controlTable = isPoint(control) ? undefined : tabulateOne(control);
  return solveOncePerKey(challengers, posteriorKey, (p): IntervalWithMedian => {
    let q: number[];
    if (controlTable === undefined) {
      // A known, positive control mean c0: the lift is (Y − c0)/c0.
      q = probs.map((prob) => (quantileOf(p, prob) - control.centre) / control.centre);
    } else if (isPoint(p)) {
      q = probs.map((prob) => pointOverControlLift(p.centre, control, prob, belowZero));
    } else {
      const table = tabulateOne(p);
      q = probs.map((prob) => signedRatioQuantile(table, controlTable, prob));
    }
    const [lower = NaN, median = NaN, upper = NaN] = q;
    return { lower, median, upper };
  });
}

/**
 * Per variant: the expected loss E[max_j μ_j − μ_i], the amount of the metric given up on average by
 * choosing that variant (in the metric's units).
 *
 * Method: quadrature loss_i = ∫ F_i(x)·(1 − ∏_{j≠i} F_j(x)) dx of the tabulated t posteriors
 * (compare/losses.ts). With count 2 a posterior is a Cauchy, whose mean does not exist, so every expected loss
 * is infinite: that is reported as not available. When every variant has sd = 0 the loss is
 * max mean − mean; when all but one have sd = 0 it comes from that one's integrated cdf E[(M − X)^+]. Accuracy 1e-9 relative to the scale of the means (against scipy.integrate.quad).
 * Cost: one tabulation per distinct variant, then with three or more posteriors one grid of O(k × nodes):
 * in the shared coordinate of tabulateShared when all are log-concave there (in practice counts of about 100
 * and more), else each table read through its own coordinate on a common grid (losses.ts
 * mappedExpectedLosses); per-variant pruned integrals only when that grid would exceed its budget.
 * Throws StatsError('invalid_argument') for bad input (2 to 50 variants) and
 * StatsError('not_available') for a variant with count 2, or two or more variants with spread beside one
 * with sd = 0.
 * @example meanExpectedLoss([{ count: 100, mean: 48, sd: 20 }, { count: 100, mean: 52, sd: 22 }])
 * //=> [4.128290345207…, 0.128290345207…]
 */
export function meanExpectedLoss(variants: readonly MeanSummary[]): number[] {
  const ps = posteriors(variants, 2);
  const points = ps.filter(isPoint).length;
  if (points === ps.length) {
    const best = Math.max(...ps.map((p) => p.centre));
    return ps.map((p) => best - p.centre);
  }
  const cauchy = ps.flatMap((p, i) => (p.df === 1 && !isPoint(p) ? [String(i + 1)] : []));
  if (cauchy.length > 0) {
    throw new StatsError(
      'not_available',
      `count, item ${cauchy.join(', ')}: with only 2 values the mean's posterior has such heavy tails ` +
        'that its average, and so every expected loss, is infinite; collect more data (at least 3 values per variant)',
    );
  }
  const only = singleSpread(ps);
  if (points > 0 && only !== undefined) {
    // One uncertain mean X against exact ones with largest value M: choosing X loses E[(M − X)^+], the
    // integrated cdf G_X(M) (TabulatedDistribution.logLowerMoment); choosing the exact c loses
    // E[max(M, X)] − c = (M − c) + E[(X − M)^+]. The t posterior is symmetric about its centre, so
    // E[(X − M)^+] = G_X(2·centre − M): a sum of two terms ≥ 0, never the difference of two large ones
    // (mean_X + G_X(M) − c cancels to a wrong sign when M − mean_X is large).
    const top = Math.max(...ps.filter(isPoint).map((p) => p.centre));
    const table = tabulateOne(only);
    const lowerMoment = Math.exp(table.logLowerMoment(top));
    const upperMoment = Math.exp(table.logLowerMoment(only.centre + (only.centre - top)));
    return ps.map((p) => (isPoint(p) ? top - p.centre + upperMoment : lowerMoment));
  }
  if (points > 0) throw mixedPointMassError(ps, 'an expected loss');
  const shared = tabulateShared(ps);
  return shared !== undefined || ps.length < 3 ? expectedLosses(shared ?? ps.map(tabulateOne)) : separateLosses(ps);
}

/**
 * P(control's mean ≤ 0), after checking it is at most LIFT_ZERO_MASS (a relative lift needs a control
 * that is positive for sure). Throws StatsError('not_available') naming the control otherwise.
 */
function checkLiftControl(control: MeanPosterior): number {
  const belowZero = cdfAt(control, 0);
  if (belowZero > LIFT_ZERO_MASS) {
    throw new StatsError(
      'not_available',
      `the control's mean could plausibly be zero or negative (${percent(belowZero)}), so a relative lift ` +
        'has no meaning; use MEAN_DIFF_INTERVAL for the absolute difference',
    );
  }
  return belowZero;
}

/** P(c/X > k) for a point-mass challenger c over a continuous control X (k > 0; exact, both signs of X). */
function pointOverControlAbove(c: number, control: MeanPosterior, k: number, belowZero: number): number {
  if (c === 0) return 0;
  const x = c / k;
  // c > 0: c/X > k exactly when 0 < X < c/k; c < 0: when c/k < X < 0.
  if (c > 0) {
    const below = cdfAt(control, x);
    return below <= 0.5
      ? below - belowZero
      : 1 - belowZero - studentTCdf((control.centre - x) / control.scale, control.df);
  }
  return belowZero - cdfAt(control, x);
}

/**
 * Per challenger: P(mean/control mean − 1 > minLift), the probability that its true mean is more than
 * minLift above the control's (a negative minLift asks "no worse than": −0.02 is "at most 2% lower").
 *
 * Method: the same ratio distribution as meanLiftInterval, with the control's tiny chance of a negative
 * mean kept exactly (compare/ratio.ts signedRatioCdf, both signs of the control), k = 1 + minLift. The
 * smaller tail is computed directly: P(Y/X > k) is also P((−Y)/X < −k), the lower tail of the mirrored
 * challenger. With sd = 0: a point-mass control c0 > 0 gives
 * the challenger's t tail at k·c0 exactly; a point-mass challenger c gives P(0 < X < c/k) (or
 * P(c/k < X < 0) for c < 0) through the control's t; two point masses give 1, 0 or ½ at equality.
 * Accuracy 1e-9 absolute (against scipy quadrature, test/reference/means/lift_above_reference.py).
 * Cost: tabulation plus one or two node sums of O(panels) per challenger.
 * Throws StatsError('invalid_argument') for bad input (2 to 50 variants) or minLift ≤ −1 or not finite,
 * and StatsError('not_available') naming the control when its mean could plausibly be ≤ 0 (as
 * meanLiftInterval).
 * @example meanProbLiftAbove([{ count: 100, mean: 48, sd: 20 }, { count: 100, mean: 52, sd: 22 }], 0) //=> [0.9088…] (P(mean_B > mean_A) when the control is positive for sure)
 */
export function meanProbLiftAbove(variants: readonly MeanSummary[], minLift: number): number[] {
  ensure(
    Number.isFinite(minLift) && minLift > -1,
    `min_lift: ${minLift} is not allowed; the minimum lift is a number greater than -1 (-0.02 asks "no worse than 2% below")`,
  );
  const [control, ...challengers] = posteriors(variants, 2);
  if (control === undefined) return [];
  const belowZero = checkLiftControl(control);
  const k = 1 + minLift;
  const controlTable = isPoint(control) ? undefined : tabulateOne(control);
  return challengers.map((p) => {
    if (controlTable === undefined) {
      // A known, positive control mean c0: P(Y > k·c0).
      const x = k * control.centre;
      if (isPoint(p)) return p.centre > x ? 1 : p.centre < x ? 0 : 0.5;
      return studentTCdf((p.centre - x) / p.scale, p.df);
    }
    if (isPoint(p)) return pointOverControlAbove(p.centre, control, k, belowZero);
    const below = signedRatioCdf(tabulateOne(p), controlTable, minLift);
    if (below <= 0.5) return 1 - below;
    // The upper tail directly: P(Y/X > k) = P((−Y)/X < −k), the lower tail of the mirrored challenger.
    const mirror: MeanPosterior = { df: p.df, centre: -p.centre, scale: p.scale };
    return signedRatioCdf(tabulateOne(mirror), controlTable, -k - 1);
  });
}

/**
 * The decision rule of DECISION on means: choose the variant with the smallest expected loss once that
 * loss is at most maxLoss (default 1% of |the control's mean|, in the metric's own units).
 * Cost and errors as meanExpectedLoss, plus StatsError('invalid_argument') for a maxLoss below 0 and
 * StatsError('not_available') when the default is asked for and the control's mean is 0.
 * @example meanDecide([{ count: 2000, mean: 48, sd: 20 }, { count: 2000, mean: 52, sd: 22 }], undefined).index //=> 1 (B is chosen: its loss, about 1e-10, is below the default max_loss 0.48)
 */
export function meanDecide(variants: readonly MeanSummary[], maxLoss: number | undefined): LossDecision {
  const losses = meanExpectedLoss(variants);
  const control = variants[0] as MeanSummary;
  if (maxLoss === undefined && control.mean === 0) {
    throw new StatsError(
      'not_available',
      "max_loss: the default, 1% of the control's mean, is 0 because that mean is 0; give max_loss in the metric's units",
    );
  }
  return chooseByLoss(losses, lossThreshold(maxLoss, control.mean));
}
