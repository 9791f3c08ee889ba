/**
 * Formula builders: the live =ABTEST.… formulas and labelled blocks the side panel writes. Pure
 * functions from plain inputs to FormulaBlock data; nothing here touches the workbook or the DOM.
 * The panel writes formulas, never pasted numbers, so a workbook keeps computing without the panel.
 */
import type { BlockStyle, CellValue, FormulaBlock } from '../workbook/workbook';
import { cellAddress, parseAddress, rangeAddress, referenceFrom, type CellPosition } from '../workbook/address';
import { PLAN_THRESHOLD_SOURCE, type ThresholdSource } from './plan';
import { variantLetter } from '../../functions/sheet/labels';
import { guardrailRows, MAX_GUARDRAILS, writeGuardrails, type Guardrail } from './guardrails';
import type { MetricRole } from './metrics';

/** Warning fill and text colours for a split that looks broken. */
export const WARNING_FILL = '#F4CCCC';
export const WARNING_TEXT = '#9C0006';
/** The SRM p-value below which a split is treated as broken (common practice; see Fabijan et al., KDD 2019). */
export const SRM_ALARM = 0.001;

/**
 * A number as formula text: the shortest text that reads back as the same double (JavaScript's
 * round-trip rule), which Excel parses as the same number. Cost O(1). Throws RangeError for NaN/±∞.
 * @example numberLiteral(0.04) //=> "0.04"; numberLiteral(1e-7) //=> "1E-7"
 */
export function numberLiteral(x: number): string {
  if (!Number.isFinite(x)) throw new RangeError(`${x} cannot be written into a formula`);
  return String(x).replace('e', 'E').replace('E+', 'E');
}

/**
 * A text as a formula string literal, with inner double quotes doubled. Cost O(length).
 * @example textLiteral('say "hi"') //=> '"say ""hi"""'
 */
export function textLiteral(text: string): string {
  return `"${text.replace(/"/g, '""')}"`;
}

/** How the user chose a prior. References are as the formula's own sheet should write them. */
export type PriorChoice =
  | { readonly kind: 'mean'; readonly meanRate: number; readonly strength: number }
  | { readonly kind: 'interval'; readonly low: number; readonly high: number; readonly level: number }
  | {
      readonly kind: 'history';
      readonly conversionsRef: string;
      readonly visitorsRef: string;
      readonly method: 'likelihood' | 'moments';
    };

/**
 * The =ABTEST.PRIOR_FROM_… formula for a prior choice (it spills alpha, beta into one row). Optional
 * arguments at their catalogue default are left out. Cost O(1).
 * @example priorFormula({ kind: 'mean', meanRate: 0.04, strength: 500 }) //=> "=ABTEST.PRIOR_FROM_MEAN(0.04,500)"
 */
export function priorFormula(choice: PriorChoice): string {
  switch (choice.kind) {
    case 'mean':
      return `=ABTEST.PRIOR_FROM_MEAN(${numberLiteral(choice.meanRate)},${numberLiteral(choice.strength)})`;
    case 'interval': {
      const level = choice.level === 0.9 ? '' : `,${numberLiteral(choice.level)}`;
      return `=ABTEST.PRIOR_FROM_INTERVAL(${numberLiteral(choice.low)},${numberLiteral(choice.high)}${level})`;
    }
    case 'history': {
      const method = choice.method === 'likelihood' ? '' : `,${textLiteral(choice.method)}`;
      return `=ABTEST.PRIOR_FROM_HISTORY(${choice.conversionsRef},${choice.visitorsRef}${method})`;
    }
  }
}

/**
 * The block "Write to sheet" puts at the selected cell: the prior formula, with room for its two-cell
 * spill (alpha, beta). Cost O(1).
 * @example priorBlock({ kind: 'mean', meanRate: 0.04, strength: 500 }, "F2").area //=> { rowCount: 1, columnCount: 2 }
 */
export function priorBlock(choice: PriorChoice, topLeft: string, sheet?: string): FormulaBlock {
  return {
    sheet,
    topLeft,
    cells: [[priorFormula(choice)]],
    numberFormats: [['0.000']],
    area: { rowCount: 1, columnCount: 2 },
  };
}

/** What the Plan section asks for. Rates and lifts are fractions. */
export interface PlanInputs {
  readonly baselineRate: number;
  readonly lift: number;
  readonly threshold: number;
  readonly power: number;
  readonly variants: number;
  readonly dailyVisitors: number;
  readonly trafficShare: number;
  /** Two-sided significance level of the classic z-test shown for comparison. */
  readonly classicAlpha: number;
  /** A Beta prior for the planning calculation; omitted means the uniform default. */
  readonly prior?: { readonly alpha: number; readonly beta: number };
}

/** Where a result of a written block lives, for tests and for the panel to point at. */
export interface BlockCells {
  readonly [name: string]: string;
}

/** A FormulaBlock plus the local addresses of its named cells. */
export interface LabelledBlock {
  readonly block: FormulaBlock;
  readonly cells: BlockCells;
}

export function at(origin: CellPosition, row: number, column: number): string {
  return cellAddress({ row: origin.row + row, column: origin.column + column });
}

/** A block under construction: the contents and number formats of its cells, counted from its top-left cell. */
export interface BlockGrid {
  readonly cells: CellValue[][];
  readonly formats: (string | null)[][];
  /** Sets one cell and its number format; returns the cell's address. */
  put(row: number, column: number, value: CellValue, format?: string | null): string;
  /** Gives `rows` cells of a column, from `row` down, one number format (a column of per-variant results). */
  formatColumn(row: number, column: number, format: string): void;
}

/**
 * An empty height × width block at `origin`, whose per-variant columns are `rows` tall.
 * Cost O(height · width). Never throws.
 */
export function blockGrid(origin: CellPosition, height: number, width: number, rows: number): BlockGrid {
  const cells: CellValue[][] = Array.from({ length: height }, () => Array.from({ length: width }, () => ''));
  const formats: (string | null)[][] = Array.from({ length: height }, () => Array.from({ length: width }, () => null));
  return {
    cells,
    formats,
    put: (row, column, value, format = null) => {
      (cells[row] as CellValue[])[column] = value;
      (formats[row] as (string | null)[])[column] = format;
      return at(origin, row, column);
    },
    formatColumn: (row, column, format) => {
      for (let r = row; r < row + rows; r += 1) (formats[r] as (string | null)[])[column] = format;
    },
  };
}

/**
 * The "Insert plan" block: a title, the inputs as labelled constant cells (rates, threshold, power and
 * levels all as percents), and the results as live formulas that refer to those cells — the threshold each
 * challenger must reach (from `source`, default the plan's threshold source), visitors per variant
 * =ABTEST.VISITORS_NEEDED(…) at that threshold, total visitors, whole weeks and days to run, and the
 * classic z-test size =ABTEST.CLASSIC_SAMPLE_SIZE(…) at the significance level split the same way. Two
 * columns (label, value). Cost O(1).
 * @example planBlock(inputs, "A1").cells.visitorsPerVariant //=> "B12"
 */
export function planBlock(
  inputs: PlanInputs,
  topLeft: string,
  sheet?: string,
  source: ThresholdSource = PLAN_THRESHOLD_SOURCE,
): LabelledBlock {
  const origin = parseAddress(topLeft).start;
  const rows: [string, CellValue, string | null][] = [];
  const names: Record<string, string> = {};
  const add = (name: string, label: string, value: CellValue, format: string | null): string => {
    const address = at(origin, rows.length, 1);
    names[name] = address;
    rows.push([label, value, format]);
    return address;
  };
  rows.push(['Test plan (Lift Ledger)', '', null]);
  const base = add('baselineRate', 'Baseline conversion rate', inputs.baselineRate, '0.00%');
  const lift = add('lift', 'Smallest lift worth detecting (relative)', inputs.lift, '0.0%');
  const threshold = add('threshold', 'Decision threshold: P(beats control) at least', inputs.threshold, '0.0%');
  const power = add('power', 'Target decision power', inputs.power, '0.0%');
  const variants = add('variants', 'Variants, control included', inputs.variants, '0');
  const daily = add('dailyVisitors', 'Visitors per day to the page', inputs.dailyVisitors, '#,##0');
  const share = add('trafficShare', 'Share of those visitors in the test', inputs.trafficShare, '0%');
  const alpha = add('classicAlpha', 'Classic test: significance level (two-sided)', inputs.classicAlpha, '0.0%');
  let priorArgs = '';
  if (inputs.prior) {
    const a = add('priorAlpha', 'Prior alpha', inputs.prior.alpha, '0.000');
    const b = add('priorBeta', 'Prior beta', inputs.prior.beta, '0.000');
    priorArgs = `,${a},${b}`;
  }
  const perChallenger = add(
    'perChallengerThreshold',
    `Threshold each challenger must reach (${source.label})`,
    `=${source.formula(threshold, variants)}`,
    '0.00%',
  );
  const perVariant = add(
    'visitorsPerVariant',
    'Visitors needed per variant',
    `=ABTEST.VISITORS_NEEDED(${base},${lift},${perChallenger},${power}${priorArgs})`,
    '#,##0',
  );
  const total = add('totalVisitors', 'Visitors needed in total', `=${perVariant}*${variants}`, '#,##0');
  const weeks = add('weeks', 'Weeks to run (whole weeks)', `=MAX(1,ROUNDUP(${total}/(${daily}*${share})/7,0))`, '0');
  add('days', 'Days to run (whole weeks)', `=7*${weeks}`, '0');
  add(
    'classicPerVariant',
    'Classic z-test size per variant (for comparison, level split the same way)',
    `=ABTEST.CLASSIC_SAMPLE_SIZE(${base},${lift},${alpha}/MAX(1,${variants}-1),${power},2)`,
    '#,##0',
  );
  const styles: BlockStyle[] = [{ row: 0, column: 0, style: { bold: true } }];
  const resultRow = rows.findIndex(([label]) => label === 'Visitors needed per variant');
  styles.push({ row: resultRow, column: 0, rowCount: rows.length - resultRow, columnCount: 2, style: { bold: true } });
  return {
    block: {
      sheet,
      topLeft: cellAddress(origin),
      cells: rows.map(([label, value]) => [label, value]),
      numberFormats: rows.map(([, , format]) => [null, format]),
      styles,
      autofit: true,
    },
    cells: names,
  };
}

/** Where the variant table is and which of its columns is which (all on one sheet, one row per variant). */
export interface ReadoutSource {
  /** The table's sheet, when the read-out may go on another sheet (its references are then qualified). */
  readonly sheet?: string;
  /** Local address of the names column's data cells ("A2:A4"), or null to call them A, B, C… */
  readonly namesRef: string | null;
  readonly visitorsRef: string;
  readonly conversionsRef: string;
  /** Local address of the planned shares column's data cells, or null for equal shares. */
  readonly sharesRef: string | null;
  /** Number of variants (data rows). */
  readonly variants: number;
  /** The table's other columns by role (local addresses of their data cells), for guardrails on other metrics. */
  readonly refs?: Readonly<Partial<Record<MetricRole, string>>>;
}

/** Settings written as input cells of the read-out block. */
export interface ReadoutSettings {
  readonly level: number;
  readonly prior: { readonly alpha: number; readonly beta: number };
  /** Rows of the density table for the chart (LIFT_DENSITY's `points`). */
  readonly densityPoints: number;
  /**
   * The SRM p-value as the core computes it from the visitors read now, used only to set the warning
   * fill (the warning text itself is a formula that follows the live value).
   */
  readonly currentSrmPValue: number;
}

/** The read-out block with its named cells and the local address of the chart's source block. */
export interface ReadoutBlock extends LabelledBlock {
  readonly chartSource: string;
  readonly chartTopLeft: string;
  readonly chartBottomRight: string;
}

/** What the expected-loss column means, written under the table (the loss is a difference of rates, not a relative change). */
export const LOSS_NOTE =
  'Expected loss is in conversion-rate points: 0.300% means choosing that variant gives up 0.3 percentage points ' +
  'of conversion rate on average (a 5.0% rate would become 4.7%), not 0.3% of the rate. Lift is relative to the control.';

/** Width of the read-out's table (variant, 9 results), before any guardrail columns. */
const READOUT_WIDTH = 10;
/** Columns the native chart covers, right of the density table (one empty column between). */
const CHART_COLUMNS = 7;

/** Rows between the split check and the density table's title: the guardrails' rows and a spare row. */
function guardrailBand(guardrails: number): number {
  return guardrails === 0 ? 0 : guardrailRows(guardrails) + 1;
}

/**
 * Size of the read-out block's area (cells, spill room and the chart it places) for k variants and g
 * guardrails. Cost O(1).
 * @example readoutArea(3, 61) //=> { rowCount: 77, columnCount: 11 }
 */
export function readoutArea(
  variants: number,
  densityPoints: number,
  guardrails = 0,
): { rowCount: number; columnCount: number } {
  return {
    rowCount: variants + 13 + densityPoints + guardrailBand(guardrails),
    columnCount: Math.max(READOUT_WIDTH + guardrails, variants + 1 + CHART_COLUMNS),
  };
}

/**
 * The "Insert read-out" block: one row per variant, its name beside its results — posterior mean,
 * credible interval, P(beats control), P(highest), lift interval and expected loss (all spilling live
 * formulas) — a note on the units, then the inputs (level, prior, largest acceptable loss), the
 * DECISION, the SRM p-value with a formula-driven warning text (and a warning fill when the current
 * value is below 0.001), and a LIFT_DENSITY table headed by the challengers' names for the native chart,
 * which sits right of it inside the block's area. Rates and losses are shown as percentages of visitors,
 * lifts as relative changes, densities as plain numbers. Guardrails (guardrails.ts) add a column each
 * beside the results and their rows with a "Decision with guardrails" below the split check. When the
 * block goes on another sheet than the table (`sheet` ≠ `source.sheet`), its references name the table's
 * sheet. Cost O(variants + points + guardrails).
 * Throws RangeError for fewer than 2 variants, a density table under 3 points, more than MAX_GUARDRAILS
 * guardrails or a guardrail whose columns are not in source.refs.
 * @example readoutBlock(source, settings, "F1").cells.decision //=> "G12" (for three variants)
 */
export function readoutBlock(
  source: ReadoutSource,
  settings: ReadoutSettings,
  topLeft: string,
  sheet?: string,
  guardrails: readonly Guardrail[] = [],
): ReadoutBlock {
  const k = source.variants;
  if (!Number.isInteger(k) || k < 2) throw new RangeError('a read-out needs at least two variants');
  if (guardrails.length > MAX_GUARDRAILS) throw new RangeError(`at most ${MAX_GUARDRAILS} guardrails`);
  if (!Number.isInteger(settings.densityPoints) || settings.densityPoints < 3) {
    throw new RangeError('the density table needs at least 3 points');
  }
  const origin = parseAddress(topLeft).start;
  const width = Math.max(READOUT_WIDTH + guardrails.length, k);
  const noteRow = k + 2;
  const settingsRow = k + 4;
  const densityTitleRow = settingsRow + 7 + guardrailBand(guardrails.length);
  const densityHeaderRow = densityTitleRow + 1;
  const height = densityHeaderRow + 1 + settings.densityPoints;
  const { cells, formats, put, formatColumn } = blockGrid(origin, height, width, k);
  // References to the table, qualified when the block is on another sheet.
  const other = source.sheet !== undefined && sheet !== undefined && source.sheet !== sheet;
  const ref = (local: string): string =>
    other ? referenceFrom(sheet as string, source.sheet as string, local) : local;

  const level = at(origin, settingsRow, 1);
  const alpha = at(origin, settingsRow + 1, 1);
  const beta = at(origin, settingsRow + 2, 1);
  const conv = ref(source.conversionsRef);
  const vis = ref(source.visitorsRef);
  const prior = `,${alpha},${beta}`;
  const names: Record<string, string> = {};

  put(0, 0, 'Read-out (Lift Ledger)');
  const headers = [
    'Variant',
    'Posterior mean',
    'Interval low',
    'Interval high',
    'P(beats control)',
    'P(highest)',
    'Lift low',
    'Lift median',
    'Lift high',
    'Expected loss (rate points)',
  ];
  headers.forEach((header, column) => put(1, column, header));
  const namesStart = parseAddress(source.namesRef ?? 'A1').start;
  for (let i = 0; i < k; i += 1) {
    const value =
      source.namesRef === null
        ? variantLetter(i)
        : `=${ref(cellAddress({ row: namesStart.row + i, column: namesStart.column }))}`;
    put(2 + i, 0, value);
  }
  const labels = rangeAddress({ row: origin.row + 2, column: origin.column }, k, 1);
  names.labels = labels;
  names.posteriorMean = put(2, 1, `=ABTEST.POSTERIOR_MEAN(${conv},${vis}${prior})`);
  formatColumn(2, 1, '0.00%');
  names.rateInterval = put(2, 2, `=ABTEST.RATE_INTERVAL(${conv},${vis},${level}${prior})`);
  formatColumn(2, 2, '0.00%');
  formatColumn(2, 3, '0.00%');
  names.probAboveControl = put(2, 4, `=ABTEST.PROB_ABOVE_CONTROL(${conv},${vis}${prior})`);
  formatColumn(2, 4, '0.0%');
  names.probHighest = put(2, 5, `=ABTEST.PROB_HIGHEST(${conv},${vis}${prior})`);
  formatColumn(2, 5, '0.0%');
  names.liftInterval = put(2, 6, `=ABTEST.LIFT_INTERVAL(${conv},${vis},${level}${prior})`);
  formatColumn(2, 6, '0.0%');
  formatColumn(2, 7, '0.0%');
  formatColumn(2, 8, '0.0%');
  names.expectedLoss = put(2, 9, `=ABTEST.EXPECTED_LOSS(${conv},${vis}${prior})`);
  formatColumn(2, 9, '0.000%');
  names.note = put(noteRow, 0, LOSS_NOTE);

  put(settingsRow, 0, 'Credible level');
  names.level = put(settingsRow, 1, settings.level, '0%');
  put(settingsRow + 1, 0, 'Prior alpha');
  names.priorAlpha = put(settingsRow + 1, 1, settings.prior.alpha, '0.000');
  put(settingsRow + 2, 0, 'Prior beta');
  names.priorBeta = put(settingsRow + 2, 1, settings.prior.beta, '0.000');
  put(settingsRow + 3, 0, 'Largest expected loss you accept (rate points)');
  const controlMean = at(origin, 2, 1);
  names.maxLoss = put(settingsRow + 3, 1, `=0.01*${controlMean}`, '0.000%');
  put(settingsRow + 4, 0, 'Decision');
  names.decision = put(settingsRow + 4, 1, `=ABTEST.DECISION(${conv},${vis},${names.maxLoss},${labels}${prior})`);
  put(
    settingsRow + 5,
    0,
    source.sharesRef === null ? 'Split check: SRM p-value (equal shares)' : 'Split check: SRM p-value (planned shares)',
  );
  const shares = source.sharesRef === null ? '' : `,${ref(source.sharesRef)}`;
  names.srmPValue = put(settingsRow + 5, 1, `=ABTEST.SRM_PVALUE(${vis}${shares})`, '0.0000');
  names.srmVerdict = put(
    settingsRow + 5,
    2,
    `=IF(${names.srmPValue}<${numberLiteral(SRM_ALARM)},"split looks broken: check how visitors are assigned","split looks as planned")`,
  );

  const guardrailRefs: Partial<Record<MetricRole, string>> = {};
  for (const [role, local] of Object.entries(source.refs ?? {}) as [MetricRole, string][])
    guardrailRefs[role] = ref(local);
  Object.assign(
    names,
    writeGuardrails(
      guardrails,
      { ...guardrailRefs, conversions: conv, visitors: vis },
      {
        headerRow: 1,
        variants: k,
        firstColumn: READOUT_WIDTH,
        settingsRow: settingsRow + 7,
        lossRange: rangeAddress({ row: origin.row + 2, column: origin.column + 9 }, k, 1),
        maxLoss: names.maxLoss,
        labels,
        decision: names.decision,
        primary: 'conversions',
      },
      {
        put,
        formatColumn,
        rangeAt: (row, column, rows) =>
          rangeAddress({ row: origin.row + row, column: origin.column + column }, rows, 1),
      },
    ),
  );

  put(
    densityTitleRow,
    0,
    'Lift densities, for the chart: lift relative to the control (first column), density of each challenger',
  );
  names.densityHeader = put(densityHeaderRow, 0, 'Lift');
  for (let i = 1; i < k; i += 1) {
    put(densityHeaderRow, i, `=${cellAddress({ row: origin.row + 2 + i, column: origin.column })}`);
  }
  names.liftDensity = put(
    densityHeaderRow + 1,
    0,
    `=ABTEST.LIFT_DENSITY(${conv},${vis},${settings.densityPoints}${prior})`,
  );
  // The lift column as a percentage; the densities beside it as plain numbers (a density is not a share).
  for (let r = densityHeaderRow + 1; r < height; r += 1) {
    (formats[r] as (string | null)[])[0] = '0.0%';
    for (let c = 1; c < k; c += 1) (formats[r] as (string | null)[])[c] = '0.00';
  }

  const styles: BlockStyle[] = [
    { row: 0, column: 0, style: { bold: true } },
    { row: 1, column: 0, columnCount: READOUT_WIDTH + guardrails.length, style: { bold: true } },
    { row: settingsRow + 4, column: 0, columnCount: 2, style: { bold: true } },
    ...(guardrails.length === 0
      ? []
      : [{ row: settingsRow + 7 + 2 * guardrails.length, column: 0, columnCount: 2, style: { bold: true } }]),
    { row: densityTitleRow, column: 0, style: { bold: true } },
    { row: densityHeaderRow, column: 0, columnCount: k, style: { bold: true } },
  ];
  if (settings.currentSrmPValue < SRM_ALARM) {
    styles.push({
      row: settingsRow + 5,
      column: 1,
      columnCount: 2,
      style: { fillColor: WARNING_FILL, fontColor: WARNING_TEXT, bold: true },
    });
  }

  const chartSource = rangeAddress(
    { row: origin.row + densityHeaderRow, column: origin.column },
    settings.densityPoints + 1,
    k,
  );
  const chartLeft = origin.column + k + 1;
  const chartTopLeft = cellAddress({ row: origin.row + densityHeaderRow, column: chartLeft });
  const chartBottomRight = cellAddress({
    row: origin.row + Math.min(height - 1, densityHeaderRow + 16),
    column: chartLeft + CHART_COLUMNS - 1,
  });
  names.chartSource = chartSource;
  return {
    block: {
      sheet,
      topLeft: cellAddress(origin),
      cells,
      numberFormats: formats,
      styles,
      area: readoutArea(k, settings.densityPoints, guardrails.length),
      // Fit the columns to the table's title, headers and variant rows, not to the long note and titles below.
      autofit: { rows: k + 2 },
    },
    cells: names,
    chartSource,
    chartTopLeft,
    chartBottomRight,
  };
}
