/**
 * The Content-Security-Policy of the served pages, in Debian's chromium: the side panel (in the preview,
 * and served exactly as built with Office's CDN script) and the help pages load and work with no
 * `securitypolicyviolation` event and no CSP message in the console, while the policy is in force (an
 * inline style or script added afterwards is refused and reported). Needs `npm run build` first.
 */
import * as fs from 'fs';
import * as path from 'path';
import type { BrowserContext, Frame, Page } from 'playwright-core';
import { openPreview, panelFrame, REPO_ROOT, screenshot, type OpenPreview } from './previewHelpers';

/** Records every CSP violation of every frame, from before any of the page's own scripts run. */
const RECORD_VIOLATIONS = `
  window.__cspViolations = [];
  document.addEventListener('securitypolicyviolation', (e) => {
    window.__cspViolations.push(e.effectiveDirective + ' ' + (e.blockedURI || '') + ' ' + (e.sample || ''));
  });
`;

async function prepare(context: BrowserContext, consoleCsp: string[]): Promise<void> {
  await context.addInitScript(RECORD_VIOLATIONS);
  context.on('console', (message) => {
    if (/Content.Security.Policy|Refused to/i.test(message.text())) consoleCsp.push(message.text());
  });
}

const violations = (where: Page | Frame): Promise<string[]> =>
  where.evaluate(() => (window as unknown as { __cspViolations: string[] }).__cspViolations ?? []);

/** Adds an inline style and an inline script: both must be refused and reported while the policy holds. */
async function provoke(where: Page | Frame): Promise<string[]> {
  await where.evaluate(() => {
    const style = document.createElement('style');
    style.textContent = 'body { outline: 3px solid red; }';
    document.head.appendChild(style);
    const script = document.createElement('script');
    script.textContent = 'window.__inlineRan = true;';
    document.head.appendChild(script);
  });
  await new Promise((resolve) => setTimeout(resolve, 300));
  const ran = await where.evaluate(() => (window as unknown as { __inlineRan?: boolean }).__inlineRan === true);
  expect(ran).toBe(false);
  return violations(where);
}

/** Clicks through the panel's sections, computing a plan (a chart) on the way. */
async function usePanel(panel: Frame): Promise<void> {
  for (const tab of ['#tab-prior', '#tab-plan', '#tab-readout', '#tab-explain']) {
    await panel.locator(tab).click();
  }
  await panel.locator('#tab-plan').click();
  await panel.locator('#plan-compute').click();
  await panel.locator('#plan-chart').waitFor({ state: 'visible', timeout: 60_000 });
}

describe('Content-Security-Policy of the served pages', () => {
  let preview: OpenPreview | undefined;
  afterEach(async () => {
    await preview?.cleanup();
    preview = undefined;
  });

  it('the side panel in the preview: works, no violation, and the policy is in force', async () => {
    const consoleCsp: string[] = [];
    preview = await openPreview({ prepare: (context) => prepare(context, consoleCsp) });
    const panel = await panelFrame(preview.page);
    await panel.locator('#tab-plan').waitFor();
    await usePanel(panel);
    // the page's own style sheet applied (body margin 0 comes from it)
    expect(await panel.evaluate(() => getComputedStyle(document.body).marginTop)).toBe('0px');
    expect(await violations(panel)).toEqual([]);
    expect(await violations(preview.page)).toEqual([]);
    expect(consoleCsp).toEqual([]);
    await screenshot(preview.page, 'csp-panel-preview');
    const provoked = await provoke(panel);
    expect(provoked.some((v) => v.startsWith('style-src-elem'))).toBe(true);
    expect(provoked.some((v) => v.startsWith('script-src-elem'))).toBe(true);
    // the first browser test of a run may build the preview bundle
  }, 600_000);

  it('the side panel served as built, Office’s script from its own host', async () => {
    const consoleCsp: string[] = [];
    const standIn = fs.readFileSync(path.join(REPO_ROOT, 'preview', 'static', 'office-stand-in.js'), 'utf8');
    let cdnRequests = 0;
    preview = await openPreview({
      asBuilt: true,
      prepare: async (context) => {
        await prepare(context, consoleCsp);
        // the machine is offline: Office's script host answers with the preview's stand-in
        await context.route('https://appsforoffice.microsoft.com/**', (route) => {
          cdnRequests++;
          return route.fulfill({ status: 200, contentType: 'text/javascript', body: standIn });
        });
      },
    });
    const panel = await panelFrame(preview.page);
    await panel.locator('#tab-plan').waitFor();
    expect(cdnRequests).toBeGreaterThan(0);
    const html = await panel.evaluate(() => document.documentElement.outerHTML);
    expect(html).toContain('https://appsforoffice.microsoft.com/lib/1/hosted/office.js');
    await usePanel(panel);
    expect(await violations(panel)).toEqual([]);
    expect(consoleCsp).toEqual([]);
  }, 600_000);

  it('a help page and the help index: styled, no violation, no script allowed', async () => {
    const consoleCsp: string[] = [];
    preview = await openPreview({ panel: false, prepare: (context) => prepare(context, consoleCsp) });
    for (const name of ['PROB_HIGHEST.html', 'index.html']) {
      await preview.page.goto(`${preview.url}help/${name}`);
      await preview.page.locator('h1').waitFor();
      expect(await preview.page.evaluate(() => getComputedStyle(document.body).maxWidth)).toBe('736px');
      expect(await violations(preview.page)).toEqual([]);
    }
    expect(consoleCsp).toEqual([]);
    await screenshot(preview.page, 'csp-help-index');
    const provoked = await provoke(preview.page);
    expect(provoked.some((v) => v.startsWith('style-src-elem'))).toBe(true);
    expect(provoked.some((v) => v.startsWith('script-src-elem'))).toBe(true);
  }, 600_000);
});
