/**
 * Streaming reader of a worksheet part (ECMA-376 Part 1 §18.3: worksheet › sheetData › row › c, with the
 * cell's formula `<f>`, cached value `<v>` and inline string `<is>`). Calls back once per cell and keeps
 * nothing itself, so a sheet of any size is read in bounded memory.
 *
 * With a `tagStart` function (given by the streaming editor, which keeps the text not yet written) it also
 * reports where each cell, its formula and its value start and end in the part's text, and where the
 * worksheet's top-level elements begin, so the editor can change a cell and leave every other byte alone.
 */
import { SaxesParser, type SaxesOptions } from 'saxes';
import { parseCell } from '../core/cellAddress';
import { localName } from './xml';

/** A cell as read from the part. Offsets are indexes into the part's decoded text (only when tracking). */
export interface RawCell {
  readonly row: number;
  readonly col: number;
  readonly attributes: Readonly<Record<string, string>>;
  /** The formula element, when the cell has one. `text` is empty for a shared formula's dependents. */
  readonly formula?: { readonly text: string; readonly attributes: Readonly<Record<string, string>>; readonly start: number; readonly end: number };
  /** The decoded text of `<v>`, when present. */
  readonly value?: string;
  readonly valueStart?: number;
  readonly valueEnd?: number;
  /** The decoded text of an inline string `<is>` (its `<t>` pieces, phonetic runs left out). */
  readonly inline?: string;
  readonly start: number;
  readonly end: number;
  /** The element prefix the part uses, e.g. "" or "x:". */
  readonly prefix: string;
}

/** Callbacks of {@link createSheetParser}. */
export interface SheetScanHooks {
  onCell(cell: RawCell): void;
  /** A child of <worksheet> begins at `start` (tracking only). */
  onTopLevel?(local: string, start: number): void;
  /** `</worksheet>` begins at `start` (tracking only). */
  onWorksheetEnd?(start: number): void;
  /** A cell element begins at `start` (tracking only); `onCell` follows when it ends. */
  onCellStart?(start: number): void;
  /** The root element's name and attributes (namespace declarations included). */
  onRoot?(name: string, attributes: Readonly<Record<string, string>>): void;
  /** A child of <worksheet> with its attributes, e.g. legacyDrawing r:id="rId2". */
  onTopLevelElement?(local: string, attributes: Readonly<Record<string, string>>): void;
}

interface OpenCell {
  row: number;
  col: number;
  attributes: Record<string, string>;
  start: number;
  prefix: string;
  formula?: { text: string; attributes: Record<string, string>; start: number; end: number };
  value?: string;
  valueStart?: number;
  valueEnd?: number;
  inline?: string;
}

/**
 * A saxes parser wired to read cells. Feed it the part's text (see feedXml).
 * @param tagStart maps a parser position to the index of the last "<" before it (the start of the tag
 * just read); give it to get offsets, leave it out to read values only (offsets are then -1).
 */
export function createSheetParser(hooks: SheetScanHooks, tagStart?: (position: number) => number): SaxesParser {
  const track = tagStart !== undefined;
  const parser = new SaxesParser({ position: track } as SaxesOptions);
  let depth = 0;
  let inSheetData = false;
  let row = -1;
  let lastCol = -1;
  let cell: OpenCell | undefined;
  let collect: 'f' | 'v' | 't' | undefined;
  let inPhonetic = false;
  let pendingStart = -1;

  parser.on('opentagstart', (tag) => {
    depth += 1;
    if (!track) return;
    const local = localName(tag.name);
    if (depth === 2) hooks.onTopLevel?.(local, (tagStart as (p: number) => number)(parser.position));
    if ((depth === 4 && local === 'c' && inSheetData) || (cell && depth === 5 && (local === 'f' || local === 'v'))) {
      pendingStart = (tagStart as (p: number) => number)(parser.position);
      if (local === 'c') hooks.onCellStart?.(pendingStart);
    }
  });

  parser.on('opentag', (tag) => {
    const local = localName(tag.name);
    if (depth === 1) hooks.onRoot?.(tag.name, tag.attributes as Record<string, string>);
    if (depth === 2) hooks.onTopLevelElement?.(local, tag.attributes as Record<string, string>);
    if (depth === 2 && local === 'sheetData') inSheetData = true;
    else if (inSheetData && depth === 3 && local === 'row') {
      const r = Number(tag.attributes.r);
      row = Number.isInteger(r) && r >= 1 ? r - 1 : row + 1;
      lastCol = -1;
    } else if (inSheetData && depth === 4 && local === 'c') {
      const attributes = tag.attributes as Record<string, string>;
      const at = attributes.r !== undefined ? parseCell(attributes.r) : undefined;
      const position = at ?? { row: Math.max(row, 0), col: lastCol + 1 };
      lastCol = position.col;
      const colon = tag.name.indexOf(':');
      cell = { row: position.row, col: position.col, attributes, start: track ? pendingStart : -1, prefix: colon < 0 ? '' : tag.name.slice(0, colon + 1) };
    } else if (cell && depth === 5) {
      if (local === 'f') {
        cell.formula = { text: '', attributes: tag.attributes as Record<string, string>, start: track ? pendingStart : -1, end: -1 };
        collect = 'f';
      } else if (local === 'v') {
        cell.value = '';
        cell.valueStart = track ? pendingStart : -1;
        collect = 'v';
      } else if (local === 'is') cell.inline = '';
    } else if (cell && cell.inline !== undefined && local === 'rPh') inPhonetic = true;
    else if (cell && cell.inline !== undefined && local === 't' && !inPhonetic) collect = 't';
  });

  const onText = (text: string): void => {
    if (!cell || collect === undefined) return;
    if (collect === 'f' && cell.formula) cell.formula.text += text;
    else if (collect === 'v') cell.value += text;
    else if (collect === 't') cell.inline += text;
  };
  parser.on('text', onText);
  parser.on('cdata', onText);

  parser.on('closetag', (tag) => {
    const local = localName(tag.name);
    if (cell && depth === 5) {
      if (local === 'f' && cell.formula) cell.formula.end = track ? parser.position : -1;
      if (local === 'v') cell.valueEnd = track ? parser.position : -1;
      collect = undefined;
    } else if (cell && local === 'rPh') inPhonetic = false;
    else if (cell && local === 't' && collect === 't') collect = undefined;
    else if (cell && depth === 4 && local === 'c') {
      hooks.onCell({ ...cell, end: track ? parser.position : -1 });
      cell = undefined;
    } else if (depth === 2 && local === 'sheetData') inSheetData = false;
    else if (depth === 1 && track) hooks.onWorksheetEnd?.((tagStart as (p: number) => number)(parser.position));
    depth -= 1;
  });
  return parser;
}
