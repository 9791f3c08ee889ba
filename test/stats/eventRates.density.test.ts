/**
 * The Gamma working density in z = log λ (functions/stats/gammaDensity.ts) against mpmath and scipy
 * log densities (test/reference/events/events_density.py → events_density.json).
 */
import reference from '../reference/events/events_density.json';
import { gammaWorkingDensity } from '../../functions/stats/gammaDensity';
import { expectStatsErrorExact } from '../helpers/assertions';

interface Row {
  shape: number;
  rate: number;
  z: number;
  mpmath: number;
  scipy: number | null;
}

describe('gammaWorkingDensity', () => {
  test.each((reference.rows as Row[]).map((r) => [r.shape, r.z, r]))(
    'log density relative to the mode, shape %p at z = %p, matches mpmath',
    (_a, _z, row) => {
      const r = row as Row;
      const d = gammaWorkingDensity(r.shape, r.rate);
      // Source: mpmath 40 digits of a(z − z0) − b(e^z − e^z0); cancellation-free here even at a = 1e9.
      // The z given to both is the same double; the mode z0 = log(a/b) is rounded once in double, which
      // moves the value by up to a·|e^(z−z0) − 1|·1e-16 ≈ 1e-16·√a·|k|.
      const tolerance = 1e-13 * Math.max(1, Math.abs(r.mpmath)) + 4e-16 * Math.sqrt(r.shape) * 40;
      expect(Math.abs(d.logDensity(r.z) - r.mpmath)).toBeLessThanOrEqual(tolerance);
      // Source: scipy.stats.gamma.logpdf (Boost), only for shapes where its difference keeps digits.
      if (r.scipy !== null)
        expect(Math.abs(d.logDensity(r.z) - r.scipy)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(r.scipy)));
    },
  );

  test('slope and curvature agree with central differences; mode and mean are exact', () => {
    for (const [a, b] of [
      [1, 500],
      [0.5, 3],
      [1e9, 4e8],
    ] as const) {
      const d = gammaWorkingDensity(a, b);
      expect(d.mode).toBeCloseTo(Math.log(a / b), 14);
      expect(d.exactMean).toBe(a / b);
      const sd = 1 / Math.sqrt(a);
      for (const k of [-20, -2, -0.5, 0.5, 3]) {
        const z = d.mode + k * sd;
        const h = 1e-5 * sd;
        const slope = (d.logDensity(z + h) - d.logDensity(z - h)) / (2 * h);
        const curvature = -(d.slope(z + h) - d.slope(z - h)) / (2 * h);
        expect(Math.abs(slope - d.slope(z)) / Math.max(1, Math.abs(d.slope(z)))).toBeLessThan(1e-5);
        // The difference quotient of the slope carries rounding noise ~1e-16·|slope|/h.
        const noise = (1e-12 * Math.max(1, Math.abs(d.slope(z)))) / h;
        expect(Math.abs(curvature - d.curvature(z))).toBeLessThan(1e-5 * d.curvature(z) + noise);
      }
    }
  });

  test('value map is exp', () => {
    const d = gammaWorkingDensity(3, 2);
    expect(d.toValue(0)).toBe(1);
    expect(d.toWorking(Math.E)).toBeCloseTo(1, 15);
    expect(d.valueJacobian(Math.log(5))).toBeCloseTo(5, 14);
    expect(d.valueRange).toEqual([0, Infinity]);
  });

  test('rejects a non-positive shape or rate, naming it', () => {
    for (const [a, b, message] of [
      [0, 1, 'gamma shape must be a finite number > 0, got 0'],
      [2, 0, 'gamma rate must be a finite number > 0, got 0'],
    ] as const) {
      expectStatsErrorExact(() => gammaWorkingDensity(a, b), 'invalid_argument', message);
    }
  });
});
