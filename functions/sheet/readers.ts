/**
 * Readers for each family of worksheet functions: they apply the declared rules of rules.ts through
 * variants.ts and return the core's input types together with the {@link VariantTable} that shapes the
 * spill.
 */
import type { BetaPrior, ConversionCounts, EventCounts, GammaPrior, MeanSummary } from '../stats/types';
import { StatsError } from '../stats/errors';
import { MAX_PRIOR, MIN_PRIOR } from '../stats/limits';
import { ArgumentProblem, classifyCell } from './cells';
import {
  CONVERSIONS,
  COUNT,
  EVENTS,
  EXPOSURE,
  MEAN,
  PLANNED_SHARES,
  PRIOR_ALPHA,
  PRIOR_BETA,
  PRIOR_RATE,
  PRIOR_SHAPE,
  SD,
  SRM_VISITORS,
  VISITORS,
  checkNumber,
  formatBound,
  readOptionalNumber,
} from './rules';
import { readAlignedCells, readVariants, type VariantCount, type VariantTable } from './variants';

/** Variants of a conversion metric, with the table that shapes the spill. */
export interface ConversionInput {
  readonly table: VariantTable;
  readonly variants: ConversionCounts[];
}

/**
 * Reads `conversions` and `visitors` (same shape; whole numbers, 0 ≤ conversions ≤ visitors, visitors ≥ 1).
 *
 * Cost O(cells).
 * @throws {ArgumentProblem} per the input policy (see variants.ts and cells.ts).
 * @example readConversions([[10], [12]], [[100], [100]], COMPARISON).variants
 * //=> [{ conversions: 10, visitors: 100 }, { conversions: 12, visitors: 100 }]
 */
export function readConversions(conversions: unknown, visitors: unknown, count: VariantCount): ConversionInput {
  const table = readVariants([CONVERSIONS, VISITORS], [conversions, visitors], count);
  const x = table.columns.conversions as readonly number[];
  const n = table.columns.visitors as readonly number[];
  return { table, variants: x.map((c, i) => ({ conversions: c, visitors: n[i] as number })) };
}

/**
 * Reads the Beta prior `[prior_alpha]`, `[prior_beta]`: both > 0, default Beta(1, 1); give both or neither.
 *
 * Cost O(1).
 * @throws {ArgumentProblem} when only one is given or either is ≤ 0.
 * @example readBetaPrior(null, null) //=> { alpha: 1, beta: 1 }
 */
export function readBetaPrior(priorAlpha: unknown, priorBeta: unknown): BetaPrior {
  const hasAlpha = classifyCell(priorAlpha).kind !== 'blank';
  const hasBeta = classifyCell(priorBeta).kind !== 'blank';
  if (hasAlpha !== hasBeta) {
    throw new ArgumentProblem(
      `prior_alpha and prior_beta: give both or neither (${hasAlpha ? 'prior_beta' : 'prior_alpha'} is missing); ` +
        'leaving both out uses the uniform prior Beta(1, 1)',
    );
  }
  return {
    alpha: readOptionalNumber(PRIOR_ALPHA, priorAlpha) as number,
    beta: readOptionalNumber(PRIOR_BETA, priorBeta) as number,
  };
}

/**
 * Reads the Gamma prior `[prior_shape]` (> 0, default 1) and `[prior_rate]` (≥ 0, default 0). Each has a
 * natural default of its own, so either may be given alone.
 *
 * Cost O(1).
 * @throws {ArgumentProblem} when a value is outside its rule.
 * @example readGammaPrior(undefined, 2) //=> { shape: 1, rate: 2 }
 */
export function readGammaPrior(priorShape: unknown, priorRate: unknown): GammaPrior {
  return {
    shape: readOptionalNumber(PRIOR_SHAPE, priorShape) as number,
    rate: readOptionalNumber(PRIOR_RATE, priorRate) as number,
  };
}

/** Variants of an average metric. */
export interface MeanInput {
  readonly table: VariantTable;
  readonly variants: MeanSummary[];
}

/**
 * Reads `count` (whole, ≥ 2), `mean` (finite) and `sd` (≥ 0), three ranges of the same shape.
 *
 * Cost O(cells).
 * @throws {ArgumentProblem} per the input policy.
 * @example readMeans([[500], [480]], [[2.1], [2.4]], [[6], [6.5]], COMPARISON).variants[1] //=> { count: 480, mean: 2.4, sd: 6.5 }
 */
export function readMeans(count: unknown, mean: unknown, sd: unknown, variantCount: VariantCount): MeanInput {
  const table = readVariants([COUNT, MEAN, SD], [count, mean, sd], variantCount);
  const c = table.columns.count as readonly number[];
  const m = table.columns.mean as readonly number[];
  const s = table.columns.sd as readonly number[];
  return { table, variants: c.map((k, i) => ({ count: k, mean: m[i] as number, sd: s[i] as number })) };
}

/** Variants of a counts-per-exposure metric. */
export interface EventInput {
  readonly table: VariantTable;
  readonly variants: EventCounts[];
}

/**
 * Reads `events` (whole, ≥ 0) and `exposure` (> 0), two ranges of the same shape.
 *
 * Cost O(cells).
 * @throws {ArgumentProblem} per the input policy.
 * @example readEvents([[30], [41]], [[1000], [1000]], COMPARISON).variants[0] //=> { events: 30, exposure: 1000 }
 */
export function readEvents(events: unknown, exposure: unknown, count: VariantCount): EventInput {
  const table = readVariants([EVENTS, EXPOSURE], [events, exposure], count);
  const e = table.columns.events as readonly number[];
  const t = table.columns.exposure as readonly number[];
  return { table, variants: e.map((k, i) => ({ events: k, exposure: t[i] as number })) };
}

/** The observed split of an experiment and its planned shares. */
export interface SplitInput {
  readonly table: VariantTable;
  readonly visitors: number[];
  readonly plannedShares: number[] | undefined;
}

/**
 * Reads SRM_PVALUE's `visitors` (whole, ≥ 0) and optional `planned_shares` (same shape, > 0). Blank
 * visitor cells are skipped; a planned share at a skipped position is ignored.
 *
 * Cost O(cells).
 * @throws {ArgumentProblem} per the input policy, or when a variant's planned share is blank.
 * @example readSplit([[5000], [5100]], undefined, COMPARISON).visitors //=> [5000, 5100]
 */
export function readSplit(visitors: unknown, plannedShares: unknown, count: VariantCount): SplitInput {
  const table = readVariants([SRM_VISITORS], [visitors], count);
  const cells = readAlignedCells(PLANNED_SHARES.name, plannedShares, table, SRM_VISITORS.name);
  const shares = cells?.map((cell, i) =>
    checkNumber(PLANNED_SHARES, cell, `${PLANNED_SHARES.name}, item ${(table.positions[i] as number) + 1}`),
  );
  return { table, visitors: [...(table.columns.visitors as readonly number[])], plannedShares: shares };
}

const showNumber = (x: number): string => formatBound(Number(x.toPrecision(6)));

/**
 * Checks that a prior made by PRIOR_FROM_MEAN lies within the declared domain of the functions it feeds
 * (alpha and beta each from 0.001 to 1E+6, stats/limits.ts), so the add-in never hands out a prior its own
 * functions refuse. Cost O(1).
 * @throws {ArgumentProblem} naming mean_rate and strength, the alpha or beta they make and the bound.
 * @example priorFromMeanInDomain({ alpha: 10, beta: 190 }, 0.05, 200) //=> { alpha: 10, beta: 190 }
 */
export function priorFromMeanInDomain(prior: BetaPrior, meanRate: number, strength: number): BetaPrior {
  for (const [part, value] of [
    ['alpha', prior.alpha],
    ['beta', prior.beta],
  ] as const) {
    if (value >= MIN_PRIOR && value <= MAX_PRIOR) continue;
    const side =
      value < MIN_PRIOR ? `below ${MIN_PRIOR}, the weakest` : `above ${formatBound(MAX_PRIOR)}, the strongest`;
    throw new ArgumentProblem(
      `strength: ${strength} with mean_rate ${meanRate} makes the prior's ${part} ${showNumber(value)}, ${side} ` +
        `prior the other functions accept; ${value < MIN_PRIOR ? 'raise' : 'lower'} strength`,
    );
  }
  return prior;
}

/**
 * Checks that a fitted prior (PRIOR_FROM_INTERVAL, PRIOR_FROM_HISTORY) lies within the declared domain of
 * the functions it feeds (0.001 to 1E+6 each). Cost O(1).
 * @throws {StatsError} `not_available` (#N/A): the fit exists but no accepted prior matches it; `why` names
 *   the arguments and says what to change.
 * @example fittedPriorInDomain({ alpha: 14.8, beta: 291 }, 'low and high are very close') //=> { alpha: 14.8, beta: 291 }
 */
export function fittedPriorInDomain(prior: BetaPrior, why: string): BetaPrior {
  const ok = (x: number): boolean => x >= MIN_PRIOR && x <= MAX_PRIOR;
  if (ok(prior.alpha) && ok(prior.beta)) return prior;
  throw new StatsError(
    'not_available',
    `the fitted prior Beta(${showNumber(prior.alpha)}, ${showNumber(prior.beta)}) is outside the priors the other ` +
      `functions accept (alpha and beta each from ${MIN_PRIOR} to ${formatBound(MAX_PRIOR)}): ${why}`,
  );
}
