/**
 * Revenue and other averages (functions/stats/normalMeans.ts) against outside references:
 * test/reference/means/means_reference.py → means_values.json (scipy.stats.t ppf/isf; scipy.special.stdtr and
 * the t pdf inside scipy.integrate.quad at epsrel 1e-13; optimize.brentq; 50-digit mpmath checks).
 * Model: Gelman et al., Bayesian Data Analysis, 3rd ed., §3.2 (Student t, n − 1 df, centre x̄, scale s/√n).
 * The scenario numbers are invented (a garden-supply shop's revenue per visitor, in dollars).
 */
import reference from '../reference/means/means_values.json';
import signedRatio from '../reference/means/means_signed_ratio.json';
import heavyTails from '../reference/means/means_heavy_tails.json';
import manyMixed from '../reference/means/means_many_mixed.json';
import highestMixed from '../reference/means/means_highest_mixed.json';
import pointMassHighest from '../reference/means/means_point_mass.json';
import {
  meanDiffInterval,
  meanExpectedLoss,
  meanInterval,
  meanLiftInterval,
  meanProbAboveControl,
  meanProbHighest,
} from '../../functions/stats/normalMeans';
import type { MeanSummary } from '../../functions/stats/types';
import { expectProbability, expectStatsErrorExact, thrownStatsError } from '../helpers/assertions';

interface Case {
  name: string;
  variants: MeanSummary[];
  intervals: Record<string, number[][]>;
  diffIntervals: Record<string, number[][]>;
  liftIntervals: Record<string, number[][]>;
  controlBelowZero: number;
  probHighest: number[];
  probAboveControl: number[];
  probBelowControl: number[];
  expectedLoss?: number[];
  welchAboveControl: number[];
}

const cases = reference.cases as unknown as Case[];
const byName = (name: string): Case => {
  const found = cases.find((c) => c.name === name);
  if (found === undefined) throw new Error(`no reference case ${name}`);
  return found;
};

/** Scale of the metric in a case, for absolute tolerances on amounts (interval ends, differences, losses). */
const amountScale = (c: Case): number => Math.max(1, ...c.variants.map((v) => Math.abs(v.mean)));

describe.each(cases.map((c) => [c.name, c]))('normalMeans against scipy: %s', (_name, kase) => {
  const c = kase as Case;
  const scale = amountScale(c);

  test('credible intervals match scipy.stats.t.ppf/isf', () => {
    for (const [level, rows] of Object.entries(c.intervals)) {
      const got = meanInterval(c.variants, Number(level));
      rows.forEach(([lower = NaN, upper = NaN], i) => {
        expect(Math.abs((got[i]?.lower ?? NaN) - lower)).toBeLessThanOrEqual(1e-12 * scale);
        expect(Math.abs((got[i]?.upper ?? NaN) - upper)).toBeLessThanOrEqual(1e-12 * scale);
      });
    }
  });

  test('P(above control) matches scipy quadrature; the swapped pair sums to 1', () => {
    const got = meanProbAboveControl(c.variants);
    c.probAboveControl.forEach((want, i) => expectProbability(got[i] ?? NaN, want));
    c.probBelowControl.forEach((want, i) => {
      const control = c.variants[0] as MeanSummary;
      const challenger = c.variants[i + 1] as MeanSummary;
      const [below = NaN] = meanProbAboveControl([challenger, control]);
      expectProbability(below, want);
      // Identity: P(A > B) + P(B > A) = 1.
      expect(Math.abs((got[i] ?? NaN) + below - 1)).toBeLessThanOrEqual(1e-12);
    });
  });

  test('P(highest) matches scipy quadrature and sums to 1', () => {
    const got = meanProbHighest(c.variants);
    c.probHighest.forEach((want, i) => expectProbability(got[i] ?? NaN, want));
    expect(Math.abs(got.reduce((s, p) => s + p, 0) - 1)).toBeLessThanOrEqual(1e-12);
  });

  test('difference intervals match scipy quadrature + brentq; the median is exactly the difference', () => {
    for (const [level, rows] of Object.entries(c.diffIntervals)) {
      const got = meanDiffInterval(c.variants, Number(level));
      rows.forEach(([lower = NaN, median = NaN, upper = NaN], i) => {
        const g = got[i];
        expect(Math.abs((g?.lower ?? NaN) - lower)).toBeLessThanOrEqual(1e-9 * scale);
        expect(Math.abs((g?.median ?? NaN) - median)).toBeLessThanOrEqual(1e-9 * scale);
        expect(Math.abs((g?.upper ?? NaN) - upper)).toBeLessThanOrEqual(1e-9 * scale);
        // The difference of two symmetric posteriors is symmetric about the difference of centres.
        const control = c.variants[0] as MeanSummary;
        const challenger = c.variants[i + 1] as MeanSummary;
        expect(g?.median).toBe(challenger.mean - control.mean);
      });
    }
  });

  test('lift intervals match scipy quadrature of the ratio over both signs, or are refused', () => {
    if (c.controlBelowZero > 1e-6) {
      const e = thrownStatsError(() => meanLiftInterval(c.variants, 0.95));
      expect(e.code).toBe('not_available');
      const pct = 100 * c.controlBelowZero;
      const shown = pct >= 0.1 ? `${pct.toFixed(1)}%` : `${pct.toPrecision(2)}%`;
      expect(e.message).toBe(
        `the control's mean could plausibly be zero or negative (${shown}), so a relative lift has no meaning; ` +
          'use MEAN_DIFF_INTERVAL for the absolute difference',
      );
      return;
    }
    for (const [level, rows] of Object.entries(c.liftIntervals)) {
      const got = meanLiftInterval(c.variants, Number(level));
      rows.forEach(([lower = NaN, median = NaN, upper = NaN], i) => {
        const g = got[i];
        expect(Math.abs((g?.lower ?? NaN) - lower)).toBeLessThanOrEqual(1e-9);
        expect(Math.abs((g?.median ?? NaN) - median)).toBeLessThanOrEqual(1e-9);
        expect(Math.abs((g?.upper ?? NaN) - upper)).toBeLessThanOrEqual(1e-9);
      });
    }
  });

  test('expected losses match scipy quadrature; differences are mean differences (or count 2 is refused)', () => {
    if (c.expectedLoss === undefined) {
      const e = thrownStatsError(() => meanExpectedLoss(c.variants));
      expect(e.code).toBe('not_available');
      expect(e.message).toMatch(/^count, item 1, 2: with only 2 values the mean's posterior has such heavy tails/);
      return;
    }
    const got = meanExpectedLoss(c.variants);
    c.expectedLoss.forEach((want, i) => expect(Math.abs((got[i] ?? NaN) - want)).toBeLessThanOrEqual(1e-9 * scale));
    for (let i = 1; i < got.length; i++) {
      const lhs = (got[i] ?? NaN) - (got[0] ?? NaN);
      const rhs = (c.variants[0]?.mean ?? NaN) - (c.variants[i]?.mean ?? NaN);
      expect(Math.abs(lhs - rhs)).toBeLessThanOrEqual(1e-12 * scale);
    }
  });

  if (Math.min(...c.variants.map((v) => v.count)) >= 1e6) {
    test("sanity only: Welch's normal approximation is close at large counts", () => {
      const got = meanProbAboveControl(c.variants);
      c.welchAboveControl.forEach((w, i) => expect(Math.abs((got[i] ?? NaN) - w)).toBeLessThan(1e-5));
    });
  }
});

describe('normalMeans against 50-digit mpmath', () => {
  const m = reference.mpmath as unknown as Record<string, { probAboveControl: number } | number>;
  test.each(['order_value_1e2', 'tiny_2', 'tiny_3'])('P(above control), %s (mpmath quad of the exact t)', (name) => {
    const entry = m[name] as { probAboveControl: number };
    const c = byName(name);
    const [got = NaN] = meanProbAboveControl(c.variants.slice(0, 2));
    expect(Math.abs(got - entry.probAboveControl)).toBeLessThanOrEqual(1e-10);
  });

  test('expected losses with 2 degrees of freedom (mpmath, closed-form t cdf; means_heavy_tails.py)', () => {
    // scipy's quadrature of this slowly decaying integrand (tiny_3 above) is good only to ~3e-8, so the
    // heavy-tailed losses are held to mpmath at 30 digits instead: 1e-11 relative.
    const got = meanExpectedLoss(heavyTails.variants);
    heavyTails.expectedLoss.forEach((want, i) =>
      expect(Math.abs((got[i] ?? NaN) - want)).toBeLessThanOrEqual(1e-11 * want),
    );
  });

  test('expected losses of 12 variants, counts 5 to 5e8, each in its own coordinate (scipy; means_many_mixed.py)', () => {
    // Counts 5 to 8 are not log-concave in the shared coordinate, so each posterior keeps its own and the
    // losses are integrated on one grid read through the maps between the coordinates (compare/losses.ts
    // mappedExpectedLosses). scipy's quad at epsrel 1e-13 over the heavy nu = 4 tails: held to 1e-10 relative.
    const got = meanExpectedLoss(manyMixed.variants);
    manyMixed.expectedLoss.forEach((want, i) =>
      expect(Math.abs((got[i] ?? NaN) - want)).toBeLessThanOrEqual(1e-10 * want),
    );
  });

  test('P(highest) of 50 variants, counts 2 to 1e8, each in its own coordinate (scipy; means_highest_mixed.py)', () => {
    // The bench's 50 uneven averages: Cauchy-like and very narrow posteriors together, on the mapped grid
    // (compare/sharedHighest.ts mappedHighestIntegrals). scipy's quad at epsrel 1e-12 in each variant's own
    // asinh variable: 1e-9 absolute everywhere, 1e-9 relative above 1e-100 (the tabulated windows reach the
    // tails to ~1e-100; below that a probability may come out 0, as one of about 8e-184 does here).
    const got = meanProbHighest(highestMixed.variants);
    highestMixed.probHighest.forEach((want, i) => {
      const value = got[i] ?? NaN;
      expect(Math.abs(value - want)).toBeLessThanOrEqual(1e-9);
      if (want > 1e-100) expect(Math.abs(value - want)).toBeLessThanOrEqual(1e-9 * want);
    });
  });

  test('variants with the same count, mean and sd get identical values beside heavy tails (exchangeability)', () => {
    // Counts 5 and 8 keep the posteriors in their own coordinates (the mapped grid); two copies of one variant
    // are exchangeable, so their P(highest) and losses are equal (common practice), and the P(highest) add to 1.
    const a = { count: 5, mean: 48, sd: 21 };
    const b = { count: 8, mean: 55, sd: 18 };
    const c = { count: 2000000, mean: 50.45, sd: 19.5 };
    const p = meanProbHighest([a, b, a, c, b]);
    expect(p[0]).toBe(p[2]);
    expect(p[1]).toBe(p[4]);
    expect(Math.abs(p.reduce((sum, v) => sum + v, 0) - 1)).toBeLessThanOrEqual(1e-12);
    const loss = meanExpectedLoss([a, b, a, c, b]);
    expect(loss[0]).toBe(loss[2]);
    expect(loss[1]).toBe(loss[4]);
    // loss_i − loss_j = mean_j − mean_i (the losses share E[max]).
    expect(Math.abs((loss[0] as number) - (loss[1] as number) - 7)).toBeLessThanOrEqual(1e-9);
  });

  test('expected losses do not depend on a common shift of the means, at 1e12 (translation of the model)', () => {
    // Sixteen variants, counts 10 to 6e8, every mean equal: each loss is E[max] − mean, the same for all, and
    // the posteriors are those of mean 0 moved by 1e12 (the t location family; common practice). Held to
    // 1e-9 relative beside the answer at mean 0 (the grid never forms a value, so 1e12 costs no digits).
    const counts = [74590, 13, 13, 14, 12, 13, 647454875, 10, 90, 10, 10, 85843043, 14, 20943, 10, 13];
    const sds = [19.8, 23.1, 26.0, 24.2, 18.4, 25.9, 24.7, 23.8, 22.7, 26.0, 19.4, 18.5, 21.6, 21.5, 21.8, 20.5];
    const at = (mean: number): number[] =>
      meanExpectedLoss(counts.map((count, i) => ({ count, mean, sd: sds[i] as number })));
    const far = at(1e12);
    const near = at(0);
    near.forEach((want, i) => {
      expect(Math.abs((far[i] ?? NaN) - want)).toBeLessThanOrEqual(1e-9 * want);
      expect(Math.abs(want - (near[0] as number))).toBeLessThanOrEqual(1e-12 * want);
    });
  });

  test('t quantiles at 1 and 2 degrees of freedom (closed forms in mpmath)', () => {
    // count 2, sd √2 → scale 1, ν = 1: the Cauchy quantile tan(π(p − ½)).
    const [cauchy] = meanInterval([{ count: 2, mean: 0, sd: Math.SQRT2 }], 0.95);
    expect(Math.abs((cauchy?.upper ?? NaN) - (m.cauchy_q975 as number))).toBeLessThanOrEqual(1e-12);
    // count 3, sd √3 → scale 1, ν = 2: (2p − 1)/√(2p(1 − p)).
    const [t2] = meanInterval([{ count: 3, mean: 0, sd: Math.sqrt(3) }], 0.95);
    expect(Math.abs((t2?.upper ?? NaN) - (m.t2_q975 as number))).toBeLessThanOrEqual(1e-12);
  });
});

describe('normalMeans: lift with a control that is barely positive (scipy, means_signed_ratio.py)', () => {
  test.each(signedRatio.cases.map((c) => [c.name, c]))('%s: both signs of the control and challenger', (_n, c) => {
    const kase = c as (typeof signedRatio.cases)[number];
    // The control's posterior puts ~4e-7 below zero: allowed (≤ 1e-6) and large enough to matter at 1e-9.
    expect(kase.controlBelowZero).toBeGreaterThan(1e-9);
    const got = meanLiftInterval(kase.variants, kase.level);
    kase.liftIntervals.forEach(([lower = NaN, median = NaN, upper = NaN], i) => {
      expect(Math.abs((got[i]?.lower ?? NaN) - lower)).toBeLessThanOrEqual(1e-9);
      expect(Math.abs((got[i]?.median ?? NaN) - median)).toBeLessThanOrEqual(1e-9);
      expect(Math.abs((got[i]?.upper ?? NaN) - upper)).toBeLessThanOrEqual(1e-9);
    });
  });
});

describe('normalMeans: a variant with sd = 0 is a point mass at its mean', () => {
  const pm = reference.pointMass as unknown as Record<
    string,
    { variants: MeanSummary[]; probAboveControl: number[]; diffInterval95: number[][]; liftInterval95?: number[][] }
  >;

  test('interval is [mean, mean]', () => {
    expect(meanInterval([{ count: 50, mean: 0, sd: 0 }])).toEqual([{ lower: 0, upper: 0 }]);
  });

  test.each(Object.entries(pm))('%s: comparisons through the other variant’s t (scipy.stats.t)', (_name, ref) => {
    const got = meanProbAboveControl(ref.variants);
    expectProbability(got[0] ?? NaN, ref.probAboveControl[0] ?? NaN);
    const [d] = meanDiffInterval(ref.variants, 0.95);
    const [lower = NaN, median = NaN, upper = NaN] = ref.diffInterval95[0] ?? [];
    expect(Math.abs((d?.lower ?? NaN) - lower)).toBeLessThanOrEqual(1e-12 * 40);
    expect(Math.abs((d?.median ?? NaN) - median)).toBeLessThanOrEqual(1e-12 * 40);
    expect(Math.abs((d?.upper ?? NaN) - upper)).toBeLessThanOrEqual(1e-12 * 40);
    if (ref.liftInterval95 !== undefined) {
      const [l] = meanLiftInterval(ref.variants, 0.95);
      const [lo = NaN, me = NaN, up = NaN] = ref.liftInterval95[0] ?? [];
      expect(Math.abs((l?.lower ?? NaN) - lo)).toBeLessThanOrEqual(1e-12);
      expect(Math.abs((l?.median ?? NaN) - me)).toBeLessThanOrEqual(1e-12);
      expect(Math.abs((l?.upper ?? NaN) - up)).toBeLessThanOrEqual(1e-12);
    }
  });

  test('a control with mean 0 and sd 0 has no relative lift', () => {
    expectStatsErrorExact(
      () => meanLiftInterval(pm.zero_control?.variants ?? []),
      'not_available',
      "the control's mean could plausibly be zero or negative (100.0%), so a relative lift has no meaning; " +
        'use MEAN_DIFF_INTERVAL for the absolute difference',
    );
  });

  test('posteriors at the rounding of their means: a mean 1e12 above the others wins with 1 (fuzz seed 41)', () => {
    // Scales sd/√1e12 ≈ 3e-4, about 3 units in the last place of 1e12. Each other variant's chance of being
    // above the top one is at most P(X_j > m) + P(X_top < m) at the midpoint m, ~1.5e15 scales out:
    // scipy.stats.t.sf(999999999999 / 2 / scale, 1e12 − 1) = 0.0 for each of the four scales.
    const sds = [410.48639520473546, 333.9214818445838, 297.39031255347436, 333.87821186756463];
    const means = [-0, -0, 999999999999, -0];
    const v = sds.map((sd, i) => ({ count: 1e12, mean: means[i] as number, sd }));
    expect(meanProbHighest(v)).toEqual([0, 0, 1, 0]);
    // Two means a third of a scale apart at 1e12 cannot be told apart in double precision: refused, naming
    // the arguments and what to do.
    const close = [v[0], { ...v[1], mean: 999999999999 }, { ...v[2], mean: 999999999998.9999 }] as MeanSummary[];
    expectStatsErrorExact(
      () => meanProbHighest(close),
      'not_available',
      'mean, sd and count: the posteriors are too narrow (sd/√count) beside the size of the means to compute the ' +
        'probabilities of being highest in double precision; subtract a common amount from every mean (e.g. ' +
        'their average) so the means are smaller, or compare pairs with MEAN_PROB_ABOVE_CONTROL',
    );
  });

  test('all point masses: the highest mean wins, ties share; losses are max − mean', () => {
    const v: MeanSummary[] = [
      { count: 10, mean: 1, sd: 0 },
      { count: 12, mean: 3, sd: 0 },
      { count: 9, mean: 3, sd: 0 },
    ];
    expect(meanProbHighest(v)).toEqual([0, 0.5, 0.5]);
    expect(meanExpectedLoss(v)).toEqual([2, 0, 0]);
    expect(meanProbAboveControl(v)).toEqual([1, 1]);
    expect(meanProbAboveControl([v[1] as MeanSummary, v[2] as MeanSummary])).toEqual([0.5]);
    expect(meanDiffInterval(v)).toEqual([
      { lower: 2, median: 2, upper: 2 },
      { lower: 2, median: 2, upper: 2 },
    ]);
  });

  test.each(pointMassHighest.cases.map((c) => [c.name, c]))(
    '%s: all but one exact — P(highest) and losses through that one t (scipy.stats.t, partial expectation)',
    (_n, c) => {
      const kase = c as (typeof pointMassHighest.cases)[number];
      const highest = meanProbHighest(kase.variants);
      kase.probHighest.forEach((want, i) => expectProbability(highest[i] ?? NaN, want));
      expect(Math.abs(highest.reduce((a, b) => a + b, 0) - 1)).toBeLessThanOrEqual(1e-12);
      const losses = meanExpectedLoss(kase.variants);
      kase.expectedLoss.forEach((want, i) =>
        expect(Math.abs((losses[i] ?? NaN) - want)).toBeLessThanOrEqual(1e-10 * Math.max(1, want)),
      );
    },
  );

  test('two variants with spread beside an exact one: P(highest) and loss are not available, naming the items', () => {
    const v: MeanSummary[] = [
      { count: 50, mean: 0, sd: 0 },
      { count: 50, mean: 0.4, sd: 2 },
      { count: 60, mean: 0.5, sd: 2 },
    ];
    const tail =
      'a standard deviation of 0 (every value equal) makes that mean exact; ' +
      'a probability of being highest mixing exact and uncertain means is not computed. Check the data, or compare ' +
      'variants pairwise with MEAN_PROB_ABOVE_CONTROL or MEAN_DIFF_INTERVAL';
    expectStatsErrorExact(() => meanProbHighest(v), 'not_available', `sd, item 1: ${tail}`);
    expect(thrownStatsError(() => meanExpectedLoss(v)).code).toBe('not_available');
  });
});

describe('normalMeans: bad input gets a clear error', () => {
  const ok: MeanSummary = { count: 10, mean: 2, sd: 1 };
  test.each([
    [
      [{ count: 1, mean: 2, sd: 1 }, ok],
      'count, item 1: 1 is too few; the Normal model needs at least 2 values per variant',
    ],
    [[ok, { count: 10.5, mean: 2, sd: 1 }], 'count, item 2: 10.5 is not a whole number'],
    [[ok, { count: 10, mean: 2, sd: -1 }], 'sd, item 2: -1 is below 0; a standard deviation is 0 or more'],
    [[ok, { count: 10, mean: Infinity, sd: 1 }], 'mean, item 2: Infinity is not a finite number'],
    [[ok], 'at least 2 variants are needed (the first is the control), got 1'],
  ])('%j', (variants, message) => {
    expectStatsErrorExact(() => meanProbAboveControl(variants as MeanSummary[]), 'invalid_argument', message);
  });

  test('level outside (0, 1)', () => {
    expectStatsErrorExact(
      () => meanInterval([ok], 0),
      'invalid_argument',
      'level: 0 is not allowed; the level must be strictly between 0 and 1 (0.95 is a 95% interval)',
    );
  });

  test('more than 50 variants', () => {
    expectStatsErrorExact(
      () => meanProbHighest(Array.from({ length: 51 }, () => ok)),
      'invalid_argument',
      'at most 50 variants are allowed, got 51',
    );
  });

  test('deterministic: the same inputs give identical outputs', () => {
    const c = byName('twenty');
    expect(meanProbHighest(c.variants)).toEqual(meanProbHighest(c.variants));
    expect(meanExpectedLoss(c.variants)).toEqual(meanExpectedLoss(c.variants));
  });
});

describe('challengers with the same count, mean and sd', () => {
  it('get the interval of the same pair alone, each as its own object (meanDiffInterval, meanLiftInterval)', () => {
    // The pairs' values are checked against scipy above; here each repeated challenger (solved once) must
    // answer exactly what its pair answers alone.
    const control: MeanSummary = { count: 400, mean: 48, sd: 20 };
    const a: MeanSummary = { count: 380, mean: 52, sd: 22 };
    const b: MeanSummary = { count: 5, mean: 47, sd: 30 };
    for (const interval of [meanDiffInterval, meanLiftInterval]) {
      const many = interval([control, a, b, a, a], 0.95);
      const alone = (x: MeanSummary) => interval([control, x], 0.95)[0];
      expect(many).toEqual([alone(a), alone(b), alone(a), alone(a)]);
      expect(many[0]).not.toBe(many[2]);
    }
  });
});
