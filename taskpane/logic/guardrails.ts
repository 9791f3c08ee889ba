/**
 * Guardrails of a read-out: a second metric of the same variants that the chosen variant must not harm
 * ("revenue per visitor no worse than −2%"). For each, a column of P(lift > limit) beside the primary
 * metric's results, its limit and required probability as input cells, and a decision that says when the
 * chosen variant fails a guardrail. Pure functions; every result is a live formula.
 */
import type { CellValue } from '../workbook/workbook';
import { KIND_SHORT, type MetricKind, type MetricRole } from './metrics';

/** Which way a guardrail metric must not move: not lower than the limit, or not higher than it. */
export type GuardrailDirection = 'noWorse' | 'noHigher';

/** A guardrail: a second metric of the same variants that the chosen variant must not harm. */
export interface Guardrail {
  readonly kind: MetricKind;
  readonly direction: GuardrailDirection;
  /** The relative lift limit as a fraction: −0.02 ("no worse than −2%") or 0.05 ("no higher than +5%"). */
  readonly limit: number;
  /** The probability with which the guardrail must hold, in (0, 1). */
  readonly required: number;
}

/** The most guardrails one read-out carries. */
export const MAX_GUARDRAILS = 3;

/** The argument list of a kind's data columns, in its functions' order (order sd last, added by the caller). */
export function dataArgs(kind: MetricKind, ref: (role: MetricRole) => string): string {
  switch (kind) {
    case 'conversions':
      return `${ref('conversions')},${ref('visitors')}`;
    case 'revenue':
      return `${ref('conversions')},${ref('visitors')},${ref('revenue')}`;
    case 'averages':
      return `${ref('count')},${ref('mean')},${ref('sd')}`;
    case 'counts':
      return `${ref('events')},${ref('exposure')}`;
  }
}

/**
 * The guardrail's probability formula: per challenger P(lift > limit) of the guardrail metric, with the
 * limit read from `limitCell` (empty in the control's place). Cost O(1).
 * @example guardrailFormula('revenue', { conversions: 'B2:B3', visitors: 'C2:C3', revenue: 'D2:D3' }, 'B9')
 * //=> "=ABTEST.REVENUE_PROB_LIFT_ABOVE(B2:B3,C2:C3,D2:D3,B9)"
 */
export function guardrailFormula(
  kind: MetricKind,
  refs: Readonly<Partial<Record<MetricRole, string>>>,
  limitCell: string,
): string {
  const ref = (role: MetricRole): string => {
    const r = refs[role];
    if (r === undefined) throw new RangeError(`the guardrail on ${KIND_SHORT[kind]} needs its ${role} column`);
    return r;
  };
  const data = dataArgs(kind, ref);
  switch (kind) {
    case 'conversions':
      return `=ABTEST.PROB_LIFT_ABOVE(${data},${limitCell})`;
    case 'revenue':
      return `=ABTEST.REVENUE_PROB_LIFT_ABOVE(${data},${limitCell}${refs.orderSd === undefined ? '' : `,${refs.orderSd}`})`;
    case 'averages':
      return `=ABTEST.MEAN_PROB_LIFT_ABOVE(${data},${limitCell})`;
    case 'counts':
      return `=ABTEST.EVENTS_PROB_LIFT_ABOVE(${data},${limitCell})`;
  }
}

/** Where the guardrail parts go in a block, and the cells they refer to. */
export interface GuardrailPlacement {
  /** Row of the result table's headings; the k variants follow (0-based within the block). */
  readonly headerRow: number;
  readonly variants: number;
  /** First column of the guardrail columns. */
  readonly firstColumn: number;
  /** First of the guardrail settings rows (2 per guardrail, then the guarded decision). */
  readonly settingsRow: number;
  /** Addresses: the expected-loss spill's k cells, the largest acceptable loss, the names, the decision. */
  readonly lossRange: string;
  readonly maxLoss: string;
  readonly labels: string;
  readonly decision: string;
  /** The primary metric's short name for the decision's words. */
  readonly primary: string;
}

/** How writeGuardrails writes into its block (block-relative rows and columns). */
export interface BlockWriter {
  /** Writes a cell and returns its address. */
  put(row: number, column: number, value: CellValue, format?: string | null): string;
  /** Sets the format of the k variant cells from (row, column) down. */
  formatColumn(row: number, column: number, format: string): void;
  /** The address of `rows` cells from (row, column) down. */
  rangeAt(row: number, column: number, rows: number): string;
}

/** Rows the guardrail settings take: 2 per guardrail and the guarded decision; 0 without guardrails. */
export function guardrailRows(count: number): number {
  return count === 0 ? 0 : 2 * count + 1;
}

/**
 * Writes the guardrails into a block: a column per guardrail (a heading formula naming the live limit,
 * then the probabilities), two settings rows each (limit, required probability) and the "Decision with
 * guardrails" row. That decision repeats the primary decision unless it chooses a challenger that fails a
 * guardrail (for "no worse than": P(lift > limit) below the required probability; for "no higher than":
 * P(lift > limit) above 1 − required); then it names the guardrail, the variant and the probabilities, and
 * says not to switch yet. The chosen variant is the expected-loss rule's (the smallest loss, the first of
 * equal ones, chosen when at most the largest acceptable loss), as every *_DECISION.
 * Cost O(guardrails). Returns the named cells (guardrail1, guardrail1Limit, …, guardedDecision).
 * @example writeGuardrails([{ kind: 'revenue', direction: 'noWorse', limit: -0.02, required: 0.95 }], refs, place, writer).guardrail1
 */
export function writeGuardrails(
  guardrails: readonly Guardrail[],
  refs: Readonly<Partial<Record<MetricRole, string>>>,
  place: GuardrailPlacement,
  writer: BlockWriter,
): Record<string, string> {
  const names: Record<string, string> = {};
  if (guardrails.length === 0) return names;
  const loss = place.lossRange;
  const index = `MATCH(MIN(${loss}),${loss},0)`;
  const failures: [string, string][] = [];
  guardrails.forEach((g, j) => {
    const n = j + 1;
    const column = place.firstColumn + j;
    const row = place.settingsRow + 2 * j;
    const noWorse = g.direction === 'noWorse';
    const what = `${KIND_SHORT[g.kind]} lift ${noWorse ? 'no worse than' : 'no higher than'}`;
    writer.put(row, 0, `Guardrail ${n}: ${what}`);
    const limit = writer.put(row, 1, g.limit, '0.0%');
    writer.put(row + 1, 0, `Guardrail ${n} must hold with probability at least`);
    const required = writer.put(row + 1, 1, g.required, '0%');
    names[`guardrail${n}Limit`] = limit;
    names[`guardrail${n}Required`] = required;
    writer.put(
      place.headerRow,
      column,
      `="Guardrail ${n}: P(${KIND_SHORT[g.kind]} lift > "&ROUND(100*${limit},2)&"%)"`,
    );
    names[`guardrail${n}`] = writer.put(place.headerRow + 1, column, guardrailFormula(g.kind, refs, limit));
    writer.formatColumn(place.headerRow + 1, column, '0.0%');
    const p = `INDEX(${writer.rangeAt(place.headerRow + 1, column, place.variants)},${index})`;
    const fails = noWorse ? `${p}<${required}` : `${p}>1-${required}`;
    const words =
      `"Guardrail ${n} fails for "&INDEX(${place.labels},${index})&": P(${KIND_SHORT[g.kind]} lift > "&ROUND(100*${limit},2)&"%) is "` +
      `&ROUND(100*${p},1)&"%, ${noWorse ? 'below' : 'above'} "&ROUND(100*${noWorse ? required : `(1-${required})`},1)&"%. ` +
      `Do not switch yet. On ${place.primary} alone: "&${place.decision}`;
    failures.push([fails, words]);
  });
  const decisionRow = place.settingsRow + 2 * guardrails.length;
  writer.put(decisionRow, 0, 'Decision with guardrails');
  let formula = `${place.decision}&" Guardrails hold for "&INDEX(${place.labels},${index})&"."`;
  for (let j = failures.length - 1; j >= 0; j -= 1) {
    const [fails, words] = failures[j] as [string, string];
    formula = `IF(${fails},${words},${formula})`;
  }
  names.guardedDecision = writer.put(
    decisionRow,
    1,
    `=IF(OR(MIN(${loss})>${place.maxLoss},${index}=1),${place.decision},${formula})`,
  );
  return names;
}
