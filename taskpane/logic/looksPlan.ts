/**
 * The Plan section with looks: how often the read-out will be looked at (every day, every week, once at the
 * end), the one threshold that keeps the chance of a false winner at the plan's rate under that schedule
 * (THRESHOLD_FOR_LOOKS, after THRESHOLD_FOR_VARIANTS shares the rate among the challengers), the chance of
 * a false winner of the naive rule (declaring at the plain threshold at every look) beside it, the whole
 * weeks a real lift of the planned size needs, and the other way round: the smallest lift a run of N weeks
 * can be expected to detect. Pure apart from the `pause` the caller passes in.
 *
 * Cautions the panel states beside these numbers: the chances hold only if the looks are taken as planned
 * (no extra looks, no stopping for other reasons) and the traffic splits as planned; the plan with several
 * challengers joins the two corrections (variants, then looks) and is not an exact joint calculation. For
 * regulated or health-related decisions, have a qualified statistician check the plan.
 */
import { falseAlarmWithLooks, MAX_LOOKS, powerWithLooks, thresholdForLooks } from '../../functions/stats/looks';
import { smallestDetectableLift } from '../../functions/stats/detectableLift';
import { thresholdForVariants } from '../../functions/stats/manyVariants';
import type { BetaPrior } from '../../functions/stats/types';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import { DEFAULT_LOCALE, formatDecimal, type NumberLocale } from './inputs';

/**
 * A threshold as the panel shows it: a percent with two decimals, rounded up, so that a P(beats control)
 * read against the text is never declared below the true threshold. Cost O(1).
 * @example thresholdText(0.9927064) //=> "99.28%"
 */
export function thresholdText(threshold: number, locale: NumberLocale = DEFAULT_LOCALE): string {
  return `${formatDecimal(Math.ceil(threshold * 10000 - 1e-9) / 100, locale)}%`;
}

/** How often the read-out is looked at. */
export type LookCadence = 'daily' | 'weekly' | 'once';

/** The words the panel shows for each cadence (our own). */
export const CADENCE_WORDS: { readonly [K in LookCadence]: string } = Object.freeze({
  daily: 'every day',
  weekly: 'once a week',
  once: 'once, at the end',
});

/** Longest plan in weeks the search considers (half a year; the plan's own "not realistic" mark). */
export const MAX_PLAN_WEEKS = 26;

/** What the looks plan needs (fractions, as the core takes them). */
export interface LooksPlanInputs {
  readonly baselineRate: number;
  readonly lift: number;
  /** The plain threshold; 1 − threshold is the overall chance of a false winner the plan keeps. */
  readonly threshold: number;
  readonly power: number;
  readonly variants: number;
  readonly dailyVisitors: number;
  readonly trafficShare: number;
  readonly cadence: LookCadence;
  readonly prior?: BetaPrior;
}

/**
 * Cumulative visitors per variant at each look of a run of `weeks` whole weeks: every day (7·weeks looks),
 * every week (weeks looks) or once at the end. Whole numbers, strictly increasing (days that would add
 * no visitor to a variant are merged into the next look). Cost O(looks).
 * @example lookSchedule(700, 'weekly', 2) //=> [700, 1400]
 */
export function lookSchedule(perVariantPerDay: number, cadence: LookCadence, weeks: number): number[] {
  const days = 7 * weeks;
  const step = cadence === 'daily' ? 1 : cadence === 'weekly' ? 7 : days;
  const out: number[] = [];
  for (let day = step; day <= days; day += step) {
    const n = Math.floor(perVariantPerDay * day);
    if (n >= 1 && (out.length === 0 || n > out[out.length - 1]!)) out.push(n);
  }
  return out;
}

/** Most weeks a cadence allows under the core's limit of MAX_LOOKS looks. */
export function maxWeeks(cadence: LookCadence): number {
  return cadence === 'daily' ? Math.min(MAX_PLAN_WEEKS, Math.floor(MAX_LOOKS / 7)) : MAX_PLAN_WEEKS;
}

/** One run length worked out. */
export interface LooksAtWeeks {
  readonly weeks: number;
  readonly looks: readonly number[];
  /** The threshold to use at every look (THRESHOLD_FOR_LOOKS at the per-challenger false-alarm rate). */
  readonly threshold: number;
  /** POWER_WITH_LOOKS of one challenger at the planned lift under that threshold. */
  readonly power: number;
}

/** The looks plan's results. */
export interface LooksPlan {
  readonly cadence: LookCadence;
  /** The overall false-alarm rate the plan keeps: 1 − threshold. */
  readonly falseAlarm: number;
  /** Each challenger's share of it at one look (1 − THRESHOLD_FOR_VARIANTS(variants, falseAlarm)). */
  readonly falseAlarmPerChallenger: number;
  readonly visitorsPerVariantPerDay: number;
  /** The shortest run that reaches the power, or null when none up to maxWeeks(cadence) does. */
  readonly plan: LooksAtWeeks | null;
  /** The longest run tried (shown when no run reaches the power). */
  readonly longest: LooksAtWeeks;
  /**
   * The naive rule on the plan's looks (or on the longest run's): declaring a challenger when its
   * P(beats control) reaches the plain threshold at any look. One challenger's chance (FALSE_ALARM_WITH_LOOKS).
   */
  readonly naiveFalseAlarm: number;
  /** The same chance under the plan's threshold (at most falseAlarmPerChallenger). */
  readonly honestFalseAlarm: number;
}

/** What the caller supplies to keep the page responsive and to stop early. */
export interface StepControl {
  pause(): Promise<void>;
  cancelled(): boolean;
  /** Called after each run length tried, with the weeks tried so far. */
  onStep?(weeks: number, tried: number): void;
}

/** Each challenger's one-look false-alarm rate: Dunnett's share of the overall rate (THRESHOLD_FOR_VARIANTS). */
export function falseAlarmPerChallenger(threshold: number, variants: number): number {
  return variants <= 2 ? 1 - threshold : 1 - thresholdForVariants(variants, 1 - threshold);
}

/**
 * The threshold and the power of a run of `weeks` weeks. Cost: one thresholdForLooks (≤ 200 ms in the
 * bench) and one powerWithLooks (≤ 100 ms). Throws StatsError from the core for inputs it rejects.
 */
export function looksAtWeeks(inputs: LooksPlanInputs, weeks: number): LooksAtWeeks {
  const prior = inputs.prior ?? UNIFORM_PRIOR;
  const perDay = (inputs.dailyVisitors * inputs.trafficShare) / inputs.variants;
  const looks = lookSchedule(perDay, inputs.cadence, weeks);
  if (looks.length === 0) {
    throw new RangeError(`fewer than one visitor per variant in ${weeks} week(s): the test cannot be looked at`);
  }
  const rate = falseAlarmPerChallenger(inputs.threshold, inputs.variants);
  const threshold = thresholdForLooks(inputs.baselineRate, looks, rate, 1, prior);
  const power = powerWithLooks(inputs.baselineRate, inputs.lift, looks, threshold, prior).probability;
  return { weeks, looks, threshold, power };
}

/**
 * The shortest whole number of weeks whose power (looks taken at the cadence, the looks' threshold)
 * reaches the target, by bisection over 1 … maxWeeks(cadence) (power grows with the run; the bisection
 * assumes it, which holds up to the small steps of the binomial lattice). Pauses between runs so the page
 * stays responsive. Cost: at most ⌈log2 26⌉ + 1 = 6 runs of looksAtWeeks, then two FALSE_ALARM_WITH_LOOKS.
 * Returns null when cancelled. Throws StatsError from the core for inputs it rejects.
 */
export async function planWithLooks(inputs: LooksPlanInputs, control: StepControl): Promise<LooksPlan | null> {
  const prior = inputs.prior ?? UNIFORM_PRIOR;
  const top = maxWeeks(inputs.cadence);
  const tried = new Map<number, LooksAtWeeks>();
  const at = async (weeks: number): Promise<LooksAtWeeks | null> => {
    const known = tried.get(weeks);
    if (known) return known;
    await control.pause();
    if (control.cancelled()) return null;
    const result = looksAtWeeks(inputs, weeks);
    tried.set(weeks, result);
    control.onStep?.(weeks, tried.size);
    return result;
  };
  const longest = await at(top);
  if (longest === null) return null;
  let plan: LooksAtWeeks | null = null;
  if (longest.power >= inputs.power) {
    let lo = 0; // lo fails (or is 0), hi reaches
    let hi = top;
    while (hi - lo > 1) {
      const mid = Math.floor((lo + hi) / 2);
      const r = await at(mid);
      if (r === null) return null;
      if (r.power >= inputs.power) hi = mid;
      else lo = mid;
    }
    plan = tried.get(hi)!;
  }
  await control.pause();
  if (control.cancelled()) return null;
  const shown = plan ?? longest;
  const naive = falseAlarmWithLooks(inputs.baselineRate, shown.looks, inputs.threshold, 1, prior).probability;
  const honest = falseAlarmWithLooks(inputs.baselineRate, shown.looks, shown.threshold, 1, prior).probability;
  return {
    cadence: inputs.cadence,
    falseAlarm: 1 - inputs.threshold,
    falseAlarmPerChallenger: falseAlarmPerChallenger(inputs.threshold, inputs.variants),
    visitorsPerVariantPerDay: (inputs.dailyVisitors * inputs.trafficShare) / inputs.variants,
    plan,
    longest,
    naiveFalseAlarm: naive,
    honestFalseAlarm: honest,
  };
}

/** The other way round: what a run of a given length can detect. */
export interface DetectableInWeeks {
  readonly weeks: number;
  readonly visitorsPerVariant: number;
  /** The looks' threshold for that run. */
  readonly threshold: number;
  /** SMALLEST_DETECTABLE_LIFT at the last look's size and the looks' threshold; null when none below +100%… */
  readonly lift: number | null;
}

/**
 * The smallest relative lift a run of `weeks` weeks can be expected to detect with the plan's power:
 * SMALLEST_DETECTABLE_LIFT at the visitors per variant of the last look, under the threshold the looks
 * need. It counts the last look only, so it is a little cautious: the earlier looks add a chance to
 * declare. Cost: one thresholdForLooks and one smallestDetectableLift (≤ 300 ms in the bench).
 * Throws StatsError from the core for inputs it rejects, except 'not_available' (no lift reaches the
 * power), which gives lift null.
 */
export function detectableInWeeks(inputs: LooksPlanInputs, weeks: number): DetectableInWeeks {
  const prior = inputs.prior ?? UNIFORM_PRIOR;
  const perDay = (inputs.dailyVisitors * inputs.trafficShare) / inputs.variants;
  const looks = lookSchedule(perDay, inputs.cadence, weeks);
  if (looks.length === 0) {
    throw new RangeError(`fewer than one visitor per variant in ${weeks} week(s): the test cannot be looked at`);
  }
  const threshold = thresholdForLooks(
    inputs.baselineRate,
    looks,
    falseAlarmPerChallenger(inputs.threshold, inputs.variants),
    1,
    prior,
  );
  const n = looks[looks.length - 1]!;
  let lift: number | null;
  try {
    lift = smallestDetectableLift(inputs.baselineRate, n, threshold, inputs.power, prior);
  } catch (error) {
    if ((error as { code?: string }).code !== 'not_available') throw error;
    lift = null;
  }
  return { weeks, visitorsPerVariant: n, threshold, lift };
}
