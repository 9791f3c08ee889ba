/* eslint-disable @typescript-eslint/no-explicit-any -- Excel passes ranges as any[][] (blanks must stay blank) */
/**
 * The worksheet functions of the family "looks": planning a test that is looked at several times, and
 * watching a running test day by day.
 *
 * Each wrapper is one runFunction call: its catalogue entry (functions/catalogue.ts) says how to read the
 * arguments and how the result spills; the body only calls the statistics core. The JSDoc is the one home
 * of each function's words (Excel's formula help and the help pages); an @example is an Excel formula with
 * array constants ({1;2} is a column) followed by "returns" and the result, run by
 * test/addin/examples.test.ts. The example values come from the scipy references in
 * test/reference/looks/looks_values.json (looks_reference.py).
 */
import { CATALOGUE } from '../catalogue';
import { ArgumentProblem, runFunction } from '../sheet';
import * as byDay from '../stats/byDay';
import * as looks from '../stats/looks';
import { POSTERIOR_TABLES } from '../posteriorTables';

/**
 * Chance that a test with no true difference declares a winner at one of several looks, stopping at the first: the false-alarm rate of looking often.
 * @customfunction FALSE_ALARM_WITH_LOOKS
 * @helpurl https://localhost:3000/help/FALSE_ALARM_WITH_LOOKS.html
 * @param baseline_rate The conversion rate of both variants, 0.000001 to 0.999999.
 * @param visitors_at_looks Visitors per variant at each look, cumulative and increasing (a row or a column of 1 to 100 whole numbers, each 1 to 1000000000).
 * @param [threshold] PROB_ABOVE_CONTROL needed to declare a winner at a look, greater than 0.5 and at most 0.999999 (optional; default 0.95).
 * @param [sides] 1: only the challenger can be declared; 2: either variant, when its chance of being higher reaches the threshold (optional; 1 or 2, default 1).
 * @param [prior_alpha] Prior alpha used in the read-out, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta used in the read-out, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns A probability between 0 and 1; compare it with 1 − threshold, the rate of a single look.
 * @method Small tests: exact enumeration of both variants' conversion counts from look to look, with the read-out's own decision at every count (exact up to rounding: within 1e-11 of an independent enumeration in scipy). Larger tests: each look's own chance of a declaration computed exactly (as DECISION_POWER), joined across the looks by recursive numerical integration of the normal limit; within 0.001 of the exact enumeration (measured), closer as the counts grow.
 * @source P. Armitage, C. K. McPherson and B. C. Rowe, "Repeated significance tests on accumulating data", JRSS A 132 (1969); C. Jennison and B. W. Turnbull, Group Sequential Methods with Applications to Clinical Trials (2000), ch. 1 and 19.
 * @example =ABTEST.FALSE_ALARM_WITH_LOOKS(0.05, {100;200;300;400;500}) returns 0.11974
 * @crosscheck With one look it equals =ABTEST.DECISION_POWER(baseline_rate, 0, visitors, threshold).
 * @caution Peeking: looking at the read-out every day and stopping at the first good day declares far more false winners than one look at the end. Use THRESHOLD_FOR_LOOKS to choose a threshold for the looks you will take, and take only those.
 */
export function falseAlarmWithLooks(
  baseline_rate: number,
  visitors_at_looks: any[][],
  threshold?: number,
  sides?: number,
  prior_alpha?: number,
  prior_beta?: number,
): number {
  return runFunction(
    CATALOGUE.FALSE_ALARM_WITH_LOOKS,
    { baseline_rate, visitors_at_looks, threshold, sides, prior_alpha, prior_beta },
    (a) =>
      looks.falseAlarmWithLooks(a.baseline_rate, a.visitors_at_looks, a.threshold, a.sides === 2 ? 2 : 1, a.prior)
        .probability,
  );
}

/**
 * Chance that a challenger truly at baseline × (1 + lift) is declared better at one of several looks, stopping at the first.
 * @customfunction POWER_WITH_LOOKS
 * @helpurl https://localhost:3000/help/POWER_WITH_LOOKS.html
 * @param baseline_rate The control's conversion rate, 0.000001 to 0.999999.
 * @param lift The challenger's true relative lift, as a fraction from -0.99 to 1 (0.1 is +10%).
 * @param visitors_at_looks Visitors per variant at each look, cumulative and increasing (a row or a column of 1 to 100 whole numbers, each 1 to 1000000000).
 * @param [threshold] PROB_ABOVE_CONTROL needed to declare the challenger at a look, greater than 0.5 and at most 0.999999 (optional; default 0.95).
 * @param [prior_alpha] Prior alpha used in the read-out, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta used in the read-out, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns A probability between 0 and 1.
 * @method The same method as the false-alarm rate with looks, with the challenger at baseline × (1 + lift): exact enumeration for small tests, each look's exact chance joined by recursive integration for larger ones (within 0.001 of the exact enumeration).
 * @source P. Armitage, C. K. McPherson and B. C. Rowe, JRSS A 132 (1969); C. Jennison and B. W. Turnbull, Group Sequential Methods (2000), ch. 19.
 * @example =ABTEST.POWER_WITH_LOOKS(0.05, 0.4873, {100;200;300;400;500}) returns 0.58764
 * @crosscheck With one look it equals =ABTEST.DECISION_POWER(baseline_rate, lift, visitors, threshold); with lift 0 it is FALSE_ALARM_WITH_LOOKS with one side.
 * @caution More looks raise the power only because they also raise the false alarms: plan the threshold with THRESHOLD_FOR_LOOKS first, then read the power at that threshold.
 */
export function powerWithLooks(
  baseline_rate: number,
  lift: number,
  visitors_at_looks: any[][],
  threshold?: number,
  prior_alpha?: number,
  prior_beta?: number,
): number {
  return runFunction(
    CATALOGUE.POWER_WITH_LOOKS,
    { baseline_rate, lift, visitors_at_looks, threshold, prior_alpha, prior_beta },
    (a) => looks.powerWithLooks(a.baseline_rate, a.lift, a.visitors_at_looks, a.threshold, a.prior).probability,
  );
}

/**
 * The one PROB_ABOVE_CONTROL threshold to use at every look so that the chance of any false declaration stays at false_alarm.
 * @customfunction THRESHOLD_FOR_LOOKS
 * @helpurl https://localhost:3000/help/THRESHOLD_FOR_LOOKS.html
 * @param baseline_rate The conversion rate of both variants, 0.000001 to 0.999999.
 * @param visitors_at_looks Visitors per variant at each look, cumulative and increasing (a row or a column of 1 to 100 whole numbers, each 1 to 1000000000).
 * @param [false_alarm] The overall false-alarm rate to keep, at least 0.000001 and at most 0.5 (optional; default 0.05).
 * @param [sides] 1: only the challenger can be declared; 2: either variant (optional; 1 or 2, default 1).
 * @param [prior_alpha] Prior alpha used in the read-out, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta used in the read-out, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns A threshold between 0.5 and 0.999999: declare at a look only when PROB_ABOVE_CONTROL reaches it.
 * @method Solves: the false-alarm rate with these looks at the threshold equals the rate asked, by the same method as that rate (so the rate at the result is at most the one asked), to 0.0001 on the normal-quantile scale of the threshold; for small tests the rate moves in steps and the middle of the step reached is returned. For the largest exactly enumerated plans two exact runs are taken: the rate at the result is then within about 0.0001 below the rate asked. With large looks it is the constant boundary of Pocock (1977).
 * @source S. J. Pocock, "Group sequential methods in the design and analysis of clinical trials", Biometrika 64 (1977); C. Jennison and B. W. Turnbull, Group Sequential Methods (2000), ch. 2 and 19.
 * @example =ABTEST.THRESHOLD_FOR_LOOKS(0.05, {1000000;2000000;3000000;4000000;5000000}, 0.05, 2) returns 0.99209
 * @crosscheck =NORM.S.DIST(2.413, TRUE) gives 0.99209, Pocock's two-sided boundary for 5 equally spaced looks.
 * @caution The threshold holds for exactly these looks: looking more often than planned raises the false alarms again. It does not protect against a broken split (check SRM_PVALUE_BY_DAY) or against many variants (see THRESHOLD_FOR_VARIANTS).
 */
export function thresholdForLooks(
  baseline_rate: number,
  visitors_at_looks: any[][],
  false_alarm?: number,
  sides?: number,
  prior_alpha?: number,
  prior_beta?: number,
): number {
  return runFunction(
    CATALOGUE.THRESHOLD_FOR_LOOKS,
    { baseline_rate, visitors_at_looks, false_alarm, sides, prior_alpha, prior_beta },
    (a) => looks.thresholdForLooks(a.baseline_rate, a.visitors_at_looks, a.false_alarm, a.sides === 2 ? 2 : 1, a.prior),
  );
}

/**
 * P(beats control) of each challenger on the counts up to and including each day: one row per day, one column per challenger.
 * @customfunction PROB_ABOVE_CONTROL_BY_DAY
 * @helpurl https://localhost:3000/help/PROB_ABOVE_CONTROL_BY_DAY.html
 * @param conversions_by_day Conversions of each day (rows) and variant (columns, the control first); counts of that day, not running totals.
 * @param visitors_by_day Visitors of each day and variant, same shape as conversions_by_day. A row left blank in both is a day without data.
 * @param [prior_alpha] Prior alpha of every variant's rate, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta of every variant's rate, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns One row per day and one column per challenger; a blank day gives a blank row, and a challenger without visitors yet a blank cell.
 * @method P(beats control) as in the read-out, on the running totals of each day: Evan Miller's exact sum where it applies, otherwise quadrature of the Beta posteriors.
 * @source E. Miller, "Formulas for Bayesian A/B Testing" (2015); A. Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §2.4.
 * @example =ABTEST.PROB_ABOVE_CONTROL_BY_DAY({21,19,27;17,22,24}, {412,398,405;388,401,377}) returns {0.41836,0.82782;0.63667,0.93615}
 * @crosscheck The last row equals =ABTEST.PROB_ABOVE_CONTROL of the column totals.
 * @caution Peeking: a row per day invites stopping on the first good day. Unless the threshold was chosen for daily looks (THRESHOLD_FOR_LOOKS), declaring on the first day it is reached gives far more false winners than the threshold suggests.
 */
export function probAboveControlByDay(
  conversions_by_day: any[][],
  visitors_by_day: any[][],
  prior_alpha?: number,
  prior_beta?: number,
): any[][] {
  return runFunction(
    CATALOGUE.PROB_ABOVE_CONTROL_BY_DAY,
    { conversions_by_day, visitors_by_day, prior_alpha, prior_beta },
    (a) => {
      const conversions = a.dayColumns.conversions_by_day;
      const visitors = a.dayColumns.visitors_by_day;
      const counts = visitors.map((day, d) =>
        day.map((v, i) => ({ visitors: v, conversions: (conversions[d] as readonly number[])[i] as number })),
      );
      return byDay.probAboveControlByDay(counts, a.prior, POSTERIOR_TABLES);
    },
  );
}

/**
 * The split check (SRM_PVALUE) on the visitors up to and including each day: one p-value per day.
 * @customfunction SRM_PVALUE_BY_DAY
 * @helpurl https://localhost:3000/help/SRM_PVALUE_BY_DAY.html
 * @param visitors_by_day Visitors of each day (rows) and variant (columns, the control first); counts of that day, not running totals. A blank row is a day without data.
 * @param [planned_shares] Planned share of each variant, one per column of visitors_by_day, any positive weights (optional; default equal shares).
 * @returns One p-value per day (a column); a blank day, or a day before any visitor, gives a blank cell.
 * @method Pearson's chi-square goodness-of-fit test of the running totals against the planned shares, as SRM_PVALUE, each day.
 * @source A. Fabijan et al., "Diagnosing Sample Ratio Mismatch in Online Controlled Experiments", KDD 2019.
 * @example =ABTEST.SRM_PVALUE_BY_DAY({412,398,405;388,401,377}) returns {0.88604;0.87903}
 * @crosscheck The last value equals =ABTEST.SRM_PVALUE of the column totals, and =CHISQ.TEST of the totals against the expected counts.
 * @caution A p-value below about 0.001 on any day says the split is broken: find the cause before reading any result. Checking it every day also raises its own false alarms; a single tiny value matters more than a run of small ones.
 */
export function srmPValueByDay(visitors_by_day: any[][], planned_shares?: any[][]): any[][] {
  return runFunction(CATALOGUE.SRM_PVALUE_BY_DAY, { visitors_by_day, planned_shares }, (a) => {
    const shares = a.planned_shares;
    if (shares !== undefined && shares.length !== a.days.width) {
      throw new ArgumentProblem(
        `planned_shares: ${shares.length} shares were given for ${a.days.width} variants (the columns of visitors_by_day); give one share per column`,
      );
    }
    return byDay.srmPValueByDay(a.dayColumns.visitors_by_day, shares);
  });
}
