import { srmPValue, srmTest } from '../../functions/stats/srm';
import { chiSquareSf } from '../../functions/stats/special/chiSquare';
import reference from '../reference/srm/srm_chisq.json';
import { relativeErrorFloored, thrownStatsError } from '../helpers/assertions';

describe('srmTest against the values in shared/check-values.md', () => {
  it('matches R chisq.test(c(50410, 49590), p = c(.5, .5)): p = 0.00951240487', () => {
    // R 4.2: X-squared = 6.724, df = 1, p-value = 0.00951240487 (shared/check-values.md)
    const result = srmTest([50410, 49590]);
    expect(result.statistic).toBeCloseTo(6.724, 12);
    expect(result.degreesOfFreedom).toBe(1);
    expect(relativeErrorFloored(result.pValue, 0.00951240487)).toBeLessThan(1e-9);
  });

  it('matches R chisq.test(c(20000, 20400, 39600), p = c(.25, .25, .5)): X² = 12, p = 0.00247875218', () => {
    const result = srmTest([20000, 20400, 39600], [0.25, 0.25, 0.5]);
    expect(result.statistic).toBeCloseTo(12, 10);
    expect(result.degreesOfFreedom).toBe(2);
    expect(relativeErrorFloored(result.pValue, 0.00247875218)).toBeLessThan(1e-8);
  });

  it("gives the p-value of Excel's CHISQ.TEST worked example through the same chi-square tail", () => {
    // Microsoft Excel help for CHISQ.TEST: a 3x2 independence table, chi-square 16.16958 with df 2,
    // result 0.0003082 (shared/check-values.md; R: pchisq(16.16958, 2, lower.tail = FALSE)).
    expect(chiSquareSf(16.16958, 2)).toBeCloseTo(0.0003082, 7);
  });
});

describe('srmTest against R chisq.test (test/reference/srm/srm_chisq.R, srm_chisq.json)', () => {
  it.each(reference.cases.map((c) => [c.visitors.join('/'), c] as const))('split %s', (_label, c) => {
    const weights = c.shares.every((s) => s === c.shares[0]) ? undefined : c.shares;
    const result = srmTest(c.visitors, weights);
    expect(result.degreesOfFreedom).toBe(c.df);
    if (c.statistic === 0) expect(result.statistic).toBe(0);
    else expect(relativeErrorFloored(result.statistic, c.statistic)).toBeLessThan(1e-10);
    // Far into the tail (down to 1e-85) the p-value keeps at least 6 correct digits; the statistic itself
    // carries a relative error of ~1e-13 at 250 million visitors, which the tail multiplies by X²/2.
    expect(relativeErrorFloored(result.pValue, c.pValue)).toBeLessThan(1e-6);
    expect(srmPValue(c.visitors, c.shares)).toBe(result.pValue);
  });

  it.each(reference.upperTails.map((t) => [t.x, t.df, t.p] as const))(
    'chi-square tail at %d with df %d equals R pchisq(lower.tail = FALSE)',
    (x, df, p) => {
      expect(relativeErrorFloored(chiSquareSf(x, df), p)).toBeLessThan(1e-6);
    },
  );
});

describe('srmTest identities', () => {
  it('does not depend on the scale of the planned shares', () => {
    const a = srmTest([900, 2100, 7000], [1, 2, 7]);
    const b = srmTest([900, 2100, 7000], [0.1, 0.2, 0.7]);
    expect(relativeErrorFloored(a.statistic, b.statistic)).toBeLessThan(1e-12);
    expect(relativeErrorFloored(a.pValue, b.pValue)).toBeLessThan(1e-10);
  });

  it('equals the two-sided normal test for two groups: X² is z² (common practice)', () => {
    // For two groups X² = (o1 − N/2)²/(N/4); here z = (50410 − 50000)/sqrt(25000).
    const z = 410 / Math.sqrt(25000);
    expect(srmTest([50410, 49590]).statistic).toBeCloseTo(z * z, 10);
  });

  it('is symmetric in the order of the groups', () => {
    expect(srmPValue([30210, 29790, 30500, 29500])).toBeCloseTo(srmPValue([29500, 30500, 29790, 30210]), 14);
  });
});

describe('srmTest input checks', () => {
  it.each([
    [[100], undefined, 'the split check needs at least 2 groups'],
    [[100, -1], undefined, '-1 is below 0; visitor counts must be 0 or more'],
    [[100, 2.5], undefined, '2.5 is not a whole number'],
    [[100, Number.NaN], undefined, 'NaN is not a number'],
    [[100, 2 ** 54], undefined, `${2 ** 54} is larger than the largest count allowed (2^53)`],
    [[0, 0], undefined, 'the groups have no visitors at all; the split check needs at least one visitor'],
    [[10, 20], [1, 0], '0 is not a positive share; planned shares must be greater than 0'],
    [[10, 20], [1, -2], '-2 is not a positive share; planned shares must be greater than 0'],
    [[10, 20], [1, Infinity], 'Infinity is not a number'],
    [[10, 20], [1, 1, 1], 'there are 3 planned shares for 2 groups; give one share per group'],
  ] as const)('rejects %j with shares %j', (visitors, shares, message) => {
    const error = thrownStatsError(() =>
      srmTest(visitors as readonly number[], shares as readonly number[] | undefined),
    );
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe(message);
  });
});
