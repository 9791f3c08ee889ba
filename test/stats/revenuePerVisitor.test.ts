/**
 * Revenue per visitor from totals (functions/stats/revenuePerVisitor.ts) against an outside reference:
 * test/reference/revenue/revenue_reference.py → revenue_values.json, nested scipy.integrate.quad (QUADPACK,
 * epsrel 1e-12) of the product model R = p × v, with brentq for interval ends and lift quantiles; for
 * exponential order values also P(R_B > R_A) through the closed-form inner probability I_x(a_B, a_A)
 * averaged over both rates (derived in the script). The totals are invented.
 */
import reference from '../reference/revenue/revenue_values.json';
import tenReference from '../reference/revenue/revenue_ten_values.json';
import cornerReference from '../reference/revenue/revenue_corner_values.json';
import {
  revenueDecide,
  revenueExpectedLoss,
  revenueInterval,
  revenueLiftInterval,
  revenueMean,
  revenueProbAboveControl,
  revenueProbHighest,
  revenueProbLiftAbove,
} from '../../functions/stats/revenuePerVisitor';
import type { RevenueTotals } from '../../functions/stats/revenuePerVisitor';
import { betaCdf } from '../../functions/stats/special/incompleteBeta';
import { TableMemo } from '../../functions/stats/tableMemo';
import { expectProbability, expectStatsErrorExact, thrownStatsError } from '../helpers/assertions';

interface Case {
  name: string;
  variants: RevenueTotals[];
  level: number;
  intervals: number[][];
  probHighest: number[];
  probAboveControl: number[];
  probBelowControl: number[];
  pGreaterClosedForm?: number[];
  expectedLoss?: number[];
  liftAbove?: { minLift: number; above: number; below: number }[];
  liftInterval?: number[];
  controlNegative?: number;
}

const cases = reference.cases as unknown as Case[];

/** |got − want| ≤ 1e-9 relative (interval ends and lifts are values, not probabilities). */
function expectValue(got: number, want: number, scale = Math.abs(want)): void {
  expect(Math.abs(got - want)).toBeLessThanOrEqual(1e-9 * Math.max(scale, 1e-300));
}

describe.each(cases.map((c) => [c.name, c]))(
  'revenue per visitor against nested scipy quadrature: %s',
  (_name, kase) => {
    const c = kase as Case;

    test('interval ends (95%) within 1e-9 relative', () => {
      const got = revenueInterval(c.variants, c.level);
      c.intervals.forEach(([lower = NaN, upper = NaN], i) => {
        expectValue(got[i]?.lower ?? NaN, lower);
        expectValue(got[i]?.upper ?? NaN, upper);
      });
    });

    test('P(highest) within 1e-9 (tails 1e-6 relative); the values sum to 1', () => {
      const got = revenueProbHighest(c.variants);
      c.probHighest.forEach((want, i) => expectProbability(got[i] ?? NaN, want));
      expect(Math.abs(got.reduce((s, x) => s + x, 0) - 1)).toBeLessThanOrEqual(1e-14);
    });

    test('P(above control) within 1e-9, and the other direction (variants swapped) in its own tail', () => {
      const got = revenueProbAboveControl(c.variants);
      c.probAboveControl.forEach((want, i) => expectProbability(got[i] ?? NaN, want));
      c.probBelowControl.forEach((want, i) => {
        const swapped = revenueProbAboveControl([c.variants[i + 1] as RevenueTotals, c.variants[0] as RevenueTotals]);
        expectProbability(swapped[0] ?? NaN, want);
        expect(Math.abs((swapped[0] ?? NaN) + (got[i] ?? NaN) - 1)).toBeLessThanOrEqual(1e-12);
      });
    });

    if (c.pGreaterClosedForm !== undefined) {
      test('P(above control) matches the closed-form inner probability I_x(a_B, a_A) averaged over the rates', () => {
        const got = revenueProbAboveControl(c.variants);
        (c.pGreaterClosedForm as number[]).forEach((want, i) => expectProbability(got[i] ?? NaN, want));
      });
    }

    if (c.expectedLoss !== undefined) {
      test('expected losses within 1e-9 of the scale of revenue per visitor', () => {
        const got = revenueExpectedLoss(c.variants);
        const scale = Math.max(...revenueMean(c.variants));
        (c.expectedLoss as number[]).forEach((want, i) => expectValue(got[i] ?? NaN, want, scale));
      });
    } else {
      test('expected losses are not available (a variant has no finite mean)', () => {
        const e = thrownStatsError(() => revenueExpectedLoss(c.variants));
        expect(e.code).toBe('not_available');
        expect(e.message).toMatch(
          /^orders, item 1: with [12] orders? .* has no finite mean, so every expected loss is infinite/,
        );
      });
    }

    if (c.liftAbove !== undefined && c.liftInterval !== undefined && (c.controlNegative ?? 0) <= 1e-6) {
      test('P(lift > min_lift) within 1e-9 (tails 1e-6 relative), the control kept over both signs', () => {
        for (const l of c.liftAbove as { minLift: number; above: number; below: number }[]) {
          const got = revenueProbLiftAbove(c.variants.slice(0, 2), l.minLift);
          expectProbability(got[0] ?? NaN, l.above);
        }
      });

      test('lift interval (lower, median, upper) within 1e-9', () => {
        const got = revenueLiftInterval(c.variants.slice(0, 2), c.level)[0];
        const [lower = NaN, median = NaN, upper = NaN] = c.liftInterval as number[];
        expectValue(got?.lower ?? NaN, lower, Math.max(1, Math.abs(lower)));
        expectValue(got?.median ?? NaN, median, Math.max(1, Math.abs(median)));
        expectValue(got?.upper ?? NaN, upper, Math.max(1, Math.abs(upper)));
      });
    } else if ((c.controlNegative ?? 0) > 1e-6) {
      test("the control's order value could plausibly be ≤ 0: the lift is not available, as MEAN_LIFT_INTERVAL", () => {
        for (const run of [() => revenueLiftInterval(c.variants, 0.95), () => revenueProbLiftAbove(c.variants, 0)]) {
          const e = thrownStatsError(run);
          expect(e.code).toBe('not_available');
          expect(e.message).toMatch(
            /^order_sd, item 1: the control's average order value could plausibly be zero or negative \(/,
          );
        }
      });
    }
  },
);

describe('ten variants with order_sd against a one-level scipy reference (revenue_ten_reference.py)', () => {
  // Each variant's f_R, F_R and S_R by one scipy quad over the rate per outer node (the product-distribution
  // formula), the outer integrals by composite Gauss-Legendre over log R at two panel counts; the JSON
  // states an error bound per value (outer-rule difference + inner quad estimates + mass outside the
  // window), all below 1e-12, so a 1e-9 check against it is a check of our values, not of the reference.
  const t = tenReference;
  const variants = t.variants as RevenueTotals[];

  test('the reference is as tight as it says: bounds below 1e-12, P(highest) sums to 1, nothing below R = 0', () => {
    for (const b of [...t.probHighestErrorBound, ...t.probAboveControlErrorBound, ...t.expectedLossErrorBound]) {
      expect(b).toBeLessThan(1e-12);
    }
    expect(Math.abs(t.probHighest.reduce((s, x) => s + x, 0) - 1)).toBeLessThan(1e-12);
    expect(Math.max(...t.negativeMass)).toBeLessThan(1e-15);
  });

  test('P(highest) of all ten within 1e-9 (tails 1e-6 relative)', () => {
    const got = revenueProbHighest(variants);
    t.probHighest.forEach((want, i) => expectProbability(got[i] ?? NaN, want));
  });

  test('expected losses of all ten within 1e-9 of the scale of revenue per visitor', () => {
    const got = revenueExpectedLoss(variants);
    const scale = Math.max(...revenueMean(variants));
    t.expectedLoss.forEach((want, i) => expectValue(got[i] ?? NaN, want, scale));
  });

  test('P(variant 2 above the control) within 1e-9', () => {
    expectProbability(revenueProbAboveControl(variants.slice(0, 2))[0] ?? NaN, t.probAboveControl[0] ?? NaN);
  });
});

describe.each(cornerReference.map((c) => [c.name, c]))(
  'the smallest order_sd allowed (0.1% of revenue/orders) against the one-level scipy reference: %s',
  (_name, kase) => {
    // revenue_ten_reference.py: every visitor ordering (the rate piled against p = 1, R with a cliff at
    // revenue/orders; before the mode search's step bound this answered #N/A) and few; bounds < 1e-11.
    const c = kase as typeof tenReference;
    const variants = c.variants as RevenueTotals[];

    test('the reference is as tight as it says (bounds below 1e-11)', () => {
      for (const b of [...c.probHighestErrorBound, ...c.probAboveControlErrorBound, ...c.expectedLossErrorBound]) {
        expect(b).toBeLessThan(1e-11);
      }
    });

    test('P(highest), P(above control) within 1e-9; expected losses within 1e-9 of the scale', () => {
      const got = revenueProbHighest(variants);
      c.probHighest.forEach((want, i) => expectProbability(got[i] ?? NaN, want));
      expectProbability(revenueProbAboveControl(variants)[0] ?? NaN, c.probAboveControl[0] ?? NaN);
      const losses = revenueExpectedLoss(variants);
      const scale = Math.max(...revenueMean(variants));
      c.expectedLoss.forEach((want, i) => expectValue(losses[i] ?? NaN, want, scale));
    });
  },
);

describe('the order value alone: the exponential model in the limit of certain, equal rates', () => {
  const o = reference.orderValueOnly;

  test('the closed form P(v_B > v_A) = I_y(a_B, a_A), y = b_B/(b_A + b_B), is what quadrature gives (reference)', () => {
    expect(Math.abs(o.closedForm - o.quadrature)).toBeLessThanOrEqual(1e-12);
  });

  test('P(R_B > R_A) approaches it as every visitor orders (p → 1) with equal orders', () => {
    // With orders = visitors = n the rates are iid Beta(n + 1, 1): log p_B − log p_A has mean 0 and
    // variance 2/(n + 1)² against the order values' 2/n, so R_B > R_A differs from v_B > v_A by about
    // φ(z)·|z|/(2n) < 1e-5 at n = 1e5 (a normal approximation, common practice).
    const n = 100000;
    const got = revenueProbAboveControl([
      { orders: n, visitors: n, revenue: 60 * n },
      { orders: n, visitors: n, revenue: 60.05 * n },
    ])[0] as number;
    // P(v_B > v_A) = P(λ_B < λ_A) = I_y(n, n), y = β_B/(β_A + β_B) (the closed form checked above)
    const closed = betaCdf((60.05 * n) / (60 * n + 60.05 * n), n, n);
    expect(closed).toBeGreaterThan(0.55);
    expect(Math.abs(got - closed)).toBeLessThanOrEqual(1e-5);
  });
});

describe('edge cases: what the model says, and clear errors', () => {
  const typical: RevenueTotals[] = [
    { orders: 120, visitors: 2400, revenue: 7200 },
    { orders: 150, visitors: 2380, revenue: 8100 },
  ];

  test('0 orders: no posterior for that variant (#N/A naming it); revenue must then be 0', () => {
    expectStatsErrorExact(
      () => revenueProbAboveControl([typical[0] as RevenueTotals, { orders: 0, visitors: 300, revenue: 0 }]),
      'not_available',
      "orders, item 2: no orders yet, so nothing is known about this variant's order value and its revenue per " +
        'visitor has no posterior; wait for its first order',
    );
    expectStatsErrorExact(
      () => revenueProbAboveControl([typical[0] as RevenueTotals, { orders: 0, visitors: 300, revenue: 35 }]),
      'invalid_argument',
      'revenue, item 2: 35 with 0 orders; revenue comes from orders, so it is 0 while orders is 0',
    );
  });

  test('exponential order values with revenue 0: not available; 1 order with order_sd: not available', () => {
    expectStatsErrorExact(
      () => revenueInterval([{ orders: 3, visitors: 300, revenue: 0 }]),
      'not_available',
      'revenue, item 1: 0 from 3 orders; with exponential order values a total of 0 has no posterior; give order_sd ' +
        '(the t model) if orders can be free',
    );
    expectStatsErrorExact(
      () => revenueInterval([{ orders: 1, visitors: 300, revenue: 20, orderSd: 0 }]),
      'not_available',
      'orders, item 1: 1 order, and order_sd needs at least 2 (STDEV.S of one value has no meaning); leave order_sd out ' +
        'to use exponential order values',
    );
    expectStatsErrorExact(
      () => revenueInterval([{ orders: 5, visitors: 300, revenue: 0, orderSd: 0 }]),
      'not_available',
      'revenue, item 1: 0 with order_sd 0, so every order was free and revenue per visitor is exactly 0; there is ' +
        'nothing uncertain to compare',
    );
  });

  test('1 order without order_sd is answered (intervals, probabilities); its expected loss is infinite', () => {
    const v: RevenueTotals[] = [
      { orders: 1, visitors: 50, revenue: 40 },
      { orders: 3, visitors: 55, revenue: 150 },
    ];
    expect(revenueProbAboveControl(v)[0]).toBeGreaterThan(0.5);
    expect(revenueMean(v)[0]).toBe(Infinity);
    expectStatsErrorExact(
      () => revenueDecide(v, undefined),
      'not_available',
      "orders, item 1: with 1 order the exponential model's average order value has no finite mean, so every " +
        'expected loss is infinite; wait for a second order (or give order_sd once there are 3)',
    );
  });

  test('order_sd 0: every order the same value, R = value × rate exactly (P(R < x) is a Beta cdf)', () => {
    const [interval] = revenueInterval([{ orders: 60, visitors: 1500, revenue: 1800, orderSd: 0 }], 0.9);
    // R = 30·p with p ~ Beta(61, 1441): its 5% point is 30 × the Beta's 5% point
    expect(Math.abs(betaCdf((interval?.lower ?? NaN) / 30, 61, 1441) - 0.05)).toBeLessThanOrEqual(1e-12);
    expect(Math.abs(betaCdf((interval?.upper ?? NaN) / 30, 61, 1441) - 0.95)).toBeLessThanOrEqual(1e-12);
  });

  test('an order_sd below 0.1% of revenue/orders is refused naming it, its item, the average order value and the least allowed', () => {
    // The fuzzer's inputs: order values known to 1e-9 of their size answered #N/A from deep inside the tabulation.
    const tiny = [
      { orders: 30, visitors: 30, revenue: 2e10, orderSd: 1 },
      { orders: 20, visitors: 20, revenue: 9e11, orderSd: 1 },
    ];
    for (const run of [() => revenueExpectedLoss(tiny), () => revenueProbHighest(tiny), () => revenueInterval(tiny)]) {
      expectStatsErrorExact(
        run,
        'invalid_argument',
        "order_sd, item 1: 1 is below 0.1% of this variant's average order value (revenue/orders = 6.67E+8); " +
          'enter 0 if every order had about the same value, or an order_sd of at least 667000',
      );
    }
    expectStatsErrorExact(
      () =>
        revenueProbAboveControl([
          { orders: 30, visitors: 3000, revenue: 1500, orderSd: 0.05 },
          { orders: 20, visitors: 3000, revenue: 1000, orderSd: 0.0499 },
        ]),
      'invalid_argument',
      "order_sd, item 2: 0.0499 is below 0.1% of this variant's average order value (revenue/orders = 50); " +
        'enter 0 if every order had about the same value, or an order_sd of at least 0.05',
    );
    // At the bound itself (0.05 on 50) and with order_sd 0 the read-out is given.
    const atBound = revenueProbAboveControl([
      { orders: 30, visitors: 3000, revenue: 1500, orderSd: 0.05 },
      { orders: 20, visitors: 3000, revenue: 1000, orderSd: 0 },
    ]);
    expect(atBound[0]).toBeGreaterThan(0);
    expect(atBound[0]).toBeLessThan(1);
  });

  test('spreads 1e16 apart (2^53 visitors beside 3): each in its own frame up to 10 variants, then a plain refusal', () => {
    // The fuzzer's input: in one shared frame the narrow variant ran out of panels ("too many panels").
    const wide = { orders: 3, visitors: 3, revenue: 846058422356.3014, orderSd: 711919178735.5414 };
    const narrow = { orders: 20, visitors: 2 ** 53, revenue: 436145082125.52026, orderSd: 297241341565.16534 };
    const pair = [wide, narrow];
    const highest = revenueProbHighest(pair);
    expect(Math.abs((highest[0] ?? NaN) + (highest[1] ?? NaN) - 1)).toBeLessThanOrEqual(1e-12);
    // loss_i − loss_j = mean_j − mean_i (E[max − R_i] − E[max − R_j]; a closed-form identity).
    const [lossWide = NaN, lossNarrow = NaN] = revenueExpectedLoss(pair);
    const [meanWide = NaN, meanNarrow = NaN] = revenueMean(pair);
    expectValue(lossWide - lossNarrow, meanNarrow - meanWide, meanWide);
    const many = Array.from({ length: 12 }, (_, i) => (i % 2 === 0 ? wide : narrow));
    expectStatsErrorExact(
      () => revenueExpectedLoss(many),
      'not_available',
      "variant 2: the spread of its revenue per visitor is about 4.68E-16 of the widest variant's, too far apart " +
        'to compare 12 variants at once (at most 10 when spreads differ this much); compare it in a smaller group',
    );
  });

  test('every visitor ordering at 2^53 visitors: 1 + visitors − orders is formed without rounding to 0', () => {
    // The fuzzer's input answered "the Beta shape b must be a finite number > 0, not 0" (1 + 2^53 rounds to
    // 2^53). Here p ~ Beta(2^53 + 1, 1) is 1 to ~1e-16, so R is the order value: revenue/Gamma(N, 1), whose
    // 95% interval is (revenue/N)·(1 ∓ 1.959964/√N) to O(1/N) (normal approximation of the gamma; common
    // practice), i.e. to far below 1e-9 of the value at N = 2^53.
    const n = 2 ** 53;
    const revenue = 649641075437.9663;
    const [got] = revenueInterval([{ orders: n, visitors: n, revenue }], 0.95);
    expectValue(got?.lower ?? NaN, (revenue / n) * (1 - 1.959963984540054 / Math.sqrt(n)));
    expectValue(got?.upper ?? NaN, (revenue / n) * (1 + 1.959963984540054 / Math.sqrt(n)));
    const highest = revenueProbHighest([
      { orders: n, visitors: n, revenue },
      { orders: n, visitors: n, revenue: 446233345208.28906 },
    ]);
    expect(highest).toEqual([1, 0]);
  });

  test('argument checks name the argument and the item', () => {
    expectStatsErrorExact(
      () => revenueInterval([{ orders: 130, visitors: 120, revenue: 10 }]),
      'invalid_argument',
      'orders, item 1: 130 is more than its visitors (120); count each ordering visitor once',
    );
    expectStatsErrorExact(
      () => revenueInterval([{ orders: 2.5, visitors: 120, revenue: 10 }]),
      'invalid_argument',
      'orders, item 1: 2.5 is not a whole number',
    );
    expectStatsErrorExact(
      () => revenueInterval([{ orders: 2, visitors: 120, revenue: -10 }]),
      'invalid_argument',
      'revenue, item 1: -10 is below 0; total revenue is 0 or more',
    );
    expectStatsErrorExact(
      () =>
        revenueProbHighest([
          { orders: 2, visitors: 120, revenue: 10, orderSd: 3 },
          { orders: 3, visitors: 120, revenue: 10 },
        ]),
      'invalid_argument',
      'order_sd, item 2: missing; give order_sd for every variant or for none',
    );
    expectStatsErrorExact(
      () =>
        revenueProbHighest([
          { orders: 2, visitors: 120, revenue: 10, orderSd: -3 },
          { orders: 3, visitors: 120, revenue: 10, orderSd: 1 },
        ]),
      'invalid_argument',
      'order_sd, item 1: -3 is below 0; a standard deviation is 0 or more',
    );
    expectStatsErrorExact(
      () => revenueInterval(typical, 1),
      'invalid_argument',
      'level: 1 is not allowed; the level must be strictly between 0 and 1 (0.95 is a 95% interval)',
    );
    expectStatsErrorExact(
      () => revenueProbLiftAbove(typical, -1),
      'invalid_argument',
      'min_lift: -1 is not allowed; the minimum lift is a number greater than -1 (-0.02 asks "no worse than 2% below")',
    );
    expectStatsErrorExact(
      () => revenueProbHighest([typical[0] as RevenueTotals]),
      'invalid_argument',
      'at least 2 variants are needed (the first is the control), got 1',
    );
  });

  test('a challenger whose order value could well be negative has no lift interval (it would pass -100%)', () => {
    const e = thrownStatsError(() =>
      revenueLiftInterval(
        [
          { orders: 50000, visitors: 1000000, revenue: 2.5e6, orderSd: 1000 },
          { orders: 40, visitors: 1000, revenue: 200, orderSd: 400 },
        ],
        0.95,
      ),
    );
    expect(e.code).toBe('not_available');
    expect(e.message).toMatch(/^order_sd, item 2: this challenger's average order value could be negative \(/);
  });
});

describe('properties', () => {
  const v: RevenueTotals[] = [
    { orders: 120, visitors: 2400, revenue: 7200 },
    { orders: 150, visitors: 2380, revenue: 8100 },
    { orders: 131, visitors: 2390, revenue: 7700 },
  ];

  test('deterministic, and a table memo changes no bit', () => {
    const memo = new TableMemo();
    const fresh = [revenueProbHighest(v), revenueExpectedLoss(v), revenueLiftInterval(v, 0.9)];
    const again = [revenueProbHighest(v), revenueExpectedLoss(v), revenueLiftInterval(v, 0.9)];
    const memoised = [revenueProbHighest(v, memo), revenueExpectedLoss(v, memo), revenueLiftInterval(v, 0.9, memo)];
    const memoisedAgain = [
      revenueProbHighest(v, memo),
      revenueExpectedLoss(v, memo),
      revenueLiftInterval(v, 0.9, memo),
    ];
    expect(again).toEqual(fresh);
    expect(memoised).toEqual(fresh);
    expect(memoisedAgain).toEqual(fresh);
  });

  test('loss_i − loss_j = mean_j − mean_i (E[max − R_i] − E[max − R_j]), to quadrature accuracy', () => {
    const losses = revenueExpectedLoss(v);
    const means = revenueMean(v);
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) {
        const lhs = (losses[i] as number) - (losses[j] as number);
        const rhs = (means[j] as number) - (means[i] as number);
        expect(Math.abs(lhs - rhs)).toBeLessThanOrEqual(1e-11 * (means[0] as number));
      }
    }
  });

  test('the decision follows the rule on the expected losses, with 1% of the control mean by default', () => {
    const d = revenueDecide(v, undefined);
    const losses = revenueExpectedLoss(v);
    expect(d.index).toBe(losses.indexOf(Math.min(...losses)));
    expect(d.maxLoss).toBe(0.01 * (revenueMean(v)[0] as number));
    expect(revenueDecide(v, 10).choose).toBe(true);
    expect(revenueDecide(v, 0).choose).toBe(false);
  });
});
