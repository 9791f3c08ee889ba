/**
 * Shaping results into spills that follow the input (catalogue: "spills follow the input").
 *
 * - A vector result (one value per variant) spills down for a column input and across for a row input.
 * - A versus-control result has `""` in the control's slot; blank positions get `""` everywhere.
 * - A block (several values per variant, e.g. lower and upper) is one row per variant for a column
 *   input and one column per variant for a row input.
 *
 * Every number is checked to be finite here, the last line of defence before a cell.
 */
import { StatsError } from '../stats/errors';
import type { BetaPrior, DensityTable, Interval, IntervalWithMedian } from '../stats/types';
import type { VariantTable } from './variants';

/** One output cell: a finite number or text (`""` for an empty slot). */
export type OutputCell = number | string;

/** What a cell says when an exact answer exists but is larger than any number a cell holds. */
export const BEYOND_CELL_MESSAGE =
  "a result is larger than the largest number a cell holds (about 1.8E+308): under this prior a variant's " +
  'rate can be so close to 0 that a ratio to it has no usable bound; compare the variants by their ' +
  'difference, or use a prior with more weight';

/**
 * Throws unless `x` is finite, so no NaN or infinity reaches a cell.
 *
 * Cost O(1).
 * @throws {StatsError} `not_available` ({@link BEYOND_CELL_MESSAGE}) for an infinite value: the question has
 *   no answer a cell can show (#N/A).
 * @throws {Error} for NaN, which no computation inside the declared domain returns (run.ts's catch-all).
 * @example finite(0.5) //=> 0.5
 */
export function finite(x: number): number {
  if (Number.isFinite(x)) return x;
  if (x === Infinity || x === -Infinity) throw new StatsError('not_available', BEYOND_CELL_MESSAGE);
  throw new Error('a result is not a number');
}

/** Lays rows of values (one row per position) out in the table's orientation. */
function orient(table: VariantTable, perPosition: OutputCell[][]): OutputCell[][] {
  if (table.orientation === 'column') return perPosition;
  const width = perPosition[0]?.length ?? 0;
  const out: OutputCell[][] = [];
  for (let j = 0; j < width; j++) out.push(perPosition.map((row) => row[j] as OutputCell));
  return out;
}

/**
 * Spills a block with `width` values per variant: `values[i]` belongs to the i-th variant of the table.
 *
 * Cost O(cells).
 * @example spillBlock(columnTable, [[0.1, 0.2], [0.3, 0.4]], 2) //=> [[0.1, 0.2], [0.3, 0.4]]
 */
export function spillBlock(table: VariantTable, values: readonly (readonly number[])[], width: number): OutputCell[][] {
  const perPosition: OutputCell[][] = [];
  for (let p = 0; p < table.length; p++) perPosition.push(new Array<OutputCell>(width).fill(''));
  table.positions.forEach((p, i) => {
    const row = values[i];
    if (row === undefined || row.length !== width) throw new Error(`internal: result ${i + 1} has the wrong width`);
    perPosition[p] = row.map(finite);
  });
  return orient(table, perPosition);
}

/**
 * Spills one value per variant in the input's orientation, `""` at blank positions.
 *
 * Cost O(cells).
 * @example spillPerVariant(rowTable, [0.2, 0.8]) //=> [[0.2, 0.8]]
 */
export function spillPerVariant(table: VariantTable, values: readonly number[]): OutputCell[][] {
  return spillBlock(
    table,
    values.map((v) => [v]),
    1,
  );
}

/**
 * Spills a block for the challengers only (`values[i]` belongs to variant i + 1); the control's slot is `""`.
 *
 * Cost O(cells).
 * @example spillBlockVersusControl(columnTable, [[-0.1, 0.05, 0.2]], 3) //=> [['', '', ''], [-0.1, 0.05, 0.2]]
 */
export function spillBlockVersusControl(
  table: VariantTable,
  values: readonly (readonly number[])[],
  width: number,
): OutputCell[][] {
  const perPosition: OutputCell[][] = [];
  for (let p = 0; p < table.length; p++) perPosition.push(new Array<OutputCell>(width).fill(''));
  table.positions.slice(1).forEach((p, i) => {
    const row = values[i];
    if (row === undefined || row.length !== width) throw new Error(`internal: result ${i + 2} has the wrong width`);
    perPosition[p] = row.map(finite);
  });
  return orient(table, perPosition);
}

/**
 * Spills one value per challenger; the control's slot and blank positions are `""`.
 *
 * Cost O(cells).
 * @example spillVersusControl(columnTable, [0.93]) //=> [[''], [0.93]]
 */
export function spillVersusControl(table: VariantTable, values: readonly number[]): OutputCell[][] {
  return spillBlockVersusControl(
    table,
    values.map((v) => [v]),
    1,
  );
}

/**
 * Lays out a chart table: first column the grid, then one column per series (`series[i][r]` is the
 * density of series i at grid point r). `columnsAt` places series at output columns (by variant
 * position), so blank positions give a column of `""` and the columns line up with the input.
 *
 * Cost O(rows × columns).
 * @example spillTable([0, 1], [[1, 1]], [0], 1) //=> [[0, 1], [1, 1]]
 */
export function spillTable(
  grid: readonly number[],
  series: readonly (readonly number[])[],
  columnsAt: readonly number[],
  width: number,
): OutputCell[][] {
  return grid.map((x, r) => {
    const row: OutputCell[] = [finite(x)];
    for (let c = 0; c < width; c++) row.push('');
    series.forEach((column, i) => {
      const value = column[r];
      if (value === undefined) throw new Error(`internal: density column ${i + 1} is too short`);
      row[1 + (columnsAt[i] as number)] = finite(value);
    });
    return row;
  });
}

/**
 * Puts the ends of an interval in order. Each end comes from its own root search, accurate to an absolute
 * tolerance; where two true values are closer than that (a symmetric difference whose median is 0 and
 * whose 10% point is −1e-50), the estimates can cross. Sorting them never moves a value further from its
 * true value than the worse of the two errors (if a ≤ b and |x − a|, |y − b| ≤ ε, then min(x, y) and
 * max(x, y) are within ε of a and b), so the cell shows an ordered interval as accurate as the search.
 */
function ordered(values: number[]): number[] {
  return values.sort((a, b) => a - b);
}

/** Rows `[lower, upper]` of credible intervals, for {@link spillBlock}; each row in order. */
export function intervalRows(intervals: readonly Interval[]): number[][] {
  return intervals.map((iv) => ordered([iv.lower, iv.upper]));
}

/** Rows `[lower, median, upper]`, for {@link spillBlockVersusControl}; each row in order. */
export function medianRows(intervals: readonly IntervalWithMedian[]): number[][] {
  return intervals.map((iv) => ordered([iv.lower, iv.median, iv.upper]));
}

/**
 * Spills a density table for a chart: `points` rows, the grid first, then one column per variant
 * (`per: 'variant'`) or per challenger (`per: 'challenger'`). A blank input position gives a column of
 * `""` so the columns line up with the input; the table itself is always laid out in columns.
 *
 * Cost O(points × variants).
 * @example spillDensity(table, { grid: [0, 1], densities: [[1, 1]] }, 'variant') //=> [[0, 1], [1, 1]]
 */
export function spillDensity(
  table: VariantTable,
  density: DensityTable,
  per: 'variant' | 'challenger',
): OutputCell[][] {
  const positions = per === 'variant' ? table.positions : table.positions.slice(1);
  const columnsAt = per === 'variant' ? positions : positions.map((p) => p - 1);
  // the control is the first non-blank position, so every challenger sits after it: column p - 1
  const width = per === 'variant' ? table.length : table.length - 1;
  if (density.densities.length !== positions.length) throw new Error('internal: wrong number of density columns');
  return spillTable(density.grid, density.densities, columnsAt, width);
}

/** One row `[alpha, beta]` of a Beta prior, every value checked finite. */
export function priorRow(prior: BetaPrior): number[][] {
  return [[finite(prior.alpha), finite(prior.beta)]];
}
