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
 *   cell that is written over and cleared again shows its spilled value again (Excel re-spills).
 * The mock does not calculate: a formula cell shows its formula text as its value.
 */
import { OfficeMockObject } from 'office-addin-mock';
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
  position: [string, string] | null;
  name: string;
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
  /** A deep copy of every cell and column width, to compare before and after. */
  snapshot(): string;
}

const key = (row: number, column: number): string => `${row},${column}`;
const DEFAULT_WIDTH = 48;
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
  const handlers: (() => void)[] = [];
  const partialSnapshots: string[] = [];
  const writeLog: string[] = [];

  const sheetCells = (sheet: string): Map<string, MockCell> => {
    const cells = grid.get(sheet);
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

  const state = {
    selection: { sheet: sheets[0] ?? 'Sheet1', address: 'A1' },
    activeSheet: sheets[0] ?? 'Sheet1',
    failures: [] as SyncFailure[],
    syncCalls: 0,
    apiVersion: '1.16',
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
      if (!grid.has(sheet) && !newSheets.has(sheet))
        throw officeError('ItemNotFound', `The requested resource doesn't exist: ${sheet}`);
      if (rows < 1 || columns < 1) throw officeError('InvalidArgument', 'The range is empty.');
      const exists = grid.has(sheet);
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
      const columnWidth = widths.get(sheet)?.get(left) ?? DEFAULT_WIDTH;
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
                widths.get(sheet)?.set(left + c, 10 + 6 * longest);
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
              for (let c = 0; c < columns; c += 1) widths.get(sheet)?.set(left + c, proxy.format.columnWidth as number);
            });
          }
          return steps;
        },
      });
      return proxy;
    };

    const makeSheet = (name: string, mustExist = true): OfficeMockObject => {
      if (mustExist && !grid.has(name) && !newSheets.has(name))
        throw officeError('ItemNotFound', `The requested resource doesn't exist: ${name}`);
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
            if (!grid.has(name)) throw officeError('ItemNotFound', `The requested resource doesn't exist: ${name}`);
            let bottom = -1;
            let right = -1;
            for (const [k, cell] of grid.get(name) ?? new Map<string, MockCell>()) {
              if (shownFormula(cell) === '' && shownValue(cell) === '') continue;
              const [r, c] = k.split(',').map(Number) as [number, number];
              bottom = Math.max(bottom, r);
              right = Math.max(right, c);
            }
            const used = nullable(
              {
                address:
                  bottom < 0 ? '' : `${quoteSheet(name)}!${rangeAddress({ row: 0, column: 0 }, bottom + 1, right + 1)}`,
              },
              bottom < 0,
            );
            proxies.push(used);
            return used;
          },
          activate: () => {
            ops.push(() => {
              log(`activate ${name}`);
              state.activeSheet = name;
            });
          },
          delete: () => {
            ops.push(() => {
              log(`delete ${name}`);
              grid.delete(name);
              widths.delete(name);
              if (state.activeSheet === name) state.activeSheet = [...grid.keys()][0] ?? '';
            });
          },
          charts: {
            add: (type: string, source: OfficeMockObject, seriesBy: string) => {
              const chart: MockChart = {
                sheet: name,
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
                setPosition: (start: string, end: string) => {
                  position.value = [start, end];
                },
              });
              const initialTitle = proxy.title.text;
              ops.push(() => {
                if (typeof proxy.title.text === 'string' && assigned(proxy.title.text, initialTitle))
                  chart.title = proxy.title.text;
                chart.position = position.value;
                charts.push(chart);
              });
              proxies.push(proxy);
              return proxy;
            },
          },
        },
        !grid.has(name) && !newSheets.has(name),
      );
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
      return JSON.stringify(out);
    },
  };
  return api;
}
