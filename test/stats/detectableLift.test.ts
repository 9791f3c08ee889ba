import { smallestDetectableLift } from '../../functions/stats/detectableLift';
import { decisionPower } from '../../functions/stats/planning';
import { thrownStatsError } from '../helpers/assertions';
import values from '../reference/looks/looks_values.json';

describe('SMALLEST_DETECTABLE_LIFT against scipy (test/reference/looks/looks_reference.py, section lift)', () => {
  // scipy: the exact decision power (Evan Miller's closed form or scipy quad for P(p_B > p_A), each x_A's
  // boundary by bisection, scipy.stats.binom tails) and brentq on the lift to 1e-13 relative.
  it.each(values.lift.map((c) => [c.baselineRate, c.visitors, c.threshold, c.power, c.prior.join(', '), c] as const))(
    'baseline %p, %p visitors, threshold %p, power %p, prior Beta(%s)',
    (p, n, t, power, _prior, c) => {
      const prior = { alpha: c.prior[0] as number, beta: c.prior[1] as number };
      const lift = smallestDetectableLift(p, n, t, power, prior);
      expect(Math.abs(lift / c.lift - 1)).toBeLessThan(1e-9);
    },
  );
});

describe('SMALLEST_DETECTABLE_LIFT against DECISION_POWER itself', () => {
  // What is returned: the lift at which decisionPower at exactly this size equals the power (decision
  // power rises strictly with the lift at a fixed size, so the crossing is unique).
  it.each([
    [0.1, 3000, 0.95, 0.8, 1, 1],
    [0.03, 50000, 0.95, 0.9, 1, 1],
    [0.2, 800, 0.9, 0.6, 0.5, 0.5],
    [0.05, 4000, 0.99, 0.8, 2, 38],
    [0.7, 300, 0.95, 0.8, 1, 1],
  ] as const)('baseline %p, %p visitors, threshold %p, power %p, prior Beta(%p, %p)', (p, n, t, power, a, b) => {
    const prior = { alpha: a, beta: b };
    const lift = smallestDetectableLift(p, n, t, power, prior);
    expect(Math.abs(decisionPower(p, lift, n, t, prior) - power)).toBeLessThan(1e-10);
    expect(decisionPower(p, lift * (1 - 1e-6), n, t, prior)).toBeLessThan(power);
    expect(decisionPower(p, lift * (1 + 1e-6), n, t, prior)).toBeGreaterThan(power);
  });

  it('falls like 1/√n between well-separated sizes (common practice: the detectable effect scales as 1/√n)', () => {
    const small = smallestDetectableLift(0.05, 10000);
    const large = smallestDetectableLift(0.05, 40000);
    expect(Math.abs(small / large - 2)).toBeLessThan(0.05);
  });

  it('at a billion visitors per variant: the normal approximation (z_0.95 + z_0.8)·√(2pq/n)/p to 1e-3 relative', () => {
    const p = 0.5;
    const n = 1e9;
    const normal = ((1.6448536269514722 + 0.8416212335729143) * Math.sqrt((2 * p * (1 - p)) / n)) / p;
    expect(Math.abs(smallestDetectableLift(p, n) / normal - 1)).toBeLessThan(1e-3);
  });
});

describe('SMALLEST_DETECTABLE_LIFT input checks', () => {
  it.each([
    [0, 1000, 0.95, 0.8, 'invalid_argument', 'the baseline rate must be between 0 and 1 (exclusive), got 0'],
    [
      0.1,
      0,
      0.95,
      0.8,
      'invalid_argument',
      'the visitors per variant must be a whole number from 1 to 1000000000, got 0',
    ],
    [
      0.1,
      2e9,
      0.95,
      0.8,
      'invalid_argument',
      'the visitors per variant must be a whole number from 1 to 1000000000, got 2000000000',
    ],
    [
      0.1,
      10.5,
      0.95,
      0.8,
      'invalid_argument',
      'the visitors per variant must be a whole number from 1 to 1000000000, got 10.5',
    ],
    [0.1, 1000, 0.5, 0.8, 'invalid_argument', 'the threshold must be above 0.5 and at most 0.999999, got 0.5'],
    [0.1, 1000, 0.95, 1, 'invalid_argument', 'the power must be between 0 and 1 (exclusive), got 1'],
    [
      0.1,
      1000,
      0.95,
      0.04,
      'invalid_argument',
      'the power (0.04) must be above the false-alarm rate of this plan (0.04949, the power at lift 0)',
    ], // decisionPower(0.1, 0, 1000, 0.95), scipy in planning_power.json
    [
      0.9,
      10,
      0.95,
      0.99,
      'not_available',
      'no lift reaches a power of 0.99 with 10 visitors per variant at a baseline rate of 0.9 (not even a challenger converting every visitor)',
    ],
  ] as const)('baseline %p, visitors %p, threshold %p, power %p', (p, n, t, power, code, message) => {
    const error = thrownStatsError(() => smallestDetectableLift(p, n, t, power));
    expect(error.code).toBe(code);
    expect(error.message).toBe(message);
  });

  it('refuses a prior outside [0.001, 1e7]', () => {
    const error = thrownStatsError(() => smallestDetectableLift(0.1, 1000, 0.95, 0.8, { alpha: 0.0001, beta: 1 }));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe(
      'prior_alpha and prior_beta must each be between 0.001 and 10000000 for planning, got 0.0001 and 1',
    );
  });
});
