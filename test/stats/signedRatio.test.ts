import { signedRatioCdf, signedRatioQuantile } from '../../functions/stats/compare';
import { posteriorOf } from '../../functions/stats/conversion';
import { tabulate } from '../../functions/stats/quadrature';
import { studentTWorkingDensity } from '../../functions/stats/studentTDensity';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import type { MeanSummary } from '../../functions/stats/types';
import liftReference from '../reference/conversion/lift_quantiles_more.json';
import signedReference from '../reference/means/means_signed_ratio.json';
import { expectStatsErrorExact, relativeError } from '../helpers/assertions';

/*
 * The ratio engine over both signs (compare/ratio.ts signedRatioQuantile, signedRatioCdf): the lift
 * Y/X − 1 when the denominator X may be negative with a small probability and the numerator Y may take
 * either sign, as the Normal model needs. Checked against
 *  - mpmath lift quantiles of two Beta posteriors (test/reference/conversion/lift_quantiles_more.json, printed by
 *    lift_quantiles_more.py; 30 digits): on positive variables the signed engine must give what the
 *    positive one gives;
 *  - scipy quadrature over both signs of the control (test/reference/means/means_signed_ratio.json, printed by
 *    means_signed_ratio.py: scipy.integrate.quad at epsrel 1e-13 and brentq), with a control whose
 *    posterior puts 4e-7 below zero and a challenger whose lift lies below −1;
 * and by the identity cdf(quantile(p)) = p.
 */

const counts = (row: readonly number[]) => ({ conversions: row[0] as number, visitors: row[1] as number });
/** The t posterior of a mean (reference prior): ν = count − 1, centre = mean, scale = sd/√count. */
const meanTable = (v: MeanSummary) => tabulate(studentTWorkingDensity(v.count - 1, v.mean, v.sd / Math.sqrt(v.count)));

describe('on two positive posteriors the signed engine agrees with mpmath (lift_quantiles_more.py) to 1e-10', () => {
  it.each(liftReference.cases.map((c) => [c.why, c] as const))('%s', (_why, c) => {
    const x = posteriorOf(counts(c.control), UNIFORM_PRIOR);
    const y = posteriorOf(counts(c.challenger), UNIFORM_PRIOR);
    const want = c.lift.map(Number);
    [0.025, 0.5, 0.975].forEach((p, k) => {
      expect(Math.abs(signedRatioQuantile(y, x, p) - (want[k] as number))).toBeLessThan(1e-10);
    });
  });
});

describe('over both signs of the control (scipy, means_signed_ratio.py) to 1e-9', () => {
  const kase = signedReference.cases[0] as (typeof signedReference.cases)[number];
  const [control, ...challengers] = kase.variants as MeanSummary[];
  const x = meanTable(control as MeanSummary);
  const tail = (1 - kase.level) / 2;

  it.each(challengers.map((v, i) => [v.mean, v, i] as const))('challenger with mean %p', (_mean, v, i) => {
    const y = meanTable(v);
    const want = kase.liftIntervals[i] as number[];
    [tail, 0.5, 1 - tail].forEach((p, k) => {
      expect(Math.abs(signedRatioQuantile(y, x, p) - (want[k] as number))).toBeLessThan(1e-9);
    });
  });

  it('a lift below −1 (a challenger mean below zero) is reached, and cdf(quantile(p)) = p to 1e-12', () => {
    const y = meanTable(challengers[1] as MeanSummary);
    for (const p of [0.025, 0.5, 0.975]) {
      const q = signedRatioQuantile(y, x, p);
      expect(relativeError(signedRatioCdf(y, x, q), p)).toBeLessThan(1e-12);
    }
    expect(signedRatioQuantile(y, x, 0.5)).toBeLessThan(-1);
  });
});

describe('argument checks', () => {
  const x = posteriorOf(counts([10, 100]), UNIFORM_PRIOR);
  it('refuses a probability outside (0, 1) and a lift that is not finite', () => {
    expectStatsErrorExact(
      () => signedRatioQuantile(x, x, 1),
      'invalid_argument',
      'a probability must be strictly between 0 and 1, not 1',
    );
    expectStatsErrorExact(
      () => signedRatioCdf(x, x, NaN),
      'invalid_argument',
      'a relative lift must be a finite number, not NaN',
    );
  });
});
