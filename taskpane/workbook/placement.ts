/**
 * Where a block can go without touching anyone's data: the first run of empty columns right of a table,
 * the first run of empty rows below it, and a valid new sheet name. Pure functions; officeWorkbook.ts
 * reads the cells and calls them.
 */

/** Excel's sheet size: 1,048,576 rows × 16,384 columns (XFD), as documented for Excel 2007 and later. */
export const SHEET_ROWS = 1_048_576;
export const SHEET_COLUMNS = 16_384;

/** The most cells a place search reads from the sheet; beyond that it places the block after the used range. */
export const MAX_SCAN_CELLS = 200_000;

/**
 * The first index `s ≥ from` such that `s − 1 … s + length − 1` are all empty (one empty line before the
 * block, so it never touches what is there), or null when the block would pass `limit`. Cost O(scanned).
 * @example firstFreeRun((i) => i > 5, 2, 3, 100) //=> 7
 */
export function firstFreeRun(
  isEmpty: (index: number) => boolean,
  from: number,
  length: number,
  limit: number,
): number | null {
  let run = 0;
  for (let i = from - 1; i < limit; i += 1) {
    run = isEmpty(i) ? run + 1 : 0;
    if (run === length + 1) return i - length + 1;
  }
  return null;
}

const FORBIDDEN = /[[\]:*?/\\]/g;

/**
 * A sheet name Excel accepts that no existing sheet has (compared without case): forbidden characters
 * `[ ] : * ? / \` removed, no leading or trailing apostrophe, at most 31 characters, not "History", and
 * " (2)", " (3)"… added when taken. Cost O(existing · length).
 * @example newSheetName('Checkout test read-out', ['Checkout test read-out']) //=> "Checkout test read-out (2)"
 */
export function newSheetName(wanted: string, existing: readonly string[]): string {
  let base = wanted
    .replace(FORBIDDEN, ' ')
    .replace(/\s+/g, ' ')
    .trim()
    .replace(/^'+|'+$/g, '')
    .trim();
  if (base === '' || base.toLowerCase() === 'history') base = 'Read-out';
  const taken = new Set(existing.map((name) => name.toLowerCase()));
  for (let n = 1; ; n += 1) {
    const suffix = n === 1 ? '' : ` (${n})`;
    const name = `${base.slice(0, 31 - suffix.length).trimEnd()}${suffix}`;
    if (!taken.has(name.toLowerCase())) return name;
  }
}
