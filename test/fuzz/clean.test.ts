/**
 * The fuzzer over the built bundle finds nothing (issue 10, pt 4): a seeded run of 3,000 calls over every
 * registered worksheet function (dist/functions.js, which the test setup builds when stale), each call in
 * a child process with a watchdog, checked as `npm run fuzz` checks them (fuzz/checks.js). A failure lists
 * every finding with its reproduction, so it can be replayed with `node fuzz/run.js --formula '…'`.
 *
 * The long runs (20,000 calls, two seeds) are `npm run fuzz -- --seed S`; their figures are in the README.
 * About 40–60 s on a quiet 2-core machine (about 3 ms of CPU per call on median, up to the 1 s budget).
 */
import { execFile } from 'child_process';
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';

const ROOT = path.join(__dirname, '..', '..');
const RUN = path.join(ROOT, 'fuzz', 'run.js');
const BUNDLE = path.join(ROOT, 'dist', 'functions.js');

/** The seed and the number of calls of this run; same seed, same calls (fuzz/random.js). */
const SEED = 'npm test';
const CALLS = 3000;

/**
 * Kinds left to the work budgets of issue 10 pt 2 (a call over 1 s of CPU, a call over 50 MB): they are
 * being fixed on their own branch, and a loaded test machine stretches CPU times too. The long runs and
 * `npm run bench` hold them; every other kind must be absent here.
 */
const BUDGET_KINDS = new Set(['timeout', 'memory']);

interface Group {
  kind: string;
  fn: string;
  detail: string;
  count: number;
  examples: { formula: string; outcome: string; notes?: string[] }[];
}
interface Report {
  settings: { seed: string | number; calls: number };
  groups: Group[];
  functions: { id: string; calls: number }[];
  functionsFuzzed: number;
}

function run(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    execFile(process.execPath, [RUN, ...args], { cwd: ROOT, maxBuffer: 64 * 1024 * 1024 }, (error, stdout, stderr) => {
      const code = error ? Number((error as NodeJS.ErrnoException & { code?: unknown }).code ?? 1) : 0;
      resolve({ code: Number.isInteger(code) ? code : 1, stdout, stderr });
    });
  });
}

describe('the fuzzer over the built bundle', () => {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'lift-ledger-fuzz-clean-'));
  afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

  it(`finds nothing in ${CALLS} seeded calls over every registered function`, async () => {
    const json = path.join(dir, 'report.json');
    const result = await run(
      ['--bundle', BUNDLE, '--seed', SEED, '--calls', String(CALLS), '--jobs', '2'].concat([
        '--no-shrink',
        '--json',
        json,
        '--quiet',
      ]),
    );
    expect(result.stderr).toBe('');
    expect([0, 1]).toContain(result.code); // 2 would mean the fuzzer could not run
    const report = JSON.parse(fs.readFileSync(json, 'utf8')) as Report;
    // every call was made, over every function the bundle registers
    expect(report.functions.reduce((n, f) => n + f.calls, 0)).toBe(CALLS);
    expect(report.functionsFuzzed).toBeGreaterThanOrEqual(29);
    const findings = report.groups
      .filter((g) => !BUDGET_KINDS.has(g.kind))
      .map((g) =>
        [`${g.kind} in ${g.fn} (${g.count} calls): ${g.detail}`]
          .concat(
            g.examples.map((e) => `  ${e.formula} → ${e.outcome}${e.notes?.length ? ` (${e.notes.join('; ')})` : ''}`),
          )
          .join('\n'),
      );
    expect(findings.join('\n\n')).toBe('');
  }, 900_000);
});
