/**
 * The "Day by day" section's logic: reading a table of daily counts of a running test, the block of live
 * formulas it inserts (PROB_ABOVE_CONTROL_BY_DAY, SRM_PVALUE_BY_DAY, the plan's threshold as a line for the
 * chart, and whether the test may stop today), and the same verdict in words for the panel.
 *
 * The table: a header row, then one row per day; the first column names the day (a date or any label),
 * then one visitors column per variant (the control first), then one conversions column per variant in the
 * same order. Counts are of that day (not running totals); a row left blank is a day without data.
 * Pure functions.
 */
import { probAboveControlByDay, srmPValueByDay, MAX_DAYS } from '../../functions/stats/byDay';
import { MAX_VARIANTS } from '../../functions/stats/limits';
import type { CellValue, FormulaBlock, BlockStyle } from '../workbook/workbook';
import { cellAddress, parseAddress, quoteSheet, rangeAddress } from '../workbook/address';
import { DEFAULT_LOCALE, formatPercent, type NumberLocale } from './inputs';
import { thresholdText } from './looksPlan';

/** Below this the split check says the traffic split is broken (the read-out's own mark). */
export const SPLIT_ALARM = 0.001;

/** A daily table read from the sheet. */
export interface DailyTable {
  readonly names: readonly string[];
  /** One entry per data row: null for a blank day, else visitors and conversions per variant. */
  readonly days: readonly ({ readonly visitors: number[]; readonly conversions: number[] } | null)[];
  readonly dayLabels: readonly CellValue[];
}

export type DailyReading =
  { readonly ok: true; readonly table: DailyTable } | { readonly ok: false; readonly problems: string[] };

const isBlank = (v: CellValue | undefined): boolean => v === undefined || v === '' || v === null;

/**
 * Read a selected table of daily counts (header row first). Cost O(cells).
 * @example readDailyTable([['Day','A visitors','B visitors','A conversions','B conversions'],['Mon',400,410,20,25]]).ok //=> true
 */
export function readDailyTable(values: readonly (readonly CellValue[])[]): DailyReading {
  const problems: string[] = [];
  const header = values[0] ?? [];
  const width = header.length;
  const counts = width - 1;
  if (values.length < 2) return { ok: false, problems: ['select the header row and at least one day'] };
  if (counts < 4 || counts % 2 !== 0) {
    return {
      ok: false,
      problems: [
        'after the day column, the table needs one visitors column per variant and then one conversions column per ' +
          `variant (2 to ${MAX_VARIANTS} variants, the control first): an even number of columns, at least 4; ` +
          `this table has ${Math.max(0, counts)}`,
      ],
    };
  }
  const k = counts / 2;
  if (k > MAX_VARIANTS) return { ok: false, problems: [`at most ${MAX_VARIANTS} variants, got ${k}`] };
  if (values.length - 1 > MAX_DAYS)
    return { ok: false, problems: [`at most ${MAX_DAYS} days, got ${values.length - 1}`] };
  const names = Array.from({ length: k }, (_, i) => {
    const text = String(header[1 + i] ?? '').trim();
    const name = text.replace(/\s*visitors$/i, '').trim();
    return name === '' ? String.fromCharCode(65 + (i % 26)) : name;
  });
  const days: ({ visitors: number[]; conversions: number[] } | null)[] = [];
  const dayLabels: CellValue[] = [];
  values.slice(1).forEach((row, r) => {
    dayLabels.push(row[0] ?? '');
    const cells = row.slice(1, 1 + counts);
    if (cells.every((v) => isBlank(v))) {
      days.push(null);
      return;
    }
    const visitors: number[] = [];
    const conversions: number[] = [];
    cells.forEach((v, c) => {
      const where = `row ${r + 2}, column ${c + 2}`;
      if (typeof v !== 'number' || !Number.isInteger(v) || v < 0) {
        problems.push(`${where}: a whole number of at least 0 is needed, not ${JSON.stringify(v ?? '')}`);
        return;
      }
      (c < k ? visitors : conversions).push(v);
    });
    if (visitors.length === k && conversions.length === k) {
      conversions.forEach((x, i) => {
        if (x > visitors[i]!)
          problems.push(`row ${r + 2}: ${names[i]} has more conversions (${x}) than visitors (${visitors[i]})`);
      });
    }
    days.push({ visitors, conversions });
  });
  if (problems.length > 0) return { ok: false, problems: problems.slice(0, 5) };
  if (days.every((d) => d === null)) return { ok: false, problems: ['every day is blank'] };
  return { ok: true, table: { names, days, dayLabels } };
}

/** The verdict for today (the last day with data). */
export interface DailyVerdict {
  /** P(beats control) of each challenger on the running totals up to the last day with data. */
  readonly probabilities: readonly (number | null)[];
  /** The split check on the running visitor totals of that day. */
  readonly splitPValue: number | null;
  /** Index of the challenger with the highest P, or -1. */
  readonly best: number;
  readonly mayStop: boolean;
  readonly splitBroken: boolean;
  readonly text: string;
}

/**
 * Whether the test may stop today under its plan: a challenger is declared when its P(beats control) on the
 * running totals reaches the plan's threshold (the one THRESHOLD_FOR_LOOKS chose for the planned looks). A
 * split check below SPLIT_ALARM comes first: the counts are then not to be read. Cost: the by-day functions
 * once over the table (≤ 1 ms per day and variant in the bench).
 * Throws StatsError from the core for counts it rejects.
 */
export function dailyVerdict(
  table: DailyTable,
  threshold: number,
  locale: NumberLocale = DEFAULT_LOCALE,
): DailyVerdict {
  const rows = table.days.filter((d): d is { visitors: number[]; conversions: number[] } => d !== null);
  const probs = probAboveControlByDay(
    rows.map((d) => d.visitors.map((v, i) => ({ visitors: v, conversions: d.conversions[i]! }))),
  );
  const split = srmPValueByDay(rows.map((d) => d.visitors));
  const last = probs[probs.length - 1] ?? [];
  const splitPValue = split[split.length - 1] ?? null;
  let best = -1;
  last.forEach((p, j) => {
    if (p !== null && (best < 0 || p > (last[best] ?? -1))) best = j;
  });
  const splitBroken = splitPValue !== null && splitPValue < SPLIT_ALARM;
  const top = best >= 0 ? (last[best] as number) : null;
  const mayStop = !splitBroken && top !== null && top >= threshold;
  const pct = (x: number): string => formatPercent(x, locale);
  const name = best >= 0 ? table.names[best + 1] : '';
  let text: string;
  if (splitBroken) {
    text =
      `Do not stop on these numbers: the split check is ${splitPValue!.toPrecision(2)}, below 0.1%, so the traffic ` +
      `is not split as planned. Find out why before reading P(beats control).`;
  } else if (top === null) {
    text = 'No challenger has visitors yet.';
  } else if (mayStop) {
    text =
      `Under its plan the test may stop today: ${name} has P(beats control) = ${pct(top)}, at or above the plan's ` +
      `threshold of ${thresholdText(threshold, locale)} — provided today is one of the looks the plan counted.`;
  } else {
    text =
      `Keep the test running: the highest P(beats control) today is ${pct(top)} (${name}), below the plan's ` +
      `threshold of ${thresholdText(threshold, locale)}. Stop at the planned end whatever it shows.`;
  }
  return { probabilities: last, splitPValue, best, mayStop, splitBroken, text };
}

/** Where the daily table is on its sheet. */
export interface DailySource {
  readonly sheet?: string;
  /** Local address of the whole table, header row included. */
  readonly tableAddress: string;
  readonly names: readonly string[];
}

/** The block and the addresses of its parts. */
export interface DailyBlock {
  readonly block: FormulaBlock;
  readonly cells: {
    readonly threshold: string;
    readonly verdict: string;
    readonly firstProb: string;
    readonly split: string;
  };
  /** The chart's source: the header row and the day rows, day column to split-check column. */
  readonly chartSource: string;
  readonly chartTopLeft: string;
  readonly chartBottomRight: string;
}

/** Rows and columns of the block for a table of `days` days and `variants` variants. */
export function dailyArea(days: number, variants: number): { rowCount: number; columnCount: number } {
  return { rowCount: days + 6, columnCount: variants + 2 };
}

/**
 * The block of live formulas: a header, one row per day (the day's label, P(beats control) of each
 * challenger spilled by PROB_ABOVE_CONTROL_BY_DAY, the plan's threshold, the split check spilled by
 * SRM_PVALUE_BY_DAY), then the threshold cell, a verdict formula and a caution. Cost O(days × variants).
 * @example dailyBlock({ tableAddress: 'A1:E8', names: ['A', 'B'] }, 0.99, 'G1').cells.threshold //=> 'H10'
 */
export function dailyBlock(source: DailySource, threshold: number, topLeft: string, sheet?: string): DailyBlock {
  const table = parseAddress(source.tableAddress);
  const k = source.names.length;
  const days = table.end.row - table.start.row;
  const first = table.start.row + 1;
  const ref = (row: number, column: number, rows = 1, columns = 1): string => {
    const local =
      rows === 1 && columns === 1 ? cellAddress({ row, column }) : rangeAddress({ row, column }, rows, columns);
    return source.sheet !== undefined && source.sheet !== sheet ? `${quoteSheet(source.sheet)}!${local}` : local;
  };
  const visitors = ref(first, table.start.column + 1, days, k);
  const conversions = ref(first, table.start.column + 1 + k, days, k);
  const origin = parseAddress(topLeft).start;
  const columns = k + 2;
  const at = (r: number, c: number): string => cellAddress({ row: origin.row + r, column: origin.column + c });
  const abs = (address: string): string => address.replace(/^([A-Z]+)(\d+)$/, '$$$1$$$2');
  const thresholdRow = days + 3; // title, header, the days, a blank row
  const thresholdCell = at(thresholdRow, 1);
  const cells: CellValue[][] = [];
  const formats: (string | null)[][] = [];
  const blankRow = (): CellValue[] => Array<CellValue>(columns).fill('');
  cells.push(['Day by day (Lift Ledger)', ...Array<CellValue>(columns - 1).fill('')]);
  cells.push([
    'Day',
    ...source.names.slice(1).map((n) => `P(${n} beats control)`),
    "Plan's threshold",
    'Split check p-value',
  ]);
  formats.push(Array(columns).fill(null), Array(columns).fill(null));
  for (let d = 0; d < days; d++) {
    const row = blankRow();
    row[0] = `=IF(${ref(first + d, table.start.column)}="","",${ref(first + d, table.start.column)})`;
    if (d === 0) {
      row[1] = `=ABTEST.PROB_ABOVE_CONTROL_BY_DAY(${conversions},${visitors})`;
      row[k + 1] = `=ABTEST.SRM_PVALUE_BY_DAY(${visitors})`;
    }
    row[k] = `=${abs(thresholdCell)}`;
    cells.push(row);
    formats.push([null, ...Array(k - 1).fill('0.0%'), '0.0%', '0.0000']);
  }
  cells.push(blankRow());
  formats.push(Array(columns).fill(null));
  const thresholdLine = blankRow();
  thresholdLine[0] = "Plan's threshold: P(beats control) at each look";
  thresholdLine[1] = threshold;
  cells.push(thresholdLine);
  formats.push([null, '0.00%', ...Array(columns - 2).fill(null)]);
  // The verdict reads the last row of the table (a blank last day reads as "keep it running").
  const lastProbs = k > 2 ? `${at(days + 1, 1)}:${at(days + 1, k - 1)}` : at(days + 1, 1);
  const lastSplit = at(days + 1, k + 1);
  const verdict = blankRow();
  verdict[0] = 'May the test stop today?';
  verdict[1] =
    `=IF(AND(ISNUMBER(${lastSplit}),${lastSplit}<${SPLIT_ALARM}),"No: the split check is below 0.1%",` +
    `IF(MAX(${lastProbs})>=${thresholdCell},` +
    `"Yes, if today is a planned look: a challenger reached the threshold","No: keep it running"))`;
  cells.push(verdict);
  formats.push(Array(columns).fill(null));
  const note = blankRow();
  note[0] =
    'Declare only at the looks the plan counted, at its threshold; a split check below 0.1% means the traffic ' +
    'split is broken. Counts are per day; the functions add them up.';
  cells.push(note);
  formats.push(Array(columns).fill(null));
  const styles: BlockStyle[] = [
    { row: 0, column: 0, style: { bold: true } },
    { row: 1, column: 0, columnCount: columns, style: { bold: true } },
    { row: thresholdRow, column: 0, rowCount: 2, style: { bold: true } },
  ];
  return {
    block: {
      sheet,
      topLeft: cellAddress(origin),
      cells,
      numberFormats: formats,
      styles,
      autofit: { rows: days + 2 },
    },
    cells: { threshold: thresholdCell, verdict: at(thresholdRow + 1, 1), firstProb: at(2, 1), split: at(2, k + 1) },
    chartSource: `${at(1, 0)}:${at(days + 1, k + 1)}`,
    chartTopLeft: at(0, columns + 1),
    chartBottomRight: at(18, columns + 8),
  };
}
