/**
 * Chi-square tails against mpmath 1.2 (gammainc at 40 digits; test/reference/special/special_reference.py),
 * Excel's CHISQ.TEST help example and R's chisq.test values (both from docs/check-values.md).
 */
import { chiSquareCdf, chiSquareSf } from '../../../functions/stats/special/chiSquare';
import reference from '../../reference/special/special_values.json';
import { expectInvalidArgument, relativeErrorOrAbsoluteAtZero } from '../../helpers/assertions';

/** One reference row; each table uses its leading columns (see special_reference.py). */
type Row = [number, number, number, number, number, number];
const rows = (name: string): Row[] => (reference as unknown as Record<string, Row[]>)[name] ?? [];

describe('chiSquareSf / chiSquareCdf against mpmath', () => {
  it.each(rows('chiSquare').map((r) => [r[0], r[1], r[2], r[3]] as const))('x = %p, df = %p', (x, df, cdf, sf) => {
    expect(Math.abs(chiSquareCdf(x, df) - cdf)).toBeLessThanOrEqual(1e-13);
    expect(relativeErrorOrAbsoluteAtZero(chiSquareSf(x, df), sf)).toBeLessThanOrEqual(1e-12);
  });
  it('gives p ≈ 1e-12 with far more than 6 correct digits', () => {
    // df = 2: P(X > x) = e^(−x/2) exactly (closed form), so x = 24·ln 10 gives 1e-12
    const x = 24 * Math.LN10;
    expect(relativeErrorOrAbsoluteAtZero(chiSquareSf(x, 2), Math.exp(-x / 2))).toBeLessThan(1e-13);
    const row = rows('chiSquare').find((r) => r[0] === 55 && r[1] === 2);
    expect(row).toBeDefined();
    expect(relativeErrorOrAbsoluteAtZero(chiSquareSf(55, 2), (row as Row)[3] as number)).toBeLessThan(1e-13);
  });
});

describe('documented examples', () => {
  it("Excel's CHISQ.TEST example: χ² = 16.16958 with 2 df gives 0.0003082", () => {
    expect(chiSquareSf(16.16958, 2)).toBeCloseTo(0.0003082, 7);
  });
  it("R's chisq.test values (R 4.2, check-values.md)", () => {
    // > chisq.test(c(50410, 49590), p = c(0.5, 0.5))  X-squared = 6.7240, df = 1, p = 0.00951240487
    const first = (50410 - 50000) ** 2 / 50000 + (49590 - 50000) ** 2 / 50000;
    expect(first).toBeCloseTo(6.724, 12);
    expect(Math.abs(chiSquareSf(first, 1) - 0.00951240487)).toBeLessThanOrEqual(5e-12); // R printed 11 decimals
    // > chisq.test(c(20000, 20400, 39600), p = c(0.25, 0.25, 0.5))  X² = 12, df = 2, p = 0.00247875218
    expect(Math.abs(chiSquareSf(12, 2) - 0.00247875218)).toBeLessThanOrEqual(5e-12);
    expect(relativeErrorOrAbsoluteAtZero(chiSquareSf(12, 2), Math.exp(-6))).toBeLessThan(1e-14); // df = 2: e^(−x/2), closed form
  });
  it('has the exact limits', () => {
    expect(chiSquareSf(0, 3)).toBe(1);
    expect(chiSquareCdf(0, 3)).toBe(0);
    expect(chiSquareSf(-2, 3)).toBe(1);
    expect(chiSquareSf(Infinity, 3)).toBe(0);
  });
  it('throws invalid_argument with a message', () => {
    expectInvalidArgument(() => chiSquareSf(1, 0), /chiSquareSf needs finite degrees of freedom above 0, got 0/);
    expectInvalidArgument(() => chiSquareCdf(Number.NaN, 2), /chiSquareCdf needs a number x, got NaN/);
  });
});
