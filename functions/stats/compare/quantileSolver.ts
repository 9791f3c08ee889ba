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

/** At most this many evaluations per quantile (each one pass over the kept panels); see solveQuantile. */
export const MAX_QUANTILE_STEPS = 100;

/**
 * Solves P(V ≤ v) = p, by Newton's method on the log of the smaller tail (log P(V ≤ v) for p ≤ ½,
 * log P(V > v) above) with derivative e^{logDensity − logTail}, both from one `evaluate`, from `start`.
 * The bracket known so far (points with residual below and above 0) guards each step; when a step leaves
 * it (or gives no number) before both sides are known, `bracket()` supplies ends that hold the root by
 * construction. The step is replaced by bisection when it leaves the bracket, or when the previous
 * Newton step did not halve the residual (a tail that bends sharply: a posterior piled up against 0, or
 * an integrand with a kink inside a panel, where Newton crawls); so the bracket at least halves every
 * other step. With `logSplit` (a difference of rates, whose quantiles may lie anywhere from 1e-300 to 1
 * when posteriors pile up against 0) a bracket straddling 0 is split at 0 and one spanning more than a
 * factor 4 at the geometric middle of its ends (1e-300 standing in for an end at 0). Once Newton has
 * crawled with the residuals at both ends of the bracket known, the steps are regula falsi between them
 * (Illinois: an end kept twice has its residual halved; in log|v| with logSplit), a crawling one followed
 * by a bisection: the density can mislead Newton where the integrand has a singular factor (the other
 * posterior's density u^(a−1) at a cusp), while the tails themselves stay accurate. Stops
 *  - when a Newton step's error estimate is below ACCEPT_ERROR (that step is returned without another
 *    evaluation), or the residual is below 1e-14 (1e-12 once it stops halving: the tails' rounding noise);
 *  - when a Newton step from a residual below 1e-6 moves v by less than 2 ulp or `tolerance` (v is the
 *    root to double precision, or to the caller's resolution: without this test a step that lands on the
 *    bracket's end was taken for a stray one, and a lift of 1e-18, where 1 + m rounds to 1, crept on);
 *  - when the bracket is narrower than 2 ulp of its ends or than `tolerance` (absolute, in v: below the
 *    caller's resolution, e.g. 1e-300 for a difference of rates), or when `report` (what
 *    the caller returns for v, e.g. the lift expm1(v)) gives the same number at both ends (a root beyond
 *    log(1.8e308) is +Infinity, one below −37.5 is a lift of exactly −1: no further step can change them).
 * Work bound: at most MAX_QUANTILE_STEPS evaluations (one pass each) and one `bracket()`; from a bracket of
 * width W the bisections close it to `tolerance` in log2(W/tolerance) of them (≤ ~90 for any finite W/tol
 * ratio below 1e27), so the cap is reached only by a tail that cannot be resolved to the tolerance; the
 * last point is then returned.
 */
export function solveQuantile(
  evaluate: (v: number, upper: boolean) => TailAndDensity,
  p: number,
  start: number,
  bracket: () => [number, number],
  tolerance = 0,
  report: (v: number) => number = (v) => v,
  logSplit = false,
): number {
  const upper = p > 0.5;
  const target = upper ? Math.log1p(-p) : Math.log(p);
  let a = -Infinity;
  let b = Infinity;
  let bracketed = false;
  let v = start;
  let previous = Infinity;
  let stepped = false;
  let previousStep = 0;
  // With logSplit: Newton in log|v| once a step in v has crawled (see above), until that crawls too.
  let inLog = false;
  let lastLog = false;
  // Regula falsi (Illinois) between the bracket's ends once Newton has crawled with both ends' residuals
  // known (a density that misleads Newton, e.g. near a cusp); a crawling secant step is followed by a
  // bisection.
  let ra = NaN;
  let rb = NaN;
  let lastSide = 0;
  let secantMode = false;
  let lastSecant = false;
  for (let i = 0; i < MAX_QUANTILE_STEPS; i++) {
    const e = evaluate(v, upper);
    // residual(v) is increasing in v: log F(v) − log p, or log(1 − p) − log S(v).
    const r = upper ? target - e.logTail : e.logTail - target;
    if (r === 0 || Math.abs(r) <= 1e-14) return v;
    // The tails carry ~1e-13 of rounding noise at a million visitors and more (the nodes' z are stored
    // to 4e-16): once the residual is that small and stops halving, the root is found to that noise.
    if (Math.abs(r) <= 1e-12 && Math.abs(r) > 0.5 * previous) return v;
    // The last Newton step did not halve the residual: bisect this time (or, with logSplit, switch a
    // crawling step in v to one in log|v|, where a tail piled up against 0 is smooth).
    const slow = stepped && Math.abs(r) > 0.5 * previous;
    previous = Math.abs(r);
    // Illinois: an end kept twice in a row has its residual halved, so the secant moves off it.
    if (r < 0) {
      if (secantMode && lastSide === -1) rb /= 2;
      a = v;
      ra = r;
      lastSide = -1;
    } else {
      if (secantMode && lastSide === 1) ra /= 2;
      b = v;
      rb = r;
      lastSide = 1;
    }
    const slope = Math.exp(e.logDensity - e.logTail);
    const linear: number = slope > 0 && Number.isFinite(slope) ? v - r / slope : NaN;
    if (Math.abs(linear - v) <= Math.max(2 * Number.EPSILON * Math.abs(v), tolerance) && Math.abs(r) <= 1e-6) return v;
    let useLog = false;
    if (logSplit && v !== 0 && a * b > 0 && !secantMode) {
      if (slow) {
        useLog = !lastLog;
        inLog = useLog;
      } else useLog = inLog;
    }
    // Newton in t = log|v|: dr/dt = slope · |v|, so v ← v · exp(−r/(slope · v)).
    let next: number = useLog ? v * Math.exp(-r / (slope * v)) : linear;
    let newton: boolean = next >= a && next <= b && next !== v;
    if (!newton && !bracketed) {
      const [lo, hi] = bracket();
      a = Math.max(a, Math.min(lo, hi));
      b = Math.min(b, Math.max(lo, hi));
      if (a !== v) ra = NaN;
      if (b !== v) rb = NaN;
      bracketed = true;
      newton = next >= a && next <= b && next !== v;
    }
    const known = Number.isFinite(ra) && Number.isFinite(rb);
    if (slow && !useLog && known) secantMode = true;
    let secant = false;
    if (secantMode && known && !(slow && lastSecant)) {
      // The secant through (a, ra) and (b, rb), in log|v| when both ends have one sign and logSplit.
      const t = ra / (ra - rb);
      const s =
        logSplit && a * b > 0
          ? Math.sign(a) * Math.exp(Math.log(Math.abs(a)) * (1 - t) + Math.log(Math.abs(b)) * t)
          : a + t * (b - a);
      if (s > a && s < b) {
        next = s;
        secant = true;
      }
      newton = false;
    } else if (slow && !useLog && Number.isFinite(a) && Number.isFinite(b)) newton = false;
    if (!newton && !secant) next = logSplit ? geometricSplit(a, b) : (a + b) / 2;
    lastLog = newton && useLog;
    lastSecant = secant;
    // After a Newton step its curvature constant shows in the new residual; at least 1, to be safe.
    const k = stepped ? Math.max(1, Math.abs(r) / (previousStep * previousStep)) : FIRST_STEP_K;
    if (newton && k * r * r <= ACCEPT_ERROR) return next;
    stepped = newton || secant;
    previousStep = Math.abs(r);
    const width = b - a;
    const closed =
      Number.isFinite(width) &&
      (width <= 2 * Number.EPSILON * Math.max(Math.abs(a), Math.abs(b)) || width <= tolerance);
    // The caller's number is the same anywhere in the bracket: return the end just evaluated.
    if (report(a) === report(b)) return r < 0 ? a : b;
    if (Math.abs(next - v) <= 2 * Number.EPSILON * Math.abs(v) || closed) return next;
    v = next;
  }
  return v;
}

/** Where a bisection of [a, b] (finite ends) splits it when quantiles span magnitudes: see solveQuantile. */
function geometricSplit(a: number, b: number): number {
  if (a < 0 && b > 0) return 0;
  const small = Math.max(Math.min(Math.abs(a), Math.abs(b)), 1e-300);
  const large = Math.max(Math.abs(a), Math.abs(b));
  if (large <= 4 * small) return (a + b) / 2;
  return (a >= 0 ? 1 : -1) * Math.sqrt(small) * Math.sqrt(large);
}
