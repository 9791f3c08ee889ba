/**
 * The read-out block for revenue per visitor from totals, averages and counts per exposure (the
 * conversions block is formulas.ts's readoutBlock), and the guardrails any read-out may carry: for each
 * guardrail metric a column of "no worse than" probabilities beside the primary metric's results, its
 * limit and required probability as input cells, and a decision that says when the chosen variant fails a
 * guardrail. Pure functions from plain inputs to FormulaBlock data; every result is a live formula.
 */
import type { BlockStyle, CellValue, FormulaBlock } from '../workbook/workbook';
import { cellAddress, parseAddress, rangeAddress, referenceFrom } from '../workbook/address';
import { variantLetter } from '../../functions/sheet/labels';
import { at, blockGrid, numberLiteral, SRM_ALARM, WARNING_FILL, WARNING_TEXT, type LabelledBlock } from './formulas';
import { dataArgs, guardrailRows, MAX_GUARDRAILS, writeGuardrails, type Guardrail } from './guardrails';
import { KIND_SHORT, type MetricKind, type MetricRole } from './metrics';

/** The table's columns as local addresses of their data cells ("B4:B6"), by role. */
export interface MetricSource {
  /** The table's sheet, when the block may go on another sheet (its references are then qualified). */
  readonly sheet?: string;
  readonly namesRef: string | null;
  readonly refs: Readonly<Partial<Record<MetricRole, string>>>;
  readonly variants: number;
}

/** Settings of a metric read-out. */
export interface MetricSettings {
  readonly level: number;
  /**
   * The SRM p-value the core computes now from the units the split check counts (visitors, counts, or a
   * counts table's users or visitors column), for the warning fill; null when there are none.
   */
  readonly currentSrmPValue: number | null;
}

/** Width of the metric read-out's table (variant, 9 results), before the guardrail columns. */
const TABLE_WIDTH = 10;

/** The unit words of each kind's values and losses. */
const UNITS: Readonly<
  Record<Exclude<MetricKind, 'conversions'>, { value: string; loss: string; format: string; note: string }>
> = {
  revenue: {
    value: 'Revenue per visitor (observed)',
    loss: 'Expected loss (revenue per visitor)',
    format: '0.000',
    note:
      'Revenue per visitor = conversion rate × average order value, in the revenue column’s currency; expected loss is in that currency per visitor. ' +
      'Without order sd, order values are taken as exponential, which understates the spread when a few orders are very large.',
  },
  averages: {
    value: 'Mean (observed)',
    loss: 'Expected loss (metric units)',
    format: '0.000',
    note: 'Means and expected losses are in the metric’s own units; intervals come from Student t posteriors of each mean. Lift is relative to the control.',
  },
  counts: {
    value: 'Events per unit of exposure (observed)',
    loss: 'Expected loss (events per unit)',
    format: '0.0000',
    note: 'Rates are events per unit of exposure (Gamma posteriors with a flat prior); expected loss is in events per unit. Lift is relative to the control.',
  },
};

/** Columns the native chart covers, right of its table (one empty column between), and rows at least. */
const CHART_COLUMNS = 7;
const CHART_ROWS = 18;
/** The metric as the chart's titles name it. */
const CHART_NOUN: Readonly<Record<Exclude<MetricKind, 'conversions'>, string>> = {
  revenue: 'revenue per visitor',
  averages: 'the average',
  counts: 'the event rate',
};
/** Light grey for the chart's helper table (its #N/A cells only tell the chart to leave a point out). */
const HELPER_TEXT = '#7F7F7F';

/** Rows of the block above the chart table's title: the table, the settings, the split check, the guardrails. */
function chartTitleRow(variants: number, guardrails: number): number {
  return variants + 9 + (guardrails === 0 ? 0 : guardrailRows(guardrails) + 1);
}

/**
 * Size of the metric read-out block for k variants and g guardrails, with the lift-interval chart's table
 * and the chart beside it. Cost O(1).
 * @example metricReadoutArea(3, 1) //=> { rowCount: 33, columnCount: 12 }
 */
export function metricReadoutArea(variants: number, guardrails: number): { rowCount: number; columnCount: number } {
  const header = chartTitleRow(variants, guardrails) + 1;
  return {
    rowCount: header + Math.max(1 + 3 * (variants - 1) + 2, CHART_ROWS),
    columnCount: Math.max(TABLE_WIDTH + guardrails, variants + 2 + CHART_COLUMNS),
  };
}

/** The native chart a metric read-out places: its source table, where it goes, its words. */
export interface MetricChart {
  readonly source: string;
  readonly topLeft: string;
  readonly bottomRight: string;
  readonly title: string;
  readonly axisTitles: { readonly x: string; readonly y: string };
  /** The heights only place each challenger's line: the vertical axis carries no numbers. */
  readonly hideValueLabels: true;
}

/** A metric read-out block with its named cells and its chart. */
export interface MetricReadoutBlock extends LabelledBlock {
  readonly chart: MetricChart;
}

/**
 * The read-out block of revenue per visitor from totals, averages or counts per exposure: one row per
 * variant, its name beside its results — the observed value (revenue ÷ visitors, the mean, events ÷
 * exposure), the credible interval, P(beats control), P(highest), the lift interval and the expected loss
 * (all live spilling formulas of the kind's family), a note on the units, then the credible level, the
 * largest acceptable loss (1% of the control's observed value, in the metric's units), the kind's
 * *_DECISION, the split check (SRM on the visitors, the counts, or a counts table's users or visitors column;
 * for counts per exposure without one, a line saying none can be made from exposure alone) and the guardrails
 * (writeGuardrails). When the block goes on another sheet than the table, references name the table's
 * sheet. Cost O(variants + guardrails). Throws RangeError for fewer than 2 variants, the conversions kind
 * (formulas.ts's readoutBlock writes it), more than MAX_GUARDRAILS guardrails or a missing column.
 * @example metricReadoutBlock('revenue', source, { level: 0.95, currentSrmPValue: 0.5 }, [], 'G1').cells.decision //=> "H11"
 */
export function metricReadoutBlock(
  kind: MetricKind,
  source: MetricSource,
  settings: MetricSettings,
  guardrails: readonly Guardrail[],
  topLeft: string,
  sheet?: string,
): MetricReadoutBlock {
  if (kind === 'conversions') throw new RangeError('the conversions read-out is formulas.ts readoutBlock');
  const k = source.variants;
  if (!Number.isInteger(k) || k < 2) throw new RangeError('a read-out needs at least two variants');
  if (guardrails.length > MAX_GUARDRAILS) throw new RangeError(`at most ${MAX_GUARDRAILS} guardrails`);
  const units = UNITS[kind];
  const origin = parseAddress(topLeft).start;
  const area = metricReadoutArea(k, guardrails.length);
  const width = area.columnCount;
  const height = area.rowCount;
  const { cells, formats, put, formatColumn } = blockGrid(origin, height, width, k);
  const other = source.sheet !== undefined && sheet !== undefined && source.sheet !== sheet;
  const qualify = (local: string): string =>
    other ? referenceFrom(sheet as string, source.sheet as string, local) : local;
  const refs: Partial<Record<MetricRole, string>> = {};
  for (const [role, local] of Object.entries(source.refs) as [MetricRole, string][]) refs[role] = qualify(local);
  const ref = (role: MetricRole): string => {
    const r = refs[role];
    if (r === undefined) throw new RangeError(`the ${KIND_SHORT[kind]} read-out needs its ${role} column`);
    return r;
  };
  const item = (role: MetricRole, i: number): string => {
    const start = parseAddress(source.refs[role] as string).start;
    return qualify(cellAddress({ row: start.row + i, column: start.column }));
  };
  const noteRow = k + 2;
  const settingsRow = k + 4;
  const names: Record<string, string> = {};
  const level = at(origin, settingsRow, 1);
  const data = dataArgs(kind, ref);
  const sd = kind === 'revenue' && refs.orderSd !== undefined ? refs.orderSd : null;
  // Revenue's order_sd sits after the data and before level (REVENUE_INTERVAL(o, v, r, [order_sd], [level])).
  const withSd = kind === 'revenue' ? `,${sd ?? ''}` : '';
  const family = kind === 'revenue' ? 'REVENUE_' : kind === 'averages' ? 'MEAN_' : 'EVENTS_';
  const intervalName = kind === 'counts' ? 'EVENTS_RATE_INTERVAL' : `${family}INTERVAL`;

  put(0, 0, `Read-out (Lift Ledger): ${KIND_SHORT[kind]}`);
  const headers = [
    'Variant',
    units.value,
    'Interval low',
    'Interval high',
    'P(beats control)',
    'P(highest)',
    'Lift low',
    'Lift median',
    'Lift high',
    units.loss,
  ];
  headers.forEach((header, column) => put(1, column, header));
  const namesStart = parseAddress(source.namesRef ?? 'A1').start;
  for (let i = 0; i < k; i += 1) {
    put(
      2 + i,
      0,
      source.namesRef === null
        ? variantLetter(i)
        : `=${qualify(cellAddress({ row: namesStart.row + i, column: namesStart.column }))}`,
    );
    const observed =
      kind === 'revenue'
        ? `=${item('revenue', i)}/${item('visitors', i)}`
        : kind === 'averages'
          ? `=${item('mean', i)}`
          : `=${item('events', i)}/${item('exposure', i)}`;
    put(2 + i, 1, observed, units.format);
  }
  names.labels = rangeAddress({ row: origin.row + 2, column: origin.column }, k, 1);
  names.observed = at(origin, 2, 1);
  names.interval = put(2, 2, `=ABTEST.${intervalName}(${data}${withSd},${level})`);
  formatColumn(2, 2, units.format);
  formatColumn(2, 3, units.format);
  names.probAboveControl = put(2, 4, `=ABTEST.${family}PROB_ABOVE_CONTROL(${data}${sd === null ? '' : `,${sd}`})`);
  formatColumn(2, 4, '0.0%');
  names.probHighest = put(2, 5, `=ABTEST.${family}PROB_HIGHEST(${data}${sd === null ? '' : `,${sd}`})`);
  formatColumn(2, 5, '0.0%');
  names.liftInterval = put(2, 6, `=ABTEST.${family}LIFT_INTERVAL(${data}${withSd},${level})`);
  for (const c of [6, 7, 8]) formatColumn(2, c, '0.0%');
  names.expectedLoss = put(2, 9, `=ABTEST.${family}EXPECTED_LOSS(${data}${sd === null ? '' : `,${sd}`})`);
  formatColumn(2, 9, kind === 'counts' ? '0.000000' : '0.0000');
  names.note = put(noteRow, 0, units.note);

  put(settingsRow, 0, 'Credible level');
  names.level = put(settingsRow, 1, settings.level, '0%');
  put(settingsRow + 1, 0, `Largest expected loss you accept (${units.loss.replace(/^Expected loss \((.*)\)$/, '$1')})`);
  names.maxLoss = put(settingsRow + 1, 1, `=0.01*ABS(${names.observed})`, kind === 'counts' ? '0.000000' : '0.0000');
  put(settingsRow + 2, 0, 'Decision');
  names.decision = put(
    settingsRow + 2,
    1,
    `=ABTEST.${family}DECISION(${data}${withSd},${names.maxLoss},${names.labels})`,
  );
  const styles: BlockStyle[] = [
    { row: 0, column: 0, style: { bold: true } },
    { row: 1, column: 0, columnCount: TABLE_WIDTH + guardrails.length, style: { bold: true } },
    { row: settingsRow + 2, column: 0, columnCount: 2, style: { bold: true } },
  ];
  // The split check needs counts of assigned units (a chi-square goodness of fit treats each unit as one
  // draw with the planned shares). Revenue has its visitors, averages their counts. Counts per exposure have
  // one only when the table gives a units column (users or visitors; KIND_ROLES.counts' optional role): a
  // chi-square on the exposure itself (user-days, sessions, hours) is not valid — exposure sums unequal
  // amounts per unit, so its spread is far larger than a count's (false alarms), and its value changes with
  // the unit (hours instead of days multiplies the statistic by 24). Without a units column the block says so.
  const counted = kind === 'revenue' || kind === 'counts' ? refs.visitors : refs.count;
  if (counted === undefined || settings.currentSrmPValue === null) {
    names.srmMissing = put(
      settingsRow + 3,
      0,
      kind === 'counts'
        ? 'Split check: none from exposure alone (a chi-square on exposure is not valid). Add a column of users or visitors per variant to the table and insert the read-out again.'
        : 'Split check: check the split on the visitors',
    );
  } else {
    const units = kind === 'averages' ? 'counts' : kind === 'counts' ? 'users or visitors' : 'visitors';
    put(settingsRow + 3, 0, `Split check: SRM p-value on the ${units} (equal shares)`);
    names.srmPValue = put(settingsRow + 3, 1, `=ABTEST.SRM_PVALUE(${counted})`, '0.0000');
    names.srmVerdict = put(
      settingsRow + 3,
      2,
      `=IF(${names.srmPValue}<${numberLiteral(SRM_ALARM)},"split looks broken: check how visitors are assigned","split looks as planned")`,
    );
    if (settings.currentSrmPValue < SRM_ALARM) {
      styles.push({
        row: settingsRow + 3,
        column: 1,
        columnCount: 2,
        style: { fillColor: WARNING_FILL, fontColor: WARNING_TEXT, bold: true },
      });
    }
  }
  const writer = {
    put,
    formatColumn,
    rangeAt: (row: number, column: number, rows: number): string =>
      rangeAddress({ row: origin.row + row, column: origin.column + column }, rows, 1),
  };
  Object.assign(
    names,
    writeGuardrails(
      guardrails,
      refs,
      {
        headerRow: 1,
        variants: k,
        firstColumn: TABLE_WIDTH,
        settingsRow: settingsRow + 5,
        lossRange: rangeAddress({ row: origin.row + 2, column: origin.column + 9 }, k, 1),
        maxLoss: names.maxLoss,
        labels: names.labels,
        decision: names.decision,
        primary: KIND_SHORT[kind],
      },
      writer,
    ),
  );
  if (guardrails.length > 0) {
    styles.push({ row: settingsRow + 5 + 2 * guardrails.length, column: 0, columnCount: 2, style: { bold: true } });
  }
  // The chart: no core function gives these metrics' lift densities (LIFT_DENSITY is the conversions'), so it
  // draws what the block computes, each challenger's lift interval (low, median, high of the lift spill) as a
  // line at its own height, and a "No change" line at 0%. One table, the lift in the first column and one
  // column per series (as the conversions chart's LIFT_DENSITY table); =NA() leaves a point out of a line.
  const titleRow = chartTitleRow(k, guardrails.length);
  const headerRow = titleRow + 1;
  const zero = k;
  names.chartTitle = put(
    titleRow,
    0,
    'Lift intervals, for the chart: lift relative to the control (first column), each challenger’s low, median and high at its own height (#N/A leaves a point out)',
  );
  put(headerRow, 0, 'Lift');
  for (let i = 1; i < k; i += 1) put(headerRow, i, `=${at(origin, 2 + i, 0)}`);
  put(headerRow, zero, 'No change');
  const row = (r: number, x: CellValue, series: number, height: number): void => {
    put(headerRow + 1 + r, 0, x, '0.0%');
    for (let c = 1; c <= zero; c += 1) put(headerRow + 1 + r, c, c === series ? height : '=NA()', '0');
  };
  for (let i = 1; i < k; i += 1) {
    for (let j = 0; j < 3; j += 1) row(3 * (i - 1) + j, `=${at(origin, 2 + i, 6 + j)}`, i, k - i);
  }
  row(3 * (k - 1), 0, zero, 0);
  row(3 * (k - 1) + 1, 0, zero, k);
  const tableRows = 3 * (k - 1) + 2;
  styles.push(
    { row: titleRow, column: 0, style: { bold: true } },
    { row: headerRow, column: 0, columnCount: zero + 1, style: { bold: true } },
    { row: headerRow + 1, column: 0, rowCount: tableRows, columnCount: zero + 1, style: { fontColor: HELPER_TEXT } },
  );
  const chartLeft = origin.column + k + 2;
  const chart: MetricChart = {
    source: rangeAddress({ row: origin.row + headerRow, column: origin.column }, tableRows + 1, zero + 1),
    topLeft: cellAddress({ row: origin.row + headerRow, column: chartLeft }),
    bottomRight: cellAddress({ row: origin.row + headerRow + CHART_ROWS - 1, column: chartLeft + CHART_COLUMNS - 1 }),
    title: `Lift of ${CHART_NOUN[kind]} over the control: credible intervals`,
    axisTitles: {
      x: `Lift of ${CHART_NOUN[kind]} over the control (relative; 0% = no change)`,
      y: 'Challengers (low, median, high)',
    },
    hideValueLabels: true,
  };
  names.chartSource = chart.source;
  const block: FormulaBlock = {
    sheet,
    topLeft: cellAddress(origin),
    cells,
    numberFormats: formats,
    styles,
    area,
    autofit: { rows: k + 2 },
  };
  return { block, cells: names, chart };
}
