/**
 * The Office.js implementation of the side panel's Workbook, on office-addin-mock (OfficeMockObject)
 * proxies over a small in-memory grid (test/taskpane/mockExcel.ts): what is written where, that it is
 * formulas and not values, that arrays always have the range's size, that the area is checked again at
 * the moment of writing, that a failed write is undone — contents, number formats, fonts, fills and
 * column widths — and checked, that places for a read-out are found in empty cells, and that data types
 * (entities, formatted numbers) are read by the text or number they show. Tables are invented (the
 * garden-supply demo).
 */
// The shared stub for office-addin-manifest (test/setup/officeAddinManifestStub.js) is empty, but
// office-addin-mock reads its OfficeApp enum (it compares a mock's host with OfficeApp.Outlook), so
// these tests give it the enum's values (as office-addin-manifest 3 defines them).
jest.mock('office-addin-manifest', () => ({
  OfficeApp: {
    Excel: 'excel',
    OneNote: 'onenote',
    Outlook: 'outlook',
    PowerPoint: 'powerpoint',
    Project: 'project',
    Word: 'word',
  },
}));

import { createOfficeWorkbook, keepText } from '../../taskpane/workbook/officeWorkbook';
import { firstFreeRun, newSheetName } from '../../taskpane/workbook/placement';
import { planBlock, priorBlock, readoutBlock } from '../../taskpane/logic/formulas';
import * as fs from 'fs';
import * as path from 'path';
import { REQUIRED_API, type FormulaBlock } from '../../taskpane/workbook/workbook';
import { mockExcel, type MockExcel } from './mockExcel';

const table = [
  ['Variant', 'Visitors', 'Conversions'],
  ['Green button', 10000, 412],
  ['Orange button', 10050, 455],
  ['Blue button', 9980, 430],
];

const workbookOn = (excel: MockExcel) => createOfficeWorkbook(excel.run, excel.supports);

describe('reading', () => {
  test('readSelection gives the sheet-qualified address, values and formulas', async () => {
    const excel = mockExcel(['Checkout test', 'Sheet2']);
    excel.set('Checkout test', 'A1:C4', table);
    excel.set('Checkout test', 'E1', [['=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4)']]);
    excel.selection = { sheet: 'Checkout test', address: 'A1:C4' };
    const workbook = workbookOn(excel);
    const selection = await workbook.readSelection();
    expect(selection).toMatchObject({
      address: "'Checkout test'!A1:C4",
      sheet: 'Checkout test',
      localAddress: 'A1:C4',
      rowCount: 4,
      columnCount: 3,
      truncated: false,
    });
    expect(selection.values[2]).toEqual(['Orange button', 10050, 455]);
    const formulaCell = await workbook.readRange('E1', 'Checkout test');
    expect(formulaCell.formulas).toEqual([['=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4)']]);
  });

  test('a huge selection is read only as far as the limits (the panel never loads a whole column)', async () => {
    const excel = mockExcel(['Sheet1']);
    excel.set('Sheet1', 'A1:B3', [
      ['Visitors', 'Conversions'],
      [100, 4],
      [120, 6],
    ]);
    excel.selection = { sheet: 'Sheet1', address: 'A1:B20000' };
    const selection = await workbookOn(excel).readSelection({ maxRows: 10 });
    expect(selection).toMatchObject({ localAddress: 'A1:B20000', rowCount: 20000, columnCount: 2, truncated: true });
    expect(selection.values).toHaveLength(10);
    expect(selection.values.slice(0, 3)).toEqual([
      ['Visitors', 'Conversions'],
      [100, 4],
      [120, 6],
    ]);
  });

  test('an entity reads as the text it shows and a formatted number as its number (valuesAsJson, ExcelApi 1.16)', async () => {
    const excel = mockExcel(['Sheet1']);
    excel.set('Sheet1', 'A1:C2', [
      ['Orange button', 10050, 455],
      ['Blue button', 9980, 430],
    ]);
    // The Excel API reference (EntityCellValue): an entity's plain value, as Range.values gives it, is "#VALUE!".
    Object.assign(excel.cell('Sheet1', 'A1'), {
      value: '#VALUE!',
      json: { type: 'Entity', basicType: 'Error', basicValue: '#VALUE!', text: 'Orange button', properties: {} },
    });
    Object.assign(excel.cell('Sheet1', 'B2'), {
      json: { type: 'Double', basicType: 'Double', basicValue: 9980, numberFormat: '#,##0' },
    });
    excel.selection = { sheet: 'Sheet1', address: 'A1:C2' };
    expect((await workbookOn(excel).readSelection()).values).toEqual([
      ['Orange button', 10050, 455],
      ['Blue button', 9980, 430],
    ]);
    // Without ExcelApi 1.16 only the plain values exist: the entity reads as its "#VALUE!".
    excel.apiVersion = '1.12';
    expect((await workbookOn(excel).readSelection()).values[0]).toEqual(['#VALUE!', 10050, 455]);
  });

  test('readRange on an unknown sheet rejects with the Office error code', async () => {
    const excel = mockExcel(['Sheet1']);
    await expect(workbookOn(excel).readRange('A1', 'Nope')).rejects.toMatchObject({ code: 'ItemNotFound' });
  });

  test('activeSheetName reads the active worksheet', async () => {
    const excel = mockExcel(['Plan', 'Other']);
    excel.activeSheet = 'Other';
    await expect(workbookOn(excel).activeSheetName()).resolves.toBe('Other');
  });
});

describe('writing a block', () => {
  const plan = () =>
    planBlock(
      {
        baselineRate: 0.04,
        lift: 0.1,
        threshold: 0.95,
        power: 0.8,
        variants: 2,
        dailyVisitors: 4000,
        trafficShare: 1,
        classicAlpha: 0.05,
      },
      'B2',
      'Plan',
    );

  test('the plan lands as formulas where asked, with number formats and bold labels; arrays have the range size', async () => {
    const excel = mockExcel(['Plan']);
    const { block, cells } = plan();
    const before = excel.syncCalls;
    const outcome = await workbookOn(excel).writeBlock(block);
    expect(outcome).toEqual({ kind: 'written', address: 'Plan!B2:C16' });
    // one sync to read the area, one to write it
    expect(excel.syncCalls - before).toBe(2);
    // contents and number formats go as one full-size array each (no 1×1 array spread over a range)
    expect(excel.writeLog.filter((w) => /^(formulas|values|numberFormat) /.test(w))).toEqual([
      'formulas Plan!B2:C16',
      'numberFormat Plan!B2:C16',
    ]);
    expect(excel.cell('Plan', 'B2').formula).toBe('Test plan (Lift Ledger)');
    expect(excel.cell('Plan', 'B2').bold).toBe(true);
    expect(excel.cell('Plan', 'C3').formula).toBe(0.04);
    expect(excel.cell('Plan', 'C3').numberFormat).toBe('0.00%');
    expect(cells.visitorsPerVariant).toBe('C12');
    expect(excel.cell('Plan', cells.visitorsPerVariant as string).formula).toBe(
      '=ABTEST.VISITORS_NEEDED(C3,C4,C11,C6)',
    );
    expect(excel.cell('Plan', cells.days as string).formula).toBe('=7*C14');
    // labels are constants, results are formulas: no pasted numbers
    const column = excel.formulas('Plan', 'C11:C16').map((row) => row[0]);
    expect(column.every((v) => typeof v === 'string' && v.startsWith('='))).toBe(true);
  });

  test('the mock, as Excel, refuses a 1×1 array written over a larger range', async () => {
    const excel = mockExcel(['Sheet1']);
    await expect(
      excel.run(async (context) => {
        context.workbook.worksheets.getItem('Sheet1').getRange('A1:B2').formulas = [['']];
        await context.sync();
      }),
    ).rejects.toMatchObject({
      code: 'InvalidArgument',
      message: "The number of rows or columns in the input array doesn't match the size or dimensions of the range.",
    });
  });

  test('an occupied area is reported cell by cell and left untouched; agreeing to the listed cells writes', async () => {
    const excel = mockExcel(['Sheet1']);
    excel.set('Sheet1', 'G2', [['keep me']]);
    const workbook = workbookOn(excel);
    const block = priorBlock({ kind: 'mean', meanRate: 0.04, strength: 500 }, 'F2', 'Sheet1');
    const snapshot = excel.snapshot();
    const outcome = await workbook.writeBlock(block);
    // the prior spills alpha, beta: G2 is in its area
    expect(outcome).toEqual({
      kind: 'occupied',
      address: 'Sheet1!F2:G2',
      occupiedCells: ['G2'],
      occupied: [{ address: 'G2', content: 'keep me' }],
    });
    expect(excel.snapshot()).toBe(snapshot);
    const forced = await workbook.writeBlock({ ...block, overwrite: [{ address: 'G2', content: 'keep me' }] });
    expect(forced.kind).toBe('written');
    expect(excel.cell('Sheet1', 'F2').formula).toBe('=ABTEST.PRIOR_FROM_MEAN(0.04,500)');
    expect(excel.cell('Sheet1', 'G2').formula).toBe('');
  });

  test('checked again at the moment of writing: anything typed meanwhile stops the write', async () => {
    const excel = mockExcel(['Sheet1']);
    excel.set('Sheet1', 'G2', [['keep me']]);
    const workbook = workbookOn(excel);
    const block = priorBlock({ kind: 'mean', meanRate: 0.04, strength: 500 }, 'F2', 'Sheet1');
    const agreed = [{ address: 'G2', content: 'keep me' }];
    // someone types into F2 after the user agreed to overwrite G2 only
    excel.set('Sheet1', 'F2', [['typed meanwhile']]);
    expect(await workbook.writeBlock({ ...block, overwrite: agreed })).toMatchObject({
      kind: 'occupied',
      occupiedCells: ['F2', 'G2'],
    });
    expect(excel.cell('Sheet1', 'F2').formula).toBe('typed meanwhile');
    // … or changes the agreed cell itself
    excel.set('Sheet1', 'F2', [['']]);
    excel.set('Sheet1', 'G2', [['changed']]);
    expect(await workbook.writeBlock({ ...block, overwrite: agreed })).toMatchObject({
      kind: 'occupied',
      occupiedCells: ['G2'],
    });
    expect(excel.cell('Sheet1', 'G2').formula).toBe('changed');
  });

  test('a double click writes once: the second write waits, then finds the area taken', async () => {
    const excel = mockExcel(['Plan']);
    const workbook = workbookOn(excel);
    const { block } = plan();
    const [first, second] = await Promise.all([workbook.writeBlock(block), workbook.writeBlock(block)]);
    expect(first).toEqual({ kind: 'written', address: 'Plan!B2:C16' });
    expect(second.kind).toBe('occupied');
    expect(excel.writeLog.filter((w) => w.startsWith('formulas '))).toEqual(['formulas Plan!B2:C16']);
  });

  test.each([
    ['half-way', true],
    ['after all of it landed', 1000],
  ] as const)(
    'a write that fails %s is undone — contents, number formats, bold, font colour, fill, widths — and checked',
    async (_when, partial) => {
      const excel = mockExcel(['Checkout test']);
      excel.set('Checkout test', 'A1:C4', table);
      // the user's own cells inside the area they agreed to write over, formatted
      excel.set('Checkout test', 'F2:F3', [['notes'], [0.125]]);
      // text that Excel would read as a number or a date if written back plainly
      excel.set('Checkout test', 'G2:H2', [['00123', '1/2']]);
      excel.style('Checkout test', 'F3', {
        numberFormat: '0.0%',
        bold: true,
        fontColor: '#1F4E79',
        fillColor: '#FFF2CC',
      });
      excel.style('Checkout test', 'E12:F12', { fillColor: '#DDEBF7' });
      const workbook = workbookOn(excel);
      const built = readoutBlock(
        { namesRef: 'A2:A4', visitorsRef: 'B2:B4', conversionsRef: 'C2:C4', sharesRef: null, variants: 3 },
        { level: 0.95, prior: { alpha: 1, beta: 1 }, densityPoints: 11, currentSrmPValue: 1e-6 },
        'E1',
        'Checkout test',
      );
      const block: FormulaBlock = {
        ...built.block,
        overwrite: [
          { address: 'F2', content: 'notes' },
          { address: 'G2', content: '00123' },
          { address: 'H2', content: '1/2' },
          { address: 'F3', content: 0.125 },
        ],
      };
      const snapshot = excel.snapshot();
      // syncs: 1 read, 2 spill check of the agreed cells, 3 write (fails after half of it landed)
      excel.failures = [
        { call: excel.syncCalls + 3, code: 'GeneralException', message: 'The request failed.', partial },
      ];
      const outcome = await workbook.writeBlock(block);
      expect(outcome).toEqual({
        kind: 'failed',
        address: "'Checkout test'!E1:O27",
        code: 'GeneralException',
        message:
          "nothing was written to 'Checkout test'!E1:O27 (The request failed.); every cell was put back and checked",
        restored: true,
        unrestored: [],
      });
      // part of the batch did land (as Excel may leave it) …
      expect(excel.partialSnapshots).toHaveLength(1);
      expect(excel.partialSnapshots[0]).toContain('=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4,F9,F10)');
      expect(excel.partialSnapshots[0]).toContain('"numberFormat":"0.00%"');
      if (partial !== true) expect(excel.partialSnapshots[0]).toMatch(/"fillColor":"#F4CCCC".*"widths":\{"E":\d+/);
      // … and every cell, format and width was put back
      expect(excel.snapshot()).toBe(snapshot);
      expect(excel.cell('Checkout test', 'F3')).toMatchObject({
        formula: 0.125,
        numberFormat: '0.0%',
        bold: true,
        fontColor: '#1F4E79',
        fillColor: '#FFF2CC',
      });
      expect(excel.formulas('Checkout test', 'G2:H2')).toEqual([['00123', '1/2']]);
    },
  );

  test('what could not be put back is listed cell by cell, and the sheet is not called "as it was"', async () => {
    const excel = mockExcel(['Sheet1']);
    excel.style('Sheet1', 'A1:B1', { numberFormat: '#,##0' });
    const workbook = workbookOn(excel);
    const block = priorBlock({ kind: 'mean', meanRate: 0.04, strength: 500 }, 'A1', 'Sheet1');
    // syncs: 1 read, 2 write (its contents and number formats land, then it fails), 3 number formats
    // back (fails), 4 contents back, 5 check
    excel.failures = [
      { call: excel.syncCalls + 2, code: 'InvalidArgument', message: 'bad write', partial: 2 },
      { call: excel.syncCalls + 3, code: 'GeneralException', message: 'lost connection', partial: false },
    ];
    const outcome = await workbook.writeBlock(block);
    expect(outcome).toEqual({
      kind: 'failed',
      address: 'Sheet1!A1:B1',
      code: 'InvalidArgument',
      message:
        'writing to Sheet1!A1:B1 failed (bad write) and these could not be put back as they were: A1: number format; check them.' +
        ' Putting back failed for: number formats (lost connection).',
      restored: false,
      unrestored: ['A1: number format'],
    });
    // B1 kept its own format (the block leaves it alone), and the contents did come back
    expect(excel.cell('Sheet1', 'B1').numberFormat).toBe('#,##0');
    expect(excel.formulas('Sheet1', 'A1:B1')).toEqual([['', '']]);
  });

  test('cells of another formula’s spill that were written over come back as its spill, not as pasted numbers', async () => {
    const excel = mockExcel(['Sheet1']);
    excel.spill('Sheet1', 'B1:B3', '=ABTEST.POSTERIOR_MEAN(D1:D3,E1:E3)', [[0.041], [0.045], [0.043]]);
    const workbook = workbookOn(excel);
    const block: FormulaBlock = {
      sheet: 'Sheet1',
      topLeft: 'B3',
      cells: [['label', 'x']],
      overwrite: [{ address: 'B3', content: 0.043 }],
    };
    const snapshot = excel.snapshot();
    excel.failures = [
      { call: excel.syncCalls + 3, code: 'GeneralException', message: 'The request failed.', partial: true },
    ];
    const outcome = await workbook.writeBlock(block);
    expect(outcome).toMatchObject({ kind: 'failed', restored: true, unrestored: [] });
    expect(excel.snapshot()).toBe(snapshot);
    expect(excel.cell('Sheet1', 'B3')).toMatchObject({ formula: '', spill: { parent: 'B1', value: 0.043 } });
  });

  test('a block on a new sheet: the sheet is made and shown; after a failure it is deleted again', async () => {
    const excel = mockExcel(['Checkout test']);
    const workbook = workbookOn(excel);
    const block: FormulaBlock = {
      ...priorBlock({ kind: 'mean', meanRate: 0.04, strength: 500 }, 'A1', 'Read-out'),
      newSheet: true,
    };
    excel.failures = [
      { call: excel.syncCalls + 2, code: 'GeneralException', message: 'The request failed.', partial: true },
    ];
    expect(await workbook.writeBlock(block)).toMatchObject({
      kind: 'failed',
      address: "'Read-out'!A1:B1",
      restored: true,
      unrestored: [],
    });
    expect(excel.sheetNames()).toEqual(['Checkout test']);
    expect(await workbook.writeBlock(block)).toEqual({ kind: 'written', address: "'Read-out'!A1:B1" });
    expect(excel.sheetNames()).toEqual(['Checkout test', 'Read-out']);
    expect(excel.activeSheet).toBe('Read-out');
    expect(await workbook.writeBlock(block)).toMatchObject({
      kind: 'failed',
      code: 'InvalidArgument',
      message: 'a sheet named "Read-out" exists already; nothing was written',
    });
  });

  test('an Excel without ExcelApi 1.12 is told so before anything is read or written', async () => {
    const excel = mockExcel(['Sheet1']);
    excel.apiVersion = '1.9';
    const workbook = workbookOn(excel);
    expect(workbook.hostProblem()).toBe(
      'this version of Excel does not offer the Excel JavaScript API 1.12 that Lift Ledger needs to write safely (Excel 2021, Excel for Microsoft 365 and Excel on the web have it)',
    );
    const outcome = await workbook.writeBlock(
      priorBlock({ kind: 'mean', meanRate: 0.04, strength: 500 }, 'A1', 'Sheet1'),
    );
    expect(outcome).toMatchObject({ kind: 'failed', code: 'NotSupported', restored: true });
    expect(outcome.kind === 'failed' && outcome.message).toMatch(/ExcelApi|JavaScript API 1\.12.*nothing was written$/);
    expect(excel.syncCalls).toBe(0);
  });

  test('text written back stays text: the apostrophe where Excel would read it as something else', () => {
    const texts = ['00123', '1/2', '=A1', '-note', '12%', 'TRUE', 'Green button', '1e5'];
    expect(texts.map((t) => keepText(t, 'General'))).toEqual([
      "'00123",
      "'1/2",
      "'=A1",
      "'-note",
      "'12%",
      "'TRUE",
      'Green button',
      "'1e5",
    ]);
    expect(keepText('00123', '@')).toBe('00123');
  });

  test('the manifest declares the requirement set the workbook layer checks', () => {
    const manifest = fs.readFileSync(path.join(__dirname, '..', '..', 'manifest', 'manifest.xml'), 'utf8');
    expect(manifest).toContain(`<Set Name="${REQUIRED_API.set}" MinVersion="${REQUIRED_API.version}"/>`);
  });

  test('a failure while reading the area writes nothing and says why', async () => {
    const excel = mockExcel(['Sheet1']);
    const workbook = workbookOn(excel);
    excel.failures = [{ call: excel.syncCalls + 1, code: 'GeneralException', message: 'busy', partial: false }];
    const outcome = await workbook.writeBlock(
      priorBlock({ kind: 'mean', meanRate: 0.1, strength: 10 }, 'C3', 'Sheet1'),
    );
    expect(outcome).toEqual({
      kind: 'failed',
      address: 'C3:D3',
      code: 'GeneralException',
      message: 'could not read C3:D3: busy; nothing was written',
      restored: true,
      unrestored: [],
    });
    expect(excel.cell('Sheet1', 'C3').formula).toBe('');
  });

  test('a malformed block is refused before anything is read or written', async () => {
    const excel = mockExcel(['Sheet1']);
    const outcome = await workbookOn(excel).writeBlock({ topLeft: 'A1', cells: [['a', 'b'], ['c']] });
    expect(outcome).toEqual({
      kind: 'failed',
      address: 'A1:B2',
      code: 'InvalidArgument',
      message: 'the block to write is not rectangular',
      restored: true,
      unrestored: [],
    });
    expect(excel.syncCalls).toBe(0);
  });

  test('the read-out block writes the warning fill on the SRM cells when the current p-value is below 0.001', async () => {
    const excel = mockExcel(['Sheet1']);
    const built = readoutBlock(
      { namesRef: null, visitorsRef: 'B2:B3', conversionsRef: 'C2:C3', sharesRef: null, variants: 2 },
      { level: 0.9, prior: { alpha: 1, beta: 1 }, densityPoints: 5, currentSrmPValue: 1e-6 },
      'E1',
      'Sheet1',
    );
    expect((await workbookOn(excel).writeBlock(built.block)).kind).toBe('written');
    const srm = built.cells.srmPValue as string;
    expect(excel.cell('Sheet1', srm).formula).toBe('=ABTEST.SRM_PVALUE(B2:B3)');
    expect(excel.cell('Sheet1', srm).fillColor).toBe('#F4CCCC');
    expect(excel.cell('Sheet1', built.cells.srmVerdict as string).fillColor).toBe('#F4CCCC');
    expect(excel.cell('Sheet1', built.cells.decision as string).fillColor).toBe('');
  });
});

describe('places for a block', () => {
  test('beside the demo’s first table: the first empty columns right of everything in its rows, never over the revenue columns', async () => {
    // The layout of the preview's "Checkout test" sheet (invented demo data): the variant table A3:C6,
    // more metrics in D3:I6, a caution in A8, read-outs in column B down to row 98 and two chart tables in K:N.
    const excel = mockExcel(['Checkout test']);
    excel.set('Checkout test', 'A1', [['Checkout test: which checkout button sells best?']]);
    excel.set('Checkout test', 'A3:I3', [
      [
        'Variant',
        'Visitors',
        'Conversions',
        'Revenue count',
        'Revenue mean',
        'Revenue sd',
        'Basket adds',
        'Sessions',
        'Planned share',
      ],
    ]);
    excel.set('Checkout test', 'A4:I6', [
      ['Green button (control)', 10412, 412, 10412, 2.41, 11.8, 1820, 15230, 1],
      ['Orange button', 10388, 463, 10388, 2.63, 12.3, 1968, 15190, 1],
      ['Big basket icon', 10451, 431, 10451, 2.5, 12, 1902, 15310, 1],
    ]);
    excel.set('Checkout test', 'A8', [['Cautions: …']]);
    for (const row of [11, 15, 19, 23, 27, 31, 35, 39, 43, 47, 49, 53, 57, 61, 65, 69, 73, 77, 82, 86, 90, 94, 98]) {
      excel.set('Checkout test', `B${row}`, [['=ABTEST.…']]);
    }
    excel.spill(
      'Checkout test',
      'K11:N51',
      '=ABTEST.POSTERIOR_DENSITY(C4:C6, B4:B6, 41)',
      Array.from({ length: 41 }, () => [0.04, 1, 2, 3]),
    );
    excel.spill(
      'Checkout test',
      'K55:N95',
      '=ABTEST.LIFT_DENSITY(C4:C6, B4:B6, 41)',
      Array.from({ length: 41 }, () => [0.1, 1, 2, 3]),
    );
    const places = await workbookOn(excel).findPlaces({
      sheet: 'Checkout test',
      table: 'A3:C6',
      rowCount: 76,
      columnCount: 10,
      newSheetName: 'Checkout test read-out',
    });
    // right: columns D…N hold something in rows 3–78, O is the empty gap, the block starts at P
    // below: columns A…J hold something down to row 98, row 99 is the gap
    expect(places).toEqual({ right: 'P3', below: 'A100', newSheet: 'Checkout test read-out' });
  });

  test('a lone table gets the cells just beside and just below it, one empty line apart', async () => {
    const excel = mockExcel(['Sheet1', 'Sheet1 read-out']);
    excel.set('Sheet1', 'B2:D5', table);
    const places = await workbookOn(excel).findPlaces({
      sheet: 'Sheet1',
      table: 'B2:D5',
      rowCount: 20,
      columnCount: 10,
      newSheetName: 'Sheet1 read-out',
    });
    expect(places).toEqual({ right: 'F2', below: 'B7', newSheet: 'Sheet1 read-out (2)' });
  });

  test('firstFreeRun keeps one empty line before the block; newSheetName makes a valid, unused name', () => {
    const filled = new Set([3, 4, 9]);
    expect(firstFreeRun((i) => !filled.has(i), 3, 3, 100)).toBe(6);
    expect(firstFreeRun((i) => !filled.has(i), 3, 4, 100)).toBe(11);
    expect(firstFreeRun(() => false, 0, 2, 50)).toBeNull();
    // Excel's sheet-name rules (common knowledge): no [ ] : * ? / \, at most 31 characters, unique without case
    expect(newSheetName('Q3: tests [final]/v2', [])).toBe('Q3 tests final v2');
    expect(newSheetName('A very long test name that goes on', ['a very long test name that goes'])).toBe(
      'A very long test name that (2)',
    );
    expect(newSheetName("'quoted'", [])).toBe('quoted');
    expect(newSheetName('History', [])).toBe('Read-out');
  });
});

describe('charts and selection events', () => {
  test('insertChart adds a native chart over the source block with its title and position', async () => {
    const excel = mockExcel(['Sheet1']);
    const outcome = await workbookOn(excel).insertChart({
      sourceAddress: 'E20:G81',
      type: 'XYScatterSmoothNoMarkers',
      title: 'Lift over control: posterior density',
      topLeft: 'I19',
      bottomRight: 'O35',
    });
    expect(outcome).toEqual({ kind: 'inserted', name: 'Chart 1' });
    expect(excel.charts).toEqual([
      {
        sheet: 'Sheet1',
        type: 'XYScatterSmoothNoMarkers',
        source: 'E20:G81',
        seriesBy: 'Columns',
        title: 'Lift over control: posterior density',
        position: ['I19', 'O35'],
        name: 'Chart 1',
      },
    ]);
  });

  test('insertChart with axis titles sets the x (category) and y (value) axes’ titles; markers for intervals', async () => {
    const excel = mockExcel(['Sheet1']);
    const outcome = await workbookOn(excel).insertChart({
      sourceAddress: 'A30:D38',
      type: 'XYScatterLines',
      title: 'Lift over the control: credible intervals of average',
      axisTitles: { x: 'Lift of average over the control (relative; 0% = no change)', y: 'Challengers' },
      topLeft: 'F30',
      bottomRight: 'L47',
    });
    expect(outcome).toEqual({ kind: 'inserted', name: 'Chart 1' });
    expect(excel.charts[0]).toMatchObject({
      type: 'XYScatterLines',
      source: 'A30:D38',
      axisTitles: { x: 'Lift of average over the control (relative; 0% = no change)', y: 'Challengers' },
    });
    // Not asked to hide the vertical axis's numbers: its tick labels are left as Excel draws them.
    expect(excel.charts[0]?.valueTickLabels).toBeUndefined();
  });

  test('insertChart with hideValueLabels leaves the vertical axis without numbers (tickLabelPosition None)', async () => {
    const excel = mockExcel(['Sheet1']);
    const outcome = await workbookOn(excel).insertChart({
      sourceAddress: 'A30:D38',
      type: 'XYScatterLines',
      title: 'Lift over the control: credible intervals of average',
      axisTitles: { x: 'Lift of average over the control (relative; 0% = no change)', y: 'Challengers' },
      hideValueLabels: true,
      topLeft: 'F30',
      bottomRight: 'L47',
    });
    expect(outcome).toEqual({ kind: 'inserted', name: 'Chart 1' });
    expect(excel.charts[0]).toMatchObject({ source: 'A30:D38', valueTickLabels: 'None' });
  });

  test('a failed chart sync is an outcome, not a rejection, and adds no chart', async () => {
    const excel = mockExcel(['Sheet1']);
    excel.failures = [{ call: 1, code: 'InvalidArgument', message: 'bad source', partial: false }];
    const outcome = await workbookOn(excel).insertChart({
      sourceAddress: 'A1:B3',
      type: 'Line',
      title: 't',
      topLeft: 'D1',
      bottomRight: 'H10',
    });
    expect(outcome).toEqual({
      kind: 'failed',
      code: 'InvalidArgument',
      message: 'the chart could not be added (bad source)',
    });
    expect(excel.charts).toEqual([]);
  });

  test('onSelectionChanged calls the listener and can be removed', async () => {
    const excel = mockExcel(['Sheet1']);
    const calls: number[] = [];
    const subscription = await workbookOn(excel).onSelectionChanged(() => calls.push(1));
    expect(excel.handlers).toHaveLength(1);
    excel.handlers[0]?.();
    expect(calls).toEqual([1]);
    await subscription.remove();
    expect(excel.handlers).toHaveLength(0);
  });
});
