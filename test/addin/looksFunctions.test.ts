/**
 * The worksheet functions of issue #14 through their wrappers (functions/wrappers/looks.ts and planning.ts):
 * values against the outside references of test/reference/looks/looks_values.json (looks_reference.py: scipy's
 * exact enumeration over both variants' outcomes, scipy's multivariate normal, Dunnett's integral, scipy
 * decision powers, scipy.stats.chisquare), defaults, orientation, blank days, and the errors that reach
 * the cell (code and message).
 */
import * as F from '../../functions/functions';
import { thrownWorksheetError } from '../helpers/assertions';
import values from '../reference/looks/looks_values.json';

const col = (xs: readonly unknown[]): unknown[][] => xs.map((x) => [x]);
const row = (xs: readonly unknown[]): unknown[][] => [[...xs]];

interface ExactCase {
  rate: number;
  lift: number;
  looks: number[];
  threshold: number;
  sides: number;
  prior?: number[];
  probability: number;
}
const exact = values.exact as ExactCase[];
const find = (rate: number, lift: number, K: number, last: number, sides: number): ExactCase => {
  const c = exact.find(
    (e) =>
      e.rate === rate &&
      e.lift === lift &&
      e.looks.length === K &&
      e.looks.at(-1) === last &&
      e.sides === sides &&
      e.prior === undefined,
  );
  if (c === undefined) throw new Error(`no reference case ${rate} ${lift} ${K} ${last} ${sides}`);
  return c;
};

describe('FALSE_ALARM_WITH_LOOKS and POWER_WITH_LOOKS against the exact enumeration (scipy)', () => {
  test('one side by default, threshold 0.95 by default; a column or a row of looks', () => {
    const c = find(0.05, 0, 5, 500, 1);
    expect(Math.abs(F.falseAlarmWithLooks(0.05, col(c.looks)) - c.probability)).toBeLessThan(1e-10);
    expect(Math.abs(F.falseAlarmWithLooks(0.05, row(c.looks), 0.95, 1) - c.probability)).toBeLessThan(1e-10);
  });

  test('two sides at 0.975; blank cells in the looks are skipped', () => {
    const c = find(0.05, 0, 5, 500, 2);
    const looks = [c.looks[0], '', ...c.looks.slice(1), null];
    expect(Math.abs(F.falseAlarmWithLooks(0.05, col(looks), 0.975, 2) - c.probability)).toBeLessThan(1e-10);
  });

  test('POWER_WITH_LOOKS at the reference lift', () => {
    const c = exact.find(
      (e) => e.rate === 0.05 && e.lift > 0 && e.looks.length === 5 && e.looks.at(-1) === 500,
    ) as ExactCase;
    expect(Math.abs(F.powerWithLooks(0.05, c.lift, col(c.looks)) - c.probability)).toBeLessThan(1e-10);
  });

  test('a prior is passed to the read-out (fractional prior, scipy quad)', () => {
    const c = exact.find((e) => e.prior !== undefined && e.prior[0] === 0.5 && e.sides === 1) as ExactCase;
    expect(
      Math.abs(F.falseAlarmWithLooks(c.rate, col(c.looks), c.threshold, 1, 0.5, 0.5) - c.probability),
    ).toBeLessThan(1e-10);
  });
});

describe('THRESHOLD_FOR_LOOKS', () => {
  test.each(values.normal.pocock.map((c) => [c.looks, c] as const))(
    "%p large looks, two sides: Φ(Pocock's z) (scipy multivariate normal root; Pocock 1977)",
    (K, c) => {
      const looks = Array.from({ length: K }, (_, i) => (i + 1) * 1e6);
      const t = F.thresholdForLooks(0.05, col(looks), 0.05, 2);
      expect(Math.abs(t - c.threshold)).toBeLessThan(2e-5);
    },
  );

  test('keeps FALSE_ALARM_WITH_LOOKS at or below false_alarm (default 0.05, one side)', () => {
    const looks = col([100, 200, 300, 400, 500]);
    const t = F.thresholdForLooks(0.05, looks);
    expect(F.falseAlarmWithLooks(0.05, looks, t)).toBeLessThanOrEqual(0.05);
    expect(t).toBeGreaterThan(0.95);
  });
});

describe('THRESHOLD_FOR_VARIANTS and SMALLEST_DETECTABLE_LIFT against scipy', () => {
  test("Dunnett's integral (scipy quad + brentq), default false alarm 0.05", () => {
    for (const c of values.dunnett.filter((d) => d.alpha === 0.05)) {
      expect(Math.abs(F.thresholdForVariants(c.challengers + 1) - c.threshold)).toBeLessThan(1e-12);
    }
    const c01 = values.dunnett.find((d) => d.alpha === 0.01 && d.challengers === 4) as { threshold: number };
    expect(Math.abs(F.thresholdForVariants(5, 0.01) - c01.threshold)).toBeLessThan(1e-12);
  });

  test('the smallest detectable lift (scipy exact decision power + brentq), defaults threshold 0.95, power 0.8', () => {
    for (const c of values.lift) {
      const [a, b] = c.prior as [number, number];
      const prior = a === 1 && b === 1 ? [] : [a, b];
      const got =
        c.threshold === 0.95 && c.power === 0.8 && prior.length === 0
          ? F.smallestDetectableLift(c.baselineRate, c.visitors)
          : F.smallestDetectableLift(c.baselineRate, c.visitors, c.threshold, c.power, a, b);
      expect(Math.abs(got / c.lift - 1)).toBeLessThan(1e-9);
    }
  });
});

describe('PROB_ABOVE_CONTROL_BY_DAY and SRM_PVALUE_BY_DAY against scipy', () => {
  const t = values.byday;
  // The invented week of the reference, with a blank row inserted after day 2 (a day without data).
  const withBlank = <T>(rows: T[][], blank: T): T[][] => [
    ...rows.slice(0, 2),
    rows[0]!.map(() => blank),
    ...rows.slice(2),
  ];

  test('one row per day, one column per challenger; a blank day gives a blank row', () => {
    const got = F.probAboveControlByDay(
      withBlank(t.conversions, '' as number | string),
      withBlank(t.visitors, '' as number | string),
    );
    expect(got).toHaveLength(t.visitors.length + 1);
    expect(got[2]).toEqual(['', '']);
    const filled = got.filter((_, i) => i !== 2);
    // Miller's closed form in scipy against ours: agreement to ~1e-12 (summation order)
    filled.forEach((r, d) =>
      r.forEach((v, j) => expect(Math.abs((v as number) - t.probAboveControl[d]![j]!)).toBeLessThan(1e-11)),
    );
  });

  test('the split check each day; equal shares by default, planned shares in a row or a column', () => {
    const got = F.srmPValueByDay(t.visitors);
    got.forEach((r, d) => expect(Math.abs((r[0] as number) - t.srmPValue[d]!)).toBeLessThan(1e-12));
    const planned = F.srmPValueByDay(t.visitors, row([2, 1, 1]));
    planned.forEach((r, d) => expect(Math.abs((r[0] as number) - t.srmPValuePlanned211[d]!)).toBeLessThan(1e-12));
    expect(F.srmPValueByDay(t.visitors, col([2, 1, 1]))).toEqual(planned);
  });

  test('a challenger with no visitors yet, and a day before any visitor, are blank cells', () => {
    expect(
      F.probAboveControlByDay(
        [
          [1, 0],
          [2, 3],
        ],
        [
          [10, 0],
          [12, 11],
        ],
      ),
    ).toEqual([[''], [F.probAboveControlByDay([[3, 3]], [[22, 11]])[0]![0]]]);
    expect(
      F.srmPValueByDay([
        [0, 0],
        [500, 520],
      ])[0],
    ).toEqual(['']);
  });
});

describe('errors reach the cell with their code and message', () => {
  test.each([
    [
      () => F.falseAlarmWithLooks(0.05, col([1000, 900])),
      '#VALUE!',
      'visitors_at_looks, item 2: 900 is not more than the 1000 of item 1; the values are cumulative, so each must be more than the one before',
    ],
    [
      () => F.falseAlarmWithLooks(0.05, col([1000]), 0.5),
      '#VALUE!',
      'threshold: 0.5 is not allowed; enter a number greater than 0.5 and at most 0.999999',
    ],
    [
      () => F.falseAlarmWithLooks(0.05, col([1000]), 0.95, 3),
      '#VALUE!',
      'sides: 3 is not allowed; enter a whole number from 1 to 2',
    ],
    [
      () => F.falseAlarmWithLooks(0.05, col([1000]), 0.95, 1, 0.0001, 1),
      '#VALUE!',
      'prior_alpha: 0.0001 is not allowed; enter a number from 0.001 to 1E+6',
    ],
    [
      () => F.powerWithLooks(0.6, 1, col([1000])),
      '#VALUE!',
      'baseline rate × (1 + lift) must be between 0 and 1, got 1.2',
    ],
    [
      () => F.thresholdForLooks(0.05, col([1000]), 0.7),
      '#VALUE!',
      'false_alarm: 0.7 is not allowed; enter a number from 1E-6 to 0.5',
    ],
    [
      () => F.thresholdForLooks(0.3, col(Array.from({ length: 50 }, (_, i) => (i + 1) * 100000)), 0.000001, 2),
      '#N/A',
      'false_alarm 0.000001: even the threshold 0.999999 gives a false-alarm rate above it with these looks',
    ],
    [() => F.thresholdForVariants(51), '#VALUE!', 'variants: 51 is not allowed; enter a whole number from 2 to 50'],
    [
      () => F.smallestDetectableLift(0.1, 2e9),
      '#VALUE!',
      'visitors_per_variant: 2000000000 is not allowed; enter a whole number from 1 to 1E+9',
    ],
    [
      () => F.smallestDetectableLift(0.9, 10, 0.95, 0.99),
      '#N/A',
      'no lift reaches a power of 0.99 with 10 visitors per variant at a baseline rate of 0.9 (not even a challenger converting every visitor)',
    ],
    [
      () =>
        F.probAboveControlByDay(
          [[1, 2]],
          [
            [10, 10],
            [10, 10],
          ],
        ),
      '#VALUE!',
      'conversions_by_day and visitors_by_day must have the same shape: conversions_by_day is 1 × 2, visitors_by_day is 2 × 2 (rows × columns)',
    ],
    [
      () => F.srmPValueByDay([[500, 510, 490]], row([1, 1])),
      '#VALUE!',
      'planned_shares: 2 shares were given for 3 variants (the columns of visitors_by_day); give one share per column',
    ],
  ] as const)('%#', (run, code, message) => {
    expect(thrownWorksheetError(run)).toEqual({ code, message });
  });

  test('a plan too large for the work budget names its argument', () => {
    const looks = col(Array.from({ length: 100 }, (_, i) => (i + 1) * 1e7));
    const error = thrownWorksheetError(() => F.falseAlarmWithLooks(0.5, looks));
    expect(error.code).toBe('#VALUE!');
    expect(error.message).toMatch(
      /^visitors_at_looks: these looks are too many and too large to plan within the time a worksheet function may take/,
    );
  });
});

describe('THRESHOLD_FOR_LOOKS with many two-sided looks and a lenient false alarm (a fuzzer finding)', () => {
  // Once refused with "each look needs a lower bound below its upper bound": the solver's first guess sat at
  // the lowest threshold, where a two-sided step below it crossed the bounds. The answer is checked against
  // the definition (common practice): at the threshold found, FALSE_ALARM_WITH_LOOKS is at most false_alarm.
  test('gives a threshold whose false-alarm rate is at most the one asked', () => {
    const looks = col(Array.from({ length: 100 }, (_, i) => (i + 1) * 10_000_000));
    const threshold = F.thresholdForLooks(0.000001, looks, 0.4072024451700007, 2);
    expect(threshold).toBeGreaterThan(0.5);
    expect(threshold).toBeLessThan(1);
    expect(F.falseAlarmWithLooks(0.000001, looks, threshold, 2)).toBeLessThanOrEqual(0.4072024451700007 + 1e-9);
  });
});
