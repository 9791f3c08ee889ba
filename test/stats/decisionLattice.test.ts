import {
  binomialWindow,
  DecisionCursor,
  lookPower,
  probAboveOnLattice,
  upperTails,
} from '../../functions/stats/decisionLattice';
import { thrownStatsError } from '../helpers/assertions';
import betaComparison from '../reference/conversion/beta_comparison.json';
import planningPower from '../reference/planning/planning_power.json';

/**
 * The mpmath cases (40 digits, test/reference/conversion/beta_comparison.py) whose two posteriors come from the same
 * number of visitors: shapes (α + x, β + n − x) with a shared prior. Returns n, x_A, x_B and the prior.
 */
function sameVisitors(c: {
  aX: number;
  bX: number;
  aY: number;
  bY: number;
}): { n: number; xA: number; xB: number; alpha: number; beta: number } | undefined {
  if (c.aX + c.bX !== c.aY + c.bY) return undefined;
  const frac = (v: number): number => v - Math.floor(v);
  const alpha = frac(c.aX) === 0 ? 1 : frac(c.aX);
  const beta = frac(c.bX) === 0 ? 1 : frac(c.bX);
  const xA = c.aX - alpha;
  const xB = c.aY - alpha;
  const n = c.aX + c.bX - alpha - beta;
  const whole = (v: number): boolean => Number.isInteger(v) && v >= 0;
  if (!whole(xA) || !whole(xB) || !whole(n) || xA > n || xB > n || !whole(c.bY - beta)) return undefined;
  return { n, xA, xB, alpha, beta };
}

describe('P(B beats A) on the lattice against mpmath at 40 digits (test/reference/conversion/beta_comparison.json)', () => {
  const cases = betaComparison.cases
    .map((c) => ({ c, lattice: sameVisitors(c) }))
    .filter((x) => x.lattice !== undefined);

  it('has cases to check (same visitors in both variants)', () => {
    expect(cases.length).toBeGreaterThanOrEqual(3);
  });

  it.each(cases.map((x) => [x.c.why, x] as const))('%s', (_why, { c, lattice }) => {
    const { n, xA, xB, alpha, beta } = lattice as NonNullable<typeof lattice>;
    const got = probAboveOnLattice(n, xA, xB, { alpha, beta });
    // Absolute accuracy: ½ plus a sum of positive steps from the diagonal, ~1e-16 per step.
    expect(Math.abs(got - Number(c.p))).toBeLessThan(1e-13 + 1e-16 * Math.abs(xB - xA));
  });
});

describe('P(B beats A) on the lattice: closed forms', () => {
  it('is ½ on the diagonal and sums to 1 with the mirrored pair (exchangeability)', () => {
    const prior = { alpha: 0.7, beta: 3.2 };
    expect(probAboveOnLattice(500, 40, 40, prior)).toBe(0.5);
    const p = probAboveOnLattice(500, 40, 57, prior);
    const q = probAboveOnLattice(500, 57, 40, prior);
    expect(Math.abs(p + q - 1)).toBeLessThan(1e-14);
  });

  it('one visitor each, uniform prior: P = 5/6 when only B converts (Beta(2,1) against Beta(1,2), closed form)', () => {
    expect(Math.abs(probAboveOnLattice(1, 0, 1, { alpha: 1, beta: 1 }) - 5 / 6)).toBeLessThan(1e-15);
  });

  it('walks into and out of the corner x = n with a prior beta below ½ (where the step factor H is infinite)', () => {
    // Beta(0.5 + 3, 0.3) against Beta(0.5 + 2, 1.3): n = 3. P(Y > X) for Y ~ Beta(3.5, 0.3), X ~ Beta(2.5, 1.3)
    // from the corner (3, 3) one step down in x_B must equal the walk from the diagonal (2, 2) up.
    const prior = { alpha: 0.5, beta: 0.3 };
    const fromCorner = new DecisionCursor(3, prior, 3);
    fromCorner.downB();
    const viaDiagonal = probAboveOnLattice(3, 3, 2, prior);
    const down = new DecisionCursor(3, prior, 2);
    down.upA();
    expect(Math.abs(fromCorner.probability - viaDiagonal)).toBeLessThan(1e-14);
    expect(Math.abs(down.probability - viaDiagonal)).toBeLessThan(1e-14);
    expect(Number.isFinite(fromCorner.probability)).toBe(true);
  });
});

describe('binomialWindow', () => {
  it('holds the exact pmf of Bin(4, ½) (1, 4, 6, 4, 1)/16', () => {
    const w = binomialWindow(4, 0.5);
    expect([w.lo, w.hi]).toEqual([0, 4]);
    [1, 4, 6, 4, 1].forEach((c, i) => expect(Math.abs((w.pmf[i] as number) - c / 16)).toBeLessThan(1e-16));
  });

  it('sums to 1 within 1e-13 from one visitor to a billion, and its tails run from 1 to 0', () => {
    for (const [n, p] of [
      [1, 0.3],
      [50, 0.01],
      [1e4, 0.5],
      [1e9, 0.05],
      [1e10, 1e-9],
    ] as const) {
      const w = binomialWindow(n, p);
      const tails = upperTails(w);
      expect(Math.abs((tails[0] as number) - 1)).toBeLessThan(1e-13);
      expect(tails[tails.length - 1]).toBe(0);
      expect(w.lo).toBeGreaterThanOrEqual(0);
      expect(w.hi).toBeLessThanOrEqual(n);
    }
  });
});

describe('lookPower against scipy decision powers (test/reference/planning/planning_power.json)', () => {
  // scipy's exact sum over every outcome pair (or each x_A's boundary by bisection) with Evan Miller's
  // closed form / scipy quad for P(p_B > p_A), scipy.stats.binom pmfs.
  const cases = planningPower.power.filter((c) => c.threshold > 0.5);
  it.each(cases.map((c) => [c.n, c.baselineRate, c.lift, c.threshold, c.alpha, c.beta, c] as const))(
    'n = %p, baseline %p, lift %p, threshold %p, prior Beta(%p, %p)',
    (n, p0, lift, t, a, b, c) => {
      const value = lookPower(n, binomialWindow(n, p0), binomialWindow(n, p0 * (1 + lift)), t, { alpha: a, beta: b });
      expect(Math.abs(value - c.power)).toBeLessThan(1e-10);
    },
  );

  it.each([0, 1])('refuses a threshold of %p', (t) => {
    const w = binomialWindow(10, 0.5);
    const error = thrownStatsError(() => lookPower(10, w, w, t, { alpha: 1, beta: 1 }));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe(`the threshold must be above 0 and below 1, got ${t}`);
  });
});
