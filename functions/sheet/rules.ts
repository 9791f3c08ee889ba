/**
 * Declared argument rules: every number a worksheet function accepts is described here as data, and
 * checked by the one routine {@link checkNumber}. The style follows HyperFormula's function plugins, where
 * each parameter declares its type and bounds and one runner does the coercion and the checks.
 */
import {
  MAX_ALPHA,
  MAX_BASELINE,
  MAX_COUNT,
  MAX_EXPOSURE,
  MAX_LEVEL,
  MAX_MEAN_SIZE,
  MAX_PLANNED_VISITORS,
  MAX_POINTS,
  MAX_POWER_VISITORS,
  MAX_PRIOR,
  MAX_PRIOR_RATE,
  MAX_SD,
  MIN_ALPHA,
  MIN_BASELINE,
  MIN_EXPOSURE,
  MIN_LEVEL,
  MIN_PLAN_LIFT,
  MIN_POINTS,
  MIN_PRIOR,
  MIN_SD,
  MIN_ORDER_SD_SHARE,
} from '../stats/limits';
import { ArgumentProblem, classifyCell } from './cells';

/** The largest count accepted (stats/limits.ts): 2^53, the largest integer a double holds exactly with all smaller ones. */
export { MAX_COUNT };

/** Bounds and kind of one numeric argument or of every cell of a numeric range. */
export interface NumberRule {
  /** The argument's name as the user sees it in Excel's formula help (`visitors`, `prior_alpha`). */
  readonly name: string;
  /** `count`: a whole number in [min, 2^53]; `real`: any finite number within the bounds. */
  readonly kind: 'count' | 'real';
  /** Smallest allowed value (inclusive). */
  readonly min?: number;
  /** Largest allowed value (inclusive). */
  readonly max?: number;
  /** The value must be strictly greater than this. */
  readonly above?: number;
  /** The value must be strictly less than this. */
  readonly below?: number;
  /** 0 is allowed besides the bounds (`sd`: 0 when every value is equal, else at least MIN_SD). */
  readonly orZero?: boolean;
  /** For a range cell: the value may not exceed the same position's value of the named column. */
  readonly atMost?: string;
  /** For an optional scalar: the value used when the argument is omitted. */
  readonly default?: number;
  /**
   * The value is a fraction: `'rate'` a share (0.95 for 95%), `'lift'` a relative lift (0.05 for +5%). An
   * out-of-bounds value that looks like a whole percentage (2 to 100 in size) gets a hint in the message.
   */
  readonly fraction?: 'rate' | 'lift';
  /**
   * A further condition the model checks against other arguments (not this rule), in words for the help page
   * and the README's argument table, e.g. `order_sd`'s floor relative to the average order value.
   */
  readonly also?: string;
}

/** A text argument that must be one of a few words (case-insensitive). */
export interface ChoiceRule<T extends string> {
  readonly name: string;
  readonly choices: readonly T[];
  readonly default: T;
}

/**
 * A bound as Excel would show it: plain decimals from 0.001 to 999999, scientific notation beyond
 * (`1E+12`, `1E-6`), so a message never spells out twelve zeros.
 *
 * Cost O(1).
 * @example formatBound(1e12) //=> '1E+12'
 * @example formatBound(0.001) //=> '0.001'
 */
export function formatBound(x: number): string {
  const size = Math.abs(x);
  if (size === 0 || (size >= 1e-3 && size < 1e6)) return String(x);
  const [mantissa, exponent] = x.toExponential().split('e') as [string, string];
  return `${mantissa}E${exponent.startsWith('-') ? exponent : `+${exponent.replace('+', '')}`}`;
}

/** Plain-words description of what a rule allows, for error messages. */
export function describeAllowed(rule: NumberRule): string {
  const parts: string[] = [];
  if (rule.min !== undefined && rule.max !== undefined) {
    parts.push(`from ${formatBound(rule.min)} to ${formatBound(rule.max)}`);
  } else if (rule.min !== undefined) parts.push(`at least ${formatBound(rule.min)}`);
  if (rule.above !== undefined) parts.push(`greater than ${formatBound(rule.above)}`);
  if (rule.below !== undefined) parts.push(`less than ${formatBound(rule.below)}`);
  if (rule.max !== undefined && rule.min === undefined) parts.push(`at most ${formatBound(rule.max)}`);
  const bounds = parts.join(' and ');
  if (rule.kind === 'count') {
    if (!bounds) return 'a whole number, 0 or more';
    return bounds.startsWith('from') ? `a whole number ${bounds}` : `a whole number, ${bounds}`;
  }
  if (rule.orZero) return `0, or a number ${bounds}`;
  return bounds ? `a number ${bounds}` : 'a finite number';
}

/**
 * Checks one value against a rule and returns it as a number.
 *
 * `where` names the argument and position for the message, e.g. `visitors, item 3`.
 * Cost O(1).
 * @throws {ArgumentProblem} naming `where`, the value, the problem and what is allowed, e.g.
 *   `visitors, item 3: 12.5 is not a whole number`.
 * @example checkNumber({ name: 'visitors', kind: 'count', min: 1 }, 120, 'visitors, item 1') //=> 120
 */
export function checkNumber(rule: NumberRule, cell: unknown, where: string): number {
  const c = classifyCell(cell);
  const allowed = describeAllowed(rule);
  switch (c.kind) {
    case 'blank':
      throw new ArgumentProblem(`${where}: is blank; enter ${allowed}`);
    case 'text':
      throw new ArgumentProblem(
        `${where}: "${c.text}" is text, not a number; enter ${allowed} (convert text with VALUE() if needed)`,
      );
    case 'logical':
      throw new ArgumentProblem(
        `${where}: ${c.value ? 'TRUE' : 'FALSE'} is a logical value, not a number; enter ${allowed}`,
      );
    case 'other':
      throw new ArgumentProblem(`${where}: ${c.description} is not a number; enter ${allowed}`);
    case 'number':
      break;
  }
  const x = c.value;
  if (rule.kind === 'count') {
    if (x < 0) throw new ArgumentProblem(`${where}: ${x} is negative; enter ${allowed}`);
    if (!Number.isInteger(x)) throw new ArgumentProblem(`${where}: ${x} is not a whole number`);
    if (x > MAX_COUNT) throw new ArgumentProblem(`${where}: ${x} is larger than 2^53, the largest count accepted`);
  }
  const outside =
    !(rule.orZero && x === 0) &&
    ((rule.min !== undefined && x < rule.min) ||
      (rule.max !== undefined && x > rule.max) ||
      (rule.above !== undefined && !(x > rule.above)) ||
      (rule.below !== undefined && !(x < rule.below)));
  if (outside) throw new ArgumentProblem(`${where}: ${x} is not allowed; enter ${percentHint(rule, x) ?? allowed}`);
  return x;
}

/**
 * The hint for a percentage typed where a fraction belongs (`level` 95, `min_lift` 5), or undefined.
 *
 * Cost O(1).
 * @example percentHint(LEVEL, 95) //=> 'a fraction: 0.95 for 95%'
 * @example percentHint(MIN_LIFT, 5) //=> 'a fraction: 0.05 for +5% (a relative lift, at most 1 for +100%)'
 */
export function percentHint(rule: NumberRule, x: number): string | undefined {
  if (rule.fraction === undefined || !(Math.abs(x) >= 2 && Math.abs(x) <= 100)) return undefined;
  const asFraction = Number((x / 100).toPrecision(12));
  if (rule.fraction === 'rate') return x > 0 ? `a fraction: ${asFraction} for ${x}%` : undefined;
  const sign = x > 0 ? '+' : '−';
  return `a fraction: ${asFraction} for ${sign}${Math.abs(x)}% (a relative lift, at most 1 for +100%)`;
}

/**
 * Reads an optional scalar number: omitted (null, undefined, blank) gives the rule's default, or
 * `undefined` when the rule has none.
 *
 * Cost O(1).
 * @throws {ArgumentProblem} as {@link checkNumber}.
 * @example readOptionalNumber(LEVEL, null) //=> 0.95
 */
export function readOptionalNumber(rule: NumberRule, value: unknown): number | undefined {
  if (classifyCell(value).kind === 'blank') return rule.default;
  return checkNumber(rule, value, rule.name);
}

/**
 * Reads a required scalar number.
 *
 * Cost O(1).
 * @throws {ArgumentProblem} when missing or outside the rule.
 * @example readRequiredNumber(BASELINE_RATE, 0.05) //=> 0.05
 */
export function readRequiredNumber(rule: NumberRule, value: unknown): number {
  if (classifyCell(value).kind === 'blank') {
    throw new ArgumentProblem(`${rule.name}: is missing; enter ${describeAllowed(rule)}`);
  }
  return checkNumber(rule, value, rule.name);
}

/**
 * Reads an optional one-word text argument such as `method`.
 *
 * Cost O(length of text).
 * @throws {ArgumentProblem} when the value is not one of the rule's choices.
 * @example readChoice(RATE_INTERVAL_METHOD, 'HDI') //=> 'hdi'
 */
export function readChoice<T extends string>(rule: ChoiceRule<T>, value: unknown): T {
  const c = classifyCell(value);
  if (c.kind === 'blank') return rule.default;
  const list = rule.choices.map((choice) => `"${choice}"`).join(' or ');
  if (c.kind !== 'text') {
    const shown =
      c.kind === 'number' ? String(c.value) : c.kind === 'logical' ? String(c.value).toUpperCase() : c.description;
    throw new ArgumentProblem(`${rule.name}: ${shown} is not allowed; enter ${list}`);
  }
  const word = c.text.trim().toLowerCase();
  const found = rule.choices.find((choice) => choice === word);
  if (found === undefined) throw new ArgumentProblem(`${rule.name}: "${c.text}" is not allowed; enter ${list}`);
  return found;
}

// ---------------------------------------------------------------------------------------------------
// The declared rules of the catalogue's arguments.

/** `conversions`: whole number, 0 ≤ conversions ≤ visitors at the same position. */
export const CONVERSIONS = {
  name: 'conversions',
  kind: 'count',
  min: 0,
  atMost: 'visitors',
} as const satisfies NumberRule;
/** `visitors`: whole number ≥ 1. */
export const VISITORS = { name: 'visitors', kind: 'count', min: 1 } as const satisfies NumberRule;
/** `visitors` of SRM_PVALUE: whole number ≥ 0 (an arm that received nobody is the worst mismatch). */
export const SRM_VISITORS = { name: 'visitors', kind: 'count', min: 0 } as const satisfies NumberRule;
/** `planned_shares`: positive weights, from 1e-6 to 1e12 (so that their sum is a finite number). */
export const PLANNED_SHARES = {
  name: 'planned_shares',
  kind: 'real',
  min: 1e-6,
  max: 1e12,
} as const satisfies NumberRule;
/** `count` of the Normal model: whole number ≥ 2 (a standard deviation needs two values). */
export const COUNT = { name: 'count', kind: 'count', min: 2 } as const satisfies NumberRule;
/** `mean`: from −1e12 to 1e12 (stats/limits.ts MAX_MEAN_SIZE). */
export const MEAN = {
  name: 'mean',
  kind: 'real',
  min: -MAX_MEAN_SIZE,
  max: MAX_MEAN_SIZE,
} as const satisfies NumberRule;
/** `sd`: 0 (every value equal), or from 1e-6 to 1e12 (stats/limits.ts MIN_SD, MAX_SD). */
export const SD = { name: 'sd', kind: 'real', min: MIN_SD, max: MAX_SD, orZero: true } as const satisfies NumberRule;
/** `events`: whole number ≥ 0. */
export const EVENTS = { name: 'events', kind: 'count', min: 0 } as const satisfies NumberRule;
/** `exposure`: from 1e-6 to 1e12 in the user's unit (stats/limits.ts MIN_EXPOSURE, MAX_EXPOSURE). */
export const EXPOSURE = {
  name: 'exposure',
  kind: 'real',
  min: MIN_EXPOSURE,
  max: MAX_EXPOSURE,
} as const satisfies NumberRule;

/** `orders` of revenue per visitor: whole number, 0 ≤ orders ≤ visitors at the same position. */
export const ORDERS = { name: 'orders', kind: 'count', min: 0, atMost: 'visitors' } as const satisfies NumberRule;
/** `revenue`: a variant's total revenue, from 0 to 1e12 in the user's currency (stats/limits.ts MAX_MEAN_SIZE). */
export const REVENUE = { name: 'revenue', kind: 'real', min: 0, max: MAX_MEAN_SIZE } as const satisfies NumberRule;
/**
 * `order_sd`: the standard deviation of one variant's order values (STDEV.S): 0, or from 1e-6 to 1e12 (as `sd`),
 * and when not 0 at least MIN_ORDER_SD_SHARE of the variant's average order value (checked by the revenue model).
 */
export const ORDER_SD = {
  name: 'order_sd',
  kind: 'real',
  min: MIN_SD,
  max: MAX_SD,
  orZero: true,
  also: `when not 0, at least ${MIN_ORDER_SD_SHARE * 100}% of the same variant's revenue/orders`,
} as const satisfies NumberRule;

/** Levels, thresholds and power: from 0.01 to 0.9999 (stats/limits.ts MIN_LEVEL, MAX_LEVEL). */
const LEVEL_BOUNDS = { kind: 'real', min: MIN_LEVEL, max: MAX_LEVEL, fraction: 'rate' } as const;
/** Prior parameters: from 0.001 to 1e6 (stats/limits.ts MIN_PRIOR, MAX_PRIOR). */
const PRIOR_BOUNDS = { kind: 'real', min: MIN_PRIOR, max: MAX_PRIOR, default: 1 } as const;

/** `level` of credible intervals: 0.01 to 0.9999, default 0.95. */
export const LEVEL = { name: 'level', ...LEVEL_BOUNDS, default: 0.95 } as const satisfies NumberRule;
/** `level` of PRIOR_FROM_INTERVAL: 0.01 to 0.9999, default 0.90. */
export const PRIOR_LEVEL = { name: 'level', ...LEVEL_BOUNDS, default: 0.9 } as const satisfies NumberRule;
/** `prior_alpha`: 0.001 to 1e6, default 1. */
export const PRIOR_ALPHA = { name: 'prior_alpha', ...PRIOR_BOUNDS } as const satisfies NumberRule;
/** `prior_beta`: 0.001 to 1e6, default 1. */
export const PRIOR_BETA = { name: 'prior_beta', ...PRIOR_BOUNDS } as const satisfies NumberRule;
/** `prior_shape`: 0.001 to 1e6, default 1. */
export const PRIOR_SHAPE = { name: 'prior_shape', ...PRIOR_BOUNDS } as const satisfies NumberRule;
/** `prior_rate`: 0 to 1e12 (a prior exposure, in the unit of `exposure`), default 0. */
export const PRIOR_RATE = {
  name: 'prior_rate',
  kind: 'real',
  min: 0,
  max: MAX_PRIOR_RATE,
  default: 0,
} as const satisfies NumberRule;
/**
 * `min_lift`: a relative lift as a fraction, greater than −1 (a rate cannot fall below zero) and at most 1
 * (+100%). A larger value is almost always a percentage typed as a whole number (5 for 5%), which would
 * silently ask about a sixfold rate.
 */
export const MIN_LIFT = {
  name: 'min_lift',
  kind: 'real',
  above: -1,
  max: 1,
  fraction: 'lift',
} as const satisfies NumberRule;
/** `max_loss`: a rate ≥ 0; no default here (the core uses 1% of the control's posterior mean). */
export const MAX_LOSS = {
  name: 'max_loss',
  kind: 'real',
  min: 0,
  below: 1,
  fraction: 'rate',
} as const satisfies NumberRule;
/** `max_loss` of the decisions on averages, counts and revenue: 0 to 1e12 in the metric's own units; the core's default. */
export const MAX_LOSS_AMOUNT = {
  name: 'max_loss',
  kind: 'real',
  min: 0,
  max: MAX_MEAN_SIZE,
} as const satisfies NumberRule;
/** `points` of density tables: whole number MIN_POINTS…MAX_POINTS (2…1000, stats/limits.ts), default 101. */
export const POINTS = {
  name: 'points',
  kind: 'count',
  min: MIN_POINTS,
  max: MAX_POINTS,
  default: 101,
} as const satisfies NumberRule;
/** A rate a user states about a prior or a plan: 1e-6 to 0.999999 (stats/limits.ts MIN_BASELINE, MAX_BASELINE). */
const RATE_BOUNDS = { kind: 'real', min: MIN_BASELINE, max: MAX_BASELINE, fraction: 'rate' } as const;
/** `mean_rate` of PRIOR_FROM_MEAN: 1e-6 to 0.999999. */
export const MEAN_RATE = { name: 'mean_rate', ...RATE_BOUNDS } as const satisfies NumberRule;
/**
 * `strength` of PRIOR_FROM_MEAN: the prior's worth in visitors, from 0.002 to 2e6 (so that alpha and beta can
 * each lie within the prior bounds; the wrapper checks the pair it makes).
 */
export const STRENGTH = {
  name: 'strength',
  kind: 'real',
  min: 2 * MIN_PRIOR,
  max: 2 * MAX_PRIOR,
} as const satisfies NumberRule;
/** `low` of PRIOR_FROM_INTERVAL: 1e-6 to 0.999999. */
export const LOW = { name: 'low', ...RATE_BOUNDS } as const satisfies NumberRule;
/** `high` of PRIOR_FROM_INTERVAL: 1e-6 to 0.999999. */
export const HIGH = { name: 'high', ...RATE_BOUNDS } as const satisfies NumberRule;
/** `baseline_rate`: 1e-6 to 0.999999. */
export const BASELINE_RATE = { name: 'baseline_rate', ...RATE_BOUNDS } as const satisfies NumberRule;
/** `lift` of the planners: a relative lift as a fraction, from −0.99 (−99%) to 1 (+100%). */
export const LIFT = {
  name: 'lift',
  kind: 'real',
  min: MIN_PLAN_LIFT,
  max: 1,
  fraction: 'lift',
} as const satisfies NumberRule;
/** `visitors_per_variant` of DECISION_POWER: whole number 1 … 1e10 (stats/limits.ts MAX_POWER_VISITORS). */
export const VISITORS_PER_VARIANT = {
  name: 'visitors_per_variant',
  kind: 'count',
  min: 1,
  max: MAX_POWER_VISITORS,
} as const satisfies NumberRule;
/** `threshold` of the Bayesian planners: 0.01 to 0.9999, default 0.95. */
export const THRESHOLD = { name: 'threshold', ...LEVEL_BOUNDS, default: 0.95 } as const satisfies NumberRule;
/** `power`: 0.01 to 0.9999, default 0.8. */
export const POWER = { name: 'power', ...LEVEL_BOUNDS, default: 0.8 } as const satisfies NumberRule;
/** `alpha` of the classic test: 0.0001 to 0.5, default 0.05. */
export const ALPHA = {
  name: 'alpha',
  kind: 'real',
  min: MIN_ALPHA,
  max: MAX_ALPHA,
  default: 0.05,
  fraction: 'rate',
} as const satisfies NumberRule;
/** `sides`: 1 or 2, default 2. */
export const SIDES = { name: 'sides', kind: 'count', min: 1, max: 2, default: 2 } as const satisfies NumberRule;

// Planning with looks, many variants, a fixed budget and day-by-day tables (issue #14). The bounds are
// the statistics core's declared domain (functions/stats/looks.ts, manyVariants.ts, detectableLift.ts, byDay.ts).

/** `visitors_per_variant` of SMALLEST_DETECTABLE_LIFT: whole number 1 … 1e9 (stats/limits.ts MAX_PLANNED_VISITORS). */
export const LIFT_VISITORS = {
  name: 'visitors_per_variant',
  kind: 'count',
  min: 1,
  max: MAX_PLANNED_VISITORS,
} as const satisfies NumberRule;
/** `threshold` where a declaration needs P(beats control) above ½: in (0.5, 0.999999], default 0.95. */
export const DECLARE_THRESHOLD = {
  name: 'threshold',
  kind: 'real',
  above: 0.5,
  max: 0.999999,
  default: 0.95,
} as const satisfies NumberRule;
/** `visitors_at_looks`: cumulative visitors per variant at each look, whole numbers 1 … 1e9, increasing. */
export const VISITORS_AT_LOOKS = {
  name: 'visitors_at_looks',
  kind: 'count',
  min: 1,
  max: MAX_PLANNED_VISITORS,
} as const satisfies NumberRule;
/** `sides` of the look planners: 1 or 2, default 1 (only the challenger is declared). */
export const LOOK_SIDES = { name: 'sides', kind: 'count', min: 1, max: 2, default: 1 } as const satisfies NumberRule;
/** `false_alarm`: the overall chance of a false declaration, in [0.000001, 0.5], default 0.05. */
export const FALSE_ALARM = {
  name: 'false_alarm',
  kind: 'real',
  min: 0.000001,
  max: 0.5,
  default: 0.05,
} as const satisfies NumberRule;
/** `variants` of THRESHOLD_FOR_VARIANTS: the control and its challengers, whole number 2 … 50. */
export const VARIANTS = { name: 'variants', kind: 'count', min: 2, max: 50 } as const satisfies NumberRule;
/** `conversions_by_day`: conversions of each day and variant, whole number ≥ 0, at most that cell's visitors. */
export const CONVERSIONS_BY_DAY = {
  name: 'conversions_by_day',
  kind: 'count',
  min: 0,
  atMost: 'visitors_by_day',
} as const satisfies NumberRule;
/** `visitors_by_day`: visitors of each day and variant, whole number ≥ 0 (a day without traffic is 0). */
export const VISITORS_BY_DAY = { name: 'visitors_by_day', kind: 'count', min: 0 } as const satisfies NumberRule;

/** `method` of RATE_INTERVAL. */
export const RATE_INTERVAL_METHOD = {
  name: 'method',
  choices: ['central', 'hdi'],
  default: 'central',
} as const satisfies ChoiceRule<string>;
/** `method` of PRIOR_FROM_HISTORY. */
export const HISTORY_METHOD = {
  name: 'method',
  choices: ['likelihood', 'moments'],
  default: 'likelihood',
} as const satisfies ChoiceRule<string>;
