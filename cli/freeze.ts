/**
 * `lift-ledger freeze`: a shareable copy of a saved workbook in which every ABTEST result is its saved
 * value, with the formula kept in a note on the cell and a header note on A1 of each sheet it changed.
 *
 * The package is edited surgically: parts are copied in their stored order with their bytes unchanged,
 * except
 * - the worksheets holding ABTEST results: only those cells change (their `<f>` removed, their `cm`
 *   dynamic-array metadata reference dropped, a text result moved from the formula-string type `str` to an
 *   inline string), plus a `<legacyDrawing>` element when the sheet had none;
 * - their relationships, notes (comments) and VML drawing parts: created or extended;
 * - [Content_Types].xml: the new parts declared;
 * - the calculation chain: the frozen cells taken out of it (the part and its declarations go when nothing
 *   is left), since it may only list formula cells.
 * Worksheets are streamed through the editor, so a large sheet is never held whole.
 *
 * The rules (which cells, the note and header wording) are in core/frozenCopy.ts, shared with the panel.
 */
import * as fs from 'fs';
import * as path from 'path';
import { PassThrough } from 'stream';
import { once } from 'events';
import * as yazl from 'yazl';
import { cellName, rangeName, type CellRange } from './core/cellAddress';
import { NOTE_AUTHOR, frozenHeaderLine, howComputedNote } from './core/frozenCopy';
import { containsAbtestCall } from './core/formula';
import { RangeSweep, cellKey, scanSheet } from './scan';
import {
  REL,
  readRelationships,
  readWorkbookStructure,
  relsPartName,
  type Relationship,
  type SheetInfo,
} from './xlsx/package';
import {
  extendCommentsPart,
  extendVmlPart,
  newCommentsPart,
  newVmlPart,
  notedCells,
  vmlBlocks,
  type NoteToAdd,
} from './xlsx/notes';
import { createSheetParser, type RawCell } from './xlsx/sheetScan';
import { StreamEditor } from './xlsx/streamEdit';
import { escapeXml, feedXml } from './xlsx/xml';
import { ZipPackage, type ZipPart } from './xlsx/zip';

/** Options of {@link freezeWorkbook}. */
export interface FreezeOptions {
  /** The time the copy is stamped with. */
  readonly frozenAt: Date;
  /** How the header names the source, e.g. the input's file name. */
  readonly source: string;
  readonly onProgress?: (done: number, total: number, part: string) => void;
}

/** What a freeze did. */
export interface FreezeResult {
  readonly frozen: number;
  readonly sheets: readonly {
    readonly name: string;
    readonly frozen: number;
    readonly notes: number;
  }[];
  readonly warnings: readonly string[];
}

const RELS_NS = 'http://schemas.openxmlformats.org/package/2006/relationships';
const REL_BASE = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';
const R_NS = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';
const COMMENTS_TYPE = 'application/vnd.openxmlformats-officedocument.spreadsheetml.comments+xml';
const VML_TYPE = 'application/vnd.openxmlformats-officedocument.vmlDrawing';

/** Worksheet children that come after `legacyDrawing` (ECMA-376 Part 1 §18.3.1.99, CT_Worksheet order). */
const AFTER_LEGACY_DRAWING = new Set([
  'legacyDrawingHF',
  'drawingHF',
  'picture',
  'oleObjects',
  'controls',
  'webPublishItems',
  'tableParts',
  'extLst',
  'AlternateContent',
]);

interface FoundCell {
  readonly row: number;
  readonly col: number;
  readonly formula: string;
  readonly spill?: CellRange;
  readonly savedError?: string;
  readonly hasSaved: boolean;
}

interface SheetPlan {
  readonly sheet: SheetInfo;
  readonly anchors: Map<number, FoundCell>;
  /** The `<legacyDrawing>` element to insert, when the sheet has none. */
  readonly legacyDrawing?: string;
  /** Part name → new text, for parts of this sheet that change or are new. */
  readonly parts: Map<string, string>;
  readonly newParts: { name: string; contentType?: string }[];
  readonly notes: number;
}

/** The end of a start tag that begins at 0 (quotes respected). */
function startTagEnd(xml: string): number {
  let quote = '';
  for (let i = 0; i < xml.length; i += 1) {
    const ch = xml[i] as string;
    if (quote) {
      if (ch === quote) quote = '';
    } else if (ch === '"' || ch === "'") quote = ch;
    else if (ch === '>') return i;
  }
  return xml.length - 1;
}

/**
 * A cell's XML with its formula removed: the `cm` attribute dropped, and a formula-string result (`t="str"`)
 * stored as an inline string. Other attributes (style, the value) stay as they are.
 */
export function frozenCellXml(raw: string, cell: RawCell): string {
  const edits: [number, number, string][] = [];
  const type = cell.attributes.t;
  if (cell.formula && cell.formula.start >= 0)
    edits.push([cell.formula.start - cell.start, cell.formula.end - cell.start, '']);
  const hasValue = cell.valueStart !== undefined && cell.valueStart >= 0 && cell.valueEnd !== undefined;
  if (type === 'str' && hasValue) {
    const from = (cell.valueStart as number) - cell.start;
    const to = (cell.valueEnd as number) - cell.start;
    const v = raw.slice(from, to);
    const open = startTagEnd(v);
    const inner = v[open - 1] === '/' ? '' : v.slice(open + 1, v.lastIndexOf('<'));
    const p = cell.prefix;
    edits.push([from, to, `<${p}is><${p}t xml:space="preserve">${inner}</${p}t></${p}is>`]);
  }
  let out = raw;
  for (const [from, to, text] of edits.sort((a, b) => b[0] - a[0])) out = out.slice(0, from) + text + out.slice(to);
  const end = startTagEnd(out);
  let tag = out.slice(0, end + 1).replace(/\s+cm\s*=\s*("[^"]*"|'[^']*')/, '');
  if (type === 'str')
    tag = hasValue
      ? tag.replace(/(\st\s*=\s*)("str"|'str')/, '$1"inlineStr"')
      : tag.replace(/\s+t\s*=\s*("str"|'str')/, '');
  return tag + out.slice(end + 1);
}

/** Drops the frozen cells from a calculation chain (ECMA-376 Part 1 §18.6); undefined when none is left. */
export function pruneCalcChain(xml: string, frozen: ReadonlyMap<string, ReadonlySet<string>>): string | undefined {
  let actual: string | undefined;
  let emitted: string | undefined;
  let kept = 0;
  const out = xml.replace(/<((?:\w+:)?)c\b([^>]*?)\/>/g, (whole: string, prefix: string, attrs: string) => {
    const i = /\si="([^"]*)"/.exec(attrs)?.[1];
    const r = /\sr="([^"]*)"/.exec(attrs)?.[1] ?? '';
    if (i !== undefined) actual = i;
    if (actual !== undefined && frozen.get(actual)?.has(r.toUpperCase())) return '';
    kept += 1;
    const text =
      i === undefined && actual !== emitted && actual !== undefined ? `<${prefix}c${attrs} i="${actual}"/>` : whole;
    emitted = actual;
    return text;
  });
  return kept === 0 ? undefined : out;
}

function nextId(existing: Iterable<string>): () => string {
  const taken = new Set(existing);
  let n = 1;
  return () => {
    while (taken.has(`rId${n}`)) n += 1;
    taken.add(`rId${n}`);
    return `rId${n}`;
  };
}

function relationshipXml(id: string, type: string, target: string): string {
  return `<Relationship Id="${id}" Type="${REL_BASE}/${type}" Target="${escapeXml(target)}"/>`;
}

/** A target path from one part to another, relative to the source part's folder. */
function relativeTarget(fromPart: string, toPart: string): string {
  return path.posix.relative(path.posix.dirname(fromPart), toPart);
}

/** Reads a sheet once: its ABTEST cells and the r:id of its `<legacyDrawing>`. */
async function findCells(
  pkg: ZipPackage,
  sheet: SheetInfo,
  onBytes: (n: number) => void,
): Promise<{ cells: FoundCell[]; legacyDrawingId?: string }> {
  let legacyDrawingId: string | undefined;
  const scan = await scanSheet(pkg, sheet, {
    withSpillValues: false,
    onBytes,
    onTopLevelElement(local, attributes) {
      if (local !== 'legacyDrawing') return;
      for (const [name, value] of Object.entries(attributes))
        if (name === 'r:id' || name.endsWith(':id')) legacyDrawingId = value;
    },
  });
  const cells = scan.cells.map((c) => ({
    row: c.row,
    col: c.col,
    formula: c.formula,
    ...(c.spill ? { spill: c.spill } : {}),
    hasSaved: c.saved !== undefined,
    ...(c.saved?.type === 'e' ? { savedError: c.saved.text ?? '' } : {}),
  }));
  return { cells, ...(legacyDrawingId ? { legacyDrawingId } : {}) };
}

/**
 * Writes the frozen copy of `input` to `output` (through a temporary file beside it, renamed at the end,
 * so a failed run leaves no half-written copy).
 * @throws {WorkbookFileError} when the input cannot be read as a workbook.
 */
export async function freezeWorkbook(input: string, output: string, options: FreezeOptions): Promise<FreezeResult> {
  const pkg = await ZipPackage.open(input);
  const temp = path.join(path.dirname(output), `.${path.basename(output)}.${process.pid}.partial`);
  try {
    const structure = await readWorkbookStructure(pkg, input);
    const sheetBytes = structure.sheets.reduce((s, sh) => s + sh.part.uncompressedSize, 0);
    let done = 0;
    const total = sheetBytes * 2;
    const onBytes = (label: string) => (n: number) => {
      done += n;
      options.onProgress?.(done, total, label);
    };
    const warnings: string[] = [];
    const taken = new Set<number>();
    for (const part of pkg.parts)
      if (part.name.toLowerCase().endsWith('.vml')) vmlBlocks(await pkg.text(part)).forEach((b) => taken.add(b));
    const usedNames = new Set(pkg.parts.map((p) => p.name.toLowerCase()));
    const freshName = (pattern: (n: number) => string): string => {
      let n = 1;
      while (usedNames.has(pattern(n).toLowerCase())) n += 1;
      usedNames.add(pattern(n).toLowerCase());
      return pattern(n);
    };

    // Phase A: find the cells, plan each sheet's changes.
    const plans = new Map<string, SheetPlan>();
    const frozenBySheetId = new Map<string, Set<string>>();
    let frozenTotal = 0;
    const summary: { name: string; frozen: number; notes: number }[] = [];
    for (const sheet of structure.sheets) {
      const found = await findCells(pkg, sheet, onBytes(sheet.part.name));
      if (found.cells.length === 0) continue;
      frozenTotal += found.cells.length;
      frozenBySheetId.set(sheet.sheetId, new Set(found.cells.map((c) => cellName(c).toUpperCase())));
      for (const c of found.cells) {
        if (!c.hasSaved) warnings.push(`${sheet.name}!${cellName(c)} had no saved value; its frozen cell is empty`);
        else if (c.savedError === '#NAME?')
          warnings.push(
            `${sheet.name}!${cellName(c)} was saved as #NAME? (calculated without the add-in); the copy keeps #NAME?`,
          );
      }
      const plan = await planSheet(pkg, sheet, found.cells, found.legacyDrawingId, options, taken, freshName, warnings);
      plans.set(sheet.part.name, plan);
      summary.push({
        name: sheet.name,
        frozen: found.cells.length,
        notes: plan.notes,
      });
    }
    for (const d of structure.definedNames) {
      if (containsAbtestCall(d.formula))
        warnings.push(
          `the defined name ${d.name} uses ABTEST (${d.formula}); names are left as they are and show #NAME? without the add-in`,
        );
    }
    for (const part of pkg.parts) {
      if (/^xl\/tables\/[^/]+\.xml$/i.test(part.name) && /abtest/i.test(await pkg.text(part))) {
        warnings.push(`the table part ${part.name} mentions ABTEST (a calculated column?); it is left as it is`);
      }
    }

    // Workbook-level edits: content types, calculation chain.
    const replaced = new Map<string, string | null>(); // part name → new text, or null to drop the part
    const added: { name: string; text: string }[] = [];
    for (const plan of plans.values()) {
      for (const [name, text] of plan.parts) {
        if (pkg.part(name)) replaced.set(pkg.part(name)?.name as string, text);
        else added.push({ name, text });
      }
    }
    let dropChain = false;
    if (structure.calcChain && frozenBySheetId.size > 0) {
      const pruned = pruneCalcChain(await pkg.text(structure.calcChain), frozenBySheetId);
      if (pruned === undefined) dropChain = true;
      replaced.set(structure.calcChain.name, pruned ?? null);
    }
    const newTypes = [...plans.values()].flatMap((p) => p.newParts);
    if (newTypes.length > 0 || dropChain) {
      const typesPart = pkg.part('[Content_Types].xml');
      if (!typesPart) throw new Error('the package has no [Content_Types].xml');
      let types = await pkg.text(typesPart);
      let insert = '';
      if (
        newTypes.some((p) => p.name.toLowerCase().endsWith('.vml')) &&
        !/<Default\s[^>]*Extension="vml"/i.test(types)
      ) {
        insert += `<Default Extension="vml" ContentType="${VML_TYPE}"/>`;
      }
      for (const p of newTypes)
        if (p.contentType) insert += `<Override PartName="/${p.name}" ContentType="${p.contentType}"/>`;
      if (dropChain && structure.calcChain) {
        const chainName = escapeRegExp(structure.calcChain.name);
        types = types.replace(new RegExp(`<Override\\s[^>]*PartName="/${chainName}"[^>]*/>`, 'i'), '');
      }
      types = types.replace('</Types>', `${insert}</Types>`);
      replaced.set(typesPart.name, types);
    }
    if (dropChain && structure.calcChain) {
      const relsPart = pkg.part(structure.workbookRelsPart);
      if (relsPart) {
        const rels = await readRelationships(pkg, structure.workbookPart);
        const chainRel = rels.find((r) => r.type.endsWith(REL.calcChain));
        if (chainRel) {
          const text = (await pkg.text(relsPart)).replace(
            new RegExp(`<Relationship\\s[^>]*Id="${escapeRegExp(chainRel.id)}"[^>]*/>`),
            '',
          );
          replaced.set(relsPart.name, text);
        }
      }
    }

    // Phase B: write the copy.
    const zip = new yazl.ZipFile();
    const sink = fs.createWriteStream(temp, { flags: 'wx' });
    zip.outputStream.pipe(sink);
    let failure: unknown;
    for (const part of pkg.parts) {
      const options0 = { mtime: part.modified, compress: part.deflated };
      const plan = plans.get(part.name);
      if (plan) {
        zip.addReadStreamLazy(part.name, options0, (cb) => {
          const out = new PassThrough();
          cb(null, out);
          rewriteSheet(pkg, plan, out, onBytes(part.name)).catch((error: unknown) => {
            failure = failure ?? error;
            out.destroy(error as Error);
            zip.outputStream.unpipe(sink);
            sink.destroy();
          });
        });
      } else if (replaced.has(part.name)) {
        const text = replaced.get(part.name);
        if (text !== null && text !== undefined) zip.addBuffer(Buffer.from(text, 'utf8'), part.name, options0);
      } else {
        zip.addReadStreamLazy(part.name, { ...options0, size: part.uncompressedSize }, (cb) => {
          pkg.stream(part).then(
            (s) => cb(null, s),
            (e: unknown) => cb(e, new PassThrough()),
          );
        });
      }
    }
    const now = options.frozenAt;
    for (const part of added) zip.addBuffer(Buffer.from(part.text, 'utf8'), part.name, { mtime: now });
    zip.end();
    await Promise.race([once(sink, 'close'), once(zip, 'error').then(([e]) => Promise.reject(e))]);
    if (failure) throw failure;
    fs.renameSync(temp, output);
    return { frozen: frozenTotal, sheets: summary, warnings };
  } catch (error) {
    fs.rmSync(temp, { force: true });
    throw error;
  } finally {
    pkg.close();
  }
}

function escapeRegExp(text: string): string {
  return text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}

/** Plans one sheet: its notes, and which of its parts change or are new. */
async function planSheet(
  pkg: ZipPackage,
  sheet: SheetInfo,
  cells: readonly FoundCell[],
  legacyDrawingId: string | undefined,
  options: FreezeOptions,
  taken: Set<number>,
  freshName: (pattern: (n: number) => string) => string,
  warnings: string[],
): Promise<SheetPlan> {
  const rels = await readRelationships(pkg, sheet.part.name);
  const commentsRel = rels.find((r) => r.type.endsWith(REL.comments) && !r.external);
  const vmlRel: Relationship | undefined = legacyDrawingId ? rels.find((r) => r.id === legacyDrawingId) : undefined;
  const threaded = rels.some((r) => r.type.endsWith(REL.threadedComment));
  const commentsPart: ZipPart | undefined = commentsRel ? pkg.part(commentsRel.target) : undefined;
  const vmlPart: ZipPart | undefined = vmlRel ? pkg.part(vmlRel.target) : undefined;
  const commentsXml = commentsPart ? await pkg.text(commentsPart) : undefined;
  const noted = commentsXml ? notedCells(commentsXml) : new Set<string>();

  // The notes: one per ABTEST cell, and the header on A1 (merged when A1 is itself a result).
  const byRef = new Map<string, NoteToAdd>();
  const header = frozenHeaderLine({
    frozenAt: options.frozenAt,
    source: options.source,
    results: cells.length,
  });
  byRef.set('A1', { row: 0, col: 0, ref: 'A1', text: header });
  for (const c of cells) {
    const ref = cellName(c);
    const text = howComputedNote({
      formula: c.formula,
      ...(c.spill ? { spill: rangeName(c.spill) } : {}),
      frozenAt: options.frozenAt,
    });
    const existing = byRef.get(ref);
    byRef.set(ref, {
      row: c.row,
      col: c.col,
      ref,
      text: existing ? `${existing.text}\n\n${text}` : text,
    });
  }
  let notes = [...byRef.values()].sort((a, b) => a.row - b.row || a.col - b.col);
  if (threaded) {
    const skipped = notes.filter((n) => noted.has(n.ref));
    for (const n of skipped) warnings.push(`${sheet.name}!${n.ref} has a threaded comment; no note was added there`);
    notes = notes.filter((n) => !noted.has(n.ref));
  }

  const parts = new Map<string, string>();
  const newParts: { name: string; contentType?: string }[] = [];
  const relsName = relsPartName(sheet.part.name);
  const relsPart = pkg.part(relsName);
  const id = nextId(rels.map((r) => r.id));
  const newRels: string[] = [];
  let legacyDrawing: string | undefined;

  if (commentsXml !== undefined && commentsPart)
    parts.set(commentsPart.name, extendCommentsPart(commentsXml, notes, NOTE_AUTHOR));
  else {
    const name = freshName((n) => `xl/comments${n}.xml`);
    parts.set(name, newCommentsPart(notes, NOTE_AUTHOR));
    newParts.push({ name, contentType: COMMENTS_TYPE });
    newRels.push(relationshipXml(id(), 'comments', relativeTarget(sheet.part.name, name)));
  }
  const fresh = notes.filter((n) => !noted.has(n.ref));
  if (vmlPart) parts.set(vmlPart.name, extendVmlPart(await pkg.text(vmlPart), fresh, taken));
  else {
    if (legacyDrawingId)
      throw new Error(
        `${sheet.part.name} names a legacy drawing ${legacyDrawingId} that its relationships do not hold`,
      );
    const name = freshName((n) => `xl/drawings/vmlDrawing${n}.vml`);
    parts.set(name, newVmlPart(fresh, taken));
    newParts.push({ name });
    const rid = id();
    newRels.push(relationshipXml(rid, 'vmlDrawing', relativeTarget(sheet.part.name, name)));
    legacyDrawing = rid;
  }
  if (newRels.length > 0) {
    if (relsPart)
      parts.set(
        relsPart.name,
        (await pkg.text(relsPart)).replace('</Relationships>', `${newRels.join('')}</Relationships>`),
      );
    else
      parts.set(
        relsName,
        `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Relationships xmlns="${RELS_NS}">${newRels.join('')}</Relationships>`,
      );
  }
  const anchors = new Map(cells.map((c) => [cellKey(c.row, c.col), c]));
  return {
    sheet,
    anchors,
    ...(legacyDrawing ? { legacyDrawing } : {}),
    parts,
    newParts,
    notes: notes.length,
  };
}

/** Streams a sheet through the editor: frozen cells rewritten, a legacyDrawing element added if needed. */
async function rewriteSheet(
  pkg: ZipPackage,
  plan: SheetPlan,
  out: PassThrough,
  onBytes: (n: number) => void,
): Promise<void> {
  const queue: string[] = [];
  const editor = new StreamEditor((text) => queue.push(text));
  const spills = new RangeSweep([]);
  let openCell = -1;
  let rootPrefix = '';
  let rPrefix: string | undefined;
  let inserted = plan.legacyDrawing === undefined;
  const legacyTag = (): string =>
    rPrefix !== undefined
      ? `<${rootPrefix}legacyDrawing ${rPrefix}:id="${plan.legacyDrawing}"/>`
      : `<${rootPrefix}legacyDrawing xmlns:r="${R_NS}" r:id="${plan.legacyDrawing}"/>`;
  const parser = createSheetParser({
    onRoot(name, attributes) {
      const colon = name.indexOf(':');
      rootPrefix = colon < 0 ? '' : name.slice(0, colon + 1);
      for (const [attr, value] of Object.entries(attributes))
        if (attr.startsWith('xmlns:') && value === R_NS) rPrefix = attr.slice(6);
    },
    onCellStart(start) {
      openCell = start;
    },
    onCell(cell) {
      openCell = -1;
      const anchor = plan.anchors.get(cellKey(cell.row, cell.col));
      if (anchor) {
        editor.replace(cell.start, cell.end, frozenCellXml(editor.text(cell.start, cell.end), cell));
        if (anchor.spill) spills.add(anchor.spill);
        return;
      }
      if (cell.attributes.t === 'str' && !cell.formula && spills.contains(cell.row, cell.col)) {
        editor.replace(cell.start, cell.end, frozenCellXml(editor.text(cell.start, cell.end), cell));
      }
    },
    onTopLevel(local, start) {
      if (!inserted && AFTER_LEGACY_DRAWING.has(local)) {
        editor.insert(start, legacyTag());
        inserted = true;
      }
    },
    onWorksheetEnd(start) {
      if (!inserted) {
        editor.insert(start, legacyTag());
        inserted = true;
      }
    },
  });
  const drain = async (): Promise<void> => {
    for (const text of queue.splice(0)) {
      if (!out.write(Buffer.from(text, 'utf8'))) await once(out, 'drain');
    }
  };
  await feedXml(await pkg.stream(plan.sheet.part), parser, plan.sheet.part.name, {
    onChunk: (text) => editor.append(text),
    afterChunk: async () => {
      editor.flush(openCell >= 0 ? Math.min(openCell, parser.consumed) : parser.consumed);
      await drain();
    },
    onByteOrderMark: () => queue.push('\uFEFF'),
    onBytes,
  });
  editor.end();
  await drain();
  out.end();
}
