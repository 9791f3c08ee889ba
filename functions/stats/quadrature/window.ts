/**
 * Where a tabulation puts its panels: the window where the log density is within `logRange` of its
 * peak (found by Newton's method from the mode on each side), and panel edges stepped across it by the
 * width rule min(curvatureWidth/√curvature, slopeWidth/|slope|), kept short against nearby complex
 * singularities. Deterministic: the same density gives the same edges.
 */
import { StatsError } from '../errors';
import type { WorkingDensity } from '../types';

/** How the panels are laid out; the defaults are what the accuracy tests were run with. */
export interface PanelOptions {
  /**
   * The window is where logDensity ≥ −logRange (default 230: tails down to ~1e-100 are tabulated, which
   * keeps probabilities and losses down to ~1e-90 relatively accurate; beyond the window the
   * exponential-tail form f/|slope| is used). 700 reaches 1e-300 at three times the cost.
   */
  readonly logRange?: number;
  /** Panel width at most curvatureWidth/√curvature (default 2: two local standard deviations). */
  readonly curvatureWidth?: number;
  /** Panel width at most slopeWidth/|slope| (default 24: the density changes by at most ~e^24
   * across a panel; the trend-weighted rules keep such panels exact). */
  readonly slopeWidth?: number;
  /**
   * Panel width at most absoluteWidth in z wherever curvature·width² > 1e-6 (default 1.5), against
   * complex singularities of the density a few units from the real axis.
   */
  readonly absoluteWidth?: number;
}

const DEFAULT_LOG_RANGE = 230;
const DEFAULT_CURVATURE_WIDTH = 2;
const DEFAULT_SLOPE_WIDTH = 24;
const DEFAULT_ABSOLUTE_WIDTH = 1.5;
/** Most panels of one tabulation (a bound on its work; ~100–300 are usual). */
const MAX_PANELS = 20000;

/** The error of a density that cannot be tabulated. */
export function tabulationFailure(message: string): StatsError {
  return new StatsError('not_available', `the posterior could not be tabulated: ${message}`);
}

/**
 * Finds where logDensity falls to −range on one side of the mode (direction ±1) by Newton's method,
 * which for a concave log density approaches the crossing monotonically from outside after one step.
 */
function windowEnd(density: WorkingDensity, range: number, direction: 1 | -1): number {
  const mode = density.mode;
  const c0 = density.curvature(mode);
  let step = c0 > 0 && Number.isFinite(c0) ? Math.sqrt((2 * range) / c0) : 1;
  let z = mode + direction * step;
  // Make sure the start is beyond the mode with a usable slope (log-concavity makes it so for any z ≠ mode).
  for (let i = 0; i < 2000; i++) {
    const phi = density.logDensity(z);
    const s = density.slope(z);
    if (!Number.isFinite(phi) || !Number.isFinite(s)) {
      // Too far: come back half-way towards the mode.
      step /= 2;
      z = mode + direction * step;
      continue;
    }
    const g = phi + range;
    if (direction * s >= 0) {
      step *= 2;
      z = mode + direction * step;
      continue;
    }
    const next = z - g / s;
    if (Math.abs(g) <= 1e-6 || Math.abs(next - z) <= 1e-13 * (1 + Math.abs(z))) return next;
    z = next;
    step = direction * (z - mode);
  }
  throw tabulationFailure('the tail window did not converge');
}

/**
 * The panel edges of a tabulation, ascending: the window [zLeft, zRight] found by {@link windowEnd},
 * stepped from the left by the width rule, which is checked at a panel's start, middle, end and (if
 * inside) the mode, halving towards the local rule where it is stricter further on.
 * Cost: a few density evaluations per panel; at most 20 000 panels.
 * Throws StatsError('not_available') when the window is empty or does not converge, or the panels do not fit.
 * @example layPanels(betaWorkingDensity(8, 10)).length //=> 35 (34 panels on logit p ∈ [−30.3, 24.2])
 */
export function layPanels(source: WorkingDensity, options: PanelOptions = {}): Float64Array {
  const range = options.logRange ?? DEFAULT_LOG_RANGE;
  const cw = options.curvatureWidth ?? DEFAULT_CURVATURE_WIDTH;
  const sw = options.slopeWidth ?? DEFAULT_SLOPE_WIDTH;
  const aw = options.absoluteWidth ?? DEFAULT_ABSOLUTE_WIDTH;
  const zLeft = windowEnd(source, range, -1);
  const zRight = windowEnd(source, range, 1);
  if (!(zLeft < source.mode && source.mode < zRight)) throw tabulationFailure('the window is empty');

  const width = (z: number): number => {
    const c = source.curvature(z);
    const s = Math.abs(source.slope(z));
    const a = c > 0 ? cw / Math.sqrt(c) : Infinity;
    const b = s > 0 ? sw / s : Infinity;
    let w = Math.min(a, b, (zRight - zLeft) / 4);
    // Where the curvature still matters, also keep panels short against nearby complex singularities
    // (the logit Beta has poles at distance π from the real axis).
    if (w > aw && c * w * w > 1e-6) w = Math.max(aw, Math.min(w, Math.sqrt(1e-6 / c)));
    return w;
  };
  const edgeList: number[] = [zLeft];
  let z = zLeft;
  while (z < zRight) {
    // The width rule at the start, the middle, the end and (if inside) the mode, until it holds on all.
    // Halving towards the local rule where it is stricter further on (never cutting below it at once,
    // which would make a panel far from a narrow region as short as the region needs).
    let w = width(z);
    for (let pass = 0; pass < 80; pass++) {
      let need = Math.min(width(z + w), width(z + w / 2));
      if (z < source.mode && source.mode < z + w) need = Math.min(need, width(source.mode));
      if (need >= w) break;
      w = Math.max(need, w / 2);
    }
    if (!(w > 0)) throw tabulationFailure('a panel has no width');
    // Only rounding dust is absorbed into the last panel (a longer panel could swallow the bulk).
    if (zRight - (z + w) < 1e-9 * w) w = zRight - z;
    z = w === zRight - z ? zRight : z + w;
    edgeList.push(z);
    if (edgeList.length > MAX_PANELS) throw tabulationFailure('too many panels');
  }
  return Float64Array.from(edgeList);
}
