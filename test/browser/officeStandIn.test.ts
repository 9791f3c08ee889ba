/**
 * The side panel's view of the preview in chromium: dist/taskpane.html is served with Office's CDN script
 * replaced by the preview's stand-in, so inside the panel's iframe `Office`/`Excel` work on the grid of
 * the parent page (reads, writes that recalculate, selection events, a chart drawn over the grid).
 * Posterior mean checks use the conjugate closed form (1 + x)/(2 + n) (common practice).
 */
import {
  cellLocator,
  openPreview,
  panelFrame,
  readCell,
  screenshot,
  selectCell,
  type OpenPreview,
} from './previewHelpers';

/** The part of the Excel global these checks call (types only; the code runs inside the panel's frame). */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type ExcelLike = { run<T>(batch: (context: any) => Promise<T>): Promise<T> };

describe('Office/Excel stand-in inside the side-panel iframe', () => {
  let preview: OpenPreview;
  beforeAll(async () => {
    preview = await openPreview({ panel: true });
  });
  afterAll(async () => {
    await preview?.cleanup();
  });

  it('serves the panel without Office’s CDN script and with the stand-in globals', async () => {
    const frame = await panelFrame(preview.page);
    const scripts = await frame.evaluate(() => Array.from(document.scripts).map((s) => s.src));
    expect(scripts.some((src) => /appsforoffice\.microsoft\.com/.test(src))).toBe(false);
    expect(scripts.some((src) => /\/preview\/office-stand-in\.js$/.test(src))).toBe(true);
    const info = await frame.evaluate(async () => {
      const office = (window as unknown as { Office: { onReady(): Promise<{ host: string }> } }).Office;
      return (await office.onReady()).host;
    });
    expect(info).toBe('Excel');
  });

  it('reads and writes the grid through Excel.run from the panel, recalculating the sheet', async () => {
    const frame = await panelFrame(preview.page);
    const read = await frame.evaluate(async () => {
      const excel = (window as unknown as { Excel: ExcelLike }).Excel;
      return excel.run(async (context) => {
        const range = context.workbook.worksheets
          .getItem('Checkout test')
          .getRange('B4:C6')
          .load('address, values, rowCount');
        await context.sync();
        return {
          address: range.address as string,
          values: range.values as unknown[][],
          rows: range.rowCount as number,
        };
      });
    });
    expect(read.address).toBe("'Checkout test'!B4:C6");
    expect(read.rows).toBe(3);
    const [visitors, conversions] = [read.values[1]?.[0] as number, read.values[1]?.[1] as number];
    await frame.evaluate(async () => {
      const excel = (window as unknown as { Excel: ExcelLike }).Excel;
      await excel.run(async (context) => {
        context.workbook.worksheets.getItem('Checkout test').getRange('C5').values = [[500]];
        await context.sync();
      });
    });
    // closed form (1 + x)/(2 + n) of the Beta(1 + x, 1 + n − x) posterior mean
    const mean = await readCell(preview.page, 'Checkout test', 'B12');
    expect(mean.value as number).toBeCloseTo((1 + 500) / (2 + visitors), 12);
    expect(conversions).not.toBe(500);
    const failure = await frame.evaluate(async () => {
      const excel = (window as unknown as { Excel: ExcelLike }).Excel;
      try {
        await excel.run(async (context) => {
          context.workbook.worksheets.getItem('No such sheet').getRange('A1').load('values');
          await context.sync();
        });
        return 'resolved';
      } catch (error) {
        return `${(error as { code: string }).code} ${error instanceof Error}`;
      }
    });
    expect(failure).toBe('ItemNotFound true');
  });

  it('tells the panel about selection changes and draws a chart it adds', async () => {
    const { page } = preview;
    const frame = await panelFrame(page);
    await frame.evaluate(async () => {
      const w = window as unknown as { Excel: ExcelLike; seenAddresses: string[] };
      w.seenAddresses = [];
      await w.Excel.run(async (context) => {
        context.workbook.onSelectionChanged.add((args: { address: string }) => {
          w.seenAddresses.push(args.address);
        });
        await context.sync();
      });
    });
    await selectCell(page, 'B23');
    await frame.waitForFunction(() => (window as unknown as { seenAddresses: string[] }).seenAddresses.length > 0);
    expect(await frame.evaluate(() => (window as unknown as { seenAddresses: string[] }).seenAddresses)).toContain(
      "'Checkout test'!B23",
    );

    await frame.evaluate(async () => {
      const excel = (window as unknown as { Excel: ExcelLike }).Excel;
      await excel.run(async (context) => {
        const sheet = context.workbook.worksheets.getItem('Checkout test');
        const chart = sheet.charts.add('XYScatterSmoothNoMarkers', sheet.getRange('K11:N51'), 'Columns');
        chart.title.text = 'Posterior densities (preview test)';
        chart.setPosition('P11', 'W30');
        await context.sync();
      });
    });
    const chart = page.locator('.charts-layer figure.chart');
    await chart.waitFor();
    expect(await chart.locator('figcaption').innerText()).toBe('Posterior densities (preview test)');
    expect(await chart.locator('path').count()).toBe(3);
    await cellLocator(page, 'P11').scrollIntoViewIfNeeded();
    await screenshot(page, 'preview-panel-chart');
    expect(preview.pageErrors).toEqual([]);
  });
});
