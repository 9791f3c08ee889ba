/**
 * The shareable copy: which cells of a sheet become plain values, what the copy's notes and header line say,
 * and how the panel describes it before anything is written. Pure functions over a scan of the sheet
 * (Workbook.scanSheet); the workbook layer makes the copy (Workbook.copySheet).
 *
 * The rules are the `lift-ledger freeze` command's, from cli/core/frozenCopy.ts, so both copies say the
 * same things: every ABTEST result (the formula cell and every cell its result spills over) becomes its
 * value, the formula that computed it goes into a note on the formula cell (or, in an Excel without notes,
 * into a "How computed" column beside it), and a header line says when the copy was made, from which cells
 * and how many results it froze. Other formulas stay formulas (they work without the add-in), except in a
 * copy of part of a sheet: a formula there that reads cells left out of the copy keeps its value instead,
 * with a note saying so.
 */
import { frozenHeaderLine, frozenTime, howComputedNote, isAbtestResult } from '../../cli/core/frozenCopy';
import { displayFormula, tokenize } from '../../cli/core/formula';
import {
  cellAddress,
  columnLetters,
  parseAddress,
  quoteSheet,
  rangeAddress,
  type ParsedAddress,
} from '../workbook/address';
import { newSheetName } from '../workbook/placement';
import type { Capabilities, FormulaCell, SheetCopyEdits, SheetScan } from '../workbook/workbook';
import { OPTIONAL_API } from '../workbook/workbook';

/** What to copy: the whole sheet, or only some of its cells (a read-out), by local address. */
export type CopyScope = { readonly kind: 'sheet' } | { readonly kind: 'cells'; readonly range: string };

/** Rows inserted at the top of a copy for its header line. */
export const HEADER_ROWS = 1;

/** What a result shows while Excel is still computing it: freezing it would keep the wait, not the result. */
const NOT_READY = new Set(['#BUSY!', '#GETTING_DATA']);

/** Functions whose references cannot be read from the formula text (they build them at run time). */
const RUNTIME_REFERENCES = new Set(['INDIRECT', 'OFFSET', 'INDEX', 'CHOOSE', 'XLOOKUP']);

/** A cell of the source that becomes a value in the copy. */
export interface FrozenCell extends FormulaCell {
  /** 'result': an ABTEST result; 'reads-outside': another formula that reads cells a partial copy leaves out. */
  readonly why: 'result' | 'reads-outside';
}

/** What a copy will hold, as the panel shows it before copying. */
export interface CopyPlan {
  readonly sheet: string;
  readonly scope: CopyScope;
  /** The source cells copied: the used range, or the selection widened to whole results ("" when empty). */
  readonly source: string;
  /** True when a selection was widened so that no result is cut in two. */
  readonly widened: boolean;
  /** Cells that become values, in reading order of their formula cells. */
  readonly frozen: readonly FrozenCell[];
  /** ABTEST results among them (a spill counts once). */
  readonly results: number;
  /** Formula cells of results Excel is still computing ("#BUSY!"). */
  readonly notReady: readonly string[];
  readonly charts: number;
  /** Name proposed for the copy: unused in the workbook. */
  readonly newSheet: string;
  /** True when the scan was too large for the panel (READ_LIMITS). */
  readonly tooLarge: boolean;
}

function overlaps(a: ParsedAddress, b: ParsedAddress): boolean {
  return (
    a.start.row <= b.end.row &&
    b.start.row <= a.end.row &&
    a.start.column <= b.end.column &&
    b.start.column <= a.end.column
  );
}

function contains(outer: ParsedAddress, inner: ParsedAddress): boolean {
  return (
    outer.start.row <= inner.start.row &&
    outer.start.column <= inner.start.column &&
    outer.end.row >= inner.end.row &&
    outer.end.column >= inner.end.column
  );
}

function union(a: ParsedAddress, b: ParsedAddress): ParsedAddress {
  return {
    sheet: a.sheet,
    start: { row: Math.min(a.start.row, b.start.row), column: Math.min(a.start.column, b.start.column) },
    end: { row: Math.max(a.end.row, b.end.row), column: Math.max(a.end.column, b.end.column) },
  };
}

function local(p: ParsedAddress): string {
  return rangeAddress(p.start, p.end.row - p.start.row + 1, p.end.column - p.start.column + 1);
}

/**
 * True when every cell `formula` reads on its own sheet lies inside `keep`: references to other sheets
 * count as inside (they stay in the workbook); a defined name, a table reference, a whole row or column,
 * or a function that builds references at run time counts as outside. Cost O(length).
 * @example readsOnlyInside('=IF(B20<0.001,"x","y")', 'Read-out', parseAddress('A1:C30')) //=> true
 */
export function readsOnlyInside(formula: string, sheet: string, keep: ParsedAddress): boolean {
  for (const token of tokenize(formula)) {
    if (token.type === 'name' || token.type === 'structured') return false;
    if (token.type === 'func' && RUNTIME_REFERENCES.has(token.name.toUpperCase().replace(/^_XLFN\./, ''))) return false;
    if (token.type !== 'ref') continue;
    if (token.sheet !== undefined && token.sheet.name.toLowerCase() !== sheet.toLowerCase()) continue;
    const last = token.last ?? token.first;
    if (
      token.first.row === undefined ||
      token.first.col === undefined ||
      last.row === undefined ||
      last.col === undefined
    ) {
      return false;
    }
    const read: ParsedAddress = {
      sheet,
      start: { row: Math.min(token.first.row, last.row), column: Math.min(token.first.col, last.col) },
      end: { row: Math.max(token.first.row, last.row), column: Math.max(token.first.col, last.col) },
    };
    if (!contains(keep, read)) return false;
  }
  return true;
}

/**
 * What a copy of `scan` within `scope` holds. A selection is widened until no result is cut in two (a
 * spill that starts or ends inside it is taken whole). Cost O(formula cells × widening passes).
 * @example planCopy(scan, { kind: 'sheet' }).results //=> 64 (for the demo's checkout sheet)
 */
export function planCopy(scan: SheetScan, scope: CopyScope): CopyPlan {
  const base = {
    sheet: scan.sheet,
    scope,
    charts: scan.charts,
    newSheet: newSheetName(`${scan.sheet} (shared)`, scan.sheetNames),
    tooLarge: scan.tooLarge,
  };
  if (scan.range === '' || scan.tooLarge) {
    return { ...base, source: scan.range, widened: false, frozen: [], results: 0, notReady: [] };
  }
  let keep: ParsedAddress | null = null;
  let widened = false;
  if (scope.kind === 'cells') {
    const asked = parseAddress(scope.range);
    keep = asked;
    for (let pass = 0; pass < scan.formulaCells.length + 1; pass += 1) {
      let grown: ParsedAddress = keep;
      for (const cell of scan.formulaCells) {
        const result = parseAddress(cell.result);
        if (overlaps(result, grown)) grown = union(grown, result);
      }
      if (local(grown) === local(keep)) break;
      keep = grown;
    }
    widened = local(keep) !== local(asked);
  }
  const inside = (cell: FormulaCell): boolean => keep === null || contains(keep, parseAddress(cell.result));
  const frozen: FrozenCell[] = [];
  for (const cell of scan.formulaCells) {
    if (!inside(cell)) continue;
    if (isAbtestResult(cell.formula)) frozen.push({ ...cell, why: 'result' });
    else if (keep !== null && !readsOnlyInside(cell.formula, scan.sheet, keep))
      frozen.push({ ...cell, why: 'reads-outside' });
  }
  const results = frozen.filter((cell) => cell.why === 'result');
  const notReady = results
    .filter((cell) => cell.values.some((row) => row.some((v) => typeof v === 'string' && NOT_READY.has(v))))
    .map((cell) => cell.address);
  return {
    ...base,
    source: keep === null ? scan.range : local(keep),
    widened,
    frozen,
    results: results.length,
    notReady,
  };
}

/**
 * Why this copy cannot be made now, or null. Cost O(1).
 * @example copyProblem(planCopy(emptyScan, { kind: 'sheet' })) //=> 'there is nothing on "Plan" to copy'
 */
export function copyProblem(plan: CopyPlan): string | null {
  const where = `"${plan.sheet}"`;
  if (plan.tooLarge) {
    return `${where} is too large for the side panel to copy (it uses ${plan.source}); make the copy from the saved file with the lift-ledger freeze command`;
  }
  if (plan.source === '') return `there is nothing on ${where} to copy`;
  if (plan.results === 0) {
    return plan.scope.kind === 'cells'
      ? `the selected cells (${plan.source}) hold no ABTEST result, so there is nothing to freeze; select a read-out`
      : `${where} holds no ABTEST result, so there is nothing to freeze`;
  }
  if (plan.notReady.length > 0) {
    const cells =
      plan.notReady.slice(0, 6).join(', ') + (plan.notReady.length > 6 ? ` and ${plan.notReady.length - 6} more` : '');
    return `${plan.notReady.length === 1 ? 'a result is' : `${plan.notReady.length} results are`} still being computed (${cells}); wait until they show numbers, then make the copy`;
  }
  return null;
}

/** A cell address `rows` further down. */
function down(address: string, rows: number): string {
  const p = parseAddress(address);
  return rangeAddress(
    { row: p.start.row + rows, column: p.start.column },
    p.end.row - p.start.row + 1,
    p.end.column - p.start.column + 1,
  );
}

/** The column of the "How computed" texts: the first one right of the copied cells. */
export function howComputedColumn(plan: CopyPlan): number {
  return parseAddress(plan.source).end.column + 1;
}

/** What the copy's notes (or "How computed" column) say for one frozen cell, with the formula as the copy holds it. */
function noteText(cell: FrozenCell, formula: string, spill: string | undefined, frozenAt: Date): string {
  if (cell.why === 'result') return howComputedNote({ formula, spill, frozenAt });
  return (
    `Was ${displayFormula(formula)}: it read cells left out of this copy, so it keeps the value it showed.\n` +
    `Frozen ${frozenTime(frozenAt)}.`
  );
}

/**
 * The edits that turn a fresh copy of the sheet (with HEADER_ROWS inserted at its top) into the shareable
 * copy: the values over every frozen result, the notes (or the "How computed" column), the header line,
 * and for part of a sheet the cells to keep. `copyFormula` gives the copy's own formula at a cell (its
 * references already moved down by the header rows); where it gives none, the scan's formula is used.
 * Cost O(frozen cells + their values).
 */
export function copyEdits(
  plan: CopyPlan,
  options: { readonly frozenAt: Date; readonly notes: boolean },
  copyFormula: (address: string) => string,
): SheetCopyEdits {
  const values = plan.frozen.map((cell) => ({ address: down(cell.result, HEADER_ROWS), values: cell.values }));
  const described = plan.frozen.map((cell) => {
    const at = down(cell.address, HEADER_ROWS);
    const result = down(cell.result, HEADER_ROWS);
    const formula = copyFormula(at) || cell.formula;
    return { cell, at, formula, spill: result === at ? undefined : result };
  });
  const source = parseAddress(plan.source);
  const headerCell = cellAddress({ row: 0, column: plan.scope.kind === 'cells' ? source.start.column : 0 });
  const texts: { address: string; text: string; bold?: boolean }[] = [];
  let notes: { address: string; text: string }[] = [];
  let formulasKept = 'in a note';
  let keepEnd = source.end.column;
  if (options.notes) {
    notes = described.map(({ cell, at, formula, spill }) => ({
      address: at,
      text: noteText(cell, formula, spill, options.frozenAt),
    }));
  } else {
    const column = howComputedColumn(plan);
    keepEnd = column;
    formulasKept = `in column ${columnLetters(column)} (How computed)`;
    const byRow = new Map<number, string[]>();
    for (const { at, formula, spill, cell } of described) {
      const row = parseAddress(at).start.row;
      const what =
        cell.why === 'result'
          ? displayFormula(formula)
          : `was ${displayFormula(formula)} (it read cells left out of this copy)`;
      const entry = `${at}: ${what}${spill ? ` (filled ${spill})` : ''}`;
      byRow.set(row, [...(byRow.get(row) ?? []), entry]);
    }
    texts.push({ address: cellAddress({ row: 0, column }), text: 'How computed', bold: true });
    for (const [row, entries] of [...byRow].sort((a, b) => a[0] - b[0])) {
      texts.push({ address: cellAddress({ row, column }), text: entries.join('; ') });
    }
  }
  texts.unshift({
    address: headerCell,
    text: frozenHeaderLine({
      frozenAt: options.frozenAt,
      source: `${quoteSheet(plan.sheet)}!${plan.source}`,
      results: plan.results,
      formulasKept,
    }),
    bold: true,
  });
  const keepOnly =
    plan.scope.kind === 'cells'
      ? rangeAddress(
          { row: source.start.row + HEADER_ROWS, column: source.start.column },
          source.end.row - source.start.row + 1,
          keepEnd - source.start.column + 1,
        )
      : undefined;
  return { ...(keepOnly === undefined ? {} : { keepOnly }), values, texts, notes };
}

function plural(n: number, one: string, many: string): string {
  return `${n.toLocaleString('en-US')} ${n === 1 ? one : many}`;
}

/**
 * The sentences the panel shows before copying: where the copy goes, what it takes, what becomes values,
 * where the formulas go, and that the original stays as it is. Cost O(1).
 */
export function describeCopy(plan: CopyPlan, capabilities: Capabilities): { text: string; fallback: string | null } {
  const what =
    plan.scope.kind === 'sheet'
      ? `the whole sheet (${plan.source})`
      : `the cells ${plan.source}${plan.widened ? ' (the selection, widened so that no result is cut in two)' : ''}, with the rest of the sheet left out`;
  const others = plan.frozen.length - plan.results;
  const formulasGo = capabilities.notes
    ? 'each with its formula in a note'
    : `each with its formula in a "How computed" column (column ${columnLetters(howComputedColumn(plan))})`;
  const charts =
    plan.scope.kind === 'sheet'
      ? `${plural(plan.charts, 'chart', 'charts')} ${plan.charts === 1 ? 'comes' : 'come'} along and show${plan.charts === 1 ? 's' : ''} the values`
      : 'charts placed inside those cells come along';
  const text =
    `A new sheet "${plan.newSheet}" right after "${plan.sheet}": a copy of ${what}, in which ` +
    `${plural(plan.results, 'ABTEST result becomes a plain value', 'ABTEST results become plain values')}, ${formulasGo}` +
    `${others > 0 ? `; ${plural(others, 'other formula that reads', 'other formulas that read')} cells left out ${others === 1 ? 'keeps its value' : 'keep their values'} too` : ''}. ` +
    `${plan.scope.kind === 'sheet' && plan.charts === 0 ? 'Number formats come along (the sheet has no charts)' : `Number formats come along and ${charts}`}. ` +
    'A header line says when and from which cells it was made. ' +
    `"${plan.sheet}" itself is not changed and stays live.`;
  const fallback = capabilities.notes
    ? null
    : `This Excel cannot add notes to cells (it lacks the Excel JavaScript API ${OPTIONAL_API.notes.version}), so the formulas go into a column beside the values instead.`;
  return { text, fallback };
}
