import fc from 'fast-check';
import { betaWorkingDensity } from '../../functions/stats/betaDensity';
import { expectedLosses } from '../../functions/stats/compare';
import { expectedLoss } from '../../functions/stats/conversion';
import { tabulate } from '../../functions/stats/quadrature';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import reference from '../reference/conversion/loss_many_values.json';
import { relativeError } from '../helpers/assertions';

/*
 * Expected loss of 3–6 conversion variants (the shared-grid path of compare/losses.ts expectedLosses, taken for
 * three or more posteriors in the 'logit' coordinate).
 *
 * Reference values: test/reference/conversion/loss_many_values.json, printed by
 *   python3 test/reference/conversion/loss_many_reference.py > test/reference/conversion/loss_many_values.json
 * (mpmath 1.3.0 at 38 digits: loss_i = ∫ F_i (1 − Π_{j≠i} F_j) dx by a composite 12-point Gauss–Legendre
 * rule in logit, F from the density by the same rule; step halving, mpmath.quad with mpmath.betainc on
 * the small case and the mean identity are its self-checks, printed under "checks").
 */

type Counts = { conversions: number; visitors: number };

const counts = (rows: readonly (readonly number[])[]): Counts[] =>
  rows.map(([conversions = NaN, visitors = NaN]) => ({ conversions, visitors }));

/** Posterior mean under the uniform prior, (1 + conversions)/(2 + visitors). */
const mean = (v: Counts): number => (1 + v.conversions) / (2 + v.visitors);

/** A loss this small is held to 1e-6 relative (the brief's bar for the tiny losses of a far leader). */
const TINY = 1e-12;

describe('conversion.expectedLoss of 3–6 variants against mpmath (loss_many_reference.py, 38 digits)', () => {
  const cases = reference.cases.map((c) => [c.why, c] as const);

  it.each(cases)('%s', (_why, c) => {
    const vs = counts(c.variants);
    const got = expectedLoss(vs, UNIFORM_PRIOR);
    expect(got).toHaveLength(vs.length);
    c.loss.forEach((text, i) => {
      const want = Number(text);
      const tolerance = want < TINY ? 1e-6 : 1e-9;
      expect(relativeError(got[i] as number, want)).toBeLessThan(tolerance);
    });
  });

  it.each(cases)('%s: loss_i − loss_j = mean_j − mean_i to 1e-12', (_why, c) => {
    // E[max] − mean_i is the loss of i, so the difference of two losses is the difference of the means
    // (exact rationals here), whatever E[max] is.
    const vs = counts(c.variants);
    const got = expectedLoss(vs, UNIFORM_PRIOR);
    for (let i = 0; i < vs.length; i++) {
      for (let j = 0; j < vs.length; j++) {
        const identity = (got[i] as number) - (got[j] as number) - (mean(vs[j] as Counts) - mean(vs[i] as Counts));
        expect(Math.abs(identity)).toBeLessThan(1e-12);
      }
    }
  });

  it('covers the cases asked for: 3 to 6 variants, a leader loss from 1e-20 to 1e-40 and below, 0 and all conversions', () => {
    const sizes = reference.cases.map((c) => c.variants.length);
    expect(Math.min(...sizes)).toBe(3);
    expect(Math.max(...sizes)).toBe(6);
    const smallest = reference.cases.map((c) => Math.min(...c.loss.map(Number)));
    expect(smallest.some((v) => v < 1e-19 && v > 1e-21)).toBe(true);
    expect(smallest.some((v) => v < 2e-40)).toBe(true);
    const rows = reference.cases.flatMap((c) => c.variants);
    expect(rows.some(([c]) => c === 0)).toBe(true);
    expect(rows.some(([c, n]) => c === n)).toBe(true);
  });
});

/*
 * The shared-grid path against the generic O(k³) path of expectedLosses: the same Beta posteriors
 * tabulated without a coordinate (generic path: Σ_{j≠i} ∫ f_j Π F_l G_i against densities) and with
 * coordinate 'logit' (shared grid: ∫ F_i (1 − Π F_j) dx on the union of panels). Neither is an outside
 * reference for the other, but they share no integration code: two independent quadratures of one
 * integral.
 *
 * What is fair: both paths claim accuracy relative to the loss itself (every term a positive integral,
 * pieces dropped only e^-46 below the running total), so 1e-9 relative is the bar for every loss a user
 * reads. Below ~1e-6 (a millionth of a rate, below any displayed digit) the brief allows 1e-15 absolute;
 * that is the first property. The second property holds even the tiny losses (down to 1e-300, below which
 * exp underflows) to 1e-6 relative, the bar of the mpmath cases above, since both paths claim relative
 * accuracy there too.
 */
describe('expectedLosses: shared grid (coordinate logit) against the generic path (fast-check, seeded)', () => {
  const variant = fc
    .tuple(
      fc.double({ min: 0, max: 9, noNaN: true }),
      fc.oneof(fc.constant(0), fc.constant(1), fc.double({ min: 0, max: 1, noNaN: true })),
    )
    .map(([logVisitors, rate]) => {
      const visitors = Math.max(1, Math.round(10 ** logVisitors));
      return { conversions: Math.round(rate * visitors), visitors };
    });
  const group = fc.array(variant, { minLength: 3, maxLength: 8 });

  function both(vs: readonly Counts[]): { shared: number[]; generic: number[] } {
    const shapes = vs.map((v) => [1 + v.conversions, 1 + v.visitors - v.conversions] as const);
    const shared = expectedLosses(shapes.map(([a, b]) => tabulate(betaWorkingDensity(a, b), { coordinate: 'logit' })));
    const generic = expectedLosses(shapes.map(([a, b]) => tabulate(betaWorkingDensity(a, b))));
    return { shared, generic };
  }

  it('agree to 1e-9 relative, or 1e-15 absolute for losses below 1e-6', () => {
    fc.assert(
      fc.property(group, (vs) => {
        const { shared, generic } = both(vs);
        shared.forEach((s, i) => {
          const g = generic[i] as number;
          const ok = Math.abs(s - g) <= 1e-9 * Math.abs(g) || (g < 1e-6 && Math.abs(s - g) <= 1e-15);
          if (!ok) throw new Error(`variant ${i}: shared ${s}, generic ${g} (relative ${relativeError(s, g)})`);
        });
      }),
      { seed: 20261201, numRuns: 150 },
    );
  });

  it('agree to 1e-6 relative on every loss above 1e-300 (the tiny ones included)', () => {
    fc.assert(
      fc.property(group, (vs) => {
        const { shared, generic } = both(vs);
        shared.forEach((s, i) => {
          const g = generic[i] as number;
          if (g < 1e-300 && s < 1e-300) return;
          if (!(relativeError(s, g) <= 1e-6)) throw new Error(`variant ${i}: shared ${s}, generic ${g}`);
        });
      }),
      { seed: 20261202, numRuns: 150 },
    );
  });
});
