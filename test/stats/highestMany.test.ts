import { expectedLoss, probHighest } from '../../functions/stats/conversion';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import reference from '../reference/conversion/conversion_highest_many.json';

/*
 * P(each is highest) and the expected losses of 50 conversion variants (the worst-case bench's two
 * 50-variant scenarios, invented data; the shared-grid paths of compare/sharedHighest.ts and losses.ts).
 *
 * Reference values: test/reference/conversion/conversion_highest_many.json, printed by
 *   python3 test/reference/conversion/conversion_highest_many.py > test/reference/conversion/conversion_highest_many.json
 * (scipy's betainc and betaincinv in double precision, composite Gauss–Legendre in logit on every posterior's
 * quantile breakpoints; 20 against 32 nodes per interval agree to 1e-15, printed under "checks").
 * Tolerances: 1e-9 absolute for the probabilities (the project's bar), 1e-6 relative for those above
 * 1e-80 (the tables' window keeps tiny probabilities to about 1e-90: below, 0 may be returned, as for
 * 7.8e-196 here), 1e-9 relative for the losses.
 */

type Case = {
  name: string;
  conversions: number[];
  visitors: number[];
  probHighest: number[];
  expectedLoss: number[];
};

const cases = (reference as { cases: Case[] }).cases;

describe.each(cases.map((c) => [c.name, c] as const))('50 variants against scipy: %s', (_, c) => {
  const variants = c.conversions.map((conversions, i) => ({ conversions, visitors: c.visitors[i] as number }));

  it('P(highest) within 1e-9 absolute, and 1e-6 relative above 1e-80', () => {
    const values = probHighest(variants, UNIFORM_PRIOR);
    expect(values).toHaveLength(50);
    values.forEach((v, i) => {
      const r = c.probHighest[i] as number;
      expect(Math.abs(v - r)).toBeLessThanOrEqual(1e-9);
      if (r > 1e-80) expect(Math.abs(v - r)).toBeLessThanOrEqual(1e-6 * r);
    });
  });

  it('expected losses within 1e-9 relative', () => {
    const values = expectedLoss(variants, UNIFORM_PRIOR);
    values.forEach((v, i) => {
      const r = c.expectedLoss[i] as number;
      expect(Math.abs(v - r)).toBeLessThanOrEqual(1e-9 * r);
    });
  });
});
