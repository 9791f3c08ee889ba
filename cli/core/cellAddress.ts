/**
 * A1 cell addresses and rectangular ranges, as SpreadsheetML writes them (ECMA-376 Part 1, §18.18.62
 * ST_Ref: "A1", "B2:D4"; columns A … XFD, rows 1 … 1048576). Rows and columns are zero-based inside.
 *
 * Pure: no Node APIs, no DOM, no state. The side panel may import this module.
 */

/** The last column (XFD) and row of a worksheet, zero-based (ECMA-376 Part 1, §18.3.1.73 and Excel's limits). */
export const MAX_COLUMN = 16383;
export const MAX_ROW = 1048575;

/** A zero-based cell position. */
export interface CellPosition {
  readonly row: number;
  readonly col: number;
}

/** A rectangle of cells, zero-based and inclusive, top ≤ bottom and left ≤ right. */
export interface CellRange {
  readonly top: number;
  readonly left: number;
  readonly bottom: number;
  readonly right: number;
}

/**
 * Column letters → zero-based index; -1 when the letters are not a column of a worksheet.
 * Cost O(length). Never throws.
 * @example columnIndex('A') //=> 0
 * @example columnIndex('XFD') //=> 16383
 */
export function columnIndex(letters: string): number {
  if (letters.length === 0 || letters.length > 3) return -1;
  let n = 0;
  for (let i = 0; i < letters.length; i += 1) {
    const code = letters.charCodeAt(i) | 0x20; // lower case
    if (code < 0x61 || code > 0x7a) return -1;
    n = n * 26 + (code - 0x60);
  }
  return n - 1 <= MAX_COLUMN ? n - 1 : -1;
}

/**
 * Zero-based column index → letters.
 * @example columnLetters(27) //=> 'AB'
 */
export function columnLetters(col: number): string {
  let n = col + 1;
  let out = '';
  while (n > 0) {
    const rem = (n - 1) % 26;
    out = String.fromCharCode(65 + rem) + out;
    n = Math.floor((n - 1) / 26);
  }
  return out;
}

const CELL = /^\$?([A-Za-z]{1,3})\$?([0-9]{1,7})$/;

/**
 * Parses "B3" or "$B$3" (the dollars are ignored); undefined when it is not a cell of a worksheet.
 * @example parseCell('$C$10') //=> { row: 9, col: 2 }
 */
export function parseCell(text: string): CellPosition | undefined {
  const m = CELL.exec(text);
  if (!m) return undefined;
  const col = columnIndex(m[1] as string);
  const row = Number(m[2]) - 1;
  if (col < 0 || row < 0 || row > MAX_ROW) return undefined;
  return { row, col };
}

/**
 * Parses "B2:D4" or a single cell "B2" (a one-cell range); undefined otherwise. The corners may come in
 * any order; the result is normalised.
 * @example parseRange('D4:B2') //=> { top: 1, left: 1, bottom: 3, right: 3 }
 */
export function parseRange(text: string): CellRange | undefined {
  const colon = text.indexOf(':');
  const a = parseCell(colon < 0 ? text : text.slice(0, colon));
  const b = colon < 0 ? a : parseCell(text.slice(colon + 1));
  if (!a || !b) return undefined;
  return {
    top: Math.min(a.row, b.row),
    left: Math.min(a.col, b.col),
    bottom: Math.max(a.row, b.row),
    right: Math.max(a.col, b.col),
  };
}

/**
 * "B3" for a position.
 * @example cellName({ row: 2, col: 1 }) //=> 'B3'
 */
export function cellName(position: CellPosition): string {
  return `${columnLetters(position.col)}${position.row + 1}`;
}

/**
 * "B2:D4" for a range, "B2" for a single cell.
 * @example rangeName({ top: 1, left: 1, bottom: 1, right: 1 }) //=> 'B2'
 */
export function rangeName(range: CellRange): string {
  const first = cellName({ row: range.top, col: range.left });
  if (range.top === range.bottom && range.left === range.right) return first;
  return `${first}:${cellName({ row: range.bottom, col: range.right })}`;
}

/** Number of cells of a range. */
export function rangeSize(range: CellRange): number {
  return (range.bottom - range.top + 1) * (range.right - range.left + 1);
}

/** True when the position lies in the range. */
export function inRange(range: CellRange, row: number, col: number): boolean {
  return row >= range.top && row <= range.bottom && col >= range.left && col <= range.right;
}

/**
 * A sheet name as a formula writes it before "!": quoted with '' for ' when it holds anything but letters,
 * digits, underscores and dots, or looks like a cell or starts with a digit (common practice of Excel's
 * formula syntax).
 * @example sheetPrefix("Read-out") //=> "'Read-out'!"
 * @example sheetPrefix('Data') //=> 'Data!'
 */
export function sheetPrefix(sheet: string): string {
  const plain =
    /^[A-Za-z_\u00C0-\uFFFF][A-Za-z0-9_.\u00C0-\uFFFF]*$/.test(sheet) &&
    !parseCell(sheet) &&
    !/^R\d*C\d*$/i.test(sheet);
  return plain ? `${sheet}!` : `'${sheet.replace(/'/g, "''")}'!`;
}
