/* eslint-disable @typescript-eslint/no-explicit-any -- Excel passes ranges as any[][] (blanks must stay blank) */
/**
 * The worksheet functions of the family "conversion": conversions out of visitors per variant.
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
import { POSTERIOR_TABLES } from '../posteriorTables';
import { decisionCell, intervalRows, medianRows, runFunction } from '../sheet';
import * as conversion from '../stats/conversion';

/**
 * Posterior mean conversion rate of each variant: the rate you should expect after seeing the data. Spills one value per variant, in the same direction as your data.
 * @customfunction POSTERIOR_MEAN
 * @helpurl https://localhost:3000/help/POSTERIOR_MEAN.html
 * @param conversions Conversions of each variant (a row or a column of whole numbers; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [prior_alpha] Prior alpha, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns The posterior mean rate of each variant, as a fraction (0.05 is 5%).
 * @method Beta–Binomial conjugate update: the posterior is Beta(alpha + conversions, beta + visitors − conversions), whose mean is (alpha + conversions) / (alpha + beta + visitors).
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §2.4.
 * @example =ABTEST.POSTERIOR_MEAN({120;150}, {2400;2380}) returns {0.050375;0.063392}
 * @crosscheck =(1+C2)/(2+B2) for conversions in C2 and visitors in B2 with the default prior; in general =(alpha+C2)/(alpha+beta+B2).
 */
export function posteriorMean(
  conversions: any[][],
  visitors: any[][],
  prior_alpha?: number,
  prior_beta?: number,
): any[][] {
  return runFunction(CATALOGUE.POSTERIOR_MEAN, { conversions, visitors, prior_alpha, prior_beta }, (a) =>
    conversion.posteriorMean(a.variants, a.prior),
  );
}

/**
 * Credible interval for each variant's conversion rate: the range that holds the true rate with the chosen probability. Spills lower and upper bound per variant (one row per variant for a column of data).
 * @customfunction RATE_INTERVAL
 * @helpurl https://localhost:3000/help/RATE_INTERVAL.html
 * @param conversions Conversions of each variant (a row or a column of whole numbers; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [level] Probability the interval holds, 0.01 to 0.9999 (optional; default 0.95).
 * @param [prior_alpha] Prior alpha, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @param [method] "central" for equal tails or "hdi" for the narrowest (highest-density) interval (optional; default "central").
 * @returns Lower and upper bound of the interval for each variant, as fractions.
 * @method Quantiles of the Beta posterior. "central" puts (1 − level)/2 in each tail; "hdi" is the shortest interval with the given probability, where the density is equal at both ends.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §2.3; highest-density interval: J. K. Kruschke, Doing Bayesian Data Analysis, 2nd ed. (2015), §4.3.4.
 * @example =ABTEST.RATE_INTERVAL({120;150}, {2400;2380}) returns {0.041990,0.059468;0.053961,0.073517}
 * @crosscheck Central interval: =BETA.INV(0.025, 1+C2, 1+B2-C2) and =BETA.INV(0.975, 1+C2, 1+B2-C2) (Excel's BETA.INV loses accuracy for very large counts).
 */
export function rateInterval(
  conversions: any[][],
  visitors: any[][],
  level?: number,
  prior_alpha?: number,
  prior_beta?: number,
  method?: string,
): any[][] {
  return runFunction(CATALOGUE.RATE_INTERVAL, { conversions, visitors, level, prior_alpha, prior_beta, method }, (a) =>
    intervalRows(conversion.rateInterval(a.variants, a.level, a.prior, a.method, POSTERIOR_TABLES)),
  );
}

/**
 * Probability that each variant has the highest true conversion rate. The values add up to 1. Spills one value per variant.
 * @customfunction PROB_HIGHEST
 * @helpurl https://localhost:3000/help/PROB_HIGHEST.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [prior_alpha] Prior alpha, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns For each variant, the probability (0 to 1) that its rate is the highest.
 * @method P(variant i is highest) = ∫ f_i(x) · Π F_j(x) dx (the product over every other variant j) over the Beta posteriors, computed deterministically by Gauss–Legendre quadrature (no simulation).
 * @source Closed form for two variants: E. Miller, "Formulas for Bayesian A/B Testing" (2015); the integral is the definition of the probability.
 * @example =ABTEST.PROB_HIGHEST({120;150}, {2400;2380}) returns {0.025678;0.974322}
 * @caution With many variants the best-looking one is often lucky: expect its lead to shrink on new data. Decide the number of variants before the test starts.
 */
export function probHighest(
  conversions: any[][],
  visitors: any[][],
  prior_alpha?: number,
  prior_beta?: number,
): any[][] {
  return runFunction(CATALOGUE.PROB_HIGHEST, { conversions, visitors, prior_alpha, prior_beta }, (a) =>
    conversion.probHighest(a.variants, a.prior, POSTERIOR_TABLES),
  );
}

/**
 * Probability that each challenger's true conversion rate beats the control's (the first variant). Spills one value per variant, with an empty cell in the control's place.
 * @customfunction PROB_ABOVE_CONTROL
 * @helpurl https://localhost:3000/help/PROB_ABOVE_CONTROL.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [prior_alpha] Prior alpha, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns For each challenger, P(its rate > the control's rate); empty text for the control.
 * @method P(B > A) for the Beta posteriors: Evan Miller's exact sum when a posterior parameter is a whole number and the sum is short (the default prior, up to tens of thousands of visitors), otherwise the integral ∫ f_B(x) F_A(x) dx by quadrature, with the smaller of P(B > A) and P(A > B) computed directly so tiny probabilities keep their digits.
 * @source E. Miller, "Formulas for Bayesian A/B Testing" (2015), closed form for whole-number parameters.
 * @example =ABTEST.PROB_ABOVE_CONTROL({120;150}, {2400;2380}) returns {"";0.974322}
 * @caution Checking this value every day and stopping the first time it passes 95% makes false wins much more likely (peeking). Fix the sample size or the decision rule in advance.
 */
export function probAboveControl(
  conversions: any[][],
  visitors: any[][],
  prior_alpha?: number,
  prior_beta?: number,
): any[][] {
  return runFunction(CATALOGUE.PROB_ABOVE_CONTROL, { conversions, visitors, prior_alpha, prior_beta }, (a) =>
    conversion.probAboveControl(a.variants, a.prior, POSTERIOR_TABLES),
  );
}

/**
 * Credible interval for each challenger's relative lift over the control (rate ÷ control's rate − 1; 0.1 is +10%). Spills lower, median and upper per challenger, with empty cells in the control's place.
 * @customfunction LIFT_INTERVAL
 * @helpurl https://localhost:3000/help/LIFT_INTERVAL.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [level] Probability the interval holds, 0.01 to 0.9999 (optional; default 0.95).
 * @param [prior_alpha] Prior alpha, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns Lower, median and upper relative lift of each challenger, as fractions.
 * @method Quantiles of the ratio of two independent Beta posteriors: P(B/A − 1 ≤ r) = ∫ f_A(x) F_B((1 + r)x) dx, inverted by Brent's method.
 * @source Distribution of a ratio of independent variables: the product-integral definition (common practice); Beta posteriors as in Gelman et al., Bayesian Data Analysis, 3rd ed., §2.4.
 * @example =ABTEST.LIFT_INTERVAL({120;150}, {2400;2380}) returns {"","","";-0.00135,0.25908,0.59100}
 * @caution A wide interval means the data cannot yet tell a small lift from a large one; the median alone overstates what you know.
 */
export function liftInterval(
  conversions: any[][],
  visitors: any[][],
  level?: number,
  prior_alpha?: number,
  prior_beta?: number,
): any[][] {
  return runFunction(CATALOGUE.LIFT_INTERVAL, { conversions, visitors, level, prior_alpha, prior_beta }, (a) =>
    medianRows(conversion.liftInterval(a.variants, a.level, a.prior, POSTERIOR_TABLES)),
  );
}

/**
 * Credible interval for each challenger's absolute difference in conversion rate (rate − control's rate; 0.004 is 0.4 percentage points). Spills lower, median and upper per challenger, with empty cells in the control's place.
 * @customfunction RATE_DIFF_INTERVAL
 * @helpurl https://localhost:3000/help/RATE_DIFF_INTERVAL.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [level] Probability the interval holds, 0.01 to 0.9999 (optional; default 0.95).
 * @param [prior_alpha] Prior alpha, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns Lower, median and upper difference of each challenger, in rate units.
 * @method Quantiles of the difference of two independent Beta posteriors: P(B − A ≤ d) = ∫ f_A(x) F_B(x + d) dx, inverted by Brent's method.
 * @source Convolution of independent variables (common practice); Beta posteriors as in Gelman et al., Bayesian Data Analysis, 3rd ed., §2.4.
 * @example =ABTEST.RATE_DIFF_INTERVAL({120;150}, {2400;2380}) returns {"","","";-0.0000767,0.013005,0.026183}
 */
export function rateDiffInterval(
  conversions: any[][],
  visitors: any[][],
  level?: number,
  prior_alpha?: number,
  prior_beta?: number,
): any[][] {
  return runFunction(CATALOGUE.RATE_DIFF_INTERVAL, { conversions, visitors, level, prior_alpha, prior_beta }, (a) =>
    medianRows(conversion.rateDiffInterval(a.variants, a.level, a.prior, POSTERIOR_TABLES)),
  );
}

/**
 * Probability that each challenger's relative lift over the control is above a minimum you choose (0.02 asks "at least +2%"; -0.01 asks "no worse than −1%"). Spills one value per variant, with an empty cell in the control's place.
 * @customfunction PROB_LIFT_ABOVE
 * @helpurl https://localhost:3000/help/PROB_LIFT_ABOVE.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param min_lift The smallest relative lift that matters to you, as a fraction greater than -1 and at most 1 (required; 0.05 is +5%).
 * @param [prior_alpha] Prior alpha, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns For each challenger, P(rate ÷ control's rate − 1 > min_lift); empty text for the control.
 * @method P(B/A − 1 > m) = ∫ f_A(x) (1 − F_B((1 + m)x)) dx for the Beta posteriors, by quadrature.
 * @source Region of practical equivalence reasoning: J. K. Kruschke, Doing Bayesian Data Analysis, 2nd ed. (2015), §12.1.
 * @example =ABTEST.PROB_LIFT_ABOVE({120;150}, {2400;2380}, 0.05) returns {"";0.93761}
 */
export function probLiftAbove(
  conversions: any[][],
  visitors: any[][],
  min_lift: number,
  prior_alpha?: number,
  prior_beta?: number,
): any[][] {
  return runFunction(CATALOGUE.PROB_LIFT_ABOVE, { conversions, visitors, min_lift, prior_alpha, prior_beta }, (a) =>
    conversion.probLiftAbove(a.variants, a.min_lift, a.prior, POSTERIOR_TABLES),
  );
}

/**
 * Expected loss of choosing each variant: the conversion rate you give up on average by picking it, if another variant is truly better. Small is good. Spills one value per variant.
 * @customfunction EXPECTED_LOSS
 * @helpurl https://localhost:3000/help/EXPECTED_LOSS.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [prior_alpha] Prior alpha, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns For each variant, E[highest rate − its rate], in rate units (0.001 is 0.1 percentage points).
 * @method Expected loss = E[max_j p_j] − E[p_i], with E[max] = ∫ (1 − Π F_j(x)) dx (the product over all variants) over the Beta posteriors, by quadrature.
 * @source C. Stucchio, "Bayesian A/B Testing at VWO" (2015), expected-loss decision rule.
 * @example =ABTEST.EXPECTED_LOSS({120;150}, {2400;2380}) returns {0.013083;0.00006524}
 * @caution The loss depends on the prior when data are few; check that a reasonable other prior gives the same choice.
 */
export function expectedLoss(
  conversions: any[][],
  visitors: any[][],
  prior_alpha?: number,
  prior_beta?: number,
): any[][] {
  return runFunction(CATALOGUE.EXPECTED_LOSS, { conversions, visitors, prior_alpha, prior_beta }, (a) =>
    conversion.expectedLoss(a.variants, a.prior, POSTERIOR_TABLES),
  );
}

/**
 * A one-cell verdict in plain words: which variant to choose when its expected loss is small enough, or that more data is needed.
 * @customfunction DECISION
 * @helpurl https://localhost:3000/help/DECISION.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [max_loss] The largest expected loss you accept, as a rate of 0 or more and less than 1 (optional; default 1% of the control's posterior mean rate).
 * @param [labels] Names of the variants, same shape as conversions (optional; default A, B, C… by position).
 * @param [prior_alpha] Prior alpha, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns One text cell: the variant to choose, or that more data is needed, naming the leader and its expected loss.
 * @method The variant with the smallest expected loss is chosen when that loss is at most max_loss; otherwise the text names the current leader and its loss.
 * @source Expected-loss stopping rule: C. Stucchio, "Bayesian A/B Testing at VWO" (2015).
 * @example =ABTEST.DECISION({120;150}, {2400;2380}) returns "Choose B: its expected loss 0.0065% is within the 0.050% allowed"
 * @caution This is a decision aid, not a guarantee. A broken traffic split (check SRM_PVALUE), peeking every day, or a strong prior can all mislead it. For regulated or health-related decisions, ask a qualified statistician and follow local rules.
 */
export function decision(
  conversions: any[][],
  visitors: any[][],
  max_loss?: number,
  labels?: any[][],
  prior_alpha?: number,
  prior_beta?: number,
): string {
  return runFunction(CATALOGUE.DECISION, { conversions, visitors, max_loss, labels, prior_alpha, prior_beta }, (a) =>
    decisionCell(a.table, a.labels, conversion.decide(a.variants, a.max_loss, a.prior, POSTERIOR_TABLES)),
  );
}

/**
 * A table for charting the posterior distribution of each variant's conversion rate: a column of rates, then one density column per variant.
 * @customfunction POSTERIOR_DENSITY
 * @helpurl https://localhost:3000/help/POSTERIOR_DENSITY.html
 * @param conversions Conversions of each variant (a row or a column of whole numbers; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [points] Number of rows of the table, 2 to 1000 (optional; default 101).
 * @param [prior_alpha] Prior alpha, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns points rows: the rate grid in the first column, then the posterior density of each variant.
 * @method Beta posterior densities evaluated on an evenly spaced grid covering where any variant's posterior has visible mass.
 * @source Beta–Binomial conjugate posterior: Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §2.4.
 * @example =ABTEST.POSTERIOR_DENSITY({120;150}, {2400;2380}) spills 101 rows × 3 columns: rate, density of A, density of B; chart it as a line chart.
 * @crosscheck Each density value equals =BETA.DIST(rate, 1+C2, 1+B2-C2, FALSE) for the default prior.
 */
export function posteriorDensity(
  conversions: any[][],
  visitors: any[][],
  points?: number,
  prior_alpha?: number,
  prior_beta?: number,
): any[][] {
  return runFunction(CATALOGUE.POSTERIOR_DENSITY, { conversions, visitors, points, prior_alpha, prior_beta }, (a) =>
    conversion.posteriorDensityTable(a.variants, a.points, a.prior, POSTERIOR_TABLES),
  );
}

/**
 * A table for charting the distribution of each challenger's relative lift over the control: a column of lifts, then one density column per challenger.
 * @customfunction LIFT_DENSITY
 * @helpurl https://localhost:3000/help/LIFT_DENSITY.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [points] Number of rows of the table, 2 to 1000, and rows × challengers at most 5000 (optional; default 101, which fits 50 variants).
 * @param [prior_alpha] Prior alpha, 0.001 to 1E+6 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, 0.001 to 1E+6 (optional; default 1, give together with prior_alpha).
 * @returns points rows: the lift grid in the first column, then the density of each challenger's lift.
 * @method Density of the ratio B/A − 1 of independent Beta posteriors, g(r) = ∫ x f_A(x) f_B((1 + r)x) dx, by quadrature. The lifts are evenly spaced from the lowest to the highest challenger's 1% to 99% lift quantiles, each end kept within 3 interquartile ranges of the nearer quartile, so the long tail of a control with few conversions does not squeeze the chart into one spike.
 * @source Density of a ratio of independent variables (common practice); Beta posteriors as in Gelman et al., Bayesian Data Analysis, 3rd ed., §2.4.
 * @example =ABTEST.LIFT_DENSITY({120;150}, {2400;2380}) spills 101 rows × 2 columns: lift, density of B's lift.
 */
export function liftDensity(
  conversions: any[][],
  visitors: any[][],
  points?: number,
  prior_alpha?: number,
  prior_beta?: number,
): any[][] {
  return runFunction(CATALOGUE.LIFT_DENSITY, { conversions, visitors, points, prior_alpha, prior_beta }, (a) =>
    conversion.liftDensityTable(a.variants, a.points, a.prior, POSTERIOR_TABLES),
  );
}
