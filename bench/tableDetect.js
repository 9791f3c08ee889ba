#!/usr/bin/env node
// The side panel's table detection (taskpane/logic/tableDetect.ts) on large selections: a printed
// table of the median time of detectTable + checkTable, and the length of the problem text the panel
// would show. Run: `node bench/tableDetect.js` (no build needed). The tables are invented: a day column,
// visitors and conversions per row; "text" puts every visitors cell in as text ("10,050"). Selections
// longer than MAX_TABLE_ROWS (5,000 rows with the header) are refused before anything else is read.
'use strict';
require('../scripts/tsRequire');
const path = require('path');
const { checkTable, detectTable } = require(path.join(__dirname, '..', 'taskpane', 'logic', 'tableDetect.ts'));

function medianMs(fn, budgetMs = 400, maxCalls = 50) {
  fn();
  const times = [];
  const started = process.hrtime.bigint();
  while (times.length < 3 || (times.length < maxCalls && Number(process.hrtime.bigint() - started) / 1e6 < budgetMs)) {
    const t0 = process.hrtime.bigint();
    fn();
    times.push(Number(process.hrtime.bigint() - t0) / 1e6);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)];
}

function table(rows, text) {
  const out = [['Day', 'Visitors', 'Conversions']];
  for (let r = 0; r < rows; r += 1) {
    const visitors = 10000 + ((r * 37) % 500);
    out.push([r + 1, text ? visitors.toLocaleString('en-US') : visitors, 400 + ((r * 13) % 90)]);
  }
  return out;
}

const rows = [];
for (const n of [1000, 2000, 4999, 10000, 20000]) {
  for (const text of [false, true]) {
    const values = table(n, text);
    let shown = '';
    let outcome = '';
    const ms = medianMs(() => {
      const detection = detectTable(values);
      if (!detection.ok) {
        shown = detection.problem;
        outcome = 'refused by detection';
        return;
      }
      const checked = checkTable(values, detection.mapping);
      shown = checked.ok ? '' : checked.problems.join('; ');
      outcome = checked.ok ? 'read-out possible' : 'refused by the check';
    });
    const time =
      ms < 0.01 ? `${(ms * 1000).toFixed(1)} µs` : ms < 1 ? `${(ms * 1000).toFixed(0)} µs` : `${ms.toFixed(1)} ms`;
    rows.push([
      n.toLocaleString('en-US'),
      text ? 'text visitors' : 'numbers',
      time,
      outcome,
      shown.length.toLocaleString('en-US'),
    ]);
  }
}
const headers = ['data rows', 'visitors column', 'detect + check', 'outcome', 'problem text (chars)'];
const widths = headers.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
const line = (cells) => `| ${cells.map((c, i) => c.padEnd(widths[i])).join(' | ')} |`;
console.log('\n### Side panel: table detection on large selections\n');
console.log(line(headers));
console.log(`|${widths.map((w) => '-'.repeat(w + 2)).join('|')}|`);
for (const r of rows) console.log(line(r));
