/**
 * The summary for decision-makers: its numbers are the statistics core's, checked against scipy for three
 * invented experiments (test/reference/addin/summary_reference.py → summary_values.json: P(best) and expected
 * loss by quadrature over the Beta posteriors, lift quantiles by root finding on the ratio's CDF, the split
 * check by scipy.stats.chisquare), and every number in its words is one of those values as shown. Also the
 * page itself: guardrails (none, passing, failing), the split check, the cautions that apply, lines short
 * enough to print, and a portrait page fitted to one page. The guardrails' probabilities are checked against
 * scipy too (test/reference/addin/summary_guardrails.py → summary_guardrails.json: Student t ratio by
 * quadrature, the Gamma rate ratio by its F distribution).
 */
import * as fs from 'fs';
import * as path from 'path';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import { chanceText } from '../../taskpane/logic/resultWords';
import { formatPercent } from '../../taskpane/logic/inputs';
import {
  LINE_LENGTH,
  SUMMARY_COLUMN_WIDTHS,
  signedPercent,
  summaryBlock,
  summaryLines,
  summaryNumbers,
  wrapText,
  type SummaryInput,
} from '../../taskpane/logic/summary';

interface ReferenceCase {
  names: string[];
  visitors: number[];
  conversions: number[];
  prior: [number, number];
  shares: number[] | null;
  level: number;
  posterior_mean: number[];
  prob_best: number[];
  prob_above_control: number[];
  lift: [number, number, number][];
  expected_loss: number[];
  decision: { index: number; loss: number; max_loss: number; choose: boolean };
  srm_pvalue: number;
  flat?: { prob_best: number[]; decision: { index: number; choose: boolean } };
}

const REFERENCE = JSON.parse(
  fs.readFileSync(path.join(__dirname, '..', 'reference', 'addin/summary_values.json'), 'utf8'),
) as Record<string, ReferenceCase>;

/** Guardrail probabilities from scipy (test/reference/addin/summary_guardrails.py). */
interface GuardrailReference {
  names: string[];
  averages: { count: number[]; mean: number[]; sd: number[] };
  counts: { events: number[]; exposure: number[] };
  averages_prob_lift_above: Record<string, number[]>;
  counts_prob_lift_above: Record<string, number[]>;
}
const GUARDRAILS = JSON.parse(
  fs.readFileSync(path.join(__dirname, '..', 'reference', 'addin/summary_guardrails.json'), 'utf8'),
) as Record<string, GuardrailReference>;

const AT = new Date(Date.UTC(2025, 6, 4, 9, 30, 0));

function inputOf(name: string, extra: Partial<SummaryInput> = {}): SummaryInput {
  const ref = REFERENCE[name] as ReferenceCase;
  return {
    title: 'Sign-up form',
    source: "'Sign-up test'!A1:C4",
    days: 21,
    dates: '',
    names: ref.names,
    visitors: ref.visitors,
    conversions: ref.conversions,
    shares: ref.shares,
    level: ref.level,
    prior: { alpha: ref.prior[0], beta: ref.prior[1] },
    guardrails: [],
    preparedAt: AT,
    ...extra,
  };
}

/** The page's running text with its lines joined back into sentences. */
function prose(input: SummaryInput): string {
  return summaryLines(input, summaryNumbers(input))
    .filter((line) => line.kind !== 'tableRow' && line.kind !== 'tableHead')
    .map((line) => String(line.cells[0]).replace(/^[•\s]+/, ''))
    .join(' ')
    .replace(/\s+/g, ' ');
}

describe('the numbers are the core’s, and the core agrees with scipy', () => {
  for (const name of ['signup', 'banner', 'unsettled', 'checkout_demo']) {
    test(`${name}: P(best), P(beats control), lift range, expected loss, decision and split check against scipy`, () => {
      const ref = REFERENCE[name] as ReferenceCase;
      const numbers = summaryNumbers(inputOf(name));
      numbers.probBest.forEach((p, i) => expect(Math.abs(p - (ref.prob_best[i] as number))).toBeLessThan(1e-9));
      numbers.probAboveControl.forEach((p, i) =>
        expect(Math.abs(p - (ref.prob_above_control[i] as number))).toBeLessThan(1e-9),
      );
      numbers.lift.forEach((lift, i) => {
        const [lower, median, upper] = ref.lift[i] as [number, number, number];
        expect(Math.abs(lift.lower - lower)).toBeLessThan(1e-8);
        expect(Math.abs(lift.median - median)).toBeLessThan(1e-8);
        expect(Math.abs(lift.upper - upper)).toBeLessThan(1e-8);
      });
      numbers.expectedLoss.forEach((loss, i) =>
        expect(Math.abs(loss - (ref.expected_loss[i] as number)) / (ref.expected_loss[i] as number)).toBeLessThan(1e-7),
      );
      expect(numbers.decision.index).toBe(ref.decision.index);
      expect(numbers.decision.choose).toBe(ref.decision.choose);
      expect(Math.abs(numbers.decision.maxLoss - ref.decision.max_loss) / ref.decision.max_loss).toBeLessThan(1e-12);
      expect(Math.abs(numbers.srm - ref.srm_pvalue) / ref.srm_pvalue).toBeLessThan(1e-9);
      if (ref.flat === undefined) expect(numbers.flat).toBeNull();
      else {
        expect(numbers.flat?.decision.index).toBe(ref.flat.decision.index);
        expect(numbers.flat?.decision.choose).toBe(ref.flat.decision.choose);
        numbers.flat?.probBest.forEach((p, i) =>
          expect(Math.abs(p - (ref.flat?.prob_best[i] as number))).toBeLessThan(1e-9),
        );
      }
    });
  }
});

describe('the words say the numbers', () => {
  test('three versions, a clear leader: the decision, why, each lift and chance as the reference values rounded', () => {
    const ref = REFERENCE.signup as ReferenceCase;
    const text = prose(inputOf('signup'));
    const leader = ref.names[ref.decision.index] as string;
    expect(text).toContain(
      'Sign-up form: 3 versions, Short form (control), Form with photo and Two-step form, shown to 29,625 visitors in all over 21 days.',
    );
    expect(text).toContain(`Go with ${leader}.`);
    // 0.8666… → "an 87% chance"; loss 0.000187 → "0.0187 percentage points"; allowed 1% of the control's mean.
    expect(chanceText(ref.prob_best[1] as number)).toBe('87%');
    expect(text).toContain(`Why: ${leader} has an 87% chance of the highest conversion rate.`);
    expect(formatPercent(ref.decision.loss)).toBe('0.0187%');
    expect(formatPercent(ref.decision.max_loss)).toBe('0.0409%');
    expect(text).toContain(
      'gives up 0.0187 percentage points of conversion rate on average (its expected loss), within the 0.0409 percentage points accepted.',
    );
    ref.names.slice(1).forEach((version, i) => {
      const [lower, median, upper] = ref.lift[i] as [number, number, number];
      expect(text).toContain(
        `${version}: most likely ${signedPercent(median)}, plausibly from ${signedPercent(lower)} to ${signedPercent(upper)}; ` +
          `${chanceText(ref.prob_best[i + 1] as number)} chance of being best.`,
      );
    });
    expect(signedPercent((ref.lift[0] as number[])[0] as number)).toBe('−1.4%');
    expect(text).toContain(
      'Form with photo: most likely +12.4%, plausibly from −1.4% to +28.1%; 87% chance of being best.',
    );
    expect(text).toContain(
      'There is a 95% probability that the true lift lies in the range shown (a credible interval).',
    );
    expect(text).toContain('Visitors were split as planned (equal shares; split check p-value 0.88,');
    expect(text).toContain("With 3 versions compared, the leader's lead is partly luck");
    expect(text).not.toContain('prior belief');
    expect(text).toContain('No guardrails were set for this test.');
    expect(text).toContain('have a qualified statistician review it before acting.');
    expect(text).toContain('stopped early because it looked good, the chances above are too optimistic.');
    expect(text).toContain("Prepared 2025-07-04 09:30 UTC by Lift Ledger from 'Sign-up test'!A1:C4.");
  });

  test('the table holds the values themselves: visitors, conversions, observed rate, chance of being best, lift range', () => {
    const ref = REFERENCE.signup as ReferenceCase;
    const rows = summaryLines(inputOf('signup'), summaryNumbers(inputOf('signup'))).filter(
      (l) => l.kind === 'tableRow',
    );
    expect(rows.map((r) => r.cells.slice(0, 3))).toEqual([
      ['Short form (control)', 9840, 402],
      ['Form with photo', 9910, 455],
      ['Two-step form', 9875, 418],
    ]);
    rows.forEach((row, i) => {
      expect(row.cells[3]).toBe((ref.conversions[i] as number) / (ref.visitors[i] as number));
      expect(Math.abs((row.cells[4] as number) - (ref.prob_best[i] as number))).toBeLessThan(1e-9);
      if (i === 0) expect(row.cells.slice(5)).toEqual(['control', '']);
      else {
        expect(Math.abs((row.cells[5] as number) - (ref.lift[i - 1] as number[])[0]!)).toBeLessThan(1e-8);
        expect(Math.abs((row.cells[6] as number) - (ref.lift[i - 1] as number[])[2]!)).toBeLessThan(1e-8);
      }
      expect(row.formats).toEqual([
        null,
        '#,##0',
        '#,##0',
        '0.00%',
        '0.0%',
        i === 0 ? null : '0.0%',
        i === 0 ? null : '0.0%',
      ]);
    });
  });

  test('a broken split and an informative prior: the split warning, the caution, and the decision without the prior', () => {
    const ref = REFERENCE.banner as ReferenceCase;
    const input = inputOf('banner', { title: 'Home page banner', days: 14, dates: '3 to 16 March' });
    const lines = summaryLines(input, summaryNumbers(input));
    const text = prose(input);
    expect(text).toContain(
      '2 versions, Old banner (control) and New banner, shown to 10,000 visitors in all over 14 days (3 to 16 March).',
    );
    expect(ref.srm_pvalue).toBeLessThan(0.001);
    expect(text).toContain(
      `The split looks broken: the visitors per version are far from the planned shares (p-value ${ref.srm_pvalue.toExponential(1)}, below 0.001).`,
    );
    expect(text).toContain('Do not act on this result until the broken split is explained.');
    expect(lines.filter((l) => l.kind === 'warning').length).toBeGreaterThanOrEqual(3);
    expect(text).toContain(
      `This read-out starts from a prior belief worth 400 visitors (alpha 12, beta 388). Without it (a flat prior) the decision is the same, and New banner's chance of being best is ${chanceText(ref.flat?.prob_best[1] as number)}.`,
    );
    expect(chanceText(ref.flat?.prob_best[1] as number)).toBe('95%');
    expect(text).toContain('There is a 90% probability that the true lift lies in the range shown');
    expect(text).not.toContain('With 2 versions compared');
    expect(text).toContain('(Beta–Binomial model, the prior above)');
  });

  test('nothing settled yet: no decision, the leader named with its loss above what is accepted', () => {
    const ref = REFERENCE.unsettled as ReferenceCase;
    const text = prose(inputOf('unsettled', { days: null }));
    expect(ref.decision.choose).toBe(false);
    expect(text).toContain('No decision yet: keep the test running.');
    expect(text).toContain(
      `Why: Page with video leads with a ${chanceText(ref.prob_best[1] as number)} chance of the highest conversion rate, but choosing it now could give up ` +
        `${formatPercent(ref.decision.loss).replace('%', '')} percentage points of conversion rate on average (its expected loss), more than the ` +
        `${formatPercent(ref.decision.max_loss).replace('%', '')} percentage points accepted.`,
    );
    expect(text).toContain('shown to 1,602 visitors in all.');
  });

  test('guardrails: each metric, its limit in words, the chance it holds per version as a value (scipy), pass or fail', () => {
    const ref = GUARDRAILS.signup as GuardrailReference;
    const input = inputOf('signup', {
      guardrails: [
        { kind: 'averages', direction: 'noWorse', limit: -0.02, required: 0.85, data: ref.averages },
        { kind: 'counts', direction: 'noHigher', limit: 0.05, required: 0.95, data: ref.counts },
      ],
      guardrailSource: "'Sign-up test'!E1",
    });
    const numbers = summaryNumbers(input);
    // The core against scipy (summary_guardrails.json): P(lift > limit) per challenger.
    const averages = ref.averages_prob_lift_above['-0.02'] as number[];
    const counts = ref.counts_prob_lift_above['0.05'] as number[];
    numbers.guardrails[0]?.probAbove.forEach((p, i) =>
      expect(Math.abs(p - (averages[i] as number))).toBeLessThan(1e-9),
    );
    numbers.guardrails[1]?.probAbove.forEach((p, i) => expect(Math.abs(p - (counts[i] as number))).toBeLessThan(1e-9));
    // "No higher than" holds with 1 − P(lift > limit).
    numbers.guardrails[1]?.holds.forEach((h, i) =>
      expect(Math.abs(h - (1 - (counts[i] as number)))).toBeLessThan(1e-9),
    );
    expect(numbers.guardrails.map((g) => g.passes)).toEqual([
      [averages[0]! >= 0.85, averages[1]! >= 0.85],
      [1 - counts[0]! >= 0.95, 1 - counts[1]! >= 0.95],
    ]);
    expect(numbers.guardrails.map((g) => g.passes)).toEqual([
      [true, false],
      [false, false],
    ]);
    const lines = summaryLines(input, numbers);
    const text = prose(input);
    expect(text).not.toContain('No guardrails were set');
    expect(text).toContain("From the read-out at 'Sign-up test'!E1. Each is a second measure");
    expect(text).toContain('Guardrail 1: average lift no worse than −2.0%, with a chance of at least 85%.');
    expect(text).toContain('Guardrail 2: event rate lift no higher than +5.0%, with a chance of at least 95%.');
    // One row per challenger and guardrail: the name, the chance it holds as a value (0.0%), passes or fails.
    const rows = lines.filter((l) => l.cells[5] === 'passes' || l.cells[5] === 'fails');
    expect(rows.map((r) => [r.kind, r.cells[0], r.cells[5]])).toEqual([
      ['tableRow', '  Form with photo', 'passes'],
      ['warningRow', '  Two-step form', 'fails'],
      ['warningRow', '  Form with photo', 'fails'],
      ['warningRow', '  Two-step form', 'fails'],
    ]);
    expect(rows.map((r) => r.cells[4])).toEqual([...numbers.guardrails[0]!.holds, ...numbers.guardrails[1]!.holds]);
    expect(rows[0]?.formats?.[4]).toBe('0.0%');
    // The leader by conversions fails guardrail 2: the decision does not switch, and says why with the numbers.
    expect(text).toContain('Do not switch to Form with photo yet: it fails a guardrail.');
    expect(formatPercent(1 - counts[0]!)).toBe('0.408%');
    expect(text).toContain(
      'Why: on conversion rate alone it would be chosen (87% chance of being best, expected loss 0.0187 percentage ' +
        'points, within the 0.0409 percentage points accepted), but the chance that its event rate lift is no higher ' +
        'than +5.0% (guardrail 2) is 0.408%, below the 95% required.',
    );
    expect(text).not.toContain('Go with Form with photo.');
    const block = summaryBlock(input, numbers, 'S');
    const failRow = lines.findIndex((l) => l.kind === 'warningRow');
    expect(block.styles).toContainEqual({
      row: failRow,
      column: 0,
      columnCount: SUMMARY_COLUMN_WIDTHS.length,
      style: { fontColor: '#9C0006', bold: true },
    });
  });

  test('guardrails that hold: the decision stands and says so', () => {
    const ref = GUARDRAILS.signup as GuardrailReference;
    const input = inputOf('signup', {
      guardrails: [{ kind: 'averages', direction: 'noWorse', limit: -0.02, required: 0.85, data: ref.averages }],
    });
    const text = prose(input);
    expect(text).toContain('Go with Form with photo.');
    expect(text).toContain('within the 0.0409 percentage points accepted. Its guardrails hold (below).');
  });

  test('the control as the safe choice is said as keeping it', () => {
    // Invented: the challenger clearly worse.
    const input = inputOf('signup', {
      names: ['Current page', 'New page'],
      visitors: [20000, 20000],
      conversions: [900, 700],
      shares: null,
      prior: UNIFORM_PRIOR,
    });
    expect(prose(input)).toContain('Keep Current page (control): no other version did better.');
  });
});

describe('the printed page', () => {
  test('every line fits the page width; one page of rows; portrait, fitted to one page, the block as print area', () => {
    for (const name of ['signup', 'banner', 'unsettled', 'checkout_demo']) {
      const input = inputOf(name, {
        guardrails: [
          {
            kind: 'averages',
            direction: 'noWorse',
            limit: -0.02,
            required: 0.95,
            data: (GUARDRAILS.signup as GuardrailReference).averages,
          },
        ],
      });
      const block = summaryBlock(input, summaryNumbers(input), 'Sign-up summary');
      for (const row of block.cells) {
        expect(String(row[0]).length).toBeLessThanOrEqual(LINE_LENGTH);
        expect(row).toHaveLength(SUMMARY_COLUMN_WIDTHS.length);
      }
      // 15-point rows on an A4 page less its margins (about 750 points): 50 rows at most (from memory of Excel's defaults).
      expect(block.cells.length).toBeLessThanOrEqual(50);
      expect(block).toMatchObject({
        sheet: 'Sign-up summary',
        newSheet: true,
        topLeft: 'A1',
        columnWidths: SUMMARY_COLUMN_WIDTHS,
        page: { orientation: 'Portrait', fitToOnePage: true, printBlockOnly: true },
      });
      expect(block.numberFormats).toHaveLength(block.cells.length);
    }
  });

  test('title and headings bold, warnings red', () => {
    const input = inputOf('banner');
    const block = summaryBlock(input, summaryNumbers(input), 'S');
    const lines = summaryLines(input, summaryNumbers(input));
    const headingRows = lines.flatMap((l, i) => (l.kind === 'heading' ? [i] : []));
    expect(headingRows.length).toBe(6);
    for (const row of headingRows) expect(block.styles).toContainEqual({ row, column: 0, style: { bold: true } });
    const warningRow = lines.findIndex((l) => l.kind === 'warning');
    expect(block.styles).toContainEqual({ row: warningRow, column: 0, style: { fontColor: '#9C0006', bold: true } });
  });

  test('wrapText breaks at spaces within the width', () => {
    expect(wrapText('one two three', 7)).toEqual(['one two', 'three']);
    expect(wrapText('a-very-long-word x', 5)).toEqual(['a-very-long-word', 'x']);
    expect(wrapText('  ', 10)).toEqual([]);
  });
});
