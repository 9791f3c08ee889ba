import * as fs from 'fs';
import * as path from 'path';
import * as ts from 'typescript';

/*
 * Every `@example` in functions/stats/** runs here, so the examples in the core's documentation are real
 * code with their real results. The conventions (also in DEVELOPERS.md):
 *  - an example is TypeScript with every named export of every file under functions/stats in scope (a
 *    name exported by two files as different things is in scope only in those files' own examples, as
 *    their own); `import` lines are documentation and are skipped;
 *  - `//=> value` after an expression, or on its own line after a statement or a multi-line expression,
 *    states that expression's value; text in parentheses after the value is a note (where the value comes
 *    from: a closed form, R, mpmath, a paper). Every example states at least one value;
 *  - a number matches when the result rounds to the digits shown; a number ending in `…` is cut, not
 *    rounded: the result lies within one unit of its last digit; a whole number without a point is exact
 *    (a count, an exact zero). Arrays, typed arrays
 *    (`Float64Array [..]`), objects (the same keys), strings, booleans, undefined and null match exactly.
 * The values themselves were checked against the sources their notes name; the tests of each module
 * hold the full checks against references.
 */

const STATS = path.join(__dirname, '../../functions/stats');

interface Check {
  /** 1-based line in the source file of the `//=>`. */
  readonly line: number;
  readonly expected: Expected;
}

interface Example {
  readonly file: string;
  readonly line: number;
  /** The example as a script calling __check(index, value) at each `//=>`. */
  readonly program: string;
  readonly checks: readonly Check[];
  /** Why the example could not be read (then it fails). */
  readonly error?: string;
}

// ----- the expected values -----------------------------------------------------------------------

type Expected =
  | {
      readonly kind: 'number';
      readonly text: string;
      readonly value: number;
      /** One unit of the last digit shown (0: exact). */
      readonly unit: number;
      /** The digits are cut (`…`), not rounded. */
      readonly cut: boolean;
    }
  | { readonly kind: 'exact'; readonly value: string | boolean | undefined | null }
  | { readonly kind: 'array'; readonly items: readonly Expected[]; readonly typed?: string }
  | { readonly kind: 'object'; readonly entries: readonly (readonly [string, Expected])[] };

/** Parses the value after `//=>`; the rest may only be a note in parentheses. Throws on anything else. */
function parseExpected(text: string): Expected {
  let i = 0;
  const space = (): void => {
    while (i < text.length && /\s/.test(text[i] as string)) i++;
  };
  const fail = (why: string): never => {
    throw new Error(`cannot read the value after //=> (${why}) at "${text.slice(i, i + 30)}" in "${text}"`);
  };
  const value = (): Expected => {
    space();
    const rest = text.slice(i);
    const typed = /^(Float64Array|Int32Array|Uint8Array)\s*\[/.exec(rest);
    if (typed) {
      i += (typed[1] as string).length;
      space();
      const list = value();
      if (list.kind !== 'array') return fail('expected a list after the array type');
      return { kind: 'array', items: list.items, typed: typed[1] };
    }
    const c = text[i];
    if (c === '[') {
      i++;
      const items: Expected[] = [];
      space();
      if (text[i] === ']') {
        i++;
        return { kind: 'array', items };
      }
      for (;;) {
        items.push(value());
        space();
        if (text[i] === ',') i++;
        else if (text[i] === ']') {
          i++;
          return { kind: 'array', items };
        } else fail('expected , or ]');
      }
    }
    if (c === '{') {
      i++;
      const entries: [string, Expected][] = [];
      space();
      if (text[i] === '}') {
        i++;
        return { kind: 'object', entries };
      }
      for (;;) {
        space();
        const key = /^(?:"([^"]*)"|'([^']*)'|([A-Za-z_$][\w$]*))\s*:/.exec(text.slice(i)) ?? fail('expected a key');
        i += key[0].length;
        entries.push([(key[1] ?? key[2] ?? key[3]) as string, value()]);
        space();
        if (text[i] === ',') i++;
        else if (text[i] === '}') {
          i++;
          return { kind: 'object', entries };
        } else fail('expected , or }');
      }
    }
    const str = /^(?:"([^"]*)"|'([^']*)')/.exec(rest);
    if (str) {
      i += (str[0] as string).length;
      return { kind: 'exact', value: str[1] ?? str[2] ?? '' };
    }
    const word = /^(true|false|undefined|null)\b/.exec(rest);
    if (word) {
      i += (word[1] as string).length;
      const map = { true: true, false: false, undefined, null: null } as const;
      return { kind: 'exact', value: map[word[1] as keyof typeof map] };
    }
    const special = /^(-?Infinity|NaN)\b/.exec(rest);
    if (special) {
      i += (special[1] as string).length;
      return { kind: 'number', text: special[1] as string, value: Number(special[1]), unit: 0, cut: false };
    }
    // A decimal number; `…` after its digits (before or after an exponent) marks them as cut.
    const num = /^-?(\d+)(?:\.(\d+))?(…)?(?:e([+-]?\d+))?(…)?/.exec(rest);
    if (num) {
      i += num[0].length;
      const decimals = (num[2] ?? '').length;
      const exponent = Number(num[4] ?? 0);
      const value = Number(num[0].replace(/…/g, ''));
      const cut = num[3] !== undefined || num[5] !== undefined;
      // A whole number written without a point, exponent or `…` is exact (a count, or an exact zero).
      const whole = num[2] === undefined && num[4] === undefined && !cut;
      return { kind: 'number', text: num[0], value, unit: whole ? 0 : 10 ** (exponent - decimals), cut };
    }
    return fail('not a value');
  };
  const result = value();
  space();
  if (i < text.length) {
    // A note: one balanced parenthesis, and nothing after it.
    if (text[i] !== '(') fail('only a note in parentheses may follow the value');
    let depth = 0;
    do {
      if (text[i] === '(') depth++;
      else if (text[i] === ')') depth--;
      i++;
    } while (depth > 0 && i < text.length);
    space();
    if (depth !== 0 || i < text.length) fail('a note is one pair of parentheses with nothing after it');
  }
  return result;
}

/** Why `actual` does not match `expected`, or undefined when it does. */
function mismatch(actual: unknown, expected: Expected, where = 'value'): string | undefined {
  switch (expected.kind) {
    case 'number': {
      if (typeof actual !== 'number') return `${where}: ${String(actual)} is not a number (expected ${expected.text})`;
      if (Number.isNaN(expected.value)) return Number.isNaN(actual) ? undefined : `${where}: ${actual} is not NaN`;
      if (!Number.isFinite(expected.value)) {
        return actual === expected.value ? undefined : `${where}: ${actual} is not ${expected.text}`;
      }
      // Rounded digits: within half a unit of the last digit shown; cut digits (…): within one unit. The
      // slack of four ulps absorbs the decimal-to-binary rounding of the two numbers.
      const allowed = (expected.cut ? 1 : 0.5) * expected.unit + 4 * Number.EPSILON * Math.abs(expected.value);
      const off = Math.abs(actual - expected.value);
      if (off <= allowed) return undefined;
      return `${where}: ${actual} does not match ${expected.text} (off by ${off.toExponential(2)})`;
    }
    case 'exact':
      if (Object.is(actual, expected.value)) return undefined;
      return `${where}: ${JSON.stringify(actual)} is not ${JSON.stringify(expected.value)}`;
    case 'array': {
      if (expected.typed !== undefined) {
        const ctor = (globalThis as unknown as Record<string, unknown>)[expected.typed] as new () => unknown;
        if (!(actual instanceof ctor)) return `${where}: not a ${expected.typed}`;
      } else if (!Array.isArray(actual)) return `${where}: ${String(actual)} is not an array`;
      const list = Array.from(actual as ArrayLike<unknown>);
      if (list.length !== expected.items.length) {
        return `${where}: ${list.length} items, expected ${expected.items.length}`;
      }
      for (let k = 0; k < list.length; k++) {
        const m = mismatch(list[k], expected.items[k] as Expected, `${where}[${k}]`);
        if (m !== undefined) return m;
      }
      return undefined;
    }
    case 'object': {
      if (typeof actual !== 'object' || actual === null) return `${where}: ${String(actual)} is not an object`;
      const keys = Object.keys(actual).sort();
      const want = expected.entries.map(([k]) => k).sort();
      if (keys.join() !== want.join()) return `${where}: keys ${keys.join(', ')}, expected ${want.join(', ')}`;
      for (const [k, v] of expected.entries) {
        const m = mismatch((actual as Record<string, unknown>)[k], v, `${where}.${k}`);
        if (m !== undefined) return m;
      }
      return undefined;
    }
  }
}

// ----- finding and compiling the examples ----------------------------------------------------------

function sourceFiles(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) return sourceFiles(full);
    return entry.name.endsWith('.ts') ? [full] : [];
  });
}

/** The expression that ends `code` and the statements before it (parsed as TypeScript). */
function splitLastExpression(code: string, where: string): { statements: string; expression: string } {
  const source = ts.createSourceFile('example.ts', code, ts.ScriptTarget.ES2020, true);
  const last = source.statements[source.statements.length - 1];
  if (last === undefined || !ts.isExpressionStatement(last)) {
    throw new Error(`${where}: the code before //=> does not end in an expression`);
  }
  return { statements: code.slice(0, last.getStart(source)), expression: last.expression.getText(source) };
}

/** The examples of one file, from its JSDoc comments. */
function examplesOf(file: string): Example[] {
  const text = fs.readFileSync(file, 'utf8');
  const relative = path.relative(path.join(STATS, '../..'), file).split(path.sep).join('/');
  const examples: Example[] = [];
  for (const comment of text.matchAll(/\/\*\*[\s\S]*?\*\//g)) {
    const startLine = text.slice(0, comment.index).split('\n').length;
    const lines = (comment[0] as string).split('\n').map((l, k) => ({
      line: startLine + k,
      text: l
        .replace(/^\s*\/\*\*\s?/, '')
        .replace(/\s*\*\/$/, '')
        .replace(/^\s*\*\s?/, ''),
    }));
    // An example runs from its @example to the next tag or the end of the comment.
    let current: { line: number; text: string }[] | undefined;
    const blocks: { line: number; text: string }[][] = [];
    for (const l of lines) {
      const at = l.text.indexOf('@example');
      if (at >= 0) {
        current = [{ line: l.line, text: l.text.slice(at + '@example'.length) }];
        blocks.push(current);
      } else if (/^@\w/.test(l.text.trim())) current = undefined;
      else if (current !== undefined) current.push(l);
    }
    for (const block of blocks) {
      let pending = '';
      let program = '';
      const checks: Check[] = [];
      try {
        for (const l of block) {
          if (/^\s*import\s/.test(l.text)) continue;
          const mark = l.text.indexOf('//=>');
          if (mark < 0) {
            pending += `${l.text}\n`;
            continue;
          }
          const code = pending + l.text.slice(0, mark);
          const { statements, expression } = splitLastExpression(code, `${relative}:${l.line}`);
          program += `${statements}\n__check(${checks.length}, (${expression}));\n`;
          checks.push({ line: l.line, expected: parseExpected(l.text.slice(mark + 4).trim()) });
          pending = '';
        }
        if (pending.trim() !== '') program += pending;
        examples.push({ file: relative, line: block[0]?.line ?? 0, program, checks });
      } catch (error) {
        const message = `${relative}:${block[0]?.line}: ${(error as Error).message}`;
        examples.push({ file: relative, line: block[0]?.line ?? 0, program: '', checks, error: message });
      }
    }
  }
  return examples;
}

/** Every named export of every file under functions/stats; a name two files export differently is left
 * out of the common scope (each file's own examples still see its own). */
interface Scopes {
  /** Every exported name with one meaning across the core. */
  readonly common: Map<string, unknown>;
  /** Each file's own exports, by its path from the repository root. */
  readonly own: Map<string, Record<string, unknown>>;
}

function loadScopes(files: readonly string[]): Scopes {
  const own = new Map<string, Record<string, unknown>>();
  const common = new Map<string, unknown>();
  const clashes = new Set<string>();
  for (const file of files) {
    // eslint-disable-next-line @typescript-eslint/no-require-imports
    const exports = require(file) as Record<string, unknown>;
    const relative = path.relative(path.join(STATS, '../..'), file).split(path.sep).join('/');
    own.set(relative, exports);
    for (const [name, value] of Object.entries(exports)) {
      if (common.has(name) && common.get(name) !== value) clashes.add(name);
      else common.set(name, value);
    }
  }
  for (const name of clashes) common.delete(name);
  return { common, own };
}

function run(example: Example, scopes: Scopes): string[] {
  const scope = new Map(scopes.common);
  for (const [name, value] of Object.entries(scopes.own.get(example.file) ?? {})) scope.set(name, value);
  const js = ts.transpileModule(example.program, {
    compilerOptions: { target: ts.ScriptTarget.ES2020, module: ts.ModuleKind.None },
  }).outputText;
  const problems: string[] = [];
  const seen = new Set<number>();
  const check = (index: number, actual: unknown): void => {
    seen.add(index);
    const c = example.checks[index] as Check;
    const m = mismatch(actual, c.expected);
    if (m !== undefined) problems.push(`${example.file}:${c.line}: ${m}`);
  };
  const names = [...scope.keys()];
  const body = new Function(...names, '__check', js) as (...args: unknown[]) => void;
  body(...names.map((n) => scope.get(n)), check);
  example.checks.forEach((c, k) => {
    if (!seen.has(k)) problems.push(`${example.file}:${c.line}: this //=> was never reached`);
  });
  return problems;
}

// ----- the tests -----------------------------------------------------------------------------------

const FILES = sourceFiles(STATS).sort();
const EXAMPLES = FILES.flatMap(examplesOf);

describe('the checker of example values', () => {
  const GAUSS_2 = Float64Array.of(-0.5773502691896257, 0.5773502691896257);
  // The checker itself must be able to fail: these are the cases it must refuse and accept.
  test.each([
    ['0.685470581054688 (R pbeta)', 0.6854705810546882, true],
    ['0.685470581054688', 0.6854705810547, false],
    ['0.3145294189453…', 0.31452941894531, true],
    ['0.3145294189453…', 0.3145294189455, false],
    ['-0.2876820724517809 (log 0.75)', Math.log(0.75), true],
    ['[0.19349845201238…, 0.80650154798761…]', [0.193498452012384, 0.806501547987616], true],
    ['[0.19349845201238…, 0.80650154798761…]', [0.193498452012384], false],
    ['{ lower: 0, upper: 0.2384… }', { lower: 0, upper: 0.23840419 }, true],
    ['{ lower: 0, upper: 0.2384… }', { lower: 0, upper: 0.2384, median: 0 }, false],
    ['Float64Array [-0.5773502691896257, 0.5773502691896257]', GAUSS_2, true],
    ['Float64Array [-0.5773502691896257, 0.5773502691896257]', Array.from(GAUSS_2), false],
    ['undefined (no whole-number shape)', undefined, true],
    ['undefined', 0, false],
    ['1e-30', 1.0000000000000001e-30, true],
    ['1.355…e-9', 1.3559e-9, true],
    ['1.355…e-9', 1.357e-9, false],
    ['68', 68, true],
    ['68', 68.4, false],
    ['68.0', 68.04, true],
    ['0', 1e-17, false],
    ['-Infinity', -Infinity, true],
    ['true (built once)', true, true],
  ] as const)('%s against %p: %p', (text, actual, ok) => {
    expect(mismatch(actual, parseExpected(text)) === undefined).toBe(ok);
  });

  test.each(['0.5 and more', '≈ 1', 'log 0.75', '[1, 2', '0 (underflows), logistic(0) //=> 0.5', '1 (open'])(
    '"%s" is not a value',
    (text) => {
      expect(() => parseExpected(text)).toThrow(/^cannot read the value after \/\/=>/);
    },
  );
});

describe('the @example lines of functions/stats run and state their results', () => {
  const scopes = loadScopes(FILES);

  test('there are examples in every part of the core', () => {
    expect(EXAMPLES.length).toBeGreaterThanOrEqual(120);
    for (const part of ['quadrature/', 'compare/', 'special/', 'conversion.ts', 'normalMeans.ts', 'eventRates.ts']) {
      expect(EXAMPLES.some((e) => e.file.includes(part))).toBe(true);
    }
  });

  test.each(EXAMPLES.map((e) => [`${e.file}:${e.line}`, e] as const))('%s', (_where, example) => {
    expect(example.error).toBeUndefined();
    expect(example.checks.length).toBeGreaterThan(0);
    expect(run(example, scopes)).toEqual([]);
  });
});
