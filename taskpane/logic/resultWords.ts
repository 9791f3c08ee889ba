/**
 * What a result says, in words a marketer reads without the method: "Orange button has an 86% chance of
 * the highest conversion rate", "Choosing Green button gives up 0.51 percentage points on average". Also
 * what an error value in a cell means, and how to find the formula a spilled cell belongs to. Pure
 * functions over the values the Explain section reads from the sheet.
 */
import type { CellValue } from '../workbook/workbook';
import { parseAddress, type CellPosition } from '../workbook/address';
import { parseAbtestCall } from './explain';
import { findFunction } from '../../functions/catalogue';
import type { SpillShape } from '../../functions/sheet/entry';
import { POINTS } from '../../functions/sheet/rules';
import { DEFAULT_LOCALE, formatCount, formatPercent, type NumberLocale } from './inputs';

/** How a function's result fills the sheet: the function catalogue's spill shape. */
export type ResultShape = SpillShape;

/**
 * The result shape of a function, from the function catalogue; undefined for a name it does not have.
 * Cost O(functions).
 * @example resultShapeOf('LIFT_INTERVAL') //=> { kind: 'perVariant', width: 3, versusControl: true }
 */
export function resultShapeOf(name: string): ResultShape | undefined {
  return findFunction(name)?.spill;
}

/** The default number of rows of a chart table (the catalogue's `points` default). */
export const DEFAULT_POINTS: number = POINTS.default;

/** The size in cells of a result, from its shape and the size of its first data range. */
export interface ResultSize {
  readonly rows: number;
  readonly columns: number;
  /** The data ran along a row (results spill along the row too). */
  readonly alongRow: boolean;
}

/**
 * The cells a result fills. `data` is the size of the first data range (variants along a row or a
 * column); `points` the chart table's rows when given. Cost O(1).
 * @example resultSize({ kind: 'perVariant', width: 3, versusControl: true }, { rows: 3, columns: 1 }) //=> { rows: 3, columns: 3, alongRow: false }
 */
export function resultSize(shape: ResultShape, data: { rows: number; columns: number }, points?: number): ResultSize {
  const alongRow = data.rows === 1 && data.columns > 1;
  const variants = data.rows * data.columns;
  switch (shape.kind) {
    case 'perVariant':
      return alongRow
        ? { rows: shape.width, columns: variants, alongRow }
        : { rows: variants, columns: shape.width, alongRow };
    case 'fixed':
      return { rows: shape.rows, columns: shape.columns, alongRow: false };
    case 'one':
      return { rows: 1, columns: 1, alongRow: false };
    case 'densityTable': {
      const rows = points !== undefined && Number.isInteger(points) && points >= 2 ? points : DEFAULT_POINTS;
      return { rows, columns: 1 + Math.max(1, variants - (shape.series === 'challenger' ? 1 : 0)), alongRow: false };
    }
    case 'byDay':
      // One row per day of the day table; one column per challenger, or one column of daily values.
      return {
        rows: data.rows,
        columns: shape.per === 'challenger' ? Math.max(1, data.columns - 1) : 1,
        alongRow: false,
      };
  }
}

/** The values of variant `i` in a per-variant result (its row for column data, its column for row data). */
export function variantValues(values: readonly (readonly CellValue[])[], i: number, alongRow: boolean): CellValue[] {
  if (alongRow) return values.map((row) => row[i] ?? '');
  return [...(values[i] ?? [])];
}

/** "86%", "less than 1%", "more than 99%" for a probability. */
export function chanceText(p: number, locale: NumberLocale = DEFAULT_LOCALE): string {
  if (p < 0.005) return 'less than 1%';
  if (p > 0.995) return 'more than 99%';
  return `${formatCount(p * 100, locale)}%`;
}

/** "a" or "an" before a number as spoken in English ("an 86% chance", "an 11% chance", "a 96% chance"). */
export function articleFor(text: string): 'a' | 'an' {
  return /^(8|11(\D|$)|18(\D|$))/.test(text) ? 'an' : 'a';
}

/**
 * "an 86% chance", "more than a 99% chance", "less than a 1% chance". Cost O(1).
 * @example chancePhrase(0.856) //=> "an 86% chance"
 */
export function chancePhrase(p: number, locale: NumberLocale = DEFAULT_LOCALE): string {
  if (p < 0.005) return 'less than a 1% chance';
  if (p > 0.995) return 'more than a 99% chance';
  const text = chanceText(p, locale);
  return `${articleFor(text)} ${text} chance`;
}

/** A level as a marketer says it: "95%", "97.5%". */
function levelWords(level: number, locale: NumberLocale): string {
  return `${plain(level * 100, locale)}%`;
}

/** "+12.3%" / "−4.10%" for a relative lift given as a fraction. */
function signed(fraction: number, locale: NumberLocale): string {
  const text = formatPercent(Math.abs(fraction), locale);
  return fraction > 0 ? `+${text}` : fraction < 0 ? `−${text}` : text;
}

/** A rate difference in percentage points ("+0.45 percentage points"). */
function points(difference: number, locale: NumberLocale, sign = true): string {
  const text = formatPercent(Math.abs(difference), locale).replace('%', '');
  const prefix = sign ? (difference > 0 ? '+' : difference < 0 ? '−' : '') : '';
  return `${prefix}${text} percentage ${text === '1' || text === '1.00' || text === '1,00' ? 'point' : 'points'}`;
}

/** A plain number with up to 4 significant digits in the user's way ("3.42", "0,0512"). */
function plain(x: number, locale: NumberLocale): string {
  const text = String(Number(x.toPrecision(4)));
  return locale.decimal === ',' ? text.replace('.', ',') : text;
}

/** Whether a variant's name already says it is the control ("Green button (control)", "Control"). */
function saysControl(name: string): boolean {
  return /\bcontrol\b/i.test(name);
}

/**
 * How a list names a variant: the control's name says "(control)" once, never twice. Cost O(length).
 * @example variantLabel('Green button', 0) //=> "Green button (control)"; variantLabel('Green button (control)', 0) //=> "Green button (control)"
 */
export function variantLabel(name: string, index: number): string {
  return index === 0 && !saysControl(name) ? `${name} (control)` : name;
}

/**
 * The control in a sentence: "the control (Green button)", or just its name when that says control.
 * Cost O(length).
 * @example controlWords('Green button (control)') //=> "Green button (control)"
 */
export function controlWords(name: string): string {
  return saysControl(name) ? name : `the control (${name})`;
}

/** What a result is about: the noun for the quantity compared. */
function quantity(name: string): { noun: string; family: 'conversion' | 'means' | 'events' } {
  if (name.startsWith('MEAN_')) return { noun: 'mean', family: 'means' };
  if (name.startsWith('EVENTS_')) return { noun: 'event rate', family: 'events' };
  return { noun: 'conversion rate', family: 'conversion' };
}

/** What the Explain section reads to put a result into words. */
export interface ResultInput {
  /** Function name without the namespace ("PROB_HIGHEST"). */
  readonly name: string;
  /** The result's values from its formula cell on (the whole spill). */
  readonly values: readonly (readonly CellValue[])[];
  /** The data ran along a row. */
  readonly alongRow: boolean;
  /** One name per variant, control first (names from the sheet, or A, B, C…). */
  readonly labels: readonly string[];
  /** Numeric arguments where known: level, min_lift, visitors_per_variant… */
  readonly numbers?: Readonly<Record<string, number | undefined>>;
  readonly locale?: NumberLocale;
}

const isNumber = (v: CellValue | undefined): v is number => typeof v === 'number' && Number.isFinite(v);

/**
 * The result in plain sentences, the most important first; an empty list when the values are not what
 * the function gives (then only the method is explained). Cost O(cells of the result).
 * @example resultWords({ name: 'PROB_HIGHEST', values: [[0.04], [0.86], [0.1]], alongRow: false, labels: ['Green', 'Orange', 'Blue'] })[0]
 * //=> "Orange has an 86% chance of having the highest conversion rate."
 */
export function resultWords(input: ResultInput): string[] {
  const locale = input.locale ?? DEFAULT_LOCALE;
  const { name, labels } = input;
  const { noun, family } = quantity(name);
  const first = input.values[0]?.[0];
  const k = labels.length;
  const each = (width: number): CellValue[][] =>
    Array.from({ length: k }, (_, i) => variantValues(input.values, i, input.alongRow).slice(0, width));
  const levelText = levelWords(input.numbers?.level ?? 0.95, locale);
  const control = controlWords(labels[0] ?? 'A');

  switch (name) {
    case 'PROB_HIGHEST':
    case 'MEAN_PROB_HIGHEST':
    case 'EVENTS_PROB_HIGHEST': {
      const chances = each(1).map((v, i) => ({ label: labels[i] ?? '', p: v[0] }));
      if (!chances.every((c) => isNumber(c.p))) return [];
      const sorted = [...chances].sort((a, b) => (b.p as number) - (a.p as number));
      const [top, ...rest] = sorted;
      if (top === undefined) return [];
      return [
        `${top.label} has ${chancePhrase(top.p as number, locale)} of having the highest ${noun}.`,
        ...(rest.length > 0
          ? [
              `The others: ${rest.map((c) => `${c.label} ${chanceText(c.p as number, locale)}`).join(', ')}. The ` +
                `chances add up to 100%.`,
            ]
          : []),
      ];
    }
    case 'PROB_ABOVE_CONTROL':
    case 'MEAN_PROB_ABOVE_CONTROL':
    case 'EVENTS_PROB_ABOVE_CONTROL': {
      const rows = each(1).slice(1);
      if (!rows.every((v) => isNumber(v[0]))) return [];
      return rows.map(
        (v, j) => `${labels[j + 1]} has ${chancePhrase(v[0] as number, locale)} of a higher ${noun} than ${control}.`,
      );
    }
    case 'PROB_LIFT_ABOVE': {
      const rows = each(1).slice(1);
      const minLift = input.numbers?.min_lift;
      if (!rows.every((v) => isNumber(v[0])) || minLift === undefined) return [];
      return rows.map((v, j) =>
        minLift >= 0
          ? `${labels[j + 1]} has ${chancePhrase(v[0] as number, locale)} of a lift over the control above ` +
            `${signed(minLift, locale)}.`
          : `${labels[j + 1]} has ${chancePhrase(v[0] as number, locale)} of being no worse than ` +
            `${signed(minLift, locale)} against the control.`,
      );
    }
    case 'LIFT_INTERVAL':
    case 'MEAN_LIFT_INTERVAL':
    case 'EVENTS_LIFT_INTERVAL':
    case 'RATE_DIFF_INTERVAL':
    case 'MEAN_DIFF_INTERVAL': {
      const rows = each(3).slice(1);
      if (!rows.every((v) => v.every(isNumber))) return [];
      const lift = name.includes('LIFT');
      const show = (x: number): string =>
        lift
          ? signed(x, locale)
          : family === 'conversion'
            ? points(x, locale)
            : `${x > 0 ? '+' : x < 0 ? '−' : ''}${plain(Math.abs(x), locale)}`;
      const what = lift ? `lift in ${noun} over the control` : `difference in ${noun} from the control`;
      return rows.map((v, j) => {
        const [low, median, high] = v as number[];
        const side =
          (low as number) > 0
            ? 'the whole range is above no change.'
            : (high as number) < 0
              ? 'the whole range is below no change: it is likely worse.'
              : 'the range includes no change, so the data cannot yet tell better from worse.';
        return (
          `${labels[j + 1]}: the ${what} is most likely about ${show(median as number)}; with ${levelText} ` +
          `probability it lies between ${show(low as number)} and ${show(high as number)}, and ${side}`
        );
      });
    }
    case 'RATE_INTERVAL':
    case 'MEAN_INTERVAL':
    case 'EVENTS_RATE_INTERVAL': {
      const rows = each(2);
      if (!rows.every((v) => v.every(isNumber))) return [];
      const show = (x: number): string => (family === 'conversion' ? formatPercent(x, locale) : plain(x, locale));
      return rows.map(
        (v, i) =>
          `${labels[i]}: ${levelText} probability that its ${noun} lies between ${show(v[0] as number)} and ` +
          `${show(v[1] as number)}.`,
      );
    }
    case 'POSTERIOR_MEAN': {
      const rows = each(1);
      if (!rows.every((v) => isNumber(v[0]))) return [];
      return [
        `Expected ${noun} of each variant: ` +
          `${rows.map((v, i) => `${labels[i]} ${formatPercent(v[0] as number, locale)}`).join(', ')}.`,
      ];
    }
    case 'EXPECTED_LOSS':
    case 'MEAN_EXPECTED_LOSS':
    case 'EVENTS_EXPECTED_LOSS': {
      const rows = each(1);
      if (!rows.every((v) => isNumber(v[0]))) return [];
      const show = (x: number): string =>
        family === 'conversion' ? points(x, locale, false) : `${plain(x, locale)} (in the units of the ${noun})`;
      const losses = rows.map((v, i) => ({ label: labels[i] ?? '', loss: v[0] as number }));
      const best = losses.reduce((a, b) => (b.loss < a.loss ? b : a));
      return [
        `Choosing ${best.label} is the least risky: if it is not the best, it gives up ${show(best.loss)} of ${noun} ` +
          `on average.`,
        `Expected loss of each choice: ${losses.map((l) => `${l.label} ${show(l.loss)}`).join(', ')}.`,
      ];
    }
    case 'DECISION':
      return typeof first === 'string' && first !== '' && !first.startsWith('#') ? [`The cell says: "${first}"`] : [];
    case 'SRM_PVALUE':
      if (!isNumber(first)) return [];
      return first < 0.001
        ? [
            `The split check gives p = ${first.toExponential(1)}, below 0.001: the visitors are not split as ` +
              `planned. Find out why (bots, redirects, a variant that fails) before trusting any read-out.`,
          ]
        : [`The split check gives p = ${plain(first, locale)}: no sign of a broken split.`];
    case 'VISITORS_NEEDED':
      return isNumber(first)
        ? [`Each variant needs ${formatCount(first, locale)} visitors for that decision power.`]
        : [];
    case 'CLASSIC_SAMPLE_SIZE':
      return isNumber(first) ? [`The classic z-test needs ${formatCount(first, locale)} visitors per variant.`] : [];
    case 'DECISION_POWER': {
      if (!isNumber(first)) return [];
      return [
        `A test of that size ends with a decision for the challenger ${chanceText(first, locale)} of the time (when ` +
          `its lift is as given; with lift 0 this is the false-alarm rate).`,
      ];
    }
    case 'PRIOR_FROM_MEAN':
    case 'PRIOR_FROM_INTERVAL':
    case 'PRIOR_FROM_HISTORY': {
      const [alpha, beta] = input.values[0] ?? [];
      if (!isNumber(alpha) || !isNumber(beta)) return [];
      return [
        `A Beta(${plain(alpha, locale)}, ${plain(beta, locale)}) prior: its mean rate is ` +
          `${formatPercent(alpha / (alpha + beta), locale)} and it counts like ${formatCount(alpha + beta, locale)} ` +
          `visitors in every variant.`,
      ];
    }
    case 'POSTERIOR_DENSITY':
    case 'LIFT_DENSITY': {
      const grid = input.values.map((row) => row[0]).filter(isNumber);
      if (grid.length < 2) return [];
      const ends = (x: number): string => (name === 'LIFT_DENSITY' ? signed(x, locale) : formatPercent(x, locale));
      return [
        `A table for a chart: ${grid.length} rows from ${ends(grid[0] as number)} to ` +
          `${ends(grid[grid.length - 1] as number)}; a taller value means a more plausible ` +
          `${name === 'LIFT_DENSITY' ? 'lift' : 'rate'}.`,
      ];
    }
    default:
      return [];
  }
}

/** What an error value in a cell means, in words, for the error codes Excel shows. */
export const ERROR_MEANINGS: Readonly<Record<string, string>> = Object.freeze({
  '#VALUE!':
    'An argument holds something the function cannot use: text where a number belongs (even "120" typed as text), a ' +
    'blank on only one side of a pair, or a number outside its range (more conversions than visitors, a level of ' +
    '95 where the function takes 0.95).',
  '#N/A':
    'The result does not exist for these inputs (for example a relative lift over a control whose rate could be zero ' +
    'or below, or a prior the past results cannot pin down).',
  '#NUM!': 'A number is outside what the function can compute, for example a lift too small to plan for.',
  '#SPILL!':
    'The result needs more cells than the one holding the formula, and some of them are not empty. Clear the cells ' +
    'below or to the right.',
  '#NAME?':
    'Excel does not know the function: the Lift Ledger add-in is not loaded in this workbook, or the name is misspelt.',
  '#BUSY!': 'The function is still computing. Wait a moment.',
  '#CALC!': 'Excel could not compute the formula as a whole (for example an empty array).',
  '#REF!': 'The formula refers to cells that no longer exist (a deleted row, column or sheet).',
  '#DIV/0!': 'A division by zero in the formula around the function.',
  '#NULL!': 'Two ranges in the formula do not meet (a space between ranges instead of a comma).',
});

/**
 * The meaning of an error value in words, or null when the value is not an error. Cost O(1).
 * @example errorMeaning('#SPILL!') //=> "The result needs more cells than the one holding the formula, …"
 */
export function errorMeaning(value: CellValue | undefined): string | null {
  if (typeof value !== 'string' || !value.startsWith('#')) return null;
  return ERROR_MEANINGS[value.toUpperCase()] ?? null;
}

/**
 * The size of the result of an =ABTEST. formula, from its text: the function's shape and the size of its
 * first range argument (and a literal `points`). Null when the text holds no known call or its first
 * argument is not an A1 range. Cost O(length).
 * @example resultSizeOf('=ABTEST.LIFT_INTERVAL(C4:C6, B4:B6)') //=> { rows: 3, columns: 3, alongRow: false }
 */
export function resultSizeOf(formula: string): ResultSize | null {
  const call = parseAbtestCall(formula);
  if (call === null) return null;
  const shape = resultShapeOf(call.name);
  if (shape === undefined) return null;
  if (shape.kind === 'one' || shape.kind === 'fixed') return resultSize(shape, { rows: 1, columns: 1 });
  try {
    const data = parseAddress(call.args[0] ?? '');
    const pointsText = shape.kind === 'densityTable' ? (call.args[2] ?? '') : '';
    const points = /^\d+$/.test(pointsText.trim()) ? Number(pointsText) : undefined;
    return resultSize(
      shape,
      { rows: data.end.row - data.start.row + 1, columns: data.end.column - data.start.column + 1 },
      points,
    );
  } catch {
    return null;
  }
}

/** The formula a selected cell's value comes from, found in a block of formulas read above and left of it. */
export interface SpillOwner {
  /** Position of the formula cell on the sheet (0-based). */
  readonly row: number;
  readonly column: number;
  readonly formula: string;
  readonly size: ResultSize;
}

/**
 * Find the =ABTEST. formula whose spilled result covers `target`, in `formulas` read from the sheet with
 * its top-left cell at `origin` (the block must end at the target's row and column: a formula cell is
 * always above and left of its spill). The nearest formula whose result covers the target wins.
 * Cost O(cells of the block).
 * @example findSpillOwner([['=ABTEST.PROB_HIGHEST(C4:C6,B4:B6)'], [0.86]], { row: 22, column: 1 }, { row: 23, column: 1 })
 * //=> { row: 22, column: 1, formula: '=ABTEST.PROB_HIGHEST(C4:C6,B4:B6)', size: { rows: 3, columns: 1, alongRow: false } }
 */
export function findSpillOwner(
  formulas: readonly (readonly CellValue[])[],
  origin: CellPosition,
  target: CellPosition,
  sizeOf: (formula: string) => ResultSize | null = resultSizeOf,
): SpillOwner | null {
  for (let r = target.row - origin.row; r >= 0; r -= 1) {
    const row = formulas[r] ?? [];
    for (let c = target.column - origin.column; c >= 0; c -= 1) {
      const cell = row[c];
      if (typeof cell !== 'string' || !cell.startsWith('=') || !/ABTEST\./i.test(cell)) continue;
      const size = sizeOf(cell);
      if (size === null) continue;
      const at = { row: origin.row + r, column: origin.column + c };
      if (target.row < at.row + size.rows && target.column < at.column + size.columns) {
        return { ...at, formula: cell, size };
      }
    }
  }
  return null;
}
