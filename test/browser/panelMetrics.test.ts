/**
 * The read-out for every metric kind, each with a guardrail, in the preview (Debian's chromium through
 * playwright-core): revenue per visitor from totals, averages, counts per exposure and conversions, from
 * the demo workbook's invented tables. The panel proposes the kind from the headings (or the user picks
 * it), adds a guardrail, inserts the block; its cells are live formulas whose values equal the statistics
 * core's (functions/stats/… called here directly, itself checked against scipy in test/stats), and the
 * decision with guardrails follows the expected-loss rule and the guardrail's probability.
 * Screenshots at the usual width and at 350 px go to test-artifacts/.
 */
import type { Frame, Page } from 'playwright-core';
import { probAboveControl, probLiftAbove } from '../../functions/stats/conversion';
import {
  eventsExpectedLoss,
  eventsLiftInterval,
  eventsProbAboveControl,
  eventsProbLiftAbove,
} from '../../functions/stats/eventRates';
import {
  meanExpectedLoss,
  meanLiftInterval,
  meanProbAboveControl,
  meanProbLiftAbove,
} from '../../functions/stats/normalMeans';
import {
  revenueExpectedLoss,
  revenueLiftInterval,
  revenueProbAboveControl,
} from '../../functions/stats/revenuePerVisitor';
import { srmPValue } from '../../functions/stats/srm';
import { UNIFORM_PRIOR, type IntervalWithMedian } from '../../functions/stats/types';
import { chartSeries } from '../../preview/src/chartView';
import { readoutBlock } from '../../taskpane/logic/formulas';
import type { Guardrail } from '../../taskpane/logic/guardrails';
import { metricReadoutBlock, type MetricChart } from '../../taskpane/logic/metricFormulas';
import { cellAddress, parseAddress } from '../../taskpane/workbook/address';
import {
  cellLocator,
  enterCell,
  openPreview,
  panelFrame,
  readCell,
  readBlock,
  screenshot,
  selectCell,
  switchSheet,
  type OpenPreview,
} from './previewHelpers';

type Cell = number | string | boolean;
const SHEET = 'Checkout test';

/** Selects `from` and extends the selection by the keyboard (Shift+arrows), as far columns may be off screen. */
async function selectRange(page: Page, from: string, to: string): Promise<void> {
  await selectCell(page, from);
  const a = parseAddress(from).start;
  const b = parseAddress(to).start;
  for (let c = a.column; c < b.column; c += 1) await page.keyboard.press('Shift+ArrowRight');
  for (let r = a.row; r < b.row; r += 1) await page.keyboard.press('Shift+ArrowDown');
}

function expectClose(actual: Cell | undefined, expected: number, where: string, tol = 1e-12): void {
  if (typeof actual !== 'number')
    throw new Error(`${where}: expected a number near ${expected}, got ${JSON.stringify(actual)}`);
  const allowed = tol * Math.max(1, Math.abs(expected));
  if (!(Math.abs(actual - expected) <= allowed))
    throw new Error(`${where}: ${actual} is not ${expected} (±${allowed})`);
}

function below(address: string, rows: number): string {
  const p = parseAddress(address).start;
  let letters = '';
  for (let n = p.column + 1; n > 0; n = Math.floor((n - 1) / 26))
    letters = String.fromCharCode(65 + ((n - 1) % 26)) + letters;
  return `${letters}${p.row + rows + 1}`;
}

/** The formula text of a cell. */
async function cellInput(page: Page, sheet: string, address: string): Promise<string> {
  const p = parseAddress(address).start;
  return page.evaluate(
    ([s, row, col]) => {
      const handle = window.liftLedgerPreview;
      if (!handle) throw new Error('the preview is not ready');
      const id = handle.workbook.sheetId(s as string) as number;
      return String(handle.workbook.cell(id, row as number, col as number).input);
    },
    [sheet, p.row, p.column] as const,
  );
}

/** Numbers of one column of the table (k rows from `address`). */
async function column(page: Page, address: string, k: number): Promise<number[]> {
  return (await readBlock(page, SHEET, address, k, 1)).map((row) => row[0] as number);
}

/** Presses "Use the selected table" and waits for the variant list. */
async function useTable(page: Page, panel: Frame, from: string, to: string): Promise<void> {
  await switchSheet(page, SHEET);
  await selectRange(page, from, to);
  await panel.locator('#tab-readout').click();
  await panel.locator('#readout-use-selection').click();
  await panel.locator('#readout-metric').waitFor();
}

/** Adds a guardrail and sets its metric, limit (percent text) and required probability. */
async function addGuardrail(panel: Frame, kind: string, limit: string): Promise<void> {
  await panel.locator('#readout-add-guardrail').click();
  await panel.locator('#readout-guardrail-1-kind').selectOption(kind);
  await panel.locator('#readout-guardrail-1-limit input').fill(limit);
  await panel.locator('#readout-guardrail-1-required input').fill('95');
}

/** Inserts the read-out and returns where it went (sheet and top-left cell), from the status message. */
async function insert(panel: Frame, expected: RegExp): Promise<{ sheet: string; topLeft: string; text: string }> {
  await panel.locator('#readout-variants').waitFor();
  await panel.locator('#readout-place-target fluent-message-bar').waitFor({ timeout: 60_000 });
  await panel.locator('#readout-insert:not([disabled])').waitFor();
  await panel.locator('#readout-insert').click();
  await panel.locator('#readout-status fluent-message-bar:not([intent="info"])').waitFor({ timeout: 120_000 });
  const text = (await panel.locator('#readout-status').textContent()) ?? '';
  expect(text).toMatch(expected);
  const m = /to (?:'([^']+)'|([^!\s]+))!([A-Z]+\d+):/.exec(text);
  if (m === null) throw new Error(`no address in "${text}"`);
  return { sheet: m[1] ?? (m[2] as string), topLeft: m[3] as string, text };
}

/** Screenshot at the usual width, then at 350 px with the guardrails in view. */
async function screenshots(page: Page, panel: Frame, name: string): Promise<void> {
  await screenshot(page, name);
  await page.evaluate(() => {
    const element = document.getElementById('panel');
    if (element) element.style.width = '350px';
  });
  await panel.locator('#readout-guardrails').scrollIntoViewIfNeeded();
  await screenshot(page, `${name}-350`);
  const overflow = await panel.evaluate(
    () => document.documentElement.scrollWidth - document.documentElement.clientWidth,
  );
  expect(overflow).toBeLessThanOrEqual(0);
  await page.evaluate(() => {
    const element = document.getElementById('panel');
    if (element) element.style.width = '';
  });
}

/** Scrolls the grid so that `address` (a chart's top-left cell) is near its top-left corner: the chart shows whole. */
async function showFromTop(page: Page, sheet: string, address: string): Promise<void> {
  await switchSheet(page, sheet);
  // One row and one column before it: the sticky headings would cover the chart's first pixels.
  const corner = parseAddress(address).start;
  const before = cellAddress({ row: Math.max(0, corner.row - 1), column: Math.max(0, corner.column - 1) });
  await cellLocator(page, before).evaluate((cell) => cell.scrollIntoView({ block: 'start', inline: 'start' }));
}

/**
 * The native chart the block placed: an XY chart with markers over the block's lift-interval table, with
 * its title and axis titles; its series (read from the live cells as the preview draws them) are each
 * challenger's lift interval from the core (low, median, high) at its own height, and the "No change" line
 * at 0%. Then screenshots with the chart in view, at the usual width and at 350 px.
 */
async function expectLiftChart(
  page: Page,
  panel: Frame,
  where: { sheet: string },
  chart: MetricChart,
  lifts: readonly IntervalWithMedian[],
  shot: string,
): Promise<void> {
  const source = parseAddress(chart.source);
  const found = await page.evaluate(
    ([s, row, col]) => {
      const handle = window.liftLedgerPreview;
      if (!handle) throw new Error('the preview is not ready');
      const id = handle.workbook.sheetId(s as string) as number;
      const c = handle.workbook.charts(id).find((x) => x.source.row === row && x.source.col === col);
      return c === undefined
        ? null
        : {
            type: c.type,
            title: c.title,
            axisTitles: c.axisTitles,
            valueLabelsHidden: c.valueLabelsHidden,
            values: handle.workbook.values(c.source),
          };
    },
    [where.sheet, source.start.row, source.start.column] as const,
  );
  if (found === null) throw new Error(`no chart over ${chart.source}`);
  expect({
    type: found.type,
    title: found.title,
    axisTitles: found.axisTitles,
    valueLabelsHidden: found.valueLabelsHidden,
  }).toEqual({
    type: 'XYScatterLines',
    title: chart.title,
    axisTitles: chart.axisTitles,
    // The heights only place each challenger's line: the vertical axis carries no numbers.
    valueLabelsHidden: true,
  });
  const k = lifts.length + 1;
  const { points } = chartSeries(found.values);
  lifts.forEach((lift, i) => {
    const line = points[i] as [number, number][];
    expect(line.map((p) => p[1])).toEqual([k - 1 - i, k - 1 - i, k - 1 - i]);
    expectClose(line[0]?.[0], lift.lower, `lift low ${i + 1}`, 1e-9);
    expectClose(line[1]?.[0], lift.median, `lift median ${i + 1}`, 1e-9);
    expectClose(line[2]?.[0], lift.upper, `lift high ${i + 1}`, 1e-9);
  });
  expect(points[k - 1]).toEqual([
    [0, 0],
    [0, k],
  ]);
  await showFromTop(page, where.sheet, chart.topLeft);
  // As drawn: the horizontal axis's two end labels and none on the vertical axis
  const ticks = await page.evaluate(
    (title) =>
      Array.from(document.querySelectorAll('svg'))
        .filter((element) => element.getAttribute('aria-label') === title)
        .map((element) => element.querySelectorAll('text.tick').length),
    chart.title,
  );
  // (an earlier read-out of the same kind on the sheet draws a second chart of the same title, drawn alike)
  expect(ticks.length).toBeGreaterThan(0);
  expect(ticks).toEqual(ticks.map(() => 2));
  await screenshot(page, `look-${shot}-chart`);
  await page.evaluate(() => {
    const element = document.getElementById('panel');
    if (element) element.style.width = '350px';
  });
  await panel.locator('#readout-status').scrollIntoViewIfNeeded();
  await screenshot(page, `look-${shot}-chart-350`);
  await page.evaluate(() => {
    const element = document.getElementById('panel');
    if (element) element.style.width = '';
  });
}

/**
 * What the decision with guardrails must say, from the core's expected losses, the largest acceptable
 * loss the block writes (1% of the control's observed value; for conversions its posterior mean) and the
 * guardrail's probabilities (challengers only): the primary decision alone when no challenger is chosen,
 * else a failure when the chosen challenger's probability is below 95%, else "Guardrails hold".
 */
function expectGuarded(
  text: Cell,
  decision: Cell,
  losses: readonly number[],
  maxLoss: number,
  guard: readonly number[],
  names: readonly string[],
): void {
  expect(typeof text).toBe('string');
  let index = 0;
  losses.forEach((l, i) => {
    if (l < (losses[index] as number)) index = i;
  });
  if ((losses[index] as number) > maxLoss || index === 0) {
    expect(text).toBe(decision);
  } else if ((guard[index - 1] as number) < 0.95) {
    expect(text).toMatch(
      new RegExp(
        `^Guardrail 1 fails for ${names[index]}: P\\(.* lift > -2%\\) is [0-9.]+%, below 95%\\. Do not switch yet\\.`,
      ),
    );
  } else {
    expect(text).toBe(`${String(decision)} Guardrails hold for ${names[index]}.`);
  }
}

describe('a read-out for every metric kind, with a guardrail', () => {
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

  it('revenue per visitor from totals: proposed from the headings, a conversions guardrail, values from the core', async () => {
    await useTable(page, panel, 'A102', 'E105');
    expect(await panel.locator('#readout-metric').inputValue()).toBe('revenue');
    expect(await panel.locator('#readout-kind-hint').textContent()).toBe(
      'Proposed from the headings: revenue per visitor (from totals). The columns it uses are below.',
    );
    expect(await panel.locator('#readout-column-revenue').inputValue()).toBe('3');
    expect(await panel.locator('#readout-column-orderSd').inputValue()).toBe('4');
    await addGuardrail(panel, 'conversions', '-2');
    const where = await insert(
      panel,
      /^Wrote the revenue per visitor read-out to .* \(live formulas\) and a chart of the lift intervals from [A-Z]+\d+:[A-Z]+\d+\. The decision is in [A-Z]+\d+\. With guardrails: [A-Z]+\d+\.$/,
    );
    await screenshots(page, panel, 'panel-metrics-revenue');

    const orders = await column(page, 'B103', 3);
    const visitors = await column(page, 'C103', 3);
    const revenue = await column(page, 'D103', 3);
    const orderSd = await column(page, 'E103', 3);
    const guardrail: Guardrail = { kind: 'conversions', direction: 'noWorse', limit: -0.02, required: 0.95 };
    const built = metricReadoutBlock(
      'revenue',
      {
        sheet: SHEET,
        namesRef: 'A103:A105',
        refs: { conversions: 'B103:B105', visitors: 'C103:C105', revenue: 'D103:D105', orderSd: 'E103:E105' },
        variants: 3,
      },
      { level: 0.95, currentSrmPValue: 1 },
      [guardrail],
      where.topLeft,
      where.sheet,
    );
    const c = built.cells;
    const local = where.sheet === SHEET;
    expect(await cellInput(page, where.sheet, c.decision as string)).toBe(
      local
        ? `=ABTEST.REVENUE_DECISION(B103:B105,C103:C105,D103:D105,E103:E105,${c.maxLoss},${c.labels})`
        : `=ABTEST.REVENUE_DECISION('${SHEET}'!B103:B105,'${SHEET}'!C103:C105,'${SHEET}'!D103:D105,'${SHEET}'!E103:E105,${c.maxLoss},${c.labels})`,
    );
    const totals = orders.map((o, i) => ({
      orders: o,
      visitors: visitors[i] as number,
      revenue: revenue[i] as number,
      orderSd: orderSd[i] as number,
    }));
    const beats = revenueProbAboveControl(totals);
    const guard = probLiftAbove(
      totals.map((t) => ({ conversions: t.orders, visitors: t.visitors })),
      -0.02,
      UNIFORM_PRIOR,
    );
    for (let i = 1; i < 3; i += 1) {
      expectClose(
        (await readCell(page, where.sheet, below(c.probAboveControl as string, i))).value,
        beats[i - 1] as number,
        `beats ${i}`,
      );
      expectClose(
        (await readCell(page, where.sheet, below(c.guardrail1 as string, i))).value,
        guard[i - 1] as number,
        `guardrail ${i}`,
      );
    }
    expect((await readCell(page, where.sheet, c.guardrail1 as string)).value).toBe('');
    const names = (await readBlock(page, SHEET, 'A103', 3, 1)).map((r) => String(r[0]));
    const decision = (await readCell(page, where.sheet, c.decision as string)).value;
    expect(String(decision)).toMatch(/per visitor/);
    expectGuarded(
      (await readCell(page, where.sheet, c.guardedDecision as string)).value,
      decision,
      revenueExpectedLoss(totals),
      0.01 * ((revenue[0] as number) / (visitors[0] as number)),
      guard,
      names,
    );
    await expectLiftChart(page, panel, where, built.chart, revenueLiftInterval(totals, 0.95), 'readout-revenue');
  });

  it('averages: picked by the user on the main table, with a guardrail on conversions', async () => {
    await useTable(page, panel, 'A3', 'I6');
    expect(await panel.locator('#readout-metric').inputValue()).toBe('conversions');
    await panel.locator('#readout-metric').selectOption('averages');
    expect(await panel.locator('#readout-column-count').inputValue()).toBe('3');
    expect(await panel.locator('#readout-column-mean').inputValue()).toBe('4');
    expect(await panel.locator('#readout-column-sd').inputValue()).toBe('5');
    await addGuardrail(panel, 'conversions', '-2');
    const where = await insert(
      panel,
      /^Wrote the average read-out to .* \(live formulas\) and a chart of the lift intervals from [A-Z]+\d+:[A-Z]+\d+\./,
    );
    await screenshots(page, panel, 'panel-metrics-averages');
    const summaries = [0, 1, 2].map((i) => i);
    const count = await column(page, 'D4', 3);
    const mean = await column(page, 'E4', 3);
    const sd = await column(page, 'F4', 3);
    const visitors = await column(page, 'B4', 3);
    const conversions = await column(page, 'C4', 3);
    const built = metricReadoutBlock(
      'averages',
      {
        sheet: SHEET,
        namesRef: 'A4:A6',
        refs: { count: 'D4:D6', mean: 'E4:E6', sd: 'F4:F6', visitors: 'B4:B6', conversions: 'C4:C6' },
        variants: 3,
      },
      { level: 0.95, currentSrmPValue: 1 },
      [{ kind: 'conversions', direction: 'noWorse', limit: -0.02, required: 0.95 }],
      where.topLeft,
      where.sheet,
    );
    const c = built.cells;
    const means = summaries.map((i) => ({ count: count[i] as number, mean: mean[i] as number, sd: sd[i] as number }));
    const beats = meanProbAboveControl(means);
    const guard = probLiftAbove(
      summaries.map((i) => ({ conversions: conversions[i] as number, visitors: visitors[i] as number })),
      -0.02,
      UNIFORM_PRIOR,
    );
    for (let i = 1; i < 3; i += 1) {
      expectClose(
        (await readCell(page, where.sheet, below(c.probAboveControl as string, i))).value,
        beats[i - 1] as number,
        `beats ${i}`,
      );
      expectClose(
        (await readCell(page, where.sheet, below(c.guardrail1 as string, i))).value,
        guard[i - 1] as number,
        `guardrail ${i}`,
      );
    }
    const names = (await readBlock(page, SHEET, 'A4', 3, 1)).map((r) => String(r[0]));
    expectGuarded(
      (await readCell(page, where.sheet, c.guardedDecision as string)).value,
      (await readCell(page, where.sheet, c.decision as string)).value,
      meanExpectedLoss(means),
      0.01 * Math.abs(mean[0] as number),
      guard,
      names,
    );
    await expectLiftChart(page, panel, where, built.chart, meanLiftInterval(means, 0.95), 'readout-averages');
  });

  it('counts per exposure: basket adds per session, with a guardrail on the average revenue', async () => {
    await useTable(page, panel, 'A3', 'I6');
    await panel.locator('#readout-metric').selectOption('counts');
    expect(await panel.locator('#readout-column-events').inputValue()).toBe('6');
    expect(await panel.locator('#readout-column-exposure').inputValue()).toBe('7');
    // The visitors column is the counts' units for the split check.
    expect(await panel.locator('#readout-column-visitors').inputValue()).toBe('1');
    await addGuardrail(panel, 'averages', '-2');
    const where = await insert(
      panel,
      /^Wrote the event rate read-out to .* \(live formulas\) and a chart of the lift intervals from [A-Z]+\d+:[A-Z]+\d+\./,
    );
    await screenshots(page, panel, 'panel-metrics-counts');
    const events = await column(page, 'G4', 3);
    const exposure = await column(page, 'H4', 3);
    const count = await column(page, 'D4', 3);
    const mean = await column(page, 'E4', 3);
    const sd = await column(page, 'F4', 3);
    const built = metricReadoutBlock(
      'counts',
      {
        sheet: SHEET,
        namesRef: 'A4:A6',
        refs: { events: 'G4:G6', exposure: 'H4:H6', visitors: 'B4:B6', count: 'D4:D6', mean: 'E4:E6', sd: 'F4:F6' },
        variants: 3,
      },
      { level: 0.95, currentSrmPValue: 1 },
      [{ kind: 'averages', direction: 'noWorse', limit: -0.02, required: 0.95 }],
      where.topLeft,
      where.sheet,
    );
    const c = built.cells;
    const rates = events.map((e, i) => ({ events: e, exposure: exposure[i] as number }));
    const beats = eventsProbAboveControl(rates);
    const guard = meanProbLiftAbove(
      count.map((n, i) => ({ count: n, mean: mean[i] as number, sd: sd[i] as number })),
      -0.02,
    );
    for (let i = 1; i < 3; i += 1) {
      expectClose(
        (await readCell(page, where.sheet, below(c.probAboveControl as string, i))).value,
        beats[i - 1] as number,
        `beats ${i}`,
      );
      expectClose(
        (await readCell(page, where.sheet, below(c.guardrail1 as string, i))).value,
        guard[i - 1] as number,
        `guardrail ${i}`,
      );
    }
    const names = (await readBlock(page, SHEET, 'A4', 3, 1)).map((r) => String(r[0]));
    expectGuarded(
      (await readCell(page, where.sheet, c.guardedDecision as string)).value,
      (await readCell(page, where.sheet, c.decision as string)).value,
      eventsExpectedLoss(rates),
      0.01 * ((events[0] as number) / (exposure[0] as number)),
      guard,
      names,
    );
    // The split check counts the table's visitors (the assigned units), never the sessions (exposure): the
    // core's chi-square p-value (srm.ts, checked against R's chisq.test in test/stats).
    expect(await cellInput(page, where.sheet, c.srmPValue as string)).toMatch(
      /^=ABTEST\.SRM_PVALUE\((?:'Checkout test'!)?B4:B6\)$/,
    );
    expectClose(
      (await readCell(page, where.sheet, c.srmPValue as string)).value,
      srmPValue(await column(page, 'B4', 3)),
      'split check',
    );
    await expectLiftChart(page, panel, where, built.chart, eventsLiftInterval(rates, 0.95), 'readout-counts');
    // The event-rate guardrail of the next test's check: the same core function at another limit.
    expect(eventsProbLiftAbove(rates, 0).map((p, i) => Math.abs(p - (beats[i] as number)) < 1e-12)).toEqual([
      true,
      true,
    ]);
  });

  it('counts per exposure without a users column: no split check from exposure, said in the panel and in the block', async () => {
    // An invented table typed by hand, as a user would: complaints per user-day of two help pages, no users column.
    await switchSheet(page, SHEET);
    const typed: [string, string][] = [
      ['D150', 'Variant'],
      ['E150', 'Complaints'],
      ['F150', 'User-days'],
      ['D151', 'Old help page'],
      ['E151', '41'],
      ['F151', '70000'],
      ['D152', 'New help page'],
      ['E152', '37'],
      ['F152', '70420'],
    ];
    for (const [address, input] of typed) await enterCell(page, address, input);
    await selectRange(page, 'D150', 'F152');
    await panel.locator('#tab-readout').click();
    await panel.locator('#readout-use-selection').click();
    await panel.locator('#readout-metric').waitFor();
    // "User-days" is the exposure, not visitors; "Complaints" the events: counts per exposure is proposed.
    expect(await panel.locator('#readout-metric').inputValue()).toBe('counts');
    expect(await panel.locator('#readout-column-exposure').inputValue()).toBe('2');
    expect(await panel.locator('#readout-column-visitors').inputValue()).toBe('none');
    expect(await panel.locator('#readout-split').textContent()).toBe(
      'Split check: none can be made from exposure alone (exposure is not a count of assigned users). Add a column of users or visitors per variant to the table, or check the split on the visitors table.',
    );
    const where = await insert(
      panel,
      /^Wrote the event rate read-out to .* \(live formulas\) and a chart of the lift intervals from [A-Z]+\d+:[A-Z]+\d+\./,
    );
    await screenshots(page, panel, 'panel-metrics-counts-no-units');
    const built = metricReadoutBlock(
      'counts',
      { sheet: SHEET, namesRef: 'D151:D152', refs: { events: 'E151:E152', exposure: 'F151:F152' }, variants: 2 },
      { level: 0.95, currentSrmPValue: null },
      [],
      where.topLeft,
      where.sheet,
    );
    expect(built.cells.srmPValue).toBeUndefined();
    expect((await readCell(page, where.sheet, built.cells.srmMissing as string)).value).toBe(
      'Split check: none from exposure alone (a chi-square on exposure is not valid). Add a column of users or visitors per variant to the table and insert the read-out again.',
    );
    await expectLiftChart(
      page,
      panel,
      where,
      built.chart,
      eventsLiftInterval(
        [
          { events: 41, exposure: 70000 },
          { events: 37, exposure: 70420 },
        ],
        0.95,
      ),
      'readout-counts-no-units',
    );
    expect(preview.pageErrors).toEqual([]);
  });

  it('conversions: the guessed columns confirmed, a guardrail on the average revenue beside the decision', async () => {
    await useTable(page, panel, 'A3', 'I6');
    await panel.locator('#readout-metric').selectOption('conversions');
    await panel.locator('#readout-confirm-mapping').click();
    await addGuardrail(panel, 'averages', '-2');
    const where = await insert(
      panel,
      /^Wrote the read-out to .* \(live formulas\) and a lift chart from .*With guardrails: [A-Z]+\d+\.$/,
    );
    await screenshots(page, panel, 'panel-metrics-conversions');
    const visitors = await column(page, 'B4', 3);
    const conversions = await column(page, 'C4', 3);
    const count = await column(page, 'D4', 3);
    const mean = await column(page, 'E4', 3);
    const sd = await column(page, 'F4', 3);
    const built = readoutBlock(
      {
        sheet: SHEET,
        namesRef: 'A4:A6',
        visitorsRef: 'B4:B6',
        conversionsRef: 'C4:C6',
        sharesRef: 'I4:I6',
        variants: 3,
        refs: { count: 'D4:D6', mean: 'E4:E6', sd: 'F4:F6' },
      },
      { level: 0.95, prior: { alpha: 1, beta: 1 }, densityPoints: 61, currentSrmPValue: 1 },
      where.topLeft,
      where.sheet,
      [{ kind: 'averages', direction: 'noWorse', limit: -0.02, required: 0.95 }],
    );
    const c = built.cells;
    const counts = visitors.map((n, i) => ({ visitors: n, conversions: conversions[i] as number }));
    const beats = probAboveControl(counts, UNIFORM_PRIOR);
    const guard = meanProbLiftAbove(
      count.map((n, i) => ({ count: n, mean: mean[i] as number, sd: sd[i] as number })),
      -0.02,
    );
    for (let i = 1; i < 3; i += 1) {
      expectClose(
        (await readCell(page, where.sheet, below(c.probAboveControl as string, i))).value,
        beats[i - 1] as number,
        `beats ${i}`,
      );
      expectClose(
        (await readCell(page, where.sheet, below(c.guardrail1 as string, i))).value,
        guard[i - 1] as number,
        `guardrail ${i}`,
      );
    }
    const guarded = (await readCell(page, where.sheet, c.guardedDecision as string)).value;
    expect(typeof guarded).toBe('string');
    expect(await cellInput(page, where.sheet, c.guardedDecision as string)).toMatch(/^=IF\(OR\(MIN\(/);
    // The lift-density chart has its axis titles; its lift axis crosses 0 (the preview draws the zero line).
    const source = parseAddress(built.chartSource);
    const chart = await page.evaluate(
      ([s, row, col]) => {
        const handle = window.liftLedgerPreview;
        if (!handle) throw new Error('the preview is not ready');
        const id = handle.workbook.sheetId(s as string) as number;
        const found = handle.workbook.charts(id).find((x) => x.source.row === row && x.source.col === col);
        return found === undefined ? null : { type: found.type, axisTitles: found.axisTitles };
      },
      [where.sheet, source.start.row, source.start.column] as const,
    );
    expect(chart).toEqual({
      type: 'XYScatterSmoothNoMarkers',
      axisTitles: { x: 'Lift of conversion rate over the control (relative)', y: 'Posterior density' },
    });
    await showFromTop(page, where.sheet, built.chartTopLeft);
    await screenshot(page, 'look-readout-conversions-chart');
  });
});
