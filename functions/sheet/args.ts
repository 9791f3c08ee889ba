/**
 * Reading a worksheet function's arguments and shaping its result from its catalogue entry, so that a
 * wrapper is one call:
 *
 *   runFunction(CATALOGUE.RATE_INTERVAL, { conversions, visitors, level, prior_alpha, prior_beta, method }, (a) =>
 *     intervalRows(conversion.rateInterval(a.variants, a.level, a.prior, a.method, POSTERIOR_TABLES)));
 *
 * The argument names are checked by the compiler against the entry's parameters, and `a` is typed from
 * them: a number with a default is a `number`, a choice is its words, the ranges become `table` and
 * `variants` (one object per variant with a field per range), a prior pair becomes `prior`.
 *
 * Arguments are read in the entry's order: the ranges first (as one variant table), then each other
 * parameter in turn, so the first problem reported is the first one in the formula.
 */
import type { BetaPrior, DensityTable, GammaPrior } from '../stats/types';
import type { FunctionEntry, Param, SpillShape } from './entry';
import { readBetaPrior, readGammaPrior } from './readers';
import { checkNumber, readChoice, readOptionalNumber, readRequiredNumber, type NumberRule } from './rules';
import { runSheet } from './run';
import {
  finite,
  spillBlock,
  spillBlockVersusControl,
  spillDensity,
  spillPerVariant,
  spillVersusControl,
  type OutputCell,
} from './spill';
import { readAlignedCells, readVariants, type VariantTable } from './variants';
import { readDays, readList, spillByDay, type DayTable } from './days';

type ParamOf<E extends FunctionEntry> = E['params'][number];
type OfKind<E extends FunctionEntry, K extends Param['kind']> = Extract<ParamOf<E>, { readonly kind: K }>;

/** What a wrapper passes: every parameter by its name, as Excel gave it. */
export type ArgInput<E extends FunctionEntry> = { readonly [P in ParamOf<E> as P['name']]: unknown };

type NumberValue<P> = P extends { readonly optional: false }
  ? number
  : P extends { readonly rule: { readonly default: number } }
    ? number
    : number | undefined;

type NumberArgs<E extends FunctionEntry> = { readonly [P in OfKind<E, 'number'> as P['name']]: NumberValue<P> };
type ChoiceArgs<E extends FunctionEntry> = {
  readonly [P in OfKind<E, 'choice'> as P['name']]: P['rule']['choices'][number];
};
type AlignedArgs<E extends FunctionEntry> = {
  readonly [P in OfKind<E, 'aligned'> as P['name']]: P extends { readonly rule: NumberRule }
    ? number[] | undefined
    : unknown[] | undefined;
};
type ListArgs<E extends FunctionEntry> = {
  readonly [P in OfKind<E, 'list'> as P['name']]: P extends { readonly optional: false }
    ? number[]
    : number[] | undefined;
};
type DaysArgs<E extends FunctionEntry> = [OfKind<E, 'days'>] extends [never]
  ? unknown
  : {
      readonly days: DayTable;
      readonly dayColumns: { readonly [P in OfKind<E, 'days'> as P['name']]: readonly (readonly number[])[] };
    };
type PriorArgs<E extends FunctionEntry> = [OfKind<E, 'prior'>] extends [never]
  ? unknown
  : OfKind<E, 'prior'> extends { readonly prior: 'beta' }
    ? { readonly prior: BetaPrior }
    : { readonly prior: GammaPrior };
type TableArgs<E extends FunctionEntry> = [OfKind<E, 'range'>] extends [never]
  ? unknown
  : {
      readonly table: VariantTable;
      readonly variants: { readonly [P in OfKind<E, 'range'> as P['name']]: number }[];
    };

/** The checked arguments of a function, typed from its entry. */
export type Args<E extends FunctionEntry> = NumberArgs<E> &
  ChoiceArgs<E> &
  AlignedArgs<E> &
  ListArgs<E> &
  DaysArgs<E> &
  PriorArgs<E> &
  TableArgs<E>;

/** What the computation hands back for each spill shape. */
export type SpillValues<S extends SpillShape> = S extends { readonly kind: 'one'; readonly of: 'number' }
  ? number
  : S extends { readonly kind: 'one'; readonly of: 'text' }
    ? string
    : S extends { readonly kind: 'perVariant'; readonly width: 1 }
      ? readonly number[]
      : S extends { readonly kind: 'perVariant' | 'fixed' }
        ? readonly (readonly number[])[]
        : S extends { readonly kind: 'densityTable' }
          ? DensityTable
          : S extends { readonly kind: 'byDay'; readonly per: 'challenger' }
            ? readonly (readonly (number | null)[])[]
            : S extends { readonly kind: 'byDay'; readonly per: 'day' }
              ? readonly (number | null)[]
              : never;

/** What the cell receives: one number or text, or a spill. */
export type SpillResult<S extends SpillShape> = S extends { readonly kind: 'one'; readonly of: 'number' }
  ? number
  : S extends { readonly kind: 'one'; readonly of: 'text' }
    ? string
    : OutputCell[][];

/**
 * Reads and checks every argument of `fn` from `input` (the wrapper's parameters by name).
 *
 * Cost O(cells of the ranges).
 * @throws {ArgumentProblem} the first problem in the entry's parameter order (mapped to #VALUE! by run.ts).
 * @example readArgs(CATALOGUE.RATE_INTERVAL, { conversions: [[5], [7]], visitors: [[50], [50]], level: null,
 *   prior_alpha: null, prior_beta: null, method: 'hdi' }).method //=> 'hdi'
 */
export function readArgs<const E extends FunctionEntry>(fn: E, input: ArgInput<E>): Args<E> {
  const given = input as Readonly<Record<string, unknown>>;
  const out: Record<string, unknown> = {};
  const ranges = fn.params.filter((p) => p.kind === 'range');
  let table: VariantTable | undefined;
  if (ranges.length > 0) {
    if (fn.variants === undefined) throw new Error(`internal: ${fn.id} reads ranges but declares no variant count`);
    const found = readVariants(
      ranges.map((p) => p.rule),
      ranges.map((p) => given[p.name]),
      fn.variants,
    );
    table = found;
    out.table = found;
    out.variants = variantRows(ranges, found);
  }
  const dayParams = fn.params.filter((p) => p.kind === 'days');
  if (dayParams.length > 0) {
    const found = readDays(
      dayParams,
      dayParams.map((p) => given[p.name]),
    );
    out.days = found;
    out.dayColumns = found.columns;
  }
  for (const p of fn.params) {
    switch (p.kind) {
      case 'range':
      case 'days':
        break;
      case 'list':
        out[p.name] = readList(p, given[p.name]);
        break;
      case 'number':
        out[p.name] = p.optional
          ? readOptionalNumber(p.rule, given[p.name])
          : readRequiredNumber(p.rule, given[p.name]);
        break;
      case 'choice':
        out[p.name] = readChoice(p.rule, given[p.name]);
        break;
      case 'aligned':
        out[p.name] = readAligned(fn, p.name, p.rule, given[p.name], table, ranges[0]?.name);
        break;
      case 'prior':
        if (!('prior' in out)) out.prior = readPrior(fn, p.prior, given);
        break;
    }
  }
  return out as Args<E>;
}

/** One object per variant with a field per range (`{ conversions, visitors }`), the core's input types. */
function variantRows(ranges: readonly Param[], table: VariantTable): Record<string, number>[] {
  const rows: Record<string, number>[] = [];
  for (let i = 0; i < table.positions.length; i++) {
    const row: Record<string, number> = {};
    for (const p of ranges) row[p.name] = (table.columns[p.name] as readonly number[])[i] as number;
    rows.push(row);
  }
  return rows;
}

function readAligned(
  fn: FunctionEntry,
  name: string,
  rule: NumberRule | undefined,
  value: unknown,
  table: VariantTable | undefined,
  tableName: string | undefined,
): unknown[] | undefined {
  if (table === undefined || tableName === undefined)
    throw new Error(`internal: ${fn.id}: ${name} has no range to line up with`);
  const cells = readAlignedCells(name, value, table, tableName);
  if (rule === undefined) return cells;
  return cells?.map((cell, i) => checkNumber(rule, cell, `${name}, item ${(table.positions[i] as number) + 1}`));
}

function readPrior(
  fn: FunctionEntry,
  family: 'beta' | 'gamma',
  given: Readonly<Record<string, unknown>>,
): BetaPrior | GammaPrior {
  const parts = fn.params.filter((p) => p.kind === 'prior' && p.prior === family).map((p) => given[p.name]);
  if (parts.length !== 2) throw new Error(`internal: ${fn.id} declares ${parts.length} ${family} prior parameters`);
  return family === 'beta' ? readBetaPrior(parts[0], parts[1]) : readGammaPrior(parts[0], parts[1]);
}

/**
 * Lays out what a computation returned as the entry's spill shape, checking every number is finite.
 *
 * Cost O(cells).
 * @throws {Error} an internal error (shown as #VALUE!) when the values do not fit the shape.
 * @example shapeResult(CATALOGUE.PROB_HIGHEST, columnTable, [0.2, 0.8]) //=> [[0.2], [0.8]]
 */
export function shapeResult(
  fn: FunctionEntry,
  table: VariantTable | undefined,
  values: unknown,
  days?: DayTable,
): number | string | OutputCell[][] {
  const spill = fn.spill;
  if (spill.kind === 'byDay') {
    if (days === undefined) throw new Error(`internal: ${fn.id} spills by day but reads no day tables`);
    if (spill.per === 'day')
      return spillByDay(
        days,
        (values as readonly (number | null)[]).map((v) => [v]),
        1,
      );
    return spillByDay(days, values as readonly (readonly (number | null)[])[], days.width - 1);
  }
  if (spill.kind === 'one') {
    if (spill.of === 'number' && typeof values === 'number') return finite(values);
    if (spill.of === 'text' && typeof values === 'string') return values;
    throw new Error(`internal: ${fn.id} returned ${typeof values}, not ${spill.of}`);
  }
  if (spill.kind === 'fixed') {
    const rows = values as readonly (readonly number[])[];
    if (rows.length !== spill.rows || rows.some((row) => row.length !== spill.columns)) {
      throw new Error(`internal: ${fn.id} returned a block of the wrong size`);
    }
    return rows.map((row) => row.map(finite));
  }
  if (table === undefined) throw new Error(`internal: ${fn.id} spills per variant but reads no ranges`);
  if (spill.kind === 'densityTable') return spillDensity(table, values as DensityTable, spill.series);
  if (spill.width === 1) {
    const perVariant = values as readonly number[];
    return spill.versusControl ? spillVersusControl(table, perVariant) : spillPerVariant(table, perVariant);
  }
  const blocks = values as readonly (readonly number[])[];
  return spill.versusControl
    ? spillBlockVersusControl(table, blocks, spill.width)
    : spillBlock(table, blocks, spill.width);
}

/**
 * Runs one worksheet function: reads its arguments by its catalogue entry, computes, and shapes the
 * result; any failure becomes a worksheet error (run.ts).
 *
 * Cost: reading and shaping O(cells), plus the computation.
 * @throws {CustomFunctions.Error} `#VALUE!` or `#N/A` with a message.
 * @example runFunction(CATALOGUE.POSTERIOR_MEAN, { conversions: [[1]], visitors: [[2]], prior_alpha: null,
 *   prior_beta: null }, (a) => conversion.posteriorMean(a.variants, a.prior)) //=> [[0.5]]
 */
export function runFunction<const E extends FunctionEntry>(
  fn: E,
  input: ArgInput<E>,
  compute: (args: Args<E>) => SpillValues<E['spill']>,
): SpillResult<E['spill']> {
  return runSheet(() => {
    const args = readArgs(fn, input);
    const { table, days } = args as { readonly table?: VariantTable; readonly days?: DayTable };
    return shapeResult(fn, table, compute(args), days) as SpillResult<E['spill']>;
  });
}
