/* eslint-disable @typescript-eslint/no-explicit-any -- Excel passes ranges as any[][] (blanks must stay blank) */
/**
 * The worksheet functions of the family "events": events over exposure per variant.
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
import * as eventRates from '../stats/eventRates';

/**
 * Credible interval for each variant's event rate per unit of exposure (e.g. add-to-cart clicks per user-day). Spills lower and upper bound per variant.
 * @customfunction EVENTS_RATE_INTERVAL
 * @helpurl https://localhost:3000/help/EVENTS_RATE_INTERVAL.html
 * @param events Events of each variant (a row or a column of whole numbers, 0 or more; the first is the control).
 * @param exposure Exposure of each variant, same shape as events (1E-6 to 1E+12: user-days, sessions…).
 * @param [level] Probability the interval holds, 0.01 to 0.9999 (optional; default 0.95).
 * @param [prior_shape] Gamma prior shape, 0.001 to 1E+6 (optional; default 1).
 * @param [prior_rate] Gamma prior rate, 0 to 1E+12 (optional; default 0, flat on the rate).
 * @returns Lower and upper bound of each variant's events per unit of exposure.
 * @method Gamma–Poisson conjugate update: the posterior is Gamma(prior_shape + events, prior_rate + exposure); the interval is its central quantiles.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §2.6.
 * @example =ABTEST.EVENTS_RATE_INTERVAL({340;395}, {1000;1010}) returns {0.30576,0.37813;0.35441,0.43162}
 * @crosscheck =GAMMA.INV(0.025, 1+events, 1/exposure) and =GAMMA.INV(0.975, 1+events, 1/exposure) for the default prior.
 * @caution Events per exposure assumes events arrive independently; heavy users can make the intervals too narrow.
 */
export function eventsRateInterval(
  events: any[][],
  exposure: any[][],
  level?: number,
  prior_shape?: number,
  prior_rate?: number,
): any[][] {
  return runFunction(CATALOGUE.EVENTS_RATE_INTERVAL, { events, exposure, level, prior_shape, prior_rate }, (a) =>
    intervalRows(eventRates.eventsRateInterval(a.variants, a.level, a.prior)),
  );
}

/**
 * Probability that each variant has the highest true event rate per unit of exposure. The values add up to 1.
 * @customfunction EVENTS_PROB_HIGHEST
 * @helpurl https://localhost:3000/help/EVENTS_PROB_HIGHEST.html
 * @param events Events of each variant (2 to 50 variants; whole numbers, 0 or more).
 * @param exposure Exposure of each variant, same shape as events (1E-6 to 1E+12).
 * @param [prior_shape] Gamma prior shape, 0.001 to 1E+6 (optional; default 1).
 * @param [prior_rate] Gamma prior rate, 0 to 1E+12 (optional; default 0, flat on the rate).
 * @returns For each variant, the probability (0 to 1) that its rate is the highest.
 * @method P(i highest) = ∫ f_i · Π F_j (the product over every other variant j) over the Gamma posteriors, by quadrature.
 * @source Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §2.6 (Gamma–Poisson posterior).
 * @example =ABTEST.EVENTS_PROB_HIGHEST({340;395}, {1000;1010}) returns {0.029173;0.970827}
 * @caution Events per exposure assumes events arrive independently; heavy users can make the intervals too narrow.
 */
export function eventsProbHighest(
  events: any[][],
  exposure: any[][],
  prior_shape?: number,
  prior_rate?: number,
): any[][] {
  return runFunction(CATALOGUE.EVENTS_PROB_HIGHEST, { events, exposure, prior_shape, prior_rate }, (a) =>
    eventRates.eventsProbHighest(a.variants, a.prior),
  );
}

/**
 * Probability that each challenger's true event rate beats the control's (the first variant). Spills one value per variant, with an empty cell in the control's place.
 * @customfunction EVENTS_PROB_ABOVE_CONTROL
 * @helpurl https://localhost:3000/help/EVENTS_PROB_ABOVE_CONTROL.html
 * @param events Events of each variant (2 to 50 variants; whole numbers, 0 or more).
 * @param exposure Exposure of each variant, same shape as events (1E-6 to 1E+12).
 * @param [prior_shape] Gamma prior shape, 0.001 to 1E+6 (optional; default 1).
 * @param [prior_rate] Gamma prior rate, 0 to 1E+12 (optional; default 0, flat on the rate).
 * @returns For each challenger, P(its rate > the control's rate); empty text for the control.
 * @method Closed form P(λ_B > λ_A) = I_z(a_A, a_B) with z = b_A/(b_A + b_B), the regularised incomplete beta function of the posterior shapes a and rates b.
 * @source Gamma–Poisson comparison via the Beta distribution of λ_A/(λ_A + λ_B) (common practice; docs/check-values.md).
 * @example =ABTEST.EVENTS_PROB_ABOVE_CONTROL({340;395}, {1000;1010}) returns {"";0.970827}
 * @crosscheck =BETA.DIST(b_A/(b_A+b_B), a_A, a_B, TRUE) with a = prior_shape + events and b = prior_rate + exposure.
 * @caution Events per exposure assumes events arrive independently; heavy users can make the intervals too narrow.
 */
export function eventsProbAboveControl(
  events: any[][],
  exposure: any[][],
  prior_shape?: number,
  prior_rate?: number,
): any[][] {
  return runFunction(CATALOGUE.EVENTS_PROB_ABOVE_CONTROL, { events, exposure, prior_shape, prior_rate }, (a) =>
    eventRates.eventsProbAboveControl(a.variants, a.prior),
  );
}

/**
 * Credible interval for each challenger's relative lift in event rate over the control (rate ÷ control's rate − 1). Spills lower, median and upper per challenger, with empty cells in the control's place.
 * @customfunction EVENTS_LIFT_INTERVAL
 * @helpurl https://localhost:3000/help/EVENTS_LIFT_INTERVAL.html
 * @param events Events of each variant (2 to 50 variants; whole numbers, 0 or more).
 * @param exposure Exposure of each variant, same shape as events (1E-6 to 1E+12).
 * @param [level] Probability the interval holds, 0.01 to 0.9999 (optional; default 0.95).
 * @param [prior_shape] Gamma prior shape, 0.001 to 1E+6 (optional; default 1).
 * @param [prior_rate] Gamma prior rate, 0 to 1E+12 (optional; default 0, flat on the rate).
 * @returns Lower, median and upper relative lift of each challenger.
 * @method The ratio of independent Gamma posteriors is a scaled Beta-prime (F) variable; its quantiles give the interval.
 * @source Ratio of independent Gamma variables (common practice); posterior as in Gelman et al., BDA3 §2.6.
 * @example =ABTEST.EVENTS_LIFT_INTERVAL({340;395}, {1000;1010}) returns {"","","";-0.0049187,0.14995,0.32961}
 * @crosscheck For the default prior, (1 + lift) at probability q equals =F.INV(q, 2*(1+x_B), 2*(1+x_A)) × (1+x_B)/(1+x_A) × t_A/t_B, with x the events and t the exposure.
 * @caution Events per exposure assumes events arrive independently; heavy users can make the intervals too narrow.
 */
export function eventsLiftInterval(
  events: any[][],
  exposure: any[][],
  level?: number,
  prior_shape?: number,
  prior_rate?: number,
): any[][] {
  return runFunction(CATALOGUE.EVENTS_LIFT_INTERVAL, { events, exposure, level, prior_shape, prior_rate }, (a) =>
    medianRows(eventRates.eventsLiftInterval(a.variants, a.level, a.prior)),
  );
}

/**
 * Expected loss of choosing each variant for an event rate: how much rate per unit of exposure you give up on average by picking it. Small is good.
 * @customfunction EVENTS_EXPECTED_LOSS
 * @helpurl https://localhost:3000/help/EVENTS_EXPECTED_LOSS.html
 * @param events Events of each variant (2 to 50 variants; whole numbers, 0 or more).
 * @param exposure Exposure of each variant, same shape as events (1E-6 to 1E+12).
 * @param [prior_shape] Gamma prior shape, 0.001 to 1E+6 (optional; default 1).
 * @param [prior_rate] Gamma prior rate, 0 to 1E+12 (optional; default 0, flat on the rate).
 * @returns For each variant, E[highest rate − its rate], in events per unit of exposure.
 * @method E[max_j λ_j] − E[λ_i] over the Gamma posteriors, with E[max] by quadrature.
 * @source C. Stucchio, "Bayesian A/B Testing at VWO" (2015), expected loss; Gamma posterior as in BDA3 §2.6.
 * @example =ABTEST.EVENTS_EXPECTED_LOSS({340;395}, {1000;1010}) returns {0.051383;0.00030419}
 * @caution Events per exposure assumes events arrive independently; heavy users can make the intervals too narrow.
 */
export function eventsExpectedLoss(
  events: any[][],
  exposure: any[][],
  prior_shape?: number,
  prior_rate?: number,
): any[][] {
  return runFunction(CATALOGUE.EVENTS_EXPECTED_LOSS, { events, exposure, prior_shape, prior_rate }, (a) =>
    eventRates.eventsExpectedLoss(a.variants, a.prior),
  );
}

/**
 * Probability that each challenger's event rate is more than min_lift above the control's; a negative min_lift asks "no worse than" (−0.05: at most 5% lower). Spills one value per variant, with an empty cell in the control's place.
 * @customfunction EVENTS_PROB_LIFT_ABOVE
 * @helpurl https://localhost:3000/help/EVENTS_PROB_LIFT_ABOVE.html
 * @param events Events of each variant (2 to 50 variants; whole numbers, 0 or more).
 * @param exposure Exposure of each variant, same shape as events (greater than 0).
 * @param min_lift The relative lift to beat, as a fraction greater than -1 and at most 1 (0.05 is a 5% higher rate; −0.05 asks "no worse than 5% lower").
 * @param [prior_shape] Gamma prior shape, 0.001 to 1E+6 (optional; default 1).
 * @param [prior_rate] Gamma prior rate, 0 to 1E+12 (optional; default 0, flat on the rate).
 * @returns For each challenger, P(its rate / the control's rate − 1 > min_lift); empty text for the control.
 * @method Closed form: with a = shape + events and b = rate + exposure, P(λ_i/λ_0 ≤ k) = I_x(a_i, a_0) with x = k·b_i/(b_0 + k·b_i), k = 1 + the minimum lift (the scaled ratio is F-distributed); the upper tail is computed directly.
 * @source Johnson, Kotz & Balakrishnan, Continuous Univariate Distributions, vol. 2, ch. 27; checked against scipy.special.betaincc and quadrature (the lift-above reference script in test/reference).
 * @example =ABTEST.EVENTS_PROB_LIFT_ABOVE({340;395}, {1000;1010}, 0.05) returns {"";0.89094}
 * @crosscheck With the default prior, =1-BETA.DIST(k*1010/(1000+k*1010), 1+395, 1+340, TRUE) with k = 1 + min_lift gives the challenger's value.
 * @caution Events per exposure assumes events arrive independently; heavy users can make the result too confident.
 */
export function eventsProbLiftAbove(
  events: any[][],
  exposure: any[][],
  min_lift: number,
  prior_shape?: number,
  prior_rate?: number,
): any[][] {
  return runFunction(CATALOGUE.EVENTS_PROB_LIFT_ABOVE, { events, exposure, min_lift, prior_shape, prior_rate }, (a) =>
    eventRates.eventsProbLiftAbove(a.variants, a.min_lift, a.prior),
  );
}

/**
 * A one-cell verdict in plain words on event rates: which variant to choose when its expected loss is small enough, or that more data is needed.
 * @customfunction EVENTS_DECISION
 * @helpurl https://localhost:3000/help/EVENTS_DECISION.html
 * @param events Events of each variant (2 to 50 variants; whole numbers, 0 or more).
 * @param exposure Exposure of each variant, same shape as events (greater than 0).
 * @param [max_loss] The largest expected loss you accept, in events per unit of exposure, 0 to 1E+12 (optional; default 1% of the control's posterior mean rate).
 * @param [labels] Names of the variants, same shape as events (optional; default A, B, C… by position).
 * @param [prior_shape] Gamma prior shape, 0.001 to 1E+6 (optional; default 1).
 * @param [prior_rate] Gamma prior rate, 0 to 1E+12 (optional; default 0, flat on the rate).
 * @returns One text cell: the variant to choose, or that more data is needed, naming the leader and its expected loss in events per unit of exposure.
 * @method DECISION's rule on event rates: the variant with the smallest expected loss is chosen when that loss is at most the largest acceptable loss; otherwise the text names the current leader and its loss.
 * @source Expected-loss stopping rule: C. Stucchio, "Bayesian A/B Testing at VWO" (2015).
 * @example =ABTEST.EVENTS_DECISION({340;395}, {1000;1010}) returns "Choose B: its expected loss 0.00030 events per unit of exposure is within the 0.0034 events per unit of exposure allowed"
 * @caution This is a decision aid, not a guarantee. A broken traffic split (check SRM_PVALUE), peeking every day, or a strong prior can all mislead it. For regulated or health-related decisions, ask a qualified statistician and follow local rules.
 */
export function eventsDecision(
  events: any[][],
  exposure: any[][],
  max_loss?: number,
  labels?: any[][],
  prior_shape?: number,
  prior_rate?: number,
): string {
  return runFunction(CATALOGUE.EVENTS_DECISION, { events, exposure, max_loss, labels, prior_shape, prior_rate }, (a) =>
    amountDecisionCell(
      a.table,
      a.labels,
      eventRates.eventsDecide(a.variants, a.max_loss, a.prior),
      'events per unit of exposure',
    ),
  );
}
