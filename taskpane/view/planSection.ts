/**
 * The Plan section: baseline, smallest lift worth detecting, threshold, power, variants, traffic →
 * visitors per variant, total, whole weeks to run, the classic z-test size beside it, and a decision-power
 * chart computed a point at a time with progress shown. The plan follows the fields as they are typed
 * (after a short pause); while it is being updated the old numbers are marked out of date and cannot be
 * inserted. "Insert plan" writes a labelled block of live formulas for exactly the numbers shown.
 */
import { planBlock, type PlanInputs } from '../logic/formulas';
import { formatCount, formatPercent } from '../logic/inputs';
import {
  curveSizes,
  durationCheck,
  PLAN_THRESHOLD_SOURCE,
  planNumbers,
  powerCurve,
  readPlan,
  samePlan,
  type PlanTexts,
} from '../logic/plan';
import {
  CADENCE_WORDS,
  detectableInWeeks,
  maxWeeks,
  planWithLooks,
  thresholdText,
  type LookCadence,
  type LooksPlanInputs,
} from '../logic/looksPlan';
import { parseAddress, rangeAddress } from '../workbook/address';
import { chartSlot, drawPowerChart } from './charts';
import { outcomeText, writeAsking, type PanelContext } from './context';
import { button, checkbox, el, nextFrame, select, setBusy, showMessage, textField, type Field } from './dom';

/** Pause after the last keystroke before the plan is recomputed (ms). */
export const PLAN_DEBOUNCE_MS = 350;

/**
 * Build the Plan section. Cost: DOM construction; each update (after typing stops) makes one
 * visitorsNeeded call and then about seven decisionPower calls, one per animation frame.
 * @example section.append(planSection(context))
 */
export function planSection(context: PanelContext): HTMLElement {
  const root = el('section', {
    id: 'section-plan',
    class: 'section',
    hidden: true,
    role: 'tabpanel',
    'aria-labelledby': 'tab-plan',
  });
  const fields: Record<keyof PlanTexts, Field> = {
    baselineRate: textField('plan-baseline', 'Baseline conversion rate', '4', { unit: '%' }),
    lift: textField('plan-lift', 'Smallest lift worth detecting (relative)', '10', { unit: '%' }),
    threshold: textField('plan-threshold', 'Decision threshold: P(beats control) at least', '95', { unit: '%' }),
    power: textField('plan-power', 'Target decision power', '80', {
      unit: '%',
      hint: 'How often a real lift of that size should end in a decision',
    }),
    variants: textField('plan-variants', 'Variants, control included', '2'),
    dailyVisitors: textField('plan-daily', 'Visitors per day to the page', '4000'),
    trafficShare: textField('plan-share', 'Share of those visitors in the test', '100', { unit: '%' }),
    classicAlpha: textField('plan-alpha', 'Classic test for comparison: significance level', '5', { unit: '%' }),
  };
  const liftHint = el('p', { id: 'plan-lift-example', class: 'hint field-hint' });
  fields.lift.element.insertBefore(liftHint, fields.lift.element.querySelector('.field-message'));
  const usePrior = checkbox('plan-use-prior', 'Plan with the prior from the Prior section', false);
  const cadence = select(
    'plan-cadence',
    'How often will you look at the read-out?',
    (Object.keys(CADENCE_WORDS) as LookCadence[]).map((key) => [key, CADENCE_WORDS[key]]),
    'weekly',
  );
  const weeksAvailable = textField('plan-weeks-available', 'Weeks you can run the test (for the smallest lift)', '4');
  const looksResults = el('div', { id: 'plan-looks', class: 'summary', 'aria-live': 'polite' });
  const detectable = el('div', { id: 'plan-detectable', class: 'summary', 'aria-live': 'polite' });
  const insertButton = button('plan-insert', 'Insert plan', 'primary');
  setBusy(insertButton, true);
  const results = el('div', { id: 'plan-results', class: 'summary', 'aria-live': 'polite' });
  const freshness = el('p', { id: 'plan-freshness', class: 'hint' });
  const duration = el('div', { id: 'plan-duration' });
  const note = el('div', { id: 'plan-note' });
  const progress = el('fluent-progress-bar', {
    id: 'plan-progress',
    max: '1',
    value: '0',
    hidden: true,
    'aria-label': 'Computing decision power',
  });
  const progressText = el('p', { id: 'plan-progress-text', class: 'hint' });
  const slot = chartSlot('plan-chart', 'Decision power against visitors per variant');
  const status = el('div', { id: 'plan-status' });
  const cautionLink = el('fluent-link', { href: '#', id: 'plan-cautions' }, 'Why stopping early breaks the plan');
  cautionLink.addEventListener('click', (event) => {
    event.preventDefault();
    context.showCautions('peeking');
  });
  root.append(
    el('h2', {}, 'Plan'),
    el(
      'p',
      { class: 'hint' },
      'How many visitors the test needs so that a real lift of the size you care about ends with a clear decision. ' +
        'Fields marked % take percents: type 5 for 5%.',
    ),
    ...Object.values(fields).map((field) => field.element),
    cadence.element,
    weeksAvailable.element,
    usePrior.element,
    el('h3', {}, 'The plan'),
    freshness,
    results,
    duration,
    note,
    el('div', { class: 'actions' }, insertButton),
    status,
    progress,
    progressText,
    el('div', { class: 'chart' }, slot.canvas),
    el('h3', {}, 'Looking while it runs'),
    looksResults,
    detectable,
    cautionLink,
  );

  /** The run being computed (each change starts a new one) and the inputs of the numbers on screen. */
  const run = {
    id: 0,
    shown: null as PlanInputs | null,
    timer: undefined as ReturnType<typeof setTimeout> | undefined,
  };

  const texts = (): PlanTexts => {
    const out = {} as Record<keyof PlanTexts, string>;
    for (const key of Object.keys(fields) as (keyof PlanTexts)[]) out[key] = fields[key].text();
    return out;
  };

  /** Read the fields; show each field's message; null when the plan cannot be computed. */
  const read = (): { inputs: PlanInputs | null; problems: string[] } => {
    const wantsPrior = usePrior.checked();
    const prior = wantsPrior && context.state.prior !== null ? context.state.prior : undefined;
    const reading = readPlan(texts(), context.locale, prior);
    for (const key of Object.keys(fields) as (keyof PlanTexts)[]) {
      const field = reading.fields[key];
      if (!field.ok) fields[key].say('error', field.message);
      else fields[key].say('note', field.note);
    }
    const lift = reading.fields.lift;
    const base = reading.fields.baselineRate;
    liftHint.textContent =
      lift.ok && base.ok
        ? `A lift of ${formatPercent(lift.value, context.locale)} takes the rate from ` +
          `${formatPercent(base.value, context.locale)} to ` +
          `${formatPercent(base.value * (1 + lift.value), context.locale)}.`
        : 'Relative: 10 means the rate goes from 4% to 4.4%.';
    const problems = [...reading.problems];
    if (wantsPrior && context.state.prior === null)
      problems.push('choose a prior in the Prior section first, or untick "Plan with the prior"');
    const fieldErrors = Object.values(reading.fields).filter((f) => !f.ok);
    return { inputs: fieldErrors.length === 0 && problems.length === 0 ? reading.inputs : null, problems };
  };

  /** Mark the numbers on screen as out of date and block inserting them. */
  const markStale = (why: string): void => {
    results.classList.add('stale');
    freshness.textContent = why;
    freshness.className = 'hint stale-note';
    setBusy(insertButton, true);
  };

  const compute = async (): Promise<void> => {
    const myRun = (run.id += 1);
    const { inputs, problems } = read();
    showMessage(status, 'info', null);
    if (inputs === null) {
      run.shown = null;
      results.classList.remove('stale');
      results.replaceChildren(
        el(
          'p',
          { class: 'error-text' },
          problems.length > 0 ? `Check the inputs: ${problems.join('; ')}.` : 'Check the fields marked in red above.',
        ),
      );
      freshness.textContent = '';
      showMessage(duration, 'info', null);
      showMessage(note, 'info', null);
      progress.hidden = true;
      progressText.textContent = '';
      setBusy(insertButton, true);
      return;
    }
    markStale('Updating the plan for the new inputs…');
    await nextFrame();
    if (myRun !== run.id) return;
    try {
      const numbers = planNumbers(inputs);
      if (myRun !== run.id) return;
      const locale = context.locale;
      run.shown = inputs;
      context.state.plannedPerVariant = numbers.visitorsPerVariant;
      results.classList.remove('stale');
      freshness.textContent = '';
      freshness.className = 'hint';
      const weeksWords = `${numbers.weeks} ${numbers.weeks === 1 ? 'week' : 'weeks'}`;
      results.replaceChildren(
        el('p', { id: 'plan-per-variant' }, `Visitors per variant: ${formatCount(numbers.visitorsPerVariant, locale)}`),
        el('p', { id: 'plan-total' }, `Visitors in total: ${formatCount(numbers.totalVisitors, locale)}`),
        el(
          'p',
          { id: 'plan-days' },
          `Run for ${weeksWords} (${formatCount(numbers.days, locale)} days) at ` +
            `${formatCount(numbers.testVisitorsPerDay, locale)} test visitors a day. ` +
            `The visitors alone take ${formatCount(numbers.daysOfTraffic, locale)} ` +
            `${numbers.daysOfTraffic === 1 ? 'day' : 'days'}; whole weeks give every weekday its share.`,
        ),
        el(
          'p',
          { id: 'plan-classic' },
          `Classic z-test size per variant, for comparison: ${formatCount(numbers.classicPerVariant, locale)} ` +
            `(two-sided, ${formatPercent(numbers.classicAlphaPerChallenger, locale)} ` +
            `level${inputs.variants > 2 ? ' per challenger' : ''})`,
        ),
      );
      const check = durationCheck(numbers.days, locale);
      showMessage(duration, check.level === 'unrealistic' ? 'error' : 'warning', check.text);
      showMessage(
        note,
        'warning',
        inputs.variants > 2 ? PLAN_THRESHOLD_SOURCE.explain(inputs.threshold, inputs.variants, locale) : null,
      );
      setBusy(insertButton, false);
      context.notify('plan');
      const sizes = curveSizes(numbers.visitorsPerVariant);
      progress.hidden = false;
      progress.setAttribute('value', '0');
      await powerCurve(inputs, sizes, {
        pause: nextFrame,
        cancelled: () => myRun !== run.id,
        onPoint: (points, done, total) => {
          progress.setAttribute('value', String(done / total));
          progressText.textContent = `Decision power: ${done} of ${total} points`;
          drawPowerChart(slot, points, inputs.power, numbers.visitorsPerVariant, locale);
        },
      });
      if (myRun === run.id) {
        progress.hidden = true;
        progressText.textContent =
          `Decision power of each challenger at ¼ to 2 times the planned size (exact ` +
          `binomial sums${inputs.variants > 2 ? ', at the per-challenger threshold' : ''}).`;
        await showLooks(inputs, myRun);
      }
    } catch (error) {
      if (myRun !== run.id) return;
      run.shown = null;
      results.classList.remove('stale');
      freshness.textContent = '';
      results.replaceChildren(el('p', { class: 'error-text' }, `No plan: ${(error as Error).message}`));
      showMessage(duration, 'info', null);
      progress.hidden = true;
      setBusy(insertButton, true);
    }
  };

  /** The plan with looks: the threshold for the chosen cadence, the weeks, the naive rule beside it. */
  const showLooks = async (inputs: PlanInputs, myRun: number): Promise<void> => {
    const locale = context.locale;
    const chosen = cadence.input.value as LookCadence;
    const looksInputs: LooksPlanInputs = { ...inputs, cadence: chosen };
    const pct = (x: number): string => formatPercent(x, locale);
    looksResults.replaceChildren(
      el('p', { class: 'hint' }, `Working out the threshold for looking ${CADENCE_WORDS[chosen]}…`),
    );
    detectable.replaceChildren();
    try {
      const result = await planWithLooks(looksInputs, {
        pause: nextFrame,
        cancelled: () => myRun !== run.id,
        onStep: (weeks) => {
          looksResults.replaceChildren(
            el(
              'p',
              { class: 'hint' },
              `Working out the threshold for looking ${CADENCE_WORDS[chosen]}… (tried ${weeks} weeks)`,
            ),
          );
        },
      });
      if (result === null || myRun !== run.id) return;
      const shown = result.plan ?? result.longest;
      const lookCount = shown.looks.length;
      const lookWords = chosen === 'once' ? 'one look at the end' : `${lookCount} looks, ${CADENCE_WORDS[chosen]}`;
      const lines: HTMLElement[] = [];
      lines.push(
        el(
          'p',
          { id: 'plan-looks-threshold' },
          `Looking ${CADENCE_WORDS[chosen]}: declare a challenger only when P(beats control) ≥ ${thresholdText(shown.threshold, locale)} ` +
            `at a look (THRESHOLD_FOR_LOOKS${inputs.variants > 2 ? ' after THRESHOLD_FOR_VARIANTS' : ''}).`,
        ),
      );
      lines.push(
        el(
          'p',
          { id: 'plan-looks-weeks' },
          result.plan !== null
            ? `Run for ${shown.weeks} ${shown.weeks === 1 ? 'week' : 'weeks'} (${lookWords}): a real lift of ` +
                `${pct(inputs.lift)} is then declared with a chance of ${pct(shown.power)}.`
            : `Even ${shown.weeks} weeks (${lookWords}) reach only a ${pct(shown.power)} chance of declaring a real ` +
                `lift of ${pct(inputs.lift)}: plan for a larger lift, more traffic or fewer variants.`,
        ),
      );
      lines.push(
        el(
          'p',
          { id: 'plan-looks-false-alarm' },
          `Chance of a false winner for each challenger: ${pct(result.naiveFalseAlarm)} if you declare at ` +
            `${pct(inputs.threshold)} at any of these looks, ${pct(result.honestFalseAlarm)} under the plan's ` +
            `threshold (FALSE_ALARM_WITH_LOOKS).`,
        ),
      );
      looksResults.replaceChildren(...lines);
      context.state.lookThreshold = shown.threshold;
      context.notify('looks');
      await nextFrame();
      if (myRun === run.id) showDetectable(looksInputs, myRun);
    } catch (error) {
      if (myRun !== run.id) return;
      looksResults.replaceChildren(el('p', { class: 'error-text' }, `No plan with looks: ${(error as Error).message}`));
    }
  };

  /** The other way round: what a run of the weeks available can detect. */
  const showDetectable = (inputs: LooksPlanInputs, myRun: number): void => {
    const locale = context.locale;
    const text = weeksAvailable.text().trim();
    const weeks = Number(text);
    const top = maxWeeks(inputs.cadence);
    if (!/^\d+$/.test(text) || weeks < 1 || weeks > top) {
      weeksAvailable.say(
        'error',
        `Weeks you can run: a whole number from 1 to ${top} when looking ${CADENCE_WORDS[inputs.cadence]}.`,
      );
      detectable.replaceChildren();
      return;
    }
    weeksAvailable.say('note', null);
    try {
      const found = detectableInWeeks(inputs, weeks);
      if (myRun !== run.id) return;
      const from = formatPercent(inputs.baselineRate, locale);
      detectable.replaceChildren(
        el(
          'p',
          { id: 'plan-detectable-lift' },
          found.lift === null
            ? `With this traffic for ${weeks} ${weeks === 1 ? 'week' : 'weeks'}, no lift up to a rate of 100% reaches ` +
                `a ${formatPercent(inputs.power, locale)} chance of being declared.`
            : `With this traffic for ${weeks} ${weeks === 1 ? 'week' : 'weeks'} ` +
                `(${formatCount(found.visitorsPerVariant, locale)} visitors per variant), the smallest lift you can ` +
                `expect to detect is ${formatPercent(found.lift, locale)} (from ${from} to ` +
                `${formatPercent(inputs.baselineRate * (1 + found.lift), locale)}), at P(beats control) ≥ ` +
                `${thresholdText(found.threshold, locale)} (SMALLEST_DETECTABLE_LIFT, counting the last look only).`,
        ),
      );
    } catch (error) {
      detectable.replaceChildren(el('p', { class: 'error-text' }, `No smallest lift: ${(error as Error).message}`));
    }
  };

  /** Recompute after typing pauses; until then the numbers on screen are marked out of date. */
  const schedule = (): void => {
    run.id += 1;
    if (run.shown !== null) markStale('Out of date: the inputs changed. Updating…');
    clearTimeout(run.timer);
    run.timer = setTimeout(() => void compute(), PLAN_DEBOUNCE_MS);
  };

  const insert = async (): Promise<void> => {
    const shown = run.shown;
    const current = read().inputs;
    if (shown === null || current === null || !samePlan(shown, current) || results.classList.contains('stale')) {
      showMessage(
        status,
        'warning',
        'The plan on screen is not the one for the current inputs yet. Wait until it is updated, then insert it.',
      );
      return;
    }
    setBusy(insertButton, true);
    try {
      const selection = await context.workbook.readSelection();
      const topLeft = rangeAddress(parseAddress(selection.localAddress).start, 1, 1);
      const { block } = planBlock(shown, topLeft, selection.sheet);
      const outcome = await writeAsking(context.workbook, block, status, 'the plan');
      if (outcome !== null) {
        const { intent, text } = outcomeText(outcome, 'the plan');
        showMessage(status, intent, text);
      }
    } catch (error) {
      showMessage(status, 'error', `Could not insert the plan: ${(error as Error).message}`);
    } finally {
      setBusy(insertButton, run.shown === null || results.classList.contains('stale'));
    }
  };

  for (const field of Object.values(fields)) field.input.addEventListener('input', schedule);
  usePrior.box.addEventListener('change', schedule);
  cadence.input.addEventListener('change', schedule);
  weeksAvailable.input.addEventListener('input', schedule);
  context.listen('prior', () => {
    const prior = context.state.prior;
    const used = run.shown?.prior;
    if (usePrior.checked() && (prior?.alpha !== used?.alpha || prior?.beta !== used?.beta)) schedule();
  });
  insertButton.addEventListener('click', () => void insert());
  queueMicrotask(schedule);
  return root;
}
