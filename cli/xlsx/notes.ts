/**
 * Cell notes in the file format Excel reads them from (its "notes", the legacy comments): a comments part
 * (ECMA-376 Part 1 §18.7, `comments` › `authors`, `commentList` › `comment ref` › `text`) and a VML drawing
 * part holding one hidden text-box shape per note (ECMA-376 Part 4, VML; `x:ClientData ObjectType="Note"`
 * with the cell's zero-based `x:Row` and `x:Column`). The VML shape layout follows what Excel itself
 * writes, from memory: a `_x0000_t202` shape type, shape ids in blocks of 1024 named by `o:idmap`.
 *
 * Everything here works on the text of small parts; existing notes are kept and new ones appended.
 */
import { escapeXml } from './xml';

/** A note to add. */
export interface NoteToAdd {
  readonly row: number;
  readonly col: number;
  readonly ref: string;
  readonly text: string;
}

const MAIN_NS = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';

/** The `<text>` content of a note: one run, its line breaks kept. */
function noteRun(text: string, prefix: string): string {
  return `<${prefix}r><${prefix}rPr><${prefix}sz val="9"/><${prefix}rFont val="Tahoma"/></${prefix}rPr><${prefix}t xml:space="preserve">${escapeXml(text)}</${prefix}t></${prefix}r>`;
}

/** A new comments part holding `notes` by `author`. */
export function newCommentsPart(notes: readonly NoteToAdd[], author: string): string {
  const list = notes
    .map((n) => `<comment ref="${n.ref}" authorId="0"><text>${noteRun(n.text, '')}</text></comment>`)
    .join('');
  return `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<comments xmlns="${MAIN_NS}"><authors><author>${escapeXml(author)}</author></authors><commentList>${list}</commentList></comments>`;
}

/** The cells that already have a note in an existing comments part. */
export function notedCells(commentsXml: string): Set<string> {
  const refs = new Set<string>();
  for (const m of commentsXml.matchAll(/<(?:\w+:)?comment\s[^>]*?\bref="([^"]+)"/g))
    refs.add((m[1] as string).toUpperCase());
  return refs;
}

/**
 * An existing comments part with `notes` added: a note on a cell that already has one is appended to its
 * text after a blank line (the reader's note stays first); other notes are added to the list by `author`
 * (added to the authors when missing).
 */
export function extendCommentsPart(xml: string, notes: readonly NoteToAdd[], author: string): string {
  const root = /<(\w+:)?comments[\s>]/.exec(xml);
  const p = root?.[1] ?? '';
  let out = xml;
  const existing = notedCells(xml);
  for (const note of notes.filter((n) => existing.has(n.ref))) {
    const open = new RegExp(`<${p}comment\\s[^>]*?\\bref="${note.ref}"[^>]*>`, 'i').exec(out);
    if (!open) continue;
    const close = out.indexOf(`</${p}text>`, open.index);
    if (close < 0) continue;
    out = `${out.slice(0, close)}${noteRun(`\n\n${note.text}`, p)}${out.slice(close)}`;
  }
  const fresh = notes.filter((n) => !existing.has(n.ref));
  if (fresh.length === 0) return out;
  const authors = [...out.matchAll(new RegExp(`<${p}author>([^<]*)</${p}author>`, 'g'))].map((m) => m[1]);
  let authorId = authors.indexOf(escapeXml(author));
  if (authorId < 0) {
    authorId = authors.length;
    const entry = `<${p}author>${escapeXml(author)}</${p}author>`;
    if (out.includes(`</${p}authors>`)) out = out.replace(`</${p}authors>`, `${entry}</${p}authors>`);
    else out = out.replace(new RegExp(`<${p}authors\\s*/>`), `<${p}authors>${entry}</${p}authors>`);
  }
  const list = fresh
    .map(
      (n) =>
        `<${p}comment ref="${n.ref}" authorId="${authorId}"><${p}text>${noteRun(n.text, p)}</${p}text></${p}comment>`,
    )
    .join('');
  if (out.includes(`</${p}commentList>`)) return out.replace(`</${p}commentList>`, `${list}</${p}commentList>`);
  return out.replace(new RegExp(`<${p}commentList\\s*/>`), `<${p}commentList>${list}</${p}commentList>`);
}

/** The shape-id blocks (`o:idmap data="1,2"`) a VML drawing uses. */
export function vmlBlocks(vml: string): number[] {
  const blocks: number[] = [];
  for (const m of vml.matchAll(/<o:idmap\b[^>]*\bdata="([^"]*)"/g)) {
    for (const piece of (m[1] as string).split(',')) if (/^\s*\d+\s*$/.test(piece)) blocks.push(Number(piece));
  }
  return blocks;
}

const SHAPE_TYPE =
  '<v:shapetype id="_x0000_t202" coordsize="21600,21600" o:spt="202" path="m,l,21600r21600,l21600,xe">' +
  '<v:stroke joinstyle="miter"/><v:path gradientshapeok="t" o:connecttype="rect"/></v:shapetype>';

/** One hidden note box beside its cell: 3 columns wide, as many rows as the text needs (at most 12). */
function noteShape(id: number, note: NoteToAdd, zIndex: number): string {
  const lines = note.text.split('\n').reduce((n, line) => n + Math.max(1, Math.ceil(line.length / 48)), 0);
  const rows = Math.min(12, lines + 1);
  const top = Math.max(0, note.row - 1);
  return (
    `<v:shape id="_x0000_s${id}" type="#_x0000_t202" style="position:absolute;margin-left:80pt;margin-top:2pt;width:216pt;height:${rows * 15}pt;` +
    `z-index:${zIndex};visibility:hidden" fillcolor="#ffffe1" o:insetmode="auto"><v:fill color2="#ffffe1"/>` +
    '<v:shadow on="t" color="black" obscured="t"/><v:path o:connecttype="none"/><v:textbox style="mso-direction-alt:auto"><div style="text-align:left"></div></v:textbox>' +
    `<x:ClientData ObjectType="Note"><x:MoveWithCells/><x:SizeWithCells/><x:Anchor>${note.col + 1}, 15, ${top}, 10, ${note.col + 4}, 15, ${top + rows}, 4</x:Anchor>` +
    `<x:AutoFill>False</x:AutoFill><x:Row>${note.row}</x:Row><x:Column>${note.col}</x:Column></x:ClientData></v:shape>`
  );
}

/** Picks `count` shape ids inside `blocks` not in `used`, adding blocks not in `taken` when needed. */
function allocateIds(count: number, blocks: number[], used: Set<number>, taken: Set<number>): number[] {
  const ids: number[] = [];
  let b = 0;
  while (ids.length < count) {
    if (b >= blocks.length) {
      let fresh = 1;
      while (taken.has(fresh)) fresh += 1;
      taken.add(fresh);
      blocks.push(fresh);
    }
    const block = blocks[b] as number;
    for (let id = block * 1024 + 1; id < block * 1024 + 1024 && ids.length < count; id += 1)
      if (!used.has(id)) ids.push(id);
    b += 1;
  }
  return ids;
}

/**
 * A new VML drawing with one note box per note. `taken` holds the id blocks other drawings of the workbook
 * use; the blocks this drawing takes are added to it.
 */
export function newVmlPart(notes: readonly NoteToAdd[], taken: Set<number>): string {
  const blocks: number[] = [];
  const ids = allocateIds(notes.length, blocks, new Set(), taken);
  const shapes = notes.map((n, i) => noteShape(ids[i] as number, n, i + 1)).join('');
  return (
    '<xml xmlns:v="urn:schemas-microsoft-com:vml" xmlns:o="urn:schemas-microsoft-com:office:office" xmlns:x="urn:schemas-microsoft-com:office:excel">' +
    `<o:shapelayout v:ext="edit"><o:idmap v:ext="edit" data="${blocks.join(',')}"/></o:shapelayout>${SHAPE_TYPE}${shapes}</xml>`
  );
}

/**
 * An existing VML drawing with note boxes added for `notes` (cells without a note so far), keeping every
 * shape it has. Ids come from its own blocks first.
 */
export function extendVmlPart(vml: string, notes: readonly NoteToAdd[], taken: Set<number>): string {
  if (notes.length === 0) return vml;
  const blocks = vmlBlocks(vml);
  const before = blocks.length;
  const used = new Set([...vml.matchAll(/_x0000_s(\d+)/g)].map((m) => Number(m[1])));
  const ids = allocateIds(notes.length, blocks, used, taken);
  let zIndex = used.size;
  const shapes = notes.map((n, i) => noteShape(ids[i] as number, n, (zIndex += 1))).join('');
  let out = vml;
  if (blocks.length > before) {
    if (before === 0)
      out = out.replace(
        /(<xml\b[^>]*>)/,
        `$1<o:shapelayout v:ext="edit"><o:idmap v:ext="edit" data="${blocks.join(',')}"/></o:shapelayout>`,
      );
    else out = out.replace(/(<o:idmap\b[^>]*\bdata=")([^"]*)(")/, `$1${blocks.join(',')}$3`);
  }
  const type = /id="_x0000_t202"/.test(out) ? '' : SHAPE_TYPE;
  const end = out.lastIndexOf('</xml>');
  if (end < 0) throw new Error('the VML drawing has no closing </xml>');
  return `${out.slice(0, end)}${type}${shapes}${out.slice(end)}`;
}
