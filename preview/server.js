/**
 * The preview server (plain http on localhost) and its build steps. Used by preview/start.js (`npm start`)
 * and by the browser tests (test/browser/), which start it on a free port.
 *
 * Routes:
 *   /                      the preview page (preview/build/index.html)
 *   /preview/…             the preview bundle (preview/build/) and its static files (preview/static/)
 *   /taskpane.html         dist/taskpane.html with Office's CDN office.js replaced by the preview's stand-in
 *                          (as built, CDN script and all, when started with `asBuilt: true`: the browser test
 *                          of the served pages' Content-Security-Policy answers the CDN request itself)
 *   /…                     any other file of dist/ (functions.js, functions.json, taskpane.js, help/…)
 *
 * Hostile or malformed requests are answered and the server keeps serving: a method other than GET and
 * HEAD gets 405; a URL longer than MAX_URL_LENGTH 414; a bad percent-encoding, a null byte or other
 * control character, or a backslash in the decoded path 400; a path that climbs out with `..` (however
 * encoded) or names nothing 404. Anything that still goes wrong while answering becomes a 500.
 */
'use strict';
const fs = require('fs');
const http = require('http');
const net = require('net');
const path = require('path');
const { spawnSync } = require('child_process');

const REPO_ROOT = path.resolve(__dirname, '..');
// PREVIEW_DIST points the server at another build folder (development against a fixture only).
const DIST = process.env.PREVIEW_DIST ? path.resolve(process.env.PREVIEW_DIST) : path.join(REPO_ROOT, 'dist');
const PREVIEW_BUILD = path.join(__dirname, 'build');
const PREVIEW_STATIC = path.join(__dirname, 'static');
const STAND_IN_URL = '/preview/office-stand-in.js';
const WEBPACK_CLI = path.join(REPO_ROOT, 'node_modules', 'webpack-cli', 'bin', 'cli.js');

const CONTENT_TYPES = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.xml': 'application/xml; charset=utf-8',
  '.woff2': 'font/woff2',
  '.txt': 'text/plain; charset=utf-8',
};

/** Newest modification time (ms) of the files under `paths` (files or folders); 0 when none exist. */
function newestMtime(paths) {
  let newest = 0;
  const visit = (p) => {
    let stat;
    try {
      stat = fs.statSync(p);
    } catch {
      return;
    }
    if (stat.isDirectory()) {
      if (path.basename(p) === 'node_modules' || path.basename(p) === 'build') return;
      for (const entry of fs.readdirSync(p)) visit(path.join(p, entry));
    } else newest = Math.max(newest, stat.mtimeMs);
  };
  paths.forEach(visit);
  return newest;
}

/**
 * When `files` were last built: the newest of their modification times and of the stamp file written
 * after a build (webpack leaves unchanged outputs untouched); -1 when one of them is missing.
 */
function builtAt(files, stamp) {
  let newest = 0;
  for (const file of files) {
    try {
      newest = Math.max(newest, fs.statSync(file).mtimeMs);
    } catch {
      return -1;
    }
  }
  try {
    newest = Math.max(newest, fs.statSync(stamp).mtimeMs);
  } catch {
    // no stamp: the outputs' own times decide
  }
  return newest;
}

function writeStamp(stamp) {
  fs.mkdirSync(path.dirname(stamp), { recursive: true });
  fs.writeFileSync(stamp, `${new Date().toISOString()}\n`);
}

function runWebpack(args, log) {
  log(`Building: webpack ${args.join(' ')}`);
  const result = spawnSync(process.execPath, [WEBPACK_CLI, ...args], {
    cwd: REPO_ROOT,
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  if (result.status !== 0) throw new Error(`webpack ${args.join(' ')} failed (exit ${result.status})`);
}

/**
 * Runs the root webpack build (dist/: functions.js, functions.json, taskpane.html…) when dist/ is missing or
 * older than its sources. Returns whether it built. Throws when the build fails; when the root
 * webpack.config.js does not exist yet it logs that and returns false.
 */
function ensureAddinBuilt({ log = console.log, force = false } = {}) {
  const outputs = ['functions.js', 'functions.json', 'taskpane.html'].map((f) => path.join(DIST, f));
  const config = path.join(REPO_ROOT, 'webpack.config.js');
  if (!fs.existsSync(config)) {
    log(
      'The add-in build (webpack.config.js) is not in this checkout yet; the preview needs dist/functions.js and dist/functions.json.',
    );
    return false;
  }
  const sources = newestMtime(
    ['functions', 'taskpane', 'help', 'manifest', 'scripts', 'webpack.config.js'].map((p) => path.join(REPO_ROOT, p)),
  );
  const stamp = path.join(DIST, '.preview-built');
  if (!force && builtAt(outputs, stamp) >= sources) return false;
  runWebpack(['--mode', 'production'], log);
  writeStamp(stamp);
  return true;
}

/** Builds the preview bundle (preview/build/) when missing or older than preview/src or its config. */
function ensurePreviewBuilt({ log = console.log, force = false } = {}) {
  const outputs = ['index.html', 'preview.js'].map((f) => path.join(PREVIEW_BUILD, f));
  const sources = newestMtime([
    path.join(__dirname, 'src'),
    path.join(__dirname, 'webpack.config.js'),
    path.join(REPO_ROOT, 'node_modules', 'hyperformula', 'package.json'),
  ]);
  const stamp = path.join(PREVIEW_BUILD, '.built');
  if (!force && builtAt(outputs, stamp) >= sources) return false;
  runWebpack(['--config', path.join(__dirname, 'webpack.config.js'), '--mode', 'production'], log);
  writeStamp(stamp);
  return true;
}

/** dist/taskpane.html with the Office CDN script swapped for the preview's stand-in. */
function rewriteTaskpane(html) {
  // Matches quoted and (minified) unquoted src attributes.
  const officeScript = () =>
    /<script\b[^>]*?\bsrc\s*=\s*["']?[^"'\s>]*(?:appsforoffice\.microsoft\.com|\/office\.js)[^"'\s>]*["']?[^>]*>\s*<\/script>/gi;
  const tag = `<script src="${STAND_IN_URL}"></script>`;
  if (officeScript().test(html)) return html.replace(officeScript(), tag);
  // No Office script found: still install the stand-in before anything else runs.
  return html.replace(/<head([^>]*)>/i, `<head$1>${tag}`);
}

/** The file a URL path maps to, inside `root`; undefined for anything outside it. */
function inside(root, urlPath) {
  const target = path.normalize(path.join(root, urlPath));
  return target === root || target.startsWith(root + path.sep) ? target : undefined;
}

/** The longest request URL answered; longer ones get 414 (the preview's own paths are under 100 characters). */
const MAX_URL_LENGTH = 2048;
const TEXT = 'text/plain; charset=utf-8';

function send(res, status, body, type, headers = {}) {
  if (res.headersSent) return res.end();
  const common = { 'Content-Type': type, 'Cache-Control': 'no-store', 'X-Content-Type-Options': 'nosniff' };
  res.writeHead(status, { ...common, ...headers });
  res.end(body);
}

function serveFile(res, file) {
  fs.readFile(file, (error, data) => {
    if (error) return send(res, 404, 'Not found', TEXT);
    send(res, 200, data, CONTENT_TYPES[path.extname(file).toLowerCase()] || 'application/octet-stream');
  });
}

/**
 * The decoded path of a request URL, or the status that refuses it: 414 when too long, 400 for a bad
 * percent-encoding, a control character (a null byte among them) or a backslash, 404 for a `..` segment.
 * The URL parser already resolves literal and `%2e%2e` dot segments at the root; an encoded slash
 * (`..%2F`) survives it and is caught here.
 */
function requestPath(url) {
  if (typeof url !== 'string' || url.length > MAX_URL_LENGTH) return { status: 414, body: 'URI too long' };
  let decoded;
  try {
    decoded = decodeURIComponent(new URL(url, 'http://localhost').pathname);
  } catch {
    return { status: 400, body: 'Bad request' };
  }
  // eslint-disable-next-line no-control-regex -- control characters are exactly what is refused here
  if (/[\u0000-\u001f\u007f\\]/.test(decoded)) return { status: 400, body: 'Bad request' };
  if (decoded.split('/').some((segment) => segment === '..')) return { status: 404, body: 'Not found' };
  return { path: decoded };
}

/** The request handler; `asBuilt` serves dist/taskpane.html unchanged. */
const createHandler = (asBuilt) => (req, res) => {
  try {
    route(req, res, asBuilt);
  } catch (error) {
    console.error(`preview server: ${req.method} ${String(req.url).slice(0, 200)} failed: ${error && error.message}`);
    send(res, 500, 'Server error', TEXT);
  }
};

function route(req, res, asBuilt) {
  if (req.method !== 'GET' && req.method !== 'HEAD') {
    return send(res, 405, 'Method not allowed', TEXT, { Allow: 'GET, HEAD' });
  }
  const request = requestPath(req.url);
  if (request.status) return send(res, request.status, request.body, TEXT);
  const urlPath = request.path;
  if (urlPath === '/' || urlPath === '/index.html') return serveFile(res, path.join(PREVIEW_BUILD, 'index.html'));
  if (urlPath.startsWith('/preview/')) {
    const rest = urlPath.slice('/preview/'.length);
    const fromStatic = inside(PREVIEW_STATIC, rest);
    if (fromStatic && fs.existsSync(fromStatic) && fs.statSync(fromStatic).isFile()) return serveFile(res, fromStatic);
    const fromBuild = inside(PREVIEW_BUILD, rest);
    return fromBuild ? serveFile(res, fromBuild) : send(res, 404, 'Not found', TEXT);
  }
  if (urlPath === '/taskpane.html' && !asBuilt) {
    return fs.readFile(path.join(DIST, 'taskpane.html'), 'utf8', (error, html) => {
      if (error) {
        return send(
          res,
          200,
          '<!doctype html><meta charset="utf-8"><p style="font-family:sans-serif">The side panel is not built yet: run <code>npm run build</code>.</p>',
          CONTENT_TYPES['.html'],
        );
      }
      send(res, 200, rewriteTaskpane(html), CONTENT_TYPES['.html']);
    });
  }
  const file = inside(DIST, urlPath);
  return file ? serveFile(res, file) : send(res, 404, 'Not found', TEXT);
}

/** Resolves with `port` if it can be listened on at `host`, else with the first free port after it. */
function findFreePort(port, host = 'localhost', tries = 50) {
  return new Promise((resolve, reject) => {
    const probe = net.createServer();
    probe.once('error', (error) => {
      if (error.code === 'EADDRINUSE' && tries > 1) resolve(findFreePort(port + 1, host, tries - 1));
      else reject(error);
    });
    probe.listen(port, host, () => probe.close(() => resolve(port)));
  });
}

/**
 * Starts the preview server. `port` 0 lets the system choose (tests); otherwise the first free port from
 * `port` upward is used. `asBuilt` serves the side panel's page exactly as built. Resolves with
 * { url, port, close() } once listening on localhost.
 */
async function startPreviewServer({ port = 3100, host = 'localhost', asBuilt = false } = {}) {
  const chosen = port === 0 ? 0 : await findFreePort(port, host);
  const server = http.createServer(createHandler(asBuilt));
  await new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(chosen, host, resolve);
  });
  const actual = server.address().port;
  return {
    port: actual,
    url: `http://localhost:${actual}/`,
    close: () => new Promise((resolve) => server.close(() => resolve())),
    server,
  };
}

module.exports = { startPreviewServer, ensureAddinBuilt, ensurePreviewBuilt, findFreePort, rewriteTaskpane, REPO_ROOT };
