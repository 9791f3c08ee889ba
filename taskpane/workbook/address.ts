/**
 * A1 addresses: parsing Excel's qualified addresses ("'Past tests'!A1:B12"), building local ones, and
 * quoting sheet names the way Excel does in formulas. Pure functions; rows and columns are 0-based.
 */

/** A cell position, 0-based: row 0 is sheet row 1, column 0 is column A. */
export interface CellPosition {
  readonly row: number;
  readonly column: number;
}

/** A parsed address: the sheet (unquoted, "" when the address has none) and the corner cells. */
export interface ParsedAddress {
  readonly sheet: string;
  readonly start: CellPosition;
  readonly end: CellPosition;
}

const CELL = /^\$?([A-Za-z]{1,3})\$?([0-9]{1,7})$/;

/**
 * Column letters of a 0-based column index (bijective base 26, as Excel numbers columns).
 * Cost O(log column). Throws RangeError for a negative or non-whole index.
 * @example columnLetters(0) //=> "A"; columnLetters(27) //=> "AB"
 */
export function columnLetters(column: number): string {
  if (!Number.isInteger(column) || column < 0) throw new RangeError(`column ${column} is not a column index`);
  let n = column + 1;
  let out = '';
  while (n > 0) {
    const rem = (n - 1) % 26;
    out = String.fromCharCode(65 + rem) + out;
    n = Math.floor((n - 1) / 26);
  }
  return out;
}

/**
 * 0-based column index of column letters ("A" → 0, "AB" → 27). Cost O(length).
 * Throws RangeError for anything but 1–3 letters.
 * @example columnIndex("AB") //=> 27
 */
export function columnIndex(letters: string): number {
  if (!/^[A-Za-z]{1,3}$/.test(letters)) throw new RangeError(`"${letters}" is not a column`);
  let n = 0;
  for (const ch of letters.toUpperCase()) n = n * 26 + (ch.charCodeAt(0) - 64);
  return n - 1;
}

/**
 * Local A1 address of a cell. Cost O(1).
 * @example cellAddress({ row: 1, column: 2 }) //=> "C2"
 */
export function cellAddress(position: CellPosition): string {
  return `${columnLetters(position.column)}${position.row + 1}`;
}

/**
 * Local A1 address of a rectangle given its top-left cell and size ("F2" for a single cell). Cost O(1).
 * Throws RangeError for a size below 1.
 * @example rangeAddress({ row: 1, column: 5 }, 3, 2) //=> "F2:G4"
 */
export function rangeAddress(topLeft: CellPosition, rowCount: number, columnCount: number): string {
  if (rowCount < 1 || columnCount < 1) throw new RangeError('a range has at least one row and one column');
  const first = cellAddress(topLeft);
  if (rowCount === 1 && columnCount === 1) return first;
  return `${first}:${cellAddress({ row: topLeft.row + rowCount - 1, column: topLeft.column + columnCount - 1 })}`;
}

/**
 * Parse an address as Excel reports it: optional sheet ("Sheet1!" or "'Past tests'!", with '' for an
 * apostrophe inside quotes), then a cell or a cell range, "$" allowed. Cost O(length).
 * Throws RangeError for anything else (whole columns "A:A" and rows "1:1" are not accepted).
 * @example parseAddress("'Past tests'!B2:C13") //=> { sheet: "Past tests", start: {row:1,column:1}, end: {row:12,column:2} }
 */
export function parseAddress(address: string): ParsedAddress {
  let sheet = '';
  let rest = address.trim();
  const bang = rest.lastIndexOf('!');
  if (bang >= 0) {
    const rawSheet = rest.slice(0, bang);
    rest = rest.slice(bang + 1);
    if (rawSheet.startsWith("'") && rawSheet.endsWith("'") && rawSheet.length >= 2) {
      sheet = rawSheet.slice(1, -1).replace(/''/g, "'");
    } else {
      sheet = rawSheet;
    }
    if (sheet === '') throw new RangeError(`"${address}" has an empty sheet name`);
  }
  const parts = rest.split(':');
  if (parts.length < 1 || parts.length > 2) throw new RangeError(`"${address}" is not an A1 address`);
  const corners = parts.map((part) => {
    const match = CELL.exec(part);
    if (!match || match[1] === undefined || match[2] === undefined) {
      throw new RangeError(`"${address}" is not an A1 address`);
    }
    const row = Number(match[2]) - 1;
    if (row < 0) throw new RangeError(`"${address}" has row 0`);
    return { row, column: columnIndex(match[1]) };
  });
  const a = corners[0] as CellPosition;
  const b = (corners[1] ?? corners[0]) as CellPosition;
  return {
    sheet,
    start: { row: Math.min(a.row, b.row), column: Math.min(a.column, b.column) },
    end: { row: Math.max(a.row, b.row), column: Math.max(a.column, b.column) },
  };
}

/**
 * The sheet name as a formula writes it: bare when it is a plain identifier, else in single quotes
 * with inner apostrophes doubled (Excel's rule). Cost O(length).
 * @example quoteSheet("Past tests") //=> "'Past tests'"; quoteSheet("Plan") //=> "Plan"
 */
export function quoteSheet(sheet: string): string {
  const plain = /^[A-Za-z_][A-Za-z0-9_.]*$/.test(sheet) && !/^[A-Za-z]{1,3}[0-9]+$/.test(sheet);
  return plain ? sheet : `'${sheet.replace(/'/g, "''")}'`;
}

/**
 * A reference to a local address as a formula on `fromSheet` should write it: unqualified on the same
 * sheet, else "Sheet!A1:B2" with the sheet quoted as needed. Cost O(length).
 * @example referenceFrom("Plan", "Past tests", "B2:B13") //=> "'Past tests'!B2:B13"
 */
export function referenceFrom(fromSheet: string, sheet: string, localAddress: string): string {
  return fromSheet === sheet ? localAddress : `${quoteSheet(sheet)}!${localAddress}`;
}

/**
 * Size of a parsed address. Cost O(1).
 * @example sizeOf(parseAddress("B2:D4")) //=> { rowCount: 3, columnCount: 3 }
 */
export function sizeOf(parsed: ParsedAddress): { rowCount: number; columnCount: number } {
  return { rowCount: parsed.end.row - parsed.start.row + 1, columnCount: parsed.end.column - parsed.start.column + 1 };
}
