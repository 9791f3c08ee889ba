/**
 * The decision rule every *_DECISION shares: choose the variant with the smallest expected loss once that
 * loss is at most the largest acceptable loss (the expected-loss stopping rule; C. Stucchio, "Bayesian
 * A/B Testing at VWO", 2015). conversion.ts's decide applies the same rule to conversion rates; this one
 * takes the losses of any metric, in that metric's own units.
 */
import { ensure } from './errors';

/** What the rule recommends. */
export interface LossDecision {
  /** True when the variant at `index` may be chosen: its expected loss is at most maxLoss. */
  readonly choose: boolean;
  /** The variant with the smallest expected loss (0-based; the current leader when choose is false). */
  readonly index: number;
  /** Its expected loss, in the metric's units. */
  readonly loss: number;
  /** The threshold used, in the metric's units. */
  readonly maxLoss: number;
}

/** The default largest acceptable loss: this share of the control's posterior mean (1%, as DECISION). */
export const DEFAULT_LOSS_SHARE = 0.01;

/**
 * Checks a user's max_loss (a finite number ≥ 0, in the metric's units) and returns it, or the default
 * DEFAULT_LOSS_SHARE × |controlMean| when it is undefined.
 * Throws StatsError('invalid_argument') for a max_loss below 0 or not finite, naming the argument.
 * @example lossThreshold(undefined, 2.5) //=> 0.025
 */
export function lossThreshold(maxLoss: number | undefined, controlMean: number): number {
  if (maxLoss !== undefined) {
    ensure(
      Number.isFinite(maxLoss) && maxLoss >= 0,
      `max_loss: ${maxLoss} is not allowed; the largest acceptable loss is a number of at least 0, in the metric's units`,
    );
    return maxLoss;
  }
  return DEFAULT_LOSS_SHARE * Math.abs(controlMean);
}

/**
 * The rule itself: the variant with the smallest loss (the first of equal ones), chosen when its loss is
 * at most maxLoss. Cost: O(k).
 * Throws StatsError('invalid_argument') for an empty list or a loss that is not a number ≥ 0.
 * @example chooseByLoss([0.3, 0.0001], 0.001) //=> { choose: true, index: 1, loss: 0.0001, maxLoss: 0.001 }
 */
export function chooseByLoss(losses: readonly number[], maxLoss: number): LossDecision {
  ensure(losses.length > 0, 'at least one expected loss is needed');
  losses.forEach((l, i) =>
    ensure(l >= 0 && Number.isFinite(l), `the expected loss of variant ${i + 1} is not a number of at least 0: ${l}`),
  );
  let index = 0;
  losses.forEach((l, i) => {
    if (l < (losses[index] as number)) index = i;
  });
  const loss = losses[index] as number;
  return { choose: loss <= maxLoss, index, loss, maxLoss };
}
