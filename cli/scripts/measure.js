#!/usr/bin/env node
/**
 * Time and peak memory of `lift-ledger audit` and `freeze` on one workbook (for the README's table):
 *
 *   node cli/scripts/bigWorkbook.js /tmp/big.xlsx      # ≈ 57 MB of invented data
 *   node cli/scripts/measure.js /tmp/big.xlsx
 *
 * Each command runs in its own node process, as a user runs it; the peak resident memory is that
 * process's maxRSS (process.resourceUsage(), read when it exits through a --require hook), the time is the
 * wall-clock time of the process including start-up. Timings on a shared machine are noisy: run it on a
 * quiet one for numbers to publish.
 */
'use strict';
const { spawnSync } = require('child_process');
const fs = require('fs');
const os = require('os');
const path = require('path');

const file = process.argv[2];
if (!file || !fs.existsSync(file)) {
  process.stderr.write('usage: node cli/scripts/measure.js <book.xlsx>\n');
  process.exit(2);
}
const bin = path.join(__dirname, '..', '..', 'bin', 'lift-ledger.js');
const hook = path.join(os.tmpdir(), `lift-ledger-measure-${process.pid}.js`);
fs.writeFileSync(
  hook,
  "process.on('exit', () => require('fs').writeFileSync(process.env.LIFT_LEDGER_MEASURE_OUT, JSON.stringify(process.resourceUsage())));\n",
);
const copy = path.join(os.tmpdir(), `lift-ledger-measure-${process.pid}-copy.xlsx`);
const rows = [];
for (const [label, args] of [
  ['audit', ['audit', file, '--json', '--no-build']],
  ['freeze', ['freeze', file, '-o', copy, '--force']],
]) {
  const out = path.join(os.tmpdir(), `lift-ledger-measure-${process.pid}-${label}.json`);
  const started = process.hrtime.bigint();
  const run = spawnSync(process.execPath, ['--require', hook, bin, ...args], {
    env: { ...process.env, LIFT_LEDGER_MEASURE_OUT: out },
    maxBuffer: 1 << 30,
    encoding: 'utf8',
  });
  const seconds = Number(process.hrtime.bigint() - started) / 1e9;
  if (run.status !== 0 && !(label === 'audit' && run.status === 1)) {
    process.stderr.write(`${label} failed (exit ${run.status}):\n${run.stderr}\n`);
    process.exit(1);
  }
  const usage = JSON.parse(fs.readFileSync(out, 'utf8'));
  fs.rmSync(out, { force: true });
  let detail;
  if (label === 'audit') {
    const s = JSON.parse(run.stdout).summary;
    detail = `${s.formulas} formulas: ${s.agree} agree, ${s.differ} differ, ${s.notCheckable} not checkable`;
  } else detail = run.stdout.split('\n')[0];
  rows.push({
    label,
    seconds,
    cpu: (usage.userCPUTime + usage.systemCPUTime) / 1e6,
    rssMb: usage.maxRSS / 1024,
    detail,
  });
}
fs.rmSync(hook, { force: true });
fs.rmSync(copy, { force: true });
const size = fs.statSync(file).size / 1e6;
process.stdout.write(`workbook: ${file} (${size.toFixed(1)} MB)\n`);
process.stdout.write('| command | wall time | CPU time | peak memory (RSS) | result |\n|---|---|---|---|---|\n');
for (const r of rows) {
  process.stdout.write(
    `| ${r.label} | ${r.seconds.toFixed(1)} s | ${r.cpu.toFixed(1)} s | ${r.rssMb.toFixed(0)} MB | ${r.detail} |\n`,
  );
}
