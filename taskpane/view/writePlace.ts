/**
 * "Where to write": the one way the panel picks a place for a block beside a table and writes it there.
 * It offers only empty places by default — the first empty columns right of the table, the first empty
 * rows below it, or a new sheet — or a cell the user selects, shows the exact target range before
 * anything is written, checks the area again at the moment of writing (asking before writing over
 * anything, listing the cells), and writes at most once per click. Any section that writes a block next
 * to a table (read-outs of other metrics, a shareable copy…) can use it.
 */
import { cellAddress, parseAddress, quoteSheet, rangeAddress } from '../workbook/address';
import type { FormulaBlock, PlaceRequest, Places, WriteOutcome } from '../workbook/workbook';
import { writeAsking, type PanelContext } from './context';
import { button, el, radioGroup, setBusy, showMessage } from './dom';

/** Where a block goes: its sheet, top-left cell, and whether that sheet is made for it. */
export interface Target {
  readonly sheet: string;
  readonly topLeft: string;
  readonly newSheet: boolean;
}

type Choice = 'right' | 'below' | 'sheet' | 'cell';

/** The place picker of one section. */
export interface WritePlace {
  readonly element: HTMLElement;
  /** Look for empty places for a block of this size beside `request.table`, and show them. */
  find(request: PlaceRequest): Promise<void>;
  /** Forget the places (no table chosen). */
  reset(): void;
  /** The chosen target, or null when there is none yet. */
  target(): Target | null;
  /**
   * Write `build(target)` at the chosen target, checked again at the moment of writing; asks in `status`
   * before writing over anything. Resolves with the final outcome and its target, or null when nothing
   * was written (cancelled, no target, or a write already running — a double click writes once).
   */
  write(
    build: (target: Target) => FormulaBlock,
    what: string,
    status: HTMLElement,
  ): Promise<{ outcome: WriteOutcome; target: Target } | null>;
}

/** "P3:Z79 (77 rows × 11 columns)" */
function describeArea(topLeft: string, rows: number, columns: number): string {
  return `${rangeAddress(parseAddress(topLeft).start, rows, columns)} (${rows} rows × ${columns} columns)`;
}

/**
 * Build a place picker; `prefix` makes its element ids unique ("readout" → "readout-place-right").
 * Cost: DOM construction; `find` makes one workbook read (findPlaces); "Use the selected cell" reads the
 * selection and the area there.
 * @example const place = writePlace(context, 'readout'); await place.find({ sheet, table, rowCount, columnCount, newSheetName })
 */
export function writePlace(context: PanelContext, prefix: string): WritePlace {
  const id = (name: string): string => `${prefix}-place-${name}`;
  const group = radioGroup(id('choice'), 'Where to write', [
    ['right', 'Right of the table, in empty columns', id('right')],
    ['below', 'Below the table, in empty rows', id('below')],
    ['sheet', 'On a new sheet', id('sheet')],
    ['cell', 'At a cell I select', id('cell')],
  ]);
  const useCell = button(id('use-selection'), 'Use the selected cell', 'secondary');
  const targetLine = el('div', { id: id('target'), 'aria-live': 'polite' });
  const element = el(
    'div',
    { id: id('group'), class: 'group', hidden: true },
    el('h3', {}, 'Where to write'),
    group,
    el('div', { class: 'actions' }, useCell),
    targetLine,
  );

  const view = {
    request: null as PlaceRequest | null,
    places: null as Places | null,
    choice: 'right' as Choice,
    cell: null as { sheet: string; topLeft: string; occupied: string[] } | null,
    writing: false,
  };

  const labelOf = (choice: Choice): HTMLElement | null => element.querySelector(`label[for="${id(choice)}"]`);

  const target = (): Target | null => {
    const { request, places } = view;
    if (request === null || places === null) return null;
    switch (view.choice) {
      case 'right':
        return places.right === null ? null : { sheet: request.sheet, topLeft: places.right, newSheet: false };
      case 'below':
        return places.below === null ? null : { sheet: request.sheet, topLeft: places.below, newSheet: false };
      case 'sheet':
        return { sheet: places.newSheet, topLeft: 'A1', newSheet: true };
      case 'cell':
        return view.cell === null ? null : { sheet: view.cell.sheet, topLeft: view.cell.topLeft, newSheet: false };
    }
  };

  const showTarget = (): void => {
    const request = view.request;
    const t = target();
    useCell.hidden = view.choice !== 'cell';
    if (request === null) {
      targetLine.replaceChildren();
      return;
    }
    if (t === null) {
      showMessage(
        targetLine,
        'info',
        view.choice === 'cell'
          ? 'Select a cell on the sheet (the top-left corner of the block), then press "Use the selected cell".'
          : 'There is no room for the block there; choose another place.',
      );
      return;
    }
    const area = describeArea(t.topLeft, request.rowCount, request.columnCount);
    const where = t.newSheet ? `a new sheet "${t.sheet}", cells ${area}` : `${quoteSheet(t.sheet)}!${area}`;
    if (view.choice === 'cell' && view.cell !== null && view.cell.occupied.length > 0) {
      const cells = view.cell.occupied;
      const listed = cells.slice(0, 6).join(', ') + (cells.length > 6 ? ` and ${cells.length - 6} more` : '');
      showMessage(
        targetLine,
        'warning',
        `It will fill ${where}. ${cells.length} of those cells hold something (${listed}): you will be asked before anything is written over.`,
      );
      return;
    }
    showMessage(
      targetLine,
      'info',
      `It will fill ${where}; ${t.newSheet ? 'nothing else is touched' : 'all those cells are empty now'}.`,
    );
  };

  const labels = (): void => {
    const { request, places } = view;
    const set = (choice: Choice, text: string): void => {
      const label = labelOf(choice);
      if (label) label.textContent = text;
    };
    if (request === null || places === null) return;
    const area = (topLeft: string | null): string =>
      topLeft === null ? 'no room' : rangeAddress(parseAddress(topLeft).start, request.rowCount, request.columnCount);
    set('right', `Right of the table, in empty columns: ${area(places.right)}`);
    set('below', `Below the table, in empty rows: ${area(places.below)}`);
    set('sheet', `On a new sheet "${places.newSheet}"`);
  };

  const choose = (choice: Choice): void => {
    view.choice = choice;
    for (const option of ['right', 'below', 'sheet', 'cell'] as const) {
      const radio = element.querySelector(`#${id(option)}`) as (HTMLElement & { checked?: boolean }) | null;
      if (radio === null) continue;
      radio.toggleAttribute('checked', option === choice);
      if (radio.checked !== (option === choice)) radio.checked = option === choice;
    }
    showTarget();
  };
  group.addEventListener('change', () => {
    const value = (group as HTMLElement & { value?: string }).value;
    if (value === 'right' || value === 'below' || value === 'sheet' || value === 'cell') choose(value);
  });
  for (const choice of ['right', 'below', 'sheet', 'cell'] as const) {
    element.querySelector(`#${id(choice)}`)?.addEventListener('click', () => choose(choice));
    labelOf(choice)?.addEventListener('click', () => choose(choice));
  }

  useCell.addEventListener('click', () => {
    void (async () => {
      const request = view.request;
      if (request === null) return;
      setBusy(useCell, true);
      try {
        const selection = await context.workbook.readSelection({ maxRows: 1, maxColumns: 1 });
        const topLeft = cellAddress(parseAddress(selection.localAddress).start);
        const area = rangeAddress(parseAddress(topLeft).start, request.rowCount, request.columnCount);
        const there = await context.workbook.readRange(area, selection.sheet);
        const occupied: string[] = [];
        const start = parseAddress(topLeft).start;
        there.formulas.forEach((row, r) =>
          row.forEach((f, c) => {
            if (f !== '' || there.values[r]?.[c] !== '')
              occupied.push(cellAddress({ row: start.row + r, column: start.column + c }));
          }),
        );
        view.cell = { sheet: selection.sheet, topLeft, occupied };
        choose('cell');
      } catch (error) {
        showMessage(targetLine, 'error', `Could not read the selected cell: ${(error as Error).message}`);
      } finally {
        setBusy(useCell, false);
      }
    })();
  });

  return {
    element,
    target,
    reset(): void {
      view.request = null;
      view.places = null;
      view.cell = null;
      element.hidden = true;
      targetLine.replaceChildren();
    },
    async find(request: PlaceRequest): Promise<void> {
      view.request = request;
      view.places = null;
      element.hidden = false;
      const problem = context.workbook.hostProblem();
      if (problem !== null) {
        showMessage(targetLine, 'error', `Nothing can be written: ${problem}.`);
        return;
      }
      showMessage(targetLine, 'info', 'Looking for empty cells…');
      try {
        view.places = await context.workbook.findPlaces(request);
      } catch (error) {
        showMessage(targetLine, 'error', `Could not look for empty cells: ${(error as Error).message}`);
        return;
      }
      labels();
      choose(
        view.places.right === null && view.choice === 'right'
          ? view.places.below === null
            ? 'sheet'
            : 'below'
          : view.choice,
      );
    },
    async write(build, what, status) {
      const t = target();
      if (t === null || view.writing) return null;
      view.writing = true;
      try {
        const block = build(t);
        showMessage(status, 'info', `Writing ${what}…`);
        const outcome = await writeAsking(context.workbook, block, status, what);
        if (outcome === null) return null;
        if (outcome.kind === 'written' && view.choice === 'cell' && view.cell !== null)
          view.cell = { ...view.cell, occupied: [] };
        return { outcome, target: t };
      } finally {
        view.writing = false;
      }
    },
  };
}
