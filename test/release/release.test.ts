/**
 * `npm run release` (scripts/release.js) as the publishing workflow runs it: a production build for a
 * hosted base URL into a temporary folder, checked, and packaged. Also what the release refuses, what the
 * site check catches, and that the workflow file runs these same commands.
 *
 * Rules checked, from the Office Add-ins documentation ("Office Add-ins XML manifest"): add-in URLs are https;
 * the manifest <Version> has four parts. The base URL https://addins.example.org/lift-ledger/ is invented.
 */
import { spawnSync } from 'child_process';
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { readParts } from '../cli/helpers/xlsxWriter';

// eslint-disable-next-line @typescript-eslint/no-require-imports
const { checkRelease, manifestUrls } = require('../../scripts/releaseCheck.js') as {
  checkRelease(site: string, base: string, version: string): { problems: string[]; urls: string[]; base: string };
  manifestUrls(xml: string): string[];
};

// Reading the package and the site take seconds on a busy machine; jest's 5 s default is too tight.
jest.setTimeout(120_000);

const ROOT = path.join(__dirname, '..', '..');
const SCRIPT = path.join(ROOT, 'scripts', 'release.js');
const BASE = 'https://addins.example.org/lift-ledger/';
const version = JSON.parse(fs.readFileSync(path.join(ROOT, 'package.json'), 'utf8')).version as string;

let dir: string;
beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'lift-ledger-release-'));
});
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

function release(
  env: Record<string, string | undefined>,
  args: string[] = [],
): { status: number | null; stdout: string; stderr: string } {
  const clean = { ...process.env };
  delete clean.ADDIN_BASE_URL;
  delete clean.ADDIN_DIST_DIR;
  const run = spawnSync(process.execPath, [SCRIPT, ...args], {
    cwd: ROOT,
    env: { ...clean, ...env } as NodeJS.ProcessEnv,
    encoding: 'utf8',
  });
  return { status: run.status, stdout: run.stdout, stderr: run.stderr };
}

describe('what the release refuses before building', () => {
  test('no base URL', () => {
    const run = release({});
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/^release: set ADDIN_BASE_URL to the https address the add-in will be served from/);
  });
  test('an http base URL', () => {
    expect(release({ ADDIN_BASE_URL: 'http://addins.example.org/' })).toMatchObject({
      status: 2,
      stderr:
        'release: ADDIN_BASE_URL "http://addins.example.org/" must use https (Office loads add-ins over https only)\n',
    });
  });
  test('this machine', () => {
    const run = release({ ADDIN_BASE_URL: 'https://localhost:3000/' });
    expect(run.status).toBe(2);
    expect(run.stderr).toContain(
      'is this machine; a release needs the address where your team will load the files from',
    );
  });
});

describe('a release for a hosted address', () => {
  let site: string;
  let out: string;
  let run: ReturnType<typeof release>;
  beforeAll(() => {
    site = path.join(dir, 'site');
    out = path.join(dir, 'out');
    run = release({ ADDIN_BASE_URL: BASE, ADDIN_DIST_DIR: site, SOURCE_DATE_EPOCH: '0' }, ['--out', out]);
  }, 600_000);

  test('builds, checks and says where things are', () => {
    expect(run.stderr).toContain(`release: building Lift Ledger ${version} for ${BASE}`);
    expect(run.status).toBe(0);
    expect(run.stdout).toContain(`Lift Ledger ${version} for ${BASE}`);
    expect(run.stdout).toContain(`the manifest will then be at ${BASE}manifest.xml.`);
  });
  test('every manifest URL is https, under the base (the AppDomain is its origin), and names a file of the site', () => {
    const xml = fs.readFileSync(path.join(site, 'manifest.xml'), 'utf8');
    const urls = manifestUrls(xml);
    expect(urls.length).toBeGreaterThanOrEqual(10);
    for (const url of urls) {
      expect(url.startsWith(BASE) || url === 'https://addins.example.org').toBe(true);
      if (url.startsWith(BASE)) expect(fs.existsSync(path.join(site, ...url.slice(BASE.length).split('/')))).toBe(true);
    }
    expect(xml).toContain('<AppDomain>https://addins.example.org</AppDomain>');
    expect(xml).toContain(`<bt:Url id="Functions.Script.Url" DefaultValue="${BASE}functions.js"/>`);
    expect(xml.replace(/<!--[\s\S]*?-->/g, '')).not.toContain('localhost');
  });
  test("the manifest version is package.json's", () => {
    const xml = fs.readFileSync(path.join(site, 'manifest.xml'), 'utf8');
    expect(/<Version>([^<]*)<\/Version>/.exec(xml)?.[1]).toBe(`${version}.0`);
  });
  test('every function has its help page at its help URL', () => {
    const metadata = JSON.parse(fs.readFileSync(path.join(site, 'functions.json'), 'utf8')) as {
      functions: { id: string; helpUrl: string }[];
    };
    expect(metadata.functions.length).toBeGreaterThanOrEqual(29);
    for (const fn of metadata.functions) {
      expect(fn.helpUrl).toBe(`${BASE}help/${fn.id}.html`);
      expect(fs.existsSync(path.join(site, 'help', `${fn.id}.html`))).toBe(true);
    }
    expect(fs.existsSync(path.join(site, 'help', 'index.html'))).toBe(true);
  });
  test('the package holds the manifest, the guide and every published file', async () => {
    const parts = await readParts(fs.readFileSync(path.join(out, `lift-ledger-${version}.zip`)));
    expect(parts.get('manifest.xml')?.equals(fs.readFileSync(path.join(site, 'manifest.xml')))).toBe(true);
    expect(parts.get('INSTALL.md')?.toString('utf8')).toBe(
      fs.readFileSync(path.join(ROOT, 'docs', 'install.md'), 'utf8'),
    );
    for (const file of [
      'site/functions.js',
      'site/functions.json',
      'site/taskpane.html',
      'site/taskpane.js',
      'site/help/index.html',
      'site/assets/icon-80.png',
    ]) {
      expect({ file, present: parts.has(file) }).toEqual({ file, present: true });
    }
  });
  test('the site check catches a missing page and a wrong version', () => {
    expect(checkRelease(site, BASE, version).problems).toEqual([]);
    const broken = path.join(dir, 'broken');
    fs.cpSync(site, broken, { recursive: true });
    fs.rmSync(path.join(broken, 'help', 'DECISION.html'));
    fs.rmSync(path.join(broken, 'assets', 'icon-32.png'));
    expect(checkRelease(broken, BASE, '9.9.9').problems).toEqual([
      `manifest.xml names ${BASE}assets/icon-32.png, but the site has no assets/icon-32.png`,
      `manifest.xml names ${BASE}assets/icon-32.png, but the site has no assets/icon-32.png`,
      `manifest.xml has version ${version}.0, package.json says 9.9.9 (9.9.9.0)`,
      `functions.json: the help page of DECISION is missing (${BASE}help/DECISION.html)`,
    ]);
    expect(checkRelease(site, 'https://elsewhere.example.org/', version).problems[0]).toBe(
      `manifest.xml: ${BASE}assets/icon-32.png is not under https://elsewhere.example.org/`,
    );
  });
});

describe('the publishing workflow', () => {
  const workflow = fs.readFileSync(path.join(ROOT, '.github', 'workflows', 'publish-addin.yml'), 'utf8');
  test('runs the commands tested here, in order', () => {
    const runs = [...workflow.matchAll(/^\s*- run: (.+)$/gm)].map((m) => m[1]);
    expect(runs).toEqual(['npm ci --no-audit --no-fund', 'npm run release', 'npx jest test/release/site.test.ts']);
    expect(JSON.parse(fs.readFileSync(path.join(ROOT, 'package.json'), 'utf8')).scripts.release).toBe(
      'node scripts/release.js',
    );
    expect(fs.existsSync(path.join(ROOT, 'test', 'release', 'site.test.ts'))).toBe(true);
  });
  test('builds for the Pages address (or a set variable), publishes dist/, keeps the package', () => {
    expect(workflow).toContain(
      "ADDIN_BASE_URL: ${{ vars.ADDIN_BASE_URL || format('https://{0}.github.io/{1}/', github.repository_owner, github.event.repository.name) }}",
    );
    expect(workflow).toMatch(/uses: actions\/upload-pages-artifact@v\d+\n\s+with:\n\s+path: dist\n/);
    expect(workflow).toMatch(/uses: actions\/deploy-pages@v\d+/);
    expect(workflow).toContain('path: dist-release/*.zip');
    expect(workflow).toMatch(/permissions:\n\s+contents: read\n\s+pages: write\n\s+id-token: write/);
  });
});
