/**
 * The function catalogue in code: one entry per worksheet function, the one source of its id, family,
 * parameters (each pointing at a declared rule of sheet/rules.ts, the one home of argument bounds), the
 * number of variants it takes and how its result spills. The contract in words is docs/catalogue.md.
 *
 * Derived from these entries or checked against them by tests: the wrappers' arguments (sheet/args.ts),
 * Excel's metadata (dist/functions.json), the help pages' signatures and allowed ranges, the README's
 * function table, the side panel's signatures (taskpane/logic/explain.ts) and the preview's spill sizes
 * (preview/src/spillLayout.ts). The words of each function (description, method, source, example,
 * cross-check, cautions) are its wrapper's JSDoc in functions/wrappers/<family>.ts.
 *
 * This module imports no statistics and no Office API: the side panel, the preview and command-line tools
 * may import it.
 */
import {
  alignedCells,
  alignedNumbers,
  choice,
  days,
  entry,
  list,
  optional,
  optionalList,
  priorPart,
  range,
  required,
  type FamilyId,
  type FunctionEntry,
} from './sheet/entry';
import * as rules from './sheet/rules';
import { COMPARISON, ONE_OR_MORE, PAST_RESULTS, type VariantCount } from './sheet/variants';

/** The families, in the order of the README and the help index; each has its wrappers in functions/wrappers/<id>.ts. */
export const FAMILIES: readonly { readonly id: FamilyId; readonly title: string }[] = [
  { id: 'conversion', title: 'Conversion rates (Beta–Binomial)' },
  { id: 'prior', title: 'Choosing a prior' },
  { id: 'planning', title: 'Planning' },
  { id: 'looks', title: 'Looking at a running test' },
  { id: 'checking', title: 'Checking the experiment' },
  { id: 'means', title: 'Revenue and other averages (Normal model)' },
  { id: 'events', title: 'Counts per exposure (Gamma–Poisson)' },
  { id: 'revenue', title: 'Revenue per visitor from totals (conversion × order value)' },
];

// Parameters shared by many functions.
const CONVERSION_DATA = [range(rules.CONVERSIONS), range(rules.VISITORS)] as const;
const MEAN_DATA = [range(rules.COUNT), range(rules.MEAN), range(rules.SD)] as const;
const EVENT_DATA = [range(rules.EVENTS), range(rules.EXPOSURE)] as const;
const REVENUE_DATA = [range(rules.ORDERS), range(rules.VISITORS), range(rules.REVENUE)] as const;
const ORDER_SD = alignedNumbers(rules.ORDER_SD);
const BETA_PRIOR = [priorPart(rules.PRIOR_ALPHA, 'beta'), priorPart(rules.PRIOR_BETA, 'beta')] as const;
const GAMMA_PRIOR = [priorPart(rules.PRIOR_SHAPE, 'gamma'), priorPart(rules.PRIOR_RATE, 'gamma')] as const;
const LEVEL = optional(rules.LEVEL);
/** Looks of a test: 1 to 100 (the statistics core's bound, functions/stats/looks.ts). */
const LOOKS: VariantCount = { min: 1, max: 100, noun: 'looks' };
/** Planned shares of the variants of a day table: one per column, 2 to 50. */
const SHARES: VariantCount = { min: 2, max: 50, noun: 'shares' };
const VISITORS_AT_LOOKS = list(rules.VISITORS_AT_LOOKS, LOOKS, true);

// Spill shapes.
const PER_VARIANT = { kind: 'perVariant', width: 1, versusControl: false } as const;
const PER_CHALLENGER = { kind: 'perVariant', width: 1, versusControl: true } as const;
const INTERVAL_PER_VARIANT = { kind: 'perVariant', width: 2, versusControl: false } as const;
const INTERVAL_PER_CHALLENGER = { kind: 'perVariant', width: 3, versusControl: true } as const;
const PRIOR_ROW = { kind: 'fixed', rows: 1, columns: 2 } as const;
const NUMBER = { kind: 'one', of: 'number' } as const;
const TEXT = { kind: 'one', of: 'text' } as const;
const PER_DAY_PER_CHALLENGER = { kind: 'byDay', per: 'challenger' } as const;
const PER_DAY = { kind: 'byDay', per: 'day' } as const;

const ENTRIES = [
  // Conversion rates (Beta–Binomial)
  entry({
    id: 'POSTERIOR_MEAN',
    family: 'conversion',
    params: [...CONVERSION_DATA, ...BETA_PRIOR],
    variants: ONE_OR_MORE,
    spill: PER_VARIANT,
  }),
  entry({
    id: 'RATE_INTERVAL',
    family: 'conversion',
    params: [...CONVERSION_DATA, LEVEL, ...BETA_PRIOR, choice(rules.RATE_INTERVAL_METHOD)],
    variants: ONE_OR_MORE,
    spill: INTERVAL_PER_VARIANT,
  }),
  entry({
    id: 'PROB_HIGHEST',
    family: 'conversion',
    params: [...CONVERSION_DATA, ...BETA_PRIOR],
    variants: COMPARISON,
    spill: PER_VARIANT,
  }),
  entry({
    id: 'PROB_ABOVE_CONTROL',
    family: 'conversion',
    params: [...CONVERSION_DATA, ...BETA_PRIOR],
    variants: COMPARISON,
    spill: PER_CHALLENGER,
  }),
  entry({
    id: 'LIFT_INTERVAL',
    family: 'conversion',
    params: [...CONVERSION_DATA, LEVEL, ...BETA_PRIOR],
    variants: COMPARISON,
    spill: INTERVAL_PER_CHALLENGER,
  }),
  entry({
    id: 'RATE_DIFF_INTERVAL',
    family: 'conversion',
    params: [...CONVERSION_DATA, LEVEL, ...BETA_PRIOR],
    variants: COMPARISON,
    spill: INTERVAL_PER_CHALLENGER,
  }),
  entry({
    id: 'PROB_LIFT_ABOVE',
    family: 'conversion',
    params: [...CONVERSION_DATA, required(rules.MIN_LIFT), ...BETA_PRIOR],
    variants: COMPARISON,
    spill: PER_CHALLENGER,
  }),
  entry({
    id: 'EXPECTED_LOSS',
    family: 'conversion',
    params: [...CONVERSION_DATA, ...BETA_PRIOR],
    variants: COMPARISON,
    spill: PER_VARIANT,
  }),
  entry({
    id: 'DECISION',
    family: 'conversion',
    params: [...CONVERSION_DATA, optional(rules.MAX_LOSS), alignedCells('labels'), ...BETA_PRIOR],
    variants: COMPARISON,
    spill: TEXT,
  }),
  entry({
    id: 'POSTERIOR_DENSITY',
    family: 'conversion',
    params: [...CONVERSION_DATA, optional(rules.POINTS), ...BETA_PRIOR],
    variants: ONE_OR_MORE,
    spill: { kind: 'densityTable', series: 'variant' },
  }),
  entry({
    id: 'LIFT_DENSITY',
    family: 'conversion',
    params: [...CONVERSION_DATA, optional(rules.POINTS), ...BETA_PRIOR],
    variants: COMPARISON,
    spill: { kind: 'densityTable', series: 'challenger' },
  }),

  // Choosing a prior
  entry({
    id: 'PRIOR_FROM_MEAN',
    family: 'prior',
    params: [required(rules.MEAN_RATE), required(rules.STRENGTH)],
    spill: PRIOR_ROW,
  }),
  entry({
    id: 'PRIOR_FROM_INTERVAL',
    family: 'prior',
    params: [required(rules.LOW), required(rules.HIGH), optional(rules.PRIOR_LEVEL)],
    spill: PRIOR_ROW,
  }),
  entry({
    id: 'PRIOR_FROM_HISTORY',
    family: 'prior',
    params: [...CONVERSION_DATA, choice(rules.HISTORY_METHOD)],
    variants: PAST_RESULTS,
    spill: PRIOR_ROW,
  }),

  // Planning
  entry({
    id: 'DECISION_POWER',
    family: 'planning',
    params: [
      required(rules.BASELINE_RATE),
      required(rules.LIFT),
      required(rules.VISITORS_PER_VARIANT),
      optional(rules.THRESHOLD),
      ...BETA_PRIOR,
    ],
    spill: NUMBER,
  }),
  entry({
    id: 'VISITORS_NEEDED',
    family: 'planning',
    params: [
      required(rules.BASELINE_RATE),
      required(rules.LIFT),
      optional(rules.THRESHOLD),
      optional(rules.POWER),
      ...BETA_PRIOR,
    ],
    spill: NUMBER,
  }),
  entry({
    id: 'CLASSIC_SAMPLE_SIZE',
    family: 'planning',
    params: [
      required(rules.BASELINE_RATE),
      required(rules.LIFT),
      optional(rules.ALPHA),
      optional(rules.POWER),
      optional(rules.SIDES),
    ],
    spill: NUMBER,
  }),
  entry({
    id: 'SMALLEST_DETECTABLE_LIFT',
    family: 'planning',
    params: [
      required(rules.BASELINE_RATE),
      required(rules.LIFT_VISITORS),
      optional(rules.DECLARE_THRESHOLD),
      optional(rules.POWER),
      ...BETA_PRIOR,
    ],
    spill: NUMBER,
  }),
  entry({
    id: 'THRESHOLD_FOR_VARIANTS',
    family: 'planning',
    params: [required(rules.VARIANTS), optional(rules.FALSE_ALARM)],
    spill: NUMBER,
  }),

  // Looking at a running test
  entry({
    id: 'FALSE_ALARM_WITH_LOOKS',
    family: 'looks',
    params: [
      required(rules.BASELINE_RATE),
      VISITORS_AT_LOOKS,
      optional(rules.DECLARE_THRESHOLD),
      optional(rules.LOOK_SIDES),
      ...BETA_PRIOR,
    ],
    spill: NUMBER,
  }),
  entry({
    id: 'POWER_WITH_LOOKS',
    family: 'looks',
    params: [
      required(rules.BASELINE_RATE),
      required(rules.LIFT),
      VISITORS_AT_LOOKS,
      optional(rules.DECLARE_THRESHOLD),
      ...BETA_PRIOR,
    ],
    spill: NUMBER,
  }),
  entry({
    id: 'THRESHOLD_FOR_LOOKS',
    family: 'looks',
    params: [
      required(rules.BASELINE_RATE),
      VISITORS_AT_LOOKS,
      optional(rules.FALSE_ALARM),
      optional(rules.LOOK_SIDES),
      ...BETA_PRIOR,
    ],
    spill: NUMBER,
  }),
  entry({
    id: 'PROB_ABOVE_CONTROL_BY_DAY',
    family: 'looks',
    params: [days(rules.CONVERSIONS_BY_DAY, COMPARISON), days(rules.VISITORS_BY_DAY, COMPARISON), ...BETA_PRIOR],
    spill: PER_DAY_PER_CHALLENGER,
  }),
  entry({
    id: 'SRM_PVALUE_BY_DAY',
    family: 'looks',
    params: [days(rules.VISITORS_BY_DAY, COMPARISON), optionalList(rules.PLANNED_SHARES, SHARES)],
    spill: PER_DAY,
  }),

  // Checking the experiment
  entry({
    id: 'SRM_PVALUE',
    family: 'checking',
    params: [range(rules.SRM_VISITORS), alignedNumbers(rules.PLANNED_SHARES)],
    variants: COMPARISON,
    spill: NUMBER,
  }),

  // Revenue and other averages (Normal model)
  entry({
    id: 'MEAN_INTERVAL',
    family: 'means',
    params: [...MEAN_DATA, LEVEL],
    variants: ONE_OR_MORE,
    spill: INTERVAL_PER_VARIANT,
  }),
  entry({
    id: 'MEAN_PROB_HIGHEST',
    family: 'means',
    params: MEAN_DATA,
    variants: COMPARISON,
    spill: PER_VARIANT,
  }),
  entry({
    id: 'MEAN_PROB_ABOVE_CONTROL',
    family: 'means',
    params: MEAN_DATA,
    variants: COMPARISON,
    spill: PER_CHALLENGER,
  }),
  entry({
    id: 'MEAN_DIFF_INTERVAL',
    family: 'means',
    params: [...MEAN_DATA, LEVEL],
    variants: COMPARISON,
    spill: INTERVAL_PER_CHALLENGER,
  }),
  entry({
    id: 'MEAN_LIFT_INTERVAL',
    family: 'means',
    params: [...MEAN_DATA, LEVEL],
    variants: COMPARISON,
    spill: INTERVAL_PER_CHALLENGER,
  }),
  entry({
    id: 'MEAN_EXPECTED_LOSS',
    family: 'means',
    params: MEAN_DATA,
    variants: COMPARISON,
    spill: PER_VARIANT,
  }),
  entry({
    id: 'MEAN_PROB_LIFT_ABOVE',
    family: 'means',
    params: [...MEAN_DATA, required(rules.MIN_LIFT)],
    variants: COMPARISON,
    spill: PER_CHALLENGER,
  }),
  entry({
    id: 'MEAN_DECISION',
    family: 'means',
    params: [...MEAN_DATA, optional(rules.MAX_LOSS_AMOUNT), alignedCells('labels')],
    variants: COMPARISON,
    spill: TEXT,
  }),

  // Counts per exposure (Gamma–Poisson)
  entry({
    id: 'EVENTS_RATE_INTERVAL',
    family: 'events',
    params: [...EVENT_DATA, LEVEL, ...GAMMA_PRIOR],
    variants: ONE_OR_MORE,
    spill: INTERVAL_PER_VARIANT,
  }),
  entry({
    id: 'EVENTS_PROB_HIGHEST',
    family: 'events',
    params: [...EVENT_DATA, ...GAMMA_PRIOR],
    variants: COMPARISON,
    spill: PER_VARIANT,
  }),
  entry({
    id: 'EVENTS_PROB_ABOVE_CONTROL',
    family: 'events',
    params: [...EVENT_DATA, ...GAMMA_PRIOR],
    variants: COMPARISON,
    spill: PER_CHALLENGER,
  }),
  entry({
    id: 'EVENTS_LIFT_INTERVAL',
    family: 'events',
    params: [...EVENT_DATA, LEVEL, ...GAMMA_PRIOR],
    variants: COMPARISON,
    spill: INTERVAL_PER_CHALLENGER,
  }),
  entry({
    id: 'EVENTS_EXPECTED_LOSS',
    family: 'events',
    params: [...EVENT_DATA, ...GAMMA_PRIOR],
    variants: COMPARISON,
    spill: PER_VARIANT,
  }),
  entry({
    id: 'EVENTS_PROB_LIFT_ABOVE',
    family: 'events',
    params: [...EVENT_DATA, required(rules.MIN_LIFT), ...GAMMA_PRIOR],
    variants: COMPARISON,
    spill: PER_CHALLENGER,
  }),
  entry({
    id: 'EVENTS_DECISION',
    family: 'events',
    params: [...EVENT_DATA, optional(rules.MAX_LOSS_AMOUNT), alignedCells('labels'), ...GAMMA_PRIOR],
    variants: COMPARISON,
    spill: TEXT,
  }),

  // Revenue per visitor from totals (conversion × order value)
  entry({
    id: 'REVENUE_INTERVAL',
    family: 'revenue',
    params: [...REVENUE_DATA, ORDER_SD, LEVEL],
    variants: ONE_OR_MORE,
    spill: INTERVAL_PER_VARIANT,
  }),
  entry({
    id: 'REVENUE_PROB_HIGHEST',
    family: 'revenue',
    params: [...REVENUE_DATA, ORDER_SD],
    variants: COMPARISON,
    spill: PER_VARIANT,
  }),
  entry({
    id: 'REVENUE_PROB_ABOVE_CONTROL',
    family: 'revenue',
    params: [...REVENUE_DATA, ORDER_SD],
    variants: COMPARISON,
    spill: PER_CHALLENGER,
  }),
  entry({
    id: 'REVENUE_LIFT_INTERVAL',
    family: 'revenue',
    params: [...REVENUE_DATA, ORDER_SD, LEVEL],
    variants: COMPARISON,
    spill: INTERVAL_PER_CHALLENGER,
  }),
  entry({
    id: 'REVENUE_PROB_LIFT_ABOVE',
    family: 'revenue',
    params: [...REVENUE_DATA, required(rules.MIN_LIFT), ORDER_SD],
    variants: COMPARISON,
    spill: PER_CHALLENGER,
  }),
  entry({
    id: 'REVENUE_EXPECTED_LOSS',
    family: 'revenue',
    params: [...REVENUE_DATA, ORDER_SD],
    variants: COMPARISON,
    spill: PER_VARIANT,
  }),
  entry({
    id: 'REVENUE_DECISION',
    family: 'revenue',
    params: [...REVENUE_DATA, ORDER_SD, optional(rules.MAX_LOSS_AMOUNT), alignedCells('labels')],
    variants: COMPARISON,
    spill: TEXT,
  }),
] as const;

type Entries = typeof ENTRIES;

/** Every entry by id, typed: `CATALOGUE.RATE_INTERVAL.params[2].name` is `'level'`. */
export const CATALOGUE = Object.freeze(Object.fromEntries(ENTRIES.map((e) => [e.id, e]))) as {
  readonly [E in Entries[number] as E['id']]: E;
};

/** Every entry in catalogue order (by family, as listed above). */
export const CATALOGUE_LIST: readonly FunctionEntry[] = ENTRIES;

/** The entry of a function id (case-insensitive), or undefined for a name the catalogue does not have. */
export function findFunction(id: string): FunctionEntry | undefined {
  const upper = id.toUpperCase();
  return CATALOGUE_LIST.find((e) => e.id === upper);
}

/** The syntax users see: `RATE_INTERVAL(conversions, visitors, [level], …)`. */
export function signatureText(fn: FunctionEntry): string {
  return `${fn.id}(${fn.params.map((p) => (p.optional ? `[${p.name}]` : p.name)).join(', ')})`;
}
