/**
 * The side panel's entry: registers the Fluent UI web components and chart.js parts it uses, applies
 * the Fluent theme that matches the system's light or dark setting, waits for Office, and mounts the
 * panel on the Office.js workbook implementation (in Excel, or on the no-Excel preview's stand-in).
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

/** Follow the system's light or dark setting with Fluent's web themes. */
function applyTheme(): void {
  const dark = window.matchMedia?.('(prefers-color-scheme: dark)');
  const apply = (): void => setTheme(dark?.matches === true ? webDarkTheme : webLightTheme);
  apply();
  dark?.addEventListener?.('change', apply);
}

function start(): void {
  defineComponents();
  registerChartParts();
  applyTheme();
  const root = document.getElementById('app');
  if (root === null) return;
  void Office.onReady().then(() => mountPanel(root, createOfficeWorkbook())).catch((error: unknown) => {
    root.textContent = `Lift Ledger could not start: ${(error as Error).message ?? String(error)}`;
  });
}

start();
