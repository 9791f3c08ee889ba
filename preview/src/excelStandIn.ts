/**
 * The preview's stand-in for the `Office` and `Excel` globals of Office.js, implementing exactly the subset
 * the side panel is allowed to use (see DEVELOPERS.md / the side-panel brief) on top of a PreviewWorkbook:
 *
 * - `Office.onReady(cb?)` → Promise of `{ host: 'Excel', platform: 'OfficeOnline' }`;
 *   `Office.context.requirements.isSetSupported('ExcelApi', v)` → true up to 1.18 (the subset below), or
 *   up to the version given to createOfficeStandIn (`?api=1.16` on the preview's address: an Excel without
 *   notes, whose notes calls then fail as an unknown API would).
 * - `Excel.run(async (context) => …)`, `context.sync()`, `context.workbook.getSelectedRange()`,
 *   `worksheets.getItem(name)`, `getItemOrNullObject(name)`, `getActiveWorksheet()`, `add(name)`,
 *   `load('items/name')` → `items`, `workbook.onSelectionChanged.add(h)`.
 * - Worksheet `name` (also set: renames), `getRange(a1)`, `getUsedRangeOrNullObject(valuesOnly?)` (a range
 *   with everything below, or a null object), `activate()`, `delete()`, `copy('After', sheet)` (named
 *   "Name (2)"; placed at the end of the tabs, as HyperFormula cannot reorder sheets),
 *   `charts.add(type, range, seriesBy)` → Chart (`title.text`, `axes.categoryAxis/valueAxis.title.text`,
 *   `axes.valueAxis.tickLabelPosition` ('None' hides the vertical axis's numbers),
 *   `setPosition(from, to)`, `name`),
 *   `charts.load('items/…')` → `items` with `name`, `top`, `left` (points) and `delete()`;
 *   `notes.getItemOrNullObject(a1)` (load `content`; `content` settable) and `notes.add(a1, text)`
 *   (ExcelApi 1.18); `pageLayout.orientation`, `.zoom`, `.centerHorizontally`, `.setPrintArea(a1)`.
 * - Range `load(…)` of address, values, valuesAsJson, formulas, rowCount, columnCount, numberFormat;
 *   writes to `formulas`, `values`, `numberFormat` (arrays of the range's size, as the API reference
 *   asks), `format.font.bold/color`, `format.fill.color`, `format.fill.clear()`, `format.columnWidth`
 *   (also loadable), `format.autofitColumns()`; `getCellProperties` (font bold/color, fill color/pattern)
 *   and `setCellProperties`; `getCell`, `getColumn`, `getOffsetRange`, `getResizedRange`,
 *   `getSpillParentOrNullObject`, `getSpillingToRangeOrNullObject`, `worksheet`; `top`, `left`, `width`,
 *   `height` in points (rows 15 points, columns their width); `getEntireRow().insert('Down')` (HyperFormula
 *   moves cells and adjusts formulas; formats, notes and charts move along); `clear('All')`.
 *
 * As in Office.js, commands are queued and run at `context.sync()`; loaded properties are readable only
 * after it; a failed command rejects `sync()` with an Error whose `code` is a string ('InvalidArgument',
 * 'ItemNotFound', 'PropertyNotLoaded', 'GeneralException'), and the commands before it stay applied.
 * `PreviewWorkbook.failNextWrite` makes the next sync that writes fail part-way, on purpose (for tests).
 * Errors and promises are made in the realm of the window given (the side-panel iframe), so
 * `instanceof Error` holds there.
 *
 * Why one file of this size: the proxies (request context, range, format, chart, worksheet, workbook)
 * mirror one API and share one command queue and realm; a file per proxy would have to export the
 * queue's internals.
 */
import { DEFAULT_COLUMN_PX, parseBlock, type CellBlock, type PreviewWorkbook } from './previewWorkbook';

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

/** A queued command; `reads` marks one that needs up-to-date values (loads, autofit); `writes` one that changes the workbook. */
interface Command {
  readonly run: () => void;
  readonly reads: boolean;
  readonly writes: boolean;
}

/** The Excel API versions the stand-in answers yes to (for the subset it implements). */
const OFFERED_API = '1.18';

function versionAtMost(version: string, most: string): boolean {
  const a = version.split('.').map(Number);
  const b = most.split('.').map(Number);
  for (let i = 0; i < Math.max(a.length, b.length); i += 1) {
    const d = (a[i] ?? 0) - (b[i] ?? 0);
    if (d !== 0) return d < 0;
  }
  return true;
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
    /** The highest ExcelApi version this stand-in offers. */
    readonly apiVersion: string = OFFERED_API,
  ) {
    this.workbook = new WorkbookProxy(this);
  }
  /** Fails the running command when the stand-in does not offer `version` (as an unknown API fails in Excel). */
  requireApi(version: string, what: string): void {
    if (!versionAtMost(version, this.apiVersion))
      this.fail('ApiNotFound', `The API you are trying to use could not be found (${what}).`);
  }
  /** A command that changes the workbook; `reads` when it also needs up-to-date values first (autofit). */
  enqueue(run: () => void, reads = false): void {
    this.queue.push({ run, reads, writes: true });
  }
  /** A load: reads only. */
  enqueueRead(run: () => void): void {
    this.queue.push({ run, reads: true, writes: false });
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
        // A failure asked for by a test: the next batch that writes stops after part of its writes.
        const writes = commands.filter((command) => command.writes).length;
        const failure = writes > 0 ? this.book.takeWriteFailure() : undefined;
        const stopAfter = failure === undefined ? Infinity : Math.floor(writes * failure.fraction);
        try {
          // One batch: HyperFormula evaluates before reads and once at the end; the grid redraws once.
          this.book.batch(() => {
            let written = 0;
            for (const command of commands) {
              if (command.writes && written >= stopAfter)
                throw officeError(this.realm, failure?.code ?? 'GeneralException', failure?.message ?? 'failed');
              if (command.reads) this.book.settle();
              command.run();
              if (command.writes) written += 1;
            }
          });
          resolve();
        } catch (error) {
          const coded = error as { code?: unknown; message?: unknown };
          reject(
            typeof coded.code === 'string'
              ? error
              : officeError(this.realm, 'GeneralException', String(coded.message ?? error)),
          );
        }
      }, 0);
    });
  }
}

/** Parses the `load` argument: 'a, b', ['a', 'b'], { select: 'a,b' } or nothing (everything). */
function loadList(properties: unknown): string[] | undefined {
  if (properties === undefined || properties === null) return undefined;
  if (typeof properties === 'string')
    return properties
      .split(',')
      .map((p) => p.trim())
      .filter(Boolean);
  if (Array.isArray(properties)) return properties.map(String);
  const select = (properties as { select?: unknown }).select;
  return select === undefined ? undefined : loadList(select);
}

const RANGE_PROPERTIES = [
  'address',
  'values',
  'valuesAsJson',
  'formulas',
  'rowCount',
  'columnCount',
  'numberFormat',
  'top',
  'left',
  'width',
  'height',
] as const;
type RangeProperty = (typeof RANGE_PROPERTIES)[number];

/** Excel's message for an array that does not fit its range (as quoted in issue #11). */
const SIZE_MISMATCH =
  "The number of rows or columns in the input array doesn't match the size or dimensions of the range.";

/**
 * Checks that a 2-D array has the block's size. The API reference promises nothing for a single value
 * spread over a larger range, so the stand-in refuses it as Excel may, with Excel's message.
 */
function shapeFor(ctx: RequestContext, block: CellBlock, data: unknown, what: string): unknown[][] {
  const rows = localRows(data);
  if (rows === undefined) return ctx.fail('InvalidArgument', `${what} must be a 2-D array`);
  if (rows.length !== block.rows || rows.some((row) => row.length !== block.columns)) {
    ctx.fail(
      'InvalidArgument',
      `${SIZE_MISMATCH} (${what}: the array is ${rows.length}×${rows[0]?.length ?? 0}, the range ${block.rows}×${block.columns})`,
    );
  }
  return rows;
}

/** A cell as valuesAsJson gives it (the basic types only: the preview has no entities). */
function cellJson(value: number | string | boolean, isError: boolean): Record<string, unknown> {
  if (isError) return { type: 'Error', basicType: 'Error', basicValue: value };
  if (value === '') return { type: 'Empty', basicType: 'Empty', basicValue: '' };
  if (typeof value === 'number') return { type: 'Double', basicType: 'Double', basicValue: value };
  if (typeof value === 'boolean') return { type: 'Boolean', basicType: 'Boolean', basicValue: value };
  return { type: 'String', basicType: 'String', basicValue: value };
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
    protected readonly ctx: RequestContext,
    /** Resolves the block when commands run (throws a coded error for a bad address). */
    readonly resolve: () => CellBlock,
  ) {
    this.format = new RangeFormatProxy(ctx, this);
  }

  load(properties?: unknown): this {
    const wanted = (loadList(properties) ?? [...RANGE_PROPERTIES]).filter((p): p is RangeProperty =>
      (RANGE_PROPERTIES as readonly string[]).includes(p),
    );
    this.ctx.enqueueRead(() => this.readNow(wanted));
    return this;
  }

  /** Runs a load: reads the properties from the workbook as it is now. */
  protected readNow(wanted: readonly RangeProperty[]): void {
    {
      const block = this.resolve();
      const book = this.ctx.book;
      for (const property of wanted) {
        if (property === 'top' || property === 'left' || property === 'width' || property === 'height') {
          const from = book.pointsAt(block.sheet, block.row, block.col);
          const to = book.pointsAt(block.sheet, block.row + block.rows, block.col + block.columns);
          this.loadedValues.top = from.top;
          this.loadedValues.left = from.left;
          this.loadedValues.width = to.left - from.left;
          this.loadedValues.height = to.top - from.top;
        }
        if (property === 'address') this.loadedValues.address = book.qualifiedAddress(block);
        if (property === 'rowCount') this.loadedValues.rowCount = block.rows;
        if (property === 'columnCount') this.loadedValues.columnCount = block.columns;
        const realm = this.ctx.realm;
        if (property === 'values') this.loadedValues.values = realmRows(realm, book.values(block));
        if (property === 'valuesAsJson') {
          this.loadedValues.valuesAsJson = realmRows(
            realm,
            grid(block, (r, c) => {
              const view = book.cell(block.sheet, r, c);
              return cellJson(view.value, view.kind === 'error');
            }),
          );
        }
        if (property === 'formulas') {
          this.loadedValues.formulas = realmRows(
            realm,
            grid(block, (r, c) => {
              const view = book.cell(block.sheet, r, c);
              // A formula's text; for a constant its value, as Excel gives it (text without its apostrophe).
              return view.input.startsWith('=') ? view.input : view.value;
            }),
          );
        }
        if (property === 'numberFormat') {
          this.loadedValues.numberFormat = realmRows(
            realm,
            grid(block, (r, c) => book.numberFormat(block.sheet, r, c) ?? 'General'),
          );
        }
      }
    }
  }

  /** Always false: a range made by getRange is never a null object (see getSpillParentOrNullObject). */
  get isNullObject(): boolean {
    return false;
  }

  private read(property: RangeProperty): unknown {
    if (!(property in this.loadedValues)) {
      throw officeError(
        this.ctx.realm,
        'PropertyNotLoaded',
        `The property '${property}' is not available. Call load('${property}') and context.sync() first.`,
      );
    }
    return this.loadedValues[property];
  }

  get address(): string {
    return this.read('address') as string;
  }
  get top(): number {
    return this.read('top') as number;
  }
  get left(): number {
    return this.read('left') as number;
  }
  get width(): number {
    return this.read('width') as number;
  }
  get height(): number {
    return this.read('height') as number;
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
  get valuesAsJson(): Record<string, unknown>[][] {
    return this.read('valuesAsJson') as Record<string, unknown>[][];
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
      rows.forEach((line, r) =>
        line.forEach((format, c) =>
          this.ctx.book.setNumberFormat(block.sheet, block.row + r, block.col + c, String(format)),
        ),
      );
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
        this.ctx.fail(
          'InvalidArgument',
          `cannot write ${this.ctx.book.qualifiedAddress(block)}: ${(error as Error).message}`,
        );
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

  getColumn(column: number): RangeProxy {
    return new RangeProxy(this.ctx, () => {
      const b = this.resolve();
      if (column < 0 || column >= b.columns) this.ctx.fail('InvalidArgument', `column ${column} is outside the range`);
      return { ...b, col: b.col + column, columns: 1 };
    });
  }

  /** Font bold/colour and fill colour/pattern of each cell (ExcelApi 1.9's CellProperties subset). */
  getCellProperties(_options?: unknown): { value: unknown[][] } {
    const result = { value: [] as unknown[][] };
    this.ctx.enqueueRead(() => {
      const b = this.resolve();
      result.value = realmRows(
        this.ctx.realm,
        grid(b, (r, c) => {
          const style = this.ctx.book.style(b.sheet, r, c);
          return {
            format: {
              font: { bold: style?.bold === true, color: (style?.color ?? '#000000').toUpperCase() },
              fill: style?.fill
                ? { color: style.fill.toUpperCase(), pattern: 'Solid' }
                : { color: '#FFFFFF', pattern: 'None' },
            },
          };
        }),
      );
    });
    return result;
  }

  setCellProperties(data: unknown[][]): void {
    this.ctx.enqueue(() => {
      const b = this.resolve();
      const rows = shapeFor(this.ctx, b, data, 'setCellProperties');
      rows.forEach((line, r) =>
        line.forEach((cell, c) => {
          const format = (
            cell as { format?: { font?: { bold?: unknown; color?: unknown }; fill?: { color?: unknown } } }
          ).format;
          const patch: { bold?: boolean; color?: string; fill?: string } = {};
          if (format?.font?.bold !== undefined) patch.bold = Boolean(format.font.bold);
          if (format?.font?.color !== undefined) patch.color = String(format.font.color);
          if (format?.fill?.color !== undefined) patch.fill = String(format.fill.color);
          this.ctx.book.setStyle(b.sheet, b.row + r, b.col + c, patch);
        }),
      );
      this.ctx.book.touch();
    });
  }

  /** The whole rows of this range: `insert('Down')` inserts as many empty rows above them. */
  getEntireRow(): { insert(shift: string): void } {
    return {
      insert: (shift: string) => {
        this.ctx.enqueue(() => {
          if (shift !== 'Down') this.ctx.fail('InvalidArgument', `whole rows are inserted Down, not ${shift}`);
          const b = this.resolve();
          this.ctx.book.insertRows(b.sheet, b.row, b.rows);
        });
      },
    };
  }

  /** Clears contents, formats and notes ('All', the only kind the preview offers). */
  clear(applyTo?: string): void {
    this.ctx.enqueue(() => {
      if (applyTo !== undefined && applyTo !== 'All')
        this.ctx.fail('InvalidArgument', `the preview clears All only, not ${applyTo}`);
      this.ctx.book.clearBlock(this.resolve());
    });
  }

  /** On a formula cell: the whole block its result fills, or a null object when it does not spill. */
  getSpillingToRangeOrNullObject(): NullableRange {
    const result = new NullableRange(this.ctx);
    this.ctx.enqueueRead(() => {
      const b = this.resolve();
      if (b.rows !== 1 || b.columns !== 1) this.ctx.fail('InvalidArgument', 'The range must be a single cell.');
      const spill = this.ctx.book.spillRange(b.sheet, b.row, b.col);
      result.settle(spill === undefined ? null : this.ctx.book.qualifiedAddress(spill));
    });
    return result;
  }

  /** The formula cell whose spill shows in this range's top-left cell, or a null object. */
  getSpillParentOrNullObject(): NullableRange {
    const result = new NullableRange(this.ctx);
    this.ctx.enqueueRead(() => {
      const b = this.resolve();
      const anchor = this.ctx.book.spillAnchor(b.sheet, b.row, b.col);
      result.settle(
        anchor === undefined
          ? null
          : this.ctx.book.qualifiedAddress({ sheet: b.sheet, row: anchor.row, col: anchor.col, rows: 1, columns: 1 }),
      );
    });
    return result;
  }

  get worksheet(): WorksheetProxy {
    return new WorksheetProxy(this.ctx, () => this.resolve().sheet);
  }
}

/** A range that may be a null object (spill parents, used ranges); its address and isNullObject are known after sync. */
class NullableRange {
  private state: { address: string | null } | undefined;
  constructor(private readonly ctx: RequestContext) {}
  settle(address: string | null): void {
    this.state = { address };
  }
  load(_properties?: unknown): this {
    return this;
  }
  private known(): { address: string | null } {
    if (this.state === undefined)
      return this.ctx.fail('PropertyNotLoaded', 'Call context.sync() before reading this range.');
    return this.state;
  }
  get isNullObject(): boolean {
    return this.known().address === null;
  }
  get address(): string {
    const { address } = this.known();
    return address ?? this.ctx.fail('InvalidArgument', 'The range is a null object.');
  }
}

function grid<T>(block: CellBlock, at: (row: number, col: number) => T): T[][] {
  return Array.from({ length: block.rows }, (_, r) =>
    Array.from({ length: block.columns }, (_, c) => at(block.row + r, block.col + c)),
  );
}

function checked(ctx: RequestContext, block: CellBlock): CellBlock {
  if (
    block.row < 0 ||
    block.col < 0 ||
    block.rows < 1 ||
    block.columns < 1 ||
    !Number.isInteger(block.row + block.col + block.rows + block.columns)
  ) {
    ctx.fail('InvalidArgument', 'The range is outside the worksheet.');
  }
  return block;
}

class RangeFormatProxy {
  readonly font: { bold: boolean; color: string };
  readonly fill: { color: string; clear(): void };
  constructor(
    private readonly ctx: RequestContext,
    private readonly range: RangeProxy,
  ) {
    const style = (patch: { bold?: boolean; color?: string; fill?: string }) =>
      ctx.enqueue(() => {
        const b = range.resolve();
        for (let r = 0; r < b.rows; r += 1)
          for (let c = 0; c < b.columns; c += 1) ctx.book.setStyle(b.sheet, b.row + r, b.col + c, patch);
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
      clear(): void {
        style({ fill: '' });
      },
    };
  }

  private loadedWidth: number | undefined;

  /** Loads `columnWidth` (the width of the range's first column, in points as Excel gives it: pixels × 0.75). */
  load(_properties?: unknown): this {
    this.ctx.enqueueRead(() => {
      const b = this.range.resolve();
      this.loadedWidth = (this.ctx.book.columnWidth(b.sheet, b.col) ?? DEFAULT_COLUMN_PX) * 0.75;
    });
    return this;
  }

  get columnWidth(): number {
    if (this.loadedWidth === undefined)
      return this.ctx.fail(
        'PropertyNotLoaded',
        "The property 'columnWidth' is not available. Call load('columnWidth') and context.sync() first.",
      );
    return this.loadedWidth;
  }

  set columnWidth(points: number) {
    this.ctx.enqueue(() => {
      const b = this.range.resolve();
      for (let c = 0; c < b.columns; c += 1) this.ctx.book.setColumnWidth(b.sheet, b.col + c, Number(points) / 0.75);
      this.ctx.book.touch();
    });
  }

  /** Widens each column of the range to fit its longest shown text (about 7 px a character). */
  autofitColumns(): void {
    this.ctx.enqueue(() => {
      const b = this.range.resolve();
      const book = this.ctx.book;
      for (let c = 0; c < b.columns; c += 1) {
        let longest = 4;
        for (let r = 0; r < b.rows; r += 1)
          longest = Math.max(longest, book.cell(b.sheet, b.row + r, b.col + c).text.length);
        book.setColumnWidth(b.sheet, b.col + c, Math.min(480, 16 + 7 * longest));
      }
      book.touch();
    }, true);
  }
}

class ChartProxy {
  readonly title: { text: string };
  /**
   * The x (category) and y (value) axes' titles, as Office.js's chart.axes.categoryAxis/valueAxis.title.text, and
   * the value axis's tickLabelPosition ('None' hides its numbers; the other positions draw them as before).
   */
  readonly axes: {
    categoryAxis: { title: { text: string } };
    valueAxis: { title: { text: string }; tickLabelPosition: string };
  };
  private chartName = '';
  constructor(
    private readonly ctx: RequestContext,
    private readonly chart: () => import('./previewWorkbook').PreviewChart,
  ) {
    const self = this;
    const axisTitle = (which: 'x' | 'y'): { text: string } => {
      let text = '';
      return {
        get text(): string {
          return text;
        },
        set text(value: string) {
          text = String(value);
          ctx.enqueue(() => {
            self.chart().axisTitles[which] = text;
            ctx.book.chartsChanged();
          });
        },
      };
    };
    let tickLabels = 'NextToAxis';
    const valueAxis = {
      title: axisTitle('y'),
      get tickLabelPosition(): string {
        return tickLabels;
      },
      set tickLabelPosition(value: string) {
        tickLabels = String(value);
        ctx.enqueue(() => {
          self.chart().valueLabelsHidden = tickLabels === 'None';
          ctx.book.chartsChanged();
        });
      },
    };
    this.axes = { categoryAxis: { title: axisTitle('x') }, valueAxis };
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
      if (!from || !to)
        this.ctx.fail('InvalidArgument', `not a cell address: ${startCell}${endCell ? `, ${endCell}` : ''}`);
      chart.position = {
        from: { row: from.row, col: from.col },
        to: { row: to.row + to.rows - 1, col: to.col + to.columns - 1 },
      };
      this.ctx.book.chartsChanged();
    });
  }
}

/** The used range: a range like any other once it exists, or a null object for an empty sheet. */
class UsedRange extends RangeProxy {
  private exists: boolean | undefined;
  constructor(
    ctx: RequestContext,
    private readonly block: () => CellBlock | undefined,
  ) {
    super(ctx, () => block() ?? ctx.fail('InvalidArgument', 'The range is a null object.'));
  }
  protected override readNow(wanted: readonly RangeProperty[]): void {
    this.exists = this.block() !== undefined;
    if (this.exists) super.readNow(wanted);
  }
  override get isNullObject(): boolean {
    if (this.exists === undefined)
      return this.ctx.fail('PropertyNotLoaded', 'Call load() and context.sync() before reading isNullObject.');
    return !this.exists;
  }
}

/** A chart as `charts.load('items/…')` lists it: its name, top-left corner in points, and delete(). */
interface ChartItem {
  readonly name: string;
  readonly top: number;
  readonly left: number;
  delete(): void;
}

/** A note as `notes.getItemOrNullObject(a1)` gives it (ExcelApi 1.18). */
class NoteItem {
  private found: { text: string | undefined } | undefined;
  constructor(
    private readonly ctx: RequestContext,
    private readonly cell: () => CellBlock,
  ) {}
  load(_properties?: unknown): this {
    this.ctx.enqueueRead(() => {
      this.ctx.requireApi('1.18', 'Worksheet.notes');
      const b = this.cell();
      this.found = { text: this.ctx.book.note(b.sheet, b.row, b.col) };
    });
    return this;
  }
  get isNullObject(): boolean {
    if (this.found === undefined)
      return this.ctx.fail('PropertyNotLoaded', 'Call load() and context.sync() before reading isNullObject.');
    return this.found.text === undefined;
  }
  get content(): string {
    if (this.found?.text === undefined)
      return this.ctx.fail('PropertyNotLoaded', "The property 'content' is not available.");
    return this.found.text;
  }
  set content(text: string) {
    this.ctx.enqueue(() => {
      this.ctx.requireApi('1.18', 'Note.content');
      const b = this.cell();
      if (this.ctx.book.note(b.sheet, b.row, b.col) === undefined)
        this.ctx.fail('ItemNotFound', 'The cell has no note.');
      this.ctx.book.setNote(b.sheet, b.row, b.col, String(text));
    });
  }
}

class WorksheetProxy {
  private loadedName: string | undefined;
  private existence: boolean | undefined;
  readonly charts: {
    add: (type: string, source: RangeProxy, seriesBy?: string) => ChartProxy;
    load: (properties?: unknown) => unknown;
    readonly items: ChartItem[];
  };
  readonly notes: {
    getItemOrNullObject: (address: string) => NoteItem;
    add: (address: string, content: string) => void;
  };
  readonly pageLayout: {
    orientation: string;
    zoom: { horizontalFitToPages?: number; verticalFitToPages?: number; scale?: number };
    centerHorizontally: boolean;
    setPrintArea(area: string): void;
  };
  constructor(
    private readonly ctx: RequestContext,
    /** Resolves the sheet's id when commands run; undefined only for a getItemOrNullObject that found none. */
    private readonly resolveSheetOrNull: () => number | undefined,
  ) {
    let listed: ChartItem[] | undefined;
    const charts = {
      add: (type: string, source: RangeProxy, seriesBy?: string): ChartProxy => {
        let made: import('./previewWorkbook').PreviewChart | undefined;
        ctx.enqueue(() => {
          if (type !== 'XYScatterSmoothNoMarkers' && type !== 'XYScatterLines' && type !== 'Line')
            ctx.fail('InvalidArgument', `chart type ${type} is not available in the preview`);
          if (seriesBy !== undefined && seriesBy !== 'Columns' && seriesBy !== 'Auto')
            ctx.fail('InvalidArgument', `seriesBy ${seriesBy} is not available in the preview`);
          const block = source.resolve();
          made = ctx.book.addChart(this.resolveSheet(), type, block);
        });
        return new ChartProxy(ctx, () => {
          if (!made) return ctx.fail('GeneralException', 'the chart was not created');
          return made;
        });
      },
      load: (_properties?: unknown) => {
        ctx.enqueueRead(() => {
          const sheet = this.resolveSheet();
          listed = ctx.book.charts(sheet).map((chart) => {
            const at = ctx.book.pointsAt(sheet, chart.position.from.row, chart.position.from.col);
            return {
              name: chart.name,
              top: at.top,
              left: at.left,
              delete: () => ctx.enqueue(() => ctx.book.deleteChart(chart.id)),
            };
          });
        });
        return charts;
      },
      get items(): ChartItem[] {
        return (
          listed ??
          ctx.fail(
            'PropertyNotLoaded',
            "The property 'items' is not available. Call load('items') and context.sync() first.",
          )
        );
      },
    };
    this.charts = charts;
    const cellAt = (address: string): CellBlock => {
      const block = parseBlock(address, this.resolveSheet());
      if (!block || block.rows !== 1 || block.columns !== 1)
        return ctx.fail('InvalidCellAddress', `${address} is not one cell.`);
      return block;
    };
    this.notes = {
      getItemOrNullObject: (address: string) => new NoteItem(ctx, () => cellAt(address)),
      add: (address: string, content: string) => {
        ctx.enqueue(() => {
          ctx.requireApi('1.18', 'Worksheet.notes');
          const b = cellAt(address);
          if (ctx.book.note(b.sheet, b.row, b.col) !== undefined)
            ctx.fail('InvalidArgument', `The cell ${address} has a note already.`);
          ctx.book.setNote(b.sheet, b.row, b.col, String(content));
        });
      },
    };
    const layout = (patch: import('./previewWorkbook').PreviewPageLayout): void =>
      ctx.enqueue(() => ctx.book.setPageLayout(this.resolveSheet(), patch));
    this.pageLayout = {
      set orientation(value: string) {
        if (value !== 'Portrait' && value !== 'Landscape') ctx.fail('InvalidArgument', `orientation ${value}`);
        layout({ orientation: value });
      },
      get orientation(): string {
        return ctx.fail('PropertyNotLoaded', 'pageLayout is write-only in the preview');
      },
      set zoom(value: { horizontalFitToPages?: number; verticalFitToPages?: number; scale?: number }) {
        layout({ zoom: { ...value } });
      },
      get zoom(): { horizontalFitToPages?: number } {
        return ctx.fail('PropertyNotLoaded', 'pageLayout is write-only in the preview');
      },
      set centerHorizontally(value: boolean) {
        layout({ centerHorizontally: Boolean(value) });
      },
      get centerHorizontally(): boolean {
        return ctx.fail('PropertyNotLoaded', 'pageLayout is write-only in the preview');
      },
      setPrintArea: (area: string) => {
        ctx.enqueue(() => {
          const sheet = this.resolveSheet();
          if (!parseBlock(area, sheet)) ctx.fail('InvalidArgument', `not a cell address: ${area}`);
          ctx.book.setPageLayout(sheet, { printArea: area });
        });
      },
    };
  }
  private resolveSheet(): number {
    const id = this.resolveSheetOrNull();
    return id ?? this.ctx.fail('ItemNotFound', 'The worksheet does not exist.');
  }
  load(properties?: unknown): this {
    const wanted = loadList(properties);
    this.ctx.enqueueRead(() => {
      const sheet = this.resolveSheetOrNull();
      this.existence = sheet !== undefined;
      if (sheet !== undefined && (wanted === undefined || wanted.includes('name')))
        this.loadedName = this.ctx.book.hf.getSheetName(sheet);
    });
    return this;
  }
  /** For getItemOrNullObject: known after a load and sync. */
  get isNullObject(): boolean {
    if (this.existence === undefined)
      return this.ctx.fail('PropertyNotLoaded', 'Call load() and context.sync() before reading isNullObject.');
    return !this.existence;
  }
  get name(): string {
    if (this.loadedName === undefined) {
      throw officeError(
        this.ctx.realm,
        'PropertyNotLoaded',
        "The property 'name' is not available. Call load('name') and context.sync() first.",
      );
    }
    return this.loadedName;
  }
  /** Renames the sheet when the batch runs. */
  set name(value: string) {
    const name = String(value);
    this.ctx.enqueue(() => {
      try {
        this.ctx.book.renameSheet(this.resolveSheet(), name);
      } catch (error) {
        const coded = error as { code?: unknown };
        if (typeof coded.code === 'string') throw error;
        this.ctx.fail('InvalidArgument', `cannot rename the sheet to '${name}': ${(error as Error).message}`);
      }
    });
    this.loadedName = name;
  }
  /** A copy of the sheet (Worksheet.copy): only 'After' this sheet is offered. */
  copy(positionType?: string, relativeTo?: WorksheetProxy): WorksheetProxy {
    let made: number | undefined;
    this.ctx.enqueue(() => {
      if (positionType !== 'After' || relativeTo === undefined)
        this.ctx.fail('InvalidArgument', 'the preview copies a sheet After a sheet only');
      made = this.ctx.book.copySheet(this.resolveSheet());
    });
    return new WorksheetProxy(this.ctx, () => made);
  }
  getRange(address: string): RangeProxy {
    return new RangeProxy(this.ctx, () => {
      if (typeof address !== 'string' || address.includes('!')) {
        return this.ctx.fail(
          'InvalidArgument',
          `getRange needs an A1 address without a sheet name, got ${String(address)}`,
        );
      }
      const block = parseBlock(address, this.resolveSheet());
      if (!block) return this.ctx.fail('InvalidArgument', `not a cell address: ${address}`);
      return block;
    });
  }
  /** The block from A1 to the last row and column holding a value, or a null object for an empty sheet. */
  getUsedRangeOrNullObject(_valuesOnly?: boolean): UsedRange {
    return new UsedRange(this.ctx, () => {
      const sheet = this.resolveSheet();
      const { height, width } = this.ctx.book.hf.getSheetDimensions(sheet);
      return height === 0 || width === 0 ? undefined : { sheet, row: 0, col: 0, rows: height, columns: width };
    });
  }
  activate(): void {
    this.ctx.enqueue(() => this.ctx.book.activate(this.resolveSheet()));
  }
  delete(): void {
    this.ctx.enqueue(() => this.ctx.book.removeSheet(this.resolveSheet()));
  }
}

/** The worksheet collection's `items` after load('items/name'). */
class WorksheetCollection {
  private names: string[] | undefined;
  constructor(private readonly ctx: RequestContext) {}
  load(_properties?: unknown): this {
    this.ctx.enqueueRead(() => {
      this.names = this.ctx.book.sheetNames();
    });
    return this;
  }
  get items(): { name: string }[] {
    if (this.names === undefined)
      return this.ctx.fail(
        'PropertyNotLoaded',
        "The property 'items' is not available. Call load('items/name') and context.sync() first.",
      );
    return this.names.map((name) => ({ name }));
  }
  getItem(name: string): WorksheetProxy {
    return new WorksheetProxy(this.ctx, () => {
      const id = this.ctx.book.sheetId(name);
      if (id === undefined) return this.ctx.fail('ItemNotFound', `The worksheet '${name}' does not exist.`);
      return id;
    });
  }
  getItemOrNullObject(name: string): WorksheetProxy {
    return new WorksheetProxy(this.ctx, () => this.ctx.book.sheetId(name));
  }
  getActiveWorksheet(): WorksheetProxy {
    return new WorksheetProxy(this.ctx, () => this.ctx.book.activeSheet);
  }
  add(name: string): WorksheetProxy {
    this.ctx.enqueue(() => {
      if (this.ctx.book.sheetId(name) !== undefined)
        this.ctx.fail('ItemAlreadyExists', `A sheet named '${name}' already exists.`);
      try {
        this.ctx.book.addSheet(name);
      } catch (error) {
        this.ctx.fail('InvalidArgument', `cannot add the sheet '${name}': ${(error as Error).message}`);
      }
    });
    return this.getItem(name);
  }
}

class WorkbookProxy {
  readonly worksheets: WorksheetCollection;
  readonly onSelectionChanged: { add: (handler: (args?: { address: string }) => unknown) => { remove: () => void } };
  constructor(private readonly ctx: RequestContext) {
    this.worksheets = new WorksheetCollection(ctx);
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
  readonly Office: {
    onReady(callback?: (info: { host: string; platform: string }) => void): Promise<{ host: string; platform: string }>;
    HostType: { Excel: string };
    context: { requirements: { isSetSupported(set: string, version?: string): boolean } };
  };
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
export function createOfficeStandIn(
  book: PreviewWorkbook,
  realm: Realm,
  apiVersion: string = OFFERED_API,
): OfficeStandIn {
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
      context: {
        requirements: {
          isSetSupported: (set: string, version = '1.1') =>
            set === 'ExcelApi' && versionAtMost(String(version), apiVersion),
        },
      },
    },
    Excel: {
      run<T>(batch: (context: RequestContext) => Promise<T> | T): Promise<T> {
        const context = new RequestContext(book, realm, apiVersion);
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
