/**
 * Streaming reader of a worksheet part (ECMA-376 Part 1 §18.3: worksheet › sheetData › row › c, with the
 * cell's formula `<f>`, cached value `<v>` and inline string `<is>`). Calls back once per cell and keeps
 * nothing itself, so a sheet of any size is read in bounded memory.
 *
 * It also reports where each cell, its formula and its value start and end in the part's text, and where
 * the worksheet's top-level elements begin, so the streaming editor can change a cell and leave every
 * other byte alone. The part is read with the fast tokenizer (fastXml.ts).
 */
import { parseCell } from '../core/cellAddress';
import { FastXmlTokenizer } from './fastXml';
import { localName } from './xml';

/** A cell as read from the part. Offsets are indexes into the part's decoded text. */
export interface RawCell {
  readonly row: number;
  readonly col: number;
  readonly attributes: Readonly<Record<string, string>>;
  /** The formula element, when the cell has one. `text` is empty for a shared formula's dependents. */
  readonly formula?: {
    readonly text: string;
    readonly attributes: Readonly<Record<string, string>>;
    readonly start: number;
    readonly end: number;
  };
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
  /** A child of <worksheet> begins at `start`. */
  onTopLevel?(local: string, start: number): void;
  /** `</worksheet>` begins at `start`. */
  onWorksheetEnd?(start: number): void;
  /** A cell element begins at `start`; `onCell` follows when it ends. */
  onCellStart?(start: number): void;
  /** The root element's name and attributes (namespace declarations included). */
  onRoot?(name: string, attributes: Readonly<Record<string, string>>): void;
  /** A child of <worksheet> with its attributes, e.g. legacyDrawing r:id="rId2". */
  onTopLevelElement?(local: string, attributes: Readonly<Record<string, string>>): void;
  /** When given and false for a row (zero-based), that row's cells are skipped unread. */
  wantRow?(row: number): boolean;
}

interface OpenCell {
  row: number;
  col: number;
  attributes: Record<string, string>;
  start: number;
  end: number;
  prefix: string;
  formula?: {
    text: string;
    attributes: Record<string, string>;
    start: number;
    end: number;
  };
  value?: string;
  valueStart?: number;
  valueEnd?: number;
  inline?: string;
}

/**
 * A tokenizer wired to read cells. Feed it the part's text (see feedXml); its `consumed` offset says how far
 * the text has been read.
 */
export function createSheetParser(hooks: SheetScanHooks): FastXmlTokenizer {
  let depth = 0;
  let inSheetData = false;
  let row = -1;
  let lastCol = -1;
  let cell: OpenCell | undefined;
  let collect = 0; // 1 formula, 2 value, 3 inline text
  let inPhonetic = false;

  const tokenizer: FastXmlTokenizer = new FastXmlTokenizer({
    open(name, attributes, start, _end, selfClosing) {
      depth += 1;
      const local = localName(name);
      if (depth === 1) hooks.onRoot?.(name, attributes);
      else if (depth === 2) {
        hooks.onTopLevel?.(local, start);
        hooks.onTopLevelElement?.(local, attributes);
        if (local === 'sheetData') inSheetData = true;
      } else if (inSheetData && depth === 3 && local === 'row') {
        const r = Number(attributes.r);
        row = Number.isInteger(r) && r >= 1 ? r - 1 : row + 1;
        lastCol = -1;
        if (hooks.wantRow && !selfClosing && !hooks.wantRow(row)) tokenizer.skipContent();
      } else if (inSheetData && depth === 4 && local === 'c') {
        const at = attributes.r !== undefined ? parseCell(attributes.r) : undefined;
        const position = at ?? { row: Math.max(row, 0), col: lastCol + 1 };
        lastCol = position.col;
        const colon = name.indexOf(':');
        hooks.onCellStart?.(start);
        cell = {
          row: position.row,
          col: position.col,
          attributes,
          start,
          end: -1,
          prefix: colon < 0 ? '' : name.slice(0, colon + 1),
        };
      } else if (cell && depth === 5) {
        if (local === 'f') {
          cell.formula = { text: '', attributes, start, end: -1 };
          collect = 1;
        } else if (local === 'v') {
          cell.value = '';
          cell.valueStart = start;
          collect = 2;
        } else if (local === 'is') cell.inline = '';
      } else if (cell && cell.inline !== undefined && local === 'rPh') inPhonetic = true;
      else if (cell && cell.inline !== undefined && local === 't' && !inPhonetic) collect = 3;
    },
    text(text) {
      if (!cell || collect === 0) return;
      if (collect === 1 && cell.formula) cell.formula.text += text;
      else if (collect === 2) cell.value += text;
      else if (collect === 3) cell.inline += text;
    },
    close(name, start, end) {
      if (cell && depth === 5) {
        const local = localName(name);
        if (local === 'f' && cell.formula) cell.formula.end = end;
        else if (local === 'v') cell.valueEnd = end;
        collect = 0;
      } else if (cell && depth === 4) {
        cell.end = end;
        hooks.onCell(cell);
        cell = undefined;
      } else if (cell && depth > 5) {
        const local = localName(name);
        if (local === 'rPh') inPhonetic = false;
        else if (local === 't' && collect === 3) collect = 0;
      } else if (depth === 2 && inSheetData && localName(name) === 'sheetData') inSheetData = false;
      else if (depth === 1) hooks.onWorksheetEnd?.(start);
      depth -= 1;
    },
  });
  return tokenizer;
}
