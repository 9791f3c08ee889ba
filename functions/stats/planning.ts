/**
 * Planning an experiment: how likely a test of a given size is to end with a clear read-out, how many
 * visitors that takes, and the classic two-proportion sample size for comparison.
 *
 * Cautions: these numbers assume the read-out is taken once, at the planned size. Looking at the results
 * again and again and stopping at the first good-looking one raises the false-alarm rate well above what
 * is planned here (peeking). With many variants each comparison has its own chance of a false alarm.
 * For regulated or health-related decisions, have a qualified statistician check the plan.
 */
import { binomialWindow, lookPower } from './decisionLattice';
import { ensure, StatsError } from './errors';
import { MAX_PLANNED_VISITORS, MAX_POWER_VISITORS } from './limits';
import { normalQuantile } from './special/normal';
import { type BetaPrior, UNIFORM_PRIOR } from './types';

function checkFinite(value: number, what: string): void {
  ensure(typeof value === 'number' && !Number.isNaN(value), `${what} must be a number, got ${String(value)}`);
  ensure(Number.isFinite(value), `${what} must be a finite number, got ${value}`);
}

function checkProbability(value: number, what: string): void {
  checkFinite(value, what);
  ensure(value > 0 && value < 1, `${what} must be between 0 and 1 (exclusive), got ${value}`);
}

/** Checks the baseline rate and lift; returns the challenger's rate baseline·(1 + lift). */
function challengerRate(baselineRate: number, lift: number): number {
  checkProbability(baselineRate, 'the baseline rate');
  checkFinite(lift, 'the lift');
  ensure(lift > -1, `the lift must be greater than -1 (a rate cannot fall below 0), got ${lift}`);
  const rate = baselineRate * (1 + lift);
  ensure(rate > 0, `the lift must be greater than -1 (a rate cannot fall below 0), got ${lift}`);
  ensure(rate < 1, `baseline rate × (1 + lift) must be below 1, got ${rate} (baseline ${baselineRate}, lift ${lift})`);
  return rate;
}

function checkPrior(prior: BetaPrior): void {
  ensure(
    typeof prior === 'object' && prior !== null && Number.isFinite(prior.alpha) && Number.isFinite(prior.beta),
    'the prior must have finite alpha and beta',
  );
  ensure(
    prior.alpha > 0 && prior.beta > 0,
    `the prior's alpha and beta must both be greater than 0, got ${prior.alpha} and ${prior.beta}`,
  );
}

/**
 * Visitors per variant for the classic two-proportion z-test, unrounded.
 *
 * Method: the normal-approximation test with pooled variance under the null and no continuity correction
 * (Fleiss, Levin & Paik, "Statistical Methods for Rates and Proportions", 3rd ed., 2003, §4.2, without the
 * correction); the same formula that R's power.prop.test solves numerically (strict = FALSE):
 * n = (z_{α/sides}·√(2 p̄ (1 − p̄)) + z_power·√(p₁q₁ + p₂q₂))² / (p₁ − p₂)², with p₂ = p₁(1 + lift),
 * p̄ = (p₁ + p₂)/2. It is the closed form; R's uniroot result differs from it by up to ~1e-4 visitor.
 * This is a frequentist plan for comparison with {@link visitorsNeeded}; it assumes one look at the end.
 * Cost: O(1).
 * Throws StatsError('invalid_argument') unless 0 < baselineRate < 1, lift ≠ 0 with 0 < rate·(1+lift) < 1,
 * 0 < alpha < 1, 0 < power < 1, sides 1 or 2, and the power is above the false-alarm rate.
 * @example classicSampleSizeExact(0.10, 0.5) //=> 685.5968583253… (R: power.prop.test(p1 = 0.1, p2 = 0.15, power = 0.8) n = 685.596858)
 */
export function classicSampleSizeExact(
  baselineRate: number,
  lift: number,
  alpha = 0.05,
  power = 0.8,
  sides: 1 | 2 = 2,
): number {
  const p2 = challengerRate(baselineRate, lift);
  ensure(lift !== 0, 'the lift must not be 0: no test can detect a difference of nothing');
  checkProbability(alpha, 'alpha');
  checkProbability(power, 'the power');
  ensure(sides === 1 || sides === 2, `sides must be 1 or 2, got ${String(sides)}`);
  const p1 = baselineRate;
  const pooled = (p1 + p2) / 2;
  const zAlpha = -normalQuantile(alpha / sides);
  const zPower = normalQuantile(power);
  const numerator = zAlpha * Math.sqrt(2 * pooled * (1 - pooled)) + zPower * Math.sqrt(p1 * (1 - p1) + p2 * (1 - p2));
  ensure(numerator > 0, `the power (${power}) must be above the false-alarm rate alpha/sides (${alpha / sides})`);
  const difference = p2 - p1;
  return (numerator * numerator) / (difference * difference);
}

/**
 * Visitors per variant for the classic two-proportion z-test, rounded up to a whole visitor.
 *
 * Method, cost and errors as {@link classicSampleSizeExact} (pooled variance under the null, no continuity
 * correction; matches R's power.prop.test rounded up). Throws StatsError('not_available') if the size
 * exceeds 2^53.
 * @example classicSampleSize(0.05, 0.1) //=> 31234 (R: power.prop.test(p1 = 0.05, p2 = 0.055, power = 0.8) n = 31233.44)
 */
export function classicSampleSize(
  baselineRate: number,
  lift: number,
  alpha = 0.05,
  power = 0.8,
  sides: 1 | 2 = 2,
): number {
  const n = Math.ceil(classicSampleSizeExact(baselineRate, lift, alpha, power, sides));
  if (!(n <= 2 ** 53)) {
    throw new StatsError(
      'not_available',
      'the classic sample size is beyond 2^53 visitors: the lift is too small to detect',
    );
  }
  return n;
}

// ---------------------------------------------------------------------------------------------------
// Decision power

/**
 * Decision power of a two-variant conversion test: the probability that, with `visitorsPerVariant`
 * visitors in each arm, a control of true rate `baselineRate` and a challenger of true rate
 * baselineRate·(1 + lift), the read-out ends with P(challenger beats control) ≥ `threshold` (the
 * posterior probability of {@link probAboveControl} under `prior`). With lift 0 it is the false-alarm rate.
 *
 * Method: exact over the binomial outcomes x_A ~ Bin(n, p₀), x_B ~ Bin(n, p₀(1+lift)). For each x_A the
 * accepting x_B form a tail x_B ≥ c(x_A) (P(B beats A) rises with x_B), and c never falls as x_A rises, so
 * power = Σ_{x_A} Bin(x_A; n, p₀)·P(X_B ≥ c(x_A)), with c walked upwards once on the lattice of outcomes
 * (decisionLattice.ts lookPower): P(B beats A) is ½ on the diagonal and changes by a closed-form amount per
 * count (J. D. Cook 2005; the identities of Evan Miller's sum), so every decision is exact to rounding
 * (~1e-16 per step of the walk), for whole and fractional prior shapes alike, with no approximation to
 * settle. Outcomes whose pmf is below 1e-16 of the peak are skipped (their mass is below 1e-15). The result
 * equals the brute-force sum over every (x_A, x_B) with the exact P to about 1e-12 (tested at n = 50 and
 * against scipy at 200, 1000 and beyond).
 * Cost: O(√(n p(1 − p))) steps of a few multiplications (the two pmf windows, ~17 standard deviations each,
 * and the boundary walk), memory three arrays of that length: about 1e6 steps and 21 MB at 1e10 visitors
 * and a rate of ½, the largest allowed (`npm run bench -- --section=worst`).
 * Throws StatsError('invalid_argument') for a rate outside (0, 1), lift ≤ −1 or rate·(1+lift) ≥ 1,
 * visitors that are not a whole number in 1 … 1e10, a threshold outside (0, 1) or a bad prior.
 * @example decisionPower(0.1, 0.2, 3000) //=> 0.79760… (about 80% chance of a clear read-out)
 */
export function decisionPower(
  baselineRate: number,
  lift: number,
  visitorsPerVariant: number,
  threshold = 0.95,
  prior: BetaPrior = UNIFORM_PRIOR,
): number {
  const challenger = challengerRate(baselineRate, lift);
  checkFinite(visitorsPerVariant, 'the visitors per variant');
  ensure(Number.isInteger(visitorsPerVariant), `${visitorsPerVariant} is not a whole number of visitors`);
  ensure(visitorsPerVariant >= 1, `the visitors per variant must be at least 1, got ${visitorsPerVariant}`);
  ensure(
    visitorsPerVariant <= MAX_POWER_VISITORS,
    `the visitors per variant must be at most 1e10, got ${visitorsPerVariant}`,
  );
  checkProbability(threshold, 'the threshold');
  checkPrior(prior);
  return powerOf(baselineRate, challenger, visitorsPerVariant, threshold, prior);
}

/** Decision power at n visitors per variant (arguments checked by the caller). */
function powerOf(p0: number, p1: number, n: number, threshold: number, prior: BetaPrior): number {
  const windowA = binomialWindow(n, p0);
  const windowB = p1 === p0 ? windowA : binomialWindow(n, p1);
  return lookPower(n, windowA, windowB, threshold, prior);
}

/**
 * Smallest number of visitors per variant at which the decision power ({@link decisionPower}) reaches
 * `power`: the planned size for a test read out once with "P(challenger beats control) ≥ threshold".
 *
 * Method: start at the classic one-sided z-test size at level 1 − threshold ({@link classicSampleSizeExact});
 * bracket the root a step away that the normal model probit(power) = slope·√n − z_threshold (slope from the
 * first value) puts just beyond it, the step growing fourfold while it fails; then shrink the bracket by
 * interpolation of probit(power) against √n, pushing past the estimate when one end keeps moving, and
 * bisection. Decision power is slightly saw-toothed in n (the outcomes are whole numbers:
 * at ~3000 visitors it can dip by ~2e-4 from one n to the next while rising ~1.3e-4 per visitor), so
 * "smallest" is defined as a crossing: the n returned has decisionPower(n) ≥ power > decisionPower(n − 1).
 * Where the saw-tooth straddles the target another crossing may exist a few visitors away; beyond
 * that the steady rise dominates (scipy's values around 537, 443 and 3024 visitors in
 * test/reference/planning/planning_power.json each show a single crossing).
 * Cost: 4–6 evaluations of decisionPower in the cases measured (test/reference/planning: 14 to 7e8
 * visitors), each O(√(n p (1 − p))); at most 1e9 visitors per variant, the largest plan, where one
 * evaluation at a rate of ½ walks ~1e6 outcomes (`npm run bench -- --section=worst`).
 * Throws StatsError('invalid_argument') for a bad rate, a lift ≤ 0, a threshold or power outside (0, 1)
 * or a bad prior; StatsError('not_available') when more than 1e9 visitors per variant (MAX_PLANNED_VISITORS,
 * limits.ts) would be needed, the message suggesting a larger lift, a lower threshold or a lower power.
 * @example visitorsNeeded(0.1, 0.2) //=> 3024 (80% decision power at threshold 0.95, uniform prior)
 */
export function visitorsNeeded(
  baselineRate: number,
  lift: number,
  threshold = 0.95,
  power = 0.8,
  prior: BetaPrior = UNIFORM_PRIOR,
): number {
  const challenger = challengerRate(baselineRate, lift);
  ensure(lift > 0, `the lift must be greater than 0 to plan for detecting it, got ${lift}`);
  checkProbability(threshold, 'the threshold');
  checkProbability(power, 'the power');
  checkPrior(prior);
  const target = power;
  const powerAt = (n: number): number => powerOf(baselineRate, challenger, n, threshold, prior);
  const tooMany = (): StatsError =>
    new StatsError(
      'not_available',
      `more than 1E+9 visitors per variant would be needed to detect a lift of ${lift} on a rate of ${baselineRate}; ` +
        'plan for a larger lift, a lower threshold or a lower power',
    );

  let guess: number;
  try {
    guess = classicSampleSizeExact(baselineRate, lift, 1 - threshold, power, 1);
  } catch (error) {
    if (error instanceof StatsError && error.code === 'invalid_argument')
      guess = 1; // power below the false-alarm rate
    else throw error;
  }
  if (!(guess <= MAX_PLANNED_VISITORS * 4)) throw tooMany();
  const start = Math.min(Math.max(Math.ceil(guess), 1), MAX_PLANNED_VISITORS);

  // Bracket: lo fails (or is 0), hi meets the target. The other end is sought a step away that the normal
  // model of the power (probit(power) = √n·slope − z_threshold, its slope from the first value) puts just
  // beyond the root, the step growing fourfold while it fails: the classic size is usually within a few
  // percent, so no evaluation is spent at half or twice the size (tens of ms each near 1e9 visitors).
  const probit = (p: number): number => normalQuantile(Math.min(Math.max(p, 1e-12), 1 - 1e-12));
  let lo: number;
  let hi: number;
  let powerLo: number;
  let powerHi: number;
  const first = powerAt(start);
  const zThreshold = normalQuantile(threshold);
  const slope = (probit(first) + zThreshold) / Math.sqrt(start);
  const root = slope > 0 && probit(target) + zThreshold > 0 ? ((probit(target) + zThreshold) / slope) ** 2 : NaN;
  let step = Number.isFinite(root)
    ? Math.max(1, Math.ceil(1.25 * Math.abs(root - start)) + 1, Math.ceil(start * 1e-6))
    : Math.max(1, Math.ceil(start / 4));
  if (first >= target) {
    hi = start;
    powerHi = first;
    for (;;) {
      lo = Math.max(hi - step, 0);
      powerLo = lo >= 1 ? powerAt(lo) : 0;
      if (powerLo < target) break;
      hi = lo;
      powerHi = powerLo;
      step *= 4;
    }
  } else {
    lo = start;
    powerLo = first;
    for (;;) {
      if (lo >= MAX_PLANNED_VISITORS) throw tooMany();
      hi = Math.min(lo + step, MAX_PLANNED_VISITORS);
      powerHi = powerAt(hi);
      if (powerHi >= target) break;
      lo = hi;
      powerLo = powerHi;
      step *= 4;
    }
  }

  // Shrink: interpolation of probit(power) in √n. The saw-tooth puts the root a few visitors from the
  // interpolated point, so when the same end of the bracket moves twice in a row the next point is pushed
  // past the estimate, away from that end, by 1, 2, 4, … visitors (and at least 1/16 of the bracket while
  // it is wide), so the other end moves as well; bisection where interpolation has nothing to go on.
  let moved = 0; // +1: hi moved last, −1: lo moved last
  let overshoot = 0;
  while (hi - lo > 1) {
    let mid: number;
    if (lo >= 1 && hi - lo > 2) {
      const zLo = probit(powerLo);
      const zHi = probit(powerHi);
      const zTarget = probit(target);
      const sLo = Math.sqrt(lo);
      const sHi = Math.sqrt(hi);
      const fraction = zHi > zLo ? (zTarget - zLo) / (zHi - zLo) : 0.5;
      const s = sLo + Math.min(Math.max(fraction, 0), 1) * (sHi - sLo);
      const push = overshoot === 0 ? 0 : Math.max(overshoot, Math.floor((hi - lo) / 16));
      mid = Math.min(Math.max(Math.round(s * s) - moved * push, lo + 1), hi - 1);
    } else {
      mid = Math.floor((lo + hi) / 2);
    }
    const powerMid = powerAt(mid);
    const side = powerMid >= target ? 1 : -1;
    if (side > 0) {
      hi = mid;
      powerHi = powerMid;
    } else {
      lo = mid;
      powerLo = powerMid;
    }
    overshoot = side === moved ? Math.max(1, 2 * overshoot) : 0;
    moved = side;
  }
  return hi;
}
