/**
 * Generates the help pages (one per worksheet function plus an index) FROM THE SAME JSDoc the
 * metadata generator reads, so Excel's formula help and the help pages cannot drift apart, and the texts
 * the side panel shows (functions/texts.generated.json, git-ignored, rewritten on every build and test run).
 *
 * The wrapper files (functions/wrappers/<family>.ts, in the order functions/functions.ts exports them) are
 * parsed with the TypeScript compiler API; for every function with a @customfunction tag it reads the
 * description, @param, @returns and the extra tags @method, @source, @example, @crosscheck and @caution
 * (custom-functions-metadata ignores tags it does not know). Each argument's allowed values come from the
 * catalogue (functions/catalogue.ts) and its declared rules, so a tightened bound shows without edits.
 * Used by webpack.config.js (emits dist/help/*.html), the jest global setup, and
 * `node help/build.js [out-dir]` (`--texts` writes only the panel's texts).
 */
'use strict';
require('../scripts/tsRequire');
const fs = require('fs');
const path = require('path');
const ts = require('typescript');

const ROOT = path.join(__dirname, '..');
/** The entry point that gathers the wrapper files, one `export * from './wrappers/<family>'` line each. */
const ENTRY = path.join(ROOT, 'functions', 'functions.ts');
const TEMPLATE = path.join(__dirname, 'template.html');
const TEXTS = path.join(ROOT, 'functions', 'texts.generated.json');
const NAMESPACE = 'ABTEST';

/**
 * The wrapper files in the order functions/functions.ts exports them (the catalogue's family order).
 * @returns {string[]} absolute paths
 * @example wrapperFiles().map((f) => path.basename(f))[0] //=> 'conversion.ts'
 */
function wrapperFiles() {
  const text = fs.readFileSync(ENTRY, 'utf8');
  const found = [...text.matchAll(/^export \* from '\.\/(wrappers\/[\w-]+)';$/gm)].map((m) =>
    path.join(ROOT, 'functions', `${m[1]}.ts`),
  );
  if (found.length === 0) throw new Error('functions/functions.ts exports no wrapper files');
  return found;
}

/** The catalogue module (TypeScript, loaded through scripts/tsRequire.js outside jest). */
function catalogue() {
  return require('../functions/catalogue');
}

function commentText(comment) {
  if (comment === undefined) return '';
  if (typeof comment === 'string') return comment.trim();
  return comment
    .map((part) => part.text)
    .join('')
    .trim();
}

/**
 * Reads the documentation of every custom function in the wrapper files.
 * @param {string | string[]} [sources] TypeScript files; defaults to {@link wrapperFiles}
 * @returns {Array<{id: string, jsName: string, file: string, description: string,
 *   params: Array<{name: string, optional: boolean, text: string}>, returns: string, method: string, source: string,
 *   examples: string[], crosschecks: string[], cautions: string[], helpUrl: string}>}
 * @example readFunctionDocs().length //=> the number of catalogue entries (29 in 0.1.0)
 */
function readFunctionDocs(sources = wrapperFiles()) {
  const docs = [];
  for (const sourcePath of Array.isArray(sources) ? sources : [sources]) docs.push(...readFileDocs(sourcePath));
  return docs;
}

function readFileDocs(sourcePath) {
  const text = fs.readFileSync(sourcePath, 'utf8');
  const file = ts.createSourceFile(sourcePath, text, ts.ScriptTarget.ES2020, true, ts.ScriptKind.TS);
  const docs = [];
  file.forEachChild((node) => {
    if (!ts.isFunctionDeclaration(node) || !node.name) return;
    const jsDoc = (node.jsDoc || [])[0];
    if (!jsDoc) return;
    const tags = jsDoc.tags || [];
    const tag = (name) => tags.filter((t) => t.tagName.text.toLowerCase() === name);
    const cf = tag('customfunction')[0];
    if (!cf) return;
    const id = commentText(cf.comment).split(/\s+/)[0] || node.name.text.toUpperCase();
    const paramDocs = new Map(
      tag('param').map((t) => [
        t.name.getText().replace(/^\[|\]$/g, ''),
        { text: commentText(t.comment), bracketed: t.isBracketed },
      ]),
    );
    const params = node.parameters.map((p) => {
      const name = p.name.getText();
      const doc = paramDocs.get(name) || { text: '', bracketed: false };
      return { name, optional: Boolean(p.questionToken) || doc.bracketed, text: doc.text };
    });
    const one = (name) => commentText((tag(name)[0] || {}).comment);
    const all = (name) => tag(name).map((t) => commentText(t.comment));
    docs.push({
      id,
      jsName: node.name.text,
      file: path.relative(ROOT, sourcePath).split(path.sep).join('/'),
      description: commentText(jsDoc.comment),
      params,
      returns: one('returns'),
      method: one('method'),
      source: one('source'),
      examples: all('example'),
      crosschecks: all('crosscheck'),
      cautions: all('caution'),
      helpUrl: one('helpurl'),
    });
  });
  return docs;
}

/**
 * Splits an @example into its formula and its stated result: `=ABTEST.F(...) returns {…}`.
 * Examples without "returns" describe the result in words (`result` is then undefined).
 * @param {string} example
 * @returns {{formula: string, result: string | undefined, words: string | undefined}}
 * @example parseExample('=ABTEST.SRM_PVALUE({50410;49590}) returns 0.0095124').result //=> '0.0095124'
 */
function parseExample(example) {
  const m = /^(=ABTEST\.[A-Z_]+\(.*\))\s+returns\s+(.+)$/s.exec(example);
  if (m) return { formula: m[1], result: m[2].trim(), words: undefined };
  const f = /^(=ABTEST\.[A-Z_]+\(.*?\))\s*(.*)$/s.exec(example);
  return f
    ? { formula: f[1], result: undefined, words: f[2].trim() }
    : { formula: '', result: undefined, words: example };
}

function escapeHtml(s) {
  return String(s).replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

function paragraphHtml(s) {
  return s
    .split(/\n\s*\n|\n/)
    .map((line) => line.trim())
    .filter(Boolean)
    .map((line) => `<p>${escapeHtml(line)}</p>`)
    .join('\n');
}

/** Text of `signature`, e.g. `=ABTEST.POSTERIOR_MEAN(conversions, visitors, [prior_alpha], [prior_beta])`. */
function signature(doc) {
  const args = doc.params.map((p) => (p.optional ? `[${p.name}]` : p.name)).join(', ');
  return `=${NAMESPACE}.${doc.id}(${args})`;
}

/**
 * The HTML body of one function's page.
 * @param {ReturnType<typeof readFunctionDocs>[number]} doc
 * @returns {string}
 */
function functionPageBody(doc) {
  const parts = [];
  parts.push(`<h1>${NAMESPACE}.${escapeHtml(doc.id)}</h1>`);
  parts.push(`<div class="lead">${paragraphHtml(doc.description)}</div>`);
  parts.push(`<h2>Syntax</h2>\n<pre>${escapeHtml(signature(doc))}</pre>`);
  const allowed = allowedValues(doc.id);
  const rows = doc.params
    .map(
      (p) =>
        `<tr><td><code>${escapeHtml(p.name)}</code>${p.optional ? ' (optional)' : ''}</td><td>${escapeHtml(p.text)}</td>` +
        `<td>${escapeHtml(allowed.get(p.name) ?? '')}</td></tr>`,
    )
    .join('\n');
  parts.push(
    `<h2>Arguments</h2>\n<table><tr><th>argument</th><th>what to give</th><th>allowed</th></tr>\n${rows}</table>`,
  );
  parts.push(`<h2>Result</h2>\n${paragraphHtml(doc.returns)}`);
  if (doc.examples.length > 0) {
    const items = doc.examples.map((e) => {
      const ex = parseExample(e);
      const formula = ex.formula ? `<pre>${escapeHtml(ex.formula)}</pre>` : '';
      const result =
        ex.result !== undefined
          ? `<p>returns <code>${escapeHtml(ex.result)}</code></p>`
          : ex.words
            ? `<p>${escapeHtml(ex.words)}</p>`
            : '';
      return `${formula}\n${result}`;
    });
    parts.push(
      `<h2>Example</h2>\n<p>Array constants stand for cell ranges: <code>{120;150}</code> is a column of two cells.</p>\n${items.join('\n')}`,
    );
  }
  if (doc.method) parts.push(`<h2>How it is computed</h2>\n${paragraphHtml(doc.method)}`);
  if (doc.source) parts.push(`<h2>Published source</h2>\n${paragraphHtml(doc.source)}`);
  if (doc.crosschecks.length > 0) {
    parts.push(`<h2>Check it with built-in functions</h2>\n${doc.crosschecks.map((c) => paragraphHtml(c)).join('\n')}`);
  }
  const cautions = [
    ...doc.cautions,
    'Read every result together with a check of the traffic split (SRM_PVALUE). For regulated or health-related decisions, ask a qualified statistician and follow local rules.',
  ];
  parts.push(`<h2>Cautions</h2>\n${cautions.map((c) => `<div class="caution">${paragraphHtml(c)}</div>`).join('\n')}`);
  return parts.join('\n');
}

/**
 * Each argument's allowed values in words, from the catalogue entry's declared rules.
 * @param {string} id
 * @returns {Map<string, string>} argument name → words
 * @example allowedValues('RATE_INTERVAL').get('level') //=> 'a number greater than 0 and less than 1; default 0.95'
 */
function allowedValues(id) {
  const { CATALOGUE } = catalogue();
  const { describeParam } = require('../functions/sheet/entry');
  const entry = CATALOGUE[id];
  if (entry === undefined) throw new Error(`${id} has a @customfunction tag but no entry in functions/catalogue.ts`);
  return new Map(entry.params.map((p) => [p.name, describeParam(p, entry)]));
}

/**
 * The texts the side panel shows for each function (taskpane/logic/explain.ts imports them), by id.
 * @param {ReturnType<typeof readFunctionDocs>} [docs]
 * @returns {Record<string, {description: string, method: string, source: string, cautions: string[]}>}
 */
function functionTexts(docs = readFunctionDocs()) {
  const texts = {};
  for (const d of docs)
    texts[d.id] = { description: d.description, method: d.method, source: d.source, cautions: d.cautions };
  return texts;
}

/**
 * Writes functions/texts.generated.json when its content changed (so an unchanged file keeps its time stamp).
 * @returns {string} the path written or kept
 */
function writeFunctionTexts() {
  const json = `${JSON.stringify(functionTexts(), null, 1)}\n`;
  const old = fs.existsSync(TEXTS) ? fs.readFileSync(TEXTS, 'utf8') : '';
  if (old !== json) fs.writeFileSync(TEXTS, json);
  return TEXTS;
}

function indexBody(docs) {
  const rows = docs
    .map(
      (d) =>
        `<tr><td><a href="${escapeHtml(d.id)}.html"><code>${escapeHtml(d.id)}</code></a></td><td>${escapeHtml(d.description.split('\n')[0])}</td></tr>`,
    )
    .join('\n');
  return [
    '<h1>Lift Ledger worksheet functions</h1>',
    '<p class="lead">Type <code>=ABTEST.</code> in a cell to use them. The first variant in every range is the control.</p>',
    `<table><tr><th>function</th><th>what it gives</th></tr>\n${rows}</table>`,
    '<h2>Cautions for every read-out</h2>',
    '<div class="caution"><p>Decide the sample size or the stopping rule before the test starts; looking every day and stopping at the first good number (peeking) makes false wins likely.</p></div>',
    '<div class="caution"><p>Check the traffic split with SRM_PVALUE first: a broken split makes every other number untrustworthy.</p></div>',
    '<div class="caution"><p>With many variants the best-looking one is often lucky. A strong prior can outweigh a small test; compare with the default prior.</p></div>',
    '<div class="caution"><p>For regulated or health-related decisions, ask a qualified statistician and follow local rules.</p></div>',
  ].join('\n');
}

/**
 * Builds every help page.
 * @param {{sources?: string | string[]}} [options]
 * @returns {Map<string, string>} file name (e.g. "POSTERIOR_MEAN.html", "index.html") → HTML
 */
function buildHelpPages(options = {}) {
  const template = fs.readFileSync(TEMPLATE, 'utf8');
  const fill = (title, body) => template.replace('{{title}}', escapeHtml(title)).replace('{{body}}', body);
  const docs = readFunctionDocs(options.sources);
  const pages = new Map();
  for (const doc of docs) pages.set(`${doc.id}.html`, fill(`${NAMESPACE}.${doc.id}`, functionPageBody(doc)));
  pages.set('index.html', fill('Functions', indexBody(docs)));
  return pages;
}

module.exports = {
  ENTRY,
  TEMPLATE,
  TEXTS,
  wrapperFiles,
  readFunctionDocs,
  parseExample,
  buildHelpPages,
  signature,
  allowedValues,
  functionTexts,
  writeFunctionTexts,
};

if (require.main === module) {
  if (process.argv[2] === '--texts') {
    console.log(`wrote ${path.relative(ROOT, writeFunctionTexts())}`);
    process.exit(0);
  }
  const out = process.argv[2] || path.join(ROOT, 'dist', 'help');
  fs.mkdirSync(out, { recursive: true });
  const pages = buildHelpPages();
  // the hash of each page's own style sheet into its Content-Security-Policy (webpack does this after minifying)
  const { withInlineStyleHashes } = require('../manifest/contentSecurityPolicy');
  for (const [name, html] of pages) fs.writeFileSync(path.join(out, name), withInlineStyleHashes(html));
  console.log(`wrote ${pages.size} help pages to ${out}`);
}
