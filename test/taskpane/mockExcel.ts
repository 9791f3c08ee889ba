/**
 * A small in-memory workbook behind office-addin-mock's OfficeMockObject, implementing the Excel API
 * subset the side panel uses (see taskpane/workbook/officeWorkbook.ts). As in Excel:
 * - writes queue on the proxy objects and reach the grid only at context.sync(), in the order the
 *   ranges and calls were made; loaded properties are readable only after the sync;
 * - an array written to `formulas`, `values` or `numberFormat` must have the range's size, else the sync
 *   fails with InvalidArgument and Excel's message ("The number of rows or columns in the input array
 *   doesn't match the size or dimensions of the range.", as quoted in issue #11);
 * - a sync can be made to fail, optionally after applying the first half of its writes (Excel does not
 *   roll back a failed batch), so tests can check that the panel puts everything back;
 * - a spilled result can be placed (`spill`): its other cells report the shown value as their formula
 *   (from memory of Excel's behaviour) and getSpillParentOrNullObject names the formula cell; a spilled
 *   cell that is written over and cleared again shows its spilled value again (Excel re-spills);
 *   getSpillingToRangeOrNullObject on the formula cell gives the whole spill;
 * - a sheet can be copied (Worksheet.copy: cells, widths, notes, charts and page layout come along, the copy
 *   is named "Name (2)" until renamed) and renamed; inserting whole rows (getEntireRow().insert) moves
 *   cells, notes and charts down and adjusts the references of the sheet's own formulas (the tokenizer of
 *   cli/core/formula.ts); Range.clear removes cells and their notes;
 * - notes (Worksheet.notes: getItemOrNullObject, add, content; ExcelApi 1.18) are offered only when
 *   `apiVersion` is at least 1.18; charts have top/left in points and can be listed and deleted; ranges
 *   have top/left/width/height (rows 15 points high, columns their width); pageLayout records
 *   orientation, zoom, centerHorizontally and the print area.
 * The mock does not calculate: a formula cell shows its formula text as its value.
 */
import { OfficeMockObject } from 'office-addin-mock';
import { tokenize } from '../../cli/core/formula';
import { cellAddress, columnLetters, parseAddress, quoteSheet, rangeAddress } from '../../taskpane/workbook/address';
import type { CellValue } from '../../taskpane/workbook/workbook';
import type { ExcelRunner, SupportCheck } from '../../taskpane/workbook/officeWorkbook';

/** One cell of the mock grid. `fillColor` "" means no fill. */
export interface MockCell {
  formula: CellValue;
  value: CellValue;
  numberFormat: string;
  bold: boolean;
  fontColor: string;
  fillColor: string;
  /** Set when the cell shows part of a spilled result: the formula cell and the value it spills here. */
  spill?: { readonly parent: string; readonly value: CellValue };
  /** A data type (as valuesAsJson gives it), e.g. an entity; its plain value is `value`. */
  json?: Record<string, unknown>;
}

/** A chart the mock recorded. */
export interface MockChart {
  sheet: string;
  type: string;
  source: string;
  seriesBy: string;
  title: string;
  /** The x (category) and y (value) axes' titles, when the panel set them. */
  axisTitles?: { x: string; y: string };
  /** The value axis's tickLabelPosition, when the panel set it ('None' hides the vertical axis's numbers). */
  valueTickLabels?: string;
  position: [string, string] | null;
  name: string;
}

/** What a sheet's page layout was set to (undefined: never set). */
export interface MockPageLayout {
  orientation?: string;
  zoom?: { horizontalFitToPages?: number; verticalFitToPages?: number; scale?: number };
  centerHorizontally?: boolean;
  printArea?: string;
}

/** Make a sync fail: which call (1-based, counted over the harness's life), the error code, and whether part of the batch lands first. */
export interface SyncFailure {
  readonly call: number;
  readonly code: string;
  readonly message: string;
  /**
   * Apply part of the batch's writes before failing, as a partly applied batch: true for the first half,
   * a number for that many (each property write or call counts once, in order).
   */
  readonly partial: boolean | number;
}

/** The mock workbook and its controls. */
export interface MockExcel {
  readonly run: ExcelRunner;
  /** Requirement sets: ExcelApi up to `apiVersion`. */
  readonly supports: SupportCheck;
  apiVersion: string;
  readonly charts: MockChart[];
  readonly handlers: (() => void)[];
  selection: { sheet: string; address: string };
  activeSheet: string;
  failures: SyncFailure[];
  syncCalls: number;
  /** The grid as it stood right after each partly applied failed batch (see SyncFailure.partial). */
  readonly partialSnapshots: string[];
  /** Every batch's write operations, in order, as short descriptions ("formulas Sheet1!A1:B2"). */
  readonly writeLog: string[];
  set(sheet: string, address: string, cells: CellValue[][]): void;
  /** Place a spilled result: `formula` in the top-left cell of `address`, `values` shown over the block. */
  spill(sheet: string, address: string, formula: string, values: CellValue[][]): void;
  /** Give cells a look (number format, bold, font colour, fill). */
  style(
    sheet: string,
    address: string,
    look: Partial<Pick<MockCell, 'numberFormat' | 'bold' | 'fontColor' | 'fillColor'>>,
  ): void;
  cell(sheet: string, address: string): MockCell;
  formulas(sheet: string, address: string): CellValue[][];
  sheetNames(): string[];
  columnWidth(sheet: string, column: string): number;
  /** The notes of a sheet by local address. */
  notes(sheet: string): Record<string, string>;
  /** Put a note on a cell (as a user would). */
  addNote(sheet: string, address: string, text: string): void;
  /** What a sheet's page layout was set to. */
  pageLayout(sheet: string): MockPageLayout;
  /** Place a chart by hand (as a user would): its source block and the cells it covers. */
  addChart(sheet: string, source: string, from: string, to: string, title: string): void;
  /** A deep copy of every cell and column width, to compare before and after. */
  snapshot(): string;
}

const key = (row: number, column: number): string => `${row},${column}`;
const DEFAULT_WIDTH = 48;
/** Row height in points (Excel's default for its default font, from memory). */
const ROW_HEIGHT = 15;

/** A cell reference's end as text, keeping its "$" signs. */
function refEndText(end: { row?: number; col?: number; rowAbsolute: boolean; colAbsolute: boolean }): string {
  const col = end.col === undefined ? '' : `${end.colAbsolute ? '$' : ''}${columnLetters(end.col)}`;
  const row = end.row === undefined ? '' : `${end.rowAbsolute ? '$' : ''}${end.row + 1}`;
  return col + row;
}

/**
 * A formula after `count` rows were inserted above row `at` of `sheet` (0-based): its references to that
 * sheet (without a sheet name, or naming it) at or below the row move down, "$" or not, as Excel does.
 */
function insertRowsInFormula(formula: string, sheet: string, at: number, count: number): string {
  let out = '';
  let from = 0;
  for (const token of tokenize(formula)) {
    if (token.type !== 'ref') continue;
    if (token.sheet !== undefined && token.sheet.name.toLowerCase() !== sheet.toLowerCase()) continue;
    const move = <E extends { row?: number }>(end: E): E =>
      end.row !== undefined && end.row >= at ? { ...end, row: end.row + count } : end;
    const first = move(token.first);
    const last = token.last ? move(token.last) : undefined;
    out +=
      formula.slice(from, token.start) + token.sheetText + refEndText(first) + (last ? `:${refEndText(last)}` : '');
    from = token.end;
  }
  return out + formula.slice(from);
}
const SIZE_MISMATCH =
  "The number of rows or columns in the input array doesn't match the size or dimensions of the range.";

function officeError(code: string, message: string): Error {
  return Object.assign(new Error(message), { code });
}

function compareVersions(a: string, b: string): number {
  const pa = a.split('.').map(Number);
  const pb = b.split('.').map(Number);
  for (let i = 0; i < Math.max(pa.length, pb.length); i += 1) {
    const d = (pa[i] ?? 0) - (pb[i] ?? 0);
    if (d !== 0) return d;
  }
  return 0;
}

/** A queued write: applied at sync in order. A range's property writes expand into one step each. */
type Op = () => void;
type Queued = Op | { readonly expand: () => Op[] };

/** office-addin-mock's placeholders for a property read before load or before sync. */
const PLACEHOLDERS = new Set(['Error, property was not loaded', 'Error, context.sync() was not called']);
/** True when a proxy property was assigned (not merely loaded) since `initial`. */
const assigned = (now: unknown, initial: unknown): boolean =>
  now !== initial && !(typeof now === 'string' && PLACEHOLDERS.has(now));

/** An OfficeMockObject whose isNullObject is readable after sync without a load, as in Office.js. */
function nullable(data: Record<string, unknown>, isNull: boolean): OfficeMockObject {
  const object = new OfficeMockObject(data);
  Object.defineProperty(object, 'isNullObject', { value: isNull, enumerable: true });
  return object;
}

/**
 * Build a mock workbook with the given sheets (first one active).
 * @example const excel = mockExcel(['Sheet1']); excel.set('Sheet1', 'A1:B1', [['x', 1]])
 */
export function mockExcel(sheets: string[]): MockExcel {
  const grid = new Map<string, Map<string, MockCell>>(sheets.map((s) => [s, new Map()]));
  const widths = new Map<string, Map<number, number>>(sheets.map((s) => [s, new Map()]));
  const charts: MockChart[] = [];
  const notes = new Map<string, Map<string, string>>(sheets.map((s) => [s, new Map()]));
  const layouts = new Map<string, MockPageLayout>(sheets.map((s) => [s, {}]));
  /** Old name → new name after a rename, so ranges made before a rename in the same batch find their sheet. */
  const aliases = new Map<string, string>();
  const real = (sheet: string): string => {
    let name = sheet;
    for (let i = 0; i < 100 && aliases.has(name); i += 1) name = aliases.get(name) as string;
    return name;
  };
  const handlers: (() => void)[] = [];
  const partialSnapshots: string[] = [];
  const writeLog: string[] = [];

  const sheetCells = (sheet: string): Map<string, MockCell> => {
    const cells = grid.get(real(sheet));
    if (cells === undefined) throw officeError('ItemNotFound', `The requested resource doesn't exist: ${sheet}`);
    return cells;
  };
  const getCell = (sheet: string, row: number, column: number): MockCell => {
    const cells = sheetCells(sheet);
    let cell = cells.get(key(row, column));
    if (cell === undefined) {
      cell = { formula: '', value: '', numberFormat: 'General', bold: false, fontColor: '#000000', fillColor: '' };
      cells.set(key(row, column), cell);
    }
    return cell;
  };
  /** What Excel reports as a cell's formula and value (a cleared spilled cell shows its spill again). */
  const shownFormula = (cell: MockCell): CellValue => (cell.formula !== '' ? cell.formula : (cell.spill?.value ?? ''));
  const shownValue = (cell: MockCell): CellValue => (cell.formula !== '' ? cell.value : (cell.spill?.value ?? ''));
  /**
   * What Excel makes of a value written through `formulas`/`values` (from memory of Excel's behaviour,
   * the subset the tests need): a leading apostrophe keeps text as text (and is dropped); in a cell not
   * formatted as Text, a string that reads as a plain number becomes that number.
   */
  const writeContent = (cell: MockCell, v: CellValue, parse = false): void => {
    let stored = v;
    if (parse && typeof v === 'string') {
      if (v.startsWith("'")) stored = v.slice(1);
      else if (cell.numberFormat !== '@' && /^\s*[-+]?\d+(\.\d+)?\s*$/.test(v)) stored = Number(v);
    }
    cell.formula = stored;
    cell.value = stored;
    delete cell.json;
  };

  /** Left edge of a column in points (the widths of the columns before it). */
  const leftOf = (sheet: string, column: number): number => {
    let sum = 0;
    for (let c = 0; c < column; c += 1) sum += widths.get(real(sheet))?.get(c) ?? DEFAULT_WIDTH;
    return sum;
  };
  /** The cells a formula cell's result fills (local address), or null when it does not spill. */
  const spillExtent = (sheet: string, row: number, column: number): string | null => {
    const anchor = cellAddress({ row, column });
    let bottom = row;
    let right = column;
    let found = false;
    for (const [k, cell] of sheetCells(sheet)) {
      if (cell.spill?.parent !== anchor || cell.formula !== '') continue;
      const [r, c] = k.split(',').map(Number) as [number, number];
      bottom = Math.max(bottom, r);
      right = Math.max(right, c);
      found = true;
    }
    return found ? rangeAddress({ row, column }, bottom - row + 1, right - column + 1) : null;
  };
  const shiftCell = (address: string, at: number, count: number): string => {
    const p = parseAddress(address).start;
    return cellAddress({ row: p.row >= at ? p.row + count : p.row, column: p.column });
  };
  const shiftRange = (address: string, at: number, count: number): string => {
    const p = parseAddress(address);
    const start = shiftCell(cellAddress(p.start), at, count);
    const end = shiftCell(cellAddress(p.end), at, count);
    return start === end ? start : `${start}:${end}`;
  };
  /** Whole rows inserted above row `at` (0-based): cells, notes and charts move down; the sheet's formulas follow. */
  const insertRows = (sheet: string, at: number, count: number): void => {
    const name = real(sheet);
    const cells = sheetCells(name);
    const moved = new Map<string, MockCell>();
    for (const [k, cell] of cells) {
      const [r, c] = k.split(',').map(Number) as [number, number];
      if (typeof cell.formula === 'string' && cell.formula.startsWith('=')) {
        cell.formula = insertRowsInFormula(cell.formula, name, at, count);
      }
      if (cell.spill) cell.spill = { ...cell.spill, parent: shiftCell(cell.spill.parent, at, count) };
      moved.set(key(r >= at ? r + count : r, c), cell);
    }
    grid.set(name, moved);
    const sheetNotes = notes.get(name) ?? new Map<string, string>();
    notes.set(name, new Map([...sheetNotes].map(([a, text]) => [shiftCell(a, at, count), text])));
    for (const chart of charts) {
      if (chart.sheet !== name) continue;
      chart.source = shiftRange(chart.source, at, count);
      if (chart.position)
        chart.position = [shiftCell(chart.position[0], at, count), shiftCell(chart.position[1], at, count)];
    }
  };
  /** Range.clear('All'): the cells and their notes go. */
  const clearCells = (sheet: string, top: number, left: number, rows: number, columns: number): void => {
    const name = real(sheet);
    const cells = sheetCells(name);
    for (let r = top; r < top + rows; r += 1) {
      for (let c = left; c < left + columns; c += 1) {
        cells.delete(key(r, c));
        notes.get(name)?.delete(cellAddress({ row: r, column: c }));
      }
    }
  };
  /** Worksheet.copy(After, source): everything of the sheet, as a new sheet right after it. */
  const copySheetNow = (source: string, name: string): void => {
    const from = real(source);
    if (grid.has(name)) throw officeError('ItemAlreadyExists', `A sheet named ${name} already exists.`);
    const cells = new Map(
      [...sheetCells(from)].map(([k, cell]) => [k, { ...cell, ...(cell.spill ? { spill: { ...cell.spill } } : {}) }]),
    );
    const entries = [...grid.entries()];
    const index = entries.findIndex(([n]) => n === from);
    entries.splice(index + 1, 0, [name, cells]);
    grid.clear();
    for (const [n, c] of entries) grid.set(n, c);
    widths.set(name, new Map(widths.get(from)));
    notes.set(name, new Map(notes.get(from)));
    layouts.set(name, { ...layouts.get(from) });
    for (const chart of charts.filter((c) => c.sheet === from)) {
      charts.push({
        ...chart,
        sheet: name,
        position: chart.position ? [...chart.position] : null,
        name: `Chart ${charts.length + 1}`,
      });
    }
  };
  const renameSheet = (from: string, to: string): void => {
    const old = real(from);
    if (old === to) return;
    if (grid.has(to)) throw officeError('ItemAlreadyExists', `A sheet named ${to} already exists.`);
    const entries = [...grid.entries()].map(([n, c]) => [n === old ? to : n, c] as [string, Map<string, MockCell>]);
    grid.clear();
    for (const [n, c] of entries) grid.set(n, c);
    for (const map of [widths, notes, layouts] as Map<string, unknown>[]) {
      if (map.has(old)) {
        map.set(to, map.get(old));
        map.delete(old);
      }
    }
    for (const chart of charts) if (chart.sheet === old) chart.sheet = to;
    if (state.activeSheet === old) state.activeSheet = to;
    aliases.set(old, to);
  };

  const state = {
    selection: { sheet: sheets[0] ?? 'Sheet1', address: 'A1' },
    activeSheet: sheets[0] ?? 'Sheet1',
    failures: [] as SyncFailure[],
    syncCalls: 0,
    apiVersion: '1.18',
  };

  const supports: SupportCheck = (set, version) =>
    set === 'ExcelApi' && compareVersions(version, state.apiVersion) <= 0;

  const makeRun: ExcelRunner = async (batch) => {
    const ops: Queued[] = [];
    const reads: (() => void)[] = [];
    const proxies: OfficeMockObject[] = [];
    const localAddressOf = new WeakMap<object, string>();
    const newSheets = new Set<string>();

    const log = (text: string): void => {
      writeLog.push(text);
    };

    const checkSize = (data: unknown, rows: number, columns: number): unknown[][] => {
      if (
        !Array.isArray(data) ||
        data.length !== rows ||
        data.some((row) => !Array.isArray(row) || row.length !== columns)
      ) {
        throw officeError('InvalidArgument', SIZE_MISMATCH);
      }
      return data as unknown[][];
    };

    const makeRange = (sheet: string, top: number, left: number, rows: number, columns: number): OfficeMockObject => {
      if (!grid.has(real(sheet)) && !newSheets.has(sheet))
        throw officeError('ItemNotFound', `The requested resource doesn't exist: ${sheet}`);
      if (rows < 1 || columns < 1) throw officeError('InvalidArgument', 'The range is empty.');
      const exists = grid.has(real(sheet));
      const at = (r: number, c: number): MockCell | undefined =>
        exists ? getCell(sheet, top + r, left + c) : undefined;
      const table = <T>(fn: (cell: MockCell | undefined, r: number, c: number) => T): T[][] =>
        Array.from({ length: rows }, (_, r) => Array.from({ length: columns }, (_, c) => fn(at(r, c), r, c)));
      const formulas = table((cell) => (cell ? shownFormula(cell) : ''));
      const values = table((cell) => (cell ? shownValue(cell) : ''));
      const valuesAsJson = table((cell) => {
        if (cell?.json) return { ...cell.json };
        const v = cell ? shownValue(cell) : '';
        if (v === '') return { type: 'Empty', basicValue: '' };
        if (typeof v === 'number') return { type: 'Double', basicValue: v };
        if (typeof v === 'boolean') return { type: 'Boolean', basicValue: v };
        return { type: 'String', basicValue: v };
      });
      const numberFormat = table((cell) => cell?.numberFormat ?? 'General');
      const local = rangeAddress({ row: top, column: left }, rows, columns);
      const columnWidth = widths.get(real(sheet))?.get(left) ?? DEFAULT_WIDTH;
      const geometry = exists
        ? {
            top: top * ROW_HEIGHT,
            left: leftOf(sheet, left),
            width: leftOf(sheet, left + columns) - leftOf(sheet, left),
            height: rows * ROW_HEIGHT,
          }
        : { top: top * ROW_HEIGHT, left: 0, width: 0, height: rows * ROW_HEIGHT };
      const spillParent = (() => {
        const cell = at(0, 0);
        return cell?.spill !== undefined && cell.formula === '' ? cell.spill.parent : null;
      })();
      const proxy: OfficeMockObject = new OfficeMockObject({
        address: `${quoteSheet(sheet)}!${local}`,
        values,
        formulas,
        valuesAsJson,
        rowCount: rows,
        columnCount: columns,
        numberFormat,
        ...geometry,
        format: {
          font: { bold: false, color: '#000000' },
          fill: {
            color: '',
            clear: () => {
              ops.push(() => {
                log(`fill.clear ${sheet}!${local}`);
                for (let r = 0; r < rows; r += 1)
                  for (let c = 0; c < columns; c += 1) getCell(sheet, top + r, left + c).fillColor = '';
              });
            },
          },
          columnWidth,
          autofitColumns: () => {
            ops.push(() => {
              log(`autofit ${sheet}!${local}`);
              for (let c = 0; c < columns; c += 1) {
                let longest = 0;
                for (let r = 0; r < rows; r += 1)
                  longest = Math.max(longest, String(getCell(sheet, top + r, left + c).value).length);
                widths.get(real(sheet))?.set(left + c, 10 + 6 * longest);
              }
            });
          },
        },
        getCell: (r: number, c: number) => makeRange(sheet, top + r, left + c, 1, 1),
        getResizedRange: (dr: number, dc: number) => makeRange(sheet, top, left, rows + dr, columns + dc),
        getOffsetRange: (dr: number, dc: number) => makeRange(sheet, top + dr, left + dc, rows, columns),
        getColumn: (c: number) => makeRange(sheet, top, left + c, rows, 1),
        getCellProperties: () => {
          const result = { value: undefined as unknown };
          reads.push(() => {
            result.value = table((cell) => ({
              format: {
                font: { bold: cell?.bold ?? false, color: cell?.fontColor ?? '#000000' },
                fill: cell?.fillColor
                  ? { color: cell.fillColor, pattern: 'Solid' }
                  : { color: '#FFFFFF', pattern: 'None' },
              },
            }));
          });
          return result;
        },
        setCellProperties: (data: unknown) => {
          ops.push(() => {
            const cells = checkSize(data, rows, columns) as {
              format?: { font?: { bold?: boolean; color?: string }; fill?: { color?: string } };
            }[][];
            log(`setCellProperties ${sheet}!${local}`);
            cells.forEach((row, r) =>
              row.forEach((p, c) => {
                const cell = getCell(sheet, top + r, left + c);
                if (p.format?.font?.bold !== undefined) cell.bold = p.format.font.bold;
                if (p.format?.font?.color !== undefined) cell.fontColor = p.format.font.color;
                if (p.format?.fill?.color !== undefined) cell.fillColor = p.format.fill.color;
              }),
            );
          });
        },
        getEntireRow: () => ({
          insert: (shift: string) => {
            ops.push(() => {
              if (shift !== 'Down') throw officeError('InvalidArgument', `whole rows are inserted Down, not ${shift}`);
              log(`insert rows ${sheet}!${top + 1}:${top + rows}`);
              insertRows(sheet, top, rows);
            });
          },
        }),
        clear: (applyTo?: string) => {
          ops.push(() => {
            if (applyTo !== undefined && applyTo !== 'All')
              throw officeError('InvalidArgument', `the mock clears All only, not ${applyTo}`);
            log(`clear ${sheet}!${local}`);
            clearCells(sheet, top, left, rows, columns);
          });
        },
        getSpillingToRangeOrNullObject: () => {
          if (rows !== 1 || columns !== 1) throw officeError('InvalidArgument', 'The range must be a single cell.');
          const extent = exists ? spillExtent(sheet, top, left) : null;
          const spill = nullable(
            { address: extent === null ? '' : `${quoteSheet(real(sheet))}!${extent}` },
            extent === null,
          );
          proxies.push(spill);
          return spill;
        },
        getSpillParentOrNullObject: () => {
          const parent = nullable(
            { address: spillParent === null ? '' : `${quoteSheet(sheet)}!${spillParent}` },
            spillParent === null,
          );
          proxies.push(parent);
          return parent;
        },
      });
      localAddressOf.set(proxy, local);
      proxies.push(proxy);
      const initial = {
        formulas: proxy.formulas as unknown,
        values: proxy.values as unknown,
        numberFormat: proxy.numberFormat as unknown,
        bold: proxy.format.font.bold as unknown,
        fontColor: proxy.format.font.color as unknown,
        fill: proxy.format.fill.color as unknown,
        columnWidth: proxy.format.columnWidth as unknown,
      };
      // The range's property writes, applied in the order the range was made, one step per property.
      ops.push({
        expand: () => {
          const steps: Op[] = [];
          const each = (fn: (cell: MockCell, r: number, c: number) => void): void => {
            for (let r = 0; r < rows; r += 1)
              for (let c = 0; c < columns; c += 1) fn(getCell(sheet, top + r, left + c), r, c);
          };
          for (const property of ['formulas', 'values'] as const) {
            if (!assigned(proxy[property], initial[property])) continue;
            const data = proxy[property] as unknown;
            steps.push(() => {
              const written = checkSize(data, rows, columns);
              log(`${property} ${sheet}!${local}`);
              each((cell, r, c) => writeContent(cell, (written[r]?.[c] ?? '') as CellValue, true));
            });
          }
          if (assigned(proxy.numberFormat, initial.numberFormat)) {
            const data = proxy.numberFormat as unknown;
            steps.push(() => {
              const written = checkSize(data, rows, columns);
              log(`numberFormat ${sheet}!${local}`);
              each((cell, r, c) => {
                cell.numberFormat = String(written[r]?.[c]);
              });
            });
          }
          const font = proxy.format.font;
          const fill = proxy.format.fill;
          if (assigned(font.bold, initial.bold)) steps.push(() => each((cell) => (cell.bold = font.bold as boolean)));
          if (assigned(font.color, initial.fontColor))
            steps.push(() => each((cell) => (cell.fontColor = font.color as string)));
          if (assigned(fill.color, initial.fill))
            steps.push(() => each((cell) => (cell.fillColor = fill.color as string)));
          if (assigned(proxy.format.columnWidth, initial.columnWidth)) {
            steps.push(() => {
              for (let c = 0; c < columns; c += 1)
                widths.get(real(sheet))?.set(left + c, proxy.format.columnWidth as number);
            });
          }
          return steps;
        },
      });
      return proxy;
    };

    const makeSheet = (name: string, mustExist = true): OfficeMockObject => {
      const known = (): boolean => grid.has(real(name)) || newSheets.has(name);
      if (mustExist && !known()) throw officeError('ItemNotFound', `The requested resource doesn't exist: ${name}`);
      /** Notes need ExcelApi 1.18: on an older host the call fails at sync, as an unknown API would. */
      const notesOffered = (): void => {
        if (!supports('ExcelApi', '1.18'))
          throw officeError('ApiNotFound', 'The API you are trying to use could not be found (Worksheet.notes).');
      };
      const sheet: OfficeMockObject = nullable(
        {
          name,
          getRange: (address: string) => {
            const parsed = parseAddress(address);
            return makeRange(
              name,
              parsed.start.row,
              parsed.start.column,
              parsed.end.row - parsed.start.row + 1,
              parsed.end.column - parsed.start.column + 1,
            );
          },
          getUsedRangeOrNullObject: () => {
            if (!grid.has(real(name)))
              throw officeError('ItemNotFound', `The requested resource doesn't exist: ${name}`);
            let bottom = -1;
            let right = -1;
            for (const [k, cell] of grid.get(real(name)) ?? new Map<string, MockCell>()) {
              if (shownFormula(cell) === '' && shownValue(cell) === '') continue;
              const [r, c] = k.split(',').map(Number) as [number, number];
              bottom = Math.max(bottom, r);
              right = Math.max(right, c);
            }
            if (bottom < 0) {
              const none = nullable({ address: '' }, true);
              proxies.push(none);
              return none;
            }
            // The used range from A1 (Excel starts it at the first used cell; the panel does not rely on either).
            const used = makeRange(name, 0, 0, bottom + 1, right + 1);
            Object.defineProperty(used, 'isNullObject', { value: false, enumerable: true });
            return used;
          },
          activate: () => {
            ops.push(() => {
              log(`activate ${name}`);
              state.activeSheet = real(name);
            });
          },
          delete: () => {
            ops.push(() => {
              const gone = real(name);
              log(`delete ${gone}`);
              grid.delete(gone);
              widths.delete(gone);
              notes.delete(gone);
              layouts.delete(gone);
              for (let i = charts.length - 1; i >= 0; i -= 1) if (charts[i]?.sheet === gone) charts.splice(i, 1);
              if (state.activeSheet === gone) state.activeSheet = [...grid.keys()][0] ?? '';
            });
          },
          copy: (position: string, relativeTo?: unknown) => {
            if (position !== 'After' || relativeTo === undefined)
              throw officeError('InvalidArgument', 'the mock copies a sheet After a sheet only');
            const base = real(name);
            let n = 2;
            const taken = (candidate: string): boolean =>
              [...grid.keys(), ...newSheets].some((s) => s.toLowerCase() === candidate.toLowerCase());
            while (taken(`${base} (${n})`)) n += 1;
            const made = `${base} (${n})`;
            newSheets.add(made);
            ops.push(() => {
              log(`copy ${base} as ${made}`);
              copySheetNow(base, made);
            });
            return makeSheet(made);
          },
        },
        !known(),
      );
      const initialName = sheet.name as unknown;
      // A name assigned in the batch renames the sheet at sync, in order with the other writes.
      ops.push({
        expand: () =>
          assigned(sheet.name, initialName)
            ? [
                () => {
                  log(`rename ${real(name)} to ${String(sheet.name)}`);
                  renameSheet(name, String(sheet.name));
                },
              ]
            : [],
      });
      const chartItems = { value: null as null | Record<string, unknown>[] };
      const chartCollection = {
        add: (type: string, source: OfficeMockObject, seriesBy: string) => {
          const chart: MockChart = {
            sheet: real(name),
            type,
            source: localAddressOf.get(source) ?? '(not a range of this batch)',
            seriesBy,
            title: '',
            position: null,
            name: `Chart ${charts.length + 1}`,
          };
          const position = { value: null as [string, string] | null };
          const proxy: OfficeMockObject = new OfficeMockObject({
            name: chart.name,
            title: { text: '' },
            axes: {
              categoryAxis: { title: { text: '' } },
              valueAxis: { title: { text: '' }, tickLabelPosition: 'NextToAxis' },
            },
            setPosition: (start: string, end: string) => {
              position.value = [start, end];
            },
          });
          const initialTitle = proxy.title.text;
          const initialX = proxy.axes.categoryAxis.title.text;
          const initialY = proxy.axes.valueAxis.title.text;
          const initialTicks = proxy.axes.valueAxis.tickLabelPosition;
          ops.push(() => {
            if (typeof proxy.title.text === 'string' && assigned(proxy.title.text, initialTitle))
              chart.title = proxy.title.text;
            const x = proxy.axes.categoryAxis.title.text;
            const y = proxy.axes.valueAxis.title.text;
            if (assigned(x, initialX) && assigned(y, initialY)) chart.axisTitles = { x: String(x), y: String(y) };
            const ticks = proxy.axes.valueAxis.tickLabelPosition;
            if (assigned(ticks, initialTicks)) chart.valueTickLabels = String(ticks);
            chart.position = position.value;
            chart.sheet = real(chart.sheet);
            charts.push(chart);
          });
          proxies.push(proxy);
          return proxy;
        },
        load: () => {
          reads.push(() => {
            chartItems.value = charts
              .filter((chart) => chart.sheet === real(name))
              .map((chart) => {
                const from = parseAddress(chart.position?.[0] ?? 'A1').start;
                return {
                  name: chart.name,
                  top: from.row * ROW_HEIGHT,
                  left: leftOf(chart.sheet, from.column),
                  delete: () => {
                    ops.push(() => {
                      log(`delete chart ${chart.name}`);
                      const i = charts.indexOf(chart);
                      if (i >= 0) charts.splice(i, 1);
                    });
                  },
                };
              });
          });
          return chartCollection;
        },
        get items(): Record<string, unknown>[] {
          if (chartItems.value === null)
            throw officeError('PropertyNotLoaded', "The property 'items' is not available. Call load and sync first.");
          return chartItems.value;
        },
      };
      const noteCollection = {
        getItemOrNullObject: (address: string) => {
          const found = { value: undefined as string | undefined, read: false };
          const item = {
            load: () => {
              reads.push(() => {
                found.value = notes.get(real(name))?.get(address);
                found.read = true;
              });
              return item;
            },
            get isNullObject(): boolean {
              if (!found.read) throw officeError('PropertyNotLoaded', 'Call load and sync first.');
              return found.value === undefined;
            },
            get content(): string {
              if (!found.read || found.value === undefined)
                throw officeError('PropertyNotLoaded', 'Call load and sync first.');
              return found.value;
            },
            set content(text: string) {
              ops.push(() => {
                notesOffered();
                const list = notes.get(real(name));
                if (list?.get(address) === undefined)
                  throw officeError('ItemNotFound', `There is no note on ${address}.`);
                log(`note ${real(name)}!${address}`);
                list.set(address, text);
              });
            },
          };
          ops.push(() => notesOffered());
          return item;
        },
        add: (address: string, content: string) => {
          ops.push(() => {
            notesOffered();
            const list = notes.get(real(name));
            if (list === undefined) throw officeError('ItemNotFound', `The requested resource doesn't exist: ${name}`);
            if (!/^[A-Z]{1,3}[0-9]+$/.test(address))
              throw officeError('InvalidCellAddress', `${address} is not one cell.`);
            if (list.has(address)) throw officeError('InvalidArgument', `The cell ${address} has a note already.`);
            log(`note ${real(name)}!${address}`);
            list.set(address, String(content));
          });
        },
      };
      const layout = (): MockPageLayout => {
        const found = layouts.get(real(name));
        if (found === undefined) throw officeError('ItemNotFound', `The requested resource doesn't exist: ${name}`);
        return found;
      };
      const pageLayout = {
        set orientation(value: string) {
          ops.push(() => {
            layout().orientation = value;
          });
        },
        set zoom(value: MockPageLayout['zoom']) {
          ops.push(() => {
            layout().zoom = { ...value };
          });
        },
        set centerHorizontally(value: boolean) {
          ops.push(() => {
            layout().centerHorizontally = value;
          });
        },
        setPrintArea: (area: string) => {
          ops.push(() => {
            parseAddress(area);
            layout().printArea = area;
          });
        },
      };
      Object.assign(sheet, { charts: chartCollection, notes: noteCollection, pageLayout });
      proxies.push(sheet);
      return sheet;
    };

    /** The worksheet collection: items/name loads, add and lookups. */
    const worksheets = {
      loaded: false,
      synced: false,
      load(): void {
        worksheets.loaded = true;
      },
      get items(): { name: string }[] {
        if (!worksheets.synced)
          throw officeError('PropertyNotLoaded', "The property 'items' is not available. Call load and sync first.");
        return [...grid.keys()].map((name) => ({ name }));
      },
      getItem: (name: string) => makeSheet(name),
      getItemOrNullObject: (name: string) => makeSheet(name, false),
      getActiveWorksheet: () => makeSheet(state.activeSheet),
      add: (name: string) => {
        newSheets.add(name);
        ops.push(() => {
          if (grid.has(name)) throw officeError('ItemAlreadyExists', `A sheet named ${name} already exists.`);
          log(`add sheet ${name}`);
          grid.set(name, new Map());
          widths.set(name, new Map());
          notes.set(name, new Map());
          layouts.set(name, {});
        });
        return makeSheet(name);
      },
    };

    const workbook = {
      getSelectedRange: () => {
        const parsed = parseAddress(state.selection.address);
        return makeRange(
          state.selection.sheet,
          parsed.start.row,
          parsed.start.column,
          parsed.end.row - parsed.start.row + 1,
          parsed.end.column - parsed.start.column + 1,
        );
      },
      worksheets,
      onSelectionChanged: {
        add: (handler: () => void) => {
          handlers.push(handler);
          return {
            remove: () => {
              const i = handlers.indexOf(handler);
              if (i >= 0) handlers.splice(i, 1);
            },
          };
        },
      },
    };
    const context = {
      workbook,
      sync: async (): Promise<void> => {
        state.syncCalls += 1;
        const batchOps = ops.splice(0).flatMap((op) => (typeof op === 'function' ? [op] : op.expand()));
        const batchReads = reads.splice(0);
        const failure = state.failures.find((f) => f.call === state.syncCalls);
        if (failure !== undefined) {
          if (failure.partial !== false) {
            const applied = failure.partial === true ? Math.floor(batchOps.length / 2) : failure.partial;
            for (const op of batchOps.slice(0, applied)) op();
            partialSnapshots.push(api.snapshot());
          }
          throw officeError(failure.code, failure.message);
        }
        for (const op of batchOps) op();
        for (const read of batchReads) read();
        for (const p of proxies) await p.sync();
        if (worksheets.loaded) worksheets.synced = true;
        await new Promise((resolve) => setTimeout(resolve, 0));
      },
    };
    return batch(context as unknown as Excel.RequestContext);
  };

  const api: MockExcel = {
    run: makeRun,
    supports,
    charts,
    partialSnapshots,
    writeLog,
    handlers,
    get apiVersion() {
      return state.apiVersion;
    },
    set apiVersion(value) {
      state.apiVersion = value;
    },
    get selection() {
      return state.selection;
    },
    set selection(value) {
      state.selection = value;
    },
    get activeSheet() {
      return state.activeSheet;
    },
    set activeSheet(value) {
      state.activeSheet = value;
    },
    get failures() {
      return state.failures;
    },
    set failures(value) {
      state.failures = value;
    },
    get syncCalls() {
      return state.syncCalls;
    },
    set syncCalls(value) {
      state.syncCalls = value;
    },
    set(sheet, address, cells) {
      const start = parseAddress(address).start;
      cells.forEach((row, r) =>
        row.forEach((v, c) => writeContent(getCell(sheet, start.row + r, start.column + c), v)),
      );
    },
    spill(sheet, address, formula, values) {
      const start = parseAddress(address).start;
      const anchor = cellAddress(start);
      values.forEach((row, r) =>
        row.forEach((v, c) => {
          const cell = getCell(sheet, start.row + r, start.column + c);
          if (r === 0 && c === 0) {
            cell.formula = formula;
            cell.value = v;
          } else {
            cell.formula = '';
            cell.value = '';
            cell.spill = { parent: anchor, value: v };
          }
        }),
      );
    },
    style(sheet, address, look) {
      const parsed = parseAddress(address);
      for (let r = parsed.start.row; r <= parsed.end.row; r += 1) {
        for (let c = parsed.start.column; c <= parsed.end.column; c += 1) Object.assign(getCell(sheet, r, c), look);
      }
    },
    cell(sheet, address) {
      const start = parseAddress(address).start;
      return getCell(sheet, start.row, start.column);
    },
    formulas(sheet, address) {
      const parsed = parseAddress(address);
      const out: CellValue[][] = [];
      for (let r = parsed.start.row; r <= parsed.end.row; r += 1) {
        const row: CellValue[] = [];
        for (let c = parsed.start.column; c <= parsed.end.column; c += 1) row.push(shownFormula(getCell(sheet, r, c)));
        out.push(row);
      }
      return out;
    },
    sheetNames() {
      return [...grid.keys()];
    },
    notes(sheet) {
      return Object.fromEntries(notes.get(real(sheet)) ?? new Map<string, string>());
    },
    addNote(sheet, address, text) {
      notes.get(real(sheet))?.set(address, text);
    },
    pageLayout(sheet) {
      return { ...(layouts.get(real(sheet)) ?? {}) };
    },
    addChart(sheet, source, from, to, title) {
      charts.push({
        sheet,
        type: 'Line',
        source,
        seriesBy: 'Columns',
        title,
        position: [from, to],
        name: `Chart ${charts.length + 1}`,
      });
    },
    columnWidth(sheet, column) {
      return widths.get(sheet)?.get(parseAddress(`${column}1`).start.column) ?? DEFAULT_WIDTH;
    },
    snapshot() {
      const out: Record<string, { cells: Record<string, MockCell>; widths: Record<string, number> }> = {};
      for (const [sheet, cells] of grid) {
        const entry = { cells: {} as Record<string, MockCell>, widths: {} as Record<string, number> };
        const keys = [...cells.keys()].sort();
        for (const k of keys) {
          const cell = cells.get(k) as MockCell;
          if (
            cell.formula !== '' ||
            cell.value !== '' ||
            cell.bold ||
            cell.fillColor !== '' ||
            cell.numberFormat !== 'General' ||
            cell.fontColor !== '#000000' ||
            cell.spill
          ) {
            const [r, c] = k.split(',').map(Number) as [number, number];
            entry.cells[cellAddress({ row: r, column: c })] = { ...cell };
          }
        }
        for (const [c, w] of [...(widths.get(sheet) ?? new Map<number, number>())].sort((a, b) => a[0] - b[0])) {
          if (w !== DEFAULT_WIDTH) entry.widths[columnLetters(c)] = w;
        }
        out[sheet] = entry;
      }
      return JSON.stringify({
        sheets: out,
        notes: [...notes].map(([sheet, list]) => [sheet, [...list].sort()]),
        layouts: [...layouts].sort(),
        charts,
      });
    },
  };
  return api;
}
