/**
 * The preview's grid behaves as a spreadsheet where issue #11 found it did not (Debian's chromium):
 * a click lands on the cell under the pointer even where text runs over it; text stops running at a
 * filled cell; Ctrl+Z takes back the last edits; a formula reaching past the preview's sheet size says
 * why it shows #NAME?; a spilling formula that fails shows its error in one cell; a number too wide
 * for its column is rounded or shown as "####", never cut with "…"; each sheet keeps its own scroll
 * position. The demo workbook is invented data (the garden-supply shop).
 */
import type { Page } from 'playwright-core';
import {
  cellLocator,
  enterCell,
  openPreview,
  readCell,
  screenshot,
  selectCell,
  switchSheet,
  type OpenPreview,
} from './previewHelpers';

async function cellInput(page: Page, sheet: string, address: string): Promise<string> {
  return page.evaluate(
    ([s, a]) => {
      const handle = window.liftLedgerPreview;
      if (!handle) throw new Error('the preview is not ready');
      const m = /^([A-Z]+)([0-9]+)$/.exec(String(a));
      if (!m) throw new Error(`bad address ${a}`);
      const col = [...(m[1] as string)].reduce((n, ch) => n * 26 + ch.charCodeAt(0) - 64, 0) - 1;
      return handle.workbook.cell(handle.workbook.sheetId(String(s)) as number, Number(m[2]) - 1, col).input;
    },
    [sheet, address] as const,
  );
}

describe('the preview grid', () => {
  let preview: OpenPreview;
  let page: Page;
  beforeAll(async () => {
    preview = await openPreview({ panel: false });
    page = preview.page;
  });
  afterAll(async () => {
    await preview?.cleanup();
  });

  it('selects the cell under the pointer where text runs over it; typing there leaves the text’s cell alone; Ctrl+Z takes it back', async () => {
    await switchSheet(page, 'Checkout test');
    const decision = await cellInput(page, 'Checkout test', 'B47');
    expect(decision).toMatch(/^=ABTEST\.DECISION\(/);
    // B47's text runs on over C47…; E47 lies under it
    expect(await cellLocator(page, 'B47').getAttribute('class')).toContain('overflow');
    await selectCell(page, 'E47');
    expect(await page.locator('#name-box').innerText()).toBe('E47');
    await page.keyboard.type('note');
    await page.keyboard.press('Enter');
    expect(await cellInput(page, 'Checkout test', 'E47')).toBe('note');
    expect(await cellInput(page, 'Checkout test', 'B47')).toBe(decision);
    await page.keyboard.press('Control+z');
    expect(await cellInput(page, 'Checkout test', 'E47')).toBe('');
    expect(await page.locator('#formula-message').innerText()).toBe('Undid the last edit of E47.');
  });

  it('takes back a typed-over formula with Ctrl+Z', async () => {
    await switchSheet(page, 'Checkout test');
    const formula = await cellInput(page, 'Checkout test', 'B11');
    const value = (await readCell(page, 'Checkout test', 'B11')).value;
    await selectCell(page, 'B11');
    await page.keyboard.type('5');
    await page.keyboard.press('Enter');
    expect((await readCell(page, 'Checkout test', 'B11')).value).toBe(5);
    await page.keyboard.press('Control+z');
    expect(await cellInput(page, 'Checkout test', 'B11')).toBe(formula);
    expect((await readCell(page, 'Checkout test', 'B11')).value).toBe(value);
    expect(await page.locator('#name-box').innerText()).toBe('B11');
  });

  it('stops running text at a filled cell', async () => {
    await switchSheet(page, 'Checkout test');
    const runOn = async (): Promise<number> =>
      cellLocator(page, 'B47')
        .locator('.cell-text')
        .evaluate((span) => span.getBoundingClientRect().width);
    const widths = await page.evaluate(() => {
      const book = window.liftLedgerPreview?.workbook;
      if (!book) throw new Error('the preview is not ready');
      return [1, 2, 3].map((c) => book.columnWidth(0, c) ?? 92);
    });
    await page.evaluate(() => {
      const book = window.liftLedgerPreview?.workbook;
      if (!book) throw new Error('the preview is not ready');
      book.setStyle(0, 46, 3, { fill: '#DDEBF7' });
      book.touch();
    });
    // B and C only (5 px padding on each side of the cell)
    expect(await runOn()).toBeCloseTo((widths[0] as number) + (widths[1] as number) - 10, 0);
    await cellLocator(page, 'B47').scrollIntoViewIfNeeded();
    await screenshot(page, 'grid-overflow-stops-at-fill');
    await page.evaluate(() => {
      const book = window.liftLedgerPreview?.workbook;
      if (!book) throw new Error('the preview is not ready');
      book.setStyle(0, 46, 3, { fill: '' });
      book.touch();
    });
  });

  it('says why a formula reaching past the preview’s rows shows #NAME?', async () => {
    await switchSheet(page, 'Plan');
    await enterCell(page, 'D2', '=SUM(A1:A2500)');
    const cell = await readCell(page, 'Plan', 'D2');
    expect(cell.value).toBe('#NAME?');
    expect(cell.message).toBe(
      "This preview's sheets have 2,000 rows and 200 columns (Excel's have 1,048,576 rows and 16,384 columns); the formula refers to A2500, beyond them. It works in Excel.",
    );
    await selectCell(page, 'D2');
    expect(await page.locator('#formula-message').innerText()).toContain('the formula refers to A2500');
  });

  it('shows the error of a spilling formula in its own cell only', async () => {
    await switchSheet(page, 'Checkout test');
    await enterCell(page, 'B5', '12.5');
    expect(await cellLocator(page, 'B11').innerText()).toBe('#VALUE!');
    expect(await cellLocator(page, 'B12').innerText()).toBe('');
    expect(await cellLocator(page, 'B13').innerText()).toBe('');
    await screenshot(page, 'grid-error-in-one-cell');
    await enterCell(page, 'B5', '10388');
    expect(typeof (await readCell(page, 'Checkout test', 'B12')).value).toBe('number');
  });

  it('rounds a General number to its column and shows "####" for a formatted one that does not fit, never "…"', async () => {
    await switchSheet(page, 'Plan');
    await page.evaluate(() => {
      const book = window.liftLedgerPreview?.workbook;
      if (!book) throw new Error('the preview is not ready');
      const plan = book.sheetId('Plan') as number;
      book.setColumnWidth(plan, 4, 60);
      book.setColumnWidth(plan, 5, 36);
      book.setNumberFormat(plan, 5, 5, '0.000%');
    });
    await enterCell(page, 'E6', '=1/3');
    await enterCell(page, 'F6', '=2/3');
    // (60 − 10) / 7.5 ≈ 6 characters: 0.3333; 66.667% needs 7 characters in a 36 px column
    expect(await cellLocator(page, 'E6').innerText()).toBe('0.3333');
    expect(await cellLocator(page, 'F6').innerText()).toBe('###');
    expect(await cellLocator(page, 'E6').getAttribute('title')).toBe('0.33333333');
    const texts = await page.locator('#grid td.kind-number').allInnerTexts();
    expect(texts.some((t) => t.includes('…'))).toBe(false);
    await screenshot(page, 'grid-rounded-numbers');
  });

  it('keeps each sheet’s own scroll position', async () => {
    const scroller = page.locator('#grid-scroller');
    await switchSheet(page, 'Checkout test');
    await scroller.evaluate((el) => {
      el.scrollTop = 900;
    });
    await switchSheet(page, 'Plan');
    expect(await scroller.evaluate((el) => el.scrollTop)).toBe(0);
    await switchSheet(page, 'Checkout test');
    expect(await scroller.evaluate((el) => el.scrollTop)).toBe(900);
    expect(preview.pageErrors).toEqual([]);
  });
});
