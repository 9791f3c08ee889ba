/**
 * A streaming text editor for one XML part: text goes in chunk by chunk, edits (replace a span, insert at
 * an offset) are applied as the parser reports positions, and everything before the last place an edit can
 * still touch is written out. Offsets are indexes into the whole part's text (as saxes counts them).
 *
 * What is kept: the text from the start of an open cell or of a tag the tokenizer has not finished (the
 * caller says where); so memory stays at about one chunk plus one cell.
 */
export class StreamEditor {
  private pending = '';
  private base = 0;

  constructor(private readonly emit: (text: string) => void) {}

  /** Adds the next chunk of the part's text. */
  append(text: string): void {
    this.pending += text;
  }

  /** The text between two offsets (both not yet written out). */
  text(start: number, end: number): string {
    return this.pending.slice(start - this.base, end - this.base);
  }

  /** Replaces the span [start, end) with `replacement` and writes out everything before it. */
  replace(start: number, end: number, replacement: string): void {
    if (start < this.base) throw new Error(`stream editor: offset ${start} was already written out`);
    this.emit(this.pending.slice(0, start - this.base) + replacement);
    this.pending = this.pending.slice(end - this.base);
    this.base = end;
  }

  /** Inserts `text` at `offset`. */
  insert(offset: number, text: string): void {
    this.replace(offset, offset, text);
  }

  /** Writes out the text before offset `upTo` (the earliest place an edit can still touch). */
  flush(upTo: number): void {
    const cut = Math.min(upTo - this.base, this.pending.length);
    if (cut <= 0) return;
    this.emit(this.pending.slice(0, cut));
    this.pending = this.pending.slice(cut);
    this.base += cut;
  }

  /** Writes out the rest. */
  end(): void {
    if (this.pending) this.emit(this.pending);
    this.base += this.pending.length;
    this.pending = '';
  }
}
