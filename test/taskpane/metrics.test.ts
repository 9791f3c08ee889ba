/**
 * The read-out for every metric kind: proposing the kind and its columns from the headings, checking the
 * columns, the order-sd warning, the formula text of the revenue, averages and counts blocks, and the
 * guardrails' "decision with guardrails", whose Excel logic is evaluated by HyperFormula (an independent
 * spreadsheet engine) with the ABTEST results replaced by constants.
 */
import { HyperFormula } from 'hyperformula';
import { meanLiftInterval } from '../../functions/stats/normalMeans';
import { chartSeries } from '../../preview/src/chartView';
import { readoutArea, readoutBlock } from '../../taskpane/logic/formulas';
import { guardrailFormula, guardrailRows, type Guardrail } from '../../taskpane/logic/guardrails';
import { metricReadoutArea, metricReadoutBlock } from '../../taskpane/logic/metricFormulas';
import { checkMetrics, detectMetrics, orderSdWarnings } from '../../taskpane/logic/metrics';
import { detectTable } from '../../taskpane/logic/tableDetect';
import { parseAddress } from '../../taskpane/workbook/address';
import type { CellValue } from '../../taskpane/workbook/workbook';

/** The demo workbook's two invented tables (their headings as there). */
const TOTALS: CellValue[][] = [
  ['Variant', 'Orders', 'Visitors', 'Revenue', 'Order sd'],
  ['Green', 412, 10412, 25092.92, 35],
  ['Orange', 463, 10388, 27320.44, 37],
  ['Basket', 431, 10451, 26127.5, 36],
];
const MAIN: CellValue[][] = [
  [
    'Variant',
    'Visitors',
    'Conversions',
    'Revenue count',
    'Revenue mean',
    'Revenue sd',
    'Basket adds',
    'Sessions',
    'Planned share',
  ],
  ['Green', 10412, 412, 10412, 2.41, 11.8, 1820, 15230, 1],
  ['Orange', 10388, 463, 10388, 2.63, 12.3, 1968, 15190, 1],
  ['Basket', 10451, 431, 10451, 2.5, 12.0, 1902, 15310, 1],
];

function detect(values: CellValue[][]) {
  const table = detectTable(values);
  return detectMetrics(values, table.ok ? table.mapping : null);
}

describe('proposing the metric and its columns from the headings', () => {
  test('revenue totals: orders, visitors, revenue and order sd; revenue is proposed', () => {
    const d = detect(TOTALS);
    expect(d.columns).toMatchObject({ conversions: 1, visitors: 2, revenue: 3, orderSd: 4, sd: null, mean: null });
    expect(d.available).toEqual(['conversions', 'revenue']);
    expect(d.proposed).toBe('revenue');
  });

  test('the main table: "Revenue mean/sd/count" are an average, not revenue; basket adds per session are counts', () => {
    const d = detect(MAIN);
    expect(d.columns).toMatchObject({
      visitors: 1,
      conversions: 2,
      count: 3,
      mean: 4,
      sd: 5,
      events: 6,
      exposure: 7,
      revenue: null,
      orderSd: null,
    });
    expect(d.available).toEqual(['conversions', 'averages', 'counts']);
    expect(d.proposed).toBe('conversions');
  });

  test('a table of averages only (no visitors) still gets its columns and names', () => {
    const values: CellValue[][] = [
      ['Arm', 'N', 'Average basket', 'Std dev'],
      ['A', 400, 31.5, 12.1],
      ['B', 410, 33.2, 12.9],
    ];
    const d = detect(values);
    expect(d).toMatchObject({ hasHeader: true, namesColumn: 0, proposed: 'averages' });
    expect(d.columns).toMatchObject({ count: 1, mean: 2, sd: 3 });
  });

  test('no headings: nothing beyond the conversions mapping is guessed', () => {
    const d = detect(TOTALS.slice(1));
    expect(d.hasHeader).toBe(false);
    expect(d.columns.revenue).toBeNull();
    expect(d.proposed).toBe('conversions');
  });
});

describe('checking the columns a read-out uses', () => {
  test('values per role, names, rows', () => {
    const d = detect(TOTALS);
    const checked = checkMetrics(TOTALS, d, ['revenue', 'conversions']);
    expect(checked).toEqual({
      ok: true,
      names: ['Green', 'Orange', 'Basket'],
      values: {
        conversions: [412, 463, 431],
        visitors: [10412, 10388, 10451],
        revenue: [25092.92, 27320.44, 26127.5],
        orderSd: [35, 37, 36],
      },
      firstRow: 1,
      lastRow: 3,
    });
  });

  test('problems name the row, the column and what is wrong; a missing column is asked for', () => {
    const bad = TOTALS.map((row) => [...row]);
    (bad[2] as CellValue[])[3] = 'n/a';
    (bad[3] as CellValue[])[1] = 20000;
    const d = detect(TOTALS);
    const checked = checkMetrics(bad, d, ['revenue']);
    expect(checked).toEqual({
      ok: false,
      problems: ['row 3: revenue is the text "n/a", not a number', 'row 4: 20000 orders is more than 10451 visitors'],
    });
    expect(checkMetrics(TOTALS, { ...d, columns: { ...d.columns, revenue: null } }, ['revenue'])).toEqual({
      ok: false,
      problems: ['set the revenue column (revenue per visitor)'],
    });
    expect(checkMetrics(MAIN, { ...detect(MAIN), columns: { ...detect(MAIN).columns, sd: 4 } }, ['averages'])).toEqual({
      ok: false,
      problems: ['Mean and Standard deviation are the same column'],
    });
  });

  test('counts must be whole, exposure above 0', () => {
    const bad = MAIN.map((row) => [...row]);
    (bad[1] as CellValue[])[6] = 3.5;
    (bad[2] as CellValue[])[7] = 0;
    expect(checkMetrics(bad, detect(MAIN), ['counts'])).toEqual({
      ok: false,
      problems: ['row 2: events 3.5 is not a whole number ≥ 0', 'row 3: exposure 0 is not above 0'],
    });
  });
});

describe('the order sd warning', () => {
  test('warns from 3 × the average order value, naming the variant and both numbers', () => {
    expect(orderSdWarnings(['A', 'B'], [10, 12], [500, 600], [40, 300])).toEqual([
      'B: order sd 300 is 6.0 × the average order value 50',
    ]);
    expect(orderSdWarnings(['A'], [10], [500], [149.9])).toEqual([]);
    expect(orderSdWarnings(['A'], [10], [500], [150])).toEqual(['A: order sd 150 is 3.0 × the average order value 50']);
    // no orders or no revenue: no average order value, no warning (the functions answer those cells)
    expect(orderSdWarnings(['A', 'B'], [0, 5], [0, 0], [10, 10])).toEqual([]);
  });
});

const SOURCE = {
  namesRef: 'A2:A4',
  refs: { conversions: 'B2:B4', visitors: 'C2:C4', revenue: 'D2:D4', orderSd: 'E2:E4' },
  variants: 3,
};

describe('the metric read-out blocks', () => {
  test('revenue: the REVENUE_ functions with order sd in its place, the decision on the names', () => {
    const { block, cells } = metricReadoutBlock('revenue', SOURCE, { level: 0.9, currentSrmPValue: 0.5 }, [], 'G1');
    expect(cells).toMatchObject({
      interval: 'I3',
      probAboveControl: 'K3',
      level: 'H8',
      maxLoss: 'H9',
      decision: 'H10',
      srmPValue: 'H11',
    });
    const at = (address: string): CellValue => {
      const p = parseAddress(address).start;
      return (block.cells[p.row] as CellValue[])[p.column - 6] as CellValue;
    };
    expect(at('H3')).toBe('=D2/C2');
    expect(at('I3')).toBe('=ABTEST.REVENUE_INTERVAL(B2:B4,C2:C4,D2:D4,E2:E4,H8)');
    expect(at('K3')).toBe('=ABTEST.REVENUE_PROB_ABOVE_CONTROL(B2:B4,C2:C4,D2:D4,E2:E4)');
    expect(at('M3')).toBe('=ABTEST.REVENUE_LIFT_INTERVAL(B2:B4,C2:C4,D2:D4,E2:E4,H8)');
    expect(at('P3')).toBe('=ABTEST.REVENUE_EXPECTED_LOSS(B2:B4,C2:C4,D2:D4,E2:E4)');
    expect(at('H9')).toBe('=0.01*ABS(H3)');
    expect(at('H10')).toBe('=ABTEST.REVENUE_DECISION(B2:B4,C2:C4,D2:D4,E2:E4,H9,G3:G5)');
    expect(at('H11')).toBe('=ABTEST.SRM_PVALUE(C2:C4)');
    expect(block.area).toEqual(metricReadoutArea(3, 0));
  });

  test('revenue without order sd leaves its slot empty; averages and counts use their families', () => {
    const { refs } = SOURCE;
    const noSd = metricReadoutBlock(
      'revenue',
      { ...SOURCE, refs: { ...refs, orderSd: undefined } },
      { level: 0.95, currentSrmPValue: 1 },
      [],
      'A10',
    );
    expect((noSd.block.cells[2] as CellValue[])[2]).toBe('=ABTEST.REVENUE_INTERVAL(B2:B4,C2:C4,D2:D4,,B17)');
    expect((noSd.block.cells[2] as CellValue[])[4]).toBe('=ABTEST.REVENUE_PROB_ABOVE_CONTROL(B2:B4,C2:C4,D2:D4)');
    const means = metricReadoutBlock(
      'averages',
      { namesRef: null, refs: { count: 'B2:B4', mean: 'C2:C4', sd: 'D2:D4' }, variants: 3 },
      { level: 0.95, currentSrmPValue: 1 },
      [],
      'A10',
      'Out',
    );
    expect(means.block.cells.slice(2, 5).map((row) => row[0])).toEqual(['A', 'B', 'C']);
    expect((means.block.cells[2] as CellValue[])[6]).toBe('=ABTEST.MEAN_LIFT_INTERVAL(B2:B4,C2:C4,D2:D4,B17)');
    expect((means.block.cells[9] as CellValue[])[1]).toBe('=ABTEST.MEAN_DECISION(B2:B4,C2:C4,D2:D4,B18,A12:A14)');
    expect((means.block.cells[10] as CellValue[])[1]).toBe('=ABTEST.SRM_PVALUE(B2:B4)');
    const counts = metricReadoutBlock(
      'counts',
      { sheet: 'Data', namesRef: 'A2:A4', refs: { events: 'B2:B4', exposure: 'C2:C4' }, variants: 3 },
      { level: 0.95, currentSrmPValue: null },
      [],
      'A1',
      'Read-out',
    );
    expect((counts.block.cells[2] as CellValue[])[2]).toBe('=ABTEST.EVENTS_RATE_INTERVAL(Data!B2:B4,Data!C2:C4,B8)');
    expect((counts.block.cells[2] as CellValue[])[1]).toBe('=Data!B2/Data!C2');
    expect(counts.cells.srmPValue).toBeUndefined();
    // Without a units column: a plain line naming the column to add, no chi-square on exposure.
    expect(counts.cells.srmMissing).toBe('A11');
    expect((counts.block.cells[10] as CellValue[])[0]).toBe(
      'Split check: none from exposure alone (a chi-square on exposure is not valid). Add a column of users or visitors per variant to the table and insert the read-out again.',
    );
    expect(counts.block.cells.flat().some((c) => String(c).includes('SRM_PVALUE'))).toBe(false);
  });

  test('counts per exposure with a users column: the split check counts the users, never the exposure', () => {
    const withUsers = metricReadoutBlock(
      'counts',
      {
        sheet: 'Data',
        namesRef: 'A2:A4',
        refs: { events: 'B2:B4', exposure: 'C2:C4', visitors: 'D2:D4' },
        variants: 3,
      },
      { level: 0.95, currentSrmPValue: 0.0002 },
      [],
      'A1',
      'Data',
    );
    expect(withUsers.cells.srmPValue).toBe('B11');
    expect((withUsers.block.cells[10] as CellValue[]).slice(0, 2)).toEqual([
      'Split check: SRM p-value on the users or visitors (equal shares)',
      '=ABTEST.SRM_PVALUE(D2:D4)',
    ]);
    // Below 0.001 now: the warning fill on the value and its verdict.
    expect(withUsers.block.styles).toContainEqual({
      row: 10,
      column: 1,
      columnCount: 2,
      style: { fillColor: '#F4CCCC', fontColor: '#9C0006', bold: true },
    });
  });

  test('a counts table: "Users" is the units column, "User-days" the exposure (not visitors)', () => {
    const table: CellValue[][] = [
      ['Variant', 'Users', 'Complaints', 'User-days'],
      ['A', 5000, 41, 70000],
      ['B', 5030, 37, 70420],
    ];
    const d = detect(table);
    expect(d.columns).toMatchObject({ visitors: 1, events: 2, exposure: 3 });
    expect(d.available).toContain('counts');
    const checked = checkMetrics(table, d, ['counts']);
    expect(checked.ok && checked.values.visitors).toEqual([5000, 5030]);
    // Exposure alone: "User-days" is not taken for users.
    const alone = detect([
      ['Variant', 'Complaints', 'User-days'],
      ['A', 41, 70000],
      ['B', 37, 70420],
    ]);
    expect(alone.columns).toMatchObject({ visitors: null, events: 1, exposure: 2 });
    expect(alone.proposed).toBe('counts');
  });

  test('errors: too few variants, the conversions kind, too many guardrails, a guardrail column missing', () => {
    const settings = { level: 0.95, currentSrmPValue: 1 };
    expect(() => metricReadoutBlock('revenue', { ...SOURCE, variants: 1 }, settings, [], 'A1')).toThrow(
      new RangeError('a read-out needs at least two variants'),
    );
    expect(() => metricReadoutBlock('conversions', SOURCE, settings, [], 'A1')).toThrow(
      new RangeError('the conversions read-out is formulas.ts readoutBlock'),
    );
    const g: Guardrail = { kind: 'conversions', direction: 'noWorse', limit: -0.02, required: 0.95 };
    expect(() => metricReadoutBlock('revenue', SOURCE, settings, [g, g, g, g], 'A1')).toThrow(
      new RangeError('at most 3 guardrails'),
    );
    expect(() => metricReadoutBlock('revenue', SOURCE, settings, [{ ...g, kind: 'counts' }], 'A1')).toThrow(
      new RangeError('the guardrail on event rate needs its events column'),
    );
  });

  test('guardrail formulas per kind', () => {
    const refs = {
      conversions: 'B2:B4',
      visitors: 'C2:C4',
      revenue: 'D2:D4',
      count: 'E2:E4',
      mean: 'F2:F4',
      sd: 'G2:G4',
      events: 'H2:H4',
      exposure: 'I2:I4',
    };
    expect(guardrailFormula('conversions', refs, 'Z1')).toBe('=ABTEST.PROB_LIFT_ABOVE(B2:B4,C2:C4,Z1)');
    expect(guardrailFormula('revenue', refs, 'Z1')).toBe('=ABTEST.REVENUE_PROB_LIFT_ABOVE(B2:B4,C2:C4,D2:D4,Z1)');
    expect(guardrailFormula('revenue', { ...refs, orderSd: 'J2:J4' }, 'Z1')).toBe(
      '=ABTEST.REVENUE_PROB_LIFT_ABOVE(B2:B4,C2:C4,D2:D4,Z1,J2:J4)',
    );
    expect(guardrailFormula('averages', refs, 'Z1')).toBe('=ABTEST.MEAN_PROB_LIFT_ABOVE(E2:E4,F2:F4,G2:G4,Z1)');
    expect(guardrailFormula('counts', refs, 'Z1')).toBe('=ABTEST.EVENTS_PROB_LIFT_ABOVE(H2:H4,I2:I4,Z1)');
  });

  test('the conversions block keeps its layout without guardrails and moves the density table below them', () => {
    const source = {
      namesRef: 'A2:A4',
      visitorsRef: 'C2:C4',
      conversionsRef: 'B2:B4',
      sharesRef: null,
      variants: 3,
      refs: { revenue: 'D2:D4' },
    };
    const settings = { level: 0.95, prior: { alpha: 1, beta: 1 }, densityPoints: 61, currentSrmPValue: 1 };
    const plain = readoutBlock(source, settings, 'F1');
    const guarded = readoutBlock(source, settings, 'F1', undefined, [
      { kind: 'revenue', direction: 'noWorse', limit: -0.02, required: 0.95 },
    ]);
    expect(plain.cells.decision).toBe('G12');
    expect(guarded.cells.decision).toBe('G12');
    expect(guarded.cells.guardrail1).toBe('P3');
    expect(guarded.cells.guardrail1Limit).toBe('G15');
    expect(guarded.cells.guardedDecision).toBe('G17');
    expect(
      parseAddress(guarded.cells.liftDensity as string).start.row -
        parseAddress(plain.cells.liftDensity as string).start.row,
    ).toBe(guardrailRows(1) + 1);
    expect(guarded.block.area).toEqual(readoutArea(3, 61, 1));
    expect(readoutArea(3, 61, 1)).toEqual({ rowCount: 81, columnCount: 11 });
    expect((guarded.block.cells[2] as CellValue[])[10]).toBe('=ABTEST.REVENUE_PROB_LIFT_ABOVE(B2:B4,C2:C4,D2:D4,G15)');
  });
});

describe('the lift-interval chart of a metric read-out', () => {
  // The demo's invented averages (MAIN: revenue count, mean, sd), with one guardrail so the chart sits below it.
  const averages = MAIN.slice(1).map((row) => ({
    count: row[3] as number,
    mean: row[4] as number,
    sd: row[5] as number,
  }));
  const guard: Guardrail = { kind: 'conversions', direction: 'noWorse', limit: -0.02, required: 0.95 };
  const built = metricReadoutBlock(
    'averages',
    {
      namesRef: null,
      refs: { count: 'D2:D4', mean: 'E2:E4', sd: 'F2:F4', conversions: 'C2:C4', visitors: 'B2:B4' },
      variants: 3,
    },
    { level: 0.95, currentSrmPValue: 1 },
    [guard],
    'A10',
  );

  test('its table: the lift column reads the lift spill, one column per challenger and a "No change" line at 0%', () => {
    const { block, chart, cells } = built;
    // Below the guardrail rows (block rows 12 to 14) and a spare row: block row 16 (sheet row 26), the header at 27.
    expect(cells.chartTitle).toBe('A26');
    expect(chart.source).toBe('A27:D35');
    const row = (r: number): CellValue[] => block.cells[r - 10] as CellValue[];
    expect(row(27).slice(0, 4)).toEqual(['Lift', '=A13', '=A14', 'No change']);
    // Challenger B (row 13 of the block's table): its lift low, median, high (G13:I13) at height 2.
    expect(row(28).slice(0, 4)).toEqual(['=G13', 2, '=NA()', '=NA()']);
    expect(row(29).slice(0, 4)).toEqual(['=H13', 2, '=NA()', '=NA()']);
    expect(row(30).slice(0, 4)).toEqual(['=I13', 2, '=NA()', '=NA()']);
    expect(row(31).slice(0, 4)).toEqual(['=G14', '=NA()', 1, '=NA()']);
    expect(row(34).slice(0, 4)).toEqual([0, '=NA()', '=NA()', 0]);
    expect(row(35).slice(0, 4)).toEqual([0, '=NA()', '=NA()', 3]);
    expect(chart).toMatchObject({
      topLeft: 'F27',
      bottomRight: 'L44',
      title: 'Lift of the average over the control: credible intervals',
      axisTitles: {
        x: 'Lift of the average over the control (relative; 0% = no change)',
        y: 'Challengers (low, median, high)',
      },
      // The heights 0…k only place each challenger's line: the vertical axis shows no numbers.
      hideValueLabels: true,
    });
    // The chart lies inside the block's area, which findPlaces keeps free.
    const area = block.area as { rowCount: number; columnCount: number };
    expect(area).toEqual(metricReadoutArea(3, 1));
    expect(10 + area.rowCount - 1).toBeGreaterThanOrEqual(44);
    expect(area.columnCount).toBeGreaterThanOrEqual(12);
    expect(block.cells).toHaveLength(area.rowCount);
  });

  test('evaluated by HyperFormula with the lift spill set to the core’s intervals: each challenger’s line is its interval', () => {
    const { block, cells, chart } = built;
    // MEAN_LIFT_INTERVAL's values from the core (normalMeans.meanLiftInterval, checked against scipy in test/stats).
    const lifts = meanLiftInterval(averages, 0.95);
    const grid = block.cells.map((row) => row.map((v) => (typeof v === 'string' && v.startsWith('=ABTEST.') ? '' : v)));
    const lift = parseAddress(cells.liftInterval as string).start;
    lifts.forEach((l, i) => {
      const r = grid[lift.row - 9 + 1 + i] as CellValue[];
      [r[6], r[7], r[8]] = [l.lower, l.median, l.upper];
    });
    const shifted = [...Array.from({ length: 9 }, () => [] as CellValue[]), ...grid];
    const hf = HyperFormula.buildFromArray(shifted as (string | number)[][], {
      licenseKey: 'gpl-v3',
      smartRounding: false,
    });
    const source = parseAddress(chart.source);
    const values = hf
      .getRangeValues({
        start: { sheet: 0, row: source.start.row, col: source.start.column },
        end: { sheet: 0, row: source.end.row, col: source.end.column },
      })
      .map((row) => row.map((v) => (typeof v === 'number' || typeof v === 'string' ? v : String(v))));
    hf.destroy();
    const { names, points } = chartSeries(values);
    expect(names).toEqual(['B', 'C', 'No change']);
    expect(points).toEqual([
      [
        [lifts[0]!.lower, 2],
        [lifts[0]!.median, 2],
        [lifts[0]!.upper, 2],
      ],
      [
        [lifts[1]!.lower, 1],
        [lifts[1]!.median, 1],
        [lifts[1]!.upper, 1],
      ],
      [
        [0, 0],
        [0, 3],
      ],
    ]);
  });
});

/**
 * Evaluates a block's own Excel logic in HyperFormula with every ABTEST result replaced: the expected
 * losses, the guardrail probabilities (blank at the control) and the decision text as constants.
 */
function guardedDecision(
  losses: number[],
  probabilities: number[],
  direction: Guardrail['direction'],
  required = 0.95,
): string {
  const { block, cells } = metricReadoutBlock(
    'averages',
    {
      namesRef: null,
      refs: { count: 'B2:B4', mean: 'C2:C4', sd: 'D2:D4', events: 'E2:E4', exposure: 'F2:F4' },
      variants: 3,
    },
    { level: 0.95, currentSrmPValue: 1 },
    [{ kind: 'counts', direction, limit: direction === 'noWorse' ? -0.02 : 0.05, required }],
    'A1',
  );
  const grid = block.cells.map((row) => row.map((v) => (typeof v === 'string' && v.startsWith('=ABTEST.') ? '' : v)));
  const put = (address: string, values: (number | string)[]): void => {
    const p = parseAddress(address).start;
    values.forEach((v, i) => ((grid[p.row + i] as CellValue[])[p.column] = v));
  };
  put(cells.expectedLoss as string, losses);
  put(cells.guardrail1 as string, ['', ...probabilities]);
  put(cells.decision as string, ['DECISION TEXT.']);
  put(cells.observed as string, [2, 2.1, 2.2]);
  const hf = HyperFormula.buildFromArray(grid as (string | number)[][], { licenseKey: 'gpl-v3' });
  const p = parseAddress(cells.guardedDecision as string).start;
  const value = hf.getCellValue({ sheet: 0, row: p.row, col: p.column });
  hf.destroy();
  return String(value);
}

describe('the decision with guardrails (its Excel logic, evaluated by HyperFormula)', () => {
  // max_loss is 1% of the control's observed value 2: 0.02
  test('a chosen challenger that fails a "no worse than" guardrail: named, with both probabilities', () => {
    expect(guardedDecision([0.5, 0.001, 0.3], [0.4, 0.9123], 'noWorse')).toBe(
      'Guardrail 1 fails for B: P(event rate lift > -2%) is 40%, below 95%. Do not switch yet. On average alone: DECISION TEXT.',
    );
  });

  test('a chosen challenger that passes: the decision and "Guardrails hold"', () => {
    expect(guardedDecision([0.5, 0.3, 0.001], [0.4, 0.97], 'noWorse')).toBe('DECISION TEXT. Guardrails hold for C.');
  });

  test('the control chosen, or nothing chosen yet: the primary decision alone', () => {
    expect(guardedDecision([0.001, 0.5, 0.3], [0.01, 0.01], 'noWorse')).toBe('DECISION TEXT.');
    expect(guardedDecision([0.5, 0.03, 0.3], [0.01, 0.01], 'noWorse')).toBe('DECISION TEXT.');
  });

  test('"no higher than": fails when P(lift > +5%) is above 1 − required', () => {
    expect(guardedDecision([0.5, 0.001, 0.3], [0.06, 0.01], 'noHigher')).toBe(
      'Guardrail 1 fails for B: P(event rate lift > 5%) is 6%, above 5%. Do not switch yet. On average alone: DECISION TEXT.',
    );
    expect(guardedDecision([0.5, 0.001, 0.3], [0.04, 0.01], 'noHigher')).toBe('DECISION TEXT. Guardrails hold for B.');
  });

  test('equal smallest losses: the first is chosen, as the decision rule', () => {
    expect(guardedDecision([0.5, 0.001, 0.001], [0.99, 0.1], 'noWorse')).toBe('DECISION TEXT. Guardrails hold for B.');
  });
});
