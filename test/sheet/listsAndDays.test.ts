/**
 * The input policy of the two argument shapes added for tests looked at several times
 * (functions/sheet/days.ts): a list of numbers (`visitors_at_looks`) and day tables (`conversions_by_day`,
 * `visitors_by_day`: one row per day, one column per variant, control first, blank days skipped), and the
 * by-day spills. The conventions are the catalogue's (docs/catalogue.md, "Looking at a running test") and
 * the cell policy of functions/sheet/cells.ts (text, logicals and error values rejected; blanks are "",
 * null or spaces).
 */
import { CATALOGUE } from '../../functions/catalogue';
import { readArgs, readDays, readList, runSheet, spillByDay } from '../../functions/sheet';
import { days, describeParam, list, optionalList, takesRange } from '../../functions/sheet/entry';
import { CONVERSIONS_BY_DAY, PLANNED_SHARES, VISITORS_AT_LOOKS, VISITORS_BY_DAY } from '../../functions/sheet/rules';
import { COMPARISON } from '../../functions/sheet/variants';
import { thrownWorksheetError } from '../helpers/assertions';

function sheetError(body: () => unknown): { code: string; message: string } {
  return thrownWorksheetError(() => runSheet(body));
}

const LOOKS = list(VISITORS_AT_LOOKS, { min: 1, max: 100, noun: 'looks' }, true);
const SHARES = optionalList(PLANNED_SHARES, { min: 2, max: 50, noun: 'shares' });
const CONVERSIONS = days(CONVERSIONS_BY_DAY, COMPARISON);
const VISITORS = days(VISITORS_BY_DAY, COMPARISON);

describe('a list of numbers (visitors_at_looks)', () => {
  test('a column, a row and a single cell are read in order', () => {
    expect(readList(LOOKS, [[1000], [2000], [3000]])).toEqual([1000, 2000, 3000]);
    expect(readList(LOOKS, [[1000, 2000, 3000]])).toEqual([1000, 2000, 3000]);
    expect(readList(LOOKS, [[500]])).toEqual([500]);
    expect(readList(LOOKS, 500)).toEqual([500]);
  });

  test('blank cells ("", null, spaces) are skipped, so a column may have spare cells', () => {
    expect(readList(LOOKS, [[1000], [''], [null], ['  '], [3000]])).toEqual([1000, 3000]);
  });

  test('each value is checked by the rule, naming the item', () => {
    expect(sheetError(() => readList(LOOKS, [[1000], [1500.5]]))).toEqual({
      code: '#VALUE!',
      message: 'visitors_at_looks, item 2: 1500.5 is not a whole number',
    });
    expect(sheetError(() => readList(LOOKS, [[1000], ['2000']]))).toEqual({
      code: '#VALUE!',
      message:
        'visitors_at_looks, item 2: "2000" is text, not a number; enter a whole number from 1 to 1E+9 (convert text with VALUE() if needed)',
    });
    expect(sheetError(() => readList(LOOKS, [[true]]))).toEqual({
      code: '#VALUE!',
      message: 'visitors_at_looks, item 1: TRUE is a logical value, not a number; enter a whole number from 1 to 1E+9',
    });
    expect(sheetError(() => readList(LOOKS, [[2e9]]))).toEqual({
      code: '#VALUE!',
      message: 'visitors_at_looks, item 1: 2000000000 is not allowed; enter a whole number from 1 to 1E+9',
    });
  });

  test('an increasing list must increase, naming both items', () => {
    expect(sheetError(() => readList(LOOKS, [[1000], [''], [1000]]))).toEqual({
      code: '#VALUE!',
      message:
        'visitors_at_looks, item 3: 1000 is not more than the 1000 of item 1; the values are cumulative, so each must be more than the one before',
    });
  });

  test('a 2-D range, an empty list, too many values and a missing argument are errors', () => {
    expect(
      sheetError(() =>
        readList(LOOKS, [
          [1, 2],
          [3, 4],
        ]),
      ).message,
    ).toBe(
      'visitors_at_looks: a range of 2 rows × 2 columns was given; use a single row or a single column (one cell per variant)',
    );
    expect(sheetError(() => readList(LOOKS, [[''], ['']])).message).toBe(
      'visitors_at_looks: at least 1 look is needed; every cell is blank',
    );
    expect(
      sheetError(() =>
        readList(
          LOOKS,
          Array.from({ length: 101 }, (_, i) => [i + 1]),
        ),
      ).message,
    ).toBe('visitors_at_looks: at most 100 looks can be used; 101 were given');
    expect(sheetError(() => readList(LOOKS, null)).message).toBe(
      'visitors_at_looks: is missing; enter a row or a column of 1 to 100 looks',
    );
  });

  test('an optional list left out is undefined', () => {
    expect(readList(SHARES, null)).toBeUndefined();
    expect(readList(SHARES, undefined)).toBeUndefined();
    expect(readList(SHARES, [[2, 1, 1]])).toEqual([2, 1, 1]);
  });

  test('the help describes it from the rule', () => {
    expect(describeParam(LOOKS, CATALOGUE.FALSE_ALARM_WITH_LOOKS)).toBe(
      'a row or a column of 1 to 100 looks; each a whole number from 1 to 1E+9, each more than the one before; blank cells are skipped',
    );
    expect(takesRange(LOOKS)).toBe(true);
  });
});

describe('day tables (one row per day, one column per variant)', () => {
  const conversions = [
    [21, 19, 27],
    ['', '', ''],
    [17, 22, 24],
  ];
  const visitors = [
    [412, 398, 405],
    [null, ' ', ''],
    [388, 401, 377],
  ];

  test('rows blank in every table are days without data: skipped, their positions kept', () => {
    const t = readDays([CONVERSIONS, VISITORS], [conversions, visitors]);
    expect(t).toEqual({
      height: 3,
      width: 3,
      rows: [0, 2],
      columns: {
        conversions_by_day: [
          [21, 19, 27],
          [17, 22, 24],
        ],
        visitors_by_day: [
          [412, 398, 405],
          [388, 401, 377],
        ],
      },
    });
  });

  test('a day with some cells blank is an error naming the first blank cell', () => {
    expect(
      sheetError(() =>
        readDays(
          [CONVERSIONS, VISITORS],
          [
            conversions,
            [
              [412, 398, 405],
              [1, 2, 3],
              [388, 401, 377],
            ],
          ],
        ),
      ),
    ).toEqual({
      code: '#VALUE!',
      message:
        'conversions_by_day, row 2, column 1: is blank while other cells of that day have values; fill in the whole day or leave the whole row blank',
    });
  });

  test("each cell is checked by its rule, naming row and column; conversions at most the same cell's visitors", () => {
    expect(sheetError(() => readDays([CONVERSIONS, VISITORS], [[[5, 'x']], [[10, 10]]])).message).toBe(
      'conversions_by_day, row 1, column 2: "x" is text, not a number; enter a whole number, at least 0 (convert text with VALUE() if needed)',
    );
    expect(sheetError(() => readDays([CONVERSIONS, VISITORS], [[[5, 11]], [[10, 10]]])).message).toBe(
      'conversions_by_day, row 1, column 2: 11 is more than the 10 visitors_by_day',
    );
    expect(sheetError(() => readDays([VISITORS], [[[10, -1]]])).message).toBe(
      'visitors_by_day, row 1, column 2: -1 is negative; enter a whole number, at least 0',
    );
  });

  test('tables of different shapes, one column, too many rows and all-blank tables are errors', () => {
    expect(
      sheetError(() =>
        readDays(
          [CONVERSIONS, VISITORS],
          [
            [[1, 2]],
            [
              [10, 10],
              [10, 10],
            ],
          ],
        ),
      ).message,
    ).toBe(
      'conversions_by_day and visitors_by_day must have the same shape: conversions_by_day is 1 × 2, visitors_by_day is 2 × 2 (rows × columns)',
    );
    expect(sheetError(() => readDays([VISITORS], [[[10], [20]]])).message).toBe(
      'visitors_by_day: 1 column was given; use one column per variant (2 to 50, the control first) and one row per day',
    );
    expect(sheetError(() => readDays([VISITORS], [Array.from({ length: 1001 }, () => [1, 1])])).message).toBe(
      'visitors_by_day: at most 1000 rows (days) can be used; 1001 were given',
    );
    expect(sheetError(() => readDays([VISITORS], [[['', '']]])).message).toBe(
      'visitors_by_day: every row is blank; give at least one day of a whole number, at least 0',
    );
  });

  test("readArgs reads the entry's day tables together into days and dayColumns", () => {
    const a = readArgs(CATALOGUE.PROB_ABOVE_CONTROL_BY_DAY, {
      conversions_by_day: conversions,
      visitors_by_day: visitors,
      prior_alpha: null,
      prior_beta: null,
    });
    expect(a.days.rows).toEqual([0, 2]);
    expect(a.dayColumns.visitors_by_day).toEqual([
      [412, 398, 405],
      [388, 401, 377],
    ]);
    expect(a.prior).toEqual({ alpha: 1, beta: 1 });
  });
});

describe('by-day spills', () => {
  const table = { height: 4, width: 3, rows: [0, 2, 3], columns: {} };

  test('one row per input row: blank days give a row of "", null values a ""', () => {
    expect(
      spillByDay(
        table,
        [
          [0.4, 0.6],
          [null, 0.7],
          [0.5, 0.8],
        ],
        2,
      ),
    ).toEqual([
      [0.4, 0.6],
      ['', ''],
      ['', 0.7],
      [0.5, 0.8],
    ]);
  });

  test('a non-finite value never reaches a cell', () => {
    expect(() =>
      spillByDay(
        table,
        [
          [NaN, 0.6],
          [0.1, 0.7],
          [0.5, 0.8],
        ],
        2,
      ),
    ).toThrow('a result is not a number');
  });
});
