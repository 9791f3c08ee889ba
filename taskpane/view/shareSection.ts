/**
 * The Share section: two ways to hand a read-out to someone without the add-in.
 *
 * - A shareable copy: a new sheet right after the source in which every ABTEST result is a plain value,
 *   its formula kept in a note (or, in an Excel without notes, in a "How computed" column), number
 *   formats and charts kept, and a header line saying when and from which cells it was made. The panel
 *   first shows what the copy will hold ("Look at what will be copied"); "Make the shareable copy" then
 *   copies exactly that, all or nothing (Workbook.copySheet), and the source stays live.
 * - A summary for people who decide: from the selected variant table, a one-page sheet in plain words
 *   with its numbers as values (taskpane/logic/summary.ts), written on a new sheet set to print on one page.
 *
 * Both write only on new sheets, so no cell of the user's is ever overwritten.
 */
import {
  copyEdits,
  copyProblem,
  describeCopy,
  howComputedColumn,
  planCopy,
  HEADER_ROWS,
  type CopyPlan,
  type CopyScope,
} from '../logic/shareCopy';
import {
  failingGuardrails,
  signedPercent,
  summaryBlock,
  summaryNumbers,
  type SummaryGuardrail,
  type SummaryInput,
} from '../logic/summary';
import {
  CONVERSIONS_READOUT_TITLE,
  findGuardrailCells,
  guardrailSettings,
  type GuardrailCells,
} from '../logic/summaryGuardrails';
import { KIND_SHORT, type MetricRole } from '../logic/metrics';
import { formatCount, parseNumber, readCount, readPercent, type CountRule, type PercentRule } from '../logic/inputs';
import { variantLabel } from '../logic/resultWords';
import { checkTable, detectTable, type TableMapping } from '../logic/tableDetect';
import { columnLetters, parseAddress, quoteSheet } from '../workbook/address';
import type { CopyOutcome, CopyRequest, RangeContents, SheetScan } from '../workbook/workbook';
import { type PanelContext } from './context';
import { button, el, radioGroup, setBusy, showMessage, textField, type Intent } from './dom';

const LEVEL_RULE: PercentRule = {
  name: 'Credible level',
  min: 0.1,
  minIncluded: true,
  max: 1,
  maxIncluded: false,
  example: '95',
};
const DAYS_RULE: CountRule = {
  name: 'Days the test ran',
  min: 1,
  minIncluded: true,
  max: 3650,
  whole: true,
  example: '28',
};

/** The words for how a copy ended. */
export function copyOutcomeText(
  outcome: CopyOutcome,
  plan: CopyPlan,
  notes: boolean,
): { intent: Intent; text: string } {
  switch (outcome.kind) {
    case 'written': {
      const charts =
        outcome.chartsKept + outcome.chartsRemoved === 0
          ? ''
          : ` ${formatCount(outcome.chartsKept)} ${outcome.chartsKept === 1 ? 'chart' : 'charts'} kept` +
            `${outcome.chartsRemoved > 0 ? ` (${formatCount(outcome.chartsRemoved)} outside the copied cells left out)` : ''}.`;
      const where = notes ? 'in a note on each' : `in column ${columnLetters(howComputedColumn(plan))} (How computed)`;
      return {
        intent: 'success',
        text:
          `Made "${outcome.sheet}" (${outcome.address}): ${formatCount(plan.results)} ABTEST ` +
          `${plan.results === 1 ? 'result is a plain value' : 'results are plain values'}, the formulas ${where}.${charts} ` +
          `"${plan.sheet}" is unchanged and stays live. The copy reads the same in an Excel without Lift Ledger.`,
      };
    }
    case 'changed':
      return {
        intent: 'warning',
        text: `Nothing was copied: the formulas on "${plan.sheet}" changed since the plan was shown. Look at the new plan below, then press the button again.`,
      };
    case 'failed':
      return {
        intent: 'error',
        text: outcome.restored
          ? `Could not make the copy: ${outcome.message}.`
          : `Could not make the copy: ${outcome.message}. Please delete the sheet ${outcome.unrestored.map((s) => `"${s}"`).join(', ')} by hand.`,
      };
  }
}

/**
 * Build the Share section. Cost: DOM construction; "Look at what will be copied" scans the sheet once
 * (its formula cells, at most MAX_SCANNED_FORMULAS); "Make the shareable copy" makes one sheet copy;
 * "Use the selected table" reads the selection once; "Write the summary" computes one read-out with the
 * core (twice with a prior that is not flat) and writes one block.
 * @example root.append(shareSection(context))
 */
export function shareSection(context: PanelContext): HTMLElement {
  const root = el('section', { id: 'section-share', class: 'section', hidden: true, 'aria-labelledby': 'tab-share' });

  // ---- The shareable copy ----
  const scope = radioGroup('share-scope', 'What to copy', [
    ['sheet', 'The whole sheet of the selection', 'share-scope-sheet'],
    ['cells', 'Only the selected cells (a read-out)', 'share-scope-cells'],
  ]);
  const lookButton = button('share-look', 'Look at what will be copied', 'primary');
  const planArea = el('div', { id: 'share-plan', class: 'summary', 'aria-live': 'polite' });
  const fallbackArea = el('div', { id: 'share-fallback' });
  const copyButton = button('share-copy', 'Make the shareable copy', 'primary');
  setBusy(copyButton, true);
  const copyProgress = el('fluent-progress-bar', {
    id: 'share-progress',
    hidden: true,
    'aria-label': 'Making the copy',
  });
  const copyStatus = el('div', { id: 'share-status' });

  // ---- The summary ----
  const useButton = button('summary-use-selection', 'Use the selected table');
  const tableArea = el('div', { id: 'summary-table', class: 'summary', 'aria-live': 'polite' });
  const confirmArea = el('div', { id: 'summary-guess' });
  const title = textField('summary-title', 'What was tested', '', 'In a few words, e.g. "Checkout button colour".');
  const days = textField('summary-days', 'Days the test ran', '', 'Optional.');
  const dates = textField('summary-dates', 'When it ran', '', 'Optional, as it should read, e.g. "2 to 29 June".');
  const level = textField('summary-level', 'Credible level', '95', { unit: '%' });
  const alpha = textField('summary-alpha', 'Prior alpha', '1');
  const beta = textField('summary-beta', 'Prior beta', '1');
  const priorButton = button('summary-use-prior', 'Copy alpha and beta from the Prior section');
  const writeButton = button('summary-write', 'Write the summary', 'primary');
  setBusy(writeButton, true);
  const summaryStatus = el('div', { id: 'summary-status' });
  const cautionLink = el('fluent-link', { href: '#', id: 'share-cautions' }, 'What the summary warns about');
  cautionLink.addEventListener('click', (event) => {
    event.preventDefault();
    context.showCautions('prior');
  });

  root.append(
    el('h2', {}, 'Share'),
    el(
      'p',
      { class: 'hint' },
      'For colleagues without Lift Ledger: a copy whose results are plain values, or a one-page summary for the people who decide. Both go on a new sheet; nothing of yours is overwritten.',
    ),
    el('h3', {}, 'Shareable copy'),
    el(
      'p',
      { class: 'hint' },
      'Every ABTEST result becomes the value it shows now, with its formula kept beside it. Other formulas, number formats and charts come along. The original stays live.',
    ),
    scope,
    el('div', { class: 'actions' }, lookButton),
    planArea,
    fallbackArea,
    el('div', { class: 'actions' }, copyButton),
    copyProgress,
    copyStatus,
    el('h3', {}, 'Summary for people who decide'),
    el(
      'p',
      { class: 'hint' },
      'Select the variant table (one row per variant: name, visitors, conversions, optionally planned shares; the control first), press "Use the selected table", then say what was tested.',
    ),
    el('div', { class: 'actions' }, useButton),
    tableArea,
    confirmArea,
    title.element,
    days.element,
    dates.element,
    level.element,
    alpha.element,
    beta.element,
    el('div', { class: 'actions' }, priorButton),
    el('div', { class: 'actions' }, writeButton),
    el(
      'p',
      { class: 'hint' },
      'Writes a new sheet set to print on one page: what was tested, the decision and why, each version’s chance of being best, the plausible lift range, the guardrails of the table’s read-out, the split check and the cautions that apply — as values, so it reads the same anywhere.',
    ),
    summaryStatus,
    cautionLink,
  );

  const view = {
    /** The guardrails of the table's read-out, read at "Use the selected table", and where they were. */
    guardrails: [] as SummaryGuardrail[],
    guardrailSource: null as string | null,
    plan: null as CopyPlan | null,
    scan: null as SheetScan | null,
    scope: { kind: 'sheet' } as CopyScope,
    copying: false,
    looking: false,
    table: null as RangeContents | null,
    mapping: null as TableMapping | null,
    confirmed: false,
    writing: false,
  };

  // ---- The shareable copy ----
  const scopeValue = (): 'sheet' | 'cells' => {
    const value = (scope as HTMLElement & { value?: string }).value;
    if (value === 'cells' || value === 'sheet') return value;
    const checked = scope.querySelector('fluent-radio[checked], fluent-radio[aria-checked="true"]');
    return checked?.getAttribute('value') === 'cells' ? 'cells' : 'sheet';
  };

  const resetPlan = (why: string | null): void => {
    view.plan = null;
    view.scan = null;
    setBusy(copyButton, true);
    planArea.replaceChildren();
    showMessage(fallbackArea, 'info', null);
    if (why !== null) planArea.append(el('p', { class: 'hint' }, why));
  };

  const showPlan = (scan: SheetScan, scopeNow: CopyScope): void => {
    const plan = planCopy(scan, scopeNow);
    view.plan = plan;
    view.scan = scan;
    view.scope = scopeNow;
    const problem = copyProblem(plan);
    if (problem !== null) {
      planArea.replaceChildren(el('p', { class: 'error-text', id: 'share-problem' }, `Cannot copy: ${problem}.`));
      showMessage(fallbackArea, 'info', null);
      setBusy(copyButton, true);
      return;
    }
    const capabilities = context.workbook.capabilities();
    const { text, fallback } = describeCopy(plan, capabilities);
    planArea.replaceChildren(el('p', { id: 'share-plan-text' }, text));
    showMessage(fallbackArea, 'warning', fallback);
    setBusy(copyButton, false);
  };

  const look = async (): Promise<void> => {
    if (view.looking || view.copying) return;
    view.looking = true;
    setBusy(lookButton, true);
    showMessage(copyStatus, 'info', null);
    resetPlan('Looking at the sheet…');
    try {
      const hostProblem = context.workbook.hostProblem();
      if (hostProblem !== null) {
        resetPlan(null);
        showMessage(copyStatus, 'error', hostProblem);
        return;
      }
      let scopeNow: CopyScope = { kind: 'sheet' };
      let sheet: string;
      if (scopeValue() === 'cells') {
        let selection: RangeContents;
        try {
          selection = await context.workbook.readSelection({ maxRows: 1, maxColumns: 1 });
        } catch (error) {
          // Whole rows or columns ("E:E") are not a block of cells the panel reads.
          if (!(error instanceof RangeError)) throw error;
          resetPlan(null);
          showMessage(
            copyStatus,
            'error',
            'Select the cells of a read-out, not whole rows or columns, or choose the whole sheet.',
          );
          return;
        }
        scopeNow = { kind: 'cells', range: selection.localAddress };
        sheet = selection.sheet;
      } else {
        sheet = await context.workbook.activeSheetName();
      }
      const scan = await context.workbook.scanSheet(sheet);
      showPlan(scan, scopeNow);
    } catch (error) {
      resetPlan(null);
      showMessage(copyStatus, 'error', `Could not read the sheet: ${(error as Error).message}`);
    } finally {
      view.looking = false;
      setBusy(lookButton, false);
    }
  };

  const makeCopy = async (): Promise<void> => {
    const plan = view.plan;
    const shown = view.scan;
    if (plan === null || shown === null || view.copying || copyProblem(plan) !== null) return;
    view.copying = true;
    setBusy(copyButton, true);
    setBusy(lookButton, true);
    copyProgress.hidden = false;
    const scopeNow = view.scope;
    const notes = context.workbook.capabilities().notes;
    showMessage(
      copyStatus,
      'info',
      `Making "${plan.newSheet}" from "${plan.sheet}"… (a large sheet takes a few seconds)`,
    );
    const frozenAt = new Date();
    const request: CopyRequest = {
      source: plan.sheet,
      newSheet: plan.newSheet,
      shown,
      headerRows: HEADER_ROWS,
      problem: (scan) => copyProblem(planCopy(scan, scopeNow)),
      edits: (scan, copyFormula) => copyEdits(planCopy(scan, scopeNow), { frozenAt, notes }, copyFormula),
    };
    try {
      const outcome = await context.workbook.copySheet(request);
      const { intent, text } = copyOutcomeText(outcome, plan, notes);
      showMessage(copyStatus, intent, text);
      if (outcome.kind === 'changed') showPlan(outcome.scan, scopeNow);
      else resetPlan(outcome.kind === 'written' ? 'Press "Look at what will be copied" for another copy.' : null);
    } catch (error) {
      // copySheet never rejects; this is a last guard so the panel never stays busy.
      showMessage(copyStatus, 'error', `Could not make the copy: ${(error as Error).message}`);
      resetPlan(null);
    } finally {
      view.copying = false;
      copyProgress.hidden = true;
      setBusy(lookButton, false);
    }
  };

  scope.addEventListener('change', () => {
    if (view.plan !== null) resetPlan('What to copy changed: look again.');
  });
  context.listen('selection', () => {
    if (view.plan !== null && !view.copying && view.scope.kind === 'cells')
      resetPlan('The selection changed: look again.');
  });
  lookButton.addEventListener('click', () => void look());
  copyButton.addEventListener('click', () => void makeCopy());

  // ---- The summary ----
  const refreshWrite = (): void => {
    setBusy(writeButton, !(view.table !== null && view.mapping !== null && view.confirmed) || view.writing);
  };

  /**
   * The guardrails of a conversions read-out of this table, as "Insert read-out" wrote them: on the table's
   * sheet or on its read-out sheet ("<sheet> read-out", the panel's proposal). The first read-out with
   * guardrails is used; its limits and required probabilities are read from its cells, the guardrail
   * metrics' columns from the table's sheet (the summary recomputes the probabilities with the core).
   */
  const findGuardrails = async (
    selection: RangeContents,
    firstRow: number,
    rows: number,
  ): Promise<{ guardrails: SummaryGuardrail[]; source: string | null; problem: string | null }> => {
    const none = { guardrails: [], source: null, problem: null };
    const table = { sheet: selection.sheet, firstRow: parseAddress(selection.localAddress).start.row + firstRow, rows };
    const own = await context.workbook.scanSheet(selection.sheet);
    const readoutSheet = `${selection.sheet} read-out`;
    const scans = [own];
    for (const name of own.sheetNames) {
      if (name === readoutSheet || name.startsWith(`${readoutSheet} (`))
        scans.push(await context.workbook.scanSheet(name));
    }
    const blocks = new Map<string, GuardrailCells[]>();
    for (const scan of scans) {
      for (const cells of findGuardrailCells(scan, table)) {
        const key = `${quoteSheet(cells.sheet)}!${cells.blockTopLeft}`;
        blocks.set(key, [...(blocks.get(key) ?? []), cells]);
      }
    }
    for (const [source, cells] of blocks) {
      const first = cells[0] as GuardrailCells;
      const title = await context.workbook.readRange(first.blockTopLeft, first.sheet);
      if (title.values[0]?.[0] !== CONVERSIONS_READOUT_TITLE) continue;
      const guardrails: SummaryGuardrail[] = [];
      for (const found of [...cells].sort((a, b) => a.n - b.n)) {
        const settings = guardrailSettings(
          (await context.workbook.readRange(found.settings, found.sheet)).values,
          found.n,
          found.kind,
        );
        if (settings === null) {
          return {
            ...none,
            problem: `guardrail ${found.n} of the read-out at ${source} has no limit or required probability the panel can read`,
          };
        }
        const data: Partial<Record<MetricRole, number[]>> = {};
        for (const [role, ref] of Object.entries(found.refs) as [MetricRole, string][]) {
          const values = (await context.workbook.readRange(ref, selection.sheet)).values.map((row) => row[0]);
          if (!values.every((v): v is number => typeof v === 'number' && Number.isFinite(v))) {
            return { ...none, problem: `guardrail ${found.n}'s column ${ref} holds cells that are not numbers` };
          }
          data[role] = values;
        }
        guardrails.push({ kind: found.kind, ...settings, data });
      }
      return { guardrails, source, problem: null };
    }
    return none;
  };

  const useTable = async (): Promise<void> => {
    setBusy(useButton, true);
    showMessage(summaryStatus, 'info', null);
    showMessage(confirmArea, 'info', null);
    view.table = null;
    view.mapping = null;
    view.guardrails = [];
    view.guardrailSource = null;
    try {
      const selection = await context.workbook.readSelection();
      const detection = selection.truncated
        ? ({ ok: false, problem: 'the selection is too large; select only the variant table' } as const)
        : detectTable(selection.values);
      if (!detection.ok) {
        tableArea.replaceChildren(
          el('p', { class: 'error-text', id: 'summary-problems' }, `${selection.address}: ${detection.problem}.`),
        );
        return;
      }
      const checked = checkTable(selection.values, detection.mapping);
      if (!checked.ok) {
        tableArea.replaceChildren(
          el(
            'p',
            { class: 'error-text', id: 'summary-problems' },
            `The table has problems: ${checked.problems.join('; ')}.`,
          ),
        );
        return;
      }
      view.table = selection;
      view.mapping = detection.mapping;
      view.confirmed = detection.basis === 'headings';
      const list = el('ul', { id: 'summary-variants' });
      checked.names.forEach((name, i) =>
        list.append(
          el(
            'li',
            {},
            `${variantLabel(name, i)}: ${formatCount(checked.conversions[i] ?? NaN, context.locale)} conversions of ${formatCount(checked.visitors[i] ?? NaN, context.locale)} visitors`,
          ),
        ),
      );
      tableArea.replaceChildren(
        el(
          'p',
          {},
          `${checked.names.length} variants in ${selection.address} (${checked.shares === null ? 'equal shares planned' : 'with planned shares'}):`,
        ),
        list,
      );
      let found: Awaited<ReturnType<typeof findGuardrails>>;
      try {
        found = await findGuardrails(selection, checked.firstRow, checked.names.length);
      } catch (error) {
        found = { guardrails: [], source: null, problem: `could not look for them (${(error as Error).message})` };
      }
      view.guardrails = found.guardrails;
      view.guardrailSource = found.source;
      tableArea.append(
        el(
          'p',
          { id: 'summary-guardrails', class: found.problem === null ? '' : 'error-text' },
          found.problem !== null
            ? `Guardrails: ${found.problem}. The summary will say none were set; fix the read-out or insert it again.`
            : found.guardrails.length === 0
              ? 'No read-out of this table with guardrails was found (on this sheet or its read-out sheet): the summary will say none were set.'
              : `Guardrails from the read-out at ${found.source}: ${found.guardrails
                  .map(
                    (g) =>
                      `${KIND_SHORT[g.kind]} lift ${g.direction === 'noWorse' ? 'no worse than' : 'no higher than'} ` +
                      `${signedPercent(g.limit, context.locale)} (with at least ${Number((g.required * 100).toPrecision(4))}%)`,
                  )
                  .join('; ')}.`,
        ),
      );
      if (!view.confirmed) {
        const confirm = button('summary-confirm-mapping', 'The columns are right', 'secondary');
        confirm.addEventListener('click', () => {
          view.confirmed = true;
          showMessage(confirmArea, 'info', null);
          refreshWrite();
        });
        showMessage(
          confirmArea,
          'warning',
          `These columns were guessed from the numbers alone: ${detection.note}. Check them (the Read-out section lets you set them), then confirm.`,
          confirm,
        );
      }
      if (title.text().trim() === '') title.set(selection.sheet);
    } catch (error) {
      tableArea.replaceChildren(
        el('p', { class: 'error-text' }, `Could not read the selection: ${(error as Error).message}`),
      );
    } finally {
      setBusy(useButton, false);
      refreshWrite();
    }
  };

  const writeSummary = async (): Promise<void> => {
    const table = view.table;
    const mapping = view.mapping;
    if (table === null || mapping === null || !view.confirmed || view.writing) return;
    const checked = checkTable(table.values, mapping);
    if (!checked.ok) return;
    for (const field of [title, days, level, alpha, beta]) field.say('note', null);
    const what = title.text().trim();
    const levelReading = readPercent(level.text(), LEVEL_RULE, context.locale);
    const daysReading = days.text().trim() === '' ? null : readCount(days.text(), DAYS_RULE, context.locale);
    const a = parseNumber(alpha.text(), context.locale);
    const b = parseNumber(beta.text(), context.locale);
    const problems: string[] = [];
    if (what === '') {
      title.say('error', 'Say what was tested, in a few words.');
      problems.push('say what was tested');
    }
    if (!levelReading.ok) {
      level.say('error', levelReading.message);
      problems.push(levelReading.message);
    }
    if (daysReading !== null && !daysReading.ok) {
      days.say('error', daysReading.message);
      problems.push(daysReading.message);
    }
    if (!(a > 0) || !(b > 0)) {
      (a > 0 ? beta : alpha).say('error', 'Prior alpha and beta must be numbers above 0.');
      problems.push('prior alpha and beta must be numbers above 0');
    }
    if (problems.length > 0 || !levelReading.ok) {
      showMessage(summaryStatus, 'error', `Nothing was written: ${problems.join('; ')}.`);
      return;
    }
    view.writing = true;
    refreshWrite();
    showMessage(summaryStatus, 'info', 'Computing the summary…');
    try {
      const input: SummaryInput = {
        title: what,
        source: `${quoteSheet(table.sheet)}!${table.localAddress}`,
        days: daysReading !== null && daysReading.ok ? daysReading.value : null,
        dates: dates.text(),
        names: checked.names,
        visitors: checked.visitors,
        conversions: checked.conversions,
        shares: checked.shares,
        level: levelReading.value,
        prior: { alpha: a, beta: b },
        guardrails: view.guardrails,
        ...(view.guardrailSource === null ? {} : { guardrailSource: view.guardrailSource }),
        preparedAt: new Date(),
      };
      let numbers: ReturnType<typeof summaryNumbers>;
      try {
        numbers = summaryNumbers(input);
      } catch (error) {
        const coded = error as { code?: unknown; message?: string };
        showMessage(
          summaryStatus,
          'error',
          `Nothing was written: ${coded.message ?? String(error)}${typeof coded.code === 'string' ? ` (${coded.code})` : ''}.`,
        );
        return;
      }
      const places = await context.workbook.findPlaces({
        sheet: table.sheet,
        table: table.localAddress,
        rowCount: 1,
        columnCount: 1,
        newSheetName: `${table.sheet} summary`,
      });
      const block = summaryBlock(input, numbers, places.newSheet, context.locale);
      const outcome = await context.workbook.writeBlock(block);
      if (outcome.kind === 'written') {
        const choice = numbers.decision;
        showMessage(
          summaryStatus,
          'success',
          `Wrote the summary to ${outcome.address}, set to print on one page. ${failingGuardrails(numbers).length > 0 ? 'It says: do not switch yet, a guardrail fails' : choice.choose ? 'It recommends a version' : 'It says: no decision yet'}. Its numbers are values: press "Write the summary" again after the data change.`,
        );
      } else if (outcome.kind === 'failed') {
        showMessage(
          summaryStatus,
          'error',
          outcome.restored
            ? `Could not write the summary: ${outcome.message}. The workbook is as it was.`
            : `Could not write the summary: ${outcome.message}.`,
        );
      } else {
        showMessage(summaryStatus, 'error', `Nothing was written: ${outcome.address} is not empty.`);
      }
    } catch (error) {
      showMessage(summaryStatus, 'error', `Could not write the summary: ${(error as Error).message}`);
    } finally {
      view.writing = false;
      refreshWrite();
    }
  };

  priorButton.addEventListener('click', () => {
    const prior = context.state.prior;
    if (prior === null) {
      showMessage(summaryStatus, 'info', 'Choose a prior in the Prior section first.');
      return;
    }
    alpha.set(String(+prior.alpha.toPrecision(8)));
    beta.set(String(+prior.beta.toPrecision(8)));
  });
  useButton.addEventListener('click', () => void useTable());
  writeButton.addEventListener('click', () => void writeSummary());
  return root;
}
