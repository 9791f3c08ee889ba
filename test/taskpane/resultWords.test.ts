/**
 * The Explain section's words for a result ("Orange button has an 86% chance of having the highest
 * conversion rate"), what an error value means, how big each result is and which formula a spilled cell
 * belongs to, and the lift chart's curves against scipy (lift_chart_reference.py). The counts are the
 * invented demo's checkout test; the values fed to the words are the core's own results for them.
 */
import { expectedLoss, liftInterval, probAboveControl, probHighest } from '../../functions/stats/conversion';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import { localeOf } from '../../taskpane/logic/inputs';
import { liftCurves, MAX_CHART_CHALLENGERS } from '../../taskpane/logic/liftCurves';
import {
  articleFor,
  chancePhrase,
  controlWords,
  errorMeaning,
  findSpillOwner,
  resultSize,
  resultSizeOf,
  resultWords,
  variantLabel,
} from '../../taskpane/logic/resultWords';
import reference from '../reference/addin/lift_chart_reference.json';

const variants = [
  { conversions: 412, visitors: 10412 },
  { conversions: 463, visitors: 10388 },
  { conversions: 431, visitors: 10451 },
];
const labels = ['Green button (control)', 'Orange button', 'Big basket icon'];
const column = (values: readonly number[]): number[][] => values.map((v) => [v]);

describe('resultWords', () => {
  test('P(highest): the leader first, in words, then the others', () => {
    const highest = probHighest(variants, UNIFORM_PRIOR);
    const words = resultWords({ name: 'PROB_HIGHEST', values: column(highest), alongRow: false, labels });
    expect(words[0]).toBe(
      `Orange button has an ${Math.round((highest[1] as number) * 100)}% chance of having the highest conversion rate.`,
    );
    expect(words[0]).toBe('Orange button has an 86% chance of having the highest conversion rate.');
    expect(words[1]).toBe('The others: Big basket icon 11%, Green button (control) 3%. The chances add up to 100%.');
  });

  test('a row of results reads the same as a column', () => {
    const highest = probHighest(variants, UNIFORM_PRIOR);
    expect(resultWords({ name: 'PROB_HIGHEST', values: [highest], alongRow: true, labels })).toEqual(
      resultWords({ name: 'PROB_HIGHEST', values: column(highest), alongRow: false, labels }),
    );
  });

  test('P(beats control): each challenger against the control, named once', () => {
    const beats = probAboveControl(variants, UNIFORM_PRIOR);
    const words = resultWords({
      name: 'PROB_ABOVE_CONTROL',
      values: [[''], ...column(beats)],
      alongRow: false,
      labels,
    });
    expect(words).toEqual([
      'Orange button has a 96% chance of a higher conversion rate than Green button (control).',
      'Big basket icon has a 73% chance of a higher conversion rate than Green button (control).',
    ]);
    const plain = resultWords({
      name: 'PROB_ABOVE_CONTROL',
      values: [[''], ...column(beats)],
      alongRow: false,
      labels: ['A', 'B', 'C'],
    });
    expect(plain[0]).toBe('B has a 96% chance of a higher conversion rate than the control (A).');
  });

  test('lift interval: median, range and whether it includes no change, in a German panel', () => {
    const lifts = liftInterval(variants, 0.95, UNIFORM_PRIOR);
    const values = [['', '', ''], ...lifts.map((l) => [l.lower, l.median, l.upper])];
    const words = resultWords({
      name: 'LIFT_INTERVAL',
      values,
      alongRow: false,
      labels,
      numbers: { level: 0.95 },
      locale: localeOf('de-DE'),
    });
    expect(words[0]).toBe(
      'Orange button: the lift in conversion rate over the control is most likely about +12,6%; with 95% probability ' +
        'it lies between −1,08% and +28,3%, and the range includes no change, so the data cannot yet tell better ' +
        'from worse.',
    );
    const clear = resultWords({
      name: 'LIFT_INTERVAL',
      values: [
        ['', '', ''],
        [0.02, 0.1, 0.2],
      ],
      alongRow: false,
      labels: ['A', 'B'],
      numbers: { level: 0.9 },
    });
    expect(clear[0]).toBe(
      'B: the lift in conversion rate over the control is most likely about +10.0%; with 90% probability it lies ' +
        'between +2.00% and +20.0%, and the whole range is above no change.',
    );
  });

  test('expected loss in percentage points, the least risky choice first', () => {
    const losses = expectedLoss(variants, UNIFORM_PRIOR);
    const words = resultWords({ name: 'EXPECTED_LOSS', values: column(losses), alongRow: false, labels });
    expect(words[0]).toMatch(
      /^Choosing Orange button is the least risky: if it is not the best, it gives up 0\.0\d+ percentage points of conversion rate on average\.$/,
    );
    expect(words[1]).toContain('Green button (control) 0.519 percentage points');
  });

  test('a result that is not what the function gives (an error, text) has no words', () => {
    expect(resultWords({ name: 'PROB_HIGHEST', values: [['#VALUE!'], [''], ['']], alongRow: false, labels })).toEqual(
      [],
    );
    expect(resultWords({ name: 'NOT_A_FUNCTION', values: [[1]], alongRow: false, labels: [] })).toEqual([]);
  });

  test('single values: split check, sizes, a prior', () => {
    expect(resultWords({ name: 'SRM_PVALUE', values: [[0.0001234]], alongRow: false, labels: [] })[0]).toMatch(
      /^The split check gives p = 1\.2e-4, below 0\.001: the visitors are not split as planned\./,
    );
    expect(resultWords({ name: 'VISITORS_NEEDED', values: [[29541]], alongRow: false, labels: [] })).toEqual([
      'Each variant needs 29,541 visitors for that decision power.',
    ]);
    expect(resultWords({ name: 'PRIOR_FROM_MEAN', values: [[8, 192]], alongRow: false, labels: [] })).toEqual([
      'A Beta(8, 192) prior: its mean rate is 4.00% and it counts like 200 visitors in every variant.',
    ]);
  });
});

describe('small words', () => {
  test('chances and their article, as spoken in English', () => {
    expect(chancePhrase(0.856)).toBe('an 86% chance');
    expect(chancePhrase(0.11)).toBe('an 11% chance');
    expect(chancePhrase(0.18)).toBe('an 18% chance');
    expect(chancePhrase(0.96)).toBe('a 96% chance');
    expect(chancePhrase(0.999)).toBe('more than a 99% chance');
    expect(chancePhrase(0.001)).toBe('less than a 1% chance');
    expect(articleFor('1%')).toBe('a');
  });

  test('the control is named once', () => {
    expect(variantLabel('Green button (control)', 0)).toBe('Green button (control)');
    expect(variantLabel('Green button', 0)).toBe('Green button (control)');
    expect(variantLabel('Orange button', 1)).toBe('Orange button');
    expect(controlWords('Green button')).toBe('the control (Green button)');
    expect(controlWords('Control')).toBe('Control');
  });

  test('error values are explained by their meaning', () => {
    expect(errorMeaning('#SPILL!')).toMatch(/^The result needs more cells than the one holding the formula/);
    expect(errorMeaning('#VALUE!')).toContain('a level of 95 where the function takes 0.95');
    expect(errorMeaning(0.5)).toBeNull();
    expect(errorMeaning('#WHATEVER')).toBeNull();
  });
});

describe('result sizes and the formula a spilled cell belongs to', () => {
  test("sizes follow the data and the function (the function catalogue's spill rules)", () => {
    expect(resultSizeOf('=ABTEST.LIFT_INTERVAL(C4:C6, B4:B6)')).toEqual({ rows: 3, columns: 3, alongRow: false });
    expect(resultSizeOf('=ABTEST.RATE_INTERVAL(B2:E2, B3:E3)')).toEqual({ rows: 2, columns: 4, alongRow: true });
    expect(resultSizeOf('=ABTEST.LIFT_DENSITY(C4:C6, B4:B6, 41)')).toEqual({ rows: 41, columns: 3, alongRow: false });
    expect(resultSizeOf('=ABTEST.POSTERIOR_DENSITY(C4:C6, B4:B6)')).toEqual({ rows: 101, columns: 4, alongRow: false });
    expect(resultSizeOf("=ABTEST.PRIOR_FROM_HISTORY('Past tests'!B4:B15,'Past tests'!C4:C15)")).toEqual({
      rows: 1,
      columns: 2,
      alongRow: false,
    });
    expect(resultSizeOf('=SUM(A1:A3)')).toBeNull();
    expect(resultSize({ kind: 'one', of: 'number' }, { rows: 3, columns: 1 })).toEqual({
      rows: 1,
      columns: 1,
      alongRow: false,
    });
  });

  test('a cell inside a spill finds its formula; a cell beside it does not', () => {
    // rows 10–14, columns A–D of a sheet: PROB_HIGHEST in B11 spills B11:B13; LIFT_INTERVAL in C11 spills C11:E13
    const formulas = [
      ['label', '', '', ''],
      ['x', '=ABTEST.PROB_HIGHEST(C4:C6,B4:B6)', '=ABTEST.LIFT_INTERVAL(C4:C6,B4:B6)', ''],
      ['y', 0.86, 0.01, 0.12],
      ['z', 0.11, -0.08, 0.04],
      ['', 'note', '', ''],
    ];
    const origin = { row: 9, column: 0 };
    expect(findSpillOwner(formulas, origin, { row: 12, column: 1 })).toMatchObject({
      row: 10,
      column: 1,
      formula: '=ABTEST.PROB_HIGHEST(C4:C6,B4:B6)',
    });
    expect(findSpillOwner(formulas, origin, { row: 12, column: 3 })).toMatchObject({
      row: 10,
      column: 2,
      size: { rows: 3, columns: 3 },
    });
    expect(findSpillOwner(formulas, origin, { row: 13, column: 1 })).toBeNull();
    expect(findSpillOwner(formulas, origin, { row: 11, column: 0 })).toBeNull();
  });
});

describe('lift chart curves against scipy (lift_chart_reference.py)', () => {
  const curves = liftCurves(variants, labels, UNIFORM_PRIOR);

  test('one curve per challenger, named', () => {
    expect(curves.map((c) => c.name)).toEqual(['Orange button', 'Big basket icon']);
  });

  test.each(reference.challengers.map((row, j) => [labels[j + 1], row, j] as const))(
    "%s: the shaded middle 90%% ends are scipy's 5%% and 95%% lift quantiles",
    (_, row, j) => {
      const curve = curves[j];
      expect(Math.abs((curve?.low90 ?? NaN) - row.low90)).toBeLessThan(1e-9);
      expect(Math.abs((curve?.high90 ?? NaN) - row.high90)).toBeLessThan(1e-9);
    },
  );

  test.each(reference.challengers.map((row, j) => [labels[j + 1], row, j] as const))(
    "%s: the curve's height matches scipy's lift density (linear between grid points, within 1%%)",
    (_, row, j) => {
      const curve = curves[j];
      if (curve === undefined) throw new Error('no curve');
      for (const [lift, density] of row.density as [number, number][]) {
        const i = curve.lift.findIndex((x) => x > lift);
        const x0 = curve.lift[i - 1] as number;
        const x1 = curve.lift[i] as number;
        const y =
          (curve.height[i - 1] as number) +
          (((curve.height[i] as number) - (curve.height[i - 1] as number)) * (lift - x0)) / (x1 - x0);
        expect(Math.abs(y - density)).toBeLessThan(0.01 * Math.max(density, 1));
      }
    },
  );

  test('too many challengers for one chart is refused in words', () => {
    const many = Array.from({ length: MAX_CHART_CHALLENGERS + 2 }, () => ({ conversions: 10, visitors: 100 }));
    expect(() =>
      liftCurves(
        many,
        many.map((_, i) => String(i)),
      ),
    ).toThrow(new RangeError('the chart shows at most 6 challengers'));
  });
});
