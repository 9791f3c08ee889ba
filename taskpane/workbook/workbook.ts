/**
 * The side panel's one way into the workbook. Every section of the panel talks to the workbook only
 * through this interface; `officeWorkbook.ts` implements it with the Excel JavaScript API (the agreed
 * subset, so the same code runs in Excel and in the no-Excel preview), and the tests implement the
 * same subset with office-addin-mock.
 *
 * Addresses: a *local* address is A1 form without a sheet ("B2:D4", "F3"); a *qualified* address is
 * what Excel reports ("Sheet1!B2:D4", "'Past tests'!A1:B12"). Rows and columns inside a block are
 * 0-based offsets from the block's top-left cell.
 */

/** A cell as the panel sees it: a number, text or boolean; "" for an empty cell; errors as text ("#VALUE!"). */
export type CellValue = string | number | boolean;

/** What the panel reads from a range: its place, its shown values and its formulas (or constants). */
export interface RangeContents {
  /** Qualified address as Excel gives it, e.g. "Sheet1!B2:D4" or "'Past tests'!A1:B12". */
  readonly address: string;
  /** The worksheet's name, unquoted ("Past tests"). */
  readonly sheet: string;
  /** The local A1 address ("B2:D4"; a single cell is "F3"). */
  readonly localAddress: string;
  readonly rowCount: number;
  readonly columnCount: number;
  /** Shown values, rowCount × columnCount. */
  readonly values: CellValue[][];
  /** "=…" text for formula cells, else the constant, rowCount × columnCount. */
  readonly formulas: CellValue[][];
}

/** The look of some cells. Colours are "#RRGGBB". */
export interface CellStyle {
  readonly bold?: boolean;
  readonly fontColor?: string;
  readonly fillColor?: string;
}

/** A styled rectangle inside a block, placed relative to the block's top-left cell (0-based). */
export interface BlockStyle {
  readonly row: number;
  readonly column: number;
  /** Default 1. */
  readonly rowCount?: number;
  /** Default 1. */
  readonly columnCount?: number;
  readonly style: CellStyle;
}

/**
 * A rectangular block the panel writes in one go: labels (constants) and live formulas ("=ABTEST.…").
 * The whole `area` (the cells plus any room their spills need) must be empty unless `overwrite` is set.
 */
export interface FormulaBlock {
  /** Worksheet to write on; default the active worksheet. */
  readonly sheet?: string;
  /** Local address of the top-left cell, e.g. "F2". */
  readonly topLeft: string;
  /** Rectangular: every row as long as the first. Strings starting with "=" are formulas. */
  readonly cells: readonly (readonly CellValue[])[];
  /** Same shape as `cells`; null or "" leaves the cell's number format alone. */
  readonly numberFormats?: readonly (readonly (string | null)[])[];
  readonly styles?: readonly BlockStyle[];
  /**
   * Size of the area that must be free (cells plus spill room), at least the size of `cells`.
   * Default: the size of `cells`.
   */
  readonly area?: { readonly rowCount: number; readonly columnCount: number };
  /** Write even where the area holds something (the user said so). Default false. */
  readonly overwrite?: boolean;
  /** Fit the block's columns to their contents after writing. Default false. */
  readonly autofit?: boolean;
}

/** How a block write ended. Nothing is ever left half-written. */
export type WriteOutcome =
  /** Everything was written. `address` is the qualified address of the area. */
  | { readonly kind: 'written'; readonly address: string }
  /** Nothing was written: these cells (local addresses) of the area are not empty. Ask before overwriting. */
  | { readonly kind: 'occupied'; readonly address: string; readonly occupiedCells: readonly string[] }
  /**
   * The write failed. `restored` says whether the area's previous contents were put back (true) or
   * whether putting them back failed too (false: the message says so).
   */
  | {
      readonly kind: 'failed';
      readonly address: string;
      readonly code: string;
      readonly message: string;
      readonly restored: boolean;
    };

/** A native Excel chart over a block of the sheet, so it stays in the workbook without the add-in. */
export interface ChartRequest {
  /** Worksheet of the source data and of the chart; default the active worksheet. */
  readonly sheet?: string;
  /** Local address of the source block: first column x values, then one column per series, header row first. */
  readonly sourceAddress: string;
  readonly type: 'XYScatterSmoothNoMarkers' | 'Line';
  readonly title: string;
  /** Local addresses of the cells the chart covers. */
  readonly topLeft: string;
  readonly bottomRight: string;
}

export type ChartOutcome =
  | { readonly kind: 'inserted'; readonly name: string }
  | { readonly kind: 'failed'; readonly code: string; readonly message: string };

/** A selection listener that can be taken off again. */
export interface Subscription {
  remove(): Promise<void>;
}

/** Everything the side panel may do to a workbook. */
export interface Workbook {
  /** The selected range (values and formulas). */
  readSelection(): Promise<RangeContents>;
  /** A range by sheet (default the active sheet) and local address. Rejects with an Error for a bad address or sheet. */
  readRange(address: string, sheet?: string): Promise<RangeContents>;
  /** The active worksheet's name. */
  activeSheetName(): Promise<string>;
  /** Write a block all-or-nothing (see WriteOutcome). Never rejects: failures are outcomes. */
  writeBlock(block: FormulaBlock): Promise<WriteOutcome>;
  /** Insert a native chart. Never rejects: failures are outcomes. */
  insertChart(request: ChartRequest): Promise<ChartOutcome>;
  /** Call `listener` after every selection change (it re-reads the selection itself). */
  onSelectionChanged(listener: () => void): Promise<Subscription>;
}
