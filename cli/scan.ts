/**
 * Finding the ABTEST results of a saved workbook, one worksheet at a time in a single streaming pass:
 * every cell whose formula calls an ABTEST function (shared formulas resolved from their master cell),
 * with its cached value and the range its result spilled over (`<f t="array" ref="…">`, written for
 * dynamic arrays and legacy array formulas alike), and optionally the cached values of the spilled cells,
 * which follow their anchor in the part (rows are stored in order, ECMA-376 Part 1 §18.3.1.73).
 *
 * Memory: the cells found and their spills; nothing else of a sheet is kept.
 */
import { parseRange, rangeSize, type CellRange } from './core/cellAddress';
import { containsAbtestCall, shiftFormula } from './core/formula';
import type { SheetInfo } from './xlsx/package';
import { createSheetParser, type RawCell } from './xlsx/sheetScan';
import { storedValueOf, type StoredValue } from './xlsx/values';
import { feedXml } from './xlsx/xml';
import type { ZipPackage } from './xlsx/zip';

/** An ABTEST result found in a sheet. */
export interface AbtestCell {
  readonly sheet: SheetInfo;
  readonly row: number;
  readonly col: number;
  /** The formula as stored (a shared formula's dependent gets its master's text, shifted). */
  readonly formula: string;
  /** The range the formula's result covers, when the file says so and it is more than one cell. */
  readonly spill?: CellRange;
  /** True when the cell carries cell metadata (`cm`), which Excel writes for dynamic-array formulas. */
  readonly dynamic: boolean;
  readonly saved?: StoredValue;
}

/** A cell's key in a sheet: row × 16384 + column (exact in a double). */
export function cellKey(row: number, col: number): number {
  return row * 16384 + col;
}

/** Quick test before tokenizing: only formulas with these letters can call an ABTEST function. */
const MAYBE_ABTEST = /abtest/i;

/**
 * Tracks rectangles while a sheet is read in row order and answers "is this cell in one of them" in
 * O(rectangles open at this row).
 */
export class RangeSweep {
  private readonly pending: CellRange[];
  private active: CellRange[] = [];
  private next = 0;
  private row = -1;

  constructor(ranges: readonly CellRange[]) {
    this.pending = [...ranges].sort((a, b) => a.top - b.top);
  }

  /** Adds a range whose top is at or below the current row (a spill met while reading). */
  add(range: CellRange): void {
    this.active.push(range);
  }

  /** True when (row, col) lies in a range; rows must not decrease between calls. */
  contains(row: number, col: number): boolean {
    if (row !== this.row) {
      this.row = row;
      this.active = this.active.filter((r) => r.bottom >= row);
      while (this.next < this.pending.length && (this.pending[this.next] as CellRange).top <= row) {
        const r = this.pending[this.next] as CellRange;
        if (r.bottom >= row) this.active.push(r);
        this.next += 1;
      }
    }
    for (const r of this.active) if (col >= r.left && col <= r.right && row >= r.top) return true;
    return false;
  }

  /** True when a range covers row `row` (any column); rows must not decrease between calls. */
  coversRow(row: number): boolean {
    this.contains(row, -1);
    return this.active.some((r) => r.top <= row);
  }

  /** True when no range is open or still to come. */
  get done(): boolean {
    return this.active.length === 0 && this.next >= this.pending.length;
  }
}

/** What {@link scanSheet} returns. */
export interface SheetScan {
  readonly cells: AbtestCell[];
  /** Cached values of spilled cells (and of the `extra` ranges asked for), by {@link cellKey}. */
  readonly values: Map<number, StoredValue>;
}

/** The formula of a cell, resolving shared formulas; masters are remembered in `masters`. */
export function cellFormula(
  cell: RawCell,
  masters: Map<string, { text: string; row: number; col: number }>,
): string | undefined {
  const f = cell.formula;
  if (!f) return undefined;
  if (f.attributes.t !== 'shared') return f.text;
  const si = f.attributes.si ?? '';
  if (f.text !== '') {
    if (MAYBE_ABTEST.test(f.text)) masters.set(si, { text: f.text, row: cell.row, col: cell.col });
    return f.text;
  }
  const master = masters.get(si);
  return master ? shiftFormula(master.text, cell.row - master.row, cell.col - master.col) : '';
}

/** True when a stored formula is an ABTEST result. */
export function isAbtestFormula(formula: string | undefined): formula is string {
  return formula !== undefined && MAYBE_ABTEST.test(formula) && containsAbtestCall(formula);
}

/**
 * Reads one worksheet: its ABTEST results, the cached values of their spills (when `withSpillValues`),
 * and the cached values of the cells in `extra`.
 */
export async function scanSheet(
  pkg: ZipPackage,
  sheet: SheetInfo,
  options: {
    withSpillValues: boolean;
    extra?: readonly CellRange[];
    onBytes?: (n: number) => void;
    /** Each child of <worksheet> with its attributes (e.g. legacyDrawing). */
    onTopLevelElement?: (local: string, attributes: Readonly<Record<string, string>>) => void;
  },
): Promise<SheetScan> {
  const cells: AbtestCell[] = [];
  const values = new Map<number, StoredValue>();
  const masters = new Map<string, { text: string; row: number; col: number }>();
  const spills = new RangeSweep([]);
  const extra = new RangeSweep(options.extra ?? []);
  const findFormulas = options.extra === undefined;
  const parser = createSheetParser({
    // Only the rows of the ranges asked for are read when looking up argument cells.
    ...(findFormulas ? {} : { wantRow: (row: number) => extra.coversRow(row) }),
    ...(options.onTopLevelElement ? { onTopLevelElement: options.onTopLevelElement } : {}),
    onCell(cell) {
      const formula = findFormulas ? cellFormula(cell, masters) : undefined;
      if (isAbtestFormula(formula)) {
        const ref = cell.formula?.attributes.t === 'array' ? cell.formula.attributes.ref : undefined;
        const range = ref ? parseRange(ref) : undefined;
        const saved = storedValueOf(cell.attributes.t, cell.value, cell.inline);
        cells.push({
          sheet,
          row: cell.row,
          col: cell.col,
          formula,
          ...(range && rangeSize(range) > 1 ? { spill: range } : {}),
          dynamic: cell.attributes.cm !== undefined,
          ...(saved ? { saved } : {}),
        });
        if (range && rangeSize(range) > 1 && options.withSpillValues) spills.add(range);
        return;
      }
      const wanted =
        (options.withSpillValues && spills.contains(cell.row, cell.col)) ||
        (!extra.done && extra.contains(cell.row, cell.col));
      if (wanted) {
        const stored = storedValueOf(cell.attributes.t, cell.value, cell.inline);
        if (stored) values.set(cellKey(cell.row, cell.col), stored);
      }
    },
  });
  await feedXml(await pkg.stream(sheet.part), parser, sheet.part.name, {
    ...(options.onBytes ? { onBytes: options.onBytes } : {}),
  });
  return { cells, values };
}
