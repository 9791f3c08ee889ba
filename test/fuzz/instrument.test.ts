/**
 * The fuzzer as an instrument: `node fuzz/run.js` over a fixture bundle whose functions each carry one
 * planted defect (test/fuzz/fixtures/functions.js) must find every one of them, name it with its kind and
 * a formula that reproduces it, keep going after a child hangs or dies, and exit 1. A replayed
 * reproduction must fail the same way; a usage mistake exits 2 with a plain message.
 */
import { execFile } from 'child_process';
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';

const ROOT = path.join(__dirname, '..', '..');
const RUN = path.join(ROOT, 'fuzz', 'run.js');
const FIXTURE = path.join(__dirname, 'fixtures', 'functions.js');

interface Group {
  kind: string;
  fn: string;
  functions: Record<string, number>;
  detail: string;
  count: number;
  examples: { fn: string; formula: string; outcome: string }[];
  minimal?: { formula: string; outcome: string };
}
interface Report {
  settings: { seed: number; calls: number };
  groups: Group[];
  functions: { id: string; calls: number }[];
  failed: boolean;
  respawns: number;
}

function fuzz(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    execFile(process.execPath, [RUN, ...args], { cwd: ROOT, maxBuffer: 64 * 1024 * 1024 }, (error, stdout, stderr) => {
      const code = error ? Number((error as NodeJS.ErrnoException & { code?: unknown }).code ?? 1) : 0;
      resolve({ code: Number.isInteger(code) ? code : 1, stdout, stderr });
    });
  });
}

describe('fuzzer as an instrument (planted defects in a fixture bundle)', () => {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'lift-ledger-fuzz-'));
  afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

  it('finds each planted defect, with a reproduction, and keeps going after hangs and aborts', async () => {
    const json = path.join(dir, 'report.json');
    const run = await fuzz([
      '--bundle',
      FIXTURE,
      '--seed',
      '5',
      '--calls',
      '150',
      '--budget-ms',
      '300',
      '--jobs',
      '2',
      '--shrink-seconds',
      '60',
      '--json',
      json,
      '--quiet',
    ]);
    expect(run.code).toBe(1);
    const report = JSON.parse(fs.readFileSync(json, 'utf8')) as Report;
    const found = (kind: string, fn: string) =>
      report.groups.find((g) => g.kind === kind && g.functions[fn] !== undefined);
    const planted: [string, string][] = [
      ['abort', 'DECISION'],
      ['timeout', 'EXPECTED_LOSS'],
      ['memory', 'POSTERIOR_DENSITY'],
      ['raw', 'RATE_INTERVAL'],
      ['error-code', 'CLASSIC_SAMPLE_SIZE'],
      ['wording', 'PRIOR_FROM_MEAN'],
      ['cell', 'SRM_PVALUE'],
      ['sum-to-one', 'PROB_HIGHEST'],
      ['shape', 'PROB_HIGHEST'],
      ['order', 'LIFT_INTERVAL'],
      ['not-refused', 'POSTERIOR_MEAN'],
      ['missing', 'NOT_ASSOCIATED'],
    ];
    expect(planted.filter(([kind, fn]) => !found(kind, fn))).toEqual([]);
    expect(found('abort', 'DECISION')?.detail).toBe('Fatal JavaScript invalid size error');
    expect(found('raw', 'RATE_INTERVAL')?.detail).toBe(
      "TypeError: Cannot read properties of undefined (reading 'lower')",
    );
    expect(found('wording', 'PRIOR_FROM_MEAN')?.detail).toBe(
      'betaTailLog needs # ≤ x ≤ #, got NaN [camelCase identifier, NaN]',
    );
    // every call was run and counted, although children were killed and replaced
    expect(report.functions.reduce((n, f) => n + f.calls, 0)).toBe(150 + 1);
    expect(report.respawns).toBeGreaterThan(0);
    for (const group of report.groups.filter((g) => g.kind !== 'missing')) {
      for (const example of group.examples) expect(example.formula).toMatch(new RegExp(`^=ABTEST\\.${example.fn}\\(`));
    }
    // a minimal reproduction, replayed, fails the same way
    const minimal =
      found('order', 'LIFT_INTERVAL')?.minimal?.formula ?? found('order', 'LIFT_INTERVAL')?.examples[0]?.formula;
    const replay = await fuzz(['--bundle', FIXTURE, '--formula', minimal as string]);
    expect(replay.code).toBe(1);
    expect(replay.stdout).toContain('✗ order: lower > median');
  }, 600_000);

  it('gives the same findings for the same seed', async () => {
    let runs = 0;
    const once = async () => {
      const json = path.join(dir, `again-${++runs}.json`);
      await fuzz([
        '--bundle',
        FIXTURE,
        '--seed',
        'same',
        '--calls',
        '80',
        '--only',
        'PROB_HIGHEST,LIFT_INTERVAL,SRM_PVALUE',
        '--no-shrink',
        '--json',
        json,
        '--quiet',
      ]);
      const report = JSON.parse(fs.readFileSync(json, 'utf8')) as Report;
      return report.groups.map((g) => `${g.kind} ${g.fn} ${g.detail} ${g.count} ${g.examples[0]?.formula}`).sort();
    };
    const first = await once();
    expect(first.length).toBeGreaterThan(3);
    expect(await once()).toEqual(first);
  }, 300_000);

  it('says plainly what is wrong with how it was called', async () => {
    const unknown = await fuzz(['--bundle', FIXTURE, '--only', 'NO_SUCH_FUNCTION', '--calls', '5']);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toContain('fuzz: --only: no registered function NO_SUCH_FUNCTION');
    const missing = await fuzz(['--bundle', path.join(dir, 'nothing.js'), '--calls', '5']);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toContain('is missing: run `npm run build` first');
    const flag = await fuzz(['--calls', 'many']);
    expect(flag.code).toBe(2);
    expect(flag.stderr).toContain('fuzz: --calls must be a positive number, got many');
  }, 120_000);
});
