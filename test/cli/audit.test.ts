/**
 * `lift-ledger audit` on workbooks built by hand (test/cli/helpers): the saved values come from outside
 * the project (scipy, R, closed forms; see helpers/books.ts), and the add-in's built functions
 * (dist/functions.js, needs `npm run build`) recompute them.
 */
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { PassThrough } from 'stream';
import { REPO_ROOT, builtState, loadAddin, type AddinFunctions } from '../../cli/addin';
import { auditWorkbook, type AuditEntry, type AuditReport } from '../../cli/audit';
import { main } from '../../cli/main';
import { MEAN_A, MEAN_B, REFERENCE_TOLERANCE, readoutBook, two } from './helpers/books';
import { buildXlsx, xlsxParts, zipParts, type TestBook } from './helpers/xlsxWriter';

// Reading and writing packages and running the add-in take seconds on a busy machine; jest's 5 s default is too tight.
jest.setTimeout(120_000);

let dir: string;
let addin: AddinFunctions;

beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'lift-ledger-audit-'));
  addin = loadAddin(path.join(REPO_ROOT, 'dist'));
});
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

async function write(name: string, book: TestBook): Promise<string> {
  const file = path.join(dir, name);
  fs.writeFileSync(file, await buildXlsx(book));
  return file;
}

function entry(report: AuditReport, cell: string, sheet = 'Read-out'): AuditEntry {
  const found = report.entries.find((e) => e.cell === cell && e.sheet === sheet);
  if (!found) throw new Error(`no audit entry for ${sheet}!${cell}`);
  return found;
}

/** Runs the command in-process; returns its exit code and what it wrote. */
async function run(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  const stdout = new PassThrough();
  const stderr = new PassThrough() as unknown as NodeJS.WriteStream;
  let out = '';
  let err = '';
  stdout.on('data', (d) => (out += d));
  (stderr as unknown as PassThrough).on('data', (d: Buffer) => (err += d));
  const code = await main(argv, { stdout, stderr });
  return { code, out, err };
}

describe('a workbook whose saved values are right', () => {
  let report: AuditReport;
  beforeAll(async () => {
    report = await auditWorkbook(await write('readout.xlsx', readoutBook({ chart: true, calcChain: true })), addin, {
      tolerance: REFERENCE_TOLERANCE,
    });
  });

  test('every checkable ABTEST formula agrees with scipy, R and the closed forms', () => {
    expect(report.summary).toEqual({
      formulas: 15,
      agree: 12,
      differ: 0,
      notCheckable: 3,
    });
  });
  test('spills are compared cell by cell, including the empty control slots', () => {
    expect(entry(report, 'D2')).toMatchObject({
      status: 'agrees',
      spill: 'D2:F3',
      compared: 6,
      function: 'LIFT_INTERVAL',
    });
    expect(entry(report, 'B2')).toMatchObject({
      status: 'agrees',
      spill: 'B2:B3',
      compared: 2,
      formula: '=ABTEST.PROB_HIGHEST(Counts!C2:C3,Counts!B2:B3)',
    });
  });
  test('all three spellings are recognised', () => {
    expect(entry(report, 'B2').function).toBe('PROB_HIGHEST'); // _xldudf_ABTEST_PROB_HIGHEST(
    expect(entry(report, 'C2').function).toBe('POSTERIOR_MEAN'); // ABTEST.POSTERIOR_MEAN(
    expect(entry(report, 'B5').function).toBe('PROB_LIFT_ABOVE'); // _xll.ABTEST.PROB_LIFT_ABOVE(
  });
  test('arguments from defined names, spilled prior cells, array constants, omitted optionals and shared formulas', () => {
    for (const cell of ['B17', 'B10', 'B13', 'B14', 'G5', 'G6']) expect(entry(report, cell).status).toBe('agrees');
    expect(entry(report, 'G6').formula).toBe("=ABTEST.POSTERIOR_MEAN('Counts'!C3,'Counts'!B3)");
  });
  test('not checkable, each with its reason', () => {
    expect(entry(report, 'B20').reason).toBe(
      'argument 1 (conversions) is an expression (Counts!C2:C3*1); only cell ranges, defined names and constants are recomputed',
    );
    expect(entry(report, 'B22').reason).toBe(
      'the ABTEST call is part of a larger formula; only a formula that is one ABTEST call is recomputed',
    );
    expect(entry(report, 'B24').reason).toBe(
      'the saved result is #NAME?: the workbook was last calculated where the add-in was not loaded',
    );
  });
  test('with no tolerance at all the scipy references differ in the last digits: the comparison is real', async () => {
    const strict = await auditWorkbook(path.join(dir, 'readout.xlsx'), addin, {
      tolerance: 0,
    });
    // Closed forms and R agree exactly or to the last bits; scipy's quadrature does not.
    expect(strict.summary.differ).toBeGreaterThan(0);
    expect(entry(strict, 'B8').status).toBe('agrees'); // PRIOR_FROM_MEAN: 10, 190 exactly
  });
});

describe('a workbook whose argument changed after it was calculated', () => {
  let report: AuditReport;
  beforeAll(async () => {
    report = await auditWorkbook(await write('changed.xlsx', readoutBook({ visitorsB: 2000 })), addin, {
      tolerance: REFERENCE_TOLERANCE,
    });
  });
  test('the formulas that read Counts!B3 differ, with both values', () => {
    const mean = entry(report, 'C2');
    expect(mean.status).toBe('differs');
    // Closed form with the changed input: (1 + 150) / (2 + 2000).
    expect(mean.differences).toEqual([{ cell: 'C3', saved: MEAN_B, recomputed: 151 / 2002 }]);
    expect(entry(report, 'B2').differences.map((d) => d.cell)).toEqual(['B2', 'B3']);
    expect(entry(report, 'B23').differences[0]?.saved).toBe(
      'Choose B: its expected loss 0.0065% is within the 0.050% allowed',
    );
  });
  test('formulas that do not read B3 still agree', () => {
    expect(entry(report, 'G5').status).toBe('agrees');
    expect(entry(report, 'B13').status).toBe('agrees');
    expect(entry(report, 'G6').differences).toEqual([{ cell: 'G6', saved: MEAN_B, recomputed: 151 / 2002 }]);
  });
  test('exit code 1, and the JSON report carries the same', async () => {
    const file = path.join(dir, 'changed.xlsx');
    const text = await run(['audit', file, '--tolerance', String(REFERENCE_TOLERANCE), '--no-build']);
    expect(text.code).toBe(1);
    expect(text.out).toContain(
      'Read-out!C2  =ABTEST.POSTERIOR_MEAN(Counts!$C$2:$C$3,Counts!$B$2:$B$3)  DIFFERS (2 cells, C2:C3)',
    );
    expect(text.out).toContain(`C3: saved ${MEAN_B}, recomputed ${151 / 2002}`);
    const json = await run(['audit', file, '--json', '--tolerance', String(REFERENCE_TOLERANCE), '--no-build']);
    expect(json.code).toBe(1);
    const parsed = JSON.parse(json.out);
    expect(parsed.summary).toEqual(report.summary);
    expect(parsed.formulas.find((f: AuditEntry) => f.cell === 'C2').differences).toEqual([
      { cell: 'C3', saved: MEAN_B, recomputed: 151 / 2002 },
    ]);
  });
});

describe('cell types: shared and inline strings, booleans, errors', () => {
  const book: TestBook = {
    sheets: [
      {
        name: 'Odd cells',
        cells: [
          { ref: 'A1', value: 2400 },
          { ref: 'A2', value: true },
          { ref: 'B1', value: 120 },
          { ref: 'B2', value: 150 },
          { ref: 'C1', value: { error: '#N/A' } },
          { ref: 'C2', value: 2380 },
          { ref: 'D1', value: 'central', stringAs: 's' },
          { ref: 'D2', value: 'hdi', stringAs: 'inlineStr' },
          // TRUE among the visitors: the function's own #VALUE! (the sheet layer's input policy).
          {
            ref: 'F1',
            formula: 'ABTEST.POSTERIOR_MEAN(B1:B2,A1:A2)',
            array: 'F1:F2',
            dynamic: true,
            value: { error: '#VALUE!' },
          },
          // An error in an argument: Excel passes it on without calling the function (as the preview does).
          {
            ref: 'G1',
            formula: 'ABTEST.POSTERIOR_MEAN(B1:B2,C1:C2)',
            value: { error: '#N/A' },
          },
          // The method from a shared string and from an inline string.
          {
            ref: 'H1',
            formula: 'ABTEST.RATE_INTERVAL(B1,A1,0.95,,,D1)',
            array: 'H1:I1',
            dynamic: true,
            value: addinRate('central', 0),
          },
          { ref: 'I1', value: addinRate('central', 1) },
          {
            ref: 'H2',
            formula: 'ABTEST.RATE_INTERVAL(B1,A1,0.95,,,D2)',
            array: 'H2:I2',
            dynamic: true,
            value: addinRate('hdi', 0),
          },
          { ref: 'I2', value: addinRate('hdi', 1) },
        ],
      },
    ],
  };
  function addinRate(method: 'central' | 'hdi', end: 0 | 1): number {
    const refs = JSON.parse(
      fs.readFileSync(path.join(REPO_ROOT, 'test', 'reference', 'addin/addin_values.json'), 'utf8'),
    ).conversionTwo;
    return (method === 'central' ? refs.rateIntervalCentral : refs.rateIntervalHdi)[0][end];
  }
  test('each is read as the function sees it', async () => {
    const report = await auditWorkbook(await write('odd.xlsx', book), addin, {
      tolerance: REFERENCE_TOLERANCE,
    });
    const f1 = entry(report, 'F1', 'Odd cells');
    expect(f1.status).toBe('agrees');
    expect(f1.errorMessage).toMatch(/^visitors, item 2: TRUE/);
    expect(entry(report, 'G1', 'Odd cells')).toMatchObject({
      status: 'agrees',
      errorMessage: 'an argument holds #N/A, which Excel returns without calling the function',
    });
    expect(entry(report, 'H1', 'Odd cells').status).toBe('agrees');
    expect(entry(report, 'H2', 'Odd cells').status).toBe('agrees');
  });
});

describe('files the audit must refuse or handle', () => {
  test('a prefixed SpreadsheetML (x:c cells) reads the same', async () => {
    const file = await write('prefixed.xlsx', {
      ...readoutBook(),
      prefixed: true,
    });
    const report = await auditWorkbook(file, addin, {
      tolerance: REFERENCE_TOLERANCE,
    });
    expect(report.summary).toEqual({
      formulas: 15,
      agree: 12,
      differ: 0,
      notCheckable: 3,
    });
  });
  test('a workbook without ABTEST formulas agrees trivially (exit 0) and says so', async () => {
    const file = await write('plain.xlsx', {
      sheets: [
        {
          name: 'S',
          cells: [
            { ref: 'A1', value: 1 },
            { ref: 'A2', formula: 'A1*2', value: 2 },
          ],
        },
      ],
    });
    const result = await run(['audit', file, '--no-build']);
    expect(result.code).toBe(0);
    expect(result.out).toContain('no ABTEST formulas found');
  });
  test('a spill saved larger or smaller than the result differs with a reason', async () => {
    const file = await write('spill.xlsx', {
      sheets: [
        {
          name: 'S',
          cells: [
            {
              ref: 'A1',
              formula: 'ABTEST.PRIOR_FROM_MEAN(0.05,200)',
              array: 'A1:A1',
              value: 10,
            },
            {
              ref: 'B5',
              formula: 'ABTEST.PRIOR_FROM_MEAN(0.05,200)',
              array: 'B5:D5',
              dynamic: true,
              value: 10,
            },
            { ref: 'C5', value: 190 },
          ],
        },
      ],
    });
    const report = await auditWorkbook(file, addin);
    expect(entry(report, 'A1', 'S')).toMatchObject({
      status: 'agrees',
      reason: 'the function returns 1×2 cells, but the file stores it in one cell; only the first value was compared',
    });
    // D5 lies in the saved range but the result has two columns: Excel shows #N/A there for a legacy array.
    expect(entry(report, 'B5', 'S').differences).toEqual([{ cell: 'D5', saved: null, recomputed: { error: '#N/A' } }]);
  });
  test('usage and file problems: exit code 2 with a message', async () => {
    expect(await run(['audit'])).toMatchObject({
      code: 2,
      err: expect.stringContaining('audit needs a workbook file (.xlsx)'),
    });
    expect(await run(['frobnicate', 'x.xlsx'])).toMatchObject({
      code: 2,
      err: expect.stringContaining('unknown command "frobnicate"'),
    });
    expect(await run(['audit', 'x.xlsx', '--tolerance', 'lots'])).toMatchObject({
      code: 2,
      err: expect.stringContaining('--tolerance must be a number'),
    });
    const missing = path.join(dir, 'nope.xlsx');
    expect(await run(['audit', missing, '--no-build'])).toMatchObject({
      code: 2,
      err: `lift-ledger: ${missing}: no such file\n`,
    });
    const notZip = path.join(dir, 'text.xlsx');
    fs.writeFileSync(notZip, 'visitors,conversions\n2400,120\n');
    const res = await run(['audit', notZip, '--no-build']);
    expect(res.code).toBe(2);
    expect(res.err).toMatch(/^lift-ledger: .*text\.xlsx is not a workbook file \(\.xlsx\): /);
    const parts = xlsxParts(readoutBook());
    parts.delete('xl/workbook.xml');
    const broken = path.join(dir, 'broken.xlsx');
    fs.writeFileSync(broken, await zipParts(parts));
    expect((await run(['audit', broken, '--no-build'])).err).toBe(
      'lift-ledger: the package names the workbook part xl/workbook.xml, but it is missing\n',
    );
  });
  test('--addin with a folder that holds no build', async () => {
    const res = await run(['audit', path.join(dir, 'plain.xlsx'), '--addin', dir]);
    expect(res).toMatchObject({
      code: 2,
      err: `lift-ledger: ${path.join(dir, 'functions.js')} is missing: run \`npm run build\` first\n`,
    });
  });
});

test('the closed forms the books use match scipy (BDA3 §2.4 posterior mean with a uniform prior)', () => {
  const refs = JSON.parse(
    fs.readFileSync(path.join(REPO_ROOT, 'test', 'reference', 'addin/addin_values.json'), 'utf8'),
  ).conversionTwo;
  expect(MEAN_A).toBeCloseTo(refs.posteriorMean[0], 15);
  expect(MEAN_B).toBeCloseTo(refs.posteriorMean[1], 15);
  expect(two.probHighest[0]! + two.probHighest[1]!).toBeCloseTo(1, 12);
});

describe('the add-in build the audit runs', () => {
  test('dist/ older than the function sources is stale; --no-build then stops with a clear message', async () => {
    const js = path.join(REPO_ROOT, 'dist', 'functions.js');
    const { atime, mtime } = fs.statSync(js);
    fs.utimesSync(js, new Date(0), new Date(0));
    try {
      expect(builtState(path.join(REPO_ROOT, 'dist'))).toBe('stale');
      const res = await run(['audit', path.join(dir, 'plain.xlsx'), '--no-build']);
      expect(res).toMatchObject({
        code: 2,
        err: 'lift-ledger: dist/functions.js is older than the sources in functions/: run `npm run build` (or leave out --no-build to build it now)\n',
      });
    } finally {
      fs.utimesSync(js, atime, mtime);
    }
    expect(builtState(path.join(REPO_ROOT, 'dist'))).toBeUndefined();
    expect(builtState(dir)).toBe('missing');
  });
});
