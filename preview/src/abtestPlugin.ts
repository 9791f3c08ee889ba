/**
 * Registers the add-in's real worksheet functions (dist/functions.js, described by dist/functions.json)
 * into HyperFormula, so the preview computes `=ABTEST.…` cells with exactly the code Excel runs.
 *
 * The bridge does only what Excel itself does around a custom function:
 * - matrix parameters receive a 2-D array of cell values (blanks as ""), scalar parameters a value,
 *   omitted optional parameters `null` (Excel's documented behaviour for optional parameters);
 * - an error value in an argument is passed on without calling the function (Excel's default);
 * - a thrown `CustomFunctions.Error` becomes that worksheet error with its message; any other throw
 *   becomes `#VALUE!` with a message saying it is an unexpected failure (a defect in the add-in);
 * - matrix results spill (their size is reserved from the formula text, see spillLayout.ts).
 */
import {
  ArraySize,
  CellError,
  EmptyValue,
  ErrorType,
  FunctionArgumentType,
  FunctionPlugin,
  SimpleRangeValue,
  type HyperFormula,
} from 'hyperformula';
import { isCustomFunctionsError } from './customFunctionsStandIn';
import { type FunctionMetadata, type FunctionsMetadataFile, worksheetName } from './metadata';
import { spillSize, type ArgumentShapes, type SpillSize } from './spillLayout';

/** A registered custom function, as `CustomFunctions.associate` received it. */
export type CustomFunctionImplementation = (...args: unknown[]) => unknown;

/** A value a cell can hold after conversion for a custom function. */
export type CellArgument = number | string | boolean;

/** The minimal view of HyperFormula's parse tree the bridge reads (not exported by HyperFormula). */
interface AstNode {
  readonly type: string;
  readonly value?: unknown;
  readonly args?: readonly AstNode[];
  readonly start?: AddressNode;
  readonly end?: AddressNode;
}
interface SimpleAddress {
  readonly sheet: number;
  readonly col: number;
  readonly row: number;
}
interface AddressNode {
  toSimpleCellAddress(base: SimpleAddress): SimpleAddress;
}
interface ProcedureNode {
  readonly args: AstNode[];
}
type PluginState = { readonly formulaAddress?: SimpleAddress };

const ERROR_TYPE_BY_TEXT: Readonly<Record<string, ErrorType>> = Object.freeze({
  '#VALUE!': ErrorType.VALUE,
  '#N/A': ErrorType.NA,
  '#DIV/0!': ErrorType.DIV_BY_ZERO,
  '#NUM!': ErrorType.NUM,
  '#NAME?': ErrorType.NAME,
  '#REF!': ErrorType.REF,
  '#NULL!': ErrorType.ERROR,
});

/**
 * Turns whatever a custom function threw into a HyperFormula cell error with a message.
 *
 * @example
 * toCellError({ code: '#N/A', message: 'no HDI' }).type; //=> 'NA'
 */
export function toCellError(thrown: unknown): CellError {
  if (isCustomFunctionsError(thrown)) {
    return new CellError(ERROR_TYPE_BY_TEXT[thrown.code] ?? ErrorType.VALUE, thrown.message || thrown.code);
  }
  // Duck-typed: an Error thrown in another realm (iframe, vm context) fails `instanceof Error`.
  const message = (thrown as { message?: unknown } | null)?.message;
  const detail = typeof message === 'string' ? message : String(thrown);
  return new CellError(ErrorType.VALUE, `unexpected failure inside the function (please report it): ${detail}`);
}

/** A cell value inside HyperFormula → what Excel passes to a custom function; errors are returned as is. */
function toArgument(value: unknown): CellArgument | CellError {
  if (value instanceof CellError) return value;
  if (value === EmptyValue || value === undefined || value === null) return '';
  if (typeof value === 'number' || typeof value === 'string' || typeof value === 'boolean') return value;
  // HyperFormula keeps typed numbers (percent, currency, dates) as objects with the raw number in `val`.
  const raw = (value as { val?: unknown }).val;
  if (typeof raw === 'number') return raw;
  return String(value);
}

/** One result value from a custom function → a HyperFormula value. */
function fromResult(value: unknown): number | string | boolean | CellError {
  if (isCustomFunctionsError(value)) return toCellError(value);
  if (typeof value === 'number') {
    return Number.isFinite(value)
      ? value
      : new CellError(ErrorType.NUM, `the function returned ${value}, which is a defect`);
  }
  if (typeof value === 'string' || typeof value === 'boolean') return value;
  if (value === null || value === undefined) return '';
  return new CellError(ErrorType.VALUE, `the function returned an unexpected ${typeof value}`);
}

/** Reads the formula text's argument shapes: the first range's size and a literal `points`. */
function argumentShapes(fn: FunctionMetadata, ast: ProcedureNode, state: PluginState): ArgumentShapes {
  const base: SimpleAddress = state?.formulaAddress ?? { sheet: 0, col: 0, row: 0 };
  let firstRange: SpillSize | undefined;
  let points: number | undefined;
  fn.parameters.forEach((parameter, index) => {
    const node = ast.args[index];
    if (node === undefined) return;
    if (parameter.dimensionality === 'matrix' && firstRange === undefined) {
      if (node.type === 'CELL_RANGE' && node.start && node.end) {
        const start = node.start.toSimpleCellAddress(base);
        const end = node.end.toSimpleCellAddress(base);
        firstRange = { rows: Math.abs(end.row - start.row) + 1, columns: Math.abs(end.col - start.col) + 1 };
      } else if (node.type === 'CELL_REFERENCE' || node.type === 'NUMBER' || node.type === 'STRING') {
        firstRange = { rows: 1, columns: 1 };
      } else if (node.type === 'ARRAY' && node.args) {
        const rows = node.args as unknown as AstNode[][];
        firstRange = { rows: rows.length, columns: rows[0]?.length ?? 1 };
      }
    }
    if (parameter.name === 'points' && node.type === 'NUMBER' && typeof node.value === 'number') points = node.value;
  });
  return { firstRange, points };
}

/** What {@link buildAbtestPlugin} returns: the plugin class and its name translations. */
export interface AbtestPluginDefinition {
  readonly plugin: typeof FunctionPlugin;
  readonly translations: Record<string, Record<string, string>>;
  /** Worksheet names registered, e.g. `ABTEST.PROB_HIGHEST`. */
  readonly names: readonly string[];
}

/**
 * Builds one HyperFormula function plugin holding every function of `metadata` that `implementations`
 * provides (by custom-function id), following HyperFormula's custom-function plugin API
 * (`implementedFunctions` with `parameters`, `sizeOfResultArrayMethod`, `vectorizationForbidden`).
 *
 * Cost: O(number of functions). Throws an Error naming a function described in the metadata but never
 * associated, because a preview that silently lacks a function would mislead.
 *
 * @example
 * const def = buildAbtestPlugin({ functions: [meta] }, new Map([['POSTERIOR_MEAN', fn]]));
 * def.names; //=> ['ABTEST.POSTERIOR_MEAN']
 */
export function buildAbtestPlugin(
  metadata: FunctionsMetadataFile,
  implementations: ReadonlyMap<string, CustomFunctionImplementation>,
): AbtestPluginDefinition {
  class AbtestPlugin extends FunctionPlugin {}
  const implemented: Record<string, unknown> = {};
  const names: string[] = [];
  const prototype = AbtestPlugin.prototype as unknown as Record<string, unknown>;

  for (const fn of metadata.functions) {
    const implementation = implementations.get(fn.id.toUpperCase());
    if (implementation === undefined) {
      throw new Error(`functions.json describes ${fn.id}, but functions.js never associated it`);
    }
    const name = worksheetName(fn);
    const isMatrix = fn.result?.dimensionality === 'matrix';
    const methodName = `run_${fn.id}`;
    const sizeName = `size_${fn.id}`;

    prototype[methodName] = function run(this: AbtestPluginInternals, ast: ProcedureNode, state: PluginState) {
      const reserved = isMatrix ? spillSize(fn, argumentShapes(fn, ast, state)) : undefined;
      return this.runFunction(ast.args, state, this.metadata(name), (...values: unknown[]) =>
        callFunction(fn, implementation, values, reserved),
      );
    };
    if (isMatrix) {
      prototype[sizeName] = function size(ast: ProcedureNode, state: PluginState) {
        const reserved = spillSize(fn, argumentShapes(fn, ast, state));
        return new ArraySize(reserved.columns, reserved.rows);
      };
    }
    implemented[name] = {
      method: methodName,
      ...(isMatrix ? { sizeOfResultArrayMethod: sizeName } : {}),
      vectorizationForbidden: true,
      parameters: fn.parameters.map((p) => ({
        argumentType: p.dimensionality === 'matrix' ? FunctionArgumentType.RANGE : FunctionArgumentType.SCALAR,
        ...(p.optional ? { optionalArg: true } : {}),
      })),
    };
    names.push(name);
  }
  (AbtestPlugin as unknown as { implementedFunctions: unknown }).implementedFunctions = implemented;
  const translations = {
    enGB: Object.fromEntries(names.map((n) => [n, n])),
    enUS: Object.fromEntries(names.map((n) => [n, n])),
  };
  return { plugin: AbtestPlugin, translations, names };
}

/** The protected FunctionPlugin members the generated methods use. */
interface AbtestPluginInternals {
  runFunction(args: unknown[], state: unknown, metadata: unknown, impl: (...values: unknown[]) => unknown): unknown;
  metadata(name: string): unknown;
}

/** Converts HyperFormula's argument values, calls the function, converts its result. */
function callFunction(
  fn: FunctionMetadata,
  implementation: CustomFunctionImplementation,
  values: unknown[],
  reserved: SpillSize | undefined,
): unknown {
  const args: unknown[] = [];
  for (let i = 0; i < fn.parameters.length; i += 1) {
    const parameter = fn.parameters[i];
    const value = values[i];
    if (parameter === undefined) break;
    if (value === undefined || value === EmptyValue) {
      args.push(null);
    } else if (value instanceof SimpleRangeValue) {
      const rows: CellArgument[][] = [];
      for (const row of value.data) {
        const converted: CellArgument[] = [];
        for (const cell of row) {
          const argument = toArgument(cell);
          if (argument instanceof CellError) return argument;
          converted.push(argument);
        }
        rows.push(converted);
      }
      args.push(rows);
    } else {
      const argument = toArgument(value);
      if (argument instanceof CellError) return argument;
      args.push(parameter.dimensionality === 'matrix' ? [[argument]] : argument);
    }
  }

  let result: unknown;
  try {
    result = implementation(...args);
  } catch (thrown) {
    return toCellError(thrown);
  }
  if (result !== null && typeof result === 'object' && typeof (result as { then?: unknown }).then === 'function') {
    return new CellError(ErrorType.VALUE, 'the preview cannot show asynchronous results');
  }
  if (reserved === undefined) {
    const single = Array.isArray(result) ? (result as unknown[][])[0]?.[0] : result;
    return fromResult(single);
  }
  const matrix = Array.isArray(result)
    ? (result as unknown[]).map((row) => (Array.isArray(row) ? row : [row]))
    : [[result]];
  const height = matrix.length;
  const width = Math.max(1, ...matrix.map((row) => row.length));
  if (height > reserved.rows || width > reserved.columns) {
    return new CellError(
      ErrorType.VALUE,
      `the result is ${height}×${width} cells but the preview reserved ${reserved.rows}×${reserved.columns}; give points as a number in the formula`,
    );
  }
  const data = matrix.map((row) => {
    const out = row.map((cell) => fromResult(cell));
    while (out.length < width) out.push('');
    return out;
  });
  return SimpleRangeValue.onlyValues(data as never);
}

/**
 * Registers the ABTEST functions into HyperFormula's global function registry (engines built afterwards
 * see them). Registering again replaces the previous plugin of the same names.
 *
 * Cost: O(number of functions). Throws as {@link buildAbtestPlugin} does, or HyperFormula's
 * FunctionPluginValidationError if the plugin is inconsistent.
 *
 * @example
 * registerAbtestFunctions(HyperFormula, metadata, host.associations).names.length; //=> 29
 */
export function registerAbtestFunctions(
  hyperformula: typeof HyperFormula,
  metadata: FunctionsMetadataFile,
  implementations: ReadonlyMap<string, CustomFunctionImplementation>,
): AbtestPluginDefinition {
  const definition = buildAbtestPlugin(metadata, implementations);
  for (const name of definition.names) {
    const existing = hyperformula.getFunctionPlugin(name);
    if (existing !== undefined) hyperformula.unregisterFunction(name);
  }
  hyperformula.registerFunctionPlugin(definition.plugin as never, definition.translations);
  return definition;
}
