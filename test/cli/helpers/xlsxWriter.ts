/**
 * Test helper (not a suite): a tiny writer of .xlsx packages, written by hand from ECMA-376 (Part 1,
 * SpreadsheetML §18; Part 2, packaging and relationships) so that the CLI's tests do not depend on any
 * spreadsheet library. It writes exactly what a test asks for — formulas in any spelling, cached values of
 * every type, spills (`<f t="array" ref>` with `cm` cell metadata for dynamic arrays), shared formulas,
 * shared and inline strings, a chart with its drawing, defined names, a calculation chain, existing notes —
 * and a small reader of a package's parts for the assertions.
 *
 * The dynamic-array metadata part (XLDAPR) and the custom-function spellings are written from memory of
 * files Excel saves; the tests say so where it matters.
 */
import * as yauzl from 'yauzl';
import * as yazl from 'yazl';

/** A cached value: number, text, TRUE/FALSE or an error. */
export type TestValue = number | string | boolean | { error: string };

/** One cell to write. */
export interface TestCell {
  readonly ref: string;
  /** The cached value (left out: the cell stores none). */
  readonly value?: TestValue;
  /** The formula as stored (no "="). */
  readonly formula?: string;
  /** A spill or array range for `<f t="array" ref>`. */
  readonly array?: string;
  /** Dynamic array: adds cm="1" (cell metadata of the XLDAPR type). */
  readonly dynamic?: boolean;
  /** Shared formula: the master gives `ref`, dependents only `si` (their formula is left empty). */
  readonly shared?: { readonly si: number; readonly ref?: string };
  /** How a text value is stored: t="s" (shared string), t="inlineStr" or t="str"; default: "str" for formula cells, "s" otherwise. */
  readonly stringAs?: 's' | 'inlineStr' | 'str';
  /** Style index (s attribute). */
  readonly style?: number;
}

/** One worksheet. */
export interface TestSheet {
  readonly name: string;
  readonly cells: readonly TestCell[];
  /** Adds a chart (drawing + chart part) whose series reads `seriesRef` (e.g. "'Read-out'!$D$2:$D$3"). */
  readonly chart?: {
    readonly seriesRef: string;
    readonly cached: readonly number[];
  };
  /** Existing notes (legacy comments + VML drawing), keyed by cell. */
  readonly notes?: Readonly<Record<string, string>>;
  /** Extra worksheet children written after sheetData (raw XML, e.g. conditional formatting). */
  readonly afterSheetData?: string;
}

/** A workbook to write. */
export interface TestBook {
  readonly sheets: readonly TestSheet[];
  readonly definedNames?: readonly {
    readonly name: string;
    readonly formula: string;
    readonly localSheetId?: number;
  }[];
  /** Writes xl/calcChain.xml listing every formula cell. */
  readonly calcChain?: boolean;
  /** Parts added as they are (name → content), with their content type; e.g. an unknown custom part. */
  readonly extraParts?: readonly {
    readonly name: string;
    readonly content: string;
    readonly contentType: string;
  }[];
  /** Use the x: prefix for SpreadsheetML elements in worksheets. */
  readonly prefixed?: boolean;
}

const MAIN = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
const REL_NS = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';
const PKG_REL = 'http://schemas.openxmlformats.org/package/2006/relationships';
const RT = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';

const esc = (s: string): string =>
  s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/** Zero-based row and column of "B3". */
function position(ref: string): { row: number; col: number } {
  const m = /^([A-Z]+)(\d+)$/.exec(ref);
  if (!m) throw new Error(`bad cell ${ref}`);
  let col = 0;
  for (const ch of m[1] as string) col = col * 26 + (ch.charCodeAt(0) - 64);
  return { row: Number(m[2]) - 1, col: col - 1 };
}

/** The XML of every part of `book`, by part name, in the order a package stores them. */
export function xlsxParts(book: TestBook): Map<string, string> {
  const parts = new Map<string, string>();
  const overrides: [string, string][] = [];
  const shared: string[] = [];
  const sharedIndex = new Map<string, number>();
  const sst = (s: string): number => {
    let i = sharedIndex.get(s);
    if (i === undefined) {
      i = shared.length;
      shared.push(s);
      sharedIndex.set(s, i);
    }
    return i;
  };
  const workbookRels: string[] = [];
  const chain: string[] = [];
  let anyDynamic = false;
  let drawingCount = 0;
  let commentCount = 0;
  const p = book.prefixed ? 'x:' : '';

  book.sheets.forEach((sheet, s) => {
    const sheetRels: string[] = [];
    const rows = new Map<number, string[]>();
    const sorted = [...sheet.cells].sort((a, b) => {
      const pa = position(a.ref);
      const pb = position(b.ref);
      return pa.row - pb.row || pa.col - pb.col;
    });
    for (const cell of sorted) {
      const { row } = position(cell.ref);
      let attrs = ` r="${cell.ref}"`;
      if (cell.style !== undefined) attrs += ` s="${cell.style}"`;
      let inner = '';
      if (cell.formula !== undefined || cell.shared) {
        let fAttrs = '';
        if (cell.array) fAttrs += ` t="array" ref="${cell.array}"`;
        if (cell.shared)
          fAttrs += ` t="shared"${cell.shared.ref ? ` ref="${cell.shared.ref}"` : ''} si="${cell.shared.si}"`;
        inner += cell.formula ? `<${p}f${fAttrs}>${esc(cell.formula)}</${p}f>` : `<${p}f${fAttrs}/>`;
        chain.push(`<c r="${cell.ref}" i="${s + 1}"/>`);
      }
      if (cell.dynamic) {
        attrs += ' cm="1"';
        anyDynamic = true;
      }
      const v = cell.value;
      if (typeof v === 'number') inner += `<${p}v>${String(v)}</${p}v>`;
      else if (typeof v === 'boolean') {
        attrs += ' t="b"';
        inner += `<${p}v>${v ? 1 : 0}</${p}v>`;
      } else if (typeof v === 'object') {
        attrs += ' t="e"';
        inner += `<${p}v>${esc(v.error)}</${p}v>`;
      } else if (typeof v === 'string') {
        const as = cell.stringAs ?? (cell.formula !== undefined || cell.shared ? 'str' : 's');
        if (as === 's') {
          attrs += ' t="s"';
          inner += `<${p}v>${sst(v)}</${p}v>`;
        } else if (as === 'inlineStr') {
          attrs += ' t="inlineStr"';
          inner += `<${p}is><${p}t>${esc(v)}</${p}t></${p}is>`;
        } else {
          attrs += ' t="str"';
          inner += `<${p}v>${esc(v)}</${p}v>`;
        }
      }
      const xml = inner ? `<${p}c${attrs}>${inner}</${p}c>` : `<${p}c${attrs}/>`;
      rows.set(row, [...(rows.get(row) ?? []), xml]);
    }
    const rowXml = [...rows.entries()]
      .sort((a, b) => a[0] - b[0])
      .map(([r, cs]) => `<${p}row r="${r + 1}">${cs.join('')}</${p}row>`)
      .join('');
    let tail = sheet.afterSheetData ?? '';
    if (sheet.chart) {
      drawingCount += 1;
      const d = drawingCount;
      sheetRels.push(
        `<Relationship Id="rId${sheetRels.length + 1}" Type="${RT}/drawing" Target="../drawings/drawing${d}.xml"/>`,
      );
      tail += `<${p}drawing r:id="rId${sheetRels.length}"/>`;
      parts.set(`xl/drawings/drawing${d}.xml`, drawingXml());
      parts.set(
        `xl/drawings/_rels/drawing${d}.xml.rels`,
        `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Relationships xmlns="${PKG_REL}"><Relationship Id="rId1" Type="${RT}/chart" Target="../charts/chart${d}.xml"/></Relationships>`,
      );
      parts.set(`xl/charts/chart${d}.xml`, chartXml(sheet.chart.seriesRef, sheet.chart.cached));
      overrides.push([`/xl/drawings/drawing${d}.xml`, 'application/vnd.openxmlformats-officedocument.drawing+xml']);
      overrides.push([`/xl/charts/chart${d}.xml`, 'application/vnd.openxmlformats-officedocument.drawingml.chart+xml']);
    }
    if (sheet.notes) {
      commentCount += 1;
      const c = commentCount;
      sheetRels.push(
        `<Relationship Id="rId${sheetRels.length + 1}" Type="${RT}/comments" Target="../comments${c}.xml"/>`,
      );
      sheetRels.push(
        `<Relationship Id="rId${sheetRels.length + 1}" Type="${RT}/vmlDrawing" Target="../drawings/vmlDrawing${c}.vml"/>`,
      );
      tail += `<${p}legacyDrawing r:id="rId${sheetRels.length}"/>`;
      const list = Object.entries(sheet.notes)
        .map(([ref, text]) => `<comment ref="${ref}" authorId="0"><text><t>${esc(text)}</t></text></comment>`)
        .join('');
      parts.set(
        `xl/comments${c}.xml`,
        `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<comments xmlns="${MAIN}"><authors><author>A. Analyst</author></authors><commentList>${list}</commentList></comments>`,
      );
      parts.set(`xl/drawings/vmlDrawing${c}.vml`, vmlXml(c, Object.keys(sheet.notes)));
      overrides.push([
        `/xl/comments${c}.xml`,
        'application/vnd.openxmlformats-officedocument.spreadsheetml.comments+xml',
      ]);
    }
    const ns = book.prefixed ? `xmlns:x="${MAIN}"` : `xmlns="${MAIN}"`;
    parts.set(
      `xl/worksheets/sheet${s + 1}.xml`,
      `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<${p}worksheet ${ns} xmlns:r="${REL_NS}"><${p}sheetViews><${p}sheetView workbookViewId="0"/></${p}sheetViews>` +
        `<${p}sheetFormatPr defaultRowHeight="15"/><${p}sheetData>${rowXml}</${p}sheetData><${p}pageMargins left="0.7" right="0.7" top="0.75" bottom="0.75" header="0.3" footer="0.3"/>${tail}</${p}worksheet>`,
    );
    if (sheetRels.length > 0) {
      parts.set(
        `xl/worksheets/_rels/sheet${s + 1}.xml.rels`,
        `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Relationships xmlns="${PKG_REL}">${sheetRels.join('')}</Relationships>`,
      );
    }
    workbookRels.push(`<Relationship Id="rId${s + 1}" Type="${RT}/worksheet" Target="worksheets/sheet${s + 1}.xml"/>`);
    overrides.push([
      `/xl/worksheets/sheet${s + 1}.xml`,
      'application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml',
    ]);
  });

  let nextRel = book.sheets.length + 1;
  workbookRels.push(`<Relationship Id="rId${nextRel++}" Type="${RT}/styles" Target="styles.xml"/>`);
  overrides.push(['/xl/styles.xml', 'application/vnd.openxmlformats-officedocument.spreadsheetml.styles+xml']);
  parts.set('xl/styles.xml', stylesXml());
  if (shared.length > 0) {
    workbookRels.push(`<Relationship Id="rId${nextRel++}" Type="${RT}/sharedStrings" Target="sharedStrings.xml"/>`);
    overrides.push([
      '/xl/sharedStrings.xml',
      'application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml',
    ]);
    parts.set(
      'xl/sharedStrings.xml',
      `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<sst xmlns="${MAIN}" count="${shared.length}" uniqueCount="${shared.length}">${shared.map((s) => `<si><t xml:space="preserve">${esc(s)}</t></si>`).join('')}</sst>`,
    );
  }
  if (anyDynamic) {
    workbookRels.push(
      `<Relationship Id="rId${nextRel++}" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/sheetMetadata" Target="metadata.xml"/>`,
    );
    overrides.push([
      '/xl/metadata.xml',
      'application/vnd.openxmlformats-officedocument.spreadsheetml.sheetMetadata+xml',
    ]);
    parts.set('xl/metadata.xml', metadataXml());
  }
  if (book.calcChain && chain.length > 0) {
    workbookRels.push(`<Relationship Id="rId${nextRel}" Type="${RT}/calcChain" Target="calcChain.xml"/>`);
    overrides.push(['/xl/calcChain.xml', 'application/vnd.openxmlformats-officedocument.spreadsheetml.calcChain+xml']);
    parts.set(
      'xl/calcChain.xml',
      `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<calcChain xmlns="${MAIN}">${chain.join('')}</calcChain>`,
    );
  }
  for (const extra of book.extraParts ?? []) {
    parts.set(extra.name, extra.content);
    overrides.push([`/${extra.name}`, extra.contentType]);
  }
  const names = (book.definedNames ?? [])
    .map(
      (d) =>
        `<definedName name="${esc(d.name)}"${d.localSheetId !== undefined ? ` localSheetId="${d.localSheetId}"` : ''}>${esc(d.formula)}</definedName>`,
    )
    .join('');
  parts.set(
    'xl/workbook.xml',
    `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<workbook xmlns="${MAIN}" xmlns:r="${REL_NS}"><workbookPr/><bookViews><workbookView/></bookViews><sheets>` +
      book.sheets.map((sh, i) => `<sheet name="${esc(sh.name)}" sheetId="${i + 1}" r:id="rId${i + 1}"/>`).join('') +
      `</sheets>${names ? `<definedNames>${names}</definedNames>` : ''}<calcPr calcId="191029"/></workbook>`,
  );
  parts.set(
    'xl/_rels/workbook.xml.rels',
    `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Relationships xmlns="${PKG_REL}">${workbookRels.join('')}</Relationships>`,
  );
  overrides.unshift(['/xl/workbook.xml', 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml']);
  const types =
    `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">` +
    '<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/>' +
    (commentCount > 0
      ? '<Default Extension="vml" ContentType="application/vnd.openxmlformats-officedocument.vmlDrawing"/>'
      : '') +
    overrides.map(([n, t]) => `<Override PartName="${n}" ContentType="${t}"/>`).join('') +
    '</Types>';
  const ordered = new Map<string, string>();
  ordered.set('[Content_Types].xml', types);
  ordered.set(
    '_rels/.rels',
    `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Relationships xmlns="${PKG_REL}"><Relationship Id="rId1" Type="${RT}/officeDocument" Target="xl/workbook.xml"/></Relationships>`,
  );
  ordered.set('xl/workbook.xml', parts.get('xl/workbook.xml') as string);
  ordered.set('xl/_rels/workbook.xml.rels', parts.get('xl/_rels/workbook.xml.rels') as string);
  for (const [name, xml] of parts) if (!ordered.has(name)) ordered.set(name, xml);
  return ordered;
}

function stylesXml(): string {
  // Style 1: percent with two decimals (built-in numFmtId 10); style 2: a custom format 0.0000.
  return (
    `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<styleSheet xmlns="${MAIN}"><numFmts count="1"><numFmt numFmtId="164" formatCode="0.0000"/></numFmts>` +
    '<fonts count="1"><font><sz val="11"/><name val="Calibri"/></font></fonts><fills count="2"><fill><patternFill patternType="none"/></fill><fill><patternFill patternType="gray125"/></fill></fills>' +
    '<borders count="1"><border><left/><right/><top/><bottom/><diagonal/></border></borders><cellStyleXfs count="1"><xf numFmtId="0" fontId="0" fillId="0" borderId="0"/></cellStyleXfs>' +
    '<cellXfs count="3"><xf numFmtId="0" fontId="0" fillId="0" borderId="0" xfId="0"/><xf numFmtId="10" fontId="0" fillId="0" borderId="0" xfId="0" applyNumberFormat="1"/>' +
    '<xf numFmtId="164" fontId="0" fillId="0" borderId="0" xfId="0" applyNumberFormat="1"/></cellXfs>' +
    '<cellStyles count="1"><cellStyle name="Normal" xfId="0" builtinId="0"/></cellStyles></styleSheet>'
  );
}

function metadataXml(): string {
  // The dynamic-array cell metadata Excel writes (XLDAPR, fDynamic="1"), from memory of saved files.
  return (
    `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<metadata xmlns="${MAIN}" xmlns:xda="http://schemas.microsoft.com/office/spreadsheetml/2017/dynamicarray">` +
    '<metadataTypes count="1"><metadataType name="XLDAPR" minSupportedVersion="120000" copy="1" pasteAll="1" pasteValues="1" merge="1" splitFirst="1" rowColShift="1" clearFormats="1" clearComments="1" assign="1" coerce="1" cellMeta="1"/></metadataTypes>' +
    '<futureMetadata name="XLDAPR" count="1"><bk><extLst><ext uri="{bdbb8cdc-fa1e-496e-a857-3c3f30c029c3}"><xda:dynamicArrayProperties fDynamic="1" fCollapsed="0"/></ext></extLst></bk></futureMetadata>' +
    '<cellMetadata count="1"><bk><rc t="1" v="0"/></bk></cellMetadata></metadata>'
  );
}

function drawingXml(): string {
  return (
    '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<xdr:wsDr xmlns:xdr="http://schemas.openxmlformats.org/drawingml/2006/spreadsheetDrawing" xmlns:a="http://schemas.openxmlformats.org/drawingml/2006/main">' +
    '<xdr:twoCellAnchor><xdr:from><xdr:col>6</xdr:col><xdr:colOff>0</xdr:colOff><xdr:row>1</xdr:row><xdr:rowOff>0</xdr:rowOff></xdr:from>' +
    '<xdr:to><xdr:col>12</xdr:col><xdr:colOff>0</xdr:colOff><xdr:row>15</xdr:row><xdr:rowOff>0</xdr:rowOff></xdr:to>' +
    '<xdr:graphicFrame macro=""><xdr:nvGraphicFramePr><xdr:cNvPr id="2" name="Chart 1"/><xdr:cNvGraphicFramePr/></xdr:nvGraphicFramePr>' +
    '<xdr:xfrm><a:off x="0" y="0"/><a:ext cx="0" cy="0"/></xdr:xfrm><a:graphic><a:graphicData uri="http://schemas.openxmlformats.org/drawingml/2006/chart">' +
    `<c:chart xmlns:c="http://schemas.openxmlformats.org/drawingml/2006/chart" xmlns:r="${REL_NS}" r:id="rId1"/></a:graphicData></a:graphic></xdr:graphicFrame><xdr:clientData/></xdr:twoCellAnchor></xdr:wsDr>`
  );
}

function chartXml(seriesRef: string, cached: readonly number[]): string {
  const pts = cached.map((v, i) => `<c:pt idx="${i}"><c:v>${v}</c:v></c:pt>`).join('');
  return (
    '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<c:chartSpace xmlns:c="http://schemas.openxmlformats.org/drawingml/2006/chart" xmlns:a="http://schemas.openxmlformats.org/drawingml/2006/main">' +
    '<c:chart><c:plotArea><c:layout/><c:barChart><c:barDir val="col"/><c:grouping val="clustered"/><c:ser><c:idx val="0"/><c:order val="0"/>' +
    `<c:val><c:numRef><c:f>${esc(seriesRef)}</c:f><c:numCache><c:formatCode>General</c:formatCode><c:ptCount val="${cached.length}"/>${pts}</c:numCache></c:numRef></c:val>` +
    '</c:ser><c:axId val="1"/><c:axId val="2"/></c:barChart><c:catAx><c:axId val="1"/><c:scaling><c:orientation val="minMax"/></c:scaling><c:axPos val="b"/><c:crossAx val="2"/></c:catAx>' +
    '<c:valAx><c:axId val="2"/><c:scaling><c:orientation val="minMax"/></c:scaling><c:axPos val="l"/><c:crossAx val="1"/></c:valAx></c:plotArea></c:chart></c:chartSpace>'
  );
}

function vmlXml(block: number, refs: readonly string[]): string {
  const shapes = refs
    .map((ref, i) => {
      const { row, col } = position(ref);
      return (
        `<v:shape id="_x0000_s${block * 1024 + 1 + i}" type="#_x0000_t202" style="position:absolute;visibility:hidden" fillcolor="#ffffe1" o:insetmode="auto">` +
        `<x:ClientData ObjectType="Note"><x:Anchor>${col + 1}, 15, ${row}, 10, ${col + 3}, 15, ${row + 4}, 4</x:Anchor><x:AutoFill>False</x:AutoFill><x:Row>${row}</x:Row><x:Column>${col}</x:Column></x:ClientData></v:shape>`
      );
    })
    .join('');
  return (
    '<xml xmlns:v="urn:schemas-microsoft-com:vml" xmlns:o="urn:schemas-microsoft-com:office:office" xmlns:x="urn:schemas-microsoft-com:office:excel">' +
    `<o:shapelayout v:ext="edit"><o:idmap v:ext="edit" data="${block}"/></o:shapelayout>` +
    '<v:shapetype id="_x0000_t202" coordsize="21600,21600" o:spt="202" path="m,l,21600r21600,l21600,xe"><v:stroke joinstyle="miter"/><v:path gradientshapeok="t" o:connecttype="rect"/></v:shapetype>' +
    `${shapes}</xml>`
  );
}

/** The package of `book` as zip bytes (every part deflated, fixed timestamps). */
export async function buildXlsx(book: TestBook): Promise<Buffer> {
  return zipParts(xlsxParts(book));
}

/** Zips parts (name → text or bytes) in the given order. */
export async function zipParts(parts: ReadonlyMap<string, string | Buffer>): Promise<Buffer> {
  const zip = new yazl.ZipFile();
  for (const [name, content] of parts) {
    zip.addBuffer(typeof content === 'string' ? Buffer.from(content, 'utf8') : content, name, {
      mtime: new Date(Date.UTC(2024, 0, 2, 3, 4, 6)),
    });
  }
  zip.end();
  const chunks: Buffer[] = [];
  for await (const chunk of zip.outputStream) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks);
}

/** Every part of a package (name → uncompressed bytes), in stored order. */
export async function readParts(zipBytes: Buffer): Promise<Map<string, Buffer>> {
  const zip = await yauzl.fromBufferPromise(zipBytes, { lazyEntries: true });
  const out = new Map<string, Buffer>();
  for await (const entry of zip.eachEntry()) {
    const chunks: Buffer[] = [];
    for await (const chunk of await zip.openReadStreamPromise(entry)) chunks.push(chunk as Buffer);
    out.set(entry.fileName, Buffer.concat(chunks));
  }
  zip.close();
  return out;
}
