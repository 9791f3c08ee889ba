import { probAboveControlByDay, srmPValueByDay } from '../../functions/stats/byDay';
import { probAboveControl } from '../../functions/stats/conversion';
import { srmPValue } from '../../functions/stats/srm';
import { thrownStatsError } from '../helpers/assertions';
import values from '../reference/looks/looks_values.json';

const table = values.byday;
const days = table.visitors.map((row, d) =>
  row.map((visitors, i) => ({ visitors, conversions: (table.conversions[d] as number[])[i] as number })),
);

describe('PROB_ABOVE_CONTROL_BY_DAY against scipy (test/reference/looks/looks_reference.py, section byday)', () => {
  // An invented test (a control and two challengers over a week, one day without traffic): P(beats
  // control) on the cumulative counts by Evan Miller's closed form in scipy (uniform prior).
  it('matches every day and challenger to 1e-11', () => {
    const got = probAboveControlByDay(days);
    got.forEach((row, d) =>
      row.forEach((v, j) =>
        expect(Math.abs((v as number) - (table.probAboveControl[d] as number[])[j]!)).toBeLessThan(1e-11),
      ),
    );
  });

  it('its last row is the read-out of the whole test', () => {
    const totals = [0, 1, 2].map((i) => ({
      conversions: days.reduce((s, d) => s + d[i]!.conversions, 0),
      visitors: days.reduce((s, d) => s + d[i]!.visitors, 0),
    }));
    expect(probAboveControlByDay(days).at(-1)).toEqual(probAboveControl(totals));
  });

  it('leaves a challenger blank (null) until it and the control have visitors', () => {
    const got = probAboveControlByDay([
      [
        { conversions: 0, visitors: 0 },
        { conversions: 1, visitors: 10 },
      ],
      [
        { conversions: 2, visitors: 12 },
        { conversions: 0, visitors: 0 },
      ],
      [
        { conversions: 1, visitors: 10 },
        { conversions: 3, visitors: 11 },
      ],
    ]);
    expect(got[0]).toEqual([null]);
    expect(got[1]).toEqual(
      probAboveControl([
        { conversions: 2, visitors: 12 },
        { conversions: 1, visitors: 10 },
      ]),
    );
    expect(got[2]).toEqual(
      probAboveControl([
        { conversions: 3, visitors: 22 },
        { conversions: 4, visitors: 21 },
      ]),
    );
  });
});

describe('SRM_PVALUE_BY_DAY against scipy.stats.chisquare on the cumulative visitors', () => {
  it('equal shares, every day to 1e-12', () => {
    srmPValueByDay(table.visitors).forEach((v, d) =>
      expect(Math.abs((v as number) - table.srmPValue[d]!)).toBeLessThan(1e-12),
    );
  });

  it('planned shares 2:1:1, every day to 1e-12', () => {
    srmPValueByDay(table.visitors, [2, 1, 1]).forEach((v, d) =>
      expect(Math.abs((v as number) - table.srmPValuePlanned211[d]!)).toBeLessThan(1e-12),
    );
  });

  it('is null before the first visitor and equals srmPValue of the totals afterwards', () => {
    expect(
      srmPValueByDay([
        [0, 0],
        [500, 520],
        [480, 530],
      ]),
    ).toEqual([null, srmPValue([500, 520]), srmPValue([980, 1050])]);
  });
});

describe('the by-day input checks', () => {
  it.each([
    [[], 'the daily counts: there must be 1 to 1000 days, got 0'],
    [[[{ conversions: 1, visitors: 10 }]], 'the daily counts: each day needs 2 to 50 variants, got 1'],
    [
      [
        [
          { conversions: 1, visitors: 10 },
          { conversions: 1, visitors: 10 },
        ],
        [{ conversions: 1, visitors: 10 }],
      ],
      'the daily counts, day 2: needs 2 variants like day 1',
    ],
    [
      [
        [
          { conversions: 11, visitors: 10 },
          { conversions: 1, visitors: 10 },
        ],
      ],
      'day 1, variant 1: 11 conversions is more than 10 visitors',
    ],
    [
      [
        [
          { conversions: 1, visitors: 10.5 },
          { conversions: 1, visitors: 10 },
        ],
      ],
      'day 1, variant 1, visitors: 10.5 is not a whole number',
    ],
    [
      [
        [
          { conversions: -1, visitors: 10 },
          { conversions: 1, visitors: 10 },
        ],
      ],
      'day 1, variant 1, conversions: -1 is outside 0 to 2^53',
    ],
  ])('%j', (input, message) => {
    const error = thrownStatsError(() => probAboveControlByDay(input as never));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe(message);
  });

  it('bounds the work: at most 2000 days × challengers', () => {
    const wide = Array.from({ length: 101 }, () =>
      Array.from({ length: 21 }, () => ({ conversions: 1, visitors: 10 })),
    );
    const error = thrownStatsError(() => probAboveControlByDay(wide));
    expect(error.code).toBe('invalid_argument');
    expect(error.message).toBe('the daily counts: at most 2000 days × challengers, got 2020');
  });

  it('checks the split check days and shares', () => {
    expect(thrownStatsError(() => srmPValueByDay([[1, 2], [3]])).message).toBe(
      'the daily visitors, day 2: needs 2 variants like day 1',
    );
    expect(thrownStatsError(() => srmPValueByDay([[1, 2]], [1, 0])).message).toBe(
      '0 is not a positive share; planned shares must be greater than 0',
    );
  });
});
