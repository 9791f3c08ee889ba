/**
 * The metadata Excel reads (functions.json) against the function catalogue (functions/catalogue.ts): ids,
 * parameter names, order and optional flags, which parameters take ranges, and which results spill. Checked
 * twice: on the metadata generated build-free from the wrapper files by custom-functions-metadata's own
 * generator (the one the webpack plugin runs), and on the built dist/functions.json.
 */
import * as fs from 'fs';
import * as path from 'path';
import { generateCustomFunctionsMetadata } from 'custom-functions-metadata';
import { CATALOGUE_LIST } from '../../functions/catalogue';
import { takesRange, type FunctionEntry } from '../../functions/sheet/entry';

/* eslint-disable-next-line @typescript-eslint/no-require-imports */
const help = require('../../help/build') as { wrapperFiles(): string[] };

interface ExpectedFunction {
  readonly name: string;
  /** Parameter names in order; a trailing "?" marks an optional one. Ranges are listed in RANGES. */
  readonly params: readonly string[];
}

// The catalogue's functions, in its order.
const EXPECTED: readonly ExpectedFunction[] = CATALOGUE_LIST.map((f) => ({
  name: f.id,
  params: f.params.map((p) => (p.optional ? `${p.name}?` : p.name)),
}));

/** Arguments that take a range (a row or column of cells); all others are single values. */
const RANGES = new Set(CATALOGUE_LIST.flatMap((f) => f.params.filter(takesRange).map((p) => p.name)));

/** Functions that answer in one cell (a number or a text) instead of a spill. */
const SCALAR_RESULT = new Set(CATALOGUE_LIST.filter((f) => f.spill.kind === 'one').map((f) => f.id));

interface MetadataParameter {
  name: string;
  description?: string;
  type: string;
  dimensionality?: string;
  optional?: boolean;
  repeating?: boolean;
}
interface MetadataFunction {
  id: string;
  name: string;
  description?: string;
  helpUrl?: string;
  parameters: MetadataParameter[];
  result?: { type?: string; dimensionality?: string };
  options?: Record<string, boolean>;
}

let functions: MetadataFunction[] = [];

beforeAll(async () => {
  const generated = await generateCustomFunctionsMetadata(help.wrapperFiles(), false);
  expect(generated.errors).toEqual([]);
  functions = (JSON.parse(generated.metadataJson) as { functions: MetadataFunction[] }).functions;
}, 60000);

function byName(name: string): MetadataFunction {
  const found = functions.find((f) => f.name === name);
  if (!found) throw new Error(`${name} is missing from the metadata`);
  return found;
}

test('exactly the catalogue names, ids equal to names, no duplicates', () => {
  expect(functions.map((f) => f.name).sort()).toEqual(EXPECTED.map((f) => f.name).sort());
  for (const f of functions) expect(f.id).toBe(f.name);
  expect(new Set(functions.map((f) => f.id)).size).toBe(CATALOGUE_LIST.length);
});

describe.each(EXPECTED.map((f) => [f.name, f] as const))('%s', (name, expected) => {
  test('parameter names, order and optional flags', () => {
    const params = byName(name).parameters;
    expect(params.map((p) => (p.optional ? `${p.name}?` : p.name))).toEqual(expected.params);
  });

  test('ranges are matrices of any; single values are scalars', () => {
    for (const p of byName(name).parameters) {
      if (RANGES.has(p.name)) {
        expect({ name: p.name, dimensionality: p.dimensionality, type: p.type }).toEqual({
          name: p.name,
          dimensionality: 'matrix',
          type: 'any',
        });
      } else {
        expect({ name: p.name, dimensionality: p.dimensionality ?? 'scalar' }).toEqual({
          name: p.name,
          dimensionality: 'scalar',
        });
        expect(['number', 'string']).toContain(p.type);
      }
      expect(p.repeating ?? false).toBe(false);
    }
  });

  test('result dimensionality: spills are matrices, single answers scalar', () => {
    const result = byName(name).result ?? {};
    expect(result.dimensionality ?? 'scalar').toBe(SCALAR_RESULT.has(name) ? 'scalar' : 'matrix');
  });

  test('descriptions are present and say something', () => {
    const f = byName(name);
    expect((f.description ?? '').length).toBeGreaterThan(40);
    // one line: Excel shows the description as a single tooltip in formula autocomplete
    expect(f.description).not.toMatch(/\n/);
    for (const p of f.parameters) {
      expect({ name: p.name, long: (p.description ?? '').length > 15 }).toEqual({ name: p.name, long: true });
      if (p.optional)
        expect({ name: p.name, saysDefault: /default/.test(p.description ?? '') }).toEqual({
          name: p.name,
          saysDefault: true,
        });
    }
  });

  test('not volatile, not streaming, and a help URL to its own page', () => {
    const f = byName(name);
    expect(f.options?.volatile ?? false).toBe(false);
    expect(f.options?.stream ?? false).toBe(false);
    expect(f.helpUrl).toBe(`https://localhost:3000/help/${name}.html`);
  });
});

test('no two functions share a description (JSDoc copied from a neighbour becomes wrong Excel help)', () => {
  const descriptions = functions.map((f) => f.description);
  expect(new Set(descriptions).size).toBe(descriptions.length);
});

test('metadata order is the catalogue order', () => {
  expect(functions.map((f) => f.id)).toEqual(CATALOGUE_LIST.map((f) => f.id));
});

test('result types: a single number is "number", a single text "string"', () => {
  for (const f of CATALOGUE_LIST) {
    if (f.spill.kind !== 'one') continue;
    expect({ id: f.id, type: byName(f.id).result?.type }).toEqual({
      id: f.id,
      type: f.spill.of === 'number' ? 'number' : 'string',
    });
  }
});

describe('the built dist/functions.json', () => {
  const file = path.join(__dirname, '..', '..', 'dist', 'functions.json');
  const built = (): MetadataFunction[] =>
    (JSON.parse(fs.readFileSync(file, 'utf8')) as { functions: MetadataFunction[] }).functions;
  const shape = (f: { id: string; parameters: MetadataParameter[] } | FunctionEntry): string[] =>
    'parameters' in f
      ? f.parameters.map((p) => `${p.name}${p.optional ? '?' : ''}${p.dimensionality === 'matrix' ? '[]' : ''}`)
      : f.params.map((p) => `${p.name}${p.optional ? '?' : ''}${takesRange(p) ? '[]' : ''}`);

  test('has exactly the catalogue ids, in its order, with its parameters', () => {
    const metadata = built();
    expect(metadata.map((f) => f.id)).toEqual(CATALOGUE_LIST.map((f) => f.id));
    for (const f of CATALOGUE_LIST) {
      const m = metadata.find((x) => x.id === f.id) as MetadataFunction;
      expect({ id: f.id, params: shape(m) }).toEqual({ id: f.id, params: shape(f) });
    }
  });

  test('equals the metadata generated from the sources (up to the help URLs of a deployment build)', () => {
    const strip = (list: MetadataFunction[]): unknown =>
      list.map(({ helpUrl, ...rest }) => ({ ...rest, help: helpUrl?.replace(/^.*\/help\//, '') }));
    expect(strip(built())).toEqual(strip(functions));
  });
});
