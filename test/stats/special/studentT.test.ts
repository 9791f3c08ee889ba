/**
 * Student t against mpmath 1.2 (40 digits: the incomplete beta route P(T ≤ −|t|) = ½ I_x(ν/2, ½) in
 * mpmath's betainc, and the closed-form log density with mpmath's loggamma;
 * test/reference/special/special_reference.py) plus closed forms for ν = 1 and 2.
 */
import { studentTCdf, studentTLogDensity, studentTQuantile } from '../../../functions/stats/special/studentT';
import reference from '../../reference/special/special_values.json';
import { expectInvalidArgument, relativeErrorOrAbsoluteAtZero } from '../../helpers/assertions';

/** One reference row; each table uses its leading columns (see special_reference.py). */
type Row = [number, number, number, number, number, number];
const rows = (name: string): Row[] => (reference as unknown as Record<string, Row[]>)[name] ?? [];

describe('studentTCdf and studentTLogDensity against mpmath', () => {
  it.each(rows('studentT').map((r) => [r[0], r[1], r[2], r[3]] as const))(
    't = %p, ν = %p',
    (t, df, cdf, logDensity) => {
      const value = studentTCdf(t, df);
      expect(Math.abs(value - cdf)).toBeLessThanOrEqual(1e-13);
      if (cdf < 0.5) expect(relativeErrorOrAbsoluteAtZero(value, cdf)).toBeLessThanOrEqual(1e-11);
      // the upper tail, read as P(T ≤ −t), is as accurate
      if (cdf > 0.5)
        expect(relativeErrorOrAbsoluteAtZero(studentTCdf(-t, df), 1 - cdf)).toBeLessThanOrEqual(
          1e-9 + 1e-15 / (1 - cdf),
        );
      expect(Math.abs(studentTLogDensity(t, df) - logDensity)).toBeLessThanOrEqual(
        1e-13 * Math.max(1, Math.abs(logDensity)),
      );
    },
  );
  it('matches the closed forms for ν = 1 (Cauchy) and ν = 2', () => {
    // Cauchy: F(t) = ½ + atan(t)/π; ν = 2: F(t) = ½ + t / (2√(2 + t²))  (A&S 26.7.3, closed forms)
    for (const t of [-30, -2, -0.3, 0.7, 5]) {
      expect(studentTCdf(t, 1)).toBeCloseTo(0.5 + Math.atan(t) / Math.PI, 14);
      expect(studentTCdf(t, 2)).toBeCloseTo(0.5 + t / (2 * Math.sqrt(2 + t * t)), 14);
    }
    expect(studentTLogDensity(0, 1)).toBeCloseTo(-Math.log(Math.PI), 15);
  });
  it('tends to the normal distribution as ν grows and at ν = Infinity', () => {
    expect(studentTCdf(-1.5, Infinity)).toBeCloseTo(0.0668072012688581, 15); // Φ(−1.5), handbook value
    expect(Math.abs(studentTCdf(-1.5, 1e12) - 0.0668072012688581)).toBeLessThan(1e-12);
  });
});

describe('studentTQuantile against mpmath', () => {
  it.each(rows('studentTQuantile').map((r) => [r[0], r[1], r[2]] as const))('p = %p, ν = %p', (p, df, truth) => {
    expect(relativeErrorOrAbsoluteAtZero(studentTQuantile(p, df), truth)).toBeLessThanOrEqual(1e-12);
  });
  it('round-trips with studentTCdf in the smaller tail', () => {
    for (const df of [0.7, 1, 2.5, 10, 1e3, 1e6]) {
      for (const p of [1e-30, 1e-8, 0.01, 0.2, 0.4]) {
        const t = studentTQuantile(p, df);
        expect(relativeErrorOrAbsoluteAtZero(studentTCdf(t, df), p)).toBeLessThan(1e-12);
        // symmetry, with the probability 1 − p actually passed (rounded) mirrored exactly
        expect(studentTQuantile(1 - p, df)).toBe(-studentTQuantile(1 - (1 - p), df));
      }
    }
  });
  it('has the exact limits', () => {
    expect(studentTQuantile(0, 3)).toBe(-Infinity);
    expect(studentTQuantile(1, 3)).toBe(Infinity);
    expect(studentTQuantile(0.5, 3)).toBe(0);
    expect(studentTCdf(0, 3)).toBe(0.5);
    expect(studentTCdf(-Infinity, 3)).toBe(0);
  });
});

describe('argument checks', () => {
  it('throws invalid_argument with a message', () => {
    expectInvalidArgument(() => studentTCdf(1, 0), /studentTCdf needs degrees of freedom above 0, got 0/);
    expectInvalidArgument(() => studentTCdf(Number.NaN, 3), /studentTCdf needs a number t, got NaN/);
    expectInvalidArgument(
      () => studentTQuantile(1.2, 3),
      /studentTQuantile needs a probability between 0 and 1, got 1.2/,
    );
    expectInvalidArgument(() => studentTLogDensity(0, -1), /studentTLogDensity needs degrees of freedom above 0/);
  });
});
