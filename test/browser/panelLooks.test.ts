/**
 * Planning with looks and watching a running test (issue #14), end to end in the preview with Debian's
 * chromium: the Plan section asked to plan for daily looks shows the looks' threshold, the whole weeks, the
 * naive rule's false-alarm rate beside the plan's and the smallest lift four weeks can detect; the Day by
 * day section reads the demo's invented daily table, takes the plan's threshold, says whether the test
 * may stop today, and inserts the by-day formulas and a chart at a place it shows first. Expected numbers
 * come from the panel's logic and the statistics core called directly (held to scipy in test/stats and
 * test/taskpane). Screenshots go to test-artifacts/ (full width and with the panel at 350 px).
 */
import type { Frame, Page } from 'playwright-core';
import { probAboveControlByDay } from '../../functions/stats/byDay';
import { formatPercent } from '../../taskpane/logic/inputs';
import { detectableInWeeks, planWithLooks, thresholdText, type LooksPlanInputs } from '../../taskpane/logic/looksPlan';
import { dailyVerdict, readDailyTable } from '../../taskpane/logic/dayByDay';
import { buildDemoWorkbook } from '../../preview/src/demoWorkbook';
import {
  openPreview,
  panelFrame,
  readBlock,
  screenshot,
  selectCell,
  switchSheet,
  type OpenPreview,
} from './previewHelpers';

async function narrowScreenshot(page: Page, name: string, frame: Frame, show: string): Promise<void> {
  await page.evaluate(() => {
    const panel = document.getElementById('panel');
    if (panel) panel.style.width = '350px';
  });
  await frame.locator(show).scrollIntoViewIfNeeded();
  await screenshot(page, name);
  await page.evaluate(() => {
    const panel = document.getElementById('panel');
    if (panel) panel.style.width = '';
  });
}

/** The Plan section's default inputs (taskpane/view/planSection.ts), looked at every day. */
const DAILY: LooksPlanInputs = {
  baselineRate: 0.04,
  lift: 0.1,
  threshold: 0.95,
  power: 0.8,
  variants: 2,
  dailyVisitors: 4000,
  trafficShare: 1,
  cadence: 'daily',
};

describe('planning with looks and watching a running test', () => {
  let preview: OpenPreview;
  let page: Page;
  let panel: Frame;
  beforeAll(async () => {
    preview = await openPreview({ panel: true });
    page = preview.page;
    panel = await panelFrame(page);
    await panel.waitForSelector('#tabs');
  });
  afterAll(async () => {
    await preview?.cleanup();
  });

  it('plans for daily looks: the looks threshold, whole weeks, the naive rule beside it, the smallest lift in 4 weeks', async () => {
    const expected = (await planWithLooks(DAILY, { pause: async () => undefined, cancelled: () => false }))!;
    const plan = expected.plan!;
    await panel.locator('#tab-plan').click();
    await panel.locator('#plan-cadence').selectOption('daily');
    const threshold = thresholdText(plan.threshold);
    await panel.locator('#plan-looks-threshold', { hasText: threshold }).waitFor({ timeout: 120_000 });
    expect(await panel.locator('#plan-looks-threshold').textContent()).toBe(
      `Looking every day: declare a challenger only when P(beats control) ≥ ${threshold} at a look (THRESHOLD_FOR_LOOKS).`,
    );
    expect(await panel.locator('#plan-looks-weeks').textContent()).toBe(
      `Run for ${plan.weeks} weeks (${plan.looks.length} looks, every day): a real lift of ${formatPercent(0.1)} is then ` +
        `declared with a chance of ${formatPercent(plan.power)}.`,
    );
    expect(await panel.locator('#plan-looks-false-alarm').textContent()).toBe(
      `Chance of a false winner for each challenger: ${formatPercent(expected.naiveFalseAlarm)} if you declare at ` +
        `${formatPercent(0.95)} at any of these looks, ${formatPercent(expected.honestFalseAlarm)} under the plan's ` +
        `threshold (FALSE_ALARM_WITH_LOOKS).`,
    );
    // the naive rule looked at daily is far above the 5% it seems to promise (the peeking problem)
    expect(expected.naiveFalseAlarm).toBeGreaterThan(0.15);
    const four = detectableInWeeks(DAILY, 4);
    await panel.locator('#plan-detectable-lift').waitFor();
    expect(await panel.locator('#plan-detectable-lift').textContent()).toContain(
      `With this traffic for 4 weeks (56,000 visitors per variant), the smallest lift you can expect to detect is ` +
        `${formatPercent(four.lift!)}`,
    );
    await panel.locator('#plan-looks').scrollIntoViewIfNeeded();
    await screenshot(page, 'panel-looks-plan');
    await narrowScreenshot(page, 'panel-looks-plan-350', panel, '#plan-detectable');
  });

  it('reads the invented daily table, uses the plan’s threshold, says whether to stop, inserts formulas and a chart', async () => {
    const expected = (await planWithLooks(DAILY, { pause: async () => undefined, cancelled: () => false }))!;
    const planThreshold = expected.plan!.threshold;
    const daily = buildDemoWorkbook().find((s) => s.name === 'Daily test')!;
    const values = daily.cells.slice(3, 18).map((row) => row.slice(0, 7).map((v) => v ?? ''));
    const reading = readDailyTable(values);
    if (!reading.ok) throw new Error(reading.problems.join('; '));

    await switchSheet(page, 'Daily test');
    await selectCell(page, 'A4');
    // select A4:G18 through the preview's workbook (G is beyond the visible columns at this width)
    await page.evaluate(() => {
      const book = window.liftLedgerPreview?.workbook;
      if (!book) throw new Error('the preview is not ready');
      book.select({ sheet: book.sheetId('Daily test') as number, row: 3, col: 0, rows: 15, columns: 7 });
    });
    await panel.locator('#selection-line', { hasText: 'A4:G18' }).waitFor();
    await panel.locator('#tab-days').click();
    await panel.locator('#days-use-selection').click();
    await panel.locator('#days-summary').waitFor();
    expect(await panel.locator('#days-summary').textContent()).toBe(
      "3 variants (Control, Green banner, Tall banner; the control first), 14 days with data in 'Daily test'!A4:G18.",
    );
    // the plan's threshold for its daily looks was passed on from the Plan section
    const shown = await panel.locator('#days-threshold input').inputValue();
    expect(Math.abs(Number(shown) / 100 - planThreshold)).toBeLessThan(1e-6);
    const verdict = dailyVerdict(reading.table, Number(shown) / 100);
    await panel.locator('#days-verdict fluent-message-bar').waitFor();
    expect(await panel.locator('#days-verdict').textContent()).toBe(verdict.text);

    await panel.locator('#days-place-target fluent-message-bar').waitFor();
    await panel.locator('#days-place-group').scrollIntoViewIfNeeded();
    await screenshot(page, 'panel-looks-days-place');
    await narrowScreenshot(page, 'panel-looks-days-350', panel, '#days-insert');
    await panel.locator('#days-insert').click();
    await panel.locator('#days-status fluent-message-bar[intent="success"]').waitFor({ timeout: 60_000 });
    const status = (await panel.locator('#days-status').textContent()) ?? '';
    const where = /^Wrote the day-by-day block to 'Daily test'!([A-Z]+)(\d+):/.exec(status);
    expect(where).not.toBeNull();
    const column = where![1]!;
    const row = Number(where![2]);
    // P(beats control) by day: the core's values on the running totals, day by day
    const want = probAboveControlByDay(
      reading.table.days.map((d) => d!.visitors.map((v, i) => ({ visitors: v, conversions: d!.conversions[i]! }))),
    );
    const colIndex = column.charCodeAt(0) - 65;
    const probColumn = String.fromCharCode(65 + colIndex + 1);
    const got = await readBlock(page, 'Daily test', `${probColumn}${row + 2}`, 14, 2);
    got.forEach((r, d) =>
      r.forEach((v, j) => expect(Math.abs((v as number) - (want[d]![j] as number))).toBeLessThan(1e-12)),
    );
    expect(status).toContain('and a chart from');
    await screenshot(page, 'panel-looks-days-inserted');
  });
});
