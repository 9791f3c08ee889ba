/**
 * The summary for people who decide: one printed page, in plain words, of what was tested, for how long and
 * on how many visitors, the decision and why, each version's chance of being best, the plausible range of
 * its lift, the guardrails, the split check and the cautions that apply. Its numbers are values computed
 * here with the statistics core (the same functions the worksheet functions run), so the page travels: it
 * says the same thing in a workbook without the add-in. Pure functions; the panel writes the block on a new
 * sheet (Workbook.writeBlock) set to print on one page. The wording is our own.
 */
import { conversion } from '../../functions/stats';
import { eventsProbLiftAbove } from '../../functions/stats/eventRates';
import { meanProbLiftAbove } from '../../functions/stats/normalMeans';
import { revenueProbLiftAbove } from '../../functions/stats/revenuePerVisitor';
import { srmPValue } from '../../functions/stats/srm';
import type { BetaPrior, ConversionCounts, IntervalWithMedian } from '../../functions/stats/types';
import { UNIFORM_PRIOR } from '../../functions/stats/types';
import { frozenTime } from '../../cli/core/frozenCopy';
import type { BlockStyle, CellValue, FormulaBlock } from '../workbook/workbook';
import { SRM_ALARM, WARNING_TEXT } from './formulas';
import { DEFAULT_LOCALE, formatCount, formatPercent, type NumberLocale } from './inputs';
import { chancePhrase, chanceText, variantLabel } from './resultWords';
import type { GuardrailDirection } from './guardrails';
import { KIND_SHORT, type MetricKind, type MetricRole } from './metrics';

/**
 * A guardrail of the read-out the summary is about (guardrails.ts): another metric of the same versions
 * that the chosen version must not harm, "no worse than" (or "no higher than") a relative lift limit with
 * at least a required probability, and that metric's columns, from which the summary recomputes the
 * probabilities with the core (as the read-out's …PROB_LIFT_ABOVE formula does). Without any, the summary
 * says none were set.
 */
export interface SummaryGuardrail {
  readonly kind: MetricKind;
  readonly direction: GuardrailDirection;
  /** The relative lift limit as a fraction: −0.02 for "no worse than −2%". */
  readonly limit: number;
  /** The probability with which it must hold, in [0.5, 1). */
  readonly required: number;
  /** The metric's columns per version, the control first (orders as `conversions` for revenue). */
  readonly data: Readonly<Partial<Record<MetricRole, readonly number[]>>>;
}

/** A guardrail's numbers: per challenger (the control has none). */
export interface GuardrailNumbers {
  /** P(lift > limit), as the read-out's column shows it. */
  readonly probAbove: number[];
  /** The chance the guardrail holds: P(lift > limit) for "no worse than", 1 − that for "no higher than". */
  readonly holds: number[];
  /** holds ≥ required. */
  readonly passes: boolean[];
}

/** What the summary is made from: the variant table as the Read-out section checked it, and a few words. */
export interface SummaryInput {
  /** What was tested, in the user's words ("Checkout button colour"). */
  readonly title: string;
  /** Where the numbers come from ("'Checkout test'!A3:C6"). */
  readonly source: string;
  /** How many days the test ran, or null when not given. */
  readonly days: number | null;
  /** When it ran, as the user wants it shown ("2 to 29 June"), or "". */
  readonly dates: string;
  /** Names, visitors, conversions per version; the control first. */
  readonly names: readonly string[];
  readonly visitors: readonly number[];
  readonly conversions: readonly number[];
  /** Planned shares of traffic per version, or null for equal shares. */
  readonly shares: readonly number[] | null;
  /** Credible level of the lift ranges (0.95). */
  readonly level: number;
  readonly prior: BetaPrior;
  /** The largest expected loss accepted (a rate); default 1% of the control's posterior mean, as DECISION. */
  readonly maxLoss?: number;
  readonly guardrails: readonly SummaryGuardrail[];
  /** Where the guardrails were read ("'Checkout test'!K3"), when there are any. */
  readonly guardrailSource?: string;
  readonly preparedAt: Date;
}

/** The numbers on the page, from the statistics core. */
export interface SummaryNumbers {
  /** Conversions ÷ visitors per version (what was seen). */
  readonly observed: number[];
  readonly posteriorMean: number[];
  readonly probBest: number[];
  /** Per challenger (the control has none). */
  readonly probAboveControl: number[];
  /** Per challenger: the relative lift over the control at the input's level. */
  readonly lift: IntervalWithMedian[];
  readonly expectedLoss: number[];
  readonly decision: conversion.Decision;
  /** Split check p-value (chi-square against the planned shares). */
  readonly srm: number;
  /** Per guardrail, in the input's order. */
  readonly guardrails: GuardrailNumbers[];
  /** With a flat prior instead of the chosen one, when the chosen one is not flat (prior sensitivity). */
  readonly flat: { readonly probBest: number[]; readonly decision: conversion.Decision } | null;
}

function isFlat(prior: BetaPrior): boolean {
  return prior.alpha === UNIFORM_PRIOR.alpha && prior.beta === UNIFORM_PRIOR.beta;
}

/**
 * A guardrail's probabilities from its metric's columns, by the core function its read-out formula calls
 * (PROB_LIFT_ABOVE with the default flat prior, REVENUE_/MEAN_/EVENTS_PROB_LIFT_ABOVE). Cost: one lift tail
 * per challenger. Throws the core's StatsError for bad columns or limit.
 * @example guardrailNumbers({ kind: 'counts', direction: 'noWorse', limit: -0.02, required: 0.95, data: { events: [120, 145], exposure: [1000, 1010] } }).passes //=> [true]
 */
export function guardrailNumbers(guard: SummaryGuardrail): GuardrailNumbers {
  const column = (role: MetricRole): readonly number[] => guard.data[role] ?? [];
  const at = (role: MetricRole, i: number): number => column(role)[i] as number;
  let probAbove: number[];
  switch (guard.kind) {
    case 'conversions':
      probAbove = conversion.probLiftAbove(
        column('visitors').map((v, i) => ({ visitors: v, conversions: at('conversions', i) })),
        guard.limit,
        UNIFORM_PRIOR,
      );
      break;
    case 'revenue': {
      const sd = guard.data.orderSd;
      probAbove = revenueProbLiftAbove(
        column('visitors').map((v, i) => ({
          orders: at('conversions', i),
          visitors: v,
          revenue: at('revenue', i),
          ...(sd === undefined ? {} : { orderSd: sd[i] as number }),
        })),
        guard.limit,
      );
      break;
    }
    case 'averages':
      probAbove = meanProbLiftAbove(
        column('count').map((n, i) => ({ count: n, mean: at('mean', i), sd: at('sd', i) })),
        guard.limit,
      );
      break;
    case 'counts':
      probAbove = eventsProbLiftAbove(
        column('events').map((e, i) => ({ events: e, exposure: at('exposure', i) })),
        guard.limit,
      );
      break;
  }
  const noWorse = guard.direction === 'noWorse';
  return {
    probAbove,
    holds: probAbove.map((p) => (noWorse ? p : 1 - p)),
    // The read-out's own test (guardrails.ts writeGuardrails): fails when p < required, or p > 1 − required.
    passes: probAbove.map((p) => (noWorse ? !(p < guard.required) : !(p > 1 - guard.required))),
  };
}

/**
 * Compute the page's numbers with the core. Cost: as the core's read-out for k versions (P(highest), lift
 * intervals, expected losses; twice when the prior is not flat). Throws the core's StatsError for bad
 * counts, prior or level.
 * @example summaryNumbers(input).probBest //=> [0.0300…, 0.8666…, 0.1033…]
 */
export function summaryNumbers(input: SummaryInput): SummaryNumbers {
  const counts: ConversionCounts[] = input.names.map((_, i) => ({
    conversions: input.conversions[i] as number,
    visitors: input.visitors[i] as number,
  }));
  const decision = conversion.decide(counts, input.maxLoss, input.prior);
  return {
    observed: counts.map((c) => c.conversions / c.visitors),
    posteriorMean: conversion.posteriorMean(counts, input.prior),
    probBest: conversion.probHighest(counts, input.prior),
    probAboveControl: conversion.probAboveControl(counts, input.prior),
    lift: conversion.liftInterval(counts, input.level, input.prior),
    expectedLoss: conversion.expectedLoss(counts, input.prior),
    decision,
    srm: srmPValue(input.visitors, input.shares ?? undefined),
    guardrails: input.guardrails.map(guardrailNumbers),
    flat: isFlat(input.prior)
      ? null
      : {
          probBest: conversion.probHighest(counts, UNIFORM_PRIOR),
          decision: conversion.decide(counts, undefined, UNIFORM_PRIOR),
        },
  };
}

/** Columns of the page and their widths in points (about 524 points: a portrait A4 or Letter page). */
export const SUMMARY_COLUMN_WIDTHS: readonly number[] = [124, 58, 76, 72, 64, 64, 64];
/** The longest line of running text, in characters (it runs over the empty cells to its right). */
export const LINE_LENGTH = 92;

/**
 * Break a text into lines of at most `width` characters at spaces (a longer word stands alone). Cost O(length).
 * @example wrapText('one two three', 7) //=> ['one two', 'three']
 */
export function wrapText(text: string, width: number = LINE_LENGTH): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(/\s+/).filter((w) => w !== '')) {
    if (line === '') line = word;
    else if (line.length + 1 + word.length <= width) line += ` ${word}`;
    else {
      lines.push(line);
      line = word;
    }
  }
  if (line !== '') lines.push(line);
  return lines;
}

/** "+12.4%" / "−1.4%" for a relative change, one decimal. */
export function signedPercent(fraction: number, locale: NumberLocale = DEFAULT_LOCALE): string {
  const text = (Math.abs(fraction) * 100).toFixed(1);
  const shown = locale.decimal === ',' ? text.replace('.', ',') : text;
  return `${fraction > 0 ? '+' : fraction < 0 ? '−' : ''}${shown}%`;
}

/** A rate difference in percentage points: "0.019 percentage points". */
function ratePoints(rate: number, locale: NumberLocale): string {
  const text = formatPercent(rate, locale).replace('%', '');
  return `${text} percentage ${text === '1' || text === '1.00' || text === '1,00' ? 'point' : 'points'}`;
}

/** "A, B and C". */
function listWords(items: readonly string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

/** What one line of the page is. */
export type SummaryLineKind =
  'title' | 'note' | 'heading' | 'text' | 'strong' | 'warning' | 'tableHead' | 'tableRow' | 'warningRow' | 'blank';

/** One row of the page: its kind, its cells (from column A) and their number formats. */
export interface SummaryLine {
  readonly kind: SummaryLineKind;
  readonly cells: readonly CellValue[];
  readonly formats?: readonly (string | null)[];
}

/** The level as a reader says it: "95%". */
function levelWords(level: number): string {
  return `${Number((level * 100).toPrecision(4))}%`;
}

/**
 * The read-out's decision with guardrails: when the decision chooses a challenger, the guardrails (their
 * indices) it fails; then it is not switched to. Empty when nothing or the control is chosen. Cost O(guardrails).
 * @example failingGuardrails(summaryNumbers(input)) //=> [1]
 */
export function failingGuardrails(numbers: SummaryNumbers): number[] {
  const leader = numbers.decision.index;
  if (!numbers.decision.choose || leader === 0) return [];
  return numbers.guardrails.flatMap((g, j) => (g.passes[leader - 1] === false ? [j] : []));
}

/** A guardrail's limit in words: "no worse than −2.0%" (the read-out's own wording, guardrails.ts). */
function limitWords(g: SummaryGuardrail, locale: NumberLocale): string {
  return `${g.direction === 'noWorse' ? 'no worse than' : 'no higher than'} ${signedPercent(g.limit, locale)}`;
}

/**
 * The page, line by line, in plain words. Cost O(versions + guardrails).
 * @example summaryLines(input, summaryNumbers(input))[0] //=> { kind: 'title', cells: ['Summary for decision-makers: Sign-up form'] }
 */
export function summaryLines(
  input: SummaryInput,
  numbers: SummaryNumbers,
  locale: NumberLocale = DEFAULT_LOCALE,
): SummaryLine[] {
  const lines: SummaryLine[] = [];
  const k = input.names.length;
  const label = (i: number): string => variantLabel(input.names[i] ?? '', i);
  const name = (i: number): string => input.names[i] ?? '';
  const paragraph = (text: string, kind: SummaryLineKind = 'text'): void => {
    for (const line of wrapText(text)) lines.push({ kind, cells: [line] });
  };
  const heading = (text: string): void => {
    lines.push({ kind: 'blank', cells: [''] });
    lines.push({ kind: 'heading', cells: [text] });
  };
  const total = input.visitors.reduce((a, b) => a + b, 0);
  const { decision } = numbers;
  const leader = decision.index;

  lines.push({ kind: 'title', cells: [`Summary for decision-makers: ${input.title}`] });
  paragraph(
    `Prepared ${frozenTime(input.preparedAt)} by Lift Ledger from ${input.source}. Every number on this page is a ` +
      'value: it stays as it is if the data change.',
    'note',
  );

  heading('What was tested');
  const how =
    input.days === null ? '' : ` over ${formatCount(input.days, locale)} ${input.days === 1 ? 'day' : 'days'}`;
  const when = input.dates.trim() === '' ? '' : ` (${input.dates.trim()})`;
  paragraph(
    `${input.title}: ${k} versions, ${listWords(input.names.map((_, i) => label(i)))}, shown to ` +
      `${formatCount(total, locale)} visitors in all${how}${when}.`,
  );

  heading('The decision');
  const loss = ratePoints(decision.loss, locale);
  const allowed = ratePoints(decision.maxLoss, locale);
  const best = chancePhrase(numbers.probBest[leader] as number, locale);
  const failing = failingGuardrails(numbers).map((j) => ({
    g: input.guardrails[j] as SummaryGuardrail,
    j,
    n: numbers.guardrails[j],
  }));
  if (failing.length > 0) {
    paragraph(
      `Do not switch to ${name(leader)} yet: it fails ${failing.length === 1 ? 'a guardrail' : 'guardrails'}.`,
      'strong',
    );
    const reasons = failing.map(
      ({ g, j, n }) =>
        `the chance that its ${KIND_SHORT[g.kind]} lift is ${limitWords(g, locale)} (guardrail ${j + 1}) is ` +
        `${formatPercent(n?.holds[leader - 1] as number, locale)}, below the ${levelWords(g.required)} required`,
    );
    paragraph(
      `Why: on conversion rate alone it would be chosen (${chanceText(numbers.probBest[leader] as number, locale)} chance of ` +
        `being best, expected loss ${loss}, within the ${allowed} accepted), but ${listWords(reasons)}.`,
      'warning',
    );
  } else if (decision.choose) {
    paragraph(leader === 0 ? `Keep ${label(0)}: no other version did better.` : `Go with ${name(leader)}.`, 'strong');
    paragraph(
      `Why: ${name(leader)} has ${best} of the highest conversion rate. If it is not in fact the best, choosing it ` +
        `gives up ${loss} of conversion rate on average (its expected loss), within the ${allowed} accepted.` +
        (leader > 0 && input.guardrails.length > 0 ? ' Its guardrails hold (below).' : ''),
    );
  } else {
    paragraph('No decision yet: keep the test running.', 'strong');
    paragraph(
      `Why: ${name(leader)} leads with ${best} of the highest conversion rate, but choosing it now could give up ` +
        `${loss} of conversion rate on average (its expected loss), more than the ${allowed} accepted.`,
    );
  }

  heading('Chance of being best, and plausible lift');
  const level = levelWords(input.level);
  lines.push({
    kind: 'tableHead',
    cells: ['Version', 'Visitors', 'Conversions', 'Conversion', 'Chance of', `Lift, ${level} range`, ''],
  });
  lines.push({ kind: 'tableHead', cells: ['', '', '', 'rate', 'being best', 'from', 'to'] });
  for (let i = 0; i < k; i += 1) {
    const lift = i === 0 ? null : numbers.lift[i - 1];
    lines.push({
      kind: 'tableRow',
      cells: [
        label(i),
        input.visitors[i] as number,
        input.conversions[i] as number,
        numbers.observed[i] as number,
        numbers.probBest[i] as number,
        lift ? lift.lower : 'control',
        lift ? lift.upper : '',
      ],
      formats: [null, '#,##0', '#,##0', '0.00%', '0.0%', lift ? '0.0%' : null, lift ? '0.0%' : null],
    });
  }
  paragraph(
    "Lift is a version's conversion rate relative to the control's: +10% means 10% more conversions per visitor. " +
      `There is a ${level} probability that the true lift lies in the range shown (a credible interval).`,
  );
  for (let i = 1; i < k; i += 1) {
    const lift = numbers.lift[i - 1] as IntervalWithMedian;
    paragraph(
      `${name(i)}: most likely ${signedPercent(lift.median, locale)}, plausibly from ${signedPercent(lift.lower, locale)} ` +
        `to ${signedPercent(lift.upper, locale)}; ${chanceText(numbers.probBest[i] as number, locale)} chance of being best.`,
    );
  }

  heading('Guardrails');
  if (input.guardrails.length === 0) {
    paragraph(
      'No guardrails were set for this test. A guardrail is a second measure that must not get worse, ' +
        'for example revenue per visitor no worse than −2%.',
    );
  } else {
    paragraph(
      `From the read-out${input.guardrailSource ? ` at ${input.guardrailSource}` : ''}. Each is a second measure a new ` +
        'version must not harm; beside each version, the chance it stays within the limit (its lift relative to the control).',
    );
    input.guardrails.forEach((g, j) => {
      const n = numbers.guardrails[j] as GuardrailNumbers;
      paragraph(
        `Guardrail ${j + 1}: ${KIND_SHORT[g.kind]} lift ${limitWords(g, locale)}, with a chance of at least ${levelWords(g.required)}.`,
      );
      for (let i = 1; i < k; i += 1) {
        const passes = n.passes[i - 1] as boolean;
        lines.push({
          kind: passes ? 'tableRow' : 'warningRow',
          cells: [`  ${name(i)}`, '', '', '', n.holds[i - 1] as number, passes ? 'passes' : 'fails', ''],
          formats: [null, null, null, null, '0.0%', null, null],
        });
      }
    });
  }

  heading('Split check');
  const split = input.shares === null ? 'equal shares' : 'the planned shares';
  const p = numbers.srm;
  const pText = p < 0.0001 ? p.toExponential(1) : p.toPrecision(2);
  if (p < SRM_ALARM) {
    paragraph(
      `The split looks broken: the visitors per version are far from ${split} (p-value ${pText}, below ${SRM_ALARM}). ` +
        'The groups may differ in more than the change tested. Find the cause before acting on this result.',
      'warning',
    );
  } else {
    paragraph(
      `Visitors were split as planned (${split}; split check p-value ${pText}, where below ${SRM_ALARM} would mean ` +
        'something in the set-up is broken).',
    );
  }

  heading('Before acting on it');
  const bullet = (text: string, kind: SummaryLineKind = 'text'): void => {
    const [first, ...rest] = wrapText(text, LINE_LENGTH - 2);
    lines.push({ kind, cells: [`• ${first ?? ''}`] });
    for (const line of rest) lines.push({ kind, cells: [`  ${line}`] });
  };
  bullet(
    'Read the result once, at the planned end of the test. If the test was stopped early because it looked ' +
      'good, the chances above are too optimistic.',
  );
  if (p < SRM_ALARM) bullet('Do not act on this result until the broken split is explained.', 'warning');
  if (k >= 3) {
    bullet(
      `With ${k} versions compared, the leader's lead is partly luck; expect a smaller lift if it is tested again.`,
    );
  }
  if (numbers.flat !== null) {
    const worth = formatCount(input.prior.alpha + input.prior.beta, locale);
    const same = numbers.flat.decision.index === leader && numbers.flat.decision.choose === decision.choose;
    const flatBest = chanceText(numbers.flat.probBest[leader] as number, locale);
    bullet(
      `This read-out starts from a prior belief worth ${worth} visitors (alpha ${Number(input.prior.alpha.toPrecision(6))}, ` +
        `beta ${Number(input.prior.beta.toPrecision(6))}). ` +
        (same
          ? `Without it (a flat prior) the decision is the same, and ${name(leader)}'s chance of being best is ${flatBest}.`
          : `Without it (a flat prior) the decision would be different: the data alone do not settle it.`),
      same ? 'text' : 'warning',
    );
  }
  bullet(
    'If this decision affects health, safety, credit or other regulated matters, have a qualified statistician ' +
      'review it before acting.',
  );

  lines.push({ kind: 'blank', cells: [''] });
  paragraph(
    `Method: a Bayesian read-out of conversion rates (Beta–Binomial model, ${isFlat(input.prior) ? 'flat prior' : 'the prior above'}), ` +
      'computed exactly by numerical integration, without simulation.',
    'note',
  );
  return lines;
}

/**
 * The page as a block for a new sheet: the lines from A1, numbers as values with their formats, headings
 * in bold, warnings in red, the column widths, and a portrait page fitted to one page with the block
 * as print area. Cost O(lines).
 */
export function summaryBlock(
  input: SummaryInput,
  numbers: SummaryNumbers,
  sheet: string,
  locale: NumberLocale = DEFAULT_LOCALE,
): FormulaBlock {
  const lines = summaryLines(input, numbers, locale);
  const width = SUMMARY_COLUMN_WIDTHS.length;
  const cells = lines.map((line) => Array.from({ length: width }, (_, c) => line.cells[c] ?? ''));
  const numberFormats = lines.map((line) => Array.from({ length: width }, (_, c) => line.formats?.[c] ?? null));
  const styles: BlockStyle[] = [];
  lines.forEach((line, row) => {
    if (line.kind === 'title' || line.kind === 'heading' || line.kind === 'strong') {
      styles.push({ row, column: 0, style: { bold: true } });
    } else if (line.kind === 'tableHead') {
      styles.push({ row, column: 0, columnCount: width, style: { bold: true } });
    } else if (line.kind === 'warningRow') {
      styles.push({ row, column: 0, columnCount: width, style: { fontColor: WARNING_TEXT, bold: true } });
    } else if (line.kind === 'warning') {
      // Red bold text, no fill: a filled cell would stop the line from running on over the cells to its right.
      styles.push({ row, column: 0, style: { fontColor: WARNING_TEXT, bold: true } });
    }
  });
  return {
    sheet,
    newSheet: true,
    topLeft: 'A1',
    cells,
    numberFormats,
    styles,
    columnWidths: SUMMARY_COLUMN_WIDTHS,
    page: { orientation: 'Portrait', fitToOnePage: true, printBlockOnly: true },
  };
}
