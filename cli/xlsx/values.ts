/**
 * A cell's cached value as stored (ECMA-376 Part 1 §18.3.1.4 `c`, its `t` attribute §18.18.11 and `<v>`),
 * and its decoding into the value a formula sees. Shared-string indexes are resolved afterwards from the
 * shared strings part, reading only the indexes that were asked for.
 */
import type { Readable } from 'stream';
import type { SavedValue } from '../core/compare';
import { FastXmlTokenizer } from './fastXml';
import { feedXml, localName } from './xml';

/** A cached value as stored: the cell's type and the text of `<v>` (or of the inline string). */
export interface StoredValue {
  readonly type: string;
  readonly text?: string;
}

/** A stored value that cannot be used as a number, text, TRUE/FALSE or error. */
export interface UnreadableValue {
  readonly unreadable: string;
}

/** From a cell's attributes and children to its stored value; undefined when the cell caches nothing. */
export function storedValueOf(
  type: string | undefined,
  value: string | undefined,
  inline: string | undefined,
): StoredValue | undefined {
  const t = type ?? 'n';
  if (t === 'inlineStr')
    return inline === undefined
      ? value === undefined
        ? undefined
        : { type: 'str', text: value }
      : { type: 'str', text: inline };
  if (value === undefined) return undefined;
  return { type: t, text: value };
}

/**
 * The value a formula sees, with shared strings looked up in `sharedStrings`.
 * @example decodeStored({ type: 'b', text: '1' }, new Map()) //=> true
 */
export function decodeStored(
  stored: StoredValue | undefined,
  sharedStrings: ReadonlyMap<number, string>,
): SavedValue | UnreadableValue {
  if (stored === undefined) return null;
  const text = stored.text ?? '';
  switch (stored.type) {
    case 'n': {
      if (text.trim() === '') return null;
      const n = Number(text);
      return Number.isFinite(n) ? n : { unreadable: `the number "${text}" cannot be read` };
    }
    case 'str':
      return text;
    case 's': {
      const s = sharedStrings.get(Number(text));
      return s === undefined ? { unreadable: `shared string ${text} is missing` } : s;
    }
    case 'b':
      return text === '1' || text.toLowerCase() === 'true';
    case 'e':
      return { error: text.toUpperCase() };
    case 'd':
      return {
        unreadable: `a date stored as text (${text}); save the workbook from Excel to store it as a number`,
      };
    default:
      return { unreadable: `an unknown cell type "${stored.type}"` };
  }
}

/** True for the decoded value of an unreadable stored value. */
export function isUnreadable(value: unknown): value is UnreadableValue {
  return typeof value === 'object' && value !== null && typeof (value as UnreadableValue).unreadable === 'string';
}

/**
 * Reads the shared strings part (ECMA-376 Part 1 §18.4.9 `sst` › `si`), streaming with the fast tokenizer,
 * and keeps only the entries whose index is in `wanted` (text of its `<t>` pieces, phonetic runs left out).
 */
export async function readSharedStrings(
  stream: Readable,
  partName: string,
  wanted: ReadonlySet<number>,
  onBytes?: (n: number) => void,
): Promise<Map<number, string>> {
  const found = new Map<number, string>();
  if (wanted.size === 0) {
    stream.destroy();
    return found;
  }
  let index = -1;
  let text: string | undefined;
  let inT = false;
  let inPhonetic = false;
  const parser = new FastXmlTokenizer({
    open(name) {
      const local = localName(name);
      if (local === 'si') {
        index += 1;
        text = wanted.has(index) ? '' : undefined;
      } else if (local === 'rPh') inPhonetic = true;
      else if (local === 't' && !inPhonetic) inT = true;
    },
    text(t) {
      if (inT && text !== undefined) text += t;
    },
    close(name) {
      const local = localName(name);
      if (local === 't') inT = false;
      else if (local === 'rPh') inPhonetic = false;
      else if (local === 'si' && text !== undefined) found.set(index, text);
    },
  });
  await feedXml(stream, parser, partName, { ...(onBytes ? { onBytes } : {}) });
  return found;
}
