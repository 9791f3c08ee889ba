/**
 * The Read-out section: the user selects the variant table; the panel finds the header row and which
 * column is which, shows that mapping with the column headings and flags cells that are not numbers
 * (a mapping guessed from the numbers alone must be confirmed), then offers an empty place for the
 * block ("Where to write", writePlace.ts) and shows its range before "Insert read-out" writes a labelled
 * block of live formulas there and a native Excel chart: of the lift densities for conversions, of the
 * challengers' lift intervals for the other metrics (no core function gives their lift densities).
 */
import { srmPValue } from '../../functions/stats/srm';
import { readoutArea, readoutBlock, SRM_ALARM } from '../logic/formulas';
import { MAX_GUARDRAILS, type Guardrail, type GuardrailDirection } from '../logic/guardrails';
import { metricReadoutArea, metricReadoutBlock } from '../logic/metricFormulas';
import {
  checkMetrics,
  detectMetrics,
  KIND_NAMES,
  KIND_ROLES,
  KIND_SHORT,
  METRIC_KINDS,
  orderSdWarnings,
  roleName,
  type MetricDetection,
  type MetricKind,
  type MetricRole,
} from '../logic/metrics';
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
import { button, checkbox, el, select, setBusy, shortNumber, showMessage, textField } from './dom';
import { writePlace } from './writePlace';

/** The credible level takes a percent from 10% (below is a likely slip: 0.95 typed for 95%). */
const CREDIBLE_LEVEL_RULE: PercentRule = {
  name: 'Credible level',
  min: 0.1,
  minIncluded: true,
  max: 1,
  maxIncluded: false,
  example: '95',
};

/** A guardrail's limit: a relative lift from −99% to +100%. */
const GUARDRAIL_LIMIT_RULE: PercentRule = {
  name: 'Guardrail limit',
  min: -0.99,
  minIncluded: true,
  max: 1,
  maxIncluded: true,
  example: '-2',
};
/** A guardrail's required probability: from 50% to below 100%. */
const GUARDRAIL_PROBABILITY_RULE: PercentRule = {
  name: 'Guardrail probability',
  min: 0.5,
  minIncluded: true,
  max: 1,
  maxIncluded: false,
  example: '95',
};

/** A guardrail as the panel holds it: its choices and the typed texts. */
interface GuardrailDraft {
  kind: MetricKind;
  direction: GuardrailDirection;
  limit: string;
  required: string;
}

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
  const kindArea = el('div', { id: 'readout-kind' });
  const mappingArea = el('div', { id: 'readout-mapping', class: 'group' });
  const columnsArea = el('div', { id: 'readout-metric-columns', class: 'group' });
  const guardrailArea = el('div', { id: 'readout-guardrails', class: 'group' });
  const orderSdArea = el('div', { id: 'readout-order-sd' });
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
      'Select the variant table (one row per variant, the control first: visitors and conversions; or orders, visitors and revenue; or count, mean and sd; or events and exposure), then press the button.',
    ),
    el('div', { class: 'actions' }, useButton),
    tableInfo,
    kindArea,
    mappingArea,
    columnsArea,
    orderSdArea,
    guardrailArea,
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
      'Writes intervals, P(beats control), P(highest), lift intervals, expected loss, the decision, the split check and each guardrail’s probabilities, with a native chart (for conversions the lift densities, for the other metrics the lift intervals) — all live formulas, each row beside its variant’s name.',
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
    /** The block size the places were found for ("kind:variants:guardrails"). */
    placedFor: '',
    /** The metric columns proposed from the headings (and set by the user). */
    metrics: null as MetricDetection | null,
    columns: {} as Record<MetricRole, number | null>,
    kind: 'conversions' as MetricKind,
    guardrails: [] as GuardrailDraft[],
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
    const g = view.guardrails.length;
    view.placedFor = `${view.kind}:${variants}:${g}`;
    const area =
      view.kind === 'conversions' ? readoutArea(variants, DENSITY_POINTS, g) : metricReadoutArea(variants, g);
    await place.find({
      sheet: selection.sheet,
      table: selection.localAddress,
      rowCount: area.rowCount,
      columnCount: area.columnCount,
      newSheetName: `${selection.sheet} read-out`,
    });
  };

  /** The columns in use: the conversions mapping's visitors and conversions when the primary is conversions. */
  const currentColumns = (): Record<MetricRole, number | null> => {
    const columns = { ...view.columns };
    if (view.kind === 'conversions' && view.mapping !== null) {
      columns.visitors = view.mapping.visitorsColumn;
      columns.conversions = view.mapping.conversionsColumn;
    }
    return columns;
  };
  const tableShape = (): { hasHeader: boolean; namesColumn: number | null } =>
    view.mapping ?? { hasHeader: view.metrics?.hasHeader ?? false, namesColumn: view.metrics?.namesColumn ?? null };
  /** The guardrails' metrics checked on the table (the primary's too unless it is conversions). */
  const checkedMetrics = () => {
    const selection = view.selection;
    if (selection === null) return null;
    const kinds = [...(view.kind === 'conversions' ? [] : [view.kind]), ...view.guardrails.map((g) => g.kind)];
    if (kinds.length === 0) return null;
    return checkMetrics(selection.values, { ...tableShape(), columns: currentColumns() }, kinds);
  };
  const placeKey = (variants: number): string => `${view.kind}:${variants}:${view.guardrails.length}`;

  const renderMetricCheck = (): void => {
    const selection = view.selection;
    if (selection === null) return;
    const checked = checkedMetrics();
    orderSdArea.replaceChildren();
    if (checked === null) return;
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
      view.placedFor = '';
      return;
    }
    const values = checked.values;
    const list = el('ul', { id: 'readout-variants' });
    checked.names.forEach((name, i) => {
      const v = (role: MetricRole): string => formatCount(values[role]?.[i] ?? NaN, context.locale);
      const words =
        view.kind === 'revenue'
          ? `${v('conversions')} orders of ${v('visitors')} visitors, revenue ${shortNumber(values.revenue?.[i] ?? NaN)}`
          : view.kind === 'averages'
            ? `count ${v('count')}, mean ${shortNumber(values.mean?.[i] ?? NaN)}, sd ${shortNumber(values.sd?.[i] ?? NaN)}`
            : `${v('events')} events over exposure ${shortNumber(values.exposure?.[i] ?? NaN)}`;
      list.append(el('li', {}, `${variantLabel(name, i)}: ${words}`));
    });
    tableInfo.replaceChildren(el('p', {}, `${checked.names.length} variants in ${selection.address}:`), list);
    const counted = view.kind === 'averages' ? values.count : values.visitors;
    if (counted === undefined) {
      showMessage(
        splitArea,
        'warning',
        'Split check: none can be made from exposure alone (exposure is not a count of assigned users). Add a column of users or visitors per variant to the table, or check the split on the visitors table.',
      );
    } else {
      const p = srmPValue(counted);
      showMessage(
        splitArea,
        p < SRM_ALARM ? 'error' : 'info',
        p < SRM_ALARM
          ? `Split check: SRM p-value ${p.toExponential(2)} is below 0.001 — the split looks broken. Find out why before trusting any read-out.`
          : `Split check: SRM p-value ${p.toPrecision(3)} (equal shares planned); no sign of a broken split.`,
      );
    }
    if (values.orderSd !== undefined && values.conversions !== undefined && values.revenue !== undefined) {
      const warnings = orderSdWarnings(checked.names, values.conversions, values.revenue, values.orderSd);
      if (warnings.length > 0) {
        showMessage(
          orderSdArea,
          'warning',
          `Order sd far above the average order value (${warnings.join('; ')}): a few very large orders carry the revenue, so revenue per visitor is uncertain and moves with them. Check those orders (wholesale buyers, refunds, test orders) and read conversions and order value on their own too.`,
        );
      }
    }
    if (checked.names.length > 4) {
      tableInfo.append(
        el('p', { class: 'hint' }, 'Many variants: the best-looking one is often lucky. See the cautions.'),
      );
    }
    setBusy(insertButton, false);
    if (view.placedFor !== placeKey(checked.names.length)) void findPlaces(checked.names.length);
  };

  const renderCheck = (): void => {
    const selection = view.selection;
    const mapping = view.mapping;
    if (view.kind !== 'conversions') {
      renderMetricCheck();
      return;
    }
    orderSdArea.replaceChildren();
    if (selection === null || mapping === null) return;
    const checked = checkTable(selection.values, mapping);
    const guard = checkedMetrics();
    if (!checked.ok || (guard !== null && !guard.ok)) {
      const problems = [
        ...(checked.ok ? [] : checked.problems),
        ...(guard !== null && !guard.ok ? guard.problems : []),
      ];
      tableInfo.replaceChildren(
        el('p', { class: 'error-text', id: 'readout-problems' }, `The table has problems: ${problems.join('; ')}.`),
      );
      showMessage(splitArea, 'info', null);
      setBusy(insertButton, true);
      place.reset();
      view.placedFor = '';
      return;
    }
    const list = el('ul', { id: 'readout-variants' });
    checked.names.forEach((name, i) =>
      list.append(
        el(
          'li',
          {},
          `${variantLabel(name, i)}: ${formatCount(checked.conversions[i] ?? NaN, context.locale)} conversions of ${formatCount(checked.visitors[i] ?? NaN, context.locale)} visitors`,
        ),
      ),
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
    if (view.placedFor !== placeKey(checked.names.length)) void findPlaces(checked.names.length);
  };

  /** Options naming each column of the selection. */
  const columnOptions = (): [string, string][] => {
    const selection = view.selection;
    if (selection === null) return [];
    const start = parseAddress(selection.localAddress).start;
    const header = selection.values[0] ?? [];
    const width = Math.max(...selection.values.slice(0, 2).map((row) => row.length));
    return Array.from({ length: width }, (_, c) => [
      String(c),
      columnName(start.column, c, header[c], tableShape().hasHeader),
    ]);
  };

  const renderKind = (): void => {
    const metric = select(
      'readout-metric',
      'Metric',
      METRIC_KINDS.map((kind) => [kind, KIND_NAMES[kind]]),
      view.kind,
    );
    metric.input.addEventListener('change', () => {
      view.kind = metric.input.value as MetricKind;
      view.guardrails = view.guardrails.filter((g) => g.kind !== view.kind);
      renderAll();
    });
    // The Beta prior belongs to the conversion functions; the other families use their reference priors.
    for (const part of [alpha.element, beta.element, priorButton]) part.hidden = view.kind !== 'conversions';
    const proposed = view.metrics?.proposed;
    kindArea.replaceChildren(
      metric.element,
      el(
        'p',
        { class: 'hint', id: 'readout-kind-hint' },
        proposed === null || proposed === undefined
          ? 'Choose the metric; the headings did not say which columns it uses.'
          : `Proposed from the headings: ${KIND_NAMES[proposed].toLowerCase()}. The columns it uses are below.`,
      ),
    );
  };

  /** Column choices for the primary metric (unless conversions, set above) and the guardrails' metrics. */
  const renderColumns = (): void => {
    columnsArea.replaceChildren();
    const roles: [MetricRole, MetricKind][] = [];
    const kinds = [view.kind, ...view.guardrails.map((g) => g.kind)];
    for (const kind of kinds) {
      for (const role of [...KIND_ROLES[kind].required, ...KIND_ROLES[kind].optional]) {
        if (view.kind === 'conversions' && (role === 'visitors' || role === 'conversions')) continue;
        if (!roles.some(([r]) => r === role)) roles.push([role, kind]);
      }
    }
    if (roles.length === 0) return;
    const options = columnOptions();
    columnsArea.append(
      el(
        'p',
        { class: 'hint' },
        `Columns of ${kinds
          .map((k) => KIND_SHORT[k])
          .filter((k, i, a) => a.indexOf(k) === i)
          .join(' and ')}:`,
      ),
    );
    for (const [role, kind] of roles) {
      const column = view.columns[role];
      const choice = select(
        `readout-column-${role}`,
        roleName(role, kind),
        [['none', 'not in the table'], ...options],
        column === null ? 'none' : String(column),
      );
      choice.input.addEventListener('change', () => {
        view.columns[role] = choice.input.value === 'none' ? null : Number(choice.input.value);
        renderCheck();
      });
      columnsArea.append(choice.element);
    }
  };

  const renderGuardrails = (): void => {
    guardrailArea.replaceChildren(
      el('h3', {}, 'Guardrails'),
      el(
        'p',
        { class: 'hint' },
        'A guardrail is another metric of the same variants that a winner must not harm (e.g. revenue per visitor no worse than −2%). Its probabilities go beside the results, and the decision says when the chosen variant fails one.',
      ),
    );
    const others = METRIC_KINDS.filter((kind) => kind !== view.kind);
    view.guardrails.forEach((g, j) => {
      const n = j + 1;
      const kind = select(
        `readout-guardrail-${n}-kind`,
        `Guardrail ${n}: metric`,
        others.map((k) => [k, KIND_NAMES[k]]),
        g.kind,
      );
      const direction = select(
        `readout-guardrail-${n}-direction`,
        'Must be',
        [
          ['noWorse', 'no worse than (higher is better)'],
          ['noHigher', 'no higher than (lower is better)'],
        ],
        g.direction,
      );
      const limit = textField(`readout-guardrail-${n}-limit`, 'Lift limit', g.limit, {
        unit: '%',
        hint: 'relative to the control: −2 allows at most a 2% drop',
      });
      const required = textField(`readout-guardrail-${n}-required`, 'With probability at least', g.required, {
        unit: '%',
      });
      const remove = button(`readout-guardrail-${n}-remove`, `Remove guardrail ${n}`, 'subtle');
      kind.input.addEventListener('change', () => {
        g.kind = kind.input.value as MetricKind;
        renderAll();
      });
      direction.input.addEventListener('change', () => {
        g.direction = direction.input.value as GuardrailDirection;
        if (g.direction === 'noHigher' && g.limit.trim().startsWith('-')) limit.set(g.limit.trim().slice(1));
      });
      for (const [field, key] of [
        [limit, 'limit'],
        [required, 'required'],
      ] as const) {
        field.element.addEventListener('input', () => {
          g[key] = field.text();
        });
        field.element.addEventListener('change', () => {
          g[key] = field.text();
        });
      }
      remove.addEventListener('click', () => {
        view.guardrails.splice(j, 1);
        renderAll();
      });
      guardrailArea.append(
        el(
          'div',
          { class: 'group', id: `readout-guardrail-${n}` },
          kind.element,
          direction.element,
          limit.element,
          required.element,
          el('div', { class: 'actions' }, remove),
        ),
      );
    });
    if (view.guardrails.length < MAX_GUARDRAILS) {
      const add = button('readout-add-guardrail', 'Add a guardrail');
      add.addEventListener('click', () => {
        const available = view.metrics?.available ?? [];
        const used = new Set(view.guardrails.map((g) => g.kind));
        const kind =
          others.find((k) => available.includes(k) && !used.has(k)) ??
          others.find((k) => !used.has(k)) ??
          (others[0] as MetricKind);
        view.guardrails.push({ kind, direction: 'noWorse', limit: '-2', required: '95' });
        renderAll();
      });
      guardrailArea.append(el('div', { class: 'actions' }, add));
    }
  };

  const renderAll = (): void => {
    renderKind();
    if (view.kind === 'conversions' && view.mapping !== null) renderMapping([], 0);
    else mappingArea.replaceChildren();
    renderColumns();
    renderGuardrails();
    renderCheck();
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
      view.placedFor = '';
      const metrics = selection.truncated
        ? null
        : detectMetrics(selection.values, detection.ok ? detection.mapping : null);
      view.metrics = metrics;
      view.columns = { ...(metrics?.columns ?? {}) } as Record<MetricRole, number | null>;
      if (!detection.ok && (metrics === null || metrics.proposed === null)) {
        view.mapping = null;
        kindArea.replaceChildren();
        mappingArea.replaceChildren();
        columnsArea.replaceChildren();
        guardrailArea.replaceChildren();
        orderSdArea.replaceChildren();
        showMessage(splitArea, 'info', null);
        place.reset();
        tableInfo.replaceChildren(
          el(
            'p',
            { class: 'error-text', id: 'readout-problems' },
            `${selection.address}: ${detection.ok ? '' : detection.problem}.`,
          ),
        );
        setBusy(insertButton, true);
        return;
      }
      view.kind = metrics?.proposed ?? 'conversions';
      // Guardrails belong to a table: a new table starts without them.
      view.guardrails = [];
      tableInfo.replaceChildren();
      renderKind();
      if (detection.ok) {
        view.mapping = detection.mapping;
        view.basis = detection.basis;
        view.confirmed = detection.basis === 'headings';
        if (view.kind === 'conversions') renderMapping(detection.flags, detection.flagCount);
        else mappingArea.replaceChildren();
      } else {
        view.mapping = null;
        view.confirmed = true;
        mappingArea.replaceChildren();
      }
      renderColumns();
      renderGuardrails();
      renderCheck();
      tableInfo.append(
        el(
          'p',
          { class: 'hint' },
          detection.ok && view.kind === 'conversions'
            ? `Detected: ${detection.note}.`
            : 'Detected: columns chosen by their headings; check them below.',
        ),
      );
    } catch (error) {
      tableInfo.replaceChildren(
        el('p', { class: 'error-text' }, `Could not read the selection: ${(error as Error).message}`),
      );
    } finally {
      setBusy(useButton, false);
    }
  };

  /** The guardrails as typed, read and checked; a message for the first bad field. */
  const readGuardrails = (): { ok: true; guardrails: Guardrail[] } | { ok: false; message: string } => {
    const out: Guardrail[] = [];
    for (const [j, g] of view.guardrails.entries()) {
      const limit = readPercent(g.limit, GUARDRAIL_LIMIT_RULE, context.locale);
      if (!limit.ok) return { ok: false, message: `Guardrail ${j + 1}: ${limit.message}` };
      const required = readPercent(g.required, GUARDRAIL_PROBABILITY_RULE, context.locale);
      if (!required.ok) return { ok: false, message: `Guardrail ${j + 1}: ${required.message}` };
      out.push({ kind: g.kind, direction: g.direction, limit: limit.value, required: required.value });
    }
    return { ok: true, guardrails: out };
  };

  const insert = async (): Promise<void> => {
    const selection = view.selection;
    const mapping = view.mapping;
    const conversions = view.kind === 'conversions';
    // A guessed conversions mapping must be confirmed; the other kinds show every column they use.
    if (selection === null || (conversions && !view.confirmed) || view.inserting) return;
    if (conversions && mapping === null) return;
    const checked = conversions && mapping !== null ? checkTable(selection.values, mapping) : null;
    if (checked !== null && !checked.ok) return;
    const metrics = checkedMetrics();
    if (metrics !== null && !metrics.ok) return;
    const k = checked?.names.length ?? (metrics?.ok ? metrics.names.length : 0);
    const firstRow = checked?.firstRow ?? (metrics?.ok ? metrics.firstRow : 0);
    const levelReading = readPercent(level.text(), CREDIBLE_LEVEL_RULE, context.locale);
    const lv = levelReading.ok ? levelReading.value : Number.NaN;
    const a = parseNumber(alpha.text(), context.locale);
    const b = parseNumber(beta.text(), context.locale);
    if (!levelReading.ok || (conversions && (!(a > 0) || !(b > 0)))) {
      showMessage(status, 'error', levelReading.ok ? 'Prior alpha and beta must be above 0.' : levelReading.message);
      return;
    }
    const guardReading = readGuardrails();
    if (!guardReading.ok) {
      showMessage(status, 'error', guardReading.message);
      return;
    }
    const guardrails = guardReading.guardrails;
    setBusy(insertButton, true);
    view.inserting = true;
    try {
      const start = parseAddress(selection.localAddress).start;
      const column = (c: number): string => rangeAddress({ row: start.row + firstRow, column: start.column + c }, k, 1);
      const columns = currentColumns();
      const refs: Partial<Record<MetricRole, string>> = {};
      for (const kind of [view.kind, ...guardrails.map((g) => g.kind)]) {
        for (const role of [...KIND_ROLES[kind].required, ...KIND_ROLES[kind].optional]) {
          const c = columns[role];
          if (c !== null) refs[role] = column(c);
        }
      }
      const shape = tableShape();
      const namesRef = shape.namesColumn === null ? null : column(shape.namesColumn);
      const buildConversions = (target: { sheet: string; topLeft: string }) =>
        readoutBlock(
          {
            sheet: selection.sheet,
            namesRef,
            visitorsRef: column((mapping as TableMapping).visitorsColumn),
            conversionsRef: column((mapping as TableMapping).conversionsColumn),
            sharesRef: mapping === null || mapping.sharesColumn === null ? null : column(mapping.sharesColumn),
            variants: k,
            refs,
          },
          {
            level: lv,
            prior: { alpha: a, beta: b },
            densityPoints: DENSITY_POINTS,
            currentSrmPValue:
              checked !== null && checked.ok ? srmPValue(checked.visitors, checked.shares ?? undefined) : 1,
          },
          target.topLeft,
          target.sheet,
          guardrails,
        );
      const counted = metrics?.ok
        ? view.kind === 'averages'
          ? metrics.values.count
          : metrics.values.visitors
        : undefined;
      const buildMetric = (target: { sheet: string; topLeft: string }) =>
        metricReadoutBlock(
          view.kind,
          { sheet: selection.sheet, namesRef, refs, variants: k },
          { level: lv, currentSrmPValue: counted === undefined ? null : srmPValue(counted) },
          guardrails,
          target.topLeft,
          target.sheet,
        );
      const written = await place.write(
        (target) => ({
          ...(conversions ? buildConversions(target) : buildMetric(target)).block,
          newSheet: target.newSheet,
        }),
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
      const guarded = (cells: Readonly<Record<string, string>>): string =>
        cells.guardedDecision === undefined ? '' : ` With guardrails: ${cells.guardedDecision}.`;
      if (!conversions) {
        const built = buildMetric(target);
        const chart = await context.workbook.insertChart({
          sheet: target.sheet,
          sourceAddress: built.chart.source,
          type: 'XYScatterLines',
          title: built.chart.title,
          axisTitles: built.chart.axisTitles,
          hideValueLabels: built.chart.hideValueLabels,
          topLeft: built.chart.topLeft,
          bottomRight: built.chart.bottomRight,
        });
        showMessage(
          status,
          chart.kind === 'inserted' ? 'success' : 'warning',
          chart.kind === 'inserted'
            ? `Wrote the ${KIND_SHORT[view.kind]} read-out to ${outcome.address} (live formulas) and a chart of the lift intervals from ${built.chart.source}. The decision is in ${built.cells.decision}.${guarded(built.cells)}`
            : `Wrote the ${KIND_SHORT[view.kind]} read-out to ${outcome.address}, but ${chart.message}. The table in ${built.chart.source} can be charted by hand. The decision is in ${built.cells.decision}.${guarded(built.cells)}`,
        );
        await findPlaces(k);
        return;
      }
      const built = buildConversions(target);
      const chart = await context.workbook.insertChart({
        sheet: target.sheet,
        sourceAddress: built.chartSource,
        type: 'XYScatterSmoothNoMarkers',
        title: 'Lift over control: posterior density',
        axisTitles: { x: 'Lift of conversion rate over the control (relative)', y: 'Posterior density' },
        topLeft: built.chartTopLeft,
        bottomRight: built.chartBottomRight,
      });
      showMessage(
        status,
        chart.kind === 'inserted' ? 'success' : 'warning',
        chart.kind === 'inserted'
          ? `Wrote the read-out to ${outcome.address} (live formulas) and a lift chart from ${built.chartSource}. The decision is in ${built.cells.decision}.${guarded(built.cells)}`
          : `Wrote the read-out to ${outcome.address}, but ${chart.message}. The density table in ${built.chartSource} can be charted by hand.`,
      );
      // The place just used is taken now: look again for the next read-out.
      await findPlaces(k);
    } catch (error) {
      showMessage(status, 'error', `Could not insert the read-out: ${(error as Error).message}`);
    } finally {
      view.inserting = false;
      const guard = checkedMetrics();
      const ready =
        (view.confirmed || view.kind !== 'conversions') &&
        (guard === null || guard.ok) &&
        (view.kind !== 'conversions' || (view.mapping !== null && checkTable(selection.values, view.mapping).ok));
      setBusy(insertButton, !ready);
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
