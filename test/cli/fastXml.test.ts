/**
 * The fast tokenizer of large workbook parts (cli/xlsx/fastXml.ts) against saxes, a conformant XML
 * parser, as the reference: on generated documents (elements with prefixes, attributes in both quote styles,
 * the five predefined entities and character references, CDATA, comments, processing instructions) fed in
 * random chunks, both give the same tags, attributes and text. Malformed documents are refused by both.
 * Entities and character references: XML 1.0 §4.1 and §4.6.
 */
import * as fc from 'fast-check';
import { SaxesParser } from 'saxes';
import { FastXmlTokenizer, XmlSyntaxError, decodeEntities } from '../../cli/xlsx/fastXml';

type Event = ['open', string, Record<string, string>] | ['close', string] | ['text', string];

function merge(events: Event[]): Event[] {
  const out: Event[] = [];
  for (const e of events) {
    const last = out[out.length - 1];
    if (e[0] === 'text' && last?.[0] === 'text') last[1] += e[1];
    else out.push(e[0] === 'text' ? ['text', e[1]] : e);
  }
  return out.filter((e) => !(e[0] === 'text' && e[1] === ''));
}

function withSaxes(xml: string): Event[] {
  const events: Event[] = [];
  const parser = new SaxesParser();
  let depth = 0;
  parser.on('opentag', (t) => {
    depth += 1;
    events.push(['open', t.name, { ...(t.attributes as Record<string, string>) }]);
  });
  parser.on('closetag', (t) => {
    depth -= 1;
    events.push(['close', t.name]);
  });
  parser.on('text', (t) => {
    if (depth > 0) events.push(['text', t]);
  });
  parser.on('cdata', (t) => events.push(['text', t]));
  parser.write(xml).close();
  return merge(events);
}

function withFast(xml: string, cuts: number[]): { events: Event[]; tags: [string, number, number][] } {
  const events: Event[] = [];
  const tags: [string, number, number][] = [];
  const tokenizer = new FastXmlTokenizer({
    open(name, attributes, start, end) {
      events.push(['open', name, attributes]);
      tags.push([name, start, end]);
    },
    close(name) {
      events.push(['close', name]);
    },
    text(text) {
      events.push(['text', text]);
    },
  });
  let at = 0;
  for (const cut of [...cuts].sort((a, b) => a - b)) {
    tokenizer.write(xml.slice(at, cut));
    at = cut;
  }
  tokenizer.write(xml.slice(at)).close();
  return { events: merge(events), tags };
}

const name = fc.constantFrom('c', 'v', 'f', 'x:c', 'row', 'sheetData', 'is', 't', 'a1', 'r:id_x');
const textPiece = fc.constantFrom(
  'a',
  ' ',
  '12.5',
  '&lt;',
  '&gt;',
  '&amp;',
  '&quot;',
  '&apos;',
  '&#65;',
  '&#x1F600;',
  'é',
  '\n',
  '"',
  "'",
  '>',
);
const text = fc.array(textPiece, { maxLength: 6 }).map((p) => p.join(''));
const attrValue = fc
  .array(fc.constantFrom('x', '1', '&amp;', '&lt;', '>', ' ', '&#x41;'), { maxLength: 4 })
  .map((p) => p.join(''));
const attributes = fc.uniqueArray(
  fc.tuple(fc.constantFrom('r', 's', 't', 'cm', 'ref', 'xml:space'), attrValue, fc.boolean()),
  {
    selector: (a) => a[0],
    maxLength: 3,
  },
);

const element: fc.Memo<string> = fc.memo((n) =>
  fc
    .tuple(
      name,
      attributes,
      n > 1
        ? fc.array(
            fc.oneof(
              text,
              element(n - 1),
              fc.constant('<![CDATA[<v>&amp;]]>'),
              fc.constant('<!-- note -->'),
              fc.constant('<?pi x?>'),
            ),
            { maxLength: 4 },
          )
        : fc.constant([]),
      fc.boolean(),
    )
    .map(([tag, attrs, children, selfClose]) => {
      const a = attrs
        .map(([k, v, dq]) => (dq ? ` ${k}="${v.replace(/"/g, '')}"` : ` ${k}='${v.replace(/'/g, '')}'`))
        .join('');
      if (selfClose && children.length === 0) return `<${tag}${a}/>`;
      return `<${tag}${a}>${children.join('')}</${tag}>`;
    }),
);

jest.setTimeout(60_000);

describe('the fast tokenizer gives what saxes gives', () => {
  test('on generated documents fed in random chunks', () => {
    fc.assert(
      fc.property(element(4), fc.array(fc.nat(), { maxLength: 5 }), (body, rawCuts) => {
        const xml = `<?xml version="1.0" encoding="UTF-8"?>\n${body}`;
        const cuts = rawCuts.map((c) => c % (xml.length + 1));
        const fast = withFast(xml, cuts);
        expect(fast.events).toEqual(withSaxes(xml));
        for (const [tag, start, end] of fast.tags) {
          expect(xml.slice(start, start + tag.length + 1)).toBe(`<${tag}`);
          expect(xml[end - 1]).toBe('>');
        }
      }),
      { numRuns: 400 },
    );
  });
});

describe('what it refuses, as saxes does', () => {
  const refused = (xml: string): string => {
    try {
      withFast(xml, []);
    } catch (error) {
      if (error instanceof XmlSyntaxError) return error.message;
      throw error;
    }
    throw new Error('expected an XmlSyntaxError');
  };
  test.each([
    ['<a><b></a>', '</a> closes <b>'],
    ['<a>', '<a> is not closed'],
    ['<a>&nbsp;</a>', 'unknown entity &nbsp;'],
    ['<a x="1" x="2"/>', 'attribute x appears twice in <a>'],
    [
      '<!DOCTYPE a [<!ENTITY e "boom">]><a>&e;</a>',
      'a DOCTYPE or other declaration, which a workbook part never holds',
    ],
    ['<a/><b/>', 'a second root element'],
    ['hello<a/>', 'text before the root element'],
    ['<a x=1/>', 'a malformed start tag: "<a x=1/>"'],
  ])('%s', (xml, message) => {
    expect(refused(xml)).toBe(message);
    expect(() => withSaxes(xml)).toThrow(Error); // saxes refuses the same text (its own wording)
  });
  test('entities and character references (XML 1.0 §4.1, §4.6)', () => {
    expect(decodeEntities('&lt;&gt;&amp;&quot;&apos;&#65;&#x42;')).toBe('<>&"\'AB');
    expect(() => decodeEntities('a & b')).toThrow(new XmlSyntaxError('"&" is not a complete entity reference'));
  });
});

describe('skipping an element unread', () => {
  test('the rows asked to be skipped give no events; the others are read as usual, in any chunking', () => {
    const rows = Array.from(
      { length: 30 },
      (_, r) =>
        `<row r="${r + 1}"><c r="A${r + 1}"><v>${r}</v></c><c r="B${r + 1}" t="str"><v>x&amp;${r}</v></c></row>`,
    );
    const xml = `<worksheet><sheetData>${rows.join('')}</sheetData><tail a="1"/></worksheet>`;
    fc.assert(
      fc.property(fc.array(fc.nat({ max: xml.length }), { maxLength: 8 }), (cuts) => {
        const texts: string[] = [];
        const closes: string[] = [];
        const tokenizer: FastXmlTokenizer = new FastXmlTokenizer({
          open(name, attributes) {
            if (name === 'row' && Number(attributes.r) % 3 !== 0) tokenizer.skipContent();
          },
          close(name) {
            closes.push(name);
          },
          text(t) {
            texts.push(t);
          },
        });
        let at = 0;
        for (const cut of [...cuts].sort((a, b) => a - b)) {
          tokenizer.write(xml.slice(at, cut));
          at = cut;
        }
        tokenizer.write(xml.slice(at)).close();
        const kept = Array.from({ length: 10 }, (_, k) => 3 * k + 2); // rows 3, 6, … 30 hold r - 1 = 2, 5, …
        expect(texts).toEqual(kept.flatMap((r) => [String(r), `x&${r}`]));
        expect(closes.filter((c) => c === 'row')).toHaveLength(30);
        expect(closes.slice(-3)).toEqual(['sheetData', 'tail', 'worksheet']);
      }),
      { numRuns: 200 },
    );
  });
});
