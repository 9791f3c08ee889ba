/**
 * Entry of the preview page (`npm start`): loads the add-in's real dist/functions.js with a CustomFunctions
 * stand-in, registers its functions into HyperFormula from dist/functions.json, builds the invented demo
 * workbook, shows the grid, and offers the side panel (dist/taskpane.html, served with the Office stand-in
 * instead of Office's CDN script) in a same-origin iframe.
 */
import { HyperFormula } from 'hyperformula';
import { registerAbtestFunctions } from './abtestPlugin';
import { createCustomFunctionsStandIn } from './customFunctionsStandIn';
import { buildDemoWorkbook, parseA1 } from './demoWorkbook';
import { createOfficeStandIn, type OfficeStandIn, type Realm } from './excelStandIn';
import { GridView } from './gridView';
import { parseFunctionsMetadata } from './metadata';
import { PreviewWorkbook } from './previewWorkbook';

/** What the page exposes on `window.liftLedgerPreview` (the panel's stand-in script and tests use it). */
export interface PreviewHandle {
  readonly workbook: PreviewWorkbook;
  /** Office/Excel globals for a frame (the side panel's office.js replacement calls this). */
  createOfficeForFrame(frame: Window): OfficeStandIn & { CustomFunctions: unknown };
  /** Raw value of a cell (number, text, boolean, '' or the error text) and its message. */
  cellValue(sheetName: string, address: string): { value: number | string | boolean; message?: string; text: string };
  /** Names of the registered worksheet functions. */
  readonly functionNames: readonly string[];
}

declare global {
  interface Window {
    liftLedgerPreview?: PreviewHandle;
  }
}

function byId<T extends HTMLElement>(id: string): T {
  const element = document.getElementById(id);
  if (!element) throw new Error(`the page has no #${id}`);
  return element as T;
}

/** Loads a script; rejects when it cannot be fetched or when it throws while running. */
function loadScript(src: string): Promise<void> {
  return new Promise((resolve, reject) => {
    const script = document.createElement('script');
    let failure: string | undefined;
    const onError = (event: ErrorEvent) => {
      if (event.filename && new URL(event.filename, location.href).pathname === src) failure = event.message;
    };
    window.addEventListener('error', onError);
    script.src = src;
    script.onload = () => {
      window.removeEventListener('error', onError);
      if (failure) reject(new Error(`${src} failed while loading (${failure})`));
      else resolve();
    };
    script.onerror = () => {
      window.removeEventListener('error', onError);
      reject(new Error(`could not load ${src}`));
    };
    document.head.append(script);
  });
}

function showFatal(message: string): void {
  const status = byId('status');
  status.textContent = message;
  status.classList.add('is-error');
  status.hidden = false;
}

async function start(): Promise<void> {
  const host = createCustomFunctionsStandIn();
  // The add-in's functions.js calls the CustomFunctions global, as in Excel's runtime.
  (window as unknown as Record<string, unknown>).CustomFunctions = host.api;
  await loadScript('/functions.js');
  const response = await fetch('/functions.json');
  if (!response.ok) throw new Error(`could not load /functions.json (${response.status})`);
  const metadata = parseFunctionsMetadata(await response.json());
  const definition = registerAbtestFunctions(HyperFormula, metadata, host.associations);

  const workbook = PreviewWorkbook.create(buildDemoWorkbook());
  new GridView(workbook, {
    tabs: byId('tabs'),
    nameBox: byId('name-box'),
    formulaInput: byId<HTMLInputElement>('formula-input'),
    formulaMessage: byId('formula-message'),
    scroller: byId('grid-scroller'),
  });

  window.liftLedgerPreview = {
    workbook,
    functionNames: definition.names,
    createOfficeForFrame(frame: Window) {
      const realm = frame as unknown as Realm;
      const frameHost = createCustomFunctionsStandIn();
      // `?api=1.16` plays an Excel that offers the Excel JavaScript API only up to that version (no notes before 1.18).
      const api = new URLSearchParams(location.search).get('api');
      const stand =
        api !== null && /^1\.\d{1,2}$/.test(api)
          ? createOfficeStandIn(workbook, realm, api)
          : createOfficeStandIn(workbook, realm);
      return { ...stand, CustomFunctions: frameHost.api };
    },
    cellValue(sheetName: string, address: string) {
      const sheet = workbook.sheetId(sheetName);
      if (sheet === undefined) throw new Error(`no sheet ${sheetName}`);
      const { row, col } = parseA1(address);
      const view = workbook.cell(sheet, row, col);
      return { value: view.value, text: view.text, ...(view.message ? { message: view.message } : {}) };
    },
  };

  const panel = byId('panel');
  const toggle = byId<HTMLButtonElement>('toggle-panel');
  const frame = byId<HTMLIFrameElement>('panel-frame');
  const setPanel = (open: boolean) => {
    panel.hidden = !open;
    toggle.setAttribute('aria-expanded', String(open));
    toggle.textContent = open ? 'Hide side panel' : 'Show side panel';
    if (open && !frame.src) frame.src = '/taskpane.html';
  };
  toggle.addEventListener('click', () => setPanel(panel.hidden));
  setPanel(new URLSearchParams(location.search).get('panel') !== 'closed');
  document.body.dataset.ready = 'true';
  byId('status').hidden = true;
}

start().catch((error: unknown) => {
  showFatal(`The preview could not start: ${(error as Error).message}. Run \`npm run build\` and \`npm start\` again.`);
  document.body.dataset.ready = 'failed';
});
