/**
 * The fixed-budget question: with this many visitors per variant, what is the smallest lift the test can
 * be expected to detect? The inverse of planning.decisionPower in the lift.
 *
 * For a fixed number of visitors n, the outcomes (x_A, x_B) that declare the challenger (P(beats control)
 * ≥ threshold) do not depend on the true rates, and the chance P(X_B ≥ c) of each tail rises with the
 * challenger's rate: decision power is continuous and strictly increasing in the lift. So for every power
 * above the false-alarm rate there is exactly one lift L* with decisionPower(L*) = power, and that is the
 * value returned. (Across n, decision power is saw-toothed — outcomes are whole numbers — so L*(n) is not
 * monotone from one visitor to the next: a test a few visitors larger can need a lift larger by ~1e-4
 * relative. Between well-separated sizes it falls like 1/√n.)
 */
import { ensure, StatsError } from './errors';
import { type BinomialWindow, binomialWeightedSum, binomialWindow, DecisionCursor } from './decisionLattice';
import { MAX_PLANNED_VISITORS } from './limits';
import { findRoot } from './numeric';
import { normalQuantile } from './special/normal';
import { type BetaPrior, UNIFORM_PRIOR } from './types';

/**
 * Most visitors per variant: the work is O(√(n p (1 − p))) per step of the search, ~70 ms at 1e9 and a rate
 * of ½ (DECISION_POWER itself accepts up to 1e10).
 */
export const MAX_LIFT_VISITORS = MAX_PLANNED_VISITORS;
/** Prior parameters lie in [MIN_LIFT_PRIOR, MAX_LIFT_PRIOR]. */
const MIN_LIFT_PRIOR = 1e-3;
const MAX_LIFT_PRIOR = 1e7;

/** The declaring boundary of one look: c[x_A − lo] = smallest x_B with P(B beats A) ≥ threshold (n + 1: none). */
function declaringBoundary(
  n: number,
  window: BinomialWindow,
  threshold: number,
  prior: BetaPrior,
): Int32Array | Float64Array {
  const size = window.hi - window.lo + 1;
  const c = n + 1 <= 2 ** 31 - 1 ? new Int32Array(size) : new Float64Array(size);
  const cursor = new DecisionCursor(n, prior, window.lo);
  let none = false;
  for (let i = 0; i < size; i++) {
    if (i > 0) cursor.upA();
    if (!none) {
      while (cursor.probability < threshold && cursor.xB < n) cursor.upB();
      if (cursor.probability < threshold) none = true;
    }
    c[i] = none ? n + 1 : cursor.xB;
  }
  return c;
}

/**
 * G(j) = P_A(c(X_A) ≤ j) for j from the smallest to the largest boundary value: the chance that an x_B of
 * j declares. With it the decision power at any challenger rate p1 is Σ_j Bin(j; n, p1)·G(j) (the order of
 * summation of Σ_x pmf_A(x)·P(X_B ≥ c(x)) swapped), which needs no table of the challenger's pmf.
 */
function declaringChance(
  n: number,
  window: BinomialWindow,
  boundary: Int32Array | Float64Array,
): { first: number; chance: Float64Array; last: number } {
  // The boundary never falls as x_A rises; values n + 1 (no x_B declares) come last and are left out.
  const first = boundary[0] as number;
  let top = first;
  for (let i = 0; i < boundary.length; i++) if ((boundary[i] as number) <= n) top = boundary[i] as number;
  const chance = new Float64Array(Math.max(top - first + 1, 1));
  for (let i = 0; i < boundary.length; i++) {
    const c = boundary[i] as number;
    if (c <= n) chance[c - first] = (chance[c - first] as number) + (window.pmf[i] as number);
  }
  let running = 0;
  for (let j = 0; j < chance.length; j++) {
    running += chance[j] as number;
    chance[j] = running;
  }
  return { first, chance, last: running };
}

/**
 * The smallest relative lift whose decision power (planning.decisionPower: P(challenger beats control) ≥
 * threshold after `visitorsPerVariant` visitors in each variant, control at `baselineRate`) reaches
 * `power`: the unique L* > 0 with decisionPower(baselineRate, L*, visitorsPerVariant) = power.
 *
 * Method: the declaring boundary is walked once on the lattice of outcomes (decisionLattice.ts; the same
 * decisions as decisionPower, exact for any prior); then the power at a lift is Σ_j Bin(j; n, p1)·G(j),
 * G(j) the control's chance of a boundary at or below j (one pass over the challenger's pmf), and Brent's method on Φ⁻¹(power) (nearly linear in the lift) finds L*
 * from a bracket around the normal approximation (z_threshold + z_power)·√(2p(1 − p)/n)/p. L* to ~1e-10 relative; decisionPower(L*) equals
 * power to ~1e-12 (test/stats/detectableLift.test.ts, and scipy in test/reference/looks/looks_reference.py).
 * Cost: one boundary walk and ~6–10 sums, each O(√(n p (1 − p))): under 1 ms to 1e5 visitors, ~70 ms at
 * 1e9 and a rate of ½.
 * Throws StatsError('invalid_argument') for a rate outside (0, 1), visitors that are not a whole number
 * from 1 to 1e9, a threshold outside (0.5, 0.999999], a power outside (0, 1) or not above the false-alarm
 * rate (the decision power at lift 0), or a prior outside [0.001, 1e7]; StatsError('not_available') when
 * no lift up to a challenger rate of 1 reaches the power.
 * @example smallestDetectableLift(0.1, 3000) //=> 0.20071… (scipy: 0.2007172694; decisionPower(0.1, 0.2, 3000) = 0.7976)
 */
export function smallestDetectableLift(
  baselineRate: number,
  visitorsPerVariant: number,
  threshold = 0.95,
  power = 0.8,
  prior: BetaPrior = UNIFORM_PRIOR,
): number {
  ensure(
    typeof baselineRate === 'number' && baselineRate > 0 && baselineRate < 1,
    `the baseline rate must be between 0 and 1 (exclusive), got ${String(baselineRate)}`,
  );
  const n = visitorsPerVariant;
  ensure(
    typeof n === 'number' && Number.isInteger(n) && n >= 1 && n <= MAX_LIFT_VISITORS,
    `the visitors per variant must be a whole number from 1 to ${MAX_LIFT_VISITORS}, got ${String(n)}`,
  );
  ensure(
    typeof threshold === 'number' && threshold > 0.5 && threshold <= 0.999999,
    `the threshold must be above 0.5 and at most 0.999999, got ${String(threshold)}`,
  );
  ensure(
    typeof power === 'number' && power > 0 && power < 1,
    `the power must be between 0 and 1 (exclusive), got ${String(power)}`,
  );
  const okPrior = (v: number): boolean => typeof v === 'number' && v >= MIN_LIFT_PRIOR && v <= MAX_LIFT_PRIOR;
  ensure(
    typeof prior === 'object' && prior !== null && okPrior(prior.alpha) && okPrior(prior.beta),
    `prior_alpha and prior_beta must each be between ${MIN_LIFT_PRIOR} and ${MAX_LIFT_PRIOR} for planning, got ${String(prior?.alpha)} and ${String(prior?.beta)}`,
  );
  const p0 = baselineRate;
  const windowA = binomialWindow(n, p0);
  const boundary = declaringBoundary(n, windowA, threshold, prior);
  const g = declaringChance(n, windowA, boundary);
  // An x_B beyond the table declares against every x_A whose boundary is in it (G at its last value).
  const at = (lift: number): number =>
    Math.min(Math.max(binomialWeightedSum(n, p0 * (1 + lift), g.chance, g.first, g.last), 0), 1);
  const falseAlarm = at(0);
  ensure(
    power > falseAlarm,
    `the power (${power}) must be above the false-alarm rate of this plan (${falseAlarm.toPrecision(4)}, the power at lift 0)`,
  );
  // Largest lift: a challenger rate just below 1. Probit(power) is nearly linear in the lift, so Brent's
  // method on it needs few evaluations once a tight bracket around the normal approximation is found.
  const maxLift = (1 - 1e-12) / p0 - 1;
  const target = normalQuantile(power);
  const gap = (lift: number): number => normalQuantile(Math.min(Math.max(at(lift), 1e-300), 1 - 1e-16)) - target;
  const guess = ((normalQuantile(threshold) + normalQuantile(power)) * Math.sqrt((2 * p0 * (1 - p0)) / n)) / p0;
  let hi = Math.min(Math.max(guess, 1e-12), maxLift);
  let lo = 0;
  let gapHi = gap(hi);
  if (gapHi >= 0) {
    const below = 0.8 * hi;
    if (gap(below) < 0) lo = below;
  } else {
    for (;;) {
      if (hi >= maxLift) {
        throw new StatsError(
          'not_available',
          `no lift reaches a power of ${power} with ${n} visitors per variant at a baseline rate of ${p0} (not even a challenger converting every visitor)`,
        );
      }
      lo = hi;
      hi = Math.min(hi * (gapHi > -1 ? 1.25 : 2), maxLift);
      gapHi = gap(hi);
      if (gapHi >= 0) break;
    }
  }
  return findRoot(gap, lo, hi, 1e-13 * hi);
}
