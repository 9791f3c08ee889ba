/**
 * Seeded inputs for the worksheet functions. Call `index` of a run with `seed` is a pure function of
 * (seed, index) and the function models: one of
 * - `ordinary`: an experiment as a user would type it (1–50 variants, 1 … 1e9 visitors, rates 0 … 1,
 *   revenue averages, event counts, priors from flat to strong), in a column or a row, sometimes with
 *   blank positions (blank in every range: a skipped variant);
 * - `extreme`: the same with one to three values moved to the edges of the declared domain or to huge and
 *   tiny magnitudes (priors 1e-12 … 1e12, 1e300, 5e-324, -0, 2^53, levels next to 0 and 1, 50 variants);
 * - `fault`: the same with one thing the declared rules refuse: text, logicals, error values and linked
 *   (entity) cells where numbers belong, a blank in only one range, a number just outside its bounds, a
 *   2-D or mismatched range, too many or too few variants, half a prior, a word that is not a choice.
 * Tagged cells: `{ $error: '#N/A' }` is an error value, `{ $entity: 12 }` a linked-data cell (child.js
 * turns them into what Excel passes); an omitted optional argument is `undefined` or `null`.
 *
 * Why one file of ~530 lines: the three kinds of input transform one draft, in a fixed order of random
 * draws so that a seed's calls stay the same, and every step reads the draft format and the typical
 * values defined at the top.
 */
'use strict';
const { streamFor } = require('./random');
const { numberProblem } = require('./spec');

const MAX_COUNT = 2 ** 53;
const BLANKS = [null, '', '   '];
const ERROR_VALUES = ['#N/A', '#VALUE!', '#DIV/0!', '#REF!', '#NUM!', '#NAME?', '#NULL!'];
const TEXTS = ['abc', '120', ' 12 ', '1e3', '5%', 'n/a', '-', '0,5', 'TRUE'];
const LABELS = ['Old button', 'New button', 'Green', 'Wide layout', 'Short form', 'Variant 3', 'B', 'Control'];

// ---------------------------------------------------------------------------------------------------
// Doubles next to a value

const scratch = new Float64Array(1);
const bits = new BigInt64Array(scratch.buffer);
/** The next double above x. */
function nextUp(x) {
  if (Number.isNaN(x) || x === Infinity) return x;
  if (x === 0) return Number.MIN_VALUE;
  scratch[0] = x;
  bits[0] += x > 0 ? 1n : -1n;
  return scratch[0];
}
/** The next double below x. */
function nextDown(x) {
  return -nextUp(-x);
}

// ---------------------------------------------------------------------------------------------------
// Values from a declared rule

const keeps = (rule, x) => numberProblem(rule, x) === undefined;

/** Values inside the rule at its edges, and huge or tiny magnitudes it allows. */
function insideEdges(rule) {
  const candidates = [];
  const unit = (a) => Math.max(Math.abs(a), 1);
  if (rule.min !== undefined)
    candidates.push(rule.min, rule.min + 1e-12 * unit(rule.min), rule.min === 0 ? -0 : rule.min);
  if (rule.above !== undefined)
    candidates.push(nextUp(rule.above), rule.above + 1e-12 * unit(rule.above), rule.above + 1e-9 * unit(rule.above));
  if (rule.max !== undefined) candidates.push(rule.max, rule.max - 1e-12 * unit(rule.max));
  if (rule.below !== undefined)
    candidates.push(nextDown(rule.below), rule.below - 1e-12 * unit(rule.below), rule.below - 1e-9 * unit(rule.below));
  if (rule.max === undefined && rule.below === undefined)
    candidates.push(1e6, 1e9, 1e12, 1e300, Number.MAX_VALUE, MAX_COUNT);
  if (rule.min === undefined && rule.above === undefined) candidates.push(-1e12, -1e300, -Number.MAX_VALUE);
  candidates.push(Number.MIN_VALUE, 1e-300, 1e-12, -0, 0, 1);
  const out = candidates.filter((x) => keeps(rule, x));
  return out.length > 0 ? out : [rule.default ?? 1];
}

/** Numbers just outside the rule (and the usual wrong kinds of number). */
function outsideEdges(rule) {
  const candidates = [];
  if (rule.min !== undefined) candidates.push(nextDown(rule.min), rule.min - 1, rule.min - 1e-9);
  if (rule.orZero && rule.min !== undefined) candidates.push(Number.MIN_VALUE, rule.min / 2);
  if (rule.above !== undefined) candidates.push(rule.above, nextDown(rule.above), rule.above - 1);
  if (rule.max !== undefined) candidates.push(nextUp(rule.max), rule.max + 1);
  if (rule.below !== undefined) candidates.push(rule.below, nextUp(rule.below), rule.below + 1);
  if (rule.kind === 'count') candidates.push(-1, 0.5, 2.5, 12.25, MAX_COUNT + 2, 1e300, -Number.MIN_VALUE);
  candidates.push(-1e300, 1e300, -Number.MIN_VALUE);
  const out = candidates.filter((x) => !keeps(rule, x));
  return out;
}

/** A value a user might type for a rule nobody described further. */
function genericTypical(rule, rng) {
  const lo = rule.min ?? rule.above;
  const hi = rule.max ?? rule.below;
  let x;
  if (lo !== undefined && hi !== undefined) x = rng.uniform(lo, hi);
  else if (lo !== undefined) x = lo + rng.logUniform(1e-3, 1e4);
  else if (hi !== undefined) x = hi - rng.logUniform(1e-3, 1e4);
  else x = rng.normal() * 100;
  if (rule.kind === 'count') x = Math.round(x);
  return keeps(rule, x) ? x : rng.pick(insideEdges(rule));
}

// ---------------------------------------------------------------------------------------------------
// Typical scalars, by parameter name

const TYPICAL = {
  level: (rng) => (rng.chance(0.7) ? rng.pick([0.95, 0.95, 0.9, 0.99, 0.8, 0.5]) : rng.uniform(0.01, 0.999)),
  prior_shape: (rng) => rng.logUniform(1e-3, 100),
  prior_rate: (rng) => (rng.chance(0.2) ? 0 : rng.logUniform(1e-3, 1e4)),
  min_lift: (rng) => Math.max(-0.99, 0.02 + 0.1 * rng.normal()),
  max_loss: (rng) => (rng.chance(0.05) ? 0 : rng.logUniform(1e-6, 0.05)),
  points: (rng) => (rng.chance(0.8) ? rng.pick([101, 101, 2, 3, 11, 51, 201, 500, 1000]) : rng.int(2, 10000)),
  mean_rate: (rng) => rng.logUniform(1e-4, 0.9),
  strength: (rng) => rng.logUniform(1e-2, 1e6),
  low: (rng) => rng.logUniform(1e-4, 0.5),
  high: (rng) => rng.uniform(0.5, 0.99),
  baseline_rate: (rng) => rng.logUniform(1e-4, 0.8),
  lift: (rng) => (rng.chance(0.5) ? rng.pick([0.05, 0.1, 0.2, -0.1, 0.02]) : Math.max(-0.99, 0.3 * rng.normal())),
  visitors_per_variant: (rng) => rng.logInt(1, 1e7),
  threshold: (rng) => rng.pick([0.95, 0.95, 0.9, 0.99, 0.8, 0.975]),
  power: (rng) => rng.pick([0.8, 0.8, 0.9, 0.5, 0.95]),
  alpha: (rng) => rng.pick([0.05, 0.05, 0.01, 0.1]),
  sides: (rng) => rng.pick([1, 2, 2]),
};

/** A Beta prior (alpha, beta) a user might give. */
function typicalBetaPrior(rng) {
  switch (rng.weighted({ flat: 20, jeffreys: 15, fromMean: 45, independent: 20 })) {
    case 'flat':
      return [1, 1];
    case 'jeffreys':
      return [0.5, 0.5];
    case 'fromMean': {
      const m = rng.logUniform(1e-4, 0.5);
      const s = rng.logUniform(1, 1e5);
      return [m * s, (1 - m) * s];
    }
    default:
      return [rng.logUniform(1e-12, 1e12), rng.logUniform(1e-12, 1e12)];
  }
}

// ---------------------------------------------------------------------------------------------------
// Paired ranges of realistic experiments, one row of values per variant

function experimentSize(rng) {
  switch (rng.weighted({ small: 15, medium: 50, large: 25, huge: 10 })) {
    case 'small':
      return rng.logInt(1, 100);
    case 'medium':
      return rng.logInt(100, 1e5);
    case 'large':
      return rng.logInt(1e5, 1e7);
    default:
      return rng.logInt(1e7, 1e9);
  }
}

const FAMILIES = {
  conversion(k, rng) {
    const n0 = experimentSize(rng);
    const p0 = {
      zero: 0,
      one: 1,
      tiny: rng.logUniform(1e-6, 1e-3),
      typical: rng.logUniform(1e-3, 0.3),
      any: rng.float(),
    }[rng.weighted({ zero: 4, one: 2, tiny: 10, typical: 64, any: 20 })];
    const uneven = rng.chance(0.2);
    return Array.from({ length: k }, () => {
      const visitors = uneven ? rng.logInt(1, 1e9) : Math.max(1, Math.round(n0 * rng.uniform(0.8, 1.2)));
      let rate = Math.min(1, Math.max(0, p0 * (1 + 0.15 * rng.normal())));
      if (rng.chance(0.05)) rate = rng.pick([0, 1]);
      const conversions = Math.min(visitors, Math.max(0, Math.round(visitors * rate)));
      return { conversions, visitors };
    });
  },
  history(k, rng) {
    const p0 = rng.logUniform(1e-3, 0.3);
    return Array.from({ length: k }, () => {
      const visitors = rng.logInt(10, 1e6);
      const rate = Math.min(1, p0 * Math.exp(0.3 * rng.normal()));
      return { conversions: Math.min(visitors, Math.round(visitors * rate)), visitors };
    });
  },
  means(k, rng) {
    const n0 = Math.max(2, experimentSize(rng));
    const base = {
      revenue: rng.uniform(0, 200),
      signed: rng.uniform(-100, 100),
      tiny: rng.logUniform(1e-9, 1e-3),
      big: rng.logUniform(1e3, 1e9),
      zero: 0,
      huge: rng.logUniform(1e15, 1e300),
    }[rng.weighted({ revenue: 60, signed: 15, tiny: 5, big: 10, zero: 5, huge: 5 })];
    const spread = rng.uniform(0.2, 5);
    return Array.from({ length: k }, () => {
      const count = rng.chance(0.2) ? rng.logInt(2, 1e9) : Math.max(2, Math.round(n0 * rng.uniform(0.8, 1.2)));
      const mean = base * (1 + 0.05 * rng.normal()) + (base === 0 ? rng.normal() : 0);
      let sd = Math.abs(base || 1) * spread * rng.uniform(0.8, 1.2);
      if (rng.chance(0.05)) sd = 0;
      return { count, mean, sd };
    });
  },
  events(k, rng) {
    const whole = rng.chance(0.5);
    const t0 = rng.logUniform(1e-3, 1e9);
    const r0 = rng.chance(0.05) ? 0 : rng.logUniform(1e-5, 20);
    return Array.from({ length: k }, () => {
      let exposure = t0 * rng.uniform(0.8, 1.2);
      if (whole) exposure = Math.max(1, Math.round(exposure));
      const events = Math.max(0, Math.round(exposure * r0 * (1 + 0.1 * rng.normal())));
      return { events: Math.min(events, MAX_COUNT), exposure };
    });
  },
  split(k, rng) {
    const n0 = experimentSize(rng) * k;
    return Array.from({ length: k }, () => ({
      visitors: rng.chance(0.03) ? 0 : Math.round((n0 / k) * (1 + 0.01 * rng.normal())),
    }));
  },
};

function familyRows(model, ranges, k, rng) {
  const family = FAMILIES[ranges[0].family];
  if (family) return family(k, rng);
  return Array.from({ length: k }, () => Object.fromEntries(ranges.map((p) => [p.name, genericTypical(p.rule, rng)])));
}

function variantCount(model, rng) {
  const { min } = model.variants;
  const max = Math.min(model.variants.max, 50);
  const band = rng.weighted({ few: 55, some: 25, many: 15, most: 5 });
  if (band === 'few') return rng.int(min, Math.max(min, Math.min(max, 4)));
  if (band === 'some') return rng.int(Math.min(max, Math.max(min, 5)), Math.max(min, Math.min(max, 12)));
  if (band === 'many') return rng.int(Math.min(max, Math.max(min, 13)), max);
  return max;
}

// ---------------------------------------------------------------------------------------------------
// A call as lists (one entry per position) before it is laid out as ranges

/**
 * The call under construction: `lists[name]` holds one cell per position for each range and aligned
 * parameter, `scalars[name]` the value of each scalar or choice, `orientation` the direction.
 */
function ordinaryDraft(model, rng) {
  const ranges = model.params.filter((p) => p.role === 'range');
  const lists = {};
  const scalars = {};
  let length = 0;
  const orientation = rng.chance(0.4) ? 'row' : 'column';
  if (ranges.length > 0) {
    const k = variantCount(model, rng);
    const rows = familyRows(model, ranges, k, rng);
    for (const p of ranges) lists[p.name] = rows.map((row) => row[p.name]);
    if (rng.chance(0.12)) {
      const blanks = rng.int(1, 3);
      for (let b = 0; b < blanks; b++) {
        const at = rng.int(0, lists[ranges[0].name].length);
        for (const p of ranges) lists[p.name].splice(at, 0, rng.pick(BLANKS));
      }
    }
    length = lists[ranges[0].name].length;
  }
  const blankAt = (pos) => ranges.length > 0 && ranges.every((p) => BLANKS.includes(lists[p.name][pos]));
  for (const p of model.params) {
    if (p.role === 'aligned') {
      if (length === 0 || rng.chance(0.5)) continue;
      if (p.text) {
        lists[p.name] = Array.from({ length }, (_, pos) =>
          blankAt(pos) ? '' : rng.chance(0.1) ? rng.int(1, 9) : rng.pick(LABELS),
        );
      } else {
        const equal = rng.chance(0.5);
        lists[p.name] = Array.from({ length }, (_, pos) =>
          blankAt(pos) ? rng.pick(BLANKS) : equal ? 1 : genericTypical(p.rule, rng),
        );
      }
    } else if (p.role === 'scalar') {
      if (p.pair) continue;
      if (p.optional && rng.chance(0.45)) continue;
      scalars[p.name] = (TYPICAL[p.name] ?? ((r) => genericTypical(p.rule, r)))(rng);
    } else if (p.role === 'choice') {
      if (p.rule.choices.length === 0 || (p.optional && rng.chance(0.5))) continue;
      const word = rng.pick(p.rule.choices);
      scalars[p.name] = rng.chance(0.2) ? ` ${word.toUpperCase()} ` : word;
    }
  }
  // pairs (both or neither): a Beta prior for a Beta pair, else each from its own rule
  const pairs = model.params.filter(
    (p) => p.role === 'scalar' && p.pair && model.params.some((q) => q.name === p.pair),
  );
  for (const p of pairs) {
    if (p.name in scalars) continue;
    const mate = model.params.find((q) => q.name === p.pair);
    if (rng.chance(0.5)) continue;
    const [a, b] =
      p.prior === 'beta' ? typicalBetaPrior(rng) : [genericTypical(p.rule, rng), genericTypical(mate.rule, rng)];
    scalars[p.name] = a;
    scalars[mate.name] = b;
  }
  if ('low' in scalars && 'high' in scalars && scalars.high <= scalars.low)
    scalars.high = scalars.low + (1 - scalars.low) * rng.uniform(0.01, 0.9);
  const draft = { lists, scalars, orientation, length };
  addDayTables(model, draft, rng);
  addLists(model, draft, rng);
  return draft;
}

// ---------------------------------------------------------------------------------------------------
// Day tables (one row per day, one column per variant) and lists of their own (a row or a column)

/** Realistic daily counts (not running totals): 2–10 variants, 1–60 days, sometimes blank days. */
function addDayTables(model, draft, rng) {
  const params = model.params.filter((p) => p.role === 'days');
  if (params.length === 0) return;
  const width = rng.int(Math.max(2, model.variants.min), Math.min(10, model.variants.max));
  const height = rng.chance(0.6) ? rng.int(1, 14) : rng.int(15, 60);
  const perDay = rng.chance(0.05) ? 0 : experimentSize(rng) / rng.int(7, 60);
  const rate = rng.chance(0.05) ? rng.pick([0, 1]) : rng.logUniform(1e-4, 0.3);
  const visitors = Array.from({ length: height }, () => {
    const quiet = rng.chance(0.05);
    return Array.from({ length: width }, () => (quiet ? 0 : Math.round(perDay * rng.uniform(0.8, 1.2))));
  });
  const conversions = visitors.map((row) =>
    row.map((v) => Math.min(v, Math.max(0, Math.round(v * rate * (1 + 0.2 * rng.normal()))))),
  );
  draft.days = {};
  for (const p of params) draft.days[p.name] = p.rule.atMost ? conversions : visitors;
  // each table a copy of its own (visitors_by_day alone when nothing is bounded by it)
  for (const p of params) draft.days[p.name] = draft.days[p.name].map((row) => row.slice());
  if (rng.chance(0.15)) {
    for (let b = rng.int(1, 3); b > 0; b--) {
      const at = rng.int(0, draft.days[params[0].name].length);
      for (const p of params)
        draft.days[p.name].splice(
          at,
          0,
          Array.from({ length: width }, () => rng.pick(BLANKS)),
        );
    }
  }
}

/** Increasing look sizes (1–100 looks, often evenly spaced), or one value per column of the day tables. */
function addLists(model, draft, rng) {
  draft.listCells = {};
  draft.listOrientation = {};
  for (const p of model.params.filter((q) => q.role === 'list')) {
    if (p.optional && rng.chance(0.4)) continue;
    let values;
    if (p.increasing) {
      const k = rng.chance(0.7) ? rng.int(p.count.min, Math.min(p.count.max, 10)) : rng.int(p.count.min, p.count.max);
      const first = rng.logInt(1, 1e6);
      const even = rng.chance(0.6);
      values = [];
      let x = 0;
      for (let i = 0; i < k; i++) {
        x += even ? first : Math.max(1, Math.round(first * rng.logUniform(0.2, 5)));
        values.push(x);
      }
      values = values.filter((v) => keeps(p.rule, v));
      if (values.length < p.count.min) values = [1];
    } else {
      const k =
        p.perColumn && draft.days
          ? draft.days[Object.keys(draft.days)[0]][0].length
          : rng.int(p.count.min, Math.min(p.count.max, 10));
      const equal = rng.chance(0.4);
      values = Array.from({ length: k }, () => (equal ? 1 : genericTypical(p.rule, rng)));
    }
    if (rng.chance(0.1)) values = values.concat(Array.from({ length: rng.int(1, 3) }, () => rng.pick(BLANKS)));
    draft.listCells[p.name] = values;
    draft.listOrientation[p.name] = rng.chance(0.3) ? 'row' : 'column';
  }
}

/** Positions of the filled days of a day table. */
const filledDays = (table) =>
  table.map((row, r) => (row.every((c) => BLANKS.includes(c)) ? -1 : r)).filter((r) => r >= 0);

/** Moves one day-table cell to an edge of its rule, or makes the looks tiny or huge (staying inside). */
function dayOrListExtreme(model, draft, rng) {
  const days = model.params.filter((p) => p.role === 'days');
  const lists = model.params.filter((p) => p.role === 'list' && draft.listCells[p.name]);
  if (days.length > 0 && (lists.length === 0 || rng.chance(0.6))) {
    const p = rng.pick(days);
    const table = draft.days[p.name];
    const rows = filledDays(table);
    if (rows.length === 0) return;
    const r = rng.pick(rows);
    const c = rng.int(0, table[r].length - 1);
    table[r][c] = rng.pick(insideEdges(p.rule).filter((x) => x <= 1e12));
    for (const q of days) {
      const limit = q.rule.atMost && draft.days[q.rule.atMost];
      if (limit && draft.days[q.name][r][c] > limit[r][c]) draft.days[q.name][r][c] = limit[r][c];
    }
  } else if (lists.length > 0) {
    const p = rng.pick(lists);
    const values = draft.listCells[p.name].filter((x) => typeof x === 'number');
    if (p.increasing) {
      const k = rng.pick([1, p.count.max, values.length]);
      const top = rng.pick([p.rule.max ?? 1e9, k, 10 * k]);
      const step = Math.max(1, Math.floor(top / k));
      draft.listCells[p.name] = Array.from({ length: Math.min(k, top) }, (_, i) => (i + 1) * step);
    } else if (values.length > 0) {
      draft.listCells[p.name][rng.int(0, values.length - 1)] = rng.pick(insideEdges(p.rule));
    }
  }
}

/** Keeps conversions ≤ visitors (and any other `atMost`) after a value was moved. */
function repairAtMost(model, draft) {
  for (const p of model.params) {
    const limit = p.role === 'range' && p.rule.atMost;
    if (!limit || !draft.lists[p.name] || !draft.lists[limit]) continue;
    draft.lists[p.name] = draft.lists[p.name].map((x, i) => {
      const cap = draft.lists[limit][i];
      return typeof x === 'number' && typeof cap === 'number' && x > cap ? cap : x;
    });
  }
}

const filledPositions = (draft, name) =>
  draft.lists[name].map((x, i) => (BLANKS.includes(x) ? -1 : i)).filter((i) => i >= 0);

/** Moves one to three values to the edges of the declared domain or to extreme magnitudes. */
function applyExtremes(model, draft, rng) {
  const ranges = model.params.filter((p) => p.role === 'range');
  const scalars = model.params.filter((p) => p.role === 'scalar');
  const steps = rng.int(1, 3);
  for (let s = 0; s < steps; s++) {
    const what = rng.weighted({
      prior: scalars.some((p) => p.prior) ? 30 : 0,
      scalar: scalars.length ? 25 : 0,
      cell: ranges.length ? 30 : 0,
      column: ranges.length ? 10 : 0,
      wide: ranges.length ? 5 : 0,
      dayOrList: model.params.some((p) => p.role === 'days' || (p.role === 'list' && draft.listCells[p.name])) ? 40 : 0,
    });
    if (what === 'dayOrList') {
      dayOrListExtreme(model, draft, rng);
      continue;
    }
    if (what === 'prior') {
      const priors = scalars.filter((p) => p.prior);
      // mostly the edges of the declared domain and values inside it; sometimes far outside (to be refused)
      const extremes = [1e-12, 1e-9, 1e-6, 1e-3, 1e3, 1e6, 1e9, 1e12];
      for (const p of priors) {
        const inside = insideEdges(p.rule).concat(extremes.filter((x) => keeps(p.rule, x)));
        draft.scalars[p.name] = rng.chance(0.7)
          ? rng.pick(inside)
          : rng.chance(0.5)
            ? rng.pick(extremes)
            : rng.logUniform(1e-12, 1e12);
      }
    } else if (what === 'scalar') {
      const p = rng.pick(scalars);
      draft.scalars[p.name] = rng.pick(insideEdges(p.rule));
      if (p.pair && !(p.pair in draft.scalars)) draft.scalars[p.pair] = 1;
    } else if (what === 'cell' || what === 'column') {
      const p = rng.pick(ranges);
      const at = filledPositions(draft, p.name);
      if (at.length === 0) continue;
      const value = rng.pick(insideEdges(p.rule));
      const targets = what === 'cell' ? [rng.pick(at)] : at;
      for (const i of targets) draft.lists[p.name][i] = value;
    } else if (what === 'wide' && model.variants.max >= 50) {
      const extra = 50 - draft.length;
      for (let i = 0; i < extra; i++) {
        const from = rng.int(0, draft.length - 1);
        for (const name of Object.keys(draft.lists)) draft.lists[name].push(draft.lists[name][from]);
      }
      draft.length = Math.max(draft.length, 50);
    }
  }
  repairAtMost(model, draft);
}

/** A value of the wrong kind where a number belongs. */
function wrongKind(rng) {
  switch (rng.weighted({ text: 30, logical: 20, error: 25, entity: 25 })) {
    case 'text':
      return rng.pick(TEXTS);
    case 'logical':
      return rng.chance(0.5);
    case 'error':
      return { $error: rng.pick(ERROR_VALUES) };
    default:
      return { $entity: rng.chance(0.7) ? rng.int(0, 5000) : 'Garden shop' };
  }
}

/** Adds one thing the declared rules refuse. */
function applyFault(model, draft, rng) {
  const ranges = model.params.filter((p) => p.role === 'range');
  const scalars = model.params.filter((p) => p.role === 'scalar');
  const required = scalars.filter((p) => !p.optional);
  const choices = model.params.filter((p) => p.role === 'choice' && p.rule.choices.length > 0);
  const aligned = model.params.filter((p) => p.role === 'aligned' && draft.lists[p.name]);
  const pairs = scalars.filter((p) => p.pair);
  const has = (list) => (list.length > 0 ? 1 : 0);
  const fault = rng.weighted({
    cellKind: 20 * has(ranges),
    cellOutside: 20 * has(ranges),
    blankAlone: 8 * (ranges.length > 1 ? 1 : 0),
    shape: 10 * has(ranges),
    count: 6 * has(ranges),
    scalarOutside: 18 * has(scalars),
    scalarKind: 6 * has(scalars),
    missing: 4 * has(required),
    halfPair: 4 * has(pairs),
    choice: 4 * has(choices),
    aligned: 6 * has(aligned),
    days: 60 * has(model.params.filter((p) => p.role === 'days')),
    list: 40 * has(model.params.filter((p) => p.role === 'list')),
  });
  if (fault === 'days') return dayFault(model, draft, rng);
  if (fault === 'list') return listFault(model, draft, rng);
  const onePosition = (name) => rng.pick(filledPositions(draft, name).length ? filledPositions(draft, name) : [0]);
  switch (fault) {
    case 'cellKind': {
      const p = rng.pick(ranges);
      draft.lists[p.name][onePosition(p.name)] = wrongKind(rng);
      break;
    }
    case 'cellOutside': {
      const p = rng.pick(ranges);
      const i = onePosition(p.name);
      const limit = p.rule.atMost && draft.lists[p.rule.atMost];
      if (limit && typeof limit[i] === 'number' && rng.chance(0.3))
        draft.lists[p.name][i] = limit[i] + rng.pick([1, 0.5, 1e6]);
      else draft.lists[p.name][i] = rng.pick(outsideEdges(p.rule));
      break;
    }
    case 'blankAlone': {
      const p = rng.pick(ranges);
      draft.lists[p.name][onePosition(p.name)] = rng.pick(BLANKS);
      break;
    }
    case 'shape':
      draft.shape = rng.pick(ranges.length > 1 ? ['twoD', 'shorter', 'crossed'] : ['twoD']);
      draft.shapeParam = rng.pick(ranges).name;
      break;
    case 'count':
      if (rng.chance(0.5) && model.variants.max <= 50) {
        while (filledPositions(draft, ranges[0].name).length <= model.variants.max) {
          const from = onePosition(ranges[0].name);
          for (const name of Object.keys(draft.lists)) draft.lists[name].push(draft.lists[name][from]);
        }
      } else {
        const keep = rng.int(0, Math.max(0, model.variants.min - 1));
        const at = filledPositions(draft, ranges[0].name);
        for (const i of at.slice(keep)) for (const p of ranges) draft.lists[p.name][i] = rng.pick(BLANKS);
      }
      draft.length = draft.lists[ranges[0].name].length;
      for (const p of aligned)
        draft.lists[p.name] = draft.lists[p.name].concat(Array(draft.length).fill(1)).slice(0, draft.length);
      break;
    case 'scalarOutside': {
      const p = rng.pick(scalars);
      const outside = outsideEdges(p.rule);
      if (outside.length) draft.scalars[p.name] = rng.pick(outside);
      if (p.pair && !(p.pair in draft.scalars)) draft.scalars[p.pair] = 1;
      break;
    }
    case 'scalarKind': {
      const p = rng.pick(scalars);
      draft.scalars[p.name] = wrongKind(rng);
      if (p.pair && !(p.pair in draft.scalars)) draft.scalars[p.pair] = 1;
      break;
    }
    case 'missing':
      delete draft.scalars[rng.pick(required).name];
      break;
    case 'halfPair': {
      const p = rng.pick(pairs);
      draft.scalars[p.name] = draft.scalars[p.name] ?? 1;
      delete draft.scalars[p.pair];
      break;
    }
    case 'choice':
      draft.scalars[rng.pick(choices).name] = rng.pick([
        'exact',
        'central interval',
        'mle',
        2,
        true,
        { $error: '#N/A' },
      ]);
      break;
    case 'aligned': {
      const p = rng.pick(aligned);
      if (rng.chance(0.5))
        draft.lists[p.name] = draft.lists[p.name].slice(0, -1).length ? draft.lists[p.name].slice(0, -1) : [1, 1];
      else if (!p.text)
        draft.lists[p.name][onePosition(ranges[0].name)] = rng.chance(0.5)
          ? rng.pick(outsideEdges(p.rule))
          : wrongKind(rng);
      else draft.alignedCrossed = p.name;
      break;
    }
    default:
      break;
  }
  return fault;
}

/** Breaks one thing in the day tables; returns the kind of fault. */
function dayFault(model, draft, rng) {
  const params = model.params.filter((p) => p.role === 'days');
  const p = rng.pick(params);
  const table = draft.days[p.name];
  const rows = filledDays(table);
  const r = rows.length > 0 ? rng.pick(rows) : 0;
  const c = rng.int(0, table[0].length - 1);
  const kind = rng.weighted({
    dayKind: 25,
    dayOutside: 25,
    dayBlank: 15 * (params.length > 1 || table[0].length > 1 ? 1 : 0),
    dayShape: 10 * (params.length > 1 ? 1 : 0),
    dayColumns: 15,
    dayEmpty: 5,
    dayRows: 2,
  });
  switch (kind) {
    case 'dayKind':
      table[r][c] = wrongKind(rng);
      break;
    case 'dayOutside': {
      const limit = p.rule.atMost && draft.days[p.rule.atMost];
      if (limit && typeof limit[r][c] === 'number' && rng.chance(0.4))
        table[r][c] = limit[r][c] + rng.pick([1, 0.5, 1e6]);
      else table[r][c] = rng.pick(outsideEdges(p.rule));
      break;
    }
    case 'dayBlank':
      table[r][c] = rng.pick(BLANKS);
      if (table[r].every((x) => BLANKS.includes(x))) {
        if (params.length > 1) break; // another table keeps the day filled
        table[r][(c + 1) % table[r].length] = 1;
      }
      break;
    case 'dayShape':
      draft.days[p.name] =
        rng.chance(0.5) && table.length > 1
          ? table.slice(0, -1)
          : table.map((row) => row.slice(0, -1).concat(row.length > 1 ? [] : [1, 1]));
      break;
    case 'dayColumns': {
      const width = rng.chance(0.5) ? 1 : model.variants.max + 1;
      for (const q of params) {
        draft.days[q.name] = draft.days[q.name].map((row) =>
          Array.from({ length: width }, (_, i) => row[i % row.length]),
        );
      }
      break;
    }
    case 'dayEmpty':
      for (const q of params) draft.days[q.name] = draft.days[q.name].map((row) => row.map(() => rng.pick(BLANKS)));
      break;
    default: {
      const extra = 1001 - table.length;
      for (const q of params) {
        const t = draft.days[q.name];
        for (let i = 0; i < extra; i++) t.push(t[i % t.length].slice());
      }
    }
  }
  return kind;
}

/** Breaks one thing in a list (or leaves out a required one); returns the kind of fault. */
function listFault(model, draft, rng) {
  const p = rng.pick(model.params.filter((q) => q.role === 'list'));
  const values = draft.listCells[p.name] ?? [1, 2];
  const filled = values.map((x, i) => (BLANKS.includes(x) ? -1 : i)).filter((i) => i >= 0);
  const i = filled.length > 0 ? rng.pick(filled) : 0;
  const kind = rng.weighted({
    listKind: 20,
    listOutside: 20,
    listOrder: p.increasing ? 20 : 0,
    listTwoD: 10,
    listCount: 15,
    listMissing: p.optional ? 0 : 5,
    listColumns: p.perColumn && draft.days ? 15 : 0,
  });
  draft.listCells[p.name] = values;
  switch (kind) {
    case 'listKind':
      values[i] = wrongKind(rng);
      break;
    case 'listOutside':
      values[i] = rng.pick(outsideEdges(p.rule));
      break;
    case 'listOrder':
      if (filled.length < 2) values.push(values[i]);
      else {
        const a = filled[rng.int(0, filled.length - 2)];
        const b = filled[filled.indexOf(a) + 1];
        if (rng.chance(0.5)) [values[a], values[b]] = [values[b], values[a]];
        else values[b] = values[a];
      }
      break;
    case 'listTwoD':
      draft.listTwoD = p.name;
      break;
    case 'listCount':
      if (rng.chance(0.5)) {
        const top = filled.length > 0 ? values[filled[filled.length - 1]] : 1;
        const step = p.increasing ? 1 : 0;
        const more = p.count.max + 1 - filled.length;
        for (let k = 1; k <= more; k++) values.push(p.increasing ? top + k * step : 1);
      } else draft.listCells[p.name] = values.map(() => rng.pick(BLANKS));
      break;
    case 'listMissing':
      delete draft.listCells[p.name];
      break;
    default: {
      const numbers = values.filter((x) => !BLANKS.includes(x));
      draft.listCells[p.name] = rng.chance(0.5) || numbers.length < 2 ? numbers.concat([1]) : numbers.slice(0, -1);
    }
  }
  return kind;
}

// ---------------------------------------------------------------------------------------------------
// Layout: lists → ranges in the chosen direction

function layout(list, orientation) {
  if (list.length === 1) return [[list[0]]];
  return orientation === 'row' ? [list.slice()] : list.map((x) => [x]);
}

function buildArgs(model, draft, rng) {
  const args = model.params.map((p) => {
    if (p.role === 'range' || p.role === 'aligned') {
      const list = draft.lists[p.name];
      if (!list) return undefined;
      let orientation = draft.orientation;
      if (draft.alignedCrossed === p.name || (draft.shape === 'crossed' && draft.shapeParam === p.name)) {
        orientation = orientation === 'row' ? 'column' : 'row';
      }
      let cells = list;
      if (draft.shape === 'shorter' && draft.shapeParam === p.name)
        cells = list.length > 1 ? list.slice(0, -1) : list.concat([1]);
      if (draft.shape === 'twoD' && draft.shapeParam === p.name) {
        const half = Math.max(2, Math.ceil(cells.length / 2));
        const padded = cells.concat(Array(2 * half - cells.length).fill(1));
        return [padded.slice(0, half), padded.slice(half)];
      }
      return layout(cells, orientation);
    }
    if (p.role === 'days') return draft.days[p.name].map((row) => row.slice());
    if (p.role === 'list') {
      const cells = draft.listCells[p.name];
      if (!cells) return undefined;
      if (draft.listTwoD === p.name) {
        const half = Math.max(2, Math.ceil(cells.length / 2));
        const padded = cells.concat(Array(2 * half - cells.length).fill(1));
        return [padded.slice(0, half), padded.slice(half)];
      }
      return layout(cells, draft.listOrientation[p.name]);
    }
    return p.name in draft.scalars ? draft.scalars[p.name] : undefined;
  });
  // omitted optional arguments: undefined when trailing (Excel passes fewer), null in the middle
  let last = args.length - 1;
  while (last >= 0 && args[last] === undefined) last--;
  const trimmed = args.slice(0, last + 1).map((a) => (a === undefined ? (rng.chance(0.5) ? null : undefined) : a));
  return trimmed;
}

/**
 * The call number `index` of a run.
 * @param {object[]} models the functions to spread the calls over (in order)
 * @returns {{ index: number, fn: string, args: unknown[], mode: string, fault?: string }}
 */
function generateCall(models, seed, index) {
  const rng = streamFor(seed, index);
  const model = models[index % models.length];
  const mode = rng.weighted({ ordinary: 45, extreme: 25, fault: 30 });
  const draft = ordinaryDraft(model, rng);
  let fault;
  if (mode === 'extreme') applyExtremes(model, draft, rng);
  if (mode === 'fault') fault = applyFault(model, draft, rng);
  return { index, fn: model.id, args: buildArgs(model, draft, rng), mode, ...(fault ? { fault } : {}) };
}

module.exports = { generateCall, nextUp, nextDown, insideEdges, outsideEdges };
