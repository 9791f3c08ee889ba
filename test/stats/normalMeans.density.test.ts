/**
 * The Student t working density (functions/stats/studentTDensity.ts) against scipy and mpmath log
 * densities (test/reference/means/means_density.py → means_density.json), and its slope and curvature
 * against differences of its own log density.
 */
import reference from '../reference/means/means_density.json';
import { studentTWorkingDensity } from '../../functions/stats/studentTDensity';
import { expectStatsErrorExact } from '../helpers/assertions';

interface Row {
  df: number;
  u: number;
  scipy: number;
  mpmath: number;
}

describe('studentTWorkingDensity', () => {
  test.each((reference.rows as Row[]).map((r) => [r.df, r.u, r]))(
    'log density relative to the mode, df %p at u = %p, matches mpmath (scipy.stats.t.logpdf beside it)',
    (_df, _u, row) => {
      const r = row as Row;
      const d = studentTWorkingDensity(r.df, 3, 0.5);
      const got = d.logDensity(r.u);
      // Source: mpmath, 40 digits, of −((ν+1)/2)·log(1 + sinh²u/ν) + log cosh u.
      expect(Math.abs(got - r.mpmath)).toBeLessThanOrEqual(1e-13 * Math.max(1, Math.abs(r.mpmath)));
      // Source: scipy.stats.t.logpdf (Boost); its difference of logs is good to ~1e-12 relative.
      expect(Math.abs(got - r.scipy)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(r.scipy)));
    },
  );

  test.each([1, 2, 3, 10, 1e4, 1e8])('slope and curvature agree with central differences (df %p)', (df) => {
    const d = studentTWorkingDensity(df, -2, 3);
    for (const u of [-25, -4, -1.3, -0.2, 0.05, 0.7, 2.5, 9, 30]) {
      const h = 1e-5 * Math.max(1, Math.abs(u));
      const slope = (d.logDensity(u + h) - d.logDensity(u - h)) / (2 * h);
      const curvature = -(d.slope(u + h) - d.slope(u - h)) / (2 * h);
      const scaleS = Math.max(1e-3, Math.abs(d.slope(u)));
      expect(Math.abs(slope - d.slope(u)) / scaleS).toBeLessThan(1e-5);
      // The difference quotient of the slope carries rounding noise ~1e-16·|slope|/h.
      const noise = (1e-12 * Math.max(1, Math.abs(d.slope(u)))) / h;
      expect(Math.abs(curvature - d.curvature(u))).toBeLessThan(1e-4 * d.curvature(u) + noise);
      expect(d.curvature(u)).toBeGreaterThan(0); // strictly log-concave for ν ≥ 1 (derived in the source)
    }
  });

  test('mode at u = 0 with curvature 1/ν; the Cauchy case is −log cosh u', () => {
    const d = studentTWorkingDensity(7, 10, 2);
    expect(d.mode).toBe(0);
    expect(Math.abs(d.slope(0))).toBe(0);
    expect(d.curvature(0)).toBeCloseTo(1 / 7, 15);
    const cauchy = studentTWorkingDensity(1, 0, 1);
    // Closed form at ν = 1 (f(t) ∝ 1/(1+t²), times cosh u = 1/cosh u): −log cosh u, −tanh u, sech² u.
    for (const u of [-3, -0.1, 0.4, 5, 300, 700]) {
      expect(cauchy.logDensity(u)).toBeCloseTo(-(Math.abs(u) - Math.LN2 + Math.log1p(Math.exp(-2 * Math.abs(u)))), 12);
      expect(cauchy.slope(u)).toBeCloseTo(-Math.tanh(u), 14);
    }
    expect(cauchy.exactMean).toBeUndefined();
    expect(d.exactMean).toBe(10);
  });

  test('value map: x = centre + scale·sinh u, its inverse and Jacobian', () => {
    const d = studentTWorkingDensity(9, 25, 2);
    expect(d.toValue(Math.asinh(1))).toBeCloseTo(27, 13);
    for (const x of [-1e6, 0, 24.5, 25, 31, 1e9]) {
      expect(Math.abs(d.toValue(d.toWorking(x)) - x)).toBeLessThanOrEqual(1e-14 * Math.max(25, Math.abs(x)));
    }
    expect(d.valueJacobian(1)).toBeCloseTo(2 * Math.cosh(1), 14);
    expect(d.valueRange).toEqual([-Infinity, Infinity]);
    // Far tails stay finite (no overflow of sinh² beyond u = 355).
    expect(Number.isFinite(d.logDensity(700))).toBe(true);
    expect(d.logDensity(700)).toBeCloseTo(-9 * (700 - Math.LN2) + 0.5 * 10 * Math.log(9) + 0, 0);
  });

  test('rejects what is not a t posterior, with the message naming the problem', () => {
    const cases: Array<[number, number, number, string]> = [
      [0.5, 0, 1, 'degrees of freedom must be a finite number ≥ 1, got 0.5'],
      [3, NaN, 1, 'the centre must be a finite number, got NaN'],
      [3, 0, 0, 'the scale must be a finite number > 0, got 0'],
    ];
    for (const [df, c, s, message] of cases) {
      expectStatsErrorExact(() => studentTWorkingDensity(df, c, s), 'invalid_argument', message);
    }
  });
});
