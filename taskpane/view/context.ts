/**
 * What the side panel's sections share: the workbook, a small state object made per panel (not per
 * module), change notifications between sections, and the way to write a block that asks before
 * overwriting.
 */
import type { BetaPrior } from '../../functions/stats/types';
import { DEFAULT_LOCALE, type NumberLocale } from '../logic/inputs';
import type { FormulaBlock, Workbook, WriteOutcome } from '../workbook/workbook';
import { button, showMessage } from './dom';

/** State one section sets and others read. */
export interface PanelState {
  /** The prior chosen in the Prior section, once one has been computed. */
  prior: BetaPrior | null;
  /** Visitors per variant from the Plan section, once computed. */
  plannedPerVariant: number | null;
  /** The threshold the Plan section chose for the looks it planned (THRESHOLD_FOR_LOOKS), once computed. */
  lookThreshold?: number | null;
}

/** The things sections can tell each other. */
export type PanelEvent = 'prior' | 'plan' | 'selection' | 'looks';

/** Shared by every section of one panel. */
export interface PanelContext {
  readonly workbook: Workbook;
  readonly state: PanelState;
  /** How the user writes numbers (from Office's display language): fields read both decimal marks. */
  readonly locale: NumberLocale;
  /** Tell the other sections something changed. */
  notify(event: PanelEvent): void;
  /** Listen for changes. */
  listen(event: PanelEvent, listener: () => void): void;
  /** Switch to the Cautions section, optionally opening one caution. */
  showCautions(id?: string): void;
}

/**
 * A panel context with fresh state and its own listener lists. Cost O(1).
 * @example const context = createContext(workbook, (id) => tabs.open('cautions', id), localeOf('de-DE'))
 */
export function createContext(
  workbook: Workbook,
  showCautions: (id?: string) => void,
  locale: NumberLocale = DEFAULT_LOCALE,
): PanelContext {
  const listeners = new Map<PanelEvent, (() => void)[]>();
  return {
    workbook,
    locale,
    state: { prior: null, plannedPerVariant: null },
    notify(event) {
      for (const listener of listeners.get(event) ?? []) listener();
    },
    listen(event, listener) {
      listeners.set(event, [...(listeners.get(event) ?? []), listener]);
    },
    showCautions,
  };
}

/**
 * Write a block; when its area is not empty, show which cells and offer "Overwrite" or "Cancel" in
 * `status`, and write again only if the user says so, over the cells listed only (anything typed there
 * meanwhile stops the write: outcome 'occupied'). Resolves with the final outcome (null when the
 * user cancelled). Never rejects.
 * @example await writeAsking(workbook, block, statusArea, 'the plan') //=> { kind: 'written', address: 'Plan!A1:B14' }
 */
export async function writeAsking(
  workbook: Workbook,
  block: FormulaBlock,
  status: HTMLElement,
  what: string,
): Promise<WriteOutcome | null> {
  const first = await workbook.writeBlock(block);
  if (first.kind !== 'occupied') return first;
  const cells = first.occupiedCells;
  const listed = cells.slice(0, 6).join(', ') + (cells.length > 6 ? ` and ${cells.length - 6} more` : '');
  return new Promise((resolve) => {
    const overwrite = button('confirm-overwrite', 'Overwrite', 'primary');
    const cancel = button('cancel-overwrite', 'Cancel');
    let answered = false;
    overwrite.addEventListener('click', () => {
      // Once only (a double click writes once); only the cells listed, as they were when listed.
      if (answered) return;
      answered = true;
      showMessage(status, 'info', `Writing ${what}…`);
      void workbook.writeBlock({ ...block, overwrite: first.occupied }).then(resolve);
    });
    cancel.addEventListener('click', () => {
      if (answered) return;
      answered = true;
      showMessage(status, 'info', 'Nothing was written.');
      resolve(null);
    });
    showMessage(
      status,
      'warning',
      `${first.address} is not empty (${listed}). Write ${what} over it? Its current contents will be replaced.`,
      overwrite,
      cancel,
    );
  });
}

/** Text for a final write outcome. */
export function outcomeText(outcome: WriteOutcome, what: string): { intent: 'success' | 'error'; text: string } {
  switch (outcome.kind) {
    case 'written':
      return { intent: 'success', text: `Wrote ${what} to ${outcome.address}. The cells hold live formulas.` };
    case 'failed':
      return {
        intent: 'error',
        text: outcome.restored
          ? `Could not write ${what}: ${outcome.message}. The sheet is as it was.`
          : `Could not write ${what}: ${outcome.message}.`,
      };
    case 'occupied':
      return { intent: 'error', text: `Nothing was written: ${outcome.address} is not empty.` };
  }
}
