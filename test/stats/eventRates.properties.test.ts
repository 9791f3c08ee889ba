/**
 * Identities of the Gamma–Poisson read-out (functions/stats/eventRates.ts) on random inputs
 * (fast-check, fixed seed): probabilities of being highest sum to 1, P(A > B) + P(B > A) = 1,
 * cdf(quantile(p)) = p through the independent incomplete gamma/beta functions, expected-loss differences
 * equal posterior-mean differences, and the quadrature path (quadrature/ + compare/) agrees with the
 * closed forms used in production (I_z(a_A, a_B) for P(B > A), the F form of the lift).
 */
import fc from 'fast-check';
import { probabilityGreater, ratioQuantile, highestProbabilities } from '../../functions/stats/compare';
import {
  eventsExpectedLoss,
  eventsLiftInterval,
  eventsProbAboveControl,
  eventsProbHighest,
  eventsRateInterval,
} from '../../functions/stats/eventRates';
import { gammaWorkingDensity } from '../../functions/stats/gammaDensity';
import { tabulate } from '../../functions/stats/quadrature';
import { betaCdf } from '../../functions/stats/special/incompleteBeta';
import { gammaP, gammaQ } from '../../functions/stats/special/incompleteGamma';
import type { EventCounts, GammaPrior } from '../../functions/stats/types';

const variant = fc.record({
  events: fc.integer({ min: 0, max: 1_000_000 }),
  exposure: fc.double({ min: 1, max: 1e6, noNaN: true }),
});
const prior = fc.record({
  shape: fc.double({ min: 0.2, max: 5, noNaN: true }),
  rate: fc.double({ min: 0, max: 50, noNaN: true }),
});
const settings = { numRuns: 25, seed: 20261201 };

const posterior = (v: EventCounts, p: GammaPrior): [number, number] => [p.shape + v.events, p.rate + v.exposure];

describe('eventRates identities (fast-check)', () => {
  test('P(highest) sums to 1 and P(A > B) + P(B > A) = 1', () => {
    fc.assert(
      fc.property(fc.array(variant, { minLength: 2, maxLength: 5 }), prior, (vs, p) => {
        const highest = eventsProbHighest(vs, p);
        expect(Math.abs(highest.reduce((s, x) => s + x, 0) - 1)).toBeLessThanOrEqual(1e-12);
        const [ab = NaN] = eventsProbAboveControl([vs[0] as EventCounts, vs[1] as EventCounts], p);
        const [ba = NaN] = eventsProbAboveControl([vs[1] as EventCounts, vs[0] as EventCounts], p);
        expect(Math.abs(ab + ba - 1)).toBeLessThanOrEqual(1e-12);
      }),
      settings,
    );
  });

  test('cdf(quantile(p)) = p for rate intervals (incomplete gamma) and lifts (incomplete beta)', () => {
    fc.assert(
      fc.property(variant, variant, prior, fc.double({ min: 0.5, max: 0.999, noNaN: true }), (a, b, p, level) => {
        const tail = (1 - level) / 2;
        const [shapeA, rateA] = posterior(a, p);
        const [shapeB, rateB] = posterior(b, p);
        const [interval] = eventsRateInterval([a], level, p);
        expect(Math.abs(gammaP(shapeA, (interval?.lower ?? NaN) * rateA) - tail)).toBeLessThanOrEqual(1e-10 * tail);
        expect(Math.abs(gammaQ(shapeA, (interval?.upper ?? NaN) * rateA) - tail)).toBeLessThanOrEqual(1e-10 * tail);
        // P(λ_B/λ_A ≤ r) = I_x(a_B, a_A), x = k/(1 + k), k = r·b_B/b_A (derived in eventRates.ts).
        const [lift] = eventsLiftInterval([a, b], level, p);
        const at = (m: number): [number, number] => {
          const k = ((1 + m) * rateB) / rateA;
          return [k / (1 + k), 1 / (1 + k)];
        };
        // Conditioning of this round trip: a lift is returned to ~1e-16 absolute, so 1 + lift carries a
        // relative error ~2.2e-16/(1 + lift), which moves I_x by up to (a_A + a_B)·that relative to itself.
        const roundTrip = (m: number): number => 1e-9 + (4.4e-16 * (shapeA + shapeB)) / (1 + m);
        const [xl] = at(lift?.lower ?? NaN);
        expect(Math.abs(betaCdf(xl, shapeB, shapeA) - tail)).toBeLessThanOrEqual(roundTrip(lift?.lower ?? NaN) * tail);
        const [, yu] = at(lift?.upper ?? NaN);
        // P(ratio > r) = I_{1−x}(a_A, a_B) with 1 − x = 1/(1 + k) formed directly.
        expect(Math.abs(betaCdf(yu, shapeA, shapeB) - tail)).toBeLessThanOrEqual(roundTrip(lift?.upper ?? NaN) * tail);
        expect(lift?.lower ?? NaN).toBeLessThanOrEqual(lift?.median ?? NaN);
        expect(lift?.median ?? NaN).toBeLessThanOrEqual(lift?.upper ?? NaN);
      }),
      settings,
    );
  });

  test('expected-loss differences equal posterior-mean differences; losses are ≥ 0', () => {
    fc.assert(
      fc.property(fc.array(variant, { minLength: 2, maxLength: 4 }), prior, (vs, p) => {
        const losses = eventsExpectedLoss(vs, p);
        const means = vs.map((v) => {
          const [s, r] = posterior(v, p);
          return s / r;
        });
        const scale = Math.max(...means);
        for (let i = 0; i < vs.length; i++) {
          expect(losses[i] ?? NaN).toBeGreaterThanOrEqual(0);
          const lhs = (losses[i] ?? NaN) - (losses[0] ?? NaN);
          expect(Math.abs(lhs - ((means[0] ?? NaN) - (means[i] ?? NaN)))).toBeLessThanOrEqual(1e-12 * scale);
        }
      }),
      settings,
    );
  });

  test('the quadrature path agrees with the closed forms used in production', () => {
    fc.assert(
      fc.property(variant, variant, prior, (a, b, p) => {
        const [sa, ra] = posterior(a, p);
        const [sb, rb] = posterior(b, p);
        const ta = tabulate(gammaWorkingDensity(sa, ra));
        const tb = tabulate(gammaWorkingDensity(sb, rb));
        const [closed = NaN] = eventsProbAboveControl([a, b], p);
        expect(Math.abs(probabilityGreater(tb, ta) - closed)).toBeLessThanOrEqual(1e-10);
        const [quadA = NaN, quadB = NaN] = highestProbabilities([ta, tb]);
        const [closedA = NaN, closedB = NaN] = eventsProbHighest([a, b], p);
        expect(Math.abs(quadA - closedA) + Math.abs(quadB - closedB)).toBeLessThanOrEqual(2e-10);
        const [lift] = eventsLiftInterval([a, b], 0.9, p);
        expect(Math.abs(ratioQuantile(tb, ta, 0.05) - (lift?.lower ?? NaN))).toBeLessThanOrEqual(
          1e-9 * Math.max(1, Math.abs(lift?.lower ?? NaN)),
        );
        expect(Math.abs(ratioQuantile(tb, ta, 0.5) - (lift?.median ?? NaN))).toBeLessThanOrEqual(
          1e-9 * Math.max(1, Math.abs(lift?.median ?? NaN)),
        );
        expect(Math.abs(ratioQuantile(tb, ta, 0.95) - (lift?.upper ?? NaN))).toBeLessThanOrEqual(
          1e-9 * Math.max(1, Math.abs(lift?.upper ?? NaN)),
        );
      }),
      settings,
    );
  });
});
