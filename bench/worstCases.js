// The "worst cases" of the worksheet functions: the slow and aborting calls of issue #10 and the slowest
// call found per function inside its documented domain, each run alone in a child process through the
// built bundle (bench/oneCall.js) with a watchdog. The scenarios are invented (no real experiment).
//
// `node bench/worstCases.js` prints the table alone; bench/run.js prints it as its "worst" section.
'use strict';
const { spawnSync } = require('child_process');
const path = require('path');

/** A column range of numbers, as Excel passes it. */
const col = (values) => values.map((v) => [v]);

/**
 * k variants of very different sizes: visitors from 10 to 1e9 (log-spaced), rates from 0 to 50% with a
 * variant at 0 conversions and one at all converted (the spread of panel widths the shared grid must span).
 */
function uneven(k) {
  const visitors = [];
  const conversions = [];
  for (let i = 0; i < k; i++) {
    const n = Math.round(10 ** (1 + (8 * i) / (k - 1)));
    const rate = i === 1 ? 0 : i === 2 ? 1 : 0.01 + (0.49 * ((i * 7) % k)) / k;
    visitors.push(n);
    conversions.push(Math.round(n * rate));
  }
  return { conversions: col(conversions), visitors: col(visitors) };
}

/** k close variants of 10,000 visitors around 5% (every posterior overlaps every other). */
function close(k) {
  const visitors = Array.from({ length: k }, (_, i) => 10000 + 7 * i);
  const conversions = visitors.map((n, i) => Math.round(n * 0.05 * (1 + 0.002 * i)));
  return { conversions: col(conversions), visitors: col(visitors) };
}

/** k averages of invented shops: counts from 2 to 1e8, means around 24, spreads from 0.01 to 300. */
function unevenMeans(k) {
  const count = [];
  const mean = [];
  const sd = [];
  for (let i = 0; i < k; i++) {
    count.push(Math.round(2 * 10 ** ((7.7 * i) / (k - 1))));
    mean.push(24 * (1 + 0.01 * ((i * 11) % k)));
    sd.push(0.01 * 10 ** ((4.5 * ((i * 13) % k)) / (k - 1)));
  }
  return { count: col(count), mean: col(mean), sd: col(sd) };
}

/** k event counts over exposures from 1 to 1e9, one at 0 events. */
function unevenEvents(k) {
  const events = [];
  const exposure = [];
  for (let i = 0; i < k; i++) {
    const e = Math.round(10 ** ((9 * i) / (k - 1)));
    exposure.push(e);
    events.push(i === 1 ? 0 : Math.round(e * (0.1 + (2 * ((i * 7) % k)) / k)));
  }
  return { events: col(events), exposure: col(exposure) };
}

/** k averages of an invented shop with millions of visitors each, close together (every pair overlaps). */
function ordinaryMeans(k) {
  return {
    count: col(Array.from({ length: k }, (_, i) => 7000000 + 1000 * i)),
    mean: col(Array.from({ length: k }, (_, i) => 24 * (1 + 0.001 * ((i * 7) % k)))),
    sd: col(Array.from({ length: k }, (_, i) => 40 + (i % 5))),
  };
}

/**
 * k invented shops' revenue totals: visitors from 1e2 to 1e9 (log-spaced), 1–8% ordering, average orders
 * from 20 to 80 with order_sd from 0.3 to 2 times the average (the spread of widths one comparison spans).
 */
function unevenRevenue(k) {
  const orders = [];
  const visitors = [];
  const revenue = [];
  const sd = [];
  for (let i = 0; i < k; i++) {
    const n = Math.round(10 ** (2 + (7 * i) / (k - 1)));
    const o = Math.max(3, Math.round(n * (0.01 + (0.07 * ((i * 7) % k)) / k)));
    const average = 20 + (60 * ((i * 11) % k)) / k;
    visitors.push(n);
    orders.push(o);
    revenue.push(Math.round(o * average * 100) / 100);
    sd.push(Math.round(average * (0.3 + (1.7 * ((i * 13) % k)) / k) * 100) / 100);
  }
  return { orders: col(orders), visitors: col(visitors), revenue: col(revenue), sd: col(sd) };
}

/** k close revenue variants of 10,000 visitors, about 5% ordering at about 50 an order (all overlap). */
function closeRevenue(k) {
  const visitors = Array.from({ length: k }, (_, i) => 10000 + 7 * i);
  const orders = visitors.map((n, i) => Math.round(n * 0.05 * (1 + 0.002 * i)));
  const revenue = orders.map((o, i) => Math.round(o * 50 * (1 + 0.001 * ((i * 7) % k)) * 100) / 100);
  const sd = orders.map((_, i) => 40 + (i % 5));
  return { orders: col(orders), visitors: col(visitors), revenue: col(revenue), sd: col(sd) };
}

/** k invented shops' first orders: 1 to 3 orders each (the exponential model's widest, most-piece posteriors). */
function fewOrders(k) {
  const orders = Array.from({ length: k }, (_, i) => 1 + (i % 3));
  const visitors = orders.map((o, i) => o * (1 + ((i * 7) % 40)));
  const revenue = orders.map((o, i) => Math.round(o * 50 * (1 + 0.01 * i) * 100) / 100);
  return { orders: col(orders), visitors: col(visitors), revenue: col(revenue) };
}

/** k whole numbers from a to b, evenly spaced (rounded): the cumulative visitors of a look list. */
const spaced = (k, a, b) => col(Array.from({ length: k }, (_, i) => Math.round(a + ((b - a) * i) / (k - 1))));
/** 100 looks one visitor apart (the exact method's largest lattices, a state array per look). */
const LOOKS_BY_ONE = spaced(100, 2101, 2200);
/** 100 looks from 50 to 5000 (the exact method's most convolution work at 100 looks). */
const LOOKS_TO_5000 = spaced(100, 50, 5000);

/**
 * k invented variants of 2,300 to 3,400 visitors with no conversions, but for two that converted every visitor
 * (a fuzz finding: each lift over a control at 0 is heavy-tailed, so no column can be interpolated).
 */
function zeroConversions(k) {
  const visitors = Array.from({ length: k }, (_, i) => 2300 + ((i * 37) % 1100));
  const conversions = visitors.map((n, i) => (i === 29 || i === 41 ? n : 0));
  return { conversions: col(conversions), visitors: col(visitors) };
}

const U50 = uneven(50);
const ZERO50 = zeroConversions(50);
const C50 = close(50);
const M50 = unevenMeans(50);
const O50 = ordinaryMeans(50);
const E50 = unevenEvents(50);
const R50 = unevenRevenue(50);
const RC50 = closeRevenue(50);
const F50 = fewOrders(50);
/** The revenue functions' rows: each at 50 variants, uneven and close, exponential and order_sd models. */
const revenueRows = [
  [
    'REVENUE_PROB_HIGHEST, 50 variants of 1–3 orders, exponential',
    'REVENUE_PROB_HIGHEST',
    [F50.orders, F50.visitors, F50.revenue],
    true,
  ],
  [
    'REVENUE_INTERVAL, 50 variants of 1–3 orders, exponential',
    'REVENUE_INTERVAL',
    [F50.orders, F50.visitors, F50.revenue, null, 0.9999],
    true,
  ],
];
for (const [name, extra] of [
  ['REVENUE_PROB_HIGHEST', []],
  ['REVENUE_EXPECTED_LOSS', []],
  ['REVENUE_DECISION', []],
  ['REVENUE_PROB_ABOVE_CONTROL', []],
  ['REVENUE_INTERVAL', [0.9999]],
  ['REVENUE_LIFT_INTERVAL', [0.9999]],
  ['REVENUE_PROB_LIFT_ABOVE', [0.05]],
]) {
  // REVENUE_PROB_LIFT_ABOVE takes min_lift before order_sd; the others take order_sd first.
  const liftFirst = name === 'REVENUE_PROB_LIFT_ABOVE';
  for (const [label, r] of [
    ['50 uneven variants', R50],
    ['50 close variants', RC50],
  ]) {
    const base = [r.orders, r.visitors, r.revenue];
    const expo = liftFirst ? [...base, ...extra] : extra.length ? [...base, null, ...extra] : base;
    const sd = liftFirst ? [...base, ...extra, r.sd] : [...base, r.sd, ...extra];
    revenueRows.push([`${name}, ${label}, exponential`, name, expo, true]);
    revenueRows.push([`${name}, ${label}, order_sd`, name, sd, true]);
  }
}

/**
 * Each case: the formula as a user would type it (shortened for generated ranges), the call, and whether
 * it lies inside the documented domain (the ≤ 250 ms target) or only at its edge or beyond (≤ 1 s).
 */
const CASES = [
  // Issue #10's reproductions.
  [
    'EXPECTED_LOSS({0;15;9},{5000;5000;5000},0.000001,0.999999)',
    'EXPECTED_LOSS',
    [col([0, 15, 9]), col([5000, 5000, 5000]), 0.000001, 0.999999],
    false,
  ],
  [
    'EVENTS_EXPECTED_LOSS({0;0;5},{1000;1000;1000},0.000001)',
    'EVENTS_EXPECTED_LOSS',
    [col([0, 0, 5]), col([1000, 1000, 1000]), 0.000001],
    false,
  ],
  [
    'DECISION({0;30000;0},{60000;60000;60000},,,1E-12,1)',
    'DECISION',
    [col([0, 30000, 0]), col([60000, 60000, 60000]), null, null, 1e-12, 1],
    false,
  ],
  ['VISITORS_NEEDED(0.01,0.01,0.999999999,0.95)', 'VISITORS_NEEDED', [0.01, 0.01, 0.999999999, 0.95], false],
  [
    'VISITORS_NEEDED(0.03,0.05,0.999999999,0.9,0.001,1E-12)',
    'VISITORS_NEEDED',
    [0.03, 0.05, 0.999999999, 0.9, 0.001, 1e-12],
    false,
  ],
  ['EXPECTED_LOSS, 50 uneven variants', 'EXPECTED_LOSS', [U50.conversions, U50.visitors], true],
  ['DECISION, 50 uneven variants', 'DECISION', [U50.conversions, U50.visitors], true],
  ['MEAN_EXPECTED_LOSS, 50 uneven variants', 'MEAN_EXPECTED_LOSS', [M50.count, M50.mean, M50.sd], true],
  ['MEAN_EXPECTED_LOSS, 50 close variants of 7e6 values', 'MEAN_EXPECTED_LOSS', [O50.count, O50.mean, O50.sd], true],
  ['MEAN_PROB_HIGHEST, 50 close variants of 7e6 values', 'MEAN_PROB_HIGHEST', [O50.count, O50.mean, O50.sd], true],
  ['LIFT_DENSITY, 50 uneven variants × 1000 points', 'LIFT_DENSITY', [U50.conversions, U50.visitors, 1000], false],
  ['LIFT_DENSITY, 50 close variants × 1000 points', 'LIFT_DENSITY', [C50.conversions, C50.visitors, 1000], false],
  ['PROB_HIGHEST, 50 uneven variants', 'PROB_HIGHEST', [U50.conversions, U50.visitors], true],
  // Worst found per function inside the domain (priors down to 0.001, thresholds up to 0.9999).
  [
    'EXPECTED_LOSS({0;15;9},{5000;5000;5000},0.001,1)',
    'EXPECTED_LOSS',
    [col([0, 15, 9]), col([5000, 5000, 5000]), 0.001, 1],
    true,
  ],
  [
    'EXPECTED_LOSS, 50 uneven variants, prior 0.001',
    'EXPECTED_LOSS',
    [U50.conversions, U50.visitors, 0.001, 0.001],
    true,
  ],
  ['PROB_HIGHEST, 50 close variants', 'PROB_HIGHEST', [C50.conversions, C50.visitors], true],
  ['PROB_ABOVE_CONTROL, 50 uneven variants', 'PROB_ABOVE_CONTROL', [U50.conversions, U50.visitors], true],
  ['LIFT_INTERVAL, 50 uneven variants', 'LIFT_INTERVAL', [U50.conversions, U50.visitors, 0.9999], true],
  ['RATE_DIFF_INTERVAL, 50 uneven variants', 'RATE_DIFF_INTERVAL', [U50.conversions, U50.visitors, 0.9999], true],
  ['PROB_LIFT_ABOVE, 50 uneven variants', 'PROB_LIFT_ABOVE', [U50.conversions, U50.visitors, 0.05], true],
  [
    'POSTERIOR_DENSITY, 50 uneven variants × 1000 points',
    'POSTERIOR_DENSITY',
    [U50.conversions, U50.visitors, 1000],
    true,
  ],
  [
    'LIFT_DENSITY, 50 uneven variants × 102 points (most rows allowed)',
    'LIFT_DENSITY',
    [U50.conversions, U50.visitors, 102],
    true,
  ],
  [
    'LIFT_DENSITY, 50 close variants × 102 points (most rows allowed)',
    'LIFT_DENSITY',
    [C50.conversions, C50.visitors, 102],
    true,
  ],
  [
    'LIFT_DENSITY, 50 variants at 0 conversions (two all converted) × 101 points',
    'LIFT_DENSITY',
    [ZERO50.conversions, ZERO50.visitors],
    true,
  ],
  [
    'LIFT_DENSITY({0;10},{1000;1000},1000) (no conversions in the control)',
    'LIFT_DENSITY',
    [col([0, 10]), col([1000, 1000]), 1000],
    true,
  ],
  [
    'LIFT_DENSITY({0;3},{1000;1000},1000,0.001,0.001)',
    'LIFT_DENSITY',
    [col([0, 3]), col([1000, 1000]), 1000, 0.001, 0.001],
    true,
  ],
  ['MEAN_PROB_HIGHEST, 50 uneven variants', 'MEAN_PROB_HIGHEST', [M50.count, M50.mean, M50.sd], true],
  ['MEAN_LIFT_INTERVAL, 50 uneven variants', 'MEAN_LIFT_INTERVAL', [M50.count, M50.mean, M50.sd, 0.9999], true],
  [
    'EVENTS_EXPECTED_LOSS, 50 uneven variants, prior 0.001',
    'EVENTS_EXPECTED_LOSS',
    [E50.events, E50.exposure, 0.001, 0.001],
    true,
  ],
  ['EVENTS_PROB_HIGHEST, 50 uneven variants', 'EVENTS_PROB_HIGHEST', [E50.events, E50.exposure], true],
  ['EVENTS_LIFT_INTERVAL, 50 uneven variants', 'EVENTS_LIFT_INTERVAL', [E50.events, E50.exposure, 0.9999], true],
  ['VISITORS_NEEDED(0.001,0.01,0.9999,0.99)', 'VISITORS_NEEDED', [0.001, 0.01, 0.9999, 0.99], true],
  [
    'VISITORS_NEEDED(0.03,0.05,0.9999,0.9,0.001,0.001)',
    'VISITORS_NEEDED',
    [0.03, 0.05, 0.9999, 0.9, 0.001, 0.001],
    true,
  ],
  [
    'VISITORS_NEEDED(0.5,0.01,0.9999,0.99,0.001,0.001)',
    'VISITORS_NEEDED',
    [0.5, 0.01, 0.9999, 0.99, 0.001, 0.001],
    true,
  ],
  ['DECISION_POWER(0.5,0.01,1E9,0.9999)', 'DECISION_POWER', [0.5, 0.01, 1e9, 0.9999], true],
  ['DECISION_POWER(0.5,0.01,1E10,0.9999)', 'DECISION_POWER', [0.5, 0.01, 1e10, 0.9999], true],
  ['PRIOR_FROM_HISTORY, 50 uneven rows', 'PRIOR_FROM_HISTORY', [U50.conversions, U50.visitors], true],
  // Planning at the edges of its domain (issue #10): the visitors ceiling of VISITORS_NEEDED (1E+9 per
  // variant), DECISION_POWER at its 1E+10 with the weakest prior, the smallest detectable lift at 1E+9 and
  // the largest thresholds, and the look planners at their largest look lists and visitors.
  [
    'VISITORS_NEEDED(0.5,0.00034,0.9999,0.9999) (just under 1E+9)',
    'VISITORS_NEEDED',
    [0.5, 0.00034, 0.9999, 0.9999],
    true,
  ],
  [
    'VISITORS_NEEDED(0.5,0.00032,0.9999,0.9999) (over 1E+9: #N/A)',
    'VISITORS_NEEDED',
    [0.5, 0.00032, 0.9999, 0.9999],
    true,
  ],
  [
    'DECISION_POWER(0.5,0.0001,1E10,0.9999,0.001,0.001)',
    'DECISION_POWER',
    [0.5, 0.0001, 1e10, 0.9999, 0.001, 0.001],
    true,
  ],
  ['SMALLEST_DETECTABLE_LIFT(0.5,1E9,0.9999,0.9999)', 'SMALLEST_DETECTABLE_LIFT', [0.5, 1e9, 0.9999, 0.9999], true],
  [
    'SMALLEST_DETECTABLE_LIFT(0.5,1E9,0.999999,0.9999,0.001,0.001)',
    'SMALLEST_DETECTABLE_LIFT',
    [0.5, 1e9, 0.999999, 0.9999, 0.001, 0.001],
    true,
  ],
  ['FALSE_ALARM_WITH_LOOKS(0.5, 100 looks 2101…2200)', 'FALSE_ALARM_WITH_LOOKS', [0.5, LOOKS_BY_ONE], true],
  ['POWER_WITH_LOOKS(0.5,0.01, 100 looks 2101…2200)', 'POWER_WITH_LOOKS', [0.5, 0.01, LOOKS_BY_ONE], true],
  ['THRESHOLD_FOR_LOOKS(0.5, 100 looks 2101…2200)', 'THRESHOLD_FOR_LOOKS', [0.5, LOOKS_BY_ONE], true],
  ['THRESHOLD_FOR_LOOKS(0.5, 100 looks 2101…2200, 0.05, 2)', 'THRESHOLD_FOR_LOOKS', [0.5, LOOKS_BY_ONE, 0.05, 2], true],
  ['FALSE_ALARM_WITH_LOOKS(0.05, 100 looks 50…5000)', 'FALSE_ALARM_WITH_LOOKS', [0.05, LOOKS_TO_5000], true],
  [
    'THRESHOLD_FOR_LOOKS(0.05, 100 looks 50…5000, 0.05, 2)',
    'THRESHOLD_FOR_LOOKS',
    [0.05, LOOKS_TO_5000, 0.05, 2],
    true,
  ],
  [
    'FALSE_ALARM_WITH_LOOKS(0.5, {1E8;…;9E8}, 0.95, 2)',
    'FALSE_ALARM_WITH_LOOKS',
    [0.5, spaced(9, 1e8, 9e8), 0.95, 2],
    true,
  ],
  ['POWER_WITH_LOOKS(0.5,0.0001, {1E8;…;9E8})', 'POWER_WITH_LOOKS', [0.5, 0.0001, spaced(9, 1e8, 9e8)], true],
  [
    'THRESHOLD_FOR_LOOKS(0.5, {3E8;6E8;9E8}, 0.05, 2)',
    'THRESHOLD_FOR_LOOKS',
    [0.5, spaced(3, 3e8, 9e8), 0.05, 2],
    true,
  ],
  ...revenueRows,
];

const WATCHDOG_MS = Number(process.env.WORST_CASE_WATCHDOG_MS || 20000);

/** Runs one case in a child process; returns its measures or why there are none. */
function runCase([, name, args]) {
  const child = spawnSync(process.execPath, [path.join(__dirname, 'oneCall.js'), JSON.stringify({ name, args })], {
    encoding: 'utf8',
    timeout: WATCHDOG_MS,
    maxBuffer: 1 << 20,
  });
  if (child.error && child.error.code === 'ETIMEDOUT') return { failure: `killed after ${WATCHDOG_MS / 1000} s` };
  if (child.status !== 0) {
    const why = (child.stderr || '').split('\n').find((l) => /error|fatal/i.test(l)) || `exit ${child.status}`;
    return { failure: `process died: ${why.trim().slice(0, 60)}` };
  }
  return JSON.parse(child.stdout.trim().split('\n').pop());
}

function outcome(r) {
  if (r.failure) return r.failure;
  if (r.error) return `${r.error} ${r.message.slice(0, 70)}`;
  const v = r.value;
  const first = Array.isArray(v) ? v[0] : v;
  const text = typeof first === 'number' ? Number(first.toPrecision(6)).toString() : String(first).slice(0, 50);
  return r.cells !== undefined ? `${text} (${r.cells} cells)` : text;
}

/**
 * The table's rows: formula, domain, CPU time, its target, memory, its target, what the cell shows. With
 * WORST_ONLY=text in the environment, only the cases whose label contains that text (e.g. LOOKS).
 */
function worstCaseRows(fmtMs) {
  const only = process.env.WORST_ONLY;
  return CASES.filter((c) => !only || c[0].includes(only)).map((c) => {
    const r = runCase(c);
    const inDomain = c[3];
    const target = inDomain ? 250 : 1000;
    const time = r.failure ? '—' : `${fmtMs(r.cpuMs)} ${r.cpuMs <= target ? '✓' : '✗'}`;
    const mb = r.failure ? '—' : `${(r.memory / 1e6).toFixed(1)} MB ${r.memory <= 50e6 ? '✓' : '✗'}`;
    return [
      c[0],
      inDomain ? 'inside' : 'edge/outside',
      time,
      inDomain ? '≤ 250 ms' : '≤ 1 s',
      mb,
      '≤ 50 MB',
      outcome(r),
    ];
  });
}

const HEADERS = ['call', 'domain', 'CPU time', 'target', 'memory', 'target', 'result'];
const NOTE =
  'Each call alone in a fresh node process through dist/functions.js (no table-memo hits), with a watchdog. ' +
  'CPU time = user + system time of the call (less inflated than the wall clock on a shared machine); ' +
  'memory = peak resident set during the call minus the resident set just before it (an upper bound).';

module.exports = { CASES, HEADERS, NOTE, worstCaseRows };

if (require.main === module) {
  const fmtMs = (ms) =>
    ms < 1 ? `${(ms * 1000).toFixed(0)} µs` : ms < 100 ? `${ms.toFixed(2)} ms` : `${ms.toFixed(0)} ms`;
  const rows = worstCaseRows(fmtMs);
  const widths = HEADERS.map((h, i) => Math.max(h.length, ...rows.map((r) => String(r[i]).length)));
  const line = (cells) => `| ${cells.map((c, i) => String(c).padEnd(widths[i])).join(' | ')} |`;
  console.log('\n### Worst cases (one call per process)\n');
  console.log(line(HEADERS));
  console.log(`|${widths.map((w) => '-'.repeat(w + 2)).join('|')}|`);
  for (const r of rows) console.log(line(r));
  console.log(`\n${NOTE}`);
}
