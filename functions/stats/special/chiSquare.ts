/**
 * The chi-square distribution with real degrees of freedom k > 0: P(X ≤ x) = P(k/2, x/2) and
 * P(X > x) = Q(k/2, x/2), the regularized incomplete gamma functions (Abramowitz & Stegun 26.4.19),
 * each tail computed directly. Used for goodness-of-fit p-values such as the sample-ratio check.
 */
import { ensure } from '../errors';
import { gammaP, gammaQ } from './incompleteGamma';

function checkArguments(x: number, df: number, name: string): void {
  ensure(df > 0 && Number.isFinite(df), `${name} needs finite degrees of freedom above 0, got ${df}`);
  ensure(!Number.isNaN(x), `${name} needs a number x, got NaN`);
}

/**
 * The chi-square survival function P(X > x) with df degrees of freedom — the p-value of a chi-square
 * statistic x.
 *
 * Method: gammaQ(df/2, x/2), computed directly (continued fraction or series with Loader's saddle-point
 * prefactor), so a p-value of 1e-12 or 1e-300 keeps ~14 correct digits. Cost: O(1)–O(√df).
 * Throws StatsError('invalid_argument') for df ≤ 0, non-finite df or NaN x. x ≤ 0 gives 1.
 * @example chiSquareSf(16.16958, 2) //=> 0.0003081912580551022 (Excel's CHISQ.TEST help example: 0.0003082)
 */
export function chiSquareSf(x: number, df: number): number {
  checkArguments(x, df, 'chiSquareSf');
  if (x <= 0) return 1;
  return gammaQ(df / 2, x / 2);
}

/**
 * The chi-square distribution function P(X ≤ x) with df degrees of freedom.
 *
 * Method: gammaP(df/2, x/2), computed directly. Cost: O(1)–O(√df). Throws StatsError('invalid_argument')
 * for df ≤ 0, non-finite df or NaN x. x ≤ 0 gives 0.
 * @example chiSquareCdf(3.841458820694124, 1) //=> 0.95
 */
export function chiSquareCdf(x: number, df: number): number {
  checkArguments(x, df, 'chiSquareCdf');
  if (x <= 0) return 0;
  return gammaP(df / 2, x / 2);
}
