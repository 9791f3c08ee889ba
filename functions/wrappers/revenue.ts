/* eslint-disable @typescript-eslint/no-explicit-any -- Excel passes ranges as any[][] (blanks must stay blank) */
/**
 * The worksheet functions of the family "revenue": revenue per visitor from the totals an analytics export
 * gives per variant (orders, visitors, total revenue, and optionally the standard deviation of order
 * values).
 *
 * Each wrapper is one runFunction call: its catalogue entry (functions/catalogue.ts) says how to read the
 * arguments and how the result spills; the body only calls the statistics core
 * (functions/stats/revenuePerVisitor.ts). The JSDoc is the one home of each function's words:
 * custom-functions-metadata turns the description and @param lines into Excel's formula help, and
 * help/build.js turns all of it into the help pages and the side panel's texts. The @example results were
 * checked against the nested scipy quadrature of test/reference/revenue/revenue_reference.py (the case
 * "exp_typical" and "t_typical" there use the same totals); test/addin/examples.test.ts runs them.
 */
import { CATALOGUE } from '../catalogue';
import { POSTERIOR_TABLES } from '../posteriorTables';
import { amountDecisionCell, intervalRows, medianRows, runFunction } from '../sheet';
import * as revenuePerVisitor from '../stats/revenuePerVisitor';
import type { RevenueTotals } from '../stats/revenuePerVisitor';

/** The variants' totals with each one's order_sd when the argument is given. */
function totals(
  variants: readonly { readonly orders: number; readonly visitors: number; readonly revenue: number }[],
  orderSd: readonly number[] | undefined,
): RevenueTotals[] {
  return variants.map((v, i) => (orderSd === undefined ? { ...v } : { ...v, orderSd: orderSd[i] as number }));
}

/**
 * Credible interval for each variant's revenue per visitor (conversion rate × average order value), from its orders, visitors and total revenue. Spills lower and upper bound per variant, in the revenue's currency per visitor.
 * @customfunction REVENUE_INTERVAL
 * @helpurl https://localhost:3000/help/REVENUE_INTERVAL.html
 * @param orders Orders of each variant (a row or a column of whole numbers, at most its visitors; the first is the control).
 * @param visitors Visitors of each variant, same shape as orders (whole numbers, 1 or more).
 * @param revenue Total revenue of each variant, same shape as orders (0 or more, in any currency).
 * @param [order_sd] Standard deviation of each variant's order values, as STDEV.S gives (0, or at least 0.1% of revenue/orders; optional, by default left out: order values are then taken as exponential).
 * @param [level] Probability the interval holds, 0.01 to 0.9999 (optional; default 0.95).
 * @returns Lower and upper bound of each variant's revenue per visitor (same currency as revenue).
 * @method Revenue per visitor is rate × order value, independent: rate ~ Beta(1 + orders, 1 + visitors − orders); order value exponential with 1/value ~ Gamma(orders, revenue), or with an order sd s a Student t (orders − 1 df, centre revenue/orders, scale s/√orders). Its distribution is a one-dimensional integral over the rate, tabulated and read at its central quantiles.
 * @source Beta–Binomial and Gamma posteriors: Gelman et al., Bayesian Data Analysis, 3rd ed. (2013), §2.4–2.6 and §3.2; the product's density by quadrature (checked against nested scipy quadrature).
 * @example =ABTEST.REVENUE_INTERVAL({120;150}, {2400;2380}, {7200;8100}) returns {2.3547,3.8818;2.7402,4.2785}
 * @crosscheck The point estimate =revenue/visitors lies inside each interval.
 * @caution Without order_sd, order values are taken as exponential: that understates the spread when a few orders are very large (give order_sd, from STDEV.S of the order values, if you have it).
 * @caution No currency is assumed: the results are in the currency of revenue, per visitor.
 */
export function revenueInterval(
  orders: any[][],
  visitors: any[][],
  revenue: any[][],
  order_sd?: any[][],
  level?: number,
): any[][] {
  return runFunction(CATALOGUE.REVENUE_INTERVAL, { orders, visitors, revenue, order_sd, level }, (a) =>
    intervalRows(revenuePerVisitor.revenueInterval(totals(a.variants, a.order_sd), a.level, POSTERIOR_TABLES)),
  );
}

/**
 * Probability that each variant has the highest revenue per visitor. The values add up to 1.
 * @customfunction REVENUE_PROB_HIGHEST
 * @helpurl https://localhost:3000/help/REVENUE_PROB_HIGHEST.html
 * @param orders Orders of each variant (2 to 50 variants in a row or a column; whole numbers, at most its visitors; the first is the control).
 * @param visitors Visitors of each variant, same shape as orders (whole numbers, 1 or more).
 * @param revenue Total revenue of each variant, same shape as orders (0 or more, in any currency).
 * @param [order_sd] Standard deviation of each variant's order values, as STDEV.S gives (0, or at least 0.1% of revenue/orders; optional, by default left out: order values are then taken as exponential).
 * @returns For each variant, the probability (0 to 1) that its revenue per visitor is the highest.
 * @method P(i highest) = ∫ f_i ∏_{j≠i} F_j over the tabulated posteriors of revenue per visitor (rate × order value), by quadrature.
 * @source Expected-value comparisons of posteriors: Gelman et al., Bayesian Data Analysis, 3rd ed. (2013); the product model of the revenue interval.
 * @example =ABTEST.REVENUE_PROB_HIGHEST({120;150}, {2400;2380}, {7200;8100}) returns {0.23293;0.76707}
 * @caution With many variants the best-looking one is often lucky; decide the number of variants in advance.
 * @caution Without order_sd, order values are taken as exponential: that understates the spread when a few orders are very large.
 */
export function revenueProbHighest(orders: any[][], visitors: any[][], revenue: any[][], order_sd?: any[][]): any[][] {
  return runFunction(CATALOGUE.REVENUE_PROB_HIGHEST, { orders, visitors, revenue, order_sd }, (a) =>
    revenuePerVisitor.revenueProbHighest(totals(a.variants, a.order_sd), POSTERIOR_TABLES),
  );
}

/**
 * Probability that each challenger's revenue per visitor beats the control's (the first variant). Spills one value per variant, with an empty cell in the control's place.
 * @customfunction REVENUE_PROB_ABOVE_CONTROL
 * @helpurl https://localhost:3000/help/REVENUE_PROB_ABOVE_CONTROL.html
 * @param orders Orders of each variant (2 to 50 variants in a row or a column; whole numbers, at most its visitors; the first is the control).
 * @param visitors Visitors of each variant, same shape as orders (whole numbers, 1 or more).
 * @param revenue Total revenue of each variant, same shape as orders (0 or more, in any currency).
 * @param [order_sd] Standard deviation of each variant's order values, as STDEV.S gives (0, or at least 0.1% of revenue/orders; optional, by default left out: order values are then taken as exponential).
 * @returns For each challenger, P(its revenue per visitor > the control's); empty text for the control.
 * @method P(B > A) = ∫ f_B F_A over the tabulated posteriors of revenue per visitor, the smaller of the pair integrated directly.
 * @source The product model of the revenue interval; with exponential order values checked against a closed form: given both rates, P(B > A) = I_x(orders_B, orders_A) with x from the rates and revenues, averaged over the rates (derived in the revenue reference script in test/reference).
 * @example =ABTEST.REVENUE_PROB_ABOVE_CONTROL({120;150}, {2400;2380}, {7200;8100}) returns {"";0.76707}
 * @caution Stopping the first time this passes 95% (peeking) makes false wins more likely; check the traffic split with SRM_PVALUE.
 * @caution Without order_sd, order values are taken as exponential: that understates the spread when a few orders are very large.
 */
export function revenueProbAboveControl(
  orders: any[][],
  visitors: any[][],
  revenue: any[][],
  order_sd?: any[][],
): any[][] {
  return runFunction(CATALOGUE.REVENUE_PROB_ABOVE_CONTROL, { orders, visitors, revenue, order_sd }, (a) =>
    revenuePerVisitor.revenueProbAboveControl(totals(a.variants, a.order_sd), POSTERIOR_TABLES),
  );
}

/**
 * Credible interval for each challenger's relative lift in revenue per visitor over the control (its revenue per visitor / the control's − 1). Spills lower, median and upper per challenger, with empty cells in the control's place.
 * @customfunction REVENUE_LIFT_INTERVAL
 * @helpurl https://localhost:3000/help/REVENUE_LIFT_INTERVAL.html
 * @param orders Orders of each variant (2 to 50 variants in a row or a column; whole numbers, at most its visitors; the first is the control).
 * @param visitors Visitors of each variant, same shape as orders (whole numbers, 1 or more).
 * @param revenue Total revenue of each variant, same shape as orders (0 or more, in any currency).
 * @param [order_sd] Standard deviation of each variant's order values, as STDEV.S gives (0, or at least 0.1% of revenue/orders; optional, by default left out: order values are then taken as exponential).
 * @param [level] Probability the interval holds, 0.01 to 0.9999 (optional; default 0.95).
 * @returns For each challenger, the lower, median and upper relative lift (0.1 is 10% more revenue per visitor); empty text for the control.
 * @method Quantiles of the ratio of the tabulated posteriors (Newton's method on the smaller tail). With an order sd, a control whose average order value could be zero or negative (chance above 1e-6) has no lift (#N/A), as for averages; below that its small negative part is kept exactly.
 * @source The product model of the revenue interval; quantiles checked against nested scipy quadrature and brentq.
 * @example =ABTEST.REVENUE_LIFT_INTERVAL({120;150}, {2400;2380}, {7200;8100}) returns {"","","";-0.18965,0.13256,0.58286}
 * @caution A wide interval means the data cannot yet tell; a few large orders can swing revenue more than conversions.
 * @caution Without order_sd, order values are taken as exponential: that understates the spread when a few orders are very large.
 */
export function revenueLiftInterval(
  orders: any[][],
  visitors: any[][],
  revenue: any[][],
  order_sd?: any[][],
  level?: number,
): any[][] {
  return runFunction(CATALOGUE.REVENUE_LIFT_INTERVAL, { orders, visitors, revenue, order_sd, level }, (a) =>
    medianRows(revenuePerVisitor.revenueLiftInterval(totals(a.variants, a.order_sd), a.level, POSTERIOR_TABLES)),
  );
}

/**
 * Probability that each challenger's revenue per visitor is more than min_lift above the control's; a negative min_lift asks "no worse than" (−0.02: at most 2% lower). Spills one value per variant, with an empty cell in the control's place.
 * @customfunction REVENUE_PROB_LIFT_ABOVE
 * @helpurl https://localhost:3000/help/REVENUE_PROB_LIFT_ABOVE.html
 * @param orders Orders of each variant (2 to 50 variants in a row or a column; whole numbers, at most its visitors; the first is the control).
 * @param visitors Visitors of each variant, same shape as orders (whole numbers, 1 or more).
 * @param revenue Total revenue of each variant, same shape as orders (0 or more, in any currency).
 * @param min_lift The relative lift to beat, as a fraction greater than -1 and at most 1 (0.05 is 5% more revenue per visitor; −0.02 asks "no worse than 2% lower").
 * @param [order_sd] Standard deviation of each variant's order values, as STDEV.S gives (0, or at least 0.1% of revenue/orders; optional, by default left out: order values are then taken as exponential).
 * @returns For each challenger, P(its revenue per visitor / the control's − 1 > min_lift); empty text for the control.
 * @method The upper tail of the ratio of the tabulated posteriors, P(R_B > (1 + m)·R_A) with m the minimum lift, integrated directly (accurate far into the tail).
 * @source The product model of the revenue interval; checked against nested scipy quadrature.
 * @example =ABTEST.REVENUE_PROB_LIFT_ABOVE({120;150}, {2400;2380}, {7200;8100}, -0.02) returns {"";0.80165}
 * @caution A guardrail read this way ("no worse than −2%") is only as good as the traffic split; check SRM_PVALUE.
 * @caution Without order_sd, order values are taken as exponential: that understates the spread when a few orders are very large.
 */
export function revenueProbLiftAbove(
  orders: any[][],
  visitors: any[][],
  revenue: any[][],
  min_lift: number,
  order_sd?: any[][],
): any[][] {
  return runFunction(CATALOGUE.REVENUE_PROB_LIFT_ABOVE, { orders, visitors, revenue, min_lift, order_sd }, (a) =>
    revenuePerVisitor.revenueProbLiftAbove(totals(a.variants, a.order_sd), a.min_lift, POSTERIOR_TABLES),
  );
}

/**
 * Expected loss of choosing each variant: the revenue per visitor given up on average if it is not the best, in the revenue's currency per visitor.
 * @customfunction REVENUE_EXPECTED_LOSS
 * @helpurl https://localhost:3000/help/REVENUE_EXPECTED_LOSS.html
 * @param orders Orders of each variant (2 to 50 variants in a row or a column; whole numbers, at most its visitors; the first is the control).
 * @param visitors Visitors of each variant, same shape as orders (whole numbers, 1 or more).
 * @param revenue Total revenue of each variant, same shape as orders (0 or more, in any currency).
 * @param [order_sd] Standard deviation of each variant's order values, as STDEV.S gives (0, or at least 0.1% of revenue/orders; optional, by default left out: order values are then taken as exponential).
 * @returns For each variant, E[max over variants of revenue per visitor − its revenue per visitor] (same currency as revenue, per visitor).
 * @method loss_i = ∫ F_i (1 − ∏_{j≠i} F_j) dR over the tabulated posteriors, by quadrature. With 1 order (no order sd) or 2 orders (with an order sd) the average order value has no finite mean: #N/A.
 * @source Expected loss: C. Stucchio, "Bayesian A/B Testing at VWO" (2015); the product model of the revenue interval.
 * @example =ABTEST.REVENUE_EXPECTED_LOSS({120;150}, {2400;2380}, {7200;8100}) returns {0.47465;0.076383}
 * @caution Without order_sd, order values are taken as exponential: that understates the spread when a few orders are very large.
 */
export function revenueExpectedLoss(orders: any[][], visitors: any[][], revenue: any[][], order_sd?: any[][]): any[][] {
  return runFunction(CATALOGUE.REVENUE_EXPECTED_LOSS, { orders, visitors, revenue, order_sd }, (a) =>
    revenuePerVisitor.revenueExpectedLoss(totals(a.variants, a.order_sd), POSTERIOR_TABLES),
  );
}

/**
 * A one-cell verdict in plain words on revenue per visitor: which variant to choose when its expected loss is small enough, or that more data is needed.
 * @customfunction REVENUE_DECISION
 * @helpurl https://localhost:3000/help/REVENUE_DECISION.html
 * @param orders Orders of each variant (2 to 50 variants in a row or a column; whole numbers, at most its visitors; the first is the control).
 * @param visitors Visitors of each variant, same shape as orders (whole numbers, 1 or more).
 * @param revenue Total revenue of each variant, same shape as orders (0 or more, in any currency).
 * @param [order_sd] Standard deviation of each variant's order values, as STDEV.S gives (0, or at least 0.1% of revenue/orders; optional, by default left out: order values are then taken as exponential).
 * @param [max_loss] The largest expected loss you accept, in the revenue's currency per visitor, 0 to 1E+12 (optional; default 1% of the control's posterior mean revenue per visitor).
 * @param [labels] Names of the variants, same shape as orders (optional; default A, B, C… by position).
 * @returns One text cell: the variant to choose, or that more data is needed, naming the leader and its expected loss per visitor (no currency symbol: the add-in cannot know the currency).
 * @method DECISION's rule on revenue per visitor: the variant with the smallest expected loss is chosen when that loss is at most the largest acceptable loss; otherwise the text names the current leader and its loss.
 * @source Expected-loss stopping rule: C. Stucchio, "Bayesian A/B Testing at VWO" (2015).
 * @example =ABTEST.REVENUE_DECISION({120;150}, {2400;2380}, {7200;8100}) returns "Keep collecting data: B leads, but its expected loss 0.076 per visitor is above the 0.030 per visitor allowed"
 * @caution This is a decision aid, not a guarantee. A broken traffic split (check SRM_PVALUE), peeking every day, or very large single orders can all mislead it. For regulated or health-related decisions, ask a qualified statistician and follow local rules.
 * @caution Without order_sd, order values are taken as exponential: that understates the spread when a few orders are very large.
 */
export function revenueDecision(
  orders: any[][],
  visitors: any[][],
  revenue: any[][],
  order_sd?: any[][],
  max_loss?: number,
  labels?: any[][],
): string {
  return runFunction(CATALOGUE.REVENUE_DECISION, { orders, visitors, revenue, order_sd, max_loss, labels }, (a) =>
    amountDecisionCell(
      a.table,
      a.labels,
      revenuePerVisitor.revenueDecide(totals(a.variants, a.order_sd), a.max_loss, POSTERIOR_TABLES),
      'per visitor',
    ),
  );
}
