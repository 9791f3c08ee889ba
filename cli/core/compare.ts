/**
 * When a saved value and a recomputed one agree.
 *
 * Numbers agree when |saved − recomputed| ≤ tolerance × max(|saved|, |recomputed|), with a default
 * relative tolerance of 1e-9. Excel writes a cell's double in full (up to 17 significant digits), so a
 * value recomputed by the same code from the same inputs is normally identical; 1e-9 leaves room for a
 * different build of the add-in or a different machine's last-bit rounding, and is still six orders of
 * magnitude tighter than the digits a worksheet shows (15), so a changed input or a changed method shows
 * up. Zero agrees only with zero. Text, TRUE/FALSE and error codes agree when they are equal; an empty
 * result slot ("") agrees with an empty or missing cell.
 *
 * Pure: no Node APIs. Cost O(1) per value.
 */
import type { ErrorLiteral } from './formula';

/** A cell's value as the audit sees it: blank is null. */
export type SavedValue = number | string | boolean | ErrorLiteral | null;

/** The default relative tolerance for numbers. */
export const DEFAULT_TOLERANCE = 1e-9;

/** True when `value` is an error literal. */
export function isErrorValue(value: unknown): value is ErrorLiteral {
  return typeof value === 'object' && value !== null && typeof (value as ErrorLiteral).error === 'string';
}

/**
 * True when the two values agree under the rules above.
 * @example valuesAgree(0.1 + 0.2, 0.3) //=> true
 * @example valuesAgree(0.974322, 0.974323) //=> false
 * @example valuesAgree('', null) //=> true
 */
export function valuesAgree(saved: SavedValue, recomputed: SavedValue, tolerance = DEFAULT_TOLERANCE): boolean {
  const blank = (v: SavedValue): boolean => v === null || v === '';
  if (blank(saved) || blank(recomputed)) return blank(saved) && blank(recomputed);
  if (typeof saved === 'number' && typeof recomputed === 'number') {
    if (saved === recomputed) return true;
    return Math.abs(saved - recomputed) <= tolerance * Math.max(Math.abs(saved), Math.abs(recomputed));
  }
  if (isErrorValue(saved) || isErrorValue(recomputed)) {
    return (
      isErrorValue(saved) && isErrorValue(recomputed) && saved.error.toUpperCase() === recomputed.error.toUpperCase()
    );
  }
  return saved === recomputed;
}

/**
 * A value as a report shows it: numbers in full (shortest round-trip form), text in quotes, errors as
 * their code, blank as "(blank)".
 * @example showValue('') //=> '""'
 * @example showValue({ error: '#N/A' }) //=> '#N/A'
 */
export function showValue(value: SavedValue): string {
  if (value === null) return '(blank)';
  if (isErrorValue(value)) return value.error;
  if (typeof value === 'string') return JSON.stringify(value);
  if (typeof value === 'boolean') return value ? 'TRUE' : 'FALSE';
  return String(value);
}
