/**
 * Planning a test that is looked at several times: the chance of a false alarm or of a win when the
 * read-out is checked at each of several looks and the test stops at the first declaration, and the one
 * threshold that keeps the false alarms at a chosen rate.
 *
 * The decision at each look is the one of planning.decisionPower: the challenger is declared when
 * P(challenger beats control | data) ≥ threshold under the Beta posteriors; with two sides, either variant
 * is declared when its probability of being higher reaches the threshold. `visitorsAtLooks` are the
 * cumulative visitors per variant at each look (the same in both variants).
 *
 * Two methods, chosen by the work the exact one would take (never by the function asked):
 * - exact: a dynamic programme over both variants' conversion counts (looksExact.ts), exact up to rounding
 *   (within 1e-11 of scipy's enumeration), used while it needs at most EXACT_BUDGET multiply-adds per run (small tests);
 * - calibrated normal: the chance of declaring at each look alone is computed exactly on the lattice of
 *   outcomes (decisionLattice.ts lookPower, the same number as DECISION_POWER at that size), turned into a
 *   bound z_k = Φ⁻¹(1 − P_k) on the standardised statistic, and the looks are joined by the correlation
 *   √(n_j/n_k) of a process with independent increments (recursive integration, brownianCrossing.ts). Its
 *   error against the exact programme, measured in test/reference/looks/looks_reference.py, falls like
 *   1/(n p (1 − p)) and grows with the number of looks; it stays below 1e-3 where this module uses it.
 *
 * Cautions: these chances assume the looks happen at the planned sizes and that the split of traffic is as
 * planned; they say nothing about a test stopped for other reasons. For regulated or health-related
 * decisions, have a qualified statistician check the plan.
 */
import { ensure, StatsError } from './errors';
import { brownianCrossing } from './brownianCrossing';
import { MAX_PLANNED_VISITORS } from './limits';
import { type BinomialWindow, binomialWindow, lookPower, upperTails } from './decisionLattice';
import {
  type CrossingMemo,
  crossingMemo,
  exactCrossing,
  exactWork,
  type LookLattice,
  lookLattices,
  readOutValuesBetween,
} from './looksExact';
import { normalCdf, normalQuantile } from './special/normal';
import { type BetaPrior, UNIFORM_PRIOR } from './types';

/** Most looks a plan may have. */
export const MAX_LOOKS = 100;
/** Most visitors per variant at a look: the planners' ceiling (limits.ts). */
export const MAX_LOOK_VISITORS = MAX_PLANNED_VISITORS;
/** Thresholds are above ½ and at most this. */
export const MAX_THRESHOLD = 0.999999;
/** False-alarm targets lie in [MIN_FALSE_ALARM, MAX_FALSE_ALARM]. */
export const MIN_FALSE_ALARM = 1e-6;
export const MAX_FALSE_ALARM = 0.5;
/** Prior parameters lie in [MIN_PRIOR, MAX_PRIOR]. */
export const MIN_PRIOR = 1e-3;
export const MAX_PRIOR = 1e7;

/**
 * Work one run of the exact programme may take, in multiply-adds of its convolutions plus LATTICE_WEIGHT per
 * point of its lattices (each look's state array is zeroed, convolved into and scanned for declarations);
 * above it the calibrated normal method is used. With more looks the normal method's error grows, so the
 * budget grows with the looks. Measured with `npm run bench -- --section=worst` on a busy 2-core machine:
 * ~1 ns a multiply-add and ~14 ns a point of the lattice, so a run at the budget of 100 looks takes up to
 * ~200 ms (100 looks one visitor apart, where the normal method is not an option: its recursive
 * integration needs looks further apart than that).
 */
const EXACT_BUDGET_BASE = 3e7;
const EXACT_BUDGET_PER_LOOK = 1.5e6;
/** Work of one point of the lattices in one run, in multiply-adds (the weight the method choice was set with). */
const LATTICE_WEIGHT = 10;
/**
 * The normal method's windows of counts keep pmf values down to this fraction of the peak (±7.4 standard
 * deviations, 14% narrower than DECISION_POWER's 1e-16): the mass left out is below 1e-13, far under that
 * method's own error (1e-3), and a look alone still matches DECISION_POWER within 1e-11.
 */
const NORMAL_WINDOW_CUTOFF = 1e-12;
/** Steps of the lattice walks (all looks together) one evaluation of the normal method may take (~40 ms). */
const WALK_BUDGET = 6e6;
/** The same for THRESHOLD_FOR_LOOKS, which evaluates several times. */
const THRESHOLD_WALK_BUDGET = 2.5e6;
/** Runs THRESHOLD_FOR_LOOKS may spend with the normal method, in units of one run at its walk budget. */
const THRESHOLD_RUNS = 6;
/**
 * Work THRESHOLD_FOR_LOOKS may spend on runs of the exact programme after the two it always takes (the
 * predicted root and its correction): at the largest exact plans that is about one more run.
 */
const THRESHOLD_EXACT_WORK = 6e7;
/**
 * THRESHOLD_FOR_LOOKS solves to this width on the Φ⁻¹(threshold) scale (a threshold to ~3e-6 near 0.99;
 * the rate moves by ~1e-5 over it, less than the normal method's own error).
 */
const THRESHOLD_TOLERANCE = 1e-4;
/**
 * When THRESHOLD_FOR_LOOKS can afford only two exact runs: the first is this far below the calibrated normal
 * method's root on the Φ⁻¹(threshold) scale (that method is within 1e-3 of the exact rate, ~0.01–0.02 on this
 * scale), the second this far above the corrected root (the correction's error, measured at 100 looks, is
 * below 2e-4 on this scale).
 */
const TWO_RUN_MARGIN = 0.02;
const TWO_RUN_AIM = 3e-4;

/** Which method answered, with the probability of a first declaration at each look. */
export interface LooksResult {
  readonly probability: number;
  readonly byLook: readonly number[];
  readonly method: 'exact' | 'normal';
}

// ---------------------------------------------------------------------------------------------------
// Checks

function checkRate(rate: number, what: string): void {
  ensure(typeof rate === 'number' && Number.isFinite(rate), `${what} must be a finite number, got ${String(rate)}`);
  ensure(rate > 0 && rate < 1, `${what} must be between 0 and 1 (exclusive), got ${rate}`);
}

function checkThreshold(threshold: number): void {
  ensure(
    typeof threshold === 'number' && threshold > 0.5 && threshold <= MAX_THRESHOLD,
    `the threshold must be above 0.5 and at most ${MAX_THRESHOLD}, got ${String(threshold)}`,
  );
}

function checkSides(sides: number): void {
  ensure(sides === 1 || sides === 2, `sides must be 1 or 2, got ${String(sides)}`);
}

function checkPrior(prior: BetaPrior): void {
  const ok = (v: number): boolean => typeof v === 'number' && v >= MIN_PRIOR && v <= MAX_PRIOR;
  ensure(
    typeof prior === 'object' && prior !== null && ok(prior.alpha) && ok(prior.beta),
    `prior_alpha and prior_beta must each be between ${MIN_PRIOR} and ${MAX_PRIOR} for planning, got ${String(prior?.alpha)} and ${String(prior?.beta)}`,
  );
}

/** Checks the looks: 1 … MAX_LOOKS whole numbers, increasing, from 1 to MAX_LOOK_VISITORS. */
export function checkLooks(visitorsAtLooks: readonly number[]): number[] {
  ensure(Array.isArray(visitorsAtLooks), 'the visitors at looks must be a list of numbers');
  ensure(
    visitorsAtLooks.length >= 1 && visitorsAtLooks.length <= MAX_LOOKS,
    `there must be 1 to ${MAX_LOOKS} looks, got ${visitorsAtLooks.length}`,
  );
  visitorsAtLooks.forEach((n, i) => {
    ensure(
      typeof n === 'number' && Number.isInteger(n),
      `look ${i + 1}: ${String(n)} is not a whole number of visitors`,
    );
    ensure(n >= 1 && n <= MAX_LOOK_VISITORS, `look ${i + 1}: ${n} visitors is outside 1 to ${MAX_LOOK_VISITORS}`);
    if (i > 0) {
      const before = visitorsAtLooks[i - 1] as number;
      ensure(
        n > before,
        `look ${i + 1}: ${n} visitors is not more than the ${before} of look ${i} (the counts are cumulative)`,
      );
    }
  });
  return [...visitorsAtLooks];
}

// ---------------------------------------------------------------------------------------------------
// The two methods behind one interface

/** A planned test with its rates, ready to be evaluated at any threshold. */
interface Plan {
  readonly looks: readonly number[];
  readonly pA: number;
  readonly pB: number;
  readonly prior: BetaPrior;
  readonly method: 'exact' | 'normal';
  /** exact: the lattices of every look. */
  readonly lattices?: readonly LookLattice[];
  /**
   * normal: the windows of look k (B's shared with A under no difference) and B's tails; kept for a plan
   * evaluated many times, made afresh per look for one evaluation (100 looks of 1e9 would hold ~50 MB).
   */
  readonly windowsAt?: (k: number) => { a: BinomialWindow; b: BinomialWindow; tailsB: Float64Array };
  /** Cost of one run, in the unit of its budget. */
  readonly runCost: number;
  /** normal: points per unit of the recursive integration's grid (brownianCrossing's r; 12 unless coarser). */
  readonly grid?: number;
}

function exactBudget(looks: number): number {
  return EXACT_BUDGET_BASE + EXACT_BUDGET_PER_LOOK * looks;
}

/** Steps of the lattice walks of all looks (window of A, window of B, boundary span). */
function walkSteps(looks: readonly number[], pA: number, pB: number): number {
  let steps = 0;
  for (const n of looks) {
    const sdA = Math.sqrt(n * pA * (1 - pA));
    const sdB = Math.sqrt(n * pB * (1 - pB));
    steps += 17.2 * (sdA + sdB) + 5 * Math.sqrt(n * (pA * (1 - pA) + pB * (1 - pB))) + 10;
  }
  return steps;
}

/** Which method to use: chosen by the work ('auto', what the public functions do) or forced (tests, bench). */
export type LooksMethod = 'auto' | 'exact' | 'normal';

function makePlan(
  looks: readonly number[],
  pA: number,
  pB: number,
  prior: BetaPrior,
  what: string,
  method: LooksMethod = 'auto',
  walkBudget = WALK_BUDGET,
  keepWindows = false,
): Plan {
  const work = exactWork(looks, pA, pB);
  const exactFits = work.perRun + LATTICE_WEIGHT * work.setup <= exactBudget(looks.length);
  if (method === 'exact' || (method === 'auto' && exactFits)) {
    return {
      looks,
      pA,
      pB,
      prior,
      method: 'exact',
      lattices: lookLattices(looks, pA, pB, prior),
      runCost: work.perRun + LATTICE_WEIGHT * work.setup,
    };
  }
  return normalPlan(looks, pA, pB, prior, what, walkBudget, keepWindows);
}

/** The calibrated normal method's plan (windows of each look); throws when its walks exceed the budget. */
function normalPlan(
  looks: readonly number[],
  pA: number,
  pB: number,
  prior: BetaPrior,
  what: string,
  walkBudget: number,
  keepWindows = false,
): Plan {
  const steps = walkSteps(looks, pA, pB);
  if (steps > walkBudget) {
    throw new StatsError(
      'invalid_argument',
      `${what}: these looks are too many and too large to plan within the time a worksheet function may take ` +
        `(about ${(steps / 1e6).toPrecision(2)} million steps of work; at most ${walkBudget / 1e6} million): use fewer ` +
        'looks or fewer visitors per look',
    );
  }
  const make = (n: number): { a: BinomialWindow; b: BinomialWindow; tailsB: Float64Array } => {
    const a = binomialWindow(n, pA, NORMAL_WINDOW_CUTOFF);
    const b = pB === pA ? a : binomialWindow(n, pB, NORMAL_WINDOW_CUTOFF);
    return { a, b, tailsB: upperTails(b) };
  };
  const kept = keepWindows ? looks.map(make) : undefined;
  const windowsAt = (k: number): ReturnType<typeof make> =>
    kept !== undefined ? (kept[k] as ReturnType<typeof make>) : make(looks[k] as number);
  return { looks, pA, pB, prior, method: 'normal', windowsAt, runCost: steps };
}

/**
 * The probability that some look declares (challenger at rate `challengerRate`, control at `rate`), by the
 * method asked: what falseAlarmWithLooks and powerWithLooks compute, with the method exposed so that tests
 * and the benchmark can compare the two. 'exact' is not bounded by the budget: for tests only.
 * Throws as falseAlarmWithLooks.
 * @example crossingWithLooks(0.1, 0.1, [100, 200], 0.95, 1, UNIFORM_PRIOR, 'exact').method //=> 'exact'
 */
export function crossingWithLooks(
  rate: number,
  challengerRate: number,
  visitorsAtLooks: readonly number[],
  threshold: number,
  sides: 1 | 2,
  prior: BetaPrior,
  method: LooksMethod = 'auto',
): LooksResult {
  checkRate(rate, 'the baseline rate');
  checkRate(challengerRate, "the challenger's rate");
  const looks = checkLooks(visitorsAtLooks);
  checkThreshold(threshold);
  checkSides(sides);
  ensure(sides === 1 || challengerRate === rate, 'two sides are planned with no true difference only');
  checkPrior(prior);
  return evaluate(makePlan(looks, rate, challengerRate, prior, 'visitors_at_looks', method), threshold, sides);
}

/** Bound on the standardised statistic with P(Z ≥ bound) = p. */
function upperBound(p: number): number {
  if (p <= 0) return Infinity;
  if (p >= 1) return -Infinity;
  return -normalQuantile(p);
}

/** The normal method's crossing probability, given the chance of declaring at each look alone. */
function calibratedCrossing(
  looks: readonly number[],
  marginals: readonly number[],
  sides: 1 | 2,
  grid?: number,
): { probability: number; byLook: number[] } {
  const upper = marginals.map(upperBound);
  // With two sides a look whose bound is at or below 0 has no region left between −bound and bound (each
  // side alone declares half the time or more): it declares for certain, as does a bound of −∞.
  const first = upper.findIndex((b) => b === -Infinity || (sides === 2 && b <= 0));
  if (first >= 0) {
    // A look that declares for certain: nothing after it matters.
    const before =
      first === 0
        ? { probability: 0, byLook: [] as number[] }
        : calibratedCrossing(looks.slice(0, first), marginals.slice(0, first), sides, grid);
    return {
      probability: 1,
      byLook: [...before.byLook, 1 - before.probability, ...looks.slice(first + 1).map(() => 0)],
    };
  }
  const lower = sides === 2 ? upper.map((b) => -b) : undefined;
  return brownianCrossing(looks, upper, lower, grid);
}

/** Evaluates a plan at a threshold: the probability that some look declares. */
function evaluate(plan: Plan, threshold: number, sides: 1 | 2, memo?: CrossingMemo): LooksResult {
  if (plan.method === 'exact') {
    const r = exactCrossing(plan.lattices as readonly LookLattice[], threshold, sides, memo);
    return { ...r, method: 'exact' };
  }
  // Each look alone: the exact decision power there. With two sides and no difference between the
  // variants, declaring the control is as likely as declaring the challenger (the labels can be swapped).
  const windowsAt = plan.windowsAt as NonNullable<Plan['windowsAt']>;
  const marginals = plan.looks.map((n, k) => {
    const w = windowsAt(k);
    return lookPower(n, w.a, w.b, threshold, plan.prior, w.tailsB);
  });
  const r = calibratedCrossing(plan.looks, marginals, sides, plan.grid);
  return { ...r, method: 'normal' };
}

// ---------------------------------------------------------------------------------------------------
// The public functions

/**
 * The false-alarm rate of a test looked at several times: the probability that, with no true difference
 * (both variants at `baselineRate`), some look declares a winner (the challenger when P(beats control) ≥
 * threshold; with sides = 2 either variant when its P(higher) ≥ threshold), stopping at the first.
 *
 * Method: exact enumeration of both variants' counts from look to look while its work is below a budget
 * (3e7 + 1.5e6 per look, in multiply-adds with the lattice weighed in), else the calibrated normal method
 * (each look's own chance computed exactly, the looks joined by recursive integration); see the module
 * comment.
 * Accuracy: exact up to rounding on the first (within 1e-11 of scipy's enumeration); within 1e-3 of the
 * exact enumeration on the second (measured, test/reference/looks/looks_reference.py), and within ~1e-4 once n·p·(1 − p) ≥ 2000 at the last look.
 * Cost: ≤ ~200 ms (exact), or O(Σ_k √(n_k p(1 − p))) walk steps plus O(K·(12r)²) for the integration.
 * Throws StatsError('invalid_argument') for a rate outside (0, 1), looks that are not 1 … 100 increasing
 * whole numbers from 1 to 1e9, a threshold outside (0.5, 0.999999], sides other than 1 and 2, a prior
 * outside [0.001, 1e7], or looks too large for the work budget.
 * @example falseAlarmWithLooks(0.05, [1000, 2000, 3000, 4000, 5000]).probability //=> 0.1294… (one look: about 0.05)
 */
export function falseAlarmWithLooks(
  baselineRate: number,
  visitorsAtLooks: readonly number[],
  threshold = 0.95,
  sides: 1 | 2 = 1,
  prior: BetaPrior = UNIFORM_PRIOR,
): LooksResult {
  checkRate(baselineRate, 'the baseline rate');
  const looks = checkLooks(visitorsAtLooks);
  checkThreshold(threshold);
  checkSides(sides);
  checkPrior(prior);
  return evaluate(makePlan(looks, baselineRate, baselineRate, prior, 'visitors_at_looks'), threshold, sides);
}

/**
 * The power of a test looked at several times: the probability that a challenger whose true rate is
 * baselineRate·(1 + lift) is declared (P(beats control) ≥ threshold) at one of the looks, the test
 * stopping at the first declaration. With lift 0 it is the one-sided false-alarm rate.
 *
 * Method, accuracy and cost as {@link falseAlarmWithLooks} (one-sided).
 * Throws as falseAlarmWithLooks, and for a lift ≤ −1 or a challenger rate baselineRate·(1 + lift) ≥ 1.
 * @example powerWithLooks(0.05, 0.2, [2000, 4000, 6000, 8000]).probability //=> 0.9053… (one look at 8000: 0.8709…)
 */
export function powerWithLooks(
  baselineRate: number,
  lift: number,
  visitorsAtLooks: readonly number[],
  threshold = 0.95,
  prior: BetaPrior = UNIFORM_PRIOR,
): LooksResult {
  checkRate(baselineRate, 'the baseline rate');
  ensure(
    typeof lift === 'number' && Number.isFinite(lift) && lift > -1,
    `the lift must be a number greater than -1, got ${String(lift)}`,
  );
  const challenger = baselineRate * (1 + lift);
  ensure(challenger > 0 && challenger < 1, `baseline rate × (1 + lift) must be between 0 and 1, got ${challenger}`);
  const looks = checkLooks(visitorsAtLooks);
  checkThreshold(threshold);
  checkPrior(prior);
  return evaluate(makePlan(looks, baselineRate, challenger, prior, 'visitors_at_looks'), threshold, 1);
}

/**
 * The one threshold to use at every look so that the false-alarm rate of {@link falseAlarmWithLooks} is at
 * most `falseAlarm`: the smallest such threshold to within 1e-4 on the Φ⁻¹(threshold) scale. Where the rate
 * moves in steps (small tests, exact method) the value returned is the middle of the step's interval of
 * thresholds, all of which give the same rate (then at most falseAlarm, possibly below it). For the
 * largest plans of the exact method the search stops after the runs its budget allows: the threshold still
 * keeps the rate at or below falseAlarm (checked by an exact run) but may lie a little above the smallest.
 * Where the budget allows only two exact runs, they are placed to bracket the root (the first 0.02 below the
 * calibrated normal method's root on the Φ⁻¹ scale, the second 3e-4 above the root corrected by the exact
 * rate measured at the first): on the benchmark's 100-look plans the threshold's rate is then 0.04994–0.04999
 * for a target of 0.05, within 3e-4 on the Φ⁻¹ scale of the smallest threshold found by more runs.
 *
 * Method: the same method as falseAlarmWithLooks for the same looks (so falseAlarmWithLooks at the result
 * is ≤ falseAlarm). Normal method: a first guess from the normal limit (equal bounds z at every look,
 * Pocock 1977), then secant steps on Φ⁻¹(threshold) inside a bracket. Exact method: the root of the
 * calibrated normal method, corrected by its offset from the exact rate there, then secant steps and, once
 * few read-out probabilities lie in the bracket, a bisection over the steps of the rate.
 * Cost: 4–10 runs of the normal method, or 2 exact runs + up to 6e7 multiply-adds (a lattice point weighed as
 * 10) of exact runs, plus up to ~20 recursive integrations (on the coarse grid for the exact method's model).
 * Throws StatsError('invalid_argument') as falseAlarmWithLooks, or for falseAlarm outside [1e-6, 0.5];
 * StatsError('not_available') when even the threshold 0.999999 gives more false alarms than asked.
 * @example thresholdForLooks(0.05, [1e6, 2e6, 3e6, 4e6, 5e6], 0.05, 2) //=> 0.99209… (Φ(2.413), Pocock's z for 5 looks)
 */
export function thresholdForLooks(
  baselineRate: number,
  visitorsAtLooks: readonly number[],
  falseAlarm = 0.05,
  sides: 1 | 2 = 1,
  prior: BetaPrior = UNIFORM_PRIOR,
): number {
  return thresholdForLooksDetails(baselineRate, visitorsAtLooks, falseAlarm, sides, prior).threshold;
}

/**
 * THRESHOLD_FOR_LOOKS with the details of its solution (the threshold and its rate, a threshold just below
 * it whose rate is above the target, the runs it took, the method): for tests and the side panel.
 * Throws as thresholdForLooks.
 */
export function thresholdForLooksDetails(
  baselineRate: number,
  visitorsAtLooks: readonly number[],
  falseAlarm = 0.05,
  sides: 1 | 2 = 1,
  prior: BetaPrior = UNIFORM_PRIOR,
): ThresholdSolution & { readonly method: 'exact' | 'normal' } {
  checkRate(baselineRate, 'the baseline rate');
  const looks = checkLooks(visitorsAtLooks);
  ensure(
    typeof falseAlarm === 'number' && falseAlarm >= MIN_FALSE_ALARM && falseAlarm <= MAX_FALSE_ALARM,
    `the false-alarm rate must be between ${MIN_FALSE_ALARM} and ${MAX_FALSE_ALARM}, got ${String(falseAlarm)}`,
  );
  checkSides(sides);
  checkPrior(prior);
  const plan = makePlan(
    looks,
    baselineRate,
    baselineRate,
    prior,
    'visitors_at_looks',
    'auto',
    THRESHOLD_WALK_BUDGET,
    true,
  );
  return { ...solveThreshold(plan, falseAlarm, sides), method: plan.method };
}

// ---------------------------------------------------------------------------------------------------
// The threshold solver

const U_MIN = 1e-9; // threshold just above ½
const U_MAX = normalQuantile(MAX_THRESHOLD);

/** The grid of the recursive integration for starting points and slopes only (errors ~1e-5 at 30 looks). */
const COARSE_GRID = 6;
/** Rougher still, for the start of the two-run search (rates within ~3e-4 of the fine grid at 100 looks). */
const ROUGH_GRID = 3;

/** Normal-limit guess: the z with P(some |Z_k| ≥ z) (or Z_k ≥ z) = target for equal bounds. */
function normalLimitGuess(
  looks: readonly number[],
  target: number,
  sides: 1 | 2,
  tolerance = 1e-5,
  grid = COARSE_GRID,
): number {
  const rate = (z: number): number =>
    brownianCrossing(
      looks,
      looks.map(() => z),
      sides === 2 ? looks.map(() => -z) : undefined,
      grid,
    ).probability;
  // Secant on log(rate) against z, from the one-look value, kept in [U_MIN, 8].
  let z0 = -normalQuantile(target / sides);
  let f0 = Math.log(rate(z0) / target);
  let z1 = z0 + 0.3;
  let f1 = Math.log(rate(z1) / target);
  for (let i = 0; i < 8 && Math.abs(z1 - z0) > tolerance; i++) {
    // a rate of 0 (far beyond the looks' reach) gives log 0: keep the last finite point
    if (f1 === f0 || !Number.isFinite(f0) || !Number.isFinite(f1)) break;
    const z2 = Math.min(Math.max(z1 - (f1 * (z1 - z0)) / (f1 - f0), U_MIN), 8);
    z0 = z1;
    f0 = f1;
    z1 = z2;
    f1 = Math.log(rate(z1) / target);
  }
  return Math.min(Math.max(z1, U_MIN), U_MAX);
}

/** The threshold found, a threshold just below it whose rate is above alpha, and the runs it took. */
export interface ThresholdSolution {
  readonly threshold: number;
  readonly rate: number;
  readonly below: number;
  readonly rateBelow: number;
  readonly runs: number;
}

function solveThreshold(plan: Plan, alpha: number, sides: 1 | 2): ThresholdSolution {
  const cost = Math.max(plan.runCost, 1);
  const allowed =
    plan.method === 'exact'
      ? Math.min(60, 2 + Math.floor(THRESHOLD_EXACT_WORK / cost))
      : Math.min(60, Math.max(6, Math.floor((THRESHOLD_RUNS * THRESHOLD_WALK_BUDGET) / cost)));
  let runsLeft = allowed;
  // (two exact runs at thresholds apart share no looks' declarations: no memo then)
  const memo = plan.method === 'exact' && allowed > 2 ? crossingMemo() : undefined;
  // The bracket: lo has a rate above alpha, hi a rate at most alpha (u is Φ⁻¹ of the threshold).
  let lo = -Infinity;
  let loRate = NaN;
  let hi = Infinity;
  let hiRate = NaN;
  const visit = (u: number): number => {
    runsLeft--;
    const r = evaluate(plan, normalCdf(u), sides, memo).probability;
    if (r > alpha && u > lo) {
      lo = u;
      loRate = r;
    } else if (r <= alpha && u < hi) {
      hi = u;
      hiRate = r;
    }
    return r;
  };
  let before: { u: number; r: number };
  let last: { u: number; r: number };
  if (plan.method === 'exact') {
    // Predict with the calibrated normal method (cheap at these sizes), then correct it by its offset
    // from the exact rate: the offset changes little over a small change of threshold. The model's
    // integration runs on the coarse grid (~1e-5 from the fine one, a smooth error the offset absorbs).
    const model = {
      ...normalPlan(plan.looks, plan.pA, plan.pB, plan.prior, 'visitors_at_looks', Infinity, true),
      grid: COARSE_GRID,
    };
    const modelAt = (u: number): number => evaluate(model, normalCdf(u), sides).probability;
    // With two runs only, the first exact run lies well below the model's root: that root is wanted to 1e-3.
    const twoRuns = allowed <= 2;
    const startGrid = twoRuns ? ROUGH_GRID : COARSE_GRID;
    const guess = normalLimitGuess(plan.looks, alpha, sides, twoRuns ? TWO_RUN_MARGIN / 20 : undefined, startGrid);
    const slope = normalLimitSlope(plan.looks, guess, sides, startGrid);
    const first = solveModel(modelAt, alpha, guess, slope, undefined, twoRuns ? TWO_RUN_MARGIN / 20 : undefined);
    if (twoRuns) {
      // Two runs only (the largest plans): the first below the model's root by more than the model's error,
      // so that its rate is above alpha; the second at the root corrected by the offset measured there,
      // a little above it, so that its rate is at most alpha. The bracket is then found without a third.
      const u0 = clampU(first.u - TWO_RUN_MARGIN, first.u);
      const r0 = visit(u0);
      const m0 = modelAt(u0);
      const chord = (m0 - first.rate) / (u0 - first.u);
      const aim =
        solveModel(modelAt, alpha - (r0 - m0), first.u, chord < 0 ? chord : slope, first.rate).u + TWO_RUN_AIM;
      before = { u: u0, r: r0 };
      const u1 = clampU(aim, u0);
      last = { u: u1, r: visit(u1) };
    } else {
      const u0 = first.u;
      const r0 = visit(u0);
      const u1 = clampU(solveModel(modelAt, alpha - (r0 - first.rate), u0, slope, first.rate).u, u0);
      before = { u: u0, r: r0 };
      last = { u: u1, r: visit(u1) };
    }
  } else {
    // A first guess from the normal limit, then one step by the normal limit's slope there.
    const u0 = normalLimitGuess(plan.looks, alpha, sides);
    const r0 = visit(u0);
    const u1 = clampU(u0 + (alpha - r0) / normalLimitSlope(plan.looks, u0, sides), u0);
    before = { u: u0, r: r0 };
    last = { u: u1, r: visit(u1) };
  }
  // Widen until bracketed (whatever the budget: a threshold whose rate is at most alpha must be found):
  // secant steps pointing the right way, at least doubling each time.
  let step = Math.max(Math.abs(last.u - before.u), 1e-3);
  while (hi === Infinity || lo === -Infinity) {
    if (hi === Infinity && lo >= U_MAX) {
      throw new StatsError(
        'not_available',
        `false_alarm ${alpha}: even the threshold ${MAX_THRESHOLD} gives a false-alarm rate above it with these looks`,
      );
    }
    if (lo === -Infinity && hi <= U_MIN) {
      // Any threshold above ½ keeps the rate at or below alpha.
      return { threshold: normalCdf(U_MIN), rate: hiRate, below: 0.5, rateBelow: NaN, runs: allowed - runsLeft };
    }
    const towards = hi === Infinity ? 1 : -1;
    const from = hi === Infinity ? lo : hi;
    const secant = last.r !== before.r ? last.u + ((alpha - last.r) * (last.u - before.u)) / (last.r - before.r) : NaN;
    const bySecant = (secant - from) * towards;
    const next = from + towards * (bySecant > 0 && bySecant < 4 * step ? Math.max(bySecant, step / 4) : step);
    step *= 2;
    before = last;
    const u = towards > 0 ? Math.min(next, U_MAX) : Math.max(next, U_MIN);
    last = { u, r: visit(u) };
  }
  // Narrow the bracket: regula falsi in u with the Illinois halving; in the exact method, once few
  // read-out probabilities lie inside, pick the step directly. Every run counts against the budget; when
  // it is spent, the upper end of the bracket (a threshold whose rate is at most alpha) is returned.
  let stale = 0; // +1 / −1: the same end moved last time
  while (hi - lo > THRESHOLD_TOLERANCE && runsLeft > 0) {
    if (plan.method === 'exact') {
      const picked = pickAmongSteps(plan, lo, hi, loRate, hiRate, alpha, sides, memo as CrossingMemo, runsLeft);
      if (picked !== undefined) return { ...picked, runs: allowed - runsLeft + picked.runs };
    }
    let weightLo = loRate - alpha;
    let weightHi = hiRate - alpha;
    if (stale === 1) weightLo /= 2;
    if (stale === -1) weightHi /= 2;
    const margin = Math.min((hi - lo) / 4, THRESHOLD_TOLERANCE);
    const guess = lo + ((hi - lo) * weightLo) / (weightLo - weightHi);
    const u = Math.min(Math.max(Number.isFinite(guess) ? guess : (lo + hi) / 2, lo + margin), hi - margin);
    const movedHi = visit(u) <= alpha;
    stale = movedHi ? (stale === 1 ? 0 : 1) : stale === -1 ? 0 : -1;
  }
  return { threshold: normalCdf(hi), rate: hiRate, below: normalCdf(lo), rateBelow: loRate, runs: allowed - runsLeft };
}

/**
 * The root of model(u) = target by secant steps from `start` (the model is the calibrated normal method:
 * smooth apart from small steps), started with the normal limit's `slope`: at most 5 evaluations, to
 * within THRESHOLD_TOLERANCE (the exact runs that follow correct the rest). Returns the last point and the
 * model's rate there.
 */
function solveModel(
  model: (u: number) => number,
  target: number,
  start: number,
  slope: number,
  startRate = model(start),
  tolerance = THRESHOLD_TOLERANCE,
): { u: number; rate: number } {
  let u0 = start;
  let r0 = startRate;
  let u1 = clampU(u0 + (target - r0) / slope, u0);
  let r1 = model(u1);
  for (let i = 0; i < 4 && Math.abs(u1 - u0) >= tolerance && r1 !== r0; i++) {
    const next = clampU(u1 + ((target - r1) * (u1 - u0)) / (r1 - r0), u1);
    u0 = u1;
    r0 = r1;
    u1 = Math.min(Math.max(next, u0 - 0.5), u0 + 0.5);
    r1 = model(u1);
  }
  return { u: u1, rate: r1 };
}

function clampU(u: number, from: number): number {
  if (!Number.isFinite(u)) return Math.min(from + 0.1, U_MAX);
  const v = Math.min(Math.max(u, U_MIN), U_MAX);
  return Math.abs(v - from) < THRESHOLD_TOLERANCE ? Math.min(from + THRESHOLD_TOLERANCE, U_MAX) : v;
}

/** d(rate)/du of the normal limit with equal bounds u at every look (negative). */
function normalLimitSlope(looks: readonly number[], u: number, sides: 1 | 2, grid = COARSE_GRID): number {
  const rate = (z: number): number =>
    brownianCrossing(
      looks,
      looks.map(() => z),
      sides === 2 ? looks.map(() => -z) : undefined,
      grid,
    ).probability;
  const d = 1e-3;
  // below the lowest threshold the two-sided bounds would cross (−z above z): step down at most to u / 2
  const below = Math.max(u - d, u / 2);
  return (rate(u + d) - rate(below)) / (u + d - below);
}

/**
 * In the exact method the rate only changes where the threshold passes the read-out probability of some
 * lattice point (it is constant on (c_j, c_(j+1)] between consecutive such values). Lists those values
 * between Φ(lo) and Φ(hi); when there are at most 64, finds by bisection over them the first interval
 * whose rate is at most alpha and returns its middle (every threshold of that interval gives the same
 * rate). Returns undefined when there are more (the caller narrows the bracket first).
 */
function pickAmongSteps(
  plan: Plan,
  lo: number,
  hi: number,
  loRate: number,
  hiRate: number,
  alpha: number,
  sides: 1 | 2,
  memo: CrossingMemo,
  runsLeft: number,
): ThresholdSolution | undefined {
  const tLo = normalCdf(lo);
  const tHi = normalCdf(hi);
  const found = readOutValuesBetween(plan.lattices as readonly LookLattice[], tLo, tHi, sides, 64);
  if (found === undefined) return undefined;
  // Interval j is (edges[j], edges[j + 1]]; the last ends at tHi, whose rate (hiRate) is ≤ alpha.
  const edges = [tLo, ...found, tHi];
  if (Math.ceil(Math.log2(edges.length)) > runsLeft) return undefined;
  const middle = (j: number): number => ((edges[j] as number) + (edges[j + 1] as number)) / 2;
  let above = -1; // largest interval known to have a rate above alpha (−1: the point tLo)
  let aboveRate = loRate;
  let atMost = edges.length - 2; // smallest interval known to have a rate at most alpha
  let atMostRate = hiRate;
  let runs = 0;
  while (atMost - above > 1) {
    const j = (above + atMost) >> 1;
    runs++;
    const r = evaluate(plan, middle(j), sides, memo).probability;
    if (r > alpha) {
      above = j;
      aboveRate = r;
    } else {
      atMost = j;
      atMostRate = r;
    }
  }
  return {
    threshold: middle(atMost),
    rate: atMostRate,
    below: above < 0 ? tLo : middle(above),
    rateBelow: aboveRate,
    runs,
  };
}
