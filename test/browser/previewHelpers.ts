/**
 * Helpers for browser tests of the preview workbook (`npm run test:browser`), for the preview's own tests
 * and for the side panel's flows (test/browser/panel*.test.ts).
 *
 *   const preview = await openPreview();            // server on a free port + Debian's chromium
 *   try {
 *     const { page } = preview;
 *     await selectCell(page, 'B11');
 *     await enterCell(page, 'C5', '480');         // click, type, Enter
 *     await readCell(page, 'Checkout test', 'B12'); // { value, text, message? } from the live workbook
 *     await switchSheet(page, 'Plan');
 *     const panel = await panelFrame(page);         // the side panel iframe (a playwright Frame)
 *     await screenshot(page, 'my-flow');            // → test-artifacts/my-flow.png
 *   } finally {
 *     await preview.cleanup();                      // closes chromium, the server, removes the profile
 *   }
 *
 * openPreview() needs dist/ (run `npm run build` first; CI does) and builds the preview bundle when it is
 * missing or stale. Chromium is /usr/bin/chromium (override with CHROMIUM_PATH), launched headless with a
 * fresh --user-data-dir; never `npx playwright install`.
 */
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { chromium, type BrowserContext, type Frame, type Page } from 'playwright-core';

/** The repository root and the screenshot folder (git-ignored). */
export const REPO_ROOT = path.resolve(__dirname, '..', '..');
export const ARTIFACTS = path.join(REPO_ROOT, 'test-artifacts');

interface PreviewServer {
  readonly url: string;
  readonly port: number;
  close(): Promise<void>;
}
interface ServerModule {
  startPreviewServer(options: { port: number; asBuilt?: boolean }): Promise<PreviewServer>;
  ensurePreviewBuilt(options?: { log?: (line: string) => void }): boolean;
}
// eslint-disable-next-line @typescript-eslint/no-require-imports
const serverModule = require('../../preview/server.js') as ServerModule;

/** What {@link openPreview} returns. */
export interface OpenPreview {
  readonly page: Page;
  readonly context: BrowserContext;
  readonly url: string;
  /** Messages the page logged as errors and uncaught exceptions, for assertions. */
  readonly pageErrors: string[];
  cleanup(): Promise<void>;
}

/** Options of {@link openPreview}. */
export interface OpenPreviewOptions {
  /** Open with the side panel shown (default true). */
  readonly panel?: boolean;
  readonly viewport?: { width: number; height: number };
  /** Serve the side panel's page exactly as built (Office's CDN script left in; see preview/server.js). */
  readonly asBuilt?: boolean;
  /** Runs before the first navigation, e.g. to add init scripts or routes to the browser context. */
  readonly prepare?: (context: BrowserContext) => Promise<void>;
}

/**
 * Starts the preview server on a free port, launches chromium on it and waits until the workbook is
 * ready. Throws with a clear message when dist/ or chromium is missing or the page fails to start.
 */
export async function openPreview(options: OpenPreviewOptions = {}): Promise<OpenPreview> {
  for (const file of ['functions.js', 'functions.json']) {
    if (!fs.existsSync(path.join(REPO_ROOT, 'dist', file))) {
      throw new Error(`dist/${file} is missing: run \`npm run build\` before \`npm run test:browser\``);
    }
  }
  const executablePath = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
  if (!fs.existsSync(executablePath)) throw new Error(`${executablePath} not found: apt-get install -y chromium`);
  serverModule.ensurePreviewBuilt({ log: () => undefined });
  const server = await serverModule.startPreviewServer({ port: 0, asBuilt: options.asBuilt });
  const profile = fs.mkdtempSync(path.join(os.tmpdir(), 'lift-ledger-preview-'));
  let context: BrowserContext | undefined;
  const cleanup = async (): Promise<void> => {
    await context?.close().catch(() => undefined);
    await server.close();
    fs.rmSync(profile, { recursive: true, force: true });
  };
  try {
    context = await chromium.launchPersistentContext(profile, {
      executablePath,
      headless: true,
      args: [
        '--headless',
        '--no-sandbox',
        '--disable-gpu',
        '--no-first-run',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
      ],
      viewport: options.viewport ?? { width: 1440, height: 900 },
    });
    await options.prepare?.(context);
    const page = context.pages()[0] ?? (await context.newPage());
    const pageErrors: string[] = [];
    page.on('pageerror', (error) => pageErrors.push(error.message));
    page.on('console', (message) => {
      if (message.type() === 'error') pageErrors.push(message.text());
    });
    const url = `${server.url}${options.panel === false ? '?panel=closed' : ''}`;
    await page.goto(url);
    await page.waitForSelector('body[data-ready]', { timeout: 60_000 });
    const ready = await page.evaluate(() => document.body.dataset.ready);
    if (ready !== 'true') throw new Error(`the preview did not start: ${await page.textContent('#status')}`);
    return { page, context, url: server.url, pageErrors, cleanup };
  } catch (error) {
    await cleanup();
    throw error;
  }
}

/** The grid cell element of the active sheet (A1 address). */
export function cellLocator(page: Page, address: string) {
  return page.locator(`#grid td[data-cell="${address.toUpperCase()}"]`);
}

/** Clicks a cell of the active sheet. */
export async function selectCell(page: Page, address: string): Promise<void> {
  await cellLocator(page, address).click();
}

/** Types `input` into a cell of the active sheet and presses Enter (the way a user edits). */
export async function enterCell(page: Page, address: string, input: string): Promise<void> {
  await selectCell(page, address);
  await page.keyboard.press('F2');
  await page.locator('.cell-editor').fill(input);
  await page.keyboard.press('Enter');
  await page.locator('.cell-editor').waitFor({ state: 'detached' });
}

/** A cell's live value in the workbook: raw value, the text shown, and an error's message. */
export async function readCell(
  page: Page,
  sheet: string,
  address: string,
): Promise<{ value: number | string | boolean; text: string; message?: string }> {
  return page.evaluate(
    ([s, a]) => {
      const handle = window.liftLedgerPreview;
      if (!handle) throw new Error('the preview is not ready');
      return handle.cellValue(s as string, a as string);
    },
    [sheet, address],
  );
}

/** Reads a rows × columns block starting at `address` (raw values). */
export async function readBlock(
  page: Page,
  sheet: string,
  address: string,
  rows: number,
  columns: number,
): Promise<(number | string | boolean)[][]> {
  return page.evaluate(
    ([s, a, r, c]) => {
      const handle = window.liftLedgerPreview;
      if (!handle) throw new Error('the preview is not ready');
      const id = handle.workbook.sheetId(s as string);
      if (id === undefined) throw new Error(`no sheet ${s}`);
      const m = /^([A-Z]+)([0-9]+)$/.exec(String(a).toUpperCase());
      if (!m) throw new Error(`bad address ${a}`);
      const col = [...(m[1] as string)].reduce((n, ch) => n * 26 + ch.charCodeAt(0) - 64, 0) - 1;
      return handle.workbook.values({ sheet: id, row: Number(m[2]) - 1, col, rows: r as number, columns: c as number });
    },
    [sheet, address, rows, columns] as const,
  );
}

/** Clicks a sheet tab and waits until it is active. */
export async function switchSheet(page: Page, name: string): Promise<void> {
  await page.locator(`#tabs button[data-sheet-name="${name}"]`).click();
  await page.locator(`#tabs button[data-sheet-name="${name}"][aria-selected="true"]`).waitFor();
}

/** The side panel's iframe as a playwright Frame, once its page has loaded. */
export async function panelFrame(page: Page): Promise<Frame> {
  const element = await page.waitForSelector('#panel-frame');
  const frame = await element.contentFrame();
  if (!frame) throw new Error('the side panel frame is not available');
  await frame.waitForLoadState('load');
  return frame;
}

/** Saves a full-page screenshot to test-artifacts/<name>.png and returns its path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(ARTIFACTS, { recursive: true });
  const file = path.join(ARTIFACTS, `${name}.png`);
  await page.screenshot({ path: file });
  return file;
}
