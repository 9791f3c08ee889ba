/**
 * The preview workbook in a real browser (Debian's chromium through playwright-core): the page computes
 * the demo's ABTEST cells with the built add-in, recalculates on edits to the values the statistics core
 * gives (functions/stats/… called here directly), shows bad input as #VALUE! with its message, switches
 * sheets, and computes a formula typed into an empty cell. Screenshots go to test-artifacts/.
 */
import {
  decide,
  expectedLoss,
  liftInterval,
  posteriorMean,
  probAboveControl,
  probHighest,
  probLiftAbove,
  rateDiffInterval,
  rateInterval,
  posteriorDensityTable,
} from '../../functions/stats/conversion';
import { priorFromHistory, priorFromMean } from '../../functions/stats/prior';
import { classicSampleSize } from '../../functions/stats/planning';
import { decisionText } from '../../functions/sheet/decision';
import { UNIFORM_PRIOR, type ConversionCounts } from '../../functions/stats/types';
import {
  cellLocator,
  enterCell,
  openPreview,
  readBlock,
  readCell,
  screenshot,
  selectCell,
  switchSheet,
  type OpenPreview,
} from './previewHelpers';

type Cell = number | string | boolean;

function expectClose(actual: Cell | undefined, expected: number, where: string, tol = 1e-12): void {
  if (typeof actual !== 'number')
    throw new Error(`${where}: expected a number near ${expected}, got ${JSON.stringify(actual)}`);
  const allowed = tol * Math.max(1, Math.abs(expected));
  if (!(Math.abs(actual - expected) <= allowed))
    throw new Error(`${where}: ${actual} is not ${expected} (±${allowed})`);
}

function expectColumn(block: Cell[][], expected: readonly Cell[][], where: string): void {
  expect(block.length).toBe(expected.length);
  expected.forEach((row, r) =>
    row.forEach((value, c) => {
      const got = block[r]?.[c];
      if (typeof value === 'number') expectClose(got, value, `${where} [${r + 1},${c + 1}]`);
      else expect({ where, r, c, got }).toEqual({ where, r, c, got: value });
    }),
  );
}

describe('preview workbook in chromium', () => {
  let preview: OpenPreview;
  beforeAll(async () => {
    preview = await openPreview({ panel: false });
  });
  afterAll(async () => {
    await preview?.cleanup();
  });

  const variantsOnPage = async (): Promise<{ variants: ConversionCounts[]; labels: string[] }> => {
    const rows = await readBlock(preview.page, 'Checkout test', 'A4', 3, 3);
    return {
      labels: rows.map((r) => String(r[0])),
      variants: rows.map((r) => ({ visitors: r[1] as number, conversions: r[2] as number })),
    };
  };

  /** Every conversion read-out of the Checkout sheet against the core, on the page's current inputs. */
  const checkConversionReadouts = async (): Promise<void> => {
    const { page } = preview;
    const { variants, labels } = await variantsOnPage();
    const past = await readBlock(page, 'Past tests', 'B4', 12, 2);
    const history = priorFromHistory(
      past.map((r) => r[0] as number),
      past.map((r) => r[1] as number),
      'likelihood',
    );
    const col = (xs: readonly number[]) => xs.map((x) => [x]);
    const vs = (rows: Cell[][], width: number) => [Array<Cell>(width).fill(''), ...rows];
    const lmu = (ivs: readonly { lower: number; median: number; upper: number }[]) =>
      ivs.map((iv) => [iv.lower, iv.median, iv.upper]);
    expectColumn(
      await readBlock(page, 'Checkout test', 'B11', 3, 1),
      col(posteriorMean(variants, UNIFORM_PRIOR)),
      'POSTERIOR_MEAN',
    );
    expectColumn(
      await readBlock(page, 'Checkout test', 'B15', 3, 2),
      rateInterval(variants, 0.95, UNIFORM_PRIOR, 'central').map((iv) => [iv.lower, iv.upper]),
      'RATE_INTERVAL',
    );
    expectColumn(
      await readBlock(page, 'Checkout test', 'B19', 3, 2),
      rateInterval(variants, 0.9, UNIFORM_PRIOR, 'hdi').map((iv) => [iv.lower, iv.upper]),
      'RATE_INTERVAL hdi',
    );
    expectColumn(
      await readBlock(page, 'Checkout test', 'B23', 3, 1),
      col(probHighest(variants, UNIFORM_PRIOR)),
      'PROB_HIGHEST',
    );
    expectColumn(
      await readBlock(page, 'Checkout test', 'B27', 3, 1),
      vs(col(probAboveControl(variants, UNIFORM_PRIOR)), 1),
      'PROB_ABOVE_CONTROL',
    );
    expectColumn(
      await readBlock(page, 'Checkout test', 'B31', 3, 3),
      vs(lmu(liftInterval(variants, 0.95, UNIFORM_PRIOR)), 3),
      'LIFT_INTERVAL',
    );
    expectColumn(
      await readBlock(page, 'Checkout test', 'B35', 3, 3),
      vs(lmu(rateDiffInterval(variants, 0.95, UNIFORM_PRIOR)), 3),
      'RATE_DIFF_INTERVAL',
    );
    expectColumn(
      await readBlock(page, 'Checkout test', 'B39', 3, 1),
      vs(col(probLiftAbove(variants, 0.05, UNIFORM_PRIOR)), 1),
      'PROB_LIFT_ABOVE',
    );
    expectColumn(
      await readBlock(page, 'Checkout test', 'B43', 3, 1),
      col(expectedLoss(variants, UNIFORM_PRIOR)),
      'EXPECTED_LOSS',
    );
    const d = decide(variants, undefined, UNIFORM_PRIOR);
    expect((await readCell(page, 'Checkout test', 'B47')).value).toBe(
      decisionText({ choose: d.choose, label: labels[d.index] ?? '?', loss: d.loss, maxLoss: d.maxLoss }),
    );
    expectColumn(
      await readBlock(page, 'Checkout test', 'B49', 3, 1),
      col(probHighest(variants, history)),
      'PROB_HIGHEST with prior',
    );
    const table = posteriorDensityTable(variants, 41, UNIFORM_PRIOR);
    expectColumn(
      await readBlock(page, 'Checkout test', 'K11', 41, 4),
      table.grid.map((x, i) => [x, ...table.densities.map((dens) => dens[i] as number)]),
      'POSTERIOR_DENSITY',
    );
  };

  it('opens with the demo computed by the add-in, the banner saying it is invented data', async () => {
    const { page } = preview;
    expect(await page.locator('.banner').innerText()).toMatch(/preview.*invented demo data/i);
    await checkConversionReadouts();
    // the shown text follows the cell's number format (0.00%)
    const mean = (await readCell(page, 'Checkout test', 'B12')).value as number;
    expect(await cellLocator(page, 'B12').innerText()).toBe(`${(mean * 100).toFixed(2)}%`);
    await screenshot(page, 'preview-opened');
    expect(preview.pageErrors).toEqual([]);
  });

  it('recalculates every dependent read-out when the challenger’s conversions are edited', async () => {
    const { page } = preview;
    const before = (await readCell(page, 'Checkout test', 'B12')).value;
    await enterCell(page, 'C5', '498');
    expect((await readCell(page, 'Checkout test', 'C5')).value).toBe(498);
    expect((await readCell(page, 'Checkout test', 'B12')).value).not.toBe(before);
    await checkConversionReadouts();
    // Enter moved the selection down, as in a spreadsheet
    expect(await page.locator('#name-box').innerText()).toBe('C6');
    await screenshot(page, 'preview-edited');
  });

  it('shows a bad input as #VALUE! with the add-in’s message in the cell’s tooltip and the formula bar', async () => {
    const { page } = preview;
    await enterCell(page, 'B5', '12.5');
    const cell = await readCell(page, 'Checkout test', 'B11');
    expect(cell.value).toBe('#VALUE!');
    expect(cell.message).toMatch(/visitors.*2.*12\.5.*whole number/i);
    await expect(cellLocator(page, 'B11').innerText()).resolves.toBe('#VALUE!');
    expect(await cellLocator(page, 'B11').getAttribute('title')).toContain(cell.message as string);
    await selectCell(page, 'B11');
    expect(await page.locator('#formula-message').innerText()).toContain(cell.message as string);
    expect(await page.locator('#formula-input').inputValue()).toBe('=ABTEST.POSTERIOR_MEAN(C4:C6, B4:B6)');
    await screenshot(page, 'preview-bad-input');
    // Escape cancels an edit: the cell keeps 12.5
    await selectCell(page, 'B5');
    await page.keyboard.press('F2');
    await page.locator('.cell-editor').fill('10388');
    await page.keyboard.press('Escape');
    expect((await readCell(page, 'Checkout test', 'B5')).value).toBe(12.5);
    await enterCell(page, 'B5', '10388');
    expect(typeof (await readCell(page, 'Checkout test', 'B11')).value).toBe('number');
  });

  it('switches sheets and shows the plan computed by the add-in', async () => {
    const { page } = preview;
    await switchSheet(page, 'Plan');
    const inputs = (await readBlock(page, 'Plan', 'B4', 5, 1)).map((r) => r[0] as number);
    const expected = classicSampleSize(inputs[0] as number, inputs[1] as number, 0.05, inputs[4] as number, 2);
    expect((await readCell(page, 'Plan', 'B13')).value).toBe(expected);
    expect(await cellLocator(page, 'B13').innerText()).toBe(String(expected));
    await screenshot(page, 'preview-plan');
  });

  it('computes a new ABTEST formula typed into an empty cell, with its spill', async () => {
    const { page } = preview;
    await switchSheet(page, 'Plan');
    // R: power.prop.test(p1 = 0.10, p2 = 0.15, power = 0.8) gives n = 685.596858 → 686 (shared/check-values.md)
    // typing into a selected cell starts an edit that replaces it; Enter commits
    await selectCell(page, 'D4');
    await page.keyboard.type('=ABTEST.CLASSIC_SAMPLE_SIZE(0.1, 0.5)');
    await page.keyboard.press('Enter');
    expect((await readCell(page, 'Plan', 'D4')).value).toBe(686);
    await enterCell(page, 'D6', '=ABTEST.PRIOR_FROM_MEAN(0.05, 200)');
    const prior = priorFromMean(0.05, 200);
    const spill = await readBlock(page, 'Plan', 'D6', 1, 2);
    expectClose(spill[0]?.[0], prior.alpha, 'prior alpha');
    expectClose(spill[0]?.[1], prior.beta, 'prior beta');
    // closed form: alpha = 0.05 · 200 = 10, beta = 190 (common practice: a Beta(a, b) is worth a + b visitors)
    expectClose(spill[0]?.[0], 10, 'alpha closed form');
    expectClose(spill[0]?.[1], 190, 'beta closed form');
    await selectCell(page, 'E6');
    expect(await page.locator('#formula-message').innerText()).toBe(
      'Part of a spilled result; edit the formula in D6.',
    );
    expect(await page.locator('#formula-input').inputValue()).toBe('=ABTEST.PRIOR_FROM_MEAN(0.05, 200)');
    await screenshot(page, 'preview-new-formula');
    expect(preview.pageErrors).toEqual([]);
  });
});
