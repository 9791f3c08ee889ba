/**
 * Checking a formula's inputs the way the worksheet function does, so the Explain section can say why a
 * cell shows #VALUE! in the function's own words ("visitors, item 3: 12.5 is not a whole number"). The
 * arguments are read from the formula text (literals) or from the cells they refer to, then handed to the
 * sheet layer's own reader (functions/sheet/args.ts, readArgs) with the function's catalogue entry.
 * Pure functions; the reading of cells is the caller's.
 */
import { findFunction } from '../../functions/catalogue';
import { readArgs } from '../../functions/sheet/args';
import { ArgumentProblem } from '../../functions/sheet/cells';
import { parseAddress } from '../workbook/address';

/** Where an argument's value comes from, as the formula writes it. */
export type ArgumentSource =
  /** Left out (Excel passes nothing: the function uses its default). */
  | { readonly kind: 'absent' }
  /** A number, text, TRUE/FALSE or array constant written in the formula. */
  | { readonly kind: 'literal'; readonly value: unknown }
  /** A cell or range: its sheet ('' for the formula's own) and local address. */
  | { readonly kind: 'cells'; readonly sheet: string; readonly address: string }
  /** A name or an expression the panel cannot evaluate. */
  | { readonly kind: 'unknown' };

/** One value of an array constant or a literal ("0.95", "\"hdi\"", "TRUE"), or undefined when it is none. */
function literalValue(text: string): unknown {
  const t = text.trim();
  if (/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(t)) return Number(t);
  if (/^"([^"]|"")*"$/.test(t)) return t.slice(1, -1).replace(/""/g, '"');
  if (/^(TRUE|FALSE)$/i.test(t)) return t.toUpperCase() === 'TRUE';
  return undefined;
}

/**
 * Classify an argument's text from a formula. Cost O(length).
 * @example argumentSource('{120;150}') //=> { kind: 'literal', value: [[120], [150]] }
 * @example argumentSource("'Past tests'!B4:B15") //=> { kind: 'cells', sheet: 'Past tests', address: 'B4:B15' }
 */
export function argumentSource(text: string): ArgumentSource {
  const t = text.trim();
  if (t === '') return { kind: 'absent' };
  const single = literalValue(t);
  if (single !== undefined) return { kind: 'literal', value: single };
  if (t.startsWith('{') && t.endsWith('}')) {
    const rows = t
      .slice(1, -1)
      .split(';')
      .map((row) => row.split(',').map(literalValue));
    return rows.every((row) => row.every((v) => v !== undefined))
      ? { kind: 'literal', value: rows }
      : { kind: 'unknown' };
  }
  try {
    const parsed = parseAddress(t);
    const local = t.slice(t.lastIndexOf('!') + 1).replace(/\$/g, '');
    return { kind: 'cells', sheet: parsed.sheet, address: local };
  } catch {
    return { kind: 'unknown' };
  }
}

/** What the re-check found. */
export type Recheck =
  /** The function's own message for the first problem in its inputs. */
  | { readonly kind: 'problem'; readonly message: string }
  /** The inputs pass the function's checks: the trouble is in the computation (or outside the function). */
  | { readonly kind: 'inputs fine' }
  /** Some argument could not be read (a name, an expression): nothing can be said. */
  | { readonly kind: 'cannot check' };

/**
 * Check the arguments of ABTEST.`name` as the worksheet function does. `values` holds each argument by
 * its catalogue name as Excel would pass it: a range as rows of cell values, a single cell or literal as
 * its value, a left-out argument as null; an argument the caller could not read is missing from it.
 * Cost O(cells of the arguments).
 * @example recheckArguments('PROB_HIGHEST', { conversions: [[412], [463]], visitors: [[10412], ['10,050']], prior_alpha: null, prior_beta: null })
 * //=> { kind: 'problem', message: 'visitors, item 2: …' }
 */
export function recheckArguments(name: string, values: Readonly<Record<string, unknown>>): Recheck {
  const fn = findFunction(name);
  if (fn === undefined) return { kind: 'cannot check' };
  if (!fn.params.every((p) => p.name in values)) return { kind: 'cannot check' };
  try {
    readArgs(fn, values as never);
    return { kind: 'inputs fine' };
  } catch (error) {
    if (error instanceof ArgumentProblem) return { kind: 'problem', message: error.message };
    return { kind: 'cannot check' };
  }
}
