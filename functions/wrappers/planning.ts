/**
 * The worksheet functions of the family "planning": decision power, sizes, the smallest detectable lift
 * and the threshold for many variants.
 *
 * Each wrapper is one runFunction call: its catalogue entry (functions/catalogue.ts) says how to read the
 * arguments and how the result spills; the body only calls the statistics core. The JSDoc is the one home
 * of each function's words: custom-functions-metadata turns the description and @param lines into
 * Excel's formula help, and help/build.js turns all of it (with @returns, @method, @source, @example,
 * @crosscheck and @caution) into the help pages and the side panel's texts. An @example is an Excel formula
 * with array constants ({1;2} is a column) followed by "returns" and the result; test/addin/examples.test.ts
 * runs it through the wrapper.
 */
import { CATALOGUE } from '../catalogue';
import { runFunction } from '../sheet';
import * as planning from '../stats/planning';
import { smallestDetectableLift as detectableLift } from '../stats/detectableLift';
import { thresholdForVariants as variantsThreshold } from '../stats/manyVariants';

/**
 * Chance that a two-variant test with this many visitors per variant ends with the challenger declared better (PROB_ABOVE_CONTROL at or above the threshold), if its true rate is baseline × (1 + lift). With lift 0 it is the false-alarm rate.
 * @customfunction DECISION_POWER
 * @helpurl https://localhost:3000/help/DECISION_POWER.html
 * @param baseline_rate The control's conversion rate, 0.000001 to 0.999999.
 * @param lift The challenger's true relative lift, as a fraction from -0.99 to 1 (0.1 is +10%).
 * @param visitors_per_variant Visitors in each of the two variants (whole number, at least 1 and at most 1E+10).
 * @param [threshold] PROB_ABOVE_CONTROL needed to declare a winner, 0.01 to 0.9999 (optional; default 0.95).
 * @param [prior_alpha] Prior alpha used in the read-out, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta used in the read-out, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns A probability between 0 and 1.
 * @method Exact sum over the binomial outcomes of both variants of the probability that the Beta posterior read-out reaches the threshold (no simulation).
 * @source Bayesian assurance of a decision rule: A. O'Hagan and J. W. Stevens, "Bayesian assessment of sample size for clinical trials of cost-effectiveness", Medical Decision Making 21 (2001).
 * @example =ABTEST.DECISION_POWER(0.1, 0.2, 1000) returns 0.41309
 * @caution The chance holds for one look at the end. Looking every day and stopping at the first win raises the false-alarm rate well above DECISION_POWER(baseline, 0, n).
 */
export function decisionPower(
  baseline_rate: number,
  lift: number,
  visitors_per_variant: number,
  threshold?: number,
  prior_alpha?: number,
  prior_beta?: number,
): number {
  return runFunction(
    CATALOGUE.DECISION_POWER,
    { baseline_rate, lift, visitors_per_variant, threshold, prior_alpha, prior_beta },
    (a) => planning.decisionPower(a.baseline_rate, a.lift, a.visitors_per_variant, a.threshold, a.prior),
  );
}

/**
 * Smallest number of visitors per variant for which DECISION_POWER reaches the power you want.
 * @customfunction VISITORS_NEEDED
 * @helpurl https://localhost:3000/help/VISITORS_NEEDED.html
 * @param baseline_rate The control's conversion rate, 0.000001 to 0.999999.
 * @param lift The smallest relative lift you want to detect, as a fraction from -0.99 to 1, not 0 (0.1 is +10%).
 * @param [threshold] PROB_ABOVE_CONTROL needed to declare a winner, 0.01 to 0.9999 (optional; default 0.95).
 * @param [power] Chance of declaring the winner you want, 0.01 to 0.9999 (optional; default 0.8).
 * @param [prior_alpha] Prior alpha used in the read-out, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta used in the read-out, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns Visitors per variant (a whole number), at most 1E+9; #N/A when a test would need more (plan for a larger lift, a lower threshold or a lower power).
 * @method Search over whole numbers of visitors for the first one whose exact DECISION_POWER reaches power.
 * @source Bayesian assurance of a decision rule: A. O'Hagan and J. W. Stevens, Medical Decision Making 21 (2001).
 * @example =ABTEST.VISITORS_NEEDED(0.1, 0.2) returns 3024
 * @crosscheck Compare with =ABTEST.CLASSIC_SAMPLE_SIZE(0.1, 0.2, 0.1, 0.8, 1), the one-sided z-test size at a similar error rate.
 * @caution The plan holds if you look once at the end; stopping early on a good day breaks it.
 */
export function visitorsNeeded(
  baseline_rate: number,
  lift: number,
  threshold?: number,
  power?: number,
  prior_alpha?: number,
  prior_beta?: number,
): number {
  return runFunction(
    CATALOGUE.VISITORS_NEEDED,
    { baseline_rate, lift, threshold, power, prior_alpha, prior_beta },
    (a) => planning.visitorsNeeded(a.baseline_rate, a.lift, a.threshold, a.power, a.prior),
  );
}

/**
 * Visitors per variant for the classic two-proportion z-test, for comparison with textbook plans.
 * @customfunction CLASSIC_SAMPLE_SIZE
 * @helpurl https://localhost:3000/help/CLASSIC_SAMPLE_SIZE.html
 * @param baseline_rate The control's conversion rate, 0.000001 to 0.999999.
 * @param lift The smallest relative lift you want to detect, as a fraction from -0.99 to 1, not 0 (0.1 is +10%).
 * @param [alpha] Significance level, 0.0001 to 0.5 (optional; default 0.05).
 * @param [power] Chance of detecting the lift, 0.01 to 0.9999 (optional; default 0.8).
 * @param [sides] 1 for a one-sided test, 2 for two-sided (optional; default 2).
 * @returns Visitors per variant, rounded up to a whole number.
 * @method n = (z_(1−alpha/sides) √(2 p̄(1 − p̄)) + z_power √(p1(1 − p1) + p2(1 − p2)))² / (p2 − p1)², with the pooled rate p̄ under the null and no continuity correction, rounded up.
 * @source J. L. Fleiss, B. Levin and M. C. Paik, Statistical Methods for Rates and Proportions, 3rd ed. (2003), §4.2; agrees with R's power.prop.test.
 * @example =ABTEST.CLASSIC_SAMPLE_SIZE(0.1, 0.5) returns 686
 * @crosscheck =ROUNDUP((NORM.S.INV(1-0.05/2)*SQRT(2*pbar*(1-pbar))+NORM.S.INV(0.8)*SQRT(p1*(1-p1)+p2*(1-p2)))^2/(p2-p1)^2, 0) with p1 the baseline, p2 = p1*(1+lift), pbar = (p1+p2)/2.
 */
export function classicSampleSize(
  baseline_rate: number,
  lift: number,
  alpha?: number,
  power?: number,
  sides?: number,
): number {
  return runFunction(CATALOGUE.CLASSIC_SAMPLE_SIZE, { baseline_rate, lift, alpha, power, sides }, (a) =>
    planning.classicSampleSize(a.baseline_rate, a.lift, a.alpha, a.power, a.sides === 1 ? 1 : 2),
  );
}

/**
 * The smallest relative lift a test of this size detects with the power you want: the fixed-budget question ("what can we detect in four weeks?").
 * @customfunction SMALLEST_DETECTABLE_LIFT
 * @helpurl https://localhost:3000/help/SMALLEST_DETECTABLE_LIFT.html
 * @param baseline_rate The control's conversion rate, 0.000001 to 0.999999.
 * @param visitors_per_variant Visitors in each of the two variants (whole number, at least 1 and at most 1000000000).
 * @param [threshold] PROB_ABOVE_CONTROL needed to declare a winner, greater than 0.5 and at most 0.999999 (optional; default 0.95).
 * @param [power] Chance of declaring the winner, 0.01 to 0.9999 (optional; default 0.8).
 * @param [prior_alpha] Prior alpha used in the read-out, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta used in the read-out, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns A relative lift (0.2 is +20%).
 * @method The lift at which DECISION_POWER at exactly this size equals power (decision power rises strictly with the lift, so there is one): the read-out's declaring outcomes are found once, then the power at a lift is a sum over the challenger's binomial outcomes, solved by Brent's method to about 1e-10.
 * @source Bayesian assurance of a decision rule: A. O'Hagan and J. W. Stevens, Medical Decision Making 21 (2001); the inverse of DECISION_POWER.
 * @example =ABTEST.SMALLEST_DETECTABLE_LIFT(0.1, 3000) returns 0.20072
 * @crosscheck =ABTEST.DECISION_POWER(baseline_rate, result, visitors_per_variant, threshold) returns power.
 * @caution Decision power is slightly saw-toothed in the number of visitors (the outcomes are whole numbers), so a test a few visitors larger can need a marginally larger lift. The answer holds for one look at the end: with daily looks use POWER_WITH_LOOKS at the threshold from THRESHOLD_FOR_LOOKS.
 */
export function smallestDetectableLift(
  baseline_rate: number,
  visitors_per_variant: number,
  threshold?: number,
  power?: number,
  prior_alpha?: number,
  prior_beta?: number,
): number {
  return runFunction(
    CATALOGUE.SMALLEST_DETECTABLE_LIFT,
    { baseline_rate, visitors_per_variant, threshold, power, prior_alpha, prior_beta },
    (a) => detectableLift(a.baseline_rate, a.visitors_per_variant, a.threshold, a.power, a.prior),
  );
}

/**
 * The PROB_ABOVE_CONTROL threshold each challenger must reach so that, with no true difference, the chance of declaring any of them is false_alarm.
 * @customfunction THRESHOLD_FOR_VARIANTS
 * @helpurl https://localhost:3000/help/THRESHOLD_FOR_VARIANTS.html
 * @param variants The number of variants, the control included (whole number, at least 2 and at most 50).
 * @param [false_alarm] The chance of any false declaration to keep, at least 0.000001 and at most 0.5 (optional; default 0.05).
 * @returns A threshold between 0.5 and 1; with 2 variants it is 1 − false_alarm.
 * @method Dunnett's one-sided many-to-one comparison with a shared control, equal sizes, in the large-sample limit: Φ(c) with P(max Z_i ≥ c) = false_alarm for variants − 1 normal statistics of correlation ½, solved by Brent's method with a 640-point quadrature.
 * @source C. W. Dunnett, "A multiple comparison procedure for comparing several treatments with a control", Journal of the American Statistical Association 50 (1955).
 * @example =ABTEST.THRESHOLD_FOR_VARIANTS(3) returns 0.97234
 * @crosscheck =NORM.S.INV(result) gives Dunnett's critical value: 1.645, 1.92, 2.06, 2.16 for 2, 3, 4, 5 variants at 0.05.
 * @caution Holds for one look at the end and equal traffic per variant; with few visitors or uneven traffic it is an approximation. Looking often as well needs both corrections (THRESHOLD_FOR_LOOKS too).
 */
export function thresholdForVariants(variants: number, false_alarm?: number): number {
  return runFunction(CATALOGUE.THRESHOLD_FOR_VARIANTS, { variants, false_alarm }, (a) =>
    variantsThreshold(a.variants, a.false_alarm),
  );
}
