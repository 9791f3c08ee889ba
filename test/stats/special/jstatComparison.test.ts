/**
 * Where jStat 1.9.6 (installed as a dev dependency) can and cannot be trusted, measured against the same
 * mpmath 1.2 reference values our own special functions are held to (special_values.json). The README can
 * quote this file: each "accurate" claim is an assertion that would fail if jStat changed, and each
 * "inaccurate" claim asserts the size of the error seen.
 */
import { betaCdf } from '../../../functions/stats/special/incompleteBeta';
import reference from '../../reference/special/special_values.json';
import { relativeError } from '../../helpers/assertions';

// jStat ships no types; its shape is declared here for the few functions compared.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const { jStat } = require('jstat') as {
  jStat: {
    ibeta(x: number, a: number, b: number): number;
    gammaln(x: number): number;
    lowRegGamma(a: number, x: number): number;
    beta: { inv(p: number, a: number, b: number): number };
    normal: { cdf(x: number, mean: number, sd: number): number; inv(p: number, mean: number, sd: number): number };
    chisquare: { cdf(x: number, df: number): number };
    studentt: { cdf(t: number, df: number): number; inv(p: number, df: number): number };
  };
};

/** One reference row; each table uses its leading columns (see special_reference.py). */
type Row = [number, number, number, number, number, number];
const rows = (name: string): Row[] => (reference as unknown as Record<string, Row[]>)[name] ?? [];
const find = (name: string, pick: (r: Row) => boolean): Row => {
  const row = rows(name).find(pick);
  if (!row) throw new Error(`no reference row in ${name}`);
  return row;
};

describe('jStat 1.9.6 where it is accurate', () => {
  it('ibeta for small shapes: absolute error below 1e-8', () => {
    for (const [x, a, b] of [
      [0.2, 8, 42],
      [0.5, 8, 10],
    ] as const) {
      const truth = find('betaNamed', (r) => r[0] === x && r[1] === a && r[2] === b)[3] as number;
      expect(Math.abs(jStat.ibeta(x, a, b) - truth)).toBeLessThan(1e-8);
    }
  });
  it('gammaln agrees with mpmath loggamma to 1e-12 relative away from its zeros at 1 and 2', () => {
    // measured: up to 4e-13 (x = 33.3); 4e-12 next to x = 1 and 2, where log Γ → 0
    for (const [x, truth] of rows('logGamma')) {
      if (x >= 2.5 || x <= 0.5) expect(relativeError(jStat.gammaln(x), truth)).toBeLessThan(1e-12);
    }
    expect(Math.abs(jStat.gammaln(2))).toBeGreaterThan(0); // not exactly 0 at x = 2 (truth 0)
  });
  it('normal.inv in the centre (p = 0.975) to 1e-12', () => {
    const truth = find('normalQuantile', (r) => r[0] === 0.975)[1] as number;
    expect(relativeError(jStat.normal.inv(0.975, 0, 1), truth)).toBeLessThan(1e-12);
  });
});

describe('jStat 1.9.6 where it is not', () => {
  it('ibeta(0.5, a, a) collapses for large a (truth 0.5 by symmetry; check-values.md)', () => {
    expect(Math.abs(jStat.ibeta(0.5, 1e6, 1e6) - 0.5)).toBeGreaterThan(0.05); // 0.4404 measured
    expect(jStat.ibeta(0.5, 1e7, 1e7)).toBeLessThan(0); // −0.17 measured: not even a probability
    expect(Math.abs(betaCdf(0.5, 1e7, 1e7) - 0.5)).toBeLessThan(1e-11); // ours, for contrast
  });
  it('ibeta(0.3, 0.5, 0.5) is off by ~2e-9 (R: 0.369010119565545)', () => {
    const error = Math.abs(jStat.ibeta(0.3, 0.5, 0.5) - 0.369010119565545);
    expect(error).toBeGreaterThan(1e-10);
    expect(error).toBeLessThan(1e-7);
  });
  it('beta.inv(0.5, 5e8, 5e8) is many standard deviations from ½ (the median, by symmetry)', () => {
    // measured here: 0.50027, i.e. 17 standard deviations (sd = √(¼/(1e9 + 1)) = 1.6e-5)
    const sd = Math.sqrt(0.25 / (1e9 + 1));
    expect(Math.abs(jStat.beta.inv(0.5, 5e8, 5e8) - 0.5) / sd).toBeGreaterThan(10);
  });
  it('normal.cdf underflows to 0 by x = −10 (truth 7.62e-24) and normal.inv loses the far tail', () => {
    const truth = find('normalCdf', (r) => r[0] === -10)[1] as number;
    expect(truth).toBeGreaterThan(7e-24);
    expect(jStat.normal.cdf(-10, 0, 1)).toBe(0);
    const q = find('normalQuantile', (r) => r[0] === 1e-20)[1] as number;
    expect(relativeError(jStat.normal.inv(1e-20, 0, 1), q)).toBeGreaterThan(1e-3);
  });
  it('chi-square p-values come from 1 − cdf, so a p-value of ~1e-13 keeps only ~3 digits', () => {
    // df = 2: P(X > 60) = e^−30 exactly (closed form)
    const error = relativeError(1 - jStat.chisquare.cdf(60, 2), Math.exp(-30));
    expect(error).toBeGreaterThan(1e-5);
  });
});
