/**
 * A saved workbook's package (an OPC zip, ECMA-376 Part 2) opened for reading with yauzl: the central
 * directory is read once, then each part is streamed on demand, so no part is held in memory unless a
 * caller reads it whole (only small parts are: relationships, content types, workbook.xml, notes).
 */
import type { Readable } from 'stream';
import * as yauzl from 'yauzl';

/** A file the command cannot read, with a message for the user (exit code 2). */
export class WorkbookFileError extends Error {
  override readonly name = 'WorkbookFileError';
}

/** One part of the package. */
export interface ZipPart {
  /** The name as stored, e.g. "xl/worksheets/sheet1.xml" (no leading slash). */
  readonly name: string;
  readonly entry: yauzl.Entry;
  readonly uncompressedSize: number;
  /** False when the part was stored without compression (method 0). */
  readonly deflated: boolean;
  readonly modified: Date;
}

/** An opened package. Close it when done. */
export class ZipPackage {
  private readonly byLowerName: Map<string, ZipPart>;

  private constructor(
    private readonly zip: yauzl.ZipFile,
    /** The parts in the order they are stored. */
    readonly parts: readonly ZipPart[],
  ) {
    this.byLowerName = new Map(parts.map((p) => [p.name.toLowerCase(), p]));
  }

  /**
   * Opens `file` and reads its central directory.
   * @throws {WorkbookFileError} when the file is missing or not a zip package.
   */
  static async open(file: string): Promise<ZipPackage> {
    let zip: yauzl.ZipFile;
    try {
      zip = await yauzl.openPromise(file, {
        lazyEntries: true,
        autoClose: false,
        strictFileNames: false,
      });
    } catch (error) {
      const code = (error as NodeJS.ErrnoException).code;
      if (code === 'ENOENT') throw new WorkbookFileError(`${file}: no such file`);
      if (code === 'EISDIR') throw new WorkbookFileError(`${file} is a folder, not a workbook file`);
      if (code === 'EACCES') throw new WorkbookFileError(`${file}: permission denied`);
      throw new WorkbookFileError(`${file} is not a workbook file (.xlsx): ${(error as Error).message}`);
    }
    const parts: ZipPart[] = [];
    try {
      for await (const entry of zip.eachEntry()) {
        if (entry.fileName.endsWith('/')) continue;
        if (entry.isEncrypted())
          throw new WorkbookFileError(
            `${file} is encrypted (a password-protected workbook); save it without a password first`,
          );
        if (entry.compressionMethod !== 0 && entry.compressionMethod !== 8) {
          throw new WorkbookFileError(
            `${file}: part ${entry.fileName} uses compression method ${entry.compressionMethod}, which this tool cannot read`,
          );
        }
        parts.push({
          name: entry.fileName,
          entry,
          uncompressedSize: entry.uncompressedSize,
          deflated: entry.compressionMethod === 8,
          modified: entry.getLastModDate(),
        });
      }
    } catch (error) {
      zip.close();
      if (error instanceof WorkbookFileError) throw error;
      throw new WorkbookFileError(`${file} is not a readable workbook file: ${(error as Error).message}`);
    }
    return new ZipPackage(zip, parts);
  }

  /** The part named `name` (case-insensitive, as OPC part names are), or undefined. */
  part(name: string): ZipPart | undefined {
    return this.byLowerName.get(name.replace(/^\//, '').toLowerCase());
  }

  /** A stream of the part's uncompressed bytes. */
  async stream(part: ZipPart): Promise<Readable> {
    return this.zip.openReadStreamPromise(part.entry);
  }

  /** The part's bytes, whole. For small parts only. */
  async bytes(part: ZipPart): Promise<Buffer> {
    const chunks: Buffer[] = [];
    for await (const chunk of await this.stream(part)) chunks.push(chunk as Buffer);
    return Buffer.concat(chunks);
  }

  /** The part as UTF-8 text, whole (a byte-order mark is dropped). For small parts only. */
  async text(part: ZipPart): Promise<string> {
    return decodeXmlBytes(await this.bytes(part), part.name);
  }

  close(): void {
    this.zip.close();
  }
}

/**
 * UTF-8 bytes of an XML part → text without a byte-order mark.
 * @throws {WorkbookFileError} for a UTF-16 part (allowed by XML, not written by Excel; not supported).
 */
export function decodeXmlBytes(bytes: Buffer, name: string): string {
  if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
    throw new WorkbookFileError(`part ${name} is UTF-16 text; only UTF-8 parts are supported`);
  }
  const text = bytes.toString('utf8');
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}
