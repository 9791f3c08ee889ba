/**
 * Reading a selected variant table: is the first row a header, which column holds the names, the
 * visitors and the conversions. One row per variant. Pure functions on the selection's values.
 *
 * Rules (our own, written down once):
 * - A cell counts as a number when it is a finite number (Excel gives numbers as numbers).
 * - The first row is a header when it holds no numbers and at least one text cell while the rows
 *   below hold numbers.
 * - Blank rows at the end of the selection are ignored (people select spare rows).
 * - A count column has only whole numbers ≥ 0 in its data rows. The names column is the first column
 *   whose data cells are all text.
 * - Visitors and conversions: header words decide when they are clear ("visitors", "users",
 *   "sessions", "trials" / "conversions", "orders", "purchases", "sign-ups", "successes"); otherwise the
 *   pair of count columns in which one is at least the other in every row, visitors being the larger.
 * - Planned shares (for the split check): a further column of positive numbers whose heading says
 *   "share", "split", "weight" or "allocation"; without one the split is taken as planned equal.
 */
import type { CellValue } from '../workbook/workbook';

/** Which column (0-based within the selection) is which; names may be missing. */
export interface TableMapping {
  readonly hasHeader: boolean;
  readonly namesColumn: number | null;
  readonly visitorsColumn: number;
  readonly conversionsColumn: number;
  /** Planned traffic shares (any positive weights), or null for equal shares. */
  readonly sharesColumn: number | null;
}

/** A mapping with the data rows it covers, or the reason none was found. */
export type Detection =
  | { readonly ok: true; readonly mapping: TableMapping; readonly dataRows: number; readonly note: string }
  | { readonly ok: false; readonly problem: string };

/** A checked table: names and counts per variant, or the problems that stop a read-out. */
export type CheckedTable =
  | {
      readonly ok: true;
      readonly names: string[];
      readonly visitors: number[];
      readonly conversions: number[];
      /** Planned shares per variant, or null for equal shares. */
      readonly shares: number[] | null;
      /** 0-based row offsets (within the selection) of the first and last data rows. */
      readonly firstRow: number;
      readonly lastRow: number;
    }
  | { readonly ok: false; readonly problems: string[] };

const VISITOR_WORDS = /visit|user|session|trial|traffic|exposure|sample|^n$/i;
const CONVERSION_WORDS = /conver|order|purchas|sign.?up|success|click|checkout|sale|buyer/i;
const SHARE_WORDS = /share|split|weight|allocation/i;

function isNumber(v: CellValue | undefined): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}
function isBlank(v: CellValue | undefined): boolean {
  return v === undefined || v === '' || (typeof v === 'string' && v.trim() === '');
}
function isText(v: CellValue | undefined): v is string {
  return typeof v === 'string' && v.trim() !== '' && !v.startsWith('#');
}

/**
 * Number of rows to use: trailing rows that are blank in every cell are dropped. Cost O(cells).
 * @example usedRows([[1, 2], ["", ""]]) //=> 1
 */
export function usedRows(values: readonly (readonly CellValue[])[]): number {
  let n = values.length;
  while (n > 0 && (values[n - 1] ?? []).every((v) => isBlank(v))) n -= 1;
  return n;
}

/**
 * Guess the table's mapping from its values. Cost O(rows · columns²).
 * Never throws; returns { ok: false, problem } when the selection is not a variant table.
 * @example detectTable([["Variant","Visitors","Conversions"],["A",1000,50],["B",1000,61]]).mapping
 * //=> { hasHeader: true, namesColumn: 0, visitorsColumn: 1, conversionsColumn: 2, sharesColumn: null }
 */
export function detectTable(values: readonly (readonly CellValue[])[]): Detection {
  const rows = usedRows(values);
  const columns = Math.max(0, ...values.slice(0, rows).map((row) => row.length));
  if (rows === 0 || columns < 2) {
    return { ok: false, problem: 'select the variant table: one row per variant with visitors and conversions columns' };
  }
  const first = values[0] ?? [];
  const firstHasNumber = first.some((v) => isNumber(v));
  const laterHaveNumbers = values.slice(1, rows).some((row) => row.some((v) => isNumber(v)));
  const hasHeader = !firstHasNumber && first.some((v) => isText(v)) && laterHaveNumbers;
  const start = hasHeader ? 1 : 0;
  const dataRows = rows - start;
  if (dataRows < 2) {
    return { ok: false, problem: 'a read-out needs at least two variants (two data rows): the control first, then the challengers' };
  }
  const data = values.slice(start, rows);
  const column = (c: number): CellValue[] => data.map((row) => row[c] ?? '');
  const countColumns: number[] = [];
  let namesColumn: number | null = null;
  for (let c = 0; c < columns; c += 1) {
    const cells = column(c);
    if (cells.every((v) => isNumber(v) && Number.isInteger(v) && v >= 0)) countColumns.push(c);
    else if (namesColumn === null && cells.every((v) => isText(v))) namesColumn = c;
  }
  if (countColumns.length < 2) {
    return {
      ok: false,
      problem: 'found fewer than two columns of whole numbers ≥ 0; the table needs a visitors column and a conversions column',
    };
  }
  const header = (c: number): string => (hasHeader && typeof first[c] === 'string' ? (first[c] as string) : '');
  const byWords = (words: RegExp): number[] => countColumns.filter((c) => words.test(header(c)));
  const visitorHeaders = byWords(VISITOR_WORDS);
  const conversionHeaders = byWords(CONVERSION_WORDS).filter((c) => !visitorHeaders.includes(c));
  const dominates = (big: number, small: number): boolean =>
    column(big).every((v, r) => (v as number) >= (column(small)[r] as number));

  const sharesFor = (visitorsColumn: number, conversionsColumn: number): number | null => {
    if (!hasHeader) return null;
    for (let c = 0; c < columns; c += 1) {
      if (c === visitorsColumn || c === conversionsColumn || !SHARE_WORDS.test(header(c))) continue;
      if (column(c).every((v) => isNumber(v) && v > 0)) return c;
    }
    return null;
  };
  const v0 = visitorHeaders[0];
  const c0 = conversionHeaders[0];
  if (visitorHeaders.length === 1 && conversionHeaders.length === 1 && v0 !== undefined && c0 !== undefined) {
    const note = dominates(v0, c0)
      ? `columns chosen by their headings ("${header(v0)}", "${header(c0)}")`
      : `columns chosen by their headings, but some rows have more conversions than visitors: check the mapping`;
    return {
      ok: true,
      mapping: { hasHeader, namesColumn, visitorsColumn: v0, conversionsColumn: c0, sharesColumn: sharesFor(v0, c0) },
      dataRows,
      note,
    };
  }
  // No clear headings: the first pair of count columns, left to right, where one dominates the other.
  for (let i = 0; i < countColumns.length; i += 1) {
    for (let j = i + 1; j < countColumns.length; j += 1) {
      const a = countColumns[i] as number;
      const b = countColumns[j] as number;
      const aBig = dominates(a, b);
      const bBig = dominates(b, a);
      if (aBig !== bBig) {
        const visitorsColumn = aBig ? a : b;
        const conversionsColumn = aBig ? b : a;
        return {
          ok: true,
          mapping: { hasHeader, namesColumn, visitorsColumn, conversionsColumn, sharesColumn: sharesFor(visitorsColumn, conversionsColumn) },
          dataRows,
          note: 'visitors taken as the column that is at least the other in every row',
        };
      }
    }
  }
  return {
    ok: false,
    problem: 'could not tell the visitors column from the conversions column (neither is at least the other in every row); set them below',
  };
}

/**
 * Check a mapping (detected or set by the user) against the values and pull out the variants.
 * Cost O(rows). Never throws; lists every problem found (row numbers counted within the selection, from 1).
 * @example checkTable([["A",1000,50],["B",1000,61]], { hasHeader: false, namesColumn: 0, visitorsColumn: 1, conversionsColumn: 2, sharesColumn: null })
 * //=> { ok: true, names: ["A","B"], visitors: [1000,1000], conversions: [50,61], shares: null, firstRow: 0, lastRow: 1 }
 */
export function checkTable(values: readonly (readonly CellValue[])[], mapping: TableMapping): CheckedTable {
  const rows = usedRows(values);
  const start = mapping.hasHeader ? 1 : 0;
  const problems: string[] = [];
  if (mapping.visitorsColumn === mapping.conversionsColumn) problems.push('visitors and conversions must be different columns');
  const names: string[] = [];
  const visitors: number[] = [];
  const conversions: number[] = [];
  const shares: number[] = [];
  for (let r = start; r < rows; r += 1) {
    const row = values[r] ?? [];
    const n = row[mapping.visitorsColumn];
    const x = row[mapping.conversionsColumn];
    const label = `row ${r + 1}`;
    if (!isNumber(n) || !Number.isInteger(n) || n < 1) problems.push(`${label}: visitors ${JSON.stringify(n ?? '')} is not a whole number ≥ 1`);
    if (!isNumber(x) || !Number.isInteger(x) || x < 0) problems.push(`${label}: conversions ${JSON.stringify(x ?? '')} is not a whole number ≥ 0`);
    if (isNumber(n) && isNumber(x) && x > n) problems.push(`${label}: ${x} conversions is more than ${n} visitors`);
    const rawName = mapping.namesColumn === null ? undefined : row[mapping.namesColumn];
    if (mapping.sharesColumn !== null) {
      const share = row[mapping.sharesColumn];
      if (!isNumber(share) || share <= 0) problems.push(`${label}: planned share ${JSON.stringify(share ?? '')} is not a number above 0`);
      shares.push(isNumber(share) ? share : NaN);
    }
    names.push(rawName === undefined || isBlank(rawName) ? String.fromCharCode(65 + ((r - start) % 26)) : String(rawName));
    visitors.push(isNumber(n) ? n : NaN);
    conversions.push(isNumber(x) ? x : NaN);
  }
  if (visitors.length < 2) problems.push('a read-out needs at least two variants');
  if (visitors.length > 50) problems.push('at most 50 variants');
  if (problems.length > 0) return { ok: false, problems };
  return {
    ok: true,
    names,
    visitors,
    conversions,
    shares: mapping.sharesColumn === null ? null : shares,
    firstRow: start,
    lastRow: rows - 1,
  };
}
