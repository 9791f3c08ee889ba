/**
 * The preview's stand-in for the `Office` and `Excel` globals of Office.js, implementing exactly the subset
 * the side panel is allowed to use (see DEVELOPERS.md / the side-panel brief) on top of a PreviewWorkbook:
 *
 * - `Office.onReady(cb?)` → Promise of `{ host: 'Excel', platform: 'OfficeOnline' }`.
 * - `Excel.run(async (context) => …)`, `context.sync()`, `context.workbook.getSelectedRange()`,
 *   `worksheets.getItem(name)`, `worksheets.getActiveWorksheet()`, `workbook.onSelectionChanged.add(h)`.
 * - Worksheet `name`, `getRange(a1)`, `charts.add(type, range, seriesBy)` → Chart (`title.text`,
 *   `setPosition(from, to)`, `name`).
 * - Range `load(…)` of address, values, formulas, rowCount, columnCount, numberFormat; writes to
 *   `formulas`, `values`, `numberFormat`, `format.font.bold/color`, `format.fill.color`,
 *   `format.autofitColumns()`; `getCell`, `getOffsetRange`, `getResizedRange`, `worksheet`.
 *
 * As in Office.js, commands are queued and run at `context.sync()`; loaded properties are readable only
 * after it; a failed command rejects `sync()` with an Error whose `code` is a string ('InvalidArgument',
 * 'ItemNotFound', 'PropertyNotLoaded', 'GeneralException'). Errors and promises are made in the realm of
 * the window given (the side-panel iframe), so `instanceof Error` holds there.
 */
import { parseBlock, type CellBlock, type PreviewWorkbook } from './previewWorkbook';

/** What the realm provides: its Error, Promise and Array constructors. */
export interface Realm {
  readonly Error: ErrorConstructor;
  readonly Promise: PromiseConstructor;
  /** Loaded 2-D arrays are made with it, so `instanceof Array` holds in the panel's frame. */
  readonly Array?: ArrayConstructor;
}

/**
 * Copies a 2-D array made in another frame into this realm's arrays. HyperFormula recognises arrays
 * with `instanceof Array`, which is false for an array made in the panel's iframe.
 */
function localRows(data: unknown): unknown[][] | undefined {
  const isList = (v: unknown): v is ArrayLike<unknown> => Array.isArray(v);
  if (!isList(data)) return undefined;
  const rows: unknown[][] = [];
  for (const row of Array.from(data)) {
    if (!isList(row)) return undefined;
    rows.push(Array.from(row));
  }
  return rows;
}

/** Copies a 2-D array into the realm's arrays (for loaded values read by the panel). */
function realmRows<T>(realm: Realm, rows: T[][]): T[][] {
  const make = realm.Array ?? Array;
  return make.from(rows, (row) => make.from(row));
}

/** A queued command; `reads` marks one that needs up-to-date values (loads, autofit). */
interface Command {
  readonly run: () => void;
  readonly reads: boolean;
}

/** Makes an Error with a string `code`, as Office.js rejects `context.sync()`. */
function officeError(realm: Realm, code: string, message: string): Error & { code: string } {
  const error = new realm.Error(message) as Error & { code: string; name: string };
  error.code = code;
  error.name = 'RichApi.Error';
  return error;
}

/** One batch of commands, as in `Excel.run`. */
class RequestContext {
  private queue: Command[] = [];
  readonly workbook: WorkbookProxy;
  constructor(
    readonly book: PreviewWorkbook,
    readonly realm: Realm,
  ) {
    this.workbook = new WorkbookProxy(this);
  }
  enqueue(run: () => void, reads = false): void {
    this.queue.push({ run, reads });
  }
  fail(code: string, message: string): never {
    throw officeError(this.realm, code, message);
  }
  sync(): Promise<void> {
    const commands = this.queue;
    this.queue = [];
    return new this.realm.Promise<void>((resolve, reject) => {
      // Run after the caller's current synchronous code, as a real round trip would.
      setTimeout(() => {
        try {
          // One batch: HyperFormula evaluates before reads and once at the end; the grid redraws once.
          this.book.batch(() => {
            for (const command of commands) {
              if (command.reads) this.book.settle();
              command.run();
            }
          });
          resolve();
        } catch (error) {
          const coded = error as { code?: unknown; message?: unknown };
          reject(typeof coded.code === 'string' ? error : officeError(this.realm, 'GeneralException', String(coded.message ?? error)));
        }
      }, 0);
    });
  }
}

/** Parses the `load` argument: 'a, b', ['a', 'b'], { select: 'a,b' } or nothing (everything). */
function loadList(properties: unknown): string[] | undefined {
  if (properties === undefined || properties === null) return undefined;
  if (typeof properties === 'string') return properties.split(',').map((p) => p.trim()).filter(Boolean);
  if (Array.isArray(properties)) return properties.map(String);
  const select = (properties as { select?: unknown }).select;
  return select === undefined ? undefined : loadList(select);
}

const RANGE_PROPERTIES = ['address', 'values', 'formulas', 'rowCount', 'columnCount', 'numberFormat'] as const;
type RangeProperty = (typeof RANGE_PROPERTIES)[number];

/** Checks that a 2-D array matches the block (or is a single value, which Excel spreads over it). */
function shapeFor(ctx: RequestContext, block: CellBlock, data: unknown, what: string): unknown[][] {
  const local = localRows(data);
  if (local === undefined) return ctx.fail('InvalidArgument', `${what} must be a 2-D array`);
  const rows = local;
  if (rows.length === 1 && rows[0]?.length === 1) {
    return Array.from({ length: block.rows }, () => Array.from({ length: block.columns }, () => rows[0]?.[0]));
  }
  if (rows.length !== block.rows || rows.some((row) => row.length !== block.columns)) {
    ctx.fail('InvalidArgument', `${what}: the array is ${rows.length}×${rows[0]?.length ?? 0} but the range is ${block.rows}×${block.columns}`);
  }
  return rows;
}

/** A cell content Excel would accept through `values`/`formulas`. */
function cellContent(ctx: RequestContext, value: unknown): string | number | boolean | null {
  if (value === null || value === undefined || value === '') return null;
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) ctx.fail('InvalidArgument', `${value} cannot be written to a cell`);
    return value;
  }
  if (typeof value === 'string' || typeof value === 'boolean') return value;
  return ctx.fail('InvalidArgument', `a ${typeof value} cannot be written to a cell`);
}

class RangeProxy {
  private loadedValues: Partial<Record<RangeProperty, unknown>> = {};
  readonly format: RangeFormatProxy;
  constructor(
    private readonly ctx: RequestContext,
    /** Resolves the block when commands run (throws a coded error for a bad address). */
    readonly resolve: () => CellBlock,
  ) {
    this.format = new RangeFormatProxy(ctx, this);
  }

  load(properties?: unknown): this {
    const wanted = (loadList(properties) ?? [...RANGE_PROPERTIES]).filter((p): p is RangeProperty =>
      (RANGE_PROPERTIES as readonly string[]).includes(p),
    );
    this.ctx.enqueue(() => {
      const block = this.resolve();
      const book = this.ctx.book;
      for (const property of wanted) {
        if (property === 'address') this.loadedValues.address = book.qualifiedAddress(block);
        if (property === 'rowCount') this.loadedValues.rowCount = block.rows;
        if (property === 'columnCount') this.loadedValues.columnCount = block.columns;
        const realm = this.ctx.realm;
        if (property === 'values') this.loadedValues.values = realmRows(realm, book.values(block));
        if (property === 'formulas') {
          this.loadedValues.formulas = realmRows(
            realm,
            grid(block, (r, c) => {
              const view = book.cell(block.sheet, r, c);
              return view.input.startsWith('=') ? view.input : view.spilled ? view.value : view.kind === 'number' ? view.value : view.input;
            }),
          );
        }
        if (property === 'numberFormat') {
          this.loadedValues.numberFormat = realmRows(realm, grid(block, (r, c) => book.numberFormat(block.sheet, r, c) ?? 'General'));
        }
      }
    }, true);
    return this;
  }

  private read(property: RangeProperty): unknown {
    if (!(property in this.loadedValues)) {
      throw officeError(this.ctx.realm, 'PropertyNotLoaded', `The property '${property}' is not available. Call load('${property}') and context.sync() first.`);
    }
    return this.loadedValues[property];
  }

  get address(): string {
    return this.read('address') as string;
  }
  get rowCount(): number {
    return this.read('rowCount') as number;
  }
  get columnCount(): number {
    return this.read('columnCount') as number;
  }
  get values(): (string | number | boolean)[][] {
    return this.read('values') as (string | number | boolean)[][];
  }
  set values(data: unknown[][]) {
    this.writeContents(data, 'values');
  }
  get formulas(): unknown[][] {
    return this.read('formulas') as unknown[][];
  }
  set formulas(data: unknown[][]) {
    this.writeContents(data, 'formulas');
  }
  get numberFormat(): string[][] {
    return this.read('numberFormat') as string[][];
  }
  set numberFormat(data: unknown[][]) {
    this.ctx.enqueue(() => {
      const block = this.resolve();
      const rows = shapeFor(this.ctx, block, data, 'numberFormat');
      rows.forEach((line, r) => line.forEach((format, c) => this.ctx.book.setNumberFormat(block.sheet, block.row + r, block.col + c, String(format))));
      this.ctx.book.touch();
    });
  }

  private writeContents(data: unknown[][], what: string): void {
    this.ctx.enqueue(() => {
      const block = this.resolve();
      const rows = shapeFor(this.ctx, block, data, what).map((line) => line.map((v) => cellContent(this.ctx, v)));
      try {
        this.ctx.book.write(block.sheet, block.row, block.col, rows);
      } catch (error) {
        this.ctx.fail('InvalidArgument', `cannot write ${this.ctx.book.qualifiedAddress(block)}: ${(error as Error).message}`);
      }
    });
  }

  getCell(row: number, column: number): RangeProxy {
    return new RangeProxy(this.ctx, () => {
      const b = this.resolve();
      return checked(this.ctx, { sheet: b.sheet, row: b.row + row, col: b.col + column, rows: 1, columns: 1 });
    });
  }

  getOffsetRange(rowOffset: number, columnOffset: number): RangeProxy {
    return new RangeProxy(this.ctx, () => {
      const b = this.resolve();
      return checked(this.ctx, { ...b, row: b.row + rowOffset, col: b.col + columnOffset });
    });
  }

  getResizedRange(deltaRows: number, deltaColumns: number): RangeProxy {
    return new RangeProxy(this.ctx, () => {
      const b = this.resolve();
      return checked(this.ctx, { ...b, rows: b.rows + deltaRows, columns: b.columns + deltaColumns });
    });
  }

  get worksheet(): WorksheetProxy {
    return new WorksheetProxy(this.ctx, () => this.resolve().sheet);
  }
}

function grid<T>(block: CellBlock, at: (row: number, col: number) => T): T[][] {
  return Array.from({ length: block.rows }, (_, r) => Array.from({ length: block.columns }, (_, c) => at(block.row + r, block.col + c)));
}

function checked(ctx: RequestContext, block: CellBlock): CellBlock {
  if (block.row < 0 || block.col < 0 || block.rows < 1 || block.columns < 1 || !Number.isInteger(block.row + block.col + block.rows + block.columns)) {
    ctx.fail('InvalidArgument', 'The range is outside the worksheet.');
  }
  return block;
}

class RangeFormatProxy {
  readonly font: { bold: boolean; color: string };
  readonly fill: { color: string };
  constructor(
    private readonly ctx: RequestContext,
    private readonly range: RangeProxy,
  ) {
    const style = (patch: { bold?: boolean; color?: string; fill?: string }) =>
      ctx.enqueue(() => {
        const b = range.resolve();
        for (let r = 0; r < b.rows; r += 1) for (let c = 0; c < b.columns; c += 1) ctx.book.setStyle(b.sheet, b.row + r, b.col + c, patch);
        ctx.book.touch();
      });
    this.font = {
      set bold(value: boolean) {
        style({ bold: Boolean(value) });
      },
      get bold(): boolean {
        return ctx.fail('PropertyNotLoaded', 'format.font.bold is write-only in the preview');
      },
      set color(value: string) {
        style({ color: String(value) });
      },
      get color(): string {
        return ctx.fail('PropertyNotLoaded', 'format.font.color is write-only in the preview');
      },
    };
    this.fill = {
      set color(value: string) {
        style({ fill: String(value) });
      },
      get color(): string {
        return ctx.fail('PropertyNotLoaded', 'format.fill.color is write-only in the preview');
      },
    };
  }

  /** Widens each column of the range to fit its longest shown text (about 7 px a character). */
  autofitColumns(): void {
    this.ctx.enqueue(() => {
      const b = this.range.resolve();
      const book = this.ctx.book;
      for (let c = 0; c < b.columns; c += 1) {
        let longest = 4;
        for (let r = 0; r < b.rows; r += 1) longest = Math.max(longest, book.cell(b.sheet, b.row + r, b.col + c).text.length);
        book.setColumnWidth(b.sheet, b.col + c, Math.min(480, 16 + 7 * longest));
      }
      book.touch();
    }, true);
  }
}

class ChartProxy {
  readonly title: { text: string };
  private chartName = '';
  constructor(
    private readonly ctx: RequestContext,
    private readonly chart: () => import('./previewWorkbook').PreviewChart,
  ) {
    const self = this;
    let titleText = '';
    this.title = {
      get text(): string {
        return titleText;
      },
      set text(value: string) {
        titleText = String(value);
        ctx.enqueue(() => {
          self.chart().title = titleText;
          ctx.book.chartsChanged();
        });
      },
    };
  }
  get name(): string {
    return this.chartName;
  }
  set name(value: string) {
    this.chartName = String(value);
    this.ctx.enqueue(() => {
      this.chart().name = this.chartName;
      this.ctx.book.chartsChanged();
    });
  }
  setPosition(startCell: string, endCell?: string): void {
    this.ctx.enqueue(() => {
      const chart = this.chart();
      const from = parseBlock(startCell, chart.sheet);
      const to = parseBlock(endCell ?? startCell, chart.sheet);
      if (!from || !to) this.ctx.fail('InvalidArgument', `not a cell address: ${startCell}${endCell ? `, ${endCell}` : ''}`);
      chart.position = { from: { row: from.row, col: from.col }, to: { row: to.row + to.rows - 1, col: to.col + to.columns - 1 } };
      this.ctx.book.chartsChanged();
    });
  }
}

class WorksheetProxy {
  private loadedName: string | undefined;
  readonly charts: { add: (type: string, source: RangeProxy, seriesBy?: string) => ChartProxy };
  constructor(
    private readonly ctx: RequestContext,
    private readonly resolveSheet: () => number,
  ) {
    this.charts = {
      add: (type: string, source: RangeProxy, seriesBy?: string): ChartProxy => {
        let made: import('./previewWorkbook').PreviewChart | undefined;
        ctx.enqueue(() => {
          if (type !== 'XYScatterSmoothNoMarkers' && type !== 'Line') ctx.fail('InvalidArgument', `chart type ${type} is not available in the preview`);
          if (seriesBy !== undefined && seriesBy !== 'Columns' && seriesBy !== 'Auto') ctx.fail('InvalidArgument', `seriesBy ${seriesBy} is not available in the preview`);
          const block = source.resolve();
          made = ctx.book.addChart(this.resolveSheet(), type, block);
        });
        return new ChartProxy(ctx, () => {
          if (!made) return ctx.fail('GeneralException', 'the chart was not created');
          return made;
        });
      },
    };
  }
  load(properties?: unknown): this {
    const wanted = loadList(properties);
    this.ctx.enqueue(() => {
      const sheet = this.resolveSheet();
      if (wanted === undefined || wanted.includes('name')) this.loadedName = this.ctx.book.hf.getSheetName(sheet);
    }, true);
    return this;
  }
  get name(): string {
    if (this.loadedName === undefined) {
      throw officeError(this.ctx.realm, 'PropertyNotLoaded', "The property 'name' is not available. Call load('name') and context.sync() first.");
    }
    return this.loadedName;
  }
  getRange(address: string): RangeProxy {
    return new RangeProxy(this.ctx, () => {
      if (typeof address !== 'string' || address.includes('!')) {
        return this.ctx.fail('InvalidArgument', `getRange needs an A1 address without a sheet name, got ${String(address)}`);
      }
      const block = parseBlock(address, this.resolveSheet());
      if (!block) return this.ctx.fail('InvalidArgument', `not a cell address: ${address}`);
      return block;
    });
  }
}

class WorkbookProxy {
  readonly worksheets: { getItem: (name: string) => WorksheetProxy; getActiveWorksheet: () => WorksheetProxy };
  readonly onSelectionChanged: { add: (handler: (args?: { address: string }) => unknown) => { remove: () => void } };
  constructor(private readonly ctx: RequestContext) {
    this.worksheets = {
      getItem: (name: string) =>
        new WorksheetProxy(ctx, () => {
          const id = ctx.book.sheetId(name);
          if (id === undefined) return ctx.fail('ItemNotFound', `The worksheet '${name}' does not exist.`);
          return id;
        }),
      getActiveWorksheet: () => new WorksheetProxy(ctx, () => ctx.book.activeSheet),
    };
    this.onSelectionChanged = {
      add: (handler) => {
        const book = ctx.book;
        const unsubscribe = book.on('selection', () => {
          void Promise.resolve().then(() => handler({ address: book.qualifiedAddress(book.selection) }));
        });
        return { remove: unsubscribe };
      },
    };
  }
  getSelectedRange(): RangeProxy {
    return new RangeProxy(this.ctx, () => this.ctx.book.selection);
  }
}

/** What {@link createOfficeStandIn} returns: the two globals to install. */
export interface OfficeStandIn {
  readonly Office: { onReady(callback?: (info: { host: string; platform: string }) => void): Promise<{ host: string; platform: string }>; HostType: { Excel: string } };
  readonly Excel: { run<T>(batch: (context: RequestContext) => Promise<T> | T): Promise<T> };
}

/**
 * Makes the `Office` and `Excel` globals for a side panel running on `book`, with errors and promises of
 * `realm` (pass the iframe's window).
 *
 * Cost: O(1); each `context.sync()` runs the queued commands and recalculates once per write.
 * Never throws itself; failed commands reject `sync()`, a throwing batch rejects `Excel.run`.
 *
 * @example
 * const { Excel } = createOfficeStandIn(book, window);
 * await Excel.run(async (context) => {
 *   const range = context.workbook.worksheets.getItem('Plan').getRange('B4').load('values');
 *   await context.sync();
 *   return range.values; //=> [[0.042]]
 * });
 */
export function createOfficeStandIn(book: PreviewWorkbook, realm: Realm): OfficeStandIn {
  const info = { host: 'Excel', platform: 'OfficeOnline' };
  return {
    Office: {
      onReady(callback) {
        return new realm.Promise((resolve) => {
          setTimeout(() => {
            callback?.(info);
            resolve(info);
          }, 0);
        });
      },
      HostType: { Excel: 'Excel' },
    },
    Excel: {
      run<T>(batch: (context: RequestContext) => Promise<T> | T): Promise<T> {
        const context = new RequestContext(book, realm);
        return new realm.Promise<T>((resolve, reject) => {
          realm.Promise.resolve()
            .then(() => batch(context))
            .then(async (result) => {
              await context.sync();
              resolve(result);
            })
            .catch(reject);
        });
      },
    },
  };
}
