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
import { createOfficeWorkbook } from '../../taskpane/workbook/officeWorkbook';

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
      const range = context.workbook.worksheets
        .getItem('Data')
        .getRange('A1:B3')
        .load('address, values, formulas, rowCount, columnCount');
      const quoted = context.workbook.worksheets.getItem('Past tests').getRange('B2:C3').load('address');
      await context.sync();
      return {
        address: range.address,
        values: range.values,
        formulas: range.formulas,
        rows: range.rowCount,
        columns: range.columnCount,
        quoted: quoted.address,
      };
    });
    expect(result).toEqual({
      address: 'Data!A1:B3',
      values: [
        ['Visitors', 'Conversions'],
        [100, 7],
        [120, 15],
      ],
      formulas: [
        ['Visitors', 'Conversions'],
        [100, 7],
        [120, 15],
      ],
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
    const foreign = vm.runInNewContext('({ rows: [["=ABTEST.POSTERIOR_MEAN(B2:B3, A2:A3)"]], Array })') as {
      rows: unknown[][];
      Array: ArrayConstructor;
    };
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

describe('the stand-in as the panel’s workbook layer uses it (the same code as in Excel)', () => {
  let book: PreviewWorkbook;
  let office: ReturnType<typeof createOfficeStandIn>;
  beforeEach(() => {
    book = PreviewWorkbook.create(sheets());
    office = createOfficeStandIn(book, realm);
  });
  afterEach(() => book.hf.destroy());

  const layer = () =>
    createOfficeWorkbook(
      (batch) => office.Excel.run(batch as never) as never,
      (set, version) => office.Office.context.requirements.isSetSupported(set, version),
    );

  /** Inputs, number formats, styles and widths of a block, to compare before and after. */
  const look = (sheet: number, rows: number, columns: number): string =>
    JSON.stringify({
      cells: Array.from({ length: rows }, (_, r) =>
        Array.from({ length: columns }, (_, c) => [
          book.cell(sheet, r, c).input,
          book.numberFormat(sheet, r, c) ?? 'General',
          book.style(sheet, r, c) ?? {},
        ]),
      ),
      widths: Array.from({ length: columns }, (_, c) => book.columnWidth(sheet, c) ?? null),
    });

  it('refuses a single value spread over a larger range, with Excel’s message', async () => {
    const error = await office.Excel.run(async (context) => {
      context.workbook.worksheets.getItem('Data').getRange('D1:D3').formulas = [['']];
      await context.sync();
    }).catch((e: unknown) => e as { code: string; message: string });
    expect(error).toMatchObject({ code: 'InvalidArgument' });
    expect((error as { message: string }).message).toMatch(
      /^The number of rows or columns in the input array doesn't match the size or dimensions of the range\./,
    );
  });

  it('answers requirement-set questions for the subset it implements', () => {
    const ask = office.Office.context.requirements.isSetSupported;
    expect([
      ask('ExcelApi', '1.1'),
      ask('ExcelApi', '1.12'),
      ask('ExcelApi', '1.18'),
      ask('ExcelApi', '1.19'),
      ask('WordApi', '1.1'),
    ]).toEqual([true, true, true, false, false]);
    // `?api=1.16` on the preview's address: an Excel without notes (Worksheet.notes is ExcelApi 1.18).
    const older = createOfficeStandIn(book, realm, '1.16').Office.context.requirements.isSetSupported;
    expect([older('ExcelApi', '1.16'), older('ExcelApi', '1.18')]).toEqual([true, false]);
  });

  it('writes a block, then undoes a write made to fail half-way: contents, formats, fills and widths come back', async () => {
    // the user's own cells in D1:E3, with a format, a fill and a column width
    book.write(0, 0, 3, [
      ['note', 0.5],
      ['', ''],
      ['', 7],
    ]);
    book.setNumberFormat(0, 0, 4, '0.0%');
    book.setStyle(0, 2, 4, { fill: '#FFF2CC', bold: true });
    book.setColumnWidth(0, 3, 150);
    const before = look(0, 4, 6);
    const block = {
      sheet: 'Data',
      topLeft: 'D1',
      cells: [
        ['Posterior mean', '=ABTEST.POSTERIOR_MEAN(B2:B3, A2:A3)'],
        ['', ''],
        ['Split', 'checked'],
      ],
      numberFormats: [
        [null, '0.00%'],
        [null, '0.00%'],
        [null, null],
      ],
      styles: [{ row: 2, column: 0, columnCount: 2, style: { fillColor: '#F4CCCC', bold: true } }],
      autofit: true,
      overwrite: [
        { address: 'D1', content: 'note' },
        { address: 'E1', content: 0.5 },
        { address: 'E3', content: 7 },
      ],
    };
    book.failNextWrite({ fraction: 0.5, code: 'GeneralException', message: 'The preview was told to fail here.' });
    const failed = await layer().writeBlock(block);
    expect(failed).toEqual({
      kind: 'failed',
      address: 'Data!D1:E3',
      code: 'GeneralException',
      message:
        'nothing was written to Data!D1:E3 (The preview was told to fail here.); every cell was put back and checked',
      restored: true,
      unrestored: [],
    });
    expect(look(0, 4, 6)).toBe(before);
    // the same write, not made to fail: (1 + 7)/(2 + 100) in E1, its spill in E2, the fill on D3:E3
    expect(await layer().writeBlock(block)).toEqual({ kind: 'written', address: 'Data!D1:E3' });
    expect(book.cell(0, 0, 4).value).toBeCloseTo(8 / 102, 15);
    expect(book.cell(0, 1, 4).text).toBe(`${((16 / 122) * 100).toFixed(2)}%`);
    expect(book.style(0, 2, 3)).toMatchObject({ fill: '#F4CCCC', bold: true });
  });

  it('finds empty places beside a table and writes on a new sheet, deleted again after a failure', async () => {
    const places = await layer().findPlaces({
      sheet: 'Data',
      table: 'A1:B3',
      rowCount: 4,
      columnCount: 3,
      newSheetName: 'Data read-out',
    });
    expect(places).toEqual({ right: 'D1', below: 'A5', newSheet: 'Data read-out' });
    const block = {
      sheet: 'Data read-out',
      newSheet: true,
      topLeft: 'A1',
      cells: [['Mean', '=ABTEST.POSTERIOR_MEAN(Data!B2:B3, Data!A2:A3)']],
    };
    book.failNextWrite({ fraction: 0.5, code: 'GeneralException', message: 'told to fail' });
    expect(await layer().writeBlock(block)).toMatchObject({ kind: 'failed', restored: true });
    expect(book.sheetNames()).toEqual(['Data', 'Past tests']);
    expect(await layer().writeBlock(block)).toEqual({ kind: 'written', address: "'Data read-out'!A1:B1" });
    expect(book.sheetNames()).toEqual(['Data', 'Past tests', 'Data read-out']);
    expect(book.hf.getSheetName(book.activeSheet)).toBe('Data read-out');
    expect(book.cell(book.sheetId('Data read-out') as number, 0, 1).value).toBeCloseTo(8 / 102, 15);
  });

  it('names the formula cell of a spilled result, and reads values as JSON', async () => {
    book.write(0, 0, 3, [['=ABTEST.POSTERIOR_MEAN(B2:B3, A2:A3)']]);
    const out = await office.Excel.run(async (context) => {
      const sheet = context.workbook.worksheets.getItem('Data');
      const child = sheet.getRange('D2').getSpillParentOrNullObject();
      const plain = sheet.getRange('A2').getSpillParentOrNullObject();
      const json = sheet.getRange('A1:B2').load('valuesAsJson');
      await context.sync();
      return { child: [child.isNullObject, child.address], plain: plain.isNullObject, json: json.valuesAsJson };
    });
    expect(out.child).toEqual([false, 'Data!D1']);
    expect(out.plain).toBe(true);
    expect(out.json).toEqual([
      [
        { type: 'String', basicType: 'String', basicValue: 'Visitors' },
        { type: 'String', basicType: 'String', basicValue: 'Conversions' },
      ],
      [
        { type: 'Double', basicType: 'Double', basicValue: 100 },
        { type: 'Double', basicType: 'Double', basicValue: 7 },
      ],
    ]);
  });

  /** A copy request for the whole of 'Data' with one result frozen (the rules of the panel's plan, by hand). */
  const copyRequest = (notes: boolean): import('../../taskpane/workbook/workbook').CopyRequest => ({
    source: 'Data',
    newSheet: 'Data (shared)',
    shown: { sheet: 'Data', range: 'A1:D3', formulaCells: [], charts: 0, sheetNames: [], tooLarge: false },
    headerRows: 1,
    problem: () => null,
    edits: (scan, copyFormula) => {
      const cell = scan.formulaCells[0];
      if (!cell) throw new Error('no formula found');
      const at = 'D3'; // D2 of the source, one header row further down
      return {
        values: [{ address: 'D3:D4', values: cell.values }],
        texts: [
          { address: 'A1', text: 'Frozen copy', bold: true },
          ...(notes ? [] : [{ address: 'E3', text: copyFormula(at) }]),
        ],
        notes: notes ? [{ address: at, text: copyFormula(at) }] : [],
      };
    },
  });

  it('copies a sheet after a header row, freezes a spilled result and keeps its formula in a note; the source stays live', async () => {
    book.write(0, 1, 3, [['=ABTEST.POSTERIOR_MEAN(B2:B3, A2:A3)']]);
    const shown = await layer().scanSheet('Data');
    expect(shown.formulaCells.map((c) => [c.address, c.result])).toEqual([['D2', 'D2:D3']]);
    const out = await layer().copySheet({ ...copyRequest(true), shown });
    expect(out).toMatchObject({ kind: 'written', sheet: 'Data (shared)', notes: 1 });
    const copy = book.sheetId('Data (shared)') as number;
    // The copy's formula reads its own rows, moved down by the header row (HyperFormula adjusts it on insert).
    expect(book.notes(copy)).toEqual({ D3: '=ABTEST.POSTERIOR_MEAN(B3:B4, A3:A4)' });
    expect(book.cell(copy, 0, 0).input).toBe('Frozen copy');
    // Closed form (1 + x)/(2 + n) of the fixture: (1 + 7)/(2 + 100) and (1 + 15)/(2 + 120), now plain values.
    expect([book.cell(copy, 2, 3), book.cell(copy, 3, 3)].map((c) => [c.input, c.value])).toEqual([
      [String(8 / 102), 8 / 102],
      [String(16 / 122), 16 / 122],
    ]);
    expect(book.cell(0, 1, 3).input).toBe('=ABTEST.POSTERIOR_MEAN(B2:B3, A2:A3)');
  });

  it('on an Excel without notes (ExcelApi 1.16) says so in its capabilities, and a copy asked with notes fails with NotSupported and leaves no copy; without notes it is made', async () => {
    office = createOfficeStandIn(book, realm, '1.16');
    book.write(0, 1, 3, [['=ABTEST.POSTERIOR_MEAN(B2:B3, A2:A3)']]);
    expect(layer().capabilities()).toEqual({ notes: false });
    const shown = await layer().scanSheet('Data');
    const refused = await layer().copySheet({ ...copyRequest(true), shown });
    expect(refused).toMatchObject({ kind: 'failed', code: 'NotSupported', restored: true });
    expect((refused as { message: string }).message).toMatch(/cannot add notes \(Excel JavaScript API 1\.18\)/);
    expect(book.sheetNames()).toEqual(['Data', 'Past tests']);
    const out = await layer().copySheet({ ...copyRequest(false), shown });
    expect(out).toMatchObject({ kind: 'written', notes: 0 });
    const copy = book.sheetId('Data (shared)') as number;
    // The formula as text beside its value (written as text, so it does not compute), and no note anywhere.
    expect(book.cell(copy, 2, 4).value).toBe('=ABTEST.POSTERIOR_MEAN(B3:B4, A3:A4)');
    expect(book.notes(copy)).toEqual({});
    expect([book.cell(copy, 2, 3).input, book.cell(copy, 2, 3).value]).toEqual([String(8 / 102), 8 / 102]);
  });

  it('an Excel without notes refuses notes.add at sync with ApiNotFound, as an unknown API fails', async () => {
    office = createOfficeStandIn(book, realm, '1.16');
    const code = await codeOf(
      office.Excel.run(async (context) => {
        context.workbook.worksheets.getItem('Data').notes.add('A1', 'a note');
        await context.sync();
      }),
    );
    expect(code).toBe('ApiNotFound');
    expect(book.notes(0)).toEqual({});
  });
});
