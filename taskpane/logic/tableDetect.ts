/**
 * Reading a selected variant table: is the first row a header, which column holds the names, the
 * visitors and the conversions. One row per variant. Pure functions on the selection's values.
 *
 * Rules (our own, written down once):
 * - A cell counts as a number when it is a finite number (Excel gives numbers as numbers). Text that
 *   looks like a count ("10,050", "1 204") is *count-like*: it helps to find the columns, but it is
 *   flagged, and a read-out is refused until it is a number (the worksheet functions refuse text too).
 * - The first row is a header when it holds no numbers and at least one text cell while the rows
 *   below hold numbers.
 * - Blank rows at the end of the selection are ignored (people select spare rows).
 * - A count column has only whole numbers ≥ 0 (or count-like text) in its data rows. The names column
 *   is the first column whose data cells are all text that does not look like a number.
 * - Visitors and conversions: header words decide when they are clear ("visitors", "users",
 *   "sessions", "trials" / "conversions", "orders", "purchases", "sign-ups", "successes"), even when a
 *   few cells of such a column are not numbers (they are flagged). Otherwise the pair of count columns in
 *   which one is at least the other in every row, visitors being the larger: that is only a guess, and
 *   the panel asks the user to confirm it.
 * - Planned shares (for the split check): a further column of positive numbers whose heading says
 *   "share", "split", "weight" or "allocation"; without one the split is taken as planned equal.
 * - Work is linear in the cells read, and at most MAX_TABLE_ROWS rows are read: a variant table or a
 *   list of past results is far shorter. Problem lists are cut to MAX_LISTED items plus a count.
 */
import type { CellValue } from '../workbook/workbook';
import { variantLetter } from '../../functions/sheet/labels';

/** Which column (0-based within the selection) is which; names may be missing. */
export interface TableMapping {
  readonly hasHeader: boolean;
  readonly namesColumn: number | null;
  readonly visitorsColumn: number;
  readonly conversionsColumn: number;
  /** Planned traffic shares (any positive weights), or null for equal shares. */
  readonly sharesColumn: number | null;
}

/** A cell of a visitors, conversions or shares column that is not a number (row and column within the selection). */
export interface CellFlag {
  readonly row: number;
  readonly column: number;
  readonly problem: string;
}

/**
 * How sure the mapping is: 'headings' when the column headings name visitors and conversions, 'guess'
 * when it was inferred from the numbers alone (the user must confirm it).
 */
export type MappingBasis = 'headings' | 'guess';

/** A mapping with the data rows it covers, or the reason none was found. */
export type Detection =
  | {
      readonly ok: true;
      readonly mapping: TableMapping;
      readonly dataRows: number;
      readonly note: string;
      readonly basis: MappingBasis;
      /** Cells of the mapped columns that are not numbers (at most MAX_LISTED; `flagCount` counts all). */
      readonly flags: readonly CellFlag[];
      readonly flagCount: number;
    }
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

/** The most rows (header included) detection and checking read; a longer selection is refused. */
export const MAX_TABLE_ROWS = 5000;
/** The most columns detection looks at. */
export const MAX_TABLE_COLUMNS = 60;
/** The most problems or flags listed one by one; the rest are counted. */
export const MAX_LISTED = 8;

const VISITOR_WORDS = /visit|user|session|trial|traffic|exposure|sample|^n$/i;
const CONVERSION_WORDS = /conver|order|purchas|sign.?up|success|click|checkout|sale|buyer/i;
const SHARE_WORDS = /share|split|weight|allocation/i;
/** Text that reads as a whole number ≥ 0, with optional thousands separators (",", ".", space, apostrophe). */
const COUNT_TEXT = /^\s*\+?(\d{1,3}([,.\s\u00a0'’]\d{3})+|\d+)\s*$/;

function isNumber(v: CellValue | undefined): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}
function isBlank(v: CellValue | undefined): boolean {
  return v === undefined || v === '' || (typeof v === 'string' && v.trim() === '');
}
function isText(v: CellValue | undefined): v is string {
  return typeof v === 'string' && v.trim() !== '' && !v.startsWith('#');
}
function isWholeCount(v: CellValue | undefined): boolean {
  return isNumber(v) && Number.isInteger(v) && v >= 0;
}
function isCountText(v: CellValue | undefined): v is string {
  return typeof v === 'string' && COUNT_TEXT.test(v);
}
/** The count a count-like text stands for (for telling visitors from conversions), else NaN. */
function countOf(v: CellValue | undefined): number {
  if (isNumber(v)) return v;
  if (isCountText(v)) return Number(v.replace(/[^\d]/g, ''));
  return Number.NaN;
}

/** What a cell is, in words, for messages: `text "10,050"`, `TRUE`, `an empty cell`, `the error #N/A`. */
export function describeCell(v: CellValue | undefined): string {
  if (v === undefined || isBlank(v)) return 'an empty cell';
  if (typeof v === 'boolean') return v ? 'TRUE' : 'FALSE';
  if (typeof v === 'number') return String(v);
  const shown = v.length > 24 ? `${v.slice(0, 23)}…` : v;
  return v.startsWith('#') ? `the error ${shown}` : `the text "${shown}"`;
}

/** Why a count cell is refused, or null when it is fine. */
function countProblem(v: CellValue | undefined, what: 'visitors' | 'conversions', minimum: number): string | null {
  if (isNumber(v)) {
    if (Number.isInteger(v) && v >= minimum) return null;
    return `${what} ${v} is not a whole number ≥ ${minimum}`;
  }
  if (isCountText(v)) return `${what} is ${describeCell(v)}, not a number: type it as a number (or use =VALUE())`;
  return `${what} is ${describeCell(v)}, not a whole number ≥ ${minimum}`;
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

/** "3 more" helper for cut lists. */
function cut(items: string[], total: number, noun: string): string[] {
  if (total <= items.length) return items;
  return [...items, `and ${(total - items.length).toLocaleString('en-US')} more ${noun}`];
}

/**
 * Guess the table's mapping from its values. Cost O(rows · columns + countColumns² · rows), with rows ≤
 * MAX_TABLE_ROWS and columns ≤ MAX_TABLE_COLUMNS.
 * Never throws; returns { ok: false, problem } when the selection is not a variant table.
 * @example detectTable([["Variant","Visitors","Conversions"],["A",1000,50],["B",1000,61]]).mapping
 * //=> { hasHeader: true, namesColumn: 0, visitorsColumn: 1, conversionsColumn: 2, sharesColumn: null }
 */
export function detectTable(values: readonly (readonly CellValue[])[]): Detection {
  if (values.length > MAX_TABLE_ROWS) {
    return {
      ok: false,
      problem: `the selection has more than ${MAX_TABLE_ROWS.toLocaleString('en-US')} rows; select only the table (one row per variant, or per past result)`,
    };
  }
  const rows = usedRows(values);
  let columns = 0;
  for (let r = 0; r < rows; r += 1) columns = Math.max(columns, (values[r] ?? []).length);
  if (columns > MAX_TABLE_COLUMNS) {
    return {
      ok: false,
      problem: `the selection has more than ${MAX_TABLE_COLUMNS} columns; select only the table's columns`,
    };
  }
  if (rows === 0 || columns < 2) {
    return {
      ok: false,
      problem: 'select the variant table: one row per variant with visitors and conversions columns',
    };
  }
  const first = values[0] ?? [];
  const firstHasNumber = first.some((v) => isNumber(v));
  let laterHaveNumbers = false;
  for (let r = 1; r < rows && !laterHaveNumbers; r += 1)
    laterHaveNumbers = (values[r] ?? []).some((v) => isNumber(v) || isCountText(v));
  const hasHeader = !firstHasNumber && first.some((v) => isText(v) && !isCountText(v)) && laterHaveNumbers;
  const start = hasHeader ? 1 : 0;
  const dataRows = rows - start;
  if (dataRows < 2) {
    return {
      ok: false,
      problem: 'a read-out needs at least two variants (two data rows): the control first, then the challengers',
    };
  }
  // Each column once, as counts (NaN where not count-like) and as a summary: O(rows · columns).
  const counts: Float64Array[] = [];
  const whole: number[] = [];
  const countLike: number[] = [];
  let namesColumn: number | null = null;
  for (let c = 0; c < columns; c += 1) {
    const column = new Float64Array(dataRows);
    let nWhole = 0;
    let nLike = 0;
    let allNames = true;
    for (let r = 0; r < dataRows; r += 1) {
      const v = (values[start + r] ?? [])[c];
      const n = countOf(v);
      column[r] = n;
      if (isWholeCount(v)) nWhole += 1;
      if (!Number.isNaN(n) && Number.isInteger(n) && n >= 0) nLike += 1;
      if (!isText(v) || isCountText(v)) allNames = false;
    }
    counts.push(column);
    whole.push(nWhole);
    countLike.push(nLike);
    if (namesColumn === null && allNames) namesColumn = c;
  }
  const header = (c: number): string => (hasHeader && typeof first[c] === 'string' ? (first[c] as string).trim() : '');
  // Count columns: every data cell count-like. Headed columns: at least half of their cells count-like.
  const countColumns: number[] = [];
  for (let c = 0; c < columns; c += 1) if (countLike[c] === dataRows) countColumns.push(c);
  const headed = (words: RegExp): number[] => {
    const out: number[] = [];
    for (let c = 0; c < columns; c += 1) if (words.test(header(c)) && 2 * (countLike[c] ?? 0) >= dataRows) out.push(c);
    return out;
  };
  const visitorHeaders = headed(VISITOR_WORDS);
  const conversionHeaders = headed(CONVERSION_WORDS).filter((c) => !visitorHeaders.includes(c));
  const dominates = (big: number, small: number): boolean => {
    const a = counts[big] as Float64Array;
    const b = counts[small] as Float64Array;
    for (let r = 0; r < dataRows; r += 1) if (!((a[r] as number) >= (b[r] as number))) return false;
    return true;
  };
  const sharesFor = (visitorsColumn: number, conversionsColumn: number): number | null => {
    if (!hasHeader) return null;
    for (let c = 0; c < columns; c += 1) {
      if (c === visitorsColumn || c === conversionsColumn || !SHARE_WORDS.test(header(c))) continue;
      let positive = true;
      for (let r = 0; r < dataRows && positive; r += 1) {
        const v = (values[start + r] ?? [])[c];
        positive = isNumber(v) && v > 0;
      }
      if (positive) return c;
    }
    return null;
  };
  const flagsFor = (visitorsColumn: number, conversionsColumn: number): { flags: CellFlag[]; count: number } => {
    const flags: CellFlag[] = [];
    let count = 0;
    for (let r = 0; r < dataRows; r += 1) {
      const row = values[start + r] ?? [];
      for (const [c, what, minimum] of [
        [visitorsColumn, 'visitors', 1],
        [conversionsColumn, 'conversions', 0],
      ] as const) {
        const problem = countProblem(row[c], what, minimum);
        if (problem === null) continue;
        count += 1;
        if (flags.length < MAX_LISTED) flags.push({ row: start + r, column: c, problem });
      }
    }
    return { flags, count };
  };
  const found = (visitorsColumn: number, conversionsColumn: number, basis: MappingBasis, note: string): Detection => {
    const { flags, count } = flagsFor(visitorsColumn, conversionsColumn);
    return {
      ok: true,
      mapping: {
        hasHeader,
        namesColumn,
        visitorsColumn,
        conversionsColumn,
        sharesColumn: sharesFor(visitorsColumn, conversionsColumn),
      },
      dataRows,
      note,
      basis,
      flags,
      flagCount: count,
    };
  };

  const v0 = visitorHeaders[0];
  const c0 = conversionHeaders[0];
  if (visitorHeaders.length === 1 && conversionHeaders.length === 1 && v0 !== undefined && c0 !== undefined) {
    const { count } = flagsFor(v0, c0);
    const heads = `columns chosen by their headings ("${header(v0)}", "${header(c0)}")`;
    const note =
      count > 0
        ? `${heads}, but ${count === 1 ? 'one of their cells is' : `${count.toLocaleString('en-US')} of their cells are`} not a whole number: see below`
        : dominates(v0, c0)
          ? heads
          : `${heads}, but some rows have more conversions than visitors: check the mapping`;
    return found(v0, c0, 'headings', note);
  }
  if (countColumns.length < 2) {
    return {
      ok: false,
      problem:
        'found fewer than two columns of whole numbers ≥ 0; the table needs a visitors column and a conversions column',
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
        const others =
          countColumns.length > 2 ? `; ${countColumns.length} columns hold counts, so check which is which` : '';
        return found(
          aBig ? a : b,
          aBig ? b : a,
          'guess',
          `a guess from the numbers: visitors taken as the column that is at least the other in every row${others}`,
        );
      }
    }
  }
  return {
    ok: false,
    problem:
      'could not tell the visitors column from the conversions column (neither is at least the other in every row); set them below',
  };
}

/**
 * Check a mapping (detected or set by the user) against the values and pull out the variants.
 * Cost O(rows), rows ≤ MAX_TABLE_ROWS. Never throws; lists the first MAX_LISTED problems and counts the
 * rest (row numbers counted within the selection, from 1).
 * @example checkTable([["A",1000,50],["B",1000,61]], { hasHeader: false, namesColumn: 0, visitorsColumn: 1, conversionsColumn: 2, sharesColumn: null })
 * //=> { ok: true, names: ["A","B"], visitors: [1000,1000], conversions: [50,61], shares: null, firstRow: 0, lastRow: 1 }
 */
export function checkTable(values: readonly (readonly CellValue[])[], mapping: TableMapping): CheckedTable {
  if (values.length > MAX_TABLE_ROWS) {
    return {
      ok: false,
      problems: [`the selection has more than ${MAX_TABLE_ROWS.toLocaleString('en-US')} rows; select only the table`],
    };
  }
  const rows = usedRows(values);
  const start = mapping.hasHeader ? 1 : 0;
  const problems: string[] = [];
  let problemCount = 0;
  const problem = (text: string): void => {
    problemCount += 1;
    if (problems.length < MAX_LISTED) problems.push(text);
  };
  if (mapping.visitorsColumn === mapping.conversionsColumn)
    problem('visitors and conversions must be different columns');
  const names: string[] = [];
  const visitors: number[] = [];
  const conversions: number[] = [];
  const shares: number[] = [];
  for (let r = start; r < rows; r += 1) {
    const row = values[r] ?? [];
    const n = row[mapping.visitorsColumn];
    const x = row[mapping.conversionsColumn];
    const label = `row ${r + 1}`;
    const visitorsProblem = countProblem(n, 'visitors', 1);
    const conversionsProblem = countProblem(x, 'conversions', 0);
    if (visitorsProblem !== null) problem(`${label}: ${visitorsProblem}`);
    if (conversionsProblem !== null) problem(`${label}: ${conversionsProblem}`);
    if (isNumber(n) && isNumber(x) && x > n) problem(`${label}: ${x} conversions is more than ${n} visitors`);
    const rawName = mapping.namesColumn === null ? undefined : row[mapping.namesColumn];
    if (mapping.sharesColumn !== null) {
      const share = row[mapping.sharesColumn];
      if (!isNumber(share) || share <= 0)
        problem(`${label}: planned share ${isNumber(share) ? share : describeCell(share)} is not a number above 0`);
      shares.push(isNumber(share) ? share : NaN);
    }
    names.push(rawName === undefined || isBlank(rawName) ? variantLetter(r - start) : String(rawName));
    visitors.push(isNumber(n) ? n : NaN);
    conversions.push(isNumber(x) ? x : NaN);
  }
  if (visitors.length < 2) problem('a read-out needs at least two variants');
  if (visitors.length > 50)
    problem(`at most 50 variants (the selection has ${visitors.length.toLocaleString('en-US')} data rows)`);
  if (problemCount > 0) return { ok: false, problems: cut(problems, problemCount, 'problems of the same kinds') };
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
