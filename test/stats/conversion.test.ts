import {
  betaHighestDensityInterval,
  decide,
  expectedLoss,
  liftDensityTable,
  liftInterval,
  posteriorDensityTable,
  posteriorMean,
  posteriorOf,
  probAboveControl,
  probHighest,
  probLiftAbove,
  rateDiffInterval,
  rateInterval,
} from '../../functions/stats/conversion';
import { betaQuantile, betaQuantileUpper } from '../../functions/stats/special/incompleteBeta';
import type { ConversionCounts, IntervalWithMedian } from '../../functions/stats/types';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import reference from '../reference/conversion/conversion_values.json';
import { relativeErrorFloored as relativeError, thrownStatsError as thrown } from '../helpers/assertions';

/*
 * Reference values: test/reference/conversion/conversion_values.json, printed by
 * test/reference/conversion/conversion_reference.py (mpmath at 40 digits, an independent construction of the
 * posteriors and of every comparison integral; see that script). The accuracy bar of the read-out:
 * probabilities, lifts and interval ends to 1e-9 absolute, tail probabilities and losses to 1e-6
 * relative. The tolerances below are tighter than the bar where the code is.
 */

type Pair = [number, number];

function counts(list: readonly (readonly number[])[]): ConversionCounts[] {
  return list.map(([conversions, visitors]) => ({ conversions: conversions as number, visitors: visitors as number }));
}

/** A probability against its reference: 1e-11 absolute, and 1e-8 relative when it is a small tail. */
function expectProbability(actual: number, expected: number): void {
  expect(Math.abs(actual - expected)).toBeLessThan(1e-11);
  if (expected < 0.5) expect(relativeError(actual, expected)).toBeLessThan(1e-8);
  else expect(relativeError(1 - actual, 1 - expected)).toBeLessThan(1e-8 + 1e-16 / (1 - expected));
}

describe('probAboveControl against mpmath (conversion_values.json)', () => {
  for (const row of reference.probGreater) {
    const label = `${row.control.join('/')} vs ${row.challenger.join('/')}`;
    it(`P(challenger > control) for ${label}`, () => {
      const [p] = probAboveControl(counts([row.control, row.challenger]), UNIFORM_PRIOR) as [number];
      expectProbability(p, Number(row.pChallengerAbove));
      // The control's side, P(control > challenger), through the reversed call: relative to itself.
      const [q] = probAboveControl(counts([row.challenger, row.control]), UNIFORM_PRIOR) as [number];
      expectProbability(q, Number(row.pControlAbove));
    });
  }
});

describe('probHighest against mpmath (3–5 variants, 10 … 1e9 visitors, tails to 1e-30)', () => {
  for (const row of reference.probHighest) {
    it(`${row.variants.map((v) => v.join('/')).join(', ')}`, () => {
      const p = probHighest(counts(row.variants), UNIFORM_PRIOR);
      p.forEach((v, i) => expectProbability(v, Number(row.pHighest[i])));
      expect(Math.abs(p.reduce((s, v) => s + v, 0) - 1)).toBeLessThan(1e-12);
    });
  }
});

describe('expectedLoss against mpmath', () => {
  for (const row of reference.expectedLoss) {
    it(`${row.variants.map((v) => v.join('/')).join(', ')}`, () => {
      const losses = expectedLoss(counts(row.variants), UNIFORM_PRIOR);
      losses.forEach((v, i) => expect(relativeError(v, Number(row.loss[i]))).toBeLessThan(1e-9));
    });
  }
});

describe('liftInterval and rateDiffInterval against mpmath quantiles (root of the ratio and difference cdfs)', () => {
  for (const row of reference.liftQuantile) {
    it(`lift ${row.p}-quantile for ${row.control.join('/')} vs ${row.challenger.join('/')}`, () => {
      const level = 1 - 2 * Math.min(row.p, 1 - row.p);
      const [interval] = liftInterval(counts([row.control, row.challenger]), level, UNIFORM_PRIOR) as [
        { lower: number; median: number; upper: number },
      ];
      const value = row.p < 0.5 ? interval.lower : interval.upper;
      expect(Math.abs(value - Number(row.lift))).toBeLessThan(1e-10);
    });
  }
  for (const row of reference.diffQuantile) {
    it(`difference ${row.p}-quantile for ${row.control.join('/')} vs ${row.challenger.join('/')}`, () => {
      const level = 1 - 2 * Math.min(row.p, 1 - row.p);
      const [interval] = rateDiffInterval(counts([row.control, row.challenger]), level, UNIFORM_PRIOR) as [
        { lower: number; median: number; upper: number },
      ];
      const value = row.p < 0.5 ? interval.lower : interval.upper;
      expect(Math.abs(value - Number(row.difference))).toBeLessThan(1e-12);
    });
  }
});

describe('rateInterval', () => {
  it('central ends equal the mpmath quantiles of Beta(1 + x, 1 + n − x), 0 … 1e9 visitors', () => {
    for (const row of reference.rateQuantile) {
      if (row.p === 0.5) continue;
      const level = 1 - 2 * Math.min(row.p, 1 - row.p);
      const [interval] = rateInterval(counts([row.variant]), level, UNIFORM_PRIOR, 'central') as [
        { lower: number; upper: number },
      ];
      const value = row.p < 0.5 ? interval.lower : interval.upper;
      expect(Math.abs(value - Number(row.rate))).toBeLessThan(1e-13);
      expect(relativeError(value, Number(row.rate))).toBeLessThan(1e-11);
    }
  });

  it('central ends equal the special-function quantiles (BETA.INV((1 − level)/2, α + x, β + n − x))', () => {
    // functions/stats/special/incompleteBeta.ts: Loader's prefactor and a continued fraction, an
    // independent path (no quadrature) to the same quantiles.
    for (const [x, n] of [
      [0, 1],
      [3, 40],
      [50, 1000],
      [4999, 100000],
      [2, 1e9],
      [5e7, 1e9],
      [1e9, 1e9],
    ] as Pair[]) {
      for (const level of [0.5, 0.9, 0.95, 0.999999]) {
        const [interval] = rateInterval(counts([[x, n]]), level, { alpha: 1, beta: 1 }) as [
          { lower: number; upper: number },
        ];
        const tail = (1 - level) / 2;
        const lower = betaQuantile(tail, 1 + x, 1 + n - x);
        const upper = betaQuantileUpper(tail, 1 + x, 1 + n - x);
        expect(Math.abs(interval.lower - lower)).toBeLessThan(1e-13);
        expect(Math.abs(interval.upper - upper)).toBeLessThan(1e-13);
        expect(relativeError(interval.lower, lower)).toBeLessThan(1e-9);
      }
    }
  });

  it('HDI with 0 conversions is [0, 1 − (1 − level)^(1/(n + 1))] (Beta(1, n + 1) has F(x) = 1 − (1 − x)^(n + 1))', () => {
    for (const n of [1, 10, 1000, 1e6]) {
      const [hdi] = rateInterval(counts([[0, n]]), 0.95, UNIFORM_PRIOR, 'hdi') as [{ lower: number; upper: number }];
      expect(hdi.lower).toBe(0);
      const exact = -Math.expm1(Math.log(0.05) / (n + 1));
      expect(relativeError(hdi.upper, exact)).toBeLessThan(1e-12);
    }
  });

  it('HDI with all conversions is [(1 − level)^(1/(n + 1)), 1] (F(x) = x^(n + 1))', () => {
    const [hdi] = rateInterval(counts([[40, 40]]), 0.9, UNIFORM_PRIOR, 'hdi') as [{ lower: number; upper: number }];
    expect(hdi.upper).toBe(1);
    expect(relativeError(hdi.lower, Math.pow(0.1, 1 / 41))).toBeLessThan(1e-13);
  });

  it('HDI of a unimodal posterior has equal density at both ends, holds the level, and is shorter than the central one (Kruschke 2015)', () => {
    for (const [x, n] of [
      [2, 10],
      [7, 120],
      [30, 100000],
    ] as Pair[]) {
      const [hdi] = rateInterval(counts([[x, n]]), 0.95, UNIFORM_PRIOR, 'hdi') as [{ lower: number; upper: number }];
      const [central] = rateInterval(counts([[x, n]]), 0.95, UNIFORM_PRIOR, 'central') as [
        { lower: number; upper: number },
      ];
      const d = posteriorOf({ conversions: x, visitors: n });
      expect(Math.abs(d.cdf(hdi.upper) - d.cdf(hdi.lower) - 0.95)).toBeLessThan(1e-13);
      expect(Math.abs(d.logValueDensity(hdi.lower) - d.logValueDensity(hdi.upper))).toBeLessThan(1e-9);
      expect(hdi.upper - hdi.lower).toBeLessThan(central.upper - central.lower);
    }
  });

  it('the HDI of a U-shaped Beta does not exist: not_available with advice', () => {
    const error = thrown(() => betaHighestDensityInterval(0.5, 0.7, 0.95));
    expect(error.code).toBe('not_available');
    expect(error.message).toBe(
      'the posterior density is U-shaped, so no single highest-density interval exists; use method "central"',
    );
    // J-shaped (a < 1 ≤ b): from 0, the level-quantile (Beta(0.5, 3)).
    const j = betaHighestDensityInterval(0.5, 3, 0.9);
    expect(j.lower).toBe(0);
  });
});

describe('posteriorMean, probLiftAbove, decide', () => {
  it('posteriorMean is (α + x)/(α + β + n)', () => {
    expect(
      posteriorMean(
        counts([
          [3, 10],
          [0, 1],
        ]),
        { alpha: 2, beta: 5 },
      ),
    ).toEqual([5 / 17, 2 / 8]);
  });

  it('probLiftAbove(0) equals probAboveControl, and a lower bar gives a higher probability', () => {
    const v = counts([
      [50, 1000],
      [65, 1000],
    ]);
    const [above] = probAboveControl(v, UNIFORM_PRIOR) as [number];
    const [lift0] = probLiftAbove(v, 0, UNIFORM_PRIOR) as [number];
    const [liftMinus] = probLiftAbove(v, -0.1, UNIFORM_PRIOR) as [number];
    expect(Math.abs(lift0 - above)).toBeLessThan(1e-13);
    expect(liftMinus).toBeGreaterThan(lift0);
    // At the median of the lift, the probability above is one half.
    const interval = liftInterval(v, 0.95, UNIFORM_PRIOR)[0] as IntervalWithMedian;
    expect(Math.abs((probLiftAbove(v, interval.median, UNIFORM_PRIOR)[0] as number) - 0.5)).toBeLessThan(1e-12);
  });

  it('decide: chooses the clear winner, asks for more data on a close call (default max loss 1% of the control mean)', () => {
    const clear = decide(
      counts([
        [300, 10000],
        [420, 10000],
      ]),
      undefined,
      UNIFORM_PRIOR,
    );
    expect(clear.choose).toBe(true);
    expect(clear.index).toBe(1);
    expect(clear.maxLoss).toBeCloseTo(0.01 * (301 / 10002), 15);
    const close = decide(
      counts([
        [300, 10000],
        [305, 10000],
      ]),
      undefined,
      UNIFORM_PRIOR,
    );
    expect(close.choose).toBe(false);
    expect(close.index).toBe(1);
    expect(close.loss).toBeGreaterThan(close.maxLoss);
    const losses = expectedLoss(
      counts([
        [300, 10000],
        [305, 10000],
      ]),
      UNIFORM_PRIOR,
    );
    expect(close.loss).toBe(losses[1]);
  });
});

describe('challengers with the same counts', () => {
  it('get the interval of the same pair alone, each as its own object (rateDiffInterval, liftInterval)', () => {
    // The pairs' values themselves are checked against scipy elsewhere in this file; here each repeated
    // challenger (solved once) must answer exactly what its pair answers alone.
    const control: [number, number] = [40, 1000];
    const a: [number, number] = [52, 1000];
    const b: [number, number] = [31, 990];
    for (const interval of [rateDiffInterval, liftInterval]) {
      const many = interval(counts([control, a, b, a, a]), 0.95, UNIFORM_PRIOR);
      const alone = (x: [number, number]) => interval(counts([control, x]), 0.95, UNIFORM_PRIOR)[0];
      expect(many).toEqual([alone(a), alone(b), alone(a), alone(a)]);
      expect(many[0]).not.toBe(many[2]);
    }
  });

  it('get the lift density column of the same pair alone (liftDensityTable), each its own array', () => {
    const control: [number, number] = [40, 1000];
    const a: [number, number] = [52, 1000];
    const b: [number, number] = [31, 990];
    const many = liftDensityTable(counts([control, a, b, a]), 21, UNIFORM_PRIOR);
    const pair = liftDensityTable(counts([control, a, b]), 21, UNIFORM_PRIOR);
    // Same union of chart ranges (a repeated challenger adds none), so the same grid and columns.
    expect(many.grid).toEqual(pair.grid);
    expect(many.densities).toEqual([pair.densities[0], pair.densities[1], pair.densities[0]]);
    expect(many.densities[0]).not.toBe(many.densities[2]);
  });
});

describe('density tables', () => {
  it('posteriorDensityTable spans the 99.9% ranges and gives dbeta (exact polynomial for Beta(8, 10))', () => {
    // 7 conversions of 16 visitors with a uniform prior: Beta(8, 10), density x^7 (1 − x)^9 / B(8, 10),
    // B(8, 10) = 7! 9! / 17! (common practice; R dbeta).
    const table = posteriorDensityTable(counts([[7, 16]]), 101, UNIFORM_PRIOR);
    const d = posteriorOf({ conversions: 7, visitors: 16 });
    expect(table.grid).toHaveLength(101);
    expect(table.grid[0]).toBe(d.quantile(0.0005));
    expect(table.grid[100]).toBe(d.quantileUpper(0.0005));
    const b = (5040 * 362880) / 355687428096000; // 7! 9! / 17!
    table.grid.forEach((x, i) => {
      const exact = (Math.pow(x, 7) * Math.pow(1 - x, 9)) / b;
      expect(relativeError((table.densities[0] as number[])[i] as number, exact)).toBeLessThan(1e-12);
    });
  });

  it('posteriorDensityTable refuses more rows than distinct rates exist in its range (2^53 visitors, all converted)', () => {
    // Beta(2^53 + 0.5, 0.5): its sd is about √0.5 / 2^53 ≈ 7.9e-17 (the Beta variance ab / ((a + b)²(a + b + 1)),
    // common practice), below the spacing of doubles just under 1 (1.1e-16): only a handful of rates between
    // its 0.05% and 99.95% quantiles exist as numbers, so 101 rows would repeat rates.
    const n = 9007199254740992;
    const variants = counts([
      [n, n],
      [n, n],
    ]);
    const prior = { alpha: 0.5, beta: 0.5 };
    const error = thrown(() => posteriorDensityTable(variants, 101, prior));
    expect(error.code).toBe('not_available');
    expect(error.message).toMatch(
      /^points: 101 different rows do not fit: the posteriors of the rates run only from 0\.99999999999999\d+ to 1 /,
    );
    expect(error.message).toContain('read them with RATE_INTERVAL, or ask for fewer points');
    // Five rows fit: distinct, increasing rates up to 1.
    const five = posteriorDensityTable(variants, 5, prior);
    expect(five.grid).toHaveLength(5);
    five.grid.forEach((x, i) => {
      if (i > 0) expect(x).toBeGreaterThan(five.grid[i - 1] as number);
    });
    expect(five.grid[4]).toBe(1);
  });

  it('liftDensityTable of one challenger holds 98% of the lift distribution (trapezoid rule; 1%–99% quantiles)', () => {
    const table = liftDensityTable(
      counts([
        [50, 1000],
        [65, 1000],
      ]),
      1000,
      UNIFORM_PRIOR,
    );
    const g = table.grid;
    const f = table.densities[0] as number[];
    let mass = 0;
    for (let i = 1; i < g.length; i++)
      mass += (((g[i] as number) - (g[i - 1] as number)) * ((f[i] as number) + (f[i - 1] as number))) / 2;
    expect(Math.abs(mass - 0.98)).toBeLessThan(2e-5);
  });
});

describe('input checks', () => {
  const cases: [string, () => unknown, string][] = [
    [
      'a fractional count',
      () =>
        probHighest(
          counts([
            [1.5, 10],
            [2, 10],
          ]),
        ),
      'variant 1: conversions must be a whole number of at least 0, not 1.5',
    ],
    [
      'conversions above visitors',
      () =>
        probHighest(
          counts([
            [11, 10],
            [2, 10],
          ]),
        ),
      'variant 1: conversions (11) cannot exceed visitors (10)',
    ],
    [
      'no visitors',
      () => posteriorMean(counts([[0, 0]])),
      'variant 1: visitors must be a whole number of at least 1, not 0',
    ],
    [
      'one variant in a comparison',
      () => probAboveControl(counts([[1, 10]])),
      'a comparison needs between 2 and 50 variants, not 1',
    ],
    [
      '51 variants',
      () => probHighest(counts(Array.from({ length: 51 }, () => [1, 10]))),
      'a comparison needs between 2 and 50 variants, not 51',
    ],
    [
      'a level of 1',
      () => rateInterval(counts([[1, 10]]), 1),
      'level: 1 is not allowed; the level must be strictly between 0 and 1 (0.95 is a 95% interval)',
    ],
    [
      'a prior of 0',
      () => posteriorMean(counts([[1, 10]]), { alpha: 0, beta: 1 }),
      "the prior's alpha must be a number greater than 0, not 0",
    ],
    [
      'a lift of −1',
      () =>
        probLiftAbove(
          counts([
            [1, 10],
            [2, 10],
          ]),
          -1,
        ),
      'the minimum lift must be a number greater than -1, not -1',
    ],
    [
      '1 point',
      () => posteriorDensityTable(counts([[1, 10]]), 1),
      'points must be a whole number from 2 to 1000, not 1',
    ],
  ];
  for (const [what, call, message] of cases) {
    it(`rejects ${what}`, () => {
      const error = thrown(call);
      expect(error.code).toBe('invalid_argument');
      expect(error.message).toBe(message);
    });
  }
});
