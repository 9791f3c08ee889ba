/**
 * The Prior section: a prior from a typical rate and its worth in visitors, from a plausible range, or
 * fitted to past results; its density chart, 90% range, mean and worth; a warning when it would
 * dominate; "Write to sheet" puts the live =ABTEST.PRIOR_FROM_… formula into the selected cell.
 */
import type { BetaPrior } from '../../functions/stats/types';
import { priorFromHistory, priorFromInterval, priorFromMean } from '../../functions/stats/prior';
import { priorBlock, type PriorChoice } from '../logic/formulas';
import {
  formatCount,
  formatDecimal,
  formatPercent,
  readCount,
  readPercent,
  type CountRule,
  type FieldReading,
  type PercentRule,
} from '../logic/inputs';
import { PRIOR_WEIGHT_RULE, priorDensityCurve, summarizePrior } from '../logic/priorSummary';
import { checkTable, detectTable } from '../logic/tableDetect';
import { parseAddress, rangeAddress, referenceFrom } from '../workbook/address';
import { chartSlot, drawPriorChart } from './charts';
import { outcomeText, writeAsking, type PanelContext } from './context';
import { button, el, radioGroup, setBusy, shortNumber, showMessage, textField, type Field } from './dom';

type Mode = 'mean' | 'interval' | 'history';

/** A rate field: a percent strictly between 0% and 100%. */
const RATE_RULE = (name: string): PercentRule => ({
  name,
  min: 0,
  minIncluded: false,
  max: 1,
  maxIncluded: false,
  example: '4',
});
/** The chance of the plausible range: a percent from 10% to below 100% (below 10% is a likely slip). */
const LEVEL_RULE: PercentRule = {
  name: 'Chance the rate is in that range',
  min: 0.1,
  minIncluded: true,
  max: 1,
  maxIncluded: false,
  example: '90',
};
const WORTH_RULE: CountRule = {
  name: 'Worth in visitors',
  min: 0,
  minIncluded: false,
  max: Number.POSITIVE_INFINITY,
  whole: false,
  example: '200',
};
const PLANNED_RULE: CountRule = {
  name: 'Visitors per variant you expect',
  min: 0,
  minIncluded: false,
  max: Number.POSITIVE_INFINITY,
  whole: false,
  example: '10000',
};

/** Past results picked from the sheet for PRIOR_FROM_HISTORY. */
interface History {
  readonly sheet: string;
  readonly conversionsRef: string;
  readonly visitorsRef: string;
  readonly conversions: number[];
  readonly visitors: number[];
}

/**
 * Build the Prior section. Cost: DOM construction; each update computes one prior (microseconds
 * except history fits, milliseconds).
 * @example section.append(priorSection(context))
 */
export function priorSection(context: PanelContext): HTMLElement {
  const root = el('section', {
    id: 'section-prior',
    class: 'section',
    role: 'tabpanel',
    'aria-labelledby': 'tab-prior',
  });
  const modes = radioGroup('prior-mode', 'How to choose the prior', [
    ['mean', 'From a typical rate and how many visitors that belief is worth', 'prior-mode-mean'],
    ['interval', 'From a plausible range', 'prior-mode-interval'],
    ['history', 'Fitted to past results on the sheet', 'prior-mode-history'],
  ]);
  const mean = textField('prior-mean', 'Typical conversion rate', '4', { unit: '%' });
  const strength = textField('prior-strength', 'Worth in visitors', '200', {
    hint: 'alpha + beta: how many visitors this belief counts for',
  });
  const low = textField('prior-low', 'Plausible low', '3', { unit: '%' });
  const high = textField('prior-high', 'Plausible high', '6', { unit: '%' });
  const level = textField('prior-level', 'Chance the rate is in that range', '90', { unit: '%' });
  const historyButton = button('prior-use-selection', 'Use the selected past results');
  const historyInfo = el(
    'p',
    { id: 'prior-history-info', class: 'hint' },
    'Select the past results (one row per past test or arm: conversions and visitors columns, a heading row is fine), then press the button.',
  );
  const method = radioGroup(
    'prior-method',
    'Fitting method',
    [
      ['likelihood', 'Maximum likelihood', 'prior-method-likelihood'],
      ['moments', 'Method of moments', 'prior-method-moments'],
    ],
    'horizontal',
  );
  const planned = textField('prior-planned', 'Visitors per variant you expect', '10000', {
    hint: 'Filled in from the Plan section',
  });
  const groups: Record<Mode, HTMLElement> = {
    mean: el('div', { class: 'group', id: 'prior-group-mean' }, mean.element, strength.element),
    interval: el(
      'div',
      { class: 'group', id: 'prior-group-interval', hidden: true },
      low.element,
      high.element,
      level.element,
    ),
    history: el('div', { class: 'group', id: 'prior-group-history', hidden: true }, historyInfo, historyButton, method),
  };
  const summary = el('div', { id: 'prior-summary', class: 'summary', 'aria-live': 'polite' });
  const warning = el('div', { id: 'prior-warning' });
  const slot = chartSlot('prior-chart', 'The prior belief about the conversion rate, its middle 90% and its mean');
  const writeButton = button('prior-write', 'Write to sheet', 'primary');
  const status = el('div', { id: 'prior-status' });
  const cautionLink = el('fluent-link', { href: '#', id: 'prior-cautions' }, 'How much does the prior matter?');
  cautionLink.addEventListener('click', (event) => {
    event.preventDefault();
    context.showCautions('prior');
  });

  root.append(
    el('h2', {}, 'Prior'),
    el(
      'p',
      { class: 'hint' },
      'What you believe about the conversion rate before the test, as a Beta prior. Leave it out and every read-out uses the uniform prior Beta(1, 1).',
    ),
    modes,
    groups.mean,
    groups.interval,
    groups.history,
    planned.element,
    summary,
    warning,
    el('div', { class: 'chart' }, slot.canvas),
    el('div', { class: 'actions' }, writeButton),
    el(
      'p',
      { class: 'hint' },
      'Writes a live =ABTEST.PRIOR_FROM_… formula into the selected cell; it spills alpha and beta into two cells.',
    ),
    status,
    cautionLink,
  );

  const view = { mode: 'mean' as Mode, history: null as History | null };

  const currentMode = (): Mode => {
    const value = modes.value;
    return value === 'interval' || value === 'history' ? value : 'mean';
  };

  /** Read one field, showing its message; the value, or null when it is not usable. */
  const value = (field: Field, reading: FieldReading): number | null => {
    field.say(reading.ok ? 'note' : 'error', reading.ok ? reading.note : reading.message);
    return reading.ok ? reading.value : null;
  };

  const choice = (): PriorChoice | string => {
    const locale = context.locale;
    for (const field of [mean, strength, low, high, level]) field.say('note', null);
    switch (view.mode) {
      case 'mean': {
        const m = value(mean, readPercent(mean.text(), RATE_RULE('Typical conversion rate'), locale));
        const s = value(strength, readCount(strength.text(), WORTH_RULE, locale));
        if (m === null || s === null) return 'Check the fields marked in red above.';
        return { kind: 'mean', meanRate: m, strength: s };
      }
      case 'interval': {
        const lo = value(low, readPercent(low.text(), RATE_RULE('Plausible low'), locale));
        const hi = value(high, readPercent(high.text(), RATE_RULE('Plausible high'), locale));
        const lv = value(level, readPercent(level.text(), LEVEL_RULE, locale));
        if (lo === null || hi === null || lv === null) return 'Check the fields marked in red above.';
        if (!(lo < hi))
          return `The plausible low (${formatPercent(lo, locale)}) must be below the plausible high (${formatPercent(hi, locale)}).`;
        return { kind: 'interval', low: lo, high: hi, level: lv };
      }
      case 'history': {
        if (view.history === null)
          return 'Select the past results on the sheet and press "Use the selected past results".';
        const m = method.value === 'moments' ? 'moments' : 'likelihood';
        return {
          kind: 'history',
          conversionsRef: view.history.conversionsRef,
          visitorsRef: view.history.visitorsRef,
          method: m,
        };
      }
    }
  };

  const compute = (c: PriorChoice): BetaPrior => {
    switch (c.kind) {
      case 'mean':
        return priorFromMean(c.meanRate, c.strength);
      case 'interval':
        return priorFromInterval(c.low, c.high, c.level);
      case 'history': {
        const history = view.history as History;
        return priorFromHistory(history.conversions, history.visitors, c.method);
      }
    }
  };

  const update = (): void => {
    const c = choice();
    showMessage(status, 'info', null);
    if (typeof c === 'string') {
      summary.replaceChildren(el('p', { class: 'hint' }, c));
      showMessage(warning, 'info', null);
      slot.chart?.destroy();
      slot.chart = null;
      const changed = context.state.prior !== null;
      context.state.prior = null;
      setBusy(writeButton, true);
      if (changed) context.notify('prior');
      return;
    }
    try {
      const prior = compute(c);
      const locale = context.locale;
      const plannedReading = readCount(planned.text(), PLANNED_RULE, locale);
      planned.say(
        plannedReading.ok ? 'note' : 'error',
        plannedReading.ok ? plannedReading.note : `${plannedReading.message} Using 10,000 meanwhile.`,
      );
      const s = summarizePrior(prior, plannedReading.ok ? plannedReading.value : 10000, locale);
      summary.replaceChildren(
        el('p', { id: 'prior-parameters' }, `Beta(alpha = ${shortNumber(s.alpha)}, beta = ${shortNumber(s.beta)})`),
        el(
          'p',
          { id: 'prior-facts' },
          `Mean ${formatPercent(s.mean, locale)}; 90% of the belief lies between ${formatPercent(s.low90, locale)} and ${formatPercent(s.high90, locale)}; worth about ${formatCount(s.worth, locale)} visitors.`,
        ),
      );
      if (s.warning !== null)
        showMessage(warning, s.weight === 'dominant' ? 'warning' : 'info', `${s.warning} ${PRIOR_WEIGHT_RULE}`);
      else showMessage(warning, 'info', null);
      drawPriorChart(slot, priorDensityCurve(prior), s, locale);
      const changed = context.state.prior?.alpha !== prior.alpha || context.state.prior?.beta !== prior.beta;
      context.state.prior = prior;
      setBusy(writeButton, false);
      if (changed) context.notify('prior');
    } catch (error) {
      summary.replaceChildren(el('p', { class: 'error-text' }, `No prior: ${(error as Error).message}`));
      showMessage(warning, 'info', null);
      context.state.prior = null;
      setBusy(writeButton, true);
    }
  };

  const useSelection = async (): Promise<void> => {
    setBusy(historyButton, true);
    try {
      const selection = await context.workbook.readSelection();
      const detection = detectTable(selection.values);
      if (!detection.ok) {
        historyInfo.textContent = `The selection ${selection.address} does not look like past results: ${detection.problem}.`;
        view.history = null;
      } else {
        const checked = checkTable(selection.values, detection.mapping);
        if (!checked.ok) {
          historyInfo.textContent = `The selection ${selection.address} has problems: ${checked.problems.join('; ')}.`;
          view.history = null;
        } else {
          const start = parseAddress(selection.localAddress).start;
          const rows = checked.lastRow - checked.firstRow + 1;
          const column = (c: number): string =>
            rangeAddress({ row: start.row + checked.firstRow, column: start.column + c }, rows, 1);
          view.history = {
            sheet: selection.sheet,
            conversionsRef: column(detection.mapping.conversionsColumn),
            visitorsRef: column(detection.mapping.visitorsColumn),
            conversions: checked.conversions,
            visitors: checked.visitors,
          };
          historyInfo.textContent = `${rows} past results on ${selection.sheet}: conversions in ${view.history.conversionsRef}, visitors in ${view.history.visitorsRef} (${detection.note}).`;
        }
      }
    } catch (error) {
      historyInfo.textContent = `Could not read the selection: ${(error as Error).message}`;
      view.history = null;
    } finally {
      setBusy(historyButton, false);
      update();
    }
  };

  const write = async (): Promise<void> => {
    const c = choice();
    if (typeof c === 'string') return;
    setBusy(writeButton, true);
    try {
      const selection = await context.workbook.readSelection();
      const target = parseAddress(selection.localAddress).start;
      const topLeft = rangeAddress(target, 1, 1);
      const placed: PriorChoice =
        c.kind === 'history' && view.history !== null
          ? {
              ...c,
              conversionsRef: referenceFrom(selection.sheet, view.history.sheet, view.history.conversionsRef),
              visitorsRef: referenceFrom(selection.sheet, view.history.sheet, view.history.visitorsRef),
            }
          : c;
      const outcome = await writeAsking(
        context.workbook,
        priorBlock(placed, topLeft, selection.sheet),
        status,
        'the prior',
      );
      if (outcome !== null) {
        const { intent, text } = outcomeText(outcome, 'the prior');
        showMessage(status, intent, text);
      }
    } catch (error) {
      showMessage(status, 'error', `Could not write the prior: ${(error as Error).message}`);
    } finally {
      setBusy(writeButton, false);
    }
  };

  modes.addEventListener('change', () => {
    view.mode = currentMode();
    for (const [mode, group] of Object.entries(groups)) group.hidden = mode !== view.mode;
    update();
  });
  method.addEventListener('change', update);
  for (const field of [mean, strength, low, high, level, planned]) field.input.addEventListener('input', update);
  historyButton.addEventListener('click', () => void useSelection());
  writeButton.addEventListener('click', () => void write());
  context.listen('plan', () => {
    if (context.state.plannedPerVariant !== null) {
      planned.set(formatDecimal(context.state.plannedPerVariant, context.locale));
      update();
    }
  });
  queueMicrotask(update);
  return root;
}
