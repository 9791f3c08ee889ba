import { brownianCrossing } from '../../functions/stats/brownianCrossing';
import { normalCdf } from '../../functions/stats/special/normal';
import { thrownStatsError } from '../helpers/assertions';
import values from '../reference/looks/looks_values.json';
import close from '../reference/looks/looks_close.json';

const spaced = (k: number): number[] => Array.from({ length: k }, (_, i) => i + 1);
const Z975 = 1.959963984540054;
const Z95 = 1.6448536269514722;

describe('brownianCrossing against scipy multivariate normal (test/reference/looks/looks_reference.py, section normal)', () => {
  // scipy.stats.multivariate_normal.cdf (Genz's quasi-Monte Carlo) of the partial-sum z-statistics,
  // corr(Z_j, Z_k) = √(t_j/t_k), mean of 3 seeds; its own seed-to-seed spread is stated with each value.
  it.each(values.normal.twoSided196.map((c) => [c.looks, c] as const))(
    '%p equally spaced looks, |Z| ≥ 1.96',
    (K, c) => {
      const got = brownianCrossing(spaced(K), Array(K).fill(Z975), Array(K).fill(-Z975)).probability;
      expect(Math.abs(got - c.rate)).toBeLessThan(2e-6 + c.spread);
    },
  );

  it.each(values.normal.oneSided1645.map((c) => [c.looks, c] as const))(
    '%p equally spaced looks, Z ≥ 1.645',
    (K, c) => {
      const got = brownianCrossing(spaced(K), Array(K).fill(Z95)).probability;
      expect(Math.abs(got - c.rate)).toBeLessThan(2e-6 + c.spread);
    },
  );

  it.each(values.normal.unequal.map((c) => [JSON.stringify(c.times), c] as const))(
    'unequal looks %s and bounds',
    (_t, c) => {
      const lower = c.lower === null ? undefined : c.lower.map((v) => (v === null ? -Infinity : v));
      const got = brownianCrossing(c.times, c.upper, lower).probability;
      expect(Math.abs(got - c.rate)).toBeLessThan(2e-6 + c.spread);
    },
  );
});

describe('brownianCrossing with looks close together (test/reference/looks/looks_close.py: scipy multivariate normal)', () => {
  // Looks 1e-6 to 1e-2 of their size apart: each step's kernel is narrower than the integration grid, where
  // the quadratic pieces take over from Simpson's rule. Measured within 3e-5 of scipy (mean of 3 seeds).
  it.each(close.cases.map((c) => [c.times.length, c.times.at(-1)! - 1, c.sides, c] as const))(
    '%p looks spanning %p of the first, %p side(s)',
    (K, _span, sides, c) => {
      const upper = Array(K).fill(c.z);
      const got = brownianCrossing(c.times, upper, sides === 2 ? upper.map((z) => -z) : undefined).probability;
      expect(Math.abs(got - c.rate)).toBeLessThan(4e-5 + c.spread);
    },
  );
});

describe('brownianCrossing: a continuation region beyond the grid at close looks', () => {
  it('a first look that crosses for sure (Z ≥ −12) gives 1 whatever follows, the later regions empty', () => {
    // Closed form: P(Z_1 ≥ −12) = 1 − Φ(−12) = 1 to double precision (Φ(−12) ≈ 1.8e-33).
    const r = brownianCrossing([1000, 1001, 1002], [-12, -12, 3]);
    expect(r.probability).toBe(1);
    expect(r.byLook[1]).toBe(0);
  });
});

describe('brownianCrossing against published tables', () => {
  // Jennison & Turnbull, Group Sequential Methods (2000), Table 1.1 (after Armitage, McPherson & Rowe 1969):
  // repeated two-sided tests at |Z| ≥ 1.96 on equally spaced looks. The table gives three decimals.
  it.each([
    [2, 0.083],
    [3, 0.107],
    [4, 0.126],
    [5, 0.142],
    [10, 0.193],
    [20, 0.248],
  ])('%p looks: false-alarm rate %p (Jennison & Turnbull Table 1.1)', (K, rate) => {
    const got = brownianCrossing(spaced(K), Array(K).fill(Z975), Array(K).fill(-Z975)).probability;
    expect(Math.abs(got - rate)).toBeLessThanOrEqual(0.0005 + 1e-9);
  });

  // Pocock (1977), constant two-sided boundaries keeping 0.05 overall: z = 2.178, 2.289, 2.361, 2.413, 2.555
  // (three decimals, so the rate at the rounded z is 0.05 within the effect of ±0.0005 in z).
  it.each([
    [2, 2.178],
    [3, 2.289],
    [4, 2.361],
    [5, 2.413],
    [10, 2.555],
  ])('%p looks at Pocock z = %p: overall rate 0.05', (K, z) => {
    const at = (v: number): number => brownianCrossing(spaced(K), Array(K).fill(v), Array(K).fill(-v)).probability;
    expect(at(z - 0.0005)).toBeGreaterThan(0.05);
    expect(at(z + 0.0005)).toBeLessThan(0.05);
  });
});

describe('brownianCrossing: closed forms and properties', () => {
  it('one look: the normal tail (Φ(−b) + Φ(a))', () => {
    const got = brownianCrossing([7], [1.3], [-2.1]);
    expect(Math.abs(got.probability - (normalCdf(-1.3) + normalCdf(-2.1)))).toBeLessThan(1e-15);
    expect(got.byLook).toHaveLength(1);
  });

  it('two looks: P(Z1 ≥ b or Z2 ≥ b) from the bivariate normal with ρ = √½ (Owen 1956: P(both ≤ 0) = ¼ + asin(ρ)/2π)', () => {
    // At b = 0: 1 − P(Z1 < 0, Z2 < 0) = 1 − (¼ + asin(√½)/(2π)) = 1 − (¼ + 1/8) = 0.625.
    const got = brownianCrossing([1, 2], [0, 0]).probability;
    expect(Math.abs(got - 0.625)).toBeLessThan(1e-6);
  });

  it('only the ratios of the look times matter', () => {
    const a = brownianCrossing([1, 2, 5], [2, 2.1, 2.2], [-3, -2.5, -2]).probability;
    const b = brownianCrossing([1000, 2000, 5000], [2, 2.1, 2.2], [-3, -2.5, -2]).probability;
    expect(Math.abs(a - b)).toBeLessThan(1e-14);
  });

  it('the first crossings by look add up to the total, and an infinite bound never crosses', () => {
    const got = brownianCrossing([1, 2, 3, 4], [Infinity, 2.2, Infinity, 2.0]);
    expect(got.byLook[0]).toBe(0);
    expect(got.byLook[2]).toBe(0);
    expect(Math.abs(got.byLook.reduce((s, v) => s + v, 0) - got.probability)).toBeLessThan(1e-15);
  });

  it('agrees with a four times finer grid (r = 48) to 1e-6 at 30 looks', () => {
    const times = spaced(30);
    const coarse = brownianCrossing(times, Array(30).fill(2.2)).probability;
    const fine = brownianCrossing(times, Array(30).fill(2.2), undefined, 48).probability;
    expect(Math.abs(coarse - fine)).toBeLessThan(1e-6);
  });
});

describe('brownianCrossing input checks', () => {
  it.each([
    [[], [], 'the looks must number 1 to 200, got 0'],
    [[1, 1], [2, 2], 'the look times must be positive and increasing'],
    [[0, 1], [2, 2], 'the look times must be positive and increasing'],
    [[1, 2], [2], 'one bound per look is needed'],
    [[1, 2], [2, NaN], 'each look needs a lower bound below its upper bound'],
  ])('times %j, upper %j', (times, upper, message) => {
    const error = thrownStatsError(() => brownianCrossing(times as number[], upper as number[]));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe(message);
  });

  it('refuses a lower bound at or above the upper one', () => {
    const error = thrownStatsError(() => brownianCrossing([1, 2], [2, 2], [-1, 2]));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe('each look needs a lower bound below its upper bound');
  });
});
