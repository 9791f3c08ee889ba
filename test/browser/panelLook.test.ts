/**
 * Screenshots of every section of the side panel, at a wide pane and at 350 px, in Office's light and
 * dark themes (test-artifacts/look-<theme>-<width>-<section>.png, git-ignored), for a person to look at.
 * Each section is shown in a state a user reaches on the invented demo workbook: a prior typed in, a plan
 * computed, the demo's variant table picked up, a P(highest) cell explained, a caution opened. The test
 * also checks what a screenshot alone would not: nothing wider than the pane, no page errors.
 */
import type { Frame, Page } from 'playwright-core';
import {
  ARTIFACTS,
  cellLocator,
  openPreview,
  panelFrame,
  selectCell,
  switchSheet,
  type OpenPreview,
} from './previewHelpers';
import * as fs from 'fs';
import * as path from 'path';

const WIDTHS = { wide: 560, narrow: 350 } as const;
const SECTIONS = ['prior', 'plan', 'readout', 'explain', 'share', 'cautions'] as const;

/** Saves the side panel alone (the whole pane, top to bottom) to test-artifacts/<name>.png. */
async function shootPanel(page: Page, frame: Frame, name: string): Promise<string> {
  fs.mkdirSync(ARTIFACTS, { recursive: true });
  const height = await frame.evaluate(() => document.documentElement.scrollHeight);
  await page.setViewportSize({ width: 1440, height: Math.min(4000, Math.max(900, height + 160)) });
  const file = path.join(ARTIFACTS, `${name}.png`);
  await page.locator('#panel').screenshot({ path: file });
  return file;
}

/** Puts a section in the state a user sees it in after a typical step on the demo workbook. */
async function prepare(page: Page, frame: Frame, section: (typeof SECTIONS)[number]): Promise<void> {
  await frame.locator(`#tab-${section}`).click();
  switch (section) {
    case 'prior':
      await frame.locator('#prior-parameters').waitFor();
      break;
    case 'plan':
      await frame
        .locator('#plan-progress-text', { hasText: 'Decision power of each challenger' })
        .waitFor({ timeout: 120_000 });
      break;
    case 'readout':
      await switchSheet(page, 'Checkout test');
      await selectCell(page, 'A3');
      await cellLocator(page, 'C6').click({ modifiers: ['Shift'] });
      await frame.locator('#readout-use-selection').click();
      await frame.locator('#readout-variants').waitFor();
      break;
    case 'explain':
      await switchSheet(page, 'Checkout test');
      await selectCell(page, 'B24');
      await frame.locator('#explain-chart-box:not([hidden])').waitFor();
      break;
    case 'share':
      await switchSheet(page, 'Checkout test');
      await selectCell(page, 'A3');
      await frame.locator('#share-look').click();
      await frame.locator('#share-plan-text').waitFor();
      break;
    case 'cautions':
      await frame.locator('#caution-variants').click();
      break;
  }
}

describe('the side panel as it looks', () => {
  let preview: OpenPreview;
  let page: Page;
  beforeAll(async () => {
    preview = await openPreview({ panel: true });
    page = preview.page;
  });
  afterAll(async () => {
    await preview?.cleanup();
  });

  for (const theme of ['light', 'dark'] as const) {
    it(`every section, wide and at 350 px, ${theme} theme`, async () => {
      await page.goto(new URL(`?theme=${theme}`, preview.url).toString());
      await page.waitForSelector('body[data-ready="true"]', { timeout: 60_000 });
      const frame = await panelFrame(page);
      await frame.waitForSelector('#tabs fluent-tab');
      expect(await frame.evaluate(() => document.documentElement.dataset.theme)).toBe(theme);
      const shots: string[] = [];
      for (const [widthName, width] of Object.entries(WIDTHS)) {
        await page.addStyleTag({ content: `#panel { width: ${width}px !important; flex: 0 0 ${width}px; }` });
        for (const section of SECTIONS) {
          await prepare(page, frame, section);
          // nothing in the pane is wider than the pane, once charts have followed the new width
          await frame
            .waitForFunction(() => document.documentElement.scrollWidth <= window.innerWidth, undefined, {
              timeout: 5_000,
            })
            .catch(() => undefined);
          expect(
            await frame.evaluate(() => document.documentElement.scrollWidth - window.innerWidth),
          ).toBeLessThanOrEqual(0);
          shots.push(await shootPanel(page, frame, `look-${theme}-${widthName}-${section}`));
        }
      }
      expect(shots).toHaveLength(SECTIONS.length * 2);
      for (const file of shots) expect(fs.statSync(file).size).toBeGreaterThan(10_000);
      expect(preview.pageErrors).toEqual([]);
    });
  }
});
