#!/usr/bin/env node
// `npm run bench`: the speed table of Lift Ledger's statistics core and add-in bundle.
//
// Each cell is the median time of one call, measured over repeated calls after a warm-up. Beside the
// exact (quadrature) values stands what a notebook would do: a seeded 100,000-draw Monte Carlo estimate
// of the same quantity, its time, and its error against ours. The scenario is invented: a control
// converting at 5% and challengers a few percent better, at 1e2 … 1e9 visitors per variant.
//
// Options: --quick (fewer sizes; for a smoke run), --section=NAME (core, variants, planning, looks, models, revenue,
// addin, worst, tableDetect).
'use strict';
require('../scripts/tsRequire');
const fs = require('fs');
const path = require('path');
const zlib = require('zlib');

const args = process.argv.slice(2);
const quick = args.includes('--quick');
const onlySection = (args.find((a) => a.startsWith('--section=')) || '').split('=')[1];
const root = path.join(__dirname, '..');

// ---------------------------------------------------------------------------------------------------
// Timing and formatting
// ---------------------------------------------------------------------------------------------------

/** Median milliseconds per call of fn, over batches lasting at least `budgetMs` in total. */
function medianMs(fn, budgetMs = 150, maxCalls = 2000) {
  fn(); // warm-up (JIT, caches)
  const times = [];
  const started = process.hrtime.bigint();
  while (times.length < 5 || (times.length < maxCalls && Number(process.hrtime.bigint() - started) / 1e6 < budgetMs)) {
    const t0 = process.hrtime.bigint();
    fn();
    times.push(Number(process.hrtime.bigint() - t0) / 1e6);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)];
}

function fmtMs(ms) {
  if (ms === undefined || ms === null || Number.isNaN(ms)) return 'n/a';
  if (ms < 0.01) return `${(ms * 1000).toFixed(2)} µs`;
  if (ms < 1) return `${(ms * 1000).toFixed(0)} µs`;
  if (ms < 100) return `${ms.toFixed(2)} ms`;
  return `${ms.toFixed(0)} ms`;
}
const fmtErr = (e) => (e === undefined ? 'n/a' : Math.abs(e).toExponential(1));
const fmtN = (n) => (n >= 1e3 ? `1e${Math.round(Math.log10(n))}` : String(n));

function printTable(title, headers, rows, note) {
  const widths = headers.map((h, i) => Math.max(String(h).length, ...rows.map((r) => String(r[i]).length)));
  const line = (cells) => `| ${cells.map((c, i) => String(c).padEnd(widths[i])).join(' | ')} |`;
  console.log(`\n### ${title}\n`);
  console.log(line(headers));
  console.log(`|${widths.map((w) => '-'.repeat(w + 2)).join('|')}|`);
  for (const r of rows) console.log(line(r));
  if (note) console.log(`\n${note}`);
}

function section(name, fn) {
  if (onlySection && onlySection !== name) return;
  try {
    fn();
  } catch (error) {
    console.log(`\n### ${name}: not measured (${error && error.message ? error.message.split('\n')[0] : error})`);
  }
}

// ---------------------------------------------------------------------------------------------------
// The seeded Monte Carlo a notebook would run (for comparison only; the product uses no random numbers)
// ---------------------------------------------------------------------------------------------------

function seededUniform(seed) {
  // mulberry32: a small, well-known 32-bit generator; fine for a comparison baseline.
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function makeSampler(seed) {
  const uniform = seededUniform(seed);
  let spare = null;
  const normal = () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let u = 0;
    while (u === 0) u = uniform();
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
  // Marsaglia & Tsang (2000) gamma sampler, with the usual boost for shape < 1.
  const gamma = (shape) => {
    if (shape < 1) return gamma(shape + 1) * Math.pow(uniform(), 1 / shape);
    const d = shape - 1 / 3;
    const c = 1 / Math.sqrt(9 * d);
    for (;;) {
      let x;
      let v;
      do {
        x = normal();
        v = 1 + c * x;
      } while (v <= 0);
      v = v * v * v;
      const u = uniform();
      if (u < 1 - 0.0331 * x * x * x * x) return d * v;
      if (Math.log(u) < 0.5 * x * x + d * (1 - v + Math.log(v))) return d * v;
    }
  };
  const beta = (a, b) => {
    const x = gamma(a);
    return x / (x + gamma(b));
  };
  return { beta, gamma, normal, uniform };
}

const DRAWS = 100000;

/** Monte Carlo draws of each variant's posterior rate under a uniform prior: draws[variant][i]. */
function drawPosteriors(variants, seed = 20261201) {
  const sampler = makeSampler(seed);
  return variants.map((v) => {
    const out = new Float64Array(DRAWS);
    for (let i = 0; i < DRAWS; i++) out[i] = sampler.beta(1 + v.conversions, 1 + v.visitors - v.conversions);
    return out;
  });
}

function mcProbAbove(variants) {
  const [a, b] = drawPosteriors(variants);
  let count = 0;
  for (let i = 0; i < DRAWS; i++) if (b[i] > a[i]) count++;
  return count / DRAWS;
}

function mcProbHighest(variants) {
  const draws = drawPosteriors(variants);
  const wins = new Array(variants.length).fill(0);
  for (let i = 0; i < DRAWS; i++) {
    let best = 0;
    for (let j = 1; j < draws.length; j++) if (draws[j][i] > draws[best][i]) best = j;
    wins[best]++;
  }
  return wins.map((w) => w / DRAWS);
}

function mcExpectedLoss(variants) {
  const draws = drawPosteriors(variants);
  const loss = new Array(variants.length).fill(0);
  for (let i = 0; i < DRAWS; i++) {
    let max = -Infinity;
    for (const d of draws) if (d[i] > max) max = d[i];
    draws.forEach((d, j) => (loss[j] += max - d[i]));
  }
  return loss.map((l) => l / DRAWS);
}

function mcLiftLower(variants, level = 0.95) {
  const [a, b] = drawPosteriors(variants);
  const lift = new Float64Array(DRAWS);
  for (let i = 0; i < DRAWS; i++) lift[i] = b[i] / a[i] - 1;
  lift.sort();
  return lift[Math.floor(((1 - level) / 2) * DRAWS)];
}

// ---------------------------------------------------------------------------------------------------
// Scenarios (invented)
// ---------------------------------------------------------------------------------------------------

const SIZES = quick ? [1e2, 1e4, 1e6, 1e9] : [1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9];
const VARIANT_COUNTS = quick ? [2, 10, 50] : [2, 5, 10, 20, 50];

/**
 * k variants of an invented test: control at 5%, each challenger 2% (relative) better, and slightly
 * different traffic per variant, so no two variants share a posterior (shared posteriors are computed
 * once, which would flatter the small sizes).
 */
function conversionScenario(visitors, k) {
  return Array.from({ length: k }, (_, i) => {
    const n = visitors + i * Math.max(1, Math.round(visitors / 1000));
    return { visitors: n, conversions: Math.round(n * 0.05 * (1 + 0.02 * i)) };
  });
}

const UNIFORM = { alpha: 1, beta: 1 };
const mark = (ms, target) => (ms <= target ? `${fmtMs(ms)} ✓` : `${fmtMs(ms)} ✗`);

console.log('# Lift Ledger benchmark');
console.log(`node ${process.version}, ${require('os').cpus().length} cores; ${new Date().toISOString().slice(0, 10)}`);
console.log('Median time per call; Monte Carlo = seeded 100,000 draws per variant (what a notebook would do).');

section('core', () => {
  const conversion = require('../functions/stats/conversion');
  const rows = [];
  for (const n of SIZES) {
    const v = conversionScenario(n, 2);
    const ours = conversion.probAboveControl(v, UNIFORM)[0];
    const tOurs = medianMs(() => conversion.probAboveControl(v, UNIFORM));
    const tMc = medianMs(() => mcProbAbove(v), 300, 5);
    const errMc = mcProbAbove(v) - ours;
    const lift = conversion.liftInterval(v, 0.95, UNIFORM)[0];
    const tLift = medianMs(() => conversion.liftInterval(v, 0.95, UNIFORM));
    const errLift = mcLiftLower(v) - lift.lower;
    const loss = conversion.expectedLoss(v, UNIFORM);
    const tLoss = medianMs(() => conversion.expectedLoss(v, UNIFORM));
    const errLoss = mcExpectedLoss(v)[0] - loss[0];
    rows.push([
      fmtN(n),
      ours.toFixed(9),
      mark(tOurs, 0.2),
      fmtMs(tMc),
      `${(tMc / tOurs).toFixed(0)}×${tMc / tOurs >= 20 ? ' ✓' : ' ✗'}`,
      fmtErr(errMc),
      mark(tLift, 2),
      fmtErr(errLift),
      fmtMs(tLoss),
      fmtErr(errLoss),
    ]);
  }
  printTable(
    'Two variants (control 5%, challenger +2% relative)',
    [
      'visitors/variant',
      'P(beats control)',
      'time (≤0.2 ms)',
      'MC time',
      'speed-up (≥20×)',
      'MC error',
      'lift interval (≤2 ms)',
      'MC error (lower end)',
      'expected loss',
      'MC error (control)',
    ],
    rows,
  );
});

section('variants', () => {
  const conversion = require('../functions/stats/conversion');
  const rows = [];
  const sizes = quick ? [1e4] : [1e2, 1e4, 1e6, 1e9];
  for (const n of sizes) {
    for (const k of VARIANT_COUNTS) {
      const v = conversionScenario(n, k);
      const tHighest = medianMs(() => conversion.probHighest(v, UNIFORM));
      const tAbove = medianMs(() => conversion.probAboveControl(v, UNIFORM));
      const tLoss = medianMs(() => conversion.expectedLoss(v, UNIFORM));
      let mcCells = ['', ''];
      if (n === 1e4) {
        const ours = conversion.probHighest(v, UNIFORM);
        const tMc = medianMs(() => mcProbHighest(v), 300, 3);
        const mc = mcProbHighest(v);
        mcCells = [fmtMs(tMc), fmtErr(Math.max(...mc.map((p, i) => Math.abs(p - ours[i]))))];
      }
      rows.push([fmtN(n), k, k === 10 ? mark(tHighest, 3) : fmtMs(tHighest), fmtMs(tAbove), fmtMs(tLoss), ...mcCells]);
    }
  }
  printTable(
    'Many variants',
    [
      'visitors/variant',
      'variants',
      'P(highest) (10: ≤3 ms)',
      'P(beats control), all',
      'expected loss, all',
      'MC time',
      'MC max error',
    ],
    rows,
  );
});

section('planning', () => {
  const planning = require('../functions/stats/planning');
  const rows = [];
  const cases = [
    [0.05, 0.1, 1000],
    [0.05, 0.1, 10000],
    [0.05, 0.1, 30000],
    [0.1, 0.05, 50000],
    [0.02, 0.2, 20000],
  ];
  for (const [p, lift, n] of cases) {
    const power = planning.decisionPower(p, lift, n, 0.95, UNIFORM);
    const t = medianMs(() => planning.decisionPower(p, lift, n, 0.95, UNIFORM), 300, 50);
    rows.push([`DECISION_POWER(${p}, ${lift}, ${n})`, power.toFixed(6), mark(t, 20)]);
  }
  for (const [p, lift] of [
    [0.05, 0.1],
    [0.1, 0.05],
    [0.02, 0.2],
  ]) {
    const needed = planning.visitorsNeeded(p, lift, 0.95, 0.8, UNIFORM);
    const t = medianMs(() => planning.visitorsNeeded(p, lift, 0.95, 0.8, UNIFORM), 600, 5);
    rows.push([`VISITORS_NEEDED(${p}, ${lift})`, String(needed), mark(t, 200)]);
  }
  printTable('Planning', ['call', 'value', 'time (power ≤20 ms, needed ≤200 ms)'], rows);
});

section('looks', () => {
  // Planning with several looks, many variants, the fixed-budget lift and a running test day by day. The
  // scenarios are invented: daily looks of a shop converting at 2-50%, up to 1e7 visitors per variant.
  const looks = require('../functions/stats/looks');
  const many = require('../functions/stats/manyVariants');
  const lift = require('../functions/stats/detectableLift');
  const byDay = require('../functions/stats/byDay');
  const rows = [];
  const spaced = (k, last) => Array.from({ length: k }, (_, i) => Math.round(((i + 1) * last) / k));
  const lookCases = [
    ['30 daily looks to 9,000 (2%)', 0.02, spaced(30, 9000)],
    ['10 looks to 2,000 (5%)', 0.05, spaced(10, 2000)],
    ['30 looks to 1e5 (5%)', 0.05, spaced(30, 1e5)],
    ['30 looks to 1e6 (10%)', 0.1, spaced(30, 1e6)],
    ['30 looks to 1e7 (5%)', 0.05, spaced(30, 1e7)],
    ['30 looks to 1e7 (50%)', 0.5, spaced(30, 1e7)],
  ];
  for (const [name, p, at] of lookCases) {
    const falseAlarm = looks.falseAlarmWithLooks(p, at, 0.95, 1);
    const tFalse = medianMs(() => looks.falseAlarmWithLooks(p, at, 0.95, 1), 300, 20);
    const tTwo = medianMs(() => looks.falseAlarmWithLooks(p, at, 0.975, 2), 300, 20);
    const tPower = medianMs(() => looks.powerWithLooks(p, 0.1, at), 300, 20);
    rows.push([
      `FALSE_ALARM / POWER_WITH_LOOKS, ${name}`,
      `${falseAlarm.probability.toFixed(4)} (${falseAlarm.method})`,
      `${mark(tFalse, 100)} / 2 sides ${mark(tTwo, 100)} / power ${mark(tPower, 100)}`,
    ]);
  }
  for (const [name, p, at] of [lookCases[1], lookCases[0], lookCases[3], lookCases[5]]) {
    for (const sides of [1, 2]) {
      const t = looks.thresholdForLooks(p, at, 0.05, sides);
      const time = medianMs(() => looks.thresholdForLooks(p, at, 0.05, sides), 600, 5);
      rows.push([
        `THRESHOLD_FOR_LOOKS, ${name}, ${sides} side${sides === 2 ? 's' : ''}`,
        t.toFixed(6),
        mark(time, 200),
      ]);
    }
  }
  for (const v of [3, 11, 50]) {
    const t = many.thresholdForVariants(v);
    rows.push([
      `THRESHOLD_FOR_VARIANTS(${v})`,
      t.toFixed(6),
      mark(
        medianMs(() => many.thresholdForVariants(v), 300, 50),
        200,
      ),
    ]);
  }
  for (const [p, n] of [
    [0.1, 3000],
    [0.05, 1e5],
    [0.02, 1e7],
    [0.5, 1e9],
  ]) {
    const l = lift.smallestDetectableLift(p, n);
    rows.push([
      `SMALLEST_DETECTABLE_LIFT(${p}, ${fmtN(n)})`,
      l.toPrecision(6),
      mark(
        medianMs(() => lift.smallestDetectableLift(p, n), 300, 20),
        100,
      ),
    ]);
  }
  // 60 days of a control and three challengers, ~1,000 visitors a day each (invented).
  const days = Array.from({ length: 60 }, (_, d) =>
    [0, 1, 2, 3].map((i) => {
      const visitors = 950 + ((d * 37 + i * 11) % 100);
      return { visitors, conversions: Math.round(visitors * (0.05 + 0.002 * i)) };
    }),
  );
  const cells = days.length * 3;
  const tDays = medianMs(() => byDay.probAboveControlByDay(days), 300, 20);
  rows.push([
    `PROB_ABOVE_CONTROL_BY_DAY, 60 days × 3 challengers`,
    `${fmtMs(tDays / cells)} per cell`,
    mark(tDays / cells, 1),
  ]);
  const visitors = days.map((d) => d.map((v) => v.visitors));
  const tSplit = medianMs(() => byDay.srmPValueByDay(visitors), 300, 50);
  rows.push([
    `SRM_PVALUE_BY_DAY, 60 days × 4 variants`,
    `${fmtMs(tSplit / (days.length * 4))} per cell`,
    mark(tSplit / (days.length * 4), 1),
  ]);
  printTable(
    'Looks, many variants, fixed budgets, day by day',
    ['call', 'value', 'time (looks ≤100 ms, thresholds ≤200 ms, lift ≤100 ms, by day ≤1 ms a cell)'],
    rows,
  );
});

section('models', () => {
  const means = require('../functions/stats/normalMeans');
  const events = require('../functions/stats/eventRates');
  const rows = [];
  const sizes = quick ? [1e2, 1e5, 1e8] : [1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8];
  const ks = quick ? [2, 20] : [2, 5, 10, 20];
  const prior = { shape: 1, rate: 0 };
  for (const n of sizes) {
    for (const k of ks) {
      // Revenue per visitor of an invented shop: average 24, spread 30 (the control's mean is clearly
      // positive even at 100 visitors, so the relative lift exists).
      const mv = Array.from({ length: k }, (_, i) => ({ count: n, mean: 24 * (1 + 0.01 * i), sd: 30 }));
      const ev = Array.from({ length: k }, (_, i) => ({ events: Math.round(0.3 * n * (1 + 0.01 * i)), exposure: n }));
      // A cell whose quantity does not exist for the scenario prints its reason instead of a time.
      const time = (fn) => {
        try {
          return fmtMs(medianMs(fn));
        } catch (error) {
          return `n/a (${error.code || error.message})`;
        }
      };
      rows.push([
        fmtN(n),
        k,
        time(() => means.meanProbAboveControl(mv)),
        time(() => means.meanProbHighest(mv)),
        time(() => means.meanLiftInterval(mv, 0.95)),
        time(() => means.meanExpectedLoss(mv)),
        time(() => events.eventsProbAboveControl(ev, prior)),
        time(() => events.eventsProbHighest(ev, prior)),
        time(() => events.eventsLiftInterval(ev, 0.95, prior)),
        time(() => events.eventsExpectedLoss(ev, prior)),
      ]);
    }
  }
  printTable(
    'Revenue (Normal model) and counts (Gamma–Poisson)',
    [
      'count/exposure',
      'variants',
      'MEAN P(beats)',
      'MEAN P(highest)',
      'MEAN lift',
      'MEAN loss',
      'EVENTS P(beats)',
      'EVENTS P(highest)',
      'EVENTS lift',
      'EVENTS loss',
    ],
    rows,
  );
});

section('revenue', () => {
  const revenue = require('../functions/stats/revenuePerVisitor');
  // An invented shop: 2.5% of visitors order, average order 60 (order_sd 70 where given), challengers 1%
  // (relative) better on both, traffic a little different per variant (no two share a posterior).
  const scenario = (visitors, k, withSd) =>
    Array.from({ length: k }, (_, i) => {
      const n = visitors + i * Math.max(1, Math.round(visitors / 1000));
      const orders = Math.max(3, Math.round(n * 0.025 * (1 + 0.01 * i)));
      const totals = { orders, visitors: n, revenue: orders * 60 * (1 + 0.01 * i) };
      return withSd ? { ...totals, orderSd: 70 } : totals;
    });
  // The same model by seeded Monte Carlo: p ~ Beta, v = revenue/Gamma(orders) or m + s·t(orders − 1).
  const mcDraws = (variants) => {
    const sampler = makeSampler(20261205);
    return variants.map((v) => {
      const out = new Float64Array(DRAWS);
      const a = 1 + v.orders;
      const b = 1 + v.visitors - v.orders;
      for (let i = 0; i < DRAWS; i++) {
        const p = sampler.beta(a, b);
        let value;
        if (v.orderSd === undefined) value = v.revenue / sampler.gamma(v.orders);
        else {
          const nu = v.orders - 1;
          const t = sampler.normal() / Math.sqrt((2 * sampler.gamma(nu / 2)) / nu);
          value = v.revenue / v.orders + (v.orderSd / Math.sqrt(v.orders)) * t;
        }
        out[i] = p * value;
      }
      return out;
    });
  };
  const mcAbove = (variants) => {
    const [a, b] = mcDraws(variants);
    let count = 0;
    for (let i = 0; i < DRAWS; i++) if (b[i] > a[i]) count++;
    return count / DRAWS;
  };
  const mcHighest = (variants) => {
    const draws = mcDraws(variants);
    const wins = new Array(variants.length).fill(0);
    for (let i = 0; i < DRAWS; i++) {
      let best = 0;
      for (let j = 1; j < draws.length; j++) if (draws[j][i] > draws[best][i]) best = j;
      wins[best]++;
    }
    return wins.map((w) => w / DRAWS);
  };
  const sizes = quick ? [1e3, 1e6, 1e9] : [1e3, 1e4, 1e5, 1e6, 1e7, 1e9];
  const rows = [];
  for (const withSd of [false, true]) {
    for (const n of sizes) {
      const two = scenario(n, 2, withSd);
      const ten = scenario(n, 10, withSd);
      const t2 = medianMs(() => revenue.revenueProbAboveControl(two));
      const m2 = medianMs(() => mcAbove(two), 300, 5);
      const t10 = medianMs(() => revenue.revenueProbHighest(ten));
      const m10 = medianMs(() => mcHighest(ten), 300, 5);
      const ratio = (mc, ours) => `${(mc / ours).toFixed(0)}×${mc / ours >= 20 ? ' ✓' : ' ✗'}`;
      rows.push([
        withSd ? 'order_sd 70' : 'exponential',
        fmtN(n),
        withSd ? fmtMs(t2) : mark(t2, 5),
        fmtMs(m2),
        ratio(m2, t2),
        fmtErr(mcAbove(two) - (revenue.revenueProbAboveControl(two)[0] ?? NaN)),
        withSd ? fmtMs(t10) : mark(t10, 30),
        fmtMs(m10),
        ratio(m10, t10),
      ]);
    }
  }
  printTable(
    'Revenue per visitor from totals (R = conversion × order value)',
    [
      'order values',
      'visitors/variant',
      'P(beats) 2 var. (≤5 ms)',
      'MC 100k',
      'faster',
      'MC error',
      'P(highest) 10 var. (≤30 ms)',
      'MC 100k',
      'faster',
    ],
    rows,
    'Targets (issue #13) on the exponential rows; "faster" is the Monte Carlo of the same model, timed in the same run (≥ 20×).',
  );
});

section('addin', () => {
  const bundlePath = path.join(root, 'dist', 'functions.js');
  if (!fs.existsSync(bundlePath)) throw new Error('dist/functions.js is missing: run `npm run build` first');
  const code = fs.readFileSync(bundlePath, 'utf8');
  const registered = new Map();
  class CfError extends Error {
    constructor(code, message) {
      super(message);
      this.code = code;
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
  const office = { onReady: () => Promise.resolve({}) };
  // The bundle runs as a script whose only host globals are CustomFunctions and Office (test/addin/
  // bundle.test.ts proves that in a bare vm context). For timing it runs in this realm instead: a vm
  // context's global object is an interceptor, which makes every global lookup (Math, Float64Array)
  // several times slower than in Excel's JavaScript runtime.
  new Function('CustomFunctions', 'Office', code)(customFunctions, office);
  const call = (name, ...a) => {
    const fn = registered.get(name);
    if (!fn) throw new Error(`${name} is not registered by the bundle`);
    return fn(...a);
  };
  // 1,000 invented experiments, three variants each, read out by 8 functions.
  const experiments = Array.from({ length: 1000 }, (_, e) => {
    const visitors = 1000 + 37 * e;
    const conv = [0, 1, 2].map((i) => [Math.round(visitors * (0.04 + 0.001 * ((e + i) % 7)))]);
    return { conv, vis: [[visitors], [visitors], [visitors]] };
  });
  // The seven functions of (conversions, visitors), then SRM_PVALUE of the visitors.
  const NAMES = [
    'POSTERIOR_MEAN',
    'RATE_INTERVAL',
    'PROB_HIGHEST',
    'PROB_ABOVE_CONTROL',
    'LIFT_INTERVAL',
    'EXPECTED_LOSS',
    'DECISION',
  ];
  const readOut = () => {
    for (const { conv, vis } of experiments) {
      for (const name of NAMES) call(name, conv, vis);
      call('SRM_PVALUE', vis);
    }
  };
  // The same calls one function at a time over all experiments (a sheet recalculated column by column):
  // 3,000 posteriors are more than the add-in's table memo keeps (~900), so each function tabulates anew.
  const readOutByColumn = () => {
    for (const name of NAMES) for (const { conv, vis } of experiments) call(name, conv, vis);
    for (const { vis } of experiments) call('SRM_PVALUE', vis);
  };
  // Memory the bundle keeps after the read-outs (its table memo): live heap after full collections (one
  // alone left 25–54 MB of garbage in the count from run to run; four give a steady figure).
  require('v8').setFlagsFromString('--expose_gc');
  const collect = require('vm').runInNewContext('gc');
  const live = () => {
    for (let i = 0; i < 4; i++) collect();
    const m = process.memoryUsage();
    return m.heapUsed + m.arrayBuffers;
  };
  const before = live();
  const t = medianMs(readOut, 1, 3);
  const tColumns = medianMs(readOutByColumn, 1, 3);
  const kept = live() - before;
  const size = fs.statSync(bundlePath).size;
  const gz = zlib.gzipSync(fs.readFileSync(bundlePath)).length;
  printTable(
    'The add-in bundle',
    ['measure', 'value', 'target'],
    [
      ['read-out of 1,000 experiments × 8 functions through dist/functions.js', mark(t, 2000), '≤ 2 s'],
      ['the same, one function at a time over all 1,000 (few table-memo hits)', fmtMs(tColumns), ''],
      ['memory kept afterwards (the table memo, budget 400,000 nodes)', `${(kept / 1e6).toFixed(1)} MB`, ''],
      ['dist/functions.js (minified)', `${(size / 1024).toFixed(1)} KB${size <= 200 * 1024 ? ' ✓' : ' ✗'}`, '≤ 200 KB'],
      ['dist/functions.js (gzip)', `${(gz / 1024).toFixed(1)} KB`, ''],
    ],
  );
});

section('worst', () => {
  const bundlePath = path.join(root, 'dist', 'functions.js');
  if (!fs.existsSync(bundlePath)) throw new Error('dist/functions.js is missing: run `npm run build` first');
  const { HEADERS, NOTE, worstCaseRows } = require('./worstCases');
  printTable(
    'Worst cases (issue #10 reproductions and the slowest call found per function)',
    HEADERS,
    worstCaseRows(fmtMs),
    NOTE,
  );
});

section('tableDetect', () => {
  require('./tableDetect');
});
