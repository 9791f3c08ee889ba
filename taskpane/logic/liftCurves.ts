/**
 * The curves of the panel's lift chart: for each challenger, how plausible each relative lift over the
 * control is (core liftDensityTable) and its middle 90% (core liftInterval at 0.9). Pure, on the core.
 */
import { liftDensityTable, liftInterval } from '../../functions/stats/conversion';
import type { BetaPrior, ConversionCounts } from '../../functions/stats/types';
import { UNIFORM_PRIOR } from '../../functions/stats/types';

/** One challenger's lift curve and its middle 90%. */
export interface LiftCurve {
  readonly name: string;
  /** Relative lifts (fractions: 0.1 is +10%), evenly spaced. */
  readonly lift: number[];
  /** The lift density there (per unit of lift). */
  readonly height: number[];
  readonly low90: number;
  readonly high90: number;
}

/** The most challengers the panel draws in one lift chart (more lines are not readable at 350 px). */
export const MAX_CHART_CHALLENGERS = 6;

/**
 * Lift curves of every challenger against the control (the first variant). Method: core liftDensityTable
 * (ratio densities by quadrature) and liftInterval (ratio quantiles). Cost: (k − 1) × points
 * one-dimensional integrals plus 2 quantiles per challenger.
 * Throws StatsError from the core for bad counts or prior; RangeError for more than MAX_CHART_CHALLENGERS
 * challengers or names that do not match the variants.
 * @example liftCurves([{ conversions: 412, visitors: 10412 }, { conversions: 463, visitors: 10388 }], ['Green', 'Orange'])[0].name //=> "Orange"
 */
export function liftCurves(
  variants: readonly ConversionCounts[],
  names: readonly string[],
  prior: BetaPrior = UNIFORM_PRIOR,
  points = 81,
): LiftCurve[] {
  if (names.length !== variants.length) throw new RangeError('one name per variant is needed');
  if (variants.length - 1 > MAX_CHART_CHALLENGERS) {
    throw new RangeError(`the chart shows at most ${MAX_CHART_CHALLENGERS} challengers`);
  }
  const table = liftDensityTable(variants, points, prior);
  const bands = liftInterval(variants, 0.9, prior);
  return table.densities.map((height, j) => ({
    name: names[j + 1] ?? '',
    lift: table.grid.slice(),
    height: height.slice(),
    low90: bands[j]?.lower ?? Number.NaN,
    high90: bands[j]?.upper ?? Number.NaN,
  }));
}
