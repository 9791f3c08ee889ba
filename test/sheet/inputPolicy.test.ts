/**
 * The sheet layer's input policy, by name: how ranges become checked numbers, what is rejected with which
 * message, and how results spill. The conventions tested here are the catalogue's
 * (docs/catalogue.md, "Conventions every function follows"); the policy for text, logicals and
 * whitespace is our own and is written down in functions/sheet/cells.ts.
 */
import { StatsError } from '../../functions/stats/errors';
import {
  COMPARISON,
  ONE_OR_MORE,
  readBetaPrior,
  readChoice,
  readConversions,
  readGammaPrior,
  readMeans,
  readOptionalNumber,
  readSplit,
  runSheet,
  spillBlock,
  spillBlockVersusControl,
  spillDensity,
  spillPerVariant,
  spillVersusControl,
  LEVEL,
  RATE_INTERVAL_METHOD,
  POINTS,
  readRequiredNumber,
  MIN_LIFT,
  LIFT,
  THRESHOLD,
  POWER,
  ALPHA,
  BASELINE_RATE,
  percentHint,
  variantLetter,
  BEYOND_CELL_MESSAGE,
  CATCH_ALL_MESSAGE,
  intervalRows,
  medianRows,
} from '../../functions/sheet';
import {
  amountDecisionCell,
  decisionText,
  defaultLabel,
  formatAmount,
  decisionPercent,
  labelOf,
} from '../../functions/sheet/decision';
import { readArgs } from '../../functions/sheet/args';
import { CATALOGUE } from '../../functions/catalogue';
import { thrownWorksheetError } from '../helpers/assertions';

/** Runs `body` through the one error mapping and returns the worksheet error it produced. */
function sheetError(body: () => unknown): { code: string; message: string } {
  return thrownWorksheetError(() => runSheet(body));
}

const col = (...xs: unknown[]): unknown[][] => xs.map((x) => [x]);
const row = (...xs: unknown[]): unknown[][] => [xs];

describe('orientation', () => {
  test('a single column is read top to bottom and spills a column', () => {
    const input = readConversions(col(10, 12, 9), col(100, 110, 90), COMPARISON);
    expect(input.table.orientation).toBe('column');
    expect(input.variants).toEqual([
      { conversions: 10, visitors: 100 },
      { conversions: 12, visitors: 110 },
      { conversions: 9, visitors: 90 },
    ]);
    expect(spillPerVariant(input.table, [0.1, 0.2, 0.3])).toEqual([[0.1], [0.2], [0.3]]);
  });

  test('a single row is read left to right and spills a row', () => {
    const input = readConversions(row(10, 12), row(100, 110), COMPARISON);
    expect(input.table.orientation).toBe('row');
    expect(spillPerVariant(input.table, [0.4, 0.6])).toEqual([[0.4, 0.6]]);
  });

  test('a single cell is a column of one', () => {
    const input = readConversions([[3]], [[30]], ONE_OR_MORE);
    expect(input.table.orientation).toBe('column');
    expect(spillPerVariant(input.table, [0.125])).toEqual([[0.125]]);
  });

  test('a bare number (not wrapped by Excel) is read as a 1 × 1 range', () => {
    expect(readConversions(3, 30, ONE_OR_MORE).variants).toEqual([{ conversions: 3, visitors: 30 }]);
  });

  test('a 2-D range is rejected, naming its shape', () => {
    expect(
      sheetError(() =>
        readConversions(
          [
            [1, 2],
            [3, 4],
          ],
          [
            [10, 20],
            [30, 40],
          ],
          COMPARISON,
        ),
      ),
    ).toEqual({
      code: '#VALUE!',
      message:
        'conversions: a range of 2 rows × 2 columns was given; use a single row or a single column (one cell per variant)',
    });
  });
});

describe('blank rows', () => {
  test.each([
    ['""', ''],
    ['null', null],
    ['undefined', undefined],
    ['spaces only', '   '],
  ])('a position blank (%s) in both ranges is no variant: skipped, its slot is ""', (_name, blank) => {
    const input = readConversions(col(10, blank, 12), col(100, blank, 110), COMPARISON);
    expect(input.variants).toEqual([
      { conversions: 10, visitors: 100 },
      { conversions: 12, visitors: 110 },
    ]);
    expect(input.table.positions).toEqual([0, 2]);
    expect(spillPerVariant(input.table, [0.3, 0.7])).toEqual([[0.3], [''], [0.7]]);
  });

  test('blank positions before the control: the first non-blank position is the control', () => {
    const input = readConversions(col('', 10, 12), col('', 100, 110), COMPARISON);
    expect(spillVersusControl(input.table, [0.9])).toEqual([[''], [''], [0.9]]);
  });

  test('only one of the pair blank is an error naming the blank one and the position', () => {
    expect(sheetError(() => readConversions(col(10, 12), col(100, ''), COMPARISON))).toEqual({
      code: '#VALUE!',
      message: 'visitors, item 2: is blank while conversions has a value; fill in both or leave both blank',
    });
    expect(sheetError(() => readConversions(col(null, 12), col(100, 120), COMPARISON))).toEqual({
      code: '#VALUE!',
      message: 'conversions, item 1: is blank while visitors has a value; fill in both or leave both blank',
    });
  });

  test('every position blank: no variant at all', () => {
    expect(sheetError(() => readConversions(col('', ''), col('', ''), COMPARISON))).toEqual({
      code: '#VALUE!',
      message: 'at least 2 variants are needed to compare; every position is blank',
    });
  });
});

describe('cell values', () => {
  test('text, even numeric text, is rejected with a hint', () => {
    expect(sheetError(() => readConversions(col(10, '12'), col(100, 110), COMPARISON))).toEqual({
      code: '#VALUE!',
      message:
        'conversions, item 2: "12" is text, not a number; enter a whole number, at least 0 (convert text with VALUE() if needed)',
    });
  });

  test('logical values are rejected', () => {
    expect(sheetError(() => readConversions(col(10, 12), col(true, 110), COMPARISON))).toEqual({
      code: '#VALUE!',
      message: 'visitors, item 1: TRUE is a logical value, not a number; enter a whole number, at least 1',
    });
  });

  test('error values and NaN are rejected', () => {
    const errorCell = new CustomFunctions.Error(CustomFunctions.ErrorCode.notAvailable);
    expect(sheetError(() => readConversions(col(10, errorCell), col(100, 110), COMPARISON))).toEqual({
      code: '#VALUE!',
      message: 'conversions, item 2: the error value #N/A is not a number; enter a whole number, at least 0',
    });
    expect(sheetError(() => readConversions(col(10, 12), col(100, Number.NaN), COMPARISON)).message).toBe(
      'visitors, item 2: NaN is not a number; enter a whole number, at least 1',
    );
  });

  test('non-whole counts are rejected (the catalogue example message)', () => {
    expect(sheetError(() => readConversions(col(1, 2, 3), col(10, 20, 12.5), COMPARISON))).toEqual({
      code: '#VALUE!',
      message: 'visitors, item 3: 12.5 is not a whole number',
    });
  });

  test('negative counts are rejected', () => {
    expect(sheetError(() => readConversions(col(-3, 2), col(10, 20), COMPARISON))).toEqual({
      code: '#VALUE!',
      message: 'conversions, item 1: -3 is negative; enter a whole number, at least 0',
    });
  });

  test('visitors of 0 are rejected', () => {
    expect(sheetError(() => readConversions(col(0, 2), col(0, 20), COMPARISON)).message).toBe(
      'visitors, item 1: 0 is not allowed; enter a whole number, at least 1',
    );
  });

  test('conversions above visitors are rejected', () => {
    expect(sheetError(() => readConversions(col(10, 130), col(100, 120), COMPARISON))).toEqual({
      code: '#VALUE!',
      message: 'conversions, item 2: 130 is more than the 120 visitors',
    });
  });

  test('counts up to 2^53 are accepted, above are rejected', () => {
    const big = 2 ** 53;
    expect(readConversions(col(1, 2), col(big, big), COMPARISON).variants[0]).toEqual({
      conversions: 1,
      visitors: big,
    });
    expect(sheetError(() => readConversions(col(1, 2), col(big * 2, 10), COMPARISON)).message).toBe(
      `visitors, item 1: ${big * 2} is larger than 2^53, the largest count accepted`,
    );
  });
});

describe('shapes and counts', () => {
  test('ranges of different shapes are rejected, naming both shapes', () => {
    expect(sheetError(() => readConversions(col(1, 2, 3), col(10, 20, 30, 40), COMPARISON))).toEqual({
      code: '#VALUE!',
      message:
        'conversions and visitors must have the same shape: conversions is 3 rows × 1 column, visitors is 4 rows × 1 column',
    });
    expect(sheetError(() => readConversions(col(1, 2), row(10, 20), COMPARISON)).message).toBe(
      'conversions and visitors must have the same shape: conversions is 2 rows × 1 column, visitors is 1 row × 2 columns',
    );
  });

  test('comparisons need 2 variants', () => {
    expect(sheetError(() => readConversions(col(1), col(10), COMPARISON))).toEqual({
      code: '#VALUE!',
      message: 'at least 2 variants are needed to compare; only 1 was given',
    });
  });

  test('comparisons accept 50 variants and reject 51', () => {
    const fifty = Array.from({ length: 50 }, (_, i) => i);
    expect(readConversions(col(...fifty), col(...fifty.map(() => 100)), COMPARISON).variants).toHaveLength(50);
    const fiftyOne = Array.from({ length: 51 }, (_, i) => i);
    expect(sheetError(() => readConversions(col(...fiftyOne), col(...fiftyOne.map(() => 100)), COMPARISON))).toEqual({
      code: '#VALUE!',
      message: 'at most 50 variants can be compared; 51 were given',
    });
  });

  test('blank positions do not count towards the 50', () => {
    const cells = Array.from({ length: 60 }, (_, i) => (i % 6 === 5 ? '' : 1));
    expect(
      readConversions(col(...cells), col(...cells.map((c) => (c === '' ? '' : 10))), COMPARISON).variants,
    ).toHaveLength(50);
  });
});

describe('priors and scalars', () => {
  test('both prior parameters omitted give the uniform prior Beta(1, 1)', () => {
    expect(readBetaPrior(undefined, null)).toEqual({ alpha: 1, beta: 1 });
  });

  test('both given are used', () => {
    expect(readBetaPrior(2, 38)).toEqual({ alpha: 2, beta: 38 });
  });

  test('only one given is an error naming the missing one', () => {
    expect(sheetError(() => readBetaPrior(2, undefined))).toEqual({
      code: '#VALUE!',
      message:
        'prior_alpha and prior_beta: give both or neither (prior_beta is missing); leaving both out uses the uniform prior Beta(1, 1)',
    });
    expect(sheetError(() => readBetaPrior(null, 5)).message).toMatch(
      /^prior_alpha and prior_beta: give both or neither \(prior_alpha is missing\)/,
    );
  });

  test('prior parameters lie in the declared domain, 0.001 to 1E+6 (stats/limits.ts), both ends included', () => {
    expect(sheetError(() => readBetaPrior(0, 1))).toEqual({
      code: '#VALUE!',
      message: 'prior_alpha: 0 is not allowed; enter a number from 0.001 to 1E+6',
    });
    expect(sheetError(() => readBetaPrior(1, 1e-12))).toEqual({
      code: '#VALUE!',
      message: 'prior_beta: 1e-12 is not allowed; enter a number from 0.001 to 1E+6',
    });
    expect(sheetError(() => readGammaPrior(2e6, 1)).message).toBe(
      'prior_shape: 2000000 is not allowed; enter a number from 0.001 to 1E+6',
    );
    expect(readBetaPrior(0.001, 1e6)).toEqual({ alpha: 0.001, beta: 1e6 });
  });

  test('the Gamma prior takes each default on its own: shape 1, rate 0', () => {
    expect(readGammaPrior(undefined, undefined)).toEqual({ shape: 1, rate: 0 });
    expect(readGammaPrior(3, undefined)).toEqual({ shape: 3, rate: 0 });
    expect(sheetError(() => readGammaPrior(1, -1)).message).toBe(
      'prior_rate: -1 is not allowed; enter a number from 0 to 1E+12',
    );
  });

  test('levels lie from 0.01 to 0.9999 (the declared domain); omitted gives 0.95', () => {
    expect(readOptionalNumber(LEVEL, null)).toBe(0.95);
    expect(readOptionalNumber(LEVEL, 0.8)).toBe(0.8);
    expect(readOptionalNumber(LEVEL, 0.9999)).toBe(0.9999);
    expect(readOptionalNumber(LEVEL, 0.01)).toBe(0.01);
    for (const bad of [0, 1, 1.5, -0.1, 0.99999, 0.001]) {
      expect(sheetError(() => readOptionalNumber(LEVEL, bad))).toEqual({
        code: '#VALUE!',
        message: `level: ${bad} is not allowed; enter a number from 0.01 to 0.9999`,
      });
    }
  });

  test('a required scalar that is missing says so', () => {
    expect(sheetError(() => readRequiredNumber(MIN_LIFT, undefined)).message).toBe(
      'min_lift: is missing; enter a number greater than -1 and at most 1',
    );
  });

  test('points must be a whole number from 2 to 1000', () => {
    expect(readOptionalNumber(POINTS, undefined)).toBe(101);
    expect(sheetError(() => readOptionalNumber(POINTS, 1)).message).toBe(
      'points: 1 is not allowed; enter a whole number from 2 to 1000',
    );
    expect(sheetError(() => readOptionalNumber(POINTS, 10.5)).message).toBe('points: 10.5 is not a whole number');
  });

  test('method words are case-insensitive; others are rejected with the allowed list', () => {
    expect(readChoice(RATE_INTERVAL_METHOD, undefined)).toBe('central');
    expect(readChoice(RATE_INTERVAL_METHOD, ' HDI ')).toBe('hdi');
    expect(sheetError(() => readChoice(RATE_INTERVAL_METHOD, 'widest'))).toEqual({
      code: '#VALUE!',
      message: 'method: "widest" is not allowed; enter "central" or "hdi"',
    });
    expect(sheetError(() => readChoice(RATE_INTERVAL_METHOD, 2)).message).toBe(
      'method: 2 is not allowed; enter "central" or "hdi"',
    );
  });
});

describe('other families', () => {
  test('means: count ≥ 2, sd ≥ 0, any finite mean; three ranges of one shape', () => {
    const input = readMeans(col(10, 12), col(-1.5, 2), col(0, 3), COMPARISON);
    expect(input.variants).toEqual([
      { count: 10, mean: -1.5, sd: 0 },
      { count: 12, mean: 2, sd: 3 },
    ]);
    expect(sheetError(() => readMeans(col(1, 12), col(1, 2), col(1, 3), COMPARISON)).message).toBe(
      'count, item 1: 1 is not allowed; enter a whole number, at least 2',
    );
    expect(sheetError(() => readMeans(col(10, 12), col(1, 2), col(1, -3), COMPARISON)).message).toBe(
      'sd, item 2: -3 is not allowed; enter 0, or a number from 1E-6 to 1E+12',
    );
    expect(sheetError(() => readMeans(col(10, 12), col(1, ''), col(1, 3), COMPARISON)).message).toBe(
      'mean, item 2: is blank while count has a value; fill in both or leave both blank',
    );
  });

  test('revenue: orders ≤ visitors, revenue ≥ 0; order_sd lines up with the variants (each given, 0 or more)', () => {
    const fn = CATALOGUE.REVENUE_PROB_ABOVE_CONTROL;
    const read = (orders: unknown, visitors: unknown, revenue: unknown, order_sd?: unknown) =>
      readArgs(fn, { orders, visitors, revenue, order_sd });
    const input = read(col(120, '', 150), col(2400, '', 2380), col(7200, '', 8100), col(55, '', 60));
    expect(input.variants).toEqual([
      { orders: 120, visitors: 2400, revenue: 7200 },
      { orders: 150, visitors: 2380, revenue: 8100 },
    ]);
    expect(input.order_sd).toEqual([55, 60]);
    expect(read(col(120, 150), col(2400, 2380), col(7200, 8100)).order_sd).toBeUndefined();
    expect(sheetError(() => read(col(120, 150), col(2400, 140), col(7200, 8100))).message).toBe(
      'orders, item 2: 150 is more than the 140 visitors',
    );
    expect(sheetError(() => read(col(120, 150), col(2400, 2380), col(7200, -1))).message).toBe(
      'revenue, item 2: -1 is not allowed; enter a number from 0 to 1E+12',
    );
    expect(sheetError(() => read(col(120, 150), col(2400, 2380), col(7200, 8100), col(55, ''))).message).toBe(
      'order_sd, item 2: is blank; enter 0, or a number from 1E-6 to 1E+12',
    );
    expect(sheetError(() => read(col(120, 150), col(2400, 2380), col(7200, 8100), row(55, 60))).message).toBe(
      'order_sd must have the same shape as orders: order_sd is 1 row × 2 columns, orders is 2 rows × 1 column',
    );
    expect(sheetError(() => read(col(120, 150), col(2400, 2380), col(7200, 8100), col(55, -2))).message).toBe(
      'order_sd, item 2: -2 is not allowed; enter 0, or a number from 1E-6 to 1E+12',
    );
  });

  test('split: planned shares line up with visitors; blank visitor positions are skipped', () => {
    const split = readSplit(col(500, '', 520), col(1, 7, 1), COMPARISON);
    expect(split.visitors).toEqual([500, 520]);
    expect(split.plannedShares).toEqual([1, 1]);
    expect(readSplit(row(5, 6), undefined, COMPARISON).plannedShares).toBeUndefined();
    expect(sheetError(() => readSplit(col(500, 520), row(1, 1), COMPARISON)).message).toBe(
      'planned_shares must have the same shape as visitors: planned_shares is 1 row × 2 columns, visitors is 2 rows × 1 column',
    );
    expect(sheetError(() => readSplit(col(500, 520), col(1, 0), COMPARISON)).message).toBe(
      'planned_shares, item 2: 0 is not allowed; enter a number from 1E-6 to 1E+12',
    );
  });
});

describe('spills', () => {
  const columnTable = readConversions(col(1, '', 2, 3), col(10, '', 20, 30), COMPARISON).table;
  const rowTable = readConversions(row(1, '', 2, 3), row(10, '', 20, 30), COMPARISON).table;

  test('blocks are one row per variant for a column input', () => {
    expect(
      spillBlock(
        columnTable,
        [
          [1, 2],
          [3, 4],
          [5, 6],
        ],
        2,
      ),
    ).toEqual([
      [1, 2],
      ['', ''],
      [3, 4],
      [5, 6],
    ]);
  });

  test('blocks are one column per variant for a row input', () => {
    expect(
      spillBlock(
        rowTable,
        [
          [1, 2],
          [3, 4],
          [5, 6],
        ],
        2,
      ),
    ).toEqual([
      [1, '', 3, 5],
      [2, '', 4, 6],
    ]);
  });

  test('versus-control blocks leave the control and blank slots empty', () => {
    expect(
      spillBlockVersusControl(
        columnTable,
        [
          [-1, 0, 1],
          [-2, 0, 2],
        ],
        3,
      ),
    ).toEqual([
      ['', '', ''],
      ['', '', ''],
      [-1, 0, 1],
      [-2, 0, 2],
    ]);
    expect(spillVersusControl(rowTable, [0.7, 0.8])).toEqual([['', '', 0.7, 0.8]]);
  });

  test('density tables: grid first, one column per position, "" columns for blank positions', () => {
    const per = spillDensity(
      columnTable,
      {
        grid: [0.1, 0.2],
        densities: [
          [1, 2],
          [3, 4],
          [5, 6],
        ],
      },
      'variant',
    );
    expect(per).toEqual([
      [0.1, 1, '', 3, 5],
      [0.2, 2, '', 4, 6],
    ]);
    const lift = spillDensity(
      columnTable,
      {
        grid: [0, 1],
        densities: [
          [3, 4],
          [5, 6],
        ],
      },
      'challenger',
    );
    expect(lift).toEqual([
      [0, '', 3, 5],
      [1, '', 4, 6],
    ]);
  });

  test('interval rows are put in order; values closer than the search tolerance may have crossed', () => {
    // RATE_DIFF_INTERVAL({1,1},{1,1},0.8,0.001,0.001): a symmetric difference, median 0 and 10% point a tiny
    // negative number; the searches returned 0 and −2.9e-16, both within their tolerance of the true values
    expect(medianRows([{ lower: 0, median: -2.868e-16, upper: 0 }])).toEqual([[-2.868e-16, 0, 0]]);
    expect(
      intervalRows([
        { lower: 0.2, upper: 0.1 },
        { lower: -1, upper: 1 },
      ]),
    ).toEqual([
      [0.1, 0.2],
      [-1, 1],
    ]);
  });

  test('a non-finite number never reaches a cell', () => {
    expect(sheetError(() => spillPerVariant(columnTable, [0.1, Number.NaN, 0.3]))).toEqual({
      code: '#VALUE!',
      message: CATCH_ALL_MESSAGE,
    });
  });

  test('an infinite answer is #N/A saying it is beyond what a cell holds, in plain words', () => {
    const error = sheetError(() =>
      spillBlockVersusControl(
        columnTable,
        [
          [0, 1, Number.POSITIVE_INFINITY],
          [0, 1, 2],
        ],
        3,
      ),
    );
    expect(error).toEqual({ code: '#N/A', message: BEYOND_CELL_MESSAGE });
    expect(error.message).not.toMatch(/Infinity|NaN|unexpected|report/);
  });
});

describe('the one error mapping', () => {
  test('core invalid_argument becomes #VALUE! with its message', () => {
    expect(
      sheetError(() => {
        throw new StatsError('invalid_argument', 'low must be below high');
      }),
    ).toEqual({
      code: '#VALUE!',
      message: 'low must be below high',
    });
  });

  test('core not_available becomes #N/A with its message', () => {
    expect(
      sheetError(() => {
        throw new StatsError('not_available', 'the highest-density region is not an interval');
      }),
    ).toEqual({
      code: '#N/A',
      message: 'the highest-density region is not an interval',
    });
  });

  test('a raw JavaScript error becomes #VALUE! in plain words, without its code detail', () => {
    expect(
      sheetError(() => {
        throw new TypeError('x is undefined');
      }),
    ).toEqual({
      code: '#VALUE!',
      message:
        'could not compute this result for these inputs; check that every argument is within the range its help page gives',
    });
  });

  test('a core message that prints an overflowed number never reaches the cell as such', () => {
    const overflow = new StatsError(
      'invalid_argument',
      'a relative lift must be a finite number greater than -1, not Infinity',
    );
    expect(
      sheetError(() => {
        throw overflow;
      }),
    ).toEqual({ code: '#N/A', message: BEYOND_CELL_MESSAGE });
    const nan = new StatsError('invalid_argument', 'x must be a number, got NaN');
    expect(
      sheetError(() => {
        throw nan;
      }),
    ).toEqual({ code: '#VALUE!', message: CATCH_ALL_MESSAGE });
  });

  test('results pass through unchanged', () => {
    expect(runSheet(() => [[1, 2]])).toEqual([[1, 2]]);
  });
});

describe('decision text', () => {
  test('percentages keep two significant digits and at least two decimals', () => {
    expect(decisionPercent(0.0123)).toBe('1.23%');
    expect(decisionPercent(0.003)).toBe('0.30%');
    expect(decisionPercent(0.0002)).toBe('0.020%');
    expect(decisionPercent(6.5235e-5)).toBe('0.0065%');
    expect(decisionPercent(0)).toBe('0%');
  });

  test('default labels are A, B, … Z, AA by position', () => {
    expect([0, 1, 25, 26, 49].map(defaultLabel)).toEqual(['A', 'B', 'Z', 'AA', 'AX']);
    expect(labelOf('  Green button ', 1)).toBe('Green button');
    expect(labelOf(2024, 1)).toBe('2024');
    expect(labelOf('', 2)).toBe('C');
  });

  test('amounts (other metrics) keep two significant digits and at least two decimals, with no currency', () => {
    expect(formatAmount(0.0042)).toBe('0.0042');
    expect(formatAmount(0.030479)).toBe('0.030');
    expect(formatAmount(12.3456)).toBe('12.35');
    expect(formatAmount(0)).toBe('0');
    // labels come lined up with the variants (a blank position already left out)
    const table = { positions: [0, 2] };
    expect(
      amountDecisionCell(
        table,
        ['Old', 'New'],
        { choose: true, index: 1, loss: 0.0042, maxLoss: 0.021 },
        'per visitor',
      ),
    ).toBe('Choose New: its expected loss 0.0042 per visitor is within the 0.021 per visitor allowed');
    expect(
      amountDecisionCell(
        table,
        undefined,
        { choose: false, index: 1, loss: 0.02, maxLoss: 0.0012 },
        'events per unit of exposure',
      ),
    ).toBe(
      'Keep collecting data: C leads, but its expected loss 0.020 events per unit of exposure is above the 0.0012 events per unit of exposure allowed',
    );
  });

  test('choose and keep-collecting wording', () => {
    expect(decisionText({ choose: true, label: 'B', loss: 0.0002, maxLoss: 0.0005 })).toBe(
      'Choose B: its expected loss 0.020% is within the 0.050% allowed',
    );
    expect(decisionText({ choose: false, label: 'B', loss: 0.003, maxLoss: 0.0005 })).toBe(
      'Keep collecting data: B leads, but its expected loss 0.30% is above the 0.050% allowed',
    );
  });
});

describe('variant letters (labels.ts), the one helper for DECISION and the panel', () => {
  test('follow spreadsheet column letters: Z, AA, AZ, BA, ZZ, AAA, and XFD for the 16,384th', () => {
    // Excel names its columns this way; its last column, number 16,384, is XFD (Microsoft, "Excel
    // specifications and limits"; common practice for the sequence itself)
    const letters = [0, 25, 26, 51, 52, 701, 702, 16383].map(variantLetter);
    expect(letters).toEqual(['A', 'Z', 'AA', 'AZ', 'BA', 'ZZ', 'AAA', 'XFD']);
    expect(defaultLabel(26)).toBe(variantLetter(26));
  });
});

describe('a percentage typed where a fraction belongs gets a hint', () => {
  test('levels, thresholds, power and alpha: 95 → "0.95 for 95%"', () => {
    expect(sheetError(() => readOptionalNumber(LEVEL, 95))).toEqual({
      code: '#VALUE!',
      message: 'level: 95 is not allowed; enter a fraction: 0.95 for 95%',
    });
    expect(sheetError(() => readOptionalNumber(THRESHOLD, 90)).message).toBe(
      'threshold: 90 is not allowed; enter a fraction: 0.9 for 90%',
    );
    expect(sheetError(() => readOptionalNumber(POWER, 80)).message).toBe(
      'power: 80 is not allowed; enter a fraction: 0.8 for 80%',
    );
    expect(sheetError(() => readOptionalNumber(ALPHA, 5)).message).toBe(
      'alpha: 5 is not allowed; enter a fraction: 0.05 for 5%',
    );
    expect(sheetError(() => readRequiredNumber(BASELINE_RATE, 12.5)).message).toBe(
      'baseline_rate: 12.5 is not allowed; enter a fraction: 0.125 for 12.5%',
    );
  });

  test('outside 2…100 the plain rule is stated (1.5 and 150 are not percentages of a fraction)', () => {
    expect(sheetError(() => readOptionalNumber(LEVEL, 150)).message).toBe(
      'level: 150 is not allowed; enter a number from 0.01 to 0.9999',
    );
    expect(sheetError(() => readOptionalNumber(LEVEL, -50)).message).toBe(
      'level: -50 is not allowed; enter a number from 0.01 to 0.9999',
    );
    expect(percentHint(LEVEL, 1.5)).toBeUndefined();
    expect(percentHint(POINTS, 50)).toBeUndefined();
  });

  test('min_lift and lift are relative lifts at most 1 (+100%); 5 and -5 get the hint', () => {
    expect(sheetError(() => readRequiredNumber(MIN_LIFT, 5))).toEqual({
      code: '#VALUE!',
      message: 'min_lift: 5 is not allowed; enter a fraction: 0.05 for +5% (a relative lift, at most 1 for +100%)',
    });
    expect(sheetError(() => readRequiredNumber(LIFT, -5)).message).toBe(
      'lift: -5 is not allowed; enter a fraction: -0.05 for −5% (a relative lift, at most 1 for +100%)',
    );
    expect(sheetError(() => readRequiredNumber(MIN_LIFT, 1.5)).message).toBe(
      'min_lift: 1.5 is not allowed; enter a number greater than -1 and at most 1',
    );
    expect(readRequiredNumber(MIN_LIFT, 1)).toBe(1);
    expect(readRequiredNumber(LIFT, -0.99)).toBe(-0.99);
  });
});
