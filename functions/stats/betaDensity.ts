/**
 * The Beta(a, b) posterior of a rate as a WorkingDensity in z = logit(p), ready for grid.ts.
 */
import { ensure } from './errors';
import type { WorkingDensity } from './types';

/**
 * The logistic function 1/(1 + e^{−z}), written so that neither branch overflows. Cost: O(1).
 * @example logistic(-800) //=> 0 (e^-800 underflows), logistic(0) //=> 0.5
 */
export function logistic(z: number): number {
  if (z >= 0) return 1 / (1 + Math.exp(-z));
  const e = Math.exp(z);
  return e / (1 + e);
}

/**
 * log(p/(1 − p)), the inverse of {@link logistic}, as log(p) − log1p(−p) (no cancellation for p near 0).
 * Cost: O(1). @example logit(0.5) //=> 0
 */
export function logit(p: number): number {
  return Math.log(p) - Math.log1p(-p);
}

/** 1/k! for k = 2 … 19: the Taylor coefficients of e^d − 1 − d. */
const INVERSE_FACTORIALS: readonly number[] = (() => {
  const list: number[] = [];
  let f = 1;
  for (let k = 2; k <= 19; k++) {
    f *= k;
    list.push(1 / f);
  }
  return list;
})();

/** 1/(2k + 3) for k = 0 … 17: the series of atanh(u)/u − 1 − … used by {@link fastLog1pmx}. */
const ODD_RECIPROCALS: readonly number[] = Array.from({ length: 18 }, (_, k) => 1 / (2 * k + 3));

/**
 * e^d − 1 − d: for |d| < 0.5 the Taylor series to d^19 by Horner (relative error below 1e-17, fixed
 * cost), else the direct formula. The same quantity as numeric.ts's expm1mx, with a fixed-length
 * evaluation because it sits in the innermost loop of every tabulation.
 */
function fastExpm1mx(d: number): number {
  if (Math.abs(d) >= 0.5) return Math.expm1(d) - d;
  let sum = INVERSE_FACTORIALS[17] as number;
  for (let i = 16; i >= 0; i--) sum = sum * d + (INVERSE_FACTORIALS[i] as number);
  return sum * d * d;
}

/**
 * log(1 + y) − y: for |y| < 0.5 through u = y/(2 + y), log(1 + y) = 2 atanh(u), which gives
 * log(1 + y) − y = −y²/(2 + y) + 2u³ Σ u^{2k}/(2k + 3) with u² ≤ 1/9 (18 terms, no cancellation);
 * else the direct formula. Same quantity as numeric.ts's log1pmx, at a fixed small cost.
 */
function fastLog1pmx(y: number): number {
  if (Math.abs(y) >= 0.5) return Math.log1p(y) - y;
  const u = y / (2 + y);
  const u2 = u * u;
  let sum = ODD_RECIPROCALS[17] as number;
  for (let i = 16; i >= 0; i--) sum = sum * u2 + (ODD_RECIPROCALS[i] as number);
  return (-y * y) / (2 + y) + 2 * u * u2 * sum;
}

/**
 * Once the relative-rate argument p0·(e^d − 1) of the primary form exceeds this, its two terms (both
 * ~p0·e^d) would cancel, so the mirror form (whose exponential decays there) is used instead.
 */
const FORM_SWITCH = 1;

/**
 * The Beta(a, b) distribution of a rate p written in z = logit(p): density ∝ p^a (1 − p)^b in z
 * (the Jacobian p(1 − p) of the change of variable removes the endpoint singularities for every a, b > 0),
 * log-concave with exponential tails of rates a (left) and b (right).
 *
 * Method: with n = a + b, p0 = a/n, mode z0 = log(a/b) (rounded once), the log density relative to the mode is
 * −n·K(d), d = z − z0, K(d) = p0·expm1mx(d) + log1pmx(p0·expm1(d)) (= −[a d − n log(1 − p0 + p0 e^d)]),
 * or its mirror image q0·expm1mx(−d) + log1pmx(q0·expm1(−d)) when p0 > ½; each form has a cancellation
 * ratio ≤ 2 near the mode, and far out on the side where its exponential grows (p0·(e^d − 1) > 1) the
 * other form takes over, so the log density is exact to a few ulps at a, b ~ 1e9 without any log-gamma.
 * slope = −n p0 q0 expm1(d)/(1 + p0 expm1(d)), curvature = n σ(z)(1 − σ(z)).
 *
 * Cost: O(1) to build; each evaluation is O(1) (a short series near the mode).
 * Throws StatsError('invalid_argument') unless a and b are finite and > 0.
 * @example betaWorkingDensity(4, 8).mode //=> -0.6931471805599453 (log(4/8))
 */
export function betaWorkingDensity(a: number, b: number): WorkingDensity {
  ensure(Number.isFinite(a) && a > 0, `the Beta shape a must be a finite number > 0, not ${a}`);
  ensure(Number.isFinite(b) && b > 0, `the Beta shape b must be a finite number > 0, not ${b}`);
  const n = a + b;
  const p0 = a / n;
  const q0 = b / n;
  // log(a/b) rounds once where log(a) − log(b) loses ~ulp(log a) (3e-15 at a billion visitors, i.e.
  // 2e-11 standard deviations); fall back to the difference only if a/b leaves the normal range.
  const ratio = a / b;
  const z0 = ratio > 1e-300 && ratio < 1e300 ? Math.log(ratio) : Math.log(a) - Math.log(b);
  const mirror = p0 > 0.5;
  const K = (d: number): number => {
    // Primary form: the one whose relative-rate argument stays in (−1, 1] near the mode.
    if (mirror) {
      const y = q0 * Math.expm1(-d);
      if (y <= FORM_SWITCH) return q0 * fastExpm1mx(-d) + fastLog1pmx(y);
      return p0 * fastExpm1mx(d) + fastLog1pmx(p0 * Math.expm1(d));
    }
    const y = p0 * Math.expm1(d);
    if (y <= FORM_SWITCH) return p0 * fastExpm1mx(d) + fastLog1pmx(y);
    return q0 * fastExpm1mx(-d) + fastLog1pmx(q0 * Math.expm1(-d));
  };
  return {
    mode: z0,
    valueRange: [0, 1] as const,
    exactMean: p0,
    logDensity(z: number): number {
      const d = z - z0;
      if (d === 0) return 0;
      return -n * K(d);
    },
    slope(z: number): number {
      const d = z - z0;
      if (d <= 0) {
        const e = Math.expm1(d);
        return (-n * p0 * q0 * e) / (1 + p0 * e);
      }
      const e = Math.expm1(-d);
      return (n * p0 * q0 * e) / (1 + q0 * e);
    },
    curvature(z: number): number {
      return n * logistic(z) * logistic(-z);
    },
    toValue: logistic,
    toWorking: logit,
    valueJacobian(z: number): number {
      return logistic(z) * logistic(-z);
    },
  };
}
