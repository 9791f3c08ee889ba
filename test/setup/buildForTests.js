/**
 * Jest global setup: makes `npm test` pass on a fresh clone. It writes the side panel's texts
 * (functions/texts.generated.json, from the wrappers' JSDoc) and runs the add-in build (webpack, ~20 s)
 * when dist/ is missing or older than its sources, because the bundle, metadata, preview-workbook and help
 * tests read dist/. An up-to-date dist/ costs nothing.
 */
'use strict';
const fs = require('fs');
const path = require('path');
const { spawnSync } = require('child_process');

const ROOT = path.join(__dirname, '..', '..');
const DIST = path.join(ROOT, 'dist');
/** What the build reads: a change in any of these makes dist/ stale. */
const SOURCES = [
  'functions',
  'taskpane',
  'help',
  'manifest',
  'scripts',
  'webpack.config.js',
  'tsconfig.json',
  'package-lock.json',
];
/** What the tests read from dist/. */
const OUTPUTS = ['functions.js', 'functions.json', 'taskpane.html', 'taskpane.js', 'manifest.xml', 'help/index.html'];

/** Newest modification time under the given paths (files or folders, recursively); 0 when none exist. */
function newestMtime(paths) {
  let newest = 0;
  const visit = (p) => {
    let stat;
    try {
      stat = fs.statSync(p);
    } catch {
      return;
    }
    if (stat.isDirectory()) for (const name of fs.readdirSync(p)) visit(path.join(p, name));
    else newest = Math.max(newest, stat.mtimeMs);
  };
  for (const p of paths) visit(p);
  return newest;
}

/** When dist/ was last built: the time of its oldest output; -1 if an output is missing. */
function builtAt() {
  let oldest = Infinity;
  for (const file of OUTPUTS) {
    try {
      oldest = Math.min(oldest, fs.statSync(path.join(DIST, file)).mtimeMs);
    } catch {
      return -1;
    }
  }
  return oldest;
}

module.exports = async function buildForTests() {
  require('../../help/build').writeFunctionTexts();
  const sources = newestMtime(SOURCES.map((p) => path.join(ROOT, p)));
  if (builtAt() >= sources) return;
  console.log(
    '\ndist/ is missing or older than its sources: building the add-in for the tests (webpack --mode production)',
  );
  const webpackCli = require.resolve('webpack-cli/bin/cli.js', { paths: [ROOT] });
  const result = spawnSync(process.execPath, [webpackCli, '--mode', 'production'], {
    cwd: ROOT,
    stdio: ['ignore', 'inherit', 'inherit'],
    env: { ...process.env, ADDIN_BASE_URL: '' },
  });
  if (result.status !== 0)
    throw new Error(`the add-in build failed (webpack exit ${result.status}); run \`npm run build\` to see why`);
  // webpack leaves an output whose bytes did not change untouched; mark every output as built now, so that
  // this check and the command line's own (`lift-ledger audit`, by the time of dist/functions.js) agree
  const now = new Date();
  for (const file of OUTPUTS) fs.utimesSync(path.join(DIST, file), now, now);
};
