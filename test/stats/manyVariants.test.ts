import { anyAbove, dunnettCritical, thresholdForVariants } from '../../functions/stats/manyVariants';
import { normalCdf, normalQuantile } from '../../functions/stats/special/normal';
import { thrownStatsError } from '../helpers/assertions';
import values from '../reference/looks/looks_values.json';

describe('THRESHOLD_FOR_VARIANTS against Dunnett (1955), one-sided, infinite degrees of freedom', () => {
  // Dunnett's one-sided 5% critical values for df = ∞ as quoted in issue #14 (from Dunnett 1955, Table 1):
  // 1.645 for one challenger, about 1.92 for two, 2.06 for three, 2.16 for four (two decimals).
  it.each([
    [2, 1.645, 0.0005],
    [3, 1.92, 0.005],
    [4, 2.06, 0.005],
    [5, 2.16, 0.005],
  ])('%p variants: c ≈ %p', (variants, c, tolerance) => {
    expect(Math.abs(normalQuantile(thresholdForVariants(variants)) - c)).toBeLessThanOrEqual(tolerance);
  });
});

describe('THRESHOLD_FOR_VARIANTS against scipy (test/reference/looks/looks_reference.py, section dunnett)', () => {
  // scipy.integrate.quad of ∫ φ(y)[1 − Φ(y + c√2)^m] dy solved by brentq (c to 1e-12), and for up to 8
  // challengers scipy's multivariate normal with correlation ½ (quasi-Monte Carlo, 3 seeds).
  it.each(values.dunnett.map((c) => [c.challengers, c.alpha, c] as const))(
    '%p challengers, false alarm %p',
    (m, alpha, c) => {
      const threshold = thresholdForVariants(m + 1, alpha);
      expect(Math.abs(normalQuantile(threshold) - c.c)).toBeLessThan(1e-9);
      expect(Math.abs(threshold - c.threshold)).toBeLessThan(1e-12);
      if ('cMvn' in c && c.cMvn !== undefined) {
        expect(Math.abs(normalQuantile(threshold) - (c.cMvn as number))).toBeLessThan(2e-4 + (c.mvnSpread as number));
      }
    },
  );
});

describe('THRESHOLD_FOR_VARIANTS: closed forms and properties', () => {
  it('two variants: one comparison, the threshold is 1 − false alarm', () => {
    expect(thresholdForVariants(2, 0.05)).toBe(normalCdf(-normalQuantile(0.05)));
    expect(Math.abs(thresholdForVariants(2, 0.1) - 0.9)).toBeLessThan(1e-15);
  });

  it('two challengers: P(max ≥ 0) = 1 − P(both < 0) = 1 − (¼ + asin(½)/2π) = 2/3 (Sheppard / Owen, ρ = ½)', () => {
    expect(Math.abs(anyAbove(0, 2) - 2 / 3)).toBeLessThan(1e-14);
  });

  it('rises with the variants and lies between the single and the Bonferroni thresholds', () => {
    let previous = 0;
    for (const v of [2, 3, 5, 10, 20, 50]) {
      const c = dunnettCritical(v - 1, 0.05);
      expect(c).toBeGreaterThan(previous);
      expect(c).toBeLessThanOrEqual(-normalQuantile(0.05 / (v - 1)) + 1e-12);
      previous = c;
    }
  });
});

describe('THRESHOLD_FOR_VARIANTS input checks', () => {
  it.each([
    [1, 0.05, 'the variants must be a whole number from 2 to 50 (the control and its challengers), got 1'],
    [51, 0.05, 'the variants must be a whole number from 2 to 50 (the control and its challengers), got 51'],
    [2.5, 0.05, 'the variants must be a whole number from 2 to 50 (the control and its challengers), got 2.5'],
    [3, 0, 'the false-alarm rate must be between 1e-6 and 0.5, got 0'],
    [3, 0.6, 'the false-alarm rate must be between 1e-6 and 0.5, got 0.6'],
  ])('variants %p, false alarm %p', (v, a, message) => {
    const error = thrownStatsError(() => thresholdForVariants(v, a));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe(message);
  });
});
