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
