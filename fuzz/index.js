/**
 * The fuzzer as a library: {@link runFuzz} runs a seeded series of calls through the built bundle in a
 * pool of child processes and returns a report (report.js prints it); {@link runFormulas} replays
 * formulas such as the report's reproductions. fuzz/run.js is the command line (`npm run fuzz`).
 */
'use strict';
const fs = require('fs');
const path = require('path');
const { Pool } = require('./pool');
const { loadModels, REPO_ROOT } = require('./models');
const { generateCall } = require('./generate');
const { checkResult, KINDS, skeleton } = require('./checks');
const { renderCall, parseFormula } = require('./formula');
const { shrink } = require('./shrink');

const DEFAULTS = {
  seed: 1,
  calls: 20000,
  only: [],
  bundle: path.join(REPO_ROOT, 'dist', 'functions.js'),
  metadata: undefined,
  jobs: 2,
  budgetMs: 1000,
  slowMs: 250,
  memoryMb: 50,
  heapMb: 256,
  shrink: true,
  shrinkBudget: 40,
  shrinkSeconds: 120,
  examples: 3,
  onProgress: undefined,
};

function resolveOptions(given) {
  const options = { ...DEFAULTS, ...Object.fromEntries(Object.entries(given).filter(([, v]) => v !== undefined)) };
  options.bundle = path.resolve(options.bundle);
  options.metadata = path.resolve(options.metadata ?? path.join(path.dirname(options.bundle), 'functions.json'));
  for (const file of [options.bundle, options.metadata]) {
    if (!fs.existsSync(file))
      throw new UsageError(`${path.relative(process.cwd(), file) || file} is missing: run \`npm run build\` first`);
  }
  return options;
}

/** A problem with how the fuzzer was called (exit code 2), as opposed to a finding (exit code 1). */
class UsageError extends Error {}

function selectModels(all, only) {
  if (!only || only.length === 0) return all;
  const wanted = only.map((name) =>
    String(name)
      .toUpperCase()
      .replace(/^ABTEST\./, ''),
  );
  const unknown = wanted.filter((name) => !all.some((m) => m.id === name));
  if (unknown.length > 0)
    throw new UsageError(
      `--only: no registered function ${unknown.join(', ')} (known: ${all.map((m) => m.id).join(', ')})`,
    );
  return all.filter((m) => wanted.includes(m.id));
}

function percentile(sorted, q) {
  if (sorted.length === 0) return 0;
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];
}

/**
 * Kinds whose findings share one cause across functions (the sheet layer, the one error mapping): grouped
 * by the shape of the message alone, with the functions listed. Other kinds are grouped per function.
 */
const ACROSS_FUNCTIONS = new Set(['wording', 'unnamed-argument', 'raw', 'error-code', 'not-refused']);

/** A message's shape for grouping: numbers and quoted text left out, the leading argument name too. */
function messageShape(detail) {
  return skeleton(detail)
    .replace(/^(?:[a-z_]+(?: and [a-z_]+)?)(?:, item #)?: /, '<argument>: ')
    .replace(/^([\w/]+) \(/, '<argument> (')
    .replace(/; enter [^[]*/, '; enter …')
    .replace(/\([a-z_]+\) accepted$/, '(<argument>) accepted');
}

/** What a group of alike findings is keyed by, and the detail it shows. */
function groupOf(fn, finding) {
  if (ACROSS_FUNCTIONS.has(finding.kind)) {
    const detail = messageShape(finding.detail);
    return { key: `${finding.kind}\u0000${detail}`, detail };
  }
  // the fuzzer's own words, except a spill's size, which varies with the input
  const detail = finding.kind === 'shape' ? skeleton(finding.detail) : finding.detail;
  return { key: `${finding.kind}\u0000${fn}\u0000${detail}`, detail };
}

/** A finding that only counts when the same kind comes back (the detail of an abort or a timing varies). */
const sameFailure = (target) => (finding) =>
  finding.kind === target.kind &&
  (['abort', 'timeout', 'memory'].includes(target.kind) || groupOf(target.fn, finding).detail === target.detail);

function describeOutcome(result) {
  switch (result.outcome) {
    case 'value':
      return 'a value';
    case 'error':
      return `${result.code} "${result.message}"`;
    case 'raw':
      return `raw ${result.name}: ${result.message}`;
    case 'abort':
      return `engine abort: ${result.reason}`;
    case 'timeout':
      return `killed after ${Math.round(result.cpuMs)} ms of CPU`;
    default:
      return result.outcome;
  }
}

/**
 * Runs the fuzzer.
 * @param {Partial<typeof DEFAULTS>} given
 * @returns {Promise<object>} the report: settings, timings, outcome counts per function, failure groups
 *   (kind, function, detail, count, examples with formulas), slow calls, and `failed` (true when any
 *   check failed).
 */
async function runFuzz(given = {}) {
  const options = resolveOptions(given);
  const allModels = loadModels({ metadataPath: options.metadata });
  const models = selectModels(allModels, options.only);
  const pool = new Pool({
    bundle: options.bundle,
    jobs: options.jobs,
    budgetMs: options.budgetMs,
    heapMb: options.heapMb,
  });
  const started = Date.now();
  const registered = await pool.start();
  const groups = new Map();
  const perFunction = new Map(
    models.map((m) => [m.id, { calls: 0, value: 0, '#VALUE!': 0, '#N/A': 0, failed: 0, cpu: [], maxHeapMb: 0 }]),
  );
  const slow = [];
  let failedCalls = 0;
  const record = (model, call, result, findings) => {
    const stats = perFunction.get(model.id);
    stats.calls++;
    if (result.outcome === 'value') stats.value++;
    else if (result.outcome === 'error' && stats[result.code] !== undefined) stats[result.code]++;
    if (typeof result.cpuMs === 'number') stats.cpu.push(result.cpuMs);
    if (typeof result.heapGrowthMb === 'number') stats.maxHeapMb = Math.max(stats.maxHeapMb, result.heapGrowthMb);
    if (result.outcome !== 'timeout' && result.cpuMs > options.slowMs)
      slow.push({
        fn: model.id,
        args: call.args,
        cpuMs: result.cpuMs,
        wallMs: result.wallMs,
        outcome: describeOutcome(result),
      });
    if (findings.length === 0) return;
    stats.failed++;
    failedCalls++;
    for (const finding of findings) {
      const { key, detail } = groupOf(model.id, finding);
      if (!groups.has(key))
        groups.set(key, { kind: finding.kind, fn: model.id, functions: {}, detail, count: 0, calls: [] });
      const group = groups.get(key);
      group.count++;
      group.functions[model.id] = (group.functions[model.id] || 0) + 1;
      group.calls.push({ fn: model.id, args: call.args, result, index: call.index });
    }
  };

  for (const model of models) {
    if (!registered.includes(model.id))
      record(model, { args: [], index: -1 }, { outcome: 'missing' }, [{ kind: 'missing', detail: 'not associated' }]);
  }
  const runnable = models.filter((m) => registered.includes(m.id));
  let done = 0;
  let nextIndex = 0;
  let lastProgress = Date.now();
  const worker = async () => {
    while (nextIndex < options.calls) {
      const call = generateCall(runnable, options.seed, nextIndex++);
      const model = runnable.find((m) => m.id === call.fn);
      const result = await pool.run(call);
      record(model, call, result, checkResult(model, call.args, result, options));
      done++;
      if (options.onProgress && Date.now() - lastProgress > 5000) {
        lastProgress = Date.now();
        options.onProgress({ done, total: options.calls, failedCalls, seconds: (Date.now() - started) / 1000 });
      }
    }
  };
  if (runnable.length > 0) await Promise.all(Array.from({ length: options.jobs * 2 }, worker));
  const runSeconds = (Date.now() - started) / 1000;

  // minimal reproductions: one per group, smallest formula first, within a time budget
  const shrinkStarted = Date.now();
  const groupList = [...groups.values()].sort(
    (a, b) => Object.keys(KINDS).indexOf(a.kind) - Object.keys(KINDS).indexOf(b.kind) || b.count - a.count,
  );
  for (const group of groupList) {
    const modelOf = (fn) => models.find((m) => m.id === fn);
    const ranked = group.calls
      .map((c) => ({
        ...c,
        ...renderCall(
          c.fn,
          c.args,
          modelOf(c.fn).params.map((p) => p.name),
        ),
      }))
      .sort((a, b) => a.formula.length - b.formula.length);
    // examples from as many functions as possible, shortest first
    const chosen = [];
    for (const c of ranked) if (chosen.length < options.examples && !chosen.some((x) => x.fn === c.fn)) chosen.push(c);
    for (const c of ranked) if (chosen.length < options.examples && !chosen.includes(c)) chosen.push(c);
    group.examples = chosen.map((c) => ({
      fn: c.fn,
      formula: c.formula,
      notes: c.notes,
      outcome: describeOutcome(c.result),
      cpuMs: c.result.cpuMs,
      call: c.index,
    }));
    group.fn = Object.entries(group.functions).sort((a, b) => b[1] - a[1])[0][0];
    delete group.calls;
    const first = ranked[0];
    const model = first ? modelOf(first.fn) : undefined;
    const names = model ? model.params.map((p) => p.name) : [];
    const timeLeft = options.shrinkSeconds * 1000 - (Date.now() - shrinkStarted);
    if (!options.shrink || group.kind === 'missing' || !first || timeLeft <= 0) continue;
    const slowKind = ['abort', 'timeout', 'memory'].includes(group.kind);
    const matches = sameFailure(group);
    const stillFails = async (args) => {
      const result = await pool.run({ fn: first.fn, args });
      return checkResult(model, args, result, options).some(matches);
    };
    const { args } = await shrink(
      model,
      first.args,
      stillFails,
      slowKind ? Math.min(12, options.shrinkBudget) : options.shrinkBudget,
    );
    if (args !== first.args) {
      const rendered = renderCall(first.fn, args, names);
      const check = await pool.run({ fn: first.fn, args });
      group.minimal = {
        fn: first.fn,
        formula: rendered.formula,
        notes: rendered.notes,
        outcome: describeOutcome(check),
        cpuMs: check.cpuMs,
      };
    }
  }
  const shrinkSeconds = (Date.now() - shrinkStarted) / 1000;
  const spawns = pool.spawns;
  await pool.close();

  const functions = [...perFunction.entries()].map(([id, s]) => {
    const cpu = s.cpu.sort((a, b) => a - b);
    return {
      id,
      calls: s.calls,
      values: s.value,
      valueErrors: s['#VALUE!'],
      naErrors: s['#N/A'],
      failed: s.failed,
      p50Ms: percentile(cpu, 0.5),
      p99Ms: percentile(cpu, 0.99),
      maxMs: cpu.length ? cpu[cpu.length - 1] : 0,
      maxHeapMb: s.maxHeapMb,
    };
  });
  slow.sort((a, b) => b.cpuMs - a.cpuMs);
  return {
    settings: {
      seed: options.seed,
      calls: options.calls,
      only: models.length === allModels.length ? [] : models.map((m) => m.id),
      bundle: path.relative(REPO_ROOT, options.bundle).startsWith('..')
        ? options.bundle
        : path.relative(REPO_ROOT, options.bundle),
      jobs: options.jobs,
      budgetMs: options.budgetMs,
      slowMs: options.slowMs,
      memoryMb: options.memoryMb,
      heapMb: options.heapMb,
    },
    functionsFuzzed: models.length,
    runSeconds,
    callsPerSecond: done / Math.max(runSeconds, 1e-9),
    shrinkSeconds,
    respawns: spawns - options.jobs,
    failedCalls,
    groups: groupList,
    slow: slow.slice(0, 200).map((s) => ({
      ...renderCall(
        s.fn,
        s.args,
        models.find((m) => m.id === s.fn).params.map((p) => p.name),
      ),
      fn: s.fn,
      cpuMs: s.cpuMs,
      wallMs: s.wallMs,
      outcome: s.outcome,
    })),
    slowCount: slow.length,
    functions,
    failed: groupList.length > 0,
  };
}

/**
 * Replays formulas (e.g. reproductions from a report) one by one and checks each result.
 * @returns {Promise<{ formula: string, outcome: string, cpuMs?: number, findings: object[] }[]>}
 */
async function runFormulas(formulas, given = {}) {
  const options = resolveOptions(given);
  const models = loadModels({ metadataPath: options.metadata });
  const pool = new Pool({ bundle: options.bundle, jobs: 1, budgetMs: options.budgetMs, heapMb: options.heapMb });
  await pool.start();
  const out = [];
  try {
    for (const formula of formulas) {
      let parsed;
      try {
        parsed = parseFormula(formula);
      } catch (error) {
        throw new UsageError(error.message);
      }
      const model = models.find((m) => m.id === parsed.fn);
      if (!model) throw new UsageError(`${formula}: no registered function ${parsed.fn}`);
      // a single value given for a range is the one-cell range Excel would pass
      const args = parsed.args.map((a, i) =>
        model.params[i] &&
        (model.params[i].role === 'range' || model.params[i].role === 'aligned') &&
        a !== null &&
        !Array.isArray(a)
          ? [[a]]
          : a,
      );
      const result = await pool.run({ fn: model.id, args });
      out.push({
        formula,
        result,
        outcome: describeOutcome(result),
        cpuMs: result.cpuMs,
        heapGrowthMb: result.heapGrowthMb,
        findings: checkResult(model, args, result, options),
      });
    }
  } finally {
    await pool.close();
  }
  return out;
}

module.exports = { runFuzz, runFormulas, UsageError, DEFAULTS, KINDS };
