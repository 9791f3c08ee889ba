import { betaWorkingDensity } from '../../functions/stats/betaDensity';
import { expectedLosses } from '../../functions/stats/compare';
import { expectedLoss } from '../../functions/stats/conversion';
import { StatsError } from '../../functions/stats/errors';
import { eventsExpectedLoss } from '../../functions/stats/eventRates';
import { tabulate } from '../../functions/stats/quadrature';
import reference from '../reference/conversion/loss_extreme_priors.json';
import { relativeError } from '../helpers/assertions';

/*
 * The shared-grid expected loss (compare/losses.ts) under very weak priors: issue #10's engine-abort
 * reproductions, whose posteriors at 0 conversions span windows ~2e8 (prior shape 1e-6) to ~2e14 (1e-12)
 * long in logit. The grid is graded away from its anchors, so its size grows with the logarithm of
 * that length; beyond its cell budget it stops with a clear error.
 *
 * Reference values: test/reference/conversion/loss_extreme_priors.json, printed by
 *   python3 test/reference/conversion/loss_extreme_priors.py > test/reference/conversion/loss_extreme_priors.json
 * (mpmath 1.3.0 at 40 digits: loss_i = ∫ F_i (1 − Π_{j≠i} F_j) dx by mpmath.quad with F from mpmath.betainc
 * or mpmath.gammainc; the 60,000-visitor case by scipy.special.betainc and scipy.integrate.quad, as marked
 * in the JSON's "by").
 */

type Case = (typeof reference.cases)[number];

function lossesOf(c: Case): number[] {
  const [counts, sizes, a, b] = c.inputs as [number[], number[], string, string];
  if (c.model === 'beta') {
    const variants = counts.map((conversions, i) => ({ conversions, visitors: sizes[i] as number }));
    return expectedLoss(variants, { alpha: Number(a), beta: Number(b) });
  }
  const variants = counts.map((events, i) => ({ events, exposure: sizes[i] as number }));
  return eventsExpectedLoss(variants, { shape: Number(a), rate: Number(b) });
}

describe('expected loss of three variants under very weak priors against mpmath/scipy (loss_extreme_priors.py)', () => {
  it.each(reference.cases.map((c) => [c.why, c] as const))('%s', (_why, c) => {
    const got = lossesOf(c);
    expect(got).toHaveLength(c.loss.length);
    c.loss.forEach((text, i) => {
      const want = Number(text);
      // A reference loss that underflows a double ("0": ~1e-18000 for the 60,000-visitor case) must be 0 here.
      if (want === 0) expect(got[i]).toBe(0);
      else expect(relativeError(got[i] as number, want)).toBeLessThan(1e-11);
    });
  });
});

describe('the shared grid stays within its cell budget', () => {
  const three = [
    tabulate(betaWorkingDensity(1e-6, 5001), { coordinate: 'logit' }),
    tabulate(betaWorkingDensity(15.000001, 4986), { coordinate: 'logit' }),
    tabulate(betaWorkingDensity(9.000001, 4992), { coordinate: 'logit' }),
  ];

  it('answers the 1e-6 prior case with a grid far below the budget (1,200 cells are enough)', () => {
    // Same values with a budget of 1,200 cells (400 pieces × 3 posteriors) as with the default: the grid
    // over a window 2.3e8 long has ~350 pieces (~200 of them within 64 of its anchors), not 2.3e8.
    const full = expectedLosses(three);
    const small = expectedLosses(three, 1200);
    expect(small).toEqual(full);
  });

  it('stops with not_available and a plain message when the budget would be exceeded', () => {
    let thrown: unknown;
    try {
      expectedLosses(three, 30);
    } catch (error) {
      thrown = error;
    }
    expect(thrown).toBeInstanceOf(StatsError);
    expect((thrown as StatsError).code).toBe('not_available');
    expect((thrown as StatsError).message).toBe(
      'the expected losses of these 3 variants need a finer comparison grid than one calculation may use ' +
        '(over 30 cells); compare fewer variants at once',
    );
  });
});

describe('the Beta working density far above the mode with a prior shape far below the visitors', () => {
  // Closed form (common practice): in z = logit x the Beta(a, b) density is ∝ exp(a z − (a + b) log(1 + e^z));
  // working densities are normalised to 0 at the mode z0 = log(a/b). Before the fix 1 + q0·(e^−d − 1)
  // rounded to 0 for Beta(1e-12, 60001) and the density was +Infinity for z ≥ 0.
  const a = 1e-12;
  const b = 60001;
  const density = betaWorkingDensity(a, b);
  const z0 = Math.log(a / b);
  const log1pExp = (z: number): number => (z > 30 ? z + Math.log1p(Math.exp(-z)) : Math.log1p(Math.exp(z)));
  const closedForm = (z: number): number => a * (z - z0) - (a + b) * (log1pExp(z) - log1pExp(z0));

  it.each([-5, -1, 0, 0.01, 1, 10, 40])('log density at z = %d agrees with the closed form to 1e-12', (z) => {
    const got = density.logDensity(z);
    expect(Number.isFinite(got)).toBe(true);
    expect(relativeError(got, closedForm(z))).toBeLessThan(1e-12);
  });

  it.each([-1, 0, 10])('slope at z = %d is finite and agrees with a − (a + b)·x (closed form)', (z) => {
    const x = 1 / (1 + Math.exp(-z));
    expect(relativeError(density.slope(z), a - (a + b) * x)).toBeLessThan(1e-12);
  });
});
