/**
 * Finding the guardrails of a conversions read-out for the summary (Share section): the read-out's block
 * (formulas.ts readoutBlock with guardrails.ts writeGuardrails) holds, per guardrail, a heading formula
 * ("Guardrail n: P(… lift > …%)"), a probability formula (=ABTEST.…PROB_LIFT_ABOVE(data, limit)) under it,
 * and two settings rows (the limit with its direction in words, the required probability). The summary
 * reads those cells, the guardrail metric's columns the formula refers to, and recomputes the
 * probabilities with the statistics core, as it does for the rest of the page. Pure functions; the panel
 * does the reading (Workbook.scanSheet, readRange).
 */
import type { FormulaCell, SheetScan, CellValue } from '../workbook/workbook';
import { cellAddress, parseAddress, type CellPosition } from '../workbook/address';
import { parseAbtestCall } from './explain';
import type { GuardrailDirection } from './guardrails';
import { KIND_ROLES, KIND_SHORT, type MetricKind, type MetricRole } from './metrics';

/** The probability function of each guardrail metric (guardrails.ts guardrailFormula writes these). */
const KIND_OF_FUNCTION: Readonly<Record<string, MetricKind>> = {
  PROB_LIFT_ABOVE: 'conversions',
  REVENUE_PROB_LIFT_ABOVE: 'revenue',
  MEAN_PROB_LIFT_ABOVE: 'averages',
  EVENTS_PROB_LIFT_ABOVE: 'counts',
};

/** The title of a conversions read-out block (formulas.ts readoutBlock, row 0). */
export const CONVERSIONS_READOUT_TITLE = 'Read-out (Lift Ledger)';
/** Columns of the conversions read-out's table before its guardrail columns (formulas.ts READOUT_WIDTH). */
const READOUT_TABLE_WIDTH = 10;

/** Where a guardrail of a read-out of the table is, before its settings are read. */
export interface GuardrailCells {
  /** The guardrail's number in its read-out (1 to 3). */
  readonly n: number;
  readonly kind: MetricKind;
  /** The sheet of the read-out. */
  readonly sheet: string;
  /** Local address of the read-out's top-left cell (its title). */
  readonly blockTopLeft: string;
  /** Local address of the 2 × 2 settings cells: the limit's label and value, the required's label and value. */
  readonly settings: string;
  /** The guardrail metric's columns, as local addresses on the table's sheet (orderSd when given). */
  readonly refs: Readonly<Partial<Record<MetricRole, string>>>;
}

/** The variant rows of the table: its sheet, first data row and column span (0-based), and how many. */
export interface TableRows {
  readonly sheet: string;
  readonly firstRow: number;
  readonly rows: number;
}

function position(address: string): CellPosition | null {
  try {
    const p = parseAddress(address);
    return p.start.row === p.end.row && p.start.column === p.end.column ? p.start : null;
  } catch {
    return null;
  }
}

/**
 * The guardrails written by "Insert read-out" on a sheet for the given table: each probability formula of
 * a guardrail metric whose data columns are the table's variant rows (on the table's sheet), with the
 * heading formula of our block above it. Read-outs of another table, and PROB_LIFT_ABOVE formulas typed by
 * hand (no heading above), are left out. Cost O(formula cells · formula length). Never throws.
 * @example findGuardrailCells(scan, { sheet: 'Checkout test', firstRow: 3, rows: 3 })[0].kind //=> 'averages'
 */
export function findGuardrailCells(scan: SheetScan, table: TableRows): GuardrailCells[] {
  const byAddress = new Map<string, FormulaCell>();
  for (const cell of scan.formulaCells) byAddress.set(cell.address.replace(/\$/g, ''), cell);
  const found: GuardrailCells[] = [];
  for (const cell of scan.formulaCells) {
    const call = parseAbtestCall(cell.formula);
    const kind = call === null ? undefined : KIND_OF_FUNCTION[call.name];
    const at = position(cell.address);
    if (call === null || kind === undefined || at === null || at.row < 2) continue;
    const heading = byAddress.get(cellAddress({ row: at.row - 1, column: at.column }));
    const match = heading === undefined ? null : /^="Guardrail ([1-9]): P\(/.exec(heading.formula);
    if (match === null) continue;
    const n = Number(match[1]);
    const roles = KIND_ROLES[kind].required;
    if (call.args.length < roles.length + 1) continue;
    const refs: Partial<Record<MetricRole, string>> = {};
    let ok = true;
    const column = (text: string): string | null => {
      try {
        const p = parseAddress(text);
        const sheet = p.sheet === '' ? scan.sheet : p.sheet;
        const fits =
          sheet === table.sheet &&
          p.start.column === p.end.column &&
          p.start.row === table.firstRow &&
          p.end.row === table.firstRow + table.rows - 1;
        return fits ? `${cellAddress(p.start)}:${cellAddress(p.end)}` : null;
      } catch {
        return null;
      }
    };
    roles.forEach((role, i) => {
      const ref = column(call.args[i] as string);
      if (ref === null) ok = false;
      else refs[role] = ref;
    });
    const limit = position(call.args[roles.length] as string);
    if (!ok || limit === null || limit.column < 1) continue;
    if (kind === 'revenue' && call.args.length > roles.length + 1 && call.args[roles.length + 1] !== '') {
      const sd = column(call.args[roles.length + 1] as string);
      if (sd === null) continue;
      refs.orderSd = sd;
    }
    const origin = { row: at.row - 2, column: at.column - READOUT_TABLE_WIDTH - (n - 1) };
    if (origin.column < 0) continue;
    found.push({
      n,
      kind,
      sheet: scan.sheet,
      blockTopLeft: cellAddress(origin),
      settings: `${cellAddress({ row: limit.row, column: limit.column - 1 })}:${cellAddress({ row: limit.row + 1, column: limit.column })}`,
      refs,
    });
  }
  return found;
}

/** A guardrail's settings as its read-out states them. */
export interface GuardrailSettings {
  readonly direction: GuardrailDirection;
  readonly limit: number;
  readonly required: number;
}

/**
 * Reads a guardrail's settings from its 2 × 2 cells (label, limit; label, required probability) as
 * writeGuardrails words them; null when the labels are not ours for guardrail n of this kind, or a value is
 * not a number in its range (limit above −1, required from 0.5 to below 1). Cost O(1).
 * @example guardrailSettings([['Guardrail 1: average lift no worse than', -0.02], ['Guardrail 1 must hold with probability at least', 0.95]], 1, 'averages')
 * //=> { direction: 'noWorse', limit: -0.02, required: 0.95 }
 */
export function guardrailSettings(
  cells: readonly (readonly CellValue[])[],
  n: number,
  kind: MetricKind,
): GuardrailSettings | null {
  const [label, limit] = cells[0] ?? [];
  const [requiredLabel, required] = cells[1] ?? [];
  const words = `Guardrail ${n}: ${KIND_SHORT[kind]} lift `;
  if (typeof label !== 'string' || !label.startsWith(words)) return null;
  const rest = label.slice(words.length);
  const direction: GuardrailDirection | null =
    rest === 'no worse than' ? 'noWorse' : rest === 'no higher than' ? 'noHigher' : null;
  if (direction === null || requiredLabel !== `Guardrail ${n} must hold with probability at least`) return null;
  if (typeof limit !== 'number' || !(limit > -1) || !(limit <= 1)) return null;
  if (typeof required !== 'number' || !(required >= 0.5) || !(required < 1)) return null;
  return { direction, limit, required };
}
