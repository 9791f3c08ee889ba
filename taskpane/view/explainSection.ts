/**
 * The Explain section: for the selected cell, what its =ABTEST. result says in plain words (with a lift
 * chart where the result compares challengers with the control), what an error in it means, which cells
 * it computes from, the method, and a built-in formula that reproduces, brackets or approximates it. A
 * cell inside a spilled result is explained as part of the formula it comes from. Follows the selection
 * while the section is open.
 */
import type { BetaPrior, ConversionCounts } from '../../functions/stats/types';
import { explainFormula, mathPieces, parseAbtestCall, SIGNATURES } from '../logic/explain';
import { liftCurves, MAX_CHART_CHALLENGERS } from '../logic/liftCurves';
import { argumentSource, recheckArguments, type Recheck } from '../logic/recheck';
import { findFunction } from '../../functions/catalogue';
import {
  errorMeaning,
  findSpillOwner,
  resultShapeOf,
  resultSizeOf,
  resultWords,
  type ResultShape,
  type ResultSize,
} from '../logic/resultWords';
import {
  cellAddress,
  columnLetters,
  parseAddress,
  quoteSheet,
  rangeAddress,
  type CellPosition,
} from '../workbook/address';
import type { CellValue, RangeContents } from '../workbook/workbook';
import { chartSlot, drawLiftChart } from './charts';
import type { PanelContext } from './context';
import { button, el } from './dom';

const KIND_WORDS = {
  reproduces: 'Built-in formula that reproduces it',
  brackets: 'Built-in formulas that bracket it',
  approximates: 'Built-in formula that approximates it',
  checks: 'Built-in formulas that check it',
  compares: 'A built-in formula to compare with',
} as const;

/** How far up and left the section looks for the formula a spilled cell belongs to. */
export const SPILL_SEARCH_ROWS = 200;
export const SPILL_SEARCH_COLUMNS = 12;
/** How far left of the data the section looks for the variants' names. */
const NAME_SEARCH_COLUMNS = 8;

/** Functions whose result compares challengers with the control on conversion data: the lift chart fits them. */
const LIFT_CHART_FUNCTIONS = new Set([
  'PROB_ABOVE_CONTROL',
  'LIFT_INTERVAL',
  'RATE_DIFF_INTERVAL',
  'PROB_LIFT_ABOVE',
  'LIFT_DENSITY',
  'PROB_HIGHEST',
  'EXPECTED_LOSS',
  'DECISION',
]);

/** The parts of a per-variant block, by its width. */
const PART_NAMES: Readonly<Record<number, readonly string[]>> = {
  2: ['lower end', 'upper end'],
  3: ['lower end', 'median', 'upper end'],
};

/** The Explain section and the function that refreshes it from the current selection. */
export interface ExplainSection {
  readonly element: HTMLElement;
  refresh(): Promise<void>;
}

/** The number of cells of a one-row or one-column range argument (0 when it is not an A1 range). */
function variantsIn(text: string): number {
  try {
    const data = parseAddress(text.trim());
    return (data.end.row - data.start.row + 1) * (data.end.column - data.start.column + 1);
  } catch {
    return 0;
  }
}

/** Which part of a result a cell holds ("the median of Orange button"), or null when that is not clear. */
function partOf(
  shape: ResultShape | undefined,
  size: ResultSize,
  down: number,
  across: number,
  labels: readonly string[],
): string | null {
  if (shape?.kind === 'perVariant') {
    const variant = labels[size.alongRow ? across : down];
    const part = PART_NAMES[shape.width]?.[size.alongRow ? down : across];
    if (variant === undefined) return null;
    if (shape.versusControl && (size.alongRow ? across : down) === 0) return "the control's slot, left empty";
    return part ? `the ${part} for ${variant}` : `the value for ${variant}`;
  }
  if (shape?.kind === 'densityTable') {
    if (across === 0) return 'the grid the curves are drawn over';
    const series = labels[shape.series === 'challenger' ? across : across - 1];
    return series === undefined ? null : `the curve height of ${series}`;
  }
  return null;
}

/** "'Checkout test'!B15": a cell as a formula would write it. */
function qualified(sheet: string, address: string): string {
  return `${quoteSheet(sheet)}!${address}`;
}

/**
 * Build the Explain section. Cost: DOM construction; each refresh reads the selection, the result's cells,
 * the data it refers to and (for a cell without a formula) up to SPILL_SEARCH_ROWS × SPILL_SEARCH_COLUMNS
 * cells above and left of it; the lift chart costs (challengers × 81) core integrals.
 * @example const explain = explainSection(context); await explain.refresh()
 */
export function explainSection(context: PanelContext): ExplainSection {
  const root = el('section', {
    id: 'section-explain',
    class: 'section',
    hidden: true,
    role: 'tabpanel',
    'aria-labelledby': 'tab-explain',
  });
  const output = el('div', { id: 'explain-output', 'aria-live': 'polite' });
  const refreshButton = button('explain-refresh', 'Explain the selected cell');
  const slot = chartSlot('explain-chart', 'Lift over the control');
  const chartBox = el('div', { class: 'chart', id: 'explain-chart-box', hidden: true }, slot.canvas);
  const cautionLink = el('fluent-link', { href: '#', id: 'explain-cautions' }, 'Cautions');
  cautionLink.addEventListener('click', (event) => {
    event.preventDefault();
    context.showCautions();
  });
  root.append(
    el('h2', {}, 'Explain'),
    el(
      'p',
      { class: 'hint' },
      'Select a cell with an =ABTEST. result (any cell of it): what it says, how it was computed, and how to check ' +
        'it with Excel alone.',
    ),
    el('div', { class: 'actions' }, refreshButton),
    output,
    cautionLink,
  );

  const workbook = context.workbook;
  const locale = context.locale;

  /** Read a block; null when the workbook refuses (a bad reference, a missing sheet). */
  const readOrNull = async (address: string, sheet: string): Promise<RangeContents | null> => {
    try {
      return await workbook.readRange(address, sheet);
    } catch {
      return null;
    }
  };

  /** The value of an argument: a number literal, or the number in the one cell it refers to. */
  const numberOf = async (text: string, sheet: string): Promise<number | undefined> => {
    const trimmed = text.trim();
    if (trimmed === '') return undefined;
    if (/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(trimmed)) return Number(trimmed);
    try {
      const parsed = parseAddress(trimmed);
      if (parsed.start.row !== parsed.end.row || parsed.start.column !== parsed.end.column) return undefined;
      const cell = await readOrNull(cellAddress(parsed.start), parsed.sheet || sheet);
      const value = cell?.values[0]?.[0];
      return typeof value === 'number' ? value : undefined;
    } catch {
      return undefined;
    }
  };

  /** The numbers in a one-row or one-column range argument, or null when any cell is not a number. */
  const numbersIn = async (text: string, sheet: string): Promise<number[] | null> => {
    try {
      const parsed = parseAddress(text.trim());
      const block = await readOrNull(
        rangeAddress(parsed.start, parsed.end.row - parsed.start.row + 1, parsed.end.column - parsed.start.column + 1),
        parsed.sheet || sheet,
      );
      const cells = block?.values.flat() ?? [];
      return cells.length > 0 && cells.every((v) => typeof v === 'number') ? (cells as number[]) : null;
    } catch {
      return null;
    }
  };

  /**
   * The variants' names: the labels argument when given, else the nearest column left of the data whose
   * cells on the same rows all hold text (or the row above, for data along a row); else A, B, C…
   */
  const namesFor = async (dataText: string, labelsText: string, count: number, sheet: string): Promise<string[]> => {
    const fallback = Array.from({ length: count }, (_, i) => columnLetters(i));
    if (count === 0) return [];
    const fromBlock = (cells: CellValue[]): string[] | null =>
      cells.length === count && cells.every((v) => typeof v === 'string' && v.trim() !== '' && !v.startsWith('#'))
        ? cells.map((v) => String(v).trim())
        : null;
    try {
      if (labelsText.trim() !== '') {
        const parsed = parseAddress(labelsText.trim());
        const block = await readOrNull(
          rangeAddress(
            parsed.start,
            parsed.end.row - parsed.start.row + 1,
            parsed.end.column - parsed.start.column + 1,
          ),
          parsed.sheet || sheet,
        );
        const found = block === null ? null : fromBlock(block.values.flat());
        if (found !== null) return found;
      }
      const data = parseAddress(dataText.trim());
      const onSheet = data.sheet || sheet;
      const alongRow = data.start.row === data.end.row && data.end.column > data.start.column;
      if (alongRow) {
        const above = Math.max(0, data.start.row - NAME_SEARCH_COLUMNS);
        const block = await readOrNull(
          rangeAddress({ row: above, column: data.start.column }, data.start.row - above || 1, count),
          onSheet,
        );
        for (let r = (block?.values.length ?? 0) - 1; r >= 0 && data.start.row > 0; r -= 1) {
          const found = fromBlock(block?.values[r] ?? []);
          if (found !== null) return found;
        }
        return fallback;
      }
      const left = Math.max(0, data.start.column - NAME_SEARCH_COLUMNS);
      if (data.start.column === 0) return fallback;
      const block = await readOrNull(
        rangeAddress({ row: data.start.row, column: left }, count, data.start.column - left),
        onSheet,
      );
      if (block === null) return fallback;
      for (let c = block.columnCount - 1; c >= 0; c -= 1) {
        const found = fromBlock(block.values.map((row) => row[c] ?? ''));
        if (found !== null) return found;
      }
      return fallback;
    } catch {
      return fallback;
    }
  };

  /** The formula the selected cell shows a part of, looking up and left of it. */
  const ownerOf = async (
    sheet: string,
    target: CellPosition,
  ): Promise<{ row: number; column: number; formula: string; size: ResultSize } | null> => {
    const top = Math.max(0, target.row - SPILL_SEARCH_ROWS + 1);
    const left = Math.max(0, target.column - SPILL_SEARCH_COLUMNS + 1);
    const block = await readOrNull(
      rangeAddress({ row: top, column: left }, target.row - top + 1, target.column - left + 1),
      sheet,
    );
    if (block === null) return null;
    const owner = findSpillOwner(block.formulas, { row: top, column: left }, target);
    if (owner === null) return null;
    // A formula that shows #SPILL! has not spilled: the cell is not part of it.
    const anchorValue = block.values[owner.row - top]?.[owner.column - left];
    return typeof anchorValue === 'string' && anchorValue.toUpperCase() === '#SPILL!' ? null : owner;
  };

  /**
   * Check a formula's inputs as its function does: each argument from the formula (a literal) or from its
   * cells (ranges as rows of values, a single cell to a single-value argument as its value).
   */
  const recheck = async (name: string, args: readonly string[], sheet: string): Promise<Recheck> => {
    const fn = findFunction(name);
    if (fn === undefined) return { kind: 'cannot check' };
    const values: Record<string, unknown> = {};
    for (const [i, param] of fn.params.entries()) {
      const source = argumentSource(args[i] ?? '');
      if (source.kind === 'unknown') return { kind: 'cannot check' };
      if (source.kind === 'absent') values[param.name] = null;
      else if (source.kind === 'literal') values[param.name] = source.value;
      else {
        const block = await readOrNull(source.address, source.sheet || sheet);
        if (block === null) return { kind: 'cannot check' };
        const manyCells = param.kind === 'range' || param.kind === 'aligned';
        if (!manyCells && block.rowCount * block.columnCount !== 1) return { kind: 'cannot check' };
        values[param.name] = manyCells ? block.values : (block.values[0]?.[0] ?? '');
      }
    }
    return recheckArguments(name, values);
  };

  /** The lift chart for a conversion comparison, or null when it does not apply or cannot be drawn. */
  const drawLift = async (
    name: string,
    args: readonly string[],
    labels: readonly string[],
    sheet: string,
  ): Promise<boolean> => {
    if (!LIFT_CHART_FUNCTIONS.has(name)) return false;
    const signature = SIGNATURES[name];
    if (signature === undefined) return false;
    const argument = (argName: string): string => args[signature.args.indexOf(argName)] ?? '';
    const conversions = await numbersIn(argument('conversions'), sheet);
    const visitors = await numbersIn(argument('visitors'), sheet);
    if (
      conversions === null ||
      visitors === null ||
      conversions.length !== visitors.length ||
      conversions.length !== labels.length
    )
      return false;
    if (conversions.length - 1 > MAX_CHART_CHALLENGERS || conversions.length < 2) return false;
    const alpha = await numberOf(argument('prior_alpha'), sheet);
    const beta = await numberOf(argument('prior_beta'), sheet);
    const prior: BetaPrior = { alpha: alpha ?? 1, beta: beta ?? 1 };
    const variants: ConversionCounts[] = conversions.map((x, i) => ({
      conversions: x,
      visitors: visitors[i] as number,
    }));
    try {
      drawLiftChart(slot, liftCurves(variants, labels, prior), locale);
      return true;
    } catch {
      return false;
    }
  };

  const run = { id: 0 };
  const refresh = async (): Promise<void> => {
    const myRun = (run.id += 1);
    try {
      const selection = await workbook.readSelection();
      if (myRun !== run.id) return;
      const sheet = selection.sheet;
      const target = parseAddress(selection.localAddress).start;
      const cell = cellAddress(target);
      const formulaCell = selection.formulas[0]?.[0];
      const formulaText = typeof formulaCell === 'string' ? formulaCell : String(formulaCell ?? '');
      let anchor = { row: target.row, column: target.column, formula: formulaText };
      let position: { down: number; across: number; size: ResultSize } | null = null;
      const selectedValue = selection.values[0]?.[0];
      if (parseAbtestCall(formulaText) === null && selectedValue !== '' && selectedValue !== undefined) {
        const owner = await ownerOf(sheet, target);
        if (myRun !== run.id) return;
        if (owner !== null) {
          anchor = owner;
          position = { down: target.row - owner.row, across: target.column - owner.column, size: owner.size };
        }
      }
      const anchorAddress = cellAddress(anchor);
      const explanation = explainFormula(anchor.formula, anchorAddress);
      if ('problem' in explanation) {
        chartBox.hidden = true;
        const looked =
          selectedValue !== '' && parseAbtestCall(formulaText) === null
            ? ` It is not part of a result spilled from up to ${SPILL_SEARCH_ROWS} rows above or ` +
              `${SPILL_SEARCH_COLUMNS} columns to the left.`
            : '';
        output.replaceChildren(
          el(
            'p',
            { id: 'explain-problem', class: 'hint' },
            `${qualified(sheet, cell)}: ${explanation.problem}.${looked}`,
          ),
        );
        return;
      }
      const size = resultSizeOf(anchor.formula) ?? { rows: 1, columns: 1, alongRow: false };
      const resultBlock = await readOrNull(rangeAddress(anchor, size.rows, size.columns), sheet);
      if (myRun !== run.id) return;
      const values = resultBlock?.values ?? [[selectedValue ?? '']];
      const call = parseAbtestCall(anchor.formula);
      const args = call?.args ?? [];
      const signature = SIGNATURES[explanation.name];
      const argument = (argName: string): string => args[signature?.args.indexOf(argName) ?? -1] ?? '';
      const dataText = args[0] ?? '';
      const shape = resultShapeOf(explanation.name);
      const needsNames =
        shape?.kind === 'perVariant' || shape?.kind === 'densityTable' || explanation.name === 'DECISION';
      const labels = needsNames ? await namesFor(dataText, argument('labels'), variantsIn(dataText), sheet) : [];
      const numbers = {
        level: await numberOf(argument('level'), sheet),
        min_lift: await numberOf(argument('min_lift'), sheet),
      };
      if (myRun !== run.id) return;
      const anchorValue = values[0]?.[0];
      const error = errorMeaning(anchorValue);

      const parts: HTMLElement[] = [
        el('h3', { id: 'explain-name' }, `ABTEST.${explanation.name} in ${qualified(sheet, anchorAddress)}`),
      ];
      if (position !== null) {
        const part = partOf(shape, position.size, position.down, position.across, labels);
        parts.push(
          el(
            'p',
            { id: 'explain-spill' },
            `${qualified(sheet, cell)} is part of the result of the formula in ${qualified(sheet, anchorAddress)} ` +
              `(${position.size.rows} × ${position.size.columns} cells)${part ? `: it holds ${part}` : ''}.`,
          ),
        );
      }
      if (error !== null) {
        const found = await recheck(explanation.name, args, sheet);
        if (myRun !== run.id) return;
        const detail =
          found.kind === 'problem'
            ? ` Checking the inputs the way the function does: ${found.message}.`
            : found.kind === 'inputs fine'
              ? " The inputs pass the function's own checks, so the trouble arose while computing or around the function."
              : ' In Excel, point at the cell to read its own message; it names the argument and the item.';
        parts.push(
          el(
            'fluent-message-bar',
            { intent: 'error', layout: 'multiline', id: 'explain-error' },
            `${qualified(sheet, anchorAddress)} shows ${String(anchorValue)}. ${error}${detail}`,
          ),
        );
      } else {
        const words = resultWords({ name: explanation.name, values, alongRow: size.alongRow, labels, numbers, locale });
        if (words.length > 0) {
          const list = el('ul', { id: 'explain-result' });
          for (const sentence of words) list.append(el('li', {}, sentence));
          parts.push(el('h4', {}, 'What it says'), list);
        }
      }
      parts.push(el('h4', {}, 'What it computes'), el('p', { id: 'explain-summary' }, explanation.summary));
      const showChart = error === null && (await drawLift(explanation.name, args, labels, sheet));
      if (myRun !== run.id) return;
      chartBox.hidden = !showChart;
      if (showChart) {
        parts.push(
          el('h4', {}, 'Lift over the control'),
          el(
            'p',
            { class: 'hint', id: 'explain-chart-note' },
            'Each curve shows how plausible each lift of a challenger is; the shaded part holds the middle 90%. ' +
              'Right of the "no lift" line is better than the control.',
          ),
          chartBox,
        );
      }
      const argumentList = el('ul', { id: 'explain-arguments' });
      for (const arg of explanation.arguments) {
        if (arg.text === '' && arg.optional) continue;
        argumentList.append(el('li', {}, el('code', {}, arg.name), ` = ${arg.text}`));
      }
      const method = el('p', { id: 'explain-method' });
      for (const piece of mathPieces(explanation.method))
        method.append(piece.subscript ? el('sub', {}, piece.text) : piece.text);
      parts.push(el('h4', {}, 'Arguments'), argumentList, el('h4', {}, 'Method'));
      if (explanation.plainMethod !== null)
        parts.push(el('p', { id: 'explain-method-words' }, explanation.plainMethod));
      parts.push(method);
      if (explanation.crossCheck !== null) {
        const formulas = el('ul', { id: 'explain-formulas' });
        for (const f of explanation.crossCheck.formulas)
          formulas.append(el('li', {}, el('code', { class: 'formula' }, f)));
        parts.push(
          el('h4', {}, KIND_WORDS[explanation.crossCheck.kind]),
          el('p', { id: 'explain-crosscheck' }, `${explanation.crossCheck.what}:`),
          formulas,
        );
      } else {
        parts.push(
          el(
            'p',
            { id: 'explain-crosscheck', class: 'hint' },
            'No built-in Excel formula computes this; the method above is how Lift Ledger does.',
          ),
        );
      }
      if (explanation.caution !== null)
        parts.push(
          el(
            'fluent-message-bar',
            { intent: 'warning', layout: 'multiline', id: 'explain-caution' },
            explanation.caution,
          ),
        );
      output.replaceChildren(...parts);
    } catch (error) {
      output.replaceChildren(
        el('p', { class: 'error-text' }, `Could not read the selection: ${(error as Error).message}`),
      );
    }
  };
  refreshButton.addEventListener('click', () => void refresh());
  return { element: root, refresh };
}
