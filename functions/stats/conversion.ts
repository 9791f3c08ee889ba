/**
 * The conversion read-out (Beta–Binomial model): what the ABTEST conversion functions compute.
 *
 * Each variant's rate has the posterior Beta(α + conversions, β + visitors − conversions) under a
 * Beta(α, β) prior (conjugate updating; Gelman et al., "Bayesian Data Analysis", 3rd ed., §2.4). The
 * posteriors are tabulated in logit(rate) by quadrature/ and compared by compare/ (P(above the control) by
 * Evan Miller's exact sum, betaComparison.ts, where it applies); the first variant is the control.
 * Inputs are checked here with generic messages; the sheet layer adds argument names.
 *
 * Every read-out that tabulates takes an optional last argument `tables` (tableMemo.ts): by default each
 * call tabulates afresh; a TableMemo passed by the caller (the add-in keeps one) lets several calls on the
 * same variants share their tables without changing any result.
 */
import { CLOSED_FORM_MAX_TERMS, closedFormLogProbGreater } from './betaComparison';
import { StatsError, ensure } from './errors';
import { betaWorkingDensity } from './betaDensity';
import {
  differenceQuantile,
  expectedLosses,
  highestProbabilities,
  probabilityGreater,
  ratioChartQuantiles,
  ratioDensityGrid,
  ratioQuantile,
  ratioSf,
} from './compare';
import type { LiftPair, LogDensityPiece, QuantileOf } from './compare';
import { TabulatedDistribution, tabulate } from './quadrature';
import { MAX_COUNT, MAX_VARIANTS, checkLevel, checkLiftDensityCells, checkPoints } from './limits';
import { findRoot } from './numeric';
import { NO_MEMO, solveOncePerKey } from './tableMemo';
import type { TableSource } from './tableMemo';
import type { BetaPrior, ConversionCounts, DensityTable, Interval, IntervalWithMedian } from './types';
import { UNIFORM_PRIOR } from './types';

function checkPrior(prior: BetaPrior): void {
  ensure(
    Number.isFinite(prior.alpha) && prior.alpha > 0,
    `the prior's alpha must be a number greater than 0, not ${prior.alpha}`,
  );
  ensure(
    Number.isFinite(prior.beta) && prior.beta > 0,
    `the prior's beta must be a number greater than 0, not ${prior.beta}`,
  );
}

function checkCounts(variants: readonly ConversionCounts[], minimum: number, maximum: number): void {
  ensure(Array.isArray(variants), 'the variants must be a list of conversions and visitors');
  if (minimum >= 2) {
    ensure(
      variants.length >= minimum && variants.length <= maximum,
      `a comparison needs between ${minimum} and ${maximum} variants, not ${variants.length}`,
    );
  } else {
    ensure(variants.length >= 1, 'at least one variant is needed');
  }
  variants.forEach((v, i) => {
    const where = `variant ${i + 1}`;
    ensure(
      Number.isInteger(v.visitors) && v.visitors >= 1 && v.visitors <= MAX_COUNT,
      `${where}: visitors must be a whole number of at least 1, not ${v.visitors}`,
    );
    ensure(
      Number.isInteger(v.conversions) && v.conversions >= 0,
      `${where}: conversions must be a whole number of at least 0, not ${v.conversions}`,
    );
    ensure(
      v.conversions <= v.visitors,
      `${where}: conversions (${v.conversions}) cannot exceed visitors (${v.visitors})`,
    );
  });
}

/** Posterior Beta shapes (a, b) of one variant. */
function shapes(v: ConversionCounts, prior: BetaPrior): [number, number] {
  return [prior.alpha + v.conversions, prior.beta + (v.visitors - v.conversions)];
}

/**
 * The tabulated posterior of one variant's rate (in logit, coordinate "logit").
 * Cost: one tabulation (~60–80 panels). Throws StatsError('invalid_argument') for bad shapes.
 * @example posteriorOf({ conversions: 7, visitors: 9 }, UNIFORM_PRIOR).cdf(0.5) //=> 0.05468749999999… (pbeta(0.5, 8, 3) = 0.0546875)
 */
export function posteriorOf(
  v: ConversionCounts,
  prior: BetaPrior = UNIFORM_PRIOR,
  tables: TableSource = NO_MEMO,
): TabulatedDistribution {
  const [a, b] = shapes(v, prior);
  return betaTable(a, b, tables);
}

/** The tabulated Beta(a, b) in logit, from `tables` (the key holds both shapes in full precision). */
function betaTable(a: number, b: number, tables: TableSource): TabulatedDistribution {
  return tables.table(`beta-logit:${a}:${b}`, () => tabulate(betaWorkingDensity(a, b), { coordinate: 'logit' }));
}

/**
 * The variants' posteriors, each distinct (conversions, visitors) pair tabulated once: variants with the
 * same counts share one TabulatedDistribution (a table is read-only apart from its deterministic lazy
 * parts, so sharing it changes no value), which compare/ also uses to integrate once per distinct one.
 */
function posteriors(
  variants: readonly ConversionCounts[],
  prior: BetaPrior,
  tables: TableSource,
): TabulatedDistribution[] {
  const seen = new Map<string, TabulatedDistribution>();
  return variants.map((v) => {
    const key = `${v.conversions}/${v.visitors}`;
    let d = seen.get(key);
    if (d === undefined) {
      d = posteriorOf(v, prior, tables);
      seen.set(key, d);
    }
    return d;
  });
}

/**
 * Posterior mean rate of each variant, (α + conversions)/(α + β + visitors).
 * Cost: O(k). Throws StatsError('invalid_argument') for bad counts or prior.
 * @example posteriorMean([{ conversions: 3, visitors: 10 }], { alpha: 1, beta: 1 }) //=> [0.3333333333333333]
 */
export function posteriorMean(variants: readonly ConversionCounts[], prior: BetaPrior = UNIFORM_PRIOR): number[] {
  checkPrior(prior);
  checkCounts(variants, 1, Infinity);
  return variants.map((v) => {
    const [a, b] = shapes(v, prior);
    return a / (a + b);
  });
}

/**
 * Credible interval of each variant's rate.
 *  - 'central': equal tails, [Q((1 − level)/2), Q((1 + level)/2)] (the same as Excel's
 *    BETA.INV((1 − level)/2, α + x, β + n − x) and its upper counterpart);
 *  - 'hdi': the highest-density interval, the shortest interval holding `level` of the posterior
 *    (J. K. Kruschke, "Doing Bayesian Data Analysis", 2nd ed., 2015, §4.3.4). Where the density only
 *    falls (or only rises) the interval starts at 0 (ends at 1); for the flat Beta(1, 1) every interval
 *    of that length is shortest and the central one is returned.
 * Cost: two quantiles per variant (central), ~30 quantiles per variant (hdi).
 * Throws StatsError('invalid_argument') for bad counts, level or prior; StatsError('not_available') for
 * the HDI of a U-shaped posterior (both shapes below 1), which is not one interval.
 * @example rateInterval([{ conversions: 0, visitors: 10 }], 0.95, UNIFORM_PRIOR, 'hdi') //=> [{ lower: 0, upper: 0.2384… }]
 */
export function rateInterval(
  variants: readonly ConversionCounts[],
  level: number,
  prior: BetaPrior = UNIFORM_PRIOR,
  method: 'central' | 'hdi' = 'central',
  tables: TableSource = NO_MEMO,
): Interval[] {
  checkPrior(prior);
  checkCounts(variants, 1, Infinity);
  checkLevel(level);
  ensure(method === 'central' || method === 'hdi', `the method must be "central" or "hdi", not ${String(method)}`);
  return variants.map((v) => {
    const d = posteriorOf(v, prior, tables);
    const tail = (1 - level) / 2;
    if (method === 'central') return { lower: d.quantile(tail), upper: d.quantileUpper(tail) };
    const [a, b] = shapes(v, prior);
    return hdiOf(d, a, b, level);
  });
}

/**
 * The highest-density interval of Beta(a, b) holding `level` (Kruschke 2015, §4.3.4): for a, b > 1 the
 * interval whose ends have equal density, found by Brent's method on the lower tail mass; [0, Q(level)]
 * when the density only falls (a ≤ 1 ≤ b, J-shaped or 0 conversions), [Q(1 − level), 1] when it only
 * rises; the central interval for the flat Beta(1, 1).
 * Cost: one tabulation and ~30 quantiles. Throws StatsError('not_available') for a U-shaped density
 * (a < 1 and b < 1) and StatsError('invalid_argument') for bad shapes or level.
 * @example betaHighestDensityInterval(1, 11, 0.95) //=> { lower: 0, upper: 0.23840419038085… } (1 − 0.05^(1/11) = 0.2384041903808527)
 */
export function betaHighestDensityInterval(a: number, b: number, level: number): Interval {
  checkLevel(level);
  return hdiOf(tabulate(betaWorkingDensity(a, b), { coordinate: 'logit' }), a, b, level);
}

function hdiOf(d: TabulatedDistribution, a: number, b: number, level: number): Interval {
  if (a < 1 && b < 1) {
    throw new StatsError(
      'not_available',
      'the posterior density is U-shaped, so no single highest-density interval exists; use method "central"',
    );
  }
  if (a === 1 && b === 1) return { lower: (1 - level) / 2, upper: (1 + level) / 2 };
  if (a <= 1) return { lower: 0, upper: d.quantile(level) };
  if (b <= 1) return { lower: d.quantileUpper(level), upper: 1 };
  // Unimodal: the lower-tail mass t at which the density is equal at both ends (Kruschke 2015).
  const rest = 1 - level;
  const ends = (t: number): [number, number] => [d.quantile(t), d.quantileUpper(rest - t)];
  const gap = (t: number): number => {
    const [lo, hi] = ends(t);
    const clamp = (v: number) => (Number.isFinite(v) ? v : v > 0 ? 1e300 : -1e300);
    return clamp(d.logValueDensity(lo)) - clamp(d.logValueDensity(hi));
  };
  const tLo = rest * 1e-12;
  const tHi = rest * (1 - 1e-12);
  let t: number;
  if (gap(tLo) >= 0) t = tLo;
  else if (gap(tHi) <= 0) t = tHi;
  else t = findRoot(gap, tLo, tHi, 1e-17 * rest);
  const [lower, upper] = ends(t);
  return { lower, upper };
}

/**
 * Probability that each variant has the highest true rate: ∫ f_i Π_{j≠i} F_j, normalised (sums to 1).
 * Cost: k tabulations and O(k × nodes) interpolations on one shared grid (compare/sharedHighest.ts) for 3 or
 * more variants, two integrals for two. Throws StatsError('invalid_argument') for bad
 * counts or prior, or fewer than 2 / more than 50 variants.
 * @example probHighest([{ conversions: 3, visitors: 10 }, { conversions: 5, visitors: 10 }], UNIFORM_PRIOR)
 * //=> [0.19349845201238…, 0.80650154798761…] (125/646, 521/646)
 */
export function probHighest(
  variants: readonly ConversionCounts[],
  prior: BetaPrior = UNIFORM_PRIOR,
  tables: TableSource = NO_MEMO,
): number[] {
  checkPrior(prior);
  checkCounts(variants, 2, MAX_VARIANTS);
  return highestProbabilities(posteriors(variants, prior, tables));
}

/**
 * For each challenger (variants 2…k), P(its rate > the control's rate).
 * Method: Evan Miller's exact sum ("Formulas for Bayesian A/B Testing", 2015; betaComparison.ts) when a
 * posterior shape is a whole number (always, under a prior with whole-number α or β) that gives at most
 * 20 000 terms and the shapes are small enough for it to keep 1e-12 relative accuracy (log-betas of at
 * most 3000 in size: up to ~45 000 visitors a variant at 1% rates, ~3 000 at 50%); otherwise the
 * quadrature of the tabulated posteriors (compare/ranking.ts probabilityGreater). A challenger with the control's
 * counts gets exactly 1/2.
 * Cost: per challenger a sum of at most 20 000 terms (a few ns each) where the closed form applies, else
 * one tabulation (the control's once) and one integral. Same errors as probHighest.
 * @example probAboveControl([{ conversions: 3, visitors: 10 }, { conversions: 5, visitors: 10 }], UNIFORM_PRIOR)
 * //=> [0.80650154798761…] (521/646 = 0.8065015479876161)
 */
export function probAboveControl(
  variants: readonly ConversionCounts[],
  prior: BetaPrior = UNIFORM_PRIOR,
  tables: TableSource = NO_MEMO,
): number[] {
  checkPrior(prior);
  checkCounts(variants, 2, MAX_VARIANTS);
  const [aC, bC] = shapes(variants[0] as ConversionCounts, prior);
  const challengers = variants.slice(1);
  const closed = challengers.map((v) => {
    const [a, b] = shapes(v, prior);
    // The same counts as the control: two draws of one distribution, 1/2 by exchangeability.
    if (a === aC && b === bC) return 0.5;
    const log = closedFormLogProbGreater(a, b, aC, bC, CLOSED_FORM_MAX_TERMS);
    return log === undefined ? undefined : Math.exp(log);
  });
  const rest = challengers.filter((_, i) => closed[i] === undefined);
  if (rest.length === 0) return closed as number[];
  // Tabulate only the control and the challengers the closed form left.
  const ds = posteriors([variants[0] as ConversionCounts, ...rest], prior, tables);
  const control = ds[0] as TabulatedDistribution;
  const done = new Map<TabulatedDistribution, number>();
  const quadrature = ds.slice(1).map((d) => {
    let v = done.get(d);
    if (v === undefined) {
      v = probabilityGreater(d, control);
      done.set(d, v);
    }
    return v;
  });
  let next = 0;
  return closed.map((v) => v ?? (quadrature[next++] as number));
}

/**
 * For each challenger, the lower, median and upper ends of the equal-tailed credible interval of the
 * relative lift rate/control − 1 (quantiles of the ratio distribution, compare/ratio.ts).
 * Cost: three quantiles per challenger, each 2–4 passes (a tail and its density). Errors as probHighest,
 * plus a level outside (0, 1).
 * @example liftInterval([{ conversions: 50, visitors: 1000 }, { conversions: 65, visitors: 1000 }], 0.95, UNIFORM_PRIOR)
 * //=> [{ lower: -0.0900205694…, median: 0.2959892194…, upper: 0.8570699573… }] (mpmath: -0.0900205695, 0.857069957)
 */
export function liftInterval(
  variants: readonly ConversionCounts[],
  level: number,
  prior: BetaPrior = UNIFORM_PRIOR,
  tables: TableSource = NO_MEMO,
): IntervalWithMedian[] {
  return challengerIntervals(variants, level, prior, tables, ratioQuantile);
}

/**
 * Lower, median and upper `quantile` of each challenger against the control, at the equal-tailed `level`:
 * the shared body of liftInterval (ratio quantiles) and rateDiffInterval (difference quantiles).
 * Cost: three quantiles per distinct challenger (challengers with the same counts are solved once).
 */
function challengerIntervals(
  variants: readonly ConversionCounts[],
  level: number,
  prior: BetaPrior,
  tables: TableSource,
  quantile: (y: TabulatedDistribution, x: TabulatedDistribution, p: number) => number,
): IntervalWithMedian[] {
  checkPrior(prior);
  checkCounts(variants, 2, MAX_VARIANTS);
  checkLevel(level);
  const ds = posteriors(variants, prior, tables);
  const control = ds[0] as TabulatedDistribution;
  const tail = (1 - level) / 2;
  // Challengers with the same counts share one posterior object (posteriors()), so one solve serves them all.
  return solveOncePerKey(
    ds.slice(1),
    (d) => d,
    (d) => ({
      lower: quantile(d, control, tail),
      median: quantile(d, control, 0.5),
      upper: quantile(d, control, 1 - tail),
    }),
  );
}

/**
 * For each challenger, the lower, median and upper ends of the equal-tailed credible interval of the
 * absolute difference rate − control's rate (quantiles of the difference distribution, compare/difference.ts).
 * Cost and errors as liftInterval.
 * @example rateDiffInterval([{ conversions: 50, visitors: 1000 }, { conversions: 65, visitors: 1000 }], 0.95, UNIFORM_PRIOR)
 * //=> [{ lower: -0.0054818921…, median: 0.0149392167…, upper: 0.0355953776… }]
 */
export function rateDiffInterval(
  variants: readonly ConversionCounts[],
  level: number,
  prior: BetaPrior = UNIFORM_PRIOR,
  tables: TableSource = NO_MEMO,
): IntervalWithMedian[] {
  return challengerIntervals(variants, level, prior, tables, differenceQuantile);
}

/**
 * For each challenger, P(rate/control − 1 > minLift); a negative minLift asks "no worse than".
 * Cost: one ratio tail per challenger. Errors as probHighest, plus minLift ≤ −1 or not finite.
 * @example probLiftAbove([{ conversions: 3, visitors: 10 }, { conversions: 5, visitors: 10 }], 0, UNIFORM_PRIOR)
 * //=> [0.80650154798761…] (521/646 = 0.8065015479876161)
 */
export function probLiftAbove(
  variants: readonly ConversionCounts[],
  minLift: number,
  prior: BetaPrior = UNIFORM_PRIOR,
  tables: TableSource = NO_MEMO,
): number[] {
  checkPrior(prior);
  checkCounts(variants, 2, MAX_VARIANTS);
  ensure(Number.isFinite(minLift) && minLift > -1, `the minimum lift must be a number greater than -1, not ${minLift}`);
  const ds = posteriors(variants, prior, tables);
  const control = ds[0] as TabulatedDistribution;
  return ds.slice(1).map((d) => ratioSf(d, control, minLift));
}

/**
 * Expected loss of each variant: E[max over variants of the rate − this variant's rate], the rate given
 * up on average by choosing it (C. Stucchio, "Bayesian A/B Testing at VWO", 2015, defines this loss).
 * Cost: O(k × nodes) on one shared grid for 3 or more variants (the losses far from 0 as E[max] − mean), two
 * integrals for two
 * (compare/losses.ts expectedLosses). Errors as probHighest.
 * @example expectedLoss([{ conversions: 3, visitors: 10 }, { conversions: 5, visitors: 10 }], UNIFORM_PRIOR)
 * //=> [0.18772154170592…, 0.02105487503926…] (Stucchio 2015's closed form)
 */
export function expectedLoss(
  variants: readonly ConversionCounts[],
  prior: BetaPrior = UNIFORM_PRIOR,
  tables: TableSource = NO_MEMO,
): number[] {
  checkPrior(prior);
  checkCounts(variants, 2, MAX_VARIANTS);
  return expectedLosses(posteriors(variants, prior, tables));
}

/** What {@link decide} recommends. */
export interface Decision {
  /** True when the variant at `index` may be chosen: its expected loss is at most maxLoss. */
  readonly choose: boolean;
  /** The variant with the smallest expected loss (0-based; the current leader when choose is false). */
  readonly index: number;
  /** Its expected loss (a rate). */
  readonly loss: number;
  /** The threshold used (a rate). */
  readonly maxLoss: number;
}

/**
 * The decision rule "choose the variant with the smallest expected loss once that loss is at most
 * maxLoss" (the expected-loss stopping rule, Stucchio 2015). Default maxLoss: 1% of the control's
 * posterior mean rate. Cost: as expectedLoss.
 * Throws StatsError('invalid_argument') for bad counts, prior or a maxLoss below 0.
 * @example decide([{ conversions: 300, visitors: 10000 }, { conversions: 420, visitors: 10000 }], undefined, UNIFORM_PRIOR)
 * //=> { choose: true, index: 1, loss: 1.35537062…e-9, maxLoss: 0.000300939812037… } (maxLoss: 1% of 301/10002)
 */
export function decide(
  variants: readonly ConversionCounts[],
  maxLoss: number | undefined,
  prior: BetaPrior = UNIFORM_PRIOR,
  tables: TableSource = NO_MEMO,
): Decision {
  checkPrior(prior);
  checkCounts(variants, 2, MAX_VARIANTS);
  if (maxLoss !== undefined) {
    ensure(
      Number.isFinite(maxLoss) && maxLoss >= 0,
      `the largest acceptable loss must be a number of at least 0, not ${maxLoss}`,
    );
  }
  const threshold = maxLoss ?? 0.01 * (posteriorMean([variants[0] as ConversionCounts], prior)[0] as number);
  const losses = expectedLoss(variants, prior, tables);
  let index = 0;
  losses.forEach((l, i) => {
    if (l < (losses[index] as number)) index = i;
  });
  const loss = losses[index] as number;
  return { choose: loss <= threshold, index, loss, maxLoss: threshold };
}

/**
 * `points` values evenly spread from lo to hi. Throws StatsError('not_available') naming `what` (the chart's
 * quantity) when two neighbours are the same number to double precision (a range of a few units in the last
 * place, e.g. a rate known to 16 digits from 9E+15 visitors): a chart table needs distinct rows.
 */
function evenGrid(lo: number, hi: number, points: number, what: string, instead: string): number[] {
  const grid = Array.from({ length: points }, (_, r) => (r === points - 1 ? hi : lo + ((hi - lo) * r) / (points - 1)));
  const distinct = grid.every((x, r) => r === 0 || x > (grid[r - 1] as number));
  if (!distinct) {
    const place = Math.max(Math.abs(lo), Math.abs(hi)) * Number.EPSILON;
    throw new StatsError(
      'not_available',
      `points: ${points} different rows do not fit: the ${what} run only from ${lo} to ${hi} (numbers a cell ` +
        `holds are about ${Number(place.toPrecision(2))} apart there); ${instead}`,
    );
  }
  return grid;
}

/**
 * A table for a chart of the posterior densities of the rates: `points` rates evenly spread over the
 * union of the variants' central 99.9% intervals, and each variant's density there (per unit of rate).
 * Cost: k tabulations and k × points density evaluations.
 * Throws StatsError('invalid_argument') for bad counts, prior or points (2 … 1000), and
 * StatsError('not_available') when that union is too narrow for `points` different rates in double precision.
 * @example posteriorDensityTable([{ conversions: 5, visitors: 10 }], 3, UNIFORM_PRIOR).grid
 * //=> [0.1100007873…, 0.5000000000…, 0.8899992126…] (Beta(6, 6)'s 0.05% and 99.95% quantiles)
 */
export function posteriorDensityTable(
  variants: readonly ConversionCounts[],
  points: number,
  prior: BetaPrior = UNIFORM_PRIOR,
  tables: TableSource = NO_MEMO,
): DensityTable {
  checkPrior(prior);
  checkCounts(variants, 1, MAX_VARIANTS);
  checkPoints(points);
  const ds = posteriors(variants, prior, tables);
  const lo = Math.min(...ds.map((d) => d.quantile(0.0005)));
  const hi = Math.max(...ds.map((d) => d.quantileUpper(0.0005)));
  const grid = evenGrid(
    lo,
    hi,
    points,
    'posteriors of the rates',
    'the rates are known to every digit a cell shows: read them with RATE_INTERVAL, or ask for fewer points',
  );
  return { grid, densities: ds.map((d) => grid.map((x) => d.density(x))) };
}

/**
 * Where a lift chart's grid runs for one challenger: from its lift's 1% to its 99% quantile, each end kept
 * within three interquartile ranges of the nearer quartile (Tukey's "far out" fences, common practice for
 * telling a long tail from the body). A lift over a control with no conversions is heavy-tailed (its
 * 99.9% quantile can be 1e4 times its median), and a grid out to its 99% quantile would show one spike.
 * Cost: four lift quantiles. Returns 'wide' when the range is not finite (a prior so weak that the
 * control's rate may lie below 1e-300) and 'narrow' when it is empty (the middle half of the lift is one
 * number: rates that are 1 or 0 to double precision under a prior that weak).
 */
function chartRange(
  challenger: TabulatedDistribution,
  control: TabulatedDistribution,
  controlQuantile?: QuantileOf,
  estimate = false,
): ChartRange {
  const found = ratioChartQuantiles(challenger, control, LIFT_CHART_QUANTILES, controlQuantile, estimate);
  const rangeOf = (quantiles: readonly number[]): [number, number] | 'wide' | 'narrow' => {
    const [q01, q25, q75, q99] = quantiles as [number, number, number, number];
    const spread = q75 - q25;
    const lo = Math.max(q01, q25 - LIFT_CHART_FENCE * spread);
    const hi = Math.min(q99, q75 + LIFT_CHART_FENCE * spread);
    if (!(Number.isFinite(lo) && Number.isFinite(hi))) return 'wide';
    return hi > lo ? [lo, hi] : 'narrow';
  };
  const range = rangeOf(found.quantiles);
  return {
    range,
    piece: found.piece,
    pair: found.pair,
    estimated: found.estimated,
    solved: () => (found.estimated ? rangeOf(found.solved()) : range),
  };
}

/** A challenger's chart range (chartRange): the range, the piece of its lift's log density, and the solved range. */
interface ChartRange {
  readonly range: [number, number] | 'wide' | 'narrow';
  readonly piece: LogDensityPiece | undefined;
  /** The pair's rules and exact integrals (compare/ratioGrid.ts), reused for the grid's densities. */
  readonly pair: LiftPair;
  /** Whether `range` comes from the piece's quantile estimates (right to ~1e-12 in log(1 + lift)). */
  readonly estimated: boolean;
  /** The range from the solved quantiles (`range` itself when not estimated). */
  solved(): [number, number] | 'wide' | 'narrow';
}

/**
 * How close an estimated end must come to the union's end for its challenger's quantiles to be solved,
 * relative to the union's width plus 1 + its largest |lift|: a thousand times the estimates' error.
 */
const CHART_END_MARGIN = 1e-9;

/**
 * The chart range of chartRange above. Throws StatsError('not_available') when there is none.
 * @example liftChartRange(tabulate(betaWorkingDensity(1, 1)), tabulate(betaWorkingDensity(1, 1)))[0]
 * //=> -0.97999999999999… (the 1% quantile of Y/X − 1 for two uniforms: P(Y/X ≤ t) = t/2)
 */
export function liftChartRange(challenger: TabulatedDistribution, control: TabulatedDistribution): [number, number] {
  const { range } = chartRange(challenger, control);
  if (typeof range === 'string') {
    throw new StatsError('not_available', `the lift has no chart range: it is spread too ${range}ly`);
  }
  return range;
}

/**
 * Why a challenger's lift has no chart range, in the sheet's words: the prior argument to change, its
 * value, the counts concerned (named by their counts: blank rows make the sheet's and the core's variant
 * numbers differ) and what helps.
 */
function noChartRange(
  why: 'wide' | 'narrow',
  prior: BetaPrior,
  control: ConversionCounts,
  challenger: ConversionCounts,
): StatsError {
  const counts = (v: ConversionCounts) => `conversions ${v.conversions}, visitors ${v.visitors}`;
  if (why === 'wide') {
    return new StatsError(
      'not_available',
      `prior_alpha ${prior.alpha} is too weak for a lift chart: the control (${counts(control)}) could have a ` +
        'rate of almost 0, so the lift has no finite range; use a prior_alpha of at least 1 (the default is 1)',
    );
  }
  return new StatsError(
    'not_available',
    `prior_alpha ${prior.alpha} and prior_beta ${prior.beta} are too weak for a lift chart: the middle half of ` +
      `the lift of the challenger (${counts(challenger)}) is a single number; use a prior of at least 1 ` +
      'and 1 (the default)',
  );
}

/**
 * Whether a posterior's middle half (its quartiles) is narrower than 1e-12 of its size, i.e. one number for
 * a chart. Cost: two quantiles.
 */
function middleHalfPinned(d: TabulatedDistribution): boolean {
  const q25 = d.quantile(0.25);
  const q75 = d.quantileUpper(0.25);
  return !(q75 - q25 > 1e-12 * Math.max(Math.abs(q25), Math.abs(q75)));
}

/** The quantiles of each challenger's lift a chart's grid is chosen from (see liftChartRange). */
const LIFT_CHART_QUANTILES = [0.01, 0.25, 0.75, 0.99] as const;
/** How many interquartile ranges beyond the quartiles a lift chart's grid may reach. */
const LIFT_CHART_FENCE = 3;

/**
 * A table for a chart of the posterior densities of each challenger's relative lift over the control:
 * `points` lifts evenly spread from the lowest to the highest end of the challengers' chart ranges
 * (liftChartRange: the 1%–99% lift quantiles, kept within three interquartile ranges of the quartiles),
 * and each challenger's lift density there (compare/ratioGrid.ts: exact ratio densities, interpolated
 * between them in log(1 + lift) where checked to be as accurate).
 * Cost: at most 4 (k − 1) quantiles (only those of challengers that may set the grid's ends when their
 * fitted piece gives estimates) and at most 1.25 (k − 1) × points + 16 (k − 1) ≤ 7,100 one-dimensional
 * integrals (typically 16 a challenger at thousands of visitors; challengers with the same counts count
 * once), each either 24 evaluations by the checked Gauss rules of ratioGrid.ts (PairRule), none where a bound
 * shows the density underflows, or the exact pruned integral. Errors as posteriorDensityTable, and 2 … 50 variants,
 * StatsError('invalid_argument') for more than 5,000 density values (limits.ts checkLiftDensityCells);
 * StatsError('not_available') naming prior_alpha (and prior_beta) when a lift has no chart range.
 * @example liftDensityTable([{ conversions: 5, visitors: 10 }, { conversions: 5, visitors: 10 }], 3, UNIFORM_PRIOR).grid.length //=> 3
 */
export function liftDensityTable(
  variants: readonly ConversionCounts[],
  points: number,
  prior: BetaPrior = UNIFORM_PRIOR,
  tables: TableSource = NO_MEMO,
): DensityTable {
  checkPrior(prior);
  checkCounts(variants, 2, MAX_VARIANTS);
  checkPoints(points);
  checkLiftDensityCells(points, variants.length - 1);
  const ds = posteriors(variants, prior, tables);
  const control = ds[0] as TabulatedDistribution;
  const challengers = ds.slice(1);
  // The control's marginal quantiles the quantile starts use are the same for every challenger.
  const remembered = new Map<string, number>();
  const controlQuantile = (p: number, upper: boolean): number => {
    const key = `${upper ? 'upper' : 'lower'} ${p}`;
    let q = remembered.get(key);
    if (q === undefined) {
      q = upper ? control.quantileUpper(p) : control.quantile(p);
      remembered.set(key, q);
    }
    return q;
  };
  // Both rates pinned to one number (their middle halves narrower than 1e-12 of their size: rates that are
  // 1 to double precision under a prior of 0.001): the lift's middle half is one number too, answered before
  // its quantiles are solved for (those solves cannot converge there and would run past the work budget).
  const controlPinned = middleHalfPinned(control);
  const fail = (i: number, why: 'wide' | 'narrow'): StatsError =>
    noChartRange(why, prior, variants[0] as ConversionCounts, variants[i + 1] as ConversionCounts);
  // Each challenger's range from the estimates of its fitted piece where it has one; then the ranges that
  // may set an end of the union (within CHART_END_MARGIN of it), or that are near empty, are solved, so the
  // grid's ends are the solved quantiles' (the others lie inside by more than their estimates' error).
  // Challengers with the same counts share one posterior object (posteriors()): each distinct one is charted
  // once, under the index of its first appearance (which the messages name), and its column copied.
  const firstAt = new Map<TabulatedDistribution, number>();
  challengers.forEach((d, i) => {
    if (!firstAt.has(d)) firstAt.set(d, i);
  });
  const distinct = [...firstAt.keys()];
  const charts = distinct.map((d) => {
    const i = firstAt.get(d) as number;
    if (controlPinned && middleHalfPinned(d)) throw fail(i, 'narrow');
    const chart = chartRange(d, control, controlQuantile, true);
    const range = typeof chart.range === 'string' ? chart.solved() : chart.range;
    if (typeof range === 'string') throw fail(i, range);
    return { chart, range, settled: typeof chart.range === 'string' || !chart.estimated };
  });
  const roughLo = Math.min(...charts.map((c) => c.range[0]));
  const roughHi = Math.max(...charts.map((c) => c.range[1]));
  // The estimates are right to ~1e-12 in log(1 + lift), i.e. to ~1e-12 (1 + |lift|) in the lift.
  const margin = CHART_END_MARGIN * (roughHi - roughLo + 1 + Math.max(Math.abs(roughLo), Math.abs(roughHi)));
  const ranges = charts.map(({ chart, range, settled }, j) => {
    if (settled || (range[0] > roughLo + margin && range[1] < roughHi - margin && range[1] - range[0] > margin)) {
      return range;
    }
    const solved = chart.solved();
    if (typeof solved === 'string') throw fail(firstAt.get(distinct[j] as TabulatedDistribution) as number, solved);
    return solved;
  });
  const lo = Math.min(...ranges.map((r) => r[0]));
  const hi = Math.max(...ranges.map((r) => r[1]));
  const grid = evenGrid(
    lo,
    hi,
    points,
    'lifts in the chart',
    'the lifts are known to every digit a cell shows: read them with LIFT_INTERVAL, or ask for fewer points',
  );
  const columns = new Map<TabulatedDistribution, number[]>();
  distinct.forEach((d, j) => {
    columns.set(d, ratioDensityGrid(d, control, grid, charts[j]?.chart.piece, charts[j]?.chart.pair).densities);
  });
  return { grid, densities: challengers.map((d) => [...(columns.get(d) as number[])]) };
}
