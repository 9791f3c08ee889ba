/**
 * The production-manifest writer: rewrites every development URL (https://localhost:3000/) of
 * manifest/manifest.xml to the base URL the add-in is served from, and checks the result.
 *
 * Used by webpack.config.js, which writes dist/manifest.xml with ADDIN_BASE_URL (default: the dev URL),
 * and by `node manifest/writeManifest.js <base-url> [out-file]` directly.
 */
'use strict';
const fs = require('fs');
const path = require('path');

/** The development base URL every resource in manifest.xml starts with. */
const DEV_BASE_URL = 'https://localhost:3000/';

/**
 * Normalises and checks a base URL: absolute https, no query or fragment, ending in "/".
 * @param {string} raw
 * @returns {string}
 * @throws {Error} when the URL is not https or not absolute.
 * @example normaliseBaseUrl('https://addins.example.org/lift-ledger') //=> 'https://addins.example.org/lift-ledger/'
 */
function normaliseBaseUrl(raw) {
  let url;
  try {
    url = new URL(String(raw).trim());
  } catch {
    throw new Error(`ADDIN_BASE_URL "${raw}" is not an absolute URL`);
  }
  if (url.protocol !== 'https:')
    throw new Error(`ADDIN_BASE_URL "${raw}" must use https (Office loads add-ins over https only)`);
  if (url.search || url.hash) throw new Error(`ADDIN_BASE_URL "${raw}" must not have a query or fragment`);
  const href = url.href;
  return href.endsWith('/') ? href : `${href}/`;
}

/**
 * The manifest with every development URL moved to `baseUrl`. The AppDomain (an origin, no path) is
 * set to the new origin.
 * @param {string} xml manifest text
 * @param {string} baseUrl e.g. https://addins.example.org/lift-ledger/
 * @returns {string}
 * @throws {Error} on a bad base URL, or when a localhost URL would remain in a non-development manifest.
 * @example rewriteManifest(xml, 'https://a.example/').includes('https://a.example/functions.js') //=> true
 */
function rewriteManifest(xml, baseUrl) {
  const base = normaliseBaseUrl(baseUrl);
  const origin = new URL(base).origin;
  let out = xml.split(DEV_BASE_URL).join(base);
  out = out.replace(/<AppDomain>https:\/\/localhost:3000<\/AppDomain>/g, `<AppDomain>${origin}</AppDomain>`);
  if (base !== DEV_BASE_URL && /localhost:3000/.test(out.replace(/<!--[\s\S]*?-->/g, ''))) {
    throw new Error('a development URL is left in the manifest');
  }
  return out;
}

/**
 * The generated functions.json with its help URLs moved from the development base to `baseUrl`.
 * @param {string} metadataJson text of functions.json
 * @param {string} baseUrl
 * @returns {string}
 * @throws {Error} on a bad base URL.
 * @example rewriteMetadata('{"helpUrl": "https://localhost:3000/help/A.html"}', 'https://a.example/x') //=> '{"helpUrl": "https://a.example/x/help/A.html"}'
 */
function rewriteMetadata(metadataJson, baseUrl) {
  return metadataJson.split(DEV_BASE_URL).join(normaliseBaseUrl(baseUrl));
}

/**
 * The four-part manifest version Office expects for a package.json version: "1.2.3" → "1.2.3.0".
 * @param {string} packageVersion
 * @returns {string}
 * @throws {Error} for a version that is not three whole numbers (a pre-release tag has no manifest form).
 * @example manifestVersion('0.1.0') //=> '0.1.0.0'
 */
function manifestVersion(packageVersion) {
  const m = /^(\d+)\.(\d+)\.(\d+)$/.exec(String(packageVersion));
  if (!m)
    throw new Error(
      `package.json version "${packageVersion}" must be three whole numbers (x.y.z) to become a manifest version`,
    );
  return `${m[1]}.${m[2]}.${m[3]}.0`;
}

/**
 * The manifest with its <Version> set from package.json's version.
 * @param {string} xml
 * @param {string} packageVersion
 * @returns {string}
 */
function withVersion(xml, packageVersion) {
  return xml.replace(/<Version>[^<]*<\/Version>/, `<Version>${manifestVersion(packageVersion)}</Version>`);
}

/**
 * Reads manifest/manifest.xml and returns it rewritten for `baseUrl`, with the version of package.json.
 * @param {string} baseUrl
 * @returns {string}
 */
function productionManifest(baseUrl) {
  const { version } = JSON.parse(fs.readFileSync(path.join(__dirname, '..', 'package.json'), 'utf8'));
  return withVersion(rewriteManifest(fs.readFileSync(path.join(__dirname, 'manifest.xml'), 'utf8'), baseUrl), version);
}

module.exports = {
  DEV_BASE_URL,
  normaliseBaseUrl,
  rewriteManifest,
  rewriteMetadata,
  manifestVersion,
  withVersion,
  productionManifest,
};

if (require.main === module) {
  const base = process.argv[2] || process.env.ADDIN_BASE_URL || DEV_BASE_URL;
  const out = process.argv[3] || path.join(__dirname, '..', 'dist', 'manifest.xml');
  fs.mkdirSync(path.dirname(out), { recursive: true });
  fs.writeFileSync(out, productionManifest(base));
  console.log(`wrote ${out} for ${normaliseBaseUrl(base)}`);
}
