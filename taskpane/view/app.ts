/**
 * The side panel: a tab list (Prior, Plan, Read-out, Explain, Cautions) over the sections, a line
 * saying what is selected, and the Cautions reachable from every section.
 */
import { CAUTIONS } from '../logic/cautions';
import type { Workbook } from '../workbook/workbook';
import { createContext } from './context';
import { el } from './dom';
import { explainSection } from './explainSection';
import { planSection } from './planSection';
import { priorSection } from './priorSection';
import { readoutSection } from './readoutSection';

type TabId = 'prior' | 'plan' | 'readout' | 'explain' | 'cautions';

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

/**
 * Mount the panel into `root`, talking to the workbook only through `workbook`. Resolves once the
 * selection listener is in place. Cost: DOM construction and one selection read.
 * @example await mountPanel(document.getElementById('app'), createOfficeWorkbook())
 */
export async function mountPanel(root: HTMLElement, workbook: Workbook): Promise<void> {
  const tabs: Record<TabId, string> = {
    prior: 'Prior',
    plan: 'Plan',
    readout: 'Read-out',
    explain: 'Explain',
    cautions: 'Cautions',
  };
  const tablist = el('fluent-tablist', { id: 'tabs', activeid: 'tab-prior', 'aria-label': 'Sections' });
  for (const [id, label] of Object.entries(tabs)) tablist.append(el('fluent-tab', { id: `tab-${id}` }, label));
  const selectionLine = el('p', { id: 'selection-line', class: 'hint' }, 'Selection: …');
  const cautionsButton = el('fluent-button', { id: 'open-cautions', appearance: 'subtle', size: 'small' }, 'Cautions');
  const header = el(
    'header',
    { class: 'panel-header' },
    el('div', { class: 'title-row' }, el('h1', {}, 'Lift Ledger'), cautionsButton),
    selectionLine,
    tablist,
  );
  const sectionsByTab: Partial<Record<TabId, HTMLElement>> = {};
  const view = { active: 'prior' as TabId };

  const open = (tab: TabId, cautionId?: string): void => {
    view.active = tab;
    if (tablist.getAttribute('activeid') !== `tab-${tab}`) tablist.setAttribute('activeid', `tab-${tab}`);
    for (const [id, section] of Object.entries(sectionsByTab)) section.hidden = id !== tab;
    if (tab === 'cautions' && cautionId !== undefined) {
      const item = root.querySelector(`#caution-${cautionId}`);
      item?.setAttribute('expanded', '');
      (item as HTMLElement | null)?.scrollIntoView?.({ block: 'nearest' });
    }
    if (tab === 'explain') void explain.refresh();
  };

  const context = createContext(workbook, (id) => open('cautions', id));
  const explain = explainSection(context);
  sectionsByTab.prior = priorSection(context);
  sectionsByTab.plan = planSection(context);
  sectionsByTab.readout = readoutSection(context);
  sectionsByTab.explain = explain.element;
  sectionsByTab.cautions = cautionsSection();

  const main = el('main', { class: 'panel-body' }, ...Object.values(sectionsByTab));
  const footer = el(
    'footer',
    { class: 'panel-footer hint' },
    'Lift Ledger writes live ABTEST formulas, never pasted numbers. For decisions about health, safety or other regulated matters, ask a qualified statistician and follow local rules.',
  );
  root.replaceChildren(header, main, footer);

  tablist.addEventListener('change', () => {
    const active = tablist.getAttribute('activeid') ?? (tablist as HTMLElement & { activeid?: string }).activeid ?? '';
    const tab = active.replace(/^tab-/, '') as TabId;
    if (tab in tabs && tab !== view.active) open(tab);
  });
  for (const id of Object.keys(tabs) as TabId[]) {
    root.querySelector(`#tab-${id}`)?.addEventListener('click', () => open(id));
  }
  cautionsButton.addEventListener('click', () => open('cautions'));

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
