/**
 * Incomplete beta, Beta density and quantiles against outside references:
 *  - mpmath 1.2 at 40 digits (test/reference/special/special_reference.py → special_values.json): betainc
 *    (regularized) for a + b ≤ 2000, and for larger shapes tanh-sinh quadrature of the exact log density in
 *    logit x (the script cross-checks both routes to 1e-25 where they overlap);
 *  - R 4.2 and Microsoft Excel's documented examples as listed in docs/check-values.md.
 */
import fc from 'fast-check';
import {
  betaCdf,
  betaLogDensity,
  betaQuantile,
  betaQuantilePair,
  betaQuantileUpper,
  betaSf,
  betaTailLog,
} from '../../../functions/stats/special/incompleteBeta';
import reference from '../../reference/special/special_values.json';
import { expectInvalidArgument, relativeErrorOrAbsoluteAtZero } from '../../helpers/assertions';

/** One reference row; each table uses its leading columns (see special_reference.py). */
type Row = [number, number, number, number, number, number];
const rows = (name: string): Row[] => (reference as unknown as Record<string, Row[]>)[name] ?? [];

describe('betaCdf / betaSf against mpmath (40 digits)', () => {
  const cases = rows('beta');
  it('has reference rows spanning small to 1e9 shapes', () => {
    expect(cases.length).toBeGreaterThan(150);
    expect(Math.max(...cases.map((r) => r[2] as number))).toBeGreaterThanOrEqual(1e9);
  });
  it.each(cases.map((r) => [r[0], r[1], r[2], r[3], r[4]] as const))(
    'I_%p(%p, %p): absolute ≤ 2e-14, each tail relative ≤ 1e-11',
    (x, a, b, lower, upper) => {
      const cdf = betaCdf(x, a, b);
      const sf = betaSf(x, a, b);
      // measured: absolute ≤ 3.5e-15, smaller-tail relative ≤ 1.5e-12
      expect(Math.abs(cdf - lower)).toBeLessThanOrEqual(2e-14);
      expect(Math.abs(sf - upper)).toBeLessThanOrEqual(2e-14);
      // the smaller tail keeps its relative accuracy (down to 1e-300 in the table)
      if (lower < 0.5) expect(relativeErrorOrAbsoluteAtZero(cdf, lower)).toBeLessThanOrEqual(1e-11);
      if (upper < 0.5) expect(relativeErrorOrAbsoluteAtZero(sf, upper)).toBeLessThanOrEqual(1e-11);
    },
  );
  it.each(cases.map((r) => [r[0], r[1], r[2], r[5]] as const))(
    'log density at %p for Beta(%p, %p): 1e-13 relative (1e-13 absolute near 0)',
    (x, a, b, logDensity) => {
      expect(Math.abs(betaLogDensity(x, a, b) - logDensity)).toBeLessThanOrEqual(
        1e-13 * Math.max(1, Math.abs(logDensity)),
      );
    },
  );
});

describe('documented values', () => {
  it('matches R pbeta and qbeta (R 4.2 values from check-values.md)', () => {
    // > pbeta(0.2, 8, 42)  [1] 0.790882697830027
    expect(betaCdf(0.2, 8, 42)).toBeCloseTo(0.790882697830027, 14);
    // > qbeta(0.9, 0.1, 10)  [1] 0.0274696222960978
    expect(relativeErrorOrAbsoluteAtZero(betaQuantile(0.9, 0.1, 10), 0.0274696222960978)).toBeLessThan(1e-13);
    // > pbeta(0.3, 0.5, 0.5)  [1] 0.369010119565545
    expect(betaCdf(0.3, 0.5, 0.5)).toBeCloseTo(0.369010119565545, 14);
  });
  it("matches Excel's BETA.DIST and BETA.INV help examples (bounds 1..3)", () => {
    // BETA.DIST(2, 8, 10, TRUE, 1, 3) = 0.6854706 = pbeta(0.5, 8, 10) = 0.685470581054688 (R)
    expect(betaCdf(0.5, 8, 10)).toBeCloseTo(0.685470581054688, 14);
    // BETA.DIST(2, 8, 10, FALSE, 1, 3) = 1.4837646 = dbeta(0.5, 8, 10) / 2
    expect(Math.exp(betaLogDensity(0.5, 8, 10)) / 2).toBeCloseTo(1.4837646, 7);
    // BETA.INV(0.685470581, 8, 10, 1, 3) = 2
    expect(1 + 2 * betaQuantile(0.685470581, 8, 10)).toBeCloseTo(2, 8);
  });
  it('gets the large-count cases right where other libraries fail (check-values.md)', () => {
    // I_0.5(a, a) = 1/2 exactly by symmetry, at a = 1e6, 1e7, 5e8 (jStat gives 0.4404 and −0.17)
    for (const a of [1e6, 1e7, 5e8, 1e9]) {
      expect(Math.abs(betaCdf(0.5, a, a) - 0.5)).toBeLessThan(1e-14);
      expect(Math.abs(betaSf(0.5, a, a) - 0.5)).toBeLessThan(1e-14);
    }
    // betaCdf(0.05, 5e7+1, 9.5e8+1): truth 0.49996527 (check-values.md), more digits from mpmath
    const named = rows('betaNamed').find((r) => r[1] === 5e7 + 1);
    expect(named).toBeDefined();
    const truth = (named as Row)[3] as number;
    expect(truth).toBeCloseTo(0.49996527, 8);
    expect(Math.abs(betaCdf(0.05, 5e7 + 1, 9.5e8 + 1) - truth)).toBeLessThan(1e-14);
  });
  it('returns the exact limits at the ends of the support', () => {
    expect(betaCdf(0, 2, 3)).toBe(0);
    expect(betaCdf(1, 2, 3)).toBe(1);
    expect(betaSf(0, 2, 3)).toBe(1);
    expect(betaSf(1, 2, 3)).toBe(0);
    expect(betaCdf(-0.5, 2, 3)).toBe(0);
    expect(betaQuantile(0, 2, 3)).toBe(0);
    expect(betaQuantile(1, 2, 3)).toBe(1);
    expect(betaQuantileUpper(0, 2, 3)).toBe(1);
    expect(betaQuantileUpper(1, 2, 3)).toBe(0);
    expect(betaLogDensity(0, 1, 3)).toBeCloseTo(Math.log(3), 15); // Beta(1, 3) density at 0 is 3
    expect(betaLogDensity(0, 0.5, 3)).toBe(Infinity);
    expect(betaLogDensity(1.5, 2, 3)).toBe(-Infinity);
  });
  it('throws invalid_argument with a message for bad input', () => {
    expectInvalidArgument(
      () => betaCdf(0.5, 0, 1),
      /betaCdf needs finite shape parameters a > 0 and b > 0, got a = 0, b = 1/,
    );
    expectInvalidArgument(() => betaSf(0.5, 1, -2), /betaSf needs finite shape parameters/);
    expectInvalidArgument(() => betaCdf(Number.NaN, 1, 2), /betaCdf needs a number x, got NaN/);
    expectInvalidArgument(() => betaQuantile(1.5, 1, 2), /betaQuantile needs a probability between 0 and 1, got 1.5/);
    expectInvalidArgument(() => betaQuantileUpper(Number.NaN, 1, 2), /betaQuantileUpper needs a probability/);
    expectInvalidArgument(() => betaLogDensity(0.5, Number.NaN, 2), /betaLogDensity needs finite shape parameters/);
  });
});

describe('betaQuantile / betaQuantileUpper against mpmath', () => {
  const cases = rows('betaQuantile').filter((r) => r[3] !== null);
  it.each(cases.map((r) => [r[0], r[1], r[2], r[3], r[4]] as const))(
    'p = %p, Beta(%p, %p)',
    (p, a, b, lowerX, upperX) => {
      // quantiles below the smallest double are 0 (and within 1e-16 of 1 are 1): compare where representable;
      // the script's bisection stops at e^−740 ≈ 4e-322, so such rows are skipped
      if ((lowerX as number) > 1e-310 && (lowerX as number) < 1 - 1e-15) {
        expect(relativeErrorOrAbsoluteAtZero(betaQuantile(p, a, b), lowerX as number)).toBeLessThan(1e-12);
      }
      if ((upperX as number) > 1e-310 && (upperX as number) < 1 - 1e-15) {
        expect(relativeErrorOrAbsoluteAtZero(betaQuantileUpper(p, a, b), upperX as number)).toBeLessThan(1e-12);
      }
    },
  );
});

/**
 * |F(x) − p| allowed: 1e-12·p plus what a few roundings of the returned x (or 1 − x, whichever is
 * smaller) can move F by — the condition of the problem, f(x)·min(x, 1 − x)·ε, or f(x)·5e-324 where x
 * is a subnormal double.
 */
function identityTolerance(p: number, x: number, y: number, a: number, b: number): number {
  const density = Math.exp(betaLogDensity(x, a, b));
  return 1e-12 * p + 16 * Number.EPSILON * density * Math.min(x, y) + 4 * Number.MIN_VALUE * density;
}

// A fixed seed keeps CI deterministic; change it locally to explore other random cases.
describe('identities (fast-check)', () => {
  const shape = fc.oneof(
    fc.double({ min: 0.1, max: 50, noNaN: true }),
    fc.double({ min: 50, max: 1e6, noNaN: true }),
    fc.constantFrom(1, 0.5, 1e7, 5e8 + 1, 1e9),
  );
  const inside = fc.double({ min: 1e-6, max: 1 - 1e-6, noNaN: true });

  it('betaCdf + betaSf = 1 to 1e-14', () => {
    fc.assert(
      fc.property(inside, shape, shape, (x, a, b) => {
        expect(Math.abs(betaCdf(x, a, b) + betaSf(x, a, b) - 1)).toBeLessThanOrEqual(1e-14);
      }),
      { numRuns: 200, seed: 20261201 },
    );
  });

  it('symmetry I_x(a, b) = 1 − I_(1−x)(b, a), read from the direct other tail', () => {
    fc.assert(
      fc.property(inside, shape, shape, (x, a, b) => {
        const y = 1 - x; // exact for x ≥ 0.5; otherwise x is recomputed from y below
        const xx = 1 - y;
        expect(Math.abs(betaCdf(xx, a, b) - betaSf(y, b, a))).toBeLessThanOrEqual(1e-13);
      }),
      { numRuns: 200, seed: 20261201 },
    );
  });

  it('is monotone in x', () => {
    fc.assert(
      fc.property(inside, inside, shape, shape, (x1, x2, a, b) => {
        const [lo, hi] = x1 <= x2 ? [x1, x2] : [x2, x1];
        expect(betaCdf(lo, a, b)).toBeLessThanOrEqual(betaCdf(hi, a, b) + 1e-15);
        expect(betaSf(lo, a, b)).toBeGreaterThanOrEqual(betaSf(hi, a, b) - 1e-15);
      }),
      { numRuns: 200, seed: 20261201 },
    );
  });

  it('cdf(quantile(p)) = p and sf(quantileUpper(q)) = q in the smaller tail', () => {
    const tail = fc.oneof(
      fc.double({ min: 1e-300, max: 1e-10, noNaN: true }),
      fc.double({ min: 1e-10, max: 0.5, noNaN: true }),
    );
    fc.assert(
      fc.property(tail, shape, shape, (p, a, b) => {
        const [x, y] = betaQuantilePair(p, a, b, false);
        if (x > 0 && y > 0) {
          const value = Math.exp(betaTailLog(x, y, a, b, false));
          expect(Math.abs(value - p)).toBeLessThanOrEqual(identityTolerance(p, x, y, a, b));
        }
        const [xu, yu] = betaQuantilePair(p, a, b, true);
        if (xu > 0 && yu > 0) {
          const value = Math.exp(betaTailLog(xu, yu, a, b, true));
          expect(Math.abs(value - p)).toBeLessThanOrEqual(identityTolerance(p, xu, yu, a, b));
        }
      }),
      { numRuns: 150, seed: 20261201 },
    );
  });
});
