// Lets plain node scripts (the benchmark, the help and README builders) require the TypeScript sources
// directly: each .ts file is transpiled in memory with the project's own TypeScript (no type check; `npm test`
// does that), so they use the same code the tests check without a separate build step. Under jest, which
// compiles .ts files itself, this hook is never consulted.
const fs = require('fs');
const ts = require('typescript');

if (require.extensions['.ts'] === undefined) {
  require.extensions['.ts'] = function compileTypeScript(module, filename) {
    const source = fs.readFileSync(filename, 'utf8');
    const { outputText } = ts.transpileModule(source, {
      compilerOptions: { module: ts.ModuleKind.CommonJS, target: ts.ScriptTarget.ES2020, esModuleInterop: true },
      fileName: filename,
    });
    module._compile(outputText, filename);
  };
}
