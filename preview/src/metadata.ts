/**
 * The parts of dist/functions.json (the custom-functions metadata that custom-functions-metadata writes)
 * the preview reads. Only what the preview needs is typed; the file has more.
 */

/** One parameter of a custom function. `dimensionality` is absent for scalars in some generator versions. */
export interface ParameterMetadata {
  readonly name: string;
  readonly type?: string;
  readonly dimensionality?: 'matrix' | 'scalar';
  readonly optional?: boolean;
  readonly description?: string;
}

/** One custom function. The worksheet name is `<namespace>.<name>` (the manifest's namespace). */
export interface FunctionMetadata {
  readonly id: string;
  readonly name: string;
  readonly description?: string;
  readonly helpUrl?: string;
  readonly parameters: readonly ParameterMetadata[];
  readonly result?: { readonly type?: string; readonly dimensionality?: 'matrix' | 'scalar' };
  readonly options?: Readonly<Record<string, unknown>>;
}

/** The whole file. */
export interface FunctionsMetadataFile {
  readonly functions: readonly FunctionMetadata[];
}

/** The manifest's custom-functions namespace (see manifest/manifest.xml): users type `=ABTEST.NAME(…)`. */
export const FUNCTION_NAMESPACE = 'ABTEST';

/**
 * Checks that a parsed functions.json has the shape the preview relies on and returns it typed.
 *
 * Cost: O(number of functions and parameters). Throws an Error naming the first offending entry.
 *
 * @example
 * parseFunctionsMetadata({ functions: [{ id: 'X', name: 'X', parameters: [] }] }).functions.length; //=> 1
 */
export function parseFunctionsMetadata(json: unknown): FunctionsMetadataFile {
  const file = json as { functions?: unknown };
  if (typeof json !== 'object' || json === null || !Array.isArray(file.functions)) {
    throw new Error('functions.json: expected an object with a "functions" array');
  }
  file.functions.forEach((entry: unknown, index: number) => {
    const fn = entry as Partial<FunctionMetadata>;
    if (typeof fn.id !== 'string' || typeof fn.name !== 'string' || !Array.isArray(fn.parameters)) {
      throw new Error(`functions.json: entry ${index + 1} needs an id, a name and a parameters array`);
    }
    fn.parameters.forEach((p, i) => {
      if (typeof p?.name !== 'string') throw new Error(`functions.json: ${fn.id}, parameter ${i + 1} has no name`);
    });
  });
  return json as FunctionsMetadataFile;
}

/**
 * The name a user types for a function. Cost O(1). Never throws.
 * @example worksheetName({ id: 'PROB_HIGHEST', name: 'PROB_HIGHEST', parameters: [] }); //=> 'ABTEST.PROB_HIGHEST'
 */
export function worksheetName(fn: FunctionMetadata): string {
  return `${FUNCTION_NAMESPACE}.${fn.name.toUpperCase()}`;
}
