/**
 * The preview's demo workbook: an INVENTED online garden-supply shop testing checkout buttons.
 * Every number here is made up for the demo and every sheet says so. Every ABTEST function of the
 * catalogue appears at least once, each with a label cell to its left (or just above, for the chart tables).
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
  return { put, width, strong, done };
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
  const headers = ['Variant', 'Visitors', 'Conversions', 'Revenue count', 'Revenue mean', 'Revenue sd', 'Basket adds', 'Sessions', 'Planned share'];
  headers.forEach((h, i) => s.put(`${columnLetters(i)}3`, h));
  s.strong('A1', ...headers.map((_, i) => `${columnLetters(i)}3`), 'A10', 'A56', 'A81', 'K10', 'K54');
  CHECKOUT_VARIANTS.forEach((variant, r) => {
    variant.forEach((value, c) => s.put(`${columnLetters(c)}${4 + r}`, value, c === 4 || c === 5 ? '0.00' : undefined));
  });
  s.put('A8', 'Cautions: fix the sample size before starting and read the result once (peeking inflates false alarms); check the split (SRM below); with many variants some look good by chance; for health or other regulated decisions ask a qualified statistician.');

  const block = (row: number, label: string, formula: string, format?: string): void => {
    s.put(`A${row}`, label);
    s.put(`B${row}`, formula, format);
  };
  s.put('A10', 'Conversion read-out (Beta–Binomial, uniform prior)');
  block(11, 'Posterior mean conversion rate (POSTERIOR_MEAN)', '=ABTEST.POSTERIOR_MEAN(C4:C6, B4:B6)', '0.00%');
  block(15, '95% credible interval for the rate: lower, upper (RATE_INTERVAL)', '=ABTEST.RATE_INTERVAL(C4:C6, B4:B6)', '0.00%');
  block(19, '90% highest-density interval: lower, upper (RATE_INTERVAL, "hdi")', '=ABTEST.RATE_INTERVAL(C4:C6, B4:B6, 0.9, , , "hdi")', '0.00%');
  block(23, 'Probability of having the highest rate (PROB_HIGHEST)', '=ABTEST.PROB_HIGHEST(C4:C6, B4:B6)', '0.0%');
  block(27, 'Probability of beating the control (PROB_ABOVE_CONTROL)', '=ABTEST.PROB_ABOVE_CONTROL(C4:C6, B4:B6)', '0.0%');
  block(31, 'Lift over the control: lower, median, upper (LIFT_INTERVAL)', '=ABTEST.LIFT_INTERVAL(C4:C6, B4:B6)', '0.0%');
  block(35, 'Rate minus the control’s: lower, median, upper (RATE_DIFF_INTERVAL)', '=ABTEST.RATE_DIFF_INTERVAL(C4:C6, B4:B6)', '0.000%');
  block(39, 'Probability the lift is above 5% (PROB_LIFT_ABOVE)', '=ABTEST.PROB_LIFT_ABOVE(C4:C6, B4:B6, 0.05)', '0.0%');
  block(43, 'Expected loss if chosen, in rate units (EXPECTED_LOSS)', '=ABTEST.EXPECTED_LOSS(C4:C6, B4:B6)', '0.000%');
  block(47, 'What to do now (DECISION)', '=ABTEST.DECISION(C4:C6, B4:B6, , A4:A6)');
  block(49, 'Probability of the highest rate with the prior fitted on "Past tests" (PROB_HIGHEST)', "=ABTEST.PROB_HIGHEST(C4:C6, B4:B6, 'Past tests'!B17, 'Past tests'!C17)", '0.0%');
  block(53, 'Split check p-value; tiny means a broken split (SRM_PVALUE)', '=ABTEST.SRM_PVALUE(B4:B6, I4:I6)', '0.0000');

  s.put('A56', 'Revenue per visitor (Normal model from count, mean and sd)');
  block(57, '95% credible interval for the mean: lower, upper (MEAN_INTERVAL)', '=ABTEST.MEAN_INTERVAL(D4:D6, E4:E6, F4:F6)', '0.000');
  block(61, 'Probability of the highest mean (MEAN_PROB_HIGHEST)', '=ABTEST.MEAN_PROB_HIGHEST(D4:D6, E4:E6, F4:F6)', '0.0%');
  block(65, 'Probability the mean beats the control (MEAN_PROB_ABOVE_CONTROL)', '=ABTEST.MEAN_PROB_ABOVE_CONTROL(D4:D6, E4:E6, F4:F6)', '0.0%');
  block(69, 'Mean minus the control’s: lower, median, upper (MEAN_DIFF_INTERVAL)', '=ABTEST.MEAN_DIFF_INTERVAL(D4:D6, E4:E6, F4:F6)', '0.000');
  block(73, 'Lift of the mean: lower, median, upper (MEAN_LIFT_INTERVAL)', '=ABTEST.MEAN_LIFT_INTERVAL(D4:D6, E4:E6, F4:F6)', '0.0%');
  block(77, 'Expected loss of the mean if chosen (MEAN_EXPECTED_LOSS)', '=ABTEST.MEAN_EXPECTED_LOSS(D4:D6, E4:E6, F4:F6)', '0.0000');

  s.put('A81', 'Basket adds per session (Gamma–Poisson)');
  block(82, '95% credible interval for adds per session: lower, upper (EVENTS_RATE_INTERVAL)', '=ABTEST.EVENTS_RATE_INTERVAL(G4:G6, H4:H6)', '0.0000');
  block(86, 'Probability of the highest rate (EVENTS_PROB_HIGHEST)', '=ABTEST.EVENTS_PROB_HIGHEST(G4:G6, H4:H6)', '0.0%');
  block(90, 'Probability of beating the control (EVENTS_PROB_ABOVE_CONTROL)', '=ABTEST.EVENTS_PROB_ABOVE_CONTROL(G4:G6, H4:H6)', '0.0%');
  block(94, 'Lift over the control: lower, median, upper (EVENTS_LIFT_INTERVAL)', '=ABTEST.EVENTS_LIFT_INTERVAL(G4:G6, H4:H6)', '0.0%');
  block(98, 'Expected loss if chosen (EVENTS_EXPECTED_LOSS)', '=ABTEST.EVENTS_EXPECTED_LOSS(G4:G6, H4:H6)', '0.00000');

  revenueFromTotals(s);

  s.put('K10', 'Chart table: posterior densities (POSTERIOR_DENSITY, 41 points)');
  s.put('K11', '=ABTEST.POSTERIOR_DENSITY(C4:C6, B4:B6, 41)', '0.0000');
  s.put('K54', 'Chart table: lift densities (LIFT_DENSITY, 41 points)');
  s.put('K55', '=ABTEST.LIFT_DENSITY(C4:C6, B4:B6, 41)', '0.0000');
  return s.done();
}

/**
 * The revenue-from-totals part of the checkout sheet (issue #13), below the other read-outs: the same
 * invented test as its analytics export would give it (orders = conversions, visitors, total revenue =
 * average revenue per visitor × visitors, and an invented standard deviation of order values), read out
 * with the REVENUE_ functions, and the "no worse than" probabilities and decisions of the other metrics.
 */
function revenueFromTotals(s: ReturnType<typeof sheetBuilder>): void {
  s.put('A102', 'Revenue per visitor from totals (orders × average order value; invented totals)');
  const headers = ['Variant', 'Orders', 'Visitors', 'Revenue', 'Order sd'];
  headers.forEach((h, i) => s.put(`${columnLetters(i)}103`, h));
  s.strong('A102', ...headers.map((_, i) => `${columnLetters(i)}103`));
  // revenue = average revenue per visitor × visitors of rows 4–6; order sd invented
  const orderSd = [35, 37, 36];
  CHECKOUT_VARIANTS.forEach((variant, r) => {
    const row = 104 + r;
    s.put(`A${row}`, variant[0]);
    s.put(`B${row}`, `=C${4 + r}`);
    s.put(`C${row}`, `=B${4 + r}`);
    s.put(`D${row}`, Math.round(variant[4] * variant[1] * 100) / 100, '0.00');
    s.put(`E${row}`, orderSd[r] as number, '0.00');
  });
  const block = (row: number, label: string, formula: string, format?: string): void => {
    s.put(`A${row}`, label);
    s.put(`B${row}`, formula, format);
  };
  const totals = 'B104:B106, C104:C106, D104:D106';
  block(108, '95% credible interval for revenue per visitor: lower, upper (REVENUE_INTERVAL)', `=ABTEST.REVENUE_INTERVAL(${totals})`, '0.000');
  block(112, 'Probability of the highest revenue per visitor (REVENUE_PROB_HIGHEST)', `=ABTEST.REVENUE_PROB_HIGHEST(${totals})`, '0.0%');
  block(116, 'Probability of beating the control (REVENUE_PROB_ABOVE_CONTROL, with order sd)', `=ABTEST.REVENUE_PROB_ABOVE_CONTROL(${totals}, E104:E106)`, '0.0%');
  block(120, 'Lift over the control: lower, median, upper (REVENUE_LIFT_INTERVAL, with order sd)', `=ABTEST.REVENUE_LIFT_INTERVAL(${totals}, E104:E106)`, '0.0%');
  block(124, 'Probability it is no worse than 2% below the control (REVENUE_PROB_LIFT_ABOVE)', `=ABTEST.REVENUE_PROB_LIFT_ABOVE(${totals}, -0.02, E104:E106)`, '0.0%');
  block(128, 'Expected loss if chosen, per visitor (REVENUE_EXPECTED_LOSS, with order sd)', `=ABTEST.REVENUE_EXPECTED_LOSS(${totals}, E104:E106)`, '0.0000');
  block(132, 'What to do on revenue (REVENUE_DECISION, with order sd)', `=ABTEST.REVENUE_DECISION(${totals}, E104:E106, , A104:A106)`);
  block(134, 'Revenue mean no worse than 2% below the control (MEAN_PROB_LIFT_ABOVE)', '=ABTEST.MEAN_PROB_LIFT_ABOVE(D4:D6, E4:E6, F4:F6, -0.02)', '0.0%');
  block(138, 'What to do on the revenue mean (MEAN_DECISION)', '=ABTEST.MEAN_DECISION(D4:D6, E4:E6, F4:F6, , A4:A6)');
  block(140, 'Basket adds more than 5% above the control (EVENTS_PROB_LIFT_ABOVE)', '=ABTEST.EVENTS_PROB_LIFT_ABOVE(G4:G6, H4:H6, 0.05)', '0.0%');
  block(144, 'What to do on basket adds (EVENTS_DECISION)', '=ABTEST.EVENTS_DECISION(G4:G6, H4:H6, , A4:A6)');
  s.put(
    'A146',
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
  s.put('A17', 'Prior fitted to these results: alpha, beta (PRIOR_FROM_HISTORY, likelihood)');
  s.put('B17', '=ABTEST.PRIOR_FROM_HISTORY(B4:B15, C4:C15)', '0.00');
  s.put('A18', 'Prior fitted by the method of moments: alpha, beta (PRIOR_FROM_HISTORY, "moments")');
  s.put('B18', '=ABTEST.PRIOR_FROM_HISTORY(B4:B15, C4:C15, "moments")', '0.00');
  s.put('A20', 'Prior with mean 4% worth 500 visitors: alpha, beta (PRIOR_FROM_MEAN)');
  s.put('B20', '=ABTEST.PRIOR_FROM_MEAN(0.04, 500)', '0.00');
  s.put('A21', 'Prior whose 90% interval is 3% to 6%: alpha, beta (PRIOR_FROM_INTERVAL)');
  s.put('B21', '=ABTEST.PRIOR_FROM_INTERVAL(0.03, 0.06)', '0.00');
  s.put('A23', 'Caution: a strong prior pulls new results toward the past. Compare with the uniform prior before acting (prior sensitivity).');
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
  s.put('B7', 0.95);
  s.put('A8', 'Wanted chance of a clear result (power)');
  s.put('B8', 0.8);
  s.put('A10', 'Chance the test ends with a clear winner (DECISION_POWER)');
  s.put('B10', '=ABTEST.DECISION_POWER(B4, B5, B6, B7)', '0.0%');
  s.put('A11', 'False-alarm rate if there is no lift at all (DECISION_POWER, lift 0)');
  s.put('B11', '=ABTEST.DECISION_POWER(B4, 0, B6, B7)', '0.0%');
  s.put('A12', 'Visitors per variant for that power (VISITORS_NEEDED)');
  s.put('B12', '=ABTEST.VISITORS_NEEDED(B4, B5, B7, B8)');
  s.put('A13', 'Visitors per variant for the classic z-test, alpha 5% (CLASSIC_SAMPLE_SIZE)');
  s.put('B13', '=ABTEST.CLASSIC_SAMPLE_SIZE(B4, B5, 0.05, B8)');
  s.put('A15', 'Caution: decide the sample size first and read the result once at the end; stopping on a good day (peeking) inflates false alarms.');
  return s.done();
}

/**
 * Builds a fresh copy of the demo workbook (three sheets: "Checkout test", "Past tests", "Plan").
 *
 * Cost: a few hundred cells. Never throws.
 *
 * @example
 * buildDemoWorkbook().map((sheet) => sheet.name); //=> ['Checkout test', 'Past tests', 'Plan']
 */
export function buildDemoWorkbook(): DemoSheet[] {
  return [checkoutSheet(), pastTestsSheet(), planSheet()];
}

/**
 * The demo as HyperFormula's `buildFromSheets` input: sheet name → rows of cell contents.
 *
 * @example
 * Object.keys(demoSheetsForHyperFormula()); //=> ['Checkout test', 'Past tests', 'Plan']
 */
export function demoSheetsForHyperFormula(sheets: readonly DemoSheet[] = buildDemoWorkbook()): Record<string, DemoCell[][]> {
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
