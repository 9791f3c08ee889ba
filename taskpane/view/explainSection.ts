/**
 * The Explain section: when the selected cell holds an =ABTEST. formula, say in words what it computes
 * for which cells, the method, and a built-in formula that reproduces, brackets or approximates it.
 * Follows the selection while the section is open.
 */
import { explainFormula } from '../logic/explain';
import { parseAddress, rangeAddress } from '../workbook/address';
import type { PanelContext } from './context';
import { button, el } from './dom';

const KIND_WORDS = {
  reproduces: 'Built-in formula that reproduces it',
  brackets: 'Built-in formulas that bracket it',
  approximates: 'Built-in formula that approximates it',
  checks: 'Built-in formulas that check it',
  compares: 'A built-in formula to compare with',
} as const;

/** The Explain section and the function that refreshes it from the current selection. */
export interface ExplainSection {
  readonly element: HTMLElement;
  refresh(): Promise<void>;
}

/**
 * Build the Explain section. Cost: DOM construction; each refresh reads the selection once.
 * @example const explain = explainSection(context); await explain.refresh()
 */
export function explainSection(context: PanelContext): ExplainSection {
  const root = el('section', { id: 'section-explain', class: 'section', hidden: true, 'aria-labelledby': 'tab-explain' });
  const output = el('div', { id: 'explain-output', 'aria-live': 'polite' });
  const refreshButton = button('explain-refresh', 'Explain the selected cell');
  const cautionLink = el('fluent-link', { href: '#', id: 'explain-cautions' }, 'Cautions');
  cautionLink.addEventListener('click', (event) => {
    event.preventDefault();
    context.showCautions();
  });
  root.append(
    el('h2', {}, 'Explain'),
    el('p', { class: 'hint' }, 'Select a cell that holds an =ABTEST. formula (the first cell of a spilled result).'),
    el('div', { class: 'actions' }, refreshButton),
    output,
    cautionLink,
  );

  const run = { id: 0 };
  const refresh = async (): Promise<void> => {
    const myRun = (run.id += 1);
    try {
      const selection = await context.workbook.readSelection();
      if (myRun !== run.id) return;
      const cell = rangeAddress(parseAddress(selection.localAddress).start, 1, 1);
      const formula = selection.formulas[0]?.[0];
      const text = typeof formula === 'string' ? formula : String(formula ?? '');
      const explanation = explainFormula(text, cell);
      if ('problem' in explanation) {
        output.replaceChildren(el('p', { id: 'explain-problem', class: 'hint' }, `${selection.sheet}!${cell}: ${explanation.problem}.`));
        return;
      }
      const args = el('ul', { id: 'explain-arguments' });
      for (const arg of explanation.arguments) {
        if (arg.text === '' && arg.optional) continue;
        args.append(el('li', {}, el('code', {}, arg.name), ` = ${arg.text}`));
      }
      const parts: HTMLElement[] = [
        el('h3', { id: 'explain-name' }, `ABTEST.${explanation.name} in ${selection.sheet}!${cell}`),
        el('p', { id: 'explain-summary' }, explanation.summary),
        el('h4', {}, 'Arguments'),
        args,
        el('h4', {}, 'Method'),
        el('p', { id: 'explain-method' }, explanation.method),
      ];
      if (explanation.crossCheck !== null) {
        const formulas = el('ul', { id: 'explain-formulas' });
        for (const f of explanation.crossCheck.formulas) formulas.append(el('li', {}, el('code', { class: 'formula' }, f)));
        parts.push(
          el('h4', {}, KIND_WORDS[explanation.crossCheck.kind]),
          el('p', { id: 'explain-crosscheck' }, `${explanation.crossCheck.what}:`),
          formulas,
        );
      } else {
        parts.push(el('p', { id: 'explain-crosscheck', class: 'hint' }, 'No built-in Excel formula computes this; the method above is how Lift Ledger does.'));
      }
      if (explanation.caution !== null) parts.push(el('fluent-message-bar', { intent: 'warning', layout: 'multiline', id: 'explain-caution' }, explanation.caution));
      output.replaceChildren(...parts);
    } catch (error) {
      output.replaceChildren(el('p', { class: 'error-text' }, `Could not read the selection: ${(error as Error).message}`));
    }
  };
  refreshButton.addEventListener('click', () => void refresh());
  return { element: root, refresh };
}
