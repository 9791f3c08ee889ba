import { priorFromHistory, priorFromInterval, priorFromMean } from '../../functions/stats/prior';
import { betaCdf, betaSf } from '../../functions/stats/special/incompleteBeta';
import { logBeta } from '../../functions/stats/special/gamma';
import reference from '../reference/priors/prior_fits.json';
import { relativeError, thrownStatsError } from '../helpers/assertions';

/** Beta–Binomial log likelihood without the binomial coefficients. */
function logLikelihood(x: readonly number[], n: readonly number[], a: number, b: number): number {
  return x.reduce((sum, xi, i) => sum + logBeta(xi + a, (n[i] as number) - xi + b) - logBeta(a, b), 0);
}

describe('priorFromMean', () => {
  it('gives alpha = mean·strength, beta = (1 − mean)·strength (a prior worth `strength` visitors, common practice)', () => {
    expect(priorFromMean(0.04, 500)).toEqual({ alpha: 20, beta: 480 });
    const p = priorFromMean(0.123, 7.5);
    expect(p.alpha + p.beta).toBeCloseTo(7.5, 14);
    expect(p.alpha / (p.alpha + p.beta)).toBeCloseTo(0.123, 14);
  });

  it.each([
    [0, 10, 'the mean rate must be between 0 and 1 (exclusive), got 0'],
    [1, 10, 'the mean rate must be between 0 and 1 (exclusive), got 1'],
    [0.5, 0, 'the strength must be greater than 0 visitors, got 0'],
    [0.5, -3, 'the strength must be greater than 0 visitors, got -3'],
    [Number.NaN, 3, 'the mean rate must be a number, got NaN'],
    [0.5, Infinity, 'the strength must be a finite number, got Infinity'],
  ])('rejects mean %p with strength %p', (mean, strength, message) => {
    const error = thrownStatsError(() => priorFromMean(mean, strength));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe(message);
  });
});

describe('priorFromInterval against scipy (test/reference/priors/prior_fits.py, prior_fits.json)', () => {
  it.each(reference.interval.map((c) => [c.low, c.high, c.level, c] as const))(
    '[%p, %p] at level %p',
    (low, high, level, c) => {
      const p = priorFromInterval(low, high, level);
      // scipy.optimize.fsolve on beta.cdf/beta.sf: both shapes agree to 1e-9 relative (the narrowest
      // range, worth ~1e8 visitors, is ill-conditioned: 1e-7).
      const tolerance = c.alpha + c.beta > 1e7 ? 1e-7 : 1e-9;
      expect(relativeError(p.alpha, c.alpha)).toBeLessThan(tolerance);
      expect(relativeError(p.beta, c.beta)).toBeLessThan(tolerance);
      // The defining property, through the incomplete beta: each tail holds (1 − level)/2.
      const tail = (1 - level) / 2;
      expect(relativeError(betaCdf(low, p.alpha, p.beta), tail)).toBeLessThan(1e-8);
      expect(relativeError(betaSf(high, p.alpha, p.beta), tail)).toBeLessThan(1e-8);
    },
  );

  it('is symmetric: the range [1 − high, 1 − low] swaps alpha and beta', () => {
    const p = priorFromInterval(0.02, 0.06, 0.9);
    const q = priorFromInterval(0.94, 0.98, 0.9);
    expect(relativeError(q.alpha, p.beta)).toBeLessThan(1e-9);
    expect(relativeError(q.beta, p.alpha)).toBeLessThan(1e-9);
  });

  it('uses level 0.9 by default', () => {
    expect(priorFromInterval(0.02, 0.06)).toEqual(priorFromInterval(0.02, 0.06, 0.9));
  });

  it('says when the range is too narrow to fit', () => {
    const error = thrownStatsError(() => priorFromInterval(0.5, 0.500001, 0.9));
    expect(error.code).toBe('not_available');
    expect(error.message).toBe(
      'the range 0.5 to 0.500001 is too narrow for a Beta prior at level 0.9: it would be worth more than 1e9 visitors',
    );
  });

  it('fits a U-shaped Beta to a range wider than the uniform prior gives (scipy: Beta(0.5638, 0.5638))', () => {
    const p = priorFromInterval(0.01, 0.99, 0.9);
    expect(p.alpha).toBeLessThan(1);
    expect(p.beta).toBeLessThan(1);
  });

  it.each([
    [0, 0.5, 0.9, 'the low end of the range must be between 0 and 1 (exclusive), got 0'],
    [0.1, 1, 0.9, 'the high end of the range must be between 0 and 1 (exclusive), got 1'],
    [0.3, 0.2, 0.9, 'the low end of the range (0.3) must be below the high end (0.2)'],
    [0.2, 0.2, 0.9, 'the low end of the range (0.2) must be below the high end (0.2)'],
    [0.1, 0.2, 1, 'the level must be between 0 and 1 (exclusive), got 1'],
    [0.1, 0.2, 0, 'the level must be between 0 and 1 (exclusive), got 0'],
  ])('rejects [%p, %p] at level %p', (low, high, level, message) => {
    const error = thrownStatsError(() => priorFromInterval(low, high, level));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe(message);
  });
});

describe('priorFromHistory, maximum likelihood, against scipy.stats.betabinom and mpmath (prior_fits.json)', () => {
  it.each(reference.likelihood.map((c, i) => [i, c] as const))('past results, set %p', (_i, c) => {
    const p = priorFromHistory(c.conversions, c.visitors);
    // scipy.optimize on sum(betabinom.logpmf), polished by Newton and by mpmath.findroot (40 digits) on
    // the digamma score equations; measured agreement 5e-11 or better.
    expect(relativeError(p.alpha, c.alpha)).toBeLessThan(1e-8);
    expect(relativeError(p.beta, c.beta)).toBeLessThan(1e-8);
    // And it is a maximum: nudging either shape by 1% lowers the likelihood.
    const best = logLikelihood(c.conversions, c.visitors, p.alpha, p.beta);
    for (const [fa, fb] of [
      [1.01, 1],
      [0.99, 1],
      [1, 1.01],
      [1, 0.99],
      [1.01, 1.01],
      [0.99, 0.99],
    ] as const) {
      expect(logLikelihood(c.conversions, c.visitors, p.alpha * fa, p.beta * fb)).toBeLessThan(best);
    }
  });

  it('throws the agreed message when the results vary no more than chance', () => {
    // Tarone's numerator Σ(x − np)² − pqΣn is −188 here (prior_fits.json "flat"): no extra spread.
    expect(reference.flat.taroneNumerator).toBeLessThan(0);
    const error = thrownStatsError(() => priorFromHistory(reference.flat.conversions, reference.flat.visitors));
    expect(error.code).toBe('not_available');
    expect(error.message).toBe(
      'the past results vary no more than chance would explain, so they do not pin down a prior strength; use PRIOR_FROM_MEAN with a strength you can defend',
    );
  });

  it('throws when no past result had a conversion', () => {
    const error = thrownStatsError(() => priorFromHistory([0, 0, 0], [100, 200, 300]));
    expect(error.code).toBe('not_available');
    expect(error.message).toMatch(/^none of the past results had a conversion/);
  });

  it('throws when the results look all-or-nothing (single-visitor results cannot show spread)', () => {
    const error = thrownStatsError(() => priorFromHistory([1, 0, 1, 0, 0], [1, 1, 1, 1, 1]));
    expect(error.code).toBe('not_available');
    expect(error.message).toMatch(/^the past results vary no more than chance would explain/);
  });
});

describe('priorFromHistory, method of moments (Kleinman 1973, weights n_i), against numpy (prior_fits.json)', () => {
  it.each(reference.moments.map((c, i) => [i, c] as const))('past results, set %p', (_i, c) => {
    const p = priorFromHistory(c.conversions, c.visitors, 'moments');
    expect(relativeError(p.alpha, c.alpha)).toBeLessThan(1e-10);
    expect(relativeError(p.beta, c.beta)).toBeLessThan(1e-10);
    expect(relativeError(1 / (p.alpha + p.beta + 1), c.rho)).toBeLessThan(1e-10);
  });

  it('throws the agreed message when the moment estimate of the extra variance is not positive', () => {
    const error = thrownStatsError(() =>
      priorFromHistory(reference.flat.conversions, reference.flat.visitors, 'moments'),
    );
    expect(error.code).toBe('not_available');
    expect(error.message).toMatch(/^the past results vary no more than chance would explain/);
  });

  it('agrees with maximum likelihood on the mean rate, which both take near the pooled rate', () => {
    const c = reference.likelihood[3] as (typeof reference.likelihood)[number];
    const ml = priorFromHistory(c.conversions, c.visitors);
    const mm = priorFromHistory(c.conversions, c.visitors, 'moments');
    expect(ml.alpha / (ml.alpha + ml.beta)).toBeCloseTo(mm.alpha / (mm.alpha + mm.beta), 3);
  });
});

describe('priorFromHistory input checks', () => {
  it.each([
    [[1, 2], [10, 10], 'a prior from history needs at least 3 past results, got 2'],
    [[1, 2, 3], [10, 10], 'there are 3 conversion counts for 2 visitor counts; give one of each per past result'],
    [[1, 2.5, 3], [10, 10, 10], '2.5 is not a whole number'],
    [[1, 2, 3], [10, 10.5, 10], '10.5 is not a whole number'],
    [[1, -2, 3], [10, 10, 10], '-2 is below 0; conversions must be 0 or more'],
    [[1, 12, 3], [10, 10, 10], '12 conversions is more than the 10 visitors'],
    [[0, 0, 3], [10, 0, 10], '0 visitors is too few; each past result needs at least 1 visitor'],
  ])('rejects %j of %j', (x, n, message) => {
    const error = thrownStatsError(() => priorFromHistory(x, n));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe(message);
  });

  it('rejects an unknown method', () => {
    const error = thrownStatsError(() => priorFromHistory([1, 2, 3], [10, 10, 10], 'median' as 'moments'));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe('the method must be "likelihood" or "moments", got "median"');
  });
});
