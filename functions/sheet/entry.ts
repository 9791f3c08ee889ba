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

/** Any parameter of a catalogue entry. */
export type Param = RangeParam | AlignedParam | NumberParam | ChoiceParam | PriorParam;

/**
 * How a result is laid out on the sheet.
 *
 * - `one`: a single cell holding a number or a text.
 * - `perVariant`: `width` values per variant (1: one cell each), along the input: rows for a column of
 *   variants, columns for a row. `versusControl`: only the challengers have values; the control's slot is `""`.
 * - `fixed`: always `rows` × `columns` cells (a prior's alpha and beta).
 * - `densityTable`: a chart table, `points` rows; a grid column, then one column per variant or per challenger.
 */
export type SpillShape =
  | { readonly kind: 'one'; readonly of: 'number' | 'text' }
  | { readonly kind: 'perVariant'; readonly width: number; readonly versusControl: boolean }
  | { readonly kind: 'fixed'; readonly rows: number; readonly columns: number }
  | { readonly kind: 'densityTable'; readonly series: 'variant' | 'challenger' };

/** The families of functions, in the order the README and the help index list them. */
export type FamilyId = 'conversion' | 'prior' | 'planning' | 'checking' | 'means' | 'events' | 'revenue';

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
    case 'aligned':
      return `${shape}; ${p.rule === undefined ? 'any text or numbers' : `each ${describeAllowed(p.rule)}`}; optional`;
    case 'choice':
      return `${p.rule.choices.map((c) => `"${c}"`).join(' or ')}; default "${p.rule.default}"`;
    case 'number':
    case 'prior': {
      const allowed = describeAllowed(p.rule);
      if (p.rule.default !== undefined) return `${allowed}; default ${p.rule.default}`;
      return p.optional ? `${allowed}; optional` : allowed;
    }
  }
}
