/**
 * The preview's grid: sheet tabs, a formula bar, an editable cell grid with spills, errors (text in the
 * cell, message on hover and in the formula bar) and charts drawn over it. All state lives in the
 * PreviewWorkbook and in the GridView instance; nothing is module-level.
 *
 * Keyboard: arrows move (Shift extends), Enter/F2 edit, typing replaces, Enter commits and moves down,
 * Tab commits and moves right, Escape cancels, Delete clears, Ctrl+Z (⌘Z) undoes the last edits typed in
 * the grid or the formula bar (up to UNDO_DEPTH of them).
 *
 * As in a spreadsheet: text runs on over the empty, unfilled cells to its right and stops at the first
 * cell that holds something or has a fill, and a click lands on the cell under the pointer even where
 * such text runs over it; a number too wide for its column is rounded (General) or shown as "####"
 * (a fixed format), never cut; each sheet keeps its own scroll position and selection.
 */
import { renderChart } from './chartView';
import { columnLetters } from './demoWorkbook';
import {
  blockAddress,
  DEFAULT_COLUMN_PX,
  fitNumber,
  type CellBlock,
  type CellView,
  type PreviewWorkbook,
} from './previewWorkbook';

/** The page elements the grid drives (ids in preview/src/index.html). */
export interface GridElements {
  readonly tabs: HTMLElement;
  readonly nameBox: HTMLElement;
  readonly formulaInput: HTMLInputElement;
  readonly formulaMessage: HTMLElement;
  readonly scroller: HTMLElement;
}

/** Horizontal padding of a cell (5 px each side) and the width of one digit at the grid's 13 px font. */
const CELL_PADDING_PX = 10;
const CHAR_PX = 7.5;
/** Edits Ctrl+Z can take back. */
const UNDO_DEPTH = 50;

/** What a user edit replaced: the block's inputs before it (null for blank). */
interface UndoStep {
  readonly sheet: number;
  readonly row: number;
  readonly col: number;
  readonly before: (string | number | boolean | null)[][];
}

export class GridView {
  private table: HTMLTableElement = document.createElement('table');
  private chartsLayer: HTMLElement = document.createElement('div');
  private editor: HTMLInputElement | undefined;
  private editing: { row: number; col: number; fromFormulaBar: boolean } | undefined;
  private anchor: { row: number; col: number } = { row: 0, col: 0 };
  private dragging = false;
  private readonly undoSteps: UndoStep[] = [];
  /** The sheet drawn last, and each sheet's scroll position when it was left. */
  private shownSheet: number | undefined;
  private readonly scrolls = new Map<number, { left: number; top: number }>();
  private restoringSheet = false;

  constructor(
    private readonly book: PreviewWorkbook,
    private readonly el: GridElements,
  ) {
    this.table.id = 'grid';
    this.table.tabIndex = 0;
    this.chartsLayer.className = 'charts-layer';
    el.scroller.append(this.table, this.chartsLayer);
    book.on('cells', () => this.render());
    book.on('sheet', () => this.render());
    book.on('charts', () => this.renderCharts());
    book.on('selection', () => this.showSelection(!this.restoringSheet));
    this.bindEvents();
    this.render();
  }

  /** Rebuilds tabs, the table and the charts of the active sheet. */
  render(): void {
    this.renderTabs();
    const sheet = this.book.activeSheet;
    const switching = this.shownSheet !== sheet;
    if (switching && this.shownSheet !== undefined) {
      this.scrolls.set(this.shownSheet, { left: this.el.scroller.scrollLeft, top: this.el.scroller.scrollTop });
    }
    const used = this.book.usedSize(sheet);
    const charts = this.book.charts(sheet);
    const rows = Math.max(40, used.rows + 12, ...charts.map((c) => c.position.to.row + 2));
    const columns = Math.max(15, used.columns + 3, ...charts.map((c) => c.position.to.col + 2));
    const widths = Array.from({ length: columns }, (_, c) => this.book.columnWidth(sheet, c) ?? DEFAULT_COLUMN_PX);
    const colgroup = document.createElement('colgroup');
    const corner = document.createElement('col');
    corner.style.width = '44px';
    colgroup.append(corner);
    const head = document.createElement('tr');
    head.append(Object.assign(document.createElement('th'), { className: 'corner' }));
    let tableWidth = 44;
    for (let c = 0; c < columns; c += 1) {
      const col = document.createElement('col');
      const width = widths[c] as number;
      tableWidth += width;
      col.style.width = `${width}px`;
      colgroup.append(col);
      const th = document.createElement('th');
      th.textContent = columnLetters(c);
      th.className = 'col-head';
      head.append(th);
    }
    const thead = document.createElement('thead');
    thead.append(head);
    const tbody = document.createElement('tbody');
    for (let r = 0; r < rows; r += 1) {
      const tr = document.createElement('tr');
      const th = document.createElement('th');
      th.textContent = String(r + 1);
      th.className = 'row-head';
      tr.append(th);
      const views = Array.from({ length: columns }, (_, c) => this.book.cell(sheet, r, c));
      // Room for text to run on: the widths of the empty, unfilled cells that follow, right to left.
      const runOn = new Array<number>(columns + 1).fill(0);
      for (let c = columns - 1; c >= 0; c -= 1) {
        const free = views[c]?.kind === 'empty' && this.book.style(sheet, r, c)?.fill === undefined;
        runOn[c] = free ? (widths[c] as number) + (runOn[c + 1] as number) : 0;
      }
      for (let c = 0; c < columns; c += 1) {
        tr.append(this.renderCell(sheet, r, c, views[c] as CellView, widths[c] as number, runOn[c + 1] as number));
      }
      tbody.append(tr);
    }
    this.table.style.width = `${tableWidth}px`;
    this.table.replaceChildren(colgroup, thead, tbody);
    this.editor = undefined;
    this.editing = undefined;
    if (switching) {
      const scroll = this.scrolls.get(sheet) ?? { left: 0, top: 0 };
      this.el.scroller.scrollLeft = scroll.left;
      this.el.scroller.scrollTop = scroll.top;
      this.shownSheet = sheet;
    }
    this.showSelection(!switching);
    this.renderCharts();
  }

  /** One cell: `runOnPx` is the room to its right that text may run over. */
  private renderCell(
    sheet: number,
    row: number,
    col: number,
    view: CellView,
    widthPx: number,
    runOnPx: number,
  ): HTMLTableCellElement {
    const td = document.createElement('td');
    td.dataset.cell = `${columnLetters(col)}${row + 1}`;
    td.dataset.row = String(row);
    td.dataset.col = String(col);
    const classes = [`kind-${view.kind}`];
    if (view.spilled) classes.push('spilled');
    if (view.input.startsWith('=')) classes.push('formula');
    if (!view.input.startsWith('=') && !view.spilled && view.kind === 'number') classes.push('input-number');
    if (view.kind === 'error') td.title = view.message ? `${view.text} ${view.message}` : view.text;
    else if (view.kind === 'text' && view.text.length > 12) td.title = view.text;
    if (view.kind === 'number' && typeof view.value === 'number') {
      const chars = (widthPx - CELL_PADDING_PX) / CHAR_PX;
      td.textContent = fitNumber(view.value, this.book.numberFormat(sheet, row, col), chars);
      if (td.textContent !== view.text) td.title = view.text;
    } else if (view.kind === 'text' && runOnPx > 0 && !view.spilled) {
      // Text runs on over the empty cells to its right; the pointer passes through it to those cells.
      classes.push('overflow');
      const span = document.createElement('span');
      span.className = 'cell-text';
      span.style.width = `${widthPx + runOnPx - CELL_PADDING_PX}px`;
      span.textContent = view.text;
      td.append(span);
    } else {
      td.textContent = view.text;
    }
    const note = this.book.note(sheet, row, col);
    if (note !== undefined) {
      // A cell note: a red corner, and its text on hover (after what the cell shows).
      classes.push('has-note');
      td.title = td.title ? `${td.title}\n\nNote: ${note}` : `Note: ${note}`;
      td.dataset.note = note;
    }
    td.className = classes.join(' ');
    const style = this.book.style(sheet, row, col);
    if (style?.bold) td.style.fontWeight = '600';
    if (style?.color) td.style.color = style.color;
    if (style?.fill) td.style.background = style.fill;
    return td;
  }

  private renderTabs(): void {
    const buttons = this.book.sheetIds().map((id) => {
      const name = this.book.hf.getSheetName(id) ?? '';
      const button = document.createElement('button');
      button.type = 'button';
      button.className = 'tab';
      button.textContent = name;
      button.dataset.sheetName = name;
      button.setAttribute('role', 'tab');
      button.setAttribute('aria-selected', String(id === this.book.activeSheet));
      button.addEventListener('click', () => {
        // Back on a sheet, its scroll position comes back as it was; the selection is not scrolled to.
        this.restoringSheet = true;
        try {
          this.book.activate(id);
        } finally {
          this.restoringSheet = false;
        }
      });
      return button;
    });
    this.el.tabs.replaceChildren(...buttons);
  }

  private renderCharts(): void {
    const sheet = this.book.activeSheet;
    const frames = this.book.charts(sheet).map((chart) => {
      const from = this.cellElement(chart.position.from.row, chart.position.from.col);
      const to = this.cellElement(chart.position.to.row, chart.position.to.col);
      const left = from?.offsetLeft ?? 0;
      const top = from?.offsetTop ?? 0;
      const right = to ? to.offsetLeft + to.offsetWidth : left + 480;
      const bottom = to ? to.offsetTop + to.offsetHeight : top + 280;
      return renderChart(this.book, chart, {
        left,
        top,
        width: Math.max(200, right - left),
        height: Math.max(160, bottom - top),
      });
    });
    this.chartsLayer.replaceChildren(...frames);
  }

  private cellElement(row: number, col: number): HTMLTableCellElement | null {
    return this.table.querySelector<HTMLTableCellElement>(`td[data-row="${row}"][data-col="${col}"]`);
  }

  /** Marks the selected block, fills the name box and the formula bar; brings the active cell into view unless told not to. */
  private showSelection(scroll = true): void {
    const sel = this.book.selection;
    if (sel.sheet !== this.book.activeSheet) return;
    for (const td of Array.from(this.table.querySelectorAll('td.selected, td.active, td.in-spill')))
      td.classList.remove('selected', 'active', 'in-spill');
    for (let r = sel.row; r < sel.row + sel.rows; r += 1) {
      for (let c = sel.col; c < sel.col + sel.columns; c += 1) this.cellElement(r, c)?.classList.add('selected');
    }
    const active = this.cellElement(this.anchorCell().row, this.anchorCell().col);
    active?.classList.add('active');
    if (scroll) active?.scrollIntoView({ block: 'nearest', inline: 'nearest' });
    this.el.nameBox.textContent = blockAddress(sel);
    const { row, col } = this.anchorCell();
    const view = this.book.cell(sel.sheet, row, col);
    // Tint the whole spill of the selected formula (or of the spill the selected cell belongs to).
    const spillFrom = view.spilled ? this.book.spillAnchor(sel.sheet, row, col) : { row, col };
    const spill = spillFrom ? this.book.spillRange(sel.sheet, spillFrom.row, spillFrom.col) : undefined;
    if (spill) {
      for (let r = spill.row; r < spill.row + spill.rows; r += 1) {
        for (let c = spill.col; c < spill.col + spill.columns; c += 1)
          this.cellElement(r, c)?.classList.add('in-spill');
      }
    }
    // A spilled cell shows its formula greyed out and read-only, as the formula lives in the first cell.
    const source = view.spilled ? this.book.spillAnchor(sel.sheet, row, col) : undefined;
    const shown = source ? this.book.cell(sel.sheet, source.row, source.col).input : view.input;
    this.el.formulaInput.readOnly = view.spilled;
    this.el.formulaInput.classList.toggle('ghost', view.spilled);
    if (!this.editing?.fromFormulaBar) this.el.formulaInput.value = shown;
    const first = source ? `${columnLetters(source.col)}${source.row + 1}` : 'its first cell';
    this.el.formulaMessage.textContent =
      view.kind === 'error'
        ? `${view.text} ${view.message ?? ''}`.trim()
        : view.spilled
          ? `Part of a spilled result; edit the formula in ${first}.`
          : '';
    this.el.formulaMessage.classList.toggle('is-error', view.kind === 'error');
  }

  private anchorCell(): { row: number; col: number } {
    const sel = this.book.selection;
    const inside =
      this.anchor.row >= sel.row &&
      this.anchor.row < sel.row + sel.rows &&
      this.anchor.col >= sel.col &&
      this.anchor.col < sel.col + sel.columns;
    return inside ? this.anchor : { row: sel.row, col: sel.col };
  }

  private selectCell(row: number, col: number, extend = false): void {
    const r = Math.max(0, row);
    const c = Math.max(0, col);
    const sheet = this.book.activeSheet;
    if (!extend) {
      this.anchor = { row: r, col: c };
      this.book.select({ sheet, row: r, col: c, rows: 1, columns: 1 });
      return;
    }
    const a = this.anchor;
    const block: CellBlock = {
      sheet,
      row: Math.min(a.row, r),
      col: Math.min(a.col, c),
      rows: Math.abs(a.row - r) + 1,
      columns: Math.abs(a.col - c) + 1,
    };
    this.book.select(block);
  }

  /** Records a block's inputs before a user edit, for Ctrl+Z. */
  private remember(block: CellBlock): void {
    const before = Array.from({ length: block.rows }, (_, r) =>
      Array.from({ length: block.columns }, (_, c) => {
        const view = this.book.cell(block.sheet, block.row + r, block.col + c);
        if (view.spilled || view.input === '') return null;
        if (view.input.startsWith('=')) return view.input;
        return view.kind === 'number' || view.kind === 'boolean' ? view.value : view.input;
      }),
    );
    this.undoSteps.push({ sheet: block.sheet, row: block.row, col: block.col, before });
    if (this.undoSteps.length > UNDO_DEPTH) this.undoSteps.shift();
  }

  /** Puts back what the last user edit replaced, and selects it. */
  private undo(): void {
    const step = this.undoSteps.pop();
    if (step === undefined) {
      this.el.formulaMessage.textContent = 'Nothing to undo.';
      return;
    }
    const rows = step.before.length;
    const columns = step.before[0]?.length ?? 1;
    try {
      this.book.write(step.sheet, step.row, step.col, step.before);
    } catch (error) {
      this.el.formulaMessage.textContent = `Cannot undo: ${(error as Error).message}`;
      return;
    }
    if (step.sheet !== this.book.activeSheet) this.book.activate(step.sheet);
    this.anchor = { row: step.row, col: step.col };
    this.book.select({ sheet: step.sheet, row: step.row, col: step.col, rows, columns });
    this.el.formulaMessage.textContent = `Undid the last edit of ${blockAddress({ row: step.row, col: step.col, rows, columns })}.`;
    this.el.formulaMessage.classList.remove('is-error');
  }

  private startEdit(initial: string | undefined): void {
    const { row, col } = this.anchorCell();
    const td = this.cellElement(row, col);
    if (!td) return;
    const input = document.createElement('input');
    input.className = 'cell-editor';
    input.value = initial ?? this.book.cell(this.book.activeSheet, row, col).input;
    input.setAttribute('aria-label', `Edit ${columnLetters(col)}${row + 1}`);
    Object.assign(input.style, {
      left: `${td.offsetLeft}px`,
      top: `${td.offsetTop}px`,
      width: `${Math.max(td.offsetWidth, 120)}px`,
      height: `${td.offsetHeight}px`,
    });
    this.el.scroller.append(input);
    this.editor = input;
    this.editing = { row, col, fromFormulaBar: false };
    input.focus();
    input.setSelectionRange(input.value.length, input.value.length);
    input.addEventListener('input', () => {
      this.el.formulaInput.value = input.value;
    });
    input.addEventListener('keydown', (event) => this.editorKey(event, input.value));
    input.addEventListener('blur', () => {
      if (this.editor === input) this.commit(input.value, 0, 0);
    });
  }

  private editorKey(event: KeyboardEvent, value: string): void {
    if (event.key === 'Enter') {
      event.preventDefault();
      this.commit(value, event.shiftKey ? -1 : 1, 0);
    } else if (event.key === 'Tab') {
      event.preventDefault();
      this.commit(value, 0, event.shiftKey ? -1 : 1);
    } else if (event.key === 'Escape') {
      event.preventDefault();
      this.cancelEdit();
    }
  }

  private commit(value: string, down: number, right: number): void {
    const target = this.editing;
    this.removeEditor();
    if (!target) return;
    const sheet = this.book.activeSheet;
    try {
      this.remember({ sheet, row: target.row, col: target.col, rows: 1, columns: 1 });
      this.book.enter(sheet, target.row, target.col, value.trim() === '' ? null : value);
    } catch (error) {
      this.el.formulaMessage.textContent = `Cannot write here: ${(error as Error).message}`;
      this.el.formulaMessage.classList.add('is-error');
      return;
    }
    this.selectCell(target.row + down, target.col + right);
    this.table.focus({ preventScroll: true });
  }

  private cancelEdit(): void {
    this.removeEditor();
    this.showSelection();
    this.table.focus({ preventScroll: true });
  }

  private removeEditor(): void {
    const editor = this.editor;
    this.editor = undefined;
    this.editing = undefined;
    editor?.remove();
  }

  private bindEvents(): void {
    this.table.addEventListener('mousedown', (event) => {
      const td = (event.target as HTMLElement).closest('td');
      if (!td || td.dataset.row === undefined) return;
      if (this.editor) this.commit(this.editor.value, 0, 0);
      this.selectCell(Number(td.dataset.row), Number(td.dataset.col), event.shiftKey);
      this.dragging = true;
      this.table.focus({ preventScroll: true });
      event.preventDefault();
    });
    this.table.addEventListener('mouseover', (event) => {
      if (!this.dragging) return;
      const td = (event.target as HTMLElement).closest('td');
      if (td && td.dataset.row !== undefined) this.selectCell(Number(td.dataset.row), Number(td.dataset.col), true);
    });
    window.addEventListener('mouseup', () => {
      this.dragging = false;
    });
    this.table.addEventListener('dblclick', (event) => {
      if ((event.target as HTMLElement).closest('td')) this.startEdit(undefined);
    });
    this.table.addEventListener('keydown', (event) => {
      if (this.editor) return;
      const { row, col } = this.anchorCell();
      const sel = this.book.selection;
      const moves: Record<string, [number, number]> = {
        ArrowUp: [-1, 0],
        ArrowDown: [1, 0],
        ArrowLeft: [0, -1],
        ArrowRight: [0, 1],
      };
      const move = moves[event.key];
      if (move) {
        event.preventDefault();
        if (event.shiftKey) {
          const edgeRow = sel.row === this.anchor.row ? sel.row + sel.rows - 1 : sel.row;
          const edgeCol = sel.col === this.anchor.col ? sel.col + sel.columns - 1 : sel.col;
          this.selectCell(edgeRow + move[0], edgeCol + move[1], true);
        } else this.selectCell(row + move[0], col + move[1]);
      } else if (event.key === 'Enter' || event.key === 'F2') {
        event.preventDefault();
        this.startEdit(undefined);
      } else if (event.key === 'Tab') {
        event.preventDefault();
        this.selectCell(row, col + (event.shiftKey ? -1 : 1));
      } else if (event.key === 'Delete' || event.key === 'Backspace') {
        event.preventDefault();
        const blank = Array.from({ length: sel.rows }, () => Array.from({ length: sel.columns }, () => null));
        try {
          this.remember(sel);
          this.book.write(sel.sheet, sel.row, sel.col, blank);
        } catch (error) {
          this.el.formulaMessage.textContent = `Cannot clear here: ${(error as Error).message}`;
        }
      } else if ((event.ctrlKey || event.metaKey) && !event.altKey && event.key.toLowerCase() === 'z') {
        event.preventDefault();
        this.undo();
      } else if (event.key.length === 1 && !event.ctrlKey && !event.metaKey && !event.altKey) {
        event.preventDefault();
        this.startEdit(event.key);
      }
    });

    const bar = this.el.formulaInput;
    bar.addEventListener('focus', () => {
      if (bar.readOnly) return;
      const { row, col } = this.anchorCell();
      this.removeEditor();
      this.editing = { row, col, fromFormulaBar: true };
    });
    bar.addEventListener('keydown', (event) => {
      if (event.key === 'Enter') {
        event.preventDefault();
        const target = this.editing;
        this.editing = undefined;
        if (!target) return;
        try {
          this.remember({ sheet: this.book.activeSheet, row: target.row, col: target.col, rows: 1, columns: 1 });
          this.book.enter(this.book.activeSheet, target.row, target.col, bar.value.trim() === '' ? null : bar.value);
          this.selectCell(target.row + 1, target.col);
        } catch (error) {
          this.el.formulaMessage.textContent = `Cannot write here: ${(error as Error).message}`;
        }
        this.table.focus({ preventScroll: true });
      } else if (event.key === 'Escape') {
        event.preventDefault();
        this.editing = undefined;
        this.showSelection();
        this.table.focus({ preventScroll: true });
      }
    });
    bar.addEventListener('blur', () => {
      if (this.editing?.fromFormulaBar) {
        this.editing = undefined;
        this.showSelection();
      }
    });
  }
}
