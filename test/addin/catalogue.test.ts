/**
 * The function catalogue (functions/catalogue.ts) against itself, its contract in words (docs/catalogue.md),
 * the wrapper files and their JSDoc: everything else is derived from the catalogue, so these checks keep the
 * one source consistent. The contract and the release record below are the outside references here.
 */
import * as fs from 'fs';
import * as path from 'path';
import { CATALOGUE, CATALOGUE_LIST, FAMILIES, findFunction, signatureText } from '../../functions/catalogue';
import * as F from '../../functions/functions';
import { requiredCount, type FunctionEntry, type Param } from '../../functions/sheet/entry';
import { PRIOR_ALPHA, PRIOR_BETA, PRIOR_RATE, PRIOR_SHAPE } from '../../functions/sheet/rules';
import { SHIPPED_0_1_0 } from '../helpers/shipped';

interface FunctionDoc {
  id: string;
  jsName: string;
  file: string;
  params: { name: string; optional: boolean; text: string }[];
}
/* eslint-disable-next-line @typescript-eslint/no-require-imports */
const help = require('../../help/build') as { wrapperFiles(): string[]; readFunctionDocs(): FunctionDoc[] };

const ROOT = path.join(__dirname, '..', '..');
const docs = help.readFunctionDocs();

/** The function rows of docs/catalogue.md: `| \`NAME\` | arguments | returns |`. */
function contractRows(): Map<string, string> {
  const text = fs.readFileSync(path.join(ROOT, 'docs', 'catalogue.md'), 'utf8');
  const rows = new Map<string, string>();
  for (const m of text.matchAll(/^\| `([A-Z_]+)` \| ([^|]*) \|/gm)) rows.set(m[1] as string, (m[2] as string).trim());
  return rows;
}

const argumentList = (fn: FunctionEntry): string => signatureText(fn).replace(/^[A-Z_]+\(|\)$/g, '');

describe('the catalogue itself', () => {
  test('ids are unique, upper case, and the keys of CATALOGUE', () => {
    const ids = CATALOGUE_LIST.map((f) => f.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const id of ids) expect(id).toMatch(/^[A-Z][A-Z0-9_]*$/);
    expect(Object.keys(CATALOGUE)).toEqual(ids);
    expect(findFunction('prob_highest')).toBe(CATALOGUE.PROB_HIGHEST);
    expect(findFunction('NOT_A_FUNCTION')).toBeUndefined();
  });

  test('no shipped id has disappeared', () => {
    const ids = new Set(CATALOGUE_LIST.map((f) => f.id));
    expect(SHIPPED_0_1_0.filter((id) => !ids.has(id))).toEqual([]);
  });

  test.each(CATALOGUE_LIST.map((f) => [f.id, f] as const))('%s: a well-formed entry', (_id, fn) => {
    const names = fn.params.map((p) => p.name);
    expect(new Set(names).size).toBe(names.length);
    // required parameters first
    const required = requiredCount(fn);
    expect(fn.params.slice(0, required).every((p) => !p.optional)).toBe(true);
    expect(fn.params.slice(required).every((p) => p.optional)).toBe(true);
    // ranges come first and declare how many variants; a spill per variant needs them
    const ranges = fn.params.filter((p) => p.kind === 'range');
    expect(fn.params.slice(0, ranges.length)).toEqual(ranges);
    expect(fn.variants !== undefined).toBe(ranges.length > 0);
    if (fn.spill.kind === 'perVariant' || fn.spill.kind === 'densityTable') expect(ranges.length).toBeGreaterThan(0);
    if (fn.params.some((p) => p.kind === 'aligned')) expect(ranges.length).toBeGreaterThan(0);
    // a prior is a pair of adjacent parameters with the prior rules
    const priors = fn.params.filter((p): p is Extract<Param, { kind: 'prior' }> => p.kind === 'prior');
    if (priors.length > 0) {
      const first = names.indexOf(priors[0]?.name as string);
      expect(names.slice(first, first + 2)).toEqual(priors.map((p) => p.name));
      const rules = priors[0]?.prior === 'beta' ? [PRIOR_ALPHA, PRIOR_BETA] : [PRIOR_SHAPE, PRIOR_RATE];
      expect(priors.map((p) => p.rule)).toEqual(rules);
    }
    // every parameter points at a rule of its own name (labels take any cells)
    for (const p of fn.params) if (p.rule !== undefined) expect(p.rule.name).toBe(p.name);
    expect(FAMILIES.map((f) => f.id)).toContain(fn.family);
  });
});

describe('docs/catalogue.md, the contract in words', () => {
  const rows = contractRows();

  test.each(CATALOGUE_LIST.map((f) => [f.id, f] as const))('%s: listed with the same arguments', (id, fn) => {
    expect({ id, args: rows.get(id) }).toEqual({ id, args: argumentList(fn) });
  });
});

describe('the wrappers', () => {
  test("functions/functions.ts exports one wrapper file per family, in the catalogue's family order", () => {
    const files = help.wrapperFiles().map((f) => path.relative(ROOT, f).split(path.sep).join('/'));
    expect(files).toEqual(FAMILIES.map((f) => `functions/wrappers/${f.id}.ts`));
    const onDisk = fs.readdirSync(path.join(ROOT, 'functions', 'wrappers')).filter((f) => f.endsWith('.ts'));
    expect(onDisk.sort()).toEqual(FAMILIES.map((f) => `${f.id}.ts`).sort());
  });

  test("one documented wrapper per entry, in its family's file, in catalogue order, with its parameters", () => {
    expect(docs.map((d) => d.id)).toEqual(CATALOGUE_LIST.map((f) => f.id));
    for (const fn of CATALOGUE_LIST) {
      const doc = docs.find((d) => d.id === fn.id) as FunctionDoc;
      expect({ id: fn.id, file: doc.file }).toEqual({ id: fn.id, file: `functions/wrappers/${fn.family}.ts` });
      expect({ id: fn.id, params: doc.params.map((p) => [p.name, p.optional]) }).toEqual({
        id: fn.id,
        params: fn.params.map((p) => [p.name, p.optional]),
      });
      expect(typeof (F as unknown as Record<string, unknown>)[doc.jsName]).toBe('function');
    }
  });

  test("the Excel help of each number argument states its rule's bounds and default", () => {
    const numbers = (text: string): number[] =>
      [...text.matchAll(/[-−]?\d+(?:\.\d+)?(?:E[+-]?\d+)?/gi)].map((m) => Number(m[0].replace('−', '-')));
    const problems: string[] = [];
    for (const fn of CATALOGUE_LIST) {
      const doc = docs.find((d) => d.id === fn.id) as FunctionDoc;
      for (const p of fn.params) {
        if (p.kind !== 'number' && p.kind !== 'prior') continue;
        const text = doc.params.find((q) => q.name === p.name)?.text ?? '';
        const shown = numbers(text);
        const bounds = [p.rule.min, p.rule.max, p.rule.above, p.rule.below].filter((b): b is number => b !== undefined);
        for (const b of bounds)
          if (!shown.includes(b)) problems.push(`${fn.id} ${p.name}: bound ${b} not in "${text}"`);
        const stated = /default (-?\d+(?:\.\d+)?)/.exec(text);
        if (p.rule.default !== undefined && Number(stated?.[1]) !== p.rule.default) {
          problems.push(`${fn.id} ${p.name}: default ${p.rule.default} not in "${text}"`);
        }
      }
    }
    expect(problems).toEqual([]);
  });
});
