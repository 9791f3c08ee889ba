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
  /** Size of the whole range (also when only its first rows were read). */
  readonly rowCount: number;
  readonly columnCount: number;
  /**
   * Shown values of the rows and columns read: all of them, or the first `maxRows` × `maxColumns` when the
   * range is larger (`truncated`). A data type reads as its plain value: a formatted number as the
   * number, an entity (linked data type) as the text it shows.
   */
  readonly values: CellValue[][];
  /** "=…" text for formula cells, else the constant, same size as `values`. */
  readonly formulas: CellValue[][];
  /** True when the range is larger than what was read. */
  readonly truncated: boolean;
}

/** How much of a range to read (defaults: READ_LIMITS). */
export interface ReadLimits {
  readonly maxRows?: number;
  readonly maxColumns?: number;
}

/** The most rows and columns a read loads unless asked otherwise: more than any table the panel reads. */
export const READ_LIMITS = { maxRows: 5001, maxColumns: 200 } as const;

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

/** A cell that holds something: its local address and what it held (formula or constant, else the shown value). */
export interface OccupiedCell {
  readonly address: string;
  readonly content: CellValue;
}

/**
 * A rectangular block the panel writes in one go: labels (constants) and live formulas ("=…").
 * The whole `area` (the cells plus any room their spills need) must be empty, except for the cells
 * listed in `overwrite`, which the user agreed to write over.
 */
export interface FormulaBlock {
  /** Worksheet to write on; default the active worksheet. */
  readonly sheet?: string;
  /** Create `sheet` first (it must not exist yet); a failed write deletes it again. */
  readonly newSheet?: boolean;
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
  /**
   * Cells of the area the user agreed to write over, each with the content they were shown. At the moment
   * of writing the area is read again: any other cell that holds something, or a listed cell whose
   * content changed meanwhile, stops the write (outcome 'occupied'). Default: none.
   */
  readonly overwrite?: readonly OccupiedCell[];
  /**
   * Fit the block's columns to their contents after writing: true for all its rows, `{ rows }` for its
   * first rows only (so a long note below does not make a column wide). Default false.
   */
  readonly autofit?: boolean | { readonly rows: number };
  /** Widths of the block's first columns, in points (Excel's unit). Only on a new sheet (`newSheet`). */
  readonly columnWidths?: readonly number[];
  /** How the new sheet prints (page layout, ExcelApi 1.9). Only on a new sheet (`newSheet`). */
  readonly page?: PageSetup;
}

/** How a sheet prints: its orientation, fitted on one page, the block as its print area. */
export interface PageSetup {
  readonly orientation: 'Portrait' | 'Landscape';
  /** Shrink the print to one page wide and one page tall. */
  readonly fitToOnePage: boolean;
  /** Print only the block's area (set as the sheet's print area). */
  readonly printBlockOnly: boolean;
}

/** How a block write ended. Nothing is ever left half-written without saying exactly what. */
export type WriteOutcome =
  /** Everything was written. `address` is the qualified address of the area. */
  | { readonly kind: 'written'; readonly address: string }
  /**
   * Nothing was written: these cells of the area hold something the user has not agreed to write over
   * (`occupied`, in reading order; `occupiedCells` are their addresses).
   */
  | {
      readonly kind: 'occupied';
      readonly address: string;
      readonly occupiedCells: readonly string[];
      readonly occupied: readonly OccupiedCell[];
    }
  /**
   * The write failed. The area was then put back (contents, number formats, fonts, fills, column widths)
   * and read again: `restored` is true only when everything checked out; otherwise `unrestored` lists
   * what differs ("F4: number format") and the message says so.
   */
  | {
      readonly kind: 'failed';
      readonly address: string;
      readonly code: string;
      readonly message: string;
      readonly restored: boolean;
      readonly unrestored: readonly string[];
    };

/** Where a block of a given size could go near a table (see Workbook.findPlaces). */
export interface PlaceRequest {
  /** Worksheet of the table. */
  readonly sheet: string;
  /** Local address of the table. */
  readonly table: string;
  readonly rowCount: number;
  readonly columnCount: number;
  /** Name wanted for a new sheet (made unique and valid for Excel). */
  readonly newSheetName: string;
}

/** Empty places for a block: right of the table, below everything under it, or a new sheet. */
export interface Places {
  /** Top-left cell of the first empty area right of the table (same top row), or null if none fits. */
  readonly right: string | null;
  /** Top-left cell of the first empty area below the table (same left column), or null if none fits. */
  readonly below: string | null;
  /** A sheet name that does not exist yet. */
  readonly newSheet: string;
}

/** A native Excel chart over a block of the sheet, so it stays in the workbook without the add-in. */
export interface ChartRequest {
  /** Worksheet of the source data and of the chart; default the active worksheet. */
  readonly sheet?: string;
  /** Local address of the source block: first column x values, then one column per series, header row first. */
  readonly sourceAddress: string;
  /** Smooth lines (densities), straight lines with markers (intervals), or a line chart. */
  readonly type: 'XYScatterSmoothNoMarkers' | 'XYScatterLines' | 'Line';
  readonly title: string;
  /** Titles of the horizontal (x) and vertical (y) axes, when given. */
  readonly axisTitles?: { readonly x: string; readonly y: string };
  /**
   * Leave the vertical axis without tick labels: for charts whose heights only place one line per series (the
   * metric read-out's lift intervals), where numbers on that axis would mean nothing to a reader.
   */
  readonly hideValueLabels?: boolean;
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

/** The Excel JavaScript API requirement set the panel's workbook code needs (also declared in the manifest). */
export const REQUIRED_API = { set: 'ExcelApi', version: '1.12' } as const;

/**
 * Requirement sets some actions use beyond REQUIRED_API. The manifest does not require them (that would hide
 * the add-in from every Excel without them); the panel asks Office at run time and offers the nearest thing.
 */
export const OPTIONAL_API = {
  /**
   * Cell notes (Worksheet.notes, Note): the shareable copy keeps each formula in a note on its value; without
   * them, in a "How computed" column beside the values.
   */
  notes: { set: 'ExcelApi', version: '1.18' },
} as const;

/** What this Excel offers beyond REQUIRED_API (see OPTIONAL_API). */
export interface Capabilities {
  readonly notes: boolean;
}

/** A formula cell found by a scan of a sheet. */
export interface FormulaCell {
  /** Local address of the formula cell ("B11"). */
  readonly address: string;
  /** Its formula as Excel gives it ("=ABTEST.PROB_HIGHEST(C4:C6, B4:B6)"). */
  readonly formula: string;
  /** Local address of the cells its result fills: the whole spill ("B11:B13"), or the cell itself. */
  readonly result: string;
  /** Shown values over `result` (errors as text, "#N/A"). */
  readonly values: CellValue[][];
}

/** What a scan of a sheet found: its used range and every formula cell in it with the cells its result fills. */
export interface SheetScan {
  readonly sheet: string;
  /** Local address of the used range ("A1:N99"), "" for an empty sheet. */
  readonly range: string;
  readonly formulaCells: readonly FormulaCell[];
  /** Native charts on the sheet. */
  readonly charts: number;
  /** Names of all sheets of the workbook when the scan was made (for naming a copy). */
  readonly sheetNames: readonly string[];
  /**
   * True when the used range is larger than the panel reads (READ_LIMITS) or holds more formula cells than
   * MAX_SCANNED_FORMULAS: then `formulaCells` is empty and nothing may be copied from the scan.
   */
  readonly tooLarge: boolean;
}

/** The most formula cells a scan looks up one by one (each needs its spill range). */
export const MAX_SCANNED_FORMULAS = 20_000;

/** What to change on a sheet's copy (addresses are the copy's, after its header rows went in). */
export interface SheetCopyEdits {
  /**
   * Keep only these cells: everything else on the copy is cleared and charts whose top-left corner lies
   * outside are deleted. Undefined keeps the whole sheet.
   */
  readonly keepOnly?: string;
  /** Plain values written over cells (frozen results): numbers, text and TRUE/FALSE; "#N/A"-like text is written as that error. */
  readonly values: readonly { readonly address: string; readonly values: readonly (readonly CellValue[])[] }[];
  /** Text written into single cells (the header line, a "How computed" column). */
  readonly texts: readonly { readonly address: string; readonly text: string; readonly bold?: boolean }[];
  /** Notes added to single cells (OPTIONAL_API.notes); a note already there keeps its text and gets ours appended. */
  readonly notes: readonly { readonly address: string; readonly text: string }[];
}

/**
 * A copy of a sheet with some of its cells changed, as one all-or-nothing action: a new sheet right after the
 * source, its header rows inserted at the top, then the edits. The source sheet is never written.
 */
export interface CopyRequest {
  readonly source: string;
  /** Name of the copy: a sheet of that name must not exist at the moment of copying. */
  readonly newSheet: string;
  /**
   * The scan the user was shown. The source is scanned again at the moment of copying; if its formula cells
   * differ (addresses, formulas or result ranges), nothing is written and the outcome is 'changed'.
   */
  readonly shown: SheetScan;
  /** Empty rows inserted at the top of the copy (Excel moves formulas, charts and notes down with the cells). */
  readonly headerRows: number;
  /** A reason not to copy this scan (e.g. results still being computed), or null. Checked before anything is written. */
  problem(scan: SheetScan): string | null;
  /**
   * The edits, from the fresh scan and the copy's own formulas (read after the header rows went in, so their
   * references are the copy's): `copyFormula("B12")` is the formula now in B12 of the copy, or "" for none.
   */
  edits(scan: SheetScan, copyFormula: (address: string) => string): SheetCopyEdits;
}

/** How a sheet copy ended. */
export type CopyOutcome =
  /** The copy exists, with every edit made; `sheet` is its name, `address` its used range (qualified). */
  | {
      readonly kind: 'written';
      readonly sheet: string;
      readonly address: string;
      readonly chartsKept: number;
      readonly chartsRemoved: number;
      readonly notes: number;
    }
  /** Nothing was written: the source's formula cells changed since `shown`; `scan` is how they are now. */
  | { readonly kind: 'changed'; readonly scan: SheetScan }
  /**
   * Nothing was copied, or the copy failed and was deleted again (then checked: `restored` is true only when
   * no sheet the action made is left; otherwise `unrestored` names it).
   */
  | {
      readonly kind: 'failed';
      readonly code: string;
      readonly message: string;
      readonly restored: boolean;
      readonly unrestored: readonly string[];
    };

/** Everything the side panel may do to a workbook. */
export interface Workbook {
  /**
   * Null when this Excel offers everything the panel uses (REQUIRED_API), else a message saying what is
   * missing. Writing methods check it themselves and fail with that message.
   */
  hostProblem(): string | null;
  /** The selected range (values and formulas of at most `limits` rows and columns). */
  readSelection(limits?: ReadLimits): Promise<RangeContents>;
  /** A range by sheet (default the active sheet) and local address. Rejects with an Error for a bad address or sheet. */
  readRange(address: string, sheet?: string, limits?: ReadLimits): Promise<RangeContents>;
  /** The active worksheet's name. */
  activeSheetName(): Promise<string>;
  /** Empty places for a block beside a table. Rejects with the Office error when the sheet cannot be read. */
  findPlaces(request: PlaceRequest): Promise<Places>;
  /**
   * Write a block all-or-nothing: the area is checked again at the moment of writing, and a failed write
   * is undone and checked (see WriteOutcome). Writes run one at a time. Never rejects: failures are outcomes.
   */
  writeBlock(block: FormulaBlock): Promise<WriteOutcome>;
  /** Insert a native chart. Never rejects: failures are outcomes. */
  insertChart(request: ChartRequest): Promise<ChartOutcome>;
  /** What this Excel offers beyond REQUIRED_API (OPTIONAL_API), asked of Office at run time. */
  capabilities(): Capabilities;
  /** Every formula cell of a sheet's used range, with its spill. Rejects with the Office error for an unknown sheet. */
  scanSheet(sheet: string): Promise<SheetScan>;
  /**
   * Copy a sheet and change the copy (see CopyRequest), all or nothing: a failure deletes whatever sheet the
   * action made and checks that it is gone. Runs one at a time with writeBlock. Never rejects: failures are outcomes.
   */
  copySheet(request: CopyRequest): Promise<CopyOutcome>;
  /** Call `listener` after every selection change (it re-reads the selection itself). */
  onSelectionChanged(listener: () => void): Promise<Subscription>;
}
