/**
 * The side panel's entry: registers the Fluent UI web components and chart.js parts it uses, waits for
 * Office, applies the Fluent theme that matches Office's theme (or the system's light or dark setting when
 * Office gives none), and mounts the panel on the Office.js workbook implementation (in Excel, or on the
 * no-Excel preview's stand-in) with Office's display language for reading numbers.
 */
import {
  Accordion,
  AccordionDefinition,
  AccordionItem,
  AccordionItemDefinition,
  Button,
  ButtonDefinition,
  Checkbox,
  CheckboxDefinition,
  Field,
  FieldDefinition,
  Link,
  LinkDefinition,
  MessageBar,
  MessageBarDefinition,
  ProgressBar,
  ProgressBarDefinition,
  Radio,
  RadioDefinition,
  RadioGroup,
  RadioGroupDefinition,
  setTheme,
  Tab,
  TabDefinition,
  Tablist,
  TablistDefinition,
  TextInput,
  TextInputDefinition,
} from '@fluentui/web-components';
import { webDarkTheme, webLightTheme } from '@fluentui/tokens';
import { registerChartParts } from './view/charts';
import { mountPanel } from './view/app';
import { createOfficeWorkbook } from './workbook/officeWorkbook';
import { officeThemeMode } from './logic/theme';

/** Define the Fluent custom elements the panel uses (each once). */
function defineComponents(): void {
  const parts: [{ define(definition: never): unknown }, unknown][] = [
    [Accordion as never, AccordionDefinition],
    [AccordionItem as never, AccordionItemDefinition],
    [Button as never, ButtonDefinition],
    [Checkbox as never, CheckboxDefinition],
    [Field as never, FieldDefinition],
    [Link as never, LinkDefinition],
    [MessageBar as never, MessageBarDefinition],
    [ProgressBar as never, ProgressBarDefinition],
    [Radio as never, RadioDefinition],
    [RadioGroup as never, RadioGroupDefinition],
    [Tab as never, TabDefinition],
    [Tablist as never, TablistDefinition],
    [TextInput as never, TextInputDefinition],
  ];
  for (const [element, definition] of parts) {
    const name = (definition as { name: string }).name;
    if (customElements.get(name) === undefined) element.define(definition as never);
  }
}

/** Show the panel light or dark with Fluent's web themes, and tell the page's CSS which one. */
function showTheme(mode: 'dark' | 'light'): void {
  setTheme(mode === 'dark' ? webDarkTheme : webLightTheme);
  document.documentElement.dataset.theme = mode;
}

/**
 * Follow Office's theme (Office.context.officeTheme) when Office gives one; otherwise the system's light
 * or dark setting. Office has no theme-change event for Excel task panes, so the theme is read again
 * whenever the panel becomes visible.
 */
function applyTheme(): void {
  const system = window.matchMedia?.('(prefers-color-scheme: dark)');
  const apply = (): void => {
    let office: 'dark' | 'light' | null;
    try {
      office = officeThemeMode(Office.context?.officeTheme);
    } catch {
      office = null;
    }
    showTheme(office ?? (system?.matches === true ? 'dark' : 'light'));
  };
  apply();
  system?.addEventListener?.('change', apply);
  document.addEventListener('visibilitychange', () => {
    if (document.visibilityState === 'visible') apply();
  });
}

/** Office's display language ("de-DE"), which decides how the panel reads and shows numbers. */
function displayLanguage(): string | undefined {
  try {
    const language = Office.context?.displayLanguage;
    return typeof language === 'string' && language !== '' ? language : undefined;
  } catch {
    return undefined;
  }
}

function start(): void {
  defineComponents();
  registerChartParts();
  const root = document.getElementById('app');
  if (root === null) return;
  void Office.onReady()
    .then(() => {
      applyTheme();
      return mountPanel(root, createOfficeWorkbook(), { language: displayLanguage() ?? navigator.language });
    })
    .catch((error: unknown) => {
      root.textContent = `Lift Ledger could not start: ${(error as Error).message ?? String(error)}`;
    });
}

start();
