/**
 * Every @example in functions/functions.ts that states a result ("=ABTEST.F(...) returns ...") is run
 * through the wrapper and compared to the digits it shows. The examples are what users read in the help
 * pages; their numbers were copied from the scipy references in test/reference/addin/addin_values.json
 * (and R for CLASSIC_SAMPLE_SIZE and SRM_PVALUE), so this test also ties the help pages to outside values.
 */
import * as F from '../../functions/functions';

/* eslint-disable-next-line @typescript-eslint/no-require-imports */
const help = require('../../help/build') as {
  readFunctionDocs(): { id: string; jsName: string; examples: string[] }[];
  parseExample(e: string): { formula: string; result?: string };
};

type Cell = number | string;

/** Splits top-level comma-separated arguments of a formula. */
function splitArgs(s: string): string[] {
  const out: string[] = [];
  let depth = 0;
  let inText = false;
  let current = '';
  for (const ch of s) {
    if (ch === '"') inText = !inText;
    if (!inText && ch === '{') depth++;
    if (!inText && ch === '}') depth--;
    if (!inText && depth === 0 && ch === ',') {
      out.push(current.trim());
      current = '';
    } else current += ch;
  }
  if (current.trim() !== '') out.push(current.trim());
  return out;
}

function parseCell(s: string): Cell {
  const t = s.trim();
  if (t.startsWith('"')) return t.slice(1, -1);
  const x = Number(t);
  if (!Number.isFinite(x)) throw new Error(`not a number: ${t}`);
  return x;
}

/** An Excel array constant ({1,2;3,4}: "," between columns, ";" between rows) or a scalar. */
function parseValue(s: string): Cell | Cell[][] {
  const t = s.trim();
  if (!t.startsWith('{')) return parseCell(t);
  return t
    .slice(1, -1)
    .split(';')
    .map((r) => splitArgs(r).map(parseCell));
}

/** Number of significant digits shown, to set the tolerance: half a unit in the last place. */
function halfUlp(text: string): number {
  const m = /\.(\d+)/.exec(text);
  const decimals = m ? (m[1] as string).length : 0;
  return 0.5 * 10 ** -decimals;
}

const docs = help.readFunctionDocs();
const cases = docs.flatMap((d) =>
  d.examples
    .map((e) => ({ id: d.id, jsName: d.jsName, ...help.parseExample(e) }))
    .filter((e) => e.result !== undefined),
);

test('most functions have an example with a stated result', () => {
  expect(cases.length).toBeGreaterThanOrEqual(25);
});

test.each(cases.map((c) => [c.id, c] as const))('%s example', (_id, c) => {
  const inner = c.formula.slice(c.formula.indexOf('(') + 1, -1);
  const args = splitArgs(inner).map(parseValue);
  const fn = (F as unknown as Record<string, (...a: unknown[]) => unknown>)[c.jsName] as (...a: unknown[]) => unknown;
  const actual = fn(...args);
  const resultText = c.result as string;
  if (resultText.startsWith('"')) {
    expect(actual).toBe(resultText.slice(1, -1));
    return;
  }
  const expected = parseValue(resultText);
  if (!Array.isArray(expected)) {
    expect(Math.abs((actual as number) - (expected as number))).toBeLessThanOrEqual(halfUlp(resultText) * 1.0001);
    return;
  }
  const rowsText = resultText
    .slice(1, -1)
    .split(';')
    .map((r) => splitArgs(r));
  const got = actual as Cell[][];
  expect(got.length).toBe(expected.length);
  expected.forEach((r, i) =>
    r.forEach((want, j) => {
      const cell = got[i]?.[j];
      if (typeof want === 'string') expect(cell).toBe(want);
      else {
        const shown = rowsText[i]?.[j] as string;
        // the digits shown are significant digits of the value: half a unit in the last place shown
        const tol = halfUlp(shown) * 1.0001 + 1e-15;
        expect({ i, j, within: Math.abs((cell as number) - want) <= tol }).toEqual({ i, j, within: true });
      }
    }),
  );
});
