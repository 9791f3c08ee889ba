/**
 * XML helpers on top of saxes: escaping, a small element tree for SMALL parts (relationships, content
 * types, workbook.xml, notes), and a streaming text feeder for large parts (worksheets, shared strings)
 * that never holds more than one chunk of decoded text besides what its caller keeps.
 */
import type { Readable } from 'stream';
import { StringDecoder } from 'string_decoder';
import { SaxesParser, type SaxesOptions } from 'saxes';
import { WorkbookFileError } from './zip';

/**
 * Escapes text for element content or a double-quoted attribute.
 * @example escapeXml('a < b & "c"') //=> 'a &lt; b &amp; &quot;c&quot;'
 */
export function escapeXml(text: string): string {
  return text.replace(/[<>&"]/g, (c) => ({ '<': '&lt;', '>': '&gt;', '&': '&amp;', '"': '&quot;' })[c] as string);
}

/** The local part of a qualified name: "x:c" → "c". */
export function localName(qname: string): string {
  const colon = qname.indexOf(':');
  return colon < 0 ? qname : qname.slice(colon + 1);
}

/** An element of a small part. */
export interface XmlElement {
  readonly name: string;
  readonly local: string;
  readonly attributes: Readonly<Record<string, string>>;
  readonly children: XmlElement[];
  text: string;
}

/**
 * Parses a small XML part into a tree (no namespaces resolved; `local` drops the prefix).
 * @throws {WorkbookFileError} naming the part when it is not well-formed XML.
 */
export function parseSmallXml(text: string, partName: string): XmlElement {
  const parser = new SaxesParser({ position: false } as SaxesOptions);
  const root: XmlElement = {
    name: '#document',
    local: '#document',
    attributes: {},
    children: [],
    text: '',
  };
  const stack: XmlElement[] = [root];
  parser.on('opentag', (tag) => {
    const element: XmlElement = {
      name: tag.name,
      local: localName(tag.name),
      attributes: tag.attributes as Record<string, string>,
      children: [],
      text: '',
    };
    (stack[stack.length - 1] as XmlElement).children.push(element);
    stack.push(element);
  });
  parser.on('closetag', () => {
    stack.pop();
  });
  const addText = (t: string): void => {
    (stack[stack.length - 1] as XmlElement).text += t;
  };
  parser.on('text', addText);
  parser.on('cdata', addText);
  try {
    parser.write(text).close();
  } catch (error) {
    throw new WorkbookFileError(`part ${partName} is not well-formed XML: ${(error as Error).message}`);
  }
  const top = root.children[0];
  if (!top) throw new WorkbookFileError(`part ${partName} has no root element`);
  return top;
}

/** The children of `element` with local name `local`. */
export function childrenNamed(element: XmlElement, local: string): XmlElement[] {
  return element.children.filter((c) => c.local === local);
}

/** Attribute by local name (ignoring any prefix), e.g. "r:id" for "id". */
export function attributeLocal(element: XmlElement, local: string): string | undefined {
  for (const [name, value] of Object.entries(element.attributes))
    if (localName(name) === local && name !== 'xmlns') return value;
  return undefined;
}

/** What {@link feedXml} feeds: saxes or the fast tokenizer. */
export interface XmlSink {
  write(text: string): unknown;
  close(): unknown;
}

/** Callbacks of {@link feedXml}. */
export interface FeedOptions {
  /** Each decoded text chunk, before the parser sees it. */
  readonly onChunk?: (text: string) => void;
  /** After the parser has taken a chunk: the place to write out edited text and wait for the reader. */
  readonly afterChunk?: () => void | Promise<void>;
  /** Bytes read from the part (for progress). */
  readonly onBytes?: (count: number) => void;
  /** Called once when the part starts with a byte-order mark (which the parser does not see). */
  readonly onByteOrderMark?: () => void;
}

/**
 * Streams a part's bytes as decoded text chunks into `parser` (saxes or the fast tokenizer), without a
 * byte-order mark. Resolves when
 * the part has been read and the parser closed.
 * @throws {WorkbookFileError} naming the part when it is not well-formed XML or is UTF-16.
 */
export async function feedXml(
  stream: Readable,
  parser: XmlSink,
  partName: string,
  options: FeedOptions = {},
): Promise<void> {
  const decoder = new StringDecoder('utf8');
  let first = true;
  const take = async (text: string): Promise<void> => {
    options.onChunk?.(text);
    parser.write(text);
    await options.afterChunk?.();
  };
  try {
    for await (const raw of stream) {
      const bytes = raw as Buffer;
      options.onBytes?.(bytes.length);
      if (
        first &&
        bytes.length >= 2 &&
        ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff))
      ) {
        throw new WorkbookFileError(`part ${partName} is UTF-16 text; only UTF-8 parts are supported`);
      }
      let text = decoder.write(bytes);
      if (first && text.length > 0) {
        if (text.charCodeAt(0) === 0xfeff) {
          text = text.slice(1);
          options.onByteOrderMark?.();
        }
        first = false;
      }
      if (text.length > 0) await take(text);
    }
    const rest = decoder.end();
    if (rest) await take(rest);
    parser.close();
  } catch (error) {
    stream.destroy();
    if (error instanceof WorkbookFileError) throw error;
    throw new WorkbookFileError(`part ${partName} is not well-formed XML: ${(error as Error).message}`);
  }
}
