/**
 * The Explain section's pure module: parsing =ABTEST. calls, the words for every catalogue function,
 * and the built-in cross-check formulas. The cross-check formulas are evaluated with HyperFormula (an
 * independent spreadsheet engine) on an invented checkout-test sheet and held against scipy
 * (test/reference/addin/taskpane_crosscheck.json, made by test/reference/addin/taskpane_crosscheck.py) and R's
 * power.prop.test / chisq.test values from docs/check-values.md.
 */
import { HyperFormula } from 'hyperformula';
import { CATALOGUE_LIST } from '../../functions/catalogue';
import {
  cellsIn,
  explainFormula,
  itemOf,
  mathPieces,
  parseAbtestCall,
  SIGNATURES,
  splitArguments,
  type Explanation,
} from '../../taskpane/logic/explain';
import { eventsProbLiftAbove } from '../../functions/stats/eventRates';
import { meanProbLiftAbove } from '../../functions/stats/normalMeans';
import {
  revenueInterval,
  revenueLiftInterval,
  revenueProbAboveControl,
  revenueProbLiftAbove,
} from '../../functions/stats/revenuePerVisitor';
import reference from '../reference/addin/taskpane_crosscheck.json';
import highest from '../reference/addin/explain_highest.json';

function explained(formula: string, anchor = 'Z1'): Explanation {
  const result = explainFormula(formula, anchor);
  if ('problem' in result) throw new Error(`not explained: ${result.problem}`);
  return result;
}

describe('parsing', () => {
  test('splits arguments at top-level commas only', () => {
    expect(splitArguments('C2:C4, B2:B4, 0.9')).toEqual(['C2:C4', 'B2:B4', '0.9']);
    expect(splitArguments('INDEX(A1:B2,1,2),"a,b",{1,2;3,4},\'Past, tests\'!B2:B9')).toEqual([
      'INDEX(A1:B2,1,2)',
      '"a,b"',
      '{1,2;3,4}',
      "'Past, tests'!B2:B9",
    ]);
    expect(splitArguments('C2:C4,,0.9')).toEqual(['C2:C4', '', '0.9']);
    expect(splitArguments('')).toEqual([]);
  });

  test('finds the ABTEST call, also inside other functions, case-insensitively', () => {
    expect(parseAbtestCall('=ABTEST.PROB_HIGHEST(C2:C4, B2:B4)')).toEqual({
      name: 'PROB_HIGHEST',
      args: ['C2:C4', 'B2:B4'],
    });
    expect(parseAbtestCall('=ROUND(abtest.posterior_mean(C2:C4,B2:B4),3)')).toEqual({
      name: 'POSTERIOR_MEAN',
      args: ['C2:C4', 'B2:B4'],
    });
    expect(parseAbtestCall('=ABTEST.DECISION(C2:C4,B2:B4,,"A (old)")')).toEqual({
      name: 'DECISION',
      args: ['C2:C4', 'B2:B4', '', '"A (old)"'],
    });
    expect(parseAbtestCall('=SUM(A1:A3)')).toBeNull();
    expect(parseAbtestCall('ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4)')).toBeNull();
    expect(parseAbtestCall('=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4')).toBeNull();
  });

  test('itemOf names the i-th cell of a row or column reference, keeping the sheet', () => {
    expect(itemOf('C2:C4', 1)).toBe('C3');
    expect(itemOf('C2:E2', 2)).toBe('E2');
    expect(itemOf("'Past tests'!B2:B13", 1)).toBe("'Past tests'!B3");
    expect(itemOf('$C$2:$C$4', 0)).toBe('C2');
    expect(itemOf('visitors_range', 0)).toBe('INDEX(visitors_range,1)');
  });

  test('cells without an ABTEST formula, unknown functions and too many arguments are explained as such', () => {
    expect(explainFormula('412', 'C2')).toEqual({
      problem: 'this cell holds no =ABTEST. formula; select a cell with one (the first cell of a spilled result)',
    });
    expect(explainFormula('=ABTEST.NOT_A_FUNCTION(A1)', 'B1')).toEqual({
      problem: "ABTEST.NOT_A_FUNCTION is not one of Lift Ledger's functions",
    });
    expect(explainFormula('=ABTEST.SRM_PVALUE(B2:B4,C2:C4,D2:D4)', 'E1')).toEqual({
      problem: 'ABTEST.SRM_PVALUE takes at most 2 arguments; this formula gives 3',
    });
  });
});

describe('every catalogue function is explained', () => {
  // The function catalogue (functions/catalogue.ts; docs/catalogue.md).
  const catalogue = CATALOGUE_LIST.map((f) => f.id);

  test('the signature table covers exactly the catalogue', () => {
    expect(Object.keys(SIGNATURES).sort()).toEqual([...catalogue].sort());
  });

  test.each(catalogue)('%s: summary names the argument cells, method is given', (name) => {
    const signature = SIGNATURES[name];
    if (signature === undefined) throw new Error(name);
    const refs = signature.args
      .slice(0, signature.required)
      .map((_, i) => `${String.fromCharCode(66 + i)}2:${String.fromCharCode(66 + i)}4`);
    const e = explained(`=ABTEST.${name}(${refs.join(',')})`, 'K2');
    expect(e.name).toBe(name);
    expect(e.arguments.map((a) => a.name)).toEqual(signature.args);
    for (const ref of refs) expect(e.summary).toContain(ref);
    expect(e.method.length).toBeGreaterThan(40);
    expect(e.summary).not.toMatch(/undefined|NaN/);
  });

  test('the words follow the arguments: level, prior, method', () => {
    const central = explained('=ABTEST.RATE_INTERVAL(C2:C4,B2:B4,0.9)');
    expect(central.summary).toBe(
      "The 90% central (equal-tailed) credible interval for each variant's conversion rate, from conversions in C2:C4 out of visitors in B2:B4, with a uniform Beta(1, 1) prior (the default). It spills a lower and an upper bound per variant.",
    );
    const hdi = explained('=ABTEST.RATE_INTERVAL(C2:C4,B2:B4,0.9,2,50,"hdi")');
    expect(hdi.summary).toContain('90% highest-density credible interval');
    expect(hdi.summary).toContain('a Beta(2, 50) prior');
    expect(hdi.crossCheck?.kind).toBe('brackets');
    expect(explained('=ABTEST.PRIOR_FROM_HISTORY(B2:B13,C2:C13,"moments")').summary).toContain(
      'by the method of moments',
    );
    expect(explained('=ABTEST.DECISION(C2:C4,B2:B4)').summary).toContain(
      "1% of the control's posterior mean rate (the default)",
    );
  });
});

// Tolerances: HyperFormula's BETA.INV, T.INV, GAMMA.INV and BETA.DIST agree with scipy to about 1e-9
// relative at these counts (measured here); these tests check the cross-check *formulas*, so they allow
// 1e-7 relative (or 1e-8 absolute for probabilities), far below any mistake in a formula.
const close = (got: number, want: number, relative = 1e-7): void => {
  expect(Math.abs(got - want)).toBeLessThanOrEqual(relative * Math.max(Math.abs(want), 0.1));
};

describe('built-in cross-check formulas, evaluated by HyperFormula', () => {
  const ref = reference as unknown as Record<string, number & number[]>;
  // An invented sheet: the garden-supply checkout test (A1:C4), revenue per visitor (E1:G3),
  // support contacts per user-day (H1:I3), a three-way split (K1:L4), prior parameters (N2:O2), a grid value (P2).
  const sheet: (string | number)[][] = [
    [
      'Variant',
      'Visitors',
      'Conversions',
      '',
      'Count',
      'Mean',
      'SD',
      'Events',
      'Exposure',
      '',
      'Visitors',
      'Share',
      '',
      'alpha',
      'beta',
      'x',
    ],
    [
      'Green',
      10000,
      412,
      '',
      10000,
      2.31,
      9.8,
      380,
      5200,
      '',
      20000,
      1,
      '',
      ...(ref['prior_interval_0.03_0.06_90'] as number[]),
      0.04,
    ],
    ['Orange', 10050, 455, '', 10050, 2.45, 10.4, 431, 5150, '', 20400, 1],
    ['Blue', 9980, 430, '', '', '', '', '', '', '', 39600, 2],
  ];
  const hf = HyperFormula.buildFromArray(sheet, {
    licenseKey: 'gpl-v3',
    smartRounding: false,
    useArrayArithmetic: true,
  });
  afterAll(() => hf.destroy());

  /** HyperFormula writes the logical constants as functions: TRUE() and FALSE(). */
  const dialect = (formula: string): string =>
    formula.replace(/\bTRUE\)/g, 'TRUE())').replace(/\bFALSE\)/g, 'FALSE())');
  const evaluate = (formula: string): number => {
    hf.setCellContents({ sheet: 0, row: 20, col: 0 }, [[dialect(formula)]]);
    const value = hf.getCellValue({ sheet: 0, row: 20, col: 0 });
    if (typeof value !== 'number') throw new Error(`${formula} gave ${JSON.stringify(value)}`);
    return value;
  };
  const checks = (formula: string, anchor = 'Z1'): number[] =>
    (explained(formula, anchor).crossCheck?.formulas ?? []).map(evaluate);

  test('POSTERIOR_MEAN: (α+x)/(α+β+n) equals scipy beta(413, 9589).mean()', () => {
    expect(explained('=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4)').crossCheck?.formulas).toEqual(['=(1+C2)/(1+1+B2)']);
    expect(checks('=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4)')[0]).toBeCloseTo(ref.posterior_mean_0 as number, 14);
  });

  test('RATE_INTERVAL: BETA.INV bounds equal scipy beta.ppf (uniform prior and Beta(2, 50))', () => {
    const [lo, hi] = checks('=ABTEST.RATE_INTERVAL(C2:C4,B2:B4,0.9)');
    const [rlo, rhi] = ref.rate_interval_90_0 as number[];
    close(lo as number, rlo as number);
    close(hi as number, rhi as number);
    const [plo, phi] = checks('=ABTEST.RATE_INTERVAL(C2:C4,B2:B4,0.95,2,50)');
    const [qlo, qhi] = ref.rate_interval_95_prior_2_50_0 as number[];
    close(plo as number, qlo as number);
    close(phi as number, qhi as number);
  });

  test("RATE_INTERVAL hdi: the brackets hold scipy's shortest 90% interval", () => {
    const [lowerMax, upperMin] = checks('=ABTEST.RATE_INTERVAL(C2:C4,B2:B4,0.9,1,1,"hdi")');
    const [hdiLo, hdiHi] = ref.rate_hdi_90_0 as number[];
    expect(hdiLo).toBeLessThanOrEqual(lowerMax as number);
    expect(hdiHi).toBeGreaterThanOrEqual(upperMin as number);
  });

  test('POSTERIOR_DENSITY: BETA.DIST(x, …, FALSE) at the grid cell equals scipy beta.pdf', () => {
    const [density] = checks('=ABTEST.POSTERIOR_DENSITY(C2:C4,B2:B4)', 'P2');
    close(density as number, ref['posterior_density_0_at_0.04'] as number);
  });

  test('PROB_ABOVE_CONTROL: the normal approximation is within 0.002 of the exact value (scipy quadrature)', () => {
    const [approx] = checks('=ABTEST.PROB_ABOVE_CONTROL(C2:C3,B2:B3)');
    expect(Math.abs((approx as number) - (ref.prob_above_control_1 as number))).toBeLessThan(0.002);
  });

  test('SRM_PVALUE: CHISQ.TEST equals scipy chisquare and R chisq.test', () => {
    expect(checks('=ABTEST.SRM_PVALUE(B2:B4)')[0]).toBeCloseTo(ref.srm_equal_pvalue as number, 12);
    // R: chisq.test(c(20000, 20400, 39600), p = c(0.25, 0.25, 0.5)) p = 0.00247875218 (shared/check-values.md)
    expect(checks('=ABTEST.SRM_PVALUE(K2:K4,L2:L4)')[0]).toBeCloseTo(0.00247875218, 10);
  });

  test('CLASSIC_SAMPLE_SIZE: the NORM.S.INV formula gives R power.prop.test n, rounded up', () => {
    // R power.prop.test values from shared/check-values.md: 685.596858, 31233.43794, 1463.707305, 10877.163065
    expect(checks('=ABTEST.CLASSIC_SAMPLE_SIZE(0.1,0.5)')).toEqual([686]);
    expect(checks('=ABTEST.CLASSIC_SAMPLE_SIZE(0.05,0.1)')).toEqual([31234]);
    expect(checks('=ABTEST.CLASSIC_SAMPLE_SIZE(0.2,0.25,0.05,0.9)')).toEqual([1464]);
    expect(checks('=ABTEST.CLASSIC_SAMPLE_SIZE(0.02,0.25,0.05,0.8,1)')).toEqual([10878]);
    // VISITORS_NEEDED is compared with the same classic size
    expect(checks('=ABTEST.VISITORS_NEEDED(0.1,0.5)')).toEqual([686]);
  });

  test('PRIOR_FROM_MEAN: alpha = m·s, beta = (1 − m)·s', () => {
    expect(checks('=ABTEST.PRIOR_FROM_MEAN(0.04,500)')).toEqual([20, 480]);
  });

  test("PRIOR_FROM_INTERVAL: BETA.DIST on scipy's fitted prior gives 5% in each tail", () => {
    const tails = checks('=ABTEST.PRIOR_FROM_INTERVAL(0.03,0.06)', 'N2');
    expect(tails[0]).toBeCloseTo(0.05, 9);
    expect(tails[1]).toBeCloseTo(0.05, 9);
  });

  test('MEAN_INTERVAL: T.INV bounds equal scipy t.ppf', () => {
    const [lo, hi] = checks('=ABTEST.MEAN_INTERVAL(E2:E3,F2:F3,G2:G3)');
    const [rlo, rhi] = ref.mean_interval_95_0 as number[];
    close(lo as number, rlo as number);
    close(hi as number, rhi as number);
  });

  test("MEAN_PROB_ABOVE_CONTROL and MEAN_DIFF_INTERVAL: normal approximations within 1e-3 of scipy's exact Student t values", () => {
    const [p] = checks('=ABTEST.MEAN_PROB_ABOVE_CONTROL(E2:E3,F2:F3,G2:G3)');
    expect(Math.abs((p as number) - (ref.mean_prob_above_control_1 as number))).toBeLessThan(1e-3);
    const [lo, hi] = checks('=ABTEST.MEAN_DIFF_INTERVAL(E2:E3,F2:F3,G2:G3)');
    const [rlo, rhi] = ref.mean_diff_interval_95_1 as number[];
    expect(Math.abs((lo as number) - (rlo as number))).toBeLessThan(1e-3);
    expect(Math.abs((hi as number) - (rhi as number))).toBeLessThan(1e-3);
  });

  test('EVENTS_RATE_INTERVAL: GAMMA.INV bounds equal scipy gamma.ppf', () => {
    const [lo, hi] = checks('=ABTEST.EVENTS_RATE_INTERVAL(H2:H3,I2:I3)');
    const [rlo, rhi] = ref.events_rate_interval_95_0 as number[];
    close(lo as number, rlo as number);
    close(hi as number, rhi as number);
  });

  test('EVENTS_PROB_ABOVE_CONTROL: the BETA.DIST closed form equals scipy quadrature', () => {
    const [p] = checks('=ABTEST.EVENTS_PROB_ABOVE_CONTROL(H2:H3,I2:I3)');
    close(p as number, ref.events_prob_above_control_1 as number);
  });

  test('EVENTS_LIFT_INTERVAL: the beta-prime BETA.INV form equals scipy quantiles of the rate ratio', () => {
    const got = checks('=ABTEST.EVENTS_LIFT_INTERVAL(H2:H3,I2:I3)');
    const want = ref.events_lift_interval_95_1 as number[];
    expect(got).toHaveLength(3);
    got.forEach((value, i) => close(value, want[i] as number));
  });

  test('PROB_HIGHEST of two variants: the pairwise formula is offered for the second cell (scipy quadrature)', () => {
    const check = explained('=ABTEST.PROB_HIGHEST(C2:C3,B2:B3)').crossCheck;
    expect(check?.kind).toBe('approximates');
    expect(check?.what).toMatch(
      /^with two variants, having the highest conversion rate is the same as beating the other/,
    );
    const [approx] = checks('=ABTEST.PROB_HIGHEST(C2:C3,B2:B3)');
    expect(Math.abs((approx as number) - (ref.prob_above_control_1 as number))).toBeLessThan(0.002);
  });

  test('PROB_HIGHEST of three variants: no two-variant formula posing as the answer; the sum and an upper limit instead (scipy)', () => {
    // the exact P(highest) values in the spill Z1:Z3 (scipy, explain_highest.py)
    hf.setCellContents(
      { sheet: 0, row: 0, col: 25 },
      highest.prob_highest.map((v) => [v]),
    );
    const check = explained('=ABTEST.PROB_HIGHEST(C2:C4,B2:B4)', 'Z1').crossCheck;
    expect(check?.kind).toBe('checks');
    expect(check?.formulas[0]).toBe('=SUM(Z1:Z3)');
    expect(check?.what).toContain(
      'With 3 variants its chance of the highest conversion rate is lower than that, so the two numbers do not match',
    );
    const [sum, bound] = checks('=ABTEST.PROB_HIGHEST(C2:C4,B2:B4)', 'Z1');
    expect(sum).toBeCloseTo(1, 12);
    // the bound is about P(Orange > Green) (scipy 0.92179) and above Orange's P(highest) (scipy 0.74085)
    expect(Math.abs((bound as number) - highest.orange_beats_green)).toBeLessThan(0.002);
    expect(bound as number).toBeGreaterThan(highest.prob_highest[1] as number);
    // a row of variants sums a row of results
    expect(explained('=ABTEST.PROB_HIGHEST(B9:D9,B10:D10)', 'F12').crossCheck?.formulas[0]).toBe('=SUM(F12:H12)');
  });

  test('EVENTS_PROB_HIGHEST and MEAN_PROB_HIGHEST follow the number of variants too', () => {
    expect(explained('=ABTEST.EVENTS_PROB_HIGHEST(H2:H3,I2:I3)').crossCheck?.kind).toBe('reproduces');
    expect(explained('=ABTEST.EVENTS_PROB_HIGHEST(H2:H4,I2:I4)').crossCheck?.kind).toBe('checks');
    expect(explained('=ABTEST.MEAN_PROB_HIGHEST(E2:E3,F2:F3,G2:G3)').crossCheck?.kind).toBe('approximates');
    expect(explained('=ABTEST.MEAN_PROB_HIGHEST(E2:E4,F2:F4,G2:G4)').crossCheck?.kind).toBe('checks');
    expect(explained('=ABTEST.PROB_HIGHEST(names,B2:B4)').crossCheck?.formulas).toHaveLength(1);
    expect(cellsIn('names')).toBeNull();
  });

  test('every cross-check formula of every function is valid spreadsheet syntax (no #NAME? or #ERROR!)', () => {
    const samples = [
      '=ABTEST.PROB_HIGHEST(C2:C3,B2:B3)',
      '=ABTEST.MEAN_PROB_HIGHEST(E2:E3,F2:F3,G2:G3)',
      '=ABTEST.EVENTS_PROB_HIGHEST(H2:H3,I2:I3,2,100)',
      '=ABTEST.EVENTS_LIFT_INTERVAL(H2:H3,I2:I3,0.9,2,100)',
      '=ABTEST.EVENTS_RATE_INTERVAL(H2:H3,I2:I3,0.9,2,100)',
    ];
    for (const formula of samples) for (const value of checks(formula)) expect(Number.isFinite(value)).toBe(true);
  });
});

describe('the method, readable', () => {
  test('subscripts instead of raw notation', () => {
    expect(mathPieces('∫ f_i(x) ∏_{j≠i} F_j(x) dx')).toEqual([
      { text: '∫ f', subscript: false },
      { text: 'i', subscript: true },
      { text: '(x) ∏', subscript: false },
      { text: 'j≠i', subscript: true },
      { text: ' F', subscript: false },
      { text: 'j', subscript: true },
      { text: '(x) dx', subscript: false },
    ]);
    expect(mathPieces('z_(1−alpha/sides) and z_power')).toEqual([
      { text: 'z', subscript: false },
      { text: '(1−alpha/sides)', subscript: true },
      { text: ' and z', subscript: false },
      { text: 'power', subscript: true },
    ]);
  });

  test.each(CATALOGUE_LIST.map((f) => f.id))('%s: no "_{", "_(" or "x_y" left in the text shown', (name) => {
    const args = SIGNATURES[name]?.args.slice(0, SIGNATURES[name]?.required).map(() => 'B2:B4') ?? [];
    const e = explained(`=ABTEST.${name}(${args.join(',')})`);
    const shown = mathPieces(e.method)
      .filter((piece) => !piece.subscript)
      .map((piece) => piece.text)
      .join('');
    expect(shown).not.toMatch(/_[{(A-Za-z0-9]/);
  });

  test('integrals come with the method in plain words first', () => {
    expect(explained('=ABTEST.PROB_HIGHEST(C2:C4,B2:B4)').plainMethod).toBe(
      'In words: for every possible value, the chance that this variant has that value while every other variant is below it, added up over all values.',
    );
    expect(explained('=ABTEST.EXPECTED_LOSS(C2:C4,B2:B4)').plainMethod).toMatch(
      /^In words: how much you give up on average/,
    );
    expect(explained('=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4)').plainMethod).toBeNull();
  });
});

describe('the functions of issue #13: words and cross-checks, evaluated by HyperFormula', () => {
  // An invented sheet: the checkout test's totals (A1:E3: orders, visitors, revenue, order sd), averages
  // (G1:I3: count, mean, sd) and events over exposure (K1:L3).
  const sheet: (string | number)[][] = [
    [400, 10000, 24000, 35, '', 10000, 2.31, 9.8, '', 380, 5200],
    [455, 10050, 28100, 38, '', 10050, 2.45, 10.4, '', 431, 5150],
  ];
  const hf = HyperFormula.buildFromArray(sheet, { licenseKey: 'gpl-v3', smartRounding: false });
  afterAll(() => hf.destroy());
  const evaluate = (formula: string): number => {
    hf.setCellContents({ sheet: 0, row: 10, col: 0 }, [[formula.replace(/\bTRUE\)/g, 'TRUE())')]]);
    const value = hf.getCellValue({ sheet: 0, row: 10, col: 0 });
    if (typeof value !== 'number') throw new Error(`${formula} gave ${JSON.stringify(value)}`);
    return value;
  };
  const checks = (formula: string): number[] => (explained(formula).crossCheck?.formulas ?? []).map(evaluate);
  const totals = [0, 1].map((i) => ({
    orders: sheet[i]?.[0] as number,
    visitors: sheet[i]?.[1] as number,
    revenue: sheet[i]?.[2] as number,
    orderSd: sheet[i]?.[3] as number,
  }));
  const withoutSd = totals.map(({ orders, visitors, revenue }) => ({ orders, visitors, revenue }));

  test('EVENTS_PROB_LIFT_ABOVE: the BETA.DIST closed form reproduces the core at min_lift −5% and +3%', () => {
    for (const m of [-0.05, 0.03]) {
      const [got] = checks(`=ABTEST.EVENTS_PROB_LIFT_ABOVE(J1:J2,K1:K2,${m})`);
      const [want] = eventsProbLiftAbove(
        [
          { events: 380, exposure: 5200 },
          { events: 431, exposure: 5150 },
        ],
        m,
      );
      // the core is checked against scipy quadrature in test/stats/liftAbove.test.ts
      expect(Math.abs((got as number) - (want as number))).toBeLessThan(1e-8);
    }
  });

  test('MEAN_PROB_LIFT_ABOVE: the normal approximation is within 0.005 of the core at 10,000 per variant', () => {
    const [got] = checks('=ABTEST.MEAN_PROB_LIFT_ABOVE(F1:F2,G1:G2,H1:H2,-0.02)');
    const [want] = meanProbLiftAbove(
      [
        { count: 10000, mean: 2.31, sd: 9.8 },
        { count: 10050, mean: 2.45, sd: 10.4 },
      ],
      -0.02,
    );
    expect(Math.abs((got as number) - (want as number))).toBeLessThan(0.005);
  });

  test('REVENUE_ cross-checks: the log-normal approximation is near the core, with and without order_sd', () => {
    for (const [args, variants] of [
      ['A1:A2,B1:B2,C1:C2,D1:D2', totals],
      ['A1:A2,B1:B2,C1:C2', withoutSd],
    ] as const) {
      const [beats] = checks(`=ABTEST.REVENUE_PROB_ABOVE_CONTROL(${args})`);
      expect(Math.abs((beats as number) - (revenueProbAboveControl(variants)[0] as number))).toBeLessThan(0.01);
      const [above] = checks(
        `=ABTEST.REVENUE_PROB_LIFT_ABOVE(${args.replace(/,D1:D2$/, '')},-0.02${args.endsWith('D1:D2') ? ',D1:D2' : ''})`,
      );
      expect(Math.abs((above as number) - (revenueProbLiftAbove(variants, -0.02)[0] as number))).toBeLessThan(0.01);
      const [lo, hi] = checks(`=ABTEST.REVENUE_INTERVAL(${args})`);
      const interval = revenueInterval(variants, 0.95)[0] as { lower: number; upper: number };
      expect(Math.abs((lo as number) / interval.lower - 1)).toBeLessThan(0.01);
      expect(Math.abs((hi as number) / interval.upper - 1)).toBeLessThan(0.01);
      const lift = checks(`=ABTEST.REVENUE_LIFT_INTERVAL(${args})`);
      const core = revenueLiftInterval(variants, 0.95)[0] as { lower: number; median: number; upper: number };
      expect(lift.map((x, i) => Math.abs(x - [core.lower, core.median, core.upper][i]!) < 0.005)).toEqual([
        true,
        true,
        true,
      ]);
    }
  });

  test('the decisions say their rule, max_loss and units; the exponential model is named when order_sd is left out', () => {
    expect(explained('=ABTEST.REVENUE_DECISION(A1:A2,B1:B2,C1:C2)').summary).toBe(
      "What to do on revenue per visitor, from orders in A1:A2, visitors in B1:B2 and revenue in C1:C2, order values taken as exponential (no order_sd given): the variant with the smallest expected loss (REVENUE_EXPECTED_LOSS) is recommended once that loss is at most 1% of the control's posterior mean revenue per visitor (the default).",
    );
    expect(explained('=ABTEST.MEAN_DECISION(F1:F2,G1:G2,H1:H2,0.05)').summary).toContain(
      "at most max_loss (0.05), in the metric's units",
    );
    expect(explained('=ABTEST.EVENTS_DECISION(J1:J2,K1:K2)').summary).toContain(
      "1% of the control's posterior mean rate (the default)",
    );
    expect(explained('=ABTEST.REVENUE_DECISION(A1:A2,B1:B2,C1:C2)').plainMethod).toMatch(
      /^In words: the expected loss of each variant/,
    );
    expect(explained('=ABTEST.REVENUE_EXPECTED_LOSS(A1:A2,B1:B2,C1:C2,D1:D2)').summary).toContain(
      "with the order values' standard deviations in D1:D2",
    );
  });
});
