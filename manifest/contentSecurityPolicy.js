/**
 * The Content-Security-Policy of the served pages (the task pane and the help pages). Each page carries
 * its policy in a <meta http-equiv="Content-Security-Policy"> at the top of its template
 * (taskpane/taskpane.html, help/template.html); its `style-src` names no inline style. This module adds,
 * after the build has minified the pages, the SHA-256 hash of each inline <style> element to that
 * `style-src`, so the page's own style sheet is allowed and nothing else inline is (no 'unsafe-inline').
 *
 * Used by webpack.config.js (ContentSecurityPolicyPlugin, over every .html asset) and by the tests.
 */
'use strict';
const crypto = require('crypto');

const META = /<meta\b[^>]*\bhttp-equiv\s*=\s*["']?Content-Security-Policy["']?[^>]*>/i;
const CONTENT = /\bcontent\s*=\s*("([^"]*)"|'([^']*)')/i;
const STYLE = /<style\b[^>]*>([\s\S]*?)<\/style>/gi;

/** The CSP source expression of a text: 'sha256-<base64 of its UTF-8 bytes>'. */
function hashSource(text) {
  return `'sha256-${crypto.createHash('sha256').update(text, 'utf8').digest('base64')}'`;
}

const COMMENT = /<!--[\s\S]*?-->/g;

/** The hash sources of every inline <style> element of a page, in order (comments are not elements). */
function inlineStyleHashes(html) {
  return [...html.replace(COMMENT, '').matchAll(STYLE)].map((m) => hashSource(m[1]));
}

/**
 * The policy of a page, as directive name → list of sources; undefined when the page has no CSP meta.
 * @example readPolicy('<meta http-equiv="Content-Security-Policy" content="default-src \'none\'">')
 * //=> { 'default-src': ["'none'"] }
 */
function readPolicy(html) {
  const meta = META.exec(html);
  if (!meta) return undefined;
  const content = CONTENT.exec(meta[0]);
  if (!content) return undefined;
  const value = content[2] ?? content[3];
  const policy = {};
  for (const directive of value.split(';')) {
    const [name, ...sources] = directive.trim().split(/\s+/);
    if (name) policy[name.toLowerCase()] = sources;
  }
  return policy;
}

/**
 * The page with the hash of each inline <style> added to its CSP's style-src (once each). A page without
 * a CSP meta is returned unchanged.
 * @throws {Error} when the page has inline styles and a CSP without a style-src directive to add them to.
 */
function withInlineStyleHashes(html) {
  const meta = META.exec(html);
  const hashes = inlineStyleHashes(html);
  if (!meta || hashes.length === 0) return html;
  const content = CONTENT.exec(meta[0]);
  if (!content) return html;
  const value = content[2] ?? content[3];
  const directives = value
    .split(';')
    .map((d) => d.trim())
    .filter(Boolean);
  const at = directives.findIndex((d) => /^style-src(\s|$)/i.test(d));
  if (at < 0) throw new Error('the page has inline <style> elements but its Content-Security-Policy has no style-src');
  // 'none' in the template means "nothing inline but the page's own style sheet": it gives way to the hashes
  const present = directives[at].split(/\s+/).filter((source) => source !== "'none'");
  directives[at] = [...present, ...hashes.filter((h, i) => !present.includes(h) && hashes.indexOf(h) === i)].join(' ');
  const quote = content[2] !== undefined ? '"' : "'";
  const newMeta = meta[0].replace(content[0], `content=${quote}${directives.join('; ')}${quote}`);
  return html.replace(meta[0], newMeta);
}

/**
 * The page with `sources` added to its CSP (directive → sources; a directive it lacks is added). A page
 * without a CSP meta is returned unchanged.
 * @example withSources(page, { 'connect-src': ["'self'"] })
 */
function withSources(html, sources) {
  const meta = META.exec(html);
  const content = meta && CONTENT.exec(meta[0]);
  if (!content || Object.keys(sources).length === 0) return html;
  const directives = (content[2] ?? content[3])
    .split(';')
    .map((d) => d.trim())
    .filter(Boolean);
  for (const [name, extra] of Object.entries(sources)) {
    const at = directives.findIndex((d) => d.split(/\s+/)[0] === name);
    if (at < 0) directives.push([name, ...extra].join(' '));
    else directives[at] = [...directives[at].split(/\s+/), ...extra].join(' ');
  }
  const quote = content[2] !== undefined ? '"' : "'";
  return html.replace(meta[0], meta[0].replace(content[0], `content=${quote}${directives.join('; ')}${quote}`));
}

/**
 * Webpack plugin: applies {@link withInlineStyleHashes} to every .html asset once the pages are final.
 * `extraSources` (directive → sources) are added too: the development server passes connect-src 'self'
 * for its live-reload socket; the built add-in connects nowhere.
 */
class ContentSecurityPolicyPlugin {
  constructor(extraSources = {}) {
    this.extraSources = extraSources;
  }

  apply(compiler) {
    const { Compilation, sources } = compiler.webpack;
    compiler.hooks.thisCompilation.tap('ContentSecurityPolicyPlugin', (compilation) => {
      compilation.hooks.processAssets.tap(
        // after the HTML pages are emitted (OPTIMIZE_INLINE) and minified (OPTIMIZE_SIZE)
        { name: 'ContentSecurityPolicyPlugin', stage: Compilation.PROCESS_ASSETS_STAGE_OPTIMIZE_HASH },
        () => {
          for (const asset of compilation.getAssets()) {
            if (!asset.name.endsWith('.html')) continue;
            const html = asset.source.source().toString();
            const updated = withSources(withInlineStyleHashes(html), this.extraSources);
            if (updated !== html) compilation.updateAsset(asset.name, new sources.RawSource(updated));
          }
        },
      );
    });
  }
}

module.exports = {
  ContentSecurityPolicyPlugin,
  withInlineStyleHashes,
  withSources,
  inlineStyleHashes,
  readPolicy,
  hashSource,
};
