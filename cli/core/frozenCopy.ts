/**
 * The rules of a frozen (shareable) copy, in one place for every maker of one: the `lift-ledger freeze`
 * command and the side panel's shareable copy (taskpane/logic/shareCopy.ts).
 *
 * - Which cells are ABTEST results: every cell whose formula calls an ABTEST function anywhere (at the top
 *   or nested), and the cells its result spills over. Without the add-in such a formula shows #NAME? at the
 *   next recalculation; a frozen copy keeps its last value instead.
 * - What the note on a frozen cell says: the formula that produced the value (as typed in Excel), where it
 *   spilled, and that the value no longer updates.
 * - What the header says: when the copy was made, from which file (or cells), how many results it froze.
 *
 * Pure: no Node APIs, no DOM, no clock (the caller passes the time). The wording is our own.
 */
import { containsAbtestCall, displayFormula } from './formula';

export { containsAbtestCall, displayFormula } from './formula';

/** The author name on the notes a frozen copy adds. */
export const NOTE_AUTHOR = 'Lift Ledger';

/**
 * True when a cell holding `formula` is an ABTEST result a frozen copy turns into its value.
 * @example isAbtestResult('ABTEST.DECISION(C2:C3,B2:B3)') //=> true
 * @example isAbtestResult('SUM(B2:B3)') //=> false
 */
export function isAbtestResult(formula: string): boolean {
  return containsAbtestCall(formula);
}

/**
 * The UTC time as "2025-03-14 09:26 UTC": the form notes and headers use (minutes are enough to tell
 * copies apart; UTC so that readers in other time zones read the same time).
 * @example frozenTime(new Date(Date.UTC(2025, 2, 14, 9, 26, 53))) //=> '2025-03-14 09:26 UTC'
 */
export function frozenTime(at: Date): string {
  const p = (n: number): string => String(n).padStart(2, '0');
  return `${at.getUTCFullYear()}-${p(at.getUTCMonth() + 1)}-${p(at.getUTCDate())} ${p(at.getUTCHours())}:${p(at.getUTCMinutes())} UTC`;
}

/** What a "how computed" note is made from. */
export interface HowComputed {
  /** The formula as stored (any accepted spelling; a leading "=" is optional). */
  readonly formula: string;
  /** The range the result spilled over, e.g. "B2:D4", when it is more than one cell. */
  readonly spill?: string;
  /** When the copy was made. */
  readonly frozenAt: Date;
}

/**
 * The note kept on a frozen cell: the formula that produced it, so a reader can see how the number was
 * computed and recompute it where the add-in is installed.
 *
 * @example
 * howComputedNote({ formula: '_xldudf_ABTEST_PROB_HIGHEST(C2:C3,B2:B3)', spill: 'D2:D3', frozenAt: new Date(0) })
 * //=> 'Computed by =ABTEST.PROB_HIGHEST(C2:C3,B2:B3) (its result filled D2:D3).\nFrozen 1970-01-01 00:00 UTC: a plain value now, it no longer updates.'
 */
export function howComputedNote(source: HowComputed): string {
  const where = source.spill ? ` (its result filled ${source.spill})` : '';
  return (
    `Computed by ${displayFormula(source.formula)}${where}.\n` +
    `Frozen ${frozenTime(source.frozenAt)}: a plain value now, it no longer updates.`
  );
}

/** What a header line is made from. */
export interface FrozenHeader {
  readonly frozenAt: Date;
  /** The file (or the cells) the copy was made from, e.g. "checkout-test.xlsx" or "'Read-out'!A1:F20". */
  readonly source: string;
  /** ABTEST formulas turned into values (spills count once). */
  readonly results: number;
  /**
   * Where each formula is kept, as the end of "each keeps the formula that computed it …": "in a note" unless
   * given (the side panel says "in column O" on an Excel without notes).
   */
  readonly formulasKept?: string;
}

/**
 * The header of a frozen copy: when, from what, how many, and what that means for a reader.
 * @example
 * frozenHeaderLine({ frozenAt: new Date(0), source: 'q3.xlsx', results: 2 })
 * //=> 'Frozen copy made 1970-01-01 00:00 UTC from q3.xlsx: 2 Lift Ledger results are plain values; each keeps the formula that computed it in a note. New data will not change them.'
 */
export function frozenHeaderLine(header: FrozenHeader): string {
  const what =
    header.results === 1
      ? '1 Lift Ledger result is a plain value'
      : `${header.results} Lift Ledger results are plain values`;
  return (
    `Frozen copy made ${frozenTime(header.frozenAt)} from ${header.source}: ${what}; ` +
    `each keeps the formula that computed it ${header.formulasKept ?? 'in a note'}. New data will not change them.`
  );
}
