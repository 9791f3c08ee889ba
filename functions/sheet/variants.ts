/**
 * Reading variants from paired ranges, the catalogue's conventions in one place:
 *
 * - the ranges (e.g. `conversions` and `visitors`) have the same shape, a single row or a single column;
 * - a position where every range is blank is "no variant": skipped, and its output slot is `""`;
 * - a position where some but not all ranges are blank is an error naming the blank one;
 * - every other cell is checked against its declared {@link NumberRule}, including cross-column limits
 *   such as conversions ≤ visitors;
 * - the number of variants is within the function's limits (2…50 for comparisons).
 */
import { ArgumentProblem, classifyCell, describeShape, readCellList, type CellList, type Orientation } from './cells';
import { MAX_VARIANTS } from '../stats/limits';
import { checkNumber, type NumberRule } from './rules';

/** The most variants a comparison accepts (catalogue; stats/limits.ts). */
export { MAX_VARIANTS };

/** How many variants a function needs. */
export interface VariantCount {
  readonly min: number;
  readonly max: number;
  /** What the positions are called in messages (default "variants"). */
  readonly noun?: string;
}

/** One variant to compare; at least one. */
export const ONE_OR_MORE: VariantCount = { min: 1, max: MAX_VARIANTS };
/** Comparisons: 2…50 variants. */
export const COMPARISON: VariantCount = { min: 2, max: MAX_VARIANTS };
/** Past results to fit a prior to: at least three (one gives no spread, two nearly none), no comparison cap. */
export const PAST_RESULTS: VariantCount = { min: 3, max: 100000, noun: 'past results' };

/** Variants read from paired ranges. */
export interface VariantTable {
  /** Orientation of the input ranges; spills follow it. */
  readonly orientation: Orientation;
  /** Number of cells in each range (positions, blank or not). */
  readonly length: number;
  /** Positions (0-based) that hold a variant, in order; the first is the control. */
  readonly positions: readonly number[];
  /** Checked values by column name, one entry per variant (blank positions left out). */
  readonly columns: Readonly<Record<string, readonly number[]>>;
}

/**
 * Reads paired ranges into checked variants.
 *
 * `rules[i]` is the declared rule of `ranges[i]`; `count` bounds the number of non-blank positions.
 * Cost O(cells).
 * @throws {ArgumentProblem} on a 2-D or mismatched range, a position blank in only some ranges, a cell
 *   breaking its rule, or too few / too many variants.
 * @example
 * readVariants([CONVERSIONS, VISITORS], [[[12], [15]], [[100], [100]]], COMPARISON)
 * //=> { orientation: 'column', length: 2, positions: [0, 1], columns: { conversions: [12, 15], visitors: [100, 100] } }
 */
export function readVariants(
  rules: readonly NumberRule[],
  ranges: readonly unknown[],
  count: VariantCount,
): VariantTable {
  const lists: CellList[] = rules.map((rule, i) => readCellList(rule.name, ranges[i]));
  const first = lists[0] as CellList;
  const firstRule = rules[0] as NumberRule;
  lists.forEach((list, i) => {
    if (list.rows !== first.rows || list.columns !== first.columns) {
      const rule = rules[i] as NumberRule;
      throw new ArgumentProblem(
        `${firstRule.name} and ${rule.name} must have the same shape: ${firstRule.name} is ` +
          `${describeShape(first.rows, first.columns)}, ${rule.name} is ${describeShape(list.rows, list.columns)}`,
      );
    }
  });
  const length = first.cells.length;
  const positions: number[] = [];
  const columns: Record<string, number[]> = {};
  for (const rule of rules) columns[rule.name] = [];
  for (let p = 0; p < length; p++) {
    const blank = lists.map((list) => classifyCell(list.cells[p]).kind === 'blank');
    if (blank.every(Boolean)) continue;
    const filled = blank.findIndex((b) => !b);
    blank.forEach((isBlank, i) => {
      if (isBlank) {
        throw new ArgumentProblem(
          `${(rules[i] as NumberRule).name}, item ${p + 1}: is blank while ${(rules[filled] as NumberRule).name} has a value; ` +
            'fill in both or leave both blank',
        );
      }
    });
    const row: Record<string, number> = {};
    rules.forEach((rule, i) => {
      row[rule.name] = checkNumber(rule, (lists[i] as CellList).cells[p], `${rule.name}, item ${p + 1}`);
    });
    for (const rule of rules) {
      const limitName = rule.atMost;
      const limit = limitName === undefined ? undefined : row[limitName];
      const value = row[rule.name] as number;
      if (limit !== undefined && value > limit) {
        throw new ArgumentProblem(`${rule.name}, item ${p + 1}: ${value} is more than the ${limit} ${limitName}`);
      }
    }
    positions.push(p);
    for (const rule of rules) (columns[rule.name] as number[]).push(row[rule.name] as number);
  }
  checkVariantCount(positions.length, count);
  return { orientation: first.orientation, length, positions, columns };
}

/**
 * Reads one optional range (e.g. `planned_shares`, `labels`) that must line up with a variant table.
 *
 * Returns `undefined` when the argument is omitted. Cost O(cells).
 * @throws {ArgumentProblem} on a shape mismatch or a blank cell at a variant's position.
 * @example readAlignedCells('labels', [['Old'], ['New']], table) //=> ['Old', 'New']
 */
export function readAlignedCells(
  name: string,
  range: unknown,
  table: VariantTable,
  tableName: string,
): unknown[] | undefined {
  if (range === null || range === undefined) return undefined;
  const list = readCellList(name, range);
  const expected = table.orientation === 'row' ? [1, table.length] : [table.length, 1];
  const matches = list.cells.length === table.length && (table.length === 1 || list.orientation === table.orientation);
  if (!matches) {
    throw new ArgumentProblem(
      `${name} must have the same shape as ${tableName}: ${name} is ${describeShape(list.rows, list.columns)}, ` +
        `${tableName} is ${describeShape(expected[0] as number, expected[1] as number)}`,
    );
  }
  return table.positions.map((p) => list.cells[p]);
}

/**
 * Checks the number of variants against a function's limits.
 *
 * Cost O(1).
 * @throws {ArgumentProblem} with the count given and the count allowed.
 * @example checkVariantCount(3, COMPARISON) // passes
 */
export function checkVariantCount(found: number, count: VariantCount): void {
  const noun = count.noun ?? 'variants';
  const given = found === 0 ? 'every position is blank' : `only ${found} ${found === 1 ? 'was' : 'were'} given`;
  if (found < count.min) {
    const what =
      noun === 'variants' && count.min >= 2
        ? `at least ${count.min} variants are needed to compare`
        : `at least ${count.min} ${count.min === 1 ? noun.replace(/s$/, '') + ' is' : noun + ' are'} needed`;
    throw new ArgumentProblem(`${what}; ${given}`);
  }
  if (found > count.max) {
    throw new ArgumentProblem(
      `at most ${count.max} ${noun} can be ${noun === 'variants' ? 'compared' : 'used'}; ${found} were given`,
    );
  }
}
