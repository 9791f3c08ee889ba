/**
 * The Content-Security-Policy of the built pages (dist/taskpane.html and every dist/help/*.html): present
 * before anything it governs, no more than the pages use (this add-in's own files and Office's script host
 * for the panel; nothing but the page's own style sheet for a help page), never 'unsafe-inline',
 * 'unsafe-eval' or a wildcard, and the hash of each inline <style> in style-src — so a change to a page's
 * CSS cannot silently lose its styles. CSP hashes are the base64 SHA-256 of the element's text (CSP Level 2,
 * W3C; common practice). The browser test (test/browser/csp.test.ts) shows the pages work under it.
 * Needs `npm run build` first.
 */
import * as crypto from 'crypto';
import * as fs from 'fs';
import * as path from 'path';

/** A page head whose CSP meta holds `policy`, followed by `rest`. */
const withPolicy = (policy: string, rest: string, before = ''): string =>
  `<head>${before}<meta http-equiv="Content-Security-Policy" content="${policy}">${rest}</head>`;

/* eslint-disable @typescript-eslint/no-require-imports */
const csp = require('../../manifest/contentSecurityPolicy.js') as {
  withInlineStyleHashes(html: string): string;
  withSources(html: string, sources: Record<string, string[]>): string;
  inlineStyleHashes(html: string): string[];
  readPolicy(html: string): Record<string, string[]> | undefined;
  hashSource(text: string): string;
};
/* eslint-enable @typescript-eslint/no-require-imports */

const DIST = path.join(__dirname, '..', '..', 'dist');
const OFFICE_HOST = 'https://appsforoffice.microsoft.com';

function page(relative: string): string {
  const file = path.join(DIST, relative);
  if (!fs.existsSync(file)) throw new Error(`dist/${relative} is missing: run \`npm run build\` before \`npm test\``);
  return fs.readFileSync(file, 'utf8');
}

const helpPages = (): string[] => {
  const dir = path.join(DIST, 'help');
  if (!fs.existsSync(dir)) throw new Error('dist/help is missing: run `npm run build` before `npm test`');
  return fs
    .readdirSync(dir)
    .filter((f) => f.endsWith('.html'))
    .map((f) => `help/${f}`);
};

/** What every page must keep, whatever its policy allows. */
function checkPage(name: string, html: string): string[] {
  const problems: string[] = [];
  const policy = csp.readPolicy(html);
  if (!policy) return [`${name}: no Content-Security-Policy`];
  const head = html.slice(0, html.search(/<\/head>/i));
  const metaAt = head.search(/http-equiv=["']?Content-Security-Policy/i);
  const firstGoverned = head.search(/<(script|style|link)\b/i);
  if (firstGoverned >= 0 && metaAt > firstGoverned) problems.push(`${name}: the policy comes after a script or style`);
  const all = Object.values(policy).flat();
  for (const loose of [
    "'unsafe-inline'",
    "'unsafe-eval'",
    "'unsafe-hashes'",
    '*',
    'data:',
    'blob:',
    'http:',
    'https:',
  ]) {
    if (all.includes(loose)) problems.push(`${name}: the policy allows ${loose}`);
  }
  if (policy['default-src']?.join(' ') !== "'none'") problems.push(`${name}: default-src is not 'none'`);
  for (const hash of csp.inlineStyleHashes(html)) {
    if (!policy['style-src']?.includes(hash)) problems.push(`${name}: an inline <style> is not in style-src (${hash})`);
  }
  if (/<script\b(?![^>]*\bsrc=)[^>]*>/i.test(html)) problems.push(`${name}: an inline <script>`);
  if (/<[a-z][^>]*\son[a-z]+\s*=/i.test(html)) problems.push(`${name}: an inline event handler`);
  if (/<[a-z][^>]*\sstyle\s*=/i.test(html)) problems.push(`${name}: a style attribute`);
  return problems;
}

describe('Content-Security-Policy of the built pages', () => {
  it('the side panel allows its own files and Office’s script host, and nothing else', () => {
    const html = page('taskpane.html');
    expect(checkPage('taskpane.html', html)).toEqual([]);
    const policy = csp.readPolicy(html) as Record<string, string[]>;
    expect(policy['script-src']).toEqual(["'self'", OFFICE_HOST]);
    expect(Object.keys(policy).sort()).toEqual(['base-uri', 'default-src', 'form-action', 'script-src', 'style-src']);
    expect(policy['base-uri']).toEqual(["'none'"]);
    expect(policy['form-action']).toEqual(["'none'"]);
    // the scripts the page loads are all from those two places
    const sources = [...html.matchAll(/<script\b[^>]*\bsrc=["']?([^"'\s>]+)/gi)].map((m) => m[1] as string);
    expect(sources.length).toBeGreaterThan(0);
    expect(sources.filter((src) => /^[a-z]+:/i.test(src) && !src.startsWith(`${OFFICE_HOST}/`))).toEqual([]);
  });

  it('every help page allows only its own style sheet: no script, no other resource', () => {
    const pages = helpPages();
    expect(pages.length).toBeGreaterThan(10);
    const problems = pages.flatMap((name) => checkPage(name, page(name)));
    expect(problems).toEqual([]);
    for (const name of pages) {
      const policy = csp.readPolicy(page(name)) as Record<string, string[]>;
      expect(Object.keys(policy).sort()).toEqual(['base-uri', 'default-src', 'form-action', 'style-src']);
      expect(policy['style-src']).toEqual(csp.inlineStyleHashes(page(name)));
    }
  });

  it("adds the hash of each inline style to style-src, replacing the template’s 'none'", () => {
    const template = withPolicy(
      "default-src 'none'; style-src 'none'; base-uri 'none'",
      '<style>body{margin:0}</style><style>p{color:red}</style><style>body{margin:0}</style>',
      '<!-- not a <style> element -->',
    );
    const expected = (text: string) => `'sha256-${crypto.createHash('sha256').update(text, 'utf8').digest('base64')}'`;
    expect(csp.hashSource('body{margin:0}')).toBe(expected('body{margin:0}'));
    const built = csp.withInlineStyleHashes(template);
    expect(csp.readPolicy(built)).toEqual({
      'default-src': ["'none'"],
      'style-src': [expected('body{margin:0}'), expected('p{color:red}')],
      'base-uri': ["'none'"],
    });
    // the development server's extra source, into a directive the policy has or lacks
    expect(csp.readPolicy(csp.withSources(built, { 'connect-src': ["'self'"], 'base-uri': ["'self'"] }))).toEqual({
      'default-src': ["'none'"],
      'style-src': [expected('body{margin:0}'), expected('p{color:red}')],
      'base-uri': ["'none'", "'self'"],
      'connect-src': ["'self'"],
    });
    // a page without a policy is left alone; a policy without style-src cannot take the hashes
    expect(csp.withInlineStyleHashes('<style>x{}</style>')).toBe('<style>x{}</style>');
    expect(() =>
      csp.withInlineStyleHashes(
        '<meta http-equiv="Content-Security-Policy" content="default-src \'none\'"><style>x{}</style>',
      ),
    ).toThrow('the page has inline <style> elements but its Content-Security-Policy has no style-src');
  });

  it('finds the problems it looks for (a page built without the hashes, an inline script, a loose policy)', () => {
    const unhashed = withPolicy("default-src 'none'; style-src 'none'", '<style>a{}</style>');
    expect(checkPage('p', unhashed)).toEqual([`p: an inline <style> is not in style-src (${csp.hashSource('a{}')})`]);
    const loose =
      withPolicy(
        "default-src *; style-src 'unsafe-inline'",
        '<script>alert(1)</script>',
        '<script src="x.js"></script>',
      ) + '<body style="x" onload="y()">';
    expect(checkPage('p', loose)).toEqual([
      'p: the policy comes after a script or style',
      "p: the policy allows 'unsafe-inline'",
      'p: the policy allows *',
      "p: default-src is not 'none'",
      'p: an inline <script>',
      'p: an inline event handler',
      'p: a style attribute',
    ]);
  });
});
