/**
 * What the Prior section says about a Beta prior: its mean, its central 90% range, what it is worth in
 * visitors, whether it would dominate a typical test, and the points of its density curve. Pure
 * functions over the core's Beta special functions.
 */
import type { BetaPrior } from '../../functions/stats/types';
import { betaLogDensity, betaQuantile } from '../../functions/stats/special/incompleteBeta';
import { DEFAULT_LOCALE, formatCount, type NumberLocale } from './inputs';

/** How strongly a prior weighs against the test's own data. */
export type PriorWeight = 'light' | 'noticeable' | 'dominant';

/** The numbers and words the Prior section shows for one prior. */
export interface PriorSummary {
  readonly alpha: number;
  readonly beta: number;
  /** alpha / (alpha + beta). */
  readonly mean: number;
  /** Central 90% range: the 5% and 95% quantiles. */
  readonly low90: number;
  readonly high90: number;
  /** alpha + beta: "worth that many visitors" (common practice). */
  readonly worth: number;
  readonly weight: PriorWeight;
  /** A sentence for the user when the prior weighs noticeably or dominates, else null. */
  readonly warning: string | null;
}

/**
 * The rule, in words, that `summarizePrior` applies (shown beside the warning).
 * Our own rule of thumb: the prior acts like `worth` extra visitors added to every variant, so set
 * against the visitors each variant will get it dominates when it is worth more, and pulls noticeably
 * when it is worth more than a quarter of them.
 */
export const PRIOR_WEIGHT_RULE =
  'Rule used: a Beta prior counts like alpha + beta extra visitors in every variant. Worth more than the visitors each variant will get, it dominates the read-out; worth more than a quarter of them, it pulls the results noticeably.';

/**
 * Summarize a Beta prior against the visitors each variant is planned to get.
 * Method: mean α/(α+β); 90% range from the Beta quantile (core betaQuantile); weight by
 * PRIOR_WEIGHT_RULE. Cost: two Beta quantiles (microseconds).
 * Throws StatsError('invalid_argument') (from the core) for alpha or beta ≤ 0; RangeError for a
 * planned size that is not a positive number.
 * @example summarizePrior({ alpha: 20, beta: 480 }, 10000).weight //=> "light" (mean 0.04, worth 500)
 */
export function summarizePrior(
  prior: BetaPrior,
  plannedPerVariant: number,
  locale: NumberLocale = DEFAULT_LOCALE,
): PriorSummary {
  if (!(plannedPerVariant > 0) || !Number.isFinite(plannedPerVariant)) {
    throw new RangeError('the planned visitors per variant must be a positive number');
  }
  const { alpha, beta } = prior;
  const low90 = betaQuantile(0.05, alpha, beta);
  const high90 = betaQuantile(0.95, alpha, beta);
  const worth = alpha + beta;
  const weight: PriorWeight =
    worth > plannedPerVariant ? 'dominant' : worth > plannedPerVariant / 4 ? 'noticeable' : 'light';
  const worthText = formatCount(worth, locale);
  const plannedText = formatCount(plannedPerVariant, locale);
  const warning =
    weight === 'dominant'
      ? `This prior is worth about ${worthText} visitors, more than the ${plannedText} each variant will get: it would outweigh the test's own data. Use a weaker prior unless you can defend it to others.`
      : weight === 'noticeable'
        ? `This prior is worth about ${worthText} visitors, more than a quarter of the ${plannedText} each variant will get: it will pull the results noticeably towards its mean.`
        : null;
  return { alpha, beta, mean: alpha / worth, low90, high90, worth, weight, warning };
}

/** Points of a density curve for a chart. */
export interface Curve {
  readonly x: number[];
  readonly y: number[];
}

/**
 * The Beta(alpha, beta) density on an even grid between its 0.05% and 99.95% quantiles (where a
 * shape below 1 makes the density infinite at 0 or 1, the grid stops short of it).
 * Method: core betaLogDensity, exponentiated. Cost O(points) density evaluations.
 * Throws RangeError for fewer than 2 points; StatsError from the core for bad shapes.
 * @example priorDensityCurve({ alpha: 2, beta: 2 }, 3).y[1] //=> 1.5 (the Beta(2,2) density at ½)
 */
export function priorDensityCurve(prior: BetaPrior, points = 121): Curve {
  if (!Number.isInteger(points) || points < 2) throw new RangeError('a curve needs at least 2 points');
  const lo = betaQuantile(0.0005, prior.alpha, prior.beta);
  const hi = betaQuantile(0.9995, prior.alpha, prior.beta);
  const x: number[] = [];
  const y: number[] = [];
  for (let i = 0; i < points; i += 1) {
    const t = lo + ((hi - lo) * i) / (points - 1);
    const logDensity = t > 0 && t < 1 ? betaLogDensity(t, prior.alpha, prior.beta) : Number.NaN;
    if (Number.isFinite(logDensity)) {
      x.push(t);
      y.push(Math.exp(logDensity));
    }
  }
  return { x, y };
}
