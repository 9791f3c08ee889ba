import { differenceCdf, differenceSf, ratioCdf, ratioSf } from '../../functions/stats/compare';
import { liftInterval, posteriorOf, rateDiffInterval } from '../../functions/stats/conversion';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import type { IntervalWithMedian } from '../../functions/stats/types';
import reference from '../reference/conversion/lift_quantiles_more.json';
import { relativeError } from '../helpers/assertions';

/*
 * Quantiles of the lift p_B/p_A − 1 and of the difference p_B − p_A (compare/ ratioQuantile and
 * differenceQuantile through conversion.liftInterval and rateDiffInterval at the 95% level).
 *
 * Reference values: test/reference/conversion/lift_quantiles_more.json, printed by
 *   python3 test/reference/conversion/lift_quantiles_more.py > test/reference/conversion/lift_quantiles_more.json
 * (mpmath 1.3.0 at 30 digits: the ratio and difference tails as composite Gauss–Legendre integrals of one
 * posterior's density against the other's tail, Newton’s method on them to 1e-22; its tails-sum-to-one
 * self-check is printed under "checks").
 */

type Counts = { conversions: number; visitors: number };
const counts = (row: readonly number[]): Counts => ({ conversions: row[0] as number, visitors: row[1] as number });

const cases = reference.cases.map((c) => [c.why, c] as const);

describe('liftInterval and rateDiffInterval against mpmath (lift_quantiles_more.py): 2.5%, 50%, 97.5% to 1e-10', () => {
  it.each(cases)('%s', (_why, c) => {
    const vs = [counts(c.control), counts(c.challenger)];
    const [lift] = liftInterval(vs, 0.95, UNIFORM_PRIOR) as [IntervalWithMedian];
    const [diff] = rateDiffInterval(vs, 0.95, UNIFORM_PRIOR) as [IntervalWithMedian];
    const [l0, l1, l2] = c.lift.map(Number) as [number, number, number];
    const [d0, d1, d2] = c.difference.map(Number) as [number, number, number];
    expect(Math.abs(lift.lower - l0)).toBeLessThan(1e-10);
    expect(Math.abs(lift.median - l1)).toBeLessThan(1e-10);
    expect(Math.abs(lift.upper - l2)).toBeLessThan(1e-10);
    expect(Math.abs(diff.lower - d0)).toBeLessThan(1e-10);
    expect(Math.abs(diff.median - d1)).toBeLessThan(1e-10);
    expect(Math.abs(diff.upper - d2)).toBeLessThan(1e-10);
  });
});

describe('cdf(quantile(p)) = p to 1e-12 relative (ratioCdf, differenceCdf at the quantiles returned)', () => {
  const ps = [0.025, 0.5, 0.975] as const;

  function quantiles(c: (typeof reference.cases)[number]) {
    const vs = [counts(c.control), counts(c.challenger)];
    const [lift] = liftInterval(vs, 0.95, UNIFORM_PRIOR) as [IntervalWithMedian];
    const [diff] = rateDiffInterval(vs, 0.95, UNIFORM_PRIOR) as [IntervalWithMedian];
    const x = posteriorOf(vs[0] as Counts, UNIFORM_PRIOR);
    const y = posteriorOf(vs[1] as Counts, UNIFORM_PRIOR);
    return { x, y, lift: [lift.lower, lift.median, lift.upper], diff: [diff.lower, diff.median, diff.upper] };
  }

  it.each(cases)('%s: P(V ≤ q_p) relative to p', (_why, c) => {
    const { x, y, lift, diff } = quantiles(c);
    ps.forEach((p, k) => {
      expect(relativeError(ratioCdf(y, x, lift[k] as number), p)).toBeLessThan(1e-12);
      expect(relativeError(differenceCdf(y, x, diff[k] as number), p)).toBeLessThan(1e-12);
    });
  });

  // At a billion visitors the nodes' working values are stored to ~4e-16 (3e-12 standard deviations), so
  // a tail there carries ~1e-12 of rounding noise and the solver stops at that noise (README, "Method and
  // accuracy"): 3e-12 there, 1e-12 elsewhere.
  it.each(cases)(
    '%s: the 97.5% quantile’s upper tail P(V > q) relative to 0.025 (the tail the solver uses)',
    (_why, c) => {
      const { x, y, lift, diff } = quantiles(c);
      const bar = Math.max(...c.control, ...c.challenger) >= 1e8 ? 3e-12 : 1e-12;
      expect(relativeError(ratioSf(y, x, lift[2] as number), 0.025)).toBeLessThan(bar);
      expect(relativeError(differenceSf(y, x, diff[2] as number), 0.025)).toBeLessThan(bar);
    },
  );
});
