/**
 * The Plan section: baseline, smallest lift worth detecting, threshold, power, variants, traffic →
 * visitors per variant, total, days, the classic z-test size beside it, a decision-power chart
 * computed a point at a time with progress shown, and "Insert plan" (a labelled block of live formulas).
 */
import { planBlock, type PlanInputs } from '../logic/formulas';
import { formatCount, formatPercent, parseNumber, parsePercent } from '../logic/inputs';
import { curveSizes, planNumbers, planProblems, powerCurve } from '../logic/plan';
import { parseAddress, rangeAddress } from '../workbook/address';
import { chartSlot, drawPowerChart } from './charts';
import { outcomeText, writeAsking, type PanelContext } from './context';
import { button, checkbox, el, nextFrame, setBusy, showMessage, textField } from './dom';

/**
 * Build the Plan section. Cost: DOM construction; "Compute" makes one visitorsNeeded call and then
 * about seven decisionPower calls, one per animation frame.
 * @example section.append(planSection(context))
 */
export function planSection(context: PanelContext): HTMLElement {
  const root = el('section', { id: 'section-plan', class: 'section', hidden: true, 'aria-labelledby': 'tab-plan' });
  const baseline = textField('plan-baseline', 'Baseline conversion rate (%)', '4');
  const lift = textField('plan-lift', 'Smallest lift worth detecting (relative, %)', '10', 'e.g. 10 means the rate goes from 4% to 4.4%');
  const threshold = textField('plan-threshold', 'Decision threshold: P(beats control) at least (%)', '95');
  const power = textField('plan-power', 'Target decision power (%)', '80', 'How often a real lift of that size should end in a decision');
  const variants = textField('plan-variants', 'Variants, control included', '2');
  const daily = textField('plan-daily', 'Visitors per day to the page', '4000');
  const share = textField('plan-share', 'Share of those visitors in the test (%)', '100');
  const classicAlpha = textField('plan-alpha', 'Classic test for comparison: significance level (%)', '5');
  const usePrior = checkbox('plan-use-prior', 'Plan with the prior from the Prior section', false);
  const computeButton = button('plan-compute', 'Compute plan', 'primary');
  const insertButton = button('plan-insert', 'Insert plan');
  setBusy(insertButton, true);
  const results = el('div', { id: 'plan-results', class: 'summary', 'aria-live': 'polite' });
  const progress = el('fluent-progress-bar', { id: 'plan-progress', max: '1', value: '0', hidden: true, 'aria-label': 'Computing decision power' });
  const progressText = el('p', { id: 'plan-progress-text', class: 'hint' });
  const slot = chartSlot('plan-chart', 'Decision power against visitors per variant');
  const status = el('div', { id: 'plan-status' });
  const note = el('div', { id: 'plan-note' });
  const cautionLink = el('fluent-link', { href: '#', id: 'plan-cautions' }, 'Why stopping early breaks the plan');
  cautionLink.addEventListener('click', (event) => {
    event.preventDefault();
    context.showCautions('peeking');
  });
  root.append(
    el('h2', {}, 'Plan'),
    el('p', { class: 'hint' }, 'How many visitors the test needs so that a real lift of the size you care about ends with a clear decision.'),
    baseline.element,
    lift.element,
    threshold.element,
    power.element,
    variants.element,
    daily.element,
    share.element,
    classicAlpha.element,
    usePrior.element,
    el('div', { class: 'actions' }, computeButton, insertButton),
    results,
    note,
    progress,
    progressText,
    el('div', { class: 'chart' }, slot.canvas),
    status,
    cautionLink,
  );

  const run = { id: 0, inputs: null as PlanInputs | null };

  const read = (): PlanInputs => {
    const checked = usePrior.checked();
    const prior = checked && context.state.prior !== null ? context.state.prior : undefined;
    return {
      baselineRate: parsePercent(baseline.text()),
      lift: parsePercent(lift.text()),
      threshold: parsePercent(threshold.text()),
      power: parsePercent(power.text()),
      variants: parseNumber(variants.text()),
      dailyVisitors: parseNumber(daily.text()),
      trafficShare: parsePercent(share.text()),
      classicAlpha: parsePercent(classicAlpha.text()),
      ...(prior ? { prior } : {}),
    };
  };

  const compute = async (): Promise<void> => {
    const myRun = (run.id += 1);
    const inputs = read();
    const problems = planProblems(inputs);
    if (usePrior.checked() && context.state.prior === null) problems.push('choose a prior in the Prior section first, or untick "Plan with the prior"');
    showMessage(status, 'info', null);
    if (problems.length > 0) {
      results.replaceChildren(el('p', { class: 'error-text' }, `Check the inputs: ${problems.join('; ')}.`));
      run.inputs = null;
      setBusy(insertButton, true);
      return;
    }
    setBusy(computeButton, true);
    results.replaceChildren(el('p', { class: 'hint' }, 'Working out the visitors needed…'));
    await nextFrame();
    try {
      const numbers = planNumbers(inputs);
      if (myRun !== run.id) return;
      run.inputs = inputs;
      context.state.plannedPerVariant = numbers.visitorsPerVariant;
      results.replaceChildren(
        el('p', { id: 'plan-per-variant' }, `Visitors per variant: ${formatCount(numbers.visitorsPerVariant)}`),
        el('p', { id: 'plan-total' }, `Visitors in total: ${formatCount(numbers.totalVisitors)}`),
        el('p', { id: 'plan-days' }, `Days to run: ${formatCount(numbers.days)} (at ${formatCount(inputs.dailyVisitors * inputs.trafficShare)} test visitors a day)`),
        el('p', { id: 'plan-classic' }, `Classic z-test size per variant, for comparison: ${formatCount(numbers.classicPerVariant)} (two-sided, ${formatPercent(inputs.classicAlpha)} level)`),
      );
      showMessage(
        note,
        inputs.variants > 2 ? 'warning' : 'info',
        inputs.variants > 2
          ? `With ${inputs.variants} variants, each challenger is planned against the control at this threshold; more challengers raise the chance that one wins by luck. See the cautions on many variants.`
          : null,
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
          drawPowerChart(slot, points, inputs.power);
        },
      });
      if (myRun === run.id) {
        progress.hidden = true;
        progressText.textContent = 'Decision power at ¼ to 2 times the planned size (exact binomial sums).';
      }
    } catch (error) {
      results.replaceChildren(el('p', { class: 'error-text' }, `No plan: ${(error as Error).message}`));
      progress.hidden = true;
      setBusy(insertButton, true);
    } finally {
      if (myRun === run.id) setBusy(computeButton, false);
    }
  };

  const insert = async (): Promise<void> => {
    if (run.inputs === null) return;
    setBusy(insertButton, true);
    try {
      const selection = await context.workbook.readSelection();
      const topLeft = rangeAddress(parseAddress(selection.localAddress).start, 1, 1);
      const { block } = planBlock(run.inputs, topLeft, selection.sheet);
      const outcome = await writeAsking(context.workbook, block, status, 'the plan');
      if (outcome !== null) {
        const { intent, text } = outcomeText(outcome, 'the plan');
        showMessage(status, intent, text);
      }
    } catch (error) {
      showMessage(status, 'error', `Could not insert the plan: ${(error as Error).message}`);
    } finally {
      setBusy(insertButton, false);
    }
  };

  computeButton.addEventListener('click', () => void compute());
  insertButton.addEventListener('click', () => void insert());
  return root;
}
