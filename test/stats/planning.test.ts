import { probAboveControl } from '../../functions/stats/conversion';
import {
  classicSampleSize,
  classicSampleSizeExact,
  decisionPower,
  visitorsNeeded,
} from '../../functions/stats/planning';
import { betaLogDensity } from '../../functions/stats/special/incompleteBeta';
import classic from '../reference/planning/planning_classic.json';
import edges from '../reference/planning/planning_edges.json';
import power from '../reference/planning/planning_power.json';
import { thrownStatsError } from '../helpers/assertions';

describe('classicSampleSize against R power.prop.test (shared/check-values.md)', () => {
  // R 4.2 power.prop.test solves with uniroot (tol = .Machine$double.eps^0.25 ≈ 1.2e-4 in n), so the
  // unrounded value is compared within that tolerance and the rounded-up value exactly.
  it.each([
    [0.1, 0.5, 0.05, 0.8, 2, 685.596858],
    [0.05, 0.1, 0.05, 0.8, 2, 31233.43794],
    [0.2, 0.25, 0.05, 0.9, 2, 1463.707305],
    [0.02, 0.25, 0.05, 0.8, 1, 10877.163065],
  ] as const)('baseline %p, lift %p, alpha %p, power %p, sides %p: n = %p', (p, lift, alpha, pw, sides, n) => {
    expect(Math.abs(classicSampleSizeExact(p, lift, alpha, pw, sides) - n)).toBeLessThan(1.2e-4);
    expect(classicSampleSize(p, lift, alpha, pw, sides)).toBe(Math.ceil(n));
  });

  it('uses alpha 0.05, power 0.8 and two sides by default', () => {
    expect(classicSampleSize(0.1, 0.5)).toBe(686);
  });
});

describe('classicSampleSize against R (test/reference/planning/planning_classic.R, planning_classic.json)', () => {
  it.each(classic.cases.map((c) => [c.baselineRate, c.lift, c] as const))('baseline %p, lift %p', (_p, _l, c) => {
    const sides = c.sides as 1 | 2;
    const exact = classicSampleSizeExact(c.baselineRate, c.lift, c.alpha, c.power, sides);
    // The closed form R's uniroot approximates, evaluated by R itself: agreement to rounding.
    expect(Math.abs(exact - c.closedForm) / c.closedForm).toBeLessThan(1e-12);
    // power.prop.test's own answer, within its uniroot tolerance.
    expect(Math.abs(exact - c.rUniroot)).toBeLessThan(1.2e-4 * Math.max(1, c.rUniroot / 1e4));
    expect(classicSampleSize(c.baselineRate, c.lift, c.alpha, c.power, sides)).toBe(Math.ceil(c.rUniroot));
  });
});

describe('classicSampleSize input checks', () => {
  it.each([
    [0, 0.1, 0.05, 0.8, 2, 'the baseline rate must be between 0 and 1 (exclusive), got 0'],
    [0.1, 0, 0.05, 0.8, 2, 'the lift must not be 0: no test can detect a difference of nothing'],
    [0.1, -1, 0.05, 0.8, 2, 'the lift must be greater than -1 (a rate cannot fall below 0), got -1'],
    [0.6, 1, 0.05, 0.8, 2, 'baseline rate × (1 + lift) must be below 1, got 1.2 (baseline 0.6, lift 1)'],
    [0.1, 0.1, 1, 0.8, 2, 'alpha must be between 0 and 1 (exclusive), got 1'],
    [0.1, 0.1, 0.05, 0, 2, 'the power must be between 0 and 1 (exclusive), got 0'],
    [0.1, 0.1, 0.05, 0.8, 3, 'sides must be 1 or 2, got 3'],
    [0.1, 0.1, 0.05, 0.01, 2, 'the power (0.01) must be above the false-alarm rate alpha/sides (0.025)'],
  ])('rejects baseline %p, lift %p, alpha %p, power %p, sides %p', (p, lift, alpha, pw, sides, message) => {
    const error = thrownStatsError(() => classicSampleSize(p, lift, alpha, pw, sides as 1 | 2));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe(message);
  });
});

/** Binomial pmf from the Beta density (Loader's saddle point in special/incompleteBeta.ts). */
function binomialPmf(k: number, n: number, p: number): number {
  return Math.exp(betaLogDensity(p, k + 1, n - k + 1)) / (n + 1);
}

/**
 * Brute force: every pair (x_A, x_B) whose probability is at least 1e-12, each decided by the exact
 * quadrature (at n = 50 the pairs left out hold about 2e-11 of probability between them; scipy).
 */
function bruteForcePower(n: number, p0: number, lift: number, threshold: number, alpha: number, beta: number): number {
  const p1 = p0 * (1 + lift);
  const support = (p: number): number[] => {
    const values = Array.from({ length: n + 1 }, (_, k) => binomialPmf(k, n, p));
    const peak = Math.max(...values);
    return values.map((v, k) => (v >= peak * 1e-16 ? k : -1)).filter((k) => k >= 0);
  };
  let total = 0;
  for (const xA of support(p0)) {
    const wA = binomialPmf(xA, n, p0);
    for (const xB of support(p1)) {
      const w = wA * binomialPmf(xB, n, p1);
      if (w < 1e-12) continue;
      const p = probAboveControl(
        [
          { conversions: xA, visitors: n },
          { conversions: xB, visitors: n },
        ],
        { alpha, beta },
      )[0] as number;
      if (p >= threshold) total += w;
    }
  }
  return total;
}

describe('decisionPower equals the brute-force sum over every outcome pair with the exact P(B beats A)', () => {
  // Few cases here (each exact comparison is a full quadrature, a few ms); planning_power.json holds
  // scipy's brute force over every pair at n = 50, 200 and 1000. The second prior has a whole-number
  // beta only, so decisionPower's close calls take the closed form for 1 − p.
  it.each([
    [50, 0.1, 0.5, 0.95, 1, 1],
    [20, 0.2, 1, 0.9, 0.5, 2],
  ] as const)('n = %p, baseline %p, lift %p, threshold %p, prior Beta(%p, %p)', (n, p0, lift, t, a, b) => {
    const brute = bruteForcePower(n, p0, lift, t, a, b);
    // 1e-4 is what a plan needs; the walk reproduces the brute force up to the pairs it leaves out.
    expect(Math.abs(decisionPower(p0, lift, n, t, { alpha: a, beta: b }) - brute)).toBeLessThan(1e-10);
  });
});

describe('decisionPower against scipy (test/reference/planning/planning_power.py, planning_power.json)', () => {
  // Evan Miller's closed form for P(p_B > p_A) (or scipy quad for a non-integer prior) summed over every
  // pair (bruteForce) or over each x_A's boundary found by bisection; scipy.stats.binom for the pmf.
  it.each(power.power.map((c) => [c.n, c.baselineRate, c.lift, c.threshold, c.alpha, c.beta, c] as const))(
    'n = %p, baseline %p, lift %p, threshold %p, prior Beta(%p, %p)',
    (n, p0, lift, t, a, b, c) => {
      const value = decisionPower(p0, lift, n, t, { alpha: a, beta: b });
      expect(Math.abs(value - c.power)).toBeLessThan(1e-10);
    },
  );
});

describe('decisionPower and visitorsNeeded at the edges of the domain (scipy, planning_edges.py)', () => {
  // The sums of planning_power.py at thresholds below ½ and at 0.9999, priors of 0.001, baselines from 1e-5
  // to 0.999 and tests of 1 to 1e6 visitors; P(p_B > p_A) by Evan Miller's closed form or scipy quad.
  it.each(edges.power.map((c) => [c.n, c.baselineRate, c.lift, c.threshold, c.alpha, c.beta, c] as const))(
    'n = %p, baseline %p, lift %p, threshold %p, prior Beta(%p, %p)',
    (n, p0, lift, t, a, b, c) => {
      const value = decisionPower(p0, lift, n, t, { alpha: a, beta: b });
      expect(Math.abs(value - c.power)).toBeLessThan(1e-10);
    },
  );

  it.each(edges.needed.map((c) => [c.baselineRate, c.lift, c.threshold, c.power, c.alpha, c.beta, c] as const))(
    "visitorsNeeded(%p, %p, %p, %p), prior Beta(%p, %p), is a crossing in scipy's decision powers",
    (p0, lift, t, target, a, b, c) => {
      const n = visitorsNeeded(p0, lift, t, target, { alpha: a, beta: b });
      const at = (m: number): number => {
        const index = c.window.indexOf(m);
        expect(index).toBeGreaterThanOrEqual(0);
        return c.powers[index] as number;
      };
      expect(at(n)).toBeGreaterThanOrEqual(target);
      expect(at(n - 1)).toBeLessThan(target);
    },
  );
});

describe('decisionPower, properties', () => {
  it('with lift 0 is the false-alarm rate, close to 1 − threshold under the uniform prior (scipy: 0.04997 at n = 50)', () => {
    const falseAlarm = decisionPower(0.1, 0, 5000, 0.95);
    expect(falseAlarm).toBeGreaterThan(0.04);
    expect(falseAlarm).toBeLessThan(0.06);
  });

  it('rises with the lift and with the number of visitors', () => {
    expect(decisionPower(0.05, 0.2, 10000)).toBeGreaterThan(decisionPower(0.05, 0.1, 10000));
    expect(decisionPower(0.05, 0.1, 40000)).toBeGreaterThan(decisionPower(0.05, 0.1, 10000));
  });

  it('stays a probability at a hundred million visitors and at one visitor', () => {
    const big = decisionPower(0.05, 0.003, 1e8);
    expect(big).toBeGreaterThan(0.5);
    expect(big).toBeLessThanOrEqual(1);
    const one = decisionPower(0.5, 0.5, 1, 0.7);
    // One visitor each: P(B beats A) ≥ 0.7 only when B converts and A does not (P = 5/6 under Beta(1,1)).
    expect(one).toBeCloseTo(0.75 * 0.5, 14);
  });

  it('uses threshold 0.95 and the uniform prior by default', () => {
    expect(decisionPower(0.1, 0.2, 1000)).toBe(decisionPower(0.1, 0.2, 1000, 0.95, { alpha: 1, beta: 1 }));
  });
});

describe('decisionPower input checks', () => {
  it.each([
    [0.1, 0.2, 100.5, 0.95, '100.5 is not a whole number of visitors'],
    [0.1, 0.2, 0, 0.95, 'the visitors per variant must be at least 1, got 0'],
    [0.1, 0.2, 2e10, 0.95, 'the visitors per variant must be at most 1e10, got 20000000000'],
    [0.1, 0.2, 100, 1, 'the threshold must be between 0 and 1 (exclusive), got 1'],
    [1.5, 0.2, 100, 0.95, 'the baseline rate must be between 0 and 1 (exclusive), got 1.5'],
    [0.1, Number.NaN, 100, 0.95, 'the lift must be a number, got NaN'],
  ])('rejects baseline %p, lift %p, visitors %p, threshold %p', (p, lift, n, t, message) => {
    const error = thrownStatsError(() => decisionPower(p, lift, n, t));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe(message);
  });

  it('rejects a prior with a shape of 0', () => {
    const error = thrownStatsError(() => decisionPower(0.1, 0.2, 100, 0.95, { alpha: 0, beta: 1 }));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe("the prior's alpha and beta must both be greater than 0, got 0 and 1");
  });
});

describe('visitorsNeeded against scipy (planning_power.json "needed")', () => {
  it.each(power.needed.map((c) => [c.baselineRate, c.lift, c.threshold, c.power, c] as const))(
    'baseline %p, lift %p, threshold %p, power %p',
    (p0, lift, t, target, c) => {
      const n = visitorsNeeded(p0, lift, t, target);
      // The answer is a crossing of the target in scipy's own decision-power values around it.
      const at = (m: number): number => {
        const index = c.window.indexOf(m);
        expect(index).toBeGreaterThanOrEqual(0);
        return c.powers[index] as number;
      };
      expect(at(n)).toBeGreaterThanOrEqual(target);
      expect(at(n - 1)).toBeLessThan(target);
      expect(Math.abs(n - c.crossing)).toBeLessThanOrEqual(25);
    },
  );

  it('returns a crossing of the target in its own decision power', () => {
    const n = visitorsNeeded(0.05, 0.3, 0.9, 0.7);
    expect(decisionPower(0.05, 0.3, n, 0.9)).toBeGreaterThanOrEqual(0.7);
    expect(decisionPower(0.05, 0.3, n - 1, 0.9)).toBeLessThan(0.7);
  });

  it('is near the classic one-sided size at level 1 − threshold under the uniform prior (common practice)', () => {
    const n = visitorsNeeded(0.05, 0.1);
    const classicOneSided = classicSampleSizeExact(0.05, 0.1, 0.05, 0.8, 1);
    expect(Math.abs(n / classicOneSided - 1)).toBeLessThan(0.05);
  });

  it.each([
    // the classic size alone is far beyond the ceiling: no evaluation
    [0.01, 1e-6, 0.95, 0.8],
    // the classic size (1.08e9) is just beyond it: one evaluation at 1e9 falls short
    [0.5, 0.00032, 0.9999, 0.9999],
  ])('says when more than 1E+9 visitors per variant would be needed (baseline %p, lift %p)', (p, lift, t, pw) => {
    const error = thrownStatsError(() => visitorsNeeded(p, lift, t, pw));
    expect(error.code).toBe('not_available');
    expect(error.message).toBe(
      `more than 1E+9 visitors per variant would be needed to detect a lift of ${lift} on a rate of ${p}; ` +
        'plan for a larger lift, a lower threshold or a lower power',
    );
  });

  it.each([
    [0.1, 0, 0.95, 0.8, 'the lift must be greater than 0 to plan for detecting it, got 0'],
    [0.1, -0.1, 0.95, 0.8, 'the lift must be greater than 0 to plan for detecting it, got -0.1'],
    [0.1, 0.1, 0.95, 1, 'the power must be between 0 and 1 (exclusive), got 1'],
  ])('rejects baseline %p, lift %p, threshold %p, power %p', (p, lift, t, pw, message) => {
    const error = thrownStatsError(() => visitorsNeeded(p, lift, t, pw));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe(message);
  });
});
