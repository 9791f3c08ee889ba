/* eslint-disable @typescript-eslint/no-explicit-any -- Excel passes ranges as any[][] (blanks must stay blank) */
/**
 * The worksheet functions of the family "means": the Normal model from COUNT, AVERAGE and STDEV.S per variant.
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
import { amountDecisionCell, intervalRows, medianRows, runFunction } from '../sheet';
import * as normalMeans from '../stats/normalMeans';

/**
 * Credible interval for each variant's true average (e.g. revenue per visitor), from the count, average and standard deviation of its values. Spills lower and upper bound per variant.
 * @customfunction MEAN_INTERVAL
 * @helpurl https://localhost:3000/help/MEAN_INTERVAL.html
 * @param count Number of values of each variant, as COUNT gives (whole numbers, 2 or more; the first is the control).
 * @param mean Average of each variant, as AVERAGE gives (−1E+12 to 1E+12), same shape as count.
 * @param sd Standard deviation of each variant, as STDEV.S gives (0, or 1E-6 to 1E+12), same shape as count.
 * @param [level] Probability the interval holds, 0.01 to 0.9999 (optional; default 0.95).
 * @returns Lower and upper bound of each variant's average.
 * @method With the reference prior p(μ, σ²) ∝ 1/σ², the mean's posterior is Student t with count − 1 degrees of freedom, centre mean and scale sd/√count; the interval is its central quantiles.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §3.2.
 * @example =ABTEST.MEAN_INTERVAL({1200;1180}, {3.10;3.42}, {9.8;10.4}) returns {2.5450,3.6550;2.8260,4.0140}
 * @crosscheck =mean - T.INV(0.975, count-1)*sd/SQRT(count) and =mean + T.INV(0.975, count-1)*sd/SQRT(count), the same numbers as the classic t interval.
 * @caution Revenue is skewed: a few large orders move the average. With small counts the t model can be optimistic; prefer larger samples.
 */
export function meanInterval(count: any[][], mean: any[][], sd: any[][], level?: number): any[][] {
  return runFunction(CATALOGUE.MEAN_INTERVAL, { count, mean, sd, level }, (a) =>
    intervalRows(normalMeans.meanInterval(a.variants, a.level)),
  );
}

/**
 * Probability that each variant has the highest true average (e.g. revenue per visitor). The values add up to 1.
 * @customfunction MEAN_PROB_HIGHEST
 * @helpurl https://localhost:3000/help/MEAN_PROB_HIGHEST.html
 * @param count Number of values of each variant, as COUNT gives (2 to 50 variants; whole numbers, 2 or more).
 * @param mean Average of each variant, as AVERAGE gives (−1E+12 to 1E+12), same shape as count.
 * @param sd Standard deviation of each variant, as STDEV.S gives (0, or 1E-6 to 1E+12), same shape as count.
 * @returns For each variant, the probability (0 to 1) that its average is the highest.
 * @method P(i highest) = ∫ f_i · Π F_j (the product over every other variant j) over the Student t posteriors, by quadrature.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §3.2 (posterior of a normal mean).
 * @example =ABTEST.MEAN_PROB_HIGHEST({1200;1180}, {3.10;3.42}, {9.8;10.4}) returns {0.22011;0.77989}
 * @caution With many variants the best-looking one is often lucky; decide the number of variants in advance.
 * @caution Averages such as revenue are pulled by a few large values; check for outliers before reading the result.
 */
export function meanProbHighest(count: any[][], mean: any[][], sd: any[][]): any[][] {
  return runFunction(CATALOGUE.MEAN_PROB_HIGHEST, { count, mean, sd }, (a) => normalMeans.meanProbHighest(a.variants));
}

/**
 * Probability that each challenger's true average beats the control's (the first variant). Spills one value per variant, with an empty cell in the control's place.
 * @customfunction MEAN_PROB_ABOVE_CONTROL
 * @helpurl https://localhost:3000/help/MEAN_PROB_ABOVE_CONTROL.html
 * @param count Number of values of each variant, as COUNT gives (2 to 50 variants; whole numbers, 2 or more).
 * @param mean Average of each variant, as AVERAGE gives (−1E+12 to 1E+12), same shape as count.
 * @param sd Standard deviation of each variant, as STDEV.S gives (0, or 1E-6 to 1E+12), same shape as count.
 * @returns For each challenger, P(its average > the control's average); empty text for the control.
 * @method P(B > A) = ∫ f_B F_A over the Student t posteriors, by quadrature.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §3.2.
 * @example =ABTEST.MEAN_PROB_ABOVE_CONTROL({1200;1180}, {3.10;3.42}, {9.8;10.4}) returns {"";0.77989}
 * @caution Stopping the first time this passes 95% (peeking) makes false wins more likely.
 * @caution Averages such as revenue are pulled by a few large values; check for outliers before reading the result.
 */
export function meanProbAboveControl(count: any[][], mean: any[][], sd: any[][]): any[][] {
  return runFunction(CATALOGUE.MEAN_PROB_ABOVE_CONTROL, { count, mean, sd }, (a) =>
    normalMeans.meanProbAboveControl(a.variants),
  );
}

/**
 * Credible interval for each challenger's difference in average from the control (average − control's average, in the metric's units). Spills lower, median and upper per challenger, with empty cells in the control's place.
 * @customfunction MEAN_DIFF_INTERVAL
 * @helpurl https://localhost:3000/help/MEAN_DIFF_INTERVAL.html
 * @param count Number of values of each variant, as COUNT gives (2 to 50 variants; whole numbers, 2 or more).
 * @param mean Average of each variant, as AVERAGE gives (−1E+12 to 1E+12), same shape as count.
 * @param sd Standard deviation of each variant, as STDEV.S gives (0, or 1E-6 to 1E+12), same shape as count.
 * @param [level] Probability the interval holds, 0.01 to 0.9999 (optional; default 0.95).
 * @returns Lower, median and upper difference of each challenger.
 * @method Quantiles of the difference of two independent Student t posteriors (the Behrens–Fisher problem), P(B − A ≤ d) = ∫ f_A(x) F_B(x + d) dx, inverted by Brent's method.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §3.2 and exercise 3.3 (difference of two normal means).
 * @example =ABTEST.MEAN_DIFF_INTERVAL({1200;1180}, {3.10;3.42}, {9.8;10.4}) returns {"","","";-0.49289,0.32000,1.13289}
 * @caution Averages such as revenue are pulled by a few large values; check for outliers before reading the result.
 */
export function meanDiffInterval(count: any[][], mean: any[][], sd: any[][], level?: number): any[][] {
  return runFunction(CATALOGUE.MEAN_DIFF_INTERVAL, { count, mean, sd, level }, (a) =>
    medianRows(normalMeans.meanDiffInterval(a.variants, a.level)),
  );
}

/**
 * Credible interval for each challenger's relative lift in average over the control (average ÷ control's average − 1). Spills lower, median and upper per challenger, with empty cells in the control's place.
 * @customfunction MEAN_LIFT_INTERVAL
 * @helpurl https://localhost:3000/help/MEAN_LIFT_INTERVAL.html
 * @param count Number of values of each variant, as COUNT gives (2 to 50 variants; whole numbers, 2 or more).
 * @param mean Average of each variant, as AVERAGE gives (−1E+12 to 1E+12), same shape as count.
 * @param sd Standard deviation of each variant, as STDEV.S gives (0, or 1E-6 to 1E+12), same shape as count.
 * @param [level] Probability the interval holds, 0.01 to 0.9999 (optional; default 0.95).
 * @returns Lower, median and upper relative lift of each challenger; an error naming the control if its average could plausibly be 0 or less.
 * @method Quantiles of the ratio B/A − 1 of independent Student t posteriors, P(B/A − 1 ≤ r) = ∫ f_A(x) F_B((1 + r)x) dx over A > 0.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §3.2; ratio distribution by its product-integral definition (common practice).
 * @example =ABTEST.MEAN_LIFT_INTERVAL({1200;1180}, {3.10;3.42}, {9.8;10.4}) returns {"","","";-0.14231,0.10323,0.42182}
 * @caution Averages such as revenue are pulled by a few large values; check for outliers before reading the result.
 */
export function meanLiftInterval(count: any[][], mean: any[][], sd: any[][], level?: number): any[][] {
  return runFunction(CATALOGUE.MEAN_LIFT_INTERVAL, { count, mean, sd, level }, (a) =>
    medianRows(normalMeans.meanLiftInterval(a.variants, a.level)),
  );
}

/**
 * Expected loss of choosing each variant for an average metric: how much of the average you give up on average by picking it. Small is good.
 * @customfunction MEAN_EXPECTED_LOSS
 * @helpurl https://localhost:3000/help/MEAN_EXPECTED_LOSS.html
 * @param count Number of values of each variant, as COUNT gives (2 to 50 variants; whole numbers, 2 or more).
 * @param mean Average of each variant, as AVERAGE gives (−1E+12 to 1E+12), same shape as count.
 * @param sd Standard deviation of each variant, as STDEV.S gives (0, or 1E-6 to 1E+12), same shape as count.
 * @returns For each variant, E[highest average − its average], in the metric's units.
 * @method E[max_j μ_j] − E[μ_i] over the Student t posteriors, with E[max] by quadrature.
 * @source C. Stucchio, "Bayesian A/B Testing at VWO" (2015), expected loss; Gelman et al., BDA3 §3.2 for the posterior.
 * @example =ABTEST.MEAN_EXPECTED_LOSS({1200;1180}, {3.10;3.42}, {9.8;10.4}) returns {0.37239;0.052388}
 * @caution Averages such as revenue are pulled by a few large values; check for outliers before reading the result.
 */
export function meanExpectedLoss(count: any[][], mean: any[][], sd: any[][]): any[][] {
  return runFunction(CATALOGUE.MEAN_EXPECTED_LOSS, { count, mean, sd }, (a) =>
    normalMeans.meanExpectedLoss(a.variants),
  );
}

/**
 * Probability that each challenger's true average is more than min_lift above the control's; a negative min_lift asks "no worse than" (−0.02: at most 2% lower). Spills one value per variant, with an empty cell in the control's place.
 * @customfunction MEAN_PROB_LIFT_ABOVE
 * @helpurl https://localhost:3000/help/MEAN_PROB_LIFT_ABOVE.html
 * @param count Number of values of each variant, as COUNT gives (2 to 50 variants; whole numbers, 2 or more).
 * @param mean Average of each variant, as AVERAGE gives, same shape as count.
 * @param sd Standard deviation of each variant, as STDEV.S gives (0 or more), same shape as count.
 * @param min_lift The relative lift to beat, as a fraction greater than -1 and at most 1 (0.05 is 5% above the control's average; −0.02 asks "no worse than 2% lower").
 * @returns For each challenger, P(its average / the control's average − 1 > min_lift); empty text for the control.
 * @method The ratio of the Student t posteriors (the control's small chance of a negative mean kept exactly), by quadrature; the smaller tail is computed directly. #N/A when the control's mean could plausibly be zero or negative (chance above 1e-6), as for the lift interval of averages.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §3.2; checked against scipy quadrature (the lift-above reference script in test/reference).
 * @example =ABTEST.MEAN_PROB_LIFT_ABOVE({1200;1180}, {3.10;3.42}, {9.8;10.4}, -0.02) returns {"";0.82380}
 * @caution A guardrail read this way ("no worse than −2%") is only as good as the traffic split; check SRM_PVALUE.
 * @caution Averages such as revenue are pulled by a few large values; check for outliers before reading the result.
 */
export function meanProbLiftAbove(count: any[][], mean: any[][], sd: any[][], min_lift: number): any[][] {
  return runFunction(CATALOGUE.MEAN_PROB_LIFT_ABOVE, { count, mean, sd, min_lift }, (a) =>
    normalMeans.meanProbLiftAbove(a.variants, a.min_lift),
  );
}

/**
 * A one-cell verdict in plain words on averages: which variant to choose when its expected loss is small enough, or that more data is needed.
 * @customfunction MEAN_DECISION
 * @helpurl https://localhost:3000/help/MEAN_DECISION.html
 * @param count Number of values of each variant, as COUNT gives (2 to 50 variants; whole numbers, 3 or more for a finite loss).
 * @param mean Average of each variant, as AVERAGE gives, same shape as count.
 * @param sd Standard deviation of each variant, as STDEV.S gives (0 or more), same shape as count.
 * @param [max_loss] The largest expected loss you accept, in the metric's own units, 0 to 1E+12 (optional; default 1% of the control's average).
 * @param [labels] Names of the variants, same shape as count (optional; default A, B, C… by position).
 * @returns One text cell: the variant to choose, or that more data is needed, naming the leader and its expected loss in the metric's units.
 * @method DECISION's rule on averages: the variant with the smallest expected loss is chosen when that loss is at most the largest acceptable loss; otherwise the text names the current leader and its loss.
 * @source Expected-loss stopping rule: C. Stucchio, "Bayesian A/B Testing at VWO" (2015).
 * @example =ABTEST.MEAN_DECISION({1200;1180}, {3.10;3.42}, {9.8;10.4}) returns "Keep collecting data: B leads, but its expected loss 0.052 in the metric's units is above the 0.031 in the metric's units allowed"
 * @caution This is a decision aid, not a guarantee. A broken traffic split (check SRM_PVALUE), peeking every day, or a few extreme values can all mislead it. For regulated or health-related decisions, ask a qualified statistician and follow local rules.
 */
export function meanDecision(count: any[][], mean: any[][], sd: any[][], max_loss?: number, labels?: any[][]): string {
  return runFunction(CATALOGUE.MEAN_DECISION, { count, mean, sd, max_loss, labels }, (a) =>
    amountDecisionCell(a.table, a.labels, normalMeans.meanDecide(a.variants, a.max_loss), "in the metric's units"),
  );
}
