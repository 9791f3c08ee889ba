/**
 * The preview's demo workbook: an INVENTED online garden-supply shop testing checkout buttons.
 * Every number here is made up for the demo and every sheet says so. Every ABTEST function of the
 * catalogue appears at least once. Each result is laid out as a reader needs it: a label row above
 * (with column headings such as "lower", "upper" for results of several columns), the variants' names
 * beside the rows of a spilled result (formulas to the variant table, so they follow it), and number
 * formats over the whole spill — as in Excel, a spilled cell does not take its formula cell's format.
 */

/** A cell's content as HyperFormula takes it: a number, text, a formula ("=…"), or null for blank. */
export type DemoCell = number | string | null;

/** One sheet of the demo workbook. */
export interface DemoSheet {
  readonly name: string;
  /** Row-major cell contents; ragged rows are fine. */
  readonly cells: DemoCell[][];
  /** Number formats by A1 address (Excel-style codes such as "0.00%"); a spill uses its anchor's format. */
  readonly formats: Record<string, string>;
  /** Column widths in pixels by column letter. */
  readonly columnWidths: Record<string, number>;
  /** Cells shown in bold (titles, headers), by A1 address. */
  readonly bold?: readonly string[];
}

/**
 * Column letters → zero-based index. Cost O(letters). Never throws.
 * @example columnIndex('AA'); //=> 26
 */
export function columnIndex(letters: string): number {
  let index = 0;
  for (const ch of letters.toUpperCase()) index = index * 26 + (ch.charCodeAt(0) - 64);
  return index - 1;
}

/**
 * Zero-based column index → letters. Cost O(log index). Never throws.
 * @example columnLetters(27); //=> 'AB'
 */
export function columnLetters(index: number): string {
  let n = index + 1;
  let letters = '';
  while (n > 0) {
    const r = (n - 1) % 26;
    letters = String.fromCharCode(65 + r) + letters;
    n = Math.floor((n - 1) / 26);
  }
  return letters;
}

/**
 * Parses an A1 cell address (with or without $) into zero-based { row, col }. Cost O(1).
 * Throws an Error "not a cell address: …" on anything else.
 * @example parseA1('B12'); //=> { row: 11, col: 1 }
 */
export function parseA1(address: string): { row: number; col: number } {
  const match = /^\$?([A-Za-z]{1,3})\$?([1-9][0-9]*)$/.exec(address.trim());
  if (!match || match[1] === undefined || match[2] === undefined) throw new Error(`not a cell address: ${address}`);
  return { row: Number(match[2]) - 1, col: columnIndex(match[1]) };
}

/** A small builder so the layout below reads like a sheet. */
function sheetBuilder(name: string) {
  const cells: DemoCell[][] = [];
  const formats: Record<string, string> = {};
  const columnWidths: Record<string, number> = {};
  const bold: string[] = [];
  /** Gives every cell of a block (e.g. a whole spill) a number format. */
  const formatBlock = (address: string, rows: number, columns: number, format: string): void => {
    const { row, col } = parseA1(address);
    for (let r = 0; r < rows; r += 1)
      for (let c = 0; c < columns; c += 1) formats[`${columnLetters(col + c)}${row + r + 1}`] = format;
  };
  const put = (address: string, value: DemoCell, format?: string): void => {
    const { row, col } = parseA1(address);
    while (cells.length <= row) cells.push([]);
    const line = cells[row] as DemoCell[];
    while (line.length <= col) line.push(null);
    line[col] = value;
    if (format !== undefined) formats[address] = format;
  };
  const width = (column: string, px: number): void => {
    columnWidths[column] = px;
  };
  const strong = (...addresses: string[]): void => {
    bold.push(...addresses);
  };
  const done = (): DemoSheet => ({ name, cells, formats, columnWidths, bold });
  return { put, width, strong, formatBlock, done };
}

/** The words every sheet carries so nobody mistakes the demo for real results. */
export const DEMO_NOTICE = 'Invented demo data: an online garden-supply shop. These are not real results.';

/** The invented checkout-button test (control first). */
const CHECKOUT_VARIANTS = [
  // name, visitors, conversions, revenue count, revenue mean, revenue sd, basket adds, sessions, planned share
  ['Green button (control)', 10412, 412, 10412, 2.41, 11.8, 1820, 15230, 1],
  ['Orange button', 10388, 463, 10388, 2.63, 12.3, 1968, 15190, 1],
  ['Big basket icon', 10451, 431, 10451, 2.5, 12.0, 1902, 15310, 1],
] as const;

/** Invented past experiments of the same shop: name, conversions, visitors. */
const PAST_TESTS = [
  ['Free delivery banner', 341, 8120],
  ['Seed packet photos', 238, 6540],
  ['Hose bundle offer', 452, 9310],
  ['Guest checkout', 538, 11200],
  ['Trust badges', 277, 7480],
  ['Shorter address form', 462, 10050],
  ['Planter size chart', 212, 5890],
  ['Compost calculator', 309, 6720],
  ['Gift wrap option', 327, 8840],
  ['Delivery date picker', 588, 12010],
  ['Bulb bundle discount', 283, 7260],
  ['Tool care tips', 238, 6110],
] as const;

function checkoutSheet(): DemoSheet {
  const s = sheetBuilder('Checkout test');
  s.width('A', 520);
  for (const c of ['B', 'C', 'D', 'E', 'F', 'G', 'H', 'I']) s.width(c, 116);
  s.width('J', 24);
  for (const c of ['K', 'L', 'M', 'N']) s.width(c, 96);
  s.put('A1', 'Checkout test: which checkout button sells best?');
  s.put('A2', DEMO_NOTICE);
  // Revenue is per visitor (zeros for visitors who bought nothing); basket adds are events over sessions.
  const headers = [
    'Variant',
    'Visitors',
    'Conversions',
    'Revenue count',
    'Revenue mean',
    'Revenue sd',
    'Basket adds',
    'Sessions',
    'Planned share',
  ];
  headers.forEach((h, i) => s.put(`${columnLetters(i)}3`, h));
  s.strong('A1', ...headers.map((_, i) => `${columnLetters(i)}3`), 'A9', 'A55', 'A80', 'K9', 'K53');
  CHECKOUT_VARIANTS.forEach((variant, r) => {
    variant.forEach((value, c) => s.put(`${columnLetters(c)}${4 + r}`, value, c === 4 || c === 5 ? '0.00' : undefined));
  });
  s.put(
    'A8',
    'Cautions: fix the sample size before starting and read the result once (peeking inflates false alarms); check the split (SRM below); with many variants some look good by chance; for health or other regulated decisions ask a qualified statistician.',
  );

  const names = ['=$A$4', '=$A$5', '=$A$6'];
  /**
   * A spilled result at B`row`: its label (and column headings) in the row above, the variants' names
   * beside its rows, its format over the whole block.
   */
  const spilled = (
    row: number,
    label: string,
    formula: string,
    format: string,
    columns: readonly string[] = [],
  ): void => {
    s.put(`A${row - 1}`, label);
    columns.forEach((heading, c) => s.put(`${columnLetters(1 + c)}${row - 1}`, heading));
    names.forEach((name, i) => s.put(`A${row + i}`, name));
    s.put(`B${row}`, formula);
    s.formatBlock(`B${row}`, names.length, Math.max(1, columns.length), format);
  };
  /** A single result at B`row` with its label beside it. */
  const single = (row: number, label: string, formula: string, format?: string): void => {
    s.put(`A${row}`, label);
    s.put(`B${row}`, formula, format);
  };
  s.put('A9', 'Conversion read-out (Beta–Binomial, uniform prior)');
  spilled(11, 'Posterior mean conversion rate (POSTERIOR_MEAN)', '=ABTEST.POSTERIOR_MEAN(C4:C6, B4:B6)', '0.00%');
  spilled(15, '95% credible interval for the rate (RATE_INTERVAL)', '=ABTEST.RATE_INTERVAL(C4:C6, B4:B6)', '0.00%', [
    'lower',
    'upper',
  ]);
  spilled(
    19,
    '90% highest-density interval (RATE_INTERVAL, "hdi")',
    '=ABTEST.RATE_INTERVAL(C4:C6, B4:B6, 0.9, , , "hdi")',
    '0.00%',
    ['lower', 'upper'],
  );
  spilled(23, 'Probability of having the highest rate (PROB_HIGHEST)', '=ABTEST.PROB_HIGHEST(C4:C6, B4:B6)', '0.0%');
  spilled(
    27,
    'Probability of beating the control (PROB_ABOVE_CONTROL)',
    '=ABTEST.PROB_ABOVE_CONTROL(C4:C6, B4:B6)',
    '0.0%',
  );
  spilled(31, 'Lift over the control, relative (LIFT_INTERVAL)', '=ABTEST.LIFT_INTERVAL(C4:C6, B4:B6)', '0.0%', [
    'lower',
    'median',
    'upper',
  ]);
  spilled(
    35,
    'Rate minus the control’s, in rate points (RATE_DIFF_INTERVAL)',
    '=ABTEST.RATE_DIFF_INTERVAL(C4:C6, B4:B6)',
    '0.000%',
    ['lower', 'median', 'upper'],
  );
  spilled(
    39,
    'Probability the lift is above 5% (PROB_LIFT_ABOVE)',
    '=ABTEST.PROB_LIFT_ABOVE(C4:C6, B4:B6, 0.05)',
    '0.0%',
  );
  spilled(
    43,
    'Expected loss if chosen, in rate points: 0.300% = 0.3 percentage points (EXPECTED_LOSS)',
    '=ABTEST.EXPECTED_LOSS(C4:C6, B4:B6)',
    '0.000%',
  );
  single(47, 'What to do now (DECISION)', '=ABTEST.DECISION(C4:C6, B4:B6, , A4:A6)');
  spilled(
    49,
    'Probability of the highest rate with the prior fitted on "Past tests" (PROB_HIGHEST)',
    "=ABTEST.PROB_HIGHEST(C4:C6, B4:B6, 'Past tests'!B17, 'Past tests'!C17)",
    '0.0%',
  );
  single(
    53,
    'Split check p-value; tiny means a broken split (SRM_PVALUE)',
    '=ABTEST.SRM_PVALUE(B4:B6, I4:I6)',
    '0.0000',
  );

  s.put('A55', 'Revenue per visitor (Normal model from count, mean and sd)');
  spilled(
    57,
    '95% credible interval for the mean revenue (MEAN_INTERVAL)',
    '=ABTEST.MEAN_INTERVAL(D4:D6, E4:E6, F4:F6)',
    '0.000',
    ['lower', 'upper'],
  );
  spilled(
    61,
    'Probability of the highest mean (MEAN_PROB_HIGHEST)',
    '=ABTEST.MEAN_PROB_HIGHEST(D4:D6, E4:E6, F4:F6)',
    '0.0%',
  );
  spilled(
    65,
    'Probability the mean beats the control (MEAN_PROB_ABOVE_CONTROL)',
    '=ABTEST.MEAN_PROB_ABOVE_CONTROL(D4:D6, E4:E6, F4:F6)',
    '0.0%',
  );
  spilled(
    69,
    'Mean minus the control’s (MEAN_DIFF_INTERVAL)',
    '=ABTEST.MEAN_DIFF_INTERVAL(D4:D6, E4:E6, F4:F6)',
    '0.000',
    ['lower', 'median', 'upper'],
  );
  spilled(
    73,
    'Lift of the mean, relative (MEAN_LIFT_INTERVAL)',
    '=ABTEST.MEAN_LIFT_INTERVAL(D4:D6, E4:E6, F4:F6)',
    '0.0%',
    ['lower', 'median', 'upper'],
  );
  spilled(
    77,
    'Expected loss of the mean if chosen, in revenue per visitor (MEAN_EXPECTED_LOSS)',
    '=ABTEST.MEAN_EXPECTED_LOSS(D4:D6, E4:E6, F4:F6)',
    '0.0000',
  );

  s.put('A80', 'Basket adds per session (Gamma–Poisson)');
  spilled(
    82,
    '95% credible interval for adds per session (EVENTS_RATE_INTERVAL)',
    '=ABTEST.EVENTS_RATE_INTERVAL(G4:G6, H4:H6)',
    '0.0000',
    ['lower', 'upper'],
  );
  spilled(
    86,
    'Probability of the highest rate (EVENTS_PROB_HIGHEST)',
    '=ABTEST.EVENTS_PROB_HIGHEST(G4:G6, H4:H6)',
    '0.0%',
  );
  spilled(
    90,
    'Probability of beating the control (EVENTS_PROB_ABOVE_CONTROL)',
    '=ABTEST.EVENTS_PROB_ABOVE_CONTROL(G4:G6, H4:H6)',
    '0.0%',
  );
  spilled(
    94,
    'Lift over the control, relative (EVENTS_LIFT_INTERVAL)',
    '=ABTEST.EVENTS_LIFT_INTERVAL(G4:G6, H4:H6)',
    '0.0%',
    ['lower', 'median', 'upper'],
  );
  spilled(
    98,
    'Expected loss if chosen, in adds per session (EVENTS_EXPECTED_LOSS)',
    '=ABTEST.EVENTS_EXPECTED_LOSS(G4:G6, H4:H6)',
    '0.00000',
  );

  revenueFromTotals(s);

  // Chart tables: a heading row with the variants' names over their density columns.
  s.put('K9', 'Chart table: posterior densities (POSTERIOR_DENSITY, 41 points)');
  ['Conversion rate', ...names].forEach((heading, c) => s.put(`${columnLetters(10 + c)}10`, heading));
  s.put('K11', '=ABTEST.POSTERIOR_DENSITY(C4:C6, B4:B6, 41)');
  s.formatBlock('K11', 41, 1, '0.00%');
  s.formatBlock('L11', 41, 3, '0.00');
  s.put('K53', 'Chart table: lift densities (LIFT_DENSITY, 41 points)');
  ['Lift over control', '=$A$5', '=$A$6'].forEach((heading, c) => s.put(`${columnLetters(10 + c)}54`, heading));
  s.put('K55', '=ABTEST.LIFT_DENSITY(C4:C6, B4:B6, 41)');
  s.formatBlock('K55', 41, 1, '0.0%');
  s.formatBlock('L55', 41, 2, '0.00');
  return s.done();
}

/**
 * The revenue-from-totals part of the checkout sheet (issue #13), below the other read-outs: the same
 * invented test as its analytics export would give it (orders = conversions, visitors, total revenue =
 * average revenue per visitor × visitors, and an invented standard deviation of order values), read out
 * with the REVENUE_ functions, and the "no worse than" probabilities and decisions of the other metrics.
 */
function revenueFromTotals(s: ReturnType<typeof sheetBuilder>): void {
  s.put('A101', 'Revenue per visitor from totals (orders × average order value; invented totals)');
  const headers = ['Variant', 'Orders', 'Visitors', 'Revenue', 'Order sd'];
  headers.forEach((h, i) => s.put(`${columnLetters(i)}102`, h));
  s.strong('A101', ...headers.map((_, i) => `${columnLetters(i)}102`));
  // orders = conversions and visitors of rows 4–6; revenue = average revenue per visitor × visitors;
  // the order values' standard deviation is invented
  const orderSd = [35, 37, 36];
  CHECKOUT_VARIANTS.forEach((variant, r) => {
    const row = 103 + r;
    s.put(`A${row}`, `=$A$${4 + r}`);
    s.put(`B${row}`, `=C${4 + r}`);
    s.put(`C${row}`, `=B${4 + r}`);
    s.put(`D${row}`, Math.round(variant[4] * variant[1] * 100) / 100, '0.00');
    s.put(`E${row}`, orderSd[r] as number, '0.00');
  });
  const names = ['=$A$4', '=$A$5', '=$A$6'];
  /** A spilled result at B`row`, its label and headings in the row above and the names beside it. */
  const spilled = (
    row: number,
    label: string,
    formula: string,
    format: string,
    columns: readonly string[] = [],
  ): void => {
    s.put(`A${row - 1}`, label);
    columns.forEach((heading, c) => s.put(`${columnLetters(1 + c)}${row - 1}`, heading));
    names.forEach((name, i) => s.put(`A${row + i}`, name));
    s.put(`B${row}`, formula);
    s.formatBlock(`B${row}`, names.length, Math.max(1, columns.length), format);
  };
  const single = (row: number, label: string, formula: string): void => {
    s.put(`A${row}`, label);
    s.put(`B${row}`, formula);
  };
  const totals = 'B103:B105, C103:C105, D103:D105';
  spilled(
    108,
    '95% credible interval for revenue per visitor (REVENUE_INTERVAL)',
    `=ABTEST.REVENUE_INTERVAL(${totals})`,
    '0.000',
    ['lower', 'upper'],
  );
  spilled(
    112,
    'Probability of the highest revenue per visitor (REVENUE_PROB_HIGHEST)',
    `=ABTEST.REVENUE_PROB_HIGHEST(${totals})`,
    '0.0%',
  );
  spilled(
    116,
    'Probability of beating the control, with order sd (REVENUE_PROB_ABOVE_CONTROL)',
    `=ABTEST.REVENUE_PROB_ABOVE_CONTROL(${totals}, E103:E105)`,
    '0.0%',
  );
  spilled(
    120,
    'Lift over the control, relative, with order sd (REVENUE_LIFT_INTERVAL)',
    `=ABTEST.REVENUE_LIFT_INTERVAL(${totals}, E103:E105)`,
    '0.0%',
    ['lower', 'median', 'upper'],
  );
  spilled(
    124,
    'Probability it is no worse than 2% below the control (REVENUE_PROB_LIFT_ABOVE)',
    `=ABTEST.REVENUE_PROB_LIFT_ABOVE(${totals}, -0.02, E103:E105)`,
    '0.0%',
  );
  spilled(
    128,
    'Expected loss if chosen, per visitor, with order sd (REVENUE_EXPECTED_LOSS)',
    `=ABTEST.REVENUE_EXPECTED_LOSS(${totals}, E103:E105)`,
    '0.0000',
  );
  single(
    131,
    'What to do on revenue (REVENUE_DECISION, with order sd)',
    `=ABTEST.REVENUE_DECISION(${totals}, E103:E105, , A103:A105)`,
  );
  spilled(
    134,
    'Revenue mean no worse than 2% below the control (MEAN_PROB_LIFT_ABOVE)',
    '=ABTEST.MEAN_PROB_LIFT_ABOVE(D4:D6, E4:E6, F4:F6, -0.02)',
    '0.0%',
  );
  single(137, 'What to do on the revenue mean (MEAN_DECISION)', '=ABTEST.MEAN_DECISION(D4:D6, E4:E6, F4:F6, , A4:A6)');
  spilled(
    140,
    'Basket adds more than 5% above the control (EVENTS_PROB_LIFT_ABOVE)',
    '=ABTEST.EVENTS_PROB_LIFT_ABOVE(G4:G6, H4:H6, 0.05)',
    '0.0%',
  );
  single(143, 'What to do on basket adds (EVENTS_DECISION)', '=ABTEST.EVENTS_DECISION(G4:G6, H4:H6, , A4:A6)');
  s.put(
    'A145',
    'Caution: without order sd the order values are taken as exponential, which understates the spread when a few orders are very large; a decision on revenue can differ from one on conversions.',
  );
}

function pastTestsSheet(): DemoSheet {
  const s = sheetBuilder('Past tests');
  s.width('A', 600);
  s.width('B', 110);
  s.width('C', 110);
  s.put('A1', 'Past tests of the shop’s checkout and product pages');
  s.put('A2', DEMO_NOTICE);
  s.put('A3', 'Past test');
  s.put('B3', 'Conversions');
  s.put('C3', 'Visitors');
  s.strong('A1', 'A3', 'B3', 'C3');
  PAST_TESTS.forEach(([name, conversions, visitors], r) => {
    s.put(`A${4 + r}`, name);
    s.put(`B${4 + r}`, conversions);
    s.put(`C${4 + r}`, visitors);
  });
  // Each prior spills alpha, beta into two cells: headings above them say which is which.
  for (const row of [16, 19]) {
    s.put(`B${row}`, 'alpha');
    s.put(`C${row}`, 'beta');
    s.strong(`B${row}`, `C${row}`);
  }
  s.put('A17', 'Prior fitted to these results (PRIOR_FROM_HISTORY, likelihood)');
  s.put('B17', '=ABTEST.PRIOR_FROM_HISTORY(B4:B15, C4:C15)');
  s.put('A18', 'Prior fitted by the method of moments (PRIOR_FROM_HISTORY, "moments")');
  s.put('B18', '=ABTEST.PRIOR_FROM_HISTORY(B4:B15, C4:C15, "moments")');
  s.put('A20', 'Prior with mean 4% worth 500 visitors (PRIOR_FROM_MEAN)');
  s.put('B20', '=ABTEST.PRIOR_FROM_MEAN(0.04, 500)');
  s.put('A21', 'Prior whose 90% interval is 3% to 6% (PRIOR_FROM_INTERVAL)');
  s.put('B21', '=ABTEST.PRIOR_FROM_INTERVAL(0.03, 0.06)');
  s.formatBlock('B17', 2, 2, '0.00');
  s.formatBlock('B20', 2, 2, '0.00');
  s.put(
    'A23',
    'Caution: a strong prior pulls new results toward the past. Compare with the uniform prior before acting (prior sensitivity).',
  );
  return s.done();
}

function planSheet(): DemoSheet {
  const s = sheetBuilder('Plan');
  s.width('A', 540);
  s.width('B', 120);
  s.put('A1', 'Plan the next checkout test');
  s.strong('A1');
  s.put('A2', DEMO_NOTICE);
  s.put('A4', 'Baseline conversion rate');
  s.put('B4', 0.042, '0.00%');
  s.put('A5', 'Smallest relative lift worth finding');
  s.put('B5', 0.1, '0%');
  s.put('A6', 'Visitors per variant we can afford');
  s.put('B6', 20000);
  s.put('A7', 'Decision threshold: probability of beating the control');
  s.put('B7', 0.95, '0%');
  s.put('A8', 'Wanted chance of a clear result (power)');
  s.put('B8', 0.8, '0%');
  s.put('A10', 'Chance the test ends with a clear winner (DECISION_POWER)');
  s.put('B10', '=ABTEST.DECISION_POWER(B4, B5, B6, B7)', '0.0%');
  s.put('A11', 'False-alarm rate if there is no lift at all (DECISION_POWER, lift 0)');
  s.put('B11', '=ABTEST.DECISION_POWER(B4, 0, B6, B7)', '0.0%');
  s.put('A12', 'Visitors per variant for that power (VISITORS_NEEDED)');
  s.put('B12', '=ABTEST.VISITORS_NEEDED(B4, B5, B7, B8)');
  s.put('A13', 'Visitors per variant for the classic z-test, alpha 5% (CLASSIC_SAMPLE_SIZE)');
  s.put('B13', '=ABTEST.CLASSIC_SAMPLE_SIZE(B4, B5, 0.05, B8)');
  s.put(
    'A15',
    'Caution: decide the sample size first and read the result once at the end; stopping on a good day (peeking) inflates false alarms.',
  );
  return s.done();
}

/** The invented daily counts of a running test: per day, visitors of the three variants, then conversions. */
const DAILY_COUNTS: readonly (readonly number[])[] = [
  [555, 608, 571, 21, 29, 27],
  [592, 555, 608, 26, 24, 26],
  [629, 592, 555, 25, 29, 22],
  [576, 629, 592, 26, 29, 26],
  [613, 576, 629, 26, 29, 26],
  [620, 673, 636, 24, 32, 29],
  [657, 620, 673, 29, 27, 29],
  [634, 597, 560, 26, 29, 22],
  [581, 634, 597, 26, 29, 27],
  [618, 581, 634, 26, 29, 26],
  [565, 618, 581, 22, 29, 27],
  [602, 565, 618, 26, 25, 27],
  [699, 662, 625, 28, 32, 25],
  [646, 699, 662, 29, 32, 29],
];

/**
 * A running test's daily counts for the panel's Daily section (select A4:G18 there). Invented.
 */
function dailySheet(): DemoSheet {
  const s = sheetBuilder('Daily test');
  s.width('A', 90);
  for (const column of ['B', 'C', 'D', 'E', 'F', 'G']) s.width(column, 185);
  s.put('A1', 'Delivery banner test, day by day (running)');
  s.strong('A1');
  s.put('A2', DEMO_NOTICE);
  const header = [
    'Day',
    'Control visitors',
    'Green banner visitors',
    'Tall banner visitors',
    'Control conversions',
    'Green banner conversions',
    'Tall banner conversions',
  ];
  header.forEach((text, c) => {
    const address = `${columnLetters(c)}4`;
    s.put(address, text);
    s.strong(address);
  });
  DAILY_COUNTS.forEach((counts, d) => {
    s.put(`A${5 + d}`, `Day ${d + 1}`);
    counts.forEach((n, c) => s.put(`${columnLetters(c + 1)}${5 + d}`, n));
  });
  s.put('A20', 'Counts of each day (not running totals). The Daily section of the panel reads this table.');
  return s.done();
}

/**
 * Builds a fresh copy of the demo workbook (four sheets: "Checkout test", "Past tests", "Plan", "Daily test").
 *
 * Cost: a few hundred cells. Never throws.
 *
 * @example
 * buildDemoWorkbook().map((sheet) => sheet.name); //=> ['Checkout test', 'Past tests', 'Plan', 'Daily test']
 */
export function buildDemoWorkbook(): DemoSheet[] {
  return [checkoutSheet(), pastTestsSheet(), planSheet(), dailySheet()];
}

/**
 * The demo as HyperFormula's `buildFromSheets` input: sheet name → rows of cell contents.
 *
 * @example
 * Object.keys(demoSheetsForHyperFormula()); //=> ['Checkout test', 'Past tests', 'Plan', 'Daily test']
 */
export function demoSheetsForHyperFormula(
  sheets: readonly DemoSheet[] = buildDemoWorkbook(),
): Record<string, DemoCell[][]> {
  return Object.fromEntries(sheets.map((sheet) => [sheet.name, sheet.cells.map((row) => [...row])]));
}

/** HyperFormula settings the preview and its tests share (the GPL licence key; no rounding of results). */
export const HYPERFORMULA_CONFIG = Object.freeze({
  licenseKey: 'gpl-v3',
  smartRounding: false,
  useArrayArithmetic: false,
  maxRows: 2000,
  maxColumns: 200,
});
