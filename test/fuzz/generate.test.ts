/**
 * The fuzzer's inputs (fuzz/generate.js, fuzz/random.js): the same seed gives the same calls, and a few
 * thousand calls hold every kind of input issue #10 asks for — ordinary experiments in rows and columns,
 * edges of each declared domain and just outside it, blanks in pairs and alone, text, logicals, error
 * values, linked-data cells, huge and tiny numbers, priors from 1e-12 to 1e12, 2-D ranges, 51 variants.
 * Reads dist/functions.json (run `npm run build` first).
 */
import * as fs from 'fs';
import * as path from 'path';
import * as os from 'os';
import * as catalogue from '../../functions/catalogue';
import { entry, optional, priorPart, range } from '../../functions/sheet/entry';
import * as rules from '../../functions/sheet/rules';
import { COMPARISON } from '../../functions/sheet/variants';
import { MAX_LEVEL, MIN_PRIOR } from '../../functions/stats/limits';

interface Model {
  id: string;
  params: { name: string; role: string; optional: boolean }[];
}
interface Call {
  index: number;
  fn: string;
  args: unknown[];
  mode: string;
  fault?: string;
}
/* eslint-disable @typescript-eslint/no-require-imports */
const { loadModels } = require('../../fuzz/models.js') as {
  loadModels(options: { metadataPath: string; catalogue: unknown }): Model[];
};
const { generateCall, nextUp, nextDown } = require('../../fuzz/generate.js') as {
  generateCall(models: Model[], seed: number | string, index: number): Call;
  nextUp(x: number): number;
  nextDown(x: number): number;
};
const { judge } = require('../../fuzz/spec.js') as {
  judge(model: Model, args: unknown[]): { violations: { param: string; why: string }[]; countProblem: boolean };
};
const { checkResult } = require('../../fuzz/checks.js') as {
  checkResult(
    model: Model,
    args: unknown[],
    result: Record<string, unknown>,
    limits: { memoryMb: number },
  ): { kind: string }[];
};
/* eslint-enable @typescript-eslint/no-require-imports */

const METADATA = path.join(__dirname, '..', '..', 'dist', 'functions.json');
if (!fs.existsSync(METADATA)) throw new Error('dist/functions.json is missing: run `npm run build` before `npm test`');
const models = loadModels({ metadataPath: METADATA, catalogue });
/** A text form that keeps -0, undefined and NaN apart from 0, null and each other. */
const serialise = (x: unknown): string =>
  JSON.stringify(x, (_key, v: unknown) =>
    Object.is(v, -0)
      ? '-0'
      : v === undefined
        ? '(undefined)'
        : typeof v === 'number' && !Number.isFinite(v)
          ? String(v)
          : v,
  );
const calls = (seed: number | string, n: number): Call[] =>
  Array.from({ length: n }, (_, i) => generateCall(models, seed, i));

describe('fuzzer inputs', () => {
  it('are the same for the same seed and differ for another', () => {
    const a = serialise(calls(11, 400));
    expect(serialise(calls(11, 400))).toBe(a);
    expect(serialise(calls('11', 400))).toBe(a);
    expect(serialise(calls(12, 400))).not.toBe(a);
    // call i does not depend on the calls before it
    expect(serialise(generateCall(models, 11, 399))).toBe(serialise(calls(11, 400)[399]));
  });

  it('spread over every registered function', () => {
    const seen = new Set(calls(3, 2 * models.length).map((c) => c.fn));
    expect([...seen].sort()).toEqual(models.map((m) => m.id).sort());
  });

  it('find the doubles next to a bound', () => {
    expect(nextUp(0)).toBe(5e-324);
    expect(nextDown(1)).toBe(1 - 2 ** -53);
    expect(nextUp(1)).toBe(1 + 2 ** -52);
    expect(nextDown(0)).toBe(-5e-324);
  });

  it('hold every kind of input the fuzzer promises', () => {
    const list = calls(7, 6000);
    const cells = (c: Call): unknown[] => c.args.flatMap((a) => (Array.isArray(a) ? (a as unknown[][]).flat() : [a]));
    const has = (what: string, test: (c: Call) => boolean) => [what, list.some(test)];
    const model = (c: Call) => models.find((m) => m.id === c.fn) as Model;
    const argOf = (c: Call, name: string) => c.args[model(c).params.findIndex((p) => p.name === name)];
    const ranges = (c: Call) =>
      model(c)
        .params.map((p, i) => (p.role === 'range' ? c.args[i] : undefined))
        .filter(Array.isArray) as unknown[][][];
    const results = [
      has('a column', (c) => ranges(c).some((r) => r.length > 1 && r[0]?.length === 1)),
      has('a row', (c) => ranges(c).some((r) => r.length === 1 && (r[0]?.length ?? 0) > 1)),
      has('a 2-D range', (c) => ranges(c).some((r) => r.length > 1 && (r[0]?.length ?? 0) > 1)),
      has(
        'a position blank in every range',
        (c) =>
          ranges(c).length > 1 &&
          (ranges(c)[0] as unknown[][])
            .flat()
            .some(
              (x, p) => ranges(c).every((r) => [null, '', '   '].includes(r.flat()[p] as string)) && x !== undefined,
            ),
      ),
      has('a blank in one range only', (c) =>
        judge(model(c), c.args).violations.some((v) => v.why.startsWith('blank alone')),
      ),
      has('text in a range', (c) =>
        ranges(c).some((r) => r.flat().some((x) => typeof x === 'string' && x.trim() !== '')),
      ),
      has('a logical', (c) => cells(c).some((x) => typeof x === 'boolean')),
      has('an error value', (c) => cells(c).some((x) => typeof x === 'object' && x !== null && '$error' in x)),
      has('a linked-data cell', (c) => cells(c).some((x) => typeof x === 'object' && x !== null && '$entity' in x)),
      has('1e300 or more', (c) => cells(c).some((x) => typeof x === 'number' && x >= 1e300)),
      has('5e-324', (c) => cells(c).some((x) => x === 5e-324)),
      has('-0', (c) => cells(c).some((x) => Object.is(x, -0))),
      has('a prior of 1e-12', (c) => argOf(c, 'prior_alpha') === 1e-12 || argOf(c, 'prior_beta') === 1e-12),
      has('a prior of 1e12', (c) => argOf(c, 'prior_alpha') === 1e12 || argOf(c, 'prior_beta') === 1e12),
      has('a level at its largest allowed value', (c) => argOf(c, 'level') === MAX_LEVEL),
      has('a prior at its smallest allowed value', (c) => argOf(c, 'prior_alpha') === MIN_PRIOR),
      has('50 variants', (c) => ranges(c).some((r) => r.flat().length === 50)),
      has('51 variants', (c) => judge(model(c), c.args).countProblem && ranges(c).some((r) => r.flat().length > 50)),
      has('a value just outside its bounds', (c) =>
        judge(model(c), c.args).violations.some((v) => /^(not above|not below|below min|above max)/.test(v.why)),
      ),
      has('a count that is not whole', (c) =>
        judge(model(c), c.args).violations.some((v) => v.why.startsWith('count not whole')),
      ),
      has('conversions above visitors', (c) =>
        judge(model(c), c.args).violations.some((v) => v.why.startsWith('more than visitors')),
      ),
      has('half a prior', (c) =>
        judge(model(c), c.args).violations.some(
          (v) => v.why === 'given without prior_beta' || v.why === 'given without prior_alpha',
        ),
      ),
      has('an omitted argument passed as null', (c) => c.args.includes(null)),
      has(
        'a visitor count of 1e9 or more',
        (c) =>
          (argOf(c, 'visitors') as unknown[][] | undefined)?.flat?.().some((x) => typeof x === 'number' && x >= 1e9) ??
          false,
      ),
    ];
    expect(results.filter(([, found]) => !found).map(([what]) => what)).toEqual([]);
    const modes = new Set(list.map((c) => c.mode));
    expect([...modes].sort()).toEqual(['extreme', 'fault', 'ordinary']);
  });

  it('cover a function the fuzzer has never heard of, from its catalogue entry alone', () => {
    // an invented function: two conversion ranges, a level and a Gamma prior; an interval per challenger
    const invented = entry({
      id: 'INVENTED_SPREAD',
      family: 'conversion',
      params: [
        range(rules.CONVERSIONS),
        range(rules.VISITORS),
        optional(rules.LEVEL),
        priorPart(rules.PRIOR_SHAPE, 'gamma'),
        priorPart(rules.PRIOR_RATE, 'gamma'),
      ],
      variants: COMPARISON,
      spill: { kind: 'perVariant', width: 2, versusControl: true },
    });
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'lift-ledger-fuzz-model-'));
    try {
      const metadata = path.join(dir, 'functions.json');
      const parameters = invented.params.map((p) => ({ name: p.name, type: 'any', optional: p.optional }));
      fs.writeFileSync(metadata, JSON.stringify({ functions: [{ id: 'INVENTED_SPREAD', parameters }] }));
      const catalogueWithIt = { findFunction: (id: string) => (id === 'INVENTED_SPREAD' ? invented : undefined) };
      const [model] = loadModels({ metadataPath: metadata, catalogue: catalogueWithIt });
      expect(model?.params.map((p) => `${p.name}:${p.role}`)).toEqual([
        'conversions:range',
        'visitors:range',
        'level:scalar',
        'prior_shape:scalar',
        'prior_rate:scalar',
      ]);
      const list = Array.from({ length: 400 }, (_, i) => generateCall([model as Model], 5, i));
      const judged = list.map((c) => judge(model as Model, c.args));
      expect(judged.filter((j) => j.violations.length === 0 && !j.countProblem).length).toBeGreaterThan(150);
      expect(judged.filter((j) => j.violations.some((v) => v.param === 'level')).length).toBeGreaterThan(5);
      // its result gets the checks its spill implies: the control's slot blank, lower ≤ upper
      const args = [
        [[10], [12]],
        [[100], [100]],
      ];
      const value = (v: unknown) => ({ outcome: 'value', value: v, heapGrowthMb: 0 });
      expect(
        checkResult(
          model as Model,
          args,
          value([
            ['', ''],
            [0.1, 0.3],
          ]),
          { memoryMb: 50 },
        ),
      ).toEqual([]);
      expect(
        checkResult(
          model as Model,
          args,
          value([
            ['', ''],
            [0.3, 0.1],
          ]),
          { memoryMb: 50 },
        ).map((f) => f.kind),
      ).toEqual(['order']);
      expect(
        checkResult(
          model as Model,
          args,
          value([
            [0, 0],
            [0.1, 0.3],
          ]),
          { memoryMb: 50 },
        ).map((f) => f.kind),
      ).toEqual(['blank']);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
