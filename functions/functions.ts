/* eslint-disable @typescript-eslint/no-explicit-any -- Excel passes ranges as any[][] (blanks must stay blank) */
/**
 * The worksheet functions of Lift Ledger (namespace ABTEST), as thin wrappers: each reads its arguments
 * through the sheet layer's declared rules, calls the statistics core, and shapes the spill.
 *
 * This file is the only one custom-functions-metadata reads: the JSDoc of each function becomes Excel's
 * formula help (description, @param), and the help pages (help/build.js) are generated from the same
 * comments, including the extra tags @method, @source, @example, @crosscheck and @caution.
 * An @example is an Excel formula with array constants ({1;2} is a column) followed by "returns" and the
 * result; test/addin/examples.test.ts runs every example through these wrappers.
 */
import * as conversion from './stats/conversion';
import * as eventRates from './stats/eventRates';
import * as normalMeans from './stats/normalMeans';
import * as planning from './stats/planning';
import * as prior from './stats/prior';
import { srmPValue } from './stats/srm';
import { TableMemo } from './stats/tableMemo';
import * as sheet from './sheet';
import { COMPARISON, ONE_OR_MORE, runSheet } from './sheet';

/**
 * The add-in's one piece of state: the conversion posteriors tabulated by recent calls, so that the
 * several functions of one read-out (interval, P(highest), lift, loss, decision on the same ranges) tabulate
 * each posterior once. A table from the memo gives bit-for-bit the values of a fresh one (stats/tableMemo.ts
 * and its tests); the memo is bounded (~25 MB) and lives as long as the shared runtime.
 */
const POSTERIOR_TABLES = new TableMemo();

/** Variant limits of PRIOR_FROM_HISTORY: at least three past results (one gives no spread, two nearly none), no comparison cap. */
const HISTORY = { min: 3, max: 100000, noun: 'past results' } as const;

// ---------------------------------------------------------------------------------------------------
// Conversion metrics (Beta–Binomial)

/**
 * Posterior mean conversion rate of each variant: the rate you should expect after seeing the data. Spills one value per variant, in the same direction as your data.
 * @customfunction POSTERIOR_MEAN
 * @helpurl https://localhost:3000/help/POSTERIOR_MEAN.html
 * @param conversions Conversions of each variant (a row or a column of whole numbers; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [prior_alpha] Prior alpha, greater than 0 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, greater than 0 (optional; default 1, give together with prior_alpha).
 * @returns The posterior mean rate of each variant, as a fraction (0.05 is 5%).
 * @method Beta–Binomial conjugate update: the posterior is Beta(alpha + conversions, beta + visitors − conversions), whose mean is (alpha + conversions) / (alpha + beta + visitors).
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §2.4.
 * @example =ABTEST.POSTERIOR_MEAN({120;150}, {2400;2380}) returns {0.050375;0.063392}
 * @crosscheck =(1+C2)/(2+B2) for conversions in C2 and visitors in B2 with the default prior; in general =(alpha+C2)/(alpha+beta+B2).
 */
export function posteriorMean(conversions: any[][], visitors: any[][], prior_alpha?: number, prior_beta?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readConversions(conversions, visitors, ONE_OR_MORE);
    return sheet.spillPerVariant(input.table, conversion.posteriorMean(input.variants, sheet.readBetaPrior(prior_alpha, prior_beta)));
  });
}

/**
 * Credible interval for each variant's conversion rate: the range that holds the true rate with the chosen probability. Spills lower and upper bound per variant (one row per variant for a column of data).
 * @customfunction RATE_INTERVAL
 * @helpurl https://localhost:3000/help/RATE_INTERVAL.html
 * @param conversions Conversions of each variant (a row or a column of whole numbers; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [level] Probability the interval holds, between 0 and 1 (optional; default 0.95).
 * @param [prior_alpha] Prior alpha, greater than 0 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, greater than 0 (optional; default 1, give together with prior_alpha).
 * @param [method] "central" for equal tails or "hdi" for the narrowest (highest-density) interval (optional; default "central").
 * @returns Lower and upper bound of the interval for each variant, as fractions.
 * @method Quantiles of the Beta posterior. "central" puts (1 − level)/2 in each tail; "hdi" is the shortest interval with the given probability, where the density is equal at both ends.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §2.3; highest-density interval: J. K. Kruschke, Doing Bayesian Data Analysis, 2nd ed. (2015), §4.3.4.
 * @example =ABTEST.RATE_INTERVAL({120;150}, {2400;2380}) returns {0.041990,0.059468;0.053961,0.073517}
 * @crosscheck Central interval: =BETA.INV(0.025, 1+C2, 1+B2-C2) and =BETA.INV(0.975, 1+C2, 1+B2-C2) (Excel's BETA.INV loses accuracy for very large counts).
 */
export function rateInterval(conversions: any[][], visitors: any[][], level?: number, prior_alpha?: number, prior_beta?: number, method?: string): any[][] {
  return runSheet(() => {
    const input = sheet.readConversions(conversions, visitors, ONE_OR_MORE);
    const found = conversion.rateInterval(input.variants, sheet.readOptionalNumber(sheet.LEVEL, level) as number, sheet.readBetaPrior(prior_alpha, prior_beta), sheet.readChoice(sheet.RATE_INTERVAL_METHOD, method), POSTERIOR_TABLES);
    return sheet.spillBlock(input.table, sheet.intervalRows(found), 2);
  });
}

/**
 * Probability that each variant has the highest true conversion rate. The values add up to 1. Spills one value per variant.
 * @customfunction PROB_HIGHEST
 * @helpurl https://localhost:3000/help/PROB_HIGHEST.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [prior_alpha] Prior alpha, greater than 0 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, greater than 0 (optional; default 1, give together with prior_alpha).
 * @returns For each variant, the probability (0 to 1) that its rate is the highest.
 * @method P(variant i is highest) = ∫ f_i(x) ∏_{j≠i} F_j(x) dx over the Beta posteriors, computed deterministically by Gauss–Legendre quadrature (no simulation).
 * @source Closed form for two variants: E. Miller, "Formulas for Bayesian A/B Testing" (2015); the integral is the definition of the probability.
 * @example =ABTEST.PROB_HIGHEST({120;150}, {2400;2380}) returns {0.025678;0.974322}
 * @caution With many variants the best-looking one is often lucky: expect its lead to shrink on new data. Decide the number of variants before the test starts.
 */
export function probHighest(conversions: any[][], visitors: any[][], prior_alpha?: number, prior_beta?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readConversions(conversions, visitors, COMPARISON);
    return sheet.spillPerVariant(input.table, conversion.probHighest(input.variants, sheet.readBetaPrior(prior_alpha, prior_beta), POSTERIOR_TABLES));
  });
}

/**
 * Probability that each challenger's true conversion rate beats the control's (the first variant). Spills one value per variant, with an empty cell in the control's place.
 * @customfunction PROB_ABOVE_CONTROL
 * @helpurl https://localhost:3000/help/PROB_ABOVE_CONTROL.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [prior_alpha] Prior alpha, greater than 0 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, greater than 0 (optional; default 1, give together with prior_alpha).
 * @returns For each challenger, P(its rate > the control's rate); empty text for the control.
 * @method P(B > A) for the Beta posteriors: Evan Miller's exact sum when a posterior parameter is a whole number and the sum is short (the default prior, up to tens of thousands of visitors), otherwise the integral ∫ f_B(x) F_A(x) dx by quadrature, with the smaller of P(B > A) and P(A > B) computed directly so tiny probabilities keep their digits.
 * @source E. Miller, "Formulas for Bayesian A/B Testing" (2015), closed form for whole-number parameters.
 * @example =ABTEST.PROB_ABOVE_CONTROL({120;150}, {2400;2380}) returns {"";0.974322}
 * @caution Checking this value every day and stopping the first time it passes 95% makes false wins much more likely (peeking). Fix the sample size or the decision rule in advance.
 */
export function probAboveControl(conversions: any[][], visitors: any[][], prior_alpha?: number, prior_beta?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readConversions(conversions, visitors, COMPARISON);
    return sheet.spillVersusControl(input.table, conversion.probAboveControl(input.variants, sheet.readBetaPrior(prior_alpha, prior_beta), POSTERIOR_TABLES));
  });
}

/**
 * Credible interval for each challenger's relative lift over the control (rate ÷ control's rate − 1; 0.1 is +10%). Spills lower, median and upper per challenger, with empty cells in the control's place.
 * @customfunction LIFT_INTERVAL
 * @helpurl https://localhost:3000/help/LIFT_INTERVAL.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [level] Probability the interval holds, between 0 and 1 (optional; default 0.95).
 * @param [prior_alpha] Prior alpha, greater than 0 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, greater than 0 (optional; default 1, give together with prior_alpha).
 * @returns Lower, median and upper relative lift of each challenger, as fractions.
 * @method Quantiles of the ratio of two independent Beta posteriors: P(B/A − 1 ≤ r) = ∫ f_A(x) F_B((1 + r)x) dx, inverted by Brent's method.
 * @source Distribution of a ratio of independent variables: the product-integral definition (common practice); Beta posteriors as in Gelman et al., Bayesian Data Analysis, 3rd ed., §2.4.
 * @example =ABTEST.LIFT_INTERVAL({120;150}, {2400;2380}) returns {"","","";-0.00135,0.25908,0.59100}
 * @caution A wide interval means the data cannot yet tell a small lift from a large one; the median alone overstates what you know.
 */
export function liftInterval(conversions: any[][], visitors: any[][], level?: number, prior_alpha?: number, prior_beta?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readConversions(conversions, visitors, COMPARISON);
    const found = conversion.liftInterval(input.variants, sheet.readOptionalNumber(sheet.LEVEL, level) as number, sheet.readBetaPrior(prior_alpha, prior_beta), POSTERIOR_TABLES);
    return sheet.spillBlockVersusControl(input.table, sheet.medianRows(found), 3);
  });
}

/**
 * Credible interval for each challenger's absolute difference in conversion rate (rate − control's rate; 0.004 is 0.4 percentage points). Spills lower, median and upper per challenger, with empty cells in the control's place.
 * @customfunction RATE_DIFF_INTERVAL
 * @helpurl https://localhost:3000/help/RATE_DIFF_INTERVAL.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [level] Probability the interval holds, between 0 and 1 (optional; default 0.95).
 * @param [prior_alpha] Prior alpha, greater than 0 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, greater than 0 (optional; default 1, give together with prior_alpha).
 * @returns Lower, median and upper difference of each challenger, in rate units.
 * @method Quantiles of the difference of two independent Beta posteriors: P(B − A ≤ d) = ∫ f_A(x) F_B(x + d) dx, inverted by Brent's method.
 * @source Convolution of independent variables (common practice); Beta posteriors as in Gelman et al., Bayesian Data Analysis, 3rd ed., §2.4.
 * @example =ABTEST.RATE_DIFF_INTERVAL({120;150}, {2400;2380}) returns {"","","";-0.0000767,0.013005,0.026183}
 */
export function rateDiffInterval(conversions: any[][], visitors: any[][], level?: number, prior_alpha?: number, prior_beta?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readConversions(conversions, visitors, COMPARISON);
    const found = conversion.rateDiffInterval(input.variants, sheet.readOptionalNumber(sheet.LEVEL, level) as number, sheet.readBetaPrior(prior_alpha, prior_beta), POSTERIOR_TABLES);
    return sheet.spillBlockVersusControl(input.table, sheet.medianRows(found), 3);
  });
}

/**
 * Probability that each challenger's relative lift over the control is above a minimum you choose (0.02 asks "at least +2%"; -0.01 asks "no worse than −1%"). Spills one value per variant, with an empty cell in the control's place.
 * @customfunction PROB_LIFT_ABOVE
 * @helpurl https://localhost:3000/help/PROB_LIFT_ABOVE.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param min_lift The smallest relative lift that matters to you, greater than -1 (required; 0.05 is +5%).
 * @param [prior_alpha] Prior alpha, greater than 0 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, greater than 0 (optional; default 1, give together with prior_alpha).
 * @returns For each challenger, P(rate ÷ control's rate − 1 > min_lift); empty text for the control.
 * @method P(B/A − 1 > m) = ∫ f_A(x) (1 − F_B((1 + m)x)) dx for the Beta posteriors, by quadrature.
 * @source Region of practical equivalence reasoning: J. K. Kruschke, Doing Bayesian Data Analysis, 2nd ed. (2015), §12.1.
 * @example =ABTEST.PROB_LIFT_ABOVE({120;150}, {2400;2380}, 0.05) returns {"";0.93761}
 */
export function probLiftAbove(conversions: any[][], visitors: any[][], min_lift: number, prior_alpha?: number, prior_beta?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readConversions(conversions, visitors, COMPARISON);
    const found = conversion.probLiftAbove(input.variants, sheet.readRequiredNumber(sheet.MIN_LIFT, min_lift), sheet.readBetaPrior(prior_alpha, prior_beta), POSTERIOR_TABLES);
    return sheet.spillVersusControl(input.table, found);
  });
}

/**
 * Expected loss of choosing each variant: the conversion rate you give up on average by picking it, if another variant is truly better. Small is good. Spills one value per variant.
 * @customfunction EXPECTED_LOSS
 * @helpurl https://localhost:3000/help/EXPECTED_LOSS.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [prior_alpha] Prior alpha, greater than 0 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, greater than 0 (optional; default 1, give together with prior_alpha).
 * @returns For each variant, E[highest rate − its rate], in rate units (0.001 is 0.1 percentage points).
 * @method Expected loss = E[max_j p_j] − E[p_i], with E[max] = ∫ (1 − ∏_j F_j(x)) dx over the Beta posteriors, by quadrature.
 * @source C. Stucchio, "Bayesian A/B Testing at VWO" (2015), expected-loss decision rule.
 * @example =ABTEST.EXPECTED_LOSS({120;150}, {2400;2380}) returns {0.013083;0.00006524}
 * @caution The loss depends on the prior when data are few; check that a reasonable other prior gives the same choice.
 */
export function expectedLoss(conversions: any[][], visitors: any[][], prior_alpha?: number, prior_beta?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readConversions(conversions, visitors, COMPARISON);
    return sheet.spillPerVariant(input.table, conversion.expectedLoss(input.variants, sheet.readBetaPrior(prior_alpha, prior_beta), POSTERIOR_TABLES));
  });
}

/**
 * A one-cell verdict in plain words: which variant to choose when its expected loss is small enough, or that more data is needed.
 * @customfunction DECISION
 * @helpurl https://localhost:3000/help/DECISION.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [max_loss] The largest expected loss you accept, as a rate (optional; default 1% of the control's posterior mean rate).
 * @param [labels] Names of the variants, same shape as conversions (optional; default A, B, C… by position).
 * @param [prior_alpha] Prior alpha, greater than 0 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, greater than 0 (optional; default 1, give together with prior_alpha).
 * @returns Text such as "Choose B: its expected loss 0.0065% is within the 0.050% allowed".
 * @method The variant with the smallest expected loss is chosen when that loss is at most max_loss; otherwise the text names the current leader and its loss.
 * @source Expected-loss stopping rule: C. Stucchio, "Bayesian A/B Testing at VWO" (2015).
 * @example =ABTEST.DECISION({120;150}, {2400;2380}) returns "Choose B: its expected loss 0.0065% is within the 0.050% allowed"
 * @caution This is a decision aid, not a guarantee. A broken traffic split (check SRM_PVALUE), peeking every day, or a strong prior can all mislead it. For regulated or health-related decisions, ask a qualified statistician and follow local rules.
 */
export function decision(conversions: any[][], visitors: any[][], max_loss?: number, labels?: any[][], prior_alpha?: number, prior_beta?: number): string {
  return runSheet(() => {
    const input = sheet.readConversions(conversions, visitors, COMPARISON);
    const found = conversion.decide(input.variants, sheet.readOptionalNumber(sheet.MAX_LOSS, max_loss), sheet.readBetaPrior(prior_alpha, prior_beta), POSTERIOR_TABLES);
    return sheet.decisionCell(input.table, sheet.readAlignedCells('labels', labels, input.table, 'conversions'), found);
  });
}

/**
 * A table for charting the posterior distribution of each variant's conversion rate: a column of rates, then one density column per variant.
 * @customfunction POSTERIOR_DENSITY
 * @helpurl https://localhost:3000/help/POSTERIOR_DENSITY.html
 * @param conversions Conversions of each variant (a row or a column of whole numbers; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [points] Number of rows of the table, 2 to 1000 (optional; default 101).
 * @param [prior_alpha] Prior alpha, greater than 0 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, greater than 0 (optional; default 1, give together with prior_alpha).
 * @returns points rows: the rate grid in the first column, then the posterior density of each variant.
 * @method Beta posterior densities evaluated on an evenly spaced grid covering where any variant's posterior has visible mass.
 * @source Beta–Binomial conjugate posterior: Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §2.4.
 * @example =ABTEST.POSTERIOR_DENSITY({120;150}, {2400;2380}) spills 101 rows × 3 columns: rate, density of A, density of B; chart it as a line chart.
 * @crosscheck Each density value equals =BETA.DIST(rate, 1+C2, 1+B2-C2, FALSE) for the default prior.
 */
export function posteriorDensity(conversions: any[][], visitors: any[][], points?: number, prior_alpha?: number, prior_beta?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readConversions(conversions, visitors, ONE_OR_MORE);
    const found = conversion.posteriorDensityTable(input.variants, sheet.readOptionalNumber(sheet.POINTS, points) as number, sheet.readBetaPrior(prior_alpha, prior_beta), POSTERIOR_TABLES);
    return sheet.spillDensity(input.table, found, 'variant');
  });
}

/**
 * A table for charting the distribution of each challenger's relative lift over the control: a column of lifts, then one density column per challenger.
 * @customfunction LIFT_DENSITY
 * @helpurl https://localhost:3000/help/LIFT_DENSITY.html
 * @param conversions Conversions of each variant (2 to 50 variants in a row or a column; the first is the control).
 * @param visitors Visitors of each variant, same shape as conversions (whole numbers, 1 or more).
 * @param [points] Number of rows of the table, 2 to 1000 (optional; default 101).
 * @param [prior_alpha] Prior alpha, greater than 0 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta, greater than 0 (optional; default 1, give together with prior_alpha).
 * @returns points rows: the lift grid in the first column, then the density of each challenger's lift.
 * @method Density of the ratio B/A − 1 of independent Beta posteriors, g(r) = ∫ x f_A(x) f_B((1 + r)x) dx, by quadrature.
 * @source Density of a ratio of independent variables (common practice); Beta posteriors as in Gelman et al., Bayesian Data Analysis, 3rd ed., §2.4.
 * @example =ABTEST.LIFT_DENSITY({120;150}, {2400;2380}) spills 101 rows × 2 columns: lift, density of B's lift.
 */
export function liftDensity(conversions: any[][], visitors: any[][], points?: number, prior_alpha?: number, prior_beta?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readConversions(conversions, visitors, COMPARISON);
    const found = conversion.liftDensityTable(input.variants, sheet.readOptionalNumber(sheet.POINTS, points) as number, sheet.readBetaPrior(prior_alpha, prior_beta), POSTERIOR_TABLES);
    return sheet.spillDensity(input.table, found, 'challenger');
  });
}

// ---------------------------------------------------------------------------------------------------
// Choosing a prior

/**
 * A Beta prior from a typical conversion rate and how many visitors' worth of belief it carries. Spills alpha and beta in one row.
 * @customfunction PRIOR_FROM_MEAN
 * @helpurl https://localhost:3000/help/PRIOR_FROM_MEAN.html
 * @param mean_rate The rate you expect, between 0 and 1 (0.05 is 5%).
 * @param strength How many visitors the prior is worth, greater than 0 (e.g. 100 for a weak prior).
 * @returns alpha and beta in one row, with alpha ÷ (alpha + beta) = mean_rate and alpha + beta = strength.
 * @method alpha = mean_rate × strength, beta = (1 − mean_rate) × strength.
 * @source A Beta(a, b) prior is read as "worth a + b visitors" with mean a/(a + b) (common practice).
 * @example =ABTEST.PRIOR_FROM_MEAN(0.05, 200) returns {10,190}
 * @caution A strong prior (large strength) can outweigh the data of a small test. Compare results with the default prior before you decide.
 */
export function priorFromMean(mean_rate: number, strength: number): any[][] {
  return runSheet(() =>
    sheet.priorRow(prior.priorFromMean(sheet.readRequiredNumber(sheet.MEAN_RATE, mean_rate), sheet.readRequiredNumber(sheet.STRENGTH, strength))),
  );
}

/**
 * A Beta prior whose central interval is the range of rates you believe in (e.g. "between 3% and 7%, 9 times in 10"). Spills alpha and beta in one row.
 * @customfunction PRIOR_FROM_INTERVAL
 * @helpurl https://localhost:3000/help/PRIOR_FROM_INTERVAL.html
 * @param low Lower end of the plausible rates, between 0 and 1.
 * @param high Upper end of the plausible rates, between low and 1.
 * @param [level] How sure you are the rate lies between low and high, between 0 and 1 (optional; default 0.90).
 * @returns alpha and beta in one row.
 * @method Solves BETA.INV((1 − level)/2, alpha, beta) = low and BETA.INV((1 + level)/2, alpha, beta) = high for alpha and beta by a safeguarded Newton/Brent search.
 * @source Quantile matching for prior elicitation: A. O'Hagan et al., Uncertain Judgements: Eliciting Experts' Probabilities (2006), ch. 6.
 * @example =ABTEST.PRIOR_FROM_INTERVAL(0.03, 0.07) returns {14.784,291.15}
 * @crosscheck =BETA.INV(0.05, alpha, beta) gives low and =BETA.INV(0.95, alpha, beta) gives high for the default level.
 * @caution A narrow interval is a strong prior. Compare results with the default prior before you decide.
 */
export function priorFromInterval(low: number, high: number, level?: number): any[][] {
  return runSheet(() =>
    sheet.priorRow(prior.priorFromInterval(sheet.readRequiredNumber(sheet.LOW, low), sheet.readRequiredNumber(sheet.HIGH, high), sheet.readOptionalNumber(sheet.PRIOR_LEVEL, level) as number)),
  );
}

/**
 * A Beta prior fitted to the results of past experiments or arms (one per cell). Spills alpha and beta in one row.
 * @customfunction PRIOR_FROM_HISTORY
 * @helpurl https://localhost:3000/help/PRIOR_FROM_HISTORY.html
 * @param conversions Conversions of each past experiment or arm (a row or a column, at least 3; 10 or more give a usable fit).
 * @param visitors Visitors of each past experiment, same shape as conversions.
 * @param [method] "likelihood" (Beta–Binomial maximum likelihood) or "moments" (method of moments) (optional; default "likelihood").
 * @returns alpha and beta in one row.
 * @method "likelihood" maximises the Beta–Binomial marginal likelihood of the past counts; "moments" matches the mean and the spread of the past rates after removing the binomial noise.
 * @source Empirical Bayes Beta–Binomial: R. E. Kass and D. Steffey, JASA 84 (1989); Gelman et al., Bayesian Data Analysis, 3rd ed., §5.3.
 * @example =ABTEST.PRIOR_FROM_HISTORY({30;75;52;41;88;47}, {1000;1100;1050;900;1200;980}) returns {15.064,271.14}
 * @caution Past tests only help if they resemble this one (same page, audience and season). If the past rates hardly differ, the fit is very strong; cap it with PRIOR_FROM_MEAN.
 */
export function priorFromHistory(conversions: any[][], visitors: any[][], method?: string): any[][] {
  return runSheet(() => {
    const input = sheet.readConversions(conversions, visitors, HISTORY);
    const found = prior.priorFromHistory(input.variants.map((v) => v.conversions), input.variants.map((v) => v.visitors), sheet.readChoice(sheet.HISTORY_METHOD, method));
    return sheet.priorRow(found);
  });
}

// ---------------------------------------------------------------------------------------------------
// Planning an experiment

/**
 * Chance that a two-variant test with this many visitors per variant ends with the challenger declared better (PROB_ABOVE_CONTROL at or above the threshold), if its true rate is baseline × (1 + lift). With lift 0 it is the false-alarm rate.
 * @customfunction DECISION_POWER
 * @helpurl https://localhost:3000/help/DECISION_POWER.html
 * @param baseline_rate The control's conversion rate, between 0 and 1.
 * @param lift The challenger's true relative lift, greater than -1 (0.1 is +10%).
 * @param visitors_per_variant Visitors in each of the two variants (whole number, 1 or more).
 * @param [threshold] PROB_ABOVE_CONTROL needed to declare a winner, between 0 and 1 (optional; default 0.95).
 * @param [prior_alpha] Prior alpha used in the read-out, greater than 0 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta used in the read-out, greater than 0 (optional; default 1, give together with prior_alpha).
 * @returns A probability between 0 and 1.
 * @method Exact sum over the binomial outcomes of both variants of the probability that the Beta posterior read-out reaches the threshold (no simulation).
 * @source Bayesian assurance of a decision rule: A. O'Hagan and J. W. Stevens, "Bayesian assessment of sample size for clinical trials of cost-effectiveness", Medical Decision Making 21 (2001).
 * @example =ABTEST.DECISION_POWER(0.1, 0.2, 1000) returns 0.41309
 * @caution The chance holds for one look at the end. Looking every day and stopping at the first win raises the false-alarm rate well above DECISION_POWER(baseline, 0, n).
 */
export function decisionPower(baseline_rate: number, lift: number, visitors_per_variant: number, threshold?: number, prior_alpha?: number, prior_beta?: number): number {
  return runSheet(() =>
    sheet.finite(planning.decisionPower(sheet.readRequiredNumber(sheet.BASELINE_RATE, baseline_rate), sheet.readRequiredNumber(sheet.LIFT, lift), sheet.readRequiredNumber(sheet.VISITORS_PER_VARIANT, visitors_per_variant), sheet.readOptionalNumber(sheet.THRESHOLD, threshold) as number, sheet.readBetaPrior(prior_alpha, prior_beta))),
  );
}

/**
 * Smallest number of visitors per variant for which DECISION_POWER reaches the power you want.
 * @customfunction VISITORS_NEEDED
 * @helpurl https://localhost:3000/help/VISITORS_NEEDED.html
 * @param baseline_rate The control's conversion rate, between 0 and 1.
 * @param lift The smallest relative lift you want to detect, greater than -1 and not 0 (0.1 is +10%).
 * @param [threshold] PROB_ABOVE_CONTROL needed to declare a winner, between 0 and 1 (optional; default 0.95).
 * @param [power] Chance of declaring the winner you want, between 0 and 1 (optional; default 0.8).
 * @param [prior_alpha] Prior alpha used in the read-out, greater than 0 (optional; default 1, give together with prior_beta).
 * @param [prior_beta] Prior beta used in the read-out, greater than 0 (optional; default 1, give together with prior_alpha).
 * @returns Visitors per variant (a whole number).
 * @method Search over whole numbers of visitors for the first one whose exact DECISION_POWER reaches power.
 * @source Bayesian assurance of a decision rule: A. O'Hagan and J. W. Stevens, Medical Decision Making 21 (2001).
 * @example =ABTEST.VISITORS_NEEDED(0.1, 0.2) returns 3024
 * @crosscheck Compare with =ABTEST.CLASSIC_SAMPLE_SIZE(0.1, 0.2, 0.1, 0.8, 1), the one-sided z-test size at a similar error rate.
 */
export function visitorsNeeded(baseline_rate: number, lift: number, threshold?: number, power?: number, prior_alpha?: number, prior_beta?: number): number {
  return runSheet(() =>
    sheet.finite(planning.visitorsNeeded(sheet.readRequiredNumber(sheet.BASELINE_RATE, baseline_rate), sheet.readRequiredNumber(sheet.LIFT, lift), sheet.readOptionalNumber(sheet.THRESHOLD, threshold) as number, sheet.readOptionalNumber(sheet.POWER, power) as number, sheet.readBetaPrior(prior_alpha, prior_beta))),
  );
}

/**
 * Visitors per variant for the classic two-proportion z-test, for comparison with textbook plans.
 * @customfunction CLASSIC_SAMPLE_SIZE
 * @helpurl https://localhost:3000/help/CLASSIC_SAMPLE_SIZE.html
 * @param baseline_rate The control's conversion rate, between 0 and 1.
 * @param lift The smallest relative lift you want to detect, greater than -1 and not 0 (0.1 is +10%).
 * @param [alpha] Significance level, between 0 and 1 (optional; default 0.05).
 * @param [power] Chance of detecting the lift, between 0 and 1 (optional; default 0.8).
 * @param [sides] 1 for a one-sided test, 2 for two-sided (optional; default 2).
 * @returns Visitors per variant, rounded up to a whole number.
 * @method n = (z_(1−alpha/sides) √(2 p̄(1 − p̄)) + z_power √(p1(1 − p1) + p2(1 − p2)))² / (p2 − p1)², with the pooled rate p̄ under the null and no continuity correction, rounded up.
 * @source J. L. Fleiss, B. Levin and M. C. Paik, Statistical Methods for Rates and Proportions, 3rd ed. (2003), §4.2; agrees with R's power.prop.test.
 * @example =ABTEST.CLASSIC_SAMPLE_SIZE(0.1, 0.5) returns 686
 * @crosscheck =ROUNDUP((NORM.S.INV(1-0.05/2)*SQRT(2*pbar*(1-pbar))+NORM.S.INV(0.8)*SQRT(p1*(1-p1)+p2*(1-p2)))^2/(p2-p1)^2, 0) with p1 the baseline, p2 = p1*(1+lift), pbar = (p1+p2)/2.
 */
export function classicSampleSize(baseline_rate: number, lift: number, alpha?: number, power?: number, sides?: number): number {
  return runSheet(() =>
    sheet.finite(planning.classicSampleSize(sheet.readRequiredNumber(sheet.BASELINE_RATE, baseline_rate), sheet.readRequiredNumber(sheet.LIFT, lift), sheet.readOptionalNumber(sheet.ALPHA, alpha) as number, sheet.readOptionalNumber(sheet.POWER, power) as number, sheet.readOptionalNumber(sheet.SIDES, sides) as 1 | 2)),
  );
}

// ---------------------------------------------------------------------------------------------------
// Checking the experiment

/**
 * Checks the traffic split: the p-value of the chi-square test of the observed visitors against the planned shares. A tiny value (below about 0.001) says the split is broken (sample ratio mismatch) and the results should not be trusted.
 * @customfunction SRM_PVALUE
 * @helpurl https://localhost:3000/help/SRM_PVALUE.html
 * @param visitors Visitors of each variant (2 to 50 variants in a row or a column; whole numbers, 0 or more).
 * @param [planned_shares] Planned share of each variant, same shape as visitors, any positive weights (optional; default equal shares).
 * @returns A p-value between 0 and 1.
 * @method Pearson's chi-square goodness-of-fit statistic with k − 1 degrees of freedom; the upper tail is computed directly so tiny p-values keep their digits.
 * @source Sample ratio mismatch: A. Fabijan et al., "Diagnosing Sample Ratio Mismatch in Online Controlled Experiments", KDD 2019.
 * @example =ABTEST.SRM_PVALUE({50410;49590}) returns 0.0095124
 * @crosscheck =CHISQ.TEST(observed, expected) with expected = total visitors × share ÷ sum of shares.
 * @caution A broken split usually means a bug in assignment or tracking; fix it before reading any other result. Below about 0.001 is the usual alarm level (common practice).
 */
export function srmPvalue(visitors: any[][], planned_shares?: any[][]): number {
  return runSheet(() => {
    const split = sheet.readSplit(visitors, planned_shares, COMPARISON);
    return sheet.finite(srmPValue(split.visitors, split.plannedShares));
  });
}

// ---------------------------------------------------------------------------------------------------
// Revenue and other averages (Normal model from summary statistics)

/**
 * Credible interval for each variant's true average (e.g. revenue per visitor), from the count, average and standard deviation of its values. Spills lower and upper bound per variant.
 * @customfunction MEAN_INTERVAL
 * @helpurl https://localhost:3000/help/MEAN_INTERVAL.html
 * @param count Number of values of each variant, as COUNT gives (whole numbers, 2 or more; the first is the control).
 * @param mean Average of each variant, as AVERAGE gives, same shape as count.
 * @param sd Standard deviation of each variant, as STDEV.S gives (0 or more), same shape as count.
 * @param [level] Probability the interval holds, between 0 and 1 (optional; default 0.95).
 * @returns Lower and upper bound of each variant's average.
 * @method With the reference prior p(μ, σ²) ∝ 1/σ², the mean's posterior is Student t with count − 1 degrees of freedom, centre mean and scale sd/√count; the interval is its central quantiles.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §3.2.
 * @example =ABTEST.MEAN_INTERVAL({1200;1180}, {3.10;3.42}, {9.8;10.4}) returns {2.5450,3.6550;2.8260,4.0140}
 * @crosscheck =mean - T.INV(0.975, count-1)*sd/SQRT(count) and =mean + T.INV(0.975, count-1)*sd/SQRT(count), the same numbers as the classic t interval.
 * @caution Revenue is skewed: a few large orders move the average. With small counts the t model can be optimistic; prefer larger samples.
 */
export function meanInterval(count: any[][], mean: any[][], sd: any[][], level?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readMeans(count, mean, sd, ONE_OR_MORE);
    return sheet.spillBlock(input.table, sheet.intervalRows(normalMeans.meanInterval(input.variants, sheet.readOptionalNumber(sheet.LEVEL, level) as number)), 2);
  });
}

/**
 * Probability that each variant has the highest true average (e.g. revenue per visitor). The values add up to 1.
 * @customfunction MEAN_PROB_HIGHEST
 * @helpurl https://localhost:3000/help/MEAN_PROB_HIGHEST.html
 * @param count Number of values of each variant, as COUNT gives (2 to 50 variants; whole numbers, 2 or more).
 * @param mean Average of each variant, as AVERAGE gives, same shape as count.
 * @param sd Standard deviation of each variant, as STDEV.S gives (0 or more), same shape as count.
 * @returns For each variant, the probability (0 to 1) that its average is the highest.
 * @method P(i highest) = ∫ f_i ∏_{j≠i} F_j over the Student t posteriors, by quadrature.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §3.2 (posterior of a normal mean).
 * @example =ABTEST.MEAN_PROB_HIGHEST({1200;1180}, {3.10;3.42}, {9.8;10.4}) returns {0.22011;0.77989}
 * @caution With many variants the best-looking one is often lucky; decide the number of variants in advance.
 */
export function meanProbHighest(count: any[][], mean: any[][], sd: any[][]): any[][] {
  return runSheet(() => {
    const input = sheet.readMeans(count, mean, sd, COMPARISON);
    return sheet.spillPerVariant(input.table, normalMeans.meanProbHighest(input.variants));
  });
}

/**
 * Probability that each challenger's true average beats the control's (the first variant). Spills one value per variant, with an empty cell in the control's place.
 * @customfunction MEAN_PROB_ABOVE_CONTROL
 * @helpurl https://localhost:3000/help/MEAN_PROB_ABOVE_CONTROL.html
 * @param count Number of values of each variant, as COUNT gives (2 to 50 variants; whole numbers, 2 or more).
 * @param mean Average of each variant, as AVERAGE gives, same shape as count.
 * @param sd Standard deviation of each variant, as STDEV.S gives (0 or more), same shape as count.
 * @returns For each challenger, P(its average > the control's average); empty text for the control.
 * @method P(B > A) = ∫ f_B F_A over the Student t posteriors, by quadrature.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §3.2.
 * @example =ABTEST.MEAN_PROB_ABOVE_CONTROL({1200;1180}, {3.10;3.42}, {9.8;10.4}) returns {"";0.77989}
 * @caution Stopping the first time this passes 95% (peeking) makes false wins more likely.
 */
export function meanProbAboveControl(count: any[][], mean: any[][], sd: any[][]): any[][] {
  return runSheet(() => {
    const input = sheet.readMeans(count, mean, sd, COMPARISON);
    return sheet.spillVersusControl(input.table, normalMeans.meanProbAboveControl(input.variants));
  });
}

/**
 * Credible interval for each challenger's difference in average from the control (average − control's average, in the metric's units). Spills lower, median and upper per challenger, with empty cells in the control's place.
 * @customfunction MEAN_DIFF_INTERVAL
 * @helpurl https://localhost:3000/help/MEAN_DIFF_INTERVAL.html
 * @param count Number of values of each variant, as COUNT gives (2 to 50 variants; whole numbers, 2 or more).
 * @param mean Average of each variant, as AVERAGE gives, same shape as count.
 * @param sd Standard deviation of each variant, as STDEV.S gives (0 or more), same shape as count.
 * @param [level] Probability the interval holds, between 0 and 1 (optional; default 0.95).
 * @returns Lower, median and upper difference of each challenger.
 * @method Quantiles of the difference of two independent Student t posteriors (the Behrens–Fisher problem), P(B − A ≤ d) = ∫ f_A(x) F_B(x + d) dx, inverted by Brent's method.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §3.2 and exercise 3.3 (difference of two normal means).
 * @example =ABTEST.MEAN_DIFF_INTERVAL({1200;1180}, {3.10;3.42}, {9.8;10.4}) returns {"","","";-0.49289,0.32000,1.13289}
 */
export function meanDiffInterval(count: any[][], mean: any[][], sd: any[][], level?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readMeans(count, mean, sd, COMPARISON);
    return sheet.spillBlockVersusControl(input.table, sheet.medianRows(normalMeans.meanDiffInterval(input.variants, sheet.readOptionalNumber(sheet.LEVEL, level) as number)), 3);
  });
}

/**
 * Credible interval for each challenger's relative lift in average over the control (average ÷ control's average − 1). Spills lower, median and upper per challenger, with empty cells in the control's place.
 * @customfunction MEAN_LIFT_INTERVAL
 * @helpurl https://localhost:3000/help/MEAN_LIFT_INTERVAL.html
 * @param count Number of values of each variant, as COUNT gives (2 to 50 variants; whole numbers, 2 or more).
 * @param mean Average of each variant, as AVERAGE gives, same shape as count.
 * @param sd Standard deviation of each variant, as STDEV.S gives (0 or more), same shape as count.
 * @param [level] Probability the interval holds, between 0 and 1 (optional; default 0.95).
 * @returns Lower, median and upper relative lift of each challenger; an error naming the control if its average could plausibly be 0 or less.
 * @method Quantiles of the ratio B/A − 1 of independent Student t posteriors, P(B/A − 1 ≤ r) = ∫ f_A(x) F_B((1 + r)x) dx over A > 0.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §3.2; ratio distribution by its product-integral definition (common practice).
 * @example =ABTEST.MEAN_LIFT_INTERVAL({1200;1180}, {3.10;3.42}, {9.8;10.4}) returns {"","","";-0.14231,0.10323,0.42182}
 */
export function meanLiftInterval(count: any[][], mean: any[][], sd: any[][], level?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readMeans(count, mean, sd, COMPARISON);
    return sheet.spillBlockVersusControl(input.table, sheet.medianRows(normalMeans.meanLiftInterval(input.variants, sheet.readOptionalNumber(sheet.LEVEL, level) as number)), 3);
  });
}

/**
 * Expected loss of choosing each variant for an average metric: how much of the average you give up on average by picking it. Small is good.
 * @customfunction MEAN_EXPECTED_LOSS
 * @helpurl https://localhost:3000/help/MEAN_EXPECTED_LOSS.html
 * @param count Number of values of each variant, as COUNT gives (2 to 50 variants; whole numbers, 2 or more).
 * @param mean Average of each variant, as AVERAGE gives, same shape as count.
 * @param sd Standard deviation of each variant, as STDEV.S gives (0 or more), same shape as count.
 * @returns For each variant, E[highest average − its average], in the metric's units.
 * @method E[max_j μ_j] − E[μ_i] over the Student t posteriors, with E[max] by quadrature.
 * @source C. Stucchio, "Bayesian A/B Testing at VWO" (2015), expected loss; Gelman et al., BDA3 §3.2 for the posterior.
 * @example =ABTEST.MEAN_EXPECTED_LOSS({1200;1180}, {3.10;3.42}, {9.8;10.4}) returns {0.37239;0.052388}
 */
export function meanExpectedLoss(count: any[][], mean: any[][], sd: any[][]): any[][] {
  return runSheet(() => {
    const input = sheet.readMeans(count, mean, sd, COMPARISON);
    return sheet.spillPerVariant(input.table, normalMeans.meanExpectedLoss(input.variants));
  });
}

// ---------------------------------------------------------------------------------------------------
// Counts per exposure (Gamma–Poisson)

/**
 * Credible interval for each variant's event rate per unit of exposure (e.g. add-to-cart clicks per user-day). Spills lower and upper bound per variant.
 * @customfunction EVENTS_RATE_INTERVAL
 * @helpurl https://localhost:3000/help/EVENTS_RATE_INTERVAL.html
 * @param events Events of each variant (a row or a column of whole numbers, 0 or more; the first is the control).
 * @param exposure Exposure of each variant, same shape as events (greater than 0: user-days, sessions…).
 * @param [level] Probability the interval holds, between 0 and 1 (optional; default 0.95).
 * @param [prior_shape] Gamma prior shape, greater than 0 (optional; default 1).
 * @param [prior_rate] Gamma prior rate, 0 or more (optional; default 0, flat on the rate).
 * @returns Lower and upper bound of each variant's events per unit of exposure.
 * @method Gamma–Poisson conjugate update: the posterior is Gamma(prior_shape + events, prior_rate + exposure); the interval is its central quantiles.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §2.6.
 * @example =ABTEST.EVENTS_RATE_INTERVAL({340;395}, {1000;1010}) returns {0.30576,0.37813;0.35441,0.43162}
 * @crosscheck =GAMMA.INV(0.025, 1+events, 1/exposure) and =GAMMA.INV(0.975, 1+events, 1/exposure) for the default prior.
 */
export function eventsRateInterval(events: any[][], exposure: any[][], level?: number, prior_shape?: number, prior_rate?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readEvents(events, exposure, ONE_OR_MORE);
    return sheet.spillBlock(input.table, sheet.intervalRows(eventRates.eventsRateInterval(input.variants, sheet.readOptionalNumber(sheet.LEVEL, level) as number, sheet.readGammaPrior(prior_shape, prior_rate))), 2);
  });
}

/**
 * Probability that each variant has the highest true event rate per unit of exposure. The values add up to 1.
 * @customfunction EVENTS_PROB_HIGHEST
 * @helpurl https://localhost:3000/help/EVENTS_PROB_HIGHEST.html
 * @param events Events of each variant (2 to 50 variants; whole numbers, 0 or more).
 * @param exposure Exposure of each variant, same shape as events (greater than 0).
 * @param [prior_shape] Gamma prior shape, greater than 0 (optional; default 1).
 * @param [prior_rate] Gamma prior rate, 0 or more (optional; default 0, flat on the rate).
 * @returns For each variant, the probability (0 to 1) that its rate is the highest.
 * @method P(i highest) = ∫ f_i ∏_{j≠i} F_j over the Gamma posteriors, by quadrature.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §2.6 (Gamma–Poisson posterior).
 * @example =ABTEST.EVENTS_PROB_HIGHEST({340;395}, {1000;1010}) returns {0.029173;0.970827}
 */
export function eventsProbHighest(events: any[][], exposure: any[][], prior_shape?: number, prior_rate?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readEvents(events, exposure, COMPARISON);
    return sheet.spillPerVariant(input.table, eventRates.eventsProbHighest(input.variants, sheet.readGammaPrior(prior_shape, prior_rate)));
  });
}

/**
 * Probability that each challenger's true event rate beats the control's (the first variant). Spills one value per variant, with an empty cell in the control's place.
 * @customfunction EVENTS_PROB_ABOVE_CONTROL
 * @helpurl https://localhost:3000/help/EVENTS_PROB_ABOVE_CONTROL.html
 * @param events Events of each variant (2 to 50 variants; whole numbers, 0 or more).
 * @param exposure Exposure of each variant, same shape as events (greater than 0).
 * @param [prior_shape] Gamma prior shape, greater than 0 (optional; default 1).
 * @param [prior_rate] Gamma prior rate, 0 or more (optional; default 0, flat on the rate).
 * @returns For each challenger, P(its rate > the control's rate); empty text for the control.
 * @method Closed form P(λ_B > λ_A) = I_z(a_A, a_B) with z = b_A/(b_A + b_B), the regularised incomplete beta function of the posterior shapes a and rates b.
 * @source Gamma–Poisson comparison via the Beta distribution of λ_A/(λ_A + λ_B) (common practice; see check-values in the developer notes).
 * @example =ABTEST.EVENTS_PROB_ABOVE_CONTROL({340;395}, {1000;1010}) returns {"";0.970827}
 * @crosscheck =BETA.DIST(b_A/(b_A+b_B), a_A, a_B, TRUE) with a = prior_shape + events and b = prior_rate + exposure.
 */
export function eventsProbAboveControl(events: any[][], exposure: any[][], prior_shape?: number, prior_rate?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readEvents(events, exposure, COMPARISON);
    return sheet.spillVersusControl(input.table, eventRates.eventsProbAboveControl(input.variants, sheet.readGammaPrior(prior_shape, prior_rate)));
  });
}

/**
 * Credible interval for each challenger's relative lift in event rate over the control (rate ÷ control's rate − 1). Spills lower, median and upper per challenger, with empty cells in the control's place.
 * @customfunction EVENTS_LIFT_INTERVAL
 * @helpurl https://localhost:3000/help/EVENTS_LIFT_INTERVAL.html
 * @param events Events of each variant (2 to 50 variants; whole numbers, 0 or more).
 * @param exposure Exposure of each variant, same shape as events (greater than 0).
 * @param [level] Probability the interval holds, between 0 and 1 (optional; default 0.95).
 * @param [prior_shape] Gamma prior shape, greater than 0 (optional; default 1).
 * @param [prior_rate] Gamma prior rate, 0 or more (optional; default 0, flat on the rate).
 * @returns Lower, median and upper relative lift of each challenger.
 * @method The ratio of independent Gamma posteriors is a scaled Beta-prime (F) variable; its quantiles give the interval.
 * @source Ratio of independent Gamma variables (common practice); posterior as in Gelman et al., BDA3 §2.6.
 * @example =ABTEST.EVENTS_LIFT_INTERVAL({340;395}, {1000;1010}) returns {"","","";-0.0049187,0.14995,0.32961}
 * @crosscheck For the default prior, (1 + lift) at probability q equals =F.INV(q, 2*(1+x_B), 2*(1+x_A)) × (1+x_B)/(1+x_A) × t_A/t_B, with x the events and t the exposure.
 */
export function eventsLiftInterval(events: any[][], exposure: any[][], level?: number, prior_shape?: number, prior_rate?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readEvents(events, exposure, COMPARISON);
    return sheet.spillBlockVersusControl(input.table, sheet.medianRows(eventRates.eventsLiftInterval(input.variants, sheet.readOptionalNumber(sheet.LEVEL, level) as number, sheet.readGammaPrior(prior_shape, prior_rate))), 3);
  });
}

/**
 * Expected loss of choosing each variant for an event rate: how much rate per unit of exposure you give up on average by picking it. Small is good.
 * @customfunction EVENTS_EXPECTED_LOSS
 * @helpurl https://localhost:3000/help/EVENTS_EXPECTED_LOSS.html
 * @param events Events of each variant (2 to 50 variants; whole numbers, 0 or more).
 * @param exposure Exposure of each variant, same shape as events (greater than 0).
 * @param [prior_shape] Gamma prior shape, greater than 0 (optional; default 1).
 * @param [prior_rate] Gamma prior rate, 0 or more (optional; default 0, flat on the rate).
 * @returns For each variant, E[highest rate − its rate], in events per unit of exposure.
 * @method E[max_j λ_j] − E[λ_i] over the Gamma posteriors, with E[max] by quadrature.
 * @source C. Stucchio, "Bayesian A/B Testing at VWO" (2015), expected loss; Gamma posterior as in BDA3 §2.6.
 * @example =ABTEST.EVENTS_EXPECTED_LOSS({340;395}, {1000;1010}) returns {0.051383;0.00030419}
 */
export function eventsExpectedLoss(events: any[][], exposure: any[][], prior_shape?: number, prior_rate?: number): any[][] {
  return runSheet(() => {
    const input = sheet.readEvents(events, exposure, COMPARISON);
    return sheet.spillPerVariant(input.table, eventRates.eventsExpectedLoss(input.variants, sheet.readGammaPrior(prior_shape, prior_rate)));
  });
}
