/**
 * The shareable copy: the plan (which cells become values, what the notes and the header say, the text the
 * panel shows first) and the copy made through the Office.js workbook layer on the mock (test/taskpane/
 * mockExcel.ts): a new sheet right after the source whose ABTEST results — every cell of a spill — are
 * plain values equal to the source's, with the copy's own formula in a note, number formats and charts
 * kept, a header line on top, and the source untouched; on an Excel without notes (ExcelApi 1.18) the
 * formulas go into a "How computed" column; a failure part-way deletes the copy again and checks; a sheet
 * that changed since it was shown is not copied. The sheets are invented (the garden-supply demo); the
 * values in them are placeholders the mock carries, not statistics (the mock does not calculate).
 */
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

import { frozenHeaderLine, howComputedNote } from '../../cli/core/frozenCopy';
import {
  copyEdits,
  copyProblem,
  describeCopy,
  planCopy,
  readsOnlyInside,
  HEADER_ROWS,
} from '../../taskpane/logic/shareCopy';
import { parseAddress } from '../../taskpane/workbook/address';
import { createOfficeWorkbook, outsideOf } from '../../taskpane/workbook/officeWorkbook';
import type { CopyRequest, SheetScan, Workbook } from '../../taskpane/workbook/workbook';
import { mockExcel, type MockExcel } from './mockExcel';

const SHEET = 'Checkout test';
const AT = new Date(Date.UTC(2025, 5, 30, 14, 5, 0));

/** The invented demo's table with a small read-out beside it: two spilled results, a decision, a chart. */
function demoSheet(): MockExcel {
  const excel = mockExcel([SHEET, 'Plan']);
  excel.set(SHEET, 'A1:C4', [
    ['Variant', 'Visitors', 'Conversions'],
    ['Green button', 10412, 412],
    ['Orange button', 10388, 463],
    ['Big basket icon', 10451, 431],
  ]);
  excel.set(SHEET, 'E1', [['Posterior mean']]);
  excel.spill(SHEET, 'E2:E4', '=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4)', [[0.0396], [0.0447], [0.0413]]);
  excel.style(SHEET, 'E2:E4', { numberFormat: '0.00%' });
  excel.set(SHEET, 'F1', [['Interval low']]);
  excel.spill(SHEET, 'F2:G4', '=ABTEST.RATE_INTERVAL(C2:C4,B2:B4,0.95)', [
    [0.036, 0.0435],
    [0.041, 0.0487],
    [0.0376, 0.0452],
  ]);
  excel.set(SHEET, 'E6', [['=ABTEST.DECISION(C2:C4,B2:B4,,A2:A4)']]);
  excel.cell(SHEET, 'E6').value = 'Choose Orange button: its expected loss 0.0012% is within the 0.040% allowed';
  excel.set(SHEET, 'E7', [['=$A$3']]);
  excel.cell(SHEET, 'E7').value = 'Orange button';
  excel.set(SHEET, 'E8', [['=SUM(B2:B4)']]);
  excel.cell(SHEET, 'E8').value = 31251;
  excel.addNote(SHEET, 'E6', 'Checked by the analyst on Monday.');
  excel.addChart(SHEET, 'E2:E4', 'I2', 'M12', 'Posterior means');
  excel.addChart(SHEET, 'A1:C4', 'A12', 'D20', 'Visitors');
  return excel;
}

const workbookOn = (excel: MockExcel): Workbook => createOfficeWorkbook(excel.run, excel.supports);

/** The copy request the panel makes for a plan. */
function request(workbook: Workbook, shown: SheetScan, scope: Parameters<typeof planCopy>[1]): CopyRequest {
  const plan = planCopy(shown, scope);
  return {
    source: shown.sheet,
    newSheet: plan.newSheet,
    shown,
    headerRows: HEADER_ROWS,
    problem: (scan) => copyProblem(planCopy(scan, scope)),
    edits: (scan, copyFormula) =>
      copyEdits(planCopy(scan, scope), { frozenAt: AT, notes: workbook.capabilities().notes }, copyFormula),
  };
}

/** Everything of one sheet in a mock snapshot (cells, widths, its notes and charts). */
function sheetState(excel: MockExcel, sheet: string): string {
  const all = JSON.parse(excel.snapshot()) as { sheets: Record<string, unknown>; charts: { sheet: string }[] };
  return JSON.stringify({
    cells: all.sheets[sheet],
    notes: excel.notes(sheet),
    charts: all.charts.filter((c) => c.sheet === sheet),
  });
}

describe('the plan of a copy', () => {
  test('a scan finds every formula cell with the cells its result fills (the whole spill) and the values shown', async () => {
    const excel = demoSheet();
    const scan = await workbookOn(excel).scanSheet(SHEET);
    expect(scan).toMatchObject({
      sheet: SHEET,
      range: 'A1:G8',
      charts: 2,
      tooLarge: false,
      sheetNames: [SHEET, 'Plan'],
    });
    expect(scan.formulaCells.map((c) => [c.address, c.result])).toEqual([
      ['E2', 'E2:E4'],
      ['F2', 'F2:G4'],
      ['E6', 'E6'],
      ['E7', 'E7'],
      ['E8', 'E8'],
    ]);
    expect(scan.formulaCells[1]?.values).toEqual([
      [0.036, 0.0435],
      [0.041, 0.0487],
      [0.0376, 0.0452],
    ]);
  });

  test('the whole sheet: every ABTEST result and only those; other formulas stay formulas', async () => {
    const scan = await workbookOn(demoSheet()).scanSheet(SHEET);
    const plan = planCopy(scan, { kind: 'sheet' });
    expect(plan).toMatchObject({
      source: 'A1:G8',
      results: 3,
      widened: false,
      newSheet: 'Checkout test (shared)',
      notReady: [],
    });
    expect(plan.frozen.map((c) => [c.address, c.why])).toEqual([
      ['E2', 'result'],
      ['F2', 'result'],
      ['E6', 'result'],
    ]);
    expect(copyProblem(plan)).toBeNull();
  });

  test('part of a sheet: a selection that cuts a spill is widened to the whole result; a formula that reads cells left out keeps its value', async () => {
    const scan = await workbookOn(demoSheet()).scanSheet(SHEET);
    const plan = planCopy(scan, { kind: 'cells', range: 'E3:F7' });
    expect(plan).toMatchObject({ source: 'E2:G7', widened: true, results: 3 });
    // E7 (=$A$3) reads the table, which the copy leaves out; E8 is outside the selection.
    expect(plan.frozen.map((c) => [c.address, c.why])).toEqual([
      ['E2', 'result'],
      ['F2', 'result'],
      ['E6', 'result'],
      ['E7', 'reads-outside'],
    ]);
  });

  test('what counts as reading cells left out', () => {
    const keep = parseAddress('E2:G8');
    expect(readsOnlyInside('=IF(E2<0.001,"broken","as planned")', SHEET, keep)).toBe(true);
    expect(readsOnlyInside("=SUM('Checkout test'!E2:E4)", SHEET, keep)).toBe(true);
    expect(readsOnlyInside('=Plan!B4*2', SHEET, keep)).toBe(true);
    expect(readsOnlyInside('=$A$3', SHEET, keep)).toBe(false);
    expect(readsOnlyInside('=SUM(E:E)', SHEET, keep)).toBe(false);
    expect(readsOnlyInside('=BaselineRate*2', SHEET, keep)).toBe(false);
    expect(readsOnlyInside('=INDIRECT("E2")', SHEET, keep)).toBe(false);
  });

  test('results still being computed, an empty sheet, a sheet without results and a huge sheet stop the copy with a reason', () => {
    const base: SheetScan = {
      sheet: SHEET,
      range: 'A1:B2',
      formulaCells: [],
      charts: 0,
      sheetNames: [SHEET],
      tooLarge: false,
    };
    const busy: SheetScan = {
      ...base,
      formulaCells: [
        { address: 'B1', formula: '=ABTEST.PROB_HIGHEST(A1:A2,B1:B2)', result: 'B1:B2', values: [['#BUSY!'], [0.3]] },
      ],
    };
    expect(copyProblem(planCopy(busy, { kind: 'sheet' }))).toBe(
      'a result is still being computed (B1); wait until they show numbers, then make the copy',
    );
    expect(copyProblem(planCopy({ ...base, range: '' }, { kind: 'sheet' }))).toBe(
      'there is nothing on "Checkout test" to copy',
    );
    expect(copyProblem(planCopy(base, { kind: 'sheet' }))).toBe(
      '"Checkout test" holds no ABTEST result, so there is nothing to freeze',
    );
    expect(copyProblem(planCopy(base, { kind: 'cells', range: 'A1' }))).toBe(
      'the selected cells (A1) hold no ABTEST result, so there is nothing to freeze; select a read-out',
    );
    expect(copyProblem(planCopy({ ...base, range: 'A1:B9000', tooLarge: true }, { kind: 'sheet' }))).toBe(
      '"Checkout test" is too large for the side panel to copy (it uses A1:B9000); make the copy from the saved file with the lift-ledger freeze command',
    );
  });

  test('the text shown before copying says where, what, where the formulas go, and that the original stays live', async () => {
    const scan = await workbookOn(demoSheet()).scanSheet(SHEET);
    const plan = planCopy(scan, { kind: 'sheet' });
    const withNotes = describeCopy(plan, { notes: true });
    expect(withNotes.fallback).toBeNull();
    expect(withNotes.text).toBe(
      'A new sheet "Checkout test (shared)" right after "Checkout test": a copy of the whole sheet (A1:G8), in which ' +
        '3 ABTEST results become plain values, each with its formula in a note. Number formats come along and 2 charts ' +
        'come along and show the values. A header line says when and from which cells it was made. "Checkout test" ' +
        'itself is not changed and stays live.',
    );
    const without = describeCopy(planCopy(scan, { kind: 'cells', range: 'E2:G7' }), { notes: false });
    expect(without.text).toContain('each with its formula in a "How computed" column (column H)');
    expect(without.text).toContain('1 other formula that reads cells left out keeps its value too');
    expect(without.fallback).toBe(
      'This Excel cannot add notes to cells (it lacks the Excel JavaScript API 1.18), so the formulas go into a column beside the values instead.',
    );
  });

  test('outsideOf: the used range minus the kept cells, as at most four rectangles', () => {
    expect(outsideOf('A1:G9', 'C3:E5')).toEqual(['A1:G2', 'A6:G9', 'A3:B5', 'F3:G5']);
    expect(outsideOf('C3:E5', 'C3:E5')).toEqual([]);
    expect(outsideOf('A1:B2', 'A1:B9')).toEqual([]);
  });
});

describe('the copy, made through the workbook layer', () => {
  test('the whole sheet: values equal to the source over every spilled cell, the copy’s formula in a note, the header line, formats and charts kept, the source untouched', async () => {
    const excel = demoSheet();
    const workbook = workbookOn(excel);
    const sourceBefore = sheetState(excel, SHEET);
    const shown = await workbook.scanSheet(SHEET);
    const outcome = await workbook.copySheet(request(workbook, shown, { kind: 'sheet' }));
    expect(outcome).toEqual({
      kind: 'written',
      sheet: 'Checkout test (shared)',
      address: "'Checkout test (shared)'!A1:G9",
      chartsKept: 2,
      chartsRemoved: 0,
      notes: 3,
    });
    const copy = 'Checkout test (shared)';
    expect(excel.sheetNames()).toEqual([SHEET, copy, 'Plan']);
    expect(excel.activeSheet).toBe(copy);
    // Every cell of each result is a value equal to the source's, one row down; no ABTEST formula is left.
    expect(excel.formulas(copy, 'E3:G5')).toEqual([
      [0.0396, 0.036, 0.0435],
      [0.0447, 0.041, 0.0487],
      [0.0413, 0.0376, 0.0452],
    ]);
    expect(excel.formulas(copy, 'E7')).toEqual([
      ['Choose Orange button: its expected loss 0.0012% is within the 0.040% allowed'],
    ]);
    expect(excel.cell(copy, 'E3').numberFormat).toBe('0.00%');
    // Other formulas stay live, their references moved with the header row.
    expect(excel.formulas(copy, 'E8:E9')).toEqual([['=$A$4'], ['=SUM(B3:B5)']]);
    // Notes: the formula as the copy held it (references one row down), where it spilled; an existing note kept.
    const notes = excel.notes(copy);
    expect(notes.E3).toBe(
      howComputedNote({ formula: '=ABTEST.POSTERIOR_MEAN(C3:C5,B3:B5)', spill: 'E3:E5', frozenAt: AT }),
    );
    expect(notes.E3).toBe(
      'Computed by =ABTEST.POSTERIOR_MEAN(C3:C5,B3:B5) (its result filled E3:E5).\nFrozen 2025-06-30 14:05 UTC: a plain value now, it no longer updates.',
    );
    expect(notes.F3).toContain('Computed by =ABTEST.RATE_INTERVAL(C3:C5,B3:B5,0.95) (its result filled F3:G5).');
    expect(notes.E7).toBe(
      `Checked by the analyst on Monday.\n\n${howComputedNote({ formula: '=ABTEST.DECISION(C3:C5,B3:B5,,A3:A5)', frozenAt: AT })}`,
    );
    expect(excel.formulas(copy, 'A1')).toEqual([
      [frozenHeaderLine({ frozenAt: AT, source: "'Checkout test'!A1:G8", results: 3 })],
    ]);
    expect(excel.cell(copy, 'A1').bold).toBe(true);
    // The charts came along and read the copy's (moved) cells.
    const all = JSON.parse(excel.snapshot()) as { charts: { sheet: string; source: string; title: string }[] };
    expect(all.charts.filter((c) => c.sheet === copy).map((c) => [c.title, c.source])).toEqual([
      ['Posterior means', 'E3:E5'],
      ['Visitors', 'A2:C5'],
    ]);
    expect(sheetState(excel, SHEET)).toBe(sourceBefore);
  });

  test('part of a sheet: everything outside is cleared, charts placed outside are deleted, a formula reading the left-out table keeps its value with a note', async () => {
    const excel = demoSheet();
    const workbook = workbookOn(excel);
    const shown = await workbook.scanSheet(SHEET);
    const outcome = await workbook.copySheet(request(workbook, shown, { kind: 'cells', range: 'E1:M12' }));
    expect(outcome).toMatchObject({ kind: 'written', chartsKept: 1, chartsRemoved: 1 });
    const copy = 'Checkout test (shared)';
    expect(
      excel
        .formulas(copy, 'A2:C5')
        .flat()
        .every((v) => v === ''),
    ).toBe(true);
    expect(excel.formulas(copy, 'E8')).toEqual([['Orange button']]);
    expect(excel.notes(copy).E8).toBe(
      'Was =$A$4: it read cells left out of this copy, so it keeps the value it showed.\nFrozen 2025-06-30 14:05 UTC.',
    );
    // =SUM(B3:B5) reads the table too: it keeps its value.
    expect(excel.formulas(copy, 'E9')).toEqual([[31251]]);
    expect(excel.formulas(copy, 'E1')).toEqual([
      [frozenHeaderLine({ frozenAt: AT, source: "'Checkout test'!E1:M12", results: 3 })],
    ]);
    const all = JSON.parse(excel.snapshot()) as { charts: { sheet: string; title: string }[] };
    expect(all.charts.filter((c) => c.sheet === copy).map((c) => c.title)).toEqual(['Posterior means']);
  });

  test('an Excel without notes (ExcelApi 1.16): the nearest thing — the formulas in a "How computed" column, said in the header', async () => {
    const excel = demoSheet();
    excel.apiVersion = '1.16';
    const workbook = workbookOn(excel);
    expect(workbook.capabilities()).toEqual({ notes: false });
    const shown = await workbook.scanSheet(SHEET);
    const outcome = await workbook.copySheet(request(workbook, shown, { kind: 'sheet' }));
    expect(outcome).toMatchObject({ kind: 'written', notes: 0 });
    const copy = 'Checkout test (shared)';
    expect(excel.notes(copy)).toEqual({ E7: 'Checked by the analyst on Monday.' });
    expect(excel.writeLog.some((line) => line.startsWith('note '))).toBe(false);
    expect(excel.formulas(copy, 'H1')).toEqual([['How computed']]);
    expect(excel.formulas(copy, 'H3')).toEqual([
      [
        'E3: =ABTEST.POSTERIOR_MEAN(C3:C5,B3:B5) (filled E3:E5); F3: =ABTEST.RATE_INTERVAL(C3:C5,B3:B5,0.95) (filled F3:G5)',
      ],
    ]);
    expect(excel.formulas(copy, 'H7')).toEqual([['E7: =ABTEST.DECISION(C3:C5,B3:B5,,A3:A5)']]);
    expect(String(excel.formulas(copy, 'A1')[0]?.[0])).toContain(
      'each keeps the formula that computed it in column H (How computed).',
    );
    expect(excel.formulas(copy, 'E3:E5')).toEqual([[0.0396], [0.0447], [0.0413]]);
  });

  test('notes asked of an Excel that has none: refused before anything is written', async () => {
    const excel = demoSheet();
    excel.apiVersion = '1.16';
    const workbook = workbookOn(excel);
    const before = excel.snapshot();
    const shown = await workbook.scanSheet(SHEET);
    const asked = request(workbook, shown, { kind: 'sheet' });
    const outcome = await workbook.copySheet({
      ...asked,
      edits: (scan, copyFormula) =>
        copyEdits(planCopy(scan, { kind: 'sheet' }), { frozenAt: AT, notes: true }, copyFormula),
    });
    expect(outcome).toMatchObject({ kind: 'failed', code: 'NotSupported', restored: true, unrestored: [] });
    expect((outcome as { message: string }).message).toBe(
      'the copy could not be made (this Excel cannot add notes (Excel JavaScript API 1.18)); no part of it is left in the workbook (checked), and "Checkout test" was not touched',
    );
    expect(excel.snapshot()).toBe(before);
  });

  test.each([true, false, 3])(
    'a copy that fails part-way (partial: %s) is deleted again and checked; the workbook is as it was',
    async (partial) => {
      const excel = demoSheet();
      const workbook = workbookOn(excel);
      const shown = await workbook.scanSheet(SHEET);
      const before = excel.snapshot();
      // Scan: 3 syncs; the copy: 2 (the copy, then reading it); the edits: the first is the writes.
      excel.failures = [
        { call: excel.syncCalls + 6, code: 'GeneralException', message: 'The request failed.', partial },
      ];
      const outcome = await workbook.copySheet(request(workbook, shown, { kind: 'sheet' }));
      expect(outcome).toEqual({
        kind: 'failed',
        code: 'GeneralException',
        message:
          'the copy could not be made (The request failed.); no part of it is left in the workbook (checked), and "Checkout test" was not touched',
        restored: true,
        unrestored: [],
      });
      expect(excel.partialSnapshots).toHaveLength(partial === false ? 0 : 1);
      expect(excel.snapshot()).toBe(before);
      expect(excel.sheetNames()).toEqual([SHEET, 'Plan']);
    },
  );

  test('a copy that fails before it is renamed is found by Excel’s own copy name and deleted', async () => {
    const excel = demoSheet();
    const workbook = workbookOn(excel);
    const shown = await workbook.scanSheet(SHEET);
    const before = excel.snapshot();
    // The copy's batch applies its first write (the copy itself) and fails before the rename.
    excel.failures = [{ call: excel.syncCalls + 4, code: 'GeneralException', message: 'lost connection', partial: 1 }];
    const outcome = await workbook.copySheet(request(workbook, shown, { kind: 'sheet' }));
    expect(outcome).toMatchObject({ kind: 'failed', restored: true });
    expect(excel.writeLog).toContain('delete Checkout test (2)');
    expect(excel.snapshot()).toBe(before);
  });

  test('when the copy cannot be deleted again, the outcome names it and does not say the workbook is as it was', async () => {
    const excel = demoSheet();
    const workbook = workbookOn(excel);
    const shown = await workbook.scanSheet(SHEET);
    const start = excel.syncCalls;
    excel.failures = [
      { call: start + 6, code: 'GeneralException', message: 'The request failed.', partial: false },
      // The undo: names read (+7), the delete fails (+8).
      { call: start + 8, code: 'AccessDenied', message: 'The workbook is protected.', partial: false },
    ];
    const outcome = await workbook.copySheet(request(workbook, shown, { kind: 'sheet' }));
    expect(outcome).toMatchObject({ kind: 'failed', code: 'GeneralException', restored: false });
    expect((outcome as { message: string }).message).toBe(
      'the copy failed (The request failed.) and a sheet the copy had started may remain (The workbook is protected.) could not be removed; check the workbook',
    );
    expect(excel.sheetNames()).toContain('Checkout test (shared)');
  });

  test('a sheet whose formulas changed since it was shown is not copied: the outcome is the new scan', async () => {
    const excel = demoSheet();
    const workbook = workbookOn(excel);
    const shown = await workbook.scanSheet(SHEET);
    excel.set(SHEET, 'E10', [['=ABTEST.PROB_HIGHEST(C2:C4,B2:B4)']]);
    const before = excel.snapshot();
    const outcome = await workbook.copySheet(request(workbook, shown, { kind: 'sheet' }));
    expect(outcome.kind).toBe('changed');
    expect(outcome.kind === 'changed' && outcome.scan.formulaCells.map((c) => c.address)).toContain('E10');
    expect(excel.snapshot()).toBe(before);
  });

  test('results still being computed, a name taken meanwhile, an old Excel: nothing is written and the reason is given', async () => {
    const excel = demoSheet();
    const workbook = workbookOn(excel);
    const shown = await workbook.scanSheet(SHEET);
    const before = excel.snapshot();
    excel.cell(SHEET, 'E6').value = '#BUSY!';
    const busyScan = await workbook.scanSheet(SHEET);
    const busy = await workbook.copySheet(request(workbook, busyScan, { kind: 'sheet' }));
    expect(busy).toMatchObject({
      kind: 'failed',
      code: 'NotReady',
      message:
        'a result is still being computed (E6); wait until they show numbers, then make the copy; nothing was copied',
    });
    excel.cell(SHEET, 'E6').value = 'Choose Orange button';
    const taken = await workbook.copySheet({ ...request(workbook, shown, { kind: 'sheet' }), newSheet: 'plan' });
    expect(taken).toMatchObject({
      kind: 'failed',
      code: 'InvalidArgument',
      message: 'a sheet named "plan" exists already; nothing was copied',
    });
    excel.apiVersion = '1.11';
    const old = await workbook.copySheet(request(workbook, shown, { kind: 'sheet' }));
    expect(old).toMatchObject({ kind: 'failed', code: 'NotSupported', restored: true });
    excel.cell(SHEET, 'E6').value = 'Choose Orange button: its expected loss 0.0012% is within the 0.040% allowed';
    expect(excel.snapshot()).toBe(before);
  });

  test('two clicks make one copy: the second waits, then finds the name taken', async () => {
    const excel = demoSheet();
    const workbook = workbookOn(excel);
    const shown = await workbook.scanSheet(SHEET);
    const [first, second] = await Promise.all([
      workbook.copySheet(request(workbook, shown, { kind: 'sheet' })),
      workbook.copySheet(request(workbook, shown, { kind: 'sheet' })),
    ]);
    expect(first.kind).toBe('written');
    expect(second).toMatchObject({
      kind: 'failed',
      message: 'a sheet named "Checkout test (shared)" exists already; nothing was copied',
    });
    expect(excel.sheetNames()).toEqual([SHEET, 'Checkout test (shared)', 'Plan']);
  });
});

describe('a printed page (writeBlock on a new sheet)', () => {
  test('column widths and the page layout are set on the new sheet: portrait, one page wide and tall, the block as print area', async () => {
    const excel = mockExcel(['Sheet1']);
    const workbook = workbookOn(excel);
    const outcome = await workbook.writeBlock({
      sheet: 'Summary',
      newSheet: true,
      topLeft: 'A1',
      cells: [
        ['Title', ''],
        ['Line', 1],
      ],
      columnWidths: [150, 60],
      page: { orientation: 'Portrait', fitToOnePage: true, printBlockOnly: true },
    });
    expect(outcome).toEqual({ kind: 'written', address: 'Summary!A1:B2' });
    expect(excel.pageLayout('Summary')).toEqual({
      orientation: 'Portrait',
      zoom: { horizontalFitToPages: 1, verticalFitToPages: 1 },
      printArea: 'A1:B2',
      centerHorizontally: true,
    });
    expect([excel.columnWidth('Summary', 'A'), excel.columnWidth('Summary', 'B')]).toEqual([150, 60]);
  });

  test('widths and a page layout are refused on an existing sheet, before anything is read', async () => {
    const excel = mockExcel(['Sheet1']);
    const before = excel.snapshot();
    const outcome = await workbookOn(excel).writeBlock({
      sheet: 'Sheet1',
      topLeft: 'A1',
      cells: [['x']],
      page: { orientation: 'Portrait', fitToOnePage: true, printBlockOnly: true },
    });
    expect(outcome).toMatchObject({
      kind: 'failed',
      code: 'InvalidArgument',
      message: 'column widths and a page layout are set only on a new sheet',
    });
    expect(excel.snapshot()).toBe(before);
  });

  test('a summary sheet whose write fails is deleted again with its page layout', async () => {
    const excel = mockExcel(['Sheet1']);
    const before = excel.snapshot();
    excel.failures = [
      { call: excel.syncCalls + 2, code: 'GeneralException', message: 'The request failed.', partial: true },
    ];
    const outcome = await workbookOn(excel).writeBlock({
      sheet: 'Summary',
      newSheet: true,
      topLeft: 'A1',
      cells: [['Title']],
      columnWidths: [150],
      page: { orientation: 'Portrait', fitToOnePage: true, printBlockOnly: true },
    });
    expect(outcome).toMatchObject({ kind: 'failed', restored: true });
    expect(excel.snapshot()).toBe(before);
  });
});
