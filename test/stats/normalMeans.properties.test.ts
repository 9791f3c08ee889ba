/**
 * Identities of the Normal-model read-out (functions/stats/normalMeans.ts) on random inputs (fast-check,
 * fixed seed): P(highest) sums to 1, P(A > B) + P(B > A) = 1, cdf(quantile(p)) = p through the independent
 * t distribution function (special/studentT.ts) and the difference distribution (compare/difference.ts), the
 * difference interval is symmetric about the difference of means, lifts are ordered, and expected-loss
 * differences equal mean differences.
 */
import fc from 'fast-check';
import { differenceCdf } from '../../functions/stats/compare';
import { tabulate } from '../../functions/stats/quadrature';
import {
  meanDiffInterval,
  meanExpectedLoss,
  meanInterval,
  meanLiftInterval,
  meanProbAboveControl,
  meanProbHighest,
} from '../../functions/stats/normalMeans';
import { studentTCdf } from '../../functions/stats/special/studentT';
import { studentTWorkingDensity } from '../../functions/stats/studentTDensity';
import type { MeanSummary } from '../../functions/stats/types';

const variant = fc.record({
  count: fc.integer({ min: 3, max: 1_000_000 }),
  mean: fc.double({ min: 1, max: 100, noNaN: true }),
  sd: fc.double({ min: 0.1, max: 50, noNaN: true }),
});
const settings = { numRuns: 20, seed: 20261202 };
const scaleOf = (v: MeanSummary): number => v.sd / Math.sqrt(v.count);

describe('normalMeans identities (fast-check)', () => {
  test('P(highest) sums to 1; P(A > B) + P(B > A) = 1', () => {
    fc.assert(
      fc.property(fc.array(variant, { minLength: 2, maxLength: 4 }), (vs) => {
        const highest = meanProbHighest(vs);
        expect(Math.abs(highest.reduce((s, x) => s + x, 0) - 1)).toBeLessThanOrEqual(1e-12);
        const [a, b] = vs as [MeanSummary, MeanSummary];
        const [ab = NaN] = meanProbAboveControl([a, b]);
        const [ba = NaN] = meanProbAboveControl([b, a]);
        expect(Math.abs(ab + ba - 1)).toBeLessThanOrEqual(1e-12);
      }),
      settings,
    );
  });

  test('cdf(quantile(p)) = p for mean intervals (t cdf) and difference intervals (difference cdf)', () => {
    fc.assert(
      fc.property(variant, variant, fc.double({ min: 0.5, max: 0.999, noNaN: true }), (a, b, level) => {
        const tail = (1 - level) / 2;
        const [interval] = meanInterval([a], level);
        const t = ((interval?.lower ?? NaN) - a.mean) / scaleOf(a);
        expect(Math.abs(studentTCdf(t, a.count - 1) - tail)).toBeLessThanOrEqual(1e-10 * tail);
        const [d] = meanDiffInterval([a, b], level);
        expect((d?.upper ?? NaN) - (d?.median ?? NaN)).toBeCloseTo((d?.median ?? NaN) - (d?.lower ?? NaN), 9);
        const ty = tabulate(studentTWorkingDensity(b.count - 1, b.mean, scaleOf(b)));
        const tx = tabulate(studentTWorkingDensity(a.count - 1, a.mean, scaleOf(a)));
        expect(Math.abs(differenceCdf(ty, tx, d?.lower ?? NaN) - tail)).toBeLessThanOrEqual(1e-9 * tail);
      }),
      settings,
    );
  });

  test('lift intervals are ordered and bracket the ratio of means when the control is clearly positive', () => {
    fc.assert(
      fc.property(variant, variant, (a, b) => {
        fc.pre(studentTCdf(-a.mean / scaleOf(a), a.count - 1) < 1e-12);
        const [l] = meanLiftInterval([a, b], 0.9);
        expect(l?.lower ?? NaN).toBeLessThan(l?.median ?? NaN);
        expect(l?.median ?? NaN).toBeLessThan(l?.upper ?? NaN);
        // Y − kX with k = mean_B/mean_A is symmetric about 0, so the median ratio is mean_B/mean_A up to
        // the control's chance of a negative mean (below 1e-12 here).
        expect(Math.abs((l?.median ?? NaN) - (b.mean / a.mean - 1))).toBeLessThanOrEqual(1e-9 * (b.mean / a.mean));
      }),
      settings,
    );
  });

  test('expected-loss differences equal mean differences; losses are ≥ 0', () => {
    fc.assert(
      fc.property(fc.array(variant, { minLength: 2, maxLength: 4 }), (vs) => {
        const losses = meanExpectedLoss(vs);
        const scale = Math.max(...vs.map((v) => v.mean));
        for (let i = 0; i < vs.length; i++) {
          expect(losses[i] ?? NaN).toBeGreaterThanOrEqual(0);
          const lhs = (losses[i] ?? NaN) - (losses[0] ?? NaN);
          expect(Math.abs(lhs - ((vs[0]?.mean ?? NaN) - (vs[i]?.mean ?? NaN)))).toBeLessThanOrEqual(1e-12 * scale);
        }
      }),
      settings,
    );
  });
});
