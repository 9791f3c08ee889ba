/**
 * The side panel is safe with the user's data (issue #11), in the preview with Debian's chromium:
 * - a new user inserts a read-out beside the demo's first table: the panel offers the first empty
 *   columns, shows the target range first, writes once on a double click, and no cell of the sheet
 *   outside that range changes (contents, number formats, styles, widths);
 * - a write made to fail half-way (the preview's Excel stand-in fails on demand, leaving the commands it
 *   ran applied, as Excel does) is undone — contents, number formats, fills — and the panel says so;
 * - a table with one count typed as text ("10,050") is shown with its column headings, the cell is
 *   flagged, and nothing can be inserted; a mapping guessed from the numbers alone must be confirmed.
 * The read-out's numbers are checked against the statistics core called directly; the tables typed
 * here are invented (the garden-supply shop). Screenshots go to test-artifacts/ (full width and with the
 * panel at 350 px).
 */
import type { Frame, Page } from 'playwright-core';
import { posteriorMean, probHighest } from '../../functions/stats/conversion';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import { readoutBlock } from '../../taskpane/logic/formulas';
import { parseAddress } from '../../taskpane/workbook/address';
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

type Cell = number | string | boolean;

/** Inputs, number formats, styles of every cell of a sheet's first rows × columns, and its column widths. */
async function sheetLook(page: Page, sheet: string, rows: number, columns: number): Promise<Record<string, string>> {
  return page.evaluate(
    ([name, r, c]) => {
      const book = window.liftLedgerPreview?.workbook;
      if (!book) throw new Error('the preview is not ready');
      const id = book.sheetId(name as string) as number;
      const out: Record<string, string> = {};
      const letters = (col: number): string => {
        let s = '';
        for (let n = col + 1; n > 0; n = Math.floor((n - 1) / 26)) s = String.fromCharCode(65 + ((n - 1) % 26)) + s;
        return s;
      };
      for (let row = 0; row < (r as number); row += 1) {
        for (let col = 0; col < (c as number); col += 1) {
          const view = book.cell(id, row, col);
          const format = book.numberFormat(id, row, col);
          const style = book.style(id, row, col);
          if (view.input === '' && view.value === '' && format === undefined && style === undefined) continue;
          out[`${letters(col)}${row + 1}`] = JSON.stringify([view.input, view.value, format ?? null, style ?? null]);
        }
      }
      for (let col = 0; col < (c as number); col += 1)
        out[`width ${letters(col)}`] = String(book.columnWidth(id, col) ?? 'default');
      return out;
    },
    [sheet, rows, columns] as const,
  );
}

/** True when `address` (A1) lies in the block from `topLeft` of rows × columns. */
function inside(address: string, topLeft: string, rows: number, columns: number): boolean {
  const a = parseAddress(address).start;
  const t = parseAddress(topLeft).start;
  return a.row >= t.row && a.row < t.row + rows && a.column >= t.column && a.column < t.column + columns;
}

async function selectRange(page: Page, from: string, to: string): Promise<void> {
  await selectCell(page, from);
  await cellLocator(page, to).click({ modifiers: ['Shift'] });
}

/** Types a table cell by cell into the active sheet (through the preview's workbook, as typed values). */
async function typeTable(page: Page, sheet: string, topLeft: string, rows: (string | number)[][]): Promise<void> {
  const p = parseAddress(topLeft).start;
  await page.evaluate(
    ([name, row, col, data]) => {
      const book = window.liftLedgerPreview?.workbook;
      if (!book) throw new Error('the preview is not ready');
      book.write(book.sheetId(name as string) as number, row as number, col as number, data as (string | number)[][]);
    },
    [sheet, p.row, p.column, rows] as const,
  );
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

async function messageText(frame: Frame, area: string): Promise<string> {
  await frame.locator(`#${area} fluent-message-bar:not([intent="info"])`).waitFor({ timeout: 60_000 });
  return (await frame.locator(`#${area}`).textContent()) ?? '';
}

describe('the side panel keeps the user’s data safe', () => {
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

  it('inserts a read-out beside the demo’s first table in empty columns, shown first, written once, nothing else touched', async () => {
    await switchSheet(page, 'Checkout test');
    const before = await sheetLook(page, 'Checkout test', 140, 40);
    await selectRange(page, 'A3', 'C6');
    await panel.locator('#tab-readout').click();
    await panel.locator('#readout-use-selection').click();
    await panel.locator('#readout-variants').waitFor();
    expect(await panel.locator('#readout-mapping-summary').textContent()).toBe(
      'Visitors: column B ("Visitors"); conversions: column C ("Conversions"); names: column A ("Variant").',
    );
    // The place offered: the first empty columns right of everything in the table's rows (D…N hold the
    // revenue, basket and session columns and the chart tables; O stays empty between), shown before writing.
    await panel.locator('#readout-place-target fluent-message-bar').waitFor();
    await panel.locator('#readout-place-target', { hasText: 'P3' }).waitFor();
    expect(await panel.locator('#readout-place-target').textContent()).toBe(
      "It will fill 'Checkout test'!P3:Z79 (77 rows × 11 columns); all those cells are empty now.",
    );
    expect(await panel.locator('label[for="readout-place-right"]').textContent()).toBe(
      'Right of the table, in empty columns: P3:Z79',
    );
    expect(await panel.locator('label[for="readout-place-sheet"]').textContent()).toBe(
      'On a new sheet "Checkout test read-out"',
    );
    await panel.locator('#readout-place-group').scrollIntoViewIfNeeded();
    await screenshot(page, 'panel-safety-readout-place');
    await narrowScreenshot(page, 'panel-safety-readout-place-350', panel, '#readout-insert');

    // A double click writes once.
    await panel.locator('#readout-insert').dblclick();
    const done = await messageText(panel, 'readout-status');
    expect(done).toMatch(
      /^Wrote the read-out to 'Checkout test'!P3:Z79 \(live formulas\) and a lift chart from P18:R79\./,
    );
    const after = await sheetLook(page, 'Checkout test', 140, 40);
    // Every cell outside the read-out's area is as it was; the area holds exactly one read-out.
    const outside = (look: Record<string, string>) =>
      Object.fromEntries(Object.entries(look).filter(([key]) => key.startsWith('width') || !inside(key, 'P3', 77, 11)));
    const widthsOf = (look: Record<string, string>) =>
      Object.fromEntries(
        Object.entries(look).filter(([key]) => key.startsWith('width') && !/^width ([P-Z])$/.test(key)),
      );
    expect(widthsOf(after)).toEqual(widthsOf(before));
    expect(Object.fromEntries(Object.entries(outside(after)).filter(([k]) => !k.startsWith('width')))).toEqual(
      Object.fromEntries(Object.entries(outside(before)).filter(([k]) => !k.startsWith('width'))),
    );
    const titles = Object.entries(after).filter(([, v]) => v.includes('Read-out (Lift Ledger)'));
    expect(titles.map(([k]) => k)).toEqual(['P3']);
    // Its cells are live formulas whose values equal the core's.
    const table = await readBlock(page, 'Checkout test', 'A4', 3, 3);
    const variants = table.map((r) => ({ visitors: r[1] as number, conversions: r[2] as number }));
    const built = readoutBlock(
      {
        sheet: 'Checkout test',
        namesRef: 'A4:A6',
        visitorsRef: 'B4:B6',
        conversionsRef: 'C4:C6',
        sharesRef: null,
        variants: 3,
      },
      { level: 0.95, prior: UNIFORM_PRIOR, densityPoints: 61, currentSrmPValue: 0.5 },
      'P3',
      'Checkout test',
    );
    const means = await readBlock(page, 'Checkout test', built.cells.posteriorMean as string, 3, 1);
    posteriorMean(variants, UNIFORM_PRIOR).forEach((m, i) =>
      expect(Math.abs((means[i]?.[0] as number) - m)).toBeLessThanOrEqual(1e-12),
    );
    const highest = await readBlock(page, 'Checkout test', built.cells.probHighest as string, 3, 1);
    probHighest(variants, UNIFORM_PRIOR).forEach((p, i) =>
      expect(Math.abs((highest[i]?.[0] as number) - p)).toBeLessThanOrEqual(1e-12),
    );
    // The names sit beside the results, the loss column says what its unit is.
    expect((await readBlock(page, 'Checkout test', 'P5', 3, 1)).map((r) => r[0])).toEqual(table.map((r) => r[0]));
    expect((await readBlock(page, 'Checkout test', 'Y4', 1, 1))[0]?.[0]).toBe('Expected loss (rate points)');
    await screenshot(page, 'panel-safety-readout-written');
    // The next read-out would go further right: the place just used is taken now (its last column, Z,
    // holds only the chart and stays the empty column between).
    await panel.locator('label[for="readout-place-right"]', { hasText: 'AA3' }).waitFor();
    expect(preview.pageErrors).toEqual([]);
  });

  it('undoes a write that fails half-way — contents, number formats and fills — and says so', async () => {
    await switchSheet(page, 'Plan');
    await typeTable(page, 'Plan', 'D20', [
      ['Variant', 'Visitors', 'Conversions'],
      ['Green button', 10000, 412],
      ['Orange button', 10050, 455],
    ]);
    // The user's own formatting on empty cells where the read-out will go (empty cells are not asked about).
    await page.evaluate(() => {
      const book = window.liftLedgerPreview?.workbook;
      if (!book) throw new Error('the preview is not ready');
      const plan = book.sheetId('Plan') as number;
      book.setNumberFormat(plan, 21, 8, '0.0%');
      book.setStyle(plan, 22, 9, { fill: '#FFF2CC', bold: true });
      book.touch();
    });
    const before = await sheetLook(page, 'Plan', 120, 30);
    await selectRange(page, 'D20', 'F22');
    await panel.locator('#readout-use-selection').click();
    await panel.locator('#readout-place-target', { hasText: 'H20' }).waitFor();
    expect(await panel.locator('#readout-place-target').textContent()).toBe(
      'It will fill Plan!H20:Q95 (76 rows × 10 columns); all those cells are empty now.',
    );
    await page.evaluate(() =>
      window.liftLedgerPreview?.workbook.failNextWrite({
        fraction: 0.5,
        code: 'GeneralException',
        message: 'The preview was told to fail this write half-way.',
      }),
    );
    await panel.locator('#readout-insert').click();
    const text = await messageText(panel, 'readout-status');
    expect(text).toBe(
      'Could not write the read-out: nothing was written to Plan!H20:Q95 (The preview was told to fail this write half-way.); every cell was put back and checked. The sheet is as it was.',
    );
    expect(await panel.locator('#readout-status fluent-message-bar').getAttribute('intent')).toBe('error');
    expect(await sheetLook(page, 'Plan', 120, 30)).toEqual(before);
    await panel.locator('#readout-status').scrollIntoViewIfNeeded();
    await screenshot(page, 'panel-safety-write-failed');
    await narrowScreenshot(page, 'panel-safety-write-failed-350', panel, '#readout-status');
    // Written normally afterwards, over the same place.
    await panel.locator('#readout-insert').click();
    expect(await messageText(panel, 'readout-status')).toMatch(/^Wrote the read-out to Plan!H20:Q95/);
  });

  it('writes on a new sheet named after the table’s, or at a selected cell only after listing what is there', async () => {
    await switchSheet(page, 'Checkout test');
    await selectRange(page, 'A3', 'C6');
    await panel.locator('#readout-use-selection').click();
    await panel.locator('label[for="readout-place-sheet"]', { hasText: 'Checkout test read-out' }).waitFor();
    await panel.locator('#readout-place-sheet').click();
    expect(await panel.locator('#readout-place-target').textContent()).toBe(
      'It will fill a new sheet "Checkout test read-out", cells A1:K77 (77 rows × 11 columns); nothing else is touched.',
    );
    await panel.locator('#readout-insert').click();
    expect(await messageText(panel, 'readout-status')).toMatch(
      /^Wrote the read-out to 'Checkout test read-out'!A1:K77 \(live formulas\)/,
    );
    await page.locator('#tabs button[data-sheet-name="Checkout test read-out"][aria-selected="true"]').waitFor();
    const mean = await readBlock(page, 'Checkout test read-out', 'B3', 1, 1);
    expect(typeof mean[0]?.[0]).toBe('number');

    // At a cell the user selects: the cells there that hold something (the demo's metrics, chart tables and
    // the read-out inserted above) are listed before anything is written.
    await switchSheet(page, 'Checkout test');
    await selectRange(page, 'A3', 'C6');
    await panel.locator('#readout-use-selection').click();
    await panel.locator('#readout-place-cell').click();
    await selectCell(page, 'H5');
    await panel.locator('#readout-place-use-selection').click();
    await panel.locator('#readout-place-target fluent-message-bar[intent="warning"]').waitFor();
    expect(await panel.locator('#readout-place-target').textContent()).toMatch(
      /^It will fill 'Checkout test'!H5:R81 \(77 rows × 11 columns\)\. \d+ of those cells hold something \(H5, I5, P5, Q5, R5, H6 and \d+ more\): you will be asked before anything is written over\.$/,
    );
    const before = await sheetLook(page, 'Checkout test', 100, 20);
    await panel.locator('#readout-insert').click();
    await panel.locator('#readout-status fluent-message-bar[intent="warning"]').waitFor();
    expect(await panel.locator('#readout-status').textContent()).toMatch(
      /^'Checkout test'!H5:R81 is not empty \(H5, I5, P5, Q5, R5, H6 and \d+ more\)\. Write the read-out over it\?/,
    );
    await panel.locator('#cancel-overwrite').click();
    expect(await panel.locator('#readout-status').textContent()).toBe('Nothing was written.');
    expect(await sheetLook(page, 'Checkout test', 100, 20)).toEqual(before);
    await panel.locator('#readout-place-right').click();
  });

  it('shows the mapping with its headings, flags a count typed as text, and refuses to compute on it', async () => {
    await switchSheet(page, 'Past tests');
    await typeTable(page, 'Past tests', 'E3', [
      ['Day', 'Visitors', 'Conversions'],
      [1, 10000, 412],
      [2, '10,050', 455],
      [3, 9980, 430],
    ]);
    const typed = await readBlock(page, 'Past tests', 'F5', 1, 1);
    expect(typed[0]?.[0]).toBe('10,050');
    await selectRange(page, 'E3', 'G6');
    await panel.locator('#readout-use-selection').click();
    await panel.locator('#readout-flags').waitFor();
    expect(await panel.locator('#readout-mapping-summary').textContent()).toBe(
      'Visitors: column F ("Visitors"); conversions: column G ("Conversions"); names: none (A, B, C…).',
    );
    expect(await panel.locator('#readout-flags li').allTextContents()).toEqual([
      'F5: visitors is the text "10,050", not a number: type it as a number (or use =VALUE())',
    ]);
    expect(await panel.locator('#readout-problems').textContent()).toBe(
      'The table has problems: row 3: visitors is the text "10,050", not a number: type it as a number (or use =VALUE()).',
    );
    expect(await panel.locator('#readout-insert').getAttribute('disabled')).not.toBeNull();
    expect(await panel.locator('#readout-place-group').getAttribute('hidden')).not.toBeNull();
    await panel.locator('#readout-flags').scrollIntoViewIfNeeded();
    await screenshot(page, 'panel-safety-text-cell');
    await narrowScreenshot(page, 'panel-safety-text-cell-350', panel, '#readout-flags');

    // Without headings, the mapping is a guess from the numbers: nothing is written until it is confirmed.
    await typeTable(page, 'Past tests', 'E10', [
      ['A', 14, 10000, 412],
      ['B', 14, 10050, 455],
    ]);
    await selectRange(page, 'E10', 'H11');
    await panel.locator('#readout-use-selection').click();
    await panel.locator('#readout-guess').waitFor();
    expect(await panel.locator('#readout-guess').textContent()).toContain(
      'These columns were guessed from the numbers alone',
    );
    expect(await panel.locator('#readout-insert').getAttribute('disabled')).not.toBeNull();
    await panel.locator('#readout-confirm-mapping').click();
    await panel.locator('#readout-guess').waitFor({ state: 'detached' });
    expect(await panel.locator('#readout-insert').getAttribute('disabled')).toBeNull();
    expect(preview.pageErrors).toEqual([]);
  });
});

export type { Cell };
