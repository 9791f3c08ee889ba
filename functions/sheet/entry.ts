/**
 * The shape of a catalogue entry: what a worksheet function reads (its parameters, each pointing at a
 * declared rule of rules.ts), how many variants it takes and how its result spills. functions/catalogue.ts
 * holds one entry per function; args.ts reads arguments and shapes results from an entry, so the wrappers
 * carry no argument logic of their own. The words (description, method, source, examples, cautions) are the
 * wrappers' JSDoc, not part of an entry.
 */
import { describeAllowed, type ChoiceRule, type NumberRule } from './rules';
import type { VariantCount } from './variants';

/** A range with one number per variant (`conversions`, `visitors`, `count`…), read with the entry's other ranges. */
export interface RangeParam<R extends NumberRule = NumberRule> {
  readonly kind: 'range';
  readonly name: R['name'];
  readonly rule: R;
  readonly optional: false;
}

/**
 * An optional range lined up with the variant table: one cell per position of the first range. With a
 * rule (`planned_shares`) each variant's cell is checked as a number; without one (`labels`) cells are kept as given.
 */
export interface AlignedParam<N extends string = string, R extends NumberRule | undefined = NumberRule | undefined> {
  readonly kind: 'aligned';
  readonly name: N;
  readonly rule: R;
  readonly optional: true;
}

/** A single number (`level`, `baseline_rate`…). */
export interface NumberParam<R extends NumberRule = NumberRule, O extends boolean = boolean> {
  readonly kind: 'number';
  readonly name: R['name'];
  readonly rule: R;
  readonly optional: O;
}

/** A one-word text argument (`method`); always optional, the rule has a default. */
export interface ChoiceParam<R extends ChoiceRule<string> = ChoiceRule<string>> {
  readonly kind: 'choice';
  readonly name: R['name'];
  readonly rule: R;
  readonly optional: true;
}

/** Which prior a pair of prior parameters makes: Beta(prior_alpha, prior_beta) or Gamma(prior_shape, prior_rate). */
export type PriorFamily = 'beta' | 'gamma';

/** One of the two optional numbers of a prior, read as a pair (args.ts gives the pair as `prior`). */
export interface PriorParam<R extends NumberRule = NumberRule, F extends PriorFamily = PriorFamily> {
  readonly kind: 'prior';
  readonly name: R['name'];
  readonly rule: R;
  readonly prior: F;
  readonly optional: true;
}

/**
 * A row or a column of numbers that is a list of its own, not one cell per variant (`visitors_at_looks`, or
 * `planned_shares` for the columns of a day table). Blank cells are skipped; `increasing` asks each value
 * to be more than the one before.
 */
export interface ListParam<R extends NumberRule = NumberRule, O extends boolean = boolean> {
  readonly kind: 'list';
  readonly name: R['name'];
  readonly rule: R;
  readonly optional: O;
  /** Bounds on the number of values given, and what they are called. */
  readonly count: VariantCount;
  readonly increasing: boolean;
}

/**
 * A table with one row per day and one column per variant, the control first (`visitors_by_day`). All of
 * an entry's day tables are read together (sheet/days.ts) into `days`; a row blank in every table is a day
 * without data and is skipped.
 */
export interface DaysParam<R extends NumberRule = NumberRule> {
  readonly kind: 'days';
  readonly name: R['name'];
  readonly rule: R;
  readonly optional: false;
  /** Bounds on the number of columns (variants). */
  readonly variants: VariantCount;
}

/** Any parameter of a catalogue entry. */
export type Param = RangeParam | AlignedParam | NumberParam | ChoiceParam | PriorParam | ListParam | DaysParam;

/** Whether Excel passes the parameter as a range (a matrix) rather than one value. */
export function takesRange(p: Param): boolean {
  return p.kind === 'range' || p.kind === 'aligned' || p.kind === 'list' || p.kind === 'days';
}

/**
 * How a result is laid out on the sheet.
 *
 * - `one`: a single cell holding a number or a text.
 * - `perVariant`: `width` values per variant (1: one cell each), along the input: rows for a column of
 *   variants, columns for a row. `versusControl`: only the challengers have values; the control's slot is `""`.
 * - `fixed`: always `rows` × `columns` cells (a prior's alpha and beta).
 * - `densityTable`: a chart table, `points` rows; a grid column, then one column per variant or per challenger.
 * - `byDay`: one row per row of the day tables (blank days give a row of `""`), with one column per
 *   challenger (`per: 'challenger'`) or a single column (`per: 'day'`).
 */
export type SpillShape =
  | { readonly kind: 'one'; readonly of: 'number' | 'text' }
  | { readonly kind: 'perVariant'; readonly width: number; readonly versusControl: boolean }
  | { readonly kind: 'fixed'; readonly rows: number; readonly columns: number }
  | { readonly kind: 'densityTable'; readonly series: 'variant' | 'challenger' }
  | { readonly kind: 'byDay'; readonly per: 'challenger' | 'day' };

/** The families of functions, in the order the README and the help index list them. */
export type FamilyId = 'conversion' | 'prior' | 'planning' | 'looks' | 'checking' | 'means' | 'events' | 'revenue';

/** One worksheet function as the catalogue declares it. */
export interface FunctionEntry {
  /** The custom-function id and the name users type after `ABTEST.`; final once shipped. */
  readonly id: string;
  readonly family: FamilyId;
  /** In the order Excel shows them: required first, then optional. */
  readonly params: readonly Param[];
  /** Bounds on the number of variants, for entries with range parameters. */
  readonly variants?: VariantCount;
  readonly spill: SpillShape;
}

// ---------------------------------------------------------------------------------------------------
// Constructors, so that catalogue rows read as one line per parameter and keep literal names and rules.

/** A range of numbers, one cell per variant. */
export function range<const R extends NumberRule>(rule: R): RangeParam<R> {
  return { kind: 'range', name: rule.name, rule, optional: false };
}

/** An optional range of text lined up with the variants (`labels`): its cells are kept as given. */
export function alignedCells<const N extends string>(name: N): AlignedParam<N, undefined> {
  return { kind: 'aligned', name, rule: undefined, optional: true };
}

/** An optional range of numbers lined up with the variants (`planned_shares`), each checked by the rule. */
export function alignedNumbers<const R extends NumberRule>(rule: R): AlignedParam<R['name'], R> {
  return { kind: 'aligned', name: rule.name, rule, optional: true };
}

/** A required number. */
export function required<const R extends NumberRule>(rule: R): NumberParam<R, false> {
  return { kind: 'number', name: rule.name, rule, optional: false };
}

/** An optional number: its rule's default when left out, or `undefined` if the rule has none. */
export function optional<const R extends NumberRule>(rule: R): NumberParam<R, true> {
  return { kind: 'number', name: rule.name, rule, optional: true };
}

/** An optional one-word text. */
export function choice<const R extends ChoiceRule<string>>(rule: R): ChoiceParam<R> {
  return { kind: 'choice', name: rule.name, rule, optional: true };
}

/** A required list of numbers (a row or a column; blank cells skipped). */
export function list<const R extends NumberRule>(
  rule: R,
  count: VariantCount,
  increasing = false,
): ListParam<R, false> {
  return { kind: 'list', name: rule.name, rule, optional: false, count, increasing };
}

/** An optional list of numbers (a row or a column; blank cells skipped). */
export function optionalList<const R extends NumberRule>(rule: R, count: VariantCount): ListParam<R, true> {
  return { kind: 'list', name: rule.name, rule, optional: true, count, increasing: false };
}

/** A table of one row per day and one column per variant. */
export function days<const R extends NumberRule>(rule: R, variants: VariantCount): DaysParam<R> {
  return { kind: 'days', name: rule.name, rule, optional: false, variants };
}

/** One number of a prior pair. */
export function priorPart<const R extends NumberRule, const F extends PriorFamily>(
  rule: R,
  prior: F,
): PriorParam<R, F> {
  return { kind: 'prior', name: rule.name, rule, prior, optional: true };
}

/** Declares an entry, keeping the literal types that let args.ts type each wrapper's arguments. */
export function entry<const E extends FunctionEntry>(declared: E): E {
  return declared;
}

/** The number of required parameters (they come first). */
export function requiredCount(fn: FunctionEntry): number {
  return fn.params.filter((p) => !p.optional).length;
}

/** "2 to 50 variants" */
export function describeVariantCount(count: VariantCount): string {
  return `${count.min} to ${count.max} ${count.noun ?? 'variants'}`;
}

/**
 * What a parameter allows, in words, derived from its declared rule: the "allowed" column of the help pages
 * and the README. A bound tightened in rules.ts shows here without further edits.
 *
 * Cost O(parameters).
 * @example describeParam(CATALOGUE.RATE_INTERVAL.params[2], CATALOGUE.RATE_INTERVAL) //=> 'a number greater than 0 and less than 1; default 0.95'
 */
export function describeParam(p: Param, fn: FunctionEntry): string {
  const first = fn.params.find((q) => q.kind === 'range');
  const shape =
    first === undefined || first === p
      ? `a row or a column, ${fn.variants === undefined ? 'one cell per variant' : describeVariantCount(fn.variants)}`
      : `same shape as ${first.name}`;
  switch (p.kind) {
    case 'range': {
      const most = p.rule.atMost === undefined ? '' : `, at most the same variant's ${p.rule.atMost}`;
      return `${shape}; each ${describeAllowed(p.rule)}${most}`;
    }
    case 'aligned': {
      const also = p.rule?.also === undefined ? '' : `, ${p.rule.also}`;
      return `${shape}; ${p.rule === undefined ? 'any text or numbers' : `each ${describeAllowed(p.rule)}${also}`}; optional`;
    }
    case 'choice':
      return `${p.rule.choices.map((c) => `"${c}"`).join(' or ')}; default "${p.rule.default}"`;
    case 'list': {
      const order = p.increasing ? ', each more than the one before' : '';
      const how = `a row or a column of ${describeVariantCount(p.count)}; each ${describeAllowed(p.rule)}${order}`;
      return `${how}; blank cells are skipped${p.optional ? '; optional' : ''}`;
    }
    case 'days': {
      const firstDays = fn.params.find((q) => q.kind === 'days');
      const layout =
        firstDays === p
          ? `one row per day and one column per variant (${describeVariantCount(p.variants)}, the control first)`
          : `same shape as ${firstDays?.name}`;
      const most = p.rule.atMost === undefined ? '' : `, at most the same cell's ${p.rule.atMost}`;
      return `${layout}; each ${describeAllowed(p.rule)}${most}; a row left blank is a day without data and is skipped`;
    }
    case 'number':
    case 'prior': {
      const allowed = describeAllowed(p.rule);
      if (p.rule.default !== undefined) return `${allowed}; default ${p.rule.default}`;
      return p.optional ? `${allowed}; optional` : allowed;
    }
  }
}
