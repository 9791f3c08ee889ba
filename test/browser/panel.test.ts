/**
 * The side panel's flows in the preview (Debian's chromium through playwright-core): fit a prior from
 * the "Past tests" sheet and write it; plan a test and insert the plan; insert a read-out beside a
 * variant table and check its cells' values against the statistics core (functions/stats/… called here
 * directly); explain a cell. Every written cell must be a live formula. Screenshots go to test-artifacts/.
 * The tables typed here are invented (the garden-supply shop's checkout buttons).
 */
import type { Frame, Page } from 'playwright-core';
import {
  expectedLoss,
  liftInterval,
  posteriorMean,
  probAboveControl,
  probHighest,
  rateInterval,
} from '../../functions/stats/conversion';
import { priorFromHistory } from '../../functions/stats/prior';
import { classicSampleSize, visitorsNeeded } from '../../functions/stats/planning';
import { srmPValue } from '../../functions/stats/srm';
import { UNIFORM_PRIOR, type ConversionCounts } from '../../functions/stats/types';
import { planBlock, readoutBlock } from '../../taskpane/logic/formulas';
import { parseAddress } from '../../taskpane/workbook/address';
import {
  cellLocator,
  enterCell,
  openPreview,
  panelFrame,
  readCell,
  screenshot,
  selectCell,
  switchSheet,
  type OpenPreview,
} from './previewHelpers';

type Cell = number | string | boolean;

/** The formula text (input) and live value of a cell, from the preview's workbook. */
async function cellInput(
  page: Page,
  sheet: string,
  address: string,
): Promise<{ input: string; value: Cell; fill?: string }> {
  const p = parseAddress(address).start;
  return page.evaluate(
    ([s, row, col]) => {
      const handle = window.liftLedgerPreview;
      if (!handle) throw new Error('the preview is not ready');
      const id = handle.workbook.sheetId(s as string) as number;
      const view = handle.workbook.cell(id, row as number, col as number);
      const style = handle.workbook.style(id, row as number, col as number) as
        { fill?: string; fillColor?: string } | undefined;
      return { input: String(view.input), value: view.value, fill: style?.fill ?? style?.fillColor };
    },
    [sheet, p.row, p.column] as const,
  );
}

async function selectRange(page: Page, from: string, to: string): Promise<void> {
  await selectCell(page, from);
  await cellLocator(page, to).click({ modifiers: ['Shift'] });
}

async function fill(frame: Frame, id: string, text: string): Promise<void> {
  await frame.locator(`#${id} input`).fill(text);
}

function expectClose(actual: Cell | undefined, expected: number, where: string, tol = 1e-12): void {
  if (typeof actual !== 'number')
    throw new Error(`${where}: expected a number near ${expected}, got ${JSON.stringify(actual)}`);
  const allowed = tol * Math.max(1, Math.abs(expected));
  if (!(Math.abs(actual - expected) <= allowed))
    throw new Error(`${where}: ${actual} is not ${expected} (±${allowed})`);
}

function offset(address: string, rows: number, columns: number): string {
  const p = parseAddress(address).start;
  const col = p.column + columns;
  let letters = '';
  for (let n = col + 1; n > 0; n = Math.floor((n - 1) / 26))
    letters = String.fromCharCode(65 + ((n - 1) % 26)) + letters;
  return `${letters}${p.row + rows + 1}`;
}

describe('side panel flows in the preview', () => {
  let preview: OpenPreview;
  let page: Page;
  let panel: Frame;
  beforeAll(async () => {
    preview = await openPreview({ panel: true });
    page = preview.page;
    panel = await panelFrame(page);
    await panel.waitForSelector('#tabs');
  });
  afterAll(async () => {
    await preview?.cleanup();
  });

  it('fits a prior from the past-experiments sheet and writes it as a live formula', async () => {
    await switchSheet(page, 'Past tests');
    await selectRange(page, 'A3', 'C15');
    await panel.locator('#tab-prior').click();
    await panel.locator('#prior-mode-history').click();
    await panel.locator('#prior-use-selection').click();
    await panel.locator('#prior-history-info', { hasText: '12 past results' }).waitFor();
    const info = await panel.locator('#prior-history-info').textContent();
    expect(info).toContain('conversions in B4:B15, visitors in C4:C15');
    // the panel's numbers come from the core's fit of the same cells
    const conversions = (
      await Promise.all(Array.from({ length: 12 }, (_, i) => readCell(page, 'Past tests', `B${4 + i}`)))
    ).map((c) => c.value as number);
    const visitors = (
      await Promise.all(Array.from({ length: 12 }, (_, i) => readCell(page, 'Past tests', `C${4 + i}`)))
    ).map((c) => c.value as number);
    const fit = priorFromHistory(conversions, visitors, 'likelihood');
    await panel.locator('#prior-parameters').waitFor();
    expect(await panel.locator('#prior-parameters').textContent()).toBe(
      `Beta(alpha = ${String(Number(fit.alpha.toPrecision(6)))}, beta = ${String(Number(fit.beta.toPrecision(6)))})`,
    );
    await screenshot(page, 'panel-prior-history');

    await selectCell(page, 'E17');
    await panel.locator('#prior-write').click();
    await panel.locator('#prior-status fluent-message-bar:not([intent="info"])').waitFor();
    expect(await panel.locator('#prior-status fluent-message-bar').getAttribute('intent')).toBe('success');
    const written = await cellInput(page, 'Past tests', 'E17');
    expect(written.input).toBe('=ABTEST.PRIOR_FROM_HISTORY(B4:B15,C4:C15)');
    expectClose(written.value, fit.alpha, 'E17 alpha', 1e-12);
    expectClose((await readCell(page, 'Past tests', 'F17')).value, fit.beta, 'F17 beta', 1e-12);
    // writing again over it asks first; "Overwrite" replaces it with the method-of-moments fit
    await panel.locator('#prior-method-moments').click();
    await panel.locator('#prior-write').click();
    await panel.locator('#prior-status fluent-message-bar[intent="warning"]').waitFor();
    expect(await panel.locator('#prior-status fluent-message-bar').textContent()).toContain(
      "'Past tests'!E17:F17 is not empty (E17, F17)",
    );
    await panel.locator('#confirm-overwrite').click();
    await panel.locator('#prior-status fluent-message-bar[intent="success"]').waitFor();
    expect((await cellInput(page, 'Past tests', 'E17')).input).toBe(
      '=ABTEST.PRIOR_FROM_HISTORY(B4:B15,C4:C15,"moments")',
    );
    expectClose(
      (await readCell(page, 'Past tests', 'E17')).value,
      priorFromHistory(conversions, visitors, 'moments').alpha,
      'E17 moments alpha',
      1e-12,
    );
    await screenshot(page, 'panel-prior-written');
  });

  it('plans a test and inserts the plan as live formulas', async () => {
    await switchSheet(page, 'Plan');
    await panel.locator('#tab-plan').click();
    await fill(panel, 'plan-baseline', '4.2');
    await fill(panel, 'plan-lift', '10');
    await fill(panel, 'plan-threshold', '95');
    await fill(panel, 'plan-power', '80');
    await fill(panel, 'plan-variants', '2');
    await fill(panel, 'plan-daily', '6000');
    await fill(panel, 'plan-share', '50');
    // the plan follows the fields (no button to press)
    const needed = visitorsNeeded(0.042, 0.1, 0.95, 0.8, UNIFORM_PRIOR);
    await panel
      .locator('#plan-per-variant', { hasText: `Visitors per variant: ${needed.toLocaleString('en-US')}` })
      .waitFor();
    const weeks = Math.ceil((2 * needed) / 3000 / 7);
    expect(await panel.locator('#plan-days').textContent()).toContain(
      `Run for ${weeks} weeks (${7 * weeks} days) at 3,000 test visitors a day.`,
    );
    expect(await panel.locator('#plan-classic').textContent()).toContain(
      classicSampleSize(0.042, 0.1, 0.05, 0.8, 2).toLocaleString('en-US'),
    );
    // the power curve is computed a point at a time and the progress bar goes away at the end
    await panel
      .locator('#plan-progress-text', { hasText: 'Decision power of each challenger at' })
      .waitFor({ timeout: 120_000 });
    await screenshot(page, 'panel-plan');

    await selectCell(page, 'D4');
    await panel.locator('#plan-insert').click();
    await panel.locator('#plan-status fluent-message-bar:not([intent="info"])').waitFor();
    expect(await panel.locator('#plan-status fluent-message-bar').getAttribute('intent')).toBe('success');
    const { cells } = planBlock(
      {
        baselineRate: 0.042,
        lift: 0.1,
        threshold: 0.95,
        power: 0.8,
        variants: 2,
        dailyVisitors: 6000,
        trafficShare: 0.5,
        classicAlpha: 0.05,
      },
      'D4',
    );
    const perVariant = await cellInput(page, 'Plan', cells.visitorsPerVariant as string);
    expect(perVariant.input).toBe('=ABTEST.VISITORS_NEEDED(E5,E6,E13,E8)');
    expect(perVariant.value).toBe(needed);
    const days = await cellInput(page, 'Plan', cells.days as string);
    expect(days.input).toBe('=7*E16');
    expect(days.value).toBe(7 * weeks);
    expect((await cellInput(page, 'Plan', cells.classicPerVariant as string)).value).toBe(
      classicSampleSize(0.042, 0.1, 0.05, 0.8, 2),
    );
    // live: change the baseline cell on the sheet and the plan follows
    await enterCell(page, cells.baselineRate as string, '0.05');
    expect((await cellInput(page, 'Plan', cells.visitorsPerVariant as string)).value).toBe(
      visitorsNeeded(0.05, 0.1, 0.95, 0.8, UNIFORM_PRIOR),
    );
    await screenshot(page, 'panel-plan-inserted');
  });

  it('inserts a read-out beside a variant table; its cells equal the core; a broken split is flagged', async () => {
    await switchSheet(page, 'Plan');
    // an invented table with a deliberately uneven split (SRM p far below 0.001)
    const table: [string, number, number][] = [
      ['Green button', 10000, 412],
      ['Orange button', 10900, 486],
      ['Blue button', 9800, 430],
    ];
    await enterCell(page, 'G20', 'Variant');
    await enterCell(page, 'H20', 'Visitors');
    await enterCell(page, 'I20', 'Conversions');
    for (const [r, [name, n, x]] of table.entries()) {
      await enterCell(page, `G${21 + r}`, name);
      await enterCell(page, `H${21 + r}`, String(n));
      await enterCell(page, `I${21 + r}`, String(x));
    }
    await selectRange(page, 'G20', 'I23');
    await panel.locator('#tab-readout').click();
    await panel.locator('#readout-use-selection').click();
    await panel.locator('#readout-variants').waitFor();
    expect(await panel.locator('#readout-variants li').allTextContents()).toEqual([
      'Green button (control): 412 conversions of 10,000 visitors',
      'Orange button: 486 conversions of 10,900 visitors',
      'Blue button: 430 conversions of 9,800 visitors',
    ]);
    const visitors = table.map((t) => t[1]);
    const p = srmPValue(visitors);
    expect(p).toBeLessThan(0.001);
    await panel.locator('#readout-split fluent-message-bar[intent="error"]').waitFor();
    await panel.locator('#readout-insert').click();
    await panel.locator('#readout-status fluent-message-bar:not([intent="info"])').waitFor({ timeout: 60_000 });
    expect(await panel.locator('#readout-status').textContent()).toMatch(
      /^Wrote the read-out to Plan!K20:U96 \(live formulas\) and a lift chart from K35:M96\./,
    );
    await screenshot(page, 'panel-readout');

    const built = readoutBlock(
      { namesRef: 'G21:G23', visitorsRef: 'H21:H23', conversionsRef: 'I21:I23', sharesRef: null, variants: 3 },
      { level: 0.95, prior: { alpha: 1, beta: 1 }, densityPoints: 61, currentSrmPValue: p },
      'K20',
    );
    const c = built.cells;
    const variants: ConversionCounts[] = table.map(([, n, x]) => ({ visitors: n, conversions: x }));
    expect((await cellInput(page, 'Plan', c.posteriorMean as string)).input).toBe(
      '=ABTEST.POSTERIOR_MEAN(I21:I23,H21:H23,L28,L29)',
    );
    const means = posteriorMean(variants, UNIFORM_PRIOR);
    const intervals = rateInterval(variants, 0.95, UNIFORM_PRIOR, 'central');
    const beats = probAboveControl(variants, UNIFORM_PRIOR);
    const highest = probHighest(variants, UNIFORM_PRIOR);
    const lifts = liftInterval(variants, 0.95, UNIFORM_PRIOR);
    const losses = expectedLoss(variants, UNIFORM_PRIOR);
    for (let i = 0; i < 3; i += 1) {
      expectClose(
        (await readCell(page, 'Plan', offset(c.posteriorMean as string, i, 0))).value,
        means[i] as number,
        `mean ${i}`,
      );
      expectClose(
        (await readCell(page, 'Plan', offset(c.rateInterval as string, i, 0))).value,
        intervals[i]?.lower as number,
        `low ${i}`,
      );
      expectClose(
        (await readCell(page, 'Plan', offset(c.rateInterval as string, i, 1))).value,
        intervals[i]?.upper as number,
        `high ${i}`,
      );
      expectClose(
        (await readCell(page, 'Plan', offset(c.probHighest as string, i, 0))).value,
        highest[i] as number,
        `highest ${i}`,
      );
      expectClose(
        (await readCell(page, 'Plan', offset(c.expectedLoss as string, i, 0))).value,
        losses[i] as number,
        `loss ${i}`,
      );
      if (i > 0) {
        expectClose(
          (await readCell(page, 'Plan', offset(c.probAboveControl as string, i, 0))).value,
          beats[i - 1] as number,
          `beats ${i}`,
        );
        expectClose(
          (await readCell(page, 'Plan', offset(c.liftInterval as string, i, 1))).value,
          lifts[i - 1]?.median as number,
          `lift ${i}`,
        );
      }
    }
    expect((await readCell(page, 'Plan', offset(c.probAboveControl as string, 0, 0))).value).toBe('');
    const srm = await cellInput(page, 'Plan', c.srmPValue as string);
    expectClose(srm.value, p, 'srm', 1e-9);
    expect((await readCell(page, 'Plan', c.srmVerdict as string)).value).toBe(
      'split looks broken: check how visitors are assigned',
    );
    expect(String(srm.fill).toUpperCase()).toBe('#F4CCCC');
    const decision = await readCell(page, 'Plan', c.decision as string);
    expect(typeof decision.value).toBe('string');
    // the native chart over the LIFT_DENSITY block
    const charts = await page.evaluate(() => {
      const handle = window.liftLedgerPreview;
      if (!handle) throw new Error('the preview is not ready');
      return handle.workbook.charts(handle.workbook.sheetId('Plan') as number).length;
    });
    expect(charts).toBe(1);
    await screenshot(page, 'panel-readout-chart');
  });

  it('explains a cell: the function, its cells, the method and a built-in cross-check', async () => {
    await switchSheet(page, 'Plan');
    await panel.locator('#tab-explain').click();
    await selectCell(page, 'L22');
    await panel.locator('#explain-name', { hasText: 'ABTEST.POSTERIOR_MEAN' }).waitFor();
    expect(await panel.locator('#explain-summary').textContent()).toBe(
      'The posterior mean conversion rate of each variant, from conversions in I21:I23 out of visitors in H21:H23, with a Beta(L28, L29) prior.',
    );
    expect(await panel.locator('#explain-formulas li').allTextContents()).toEqual(['=(L28+I21)/(L28+L29+H21)']);
    await screenshot(page, 'panel-explain');
    // following the selection: a plain number cell is explained as such
    await selectCell(page, 'H21');
    await panel.locator('#explain-problem').waitFor();
    expect(preview.pageErrors).toEqual([]);
  });
});
