/**
 * `lift-ledger freeze`: the shareable copy made outside Excel. The packages are built by hand from ECMA-376
 * (helpers/xlsxWriter.ts); the checks read the copy's parts directly: every part the freeze has no reason
 * to touch (chart, drawing, styles, shared strings, other sheets, unknown parts) keeps its exact bytes, and
 * the parts it edits are well-formed and hold what ECMA-376 asks (notes: Part 1 §18.7 and a VML drawing;
 * relationships and content types: Part 2).
 */
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import { PassThrough } from 'stream';
import { REPO_ROOT, loadAddin } from '../../cli/addin';
import { auditWorkbook } from '../../cli/audit';
import { freezeWorkbook, pruneCalcChain } from '../../cli/freeze';
import { main } from '../../cli/main';
import { parseSmallXml } from '../../cli/xlsx/xml';
import { readoutBook } from './helpers/books';
import { buildXlsx, readParts, type TestBook } from './helpers/xlsxWriter';

// Reading and writing packages and running the add-in take seconds on a busy machine; jest's 5 s default is too tight.
jest.setTimeout(120_000);

let dir: string;
const AT = new Date(Date.UTC(2025, 5, 30, 14, 5));

beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'lift-ledger-freeze-'));
});
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

async function frozen(
  name: string,
  book: TestBook,
): Promise<{
  input: string;
  output: string;
  before: Map<string, Buffer>;
  after: Map<string, Buffer>;
  warnings: readonly string[];
}> {
  const input = path.join(dir, `${name}.xlsx`);
  const output = path.join(dir, `${name}-copy.xlsx`);
  fs.writeFileSync(input, await buildXlsx(book));
  const result = await freezeWorkbook(input, output, {
    frozenAt: AT,
    source: `${name}.xlsx`,
  });
  return {
    input,
    output,
    before: await readParts(fs.readFileSync(input)),
    after: await readParts(fs.readFileSync(output)),
    warnings: result.warnings,
  };
}

const text = (parts: Map<string, Buffer>, name: string): string => {
  const part = parts.get(name);
  if (!part) throw new Error(`part ${name} is missing`);
  return part.toString('utf8');
};

describe('a read-out with a chart, shared formulas, spills and a calculation chain', () => {
  let r: Awaited<ReturnType<typeof frozen>>;
  beforeAll(async () => {
    r = await frozen('readout', readoutBook({ chart: true, calcChain: true }));
  });

  test('the chart, its drawing, styles, strings, names and the other sheet keep their exact bytes', () => {
    for (const name of [
      'xl/charts/chart1.xml',
      'xl/drawings/drawing1.xml',
      'xl/drawings/_rels/drawing1.xml.rels',
      'xl/styles.xml',
      'xl/sharedStrings.xml',
      'xl/metadata.xml',
      'xl/workbook.xml',
      'xl/_rels/workbook.xml.rels',
      'xl/worksheets/sheet2.xml',
      '_rels/.rels',
    ]) {
      expect({
        name,
        same: r.after.get(name)?.equals(r.before.get(name) as Buffer),
      }).toEqual({ name, same: true });
    }
  });
  test('parts keep their order; the new notes parts come last', () => {
    const names = [...r.after.keys()];
    expect(names.slice(0, r.before.size)).toEqual([...r.before.keys()]);
    expect(names.slice(r.before.size).sort()).toEqual(['xl/comments1.xml', 'xl/drawings/vmlDrawing1.vml']);
  });

  test('ABTEST formulas are gone, values and styles stay, other formulas stay', () => {
    const sheet = text(r.after, 'xl/worksheets/sheet1.xml');
    expect(sheet).not.toMatch(/ABTEST/i);
    expect(sheet).toContain('<c r="E10"><f>SUM(Counts!B2:B3)</f><v>4780</v></c>');
    expect(sheet).toContain('<c r="B2" s="1"><v>0.02567804919894214</v></c>');
    expect(sheet).toContain('<c r="C2" s="2"><v>0.050374687760199835</v></c>');
    expect(sheet).not.toContain(' cm="');
    // A text result is no longer a formula string (t="str" needs a formula): an inline string.
    expect(sheet).toContain(
      '<c r="B23" t="inlineStr"><is><t xml:space="preserve">Choose B: its expected loss 0.0065% is within the 0.050% allowed</t></is></c>',
    );
    expect(sheet).toContain('<c r="E2" t="inlineStr"><is><t xml:space="preserve"></t></is></c>');
    // Everything outside the cells is as it was, plus the legacyDrawing after the drawing (CT_Worksheet order).
    const before = text(r.before, 'xl/worksheets/sheet1.xml');
    expect(sheet.slice(0, sheet.indexOf('<sheetData>'))).toBe(before.slice(0, before.indexOf('<sheetData>')));
    expect(sheet.slice(sheet.indexOf('</sheetData>'))).toBe(
      before.slice(before.indexOf('</sheetData>')).replace('</worksheet>', '<legacyDrawing r:id="rId3"/></worksheet>'),
    );
    expect(() => parseSmallXml(sheet, 'sheet1.xml')).not.toThrow();
  });

  test('each frozen cell has a note with its formula; A1 has the header', () => {
    const comments = parseSmallXml(text(r.after, 'xl/comments1.xml'), 'comments1.xml');
    const notes = new Map(
      comments.children[1]?.children.map((c) => [
        c.attributes.ref,
        c.children[0]?.children
          .map((run) => run.children.map((t) => (t.local === 't' ? t.text : '')).join(''))
          .join(''),
      ]),
    );
    expect(comments.children[0]?.children[0]?.text).toBe('Lift Ledger');
    expect(notes.size).toBe(16); // 15 ABTEST cells and the header on A1
    expect(notes.get('A1')).toBe(
      'Frozen copy made 2025-06-30 14:05 UTC from readout.xlsx: 15 Lift Ledger results are plain values; each keeps the formula that computed it in a note. New data will not change them.',
    );
    expect(notes.get('B2')).toBe(
      'Computed by =ABTEST.PROB_HIGHEST(Counts!C2:C3,Counts!B2:B3) (its result filled B2:B3).\nFrozen 2025-06-30 14:05 UTC: a plain value now, it no longer updates.',
    );
    expect(notes.get('G6')).toMatch(/^Computed by =ABTEST\.POSTERIOR_MEAN\('Counts'!C3,'Counts'!B3\)\./);
    const vml = text(r.after, 'xl/drawings/vmlDrawing1.vml');
    const rows = [...vml.matchAll(/<x:Row>(\d+)<\/x:Row><x:Column>(\d+)<\/x:Column>/g)].map((m) => `${m[1]},${m[2]}`);
    expect(rows).toHaveLength(16);
    expect(rows).toContain('0,0');
    expect(rows).toContain('1,1'); // B2
    expect(new Set([...vml.matchAll(/id="(_x0000_s\d+)"/g)].map((m) => m[1])).size).toBe(16);
  });

  test('relationships and content types declare the new parts', () => {
    const rels = text(r.after, 'xl/worksheets/_rels/sheet1.xml.rels');
    expect(rels).toContain(
      'Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/comments" Target="../comments1.xml"',
    );
    expect(rels).toContain(
      '<Relationship Id="rId3" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/vmlDrawing" Target="../drawings/vmlDrawing1.vml"/>',
    );
    const types = text(r.after, '[Content_Types].xml');
    expect(types).toContain(
      '<Default Extension="vml" ContentType="application/vnd.openxmlformats-officedocument.vmlDrawing"/>',
    );
    expect(types).toContain(
      '<Override PartName="/xl/comments1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.comments+xml"/>',
    );
  });

  test('the calculation chain keeps only formula cells', () => {
    expect(text(r.after, 'xl/calcChain.xml')).toMatch(/<calcChain [^>]*><c r="E10" i="1"\/><\/calcChain>$/);
  });

  test('the copy has no ABTEST formula left for the audit; the input is unchanged', async () => {
    const report = await auditWorkbook(r.output, loadAddin(path.join(REPO_ROOT, 'dist')));
    expect(report.summary.formulas).toBe(0);
    expect(
      (await readParts(fs.readFileSync(r.input)))
        .get('xl/worksheets/sheet1.xml')
        ?.equals(r.before.get('xl/worksheets/sheet1.xml') as Buffer),
    ).toBe(true);
  });
  test('freezing the copy again changes nothing', async () => {
    const again = path.join(dir, 'readout-copy-2.xlsx');
    const result = await freezeWorkbook(r.output, again, {
      frozenAt: AT,
      source: 'readout-copy.xlsx',
    });
    expect(result.frozen).toBe(0);
    const parts = await readParts(fs.readFileSync(again));
    for (const [name, bytes] of r.after)
      expect({ name, same: parts.get(name)?.equals(bytes) }).toEqual({
        name,
        same: true,
      });
  });
  test('a result saved as #NAME? is reported', () => {
    expect(r.warnings).toEqual([
      'Read-out!B24 was saved as #NAME? (calculated without the add-in); the copy keeps #NAME?',
    ]);
  });
});

describe('existing notes, prefixed cells, a chain with nothing left', () => {
  test("a reader's notes are kept; ours are appended or added beside them", async () => {
    const book: TestBook = {
      sheets: [
        {
          name: 'S',
          notes: { B2: 'Checked with finance', D9: 'Unrelated note' },
          cells: [
            { ref: 'A1', value: 'x' },
            {
              ref: 'B2',
              formula: 'ABTEST.PRIOR_FROM_MEAN(0.05,200)',
              array: 'B2:C2',
              dynamic: true,
              value: 10,
            },
            { ref: 'C2', value: 190 },
          ],
        },
      ],
    };
    const r = await frozen('notes', book);
    const comments = text(r.after, 'xl/comments1.xml');
    expect(comments).toContain('<authors><author>A. Analyst</author><author>Lift Ledger</author></authors>');
    expect(comments).toMatch(
      /<comment ref="B2" authorId="0"><text><t>Checked with finance<\/t><r>.*<t xml:space="preserve">\n\nComputed by =ABTEST\.PRIOR_FROM_MEAN\(0\.05,200\)/s,
    );
    expect(comments).toContain('<comment ref="D9" authorId="0"><text><t>Unrelated note</t></text></comment>');
    expect(comments).toMatch(
      /<comment ref="A1" authorId="1"><text><r>.*Frozen copy made 2025-06-30 14:05 UTC from notes\.xlsx: 1 Lift Ledger result is a plain value;/s,
    );
    const vml = text(r.after, 'xl/drawings/vmlDrawing1.vml');
    // Two shapes were there (B2, D9); one is added for A1; no new part, no new relationship.
    expect([...vml.matchAll(/<v:shape /g)]).toHaveLength(3);
    expect(new Set([...vml.matchAll(/id="(_x0000_s\d+)"/g)].map((m) => m[1])).size).toBe(3);
    expect([...r.after.keys()]).toEqual([...r.before.keys()]);
    expect(
      r.after
        .get('xl/worksheets/_rels/sheet1.xml.rels')
        ?.equals(r.before.get('xl/worksheets/_rels/sheet1.xml.rels') as Buffer),
    ).toBe(true);
    expect(() => parseSmallXml(comments, 'comments1.xml')).not.toThrow();
  });

  test('prefixed SpreadsheetML (x:c) and a chain that empties: the chain part and its declarations go', async () => {
    const r = await frozen('prefixed', {
      prefixed: true,
      calcChain: true,
      sheets: [
        {
          name: 'S',
          cells: [
            {
              ref: 'B2',
              formula: 'ABTEST.SRM_PVALUE({50410;49590})',
              value: 0.0095124048725033702,
            },
            {
              ref: 'C2',
              formula: 'ABTEST.DECISION({120;150},{2400;2380})',
              value: 'Choose B',
            },
          ],
        },
      ],
    });
    const sheet = text(r.after, 'xl/worksheets/sheet1.xml');
    expect(sheet).toContain('<x:c r="C2" t="inlineStr"><x:is><x:t xml:space="preserve">Choose B</x:t></x:is></x:c>');
    expect(sheet).toContain(`<x:legacyDrawing r:id="rId2"/></x:worksheet>`);
    expect(r.after.has('xl/calcChain.xml')).toBe(false);
    expect(text(r.after, '[Content_Types].xml')).not.toContain('calcChain');
    expect(text(r.after, 'xl/_rels/workbook.xml.rels')).not.toContain('calcChain');
  });

  test('pruning keeps the sheet of the next entry when the removed one named it', () => {
    const chain = '<calcChain><c r="A1" i="2"/><c r="B1"/><c r="A1" i="1"/></calcChain>';
    expect(pruneCalcChain(chain, new Map([['2', new Set(['A1'])]]))).toBe(
      '<calcChain><c r="B1" i="2"/><c r="A1" i="1"/></calcChain>',
    );
    expect(
      pruneCalcChain('<calcChain><c r="A1" i="1"/></calcChain>', new Map([['1', new Set(['A1'])]])),
    ).toBeUndefined();
  });

  test('an unknown part and a defined name using ABTEST: the part is copied, the name reported', async () => {
    const r = await frozen('extra', {
      sheets: [
        {
          name: 'S',
          cells: [
            {
              ref: 'B2',
              formula: 'ABTEST.SRM_PVALUE({50410;49590})',
              value: 0.0095,
            },
          ],
        },
      ],
      definedNames: [{ name: 'split_check', formula: 'ABTEST.SRM_PVALUE(S!$A$1:$A$2)' }],
      extraParts: [
        {
          name: 'customXml/item1.xml',
          content: '<data xmlns="urn:example:lift-ledger-test">kept as is</data>',
          contentType: 'application/xml',
        },
      ],
    });
    expect(text(r.after, 'customXml/item1.xml')).toBe('<data xmlns="urn:example:lift-ledger-test">kept as is</data>');
    expect(r.warnings).toEqual([
      'the defined name split_check uses ABTEST (ABTEST.SRM_PVALUE(S!$A$1:$A$2)); names are left as they are and show #NAME? without the add-in',
    ]);
  });
});

describe('the command line', () => {
  async function run(argv: string[]): Promise<{ code: number; out: string; err: string }> {
    const stdout = new PassThrough();
    const stderr = new PassThrough();
    let out = '';
    let err = '';
    stdout.on('data', (d) => (out += d));
    stderr.on('data', (d) => (err += d));
    const code = await main(argv, {
      stdout,
      stderr: stderr as unknown as NodeJS.WriteStream,
      now: () => AT,
    });
    return { code, out, err };
  }

  test('writes the copy, refuses to replace a file without --force, never writes over its input', async () => {
    const input = path.join(dir, 'cli.xlsx');
    const output = path.join(dir, 'cli-copy.xlsx');
    fs.writeFileSync(input, await buildXlsx(readoutBook()));
    const first = await run(['freeze', input, '-o', output]);
    expect(first.code).toBe(0);
    expect(first.out).toContain(`Wrote ${output}: 15 ABTEST results frozen as values on 1 sheet.`);
    expect(first.out).toContain('  Read-out: 15 results, 16 notes added');
    expect(await run(['freeze', input, '-o', output])).toMatchObject({
      code: 2,
      err: `lift-ledger: ${output} exists; use --force to replace it\nRun \`lift-ledger help\` for usage.\n`,
    });
    expect((await run(['freeze', input, '-o', output, '--force'])).code).toBe(0);
    expect(await run(['freeze', input, '-o', input, '--force'])).toMatchObject({
      code: 2,
      err: expect.stringContaining(
        'the copy must be a different file from the workbook: freeze never changes its input',
      ),
    });
    expect(await run(['freeze', input])).toMatchObject({
      code: 2,
      err: expect.stringContaining('freeze needs the copy to write'),
    });
    expect(fs.readdirSync(dir).filter((f) => f.endsWith('.partial'))).toEqual([]);
  });
  test('a file that is not a workbook leaves no copy behind', async () => {
    const input = path.join(dir, 'notes.txt');
    fs.writeFileSync(input, 'not a workbook');
    const output = path.join(dir, 'never.xlsx');
    const res = await run(['freeze', input, '-o', output]);
    expect(res.code).toBe(2);
    expect(res.err).toMatch(/notes\.txt is not a workbook file \(\.xlsx\)/);
    expect(fs.existsSync(output)).toBe(false);
  });
});
