/**
 * The quantile solver of the difference and ratio distributions: Newton's method on the log of the
 * smaller tail, with the tail and its density from one pass (integrate.ts logTailAndDensity), guarded by
 * a bracket from the marginal quantiles when a step strays.
 */
import { StatsError } from '../errors';
import type { TailAndDensity } from './integrate';

/** Throws StatsError('invalid_argument') unless 0 < p < 1. */
export function checkProbability(p: number): void {
  if (!(p > 0 && p < 1))
    throw new StatsError('invalid_argument', `a probability must be strictly between 0 and 1, not ${p}`);
}

/**
 * A Newton step is returned without checking its result once the residual r it starts from promises an
 * error K·r² ≤ 1e-15 (K = |r''|/(2r'²), estimated from the residuals of the steps so far, taken as 1000
 * before any step: measured K ≈ 0.1 at thousands of visitors and up to ~70 at a hundred).
 */
const ACCEPT_ERROR = 1e-15;
const FIRST_STEP_K = 1000;

/**
 * Solves P(V ≤ v) = p, by Newton's method on the log of the smaller tail (log P(V ≤ v) for p ≤ ½,
 * log P(V > v) above) with derivative e^{logDensity − logTail}, both from one `evaluate`, from `start`.
 * The bracket known so far (points with residual below and above 0) guards each step; when a step leaves
 * it (or gives no number) before both sides are known, `bracket()` supplies ends that hold the root by
 * construction, and the step is replaced by bisection. Once the error estimate of a Newton step is below
 * ACCEPT_ERROR that step is returned without another evaluation.
 */
export function solveQuantile(
  evaluate: (v: number, upper: boolean) => TailAndDensity,
  p: number,
  start: number,
  bracket: () => [number, number],
): number {
  const upper = p > 0.5;
  const target = upper ? Math.log1p(-p) : Math.log(p);
  let a = -Infinity;
  let b = Infinity;
  let bracketed = false;
  let v = start;
  let previous = Infinity;
  let k = FIRST_STEP_K;
  let stepped = false;
  let previousStep = 0;
  for (let i = 0; i < 200; i++) {
    const e = evaluate(v, upper);
    // residual(v) is increasing in v: log F(v) − log p, or log(1 − p) − log S(v).
    const r = upper ? target - e.logTail : e.logTail - target;
    if (r === 0 || Math.abs(r) <= 1e-14) return v;
    // The tails carry ~1e-13 of rounding noise at a million visitors and more (the nodes' z are stored
    // to 4e-16): once the residual is that small and stops halving, the root is found to that noise.
    if (Math.abs(r) <= 1e-12 && Math.abs(r) > 0.5 * previous) return v;
    previous = Math.abs(r);
    if (r < 0) a = v;
    else b = v;
    const slope = Math.exp(e.logDensity - e.logTail);
    let next = slope > 0 && Number.isFinite(slope) ? v - r / slope : NaN;
    let newton = next > a && next < b;
    if (!newton && !bracketed) {
      const [lo, hi] = bracket();
      a = Math.max(a, Math.min(lo, hi));
      b = Math.min(b, Math.max(lo, hi));
      bracketed = true;
      newton = next > a && next < b;
    }
    if (!newton) next = (a + b) / 2;
    // After a Newton step its curvature constant shows in the new residual; at least 1, to be safe.
    k = stepped ? Math.max(1, Math.abs(r) / (previousStep * previousStep)) : FIRST_STEP_K;
    if (newton && k * r * r <= ACCEPT_ERROR) return next;
    stepped = newton;
    previousStep = Math.abs(r);
    const closed =
      Number.isFinite(a) && Number.isFinite(b) && b - a <= 2 * Number.EPSILON * Math.max(Math.abs(a), Math.abs(b));
    if (Math.abs(next - v) <= 2 * Number.EPSILON * Math.abs(v) || closed) return next;
    v = next;
  }
  return v;
}
