/**
 * What the fuzzer knows about each registered function: its id (dist/functions.json, the metadata Excel
 * reads) and, from the function catalogue (functions/catalogue.ts), its parameters with their declared
 * rules (functions/sheet/rules.ts), its variant count and its spill shape; from parameters.js, the
 * realistic data generator and the meaning of its values.
 *
 * Model: { id, params: [{ name, role, rule, optional, pair?, prior?, family?, text?, count?, increasing?,
 * perColumn? }], variants, output } with role 'range' | 'aligned' | 'scalar' | 'choice' | 'list' (a row or
 * column of its own: `count` values, `increasing` or not, `perColumn`: one per column of the day tables) |
 * 'days' (a day table: one row per day, one column per variant, read with the other day tables), and output { shape, width?, per?, values?, … } as
 * checks.js reads it.
 */
'use strict';
const fs = require('fs');
const path = require('path');
const { DATA_FAMILIES, VALUES, BOTH_OR_NEITHER, PER_COLUMN_LISTS } = require('./parameters');

const REPO_ROOT = path.resolve(__dirname, '..');

/** The function catalogue, its TypeScript source transpiled in memory (as the bench and help builders do). */
function loadCatalogue() {
  require('../scripts/tsRequire');
  return require(path.join(REPO_ROOT, 'functions', 'catalogue.ts'));
}

/** The result's shape and value checks from a catalogue spill shape. */
function outputOf(id, spill) {
  const values = VALUES[id] ?? {};
  switch (spill.kind) {
    case 'one':
      return { shape: 'scalar', ...values, values: spill.of === 'text' ? 'text' : values.values };
    case 'perVariant': {
      const interval = spill.width === 2 ? 'interval' : spill.width === 3 ? 'median' : undefined;
      const shape =
        spill.width === 1
          ? spill.versusControl
            ? 'versusControl'
            : 'perVariant'
          : spill.versusControl
            ? 'blockVersusControl'
            : 'block';
      return { shape, width: spill.width, ...values, values: interval ?? values.values };
    }
    case 'fixed':
      return spill.rows === 1 ? { shape: 'row', width: spill.columns, ...values } : { shape: 'unknown' };
    case 'densityTable':
      return { shape: 'density', per: spill.series, ...values };
    case 'byDay':
      return { shape: 'byDay', per: spill.per, ...values };
    default:
      return { shape: 'unknown' };
  }
}

/** The data generator for an entry's ranges. */
function familyOf(entry) {
  const names = entry.params.filter((p) => p.kind === 'range').map((p) => p.name);
  const known = DATA_FAMILIES.find((f) => f.ranges.length === names.length && f.ranges.every((n, i) => n === names[i]));
  if (!known) return 'generic';
  return entry.variants && entry.variants.noun && known.pastResults ? known.pastResults : known.family;
}

/** The variant count of an entry: its own, or its day tables' (one column per variant). */
function variantsOf(entry) {
  const days = entry.params.find((p) => p.kind === 'days');
  const count = entry.variants ?? (days && days.variants);
  return count ? { min: count.min, max: count.max } : { min: 1, max: 50 };
}

/** One catalogue parameter as the fuzzer's model of it. */
function paramOf(p, entry, family) {
  const base = { name: p.name, optional: Boolean(p.optional), rule: p.rule ?? { name: p.name } };
  switch (p.kind) {
    case 'range':
      return { ...base, role: 'range', family };
    case 'aligned':
      return { ...base, role: 'aligned', text: p.rule === undefined };
    case 'choice':
      return { ...base, role: 'choice' };
    case 'list': {
      const perColumn = PER_COLUMN_LISTS.includes(p.name) && entry.params.some((q) => q.kind === 'days');
      return { ...base, role: 'list', count: p.count, increasing: Boolean(p.increasing), perColumn };
    }
    case 'days':
      return { ...base, role: 'days' };
    case 'prior': {
      const mate = entry.params.find((q) => q.kind === 'prior' && q.prior === p.prior && q.name !== p.name);
      const paired = mate && BOTH_OR_NEITHER.includes(p.prior);
      return { ...base, role: 'scalar', prior: p.prior, ...(paired ? { pair: mate.name } : {}) };
    }
    default:
      return { ...base, role: 'scalar' };
  }
}

/** A function the catalogue does not describe: generated from its declared metadata types alone. */
function fromMetadata(fn) {
  const params = fn.parameters.map((meta) => {
    const base = { name: meta.name, optional: Boolean(meta.optional) };
    if (meta.dimensionality === 'matrix')
      return { ...base, role: 'range', family: 'generic', rule: { name: meta.name, kind: 'real' } };
    if (meta.type === 'string') return { ...base, role: 'choice', rule: { name: meta.name, choices: [], default: '' } };
    return { ...base, role: 'scalar', rule: { name: meta.name, kind: 'real' } };
  });
  return { params, variants: { min: 1, max: 50 }, output: { shape: 'unknown' }, catalogued: false };
}

/**
 * Builds the models of every function in a functions.json.
 * @param {{ metadataPath: string, catalogue?: { findFunction(id: string): object | undefined } }} options
 * @returns {object[]} one model per function
 */
function loadModels({ metadataPath, catalogue = loadCatalogue() }) {
  const metadata = JSON.parse(fs.readFileSync(metadataPath, 'utf8'));
  return metadata.functions.map((fn) => {
    const id = String(fn.id).toUpperCase();
    const entry = catalogue.findFunction(id);
    if (!entry) return { id, ...fromMetadata(fn) };
    const family = familyOf(entry);
    return {
      id,
      params: entry.params.map((p) => paramOf(p, entry, family)),
      variants: variantsOf(entry),
      output: outputOf(id, entry.spill),
      catalogued: true,
    };
  });
}

module.exports = { loadModels, loadCatalogue, outputOf, REPO_ROOT };
