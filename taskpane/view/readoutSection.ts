/**
 * The Read-out section: the user selects the variant table; the panel finds the header row and which
 * column is which, shows that mapping with the column headings and flags cells that are not numbers
 * (a mapping guessed from the numbers alone must be confirmed), then offers an empty place for the
 * block ("Where to write", writePlace.ts) and shows its range before "Insert read-out" writes a labelled
 * block of live formulas there and a native Excel chart of the lift densities.
 */
import { srmPValue } from '../../functions/stats/srm';
import { readoutArea, readoutBlock, SRM_ALARM } from '../logic/formulas';
import { formatCount, parseNumber, readPercent, type PercentRule } from '../logic/inputs';
import { variantLabel } from '../logic/resultWords';
import {
  checkTable,
  detectTable,
  MAX_LISTED,
  type CellFlag,
  type MappingBasis,
  type TableMapping,
} from '../logic/tableDetect';
import { cellAddress, columnLetters, parseAddress, rangeAddress } from '../workbook/address';
import type { CellValue, RangeContents } from '../workbook/workbook';
import { outcomeText, type PanelContext } from './context';
import { button, checkbox, el, select, setBusy, showMessage, textField } from './dom';
import { writePlace } from './writePlace';

/** The credible level takes a percent from 10% (below is a likely slip: 0.95 typed for 95%). */
const CREDIBLE_LEVEL_RULE: PercentRule = { name: 'Credible level', min: 0.1, minIncluded: true, max: 1, maxIncluded: false, example: '95' };

/** Rows of the LIFT_DENSITY table the read-out writes for its chart. */
const DENSITY_POINTS = 61;

/** "column B ("Visitors")", or "column B" when there is no heading. */
function columnName(start: number, column: number, header: CellValue | undefined, hasHeader: boolean): string {
  const heading = hasHeader && typeof header === 'string' && header.trim() !== '' ? ` ("${header.trim()}")` : '';
  return `column ${columnLetters(start + column)}${heading}`;
}

/**
 * Build the Read-out section. Cost: DOM construction; "Use the selected table" reads the selection
 * once (at most 5,001 rows) and looks for empty places once; "Insert read-out" makes one block write and
 * one chart insert.
 * @example section.append(readoutSection(context))
 */
export function readoutSection(context: PanelContext): HTMLElement {
  const root = el('section', {
    id: 'section-readout',
    class: 'section',
    hidden: true,
    'aria-labelledby': 'tab-readout',
  });
  const useButton = button('readout-use-selection', 'Use the selected table', 'primary');
  const tableInfo = el('div', { id: 'readout-table', class: 'summary', 'aria-live': 'polite' });
  const mappingArea = el('div', { id: 'readout-mapping', class: 'group' });
  const level = textField('readout-level', 'Credible level', '95', { unit: '%' });
  const alpha = textField('readout-alpha', 'Prior alpha', '1');
  const beta = textField('readout-beta', 'Prior beta', '1');
  const priorButton = button('readout-use-prior', 'Copy alpha and beta from the Prior section');
  const insertButton = button('readout-insert', 'Insert read-out', 'primary');
  setBusy(insertButton, true);
  const splitArea = el('div', { id: 'readout-split' });
  const status = el('div', { id: 'readout-status' });
  const place = writePlace(context, 'readout');
  const cautionLink = el('fluent-link', { href: '#', id: 'readout-cautions' }, 'Before you act on a read-out');
  cautionLink.addEventListener('click', (event) => {
    event.preventDefault();
    context.showCautions('peeking');
  });
  root.append(
    el('h2', {}, 'Read-out'),
    el(
      'p',
      { class: 'hint' },
      'Select the variant table (one row per variant: name, visitors, conversions; the control first), then press the button.',
    ),
    el('div', { class: 'actions' }, useButton),
    tableInfo,
    mappingArea,
    splitArea,
    level.element,
    alpha.element,
    beta.element,
    el('div', { class: 'actions' }, priorButton),
    place.element,
    el('div', { class: 'actions' }, insertButton),
    el(
      'p',
      { class: 'hint' },
      'Writes posterior means and intervals, P(beats control), P(highest), lift intervals, expected loss, the decision, the split check, and a lift-density table with a native chart — all live formulas, each row beside its variant’s name.',
    ),
    status,
    cautionLink,
  );

  const view = {
    selection: null as RangeContents | null,
    mapping: null as TableMapping | null,
    basis: 'headings' as MappingBasis,
    /** A guessed mapping counts once the user confirms it or sets a column. */
    confirmed: true,
    /** Variants the places were found for (the block's size depends on it). */
    placedFor: 0,
    /** True while an insert runs: a second click does nothing (a double click writes once). */
    inserting: false,
  };

  const cellOf = (row: number, column: number): string => {
    const start = parseAddress(view.selection?.localAddress ?? 'A1').start;
    return cellAddress({ row: start.row + row, column: start.column + column });
  };

  const findPlaces = async (variants: number): Promise<void> => {
    const selection = view.selection;
    if (selection === null) return;
    view.placedFor = variants;
    const area = readoutArea(variants, DENSITY_POINTS);
    await place.find({
      sheet: selection.sheet,
      table: selection.localAddress,
      rowCount: area.rowCount,
      columnCount: area.columnCount,
      newSheetName: `${selection.sheet} read-out`,
    });
  };

  const renderCheck = (): void => {
    const selection = view.selection;
    const mapping = view.mapping;
    if (selection === null || mapping === null) return;
    const checked = checkTable(selection.values, mapping);
    if (!checked.ok) {
      tableInfo.replaceChildren(
        el(
          'p',
          { class: 'error-text', id: 'readout-problems' },
          `The table has problems: ${checked.problems.join('; ')}.`,
        ),
      );
      showMessage(splitArea, 'info', null);
      setBusy(insertButton, true);
      place.reset();
      return;
    }
    const list = el('ul', { id: 'readout-variants' });
    checked.names.forEach((name, i) =>
      list.append(el('li', {}, `${variantLabel(name, i)}: ${formatCount(checked.conversions[i] ?? NaN, context.locale)} conversions of ${formatCount(checked.visitors[i] ?? NaN, context.locale)} visitors`)),
    );
    tableInfo.replaceChildren(el('p', {}, `${checked.names.length} variants in ${selection.address}:`), list);
    const p = srmPValue(checked.visitors, checked.shares ?? undefined);
    showMessage(
      splitArea,
      p < SRM_ALARM ? 'error' : 'info',
      p < SRM_ALARM
        ? `Split check: SRM p-value ${p.toExponential(2)} is below 0.001 — the split looks broken. Find out why before trusting any read-out.`
        : `Split check: SRM p-value ${p.toPrecision(3)} (${checked.shares === null ? 'equal shares planned' : 'against the planned shares'}); no sign of a broken split.`,
    );
    if (checked.names.length > 4) {
      tableInfo.append(
        el('p', { class: 'hint' }, 'Many variants: the best-looking one is often lucky. See the cautions.'),
      );
    }
    setBusy(insertButton, !view.confirmed);
    if (view.placedFor !== checked.names.length) void findPlaces(checked.names.length);
  };

  const renderMapping = (flags: readonly CellFlag[], flagCount: number): void => {
    const selection = view.selection;
    const mapping = view.mapping;
    mappingArea.replaceChildren();
    if (selection === null || mapping === null) return;
    const start = parseAddress(selection.localAddress).start;
    const header = selection.values[0] ?? [];
    const options: [string, string][] = header.map((cell, c) => [
      String(c),
      columnName(start.column, c, cell, mapping.hasHeader),
    ]);
    const headerBox = checkbox('readout-has-header', 'First row is a heading', mapping.hasHeader);
    const names = select(
      'readout-names',
      'Names',
      [['none', 'no names (A, B, C…)'], ...options],
      mapping.namesColumn === null ? 'none' : String(mapping.namesColumn),
    );
    const visitors = select('readout-visitors', 'Visitors', options, String(mapping.visitorsColumn));
    const conversions = select('readout-conversions', 'Conversions', options, String(mapping.conversionsColumn));
    const shares = select(
      'readout-shares',
      'Planned shares (split check)',
      [['none', 'equal shares'], ...options],
      mapping.sharesColumn === null ? 'none' : String(mapping.sharesColumn),
    );
    const summary = el(
      'p',
      { id: 'readout-mapping-summary' },
      `Visitors: ${columnName(start.column, mapping.visitorsColumn, header[mapping.visitorsColumn], mapping.hasHeader)}; ` +
        `conversions: ${columnName(start.column, mapping.conversionsColumn, header[mapping.conversionsColumn], mapping.hasHeader)}; ` +
        `names: ${mapping.namesColumn === null ? 'none (A, B, C…)' : columnName(start.column, mapping.namesColumn, header[mapping.namesColumn], mapping.hasHeader)}.`,
    );
    const changed = (): void => {
      view.mapping = {
        hasHeader: headerBox.checked(),
        namesColumn: names.input.value === 'none' ? null : Number(names.input.value),
        visitorsColumn: Number(visitors.input.value),
        conversionsColumn: Number(conversions.input.value),
        sharesColumn: shares.input.value === 'none' ? null : Number(shares.input.value),
      };
      // Setting a column by hand is the user's own mapping: no longer a guess.
      view.confirmed = true;
      renderMapping([], 0);
      renderCheck();
    };
    headerBox.box.addEventListener('change', changed);
    for (const control of [names, visitors, conversions, shares]) control.input.addEventListener('change', changed);
    mappingArea.append(summary);
    if (flagCount > 0) {
      const items = flags.map((flag) => el('li', {}, `${cellOf(flag.row, flag.column)}: ${flag.problem}`));
      if (flagCount > flags.length)
        items.push(el('li', {}, `and ${(flagCount - flags.length).toLocaleString('en-US')} more cells like these`));
      mappingArea.append(
        el(
          'div',
          { id: 'readout-flags', role: 'alert' },
          el(
            'p',
            { class: 'error-text' },
            `Cells that are not whole numbers (${flagCount.toLocaleString('en-US')}; fix them on the sheet, then press "Use the selected table" again):`,
          ),
          el('ul', {}, ...items.slice(0, MAX_LISTED + 1)),
        ),
      );
    }
    if (!view.confirmed) {
      const confirm = button('readout-confirm-mapping', 'The columns are right', 'secondary');
      const guess = el('div', { id: 'readout-guess' });
      showMessage(
        guess,
        'warning',
        'These columns were guessed from the numbers alone (the headings do not say which is which). Check them below, then confirm or set them.',
        confirm,
      );
      confirm.addEventListener('click', () => {
        view.confirmed = true;
        renderMapping(flags, flagCount);
        renderCheck();
      });
      mappingArea.append(guess);
    }
    mappingArea.append(
      el('p', { class: 'hint' }, 'Which column is which (correct it if needed):'),
      headerBox.element,
      names.element,
      visitors.element,
      conversions.element,
      shares.element,
    );
  };

  const useSelection = async (): Promise<void> => {
    setBusy(useButton, true);
    showMessage(status, 'info', null);
    try {
      const selection = await context.workbook.readSelection();
      const detection = selection.truncated
        ? ({
            ok: false,
            problem: `the selection has ${selection.rowCount.toLocaleString('en-US')} rows and ${selection.columnCount} columns; select only the variant table`,
          } as const)
        : detectTable(selection.values);
      view.selection = selection;
      view.placedFor = 0;
      if (!detection.ok) {
        view.mapping = null;
        mappingArea.replaceChildren();
        showMessage(splitArea, 'info', null);
        place.reset();
        tableInfo.replaceChildren(
          el('p', { class: 'error-text', id: 'readout-problems' }, `${selection.address}: ${detection.problem}.`),
        );
        setBusy(insertButton, true);
        return;
      }
      view.mapping = detection.mapping;
      view.basis = detection.basis;
      view.confirmed = detection.basis === 'headings';
      renderMapping(detection.flags, detection.flagCount);
      renderCheck();
      tableInfo.append(el('p', { class: 'hint' }, `Detected: ${detection.note}.`));
    } catch (error) {
      tableInfo.replaceChildren(
        el('p', { class: 'error-text' }, `Could not read the selection: ${(error as Error).message}`),
      );
    } finally {
      setBusy(useButton, false);
    }
  };

  const insert = async (): Promise<void> => {
    const selection = view.selection;
    const mapping = view.mapping;
    if (selection === null || mapping === null || !view.confirmed || view.inserting) return;
    const checked = checkTable(selection.values, mapping);
    if (!checked.ok) return;
    const levelReading = readPercent(level.text(), CREDIBLE_LEVEL_RULE, context.locale);
    const lv = levelReading.ok ? levelReading.value : Number.NaN;
    const a = parseNumber(alpha.text(), context.locale);
    const b = parseNumber(beta.text(), context.locale);
    if (!levelReading.ok || !(a > 0) || !(b > 0)) {
      showMessage(status, 'error', levelReading.ok ? 'Prior alpha and beta must be above 0.' : levelReading.message);
      return;
    }
    setBusy(insertButton, true);
    view.inserting = true;
    try {
      const start = parseAddress(selection.localAddress).start;
      const k = checked.names.length;
      const column = (c: number): string =>
        rangeAddress({ row: start.row + checked.firstRow, column: start.column + c }, k, 1);
      const build = (target: { sheet: string; topLeft: string; newSheet: boolean }) =>
        readoutBlock(
          {
            sheet: selection.sheet,
            namesRef: mapping.namesColumn === null ? null : column(mapping.namesColumn),
            visitorsRef: column(mapping.visitorsColumn),
            conversionsRef: column(mapping.conversionsColumn),
            sharesRef: mapping.sharesColumn === null ? null : column(mapping.sharesColumn),
            variants: k,
          },
          {
            level: lv,
            prior: { alpha: a, beta: b },
            densityPoints: DENSITY_POINTS,
            currentSrmPValue: srmPValue(checked.visitors, checked.shares ?? undefined),
          },
          target.topLeft,
          target.sheet,
        );
      const written = await place.write(
        (target) => ({ ...build(target).block, newSheet: target.newSheet }),
        'the read-out',
        status,
      );
      if (written === null) return;
      const { outcome, target } = written;
      if (outcome.kind !== 'written') {
        const { intent, text } = outcomeText(outcome, 'the read-out');
        showMessage(status, intent, text);
        return;
      }
      const built = build(target);
      const chart = await context.workbook.insertChart({
        sheet: target.sheet,
        sourceAddress: built.chartSource,
        type: 'XYScatterSmoothNoMarkers',
        title: 'Lift over control: posterior density',
        topLeft: built.chartTopLeft,
        bottomRight: built.chartBottomRight,
      });
      showMessage(
        status,
        chart.kind === 'inserted' ? 'success' : 'warning',
        chart.kind === 'inserted'
          ? `Wrote the read-out to ${outcome.address} (live formulas) and a lift chart from ${built.chartSource}. The decision is in ${built.cells.decision}.`
          : `Wrote the read-out to ${outcome.address}, but ${chart.message}. The density table in ${built.chartSource} can be charted by hand.`,
      );
      // The place just used is taken now: look again for the next read-out.
      await findPlaces(k);
    } catch (error) {
      showMessage(status, 'error', `Could not insert the read-out: ${(error as Error).message}`);
    } finally {
      view.inserting = false;
      setBusy(
        insertButton,
        !(view.confirmed && view.mapping !== null && checkTable(selection.values, view.mapping).ok),
      );
    }
  };

  priorButton.addEventListener('click', () => {
    const prior = context.state.prior;
    if (prior === null) {
      showMessage(status, 'info', 'Choose a prior in the Prior section first.');
      return;
    }
    alpha.set(String(+prior.alpha.toPrecision(8)));
    beta.set(String(+prior.beta.toPrecision(8)));
  });
  useButton.addEventListener('click', () => void useSelection());
  insertButton.addEventListener('click', () => void insert());
  return root;
}
