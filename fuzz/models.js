/**
 * What the fuzzer knows about each registered function: its id and parameters (from dist/functions.json,
 * the metadata Excel reads), each parameter's role and declared rule (functions/sheet/rules.ts, through
 * the table in parameters.js), its variant count and what its result looks like.
 */
'use strict';
const fs = require('fs');
const path = require('path');
const { PARAMETERS, FUNCTION_PARAMETERS, VARIANT_COUNTS, OUTPUTS } = require('./parameters');

const REPO_ROOT = path.resolve(__dirname, '..');

/** Loads a TypeScript source of the repository (transpiled in memory, as the bench does). */
function requireSource(relativePath) {
  require('../scripts/tsRequire');
  return require(path.join(REPO_ROOT, relativePath));
}

/** The declared rules and variant counts of the sheet layer. */
function loadDeclarations() {
  return {
    rules: requireSource('functions/sheet/rules.ts'),
    variantCounts: requireSource('functions/sheet/variants.ts'),
  };
}

function ruleNamed(rules, name, where) {
  const rule = rules[name];
  if (!rule || typeof rule !== 'object') {
    throw new Error(`${where}: functions/sheet/rules.ts exports no rule ${name} (update fuzz/parameters.js)`);
  }
  return rule;
}

/** A parameter the table does not know: generated from its declared type alone. */
function fallbackParameter(meta) {
  if (meta.dimensionality === 'matrix')
    return { role: 'range', family: 'generic', rule: { name: meta.name, kind: 'real' } };
  if (meta.type === 'string') return { role: 'choice', rule: { name: meta.name, choices: [], default: '' } };
  return { role: 'scalar', rule: { name: meta.name, kind: 'real' } };
}

/**
 * Builds the models of every function in a functions.json.
 * @param {{ metadataPath: string, declarations?: object }} options
 * @returns {object[]} one model per function: { id, params, variants, output }
 */
function loadModels({ metadataPath, declarations = loadDeclarations() }) {
  const metadata = JSON.parse(fs.readFileSync(metadataPath, 'utf8'));
  const { rules, variantCounts } = declarations;
  return metadata.functions.map((fn) => {
    const id = String(fn.id).toUpperCase();
    const params = fn.parameters.map((meta) => {
      const entry = (FUNCTION_PARAMETERS[id] && FUNCTION_PARAMETERS[id][meta.name]) || PARAMETERS[meta.name];
      const where = `${id}(${meta.name})`;
      const base = entry
        ? { ...entry, rule: entry.rule ? ruleNamed(rules, entry.rule, where) : { name: meta.name } }
        : fallbackParameter(meta);
      return { ...base, name: meta.name, optional: Boolean(meta.optional) };
    });
    const countEntry = VARIANT_COUNTS[id] ?? 'COMPARISON';
    const variants = typeof countEntry === 'string' ? variantCounts[countEntry] : countEntry;
    if (!variants) throw new Error(`${id}: functions/sheet/variants.ts exports no ${countEntry}`);
    return {
      id,
      params,
      variants: { min: variants.min, max: variants.max },
      output: OUTPUTS[id] ?? { shape: 'unknown' },
    };
  });
}

module.exports = { loadModels, loadDeclarations, REPO_ROOT };
