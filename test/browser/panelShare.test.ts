/**
 * The side panel's Share section in the preview with Debian's chromium, on the invented demo read-out
 * (preview/src/demoWorkbook.ts, a garden-supply shop's checkout buttons):
 * - a shareable copy of the whole "Checkout test" sheet: every ABTEST result a plain value equal to the
 *   live one it came from, the formula in a note on it, number formats and a native chart kept (the chart
 *   reads the copy's values), a header line on top, the original still live;
 * - the same on an Excel without notes (`?api=1.16`): the panel says so first, and the formulas go into a
 *   "How computed" column;
 * - the summary for people who decide from the demo's variant table, on a new sheet set to print on one
 *   page: its chances of being best and lift ranges agree with scipy (test/reference/addin/summary_values.json,
 *   case "checkout_demo", made by test/reference/addin/summary_reference.py);
 * - the summary of a read-out with a guardrail (average revenue no worse than −2%): each challenger's chance it
 *   holds agrees with scipy (test/reference/addin/summary_guardrails.py), and the failing leader is not chosen.
 * Screenshots go to test-artifacts/ (full width and with the panel at 350 px).
 */
import * as fs from 'fs';
import * as path from 'path';
import type { Frame, Page } from 'playwright-core';
import {
  cellLocator,
  openPreview,
  panelFrame,
  readBlock,
  screenshot,
  selectCell,
  switchSheet,
  type OpenPreview,
} from './previewHelpers';

const SHEET = 'Checkout test';
const COPY = 'Checkout test (shared)';

interface ReferenceCase {
  names: string[];
  visitors: number[];
  conversions: number[];
  posterior_mean: number[];
  prob_best: number[];
  lift: [number, number, number][];
  srm_pvalue: number;
}
/** The guardrail probabilities of the demo table, from scipy (test/reference/addin/summary_guardrails.py). */
const GUARDRAILS = (
  JSON.parse(
    fs.readFileSync(path.join(__dirname, '..', 'reference', 'addin/summary_guardrails.json'), 'utf8'),
  ) as Record<string, { averages_prob_lift_above: Record<string, number[]> }>
).checkout_demo as { averages_prob_lift_above: Record<string, number[]> };
const REFERENCE = (
  JSON.parse(fs.readFileSync(path.join(__dirname, '..', 'reference', 'addin/summary_values.json'), 'utf8')) as Record<
    string,
    ReferenceCase
  >
).checkout_demo as ReferenceCase;

/** A cell of a sheet as the preview holds it: what was typed or written, its value, format and note. */
async function cellState(
  page: Page,
  sheet: string,
  address: string,
): Promise<{ input: unknown; value: unknown; format: string | null; note: string | null }> {
  return page.evaluate(
    ([name, a]) => {
      const book = window.liftLedgerPreview?.workbook;
      if (!book) throw new Error('the preview is not ready');
      const id = book.sheetId(name as string);
      if (id === undefined) throw new Error(`no sheet ${name}`);
      const m = /^([A-Z]+)([0-9]+)$/.exec(a as string);
      if (!m) throw new Error(`bad address ${a}`);
      const col = [...(m[1] as string)].reduce((n, ch) => n * 26 + ch.charCodeAt(0) - 64, 0) - 1;
      const row = Number(m[2]) - 1;
      const view = book.cell(id, row, col);
      return {
        input: view.input,
        value: view.value,
        format: book.numberFormat(id, row, col) ?? null,
        note: book.note(id, row, col) ?? null,
      };
    },
    [sheet, address] as const,
  );
}

async function messageText(frame: Frame, area: string): Promise<string> {
  await frame.locator(`#${area} fluent-message-bar:not([intent="info"])`).waitFor({ timeout: 120_000 });
  return (await frame.locator(`#${area}`).textContent()) ?? '';
}

/** Screenshot of the page with the side panel at 350 px (scrolled to `show`), then back to its usual width. */
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

/** Opens the Share section with the active cell on the demo read-out. */
async function openShare(page: Page, panel: Frame): Promise<void> {
  await switchSheet(page, SHEET);
  await selectCell(page, 'B11');
  await panel.locator('#tab-share').click();
  await panel.locator('#section-share:not([hidden])').waitFor();
}

describe('the Share section on the demo read-out', () => {
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

  it('a shareable copy of the whole sheet: values equal to the live results, formulas in notes, formats and a chart kept, the original live', async () => {
    // A native chart of the demo's lift-density table (as a user would insert one), to see that it comes along.
    await page.evaluate(() => {
      const book = window.liftLedgerPreview?.workbook;
      if (!book) throw new Error('the preview is not ready');
      const sheet = book.sheetId('Checkout test') as number;
      const chart = book.addChart(sheet, 'Line', { sheet, row: 53, col: 10, rows: 42, columns: 3 });
      chart.title = 'Lift densities';
      chart.position = { from: { row: 2, col: 15 }, to: { row: 20, col: 20 } };
    });
    await openShare(page, panel);
    await panel.locator('#share-look').click();
    await panel.locator('#share-plan-text').waitFor({ timeout: 60_000 });
    // 36 ABTEST formula cells on the demo sheet: the conversion, revenue, revenue-from-totals and events blocks and 2 chart tables.
    expect(await panel.locator('#share-plan-text').textContent()).toBe(
      `A new sheet "${COPY}" right after "${SHEET}": a copy of the whole sheet (A1:N145), in which 36 ABTEST results become plain values, ` +
        'each with its formula in a note. Number formats come along and 1 chart comes along and shows the values. ' +
        `A header line says when and from which cells it was made. "${SHEET}" itself is not changed and stays live.`,
    );
    expect(await panel.locator('#share-fallback').textContent()).toBe('');
    await screenshot(page, 'panel-share-plan');
    await narrowScreenshot(page, 'panel-share-plan-350', panel, '#share-copy');

    const live = await readBlock(page, SHEET, 'B11', 3, 1);
    await panel.locator('#share-copy').dblclick();
    const done = await messageText(panel, 'share-status');
    expect(done).toMatch(
      /^Made "Checkout test \(shared\)" \('Checkout test \(shared\)'!A1:N146\): 36 ABTEST results are plain values, the formulas in a note on each\. 1 chart kept\. "Checkout test" is unchanged and stays live\./,
    );
    const sheets = await page.evaluate(() => window.liftLedgerPreview?.workbook.sheetNames());
    expect(sheets).toEqual(['Checkout test', 'Past tests', 'Plan', 'Daily test', COPY]);

    // B11:B13 (posterior means) of the source are B12:B14 of the copy: plain numbers, the live values, in scipy's
    // agreement (posterior means (1 + x)/(2 + n), closed form), with the source's number format.
    for (let i = 0; i < 3; i += 1) {
      const cell = await cellState(page, COPY, `B${12 + i}`);
      expect(typeof cell.input === 'number' || (typeof cell.input === 'string' && !cell.input.startsWith('='))).toBe(
        true,
      );
      expect(cell.value).toBe(live[i]?.[0]);
      expect(Math.abs((cell.value as number) - (REFERENCE.posterior_mean[i] as number))).toBeLessThan(1e-12);
      expect(cell.format).toBe('0.00%');
    }
    expect((await cellState(page, COPY, 'B12')).note).toMatch(
      /^Computed by =ABTEST\.POSTERIOR_MEAN\(C5:C7, B5:B7\) \(its result filled B12:B14\)\.\nFrozen \d{4}-\d\d-\d\d \d\d:\d\d UTC: a plain value now, it no longer updates\.$/,
    );
    // P(highest) at B23:B25 of the source: values equal to scipy's P(best).
    const best = await readBlock(page, COPY, 'B24', 3, 1);
    best.forEach((row, i) =>
      expect(Math.abs((row[0] as number) - (REFERENCE.prob_best[i] as number))).toBeLessThan(1e-9),
    );
    // The decision is text now; the names beside the results are still formulas reading the copy's own table.
    const decision = await cellState(page, COPY, 'B48');
    expect(String(decision.input)).not.toMatch(/^=/);
    expect(decision.note).toMatch(/^Computed by =ABTEST\.DECISION\(C5:C7, B5:B7, , A5:A7\)/);
    expect((await cellState(page, COPY, 'A12')).input).toBe('=$A$5');
    // The header line.
    expect(String((await cellState(page, COPY, 'A1')).input)).toMatch(
      /^Frozen copy made \d{4}-\d\d-\d\d \d\d:\d\d UTC from 'Checkout test'!A1:N145: 36 Lift Ledger results are plain values; each keeps the formula that computed it in a note\./,
    );
    // The chart came along, reads the copy's cells (moved down by the header row), which are values now.
    const chart = await page.evaluate(() => {
      const book = window.liftLedgerPreview?.workbook;
      if (!book) throw new Error('the preview is not ready');
      const copy = book.sheetId('Checkout test (shared)') as number;
      const [c] = book.charts(copy);
      if (!c) return null;
      const first = book.cell(copy, c.source.row + 1, c.source.col);
      return {
        title: c.title,
        sheet: c.source.sheet === copy,
        row: c.source.row,
        formula: String(first.input).startsWith('='),
        value: typeof first.value,
      };
    });
    expect(chart).toEqual({ title: 'Lift densities', sheet: true, row: 54, formula: false, value: 'number' });
    // The original is still live.
    expect((await cellState(page, SHEET, 'B11')).input).toBe('=ABTEST.POSTERIOR_MEAN(C4:C6, B4:B6)');
    expect((await cellState(page, SHEET, 'B11')).note).toBeNull();
    await cellLocator(page, 'B12').scrollIntoViewIfNeeded();
    await screenshot(page, 'panel-share-copied');
    await narrowScreenshot(page, 'panel-share-copied-350', panel, '#share-status');
    expect(preview.pageErrors).toEqual([]);
  });

  it('the summary of the demo read-out: a one-page sheet whose chances and lift ranges agree with scipy', async () => {
    await switchSheet(page, SHEET);
    await selectCell(page, 'A3');
    await cellLocator(page, 'C6').click({ modifiers: ['Shift'] });
    await panel.locator('#tab-share').click();
    await panel.locator('#summary-use-selection').click();
    await panel.locator('#summary-variants').waitFor();
    expect(await panel.locator('#summary-table p').first().textContent()).toBe(
      "3 variants in 'Checkout test'!A3:C6 (equal shares planned):",
    );
    await panel.locator('#summary-title').locator('input').fill('Checkout button colour');
    await panel.locator('#summary-days').locator('input').fill('28');
    await panel.locator('#summary-write').click();
    const done = await messageText(panel, 'summary-status');
    expect(done).toMatch(
      /^Wrote the summary to 'Checkout test summary'!A1:G\d+, set to print on one page\. It recommends a version\./,
    );
    const summary = 'Checkout test summary';
    const rows = await readBlock(page, summary, 'A1', 60, 7);
    expect(rows[0]?.[0]).toBe('Summary for decision-makers: Checkout button colour');
    REFERENCE.names.forEach((name, i) => {
      const row = rows.find(
        (r) => typeof r[0] === 'string' && (r[0] as string).startsWith(name) && typeof r[1] === 'number',
      );
      expect(row).toBeDefined();
      const cells = row as (number | string | boolean)[];
      expect(cells.slice(1, 3)).toEqual([REFERENCE.visitors[i], REFERENCE.conversions[i]]);
      expect(Math.abs((cells[4] as number) - (REFERENCE.prob_best[i] as number))).toBeLessThan(1e-9);
      if (i > 0) {
        const [lower, , upper] = REFERENCE.lift[i - 1] as [number, number, number];
        expect(Math.abs((cells[5] as number) - lower)).toBeLessThan(1e-8);
        expect(Math.abs((cells[6] as number) - upper)).toBeLessThan(1e-8);
      }
    });
    const words = rows
      .map((r) => String(r[0]))
      .join(' ')
      .replace(/\s+/g, ' ');
    expect(words).toContain('Go with Orange button.');
    expect(words).toContain('shown to 31,251 visitors in all over 28 days');
    // scipy's chi-square p-value for the demo's visitors against equal shares: 0.9075…, shown with two digits.
    expect(REFERENCE.srm_pvalue.toPrecision(2)).toBe('0.91');
    expect(words).toContain('Visitors were split as planned (equal shares; split check p-value 0.91');
    expect(words).toContain('have a qualified statistician review it before acting');
    const layout = await page.evaluate(() => {
      const book = window.liftLedgerPreview?.workbook;
      return book?.pageLayout(book.sheetId('Checkout test summary') as number);
    });
    expect(layout).toMatchObject({ orientation: 'Portrait', zoom: { horizontalFitToPages: 1, verticalFitToPages: 1 } });
    await screenshot(page, 'panel-share-summary');
    await narrowScreenshot(page, 'panel-share-summary-350', panel, '#summary-status');
    expect(preview.pageErrors).toEqual([]);
  });

  it('the summary of a read-out with a guardrail: each challenger’s chance it holds agrees with scipy, and the leader that fails it is not switched to', async () => {
    // Insert a conversions read-out of the demo table with a guardrail on the average revenue (no worse than −2%).
    await switchSheet(page, SHEET);
    await selectCell(page, 'A3');
    for (let i = 0; i < 8; i += 1) await page.keyboard.press('Shift+ArrowRight');
    for (let i = 0; i < 3; i += 1) await page.keyboard.press('Shift+ArrowDown');
    await panel.locator('#tab-readout').click();
    await panel.locator('#readout-use-selection').click();
    await panel.locator('#readout-metric').waitFor();
    await panel.locator('#readout-metric').selectOption('conversions');
    await panel.locator('#readout-confirm-mapping').click();
    await panel.locator('#readout-add-guardrail').click();
    await panel.locator('#readout-guardrail-1-kind').selectOption('averages');
    await panel.locator('#readout-guardrail-1-limit input').fill('-2');
    await panel.locator('#readout-guardrail-1-required input').fill('95');
    await panel.locator('#readout-place-target fluent-message-bar').waitFor({ timeout: 60_000 });
    await panel.locator('#readout-insert:not([disabled])').waitFor();
    await panel.locator('#readout-insert').click();
    expect(await messageText(panel, 'readout-status')).toMatch(
      /^Wrote the read-out to .*With guardrails: [A-Z]+\d+\.$/,
    );

    // The summary from the variant table alone (A3:C6): the guardrail is found in the read-out beside it.
    await switchSheet(page, SHEET);
    await selectCell(page, 'A3');
    await cellLocator(page, 'C6').click({ modifiers: ['Shift'] });
    await panel.locator('#tab-share').click();
    await panel.locator('#summary-use-selection').click();
    await panel.locator('#summary-guardrails').waitFor({ timeout: 60_000 });
    expect(await panel.locator('#summary-guardrails').textContent()).toMatch(
      /^Guardrails from the read-out at 'Checkout test'![A-Z]+\d+: average lift no worse than −2\.0% \(with at least 95%\)\.$/,
    );
    await panel.locator('#summary-title').locator('input').fill('Checkout button colour');
    await panel.locator('#summary-write').click();
    const done = await messageText(panel, 'summary-status');
    expect(done).toMatch(/set to print on one page\. It says: do not switch yet, a guardrail fails\./);
    const m = /^Wrote the summary to '([^']+)'!/.exec(done);
    if (m === null) throw new Error(`no sheet in "${done}"`);
    const rows = await readBlock(page, m[1] as string, 'A1', 60, 7);
    const words = rows
      .map((r) => String(r[0]))
      .join(' ')
      .replace(/\s+/g, ' ');
    expect(words).toContain('Guardrail 1: average lift no worse than −2.0%, with a chance of at least 95%.');
    // scipy (summary_guardrails.json, case "checkout_demo"): P(average lift > −2%) per challenger.
    const expected = GUARDRAILS.averages_prob_lift_above['-0.02'] as number[];
    const results = rows.filter((r) => r[5] === 'passes' || r[5] === 'fails');
    expect(results.map((r) => String(r[0]).trim())).toEqual(['Orange button', 'Big basket icon']);
    results.forEach((r, i) => expect(Math.abs((r[4] as number) - (expected[i] as number))).toBeLessThan(1e-9));
    // 0.947… and 0.801… are both below 95%: both fail, and the leader by conversions is not switched to.
    expect(results.map((r) => r[5])).toEqual(['fails', 'fails']);
    expect(words).toContain('Do not switch to Orange button yet: it fails a guardrail.');
    expect(words).toContain(
      `the chance that its average lift is no worse than −2.0% (guardrail 1) is ${(100 * (expected[0] as number)).toFixed(1)}%, below the 95% required.`,
    );
    await page.evaluate(() => {
      const grid = document.getElementById('grid');
      if (grid) grid.scrollTop = 0;
    });
    await screenshot(page, 'look-share-summary-guardrail');
    await narrowScreenshot(page, 'look-share-summary-guardrail-350', panel, '#summary-use-selection');
    expect(preview.pageErrors).toEqual([]);
  });

  it('on an Excel without notes (?api=1.16) the panel says so first, and the copy keeps the formulas in a How computed column', async () => {
    await page.goto(new URL('?api=1.16', preview.url).toString());
    await page.waitForSelector('body[data-ready="true"]', { timeout: 60_000 });
    panel = await panelFrame(page);
    await panel.waitForSelector('#tabs');
    await openShare(page, panel);
    await panel.locator('#share-look').click();
    await panel.locator('#share-plan-text').waitFor({ timeout: 60_000 });
    const planText = await panel.locator('#share-plan-text').textContent();
    expect(planText).toContain('each with its formula in a "How computed" column (column O)');
    // A fresh demo: no chart on the sheet.
    expect(planText).toContain('Number formats come along (the sheet has no charts).');
    expect(await panel.locator('#share-fallback').textContent()).toBe(
      'This Excel cannot add notes to cells (it lacks the Excel JavaScript API 1.18), so the formulas go into a column beside the values instead.',
    );
    await narrowScreenshot(page, 'panel-share-no-notes-350', panel, '#share-copy');
    await panel.locator('#share-copy').click();
    const done = await messageText(panel, 'share-status');
    expect(done).toContain('the formulas in column O (How computed)');
    expect((await cellState(page, COPY, 'O1')).input).toBe('How computed');
    expect((await cellState(page, COPY, 'O12')).input).toBe(
      'B12: =ABTEST.POSTERIOR_MEAN(C5:C7, B5:B7) (filled B12:B14); K12: =ABTEST.POSTERIOR_DENSITY(C5:C7, B5:B7, 41) (filled K12:N52)',
    );
    expect((await cellState(page, COPY, 'B12')).note).toBeNull();
    const notes = await page.evaluate(() => {
      const book = window.liftLedgerPreview?.workbook;
      return book?.notes(book.sheetId('Checkout test (shared)') as number);
    });
    expect(notes).toEqual({});
    expect(preview.pageErrors).toEqual([]);
  });
});
