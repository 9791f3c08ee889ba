/**
 * The side panel: a tab list (Prior, Plan, Read-out, Daily, Explain, Share, Cautions) over the sections, a line
 * saying what is selected, and the Cautions reachable from every section (its tab, and a link in each
 * section that opens the caution it needs).
 */
import { CAUTIONS } from '../logic/cautions';
import { localeOf } from '../logic/inputs';
import type { Workbook } from '../workbook/workbook';
import { createContext } from './context';
import { el } from './dom';
import { daySection } from './daySection';
import { explainSection } from './explainSection';
import { planSection } from './planSection';
import { priorSection } from './priorSection';
import { readoutSection } from './readoutSection';
import { shareSection } from './shareSection';

type TabId = 'prior' | 'plan' | 'readout' | 'days' | 'explain' | 'share' | 'cautions';

function cautionsSection(): HTMLElement {
  const accordion = el('fluent-accordion', { id: 'cautions-list' });
  for (const caution of CAUTIONS) {
    accordion.append(
      el(
        'fluent-accordion-item',
        { id: `caution-${caution.id}` },
        el('span', { slot: 'heading' }, caution.title),
        el('p', {}, caution.text),
      ),
    );
  }
  return el(
    'section',
    { id: 'section-cautions', class: 'section', hidden: true, 'aria-labelledby': 'tab-cautions' },
    el('h2', {}, 'Cautions'),
    el('p', { class: 'hint' }, 'Where a read-out can mislead, and what to do about it.'),
    accordion,
  );
}

/** Options of the panel. */
export interface PanelOptions {
  /** Office's display language (Office.context.displayLanguage): how numbers are read and shown. */
  readonly language?: string;
}

/** The tabs in order: id and visible name. */
const TABS: readonly (readonly [TabId, string])[] = [
  ['prior', 'Prior'],
  ['plan', 'Plan'],
  ['readout', 'Read-out'],
  ['days', 'Daily'],
  ['explain', 'Explain'],
  ['share', 'Share'],
  ['cautions', 'Cautions'],
];

/**
 * Mount the panel into `root`, talking to the workbook only through `workbook`. Resolves once the
 * selection listener is in place. The tabs follow the WAI-ARIA tabs pattern: one tab in the Tab order,
 * arrow keys (and Home, End) move to a tab and show its section, Enter and Space show the focused tab's
 * section. Cost: DOM construction and one selection read.
 * @example await mountPanel(document.getElementById('app'), createOfficeWorkbook(), { language: 'de-DE' })
 */
export async function mountPanel(root: HTMLElement, workbook: Workbook, options: PanelOptions = {}): Promise<void> {
  const tablist = el('fluent-tablist', { id: 'tabs', activeid: 'tab-prior', 'aria-label': 'Sections' });
  for (const [id, label] of TABS) {
    tablist.append(el('fluent-tab', { id: `tab-${id}`, 'aria-controls': `section-${id}` }, label));
  }
  const tabElements = TABS.map(([id]) => tablist.querySelector(`#tab-${id}`) as HTMLElement);
  const selectionLine = el('p', { id: 'selection-line', class: 'hint' }, 'Selection: …');
  const header = el('header', { class: 'panel-header' }, el('h1', {}, 'Lift Ledger'), selectionLine, tablist);
  const sectionsByTab: Partial<Record<TabId, HTMLElement>> = {};
  const view = { active: 'prior' as TabId };

  /** Only the shown tab is in the Tab order (roving tabindex). */
  const rove = (): void => {
    TABS.forEach(([id], i) => {
      const tab = tabElements[i] as HTMLElement;
      tab.tabIndex = id === view.active ? 0 : -1;
      tab.setAttribute('aria-selected', String(id === view.active));
    });
  };

  const open = (tab: TabId, cautionId?: string): void => {
    view.active = tab;
    if (tablist.getAttribute('activeid') !== `tab-${tab}`) tablist.setAttribute('activeid', `tab-${tab}`);
    for (const [id, section] of Object.entries(sectionsByTab)) section.hidden = id !== tab;
    rove();
    if (tab === 'cautions' && cautionId !== undefined) {
      const item = root.querySelector(`#caution-${cautionId}`);
      item?.setAttribute('expanded', '');
      (item as HTMLElement | null)?.scrollIntoView?.({ block: 'nearest' });
    }
    if (tab === 'explain') void explain.refresh();
  };

  const context = createContext(workbook, (id) => open('cautions', id), localeOf(options.language));
  const explain = explainSection(context);
  sectionsByTab.prior = priorSection(context);
  sectionsByTab.plan = planSection(context);
  sectionsByTab.readout = readoutSection(context);
  sectionsByTab.days = daySection(context);
  sectionsByTab.explain = explain.element;
  sectionsByTab.share = shareSection(context);
  sectionsByTab.cautions = cautionsSection();
  for (const [id, section] of Object.entries(sectionsByTab)) {
    section.setAttribute('role', 'tabpanel');
    section.setAttribute('aria-labelledby', `tab-${id}`);
  }

  const main = el('main', { class: 'panel-body' }, ...Object.values(sectionsByTab));
  const footer = el(
    'footer',
    { class: 'panel-footer hint' },
    'Lift Ledger writes live ABTEST formulas, never pasted numbers. For decisions about health, safety or other regulated matters, ask a qualified statistician and follow local rules.',
  );
  root.replaceChildren(header, main, footer);
  rove();

  const tabOf = (target: EventTarget | null): TabId | null => {
    const index = tabElements.findIndex((tab) => tab === target || tab.contains(target as Node));
    return index < 0 ? null : (TABS[index] as readonly [TabId, string])[0];
  };
  tablist.addEventListener('change', () => {
    const active = (tablist as HTMLElement & { activeid?: string }).activeid ?? tablist.getAttribute('activeid') ?? '';
    const tab = active.replace(/^tab-/, '') as TabId;
    if (TABS.some(([id]) => id === tab) && tab !== view.active) open(tab);
  });
  tablist.addEventListener('keydown', (event: KeyboardEvent) => {
    const current = tabOf(event.target) ?? view.active;
    const index = TABS.findIndex(([id]) => id === current);
    const last = TABS.length - 1;
    const moves: Record<string, number> = {
      ArrowRight: index + 1,
      ArrowDown: index + 1,
      ArrowLeft: index - 1,
      ArrowUp: index - 1,
      Home: 0,
      End: last,
    };
    if (event.key in moves) {
      const next = ((moves[event.key] as number) + TABS.length) % TABS.length;
      event.preventDefault();
      event.stopPropagation();
      open((TABS[next] as readonly [TabId, string])[0]);
      (tabElements[next] as HTMLElement).focus();
    } else if (event.key === 'Enter' || event.key === ' ') {
      event.preventDefault();
      open(current);
    }
  });
  for (const [id] of TABS) {
    root.querySelector(`#tab-${id}`)?.addEventListener('click', () => open(id));
  }

  const showSelection = async (): Promise<void> => {
    try {
      const selection = await workbook.readSelection();
      selectionLine.textContent = `Selection: ${selection.address}`;
    } catch {
      selectionLine.textContent = 'Selection: (could not be read)';
    }
    context.notify('selection');
    if (view.active === 'explain') await explain.refresh();
  };
  await workbook.onSelectionChanged(() => void showSelection());
  await showSelection();
}
