/**
 * The Plan section's numbers: visitors per variant (core visitorsNeeded), total, days to run, the
 * classic z-test size beside it, and the decision-power curve computed a point at a time so the panel
 * never freezes. Pure apart from the `pause` the caller passes in.
 */
import type { BetaPrior } from '../../functions/stats/types';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import { classicSampleSize, decisionPower, visitorsNeeded } from '../../functions/stats/planning';
import type { PlanInputs } from './formulas';

/** The plan's results. */
export interface PlanNumbers {
  readonly visitorsPerVariant: number;
  readonly totalVisitors: number;
  /** Whole days: ceil(total / (daily visitors × share in the test)), as the sheet's ROUNDUP. */
  readonly days: number;
  readonly classicPerVariant: number;
}

/**
 * Check the Plan inputs; returns a list of problems in plain words (empty when all is well). Cost O(1).
 * @example planProblems({ ...inputs, trafficShare: 1.5 }) //=> ["share of traffic in the test must be above 0 and at most 100%"]
 */
export function planProblems(inputs: PlanInputs): string[] {
  const out: string[] = [];
  const inOpen = (v: number): boolean => Number.isFinite(v) && v > 0 && v < 1;
  if (!inOpen(inputs.baselineRate)) out.push('baseline rate must be between 0% and 100%');
  if (!Number.isFinite(inputs.lift) || inputs.lift <= 0) out.push('smallest lift worth detecting must be above 0%');
  else if (inOpen(inputs.baselineRate) && inputs.baselineRate * (1 + inputs.lift) >= 1) {
    out.push('baseline rate × (1 + lift) must stay below 100%');
  }
  if (!inOpen(inputs.threshold)) out.push('decision threshold must be between 0 and 1');
  if (!inOpen(inputs.power)) out.push('target power must be between 0% and 100%');
  if (!Number.isInteger(inputs.variants) || inputs.variants < 2 || inputs.variants > 50) {
    out.push('number of variants must be a whole number from 2 to 50');
  }
  if (!Number.isFinite(inputs.dailyVisitors) || inputs.dailyVisitors <= 0) out.push('visitors per day must be above 0');
  if (!Number.isFinite(inputs.trafficShare) || inputs.trafficShare <= 0 || inputs.trafficShare > 1) {
    out.push('share of traffic in the test must be above 0 and at most 100%');
  }
  if (!inOpen(inputs.classicAlpha)) out.push('classic significance level must be between 0 and 1');
  return out;
}

/**
 * Compute the plan. Method: core visitorsNeeded (exact decision power, searched over n) and
 * classicSampleSize (two-proportion z-test, as R's power.prop.test). Cost: one visitorsNeeded call
 * (the core's target is ≤ 200 ms). Throws StatsError from the core for inputs it rejects.
 * @example planNumbers({ baselineRate: 0.1, lift: 0.5, threshold: 0.95, power: 0.8, variants: 2, dailyVisitors: 500, trafficShare: 1, classicAlpha: 0.05 }).classicPerVariant //=> 686
 */
export function planNumbers(inputs: PlanInputs): PlanNumbers {
  const prior: BetaPrior = inputs.prior ?? UNIFORM_PRIOR;
  const perVariant = visitorsNeeded(inputs.baselineRate, inputs.lift, inputs.threshold, inputs.power, prior);
  const total = perVariant * inputs.variants;
  return {
    visitorsPerVariant: perVariant,
    totalVisitors: total,
    days: Math.ceil(total / (inputs.dailyVisitors * inputs.trafficShare)),
    classicPerVariant: classicSampleSize(inputs.baselineRate, inputs.lift, inputs.classicAlpha, inputs.power, 2),
  };
}

/**
 * Visitors-per-variant values for the power chart: fractions ¼ … 2 of the planned size, whole and
 * distinct, ascending. Cost O(1).
 * @example curveSizes(1000) //=> [250, 500, 750, 1000, 1250, 1500, 2000]
 */
export function curveSizes(visitorsPerVariant: number): number[] {
  const fractions = [0.25, 0.5, 0.75, 1, 1.25, 1.5, 2];
  const sizes = fractions.map((f) => Math.max(1, Math.round(f * visitorsPerVariant)));
  return [...new Set(sizes)].sort((a, b) => a - b);
}

/** One computed point of the power curve. */
export interface PowerPoint {
  readonly visitorsPerVariant: number;
  readonly power: number;
}

/** What the caller supplies to keep the page responsive and to stop early. */
export interface CurveControl {
  /** Called after each point with the points so far and the count done. */
  onPoint(points: readonly PowerPoint[], done: number, total: number): void;
  /** Awaited between points (e.g. a zero-delay timeout) so the page can repaint and react. */
  pause(): Promise<void>;
  /** Checked before each point; when true the computation stops and returns what it has. */
  cancelled(): boolean;
}

/**
 * Decision power at each size, one point at a time, pausing between points.
 * Method: core decisionPower (exact binomial sum). Cost: one decisionPower call per size (the core's
 * target is ≤ 20 ms each at typical sizes). Throws StatsError from the core for inputs it rejects.
 * @example await powerCurve(inputs, [250, 500], control) //=> [{ visitorsPerVariant: 250, power: … }, …]
 */
export async function powerCurve(inputs: PlanInputs, sizes: readonly number[], control: CurveControl): Promise<PowerPoint[]> {
  const prior: BetaPrior = inputs.prior ?? UNIFORM_PRIOR;
  const points: PowerPoint[] = [];
  for (const n of sizes) {
    if (control.cancelled()) break;
    await control.pause();
    if (control.cancelled()) break;
    points.push({ visitorsPerVariant: n, power: decisionPower(inputs.baselineRate, inputs.lift, n, inputs.threshold, prior) });
    control.onPoint(points.slice(), points.length, sizes.length);
  }
  return points;
}
