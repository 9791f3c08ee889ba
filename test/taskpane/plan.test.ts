/**
 * The Plan section's logic: input checks, the plan's numbers (days as the sheet's ROUNDUP), the
 * classic size against R's power.prop.test (shared/check-values.md), and the power curve computed a
 * point at a time — pausing between points and stopping when cancelled.
 */
import { curveSizes, planNumbers, planProblems, powerCurve, type PowerPoint } from '../../taskpane/logic/plan';
import { decisionPower, visitorsNeeded } from '../../functions/stats/planning';
import { UNIFORM_PRIOR } from '../../functions/stats/types';

const inputs = { baselineRate: 0.1, lift: 0.5, threshold: 0.95, power: 0.8, variants: 3, dailyVisitors: 500, trafficShare: 0.4, classicAlpha: 0.05 };

describe('planProblems', () => {
  test('good inputs have none; each bad input is named', () => {
    expect(planProblems(inputs)).toEqual([]);
    expect(planProblems({ ...inputs, baselineRate: 0, trafficShare: 1.5, variants: 1.5 })).toEqual([
      'baseline rate must be between 0% and 100%',
      'number of variants must be a whole number from 2 to 50',
      'share of traffic in the test must be above 0 and at most 100%',
    ]);
    expect(planProblems({ ...inputs, baselineRate: 0.8, lift: 0.5 })).toEqual(['baseline rate × (1 + lift) must stay below 100%']);
  });
});

describe('planNumbers', () => {
  test('per variant from the core, total, days rounded up, classic size as R power.prop.test', () => {
    const numbers = planNumbers(inputs);
    const needed = visitorsNeeded(0.1, 0.5, 0.95, 0.8, UNIFORM_PRIOR);
    expect(numbers.visitorsPerVariant).toBe(needed);
    expect(numbers.totalVisitors).toBe(3 * needed);
    expect(numbers.days).toBe(Math.ceil((3 * needed) / 200));
    // R: power.prop.test(p1 = 0.10, p2 = 0.15, power = 0.8) n = 685.596858 → 686 (shared/check-values.md)
    expect(numbers.classicPerVariant).toBe(686);
  });
});

describe('power curve', () => {
  test('sizes from a quarter to twice the plan', () => {
    expect(curveSizes(1000)).toEqual([250, 500, 750, 1000, 1250, 1500, 2000]);
    expect(curveSizes(2)).toEqual([1, 2, 3, 4]);
  });

  test('computes each point with the core, pausing before each and reporting progress', async () => {
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
    expect(points).toEqual(sizes.map((n) => ({ visitorsPerVariant: n, power: decisionPower(0.1, 0.5, n, 0.95, UNIFORM_PRIOR) })));
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
