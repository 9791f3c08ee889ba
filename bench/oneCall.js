#!/usr/bin/env node
// One worksheet call through the built bundle (dist/functions.js), alone in this process, for the
// "worst cases" table of bench/run.js: `node bench/oneCall.js '<json>'` with {"name": "EXPECTED_LOSS",
// "args": [...]} (arrays are sheet ranges, null an omitted argument). Prints one line of JSON: the CPU
// time of the call (user + system, so a loaded machine inflates it less than the wall clock), the wall
// time, the growth of the resident set during the call (peak RSS − RSS before it, from the kernel's
// high-water mark) and what the cell would show (the first value, or the error's code and message).
'use strict';
const fs = require('fs');
const path = require('path');

const request = JSON.parse(process.argv[2]);
const bundlePath = path.join(__dirname, '..', 'dist', 'functions.js');
const code = fs.readFileSync(bundlePath, 'utf8');
const registered = new Map();
class CfError extends Error {
  constructor(errorCode, message) {
    super(message);
    this.code = errorCode;
  }
}
const customFunctions = {
  associate: (id, fn) => {
    if (typeof id === 'string') registered.set(id, fn);
    else for (const [k, f] of Object.entries(id)) registered.set(k, f);
  },
  Error: CfError,
  ErrorCode: { invalidValue: '#VALUE!', notAvailable: '#N/A', invalidNumber: '#NUM!' },
};
new Function('CustomFunctions', 'Office', code)(customFunctions, { onReady: () => Promise.resolve({}) });
const fn = registered.get(request.name);
if (!fn) throw new Error(`${request.name} is not registered by the bundle`);

const rssBefore = process.memoryUsage().rss;
const cpu0 = process.cpuUsage();
const t0 = process.hrtime.bigint();
let shown;
try {
  const result = fn(...request.args);
  if (Array.isArray(result)) {
    const flat = result.flat();
    shown = { value: flat.slice(0, 3), cells: flat.length };
  } else shown = { value: result };
} catch (error) {
  shown = { error: error && error.code ? error.code : 'raw exception', message: String(error && error.message) };
}
const wallMs = Number(process.hrtime.bigint() - t0) / 1e6;
const cpu = process.cpuUsage(cpu0);
const maxRss = process.resourceUsage().maxRSS * 1024;
// The call's memory: how far the peak rose above the RSS just before the call (an upper bound: a peak
// left by loading the bundle counts too, so small calls show a few MB), node's own start-up not counted.
const memory = Math.max(0, maxRss - rssBefore);
process.stdout.write(`${JSON.stringify({ cpuMs: (cpu.user + cpu.system) / 1000, wallMs, memory, ...shown })}\n`);
