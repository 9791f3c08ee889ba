/**
 * The side panel read by a marketer, in the preview (Debian's chromium through playwright-core): tabs by
 * keyboard (the WAI-ARIA tabs pattern), percents typed with either decimal mark, the 0.95-for-95% slip
 * named, a plan that never shows or inserts numbers for other inputs, many variants and unrealistic run
 * times said in words, Office's dark theme, a 350 px pane, and the Explain section's words for a result.
 * Expected numbers come from the statistics core (functions/stats, itself checked against scipy, R and
 * mpmath in test/stats); the tables are the invented demo's.
 */
import type { Frame, Page } from 'playwright-core';
import { probHighest } from '../../functions/stats/conversion';
import { visitorsNeeded } from '../../functions/stats/planning';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import {
  enterCell,
  openPreview,
  panelFrame,
  readCell,
  selectCell,
  switchSheet,
  type OpenPreview,
} from './previewHelpers';

async function fill(frame: Frame, id: string, text: string): Promise<void> {
  await frame.locator(`#${id} input`).fill(text);
}

/** The id of the focused element inside the panel. */
async function focusedId(frame: Frame): Promise<string> {
  return frame.evaluate(() => document.activeElement?.id ?? '');
}

/** Which sections are shown. */
async function shownSections(frame: Frame): Promise<string[]> {
  return frame.evaluate(() =>
    Array.from(document.querySelectorAll('main > section'))
      .filter((s) => !(s as HTMLElement).hidden)
      .map((s) => s.id),
  );
}

/** Opens the preview at `query` (e.g. "?theme=dark") and returns the panel once its tabs are there. */
async function reopen(page: Page, url: string, query: string): Promise<Frame> {
  await page.goto(new URL(query, url).toString());
  await page.waitForSelector('body[data-ready="true"]', { timeout: 60_000 });
  const frame = await panelFrame(page);
  await frame.waitForSelector('#tabs fluent-tab');
  return frame;
}

describe('the side panel, clear to a marketer', () => {
  let preview: OpenPreview;
  let page: Page;
  let panel: Frame;
  beforeAll(async () => {
    preview = await openPreview({ panel: true });
    page = preview.page;
    panel = await panelFrame(page);
    await panel.waitForSelector('#tabs fluent-tab');
  });
  afterAll(async () => {
    await preview?.cleanup();
  });

  it('tabs follow the WAI-ARIA pattern: one tab stop, arrows and Home/End show the section, Enter and Space too', async () => {
    await panel.locator('#tab-prior').click();
    const tabIndexes = await panel.evaluate(() =>
      Array.from(document.querySelectorAll('#tabs fluent-tab')).map((t) => (t as HTMLElement).tabIndex),
    );
    expect(tabIndexes).toEqual([0, -1, -1, -1, -1, -1]);
    await panel.locator('#tab-prior').focus();
    await page.keyboard.press('ArrowRight');
    expect(await shownSections(panel)).toEqual(['section-plan']);
    expect(await focusedId(panel)).toBe('tab-plan');
    expect(await panel.locator('#tab-plan').getAttribute('aria-selected')).toBe('true');
    await page.keyboard.press('End');
    expect(await shownSections(panel)).toEqual(['section-cautions']);
    expect(await focusedId(panel)).toBe('tab-cautions');
    await page.keyboard.press('ArrowRight');
    expect(await shownSections(panel)).toEqual(['section-prior']);
    await page.keyboard.press('ArrowLeft');
    expect(await shownSections(panel)).toEqual(['section-cautions']);
    await page.keyboard.press('Home');
    expect(await shownSections(panel)).toEqual(['section-prior']);
    await page.keyboard.press('ArrowDown');
    await page.keyboard.press('Enter');
    expect(await shownSections(panel)).toEqual(['section-plan']);
    await page.keyboard.press('Space');
    expect(await shownSections(panel)).toEqual(['section-plan']);
    expect(
      await panel.evaluate(() =>
        Array.from(document.querySelectorAll('#tabs fluent-tab')).map((t) => (t as HTMLElement).tabIndex),
      ),
    ).toEqual([-1, 0, -1, -1, -1, -1]);
    // one way to the cautions: the tab (no second Cautions button in the header)
    expect(await panel.locator('header fluent-button').count()).toBe(0);
  });

  it('a fraction typed into a percent field is refused with the slip named; a decimal comma is read', async () => {
    await panel.locator('#tab-plan').click();
    await fill(panel, 'plan-threshold', '0.95');
    await panel.locator('#plan-threshold-message', { hasText: '0.95 here means 0.95%' }).waitFor();
    expect(await panel.locator('#plan-threshold-message').textContent()).toBe(
      'Decision threshold: 0.95 here means 0.95%, because this field takes a percent. For 95% type 95, not 0.95.',
    );
    await panel.locator('#plan-results', { hasText: 'Check the fields marked in red above.' }).waitFor();
    expect(await panel.locator('#plan-insert').getAttribute('disabled')).not.toBeNull();
    await fill(panel, 'plan-threshold', '95');
    await fill(panel, 'plan-baseline', '4,5');
    const needed = visitorsNeeded(0.045, 0.1, 0.95, 0.8, UNIFORM_PRIOR);
    await panel.locator('#plan-per-variant', { hasText: needed.toLocaleString('en-US') }).waitFor();
    expect(await panel.locator('#plan-lift-example').textContent()).toBe(
      'A lift of 10.0% takes the rate from 4.50% to 4.95%.',
    );
    expect(await panel.locator('#plan-threshold-message').isHidden()).toBe(true);
    // every percent field shows its unit inside it
    expect(await panel.locator('#section-plan fluent-text-input[data-unit="%"]').count()).toBe(6);
  });

  it('never shows or inserts a plan for other inputs: old numbers are marked out of date until updated', async () => {
    await switchSheet(page, 'Plan');
    await fill(panel, 'plan-baseline', '4');
    await panel
      .locator('#plan-per-variant', {
        hasText: visitorsNeeded(0.04, 0.1, 0.95, 0.8, UNIFORM_PRIOR).toLocaleString('en-US'),
      })
      .waitFor();
    await panel.locator('#plan-results:not(.stale)').waitFor();
    await fill(panel, 'plan-baseline', '8');
    // at once: the 4% plan is marked out of date and cannot be inserted
    expect(await panel.locator('#plan-results').getAttribute('class')).toContain('stale');
    expect(await panel.locator('#plan-insert').getAttribute('disabled')).not.toBeNull();
    expect(await panel.locator('#plan-freshness').textContent()).toMatch(
      /^Out of date: the inputs changed\. Updating…$|^Updating the plan for the new inputs…$/,
    );
    const needed = visitorsNeeded(0.08, 0.1, 0.95, 0.8, UNIFORM_PRIOR);
    await panel.locator('#plan-per-variant', { hasText: needed.toLocaleString('en-US') }).waitFor();
    await panel.locator('#plan-results:not(.stale)').waitFor();
    await selectCell(page, 'H4');
    await panel.locator('#plan-insert:not([disabled])').click();
    await panel.locator('#plan-status fluent-message-bar[intent="success"]').waitFor();
    expect((await readCell(page, 'Plan', 'I5')).value).toBe(0.08);
    expect((await readCell(page, 'Plan', 'I5')).text).toBe('8.00%');
    // the threshold and the power are written in the same unit (percent)
    expect((await readCell(page, 'Plan', 'I7')).text).toBe('95.0%');
    expect((await readCell(page, 'Plan', 'I8')).text).toBe('80.0%');
  });

  it('many variants: each challenger gets its share of the false-alarm rate, said in words', async () => {
    await fill(panel, 'plan-baseline', '4');
    await fill(panel, 'plan-variants', '10');
    const needed = visitorsNeeded(0.04, 0.1, 1 - 0.05 / 9, 0.8, UNIFORM_PRIOR);
    await panel.locator('#plan-per-variant', { hasText: needed.toLocaleString('en-US') }).waitFor();
    expect(await panel.locator('#plan-note').textContent()).toContain(
      'With 9 challengers, each one gets a chance to win by luck.',
    );
    expect(await panel.locator('#plan-note').textContent()).toContain(
      'each challenger must reach P(beats control) ≥ 99.4%',
    );
    expect(needed).toBeGreaterThan(visitorsNeeded(0.04, 0.1, 0.95, 0.8, UNIFORM_PRIOR));
  });

  it('an unrealistic run time is flagged, and the run is whole weeks', async () => {
    await fill(panel, 'plan-variants', '2');
    await fill(panel, 'plan-lift', '2');
    await fill(panel, 'plan-daily', '300');
    const needed = visitorsNeeded(0.04, 0.02, 0.95, 0.8, UNIFORM_PRIOR);
    const weeks = Math.ceil((2 * needed) / 300 / 7);
    await panel
      .locator('#plan-days', { hasText: `Run for ${weeks} weeks (${(7 * weeks).toLocaleString('en-US')} days)` })
      .waitFor();
    await panel.locator('#plan-duration fluent-message-bar[intent="error"]').waitFor();
    expect(await panel.locator('#plan-duration').textContent()).toContain('is not a realistic test');
    await fill(panel, 'plan-lift', '10');
    await fill(panel, 'plan-daily', '4000');
    await panel.locator('#plan-duration fluent-message-bar').waitFor({ state: 'detached' });
  });

  it('explains a result in words, and a cell inside its spill by the formula it belongs to', async () => {
    await switchSheet(page, 'Checkout test');
    await panel.locator('#tab-explain').click();
    await selectCell(page, 'B24');
    await panel.locator('#explain-spill').waitFor();
    expect(await panel.locator('#explain-spill').textContent()).toBe(
      "'Checkout test'!B24 is part of the result of the formula in 'Checkout test'!B23 (3 × 1 cells): it holds the value for Orange button.",
    );
    const highest = probHighest(
      [
        { conversions: 412, visitors: 10412 },
        { conversions: 463, visitors: 10388 },
        { conversions: 431, visitors: 10451 },
      ],
      UNIFORM_PRIOR,
    );
    expect(await panel.locator('#explain-result li').first().textContent()).toBe(
      `Orange button has an ${Math.round((highest[1] as number) * 100)}% chance of having the highest conversion rate.`,
    );
    expect(await panel.locator('#explain-name').textContent()).toBe("ABTEST.PROB_HIGHEST in 'Checkout test'!B23");
    // the lift chart: a 'no lift' line, percent ticks, described for screen readers
    await panel.locator('#explain-chart-box:not([hidden])').waitFor();
    expect(await panel.locator('#explain-chart').getAttribute('aria-label')).toMatch(
      /^Lift over the control: Orange button, 90% between \+1\.00% and \+25\.6%; Big basket icon, 90% between /,
    );
    expect(preview.pageErrors).toEqual([]);
  });

  it("explains an error cell by its error, in the worksheet function's own words", async () => {
    await switchSheet(page, 'Checkout test');
    await enterCell(page, 'D23', '=ABTEST.PROB_HIGHEST(C4:C6, B4:B5)');
    await panel.locator('#tab-explain').click();
    await selectCell(page, 'D23');
    await panel.locator('#explain-error').waitFor();
    const cell = await readCell(page, 'Checkout test', 'D23');
    expect(cell.value).toBe('#VALUE!');
    expect(cell.message).toBeTruthy();
    const text = await panel.locator('#explain-error').textContent();
    expect(text).toMatch(/^'Checkout test'!D23 shows #VALUE!\. An argument holds something the function cannot use/);
    expect(text).toContain(`Checking the inputs the way the function does: ${cell.message}.`);
    // the method is shown with subscripts, not raw notation
    expect(await panel.locator('#explain-method').textContent()).not.toContain('_{');
    expect(await panel.locator('#explain-method sub').count()).toBeGreaterThan(0);
  });

  it('a 350 px pane: tab names on one line, every field as wide as the pane', async () => {
    await page.addStyleTag({ content: '#panel { width: 350px !important; flex: 0 0 350px; }' });
    await panel.locator('#tab-plan').click();
    const heights = await panel.evaluate(() =>
      Array.from(document.querySelectorAll('#tabs fluent-tab')).map((t) => t.getBoundingClientRect().height),
    );
    expect(new Set(heights.map((h) => Math.round(h))).size).toBe(1);
    const label = await panel.evaluate(() => {
      const tab = document.querySelector('#tab-readout') as HTMLElement;
      const range = document.createRange();
      range.selectNodeContents(tab);
      return range.getClientRects().length;
    });
    expect(label).toBe(1);
    const widths = await panel.evaluate(() =>
      Array.from(document.querySelectorAll('#section-plan fluent-text-input')).map((t) =>
        Math.round(t.getBoundingClientRect().width),
      ),
    );
    expect(widths.length).toBe(8);
    expect(new Set(widths).size).toBe(1);
    expect(await panel.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).toBe(true);
  });

  it("follows Office's theme, with the preview's switch", async () => {
    panel = await reopen(page, preview.url, '?theme=dark');
    expect(await panel.evaluate(() => document.documentElement.dataset.theme)).toBe('dark');
    const background = await panel.evaluate(() => getComputedStyle(document.body).backgroundColor);
    const [r, g, b] = (background.match(/\d+/g) ?? []).map(Number);
    expect(Math.max(r ?? 255, g ?? 255, b ?? 255)).toBeLessThan(80);
    expect(await page.locator('#office-theme-switch').textContent()).toBe('Office theme: dark');
    await page.locator('#office-theme-switch').click();
    await page.waitForFunction(() => {
      const frame = document.getElementById('panel-frame') as HTMLIFrameElement | null;
      return frame?.contentDocument?.documentElement?.dataset?.theme === 'light';
    });
    expect(new URL(page.url()).searchParams.get('theme')).toBe('light');
  });

  it("reads and shows numbers in Office's display language (German: 4,5 and 12.000)", async () => {
    panel = await reopen(page, preview.url, '?lang=de-DE');
    await panel.locator('#tab-plan').click();
    await fill(panel, 'plan-baseline', '4,5');
    await fill(panel, 'plan-daily', '12.000');
    const needed = visitorsNeeded(0.045, 0.1, 0.95, 0.8, UNIFORM_PRIOR);
    await panel
      .locator('#plan-per-variant', { hasText: `Visitors per variant: ${needed.toLocaleString('de-DE')}` })
      .waitFor();
    expect(await panel.locator('#plan-days').textContent()).toContain('at 12.000 test visitors a day');
    expect(await panel.locator('#plan-lift-example').textContent()).toBe(
      'A lift of 10,0% takes the rate from 4,50% to 4,95%.',
    );
  });
});
