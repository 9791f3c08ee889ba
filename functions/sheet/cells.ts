/**
 * The input policy for cells, written down once.
 *
 * Excel hands a range argument declared `any[][]` to a custom function as rows of cell values. Lift
 * Ledger reads every such cell the same way:
 *
 * - **Blank**: `""`, `null`, `undefined`, or text made only of spaces. A blank cell is "nothing here"; the
 *   variant readers decide whether a blank is allowed at that position (see variants.ts).
 * - **Number**: a finite JavaScript number. `NaN` and infinities are rejected as "not a finite number".
 * - **Text**, even text that looks like a number (`"120"`): rejected. A count typed as text is usually a
 *   pasted value that Excel did not convert, and silently reading it would hide the problem. The message
 *   says how to fix it (VALUE() or re-typing the cell).
 * - **Logical** (`TRUE`/`FALSE`): rejected; Excel's own statistics functions ignore logicals in ranges,
 *   and a logical where a count belongs is a mistake.
 * - **Data types** (Excel passes them as objects because functions.json has allowCustomDataForDataTypeAny):
 *   a formatted number is read as its number, an entity (linked data type) as the text it shows, so it
 *   serves as a label and is refused as text where a number belongs.
 * - **Anything else** (an error value): rejected as "not a number".
 *
 * A range must be a single row or a single column; a single cell counts as a column of one.
 */

/** What one cell holds, after classification. */
export type SheetCell =
  | { readonly kind: 'blank' }
  | { readonly kind: 'number'; readonly value: number }
  | { readonly kind: 'text'; readonly text: string }
  | { readonly kind: 'logical'; readonly value: boolean }
  | { readonly kind: 'other'; readonly description: string };

/** How a one-dimensional range lies on the sheet; spills follow it. */
export type Orientation = 'column' | 'row';

/** A range read as a list of cells, with the shape it had on the sheet. */
export interface CellList {
  readonly orientation: Orientation;
  readonly rows: number;
  readonly columns: number;
  readonly cells: readonly unknown[];
}

/**
 * Classifies one cell value under the input policy above.
 *
 * Cost O(length of text). Never throws.
 * @example classifyCell("") //=> { kind: 'blank' }
 * @example classifyCell(12) //=> { kind: 'number', value: 12 }
 */
export function classifyCell(cell: unknown): SheetCell {
  if (cell === null || cell === undefined) return { kind: 'blank' };
  if (typeof cell === 'string') return cell.trim() === '' ? { kind: 'blank' } : { kind: 'text', text: cell };
  if (typeof cell === 'number') {
    return Number.isFinite(cell) ? { kind: 'number', value: cell } : { kind: 'other', description: String(cell) };
  }
  if (typeof cell === 'boolean') return { kind: 'logical', value: cell };
  // A data type (formatted number, entity) arrives as an object, as functions.json allows custom data:
  // read its plain value, or an entity's shown text (its plain value is only "#VALUE!").
  if (typeof cell === 'object' && cell !== null && 'basicValue' in cell) {
    const data = cell as { type?: unknown; basicValue?: unknown; basicType?: unknown; text?: unknown };
    // an entity is the text it shows, whatever its basic value (a number shown on a card is still a label)
    if (data.type === 'Entity') {
      const shown = typeof data.text === 'string' && data.text.trim() !== '' ? data.text : 'a linked data type';
      return { kind: 'text', text: shown };
    }
    const plain = data.basicType === 'Error' && typeof data.text === 'string' ? data.text : data.basicValue;
    if (typeof plain !== 'object' || plain === null) return classifyCell(plain);
  }
  if (typeof cell === 'object' && cell !== null && 'code' in cell) {
    return { kind: 'other', description: `the error value ${String((cell as { code: unknown }).code)}` };
  }
  return { kind: 'other', description: 'a value that is not a plain number' };
}

/** "3 rows × 1 column" */
export function describeShape(rows: number, columns: number): string {
  return `${rows} ${rows === 1 ? 'row' : 'rows'} × ${columns} ${columns === 1 ? 'column' : 'columns'}`;
}

/**
 * Reads a range argument into a flat list of cells, keeping its orientation.
 *
 * Accepts what Excel passes for an `any[][]` parameter (rows of cells) and, for robustness, a bare
 * scalar (read as a 1 × 1 range) or a flat array (read as a column). Cost O(cells).
 * @throws {ArgumentProblem} when the range is empty, ragged, or has more than one row and more than one column.
 * @example readCellList('visitors', [[1], [2]]) //=> { orientation: 'column', rows: 2, columns: 1, cells: [1, 2] }
 */
export function readCellList(name: string, range: unknown): CellList {
  const rowsOf: unknown[][] = Array.isArray(range)
    ? range.map((row: unknown) => (Array.isArray(row) ? (row as unknown[]) : [row]))
    : [[range]];
  const rows = rowsOf.length;
  const columns = rowsOf[0]?.length ?? 0;
  if (rows === 0 || columns === 0) throw new ArgumentProblem(`${name}: the range is empty`);
  if (rowsOf.some((row) => row.length !== columns)) throw new ArgumentProblem(`${name}: the range is not rectangular`);
  if (rows > 1 && columns > 1) {
    throw new ArgumentProblem(
      `${name}: a range of ${describeShape(rows, columns)} was given; use a single row or a single column (one cell per variant)`,
    );
  }
  const cells = rows > 1 || columns === 1 ? rowsOf.map((row) => row[0]) : (rowsOf[0] as unknown[]);
  return { orientation: rows === 1 && columns > 1 ? 'row' : 'column', rows, columns, cells };
}

/**
 * A problem with what the user typed, found by the sheet layer before the core runs. The one mapping in
 * run.ts turns it into `#VALUE!` with this message.
 */
export class ArgumentProblem extends Error {
  override readonly name = 'ArgumentProblem';
}
