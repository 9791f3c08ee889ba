/**
 * @jest-environment jsdom
 *
 * The side panel's view wiring without Fluent's custom elements (they stay unknown elements here): the
 * ask-before-overwrite flow, the Prior section writing its live formula into the selected cell of an
 * office-addin-mock workbook, and the Plan section refusing to insert numbers computed for other inputs
 * (here the button's disabled attribute does nothing, so the section's own guard is what is tested). The
 * browser flows (test/browser/panel*.test.ts) cover the real elements.
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

import { createContext, writeAsking } from '../../taskpane/view/context';
import { priorSection } from '../../taskpane/view/priorSection';
import { planSection, PLAN_DEBOUNCE_MS } from '../../taskpane/view/planSection';
import { visitorsNeeded } from '../../functions/stats/planning';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import { priorBlock } from '../../taskpane/logic/formulas';
import { createOfficeWorkbook } from '../../taskpane/workbook/officeWorkbook';
import { mockExcel } from './mockExcel';

const settle = async (): Promise<void> => {
  for (let i = 0; i < 20; i += 1) await new Promise((resolve) => setTimeout(resolve, 0));
};

beforeAll(() => {
  // jsdom has no canvas; chart.js then reports that it cannot draw, which these tests do not look at.
  jest.spyOn(console, 'error').mockImplementation(() => undefined);
  HTMLCanvasElement.prototype.getContext = (() => null) as never;
});

describe('writeAsking', () => {
  test('an occupied area shows which cells and writes only after "Overwrite"', async () => {
    const excel = mockExcel(['Sheet1']);
    excel.set('Sheet1', 'B1', [['old alpha']]);
    const workbook = createOfficeWorkbook(excel.run);
    const status = document.createElement('div');
    document.body.append(status);
    const pending = writeAsking(
      workbook,
      priorBlock({ kind: 'mean', meanRate: 0.04, strength: 500 }, 'A1', 'Sheet1'),
      status,
      'the prior',
    );
    await settle();
    expect(status.textContent).toBe(
      'Sheet1!A1:B1 is not empty (B1). Write the prior over it? Its current contents will be replaced.OverwriteCancel',
    );
    expect(excel.cell('Sheet1', 'A1').formula).toBe('');
    (status.querySelector('#confirm-overwrite') as HTMLElement).click();
    await expect(pending).resolves.toEqual({ kind: 'written', address: 'Sheet1!A1:B1' });
    expect(excel.cell('Sheet1', 'A1').formula).toBe('=ABTEST.PRIOR_FROM_MEAN(0.04,500)');
    expect(excel.cell('Sheet1', 'B1').formula).toBe('');
  });

  test('"Cancel" writes nothing', async () => {
    const excel = mockExcel(['Sheet1']);
    excel.set('Sheet1', 'A1', [['keep']]);
    const workbook = createOfficeWorkbook(excel.run);
    const status = document.createElement('div');
    const pending = writeAsking(
      workbook,
      priorBlock({ kind: 'mean', meanRate: 0.04, strength: 500 }, 'A1', 'Sheet1'),
      status,
      'the prior',
    );
    await settle();
    (status.querySelector('#cancel-overwrite') as HTMLElement).click();
    await expect(pending).resolves.toBeNull();
    expect(status.textContent).toBe('Nothing was written.');
    expect(excel.cell('Sheet1', 'A1').formula).toBe('keep');
  });
});

describe('Prior section', () => {
  test('summarises the typed prior and writes =ABTEST.PRIOR_FROM_MEAN into the selected cell', async () => {
    const excel = mockExcel(['Checkout test']);
    excel.selection = { sheet: 'Checkout test', address: 'F3:G9' };
    const workbook = createOfficeWorkbook(excel.run);
    const context = createContext(workbook, () => undefined);
    const root = document.createElement('div');
    document.body.append(root);
    root.append(priorSection(context));
    await settle();
    // defaults: typical rate 4%, worth 200 visitors → Beta(8, 192)
    expect(root.querySelector('#prior-parameters')?.textContent).toBe('Beta(alpha = 8, beta = 192)');
    expect(context.state.prior).toEqual({ alpha: 8, beta: 192 });
    const strength = root.querySelector('#prior-strength') as HTMLElement & { value?: string };
    strength.setAttribute('value', '20000');
    strength.dispatchEvent(new Event('input'));
    await settle();
    expect(root.querySelector('#prior-warning')?.textContent).toContain(
      'This prior is worth about 20,000 visitors, more than the 10,000 each variant will get',
    );
    (root.querySelector('#prior-write') as HTMLElement).click();
    await settle();
    await settle();
    expect(excel.cell('Checkout test', 'F3').formula).toBe('=ABTEST.PRIOR_FROM_MEAN(0.04,20000)');
    expect(root.querySelector('#prior-status')?.textContent).toBe(
      "Wrote the prior to 'Checkout test'!F3:G3. The cells hold live formulas.",
    );
  });
});

describe('Plan section', () => {
  const wait = (ms: number): Promise<void> => new Promise((resolve) => setTimeout(resolve, ms));
  const type = (root: HTMLElement, id: string, text: string): void => {
    const input = root.querySelector(`#${id}`) as HTMLElement & { value?: string };
    input.value = text;
    input.setAttribute('value', text);
    input.dispatchEvent(new Event('input'));
  };

  test('follows the fields; while out of date it inserts nothing; then it inserts exactly the inputs shown', async () => {
    const excel = mockExcel(['Plan']);
    excel.selection = { sheet: 'Plan', address: 'B2' };
    const workbook = createOfficeWorkbook(excel.run);
    const context = createContext(workbook, () => undefined);
    const root = document.createElement('div');
    document.body.append(root);
    root.append(planSection(context));
    await wait(PLAN_DEBOUNCE_MS + 50);
    await settle();
    const perVariant = (): string | null | undefined => root.querySelector('#plan-per-variant')?.textContent;
    expect(perVariant()).toBe(
      `Visitors per variant: ${visitorsNeeded(0.04, 0.1, 0.95, 0.8, UNIFORM_PRIOR).toLocaleString('en-US')}`,
    );

    type(root, 'plan-baseline', '8');
    const results = root.querySelector('#plan-results') as HTMLElement;
    expect(results.classList.contains('stale')).toBe(true);
    expect(root.querySelector('#plan-insert')?.hasAttribute('disabled')).toBe(true);
    (root.querySelector('#plan-insert') as HTMLElement).click();
    await settle();
    expect(root.querySelector('#plan-status')?.textContent).toBe(
      'The plan on screen is not the one for the current inputs yet. Wait until it is updated, then insert it.',
    );
    expect(excel.cell('Plan', 'C3').formula).toBe('');

    await wait(PLAN_DEBOUNCE_MS + 50);
    await settle();
    expect(results.classList.contains('stale')).toBe(false);
    expect(perVariant()).toBe(
      `Visitors per variant: ${visitorsNeeded(0.08, 0.1, 0.95, 0.8, UNIFORM_PRIOR).toLocaleString('en-US')}`,
    );
    (root.querySelector('#plan-insert') as HTMLElement).click();
    await settle();
    await settle();
    expect(excel.cell('Plan', 'C3').formula).toBe(0.08);
    expect(excel.cell('Plan', 'C3').numberFormat).toBe('0.00%');
    expect(root.querySelector('#plan-status')?.textContent).toBe(
      'Wrote the plan to Plan!B2:C16. The cells hold live formulas.',
    );
  }, 30_000);
});
