/**
 * The Office.js implementation of the side panel's Workbook, on office-addin-mock (OfficeMockObject)
 * proxies over a small in-memory grid (test/taskpane/mockExcel.ts): what is written where, that it
 * is formulas and not values, that nothing is left written when a sync fails, and that charts are added.
 */
// The shared stub for office-addin-manifest (test/setup/officeAddinManifestStub.js) is empty, but
// office-addin-mock reads its OfficeApp enum (it compares a mock's host with OfficeApp.Outlook), so
// these tests give it the enum's values (as office-addin-manifest 3 defines them).
jest.mock('office-addin-manifest', () => ({
  OfficeApp: { Excel: 'excel', OneNote: 'onenote', Outlook: 'outlook', PowerPoint: 'powerpoint', Project: 'project', Word: 'word' },
}));

import { createOfficeWorkbook } from '../../taskpane/workbook/officeWorkbook';
import { planBlock, priorBlock, readoutBlock } from '../../taskpane/logic/formulas';
import { mockExcel } from './mockExcel';

const table = [
  ['Variant', 'Visitors', 'Conversions'],
  ['Green button', 10000, 412],
  ['Orange button', 10050, 455],
  ['Blue button', 9980, 430],
];

describe('reading', () => {
  test('readSelection gives the sheet-qualified address, values and formulas', async () => {
    const excel = mockExcel(['Checkout test', 'Sheet2']);
    excel.set('Checkout test', 'A1:C4', table);
    excel.set('Checkout test', 'E1', [['=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4)']]);
    excel.selection = { sheet: 'Checkout test', address: 'A1:C4' };
    const workbook = createOfficeWorkbook(excel.run);
    const selection = await workbook.readSelection();
    expect(selection.address).toBe("'Checkout test'!A1:C4");
    expect(selection.sheet).toBe('Checkout test');
    expect(selection.localAddress).toBe('A1:C4');
    expect(selection.rowCount).toBe(4);
    expect(selection.columnCount).toBe(3);
    expect(selection.values[2]).toEqual(['Orange button', 10050, 455]);
    const formulaCell = await workbook.readRange('E1', 'Checkout test');
    expect(formulaCell.formulas).toEqual([['=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4)']]);
  });

  test('readRange on an unknown sheet rejects with the Office error code', async () => {
    const excel = mockExcel(['Sheet1']);
    const workbook = createOfficeWorkbook(excel.run);
    await expect(workbook.readRange('A1', 'Nope')).rejects.toMatchObject({ code: 'ItemNotFound' });
  });

  test('activeSheetName reads the active worksheet', async () => {
    const excel = mockExcel(['Plan', 'Other']);
    excel.activeSheet = 'Other';
    await expect(createOfficeWorkbook(excel.run).activeSheetName()).resolves.toBe('Other');
  });
});

describe('writing a block', () => {
  test('the plan lands as formulas where asked, with number formats and bold labels, in one write sync', async () => {
    const excel = mockExcel(['Plan']);
    const workbook = createOfficeWorkbook(excel.run);
    const { block, cells } = planBlock(
      { baselineRate: 0.04, lift: 0.1, threshold: 0.95, power: 0.8, variants: 2, dailyVisitors: 4000, trafficShare: 1, classicAlpha: 0.05 },
      'B2',
      'Plan',
    );
    const before = excel.syncCalls;
    const outcome = await workbook.writeBlock(block);
    expect(outcome).toEqual({ kind: 'written', address: 'Plan!B2:C16' });
    // one sync to read the area, one to write it
    expect(excel.syncCalls - before).toBe(2);
    expect(excel.cell('Plan', 'B2').formula).toBe('Test plan (Lift Ledger)');
    expect(excel.cell('Plan', 'B2').bold).toBe(true);
    expect(excel.cell('Plan', 'C3').formula).toBe(0.04);
    expect(excel.cell('Plan', 'C3').numberFormat).toBe('0.00%');
    expect(cells.visitorsPerVariant).toBe('C12');
    expect(excel.cell('Plan', cells.visitorsPerVariant as string).formula).toBe('=ABTEST.VISITORS_NEEDED(C3,C4,C11,C6)');
    expect(excel.cell('Plan', cells.days as string).formula).toBe('=7*C14');
    // labels are constants, results are formulas: no pasted numbers
    const column = excel.formulas('Plan', 'C11:C16').map((row) => row[0]);
    expect(column.every((v) => typeof v === 'string' && v.startsWith('='))).toBe(true);
  });

  test('an occupied area is reported cell by cell and left untouched; overwrite writes', async () => {
    const excel = mockExcel(['Sheet1']);
    excel.set('Sheet1', 'G2', [['keep me']]);
    const workbook = createOfficeWorkbook(excel.run);
    const block = priorBlock({ kind: 'mean', meanRate: 0.04, strength: 500 }, 'F2', 'Sheet1');
    const snapshot = excel.snapshot();
    const outcome = await workbook.writeBlock(block);
    // the prior spills alpha, beta: G2 is in its area
    expect(outcome).toEqual({ kind: 'occupied', address: 'Sheet1!F2:G2', occupiedCells: ['G2'] });
    expect(excel.snapshot()).toBe(snapshot);
    const forced = await workbook.writeBlock({ ...block, overwrite: true });
    expect(forced.kind).toBe('written');
    expect(excel.cell('Sheet1', 'F2').formula).toBe('=ABTEST.PRIOR_FROM_MEAN(0.04,500)');
  });

  test('a failed write sync that Excel applied in part is rolled back: the cells are as before', async () => {
    const excel = mockExcel(['Checkout test']);
    excel.set('Checkout test', 'A1:C4', table);
    excel.set('Checkout test', 'E30', [['notes']]);
    const workbook = createOfficeWorkbook(excel.run);
    const built = readoutBlock(
      { namesRef: 'A2:A4', visitorsRef: 'B2:B4', conversionsRef: 'C2:C4', sharesRef: null, variants: 3 },
      { level: 0.95, prior: { alpha: 1, beta: 1 }, densityPoints: 11, currentSrmPValue: 0.5 },
      'E1',
      'Checkout test',
    );
    const snapshot = excel.snapshot();
    // sync 1 reads the area, sync 2 writes it: make the write fail after part of it landed
    excel.failures = [{ call: excel.syncCalls + 2, code: 'GeneralException', message: 'The request failed.', partial: true }];
    const outcome = await workbook.writeBlock({ ...built.block, area: { rowCount: 28, columnCount: 10 } });
    expect(outcome).toEqual({
      kind: 'failed',
      address: "'Checkout test'!E1:N28",
      code: 'GeneralException',
      message: "nothing was written to 'Checkout test'!E1:N28 (The request failed.)",
      restored: true,
    });
    // part of the batch did land (as Excel may leave it) …
    expect(excel.partialSnapshots).toHaveLength(1);
    expect(excel.partialSnapshots[0]).not.toBe(snapshot);
    expect(excel.partialSnapshots[0]).toContain('=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4,F8,F9)');
    // … and the panel put every cell back
    expect(excel.snapshot()).toBe(snapshot);
  });

  test('when putting the cells back fails too, the outcome says so', async () => {
    const excel = mockExcel(['Sheet1']);
    const workbook = createOfficeWorkbook(excel.run);
    const block = priorBlock({ kind: 'mean', meanRate: 0.04, strength: 500 }, 'A1', 'Sheet1');
    excel.failures = [
      { call: excel.syncCalls + 2, code: 'InvalidArgument', message: 'bad write', partial: true },
      { call: excel.syncCalls + 3, code: 'GeneralException', message: 'lost connection', partial: false },
    ];
    const outcome = await workbook.writeBlock(block);
    expect(outcome).toMatchObject({ kind: 'failed', code: 'InvalidArgument', restored: false });
    expect(outcome.kind === 'failed' && outcome.message).toBe(
      'writing to Sheet1!A1:B1 failed (bad write) and putting back its previous contents failed too (lost connection); check those cells',
    );
  });

  test('a failure while reading the area writes nothing and says why', async () => {
    const excel = mockExcel(['Sheet1']);
    const workbook = createOfficeWorkbook(excel.run);
    excel.failures = [{ call: excel.syncCalls + 1, code: 'GeneralException', message: 'busy', partial: false }];
    const outcome = await workbook.writeBlock(priorBlock({ kind: 'mean', meanRate: 0.1, strength: 10 }, 'C3', 'Sheet1'));
    expect(outcome).toEqual({ kind: 'failed', address: 'C3:D3', code: 'GeneralException', message: 'could not read C3:D3: busy', restored: true });
    expect(excel.cell('Sheet1', 'C3').formula).toBe('');
  });

  test('a malformed block is refused before anything is read or written', async () => {
    const excel = mockExcel(['Sheet1']);
    const workbook = createOfficeWorkbook(excel.run);
    const outcome = await workbook.writeBlock({ topLeft: 'A1', cells: [['a', 'b'], ['c']] });
    expect(outcome).toEqual({ kind: 'failed', address: 'A1:B2', code: 'InvalidArgument', message: 'the block to write is not rectangular', restored: true });
    expect(excel.syncCalls).toBe(0);
  });

  test('the read-out block writes the warning fill on the SRM cells when the current p-value is below 0.001', async () => {
    const excel = mockExcel(['Sheet1']);
    const workbook = createOfficeWorkbook(excel.run);
    const built = readoutBlock(
      { namesRef: null, visitorsRef: 'B2:B3', conversionsRef: 'C2:C3', sharesRef: null, variants: 2 },
      { level: 0.9, prior: { alpha: 1, beta: 1 }, densityPoints: 5, currentSrmPValue: 1e-6 },
      'E1',
      'Sheet1',
    );
    expect((await workbook.writeBlock(built.block)).kind).toBe('written');
    const srm = built.cells.srmPValue as string;
    expect(excel.cell('Sheet1', srm).formula).toBe('=ABTEST.SRM_PVALUE(B2:B3)');
    expect(excel.cell('Sheet1', srm).fillColor).toBe('#F4CCCC');
    expect(excel.cell('Sheet1', built.cells.srmVerdict as string).fillColor).toBe('#F4CCCC');
    expect(excel.cell('Sheet1', built.cells.decision as string).fillColor).toBe('');
  });
});

describe('charts and selection events', () => {
  test('insertChart adds a native chart over the source block with its title and position', async () => {
    const excel = mockExcel(['Sheet1']);
    const workbook = createOfficeWorkbook(excel.run);
    const outcome = await workbook.insertChart({
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

  test('a failed chart sync is an outcome, not a rejection, and adds no chart', async () => {
    const excel = mockExcel(['Sheet1']);
    const workbook = createOfficeWorkbook(excel.run);
    excel.failures = [{ call: 1, code: 'InvalidArgument', message: 'bad source', partial: false }];
    const outcome = await workbook.insertChart({ sourceAddress: 'A1:B3', type: 'Line', title: 't', topLeft: 'D1', bottomRight: 'H10' });
    expect(outcome).toEqual({ kind: 'failed', code: 'InvalidArgument', message: 'the chart could not be added (bad source)' });
    expect(excel.charts).toEqual([]);
  });

  test('onSelectionChanged calls the listener and can be removed', async () => {
    const excel = mockExcel(['Sheet1']);
    const workbook = createOfficeWorkbook(excel.run);
    const calls: number[] = [];
    const subscription = await workbook.onSelectionChanged(() => calls.push(1));
    expect(excel.handlers).toHaveLength(1);
    excel.handlers[0]?.();
    expect(calls).toEqual([1]);
    await subscription.remove();
    expect(excel.handlers).toHaveLength(0);
  });
});
