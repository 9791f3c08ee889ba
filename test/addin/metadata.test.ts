/**
 * The metadata Excel reads (functions.json), generated build-free from functions/functions.ts by
 * custom-functions-metadata's own generator — the same one the webpack plugin runs.
 *
 * EXPECTED mirrors the function catalogue (docs/catalogue.md): names,
 * argument order and which arguments are optional. It is written out here on purpose so the test does
 * not depend on a file outside the clone; a change to the catalogue must be copied here by hand.
 */
import * as path from 'path';
import { generateCustomFunctionsMetadata } from 'custom-functions-metadata';

interface ExpectedFunction {
  readonly name: string;
  /** Parameter names in order; a trailing "?" marks an optional one. Ranges are listed in RANGES. */
  readonly params: readonly string[];
}

// Mirrors the catalogue's tables, in its order.
const EXPECTED: readonly ExpectedFunction[] = [
  { name: 'POSTERIOR_MEAN', params: ['conversions', 'visitors', 'prior_alpha?', 'prior_beta?'] },
  { name: 'RATE_INTERVAL', params: ['conversions', 'visitors', 'level?', 'prior_alpha?', 'prior_beta?', 'method?'] },
  { name: 'PROB_HIGHEST', params: ['conversions', 'visitors', 'prior_alpha?', 'prior_beta?'] },
  { name: 'PROB_ABOVE_CONTROL', params: ['conversions', 'visitors', 'prior_alpha?', 'prior_beta?'] },
  { name: 'LIFT_INTERVAL', params: ['conversions', 'visitors', 'level?', 'prior_alpha?', 'prior_beta?'] },
  { name: 'RATE_DIFF_INTERVAL', params: ['conversions', 'visitors', 'level?', 'prior_alpha?', 'prior_beta?'] },
  { name: 'PROB_LIFT_ABOVE', params: ['conversions', 'visitors', 'min_lift', 'prior_alpha?', 'prior_beta?'] },
  { name: 'EXPECTED_LOSS', params: ['conversions', 'visitors', 'prior_alpha?', 'prior_beta?'] },
  { name: 'DECISION', params: ['conversions', 'visitors', 'max_loss?', 'labels?', 'prior_alpha?', 'prior_beta?'] },
  { name: 'POSTERIOR_DENSITY', params: ['conversions', 'visitors', 'points?', 'prior_alpha?', 'prior_beta?'] },
  { name: 'LIFT_DENSITY', params: ['conversions', 'visitors', 'points?', 'prior_alpha?', 'prior_beta?'] },
  { name: 'PRIOR_FROM_MEAN', params: ['mean_rate', 'strength'] },
  { name: 'PRIOR_FROM_INTERVAL', params: ['low', 'high', 'level?'] },
  { name: 'PRIOR_FROM_HISTORY', params: ['conversions', 'visitors', 'method?'] },
  { name: 'DECISION_POWER', params: ['baseline_rate', 'lift', 'visitors_per_variant', 'threshold?', 'prior_alpha?', 'prior_beta?'] },
  { name: 'VISITORS_NEEDED', params: ['baseline_rate', 'lift', 'threshold?', 'power?', 'prior_alpha?', 'prior_beta?'] },
  { name: 'CLASSIC_SAMPLE_SIZE', params: ['baseline_rate', 'lift', 'alpha?', 'power?', 'sides?'] },
  { name: 'SRM_PVALUE', params: ['visitors', 'planned_shares?'] },
  { name: 'MEAN_INTERVAL', params: ['count', 'mean', 'sd', 'level?'] },
  { name: 'MEAN_PROB_HIGHEST', params: ['count', 'mean', 'sd'] },
  { name: 'MEAN_PROB_ABOVE_CONTROL', params: ['count', 'mean', 'sd'] },
  { name: 'MEAN_DIFF_INTERVAL', params: ['count', 'mean', 'sd', 'level?'] },
  { name: 'MEAN_LIFT_INTERVAL', params: ['count', 'mean', 'sd', 'level?'] },
  { name: 'MEAN_EXPECTED_LOSS', params: ['count', 'mean', 'sd'] },
  { name: 'EVENTS_RATE_INTERVAL', params: ['events', 'exposure', 'level?', 'prior_shape?', 'prior_rate?'] },
  { name: 'EVENTS_PROB_HIGHEST', params: ['events', 'exposure', 'prior_shape?', 'prior_rate?'] },
  { name: 'EVENTS_PROB_ABOVE_CONTROL', params: ['events', 'exposure', 'prior_shape?', 'prior_rate?'] },
  { name: 'EVENTS_LIFT_INTERVAL', params: ['events', 'exposure', 'level?', 'prior_shape?', 'prior_rate?'] },
  { name: 'EVENTS_EXPECTED_LOSS', params: ['events', 'exposure', 'prior_shape?', 'prior_rate?'] },
];

/** Arguments that take a range (a row or column of cells); all others are single values. */
const RANGES = new Set(['conversions', 'visitors', 'labels', 'planned_shares', 'count', 'mean', 'sd', 'events', 'exposure']);

/** Functions that answer in one cell (a number or a text) instead of a spill. */
const SCALAR_RESULT = new Set(['DECISION', 'DECISION_POWER', 'VISITORS_NEEDED', 'CLASSIC_SAMPLE_SIZE', 'SRM_PVALUE']);

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
  const generated = await generateCustomFunctionsMetadata(path.join(__dirname, '..', '..', 'functions', 'functions.ts'), false);
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
  expect(new Set(functions.map((f) => f.id)).size).toBe(29);
});

describe.each(EXPECTED.map((f) => [f.name, f] as const))('%s', (name, expected) => {
  test('parameter names, order and optional flags', () => {
    const params = byName(name).parameters;
    expect(params.map((p) => (p.optional ? `${p.name}?` : p.name))).toEqual(expected.params);
  });

  test('ranges are matrices of any; single values are scalars', () => {
    for (const p of byName(name).parameters) {
      if (RANGES.has(p.name)) {
        expect({ name: p.name, dimensionality: p.dimensionality, type: p.type }).toEqual({ name: p.name, dimensionality: 'matrix', type: 'any' });
      } else {
        expect({ name: p.name, dimensionality: p.dimensionality ?? 'scalar' }).toEqual({ name: p.name, dimensionality: 'scalar' });
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
      if (p.optional) expect({ name: p.name, saysDefault: /default/.test(p.description ?? '') }).toEqual({ name: p.name, saysDefault: true });
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
