#!/usr/bin/env node
/**
 * `npm run release`: the add-in built for the address it will be served from, checked, and packaged.
 *
 *   ADDIN_BASE_URL=https://your.host/lift-ledger/ npm run release
 *
 * 1. builds the add-in (webpack, production) into dist/ (or ADDIN_DIST_DIR) with every URL of the
 *    manifest and of the function help under ADDIN_BASE_URL, and the manifest version from package.json;
 * 2. checks the result (scripts/releaseCheck.js): all URLs https and under the base, every file they name
 *    present, a help page for every function; stops with exit code 1 on any problem;
 * 3. writes dist-release/lift-ledger-<version>.zip (or --out DIR): manifest.xml and INSTALL.md
 *    (docs/install.md) at the top, the files to publish under site/.
 *
 * Publish the contents of the site folder at ADDIN_BASE_URL (the workflow in .github/workflows does it on
 * GitHub Pages); give manifest.xml to the people who install (docs/install.md).
 * Exit codes: 0 done; 1 the build or the check failed; 2 no usable ADDIN_BASE_URL or a bad option.
 */
'use strict';
const { spawnSync } = require('child_process');
const fs = require('fs');
const path = require('path');
const yazl = require('yazl');
const { manifestVersion, normaliseBaseUrl } = require('../manifest/writeManifest');
const { checkRelease } = require('./releaseCheck');

const ROOT = path.join(__dirname, '..');

function fail(code, message) {
  process.stderr.write(`release: ${message}\n`);
  process.exit(code);
}

function options(argv) {
  const out = { outDir: path.join(ROOT, 'dist-release'), build: true };
  for (let i = 0; i < argv.length; i += 1) {
    if (argv[i] === '--out' && argv[i + 1]) out.outDir = path.resolve(argv[++i]);
    else if (argv[i] === '--no-build') out.build = false;
    else fail(2, `unknown option ${argv[i]} (options: --out DIR, --no-build)`);
  }
  return out;
}

/** Every file under `dir`, as paths relative to it with "/" separators, sorted. */
function filesUnder(dir, prefix = '') {
  const out = [];
  for (const entry of fs.readdirSync(path.join(dir, prefix), { withFileTypes: true })) {
    const rel = prefix ? `${prefix}/${entry.name}` : entry.name;
    if (entry.isDirectory()) out.push(...filesUnder(dir, rel));
    else out.push(rel);
  }
  return out.sort();
}

async function main() {
  const opts = options(process.argv.slice(2));
  const raw = process.env.ADDIN_BASE_URL;
  if (!raw)
    fail(
      2,
      'set ADDIN_BASE_URL to the https address the add-in will be served from, e.g. ADDIN_BASE_URL=https://addins.example.org/lift-ledger/ npm run release',
    );
  let base;
  try {
    base = normaliseBaseUrl(raw);
  } catch (error) {
    fail(2, error.message);
  }
  const host = new URL(base).hostname;
  if (host === 'localhost' || host === '127.0.0.1' || host === '[::1]')
    fail(
      2,
      `ADDIN_BASE_URL ${base} is this machine; a release needs the address where your team will load the files from`,
    );
  const { version } = JSON.parse(fs.readFileSync(path.join(ROOT, 'package.json'), 'utf8'));
  try {
    manifestVersion(version);
  } catch (error) {
    fail(2, error.message);
  }
  const site = process.env.ADDIN_DIST_DIR ? path.resolve(process.env.ADDIN_DIST_DIR) : path.join(ROOT, 'dist');

  if (opts.build) {
    process.stderr.write(
      `release: building Lift Ledger ${version} for ${base} into ${path.relative(ROOT, site) || site}…\n`,
    );
    const cli = require.resolve('webpack-cli/bin/cli.js', { paths: [ROOT] });
    const run = spawnSync(process.execPath, [cli, '--mode', 'production'], {
      cwd: ROOT,
      env: { ...process.env, ADDIN_BASE_URL: base, ADDIN_DIST_DIR: site },
      stdio: ['ignore', 'inherit', 'inherit'],
    });
    if (run.status !== 0) fail(1, 'the build failed (see above)');
  }

  const { problems, urls } = checkRelease(site, base, version);
  if (problems.length > 0) fail(1, `the built site is not ready to publish:\n  ${problems.join('\n  ')}`);

  fs.mkdirSync(opts.outDir, { recursive: true });
  const zipFile = path.join(opts.outDir, `lift-ledger-${version}.zip`);
  const zip = new yazl.ZipFile();
  const when = process.env.SOURCE_DATE_EPOCH ? new Date(Number(process.env.SOURCE_DATE_EPOCH) * 1000) : new Date();
  zip.addFile(path.join(site, 'manifest.xml'), 'manifest.xml', { mtime: when });
  zip.addFile(path.join(ROOT, 'docs', 'install.md'), 'INSTALL.md', { mtime: when });
  const files = filesUnder(site);
  for (const rel of files) zip.addFile(path.join(site, ...rel.split('/')), `site/${rel}`, { mtime: when });
  zip.end();
  await new Promise((resolve, reject) =>
    zip.outputStream.pipe(fs.createWriteStream(zipFile)).on('close', resolve).on('error', reject),
  );

  process.stdout.write(
    [
      `Lift Ledger ${version} for ${base}`,
      `  checked: ${urls.length} manifest URLs, ${files.length} files`,
      `  package: ${path.relative(process.cwd(), zipFile)} (manifest.xml, INSTALL.md, site/)`,
      `Publish the contents of ${path.relative(process.cwd(), site) || '.'} at ${base}; the manifest will then be at ${base}manifest.xml.`,
      'How a team installs it: docs/install.md.',
      '',
    ].join('\n'),
  );
}

main().catch((error) => fail(1, error.stack || String(error)));
