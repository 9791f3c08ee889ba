/**
 * Plain-words text for DECISION, and the percentage formatting it uses.
 */
import { classifyCell } from './cells';
import { variantLetter } from './labels';

/**
 * Formats a rate (0.0123) as a percentage with two significant digits and at least two decimals
 * ("1.23%", "0.30%", "0.0012%"), so small expected losses do not round to "0.00%".
 *
 * Cost O(1).
 * @example decisionPercent(0.0002) //=> "0.020%"
 * @example decisionPercent(0.0123) //=> "1.23%"
 */
export function decisionPercent(rate: number): string {
  const percent = rate * 100;
  if (percent === 0) return '0%';
  const magnitude = Math.floor(Math.log10(Math.abs(percent)));
  const decimals = Math.min(12, Math.max(2, 1 - magnitude));
  return `${percent.toFixed(decimals)}%`;
}

/**
 * The default label of the variant at 0-based position `p` of the range: its letter (labels.ts), A, B, …,
 * Z, AA, AB, …
 *
 * Cost O(log p).
 * @example defaultLabel(1) //=> "B"
 * @example defaultLabel(26) //=> "AA"
 */
export const defaultLabel: (p: number) => string = variantLetter;

/**
 * The label of a variant: the user's label cell if it holds text or a number, else the default letter.
 *
 * Cost O(1).
 * @example labelOf('Green button', 1) //=> "Green button"
 * @example labelOf('', 1) //=> "B"
 */
export function labelOf(cell: unknown, p: number): string {
  const c = classifyCell(cell);
  if (c.kind === 'text') return c.text.trim();
  if (c.kind === 'number') return String(c.value);
  return defaultLabel(p);
}

/** What the core's decision rule found, with the chosen or leading variant's label. */
export interface DecisionOutcome {
  readonly choose: boolean;
  readonly label: string;
  readonly loss: number;
  readonly maxLoss: number;
}

/**
 * The one-cell text of DECISION.
 *
 * Cost O(1).
 * @example decisionText({ choose: true, label: 'B', loss: 0.0002, maxLoss: 0.0005 })
 * //=> "Choose B: its expected loss 0.020% is within the 0.050% allowed"
 */
export function decisionText(outcome: DecisionOutcome): string {
  return decisionWords(outcome, decisionPercent(outcome.loss), decisionPercent(outcome.maxLoss));
}

/** The one wording of every *_DECISION, given the loss and the threshold already written out. */
function decisionWords(outcome: DecisionOutcome, loss: string, allowed: string): string {
  return outcome.choose
    ? `Choose ${outcome.label}: its expected loss ${loss} is within the ${allowed} allowed`
    : `Keep collecting data: ${outcome.label} leads, but its expected loss ${loss} is above the ${allowed} allowed`;
}

/**
 * The DECISION cell for a variant table: maps the core's variant index back to its position in the
 * range, picks the label (user's or default letter) and writes the text.
 *
 * Cost O(variants).
 * @throws {Error} if the core's index is outside the table (an internal fault, shown as #VALUE!).
 * @example decisionCell(table, undefined, { choose: false, index: 1, loss: 0.003, maxLoss: 0.0005 })
 * //=> "Keep collecting data: B leads, but its expected loss 0.30% is above the 0.050% allowed"
 */
export function decisionCell(
  table: { readonly positions: readonly number[] },
  labels: readonly unknown[] | undefined,
  found: { readonly choose: boolean; readonly index: number; readonly loss: number; readonly maxLoss: number },
): string {
  const position = table.positions[found.index];
  if (position === undefined || !Number.isFinite(found.loss) || !Number.isFinite(found.maxLoss)) {
    throw new Error(`internal: the decision rule returned variant ${found.index}`);
  }
  const label = labelOf(labels?.[found.index], position);
  return decisionText({ choose: found.choose, label, loss: found.loss, maxLoss: found.maxLoss });
}

/**
 * Formats an amount in a metric's own units (a loss of revenue per visitor, events per unit of exposure,
 * an average) with two significant digits and at least two decimals, as decisionPercent does for rates:
 * no currency symbol (the add-in cannot know the currency).
 *
 * Cost O(1).
 * @example formatAmount(0.0042) //=> "0.0042"
 * @example formatAmount(12.3456) //=> "12.35"
 */
export function formatAmount(amount: number): string {
  if (amount === 0) return '0';
  const magnitude = Math.floor(Math.log10(Math.abs(amount)));
  const decimals = Math.min(12, Math.max(2, 1 - magnitude));
  return amount.toFixed(decimals);
}

/**
 * The one-cell text of MEAN_DECISION, EVENTS_DECISION and REVENUE_DECISION: DECISION's rule and words,
 * with the loss and the threshold as amounts followed by the metric's unit ("per visitor", "events per
 * unit of exposure", "in the metric's units").
 *
 * Cost O(variants).
 * @throws {Error} if the core's index is outside the table (an internal fault, shown as #VALUE!).
 * @example amountDecisionCell(table, undefined, { choose: true, index: 1, loss: 0.0042, maxLoss: 0.021 }, 'per visitor')
 * //=> "Choose B: its expected loss 0.0042 per visitor is within the 0.021 per visitor allowed"
 */
export function amountDecisionCell(
  table: { readonly positions: readonly number[] },
  labels: readonly unknown[] | undefined,
  found: { readonly choose: boolean; readonly index: number; readonly loss: number; readonly maxLoss: number },
  unit: string,
): string {
  const position = table.positions[found.index];
  if (position === undefined || !Number.isFinite(found.loss) || !Number.isFinite(found.maxLoss)) {
    throw new Error(`internal: the decision rule returned variant ${found.index}`);
  }
  const outcome = {
    choose: found.choose,
    label: labelOf(labels?.[found.index], position),
    loss: found.loss,
    maxLoss: found.maxLoss,
  };
  return decisionWords(outcome, `${formatAmount(found.loss)} ${unit}`, `${formatAmount(found.maxLoss)} ${unit}`);
}
