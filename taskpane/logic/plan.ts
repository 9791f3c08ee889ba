/**
 * The Plan section's numbers: visitors per variant (core visitorsNeeded) at a threshold that accounts for
 * the number of challengers, total, the run time in whole weeks with a warning when it is unrealistic, the
 * classic z-test size beside it, and the decision-power curve computed a point at a time so the panel never
 * freezes. Also how the panel reads its plan fields (percents, counts) into the fractions the core takes.
 * Pure apart from the `pause` the caller passes in.
 */
import type { BetaPrior } from '../../functions/stats/types';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import { MAX_VARIANTS } from '../../functions/stats/limits';
import { classicSampleSize, decisionPower, visitorsNeeded } from '../../functions/stats/planning';
import type { PlanInputs } from './formulas';
import {
  DEFAULT_LOCALE,
  formatCount,
  formatPercent,
  readCount,
  readPercent,
  type CountRule,
  type FieldReading,
  type NumberLocale,
  type PercentRule,
} from './inputs';

/**
 * Where the threshold each challenger must reach comes from, given the overall threshold and the number
 * of variants. One object so the source can be swapped (e.g. for Dunnett's many-to-one threshold once the
 * worksheet has a function for it) without touching the plan's callers.
 */
export interface ThresholdSource {
  /** Plain words for the method, used in the sheet's label ("false-alarm rate split evenly over the challengers"). */
  readonly label: string;
  /** P(beats control) each challenger must reach. Equals `threshold` for one challenger. */
  perChallenger(threshold: number, variants: number): number;
  /** The same as a worksheet expression (no leading "="), from the cells holding the threshold and the variants. */
  formula(thresholdCell: string, variantsCell: string): string;
  /** A sentence for the panel saying what was done and why. */
  explain(threshold: number, variants: number, locale?: NumberLocale): string;
}

/**
 * Bonferroni's split (Bonferroni 1936; Dunn 1961): with no true difference, the chance that any of the
 * m = variants − 1 challengers is declared is at most the sum of their chances, so giving each challenger
 * the false-alarm rate (1 − threshold)/m keeps the overall rate at or below 1 − threshold. A little
 * stricter than needed (it ignores that the challengers share the control); Dunnett's many-to-one
 * threshold is the exact one and can replace it through PLAN_THRESHOLD_SOURCE.
 */
export const BONFERRONI_SPLIT: ThresholdSource = Object.freeze({
  label: 'false-alarm rate split evenly over the challengers',
  perChallenger(threshold: number, variants: number): number {
    const challengers = Math.max(1, variants - 1);
    return 1 - (1 - threshold) / challengers;
  },
  formula(thresholdCell: string, variantsCell: string): string {
    return `1-(1-${thresholdCell})/MAX(1,${variantsCell}-1)`;
  },
  explain(threshold: number, variants: number, locale: NumberLocale = DEFAULT_LOCALE): string {
    const challengers = variants - 1;
    if (challengers <= 1) return '';
    const falseAlarm = formatPercent(1 - threshold, locale);
    const each = formatPercent((1 - threshold) / challengers, locale);
    const perChallenger = formatPercent(BONFERRONI_SPLIT.perChallenger(threshold, variants), locale);
    return (
      `With ${challengers} challengers, each one gets a chance to win by luck. To keep the overall chance of a false ` +
      `winner at ${falseAlarm}, the ${falseAlarm} is split evenly: each challenger must reach P(beats control) ≥ ` +
      `${perChallenger} (${each} each; the Bonferroni split, slightly stricter than needed). That is why each ` +
      `variant ` +
      `needs more visitors than in a test of two.`
    );
  },
});

/** The threshold source the plan uses. */
export const PLAN_THRESHOLD_SOURCE: ThresholdSource = BONFERRONI_SPLIT;

/** Our own rule of thumb: past 8 weeks a test meets changing seasons, cookie loss and other launches. */
export const LONG_TEST_WEEKS = 8;
/** Past half a year a test is not a realistic plan at all (our own rule of thumb). */
export const UNREALISTIC_TEST_WEEKS = 26;

/** The plan's results. */
export interface PlanNumbers {
  /** The P(beats control) each challenger must reach (the overall threshold for two variants). */
  readonly perChallengerThreshold: number;
  readonly visitorsPerVariant: number;
  readonly totalVisitors: number;
  /** Visitors a day who enter the test: daily visitors × share in the test. */
  readonly testVisitorsPerDay: number;
  /** Days the traffic needs: ceil(total / test visitors a day). */
  readonly daysOfTraffic: number;
  /** Whole weeks to run, at least 1: ceil(total / test visitors a day / 7), as the sheet's ROUNDUP. */
  readonly weeks: number;
  /** 7 × weeks. */
  readonly days: number;
  /** The classic significance level per challenger: classicAlpha / (variants − 1). */
  readonly classicAlphaPerChallenger: number;
  readonly classicPerVariant: number;
}

/**
 * Compute the plan. Method: the per-challenger threshold from `source` (default PLAN_THRESHOLD_SOURCE);
 * core visitorsNeeded at that threshold (exact decision power, searched over n); classicSampleSize at the
 * significance level split the same way (two-proportion z-test, as R's power.prop.test); the run time
 * rounded up to whole weeks. Cost: one visitorsNeeded call (the core's target is ≤ 200 ms).
 * Throws StatsError from the core for inputs it rejects.
 * @example planNumbers({ baselineRate: 0.1, lift: 0.5, threshold: 0.95, power: 0.8, variants: 2, dailyVisitors: 500, trafficShare: 1, classicAlpha: 0.05 }).classicPerVariant //=> 686
 */
export function planNumbers(inputs: PlanInputs, source: ThresholdSource = PLAN_THRESHOLD_SOURCE): PlanNumbers {
  const prior: BetaPrior = inputs.prior ?? UNIFORM_PRIOR;
  const perChallengerThreshold = source.perChallenger(inputs.threshold, inputs.variants);
  const perVariant = visitorsNeeded(inputs.baselineRate, inputs.lift, perChallengerThreshold, inputs.power, prior);
  const total = perVariant * inputs.variants;
  const perDay = inputs.dailyVisitors * inputs.trafficShare;
  const weeks = Math.max(1, Math.ceil(total / perDay / 7));
  const classicAlphaPerChallenger = inputs.classicAlpha / Math.max(1, inputs.variants - 1);
  return {
    perChallengerThreshold,
    visitorsPerVariant: perVariant,
    totalVisitors: total,
    testVisitorsPerDay: perDay,
    daysOfTraffic: Math.ceil(total / perDay),
    weeks,
    days: 7 * weeks,
    classicAlphaPerChallenger,
    classicPerVariant: classicSampleSize(inputs.baselineRate, inputs.lift, classicAlphaPerChallenger, inputs.power, 2),
  };
}

/** How realistic a run time is. */
export interface DurationCheck {
  readonly level: 'fine' | 'long' | 'unrealistic';
  /** Words for the panel; null when fine. */
  readonly text: string | null;
}

/** "about 4.2 years" / "about 7 months" for a number of weeks. */
function spanWords(weeks: number): string {
  const years = (weeks * 7) / 365.25;
  if (years >= 1.5) return `about ${years.toFixed(1)} years`;
  return `about ${Math.round((weeks * 7) / 30.44)} months`;
}

/**
 * Say whether a planned run time is realistic. Over LONG_TEST_WEEKS it is long (returning visitors clear
 * cookies, seasons and prices change, other launches overlap); over UNREALISTIC_TEST_WEEKS it is no plan
 * at all. Both are our own rules of thumb. Cost O(1).
 * @example durationCheck(1547).level //=> "unrealistic"
 */
export function durationCheck(days: number, locale: NumberLocale = DEFAULT_LOCALE): DurationCheck {
  const weeks = Math.ceil(days / 7);
  const shorten =
    'To shorten it: plan for a larger smallest lift worth detecting, put more of the traffic into the test, test ' +
    'fewer variants, or accept a lower threshold or power.';
  if (weeks > UNREALISTIC_TEST_WEEKS) {
    return {
      level: 'unrealistic',
      text:
        `${formatCount(days, locale)} days (${spanWords(weeks)}) is not a realistic test: visitors, prices and ` +
        `seasons change long before it ends, and the result would describe a shop that no longer exists. ${shorten}`,
    };
  }
  if (weeks > LONG_TEST_WEEKS) {
    return {
      level: 'long',
      text:
        `${weeks} weeks is a long test: over ${LONG_TEST_WEEKS} weeks returning visitors clear their cookies and ` +
        `count twice, and seasons and other launches get in the way. ${shorten}`,
    };
  }
  return { level: 'fine', text: null };
}

/** The texts of the Plan section's fields. */
export interface PlanTexts {
  readonly baselineRate: string;
  readonly lift: string;
  readonly threshold: string;
  readonly power: string;
  readonly variants: string;
  readonly dailyVisitors: string;
  readonly trafficShare: string;
  readonly classicAlpha: string;
}

/** What each Plan field accepts. Percent fields take percents (4 for 4%). */
export const PLAN_RULES: {
  readonly [K in keyof PlanTexts]:
    { readonly kind: 'percent'; readonly rule: PercentRule } | { readonly kind: 'count'; readonly rule: CountRule };
} = Object.freeze({
  baselineRate: {
    kind: 'percent',
    rule: { name: 'Baseline conversion rate', min: 0, minIncluded: false, max: 1, maxIncluded: false, example: '4' },
  },
  lift: {
    kind: 'percent',
    rule: {
      name: 'Smallest lift worth detecting',
      min: 0,
      minIncluded: false,
      max: 10,
      maxIncluded: true,
      example: '10',
    },
  },
  threshold: {
    kind: 'percent',
    rule: { name: 'Decision threshold', min: 0.5, minIncluded: false, max: 1, maxIncluded: false, example: '95' },
  },
  power: {
    kind: 'percent',
    rule: { name: 'Target decision power', min: 0.5, minIncluded: true, max: 1, maxIncluded: false, example: '80' },
  },
  variants: {
    kind: 'count',
    rule: { name: 'Variants', min: 2, minIncluded: true, max: MAX_VARIANTS, whole: true, example: '2' },
  },
  dailyVisitors: {
    kind: 'count',
    rule: {
      name: 'Visitors per day',
      min: 0,
      minIncluded: false,
      max: Number.POSITIVE_INFINITY,
      whole: false,
      example: '4000',
    },
  },
  trafficShare: {
    kind: 'percent',
    rule: {
      name: 'Share of visitors in the test',
      min: 0,
      minIncluded: false,
      max: 1,
      maxIncluded: true,
      example: '100',
    },
  },
  classicAlpha: {
    kind: 'percent',
    rule: { name: 'Significance level', min: 0, minIncluded: false, max: 0.5, maxIncluded: true, example: '5' },
  },
});

/** The Plan fields read: the inputs when all are good, each field's message or note, and cross-field problems. */
export interface PlanReading {
  readonly inputs: PlanInputs | null;
  /** Per field: an error (blocks the plan) or a note (how the value was read). */
  readonly fields: { readonly [K in keyof PlanTexts]: FieldReading };
  /** Problems between fields (rate × (1 + lift) ≥ 100%). */
  readonly problems: readonly string[];
}

/**
 * Read the Plan fields in the user's way of writing numbers. Cost O(total text length).
 * @example readPlan({ baselineRate: '4,2', lift: '10', threshold: '95', power: '80', variants: '2', dailyVisitors: '6000', trafficShare: '50', classicAlpha: '5' }).inputs?.baselineRate //=> 0.042
 */
export function readPlan(texts: PlanTexts, locale: NumberLocale = DEFAULT_LOCALE, prior?: BetaPrior): PlanReading {
  const fields = {} as Record<keyof PlanTexts, FieldReading>;
  for (const key of Object.keys(PLAN_RULES) as (keyof PlanTexts)[]) {
    const spec = PLAN_RULES[key];
    fields[key] =
      spec.kind === 'percent' ? readPercent(texts[key], spec.rule, locale) : readCount(texts[key], spec.rule, locale);
  }
  const values = Object.values(fields);
  if (!values.every((f) => f.ok)) return { inputs: null, fields, problems: [] };
  const value = (key: keyof PlanTexts): number => (fields[key] as { value: number }).value;
  const inputs: PlanInputs = {
    baselineRate: value('baselineRate'),
    lift: value('lift'),
    threshold: value('threshold'),
    power: value('power'),
    variants: value('variants'),
    dailyVisitors: value('dailyVisitors'),
    trafficShare: value('trafficShare'),
    classicAlpha: value('classicAlpha'),
    ...(prior ? { prior } : {}),
  };
  const problems = planProblems(inputs);
  return { inputs: problems.length === 0 ? inputs : null, fields, problems };
}

/**
 * Check the Plan inputs (fractions); returns a list of problems in plain words (empty when all is well).
 * Cost O(1).
 * @example planProblems({ ...inputs, trafficShare: 1.5 }) //=> ["share of traffic in the test must be above 0 and at most 100%"]
 */
export function planProblems(inputs: PlanInputs): string[] {
  const out: string[] = [];
  const inOpen = (v: number): boolean => Number.isFinite(v) && v > 0 && v < 1;
  if (!inOpen(inputs.baselineRate)) out.push('baseline rate must be between 0% and 100%');
  if (!Number.isFinite(inputs.lift) || inputs.lift <= 0) out.push('smallest lift worth detecting must be above 0%');
  else if (inOpen(inputs.baselineRate) && inputs.baselineRate * (1 + inputs.lift) >= 1) {
    out.push(
      `baseline rate × (1 + lift) must stay below 100%: ${formatPercent(inputs.baselineRate)} raised by ` +
        `${formatPercent(inputs.lift)} would be ${formatPercent(inputs.baselineRate * (1 + inputs.lift))}`,
    );
  }
  if (!inOpen(inputs.threshold)) out.push('decision threshold must be between 0% and 100%');
  if (!inOpen(inputs.power)) out.push('target power must be between 0% and 100%');
  if (!Number.isInteger(inputs.variants) || inputs.variants < 2 || inputs.variants > MAX_VARIANTS) {
    out.push(`number of variants must be a whole number from 2 to ${MAX_VARIANTS}`);
  }
  if (!Number.isFinite(inputs.dailyVisitors) || inputs.dailyVisitors <= 0) out.push('visitors per day must be above 0');
  if (!Number.isFinite(inputs.trafficShare) || inputs.trafficShare <= 0 || inputs.trafficShare > 1) {
    out.push('share of traffic in the test must be above 0 and at most 100%');
  }
  if (!inOpen(inputs.classicAlpha)) out.push('classic significance level must be between 0% and 100%');
  return out;
}

/**
 * Whether two plan inputs are the same plan (used to refuse inserting results computed from other inputs).
 * Cost O(1).
 * @example samePlan(a, { ...a }) //=> true
 */
export function samePlan(a: PlanInputs, b: PlanInputs): boolean {
  const keys: (keyof PlanInputs)[] = [
    'baselineRate',
    'lift',
    'threshold',
    'power',
    'variants',
    'dailyVisitors',
    'trafficShare',
    'classicAlpha',
  ];
  if (!keys.every((key) => a[key] === b[key])) return false;
  return a.prior?.alpha === b.prior?.alpha && a.prior?.beta === b.prior?.beta;
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
 * Decision power of one challenger at each size, at the per-challenger threshold, one point at a time,
 * pausing between points. Method: core decisionPower (exact binomial sum). Cost: one decisionPower call per
 * size (the core's target is ≤ 20 ms each at typical sizes). Throws StatsError from the core for inputs it
 * rejects.
 * @example await powerCurve(inputs, [250, 500], control) //=> [{ visitorsPerVariant: 250, power: … }, …]
 */
export async function powerCurve(
  inputs: PlanInputs,
  sizes: readonly number[],
  control: CurveControl,
  source: ThresholdSource = PLAN_THRESHOLD_SOURCE,
): Promise<PowerPoint[]> {
  const prior: BetaPrior = inputs.prior ?? UNIFORM_PRIOR;
  const threshold = source.perChallenger(inputs.threshold, inputs.variants);
  const points: PowerPoint[] = [];
  for (const n of sizes) {
    if (control.cancelled()) break;
    await control.pause();
    if (control.cancelled()) break;
    points.push({ visitorsPerVariant: n, power: decisionPower(inputs.baselineRate, inputs.lift, n, threshold, prior) });
    control.onPoint(points.slice(), points.length, sizes.length);
  }
  return points;
}
