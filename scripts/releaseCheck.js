/**
 * Checks a built site (the folder a release publishes) for a base URL, before anything is published:
 * - manifest.xml: every URL it names is https and lies under the base URL (the AppDomain is the base's
 *   origin), no development address is left, and its <Version> is package.json's version as x.y.z.0;
 * - every file those URLs name exists in the site;
 * - functions.json: every function has a help URL under the base, and that help page exists;
 * - the pages the add-in loads (taskpane.html, functions.js, functions.json) and the help index exist.
 *
 * Used by scripts/release.js (which refuses to package a site with problems) and by test/release/.
 */
'use strict';
const fs = require('fs');
const path = require('path');
const { manifestVersion, normaliseBaseUrl } = require('../manifest/writeManifest');

/** Files a site must hold whatever the manifest says. */
const REQUIRED_FILES = [
  'manifest.xml',
  'taskpane.html',
  'taskpane.js',
  'functions.js',
  'functions.json',
  'help/index.html',
];

/**
 * Every URL in a manifest: attribute values and element texts that start with a scheme, outside comments.
 * @param {string} xml
 * @returns {string[]}
 */
function manifestUrls(xml) {
  const body = xml.replace(/<!--[\s\S]*?-->/g, '');
  const urls = [];
  for (const m of body.matchAll(/"([a-z][a-z0-9+.-]*:\/\/[^"]*)"/gi)) urls.push(m[1]);
  for (const m of body.matchAll(/>\s*([a-z][a-z0-9+.-]*:\/\/[^<\s]*)\s*</gi)) urls.push(m[1]);
  return urls.filter((u) => !/^https?:\/\/schemas\.microsoft\.com\//.test(u) && !/^http:\/\/www\.w3\.org\//.test(u));
}

/**
 * The file of `site` a URL under `base` names (query and fragment dropped), or undefined for other URLs.
 * @param {string} url
 * @param {string} base
 * @param {string} site
 */
function fileFor(url, base, site) {
  if (!url.startsWith(base)) return undefined;
  const rest = decodeURIComponent(url.slice(base.length).replace(/[?#].*$/, '')) || 'index.html';
  return path.join(site, ...rest.split('/'));
}

/**
 * Checks `site` for `baseUrl` and `packageVersion`.
 * @param {string} site folder of the built files
 * @param {string} baseUrl
 * @param {string} packageVersion
 * @returns {{ problems: string[], urls: string[], base: string }}
 */
function checkRelease(site, baseUrl, packageVersion) {
  const problems = [];
  const base = normaliseBaseUrl(baseUrl);
  const origin = new URL(base).origin;
  for (const file of REQUIRED_FILES)
    if (!fs.existsSync(path.join(site, file))) problems.push(`${file} is missing from the site`);
  const manifestFile = path.join(site, 'manifest.xml');
  if (!fs.existsSync(manifestFile)) return { problems, urls: [], base };
  const xml = fs.readFileSync(manifestFile, 'utf8');
  const urls = manifestUrls(xml);
  if (urls.length === 0) problems.push('manifest.xml names no URL');
  for (const url of urls) {
    if (!url.startsWith('https://')) problems.push(`manifest.xml: ${url} is not https`);
    else if (url === origin)
      continue; // the AppDomain
    else if (!url.startsWith(base)) problems.push(`manifest.xml: ${url} is not under ${base}`);
    else {
      const file = fileFor(url, base, site);
      if (file && !fs.existsSync(file))
        problems.push(`manifest.xml names ${url}, but the site has no ${path.relative(site, file)}`);
    }
  }
  if (/localhost/i.test(xml.replace(/<!--[\s\S]*?-->/g, '')) && !/localhost/i.test(base))
    problems.push('manifest.xml still names localhost');
  const version = /<Version>([^<]*)<\/Version>/.exec(xml)?.[1];
  let wanted;
  try {
    wanted = manifestVersion(packageVersion);
  } catch (error) {
    problems.push(error.message);
  }
  if (wanted && version !== wanted)
    problems.push(`manifest.xml has version ${version}, package.json says ${packageVersion} (${wanted})`);
  const metadataFile = path.join(site, 'functions.json');
  if (fs.existsSync(metadataFile)) {
    const metadata = JSON.parse(fs.readFileSync(metadataFile, 'utf8'));
    for (const fn of metadata.functions ?? []) {
      if (!fn.helpUrl) problems.push(`functions.json: ${fn.id} has no help URL`);
      else if (!fn.helpUrl.startsWith(base))
        problems.push(`functions.json: the help URL of ${fn.id} (${fn.helpUrl}) is not under ${base}`);
      else if (!fs.existsSync(fileFor(fn.helpUrl, base, site)))
        problems.push(`functions.json: the help page of ${fn.id} is missing (${fn.helpUrl})`);
    }
  }
  return { problems, urls, base };
}

module.exports = { checkRelease, manifestUrls, REQUIRED_FILES };
