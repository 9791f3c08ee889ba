/**
 * The preview's demo workbook, evaluated headless: HyperFormula (smartRounding off) with the REAL add-in
 * bundle dist/functions.js + dist/functions.json registered by the page's own code (preview/src/abtestPlugin.ts).
 * CI runs `npm run build` before `npm test`; without dist/ this test fails with that instruction.
 *
 * Every ABTEST cell of the workbook is compared with the statistics core called directly
 * (functions/stats/…), and a few with values from outside the project: closed forms, scipy
 * (test/reference/addin/preview_workbook.py → preview_workbook.json) and R (docs/check-values.md).
 */
import * as fs from 'fs';
import * as path from 'path';
import { DetailedCellError } from 'hyperformula';
import {
  posteriorMean,
  rateInterval,
  probHighest,
  probAboveControl,
  liftInterval,
  rateDiffInterval,
  probLiftAbove,
  expectedLoss,
  decide,
  posteriorDensityTable,
  liftDensityTable,
} from '../../functions/stats/conversion';
import { priorFromHistory, priorFromInterval, priorFromMean } from '../../functions/stats/prior';
import { classicSampleSize, decisionPower, visitorsNeeded } from '../../functions/stats/planning';
import { srmPValue } from '../../functions/stats/srm';
import {
  meanDiffInterval,
  meanExpectedLoss,
  meanInterval,
  meanLiftInterval,
  meanDecide,
  meanProbAboveControl,
  meanProbHighest,
  meanProbLiftAbove,
} from '../../functions/stats/normalMeans';
import {
  eventsDecide,
  eventsExpectedLoss,
  eventsLiftInterval,
  eventsProbAboveControl,
  eventsProbHighest,
  eventsProbLiftAbove,
  eventsRateInterval,
} from '../../functions/stats/eventRates';
import {
  revenueDecide,
  revenueExpectedLoss,
  revenueInterval,
  revenueLiftInterval,
  revenueProbAboveControl,
  revenueProbHighest,
  revenueProbLiftAbove,
} from '../../functions/stats/revenuePerVisitor';
import { CATALOGUE_LIST } from '../../functions/catalogue';
import { SHIPPED_0_1_0 } from '../helpers/shipped';
import { amountDecisionCell, decisionText } from '../../functions/sheet/decision';
import { FLAT_GAMMA_PRIOR, UNIFORM_PRIOR, type BetaPrior, type ConversionCounts } from '../../functions/stats/types';
import { buildDemoWorkbook, columnLetters, parseA1 } from '../../preview/src/demoWorkbook';
import { PreviewWorkbook } from '../../preview/src/previewWorkbook';
import { SPILL_RULES } from '../../preview/src/spillLayout';
import { loadAndRegister, REPO_ROOT } from './loadBundle';
import reference from '../reference/addin/preview_workbook.json';

type Cell = number | string | boolean;

const DIST = path.join(REPO_ROOT, 'dist');
const loaded = loadAndRegister(path.join(DIST, 'functions.js'), path.join(DIST, 'functions.json'));

/** |actual − expected| ≤ tol · max(1, |expected|), with a message naming the cell. */
function expectNumber(actual: unknown, expected: number, where: string, tol = 1e-12): void {
  if (typeof actual !== 'number')
    throw new Error(`${where}: expected a number near ${expected}, got ${JSON.stringify(actual)}`);
  const scale = Math.max(1, Math.abs(expected));
  if (!(Math.abs(actual - expected) <= tol * scale)) {
    throw new Error(
      `${where}: ${actual} differs from ${expected} by ${Math.abs(actual - expected)} (tolerance ${tol * scale})`,
    );
  }
}

/** Compares a block of the sheet with expected cells ("" for an empty slot, numbers within 1e-12). */
function expectBlock(actual: Cell[][], expected: Cell[][], where: string, tol = 1e-12): void {
  expect(actual.length).toBe(expected.length);
  expected.forEach((row, r) => {
    expect(actual[r]?.length).toBe(row.length);
    row.forEach((value, c) => {
      const got = actual[r]?.[c];
      const at = `${where} row ${r + 1} col ${c + 1}`;
      if (typeof value === 'number') expectNumber(got, value, at, tol);
      else expect({ at, value: got }).toEqual({ at, value });
    });
  });
}

const column = (values: readonly number[]): Cell[][] => values.map((v) => [v]);
const versusControl = (rows: readonly Cell[][], width: number): Cell[][] => [Array<Cell>(width).fill(''), ...rows];
const lmu = (ivs: readonly { lower: number; median: number; upper: number }[]): Cell[][] =>
  ivs.map((iv) => [iv.lower, iv.median, iv.upper]);
const lu = (ivs: readonly { lower: number; upper: number }[]): Cell[][] => ivs.map((iv) => [iv.lower, iv.upper]);
const densityTable = (t: { grid: number[]; densities: number[][] }): Cell[][] =>
  t.grid.map((x, i) => [x, ...t.densities.map((d) => d[i] as number)]);

describe('preview demo workbook with the built add-in', () => {
  const book = PreviewWorkbook.create(buildDemoWorkbook());
  const sheetOf = (name: string): number => {
    const id = book.sheetId(name);
    if (id === undefined) throw new Error(`no sheet ${name}`);
    return id;
  };
  const read = (sheet: string, address: string, rows = 1, columns = 1): Cell[][] => {
    const { row, col } = parseA1(address);
    return book.values({ sheet: sheetOf(sheet), row, col, rows, columns });
  };
  const num = (sheet: string, address: string): number => read(sheet, address)[0]?.[0] as number;
  const text = (sheet: string, address: string): Cell => read(sheet, address)[0]?.[0] as Cell;

  // The demo inputs, read back from the sheets (so the test follows the workbook).
  const checkout = (): { variants: ConversionCounts[]; labels: string[] } => {
    const rows = read('Checkout test', 'A4', 3, 9);
    return {
      labels: rows.map((r) => String(r[0])),
      variants: rows.map((r) => ({ conversions: r[2] as number, visitors: r[1] as number })),
    };
  };
  const means = () =>
    read('Checkout test', 'D4', 3, 3).map((r) => ({ count: r[0] as number, mean: r[1] as number, sd: r[2] as number }));
  const eventsOf = () =>
    read('Checkout test', 'G4', 3, 2).map((r) => ({ events: r[0] as number, exposure: r[1] as number }));
  const past = () => {
    const rows = read('Past tests', 'B4', 12, 2);
    return { conversions: rows.map((r) => r[0] as number), visitors: rows.map((r) => r[1] as number) };
  };
  const planInputs = () => read('Plan', 'B4', 5, 1).map((r) => r[0] as number);
  // The revenue totals (orders, visitors, revenue, order sd) of the revenue-from-totals block.
  const totals = (withSd: boolean) =>
    read('Checkout test', 'B103', 3, 4).map((r) => ({
      orders: r[0] as number,
      visitors: r[1] as number,
      revenue: r[2] as number,
      ...(withSd ? { orderSd: r[3] as number } : {}),
    }));

  /** Expected contents of every ABTEST formula cell, keyed by "Sheet!A1" of the formula. */
  const expectations = (): Record<string, () => { rows: number; columns: number; cells: Cell[][]; tol?: number }> => {
    const { variants, labels } = checkout();
    const historyPrior: BetaPrior = priorFromHistory(past().conversions, past().visitors, 'likelihood');
    const [baseline, lift, perVariant, threshold, power] = planInputs() as [number, number, number, number, number];
    const block = (cells: Cell[][], tol?: number) => () => ({
      rows: cells.length,
      columns: cells[0]?.length ?? 1,
      cells,
      tol,
    });
    const lazy = (make: () => Cell[][], tol?: number) => () => {
      const cells = make();
      return { rows: cells.length, columns: cells[0]?.length ?? 1, cells, tol };
    };
    return {
      'Checkout test!B11': block(column(posteriorMean(variants, UNIFORM_PRIOR))),
      'Checkout test!B15': block(lu(rateInterval(variants, 0.95, UNIFORM_PRIOR, 'central'))),
      'Checkout test!B19': block(lu(rateInterval(variants, 0.9, UNIFORM_PRIOR, 'hdi'))),
      'Checkout test!B23': block(column(probHighest(variants, UNIFORM_PRIOR))),
      'Checkout test!B27': block(versusControl(column(probAboveControl(variants, UNIFORM_PRIOR)), 1)),
      'Checkout test!B31': block(versusControl(lmu(liftInterval(variants, 0.95, UNIFORM_PRIOR)), 3)),
      'Checkout test!B35': block(versusControl(lmu(rateDiffInterval(variants, 0.95, UNIFORM_PRIOR)), 3)),
      'Checkout test!B39': block(versusControl(column(probLiftAbove(variants, 0.05, UNIFORM_PRIOR)), 1)),
      'Checkout test!B43': block(column(expectedLoss(variants, UNIFORM_PRIOR))),
      'Checkout test!B47': lazy(() => {
        const d = decide(variants, undefined, UNIFORM_PRIOR);
        return [[decisionText({ choose: d.choose, label: labels[d.index] ?? '?', loss: d.loss, maxLoss: d.maxLoss })]];
      }),
      'Checkout test!B49': block(column(probHighest(variants, historyPrior)), 1e-10),
      'Checkout test!B53': block([
        [
          srmPValue(
            variants.map((v) => v.visitors),
            [1, 1, 1],
          ),
        ],
      ]),
      'Checkout test!B57': block(lu(meanInterval(means(), 0.95))),
      'Checkout test!B61': block(column(meanProbHighest(means()))),
      'Checkout test!B65': block(versusControl(column(meanProbAboveControl(means())), 1)),
      'Checkout test!B69': block(versusControl(lmu(meanDiffInterval(means(), 0.95)), 3)),
      'Checkout test!B73': block(versusControl(lmu(meanLiftInterval(means(), 0.95)), 3)),
      'Checkout test!B77': block(column(meanExpectedLoss(means()))),
      'Checkout test!B82': block(lu(eventsRateInterval(eventsOf(), 0.95, FLAT_GAMMA_PRIOR))),
      'Checkout test!B86': block(column(eventsProbHighest(eventsOf(), FLAT_GAMMA_PRIOR))),
      'Checkout test!B90': block(versusControl(column(eventsProbAboveControl(eventsOf(), FLAT_GAMMA_PRIOR)), 1)),
      'Checkout test!B94': block(versusControl(lmu(eventsLiftInterval(eventsOf(), 0.95, FLAT_GAMMA_PRIOR)), 3)),
      'Checkout test!B98': block(column(eventsExpectedLoss(eventsOf(), FLAT_GAMMA_PRIOR))),
      'Checkout test!B108': lazy(() => lu(revenueInterval(totals(false), 0.95))),
      'Checkout test!B112': lazy(() => column(revenueProbHighest(totals(false)))),
      'Checkout test!B116': lazy(() => versusControl(column(revenueProbAboveControl(totals(true))), 1)),
      'Checkout test!B120': lazy(() => versusControl(lmu(revenueLiftInterval(totals(true), 0.95)), 3)),
      'Checkout test!B124': lazy(() => versusControl(column(revenueProbLiftAbove(totals(true), -0.02)), 1)),
      'Checkout test!B128': lazy(() => column(revenueExpectedLoss(totals(true)))),
      'Checkout test!B131': lazy(() => [
        [amountDecisionCell({ positions: [0, 1, 2] }, labels, revenueDecide(totals(true), undefined), 'per visitor')],
      ]),
      'Checkout test!B134': lazy(() => versusControl(column(meanProbLiftAbove(means(), -0.02)), 1)),
      'Checkout test!B137': lazy(() => [
        [amountDecisionCell({ positions: [0, 1, 2] }, labels, meanDecide(means(), undefined), "in the metric's units")],
      ]),
      'Checkout test!B140': lazy(() =>
        versusControl(column(eventsProbLiftAbove(eventsOf(), 0.05, FLAT_GAMMA_PRIOR)), 1),
      ),
      'Checkout test!B143': lazy(() => [
        [
          amountDecisionCell(
            { positions: [0, 1, 2] },
            labels,
            eventsDecide(eventsOf(), undefined, FLAT_GAMMA_PRIOR),
            'events per unit of exposure',
          ),
        ],
      ]),
      'Checkout test!K11': block(densityTable(posteriorDensityTable(variants, 41, UNIFORM_PRIOR))),
      'Checkout test!K55': block(densityTable(liftDensityTable(variants, 41, UNIFORM_PRIOR))),
      'Past tests!B17': block([[historyPrior.alpha, historyPrior.beta]]),
      'Past tests!B18': lazy(() => {
        const p = priorFromHistory(past().conversions, past().visitors, 'moments');
        return [[p.alpha, p.beta]];
      }),
      'Past tests!B20': block([[priorFromMean(0.04, 500).alpha, priorFromMean(0.04, 500).beta]]),
      'Past tests!B21': block([[priorFromInterval(0.03, 0.06, 0.9).alpha, priorFromInterval(0.03, 0.06, 0.9).beta]]),
      'Plan!B10': lazy(() => [[decisionPower(baseline, lift, perVariant, threshold, UNIFORM_PRIOR)]]),
      'Plan!B11': lazy(() => [[decisionPower(baseline, 0, perVariant, threshold, UNIFORM_PRIOR)]]),
      'Plan!B12': lazy(() => [[visitorsNeeded(baseline, lift, threshold, power, UNIFORM_PRIOR)]]),
      'Plan!B13': lazy(() => [[classicSampleSize(baseline, lift, 0.05, power, 2)]]),
    };
  };

  /** Every formula cell that calls an ABTEST function, as "Sheet!A1" → formula. */
  const abtestCells = (): Map<string, string> => {
    const found = new Map<string, string>();
    for (const name of book.sheetNames()) {
      const sheet = sheetOf(name);
      const { rows, columns } = book.usedSize(sheet);
      for (let r = 0; r < rows; r += 1) {
        for (let c = 0; c < columns; c += 1) {
          const formula = book.hf.getCellFormula({ sheet, row: r, col: c });
          if (formula && /ABTEST\./i.test(formula)) found.set(`${name}!${columnLetters(c)}${r + 1}`, formula);
        }
      }
    }
    return found;
  };

  it('registers every function of dist/functions.json, and the spill layout knows every matrix result', () => {
    const ids = loaded.metadata.functions.map((f) => f.id.toUpperCase());
    expect(loaded.definition.names).toHaveLength(ids.length);
    const matrixWithoutRule = loaded.metadata.functions.filter(
      (f) => f.result?.dimensionality === 'matrix' && !SPILL_RULES[f.id.toUpperCase()],
    );
    expect(matrixWithoutRule.map((f) => f.id)).toEqual([]);
    // every function of the catalogue (functions/catalogue.ts), in its order
    expect(ids).toEqual(CATALOGUE_LIST.map((f) => f.id));
  });

  it('keeps HyperFormula (GPL-v3 key) out of the add-in bundles in dist/: it lives only in the preview bundle', () => {
    const bundles = fs.readdirSync(DIST).filter((f) => f.endsWith('.js'));
    expect(bundles).toContain('functions.js');
    for (const file of bundles) {
      const source = fs.readFileSync(path.join(DIST, file), 'utf8');
      expect({ file, mentionsHyperFormula: /hyperformula|gpl-v3/i.test(source) }).toEqual({
        file,
        mentionsHyperFormula: false,
      });
    }
  });

  it('uses every function of the first release at least once, each with a label beside it', () => {
    const cells = abtestCells();
    const used = new Set<string>();
    for (const formula of cells.values())
      for (const m of formula.matchAll(/ABTEST\.([A-Z_]+)\s*\(/gi)) used.add((m[1] ?? '').toUpperCase());
    // every function of 0.1.0 is shown; functions added since may be (adding one needs no demo edit)
    expect(SHIPPED_0_1_0.filter((id) => !used.has(id))).toEqual([]);
    const known = new Set(loaded.metadata.functions.map((f) => f.name.toUpperCase()));
    expect([...used].filter((id) => !known.has(id))).toEqual([]);
    for (const key of cells.keys()) {
      const [sheet, address] = key.split('!') as [string, string];
      const { row, col } = parseA1(address);
      const left = col > 0 ? book.cell(sheetOf(sheet), row, col - 1) : undefined;
      const above = row > 0 ? book.cell(sheetOf(sheet), row - 1, col) : undefined;
      const label = [left, above].find((v) => v?.kind === 'text' && v.text.length > 8);
      expect({ key, hasLabel: label !== undefined }).toEqual({ key, hasLabel: true });
    }
    for (const sheet of book.sheetNames()) expect(String(text(sheet, 'A2'))).toMatch(/Invented demo data/);
  });

  it('computes every ABTEST cell exactly as the statistics core does', () => {
    const expected = expectations();
    expect([...abtestCells().keys()].sort()).toEqual(Object.keys(expected).sort());
    for (const [key, make] of Object.entries(expected)) {
      const [sheet, address] = key.split('!') as [string, string];
      const want = make();
      const got = read(sheet, address, want.rows, want.columns);
      expectBlock(got, want.cells, key, want.tol);
      // nothing beyond the block belongs to the spill
      const { row, col } = parseA1(address);
      const below = book.cell(sheetOf(sheet), row + want.rows, col);
      expect({ key, belowIsSpill: below.spilled }).toEqual({ key, belowIsSpill: false });
    }
  });

  it('agrees with outside references on the demo numbers (scipy, test/reference/addin/preview_workbook.json)', () => {
    // Beta posterior mean (1 + x) / (2 + n), uniform prior: closed form, common practice
    reference.posterior_mean.forEach((m, i) =>
      expectNumber(num('Checkout test', `B${11 + i}`), m, `posterior mean ${i + 1}`, 1e-13),
    );
    // scipy.stats.beta.ppf(0.025 | 0.975, 1 + x, 1 + n − x)
    reference.rate_interval_central_95.forEach(([lo, hi], i) => {
      expectNumber(num('Checkout test', `B${15 + i}`), lo as number, `rate interval lower ${i + 1}`, 1e-9);
      expectNumber(num('Checkout test', `C${15 + i}`), hi as number, `rate interval upper ${i + 1}`, 1e-9);
    });
    // Evan Miller (2015) exact sum for P(p_B > p_A), evaluated with scipy.special.betaln
    reference.prob_above_control.forEach((p, i) =>
      expectNumber(num('Checkout test', `B${28 + i}`), p, `P(beats control) ${i + 2}`, 1e-9),
    );
    // scipy.stats.chisquare(visitors) with equal expected shares
    expectNumber(num('Checkout test', 'B53'), reference.srm_pvalue_equal_shares, 'SRM p-value', 1e-9);
    // Student t posterior of the mean, x̄ ± t(0.975, n − 1)·s/√n (Gelman et al., BDA3 §3.2; scipy.stats.t.ppf)
    reference.mean_interval_95.forEach(([lo, hi], i) => {
      expectNumber(num('Checkout test', `B${57 + i}`), lo as number, `mean interval lower ${i + 1}`, 1e-9);
      expectNumber(num('Checkout test', `C${57 + i}`), hi as number, `mean interval upper ${i + 1}`, 1e-9);
    });
    // Gamma(1 + events, exposure) quantiles, scipy.stats.gamma.ppf
    reference.events_rate_interval_95.forEach(([lo, hi], i) => {
      expectNumber(num('Checkout test', `B${82 + i}`), lo as number, `events interval lower ${i + 1}`, 1e-9);
      expectNumber(num('Checkout test', `C${82 + i}`), hi as number, `events interval upper ${i + 1}`, 1e-9);
    });
    // P(λ_B > λ_A) = I_z(a_A, a_B), z = b_A/(b_A + b_B) (docs/check-values.md), scipy.special.betainc
    reference.events_prob_above_control.forEach((p, i) =>
      expectNumber(num('Checkout test', `B${91 + i}`), p, `events P(beats control) ${i + 2}`, 1e-9),
    );
    // PRIOR_FROM_MEAN(0.04, 500): alpha = 0.04·500 = 20, beta = 480 (closed form; a Beta(a, b) is worth a + b visitors, common practice)
    expectNumber(num('Past tests', 'B20'), 20, 'prior alpha', 1e-12);
    expectNumber(num('Past tests', 'C20'), 480, 'prior beta', 1e-12);
  });

  it('recalculates after edits, and matches R on the classic size and the split check (docs/check-values.md)', () => {
    const plan = sheetOf('Plan');
    const checkoutSheet = sheetOf('Checkout test');
    const savedPlan = read('Plan', 'B4', 5, 1);
    const savedVisitors = read('Checkout test', 'B4', 3, 1);
    const savedShares = read('Checkout test', 'I4', 3, 1);
    try {
      // R: power.prop.test(p1 = 0.10, p2 = 0.15, power = 0.8) gives n = 685.596858 → 686 per group
      book.write(plan, 3, 1, [[0.1], [0.5]]);
      expect(num('Plan', 'B13')).toBe(686);
      // R: chisq.test(c(20000, 20400, 39600), p = c(0.25, 0.25, 0.5)) gives X² = 12, p = 0.00247875218
      book.write(checkoutSheet, 3, 1, [[20000], [20400], [39600]]);
      book.write(checkoutSheet, 3, 8, [[1], [1], [2]]);
      expectNumber(num('Checkout test', 'B53'), 0.00247875218, 'SRM p-value vs R', 1e-8);
      // the conversion read-outs followed the new visitors: the core on the edited inputs
      const { variants } = checkout();
      column(posteriorMean(variants, UNIFORM_PRIOR)).forEach(([m], i) =>
        expectNumber(num('Checkout test', `B${11 + i}`), m as number, `edited mean ${i + 1}`),
      );
    } finally {
      book.write(plan, 3, 1, savedPlan);
      book.write(checkoutSheet, 3, 1, savedVisitors);
      book.write(checkoutSheet, 3, 8, savedShares);
    }
  });

  it('shows bad input as #VALUE! with the add-in’s message, and no cell holds a raw failure', () => {
    const checkoutSheet = sheetOf('Checkout test');
    const saved = read('Checkout test', 'B5', 1, 1);
    try {
      book.write(checkoutSheet, 4, 1, [[12.5]]);
      const value = book.hf.getCellValue({ sheet: checkoutSheet, row: 10, col: 1 });
      expect(value).toBeInstanceOf(DetailedCellError);
      expect((value as DetailedCellError).value).toBe('#VALUE!');
      expect((value as DetailedCellError).message).toMatch(/visitors.*2.*12\.5.*whole number/i);
    } finally {
      book.write(checkoutSheet, 4, 1, saved);
    }
    for (const key of abtestCells().keys()) {
      const [sheet, address] = key.split('!') as [string, string];
      const { row, col } = parseA1(address);
      const view = book.cell(sheetOf(sheet), row, col);
      expect({ key, kind: view.kind, message: view.message }).toEqual({
        key,
        kind: expect.not.stringMatching(/^error$/),
        message: undefined,
      });
    }
  });
});
