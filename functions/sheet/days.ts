/**
 * Reading the two argument shapes of the functions for tests looked at several times, and shaping their
 * day-by-day results:
 *
 * - a list (`visitors_at_looks`): a single row or column of numbers that is not one cell per variant;
 *   blank cells are skipped (a column with spare cells), each other cell is checked by its rule;
 * - day tables (`conversions_by_day`, `visitors_by_day`): one row per day and one column per variant, the
 *   control first, read together. A row blank in every table is a day without data: skipped, and its row of
 *   the result is `""`. A row with some cells blank and others filled is an error naming the first blank
 *   cell. Counts are per day, not cumulative.
 */
import { ArgumentProblem, classifyCell, readCellList } from './cells';
import type { DaysParam, ListParam } from './entry';
import { checkNumber, describeAllowed, type NumberRule } from './rules';
import { finite, type OutputCell } from './spill';
import type { VariantCount } from './variants';

/** Most rows (days) a day table may have. */
export const MAX_DAY_ROWS = 1000;

/** The day tables of a function, checked. */
export interface DayTable {
  /** Rows of the input tables, blank days included. */
  readonly height: number;
  /** Columns: the variants, the control first. */
  readonly width: number;
  /** Input rows (0-based) that hold a day, in order. */
  readonly rows: readonly number[];
  /** Checked values by table name: one array per day (blank days left out), one value per variant. */
  readonly columns: Readonly<Record<string, readonly (readonly number[])[]>>;
}

/**
 * Reads a list argument: omitted gives `undefined` (optional) or an error (required).
 *
 * Cost O(cells).
 * @throws {ArgumentProblem} naming the argument and item: a 2-D range, a cell breaking the rule, a value not
 *   above the one before (increasing lists), or too few / too many values.
 * @example readList(list(VISITORS_AT_LOOKS, LOOKS, true), [[1000], [2000], [''], [3000]]) //=> [1000, 2000, 3000]
 */
export function readList(param: ListParam, value: unknown): number[] | undefined {
  const { name, rule, count } = param;
  if (value === null || value === undefined || (!Array.isArray(value) && classifyCell(value).kind === 'blank')) {
    if (param.optional) return undefined;
    throw new ArgumentProblem(
      `${name}: is missing; enter a row or a column of ${count.min} to ${count.max} ${count.noun ?? 'values'}`,
    );
  }
  const cells = readCellList(name, value).cells;
  const out: number[] = [];
  let before: { item: number; value: number } | undefined;
  cells.forEach((cell, i) => {
    if (classifyCell(cell).kind === 'blank') return;
    const x = checkNumber(rule, cell, `${name}, item ${i + 1}`);
    if (param.increasing && before !== undefined && !(x > before.value)) {
      throw new ArgumentProblem(
        `${name}, item ${i + 1}: ${x} is not more than the ${before.value} of item ${before.item}; ` +
          'the values are cumulative, so each must be more than the one before',
      );
    }
    before = { item: i + 1, value: x };
    out.push(x);
  });
  if (out.length < count.min) {
    const noun = count.noun ?? 'values';
    const needed =
      count.min === 1 ? `at least 1 ${noun.replace(/s$/, '')} is needed` : `at least ${count.min} ${noun} are needed`;
    const given =
      out.length === 0 ? 'every cell is blank' : `only ${out.length} ${out.length === 1 ? 'was' : 'were'} given`;
    throw new ArgumentProblem(`${name}: ${needed}; ${given}`);
  }
  if (out.length > count.max) {
    throw new ArgumentProblem(
      `${name}: at most ${count.max} ${count.noun ?? 'values'} can be used; ${out.length} were given`,
    );
  }
  return out;
}

/** Rows of cells of a 2-D range argument (a scalar is one cell, a flat array one row). */
function rowsOf(name: string, range: unknown): unknown[][] {
  const rows: unknown[][] = Array.isArray(range)
    ? range.map((row: unknown) => (Array.isArray(row) ? (row as unknown[]) : [row]))
    : [[range]];
  const width = rows[0]?.length ?? 0;
  if (rows.length === 0 || width === 0) throw new ArgumentProblem(`${name}: the range is empty`);
  if (rows.some((row) => row.length !== width)) throw new ArgumentProblem(`${name}: the range is not rectangular`);
  return rows;
}

/**
 * Reads the day tables of a function together (`params` in the entry's order, `ranges` as Excel gave them).
 *
 * Cost O(cells).
 * @throws {ArgumentProblem} on tables of different shapes, too few or too many variant columns or days, a
 *   day with blank and filled cells, a cell breaking its rule, or a cell above its limit in another table
 *   (conversions above visitors).
 * @example readDays([days(VISITORS_BY_DAY, COMPARISON)], [[[500, 510], ['', ''], [480, 470]]]).rows //=> [0, 2]
 */
export function readDays(params: readonly DaysParam[], ranges: readonly unknown[]): DayTable {
  const first = params[0] as DaysParam;
  const tables = params.map((p, i) => rowsOf(p.name, ranges[i]));
  const base = tables[0] as unknown[][];
  const height = base.length;
  const width = (base[0] as unknown[]).length;
  tables.forEach((t, i) => {
    if (t.length !== height || (t[0] as unknown[]).length !== width) {
      const p = params[i] as DaysParam;
      throw new ArgumentProblem(
        `${first.name} and ${p.name} must have the same shape: ${first.name} is ${height} × ${width}, ` +
          `${p.name} is ${t.length} × ${(t[0] as unknown[]).length} (rows × columns)`,
      );
    }
  });
  const variants: VariantCount = first.variants;
  if (width < variants.min || width > variants.max) {
    throw new ArgumentProblem(
      `${first.name}: ${width} ${width === 1 ? 'column was' : 'columns were'} given; use one column per variant ` +
        `(${variants.min} to ${variants.max}, the control first) and one row per day`,
    );
  }
  if (height > MAX_DAY_ROWS) {
    throw new ArgumentProblem(`${first.name}: at most ${MAX_DAY_ROWS} rows (days) can be used; ${height} were given`);
  }
  const rows: number[] = [];
  const columns: Record<string, number[][]> = {};
  for (const p of params) columns[p.name] = [];
  for (let r = 0; r < height; r++) {
    const blank = tables.map((t) => (t[r] as unknown[]).map((cell) => classifyCell(cell).kind === 'blank'));
    if (blank.every((row) => row.every(Boolean))) continue;
    params.forEach((p, i) => {
      const c = (blank[i] as boolean[]).indexOf(true);
      if (c >= 0) {
        throw new ArgumentProblem(
          `${p.name}, row ${r + 1}, column ${c + 1}: is blank while other cells of that day have values; ` +
            'fill in the whole day or leave the whole row blank',
        );
      }
    });
    const day: Record<string, number[]> = {};
    params.forEach((p, i) => {
      day[p.name] = ((tables[i] as unknown[][])[r] as unknown[]).map((cell, c) =>
        checkNumber(p.rule, cell, `${p.name}, row ${r + 1}, column ${c + 1}`),
      );
    });
    for (const p of params) {
      const limitName = p.rule.atMost;
      const limits = limitName === undefined ? undefined : day[limitName];
      if (limits === undefined) continue;
      (day[p.name] as number[]).forEach((value, c) => {
        if (value > (limits[c] as number)) {
          throw new ArgumentProblem(
            `${p.name}, row ${r + 1}, column ${c + 1}: ${value} is more than the ${limits[c]} ${limitName}`,
          );
        }
      });
    }
    rows.push(r);
    for (const p of params) (columns[p.name] as number[][]).push(day[p.name] as number[]);
  }
  if (rows.length === 0) {
    throw new ArgumentProblem(
      `${first.name}: every row is blank; give at least one day of ${describeAllowed(first.rule as NumberRule)}`,
    );
  }
  return { height, width, rows, columns };
}

/**
 * Lays out a by-day result: one row per input row (blank days: a row of `""`), `width` columns; `values[i]`
 * belongs to the i-th day that holds data, and a null (no visitors yet) becomes `""`.
 *
 * Cost O(rows × width).
 * @example spillByDay({ height: 3, width: 2, rows: [0, 2], columns: {} }, [[0.4], [null]], 1) //=> [[0.4], [''], ['']]
 */
export function spillByDay(
  table: DayTable,
  values: readonly (readonly (number | null)[])[],
  width: number,
): OutputCell[][] {
  if (values.length !== table.rows.length) throw new Error('internal: one row of results per day is needed');
  const out: OutputCell[][] = [];
  for (let r = 0; r < table.height; r++) out.push(new Array<OutputCell>(width).fill(''));
  table.rows.forEach((r, i) => {
    const row = values[i] as readonly (number | null)[];
    if (row.length !== width) throw new Error(`internal: day ${i + 1} has the wrong number of results`);
    out[r] = row.map((v) => (v === null ? '' : finite(v)));
  });
  return out;
}
