/**
 * The built site in dist/ is ready to publish at ADDIN_BASE_URL (default: the development address the plain
 * `npm run build` uses): every manifest URL is https and under the base, names a file that exists, the
 * manifest version is package.json's, every function has its help page. The publishing workflow runs this
 * file after `npm run release` (.github/workflows/publish-addin.yml); `npm test` runs it on the local build.
 * Manifest rules: Office Add-ins documentation, "Office Add-ins XML manifest" (https only, AppDomain an origin).
 */
import * as fs from 'fs';
import * as path from 'path';

// eslint-disable-next-line @typescript-eslint/no-require-imports
const { checkRelease } = require('../../scripts/releaseCheck.js') as {
  checkRelease(site: string, base: string, version: string): { problems: string[]; urls: string[]; base: string };
};

const ROOT = path.join(__dirname, '..', '..');
const site = process.env.ADDIN_DIST_DIR ? path.resolve(process.env.ADDIN_DIST_DIR) : path.join(ROOT, 'dist');
const base = process.env.ADDIN_BASE_URL || 'https://localhost:3000/';
const version = JSON.parse(fs.readFileSync(path.join(ROOT, 'package.json'), 'utf8')).version as string;

test(`dist/ holds a complete add-in for ${base}`, () => {
  if (!fs.existsSync(path.join(site, 'manifest.xml')))
    throw new Error('dist/manifest.xml is missing: run `npm run build` (or `npm run release`) first');
  const result = checkRelease(site, base, version);
  expect(result.problems).toEqual([]);
  expect(result.urls.length).toBeGreaterThanOrEqual(10);
});
