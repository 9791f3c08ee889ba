/**
 * The limits of the statistics core in one place: how many variants a comparison takes, the largest
 * count, the rows of a density table, and the one check of a credible level. The sheet layer's argument
 * rules (functions/sheet/rules.ts, variants.ts) import the same numbers, so the worksheet, its help and
 * the core cannot disagree about a bound.
 */
import { ensure } from './errors';

/** Most variants a comparison accepts (the first is the control). */
export const MAX_VARIANTS = 50;

/** The largest count accepted: 2^53, the largest whole number a double holds exactly with all smaller ones. */
export const MAX_COUNT = 2 ** 53;

/** Fewest rows of a density table (a chart needs two points at least). */
export const MIN_POINTS = 2;

/**
 * Most rows of a density table: a chart needs no more, and each row of a lift table is one integral,
 * which keeps one call within its time budget.
 */
export const MAX_POINTS = 1000;

/*
 * The declared domain of the worksheet functions: the bounds the sheet layer (functions/sheet/rules.ts)
 * enforces at the door and the help pages state. Inside them the reference tests (test/reference, the
 * *_extremes scripts with mpmath) check the answers at the corners; outside them a call answers #VALUE!
 * naming the argument, its value and these bounds. Each bound is chosen from what the numerics are shown
 * to handle, not from what users might type: every one is far beyond what an experiment produces.
 */

/** Weakest prior parameter accepted (prior_alpha, prior_beta, prior_shape): 0.001, weaker than Jeffreys' 0.5. */
export const MIN_PRIOR = 0.001;
/** Strongest prior parameter accepted: a prior worth a million visitors (or events). */
export const MAX_PRIOR = 1e6;
/** Largest prior_rate (prior exposure) of the Gamma prior, in the unit of `exposure`. */
export const MAX_PRIOR_RATE = 1e12;
/** Smallest and largest exposure of one variant (counts per exposure), in the user's unit. */
export const MIN_EXPOSURE = 1e-6;
export const MAX_EXPOSURE = 1e12;
/** Largest magnitude of a mean (Normal model): means from −1e12 to 1e12. */
export const MAX_MEAN_SIZE = 1e12;
/** Smallest nonzero and largest standard deviation (Normal model); 0 is allowed (every value equal). */
export const MIN_SD = 1e-6;
export const MAX_SD = 1e12;
/**
 * Smallest order_sd of the revenue model beside the variant's average order value revenue/orders (other
 * than 0, every order the same value): 0.1%. Below it the order value's t is so much narrower than the
 * rate's posterior that the density of R = p·v is not resolved (scans of orders 2 to 1e9, every visitor
 * ordering to 1 in 10,000, all pass from here up; the corner is checked against scipy in
 * test/reference/revenue/revenue_corner_values.json); at that precision order_sd 0 gives the same read-out.
 */
export const MIN_ORDER_SD_SHARE = 0.001;
/** Narrowest and widest credible level, threshold or power: 0.01 to 0.9999 (99.99%). */
export const MIN_LEVEL = 0.01;
export const MAX_LEVEL = 0.9999;
/** Smallest and largest baseline conversion rate of the planners. */
export const MIN_BASELINE = 1e-6;
export const MAX_BASELINE = 0.999999;
/** Smallest relative lift a planner plans for: −99% (a lift of −100% leaves no rate to compare). */
export const MIN_PLAN_LIFT = -0.99;
/**
 * Most visitors per variant of a plan: the largest answer of VISITORS_NEEDED (a test needing more is answered
 * #N/A, "more than 1E+9 visitors per variant"), and the largest test SMALLEST_DETECTABLE_LIFT and the look
 * planners take. Each evaluation of the decision power walks O(√(n p (1 − p))) outcomes (~16 million steps
 * at 1e9 and a rate of ½, tens of ms); a search takes four or more, which keeps it within its budget here.
 * Two billion visitors in one test is beyond what a plan of practical use needs.
 */
export const MAX_PLANNED_VISITORS = 1e9;
/** Most visitors per variant DECISION_POWER takes: one evaluation, ~1e6 steps of the walk at 1e10 and ½. */
export const MAX_POWER_VISITORS = 1e10;
/** Significance level of the classic test: 0.0001 to 0.5. */
export const MIN_ALPHA = 0.0001;
export const MAX_ALPHA = 0.5;

/**
 * Checks a credible level: a finite number strictly between 0 and 1. The message follows the input
 * policy of the sheet layer (argument: value, problem, what is allowed) with an example of a level.
 * Cost: O(1). Throws StatsError('invalid_argument') naming the level and what is allowed.
 * @example checkLevel(0.95) //=> undefined
 */
export function checkLevel(level: number): void {
  ensure(
    Number.isFinite(level) && level > 0 && level < 1,
    `level: ${level} is not allowed; the level must be strictly between 0 and 1 (0.95 is a 95% interval)`,
  );
}

/**
 * Checks how many variants a model's comparison is given: at least `minimum` (1 for a per-variant
 * read-out, 2 where the first is the control) and at most MAX_VARIANTS.
 * Cost: O(1). Throws StatsError('invalid_argument') saying how many are needed and how many came.
 * @example checkVariantCount(3, 2) //=> undefined
 */
export function checkVariantCount(count: number, minimum: number): void {
  ensure(
    count >= minimum,
    minimum === 1
      ? 'at least one variant is needed'
      : `at least ${minimum} variants are needed (the first is the control), got ${count}`,
  );
  ensure(count <= MAX_VARIANTS, `at most ${MAX_VARIANTS} variants are allowed, got ${count}`);
}

/**
 * Checks the number of rows of a density table: a whole number from MIN_POINTS to MAX_POINTS.
 * Cost: O(1). Throws StatsError('invalid_argument') naming the value and the allowed range.
 * @example checkPoints(101) //=> undefined
 */
export function checkPoints(points: number): void {
  ensure(
    Number.isInteger(points) && points >= MIN_POINTS && points <= MAX_POINTS,
    `points must be a whole number from ${MIN_POINTS} to ${MAX_POINTS}, not ${points}`,
  );
}

/**
 * Most density cells (rows × challengers) of one lift density table: each is one integral (~40 µs), so
 * this keeps a call within its time budget; the default 101 rows fit 50 variants (49 × 101 = 4,949).
 */
export const MAX_LIFT_DENSITY_CELLS = 5000;

/**
 * Checks the size of a lift density table: points × challengers at most MAX_LIFT_DENSITY_CELLS.
 * Cost: O(1). Throws StatsError('invalid_argument') naming the points, the challengers and the most rows allowed.
 * @example checkLiftDensityCells(101, 49) //=> undefined
 */
export function checkLiftDensityCells(points: number, challengers: number): void {
  const most = Math.floor(MAX_LIFT_DENSITY_CELLS / challengers);
  ensure(
    points * challengers <= MAX_LIFT_DENSITY_CELLS,
    `points: ${points} rows for ${challengers} challengers are too many for one table; with ${challengers} ` +
      `challengers at most ${most} rows are allowed (at most ${MAX_LIFT_DENSITY_CELLS} density values in all)`,
  );
}
