/**
 * The Plan section with looks (taskpane/logic/looksPlan.ts): the look schedule of a cadence, the shortest
 * whole number of weeks whose power reaches the target under the looks' threshold, the naive rule's chance
 * of a false winner beside the plan's, and the smallest lift a run of N weeks can detect. The numbers are
 * the statistics core's (functions/stats/looks.ts, manyVariants.ts, detectableLift.ts), themselves held to
 * scipy's exact enumeration, multivariate normal and Dunnett values in test/stats; here the plan is held
 * to those functions and to what its definition demands (minimal weeks, rates kept).
 */
import { falseAlarmWithLooks, powerWithLooks, thresholdForLooks } from '../../functions/stats/looks';
import { smallestDetectableLift } from '../../functions/stats/detectableLift';
import { thresholdForVariants } from '../../functions/stats/manyVariants';
import {
  detectableInWeeks,
  falseAlarmPerChallenger,
  lookSchedule,
  looksAtWeeks,
  maxWeeks,
  planWithLooks,
  thresholdText,
  type LooksPlanInputs,
} from '../../taskpane/logic/looksPlan';

const base: LooksPlanInputs = {
  baselineRate: 0.04,
  lift: 0.1,
  threshold: 0.95,
  power: 0.8,
  variants: 2,
  dailyVisitors: 4000,
  trafficShare: 1,
  cadence: 'weekly',
};
const quiet = { pause: async (): Promise<void> => undefined, cancelled: (): boolean => false };

describe('lookSchedule', () => {
  test('every day, every week, once: cumulative visitors per variant, whole and increasing', () => {
    expect(lookSchedule(700, 'weekly', 3)).toEqual([4900, 9800, 14700]);
    expect(lookSchedule(700, 'once', 3)).toEqual([14700]);
    expect(lookSchedule(100.5, 'daily', 1)).toEqual([100, 201, 301, 402, 502, 603, 703]);
  });

  test('days without a new visitor per variant are merged into the next look; none at all gives no look', () => {
    expect(lookSchedule(0.5, 'daily', 1)).toEqual([1, 2, 3]);
    expect(lookSchedule(0.1, 'weekly', 1)).toEqual([]);
  });

  test("daily looks stop at the core's 100 looks: 14 weeks", () => {
    expect(maxWeeks('daily')).toBe(14);
    expect(maxWeeks('weekly')).toBe(26);
    expect(lookSchedule(10, 'daily', maxWeeks('daily'))).toHaveLength(98);
  });
});

describe('planWithLooks', () => {
  test.each(['once', 'weekly', 'daily'] as const)(
    'looking %s: the shortest whole weeks reaching the power, the rate kept, the naive rule beside it',
    async (cadence) => {
      const inputs = { ...base, cadence };
      const result = await planWithLooks(inputs, quiet);
      expect(result).not.toBeNull();
      const plan = result!.plan!;
      expect(plan).not.toBeNull();
      // the plan's threshold is THRESHOLD_FOR_LOOKS on its own looks, and its power POWER_WITH_LOOKS
      expect(plan.threshold).toBe(thresholdForLooks(0.04, plan.looks, 1 - 0.95, 1));
      expect(plan.power).toBe(powerWithLooks(0.04, 0.1, plan.looks, plan.threshold).probability);
      expect(plan.power).toBeGreaterThanOrEqual(0.8);
      // minimal: one week less does not reach the power
      if (plan.weeks > 1) expect(looksAtWeeks(inputs, plan.weeks - 1).power).toBeLessThan(0.8);
      // the plan keeps the chance of a false winner at 5% (THRESHOLD_FOR_LOOKS's promise, to its 1e-4 on z)
      expect(result!.honestFalseAlarm).toBeLessThanOrEqual(0.05 + 1e-4);
      expect(result!.naiveFalseAlarm).toBe(falseAlarmWithLooks(0.04, plan.looks, 0.95, 1).probability);
    },
  );

  test("looking more often raises the naive rule's false alarms well above 5% (the peeking problem)", async () => {
    const weekly = (await planWithLooks({ ...base, cadence: 'weekly' }, quiet))!;
    const daily = (await planWithLooks({ ...base, cadence: 'daily' }, quiet))!;
    expect(weekly.naiveFalseAlarm).toBeGreaterThan(0.08);
    expect(daily.naiveFalseAlarm).toBeGreaterThan(weekly.naiveFalseAlarm);
    expect(daily.plan!.threshold).toBeGreaterThan(weekly.plan!.threshold);
  });

  test('several challengers share the rate first (THRESHOLD_FOR_VARIANTS), then the looks', async () => {
    expect(falseAlarmPerChallenger(0.95, 2)).toBeCloseTo(0.05, 15);
    expect(falseAlarmPerChallenger(0.95, 4)).toBe(1 - thresholdForVariants(4, 0.05));
    const inputs = { ...base, variants: 4 };
    const result = (await planWithLooks(inputs, quiet))!;
    expect(result.falseAlarmPerChallenger).toBe(1 - thresholdForVariants(4, 0.05));
    const plan = result.plan!;
    expect(plan.threshold).toBe(thresholdForLooks(0.04, plan.looks, 1 - thresholdForVariants(4, 0.05), 1));
    // a quarter of the traffic each: 1,000 visitors per variant a day
    expect(plan.looks[0]).toBe(7000);
  });

  test('no run up to the limit reaches the power: plan null, the longest run shown', async () => {
    const result = (await planWithLooks({ ...base, lift: 0.01, dailyVisitors: 200 }, quiet))!;
    expect(result.plan).toBeNull();
    expect(result.longest.weeks).toBe(26);
    expect(result.longest.power).toBeLessThan(0.8);
  });

  test('pauses before each run and stops when cancelled', async () => {
    let pauses = 0;
    const stopped = await planWithLooks(base, {
      pause: async () => {
        pauses += 1;
      },
      cancelled: () => pauses >= 2,
    });
    expect(stopped).toBeNull();
    expect(pauses).toBe(2);
  });

  test('too little traffic to look at all is refused in words', async () => {
    await expect(planWithLooks({ ...base, dailyVisitors: 0.001 }, quiet)).rejects.toThrow(
      new RangeError('fewer than one visitor per variant in 26 week(s): the test cannot be looked at'),
    );
  });
});

describe('detectableInWeeks', () => {
  test("SMALLEST_DETECTABLE_LIFT at the last look under the looks' threshold", () => {
    const found = detectableInWeeks({ ...base, cadence: 'daily' }, 4);
    expect(found.visitorsPerVariant).toBe(56000);
    const looks = lookSchedule(2000, 'daily', 4);
    expect(found.threshold).toBe(thresholdForLooks(0.04, looks, 1 - 0.95, 1));
    expect(found.lift).toBe(smallestDetectableLift(0.04, 56000, found.threshold, 0.8));
    // counting the last look only is cautious: the looks together reach at least the power at that lift
    expect(powerWithLooks(0.04, found.lift!, looks, found.threshold).probability).toBeGreaterThanOrEqual(0.8 - 1e-9);
  });

  test('more weeks detect a smaller lift; one look at the end detects the smallest', () => {
    const two = detectableInWeeks(base, 2).lift!;
    const six = detectableInWeeks(base, 6).lift!;
    expect(six).toBeLessThan(two);
    expect(detectableInWeeks({ ...base, cadence: 'once' }, 6).lift!).toBeLessThan(six);
  });
});

describe('thresholdText', () => {
  test('two decimals, rounded up so a P read against it is never below the threshold', () => {
    expect(thresholdText(0.9927064)).toBe('99.28%');
    expect(thresholdText(0.95)).toBe('95%');
    expect(thresholdText(0.9499806)).toBe('95%');
    expect(thresholdText(0.98532)).toBe('98.54%');
  });
});
