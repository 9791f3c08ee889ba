import fc from 'fast-check';
import { betaWorkingDensity } from '../../functions/stats/betaDensity';
import { highestProbabilityIntegrals } from '../../functions/stats/compare';
import { tabulate } from '../../functions/stats/quadrature';
import { relativeError } from '../helpers/assertions';

/*
 * P(each is highest) of 3–12 conversion variants: the shared-grid path (compare/sharedHighest.ts, taken for
 * three or more posteriors in one coordinate) against the per-variant integrals of compare/ranking.ts
 * (taken when the tables carry no coordinate). Both are checked against mpmath and scipy elsewhere
 * (conversion.test.ts; highestMany.test.ts at 50 variants); here they must agree with each other on random groups.
 */

type Counts = { conversions: number; visitors: number };

describe('highestProbabilityIntegrals: shared grid against the per-variant integrals (fast-check, seeded)', () => {
  const variant = fc
    .tuple(
      fc.double({ min: 0, max: 9, noNaN: true }),
      fc.oneof(fc.constant(0), fc.constant(1), fc.double({ min: 0, max: 1, noNaN: true })),
    )
    .map(([logVisitors, rate]) => {
      const visitors = Math.max(1, Math.round(10 ** logVisitors));
      return { conversions: Math.round(rate * visitors), visitors };
    });
  const group = fc.array(variant, { minLength: 3, maxLength: 12 });

  function both(vs: readonly Counts[]): { shared: number[]; generic: number[] } {
    const shapes = vs.map((v) => [1 + v.conversions, 1 + v.visitors - v.conversions] as const);
    const shared = highestProbabilityIntegrals(
      shapes.map(([a, b]) => tabulate(betaWorkingDensity(a, b), { coordinate: 'logit' })),
    );
    const generic = highestProbabilityIntegrals(shapes.map(([a, b]) => tabulate(betaWorkingDensity(a, b))));
    return { shared, generic };
  }

  // 1e-9, the project's bar against references: the per-variant path is the less accurate one next to a rate
  // of 1 (the mpmath checks below, where it misses by 1e-12 and 1e-10 and the shared grid by under 1e-15).
  it('agree to 1e-9 absolute, and each sums to 1 within 1e-12', () => {
    fc.assert(
      fc.property(group, (vs) => {
        const { shared, generic } = both(vs);
        const sum = shared.reduce((s, v) => s + v, 0);
        if (!(Math.abs(sum - 1) <= 1e-12)) throw new Error(`shared sum ${sum}`);
        shared.forEach((s, i) => {
          const g = generic[i] as number;
          if (!(Math.abs(s - g) <= 1e-9)) throw new Error(`variant ${i}: shared ${s}, generic ${g}`);
        });
      }),
      { seed: 20261205, numRuns: 120 },
    );
  });

  it('agree to 1e-6 relative on every probability above 1e-300 (the tiny ones included)', () => {
    fc.assert(
      fc.property(group, (vs) => {
        const { shared, generic } = both(vs);
        shared.forEach((s, i) => {
          const g = generic[i] as number;
          if (g < 1e-300 && s < 1e-300) return;
          if (!(relativeError(s, g) <= 1e-6)) throw new Error(`variant ${i}: shared ${s}, generic ${g}`);
        });
      }),
      { seed: 20261206, numRuns: 120 },
    );
  });

  // mpmath 1.3 at 40 digits, quad in y = 1 − x split at multiples of 1/a (a the second variant's first shape):
  // ∫ f_1 · x^c · x² · (1 − y²)², the cdfs of Beta(c, 1), Beta(2, 1) and twice Beta(1, 2) in closed form
  // (scripts in the comments of each case; values from mp.dps = 40).
  it.each([
    // a = 315473324 (b = 2: f_1 = x^(a−1)·y/B(a, 2)), c = 25251
    [25250, 25250, 315473323, 315473324, 0.9998399232760078],
    // a = 9922947 (b = 1: f_1 = a·x^(a−1)), c = 5249165
    [5249164, 5249164, 9922946, 9922946, 0.6540253388552068],
  ])('matches mpmath next to a rate of 1: %i of %i against %i of %i', (c0, n0, c1, n1, expected) => {
    const vs = [
      [c0, n0],
      [c1, n1],
      [0, 1],
      [1, 1],
      [0, 1],
    ];
    const tables = vs.map(([c, n]) => tabulate(betaWorkingDensity(1 + c!, 1 + n! - c!), { coordinate: 'logit' }));
    const values = highestProbabilityIntegrals(tables);
    expect(Math.abs((values[1] as number) - expected)).toBeLessThan(1e-14);
  });

  it('gives a table listed twice the identical value', () => {
    const x = tabulate(betaWorkingDensity(31, 970), { coordinate: 'logit' });
    const y = tabulate(betaWorkingDensity(40, 961), { coordinate: 'logit' });
    const values = highestProbabilityIntegrals([x, y, x, y, x]);
    expect(values[0]).toBe(values[2]);
    expect(values[0]).toBe(values[4]);
    expect(values[1]).toBe(values[3]);
    expect(values[1]).toBeGreaterThan(values[0] as number);
  });
});
