/**
 * The add-in's worksheet functions outside Excel: the built dist/functions.js runs in a Node `vm` context
 * that holds only a CustomFunctions stand-in (the preview's, preview/src/customFunctionsStandIn.ts) and an
 * inert Office object, exactly as test/preview/loadBundle.ts does. Each function id then maps to the same
 * wrapper Excel calls, and dist/functions.json gives each function's parameters.
 *
 * Also: whether dist/ is missing or older than the function sources, and building it when it is.
 */
import { spawnSync } from 'child_process';
import * as fs from 'fs';
import * as path from 'path';
import * as vm from 'vm';
import { createCustomFunctionsStandIn, isCustomFunctionsError } from '../preview/src/customFunctionsStandIn';
import { parseFunctionsMetadata, type FunctionMetadata } from '../preview/src/metadata';

/** The repository root (this file is cli/addin.ts). */
export const REPO_ROOT = path.resolve(__dirname, '..');

/** A usage or setup problem the command reports with exit code 2. */
export class SetupError extends Error {
  override readonly name = 'SetupError';
}

/** The loaded functions. */
export interface AddinFunctions {
  readonly folder: string;
  readonly byName: ReadonlyMap<
    string,
    {
      readonly metadata: FunctionMetadata;
      readonly run: (...args: unknown[]) => unknown;
    }
  >;
}

/** Newest modification time (ms) of the files under `dir` whose names end in one of `extensions`. */
function newestSource(dir: string, extensions: readonly string[]): number {
  let newest = 0;
  if (!fs.existsSync(dir)) return newest;
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) newest = Math.max(newest, newestSource(full, extensions));
    else if (extensions.some((e) => entry.name.endsWith(e))) newest = Math.max(newest, fs.statSync(full).mtimeMs);
  }
  return newest;
}

/**
 * Why the built functions in `folder` cannot be used as they are: "missing" or "stale" (older than a source
 * under functions/), or undefined when they are up to date. Sources are looked at only for the project's
 * own dist/ folder.
 */
export function builtState(folder: string): 'missing' | 'stale' | undefined {
  const js = path.join(folder, 'functions.js');
  const json = path.join(folder, 'functions.json');
  if (!fs.existsSync(js) || !fs.existsSync(json)) return 'missing';
  if (path.resolve(folder) !== path.join(REPO_ROOT, 'dist')) return undefined;
  const built = Math.min(fs.statSync(js).mtimeMs, fs.statSync(json).mtimeMs);
  return newestSource(path.join(REPO_ROOT, 'functions'), ['.ts']) > built ? 'stale' : undefined;
}

/**
 * Builds the add-in into dist/ (`webpack --mode production`, as `npm run build`), with webpack's output on
 * stderr so that a machine-readable report on stdout stays clean. A production base URL found in an
 * existing dist/manifest.xml is kept, so a release build is not turned back into a development one.
 * @throws {SetupError} when the build fails.
 */
export function buildAddin(say: (line: string) => void): void {
  const env = { ...process.env };
  const manifest = path.join(REPO_ROOT, 'dist', 'manifest.xml');
  if (!env.ADDIN_BASE_URL && fs.existsSync(manifest)) {
    const m = /<bt:Url id="Functions\.Script\.Url" DefaultValue="([^"]+)functions\.js"/.exec(
      fs.readFileSync(manifest, 'utf8'),
    );
    if (m && !m[1]?.startsWith('https://localhost:3000/')) env.ADDIN_BASE_URL = m[1];
  }
  let cli: string;
  try {
    cli = require.resolve('webpack-cli/bin/cli.js', { paths: [REPO_ROOT] });
  } catch {
    throw new SetupError('webpack is not installed: run `npm install` in the project folder first');
  }
  say(
    `building the add-in into dist/ (npm run build${env.ADDIN_BASE_URL ? `, ADDIN_BASE_URL=${env.ADDIN_BASE_URL}` : ''}); this takes about half a minute…`,
  );
  const run = spawnSync(process.execPath, [cli, '--mode', 'production'], {
    cwd: REPO_ROOT,
    env,
    stdio: ['ignore', process.stderr, process.stderr],
  });
  if (run.status !== 0)
    throw new SetupError('the add-in build failed (see the messages above); fix it or run `npm run build` yourself');
}

/**
 * Loads functions.js and functions.json from `folder`.
 * @throws {SetupError} when a file is missing or the bundle does not register a function its metadata names.
 */
export function loadAddin(folder: string): AddinFunctions {
  const js = path.join(folder, 'functions.js');
  const jsonFile = path.join(folder, 'functions.json');
  for (const file of [js, jsonFile])
    if (!fs.existsSync(file)) throw new SetupError(`${file} is missing: run \`npm run build\` first`);
  const host = createCustomFunctionsStandIn();
  const office = {
    onReady: () => Promise.resolve({ host: 'Excel', platform: 'PC' }),
    actions: { associate: () => undefined },
  };
  const context = vm.createContext({
    CustomFunctions: host.api,
    Office: office,
    console,
  });
  const sandbox = context as Record<string, unknown>;
  sandbox.self = context;
  sandbox.window = context;
  sandbox.globalThis = context;
  vm.runInContext(fs.readFileSync(js, 'utf8'), context, {
    filename: 'functions.js',
  });
  let metadata;
  try {
    metadata = parseFunctionsMetadata(JSON.parse(fs.readFileSync(jsonFile, 'utf8')));
  } catch (error) {
    throw new SetupError(`${jsonFile} cannot be read: ${(error as Error).message}`);
  }
  const byName = new Map<string, { metadata: FunctionMetadata; run: (...args: unknown[]) => unknown }>();
  for (const fn of metadata.functions) {
    const run = host.associations.get(fn.id.toUpperCase());
    if (!run)
      throw new SetupError(
        `${jsonFile} describes ${fn.id}, but functions.js never registers it: rebuild with \`npm run build\``,
      );
    byName.set(fn.name.toUpperCase(), { metadata: fn, run });
  }
  return { folder, byName };
}

export { isCustomFunctionsError };
