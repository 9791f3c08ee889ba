/**
 * `lift-ledger audit`: recomputes every ABTEST formula of a saved workbook from the cached values of its
 * argument cells with the add-in's own functions, and says for each whether the saved result agrees.
 *
 * Three streaming passes, each bounded in memory by what the formulas need, never by the file:
 * 1. every worksheet: the ABTEST cells, their cached values and those of their spills;
 * 2. only the worksheets that hold argument cells: the cached values of those cells;
 * 3. the shared strings: only the entries those values point at.
 */
import { cellName, rangeName, rangeSize, type CellRange } from './core/cellAddress';
import { DEFAULT_TOLERANCE, isErrorValue, valuesAgree, type SavedValue } from './core/compare';
import { abtestFunctionName, displayFormula, parseFormula, type FormulaNode, type RefNode } from './core/formula';
import { isCustomFunctionsError, type AddinFunctions } from './addin';
import { cellKey, scanSheet, type AbtestCell } from './scan';
import { readWorkbookStructure, type SheetInfo, type WorkbookStructure } from './xlsx/package';
import { decodeStored, isUnreadable, readSharedStrings, type StoredValue } from './xlsx/values';
import { ZipPackage } from './xlsx/zip';

/** Largest argument range the audit reads (cells); larger ones are reported as not checkable. */
export const MAX_ARGUMENT_CELLS = 1_000_000;

/** How one ABTEST formula fared. */
export type AuditStatus = 'agrees' | 'differs' | 'not-checkable';

/** A cell whose saved value and recomputed value differ. */
export interface CellDifference {
  readonly cell: string;
  readonly saved: SavedValue;
  readonly recomputed: SavedValue;
}

/** One ABTEST formula's result. */
export interface AuditEntry {
  readonly sheet: string;
  readonly cell: string;
  /** The formula as a user sees it, e.g. "=ABTEST.PROB_HIGHEST(C2:C4,B2:B4)". */
  readonly formula: string;
  /** The ABTEST function at the top of the formula, when there is one. */
  readonly function?: string;
  readonly status: AuditStatus;
  /** Why the formula is not checkable, or what differs in its shape. */
  readonly reason?: string;
  /** The range the saved result covers, when more than one cell. */
  readonly spill?: string;
  /** Cells compared. */
  readonly compared: number;
  readonly differences: readonly CellDifference[];
  /** The message of the worksheet error the recomputation gave, when it gave one. */
  readonly errorMessage?: string;
}

/** The whole audit. */
export interface AuditReport {
  readonly file: string;
  readonly tolerance: number;
  readonly addinFolder: string;
  readonly entries: readonly AuditEntry[];
  readonly summary: {
    readonly formulas: number;
    readonly agree: number;
    readonly differ: number;
    readonly notCheckable: number;
  };
}

/** Options of {@link auditWorkbook}. */
export interface AuditOptions {
  readonly tolerance?: number;
  /** Called as parts are read: bytes done and bytes planned (uncompressed), and the part being read. */
  readonly onProgress?: (done: number, total: number, part: string) => void;
}

type ArgPlan =
  | {
      readonly kind: 'value';
      readonly value: SavedValue;
      readonly matrix: boolean;
    }
  | { readonly kind: 'array'; readonly rows: readonly (readonly SavedValue[])[] }
  | {
      readonly kind: 'range';
      readonly sheet: SheetInfo;
      readonly range: CellRange;
      readonly matrix: boolean;
    }
  | { readonly kind: 'missing' };

type Plan =
  | {
      readonly ok: true;
      readonly functionName: string;
      readonly args: readonly ArgPlan[];
    }
  | {
      readonly ok: false;
      readonly functionName?: string;
      readonly reason: string;
    };

/** Saved results Excel writes when it could not compute the formula itself. */
const NOT_COMPUTED: Readonly<Record<string, string>> = {
  '#NAME?': 'the saved result is #NAME?: the workbook was last calculated where the add-in was not loaded',
  '#BUSY!': 'the saved result is #BUSY!: the workbook was saved while the function was still computing',
  '#GETTING_DATA': 'the saved result is #GETTING_DATA: the workbook was saved while the function was still computing',
  '#SPILL!': 'the saved result is #SPILL!: its result could not spill (other cells were in the way)',
  '#CALC!': 'the saved result is #CALC!: Excel could not calculate the formula',
};

function describeRef(node: RefNode): string | undefined {
  if (node.sheet?.external !== undefined) return `argument refers to another workbook (${node.text})`;
  if (node.sheet?.lastName !== undefined) return `argument spans several sheets (${node.text})`;
  const ends = [node.first, node.last ?? node.first];
  if (ends.some((e) => e.row === undefined || e.col === undefined))
    return `argument is a whole column or row (${node.text}); give the cells of the data instead`;
  return undefined;
}

class Planner {
  private readonly sheetsByName: Map<string, SheetInfo>;

  constructor(
    private readonly structure: WorkbookStructure,
    private readonly addin: AddinFunctions,
  ) {
    this.sheetsByName = new Map(structure.sheets.map((s) => [s.name.toLowerCase(), s]));
  }

  plan(cell: AbtestCell): Plan {
    const parsed = parseFormula(cell.formula);
    if (!parsed.ok)
      return {
        ok: false,
        reason: `the formula could not be read: ${parsed.problem}`,
      };
    const top = parsed.node;
    const name = top.kind === 'call' ? abtestFunctionName(top.name) : undefined;
    if (top.kind !== 'call' || name === undefined)
      return {
        ok: false,
        reason: 'the ABTEST call is part of a larger formula; only a formula that is one ABTEST call is recomputed',
      };
    const fn = this.addin.byName.get(name);
    if (!fn)
      return {
        ok: false,
        functionName: name,
        reason: `ABTEST.${name} is not a function of this build of the add-in`,
      };
    const params = fn.metadata.parameters;
    if (top.args.length > params.length)
      return {
        ok: false,
        functionName: name,
        reason: `ABTEST.${name} takes at most ${params.length} arguments; the formula gives ${top.args.length}`,
      };
    const args: ArgPlan[] = [];
    for (let i = 0; i < params.length; i += 1) {
      const param = params[i] as (typeof params)[number];
      const node = top.args[i];
      const label = `argument ${i + 1} (${param.name})`;
      if (node === undefined || node.kind === 'missing') {
        if (!param.optional)
          return {
            ok: false,
            functionName: name,
            reason: `${label} is required but missing`,
          };
        args.push({ kind: 'missing' });
        continue;
      }
      const arg = this.argument(node, param.dimensionality === 'matrix', cell.sheet, label, 0);
      if (typeof arg === 'string') return { ok: false, functionName: name, reason: arg };
      args.push(arg);
    }
    return { ok: true, functionName: name, args };
  }

  private argument(
    node: FormulaNode,
    matrix: boolean,
    sheet: SheetInfo,
    label: string,
    depth: number,
  ): ArgPlan | string {
    switch (node.kind) {
      case 'constant':
        return { kind: 'value', value: node.value, matrix };
      case 'array':
        if (!matrix)
          return `${label} is an array constant where one value is expected (Excel would compute the function once per item)`;
        return { kind: 'array', rows: node.rows };
      case 'ref': {
        const problem = describeRef(node);
        if (problem) return `${label}: ${problem}`;
        const target = node.sheet ? this.sheetsByName.get(node.sheet.name.toLowerCase()) : sheet;
        if (!target) return `${label} refers to a sheet "${node.sheet?.name}" that is not a worksheet of this workbook`;
        const a = node.first;
        const b = node.last ?? node.first;
        const range = {
          top: Math.min(a.row as number, b.row as number),
          left: Math.min(a.col as number, b.col as number),
          bottom: Math.max(a.row as number, b.row as number),
          right: Math.max(a.col as number, b.col as number),
        };
        if (rangeSize(range) > MAX_ARGUMENT_CELLS)
          return `${label} covers ${rangeSize(range)} cells, more than the ${MAX_ARGUMENT_CELLS} the audit reads`;
        if (!matrix && rangeSize(range) > 1)
          return `${label} is a range (${node.text}) where one value is expected (Excel would compute the function once per cell)`;
        return { kind: 'range', sheet: target, range, matrix };
      }
      case 'name': {
        if (depth > 0) return `${label}: the defined name ${node.name} refers to another name`;
        const scope = node.sheet ? this.sheetsByName.get(node.sheet.name.toLowerCase()) : sheet;
        const lower = node.name.toLowerCase();
        const found =
          this.structure.definedNames.find(
            (d) => d.name.toLowerCase() === lower && scope !== undefined && d.localSheetIndex === scope.index,
          ) ??
          (node.sheet
            ? undefined
            : this.structure.definedNames.find(
                (d) => d.name.toLowerCase() === lower && d.localSheetIndex === undefined,
              ));
        if (!found) return `${label} uses the name ${node.text}, which the workbook does not define`;
        const inner = parseFormula(found.formula);
        if (!inner.ok || !['ref', 'constant', 'array'].includes(inner.node.kind)) {
          return `${label} uses the defined name ${node.name}, which is not a plain range or constant (${found.formula})`;
        }
        return this.argument(inner.node, matrix, sheet, `${label} (the name ${node.name})`, depth + 1);
      }
      case 'call':
      case 'expression':
        return `${label} is an expression (${node.text}); only cell ranges, defined names and constants are recomputed`;
      default:
        return `${label} cannot be read`;
    }
  }
}

/** A recomputed result: a matrix of values, or a worksheet error with its message. */
type Recomputed = { readonly matrix: SavedValue[][] } | { readonly error: string; readonly message: string };

function resultValue(value: unknown): SavedValue {
  if (isCustomFunctionsError(value)) return { error: value.code };
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? value : { error: '#NUM!' };
  if (typeof value === 'string' || typeof value === 'boolean') return value;
  return { error: '#VALUE!' };
}

function recompute(run: (...args: unknown[]) => unknown, args: unknown[]): Recomputed {
  let result: unknown;
  try {
    result = run(...args);
  } catch (thrown) {
    if (isCustomFunctionsError(thrown)) return { error: thrown.code, message: thrown.message };
    return {
      error: '#VALUE!',
      message: `unexpected failure inside the function: ${(thrown as Error)?.message ?? String(thrown)}`,
    };
  }
  if (Array.isArray(result))
    return {
      matrix: (result as unknown[]).map((row) => (Array.isArray(row) ? row.map(resultValue) : [resultValue(row)])),
    };
  return { matrix: [[resultValue(result)]] };
}

/**
 * Audits the workbook `file` with the functions of `addin`.
 * @throws {WorkbookFileError} when the file cannot be read as a workbook.
 */
export async function auditWorkbook(
  file: string,
  addin: AddinFunctions,
  options: AuditOptions = {},
): Promise<AuditReport> {
  const tolerance = options.tolerance ?? DEFAULT_TOLERANCE;
  const pkg = await ZipPackage.open(file);
  try {
    const structure = await readWorkbookStructure(pkg, file);
    let done = 0;
    let total = structure.sheets.reduce((s, sh) => s + sh.part.uncompressedSize, 0);
    const onBytes = (label: string) => (n: number) => {
      done += n;
      options.onProgress?.(done, total, label);
    };

    // Pass 1: the ABTEST cells and their spills.
    const cells: AbtestCell[] = [];
    const values = new Map<number, Map<number, StoredValue>>(); // sheet index → cell key → stored value
    for (const sheet of structure.sheets) {
      const scan = await scanSheet(pkg, sheet, {
        withSpillValues: true,
        onBytes: onBytes(sheet.part.name),
      });
      cells.push(...scan.cells);
      values.set(sheet.index, scan.values);
    }

    // Plans, and the argument ranges they need.
    const planner = new Planner(structure, addin);
    const plans = cells.map((c) => planner.plan(c));
    const needed = new Map<number, CellRange[]>();
    for (const plan of plans) {
      if (!plan.ok) continue;
      for (const arg of plan.args)
        if (arg.kind === 'range') needed.set(arg.sheet.index, [...(needed.get(arg.sheet.index) ?? []), arg.range]);
    }

    // Pass 2: the argument cells.
    const pass2 = structure.sheets.filter((s) => needed.has(s.index));
    total +=
      pass2.reduce((s, sh) => s + sh.part.uncompressedSize, 0) + (structure.sharedStrings?.uncompressedSize ?? 0);
    for (const sheet of pass2) {
      const scan = await scanSheet(pkg, sheet, {
        withSpillValues: false,
        extra: needed.get(sheet.index) ?? [],
        onBytes: onBytes(sheet.part.name),
      });
      const into = values.get(sheet.index) as Map<number, StoredValue>;
      for (const [key, value] of scan.values) into.set(key, value);
    }

    // Pass 3: the shared strings those values use.
    const wanted = new Set<number>();
    const want = (v: StoredValue | undefined): void => {
      if (v?.type === 's') wanted.add(Number(v.text));
    };
    cells.forEach((c) => want(c.saved));
    values.forEach((m) => m.forEach(want));
    const sst = structure.sharedStrings
      ? await readSharedStrings(
          await pkg.stream(structure.sharedStrings),
          structure.sharedStrings.name,
          wanted,
          onBytes(structure.sharedStrings.name),
        )
      : new Map<number, string>();

    const valueAt = (sheet: SheetInfo, row: number, col: number): ReturnType<typeof decodeStored> =>
      decodeStored(values.get(sheet.index)?.get(cellKey(row, col)), sst);
    const entries = cells.map((cell, i) => judge(cell, plans[i] as Plan, addin, valueAt, sst, tolerance));
    const count = (s: AuditStatus): number => entries.filter((e) => e.status === s).length;
    return {
      file,
      tolerance,
      addinFolder: addin.folder,
      entries,
      summary: {
        formulas: entries.length,
        agree: count('agrees'),
        differ: count('differs'),
        notCheckable: count('not-checkable'),
      },
    };
  } finally {
    pkg.close();
  }
}

function judge(
  cell: AbtestCell,
  plan: Plan,
  addin: AddinFunctions,
  valueAt: (sheet: SheetInfo, row: number, col: number) => ReturnType<typeof decodeStored>,
  sst: ReadonlyMap<number, string>,
  tolerance: number,
): AuditEntry {
  const base = {
    sheet: cell.sheet.name,
    cell: cellName(cell),
    formula: displayFormula(cell.formula),
    ...(plan.functionName ? { function: plan.functionName } : {}),
    ...(cell.spill ? { spill: rangeName(cell.spill) } : {}),
  };
  const notCheckable = (reason: string): AuditEntry => ({
    ...base,
    status: 'not-checkable',
    reason,
    compared: 0,
    differences: [],
  });
  if (!plan.ok) return notCheckable(plan.reason);
  const saved = decodeStored(cell.saved, sst);
  if (isUnreadable(saved)) return notCheckable(`the saved result cannot be read: ${saved.unreadable}`);
  if (cell.saved === undefined) return notCheckable('the workbook holds no saved result for this cell');
  if (isErrorValue(saved) && NOT_COMPUTED[saved.error]) return notCheckable(NOT_COMPUTED[saved.error] as string);

  // Arguments, as Excel passes them (the preview's bridge does the same: blanks in ranges as "", an omitted
  // or blank single argument as null, an error in an argument returned without calling the function).
  const args: unknown[] = [];
  let passedError: string | undefined;
  for (const [i, arg] of plan.args.entries()) {
    const note = (v: SavedValue): SavedValue => {
      if (isErrorValue(v) && passedError === undefined) passedError = v.error;
      return v;
    };
    if (arg.kind === 'missing') args.push(null);
    else if (arg.kind === 'value') args.push(arg.matrix ? [[note(arg.value)]] : note(arg.value));
    else if (arg.kind === 'array') args.push(arg.rows.map((r) => r.map(note)));
    else {
      const rows: SavedValue[][] = [];
      for (let r = arg.range.top; r <= arg.range.bottom; r += 1) {
        const row: SavedValue[] = [];
        for (let c = arg.range.left; c <= arg.range.right; c += 1) {
          const v = valueAt(arg.sheet, r, c);
          if (isUnreadable(v))
            return notCheckable(
              `argument ${i + 1}: cell ${arg.sheet.name}!${cellName({ row: r, col: c })} holds ${v.unreadable}`,
            );
          row.push(note(v === null ? '' : v));
        }
        rows.push(row);
      }
      if (arg.matrix) args.push(rows);
      else {
        const single = rows[0]?.[0] ?? '';
        args.push(single === '' ? null : single);
      }
    }
  }

  const fn = addin.byName.get(plan.functionName);
  if (!fn) return notCheckable(`ABTEST.${plan.functionName} is not a function of this build of the add-in`);
  const result: Recomputed =
    passedError !== undefined
      ? {
          error: passedError,
          message: `an argument holds ${passedError}, which Excel returns without calling the function`,
        }
      : recompute(fn.run, args);

  if ('error' in result) {
    const recomputed: SavedValue = { error: result.error };
    const agree = valuesAgree(saved, recomputed, tolerance);
    return {
      ...base,
      status: agree ? 'agrees' : 'differs',
      compared: 1,
      differences: agree ? [] : [{ cell: base.cell, saved, recomputed }],
      errorMessage: result.message,
    };
  }

  const matrix = result.matrix;
  const height = matrix.length;
  const width = Math.max(1, ...matrix.map((r) => r.length));
  const area = cell.spill ?? {
    top: cell.row,
    left: cell.col,
    bottom: cell.row,
    right: cell.col,
  };
  const differences: CellDifference[] = [];
  let compared = 0;
  for (let r = area.top; r <= area.bottom; r += 1) {
    for (let c = area.left; c <= area.right; c += 1) {
      const i = r - cell.row;
      const j = c - cell.col;
      const recomputed: SavedValue = i < height && j < width ? (matrix[i]?.[j] ?? '') : { error: '#N/A' };
      const here = r === cell.row && c === cell.col ? saved : valueAt(cell.sheet, r, c);
      compared += 1;
      if (isUnreadable(here)) {
        differences.push({
          cell: cellName({ row: r, col: c }),
          saved: `(unreadable: ${here.unreadable})`,
          recomputed,
        });
        continue;
      }
      if (!valuesAgree(here, recomputed, tolerance))
        differences.push({
          cell: cellName({ row: r, col: c }),
          saved: here,
          recomputed,
        });
    }
  }
  let reason: string | undefined;
  const bigger = height > area.bottom - area.top + 1 || width > area.right - area.left + 1;
  if (bigger && cell.spill)
    reason = `the function now returns ${height}×${width} cells, but the saved result covers ${rangeName(cell.spill)}`;
  else if (bigger)
    reason = `the function returns ${height}×${width} cells, but the file stores it in one cell; only the first value was compared`;
  const status: AuditStatus = differences.length > 0 || (bigger && cell.spill !== undefined) ? 'differs' : 'agrees';
  return {
    ...base,
    status,
    ...(reason ? { reason } : {}),
    compared,
    differences,
  };
}
