/**
 * The split check: is the traffic of an experiment divided between its variants the way it was planned?
 *
 * A sample ratio mismatch (SRM) — say 50,410 against 49,590 visitors in a planned 50/50 test — means the
 * assignment or the logging is broken, and the read-out of such a test cannot be trusted however good its
 * numbers look (A. Fabijan et al., "Diagnosing Sample Ratio Mismatch in Online Controlled Experiments: A
 * Taxonomy and Rules of Thumb for Practitioners", KDD 2019). The check is Pearson's chi-square test of
 * goodness of fit of the observed visitor counts against the planned shares. A p-value below about 0.001
 * is commonly treated as a broken split (common practice); look for the cause before reading the results.
 */
import { ensure } from './errors';
import { MAX_COUNT } from './limits';
import { chiSquareSf } from './special/chiSquare';

/** The result of the split check. */
export interface SrmResult {
  /** Pearson's X² = Σ (observed − expected)² / expected. */
  readonly statistic: number;
  /** Number of groups − 1. */
  readonly degreesOfFreedom: number;
  /** P(χ²(df) ≥ statistic): the chance of a split at least this uneven if the assignment works as planned. */
  readonly pValue: number;
}

/** Validates the inputs and returns the planned shares normalised to sum to 1. */
function checkedShares(visitors: readonly number[], plannedShares?: readonly number[]): number[] {
  ensure(Array.isArray(visitors), 'visitors must be a list of counts');
  ensure(visitors.length >= 2, 'the split check needs at least 2 groups');
  let total = 0;
  for (const v of visitors) {
    ensure(typeof v === 'number' && Number.isFinite(v), `${String(v)} is not a number`);
    ensure(v >= 0, `${v} is below 0; visitor counts must be 0 or more`);
    ensure(Number.isInteger(v), `${v} is not a whole number`);
    ensure(v <= MAX_COUNT, `${v} is larger than the largest count allowed (2^53)`);
    total += v;
  }
  ensure(total > 0, 'the groups have no visitors at all; the split check needs at least one visitor');
  if (plannedShares === undefined) return visitors.map(() => 1 / visitors.length);
  ensure(Array.isArray(plannedShares), 'planned shares must be a list of positive weights');
  ensure(
    plannedShares.length === visitors.length,
    `there are ${plannedShares.length} planned shares for ${visitors.length} groups; give one share per group`,
  );
  let weight = 0;
  for (const s of plannedShares) {
    ensure(typeof s === 'number' && Number.isFinite(s), `${String(s)} is not a number`);
    ensure(s > 0, `${s} is not a positive share; planned shares must be greater than 0`);
    weight += s;
  }
  ensure(Number.isFinite(weight), 'the planned shares are too large to add up; scale them down');
  return plannedShares.map((s) => s / weight);
}

/**
 * Pearson's chi-square goodness-of-fit test of an observed traffic split against the planned shares.
 *
 * Method: expected count of group i is e_i = N·w_i/Σw (N the total visitors, w the planned shares,
 * any positive weights; equal shares by default); X² = Σ (o_i − e_i)²/e_i with k − 1 degrees of freedom
 * and p = P(χ²_{k−1} ≥ X²) from {@link chiSquareSf}, which keeps its relative accuracy far into the tail
 * (p = 1e-12 to about 6 significant digits and beyond). This is the sample-ratio-mismatch check of
 * Fabijan et al., KDD 2019; a p-value below about 0.001 is commonly read as a broken split. As with any
 * test, checking it again and again while an experiment runs raises the chance of a false alarm.
 * Cost: O(k) for k groups.
 * Throws StatsError('invalid_argument') for fewer than 2 groups, counts that are not whole numbers ≥ 0
 * (or above 2^53), no visitors at all, shares that are not > 0, or shares of a different length.
 * @example srmTest([50410, 49590]) //=> { statistic: 6.724, degreesOfFreedom: 1, pValue: 0.00951240487… }
 */
export function srmTest(visitors: readonly number[], plannedShares?: readonly number[]): SrmResult {
  const shares = checkedShares(visitors, plannedShares);
  let total = 0;
  for (const v of visitors) total += v;
  let statistic = 0;
  visitors.forEach((observed, i) => {
    const expected = total * (shares[i] as number);
    const gap = observed - expected;
    statistic += (gap * gap) / expected;
  });
  const degreesOfFreedom = visitors.length - 1;
  return { statistic, degreesOfFreedom, pValue: chiSquareSf(statistic, degreesOfFreedom) };
}

/**
 * The p-value of the split check {@link srmTest}: the chance of a split at least this far from the
 * planned shares if the traffic is in fact assigned as planned. A tiny value (below about 0.001, common
 * practice) says the split is broken (sample ratio mismatch; Fabijan et al., KDD 2019).
 *
 * Method and cost as {@link srmTest}. Throws as {@link srmTest}.
 * @example srmPValue([20000, 20400, 39600], [1, 1, 2]) //=> 0.00247875217666… (X² = 12, df 2)
 */
export function srmPValue(visitors: readonly number[], plannedShares?: readonly number[]): number {
  return srmTest(visitors, plannedShares).pValue;
}
