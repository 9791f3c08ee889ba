/**
 * Explaining a cell: parse the =ABTEST.… call in a formula, say in words what it computes for which
 * cells, the method behind it, and — where one exists — a built-in Excel formula that reproduces,
 * brackets or approximates it for the first variant (or the first challenger), so a reader can check
 * the add-in with Excel alone. Pure functions.
 *
 * Why one file of ~660 lines: parsing a call, the per-function sentences (describeCall, ~190 lines) and
 * the cross-check formulas use one set of address helpers and the catalogue's signatures. The sentences
 * are the part to move into a file of their own if more functions get one.
 */
import { CATALOGUE_LIST } from '../../functions/catalogue';
import { requiredCount } from '../../functions/sheet/entry';
import FUNCTION_TEXTS from '../../functions/texts.generated.json';
import { parseAddress, cellAddress, quoteSheet } from '../workbook/address';

/** One argument of a call: its catalogue name and the text the formula gives it ("" when left out). */
export interface CallArgument {
  readonly name: string;
  readonly text: string;
  readonly optional: boolean;
}

/** An =ABTEST. call found in a formula. */
export interface ParsedCall {
  /** Name without the namespace, e.g. "RATE_INTERVAL". */
  readonly name: string;
  /** The argument texts in order, trimmed. */
  readonly args: readonly string[];
}

/** How a built-in formula relates to the add-in's result. */
export type CrossCheckKind = 'reproduces' | 'brackets' | 'approximates' | 'checks' | 'compares';

/** A built-in formula a reader can type next to the result. */
export interface CrossCheck {
  readonly kind: CrossCheckKind;
  /** What the formula shows, in words. */
  readonly what: string;
  /** Excel formulas, in the order `what` mentions them. */
  readonly formulas: readonly string[];
}

/** Everything the Explain section shows. */
export interface Explanation {
  readonly name: string;
  readonly arguments: readonly CallArgument[];
  /** What the call computes, naming its cells. */
  readonly summary: string;
  /** The method in plain words, when its formula needs them (an integral), else null. */
  readonly plainMethod: string | null;
  /** The method and its published source (with its formula; see mathPieces for showing subscripts). */
  readonly method: string;
  readonly crossCheck: CrossCheck | null;
  /** Words of caution specific to this function, if any. */
  readonly caution: string | null;
}

/** A piece of a method text: plain text, or a subscript ("i" in fᵢ, "j≠i" under ∏). */
export interface MathPiece {
  readonly text: string;
  readonly subscript: boolean;
}

/**
 * Split a method text into plain pieces and subscripts, so "∫ f_i(x) ∏_{j≠i} F_j(x) dx" is shown with
 * real subscripts instead of its raw notation. A subscript is what follows "_" after a letter, ∏ or "max":
 * a {group}, a (group), or a run of letters and digits. Cost O(length).
 * @example mathPieces('f_i(x)') //=> [{ text: 'f', subscript: false }, { text: 'i', subscript: true }, { text: '(x)', subscript: false }]
 */
export function mathPieces(text: string): MathPiece[] {
  const pieces: MathPiece[] = [];
  const pattern = /(max|[A-Za-zλμ∏Π])_(?:\{([^}]*)\}|\(([^)]*)\)|([A-Za-z0-9]+))/g;
  let last = 0;
  for (let match = pattern.exec(text); match !== null; match = pattern.exec(text)) {
    const base = match[1] ?? '';
    const sub = match[2] ?? (match[3] !== undefined ? `(${match[3]})` : (match[4] ?? ''));
    pieces.push({ text: text.slice(last, match.index) + base, subscript: false }, { text: sub, subscript: true });
    last = match.index + match[0].length;
  }
  pieces.push({ text: text.slice(last), subscript: false });
  return pieces.filter((piece) => piece.text !== '');
}

/** The method in plain words, before its formula, for the functions whose method is an integral. */
const PLAIN_METHODS: readonly [RegExp, string][] = [
  [
    /PROB_HIGHEST$/,
    'In words: for every possible value, the chance that this variant has that value while every other variant is below it, added up over all values.',
  ],
  [
    /PROB_ABOVE_CONTROL$/,
    "In words: for every possible value of the challenger, the chance that the control is below it, averaged over what the challenger's value may be.",
  ],
  [
    /LIFT_INTERVAL$/,
    "In words: for any lift r, the chance that the true lift is below r comes from averaging over what the control's value may be; the interval's ends are the lifts where that chance is (1 − level)/2 and 1 − (1 − level)/2, the median where it is ½.",
  ],
  [
    /DIFF_INTERVAL$/,
    "In words: for any difference d, the chance that the true difference is below d comes from averaging over what the control's value may be; the interval's ends are where that chance is (1 − level)/2 and 1 − (1 − level)/2.",
  ],
  [
    /PROB_LIFT_ABOVE$/,
    "In words: the chance that the challenger beats the control by more than min_lift, averaged over what the control's value may be.",
  ],
  [
    /DECISION$/,
    'In words: the expected loss of each variant is worked out first; the variant with the smallest one is recommended once that loss is at most max_loss, otherwise the test should go on.',
  ],
  [
    /EXPECTED_LOSS$/,
    'In words: how much you give up on average if you choose this variant and another one is in fact better; zero when it is surely the best.',
  ],
  [/^LIFT_DENSITY$/, "In words: how plausible each lift is, from averaging over what the control's rate may be."],
];

/** Why a formula could not be explained. */
export interface NotExplained {
  readonly problem: string;
}

/**
 * Split a formula's argument list at top-level commas, respecting parentheses, braces (array
 * constants), "text" and 'sheet names'. Cost O(length).
 * @example splitArguments("C2:C4, B2:B4, 0.9") //=> ["C2:C4", "B2:B4", "0.9"]
 */
export function splitArguments(list: string): string[] {
  const out: string[] = [];
  let depth = 0;
  let current = '';
  let quote: '"' | "'" | null = null;
  for (let i = 0; i < list.length; i += 1) {
    const ch = list.charAt(i);
    if (quote !== null) {
      current += ch;
      if (ch === quote) {
        if (list.charAt(i + 1) === quote) {
          current += quote;
          i += 1;
        } else {
          quote = null;
        }
      }
      continue;
    }
    if (ch === '"' || ch === "'") quote = ch;
    else if (ch === '(' || ch === '{') depth += 1;
    else if (ch === ')' || ch === '}') depth -= 1;
    else if (ch === ',' && depth === 0) {
      out.push(current.trim());
      current = '';
      continue;
    }
    current += ch;
  }
  if (current.trim() !== '' || out.length > 0) out.push(current.trim());
  return out;
}

/**
 * Find the first =ABTEST.NAME(…) call in a formula (it may sit inside other functions) and split its
 * arguments. Cost O(length). Returns null when the text is not a formula or holds no ABTEST call, or
 * the call's parentheses do not close.
 * @example parseAbtestCall("=ABTEST.PROB_HIGHEST(C2:C4, B2:B4)") //=> { name: "PROB_HIGHEST", args: ["C2:C4", "B2:B4"] }
 */
export function parseAbtestCall(formula: string): ParsedCall | null {
  if (!formula.startsWith('=')) return null;
  const match = /ABTEST\.([A-Z_][A-Z0-9_]*)\s*\(/i.exec(formula);
  if (!match || match[1] === undefined) return null;
  const open = match.index + match[0].length;
  let depth = 1;
  let quote: string | null = null;
  for (let i = open; i < formula.length; i += 1) {
    const ch = formula.charAt(i);
    if (quote !== null) {
      if (ch === quote) quote = formula.charAt(i + 1) === quote ? ((i += 1), quote) : null;
      continue;
    }
    if (ch === '"' || ch === "'") quote = ch;
    else if (ch === '(') depth += 1;
    else if (ch === ')') {
      depth -= 1;
      if (depth === 0) return { name: match[1].toUpperCase(), args: splitArguments(formula.slice(open, i)) };
    }
  }
  return null;
}

interface Signature {
  readonly args: readonly string[];
  /** Number of required arguments. */
  readonly required: number;
}

/** Every function's argument names, required first, from the function catalogue (functions/catalogue.ts). */
export const SIGNATURES: Readonly<Record<string, Signature>> = Object.fromEntries(
  CATALOGUE_LIST.map((f) => [f.id, { args: f.params.map((p) => p.name), required: requiredCount(f) }]),
);

/** A function's help texts (its wrapper's JSDoc, via help/build.js): description, method, source, cautions. */
interface FunctionTexts {
  readonly description: string;
  readonly method: string;
  readonly source: string;
  readonly cautions: readonly string[];
}
const TEXTS: Readonly<Record<string, FunctionTexts>> = FUNCTION_TEXTS;

/**
 * The i-th cell (0-based) of a range reference, as formula text: "C3" for item 1 of "C2:C4" (a column)
 * or of "C2:E2" (a row), keeping any sheet prefix; INDEX(ref, i+1) when the reference is not a plain
 * A1 range (a name, an expression). Cost O(length).
 * @example itemOf("'Past tests'!B2:B13", 1) //=> "'Past tests'!B3"
 */
export function itemOf(reference: string, index: number): string {
  try {
    const parsed = parseAddress(reference.trim());
    const isRow = parsed.start.row === parsed.end.row && parsed.start.column !== parsed.end.column;
    const cell = isRow
      ? { row: parsed.start.row, column: parsed.start.column + index }
      : { row: parsed.start.row + index, column: parsed.start.column };
    const prefix = parsed.sheet === '' ? '' : `${quoteSheet(parsed.sheet)}!`;
    return prefix + cellAddress(cell);
  } catch {
    return `INDEX(${reference},${index + 1})`;
  }
}

/**
 * The number of cells of a one-row or one-column reference ("C2:C4" → 3), or null when the text is not
 * a plain A1 range (a name, an expression). Cost O(length).
 * @example cellsIn("'Past tests'!B4:B15") //=> 12
 */
export function cellsIn(reference: string): number | null {
  try {
    const parsed = parseAddress(reference.trim());
    return (parsed.end.row - parsed.start.row + 1) * (parsed.end.column - parsed.start.column + 1);
  } catch {
    return null;
  }
}

/** The cells a one-value-per-variant result fills from `anchor`: down for column data, across for row data. */
function spillOf(anchor: string, dataReference: string, count: number): string {
  try {
    const data = parseAddress(dataReference.trim());
    const start = parseAddress(anchor).start;
    const alongRow = data.start.row === data.end.row && data.end.column > data.start.column;
    const end = alongRow
      ? { row: start.row, column: start.column + count - 1 }
      : { row: start.row + count - 1, column: start.column };
    return `${cellAddress(start)}:${cellAddress(end)}`;
  } catch {
    return `${anchor}#`;
  }
}

/**
 * The cross-check of a P(highest) result that fits the number of variants: with two, having the highest
 * value is beating the other, so the pairwise formula applies to the second cell; with more, no built-in
 * formula gives it, but the values must add up to 1 and the second variant's value cannot exceed its
 * chance of beating the first (the pairwise formula), so both are offered as checks.
 */
function highestCheck(pairwise: CrossCheck, dataReference: string, anchor: string, noun: string): CrossCheck {
  const count = cellsIn(dataReference);
  if (count === 2) {
    return {
      ...pairwise,
      what: `with two variants, having the highest ${noun} is the same as beating the other: the second variant's value, ${pairwise.kind === 'reproduces' ? 'exactly' : 'by a normal approximation'}`,
    };
  }
  const bound = `its chance of beating the first variant${pairwise.kind === 'reproduces' ? '' : ' (normal approximation)'}`;
  return {
    kind: 'checks',
    what:
      count === null
        ? `an upper limit for the second variant's value: ${bound}; with more variants its chance of the highest ${noun} is lower`
        : `that the ${count} values add up to 1 (first formula), and an upper limit for the second variant's value: ${bound} (second formula). With ${count} variants its chance of the highest ${noun} is lower than that, so the two numbers do not match`,
    formulas:
      count === null
        ? [...pairwise.formulas]
        : [`=SUM(${spillOf(anchor, dataReference, count)})`, ...pairwise.formulas],
  };
}

/** The cell `columns` to the right of a local address (used for the second cell of a spill). */
function rightOf(address: string, columns: number): string {
  try {
    const parsed = parseAddress(address);
    const prefix = parsed.sheet === '' ? '' : `${quoteSheet(parsed.sheet)}!`;
    return prefix + cellAddress({ row: parsed.start.row, column: parsed.start.column + columns });
  } catch {
    return `OFFSET(${address},0,${columns})`;
  }
}

/** Wrap a formula fragment in parentheses unless it is a plain number or reference. */
function p(text: string): string {
  return /^[A-Za-z0-9_.$!':]+$/.test(text) ? text : `(${text})`;
}

function percent(levelText: string): string {
  const n = Number(levelText);
  return Number.isFinite(n) && levelText.trim() !== '' ? `${+(n * 100).toFixed(4)}%` : `the level in ${levelText}`;
}

/**
 * Explain a cell's formula. `anchor` is the local address of the cell holding it (used where a
 * check formula refers to the spilled result itself). Cost O(length of the formula).
 * Never throws; returns { problem } for text that holds no =ABTEST. call or a call we do not know.
 * @example explainFormula("=ABTEST.POSTERIOR_MEAN(C2:C4,B2:B4)", "F2").crossCheck.formulas[0] //=> "=(1+C2)/(1+1+B2)"
 */
export function explainFormula(formula: string, anchor: string): Explanation | NotExplained {
  const call = parseAbtestCall(formula);
  if (call === null) {
    return {
      problem: 'this cell holds no =ABTEST. formula; select a cell with one (the first cell of a spilled result)',
    };
  }
  const signature = SIGNATURES[call.name];
  if (signature === undefined) return { problem: `ABTEST.${call.name} is not one of Lift Ledger's functions` };
  if (call.args.length > signature.args.length) {
    return {
      problem: `ABTEST.${call.name} takes at most ${signature.args.length} arguments; this formula gives ${call.args.length}`,
    };
  }
  const args: CallArgument[] = signature.args.map((name, i) => ({
    name,
    text: call.args[i] ?? '',
    optional: i >= signature.required,
  }));
  const get = (name: string): string => args.find((a) => a.name === name)?.text ?? '';
  const or = (name: string, fallback: string): string => (get(name) === '' ? fallback : get(name));
  const texts = TEXTS[call.name];
  return {
    name: call.name,
    arguments: args,
    ...(describeCall(call.name, get, or, anchor) ?? genericWords(call.name, texts, args)),
    plainMethod: PLAIN_METHODS.find(([pattern]) => pattern.test(call.name))?.[1] ?? null,
    method: texts === undefined ? '' : `${texts.method} Source: ${texts.source}`,
    caution: texts === undefined || texts.cautions.length === 0 ? null : texts.cautions.join(' '),
  };
}

/** What describeCall words for a call: the summary and the built-in cross-check. */
type CallWords = Pick<Explanation, 'summary' | 'crossCheck'>;

/** The words for a function without its own case below: its description and the arguments as given. */
function genericWords(name: string, texts: FunctionTexts | undefined, args: readonly CallArgument[]): CallWords {
  const given = args.filter((a) => a.text !== '').map((a) => `${a.name} ${a.text}`);
  const what = texts === undefined ? `ABTEST.${name}.` : texts.description;
  return { summary: given.length === 0 ? what : `${what} From ${given.join(', ')}.`, crossCheck: null };
}

type Getter = (name: string) => string;
type Defaulting = (name: string, fallback: string) => string;

function betaPriorWords(get: Getter): string {
  return get('prior_alpha') === ''
    ? 'a uniform Beta(1, 1) prior (the default)'
    : `a Beta(${get('prior_alpha')}, ${get('prior_beta')}) prior`;
}

function gammaPriorWords(get: Getter): string {
  return get('prior_shape') === ''
    ? 'a Gamma(1, 0) prior (flat on the rate, the default)'
    : `a Gamma(${get('prior_shape')}, ${get('prior_rate') === '' ? '0' : get('prior_rate')}) prior`;
}

function describeCall(name: string, get: Getter, or: Defaulting, anchor: string): CallWords | null {
  const x = get('conversions');
  const n = get('visitors');
  const a = or('prior_alpha', '1');
  const b = or('prior_beta', '1');
  const level = or('level', '0.95');
  const on = `conversions in ${x} out of visitors in ${n}`;
  const x1 = itemOf(x, 0);
  const n1 = itemOf(n, 0);
  const x2 = itemOf(x, 1);
  const n2 = itemOf(n, 1);
  const postA1 = `${p(a)}+${x1}`;
  const postB1 = `${p(b)}+${n1}-${x1}`;
  const postA2 = `${p(a)}+${x2}`;
  const postB2 = `${p(b)}+${n2}-${x2}`;
  const normalBeats = (): CrossCheck => {
    const mean = (al: string, be: string): string => `(${al})/(${al}+${be})`;
    const variance = (al: string, be: string): string => `(${al})*(${be})/((${al}+${be})^2*(${al}+${be}+1))`;
    return {
      kind: 'approximates',
      what: 'for the first challenger against the control, a normal approximation to the two Beta posteriors (close once both variants have a few dozen conversions)',
      formulas: [
        `=NORM.S.DIST((${mean(postA2, postB2)}-${mean(postA1, postB1)})/SQRT(${variance(postA1, postB1)}+${variance(postA2, postB2)}),TRUE)`,
      ],
    };
  };
  switch (name) {
    case 'POSTERIOR_MEAN':
      return {
        summary: `The posterior mean conversion rate of each variant, from ${on}, with ${betaPriorWords(get)}.`,
        crossCheck: {
          kind: 'reproduces',
          what: "the first variant's value, by the closed form (alpha + conversions)/(alpha + beta + visitors)",
          formulas: [`=(${a}+${x1})/(${a}+${b}+${n1})`],
        },
      };
    case 'RATE_INTERVAL': {
      const hdi = /hdi/i.test(get('method'));
      const tail = `(1-${p(level)})/2`;
      return {
        summary: `The ${percent(level)} ${hdi ? 'highest-density' : 'central (equal-tailed)'} credible interval for each variant's conversion rate, from ${on}, with ${betaPriorWords(get)}. It spills a lower and an upper bound per variant.`,
        crossCheck: hdi
          ? {
              kind: 'brackets',
              what: 'for the first variant: the lower bound lies between 0 and the first formula, the upper bound between the second formula and 1 (any interval holding that probability does)',
              formulas: [`=BETA.INV(1-${p(level)},${postA1},${postB1})`, `=BETA.INV(${p(level)},${postA1},${postB1})`],
            }
          : {
              kind: 'reproduces',
              what: "the first variant's lower and upper bounds, with Excel's Beta quantile",
              formulas: [`=BETA.INV(${tail},${postA1},${postB1})`, `=BETA.INV(1-${tail},${postA1},${postB1})`],
            },
      };
    }
    case 'PROB_HIGHEST':
      return {
        summary: `The probability that each variant has the highest true conversion rate, from ${on}, with ${betaPriorWords(get)}. The values add up to 1.`,
        crossCheck: highestCheck(normalBeats(), x, anchor, 'conversion rate'),
      };
    case 'PROB_ABOVE_CONTROL':
      return {
        summary: `For each challenger, the probability that its true conversion rate is above the control's (the first variant), from ${on}, with ${betaPriorWords(get)}. The control's cell is left empty.`,
        crossCheck: normalBeats(),
      };
    case 'LIFT_INTERVAL':
    case 'RATE_DIFF_INTERVAL': {
      const lift = name === 'LIFT_INTERVAL';
      return {
        summary: `For each challenger, the ${percent(level)} credible interval and median of the ${lift ? "relative lift (its rate ÷ the control's rate − 1)" : "difference in rate (its rate − the control's rate, in rate units)"}, from ${on}, with ${betaPriorWords(get)}. It spills lower, median, upper; the control's row is empty.`,
        crossCheck: null,
      };
    }
    case 'PROB_LIFT_ABOVE':
      return {
        summary: `For each challenger, the probability that its relative lift over the control is above ${get('min_lift')} (a negative value asks "no worse than"), from ${on}, with ${betaPriorWords(get)}.`,
        crossCheck: null,
      };
    case 'EXPECTED_LOSS':
      return {
        summary: `For each variant, the expected loss: the conversion rate given up on average by choosing it, E[max over variants of the rate − its rate], from ${on}, with ${betaPriorWords(get)}.`,
        crossCheck: null,
      };
    case 'DECISION':
      return {
        summary: `One sentence: which variant to choose, if its expected loss is at most ${get('max_loss') === '' ? "1% of the control's posterior mean rate (the default)" : get('max_loss')}; otherwise that more data is needed, naming the current leader and its loss. From ${on}${get('labels') === '' ? '' : `, names in ${get('labels')}`}, with ${betaPriorWords(get)}.`,
        crossCheck: null,
      };
    case 'POSTERIOR_DENSITY':
      return {
        summary: `A table for a chart: ${or('points', '101')} rows; the first column is a grid of conversion rates, then one column per variant with its posterior density, from ${on}, with ${betaPriorWords(get)}.`,
        crossCheck: {
          kind: 'reproduces',
          what: "the first variant's density in the first row, with Excel's Beta density at the grid value in this cell",
          formulas: [`=BETA.DIST(${anchor},${postA1},${postB1},FALSE)`],
        },
      };
    case 'LIFT_DENSITY':
      return {
        summary: `A table for a chart: ${or('points', '101')} rows; the first column is a grid of relative lifts, then one column per challenger with the density of its lift over the control, from ${on}, with ${betaPriorWords(get)}.`,
        crossCheck: null,
      };
    case 'PRIOR_FROM_MEAN': {
      const m = get('mean_rate');
      const s = get('strength');
      return {
        summary: `A Beta prior (alpha, beta in one row) with mean ${m} and worth ${s} visitors (alpha + beta = ${s}).`,
        crossCheck: {
          kind: 'reproduces',
          what: 'alpha and beta',
          formulas: [`=${p(m)}*${p(s)}`, `=(1-${p(m)})*${p(s)}`],
        },
      };
    }
    case 'PRIOR_FROM_INTERVAL': {
      const lvl = or('level', '0.9');
      const alphaCell = anchor;
      const betaCell = rightOf(anchor, 1);
      return {
        summary: `The Beta prior (alpha, beta in one row) whose central ${percent(lvl)} interval runs from ${get('low')} to ${get('high')}.`,
        crossCheck: {
          kind: 'checks',
          what: `that the fitted prior (alpha in ${alphaCell}, beta in ${betaCell}) puts (1 − level)/2 below low and above high: both formulas should give (1 − level)/2`,
          formulas: [
            `=BETA.DIST(${get('low')},${alphaCell},${betaCell},TRUE)`,
            `=1-BETA.DIST(${get('high')},${alphaCell},${betaCell},TRUE)`,
          ],
        },
      };
    }
    case 'PRIOR_FROM_HISTORY': {
      const moments = /moments/i.test(get('method'));
      return {
        summary: `A Beta prior (alpha, beta in one row) fitted to past results: conversions in ${x} out of visitors in ${n}, one past experiment or arm per cell, by ${moments ? 'the method of moments' : 'maximum likelihood'}.`,
        crossCheck: null,
      };
    }
    case 'DECISION_POWER':
      return {
        summary: `The probability that a two-variant test with ${get('visitors_per_variant')} visitors per variant, baseline rate ${get('baseline_rate')} and a challenger truly ${get('lift')} better (relative), ends with P(beats control) ≥ ${or('threshold', '0.95')}${get('prior_alpha') === '' ? '' : `, with ${betaPriorWords(get)}`}. With lift 0 it is the false-alarm rate.`,
        crossCheck: null,
      };
    case 'VISITORS_NEEDED': {
      const base = get('baseline_rate');
      const lift = get('lift');
      return {
        summary: `The smallest number of visitors per variant whose decision power reaches ${or('power', '0.8')}, for baseline rate ${base}, a true relative lift of ${lift} and decision threshold ${or('threshold', '0.95')}.`,
        crossCheck: {
          kind: 'compares',
          what: 'the classic z-test size per variant for the same baseline and lift (two-sided 5%), a familiar number of the same order',
          formulas: [classicFormula(base, lift, '0.05', or('power', '0.8'), '2')],
        },
      };
    }
    case 'CLASSIC_SAMPLE_SIZE': {
      const base = get('baseline_rate');
      const lift = get('lift');
      return {
        summary: `Visitors per variant for the classic two-proportion z-test: baseline rate ${base}, relative lift ${lift}, significance level ${or('alpha', '0.05')}, power ${or('power', '0.8')}, ${or('sides', '2')}-sided; rounded up.`,
        crossCheck: {
          kind: 'reproduces',
          what: "the size, with Excel's normal quantile",
          formulas: [classicFormula(base, lift, or('alpha', '0.05'), or('power', '0.8'), or('sides', '2'))],
        },
      };
    }
    case 'SRM_PVALUE': {
      const v = get('visitors');
      const shares = get('planned_shares');
      const expected = shares === '' ? `0*${p(v)}+SUM(${v})/COUNT(${v})` : `SUM(${v})*${p(shares)}/SUM(${shares})`;
      return {
        summary: `The p-value of the chi-square test of the visitors in ${v} against the planned split (${shares === '' ? 'equal shares' : `shares in ${shares}`}). A value below 0.001 says the split looks broken (sample ratio mismatch).`,
        crossCheck: {
          kind: 'reproduces',
          what: "the p-value with Excel's CHISQ.TEST on observed and expected visitors",
          formulas: [`=CHISQ.TEST(${v},${expected})`],
        },
      };
    }
    default:
      return describeMeanOrEvents(name, get, or, anchor);
  }
}

/** The classic size as a built-in formula (NORM.S.INV), written out without LET for older Excel. */
function classicFormula(base: string, lift: string, alpha: string, power: string, sides: string): string {
  const p1 = p(base);
  const p2 = `${p1}*(1+${p(lift)})`;
  const pbar = `(${p1}+${p2})/2`;
  return (
    `=ROUNDUP((NORM.S.INV(1-${p(alpha)}/${p(sides)})*SQRT(2*${pbar}*(1-${pbar}))` +
    `+NORM.S.INV(${p(power)})*SQRT(${p1}*(1-${p1})+${p2}*(1-${p2})))^2/(${p2}-${p1})^2,0)`
  );
}

function describeMeanOrEvents(name: string, get: Getter, or: Defaulting, anchor: string): CallWords | null {
  const level = or('level', '0.95');
  if (name.startsWith('MEAN_')) {
    const count = get('count');
    const mean = get('mean');
    const sd = get('sd');
    const on = `counts in ${count}, means in ${mean} and standard deviations in ${sd}`;
    const c1 = itemOf(count, 0);
    const m1 = itemOf(mean, 0);
    const s1 = itemOf(sd, 0);
    const c2 = itemOf(count, 1);
    const m2 = itemOf(mean, 1);
    const s2 = itemOf(sd, 1);
    const se = `SQRT(${s1}^2/${c1}+${s2}^2/${c2})`;
    switch (name) {
      case 'MEAN_INTERVAL':
        return {
          summary: `The ${percent(level)} credible interval for each variant's mean, from ${on}.`,
          crossCheck: {
            kind: 'reproduces',
            what: "the first variant's lower and upper bounds with Excel's Student t quantile",
            formulas: [
              `=${m1}-T.INV(1-(1-${p(level)})/2,${c1}-1)*${s1}/SQRT(${c1})`,
              `=${m1}+T.INV(1-(1-${p(level)})/2,${c1}-1)*${s1}/SQRT(${c1})`,
            ],
          },
        };
      case 'MEAN_PROB_HIGHEST':
      case 'MEAN_PROB_ABOVE_CONTROL': {
        const pairwise: CrossCheck = {
          kind: 'approximates',
          what: 'for the first challenger against the control, a normal approximation (close for large counts)',
          formulas: [`=NORM.S.DIST((${m2}-${m1})/${se},TRUE)`],
        };
        return {
          summary:
            name === 'MEAN_PROB_HIGHEST'
              ? `The probability that each variant has the highest true mean, from ${on}. The values add up to 1.`
              : `For each challenger, the probability that its true mean is above the control's, from ${on}.`,
          crossCheck: name === 'MEAN_PROB_HIGHEST' ? highestCheck(pairwise, count, anchor, 'mean') : pairwise,
        };
      }
      case 'MEAN_DIFF_INTERVAL':
        return {
          summary: `For each challenger, the ${percent(level)} credible interval and median of its mean − the control's mean, from ${on}.`,
          crossCheck: {
            kind: 'approximates',
            what: "the first challenger's lower and upper bounds by a normal approximation (close for large counts)",
            formulas: [
              `=${m2}-${m1}-NORM.S.INV(1-(1-${p(level)})/2)*${se}`,
              `=${m2}-${m1}+NORM.S.INV(1-(1-${p(level)})/2)*${se}`,
            ],
          },
        };
      case 'MEAN_LIFT_INTERVAL':
        return {
          summary: `For each challenger, the ${percent(level)} credible interval and median of its mean ÷ the control's mean − 1, from ${on}. It is an error when the control's mean could plausibly be zero or below.`,
          crossCheck: null,
        };
      case 'MEAN_EXPECTED_LOSS':
        return {
          summary: `For each variant, the mean given up on average by choosing it, E[max mean − its mean], from ${on}.`,
          crossCheck: null,
        };
      case 'MEAN_PROB_LIFT_ABOVE': {
        const k = `(1+${p(get('min_lift'))})`;
        return {
          summary: `For each challenger, the probability that its true mean is more than min_lift (${get('min_lift')}) above the control's, relative (a negative min_lift asks "no worse than"), from ${on}.`,
          crossCheck: {
            kind: 'approximates',
            what: "for the first challenger, a normal approximation of its mean minus (1 + min_lift) × the control's (close for large counts and a control mean far from 0)",
            formulas: [`=NORM.S.DIST((${m2}-${k}*${m1})/SQRT(${s2}^2/${c2}+${k}^2*${s1}^2/${c1}),TRUE)`],
          },
        };
      }
      case 'MEAN_DECISION':
        return {
          summary: `What to do on the means, from ${on}: the variant with the smallest expected loss (MEAN_EXPECTED_LOSS) is recommended once that loss is at most ${get('max_loss') === '' ? "1% of the control's mean (the default)" : `max_loss (${get('max_loss')}), in the metric's units`}.`,
          crossCheck: null,
        };
      default:
        break;
    }
  }
  const events = get('events');
  const exposure = get('exposure');
  const shape = or('prior_shape', '1');
  const rate = or('prior_rate', '0');
  const on = `events in ${events} over exposure in ${exposure}, with ${gammaPriorWords(get)}`;
  const e1 = itemOf(events, 0);
  const t1 = itemOf(exposure, 0);
  const e2 = itemOf(events, 1);
  const t2 = itemOf(exposure, 1);
  const shape1 = `${p(shape)}+${e1}`;
  const shape2 = `${p(shape)}+${e2}`;
  const rate1 = rate === '0' ? t1 : `${p(rate)}+${t1}`;
  const rate2 = rate === '0' ? t2 : `${p(rate)}+${t2}`;
  switch (name) {
    case 'EVENTS_RATE_INTERVAL':
      return {
        summary: `The ${percent(level)} credible interval for each variant's events per unit of exposure, from ${on}.`,
        crossCheck: {
          kind: 'reproduces',
          what: "the first variant's bounds with Excel's Gamma quantile (GAMMA.INV takes a scale, 1/rate)",
          formulas: [
            `=GAMMA.INV((1-${p(level)})/2,${shape1},1/(${rate1}))`,
            `=GAMMA.INV(1-(1-${p(level)})/2,${shape1},1/(${rate1}))`,
          ],
        },
      };
    case 'EVENTS_PROB_HIGHEST':
    case 'EVENTS_PROB_ABOVE_CONTROL': {
      const pairwise: CrossCheck = {
        kind: 'reproduces',
        what: "the first challenger's value, by the regularized incomplete beta closed form",
        formulas: [`=BETA.DIST((${rate1})/((${rate1})+(${rate2})),${shape1},${shape2},TRUE)`],
      };
      return {
        summary:
          name === 'EVENTS_PROB_HIGHEST'
            ? `The probability that each variant has the highest true event rate, from ${on}. The values add up to 1.`
            : `For each challenger, the probability that its true event rate is above the control's, from ${on}.`,
        crossCheck: name === 'EVENTS_PROB_HIGHEST' ? highestCheck(pairwise, events, anchor, 'event rate') : pairwise,
      };
    }
    case 'EVENTS_LIFT_INTERVAL': {
      const q = (prob: string): string => `BETA.INV(${prob},${shape2},${shape1})`;
      const lift = (prob: string): string => `=(${rate1})/(${rate2})*${q(prob)}/(1-${q(prob)})-1`;
      return {
        summary: `For each challenger, the ${percent(level)} credible interval and median of its event rate ÷ the control's − 1, from ${on}.`,
        crossCheck: {
          kind: 'reproduces',
          what: "the first challenger's lower bound, median and upper bound with Excel's Beta quantile",
          formulas: [lift(`(1-${p(level)})/2`), lift('0.5'), lift(`1-(1-${p(level)})/2`)],
        },
      };
    }
    case 'EVENTS_EXPECTED_LOSS':
      return {
        summary: `For each variant, the event rate given up on average by choosing it, from ${on}.`,
        crossCheck: null,
      };
    case 'EVENTS_PROB_LIFT_ABOVE': {
      const k = `(1+${p(get('min_lift'))})`;
      return {
        summary: `For each challenger, the probability that its true event rate is more than min_lift (${get('min_lift')}) above the control's, relative (a negative min_lift asks "no worse than"), from ${on}.`,
        crossCheck: {
          kind: 'reproduces',
          what: "the first challenger's value, by the regularized incomplete beta closed form (rate_B > (1 + min_lift) × rate_A)",
          formulas: [`=BETA.DIST((${rate1})/((${rate1})+${k}*(${rate2})),${shape1},${shape2},TRUE)`],
        },
      };
    }
    case 'EVENTS_DECISION':
      return {
        summary: `What to do on the event rates, from ${on}: the variant with the smallest expected loss (EVENTS_EXPECTED_LOSS) is recommended once that loss is at most ${get('max_loss') === '' ? "1% of the control's posterior mean rate (the default)" : `max_loss (${get('max_loss')}) events per unit of exposure`}.`,
        crossCheck: null,
      };
    default:
      return describeRevenue(name, get, or, anchor);
  }
}

/**
 * Revenue per visitor from totals. Its cross-checks are normal approximations on the log scale (the delta
 * method; common practice): log R = log p + log v with var(log p) ≈ (1 − p)/orders and var(log v) ≈
 * 1/orders for exponential order values, (order sd ÷ average order value)²/orders with order_sd given.
 */
function describeRevenue(name: string, get: Getter, or: Defaulting, anchor: string): CallWords | null {
  if (!name.startsWith('REVENUE_')) return null;
  const level = or('level', '0.95');
  const orders = get('orders');
  const visitors = get('visitors');
  const revenue = get('revenue');
  const sd = get('order_sd');
  const on =
    `orders in ${orders}, visitors in ${visitors} and revenue in ${revenue}` +
    (sd === ''
      ? ', order values taken as exponential (no order_sd given)'
      : `, with the order values' standard deviations in ${sd}`);
  const item = (i: number) => ({
    o: itemOf(orders, i),
    v: itemOf(visitors, i),
    r: itemOf(revenue, i),
    s: sd === '' ? '' : itemOf(sd, i),
  });
  const variance = (i: number): string => {
    const { o, v, r, s } = item(i);
    const orderValue = s === '' ? `1/${o}` : `(${s}/(${r}/${o}))^2/${o}`;
    return `(1-${o}/${v})/${o}+${orderValue}`;
  };
  const logR = (i: number): string => `LN(${item(i).r}/${item(i).v})`;
  const se = `SQRT(${variance(0)}+${variance(1)})`;
  const z = `NORM.S.INV(1-(1-${p(level)})/2)`;
  const approximate = 'a normal approximation on the log scale (close once each variant has a few hundred orders)';
  switch (name) {
    case 'REVENUE_INTERVAL':
      return {
        summary: `The ${percent(level)} credible interval for each variant's revenue per visitor (conversion rate × average order value), from ${on}.`,
        crossCheck: {
          kind: 'approximates',
          what: `the first variant's bounds by ${approximate}`,
          formulas: [`=EXP(${logR(0)}-${z}*SQRT(${variance(0)}))`, `=EXP(${logR(0)}+${z}*SQRT(${variance(0)}))`],
        },
      };
    case 'REVENUE_PROB_HIGHEST':
    case 'REVENUE_PROB_ABOVE_CONTROL': {
      const pairwise: CrossCheck = {
        kind: 'approximates',
        what: `for the first challenger against the control, ${approximate}`,
        formulas: [`=NORM.S.DIST((${logR(1)}-${logR(0)})/${se},TRUE)`],
      };
      return {
        summary:
          name === 'REVENUE_PROB_HIGHEST'
            ? `The probability that each variant has the highest true revenue per visitor, from ${on}. The values add up to 1.`
            : `For each challenger, the probability that its true revenue per visitor is above the control's, from ${on}.`,
        crossCheck:
          name === 'REVENUE_PROB_HIGHEST' ? highestCheck(pairwise, orders, anchor, 'revenue per visitor') : pairwise,
      };
    }
    case 'REVENUE_LIFT_INTERVAL':
      return {
        summary: `For each challenger, the ${percent(level)} credible interval and median of its revenue per visitor ÷ the control's − 1, from ${on}.`,
        crossCheck: {
          kind: 'approximates',
          what: `the first challenger's lower bound, median and upper bound by ${approximate}`,
          formulas: [
            `=EXP(${logR(1)}-${logR(0)}-${z}*${se})-1`,
            `=EXP(${logR(1)}-${logR(0)})-1`,
            `=EXP(${logR(1)}-${logR(0)}+${z}*${se})-1`,
          ],
        },
      };
    case 'REVENUE_PROB_LIFT_ABOVE':
      return {
        summary: `For each challenger, the probability that its true revenue per visitor is more than min_lift (${get('min_lift')}) above the control's, relative (a negative min_lift asks "no worse than"), from ${on}.`,
        crossCheck: {
          kind: 'approximates',
          what: `for the first challenger, ${approximate}`,
          formulas: [`=NORM.S.DIST((${logR(1)}-${logR(0)}-LN(1+${p(get('min_lift'))}))/${se},TRUE)`],
        },
      };
    case 'REVENUE_EXPECTED_LOSS':
      return {
        summary: `For each variant, the revenue per visitor given up on average by choosing it, E[max R − its R], in the revenue's currency per visitor, from ${on}.`,
        crossCheck: null,
      };
    case 'REVENUE_DECISION':
      return {
        summary: `What to do on revenue per visitor, from ${on}: the variant with the smallest expected loss (REVENUE_EXPECTED_LOSS) is recommended once that loss is at most ${get('max_loss') === '' ? "1% of the control's posterior mean revenue per visitor (the default)" : `max_loss (${get('max_loss')}) per visitor`}.`,
        crossCheck: null,
      };
    default:
      return null;
  }
}
