/**
 * The Workbook interface on the Excel JavaScript API (REQUIRED_API, ExcelApi 1.12, declared in the
 * manifest and checked before writing), so the same code runs in Excel and in the no-Excel preview's
 * stand-in. It uses: getSelectedRange, worksheets (getItem, getItemOrNullObject, getActiveWorksheet,
 * add, load items/name), Worksheet (getRange, getUsedRangeOrNullObject, activate, delete, charts.add),
 * Range (load of address/values/formulas/numberFormat/rowCount/columnCount and, where ExcelApi 1.16 is
 * offered, valuesAsJson; full-size `formulas` and `numberFormat` writes; getCell, getResizedRange,
 * getColumn, getCellProperties/setCellProperties, format.font/fill/columnWidth/autofitColumns,
 * format.fill.clear, getSpillParentOrNullObject), Chart (title, axes.categoryAxis/valueAxis.title, setPosition,
 * name) and
 * onSelectionChanged. For copies and printed summaries, within ExcelApi 1.12: Worksheet.copy (1.7),
 * name, pageLayout (orientation, zoom, setPrintArea, centerHorizontally: 1.9), charts (load of
 * items/name/top/left, delete); Range getEntireRow, insert, clear, top/left/width/height (1.3),
 * getSpillingToRangeOrNullObject (1.12), format.columnWidth. Beyond it, only where Office says the host
 * has it (OPTIONAL_API): Worksheet.notes (getItemOrNullObject, add, Note.content; ExcelApi 1.18).
 *
 * Safety rules kept here, for every section that writes:
 * - Arrays written to a range always have the range's size (the API reference promises nothing for a
 *   1×1 array on a larger range).
 * - A block is written only after its area is read again at that moment; a cell that holds something
 *   the user did not agree to write over stops the write.
 * - Before writing, everything the write can change is recorded (contents, number formats, bold, font
 *   colour, fill, column widths, spilled cells); after a failed write it is put back step by step, read
 *   again and compared, and the outcome lists whatever differs.
 * - Writes run one at a time: a second click waits for the first write and then finds the area taken.
 *
 * Why one file of this size: it is one factory whose methods (reads, finding a free place, the write with
 * its record and undo, charts, the selection listener) share the queue that runs writes one at a time,
 * the host check and the read helpers; split, that state would have to pass between files.
 */
import type {
  Capabilities,
  CellValue,
  ChartOutcome,
  ChartRequest,
  CopyOutcome,
  CopyRequest,
  FormulaBlock,
  FormulaCell,
  OccupiedCell,
  PlaceRequest,
  Places,
  RangeContents,
  ReadLimits,
  SheetCopyEdits,
  SheetScan,
  Subscription,
  Workbook,
  WriteOutcome,
} from './workbook';
import { MAX_SCANNED_FORMULAS, OPTIONAL_API, READ_LIMITS, REQUIRED_API } from './workbook';
import { cellAddress, columnLetters, parseAddress, quoteSheet, rangeAddress, type CellPosition } from './address';
import { firstFreeRun, MAX_SCAN_CELLS, newSheetName, SHEET_COLUMNS, SHEET_ROWS } from './placement';

/** How the implementation gets a request context: Excel.run in the add-in, a mock in tests. */
export type ExcelRunner = <T>(batch: (context: Excel.RequestContext) => Promise<T>) => Promise<T>;

/** Whether the host offers a requirement set (Office.context.requirements.isSetSupported in Office). */
export type SupportCheck = (set: string, version: string) => boolean;

/** The set that gives valuesAsJson (entities and formatted numbers as data types). */
const DATA_TYPES_API = { set: 'ExcelApi', version: '1.16' } as const;

/** The most cells listed one by one in a message about what could not be put back. */
const LISTED = 12;

/** Office's answer; outside Office (no `Office` global, as in unit tests) every set counts as offered. */
function officeSupports(set: string, version: string): boolean {
  const office = (globalThis as { Office?: typeof Office }).Office;
  if (office === undefined) return true;
  return office.context?.requirements?.isSetSupported?.(set, version) === true;
}

/** The error code and message of a failed sync (Office.js errors carry a string `code`). */
function describeError(error: unknown): { code: string; message: string } {
  const record = (typeof error === 'object' && error !== null ? error : {}) as { code?: unknown; message?: unknown };
  const code = typeof record.code === 'string' && record.code !== '' ? record.code : 'GeneralException';
  const message = typeof record.message === 'string' && record.message !== '' ? record.message : String(error);
  return { code, message };
}

function isBlank(value: unknown): boolean {
  return value === '' || value === null || value === undefined;
}

/**
 * A cell as the panel reads it: its plain value, with a data type read from its JSON (valuesAsJson) when
 * given — an entity as the text it shows (its plain value is only "#VALUE!"), a formatted number as the
 * number. Anything else that is not a string, number or boolean reads as "".
 */
function plainCell(value: unknown, json: unknown): CellValue {
  const data = (typeof json === 'object' && json !== null ? json : {}) as {
    basicType?: unknown;
    basicValue?: unknown;
    text?: unknown;
    type?: unknown;
  };
  if (data.basicType === 'Error' && data.type !== 'Error' && typeof data.text === 'string') return data.text;
  const plain = 'basicValue' in data ? data.basicValue : value;
  if (typeof plain === 'string' || typeof plain === 'number' || typeof plain === 'boolean') return plain;
  if (typeof plain === 'object' && plain !== null && 'basicValue' in plain)
    return plainCell((plain as { basicValue: unknown }).basicValue, undefined);
  return '';
}

function worksheetOf(context: Excel.RequestContext, sheet: string | undefined): Excel.Worksheet {
  return sheet === undefined || sheet === ''
    ? context.workbook.worksheets.getActiveWorksheet()
    : context.workbook.worksheets.getItem(sheet);
}

/** Check a block's shapes; returns a message for a malformed block, else null. */
function shapeProblem(block: FormulaBlock): string | null {
  const rows = block.cells.length;
  const columns = block.cells[0]?.length ?? 0;
  if (rows === 0 || columns === 0) return 'the block to write is empty';
  if (block.cells.some((row) => row.length !== columns)) return 'the block to write is not rectangular';
  if (block.numberFormats) {
    if (block.numberFormats.length !== rows || block.numberFormats.some((row) => row.length !== columns)) {
      return 'the number formats do not match the block';
    }
  }
  const area = block.area ?? { rowCount: rows, columnCount: columns };
  if (area.rowCount < rows || area.columnCount < columns) return 'the area to keep free is smaller than the block';
  for (const style of block.styles ?? []) {
    const r = style.row + (style.rowCount ?? 1);
    const c = style.column + (style.columnCount ?? 1);
    if (style.row < 0 || style.column < 0 || r > rows || c > columns) return 'a style lies outside the block';
  }
  if (block.newSheet === true && (block.sheet === undefined || block.sheet === '')) return 'a new sheet needs a name';
  if ((block.columnWidths !== undefined || block.page !== undefined) && block.newSheet !== true) {
    return 'column widths and a page layout are set only on a new sheet';
  }
  if ((block.columnWidths ?? []).some((w) => !(Number.isFinite(w) && w > 0 && w <= 1000))) {
    return 'a column width must be above 0 and at most 1000 points';
  }
  if ((block.columnWidths?.length ?? 0) > area.columnCount) return 'more column widths than the block has columns';
  return null;
}

/**
 * A text constant as it must be written back through `formulas` to stay text: with Excel's apostrophe
 * prefix when Excel would otherwise read it as a formula, a number, a percentage, a date or a logical
 * ("00123", "=x", "1/2", "TRUE"); as it is in a cell formatted as Text ("@"). Cost O(length).
 */
export function keepText(text: string, numberFormat: string): string {
  if (text === '' || numberFormat === '@') return text;
  const misread =
    /^[=+\-@']/.test(text) ||
    /^\s*[-+]?[\d.,\s]*\d[\d.,\s]*(%|[eE][-+]?\d+)?\s*$/.test(text) ||
    /^\s*\d{1,4}[/.-]\d{1,2}([/.-]\d{1,4})?\s*$/.test(text) ||
    /^\s*(true|false)\s*$/i.test(text);
  return misread ? `'${text}` : text;
}

/** The look of one cell that a write can change. */
interface CellLook {
  readonly bold: boolean;
  readonly fontColor: string;
  readonly fillColor: string;
  /** True when the cell has no fill at all (restored with fill.clear()). */
  readonly noFill: boolean;
}

/** Everything a block write can change in its area, recorded before writing. */
interface Snapshot {
  readonly address: string;
  readonly formulas: CellValue[][];
  readonly values: CellValue[][];
  readonly numberFormat: string[][];
  readonly looks: CellLook[][];
  readonly widths: number[];
  /** Cells that show part of a spilled result whose formula sits elsewhere ("r,c"): put back by clearing. */
  readonly spilled: Set<string>;
}

const LOOK_OPTIONS: Excel.CellPropertiesLoadOptions = {
  format: { font: { bold: true, color: true }, fill: { color: true, pattern: true } },
};

function looksOf(properties: Excel.CellProperties[][]): CellLook[][] {
  return properties.map((row) =>
    row.map((p) => ({
      bold: p.format?.font?.bold === true,
      fontColor: String(p.format?.font?.color ?? '').toUpperCase(),
      fillColor: String(p.format?.fill?.color ?? '').toUpperCase(),
      noFill: p.format?.fill?.pattern === 'None' || p.format?.fill?.pattern === undefined,
    })),
  );
}

/** The cells of the block's style rectangles ("r,c"): the only ones whose font or fill a write changes. */
function styledCells(block: FormulaBlock): Set<string> {
  const out = new Set<string>();
  for (const style of block.styles ?? []) {
    for (let r = style.row; r < style.row + (style.rowCount ?? 1); r += 1) {
      for (let c = style.column; c < style.column + (style.columnCount ?? 1); c += 1) out.add(`${r},${c}`);
    }
  }
  return out;
}

/** Occupied cells of an area, in reading order. */
function occupiedCells(origin: CellPosition, formulas: CellValue[][], values: CellValue[][]): OccupiedCell[] {
  const out: OccupiedCell[] = [];
  formulas.forEach((row, r) =>
    row.forEach((formula, c) => {
      const value = values[r]?.[c];
      if (!isBlank(formula) || !isBlank(value)) {
        out.push({
          address: cellAddress({ row: origin.row + r, column: origin.column + c }),
          content: isBlank(formula) ? (value as CellValue) : formula,
        });
      }
    }),
  );
  return out;
}

function listed(items: readonly string[]): string {
  const shown = items.slice(0, LISTED).join('; ');
  return items.length > LISTED ? `${shown}; and ${items.length - LISTED} more` : shown;
}

/** A local address without its sheet and "$" signs ("'Past tests'!$B$2:$C$4" → "B2:C4"). */
function localOf(address: string): string {
  return address.slice(address.lastIndexOf('!') + 1).replace(/\$/g, '');
}

/** The local address `rows` rows further down. */
function shiftedDown(local: string, rows: number): string {
  const parsed = parseAddress(local);
  const size = {
    rowCount: parsed.end.row - parsed.start.row + 1,
    columnCount: parsed.end.column - parsed.start.column + 1,
  };
  return rangeAddress({ row: parsed.start.row + rows, column: parsed.start.column }, size.rowCount, size.columnCount);
}

/** True when two scans found the same formula cells (addresses, formulas and result ranges). */
function sameFormulaCells(a: SheetScan, b: SheetScan): boolean {
  if (a.tooLarge !== b.tooLarge || a.formulaCells.length !== b.formulaCells.length) return false;
  return a.formulaCells.every((cell, i) => {
    const other = b.formulaCells[i];
    return (
      other !== undefined &&
      other.address === cell.address &&
      other.formula === cell.formula &&
      other.result === cell.result
    );
  });
}

/** The parts of `used` outside `keep` (both local addresses), as at most four rectangles. Cost O(1). */
export function outsideOf(used: string, keep: string): string[] {
  const u = parseAddress(used);
  const k = parseAddress(keep);
  const out: string[] = [];
  const rect = (r0: number, c0: number, r1: number, c1: number): void => {
    if (r1 >= r0 && c1 >= c0) out.push(rangeAddress({ row: r0, column: c0 }, r1 - r0 + 1, c1 - c0 + 1));
  };
  rect(u.start.row, u.start.column, Math.min(u.end.row, k.start.row - 1), u.end.column);
  rect(Math.max(u.start.row, k.end.row + 1), u.start.column, u.end.row, u.end.column);
  const top = Math.max(u.start.row, k.start.row);
  const bottom = Math.min(u.end.row, k.end.row);
  rect(top, u.start.column, bottom, Math.min(u.end.column, k.start.column - 1));
  rect(top, Math.max(u.start.column, k.end.column + 1), bottom, u.end.column);
  return out;
}

/** A name Excel gives a copy of `source` before it is renamed: "Plan (2)", "Plan (3)"… */
function isCopyName(name: string, source: string, wanted: string): boolean {
  const lower = name.toLowerCase();
  if (lower === wanted.toLowerCase()) return true;
  const base = source.toLowerCase();
  return lower.startsWith(`${base} (`) && /^ \(\d+\)$/.test(lower.slice(base.length));
}

/**
 * Create the Office.js implementation of Workbook. `supports` answers requirement-set questions
 * (Office.context.requirements.isSetSupported by default).
 * Cost: reads make two syncs (size, then at most `limits` rows × columns); writeBlock makes one or two
 * syncs to read the area, one to write, and after a failure up to four to put things back and one to
 * check them. Methods never throw for workbook failures except readRange/readSelection/findPlaces,
 * which reject with the Office error (bad address, unknown sheet).
 * @example const workbook = createOfficeWorkbook(); await workbook.readSelection() //=> { address: "Sheet1!B2:D4", … }
 */
export function createOfficeWorkbook(
  run: ExcelRunner = (batch) => Excel.run(batch),
  supports: SupportCheck = officeSupports,
): Workbook {
  let writing: Promise<unknown> = Promise.resolve();
  const oneAtATime = <T>(work: () => Promise<T>): Promise<T> => {
    const next = writing.then(work, work);
    writing = next.catch(() => undefined);
    return next;
  };

  const hostProblem = (): string | null =>
    supports(REQUIRED_API.set, REQUIRED_API.version)
      ? null
      : `this version of Excel does not offer the Excel JavaScript API ${REQUIRED_API.version} that Lift Ledger needs to write safely ` +
        '(Excel 2021, Excel for Microsoft 365 and Excel on the web have it)';

  /** Loads a range's size, then its first rows and columns (values, formulas, data types). */
  const readContents = async (
    context: Excel.RequestContext,
    range: Excel.Range,
    limits: ReadLimits | undefined,
  ): Promise<RangeContents> => {
    range.load('address, rowCount, columnCount');
    await context.sync();
    const maxRows = Math.max(1, limits?.maxRows ?? READ_LIMITS.maxRows);
    const maxColumns = Math.max(1, limits?.maxColumns ?? READ_LIMITS.maxColumns);
    const rows = Math.min(range.rowCount, maxRows);
    const columns = Math.min(range.columnCount, maxColumns);
    const truncated = rows < range.rowCount || columns < range.columnCount;
    const part = truncated ? range.getCell(0, 0).getResizedRange(rows - 1, columns - 1) : range;
    const json = supports(DATA_TYPES_API.set, DATA_TYPES_API.version);
    part.load(json ? 'values, formulas, valuesAsJson' : 'values, formulas');
    await context.sync();
    const address = range.address;
    const parsed = parseAddress(address);
    const jsonRows = json ? (part.valuesAsJson as unknown[][]) : [];
    const values = (part.values as unknown[][]).map((row, r) => row.map((v, c) => plainCell(v, jsonRows[r]?.[c])));
    const formulas = (part.formulas as unknown[][]).map((row, r) =>
      row.map((f, c) => (typeof f === 'string' && f.startsWith('=') ? f : (values[r]?.[c] ?? plainCell(f, undefined)))),
    );
    return {
      address,
      sheet: parsed.sheet,
      localAddress: address.slice(address.lastIndexOf('!') + 1).replace(/\$/g, ''),
      rowCount: range.rowCount,
      columnCount: range.columnCount,
      values,
      formulas,
      truncated,
    };
  };

  const failed = (address: string, code: string, message: string): WriteOutcome => ({
    kind: 'failed',
    address,
    code,
    message,
    restored: true,
    unrestored: [],
  });

  const writeOnce = async (block: FormulaBlock): Promise<WriteOutcome> => {
    const rows = block.cells.length;
    const columns = block.cells[0]?.length ?? 0;
    const origin = parseAddress(block.topLeft).start;
    const size = block.area ?? { rowCount: rows, columnCount: columns };
    const areaLocal = rangeAddress(origin, size.rowCount, size.columnCount);
    const problem = shapeProblem(block);
    if (problem !== null) return failed(areaLocal, 'InvalidArgument', problem);
    const host = hostProblem();
    if (host !== null) return failed(areaLocal, 'NotSupported', `${host}; nothing was written`);
    const newSheet = block.newSheet === true;
    const sheetName = block.sheet ?? '';

    // 1. Read the area as it is now (and the sheet names, for a new sheet).
    let snapshot: Snapshot | null;
    try {
      snapshot = await run(async (context) => {
        const sheets = context.workbook.worksheets;
        sheets.load('items/name');
        if (newSheet) {
          await context.sync();
          if (sheets.items.some((s) => s.name.toLowerCase() === sheetName.toLowerCase())) return null;
          return {
            address: `${quoteSheet(sheetName)}!${areaLocal}`,
            formulas: [],
            values: [],
            numberFormat: [],
            looks: [],
            widths: [],
            spilled: new Set<string>(),
          };
        }
        const area = worksheetOf(context, block.sheet).getRange(areaLocal);
        area.load('address, formulas, values, numberFormat');
        const properties = area.getCellProperties(LOOK_OPTIONS);
        const columnFormats = Array.from({ length: size.columnCount }, (_, c) =>
          area.getColumn(c).format.load('columnWidth'),
        );
        await context.sync();
        return {
          address: area.address,
          formulas: (area.formulas as unknown[][]).map((row) => row.map((v) => plainCell(v, undefined))),
          values: (area.values as unknown[][]).map((row) => row.map((v) => plainCell(v, undefined))),
          numberFormat: (area.numberFormat as unknown[][]).map((row) => row.map((f) => String(f ?? 'General'))),
          looks: looksOf(properties.value),
          widths: columnFormats.map((format) => format.columnWidth),
          spilled: new Set<string>(),
        };
      });
    } catch (error) {
      const { code, message } = describeError(error);
      return failed(areaLocal, code, `could not read ${areaLocal}: ${message}; nothing was written`);
    }
    if (snapshot === null) {
      return failed(
        `${quoteSheet(sheetName)}!${areaLocal}`,
        'InvalidArgument',
        `a sheet named "${sheetName}" exists already; nothing was written`,
      );
    }
    const before = snapshot;

    // 2. Check again: only cells the user agreed to write over, with the content they saw, may hold something.
    const occupied = newSheet ? [] : occupiedCells(origin, before.formulas, before.values);
    const agreed = new Map((block.overwrite ?? []).map((cell) => [cell.address, cell.content]));
    if (occupied.some((cell) => !agreed.has(cell.address) || agreed.get(cell.address) !== cell.content)) {
      return {
        kind: 'occupied',
        address: before.address,
        occupiedCells: occupied.map((cell) => cell.address),
        occupied,
      };
    }
    if (occupied.length > 0) {
      // Cells showing part of another formula's spill are put back by clearing them (the spill returns).
      try {
        await run(async (context) => {
          const area = worksheetOf(context, block.sheet).getRange(areaLocal);
          const parents = occupied.map((cell) => {
            const p = parseAddress(cell.address).start;
            const r = p.row - origin.row;
            const c = p.column - origin.column;
            const parent = area.getCell(r, c).getSpillParentOrNullObject();
            parent.load('address');
            return { r, c, parent };
          });
          await context.sync();
          for (const { r, c, parent } of parents) {
            if (parent.isNullObject) continue;
            const anchor = parseAddress(parent.address).start;
            if (anchor.row !== origin.row + r || anchor.column !== origin.column + c) before.spilled.add(`${r},${c}`);
          }
        });
      } catch (error) {
        const { code, message } = describeError(error);
        return failed(
          before.address,
          code,
          `could not check ${before.address} for spilled results: ${message}; nothing was written`,
        );
      }
    }

    // 3. Write everything in one sync: full-size arrays for contents and number formats.
    const contents = Array.from({ length: size.rowCount }, (_, r) =>
      Array.from({ length: size.columnCount }, (_, c) => {
        const value = block.cells[r]?.[c];
        return isBlank(value) ? '' : (value as CellValue);
      }),
    );
    const formats = Array.from({ length: size.rowCount }, (_, r) =>
      Array.from({ length: size.columnCount }, (_, c) => {
        const format = block.numberFormats?.[r]?.[c];
        return format !== null && format !== undefined && format !== ''
          ? format
          : (before.numberFormat[r]?.[c] ?? 'General');
      }),
    );
    try {
      await run(async (context) => {
        const sheet = newSheet ? context.workbook.worksheets.add(sheetName) : worksheetOf(context, block.sheet);
        const target = sheet.getRange(areaLocal);
        target.formulas = contents;
        target.numberFormat = formats;
        for (const style of block.styles ?? []) {
          const cells = target
            .getCell(style.row, style.column)
            .getResizedRange((style.rowCount ?? 1) - 1, (style.columnCount ?? 1) - 1);
          if (style.style.bold !== undefined) cells.format.font.bold = style.style.bold;
          if (style.style.fontColor !== undefined) cells.format.font.color = style.style.fontColor;
          if (style.style.fillColor !== undefined) cells.format.fill.color = style.style.fillColor;
        }
        if (block.autofit === true) target.format.autofitColumns();
        else if (typeof block.autofit === 'object') {
          const rowsToFit = Math.min(Math.max(1, block.autofit.rows), size.rowCount);
          target
            .getCell(0, 0)
            .getResizedRange(rowsToFit - 1, size.columnCount - 1)
            .format.autofitColumns();
        }
        (block.columnWidths ?? []).forEach((width, c) => {
          target.getColumn(c).format.columnWidth = width;
        });
        if (block.page !== undefined) {
          const layout = sheet.pageLayout;
          layout.orientation = block.page.orientation as Excel.PageOrientation;
          if (block.page.fitToOnePage) layout.zoom = { horizontalFitToPages: 1, verticalFitToPages: 1 };
          if (block.page.printBlockOnly) layout.setPrintArea(areaLocal);
          layout.centerHorizontally = true;
        }
        if (newSheet) sheet.activate();
        await context.sync();
      });
      return { kind: 'written', address: before.address };
    } catch (error) {
      return undo(block, before, origin, areaLocal, describeError(error));
    }
  };

  /** Put back what a failed write may have changed, then read the area again and say what differs. */
  const undo = async (
    block: FormulaBlock,
    before: Snapshot,
    origin: CellPosition,
    areaLocal: string,
    cause: { code: string; message: string },
  ): Promise<WriteOutcome> => {
    const steps: string[] = [];
    const step = async (
      what: string,
      batch: (context: Excel.RequestContext, target: Excel.Range) => void | Promise<void>,
    ): Promise<void> => {
      try {
        await run(async (context) => {
          await batch(context, worksheetOf(context, block.sheet).getRange(areaLocal));
          await context.sync();
        });
      } catch (error) {
        steps.push(`${what} (${describeError(error).message})`);
      }
    };
    let unrestored: string[];
    if (block.newSheet === true) {
      const name = block.sheet ?? '';
      try {
        const exists = await run(async (context) => {
          const sheet = context.workbook.worksheets.getItemOrNullObject(name);
          sheet.load('name');
          await context.sync();
          if (sheet.isNullObject) return false;
          sheet.delete();
          await context.sync();
          const check = context.workbook.worksheets.getItemOrNullObject(name);
          check.load('name');
          await context.sync();
          return !check.isNullObject;
        });
        unrestored = exists ? [`the new sheet "${name}" (delete it by hand)`] : [];
      } catch (error) {
        unrestored = [`the new sheet "${name}" may remain (${describeError(error).message})`];
      }
    } else {
      const styled = styledCells(block);
      const restoreFormulas = before.formulas.map((row, r) =>
        row.map((f, c) => {
          if (before.spilled.has(`${r},${c}`)) return '';
          // A text constant reads the same through formulas and values; keep it text when written back.
          const text = typeof f === 'string' && f === before.values[r]?.[c];
          return text ? keepText(f, before.numberFormat[r]?.[c] ?? 'General') : f;
        }),
      );
      // Number formats first: a cell formatted as Text takes its text back as text.
      await step('number formats', (_context, target) => {
        target.numberFormat = before.numberFormat;
      });
      await step('contents', (_context, target) => {
        target.formulas = restoreFormulas;
      });
      if (styled.size > 0) {
        // Only what differs now is set back, so untouched properties stay as they were (not made explicit).
        await step('fonts and fills', async (context, target) => {
          const current = target.getCellProperties(LOOK_OPTIONS);
          await context.sync();
          const now = looksOf(current.value);
          for (const key of styled) {
            const [r, c] = key.split(',').map(Number) as [number, number];
            const was = before.looks[r]?.[c];
            const is = now[r]?.[c];
            if (was === undefined || is === undefined) continue;
            const cell = target.getCell(r, c);
            const font: { bold?: boolean; color?: string } = {};
            if (is.bold !== was.bold) font.bold = was.bold;
            if (is.fontColor !== was.fontColor) font.color = was.fontColor;
            if (font.bold !== undefined || font.color !== undefined) cell.setCellProperties([[{ format: { font } }]]);
            if (is.noFill !== was.noFill || (!was.noFill && is.fillColor !== was.fillColor)) {
              if (was.noFill) cell.format.fill.clear();
              else cell.format.fill.color = was.fillColor;
            }
          }
        });
      }
      if (block.autofit !== undefined && block.autofit !== false) {
        await step('column widths', async (context, target) => {
          const current = before.widths.map((_, c) => target.getColumn(c).format.load('columnWidth'));
          await context.sync();
          before.widths.forEach((width, c) => {
            if (Math.abs((current[c]?.columnWidth ?? width) - width) > 0.01)
              target.getColumn(c).format.columnWidth = width;
          });
        });
      }
      try {
        unrestored = await run(async (context) => {
          const area = worksheetOf(context, block.sheet).getRange(areaLocal);
          area.load('formulas, values, numberFormat');
          const properties = area.getCellProperties(LOOK_OPTIONS);
          const columnFormats = before.widths.map((_, c) => area.getColumn(c).format.load('columnWidth'));
          await context.sync();
          const looks = looksOf(properties.value);
          const formulas = area.formulas as unknown[][];
          const values = area.values as unknown[][];
          const numberFormat = area.numberFormat as unknown[][];
          const differences: string[] = [];
          before.formulas.forEach((row, r) =>
            row.forEach((formula, c) => {
              const what: string[] = [];
              const spilled = before.spilled.has(`${r},${c}`);
              const now = plainCell(spilled ? values[r]?.[c] : formulas[r]?.[c], undefined);
              const was = spilled ? before.values[r]?.[c] : formula;
              if (now !== was && !(isBlank(now) && isBlank(was))) what.push('contents');
              if (String(numberFormat[r]?.[c]) !== before.numberFormat[r]?.[c]) what.push('number format');
              if (styled.has(`${r},${c}`)) {
                const a = looks[r]?.[c];
                const b = before.looks[r]?.[c];
                if (a?.bold !== b?.bold) what.push('bold');
                if (a?.fontColor !== b?.fontColor) what.push('font colour');
                if (a?.noFill !== b?.noFill || (b?.noFill === false && a?.fillColor !== b?.fillColor))
                  what.push('fill');
              }
              if (what.length > 0)
                differences.push(
                  `${cellAddress({ row: origin.row + r, column: origin.column + c })}: ${what.join(', ')}`,
                );
            }),
          );
          if (block.autofit !== undefined && block.autofit !== false) {
            columnFormats.forEach((format, c) => {
              if (Math.abs(format.columnWidth - (before.widths[c] ?? format.columnWidth)) > 0.01) {
                differences.push(`column ${columnLetters(origin.column + c)}: width`);
              }
            });
          }
          return differences;
        });
      } catch (error) {
        unrestored = [`the whole area (it could not be read back: ${describeError(error).message})`];
      }
    }
    const restored = unrestored.length === 0;
    const failedSteps = steps.length > 0 ? ` Putting back failed for: ${steps.join('; ')}.` : '';
    return {
      kind: 'failed',
      address: before.address,
      code: cause.code,
      message: restored
        ? `nothing was written to ${before.address} (${cause.message}); every cell was put back and checked`
        : `writing to ${before.address} failed (${cause.message}) and these could not be put back as they were: ` +
          `${listed(unrestored)}; check them.${failedSteps}`,
      restored,
      unrestored,
    };
  };

  const capabilities = (): Capabilities => ({ notes: supports(OPTIONAL_API.notes.set, OPTIONAL_API.notes.version) });

  /** Every formula cell of the used range, with the range its result fills (one sync per step, three at most). */
  const scan = (sheetName: string): Promise<SheetScan> =>
    run(async (context) => {
      const sheets = context.workbook.worksheets;
      sheets.load('items/name');
      const sheet = sheets.getItem(sheetName);
      const used = sheet.getUsedRangeOrNullObject(true);
      used.load('address, rowCount, columnCount');
      const charts = sheet.charts;
      charts.load('items/name');
      await context.sync();
      const base = { sheet: sheetName, charts: charts.items.length, sheetNames: sheets.items.map((s) => s.name) };
      if (used.isNullObject) return { ...base, range: '', formulaCells: [], tooLarge: false };
      const local = localOf(used.address);
      if (used.rowCount > READ_LIMITS.maxRows || used.columnCount > READ_LIMITS.maxColumns) {
        return { ...base, range: local, formulaCells: [], tooLarge: true };
      }
      used.load('formulas, values');
      await context.sync();
      const origin = parseAddress(local).start;
      const values = (used.values as unknown[][]).map((row) => row.map((v) => plainCell(v, undefined)));
      const found: { r: number; c: number; formula: string }[] = [];
      (used.formulas as unknown[][]).forEach((row, r) =>
        row.forEach((f, c) => {
          if (typeof f === 'string' && f.startsWith('=')) found.push({ r, c, formula: f });
        }),
      );
      if (found.length > MAX_SCANNED_FORMULAS) return { ...base, range: local, formulaCells: [], tooLarge: true };
      const spills = found.map(({ r, c }) => {
        const spill = used.getCell(r, c).getSpillingToRangeOrNullObject();
        spill.load('address');
        return spill;
      });
      if (found.length > 0) await context.sync();
      const formulaCells: FormulaCell[] = found.map(({ r, c, formula }, i) => {
        const address = cellAddress({ row: origin.row + r, column: origin.column + c });
        const spill = spills[i] as Excel.Range;
        const result = spill.isNullObject ? address : localOf(spill.address);
        const extent = parseAddress(result);
        const shown: CellValue[][] = [];
        for (let row = extent.start.row; row <= extent.end.row; row += 1) {
          const line: CellValue[] = [];
          for (let col = extent.start.column; col <= extent.end.column; col += 1) {
            line.push(values[row - origin.row]?.[col - origin.column] ?? '');
          }
          shown.push(line);
        }
        return { address, formula, result, values: shown };
      });
      return { ...base, range: local, formulaCells, tooLarge: false };
    });

  /** Delete the sheets a failed copy made (its name, or Excel's "Source (2)" before renaming) and check. */
  const undoCopy = async (
    request: CopyRequest,
    before: readonly string[],
    cause: { code: string; message: string },
  ): Promise<CopyOutcome> => {
    const known = new Set(before.map((name) => name.toLowerCase()));
    const made = (names: readonly string[]): string[] =>
      names.filter((name) => !known.has(name.toLowerCase()) && isCopyName(name, request.source, request.newSheet));
    let unrestored: string[];
    try {
      unrestored = await run(async (context) => {
        const sheets = context.workbook.worksheets;
        sheets.load('items/name');
        await context.sync();
        const extra = made(sheets.items.map((sheet) => sheet.name));
        if (extra.length === 0) return [];
        for (const name of extra) context.workbook.worksheets.getItem(name).delete();
        await context.sync();
        const check = context.workbook.worksheets;
        check.load('items/name');
        await context.sync();
        return made(check.items.map((sheet) => sheet.name)).map((name) => `the sheet "${name}" (delete it by hand)`);
      });
    } catch (error) {
      unrestored = [`a sheet the copy had started may remain (${describeError(error).message})`];
    }
    const restored = unrestored.length === 0;
    return {
      kind: 'failed',
      code: cause.code,
      message: restored
        ? `the copy could not be made (${cause.message}); no part of it is left in the workbook (checked), and "${request.source}" was not touched`
        : `the copy failed (${cause.message}) and ${listed(unrestored)} could not be removed; check the workbook`,
      restored,
      unrestored,
    };
  };

  const copyOnce = async (request: CopyRequest): Promise<CopyOutcome> => {
    const fail = (code: string, message: string): CopyOutcome => ({
      kind: 'failed',
      code,
      message,
      restored: true,
      unrestored: [],
    });
    const host = hostProblem();
    if (host !== null) return fail('NotSupported', `${host}; nothing was copied`);
    if (!(Number.isInteger(request.headerRows) && request.headerRows >= 0 && request.headerRows <= 10)) {
      return fail('InvalidArgument', 'the header rows must be a whole number from 0 to 10; nothing was copied');
    }
    let fresh: SheetScan;
    try {
      fresh = await scan(request.source);
    } catch (error) {
      const { code, message } = describeError(error);
      return fail(code, `could not read the sheet "${request.source}": ${message}; nothing was copied`);
    }
    if (!sameFormulaCells(fresh, request.shown)) return { kind: 'changed', scan: fresh };
    if (fresh.tooLarge) {
      return fail(
        'InvalidArgument',
        `"${request.source}" is too large for the panel to copy (${fresh.range}); nothing was copied`,
      );
    }
    const problem = request.problem(fresh);
    if (problem !== null) return fail('NotReady', `${problem}; nothing was copied`);
    const wanted = request.newSheet.toLowerCase();
    if (request.newSheet.trim() === '' || fresh.sheetNames.some((name) => name.toLowerCase() === wanted)) {
      return fail('InvalidArgument', `a sheet named "${request.newSheet}" exists already; nothing was copied`);
    }
    const notesOffered = capabilities().notes;
    try {
      // 1. The copy right after its source and its header rows; then its own formulas and number formats.
      const read = await run(async (context) => {
        const source = context.workbook.worksheets.getItem(request.source);
        const copy = source.copy('After' as Excel.WorksheetPositionType, source);
        copy.name = request.newSheet;
        if (request.headerRows > 0) {
          copy
            .getRange('A1')
            .getResizedRange(request.headerRows - 1, 0)
            .getEntireRow()
            .insert('Down' as Excel.InsertShiftDirection);
        }
        await context.sync();
        if (fresh.range === '') return null;
        const shifted = shiftedDown(fresh.range, request.headerRows);
        const range = copy.getRange(shifted);
        range.load('formulas, numberFormat');
        await context.sync();
        return {
          origin: parseAddress(shifted).start,
          formulas: range.formulas as unknown[][],
          numberFormat: range.numberFormat as unknown[][],
        };
      });
      /** What the copy held at a cell (its formula or number format), read in step 1. */
      const at = (grid: 'formulas' | 'numberFormat', row: number, column: number): unknown =>
        read === null ? undefined : read[grid][row - read.origin.row]?.[column - read.origin.column];
      const copyFormula = (address: string): string => {
        const p = parseAddress(address).start;
        const f = at('formulas', p.row, p.column);
        return typeof f === 'string' && f.startsWith('=') ? f : '';
      };
      const edits: SheetCopyEdits = request.edits(fresh, copyFormula);
      if (edits.notes.length > 0 && !notesOffered) {
        throw Object.assign(
          new Error(`this Excel cannot add notes (Excel JavaScript API ${OPTIONAL_API.notes.version})`),
          {
            code: 'NotSupported',
          },
        );
      }
      // 2. The edits, then the notes (appended to notes the copy brought along), then the charts outside.
      return await run(async (context): Promise<CopyOutcome> => {
        const copy = context.workbook.worksheets.getItem(request.newSheet);
        let keep: Excel.Range | null = null;
        if (edits.keepOnly !== undefined) {
          const used = copy.getUsedRangeOrNullObject(false);
          used.load('address');
          await context.sync();
          if (!used.isNullObject) {
            for (const rect of outsideOf(localOf(used.address), edits.keepOnly)) {
              copy.getRange(rect).clear('All' as Excel.ClearApplyTo);
            }
          }
          keep = copy.getRange(edits.keepOnly);
          keep.load('top, left, width, height');
        }
        for (const edit of edits.values) {
          const start = parseAddress(edit.address).start;
          copy.getRange(edit.address).formulas = edit.values.map((row, r) =>
            row.map((value, c) =>
              typeof value === 'string'
                ? keepText(value, String(at('numberFormat', start.row + r, start.column + c) ?? 'General'))
                : value,
            ),
          );
        }
        for (const text of edits.texts) {
          const cell = copy.getRange(text.address);
          cell.formulas = [[keepText(text.text, 'General')]];
          if (text.bold === true) cell.format.font.bold = true;
        }
        const existing = edits.notes.map((note) => {
          const found = copy.notes.getItemOrNullObject(note.address);
          found.load('content');
          return found;
        });
        const charts = copy.charts;
        charts.load(keep === null ? 'items/name' : 'items/name, items/top, items/left');
        await context.sync();
        edits.notes.forEach((note, i) => {
          const found = existing[i] as Excel.Note;
          if (found.isNullObject) copy.notes.add(note.address, note.text);
          else found.content = `${found.content}\n\n${note.text}`;
        });
        let removed = 0;
        if (keep !== null) {
          const box = keep;
          for (const chart of charts.items) {
            const inside =
              chart.top >= box.top - 0.5 &&
              chart.top < box.top + box.height &&
              chart.left >= box.left - 0.5 &&
              chart.left < box.left + box.width;
            if (!inside) {
              chart.delete();
              removed += 1;
            }
          }
        }
        copy.activate();
        const used = copy.getUsedRangeOrNullObject(true);
        used.load('address');
        await context.sync();
        return {
          kind: 'written',
          sheet: request.newSheet,
          address: used.isNullObject ? `${quoteSheet(request.newSheet)}!A1` : used.address,
          chartsKept: charts.items.length - removed,
          chartsRemoved: removed,
          notes: edits.notes.length,
        };
      });
    } catch (error) {
      return undoCopy(request, fresh.sheetNames, describeError(error));
    }
  };

  return {
    hostProblem,

    async readSelection(limits?: ReadLimits): Promise<RangeContents> {
      return run((context) => readContents(context, context.workbook.getSelectedRange(), limits));
    },

    async readRange(address: string, sheet?: string, limits?: ReadLimits): Promise<RangeContents> {
      return run((context) => readContents(context, worksheetOf(context, sheet).getRange(address), limits));
    },

    async activeSheetName(): Promise<string> {
      return run(async (context) => {
        const sheet = context.workbook.worksheets.getActiveWorksheet();
        sheet.load('name');
        await context.sync();
        return sheet.name;
      });
    },

    async findPlaces(request: PlaceRequest): Promise<Places> {
      return run(async (context) => {
        const sheet = context.workbook.worksheets.getItem(request.sheet);
        const used = sheet.getUsedRangeOrNullObject(true);
        used.load('address');
        const sheets = context.workbook.worksheets;
        sheets.load('items/name');
        await context.sync();
        const table = parseAddress(request.table);
        const usedEnd = used.isNullObject ? table.end : parseAddress(used.address).end;
        const lastRow = Math.max(usedEnd.row, table.end.row);
        const lastColumn = Math.max(usedEnd.column, table.end.column);
        const h = request.rowCount;
        const w = request.columnCount;
        // Regions that may hold something: right of the table in its rows, below it in its columns.
        const rightFirst = table.end.column + 1;
        const belowFirst = table.end.row + 1;
        const rightCells = lastColumn >= rightFirst ? h * (lastColumn - rightFirst + 1) : 0;
        const belowCells = lastRow >= belowFirst ? w * (lastRow - belowFirst + 1) : 0;
        const load = (cells: number, topLeft: CellPosition, rows: number, columns: number): Excel.Range | null => {
          if (
            cells === 0 ||
            cells > MAX_SCAN_CELLS ||
            topLeft.row + rows > SHEET_ROWS ||
            topLeft.column + columns > SHEET_COLUMNS
          )
            return null;
          const range = sheet.getRange(rangeAddress(topLeft, rows, columns));
          range.load('values, formulas');
          return range;
        };
        const rightRange = load(
          rightCells,
          { row: table.start.row, column: rightFirst },
          h,
          lastColumn - rightFirst + 1,
        );
        const belowRange = load(
          belowCells,
          { row: belowFirst, column: table.start.column },
          lastRow - belowFirst + 1,
          w,
        );
        if (rightRange !== null || belowRange !== null) await context.sync();
        const filled = (
          range: Excel.Range | null,
          cells: number,
          line: (r: number, c: number) => number,
        ): Set<number> | null => {
          if (range === null) return cells === 0 ? new Set() : null;
          const out = new Set<number>();
          const values = range.values as unknown[][];
          (range.formulas as unknown[][]).forEach((row, r) =>
            row.forEach((f, c) => {
              if (!isBlank(f) || !isBlank(values[r]?.[c])) out.add(line(r, c));
            }),
          );
          return out;
        };
        const rightFilled = filled(rightRange, rightCells, (_r, c) => rightFirst + c);
        const belowFilled = filled(belowRange, belowCells, (r) => belowFirst + r);
        // Columns (rows) beyond the used range are empty; when the region was too big to read, start after it.
        const right =
          table.start.row + h > SHEET_ROWS
            ? null
            : firstFreeRun(
                (i) => (rightFilled === null ? i > lastColumn : !rightFilled.has(i)),
                rightFilled === null ? lastColumn + 2 : table.end.column + 2,
                w,
                SHEET_COLUMNS,
              );
        const below =
          table.start.column + w > SHEET_COLUMNS
            ? null
            : firstFreeRun(
                (i) => (belowFilled === null ? i > lastRow : !belowFilled.has(i)),
                belowFilled === null ? lastRow + 2 : table.end.row + 2,
                h,
                SHEET_ROWS,
              );
        return {
          right: right === null ? null : cellAddress({ row: table.start.row, column: right }),
          below: below === null ? null : cellAddress({ row: below, column: table.start.column }),
          newSheet: newSheetName(
            request.newSheetName,
            sheets.items.map((s) => s.name),
          ),
        };
      });
    },

    writeBlock(block: FormulaBlock): Promise<WriteOutcome> {
      return oneAtATime(() => writeOnce(block));
    },

    async insertChart(request: ChartRequest): Promise<ChartOutcome> {
      try {
        return await run(async (context) => {
          const sheet = worksheetOf(context, request.sheet);
          const source = sheet.getRange(request.sourceAddress);
          const chart = sheet.charts.add(request.type as Excel.ChartType, source, 'Columns' as Excel.ChartSeriesBy);
          chart.title.text = request.title;
          if (request.axisTitles !== undefined) {
            // In an XY scatter chart the category axis is the horizontal (x) one (from memory of Excel's object
            // model: xlCategory names a scatter chart's x axis).
            chart.axes.categoryAxis.title.text = request.axisTitles.x;
            chart.axes.valueAxis.title.text = request.axisTitles.y;
          }
          // ChartAxis.tickLabelPosition is in ExcelApi 1.7, below REQUIRED_API (1.12).
          if (request.hideValueLabels === true) chart.axes.valueAxis.tickLabelPosition = 'None';
          chart.setPosition(request.topLeft, request.bottomRight);
          // The agreed subset reads a chart's name without load(); Office.js needs load('name') first.
          const loadable = typeof (chart as { load?: unknown }).load === 'function';
          if (loadable) chart.load('name');
          await context.sync();
          const name = loadable ? chart.name : (chart as { name?: unknown }).name;
          return {
            kind: 'inserted',
            name: typeof name === 'string' && name !== '' ? name : request.title,
          } as ChartOutcome;
        });
      } catch (error) {
        const { code, message } = describeError(error);
        return { kind: 'failed', code, message: `the chart could not be added (${message})` };
      }
    },

    capabilities,

    scanSheet(sheet: string): Promise<SheetScan> {
      return scan(sheet);
    },

    copySheet(request: CopyRequest): Promise<CopyOutcome> {
      return oneAtATime(() => copyOnce(request));
    },

    async onSelectionChanged(listener: () => void): Promise<Subscription> {
      return run(async (context) => {
        const handle = context.workbook.onSelectionChanged.add(async () => {
          listener();
        });
        await context.sync();
        return {
          async remove(): Promise<void> {
            handle.remove();
            const own = (handle as unknown as { context?: { sync?: () => Promise<unknown> } }).context;
            if (own && typeof own.sync === 'function') await own.sync();
          },
        };
      });
    },
  };
}
