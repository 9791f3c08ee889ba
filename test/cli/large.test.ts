/**
 * The large-workbook path on a small instance of the generated workbook (cli/scripts/bigWorkbook.js; the
 * 50 MB measurement itself is `node cli/scripts/measure.js`, in the README, never a timed test): the log
 * sheet is streamed in and out, every formula agrees with its closed-form cached value (BDA3 §2.4 posterior
 * mean; PRIOR_FROM_MEAN's alpha = mean × strength), freeze leaves the log sheet's bytes alone. Also: the
 * progress bar draws only on a terminal, and the command works as a user runs it (node, npx).
 */
import { execFileSync, spawnSync } from 'child_process';
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { PassThrough } from 'stream';
import { REPO_ROOT, loadAddin } from '../../cli/addin';
import { auditWorkbook } from '../../cli/audit';
import { freezeWorkbook } from '../../cli/freeze';
import { ProgressBar } from '../../cli/report';
import { readParts } from './helpers/xlsxWriter';

// Reading and writing packages and running the add-in take seconds on a busy machine; jest's 5 s default is too tight.
jest.setTimeout(120_000);

// eslint-disable-next-line @typescript-eslint/no-require-imports
const generator = require('../../cli/scripts/bigWorkbook.js') as {
  writeBigWorkbook(file: string, rows: number): Promise<number>;
  readoutCount(rows: number): number;
};

let dir: string;
beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'lift-ledger-large-'));
});
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('a generated log workbook (5 200 rows)', () => {
  const rows = 5200;
  let file: string;
  beforeAll(async () => {
    file = path.join(dir, 'log.xlsx');
    await generator.writeBigWorkbook(file, rows);
  });

  test('audit: every formula agrees, progress is reported up to the planned bytes', async () => {
    const seen: [number, number][] = [];
    const report = await auditWorkbook(file, loadAddin(path.join(REPO_ROOT, 'dist')), {
      onProgress: (d, t) => seen.push([d, t]),
    });
    const formulas = generator.readoutCount(rows) * 2 + 2;
    expect(report.summary).toEqual({ formulas, agree: formulas, differ: 0, notCheckable: 0 });
    const last = seen[seen.length - 1] as [number, number];
    expect(last[0]).toBe(last[1]);
    expect(seen.every(([d, t], i) => d <= t && (i === 0 || d >= (seen[i - 1] as [number, number])[0]))).toBe(true);
  });

  test('freeze: both sheets frozen, nothing else in the log sheet changed', async () => {
    const copy = path.join(dir, 'log-copy.xlsx');
    const result = await freezeWorkbook(file, copy, { frozenAt: new Date(0), source: 'log.xlsx' });
    expect(result.frozen).toBe(generator.readoutCount(rows) * 2 + 2);
    const before = (await readParts(fs.readFileSync(file))).get('xl/worksheets/sheet2.xml')?.toString('utf8') as string;
    const after = (await readParts(fs.readFileSync(copy))).get('xl/worksheets/sheet2.xml')?.toString('utf8') as string;
    const cut = before.lastIndexOf('<row ');
    expect(after.slice(0, cut)).toBe(before.slice(0, cut));
    expect(after.slice(cut)).not.toContain('<f');
  });
});

describe('the progress bar', () => {
  function fakeStream(isTTY: boolean): { stream: NodeJS.WriteStream; written: () => string } {
    const sink = new PassThrough();
    let text = '';
    sink.on('data', (d) => (text += d));
    return {
      stream: Object.assign(sink, { isTTY, columns: 60 }) as unknown as NodeJS.WriteStream,
      written: () => text,
    };
  }
  test('draws on a terminal at most ten times a second and clears itself', () => {
    const { stream, written } = fakeStream(true);
    let now = 0;
    const bar = new ProgressBar(stream, 'auditing', () => now);
    now = 1000;
    bar.update(50, 100, 'xl/worksheets/sheet2.xml');
    now = 1050;
    bar.update(60, 100, 'xl/worksheets/sheet2.xml'); // too soon: skipped
    now = 1200;
    bar.update(100, 100, 'xl/worksheets/sheet2.xml');
    bar.clear();
    const frames = written()
      .split('\r')
      .filter((f) => f.trim() !== '');
    expect(frames.map((f) => f.trim())).toEqual([
      // cut to the terminal's 60 columns, less one
      'auditing [###############...............] 50% xl/worksheets',
      'auditing [##############################] 100% xl/worksheet',
    ]);
    expect(written().endsWith(`\r${' '.repeat(59)}\r`)).toBe(true);
  });
  test('writes nothing when stderr is a pipe or a file', () => {
    const { stream, written } = fakeStream(false);
    const bar = new ProgressBar(stream, 'auditing', () => 5000);
    bar.update(1, 2, 'x');
    bar.clear();
    expect(written()).toBe('');
  });
});

describe('the command as a user runs it', () => {
  test('bin/lift-ledger.js is executable (npx runs it directly) and package.json names it', () => {
    const pkg = JSON.parse(fs.readFileSync(path.join(REPO_ROOT, 'package.json'), 'utf8'));
    expect(pkg.bin).toEqual({ 'lift-ledger': 'bin/lift-ledger.js' });
    expect(fs.statSync(path.join(REPO_ROOT, 'bin', 'lift-ledger.js')).mode & 0o111).not.toBe(0);
  });
  test("npx lift-ledger resolves the project's own command (npm 7 and later)", () => {
    const out = execFileSync('npx', ['--no-install', 'lift-ledger', 'help'], { cwd: REPO_ROOT, encoding: 'utf8' });
    expect(out.split('\n')[0]).toBe(
      'lift-ledger — check and share saved workbooks that use the Lift Ledger add-in (no Excel needed)',
    );
  });
  test('exit code 2 and a message from the real process', () => {
    const run = spawnSync(
      process.execPath,
      [path.join(REPO_ROOT, 'bin', 'lift-ledger.js'), 'audit', path.join(dir, 'missing.xlsx'), '--no-build'],
      { encoding: 'utf8' },
    );
    expect(run.status).toBe(2);
    expect(run.stderr).toBe(`lift-ledger: ${path.join(dir, 'missing.xlsx')}: no such file\n`);
    expect(run.stdout).toBe('');
  });
});
