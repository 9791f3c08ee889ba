/**
 * The preview's workbook: a HyperFormula engine plus what a spreadsheet shows around it (number formats,
 * simple cell styles, column widths, the active sheet, the selection, charts), with change listeners for
 * the grid and the Excel stand-in. No DOM here, so it also runs under node.
 *
 * Why one file of this size: the PreviewWorkbook class is one state (engine, formats, styles, widths,
 * selection, charts, listeners) that every method reads; the number-format and address helpers above it
 * are shared by the class and the grid, and are the part to move out first if the file grows.
 */
import { DetailedCellError, HyperFormula } from 'hyperformula';
import { columnLetters, parseA1, type DemoSheet, HYPERFORMULA_CONFIG, demoSheetsForHyperFormula } from './demoWorkbook';

/** A rectangle of cells on one sheet, zero-based and inclusive. */
export interface CellBlock {
  readonly sheet: number;
  readonly row: number;
  readonly col: number;
  readonly rows: number;
  readonly columns: number;
}

/** Simple per-cell styles the Excel stand-in can set. */
export interface CellStyle {
  bold?: boolean;
  color?: string;
  fill?: string;
}

/** A chart drawn over the grid. */
export interface PreviewChart {
  readonly id: number;
  readonly sheet: number;
  type: 'XYScatterSmoothNoMarkers' | 'XYScatterLines' | 'Line';
  source: CellBlock;
  title: string;
  /** Titles of the horizontal and vertical axes ("" when not set). */
  axisTitles: { x: string; y: string };
  /** The vertical axis's tick labels are hidden (Office.js valueAxis.tickLabelPosition = 'None'). */
  valueLabelsHidden: boolean;
  name: string;
  /** Top-left and bottom-right cells the chart covers. */
  position: { from: { row: number; col: number }; to: { row: number; col: number } };
}

/** What a cell shows. */
export interface CellView {
  /** The text drawn in the cell. */
  readonly text: string;
  readonly kind: 'empty' | 'number' | 'text' | 'boolean' | 'error';
  /** The raw value: number, string, boolean, '' for blank, or the error text ('#VALUE!'). */
  readonly value: number | string | boolean;
  /** An error's message, for the tooltip and the formula bar. */
  readonly message?: string;
  /** "=…" for a formula cell, else the constant as typed, '' for blank. */
  readonly input: string;
  /** True when the cell holds part of a spilled result other than its formula cell. */
  readonly spilled: boolean;
}

/** What a sheet's page layout was set to (the preview does not print; tests read it). */
export interface PreviewPageLayout {
  orientation?: string;
  zoom?: { horizontalFitToPages?: number; verticalFitToPages?: number; scale?: number };
  centerHorizontally?: boolean;
  printArea?: string;
}

/** A row's height in points, as the stand-in reports range and chart positions (Excel's default, from memory). */
export const ROW_HEIGHT_PT = 15;

/** Events the workbook emits. */
export type WorkbookEvent = 'cells' | 'selection' | 'sheet' | 'charts';

/** A column's width in pixels when none is set. */
export const DEFAULT_COLUMN_PX = 92;

/** A failure the Excel stand-in is asked to make (see {@link PreviewWorkbook.failNextWrite}). */
export interface WriteFailure {
  /** Share of the batch's write commands that run before it fails (0.5: half-way). */
  readonly fraction: number;
  readonly code: string;
  readonly message: string;
}

/**
 * Formats a number with an Excel-style number format code (the subset the preview needs: "0", "0.00",
 * "0.0%", "General"). Cost: O(1). Never throws; an unknown code falls back to General.
 *
 * @example
 * formatNumber(0.04321, '0.00%'); //=> '4.32%'
 */
export function formatNumber(value: number, format: string | undefined): string {
  const code = (format ?? 'General').trim();
  const fixed = /^0(?:\.(0+))?(%?)$/.exec(code);
  if (fixed) {
    const decimals = fixed[1]?.length ?? 0;
    return fixed[2] === '%' ? `${(value * 100).toFixed(decimals)}%` : value.toFixed(decimals);
  }
  if (Number.isInteger(value) && Math.abs(value) < 1e11) return String(value);
  const abs = Math.abs(value);
  if (abs !== 0 && (abs < 1e-4 || abs >= 1e11)) {
    // Excel's General shows 1.23E-05
    const [mantissa, exponent] = value.toExponential(4).split('e') as [string, string];
    const e = Number(exponent);
    return `${Number(mantissa)}E${e < 0 ? '-' : '+'}${String(Math.abs(e)).padStart(2, '0')}`;
  }
  return String(Number(value.toPrecision(8)));
}

/**
 * The text of a number that fits `maxChars` characters, as a spreadsheet shows it in a narrow column: a
 * General number loses decimals (rounded, not cut) and then turns to scientific notation; a number with a
 * fixed format that does not fit shows "#" signs (Excel's "####"). Cost O(digits). Never throws.
 *
 * @example
 * fitNumber(0.04321987, undefined, 6); //=> '0.0432'
 * fitNumber(0.4321, '0.00%', 4); //=> '####'
 */
export function fitNumber(value: number, format: string | undefined, maxChars: number): string {
  const shown = formatNumber(value, format);
  const room = Math.max(1, Math.floor(maxChars));
  if (shown.length <= room) return shown;
  const code = (format ?? 'General').trim();
  if (code === 'General' || code === '') {
    const abs = Math.abs(value);
    if (abs >= 1e-4 && abs < 1e11) {
      // Drop decimals, rounding: 0.0432199 → 0.04322 → 0.0432 …
      for (let decimals = 10; decimals >= 0; decimals -= 1) {
        const text = String(Number(value.toFixed(decimals)));
        if (text.length <= room && !(Number(text) === 0 && value !== 0)) return text;
      }
    }
    for (let digits = 6; digits >= 1; digits -= 1) {
      const [mantissa, exponent] = value.toExponential(digits - 1).split('e') as [string, string];
      const e = Number(exponent);
      const text = `${Number(mantissa)}E${e < 0 ? '-' : '+'}${String(Math.abs(e)).padStart(2, '0')}`;
      if (text.length <= room) return text;
    }
  }
  return '#'.repeat(room);
}

/** The preview's sheet size (HyperFormula's maxRows/maxColumns in HYPERFORMULA_CONFIG) and Excel's, for messages. */
const EXCEL_SIZE = '1,048,576 rows and 16,384 columns';

/**
 * Why a formula shows a bare #NAME?: it refers to a cell beyond the preview's sheet size. Returns the
 * message, or undefined when every reference is inside. References inside string literals are ignored.
 * Cost O(formula length). Never throws.
 *
 * @example
 * beyondSheetMessage('=SUM(A1:A2500)', 2000, 200); //=> 'This preview's sheets have 2,000 rows and 200 columns …'
 */
export function beyondSheetMessage(formula: string, maxRows: number, maxColumns: number): string | undefined {
  const code = formula.replace(/"(?:[^"]|"")*"/g, '""');
  let worst: string | undefined;
  for (const match of code.matchAll(/(?<![A-Za-z0-9_.])\$?([A-Za-z]{1,3})\$?([0-9]{1,7})(?![A-Za-z0-9_(])/g)) {
    const letters = match[1] ?? '';
    const row = Number(match[2]);
    let column = 0;
    for (const ch of letters.toUpperCase()) column = column * 26 + (ch.charCodeAt(0) - 64);
    if (row > maxRows || column > maxColumns) {
      worst = match[0].replace(/\$/g, '');
      break;
    }
  }
  if (worst === undefined) return undefined;
  return (
    `This preview's sheets have ${maxRows.toLocaleString('en-US')} rows and ${maxColumns} columns (Excel's have ${EXCEL_SIZE}); ` +
    `the formula refers to ${worst}, beyond them. It works in Excel.`
  );
}

/**
 * Quotes a sheet name the way Excel does in addresses. Cost O(name). Never throws.
 * @example qualifiedSheetName('Past tests'); //=> "'Past tests'"
 */
export function qualifiedSheetName(name: string): string {
  return /^[A-Za-z_][A-Za-z0-9_.]*$/.test(name) ? name : `'${name.replace(/'/g, "''")}'`;
}

/**
 * A1 text of a block without the sheet. Cost O(1). Never throws.
 * @example blockAddress({ row: 1, col: 1, rows: 3, columns: 3 }); //=> 'B2:D4'
 */
export function blockAddress(block: Omit<CellBlock, 'sheet'>): string {
  const first = `${columnLetters(block.col)}${block.row + 1}`;
  if (block.rows === 1 && block.columns === 1) return first;
  return `${first}:${columnLetters(block.col + block.columns - 1)}${block.row + block.rows}`;
}

/**
 * Parses "B2" or "B2:D4" (no sheet) into a block on `sheet`; undefined if it is not an address. Cost O(1).
 * @example parseBlock('B2:D4', 0); //=> { sheet: 0, row: 1, col: 1, rows: 3, columns: 3 }
 */
export function parseBlock(address: string, sheet: number): CellBlock | undefined {
  const parts = address.trim().split(':');
  if (parts.length < 1 || parts.length > 2) return undefined;
  try {
    const a = parseA1(parts[0] ?? '');
    const b = parts.length === 2 ? parseA1(parts[1] ?? '') : a;
    return {
      sheet,
      row: Math.min(a.row, b.row),
      col: Math.min(a.col, b.col),
      rows: Math.abs(b.row - a.row) + 1,
      columns: Math.abs(b.col - a.col) + 1,
    };
  } catch {
    return undefined;
  }
}

/**
 * The workbook of the preview. Create one per page (or per test) with {@link PreviewWorkbook.create};
 * the ABTEST functions must already be registered into HyperFormula.
 */
export class PreviewWorkbook {
  readonly hf: HyperFormula;
  private readonly formats: Map<string, string>[];
  private readonly styles: Map<string, CellStyle>[];
  private readonly widths: Record<string, number>[];
  private readonly listeners = new Map<WorkbookEvent, Set<() => void>>();
  private readonly chartList: PreviewChart[] = [];
  private nextChartId = 1;
  private batchDepth = 0;
  private readonly pendingEvents = new Set<WorkbookEvent>();
  private active = 0;
  private selected: CellBlock = { sheet: 0, row: 0, col: 0, rows: 1, columns: 1 };
  private readonly writeFailures: WriteFailure[] = [];
  private readonly notesBySheet: Map<string, string>[] = [];
  private readonly layouts: PreviewPageLayout[] = [];
  private readonly selectionBySheet = new Map<number, CellBlock>();

  private constructor(sheets: readonly DemoSheet[]) {
    this.hf = HyperFormula.buildFromSheets(demoSheetsForHyperFormula(sheets), { ...HYPERFORMULA_CONFIG });
    this.formats = sheets.map((sheet) => {
      const map = new Map<string, string>();
      for (const [address, format] of Object.entries(sheet.formats)) {
        const { row, col } = parseA1(address);
        map.set(`${row},${col}`, format);
      }
      return map;
    });
    this.styles = sheets.map((sheet) => {
      const map = new Map<string, CellStyle>();
      for (const address of sheet.bold ?? []) {
        const { row, col } = parseA1(address);
        map.set(`${row},${col}`, { bold: true });
      }
      return map;
    });
    this.widths = sheets.map((sheet) => ({ ...sheet.columnWidths }));
    sheets.forEach((_, i) => {
      this.notesBySheet[i] = new Map();
      this.layouts[i] = {};
    });
  }

  /**
   * Builds the workbook from sheets (normally {@link buildDemoWorkbook}'s). Cost: one full HyperFormula
   * evaluation. Throws what HyperFormula throws for malformed sheets.
   *
   * @example
   * PreviewWorkbook.create(buildDemoWorkbook()).sheetNames(); //=> ['Checkout test', 'Past tests', 'Plan']
   */
  static create(sheets: readonly DemoSheet[]): PreviewWorkbook {
    return new PreviewWorkbook(sheets);
  }

  /** Subscribes to an event; returns the unsubscribe function. */
  on(event: WorkbookEvent, listener: () => void): () => void {
    const set = this.listeners.get(event) ?? new Set<() => void>();
    set.add(listener);
    this.listeners.set(event, set);
    return () => set.delete(listener);
  }

  private emit(event: WorkbookEvent): void {
    if (this.batchDepth > 0) {
      this.pendingEvents.add(event);
      return;
    }
    for (const listener of [...(this.listeners.get(event) ?? [])]) listener();
  }

  /**
   * Runs `work` as one batch (the Excel stand-in's `context.sync()`): HyperFormula evaluates once at
   * the end (or at {@link settle}), spills are restored once, and listeners hear each event once.
   * Nested batches join the outer one. Rethrows what `work` throws, after closing the batch.
   */
  batch<T>(work: () => T): T {
    if (this.batchDepth === 0) this.hf.suspendEvaluation();
    this.batchDepth += 1;
    try {
      return work();
    } finally {
      this.batchDepth -= 1;
      if (this.batchDepth === 0) {
        if (this.hf.isEvaluationSuspended()) this.hf.resumeEvaluation();
        this.respill();
        const events = [...this.pendingEvents];
        this.pendingEvents.clear();
        for (const event of (['sheet', 'cells', 'charts', 'selection'] as const).filter((e) => events.includes(e)))
          this.emit(event);
      }
    }
  }

  /**
   * Inside a batch: brings values up to date before something reads them; evaluation stays on until
   * the next write of the batch. Cheap when nothing changed.
   */
  settle(): void {
    if (this.batchDepth === 0 || !this.hf.isEvaluationSuspended()) return;
    this.hf.resumeEvaluation();
    this.respill();
  }

  sheetNames(): string[] {
    return this.hf.getSheetNames();
  }

  sheetId(name: string): number | undefined {
    return this.hf.getSheetId(name);
  }

  /** Ids of the sheets, in tab order (ids stay the same when a sheet is removed). */
  sheetIds(): number[] {
    return this.hf.getSheetNames().map((name) => this.hf.getSheetId(name) as number);
  }

  /**
   * Adds an empty sheet at the end and fires 'sheet'; returns its id. Throws HyperFormula's error for a
   * name it refuses (taken, or not a valid name).
   */
  addSheet(name: string): number {
    const added = this.hf.addSheet(name);
    const id = this.hf.getSheetId(added) as number;
    this.formats[id] = new Map();
    this.styles[id] = new Map();
    this.widths[id] = {};
    this.notesBySheet[id] = new Map();
    this.layouts[id] = {};
    this.emit('sheet');
    return id;
  }

  /**
   * Copies a sheet as Excel's Worksheet.copy does: contents (formulas as they are, so references without a
   * sheet name read the copy's own cells), number formats, styles, column widths, notes, page layout and
   * charts (reading the copy's cells). Named "Name (2)", "Name (3)"… The copy goes at the end of the tabs
   * (HyperFormula cannot reorder sheets; Excel would put it right after the source). Returns its id;
   * fires 'sheet' and 'charts'. Throws for an unknown sheet.
   */
  copySheet(source: number): number {
    const name = this.hf.getSheetName(source);
    if (name === undefined) throw new Error(`no sheet ${source}`);
    let n = 2;
    while (this.sheetId(`${name} (${n})`) !== undefined) n += 1;
    // Reading which cells are spilled needs values up to date (HyperFormula refuses while suspended).
    this.settle();
    const id = this.addSheet(`${name} (${n})`);
    const { height, width } = this.hf.getSheetDimensions(source);
    const contents: (string | number | boolean | null)[][] = [];
    for (let row = 0; row < height; row += 1) {
      const line: (string | number | boolean | null)[] = [];
      for (let col = 0; col < width; col += 1) {
        const at = { sheet: source, row, col };
        // A spilled cell is not content: its formula cell fills it again in the copy.
        const spilled = this.hf.isCellPartOfArray(at) && !this.hf.doesCellHaveFormula(at);
        const serialized = spilled ? null : this.hf.getCellSerialized(at);
        line.push(
          serialized === undefined || serialized === '' ? null : (serialized as string | number | boolean | null),
        );
      }
      contents.push(line);
    }
    if (height > 0 && width > 0) this.hf.setSheetContent(id, contents);
    this.formats[id] = new Map(this.formats[source]);
    this.styles[id] = new Map(
      [...(this.styles[source] ?? new Map<string, CellStyle>())].map(([k, v]) => [k, { ...v }]),
    );
    this.widths[id] = { ...this.widths[source] };
    this.notesBySheet[id] = new Map(this.notesBySheet[source]);
    this.layouts[id] = { ...this.layouts[source] };
    for (const chart of this.charts(source)) {
      const copy = this.addChart(id, chart.type, { ...chart.source, sheet: id });
      copy.title = chart.title;
      copy.axisTitles = { ...chart.axisTitles };
      copy.valueLabelsHidden = chart.valueLabelsHidden;
      copy.position = { from: { ...chart.position.from }, to: { ...chart.position.to } };
    }
    if (this.batchDepth === 0) this.respill();
    this.emit('cells');
    this.emit('charts');
    return id;
  }

  /** Renames a sheet; fires 'sheet'. Throws HyperFormula's error for a name taken or not valid. */
  renameSheet(sheet: number, name: string): void {
    this.hf.renameSheet(sheet, name);
    this.emit('sheet');
  }

  /**
   * Inserts `count` empty rows above row `at` (0-based): HyperFormula moves the cells and adjusts every
   * formula; number formats, styles, notes and charts move with their cells. Fires 'cells' and 'charts'.
   */
  insertRows(sheet: number, at: number, count: number): void {
    if (!(Number.isInteger(at) && at >= 0 && Number.isInteger(count) && count >= 1))
      throw new Error('rows to insert must be whole numbers');
    if (this.batchDepth > 0 && !this.hf.isEvaluationSuspended()) this.hf.suspendEvaluation();
    this.hf.addRows(sheet, [at, count]);
    const moveKey = (key: string): string => {
      const [r, c] = key.split(',').map(Number) as [number, number];
      return `${r >= at ? r + count : r},${c}`;
    };
    const moveMap = <T>(map: Map<string, T> | undefined): Map<string, T> =>
      new Map([...(map ?? new Map<string, T>())].map(([k, v]) => [moveKey(k), v]));
    this.formats[sheet] = moveMap(this.formats[sheet]);
    this.styles[sheet] = moveMap(this.styles[sheet]);
    this.notesBySheet[sheet] = moveMap(this.notesBySheet[sheet]);
    for (const chart of this.charts(sheet)) {
      const down = (row: number): number => (row >= at ? row + count : row);
      chart.source = { ...chart.source, row: down(chart.source.row) };
      chart.position = {
        from: { row: down(chart.position.from.row), col: chart.position.from.col },
        to: { row: down(chart.position.to.row), col: chart.position.to.col },
      };
    }
    if (this.batchDepth === 0) this.respill();
    this.emit('cells');
    this.emit('charts');
  }

  /**
   * Range.clear('All'): contents, number formats, styles and notes of a block. Cells that show part of a
   * spill whose formula cell lies outside the block stay (the spill is not content). Fires 'cells'.
   */
  clearBlock(block: CellBlock): void {
    if (this.batchDepth > 0 && !this.hf.isEvaluationSuspended()) this.hf.suspendEvaluation();
    for (let r = 0; r < block.rows; r += 1) {
      for (let c = 0; c < block.columns; c += 1) {
        const at = { sheet: block.sheet, row: block.row + r, col: block.col + c };
        const key = `${at.row},${at.col}`;
        this.formats[block.sheet]?.delete(key);
        this.styles[block.sheet]?.delete(key);
        this.notesBySheet[block.sheet]?.delete(key);
        const spilled = this.hf.isCellPartOfArray(at) && !this.hf.doesCellHaveFormula(at);
        const content = this.hf.getCellSerialized(at);
        if (!spilled && content !== undefined && content !== null && content !== '') this.hf.setCellContents(at, null);
      }
    }
    if (this.batchDepth === 0) this.respill();
    this.emit('cells');
  }

  /** The note on a cell, if any. */
  note(sheet: number, row: number, col: number): string | undefined {
    return this.notesBySheet[sheet]?.get(`${row},${col}`);
  }

  /** Puts (or with undefined removes) the note on a cell; fires 'cells'. */
  setNote(sheet: number, row: number, col: number, text: string | undefined): void {
    const map = this.notesBySheet[sheet] ?? new Map<string, string>();
    this.notesBySheet[sheet] = map;
    if (text === undefined) map.delete(`${row},${col}`);
    else map.set(`${row},${col}`, text);
    this.emit('cells');
  }

  /** The notes of a sheet by A1 address (for tests). */
  notes(sheet: number): Record<string, string> {
    return Object.fromEntries(
      [...(this.notesBySheet[sheet] ?? new Map<string, string>())].map(([k, text]) => {
        const [r, c] = k.split(',').map(Number) as [number, number];
        return [`${columnLetters(c)}${r + 1}`, text];
      }),
    );
  }

  /** What a sheet's page layout was set to. */
  pageLayout(sheet: number): PreviewPageLayout {
    return { ...(this.layouts[sheet] ?? {}) };
  }

  /** Sets part of a sheet's page layout. */
  setPageLayout(sheet: number, patch: PreviewPageLayout): void {
    this.layouts[sheet] = { ...(this.layouts[sheet] ?? {}), ...patch };
  }

  /** Left edge of a column and top edge of a row, in points (as Office.js gives range and chart positions). */
  pointsAt(sheet: number, row: number, col: number): { top: number; left: number } {
    let left = 0;
    for (let c = 0; c < col; c += 1) left += (this.columnWidth(sheet, c) ?? DEFAULT_COLUMN_PX) * 0.75;
    return { top: row * ROW_HEIGHT_PT, left };
  }

  /** Removes a chart; fires 'charts'. */
  deleteChart(id: number): void {
    const i = this.chartList.findIndex((chart) => chart.id === id);
    if (i >= 0) this.chartList.splice(i, 1);
    this.emit('charts');
  }

  /** Removes a sheet (never the last one) with its charts, formats and styles; fires 'sheet'. Throws for the last sheet. */
  removeSheet(sheet: number): void {
    if (this.hf.countSheets() <= 1) throw new Error('a workbook keeps at least one sheet');
    this.hf.removeSheet(sheet);
    this.formats[sheet] = new Map();
    this.styles[sheet] = new Map();
    this.widths[sheet] = {};
    this.notesBySheet[sheet] = new Map();
    this.layouts[sheet] = {};
    for (let i = this.chartList.length - 1; i >= 0; i -= 1)
      if (this.chartList[i]?.sheet === sheet) this.chartList.splice(i, 1);
    if (this.active === sheet) {
      this.active = this.sheetIds()[0] ?? 0;
      this.selected = { sheet: this.active, row: 0, col: 0, rows: 1, columns: 1 };
      this.emit('selection');
    }
    this.emit('sheet');
    this.emit('charts');
  }

  /**
   * Makes the next batch of the Excel stand-in that writes fail after `fraction` of its write commands
   * (0.5: half-way), with `code` and `message`; the commands that ran stay applied, as in Excel. For tests
   * of the panel's undo (`window.liftLedgerPreview.failNextWrite`).
   */
  failNextWrite(failure: WriteFailure): void {
    this.writeFailures.push(failure);
  }

  /** The failure asked for, if any (the stand-in takes it once). */
  takeWriteFailure(): WriteFailure | undefined {
    return this.writeFailures.shift();
  }

  get activeSheet(): number {
    return this.active;
  }

  /** Makes `sheet` the active sheet with the selection it had last (A1 the first time), as Excel does. */
  activate(sheet: number): void {
    if (this.hf.getSheetName(sheet) === undefined) return;
    this.selectionBySheet.set(this.active, this.selected);
    this.active = sheet;
    this.selected = this.selectionBySheet.get(sheet) ?? { sheet, row: 0, col: 0, rows: 1, columns: 1 };
    this.emit('sheet');
    this.emit('selection');
  }

  get selection(): CellBlock {
    return this.selected;
  }

  /** Selects a block (switching sheets if needed) and fires the selection event. */
  select(block: CellBlock): void {
    if (block.sheet !== this.active) {
      this.selectionBySheet.set(this.active, this.selected);
      this.active = block.sheet;
      this.emit('sheet');
    }
    this.selected = block;
    this.emit('selection');
  }

  /** Used size of a sheet (rows × columns with content), at least 1 × 1. */
  usedSize(sheet: number): { rows: number; columns: number } {
    const { height, width } = this.hf.getSheetDimensions(sheet);
    return { rows: Math.max(1, height), columns: Math.max(1, width) };
  }

  columnWidth(sheet: number, col: number): number | undefined {
    return this.widths[sheet]?.[columnLetters(col)];
  }

  setColumnWidth(sheet: number, col: number, px: number): void {
    const widths = this.widths[sheet];
    if (widths) widths[columnLetters(col)] = px;
  }

  /**
   * The number format of a cell: its own. As in Excel, the cells of a spilled result keep their own
   * formats (they do not take the formula cell's), so a spill is formatted as a whole block.
   */
  numberFormat(sheet: number, row: number, col: number): string | undefined {
    return this.formats[sheet]?.get(`${row},${col}`);
  }

  /** Sets a cell's number format; "General" (Excel's default) removes it. */
  setNumberFormat(sheet: number, row: number, col: number, format: string): void {
    if (format === 'General') this.formats[sheet]?.delete(`${row},${col}`);
    else this.formats[sheet]?.set(`${row},${col}`, format);
  }

  style(sheet: number, row: number, col: number): CellStyle | undefined {
    return this.styles[sheet]?.get(`${row},${col}`);
  }

  /** Merges `style` into a cell's style; a fill of '' removes the fill, bold false is the default (not kept). */
  setStyle(sheet: number, row: number, col: number, style: CellStyle): void {
    const map = this.styles[sheet];
    if (!map) return;
    const merged: CellStyle = { ...map.get(`${row},${col}`), ...style };
    if (merged.fill === '') delete merged.fill;
    if (merged.bold === false) delete merged.bold;
    if (Object.keys(merged).length === 0) map.delete(`${row},${col}`);
    else map.set(`${row},${col}`, merged);
  }

  /** The formula cell whose spill covers (row, col), found by walking up and left through the spill. */
  spillAnchor(sheet: number, row: number, col: number): { row: number; col: number } | undefined {
    const isPart = (r: number, c: number) => r >= 0 && c >= 0 && this.hf.isCellPartOfArray({ sheet, row: r, col: c });
    if (!isPart(row, col) || this.hf.doesCellHaveFormula({ sheet, row, col })) return undefined;
    for (let r = row; r >= 0 && isPart(r, col); r -= 1) {
      for (let c = col; c >= 0 && isPart(r, c); c -= 1) {
        if (this.hf.doesCellHaveFormula({ sheet, row: r, col: c })) return { row: r, col: c };
      }
    }
    return undefined;
  }

  /**
   * The block a spilled result covers, given its formula cell; undefined when that cell does not spill.
   * Cost: O(spill size).
   */
  spillRange(sheet: number, row: number, col: number): CellBlock | undefined {
    const at = (r: number, c: number) => ({ sheet, row: r, col: c });
    if (!this.hf.doesCellHaveFormula(at(row, col)) || !this.hf.isCellPartOfArray(at(row, col))) return undefined;
    const child = (r: number, c: number) =>
      this.hf.isCellPartOfArray(at(r, c)) &&
      !this.hf.doesCellHaveFormula(at(r, c)) &&
      this.spillAnchorIs(sheet, r, c, row, col);
    let columns = 1;
    while (child(row, col + columns)) columns += 1;
    let rows = 1;
    while (child(row + rows, col)) rows += 1;
    return rows * columns > 1 ? { sheet, row, col, rows, columns } : undefined;
  }

  private spillAnchorIs(sheet: number, r: number, c: number, row: number, col: number): boolean {
    const anchor = this.spillAnchor(sheet, r, c);
    return anchor !== undefined && anchor.row === row && anchor.col === col;
  }

  /** What a cell shows, with its formula or typed constant. */
  cell(sheet: number, row: number, col: number): CellView {
    const address = { sheet, row, col };
    const value = this.hf.getCellValue(address);
    const serialized = this.hf.getCellSerialized(address);
    const spilled = this.hf.isCellPartOfArray(address) && !this.hf.doesCellHaveFormula(address);
    const input = serialized === null || serialized === undefined ? '' : String(serialized);
    if (value instanceof DetailedCellError) {
      // A formula that returns an error shows it in its own cell only (HyperFormula repeats it over the
      // block it reserved; Excel does not spill an error).
      if (spilled && this.repeatsAnchorError(sheet, row, col, value))
        return { text: '', kind: 'empty', value: '', input, spilled };
      const message =
        value.message || (value.type === 'NAME' && input.startsWith('=') ? this.beyondSheet(input) : undefined);
      return { text: value.value, kind: 'error', value: value.value, message, input, spilled };
    }
    if (value === null || value === undefined || value === '') {
      return { text: '', kind: value === '' ? 'text' : 'empty', value: '', input, spilled };
    }
    if (typeof value === 'number') {
      return { text: formatNumber(value, this.numberFormat(sheet, row, col)), kind: 'number', value, input, spilled };
    }
    if (typeof value === 'boolean') return { text: value ? 'TRUE' : 'FALSE', kind: 'boolean', value, input, spilled };
    return { text: String(value), kind: 'text', value: String(value), input, spilled };
  }

  /**
   * Writes what a user typed: "=…" is a formula, a number-like text a number, anything else text;
   * '' clears. Recalculates and fires 'cells'. Throws HyperFormula's error if the cell cannot be written.
   */
  enter(sheet: number, row: number, col: number, typed: string | number | boolean | null): void {
    this.write(sheet, row, col, [[typed]]);
  }

  /** Writes a block of contents at (row, col), one recalculation; fires 'cells'. */
  write(sheet: number, row: number, col: number, contents: (string | number | boolean | null)[][]): void {
    const cleaned = contents.map((line) => line.map((v) => (v === '' ? null : v)));
    if (this.batchDepth > 0 && !this.hf.isEvaluationSuspended()) this.hf.suspendEvaluation();
    this.hf.setCellContents({ sheet, row, col }, cleaned);
    if (this.batchDepth === 0) this.respill();
    this.emit('cells');
  }

  /**
   * Re-enters formulas showing #SPILL! so a spill comes back once its area is free again (as in Excel;
   * HyperFormula keeps the error until the formula is entered anew). Cost: one pass over the used cells.
   */
  private respill(): void {
    for (const sheet of this.sheetIds()) {
      const { rows, columns } = this.usedSize(sheet);
      for (let row = 0; row < rows; row += 1) {
        for (let col = 0; col < columns; col += 1) {
          const value = this.hf.getCellValue({ sheet, row, col });
          if (!(value instanceof DetailedCellError) || value.type !== 'SPILL') continue;
          const formula = this.hf.getCellFormula({ sheet, row, col });
          if (formula !== undefined) this.hf.setCellContents({ sheet, row, col }, formula);
        }
      }
    }
  }

  /** True when (row, col) is part of a spill whose formula cell shows the same error. */
  private repeatsAnchorError(sheet: number, row: number, col: number, error: DetailedCellError): boolean {
    const anchor = this.spillAnchor(sheet, row, col);
    if (anchor === undefined) return false;
    const own = this.hf.getCellValue({ sheet, row: anchor.row, col: anchor.col });
    return own instanceof DetailedCellError && own.value === error.value && own.message === error.message;
  }

  private beyondSheet(formula: string): string | undefined {
    const config = this.hf.getConfig();
    return beyondSheetMessage(formula, config.maxRows, config.maxColumns);
  }

  /** Lets listeners know that styles or formats changed without a content change. */
  touch(): void {
    this.emit('cells');
  }

  /** Charts on a sheet. */
  charts(sheet: number): PreviewChart[] {
    return this.chartList.filter((chart) => chart.sheet === sheet);
  }

  /** Adds a chart and fires 'charts'. */
  addChart(sheet: number, type: PreviewChart['type'], source: CellBlock): PreviewChart {
    const id = this.nextChartId;
    this.nextChartId += 1;
    const chart: PreviewChart = {
      id,
      sheet,
      type,
      source,
      title: '',
      axisTitles: { x: '', y: '' },
      valueLabelsHidden: false,
      name: `Chart ${id}`,
      position: {
        from: { row: source.row, col: source.col + source.columns + 1 },
        to: { row: source.row + 14, col: source.col + source.columns + 7 },
      },
    };
    this.chartList.push(chart);
    this.emit('charts');
    return chart;
  }

  /** Fires 'charts' after a chart's title, name or position changed. */
  chartsChanged(): void {
    this.emit('charts');
  }

  /** Raw values of a block (errors as their text), for charts and the Excel stand-in. */
  values(block: CellBlock): (number | string | boolean)[][] {
    const out: (number | string | boolean)[][] = [];
    for (let r = 0; r < block.rows; r += 1) {
      const line: (number | string | boolean)[] = [];
      for (let c = 0; c < block.columns; c += 1) line.push(this.cell(block.sheet, block.row + r, block.col + c).value);
      out.push(line);
    }
    return out;
  }

  /** Sheet-qualified A1 address as Excel gives it: 'Past tests'!B2:D4. */
  qualifiedAddress(block: CellBlock): string {
    return `${qualifiedSheetName(this.hf.getSheetName(block.sheet) ?? '')}!${blockAddress(block)}`;
  }
}
