/**
 * @jest-environment jsdom
 *
 * The Share section of the side panel on the mock workbook (test/taskpane/mockExcel.ts), without Fluent's
 * custom elements: "Look at what will be copied" shows the plan, "Make the shareable copy" makes exactly
 * that (values over every ABTEST result, formulas in notes, or in a "How computed" column on an Excel that
 * lacks notes — said in the panel before anything is written), a sheet changed in between is not copied,
 * and a sheet without results offers nothing. The summary is written from the selected variant table on a
 * new sheet; its chances of being best and lift ranges are checked against scipy (test/reference/
 * summary_values.json, case "signup", made by test/reference/addin/summary_reference.py). The sheets are
 * invented; the mock does not calculate, so the copy's values are placeholders the mock carries.
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

import * as fs from 'fs';
import * as path from 'path';
import { readoutBlock } from '../../taskpane/logic/formulas';
import { createContext } from '../../taskpane/view/context';
import { shareSection } from '../../taskpane/view/shareSection';
import { createOfficeWorkbook } from '../../taskpane/workbook/officeWorkbook';
import type { CellValue } from '../../taskpane/workbook/workbook';
import { mockExcel, type MockExcel } from './mockExcel';

const SHEET = 'Checkout test';
const COPY = 'Checkout test (shared)';

const settle = async (): Promise<void> => {
  for (let i = 0; i < 30; i += 1) await new Promise((resolve) => setTimeout(resolve, 0));
};

/** A small read-out beside the invented table: a spilled result, a decision, another formula, a chart. */
function demoSheet(): MockExcel {
  const excel = mockExcel([SHEET, 'Plan']);
  excel.set(SHEET, 'A1:C4', [
    ['Variant', 'Visitors', 'Conversions'],
    ['Green button', 10412, 412],
    ['Orange button', 10388, 463],
    ['Big basket icon', 10451, 431],
  ]);
  excel.spill(SHEET, 'E2:E4', '=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4)', [[0.0396], [0.0447], [0.0413]]);
  excel.style(SHEET, 'E2:E4', { numberFormat: '0.00%' });
  excel.set(SHEET, 'E6', [['=ABTEST.DECISION(C2:C4,B2:B4,,A2:A4)']]);
  excel.cell(SHEET, 'E6').value = 'Choose Orange button';
  excel.set(SHEET, 'E8', [['=SUM(B2:B4)']]);
  excel.cell(SHEET, 'E8').value = 31251;
  excel.addChart(SHEET, 'E2:E4', 'G2', 'K12', 'Posterior means');
  excel.selection = { sheet: SHEET, address: 'E2' };
  return excel;
}

/** The section mounted in a fresh document on a mock workbook. */
function mount(excel: MockExcel): HTMLElement {
  const workbook = createOfficeWorkbook(excel.run, excel.supports);
  const context = createContext(workbook, () => undefined);
  const root = document.createElement('div');
  document.body.replaceChildren(root);
  root.append(shareSection(context));
  return root;
}

const text = (root: HTMLElement, selector: string): string => root.querySelector(selector)?.textContent ?? '';
const click = (root: HTMLElement, selector: string): void => (root.querySelector(selector) as HTMLElement).click();
const disabled = (root: HTMLElement, selector: string): boolean =>
  root.querySelector(selector)?.hasAttribute('disabled') ?? false;

describe('Share section: the shareable copy', () => {
  test('shows the plan first, then copies the whole sheet: results become values with their formulas in notes; the source stays live', async () => {
    const excel = demoSheet();
    const root = mount(excel);
    expect(disabled(root, '#share-copy')).toBe(true);
    click(root, '#share-look');
    await settle();
    expect(text(root, '#share-plan-text')).toBe(
      `A new sheet "${COPY}" right after "${SHEET}": a copy of the whole sheet (A1:E8), in which 2 ABTEST results become plain values, ` +
        'each with its formula in a note. Number formats come along and 1 chart comes along and shows the values. ' +
        `A header line says when and from which cells it was made. "${SHEET}" itself is not changed and stays live.`,
    );
    expect(text(root, '#share-fallback')).toBe('');
    expect(disabled(root, '#share-copy')).toBe(false);
    const source = JSON.stringify(excel.formulas(SHEET, 'A1:E8'));
    click(root, '#share-copy');
    await settle();
    expect(text(root, '#share-status')).toMatch(
      new RegExp(
        `^Made "${COPY.replace(/[()]/g, '\\$&')}" \\('Checkout test \\(shared\\)'!A1:E9\\): 2 ABTEST results are plain values, the formulas in a note on each\\. 1 chart kept\\.`,
      ),
    );
    expect(excel.sheetNames()).toEqual([SHEET, COPY, 'Plan']);
    // One header row on top: E2:E4 of the source is E3:E5 of the copy.
    expect(excel.formulas(COPY, 'E3:E5')).toEqual([[0.0396], [0.0447], [0.0413]]);
    expect(excel.cell(COPY, 'E3').numberFormat).toBe('0.00%');
    expect(excel.formulas(COPY, 'E7')).toEqual([['Choose Orange button']]);
    expect(excel.formulas(COPY, 'E9')).toEqual([['=SUM(B3:B5)']]);
    expect(excel.notes(COPY).E3).toMatch(/^Computed by =ABTEST\.POSTERIOR_MEAN\(C3:C5,B3:B5\)/);
    expect(excel.notes(COPY).E7).toMatch(/^Computed by =ABTEST\.DECISION\(C3:C5,B3:B5,,A3:A5\)/);
    expect(String(excel.formulas(COPY, 'A1')[0]?.[0])).toMatch(/^Frozen copy made .* from 'Checkout test'!A1:E8/);
    expect(JSON.stringify(excel.formulas(SHEET, 'A1:E8'))).toBe(source);
    expect(excel.notes(SHEET)).toEqual({});
    // The plan was used: a second copy needs a new look.
    expect(disabled(root, '#share-copy')).toBe(true);
  });

  test('an Excel without notes (ExcelApi 1.16): the panel says so before copying, and the formulas go into a "How computed" column', async () => {
    const excel = demoSheet();
    excel.apiVersion = '1.16';
    const root = mount(excel);
    click(root, '#share-look');
    await settle();
    expect(text(root, '#share-plan-text')).toContain('each with its formula in a "How computed" column (column F)');
    expect(text(root, '#share-fallback')).toBe(
      'This Excel cannot add notes to cells (it lacks the Excel JavaScript API 1.18), so the formulas go into a column beside the values instead.',
    );
    click(root, '#share-copy');
    await settle();
    expect(text(root, '#share-status')).toContain('the formulas in column F (How computed)');
    expect(excel.notes(COPY)).toEqual({});
    expect(excel.writeLog.some((line) => line.startsWith('note '))).toBe(false);
    expect(excel.formulas(COPY, 'F1')).toEqual([['How computed']]);
    expect(excel.formulas(COPY, 'F3')).toEqual([['E3: =ABTEST.POSTERIOR_MEAN(C3:C5,B3:B5) (filled E3:E5)']]);
    expect(excel.formulas(COPY, 'E3:E5')).toEqual([[0.0396], [0.0447], [0.0413]]);
  });

  test('only the selected cells: the selection is widened to whole results and the rest of the sheet is left out', async () => {
    const excel = demoSheet();
    excel.selection = { sheet: SHEET, address: 'E3:E6' };
    const root = mount(excel);
    (root.querySelector('#share-scope') as HTMLElement & { value?: string }).value = 'cells';
    click(root, '#share-look');
    await settle();
    expect(text(root, '#share-plan-text')).toContain(
      'a copy of the cells E2:E6 (the selection, widened so that no result is cut in two), with the rest of the sheet left out',
    );
    click(root, '#share-copy');
    await settle();
    expect(text(root, '#share-status')).toMatch(/^Made "Checkout test \(shared\)"/);
    expect(excel.formulas(COPY, 'A2:C5')).toEqual([
      ['', '', ''],
      ['', '', ''],
      ['', '', ''],
      ['', '', ''],
    ]);
    expect(excel.formulas(COPY, 'E3:E5')).toEqual([[0.0396], [0.0447], [0.0413]]);
    expect(excel.formulas(COPY, 'E9')).toEqual([['']]);
  });

  test('only the selected cells, with a whole column selected: asks for the read-out’s cells and copies nothing', async () => {
    const excel = demoSheet();
    excel.selection = { sheet: SHEET, address: 'E:E' };
    const root = mount(excel);
    (root.querySelector('#share-scope') as HTMLElement & { value?: string }).value = 'cells';
    click(root, '#share-look');
    await settle();
    expect(text(root, '#share-status')).toBe(
      'Select the cells of a read-out, not whole rows or columns, or choose the whole sheet.',
    );
    expect(disabled(root, '#share-copy')).toBe(true);
    expect(excel.sheetNames()).toEqual([SHEET, 'Plan']);
    // The whole sheet needs no cells selected: it is the active sheet.
    (root.querySelector('#share-scope') as HTMLElement & { value?: string }).value = 'sheet';
    click(root, '#share-look');
    await settle();
    expect(text(root, '#share-plan-text')).toContain('a copy of the whole sheet (A1:E8)');
    expect(disabled(root, '#share-copy')).toBe(false);
  });

  test('a sheet whose formulas changed after the plan was shown is not copied; the new plan is shown', async () => {
    const excel = demoSheet();
    const root = mount(excel);
    click(root, '#share-look');
    await settle();
    excel.set(SHEET, 'E10', [['=ABTEST.SRM_PVALUE(B2:B4)']]);
    excel.cell(SHEET, 'E10').value = 0.9;
    const before = excel.snapshot();
    click(root, '#share-copy');
    await settle();
    expect(text(root, '#share-status')).toBe(
      `Nothing was copied: the formulas on "${SHEET}" changed since the plan was shown. Look at the new plan below, then press the button again.`,
    );
    expect(excel.snapshot()).toBe(before);
    expect(text(root, '#share-plan-text')).toContain('3 ABTEST results become plain values');
    expect(disabled(root, '#share-copy')).toBe(false);
  });

  test('a sheet without ABTEST results: says why, and the copy button stays off', async () => {
    const excel = demoSheet();
    excel.selection = { sheet: 'Plan', address: 'A1' };
    excel.activeSheet = 'Plan';
    excel.set('Plan', 'A1:B1', [['Baseline', 0.04]]);
    const root = mount(excel);
    click(root, '#share-look');
    await settle();
    expect(text(root, '#share-problem')).toBe(
      'Cannot copy: "Plan" holds no ABTEST result, so there is nothing to freeze.',
    );
    expect(disabled(root, '#share-copy')).toBe(true);
    click(root, '#share-copy');
    await settle();
    expect(excel.sheetNames()).toEqual([SHEET, 'Plan']);
  });
});

interface ReferenceCase {
  names: string[];
  visitors: number[];
  conversions: number[];
  prob_best: number[];
  lift: [number, number, number][];
  decision: { index: number; choose: boolean };
}

const REFERENCE = JSON.parse(
  fs.readFileSync(path.join(__dirname, '..', 'reference', 'addin/summary_values.json'), 'utf8'),
) as Record<string, ReferenceCase>;

/** Guardrail probabilities from scipy (test/reference/addin/summary_guardrails.py). */
interface GuardrailReference {
  averages: { count: number[]; mean: number[]; sd: number[] };
  counts: { events: number[]; exposure: number[] };
  averages_prob_lift_above: Record<string, number[]>;
  counts_prob_lift_above: Record<string, number[]>;
}
const GUARDRAILS = JSON.parse(
  fs.readFileSync(path.join(__dirname, '..', 'reference', 'addin/summary_guardrails.json'), 'utf8'),
) as Record<string, GuardrailReference>;

describe('Share section: the summary for people who decide', () => {
  /** The invented sign-up test of the scipy reference, as a variant table with headings. */
  function signupSheet(): MockExcel {
    const ref = REFERENCE.signup as ReferenceCase;
    const excel = mockExcel(['Sign-up test']);
    excel.set('Sign-up test', 'A1:C4', [
      ['Version', 'Visitors', 'Conversions'],
      ...ref.names.map((name, i) => [name, ref.visitors[i] as number, ref.conversions[i] as number]),
    ]);
    excel.selection = { sheet: 'Sign-up test', address: 'A1:C4' };
    return excel;
  }

  const setField = (root: HTMLElement, id: string, value: string): void => {
    const input = root.querySelector(`#${id}`) as HTMLElement & { value?: string };
    input.value = value;
    input.setAttribute('value', value);
  };

  test('from the selected table: a new sheet whose chances of being best and lift ranges agree with scipy, as values', async () => {
    const ref = REFERENCE.signup as ReferenceCase;
    const excel = signupSheet();
    const root = mount(excel);
    expect(disabled(root, '#summary-write')).toBe(true);
    click(root, '#summary-use-selection');
    await settle();
    expect(text(root, '#summary-variants')).toBe(
      'Short form (control): 402 conversions of 9,840 visitorsForm with photo: 455 conversions of 9,910 visitorsTwo-step form: 418 conversions of 9,875 visitors',
    );
    // The title starts as the sheet's name; the user says what was tested.
    expect((root.querySelector('#summary-title') as HTMLElement & { value?: string }).value).toBe('Sign-up test');
    setField(root, 'summary-title', 'Sign-up form');
    setField(root, 'summary-days', '21');
    click(root, '#summary-write');
    await settle();
    const summary = 'Sign-up test summary';
    expect(text(root, '#summary-status')).toMatch(
      /^Wrote the summary to 'Sign-up test summary'!A1:G\d+, set to print on one page\. It recommends a version\./,
    );
    expect(excel.sheetNames()).toEqual(['Sign-up test', summary]);
    expect(excel.formulas(summary, 'A1')).toEqual([['Summary for decision-makers: Sign-up form']]);
    // Find the table rows by the versions' names; P(best) in column E, the lift range in F:G (from, to).
    const column = excel.formulas(summary, 'A1:G60');
    ref.names.forEach((_, i) => {
      const row = column.find(
        (r) =>
          typeof r[0] === 'string' &&
          (r[0] as string).startsWith(i === 0 ? `${ref.names[0]}` : (ref.names[i] as string)) &&
          typeof r[1] === 'number',
      );
      expect(row).toBeDefined();
      const cells = row as unknown[];
      expect(cells.slice(1, 3)).toEqual([ref.visitors[i], ref.conversions[i]]);
      expect(Math.abs((cells[4] as number) - (ref.prob_best[i] as number))).toBeLessThan(1e-9);
      if (i > 0) {
        const [lower, , upper] = ref.lift[i - 1] as [number, number, number];
        expect(Math.abs((cells[5] as number) - lower)).toBeLessThan(1e-8);
        expect(Math.abs((cells[6] as number) - upper)).toBeLessThan(1e-8);
      }
    });
    // The running text, its wrapped lines joined again.
    const words = column
      .map((r) => String(r[0]))
      .join(' ')
      .replace(/\s+/g, ' ');
    expect(words).toContain('Go with Form with photo.');
    expect(words).toContain('over 21 days');
    expect(words).toContain('have a qualified statistician');
    expect(excel.pageLayout(summary)).toMatchObject({
      orientation: 'Portrait',
      zoom: { horizontalFitToPages: 1, verticalFitToPages: 1 },
    });
    // The source table is untouched.
    expect(excel.formulas('Sign-up test', 'A2:C2')).toEqual([['Short form', 9840, 402]]);
  });

  test('a read-out of the table with guardrails: the summary carries each one, its chance per version (scipy) and the decision that does not switch', async () => {
    const ref = REFERENCE.signup as ReferenceCase;
    const guard = GUARDRAILS.signup as GuardrailReference;
    const excel = mockExcel(['Sign-up test']);
    // The invented sign-up table with two invented guardrail metrics (summary_guardrails.py, case "signup").
    excel.set('Sign-up test', 'A1:H4', [
      ['Version', 'Visitors', 'Conversions', 'Count', 'Mean order value', 'SD', 'Contacts', 'User-days'],
      ...ref.names.map((name, i) => [
        name,
        ref.visitors[i] as number,
        ref.conversions[i] as number,
        guard.averages.count[i] as number,
        guard.averages.mean[i] as number,
        guard.averages.sd[i] as number,
        guard.counts.events[i] as number,
        guard.counts.exposure[i] as number,
      ]),
    ]);
    // The read-out "Insert read-out" writes for it at J1, with an averages and an event-rate guardrail.
    const built = readoutBlock(
      {
        sheet: 'Sign-up test',
        namesRef: 'A2:A4',
        visitorsRef: 'B2:B4',
        conversionsRef: 'C2:C4',
        sharesRef: null,
        variants: 3,
        refs: { count: 'D2:D4', mean: 'E2:E4', sd: 'F2:F4', events: 'G2:G4', exposure: 'H2:H4' },
      },
      { level: 0.95, prior: { alpha: 1, beta: 1 }, densityPoints: 11, currentSrmPValue: 1 },
      'J1',
      'Sign-up test',
      [
        { kind: 'averages', direction: 'noWorse', limit: -0.02, required: 0.85 },
        { kind: 'counts', direction: 'noHigher', limit: 0.05, required: 0.95 },
      ],
    );
    const rows = built.block.cells.length;
    const columns = (built.block.cells[0] as unknown[]).length;
    excel.set('Sign-up test', `J1:${String.fromCharCode(74 + columns - 1)}${rows}`, built.block.cells as CellValue[][]);
    excel.selection = { sheet: 'Sign-up test', address: 'A1:C4' };
    const root = mount(excel);
    click(root, '#summary-use-selection');
    await settle();
    expect(text(root, '#summary-guardrails')).toBe(
      "Guardrails from the read-out at 'Sign-up test'!J1: average lift no worse than −2.0% (with at least 85%); " +
        'event rate lift no higher than +5.0% (with at least 95%).',
    );
    click(root, '#summary-write');
    await settle();
    const page = excel.formulas('Sign-up test summary', 'A1:G60');
    const words = page
      .map((r) => String(r[0]))
      .join(' ')
      .replace(/\s+/g, ' ');
    expect(words).toContain('Do not switch to Form with photo yet: it fails a guardrail.');
    expect(words).toContain('Guardrail 1: average lift no worse than −2.0%, with a chance of at least 85%.');
    expect(words).toContain('Guardrail 2: event rate lift no higher than +5.0%, with a chance of at least 95%.');
    expect(words).not.toContain('No guardrails were set');
    // The rows of each guardrail: the chance it holds as a value, against scipy; "no higher than" holds with 1 − P.
    const results = page.filter((r) => r[5] === 'passes' || r[5] === 'fails');
    const averages = guard.averages_prob_lift_above['-0.02'] as number[];
    const counts = guard.counts_prob_lift_above['0.05'] as number[];
    const expected = [...averages, ...counts.map((p) => 1 - p)];
    expect(results.map((r) => String(r[0]).trim())).toEqual([
      'Form with photo',
      'Two-step form',
      'Form with photo',
      'Two-step form',
    ]);
    results.forEach((r, i) => expect(Math.abs((r[4] as number) - (expected[i] as number))).toBeLessThan(1e-9));
    expect(results.map((r) => r[5])).toEqual(['passes', 'fails', 'fails', 'fails']);
    // A read-out of another table (other rows) is not taken for this one's.
    const other = mockExcel(['Sign-up test']);
    other.set('Sign-up test', 'A1:C4', [
      ['Version', 'Visitors', 'Conversions'],
      ...ref.names.map((name, i) => [name, ref.visitors[i] as number, ref.conversions[i] as number]),
    ]);
    other.set('Sign-up test', 'J1:J3', [
      ['Read-out (Lift Ledger)'],
      ['="Guardrail 1: P(average lift > "&ROUND(100*K12,2)&"%)"'],
      ['=ABTEST.MEAN_PROB_LIFT_ABOVE(D3:D5,E3:E5,F3:F5,K12)'],
    ]);
    other.selection = { sheet: 'Sign-up test', address: 'A1:C4' };
    const again = mount(other);
    click(again, '#summary-use-selection');
    await settle();
    expect(text(again, '#summary-guardrails')).toMatch(/^No read-out of this table with guardrails was found/);
  });

  test('bad fields: nothing is written and each field says what is wrong', async () => {
    const excel = signupSheet();
    const root = mount(excel);
    click(root, '#summary-use-selection');
    await settle();
    setField(root, 'summary-title', '  ');
    setField(root, 'summary-days', '2.5');
    setField(root, 'summary-level', '0.95');
    click(root, '#summary-write');
    await settle();
    expect(text(root, '#summary-title-message')).toBe('Say what was tested, in a few words.');
    expect(text(root, '#summary-days-message')).toMatch(/^Days the test ran: /);
    expect(text(root, '#summary-level-message')).toBe(
      'Credible level: 0.95 here means 0.95%, because this field takes a percent. For 95% type 95, not 0.95.',
    );
    expect(text(root, '#summary-status')).toMatch(/^Nothing was written: say what was tested; /);
    expect(excel.sheetNames()).toEqual(['Sign-up test']);
  });

  test('a selection that is not a variant table: says so and offers nothing to write', async () => {
    const excel = signupSheet();
    excel.selection = { sheet: 'Sign-up test', address: 'A1' };
    const root = mount(excel);
    click(root, '#summary-use-selection');
    await settle();
    expect(text(root, '#summary-problems')).toMatch(/^'Sign-up test'!A1: /);
    expect(disabled(root, '#summary-write')).toBe(true);
  });

  test('a summary sheet that exists already is never written over: the new one gets the next free name', async () => {
    const excel = mockExcel(['Sign-up test', 'Sign-up test summary']);
    const ref = REFERENCE.signup as ReferenceCase;
    excel.set('Sign-up test', 'A1:C4', [
      ['Version', 'Visitors', 'Conversions'],
      ...ref.names.map((name, i) => [name, ref.visitors[i] as number, ref.conversions[i] as number]),
    ]);
    excel.set('Sign-up test summary', 'A1', [['my own notes']]);
    excel.selection = { sheet: 'Sign-up test', address: 'A1:C4' };
    const root = mount(excel);
    click(root, '#summary-use-selection');
    await settle();
    click(root, '#summary-write');
    await settle();
    expect(excel.sheetNames()).toEqual(['Sign-up test', 'Sign-up test summary', 'Sign-up test summary (2)']);
    expect(excel.formulas('Sign-up test summary', 'A1')).toEqual([['my own notes']]);
    expect(excel.formulas('Sign-up test summary (2)', 'A1')).toEqual([['Summary for decision-makers: Sign-up test']]);
  });
});
