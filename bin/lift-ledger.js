#!/usr/bin/env node
// The `lift-ledger` command (package.json "bin"): `npx lift-ledger audit book.xlsx` from a clone after
// `npm install`. The command's TypeScript sources (cli/) are transpiled in memory with the project's own
// TypeScript (scripts/tsRequire.js, as the benchmark does), so there is no separate build step for the
// command itself; `audit` runs the add-in's built dist/functions.js and builds it first when missing.
'use strict';
const path = require('path');

try {
  require.resolve('typescript');
} catch {
  process.stderr.write(
    "lift-ledger: the project's dependencies are not installed: run `npm install` in the project folder first\n",
  );
  process.exit(2);
}
require(path.join(__dirname, '..', 'scripts', 'tsRequire.js'));

const { main } = require(path.join(__dirname, '..', 'cli', 'main.ts'));
main(process.argv.slice(2), {
  stdout: process.stdout,
  stderr: process.stderr,
}).then((code) => {
  process.exitCode = code;
});
