/**
 * Ranking: P(X > Y) of two posteriors and P(each is highest) of several, each one integral
 * ∫ f_i Π_{j≠i} F_j on the grid of the posterior integrated over (integrate.ts).
 */
import { StatsError } from '../errors';
import { log1mExp } from '../numeric';
import type { TabulatedDistribution } from '../quadrature';
import { factor } from './factors';
import { checkList, logIntegral, xIsBase } from './integrate';
import type { LogTails } from './integrate';
import { mappedHighestIntegrals, sharedHighestIntegrals } from './sharedHighest';
import type { CoordinateMap } from './sharedHighest';

/**
 * log P(X > Y) and log P(Y > X): the one expected to be smaller (that the lower-mean variable is above
 * the other) is integrated directly and the other is log1mExp of it; if that guess gives more than ½
 * (possible only close to ½, by skewness) the other side is integrated as well and the smaller kept.
 */
function greaterTails(x: TabulatedDistribution, y: TabulatedDistribution): LogTails {
  // One table twice (two variants with the same counts share one): X and Y are independent draws of one
  // continuous distribution, so P(X > Y) = P(Y > X) = 1/2 exactly by exchangeability (common practice).
  if (x === y) return { lower: -Math.LN2, upper: -Math.LN2 };
  const base = xIsBase(x, y) ? x : y;
  const other = base === x ? y : x;
  // log P(base > other) = ∫ f_base F_other; log P(other > base) = ∫ f_base S_other.
  const baseAbove = () => logIntegral(base, [factor(other, 'cdf')]);
  const otherAbove = () => logIntegral(base, [factor(other, 'sf')]);
  const guessBaseAbove = base.mean < other.mean || (base.mean === other.mean && base === x);
  let lBase: number;
  let lOther: number;
  if (guessBaseAbove) {
    lBase = baseAbove();
    lOther = lBase > -Math.LN2 ? otherAbove() : log1mExp(lBase);
    if (lBase > -Math.LN2 && lOther > lBase) lOther = log1mExp(lBase);
    else if (lBase > -Math.LN2) lBase = log1mExp(lOther);
  } else {
    lOther = otherAbove();
    lBase = lOther > -Math.LN2 ? baseAbove() : log1mExp(lOther);
    if (lOther > -Math.LN2 && lBase > lOther) lBase = log1mExp(lOther);
    else if (lOther > -Math.LN2) lOther = log1mExp(lBase);
  }
  return base === x ? { lower: lBase, upper: lOther } : { lower: lOther, upper: lBase };
}

/**
 * P(X > Y) for independent X, Y: ∫ f_X F_Y (or ∫ f_Y S_X on the narrower one's grid). Of P(X > Y) and
 * P(Y > X) the smaller is integrated directly and the other returned as 1 − smaller, so
 * probabilityGreater(x, y) + probabilityGreater(y, x) = 1 and a tiny value is accurate relative to itself.
 * Method: composite Gauss–Legendre quadrature on the tabulated panels (see quadrature/); for one table passed
 * twice (the same object) exactly 1/2, by exchangeability.
 * Cost: ~2 × (panels + kept panels × 16) interpolations; O(1) for the same table twice.
 * @example
 * const [y, x] = [tabulate(betaWorkingDensity(6, 6)), tabulate(betaWorkingDensity(4, 8))];
 * probabilityGreater(y, x) //=> 0.80650154798761… (521/646 = 0.8065015479876161, Evan Miller 2015)
 */
export function probabilityGreater(x: TabulatedDistribution, y: TabulatedDistribution): number {
  const t = greaterTails(x, y);
  return Math.exp(t.lower);
}

/**
 * log P(X > Y), accurate relative to itself down to ~1e-90 (the tabulation window). Same method and cost
 * as probabilityGreater.
 * @example
 * const [x, y] = [tabulate(betaWorkingDensity(4, 8)), tabulate(betaWorkingDensity(6, 6))];
 * logProbabilityGreater(x, y) //=> -1.642485766480… (log(125/646) = -1.6424857664803008)
 */
export function logProbabilityGreater(x: TabulatedDistribution, y: TabulatedDistribution): number {
  return greaterTails(x, y).lower;
}

/**
 * The raw integrals ∫ f_i Π_{j≠i} F_j of P(variant i is highest), before normalising. Their sum is 1
 * up to the quadrature error (checked to 1e-10 in the tests). Exposed for that check.
 * Cost: for three or more posteriors in one coordinate O(k × shared-grid nodes) (sharedHighest.ts), else
 * k × (panels + kept panels × 16) × (k − 1) interpolations.
 * @example
 * const [x, y] = [tabulate(betaWorkingDensity(4, 8)), tabulate(betaWorkingDensity(6, 6))];
 * highestProbabilityIntegrals([x, y]) //=> [0.19349845201238…, 0.80650154798761…] (125/646, 521/646)
 */
export function highestProbabilityIntegrals(ds: readonly TabulatedDistribution[]): number[] {
  checkList(ds);
  // Three or more posteriors in one coordinate: one grid shared by all of them, O(k × nodes) (measured
  // 4–6 times faster at 50 variants); a grid over its budget (outside the documented domain) falls back
  // to the per-variant integrals below.
  const coordinate = (ds[0] as TabulatedDistribution).coordinate;
  if (ds.length >= 3 && coordinate !== undefined && ds.every((d) => d.coordinate === coordinate)) {
    try {
      return sharedHighestIntegrals(ds);
    } catch (error) {
      if (!(error instanceof StatsError && error.code === 'not_available')) throw error;
    }
  }
  // The integral depends only on d and the multiset of the others, so a distribution listed twice (the
  // same object) is integrated once and both get the identical value.
  const done = new Map<TabulatedDistribution, number>();
  return ds.map((d, i) => {
    const known = done.get(d);
    if (known !== undefined) return known;
    const factors = ds.filter((_, j) => j !== i).map((o) => factor(o, 'cdf'));
    const value = Math.exp(logIntegral(d, factors));
    done.set(d, value);
    return value;
  });
}

/**
 * P(X_i is the highest) for each i: ∫ f_i Π_{j≠i} F_j on i's grid (split where a narrower posterior
 * needs it), divided by their sum so they add to 1. Identical inputs give identical outputs (1/k each).
 * Tiny probabilities keep their relative accuracy (each is integrated directly).
 * Cost: O(k × nodes) on a shared grid (3+ posteriors in one coordinate), else O(k² × nodes kept).
 * Throws StatsError('invalid_argument') for an empty list.
 * @example
 * const [x, y] = [tabulate(betaWorkingDensity(4, 8)), tabulate(betaWorkingDensity(6, 6))];
 * highestProbabilities([x, y]) //=> [0.19349845201238…, 0.80650154798761…] (125/646, 521/646)
 */
export function highestProbabilities(ds: readonly TabulatedDistribution[]): number[] {
  const raw = highestProbabilityIntegrals(ds);
  let sum = 0;
  for (const r of raw) sum += r;
  if (!(sum > 0)) throw new StatsError('not_available', 'the probabilities of being highest could not be computed');
  return raw.map((r) => r / sum);
}

/**
 * P(X_i is the highest) for each i of posteriors each tabulated in its own coordinate, read through maps
 * into a coordinate w common to all (maps[i] gives table i's coordinate at w): one grid for all of them
 * (sharedHighest.ts mappedHighestIntegrals, O(k × nodes)), divided by their sum. When that grid would be
 * over its budget (a posterior too narrow for w's doubles), the per-variant integrals of
 * highestProbabilityIntegrals instead. Two posteriors take the per-variant integrals directly.
 * Throws StatsError('invalid_argument') for an empty list or maps of another length.
 */
export function mappedHighestProbabilities(
  ds: readonly TabulatedDistribution[],
  maps: readonly CoordinateMap[],
): number[] {
  checkList(ds);
  if (maps.length !== ds.length) {
    throw new StatsError('invalid_argument', `${maps.length} coordinate maps for ${ds.length} posteriors`);
  }
  let raw: number[] | undefined;
  if (ds.length >= 3) {
    try {
      raw = mappedHighestIntegrals(ds, maps);
    } catch (error) {
      if (!(error instanceof StatsError && error.code === 'not_available')) throw error;
    }
  }
  if (raw === undefined) return highestProbabilities(ds);
  let sum = 0;
  for (const r of raw) sum += r;
  if (!(sum > 0)) throw new StatsError('not_available', 'the probabilities of being highest could not be computed');
  return raw.map((r) => r / sum);
}
