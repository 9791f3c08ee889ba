/**
 * Test helper (not a suite): the workbooks the CLI tests use, built with the hand-made writer.
 *
 * Cached values are NOT computed by the add-in (that would make the audit agree with itself): they are
 * - scipy references from test/reference/addin/addin_values.json (made by addin_values.py), accurate to about
 *   1e-8 relative, so the tests audit with a tolerance of 1e-7, as test/addin/bundle.test.ts compares;
 * - closed forms: the Beta–Binomial posterior mean (alpha + conversions) / (alpha + beta + visitors)
 *   (Gelman et al., BDA3 §2.4) and the prior from a mean and a strength, alpha = mean × strength;
 * - R's chisq.test p-value from test/reference/srm/srm_chisq.json;
 * - the DECISION wording documented in the function catalogue's example for these counts.
 * The counts (120 of 2400 against 150 of 2380) are the invented example of the catalogue.
 */
import * as fs from 'fs';
import * as path from 'path';
import type { TestBook, TestCell, TestSheet } from './xlsxWriter';

const REF = path.join(__dirname, '..', '..', 'reference');
const addin = JSON.parse(fs.readFileSync(path.join(REF, 'addin/addin_values.json'), 'utf8'));
const srm = JSON.parse(fs.readFileSync(path.join(REF, 'srm/srm_chisq.json'), 'utf8'));

/** scipy references for conversions {120;150} of visitors {2400;2380} (addin_values.py). */
export const two = addin.conversionTwo as {
  probHighest: number[];
  expectedLoss: number[];
  liftInterval: number[][];
  probLiftAbove: number[];
};

/** R: chisq.test(c(50410, 49590)) p-value (srm_chisq.R). */
export const srmPValue = srm.cases[0].pValue as number;

/** The DECISION text of the catalogue's example for these counts (the function catalogue, DECISION). */
export const DECISION_TEXT = 'Choose B: its expected loss 0.0065% is within the 0.050% allowed';

/** Closed-form posterior means with the uniform prior (BDA3 §2.4). */
export const MEAN_A = 121 / 2402;
export const MEAN_B = 151 / 2382;

/** The tolerance the tests audit with: the scipy references' accuracy (see above). */
export const REFERENCE_TOLERANCE = 1e-7;

function countsSheet(visitorsB: number): TestSheet {
  return {
    name: 'Counts',
    cells: [
      { ref: 'A1', value: 'Variant (invented demo data)' },
      { ref: 'B1', value: 'Visitors' },
      { ref: 'C1', value: 'Conversions' },
      { ref: 'A2', value: 'A', stringAs: 'inlineStr' },
      { ref: 'A3', value: 'B', stringAs: 'inlineStr' },
      { ref: 'B2', value: 2400 },
      { ref: 'B3', value: visitorsB },
      { ref: 'C2', value: 120 },
      { ref: 'C3', value: 150 },
    ],
  };
}

const C = 'Counts!C2:C3';
const V = 'Counts!B2:B3';

/** The ABTEST cells of the read-out sheet, with their cached values. */
export function readoutCells(): TestCell[] {
  return [
    { ref: 'A1', value: 'Read-out of the checkout test (invented demo data)' },
    // The user-defined-function spelling, a dynamic array spilling down.
    {
      ref: 'B2',
      formula: `_xldudf_ABTEST_PROB_HIGHEST(${C},${V})`,
      array: 'B2:B3',
      dynamic: true,
      value: two.probHighest[0] as number,
      style: 1,
    },
    { ref: 'B3', value: two.probHighest[1] as number, style: 1 },
    // The worksheet spelling with absolute references; closed form.
    {
      ref: 'C2',
      formula: 'ABTEST.POSTERIOR_MEAN(Counts!$C$2:$C$3,Counts!$B$2:$B$3)',
      array: 'C2:C3',
      dynamic: true,
      value: MEAN_A,
      style: 2,
    },
    { ref: 'C3', value: MEAN_B, style: 2 },
    // A 2×3 spill with empty text in the control's row.
    {
      ref: 'D2',
      formula: `ABTEST.LIFT_INTERVAL(${C},${V},0.95)`,
      array: 'D2:F3',
      dynamic: true,
      value: '',
    },
    { ref: 'E2', value: '', stringAs: 'str' },
    { ref: 'F2', value: '', stringAs: 'str' },
    { ref: 'D3', value: two.liftInterval[0]?.[0] as number },
    { ref: 'E3', value: two.liftInterval[0]?.[1] as number },
    { ref: 'F3', value: two.liftInterval[0]?.[2] as number },
    // A percent constant; the _xll. spelling.
    {
      ref: 'B5',
      formula: `_xll.ABTEST.PROB_LIFT_ABOVE(${C},${V},5%)`,
      array: 'B5:B6',
      dynamic: true,
      value: '',
    },
    { ref: 'B6', value: two.probLiftAbove[0] as number },
    // A prior from constants, then used from its spilled cells.
    {
      ref: 'B8',
      formula: 'ABTEST.PRIOR_FROM_MEAN(0.05,200)',
      array: 'B8:C8',
      dynamic: true,
      value: 10,
    },
    { ref: 'C8', value: 190 },
    {
      ref: 'B10',
      formula: `ABTEST.POSTERIOR_MEAN(${C},${V},B8,C8)`,
      array: 'B10:B11',
      dynamic: true,
      value: 130 / 2600,
    },
    { ref: 'B11', value: 160 / 2580 },
    // An array constant, no spill.
    {
      ref: 'B13',
      formula: 'ABTEST.SRM_PVALUE({50410;49590})',
      value: srmPValue,
    },
    // Omitted optional arguments.
    {
      ref: 'B14',
      formula: `ABTEST.EXPECTED_LOSS(${C},${V},,)`,
      array: 'B14:B15',
      dynamic: true,
      value: two.expectedLoss[0] as number,
    },
    { ref: 'B15', value: two.expectedLoss[1] as number },
    // Defined names.
    {
      ref: 'B17',
      formula: 'ABTEST.POSTERIOR_MEAN(conv,visits)',
      array: 'B17:B18',
      dynamic: true,
      value: MEAN_A,
    },
    { ref: 'B18', value: MEAN_B },
    // Not checkable: an expression, a nested call, a result saved without the add-in.
    {
      ref: 'B20',
      formula: `ABTEST.POSTERIOR_MEAN(${C}*1,${V})`,
      array: 'B20:B21',
      dynamic: true,
      value: MEAN_A,
    },
    { ref: 'B21', value: MEAN_B },
    {
      ref: 'B22',
      formula: 'ROUND(ABTEST.POSTERIOR_MEAN(Counts!C2,Counts!B2),4)',
      value: 0.0504,
    },
    { ref: 'B23', formula: `ABTEST.DECISION(${C},${V})`, value: DECISION_TEXT },
    {
      ref: 'B24',
      formula: `ABTEST.PROB_HIGHEST(${C},${V})`,
      value: { error: '#NAME?' },
    },
    // A plain formula that is not ours.
    { ref: 'E10', formula: `SUM(${V})`, value: 4780 },
    // A shared formula filled down (master G5, dependent G6) on a quoted sheet name.
    {
      ref: 'G5',
      formula: "ABTEST.POSTERIOR_MEAN('Counts'!C2,'Counts'!B2)",
      shared: { si: 0, ref: 'G5:G6' },
      value: MEAN_A,
    },
    { ref: 'G6', shared: { si: 0 }, value: MEAN_B },
  ];
}

/** The read-out workbook; `visitorsB` changes Counts!B3 after the values were cached (2380 as computed). */
export function readoutBook(options: { visitorsB?: number; chart?: boolean; calcChain?: boolean } = {}): TestBook {
  const readout: TestSheet = {
    name: 'Read-out',
    cells: readoutCells(),
    ...(options.chart
      ? {
          chart: {
            seriesRef: "'Read-out'!$B$2:$B$3",
            cached: [two.probHighest[0] as number, two.probHighest[1] as number],
          },
        }
      : {}),
  };
  return {
    sheets: [readout, countsSheet(options.visitorsB ?? 2380)],
    definedNames: [
      { name: 'conv', formula: 'Counts!$C$2:$C$3' },
      { name: 'visits', formula: 'Counts!$B$2:$B$3' },
    ],
    ...(options.calcChain ? { calcChain: true } : {}),
  };
}
