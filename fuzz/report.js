/**
 * The fuzzer's report as text (markdown, readable in a terminal): what ran, how fast, the failures
 * grouped by kind with counts and reproductions, the calls over the in-domain target, and per-function
 * timings.
 */
'use strict';
const { KINDS } = require('./checks');

/** "1 call", "2 calls" */
const plural = (n, word) => `${n} ${word}${n === 1 ? '' : 's'}`;
const ms = (x) => (typeof x === 'number' ? (x >= 100 ? x.toFixed(0) : x.toFixed(1)) : '–');

function formatReport(report) {
  const s = report.settings;
  const lines = [];
  const only = s.only.length ? ` (only ${s.only.join(', ')})` : '';
  lines.push(
    `# Fuzzer report: seed ${s.seed}, ${plural(s.calls, 'call')} ` +
      `over ${plural(report.functionsFuzzed, 'function')}${only}`,
  );
  lines.push('');
  lines.push(
    `Bundle ${s.bundle}; ${s.jobs} child processes (heap bounded at ${s.heapMb} MB); ` +
      `hard budget ${s.budgetMs} ms of CPU per call, in-domain target ${s.slowMs} ms, ` +
      `memory limit ${s.memoryMb} MB per call.`,
  );
  lines.push(
    `Ran in ${report.runSeconds.toFixed(1)} s (${report.callsPerSecond.toFixed(0)} calls/s), ` +
      `minimal reproductions in ${report.shrinkSeconds.toFixed(1)} s; ` +
      `${report.respawns} children replaced after an abort or a kill.`,
  );
  lines.push('');
  if (!report.failed) {
    lines.push('No failures.');
  } else {
    lines.push(
      `**${plural(report.failedCalls, 'call')} failed a check**, in ${plural(report.groups.length, 'group')}:`,
    );
    lines.push('');
    lines.push('| kind | calls (a call may fail several checks) | groups |');
    lines.push('|---|---|---|');
    for (const kind of Object.keys(KINDS)) {
      const groups = report.groups.filter((g) => g.kind === kind);
      if (groups.length)
        lines.push(`| ${KINDS[kind]} | ${groups.reduce((n, g) => n + g.count, 0)} | ${groups.length} |`);
    }
    for (const kind of Object.keys(KINDS)) {
      const groups = report.groups.filter((g) => g.kind === kind);
      if (groups.length === 0) continue;
      lines.push('');
      lines.push(
        `## ${KINDS[kind]} (${plural(
          groups.reduce((n, g) => n + g.count, 0),
          'call',
        )})`,
      );
      for (const g of groups) {
        lines.push('');
        const where = Object.entries(g.functions || { [g.fn]: g.count }).sort((a, b) => b[1] - a[1]);
        const names =
          where.length === 1
            ? `**${where[0][0]}**`
            : `${where.length} functions (${where.map(([fn, n]) => `${fn} ${n}`).join(', ')})`;
        lines.push(`- ${names}: ${g.detail} — ${g.count} call${g.count === 1 ? '' : 's'}`);
        const shown = [];
        if (g.minimal) shown.push({ ...g.minimal, label: 'minimal' });
        for (const e of g.examples || []) if (!shown.some((x) => x.formula === e.formula)) shown.push(e);
        for (const e of shown) {
          const timing = typeof e.cpuMs === 'number' ? `, ${ms(e.cpuMs)} ms` : '';
          lines.push(`  - \`${e.formula}\`${e.label ? ` (${e.label})` : ''} → ${e.outcome.slice(0, 200)}${timing}`);
          for (const note of e.notes || []) lines.push(`    (${note})`);
        }
      }
    }
  }
  lines.push('');
  lines.push(`## Calls over the in-domain target of ${s.slowMs} ms (not counted as failures): ${report.slowCount}`);
  if (report.slow.length) {
    lines.push('');
    const byFn = new Map();
    for (const x of report.slow) byFn.set(x.fn, [...(byFn.get(x.fn) || []), x]);
    for (const [fn, list] of byFn) {
      lines.push(`- **${fn}**: ${list.length} call${list.length === 1 ? '' : 's'}, up to ${ms(list[0].cpuMs)} ms`);
      for (const x of list.slice(0, 2)) {
        const formula = x.formula.length > 400 ? `${x.formula.slice(0, 400)}…` : x.formula;
        lines.push(`  - \`${formula}\` → ${x.outcome.slice(0, 120)}, ${ms(x.cpuMs)} ms`);
      }
    }
  }
  lines.push('');
  lines.push('## Per function (CPU ms per call)');
  lines.push('');
  lines.push('| function | calls | values | #VALUE! | #N/A | failed | median | 99th pct | max | max heap growth MB |');
  lines.push('|---|---|---|---|---|---|---|---|---|---|');
  for (const f of report.functions) {
    const cells = [f.id, f.calls, f.values, f.valueErrors, f.naErrors, f.failed, ms(f.p50Ms), ms(f.p99Ms), ms(f.maxMs)];
    lines.push(`| ${cells.join(' | ')} | ${f.maxHeapMb.toFixed(1)} |`);
  }
  return lines.join('\n');
}

module.exports = { formatReport };
