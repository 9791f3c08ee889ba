/**
 * The decision rule shared by every *_DECISION (functions/stats/decisionRule.ts), and the DECISION-style
 * read-outs of the other metrics built on it (eventsDecide, meanDecide). The rule is the expected-loss
 * stopping rule (C. Stucchio, "Bayesian A/B Testing at VWO", 2015; common practice): choose the variant
 * with the smallest expected loss once it is at most max_loss. Its inputs here are invented numbers; the
 * losses it is fed elsewhere are tested against scipy and mpmath in their own files.
 */
import { chooseByLoss, lossThreshold } from '../../functions/stats/decisionRule';
import { eventsDecide, eventsExpectedLoss } from '../../functions/stats/eventRates';
import { meanDecide, meanExpectedLoss } from '../../functions/stats/normalMeans';
import { expectStatsErrorExact } from '../helpers/assertions';

test('chooseByLoss picks the smallest loss and compares it with max_loss (inclusive)', () => {
  expect(chooseByLoss([0.3, 0.0001, 0.2], 0.001)).toEqual({ choose: true, index: 1, loss: 0.0001, maxLoss: 0.001 });
  expect(chooseByLoss([0.3, 0.002, 0.2], 0.001)).toEqual({ choose: false, index: 1, loss: 0.002, maxLoss: 0.001 });
  // at exactly max_loss the variant may be chosen ("within the allowed")
  expect(chooseByLoss([0.5, 0.001], 0.001).choose).toBe(true);
  // equal losses: the first (the control before a challenger)
  expect(chooseByLoss([0.01, 0.01], 0.1).index).toBe(0);
});

test('chooseByLoss rejects an empty list and a loss that is not a number of at least 0', () => {
  expectStatsErrorExact(() => chooseByLoss([], 0.1), 'invalid_argument', 'at least one expected loss is needed');
  expectStatsErrorExact(
    () => chooseByLoss([0.1, Number.NaN], 0.1),
    'invalid_argument',
    'the expected loss of variant 2 is not a number of at least 0: NaN',
  );
});

test('lossThreshold: the default is 1% of |control mean| (as DECISION); a given max_loss is checked', () => {
  expect(lossThreshold(undefined, 2.5)).toBe(0.025);
  expect(lossThreshold(undefined, -4)).toBe(0.04);
  expect(lossThreshold(0, 2.5)).toBe(0);
  expectStatsErrorExact(
    () => lossThreshold(-0.01, 2.5),
    'invalid_argument',
    "max_loss: -0.01 is not allowed; the largest acceptable loss is a number of at least 0, in the metric's units",
  );
});

test('eventsDecide applies the rule to eventsExpectedLoss with 1% of the control mean rate by default', () => {
  const v = [
    { events: 1200, exposure: 10000 },
    { events: 1450, exposure: 10100 },
  ];
  const losses = eventsExpectedLoss(v);
  const d = eventsDecide(v, undefined);
  expect(d.index).toBe(1);
  expect(d.loss).toBe(losses[1]);
  // control's posterior mean rate under the flat Gamma(1, 0) prior: 1201/10000
  expect(d.maxLoss).toBeCloseTo(0.01 * (1201 / 10000), 15);
  expect(d.choose).toBe((losses[1] as number) <= d.maxLoss);
  expect(eventsDecide(v, 0).choose).toBe(false);
});

test('meanDecide applies the rule to meanExpectedLoss; the default needs a control mean other than 0', () => {
  const v = [
    { count: 2000, mean: 48, sd: 20 },
    { count: 2000, mean: 52, sd: 22 },
  ];
  const d = meanDecide(v, undefined);
  expect(d).toEqual({ choose: true, index: 1, loss: meanExpectedLoss(v)[1], maxLoss: 0.48 });
  expectStatsErrorExact(
    () =>
      meanDecide(
        [
          { count: 20, mean: 0, sd: 1 },
          { count: 20, mean: 0.5, sd: 1 },
        ],
        undefined,
      ),
    'not_available',
    "max_loss: the default, 1% of the control's mean, is 0 because that mean is 0; give max_loss in the metric's units",
  );
  expect(
    meanDecide(
      [
        { count: 20, mean: 0, sd: 1 },
        { count: 20, mean: 0.5, sd: 1 },
      ],
      0.05,
    ).index,
  ).toBe(1);
});
