/* eslint-disable @typescript-eslint/no-explicit-any -- Excel passes ranges as any[][] (blanks must stay blank) */
/**
 * The worksheet functions of the family "checking": the traffic split.
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
import { srmPValue } from '../stats/srm';

/**
 * Checks the traffic split: the p-value of the chi-square test of the observed visitors against the planned shares. A tiny value (below about 0.001) says the split is broken (sample ratio mismatch) and the results should not be trusted.
 * @customfunction SRM_PVALUE
 * @helpurl https://localhost:3000/help/SRM_PVALUE.html
 * @param visitors Visitors of each variant (2 to 50 variants in a row or a column; whole numbers, 0 or more).
 * @param [planned_shares] Planned share of each variant, same shape as visitors, positive weights from 1E-6 to 1E+12 (optional; default equal shares).
 * @returns A p-value between 0 and 1.
 * @method Pearson's chi-square goodness-of-fit statistic with k − 1 degrees of freedom; the upper tail is computed directly so tiny p-values keep their digits.
 * @source Sample ratio mismatch: A. Fabijan et al., "Diagnosing Sample Ratio Mismatch in Online Controlled Experiments", KDD 2019.
 * @example =ABTEST.SRM_PVALUE({50410;49590}) returns 0.0095124
 * @crosscheck =CHISQ.TEST(observed, expected) with expected = total visitors × share ÷ sum of shares.
 * @caution A broken split usually means a bug in assignment or tracking; fix it before reading any other result. Below about 0.001 is the usual alarm level (common practice).
 */
export function srmPvalue(visitors: any[][], planned_shares?: any[][]): number {
  return runFunction(CATALOGUE.SRM_PVALUE, { visitors, planned_shares }, (a) =>
    srmPValue(
      a.variants.map((v) => v.visitors),
      a.planned_shares,
    ),
  );
}
