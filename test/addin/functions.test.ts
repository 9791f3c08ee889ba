/**
 * Every worksheet function through its wrapper in functions/functions.ts: defaults, orientation, blank
 * rows, the catalogue's error conventions, and values against outside references.
 *
 * Reference values:
 * - test/reference/addin/addin_values.json — scipy 1.17 (scipy.stats beta/t/gamma/betabinom distributions,
 *   integrate.quad of the textbook integrals, optimize for quantiles and fits); made by
 *   test/reference/addin/addin_values.py, the scenario invented (a garden-supply shop's checkout buttons);
 *   test/reference/addin/addin_visitors_needed.json from addin_visitors_needed.py (same definitions).
 * - test/reference/srm/srm_chisq.json — R 4.2 chisq.test (the SRM engineer's script srm_chisq.R).
 * - test/reference/planning/planning_classic.json — R 4.2 power.prop.test (planning_classic.R).
 * - closed forms named beside each check.
 */
import * as fs from 'fs';
import * as path from 'path';
import * as F from '../../functions/functions';
import { thrownWorksheetError } from '../helpers/assertions';

const REF = path.join(__dirname, '..', 'reference');
const readJson = <T>(name: string): T => JSON.parse(fs.readFileSync(path.join(REF, name), 'utf8')) as T;

interface ConversionRef {
  conversions: number[];
  visitors: number[];
  level: number;
  prior: [number, number];
  posteriorMean: number[];
  rateIntervalCentral: number[][];
  rateIntervalHdi: number[][];
  probHighest: number[];
  probAboveControl: number[];
  expectedLoss: number[];
  liftInterval: number[][];
  rateDiffInterval: number[][];
  minLift: number;
  probLiftAbove: number[];
}
interface MeanRef {
  count: number[];
  mean: number[];
  sd: number[];
  level: number;
  meanInterval: number[][];
  probHighest: number[];
  probAboveControl: number[];
  expectedLoss: number[];
  diffInterval: number[][];
  liftInterval: number[][];
}
interface EventsRef {
  events: number[];
  exposure: number[];
  level: number;
  prior: [number, number];
  rateInterval: number[][];
  probHighest: number[];
  probAboveControl: number[];
  probAboveControlClosedForm: number[];
  expectedLoss: number[];
  liftInterval: number[][];
}
const ref = readJson<{
  conversionTwo: ConversionRef;
  conversionThree: ConversionRef;
  meanTwo: MeanRef;
  meanThree: MeanRef;
  eventsTwo: EventsRef;
  eventsThree: EventsRef;
  priorFromMean: { meanRate: number; strength: number; alpha: number; beta: number };
  priorFromInterval: { low: number; high: number; level: number; ab: [number, number] };
  priorFromIntervalLevel95: { low: number; high: number; level: number; ab: [number, number] };
  priorFromHistory: { conversions: number[]; visitors: number[]; likelihood: [number, number] };
  decisionPower: { baseline: number; lift: number; n: number; threshold: number; power: number }[];
}>('addin/addin_values.json');
const visitorsNeededRef = readJson<{
  cases: { baseline: number; lift: number; n: number; threshold: number; power: number }[];
}>('addin/addin_visitors_needed.json');
const srm = readJson<{ cases: { visitors: number[]; shares: number[]; pValue: number }[] }>('srm/srm_chisq.json');

/**
 * Relative tolerance against the scipy references (quad at epsrel 1e-12, brentq at rtol 1e-13, so the
 * references carry about 11 digits). Measured on 2026-12-01: the largest relative difference of any
 * quadrature result was 2.3e-12; the HDI (scipy's bounded minimiser) agreed to 2.3e-9.
 */
const REL = 1e-9;

const col = (xs: readonly unknown[]): unknown[][] => xs.map((x) => [x]);
const row = (xs: readonly unknown[]): unknown[][] => [[...xs]];
const transpose = (m: unknown[][]): unknown[][] => (m[0] ?? []).map((_, j) => m.map((r) => r[j]));

function close(actual: unknown, expected: number, rel = REL, abs = 1e-13): void {
  expect(typeof actual).toBe('number');
  const a = actual as number;
  const ok = Math.abs(a - expected) <= Math.max(abs, rel * Math.abs(expected));
  if (!ok) throw new Error(`expected ${a} to be within ${rel} (relative) of ${expected}`);
}

/** Compares a spill with expected cells: numbers within tolerance, text exactly. */
function expectSpill(actual: unknown[][], expected: (number | string)[][], rel = REL): void {
  expect(actual.length).toBe(expected.length);
  actual.forEach((r, i) => {
    const e = expected[i] as (number | string)[];
    expect(r.length).toBe(e.length);
    r.forEach((cell, j) => {
      const want = e[j] as number | string;
      if (typeof want === 'string') expect(cell).toBe(want);
      else close(cell, want, rel);
    });
  });
}

/** The worksheet error a call raises. */
function sheetError(call: () => unknown): { code: string; message: string } {
  return thrownWorksheetError(call, '(raw error)');
}

const vsControl = (values: number[]): (number | string)[][] => [[''], ...values.map((v) => [v])];
const blockVsControl = (rows: number[][]): (number | string)[][] => [rows[0]?.map(() => '') ?? [], ...rows];

describe('conversion metrics against scipy', () => {
  const two = ref.conversionTwo;
  const three = ref.conversionThree;
  const args3 = [col(three.conversions), col(three.visitors)] as const;

  test('POSTERIOR_MEAN: default prior, and equals (α + x)/(α + β + n) (conjugate closed form)', () => {
    expectSpill(F.posteriorMean(col(two.conversions), col(two.visitors)), col(two.posteriorMean) as number[][]);
    expectSpill(F.posteriorMean(...args3, 2, 38), col(three.posteriorMean) as number[][], 1e-14);
  });

  test('RATE_INTERVAL: central (default) and hdi, default level 0.95', () => {
    expectSpill(F.rateInterval(col(two.conversions), col(two.visitors)), two.rateIntervalCentral);
    expectSpill(
      F.rateInterval(col(two.conversions), col(two.visitors), undefined, undefined, undefined, 'hdi'),
      two.rateIntervalHdi,
      1e-7,
    );
    expectSpill(F.rateInterval(...args3, 0.9, 2, 38), three.rateIntervalCentral);
    expectSpill(F.rateInterval(...args3, 0.9, 2, 38, 'HDI'), three.rateIntervalHdi, 1e-7);
  });

  test('PROB_HIGHEST sums to 1 and matches quadrature', () => {
    const out = F.probHighest(col(two.conversions), col(two.visitors));
    expectSpill(out, col(two.probHighest) as number[][]);
    const out3 = F.probHighest(...args3, 2, 38);
    expectSpill(out3, col(three.probHighest) as number[][]);
    close(
      out3.reduce((s, r) => s + (r[0] as number), 0),
      1,
      1e-12,
    );
  });

  test('PROB_ABOVE_CONTROL: "" in the control slot', () => {
    expectSpill(F.probAboveControl(col(two.conversions), col(two.visitors)), vsControl(two.probAboveControl));
    expectSpill(F.probAboveControl(...args3, 2, 38), vsControl(three.probAboveControl));
  });

  test("PROB_ABOVE_CONTROL equals Evan Miller's exact rational for Beta(4, 8) vs Beta(6, 6): 521/646", () => {
    // conversions 3 of 10 and 5 of 10 with the uniform prior give Beta(4, 8) and Beta(6, 6)
    // (docs/check-values.md: E. Miller, "Formulas for Bayesian A/B Testing", 2015)
    expectSpill(F.probAboveControl(col([3, 5]), col([10, 10])), vsControl([521 / 646]), 1e-12);
  });

  test('LIFT_INTERVAL and RATE_DIFF_INTERVAL: lower, median, upper per challenger', () => {
    expectSpill(F.liftInterval(col(two.conversions), col(two.visitors)), blockVsControl(two.liftInterval), 1e-9);
    expectSpill(F.liftInterval(...args3, 0.9, 2, 38), blockVsControl(three.liftInterval), 1e-9);
    expectSpill(
      F.rateDiffInterval(col(two.conversions), col(two.visitors)),
      blockVsControl(two.rateDiffInterval),
      1e-9,
    );
    expectSpill(F.rateDiffInterval(...args3, 0.9, 2, 38), blockVsControl(three.rateDiffInterval), 1e-9);
  });

  test('PROB_LIFT_ABOVE: positive and negative min_lift', () => {
    expectSpill(
      F.probLiftAbove(col(two.conversions), col(two.visitors), two.minLift),
      vsControl(two.probLiftAbove),
      1e-9,
    );
    expectSpill(F.probLiftAbove(...args3, three.minLift, 2, 38), vsControl(three.probLiftAbove), 1e-9);
  });

  test('PROB_LIFT_ABOVE at min_lift 0 equals PROB_ABOVE_CONTROL (identity)', () => {
    const a = F.probLiftAbove(...args3, 0, 2, 38);
    const b = F.probAboveControl(...args3, 2, 38);
    expectSpill(a, b as (number | string)[][], 1e-9);
  });

  test('EXPECTED_LOSS: E[max] − E[p_i]; differences equal differences of posterior means (identity)', () => {
    const loss = F.expectedLoss(col(two.conversions), col(two.visitors));
    expectSpill(loss, col(two.expectedLoss) as number[][], 1e-9);
    const loss3 = F.expectedLoss(...args3, 2, 38);
    expectSpill(loss3, col(three.expectedLoss) as number[][], 1e-9);
    const means = three.posteriorMean;
    close((loss3[0]?.[0] as number) - (loss3[1]?.[0] as number), (means[1] as number) - (means[0] as number), 1e-8);
  });

  test("DECISION: choose when the leader's loss is within the default 1% of the control's posterior mean", () => {
    // loss of B 6.5235e-5 (scipy) ≤ 0.01 × 0.0503747 (control's posterior mean)
    expect(F.decision(col(two.conversions), col(two.visitors))).toBe(
      'Choose B: its expected loss 0.0065% is within the 0.050% allowed',
    );
  });

  test('DECISION: keep collecting when the loss is above max_loss; labels name the leader', () => {
    // leader B (smallest loss 0.00080028 per scipy) above a max_loss of 0.0005
    expect(F.decision(...args3, 0.0005, col(['Grey', 'Green', 'Large green']), 2, 38)).toBe(
      'Keep collecting data: Green leads, but its expected loss 0.080% is above the 0.050% allowed',
    );
    expect(F.decision(...args3, 0.001, undefined, 2, 38)).toBe(
      'Choose B: its expected loss 0.080% is within the 0.10% allowed',
    );
  });

  test('DECISION: default letters count blank positions, so "C" is the third cell', () => {
    expect(F.decision(col([120, '', 150]), col([2400, '', 2380]))).toBe(
      'Choose C: its expected loss 0.0065% is within the 0.050% allowed',
    );
  });

  test('DECISION: labels must have the same shape', () => {
    expect(sheetError(() => F.decision(col(two.conversions), col(two.visitors), undefined, row(['A', 'B'])))).toEqual({
      code: '#VALUE!',
      message:
        'labels must have the same shape as conversions: labels is 1 row × 2 columns, conversions is 2 rows × 1 column',
    });
  });

  test('POSTERIOR_DENSITY: 101 rows by default, grid then one density per variant; integrates to 1', () => {
    const table = F.posteriorDensity(col(two.conversions), col(two.visitors));
    expect(table).toHaveLength(101);
    expect(table.every((r) => r.length === 3)).toBe(true);
    const grid = table.map((r) => r[0] as number);
    for (let i = 1; i < grid.length; i++) expect(grid[i] as number).toBeGreaterThan(grid[i - 1] as number);
    // trapezoid rule over the grid: the densities are those of probability distributions
    for (const c of [1, 2]) {
      let area = 0;
      for (let i = 1; i < table.length; i++) {
        area +=
          0.5 *
          ((table[i]?.[c] as number) + (table[i - 1]?.[c] as number)) *
          ((grid[i] as number) - (grid[i - 1] as number));
      }
      expect(Math.abs(area - 1)).toBeLessThan(2e-3);
    }
  });

  test('POSTERIOR_DENSITY values are Beta densities (closed form via log-gamma; scipy beta.pdf agrees)', () => {
    const table = F.posteriorDensity(col([3, 5]), col([10, 10]), 11);
    expect(table).toHaveLength(11);
    // Beta(4, 8): f(x) = x^3 (1-x)^7 / B(4, 8), B(4, 8) = 3! 7! / 11! = 1/1320; Beta(6, 6): 1/B(6, 6) = 11!/(5! 5!) = 2772
    for (const r of table) {
      const x = r[0] as number;
      close(r[1], 1320 * x ** 3 * (1 - x) ** 7, 1e-9, 1e-12);
      close(r[2], 2772 * x ** 5 * (1 - x) ** 5, 1e-9, 1e-12);
    }
  });

  test('LIFT_DENSITY: grid then one column per challenger; holds at least its central 98% (1%–99% quantiles)', () => {
    const table = F.liftDensity(...args3, 201, 2, 38);
    expect(table).toHaveLength(201);
    expect(table.every((r) => r.length === 3)).toBe(true);
    for (const c of [1, 2]) {
      let area = 0;
      for (let i = 1; i < table.length; i++) {
        area +=
          0.5 *
          ((table[i]?.[c] as number) + (table[i - 1]?.[c] as number)) *
          ((table[i]?.[0] as number) - (table[i - 1]?.[0] as number));
      }
      // The grid spans every challenger's 1%–99% lift quantiles (the union over challengers may hold more).
      expect(area).toBeGreaterThan(0.98 - 5e-3);
      expect(area).toBeLessThan(1 + 5e-3);
    }
  });
});

describe('conversion metrics: orientation and blank rows', () => {
  const two = ref.conversionTwo;

  test('a row input spills a row; blocks become one column per variant', () => {
    expectSpill(F.posteriorMean(row(two.conversions), row(two.visitors)), [two.posteriorMean]);
    expectSpill(
      F.rateInterval(row(two.conversions), row(two.visitors)),
      transpose(two.rateIntervalCentral) as number[][],
    );
    expectSpill(
      F.liftInterval(row(two.conversions), row(two.visitors)),
      transpose(blockVsControl(two.liftInterval)) as (number | string)[][],
      1e-9,
    );
    expectSpill(F.probAboveControl(row(two.conversions), row(two.visitors)), [['', two.probAboveControl[0] as number]]);
  });

  test('blank rows are skipped and give "" slots, for every blank form', () => {
    const c = col([120, '', 150, null]);
    const n = col([2400, '', 2380, undefined]);
    expectSpill(F.posteriorMean(c, n), [
      [two.posteriorMean[0] as number],
      [''],
      [two.posteriorMean[1] as number],
      [''],
    ]);
    expectSpill(F.probHighest(c, n), [[two.probHighest[0] as number], [''], [two.probHighest[1] as number], ['']]);
    expectSpill(
      F.rateDiffInterval(c, n),
      [['', '', ''], ['', '', ''], two.rateDiffInterval[0] as number[], ['', '', '']],
      1e-9,
    );
    const density = F.posteriorDensity(c, n, 5);
    expect(density.every((r) => r.length === 5 && r[2] === '' && r[4] === '')).toBe(true);
  });

  test("the catalogue's error conventions reach the cell with code and message", () => {
    expect(sheetError(() => F.probHighest(col([1, 2, 3]), col([10, 20, 12.5])))).toEqual({
      code: '#VALUE!',
      message: 'visitors, item 3: 12.5 is not a whole number',
    });
    expect(sheetError(() => F.expectedLoss(col([1, '']), col([10, 20])))).toEqual({
      code: '#VALUE!',
      message: 'conversions, item 2: is blank while visitors has a value; fill in both or leave both blank',
    });
    expect(sheetError(() => F.probAboveControl(col([1]), col([10])))).toEqual({
      code: '#VALUE!',
      message: 'at least 2 variants are needed to compare; only 1 was given',
    });
    expect(sheetError(() => F.liftInterval(col([1, 2]), col([10, 20]), 0.95, 2))).toEqual({
      code: '#VALUE!',
      message:
        'prior_alpha and prior_beta: give both or neither (prior_beta is missing); leaving both out uses the uniform prior Beta(1, 1)',
    });
    expect(sheetError(() => F.rateInterval(col([1, 2]), col([10, 20]), 1))).toEqual({
      code: '#VALUE!',
      message: 'level: 1 is not allowed; enter a number from 0.01 to 0.9999',
    });
    expect(sheetError(() => F.rateInterval(col([1]), col([10]), 0.9, 1, 1, 'widest'))).toEqual({
      code: '#VALUE!',
      message: 'method: "widest" is not allowed; enter "central" or "hdi"',
    });
    expect(sheetError(() => F.probLiftAbove(col([1, 2]), col([10, 20]), -1))).toEqual({
      code: '#VALUE!',
      message: 'min_lift: -1 is not allowed; enter a number greater than -1 and at most 1',
    });
    // a lift typed as a whole percentage used to ask about a sixfold rate (and answered 2e-122)
    expect(sheetError(() => F.probLiftAbove(col([120, 150]), col([2400, 2380]), 5))).toEqual({
      code: '#VALUE!',
      message: 'min_lift: 5 is not allowed; enter a fraction: 0.05 for +5% (a relative lift, at most 1 for +100%)',
    });
    expect(sheetError(() => F.rateInterval(col([1, 2]), col([10, 20]), 95))).toEqual({
      code: '#VALUE!',
      message: 'level: 95 is not allowed; enter a fraction: 0.95 for 95%',
    });
    expect(sheetError(() => F.visitorsNeeded(0.1, 20))).toEqual({
      code: '#VALUE!',
      message: 'lift: 20 is not allowed; enter a fraction: 0.2 for +20% (a relative lift, at most 1 for +100%)',
    });
    expect(sheetError(() => F.posteriorMean(col([11]), col([10])))).toEqual({
      code: '#VALUE!',
      message: 'conversions, item 1: 11 is more than the 10 visitors',
    });
    expect(sheetError(() => F.posteriorDensity(col([1]), col([10]), 1))).toEqual({
      code: '#VALUE!',
      message: 'points: 1 is not allowed; enter a whole number from 2 to 1000',
    });
    const fiftyOne = Array.from({ length: 51 }, () => 5);
    expect(sheetError(() => F.probHighest(col(fiftyOne), col(fiftyOne.map(() => 50))))).toEqual({
      code: '#VALUE!',
      message: 'at most 50 variants can be compared; 51 were given',
    });
  });

  test('single-variant functions accept one variant', () => {
    expectSpill(F.posteriorMean([[120]], [[2400]]), [[two.posteriorMean[0] as number]]);
    expectSpill(F.rateInterval([[120]], [[2400]]), [two.rateIntervalCentral[0] as number[]]);
  });

  test('very large counts stay finite and sensible (a billion visitors)', () => {
    const out = F.probAboveControl(col([50_000_000, 50_010_000]), col([1_000_000_000, 1_000_000_000]));
    expect(out[0]?.[0]).toBe('');
    const p = out[1]?.[0] as number;
    // normal approximation of the difference of rates (common practice): z = 10000 / sqrt(2 n p (1 - p))
    // = 1.026 for n = 1e9, p = 0.05, and Phi(1.026) = 0.8476 (normal table, from memory)
    expect(p).toBeGreaterThan(0.84);
    expect(p).toBeLessThan(0.86);
  });
});

describe('priors', () => {
  test('PRIOR_FROM_MEAN: alpha = mean × strength, beta = (1 − mean) × strength', () => {
    const r = ref.priorFromMean;
    expectSpill(F.priorFromMean(r.meanRate, r.strength), [[r.alpha, r.beta]], 1e-14);
  });

  test('PRIOR_FROM_INTERVAL: default level 0.90, and a 0.95 level (scipy fsolve of beta.ppf)', () => {
    const a = ref.priorFromInterval;
    expectSpill(F.priorFromInterval(a.low, a.high), [a.ab], 1e-9);
    const b = ref.priorFromIntervalLevel95;
    expectSpill(F.priorFromInterval(b.low, b.high, b.level), [b.ab], 1e-9);
  });

  test('PRIOR_FROM_INTERVAL: low above high is an error from the core', () => {
    const e = sheetError(() => F.priorFromInterval(0.07, 0.03));
    expect(e.code).toBe('#VALUE!');
    expect(e.message).toMatch(/low|high/);
  });

  test("PRIOR_FROM_HISTORY: likelihood fit equals scipy's Beta–Binomial maximum likelihood; row or column", () => {
    const h = ref.priorFromHistory;
    expectSpill(F.priorFromHistory(col(h.conversions), col(h.visitors)), [h.likelihood], 1e-5);
    expectSpill(F.priorFromHistory(row(h.conversions), row(h.visitors), 'likelihood'), [h.likelihood], 1e-5);
  });

  test('PRIOR_FROM_HISTORY: moments gives a prior whose mean is near the pooled rate', () => {
    const h = ref.priorFromHistory;
    const [[alpha, beta]] = F.priorFromHistory(col(h.conversions), col(h.visitors), 'moments') as [[number, number]];
    const pooled = h.conversions.reduce((a, b) => a + b, 0) / h.visitors.reduce((a, b) => a + b, 0);
    expect(Math.abs(alpha / (alpha + beta) - pooled)).toBeLessThan(0.005);
    expect(alpha + beta).toBeGreaterThan(50);
    expect(alpha + beta).toBeLessThan(2000);
  });

  test('PRIOR_FROM_HISTORY: at least 3 past results; method words checked', () => {
    expect(sheetError(() => F.priorFromHistory(col([1, 2]), col([10, 20])))).toEqual({
      code: '#VALUE!',
      message: 'at least 3 past results are needed; only 2 were given',
    });
    expect(sheetError(() => F.priorFromHistory(col([1, 2, 3]), col([10, 20, 30]), 'median'))).toEqual({
      code: '#VALUE!',
      message: 'method: "median" is not allowed; enter "likelihood" or "moments"',
    });
  });

  test('priors: scalar checks name the argument', () => {
    expect(sheetError(() => F.priorFromMean(1.2, 100))).toEqual({
      code: '#VALUE!',
      message: 'mean_rate: 1.2 is not allowed; enter a number from 1E-6 to 0.999999',
    });
    expect(sheetError(() => F.priorFromMean(0.1, 0))).toEqual({
      code: '#VALUE!',
      message: 'strength: 0 is not allowed; enter a number from 0.002 to 2E+6',
    });
  });
});

describe('planning', () => {
  test('DECISION_POWER: exact binomial sums (scipy), and the false-alarm rate at lift 0', () => {
    for (const c of ref.decisionPower) close(F.decisionPower(c.baseline, c.lift, c.n, c.threshold), c.power, 1e-9);
    const c0 = ref.decisionPower[0];
    if (c0) close(F.decisionPower(c0.baseline, c0.lift, c0.n), c0.power, 1e-9); // default threshold 0.95
  });

  test('VISITORS_NEEDED: the first n whose DECISION_POWER reaches the power', () => {
    const n = F.visitorsNeeded(0.1, 0.2);
    expect(n).toBe(3024);
    // scipy's exact decision power on both sides of the answer (addin_visitors_needed.py):
    // 3023 visitors give 0.79988 < 0.8, 3024 give 0.800001 ≥ 0.8
    for (const c of visitorsNeededRef.cases)
      close(F.decisionPower(c.baseline, c.lift, c.n, c.threshold), c.power, 1e-9);
    const [below, at] = visitorsNeededRef.cases;
    expect([below?.n, below && below.power < 0.8, at?.n, at && at.power >= 0.8]).toEqual([n - 1, true, n, true]);
  });

  test("CLASSIC_SAMPLE_SIZE equals R's power.prop.test n rounded up", () => {
    // R 4.2: power.prop.test(p1 = 0.10, p2 = 0.15, power = 0.8) → n = 685.596858 (docs/check-values.md)
    expect(F.classicSampleSize(0.1, 0.5)).toBe(686);
    // power.prop.test(p1 = 0.05, p2 = 0.055, power = 0.8) → 31233.43794
    expect(F.classicSampleSize(0.05, 0.1)).toBe(31234);
    // power.prop.test(p1 = 0.20, p2 = 0.25, power = 0.9) → 1463.707305
    expect(F.classicSampleSize(0.2, 0.25, 0.05, 0.9)).toBe(1464);
    // power.prop.test(p1 = 0.02, p2 = 0.025, power = 0.8, alternative = "one.sided") → 10877.163065
    expect(F.classicSampleSize(0.02, 0.25, 0.05, 0.8, 1)).toBe(10878);
  });

  test('planning: argument checks', () => {
    expect(sheetError(() => F.classicSampleSize(0.1, 0.5, 0.05, 0.8, 3))).toEqual({
      code: '#VALUE!',
      message: 'sides: 3 is not allowed; enter a whole number from 1 to 2',
    });
    expect(sheetError(() => F.decisionPower(0.1, 0.2, 100.5))).toEqual({
      code: '#VALUE!',
      message: 'visitors_per_variant: 100.5 is not a whole number',
    });
    expect(sheetError(() => F.visitorsNeeded(0, 0.2))).toEqual({
      code: '#VALUE!',
      message: 'baseline_rate: 0 is not allowed; enter a number from 1E-6 to 0.999999',
    });
  });
});

describe('SRM_PVALUE against R chisq.test', () => {
  test.each(srm.cases.map((c, i) => [i, c] as const))('case %i, column input with planned shares', (_i, c) => {
    close(F.srmPvalue(col(c.visitors), col(c.shares)), c.pValue, 1e-9, 1e-300);
  });

  test('equal shares by default; row input; blank positions skipped', () => {
    const c = srm.cases[0] as { visitors: number[]; pValue: number };
    close(F.srmPvalue(col(c.visitors)), c.pValue, 1e-9);
    close(F.srmPvalue(row(c.visitors)), c.pValue, 1e-9);
    close(F.srmPvalue(col([c.visitors[0], '', c.visitors[1]])), c.pValue, 1e-9);
  });

  test('errors', () => {
    expect(sheetError(() => F.srmPvalue(col([100])))).toEqual({
      code: '#VALUE!',
      message: 'at least 2 variants are needed to compare; only 1 was given',
    });
    expect(sheetError(() => F.srmPvalue(col([100, 120]), col([1, '']))).message).toBe(
      'planned_shares, item 2: is blank; enter a number from 1E-6 to 1E+12',
    );
  });
});

describe('averages (Student t posteriors) against scipy', () => {
  const m = ref.meanTwo;
  const m3 = ref.meanThree;
  const a2 = [col(m.count), col(m.mean), col(m.sd)] as const;
  const a3 = [col(m3.count), col(m3.mean), col(m3.sd)] as const;

  test('MEAN_INTERVAL equals the t interval mean ± t.ppf × sd/√n', () => {
    expectSpill(F.meanInterval(...a2), m.meanInterval);
    expectSpill(F.meanInterval(...a3, 0.9), m3.meanInterval);
    expectSpill(F.meanInterval(row(m.count), row(m.mean), row(m.sd)), transpose(m.meanInterval) as number[][]);
  });

  test('MEAN_PROB_HIGHEST, MEAN_PROB_ABOVE_CONTROL', () => {
    expectSpill(F.meanProbHighest(...a2), col(m.probHighest) as number[][]);
    expectSpill(F.meanProbHighest(...a3), col(m3.probHighest) as number[][]);
    expectSpill(F.meanProbAboveControl(...a3), vsControl(m3.probAboveControl));
  });

  test('MEAN_DIFF_INTERVAL, MEAN_LIFT_INTERVAL', () => {
    expectSpill(F.meanDiffInterval(...a2), blockVsControl(m.diffInterval), 1e-9);
    expectSpill(F.meanDiffInterval(...a3, 0.9), blockVsControl(m3.diffInterval), 1e-9);
    expectSpill(F.meanLiftInterval(...a2), blockVsControl(m.liftInterval), 1e-9);
    expectSpill(F.meanLiftInterval(...a3, 0.9), blockVsControl(m3.liftInterval), 1e-9);
  });

  test('MEAN_EXPECTED_LOSS', () => {
    expectSpill(F.meanExpectedLoss(...a2), col(m.expectedLoss) as number[][], 1e-9);
    expectSpill(F.meanExpectedLoss(...a3), col(m3.expectedLoss) as number[][], 1e-9);
  });

  test('blank rows and errors', () => {
    const out = F.meanProbAboveControl(col([1200, '', 1180]), col([3.1, '', 3.42]), col([9.8, null, 10.4]));
    expectSpill(out, [[''], [''], [m.probAboveControl[0] as number]]);
    expect(sheetError(() => F.meanInterval(col([1, 5]), col([1, 2]), col([1, 1])))).toEqual({
      code: '#VALUE!',
      message: 'count, item 1: 1 is not allowed; enter a whole number, at least 2',
    });
    expect(sheetError(() => F.meanDiffInterval(col([10, 12]), col([1, 2]), row([1, 1])))).toEqual({
      code: '#VALUE!',
      message: 'count and sd must have the same shape: count is 2 rows × 1 column, sd is 1 row × 2 columns',
    });
  });

  test('MEAN_LIFT_INTERVAL: #N/A naming the control when its mean could be ≤ 0', () => {
    const e = sheetError(() => F.meanLiftInterval(col([10, 10]), col([0.1, 2]), col([5, 5])));
    expect(e.code).toBe('#N/A');
    expect(e.message).toMatch(/control/);
  });
});

describe('counts per exposure (Gamma posteriors) against scipy', () => {
  const e = ref.eventsTwo;
  const e3 = ref.eventsThree;
  const a2 = [col(e.events), col(e.exposure)] as const;
  const a3 = [col(e3.events), col(e3.exposure)] as const;

  test('EVENTS_RATE_INTERVAL: gamma quantiles; default prior Gamma(1, 0) and an informative one', () => {
    expectSpill(F.eventsRateInterval(...a2), e.rateInterval);
    expectSpill(F.eventsRateInterval(...a3, 0.9, 2, 10), e3.rateInterval);
    expectSpill(F.eventsRateInterval(row(e.events), row(e.exposure)), transpose(e.rateInterval) as number[][]);
  });

  test('EVENTS_PROB_HIGHEST, EVENTS_PROB_ABOVE_CONTROL (also the closed form I_z(a_A, a_B))', () => {
    expectSpill(F.eventsProbHighest(...a2), col(e.probHighest) as number[][]);
    expectSpill(F.eventsProbHighest(...a3, 2, 10), col(e3.probHighest) as number[][]);
    expectSpill(F.eventsProbAboveControl(...a2), vsControl(e.probAboveControlClosedForm), 1e-9);
    expectSpill(F.eventsProbAboveControl(...a3, 2, 10), vsControl(e3.probAboveControlClosedForm), 1e-9);
  });

  test('EVENTS_LIFT_INTERVAL, EVENTS_EXPECTED_LOSS', () => {
    expectSpill(F.eventsLiftInterval(...a2), blockVsControl(e.liftInterval), 1e-9);
    expectSpill(F.eventsLiftInterval(...a3, 0.9, 2, 10), blockVsControl(e3.liftInterval), 1e-9);
    expectSpill(F.eventsExpectedLoss(...a2), col(e.expectedLoss) as number[][], 1e-9);
    expectSpill(F.eventsExpectedLoss(...a3, 2, 10), col(e3.expectedLoss) as number[][], 1e-9);
  });

  test('blank rows and errors', () => {
    const out = F.eventsProbHighest(col(['', 340, 395]), col([null, 1000, 1010]));
    expectSpill(out, [[''], [e.probHighest[0] as number], [e.probHighest[1] as number]]);
    expect(sheetError(() => F.eventsRateInterval(col([3.5]), col([10])))).toEqual({
      code: '#VALUE!',
      message: 'events, item 1: 3.5 is not a whole number',
    });
    expect(sheetError(() => F.eventsExpectedLoss(col([3, 4]), col([10, 0])))).toEqual({
      code: '#VALUE!',
      message: 'exposure, item 2: 0 is not allowed; enter a number from 1E-6 to 1E+12',
    });
    expect(sheetError(() => F.eventsProbAboveControl(col([3, 4]), col([10, 10]), 0))).toEqual({
      code: '#VALUE!',
      message: 'prior_shape: 0 is not allowed; enter a number from 0.001 to 1E+6',
    });
  });
});

// The functions of issue #13, against their references: test/reference/means/lift_above_reference.py (scipy quad
// and betaincc) and test/reference/revenue/revenue_reference.py (nested scipy quadrature of R = p × v).
const liftAbove = readJson<{
  means: {
    name: string;
    variants: { count: number; mean: number; sd: number }[];
    minLifts: number[];
    above: number[][];
  }[];
  events: {
    name: string;
    variants: { events: number; exposure: number }[];
    minLifts: number[];
    aboveClosedForm: number[][];
  }[];
}>('means/lift_above_values.json');
interface RevenueCase {
  name: string;
  variants: { orders: number; visitors: number; revenue: number; orderSd?: number }[];
  intervals: number[][];
  probHighest: number[];
  probAboveControl: number[];
  expectedLoss?: number[];
  liftAbove?: { minLift: number; above: number }[];
  liftInterval?: number[];
}
const revenueRef = readJson<{ cases: RevenueCase[] }>('revenue/revenue_values.json');
const revenueCase = (name: string): RevenueCase => {
  const found = revenueRef.cases.find((c) => c.name === name);
  if (found === undefined) throw new Error(`no revenue reference case ${name}`);
  return found;
};

describe('P(lift > min_lift) and the decision for averages and counts', () => {
  test('MEAN_PROB_LIFT_ABOVE against scipy quadrature of the ratio', () => {
    const c = liftAbove.means.find((x) => x.name === 'means_large');
    if (c === undefined) throw new Error('no means_large case');
    c.minLifts.forEach((m, row) => {
      const out = F.meanProbLiftAbove(
        col(c.variants.map((v) => v.count)),
        col(c.variants.map((v) => v.mean)),
        col(c.variants.map((v) => v.sd)),
        m,
      );
      expectSpill(out, vsControl(c.above[row] as number[]), 1e-9);
    });
  });

  test('EVENTS_PROB_LIFT_ABOVE against the closed form (scipy betaincc)', () => {
    const c = liftAbove.events.find((x) => x.name === 'events_typical');
    if (c === undefined) throw new Error('no events_typical case');
    c.minLifts.forEach((m, row) => {
      const out = F.eventsProbLiftAbove(
        col(c.variants.map((v) => v.events)),
        col(c.variants.map((v) => v.exposure)),
        m,
      );
      expectSpill(out, vsControl(c.aboveClosedForm[row] as number[]), 1e-9);
    });
  });

  test("MEAN_DECISION and EVENTS_DECISION: the rule of DECISION, the loss in the metric's units", () => {
    expect(
      F.meanDecision(col([1200, 1180]), col([3.1, 3.42]), col([9.8, 10.4]), 0.1, col(['Old page', 'New page'])),
    ).toBe(
      "Choose New page: its expected loss 0.052 in the metric's units is within the 0.10 in the metric's units allowed",
    );
    expect(F.eventsDecision(row([340, 395]), row([1000, 1010]), 0.0001)).toBe(
      'Keep collecting data: B leads, but its expected loss 0.00030 events per unit of exposure is above the 0.00010 events per unit of exposure allowed',
    );
    expect(sheetError(() => F.meanDecision(col([20, 20]), col([0, 0.5]), col([1, 1])))).toEqual({
      code: '#N/A',
      message:
        "max_loss: the default, 1% of the control's mean, is 0 because that mean is 0; give max_loss in the metric's units",
    });
    expect(sheetError(() => F.eventsDecision(col([3, 4]), col([10, 10]), -1))).toEqual({
      code: '#VALUE!',
      message: 'max_loss: -1 is not allowed; enter a number from 0 to 1E+12',
    });
  });
});

describe('revenue per visitor from totals against nested scipy quadrature', () => {
  const args = (c: RevenueCase, withSd: boolean) =>
    [
      col(c.variants.map((v) => v.orders)),
      col(c.variants.map((v) => v.visitors)),
      col(c.variants.map((v) => v.revenue)),
      withSd ? col(c.variants.map((v) => v.orderSd)) : undefined,
    ] as const;

  test.each([
    ['exponential order values', 'exp_typical', false],
    ['order_sd given (t)', 't_typical', true],
  ] as const)('%s: every function of the family', (_label, name, withSd) => {
    const c = revenueCase(name);
    const [orders, visitors, revenue, orderSd] = args(c, withSd);
    expectSpill(F.revenueInterval(orders, visitors, revenue, orderSd), c.intervals, 1e-9);
    expectSpill(F.revenueProbHighest(orders, visitors, revenue, orderSd), col(c.probHighest) as number[][], 1e-9);
    expectSpill(F.revenueProbAboveControl(orders, visitors, revenue, orderSd), vsControl(c.probAboveControl), 1e-9);
    expectSpill(
      F.revenueExpectedLoss(orders, visitors, revenue, orderSd),
      col(c.expectedLoss as number[]) as number[][],
      1e-9,
    );
    const lift = c.liftInterval as number[];
    expectSpill(F.revenueLiftInterval(orders, visitors, revenue, orderSd), blockVsControl([lift]), 1e-9);
    for (const l of c.liftAbove as { minLift: number; above: number }[]) {
      expectSpill(F.revenueProbLiftAbove(orders, visitors, revenue, l.minLift, orderSd), vsControl([l.above]), 1e-9);
    }
  });

  test("REVENUE_DECISION: DECISION's rule, the loss per visitor without a currency symbol", () => {
    const c = revenueCase('exp_typical');
    const [orders, visitors, revenue] = args(c, false);
    expect(F.revenueDecision(orders, visitors, revenue, undefined, 0.1, col(['Old', 'New']))).toBe(
      'Choose New: its expected loss 0.076 per visitor is within the 0.10 per visitor allowed',
    );
  });

  test('a row input spills a row; blank positions give "" slots', () => {
    const out = F.revenueProbHighest(row([120, '', 150]), row([2400, null, 2380]), row([7200, ' ', 8100]));
    const [a, b] = revenueCase('exp_typical').probHighest as [number, number];
    expectSpill(out, [[a, '', b]], 1e-9);
  });

  test('errors reach the cell with code and message', () => {
    expect(sheetError(() => F.revenueInterval(col([130]), col([120]), col([10])))).toEqual({
      code: '#VALUE!',
      message: 'orders, item 1: 130 is more than the 120 visitors',
    });
    expect(sheetError(() => F.revenueProbAboveControl(col([120, 0]), col([2400, 300]), col([7200, 0])))).toEqual({
      code: '#N/A',
      message:
        "orders, item 2: no orders yet, so nothing is known about this variant's order value and its revenue per " +
        'visitor has no posterior; wait for its first order',
    });
    expect(sheetError(() => F.revenueProbAboveControl(col([120, 3]), col([2400, 300]), col([7200, 0])))).toEqual({
      code: '#N/A',
      message:
        'revenue, item 2: 0 from 3 orders; with exponential order values a total of 0 has no posterior; give ' +
        'order_sd (the t model) if orders can be free',
    });
    expect(
      sheetError(() => F.revenueProbAboveControl(col([120, 150]), col([2400, 2380]), col([7200, 8100]), col([55, '']))),
    ).toEqual({
      code: '#VALUE!',
      message: 'order_sd, item 2: is blank; enter 0, or a number from 1E-6 to 1E+12',
    });
    expect(sheetError(() => F.revenueExpectedLoss(col([1, 3]), col([50, 55]), col([40, 150])))).toEqual({
      code: '#N/A',
      message:
        "orders, item 1: with 1 order the exponential model's average order value has no finite mean, so every " +
        'expected loss is infinite; wait for a second order (or give order_sd once there are 3)',
    });
    const whale = sheetError(() =>
      F.revenueLiftInterval(col([400, 420]), col([20000, 20000]), col([20000, 22000]), col([1000, 1100])),
    );
    expect(whale.code).toBe('#N/A');
    expect(whale.message).toMatch(
      /^order_sd, item 1: the control's average order value could plausibly be zero or negative \(/,
    );
  });
});

describe('no NaN, no Infinity, no raw errors', () => {
  test('extreme but valid inputs give finite cells or a worksheet error', () => {
    const calls: (() => unknown)[] = [
      () => F.probHighest(col([0, 0]), col([1, 1])),
      () => F.expectedLoss(col([1, 1]), col([1, 1])),
      () => F.liftInterval(col([0, 5]), col([10, 10])),
      () => F.rateInterval(col([0]), col([1]), 0.999999, 1, 1, 'hdi'),
      () => F.meanExpectedLoss(col([2, 2]), col([1, 2]), col([1, 1])),
      () => F.eventsLiftInterval(col([0, 0]), col([1, 1])),
      () => F.srmPvalue(col([0, 0])),
    ];
    for (const call of calls) {
      let out: unknown;
      try {
        out = call();
      } catch (e) {
        const err = e as { code?: string; message: string };
        expect(['#VALUE!', '#N/A']).toContain(err.code);
        expect(err.message.length).toBeGreaterThan(10);
        continue;
      }
      const cells = Array.isArray(out) ? (out as unknown[][]).flat() : [out];
      for (const cell of cells) if (typeof cell === 'number') expect(Number.isFinite(cell)).toBe(true);
    }
  });
});
