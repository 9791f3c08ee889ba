/**
 * The preview's workbook model (preview/src/previewWorkbook.ts): number formats as Excel writes them,
 * addresses as Excel gives them, spills that come back when their area is freed, formats inherited by
 * spilled cells. Functions come from the bridge fixture; its POSTERIOR_MEAN is the closed form
 * (1 + x)/(2 + n) of the Beta posterior mean (common practice).
 */
import * as path from 'path';
import {
  beyondSheetMessage,
  blockAddress,
  fitNumber,
  formatNumber,
  parseBlock,
  PreviewWorkbook,
  qualifiedSheetName,
} from '../../preview/src/previewWorkbook';
import { buildDemoWorkbook, DEMO_NOTICE } from '../../preview/src/demoWorkbook';
import { loadAndRegister } from './loadBundle';

loadAndRegister(path.join(__dirname, 'fixtures', 'functions.js'), path.join(__dirname, 'fixtures', 'functions.json'));

describe('numbers too wide for their column: rounded (General) or "####" (fixed formats), never cut', () => {
  it.each([
    // Excel rounds General numbers to the column (common practice: a narrow column shows 0.0432 for 0.04321987)
    [0.04321987, undefined, 6, '0.0432'],
    [0.04321987, undefined, 12, '0.04321987'],
    [123456.789, undefined, 7, '123457'],
    [1234567890123, undefined, 8, '1.23E+12'],
    [0.000012345, undefined, 7, '1.2E-05'],
    [0.4321, '0.00%', 4, '####'],
    [0.4321, '0.00%', 6, '43.21%'],
    [-2.5, undefined, 4, '-2.5'],
  ])('%p with %p in %p characters shows %p', (value, format, chars, shown) => {
    expect(fitNumber(value, format, chars)).toBe(shown);
  });
});

describe('number formats (Excel format codes "0", "0.00", "0.0%")', () => {
  it.each([
    [0.04321, '0.00%', '4.32%'],
    [0.5, '0%', '50%'],
    [2.345, '0.00', '2.35'],
    [686, '0', '686'],
    [10412, undefined, '10412'],
    [0.1 + 0.2, undefined, '0.3'],
    [0.0000123, 'General', '1.23E-05'],
    [-4.5e12, undefined, '-4.5E+12'],
  ])('%p with %p shows %p', (value, format, shown) => {
    expect(formatNumber(value, format)).toBe(shown);
  });
});

describe('addresses', () => {
  it('quotes sheet names with spaces as Excel does', () => {
    expect(qualifiedSheetName('Past tests')).toBe("'Past tests'");
    expect(qualifiedSheetName('Plan')).toBe('Plan');
    expect(qualifiedSheetName("Bob's")).toBe("'Bob''s'");
  });
  it('parses and writes A1 blocks', () => {
    expect(parseBlock('B2:D4', 1)).toEqual({ sheet: 1, row: 1, col: 1, rows: 3, columns: 3 });
    expect(parseBlock('$C$3', 0)).toEqual({ sheet: 0, row: 2, col: 2, rows: 1, columns: 1 });
    expect(parseBlock('not an address', 0)).toBeUndefined();
    expect(blockAddress({ row: 1, col: 1, rows: 3, columns: 3 })).toBe('B2:D4');
    expect(blockAddress({ row: 0, col: 26, rows: 1, columns: 1 })).toBe('AA1');
  });
});

describe('PreviewWorkbook', () => {
  const sheet = () => [
    {
      name: 'S',
      cells: [
        [10, 3, '=ABTEST.POSTERIOR_MEAN(B1:B2, A1:A2)'],
        [20, 5],
      ],
      formats: { C1: '0.00%' },
      columnWidths: {},
    },
  ];

  it('gives spilled cells their own number formats, as Excel does (the formula cell’s format does not spread)', () => {
    const book = PreviewWorkbook.create(sheet());
    // (1 + 5)/(2 + 20) = 0.272727…, shown in General until its own cell is formatted
    expect(book.cell(0, 1, 2)).toMatchObject({ text: '0.27272727', spilled: true, kind: 'number' });
    expect(book.spillAnchor(0, 1, 2)).toEqual({ row: 0, col: 2 });
    book.setNumberFormat(0, 1, 2, '0.00%');
    expect(book.cell(0, 1, 2).text).toBe('27.27%');
  });

  it('shows an error of a spilling formula in its own cell only, as Excel does', () => {
    // 12.5 visitors is refused: POSTERIOR_MEAN returns #VALUE! for the whole result
    const book = PreviewWorkbook.create([
      {
        name: 'S',
        cells: [
          [10, 3, '=ABTEST.POSTERIOR_MEAN(B1:B2, A1:A2)'],
          [12.5, 5],
        ],
        formats: {},
        columnWidths: {},
      },
    ]);
    expect(book.cell(0, 0, 2)).toMatchObject({ kind: 'error', value: '#VALUE!' });
    expect(book.cell(0, 1, 2)).toMatchObject({ kind: 'empty', text: '' });
    expect(book.values({ sheet: 0, row: 0, col: 2, rows: 2, columns: 1 })).toEqual([['#VALUE!'], ['']]);
  });

  it('says why a formula gives #NAME? when it reaches past the preview’s sheet size', () => {
    const book = PreviewWorkbook.create([
      { name: 'S', cells: [['=SUM(A1:A2500)', '=SUM(C1:C20)']], formats: {}, columnWidths: {} },
    ]);
    expect(book.cell(0, 0, 0)).toMatchObject({
      kind: 'error',
      value: '#NAME?',
      message:
        "This preview's sheets have 2,000 rows and 200 columns (Excel's have 1,048,576 rows and 16,384 columns); the formula refers to A2500, beyond them. It works in Excel.",
    });
    expect(book.cell(0, 0, 1)).toMatchObject({ kind: 'number', value: 0 });
    expect(beyondSheetMessage('=IF(A1>0,"ZZ9999 in text",B2)', 2000, 200)).toBeUndefined();
    expect(beyondSheetMessage('=HZ1+1', 2000, 200)).toContain('refers to HZ1');
  });

  it('adds and removes sheets (ids stay), and keeps each sheet’s selection', () => {
    const book = PreviewWorkbook.create(buildDemoWorkbook());
    const id = book.addSheet('Checkout test read-out');
    expect(book.sheetNames()).toEqual(['Checkout test', 'Past tests', 'Plan', 'Daily test', 'Checkout test read-out']);
    book.select({ sheet: 0, row: 4, col: 1, rows: 2, columns: 1 });
    book.activate(id);
    expect(book.selection).toEqual({ sheet: id, row: 0, col: 0, rows: 1, columns: 1 });
    book.activate(0);
    expect(book.selection).toEqual({ sheet: 0, row: 4, col: 1, rows: 2, columns: 1 });
    book.removeSheet(1);
    expect(book.sheetNames()).toEqual(['Checkout test', 'Plan', 'Daily test', 'Checkout test read-out']);
    expect(book.sheetIds()).toEqual([0, 2, 3, id]);
    expect(() => {
      for (const sheet of book.sheetIds()) book.removeSheet(sheet);
    }).toThrow(new Error('a workbook keeps at least one sheet'));
  });

  it('brings a spill back once the cell blocking it is cleared', () => {
    const book = PreviewWorkbook.create(sheet());
    book.enter(0, 1, 2, 'in the way');
    expect(book.cell(0, 0, 2)).toMatchObject({ kind: 'error', value: '#SPILL!' });
    book.enter(0, 1, 2, null);
    expect(book.cell(0, 0, 2).value).toBeCloseTo(4 / 12, 15);
    expect(book.cell(0, 1, 2).value).toBeCloseTo(6 / 22, 15);
  });

  it('fires change, selection and sheet events', () => {
    const book = PreviewWorkbook.create(buildDemoWorkbook());
    const seen: string[] = [];
    book.on('cells', () => seen.push('cells'));
    book.on('selection', () => seen.push('selection'));
    book.on('sheet', () => seen.push('sheet'));
    book.enter(2, 3, 5, 1);
    book.select({ sheet: 1, row: 0, col: 0, rows: 1, columns: 1 });
    expect(seen).toEqual(['cells', 'sheet', 'selection']);
    expect(book.activeSheet).toBe(1);
  });

  it('says on every demo sheet that the data is invented', () => {
    const sheets = buildDemoWorkbook();
    expect(sheets.map((s) => s.name)).toEqual(['Checkout test', 'Past tests', 'Plan', 'Daily test']);
    for (const s of sheets) expect(s.cells[1]?.[0]).toBe(DEMO_NOTICE);
    expect(DEMO_NOTICE).toMatch(/invented/i);
  });
});

describe('spill ranges', () => {
  it('finds the block a formula spills into, from its formula cell', () => {
    const book = PreviewWorkbook.create([
      {
        name: 'S',
        cells: [
          [10, 3, '=ABTEST.POSTERIOR_MEAN(B1:B3, A1:A3)', '=1+1'],
          [20, 5],
          [30, 6],
        ],
        formats: {},
        columnWidths: {},
      },
    ]);
    expect(book.spillRange(0, 0, 2)).toEqual({ sheet: 0, row: 0, col: 2, rows: 3, columns: 1 });
    expect(book.spillRange(0, 0, 3)).toBeUndefined();
    expect(book.spillRange(0, 1, 2)).toBeUndefined();
  });
});
