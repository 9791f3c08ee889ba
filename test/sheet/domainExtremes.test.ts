/**
 * The declared domain (functions/stats/limits.ts, enforced by functions/sheet/rules.ts) at its corners:
 * inside, the worksheet functions answer the reference values; just outside, they answer #VALUE! naming the
 * argument, its value and the allowed range in plain words.
 *
 * Reference values: test/reference/domain/domain_extremes.json, made by test/reference/domain/domain_extremes.py with
 * mpmath 1.3 at 60 digits (regularised incomplete beta and gamma functions, Student t, mpmath.quad), and
 * scipy 1.17 where a Beta or Gamma shape or a t's degrees of freedom reach 1000 (named in the script).
 */
import * as fs from 'fs';
import * as path from 'path';
import * as F from '../../functions/functions';
import { BEYOND_CELL_MESSAGE } from '../../functions/sheet';
import { MAX_LEVEL, MAX_PRIOR, MIN_LEVEL, MIN_PRIOR } from '../../functions/stats/limits';
import { thrownWorksheetError } from '../helpers/assertions';

interface Ref {
  rateInterval: { conversions: number[]; visitors: number[]; prior: number[]; level: number; interval: number[][] }[];
  probAboveControl: { conversions: number[]; visitors: number[]; prior: number[]; probAbove: number }[];
  eventsRateInterval: { events: number[]; exposure: number[]; prior: number[]; level: number; interval: number[][] }[];
  eventsProbAboveControl: { events: number[]; exposure: number[]; prior: number[]; probAbove: number }[];
  meanInterval: { count: number[]; mean: number[]; sd: number[]; level: number; interval: number[][] }[];
  meanExpectedLoss: { count: number[]; mean: number[]; sd: number[]; loss: number[] }[];
  liftInterval: { conversions: number[]; visitors: number[]; prior: number[]; level: number; upper: number }[];
}
const REF = JSON.parse(
  fs.readFileSync(path.join(__dirname, '..', 'reference', 'domain/domain_extremes.json'), 'utf8'),
) as Ref;

const col = (xs: readonly number[]): number[][] => xs.map((x) => [x]);

/** |got − want| within 1e-9 relative, or 1e-300 absolute for values a double rounds to 0. */
function expectClose(got: unknown, want: number, relative = 1e-9): void {
  expect(typeof got).toBe('number');
  const error = Math.abs((got as number) - want);
  if (error > relative * Math.abs(want) + 1e-300) {
    throw new Error(`got ${String(got)}, the reference says ${want} (error ${error})`);
  }
}

describe('inside the domain: the reference values at its corners', () => {
  test.each(REF.rateInterval.map((c) => [JSON.stringify(c.prior), c.level, c] as const))(
    'RATE_INTERVAL with prior %s and level %s (mpmath incomplete beta; scipy for shapes ≥ 1000)',
    (_p, _l, c) => {
      const got = F.rateInterval(col(c.conversions), col(c.visitors), c.level, c.prior[0], c.prior[1]);
      c.interval.forEach((row, i) => row.forEach((want, j) => expectClose(got[i]?.[j], want)));
    },
  );

  test.each(REF.probAboveControl.map((c) => [JSON.stringify(c.prior), c] as const))(
    'PROB_ABOVE_CONTROL with prior %s (mpmath.quad of f0·(1 − I_x); scipy for shapes ≥ 1000)',
    (_p, c) => {
      const got = F.probAboveControl(col(c.conversions), col(c.visitors), c.prior[0], c.prior[1]);
      expect(got[0]?.[0]).toBe('');
      expectClose(got[1]?.[0], c.probAbove);
    },
  );

  test.each(REF.eventsRateInterval.map((c) => [JSON.stringify(c.exposure), JSON.stringify(c.prior), c] as const))(
    'EVENTS_RATE_INTERVAL with exposure %s and prior %s (mpmath incomplete gamma)',
    (_e, _p, c) => {
      const got = F.eventsRateInterval(col(c.events), col(c.exposure), c.level, c.prior[0], c.prior[1]);
      c.interval.forEach((row, i) => row.forEach((want, j) => expectClose(got[i]?.[j], want)));
    },
  );

  test.each(REF.eventsProbAboveControl.map((c) => [JSON.stringify(c.prior), c] as const))(
    'EVENTS_PROB_ABOVE_CONTROL with prior %s (closed form through Beta(a1, a0), mpmath)',
    (_p, c) => {
      const got = F.eventsProbAboveControl(col(c.events), col(c.exposure), c.prior[0], c.prior[1]);
      expectClose(got[1]?.[0], c.probAbove);
    },
  );

  test.each(REF.meanInterval.map((c) => [JSON.stringify(c.mean), JSON.stringify(c.sd), c] as const))(
    'MEAN_INTERVAL with means %s and sds %s (Student t quantiles, mpmath; scipy for df ≥ 1000)',
    (_m, _s, c) => {
      const got = F.meanInterval(col(c.count), col(c.mean), col(c.sd), c.level);
      c.interval.forEach((row, i) => row.forEach((want, j) => expectClose(got[i]?.[j], want)));
    },
  );

  test.each(REF.meanExpectedLoss.map((c) => [JSON.stringify(c.mean), c] as const))(
    'MEAN_EXPECTED_LOSS of an exact control against one uncertain challenger, means %s (mpmath.quad)',
    (_m, c) => {
      const got = F.meanExpectedLoss(col(c.count), col(c.mean), col(c.sd));
      // the control's loss E[(X − M)^+] is ≥ 0 and tiny or 0 here: held to 1e-9 of the challenger's
      expect(got[0]?.[0]).toBeGreaterThanOrEqual(0);
      expectClose(got[0]?.[0], c.loss[0] as number, 1e-6);
      expectClose(got[1]?.[0], c.loss[1] as number);
    },
  );

  test('the example of issue 10 no longer answers a negative loss: −5.468 exact against −1E+12', () => {
    const got = F.meanExpectedLoss(col([95, 30806260]), col([-5.468, -1e12]), col([0, 0.00776]));
    expect(got[0]).toEqual([0]);
    expectClose(got[1]?.[0], 1e12 - 5.468, 1e-15);
  });

  test('LIFT_INTERVAL at the weakest prior, 30000 of 30000 against 0 of 30000: the upper end within one double of −1 + 1.9e-16 (mpmath.quad)', () => {
    const c = REF.liftInterval[0] as Ref['liftInterval'][number];
    const got = F.liftInterval(col(c.conversions), col(c.visitors), c.level, c.prior[0], c.prior[1]);
    expect(got[0]).toEqual(['', '', '']);
    // lower and median lie within 1e-300 of −1 (the challenger's rate is almost surely below 1e-300)
    expect(got[1]?.[0]).toBe(-1);
    expect(got[1]?.[1]).toBe(-1);
    // near −1 doubles are 1.1e-16 apart: the upper end is held to one spacing of the reference
    expect(Math.abs((got[1]?.[2] as number) - c.upper)).toBeLessThanOrEqual(2 ** -52);
  });

  test('a lift beyond the largest number a cell holds is #N/A in plain words, not a number', () => {
    // control Beta(0.001, 4): its rate's quartile is about 1e-603, so the lift's upper quartile is about 1e603
    const error = thrownWorksheetError(() => F.liftInterval([[0, 3, 1]], [[3, 3, 3]], 0.5, 0.001, 1));
    expect(error).toEqual({ code: '#N/A', message: BEYOND_CELL_MESSAGE });
  });
});

describe('outside the domain: #VALUE! naming the argument, its value and the range', () => {
  test.each([
    [
      'prior_alpha',
      () => F.liftInterval(col([30000, 0]), col([30000, 30000]), null as never, 1e-12, 1e-12),
      '1e-12',
      'from 0.001 to 1E+6',
    ],
    ['prior_beta', () => F.probHighest(col([1, 2]), col([10, 10]), 1, 2e6), '2000000', 'from 0.001 to 1E+6'],
    ['prior_shape', () => F.eventsRateInterval(col([3]), col([10]), 0.95, 0.0001), '0.0001', 'from 0.001 to 1E+6'],
    ['prior_rate', () => F.eventsRateInterval(col([3]), col([10]), 0.95, 1, 1e13), '10000000000000', 'from 0 to 1E+12'],
    [
      'exposure, item 1',
      () => F.eventsRateInterval(col([834, 813]), col([5e-324, 0.5]), 0.99, 2),
      '5e-324',
      'from 1E-6 to 1E+12',
    ],
    [
      'sd, item 1',
      () => F.meanInterval(col([60405, 2]), col([23.97, 24.63]), col([5e-324, 1e308])),
      '5e-324',
      '0, or a number from 1E-6 to 1E+12',
    ],
    [
      'mean, item 2',
      () => F.meanExpectedLoss(col([95, 30806260]), col([-5.468, -1e300]), col([0, 0.00776])),
      '-1e+300',
      'from -1E+12 to 1E+12',
    ],
    ['prior_alpha', () => F.decisionPower(0.000001, 1, 100, 0.5, 1e-300, 100), '1e-300', 'from 0.001 to 1E+6'],
    ['level', () => F.rateInterval(col([1]), col([10]), 0.99999), '0.99999', 'from 0.01 to 0.9999'],
    ['threshold', () => F.visitorsNeeded(0.01, 0.01, 0.999999999, 0.95), '0.999999999', 'from 0.01 to 0.9999'],
    ['baseline_rate', () => F.classicSampleSize(5e-324, 0.1), '5e-324', 'from 1E-6 to 0.999999'],
  ] as const)('%s', (name, call, value, range) => {
    const error = thrownWorksheetError(call);
    expect(error.code).toBe('#VALUE!');
    expect(error.message).toBe(
      `${name}: ${value} is not allowed; enter a number ${range}`.replace('a number 0,', '0,'),
    );
    expect(error.message).not.toMatch(/NaN|Infinity|unexpected|report|[a-z][A-Z]/);
  });

  test('the bounds themselves are inside: priors 0.001 and 1E+6, level 0.01 and 0.9999', () => {
    expect(F.posteriorMean(col([0, 3]), col([3, 3]), MIN_PRIOR, MAX_PRIOR)).toEqual([
      [MIN_PRIOR / (MIN_PRIOR + MAX_PRIOR + 3)],
      [(MIN_PRIOR + 3) / (MIN_PRIOR + MAX_PRIOR + 3)],
    ]); // the Beta–Binomial posterior mean, a closed form (Gelman et al., BDA3 §2.4)
    for (const level of [MIN_LEVEL, MAX_LEVEL]) expect(F.rateInterval(col([1]), col([10]), level)).toHaveLength(1);
  });

  test('PRIOR_FROM_MEAN refuses to make a prior the other functions would refuse, naming strength and mean_rate', () => {
    expect(thrownWorksheetError(() => F.priorFromMean(0.000001, 1))).toEqual({
      code: '#VALUE!',
      message:
        "strength: 1 with mean_rate 0.000001 makes the prior's alpha 1E-6, below 0.001, the weakest prior the " +
        'other functions accept; raise strength',
    });
    expect(F.priorFromMean(0.5, 0.002)).toEqual([[0.001, 0.001]]);
  });
});
