/**
 * The Daily section ("Daily" tab), for a test that is running: select a table of daily counts (a header row, the
 * day, one visitors column per variant, then one conversions column per variant, the control first), and
 * the section says in words whether the test may stop today under its plan — P(beats control) on the
 * running totals against the threshold the Plan section chose for its looks, after the daily split check.
 * "Insert day by day" writes, at a place shown first ("Where to write", writePlace.ts: empty places only
 * by default, checked again when writing, undone if the write fails), a block of live formulas
 * (PROB_ABOVE_CONTROL_BY_DAY, SRM_PVALUE_BY_DAY, the threshold, the verdict) and a native line chart of
 * P(beats control) by day with the threshold line and the split check.
 */
import { dailyArea, dailyBlock, dailyVerdict, readDailyTable, type DailyTable } from '../logic/dayByDay';
import { formatCount, readPercent } from '../logic/inputs';
import type { RangeContents } from '../workbook/workbook';
import { outcomeText, type PanelContext } from './context';
import { button, el, setBusy, showMessage, textField } from './dom';
import { writePlace } from './writePlace';

/**
 * Build the Daily section. Cost: DOM construction; "Use the selected table" reads the selection once
 * and runs the by-day functions once over it.
 * @example section.append(daySection(context))
 */
export function daySection(context: PanelContext): HTMLElement {
  const root = el('section', { id: 'section-days', class: 'section', hidden: true });
  const useButton = button('days-use-selection', 'Use the selected table', 'primary');
  const threshold = textField('days-threshold', "The plan's threshold: P(beats control) at each look", '95', {
    unit: '%',
    hint: 'The Plan section fills this in with the threshold for the looks you planned.',
  });
  const tableInfo = el('div', { id: 'days-table', 'aria-live': 'polite' });
  const verdictArea = el('div', { id: 'days-verdict', 'aria-live': 'polite' });
  const insertButton = button('days-insert', 'Insert day by day', 'primary');
  setBusy(insertButton, true);
  const status = el('div', { id: 'days-status' });
  const place = writePlace(context, 'days');
  const cautionLink = el(
    'fluent-link',
    { href: '#', id: 'days-cautions' },
    'Why looking every day needs its own threshold',
  );
  cautionLink.addEventListener('click', (event) => {
    event.preventDefault();
    context.showCautions('peeking');
  });
  root.append(
    el('h2', {}, 'Daily: a running test'),
    el(
      'p',
      { class: 'hint' },
      'For a running test. Select its table of daily counts: a header row, then one row per day — the day, one ' +
        'visitors column per variant (the control first), then one conversions column per variant in the same ' +
        'order. Counts of that day, not running totals; a blank row is a day without data.',
    ),
    el('div', { class: 'actions' }, useButton),
    tableInfo,
    threshold.element,
    verdictArea,
    place.element,
    el('div', { class: 'actions' }, insertButton),
    el(
      'p',
      { class: 'hint' },
      'Writes P(beats control) by day, the plan’s threshold and the daily split check as live formulas, whether ' +
        'the test may stop today, and a native chart of them by day.',
    ),
    status,
    cautionLink,
  );

  const view = {
    selection: null as RangeContents | null,
    table: null as DailyTable | null,
    busy: false,
  };

  const readThreshold = (): number | null => {
    const reading = readPercent(
      threshold.text(),
      { name: "The plan's threshold", min: 0.5, minIncluded: false, max: 1, maxIncluded: false, example: '99' },
      context.locale,
    );
    if (!reading.ok) {
      threshold.say('error', reading.message);
      return null;
    }
    threshold.say('note', reading.note);
    return reading.value;
  };

  const render = (): void => {
    const table = view.table;
    const selection = view.selection;
    if (table === null || selection === null) return;
    const t = readThreshold();
    if (t === null) {
      showMessage(verdictArea, 'info', null);
      setBusy(insertButton, true);
      return;
    }
    try {
      const verdict = dailyVerdict(table, t, context.locale);
      showMessage(verdictArea, verdict.splitBroken ? 'error' : verdict.mayStop ? 'success' : 'info', verdict.text);
      setBusy(insertButton, false);
    } catch (error) {
      showMessage(verdictArea, 'error', `Cannot read the test: ${(error as Error).message}`);
      setBusy(insertButton, true);
    }
  };

  const useSelection = async (): Promise<void> => {
    setBusy(useButton, true);
    showMessage(status, 'info', null);
    try {
      const selection = await context.workbook.readSelection();
      const reading = readDailyTable(selection.values);
      if (!reading.ok) {
        view.table = null;
        view.selection = null;
        tableInfo.replaceChildren(
          el(
            'p',
            { class: 'error-text', id: 'days-problems' },
            `The table has problems: ${reading.problems.join('; ')}.`,
          ),
        );
        showMessage(verdictArea, 'info', null);
        place.reset();
        setBusy(insertButton, true);
        return;
      }
      view.selection = selection;
      view.table = reading.table;
      const withData = reading.table.days.filter((d) => d !== null).length;
      tableInfo.replaceChildren(
        el(
          'p',
          { id: 'days-summary' },
          `${reading.table.names.length} variants (${reading.table.names.join(', ')}; the control first), ` +
            `${formatCount(withData, context.locale)} days with data in ${selection.address}.`,
        ),
      );
      const area = dailyArea(reading.table.days.length, reading.table.names.length);
      await place.find({
        sheet: selection.sheet,
        table: selection.localAddress,
        rowCount: area.rowCount,
        columnCount: area.columnCount,
        newSheetName: `${selection.sheet} by day`,
      });
      render();
    } catch (error) {
      showMessage(status, 'error', `Could not read the selection: ${(error as Error).message}`);
    } finally {
      setBusy(useButton, false);
    }
  };

  const insert = async (): Promise<void> => {
    const selection = view.selection;
    const table = view.table;
    const t = readThreshold();
    if (view.busy || selection === null || table === null || t === null) return;
    view.busy = true;
    setBusy(insertButton, true);
    try {
      const build = (target: { sheet: string; topLeft: string }) =>
        dailyBlock(
          { sheet: selection.sheet, tableAddress: selection.localAddress, names: table.names },
          t,
          target.topLeft,
          target.sheet,
        );
      const written = await place.write(
        (target) => ({ ...build(target).block, newSheet: target.newSheet }),
        'the day-by-day block',
        status,
      );
      if (written === null) return;
      const { outcome, target } = written;
      if (outcome.kind !== 'written') {
        const { intent, text } = outcomeText(outcome, 'the day-by-day block');
        showMessage(status, intent, text);
        return;
      }
      const built = build(target);
      const chart = await context.workbook.insertChart({
        sheet: target.sheet,
        sourceAddress: built.chartSource,
        type: 'Line',
        title: 'P(beats control) by day, the plan’s threshold and the split check',
        topLeft: built.chartTopLeft,
        bottomRight: built.chartBottomRight,
      });
      showMessage(
        status,
        chart.kind === 'inserted' ? 'success' : 'warning',
        chart.kind === 'inserted'
          ? `Wrote the day-by-day block to ${outcome.address} (live formulas) and a chart from ${built.chartSource}. ` +
              `Whether the test may stop today is in ${built.cells.verdict}.`
          : `Wrote the day-by-day block to ${outcome.address}, but ${chart.message}. The table in ` +
              `${built.chartSource} can be charted by hand.`,
      );
      const area = dailyArea(table.days.length, table.names.length);
      await place.find({
        sheet: selection.sheet,
        table: selection.localAddress,
        rowCount: area.rowCount,
        columnCount: area.columnCount,
        newSheetName: `${selection.sheet} by day`,
      });
    } catch (error) {
      showMessage(status, 'error', `Could not insert the day-by-day block: ${(error as Error).message}`);
    } finally {
      view.busy = false;
      setBusy(insertButton, view.table === null);
    }
  };

  useButton.addEventListener('click', () => void useSelection());
  insertButton.addEventListener('click', () => void insert());
  threshold.input.addEventListener('input', render);
  context.listen('looks', () => {
    const planned = context.state.lookThreshold;
    if (planned !== null && planned !== undefined) {
      threshold.set(String(Number((planned * 100).toFixed(4))));
      render();
    }
  });
  return root;
}
