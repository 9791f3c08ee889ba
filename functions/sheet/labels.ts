/**
 * The one way Lift Ledger names variants by position: A, B, …, Z, AA, AB, … (the sequence of spreadsheet
 * column letters). DECISION uses it for variants without a label; the side panel should use it for its
 * default variant names, so a 27th variant is "AA" everywhere.
 */

/**
 * The letter name of the variant at 0-based position `index`: 0 → "A", 25 → "Z", 26 → "AA", 701 → "ZZ",
 * 702 → "AAA".
 *
 * Cost O(log index). Never throws; a negative or fractional index is read as its whole part, at least 0.
 * @example variantLetter(1) //=> "B"
 * @example variantLetter(26) //=> "AA"
 */
export function variantLetter(index: number): string {
  let n = Math.max(0, Math.floor(index)) + 1;
  let label = '';
  while (n > 0) {
    const r = (n - 1) % 26;
    label = String.fromCharCode(65 + r) + label;
    n = Math.floor((n - 1) / 26);
  }
  return label;
}
