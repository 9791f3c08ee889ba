/**
 * Test helper: loads a functions.js bundle and its functions.json the way the preview page does, but in a
 * node `vm` context holding only the `CustomFunctions` stand-in of the preview (and an inert `Office`), and
 * registers the functions into HyperFormula with the page's own registration code.
 */
import * as fs from 'fs';
import * as path from 'path';
import * as vm from 'vm';
import { HyperFormula } from 'hyperformula';
import { createCustomFunctionsStandIn } from '../../preview/src/customFunctionsStandIn';
import { parseFunctionsMetadata, type FunctionsMetadataFile } from '../../preview/src/metadata';
import {
  registerAbtestFunctions,
  type AbtestPluginDefinition,
  type CustomFunctionImplementation,
} from '../../preview/src/abtestPlugin';

/** The repository root. */
export const REPO_ROOT = path.resolve(__dirname, '..', '..');

/** What {@link loadAndRegister} returns. */
export interface LoadedFunctions {
  readonly metadata: FunctionsMetadataFile;
  readonly associations: ReadonlyMap<string, CustomFunctionImplementation>;
  readonly definition: AbtestPluginDefinition;
}

/**
 * Runs `functionsJs` with a fresh CustomFunctions stand-in, reads `functionsJson`, registers every function
 * into HyperFormula. Throws an Error with a clear instruction when a file is missing.
 */
export function loadAndRegister(functionsJs: string, functionsJson: string): LoadedFunctions {
  for (const file of [functionsJs, functionsJson]) {
    if (!fs.existsSync(file)) {
      throw new Error(
        `${path.relative(REPO_ROOT, file)} is missing: run \`npm run build\` before \`npm test\` (the preview test evaluates the built add-in)`,
      );
    }
  }
  const host = createCustomFunctionsStandIn();
  const office = {
    onReady: () => Promise.resolve({ host: 'Excel', platform: 'PC' }),
    actions: { associate: () => undefined },
  };
  const context = vm.createContext({ CustomFunctions: host.api, Office: office, console });
  (context as Record<string, unknown>).self = context;
  (context as Record<string, unknown>).window = context;
  (context as Record<string, unknown>).globalThis = context;
  vm.runInContext(fs.readFileSync(functionsJs, 'utf8'), context, { filename: functionsJs });
  const metadata = parseFunctionsMetadata(JSON.parse(fs.readFileSync(functionsJson, 'utf8')));
  const definition = registerAbtestFunctions(HyperFormula, metadata, host.associations);
  return { metadata, associations: host.associations, definition };
}
