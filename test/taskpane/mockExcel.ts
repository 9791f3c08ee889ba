/**
 * A small in-memory workbook behind office-addin-mock's OfficeMockObject, implementing the agreed
 * Excel API subset the side panel uses (getSelectedRange, worksheets.getItem/getActiveWorksheet,
 * getRange, load/sync, formulas/numberFormat/format writes, getCell/getResizedRange, charts.add,
 * onSelectionChanged). Writes queue on the proxy objects and reach the grid only at context.sync(),
 * as in Excel; a sync can be made to fail, optionally after applying part of the batch (Excel does not
 * roll back a failed batch), so tests can check that the panel restores the cells.
 */
import { OfficeMockObject } from 'office-addin-mock';
import { cellAddress, parseAddress, quoteSheet, rangeAddress } from '../../taskpane/workbook/address';
import type { CellValue } from '../../taskpane/workbook/workbook';
import type { ExcelRunner } from '../../taskpane/workbook/officeWorkbook';

/** One cell of the mock grid. */
export interface MockCell {
  formula: CellValue;
  value: CellValue;
  numberFormat: string;
  bold: boolean;
  fontColor: string;
  fillColor: string;
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

interface Pending {
  sheet: string;
  top: number;
  left: number;
  rows: number;
  columns: number;
  proxy: OfficeMockObject;
  initialFormulas: unknown;
  initialValues: unknown;
  initialNumberFormat: unknown;
  initialBold: unknown;
  initialFontColor: unknown;
  initialFill: unknown;
  autofit: { called: boolean };
}

interface PendingChart {
  proxy: OfficeMockObject;
  chart: MockChart;
  initialTitle: unknown;
  position: { value: [string, string] | null };
}

/** Make a sync fail: which call (1-based, counted over the harness's life), the error code, and whether part of the batch lands first. */
export interface SyncFailure {
  readonly call: number;
  readonly code: string;
  readonly message: string;
  /** Apply the first half of the queued cell writes before failing, as a partly applied batch. */
  readonly partial: boolean;
}

/** The mock workbook and its controls. */
export interface MockExcel {
  readonly run: ExcelRunner;
  readonly charts: MockChart[];
  readonly handlers: (() => void)[];
  selection: { sheet: string; address: string };
  activeSheet: string;
  failures: SyncFailure[];
  syncCalls: number;
  /** The grid as it stood right after each partly applied failed batch (see SyncFailure.partial). */
  readonly partialSnapshots: string[];
  set(sheet: string, address: string, cells: CellValue[][]): void;
  cell(sheet: string, address: string): MockCell;
  formulas(sheet: string, address: string): CellValue[][];
  /** A deep copy of every cell, to compare before and after. */
  snapshot(): string;
}

const key = (row: number, column: number): string => `${row},${column}`;

/**
 * Build a mock workbook with the given sheets (first one active).
 * @example const excel = mockExcel(['Sheet1']); excel.set('Sheet1', 'A1:B1', [['x', 1]])
 */
export function mockExcel(sheets: string[]): MockExcel {
  const grid = new Map<string, Map<string, MockCell>>(sheets.map((s) => [s, new Map()]));
  const charts: MockChart[] = [];
  const handlers: (() => void)[] = [];
  const partialSnapshots: string[] = [];

  const getCell = (sheet: string, row: number, column: number): MockCell => {
    const cells = grid.get(sheet);
    if (cells === undefined) throw Object.assign(new Error(`no sheet ${sheet}`), { code: 'ItemNotFound' });
    let cell = cells.get(key(row, column));
    if (cell === undefined) {
      cell = { formula: '', value: '', numberFormat: 'General', bold: false, fontColor: '#000000', fillColor: '' };
      cells.set(key(row, column), cell);
    }
    return cell;
  };

  const state = {
    selection: { sheet: sheets[0] ?? 'Sheet1', address: 'A1' },
    activeSheet: sheets[0] ?? 'Sheet1',
    failures: [] as SyncFailure[],
    syncCalls: 0,
  };

  const makeRun: ExcelRunner = async (batch) => {
    const pending: Pending[] = [];
    const pendingCharts: PendingChart[] = [];
    const loadedSheets: OfficeMockObject[] = [];
    const localAddressOf = new WeakMap<OfficeMockObject, string>();

    const makeRange = (sheet: string, top: number, left: number, rows: number, columns: number): OfficeMockObject => {
      if (!grid.has(sheet)) throw Object.assign(new Error(`no sheet ${sheet}`), { code: 'ItemNotFound' });
      const values: CellValue[][] = [];
      const formulas: CellValue[][] = [];
      for (let r = 0; r < rows; r += 1) {
        values.push([]);
        formulas.push([]);
        for (let c = 0; c < columns; c += 1) {
          const cell = getCell(sheet, top + r, left + c);
          (values[r] as CellValue[]).push(cell.value);
          (formulas[r] as CellValue[]).push(cell.formula);
        }
      }
      const autofit = { called: false };
      const proxy: OfficeMockObject = new OfficeMockObject({
        address: `${quoteSheet(sheet)}!${rangeAddress({ row: top, column: left }, rows, columns)}`,
        values,
        formulas,
        rowCount: rows,
        columnCount: columns,
        numberFormat: formulas.map((row) => row.map(() => 'General')),
        format: {
          font: { bold: false, color: '#000000' },
          fill: { color: '' },
          autofitColumns: () => {
            autofit.called = true;
          },
        },
        getCell: (r: number, c: number) => makeRange(sheet, top + r, left + c, 1, 1),
        getResizedRange: (dr: number, dc: number) => makeRange(sheet, top, left, rows + dr, columns + dc),
        getOffsetRange: (dr: number, dc: number) => makeRange(sheet, top + dr, left + dc, rows, columns),
      });
      localAddressOf.set(proxy, rangeAddress({ row: top, column: left }, rows, columns));
      pending.push({
        sheet,
        top,
        left,
        rows,
        columns,
        proxy,
        initialFormulas: proxy.formulas,
        initialValues: proxy.values,
        initialNumberFormat: proxy.numberFormat,
        initialBold: proxy.format.font.bold,
        initialFontColor: proxy.format.font.color,
        initialFill: proxy.format.fill.color,
        autofit,
      });
      return proxy;
    };

    const makeSheet = (name: string): OfficeMockObject => {
      if (!grid.has(name)) throw Object.assign(new Error(`The requested resource doesn't exist: ${name}`), { code: 'ItemNotFound' });
      const sheet: OfficeMockObject = new OfficeMockObject({
        name,
        getRange: (address: string) => {
          const parsed = parseAddress(address);
          return makeRange(name, parsed.start.row, parsed.start.column, parsed.end.row - parsed.start.row + 1, parsed.end.column - parsed.start.column + 1);
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
              name: `Chart ${charts.length + pendingCharts.length + 1}`,
            };
            const position = { value: null as [string, string] | null };
            const proxy: OfficeMockObject = new OfficeMockObject({
              name: chart.name,
              title: { text: '' },
              setPosition: (start: string, end: string) => {
                position.value = [start, end];
              },
            });
            pendingCharts.push({ proxy, chart, initialTitle: proxy.title.text, position });
            return proxy;
          },
        },
      });
      loadedSheets.push(sheet);
      return sheet;
    };

    const applyWrites = (fraction: number): void => {
      const upto = Math.floor(pending.length * fraction);
      for (const p of pending.slice(0, upto)) {
        const { proxy } = p;
        // A 1×1 array written to a larger range goes to every cell, as in Excel.
        const at = <T>(grid2: T[][], r: number, c: number): T | undefined =>
          grid2.length === 1 && grid2[0]?.length === 1 ? grid2[0]?.[0] : grid2[r]?.[c];
        const each = (fn: (cell: MockCell, r: number, c: number) => void): void => {
          for (let r = 0; r < p.rows; r += 1) for (let c = 0; c < p.columns; c += 1) fn(getCell(p.sheet, p.top + r, p.left + c), r, c);
        };
        if (Array.isArray(proxy.formulas) && proxy.formulas !== p.initialFormulas) {
          const written = proxy.formulas as CellValue[][];
          each((cell, r, c) => {
            const v = at(written, r, c) ?? '';
            cell.formula = v;
            // The mock does not calculate: a formula cell shows its formula text as its value.
            cell.value = v;
          });
        }
        if (Array.isArray(proxy.values) && proxy.values !== p.initialValues) {
          const written = proxy.values as CellValue[][];
          each((cell, r, c) => {
            cell.value = at(written, r, c) ?? '';
            cell.formula = cell.value;
          });
        }
        if (Array.isArray(proxy.numberFormat) && proxy.numberFormat !== p.initialNumberFormat) {
          const written = proxy.numberFormat as string[][];
          each((cell, r, c) => {
            cell.numberFormat = at(written, r, c) ?? cell.numberFormat;
          });
        }
        const font = proxy.format.font;
        if (typeof font.bold === 'boolean' && font.bold !== p.initialBold) each((cell) => (cell.bold = font.bold));
        if (typeof font.color === 'string' && font.color !== p.initialFontColor) each((cell) => (cell.fontColor = font.color));
        const fill = proxy.format.fill;
        if (typeof fill.color === 'string' && fill.color !== p.initialFill) each((cell) => (cell.fillColor = fill.color));
      }
      if (fraction >= 1) {
        for (const pc of pendingCharts) {
          if (typeof pc.proxy.title.text === 'string' && pc.proxy.title.text !== pc.initialTitle) pc.chart.title = pc.proxy.title.text;
          pc.chart.position = pc.position.value;
          charts.push(pc.chart);
        }
      }
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
      worksheets: {
        getItem: (name: string) => makeSheet(name),
        getActiveWorksheet: () => makeSheet(state.activeSheet),
      },
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
    const context: OfficeMockObject = new OfficeMockObject({
      workbook,
      sync: async () => {
        state.syncCalls += 1;
        const failure = state.failures.find((f) => f.call === state.syncCalls);
        if (failure !== undefined) {
          if (failure.partial) {
            applyWrites(0.5);
            partialSnapshots.push(api.snapshot());
          }
          pending.length = 0;
          pendingCharts.length = 0;
          throw Object.assign(new Error(failure.message), { code: failure.code });
        }
        applyWrites(1);
        for (const p of pending) await p.proxy.sync();
        for (const s of loadedSheets) await s.sync();
        for (const pc of pendingCharts) await pc.proxy.sync();
        await new Promise((resolve) => setTimeout(resolve, 0));
        pending.length = 0;
        pendingCharts.length = 0;
      },
    });
    // office-addin-mock keeps plain nested objects as mock objects; the functions above are closures.
    return batch(context as unknown as Excel.RequestContext);
  };

  const api: MockExcel = {
    run: makeRun,
    charts,
    partialSnapshots,
    handlers,
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
        row.forEach((v, c) => {
          const cell = getCell(sheet, start.row + r, start.column + c);
          cell.formula = v;
          cell.value = v;
        }),
      );
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
        for (let c = parsed.start.column; c <= parsed.end.column; c += 1) row.push(getCell(sheet, r, c).formula);
        out.push(row);
      }
      return out;
    },
    snapshot() {
      const out: Record<string, Record<string, MockCell>> = {};
      for (const [sheet, cells] of grid) {
        out[sheet] = {};
        for (const [k, cell] of cells) {
          if (cell.formula !== '' || cell.value !== '' || cell.bold || cell.fillColor !== '' || cell.numberFormat !== 'General') {
            const [r, c] = k.split(',').map(Number) as [number, number];
            (out[sheet] as Record<string, MockCell>)[cellAddress({ row: r, column: c })] = { ...cell };
          }
        }
      }
      return JSON.stringify(out);
    },
  };
  return api;
}
