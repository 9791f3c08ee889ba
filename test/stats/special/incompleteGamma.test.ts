/**
 * Regularized incomplete gamma P, Q and the Gamma quantiles against mpmath 1.2 (gammainc at 40 digits for
 * a ≤ 2e4, tanh-sinh quadrature of the exact log density in log x above, cross-checked where both run;
 * test/reference/special/special_reference.py) and Excel's GAMMA.DIST help example (check-values.md).
 */
import fc from 'fast-check';
import {
  gammaP,
  gammaQ,
  gammaQuantile,
  gammaQuantileUpper,
  gammaTailLog,
} from '../../../functions/stats/special/incompleteGamma';
import reference from '../../reference/special/special_values.json';
import { expectInvalidArgument, relativeErrorOrAbsoluteAtZero } from '../../helpers/assertions';

/** One reference row; each table uses its leading columns (see special_reference.py). */
type Row = [number, number, number, number, number, number];
const rows = (name: string): Row[] => (reference as unknown as Record<string, Row[]>)[name] ?? [];

describe('gammaP / gammaQ against mpmath', () => {
  const cases = rows('gamma');
  it('spans shapes 0.1 … 1e9', () => {
    expect(cases.length).toBeGreaterThan(100);
    expect(Math.max(...cases.map((r) => r[0] as number))).toBe(1e9);
  });
  it.each(cases.map((r) => [r[0], r[1], r[2], r[3]] as const))('a = %p, x = %p', (a, x, P, Q) => {
    const p = gammaP(a, x);
    const q = gammaQ(a, x);
    // measured: absolute ≤ 2.2e-14, smaller-tail relative ≤ 1e-12
    expect(Math.abs(p - P)).toBeLessThanOrEqual(1e-13);
    expect(Math.abs(q - Q)).toBeLessThanOrEqual(1e-13);
    if (P < 0.5) expect(relativeErrorOrAbsoluteAtZero(p, P)).toBeLessThanOrEqual(1e-11);
    if (Q < 0.5) expect(relativeErrorOrAbsoluteAtZero(q, Q)).toBeLessThanOrEqual(1e-11);
  });
  it("matches Excel's GAMMA.DIST(10.00001131, 9, 2, TRUE) = 0.068094 (scale 2, so x/2)", () => {
    expect(gammaP(9, 10.00001131 / 2)).toBeCloseTo(0.068094, 6);
  });
  it('has exact limits and the closed form Q(1, x) = e^−x', () => {
    expect(gammaP(3, 0)).toBe(0);
    expect(gammaQ(3, 0)).toBe(1);
    expect(gammaP(3, Infinity)).toBe(1);
    expect(relativeErrorOrAbsoluteAtZero(gammaQ(1, 30), Math.exp(-30))).toBeLessThan(1e-14); // closed form
    expect(relativeErrorOrAbsoluteAtZero(gammaQ(1, 700), Math.exp(-700))).toBeLessThan(1e-13);
  });
});

describe('gammaQuantile / gammaQuantileUpper against mpmath', () => {
  const cases = rows('gammaQuantile');
  it.each(cases.map((r) => [r[0], r[1], r[2], r[3]] as const))('p = %p, shape %p', (p, a, lowerX, upperX) => {
    // the script's bisection stops at e^−740 ≈ 4e-322: such rows mean 'below the smallest double'
    if ((lowerX as number) > 1e-310)
      expect(relativeErrorOrAbsoluteAtZero(gammaQuantile(p, a), lowerX as number)).toBeLessThan(1e-12);
    else expect(gammaQuantile(p, a)).toBe(0); // below the smallest double
    expect(relativeErrorOrAbsoluteAtZero(gammaQuantileUpper(p, a), upperX as number)).toBeLessThan(1e-12);
  });
  it('has exact limits', () => {
    expect(gammaQuantile(0, 2)).toBe(0);
    expect(gammaQuantile(1, 2)).toBe(Infinity);
    expect(gammaQuantileUpper(0, 2)).toBe(Infinity);
    expect(gammaQuantileUpper(1, 2)).toBe(0);
  });
});

// A fixed seed keeps CI deterministic; change it locally to explore other random cases.
describe('identities (fast-check)', () => {
  const shape = fc.oneof(
    fc.double({ min: 0.1, max: 100, noNaN: true }),
    fc.double({ min: 100, max: 1e7, noNaN: true }),
    fc.constantFrom(0.5, 1, 1e9),
  );
  it('P + Q = 1 to 1e-14', () => {
    fc.assert(
      fc.property(shape, fc.double({ min: 1e-3, max: 4, noNaN: true }), (a, scale) => {
        const x = a * scale;
        expect(Math.abs(gammaP(a, x) + gammaQ(a, x) - 1)).toBeLessThanOrEqual(1e-14);
      }),
      { numRuns: 300, seed: 20261201 },
    );
  });
  it('P(quantile(p)) = p and Q(quantileUpper(q)) = q in the smaller tail', () => {
    const tail = fc.oneof(
      fc.double({ min: 1e-300, max: 1e-10, noNaN: true }),
      fc.double({ min: 1e-10, max: 0.5, noNaN: true }),
    );
    fc.assert(
      fc.property(tail, shape, (p, a) => {
        for (const upper of [false, true]) {
          const x = upper ? gammaQuantileUpper(p, a) : gammaQuantile(p, a);
          if (x === 0 || x === Infinity) continue;
          const value = Math.exp(gammaTailLog(a, x, upper));
          // allowed: 1e-12·p plus what four roundings of x move the tail by (the condition of the problem)
          const step = Math.max(x * (1 + 4 * Number.EPSILON), x + 4 * Number.MIN_VALUE); // also for subnormal x
          const moved = Math.abs(Math.exp(gammaTailLog(a, step, upper)) - value);
          expect(Math.abs(value - p)).toBeLessThanOrEqual(1e-12 * p + 4 * moved);
        }
      }),
      { numRuns: 150, seed: 20261201 },
    );
  });
});

describe('argument checks', () => {
  it('throws invalid_argument with a message', () => {
    expectInvalidArgument(() => gammaP(0, 1), /gammaP needs a finite shape a > 0, got 0/);
    expectInvalidArgument(() => gammaQ(2, -1), /gammaQ needs x ≥ 0, got -1/);
    expectInvalidArgument(() => gammaP(2, Number.NaN), /gammaP needs x ≥ 0, got NaN/);
    expectInvalidArgument(() => gammaQuantile(2, 1), /gammaQuantile needs a probability between 0 and 1, got 2/);
    expectInvalidArgument(() => gammaQuantileUpper(0.5, -1), /gammaQuantileUpper needs a finite shape a > 0/);
  });
});
