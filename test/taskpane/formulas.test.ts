/**
 * Formula builders of the side panel: the exact formula text of priors, the plan block and the
 * read-out block (live formulas that refer to the cells they should), and the address helpers they use.
 * The plan block is also evaluated in HyperFormula for its built-in parts (total, days) so the cell
 * references are checked by an independent engine, not only as text.
 */
import { HyperFormula } from 'hyperformula';
import {
  numberLiteral,
  planBlock,
  priorBlock,
  priorFormula,
  readoutBlock,
  textLiteral,
} from '../../taskpane/logic/formulas';
import {
  cellAddress,
  columnIndex,
  columnLetters,
  parseAddress,
  quoteSheet,
  rangeAddress,
  referenceFrom,
} from '../../taskpane/workbook/address';
import { formatCount, formatPercent, parseNumber, parsePercent } from '../../taskpane/logic/inputs';
import { BONFERRONI_SPLIT } from '../../taskpane/logic/plan';
import { decisionText, defaultLabel } from '../../functions/sheet/decision';

describe('addresses', () => {
  test('column letters round-trip (bijective base 26, as Excel numbers columns)', () => {
    expect([0, 25, 26, 27, 51, 52, 701, 702, 16383].map(columnLetters)).toEqual([
      'A',
      'Z',
      'AA',
      'AB',
      'AZ',
      'BA',
      'ZZ',
      'AAA',
      'XFD',
    ]);
    for (const c of [0, 1, 25, 26, 700, 16383]) expect(columnIndex(columnLetters(c))).toBe(c);
    expect(() => columnLetters(-1)).toThrow(new RangeError('column -1 is not a column index'));
  });

  test("parses Excel's qualified addresses, quoted sheets and $ signs", () => {
    expect(parseAddress("'Past tests'!B2:C13")).toEqual({
      sheet: 'Past tests',
      start: { row: 1, column: 1 },
      end: { row: 12, column: 2 },
    });
    expect(parseAddress("'Bob''s data'!$A$1")).toEqual({
      sheet: "Bob's data",
      start: { row: 0, column: 0 },
      end: { row: 0, column: 0 },
    });
    expect(parseAddress('D4:B2')).toEqual({ sheet: '', start: { row: 1, column: 1 }, end: { row: 3, column: 3 } });
    expect(() => parseAddress('A:A')).toThrow(new RangeError('"A:A" is not an A1 address'));
  });

  test('quotes sheet names as formulas need', () => {
    expect(quoteSheet('Plan')).toBe('Plan');
    expect(quoteSheet('Past tests')).toBe("'Past tests'");
    expect(quoteSheet("Bob's")).toBe("'Bob''s'");
    expect(quoteSheet('AB12')).toBe("'AB12'"); // looks like a cell reference
    expect(referenceFrom('Plan', 'Past tests', 'B2:B13')).toBe("'Past tests'!B2:B13");
    expect(referenceFrom('Plan', 'Plan', 'B2:B13')).toBe('B2:B13');
    expect(rangeAddress({ row: 1, column: 5 }, 3, 2)).toBe('F2:G4');
    expect(cellAddress({ row: 0, column: 0 })).toBe('A1');
  });
});

describe('typed inputs', () => {
  test('numbers and percentages as people type them', () => {
    expect(parseNumber('12,000')).toBe(12000);
    expect(parseNumber(' 4.5% ')).toBeCloseTo(0.045, 15);
    expect(parseNumber('1e-3')).toBe(0.001);
    expect(parseNumber('abc')).toBeNaN();
    expect(parseNumber('')).toBeNaN();
    expect(parsePercent('4')).toBe(0.04);
    expect(parsePercent('4%')).toBe(0.04);
    expect(formatPercent(0.0412)).toBe('4.12%');
    expect(formatPercent(0.000123)).toBe('0.0123%');
    expect(formatCount(31233.4)).toBe('31,233');
  });
});

describe('prior formulas', () => {
  test('each way of choosing a prior gives its PRIOR_FROM_ formula, defaults left out', () => {
    expect(priorFormula({ kind: 'mean', meanRate: 0.04, strength: 500 })).toBe('=ABTEST.PRIOR_FROM_MEAN(0.04,500)');
    expect(priorFormula({ kind: 'interval', low: 0.03, high: 0.06, level: 0.9 })).toBe(
      '=ABTEST.PRIOR_FROM_INTERVAL(0.03,0.06)',
    );
    expect(priorFormula({ kind: 'interval', low: 0.03, high: 0.06, level: 0.8 })).toBe(
      '=ABTEST.PRIOR_FROM_INTERVAL(0.03,0.06,0.8)',
    );
    expect(
      priorFormula({
        kind: 'history',
        conversionsRef: "'Past tests'!B2:B13",
        visitorsRef: "'Past tests'!C2:C13",
        method: 'likelihood',
      }),
    ).toBe("=ABTEST.PRIOR_FROM_HISTORY('Past tests'!B2:B13,'Past tests'!C2:C13)");
    expect(priorFormula({ kind: 'history', conversionsRef: 'B2:B13', visitorsRef: 'C2:C13', method: 'moments' })).toBe(
      '=ABTEST.PRIOR_FROM_HISTORY(B2:B13,C2:C13,"moments")',
    );
  });

  test('the prior block keeps room for its two-cell spill', () => {
    expect(priorBlock({ kind: 'mean', meanRate: 0.04, strength: 500 }, 'F2', 'Sheet1')).toEqual({
      sheet: 'Sheet1',
      topLeft: 'F2',
      cells: [['=ABTEST.PRIOR_FROM_MEAN(0.04,500)']],
      numberFormats: [['0.000']],
      area: { rowCount: 1, columnCount: 2 },
    });
  });

  test('literals', () => {
    expect(numberLiteral(1e-7)).toBe('1E-7');
    expect(numberLiteral(2.5e21)).toBe('2.5E21');
    expect(numberLiteral(0.1 + 0.2)).toBe('0.30000000000000004');
    expect(() => numberLiteral(Number.NaN)).toThrow(new RangeError('NaN cannot be written into a formula'));
    expect(textLiteral('say "hi"')).toBe('"say ""hi"""');
  });
});

describe('plan block', () => {
  const inputs = {
    baselineRate: 0.04,
    lift: 0.1,
    threshold: 0.95,
    power: 0.8,
    variants: 3,
    dailyVisitors: 4000,
    trafficShare: 0.5,
    classicAlpha: 0.05,
  };

  test('inputs as labelled constants (rates, threshold, power and levels as percents), results as formulas referring to them', () => {
    const { block, cells } = planBlock(inputs, 'B2');
    expect(block.cells.map((row) => row[0])).toEqual([
      'Test plan (Lift Ledger)',
      'Baseline conversion rate',
      'Smallest lift worth detecting (relative)',
      'Decision threshold: P(beats control) at least',
      'Target decision power',
      'Variants, control included',
      'Visitors per day to the page',
      'Share of those visitors in the test',
      'Classic test: significance level (two-sided)',
      "Threshold each challenger must reach (false-alarm rate shared by the challengers, Dunnett's many-to-one threshold)",
      'Visitors needed per variant',
      'Visitors needed in total',
      'Weeks to run (whole weeks)',
      'Days to run (whole weeks)',
      'Classic z-test size per variant (for comparison, level split the same way)',
    ]);
    expect(block.cells.map((row) => row[1])).toEqual([
      '',
      0.04,
      0.1,
      0.95,
      0.8,
      3,
      4000,
      0.5,
      0.05,
      '=IF(C7<=2,C5,ABTEST.THRESHOLD_FOR_VARIANTS(C7,1-C5))',
      '=ABTEST.VISITORS_NEEDED(C3,C4,C11,C6)',
      '=C12*C7',
      '=MAX(1,ROUNDUP(C13/(C8*C9)/7,0))',
      '=7*C14',
      '=ABTEST.CLASSIC_SAMPLE_SIZE(C3,C4,C10/MAX(1,C7-1),C6,2)',
    ]);
    // one unit for every probability-like input: all shown as percents
    expect(block.numberFormats?.slice(1, 9).map((row) => row[1])).toEqual([
      '0.00%',
      '0.0%',
      '0.0%',
      '0.0%',
      '0',
      '#,##0',
      '0%',
      '0.0%',
    ]);
    expect(cells).toMatchObject({
      baselineRate: 'C3',
      perChallengerThreshold: 'C11',
      visitorsPerVariant: 'C12',
      totalVisitors: 'C13',
      weeks: 'C14',
      days: 'C15',
      classicPerVariant: 'C16',
    });
  });

  test('with a prior, its cells are inputs and VISITORS_NEEDED refers to them', () => {
    const { block, cells } = planBlock({ ...inputs, prior: { alpha: 20, beta: 480 } }, 'A1');
    expect(cells.priorAlpha).toBe('B10');
    expect(block.cells[12]).toEqual(['Visitors needed per variant', '=ABTEST.VISITORS_NEEDED(B2,B3,B12,B5,B10,B11)']);
  });

  test('the threshold, total, weeks and days formulas compute the right numbers (HyperFormula, with a known visitors count)', () => {
    const { block, cells } = planBlock(inputs, 'A1', undefined, BONFERRONI_SPLIT);
    // Replace the ABTEST call (not registered in HyperFormula) by a constant, keep every other formula as written.
    const rows = block.cells.map((row) =>
      row.map((v) => (typeof v === 'string' && v.startsWith('=ABTEST.') ? 31234 : v)),
    );
    const hf = HyperFormula.buildFromArray(rows as (string | number)[][], { licenseKey: 'gpl-v3' });
    const value = (address: string): unknown => {
      const p = parseAddress(address).start;
      return hf.getCellValue({ sheet: 0, row: p.row, col: p.column });
    };
    expect(value(cells.perChallengerThreshold as string)).toBeCloseTo(0.975, 15); // 1 − 0.05/2 for two challengers
    expect(value(cells.totalVisitors as string)).toBe(93702); // 31234 × 3 variants
    expect(value(cells.weeks as string)).toBe(7); // ceil(93702 / (4000 × 0.5) / 7) = ceil(6.69)
    expect(value(cells.days as string)).toBe(49);
    hf.destroy();
  });
});

describe('read-out block', () => {
  const source = { namesRef: 'A2:A4', visitorsRef: 'B2:B4', conversionsRef: 'C2:C4', sharesRef: null, variants: 3 };
  const settings = { level: 0.95, prior: { alpha: 1, beta: 1 }, densityPoints: 61, currentSrmPValue: 0.4 };
  const cellOf = (built: ReturnType<typeof readoutBlock>, address: string, originColumn = 4): unknown => {
    const p = parseAddress(address).start;
    return built.block.cells[p.row]?.[p.column - originColumn];
  };
  const formatOf = (built: ReturnType<typeof readoutBlock>, address: string, originColumn = 4): unknown => {
    const p = parseAddress(address).start;
    return built.block.numberFormats?.[p.row]?.[p.column - originColumn];
  };

  test('one row per variant, its name beside its spilling results; a note on units; inputs, decision, split check, density table', () => {
    const built = readoutBlock(source, settings, 'E1', 'Checkout test');
    const { cells } = built;
    expect(cells).toMatchObject({
      labels: 'E3:E5',
      posteriorMean: 'F3',
      rateInterval: 'G3',
      probAboveControl: 'I3',
      probHighest: 'J3',
      liftInterval: 'K3',
      expectedLoss: 'N3',
      note: 'E6',
      level: 'F8',
      priorAlpha: 'F9',
      priorBeta: 'F10',
      maxLoss: 'F11',
      decision: 'F12',
      srmPValue: 'F13',
      srmVerdict: 'G13',
      densityHeader: 'E16',
      liftDensity: 'E17',
    });
    const at = (address: string): unknown => cellOf(built, address);
    expect(at('E2')).toBe('Variant');
    expect(at('N2')).toBe('Expected loss (rate points)');
    expect(at('E3')).toBe('=A2');
    expect(at('E5')).toBe('=A4');
    expect(at('F3')).toBe('=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4,F9,F10)');
    expect(at('G3')).toBe('=ABTEST.RATE_INTERVAL(C2:C4,B2:B4,F8,F9,F10)');
    expect(at('I3')).toBe('=ABTEST.PROB_ABOVE_CONTROL(C2:C4,B2:B4,F9,F10)');
    expect(at('J3')).toBe('=ABTEST.PROB_HIGHEST(C2:C4,B2:B4,F9,F10)');
    expect(at('K3')).toBe('=ABTEST.LIFT_INTERVAL(C2:C4,B2:B4,F8,F9,F10)');
    expect(at('N3')).toBe('=ABTEST.EXPECTED_LOSS(C2:C4,B2:B4,F9,F10)');
    expect(at('E6')).toMatch(/^Expected loss is in conversion-rate points: 0\.300% means .* 0\.3 percentage points/);
    expect(at('E11')).toBe('Largest expected loss you accept (rate points)');
    expect(at('F11')).toBe('=0.01*F3');
    expect(at('F12')).toBe('=ABTEST.DECISION(C2:C4,B2:B4,F11,E3:E5,F9,F10)');
    expect(at('F13')).toBe('=ABTEST.SRM_PVALUE(B2:B4)');
    expect(at('G13')).toBe(
      '=IF(F13<0.001,"split looks broken: check how visitors are assigned","split looks as planned")',
    );
    expect(at('E17')).toBe('=ABTEST.LIFT_DENSITY(C2:C4,B2:B4,61,F9,F10)');
    // the density table's columns carry the challengers' names
    expect([at('E16'), at('F16'), at('G16')]).toEqual(['Lift', '=E4', '=E5']);
    // spill room: cells under and beside a spilling formula are left empty
    expect(at('F4')).toBe('');
    expect(at('H3')).toBe('');
    expect(at('F17')).toBe('');
    expect(built.block.cells).toHaveLength(16 + 61);
    // the area holds the chart too, right of the density table: nothing of the user's lies under it
    expect(built.block.area).toEqual({ rowCount: 77, columnCount: 11 });
    expect(built.chartSource).toBe('E16:G77');
    expect([built.chartTopLeft, built.chartBottomRight]).toEqual(['I16', 'O32']);
    expect(built.block.autofit).toEqual({ rows: 5 });
    expect(built.block.styles?.some((s) => s.style.fillColor !== undefined)).toBe(false);
  });

  test('number formats that cannot mislead: rates and losses in %, lifts in %, densities as plain numbers', () => {
    const built = readoutBlock(source, settings, 'E1');
    const f = (address: string): unknown => formatOf(built, address);
    expect([f('F3'), f('F5'), f('G4'), f('H5')]).toEqual(['0.00%', '0.00%', '0.00%', '0.00%']);
    expect([f('I4'), f('J3'), f('K4'), f('M5')]).toEqual(['0.0%', '0.0%', '0.0%', '0.0%']);
    expect([f('N3'), f('N5'), f('F11')]).toEqual(['0.000%', '0.000%', '0.000%']);
    // before: the whole density table showed as percentages ("949.9%"); now only its lift column does
    expect([f('E17'), f('E77'), f('F17'), f('G77')]).toEqual(['0.0%', '0.0%', '0.00', '0.00']);
  });

  test('on another sheet than the table, every reference names the table’s sheet', () => {
    const built = readoutBlock(
      { ...source, sheet: 'Checkout test', sharesRef: 'D2:D4' },
      settings,
      'A1',
      'Checkout test read-out',
    );
    const at = (address: string): unknown => cellOf(built, address, 0);
    expect(at('A3')).toBe("='Checkout test'!A2");
    expect(at('B3')).toBe("=ABTEST.POSTERIOR_MEAN('Checkout test'!C2:C4,'Checkout test'!B2:B4,B9,B10)");
    expect(at('B13')).toBe("=ABTEST.SRM_PVALUE('Checkout test'!B2:B4,'Checkout test'!D2:D4)");
    // on the table's own sheet they stay local
    expect(cellOf(readoutBlock({ ...source, sheet: 'Checkout test' }, settings, 'E1', 'Checkout test'), 'F3')).toBe(
      '=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4,F9,F10)',
    );
  });

  test('with planned shares the split check tests against them', () => {
    const built = readoutBlock({ ...source, sharesRef: 'D2:D4' }, settings, 'F1');
    expect(built.block.cells[12]?.slice(0, 2)).toEqual([
      'Split check: SRM p-value (planned shares)',
      '=ABTEST.SRM_PVALUE(B2:B4,D2:D4)',
    ]);
  });

  test('without a names column the variants are called A, B, C…', () => {
    const built = readoutBlock({ ...source, namesRef: null }, settings, 'E1');
    expect(built.block.cells.slice(2, 5).map((row) => row[0])).toEqual(['A', 'B', 'C']);
  });

  test('a broken split (p < 0.001 now) gets the warning fill on the p-value and its verdict', () => {
    const built = readoutBlock(source, { ...settings, currentSrmPValue: 2e-5 }, 'E1');
    expect(built.block.styles).toContainEqual({
      row: 12,
      column: 1,
      columnCount: 2,
      style: { fillColor: '#F4CCCC', fontColor: '#9C0006', bold: true },
    });
  });

  test('many variants: the table and the chart still fit in the area', () => {
    const built = readoutBlock({ ...source, namesRef: null, variants: 12 }, settings, 'A1');
    expect(built.block.cells[0]).toHaveLength(12);
    expect(built.block.area).toEqual({ rowCount: 12 + 13 + 61, columnCount: 20 });
    expect(parseAddress(built.chartBottomRight).start.column).toBe(19);
  });

  test('refuses fewer than two variants', () => {
    expect(() => readoutBlock({ ...source, variants: 1 }, settings, 'E1')).toThrow(
      new RangeError('a read-out needs at least two variants'),
    );
  });
});

describe('default variant names: the one variant-letter helper (functions/sheet/labels.ts)', () => {
  test('a read-out without a names column names the 27th variant AA, as DECISION does', () => {
    const settings = { level: 0.95, prior: { alpha: 1, beta: 1 }, densityPoints: 61, currentSrmPValue: 0.4 };
    const source = { namesRef: null, visitorsRef: 'B2:B29', conversionsRef: 'C2:C29', sharesRef: null, variants: 28 };
    const built = readoutBlock(source, settings, 'E1');
    // names sit in the block's first column, one row per variant from the third row
    const names = [2, 3, 27, 28, 29].map((row) => built.block.cells[row]?.[0]);
    expect(names).toEqual(['A', 'B', 'Z', 'AA', 'AB']);
    // the spreadsheet column letters after Z are AA, AB (common practice)
    expect(decisionText({ choose: true, label: defaultLabel(26), loss: 0.0002, maxLoss: 0.0005 })).toBe(
      'Choose AA: its expected loss 0.020% is within the 0.050% allowed',
    );
  });
});
