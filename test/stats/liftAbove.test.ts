/**
 * MEAN_PROB_LIFT_ABOVE and EVENTS_PROB_LIFT_ABOVE (normalMeans.meanProbLiftAbove,
 * eventRates.eventsProbLiftAbove) against test/reference/means/lift_above_reference.py → lift_above_values.json:
 * scipy.integrate.quad of the ratio distribution (epsrel 1e-13, both signs of the control for the t
 * posteriors) and, for event rates, the closed form 1 − I_x(a_i, a_0) through scipy.special.betaincc.
 * The summaries are invented.
 */
import reference from '../reference/means/lift_above_values.json';
import { eventsProbAboveControl, eventsProbLiftAbove } from '../../functions/stats/eventRates';
import { meanProbAboveControl, meanProbLiftAbove } from '../../functions/stats/normalMeans';
import type { EventCounts, GammaPrior, MeanSummary } from '../../functions/stats/types';
import { expectProbability, expectStatsErrorExact, thrownStatsError } from '../helpers/assertions';

interface MeanCase {
  name: string;
  variants: MeanSummary[];
  minLifts: number[];
  above: number[][];
  controlBelowZero: number;
}

interface EventCase {
  name: string;
  variants: EventCounts[];
  prior: GammaPrior;
  minLifts: number[];
  aboveQuadrature: number[][];
  aboveClosedForm: number[][];
}

describe.each((reference.means as MeanCase[]).map((c) => [c.name, c]))(
  'meanProbLiftAbove against scipy quad: %s',
  (_n, kase) => {
    const c = kase as MeanCase;
    if (c.controlBelowZero > 1e-6) {
      test("the control's mean could plausibly be ≤ 0: not available, as MEAN_LIFT_INTERVAL", () => {
        const e = thrownStatsError(() => meanProbLiftAbove(c.variants, 0));
        expect(e.code).toBe('not_available');
        expect(e.message).toMatch(
          /^the control's mean could plausibly be zero or negative \(0\.2%\), so a relative lift has no meaning/,
        );
      });
      return;
    }
    test('P(lift > m) matches the ratio distribution by quadrature (1e-9, tails 1e-6 relative)', () => {
      c.minLifts.forEach((m, row) => {
        const got = meanProbLiftAbove(c.variants, m);
        (c.above[row] as number[]).forEach((want, i) => expectProbability(got[i] ?? NaN, want));
      });
    });
  },
);

test('meanProbLiftAbove at min_lift 0 is P(mean > control) when the control is positive for sure', () => {
  const v: MeanSummary[] = [
    { count: 100, mean: 48, sd: 20 },
    { count: 100, mean: 52, sd: 22 },
  ];
  // The control's posterior puts 2e-43 below 0 (reference), so the two probabilities agree to rounding.
  expect(Math.abs((meanProbLiftAbove(v, 0)[0] ?? NaN) - (meanProbAboveControl(v)[0] ?? NaN))).toBeLessThanOrEqual(
    1e-12,
  );
});

test('meanProbLiftAbove with sd = 0 against the exact forms (scipy.special.stdtr)', () => {
  // A point-mass control c0: P(Y > (1 + m)·c0), the challenger's t tail.
  const pc = reference.meansPointControl;
  expectProbability(meanProbLiftAbove(pc.variants, pc.minLift)[0] ?? NaN, pc.above);
  // A point-mass challenger c: P(0 < X < c/(1 + m)) through the control's t.
  const ch = reference.meansPointChallenger;
  expectProbability(meanProbLiftAbove(ch.variants, ch.minLift)[0] ?? NaN, ch.above);
  // Two point masses: 1, 0, and ½ exactly at the threshold (ties count half, as MEAN_PROB_ABOVE_CONTROL).
  const twoPoints = (m: number) =>
    meanProbLiftAbove(
      [
        { count: 10, mean: 40, sd: 0 },
        { count: 10, mean: 44, sd: 0 },
      ],
      m,
    )[0];
  expect(twoPoints(0.05)).toBe(1);
  expect(twoPoints(0.2)).toBe(0);
  expect(twoPoints(44 / 40 - 1)).toBe(0.5);
});

test('meanProbLiftAbove rejects a min_lift of -1 or below, naming the argument', () => {
  expectStatsErrorExact(
    () =>
      meanProbLiftAbove(
        [
          { count: 10, mean: 4, sd: 1 },
          { count: 10, mean: 5, sd: 1 },
        ],
        -1,
      ),
    'invalid_argument',
    'min_lift: -1 is not allowed; the minimum lift is a number greater than -1 (-0.02 asks "no worse than 2% below")',
  );
});

describe.each((reference.events as EventCase[]).map((c) => [c.name, c]))('eventsProbLiftAbove: %s', (_n, kase) => {
  const c = kase as EventCase;
  test('matches the closed form (scipy.special.betaincc) and scipy quadrature', () => {
    c.minLifts.forEach((m, row) => {
      const got = eventsProbLiftAbove(c.variants, m, c.prior);
      (c.aboveClosedForm[row] as number[]).forEach((want, i) => {
        expectProbability(got[i] ?? NaN, want);
        // a tail of 6.5e-55 keeps its relative accuracy (the upper tail is computed directly)
        if (want < 1e-20) expect(Math.abs((got[i] ?? NaN) / want - 1)).toBeLessThanOrEqual(1e-9);
        expectProbability(got[i] ?? NaN, (c.aboveQuadrature[row] as number[])[i] ?? NaN);
      });
    });
  });
});

test('eventsProbLiftAbove at min_lift 0 equals eventsProbAboveControl (the same closed form)', () => {
  const v: EventCounts[] = [
    { events: 120, exposure: 1000 },
    { events: 145, exposure: 1010 },
  ];
  expect(Math.abs((eventsProbLiftAbove(v, 0)[0] ?? NaN) - (eventsProbAboveControl(v)[0] ?? NaN))).toBeLessThanOrEqual(
    1e-15,
  );
});

test('eventsProbLiftAbove rejects a min_lift that is not a number above -1', () => {
  expectStatsErrorExact(
    () =>
      eventsProbLiftAbove(
        [
          { events: 1, exposure: 2 },
          { events: 2, exposure: 2 },
        ],
        Number.NaN,
      ),
    'invalid_argument',
    'min_lift: NaN is not allowed; the minimum lift is a number greater than -1 (-0.05 asks "no worse than 5% below")',
  );
});
