/**
 * Help pages and icons, build-free. The pages are generated from the wrappers' JSDoc (functions/wrappers/)
 * by help/build.js; these tests check that every catalogue function has a complete page and that the page
 * agrees with the metadata Excel shows (same source, so they cannot drift) and with the catalogue's rules. Icons are checked as PNG
 * files against the PNG specification (W3C, 2nd ed.): signature, IHDR, CRCs, and the pixel data size.
 */
import * as zlib from 'zlib';
import { generateCustomFunctionsMetadata } from 'custom-functions-metadata';
import { CATALOGUE_LIST } from '../../functions/catalogue';
import { describeParam } from '../../functions/sheet/entry';

interface FunctionDoc {
  id: string;
  description: string;
  params: { name: string; optional: boolean; text: string }[];
  returns: string;
  method: string;
  source: string;
  examples: string[];
  crosschecks: string[];
  cautions: string[];
  helpUrl: string;
}
/* eslint-disable @typescript-eslint/no-require-imports */
const help = require('../../help/build') as {
  wrapperFiles(): string[];
  readFunctionDocs(): FunctionDoc[];
  buildHelpPages(): Map<string, string>;
  parseExample(e: string): { formula: string; result?: string; words?: string };
  signature(doc: FunctionDoc): string;
};
const icons = require('../../manifest/icons') as {
  ICON_SIZES: number[];
  drawIcon(size: number): Buffer;
  crc32(b: Buffer): number;
};
/* eslint-enable @typescript-eslint/no-require-imports */

const docs = help.readFunctionDocs();
const pages = help.buildHelpPages();

test('one page per function plus an index that links every page', () => {
  expect(docs).toHaveLength(CATALOGUE_LIST.length);
  expect(pages.size).toBe(CATALOGUE_LIST.length + 1);
  const index = pages.get('index.html') ?? '';
  for (const d of docs) {
    expect(pages.has(`${d.id}.html`)).toBe(true);
    expect(index).toContain(`href="${d.id}.html"`);
  }
});

test('the pages agree with the generated metadata: description, parameters, help URL', async () => {
  const generated = await generateCustomFunctionsMetadata(help.wrapperFiles(), false);
  const metadata = (
    JSON.parse(generated.metadataJson) as {
      functions: {
        id: string;
        description: string;
        helpUrl: string;
        parameters: { name: string; optional?: boolean; description: string }[];
      }[];
    }
  ).functions;
  for (const m of metadata) {
    const d = docs.find((x) => x.id === m.id) as FunctionDoc;
    expect(d.description).toBe(m.description);
    expect(d.helpUrl).toBe(m.helpUrl);
    expect(d.params.map((p) => [p.name, p.optional, p.text])).toEqual(
      m.parameters.map((p) => [p.name, p.optional ?? false, p.description]),
    );
  }
}, 60000);

describe.each(docs.map((d) => [d.id, d] as const))('%s', (id, d) => {
  test('has what it computes, the method, a published source, an example and cautions', () => {
    expect(d.description.length).toBeGreaterThan(40);
    expect(d.returns.length).toBeGreaterThan(10);
    expect(d.method.length).toBeGreaterThan(30);
    expect(d.source.length).toBeGreaterThan(15);
    expect(d.examples.length).toBeGreaterThan(0);
    const page = pages.get(`${id}.html`) ?? '';
    for (const heading of [
      'Syntax',
      'Arguments',
      'Result',
      'Example',
      'How it is computed',
      'Published source',
      'Cautions',
    ]) {
      expect({ id, heading, present: page.includes(`<h2>${heading}</h2>`) }).toEqual({ id, heading, present: true });
    }
    expect(page).toContain('qualified statistician');
  });

  test('its example is a formula of this function', () => {
    for (const e of d.examples) expect(help.parseExample(e).formula.startsWith(`=ABTEST.${id}(`)).toBe(true);
  });

  test('the syntax line lists the parameters with optional ones bracketed', () => {
    const page = pages.get(`${id}.html`) ?? '';
    const sig = help.signature(d);
    expect(page).toContain(sig.replace(/&/g, '&amp;'));
    expect(sig).toBe(`=ABTEST.${id}(${d.params.map((p) => (p.optional ? `[${p.name}]` : p.name)).join(', ')})`);
  });
});

test("each page states every argument's allowed values, as the catalogue's rules describe them", () => {
  for (const entry of CATALOGUE_LIST) {
    const page = pages.get(`${entry.id}.html`) ?? '';
    for (const p of entry.params) {
      const words = describeParam(p, entry)
        .replace(/&/g, '&amp;')
        .replace(/</g, '&lt;')
        .replace(/>/g, '&gt;')
        .replace(/"/g, '&quot;');
      expect({ id: entry.id, name: p.name, stated: page.includes(`<td>${words}</td>`) }).toEqual({
        id: entry.id,
        name: p.name,
        stated: true,
      });
    }
  }
  // spot check of the words themselves (rules.ts): a level is a fraction strictly between 0 and 1
  expect(pages.get('RATE_INTERVAL.html')).toContain('<td>a number from 0.01 to 0.9999; default 0.95</td>');
});

test('cross-checks with built-in formulas are given where the catalogue promises one', () => {
  const withCrosscheck = docs.filter((d) => d.crosschecks.length > 0).map((d) => d.id);
  for (const id of ['POSTERIOR_MEAN', 'RATE_INTERVAL', 'SRM_PVALUE', 'CLASSIC_SAMPLE_SIZE'])
    expect(withCrosscheck).toContain(id);
  expect(docs.find((d) => d.id === 'RATE_INTERVAL')?.crosschecks.join(' ')).toContain('BETA.INV(0.025');
  expect(docs.find((d) => d.id === 'SRM_PVALUE')?.crosschecks.join(' ')).toContain('CHISQ.TEST');
  expect(docs.find((d) => d.id === 'CLASSIC_SAMPLE_SIZE')?.crosschecks.join(' ')).toContain('NORM.S.INV');
});

test('cautions cover peeking, broken splits, prior sensitivity and many variants somewhere', () => {
  const all = docs.flatMap((d) => d.cautions).join(' ') + (pages.get('index.html') ?? '');
  expect(all).toMatch(/peeking/);
  expect(all).toMatch(/split/);
  expect(all).toMatch(/prior/);
  expect(all).toMatch(/many variants/i);
});

test('text is escaped in the pages', () => {
  const page = pages.get('PROB_ABOVE_CONTROL.html') ?? '';
  expect(page).toContain('P(B &gt; A)');
  expect(page).not.toContain('P(B > A)');
});

describe('icons', () => {
  test.each(icons.ICON_SIZES.map((s) => [s]))('icon-%i.png is a valid RGBA PNG of that size', (size) => {
    const png = icons.drawIcon(size);
    expect([...png.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    let offset = 8;
    const chunks: { type: string; data: Buffer }[] = [];
    while (offset < png.length) {
      const length = png.readUInt32BE(offset);
      const type = png.subarray(offset + 4, offset + 8).toString('ascii');
      const data = png.subarray(offset + 8, offset + 8 + length);
      const crc = png.readUInt32BE(offset + 8 + length);
      expect({ type, crcOk: crc === icons.crc32(png.subarray(offset + 4, offset + 8 + length)) }).toEqual({
        type,
        crcOk: true,
      });
      chunks.push({ type, data });
      offset += 12 + length;
    }
    expect(chunks.map((c) => c.type)).toEqual(['IHDR', 'IDAT', 'IEND']);
    const ihdr = chunks[0]?.data as Buffer;
    expect([ihdr.readUInt32BE(0), ihdr.readUInt32BE(4), ihdr[8], ihdr[9]]).toEqual([size, size, 8, 6]);
    const raw = zlib.inflateSync(chunks[1]?.data as Buffer);
    expect(raw.length).toBe(size * (1 + 4 * size));
  });

  test('crc32 matches the standard check value', () => {
    // CRC-32 of "123456789" is 0xCBF43926 (the check value of the ISO 3309 / PNG CRC; common practice)
    expect(icons.crc32(Buffer.from('123456789', 'ascii'))).toBe(0xcbf43926);
  });
});
