/* eslint-disable @typescript-eslint/no-explicit-any -- Excel passes ranges as any[][] (blanks must stay blank) */
/**
 * The worksheet functions of the family "prior": choosing a Beta prior for conversion rates.
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
import { fittedPriorInDomain, priorFromMeanInDomain, priorRow, runFunction } from '../sheet';
import * as prior from '../stats/prior';

/**
 * A Beta prior from a typical conversion rate and how many visitors' worth of belief it carries. Spills alpha and beta in one row.
 * @customfunction PRIOR_FROM_MEAN
 * @helpurl https://localhost:3000/help/PRIOR_FROM_MEAN.html
 * @param mean_rate The rate you expect, 0.000001 to 0.999999 (0.05 is 5%).
 * @param strength How many visitors the prior is worth, 0.002 to 2E+6 (e.g. 100 for a weak prior).
 * @returns alpha and beta in one row, with alpha ÷ (alpha + beta) = mean_rate and alpha + beta = strength.
 * @method alpha = mean_rate × strength, beta = (1 − mean_rate) × strength.
 * @source A Beta(a, b) prior is read as "worth a + b visitors" with mean a/(a + b) (common practice).
 * @example =ABTEST.PRIOR_FROM_MEAN(0.05, 200) returns {10,190}
 * @caution A strong prior (large strength) can outweigh the data of a small test. Compare results with the default prior before you decide.
 */
export function priorFromMean(mean_rate: number, strength: number): any[][] {
  return runFunction(CATALOGUE.PRIOR_FROM_MEAN, { mean_rate, strength }, (a) =>
    priorRow(priorFromMeanInDomain(prior.priorFromMean(a.mean_rate, a.strength), a.mean_rate, a.strength)),
  );
}

/**
 * A Beta prior whose central interval is the range of rates you believe in (e.g. "between 3% and 7%, 9 times in 10"). Spills alpha and beta in one row.
 * @customfunction PRIOR_FROM_INTERVAL
 * @helpurl https://localhost:3000/help/PRIOR_FROM_INTERVAL.html
 * @param low Lower end of the plausible rates, 0.000001 to 0.999999.
 * @param high Upper end of the plausible rates, 0.000001 to 0.999999 and above low.
 * @param [level] How sure you are the rate lies between low and high, 0.01 to 0.9999 (optional; default 0.90).
 * @returns alpha and beta in one row.
 * @method Solves BETA.INV((1 − level)/2, alpha, beta) = low and BETA.INV((1 + level)/2, alpha, beta) = high for alpha and beta by a safeguarded Newton/Brent search.
 * @source Quantile matching for prior elicitation: A. O'Hagan et al., Uncertain Judgements: Eliciting Experts' Probabilities (2006), ch. 6.
 * @example =ABTEST.PRIOR_FROM_INTERVAL(0.03, 0.07) returns {14.784,291.15}
 * @crosscheck =BETA.INV(0.05, alpha, beta) gives low and =BETA.INV(0.95, alpha, beta) gives high for the default level.
 * @caution A narrow interval is a strong prior. Compare results with the default prior before you decide.
 */
export function priorFromInterval(low: number, high: number, level?: number): any[][] {
  return runFunction(CATALOGUE.PRIOR_FROM_INTERVAL, { low, high, level }, (a) =>
    priorRow(
      fittedPriorInDomain(
        prior.priorFromInterval(a.low, a.high, a.level),
        'low and high are too close together (or too far apart) for this level; widen or narrow the range',
      ),
    ),
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
  return runFunction(CATALOGUE.PRIOR_FROM_HISTORY, { conversions, visitors, method }, (a) =>
    priorRow(
      fittedPriorInDomain(
        prior.priorFromHistory(
          a.variants.map((v) => v.conversions),
          a.variants.map((v) => v.visitors),
          a.method,
        ),
        'the past rates (conversions out of visitors) hardly differ or differ wildly; choose a prior with PRIOR_FROM_MEAN',
      ),
    ),
  );
}
