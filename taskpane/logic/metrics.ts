/**
 * The metric kinds a read-out can be about, and reading their columns from a selected table (one row per
 * variant). Pure functions on the selection's values.
 *
 * Kinds and the columns each needs (our own grouping, after the worksheet function families):
 * - conversions: visitors, conversions;
 * - revenue per visitor from totals: orders (the conversions column), visitors, revenue, optional order sd;
 * - averages: count, mean, sd (of a per-visitor or per-unit value);
 * - counts per exposure: events, exposure (sessions, user-days…).
 * Columns are proposed from the headings (words below, the more specific first: "Order sd" is the order sd,
 * not the sd of an average; "Revenue mean" is a mean, not revenue); the user can set each. The kind is
 * proposed from what the headings provide: revenue totals, then conversions, then averages, then counts.
 * Work is linear in the cells read (at most MAX_TABLE_ROWS rows, as tableDetect.ts).
 */
import type { CellValue } from '../workbook/workbook';
import { variantLetter } from '../../functions/sheet/labels';
import { describeCell, MAX_LISTED, MAX_TABLE_ROWS, usedRows, type TableMapping } from './tableDetect';

/** What a read-out is about. */
export type MetricKind = 'conversions' | 'revenue' | 'averages' | 'counts';

/** A column a metric kind reads. */
export type MetricRole =
  'visitors' | 'conversions' | 'revenue' | 'orderSd' | 'count' | 'mean' | 'sd' | 'events' | 'exposure';

/** The kinds in the order the panel lists them. */
export const METRIC_KINDS: readonly MetricKind[] = ['conversions', 'revenue', 'averages', 'counts'];

/** The kind's name in the panel and in the block's title. */
export const KIND_NAMES: Readonly<Record<MetricKind, string>> = {
  conversions: 'Conversions',
  revenue: 'Revenue per visitor (from totals)',
  averages: 'Averages (count, mean, sd)',
  counts: 'Counts per exposure',
};

/** The metric's short name in sentences ("revenue per visitor no worse than −2%"). */
export const KIND_SHORT: Readonly<Record<MetricKind, string>> = {
  conversions: 'conversion rate',
  revenue: 'revenue per visitor',
  averages: 'average',
  counts: 'event rate',
};

/** The columns each kind needs, then its optional ones. */
export const KIND_ROLES: Readonly<
  Record<MetricKind, { required: readonly MetricRole[]; optional: readonly MetricRole[] }>
> = {
  conversions: { required: ['visitors', 'conversions'], optional: [] },
  revenue: { required: ['conversions', 'visitors', 'revenue'], optional: ['orderSd'] },
  averages: { required: ['count', 'mean', 'sd'], optional: [] },
  // Counts per exposure: users or visitors (the assigned units) only for the split check (metricFormulas.ts).
  counts: { required: ['events', 'exposure'], optional: ['visitors'] },
};

/** A column's name in the panel, per kind where the same column means different things. */
export function roleName(role: MetricRole, kind: MetricKind): string {
  switch (role) {
    case 'conversions':
      return kind === 'revenue' ? 'Orders' : 'Conversions';
    case 'orderSd':
      return 'Order sd (optional)';
    case 'visitors':
      return kind === 'counts' ? 'Users or visitors (optional, for the split check)' : 'Visitors';
    case 'sd':
      return 'Standard deviation';
    default:
      return role.charAt(0).toUpperCase() + role.slice(1);
  }
}

/** Heading words of a visitors (or users) column; not "User-days" or "Visitor sessions", which are exposure. */
const VISITOR_WORDS = /^(?!.*(day|hour|week|session|exposure|time)).*(visit|user|traffic|^n$|trial)/i;
/** Heading words of a conversions (or orders) column. */
const CONVERSION_WORDS = /conver|order|purchas|sign.?up|success|checkout|buyer/i;

/** Heading words per column, tried in this order so the more specific wins (each column is used once). */
const ROLE_WORDS: readonly [MetricRole, RegExp][] = [
  ['orderSd', /(order|basket|ticket).*(\bsd\b|s\.d|std|stdev|deviation)|(\bsd\b|std|stdev|deviation).*order/i],
  ['sd', /\bsd\b|s\.d\.|std|stdev|deviation/i],
  ['mean', /mean|average|avg/i],
  ['count', /count|^n$|sample size/i],
  ['revenue', /revenue|sales|amount|turnover|income|gmv|value/i],
  ['visitors', VISITOR_WORDS],
  ['conversions', CONVERSION_WORDS],
  ['events', /event|adds?\b|refund|return|complaint|error|click|call|view|contact|ticket/i],
  ['exposure', /exposure|session|day|hour|week|duration|time/i],
];

/** Which column (0-based within the selection) holds each role, or null. */
export type RoleColumns = Readonly<Record<MetricRole, number | null>>;

/** The table's shape and its proposed columns. */
export interface MetricDetection {
  readonly hasHeader: boolean;
  readonly namesColumn: number | null;
  readonly columns: RoleColumns;
  /** The kinds whose required columns were all found, in METRIC_KINDS order. */
  readonly available: readonly MetricKind[];
  /**
   * The kind proposed: revenue totals when found, counts when the guessed conversions column is headed as
   * events, else the first available; null when none is.
   */
  readonly proposed: MetricKind | null;
}

function isNumber(v: CellValue | undefined): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}
function isText(v: CellValue | undefined): v is string {
  return typeof v === 'string' && v.trim() !== '' && !v.startsWith('#') && !/^[\s\d.,+-]+$/.test(v);
}

/** The kinds whose required columns are all set. */
export function availableKinds(columns: RoleColumns): MetricKind[] {
  return METRIC_KINDS.filter((kind) => KIND_ROLES[kind].required.every((role) => columns[role] !== null));
}

/**
 * Proposes the columns of every metric kind from the headings, using the conversions mapping of
 * tableDetect.ts (which also looks at the numbers) for visitors and conversions when it found one.
 * Cost O(rows · columns) with rows ≤ MAX_TABLE_ROWS. Never throws.
 * @example detectMetrics([["Variant","Orders","Visitors","Revenue"],["A",40,1000,2400],["B",52,1010,2990]], null).proposed //=> "revenue"
 */
export function detectMetrics(
  values: readonly (readonly CellValue[])[],
  mapping: TableMapping | null,
): MetricDetection {
  const rows = Math.min(usedRows(values), MAX_TABLE_ROWS);
  const first = values[0] ?? [];
  let width = 0;
  for (let r = 0; r < rows; r += 1) width = Math.max(width, (values[r] ?? []).length);
  const hasHeader = mapping?.hasHeader ?? (!first.some(isNumber) && first.some(isText) && rows > 1);
  const start = hasHeader ? 1 : 0;
  let namesColumn: number | null = mapping?.namesColumn ?? null;
  if (mapping === null) {
    for (let c = 0; c < width && namesColumn === null; c += 1) {
      let all = rows > start;
      for (let r = start; r < rows && all; r += 1) all = isText((values[r] ?? [])[c]);
      if (all) namesColumn = c;
    }
  }
  const columns: Record<MetricRole, number | null> = {
    visitors: null,
    conversions: null,
    revenue: null,
    orderSd: null,
    count: null,
    mean: null,
    sd: null,
    events: null,
    exposure: null,
  };
  const taken = new Set<number>(namesColumn === null ? [] : [namesColumn]);
  if (mapping !== null) {
    columns.visitors = mapping.visitorsColumn;
    columns.conversions = mapping.conversionsColumn;
    if (mapping.sharesColumn !== null) taken.add(mapping.sharesColumn);
  }
  if (hasHeader) {
    for (const [role, words] of ROLE_WORDS) {
      if (columns[role] !== null) continue;
      for (let c = 0; c < width; c += 1) {
        const heading = first[c];
        // The columns tableDetect guessed from the numbers may be events ("Complaints") and exposure
        // ("User-days"): those roles may take them when the heading says so and not the guessed role.
        const text = typeof heading === 'string' ? heading.trim() : '';
        const mayTake =
          (role === 'events' && c === columns.conversions && !CONVERSION_WORDS.test(text)) ||
          (role === 'exposure' && c === columns.visitors && !VISITOR_WORDS.test(text));
        if (!mayTake && (taken.has(c) || c === columns.visitors || c === columns.conversions)) continue;
        if (typeof heading === 'string' && words.test(heading.trim())) {
          columns[role] = c;
          taken.add(c);
          break;
        }
      }
    }
  }
  // Exposure took the guessed visitors column: the table has no visitors (a split check must not count exposure).
  if (columns.exposure !== null && columns.exposure === columns.visitors) columns.visitors = null;
  const available = availableKinds(columns);
  const eventsNotConversions = columns.events !== null && columns.events === columns.conversions;
  const proposed = available.includes('revenue') ? 'revenue' : eventsNotConversions ? 'counts' : (available[0] ?? null);
  return { hasHeader, namesColumn, columns, available, proposed };
}

/** The variants' values of the roles a read-out uses, with their names. */
export type CheckedMetrics =
  | {
      readonly ok: true;
      readonly names: string[];
      readonly values: Readonly<Partial<Record<MetricRole, number[]>>>;
      readonly firstRow: number;
      readonly lastRow: number;
    }
  | { readonly ok: false; readonly problems: string[] };

/** Why a role's cell is refused (null when fine). */
function roleProblem(role: MetricRole, v: CellValue | undefined, kind: MetricKind): string | null {
  const what = roleName(role, kind)
    .replace(/ \(optional[^)]*\)$/, '')
    .toLowerCase();
  if (!isNumber(v)) return `${what} is ${describeCell(v)}, not a number`;
  switch (role) {
    case 'visitors':
      return Number.isInteger(v) && v >= 1 ? null : `${what} ${v} is not a whole number ≥ 1`;
    case 'conversions':
    case 'events':
      return Number.isInteger(v) && v >= 0 ? null : `${what} ${v} is not a whole number ≥ 0`;
    case 'count':
      return Number.isInteger(v) && v >= 2 ? null : `${what} ${v} is not a whole number ≥ 2`;
    case 'revenue':
    case 'orderSd':
    case 'sd':
      return v >= 0 ? null : `${what} ${v} is below 0`;
    case 'exposure':
      return v > 0 ? null : `${what} ${v} is not above 0`;
    case 'mean':
      return null;
  }
}

/**
 * Checks the columns the given kinds use (the primary metric's and its guardrails') and pulls out the
 * variants. Cost O(rows · roles), rows ≤ MAX_TABLE_ROWS. Never throws; lists the first MAX_LISTED problems
 * and counts the rest (rows counted within the selection, from 1).
 * @example checkMetrics(values, detection, ['revenue']).values.revenue //=> [2400, 2990]
 */
export function checkMetrics(
  values: readonly (readonly CellValue[])[],
  table: Pick<MetricDetection, 'hasHeader' | 'namesColumn' | 'columns'>,
  kinds: readonly MetricKind[],
): CheckedMetrics {
  const problems: string[] = [];
  let count = 0;
  const problem = (text: string): void => {
    count += 1;
    if (problems.length < MAX_LISTED) problems.push(text);
  };
  if (values.length > MAX_TABLE_ROWS) {
    return {
      ok: false,
      problems: [`the selection has more than ${MAX_TABLE_ROWS.toLocaleString('en-US')} rows; select only the table`],
    };
  }
  const rows = usedRows(values);
  const start = table.hasHeader ? 1 : 0;
  const used: [MetricRole, MetricKind][] = [];
  for (const kind of kinds) {
    for (const role of [...KIND_ROLES[kind].required, ...KIND_ROLES[kind].optional]) {
      if (used.some(([r]) => r === role)) continue;
      const optional = KIND_ROLES[kind].optional.includes(role);
      if (table.columns[role] === null) {
        if (!optional) problem(`set the ${roleName(role, kind).toLowerCase()} column (${KIND_SHORT[kind]})`);
        continue;
      }
      used.push([role, kind]);
    }
  }
  const seen = new Map<number, MetricRole>();
  for (const [role, kind] of used) {
    const c = table.columns[role] as number;
    const other = seen.get(c);
    if (other !== undefined) problem(`${roleName(other, kind)} and ${roleName(role, kind)} are the same column`);
    seen.set(c, role);
  }
  const out: Partial<Record<MetricRole, number[]>> = {};
  for (const [role] of used) out[role] = [];
  const names: string[] = [];
  for (let r = start; r < rows; r += 1) {
    const row = values[r] ?? [];
    for (const [role, kind] of used) {
      const v = row[table.columns[role] as number];
      const text = roleProblem(role, v, kind);
      if (text !== null) problem(`row ${r + 1}: ${text}`);
      (out[role] as number[]).push(isNumber(v) ? v : Number.NaN);
    }
    const x = row[table.columns.conversions ?? -1];
    const n = row[table.columns.visitors ?? -1];
    if (out.conversions !== undefined && out.visitors !== undefined && isNumber(x) && isNumber(n) && x > n) {
      problem(`row ${r + 1}: ${x} ${kinds.includes('revenue') ? 'orders' : 'conversions'} is more than ${n} visitors`);
    }
    const raw = table.namesColumn === null ? undefined : row[table.namesColumn];
    names.push(raw === undefined || raw === '' ? variantLetter(r - start) : String(raw));
  }
  if (names.length < 2) problem('a read-out needs at least two variants');
  if (names.length > 50)
    problem(`at most 50 variants (the selection has ${names.length.toLocaleString('en-US')} data rows)`);
  if (count > 0) {
    if (count > problems.length)
      problems.push(`and ${(count - problems.length).toLocaleString('en-US')} more problems of the same kinds`);
    return { ok: false, problems };
  }
  return { ok: true, names, values: out, firstRow: start, lastRow: rows - 1 };
}

/** An order sd this many times the average order value or more is warned about (our own rule of thumb). */
export const ORDER_SD_WARNING_RATIO = 3;

/**
 * The variants whose given order sd is far above their average order value (revenue / orders): a few very
 * large orders then carry the average, and revenue per visitor is uncertain and sensitive to them.
 * Cost O(variants).
 * @example orderSdWarnings(['A','B'], [10, 12], [500, 600], [40, 300]) //=> ['B: order sd 300 is 6.0 × the average order value 50']
 */
export function orderSdWarnings(
  names: readonly string[],
  orders: readonly number[],
  revenue: readonly number[],
  orderSd: readonly number[],
): string[] {
  const out: string[] = [];
  names.forEach((name, i) => {
    const o = orders[i] as number;
    const sd = orderSd[i] as number;
    const average = (revenue[i] as number) / o;
    if (!(o > 0) || !(average > 0) || !(sd >= ORDER_SD_WARNING_RATIO * average)) return;
    out.push(
      `${name}: order sd ${+sd.toPrecision(6)} is ${(sd / average).toFixed(1)} × the average order value ${+average.toPrecision(6)}`,
    );
  });
  return out;
}
