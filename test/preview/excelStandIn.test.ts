/**
 * The preview's Office/Excel stand-in (preview/src/excelStandIn.ts) on a small workbook, headless: the
 * agreed Excel API subset the side panel uses, with Office.js's batching (commands run at sync, loaded
 * properties readable after it, failures reject sync with a string `code`). Functions come from the
 * bridge fixture (test/preview/fixtures), whose POSTERIOR_MEAN is the closed form (1 + x)/(2 + n)
 * (conjugate Beta posterior mean, common practice).
 */
import * as path from 'path';
import { createOfficeStandIn } from '../../preview/src/excelStandIn';
import { PreviewWorkbook } from '../../preview/src/previewWorkbook';
import type { DemoSheet } from '../../preview/src/demoWorkbook';
import { loadAndRegister } from './loadBundle';

loadAndRegister(path.join(__dirname, 'fixtures', 'functions.js'), path.join(__dirname, 'fixtures', 'functions.json'));

const sheets = (): DemoSheet[] => [
  {
    name: 'Data',
    cells: [
      ['Visitors', 'Conversions'],
      [100, 7],
      [120, 15],
    ],
    formats: {},
    columnWidths: {},
  },
  { name: 'Past tests', cells: [['note'], [null, 1, 2], [null, 3, 4]], formats: {}, columnWidths: {} },
];

const realm = { Error, Promise, Array };

/** Runs a batch and returns the rejection's code (or 'resolved'). */
async function codeOf(run: Promise<unknown>): Promise<string> {
  try {
    await run;
    return 'resolved';
  } catch (error) {
    return String((error as { code?: unknown }).code);
  }
}

describe('Office/Excel stand-in of the preview', () => {
  let book: PreviewWorkbook;
  let office: ReturnType<typeof createOfficeStandIn>;
  beforeEach(() => {
    book = PreviewWorkbook.create(sheets());
    office = createOfficeStandIn(book, realm);
  });
  afterEach(() => book.hf.destroy());

  it('Office.onReady resolves with the Excel host and calls its callback', async () => {
    const seen: string[] = [];
    const info = await office.Office.onReady((i) => seen.push(i.host));
    expect(info.host).toBe('Excel');
    expect(seen).toEqual(['Excel']);
  });

  it('loads address, values, formulas and sizes after sync, with sheet-qualified addresses', async () => {
    const result = await office.Excel.run(async (context) => {
      const range = context.workbook.worksheets.getItem('Data').getRange('A1:B3').load('address, values, formulas, rowCount, columnCount');
      const quoted = context.workbook.worksheets.getItem('Past tests').getRange('B2:C3').load('address');
      await context.sync();
      return { address: range.address, values: range.values, formulas: range.formulas, rows: range.rowCount, columns: range.columnCount, quoted: quoted.address };
    });
    expect(result).toEqual({
      address: 'Data!A1:B3',
      values: [['Visitors', 'Conversions'], [100, 7], [120, 15]],
      formulas: [['Visitors', 'Conversions'], [100, 7], [120, 15]],
      rows: 3,
      columns: 2,
      quoted: "'Past tests'!B2:C3",
    });
  });

  it('refuses to read a property that was not loaded, with code PropertyNotLoaded', async () => {
    const code = await codeOf(
      office.Excel.run(async (context) => {
        const range = context.workbook.worksheets.getItem('Data').getRange('A1');
        await context.sync();
        return range.values;
      }),
    );
    expect(code).toBe('PropertyNotLoaded');
  });

  it('writes formulas that recalculate and spill, and reads them back', async () => {
    const out = await office.Excel.run(async (context) => {
      const sheet = context.workbook.worksheets.getItem('Data');
      sheet.getRange('D2').formulas = [['=ABTEST.POSTERIOR_MEAN(B2:B3, A2:A3)']];
      const spill = sheet.getRange('D2:D3').load('values, formulas');
      await context.sync();
      return { values: spill.values, formulas: spill.formulas };
    });
    // (1 + 7)/(2 + 100) and (1 + 15)/(2 + 120)
    expect(out.values[0]?.[0]).toBeCloseTo(8 / 102, 15);
    expect(out.values[1]?.[0]).toBeCloseTo(16 / 122, 15);
    expect(out.formulas[0]?.[0]).toBe('=ABTEST.POSTERIOR_MEAN(B2:B3, A2:A3)');
  });

  it('shows errors as their text in values, and constants written through values', async () => {
    const values = await office.Excel.run(async (context) => {
      const sheet = context.workbook.worksheets.getItem('Data');
      sheet.getRange('A3').values = [[12.5]];
      sheet.getRange('E1').values = [['label']];
      const range = sheet.getRange('D2').load('values');
      sheet.getRange('D2').formulas = [['=ABTEST.POSTERIOR_MEAN(B2:B3, A2:A3)']];
      const label = sheet.getRange('E1').load('values');
      await context.sync();
      return [range.values, label.values];
    });
    // the load was queued before the formula was written, so it sees the blank cell, as Office.js would
    expect(values[0]).toEqual([['']]);
    expect(values[1]).toEqual([['label']]);
    const view = book.cell(0, 1, 3);
    expect(view.value).toBe('#VALUE!');
    expect(view.message).toBe('visitors, item 2: 12.5 is not a whole number');
  });

  it('accepts 2-D arrays made in another realm (the panel’s iframe) and hands back arrays of the caller’s realm', async () => {
    const vm = await import('vm');
    const foreign = vm.runInNewContext('({ rows: [["=ABTEST.POSTERIOR_MEAN(B2:B3, A2:A3)"]], Array })') as { rows: unknown[][]; Array: ArrayConstructor };
    expect(foreign.rows instanceof Array).toBe(false);
    const foreignOffice = createOfficeStandIn(book, { Error, Promise, Array: foreign.Array });
    const loaded = await foreignOffice.Excel.run(async (context) => {
      const range = context.workbook.worksheets.getItem('Data').getRange('D2');
      range.formulas = foreign.rows;
      const read = context.workbook.worksheets.getItem('Data').getRange('D2:D3').load('values');
      await context.sync();
      return read.values;
    });
    expect(loaded instanceof foreign.Array).toBe(true);
    expect(loaded[0] instanceof foreign.Array).toBe(true);
    // (1 + 7)/(2 + 100), (1 + 15)/(2 + 120)
    expect(loaded[0]?.[0]).toBeCloseTo(8 / 102, 15);
    expect(loaded[1]?.[0]).toBeCloseTo(16 / 122, 15);
  });

  it('runs a sync as one batch: many 1×1 writes, one redraw, and a load in the batch sees the writes', async () => {
    let redraws = 0;
    book.on('cells', () => {
      redraws += 1;
    });
    const values = await office.Excel.run(async (context) => {
      const sheet = context.workbook.worksheets.getItem('Data');
      for (let r = 0; r < 20; r += 1) sheet.getRange(`F${r + 1}`).formulas = [[r === 0 ? '=SUM(G1:G20)' : '']];
      for (let r = 0; r < 20; r += 1) sheet.getRange(`G${r + 1}`).values = [[r + 1]];
      const total = sheet.getRange('F1').load('values');
      sheet.getRange('G1').values = [[100]];
      const after = sheet.getRange('F1').load('values');
      await context.sync();
      return [total.values, after.values];
    });
    // 1 + 2 + … + 20 = 210; with G1 = 100 instead of 1: 309
    expect(values).toEqual([[[210]], [[309]]]);
    expect(redraws).toBe(1);
  });

  it('rejects sync with InvalidArgument for a wrongly shaped write and ItemNotFound for a missing sheet', async () => {
    expect(
      await codeOf(
        office.Excel.run(async (context) => {
          context.workbook.worksheets.getItem('Data').getRange('A1:B2').values = [[1, 2, 3]];
          await context.sync();
        }),
      ),
    ).toBe('InvalidArgument');
    expect(
      await codeOf(
        office.Excel.run(async (context) => {
          context.workbook.worksheets.getItem('Nope').getRange('A1').load('values');
          await context.sync();
        }),
      ),
    ).toBe('ItemNotFound');
    expect(
      await codeOf(
        office.Excel.run(async (context) => {
          context.workbook.worksheets.getItem('Data').getRange('Data!A1').load('values');
          await context.sync();
        }),
      ),
    ).toBe('InvalidArgument');
  });

  it('derives ranges with getCell, getOffsetRange, getResizedRange and knows their worksheet', async () => {
    const out = await office.Excel.run(async (context) => {
      const base = context.workbook.worksheets.getItem('Past tests').getRange('B2:C3');
      const cell = base.getCell(1, 1).load('address, values');
      const offset = base.getOffsetRange(1, 0).load('address');
      const resized = base.getResizedRange(2, -1).load('address');
      const sheet = base.worksheet.load('name');
      await context.sync();
      return [cell.address, cell.values, offset.address, resized.address, sheet.name];
    });
    expect(out).toEqual(["'Past tests'!C3", [[4]], "'Past tests'!B3:C4", "'Past tests'!B2:B5", 'Past tests']);
  });

  it('follows the selection and fires onSelectionChanged until the handler is removed', async () => {
    const seen: (string | undefined)[] = [];
    const registration = await office.Excel.run(async (context) => {
      const handle = context.workbook.onSelectionChanged.add((args) => {
        seen.push(args?.address);
      });
      await context.sync();
      return handle;
    });
    book.select({ sheet: 1, row: 1, col: 1, rows: 2, columns: 2 });
    await new Promise((resolve) => setTimeout(resolve, 5));
    const selected = await office.Excel.run(async (context) => {
      const range = context.workbook.getSelectedRange().load('address');
      const active = context.workbook.worksheets.getActiveWorksheet().load('name');
      await context.sync();
      return [range.address, active.name];
    });
    expect(selected).toEqual(["'Past tests'!B2:C3", 'Past tests']);
    expect(seen).toEqual(["'Past tests'!B2:C3"]);
    registration.remove();
    book.select({ sheet: 0, row: 0, col: 0, rows: 1, columns: 1 });
    await new Promise((resolve) => setTimeout(resolve, 5));
    expect(seen).toHaveLength(1);
  });

  it('sets number formats, fonts, fills and column widths', async () => {
    const formats = await office.Excel.run(async (context) => {
      const range = context.workbook.worksheets.getItem('Data').getRange('A2:A3');
      range.numberFormat = [['0.00%'], ['0.0']];
      range.format.font.bold = true;
      range.format.font.color = '#204060';
      range.format.fill.color = '#eef4ee';
      range.format.autofitColumns();
      const read = range.load('numberFormat');
      await context.sync();
      return read.numberFormat;
    });
    expect(formats).toEqual([['0.00%'], ['0.0']]);
    expect(book.cell(0, 1, 0).text).toBe('10000.00%');
    expect(book.cell(0, 2, 0).text).toBe('120.0');
    expect(book.style(0, 1, 0)).toEqual({ bold: true, color: '#204060', fill: '#eef4ee' });
    expect(book.columnWidth(0, 0)).toBeGreaterThan(16);
  });

  it('adds a chart with a title, name and position', async () => {
    await office.Excel.run(async (context) => {
      const sheet = context.workbook.worksheets.getItem('Data');
      const chart = sheet.charts.add('XYScatterSmoothNoMarkers', sheet.getRange('A1:B3'), 'Columns');
      chart.title.text = 'Posterior densities';
      chart.name = 'Densities';
      chart.setPosition('D2', 'J16');
      await context.sync();
    });
    const [chart] = book.charts(0);
    expect(chart).toMatchObject({
      type: 'XYScatterSmoothNoMarkers',
      title: 'Posterior densities',
      name: 'Densities',
      source: { sheet: 0, row: 0, col: 0, rows: 3, columns: 2 },
      position: { from: { row: 1, col: 3 }, to: { row: 15, col: 9 } },
    });
    expect(
      await codeOf(
        office.Excel.run(async (context) => {
          const sheet = context.workbook.worksheets.getItem('Data');
          sheet.charts.add('Pie', sheet.getRange('A1:B3'), 'Columns');
          await context.sync();
        }),
      ),
    ).toBe('InvalidArgument');
  });
});
