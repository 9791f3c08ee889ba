/**
 * The Plan section's logic: reading its fields (percents, either decimal mark), the threshold each
 * challenger must reach when there are several (Bonferroni's split, held to Dunnett's exact many-to-one
 * values from scipy), the plan's numbers (whole weeks; the classic size against R's power.prop.test), the
 * duration warning, and the power curve computed a point at a time — pausing between points and stopping
 * when cancelled.
 */
import {
  BONFERRONI_SPLIT,
  curveSizes,
  DUNNETT_MANY_TO_ONE,
  durationCheck,
  PLAN_THRESHOLD_SOURCE,
  planNumbers,
  planProblems,
  powerCurve,
  readPlan,
  samePlan,
  type PowerPoint,
  type ThresholdSource,
} from '../../taskpane/logic/plan';
import { localeOf } from '../../taskpane/logic/inputs';
import { decisionPower, visitorsNeeded } from '../../functions/stats/planning';
import { normalQuantile } from '../../functions/stats/special/normal';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import manyVariants from '../reference/planning/plan_many_variants.json';

const inputs = {
  baselineRate: 0.1,
  lift: 0.5,
  threshold: 0.95,
  power: 0.8,
  variants: 3,
  dailyVisitors: 500,
  trafficShare: 0.4,
  classicAlpha: 0.05,
};
const texts = {
  baselineRate: '4',
  lift: '10',
  threshold: '95',
  power: '80',
  variants: '2',
  dailyVisitors: '4000',
  trafficShare: '100',
  classicAlpha: '5',
};

describe('planProblems', () => {
  test('good inputs have none; each bad input is named', () => {
    expect(planProblems(inputs)).toEqual([]);
    expect(planProblems({ ...inputs, baselineRate: 0, trafficShare: 1.5, variants: 1.5 })).toEqual([
      'baseline rate must be between 0% and 100%',
      'number of variants must be a whole number from 2 to 50',
      'share of traffic in the test must be above 0 and at most 100%',
    ]);
    expect(planProblems({ ...inputs, baselineRate: 0.8, lift: 0.5 })).toEqual([
      'baseline rate × (1 + lift) must stay below 100%: 80.0% raised by 50.0% would be 120.0%',
    ]);
  });
});

describe('readPlan: the fields take percents, in either decimal mark', () => {
  test('the defaults read as fractions for the core', () => {
    const reading = readPlan(texts);
    expect(reading.inputs).toEqual({
      baselineRate: 0.04,
      lift: 0.1,
      threshold: 0.95,
      power: 0.8,
      variants: 2,
      dailyVisitors: 4000,
      trafficShare: 1,
      classicAlpha: 0.05,
    });
    expect(reading.problems).toEqual([]);
  });

  test('a decimal comma is read in an English panel and in a German one', () => {
    expect(readPlan({ ...texts, baselineRate: '4,5' }).inputs?.baselineRate).toBeCloseTo(0.045, 15);
    const german = readPlan({ ...texts, baselineRate: '4,5', dailyVisitors: '12.000' }, localeOf('de-DE'));
    expect(german.inputs?.baselineRate).toBeCloseTo(0.045, 15);
    expect(german.inputs?.dailyVisitors).toBe(12000);
  });

  test('a fraction typed into a percent field is refused with the likely slip named', () => {
    const reading = readPlan({ ...texts, threshold: '0.95', power: '0,8' });
    expect(reading.inputs).toBeNull();
    expect(reading.fields.threshold).toEqual({
      ok: false,
      message:
        'Decision threshold: 0.95 here means 0.95%, because this field takes a percent. For 95% type 95, not 0.95.',
    });
    expect(reading.fields.power).toEqual({
      ok: false,
      message:
        'Target decision power: 0,8 here means 0.8%, because this field takes a percent. For 80% type 80, not 0,8.',
    });
  });

  test('a small rate typed below 1 is accepted, with a note on how it was read', () => {
    const reading = readPlan({ ...texts, baselineRate: '0.04' });
    expect(reading.inputs?.baselineRate).toBeCloseTo(0.0004, 15);
    expect(reading.fields.baselineRate).toEqual({
      ok: true,
      value: 0.0004,
      note: 'read as 0.04%; if you meant 4%, type 4.',
    });
  });

  test('counts refuse percents and fractions of a variant', () => {
    const reading = readPlan({ ...texts, variants: '2.5', dailyVisitors: '40%' });
    expect(reading.fields.variants).toEqual({
      ok: false,
      message: 'Variants: it must be a whole number; you typed 2.5.',
    });
    expect(reading.fields.dailyVisitors).toEqual({
      ok: false,
      message: 'Visitors per day: this field takes a plain number, not a percent (e.g. 4000).',
    });
  });
});

describe('many variants: the threshold each challenger must reach', () => {
  const rows = manyVariants.rows;

  test('two variants keep the threshold; more split the false-alarm rate evenly (Bonferroni)', () => {
    expect(BONFERRONI_SPLIT.perChallenger(0.95, 2)).toBe(0.95);
    expect(BONFERRONI_SPLIT.perChallenger(0.95, 10)).toBeCloseTo(1 - 0.05 / 9, 15);
    expect(BONFERRONI_SPLIT.formula('B4', 'B6')).toBe('1-(1-B4)/MAX(1,B6-1)');
  });

  test.each(rows.map((row) => [row.challengers, row]))(
    "%i challenger(s): the normal-limit critical value is Bonferroni's and never below Dunnett's (scipy, Dunnett 1955)",
    (challengers, row) => {
      const z = normalQuantile(BONFERRONI_SPLIT.perChallenger(0.95, challengers + 1));
      // scipy norm.ppf(1 - 0.05/m), printed to 6 decimals
      expect(Math.abs(z - row.bonferroni_z)).toBeLessThan(1e-6);
      // at least as strict as the exact many-to-one value: the overall false-alarm rate stays ≤ 5%
      expect(z).toBeGreaterThanOrEqual(row.dunnett_z - 1e-6);
      expect(row.bonferroni_family).toBeLessThanOrEqual(0.05 + 1e-6);
    },
  );

  test('ten variants need more visitors each than two, and exactly the core size at the split threshold', () => {
    const two = planNumbers({ ...inputs, variants: 2 }, BONFERRONI_SPLIT);
    const ten = planNumbers({ ...inputs, variants: 10 }, BONFERRONI_SPLIT);
    expect(ten.perChallengerThreshold).toBeCloseTo(1 - 0.05 / 9, 15);
    expect(ten.visitorsPerVariant).toBe(visitorsNeeded(0.1, 0.5, 1 - 0.05 / 9, 0.8, UNIFORM_PRIOR));
    expect(ten.visitorsPerVariant).toBeGreaterThan(two.visitorsPerVariant);
    expect(ten.totalVisitors).toBe(10 * ten.visitorsPerVariant);
  });

  test.each([1, 2, 4, 9])(
    'the classic size at the split level with %i challenger(s) is R power.prop.test rounded up',
    (m) => {
      const numbers = planNumbers({ ...inputs, baselineRate: 0.1, lift: 0.5, variants: m + 1 });
      const n = manyVariants.classic_n.by_challengers[String(m) as '1' | '2' | '4' | '9'];
      expect(numbers.classicAlphaPerChallenger).toBeCloseTo(0.05 / m, 15);
      expect(numbers.classicPerVariant).toBe(Math.ceil(n));
    },
  );

  test('the threshold source can be swapped', () => {
    const fixed: ThresholdSource = {
      label: 'a fixed 99% for every challenger',
      perChallenger: () => 0.99,
      formula: () => '0.99',
      explain: () => 'fixed',
    };
    expect(planNumbers(inputs, fixed).visitorsPerVariant).toBe(visitorsNeeded(0.1, 0.5, 0.99, 0.8, UNIFORM_PRIOR));
    expect(PLAN_THRESHOLD_SOURCE).toBe(DUNNETT_MANY_TO_ONE);
  });

  test.each(rows.map((row) => [row.challengers, row]))(
    "%i challenger(s): the plan's threshold is Dunnett's many-to-one value (scipy, Dunnett 1955), never stricter than Bonferroni's",
    (challengers, row) => {
      const threshold = DUNNETT_MANY_TO_ONE.perChallenger(0.95, challengers + 1);
      // scipy's critical value printed to 6 decimals (plan_many_variants.json)
      expect(Math.abs(normalQuantile(threshold) - row.dunnett_z)).toBeLessThan(2e-6);
      expect(threshold).toBeLessThanOrEqual(BONFERRONI_SPLIT.perChallenger(0.95, challengers + 1) + 1e-12);
      const numbers = planNumbers({ ...inputs, variants: challengers + 1 });
      expect(numbers.perChallengerThreshold).toBe(threshold);
      expect(numbers.visitorsPerVariant).toBe(visitorsNeeded(0.1, 0.5, threshold, 0.8, UNIFORM_PRIOR));
    },
  );

  test("Dunnett's source writes THRESHOLD_FOR_VARIANTS and explains itself", () => {
    expect(DUNNETT_MANY_TO_ONE.formula('B4', 'B6')).toBe('IF(B6<=2,B4,ABTEST.THRESHOLD_FOR_VARIANTS(B6,1-B4))');
    expect(DUNNETT_MANY_TO_ONE.perChallenger(0.95, 2)).toBe(0.95);
    expect(DUNNETT_MANY_TO_ONE.explain(0.95, 2)).toBe('');
    expect(DUNNETT_MANY_TO_ONE.explain(0.95, 5)).toBe(
      'With 4 challengers, each one gets a chance to win by luck. To keep the overall chance of a false winner at ' +
        "5.00%, each challenger must reach P(beats control) ≥ 98.5% (THRESHOLD_FOR_VARIANTS: Dunnett's many-to-one " +
        'threshold, which counts that all challengers are compared with the same control). That is why each ' +
        'variant needs more visitors than in a test of two.',
    );
  });

  test('the explanation says how many challengers and what each must reach', () => {
    expect(BONFERRONI_SPLIT.explain(0.95, 2)).toBe('');
    expect(BONFERRONI_SPLIT.explain(0.95, 5)).toBe(
      'With 4 challengers, each one gets a chance to win by luck. To keep the overall chance of a false winner at ' +
        '5.00%, the 5.00% is split evenly: each challenger must reach P(beats control) ≥ 98.8% (1.25% each; the ' +
        'Bonferroni split, slightly stricter than needed). That is why each variant needs more visitors than in a ' +
        'test of two.',
    );
  });
});

describe('planNumbers: run time in whole weeks', () => {
  test('per variant from the core, total, whole weeks that cover the days of traffic', () => {
    const numbers = planNumbers(inputs);
    const needed = visitorsNeeded(0.1, 0.5, DUNNETT_MANY_TO_ONE.perChallenger(0.95, 3), 0.8, UNIFORM_PRIOR);
    expect(numbers.visitorsPerVariant).toBe(needed);
    expect(numbers.totalVisitors).toBe(3 * needed);
    expect(numbers.testVisitorsPerDay).toBe(200);
    expect(numbers.daysOfTraffic).toBe(Math.ceil((3 * needed) / 200));
    expect(numbers.days % 7).toBe(0);
    expect(numbers.days).toBe(7 * numbers.weeks);
    expect(numbers.days).toBeGreaterThanOrEqual(numbers.daysOfTraffic);
    expect(numbers.days - numbers.daysOfTraffic).toBeLessThan(7);
  });

  test('a test that needs a day of traffic still runs a whole week (the cautions: run whole weeks)', () => {
    const numbers = planNumbers({ ...inputs, variants: 2, dailyVisitors: 1e7, trafficShare: 1 });
    expect(numbers.daysOfTraffic).toBe(1);
    expect(numbers.weeks).toBe(1);
    expect(numbers.days).toBe(7);
  });

  test('the classic size for two variants is R power.prop.test rounded up', () => {
    // R: power.prop.test(p1 = 0.10, p2 = 0.15, power = 0.8) n = 685.596858 → 686
    expect(planNumbers({ ...inputs, variants: 2 }).classicPerVariant).toBe(686);
  });
});

describe('durationCheck', () => {
  test('up to 8 weeks is fine, longer is long, past half a year unrealistic', () => {
    expect(durationCheck(56)).toEqual({ level: 'fine', text: null });
    expect(durationCheck(63).level).toBe('long');
    expect(durationCheck(63).text).toMatch(
      /^9 weeks is a long test: over 8 weeks returning visitors clear their cookies/,
    );
    const far = durationCheck(1547);
    expect(far.level).toBe('unrealistic');
    expect(far.text).toMatch(/^1,547 days \(about 4\.2 years\) is not a realistic test: /);
    expect(far.text).toContain('To shorten it: plan for a larger smallest lift worth detecting');
    expect(durationCheck(200).text).toMatch(/^200 days \(about 7 months\)/);
  });
});

describe('samePlan', () => {
  test('any changed input or prior makes another plan', () => {
    expect(samePlan(inputs, { ...inputs })).toBe(true);
    expect(samePlan(inputs, { ...inputs, baselineRate: 0.08 })).toBe(false);
    expect(samePlan(inputs, { ...inputs, prior: { alpha: 2, beta: 3 } })).toBe(false);
    expect(samePlan({ ...inputs, prior: { alpha: 2, beta: 3 } }, { ...inputs, prior: { alpha: 2, beta: 3 } })).toBe(
      true,
    );
  });
});

describe('power curve', () => {
  test('sizes from a quarter to twice the plan', () => {
    expect(curveSizes(1000)).toEqual([250, 500, 750, 1000, 1250, 1500, 2000]);
    expect(curveSizes(2)).toEqual([1, 2, 3, 4]);
  });

  test('computes each point with the core at the per-challenger threshold, pausing before each and reporting progress', async () => {
    const events: string[] = [];
    const sizes = [100, 200, 400];
    const points = await powerCurve(inputs, sizes, {
      pause: async () => {
        events.push('pause');
      },
      cancelled: () => false,
      onPoint: (so, done, total) => events.push(`point ${done}/${total} (${so.length})`),
    });
    expect(events).toEqual(['pause', 'point 1/3 (1)', 'pause', 'point 2/3 (2)', 'pause', 'point 3/3 (3)']);
    expect(points).toEqual(
      sizes.map((n) => ({
        visitorsPerVariant: n,
        power: decisionPower(0.1, 0.5, n, DUNNETT_MANY_TO_ONE.perChallenger(0.95, 3), UNIFORM_PRIOR),
      })),
    );
    // more visitors, more power (a property of the design, common practice)
    expect((points[2] as PowerPoint).power).toBeGreaterThan((points[0] as PowerPoint).power);
  });

  test('stops when cancelled, keeping what it has', async () => {
    let calls = 0;
    const points = await powerCurve(inputs, [100, 200, 400], {
      pause: async () => undefined,
      cancelled: () => calls >= 1,
      onPoint: () => {
        calls += 1;
      },
    });
    expect(points).toHaveLength(1);
  });
});
