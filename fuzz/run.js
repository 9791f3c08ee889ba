#!/usr/bin/env node
/**
 * `npm run fuzz`: seeded calls of every registered worksheet function through the built bundle, in child
 * processes with a watchdog; prints a report and exits 1 when any check failed (2 when it could not run).
 *
 *   node fuzz/run.js [--seed S] [--calls N] [--only NAME[,NAME…]] [--bundle dist/functions.js]
 *                    [--jobs J] [--budget-ms 1000] [--slow-ms 250] [--memory-mb 50] [--heap-mb 256]
 *                    [--no-shrink] [--shrink-seconds 120] [--json FILE] [--markdown FILE] [--quiet]
 *   node fuzz/run.js --formula '=ABTEST.PROB_HIGHEST({1;2},{10;10})' [--formula …]   replay formulas
 *
 * Same seed, same calls: call i's input depends only on the seed and i (see random.js).
 */
'use strict';
const fs = require('fs');
const os = require('os');
const { runFuzz, runFormulas, UsageError, DEFAULTS } = require('./index');
const { formatReport } = require('./report');

const USAGE = `Seeded calls of every registered worksheet function through the built bundle (npm run build
first), each in a child process with a watchdog; prints a report grouped by kind with reproductions.

  node fuzz/run.js [--seed S] [--calls N] [--only NAME[,NAME…]] [--bundle dist/functions.js]
                   [--jobs J] [--budget-ms 1000] [--slow-ms 250] [--memory-mb 50] [--heap-mb 256]
                   [--no-shrink] [--shrink-seconds 120] [--json FILE] [--markdown FILE] [--quiet]
  node fuzz/run.js --formula '=ABTEST.PROB_HIGHEST({1;2},{10;10})' [--formula …]   replay formulas

Defaults: seed 1, 20000 calls, every function, one child process per core (at most 4). Same seed, same calls.
Exit code 0: nothing found; 1: a check failed; 2: the fuzzer could not run (the message says why).`;

function parseArgs(argv) {
  const options = { formulas: [] };
  const numeric = {
    '--seed': 'seed',
    '--calls': 'calls',
    '--jobs': 'jobs',
    '--budget-ms': 'budgetMs',
    '--slow-ms': 'slowMs',
    '--memory-mb': 'memoryMb',
    '--heap-mb': 'heapMb',
    '--shrink-seconds': 'shrinkSeconds',
  };
  for (let i = 0; i < argv.length; i++) {
    const [flag, inline] =
      argv[i].startsWith('--') && argv[i].includes('=')
        ? [argv[i].slice(0, argv[i].indexOf('=')), argv[i].slice(argv[i].indexOf('=') + 1)]
        : [argv[i], undefined];
    const value = () => {
      if (inline !== undefined) return inline;
      if (i + 1 >= argv.length) throw new UsageError(`${flag} needs a value`);
      return argv[++i];
    };
    if (flag in numeric) {
      const raw = value();
      const x = Number(raw);
      if (flag === '--seed' && !Number.isFinite(x)) options.seed = raw;
      else if (!Number.isFinite(x) || x < 0 || (flag !== '--seed' && x === 0 && flag !== '--slow-ms'))
        throw new UsageError(`${flag} must be a positive number, got ${raw}`);
      else options[numeric[flag]] = x;
    } else if (flag === '--only')
      options.only = value()
        .split(',')
        .map((s) => s.trim())
        .filter(Boolean);
    else if (flag === '--bundle') options.bundle = value();
    else if (flag === '--metadata') options.metadata = value();
    else if (flag === '--no-shrink') options.shrink = false;
    else if (flag === '--json') options.json = value();
    else if (flag === '--markdown') options.markdown = value();
    else if (flag === '--quiet') options.quiet = true;
    else if (flag === '--formula') options.formulas.push(value());
    else if (flag === '--help' || flag === '-h') options.help = true;
    else throw new UsageError(`unknown option ${argv[i]}\n${USAGE}`);
  }
  return options;
}

async function main() {
  const options = parseArgs(process.argv.slice(2));
  if (options.help) {
    console.log(USAGE);
    return 0;
  }
  if (options.formulas.length > 0) {
    const results = await runFormulas(options.formulas, options);
    for (const r of results) {
      const cost =
        typeof r.cpuMs === 'number'
          ? ` (${r.cpuMs.toFixed(1)} ms CPU, heap +${(r.heapGrowthMb ?? 0).toFixed(1)} MB)`
          : '';
      console.log(`${r.formula}\n  → ${r.outcome}${cost}`);
      for (const f of r.findings) console.log(`  ✗ ${f.kind}: ${f.detail}`);
      if (r.result.outcome === 'value') console.log(`  ${JSON.stringify(r.result.value).slice(0, 2000)}`);
    }
    return results.some((r) => r.findings.length > 0) ? 1 : 0;
  }
  if (options.jobs === undefined)
    options.jobs = Math.max(1, Math.min(4, os.availableParallelism ? os.availableParallelism() : os.cpus().length));
  const quiet = options.quiet;
  const report = await runFuzz({
    ...options,
    onProgress: quiet
      ? undefined
      : (p) =>
          process.stderr.write(`  ${p.done}/${p.total} calls, ${p.failedCalls} failed, ${p.seconds.toFixed(0)} s\n`),
  });
  const text = formatReport(report);
  if (options.json) fs.writeFileSync(options.json, `${JSON.stringify(report, null, 1)}\n`);
  if (options.markdown) fs.writeFileSync(options.markdown, `${text}\n`);
  if (!quiet || report.failed) console.log(text);
  else {
    const { seed, calls } = report.settings;
    console.log(`seed ${seed}: ${calls} calls, no failures (${report.callsPerSecond.toFixed(0)} calls/s)`);
  }
  return report.failed ? 1 : 0;
}

main().then(
  (code) => {
    process.exitCode = code;
  },
  (error) => {
    console.error(error instanceof UsageError ? `fuzz: ${error.message}` : error.stack || String(error));
    process.exitCode = 2;
  },
);

module.exports = { parseArgs, DEFAULTS };
