/**
 * A fuzzer child process: loads the built functions bundle with the CustomFunctions stand-in (as Excel's
 * runtime would: the bundle's only host globals are CustomFunctions and Office) and runs one call at a
 * time for its parent (pool.js), reporting the outcome, the CPU and wall time, and the heap growth.
 *
 * The bundle runs through `new Function` in this process's own realm rather than in a vm context: a vm
 * context's global object slows every global lookup several times, which would distort the timings.
 * The parent starts this file with a bounded --max-old-space-size and --expose-gc.
 */
'use strict';
const fs = require('fs');
const v8 = require('v8');
const { performance } = require('perf_hooks');
const { createStandIn, decodeValue } = require('./standIn');

const bundlePath = process.argv[2];
const host = createStandIn();
new Function('CustomFunctions', 'Office', fs.readFileSync(bundlePath, 'utf8'))(host.api, host.office);

/** Committed heap outside the young generation, plus memory held outside the heap (typed arrays). */
function committedBytes() {
  let total = 0;
  for (const space of v8.getHeapSpaceStatistics()) if (space.space_name !== 'new_space') total += space.space_size;
  return total + process.memoryUsage().external;
}

let cleanBaseline = committedBytes();
/** After a call that left the committed heap this far above the last clean state, collect before the next. */
const RECOLLECT_BYTES = 48 * 1024 * 1024;

/** A result value as plain data: errors inside arrays keep their code, other objects are described. */
function plain(value) {
  if (Array.isArray(value)) return value.map(plain);
  if (value instanceof host.api.Error) return { $error: value.code, message: value.message };
  if (value !== null && typeof value === 'object') return { $object: Object.prototype.toString.call(value) };
  if (typeof value === 'function' || typeof value === 'symbol' || typeof value === 'bigint')
    return { $object: typeof value };
  return value;
}

function describeThrown(thrown) {
  if (thrown instanceof host.api.Error) return { outcome: 'error', code: thrown.code, message: String(thrown.message) };
  const isError = thrown instanceof Error;
  return {
    outcome: 'raw',
    name: isError ? thrown.name : typeof thrown,
    message: isError ? String(thrown.message) : String(thrown),
    stack: isError && thrown.stack ? String(thrown.stack).split('\n').slice(0, 4).join('\n') : '',
  };
}

async function runCall(message) {
  const fn = host.associations.get(message.fn);
  if (!fn) return { outcome: 'missing' };
  const args = decodeValue(message.args, host.api);
  const before = committedBytes();
  const cpu0 = process.cpuUsage();
  const t0 = performance.now();
  let outcome;
  try {
    let value = fn(...args);
    if (value !== null && typeof value === 'object' && typeof value.then === 'function') value = await value;
    outcome = { outcome: 'value', value: plain(value) };
  } catch (thrown) {
    outcome = describeThrown(thrown);
  }
  const wallMs = performance.now() - t0;
  const cpu = process.cpuUsage(cpu0);
  const after = committedBytes();
  return {
    ...outcome,
    wallMs,
    cpuMs: (cpu.user + cpu.system) / 1000,
    heapGrowthMb: Math.max(0, after - before) / 1048576,
    after,
  };
}

process.on('message', (message) => {
  runCall(message).then((result) => {
    const { after, ...report } = result;
    report.id = message.id;
    const usage = process.cpuUsage();
    report.cpuTotalUs = usage.user + usage.system;
    process.send(report, () => {
      if (after !== undefined && after - cleanBaseline > RECOLLECT_BYTES && typeof global.gc === 'function') {
        global.gc();
        cleanBaseline = committedBytes();
      }
    });
  });
});

const usage = process.cpuUsage();
process.send({ ready: true, functions: [...host.associations.keys()], cpuTotalUs: usage.user + usage.system });
